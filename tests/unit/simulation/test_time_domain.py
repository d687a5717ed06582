"""The time-domain kernel (conducting host, supplies without a period) through pdvoid.simulate.

Test scenarios are invented (not measured objects). Expected values are derived by hand in the comments from the
void-field response x(t) = f_cap·E0(t) + conduction part + deposited-charge part (docs guide, "Conducting
insulation and DC supplies"), with the sphere's closed forms written out here rather than taken from pdvoid.
"""

from __future__ import annotations

import math
import os
import subprocess
import sys
import warnings

import numpy as np
import pytest
import scipy.constants as sc
from scipy import stats

import pdvoid

EPS0 = sc.epsilon_0
ER, D_SLAB, DIA = 4.0, 10e-3, 1e-3


def _dc(sigma=1e-13, voltage=40e3, model=None, surface=0.0, supply=None):
    return pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=D_SLAB, permittivity=ER, conductivity=sigma),
        void=pdvoid.Void(diameter=DIA, height=DIA, surface_conductivity=surface),
        supply=supply if supply is not None else pdvoid.DC(voltage),
        model=model if model is not None else pdvoid.FieldModel(lag_free=True),
    )


def _sphere(sigma, sigma_s=0.0):
    """(f_cap, f_res, tau) of a sphere (N = 1/3) written out: 3er/(2er + 1), 3 sigma/(2 sigma + 2 sigma_s/a),
    eps0 (2 er + 1)/(2 sigma + 2 sigma_s/a) (boundary-value solution of a sphere with a surface current)."""
    a = DIA / 2
    rate = 2 * sigma + 2 * sigma_s / a
    return 3 * ER / (2 * ER + 1), 3 * sigma / rate, EPS0 * (2 * ER + 1) / rate


def test_lag_free_dc_interval_is_tau_log_ratio():
    # After a discharge x = E_res, then x(t) = E_inf + (E_res - E_inf) exp(-t/tau) on a constant piece (the
    # conduction part and the deposited charge relax with the same tau), so the next discharge follows after
    # tau ln((E_inf - E_res)/(E_inf - E_inc)), E_inf = f_res V/d (hand derivation).
    s = _dc()
    r = pdvoid.simulate(s, duration=1e4)
    c = pdvoid.compute_coefficients(s)
    _, f_res, tau = _sphere(1e-13)
    e_inf = f_res * 40e3 / D_SLAB
    expected = tau * math.log((e_inf - c.residual_field) / (e_inf - c.inception_field))
    assert r.event_count > 10
    np.testing.assert_allclose(np.diff(r.time), expected, rtol=1e-9)
    np.testing.assert_allclose(r.field_after, c.residual_field, rtol=1e-12)
    assert r.duration == pytest.approx(1e4, rel=1e-15) and r.cycles == 1


def test_energisation_from_zero():
    # At t = 0 the void field jumps to f_cap·E0 (capacitive) and relaxes to f_res·E0:
    # x(t) = f_res E0 + (f_cap - f_res) E0 exp(-t/tau); with f_cap E0 < E_inc < f_res E0 the first discharge is at
    # t1 = tau ln((f_res - f_cap) E0 / (f_res E0 - E_inc)) (hand derivation).
    s = _dc(voltage=32e3)
    c = pdvoid.compute_coefficients(s)
    f_cap, f_res, tau = _sphere(1e-13)
    e0 = 32e3 / D_SLAB
    assert f_cap * e0 < c.inception_field < f_res * e0
    r = pdvoid.simulate(s, duration=2000.0)
    assert r.time[0] == pytest.approx(tau * math.log((f_res - f_cap) * e0 / (f_res * e0 - c.inception_field)),
                                      rel=1e-9)
    # a step above the capacitive inception discharges at once, with the capacitive field before it
    r = pdvoid.simulate(_dc(voltage=50e3), duration=10.0)
    assert r.time[0] == 0.0 and r.field_before[0] == pytest.approx(f_cap * 50e3 / D_SLAB, rel=1e-12)


