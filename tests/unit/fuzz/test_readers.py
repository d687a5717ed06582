"""Fuzz every reader of files: the result (.npz), exchange, count-matrix and event-list readers, scenario, sweep
and parameter files. Each example is a valid file with random damage; the reader must give its object or raise
InputError, never another exception, and never allocate more than a small bound (tracemalloc)."""

from __future__ import annotations

import functools
import json
import tempfile
import warnings
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import pdvoid
from pdvoid import InputError
from pdvoid.inputs.demo import demo_measured_path, demo_scenario_path, demo_sweep_path
from pdvoid.io import read_exchange, read_pattern_matrix, write_exchange, write_pattern_matrix
from pdvoid.io.matrix import PatternMatrix

FUZZ = settings.get_profile("pdvoid-fuzz")
PARAMETERS = Path(pdvoid.__file__).parent / "inputs" / "parameter_sets"
LIMIT = 64 * 1024**2  # bytes any one damaged small file may make a reader allocate

_JSON = st.recursive(st.none() | st.booleans() | st.integers(-2**70, 2**70) | st.floats() | st.text(max_size=8),
                     lambda c: st.lists(c, max_size=3) | st.dictionaries(st.text(max_size=5), c, max_size=3),
                     max_leaves=6)


def _scenario():
    return pdvoid.Scenario(insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
                           void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3),
                           supply=pdvoid.Sine(rms=18e3, frequency=50.0),
                           model=pdvoid.FieldModel(lag_free=True, residual_ratio=0.2))


@functools.cache
def _files():
    """The valid files the fuzz damages (built once; a plain function, so that hypothesis does not print them)."""
    d = Path(tempfile.mkdtemp(prefix="pdvoid-fuzz-"))
    res = pdvoid.simulate(_scenario(), cycles=6, seed=2)
    hist = pdvoid.simulate(_scenario(), cycles=6, seed=2, histogram=True)
    ev = res.events
    m = PatternMatrix(np.array([[3, 0, 1], [0, 2, 5]]), [0, 180, 360], [-2e-12, -1e-12, 1e-12, 2e-12], 10, 50)
    return {
        "result": res.save(d / "r.npz").read_bytes(),
        "histogram": hist.save(d / "h.npz").read_bytes(),
        "exchange": write_exchange(ev, d / "x.txt").read_text(),
        "exchange-matrix": write_exchange(m, d / "xm.txt").read_text(),
        "matrix": write_pattern_matrix(m, d / "m.csv").read_text(),
        "events": res.to_csv(d / "e.csv").read_text(),
        "measured": demo_measured_path().read_text(),
        "scenario": demo_scenario_path().read_text(),
        "sweep": demo_sweep_path().read_text().replace('"demo.toml"', f'"{demo_scenario_path()}"'),
        "materials": (PARAMETERS / "materials.toml").read_text(),
        "gases": (PARAMETERS / "gases.toml").read_text(),
    }


def _refused_or_read(read, path, allocation_limit):
    with allocation_limit(LIMIT):
        try:
            read(path)
        except InputError:
            pass


# ------------------------------------------------------------------------------------------- binary damage
_DAMAGE = st.tuples(st.lists(st.tuples(st.floats(0, 1, exclude_max=True), st.integers(0, 255)), max_size=6),
                    st.one_of(st.none(), st.floats(0, 1)))


def _damaged(data: bytes, damage) -> bytes:
    edits, cut = damage
    b = bytearray(data)
    for where, value in edits:
        b[int(where * len(b))] = value
    if cut is not None:
        b = b[: int(cut * len(b))]
    return bytes(b)


def _check_result_bytes(tmp_path, allocation_limit, which, damage):
    p = tmp_path / "damaged.npz"
    p.write_bytes(_damaged(_files()[which], damage))
    _refused_or_read(pdvoid.load, p, allocation_limit)


@settings(FUZZ, max_examples=60)
@given(which=st.sampled_from(["result", "histogram"]), damage=_DAMAGE)
def test_damaged_result_files(tmp_path, allocation_limit, which, damage):
    _check_result_bytes(tmp_path, allocation_limit, which, damage)


@pytest.mark.slow
@settings(FUZZ, max_examples=2000)
@given(which=st.sampled_from(["result", "histogram"]), damage=_DAMAGE)
def test_damaged_result_files_long(tmp_path, allocation_limit, which, damage):
    _check_result_bytes(tmp_path, allocation_limit, which, damage)


# ---------------------------------------------------------------------------------- result metadata values
_META_KEYS = ["cycles", "requested_cycles", "seed", "event_count", "sum_abs_charge", "sum_charge_squared",
              "sum_charge_voltage", "first_discharge_time", "histogram", "references", "version", "label",
              "scenario", "format_version"]


