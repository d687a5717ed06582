"""pdvoid.faces.summary_table: the one place the SI run summary gets display units."""

from __future__ import annotations

import math

import pytest

from pdvoid.analysis.summary import RunSummary
from pdvoid.core.errors import InputError
from pdvoid.faces.summary_table import SUMMARY_ROWS, summary_dict, summary_rows

# an invented run: 100 cycles at 50 Hz (T = 2 s), 250 discharges of mean 20 pC, the first at 0.5 s (cycle 25:
# 250 / 80 cycles = 3.125 per cycle, 250 / 1.6 s = 156.25 /s afterwards; hand calculation)
SUMMARY = RunSummary(
    cycles=100,
    duration=2.0,
    discharge_count=250,
    discharges_per_cycle=2.5,
    mean_apparent_charge=20e-12,
    largest_apparent_charge=math.nan,
    average_discharge_current=2.5e-9,
    quadratic_rate=6e-22,
    discharge_power=4e-5,
    pulse_repetition_rate=125.0,
    first_discharge_time=0.5,
    discharges_per_cycle_after_first=3.125,
    pulse_repetition_rate_after_first=156.25,
)


def test_rows_in_display_units():
    rows = summary_dict(SUMMARY)
    # SI prefixes: pico 1e-12, nano 1e-9, milli 1e-3 (SI brochure, common practice)
    assert rows["discharges per cycle [-]"] == 2.5
    assert rows["mean apparent charge [pC]"] == pytest.approx(20.0, rel=1e-15)
    assert rows["average discharge current I [nA]"] == pytest.approx(2.5, rel=1e-15)
    assert rows["quadratic rate D [pC²/s]"] == pytest.approx(600.0, rel=1e-15)
    assert rows["discharge power P [mW]"] == pytest.approx(0.04, rel=1e-15)
    assert rows["pulse repetition rate n [1/s]"] == 125.0
    assert rows["first discharge after [s]"] == 0.5
    assert rows["discharges per cycle from the first discharge on [-]"] == 3.125
    assert rows["pulse repetition rate from the first discharge on [1/s]"] == 156.25
    assert math.isnan(rows["largest apparent charge [pC]"])  # a missing number stays missing, never 0


def test_rows_follow_the_table_order():
    assert [label for label, _ in summary_rows(SUMMARY)] == [label for label, _, _ in SUMMARY_ROWS]
    assert {name for _, name, _ in SUMMARY_ROWS} <= set(RunSummary.UNITS)


def test_a_plain_dict_is_refused():
    with pytest.raises(InputError, match="RunSummary"):
        summary_rows({"mean apparent charge [pC]": 1.0})  # type: ignore[arg-type]  # the wrong type on purpose