def test_surface_conduction_shortens_the_interval_and_lowers_the_dc_field():
    # the sphere with surface conductance: E_inf and tau from the boundary-value solution (docstring of _sphere)
    sigma, sigma_s = 1e-13, 2e-17
    s = _dc(sigma=sigma, surface=sigma_s, voltage=50e3)
    c = pdvoid.compute_coefficients(s)
    _, f_res, tau = _sphere(sigma, sigma_s)
    e_inf = f_res * 50e3 / D_SLAB
    r = pdvoid.simulate(s, duration=5000.0)
    expected = tau * math.log((e_inf - c.residual_field) / (e_inf - c.inception_field))
    np.testing.assert_allclose(np.diff(r.time)[1:], expected, rtol=1e-9)
    # a conducting wall in a perfect dielectric: the DC void field decays to zero, one discharge at switch-on only
    r = pdvoid.simulate(_dc(sigma=0.0, surface=1e-16, voltage=50e3), duration=1e4)
    assert r.event_count == 1


def test_capacitive_limit_reproduces_the_cycle_kernel():
    # sigma -> 0: tau -> infinity and the time-domain kernel must give the cycle kernel's AC events
    base = dict(thickness=6e-3, permittivity=4.2)
    void = pdvoid.Void(1.5e-3, 1.5e-3)
    model = pdvoid.FieldModel(lag_free=True, residual_ratio=0.2)
    lossless = pdvoid.Scenario(pdvoid.Insulation(**base), void, pdvoid.Sine(18e3), model)
    tiny = pdvoid.Scenario(pdvoid.Insulation(**base, conductivity=1e-30), void, pdvoid.Sine(18e3), model)
    a = pdvoid.simulate(lossless, cycles=20)
    b = pdvoid.simulate(tiny, cycles=20)
    assert a.event_count == b.event_count > 40
    np.testing.assert_allclose(b.time, a.time, rtol=0, atol=1e-12)
    np.testing.assert_allclose(b.charge, a.charge, rtol=1e-9)
    np.testing.assert_allclose(b.phase_deg, a.phase_deg, rtol=0, atol=1e-6)


def test_zero_conductivity_keeps_the_cycle_kernel_bit_for_bit():
    # conductivity = 0 given explicitly is today's model: identical results to the default, also stochastic
    void = pdvoid.Void(1.5e-3, 1.5e-3)
    model = pdvoid.FieldModel(ionization_rate=1e10)
    a = pdvoid.simulate(pdvoid.Scenario(pdvoid.Insulation(6e-3, 4.2), void, pdvoid.Sine(18e3), model), cycles=50,
                        seed=3)
    b = pdvoid.simulate(pdvoid.Scenario(pdvoid.Insulation(6e-3, 4.2, conductivity=0.0),
                                        pdvoid.Void(1.5e-3, 1.5e-3, surface_conductivity=0.0), pdvoid.Sine(18e3),
                                        model), cycles=50, seed=3)
    assert a.event_count > 50
    for name in ("time", "charge", "field_before", "field_after", "voltage", "phase_deg"):
        assert np.array_equal(getattr(a, name), getattr(b, name))


def test_time_rescaling_of_the_start_electron_wait_on_a_dc_piece():
    # Time-rescaling theorem (Brown et al. 2002): the hazard integrated from the threshold crossing to the
    # discharge is Exp(1). After a discharge at t_l the field re-crosses E_inc after the lag-free interval T
    # (first test); the rate is then n_vol + n_s exp(-(t - t_l)/tau_s) (same polarity: n_s = surface_rate_same).
    model = pdvoid.FieldModel(surface_rate_same=4.0, surface_decay_time=0.6, ionization_rate=2e9)
    sigma = 1e-10
    s = _dc(sigma=sigma, model=model)
    c = pdvoid.compute_coefficients(s)
    _, f_res, tau = _sphere(sigma)
    e_inf = f_res * 40e3 / D_SLAB
    t_rec = tau * math.log((e_inf - c.residual_field) / (e_inf - c.inception_field))
    r = pdvoid.simulate(s, duration=3000.0, seed=11)
    t = r.time
    assert t.size > 1000
    t_last, t_d = t[:-1], t[1:]
    t_c = t_last + t_rec
    n_vol, n_s, tau_s = c.volume_electron_rate, 4.0, 0.6
    hazard = n_vol * (t_d - t_c) + n_s * tau_s * (np.exp(-(t_c - t_last) / tau_s) - np.exp(-(t_d - t_last) / tau_s))
    assert np.all(t_d >= t_c - 1e-9)
    assert stats.kstest(hazard, "expon").pvalue > 1e-3


