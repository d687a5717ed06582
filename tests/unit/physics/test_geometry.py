"""Unit tests of pdvoid.physics.geometry: behaviour, properties and input validation."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.special import elliprd

from pdvoid import InputError
from pdvoid.core.units import EPSILON_0
from pdvoid.physics.geometry import (
    depolarization_ellipsoid,
    depolarization_spheroid,
    ellipsoid_volume,
    field_enhancement,
    induced_charge_per_field,
    layered_field_enhancement,
    spheroid_volume,
)

axis = st.floats(min_value=-3.0, max_value=3.0).map(lambda e: 10.0**e)  # log-uniform 1e-3 ... 1e3
ratio = st.floats(min_value=-6.0, max_value=6.0).map(lambda e: 10.0**e)  # aspect ratios 1e-6 ... 1e6
permittivity = st.floats(min_value=1.0, max_value=100.0)
depol = st.floats(min_value=0.0, max_value=1.0)


# --- properties ---------------------------------------------------------------------------------------------
@given(axis, axis, axis)
def test_sum_rule_random_triaxial(a, b, c):
    # Source: DLMF 19.33.8 (L_a + L_b + L_c = 4π) → N_a + N_b + N_c = 1.
    total = (
        depolarization_ellipsoid(b, c, a)
        + depolarization_ellipsoid(c, a, b)
        + depolarization_ellipsoid(a, b, c)
    )
    assert total == pytest.approx(1.0, rel=1e-12)


@given(ratio)
def test_spheroid_closed_forms_match_elliprd(r):
    # Source: scipy.special.elliprd (NIST DLMF 19.33.8) for a = b = 1, c = r; closed forms and near-sphere
    # series must agree to 1e-12 relative at any aspect ratio.
    assert depolarization_spheroid(2.0, 2.0 * r) == pytest.approx(
        r / 3.0 * elliprd(1.0, 1.0, r * r), rel=1e-12
    )


@given(st.floats(min_value=-1e-2, max_value=1e-2))
def test_spheroid_near_sphere_matches_elliprd(delta):
    # Source: scipy.special.elliprd (DLMF 19.33.8) around the sphere, where the closed forms cancel
    # (brief §2.2).
    c = 1.0 + delta
    assert depolarization_spheroid(2.0, 2.0 * c) == pytest.approx(
        c / 3.0 * elliprd(1.0, 1.0, c * c), rel=1e-12
    )


@given(ratio, ratio)
def test_spheroid_depolarization_monotone_in_flatness(r1, r2):
    # Source: common practice (a flatter void across the field depolarises more): N falls as
    # height/diameter grows.
    lo, hi = sorted((r1, r2))
    assert depolarization_spheroid(1.0, lo) >= depolarization_spheroid(1.0, hi)


@given(permittivity, permittivity, depol)
def test_field_enhancement_monotone_in_permittivity(e1, e2, n):
    # Source: Stratton 1941 (from memory) formula f = εr/(εr(1 − N) + N): non-decreasing in εr for N
    # in [0, 1].
    lo, hi = sorted((e1, e2))
    assert field_enhancement(lo, n) <= field_enhancement(hi, n) * (1 + 1e-15)


@given(permittivity, depol, depol)
def test_field_enhancement_monotone_in_depolarization(er, n1, n2):
    # Source: same formula: non-decreasing in N for εr >= 1; bounded by 1 (needle) and εr (disc).
    lo, hi = sorted((n1, n2))
    f_lo, f_hi = field_enhancement(er, lo), field_enhancement(er, hi)
    assert f_lo <= f_hi * (1 + 1e-15)
    assert 1.0 - 1e-15 <= f_lo and f_hi <= er * (1 + 1e-15)


# --- values and shapes --------------------------------------------------------------------------------------
def test_scalar_in_float_out_and_arrays_broadcast():
    # Source: common practice (API contract of pdvoid.physics: floats in → float out, arrays broadcast).
    assert type(depolarization_spheroid(1.0, 0.5)) is float
    assert type(field_enhancement(np.float64(4.0), np.array(0.5))) is float
    out = depolarization_spheroid(np.array([1.0, 2.0, 3.0]), 1.0)
    assert out.shape == (3,)
    out2 = field_enhancement(np.array([[2.0], [4.0]]), np.array([0.2, 0.5, 0.9]))
    assert out2.shape == (2, 3)
    assert out2[1, 1] == pytest.approx(4.0 / (4.0 * 0.5 + 0.5), rel=1e-15)  # formula by hand: 4/2.5 = 1.6
    assert depolarization_ellipsoid(np.ones(4), 2.0, np.array([1.0, 2.0, 3.0, 4.0])).shape == (4,)


def test_shape_mismatch_is_input_error():
    with pytest.raises(InputError, match="broadcast"):
        depolarization_spheroid(np.ones(3), np.ones(2))


def test_volumes():
    # Source: elementary geometry (common practice): (4/3)π abc; spheroid (π/6) D² h.
    assert ellipsoid_volume(1.0, 2.0, 3.0) == pytest.approx(8.0 * math.pi, rel=1e-15)
    assert spheroid_volume(2.0, 3.0) == pytest.approx(2.0 * math.pi, rel=1e-15)  # π/6·4·3
    assert spheroid_volume(2.0, 3.0) == pytest.approx(ellipsoid_volume(1.0, 1.0, 1.5), rel=1e-15)


def test_induced_charge_per_field_formula():
    # Source: physics brief §2.3 (Pedersen, crichton1989 from memory): K εr ε0 Ω / d with K = 1/N.
    # Hand value: N = 0.5, εr = 2, Ω = 1e-9 m³, d = 1e-2 m → 2·2·ε0·1e-9/1e-2 = 4e-7·ε0.
    assert induced_charge_per_field(2.0, 0.5, 1e-9, 1e-2) == pytest.approx(4e-7 * EPSILON_0, rel=1e-15)


@pytest.mark.parametrize(
    "diameter, height, e_dep, q_top",
    [
        (2.0, 2.0, 0.11111, 0.46542),  # sphere a = 1: Richardson-extrapolated FV -0.11095 / -0.46524
        (3.0, 1.5, 0.21800, 0.97428),  # oblate a = 1.5, c = 0.75 (N = 0.527200): FV -0.21790 / -0.97365
    ],
)
def test_finite_volume_check_of_brief(diameter, height, e_dep, q_top):
    # Source: physics brief §2.3 finite-volume verification (derived): ε0 = 1, εr = 4, plates at z = 0 and
    # d = 12, uniform free polarisation P = 1 in the void. Predicted counter-field ΔE = N P/(εr(1 − N) + N)
    # and induced charge q = K εr Ω ΔE/d (values above, 5 digits); the brief's extrapolated solver agrees
    # within 0.15 %.
    er, d = 4.0, 12.0
    n = depolarization_spheroid(diameter, height)
    de = n / (er * (1 - n) + n)
    assert de == pytest.approx(e_dep, abs=1e-5)
    q = induced_charge_per_field(er, n, spheroid_volume(diameter, height), d) / EPSILON_0 * de  # ε0 = 1 units
    assert q == pytest.approx(q_top, abs=1e-5)


def test_oblate_depolarization_value_of_brief():
    # Source: physics brief §2.3 (derived): oblate a = 1.5, c = 0.75 has N = 0.527200 (6 digits).
    assert depolarization_spheroid(3.0, 1.5) == pytest.approx(0.527200, abs=5e-7)


# --- validation ---------------------------------------------------------------------------------------------
bad_positive = st.one_of(
    st.sampled_from([math.nan, math.inf, -math.inf, 0.0, -0.0]),
    st.floats(max_value=-1e-300, allow_nan=False, allow_infinity=False),
)
bad_permittivity = st.one_of(
    st.sampled_from([math.nan, math.inf, 0.0]),
    st.floats(max_value=0.999999, allow_nan=False, allow_infinity=False),
)
bad_depolarization = st.one_of(
    st.sampled_from([math.nan, math.inf, -1e-9, 1.0 + 1e-9]),
    st.floats(max_value=-1e-300, allow_nan=False, allow_infinity=False),
    st.floats(min_value=1.000001, allow_nan=False, allow_infinity=False),
)

POSITIVE_ARGS = [
    (depolarization_ellipsoid, (1.0, 2.0, 3.0), (0, 1, 2)),
    (depolarization_spheroid, (1.0, 2.0), (0, 1)),
    (ellipsoid_volume, (1.0, 2.0, 3.0), (0, 1, 2)),
    (spheroid_volume, (1.0, 2.0), (0, 1)),
    (induced_charge_per_field, (4.0, 0.5, 1e-9, 1e-2), (2, 3)),
    (layered_field_enhancement, (4.0, 1e-3, 1e-2), (1, 2)),
]


@pytest.mark.parametrize("func, args, positions", POSITIVE_ARGS, ids=lambda x: getattr(x, "__name__", ""))
@settings(max_examples=25)
@given(bad=bad_positive, which=st.integers(0, 2))
def test_non_positive_or_non_finite_lengths_rejected(func, args, positions, bad, which):
    # Source: helper rules (common practice): NaN, ±inf, zero and negative lengths raise InputError.
    pos = positions[which % len(positions)]
    call = list(args)
    call[pos] = bad
    with pytest.raises(InputError):
        func(*call)
    call[pos] = np.array([1.0, bad])  # also inside an array
    with pytest.raises(InputError, match="entry 1"):
        func(*call)


@settings(max_examples=40)
@given(bad=bad_permittivity)
def test_permittivity_below_one_rejected(bad):
    # Source: helper rules: a host with εr < 1 is impossible; NaN/inf rejected.
    for func, args in [
        (field_enhancement, (bad, 0.5)),
        (field_enhancement, (4.0, 0.5, bad)),
        (induced_charge_per_field, (bad, 0.5, 1e-9, 1e-2)),
        (layered_field_enhancement, (bad, 1e-3, 1e-2)),
    ]:
        with pytest.raises(InputError, match="permittivity"):
            func(*args)


@settings(max_examples=40)
@given(bad=bad_depolarization)
def test_depolarization_outside_unit_interval_rejected(bad):
    # Source: helper rules; N lies in [0, 1] (sum rule, DLMF 19.33.8).
    with pytest.raises(InputError, match="depolarization"):
        field_enhancement(4.0, bad)
    with pytest.raises(InputError, match="depolarization"):
        induced_charge_per_field(4.0, bad, 1e-9, 1e-2)


def test_needle_depolarization_zero_rejected_for_charge():
    # K = 1/N is undefined at N = 0 (the needle limit needs Ω → 0 too).
    with pytest.raises(InputError, match="depolarization"):
        induced_charge_per_field(4.0, 0.0, 1e-9, 1e-2)


@given(t=st.floats(min_value=1e-3, max_value=10.0))
def test_void_taller_than_slab_rejected(t):
    # Source: helper rules (physically impossible): height >= thickness.
    with pytest.raises(InputError, match="height must be smaller than thickness"):
        layered_field_enhancement(4.0, t, 1e-3)


def test_error_message_names_parameter_and_value():
    with pytest.raises(InputError, match=r"diameter must lie in \(0, inf\) m; got -1.0"):
        depolarization_spheroid(-1.0, 1.0)
    with pytest.raises(InputError, match="real number"):
        depolarization_spheroid("1 mm", 1.0)
    with pytest.raises(InputError):
        depolarization_spheroid(True, 1.0)
