"""The ``measure`` command: a result read through the simulated IEC 60270 chain into an events file."""

import json

import numpy as np

import pdvoid
from pdvoid.faces.cli.command import main
from pdvoid.inputs.demo import demo_scenario


def test_measure_command_writes_an_events_file_read_back_as_measured(tmp_path, capsys):
    res = pdvoid.simulate(demo_scenario(), cycles=200, seed=3)
    res.save(tmp_path / "run.npz")
    out = tmp_path / "measured.csv"
    argv = ["measure", str(tmp_path / "run.npz"), "-o", str(out), "--test-object-capacitance", "100pF",
            "--coupling-capacitance", "1nF", "--threshold", "5pC", "--phase-resolution", "1deg", "--json"]
    assert main(argv) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["input pulses"] == res.event_count and doc["readings"] > 0
    ev = pdvoid.read_events(out)
    assert ev.extra["threshold"] == 5e-12 and ev.cycles == 200.0
    direct = pdvoid.measure(res, pdvoid.TestCircuit(100e-12, 1e-9),
                            pdvoid.Instrument(threshold=5e-12, phase_resolution_deg=1.0))
    np.testing.assert_allclose(ev.charge, direct.charge, atol=1e-16)  # written to 1e-4 pC
    assert "SIMULATED IEC 60270 instrument" in out.read_text(encoding="utf-8")


def test_measure_command_refuses_bad_settings(tmp_path, capsys):
    res = pdvoid.simulate(demo_scenario(), cycles=10, seed=3)
    res.save(tmp_path / "run.npz")
    argv = ["measure", str(tmp_path / "run.npz"), "-o", str(tmp_path / "m.csv"),
            "--test-object-capacitance", "100pF", "--coupling-capacitance", "1nF", "--f-low", "10kHz",
            "--f-high", "500kHz"]
    assert main(argv) == 2
    assert "f_low" in capsys.readouterr().err
