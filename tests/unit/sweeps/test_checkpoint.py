"""Sweep checkpoints: finished points kept as they complete, resumed sweeps identical to uninterrupted ones,
checkpoints of other sweeps and damaged parts refused, and the sweep file reader's consistency checks.

Expectations come from the project's rules (issue "nothing lost, nothing guessed"): a resumed sweep ends with a
dataset identical to an uninterrupted run, no reader accepts an incomplete or mixed output.
"""

from __future__ import annotations

import json

import numpy as np
import pytest
import xarray as xr

import pdvoid.sweeps.run as sweep_run
from pdvoid import InputError
from pdvoid.core.files import LOCK_NAME, FolderLock
from pdvoid.simulation.parallel import parallel_map
from pdvoid.sweeps import (
    check_sweep_dataset,
    checkpoint_path,
    checkpoint_progress,
    read_netcdf,
    remove_checkpoint,
    sweep,
    sweep_to_file,
    write_netcdf,
)
from pdvoid.sweeps.checkpoint import PLAN_NAME

GRID = {"void.diameter": [0.8e-3, 1.2e-3, 1.5e-3], "void.height": [1.0e-3, 7.0e-3]}  # 7 mm > 6 mm wall: fails
LHS = {"void.diameter": (0.8e-3, 2e-3), "void.pressure": (3e4, 1.2e5, "log")}
CYCLES = 60


@pytest.fixture(scope="module")
def reference():
    from pdvoid.inputs.demo import demo_scenario

    return sweep(demo_scenario(), GRID, cycles=CYCLES, seed=5, workers=1, progress=False)


class _StopAfter:
    """run_point that raises KeyboardInterrupt (as Ctrl-C would) once ``count`` points have run."""

    def __init__(self, count: int) -> None:
        self.count = count
        self.calls = 0
        self.real = sweep_run.run_point

    def __call__(self, item, **kw):
        if self.calls >= self.count:
            raise KeyboardInterrupt
        self.calls += 1
        return self.real(item, **kw)


def _interrupt(monkeypatch, after, **kw):
    from pdvoid.inputs.demo import demo_scenario

    monkeypatch.setattr(sweep_run, "run_point", _StopAfter(after))
    with pytest.raises(KeyboardInterrupt):
        sweep(demo_scenario(), kw.pop("parameters", GRID), cycles=CYCLES, seed=5, workers=1, progress=False, **kw)
    monkeypatch.undo()


@pytest.mark.parametrize("after", [0, 1, 4, 5])
def test_an_interrupted_sweep_resumes_to_the_identical_dataset(tmp_path, monkeypatch, reference, demo, after):
    cp = tmp_path / "cp"
    _interrupt(monkeypatch, after, checkpoint=cp)
    # interrupted points are flushed when the sweep stops: every point that finished is kept
    assert checkpoint_progress(cp) == (after, 6)
    assert not (cp / LOCK_NAME).exists()
    ds = sweep(demo, GRID, cycles=CYCLES, seed=5, workers=1, progress=False, checkpoint=cp, resume=True)
    xr.testing.assert_identical(ds, reference)
    assert checkpoint_progress(cp) == (6, 6)  # kept complete: resuming again runs nothing
    again = sweep(demo, GRID, cycles=CYCLES, seed=5, workers=1, progress=False, checkpoint=cp, resume=True)
    xr.testing.assert_identical(again, reference)


def test_resume_runs_only_the_missing_points(tmp_path, monkeypatch, demo):
    cp = tmp_path / "cp"
    _interrupt(monkeypatch, 4, checkpoint=cp)
    spy = _StopAfter(10**9)
    monkeypatch.setattr(sweep_run, "run_point", spy)
    sweep(demo, GRID, cycles=CYCLES, seed=5, workers=1, progress=False, checkpoint=cp, resume=True)
    assert spy.calls == 2


def test_lhs_sweep_resumed_on_two_processes_is_identical(tmp_path, monkeypatch, demo):
    ref = sweep(demo, LHS, cycles=CYCLES, seed=2, design="lhs", samples=5, workers=1, progress=False)
    cp = tmp_path / "cp"
    from pdvoid.inputs.demo import demo_scenario

    monkeypatch.setattr(sweep_run, "run_point", _StopAfter(2))
    with pytest.raises(KeyboardInterrupt):
        sweep(demo_scenario(), LHS, cycles=CYCLES, seed=2, design="lhs", samples=5, workers=1, progress=False,
              checkpoint=cp)
    monkeypatch.undo()
    ds = sweep(demo, LHS, cycles=CYCLES, seed=2, design="lhs", samples=5, workers=2, progress=False,
               checkpoint=cp, resume=True)
    xr.testing.assert_identical(ds, ref)


