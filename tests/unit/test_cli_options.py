"""Command-line options: a quantity without a unit is refused at parse time, pure numbers are range-checked,
and the analysis commands show the inception band, its verdict, the regime and validity notes."""

from __future__ import annotations

import argparse
import json
import warnings

import pytest

from pdvoid.faces.cli import build_parser, main
from pdvoid.faces.cli.options import QuantityConverter
from pdvoid.inputs.demo import demo_scenario, demo_scenario_path

# one value with a unit per dimension (SI prefixes, common practice)
WITH_UNIT = {"voltage": "18kV", "charge": "5pC", "time": "1s", "frequency": "50Hz", "angle": "2deg",
             "capacitance": "100pF", "length": "1mm"}


def _subparsers(parser: argparse.ArgumentParser) -> dict[str, argparse.ArgumentParser]:
    for action in parser._actions:
        if isinstance(action, argparse._SubParsersAction):
            return dict(action.choices)
    raise AssertionError("no sub-commands")


def _filler(action: argparse.Action) -> str:
    if isinstance(action.type, QuantityConverter):
        return WITH_UNIT[action.type.dimension]
    if getattr(action.type, "__name__", "") in ("integer", "number"):
        return "1"
    if action.choices:
        return next(iter(action.choices))
    return "x.toml"


def _required(sub: argparse.ArgumentParser, skip: argparse.Action) -> list[str]:
    """The arguments a command needs besides ``skip``: positionals and required options with valid values."""
    argv: list[str] = []
    for a in sub._actions:
        if a is skip or isinstance(a, argparse._HelpAction):
            continue
        if not a.option_strings:
            argv.append(_filler(a))
        elif a.required:
            argv += [a.option_strings[0], _filler(a)]
    return argv


def _actions(kind):
    out = []
    for name, sub in _subparsers(build_parser()).items():
        for a in sub._actions:
            if a.option_strings and kind(a):
                out.append(pytest.param(name, a.option_strings[0], id=f"{name} {a.option_strings[0]}"))
    return out


UNIT_OPTIONS = _actions(lambda a: isinstance(a.type, QuantityConverter))
NUMBER_OPTIONS = _actions(lambda a: getattr(a.type, "__name__", "") in ("integer", "number"))


def _action(command: str, option: str) -> tuple[argparse.ArgumentParser, argparse.Action]:
    sub = _subparsers(build_parser())[command]
    return sub, next(a for a in sub._actions if option in a.option_strings)


def test_every_quantity_option_is_found():
    found = {(c, o) for c, o in (p.values for p in UNIT_OPTIONS)}
    for needed in [("report", "--test-voltage"), ("report", "--service-voltage"), ("margin", "--test-voltage"),
                   ("margin", "--nominal-voltage"), ("inception", "--step"), ("inception", "--dwell"),
                   ("inception", "--threshold"), ("fit", "--threshold"), ("fit", "--noise"),
                   ("fit", "--phase-resolution"), ("fit", "--frequency"), ("pattern", "--frequency")]:
        assert needed in found, needed


@pytest.mark.parametrize(("command", "option"), UNIT_OPTIONS)
def test_a_bare_number_is_refused_with_the_unit_suggested(command, option, capsys):
    sub, action = _action(command, option)
    argv = [command, *_required(sub, action), option, "18"]
    with pytest.raises(SystemExit) as exc:
        build_parser().parse_args(argv)
    assert exc.value.code == 2
    err = capsys.readouterr().err
    assert f"pdvoid {command}: error: argument {option}" in err
    assert "'18' has no unit; write it with one, e.g. 18" in err
    assert action.help and "e.g." in action.help  # the help shows an example with its unit


