"""simulate(): lag-free limits, model agreement, reproducibility, supplies, histogram mode, charge decay."""

from __future__ import annotations

import math
import os
import subprocess
import sys

import numpy as np
import pytest

import pdvoid
from pdvoid.physics.network import lag_free_discharges_per_cycle


def _sc(model, rms=18e3, frequency=50.0, **void):
    vd = dict(diameter=1.5e-3, height=1.5e-3)
    vd.update(void)
    return pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
        void=pdvoid.Void(**vd),
        supply=pdvoid.Sine(rms=rms, frequency=frequency),
        model=model,
    )


def test_lag_free_field_model_first_discharge_phase():
    # first discharge where f·E_peak·sin φ = E_inc, E_peak = √2·U/d (uniform void field, brief §2.1 and
    # issue statement of the lag-free field model; derived)
    sc = _sc(pdvoid.FieldModel(lag_free=True))
    c = pdvoid.compute_coefficients(sc)
    res = pdvoid.simulate(sc, cycles=3, seed=0)
    e_peak = math.sqrt(2.0) * sc.supply.rms / sc.insulation.thickness
    expected = math.degrees(math.asin(c.inception_field / (c.field_enhancement * e_peak)))
    assert res.phase_deg[0] == pytest.approx(expected, abs=1e-9)
    assert res.field_before[0] == pytest.approx(c.inception_field, rel=1e-12)
    assert res.field_after[0] == pytest.approx(c.residual_field, rel=1e-12)
    # every lag-free discharge starts at ±E_inc and ends at ±E_res, charge (E_inc − E_res)·K εr ε0 Ω/d
    assert np.abs(res.field_before) == pytest.approx(c.inception_field, rel=1e-9)
    assert np.abs(res.charge) == pytest.approx(c.charge_per_discharge, rel=1e-9)


def test_lag_free_field_model_count_matches_closed_form():
    # the field model is the network model with k_eff = f·h/d (brief §4): same closed-form count (brief §1.4)
    sc = _sc(pdvoid.FieldModel(lag_free=True, residual_ratio=0.3), rms=25e3)
    c = pdvoid.compute_coefficients(sc)
    a = c.field_enhancement * math.sqrt(2.0) * sc.supply.rms / sc.insulation.thickness
    n = lag_free_discharges_per_cycle(a, c.inception_field, c.residual_field)
    res = pdvoid.simulate(sc, cycles=20, seed=0)
    window = np.floor(res.time * 50.0 - 0.25).astype(int)
    assert np.all(np.bincount(window[window >= 0])[:19] == n)


def test_flat_void_field_model_matches_network_model():
    # a flat void (height ≪ diameter, ≪ thickness): the induced-charge model and the three-capacitance model give
    # the same counts and charges to within O(t/d) (brief §2.3 flat-disc limit; issue requirement)
    d_void, h = 4e-3, 0.1e-3
    field = _sc(pdvoid.FieldModel(lag_free=True), rms=15e3, diameter=d_void, height=h)
    # network void: a cylinder of the same height and the same volume as the oblate spheroid (2/3 of the area)
    net = _sc(pdvoid.NetworkModel(lag_free=True), rms=15e3, diameter=d_void * math.sqrt(2.0 / 3.0), height=h,
              shape="cylinder")
    rf = pdvoid.simulate(field, cycles=20, seed=0)
    rn = pdvoid.simulate(net, cycles=20, seed=0)
    tol = h / 6e-3 + h / d_void * 4.2  # O(t/d) plus the spheroid's finite-aspect correction O(εr·h/D)
    assert rf.event_count > 0
    assert abs(rf.event_count - rn.event_count) <= 0.05 * rn.event_count
    assert np.mean(np.abs(rf.charge)) == pytest.approx(np.mean(np.abs(rn.charge)), rel=tol)


