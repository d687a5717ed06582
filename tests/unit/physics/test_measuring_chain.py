"""The test circuit's charge transfer and the instrument's band-pass against hand derivations and scipy.signal."""

import math

import numpy as np
import pytest
from scipy import signal

from pdvoid.core.errors import InputError
from pdvoid.physics.bandpass import bandpass_zpk, impulse_residues, noise_moments, rice_crossing_rate
from pdvoid.physics.measuring_circuit import charge_transfer_ratio, circuit_time_constant


def test_charge_transfer_ratio_by_hand():
    # derived by hand (charge conservation, module docstring): Z_m with C_k -> C_k / (C_a + C_k + C_s);
    # Z_m with the test object -> (C_k + C_s) / (C_a + C_k + C_s)
    assert charge_transfer_ratio(1e-9, 1e-9) == pytest.approx(0.5, rel=1e-15)
    assert charge_transfer_ratio(2e-9, 0.5e-9, 0.5e-9) == pytest.approx(0.5 / 3.0, rel=1e-15)
    assert charge_transfer_ratio(2e-9, 0.5e-9, 0.5e-9, "test_object") == pytest.approx(1.0 / 3.0, rel=1e-15)
    # a large coupling capacitor passes nearly all of the charge (physics brief 1.3: q_m ~ q C_k/(C_a + C_k))
    assert charge_transfer_ratio(100e-12, 1e-6) == pytest.approx(1.0, abs=1e-3)


def test_circuit_time_constant_by_hand():
    # R_m times the two capacitances of the loop in series: 50 ohm * (1 nF in series with 1 nF) = 25 ns
    assert circuit_time_constant(50.0, 1e-9, 1e-9) == pytest.approx(25e-9, rel=1e-14)
    # Z_m with the test object: 50 * C_a (C_k + C_s) / total = 50 * 2n * 1n / 3n
    assert circuit_time_constant(50.0, 2e-9, 0.5e-9, 0.5e-9, "test_object") == pytest.approx(50 * 2e-9 / 3, rel=1e-14)


def test_bad_circuit_values_are_refused():
    with pytest.raises(InputError, match="coupling_capacitance"):
        charge_transfer_ratio(1e-9, -1e-9)
    with pytest.raises(InputError, match="arrangement"):
        charge_transfer_ratio(1e-9, 1e-9, arrangement="series")


@pytest.mark.parametrize(("f1", "f2", "order"), [(100e3, 500e3, 2), (30e3, 1e6, 1), (95.5e3, 104.5e3, 2),
                                                 (50e3, 59e3, 3)])
def test_bandpass_is_down_6_db_at_its_limits(f1, f2, order):
    # the limit frequencies of IEC 60270 (from memory) are where the response has fallen by 6 dB
    z, p, k = bandpass_zpk(f1, f2, order)
    _, h = signal.freqs_zpk(z, p, k, worN=2 * np.pi * np.array([f1, f2, math.sqrt(f1 * f2)]))
    np.testing.assert_allclose(np.abs(h), [0.5, 0.5, 1.0], rtol=1e-9)


@pytest.mark.parametrize(("f1", "f2", "order"), [(100e3, 500e3, 2), (95.5e3, 104.5e3, 2), (60e3, 900e3, 1)])
def test_impulse_response_matches_scipy(f1, f2, order):
    # the Heaviside expansion against scipy.signal.impulse of the same analog band-pass (independent numerics)
    z, p, k = bandpass_zpk(f1, f2, order)
    poles, res = impulse_residues(z, p, k)
    t = np.linspace(0.0, 12.0 / float(np.min(-p.real)), 4001)
    b, a = signal.zpk2tf(z, p, k)
    _, h_scipy = signal.impulse((b, a), T=t)
    h = np.real(np.exp(np.outer(t, poles)) @ res)
    np.testing.assert_allclose(h, h_scipy, atol=1e-7 * np.max(np.abs(h_scipy)))


def test_shaping_stage_matches_scipy_lsim():
    # the response to an exponential current pulse (time constant tau) equals lsim of the filter on that input
    z, p, k = bandpass_zpk(100e3, 500e3, 2)
    tau = 0.3e-6
    poles, res = impulse_residues(z, p, k, (tau,))
    t = np.linspace(0.0, 40e-6, 80001)
    u = np.exp(-t / tau) / tau
    _, y, _ = signal.lsim(signal.ZerosPolesGain(z, p, k), u, t, interp=True)
    ours = np.real(np.exp(np.outer(t, poles)) @ res)
    np.testing.assert_allclose(ours, y, atol=2e-3 * np.max(np.abs(y)))


def test_rice_rate_of_white_noise_through_the_bandpass():
    # Rice 1944: zero up-crossing rate sqrt(m2/m0)/(2 pi); check against a simulated Gaussian process made by
    # filtering white noise with the same band-pass (discretised by scipy's bilinear transform)
    z, p, k = bandpass_zpk(100e3, 500e3, 2)
    m0, m2 = noise_moments(z, p, k)
    fs = 40e6
    zd, pd, kd = signal.bilinear_zpk(z, p, k, fs)
    sos = signal.zpk2sos(zd, pd, kd)
    x = signal.sosfilt(sos, np.random.default_rng(3).standard_normal(2_000_000))[10000:]
    sigma = float(np.std(x))
    level = 2.0 * sigma
    ups = np.count_nonzero((x[:-1] < level) & (x[1:] >= level)) / (x.size / fs)
    assert ups == pytest.approx(rice_crossing_rate(level, sigma, m0, m2), rel=0.05)
