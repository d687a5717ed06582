"""Quantity parsing at the edges (pdvoid.core.units.parse_quantity) and units in scenario files."""

from __future__ import annotations

import math
import re

import pytest

import pdvoid
from pdvoid.core.units import DIMENSIONS, MAX_QUANTITY_TEXT, parse_quantity


@pytest.mark.parametrize(
    "text, dimension, expected",
    [
        # NIST SP 811 (2008), appendix B.8: 1 psi = 6.894757e3 Pa
        ("7 psi", "pressure", 7 * 6.894757e3),
        # NIST SP 811 (2008), appendix B.8: 1 torr = 1.333224e2 Pa
        ("0.5 Torr", "pressure", 0.5 * 133.3224),
        ("0.5 torr", "pressure", 0.5 * 133.3224),
        # NIST SP 811 (2008), appendix B.8: standard atmosphere = 101325 Pa exactly
        ("1 atm", "pressure", 101325.0),
        # SI prefixes (SI Brochure, 9th ed., table 7): k = 1e3, c = 1e-2, so 1 kV/cm = 1e5 V/m by definition
        ("30 kV/cm", "field", 30e5),
        ("2 kV/mm", "field", 2e6),
        # SI prefix p = 1e-12: 1 pF = 1e-12 F
        ("0.1 pF", "capacitance", 0.1e-12),
        # c = 1e-2, squared: 1 cm2 = 1e-4 m2
        ("1 cm2", "area", 1e-4),
        ("1 cm^2", "area", 1e-4),
        ("100 mm2", "area", 1e-4),
        # SI Brochure, 9th ed., 2.3.1: t/degC = T/K - 273.15, so 20 degC = 293.15 K
        ("20 degC", "temperature", 293.15),
        ("20 °C", "temperature", 293.15),
        ("300 K", "temperature", 300.0),
        # SI prefixes m = 1e-3, u/µ = 1e-6
        ("1.2 mm", "length", 1.2e-3),
        ("1200 um", "length", 1.2e-3),
        ("3 us", "time", 3e-6),
        ("3 µs", "time", 3e-6),
        ("50 Hz", "frequency", 50.0),
        ("18kV", "voltage", 18e3),
        ("10 pC", "charge", 10e-12),
        # 1 pC/(kV/mm) = 1e-12 C / 1e6 (V/m) = 1e-18 C/(V/m) (SI prefixes)
        ("1 pC/(kV/mm)", "charge per field", 1e-18),
        ("2 1/(cm3 s)", "rate density", 2e6),
        ("100 1/s", "rate", 100.0),
        # percent = 1e-2 (ISO 80000-1)
        ("30 %", "dimensionless", 0.3),
        # pi rad = 180 deg (definition of the degree); angles come back in degrees
        (f"{math.pi} rad", "angle", 180.0),
        ("90 deg", "angle", 90.0),
    ],
)
def test_conversions_match_published_factors(text, dimension, expected):
    assert parse_quantity(text, dimension, name="x") == pytest.approx(expected, rel=1e-6)


@pytest.mark.parametrize("value, dimension", [(1.5e-3, "length"), (7, "pressure"), ("12", "voltage"),
                                              ("2.5e-3", "time"), (0.25, "dimensionless"), ("30", "angle")])
def test_bare_numbers_are_si(value, dimension):
    assert parse_quantity(value, dimension) == float(value)


def test_inf_allowed_for_times_nan_not():
    # a charge decay time that never ends is written "inf" (scenario files write it so)
    assert parse_quantity("inf", "time") == math.inf
    assert parse_quantity("inf s", "time") == math.inf
    for text in ("nan", "nan s", "NaN"):
        with pytest.raises(pdvoid.InputError, match="charge_decay_time"):
            parse_quantity(text, "time", name="charge_decay_time")


@pytest.mark.parametrize(
    "text, dimension, match",
    [
        ("1 kV", "length", r"void\.diameter.*'1 kV'.*'length'.*mm"),  # wrong dimension
        ("3 mm", "pressure", r"void\.diameter.*'3 mm'.*'pressure'.*atm"),
        ("1 rad/s", "rate", r"void\.diameter.*'rate'"),  # pint counts radians as dimensionless; pdvoid does not
        ("5 deg", "dimensionless", r"void\.diameter.*'dimensionless'"),
        ("5 %", "angle", r"void\.diameter.*'angle'.*deg"),
        ("1 furlongz", "length", r"void\.diameter.*unknown unit 'furlongz'.*mm"),  # unknown unit
        ("1 kV/(mm", "field", r"void\.diameter.*cannot read.*kV/mm"),  # malformed
        ("1 __import__('os')", "length", r"void\.diameter.*not a unit expression"),  # never evaluated
        ("1 m; 2", "length", r"void\.diameter.*not a unit expression"),
        ("one mm", "length", r"void\.diameter.*number"),  # not a number
        ("", "length", r"void\.diameter.*number"),
        ("1 2 mm", "length", r"void\.diameter"),
        ("mm", "length", r"void\.diameter.*number"),
    ],
)
def test_bad_text_raises_input_error_naming_parameter(text, dimension, match):
    with pytest.raises(pdvoid.InputError, match=match):
        parse_quantity(text, dimension, name="void.diameter")


