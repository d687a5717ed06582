"""Effective ionisation of air (Morrow & Lowke 1997) and SF6 (linear fit), the critical field, and the streamer
(ionisation-integral) criterion ∫ α_eff dx = K as an inception estimate independent of the streamer formula."""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt
from scipy import integrate, optimize

from pdvoid.core.errors import InputError, check_array, check_choice, check_range
from pdvoid.core.units import ATM, BOLTZMANN, T_ROOM
from pdvoid.physics.checks import broadcast as _broadcast
from pdvoid.physics.checks import shape_out as _shape_out
from pdvoid.physics.checks import values as _values
from pdvoid.physics.gas_density import density_equivalent_pressure

__all__ = [
    "morrow_lowke_coefficients",
    "effective_ionization_air",
    "critical_field_air",
    "ionization_integral_inception_field",
    "sf6_effective_ionization",
    "sf6_ionization_integral_inception_field",
    "streamer_integral",
    "SF6_SLOPE",
    "SF6_LIMITING_REDUCED_FIELD",
]

#: SF6 linear effective-ionisation fit, SI: 27.7 /kV and 88.6 kV/(cm bar) = 88.6 V/(Pa m). From memory.
SF6_SLOPE = 0.0277  # [1/V]
SF6_LIMITING_REDUCED_FIELD = 88.6  # [V/(Pa m)]

# Reduced-field bracket of the Morrow–Lowke root searches [V cm²]: 50 Td and 10 000 Td (1 Td = 1e-17 V cm²).
_X_LOW = 5.0e-16
_X_HIGH = 1.0e-13


