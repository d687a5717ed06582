"""Supplies without a period, the conduction keys, and their scenario-file form."""

from __future__ import annotations

import math

import numpy as np
import pytest

import pdvoid
from pdvoid.inputs.supplies import supply_kinds

_TOML = """
[insulation]
thickness = "10 mm"
permittivity = 4.0
conductivity = "{cond}"

[void]
diameter = "1 mm"
height = "1 mm"
surface_conductivity = "{surf}"

[supply]
kind = "dc"
voltage = "-40 kV"
ripple = [[1, 0.02, 0.0], [2, "1 %", 90.0]]
ripple_frequency = "300 Hz"
rise_time = "2 s"
"""


def test_scenario_file_accepts_the_new_keys_with_units(tmp_path):
    p = tmp_path / "dc.toml"
    p.write_text(_TOML.format(cond="1e-15 S/cm", surf="3 fS"), encoding="utf-8")
    with pytest.raises(pdvoid.InputError):  # "1 %" is not a plain fraction in a ripple list
        pdvoid.Scenario.from_file(p)
    p.write_text(_TOML.format(cond="1e-15 S/cm", surf="3 fS").replace('"1 %"', "0.01"), encoding="utf-8")
    s = pdvoid.Scenario.from_file(p)
    assert s.insulation.conductivity == pytest.approx(1e-13, rel=1e-12)  # 1e-15 S/cm = 1e-13 S/m
    assert s.void.surface_conductivity == pytest.approx(3e-15, rel=1e-12)
    assert isinstance(s.supply, pdvoid.DC) and s.supply.voltage == -40e3 and s.supply.rise_time == 2.0
    assert s.supply.ripple == ((1, 0.02, 0.0), (2, 0.01, 90.0))
    # written back and read again: the same scenario
    back = pdvoid.Scenario.from_file(s.to_file(tmp_path / "again.toml"))
    assert back == s


@pytest.mark.parametrize("cond,surf", [("-1e-14 S/m", "0 S"), ("2 S/m", "0 S"), ("1e-14 V", "0 S"),
                                       ("1e-14 S/m", "-1 fS"), ("1e-14 S/m", "1 S/m")])
def test_scenario_file_refuses_bad_conduction_values(tmp_path, cond, surf):
    p = tmp_path / "bad.toml"
    p.write_text(_TOML.format(cond=cond, surf=surf).replace('"1 %"', "0.01"), encoding="utf-8")
    with pytest.raises(pdvoid.InputError, match="conductivity"):
        pdvoid.Scenario.from_file(p)


def test_scenario_file_names_the_supply_kinds(tmp_path):
    p = tmp_path / "bad.toml"
    text = _TOML.format(cond="0 S/m", surf="0 S").replace('"1 %"', "0.01")
    p.write_text(text.replace('kind = "dc"', 'kind = "dcc"'), encoding="utf-8")
    with pytest.raises(pdvoid.InputError, match="polarity_reversal"):
        pdvoid.Scenario.from_file(p)
    p.write_text(text.replace('rise_time = "2 s"', 'rise_time = "2 s"\nfrequency = "50 Hz"'), encoding="utf-8")
    with pytest.raises(pdvoid.InputError, match="supply.frequency"):
        pdvoid.Scenario.from_file(p)
    assert supply_kinds() == ("dc", "polarity_reversal", "piecewise_linear", "square_wave",
                             "cosine_rectangular")


def test_lossless_files_are_written_as_before(tmp_path):
    # zero conductivities are the default and are not written (files of older scenarios keep their text)
    s = pdvoid.Scenario(pdvoid.Insulation(6e-3, 4.2), pdvoid.Void(1e-3, 1e-3), pdvoid.Sine(10e3))
    text = s.to_file(tmp_path / "s.toml").read_text(encoding="utf-8")
    assert "conductivity" not in text


def test_polarity_reversal_and_piecewise_round_trip(tmp_path):
    for sup in (pdvoid.PolarityReversal(30e3, hold_time=100.0, ramp_time=5.0, reversals=3, rise_time=1.0,
                                        ripple=((6, 0.01, 0.0),), ripple_frequency=50.0),
                pdvoid.PiecewiseLinear([0.0, 1.0, 3.0], [0.0, 2e4, -1e4]),
                pdvoid.SquareWave(2e3, 2e4, 1e-7, duty=0.2, bipolar=False),
                pdvoid.CosineRectangular(2e4, 0.1, 0.05),
                pdvoid.DC(-3e4, rise_time=1.0, off_time=50.0, decay_time=2.0)):
        s = pdvoid.Scenario(pdvoid.Insulation(6e-3, 4.2), pdvoid.Void(1e-3, 1e-3), sup)
        assert pdvoid.Scenario.from_file(s.to_file(tmp_path / "s.toml")) == s


