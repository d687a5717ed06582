"""Event lists in delimited text: every supported layout round-trips; every malformed line names itself."""

from __future__ import annotations

import numpy as np
import pytest

import pdvoid
from pdvoid.io import describe_read, read_events, write_events
from pdvoid.io import lines as L
from pdvoid.simulation.events import Events

# Exactness of the round trips rests on two facts (common practice): printing a double with 17 significant
# digits and parsing it back gives the same double (IEEE 754-2008, clause 5.12.2), and numpy's text parser
# rounds decimal text correctly. Unit factors are the SI prefixes (BIPM, SI Brochure, 9th ed., table 7).


def write(tmp_path, text: str | bytes, name: str = "events.csv"):
    p = tmp_path / name
    if isinstance(text, bytes):
        p.write_bytes(text)
    else:
        p.write_text(text, encoding="utf-8", newline="")
    return p


@pytest.fixture(scope="module")
def simulated():
    from pdvoid.inputs.demo import demo_scenario

    return pdvoid.simulate(demo_scenario(), cycles=60, seed=3)


def test_writer_round_trip_is_exact_in_si_units(tmp_path, simulated):
    ev = simulated.events
    assert ev.count > 20  # the test needs events (demo scenario, 60 cycles)
    p = write_events(ev, tmp_path / "sim.csv")
    back = read_events(p)  # the file carries frequency and cycles: no options needed
    for name in ("phase_deg", "charge", "time", "cycle", "voltage", "field_before", "field_after"):
        # 17 significant digits round-trip doubles exactly (IEEE 754-2008 5.12.2)
        np.testing.assert_array_equal(getattr(back, name), getattr(ev, name), err_msg=name)
    assert back.frequency == ev.frequency and back.cycles == ev.cycles and back.label == ev.label


def test_result_csv_export_reads_back_with_the_frequency(tmp_path, simulated):
    p = simulated.to_csv(tmp_path / "result.csv")
    back = read_events(p, frequency=50.0)
    np.testing.assert_array_equal(back.charge, simulated.charge)  # exact (IEEE 754 17-digit round trip)
    np.testing.assert_array_equal(back.phase_deg, simulated.phase_deg)
    # the export declares the cycles observed (a comment line), so the observation time is the result's own,
    # not the span of its events
    assert back.cycles == simulated.cycles
    assert "floor" not in back.extra["summary"]["cycles from"]


def test_writer_other_units_round_trip_to_rounding(tmp_path, simulated):
    ev = simulated.events
    p = write_events(
        ev, tmp_path / "u.csv", units={"charge": "pC", "time": "ms", "voltage": "kV"}, delimiter=";"
    )
    back = read_events(p)
    # one division and one multiplication by the prefix: a few ulp (common practice)
    np.testing.assert_allclose(back.charge, ev.charge, rtol=4e-16, atol=0.0)
    np.testing.assert_allclose(back.time, ev.time, rtol=4e-16, atol=0.0)
    assert back.extra["summary"]["columns"][0] == "time [ms]"


LAYOUTS = {
    # name: (header or None, delimiter, decimal, options, columns in the file with their SI factors)
    "phase deg, charge pC, comma": (
        "phase [deg],charge [pC]",
        ",",
        ".",
        {"cycles": 100, "frequency": 50},
        [("phase", 1.0), ("charge", 1e-12)],
    ),
    "semicolon, decimal comma": (
        "phase [deg];charge [pC]",
        ";",
        ",",
        {"cycles": 100, "frequency": 60},
        [("phase", 1.0), ("charge", 1e-12)],
    ),
    "tab, declared decimal comma": (
        "phase [deg]\tcharge [nC]",
        "\t",
        ",",
        {"cycles": 100, "frequency": 50, "decimal": ","},
        [("phase", 1.0), ("charge", 1e-9)],
    ),
    "time ms, charge C, cycle, voltage kV": (
        "time [ms]\tcharge [C]\tcycle [-]\tvoltage [kV]",
        "\t",
        ".",
        {"frequency": "50 Hz"},
        [("time", 1e-3), ("charge", 1.0), ("cycle", 1.0), ("voltage", 1e3)],
    ),
    "no header, columns option, rad and fC": (
        None,
        ",",
        ".",
        {"cycles": 100, "frequency": 50, "columns": ["phase [rad]", "charge [fC]"]},
        [("phase", 180.0 / np.pi), ("charge", 1e-15)],
    ),
    "header without units, units option": (
        "Phase,Apparent charge",
        ",",
        ".",
        {"cycles": 100, "frequency": 50, "units": {"charge": "pC", "phase": "deg"}},
        [("phase", 1.0), ("charge", 1e-12)],
    ),
    "skip column, round brackets": (
        "channel (-);time (s);charge (pC)",
        ";",
        ".",
        {"frequency": 50, "columns": ["skip", "time", "charge"]},
        [("skip", 1.0), ("time", 1.0), ("charge", 1e-12)],
    ),
}


