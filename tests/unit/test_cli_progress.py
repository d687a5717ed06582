"""The progress bar of the long commands: count and ETA on stderr when it is a terminal, nothing with --quiet,
nothing when stderr is a file or a pipe, and never a byte on stdout."""

from __future__ import annotations

import io
import json
import re

import pytest

from pdvoid.faces.cli import progress
from pdvoid.faces.cli.command import main
from pdvoid.inputs.demo import demo_measured_path, demo_scenario_path


class FakeTerminal(io.StringIO):
    """A text stream that says it is a terminal."""

    def isatty(self) -> bool:
        return True


def test_the_bar_shows_count_and_eta_on_a_terminal(monkeypatch):
    monkeypatch.setattr(progress, "MIN_INTERVAL", 0.0)
    term = FakeTerminal()
    with progress.ProgressBar(10, "simulating", "cycle", stream=term, delay=0.0) as bar:
        for done in (3, 7, 10):
            bar.update_to(done, 10)
    text = term.getvalue()
    assert "simulating" in text and "3/10" in text and "7/10" in text
    # tqdm's meter "[elapsed<remaining, rate]": the remaining time is the ETA
    assert re.search(r"\[\d\d:\d\d<\d\d:\d\d", text)


@pytest.mark.parametrize(("stream", "quiet"), [(FakeTerminal(), True), (io.StringIO(), False)])
def test_no_bar_when_quiet_or_not_a_terminal(stream, quiet):
    with progress.ProgressBar(10, "simulating", "cycle", stream=stream, quiet=quiet, delay=0.0) as bar:
        bar.update_to(10, 10)
    assert stream.getvalue() == "" and not bar.enabled


def _run(monkeypatch, capsys, argv):
    term = FakeTerminal()
    monkeypatch.setattr(progress, "DELAY", 0.0)
    monkeypatch.setattr(progress, "MIN_INTERVAL", 0.0)
    monkeypatch.setattr("sys.stderr", term)
    code = main(argv)
    return code, capsys.readouterr().out, term.getvalue()


@pytest.mark.parametrize("quiet", [False, True])
def test_simulate_draws_the_bar_on_stderr_unless_quiet(monkeypatch, capsys, tmp_path, quiet):
    argv = ["simulate", str(demo_scenario_path()), "--cycles", "300", "--out", str(tmp_path / "r"), "--json"]
    code, out, err = _run(monkeypatch, capsys, argv + (["--quiet"] if quiet else []))
    assert code == 0
    json.loads(out)  # stdout stays clean JSON either way
    assert ("simulating" in err and "/300" in err) is not quiet
    if quiet:
        assert err == ""


def test_inception_ramp_counts_the_repeated_tests(monkeypatch, capsys):
    code, out, err = _run(monkeypatch, capsys, ["inception", str(demo_scenario_path()), "--ramp", "--seeds", "2",
                                                "--dwell", "0.1s", "--step", "1kV", "--json"])
    assert code == 0 and json.loads(out)["ramp test"]
    assert "stepped tests" in err and "/2 [" in err


def test_fit_counts_simulations(monkeypatch, capsys):
    argv = ["fit", str(demo_measured_path()), "--scenario", str(demo_scenario_path()), "--vary",
            "void.diameter=0.5mm:3mm", "--cycles", "20", "--popsize", "4", "--maxiter", "1", "--json"]
    code, out, err = _run(monkeypatch, capsys, argv)
    assert code == 0
    runs = json.loads(out)["simulations"]
    assert "fitting" in err
    # the budget shown: 1 start + popsize 4 x 1 parameter x (maxiter 1 + 1) generations + polish 40 x 1 + 6 noise
    # seeds (the defaults of pdvoid.analysis.fit.fit) = 55 simulations at most; scipy may stop earlier
    counts = [int(a) for a, b in re.findall(r"(\d+)/(\d+) \[", err) if b == "55"]
    assert counts and 0 < max(counts) <= min(runs, 55)