@pytest.mark.parametrize(
    "change",
    [{"cycles": CYCLES + 1}, {"seed": 6}, {"parameters": {**GRID, "void.diameter": [0.8e-3, 1.2e-3, 1.6e-3]}},
     {"scenario": "thicker"}, {"metrics": "custom"}],
)
def test_a_checkpoint_of_another_sweep_is_refused(tmp_path, monkeypatch, demo, change):
    cp = tmp_path / "cp"
    _interrupt(monkeypatch, 2, checkpoint=cp)
    kw = {"cycles": CYCLES, "seed": 5, "parameters": GRID, "scenario": demo, "metrics": None} | change
    if kw["scenario"] == "thicker":
        kw["scenario"] = demo.replace(**{"insulation.thickness": 7e-3})
    if kw["metrics"] == "custom":
        kw["metrics"] = _count_metric
    with pytest.raises(InputError, match="checkpoint of a different sweep"):
        sweep(kw["scenario"], kw["parameters"], cycles=kw["cycles"], seed=kw["seed"], metrics=kw["metrics"],
              workers=1, progress=False, checkpoint=cp, resume=True)
    assert checkpoint_progress(cp) == (2, 6)  # untouched


def _count_metric(result):
    return {"events [1]": float(result.events.count)}


def test_a_checkpoint_needs_resume_and_resume_needs_a_checkpoint(tmp_path, monkeypatch, demo):
    cp = tmp_path / "cp"
    _interrupt(monkeypatch, 2, checkpoint=cp)
    with pytest.raises(InputError, match=r"holds an interrupted sweep \(2 of 6 points finished\)"):
        sweep(demo, GRID, cycles=CYCLES, seed=5, workers=1, progress=False, checkpoint=cp)
    with pytest.raises(InputError, match="resume=True needs checkpoint"):
        sweep(demo, GRID, cycles=CYCLES, seed=5, workers=1, progress=False, resume=True)
    with pytest.raises(InputError, match="resume must be True or False"):
        sweep(demo, GRID, cycles=CYCLES, seed=5, workers=1, progress=False, checkpoint=cp, resume="yes")
    # a missing checkpoint folder with resume=True starts from the beginning
    ds = sweep(demo, GRID, cycles=CYCLES, seed=5, workers=1, progress=False, checkpoint=tmp_path / "new",
               resume=True)
    assert ds.attrs["points"] == 6
    remove_checkpoint(cp)
    assert not cp.exists()
    remove_checkpoint(cp)  # nothing to remove: nothing happens


def test_a_checkpoint_in_use_is_refused(tmp_path, demo):
    cp = tmp_path / "cp"
    with FolderLock(cp):  # another sweep holds it (this process is alive)
        with pytest.raises(InputError, match="another pdvoid run is writing"):
            sweep(demo, GRID, cycles=CYCLES, seed=5, workers=1, progress=False, checkpoint=cp)
        with pytest.raises(InputError, match="another pdvoid run is writing"):
            remove_checkpoint(cp)


def _damaged(tmp_path, monkeypatch):
    cp = tmp_path / "cp"
    _interrupt(monkeypatch, 3, checkpoint=cp)
    parts = sorted(cp.glob("part-*.json"))
    assert parts
    return cp, parts


@pytest.mark.parametrize(
    ("damage", "match"),
    [
        (lambda doc: doc | {"plan_sha256": "0" * 64}, "belongs to another sweep"),
        (lambda doc: doc | {"indices": [6] * len(doc["indices"])}, "not in 0..5"),
        (lambda doc: doc | {"indices": doc["indices"][:-1]}, "same length"),
        (lambda doc: doc | {"outcomes": [[{"x [1]": "1"}, ""]] * len(doc["outcomes"])}, "is not a number"),
        (lambda doc: doc | {"outcomes": [[1, 2]] * len(doc["outcomes"])}, "an outcome must be"),
        (lambda doc: {"format": "something else"}, "not a part of a pdvoid sweep checkpoint"),
    ],
)
def test_damaged_or_mixed_parts_are_refused(tmp_path, monkeypatch, demo, damage, match):
    cp, parts = _damaged(tmp_path, monkeypatch)
    doc = json.loads(parts[0].read_text(encoding="utf-8"))
    parts[0].write_text(json.dumps(damage(doc)), encoding="utf-8")
    with pytest.raises(InputError, match="incomplete or mixed checkpoint") as info:
        sweep(demo, GRID, cycles=CYCLES, seed=5, workers=1, progress=False, checkpoint=cp, resume=True)
    assert match in str(info.value)
    with pytest.raises(InputError, match=match):
        checkpoint_progress(cp)


