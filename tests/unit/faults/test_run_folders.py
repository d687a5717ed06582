"""Fault tests of ``pdvoid simulate --out``: refused overwrites, locks, manifests, killed runs and a full disk.

Expectations come from the project's rules (issue "nothing lost, nothing guessed"): no reader accepts an
incomplete or mixed output, nothing that existed before a failed run is lost unless --force was given, and a
second run aimed at a folder in use is refused.
"""

from __future__ import annotations

import errno
import os
import random
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from pdvoid import InputError
from pdvoid.core.files import LOCK_NAME, MANIFEST_NAME, FolderLock, check_run_file, verify_manifest
from pdvoid.faces import cli
from pdvoid.inputs.demo import demo_scenario_path
from pdvoid.io import read_events
from pdvoid.simulation.results import load

SCENARIO = str(demo_scenario_path())


def _run(out: Path, *extra: str, cycles: int = 30) -> int:
    return cli.main(["simulate", SCENARIO, "--out", str(out), "--cycles", str(cycles), "--seed", "3", *extra])


def _readers_refuse(out: Path) -> None:
    with pytest.raises(InputError, match="incomplete or mixed output"):
        load(out / "result.npz")
    with pytest.raises(InputError, match="incomplete or mixed output"):
        read_events(out / "events.csv")


def test_a_run_folder_is_complete_and_verified(tmp_path, capsys):
    out = tmp_path / "run"
    assert _run(out) == 0
    doc = verify_manifest(out, required=("result.npz", "events.csv", "summary.json"))
    assert doc["seed"] == 3 and doc["cycles"] == 30 and doc["frequency_hz"] == 50.0
    assert len(doc["scenario_sha256"]) == 64 and doc["pdvoid_version"]
    assert not (out / LOCK_NAME).exists()
    res = load(out / "result.npz")
    ev = read_events(out / "events.csv")
    assert ev.count == res.events.count and ev.cycles == res.cycles  # the events file carries the cycles


def test_overwrite_needs_force_and_keeps_the_old_run(tmp_path, capsys):
    out = tmp_path / "run"
    assert _run(out) == 0
    before = {p.name: p.read_bytes() for p in out.iterdir()}
    capsys.readouterr()
    assert _run(out, cycles=40) == 2
    err = capsys.readouterr().err
    assert "already holds a run" in err and "--force" in err
    assert {p.name: p.read_bytes() for p in out.iterdir()} == before  # untouched
    assert _run(out, "--force", cycles=40) == 0
    assert verify_manifest(out)["cycles"] == 40


def test_output_path_is_checked_before_the_run(tmp_path, capsys, monkeypatch):
    import pdvoid.simulation.simulate as sim

    def never(*a, **k):  # the run must not start
        raise AssertionError("simulate ran before the output path was checked")

    monkeypatch.setattr(sim, "simulate", never)
    blocker = tmp_path / "a_file"
    blocker.write_text("x", encoding="utf-8")
    assert _run(blocker / "sub") == 2
    assert "is not a folder" in capsys.readouterr().err
    assert _run(blocker) == 2
    assert "exists and is not a folder" in capsys.readouterr().err


def test_tampered_or_unfinished_folders_are_refused(tmp_path, capsys):
    out = tmp_path / "run"
    assert _run(out) == 0
    with open(out / "events.csv", "a", encoding="utf-8") as fh:  # truncated or appended: a different file
        fh.write("0.5,1e-12\n")
    _readers_refuse(out)
    assert _run(tmp_path / "run2") == 0
    (tmp_path / "run2" / MANIFEST_NAME).unlink()  # a run that did not finish writing its manifest
    _readers_refuse(tmp_path / "run2")
    # a result file moved in from another run: mixed output
    assert _run(tmp_path / "run3", cycles=20) == 0
    os.replace(tmp_path / "run3" / "result.npz", tmp_path / "run" / "result.npz")
    with pytest.raises(InputError, match="result.npz differs"):
        load(tmp_path / "run" / "result.npz")


def test_standalone_files_load_without_a_manifest(tmp_path, capsys):
    out = tmp_path / "run"
    assert _run(out) == 0
    res = load(out / "result.npz")
    alone = tmp_path / "elsewhere"
    alone.mkdir()
    res.save(alone / "result.npz")
    assert load(alone / "result.npz").events.count == res.events.count
    check_run_file(alone / "result.npz")  # one run file in a folder: not a run folder


