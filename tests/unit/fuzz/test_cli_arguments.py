"""Fuzz the command line: every command's argument parsing (all converters), and full runs of the cheap
commands. The parser either gives a namespace or exits with code 2 ("pdvoid ...: error: ..."); a run ends with
code 0 or 2 and never an internal error or a traceback."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from pdvoid.faces import cli
from pdvoid.faces.cli.command import build_parser
from pdvoid.inputs.demo import demo_measured_path, demo_scenario_path, demo_sweep_path

FUZZ = settings.get_profile("pdvoid-fuzz")

_OPTIONS = ["--cycles", "--seed", "--json", "--phase-bins", "--charge-bins", "--charge-scale", "--frequency",
            "--ramp", "--step", "--dwell", "--threshold", "--repeat-count", "--seeds", "--test-voltage",
            "--nominal-voltage", "--parameter", "--values", "--noise", "--relative-noise", "--phase-resolution",
            "--cycles-measured", "--popsize", "--maxiter", "--workers", "--vary", "--service-voltage", "--figures",
            "--scheduler", "--no-progress", "--out"]
_VALUES = ["-1", "0", "1", "3", "7", "1e3", "18", "nan", "inf", "-inf", "x", "", " ", "9" * 60, "18kV", "0V",
           "-5kV", "2deg", "400deg", "1rad", "50Hz", "0Hz", "1s", "5pC", "-1pC", "0.5", "void.size", "void.height",
           "1mm,2mm", "nan,1mm", "void.height=0.5mm:2mm", "void.height=2mm:1mm", "log", "png", "tcp://x", "1 kV",
           "kV", "1e400V", "1_000", "0x10", "٣", "１８kV"]
_COMMANDS = ["demo", "simulate", "pattern", "inception", "margin", "fit", "report", "sweep"]


def _positional(command, tmp):
    return {"demo": [], "simulate": [str(demo_scenario_path())], "pattern": [str(demo_measured_path())],
            "inception": [str(demo_scenario_path())], "margin": [str(demo_scenario_path())],
            "fit": [str(demo_measured_path())], "report": [str(demo_scenario_path())],
            "sweep": [str(demo_sweep_path())]}[command]


_ARGV = st.lists(st.one_of(st.sampled_from(_OPTIONS), st.sampled_from(_VALUES)), max_size=8)


def _check_parse(command, extra):
    argv = [command, *_positional(command, None), *extra]
    try:
        build_parser().parse_args(argv)
    except SystemExit as exc:
        assert exc.code in (0, 2)


@settings(FUZZ, max_examples=300)
@given(command=st.sampled_from(_COMMANDS), extra=_ARGV)
def test_parsing_gives_a_namespace_or_exit_2(command, extra, capsys):
    _check_parse(command, extra)
    assert "Traceback" not in capsys.readouterr().err


@pytest.mark.slow
@settings(FUZZ, max_examples=5000)
@given(command=st.sampled_from(_COMMANDS), extra=_ARGV)
def test_parsing_gives_a_namespace_or_exit_2_long(command, extra, capsys):
    _check_parse(command, extra)
    assert "Traceback" not in capsys.readouterr().err


# runs: the options that make a run long are fixed small first (argparse keeps the last value given, and the
# fuzzed values stay small)
_SMALL = ["-1", "0", "1", "3", "x", "", "nan", "18kV", "0V", "2deg", "50Hz", "0.5", "void.size", "void.height",
          "1mm,2mm", "nan,1mm", "log", "1s", "5pC"]
_RUN_OPTIONS = ["--json", "--phase-bins", "--charge-bins", "--charge-scale", "--frequency", "--threshold",
                "--test-voltage", "--nominal-voltage", "--parameter", "--values", "--cycles"]


def _check_run(command, extra, capsys):
    base = {"pattern": ["pattern", str(demo_measured_path())],
            "inception": ["inception", str(demo_scenario_path())],
            "margin": ["margin", str(demo_scenario_path()), "--test-voltage", "18kV"],
            "demo": ["demo", "--cycles", "5"]}[command]
    code = None
    try:
        code = cli.main([*base, *extra])
    except SystemExit as exc:
        code = exc.code
    err = capsys.readouterr().err
    assert code in (0, 2), err
    assert "Traceback" not in err and "internal error" not in err


_RUN_ARGV = st.lists(st.one_of(st.sampled_from(_RUN_OPTIONS), st.sampled_from(_SMALL)), max_size=6)


@settings(FUZZ, max_examples=60)
@given(command=st.sampled_from(["pattern", "inception", "margin", "demo"]), extra=_RUN_ARGV)
def test_runs_end_in_0_or_2(command, extra, capsys):
    if command == "demo" and "--cycles" in extra:
        extra = [e for e in extra if e != "--cycles"]
    _check_run(command, extra, capsys)


@pytest.mark.slow
@settings(FUZZ, max_examples=600)
@given(command=st.sampled_from(["pattern", "inception", "margin", "demo"]), extra=_RUN_ARGV)
def test_runs_end_in_0_or_2_long(command, extra, capsys):
    if command == "demo" and "--cycles" in extra:
        extra = [e for e in extra if e != "--cycles"]
    _check_run(command, extra, capsys)
