"""pdvoid.measure: readings of an IEC 60270 instrument, checked against hand values and scipy.signal."""

from pathlib import Path

import numpy as np
import pytest
from scipy import signal

import pdvoid
from pdvoid.analysis.measured import instrument_response
from pdvoid.physics.bandpass import bandpass_zpk

ROOT = str(Path(__file__).resolve().parents[3])
WIDE = pdvoid.Instrument(kind="wideband", f_low=100e3, f_high=500e3)
NARROW = pdvoid.Instrument(kind="narrowband", centre=100e3, bandwidth=9e3)
CIRCUIT = pdvoid.TestCircuit(test_object_capacitance=1e-9, coupling_capacitance=1e-9)


def _lone(charges, phases=None, cycles=1.0):
    phases = np.linspace(20.0, 300.0, len(charges)) if phases is None else np.asarray(phases, dtype=float)
    return pdvoid.Events(phase_deg=phases, charge=np.asarray(charges, dtype=float), frequency=50.0, cycles=cycles,
                         cycle=np.zeros(len(charges)))


@pytest.mark.parametrize("inst", [WIDE, NARROW], ids=["wideband", "narrowband"])
def test_isolated_pulse_reads_its_apparent_charge_after_calibration(inst):
    q = [50e-12, -20e-12, 300e-12]
    m = pdvoid.measure(_lone(q), circuit=CIRCUIT, instrument=inst)
    assert m.count == 3
    np.testing.assert_allclose(m.charge, q, rtol=0.01)


@pytest.mark.parametrize("inst", [WIDE, NARROW], ids=["wideband", "narrowband"])
@pytest.mark.parametrize(("ca", "ck", "cs", "where"), [
    (1e-9, 1e-9, 0.0, "coupling_capacitor"),
    (2e-9, 0.5e-9, 0.5e-9, "coupling_capacitor"),
    (2e-9, 0.5e-9, 0.5e-9, "test_object"),
])
def test_uncalibrated_reading_follows_the_hand_derived_transfer_ratio(inst, ca, ck, cs, where):
    circuit = pdvoid.TestCircuit(ca, ck, stray_capacitance=cs, arrangement=where)
    # by hand: q_m/q = C_k/(C_a+C_k+C_s) with Z_m at C_k, (C_k+C_s)/(C_a+C_k+C_s) with Z_m at the test object
    ratio = ck / (ca + ck + cs) if where == "coupling_capacitor" else (ck + cs) / (ca + ck + cs)
    m = pdvoid.measure(_lone([40e-12]), circuit=circuit, instrument=inst, calibrate=False)
    assert m.charge[0] == pytest.approx(40e-12 * ratio, rel=0.01)
    # and calibration undoes it
    cal = pdvoid.measure(_lone([40e-12]), circuit=circuit, instrument=inst)
    assert cal.charge[0] == pytest.approx(40e-12, rel=0.01)


def test_a_calibrator_capacitor_left_in_parallel_shows_as_a_calibration_error():
    # C_0 adds to C_a during calibration only: reading = q (C_a+C_0+C_k)/(C_a+C_k) with a fast calibrator
    circuit = pdvoid.TestCircuit(1e-9, 1e-9, calibrator_capacitance=100e-12, calibrator_rise_time=1e-9)
    m = pdvoid.measure(_lone([50e-12]), circuit=circuit, instrument=WIDE)
    assert m.charge[0] == pytest.approx(50e-12 * 2.1 / 2.0, rel=2e-3)


def _theory_resolution_time(inst, sign=1.0, tol=0.1):
    """Largest spacing with |max|h(t) + sign h(t - s)| / max|h| - 1| > tol, h from scipy.signal.impulse of the
    same analog band-pass (the filter's theory of the IEC 60270 pulse resolution time)."""
    z, p, k = bandpass_zpk(inst.f_low, inst.f_high, inst.order)
    dt = 1.0 / (128 * inst.f_high)
    t = np.arange(0.0, 14.0 / float(np.min(-p.real)), dt)
    _, h = signal.impulse(signal.ZerosPolesGain(z, p, k), T=t)
    peak = np.max(np.abs(h))
    hold = instrument_response(CIRCUIT, inst).hold
    for shift in range(int(hold / dt), 0, -1):
        pair = h.copy()
        pair[shift:] += sign * h[: h.size - shift]
        if abs(np.max(np.abs(pair)) / peak - 1.0) > tol:
            return shift * dt
    return 0.0


