"""Inception of gas discharges in a void: streamer criterion, Paschen's law, ionisation integral.

Plain functions on floats (numpy arrays where the formula is closed-form). Pressure and temperature enter
through the gas density, written as the density-equivalent pressure p·T_ref/T with T_ref = 293.15 K
(:data:`pdvoid.units.T_ROOM`).

Two independent inception estimates are offered: the closed-form streamer inception field (Niemeyer-type
formula, constants fitted per gas) and the uniform-field ionisation integral ∫ α_eff dx = K with the
Morrow–Lowke coefficients of air (or the linear SF6 fit). For air at 1 atm and a 1 mm gap they agree within a
few per cent.
"""

from __future__ import annotations

import math

import numpy as np
from scipy import integrate, optimize

from ..errors import InputError, check_array, check_choice, check_nonnegative, check_positive, check_range
from ..units import ATM, BOLTZMANN, T_ROOM

__all__ = [
    "density_equivalent_pressure",
    "streamer_inception_field",
    "paschen_voltage",
    "paschen_minimum",
    "empirical_air_breakdown_voltage",
    "morrow_lowke_coefficients",
    "effective_ionization_air",
    "critical_field_air",
    "ionization_integral_inception_field",
    "sf6_effective_ionization",
    "sf6_ionization_integral_inception_field",
    "streamer_integral",
    "gas_inception_field",
]

#: SF6 linear effective-ionisation fit, SI: 27.7 /kV and 88.6 kV/(cm bar) = 88.6 V/(Pa m). From memory.
SF6_SLOPE = 0.0277  # [1/V]
SF6_LIMITING_REDUCED_FIELD = 88.6  # [V/(Pa m)]

# Reduced-field bracket of the Morrow–Lowke root searches [V cm²]: 50 Td and 10 000 Td (1 Td = 1e-17 V cm²).
_X_LOW = 5.0e-16
_X_HIGH = 1.0e-13


