"""Fault tests of ``pdvoid sweep --out``: kills, interrupts, concurrent writers and a full disk.

Expectations come from the project's rules (issue "nothing lost, nothing guessed"): a sweep keeps every
finished point as it completes, ``--resume`` ends with a dataset identical to an uninterrupted run, SIGINT and
SIGTERM stop cleanly (exit 130 and 143, no traceback) and say how to resume, a second writer on one output is
refused, and a full disk never destroys the previous file nor leaves a partial one under the final name.
"""

from __future__ import annotations

import contextlib
import errno
import json
import os
import random
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import pytest
import xarray as xr

import pdvoid.core.files as files_module
import pdvoid.sweeps.run as sweep_run
from pdvoid import InputError
from pdvoid.core.files import LOCK_NAME, FolderLock, verify_manifest
from pdvoid.faces import cli
from pdvoid.inputs.demo import demo_scenario_path
from pdvoid.sweeps import checkpoint_path, checkpoint_progress, read_netcdf

SCENARIO = str(demo_scenario_path())


def _sweep_file(folder: Path, cycles: int, diameters: int = 3, pressures: int = 2, seed: int = 5) -> Path:
    d = ", ".join(f'"{0.6 + 0.2 * i:.1f} mm"' for i in range(diameters))
    p = ", ".join(f'"{40 + 20 * i} kPa"' for i in range(pressures))
    f = folder / f"sweep_{cycles}_{diameters}x{pressures}_{seed}.toml"
    f.write_text(textwrap.dedent(f"""\
        scenario = {json.dumps(SCENARIO)}
        [sweep]
        cycles = {cycles}
        seed = {seed}
        [parameters]
        "void.diameter" = [{d}]
        "void.pressure" = [{p}]
        """), encoding="utf-8")
    return f


def _main(f: Path, out: Path, *extra: str) -> int:
    return cli.main(["sweep", str(f), "--out", str(out), "--workers", "1", "--no-progress", *extra])


def _leftovers(folder: Path) -> list[str]:
    """Temporary files of atomic writes under any name: none may be left behind."""
    return sorted(p.name for p in folder.rglob(".*.part"))


def _reference(tmp_path: Path, f: Path) -> xr.Dataset:
    out = tmp_path / f"reference_{f.stem}.nc"
    assert _main(f, out) == 0
    return read_netcdf(out)


# --- a disk that fills up: every atomic write is counted against a budget of free bytes ----------------------


class _Disk:
    def __init__(self, free: int, only: str = "") -> None:
        self.free = free
        self.only = only  # limit only temporary files whose name contains this text
        self.refused = 0


class _LimitedFile:
    def __init__(self, fh, disk: _Disk) -> None:
        self._fh = fh
        self._disk = disk

    def write(self, data):
        size = len(data.encode("utf-8")) if isinstance(data, str) else len(memoryview(data).cast("B"))
        if size > self._disk.free:
            self._disk.refused += 1
            raise OSError(errno.ENOSPC, "No space left on device")
        self._disk.free -= size
        return self._fh.write(data)

    def __getattr__(self, name):
        return getattr(self._fh, name)

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self._fh.close()


class _OsWithDisk:
    """``os`` as pdvoid.core.files sees it, with ``fdopen`` returning files that obey the disk's budget."""

    def __init__(self, disk: _Disk) -> None:
        self._disk = disk

    def __getattr__(self, name):
        return getattr(os, name)

    def fdopen(self, fd, *args, **kwargs):
        fh = os.fdopen(fd, *args, **kwargs)
        name = os.readlink(f"/proc/self/fd/{fd}")
        if self._disk.only and self._disk.only not in Path(name).name:
            return fh
        return _LimitedFile(fh, self._disk)


def _full_disk(monkeypatch, free: int, only: str = "") -> _Disk:
    disk = _Disk(free, only)
    monkeypatch.setattr(files_module, "os", _OsWithDisk(disk))
    return disk


def test_full_disk_while_writing_the_netcdf_keeps_the_previous_file_and_the_points(tmp_path, monkeypatch, capsys):
    f5 = _sweep_file(tmp_path, 40)
    out = tmp_path / "r.nc"
    assert _main(f5, out) == 0
    before = out.read_bytes()
    f6 = _sweep_file(tmp_path, 50)  # another sweep replaces it with --force
    reference = _reference(tmp_path, f6)
    capsys.readouterr()
    disk = _full_disk(monkeypatch, 100, only=".r.nc.")
    assert _main(f6, out, "--force") == 2
    err = capsys.readouterr().err
    assert disk.refused and "No space left on device" in err and "Traceback" not in err
    assert "6 of 6 points are kept" in err and "--resume" in err
    assert out.read_bytes() == before  # the previous file survives whole
    assert _leftovers(tmp_path) == []  # no partial file under any name
    assert checkpoint_progress(checkpoint_path(out)) == (6, 6)
    monkeypatch.undo()  # space freed: the sweep finishes without running a point again
    spy = []
    monkeypatch.setattr(sweep_run, "run_point", lambda *a, **k: spy.append(1))
    assert _main(f6, out, "--resume") == 0
    assert spy == []
    xr.testing.assert_identical(read_netcdf(out), reference)
    assert not checkpoint_path(out).exists()