# --------------------------------------------------------------------------------- ionisation coefficients
def _morrow_lowke_reduced(x: np.ndarray, n_cm: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """α/N, η2/N, η3/N [cm²] at reduced field x [V cm²] and density n_cm [1/cm³] (Morrow & Lowke 1997)."""
    alpha = np.where(x > 1.5e-15, 2.0e-16 * np.exp(-7.248e-15 / x), 6.619e-17 * np.exp(-5.593e-15 / x))
    eta2 = np.where(x > 1.05e-15, 8.889e-5 * x + 2.567e-19, np.maximum(6.089e-4 * x - 2.893e-19, 0.0))
    eta3 = n_cm * 4.7778e-59 * x ** -1.2749
    return alpha, eta2, eta3


def morrow_lowke_coefficients(field: npt.ArrayLike, gas_number_density: npt.ArrayLike
                              ) -> tuple[float | np.ndarray, float | np.ndarray, float | np.ndarray]:
    """Ionisation α, two-body attachment η2 and three-body attachment η3 of air (Morrow & Lowke fits).

    With E/N in V cm² and N in cm⁻³ (converted here from SI):
    α/N = 2.0e-16·exp(−7.248e-15/(E/N)) for E/N > 1.5e-15, else 6.619e-17·exp(−5.593e-15/(E/N));
    η2/N = 8.889e-5·(E/N) + 2.567e-19 for E/N > 1.05e-15, else max(6.089e-4·(E/N) − 2.893e-19, 0);
    η3/N = N·4.7778e-59·(E/N)^−1.2749.

    Validity: dry air; the fits were made for streamer simulation near atmospheric density. η3 grows as N², so
    far from 1 atm the attachment part is an extrapolation; above about 1000 Td the fits are extrapolated too.

    Parameters
    ----------
    field : array_like
        electric field magnitude E [V/m], > 0.
    gas_number_density : array_like
        N [1/m³], > 0.

    Returns
    -------
    tuple[float | numpy.ndarray, float | numpy.ndarray, float | numpy.ndarray]
        (alpha, eta2, eta3) [1/m], floats or arrays.

    References
    ----------
    morrow1997 (appendix; coefficients confirmed against independent public code copies).
    """
    e, s1 = _values("field", field, unit="V/m")
    n, s2 = _values("gas_number_density", gas_number_density, unit="1/m³")
    e, n = _broadcast(field=e, gas_number_density=n)
    n_cm = n * 1e-6
    x = (e * 1e-2) / n_cm
    per_m = 100.0 * n_cm
    alpha, eta2, eta3 = (per_m * c for c in _morrow_lowke_reduced(x, n_cm))
    scalar = s1 and s2
    return _shape_out(alpha, scalar), _shape_out(eta2, scalar), _shape_out(eta3, scalar)


def effective_ionization_air(field: npt.ArrayLike, pressure: npt.ArrayLike = ATM,
                             temperature: npt.ArrayLike = T_ROOM) -> float | np.ndarray:
    """Effective ionisation coefficient of air α_eff = α − η2 − η3 (Morrow & Lowke), N = p/(k_B T).

    Parameters
    ----------
    field : array_like
        electric field magnitude E [V/m], > 0.
    pressure : array_like, optional
        gas pressure p [Pa], > 0.
    temperature : array_like, optional
        gas temperature T [K], > 0.

    Returns
    -------
    float or numpy.ndarray
        α_eff [1/m]; negative where attachment wins.

    References
    ----------
    morrow1997 (see :func:`morrow_lowke_coefficients` for the fits and their validity).
    """
    p, s1 = _values("pressure", pressure, unit="Pa")
    t, s2 = _values("temperature", temperature, unit="K")
    e, s3 = _values("field", field, unit="V/m")
    alpha, eta2, eta3 = morrow_lowke_coefficients(e, p / (BOLTZMANN * t))
    return _shape_out(np.asarray(alpha - eta2 - eta3), s1 and s2 and s3)


def _air_reduced_root(n_cm: float, target_per_cm: float, x_low: float, problem: str) -> float:
    """Reduced field x [V cm²] in [x_low, _X_HIGH] where α_eff(x) [1/cm] equals target_per_cm."""
    def h(x: float) -> float:
        alpha, eta2, eta3 = _morrow_lowke_reduced(np.asarray(x), np.asarray(n_cm))
        return float(n_cm * (alpha - eta2 - eta3)) - target_per_cm

    if not (h(x_low) < 0.0 < h(_X_HIGH)):
        raise InputError(problem)
    return optimize.brentq(h, x_low, _X_HIGH, xtol=1e-30, rtol=1e-13)


def _air_density_cm(pressure: float, temperature: float) -> float:
    p = check_range("pressure", pressure, 0.0, math.inf, low_open=True, unit="Pa")
    t = check_range("temperature", temperature, 0.0, math.inf, low_open=True, unit="K")
    return p / (BOLTZMANN * t) * 1e-6


def _no_critical_field(pressure: float, temperature: float) -> str:
    return (f"pressure {pressure!r} Pa at temperature {temperature!r} K: the Morrow-Lowke coefficients have "
            f"no field with alpha = eta between {_X_LOW / 1e-17:g} Td and {_X_HIGH / 1e-17:g} Td (density "
            "far outside the range of the fits)")


def critical_field_air(pressure: float = ATM, temperature: float = T_ROOM) -> float:
    """Critical field of air, where the Morrow–Lowke ionisation equals attachment (α = η2 + η3).

    Found with brentq on the reduced field between 50 Td and 10 000 Td. The bracket: at 50 Td (just above
    47.5 Td, where the lower η2 fit is clipped at zero) α/N ≈ 9e-22 cm² is far below η2/N ≈ 1.5e-20 cm², so
    α_eff < 0 at any density; at 10 000 Td α_eff > 0 unless N exceeds about 1e32 m⁻³. A single sign change
    in between was checked on a fine grid from 1 Pa to 10 MPa. At 1 atm and 293 K: 26.97 kV/cm (107.7 Td).

    Parameters
    ----------
    pressure : float, optional
        gas pressure p [Pa], > 0.
    temperature : float, optional
        gas temperature T [K], > 0.

    Returns
    -------
    float
        Critical field E_cr [V/m].

    References
    ----------
    morrow1997.
    """
    n_cm = _air_density_cm(pressure, temperature)
    x = _air_reduced_root(n_cm, 0.0, _X_LOW, _no_critical_field(pressure, temperature))
    return x * n_cm * 100.0


def ionization_integral_inception_field(length: float, pressure: float = ATM, temperature: float = T_ROOM,
                                        k_streamer: float = 9.15) -> float:
    """Uniform field E at which the streamer criterion α_eff(E)·l = K is met in air (Morrow–Lowke α_eff).

    An estimate of the inception field independent of the fitted streamer formula. brentq on the reduced field
    from the critical field (where α_eff·l − K = −K < 0) to 10 000 Td. α_eff rises monotonically on this
    bracket: its maximum lies near 12 800 Td, where dα/d(E/N) falls to the slope of the η2 fit. If even
    10 000 Td does not reach K, the gap × density is too small for a streamer (Townsend region) and
    :class:`~pdvoid.InputError` is raised. 1 mm at 1 atm, 293 K, K = 9.15: E·l = 4.665 kV.

    Validity: uniform field; dry air; roots well above about 1000 Td (sub-10 µm gaps at 1 atm) rely on
    extrapolated fits.

    Parameters
    ----------
    length : float
        gap length l along the field [m], > 0.
    pressure : float, optional
        gas pressure p [Pa], > 0.
    temperature : float, optional
        gas temperature T [K], > 0.
    k_streamer : float, optional
        ionisation-integral threshold K [-], in (0, 100]; 9.15–9.2 (avalanche of 1e4) or about
        18–20 (1e8).

    Returns
    -------
    float
        Inception field [V/m].

    References
    ----------
    morrow1997 (α, η), mikropoulos2009 (K about 9.2).
    """
    l = check_range("length", length, 0.0, math.inf, low_open=True, unit="m")
    k = check_range("k_streamer", k_streamer, 0.0, 100.0, low_open=True)
    n_cm = _air_density_cm(pressure, temperature)
    x_crit = _air_reduced_root(n_cm, 0.0, _X_LOW, _no_critical_field(pressure, temperature))
    problem = (f"ionization_integral_inception_field: length {l!r} m at pressure {pressure!r} Pa and "
               f"temperature {temperature!r} K is too short for a streamer: even at {_X_HIGH / 1e-17:g} Td "
               f"the ionisation integral stays below K = {k:g} (Townsend region; see paschen_voltage)")
    x = _air_reduced_root(n_cm, k / (l * 100.0), x_crit, problem)
    return x * n_cm * 100.0


def sf6_effective_ionization(
    field: npt.ArrayLike, pressure: npt.ArrayLike, temperature: npt.ArrayLike = T_ROOM, *, slope: float = SF6_SLOPE,
    limiting_reduced_field: float = SF6_LIMITING_REDUCED_FIELD,
) -> float | np.ndarray:
    """Linear fit of the effective ionisation of SF6: α̅/p = k·(E/p − (E/p)_lim), p density-equivalent.

    k = 27.7 /kV and (E/p)_lim = 88.6 kV/(cm bar) (from memory); in SI k = 0.0277 /V and
    (E/p)_lim = 88.6 V/(Pa m) (1 kV/(cm bar) = 1 V/(Pa m)). Validity: E/p near (E/p)_lim (roughly ±30 %,
    from memory); negative below (E/p)_lim (net attachment).

    Parameters
    ----------
    field : array_like
        field magnitude E [V/m], >= 0.
    pressure : array_like
        gas pressure p [Pa], > 0.
    temperature : array_like, optional
        gas temperature T [K], > 0.
    slope : float, optional
        k [1/V], > 0.
    limiting_reduced_field : float, optional
        (E/p)_lim [V/(Pa m)], > 0.

    Returns
    -------
    float or numpy.ndarray
        α̅ [1/m].

    References
    ----------
    pedersen1970 (from memory), niemeyer1995.
    """
    k = check_range("slope", slope, 0.0, math.inf, low_open=True, unit="1/V")
    elim = check_range("limiting_reduced_field", limiting_reduced_field, 0.0, math.inf, low_open=True,
                       unit="V/(Pa m)")
    e, s1 = _values("field", field, low_open=False, unit="V/m")
    p, s2 = _values("pressure", pressure, unit="Pa")
    t, s3 = _values("temperature", temperature, unit="K")
    e, p, t = _broadcast(field=e, pressure=p, temperature=t)
    peq = p * (T_ROOM / t)
    return _shape_out(k * (e - elim * peq), s1 and s2 and s3)


def sf6_ionization_integral_inception_field(length: float, pressure: float, temperature: float = T_ROOM,
                                            k_streamer: float = 10.5) -> float:
    """Uniform field where the linear SF6 fit meets α̅·l = K: E = p·((E/p)_lim + K/(k·p·l)), closed form.

    Equal to the streamer formula with n = 1 and B = K/(k·(E/p)_lim) = 4.278 Pa m for K = 10.5.

    Parameters
    ----------
    length : float
        gap length l [m], > 0.
    pressure : float
        gas pressure p [Pa], > 0.
    temperature : float, optional
        gas temperature T [K], > 0.
    k_streamer : float, optional
        threshold K [-], in (0, 100]; 10.5 for SF6 (from memory).

    Returns
    -------
    float
        Inception field [V/m].

    References
    ----------
    pedersen1970 (from memory), niemeyer1995.
    """
    l = check_range("length", length, 0.0, math.inf, low_open=True, unit="m")
    k = check_range("k_streamer", k_streamer, 0.0, 100.0, low_open=True)
    peq = float(density_equivalent_pressure(pressure, temperature))
    return peq * (SF6_LIMITING_REDUCED_FIELD + k / (SF6_SLOPE * peq * l))


def streamer_integral(field_values: npt.ArrayLike, positions: npt.ArrayLike, *, pressure: float = ATM,
                      temperature: float = T_ROOM, gas: str = "air", method: str = "trapezoid") -> float:
    """Ionisation integral ∫ α_eff(|E(x)|) dx along a field line from sampled field magnitudes.

    The caller chooses the path, usually the stretch of a field line where α_eff > 0 (the avalanche region);
    parts with α_eff < 0 are integrated as they are (the avalanche shrinks there). Compare the result with K
    (9.15–9.2 for air, 10.5 for SF6) for the streamer criterion.

    Parameters
    ----------
    field_values : array_like
        field magnitudes |E| at the samples [V/m], all > 0.
    positions : array_like
        sample positions along the line [m], strictly increasing, same length (>= 2).
    pressure : float, optional
        gas pressure p [Pa], > 0.
    temperature : float, optional
        gas temperature T [K], > 0.
    gas : str, optional
        "air" (Morrow–Lowke α_eff) or "sf6" (linear fit).
    method : str, optional
        "trapezoid" or "simpson" (scipy.integrate).

    Returns
    -------
    float
        ∫ α_eff dx [-].

    References
    ----------
    morrow1997 (air), pedersen1970 (SF6, from memory).
    """
    check_choice("gas", gas, ("air", "sf6"))
    check_choice("method", method, ("trapezoid", "simpson"))
    e = check_array("field_values", field_values, min_size=2)
    x = check_array("positions", positions, min_size=2)
    if e.size != x.size:
        raise InputError(f"field_values and positions must have equal length; got {e.size} and {x.size}")
    if np.any(e <= 0.0):
        i = int(np.flatnonzero(e <= 0.0)[0])
        raise InputError(f"field_values must be > 0 V/m (magnitudes); entry {i} is {e[i]!r}")
    if np.any(np.diff(x) <= 0.0):
        i = int(np.flatnonzero(np.diff(x) <= 0.0)[0]) + 1
        raise InputError(f"positions must be strictly increasing; entry {i} is {x[i]!r} after {x[i - 1]!r}")
    if gas == "air":
        a_eff = effective_ionization_air(e, pressure, temperature)
    else:
        a_eff = sf6_effective_ionization(e, pressure, temperature)
    rule = integrate.trapezoid if method == "trapezoid" else integrate.simpson
    return float(rule(a_eff, x=x))