@pytest.mark.parametrize("inst", [WIDE, NARROW], ids=["wideband", "narrowband"])
def test_close_pulses_read_as_one_larger_pulse_and_far_ones_as_two(inst):
    tr = pdvoid.pulse_resolution_time(CIRCUIT, inst)
    resp = instrument_response(CIRCUIT, inst)
    assert 0.0 < tr < resp.hold
    # closer than the resolution time: one reading, larger than a lone pulse's by more than 10 %
    close = min(tr, resp.peak_time) / 4.0
    r, n = pdvoid.pulse_pair_reading(CIRCUIT, inst, close)
    assert n == 1 and r > 1.1
    # through measure: two pulses of 30 pC close together -> one reading
    t0 = 0.005
    ev = pdvoid.Events(phase_deg=np.array([0.0, 0.0]), charge=np.array([30e-12, 30e-12]), frequency=50.0,
                       cycles=1.0, time=np.array([t0, t0 + close]), cycle=np.zeros(2))
    m = pdvoid.measure(ev, CIRCUIT, inst)
    assert m.count == 1 and m.charge[0] > 33e-12
    # farther apart than the detector's hold: two readings of the single-pulse value
    far = 1.2 * resp.hold
    r, n = pdvoid.pulse_pair_reading(CIRCUIT, inst, far)
    assert n == 2 and r == pytest.approx(1.0, abs=0.02)
    ev = pdvoid.Events(phase_deg=np.array([0.0, 0.0]), charge=np.array([30e-12, 30e-12]), frequency=50.0,
                       cycles=1.0, time=np.array([t0, t0 + far]), cycle=np.zeros(2))
    m = pdvoid.measure(ev, CIRCUIT, inst)
    assert m.count == 2
    np.testing.assert_allclose(m.charge, 30e-12, rtol=0.02)


@pytest.mark.parametrize("inst", [WIDE, NARROW], ids=["wideband", "narrowband"])
@pytest.mark.parametrize("sign", [1.0, -1.0], ids=["same", "opposite"])
def test_resolution_time_agrees_with_the_filter_theory(inst, sign):
    # theory: the IEC 60270 10 % criterion (from memory) applied to scipy.signal.impulse of the same band-pass
    simulated = pdvoid.pulse_resolution_time(CIRCUIT, inst, opposite=sign < 0)
    theory = _theory_resolution_time(inst, sign)
    resp = instrument_response(CIRCUIT, inst)
    assert simulated == pytest.approx(theory, abs=2 * resp.dt, rel=0.02)


def test_opposite_pulses_cancel_when_close():
    r, n = pdvoid.pulse_pair_reading(CIRCUIT, WIDE, 50e-9, opposite=True)
    assert n == 1 and r < 0.5


def test_noise_threshold_gating_interference_and_phase_resolution():
    inst = pdvoid.Instrument(threshold=5e-12, noise=1e-12, gating=((170.0, 190.0),),
                             interference=((90.0, 20e-12),), phase_resolution_deg=2.0)
    ev = _lone([50e-12, 3e-12, 40e-12], phases=[30.0, 60.0, 180.0], cycles=20.0)
    m = pdvoid.measure(ev, CIRCUIT, inst, seed=4)
    # the 3 pC pulse is below threshold, the 180 deg pulse gated; 20 interference pulses at 90 deg
    near90 = np.abs(m.phase_deg - 91.0) < 1.5
    assert near90.sum() == 20
    np.testing.assert_allclose(m.charge[near90], 20e-12, atol=5e-12)
    assert np.all(np.abs(m.charge) >= 5e-12)
    assert not np.any((m.phase_deg >= 170.0) & (m.phase_deg < 190.0))
    assert np.all(np.isclose(np.mod(m.phase_deg - 1.0, 2.0), 0.0, atol=1e-9))
    again = pdvoid.measure(ev, CIRCUIT, inst, seed=4)
    assert np.array_equal(m.charge, again.charge)  # seeded bit for bit


def test_noise_peaks_follow_rice_rate():
    from pdvoid.physics.bandpass import rice_crossing_rate

    inst = pdvoid.Instrument(threshold=3e-12, noise=1e-12)
    ev = _lone([], cycles=500.0)
    m = pdvoid.measure(ev, CIRCUIT, inst, seed=1)
    resp = instrument_response(CIRCUIT, inst)
    sigma = 1e-12 / abs(resp.scale)
    expected = 2 * rice_crossing_rate(3e-12 / abs(resp.scale), sigma, *resp.noise_moments) * 10.0
    assert m.count == pytest.approx(expected, rel=5 * expected**-0.5)


