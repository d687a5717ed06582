"""Unit tests of pdvoid.physics.inception: formulas, vectorisation, density scaling and input validation."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from pdvoid import InputError
from pdvoid.inputs.materials import get_gas, load_gases
from pdvoid.physics.inception import (
    density_equivalent_pressure,
    empirical_air_breakdown_voltage,
    gas_inception_field,
    paschen_minimum,
    paschen_voltage,
    streamer_inception_field,
)
from pdvoid.physics.ionization import (
    critical_field_air,
    effective_ionization_air,
    ionization_integral_inception_field,
    morrow_lowke_coefficients,
    sf6_effective_ionization,
    sf6_ionization_integral_inception_field,
    streamer_integral,
)

# illias2011 / niemeyer1995, from memory
AIR = dict(critical_reduced_field=24.2, b_constant=8.6, exponent=0.5)
TORR_CM = 101325.0 / 760.0 * 0.01
PASCHEN_AIR = dict(a_coefficient=15.0 / TORR_CM, b_coefficient=365.0 / TORR_CM, secondary_emission=0.01)


# ------------------------------------------------------------------------------------------- streamer formula
def test_streamer_formula_hand_values():
    # Source: hand evaluation of E = 24.2 p (1 + 8.6/sqrt(p l)) (physics brief §3.1 formula, constants
    # from memory)
    assert streamer_inception_field(101325.0, 1e-3, **AIR) == pytest.approx(4.547007578e6, rel=1e-9)
    # double pressure: 24.2 x 202650 x (1 + 8.6/sqrt(202.65)) = 7.866826206e6 V/m
    assert streamer_inception_field(202650.0, 1e-3, **AIR) == pytest.approx(7.866826206e6, rel=1e-9)
    # 1 cm at 1 atm: 24.2 x 101325 x (1 + 8.6/sqrt(1013.25)) = 3.114544011e6 V/m
    assert streamer_inception_field(101325.0, 1e-2, **AIR) == pytest.approx(3.114544011e6, rel=1e-9)


def test_streamer_temperature_enters_through_density():
    # Source: ideal gas (common practice): at 586.3 K and 1 atm the density equals 50662.5 Pa at 293.15 K.
    # Hand value: 24.2 x 50662.5 x (1 + 8.6/sqrt(50.6625)) = 2.707380603e6 V/m.
    hot = streamer_inception_field(101325.0, 1e-3, temperature=586.3, **AIR)
    assert hot == pytest.approx(2.707380603e6, rel=1e-9)
    assert hot == pytest.approx(streamer_inception_field(50662.5, 1e-3, **AIR), rel=1e-12)
    assert density_equivalent_pressure(101325.0, 586.3) == pytest.approx(50662.5, rel=1e-12)


def test_streamer_without_b_is_critical_field():
    # Source: the formula with B = 0 reduces to (E/p)_cr p (physics brief §3.1).
    assert streamer_inception_field(1e5, 1e-3, critical_reduced_field=24.2, b_constant=0.0,
                                     exponent=0.5) == pytest.approx(24.2e5, rel=1e-15)


def test_streamer_vectorised_and_broadcast():
    # Source: same formula element by element (common practice for numpy functions).
    p = np.array([5e4, 1e5, 2e5])
    l = np.array([[1e-4], [1e-3]])
    out = streamer_inception_field(p, l, **AIR)
    assert out.shape == (2, 3)
    for i in range(2):
        for j in range(3):
            assert out[i, j] == pytest.approx(streamer_inception_field(p[j], l[i, 0], **AIR), rel=1e-14)
    assert isinstance(streamer_inception_field(1e5, 1e-3, **AIR), float)
    assert isinstance(streamer_inception_field(np.float64(1e5), np.array(1e-3), **AIR), float)


@settings(max_examples=60)
@given(p=st.floats(1e3, 1e6), l=st.floats(1e-5, 0.1), f=st.floats(1.01, 10.0))
def test_streamer_monotonic(p, l, f):
    # Source: the formula (niemeyer1995 form): E_inc falls with l, and rises with p for n <= 1.
    e = streamer_inception_field(p, l, **AIR)
    assert streamer_inception_field(p, l * f, **AIR) < e
    assert streamer_inception_field(p * f, l, **AIR) > e


@pytest.mark.parametrize("kwargs, match", [
    (dict(pressure=0.0), "pressure"),
    (dict(pressure=-1e5), "pressure"),
    (dict(pressure=math.nan), "pressure"),
    (dict(length=0.0), "length"),
    (dict(length=math.inf), "length"),
    (dict(temperature=0.0), "temperature"),
    (dict(critical_reduced_field=0.0), "critical_reduced_field"),
    (dict(b_constant=-1.0), "b_constant"),
    (dict(exponent=0.0), "exponent"),
    (dict(exponent=1.5), "exponent"),
    (dict(pressure="1 atm"), "pressure"),
    (dict(length=[1e-3, -1e-3]), r"length\[1\]"),
])
def test_streamer_rejects_bad_input(kwargs, match):
    # Source: project rules (InputError naming the parameter).
    args = dict(pressure=1e5, length=1e-3, temperature=293.15, **AIR)
    args.update(kwargs)
    with pytest.raises(InputError, match=match):
        streamer_inception_field(args.pop("pressure"), args.pop("length"), **args)


def test_incompatible_shapes_rejected():
    # Source: numpy broadcasting rules; pdvoid reports them as InputError.
    with pytest.raises(InputError, match="broadcast"):
        streamer_inception_field([1e5, 2e5], [1e-3, 2e-3, 3e-3], **AIR)


# ------------------------------------------------------------------------------------------------- Paschen
@settings(max_examples=60)
@given(gamma=st.floats(1e-4, 0.5), a=st.floats(1.0, 50.0), b=st.floats(50.0, 1000.0),
       f=st.floats(1.001, 20.0))
def test_paschen_minimum_is_minimum(gamma, a, b, f):
    # Source: derived (dV/d(pd) = 0 at (pd)_min, physics brief §6): the curve is higher on both sides.
    pd_min, v_min = paschen_minimum(a, b, gamma)
    kw = dict(a_coefficient=a, b_coefficient=b, secondary_emission=gamma)
    assert paschen_voltage(1.0, pd_min, **kw) == pytest.approx(v_min, rel=1e-9)
    assert paschen_voltage(1.0, pd_min * f, **kw) > v_min
    asym = math.log1p(1.0 / gamma) / a
    left = asym + (pd_min - asym) / f  # between the asymptote and the minimum
    assert paschen_voltage(1.0, left, **kw) > v_min


def test_paschen_array_with_one_bad_entry_raises():
    # Source: physics brief §6: no Townsend breakdown left of the asymptote; nothing is silently clipped.
    with pytest.raises(InputError, match="asymptote"):
        paschen_voltage(101325.0, np.array([1e-3, 1e-9]), **PASCHEN_AIR)
    out = paschen_voltage(101325.0, np.array([1e-3, 1e-2]), **PASCHEN_AIR)
    assert out.shape == (2,) and np.all(np.diff(out) > 0)


@pytest.mark.parametrize("bad", [dict(secondary_emission=0.0), dict(secondary_emission=1.5),
                                 dict(a_coefficient=-1.0), dict(b_coefficient=0.0)])
def test_paschen_rejects_bad_constants(bad):
    # Source: project rules; gamma in (0, 1], A > 0, B > 0.
    kw = dict(PASCHEN_AIR)
    kw.update(bad)
    with pytest.raises(InputError, match=next(iter(bad))):
        paschen_voltage(1e5, 1e-3, **kw)
    with pytest.raises(InputError, match=next(iter(bad))):
        paschen_minimum(kw["a_coefficient"], kw["b_coefficient"], kw["secondary_emission"])


def test_empirical_breakdown_validation_and_vector():
    # Source: lux_paschen formula evaluated at two gaps (4.345 kV, 30.30 kV; physics brief §6, derived).
    out = empirical_air_breakdown_voltage(np.array([1e-3, 1e-2]))
    np.testing.assert_allclose(out, [4344.6648, 30300.0], rtol=1e-7)
    with pytest.raises(InputError, match="gap"):
        empirical_air_breakdown_voltage(0.0)
    with pytest.raises(InputError, match="temperature"):
        empirical_air_breakdown_voltage(1e-3, temperature=-5.0)


# ------------------------------------------------------------------------------------------ Morrow-Lowke
def test_morrow_lowke_vectorised_matches_scalar():
    # Source: morrow1997 fits, element by element.
    n = 2.5e25
    e = np.array([1e6, 3e6, 1e7])
    alpha, eta2, eta3 = morrow_lowke_coefficients(e, n)
    for i, ei in enumerate(e):
        a, b, c = morrow_lowke_coefficients(float(ei), n)
        assert (alpha[i], eta2[i], eta3[i]) == pytest.approx((a, b, c), rel=1e-14)


def test_effective_ionization_uses_ideal_gas_density():
    # Source: N = p/(k_B T) (scipy.constants.k); alpha_eff = alpha - eta2 - eta3 (morrow1997).
    from scipy.constants import k as k_b
    n = 101325.0 / (k_b * 300.0)
    a, b, c = morrow_lowke_coefficients(3e6, n)
    assert effective_ionization_air(3e6, 101325.0, 300.0) == pytest.approx(a - b - c, rel=1e-14)


@pytest.mark.parametrize("call, match", [
    (lambda: morrow_lowke_coefficients(0.0, 2.5e25), "field"),
    (lambda: morrow_lowke_coefficients(3e6, -1.0), "gas_number_density"),
    (lambda: effective_ionization_air(3e6, 0.0), "pressure"),
    (lambda: critical_field_air(-1.0), "pressure"),
    (lambda: critical_field_air(101325.0, math.inf), "temperature"),
    (lambda: critical_field_air(1e30), "Morrow-Lowke"),
    (lambda: ionization_integral_inception_field(0.0), "length"),
    (lambda: ionization_integral_inception_field(1e-3, k_streamer=0.0), "k_streamer"),
    (lambda: ionization_integral_inception_field(1e-8, 1000.0), "too short for a streamer"),
])
def test_ionization_rejects_bad_input(call, match):
    # Source: project rules (InputError naming the parameter or the reason).
    with pytest.raises(InputError, match=match):
        call()


@settings(max_examples=25, deadline=None)
@given(l=st.floats(2e-4, 2e-2), f=st.floats(1.05, 5.0))
def test_ionization_integral_field_falls_with_length(l, f):
    # Source: the criterion alpha_eff(E) l = K with alpha_eff increasing in E above E_cr (morrow1997):
    # a longer gap needs a lower field, never below the critical field.
    e1 = ionization_integral_inception_field(l)
    e2 = ionization_integral_inception_field(l * f)
    assert critical_field_air() < e2 < e1


def test_sf6_fit_and_closed_form():
    # Source: linear fit (pedersen1970, from memory): alpha = 0 at E/p = 88.6 V/(Pa m); closed form of
    # alpha l = K.
    assert sf6_effective_ionization(88.6e5, 1e5) == pytest.approx(0.0, abs=1e-9)
    e = sf6_ionization_integral_inception_field(2e-3, 3e5, k_streamer=10.5)
    assert float(sf6_effective_ionization(e, 3e5)) * 2e-3 == pytest.approx(10.5, rel=1e-12)
    with pytest.raises(InputError, match="field"):
        sf6_effective_ionization(-1.0, 1e5)


# ---------------------------------------------------------------------------------------- streamer_integral
def test_streamer_integral_linear_field_simpson_vs_trapezoid():
    # Source: scipy.integrate: simpson and trapezoid converge to the same integral as samples are refined.
    x = np.linspace(0.0, 1e-3, 401)
    e = np.linspace(5e6, 3e6, x.size)
    t = streamer_integral(e, x, method="trapezoid")
    s = streamer_integral(e, x, method="simpson")
    assert t == pytest.approx(s, rel=1e-4)
    assert streamer_integral(e, x, gas="sf6", pressure=1e5) < 0.0  # below SF6's 8.86 MV/m at 1 bar


@pytest.mark.parametrize("fields, positions, match", [
    ([3e6], [0.0], "at least 2"),
    ([3e6, 3e6], [0.0, 1e-3, 2e-3], "equal length"),
    ([3e6, 0.0], [0.0, 1e-3], "field_values"),
    ([3e6, -3e6], [0.0, 1e-3], "field_values"),
    ([3e6, 3e6], [1e-3, 1e-3], "strictly increasing"),
    ([3e6, math.nan], [0.0, 1e-3], "finite"),
])
def test_streamer_integral_rejects_bad_samples(fields, positions, match):
    # Source: project rules.
    with pytest.raises(InputError, match=match):
        streamer_integral(fields, positions)


def test_streamer_integral_rejects_unknown_options():
    # Source: project rules (choices named in the message).
    with pytest.raises(InputError, match="gas"):
        streamer_integral([3e6, 3e6], [0.0, 1e-3], gas="nitrogen")
    with pytest.raises(InputError, match="method"):
        streamer_integral([3e6, 3e6], [0.0, 1e-3], method="romberg")


# ------------------------------------------------------------------------------------- gas_inception_field
def test_gas_inception_field_uses_parameter_set():
    # Source: gases.toml air constants (24.2, 8.6, 1/2) -> 4.547 MV/m at 1 mm, 1 atm (physics brief §3.1).
    assert gas_inception_field("air", 101325.0, 1e-3) == pytest.approx(4.547007578e6, rel=1e-9)
    assert gas_inception_field("air", 101325.0, 1e-3, criterion="ionization_integral") == pytest.approx(
        ionization_integral_inception_field(1e-3, 101325.0, k_streamer=get_gas("air").k_streamer), rel=1e-12)
    k = gas_inception_field("air", 101325.0, 1e-3, criterion="ionization_integral", k_streamer=18.42)
    assert k > gas_inception_field("air", 101325.0, 1e-3, criterion="ionization_integral")
    n2 = gas_inception_field("nitrogen", 101325.0, 1e-3)
    # nitrogen (E/p)_cr = 23.6208, derived in gases.toml so that 1 cm at 1 atm gives 30.4 kV (was 24.3)
    assert n2 == pytest.approx(4.547007578e6 * 23.6208 / 24.2, rel=1e-9)


def test_gas_inception_field_errors():
    # Source: project rules: unavailable criteria name what is available.
    with pytest.raises(InputError, match="air, sf6"):
        gas_inception_field("nitrogen", 1e5, 1e-3, criterion="ionization_integral")
    with pytest.raises(InputError, match="known: air, nitrogen, sf6"):
        gas_inception_field("argon", 1e5, 1e-3)
    with pytest.raises(InputError, match="criterion"):
        gas_inception_field("air", 1e5, 1e-3, criterion="townsend")
    with pytest.raises(InputError, match="k_streamer"):
        gas_inception_field("air", 1e5, 1e-3, k_streamer=9.0)


def test_gas_inception_field_accepts_user_gas(tmp_path):
    # Source: a user file with air's constants under another name gives air's numbers (round trip).
    text = """
[dry_air]
description = "user copy of air"
references = []
ionization_model = "morrow_lowke_air"
permittivity = {value = 1.0, unit = "1", status = "common practice", source = "user"}
critical_reduced_field = {value = 24.2, unit = "V/(Pa m)", status = "from memory", source = "user"}
b_constant = {value = 8.6, unit = "(Pa m)^n", status = "from memory", source = "user"}
exponent = {value = 0.5, unit = "1", status = "from memory", source = "user"}
k_streamer = {value = 9.15, unit = "1", status = "common practice", source = "user"}
"""
    path = tmp_path / "gases.toml"
    path.write_text(text, encoding="utf-8")
    gas = load_gases(path)["dry_air"]
    for criterion in ("streamer", "ionization_integral"):
        assert gas_inception_field(gas, 9e4, 2e-3, 300.0, criterion=criterion) == pytest.approx(
            gas_inception_field("air", 9e4, 2e-3, 300.0, criterion=criterion), rel=1e-12)
