"""Void populations for design: the probability that a part passes a routine partial-discharge test.

Given a design (:class:`pdvoid.Scenario`: insulation, the shape and gas of its voids, the model), a population of
voids per part (:class:`~pdvoid.inputs.population.VoidPopulation`), a test voltage, a test duration and an
acceptance level (the part passes when its partial-discharge level is at most ``level``), estimate the share of
parts that pass.

Method: Monte Carlo over parts. Each part draws its number of voids and their diameters from the population; its
voids are simulated together (:func:`pdvoid.simulate_voids`: independent voids adding their apparent charges to
one record) for the test duration from an uncharged state at the start of the test; its level is the largest
apparent charge of the record (``quantity="largest"``) or the largest repeatedly occurring magnitude
(``quantity="repeated"``, :func:`pdvoid.analysis.largest_repeated_magnitude`). A void whose peak field at the test
voltage stays below its inception field cannot discharge from an uncharged start, so it is left out of the
simulation (exact: it would give no event; checked from the kernel's own inception value and the supply's
extremes). The share of passing parts p̂ = k / n comes with the Wilson score interval (:func:`wilson_interval`),
which covers the Monte-Carlo sampling error only, not the uncertainty of the model or of the population.

Analytic part: the probability that a part holds no void at or above the largest discharge-free size
(:func:`pdvoid.largest_pd_free_void`, the analytic inception voltage of the design's void shape) is exact for the
population (:meth:`~pdvoid.inputs.population.VoidPopulation.no_void_at_or_above`). Such a part passes at any
acceptance level, so that probability is a lower bound of the pass probability, and equals it when every
discharging void exceeds the level within the test.

What the numbers are not: the apparent charge of the model at the void's terminals, not the reading of an
instrument (no measuring chain, noise or detection threshold); the test starts from uncharged voids (no
pre-stress); the voids do not interact.
"""

from __future__ import annotations

import math
import time
import warnings
from dataclasses import dataclass
from typing import Any

import numpy as np

from pdvoid.analysis.margins import largest_pd_free_void
from pdvoid.analysis.quantities import DEFAULT_REPETITION_RATE, largest_repeated_magnitude
from pdvoid.core.errors import InputError, check_choice, check_int, check_positive, check_range
from pdvoid.core.validity import ValidityWarning
from pdvoid.inputs.multi_void import MultiVoidScenario
from pdvoid.inputs.parameters import Sine, Void, check_seed
from pdvoid.inputs.population import VoidPopulation
from pdvoid.inputs.scenario import Scenario
from pdvoid.inputs.waveform import evaluate
from pdvoid.models import kernel_arguments
from pdvoid.models.arguments import KernelArguments
from pdvoid.simulation.multi_void import simulate_voids

__all__ = ["AcceptanceEstimate", "acceptance_probability", "wilson_interval", "QUANTITIES", "MAX_PARTS"]

#: what a part's partial-discharge level is: the largest apparent charge, or the largest repeatedly occurring one
QUANTITIES = ("largest", "repeated")
#: most parts one estimate may simulate [-]
MAX_PARTS = 1_000_000


def wilson_interval(passed: int, total: int, confidence: float = 0.95) -> tuple[float, float]:
    """Wilson score interval of a binomial proportion.

    With p̂ = k/n and z the two-sided standard normal quantile of ``confidence``: centre (k + z²/2)/(n + z²),
    half-width z/(n + z²)·sqrt(k(n - k)/n + z²/4). Unlike the normal-approximation interval it stays inside
    [0, 1] and does not collapse to zero width at k = 0 or k = n.

    Parameters
    ----------
    passed : int
        Successes k [-], 0 ≤ k ≤ n.
    total : int
        Trials n [-], ≥ 1.
    confidence : float
        Two-sided confidence level [-], in (0, 1).

    Returns
    -------
    tuple of float
        (low, high) [-].

    References
    ----------
    wilson1927 (the score interval); the same numbers as scipy.stats.binomtest(k, n).proportion_ci(method="wilson")
    (checked in the tests). Valid for any n ≥ 1; its coverage is close to nominal from n of a few tens.
    """
    from scipy.special import ndtri

    n = check_int("total", total, 1)
    k = check_int("passed", passed, 0, n)
    c = check_range("confidence", confidence, 0.0, 1.0, low_open=True, high_open=True)
    z = float(ndtri(0.5 + c / 2.0))
    z2 = z * z
    centre = (k + z2 / 2.0) / (n + z2)
    half = z / (n + z2) * math.sqrt(k * (n - k) / n + z2 / 4.0)
    return max(0.0, centre - half), min(1.0, centre + half)


