"""Coaxial insulation: the insulation wall of a cable between its inner conductor and its outer screen."""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from pdvoid.core.errors import InputError, check_range
from pdvoid.inputs.parameters import Insulation

__all__ = ["Coaxial", "RADIUS_RANGE"]

#: allowed range of the conductor radii [m]: 10 µm (a fine wire) to 5 m
RADIUS_RANGE = (1e-5, 5.0)


@dataclass(frozen=True, kw_only=True)
class Coaxial(Insulation):
    """Insulation between coaxial cylindrical conductors (a cable): inner conductor at the applied voltage,
    outer conductor (screen) earthed; the void sits at ``void.radial_position`` from the axis.

    The applied field is radial, E(r) = V/(r ln(R/r_i)) (:func:`pdvoid.physics.coaxial.coaxial_field_per_volt`),
    and so is a void's axis: ``void.height`` is its radial extent, ``void.diameter`` its extent across the
    field. ``thickness`` is the wall thickness R − r_i (set from the radii, not given). The other attributes
    are those of :class:`pdvoid.Insulation`; ``area`` has no meaning here and is refused.

    Attributes
    ----------
    inner_radius : float
        radius r_i of the inner conductor (or of the conductor screen, where the insulation begins) [m],
        10 µm to 5 m.
    outer_radius : float
        radius R where the insulation ends (the insulation screen or outer conductor) [m], larger than
        ``inner_radius``, at most 5 m; the wall R − r_i must lie in 1 µm to 1 m.
    permittivity : float or None
        relative permittivity εr of the insulation [-], 1 to 100; taken from ``material`` when omitted.
    material : str or None
        name of a host material from the parameter sets.
    dielectric_strength : float or None
        typical short-time dielectric strength of the insulation [V/m], as for :class:`pdvoid.Insulation`;
        compared with the field at the inner conductor, where it is highest.
    thickness : float
        the wall thickness R − r_i [m] (derived).

    Raises
    ------
    pdvoid.InputError
        For a radius outside its range, r_i ≥ R, an ``area``, or anything :class:`pdvoid.Insulation` refuses.

    Examples
    --------
    >>> import pdvoid
    >>> cable = pdvoid.Coaxial(inner_radius=10e-3, outer_radius=15.5e-3, material="xlpe")
    >>> round(cable.thickness * 1e3, 6)
    5.5
    """

    thickness: float = field(init=False, default=math.nan)
    inner_radius: float
    outer_radius: float

    def __post_init__(self) -> None:
        lo, hi = RADIUS_RANGE
        a = check_range("insulation.inner_radius", self.inner_radius, lo, hi, unit="m")
        b = check_range("insulation.outer_radius", self.outer_radius, lo, hi, unit="m")
        if a >= b:
            raise InputError(f"insulation.inner_radius must be smaller than insulation.outer_radius ({b:g} m); "
                             f"got {a:g} m")
        if self.area is not None:
            raise InputError(f"insulation.area does not apply to a coaxial insulation (a cable has no plane "
                             f"electrode area); got {self.area!r}")
        object.__setattr__(self, "inner_radius", a)
        object.__setattr__(self, "outer_radius", b)
        object.__setattr__(self, "thickness", b - a)
        super().__post_init__()
