"""``pdvoid simulate --duration`` and ``pdvoid inception``/``margin`` on scenarios with supplies other than a
50 Hz sine: the right quantity or a refusal in words, never a sine answer."""

from __future__ import annotations

import json

import pytest

import pdvoid
from pdvoid.analysis.supply_inception import supply_inception
from pdvoid.faces.cli.command import main
from pdvoid.inputs.demo import demo_scenario_path

SUPPLIES = {
    "dc": 'kind = "dc"\nvoltage = "30 kV"\n',
    "vlf": 'kind = "cosine_rectangular"\nvoltage = "20 kV"\nfrequency = "0.1 Hz"\ntransition_time = "0.5 s"\n',
    "pwm": 'kind = "square_wave"\nvoltage = "20 kV"\nfrequency = "10 kHz"\nrise_time = "100 ns"\n',
}


def _file(tmp_path, supply):
    text = demo_scenario_path().read_text(encoding="utf-8")
    head, rest = text.split("[supply]", 1)
    tail = rest[rest.index("[model]"):]
    head = head.replace('material = "epoxy_silica_filled"', 'material = "epoxy_silica_filled"\nconductivity = '
                        '"1e-12 S/m"')
    p = tmp_path / f"{supply}.toml"
    p.write_text(head + "[supply]\n" + SUPPLIES[supply] + "\n" + tail, encoding="utf-8")
    return p


def test_simulate_dc_for_a_duration_states_it(tmp_path, capsys):
    f = _file(tmp_path, "dc")
    assert main(["simulate", str(f), "--duration", "50s", "--out", str(tmp_path / "r"), "--quiet"]) == 0
    out = capsys.readouterr().out
    assert "simulated 50 s from energisation" in out and "discharges per cycle" not in out
    doc = json.loads((tmp_path / "r" / "summary.json").read_text(encoding="utf-8"))
    assert doc["duration [s]"] == 50.0 and doc["cycles"] is None
    res = pdvoid.load(tmp_path / "r" / "result.npz")
    assert res.duration == pytest.approx(50.0)


@pytest.mark.parametrize(("supply", "args", "words"), [
    ("dc", ["--cycles", "10"], "--cycles is for periodic supplies"),
    ("dc", [], "give --duration"),
    ("pwm", ["--duration", "1s"], "--duration is for supplies without a period"),
])
def test_simulate_refuses_the_wrong_run_length(tmp_path, capsys, supply, args, words):
    f = _file(tmp_path, supply)
    assert main(["simulate", str(f), "--out", str(tmp_path / "r"), "--quiet", *args]) == 2
    err = capsys.readouterr().err
    assert err.startswith("pdvoid: error:") and words in err
    assert not (tmp_path / "r" / "result.npz").exists()


@pytest.mark.parametrize(("supply", "quantity"), [("dc", "DC voltage"), ("vlf", "peak (level) voltage"),
                                                   ("pwm", "peak-to-peak voltage")])
def test_inception_gives_the_supply_quantity(tmp_path, capsys, supply, quantity):
    f = _file(tmp_path, supply)
    assert main(["inception", str(f), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["quantity"] == quantity
    expected = supply_inception(pdvoid.Scenario.from_file(f))  # the same function the command prints
    got = doc["analytic"][f"inception voltage [V, {quantity}]"]
    assert got == pytest.approx(expected.inception_voltage) or got is None


@pytest.mark.parametrize("supply", ["dc", "vlf", "pwm"])
def test_margin_refuses_in_words(tmp_path, capsys, supply):
    f = _file(tmp_path, supply)
    assert main(["margin", str(f), "--test-voltage", "18kV"]) == 2
    err = capsys.readouterr().err
    assert err.startswith("pdvoid: error:") and "pdvoid inception" in err


def test_inception_ramp_is_refused_for_dc(tmp_path, capsys):
    assert main(["inception", str(_file(tmp_path, "dc")), "--ramp"]) == 2
    assert "--ramp" in capsys.readouterr().err
