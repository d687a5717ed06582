"""pdvoid's own formats (result, exchange, count matrix) are read only when they are consistent: counts, cycles,
shapes, dtypes, monotone times, no wrap-around; and a result file is read header first, so that a small file
cannot make the reader allocate gigabytes. Expectations: the project's bad-input rules (issue 12)."""

from __future__ import annotations

import json
import zipfile

import numpy as np
import pytest

import pdvoid
from pdvoid import InputError
from pdvoid.io import read_exchange, read_pattern_matrix, write_exchange
from pdvoid.io.matrix import PatternMatrix


@pytest.fixture(scope="module")
def saved(tmp_path_factory):
    sc = pdvoid.Scenario(insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
                         void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3), supply=pdvoid.Sine(rms=18e3, frequency=50.0),
                         model=pdvoid.FieldModel(lag_free=True, residual_ratio=0.2))
    folder = tmp_path_factory.mktemp("res")
    res = pdvoid.simulate(sc, cycles=20, seed=3)
    hist = pdvoid.simulate(sc, cycles=20, seed=3, histogram=True)
    assert res.event_count > 5
    return res.save(folder / "events.npz"), hist.save(folder / "hist.npz")


def _arrays(path):
    with np.load(path) as z:
        arrays = {k: z[k] for k in z.files}
    meta = json.loads(arrays.pop("metadata").tobytes())
    return arrays, meta


def _rewrite(path, tmp_path, *, meta_change=None, **arrays_change):
    arrays, meta = _arrays(path)
    (meta_change or (lambda m: None))(meta)
    arrays.update(arrays_change)
    out = tmp_path / "bad.npz"
    np.savez_compressed(out, metadata=np.frombuffer(json.dumps(meta).encode(), np.uint8), **arrays)
    return out


def test_untouched_files_round_trip(saved):
    for p in saved:
        r = pdvoid.load(p)
        assert r.event_count >= 0 and r.complete


@pytest.mark.parametrize("change, words", [
    (lambda m: m.update(cycles=25), "25 cycles simulated but only 20 requested"),
    (lambda m: m.update(cycles=1), "after the end of the 1 cycles"),
    (lambda m: m.update(event_count=3), "metadata counts 3 discharges"),
    (lambda m: m.update(cycles=20.5), "cycles must be a whole number"),
    (lambda m: m.update(cycles=True), "cycles must be a whole number"),
    (lambda m: m.update(seed=-1), "seed must be a whole number"),
    (lambda m: m.update(sum_abs_charge=(-1.0).hex()), "negative sum"),
    (lambda m: m.update(sum_abs_charge="inf"), "must be finite"),
    (lambda m: m.update(references="field"), "references must be a list"),
    (lambda m: m.update(version=3), "version must be text"),
])
def test_inconsistent_metadata_is_refused(saved, tmp_path, change, words):
    with pytest.raises(InputError, match=words):
        pdvoid.load(_rewrite(saved[0], tmp_path, meta_change=change))


def test_inconsistent_event_arrays_are_refused(saved, tmp_path):
    arrays, _ = _arrays(saved[0])
    n = arrays["time"].size
    cases = {
        "charge": (arrays["charge"][:-1], "holds"),  # one event fewer
        "time": (-arrays["time"], "times must be >= 0"),
        "cycle": (arrays["cycle"] + 1, "whole cycles of the event times"),
        "phase_deg": ((arrays["phase_deg"] + 90.0) % 360.0, "phases do not match"),
    }
    for name, (values, words) in cases.items():
        with pytest.raises(InputError, match=words):
            pdvoid.load(_rewrite(saved[0], tmp_path, **{name: values}))
    with pytest.raises(InputError, match="non-decreasing"):
        pdvoid.load(_rewrite(saved[0], tmp_path, time=arrays["time"][::-1].copy()))
    with pytest.raises(InputError, match="expected <f8"):  # complex charges: never silently made real
        pdvoid.load(_rewrite(saved[0], tmp_path, charge=arrays["charge"].astype(complex)))
    with pytest.raises(InputError, match="expected <f8"):
        pdvoid.load(_rewrite(saved[0], tmp_path, time=arrays["time"].astype(np.float32)))
    with pytest.raises(InputError, match="1 dimension"):
        pdvoid.load(_rewrite(saved[0], tmp_path, voltage=np.zeros((n, 1))))


