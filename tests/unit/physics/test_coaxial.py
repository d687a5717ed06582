"""Unit tests of pdvoid.physics.coaxial: the cylindrical-capacitor field, the weighting potential of the inner
conductor and the change of the field across a void, each against an independent value."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad

from pdvoid import InputError
from pdvoid.physics.coaxial import coaxial_field_per_volt, coaxial_field_variation, coaxial_weighting_potential

A, B = 8e-3, 13.5e-3  # conductor and insulation screen radii of the invented example cable [m]


def test_field_integrates_to_the_applied_voltage():
    # Source: definition of the potential difference, V = ∫ E dr from r_i to R (scipy quadrature, not the
    # closed form): the field per volt must integrate to exactly 1
    total, _ = quad(lambda r: coaxial_field_per_volt(r, A, B), A, B, epsabs=0.0, epsrel=1e-13)
    assert total == pytest.approx(1.0, rel=1e-12)


def test_field_from_gauss_law_and_the_textbook_capacitance():
    # Source: Gauss's law, E(r) = Q'/(2π ε r), with the textbook capacitance per length of a coaxial line,
    # C' = 2π ε / ln(R/r_i) (Kuffel, Zaengl & Kuffel 2000, electrostatic fields chapter, from memory), so
    # E/V = C'/(2π ε r); ε cancels (here ε = 2.3 ε0)
    eps = 2.3 * 8.8541878128e-12
    c_per_length = 2.0 * math.pi * eps / math.log(B / A)
    for r in (A, 10.5e-3, B):
        assert coaxial_field_per_volt(r, A, B) == pytest.approx(c_per_length / (2.0 * math.pi * eps * r), rel=1e-14)


def test_field_hand_value():
    # hand calculation: ln(13.5/8) = 0.523248, r ln(R/r_i) at 10.5 mm = 5.49411 mm, 1/that = 182.013 1/m
    assert coaxial_field_per_volt(10.5e-3, A, B) == pytest.approx(182.013, rel=1e-5)


def test_weighting_potential_ends_and_gradient():
    # Source: Pedersen's λ (physics brief §2.3): λ = 1 on the measuring (inner) conductor, 0 on the other;
    # its gradient, by central differences here, is the field per volt (both solve Laplace's equation with
    # the same boundary values)
    assert coaxial_weighting_potential(A, A, B) == pytest.approx(1.0, abs=1e-15)
    assert coaxial_weighting_potential(B, A, B) == pytest.approx(0.0, abs=1e-15)
    r, h = 11e-3, 1e-7
    grad = (coaxial_weighting_potential(r - h, A, B) - coaxial_weighting_potential(r + h, A, B)) / (2 * h)
    assert grad == pytest.approx(coaxial_field_per_volt(r, A, B), rel=1e-8)


def test_weighting_potential_solves_laplace():
    # Source: Laplace's equation in cylindrical coordinates, (1/r) d/dr (r dλ/dr) = 0, i.e. r dλ/dr is constant
    # (finite differences at three radii)
    h = 1e-7
    flux = [r * (coaxial_weighting_potential(r + h, A, B) - coaxial_weighting_potential(r - h, A, B)) / (2 * h)
            for r in (8.5e-3, 11e-3, 13e-3)]
    assert flux[0] == pytest.approx(flux[1], rel=1e-7) and flux[1] == pytest.approx(flux[2], rel=1e-7)


@pytest.mark.parametrize("eps", [1e-2, 1e-3])
def test_thin_wall_limit_is_the_plane_slab(eps):
    # Textbook limit R − r_i = d ≪ r_i: the coaxial field tends to the plane-slab field 1/d. Hand series at
    # mid-wall (r = r_i + d/2, ε = d/r_i): r ln(R/r_i) = d (1 + ε/2)(1 − ε/2 + ε²/3 − ...) = d (1 + ε²/12 + O(ε³)),
    # so the relative difference is ε²/12 (second order), and at the walls ±ε/2 (first order)
    a = 1.0
    d = eps * a
    mid = coaxial_field_per_volt(a + d / 2, a, a + d) * d
    assert 1.0 / mid - 1.0 == pytest.approx(eps**2 / 12.0, rel=0.05)
    assert coaxial_field_per_volt(a, a, a + d) * d == pytest.approx(1.0 + eps / 2.0, rel=eps)


def test_field_variation_across_a_void_by_hand():
    # hand: E ∝ 1/r, (1/(r − h/2) − 1/(r + h/2)) r = h r/(r² − h²/4); h = 1 mm, r = 10 mm: 10/(100 − 0.25)
    assert coaxial_field_variation(1e-3, 10e-3) == pytest.approx(10.0 / 99.75, rel=1e-14)
    e = coaxial_field_per_volt(np.array([9.5e-3, 10.5e-3]), 5e-3, 20e-3)
    assert (e[0] - e[1]) / coaxial_field_per_volt(10e-3, 5e-3, 20e-3) == pytest.approx(10.0 / 99.75, rel=1e-12)


def test_arrays_broadcast():
    r = np.linspace(A, B, 5)
    out = coaxial_field_per_volt(r, A, B)
    assert isinstance(out, np.ndarray) and out.shape == (5,)
    assert isinstance(coaxial_field_per_volt(10e-3, A, B), float)


@pytest.mark.parametrize(("args", "words"), [
    ((10e-3, 12e-3, 11e-3), "inner_radius must be smaller than outer_radius"),
    ((10e-3, 10e-3, 10e-3), "inner_radius must be smaller than outer_radius"),
    ((7e-3, A, B), "radius must lie in"),
    ((14e-3, A, B), "radius must lie in"),
    ((-1e-3, A, B), "radius"),
    ((10e-3, -A, B), "inner_radius"),
])
def test_bad_radii_are_refused(args, words):
    with pytest.raises(InputError, match=words):
        coaxial_field_per_volt(*args)
    with pytest.raises(InputError, match=words):
        coaxial_weighting_potential(*args)


def test_void_reaching_the_axis_is_refused():
    with pytest.raises(InputError, match="twice the radius"):
        coaxial_field_variation(2e-3, 1e-3)
