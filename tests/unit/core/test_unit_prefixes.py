"""Quantity strings at the edges come back in SI: checked through the public ``parse_quantity`` only.

Expected values follow from the definitions of the SI prefixes (k = 1e3, M = 1e6, m = 1e-3, c = 1e-2,
p = 1e-12; the SI Brochure, 9th ed., its table of SI prefixes) and the exact definitions of the atmosphere
(101325 Pa), the torr (101325/760 Pa) and the degree Celsius (0 degC = 273.15 K), worked by hand here.
"""

from __future__ import annotations

import pytest

from pdvoid.core.units import parse_quantity


@pytest.mark.parametrize(
    "text, expected",
    [
        ("30 kV/cm", 3e6),  # 30 x 1e3 V / 1e-2 m
        ("3 kV/mm", 3e6),  # 3 x 1e3 V / 1e-3 m
        ("3 MV/m", 3e6),  # 3 x 1e6 V / m
        ("1 kV/cm", 1e5),  # 1e3 V / 1e-2 m
        ("2.5 kV/mm", 2.5e6),
        ("4.5 MV/m", 4.5e6),
        ("120 V/m", 120.0),
    ],
)
def test_field_units(text, expected):
    assert parse_quantity(text, "field", name="field") == pytest.approx(expected, rel=1e-12)


def test_rule_of_thumb_units_agree():
    # physics brief §6: "about 3 kV/mm (30 kV/cm)" for air at 1 atm; the two spellings are one field
    a = parse_quantity("30 kV/cm", "field", name="field")
    b = parse_quantity("3 kV/mm", "field", name="field")
    c = parse_quantity("3 MV/m", "field", name="field")
    assert a == pytest.approx(b, rel=1e-12) and b == pytest.approx(c, rel=1e-12)


@pytest.mark.parametrize(
    "text, dimension, expected",
    [
        ("1.5 mm", "length", 1.5e-3),
        ("6 cm", "length", 0.06),
        ("18 kV", "voltage", 18e3),
        ("50 Hz", "frequency", 50.0),
        ("1 atm", "pressure", 101325.0),  # exact by definition
        ("760 Torr", "pressure", 101325.0),  # 1 Torr = 101325/760 Pa, exact
        ("1 bar", "pressure", 1e5),
        ("50 kPa", "pressure", 5e4),
        ("20 ms", "time", 0.02),
        ("5 pC", "charge", 5e-12),
        ("20 degC", "temperature", 293.15),  # 0 degC = 273.15 K by definition
    ],
)
def test_other_units(text, dimension, expected):
    assert parse_quantity(text, dimension, name="value") == pytest.approx(expected, rel=1e-12)