def _check_metadata(tmp_path, allocation_limit, which, changes, arrays_change):
    import io

    with np.load(io.BytesIO(_files()[which])) as z:
        arrays = {k: z[k] for k in z.files}
    meta = json.loads(arrays.pop("metadata").tobytes())
    for key, value in changes:
        meta[key] = value
    for name, how in arrays_change:
        a = arrays.get(name)
        if a is None:
            continue
        with warnings.catch_warnings():  # the damage itself may cast complex to real
            warnings.simplefilter("ignore")
            arrays[name] = {"drop": a[:-1], "neg": -a, "float32": a.astype(np.float32), "complex": a.astype(complex),
                            "2d": a.reshape(1, -1), "empty": a[:0]}[how]
    p = tmp_path / "meta.npz"
    np.savez_compressed(p, metadata=np.frombuffer(json.dumps(meta).encode(), np.uint8), **arrays)
    _refused_or_read(pdvoid.load, p, allocation_limit)


_CHANGES = st.lists(st.tuples(st.sampled_from(_META_KEYS), _JSON), max_size=3)
_ARRAY_CHANGES = st.lists(st.tuples(st.sampled_from(["time", "charge", "cycle", "phase_deg", "voltage",
                                                     "hist_counts", "hist_charge_edges", "hist_phase_edges_deg"]),
                                    st.sampled_from(["drop", "neg", "float32", "complex", "2d", "empty"])),
                          max_size=2)


@settings(FUZZ, max_examples=60)
@given(which=st.sampled_from(["result", "histogram"]), changes=_CHANGES, arrays_change=_ARRAY_CHANGES)
def test_result_metadata_and_arrays(tmp_path, allocation_limit, which, changes, arrays_change):
    _check_metadata(tmp_path, allocation_limit, which, changes, arrays_change)


@pytest.mark.slow
@settings(FUZZ, max_examples=2000)
@given(which=st.sampled_from(["result", "histogram"]), changes=_CHANGES, arrays_change=_ARRAY_CHANGES)
def test_result_metadata_and_arrays_long(tmp_path, allocation_limit, which, changes, arrays_change):
    _check_metadata(tmp_path, allocation_limit, which, changes, arrays_change)


# -------------------------------------------------------------------------------------------- text damage
_TOKENS = st.sampled_from(["", "nan", "inf", "-1", "0", "1e308", "1e-320", "9" * 30, "1+2j", "x", ",", ",,", "#",
                           "---", "[", "]", "{", "}", "\"", "=", "counts", "phase edges [deg]", "charge [pC]",
                           "\ufeff", "\x00", " ", "\t", "1,2", "0,180,360", "-0.5", "2**63", "9223372036854775808"])
_TEXT_EDIT = st.lists(st.tuples(st.sampled_from(["replace", "insert", "delete", "append", "swap"]),
                                st.floats(0, 1, exclude_max=True), st.lists(_TOKENS, max_size=4)), min_size=1,
                      max_size=4)


def _edited(text: str, edits) -> str:
    lines = text.split("\n")
    for op, where, tokens in edits:
        i = int(where * len(lines))
        piece = "".join(tokens)
        if op == "replace":
            lines[i] = piece
        elif op == "insert":
            lines.insert(i, piece)
        elif op == "delete" and len(lines) > 1:
            del lines[i]
        elif op == "append":
            lines[i] += piece
        elif op == "swap" and len(lines) > 1:
            j = (i + 1) % len(lines)
            lines[i], lines[j] = lines[j], lines[i]
    return "\n".join(lines)


def _readers():
    from pdvoid.inputs.materials import load_gases, load_materials
    from pdvoid.sweeps.files import read_sweep_file

    return {
        "exchange": read_exchange, "exchange-matrix": read_exchange,
        "matrix": read_pattern_matrix, "events": lambda p: pdvoid.read_events(p),
        "measured": lambda p: pdvoid.read_events(p), "scenario": pdvoid.Scenario.from_file,
        "sweep": read_sweep_file, "materials": load_materials, "gases": load_gases,
    }


def _check_text(tmp_path, allocation_limit, which, edits):
    readers = _readers()
    source = _files()[which]
    p = tmp_path / ("damaged.toml" if which in ("scenario", "sweep", "materials", "gases") else "damaged.txt")
    p.write_text(_edited(source, edits), encoding="utf-8", errors="surrogatepass")
    _refused_or_read(readers[which], p, allocation_limit)


_WHICH = st.sampled_from(["exchange", "exchange-matrix", "matrix", "events", "measured", "scenario", "sweep",
                          "materials", "gases"])


@settings(FUZZ, max_examples=150)
@given(which=_WHICH, edits=_TEXT_EDIT)
def test_damaged_text_files(tmp_path, allocation_limit, which, edits):
    _check_text(tmp_path, allocation_limit, which, edits)


@pytest.mark.slow
@settings(FUZZ, max_examples=3000)
@given(which=_WHICH, edits=_TEXT_EDIT)
def test_damaged_text_files_long(tmp_path, allocation_limit, which, edits):
    _check_text(tmp_path, allocation_limit, which, edits)