def test_time_rescaling_of_the_start_electron_wait_on_a_linear_piece():
    # Time-rescaling theorem (Brown et al. 2002) on a linear piece: a perfect dielectric (no conduction part, the
    # deposited charge kept) under a voltage rising at a constant rate r. After a discharge at t_l the void field
    # restarts at E_res and rises at f_cap r / d (x = f_cap V/d + q, hand derivation), so it re-crosses E_inc after
    # (E_inc - E_res) d / (f_cap r); from there the rate is n_vol + n_s exp(-(t - t_l)/tau_s), and its integral
    # up to the discharge is Exp(1). The first discharge (from V = 0) is left out.
    model = pdvoid.FieldModel(surface_rate_same=2000.0, surface_decay_time=5e-4, ionization_rate=1e13)
    rate = 1e7  # V/s: 0 to 10 MV in 1 s (an invented stress test of the kernel, not a real supply)
    s = _dc(sigma=0.0, model=model, supply=pdvoid.PiecewiseLinear([0.0, 1.0], [0.0, rate]))
    c = pdvoid.compute_coefficients(s)
    f_cap = 3 * ER / (2 * ER + 1)
    r = pdvoid.simulate(s, duration=1.0, seed=5)
    t = r.time
    assert t.size > 300 and np.all(r.charge > 0)
    t_last, t_d = t[:-1], t[1:]
    t_c = t_last + (c.inception_field - c.residual_field) * D_SLAB / (f_cap * rate)
    n_vol, n_s, tau_s = c.volume_electron_rate, 2000.0, 5e-4
    hazard = n_vol * (t_d - t_c) + n_s * tau_s * (np.exp(-(t_c - t_last) / tau_s) - np.exp(-(t_d - t_last) / tau_s))
    assert np.all(t_d >= t_c - 1e-9)
    assert stats.kstest(hazard, "expon").pvalue > 1e-3
    # a wrong crossing time (the field's slope taken 10 % steeper) is detected: the test can fail
    t_wrong = t_last + (c.inception_field - c.residual_field) * D_SLAB / (1.1 * f_cap * rate)
    wrong = n_vol * (t_d - t_wrong) + n_s * tau_s * (np.exp(-(t_wrong - t_last) / tau_s)
                                                     - np.exp(-(t_d - t_last) / tau_s))
    assert stats.kstest(wrong, "expon").pvalue < 1e-3


def test_dc_repetition_is_orders_of_magnitude_below_ac_of_the_same_peak():
    # Published behaviour (from memory: U. Fromm, "Interpretation of partial discharges at dc voltages", IEEE
    # TDEI 2(5) (1995) 761-770): under DC the repetition rate is set by the host's relaxation time and is orders
    # of magnitude below that under AC of the same peak. Epoxy-like sigma = 1e-14 S/m (tau of hours); lag-free in
    # both, so that only the field's own time scale differs.
    peak = 40e3
    dc = pdvoid.simulate(_dc(sigma=1e-14, voltage=peak), duration=5e4)
    ac_s = pdvoid.Scenario(pdvoid.Insulation(D_SLAB, ER), pdvoid.Void(DIA, DIA), pdvoid.Sine(peak / math.sqrt(2)),
                           pdvoid.FieldModel(lag_free=True))
    ac = pdvoid.simulate(ac_s, cycles=500)
    rate_dc = dc.event_count / dc.duration
    rate_ac = ac.event_count / ac.duration
    assert rate_ac > 1e3 * rate_dc > 0


def test_polarity_reversal_brings_a_burst():
    # after the reversal the void field swings by about 2 f_cap E0 at once and the deposited charge adds to the
    # new polarity: discharges follow faster than the steady DC interval (lag-free, hand argument)
    sup = pdvoid.PolarityReversal(40e3, hold_time=3000.0, ramp_time=60.0)
    r = pdvoid.simulate(_dc(supply=sup), duration=6000.0)
    steady = np.diff(r.time[r.time < 3000.0])
    after = r.time[r.time > 3000.0]
    assert np.all(r.charge[r.time > 3060.0] < 0)
    assert after.size >= 2 and after[1] - after[0] < 0.5 * steady.min()


