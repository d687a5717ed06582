"""The "pdvoid-pattern" exchange format: exact round trips, provenance, strict parsing."""

from __future__ import annotations

import json

import numpy as np
import pytest

import pdvoid
from pdvoid.io import EXCHANGE_FORMAT, PatternMatrix, read_exchange, write_exchange
from pdvoid.io import exchange as X
from pdvoid.simulation.events import Events

# Exactness: 17 significant digits reproduce a double (IEEE 754-2008 clause 5.12.2); Python's json writes the
# shortest repr of a float, which also round-trips (Python language reference, float.__repr__).
FIELDS = ("phase_deg", "charge", "time", "cycle", "voltage", "field_before", "field_after")


@pytest.fixture(scope="module")
def result():
    from pdvoid.inputs.demo import demo_scenario

    return pdvoid.simulate(demo_scenario(), cycles=50, seed=9)


def test_result_round_trip_is_exact_with_provenance(tmp_path, result):
    p = write_exchange(result, tmp_path / "r.pdp", provenance={"operator": "test"}, threshold=5e-12)
    back = read_exchange(p)
    for name in FIELDS:
        np.testing.assert_array_equal(getattr(back, name), getattr(result.events, name), err_msg=name)
    assert (back.frequency, back.cycles, back.label) == (50.0, 50.0, "simulated")
    prov = back.extra["provenance"]
    assert (
        prov["operator"] == "test"
        and prov["seed"] == 9
        and prov["scenario"]["void"]["diameter"] == "0.0015 m"
    )
    assert back.extra["threshold"] == 5e-12
    assert p.read_text(encoding="utf-8").splitlines()[0] == f"{EXCHANGE_FORMAT} 1"


def test_partly_unknown_columns_round_trip(tmp_path):
    volts = np.array([1.0, np.nan, 3.0])
    ev = Events(
        phase_deg=[1.0, 2.0, 359.5],
        charge=[1e-12, -0.0, 3e-12],
        frequency=60.0,
        cycles=2.5,
        voltage=volts,
        label="mixed",
    )
    back = read_exchange(write_exchange(ev, tmp_path / "e.pdp"))
    np.testing.assert_array_equal(
        back.voltage, volts
    )  # NaN stays NaN (assert_array_equal treats NaN as equal)
    assert np.isnan(back.time).all() and back.cycles == 2.5 and back.frequency == 60.0
    header = json.loads(p_text_header(tmp_path / "e.pdp"))
    assert header["columns"] == ["phase [deg]", "charge [C]", "voltage [V]"]


def p_text_header(path):
    lines = path.read_text(encoding="utf-8").splitlines()
    return "\n".join(lines[1 : lines.index("---")])


def test_empty_events_round_trip(tmp_path):
    ev = Events(phase_deg=[], charge=[], frequency=50.0, cycles=10.0)
    back = read_exchange(write_exchange(ev, tmp_path / "e.pdp"))
    assert back.count == 0 and back.cycles == 10.0


def test_matrix_round_trip(tmp_path):
    rng = np.random.default_rng(1)
    m = PatternMatrix(
        rng.integers(0, 9, (4, 3)),
        [0.0, 90.0, 180.0, 270.0, 360.0],
        [-1e-10, 0.1e-10, 0.3e-10, 1e-10],
        cycles=12.0,
        frequency=50.0,
        label="m",
    )
    back = read_exchange(write_exchange(m, tmp_path / "m.pdp", provenance={"note": "x"}))
    assert isinstance(back, PatternMatrix)
    np.testing.assert_array_equal(back.counts, m.counts)
    np.testing.assert_array_equal(back.charge_edges, m.charge_edges)  # float repr round trip
    np.testing.assert_array_equal(back.phase_edges_deg, m.phase_edges_deg)
    assert back.extra["provenance"] == {"note": "x"} and back.label == "m"


def _file(tmp_path, header: dict | str, body: str, first: str = f"{EXCHANGE_FORMAT} 1"):
    p = tmp_path / "x.pdp"
    h = header if isinstance(header, str) else json.dumps(header)
    p.write_text(f"{first}\n{h}\n---\n{body}", encoding="utf-8")
    return p


GOOD = {
    "kind": "events",
    "frequency [Hz]": 50.0,
    "cycles": 10.0,
    "columns": ["phase [deg]", "charge [C]"],
    "rows": 2,
}


