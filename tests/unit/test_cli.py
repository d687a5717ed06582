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
