"""Depolarisation factors against NIST DLMF §19.33(iii), eq. 19.33.8 (see reference/dlmf_19_33/source.toml).

DLMF gives L_c = (4π/3) a b c R_D(a², b², c²) in cgs units with L_a + L_b + L_c = 4π; the SI factor is
N_c = L_c/(4π). R_D is Carlson's symmetric integral, scipy.special.elliprd (Carlson 1995 algorithm).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad
from scipy.special import elliprd

from pdvoid.physics.geometry import depolarization_ellipsoid, depolarization_spheroid

REL = 1e-12  # double precision with room for a few tens of ulps (reference/dlmf_19_33/source.toml)


def dlmf_19_33_8(a: float, b: float, c: float) -> float:
    """Source: DLMF eq. 19.33.8 divided by 4π, evaluated directly with scipy.special.elliprd."""
    return (4.0 * math.pi / 3.0) * a * b * c * elliprd(a * a, b * b, c * c) / (4.0 * math.pi)


# (a, b, c) semi-axes, field along c
PROLATE = [(1.0, 1.0, 1.5), (1.0, 1.0, 3.0), (0.2, 0.2, 5.0), (1e-3, 1e-3, 1.0)]
OBLATE = [(1.5, 1.5, 1.0), (3.0, 3.0, 1.0), (5.0, 5.0, 0.2), (1.0, 1.0, 1e-4)]
TRIAXIAL = [(1.0, 2.0, 3.0), (3.0, 2.0, 1.0), (0.5, 4.0, 1.7), (10.0, 0.1, 1.0)]


@pytest.mark.parametrize("a, b, c", PROLATE + OBLATE + TRIAXIAL)
def test_eq_19_33_8_elliprd(a, b, c):
    # Source: DLMF 19.33.8 / (4π) via scipy.special.elliprd (NIST DLMF §19.33(iii)).
    assert depolarization_ellipsoid(a, b, c) == pytest.approx(dlmf_19_33_8(a, b, c), rel=REL)


@pytest.mark.parametrize("a, b, c", PROLATE + OBLATE)
def test_eq_19_33_8_spheroid_closed_forms(a, b, c):
    # Source: DLMF 19.33.8 (elliprd) for a = b; the closed spheroid forms (Osborn 1945, from memory) must
    # agree with it.
    assert depolarization_spheroid(2 * a, 2 * c) == pytest.approx(dlmf_19_33_8(a, a, c), rel=REL)


@pytest.mark.parametrize("ratio", [1 + 1e-7, 1 - 1e-7, 1 + 1e-4, 1 - 1e-4, 1 + 1e-3, 1 - 1e-3, 1.2, 0.8])
def test_eq_19_33_8_spheroid_near_sphere(ratio):
    # Source: DLMF 19.33.8 via scipy.special.elliprd; near the sphere the plain closed forms lose digits by
    # cancellation (about 1e-10 at c/a = 1 ± 1e-6, physics brief §2.2), so this guards the series branch.
    a, c = 1.0, ratio
    assert depolarization_spheroid(2 * a, 2 * c) == pytest.approx(dlmf_19_33_8(a, a, c), rel=REL)


def test_eq_19_33_8_spheroid_array_sweep():
    # Source: DLMF 19.33.8 via scipy.special.elliprd over aspect ratios 1e-6 ... 1e6 (both spheroid families
    # and both sides of the series/closed-form crossover near e² = 0.05).
    c = np.concatenate([np.logspace(-6, 6, 601), 1 + np.linspace(-0.1, 0.1, 401)])
    expected = c / 3.0 * elliprd(1.0, 1.0, c * c)  # a = b = 1
    np.testing.assert_allclose(depolarization_spheroid(2.0, 2.0 * c), expected, rtol=REL, atol=0)


def test_eq_19_33_8_sphere_is_one_third():
    # Source: DLMF 19.33.8 with a = b = c: R_D(x, x, x) = x^(-3/2) (direct from the integral
    # definition of R_D in the scipy.special.elliprd docs), so N = 1/3 exactly.
    assert depolarization_spheroid(2.0, 2.0) == 1.0 / 3.0
    assert depolarization_ellipsoid(0.7, 0.7, 0.7) == pytest.approx(1.0 / 3.0, rel=1e-15)


@pytest.mark.parametrize("a, b, c", TRIAXIAL + PROLATE + OBLATE)
def test_eq_19_33_8_sum_rule(a, b, c):
    # Source: DLMF 19.33.8, L_a + L_b + L_c = 4π, i.e. N_a + N_b + N_c = 1 (permuting the axes).
    total = (
        depolarization_ellipsoid(b, c, a)
        + depolarization_ellipsoid(c, a, b)
        + depolarization_ellipsoid(a, b, c)
    )
    assert total == pytest.approx(1.0, rel=1e-13)


@pytest.mark.parametrize("a, b, c", [(1.0, 2.0, 3.0), (2.5, 0.4, 1.1)])
def test_eq_19_33_8_integral_form_quadrature(a, b, c):
    # Source: integral form of DLMF 19.33.8 (R_D written as its defining integral), physics brief §2.2:
    #   N_c = (abc/2) ∫0^∞ ds / [(s + c²) sqrt((s + a²)(s + b²)(s + c²))], evaluated by scipy.integrate.quad,
    # independent of Carlson's duplication algorithm. Tolerance 1e-10: quadrature accuracy on [0, ∞).
    def integrand(s: float) -> float:
        return 1.0 / ((s + c * c) * math.sqrt((s + a * a) * (s + b * b) * (s + c * c)))

    head, _ = quad(integrand, 0.0, 10.0, epsabs=0.0, epsrel=1e-13, limit=200)
    tail, _ = quad(integrand, 10.0, math.inf, epsabs=0.0, epsrel=1e-13, limit=200)
    assert depolarization_ellipsoid(a, b, c) == pytest.approx(0.5 * a * b * c * (head + tail), rel=1e-10)


def test_eq_19_33_8_scale_invariance():
    # Source: DLMF 19.33.8 with R_D homogeneous of degree −3/2 (from its integral
    # definition, shown in the scipy.special.elliprd docs): N depends on the
    # axis ratios only. Checks that tiny and huge voids give the same factor as unit ones.
    n1 = depolarization_ellipsoid(1.0, 2.0, 3.0)
    assert depolarization_ellipsoid(1e-9, 2e-9, 3e-9) == pytest.approx(n1, rel=1e-14)
    assert depolarization_ellipsoid(1e9, 2e9, 3e9) == pytest.approx(n1, rel=1e-14)