@dataclass(frozen=True, eq=False)
class AcceptanceEstimate:
    """Outcome of :func:`acceptance_probability`.

    Attributes
    ----------
    probability : float
        Share of simulated parts that passed, p̂ = passed / parts [-].
    interval : tuple of float
        Wilson score interval of the pass probability at ``confidence`` [-] (Monte-Carlo error only).
    confidence : float
        Its confidence level [-].
    passed, parts : int
        Parts that passed, parts simulated [-].
    levels : numpy.ndarray
        Each part's partial-discharge level [C] (0 for a part without discharges).
    void_counts : numpy.ndarray
        Voids in each part [-].
    discharging_voids : numpy.ndarray
        Voids in each part whose peak field reached inception at the test voltage [-].
    pd_free_probability : float
        Analytic probability that a part holds no void at or above ``pd_free_diameter`` [-]: a lower bound of
        the pass probability (module docs).
    pd_free_diameter : float
        Largest discharge-free void diameter at the test voltage (analytic inception) [m].
    level : float
        The acceptance level [C].
    voltage : float
        The test voltage [V rms].
    duration : float
        The simulated test time, whole cycles [s].
    cycles : int
        Its cycles [-].
    quantity : str
        "largest" or "repeated".
    seed : int
        The seed [-].
    elapsed : float
        Wall time [s].
    notes : tuple of str
        Assumptions and limits, in words.
    """

    probability: float
    interval: tuple[float, float]
    confidence: float
    passed: int
    parts: int
    levels: np.ndarray
    void_counts: np.ndarray
    discharging_voids: np.ndarray
    pd_free_probability: float
    pd_free_diameter: float
    level: float
    voltage: float
    duration: float
    cycles: int
    quantity: str
    seed: int
    elapsed: float
    notes: tuple[str, ...]

    def summary(self) -> str:
        """The estimate in a few lines of text (charges in pC, voltages in kV).

        Returns
        -------
        str
            Probability with its interval, the analytic lower bound and the notes.
        """
        lo, hi = self.interval
        lines = [
            f"pass probability {self.probability:.4f} ({100 * self.confidence:g} % Wilson interval {lo:.4f} .. "
            f"{hi:.4f}) from {self.parts} simulated parts ({self.passed} passed)",
            f"acceptance: {self.quantity} apparent charge <= {self.level * 1e12:.4g} pC at {self.voltage / 1e3:.4g} "
            f"kV rms for {self.duration:.4g} s ({self.cycles} cycles)",
            f"analytic: P(no void >= {self.pd_free_diameter * 1e3:.4g} mm, the largest discharge-free size) = "
            f"{self.pd_free_probability:.4f}, a lower bound",
            f"voids per part: mean {float(np.mean(self.void_counts)):.3g}; discharging at the test voltage: mean "
            f"{float(np.mean(self.discharging_voids)):.3g}",
        ]
        return "\n".join(lines + [f"note: {n}" for n in self.notes])


def _can_discharge(scenario: Scenario) -> bool:
    """False when the void's peak quantity |g·V| at the supply's extremes stays below its inception value: from an
    uncharged start the kernel can then never fire (it fires only at |x| ≥ x_inc). True otherwise, and for
    models whose kernel arguments are not the plain ones (they are simulated)."""
    args = kernel_arguments(scenario)
    if type(args) is not KernelArguments:
        return True
    if not math.isfinite(args.x_inc):
        return False
    v = evaluate(args.seg_fracs, args.orders, args.a_coef, args.b_coef)  # V is monotone between the breakpoints
    return bool(abs(args.gain) * float(np.max(np.abs(v))) >= args.x_inc)