def test_a_folder_in_use_is_refused(tmp_path, capsys):
    out = tmp_path / "run"
    assert _run(out) == 0
    capsys.readouterr()
    with FolderLock(out):  # another run holds the folder (this process is alive)
        assert _run(out, "--force") == 2
        assert "another pdvoid run is writing" in capsys.readouterr().err
        with pytest.raises(InputError, match="is writing into this folder"):
            load(out / "result.npz")
    assert load(out / "result.npz").cycles == 30


def test_full_disk_during_an_overwrite_never_leaves_an_accepted_mix(tmp_path, capsys, monkeypatch):
    from pdvoid.simulation.results import Result

    out = tmp_path / "run"
    assert _run(out) == 0
    capsys.readouterr()

    def full(self, path):
        raise OSError(errno.ENOSPC, "No space left on device", str(path))

    monkeypatch.setattr(Result, "to_csv", full)
    assert _run(out, "--force", cycles=40) == 1
    err = capsys.readouterr().err
    assert "No space left on device" in err and "Traceback" not in err
    _readers_refuse(out)  # the old manifest was withdrawn first: the half-replaced folder is refused
    assert not (out / LOCK_NAME).exists()


def _kill_once(tmp_path: Path, delay: float, index: int) -> str:
    out = tmp_path / f"killed{index}"
    proc = subprocess.Popen([sys.executable, "-m", "pdvoid", "simulate", SCENARIO, "--out", str(out), "--cycles",
                             "400000", "--seed", "1"], stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    time.sleep(delay)
    proc.send_signal(signal.SIGKILL)
    proc.wait(timeout=60)
    if not out.exists() or not any(out.iterdir()):
        return "nothing written"
    try:
        verify_manifest(out)
    except InputError:
        for name in ("result.npz", "events.csv"):
            if (out / name).exists():
                with pytest.raises(InputError):
                    (load if name.endswith(".npz") else read_events)(out / name)
        return "refused"
    return "complete"


@pytest.mark.slow
def test_runs_killed_at_random_points_are_refused_or_complete(tmp_path):
    rng = random.Random(20261202)  # fixed seed: the kill points are reproducible
    outcomes = [_kill_once(tmp_path, rng.uniform(0.5, 6.0), i) for i in range(6)]
    assert set(outcomes) <= {"nothing written", "refused", "complete"}
    assert "refused" in outcomes or "complete" in outcomes, outcomes  # some kill came after the run began writing


def test_concurrent_writers_on_one_folder(tmp_path):
    out = tmp_path / "shared"
    procs = [subprocess.Popen([sys.executable, "-m", "pdvoid", "simulate", SCENARIO, "--out", str(out), "--cycles",
                               "3000", "--seed", str(i), "--force"], stdout=subprocess.DEVNULL,
                              stderr=subprocess.PIPE, text=True) for i in range(3)]
    codes, errs = [], []
    for p in procs:
        _, err = p.communicate(timeout=300)
        codes.append(p.returncode)
        errs.append(err)
    assert 0 in codes  # at least one run finished
    for code, err in zip(codes, errs, strict=True):
        assert code in (0, 2), err
        if code == 2:
            assert "another pdvoid run is writing" in err and "Traceback" not in err
    doc = verify_manifest(out)  # whatever won, the folder is one complete run
    assert load(out / "result.npz").seed == doc["seed"]


def test_a_run_killed_after_its_first_file_is_refused(tmp_path, capsys):
    # found by the kill test: a run killed after result.npz but before the other files left one run file and
    # its lock; one file alone did not make the folder a run folder, and the result loaded
    out = tmp_path / "run"
    assert _run(out) == 0
    single = tmp_path / "killed"
    single.mkdir()
    os.replace(out / "result.npz", single / "result.npz")
    (single / LOCK_NAME).write_text("999999999", encoding="utf-8")  # no such process: a stale lock
    with pytest.raises(InputError, match="incomplete or mixed output: no manifest.json"):
        load(single / "result.npz")


def test_simulate_states_the_model_and_its_assumptions(tmp_path, capsys):
    # project rule: a number that rests on an assumption says so where it is shown
    import json

    assert _run(tmp_path / "run") == 0
    out = capsys.readouterr().out
    assert "model: field model" in out and "assumptions:" in out and "illustrative" in out
    doc = json.loads((tmp_path / "run" / "summary.json").read_text(encoding="utf-8"))
    assert doc["model"]["kind"] == "field" and "fit them to a measured pattern" in doc["model"]["assumptions"]