@pytest.mark.parametrize("free", [0, 700, 2500])
def test_full_disk_while_keeping_points_stops_cleanly_and_resumes(tmp_path, monkeypatch, capsys, free):
    f = _sweep_file(tmp_path, 40)
    reference = _reference(tmp_path, f)
    out = tmp_path / "r.nc"
    out.write_bytes(b"previous file")
    capsys.readouterr()
    _full_disk(monkeypatch, free)  # plan, parts and the NetCDF file all count against the budget
    code = _main(f, out, "--force")
    err = capsys.readouterr().err
    assert code in (1, 2) and "No space left on device" in err and "Traceback" not in err
    assert out.read_bytes() == b"previous file"
    assert _leftovers(tmp_path) == []
    monkeypatch.undo()
    kept = checkpoint_progress(checkpoint_path(out))
    assert kept is None or kept[1] == 6
    assert _main(f, out, "--resume" if kept else "--force") == 0
    xr.testing.assert_identical(read_netcdf(out), reference)


@pytest.mark.parametrize("free", [0, 3000, 30000, 300000])
def test_full_disk_during_simulate_never_leaves_a_partial_file(tmp_path, monkeypatch, capsys, free):
    def run(out: Path, *extra: str) -> int:
        return cli.main(["simulate", SCENARIO, "--out", str(out), "--cycles", "40", "--seed", "3", *extra])

    old, new = tmp_path / "old", tmp_path / "new"
    assert cli.main(["simulate", SCENARIO, "--out", str(old), "--cycles", "30", "--seed", "3"]) == 0
    assert run(new) == 0
    versions = {n: {(old / n).read_bytes(), (new / n).read_bytes()} for n in ("result.npz", "events.csv")}
    capsys.readouterr()
    _full_disk(monkeypatch, free)
    code = run(old, "--force")
    err = capsys.readouterr().err
    monkeypatch.undo()
    assert "Traceback" not in err
    for name, allowed in versions.items():
        assert (old / name).read_bytes() in allowed, name  # the old file or the new one, whole
    json.loads((old / "summary.json").read_text(encoding="utf-8"))  # complete JSON either way
    assert _leftovers(tmp_path) == [] and not (old / LOCK_NAME).exists()
    if code == 0:
        verify_manifest(old)
    elif code == 2:  # the lock could not be written: the folder was not touched
        assert "cannot lock the output folder (No space left on device)" in err
        verify_manifest(old)
        assert verify_manifest(old)["cycles"] == 30
    else:  # the run failed midway: the half-replaced folder is refused
        assert code == 1 and "No space left on device" in err
        with pytest.raises(InputError, match="incomplete or mixed output"):
            verify_manifest(old)
    assert run(tmp_path / "third") == 0  # without --force an existing run is never touched
    assert run(tmp_path / "third", "--cycles", "50") == 2


@contextlib.contextmanager
def _small_tmpfs(where: Path, size: str = "1m"):
    where.mkdir()
    try:
        done = subprocess.run(["mount", "-t", "tmpfs", "-o", f"size={size}", "tmpfs", str(where)],
                              capture_output=True, text=True, timeout=30)
    except (OSError, subprocess.SubprocessError) as exc:
        pytest.skip(f"cannot mount a tmpfs here: {exc}")
    if done.returncode != 0:
        pytest.skip(f"cannot mount a tmpfs here: {done.stderr.strip()}")
    try:
        yield where
    finally:
        subprocess.run(["umount", str(where)], capture_output=True, timeout=30)


def test_a_real_full_disk_on_a_1_mb_tmpfs(tmp_path, capsys):
    f = _sweep_file(tmp_path, 40)
    reference = _reference(tmp_path, f)
    with _small_tmpfs(tmp_path / "small") as small:
        out = small / "r.nc"
        assert _main(_sweep_file(tmp_path, 30), out) == 0
        before = out.read_bytes()
        st = os.statvfs(small)
        filler = small / "filler"
        with open(filler, "wb") as fh:  # leave about two pages free: the plan fits, the rest does not
            fh.write(b"\0" * max(0, st.f_bavail * st.f_frsize - 8192))
        capsys.readouterr()
        code = _main(f, out, "--force")
        err = capsys.readouterr().err
        assert code in (1, 2), err
        assert "No space left on device" in err and "Traceback" not in err
        assert out.read_bytes() == before
        assert _leftovers(small) == []
        filler.unlink()
        kept = checkpoint_progress(checkpoint_path(out))
        assert _main(f, out, "--resume" if kept else "--force") == 0
        xr.testing.assert_identical(read_netcdf(out), reference)
        assert not checkpoint_path(out).exists()