def test_inconsistent_histograms_are_refused(saved, tmp_path):
    arrays, meta = _arrays(saved[1])
    counts = arrays["hist_counts"].copy()
    neg = counts.copy()
    neg[0, 0] = -1
    with pytest.raises(InputError, match="counts must be >= 0"):
        pdvoid.load(_rewrite(saved[1], tmp_path, hist_counts=neg))
    more = counts.copy()
    more[0, 0] += 1
    with pytest.raises(InputError, match="but the metadata counts"):
        pdvoid.load(_rewrite(saved[1], tmp_path, hist_counts=more))
    with pytest.raises(InputError, match="do not match"):
        pdvoid.load(_rewrite(saved[1], tmp_path, hist_counts=counts[:-1]))
    huge = np.zeros_like(counts)
    huge[0, :2] = 2**62  # adds up past 2**63 in int64: must not wrap to a negative or small total
    with pytest.raises(InputError, match="more than 2\\*\\*62"):
        pdvoid.load(_rewrite(saved[1], tmp_path, hist_counts=huge))


def test_a_small_file_cannot_claim_gigabytes(saved, tmp_path):
    """A 2.3 MB file of 2.4 GB of deflated zeros used to take 2.5 GB to load; the budget refuses it from the
    headers, and a header that claims more than its bytes hold is refused without reading."""
    arrays, meta = _arrays(saved[1])
    bomb = tmp_path / "bomb.npz"
    with zipfile.ZipFile(bomb, "w", zipfile.ZIP_DEFLATED) as zf:
        for k, v in arrays.items():
            if k != "hist_counts":
                with zf.open(k + ".npy", "w") as fh:
                    np.lib.format.write_array(fh, v)
        with zf.open("metadata.npy", "w") as fh:
            np.lib.format.write_array(fh, np.frombuffer(json.dumps(meta).encode(), np.uint8))
        header = {"descr": "<i8", "fortran_order": False, "shape": (72, 2**29)}  # 309 GB of int64
        with zf.open("hist_counts.npy", "w", force_zip64=True) as fh:
            np.lib.format.write_array_header_1_0(fh, header)
            fh.write(b"\0" * (1 << 20))  # only 1 MiB follows
    with pytest.raises(InputError, match="declares shape|would take"):
        pdvoid.load(bomb)


def test_memory_budget_names_the_memory_and_the_variable(saved, monkeypatch):
    monkeypatch.setenv("PDVOID_MEMORY_LIMIT", "1kB")
    with pytest.raises(InputError, match=r"would take .* of memory, more than the budget of 1 kB.*PDVOID_MEMORY"):
        pdvoid.load(saved[0])
    monkeypatch.setenv("PDVOID_MEMORY_LIMIT", "lots")
    with pytest.raises(InputError, match="PDVOID_MEMORY_LIMIT must be a size"):
        pdvoid.load(saved[0])


def test_entries_and_compression_are_checked(saved, tmp_path):
    arrays, meta = _arrays(saved[0])
    extra = tmp_path / "extra.npz"
    np.savez(extra, metadata=np.frombuffer(json.dumps(meta).encode(), np.uint8), evil=np.zeros(3), **arrays)
    with pytest.raises(InputError, match="unexpected entry 'evil.npy'"):
        pdvoid.load(extra)
    bz = tmp_path / "bz.npz"
    with zipfile.ZipFile(bz, "w", zipfile.ZIP_BZIP2) as zf:
        with zf.open("metadata.npy", "w") as fh:
            np.lib.format.write_array(fh, np.frombuffer(json.dumps(meta).encode(), np.uint8))
    with pytest.raises(InputError, match="stored or deflated only"):
        pdvoid.load(bz)
    deep = tmp_path / "deep.npz"
    np.savez(deep, metadata=np.frombuffer(b"[" * 100000, np.uint8), **arrays)
    with pytest.raises(InputError, match="not valid JSON"):
        pdvoid.load(deep)


def test_a_fifo_is_not_read(tmp_path):
    import os

    fifo = tmp_path / "pipe.npz"
    os.mkfifo(fifo)
    with pytest.raises(InputError, match="not a regular file"):
        pdvoid.load(fifo)


# ------------------------------------------------------------------------------------------------ exchange
def _events(**kw):
    t = np.array([0.001, 0.004, 0.012, 0.031])
    base = {"phase_deg": (t * 50 % 1) * 360, "charge": np.array([1e-12, -2e-12, 3e-12, -1e-12]), "frequency": 50.0,
            "cycles": 2.0, "time": t}
    base.update(kw)
    return pdvoid.Events(**base)


