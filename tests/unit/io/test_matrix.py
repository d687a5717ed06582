"""Phase-resolved count matrices with bin edges: round trips, conversion to events, malformed files."""

from __future__ import annotations

import numpy as np
import pytest

import pdvoid
from pdvoid.io import (
    PatternMatrix,
    describe_read,
    matrix_from_events,
    read_pattern_matrix,
    write_pattern_matrix,
)
from pdvoid.simulation.events import Events

# Exact round trips: 17 significant digits reproduce a double (IEEE 754-2008 clause 5.12.2); counts are
# integers. SI prefixes from the BIPM SI Brochure (9th ed., table 7).


@pytest.fixture
def matrix():
    rng = np.random.default_rng(5)
    counts = rng.integers(0, 50, (36, 16))
    return PatternMatrix(
        counts,
        np.linspace(0.0, 360.0, 37),
        np.geomspace(1e-12, 1e-9, 17) * 1.0,
        cycles=500.0,
        frequency=50.0,
        label="bench",
    )


@pytest.mark.parametrize("delimiter", [",", ";", "\t"])
def test_round_trip_si(tmp_path, matrix, delimiter):
    p = write_pattern_matrix(matrix, tmp_path / "m.csv", delimiter=delimiter, metadata={"site": "lab"})
    back = read_pattern_matrix(p)
    np.testing.assert_array_equal(back.counts, matrix.counts)  # integers
    np.testing.assert_array_equal(back.phase_edges_deg, matrix.phase_edges_deg)  # IEEE 754 17 digits
    np.testing.assert_array_equal(back.charge_edges, matrix.charge_edges)
    assert (back.cycles, back.frequency, back.label) == (500.0, 50.0, "bench")
    assert (
        back.extra["metadata"]["site"] == "lab"
        and back.extra["summary"]["discharges counted"] == matrix.total
    )
    assert "phase bins: 36" in describe_read(back)


def test_round_trip_other_units(tmp_path, matrix):
    p = write_pattern_matrix(matrix, tmp_path / "m.csv", charge_unit="pC", phase_unit="rad")
    back = read_pattern_matrix(p)
    # one division and one multiplication by the unit factor: a few ulp (common practice)
    np.testing.assert_allclose(back.charge_edges, matrix.charge_edges, rtol=4e-16)
    np.testing.assert_allclose(back.phase_edges_deg, matrix.phase_edges_deg, rtol=4e-16, atol=1e-13)
    assert back.phase_edges_deg[-1] == 360.0  # 2 pi rad is exactly the full turn after the documented snap


def test_hand_written_layout_with_decimal_comma(tmp_path):
    text = (
        "# cycles = 20\n# frequency = 60 Hz\ncharge edges [nC];-0,5;0;0,5\nphase edges [deg];0;180;360\n\n"
        "counts\n1;2\n# comment inside the counts\n3;4\n"
    )
    p = tmp_path / "m.csv"
    p.write_text(text, encoding="utf-8")
    m = read_pattern_matrix(p)
    np.testing.assert_array_equal(m.counts, [[1, 2], [3, 4]])
    np.testing.assert_array_equal(m.charge_edges, [-0.5e-9, 0.0, 0.5e-9])  # nC = 1e-9 C (SI prefix)
    assert m.frequency == 60.0 and m.cycles == 20.0


def test_to_events_places_events_at_bin_centres():
    m = PatternMatrix(
        [[2, 0], [0, 1]], [0.0, 180.0, 360.0], [1e-12, 1e-11, 1e-10], cycles=3.0, frequency=50.0
    )
    ev = m.to_events()
    np.testing.assert_array_equal(ev.phase_deg, [90.0, 90.0, 270.0])  # centres of [0,180) and [180,360)
    np.testing.assert_allclose(ev.charge, [5.5e-12, 5.5e-12, 5.5e-11], rtol=1e-15)  # arithmetic centres
    geo = m.to_events("geometric")
    np.testing.assert_allclose(geo.charge, [np.sqrt(1e-23)] * 2 + [np.sqrt(1e-21)], rtol=1e-15)
    with pytest.raises(pdvoid.InputError, match="geometric"):
        PatternMatrix([[1]], [0.0, 360.0], [-1.0, 1.0], cycles=1.0, frequency=50.0).to_events("geometric")


