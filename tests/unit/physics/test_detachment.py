"""Detachment from O2⁻, the avalanche factor (1 − η/α) and the negative-ion population (pdvoid.physics.detachment),
and the kernel's copy of the hazard (pdvoid.kernels.memory_events)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import integrate

import pdvoid
from pdvoid.physics.detachment import (
    avalanche_start_probability,
    detachment_frequency_air,
    ion_drift_time,
    negative_ion_population,
    o2_detachment_rate_coefficients,
)
from pdvoid.physics.ionization import critical_field_air, morrow_lowke_coefficients

KB = 1.380649e-23  # CODATA 2018, exact
N_ATM = 101325.0 / (KB * 293.15)


def test_rate_coefficients_at_hand_values_of_the_reduced_field():
    # k = A·exp(−(B/(C + E/N))²) with E/N in Td (kossyi1992, from memory), evaluated by hand at 0, 100 and 1e5 Td:
    # 100 Td: 1.24e-11·exp(−(179/108.8)²) = 1.24e-11·exp(−2.70673) = 8.2785e-13 cm³/s
    k_n2, k_o2 = o2_detachment_rate_coefficients(100e-21)
    assert k_n2 == pytest.approx(1.24e-17 * 0.066766, rel=1e-4)
    assert k_o2 == pytest.approx(6.9e-16 * math.exp(-(198 / 105.6) ** 2), rel=1e-12)
    # the high-field limit is the prefactor; at zero field the rate is negligible (exp(−414) for N2)
    k_n2, k_o2 = o2_detachment_rate_coefficients(1e-16)
    assert k_n2 == pytest.approx(1.24e-17, rel=1e-5) and k_o2 == pytest.approx(6.9e-16, rel=1e-5)
    assert o2_detachment_rate_coefficients(0.0)[0] < 1e-190


def test_detachment_frequency_weights_the_air_components_and_rises_with_the_field():
    e = np.linspace(1e5, 3e7, 400)
    nu = detachment_frequency_air(e, 101325.0)
    k_n2, k_o2 = o2_detachment_rate_coefficients(e / N_ATM)
    np.testing.assert_allclose(nu, N_ATM * (0.79 * k_n2 + 0.21 * k_o2), rtol=1e-12)
    assert np.all(np.diff(nu) > 0.0)
    # at the critical field of air (26.97 kV/cm, 107.7 Td), by hand: N = 2.503e25 m⁻³, k_N2 = 1.170e-18 m³/s,
    # k_O2 = 3.255e-17 m³/s, so ν = N·(0.79·k_N2 + 0.21·k_O2) = 1.94e8 /s
    # to the 4 digits carried (an ion detaches in about 5 ns)
    assert detachment_frequency_air(critical_field_air(), 101325.0) == pytest.approx(1.94e8, rel=5e-3)


def test_avalanche_factor_is_zero_below_the_critical_field_and_one_minus_eta_over_alpha_above():
    ec = critical_field_air()  # α = η there (morrow1997)
    assert avalanche_start_probability(0.98 * ec, 101325.0) == 0.0
    assert avalanche_start_probability(0.0, 101325.0) == 0.0
    e = np.array([1.05 * ec, 2 * ec, 5 * ec])
    a, h2, h3 = morrow_lowke_coefficients(e, N_ATM)
    np.testing.assert_allclose(avalanche_start_probability(e, 101325.0), 1 - (h2 + h3) / a, rtol=1e-12)
    # 5 % above the critical field α grows by about exp(0.05·7.248/1.077) = 1.40 and η2 by about 5 %, so
    # 1 − η/α is about 1 − 1.05/1.40 = 0.25 (hand estimate from the fits' exponents)
    assert 0.15 < avalanche_start_probability(1.05 * ec, 101325.0) < 0.3
    assert avalanche_start_probability(10 * ec, 101325.0) > 0.95


def test_ion_population_solves_its_rate_equation():
    # dn/dt = S − n/τ integrated numerically (scipy.integrate.solve_ivp) against the closed form
    s, tau, n0 = 300.0, 2e-3, 1.7
    t = np.linspace(0.0, 1e-2, 21)
    ref = integrate.solve_ivp(lambda _t, n: s - n / tau, (0.0, 1e-2), [n0], t_eval=t, rtol=1e-11, atol=1e-13)
    np.testing.assert_allclose(negative_ion_population(t, n0, s, tau), ref.y[0], rtol=1e-8)
    assert negative_ion_population(2.0, 1.0, 3.0, math.inf) == pytest.approx(7.0)
    assert negative_ion_population(1e3, 0.0, 3.0, 1e-3) == pytest.approx(3e-3)  # steady state S·τ


def test_drift_time_by_hand():
    # 1.5 mm at 1 MV/m with 2.5 cm²/(V s): 1.5e-3/(2.5e-4·1e6) = 6 µs; half the pressure doubles the mobility
    assert ion_drift_time(1.5e-3, 1e6, 101325.0) == pytest.approx(6e-6)
    assert ion_drift_time(1.5e-3, 1e6, 101325.0 / 2) == pytest.approx(3e-6)


@pytest.mark.parametrize(("name", "value"), [("lifetime", 0.0), ("lifetime", -1.0), ("source", math.nan),
                                             ("initial", -1.0)])
def test_ion_population_refuses_bad_input(name, value):
    kw = {"initial": 0.0, "source": 1.0, "lifetime": 1.0, name: value}
    with pytest.raises(pdvoid.InputError, match=name):
        negative_ion_population(1.0, **kw)


def test_kernel_copy_of_the_hazard_matches_the_physics_and_its_bound_holds():
    from pdvoid.kernels import memory_events as M

    for p in (2e4, 101325.0, 3e5):
        n = p / (KB * 293.15)
        e = np.geomspace(1e4, 2e8, 600) * p / 101325.0
        ref = detachment_frequency_air(e, p) * avalanche_start_probability(e, p)
        got = np.array([M.detachment_hazard(x, n) for x in e])
        np.testing.assert_allclose(got, ref, rtol=1e-12, atol=0.0)
        bound = np.array([M.detachment_bound(x, n) for x in e])
        # the thinning bound at a field bounds the hazard at every lower field (running maximum)
        assert np.all(bound >= np.maximum.accumulate(got))
        assert np.all(np.diff(bound) >= 0.0)
