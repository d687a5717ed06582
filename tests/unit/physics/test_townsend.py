"""Unit tests of the Townsend branch, the Paschen-minimum floor and the combined inception criterion."""

from __future__ import annotations

import math
import warnings

import pytest

import pdvoid
from pdvoid import InputError
from pdvoid.core import ValidityWarning
from pdvoid.inputs.materials import get_gas
from pdvoid.physics.inception import gas_inception_field, inception_criterion, paschen_voltage
from pdvoid.physics.townsend import (
    TORR_CM,
    WALL_SECONDARY_EMISSION,
    InceptionResult,
    combine_criteria,
    paschen_floor_voltage,
    townsend_breakdown_voltage,
    wall_secondary_emission,
)

AIR = get_gas("air")
KW = dict(a_coefficient=AIR.paschen_a, b_coefficient=AIR.paschen_b, secondary_emission=AIR.secondary_emission)
FLOOR = dict(minimum_voltage=327.0, minimum_pd=AIR.paschen_minimum_pd, reference_emission=0.01)


def test_townsend_voltage_equals_paschen_right_of_asymptote_and_inf_left():
    # Source: the same formula as paschen_voltage (bazelyan1998); left of ln(1 + 1/gamma)/A no breakdown (derived).
    assert townsend_breakdown_voltage(101325.0, 50e-6, **KW) == pytest.approx(paschen_voltage(101325.0, 50e-6, **KW),
                                                                              rel=1e-14)
    asym = math.log1p(100.0) / AIR.paschen_a
    assert townsend_breakdown_voltage(1.0, 0.999 * asym, **KW) == math.inf
    assert townsend_breakdown_voltage(1.0, asym, **KW) == math.inf
    assert math.isfinite(townsend_breakdown_voltage(1.0, 1.001 * asym, **KW))


def test_townsend_warns_above_its_fit_range():
    # Source: raizer1991 E/p >= 100 V/(cm Torr) (from memory) -> pd <= 20 Pa m here (TOWNSEND_PD_MAX).
    with pytest.warns(ValidityWarning, match="20 Pa m"):
        townsend_breakdown_voltage(101325.0, 1e-3, **KW)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        townsend_breakdown_voltage(101325.0, 1e-3, check_validity=False, **KW)


def test_floor_minimum_and_left_branch():
    # Source: derived: the fit through (pd_min, V_min) has its minimum there and V_min to its right.
    pd_min = AIR.paschen_minimum_pd
    assert paschen_floor_voltage(1.0, pd_min, secondary_emission=0.01, **FLOOR) == pytest.approx(327.0, rel=1e-12)
    assert paschen_floor_voltage(1.0, 10 * pd_min, secondary_emission=0.01, **FLOOR) == pytest.approx(327.0,
                                                                                                       rel=1e-12)
    assert paschen_floor_voltage(1.0, 0.7 * pd_min, secondary_emission=0.01, **FLOOR) > 327.0
    assert paschen_floor_voltage(1.0, pd_min / math.e, secondary_emission=0.01, **FLOOR) == math.inf
    # temperature enters through the density: twice the temperature at twice the pressure is the same gas density
    assert paschen_floor_voltage(2.0, 0.5 * pd_min, temperature=2 * 293.15, secondary_emission=0.01,
                                 **FLOOR) == pytest.approx(
        paschen_floor_voltage(1.0, 0.5 * pd_min, secondary_emission=0.01, **FLOOR), rel=1e-12)


@pytest.mark.parametrize("bad", [0.0, -0.1, 1.5, math.nan, "0.01"])
def test_bad_secondary_emission_names_the_parameter(bad):
    with pytest.raises(InputError, match="secondary_emission"):
        townsend_breakdown_voltage(1e5, 1e-3, a_coefficient=11.25, b_coefficient=273.8, secondary_emission=bad)
    with pytest.raises(InputError, match="secondary_emission"):
        inception_criterion("air", 1e5, 1e-3, secondary_emission=bad)


def test_wall_defaults():
    # Source: WALL_SECONDARY_EMISSION (metal: bazelyan1998 confirmed; polymer: from memory).
    assert wall_secondary_emission("metal") == WALL_SECONDARY_EMISSION["metal"] == 0.01
    assert wall_secondary_emission("polymer") == WALL_SECONDARY_EMISSION["polymer"]
    with pytest.raises(InputError, match="wall"):
        wall_secondary_emission("glass")


def test_regimes_and_reasons():
    r = inception_criterion("air", 101325.0, 1e-3)
    assert isinstance(r, InceptionResult) and r.regime == "streamer" and "streamer regime" in r.reason
    assert r.field == pytest.approx(gas_inception_field("air", 101325.0, 1e-3, combined=False), rel=1e-15)
    r = inception_criterion("air", 101325.0, 60e-6)
    assert r.regime == "townsend" and "secondary emission" in r.reason
    r = inception_criterion("air", 101325.0, 10e-6)
    assert r.regime == "townsend" and "floor" in r.reason and r.voltage == pytest.approx(327.0, rel=1e-9)
    r = inception_criterion("air", 101325.0, 1e-6)
    assert r.regime == "no self-sustained discharge" and math.isinf(r.field) and not r.finite
    assert gas_inception_field("air", 101325.0, 1e-6) == math.inf


def test_combined_is_continuous_across_regime_changes():
    # derived: the combination is max/min of continuous curves, so a 1e-6 step in pd changes E by < 1e-5
    import numpy as np

    for criterion in ("streamer", "ionization_integral"):
        pd = np.geomspace(0.22, 1000.0, 3000) * TORR_CM
        v = np.array([inception_criterion("air", x / 1e-3, 1e-3, criterion=criterion).voltage for x in pd])
        v2 = np.array([inception_criterion("air", x * (1 + 1e-6) / 1e-3, 1e-3, criterion=criterion).voltage
                       for x in pd])
        assert np.all(np.abs(v2 / v - 1.0) < 2e-5)


