"""Inception and extinction: analytic estimates, a simulated stepped-voltage test, and the chance that a short
test misses a void.

Definitions follow IEC 60270 clause 3 (from memory for the wording): the inception voltage is the applied voltage
at which repetitive discharges are first observed when the voltage is raised gradually; the extinction voltage the
one at which they cease when it is lowered gradually. "Repetitive" needs a number: here at least
``repeat_count`` pulses of magnitude ≥ ``threshold`` within one dwell (our own documented criterion; a test lab
sets its own from the product standard).
"""

from __future__ import annotations

import itertools
import math
from collections.abc import Callable, Iterable, Sized
from dataclasses import dataclass
from typing import Any, Literal, overload

import numpy as np

from pdvoid.coefficients import compute_coefficients
from pdvoid.core.errors import InputError, check_int, check_nonnegative, check_positive
from pdvoid.core.limits import MAX_SEEDS as _MAX_SEEDS
from pdvoid.inputs.scenario import Scenario
from pdvoid.simulation.simulate import VoidRunner

__all__ = ["InceptionEstimate", "RampTest", "inception", "ramp_test", "probability_of_missing",
           "time_above_inception_fraction"]

#: most repeated tests (seeds) one stepped-voltage test may run [-]
MAX_SEEDS = _MAX_SEEDS


@dataclass(frozen=True)
class InceptionEstimate:
    """Analytic inception and extinction of a scenario (applied voltages in V rms).

    Attributes
    ----------
    inception_voltage : float
        where the void field first reaches E_inc, by the model's criterion [V].
    inception_voltage_streamer, inception_voltage_integral : float
        by each criterion [V] (NaN if unavailable).
    extinction_voltage : float
        lowest voltage that sustains lag-free discharges once started, where the peak void
        field reaches (E_inc + E_res)/2 [V]. From an uncharged start the model stops at the inception voltage,
        so the extinction voltage of a gradual decrease lies between the two (physics brief §1.4, derived).
    inception_field, residual_field : float
        in the void [V/m].
    field_enhancement : float
        [-].
    peak_factor : float
        peak/rms of the supply [-].
    inception_regime : str
        "streamer", "townsend" or "no self-sustained discharge" (then the voltages and fields are infinite: no
        discharge at any voltage).
    inception_reason : str
        why, in one sentence.
    """

    inception_voltage: float
    inception_voltage_streamer: float
    inception_voltage_integral: float
    extinction_voltage: float
    inception_field: float
    residual_field: float
    field_enhancement: float
    peak_factor: float
    inception_regime: str = "streamer"
    inception_reason: str = ""


@dataclass(frozen=True)
class RampTest:
    """Outcome of simulated stepped-voltage tests, one per seed (voltages in V rms).

    Attributes
    ----------
    inception_voltages, extinction_voltages : numpy.ndarray
        per seed [V]; NaN when not reached within the limits.
    inception_voltage, extinction_voltage : float
        means over the seeds [V].
    inception_voltage_std, extinction_voltage_std : float
        sample standard deviations over the seeds [V] (NaN for fewer than two values).
    step : float
        the voltage step [V].
    dwell : float
        the time at each level [s] (whole cycles).
    threshold : float
        the detection threshold [C].
    repeat_count : int
        pulses per dwell that count as repetitive [-].
    levels : numpy.ndarray
        the voltage levels visited by the first seed, in order [V].
    counts : numpy.ndarray
        pulses ≥ threshold at each visited level of the first seed [-].
    """

    inception_voltages: np.ndarray
    extinction_voltages: np.ndarray
    inception_voltage: float
    extinction_voltage: float
    inception_voltage_std: float
    extinction_voltage_std: float
    step: float
    dwell: float
    threshold: float
    repeat_count: int
    levels: np.ndarray
    counts: np.ndarray


@overload
def inception(scenario: Scenario, ramp: Literal[False] = False) -> InceptionEstimate: ...


@overload
def inception(scenario: Scenario, ramp: Literal[True], **ramp_options: Any) -> RampTest: ...