def _layout_values(cols, rng, n=40):
    f = 50.0
    cyc = rng.integers(0, 90, n).astype(float)
    phase = np.round(rng.uniform(0.0, 359.0, n), 3)
    order = np.argsort(cyc + phase / 360.0)  # events in time order
    cyc, phase = cyc[order], phase[order]
    out = {}
    for name, factor in cols:
        if name == "phase":
            out[name] = phase if factor == 1.0 else np.round(np.deg2rad(phase), 6)
        elif name == "charge":
            out[name] = np.round(rng.normal(0.0, 100.0, n), 4)
        elif name == "time":
            t = (cyc + phase / 360.0) / f
            out[name] = np.round(t / factor, 9)
        elif name == "cycle":
            out[name] = cyc
        elif name == "voltage":
            out[name] = np.round(rng.uniform(-20, 20, n), 5)
        else:
            out[name] = rng.integers(1, 4, n).astype(float)
    return out


@pytest.mark.parametrize("layout", sorted(LAYOUTS))
def test_every_layout_round_trips(tmp_path, layout):
    header, delim, decimal, options, cols = LAYOUTS[layout]
    options = {k: v for k, v in options.items() if v is not None}
    vals = _layout_values(cols, np.random.default_rng(7))
    if "time" in vals and "cycle" in vals:  # cycle must agree with time: floor(t f)
        vals["cycle"] = np.floor(vals["time"] * 1e-3 * 50.0 + 1e-9) if cols[0][1] == 1e-3 else vals["cycle"]
    table = np.column_stack([vals[n] for n, _ in cols])
    lines = [delim.join(repr(float(x)) for x in row) for row in table]
    if decimal == ",":
        lines = [ln.replace(".", ",") for ln in lines]
    text = (
        "# a comment before the header\n"
        + (header + "\n" if header else "")
        + "\n".join(lines[:20])
        + "\n\n# a comment between rows\n"
        + "\n".join(lines[20:])
        + "\n"
    )
    p = write(tmp_path, text)
    ev = read_events(p, **options)
    assert ev.count == len(lines)
    for name, factor in cols:
        if name == "skip":
            continue
        attr = "phase_deg" if name == "phase" else name
        expected = vals[name] * factor
        if (
            name == "phase" and factor != 1.0
        ):  # rad -> deg: one multiplication (SI brochure: 1 rad = 180/pi deg)
            np.testing.assert_allclose(getattr(ev, attr), expected, rtol=1e-15)
        else:  # exact: the same text parsed, times the same prefix (IEEE 754 correctly rounded operations)
            np.testing.assert_array_equal(getattr(ev, attr), expected, err_msg=name)
    s = ev.extra["summary"]
    assert s["comment lines"] == 2 and s["blank lines"] == 1 and s["events"] == len(lines)
    assert s["decimal mark"] == decimal


def test_time_column_gives_phase_and_cycle(tmp_path):
    # t = 0.0125 s at 50 Hz is 0.625 cycle: cycle 0, phase 225 deg; t = 0.0250 s is cycle 1, phase 90 deg
    p = write(tmp_path, "# frequency = 50 Hz\ntime [s],charge [pC]\n0.0125,-5\n0.025,7\n0.025,8\n")
    ev = read_events(p)
    np.testing.assert_allclose(ev.phase_deg, [225.0, 90.0, 90.0], rtol=0, atol=1e-9)  # definition of phase
    np.testing.assert_array_equal(ev.cycle, [0.0, 1.0, 1.0])
    assert ev.cycles == 2.0  # floor(0.025 * 50) + 1, the documented default
    assert read_events(p, cycles=10).cycles == 10.0
    assert read_events(p, duration="1 s").cycles == 50.0  # 1 s at 50 Hz


