"""The discharge regime of a void in words: below inception, waiting for a start electron, or discharging.

Above inception a void can still show no discharge for a long time: until the first discharge the only start
electrons are those of the volume supply (natural background ionisation) and, for a void bounded by an electrode,
emission from the metal when it is the cathode; surface emission from the void wall needs a first discharge. The
kernel draws the wait as an exponential hazard that accumulates only while |x| >= x_inc (:mod:`pdvoid.kernels.
void_events`, ``start_wait``). This module estimates that wait from the same rates, so that an empty run above
inception is not mistaken for a void below inception. It is an analysis estimate, not the kernel: the hazard per
cycle is integrated in closed form for a pure sine and on a fine grid of the waveform otherwise.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from pdvoid.coefficients import compute_coefficients
from pdvoid.core.errors import InputError
from pdvoid.inputs.scenario import Scenario
from pdvoid.models.arguments import KernelArguments
from pdvoid.models.protocol import VoidModel
from pdvoid.simulation.results import Result

__all__ = ["REGIME_STATES", "DischargeRegime", "discharge_regime", "fraction_of_sine_above"]

#: the states :func:`discharge_regime` reports
REGIME_STATES = ("below inception", "no self-sustained discharge", "waiting for a start electron", "discharging")

#: grid points per period for waveforms other than a pure sine [-]
_GRID = 20000

#: probability of a first discharge that ``cycles_for_95_percent`` refers to [-]
_CONFIDENCE = 0.95


@dataclass(frozen=True)
class DischargeRegime:
    """What a void above or below inception is expected to do, and in plain words.

    Attributes
    ----------
    state : str
        One of :data:`REGIME_STATES`.
    text : str
        One or two sentences for a design engineer, e.g. "above inception but waiting for a start electron: ...".
    voltage_ratio : float
        Peak of the uncharged void quantity divided by its inception value, i.e. applied over inception voltage
        [-]; 0 when no self-sustained discharge is possible.
    fraction_above_inception : float
        Fraction of each period during which the field of the uncharged void is at or above E_inc [-].
    start_electron_rate : float
        Mean start-electron rate before the first discharge while the field is above inception [1/s] (volume
        supply, electrode emission where it applies, the field-assisted factor when the model uses it); NaN when
        the void never reaches inception; inf for a lag-free model.
    mean_wait : float
        Expected time to the first start electron, including the parts of each period below inception (period
        divided by the hazard accumulated per cycle) [s]; 0 for a lag-free model; inf when it never comes (below
        inception or no start electrons).
    mean_wait_cycles : float
        The same in supply cycles [-].
    cycles_for_95_percent : float
        Cycles after which a first discharge has occurred with 95 % probability, −ln(0.05)·mean_wait_cycles
        (exponential waiting law) [-].
    frequency : float
        Supply frequency [Hz].
    first_discharge_time : float
        Time of the first discharge of the result given [s]; NaN without a result or a discharge.
    simulated_time : float
        Duration of the result given [s]; NaN without a result.
    probability_of_no_discharge : float
        Probability that a run as long as the result sees no discharge at all, exp(−cycles/mean_wait_cycles)
        [-]; NaN without a result.
    """

    state: str
    text: str
    voltage_ratio: float
    fraction_above_inception: float
    start_electron_rate: float
    mean_wait: float
    mean_wait_cycles: float
    cycles_for_95_percent: float
    frequency: float
    first_discharge_time: float = math.nan
    simulated_time: float = math.nan
    probability_of_no_discharge: float = math.nan


def fraction_of_sine_above(level: float) -> float:
    """Fraction of a sine period during which |sin| >= ``level``: 1 − (2/π)·asin(level).

    Parameters
    ----------
    level : float
        Level relative to the peak [-], >= 0.

    Returns
    -------
    float
        The fraction of the period [-]: 1 at level 0, 0 above 1.

    Raises
    ------
    InputError
        For a negative or non-finite level.
    """
    if isinstance(level, bool) or not isinstance(level, (int, float)) or not math.isfinite(level) or level < 0.0:
        raise InputError(f"level must be a finite number >= 0 (relative to the peak); got {level!r}")
    if level > 1.0:
        return 0.0
    return 1.0 - 2.0 / math.pi * math.asin(level)


def _number(x: float) -> str:
    """A count or time for a sentence: three significant figures, thousands grouped by a space."""
    if not math.isfinite(x):
        return "never" if x > 0 else "n/a"
    if abs(x) >= 1000.0:
        digits = int(math.floor(math.log10(abs(x)))) - 2
        return f"{round(x, -digits):,.0f}".replace(",", " ")
    return f"{x:.3g}"


def _hazard_per_cycle(args: KernelArguments, frequency: float) -> tuple[float, float, float]:
    """(fraction of the period above inception, peak |x| / x_inc, start-electron hazard per cycle [-])."""
    period = 1.0 / frequency
    if args.pure_sine:
        amp = abs(args.gain) * math.hypot(float(args.a_coef[0]), float(args.b_coef[0]))
        ratio = amp / args.x_inc
        frac = fraction_of_sine_above(args.x_inc / amp) if amp > 0.0 else 0.0
        if not args.field_assisted:
            # the two half cycles are mirror images: each spends frac/2 of the period above inception
            return frac, ratio, period * frac * 0.5 * (args.n_vol_pos + args.n_vol_neg)
    from pdvoid.inputs.waveform import evaluate

    grid = (np.arange(_GRID) + 0.5) / _GRID
    x = args.gain * evaluate(grid, args.orders, args.a_coef, args.b_coef)
    above = np.abs(x) >= args.x_inc
    ratio = float(np.max(np.abs(x))) / args.x_inc
    if args.pure_sine:
        frac = fraction_of_sine_above(1.0 / ratio) if ratio > 0.0 else 0.0
    else:
        frac = float(np.mean(above))
    rate = np.where(x > 0.0, args.n_vol_pos, args.n_vol_neg)
    if args.field_assisted:
        rate = rate * np.exp(np.abs(x) / args.x_inc)
    return frac, ratio, period * float(np.mean(np.where(above, rate, 0.0)))


def discharge_regime(scenario: Scenario, result: Result | None = None) -> DischargeRegime:
    """The regime of a void: below inception, waiting for a start electron, or discharging.

    Without a result the state follows from the scenario: "no self-sustained discharge" when the inception
    criterion allows none, "below inception" when the uncharged void never reaches the inception field,
    "waiting for a start electron" when the expected wait for the first start electron is longer than one cycle,
    else "discharging" (also for a lag-free model). With a result the run decides between the last two:
    "discharging" when it has discharges, "waiting for a start electron" when it is above inception and has none.

    The wait: before the first discharge start electrons come only from the rates that need no earlier
    discharge (volume supply, and electrode emission for the discharges whose cathode is the metal), times
    exp(|x|/x_inc) when the model is field-assisted, and they count only while |x| >= x_inc. With H the hazard
    accumulated per cycle, the number of cycles to the first discharge is close to exponential with mean 1/H
    (Poisson start electrons, common practice): 95 % of first discharges come within −ln(0.05)/H cycles.

    Parameters
    ----------
    scenario : pdvoid.Scenario
        The void, its supply and its model [-].
    result : pdvoid.simulation.results.Result or None, optional
        A simulation of ``scenario``; its discharges (or their absence) decide the state.

    Returns
    -------
    DischargeRegime
        The state, the expected wait and a sentence saying it.

    Raises
    ------
    InputError
        When ``scenario`` is not a Scenario, ``result`` is not a Result, or the result is of another scenario.
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    if result is not None:
        if not isinstance(result, Result):
            raise InputError(f"result must be a simulation Result or None; got {type(result).__name__}")
        if result.scenario != scenario:
            raise InputError("result is a simulation of another scenario; pass the scenario it was run with")
    model = scenario.model
    if not isinstance(model, VoidModel):
        raise InputError(f"scenario.model {type(model).__name__} does not implement the void-model protocol")
    c = compute_coefficients(scenario)
    f = float(scenario.periodic_supply.frequency)
    period = 1.0 / f
    extra: dict[str, float] = {}
    if result is not None:
        extra["simulated_time"] = float(result.duration)
        if result.event_count:
            extra["first_discharge_time"] = float(result.first_discharge_time)

    if c.inception_regime == "no self-sustained discharge" or not math.isfinite(c.inception_field):
        text = "no self-sustained discharge: " + (c.inception_reason or "the gas gap cannot sustain one")
        return DischargeRegime("no self-sustained discharge", text, 0.0, 0.0, math.nan, math.inf, math.inf,
                               math.inf, f, **extra)

    args = model.kernel_arguments(scenario, c)
    frac, ratio, hazard = _hazard_per_cycle(args, f)
    if frac == 0.0:
        if result is not None and result.event_count:  # e.g. a deposited charge the uncharged void lacks
            state = "discharging"
            text = (f"discharging: first discharge after {_number(result.first_discharge_time)} s, although the "
                    f"applied voltage is only {100.0 * ratio:.3g} % of the inception voltage of the uncharged void")
        else:
            state = "below inception"
            text = (f"below inception: the applied voltage is {100.0 * ratio:.3g} % of the inception voltage; no "
                    "discharge is expected")
        return DischargeRegime(state, text, ratio, 0.0, math.nan, math.inf, math.inf, math.inf, f, **extra)

    if args.lag_free:
        rate, wait_cycles = math.inf, 0.0
    elif hazard > 0.0:
        rate, wait_cycles = hazard / (frac * period), 1.0 / hazard
    else:
        rate, wait_cycles = 0.0, math.inf
    wait = wait_cycles * period
    cycles95 = -math.log(1.0 - _CONFIDENCE) * wait_cycles
    p_none = math.nan
    if result is not None:
        p_none = math.exp(-result.cycles / wait_cycles) if wait_cycles > 0.0 else 0.0

    above = f"above inception ({100.0 * ratio:.3g} % of the inception voltage)"
    if args.lag_free:
        expect = "no start-electron wait (lag-free model): discharges from the first cycle"
    elif rate == 0.0:
        expect = "no start electrons before a first discharge: it never starts"
    else:
        expect = (f"mean wait for a first start electron {_number(wait)} s ({_number(wait_cycles)} cycles at "
                  f"{f:g} Hz); 95 % chance of a first discharge within {_number(cycles95)} cycles")
    if result is not None:
        if result.event_count:
            state = "discharging"
            text = (f"discharging: first discharge after {_number(result.first_discharge_time)} s; {above}; "
                    f"{expect}")
        else:
            state = "waiting for a start electron"
            text = (f"{above} but waiting for a start electron: no discharge in the {_number(result.duration)} s "
                    f"simulated ({_number(result.cycles)} cycles; a run this long stays empty with probability "
                    f"{100.0 * p_none:.2g} %); {expect}")
    elif wait_cycles > 1.0:
        state = "waiting for a start electron"
        text = f"{above} but waiting for a start electron: {expect}"
    else:
        state = "discharging"
        text = f"discharging: {above}; {expect}"
    return DischargeRegime(state, text, ratio, frac, rate, wait, wait_cycles, cycles95, f,
                           probability_of_no_discharge=p_none, **extra)