def inception(scenario: Scenario, ramp: bool = False, **ramp_options: Any) -> InceptionEstimate | RampTest:
    """Inception and extinction voltages of ``scenario``.

    ``ramp=False`` (default) gives the analytic :class:`InceptionEstimate`; ``ramp=True`` runs
    :func:`ramp_test` with ``ramp_options`` and returns a :class:`RampTest`.

    Parameters
    ----------
    scenario : Scenario
        The void in its insulation [-].
    ramp : bool
        False for the analytic estimate, True for a simulated stepped-voltage test [-].
    **ramp_options
        Keyword arguments of :func:`ramp_test` (only with ``ramp=True``).

    Returns
    -------
    InceptionEstimate or RampTest
        The analytic estimate, or the simulated test.

    Raises
    ------
    InputError
        For a bad scenario, ramp options without ``ramp=True``, or bad ramp options.
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    if ramp:
        return ramp_test(scenario, **ramp_options)
    if ramp_options:
        raise InputError(f"ramp options {sorted(ramp_options)} need ramp=True")
    c = compute_coefficients(scenario)
    return InceptionEstimate(
        inception_voltage=c.inception_voltage, inception_voltage_streamer=c.inception_voltage_streamer,
        inception_voltage_integral=c.inception_voltage_integral, extinction_voltage=c.extinction_voltage,
        inception_field=c.inception_field, residual_field=c.residual_field,
        field_enhancement=c.field_enhancement, peak_factor=c.peak_factor,
        inception_regime=c.inception_regime, inception_reason=c.inception_reason,
    )


def _one_ramp(scenario, seed, start, step, dwell_cycles, threshold, repeat_count, max_voltage):
    runner = VoidRunner(scenario, seed)
    base = scenario.supply.rms
    levels, counts = [], []
    u = start
    u_inc = math.nan
    while u <= max_voltage * (1 + 1e-12):
        t, q, *_ = runner.run(dwell_cycles, scale=u / base)
        n = int(np.count_nonzero(np.abs(q) >= threshold))
        levels.append(u)
        counts.append(n)
        if n >= repeat_count:
            u_inc = u
            break
        u += step
    u_ext = math.nan
    if math.isfinite(u_inc):
        while u > step * 0.5:
            u -= step
            t, q, *_ = runner.run(dwell_cycles, scale=u / base)
            n = int(np.count_nonzero(np.abs(q) >= threshold))
            levels.append(u)
            counts.append(n)
            if n < repeat_count:
                u_ext = u
                break
    return u_inc, u_ext, levels, counts


def ramp_test(
    scenario: Scenario,
    *,
    start: float | None = None,
    step: float | None = None,
    dwell: float = 1.0,
    threshold: float = 0.0,
    repeat_count: int = 10,
    seeds: Iterable[int] = (0,),
    max_voltage: float | None = None,
    progress: Callable[[int, int], None] | None = None,
) -> RampTest:
    """Simulate a stepped-voltage test as a test lab runs it, with the void's memory carried between steps.

    The voltage starts at ``start`` and rises by ``step`` every ``dwell`` until at least ``repeat_count`` pulses
    of magnitude ≥ ``threshold`` occur within one dwell (inception voltage = that level); it then falls by
    ``step`` per dwell until a dwell has fewer (extinction voltage = that level). In lag-free mode the simulated
    inception voltage lies within one step above the analytic one.

    Parameters
    ----------
    scenario : Scenario
        the void; its supply's waveform and frequency are used, its rms is replaced by the test levels.
    start : float or None
        first level [V rms]; default half the analytic inception voltage, rounded down to a whole step.
    step : float or None
        voltage step [V rms]; default 2 % of the analytic inception voltage.
    dwell : float
        time at each level [s], rounded to whole cycles (at least one).
    threshold : float
        detection threshold of the measuring system [C].
    repeat_count : int
        pulses per dwell that count as repetitive [-].
    seeds : Iterable[int]
        seeds of the repeated tests [-] (spread over seeds = statistical scatter of the test).
    max_voltage : float or None
        highest level tried [V rms]; default 3 × the analytic inception voltage.
    progress : Callable[[int, int], None], optional
        called as progress(tests_done, tests) after each seed's test.

    Returns
    -------
    RampTest
        Inception and extinction voltage per seed, their means and standard deviations, and the levels and
        counts of the first seed.

    Raises
    ------
    InputError
        For a bad scenario, levels, dwell, threshold, repeat count or seeds.
    """
    est = inception(scenario)
    u_ref = est.inception_voltage
    if not math.isfinite(u_ref) and (step is None or start is None or max_voltage is None):
        raise InputError(f"ramp_test: the scenario has no finite inception voltage ({est.inception_reason}); "
                         "give start, step and max_voltage to ramp it anyway")
    step = 0.02 * u_ref if step is None else check_positive("step", step, "V")
    start = math.floor(0.5 * u_ref / step) * step if start is None else check_nonnegative("start", start, "V")
    if start == 0.0:
        start = step
    max_voltage = 3.0 * u_ref if max_voltage is None else check_positive("max_voltage", max_voltage, "V")
    if (max_voltage - start) / step > 10_000:
        raise InputError(f"step {step:g} V is too small for the range {start:g}..{max_voltage:g} V "
                         "(more than 10000 levels)")
    dwell = check_positive("dwell", dwell, "s")
    dwell_cycles = max(1, round(dwell * scenario.periodic_supply.frequency))
    if dwell_cycles > 10_000_000:
        raise InputError(f"dwell must be at most 1e7 cycles; got {dwell_cycles}")
    threshold = check_nonnegative("threshold", threshold, "C")
    repeat_count = check_int("repeat_count", repeat_count, 1, 10**9)
    if isinstance(seeds, (str, bytes)) or not isinstance(seeds, Iterable):
        raise InputError(f"seeds must be an iterable of whole numbers (e.g. range(5)); got {seeds!r}")
    if isinstance(seeds, Sized) and len(seeds) > MAX_SEEDS:  # checked before anything is allocated
        raise InputError(f"seeds must hold 1 to {MAX_SEEDS} seeds; got {len(seeds)}")
    seed_list = list(itertools.islice(seeds, MAX_SEEDS + 1))
    if not 1 <= len(seed_list) <= MAX_SEEDS:
        raise InputError(f"seeds must hold 1 to {MAX_SEEDS} seeds; got "
                         f"{len(seed_list) if len(seed_list) <= MAX_SEEDS else 'more than ' + str(MAX_SEEDS)}")
    if progress is not None and not callable(progress):
        raise InputError(f"progress must be callable or None; got {type(progress).__name__}")
    runs = []
    for s in seed_list:
        runs.append(_one_ramp(scenario, s, start, step, dwell_cycles, threshold, repeat_count, max_voltage))
        if progress is not None:
            progress(len(runs), len(seed_list))
    incs_a = np.array([ui for ui, _, _, _ in runs])
    exts_a = np.array([ue for _, ue, _, _ in runs])
    first = (runs[0][2], runs[0][3])  # the levels and counts of the first seed

    def stats(x):
        good = x[np.isfinite(x)]
        mean = float(good.mean()) if good.size else math.nan
        std = float(good.std(ddof=1)) if good.size > 1 else math.nan
        return mean, std

    (mi, si), (me, se) = stats(incs_a), stats(exts_a)
    return RampTest(
        inception_voltages=incs_a, extinction_voltages=exts_a, inception_voltage=mi, extinction_voltage=me,
        inception_voltage_std=si, extinction_voltage_std=se, step=step, dwell=dwell_cycles /
        scenario.periodic_supply.frequency, threshold=threshold, repeat_count=repeat_count,
        levels=np.array(first[0]), counts=np.array(first[1]),
    )


def time_above_inception_fraction(scenario: Scenario, voltage: float) -> float:
    """Fraction of each period during which the field of an uncharged void exceeds E_inc at ``voltage``.

    Derived for a pure sine: |sin ωt| ≥ s0 with s0 = U_inc/U, a fraction 1 − (2/π)·asin(s0). Other waveforms are
    evaluated numerically on 20001 points per period.

    Parameters
    ----------
    scenario : Scenario
        The void; its supply's waveform is used, scaled to ``voltage`` [-].
    voltage : float
        Applied voltage [V rms], > 0.

    Returns
    -------
    float
        The fraction of the period, 0 ... 1 [-]; 0 at or below the inception voltage.

    Raises
    ------
    InputError
        For a voltage <= 0.
    """
    voltage = check_positive("voltage", voltage, "V")
    u_inc = compute_coefficients(scenario).inception_voltage
    if voltage <= u_inc:
        return 0.0
    if getattr(scenario.supply, "is_pure", False):
        return 1.0 - 2.0 / math.pi * math.asin(u_inc / voltage)
    from pdvoid.inputs.waveform import evaluate

    orders, a, b = scenario.periodic_supply.fourier()
    v = evaluate(np.linspace(0.0, 1.0, 20001)[:-1], orders, a, b) * (voltage / scenario.supply.rms)
    c = compute_coefficients(scenario)
    gain = c.field_enhancement / scenario.insulation.thickness
    return float(np.mean(np.abs(gain * v) >= c.inception_field))


def probability_of_missing(scenario: Scenario, voltage: float, duration: float) -> float:
    """Probability that an uncharged void produces no discharge at all during a test of ``duration`` at
    ``voltage``.

    exp(−N_vol·t_above), with t_above the time its field spends above E_inc (Poisson start electrons from volume
    ionisation; surface emission needs an earlier discharge; physics brief §3.3). Lag-free models never miss
    above inception (returns 0); below inception the probability is 1.

    Parameters
    ----------
    scenario : Scenario
        The void and its model [-].
    voltage : float
        Applied voltage [V rms], > 0.
    duration : float
        Duration of the test [s], > 0.

    Returns
    -------
    float
        The probability, 0 ... 1 [-].

    Raises
    ------
    InputError
        For a voltage or duration <= 0.
    """
    duration = check_positive("duration", duration, "s")
    frac = time_above_inception_fraction(scenario, voltage)
    if frac == 0.0:
        return 1.0
    if scenario.model.lag_free:
        return 0.0
    n_vol = compute_coefficients(scenario).volume_electron_rate
    return math.exp(-n_vol * duration * frac)