def test_ripple_and_piecewise_supplies_run():
    # a piecewise-linear DC ramp equals the DC supply with the same rise time
    dc = _dc(supply=pdvoid.DC(40e3, rise_time=50.0))
    pw = _dc(supply=pdvoid.PiecewiseLinear([0.0, 50.0], [0.0, 40e3]))
    a, b = pdvoid.simulate(dc, duration=3000.0), pdvoid.simulate(pw, duration=3000.0)
    assert a.event_count == b.event_count > 3
    np.testing.assert_allclose(a.time, b.time, rtol=1e-12)
    # a small ripple moves the discharges a little, not their number
    rip = pdvoid.simulate(_dc(supply=pdvoid.DC(40e3, ripple=((1, 0.01, 0.0), (2, 0.005, 30.0)))), duration=3000.0)
    plain = pdvoid.simulate(_dc(), duration=3000.0)
    assert abs(rip.event_count - plain.event_count) <= 1
    assert np.all(np.abs(rip.voltage - 40e3) <= 40e3 * 0.015 + 1e-6)


def test_save_and_load_a_dc_result(tmp_path):
    r = pdvoid.simulate(_dc(model=pdvoid.FieldModel()), duration=3000.0, seed=4)
    back = pdvoid.load(r.save(tmp_path / "dc.npz"))
    assert back.scenario == r.scenario and back.duration == r.duration
    for name in ("time", "charge", "phase_deg", "voltage"):
        assert np.array_equal(getattr(back, name), getattr(r, name))


@pytest.mark.parametrize("call", [
    lambda dc, ac: pdvoid.simulate(dc, cycles=10),
    lambda dc, ac: pdvoid.simulate(dc),
    lambda dc, ac: pdvoid.simulate(ac, duration=1.0),
    lambda dc, ac: pdvoid.simulate(dc, duration=0.0),
    lambda dc, ac: pdvoid.simulate(dc, duration=-5.0),
    lambda dc, ac: pdvoid.simulate(dc, duration="1 s"),
    lambda dc, ac: pdvoid.simulate(dc, duration=10.0, histogram=True),
    lambda dc, ac: pdvoid.simulate(dc, duration=10.0, should_stop=lambda: False),
    lambda dc, ac: pdvoid.simulate(pdvoid.Scenario(dc.insulation, dc.void, dc.supply, pdvoid.NetworkModel()),
                                   duration=10.0),
    lambda dc, ac: pdvoid.models.kernel_arguments(dc),  # the cycle kernel's arguments do not apply
    lambda dc, ac: pdvoid.simulation.simulate.VoidRunner(dc),
])
def test_wrong_run_length_or_mode_is_refused(call):
    dc = _dc()
    ac = pdvoid.Scenario(pdvoid.Insulation(D_SLAB, ER), pdvoid.Void(DIA, DIA), pdvoid.Sine(20e3))
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", pdvoid.ValidityWarning)
        with pytest.raises(pdvoid.InputError):
            call(dc, ac)


_JIT_SCRIPT = """
import sys, numpy as np, pdvoid
s = pdvoid.Scenario(pdvoid.Insulation(10e-3, 4.0, conductivity=1e-11), pdvoid.Void(1e-3, 1e-3),
                    pdvoid.DC(40e3, ripple=((1, 0.02, 0.0),), ripple_frequency=0.5),
                    pdvoid.FieldModel(field_assisted={fa}, ionization_rate=1e10))
r = pdvoid.simulate(s, duration=200.0, seed=2)
np.save(sys.argv[1], np.stack([r.time, r.charge, r.field_before]))
"""


@pytest.mark.parametrize("fa", [False, True])
def test_jit_disabled_gives_the_same_events(tmp_path, fa):
    # the kernel source run as plain Python (NUMBA_DISABLE_JIT=1) gives the same events as compiled
    out = {}
    for jit in ("0", "1"):
        path = tmp_path / f"jit{jit}.npy"
        subprocess.run([sys.executable, "-c", _JIT_SCRIPT.format(fa=fa), str(path)], check=True, timeout=300,
                       env=dict(os.environ, NUMBA_DISABLE_JIT=jit))
        out[jit] = np.load(path)
    assert out["0"].shape[1] > 10
    np.testing.assert_allclose(out["0"], out["1"], rtol=1e-12, atol=0)


