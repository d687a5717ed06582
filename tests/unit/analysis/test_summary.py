"""The run summary: an SI record whose numbers are checked against the event arrays and closed forms."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest

import pdvoid
from pdvoid.analysis.summary import RunSummary, run_summary
from pdvoid.inputs.demo import DEMO_SERVICE_RMS, DEMO_TEST_RMS, demo_scenario

CYCLES = 300


@pytest.fixture(scope="module")
def test_level_run():
    """The demo at its test voltage: several discharges per cycle with scattered magnitudes (invented case)."""
    return pdvoid.simulate(demo_scenario().replace(**{"supply.rms": DEMO_TEST_RMS}), CYCLES, 1)


def test_mean_apparent_charge_is_the_mean_magnitude_per_discharge(test_level_run):
    res = test_level_run
    s = run_summary(res)
    q = np.abs(res.charge)
    assert q.size > 1.5 * CYCLES  # more than one discharge per cycle: per discharge and per cycle differ
    assert np.ptp(q) > 0.05 * q.mean()  # scattered magnitudes: the mean is not just any one charge
    # mean magnitude per discharge, Σ|q|/N (definition, common practice), from the event arrays
    assert s.mean_apparent_charge == pytest.approx(np.mean(q), rel=1e-12)
    assert s.largest_apparent_charge == float(q.max())


def test_discharges_per_cycle_is_count_over_cycles(test_level_run):
    res = test_level_run
    s = run_summary(res)
    # hand calculation: events counted in the arrays divided by the cycles asked for
    assert s.discharge_count == res.charge.size
    assert s.discharges_per_cycle == pytest.approx(res.charge.size / CYCLES, rel=1e-15)
    assert s.cycles == CYCLES


def test_iec60270_quantities_from_the_event_arrays(test_level_run):
    res = test_level_run
    s = run_summary(res)
    q, u = res.charge, res.voltage
    t_ref = CYCLES / 50.0  # the demo supply is 50 Hz: T = cycles / f (hand calculation)
    assert s.duration == pytest.approx(t_ref, rel=1e-15)
    # IEC 60270 clause 3 definitions (from memory): I = Σ|q|/T, D = Σq²/T, P = Σq·u/T, n = N/T
    assert s.average_discharge_current == pytest.approx(np.sum(np.abs(q)) / t_ref, rel=1e-12)
    assert s.quadratic_rate == pytest.approx(np.sum(q**2) / t_ref, rel=1e-12)
    assert s.discharge_power == pytest.approx(np.sum(q * u) / t_ref, rel=1e-9)
    assert s.pulse_repetition_rate == pytest.approx(q.size / t_ref, rel=1e-15)


def test_lag_free_mean_charge_is_the_closed_form(lag_free_field):
    # lag-free field model: every discharge drops the void field from E_inc to E_res, so each apparent charge
    # is (E_inc − E_res)·charge_per_field (physics brief §1.4 assumptions; hand calculation from the coefficients)
    res = pdvoid.simulate(lag_free_field, 20, 0)
    c = res.coefficients()
    expected = (c.inception_field - c.residual_field) * c.charge_per_field
    s = run_summary(res)
    assert s.discharge_count > 20
    assert s.mean_apparent_charge == pytest.approx(expected, rel=1e-12)
    assert s.largest_apparent_charge == pytest.approx(expected, rel=1e-12)


def test_no_discharge_below_inception():
    res = pdvoid.simulate(demo_scenario().replace(**{"supply.rms": DEMO_SERVICE_RMS}), 20, 1)
    s = run_summary(res)
    assert res.event_count == 0  # the demo's service level is below its inception voltage
    assert (s.discharge_count, s.discharges_per_cycle, s.mean_apparent_charge) == (0, 0.0, 0.0)
    assert math.isnan(s.largest_apparent_charge)
    assert (s.average_discharge_current, s.quadratic_rate, s.discharge_power) == (0.0, 0.0, 0.0)


def test_histogram_only_run_is_summarised_from_the_running_sums(test_level_run):
    full = test_level_run
    hist = pdvoid.simulate(full.scenario, CYCLES, 1, histogram=True)
    assert hist.charge.size == 0 and hist.event_count == full.event_count  # same seed, same discharges
    s, ref = run_summary(hist), run_summary(full)
    assert math.isnan(s.largest_apparent_charge)
    for name in ("discharges_per_cycle", "mean_apparent_charge", "average_discharge_current", "quadratic_rate",
                 "discharge_power", "pulse_repetition_rate"):
        assert getattr(s, name) == pytest.approx(getattr(ref, name), rel=1e-9), name


def test_record_is_frozen_and_every_attribute_has_a_unit(test_level_run):
    s = run_summary(test_level_run)
    with pytest.raises(dataclasses.FrozenInstanceError):
        s.mean_apparent_charge = 0.0  # type: ignore[misc]  # the point of the test: assignment must fail
    assert set(RunSummary.UNITS) == {f.name for f in dataclasses.fields(RunSummary)}
    assert RunSummary.UNITS["mean_apparent_charge"] == "C"


def test_not_a_result_is_an_input_error(test_level_run):
    with pytest.raises(pdvoid.InputError, match="Result"):
        run_summary(test_level_run.events)


def test_a_run_of_no_cycle_is_an_input_error(test_level_run):
    stopped = dataclasses.replace(test_level_run, cycles=0)  # a run stopped before its first cycle
    with pytest.raises(pdvoid.InputError, match="cycles=0"):
        run_summary(stopped)


@pytest.fixture(scope="module")
def waiting_run():
    """A 1.5 mm void at 18 kV with a weak volume supply (invented case): it waits about 100 cycles, then recurs."""
    sc = pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
        void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3),
        supply=pdvoid.Sine(rms=18e3, frequency=50.0),
        model=pdvoid.FieldModel(ionization_rate=3e8),
    )
    return pdvoid.simulate(sc, CYCLES, 0)


def test_rates_after_the_first_discharge_leave_out_the_wait(waiting_run):
    res = waiting_run
    s = run_summary(res)
    # hand calculation from the event arrays: the first event's cycle, the count from it on, the cycles left
    first_cycle = int(res.cycle[0])
    assert first_cycle > 20  # the run really waited
    count_after = int(np.count_nonzero(res.cycle >= first_cycle))
    assert s.first_discharge_time == res.time[0]
    assert s.discharges_per_cycle_after_first == pytest.approx(count_after / (CYCLES - first_cycle), rel=1e-15)
    assert s.pulse_repetition_rate_after_first == pytest.approx(count_after / ((CYCLES - first_cycle) / 50.0),
                                                                rel=1e-12)
    # the whole-run average still counts the waiting cycles
    assert s.discharges_per_cycle == pytest.approx(res.charge.size / CYCLES, rel=1e-15)
    assert s.discharges_per_cycle_after_first > 1.2 * s.discharges_per_cycle


def test_histogram_run_gives_the_same_rates_after_the_first(waiting_run):
    hist = pdvoid.simulate(waiting_run.scenario, CYCLES, 0, histogram=True)
    a, b = run_summary(waiting_run), run_summary(hist)
    assert b.first_discharge_time == a.first_discharge_time
    assert b.discharges_per_cycle_after_first == a.discharges_per_cycle_after_first


def test_no_first_discharge_gives_nan_rates():
    res = pdvoid.simulate(demo_scenario().replace(**{"supply.rms": DEMO_SERVICE_RMS}), 20, 1)
    s = run_summary(res)
    assert math.isnan(s.first_discharge_time)
    assert math.isnan(s.discharges_per_cycle_after_first) and math.isnan(s.pulse_repetition_rate_after_first)