def _exchange_lines(tmp_path, ev):
    p = write_exchange(ev, tmp_path / "x.txt")
    return p, p.read_text(encoding="utf-8").splitlines()


def test_exchange_round_trip_holds(tmp_path):
    ev = _events()
    p, _ = _exchange_lines(tmp_path, ev)
    back = read_exchange(p)
    np.testing.assert_array_equal(back.time, ev.time)
    np.testing.assert_array_equal(back.cycle, ev.cycle)


@pytest.mark.parametrize("edit, words", [
    (lambda rows: rows.__setitem__(1, rows[1].replace("0.0040000000000000001", "-0.004")), "before the start|phase"),
    (lambda rows: rows.reverse(), "earlier than the event before|phase"),
    (lambda rows: rows.__setitem__(0, rows[0] + "j"), "line"),  # a complex number is not a number here
])
def test_exchange_events_inconsistent_are_refused(tmp_path, edit, words):
    p, lines = _exchange_lines(tmp_path, _events())
    start = lines.index("---") + 2
    rows = lines[start:]
    edit(rows)
    p.write_text("\n".join(lines[:start] + rows) + "\n", encoding="utf-8")
    with pytest.raises(InputError, match=words):
        read_exchange(p)


def test_exchange_header_counts_must_match(tmp_path):
    p, lines = _exchange_lines(tmp_path, _events())
    text = "\n".join(lines).replace('"rows": 4', '"rows": 5').replace('"cycles": 2.0', '"cycles": 0.5')
    p.write_text(text + "\n", encoding="utf-8")
    with pytest.raises(InputError, match="data rows; the header says 5"):
        read_exchange(p)
    p.write_text("\n".join(lines).replace('"cycles": 2.0', '"cycles": 0.5') + "\n", encoding="utf-8")
    with pytest.raises(InputError, match="after the end of the observation|cycle must be"):
        read_exchange(p)


def test_exchange_writer_refuses_what_the_reader_would(tmp_path):
    t = np.array([0.004, 0.001])  # decreasing
    with pytest.raises(InputError, match="cannot be written: time earlier"):
        write_exchange(_events(time=t, phase_deg=(t * 50 % 1) * 360, charge=np.ones(2) * 1e-12), tmp_path / "x")
    assert not (tmp_path / "x").exists()


# ----------------------------------------------------------------------------------------- count matrix
def test_count_matrix_counts_never_wrap(tmp_path):
    p = tmp_path / "m.csv"
    p.write_text("# frequency = 50 Hz\n# cycles = 10\nphase edges [deg],0,180,360\ncharge edges [pC],-1,0,1\n"
                 "counts\n9223372036854775808,0\n0,1\n", encoding="utf-8")  # 2**63 wrapped to -2**63 before
    with pytest.raises(InputError, match="line 6.*from 0 to 2\\*\\*53"):
        read_pattern_matrix(p)
    with pytest.raises(InputError, match="at most 2\\*\\*53"):
        PatternMatrix(np.array([[2**62, 2**62], [2**62, 0]]), [0, 180, 360], [-1, 0, 1], 1, 50)
    with pytest.raises(InputError, match="whole numbers"):
        PatternMatrix(np.array([[1 + 1j, 0], [0, 0]]), [0, 180, 360], [-1, 0, 1], 1, 50)
    with pytest.raises(InputError, match="whole numbers"):
        PatternMatrix(np.array([[True, False], [False, False]]), [0, 180, 360], [-1, 0, 1], 1, 50)
    m = PatternMatrix(np.array([[2**53, 0], [0, 0]], dtype=np.uint64), [0, 180, 360], [-1, 0, 1], 1, 50)
    assert m.total == 2**53


def test_events_refuse_complex_and_text():
    with pytest.raises(InputError, match="charge must hold real numbers"):
        pdvoid.Events(phase_deg=[1.0], charge=np.array([1e-12 + 1e-12j]), frequency=50, cycles=1)
    with pytest.raises(InputError, match="phase_deg must hold real numbers"):
        pdvoid.Events(phase_deg=["1"], charge=[1e-12], frequency=50, cycles=1)
    with pytest.raises(InputError, match="time must hold real numbers"):
        pdvoid.Events(phase_deg=[1.0], charge=[1e-12], frequency=50, cycles=1, time=[True])
