"""Array-aware input checks shared by the physics modules (scalars stay scalars, arrays broadcast)."""

from __future__ import annotations

import math

import numpy as np

from ..errors import InputError, check_array, check_nonnegative, check_positive, check_range

__all__ = ["values", "shape_out", "broadcast"]


def values(name: str, value: object, *, low: float = 0.0, low_open: bool = True, high: float = math.inf,
            unit: str = "") -> tuple[np.ndarray, bool]:
    """``value`` (number or array) as a float array checked against (low, high]; and whether it was scalar."""
    def check(label: str, x: object) -> float:
        if high == math.inf and low == 0.0:
            return (check_positive if low_open else check_nonnegative)(label, x, unit)
        return check_range(label, x, low, high, low_open=low_open, unit=unit)

    if np.ndim(value) == 0:
        if isinstance(value, np.ndarray):
            value = value.item()
        return np.asarray(check(name, value), dtype=float), True
    arr = check_array(name, value, ndim=int(np.ndim(value)), min_size=1)
    ok = (arr > low if low_open else arr >= low) & (arr <= high)
    if not np.all(ok):
        i = int(np.flatnonzero(~ok.ravel())[0])
        check(f"{name}[{i}]", float(arr.ravel()[i]))
    return arr, False


def shape_out(result: np.ndarray, scalar: bool) -> float | np.ndarray:
    return float(result) if scalar else result


def broadcast(**arrays: np.ndarray) -> list[np.ndarray]:
    try:
        return list(np.broadcast_arrays(*arrays.values()))
    except ValueError:
        shapes = ", ".join(f"{k} {np.shape(v)}" for k, v in arrays.items())
        raise InputError(f"array arguments must have broadcast-compatible shapes; got {shapes}") from None