# --- refusals, locks and the exit status -----------------------------------------------------------------


def test_a_second_writer_on_one_output_is_refused(tmp_path, capsys):
    f = _sweep_file(tmp_path, 40)
    out = tmp_path / "r.nc"
    assert _main(f, out) == 0
    before = out.read_bytes()
    capsys.readouterr()
    with FolderLock(checkpoint_path(out)):  # another sweep is writing to r.nc (this process is alive)
        assert _main(f, out, "--force") == 2
        assert "another pdvoid run is writing" in capsys.readouterr().err
        assert _main(f, out, "--resume") == 2
    assert out.read_bytes() == before
    assert list(checkpoint_path(out).iterdir()) == []  # the folder of the test's own lock, left empty


def test_existing_output_or_checkpoint_needs_resume_or_force(tmp_path, capsys):
    f = _sweep_file(tmp_path, 40)
    out = tmp_path / "r.nc"
    assert _main(f, out) == 0
    capsys.readouterr()
    assert _main(f, out) == 2
    assert "r.nc exists; give overwrite (--force)" in capsys.readouterr().err
    with pytest.raises(SystemExit):  # argparse: --resume and --force exclude each other
        _main(f, out, "--resume", "--force")
    assert not checkpoint_path(out).exists()


def test_every_point_failed_exits_non_zero_with_the_reasons_in_the_file(tmp_path, capsys):
    f = tmp_path / "bad.toml"
    f.write_text(f'scenario = {json.dumps(SCENARIO)}\n[sweep]\ncycles = 20\n[parameters]\n'
                 '"void.height" = ["7 mm", "8 mm"]\n', encoding="utf-8")  # taller than the 6 mm wall
    out = tmp_path / "r.nc"
    assert _main(f, out) == 2
    err = capsys.readouterr().err
    assert "every one of the 2 points failed" in err and "void.height" in err
    ds = read_netcdf(out)
    assert ds.attrs["failed_points"] == 2 and all("void.height" in e for e in ds["error"].values)


def test_killed_after_the_file_but_before_the_checkpoint_was_removed(tmp_path, monkeypatch, capsys):
    f = _sweep_file(tmp_path, 40)
    reference = _reference(tmp_path, f)
    out = tmp_path / "r.nc"
    real = sweep_run.clear_files

    def half_then_killed(folder):
        parts = sorted(folder.glob("part-*.json"))
        parts[0].unlink()
        raise KeyboardInterrupt

    monkeypatch.setattr(sweep_run, "clear_files", half_then_killed)
    assert _main(f, out) == 130
    monkeypatch.setattr(sweep_run, "clear_files", real)
    xr.testing.assert_identical(read_netcdf(out), reference)  # the file in place is complete
    capsys.readouterr()
    assert _main(f, out) == 2  # the leftover checkpoint is not silently dropped
    assert "holds an interrupted sweep" in capsys.readouterr().err
    assert _main(f, out, "--resume") == 0  # the missing points run again: the same file
    xr.testing.assert_identical(read_netcdf(out), reference)
    assert not checkpoint_path(out).exists()


# --- real processes: kills and signals (slow) ---------------------------------------------------------------


def _start(f: Path, out: Path, workers: int, *extra: str) -> subprocess.Popen:
    return subprocess.Popen([sys.executable, "-m", "pdvoid", "sweep", str(f), "--out", str(out), "--workers",
                             str(workers), "--no-progress", *extra], stdout=subprocess.PIPE,
                            stderr=subprocess.PIPE, text=True, start_new_session=True)


def _live_in_group(pgid: int) -> list[int]:
    """Processes of the process group that are still running (zombies waiting for a reaper do not count)."""
    alive = []
    for stat in Path("/proc").glob("[0-9]*/stat"):
        with contextlib.suppress(OSError):
            fields = stat.read_text().rsplit(")", 1)[1].split()
            if int(fields[2]) == pgid and fields[0] != "Z":
                alive.append(int(stat.parent.name))
    return alive