def test_phase_only_needs_cycles_or_duration(tmp_path):
    p = write(tmp_path, "# frequency = 50 Hz\nphase [deg],charge [pC]\n10,1\n")
    with pytest.raises(pdvoid.InputError, match=r"cycles= or duration="):
        read_events(p)
    assert read_events(p, cycles=3).cycles == 3.0
    assert read_events(p, duration=0.1).cycles == pytest.approx(5.0, rel=1e-15)  # 0.1 s x 50 Hz
    assert np.isnan(read_events(p, cycles=3).time).all()


def test_frequency_is_required(tmp_path):
    p = write(tmp_path, "phase [deg],charge [pC]\n10,1\n")
    with pytest.raises(pdvoid.InputError, match=r"frequency"):
        read_events(p, cycles=3)


def test_cycle_column_with_phase_gives_time(tmp_path):
    p = write(
        tmp_path, "# frequency = 50 Hz\n# cycles = 4\ncycle [-],phase [deg],charge [pC]\n2,90,1\n3,270,-1\n"
    )
    ev = read_events(p)
    np.testing.assert_allclose(ev.time, [(2 + 0.25) / 50.0, (3 + 0.75) / 50.0], rtol=1e-15)  # (c + phi/360)/f


@pytest.mark.parametrize(
    "text, line, reason",
    [
        (
            "# frequency = 50 Hz\n# cycles = 4\ncycle [-],phase [deg],charge [pC]\n2,90,1\n4,270,-1\n",
            5,
            "beyond",
        ),
        (
            "# frequency = 50 Hz\n# cycles = 4\ncycle [-],phase [deg],charge [pC]\n2.5,90,1\n",
            4,
            "whole number",
        ),
        ("# frequency = 50 Hz\ntime [s],charge [pC]\n0.01,1\n0.02,1\n0.015,1\n", 5, "time decreases"),
        ("# frequency = 50 Hz\ntime [s],charge [pC]\n-0.01,1\n", 3, "negative time"),
        (
            "# frequency = 50 Hz\n# cycles = 1\ntime [s],charge [pC]\n0.01,1\n0.03,1\n",
            5,
            "beyond the observation",
        ),
        ("# frequency = 50 Hz\ntime [s],phase [deg],charge [pC]\n0.005,90,1\n0.015,90,1\n", 4, "disagrees"),
        ("# frequency = 50 Hz\ntime [s],cycle [-],charge [pC]\n0.005,0,1\n0.025,0,1\n", 4, "cycle disagrees"),
        ("# frequency = 50 Hz\n# frequency = 60 Hz\nphase [deg],charge [pC]\n1,1\n", 2, "again"),
        ("# frequency = fifty\nphase [deg],charge [pC]\n1,1\n", 1, "frequency"),
    ],
)
def test_inconsistent_files_name_the_line(tmp_path, text, line, reason):
    p = write(tmp_path, text)
    with pytest.raises(pdvoid.InputError) as err:
        read_events(p, cycles=None) if "cycles" in text or "time" in text else read_events(p, cycles=5)
    msg = str(err.value)
    assert str(p) in msg and f"line {line}:" in msg and reason in msg, msg


BAD_LINES = [
    ("abc,1", "not a number"),
    ("1,2,3", "expected 2 fields"),
    ("1", "expected 2 fields"),
    ("1,", "field 2 is empty"),
    ("nan,1", "NaN"),
    ("1,inf", "infinite"),
    ("1e999,1", "infinite"),
    ("0x10,1", "not a number"),
    ("1_0,1", "not a plain decimal"),
    ("360,1", "phase outside"),
    ("-0.5,1", "phase outside"),
    ("1;2", "expected 2 fields"),
    ("phase [deg],charge [pC]", "not a number"),
]


@pytest.mark.parametrize("bad, reason", BAD_LINES)
@pytest.mark.parametrize("where", [0, 5, 9])
def test_malformed_line_is_named(tmp_path, bad, reason, where):
    rows = [f"{10 * i + 1},{i - 4}" for i in range(10)]
    rows.insert(where, bad)
    p = write(
        tmp_path, "# frequency = 50 Hz\n# cycles = 10\nphase [deg],charge [pC]\n" + "\n".join(rows) + "\n"
    )
    with pytest.raises(pdvoid.InputError) as err:
        read_events(p)
    msg = str(err.value)
    assert f"{p}, line {4 + where}: " in msg and reason in msg, msg