@pytest.mark.parametrize(
    "first, header, body, pattern",
    [
        ("pdvoid-result 1", GOOD, "", r"line 1: not a pdvoid-pattern file"),
        (f"{EXCHANGE_FORMAT} 2", GOOD, "", r"line 1: format version '2'"),
        (None, "{not json", "", r"line 2: the header is not valid JSON"),
        (None, '{"kind": "events", "cycles": NaN}', "", r"not valid JSON"),
        (None, "[1, 2]", "", r"must be a JSON object"),
        (None, {**GOOD, "kind": "table"}, "", r"'kind' must be"),
        (None, {**GOOD, "frequency [Hz]": -1}, "", r"'frequency \[Hz\]' must be a number > 0"),
        (None, {**GOOD, "cycles": "ten"}, "", r"'cycles' must be a number"),
        (None, {**GOOD, "rows": 3}, "phase [deg],charge [C]\n1,2\n3,4\n", r"2 data rows; the header says 3"),
        (None, GOOD, "phase [deg],charge [pC]\n1,2\n3,4\n", r"line 4: the column line must repeat"),
        (None, GOOD, "phase [deg],charge [C]\n1,2\n3,nan\n", r"line 6: field 2 is NaN"),
        (None, GOOD, "phase [deg],charge [C]\n1,2\n# note\n", r"line 6: expected 2 fields"),
        (None, GOOD, "phase [deg],charge [C]\n1,2\n400,4\n", r"line 6: phase outside"),
        (None, {**GOOD, "columns": ["charge [C]"]}, "", r"must name phase and charge"),
        (None, {**GOOD, "columns": ["phase [deg]", "charge"]}, "", r"has no unit"),
        (
            None,
            {
                "kind": "matrix",
                "frequency [Hz]": 50,
                "cycles": 1,
                "phase edges [deg]": [0, 360],
                "charge edges [C]": [0, 1],
                "shape": [1, 2],
            },
            "1\n",
            r"'shape'",
        ),
        (
            None,
            {
                "kind": "matrix",
                "frequency [Hz]": 50,
                "cycles": 1,
                "phase edges [deg]": [0, 360],
                "charge edges [C]": [0, 1],
                "shape": [1, 1],
            },
            "-1\n",
            r"line 4: counts must be whole",
        ),
        (
            None,
            {
                "kind": "matrix",
                "frequency [Hz]": 50,
                "cycles": 1,
                "phase edges [deg]": [0, 360],
                "charge edges [C]": [1, 0],
                "shape": [1, 1],
            },
            "1\n",
            r"strictly increasing",
        ),
    ],
)
def test_malformed_exchange_files(tmp_path, first, header, body, pattern):
    p = _file(tmp_path, header, body, first or f"{EXCHANGE_FORMAT} 1")
    with pytest.raises(pdvoid.InputError, match=pattern) as err:
        read_exchange(p)
    assert str(p) in str(err.value)


def test_header_without_end_and_header_limit(tmp_path, monkeypatch):
    p = tmp_path / "x.pdp"
    p.write_text(f"{EXCHANGE_FORMAT} 1\n{{}}\n", encoding="utf-8")
    with pytest.raises(pdvoid.InputError, match="no line '---'"):
        read_exchange(p)
    monkeypatch.setattr(X, "MAX_HEADER_CHARS", 10)
    q = _file(tmp_path, GOOD, "")
    with pytest.raises(pdvoid.InputError, match="header longer than 10"):
        read_exchange(q)


def test_writer_rejects_bad_provenance_and_threshold(tmp_path):
    ev = Events(phase_deg=[1.0], charge=[1.0], frequency=50.0, cycles=1.0)
    with pytest.raises(pdvoid.InputError, match="JSON values"):
        write_exchange(ev, tmp_path / "a.pdp", provenance={"x": float("nan")})
    with pytest.raises(pdvoid.InputError, match="JSON values"):
        write_exchange(ev, tmp_path / "a.pdp", provenance={"x": object()})
    with pytest.raises(pdvoid.InputError, match="threshold"):
        write_exchange(ev, tmp_path / "a.pdp", threshold=-1.0)
    with pytest.raises(pdvoid.InputError, match="expected discharge events"):
        write_exchange("not events", tmp_path / "a.pdp")
