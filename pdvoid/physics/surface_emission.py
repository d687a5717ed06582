"""Start electrons from charge trapped on a void wall, and the residual field a streamer discharge leaves.

A discharge deposits its charge on the void walls. Electrons trapped there at depth Φ are released thermally at
the attempt frequency ν0; the field at the wall lowers the barrier by the Schottky term
ΔΦ = sqrt(e³|E|/(4π ε0)), so the release rate is (|q|/e)·ν0·exp(−(Φ − ΔΦ)/(k_B T)). This is the detrapping
term of Niemeyer's generalised PD model (structure as widely reproduced; the paper itself could not be read,
physics brief §3.3, from memory). A wall emits only while it is the cathode side of the void, i.e. the field pushes
its electrons into the gas.

The discharge ends when the void field has fallen to about the field in which a streamer can still propagate (the
streamer stability field), proportional to the gas density: for positive streamers in air about
0.5 kV/(mm·bar) (physics brief §3.2, from memory).
"""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

from pdvoid.core.errors import InputError, check_positive, check_range
from pdvoid.core.units import BOLTZMANN, ELEMENTARY_CHARGE, EPSILON_0, T_ROOM
from pdvoid.physics.checks import broadcast as _broadcast
from pdvoid.physics.checks import shape_out as _shape_out
from pdvoid.physics.checks import values as _values

__all__ = ["schottky_lowering", "schottky_coefficient", "detrapping_rate", "streamer_stability_field",
           "AIR_STABILITY_REDUCED_FIELD"]

#: Reduced stability field of positive streamers in air, 0.5 kV/(mm·bar) = 5 V/(Pa m) (physics brief §3.2, from
#: memory); pressures enter as the density-equivalent pressure at 293.15 K.
AIR_STABILITY_REDUCED_FIELD = 5.0


def schottky_lowering(field: npt.ArrayLike) -> float | np.ndarray:
    """Schottky lowering of a trap or work-function barrier by the field at the surface: ΔΦ = sqrt(e³|E|/(4π ε0)).

    At 1 MV/m ΔΦ = 0.0380 eV (6.08e-21 J); at 10 MV/m 0.120 eV.

    Validity: image-force (Schottky) picture of a barrier at a planar surface; meaningful while ΔΦ stays below the
    barrier itself (for a 1 eV barrier up to about 700 MV/m, far above any void field).

    Parameters
    ----------
    field : array_like
        Magnitude of the field at the surface |E| [V/m], >= 0.

    Returns
    -------
    float or numpy.ndarray
        The barrier lowering ΔΦ [J].

    References
    ----------
    schottky1914 (the image-force lowering), niemeyer1995 (its use in the detrapping rate of wall charge).
    """
    e, s = _values("field", field, low=0.0, low_open=False, unit="V/m")
    return _shape_out(np.sqrt(ELEMENTARY_CHARGE**3 * e / (4.0 * math.pi * EPSILON_0)), s)


def schottky_coefficient(temperature: float) -> float:
    """β = sqrt(e³/(4π ε0))/(k_B T), so that ΔΦ/(k_B T) = β·sqrt(|E|) (the form the event kernel evaluates).

    Validity: as :func:`schottky_lowering`; T is the wall temperature.

    Parameters
    ----------
    temperature : float
        Wall temperature T [K], > 0.

    Returns
    -------
    float
        β [(V/m)^-1/2].

    References
    ----------
    schottky1914, niemeyer1995.
    """
    t = check_positive("temperature", temperature, "K")
    return math.sqrt(ELEMENTARY_CHARGE**3 / (4.0 * math.pi * EPSILON_0)) / (BOLTZMANN * t)