def test_square_wave_lag_free_discharges_per_edge_against_a_hand_count():
    # Perfect dielectric, lag-free, no decay: the void field swings between about +-A = +-f V/d like the sine of
    # the physics brief §1.4 (which counts only the extremes), so in the steady state each edge carries
    # 2·n1 discharges, n1 = floor((A - E_res)/(E_inc - E_res)), and the first half-edge from 0 carries n1.
    for volts, ratio in ((40e3, 0.2), (70e3, 0.3), (90e3, 0.1)):
        sup = pdvoid.SquareWave(volts, frequency=1e3, rise_time=2e-6)
        s = pdvoid.Scenario(pdvoid.Insulation(D_SLAB, ER), pdvoid.Void(DIA, DIA), sup,
                            pdvoid.FieldModel(lag_free=True, residual_ratio=ratio))
        c = pdvoid.compute_coefficients(s)
        a = c.field_enhancement * volts / D_SLAB
        n1 = math.floor((a - c.residual_field) / (c.inception_field - c.residual_field))
        r = pdvoid.simulate(s, cycles=6)
        assert n1 >= 1
        # edges: rising centred on k ms, falling on k + 0.5 ms; each event lies on one
        edge = np.round(r.time / 0.5e-3)
        assert np.all(np.abs(r.time - edge * 0.5e-3) <= 1e-6 + 1e-15)
        counts = np.bincount(edge.astype(int), minlength=12)
        assert counts[0] == n1 and np.all(counts[1:12] == 2 * n1)
        assert np.all(np.sign(r.charge) == np.where(edge % 2 == 0, 1.0, -1.0))


def test_square_wave_rms_and_pieces():
    # trapezoid rms written out: bipolar V sqrt(1 - 4 r f/3), unipolar V sqrt(d - r f/3)
    b = pdvoid.SquareWave(1e3, 50.0, 1e-3)
    u = pdvoid.SquareWave(1e3, 50.0, 1e-3, duty=0.3, bipolar=False)
    t = np.linspace(0.0, 0.02, 200001)
    for sup, expected in ((b, 1e3 * math.sqrt(1 - 4 * 1e-3 * 50 / 3)), (u, 1e3 * math.sqrt(0.3 - 1e-3 * 50 / 3))):
        assert sup.rms == pytest.approx(expected, rel=1e-12)
        v = sup.pieces(0.04).voltage(t + 0.02)  # one period away from energisation
        assert np.sqrt(np.mean(v[:-1] ** 2)) == pytest.approx(expected, rel=1e-4)
    with pytest.raises(pdvoid.InputError, match="rise_time"):
        pdvoid.SquareWave(1e3, 1e3, 0.6e-3)
    with pytest.raises(pdvoid.InputError):
        pdvoid.simulate(pdvoid.Scenario(pdvoid.Insulation(D_SLAB, ER), pdvoid.Void(DIA, DIA), b), duration=1.0)