def acceptance_probability(
    scenario: Scenario,
    population: VoidPopulation,
    level: float,
    duration: float,
    *,
    voltage: float | None = None,
    parts: int = 1000,
    seed: int = 0,
    quantity: str = "largest",
    repetition_rate: float = DEFAULT_REPETITION_RATE,
    confidence: float = 0.95,
    workers: int | None = 1,
    client: Any = None,
) -> AcceptanceEstimate:
    """The probability that a part with voids from ``population`` passes a routine test (module docs).

    Parameters
    ----------
    scenario : Scenario
        The design: insulation, model, supply waveform, and the void whose gas, pressure, temperature, shape and
        position every void of the population shares (its aspect ratio too, unless the population sets one).
    population : VoidPopulation
        Sizes and number of voids per part.
    level : float
        Acceptance level [C], > 0: a part passes when its level is at most this.
    duration : float
        Test duration [s], > 0; rounded up to whole cycles of the supply (the estimate says how many).
    voltage : float or None
        Test voltage [V rms] (a sine supply's rms is replaced); None: the scenario's supply as it is.
    parts : int
        Parts to simulate, 1 to 1e6 [-].
    seed : int
        Seed of the draws and of the simulations [-]; the same seed gives the same estimate.
    quantity : str
        "largest" (largest |q| in the test) or "repeated" (:func:`pdvoid.analysis.largest_repeated_magnitude`).
    repetition_rate : float
        Repetition rate of the "repeated" quantity [1/s].
    confidence : float
        Confidence level of the interval [-], in (0, 1).
    workers : int or None
        Processes for the parts (1 = in this process; None = all local cores); the estimate is the same for
        any number, each part having its own seed.
    client : Any
        A dask.distributed Client or scheduler address (then ``workers`` is ignored).

    Returns
    -------
    AcceptanceEstimate
        The Monte-Carlo probability with its Wilson interval, the analytic lower bound and each part's level.

    Raises
    ------
    InputError
        For bad input, a voltage for a non-sine supply, or a population whose largest void does not fit the
        insulation (checked before any simulation).

    References
    ----------
    wilson1927 (the interval); the Poisson thinning of the analytic bound is textbook probability. Valid within
    the validity range of the design's void model for every size of the population.
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario (the design); got {type(scenario).__name__}")
    if not isinstance(population, VoidPopulation):
        raise InputError(f"population must be a pdvoid.VoidPopulation; got {type(population).__name__}")
    level = check_positive("level", level, "C")
    duration = check_positive("duration", duration, "s")
    parts = check_int("parts", parts, 1, MAX_PARTS)
    seed = check_seed(seed)
    check_choice("quantity", quantity, QUANTITIES)
    repetition_rate = check_positive("repetition_rate", repetition_rate, "1/s")
    confidence = check_range("confidence", confidence, 0.0, 1.0, low_open=True, high_open=True)
    if workers is not None:
        workers = check_int("workers", workers, 1, 1024)
    if voltage is not None:
        voltage = check_positive("voltage", voltage, "V")
        if not isinstance(scenario.supply, Sine):
            raise InputError("voltage replaces a sine supply's rms; for a sampled (periodic) supply give the test "
                             "waveform in the scenario and voltage=None")
        scenario = scenario.replace(**{"supply.rms": voltage})
    tv = scenario.void
    if tv.inception_length is not None or tv.field_enhancement is not None:
        raise InputError("the design's void sets void.inception_length or void.field_enhancement and "
                         "void.charge_per_field, which belong to its own size; leave them unset so that each void "
                         "of the population gets its own")
    test_voltage = float(scenario.supply.rms)
    f = float(scenario.periodic_supply.frequency)
    cycles = max(1, math.ceil(duration * f * (1.0 - 1e-12)))
    if cycles > 100_000_000:
        raise InputError(f"duration {duration!r} s is {cycles} cycles at {f!r} Hz; at most 1e8 cycles")
    aspect = (population.aspect_ratio if population.aspect_ratio is not None
              else scenario.void.height / scenario.void.diameter)
    biggest = population.largest_diameter
    try:
        Scenario(insulation=scenario.insulation, void=_void(scenario.void, biggest, aspect), supply=scenario.supply,
                 model=scenario.model)
    except InputError as exc:
        raise InputError(f"population: its largest void ({biggest!r} m across, {biggest * aspect!r} m high) does not "
                         f"fit the design: {exc}") from None
    t0 = time.perf_counter()
    notes = [
        "Monte-Carlo estimate: the interval covers the sampling error of the simulated parts only, not the "
        "uncertainty of the model parameters or of the void population.",
        "apparent charge at the terminals from the model, not an instrument reading (no measuring chain, noise or "
        "detection threshold); voids start uncharged at the start of the test and do not interact.",
    ]
    if cycles != duration * f:
        notes.append(f"the test duration {duration!r} s was rounded up to {cycles} whole cycles at {f:g} Hz.")
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", ValidityWarning)
        free = largest_pd_free_void(scenario.replace(**{"void.height": scenario.void.diameter * aspect}),
                                    test_voltage)
        pd_free = population.no_void_at_or_above(free.diameter)
        if free.limited_by == "insulation":
            notes.append(f"the analytic discharge-free size search stopped at {free.diameter:.4g} m (half the "
                         "insulation over the aspect ratio): larger voids may also be discharge-free, so the "
                         "analytic bound is conservative.")
        rng = np.random.default_rng(seed)
        counts = population.draw_counts(rng, parts)
        sizes = population.draw_diameters(rng, int(counts.sum()))
        levels = np.zeros(parts)
        discharging = np.zeros(parts, dtype=np.int64)
        incepts: dict[float, bool] = {}
        work: list[tuple[int, tuple[Void, ...]]] = []
        start = 0
        for i in range(parts):
            voids = []
            for d in sizes[start:start + counts[i]]:
                v = _void(scenario.void, float(d), aspect)
                if float(d) not in incepts:
                    incepts[float(d)] = _can_discharge(scenario.replace(**{"void.diameter": v.diameter,
                                                                           "void.height": v.height}))
                if incepts[float(d)]:
                    voids.append(v)
            start += int(counts[i])
            discharging[i] = len(voids)
            if voids:
                work.append((i, tuple(voids)))
    task = _PartLevel(scenario, cycles, seed, quantity, repetition_rate)
    if workers == 1 and client is None:
        done = [task(item) for item in work]
    else:
        from pdvoid.simulation.parallel import parallel_map

        done = parallel_map(task, work, workers=workers, client=client)
    found = {str(w.message) for w in caught if issubclass(w.category, ValidityWarning)}
    for (i, _), (value, part_notes) in zip(work, done, strict=True):
        levels[i] = value
        found.update(part_notes)
    messages = sorted(found)
    if messages:
        notes.append(f"{len(messages)} validity note(s) from the coefficients of some void sizes, e.g.: "
                     f"{messages[0]}")
    for w in caught:  # warnings other than the validity notes are passed on
        if not issubclass(w.category, ValidityWarning):
            warnings.warn_explicit(w.message, w.category, w.filename, w.lineno)
    passed = int(np.count_nonzero(levels <= level))
    return AcceptanceEstimate(
        probability=passed / parts, interval=wilson_interval(passed, parts, confidence), confidence=confidence,
        passed=passed, parts=parts, levels=levels, void_counts=counts, discharging_voids=discharging,
        pd_free_probability=pd_free, pd_free_diameter=free.diameter, level=level, voltage=test_voltage,
        duration=cycles / f, cycles=cycles, quantity=quantity, seed=seed, elapsed=time.perf_counter() - t0,
        notes=tuple(notes),
    )


class _PartLevel:
    """One part's level [C] and the validity notes of its simulation, from (part index, its discharging voids);
    picklable, so the parts run on worker processes or a Dask cluster with the same result."""

    def __init__(self, scenario: Scenario, cycles: int, seed: int, quantity: str, repetition_rate: float) -> None:
        self.scenario = scenario
        self.cycles = cycles
        self.seed = seed
        self.quantity = quantity
        self.repetition_rate = repetition_rate

    def __call__(self, item: tuple[int, tuple[Void, ...]]) -> tuple[float, tuple[str, ...]]:
        i, voids = item
        part_seed = int(np.random.SeedSequence([self.seed, i]).generate_state(1, dtype=np.uint32)[0])
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always", ValidityWarning)
            rec = simulate_voids(MultiVoidScenario.from_scenario(self.scenario, voids), cycles=self.cycles,
                                 seed=part_seed)
        notes = tuple(sorted({str(w.message) for w in caught if issubclass(w.category, ValidityWarning)}))
        for w in caught:
            if not issubclass(w.category, ValidityWarning):
                warnings.warn_explicit(w.message, w.category, w.filename, w.lineno)
        if rec.events.count == 0:
            return 0.0, notes
        if self.quantity == "largest":
            return float(np.max(np.abs(rec.events.charge))), notes
        return largest_repeated_magnitude(rec.events, self.repetition_rate), notes


def _void(template: Void, diameter: float, aspect: float) -> Void:
    """The template void with ``diameter`` [m] and height ``aspect`` × diameter [m]."""
    from dataclasses import replace

    return replace(template, diameter=diameter, height=diameter * aspect)