@pytest.mark.parametrize(("command", "option"), UNIT_OPTIONS)
def test_a_value_with_a_unit_is_accepted(command, option):
    sub, action = _action(command, option)
    assert isinstance(action.type, QuantityConverter)
    text = WITH_UNIT[action.type.dimension]
    ns = build_parser().parse_args([command, *_required(sub, action), option, text])
    # 18 kV = 18000 V, 5 pC = 5e-12 C, 1 s, 50 Hz, 2 deg, 100 pF = 1e-10 F (SI prefixes, common practice)
    expected = {"18kV": 18e3, "5pC": 5e-12, "1s": 1.0, "50Hz": 50.0, "2deg": 2.0, "100pF": 1e-10, "1mm": 1e-3}[text]
    assert getattr(ns, action.dest) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize(("command", "option"), UNIT_OPTIONS)
@pytest.mark.parametrize("bad", ["18 furlong", "nanV", "-3kV"])
def test_a_wrong_unit_or_a_negative_value_is_refused(command, option, bad, capsys):
    sub, action = _action(command, option)
    if bad == "18 furlong" and action.type.dimension == "length":  # a furlong is a length: a mass is the wrong unit
        bad = "18 kg"
    with pytest.raises(SystemExit) as exc:
        build_parser().parse_args([command, *_required(sub, action), f"{option}={bad}"])
    assert exc.value.code == 2
    assert f"argument {option}" in capsys.readouterr().err


@pytest.mark.parametrize(("command", "option"), NUMBER_OPTIONS)
@pytest.mark.parametrize("bad", ["nan", "inf", "-5", "ten"])
def test_pure_numbers_refuse_nan_inf_and_out_of_range(command, option, bad, capsys):
    sub, action = _action(command, option)
    with pytest.raises(SystemExit) as exc:
        build_parser().parse_args([command, *_required(sub, action), f"{option}={bad}"])
    assert exc.value.code == 2
    err = capsys.readouterr().err
    assert f"argument {option}" in err and repr(bad) in err


def test_the_unit_slip_of_the_issue(capsys):
    with pytest.raises(SystemExit) as exc:
        main(["margin", str(demo_scenario_path()), "--test-voltage", "18"])
    assert exc.value.code == 2
    assert "argument --test-voltage: '18' has no unit; write it with one, e.g. 18kV or 18000V" in \
        capsys.readouterr().err


def test_margin_values_need_a_unit(capsys):
    assert main(["margin", str(demo_scenario_path()), "--test-voltage", "18kV", "--values", "0.5mm,1"]) == 2
    err = capsys.readouterr().err
    assert err.startswith("pdvoid: error: --values: '1' has no unit") and "Traceback" not in err


def _refuse(name):
    raise ValueError(f"not strict JSON: {name}")