def test_decimal_point_in_decimal_comma_file(tmp_path):
    p = write(tmp_path, "phase [deg];charge [pC]\n1,5;2,5\n3.5;1\n")
    with pytest.raises(pdvoid.InputError, match=r"line 3: '\.' found"):
        read_events(p, cycles=1, frequency=50)


@pytest.mark.parametrize(
    "raw, reason",
    [(b"phase [deg],charge [pC]\n1,\xff\n", "not UTF-8"), (b"phase [deg],charge [pC]\n1,2\x00\n", "NUL")],
)
def test_binary_content_is_named(tmp_path, raw, reason):
    p = write(tmp_path, raw)
    with pytest.raises(pdvoid.InputError, match=rf"line 2: {reason}"):
        read_events(p, cycles=1, frequency=50)


def test_bom_and_crlf_are_accepted(tmp_path):
    p = write(tmp_path, "\ufeffphase [deg],charge [pC]\r\n1,2\r\n3,4\r\n")
    ev = read_events(p, cycles=1, frequency=50)
    np.testing.assert_array_equal(ev.charge, [2e-12, 4e-12])  # pC prefix 1e-12 (SI brochure)


def test_limits(tmp_path, monkeypatch):
    p = write(tmp_path, "phase [deg],charge [pC]\n" + "1,2\n" * 20)
    monkeypatch.setattr(L, "MAX_ROWS", 10)
    with pytest.raises(pdvoid.InputError, match=r"line 12: more than 10 data rows"):
        read_events(p, cycles=1, frequency=50)
    monkeypatch.setattr(L, "MAX_FILE_BYTES", 50)
    with pytest.raises(pdvoid.InputError, match=r"larger than the limit of 50 bytes"):
        read_events(p, cycles=1, frequency=50)
    monkeypatch.setattr(L, "MAX_FILE_BYTES", 10**6)
    monkeypatch.setattr(L, "MAX_LINE_CHARS", 30)
    q = write(tmp_path, "phase [deg],charge [pC]\n1,2\n1," + "2" * 40 + "\n", "long.csv")
    with pytest.raises(pdvoid.InputError, match=r"line 3: line longer than 30"):
        read_events(q, cycles=1, frequency=50)


def test_real_limits_are_the_documented_ones():
    assert L.MAX_FILE_BYTES == 200 * 1024**2 and L.MAX_LINE_CHARS == 10_000 and L.MAX_ROWS == 50_000_000


@pytest.mark.parametrize(
    "text, kwargs, pattern",
    [
        ("phase [deg],charge [pC]\n1,2\n", {"cycles": 1, "frequency": 50, "delimiter": "|"}, "delimiter"),
        (
            "phase [deg],charge [pC]\n1,2\n",
            {"cycles": 1, "frequency": 50, "delimiter": ",", "decimal": ","},
            "decimal",
        ),
        ("phase [deg],charge [pC]\n1,2\n", {"cycles": 1, "duration": 1, "frequency": 50}, "not both"),
        ("phase [deg],charge [pC]\n1,2\n", {"cycles": -1, "frequency": 50}, "cycles must be > 0"),
        ("phase [deg],charge [pC]\n1,2\n", {"cycles": 1, "frequency": "50 kV"}, "frequency"),
        ("phase [deg],colour [pC]\n1,2\n", {"cycles": 1, "frequency": 50}, "unknown column 'colour'"),
        ("phase [deg],charge\n1,2\n", {"cycles": 1, "frequency": 50}, "has no unit"),
        ("phase [deg],charge [mV]\n1,2\n", {"cycles": 1, "frequency": 50}, "not accepted"),
        ("phase [deg],phase [deg],charge [C]\n1,2,3\n", {"cycles": 1, "frequency": 50}, "appears twice"),
        ("phase [deg],voltage [V]\n1,2\n", {"cycles": 1, "frequency": 50}, "no charge column"),
        ("cycle [-],charge [C]\n1,2\n", {"cycles": 5, "frequency": 50}, "phase or a time"),
        ("1,2\n", {"cycles": 1, "frequency": 50}, "without a header"),
        (
            "phase [deg],charge [pC]\n1,2\n",
            {"cycles": 1, "frequency": 50, "columns": ["time [s]", "charge [pC]"]},
            "columns= gives 'time'",
        ),
        (
            "phase [deg],charge [pC]\n1,2\n",
            {"cycles": 1, "frequency": 50, "columns": ["phase", "charge", "skip"]},
            "the header has 2 columns",
        ),
        (
            "phase [deg],charge [pC]\n1,2\n",
            {"cycles": 1, "frequency": 50, "units": {"charge": "nC"}},
            "already has unit",
        ),
        ("# only comments\n\n", {"cycles": 1, "frequency": 50}, "no header line and no data"),
        ("# frequency = 50 Hz\nphase [deg],charge [pC]\n1,2\n", {"cycles": 1, "frequency": 60}, "was given"),
    ],
)
def test_bad_headers_and_options(tmp_path, text, kwargs, pattern):
    p = write(tmp_path, text)
    with pytest.raises(pdvoid.InputError, match=pattern):
        read_events(p, **kwargs)


