"""Shared builders for the analysis tests."""

from __future__ import annotations

import numpy as np
import pytest

from pdvoid.simulation.events import Events


def build_events(phase_deg, charge, *, frequency=50.0, cycles=1.0, cycle=None, voltage=None, time=None):
    """Events from plain lists; time from cycle and phase when not given (t = (cycle + phase/360) / f)."""
    phase = np.asarray(phase_deg, dtype=float)
    cyc = np.zeros_like(phase) if cycle is None else np.asarray(cycle, dtype=float)
    if time is None:
        time = (cyc + phase / 360.0) / frequency
    return Events(
        phase_deg=phase,
        charge=np.asarray(charge, dtype=float),
        frequency=frequency,
        cycles=cycles,
        time=time,
        cycle=cyc,
        voltage=voltage,
    )


@pytest.fixture
def make_events():
    return build_events


@pytest.fixture
def random_events():
    """A seeded event set with both polarities and a few zero-charge events."""
    rng = np.random.default_rng(12345)
    n = 2000
    phase = rng.uniform(0.0, 360.0, n)
    mag = 10.0 ** rng.uniform(-13.0, -10.0, n)
    sign = np.where(rng.uniform(size=n) < 0.5, -1.0, 1.0)
    charge = sign * mag
    charge[:7] = 0.0
    cycle = rng.integers(0, 100, n).astype(float)
    return build_events(phase, charge, cycles=100.0, cycle=cycle)