def test_matrix_from_events_counts_everything():
    ev = Events(phase_deg=[10.0, 10.0, 350.0], charge=[1e-12, 2e-12, -1e-12], frequency=50.0, cycles=2.0)
    m = matrix_from_events(ev, [0.0, 180.0, 360.0], [-3e-12, 0.0, 3e-12])
    np.testing.assert_array_equal(m.counts, [[0, 2], [1, 0]])
    with pytest.raises(pdvoid.InputError, match="outside the given edges"):
        matrix_from_events(ev, [0.0, 180.0, 360.0], [0.0, 3e-12])


@pytest.mark.parametrize(
    "text, pattern",
    [
        ("phase edges [deg],0,360\ncounts\n1\n", r"before the charge edges"),
        ("phase edges [deg],0,360\ncharge edges [pC],0,1\ncounts\n1\n2\n", r"line 5: 2 count rows for 1"),
        ("phase edges [deg],0,360\ncharge edges [pC],0,1\ncounts\n", r"0 count rows for 1"),
        ("phase edges [deg],0,400\ncharge edges [pC],0,1\ncounts\n1\n", r"line 1: phase edges must lie"),
        ("phase edges [deg],10,5\n", r"line 1: phase edges must be at least 2 strictly increasing"),
        ("phase edges [deg],0\n", r"line 1: phase edges must be at least 2"),
        ("phase edges [V],0,360\n", r"line 1: .*not accepted"),
        ("phase edges [deg],0,360\nphase edges [deg],0,360\n", r"line 2: a second phase edges line"),
        ("phase bins,0,360\n", r"line 1: expected 'phase edges"),
        ("phase edges [deg],0,360\ncharge edges [pC],0,1\ncounts,3\n1\n", r"line 3: the 'counts' line"),
        ("phase edges [deg],0,360\ncharge edges [pC],0,1\ncounts\n1.5\n", r"line 4: counts must be whole"),
        ("phase edges [deg],0,360\ncharge edges [pC],0,1\ncounts\n-1\n", r"line 4: counts must be whole"),
        ("phase edges [deg],0,360\ncharge edges [pC],0,1,2\ncounts\n1\n", r"line 4: expected 2 fields"),
        ("phase edges [deg],0,360\ncharge edges [pC],0,x\n", r"line 2: field 3 is not a number"),
        ("# just a comment\n", r"no 'counts' line"),
    ],
)
def test_malformed_matrix_files(tmp_path, text, pattern):
    p = tmp_path / "m.csv"
    p.write_text(text, encoding="utf-8")
    with pytest.raises(pdvoid.InputError, match=pattern):
        read_pattern_matrix(p, cycles=1, frequency=50)


def test_cycles_and_frequency_required(tmp_path):
    p = tmp_path / "m.csv"
    p.write_text("phase edges [deg],0,360\ncharge edges [pC],0,1\ncounts\n1\n", encoding="utf-8")
    with pytest.raises(pdvoid.InputError, match="frequency unknown"):
        read_pattern_matrix(p, cycles=1)
    with pytest.raises(pdvoid.InputError, match="cycles unknown"):
        read_pattern_matrix(p, frequency=50)


@pytest.mark.parametrize(
    "kwargs, pattern",
    [
        ({"counts": [[1, 2]]}, "shape"),
        ({"counts": [[-1]]}, "whole numbers"),
        ({"counts": [[0.5]]}, "whole numbers"),
        ({"phase_edges_deg": [0.0, 400.0]}, "inside"),
        ({"charge_edges": [1.0, 1.0]}, "strictly increasing"),
        ({"cycles": 0.0}, "cycles"),
        ({"frequency": float("nan")}, "frequency"),
    ],
)
def test_pattern_matrix_validation(kwargs, pattern):
    args = {
        "counts": [[1]],
        "phase_edges_deg": [0.0, 360.0],
        "charge_edges": [0.0, 1.0],
        "cycles": 1.0,
        "frequency": 50.0,
    }
    args.update(kwargs)
    with pytest.raises(pdvoid.InputError, match=pattern):
        PatternMatrix(**args)
