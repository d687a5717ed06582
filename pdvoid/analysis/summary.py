"""The few numbers that summarise a simulated run (discharges per cycle, magnitudes, IEC 60270 quantities), in SI.

Display units (pC, nA, mW) are applied only by the faces (:mod:`pdvoid.faces.summary_table`).
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from types import MappingProxyType
from typing import ClassVar

import numpy as np

from pdvoid.core.errors import InputError
from pdvoid.simulation.results import Result

__all__ = ["RunSummary", "run_summary"]


@dataclass(frozen=True)
class RunSummary:
    """The summary numbers of one simulated run, in SI.

    The IEC 60270 quantities use the whole simulated time T = cycles / frequency as reference time and come
    from the kernel's running sums, so they hold for histogram-only runs too (IEC 60270 clause 3 definitions,
    from memory): I = Σ|q|/T, D = Σq²/T, P = Σq·u/T, n = count/T.

    Attributes
    ----------
    cycles : int
        AC cycles simulated [-].
    duration : float
        Simulated time T, the reference time of the IEC 60270 quantities [s].
    discharge_count : int
        Discharges in the run [-].
    discharges_per_cycle : float
        Discharges per AC cycle, ``discharge_count / cycles`` [1/cycle].
    mean_apparent_charge : float
        Mean magnitude of the apparent charge per discharge, Σ|q| / count [C]; 0 when no discharge occurred.
    largest_apparent_charge : float
        Largest magnitude of the apparent charge [C]; NaN when the run kept no event arrays (no discharge, or a
        histogram-only run).
    average_discharge_current : float
        Average discharge current I = Σ|q| / T [A].
    quadratic_rate : float
        Quadratic rate D = Σq² / T [C²/s].
    discharge_power : float
        Discharge power P = Σq·u / T, u the applied voltage at each discharge [W].
    pulse_repetition_rate : float
        Pulse repetition rate n = count / T [1/s].
    first_discharge_time : float
        Time of the first discharge from the start of the run [s]; NaN when the run had none (or an old
        histogram-only result file does not know it).
    discharges_per_cycle_after_first : float
        The recurrent rate once discharging: the discharges from the first one on (all of them) divided by the
        cycles from the first discharge's cycle to the end of the run [1/cycle]; NaN without a first discharge.
        Differs from ``discharges_per_cycle`` when the void waited long for its first start electron.
    pulse_repetition_rate_after_first : float
        The same count divided by the time from the start of the first discharge's cycle to the end [1/s]; NaN
        without a first discharge.
    """

    #: SI unit of each attribute ("1" for a pure number)
    UNITS: ClassVar[Mapping[str, str]] = MappingProxyType({
        "cycles": "1",
        "duration": "s",
        "discharge_count": "1",
        "discharges_per_cycle": "1",
        "mean_apparent_charge": "C",
        "largest_apparent_charge": "C",
        "average_discharge_current": "A",
        "quadratic_rate": "C^2/s",
        "discharge_power": "W",
        "pulse_repetition_rate": "1/s",
        "first_discharge_time": "s",
        "discharges_per_cycle_after_first": "1",
        "pulse_repetition_rate_after_first": "1/s",
    })

    cycles: int
    duration: float
    discharge_count: int
    discharges_per_cycle: float
    mean_apparent_charge: float
    largest_apparent_charge: float
    average_discharge_current: float
    quadratic_rate: float
    discharge_power: float
    pulse_repetition_rate: float
    first_discharge_time: float = math.nan
    discharges_per_cycle_after_first: float = math.nan
    pulse_repetition_rate_after_first: float = math.nan


def run_summary(result: Result) -> RunSummary:
    """Summarise a simulated run.

    Parameters
    ----------
    result : pdvoid.simulation.results.Result
        The simulation [-]; histogram-only runs are summarised from the kernel's running sums.

    Returns
    -------
    RunSummary
        The numbers in SI.

    Raises
    ------
    InputError
        When ``result`` is not a simulation Result, or it ran no cycle.
    """
    if not isinstance(result, Result):
        raise InputError(f"run_summary needs a simulation Result; got {type(result).__name__}")
    if result.cycles < 1:
        raise InputError(f"run_summary needs a run of at least one cycle; got cycles={result.cycles!r}")
    t_ref = result.duration
    n = int(result.event_count)
    q = np.abs(result.charge)
    f = result.frequency
    t_first = float(result.first_discharge_time)
    per_cycle_after = rate_after = math.nan
    if n and not math.isnan(t_first):
        first_cycle = min(math.floor(t_first * f), result.cycles - 1)  # the cycle holding the first discharge
        cycles_after = result.cycles - first_cycle
        per_cycle_after = n / cycles_after
        rate_after = n / (cycles_after / f)
    return RunSummary(
        cycles=int(result.cycles),
        duration=float(t_ref),
        discharge_count=n,
        discharges_per_cycle=n / result.cycles,
        mean_apparent_charge=float(result.sum_abs_charge / n) if n else 0.0,
        largest_apparent_charge=float(q.max()) if q.size else math.nan,
        average_discharge_current=float(result.sum_abs_charge / t_ref),
        quadratic_rate=float(result.sum_charge_squared / t_ref),
        discharge_power=float(result.sum_charge_voltage / t_ref),
        pulse_repetition_rate=n / t_ref,
        first_discharge_time=t_first if n else math.nan,
        discharges_per_cycle_after_first=per_cycle_after,
        pulse_repetition_rate_after_first=rate_after,
    )