@pytest.mark.parametrize("value", [True, False, None, [1.0], {"v": 1}, b"1 mm"])
def test_booleans_and_non_numbers_refused(value):
    with pytest.raises(pdvoid.InputError, match="thickness"):
        parse_quantity(value, "length", name="thickness")


def test_over_long_text_refused():
    text = "1" + " " * MAX_QUANTITY_TEXT + "mm"
    with pytest.raises(pdvoid.InputError, match=f"thickness.*longer than {MAX_QUANTITY_TEXT}"):
        parse_quantity(text, "length", name="thickness")


def test_unknown_dimension_refused():
    with pytest.raises(pdvoid.InputError, match="dimension must be one of"):
        parse_quantity("1 mm", "lenght")


def test_input_error_is_a_value_error():
    with pytest.raises(ValueError):
        parse_quantity("1 kV", "length")


def test_import_pdvoid_does_not_import_pint():
    import subprocess
    import sys

    code = "import sys, pdvoid; print('pint' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "False"


def test_network_scenario_file_with_pf_and_cm2_loads(tmp_path):
    p = tmp_path / "network.toml"
    p.write_text(
        '[insulation]\nthickness = "3 mm"\npermittivity = 2.3\narea = "1 cm2"\n'
        '[void]\ndiameter = "2 mm"\nheight = "0.2 mm"\nshape = "cylinder"\npressure = "1 atm"\n'
        '[supply]\nrms = "10 kV"\nfrequency = "50 Hz"\n'
        '[model]\nkind = "network"\ncapacitance_void = "0.1 pF"\ncapacitance_series = "0.02 pF"\n'
    )
    sc = pdvoid.Scenario.from_file(p)
    assert sc.insulation.area == pytest.approx(1e-4, rel=1e-12)  # c = 1e-2 (SI prefix), squared
    assert sc.model.capacitance_void == pytest.approx(0.1e-12, rel=1e-12)  # p = 1e-12 (SI prefix)
    assert sc.model.capacitance_series == pytest.approx(0.02e-12, rel=1e-12)
    assert sc.void.pressure == 101325.0  # standard atmosphere, exact (NIST SP 811 (2008), appendix B.8)
    # written back in SI with units, read again: the same scenario
    out = tmp_path / "again.toml"
    sc.to_file(out)
    assert pdvoid.Scenario.from_file(out) == sc


def test_scenario_file_names_the_key_of_a_wrong_unit(tmp_path):
    p = tmp_path / "bad.toml"
    p.write_text(
        '[insulation]\nthickness = "3 mm"\npermittivity = 2.3\narea = "1 cm"\n'
        '[void]\ndiameter = "2 mm"\nheight = "0.2 mm"\n[supply]\nrms = "10 kV"\n'
    )
    with pytest.raises(pdvoid.InputError, match=r"insulation\.area.*'area'"):
        pdvoid.Scenario.from_file(p)


@pytest.mark.parametrize("dimension", sorted(DIMENSIONS))
def test_examples_named_in_error_messages_parse(dimension):
    # every example unit an error message offers must itself be accepted for that dimension
    examples = re.findall(r"'([^']*)'", DIMENSIONS[dimension][1])
    assert examples
    for text in examples:
        assert math.isfinite(parse_quantity(text, dimension, name=dimension))


@pytest.fixture
def fresh_registry(monkeypatch):
    from pdvoid.core import units

    units._parse_unit.cache_clear()
    monkeypatch.setattr(units, "_registry", None)
    yield
    units._parse_unit.cache_clear()  # the cached units belong to this test's registry


def test_registry_is_shared_between_threads(fresh_registry):
    from concurrent.futures import ThreadPoolExecutor

    # first use from several threads at once: one registry, no mixing of units from two (pint refuses to mix them)
    texts = ["1.2 mm", "1 cm2", "7 psi", "20 degC", "3 us"] * 8
    dims = ["length", "area", "pressure", "temperature", "time"] * 8
    with ThreadPoolExecutor(4) as pool:
        values = list(pool.map(parse_quantity, texts, dims))
    assert values[:5] == [parse_quantity(t, d) for t, d in zip(texts[:5], dims[:5], strict=True)]