def detrapping_rate(charge: npt.ArrayLike, field: npt.ArrayLike, *, trap_depth: float, attempt_frequency: float,
                    temperature: float = T_ROOM) -> float | np.ndarray:
    """Electrons per second released from negative charge trapped on a void wall (Niemeyer-type detrapping):
    N = (|q|/e)·ν0·exp(−(Φ − ΔΦ(E))/(k_B T)), ΔΦ the Schottky lowering.

    ``charge`` is the wall's trapped electronic charge; only its magnitude enters (the caller decides whether the
    wall is charged negatively and is the cathode side). Example: 100 pC (6.24e8 electrons), Φ = 1 eV,
    ν0 = 1e14 1/s, 293.15 K and 5 MV/m give about 1.15e7 1/s.

    Validity: thermally activated release over a field-lowered barrier (structure from memory, physics brief
    §3.3); requires ΔΦ < Φ (refused otherwise: the barrier would vanish and the formula no longer applies).

    Parameters
    ----------
    charge : array_like
        Trapped charge q [C] (its magnitude is used).
    field : array_like
        Field at the wall |E| [V/m], >= 0.
    trap_depth : float
        Effective trap depth Φ [J], > 0 (about 1 eV = 1.602e-19 J, from memory).
    attempt_frequency : float
        Attempt-to-escape frequency ν0 [1/s], > 0.
    temperature : float, optional
        Wall temperature T [K], > 0.

    Returns
    -------
    float or numpy.ndarray
        Release rate of electrons [1/s].

    Raises
    ------
    InputError
        For bad inputs, or a field whose Schottky lowering reaches the trap depth.

    References
    ----------
    niemeyer1995 (detrapping term of the electron-generation rate), schottky1914 (barrier lowering).
    """
    phi = check_positive("trap_depth", trap_depth, "J")
    nu0 = check_positive("attempt_frequency", attempt_frequency, "1/s")
    t = check_positive("temperature", temperature, "K")
    q = np.abs(np.asarray(charge, dtype=float))
    if not np.all(np.isfinite(q)):
        raise InputError(f"charge must be finite numbers [C]; got {charge!r}")
    lowering = np.asarray(schottky_lowering(field), dtype=float)
    if np.any(lowering >= phi):
        raise InputError(f"field {np.max(np.abs(field)):g} V/m lowers the barrier by at least trap_depth {phi:g} J; "
                         "the detrapping formula needs a smaller field or a deeper trap")
    qb, lb = _broadcast(charge=q, lowering=lowering)
    out = qb / ELEMENTARY_CHARGE * nu0 * np.exp(-(phi - lb) / (BOLTZMANN * t))
    return _shape_out(out, np.ndim(charge) == 0 and np.ndim(field) == 0)


def streamer_stability_field(pressure: npt.ArrayLike, temperature: npt.ArrayLike = T_ROOM, *,
                             reduced_field: float = AIR_STABILITY_REDUCED_FIELD) -> float | np.ndarray:
    """Streamer stability field E_st = (E/p)_st · p · (293.15 K / T), the field a streamer discharge leaves behind.

    Proportional to the gas density and independent of the void size. Air, positive streamers:
    (E/p)_st ≈ 5 V/(Pa m) = 0.5 kV/(mm·bar), so E_st = 0.507 MV/m at 101325 Pa and 293.15 K.

    Validity: streamer discharges (p·l well above the Paschen minimum); the reduced value is for air and from
    memory (physics brief §3.2); other gases need their own ``reduced_field``.

    Parameters
    ----------
    pressure : array_like
        Gas pressure p [Pa], > 0.
    temperature : array_like, optional
        Gas temperature T [K], > 0.
    reduced_field : float, optional
        (E/p)_st at 293.15 K [V/(Pa m)], > 0.

    Returns
    -------
    float or numpy.ndarray
        E_st [V/m].

    References
    ----------
    niemeyer1995 (residual field tied to the streamer propagation field), gutfleisch1995.
    """
    r = check_range("reduced_field", reduced_field, 0.0, 1e3, low_open=True, unit="V/(Pa m)")
    p, s1 = _values("pressure", pressure, unit="Pa")
    t, s2 = _values("temperature", temperature, unit="K")
    p, t = _broadcast(pressure=p, temperature=t)
    return _shape_out(r * p * (T_ROOM / t), s1 and s2)

