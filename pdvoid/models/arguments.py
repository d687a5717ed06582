"""The plain numbers and arrays one kernel call needs, shared by both models."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..waveform import monotone_breakpoints

__all__ = ["KernelArguments", "supply_arrays"]


@dataclass(frozen=True, eq=False)
class KernelArguments:
    """Kernel inputs in SI. The void quantity x is a field [V/m] (field model) or a voltage [V] (network model);
    ``x_to_field`` converts it to the void field [V/m]."""

    frequency: float
    orders: np.ndarray
    a_coef: np.ndarray
    b_coef: np.ndarray
    seg_fracs: np.ndarray
    pure_sine: bool
    gain: float
    x_inc: float
    x_res: float
    charge_per_unit: float
    lag_free: bool
    n_vol: float
    n_same: float
    n_rev: float
    tau_s: float
    field_assisted: bool
    tau_q: float
    x_to_field: float
    references: tuple[str, ...]

    def max_events_per_cycle(self, scale: float = 1.0) -> int:
        """An upper bound on discharges in one cycle with the supply multiplied by ``scale`` (each discharge
        lowers |x| by at least x_inc - x_res; on every monotone piece x travels at most the swing of g·V plus
        the decay of the deposited part)."""
        from ..waveform import evaluate

        v = scale * evaluate(self.seg_fracs, self.orders, self.a_coef, self.b_coef)
        swing = abs(self.gain) * float(np.sum(np.abs(np.diff(v))))
        vmax = abs(self.gain) * float(np.max(np.abs(v)))
        pieces = self.seg_fracs.size - 1
        if np.isfinite(self.tau_q):
            pieces *= 3
            swing += pieces * 2.0 * (vmax + self.x_inc)
        step = self.x_inc - self.x_res
        return int(np.ceil((swing + pieces * 2.0 * (vmax + self.x_inc)) / step)) + 4 * pieces + 4


def supply_arrays(supply) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, bool]:
    """(orders, a, b, breakpoints, pure_sine) for the kernel."""
    orders, a, b = supply.fourier()
    pure = bool(supply.is_pure)
    if pure:
        orders, a, b = orders[:1], a[:1], b[:1]
        seg = np.array([0.0, 0.25, 0.75, 1.0])
    else:
        seg = monotone_breakpoints(orders, a, b)
    return orders, a, b, seg, pure