def test_bad_paths(tmp_path):
    with pytest.raises(pdvoid.InputError, match="cannot read"):
        read_events(tmp_path / "missing.csv", cycles=1, frequency=50)
    with pytest.raises(pdvoid.InputError, match="not a regular file"):
        read_events(tmp_path, cycles=1, frequency=50)
    with pytest.raises(pdvoid.InputError, match="file name"):
        read_events(3, cycles=1, frequency=50)


def test_summary_and_description(tmp_path):
    text = (
        "# frequency = 50 Hz\n# threshold = 5 pC\n# site = test bay 2\n\ntime [s],charge [nC]\n0.001,0.1\n"
        "# mid-file note\n0.5,-0.2\n"
    )
    p = write(tmp_path, text)
    ev = read_events(p)
    s = ev.extra["summary"]
    assert (s["lines"], s["comment lines"], s["blank lines"], s["header line"], s["events"]) == (
        8,
        4,
        1,
        5,
        2,
    )
    assert s["columns"] == ["time [s]", "charge [nC]"] and s["time span [s]"] == (0.001, 0.5)
    assert ev.extra["threshold"] == pytest.approx(5e-12, rel=1e-15)  # 5 pC (SI prefix)
    assert ev.extra["metadata"]["site"] == "test bay 2"
    text_out = describe_read(ev)
    assert "comment lines: 4" in text_out and "time [s], charge [nC]" in text_out and "events: 2" in text_out
    with pytest.raises(pdvoid.InputError, match="summary"):
        describe_read(Events(phase_deg=[1.0], charge=[1.0], frequency=50.0, cycles=1.0))


def test_zero_events_with_header_only(tmp_path):
    p = write(tmp_path, "phase [deg],charge [pC]\n")
    ev = read_events(p, cycles=100, frequency=50)
    assert ev.count == 0 and ev.cycles == 100.0
    q = write(tmp_path, "# frequency = 50 Hz\ntime [s],charge [pC]\n", "t.csv")
    with pytest.raises(pdvoid.InputError, match="no events"):
        read_events(q)


def test_writer_metadata_and_checks(tmp_path):
    ev = Events(phase_deg=[10.0, 200.0], charge=[1e-12, -2e-12], frequency=50.0, cycles=4.0, label="bench A")
    p = write_events(ev, tmp_path / "w.csv", metadata={"operator": "nobody"}, comments=["hello"])
    back = read_events(p)
    assert back.extra["metadata"]["operator"] == "nobody" and back.label == "bench A"
    np.testing.assert_array_equal(back.charge, ev.charge)  # IEEE 754 17-digit round trip
    with pytest.raises(pdvoid.InputError, match="non-finite"):
        write_events(ev, tmp_path / "x.csv", columns=["time", "charge"])
    with pytest.raises(pdvoid.InputError, match="cannot be written"):
        write_events(ev, tmp_path / "x.csv", metadata={"bad key!": 1})
    with pytest.raises(pdvoid.InputError, match="not accepted"):
        write_events(ev, tmp_path / "x.csv", units={"charge": "kV"})