def test_events_against_an_independent_numerical_filter():
    # The void field rebuilt without the kernel: the conduction part by scipy.signal.lsim of G/(1 + s tau) on a
    # dense grid (G = (f_res - f_cap)/d from the sphere's closed forms above), the capacitive part f_cap V/d, and
    # the deposited charge as the kernel's jumps decaying with tau. Lag-free discharges must happen where this
    # field reaches E_inc, and it must stay below E_inc between them (no crossing missed).
    from scipy import signal

    sigma = 1e-11
    sup = pdvoid.PolarityReversal(45e3, hold_time=60.0, ramp_time=3.0, ripple=((1, 0.03, 0.0),),
                                  ripple_frequency=0.7)
    s = _dc(sigma=sigma, supply=sup)
    c = pdvoid.compute_coefficients(s)
    r = pdvoid.simulate(s, duration=150.0)
    f_cap, f_res, tau = _sphere(sigma)
    t = np.linspace(0.0, 150.0, 600_001)
    v = sup.pieces(150.0).voltage(t)
    _, z, _ = signal.lsim(([(f_res - f_cap) / D_SLAB], [tau, 1.0]), v, t)
    x = f_cap * v / D_SLAB + z
    jumps = r.field_after - r.field_before
    for ti, dj in zip(r.time, jumps, strict=True):
        x[t >= ti] += dj * np.exp(-(t[t >= ti] - ti) / tau)
    assert r.event_count > 20 and np.any(r.charge < 0) and np.any(r.charge > 0)
    x_inc = c.inception_field
    tol = 2e-3 * x_inc  # lsim's first-order hold on a 0.25 ms grid
    edges = np.concatenate([r.time, [150.0]])
    for a, b in zip(edges[:-1], edges[1:], strict=True):
        inside = (t > a + 1e-3) & (t < b - 1e-3)
        assert np.max(np.abs(x[inside]), initial=0.0) < x_inc + tol
    # just before each discharge the rebuilt field is at the threshold
    idx = np.searchsorted(t, r.time) - 1
    np.testing.assert_allclose(np.abs(x[idx[1:]]), x_inc, atol=tol)
    np.testing.assert_allclose(np.abs(r.field_before[1:]), x_inc, rtol=1e-9)


def test_cosine_rectangular_counts_and_conduction_against_lsim():
    # Perfect dielectric, lag-free: the void field swings between +-f V/d as for the square wave, so each polarity
    # change carries 2·n1 discharges (n1 on the first half change from 0 V; physics brief §1.4 reasoning).
    sup = pdvoid.CosineRectangular(60e3, frequency=0.1, transition_time=0.2)
    model = pdvoid.FieldModel(lag_free=True, residual_ratio=0.25)
    s = pdvoid.Scenario(pdvoid.Insulation(D_SLAB, ER), pdvoid.Void(DIA, DIA), sup, model)
    c = pdvoid.compute_coefficients(s)
    a = c.field_enhancement * 60e3 / D_SLAB
    n1 = math.floor((a - c.residual_field) / (c.inception_field - c.residual_field))
    r = pdvoid.simulate(s, cycles=4)
    change = np.round(r.time / 5.0)  # changes centred on multiples of half a period (5 s)
    assert np.all(np.abs(r.time - change * 5.0) <= 0.1 + 1e-12)
    counts = np.bincount(change.astype(int), minlength=8)
    assert n1 >= 1 and counts[0] == n1 and np.all(counts[1:8] == 2 * n1)
    # with conduction (tau ~ 4 s against the 10 s period) the events sit where the field rebuilt with
    # scipy.signal.lsim (as in the test above) reaches E_inc, and the rebuilt field stays below it in between
    from scipy import signal

    sigma = 1e-11
    s = pdvoid.Scenario(pdvoid.Insulation(D_SLAB, ER, conductivity=sigma), pdvoid.Void(DIA, DIA), sup, model)
    r = pdvoid.simulate(s, cycles=3)
    f_cap, f_res, tau = _sphere(sigma)
    t = np.linspace(0.0, 30.0, 300_001)
    v = sup.pieces(30.0).voltage(t)
    assert np.max(np.abs(v)) == pytest.approx(60e3, rel=1e-12)
    _, z, _ = signal.lsim(([(f_res - f_cap) / D_SLAB], [tau, 1.0]), v, t)
    x = f_cap * v / D_SLAB + z
    for ti, dj in zip(r.time, r.field_after - r.field_before, strict=True):
        x[t >= ti] += dj * np.exp(-(t[t >= ti] - ti) / tau)
    tol = 2e-3 * c.inception_field
    edges = np.concatenate([r.time, [30.0]])
    assert r.event_count > counts.sum() * 3 / 4  # conduction adds discharges during the holds
    for lo, hi in zip(edges[:-1], edges[1:], strict=True):
        inside = (t > lo + 1e-3) & (t < hi - 1e-3)
        assert np.max(np.abs(x[inside]), initial=0.0) < c.inception_field + tol
    idx = np.searchsorted(t, r.time)[1:] - 1
    # extrapolated from the last grid point before the event by one grid step (fast polarity changes)
    step = np.abs(x[idx] - x[idx - 1])
    assert np.all(np.abs(np.abs(x[idx]) - c.inception_field) <= tol + step)


