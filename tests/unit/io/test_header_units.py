"""Measured-file headers accept any unit of the right dimension (through pint), not only a fixed list."""

from __future__ import annotations

import numpy as np
import pytest

import pdvoid


@pytest.mark.parametrize(
    ("header", "row", "expected_time", "expected_charge"),
    [
        # 1 min = 60 s, 1 uC = 1e-6 C (SI prefixes and the minute, NIST SP 811 (2008) table 6 and section 4)
        ("time [min],charge [uC]", "0.001,2e-6", 0.06, 2e-12),
        # 1 ms = 1e-3 s; 1 fC = 1e-15 C (SI prefixes)
        ("time [ms],charge [fC]", "2.5,3000", 2.5e-3, 3e-12),
    ],
)
def test_headers_in_any_unit_of_the_dimension(tmp_path, header, row, expected_time, expected_charge):
    p = tmp_path / "events.csv"
    p.write_text(f"# frequency = 50 Hz\n{header}\n{row}\n", encoding="utf-8")
    ev = pdvoid.read_events(p, duration="1 s")
    assert ev.time[0] == pytest.approx(expected_time, rel=1e-12)
    assert ev.charge[0] == pytest.approx(expected_charge, rel=1e-12)


def test_phase_in_gradians_and_voltage_in_millivolts(tmp_path):
    # 100 gon = 90 deg (the gradian is 1/400 turn, NIST SP 811 (2008) table 10); 1 mV = 1e-3 V
    p = tmp_path / "events.csv"
    p.write_text("# frequency = 50 Hz\nphase [gon],charge [pC],voltage [mV]\n100,5,2e6\n", encoding="utf-8")
    ev = pdvoid.read_events(p, cycles=10)
    assert ev.phase_deg[0] == pytest.approx(90.0, rel=1e-12)
    assert ev.voltage is not None and np.isclose(ev.voltage[0], 2e3, rtol=1e-12)


def test_a_unit_of_another_dimension_is_refused_with_the_line(tmp_path):
    p = tmp_path / "events.csv"
    p.write_text("# frequency = 50 Hz\nphase [deg],charge [kV]\n10,5\n", encoding="utf-8")
    with pytest.raises(pdvoid.InputError, match=r"line 2, column 2: unit 'kV' is not accepted for column 'charge'"):
        pdvoid.read_events(p, cycles=10)