def test_truncated_duplicated_or_orphaned_parts_are_refused(tmp_path, monkeypatch, demo):
    cp, parts = _damaged(tmp_path, monkeypatch)
    (cp / "part-999999.json").write_bytes(parts[0].read_bytes())  # the same points twice
    with pytest.raises(InputError, match="stored twice"):
        checkpoint_progress(cp)
    (cp / "part-999999.json").write_bytes(parts[0].read_bytes()[:-7])  # cut short
    with pytest.raises(InputError, match="part-999999.json is unreadable"):
        checkpoint_progress(cp)
    (cp / "part-999999.json").unlink()
    (cp / PLAN_NAME).unlink()
    with pytest.raises(InputError, match="parts without a plan.json"):
        checkpoint_progress(cp)


def test_leftovers_of_killed_writes_are_ignored_and_removed(tmp_path, monkeypatch, demo, reference):
    cp = tmp_path / "cp"
    _interrupt(monkeypatch, 3, checkpoint=cp)
    leftover = cp / ".part-000009.json.abc123.part"  # a write killed before its rename: never read
    leftover.write_text('{"indices": [0], "outcomes": [', encoding="utf-8")
    (cp / LOCK_NAME).write_text("999999999", encoding="utf-8")  # a lock left by a killed sweep: taken over
    ds = sweep(demo, GRID, cycles=CYCLES, seed=5, workers=1, progress=False, checkpoint=cp, resume=True)
    xr.testing.assert_identical(ds, reference)
    assert not leftover.exists() and not (cp / LOCK_NAME).exists()


def test_parallel_map_reports_each_finished_chunk(tmp_path):
    for workers in (1, 2):
        seen: dict[int, int] = {}

        def record(rng, values, seen=seen):
            for i, v in zip(rng, values, strict=True):
                assert i not in seen
                seen[i] = v

        assert parallel_map(abs, [-i for i in range(40)], workers=workers, on_result=record) == list(range(40))
        assert seen == {i: i for i in range(40)}
    with pytest.raises(InputError, match="on_result"):
        parallel_map(abs, [1], on_result=3)


# --- sweep_to_file: the file and its checkpoint ------------------------------------------------------------


def test_sweep_to_file_writes_the_file_and_removes_the_checkpoint(tmp_path, demo, reference):
    out = tmp_path / "r.nc"
    ds = sweep_to_file(demo, GRID, out, cycles=CYCLES, seed=5, workers=1, progress=False)
    xr.testing.assert_identical(ds, reference)
    xr.testing.assert_identical(read_netcdf(out), read_back(reference, tmp_path))
    assert not checkpoint_path(out).exists()
    assert sorted(p.name for p in tmp_path.iterdir()) == ["r.nc", "ref.nc"]


def read_back(ds, tmp_path):
    write_netcdf(ds, tmp_path / "ref.nc")
    return read_netcdf(tmp_path / "ref.nc")


def test_sweep_to_file_refuses_to_lose_work(tmp_path, monkeypatch, demo):
    out = tmp_path / "r.nc"
    out.write_bytes(b"previous")
    args = (demo, GRID, out)
    kw = {"cycles": CYCLES, "seed": 5, "workers": 1, "progress": False}
    with pytest.raises(InputError, match=r"r.nc exists; give overwrite \(--force\)"):
        sweep_to_file(*args, **kw)
    with pytest.raises(InputError, match="no interrupted sweep to resume"):
        sweep_to_file(*args, resume=True, **kw)
    with pytest.raises(InputError, match="not both"):
        sweep_to_file(*args, resume=True, overwrite=True, **kw)
    assert out.read_bytes() == b"previous" and not checkpoint_path(out).exists()
    monkeypatch.setattr(sweep_run, "run_point", _StopAfter(2))
    with pytest.raises(KeyboardInterrupt):
        sweep_to_file(*args, overwrite=True, **kw)
    monkeypatch.undo()
    assert out.read_bytes() == b"previous"  # replaced only when the new file is complete
    assert checkpoint_progress(checkpoint_path(out)) == (2, 6)
    with pytest.raises(InputError, match=r"holds an interrupted sweep of r.nc: resume it \(--resume\)"):
        sweep_to_file(demo, GRID, tmp_path / "r.nc", **kw)
    ds = sweep_to_file(*args, resume=True, **kw)
    xr.testing.assert_identical(read_netcdf(out), read_back(ds, tmp_path))
    assert not checkpoint_path(out).exists()


def test_force_starts_over(tmp_path, monkeypatch, demo, reference):
    out = tmp_path / "r.nc"
    monkeypatch.setattr(sweep_run, "run_point", _StopAfter(3))
    with pytest.raises(KeyboardInterrupt):
        sweep_to_file(demo, GRID, out, cycles=CYCLES + 1, seed=5, workers=1, progress=False)
    monkeypatch.undo()
    ds = sweep_to_file(demo, GRID, out, cycles=CYCLES, seed=5, workers=1, progress=False, overwrite=True)
    xr.testing.assert_identical(ds, reference)


