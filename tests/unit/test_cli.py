"""The command line: demo and simulate, text and JSON, errors as messages (not tracebacks)."""

from __future__ import annotations

import json

import numpy as np
import pytest

import pdvoid
from pdvoid.faces.cli.command import main
from pdvoid.inputs.demo import DEMO_TEST_RMS, demo_scenario


def test_demo_json(capsys):
    assert main(["demo", "--cycles", "300", "--seed", "1", "--json"]) == 0
    out = json.loads(capsys.readouterr().out, parse_constant=_refuse)  # strict JSON: no NaN or Infinity
    rows = out["demo"]
    # streamer and ionisation-integral estimates agree within 10 % for a mm void in air (physics brief §3.1)
    a = rows["inception voltage, streamer criterion [kV rms]"]
    b = rows["inception voltage, ionisation integral [kV rms]"]
    assert abs(a - b) / a < 0.1
    service, test = out["simulations"].values()
    assert service["discharges per cycle [-]"] == 0.0  # service voltage below inception in the demo
    assert test["discharges per cycle [-]"] > 0.5
    assert service["largest apparent charge [pC]"] is None  # no discharge: no largest charge (JSON null)
    # the demo's test run at seed 1 over 300 cycles is the run of tests/unit/analysis/test_summary.py; its mean
    # charge in pC is the SI mean × 1e12 (SI prefix pico, common practice), checked against the event arrays
    res = pdvoid.simulate(demo_scenario().replace(**{"supply.rms": DEMO_TEST_RMS}), 300, 1)
    assert test["mean apparent charge [pC]"] == pytest.approx(np.mean(np.abs(res.charge)) * 1e12, rel=1e-12)
    assert test["discharges per cycle [-]"] == pytest.approx(res.charge.size / 300, rel=1e-15)
    assert "high voltage can kill" in out["safety"]


def _refuse(name):
    raise ValueError(f"not strict JSON: {name}")


def test_demo_text(capsys):
    assert main(["demo", "--cycles", "100"]) == 0
    text = capsys.readouterr().out
    assert "inception voltage, streamer criterion [kV rms]" in text and "SAFETY" in text
    assert "mean apparent charge [pC]" in text and "nan" not in text  # a missing number prints as n/a


def test_simulate_writes_files(tmp_path, capsys):
    from pdvoid.inputs.demo import demo_scenario_path

    out = tmp_path / "run"
    assert main(["simulate", str(demo_scenario_path()), "--cycles", "100", "--seed", "3", "--out", str(out),
                 "--json"]) == 0
    doc = json.loads(capsys.readouterr().out, parse_constant=_refuse)
    assert json.loads((out / "summary.json").read_text(encoding="utf-8"), parse_constant=_refuse) == doc
    assert (out / "result.npz").exists() and (out / "events.csv").exists() and (out / "summary.json").exists()
    assert doc["summary"]["discharges per cycle [-]"] > 0


def test_bad_input_gives_a_message_and_exit_code_2(tmp_path, capsys):
    bad = tmp_path / "bad.toml"
    bad.write_text("[void]\n")
    assert main(["simulate", str(bad), "--out", str(tmp_path / "o")]) == 2
    assert "error" in capsys.readouterr().err


def test_unknown_command_exits():
    with pytest.raises(SystemExit):
        main(["fly"])


def test_demo_states_the_regime(capsys):
    assert main(["demo", "--cycles", "300", "--seed", "1", "--json"]) == 0
    out = json.loads(capsys.readouterr().out, parse_constant=_refuse)
    service, test = out["regimes"].values()
    assert service["state"] == "below inception" and service["text"].startswith("below inception")
    assert test["state"] == "discharging"
    res = pdvoid.simulate(demo_scenario().replace(**{"supply.rms": DEMO_TEST_RMS}), 300, 1)
    assert test["first discharge after [s]"] == res.time[0]
    assert main(["demo", "--cycles", "100"]) == 0
    assert "regime: below inception" in capsys.readouterr().out


