"""The void field in a conducting host (pdvoid.physics.conduction) against limits and an independent derivation."""

from __future__ import annotations

import math

import pytest
import scipy.constants as sc

import pdvoid
from pdvoid.physics.conduction import (
    arrhenius_conductivity,
    capacitive_void_enhancement,
    equivalent_void_conductivity,
    exponential_conductivity,
    resistive_void_enhancement,
    void_field_transfer,
    void_relaxation_time,
)
from pdvoid.physics.geometry import depolarization_spheroid, field_enhancement

EPS0 = sc.epsilon_0  # CODATA via scipy, independent of pdvoid's constant table


@pytest.mark.parametrize("n", [1e-3, 0.1, 1.0 / 3.0, 0.7, 0.99])
@pytest.mark.parametrize("er", [1.5, 2.3, 4.0, 10.0])
def test_transfer_limits_and_first_order_form(er, n):
    sigma = 1e-13
    tau = void_relaxation_time(er, n, sigma)
    # the closed form tau = eps0 (er (1 - N) + N) / ((1 - N) sigma), written out here
    assert tau == pytest.approx(EPS0 * (er * (1 - n) + n) / ((1 - n) * sigma), rel=1e-12)
    f_cap = capacitive_void_enhancement(er, n)
    f_res = resistive_void_enhancement(n, sigma)
    # s -> infinity: the perfect-dielectric enhancement of the existing model (pdvoid.physics.geometry)
    assert f_cap == pytest.approx(float(field_enhancement(er, n)), rel=1e-14)
    assert abs(void_field_transfer(1e13 / tau, er, n, sigma) - f_cap) < 1e-10 * f_res
    # s -> 0: steady DC, E_in = E0/(1 - N) for a non-conducting gas (issue 14, ellipsoid in a conducting host)
    assert f_res == pytest.approx(1.0 / (1.0 - n), rel=1e-14)
    assert abs(void_field_transfer(1e-13 / tau, er, n, sigma) - f_res) < 1e-10 * f_res
    # in between: H(s) = f_cap + (f_res - f_cap)/(1 + s tau) at real and imaginary s (partial fractions)
    for s in (0.3 / tau, 1.0 / tau, 7.0 / tau, 2j / tau, (1 + 1j) / tau):
        direct = void_field_transfer(s, er, n, sigma)
        assert abs(direct - (f_cap + (f_res - f_cap) / (1 + s * tau))) < 1e-12 * abs(direct)


def test_sphere_with_surface_conductance_against_a_boundary_value_solution():
    # Independent derivation (potential -E_in r cos(t) inside, -E0 r cos(t) + p cos(t)/r^2 outside, surface charge
    # rho_s = [eps_e (3 E0 - 2 E_in) - eps0 E_in] cos(t), charge balance d(rho_s)/dt = -sigma E_r,out +
    # 2 sigma_s E_in cos(t)/a from the surface current sigma_s E_t): in the Laplace domain
    # H(s) = 3 (s eps_e + sigma) / (s (2 eps_e + eps0) + 2 sigma + 2 sigma_s / a).
    er, sigma, sigma_s, a = 4.0, 1e-13, 1e-16, 0.5e-3
    eps_e = er * EPS0
    sigma_i = equivalent_void_conductivity(sigma_s, 2 * a)
    for s in (1e-4, 1e-2, 1.0, 3j, 1e3):
        expected = 3 * (s * eps_e + sigma) / (s * (2 * eps_e + EPS0) + 2 * sigma + 2 * sigma_s / a)
        got = void_field_transfer(s, er, 1.0 / 3.0, sigma, sigma_i)
        assert abs(got - expected) < 1e-12 * abs(expected)
    # its pole and DC value
    assert void_relaxation_time(er, 1 / 3, sigma, sigma_i) == pytest.approx(
        (2 * eps_e + EPS0) / (2 * sigma + 2 * sigma_s / a), rel=1e-12)
    assert resistive_void_enhancement(1 / 3, sigma, sigma_i) == pytest.approx(3 * sigma / (2 * sigma + 2 * sigma_s / a),
                                                                             rel=1e-12)


def test_limits_of_the_relaxation_time():
    # a perfect dielectric never relaxes; a needle (N -> 0) has f_cap = f_res = 1 (no enhancement either way)
    assert void_relaxation_time(4.0, 0.3, 0.0) == math.inf
    n = float(depolarization_spheroid(1e-6, 1.0))
    assert capacitive_void_enhancement(4.0, n) == pytest.approx(1.0, abs=1e-5)
    assert resistive_void_enhancement(n, 1e-12) == pytest.approx(1.0, abs=1e-5)
    # a conducting wall in a perfect dielectric: no DC field left in the void
    assert resistive_void_enhancement(0.3, 1e-30, 1e-12) == pytest.approx(0.0, abs=1e-15)


def test_conductivity_laws():
    # at the reference state both laws return the reference conductivity
    assert arrhenius_conductivity(1e-15, 1.0, 293.15) == pytest.approx(1e-15, rel=1e-15)
    assert exponential_conductivity(1e-15, 0.1, 293.15) == pytest.approx(1e-15, rel=1e-15)
    # Arrhenius factor written out with scipy's constants: exp(-(Ea/k)(1/T - 1/T0)), Ea = 0.8 eV, 20 -> 70 degC
    factor = math.exp(-(0.8 * sc.e / sc.k) * (1 / 343.15 - 1 / 293.15))
    assert arrhenius_conductivity(2e-16, 0.8, 343.15) == pytest.approx(2e-16 * factor, rel=1e-12)
    # field term: exp(gamma |E|), gamma = 5e-8 m/V at 20 kV/mm gives e^1
    assert arrhenius_conductivity(1e-15, 0.0, 293.15, field_coefficient=5e-8, field=-2e7) == pytest.approx(
        1e-15 * math.e, rel=1e-12)
    assert exponential_conductivity(1e-15, 0.1, 303.15) == pytest.approx(1e-15 * math.e, rel=1e-12)


@pytest.mark.parametrize("call", [
    lambda: void_relaxation_time(4.0, 1.0, 1e-12),
    lambda: void_relaxation_time(4.0, 0.3, -1e-12),
    lambda: void_relaxation_time(0.5, 0.3, 1e-12),
    lambda: resistive_void_enhancement(0.3, 0.0),
    lambda: void_field_transfer(0.0, 4.0, 0.3, 1e-12),
    lambda: void_field_transfer("x", 4.0, 0.3, 1e-12),
    lambda: equivalent_void_conductivity(1e-15, 0.0),
    lambda: arrhenius_conductivity(0.0, 1.0, 300.0),
    lambda: arrhenius_conductivity(1e-15, 1.0, 100.0),
    lambda: exponential_conductivity(1e-15, -0.1, 300.0),
])
def test_bad_input_is_refused(call):
    with pytest.raises(pdvoid.InputError):
        call()