# --- the sweep file reader refuses inconsistent files ---------------------------------------------------------


def _edited(reference, tmp_path, edit):
    ds = reference.copy(deep=True)
    ds = edit(ds) or ds
    p = tmp_path / "edited.nc"
    ds.to_netcdf(p, engine="scipy")
    return p


@pytest.mark.parametrize(
    ("edit", "match"),
    [
        (lambda ds: ds.drop_vars("seed"), "variable 'seed' is missing"),
        (lambda ds: ds.drop_vars("error"), "variable 'error' is missing"),
        (lambda ds: ds.attrs.pop("scenario_toml") and None, "missing attributes: scenario_toml"),
        (lambda ds: ds.attrs.update(title="something"), "not written by pdvoid.sweeps"),
        (lambda ds: ds.attrs.update(points=-1), "points must be a whole number >= 0"),
        (lambda ds: ds.attrs.update(failed_points=-2), "failed_points must be a whole number >= 0"),
        (lambda ds: ds.attrs.update(points=7), "points = 7 but the variables hold 6"),
        (lambda ds: ds.attrs.update(failed_points=1), "failed_points = 1 but 3 points carry an error"),
        (lambda ds: ds.attrs.update(design="spiral"), "design 'spiral'"),
        (lambda ds: ds.attrs.update(cycles=0), "cycles must be a whole number >= 1"),
        (lambda ds: ds.attrs.update(parameters="void.diameter, void.pressure"), "void.pressure missing"),
        (lambda ds: ds.assign(seed=ds["seed"] + 1), "seed of point 0 is not that of master seed 5"),
        (lambda ds: ds.assign(extra=("void.diameter", np.zeros(3))), "'extra' lies on"),
        (lambda ds: ds.transpose("void.height", "void.diameter"), "lies on ('void.height', 'void.diameter')"),
        (lambda ds: ds.assign(discharges_per_cycle=ds["discharges_per_cycle"].fillna(1.0)),
         "has values at points that failed"),
        (lambda ds: ds.attrs.update(scenario_toml="[void]\n"), "scenario"),
    ],
)
def test_the_reader_refuses_inconsistent_files(tmp_path, reference, edit, match):
    p = _edited(reference, tmp_path, edit)
    with pytest.raises(InputError, match="incomplete or inconsistent sweep file") as info:
        read_netcdf(p)
    assert match in str(info.value)


def test_the_reader_refuses_a_truncated_or_foreign_file(tmp_path, reference):
    p = tmp_path / "r.nc"
    write_netcdf(reference, p)
    data = p.read_bytes()
    p.write_bytes(data[: len(data) // 2])
    with pytest.raises(InputError, match="not a readable NetCDF file|inconsistent"):
        read_netcdf(p)
    xr.Dataset({"x": ("t", [1.0, 2.0])}).to_netcdf(tmp_path / "other.nc", engine="scipy")
    with pytest.raises(InputError, match="not written by pdvoid.sweeps"):
        read_netcdf(tmp_path / "other.nc")


def test_a_random_design_file_reads_back_and_is_checked(tmp_path, demo):
    ds = sweep(demo, LHS, cycles=20, seed=2, design="random", samples=4, workers=1, progress=False)
    write_netcdf(ds, tmp_path / "r.nc")
    check_sweep_dataset(read_netcdf(tmp_path / "r.nc"))
    bad = ds.assign_coords(point=np.array([0, 1, 3, 2], dtype=np.int32))
    with pytest.raises(InputError, match="number the points"):
        check_sweep_dataset(bad)


def test_a_master_seed_beyond_32_bits_writes_and_reads_back(tmp_path, demo):
    # found while testing the checkpoints: seeds up to 2**32 - 1 are allowed, but NetCDF-3 integer attributes
    # hold 32-bit signed values, so writing the file failed after the whole sweep had run
    ds = sweep(demo, {"void.diameter": [1e-3, 2e-3]}, cycles=10, seed=2**32 - 1, workers=1, progress=False)
    assert ds.attrs["seed"] == str(2**32 - 1)
    write_netcdf(ds, tmp_path / "r.nc")
    back = read_netcdf(tmp_path / "r.nc")
    assert int(back.attrs["seed"]) == 2**32 - 1
    with pytest.raises(InputError, match="seed must be a whole number"):
        check_sweep_dataset(back.assign_attrs(seed="12a"))
    small = sweep(demo, {"void.diameter": [1e-3]}, cycles=10, seed=2**31 - 1, workers=1, progress=False)
    assert small.attrs["seed"] == 2**31 - 1