def test_inception_shows_the_band_and_the_regime(capsys):
    import pdvoid

    c = pdvoid.compute_coefficients(demo_scenario())
    assert main(["inception", str(demo_scenario_path()), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out, parse_constant=_refuse)["analytic"]
    lo, hi = sorted((c.inception_voltage_streamer, c.inception_voltage_integral))
    # the streamer formula is linear in (E/p)_cr, quoted as 24.2 and 25.2 V/(Pa m) for air (physics brief 3.1)
    hi = max(hi, c.inception_voltage_streamer * 25.2 / 24.2)
    assert doc["inception band [V rms]"] == pytest.approx([lo, hi], rel=1e-12)
    assert doc["inception regime"] == c.inception_regime == "streamer"
    assert main(["inception", str(demo_scenario_path())]) == 0
    text = capsys.readouterr().out
    assert f"inception band {lo / 1e3:.4g} to {hi / 1e3:.4g} kV rms" in text and "streamer regime" in text


def test_inception_without_self_sustained_discharge(tmp_path, capsys):
    path = tmp_path / "tiny.toml"
    demo_scenario().replace(**{"void.diameter": 1e-6, "void.height": 1e-6}).to_file(path)
    assert main(["inception", str(path), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out, parse_constant=_refuse)
    assert doc["analytic"]["inception voltage [V rms]"] is None  # infinite → null, strict JSON
    assert doc["analytic"]["inception regime"] == "no self-sustained discharge"
    assert main(["inception", str(path)]) == 0
    out = capsys.readouterr().out
    assert "inception voltage: no self-sustained discharge: p*l" in out and " inf" not in out


@pytest.mark.parametrize(("test", "expected"), [("10kV", "discharge-free at the test level"),
                                                ("13.3kV", "inconclusive: the criteria disagree"),
                                                ("18kV", "discharges expected")])
def test_margin_verdict(test, expected, capsys):
    # the demo's criteria: streamer 13.18 kV, ionisation integral 13.51 kV (pdvoid.compute_coefficients)
    assert main(["margin", str(demo_scenario_path()), "--test-voltage", test]) == 0
    assert f"verdict: {expected}" in capsys.readouterr().out
    assert main(["margin", str(demo_scenario_path()), "--test-voltage", test, "--json"]) == 0
    doc = json.loads(capsys.readouterr().out, parse_constant=_refuse)
    assert doc["verdict"] == expected and "high voltage can kill" in doc["safety"].lower()


@pytest.mark.parametrize("command", ["inception", "margin"])
def test_validity_notes_instead_of_warnings(command, tmp_path, capsys):
    path = tmp_path / "big.toml"
    demo_scenario().replace(**{"void.diameter": 3e-3, "void.height": 3e-3}).to_file(path)
    argv = [command, str(path)] + (["--test-voltage", "8kV"] if command == "margin" else [])
    with warnings.catch_warnings():
        warnings.simplefilter("error")  # a raw warning would fail here
        assert main(argv) == 0
        out = capsys.readouterr()
        assert main([*argv, "--json"]) == 0
    assert "Validity notes" in out.out and "not small against the slab" in out.out
    assert "ValidityWarning" not in out.err + out.out
    doc = json.loads(capsys.readouterr().out, parse_constant=_refuse)
    assert any("not small against the slab" in n for n in doc["validity_notes"])


def test_fit_gives_validity_notes_not_warnings(capsys):
    from pdvoid.inputs.demo import demo_measured_path

    # the README's fit with units, cut short: trial voids up to 3 mm wide in the 6 mm wall leave the closed
    # forms' verified range (pdvoid.coefficients.limits), which must come back as notes
    argv = ["fit", str(demo_measured_path()), "--scenario", str(demo_scenario_path()), "--vary",
            "void.diameter=0.5mm:3mm", "--threshold", "10pC", "--noise", "2pC", "--relative-noise", "0.03",
            "--phase-resolution", "1deg", "--cycles", "50", "--popsize", "4", "--maxiter", "1", "--json"]
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        assert main(argv) == 0
    doc = json.loads(capsys.readouterr().out, parse_constant=_refuse)
    assert isinstance(doc["validity_notes"], list) and doc["validity_notes"]
    assert all("not small against the slab" in n or "range" in n for n in doc["validity_notes"])
    assert 0.5e-3 <= doc["best"]["void.diameter"] <= 3e-3


def test_margin_with_one_criterion_says_so(tmp_path, capsys):
    import math

    import pdvoid

    n2 = demo_scenario().replace(**{"void.gas": "nitrogen"})
    c = pdvoid.compute_coefficients(n2)
    assert math.isnan(c.inception_voltage_integral)  # no ionisation data for nitrogen (gases.toml)
    path = tmp_path / "n2.toml"
    n2.to_file(path)
    below = f"{0.9 * c.inception_voltage_streamer:.6f}V"  # 10 % under the streamer inception voltage
    assert main(["margin", str(path), "--test-voltage", below]) == 0
    out = capsys.readouterr().out
    assert "verdict: discharge-free at the test level" in out
    assert "by the streamer criterion only" in out and "rests on one criterion only" in out
    assert main(["margin", str(path), "--test-voltage", below, "--json"]) == 0
    doc = json.loads(capsys.readouterr().out, parse_constant=_refuse)
    assert doc["criteria in the band"] == ["streamer"]
    assert doc["inception voltage, ionisation integral [V rms]"] is None  # NaN → null, strict JSON