def test_same_seed_same_arrays_and_different_seed_differs(demo):
    a = pdvoid.simulate(demo, cycles=200, seed=3)
    b = pdvoid.simulate(demo, cycles=200, seed=3)
    c = pdvoid.simulate(demo, cycles=200, seed=4)
    for name in ("time", "charge", "field_before", "field_after", "voltage", "phase_deg", "cycle"):
        assert np.array_equal(getattr(a, name), getattr(b, name))
    assert not np.array_equal(a.time[:10], c.time[:10])


def test_chunking_does_not_change_the_answer(demo):
    a = pdvoid.simulate(demo, cycles=300, seed=8)
    b = pdvoid.simulate(demo, cycles=300, seed=8, chunk_cycles=7)
    assert np.array_equal(a.time, b.time) and np.array_equal(a.charge, b.charge)


_JIT_SCRIPT = """
import sys, numpy as np, pdvoid
from pdvoid.inputs.demo import demo_scenario
sc = demo_scenario().replace(**{{"model.field_assisted": {fa}}})
r = pdvoid.simulate(sc, cycles=40, seed=2)
np.save(sys.argv[1], np.stack([r.time, r.charge, r.field_before]))
"""


@pytest.mark.parametrize("fa", [False, True])
def test_jit_disabled_gives_the_same_events(tmp_path, fa):
    # the same kernel source run as plain Python (NUMBA_DISABLE_JIT=1) must give the same events
    out = {}
    for jit in ("0", "1"):
        env = dict(os.environ, NUMBA_DISABLE_JIT=jit)
        path = tmp_path / f"jit{jit}.npy"
        subprocess.run([sys.executable, "-c", _JIT_SCRIPT.format(fa=fa), str(path)], env=env, check=True,
                       timeout=300)
        out[jit] = np.load(path)
    assert out["0"].shape[1] > 20
    np.testing.assert_allclose(out["0"], out["1"], rtol=1e-12, atol=0)


def test_periodic_samples_of_a_sine_match_the_closed_form_path():
    # the generic root finder (any waveform) against the closed-form arcsine path (pure sine)
    sine = _sc(pdvoid.FieldModel(lag_free=True), rms=20e3)
    n = 64
    samples = math.sqrt(2.0) * 20e3 * np.sin(2 * np.pi * np.arange(n) / n)
    per = sine.replace(**{}) if False else pdvoid.Scenario(
        insulation=sine.insulation, void=sine.void, supply=pdvoid.Periodic(samples=samples, frequency=50.0),
        model=sine.model)
    a = pdvoid.simulate(sine, cycles=10, seed=0)
    b = pdvoid.simulate(per, cycles=10, seed=0)
    assert a.event_count == b.event_count > 0
    np.testing.assert_allclose(a.time, b.time, rtol=0, atol=1e-12)
    np.testing.assert_allclose(a.charge, b.charge, rtol=1e-9)


def test_harmonics_shift_the_discharges():
    base = _sc(pdvoid.FieldModel(lag_free=True), rms=20e3)
    flat_top = base.replace(**{"supply.harmonics": ((3, 0.2, 0.0),)})
    a = pdvoid.simulate(base, cycles=5, seed=0)
    b = pdvoid.simulate(flat_top, cycles=5, seed=0)
    # a third harmonic in anti-phase flattens the crest: the first inception comes at another phase
    assert abs(a.phase_deg[0] - b.phase_deg[0]) > 1.0
    c = pdvoid.compute_coefficients(flat_top)
    assert c.peak_factor < math.sqrt(2.0)


def test_histogram_mode_counts_the_same_events(demo):
    ev = pdvoid.simulate(demo, cycles=500, seed=6)
    edges = np.linspace(-400e-12, 400e-12, 41)
    hi = pdvoid.simulate(demo, cycles=500, seed=6, histogram=True, phase_bins=36, charge_edges=edges)
    assert hi.events.count == 0 and hi.event_count == ev.event_count
    ref, _, _ = np.histogram2d(ev.phase_deg, ev.charge, bins=[np.linspace(0, 360, 37), edges])
    assert np.array_equal(hi.histogram.counts, ref.astype(np.int64))
    assert hi.histogram.below + hi.histogram.above == ev.event_count - int(ref.sum())
    assert hi.sum_abs_charge == pytest.approx(np.sum(np.abs(ev.charge)), rel=1e-12)


