"""The command line: demo and simulate, text and JSON, errors as messages (not tracebacks)."""

from __future__ import annotations

import json

import pytest

from pdvoid.faces.cli.command import main


def test_demo_json(capsys):
    assert main(["demo", "--cycles", "300", "--seed", "1", "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    rows = out["demo"]
    # streamer and ionisation-integral estimates agree within 10 % for a mm void in air (physics brief §3.1)
    a = rows["inception voltage, streamer criterion [kV rms]"]
    b = rows["inception voltage, ionisation integral [kV rms]"]
    assert abs(a - b) / a < 0.1
    service, test = out["simulations"].values()
    assert service["discharges per cycle [-]"] == 0.0  # service voltage below inception in the demo
    assert test["discharges per cycle [-]"] > 0.5
    assert "high voltage can kill" in out["safety"]


def test_demo_text(capsys):
    assert main(["demo", "--cycles", "100"]) == 0
    text = capsys.readouterr().out
    assert "inception voltage, streamer criterion [kV rms]" in text and "SAFETY" in text


def test_simulate_writes_files(tmp_path, capsys):
    from pdvoid.inputs.demo import demo_scenario_path

    out = tmp_path / "run"
    assert main(["simulate", str(demo_scenario_path()), "--cycles", "100", "--seed", "3", "--out", str(out),
                 "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
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