def _wait_for_points(out: Path, proc: subprocess.Popen, at_least: int, timeout: float = 120.0) -> None:
    end = time.monotonic() + timeout
    while time.monotonic() < end and proc.poll() is None:
        with contextlib.suppress(InputError):
            kept = checkpoint_progress(checkpoint_path(out))
            if kept and kept[0] >= at_least:
                return
        time.sleep(0.05)
    raise AssertionError(f"no {at_least} points kept in time (exit status {proc.poll()})")


def _kill_group(proc: subprocess.Popen) -> None:
    with contextlib.suppress(ProcessLookupError):
        os.killpg(proc.pid, signal.SIGKILL)


#: a sweep of 10 to 20 s serially (40 points, 0.25 to 0.5 s each on a shared 2-core machine)
SLOW_SWEEP = {"cycles": 150_000, "diameters": 8, "pressures": 5}


@pytest.fixture(scope="module")
def slow_sweep(tmp_path_factory):
    """The slow sweep file and its uninterrupted result, computed once."""
    folder = tmp_path_factory.mktemp("slow_sweep")
    f = _sweep_file(folder, **SLOW_SWEEP)
    return f, _reference(folder, f)


@pytest.mark.slow
def test_sweeps_killed_at_random_points_resume_to_the_identical_file(tmp_path, capsys, slow_sweep):
    f, reference = slow_sweep
    rng = random.Random(20261202)  # fixed seed: the kill points are reproducible
    kept_at_kill = []
    for k, workers in enumerate((1, 1, 1, 1, 2)):
        out = tmp_path / f"killed{k}.nc"
        proc = _start(f, out, workers)
        try:
            time.sleep(rng.uniform(2.0, 12.0))
            proc.send_signal(signal.SIGKILL)  # the main process only: its workers are orphaned
            proc.communicate(timeout=60)
        finally:
            _kill_group(proc)
        assert proc.returncode == -signal.SIGKILL
        assert not out.exists()
        kept = checkpoint_progress(checkpoint_path(out))
        kept_at_kill.append(None if kept is None else kept[0])
        assert _main(f, out, "--resume") == 0
        xr.testing.assert_identical(read_netcdf(out), reference)
        assert not checkpoint_path(out).exists()
    assert any(n for n in kept_at_kill), kept_at_kill  # some kill came after points were kept
    print("points kept at each kill:", kept_at_kill)


@pytest.mark.slow
@pytest.mark.parametrize(("sig", "status", "workers"),
                         [(signal.SIGINT, 130, 1), (signal.SIGTERM, 143, 1), (signal.SIGINT, 130, 2),
                          (signal.SIGTERM, 143, 2)])
def test_sigint_and_sigterm_stop_cleanly_and_resume(tmp_path, capsys, slow_sweep, sig, status, workers):
    f, reference = slow_sweep
    out = tmp_path / "r.nc"
    proc = _start(f, out, workers)
    try:
        _wait_for_points(out, proc, 2)
        proc.send_signal(sig)
        _, err = proc.communicate(timeout=60)
        end = time.monotonic() + 10
        while _live_in_group(proc.pid) and time.monotonic() < end:
            time.sleep(0.1)
        assert _live_in_group(proc.pid) == []  # the workers were stopped too
    finally:
        _kill_group(proc)
    assert proc.returncode == status, err
    assert "Traceback" not in err and f"sweep stopped ({signal.Signals(sig).name})" in err
    assert "--resume" in err and str(out) in err
    done, total = checkpoint_progress(checkpoint_path(out))
    assert 2 <= done < total == 40 and f"{done} of 40 points are kept" in err
    assert not out.exists() and not (checkpoint_path(out) / LOCK_NAME).exists()
    assert _main(f, out, "--resume") == 0
    xr.testing.assert_identical(read_netcdf(out), reference)


@pytest.mark.slow
def test_concurrent_sweep_processes_on_one_output(tmp_path):
    files = [_sweep_file(tmp_path, 60_000, 4, 3, seed=s) for s in (1, 2, 3)]
    references = [_reference(tmp_path, f) for f in files]
    out = tmp_path / "shared.nc"
    procs = [_start(f, out, 1, "--force") for f in files]
    codes, errs = [], []
    try:
        for p in procs:
            _, err = p.communicate(timeout=300)
            codes.append(p.returncode)
            errs.append(err)
    finally:
        for p in procs:
            _kill_group(p)
    assert 0 in codes
    for code, err in zip(codes, errs, strict=True):
        assert code in (0, 2), err
        if code == 2:
            assert "another pdvoid run is writing" in err and "Traceback" not in err
    ds = read_netcdf(out)  # whichever won: one whole sweep, never a mix
    assert sum(ds.identical(r) for r in references) == 1
    assert not checkpoint_path(out).exists()