def test_charge_decay_follows_its_time_constant_and_misses_no_crossing():
    tau = 4e-3
    sc = _sc(pdvoid.FieldModel(lag_free=True, charge_decay_time=tau, residual_ratio=0.1), rms=20e3)
    res = pdvoid.simulate(sc, cycles=6, seed=0)
    c = pdvoid.compute_coefficients(sc)
    g = c.field_enhancement / sc.insulation.thickness
    amp = math.sqrt(2.0) * sc.supply.rms
    w = 2 * math.pi * 50.0
    assert res.event_count > 10
    # lag-free with decay: every discharge at |E| = E_inc
    assert np.abs(res.field_before) == pytest.approx(c.inception_field, rel=1e-9)
    # between discharges E_q(t) = E_q0·exp(−Δt/τ): |E_v| stays below E_inc (no crossing missed), dense check
    times = np.concatenate([[0.0], res.time])
    xq = np.concatenate([[0.0], res.field_after - g * res.voltage])
    for i in range(res.event_count):
        t = np.linspace(times[i], times[i + 1], 2001)[1:-1]
        x = g * amp * np.sin(w * t) + xq[i] * np.exp(-(t - times[i]) / tau)
        assert np.all(np.abs(x) < c.inception_field * (1 + 1e-12))
        # the field just before the discharge is the decayed value
        x_end = g * res.voltage[i] + xq[i] * math.exp(-(res.time[i] - times[i]) / tau)
        assert x_end == pytest.approx(res.field_before[i], rel=1e-9)


def test_stopping_early_returns_a_partial_result(demo):
    calls = []
    res = pdvoid.simulate(demo, cycles=100_000, seed=1, chunk_cycles=100, progress=lambda d, n: calls.append(d),
                          should_stop=lambda: len(calls) >= 3)
    assert res.cycles == 300 and not res.complete and calls == [100, 200, 300]


@pytest.mark.parametrize(
    "kwargs, match",
    [
        (dict(cycles=0), "cycles"),
        (dict(cycles=1.5), "cycles"),
        (dict(seed=-1), "seed"),
        (dict(histogram=True, charge_edges=[1.0, 0.0]), "charge_edges"),
    ],
)
def test_bad_arguments(demo, kwargs, match):
    args = dict(cycles=10, seed=0)
    args.update(kwargs)
    with pytest.raises(pdvoid.InputError, match=match):
        pdvoid.simulate(demo, **args)


def test_bad_scenarios_raise_input_errors():
    with pytest.raises(pdvoid.InputError, match="void.height"):
        _sc(pdvoid.FieldModel(), height=7e-3)
    with pytest.raises(pdvoid.InputError, match="supply.frequency"):
        pdvoid.Sine(rms=1e3, frequency=0.0)
    with pytest.raises(pdvoid.InputError, match="surface_rate_same"):
        pdvoid.FieldModel(surface_rate_same=-1.0)
    with pytest.raises(pdvoid.InputError, match="void.gas"):
        pdvoid.Void(diameter=1e-3, height=1e-3, gas="helium")
    with pytest.raises(pdvoid.InputError, match="residual_ratio"):
        pdvoid.FieldModel(residual_ratio=1.0)
    with pytest.raises(pdvoid.InputError, match="permittivity"):
        pdvoid.Insulation(thickness=1e-3, permittivity=0.5)
    with pytest.raises(pdvoid.InputError, match="simulate|Scenario"):
        pdvoid.simulate("not a scenario", cycles=1)