def test_dc_interval_in_a_cable():
    # A small spherical void at radius r in a coaxial insulation sees the local field V/(r ln(R/r_i)) (uniform
    # conductivity: the DC and the capacitive field distributions of the wall agree); the lag-free DC interval
    # follows the same hand formula with E_inf = (3/2) V/(r ln(R/r_i)) and tau = eps0 (2 er + 1)/(2 sigma).
    sigma, er, r_i, r_o, r = 1e-13, 2.3, 10e-3, 15.5e-3, 12e-3
    cable = pdvoid.Coaxial(inner_radius=r_i, outer_radius=r_o, permittivity=er, conductivity=sigma)
    s = pdvoid.Scenario(cable, pdvoid.Void(0.5e-3, 0.5e-3, radial_position=r), pdvoid.DC(60e3),
                        pdvoid.FieldModel(lag_free=True))
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", pdvoid.ValidityWarning)  # the closed forms at the local field
        c = pdvoid.compute_coefficients(s)
        res = pdvoid.simulate(s, duration=5000.0)
    e_inf = 1.5 * 60e3 / (r * math.log(r_o / r_i))
    tau = EPS0 * (2 * er + 1) / (2 * sigma)
    expected = tau * math.log((e_inf - c.residual_field) / (e_inf - c.inception_field))
    assert res.event_count > 10
    np.testing.assert_allclose(np.diff(res.time), expected, rtol=1e-6)


def test_switch_off_discharges_follow_the_exponential_decay():
    # Perfect dielectric, lag-free: the step to V at t = 0 discharges once and leaves x = E_res, i.e. a deposited
    # field E_res - gV (g V = f_cap V/d). After switching off at t_off, V = V exp(-u/t_p) and
    # x(u) = g V exp(-u/t_p) + E_res - g V reaches -E_inc at u = t_p ln(g V/(g V - E_res - E_inc)) (hand
    # derivation): a discharge of the reversed polarity after switching off; with a step off (t_p = 0) at once.
    for decay in (0.0, 5.0, 40.0):
        s = _dc(sigma=0.0, supply=pdvoid.DC(50e3, off_time=100.0, decay_time=decay))
        c = pdvoid.compute_coefficients(s)
        g_v = c.field_enhancement * 50e3 / D_SLAB
        r = pdvoid.simulate(s, duration=400.0)
        assert r.event_count == 2 and r.charge[0] > 0 > r.charge[1]
        expected = 100.0 + decay * math.log(g_v / (g_v - c.residual_field - c.inception_field))
        assert r.time[1] == pytest.approx(expected, rel=1e-12, abs=1e-12)
    # with conduction (tau = 4000 s against a 3 s decay: the deposited charge outlives the supply) the decay and
    # the relaxation combine: against the lsim-rebuilt field (as above)
    from scipy import signal

    sigma = 1e-14
    sup = pdvoid.DC(50e3, off_time=60.0, decay_time=3.0)
    s = _dc(sigma=sigma, supply=sup)
    c = pdvoid.compute_coefficients(s)
    r = pdvoid.simulate(s, duration=120.0)
    f_cap, f_res, tau = _sphere(sigma)
    t = np.linspace(0.0, 120.0, 480_001)
    v = sup.pieces(120.0).voltage(t)
    _, z, _ = signal.lsim(([(f_res - f_cap) / D_SLAB], [tau, 1.0]), v, t)
    x = f_cap * v / D_SLAB + z
    for ti, dj in zip(r.time, r.field_after - r.field_before, strict=True):
        x[t >= ti] += dj * np.exp(-(t[t >= ti] - ti) / tau)
    tol = 2e-3 * c.inception_field
    edges = np.concatenate([r.time, [120.0]])
    assert np.any(r.charge[r.time > 60.0] < 0)
    for lo, hi in zip(edges[:-1], edges[1:], strict=True):
        inside = (t > lo + 1e-3) & (t < hi - 1e-3)
        assert np.max(np.abs(x[inside]), initial=0.0) < c.inception_field + tol
