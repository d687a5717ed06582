"""The few numbers that summarise a simulated run (discharges per cycle, magnitudes, IEC 60270 quantities)."""

from __future__ import annotations

import numpy as np

from pdvoid.core.errors import InputError

__all__ = ["run_summary"]


def run_summary(result) -> dict[str, float]:
    """Summary of a :class:`pdvoid.simulation.results.Result` with units in the keys.

    The IEC 60270 quantities use the whole simulated time as reference time and come from the kernel's running
    sums, so they hold for histogram-only runs too (IEC 60270 clause 3 definitions, from memory):
    I = Σ|q|/T, D = Σq²/T, P = Σq·u/T, n = count/T.
    """
    if not hasattr(result, "sum_abs_charge"):
        raise InputError(f"run_summary needs a simulation Result; got {type(result).__name__}")
    t_ref = result.duration
    n = result.event_count
    q = np.abs(result.charge)
    out = {
        "discharges per cycle [-]": n / result.cycles,
        "mean apparent charge [pC]": (result.sum_abs_charge / n * 1e12) if n else 0.0,
        "largest apparent charge [pC]": float(q.max() * 1e12) if q.size else float("nan"),
        "average discharge current I [nA]": result.sum_abs_charge / t_ref * 1e9,
        "quadratic rate D [pC²/s]": result.sum_charge_squared / t_ref * 1e24,
        "discharge power P [mW]": result.sum_charge_voltage / t_ref * 1e3,
        "pulse repetition rate n [1/s]": n / t_ref,
    }
    if result.histogram is not None and not q.size:
        out.pop("largest apparent charge [pC]")
    return out
