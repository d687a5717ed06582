"""IEC 60270 quantities over a window and the largest repeatedly occurring magnitude, on hand-computed events.

Formulas: IEC 60270 clause 3 as quoted in the physics brief section 9 (wording from memory): I = sum|q|/T_ref,
D = sum q^2/T_ref, P = sum q u/T_ref, n = count/T_ref.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from pdvoid import InputError
from pdvoid.analysis.quantities import DEFAULT_REPETITION_RATE, iec60270, largest_repeated_magnitude
from pdvoid.simulation.events import Events


@pytest.fixture
def four_events():
    # 4 events over 2 cycles at 50 Hz (observation 40 ms); times 1, 5, 12, 30 ms
    time = np.array([1e-3, 5e-3, 12e-3, 30e-3])
    return Events(
        phase_deg=(time * 50.0 % 1.0) * 360.0,
        charge=[2e-12, -4e-12, 1e-12, -3e-12],
        frequency=50.0,
        cycles=2.0,
        time=time,
        voltage=[1e3, -2e3, 3e3, -1e3],
    )


def test_whole_observation_hand_computed(four_events):
    # brief section 9 formulas, by hand: T_ref = 2/50 s = 0.04 s
    q = iec60270(four_events)
    assert q.reference_time == pytest.approx(0.04)
    assert q.average_current == pytest.approx(10e-12 / 0.04, rel=1e-12)  # (2+4+1+3) pC
    assert q.quadratic_rate == pytest.approx(30e-24 / 0.04, rel=1e-12)  # (4+16+1+9) pC^2
    assert q.power == pytest.approx((2e-9 + 8e-9 + 3e-9 + 3e-9) / 0.04, rel=1e-12)  # sum q u
    assert q.repetition_rate == pytest.approx(4 / 0.04)
    assert q.count == 4 and q.window == (0.0, pytest.approx(0.04))


def test_window_selects_half_open_interval(four_events):
    # window [5 ms, 20 ms): events at 5 and 12 ms, T_ref = 15 ms (hand-computed)
    q = iec60270(four_events, window=(5e-3, 20e-3))
    assert q.count == 2
    assert q.reference_time == pytest.approx(15e-3)
    assert q.average_current == pytest.approx(5e-12 / 15e-3, rel=1e-12)
    assert q.quadratic_rate == pytest.approx(17e-24 / 15e-3, rel=1e-12)
    assert q.power == pytest.approx((8e-9 + 3e-9) / 15e-3, rel=1e-12)
    assert q.repetition_rate == pytest.approx(2 / 15e-3)


def test_threshold_applies_to_repetition_rate(four_events):
    # n counts pulses with |q| >= threshold (brief section 9: "usually only pulses above a specified
    # magnitude")
    q = iec60270(four_events, threshold=3e-12)
    assert q.repetition_rate == pytest.approx(2 / 0.04)
    assert q.average_current == pytest.approx(10e-12 / 0.04)


def test_empty_window_gives_zeros(four_events):
    # empty sums are zero
    q = iec60270(four_events, window=(31e-3, 40e-3))
    values = (q.count, q.average_current, q.quadratic_rate, q.power, q.repetition_rate)
    assert values == (0, 0.0, 0.0, 0.0, 0.0)


def test_power_is_nan_without_voltages():
    # documented: P needs the instantaneous voltage of every event in the window
    ev = Events(phase_deg=[10.0, 200.0], charge=[1e-12, -1e-12], frequency=50.0, cycles=1.0)
    q = iec60270(ev)
    assert math.isnan(q.power)
    assert q.average_current == pytest.approx(2e-12 / 0.02)


@pytest.mark.parametrize(
    "window", [(-1e-3, 10e-3), (10e-3, 50e-3), (20e-3, 10e-3), (10e-3, 10e-3), (0.0, math.nan), (0.0,), "all"]
)
def test_bad_windows(four_events, window):
    with pytest.raises(InputError):
        iec60270(four_events, window=window)


def test_window_needs_times():
    ev = Events(phase_deg=[10.0], charge=[1e-12], frequency=50.0, cycles=1.0)
    with pytest.raises(InputError, match="time"):
        iec60270(ev, window=(0.0, 0.01))


def test_bad_threshold_and_events(four_events):
    with pytest.raises(InputError):
        iec60270(four_events, threshold=-1e-12)
    with pytest.raises(InputError):
        iec60270([1e-12, 2e-12])


def test_largest_repeated_magnitude_hand_computed(four_events):
    # our documented definition: k = ceil(rate * T_ref); the k-th largest |q|
    # T_ref = 0.04 s; rate 50/s -> k = 2 -> 3 pC; rate 100/s -> k = 4 -> 1 pC; rate 101/s -> k = 5 > 4 -> 0
    assert largest_repeated_magnitude(four_events, 50.0) == pytest.approx(3e-12)
    assert largest_repeated_magnitude(four_events, 100.0) == pytest.approx(1e-12)
    assert largest_repeated_magnitude(four_events, 101.0) == 0.0
    assert largest_repeated_magnitude(four_events, 1.0) == pytest.approx(4e-12)  # k = 1: the largest
    assert largest_repeated_magnitude(four_events, 100.0, window=(0.0, 0.02)) == pytest.approx(2e-12)


def test_largest_repeated_magnitude_default_rate(make_events):
    # documented default 100/s: at 50 Hz two pulses per cycle; 10 cycles with 2 pulses each of 1..20 pC
    mags = np.arange(1.0, 21.0) * 1e-12
    phase = np.tile([45.0, 225.0], 10)
    cycle = np.repeat(np.arange(10.0), 2)
    ev = make_events(phase, mags * np.tile([1.0, -1.0], 10), cycle=cycle, cycles=10.0)
    assert DEFAULT_REPETITION_RATE == 100.0
    assert largest_repeated_magnitude(ev) == pytest.approx(1e-12)  # k = 20: all pulses needed
    assert largest_repeated_magnitude(ev, 50.0) == pytest.approx(11e-12)  # k = 10


def test_largest_repeated_magnitude_bad_input(four_events):
    for bad in (0.0, -1.0, math.inf, "100"):
        with pytest.raises(InputError):
            largest_repeated_magnitude(four_events, bad)


def test_histogram_only_results_are_refused():
    # a result that recorded discharges but stored no events must not give zero quantities
    class HistogramOnly:
        events = Events(phase_deg=[], charge=[], frequency=50.0, cycles=10.0)
        event_count = 25

    with pytest.raises(InputError, match="histogram"):
        iec60270(HistogramOnly())
    with pytest.raises(InputError, match="histogram"):
        largest_repeated_magnitude(HistogramOnly())


def test_agrees_with_the_kernel_running_sums():
    # two independent paths to the same clause-3 sums: the simulation kernel's running sums and the event list
    import pdvoid

    sc = pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.0),
        void=pdvoid.Void(diameter=2e-3, height=1e-3),
        supply=pdvoid.Sine(rms=25e3, frequency=50.0),
        model=pdvoid.NetworkModel(lag_free=True, residual_ratio=0.2),
    )
    res = pdvoid.simulate(sc, cycles=8, seed=0)
    assert res.event_count > 10
    q = iec60270(res)
    t_ref = res.duration
    assert q.average_current == pytest.approx(res.sum_abs_charge / t_ref, rel=1e-9)
    assert q.quadratic_rate == pytest.approx(res.sum_charge_squared / t_ref, rel=1e-9)
    assert q.power == pytest.approx(res.sum_charge_voltage / t_ref, rel=1e-9)
    assert q.repetition_rate == pytest.approx(res.event_count / t_ref, rel=1e-12)
