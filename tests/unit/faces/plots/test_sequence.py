"""Pulse-sequence plots."""

from __future__ import annotations

import numpy as np
import pytest

import pdvoid
from pdvoid import InputError
from pdvoid.faces.plots import pulse_sequence_plot
from pdvoid.simulation.events import Events


@pytest.mark.parametrize("kind", ["du", "q_du", "dphi"])
def test_sequence_renders(render, demo_result, kind):
    render(pulse_sequence_plot(demo_result, kind))


def test_lag_free_sequence_points(lag_free_field):
    # lag-free field model: consecutive same-polarity pulses are Δu = ±(E_inc − E_res)/g apart
    # (physics brief §1.4 pulse-sequence check, derived)
    res = pdvoid.simulate(lag_free_field, 20, 0)
    ax = pulse_sequence_plot(res, "du")
    pts = np.concatenate([c.get_offsets() for c in ax.collections])
    c = res.coefficients()
    g = c.field_enhancement / lag_free_field.insulation.thickness
    same = (c.inception_field - c.residual_field) / g / 1e3
    assert np.any(np.isclose(np.abs(pts[:, 1]), same, rtol=1e-6))


def test_too_few_events(render):
    ev = Events(phase_deg=[10.0], charge=[1e-12], frequency=50.0, cycles=1.0, time=[0.001], voltage=[1.0])
    ax = pulse_sequence_plot(ev)
    render(ax)
    assert any("too few" in t.get_text() for t in ax.texts)


def test_sequence_bad_input(demo_result):
    with pytest.raises(InputError, match="kind"):
        pulse_sequence_plot(demo_result, "dt")
    ev = Events(phase_deg=[10.0, 20.0], charge=[1e-12, 2e-12], frequency=50.0, cycles=1.0)
    with pytest.raises(InputError, match="voltage|time"):
        pulse_sequence_plot(ev)  # measured phases only: no times or voltages
