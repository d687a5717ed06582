"""Inception studies and design margins: analytic, simulated stepped test, missing probability, largest void."""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from scipy import stats

import pdvoid
from pdvoid.analysis.inception import probability_of_missing, ramp_test, time_above_inception_fraction
from pdvoid.analysis.margins import design_margin, largest_pd_free_void, margin_table
from pdvoid.faces.cli.command import main


def test_analytic_inception_matches_the_field_balance(demo):
    # U_inc = E_inc·d/(f·√2) for a sine: the void field f·√2·U/d reaches E_inc at the crest (brief §2.1, derived)
    est = pdvoid.inception(demo)
    d = demo.insulation.thickness
    assert est.inception_voltage == pytest.approx(est.inception_field * d / (est.field_enhancement * math.sqrt(2)),
                                                  rel=1e-12)
    # extinction estimate: peak void field at (E_inc + E_res)/2 (brief §1.4: odd family sustains down to it)
    assert est.extinction_voltage == pytest.approx(est.inception_voltage * (1 + 0.25) / 2, rel=1e-12)
    assert est.inception_voltage_integral > est.inception_voltage_streamer  # 4.665 vs 4.547 kV·mm (brief §3.1)


def test_lag_free_ramp_returns_the_analytic_inception_within_one_step(demo):
    sc = demo.replace(**{"model.lag_free": True})
    est = pdvoid.inception(sc)
    for step in (97.0, 250.0, 1000.0):
        r = ramp_test(sc, step=step, start=5000.0, dwell=0.1)
        # the first level at or above U_inc fires: 0 <= U_ramp - U_inc < step (issue requirement)
        assert 0.0 <= r.inception_voltage - est.inception_voltage < step
        # from the zero-start (even) family the lag-free void stops just below U_inc: no hysteresis (brief §1.4)
        assert est.inception_voltage - step <= r.extinction_voltage < est.inception_voltage


def test_stochastic_ramp_lies_at_or_above_the_analytic_inception(demo):
    est = pdvoid.inception(demo)
    r = pdvoid.inception(demo, ramp=True, dwell=0.5, threshold=20e-12, seeds=range(4))
    assert np.all(r.inception_voltages >= est.inception_voltage)  # a statistical lag can only delay inception
    assert r.inception_voltages.size == 4 and np.all(np.isfinite(r.extinction_voltages))
    assert np.all(r.extinction_voltages < r.inception_voltages)


def test_probability_of_no_discharge_is_exp_minus_n_t():
    # constant start-electron rate N over a time t above inception: P(no discharge) = exp(−N·t) (Poisson)
    sc = pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
        void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3),
        supply=pdvoid.Sine(rms=18e3, frequency=50.0),
        model=pdvoid.FieldModel(ionization_rate=1e9),
    )
    c = pdvoid.compute_coefficients(sc)
    cycles = 40
    t_above = cycles / 50.0 * time_above_inception_fraction(sc, 18e3)
    p_pred = math.exp(-c.volume_electron_rate * t_above)
    assert p_pred == pytest.approx(probability_of_missing(sc, 18e3, cycles / 50.0), rel=1e-12)
    assert 0.2 < p_pred < 0.8
    runs = 400
    misses = sum(pdvoid.simulate(sc, cycles=cycles, seed=s).event_count == 0 for s in range(runs))
    # binomial test of the observed miss count against exp(−N·t) (scipy.stats.binomtest), fixed seeds
    assert stats.binomtest(misses, runs, p_pred).pvalue > 0.01


def test_time_above_inception_for_a_sine():
    # |sin| ≥ s0 holds for a fraction 1 − (2/π)·asin(s0) of the period (elementary trigonometry)
    sc = pdvoid.Scenario(insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
                         void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3), supply=pdvoid.Sine(rms=18e3))
    u_inc = pdvoid.compute_coefficients(sc).inception_voltage
    assert time_above_inception_fraction(sc, 2 * u_inc) == pytest.approx(1 - 2 / math.pi * math.asin(0.5))
    assert time_above_inception_fraction(sc, 0.9 * u_inc) == 0.0
    # the numerical path for other waveforms agrees on a sine given as samples
    per = pdvoid.Scenario(insulation=sc.insulation, void=sc.void, model=sc.model, supply=pdvoid.Periodic(
        samples=math.sqrt(2) * 18e3 * np.sin(2 * np.pi * np.arange(64) / 64)))
    assert time_above_inception_fraction(per, 2 * u_inc) == pytest.approx(1 - 2 / math.pi * math.asin(0.5),
                                                                         abs=2e-4)