# ----------------------------------------------------------------------------------------------- validation
def _values(name: str, value: object, *, low: float = 0.0, low_open: bool = True, high: float = math.inf,
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


def _shape_out(result: np.ndarray, scalar: bool) -> float | np.ndarray:
    return float(result) if scalar else result


def _broadcast(**arrays: np.ndarray) -> list[np.ndarray]:
    try:
        return list(np.broadcast_arrays(*arrays.values()))
    except ValueError:
        shapes = ", ".join(f"{k} {np.shape(v)}" for k, v in arrays.items())
        raise InputError(f"array arguments must have broadcast-compatible shapes; got {shapes}") from None


def density_equivalent_pressure(pressure: object, temperature: object = T_ROOM) -> float | np.ndarray:
    """Pressure at 293.15 K with the same gas density: p·T_ref/T (ideal gas).

    Args:
        pressure: gas pressure p [Pa], > 0.
        temperature: gas temperature T [K], > 0.

    Returns:
        The density-equivalent pressure [Pa].
    """
    p, s1 = _values("pressure", pressure, unit="Pa")
    t, s2 = _values("temperature", temperature, unit="K")
    return _shape_out(p * (T_ROOM / t), s1 and s2)


# ----------------------------------------------------------------------------------------- streamer formula
def streamer_inception_field(pressure: object, length: object, *, critical_reduced_field: float,
                             b_constant: float, exponent: float,
                             temperature: object = T_ROOM) -> float | np.ndarray:
    """Streamer inception field of a gas gap: E_inc = (E/p)_cr · p · (1 + B / (p·l)^n).

    p is the density-equivalent pressure p·(293.15 K/T). Air (gases.toml): (E/p)_cr = 24.2 V/(Pa m),
    B = 8.6 Pa^½ m^½, n = ½, all from memory. For a 1 mm gap in air at 1 atm this gives 4.547 MV/m.

    Validity: streamer-type discharges, roughly 0.1 mm to a few cm at 1 atm (p·l about 10 to 1e4 Pa m; common
    practice). Which length l is meant (void extent along the field, i.e. the diameter of a sphere, or the
    radius) is a convention of the model using it; Illias et al. use the diameter (from memory).

    Args:
        pressure: gas pressure p [Pa], > 0.
        length: discharge length l along the field [m], > 0.
        critical_reduced_field: (E/p)_cr [V/(Pa m)], > 0.
        b_constant: B [(Pa m)^n], >= 0.
        exponent: n [-], in (0, 1].
        temperature: gas temperature T [K], > 0.

    Returns:
        Inception field E_inc [V/m] (the field inside the void).

    References:
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
def paschen_voltage(pressure: object, gap: object, *, a_coefficient: float, b_coefficient: float,
                    secondary_emission: float, temperature: object = T_ROOM) -> float | np.ndarray:
    """Paschen's law (Townsend breakdown): V_b = B·pd / (ln(A·pd) − ln(ln(1 + 1/γ))).

    p is the density-equivalent pressure p·(293.15 K/T). Left of the asymptote, pd ≤ ln(1 + 1/γ)/A, the
    denominator is ≤ 0: no breakdown by the Townsend mechanism exists there, and this function raises
    :class:`~pdvoid.InputError` instead of returning a negative or infinite voltage.

    Validity: the A, B fit of air holds for E/p ≈ 100–800 V/(cm Torr) (from memory). At large pd (mm gaps and
    longer at 1 atm, E/p < 100 V/(cm Torr)) the formula over-predicts: 1 cm at 1 atm gives 35.5 kV against a
    measured ~30 kV. Use :func:`empirical_air_breakdown_voltage` there.

    Args:
        pressure: gas pressure p [Pa], > 0.
        gap: electrode gap d [m], > 0.
        a_coefficient: A [1/(Pa m)], > 0 (air: 11.2509, i.e. 15 /(cm Torr)).
        b_coefficient: B [V/(Pa m)], > 0 (air: 273.7725, i.e. 365 V/(cm Torr)).
        secondary_emission: γ [-], in (0, 1] (air: 0.01).
        temperature: gas temperature T [K], > 0.

    Returns:
        Breakdown voltage V_b [V].

    References:
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

    Args:
        a_coefficient: A [1/(Pa m)], > 0.
        b_coefficient: B [V/(Pa m)], > 0.
        secondary_emission: γ [-], in (0, 1].

    Returns:
        ((pd)_min [Pa m], V_min [V]) with p the density-equivalent pressure at 293.15 K.

    References:
        bazelyan1998, raizer1991 (the formula whose minimum this is).
    """
    a = check_range("a_coefficient", a_coefficient, 0.0, math.inf, low_open=True, unit="1/(Pa m)")
    b = check_range("b_coefficient", b_coefficient, 0.0, math.inf, low_open=True, unit="V/(Pa m)")
    g = check_range("secondary_emission", secondary_emission, 0.0, 1.0, low_open=True)
    c = math.log1p(1.0 / g)
    return math.e * c / a, math.e * b / a * c


def empirical_air_breakdown_voltage(gap: object, pressure: object = ATM,
                                    temperature: object = T_ROOM) -> float | np.ndarray:
    """Uniform-field breakdown voltage of air: U_b = 24.22·(δd) + 6.08·sqrt(δd) kV, d in cm.

    δ is the relative gas density p/101325 Pa · 293.15 K/T (the source writes 293 K; the 0.05 % difference is
    below the formula's accuracy). 1 mm at 1 atm gives 4.345 kV, 1 cm gives 30.30 kV.

    Validity: mm to cm gaps near atmospheric density (δd from about 0.05 to 10 cm); dry air.

    Args:
        gap: electrode gap d [m], > 0.
        pressure: gas pressure p [Pa], > 0.
        temperature: gas temperature T [K], > 0.

    Returns:
        Breakdown voltage U_b [V].

    References:
        lux_paschen (formula, confirmed), schumann1923 (usual attribution, from memory).
    """
    d, s1 = _values("gap", gap, unit="m")
    p, s2 = _values("pressure", pressure, unit="Pa")
    t, s3 = _values("temperature", temperature, unit="K")
    d, p, t = _broadcast(gap=d, pressure=p, temperature=t)
    x = (p / ATM) * (T_ROOM / t) * (d * 100.0)  # δ·d in cm
    return _shape_out(1e3 * (24.22 * x + 6.08 * np.sqrt(x)), s1 and s2 and s3)


# --------------------------------------------------------------------------------- ionisation coefficients
def _morrow_lowke_reduced(x: np.ndarray, n_cm: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """α/N, η2/N, η3/N [cm²] at reduced field x [V cm²] and density n_cm [1/cm³] (Morrow & Lowke 1997)."""
    alpha = np.where(x > 1.5e-15, 2.0e-16 * np.exp(-7.248e-15 / x), 6.619e-17 * np.exp(-5.593e-15 / x))
    eta2 = np.where(x > 1.05e-15, 8.889e-5 * x + 2.567e-19, np.maximum(6.089e-4 * x - 2.893e-19, 0.0))
    eta3 = n_cm * 4.7778e-59 * x ** -1.2749
    return alpha, eta2, eta3


def morrow_lowke_coefficients(field: object, gas_number_density: object) -> tuple:
    """Ionisation α, two-body attachment η2 and three-body attachment η3 of air (Morrow & Lowke fits).

    With E/N in V cm² and N in cm⁻³ (converted here from SI):
    α/N = 2.0e-16·exp(−7.248e-15/(E/N)) for E/N > 1.5e-15, else 6.619e-17·exp(−5.593e-15/(E/N));
    η2/N = 8.889e-5·(E/N) + 2.567e-19 for E/N > 1.05e-15, else max(6.089e-4·(E/N) − 2.893e-19, 0);
    η3/N = N·4.7778e-59·(E/N)^−1.2749.

    Validity: dry air; the fits were made for streamer simulation near atmospheric density. η3 grows as N², so
    far from 1 atm the attachment part is an extrapolation; above about 1000 Td the fits are extrapolated too.

    Args:
        field: electric field magnitude E [V/m], > 0.
        gas_number_density: N [1/m³], > 0.

    Returns:
        (alpha, eta2, eta3) [1/m], floats or arrays.

    References:
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


def effective_ionization_air(field: object, pressure: object = ATM,
                             temperature: object = T_ROOM) -> float | np.ndarray:
    """Effective ionisation coefficient of air α_eff = α − η2 − η3 (Morrow & Lowke), N = p/(k_B T).

    Args:
        field: electric field magnitude E [V/m], > 0.
        pressure: gas pressure p [Pa], > 0.
        temperature: gas temperature T [K], > 0.

    Returns:
        α_eff [1/m]; negative where attachment wins.

    References:
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

    Args:
        pressure: gas pressure p [Pa], > 0.
        temperature: gas temperature T [K], > 0.

    Returns:
        Critical field E_cr [V/m].

    References:
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

    Args:
        length: gap length l along the field [m], > 0.
        pressure: gas pressure p [Pa], > 0.
        temperature: gas temperature T [K], > 0.
        k_streamer: ionisation-integral threshold K [-], in (0, 100]; 9.15–9.2 (avalanche of 1e4) or about
            18–20 (1e8).

    Returns:
        Inception field [V/m].

    References:
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
    field: object, pressure: object, temperature: object = T_ROOM, *, slope: float = SF6_SLOPE,
    limiting_reduced_field: float = SF6_LIMITING_REDUCED_FIELD,
) -> float | np.ndarray:
    """Linear fit of the effective ionisation of SF6: α̅/p = k·(E/p − (E/p)_lim), p density-equivalent.

    k = 27.7 /kV and (E/p)_lim = 88.6 kV/(cm bar) (from memory); in SI k = 0.0277 /V and
    (E/p)_lim = 88.6 V/(Pa m) (1 kV/(cm bar) = 1 V/(Pa m)). Validity: E/p near (E/p)_lim (roughly ±30 %,
    from memory); negative below (E/p)_lim (net attachment).

    Args:
        field: field magnitude E [V/m], >= 0.
        pressure: gas pressure p [Pa], > 0.
        temperature: gas temperature T [K], > 0.
        slope: k [1/V], > 0.
        limiting_reduced_field: (E/p)_lim [V/(Pa m)], > 0.

    Returns:
        α̅ [1/m].

    References:
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

    Args:
        length: gap length l [m], > 0.
        pressure: gas pressure p [Pa], > 0.
        temperature: gas temperature T [K], > 0.
        k_streamer: threshold K [-], in (0, 100]; 10.5 for SF6 (from memory).

    Returns:
        Inception field [V/m].

    References:
        pedersen1970 (from memory), niemeyer1995.
    """
    l = check_range("length", length, 0.0, math.inf, low_open=True, unit="m")
    k = check_range("k_streamer", k_streamer, 0.0, 100.0, low_open=True)
    peq = float(density_equivalent_pressure(pressure, temperature))
    return peq * (SF6_LIMITING_REDUCED_FIELD + k / (SF6_SLOPE * peq * l))


def streamer_integral(field_values: object, positions: object, *, pressure: float = ATM,
                      temperature: float = T_ROOM, gas: str = "air", method: str = "trapezoid") -> float:
    """Ionisation integral ∫ α_eff(|E(x)|) dx along a field line from sampled field magnitudes.

    The caller chooses the path, usually the stretch of a field line where α_eff > 0 (the avalanche region);
    parts with α_eff < 0 are integrated as they are (the avalanche shrinks there). Compare the result with K
    (9.15–9.2 for air, 10.5 for SF6) for the streamer criterion.

    Args:
        field_values: field magnitudes |E| at the samples [V/m], all > 0.
        positions: sample positions along the line [m], strictly increasing, same length (>= 2).
        pressure: gas pressure p [Pa], > 0.
        temperature: gas temperature T [K], > 0.
        gas: "air" (Morrow–Lowke α_eff) or "sf6" (linear fit).
        method: "trapezoid" or "simpson" (scipy.integrate).

    Returns:
        ∫ α_eff dx [-].

    References:
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


def gas_inception_field(gas: object, pressure: float, length: float, temperature: float = T_ROOM,
                        criterion: str = "streamer", k_streamer: float | None = None) -> float:
    """Inception field of a named gas (or a :class:`pdvoid.materials.GasData`) from its parameter set.

    criterion "streamer" uses :func:`streamer_inception_field` with the gas's (E/p)_cr, B, n;
    "ionization_integral" uses the gas's ionisation model: Morrow–Lowke for air
    (:func:`ionization_integral_inception_field`) or the linear SF6 fit
    (:func:`sf6_ionization_integral_inception_field`), with K from the parameter set unless ``k_streamer``
    is given. Other gases (e.g. nitrogen) have no ionisation model here.

    Args:
        gas: gas name in the built-in parameter set ("air", "nitrogen", "sf6") or a GasData.
        pressure: gas pressure p [Pa], > 0.
        length: discharge length l [m], > 0.
        temperature: gas temperature T [K], > 0.
        criterion: "streamer" or "ionization_integral".
        k_streamer: threshold K [-] overriding the parameter set (ionization_integral only).

    Returns:
        Inception field [V/m].

    References:
        niemeyer1995, illias2011, morrow1997, pedersen1970 (see the functions used).
    """
    from ..materials import GasData, get_gas, list_gases

    data = gas if isinstance(gas, GasData) else get_gas(gas)  # get_gas raises InputError for unknown names
    check_choice("criterion", criterion, ("streamer", "ionization_integral"))
    if criterion == "streamer":
        if k_streamer is not None:
            raise InputError("k_streamer applies only to criterion='ionization_integral'; "
                             "got criterion='streamer'")
        return float(streamer_inception_field(
            pressure, length, critical_reduced_field=data.critical_reduced_field, b_constant=data.b_constant,
            exponent=data.exponent, temperature=temperature))
    if data.ionization_model is None:
        available = [g for g in list_gases() if get_gas(g).ionization_model is not None]
        raise InputError(f"criterion='ionization_integral' needs an ionisation model; gas {data.name!r} has "
                         f"none. Built-in gases with one: {', '.join(available)}")
    k = data.k_streamer if k_streamer is None else k_streamer
    if data.ionization_model == "morrow_lowke_air":
        return ionization_integral_inception_field(length, pressure, temperature, k_streamer=k)
    return sf6_ionization_integral_inception_field(length, pressure, temperature, k_streamer=k)