def test_sf6_refuses_the_townsend_branch_with_a_warning():
    # SF6 has no Townsend constants in gases.toml: streamer criterion alone, ValidityWarning below its range.
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        r = inception_criterion("sf6", 1e5, 1e-3)
    assert r.regime == "streamer" and "no Townsend constants" in r.reason and math.isnan(r.townsend_field)
    with pytest.warns(ValidityWarning, match="sf6"):
        inception_criterion("sf6", 1e5, 50e-6)


def test_warning_above_the_range():
    with pytest.warns(ValidityWarning, match="above 10000 Pa m"):
        inception_criterion("air", 1e6, 0.05)


def test_combine_criteria_checks_streamer_field():
    with pytest.raises(InputError, match="streamer_field"):
        combine_criteria(AIR, 1e5, 1e-3, 293.15, -1.0)
    r = combine_criteria(AIR, 1e5, 1e-3, 293.15, math.inf)
    assert r.regime == "townsend"  # no streamer possible: the Townsend criterion decides


def test_nitrogen_has_a_floor():
    # Source: naidu2013 (from memory): N2 minimum 251 V at 0.67 Torr cm.
    r = inception_criterion("nitrogen", 0.67 * TORR_CM / 1e-3, 1e-3)
    assert r.voltage == pytest.approx(251.0, rel=1e-6)


def test_void_options_validate():
    with pytest.raises(InputError, match="void.fill_temperature"):
        pdvoid.Void(diameter=1e-3, height=1e-3, fill_temperature=300.0)
    with pytest.raises(InputError, match="void.fill_temperature"):
        pdvoid.Void(diameter=1e-3, height=1e-3, sealed=True, fill_temperature=100.0)
    with pytest.raises(InputError, match="void.sealed"):
        pdvoid.Void(diameter=1e-3, height=1e-3, sealed=1)
    with pytest.raises(InputError, match="void.secondary_emission"):
        pdvoid.Void(diameter=1e-3, height=1e-3, secondary_emission=0.0)
    v = pdvoid.Void(diameter=1e-3, height=1e-3, sealed=True, temperature=350.0)  # sealed at its own temperature
    assert v.gas_pressure == v.pressure


# µm-scale voids lie near the Paschen minimum, where compute_coefficients rightly adds a ValidityWarning
# (pdvoid.coefficients.limits.warn_near_paschen_minimum); this test checks other numbers
@pytest.mark.filterwarnings("ignore:p\\*l = .* is near the Paschen minimum:pdvoid.core.validity.ValidityWarning")
def test_void_secondary_emission_reaches_the_coefficients():
    ins = pdvoid.Insulation(thickness=6e-3, permittivity=4.2)
    c1 = pdvoid.compute_coefficients(pdvoid.Scenario(ins, pdvoid.Void(diameter=10e-6, height=10e-6),
                                                     pdvoid.Sine(rms=1e3)))
    c5 = pdvoid.compute_coefficients(pdvoid.Scenario(ins, pdvoid.Void(diameter=10e-6, height=10e-6,
                                                                      secondary_emission=0.05), pdvoid.Sine(rms=1e3)))
    assert c5.inception_field < c1.inception_field
    assert c1.inception_regime == "townsend" and c1.inception_reason


def test_scenario_file_round_trip_with_sealed_void(tmp_path):
    from pdvoid.inputs.scenario import read_scenario, write_scenario

    s = pdvoid.Scenario(pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
                        pdvoid.Void(diameter=1e-3, height=1e-3, temperature=353.15, sealed=True,
                                    fill_temperature=293.15, secondary_emission=0.02), pdvoid.Sine(rms=10e3))
    path = write_scenario(s, tmp_path / "s.toml")
    assert read_scenario(path) == s
    text = (tmp_path / "t.toml")
    text.write_text('[insulation]\nthickness = "6 mm"\npermittivity = 4.2\n[void]\ndiameter = "1 mm"\n'
                    'height = "1 mm"\ntemperature = "80 degC"\nsealed = true\nfill_temperature = "20 degC"\n'
                    '[supply]\nkind = "sine"\nrms = "10 kV"\n', encoding="utf-8")
    v = read_scenario(text).void
    assert v.sealed and v.fill_temperature == pytest.approx(293.15) and v.temperature == pytest.approx(353.15)


def test_no_discharge_void_simulates_to_zero_events_and_analyses():
    # an infinite inception field flows through simulate, inception and margins without NaN or errors
    s = pdvoid.Scenario(pdvoid.Insulation(thickness=6e-3, permittivity=4.2), pdvoid.Void(diameter=1e-6, height=1e-6),
                        pdvoid.Sine(rms=30e3))
    c = pdvoid.compute_coefficients(s)
    assert math.isinf(c.inception_field) and math.isinf(c.inception_voltage)
    assert c.inception_regime == "no self-sustained discharge"
    assert pdvoid.simulate(s, cycles=3, seed=1).event_count == 0
    est = pdvoid.inception(s)
    assert math.isinf(est.inception_voltage) and est.inception_regime == "no self-sustained discharge"
    from pdvoid.analysis.margins import design_margin, margin_table

    t = margin_table(s, values=[1e-6, 1e-4])
    assert math.isinf(t.inception_voltage[0]) and math.isfinite(t.inception_voltage[1])
    assert design_margin(s, 8e3).margin == math.inf
    with pytest.raises(InputError, match="no finite inception voltage"):
        pdvoid.inception(s, ramp=True)
