"""Every writer replaces its file in one rename: a failure while writing (here a full disk reported when the data
is flushed, ENOSPC, simulated) leaves the previous file exactly as it was and no partial file behind."""

from __future__ import annotations

import errno

import numpy as np
import pytest

import pdvoid
from pdvoid.core import files
from pdvoid.io import matrix_from_events, write_events, write_exchange, write_pattern_matrix


@pytest.fixture
def small_result(demo):
    return pdvoid.simulate(demo, cycles=20, seed=1)


def _writers(result, tmp_path):
    ev = result.events
    mat = matrix_from_events(ev, np.linspace(0.0, 360.0, 13), np.linspace(-2e-10, 2e-10, 9))
    return {
        "events.csv": lambda p: write_events(ev, p),
        "exchange.txt": lambda p: write_exchange(ev, p),
        "matrix.csv": lambda p: write_pattern_matrix(mat, p),
        "scenario.toml": lambda p: result.scenario.to_file(p),
    }


@pytest.mark.parametrize("name", ["events.csv", "exchange.txt", "matrix.csv", "scenario.toml"])
def test_a_failed_write_keeps_the_previous_file(small_result, tmp_path, monkeypatch, name):
    write = _writers(small_result, tmp_path)[name]
    target = tmp_path / name
    target.write_bytes(b"the previous contents")

    def full(fd):
        raise OSError(errno.ENOSPC, "No space left on device")

    monkeypatch.setattr(files.os, "fsync", full)
    with pytest.raises(OSError):
        write(target)
    assert target.read_bytes() == b"the previous contents"
    assert sorted(p.name for p in tmp_path.iterdir()) == [name]
    monkeypatch.undo()
    write(target)  # and with room on the disk it is written whole
    assert target.read_bytes() != b"the previous contents"


def test_netcdf_written_atomically(small_result, tmp_path, monkeypatch):
    from pdvoid.sweeps import read_netcdf, sweep, write_netcdf

    ds = sweep(small_result.scenario, {"void.diameter": [1.0e-3, 1.5e-3]}, cycles=10, seed=1)
    target = tmp_path / "sweep.nc"
    write_netcdf(ds, target)
    before = target.read_bytes()

    def full(fd):
        raise OSError(errno.ENOSPC, "No space left on device")

    monkeypatch.setattr(files.os, "fsync", full)
    with pytest.raises(pdvoid.InputError, match="cannot write NetCDF"):
        write_netcdf(ds.isel(point=slice(0, 1)) if "point" in ds.dims else ds, target)
    assert target.read_bytes() == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["sweep.nc"]
    assert dict(read_netcdf(target).sizes) == dict(ds.sizes)  # the earlier file still reads whole
