"""Every command's ``--json`` is strict JSON (null, never NaN or Infinity), and every command stops quietly when
the reader of its output goes away (``pdvoid ... | head``). Expectations: the project's output rules (issue 12)."""

from __future__ import annotations

import json
import os
import sys

import pytest

from pdvoid.faces import cli
from pdvoid.inputs.demo import demo_measured_path, demo_scenario_path


def _no_constants(name):
    raise AssertionError(f"{name} is not strict JSON")


@pytest.fixture(scope="module")
def run_folder(tmp_path_factory):
    out = tmp_path_factory.mktemp("run") / "run"
    assert cli.main(["simulate", str(demo_scenario_path()), "--cycles", "50", "--out", str(out)]) == 0
    return out


def _commands(run_folder, tmp_path):
    demo = str(demo_scenario_path())
    return {
        "demo": ["demo", "--cycles", "30"],
        "simulate": ["simulate", demo, "--cycles", "20", "--out", str(tmp_path / "again")],
        "pattern": ["pattern", str(run_folder / "result.npz")],
        "pattern-csv": ["pattern", str(run_folder / "events.csv"), "--frequency", "50Hz"],
        "inception": ["inception", demo],
        "inception-ramp": ["inception", demo, "--ramp", "--seeds", "1", "--dwell", "0.05s", "--step", "2kV"],
        "margin": ["margin", demo, "--test-voltage", "18kV", "--values", "1mm,5mm,7mm"],  # rows not computed
        "fit": ["fit", str(demo_measured_path()), "--scenario", demo, "--vary", "void.height=0.5mm:2mm",
                "--cycles", "10", "--popsize", "4", "--maxiter", "1"],
    }


@pytest.mark.parametrize("name", ["demo", "simulate", "pattern", "pattern-csv", "inception", "inception-ramp",
                                  "margin", "fit"])
def test_json_is_strict(name, run_folder, tmp_path, capsys):
    argv = _commands(run_folder, tmp_path)[name]
    capsys.readouterr()
    assert cli.main([*argv, "--json"]) == 0, capsys.readouterr().err
    json.loads(capsys.readouterr().out, parse_constant=_no_constants)


@pytest.mark.parametrize("name", ["demo", "pattern", "inception", "margin", "fit"])
@pytest.mark.parametrize("as_json", [False, True])
def test_closed_pipe_is_quiet(name, as_json, run_folder, tmp_path, monkeypatch, capsys):
    argv = _commands(run_folder, tmp_path)[name] + (["--json"] if as_json else [])
    read_end, write_end = os.pipe()
    os.close(read_end)  # the reader is gone: every write gets EPIPE
    out = os.fdopen(write_end, "w", buffering=1)
    monkeypatch.setattr(sys, "stdout", out)
    try:
        code = cli.main(argv)
    finally:
        monkeypatch.undo()
        out.close()
    assert code == 0
    assert "Traceback" not in capsys.readouterr().err