def test_measure_a_million_pulses():
    rng = np.random.default_rng(0)
    n = 1_000_000
    cycles = 20000.0
    t = np.sort(rng.uniform(0.0, cycles / 50.0, n))
    ev = pdvoid.Events(phase_deg=np.mod(t * 50.0, 1.0) * 360.0, charge=rng.normal(0, 50e-12, n), frequency=50.0,
                       cycles=cycles, time=t)
    m = pdvoid.measure(ev, CIRCUIT, WIDE)
    assert 0.9 * n < m.count <= n


def test_bad_inputs_are_refused():
    with pytest.raises(pdvoid.InputError, match="f_low"):
        pdvoid.Instrument(kind="wideband", f_low=10e3, f_high=500e3)
    with pytest.raises(pdvoid.InputError, match="bandwidth"):
        pdvoid.Instrument(kind="narrowband", centre=100e3, bandwidth=50e3)
    pdvoid.Instrument(kind="narrowband", centre=100e3, bandwidth=50e3, standard_ranges=False)
    with pytest.raises(pdvoid.InputError, match="kind"):
        pdvoid.Instrument(kind="ultra")
    with pytest.raises(pdvoid.InputError, match="test_object_capacitance"):
        pdvoid.TestCircuit(test_object_capacitance=0.0, coupling_capacitance=1e-9)
    with pytest.raises(pdvoid.InputError, match="circuit"):
        pdvoid.measure(_lone([1e-12]), circuit=WIDE, instrument=WIDE)
    with pytest.raises(pdvoid.InputError, match="noise"):
        pdvoid.measure(_lone([1e-12], cycles=1000), CIRCUIT, pdvoid.Instrument(noise=1e-12, threshold=0.0))
    with pytest.raises(pdvoid.InputError, match="phase_resolution_deg"):
        pdvoid.Instrument(phase_resolution_deg=7.0)


_JIT_SCRIPT = """
import sys, numpy as np, pdvoid
ev = pdvoid.Events(phase_deg=np.array([10., 10.001, 200.]), charge=np.array([30e-12, -20e-12, 5e-12]),
                   frequency=50.0, cycles=2.0, cycle=np.array([0., 0., 1.]))
out = []
for inst in (pdvoid.Instrument(), pdvoid.Instrument(kind="narrowband")):
    m = pdvoid.measure(ev, pdvoid.TestCircuit(1e-9, 1e-9), inst)
    out.extend([m.time, m.charge])
np.save(sys.argv[1], np.concatenate(out))
"""


def test_jit_disabled_gives_the_same_readings(tmp_path):
    import os
    import subprocess
    import sys

    out = {}
    for jit in ("0", "1"):
        path = tmp_path / f"jit{jit}.npy"
        env = dict(os.environ, NUMBA_DISABLE_JIT=jit, PYTHONPATH=ROOT)
        subprocess.run([sys.executable, "-c", _JIT_SCRIPT, str(path)], env=env,
                       check=True, timeout=300, cwd=str(tmp_path))
        out[jit] = np.load(path)
    assert out["0"].size >= 8
    np.testing.assert_allclose(out["0"], out["1"], rtol=1e-12, atol=1e-24)


def test_calibration_factor_is_positive_for_a_narrowband_output_with_a_negative_main_half_wave():
    # IEC 60270 calibration: the factor is the calibrator's charge over its reading's magnitude, so positive;
    # at 200 kHz / 9 kHz the band-pass's largest half-wave of a positive pulse is negative (the carrier)
    # (with C_a = 100 pF and C_k = 1 nF, the case the command line printed as -1.101)
    inst = pdvoid.Instrument(kind="narrowband", centre=200e3, bandwidth=9e3)
    circuit = pdvoid.TestCircuit(test_object_capacitance=100e-12, coupling_capacitance=1e-9)
    resp = instrument_response(circuit, inst)
    assert resp.peak < 0.0 and resp.polarity == -1.0
    assert resp.calibration_factor > 0.0
    assert resp.calibration_factor == pytest.approx(circuit.calibrator_charge / abs(resp.calibration_reading),
                                                    rel=1e-15)
    m = pdvoid.measure(_lone([50e-12, -20e-12]), circuit=circuit, instrument=inst)
    rec = m.extra["instrument"]
    assert rec["calibration_factor"] == resp.calibration_factor > 0.0 and rec["reading_polarity"] == -1.0
    np.testing.assert_allclose(m.charge, [50e-12, -20e-12], rtol=0.01)  # readings keep the discharge's sign
