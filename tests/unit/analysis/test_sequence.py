"""Pulse-sequence analysis on hand-built event lists (definitions: physics brief section 10, hoof1995, from
memory)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from pdvoid import InputError
from pdvoid.analysis.sequence import pulse_sequence
from pdvoid.simulation.events import Events


def test_hand_built_sequence(make_events):
    # hand-computed from Delta u_n = u(t_n) - u(t_{n-1}), Delta t_n = t_n - t_{n-1}, Delta phi elapsed
    phase = [30.0, 60.0, 210.0, 20.0]
    cycle = [0.0, 0.0, 0.0, 2.0]
    voltage = [5e3, 8.66e3, -5e3, 3.42e3]
    charge = [1e-12, 2e-12, -3e-12, 4e-12]
    ev = make_events(phase, charge, cycle=cycle, voltage=voltage, cycles=3.0)
    seq = pulse_sequence(ev)
    np.testing.assert_allclose(seq.delta_u, [3.66e3, -13.66e3, 8.42e3], rtol=1e-12)
    np.testing.assert_allclose(seq.delta_phase_deg, [30.0, 150.0, 170.0 + 360.0], rtol=1e-12)
    np.testing.assert_allclose(seq.delta_t, np.array([30.0, 150.0, 530.0]) / 360.0 / 50.0, rtol=1e-9)
    np.testing.assert_allclose(seq.delta_u_previous, [3.66e3, -13.66e3])
    np.testing.assert_allclose(seq.delta_u_next, [-13.66e3, 8.42e3])
    np.testing.assert_allclose(seq.charge_n, [2e-12, -3e-12, 4e-12])
    np.testing.assert_array_equal(seq.same_polarity, [True, False, False])


def test_events_are_put_in_time_order(make_events):
    # the definitions refer to consecutive pulses in time
    ev = make_events([90.0, 30.0, 60.0], [3e-12, 1e-12, 2e-12], voltage=[3.0, 1.0, 2.0])
    seq = pulse_sequence(ev)
    np.testing.assert_allclose(seq.voltage, [1.0, 2.0, 3.0])
    np.testing.assert_allclose(seq.delta_u, [1.0, 1.0])
    np.testing.assert_allclose(seq.charge, [1e-12, 2e-12, 3e-12])


@pytest.mark.parametrize("n", [0, 1, 2])
def test_short_sequences_give_empty_differences(make_events, n):
    ev = make_events([10.0, 20.0][:n], [1e-12, 1e-12][:n], voltage=[1.0, 2.0][:n])
    seq = pulse_sequence(ev)
    assert seq.delta_u.size == max(n - 1, 0)
    assert seq.delta_u_next.size == max(n - 2, 0)


def test_missing_voltage_or_time_is_rejected(make_events):
    with pytest.raises(InputError, match="voltage"):
        pulse_sequence(make_events([10.0, 20.0], [1e-12, 1e-12]))
    ev = Events(phase_deg=[10.0, 20.0], charge=[1e-12, 1e-12], frequency=50.0, cycles=1.0, voltage=[1.0, 2.0])
    with pytest.raises(InputError, match="time"):
        pulse_sequence(ev)
    with pytest.raises(InputError):
        pulse_sequence(make_events([10.0, 20.0], [1e-12, 1e-12], voltage=[1.0, math.nan]))
    with pytest.raises(InputError):
        pulse_sequence([1.0, 2.0])
