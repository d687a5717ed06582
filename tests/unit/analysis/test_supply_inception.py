"""Inception under each supply (pdvoid.analysis.supply_inception) against hand derivations and scipy.signal.lsim."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from scipy import signal

import pdvoid
from pdvoid.analysis.supply_inception import (
    dc_inception,
    repetitive_inception,
    supply_inception,
    transfer_magnitude,
    vlf_inception,
)
from pdvoid.coefficients import compute_coefficients
from pdvoid.core.units import EPSILON_0
from pdvoid.inputs.demo import demo_scenario
from pdvoid.models.time_domain import conduction_coefficients


def _scenario(supply, sigma=0.0, sigma_s=0.0, **model):
    sc = demo_scenario()  # a sphere (diameter = height): N = 1/3
    changes = {"insulation.conductivity": sigma, "void.surface_conductivity": sigma_s}
    changes.update({f"model.{k}": v for k, v in model.items()})
    return dataclasses.replace(sc.replace(**changes), supply=supply)


def _einc_d(sc):
    c = compute_coefficients(sc)
    return c.inception_field, c.residual_field, sc.insulation.thickness, c.field_enhancement


def test_dc_inception_is_set_by_the_resistive_enhancement_of_a_sphere():
    sc = _scenario(pdvoid.DC(30e3), sigma=1e-12)
    e_inc, _, d, _ = _einc_d(sc)
    r = dc_inception(sc)
    # hand: a sphere in a conducting host, non-conducting gas: f_res = 1/(1 - 1/3) = 3/2 (Wagner-Sillars limit)
    assert r.inception_voltage == pytest.approx(e_inc * d / 1.5, rel=1e-12)
    assert r.extinction_voltage == r.inception_voltage  # the field recovers to E_inf after each discharge
    # f_cap = 3 er/(2 er + 1) < 3/2: the switch-on field rises monotonically, its peak is the steady one
    assert r.transient_inception_voltage == pytest.approx(r.inception_voltage, rel=1e-9)
    # hand: tau = eps0 (2 er + 1)/(2 sigma) for a sphere
    er = sc.insulation.permittivity
    assert r.relaxation_time == pytest.approx(EPSILON_0 * (2 * er + 1) / (2 * 1e-12), rel=1e-12)


@pytest.mark.parametrize("rise", [0.0, 3.0, 40.0])
def test_switch_on_transient_with_a_conducting_wall_against_the_ramp_response(rise):
    sc = _scenario(pdvoid.DC(30e3, rise_time=rise), sigma=1e-13, sigma_s=1e-14)
    e_inc, _, d, f_cap = _einc_d(sc)
    cond = conduction_coefficients(sc, compute_coefficients(sc))
    f_res, tau = cond.resistive_enhancement, cond.relaxation_time
    assert f_res < f_cap  # the wall conduction pulls the steady field below the capacitive one
    # hand: during a linear rise over r the lagging part reaches w(r) = 1 - (tau/r)(1 - exp(-r/tau)) of its final
    # value; the field peaks at the end of the rise, then relaxes to f_res (w -> 0 for r -> 0: a step to f_cap)
    w = 0.0 if rise == 0.0 else 1.0 - tau / rise * (1.0 - math.exp(-rise / tau))
    peak = f_cap + (f_res - f_cap) * w
    r = dc_inception(sc)
    assert r.transient_inception_voltage == pytest.approx(e_inc * d / peak, rel=1e-9)
    assert r.inception_voltage == pytest.approx(e_inc * d / f_res, rel=1e-12)


def test_dc_in_a_perfect_dielectric_has_no_repetitive_inception():
    sc = _scenario(pdvoid.DC(30e3))
    e_inc, _, d, f_cap = _einc_d(sc)
    r = dc_inception(sc)
    assert math.isinf(r.inception_voltage)
    assert r.transient_inception_voltage == pytest.approx(e_inc * d / f_cap, rel=1e-12)  # the step at switch-on
    assert any("perfect dielectric" in n for n in r.notes)


def test_polarity_reversal_of_an_uncharged_void_after_a_long_hold():
    # hold 50 tau: the field is f_res V/d at the reversal; a fast ramp (<< tau) adds -2 f_cap V/d (hand)
    sigma = 1e-12
    sc0 = _scenario(pdvoid.DC(30e3), sigma=sigma)
    tau = dc_inception(sc0).relaxation_time
    sc = _scenario(pdvoid.PolarityReversal(30e3, hold_time=50 * tau, ramp_time=1e-6 * tau), sigma=sigma)
    e_inc, _, d, f_cap = _einc_d(sc)
    after = abs(1.5 - 2 * f_cap)
    r = dc_inception(sc)
    assert r.transient_inception_voltage == pytest.approx(e_inc * d / max(after, 1.5), rel=1e-5)


def _h_hand(w, f_cap, f_res, tau):
    # hand: H(jw) = f_cap + (f_res - f_cap)/(1 + j w tau), split into real and imaginary parts
    x = w * tau
    re = (f_res + f_cap * x * x) / (1 + x * x)
    im = -(f_res - f_cap) * x / (1 + x * x)
    return math.hypot(re, im)


def test_vlf_sine_through_the_transfer_at_omega():
    sc0 = _scenario(pdvoid.Sine(10e3, frequency=0.1), sigma=1.0)
    c = compute_coefficients(sc0)
    er = sc0.insulation.permittivity
    # choose sigma so that w tau = 1 at 0.1 Hz: tau = eps0 (2 er + 1)/(2 sigma) for a sphere
    sigma = EPSILON_0 * (2 * er + 1) / 2 * (2 * math.pi * 0.1)
    sc = _scenario(pdvoid.Sine(10e3, frequency=0.1), sigma=sigma)
    r = vlf_inception(sc)
    h = _h_hand(2 * math.pi * 0.1, c.field_enhancement, 1.5, 1.0 / (2 * math.pi * 0.1))
    # the peak is taken on 32768 samples per period: (pi/32768)^2/2 ~ 5e-9 relative at worst
    assert r.enhancement == pytest.approx(h, rel=1e-8)
    assert r.inception_voltage == pytest.approx(c.inception_field * sc.insulation.thickness / (math.sqrt(2) * h),
                                                rel=1e-8)
    assert transfer_magnitude(2 * math.pi * 0.1, c.field_enhancement, 1.5, 1.0 / (2 * math.pi * 0.1)) == \
        pytest.approx(h, rel=1e-12)
    # 50 Hz in the same host: w tau = 500, |H| within 1e-5 of f_cap (the capacitive limit)
    r50 = vlf_inception(_scenario(pdvoid.Sine(10e3, frequency=50.0), sigma=sigma))
    assert r50.enhancement == pytest.approx(c.field_enhancement, rel=1e-5)


def test_cosine_rectangular_against_lsim_of_the_first_order_system():
    er = demo_scenario().insulation.permittivity
    f = 0.1
    sigma = EPSILON_0 * (2 * er + 1) / 2 / 2.0  # tau = 2 s, a fifth of the period
    sup = pdvoid.CosineRectangular(10e3, frequency=f, transition_time=1.0)
    sc = _scenario(sup, sigma=sigma)
    c = compute_coefficients(sc)
    d = sc.insulation.thickness
    r = vlf_inception(sc)
    # independent: x = f_cap V/d + z, tau z' = G V - z, integrated with scipy.signal.lsim over 8 periods
    tau, g = 2.0, (1.5 - c.field_enhancement) / d
    t = np.linspace(0.0, 8.0 / f, 800_001)
    v = sup.pieces(t[-1]).voltage(t)
    _, z, _ = signal.lsim(([g], [tau, 1.0]), v, t)
    x = c.field_enhancement / d * v + z
    last = t >= 7.0 / f
    peak = np.max(np.abs(x[last])) / 10e3
    assert r.enhancement == pytest.approx(peak * d, rel=2e-4)
    # sigma = 0: the capacitive limit, the peak field f_cap V/d (hand)
    r0 = vlf_inception(_scenario(sup))
    assert r0.enhancement == pytest.approx(c.field_enhancement, rel=1e-9)
    assert r0.inception_voltage == pytest.approx(c.inception_field * d / c.field_enhancement, rel=1e-9)


@pytest.mark.parametrize("bipolar", [True, False])
def test_lag_free_rpdiv_and_rpdev_of_a_perfect_dielectric(bipolar):
    sc = _scenario(pdvoid.SquareWave(1e3, frequency=1e4, rise_time=1e-7, bipolar=bipolar))
    e_inc, e_res, d, f_cap = _einc_d(sc)
    r = repetitive_inception(sc)
    # hand: first discharge when the peak field f_cap V/d reaches E_inc (peak-to-peak 2V bipolar, V unipolar);
    # sustained on every edge while the swing per edge f_cap U_pp/d >= E_inc + E_res (field left at +-E_res)
    pp_per_peak = 2.0 if bipolar else 1.0
    assert r.lag_free_inception_voltage == pytest.approx(pp_per_peak * e_inc * d / f_cap, rel=1e-12)
    assert r.extinction_voltage == pytest.approx((e_inc + e_res) * d / f_cap, rel=1e-12)
    assert r.quantity == "peak-to-peak voltage"


def test_statistical_rpdiv_against_the_time_above_inception_by_hand():
    f, rise = 1e3, 400e-6
    sc = _scenario(pdvoid.SquareWave(1e3, frequency=f, rise_time=rise), ionization_rate=2e12)
    c = compute_coefficients(sc)
    n = c.volume_electron_rate
    assert math.log(2) / n < 0.5 / f  # the criterion can be met within the flat part
    r = repetitive_inception(sc)
    u_lf = r.lag_free_inception_voltage
    # hand: time per period with x >= E_inc = duty/f - rise*U_lf/U (trapezoid); P = 1 - exp(-N t) = 1/2 there
    expected = max(u_lf, rise * u_lf / (0.5 / f - math.log(2) / n))
    assert expected > u_lf
    assert r.inception_voltage == pytest.approx(expected, rel=1e-9)
    # a shorter rise time lowers the RPDIV towards the lag-free value (the lag window grows)
    fast = repetitive_inception(_scenario(pdvoid.SquareWave(1e3, frequency=f, rise_time=1e-7),
                                          ionization_rate=2e12))
    assert fast.inception_voltage == pytest.approx(u_lf, rel=1e-9) and fast.inception_voltage < r.inception_voltage


def test_supply_inception_dispatches_and_refuses_what_it_cannot_answer():
    sc = _scenario(pdvoid.DC(30e3), sigma=1e-12)
    assert supply_inception(sc).quantity == "DC voltage"
    pw = _scenario(pdvoid.PiecewiseLinear(times=(0.0, 1.0, 2.0), voltages=(0.0, 1e3, 1e3)), sigma=1e-12)
    with pytest.raises(pdvoid.InputError, match="PiecewiseLinear"):
        supply_inception(pw)
    with pytest.raises(pdvoid.InputError, match="SquareWave"):
        repetitive_inception(sc)
    with pytest.raises(pdvoid.InputError, match="probability"):
        repetitive_inception(_scenario(pdvoid.SquareWave(1e3, frequency=1e4, rise_time=1e-7)), probability=1.5)
    with pytest.raises(pdvoid.InputError, match="omega"):
        transfer_magnitude(-1.0, 1.0, 1.5, 1.0)


def _lag_free(sc):
    return dataclasses.replace(sc, model=dataclasses.replace(sc.model, lag_free=True))


def test_dc_inception_agrees_with_the_lag_free_time_domain_kernel():
    # independent path: the event kernel (pdvoid.kernels.conduction_events) on the same scenario
    sc = _scenario(pdvoid.DC(30e3), sigma=1e-12)
    u = dc_inception(sc).inception_voltage
    tau = dc_inception(sc).relaxation_time
    below = pdvoid.simulate(_lag_free(dataclasses.replace(sc, supply=pdvoid.DC(0.99 * u))), duration=30 * tau)
    above = pdvoid.simulate(_lag_free(dataclasses.replace(sc, supply=pdvoid.DC(1.01 * u))), duration=30 * tau)
    assert below.event_count == 0 and above.event_count > 0


def test_lag_free_rpdiv_agrees_with_the_time_domain_kernel():
    sc = _scenario(pdvoid.SquareWave(1e3, frequency=1e4, rise_time=1e-7))
    u_pp = repetitive_inception(sc).lag_free_inception_voltage
    runs = [pdvoid.simulate(_lag_free(dataclasses.replace(sc, supply=pdvoid.SquareWave(
        k * u_pp / 2, frequency=1e4, rise_time=1e-7))), cycles=50) for k in (0.99, 1.01)]
    assert runs[0].event_count == 0 and runs[1].event_count > 0
