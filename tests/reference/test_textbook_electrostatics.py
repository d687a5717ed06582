"""Standard electrostatic limits of a dielectric ellipsoid (void) in a uniform field.

Sources (reference/textbook_electrostatics/source.toml): J. A. Stratton, Electromagnetic Theory (1941),
§3.25-3.27 (dielectric ellipsoid and sphere in a uniform field; section numbers from memory); the
series-capacitor (layered dielectric) result of elementary electrostatics; Pedersen's induced charge for a
sphere as written in the physics brief §2.3 (crichton1989, from memory).
"""

from __future__ import annotations

import math

import pytest

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

PERMITTIVITIES = [1.0, 2.3, 3.6, 4.4, 10.0, 100.0]


@pytest.mark.parametrize("er", PERMITTIVITIES)
def test_sphere_field_enhancement(er):
    # Source: Stratton 1941 (sphere in a uniform field): E_inside = 3 εr/(2 εr + 1) E0 for a gas sphere
    # (εg = 1).
    n = depolarization_spheroid(1e-3, 1e-3)
    assert field_enhancement(er, n) == pytest.approx(3 * er / (2 * er + 1), rel=1e-15)


@pytest.mark.parametrize("er", PERMITTIVITIES)
def test_flat_disc_limit_is_permittivity(er):
    # Source: Stratton 1941 / continuity of normal D: a thin gas disc across the field carries E = εr E0
    # (N → 1).
    assert field_enhancement(er, 1.0) == pytest.approx(er, rel=1e-15)
    n = depolarization_spheroid(1.0, 1e-9)  # height/diameter = 1e-9: 1 − N ≈ (π/2)·1e-9
    assert field_enhancement(er, n) == pytest.approx(er, rel=2 * er * 1e-9)


@pytest.mark.parametrize("er", PERMITTIVITIES)
def test_needle_limit_is_one(er):
    # Source: Stratton 1941 / continuity of tangential E: a thin needle along the field carries E = E0
    # (N → 0).
    assert field_enhancement(er, 0.0) == 1.0
    n = depolarization_spheroid(1e-6, 1.0)  # N ≈ ρ² (ln(2/ρ) − 1) ≈ 1.4e-11 for ρ = 1e-6
    assert field_enhancement(er, n) == pytest.approx(1.0, abs=1e-10 * er)


def test_no_contrast_gives_no_enhancement():
    # Source: Stratton 1941 (ellipsoid of the host's own permittivity does not disturb the field): εg = εr →
    # f = 1.
    for n in (0.1, 1 / 3, 0.9):
        assert field_enhancement(3.6, n, gas_permittivity=3.6) == pytest.approx(1.0, rel=1e-15)


@pytest.mark.parametrize("er, n", [(4.0, 1 / 3), (2.3, 0.05), (3.6, 0.8)])
def test_pedersen_k_form(er, n):
    # Source: physics brief §2.1 (crichton1989 K notation, from memory): f = K εr / (1 + εr (K − 1)), K = 1/N.
    k = 1.0 / n
    assert field_enhancement(er, n) == pytest.approx(k * er / (1 + er * (k - 1)), rel=1e-14)


@pytest.mark.parametrize("b, c", [(1.0, 2.0), (1.0, 1.0), (3.0, 0.5)])
def test_elliptic_cylinder_limit(b, c):
    # Source: Stratton 1941 / Osborn 1945 (from memory): for a → ∞ (elliptic cylinder with semi-axes b, c
    # across its length) N_c = b / (b + c). With a = 1e7 the correction is of order (bc/a²) ln(a) < 1e-12.
    assert depolarization_ellipsoid(1e7, b, c) == pytest.approx(b / (b + c), rel=1e-9)


def test_spheroid_transverse_factors():
    # Source: sum rule N_a + N_b + N_c = 1 (DLMF 19.33.8) with N_a = N_b for a spheroid: N_a = (1 − N_c)/2.
    d, h = 3.0, 1.2
    n_c = depolarization_spheroid(d, h)
    n_a = depolarization_ellipsoid(h / 2, d / 2, d / 2)  # field along an equatorial semi-axis
    assert n_a == pytest.approx((1 - n_c) / 2, rel=1e-13)


@pytest.mark.parametrize("er", [2.3, 4.0])
def test_induced_charge_sphere(er):
    # Source: physics brief §2.3 (Pedersen's induced charge, crichton1989 from memory): sphere (K = 3)
    #   q = 4π εr ε0 a³ ΔE / d.
    a, d, de = 0.5e-3, 10e-3, 1e6
    n = depolarization_spheroid(2 * a, 2 * a)
    q = induced_charge_per_field(er, n, spheroid_volume(2 * a, 2 * a), d) * de
    assert q == pytest.approx(4 * math.pi * er * EPSILON_0 * a**3 * de / d, rel=1e-14)
    # The same through the general ellipsoid functions.
    q2 = induced_charge_per_field(er, depolarization_ellipsoid(a, a, a), ellipsoid_volume(a, a, a), d) * de
    assert q2 == pytest.approx(q, rel=1e-14)


@pytest.mark.parametrize("er, t, d", [(4.0, 1e-3, 10e-3), (2.3, 0.1e-3, 2e-3), (1.0, 0.5e-3, 1e-3)])
def test_layered_slab_series_capacitors(er, t, d):
    # Source: elementary electrostatics (series dielectric layers, continuity of normal D): with V = 1 V,
    #   E_gas = εr E_solid and E_gas t + E_solid (d − t) = V  →  E_gas = εr V / (εr t + d − t).
    # Hand value for (4, 1 mm, 10 mm): f = 4·10/(4·1 + 9) = 40/13 = 3.076923...
    e_solid = 1.0 / (er * t + (d - t))
    e_gas = er * e_solid
    assert e_gas * t + e_solid * (d - t) == pytest.approx(1.0, rel=1e-15)  # the two layers share V
    assert layered_field_enhancement(er, t, d) == pytest.approx(e_gas * d, rel=1e-14)


def test_layered_slab_hand_value_and_thin_limit():
    # Source: series dielectric layers (hand arithmetic): εr = 4, t = 1 mm, d = 10 mm → 40/13.
    assert layered_field_enhancement(4.0, 1e-3, 10e-3) == pytest.approx(40.0 / 13.0, rel=1e-15)
    # t/d → 0: f → εr, the flat-disc limit of the ellipsoid (Stratton 1941).
    assert layered_field_enhancement(4.0, 1e-12, 1e-2) == pytest.approx(4.0, rel=1e-9)
