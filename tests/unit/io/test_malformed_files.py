"""Hypothesis-generated malformed files: only InputError, quickly, naming the line."""

from __future__ import annotations

import re

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import pdvoid
from pdvoid.io import read_events, read_exchange, read_pattern_matrix

FAST = settings(max_examples=120, deadline=2000, suppress_health_check=[HealthCheck.function_scoped_fixture])
LINE = re.compile(r", line (\d+): ")

# always-invalid replacements for one data row of a "time [s],charge [pC]" file (any position)
ALWAYS_BAD = st.sampled_from(
    [
        "x,1",
        "1,2,3",
        "1",
        ",",
        "1,",
        "nan,1",
        "1,nan",
        "inf,1",
        "-1,1",
        "1,1e999",
        "0x1,1",
        "1;2",
        "1 2,3",
        "time [s],charge [pC]",
        "1,,",
        "\u0661,1",
        "--1,1",
    ]
)
TOKENS = st.one_of(
    st.floats(allow_nan=True, allow_infinity=True).map(repr),
    st.integers(-(10**6), 10**6).map(str),
    st.text(alphabet=",;.\t #eE+-0123456789abcnaifx[]()", max_size=12),
    st.text(max_size=8),
)


def _valid_rows(increments):
    t = np.cumsum(np.asarray(increments, dtype=float))
    return [f"{float(x)!r},{(-1) ** i * (i + 1)}" for i, x in enumerate(t)]


@FAST
@given(increments=st.lists(st.floats(1e-4, 1e-2), min_size=1, max_size=30), bad=ALWAYS_BAD, data=st.data())
def test_one_bad_row_is_named_exactly(tmp_path_factory, increments, bad, data):
    rows = _valid_rows(increments)
    where = data.draw(st.integers(0, len(rows)))
    rows.insert(where, bad)
    p = tmp_path_factory.mktemp("one") / "f.csv"
    p.write_text("# frequency = 50 Hz\ntime [s],charge [pC]\n" + "\n".join(rows) + "\n", encoding="utf-8")
    try:
        read_events(p)
    except pdvoid.InputError as exc:
        m = LINE.search(str(exc))
        assert str(p) in str(exc) and m is not None, str(exc)
        assert int(m.group(1)) == 3 + where, str(exc)  # header on line 2, first row on line 3
    else:
        raise AssertionError(f"{bad!r} at row {where} was accepted")


@FAST
@given(lines=st.lists(st.lists(TOKENS, min_size=0, max_size=4).map(",".join), max_size=25))
def test_random_rows_raise_only_input_error_naming_a_line(tmp_path_factory, lines):
    p = tmp_path_factory.mktemp("rnd") / "f.csv"
    body = "\n".join(lines)
    p.write_text("# frequency = 50 Hz\ntime [s],charge [pC]\n" + body + "\n", encoding="utf-8")
    file_lines = body.split("\n")  # tokens may hold line breaks themselves
    try:
        ev = read_events(p, cycles=10**6)
    except pdvoid.InputError as exc:
        msg = str(exc)
        assert str(p) in msg
        m = LINE.search(msg)
        assert m is not None, msg  # the header is valid, so every complaint is about a line
        assert 3 <= int(m.group(1)) <= 2 + len(file_lines), msg
    else:
        assert ev.count == sum(1 for s in file_lines if s.strip() and not s.strip().startswith("#"))


@FAST
@given(raw=st.binary(max_size=400))
def test_arbitrary_bytes_never_crash(tmp_path_factory, raw):
    p = tmp_path_factory.mktemp("bytes") / "f.csv"
    p.write_bytes(raw)
    for reader, kwargs in (
        (read_events, {"cycles": 5, "frequency": 50}),
        (read_pattern_matrix, {}),
        (read_exchange, {}),
    ):
        try:
            reader(p, **kwargs)
        except pdvoid.InputError as exc:
            assert str(p) in str(exc)


@FAST
@given(text=st.text(max_size=300))
def test_arbitrary_text_never_crashes(tmp_path_factory, text):
    p = tmp_path_factory.mktemp("text") / "f.csv"
    p.write_text(text, encoding="utf-8")
    for reader, kwargs in (
        (read_events, {"cycles": 5, "frequency": 50}),
        (read_pattern_matrix, {"cycles": 1}),
        (read_exchange, {}),
    ):
        try:
            reader(p, **kwargs)
        except pdvoid.InputError as exc:
            assert str(p) in str(exc)


@FAST
@given(row=st.integers(0, 3), bad=st.sampled_from(["1,2", "1,x,3", "-1,0,0", "1.5,0,0", "nan,0,0", ""]))
def test_matrix_bad_count_row_is_named(tmp_path_factory, row, bad):
    rows = ["1,2,3", "0,0,0", "4,5,6", "7,8,9"]
    rows[row] = bad
    text = (
        "# frequency = 50 Hz\n# cycles = 10\nphase edges [deg],0,90,180,270,360\ncharge edges [pC],-1,0,1,2\n"
        "counts\n" + "\n".join(rows) + "\n"
    )
    p = tmp_path_factory.mktemp("mx") / "m.csv"
    p.write_text(text, encoding="utf-8")
    try:
        read_pattern_matrix(p)
    except pdvoid.InputError as exc:
        m = LINE.search(str(exc))
        if bad == "":  # a blank line is skipped: one row too few, a file-level complaint
            assert "3 count rows for 4 phase bins" in str(exc)
        else:
            assert m is not None and int(m.group(1)) == 6 + row, str(exc)
    else:
        raise AssertionError(f"{bad!r} accepted")
