"""Inception of gas discharges in a void: streamer criterion, Paschen's law, ionisation integral.

Plain functions on floats (numpy arrays where the formula is closed-form). Pressure and temperature enter
through the gas density, written as the density-equivalent pressure p·T_ref/T with T_ref = 293.15 K
(:data:`pdvoid.core.units.T_ROOM`).

Two independent inception estimates are offered: the closed-form streamer inception field (Niemeyer-type
formula, constants fitted per gas) and the uniform-field ionisation integral ∫ α_eff dx = K with the
Morrow–Lowke coefficients of air (or the linear SF6 fit). For air at 1 atm and a 1 mm gap they agree within a
few per cent.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

import numpy as np
import numpy.typing as npt

from pdvoid.core.errors import InputError, check_choice, check_range
from pdvoid.core.units import ATM, T_ROOM
from pdvoid.physics.checks import broadcast as _broadcast
from pdvoid.physics.checks import shape_out as _shape_out
from pdvoid.physics.checks import values as _values
from pdvoid.physics.gas_density import density_equivalent_pressure
from pdvoid.physics.ionization import (
    critical_field_air,
    ionization_integral_inception_field,
    sf6_ionization_integral_inception_field,
)
from pdvoid.physics.townsend import InceptionResult, combine_criteria

if TYPE_CHECKING:
    from pdvoid.inputs.materials import GasData

__all__ = [
    "density_equivalent_pressure",
    "streamer_inception_field",
    "paschen_voltage",
    "paschen_minimum",
    "empirical_air_breakdown_voltage",
    "gas_inception_field",
    "inception_criterion",
]


# ----------------------------------------------------------------------------------------- streamer formula
def streamer_inception_field(pressure: npt.ArrayLike, length: npt.ArrayLike, *, critical_reduced_field: float,
                             b_constant: float, exponent: float,
                             temperature: npt.ArrayLike = T_ROOM) -> float | np.ndarray:
    """Streamer inception field of a gas gap: E_inc = (E/p)_cr · p · (1 + B / (p·l)^n).

    p is the density-equivalent pressure p·(293.15 K/T). Air (gases.toml): (E/p)_cr = 24.2 V/(Pa m),
    B = 8.6 Pa^½ m^½, n = ½, all from memory. For a 1 mm gap in air at 1 atm this gives 4.547 MV/m.

    Validity: streamer-type discharges, roughly 0.1 mm to a few cm at 1 atm (p·l about 10 to 1e4 Pa m; common
    practice). Which length l is meant (void extent along the field, i.e. the diameter of a sphere, or the
    radius) is a convention of the model using it; Illias et al. use the diameter (from memory).

    Parameters
    ----------
    pressure : array_like
        gas pressure p [Pa], > 0.
    length : array_like
        discharge length l along the field [m], > 0.
    critical_reduced_field : float
        (E/p)_cr [V/(Pa m)], > 0.
    b_constant : float
        B [(Pa m)^n], >= 0.
    exponent : float
        n [-], in (0, 1].
    temperature : array_like, optional
        gas temperature T [K], > 0.

    Returns
    -------
    float or numpy.ndarray
        Inception field E_inc [V/m] (the field inside the void).

    References
    ----------
    niemeyer1995 (generalised PD model, streamer inception formula; equation number not confirmed),
    gutfleisch1995 (from memory), illias2011 (air constants 24.2 V/(Pa m), 8.6 Pa^½ m^½, n = ½; from
    memory).
    """
    ecr = check_range("critical_reduced_field", critical_reduced_field, 0.0, math.inf, low_open=True,
                      unit="V/(Pa m)")
    b = check_range("b_constant", b_constant, 0.0, math.inf, unit="(Pa m)^n")
    n = check_range("exponent", exponent, 0.0, 1.0, low_open=True)
    p, s1 = _values("pressure", pressure, unit="Pa")
    l, s2 = _values("length", length, unit="m")
    t, s3 = _values("temperature", temperature, unit="K")
    p, l, t = _broadcast(pressure=p, length=l, temperature=t)
    peq = p * (T_ROOM / t)
    return _shape_out(ecr * peq * (1.0 + b / (peq * l) ** n), s1 and s2 and s3)


# ------------------------------------------------------------------------------------------------- Paschen
def paschen_voltage(pressure: npt.ArrayLike, gap: npt.ArrayLike, *, a_coefficient: float, b_coefficient: float,
                    secondary_emission: float, temperature: npt.ArrayLike = T_ROOM) -> float | np.ndarray:
    """Paschen's law (Townsend breakdown): V_b = B·pd / (ln(A·pd) − ln(ln(1 + 1/γ))).

    p is the density-equivalent pressure p·(293.15 K/T). Left of the asymptote, pd ≤ ln(1 + 1/γ)/A, the
    denominator is ≤ 0: no breakdown by the Townsend mechanism exists there, and this function raises
    :class:`~pdvoid.InputError` instead of returning a negative or infinite voltage.

    Validity: the A, B fit of air holds for E/p ≈ 100–800 V/(cm Torr) (from memory). At large pd (mm gaps and
    longer at 1 atm, E/p < 100 V/(cm Torr)) the formula over-predicts: 1 cm at 1 atm gives 35.5 kV against a
    measured ~30 kV. Use :func:`empirical_air_breakdown_voltage` there.

    Parameters
    ----------
    pressure : array_like
        gas pressure p [Pa], > 0.
    gap : array_like
        electrode gap d [m], > 0.
    a_coefficient : float
        A [1/(Pa m)], > 0 (air: 11.2509, i.e. 15 /(cm Torr)).
    b_coefficient : float
        B [V/(Pa m)], > 0 (air: 273.7725, i.e. 365 V/(cm Torr)).
    secondary_emission : float
        γ [-], in (0, 1] (air: 0.01).
    temperature : array_like, optional
        gas temperature T [K], > 0.

    Returns
    -------
    float or numpy.ndarray
        Breakdown voltage V_b [V].

    References
    ----------
    bazelyan1998 (air A, B, γ; confirmed via lux_paschen), raizer1991 (A, B table, validity range; from
    memory).
    """
    a = check_range("a_coefficient", a_coefficient, 0.0, math.inf, low_open=True, unit="1/(Pa m)")
    b = check_range("b_coefficient", b_coefficient, 0.0, math.inf, low_open=True, unit="V/(Pa m)")
    g = check_range("secondary_emission", secondary_emission, 0.0, 1.0, low_open=True)
    p, s1 = _values("pressure", pressure, unit="Pa")
    d, s2 = _values("gap", gap, unit="m")
    t, s3 = _values("temperature", temperature, unit="K")
    p, d, t = _broadcast(pressure=p, gap=d, temperature=t)
    pd = p * (T_ROOM / t) * d
    denominator = np.log(a * pd) - math.log(math.log1p(1.0 / g))
    if np.any(denominator <= 0.0):
        i = int(np.flatnonzero(denominator.ravel() <= 0.0)[0])
        asymptote = math.log1p(1.0 / g) / a
        raise InputError(
            f"paschen_voltage: pd = {pd.ravel()[i]:.6g} Pa m (density-equivalent pressure x gap) lies at or "
            f"left of the Paschen asymptote ln(1 + 1/gamma)/A = {asymptote:.6g} Pa m: no breakdown by the "
            "Townsend mechanism at any voltage; pd must be larger"
        )
    return _shape_out(b * pd / denominator, s1 and s2 and s3)


def paschen_minimum(a_coefficient: float, b_coefficient: float,
                    secondary_emission: float) -> tuple[float, float]:
    """Minimum of Paschen's curve: (pd)_min = e·ln(1 + 1/γ)/A, V_min = (e·B/A)·ln(1 + 1/γ).

    Derived from dV_b/d(pd) = 0 of :func:`paschen_voltage`. Air (A = 15 /(cm Torr), B = 365 V/(cm Torr),
    γ = 0.01) gives 305.27 V at 0.8363 Torr cm; the measured air minimum is about 327 V at 0.57 Torr cm.

    Parameters
    ----------
    a_coefficient : float
        A [1/(Pa m)], > 0.
    b_coefficient : float
        B [V/(Pa m)], > 0.
    secondary_emission : float
        γ [-], in (0, 1].

    Returns
    -------
    tuple[float, float]
        ((pd)_min [Pa m], V_min [V]) with p the density-equivalent pressure at 293.15 K.

    References
    ----------
    bazelyan1998, raizer1991 (the formula whose minimum this is).
    """
    a = check_range("a_coefficient", a_coefficient, 0.0, math.inf, low_open=True, unit="1/(Pa m)")
    b = check_range("b_coefficient", b_coefficient, 0.0, math.inf, low_open=True, unit="V/(Pa m)")
    g = check_range("secondary_emission", secondary_emission, 0.0, 1.0, low_open=True)
    c = math.log1p(1.0 / g)
    return math.e * c / a, math.e * b / a * c


def empirical_air_breakdown_voltage(gap: npt.ArrayLike, pressure: npt.ArrayLike = ATM,
                                    temperature: npt.ArrayLike = T_ROOM) -> float | np.ndarray:
    """Uniform-field breakdown voltage of air: U_b = 24.22·(δd) + 6.08·sqrt(δd) kV, d in cm.

    δ is the relative gas density p/101325 Pa · 293.15 K/T (the source writes 293 K; the 0.05 % difference is
    below the formula's accuracy). 1 mm at 1 atm gives 4.345 kV, 1 cm gives 30.30 kV.

    Validity: mm to cm gaps near atmospheric density (δd from about 0.05 to 10 cm); dry air.

    Parameters
    ----------
    gap : array_like
        electrode gap d [m], > 0.
    pressure : array_like, optional
        gas pressure p [Pa], > 0.
    temperature : array_like, optional
        gas temperature T [K], > 0.

    Returns
    -------
    float or numpy.ndarray
        Breakdown voltage U_b [V].

    References
    ----------
    lux_paschen (formula, confirmed), schumann1923 (usual attribution, from memory).
    """
    d, s1 = _values("gap", gap, unit="m")
    p, s2 = _values("pressure", pressure, unit="Pa")
    t, s3 = _values("temperature", temperature, unit="K")
    d, p, t = _broadcast(gap=d, pressure=p, temperature=t)
    x = (p / ATM) * (T_ROOM / t) * (d * 100.0)  # δ·d in cm
    return _shape_out(1e3 * (24.22 * x + 6.08 * np.sqrt(x)), s1 and s2 and s3)


def gas_inception_field(gas: str | GasData, pressure: float, length: float, temperature: float = T_ROOM,
                        criterion: str = "streamer", k_streamer: float | None = None, *,
                        secondary_emission: float | None = None, combined: bool = True) -> float:
    """Inception field of a named gas (or a :class:`pdvoid.inputs.materials.GasData`) from its parameter set.

    With ``combined=True`` (default) the value of :func:`inception_criterion`: the chosen streamer criterion
    joined with the Townsend criterion and the Paschen-minimum floor (``math.inf`` where no self-sustained
    discharge is possible; its ``reason`` says why). With ``combined=False`` the streamer criterion alone:
    "streamer" uses :func:`streamer_inception_field` with the gas's (E/p)_cr, B, n; "ionization_integral"
    uses the gas's ionisation model, Morrow–Lowke for air (:func:`ionization_integral_inception_field`) or the
    linear SF6 fit (:func:`sf6_ionization_integral_inception_field`), with K from the parameter set unless
    ``k_streamer`` is given. Other gases (e.g. nitrogen) have no ionisation model here.

    Validity: see :func:`inception_criterion` (combined) and the criteria used.

    Parameters
    ----------
    gas : str or GasData
        Gas name in the built-in parameter set ("air", "nitrogen", "sf6") or a GasData.
    pressure : float
        Gas pressure p [Pa], > 0.
    length : float
        Discharge length l [m], > 0.
    temperature : float
        Gas temperature T [K], > 0.
    criterion : str
        "streamer" or "ionization_integral".
    k_streamer : float, optional
        Threshold K [-] overriding the parameter set (ionization_integral only).
    secondary_emission : float, optional
        γ of the cathode wall [-] for the Townsend branch (default: the gas's reference γ).
    combined : bool
        Join with the Townsend branch (True) or return the streamer criterion alone.

    Returns
    -------
    float
        Inception field [V/m]; ``math.inf`` (combined only) where no self-sustained discharge is possible.

    References
    ----------
    niemeyer1995, illias2011, morrow1997, pedersen1970, bazelyan1998, hvc_paschen (see the functions used).
    """
    if combined:
        return inception_criterion(gas, pressure, length, temperature, criterion=criterion, k_streamer=k_streamer,
                                   secondary_emission=secondary_emission).field
    if secondary_emission is not None:
        raise InputError("secondary_emission applies only with combined=True (the Townsend branch)")
    return _streamer_criterion(gas, pressure, length, temperature, criterion, k_streamer)


def _streamer_criterion(gas: object, pressure: float, length: float, temperature: float, criterion: str,
                        k_streamer: float | None) -> float:
    data = _gas_data(gas)
    check_choice("criterion", criterion, ("streamer", "ionization_integral"))
    if criterion == "streamer":
        if k_streamer is not None:
            raise InputError("k_streamer applies only to criterion='ionization_integral'; "
                             "got criterion='streamer'")
        return float(streamer_inception_field(
            pressure, length, critical_reduced_field=data.critical_reduced_field, b_constant=data.b_constant,
            exponent=data.exponent, temperature=temperature))
    if data.ionization_model is None:
        from pdvoid.inputs.materials import get_gas, list_gases

        available = [g for g in list_gases() if get_gas(g).ionization_model is not None]
        raise InputError(f"criterion='ionization_integral' needs an ionisation model; gas {data.name!r} has "
                         f"none. Built-in gases with one: {', '.join(available)}")
    k = data.k_streamer if k_streamer is None else k_streamer
    if k is None:  # the gas file checks that an ionisation model comes with its K
        raise InputError(f"gas {data.name!r} has an ionisation model but no k_streamer; give k_streamer")
    if data.ionization_model == "morrow_lowke_air":
        return ionization_integral_inception_field(length, pressure, temperature, k_streamer=k)
    return sf6_ionization_integral_inception_field(length, pressure, temperature, k_streamer=k)


def _gas_data(gas: object) -> GasData:
    from pdvoid.inputs.materials import GasData, get_gas

    if isinstance(gas, GasData):
        return gas
    return get_gas(gas)  # type: ignore[arg-type]  # get_gas raises InputError for unknown names and non-strings


def inception_criterion(gas: str | GasData, pressure: float, length: float, temperature: float = T_ROOM, *,
                        criterion: str = "streamer", k_streamer: float | None = None,
                        secondary_emission: float | None = None) -> InceptionResult:
    """The gas-breakdown criterion valid from below the Paschen minimum to cm gaps, with its regime and reason.

    The streamer criterion named by ``criterion`` (see :func:`gas_inception_field` with ``combined=False``) is
    joined with the Townsend criterion and the Paschen-minimum floor of
    :mod:`pdvoid.physics.townsend`:

        E_inc = max(E_floor, min(E_Townsend, E_streamer))

    i.e. the discharge starts by whichever mechanism needs the lower field, but never below the measured lower
    envelope of the Paschen curve; left of the Paschen asymptote no self-sustained discharge exists and the
    field is ``math.inf`` (regime "no self-sustained discharge"). Where the ionisation integral cannot reach K
    at any field (gap too short for a streamer), its field counts as infinite and the Townsend branch decides.
    The rule and its sources are given in :func:`pdvoid.physics.townsend.combine_criteria`.

    Validity: p·l (density-equivalent pressure × length) from 0 to 1e4 Pa m (about 10 cm at 1 atm), with a
    :class:`~pdvoid.core.validity.ValidityWarning` above; for gases without Townsend constants (SF6) the
    streamer criterion alone, with a ValidityWarning below its range. Air with the streamer formula: within
    5 % of the empirical uniform-field curve from 0.1 mm to 1 cm at 1 atm, 327 V minimum near 0.57 Torr cm.

    Parameters
    ----------
    gas : str or GasData
        Gas name ("air", "nitrogen", "sf6") or a GasData.
    pressure : float
        Gas pressure p [Pa], > 0.
    length : float
        Discharge length l along the field [m], > 0.
    temperature : float
        Gas temperature T [K], > 0.
    criterion : str
        "streamer" (formula) or "ionization_integral".
    k_streamer : float, optional
        Threshold K [-] of the ionisation integral (default: the parameter set's).
    secondary_emission : float, optional
        γ of the cathode wall [-], in (0, 1] (default: the gas's reference γ, 0.01 for air and nitrogen).

    Returns
    -------
    pdvoid.physics.townsend.InceptionResult
        ``field`` [V/m] (possibly ``math.inf``), ``voltage`` [V], ``regime``, ``reason`` and the parts.

    References
    ----------
    niemeyer1995, illias2011, morrow1997, bazelyan1998, raizer1991, hvc_paschen, naidu2013, kuffel2000.
    """
    data = _gas_data(gas)
    try:
        e_s = _streamer_criterion(data, pressure, length, temperature, criterion, k_streamer)
    except InputError:
        if criterion != "ionization_integral" or data.ionization_model != "morrow_lowke_air":
            raise
        critical_field_air(pressure, temperature)  # re-raises when the density is outside the fits
        e_s = math.inf  # the gap is too short for a streamer at any field
    return combine_criteria(data, pressure, length, temperature, e_s, secondary_emission=secondary_emission,
                            criterion=criterion)
