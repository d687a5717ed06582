"""Coaxial (cable) insulation: the radial field, Pedersen's weighting field of the inner conductor, and how far
the field changes across a void.

A coaxial insulation fills r_i ≤ r ≤ R between an inner conductor (radius r_i, at the applied voltage V) and an
earthed outer conductor or screen (radius R). All functions take floats or numpy arrays (broadcast together) and
return a float for scalar input, an array otherwise. Lengths in metres.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from pdvoid.core.errors import InputError
from pdvoid.physics.checks import broadcast_named as _broadcast
from pdvoid.physics.checks import positive as _positive
from pdvoid.physics.checks import scalar_or_array as _out

__all__ = ["coaxial_field_per_volt", "coaxial_weighting_potential", "coaxial_field_variation"]


def _radii(radius: npt.ArrayLike, inner_radius: npt.ArrayLike,
           outer_radius: npt.ArrayLike) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    r_ = _positive("radius", radius, "m")
    a_ = _positive("inner_radius", inner_radius, "m")
    b_ = _positive("outer_radius", outer_radius, "m")
    r, a, b = _broadcast(radius=r_, inner_radius=a_, outer_radius=b_)
    if np.any(a >= b):
        i = int(np.flatnonzero((a >= b).ravel())[0])
        raise InputError(f"inner_radius must be smaller than outer_radius; got {a.ravel()[i]!r} m and "
                         f"{b.ravel()[i]!r} m")
    bad = (r < a) | (r > b)
    if np.any(bad):
        i = int(np.flatnonzero(bad.ravel())[0])
        raise InputError(f"radius must lie in [inner_radius, outer_radius] = [{a.ravel()[i]:g}, {b.ravel()[i]:g}] m; "
                         f"got {r.ravel()[i]!r} m")
    return r, a, b


def coaxial_field_per_volt(radius: npt.ArrayLike, inner_radius: npt.ArrayLike,
                           outer_radius: npt.ArrayLike) -> float | np.ndarray:
    """Radial field of a coaxial insulation per volt between its conductors, ``1 / (r ln(R/r_i))``.

    Gauss's law for a long cylindrical capacitor with a homogeneous dielectric: the charge per length Q' on the
    inner conductor gives E(r) = Q'/(2π ε r) and V = Q'/(2π ε) · ln(R/r_i), so ``E(r) = V / (r ln(R/r_i))``,
    independent of the permittivity. The same expression is the magnitude of the gradient of Pedersen's
    weighting potential of the inner conductor (:func:`coaxial_weighting_potential`), which is why it also sets
    the apparent charge at the cable terminals. Largest at the inner conductor, V/(r_i ln(R/r_i)).

    Parameters
    ----------
    radius : array_like
        distance from the cable axis r, r_i ≤ r ≤ R [m]
    inner_radius : array_like
        radius of the inner conductor (or of its semiconducting screen) r_i [m]
    outer_radius : array_like
        inner radius of the outer conductor or insulation screen R, > r_i [m]

    Returns
    -------
    float or numpy.ndarray
        E(r)/V [1/m]

    Notes
    -----
    Validity: long straight coaxial conductors (end effects neglected), homogeneous linear insulation, no space
    charge; exact under these assumptions. For a thin wall (R − r_i ≪ r_i) it tends to 1/(R − r_i), the plane slab.

    References
    ----------
    kuffel2000_fields (coaxial cylindrical field, from memory); the derivation above is elementary (Gauss's law).
    """
    r, a, b = _radii(radius, inner_radius, outer_radius)
    return _out(1.0 / (r * np.log(b / a)), radius, inner_radius, outer_radius)


def coaxial_weighting_potential(radius: npt.ArrayLike, inner_radius: npt.ArrayLike,
                                outer_radius: npt.ArrayLike) -> float | np.ndarray:
    """Pedersen's λ function of the inner conductor of a coaxial insulation, ``λ(r) = ln(R/r) / ln(R/r_i)``.

    λ solves Laplace's equation in the insulation with λ = 1 on the inner conductor (where the apparent charge
    is measured, at the cable terminals) and λ = 0 on the outer conductor. A charge distribution with zero net
    charge and dipole moment M, small against its distance to the conductors, induces on the inner conductor
    ``q = −M·∇λ`` with ``|∇λ| = 1/(r ln(R/r_i))`` (:func:`coaxial_field_per_volt`); inside a void the gradient is
    raised by the void's field enhancement f, exactly as in the plane slab, so the apparent charge per drop ΔE of
    the field inside a spheroidal void is ``K εr ε0 Ω ΔE / (r ln(R/r_i))`` (derivation in the guide, "Voids in
    cable insulation"). The plane-slab λ = z/d is its thin-wall limit.

    Parameters
    ----------
    radius : array_like
        distance from the cable axis r, r_i ≤ r ≤ R [m]
    inner_radius : array_like
        radius of the inner conductor r_i [m]
    outer_radius : array_like
        inner radius of the outer conductor R, > r_i [m]

    Returns
    -------
    float or numpy.ndarray
        λ(r), from 1 at r_i to 0 at R [-]

    Notes
    -----
    Validity: as :func:`coaxial_field_per_volt` (long coaxial conductors, homogeneous host, no other
    electrodes). The void itself is not in λ here; its effect is the factor f above (void small against its
    distance to the conductors and against r).

    References
    ----------
    pedersen1991, crichton1989 (the λ function and induced charge, from memory); the coaxial λ is the
    normalised potential of the cylindrical capacitor (kuffel2000_fields, from memory).
    """
    r, a, b = _radii(radius, inner_radius, outer_radius)
    return _out(np.log(b / r) / np.log(b / a), radius, inner_radius, outer_radius)


def coaxial_field_variation(height: npt.ArrayLike, radius: npt.ArrayLike) -> float | np.ndarray:
    """How much the applied radial field changes across a void of radial extent h centred at radius r.

    The applied field goes as 1/r, so between the void's inner wall (r − h/2) and its outer wall (r + h/2) it
    changes by ``(1/(r − h/2) − 1/(r + h/2)) · r = h r / (r² − h²/4)``, i.e. by h/r to first order. The
    thin-void model evaluates the field at the void centre; the field at the inner wall, where it is highest, is
    larger by h/(2r) to first order. The mean field over the void and the induced charge differ from their
    centre values only in second order, (h/r)²/20 for a sphere (the mean of 1/r over the void, derived).

    Parameters
    ----------
    height : array_like
        void extent along the field (radially) h [m], h < 2r
    radius : array_like
        radius of the void centre r [m]

    Returns
    -------
    float or numpy.ndarray
        relative change of the applied field across the void, (E(r − h/2) − E(r + h/2)) / E(r) [-]

    Notes
    -----
    Validity: the 1/r field of :func:`coaxial_field_per_volt` (the void itself not included).

    References
    ----------
    derived here from E ∝ 1/r.
    """
    h_ = _positive("height", height, "m")
    r_ = _positive("radius", radius, "m")
    h, r = _broadcast(height=h_, radius=r_)
    if np.any(h >= 2.0 * r):
        raise InputError("height must be smaller than twice the radius (the void must not reach the axis); got "
                         f"height {np.max(h)!r} m at radius {np.min(r)!r} m")
    return _out(h * r / (r * r - 0.25 * h * h), height, radius)
