"""Gas density as the physics of discharges sees it: the density-equivalent pressure."""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from pdvoid.core.units import T_ROOM
from pdvoid.physics.checks import shape_out as _shape_out
from pdvoid.physics.checks import values as _values

__all__ = ["density_equivalent_pressure"]


def density_equivalent_pressure(pressure: npt.ArrayLike, temperature: npt.ArrayLike = T_ROOM) -> float | np.ndarray:
    """Pressure at 293.15 K with the same gas density: p·T_ref/T (ideal gas).

    Parameters
    ----------
    pressure : array_like
        gas pressure p [Pa], > 0.
    temperature : array_like, optional
        gas temperature T [K], > 0.

    Returns
    -------
    float or numpy.ndarray
        The density-equivalent pressure [Pa].
    """
    p, s1 = _values("pressure", pressure, unit="Pa")
    t, s2 = _values("temperature", temperature, unit="K")
    return _shape_out(p * (T_ROOM / t), s1 and s2)