def test_supply_pieces():
    # polarity reversal: +V until hold, linear to -V over the ramp, then -V (hand values)
    p = pdvoid.PolarityReversal(1e4, hold_time=10.0, ramp_time=2.0).pieces(30.0)
    np.testing.assert_allclose(p.voltage(np.array([0.0, 9.9, 10.5, 11.0, 12.0, 29.0])),
                               [1e4, 1e4, 5e3, 0.0, -1e4, -1e4], atol=1e-9)
    # DC with a rise and a ripple of 2 % at order 1, phase 0: V(t) = V (min(t/rise, 1) + 0.02 sin(w t))
    d = pdvoid.DC(2e4, ripple=((1, 0.02, 0.0),), ripple_frequency=100.0, rise_time=4.0)
    t = np.array([0.0, 1.0, 2.00125, 10.0025])
    np.testing.assert_allclose(d.pieces(20.0).voltage(t),
                               2e4 * (np.minimum(t / 4.0, 1.0) + 0.02 * np.sin(2 * np.pi * 100.0 * t)), atol=1e-7)
    assert d.peak == pytest.approx(2e4 * 1.02, rel=1e-12)
    assert d.rms == pytest.approx(2e4 * math.sqrt(1 + 0.02**2 / 2), rel=1e-12)
    # piecewise-linear rms of a triangle 0 -> A -> 0: A/sqrt(3) (textbook)
    assert pdvoid.PiecewiseLinear([0.0, 1.0, 2.0], [0.0, 3.0, 0.0]).rms == pytest.approx(3 / math.sqrt(3))


def test_piecewise_from_csv(tmp_path):
    p = tmp_path / "supply.csv"
    p.write_text("# measured (synthetic)\ntime [s],voltage [V]\n0,0\n0.5,1000\n2,1000\n", encoding="utf-8")
    s = pdvoid.PiecewiseLinear.from_csv(p)
    assert np.array_equal(s.times, [0.0, 0.5, 2.0]) and np.array_equal(s.voltages, [0.0, 1000.0, 1000.0])
    p.write_text("time [s],voltage [V]\n0,0\n0.5,abc\n", encoding="utf-8")
    with pytest.raises(pdvoid.InputError, match="line 3"):
        pdvoid.PiecewiseLinear.from_csv(p)
    with pytest.raises(pdvoid.InputError, match="no such file"):
        pdvoid.PiecewiseLinear.from_csv(tmp_path / "missing.csv")


@pytest.mark.parametrize("make", [
    lambda: pdvoid.DC(0.0),
    lambda: pdvoid.DC(2e7),
    lambda: pdvoid.DC("10 kV"),
    lambda: pdvoid.DC(1e4, ripple=((0, 0.1, 0.0),)),
    lambda: pdvoid.DC(1e4, ripple=((1, 1.5, 0.0),)),
    lambda: pdvoid.DC(1e4, ripple=((1, 0.1, 0.0), (1, 0.1, 0.0))),
    lambda: pdvoid.DC(1e4, ripple=[1, 0.1, 0.0]),
    lambda: pdvoid.DC(1e4, ripple_frequency=0.0),
    lambda: pdvoid.DC(1e4, rise_time=-1.0),
    lambda: pdvoid.DC(1e4, off_time=10.0, ripple=((1, 0.01, 0.0),)),
    lambda: pdvoid.DC(1e4, decay_time=5.0),
    lambda: pdvoid.DC(1e4, rise_time=20.0, off_time=10.0),
    lambda: pdvoid.DC(1e4, off_time=0.0),
    lambda: pdvoid.PolarityReversal(1e4, hold_time=10.0, ramp_time=0.0),
    lambda: pdvoid.PolarityReversal(1e4, hold_time=10.0, ramp_time=1.0, reversals=0),
    lambda: pdvoid.PolarityReversal(1e4, hold_time=10.0, ramp_time=1.0, rise_time=20.0),
    lambda: pdvoid.PiecewiseLinear([1.0, 2.0], [0.0, 1.0]),
    lambda: pdvoid.PiecewiseLinear([0.0, 0.0], [0.0, 1.0]),
    lambda: pdvoid.PiecewiseLinear([0.0, 1.0], [0.0, 0.0]),
    lambda: pdvoid.PiecewiseLinear([0.0, 1.0, 2.0], [0.0, 1.0]),
    lambda: pdvoid.SquareWave(1e3, 1e3, 0.0),
    lambda: pdvoid.CosineRectangular(1e3, 0.1, 5.0),
    lambda: pdvoid.CosineRectangular(1e3, 0.1, 0.0),
    lambda: pdvoid.CosineRectangular(0.0, 0.1, 0.01),
    lambda: pdvoid.SquareWave(1e3, 1e3, 1e-6, duty=1.0),
    lambda: pdvoid.SquareWave(1e3, 2e6, 1e-9),
    lambda: pdvoid.SquareWave(1e3, 1e3, 1e-6, bipolar="yes"),
    lambda: pdvoid.Insulation(6e-3, 4.2, conductivity=-1.0),
    lambda: pdvoid.Insulation(6e-3, 4.2, conductivity=float("nan")),
    lambda: pdvoid.Void(1e-3, 1e-3, surface_conductivity=2.0),
])
def test_bad_supplies_and_conductivities_are_refused(make):
    with pytest.raises(pdvoid.InputError):
        make()