def test_simulate_says_waiting_for_a_start_electron(tmp_path, capsys):
    # a 1.5 mm void 37 % above inception at natural background ionisation: a mean wait of thousands of cycles
    # (tests/unit/analysis/test_regime.py), so 40 cycles are empty although the void is above inception
    sc = pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
        void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3), supply=pdvoid.Sine(rms=18e3, frequency=50.0),
        model=pdvoid.FieldModel(),
    )
    path = tmp_path / "waiting.toml"
    sc.to_file(path)
    assert main(["simulate", str(path), "--cycles", "40", "--out", str(tmp_path / "a"), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out, parse_constant=_refuse)
    assert doc["summary"]["discharges per cycle [-]"] == 0.0
    assert doc["regime"]["state"] == "waiting for a start electron"
    assert doc["regime"]["first discharge after [s]"] is None
    assert doc["regime"]["mean wait for a first start electron [cycles]"] > 1000
    assert main(["simulate", str(path), "--cycles", "40", "--out", str(tmp_path / "b")]) == 0
    assert "regime: above inception" in capsys.readouterr().out


def test_version_prints_the_package_version(capsys):
    with pytest.raises(SystemExit) as stop:
        main(["--version"])
    assert stop.value.code == 0
    assert capsys.readouterr().out.strip() == f"pdvoid {pdvoid.__version__}"


def test_pattern_of_a_file_without_voltage_says_why_there_is_no_power(tmp_path, capsys):
    # an invented event list with phase and charge only: P = sum q_i u_i / T_ref (IEC 60270 clause 3) needs the
    # instantaneous voltage u_i at each discharge, which this file does not give
    path = tmp_path / "measured.csv"
    path.write_text("# cycles = 10\n# frequency = 50\nphase [deg],charge [pC]\n45.0,120\n80.5,95\n225.0,-110\n"
                    "260.0,-80\n", encoding="utf-8")
    assert main(["pattern", str(path)]) == 0
    text = capsys.readouterr().out
    power = next(line for line in text.splitlines() if "discharge power P" in line)
    assert "nan" not in text.lower().replace("nanos", "")
    assert "cannot be computed" in power and "no applied voltage" in power
    # the other IEC 60270 quantities need no voltage: I = sum |q| / T_ref = 405 pC / 0.2 s = 2.025 nA
    current = next(line for line in text.splitlines() if "average discharge current" in line)
    assert float(current.split()[-1]) == pytest.approx(405e-12 / 0.2, rel=1e-3)
    assert main(["pattern", str(path), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out, parse_constant=_refuse)
    assert doc["iec60270"]["discharge power P [W]"] is None
    assert "no applied voltage" in doc["not computed"]["discharge power P [W]"]


def test_measure_narrowband_prints_a_positive_calibration_factor(tmp_path, capsys):
    # IEC 60270 calibration: factor = calibrator charge / |its reading| > 0, also when a 200 kHz narrow band
    # turns a positive pulse's main half-wave negative
    src = tmp_path / "pulses.csv"
    src.write_text("# cycles = 2\n# frequency = 50\ncycle [-],phase [deg],charge [pC]\n0,40,80\n1,220,-60\n",
                   encoding="utf-8")
    argv = ["measure", str(src), "-o", str(tmp_path / "read.csv"), "--test-object-capacitance", "100pF",
            "--coupling-capacitance", "1nF", "--instrument", "narrowband", "--centre", "200kHz",
            "--bandwidth", "9kHz"]
    assert main(argv) == 0
    text = capsys.readouterr().out
    factor = float(text.split("calibration factor ")[1].split()[0])
    assert factor > 0.0 and "-" not in text.split("calibration factor ")[1].split()[0]
    assert main([*argv, "--json"]) == 0
    doc = json.loads(capsys.readouterr().out, parse_constant=_refuse)
    assert doc["calibration factor [-]"] == pytest.approx(factor, rel=1e-3) and doc["reading polarity [-]"] == -1
    assert "calibration_factor = -" not in (tmp_path / "read.csv").read_text(encoding="utf-8")