# explores or shows voids large against the slab (e.g. 3 mm in 6 mm), for which compute_coefficients
# rightly warns that the closed forms are off (ValidityWarning)
@pytest.mark.filterwarnings("ignore::pdvoid.core.validity.ValidityWarning")
def test_largest_pd_free_void_reproduces_the_inception_voltage(demo):
    u_test = 18e3
    lv = largest_pd_free_void(demo, u_test)
    assert lv.limited_by == ""
    back = demo.replace(**{"void.diameter": lv.diameter, "void.height": lv.height})
    assert pdvoid.compute_coefficients(back).inception_voltage == pytest.approx(u_test, rel=1e-9)
    # and the margin map, interpolated in log size, brackets the same size
    table = margin_table(demo, "void.size", np.geomspace(0.1e-3, 2.5e-3, 200), test_voltage=u_test)
    ok = np.isfinite(table.inception_voltage)
    d_interp = np.exp(np.interp(u_test, table.inception_voltage[ok][::-1], np.log(table.values[ok][::-1])))
    assert d_interp == pytest.approx(lv.diameter, rel=2e-3)
    assert np.all(np.diff(table.inception_voltage[ok]) < 0)  # monotone in size (streamer term, fixed shape)


def test_margin_rows_are_in_si(demo):
    t = margin_table(demo, "void.pressure", [50e3, 101325.0], test_voltage=15e3)
    rows = t.as_rows()
    assert list(rows[0]) == ["void.pressure [Pa]", "inception voltage [V rms]", "extinction voltage [V rms]",
                             "margin to test level [-]"]
    # each row holds the table's own SI arrays, with no display factor (kV would be 1000 times smaller)
    u_inc = pdvoid.compute_coefficients(demo.replace(**{"void.pressure": 50e3})).inception_voltage
    assert rows[0]["inception voltage [V rms]"] == u_inc
    assert rows[1]["extinction voltage [V rms]"] == float(t.extinction_voltage[1])
    assert rows[1]["margin to test level [-]"] == pytest.approx(float(t.inception_voltage[1]) / 15e3, rel=1e-15)


# explores or shows voids large against the slab (e.g. 3 mm in 6 mm), for which compute_coefficients
# rightly warns that the closed forms are off (ValidityWarning)
@pytest.mark.filterwarnings("ignore::pdvoid.core.validity.ValidityWarning")
def test_margin_tables_and_limits(demo):
    t = margin_table(demo, "void.pressure", [50e3, 101325.0, 200e3])
    assert np.all(np.diff(t.inception_voltage) > 0)  # higher pressure → higher E_inc (streamer formula)
    t = margin_table(demo, "insulation.permittivity", [2.3, 4.2, 8.0])
    assert np.all(np.diff(t.inception_voltage) < 0)  # f = 3εr/(2εr+1) rises with εr for a sphere
    t = margin_table(demo, "void.size", [1e-3, 6.5e-3])
    assert math.isnan(t.inception_voltage[1]) and "void.height" in t.errors[1]
    with pytest.raises(pdvoid.InputError, match="parameter"):
        margin_table(demo, "void.colour", [1.0])
    with pytest.raises(pdvoid.InputError, match="test_voltage"):
        largest_pd_free_void(demo, -1.0)
    # default test level √3·U0 (common practice in routine PD tests of extruded cables, physics brief §9:
    # 1.73 U0, the phase-to-phase voltage); √3 = 1.7320508075688772 written out here, not taken from the module
    sqrt3 = 1.7320508075688772
    assert sqrt3 == math.sqrt(3.0)
    dm = design_margin(demo, 10e3)
    assert dm.test_factor == pytest.approx(sqrt3, rel=1e-15)
    assert dm.test_voltage == pytest.approx(10e3 * sqrt3, rel=1e-15)  # 17.320508 kV
    assert dm.margin == pytest.approx(pdvoid.inception(demo).inception_voltage / (10e3 * sqrt3), rel=1e-12)


# explores or shows voids large against the slab (e.g. 3 mm in 6 mm), for which compute_coefficients
# rightly warns that the closed forms are off (ValidityWarning)
@pytest.mark.filterwarnings("ignore::pdvoid.core.validity.ValidityWarning")
def test_cli_margin_inception_pattern(tmp_path, capsys):
    from pdvoid.inputs.demo import demo_scenario_path

    path = str(demo_scenario_path())
    assert main(["margin", path, "--test-voltage", "18kV", "--nominal-voltage", "10 kV", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["largest discharge-free void"]["diameter [m]"] == pytest.approx(
        largest_pd_free_void(demo_scenario(), 18e3).diameter)
    assert main(["inception", path, "--ramp", "--seeds", "2", "--dwell", "0.2s", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["ramp test"]["inception voltage [V rms]"] >= doc["analytic"]["inception voltage [V rms]"]
    assert main(["simulate", path, "--cycles", "200", "--out", str(tmp_path)]) == 0
    capsys.readouterr()
    assert main(["pattern", str(tmp_path / "result.npz"), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["events"] > 0 and "skewness H_n+" in " ".join(doc["fingerprint"])


def demo_scenario():
    from pdvoid.inputs.demo import demo_scenario as d

    return d()
