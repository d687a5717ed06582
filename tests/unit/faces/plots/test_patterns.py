"""The phase-resolved pattern plot: inputs it accepts, what it draws, bad input."""

from __future__ import annotations

import numpy as np
import pytest
from matplotlib.colors import LogNorm

from pdvoid import InputError
from pdvoid.analysis.patterns import pattern
from pdvoid.faces.plots import pattern_mesh, phase_pattern
from pdvoid.simulation.events import Events


def test_pattern_from_result(render, demo_result):
    ax = phase_pattern(demo_result)
    render(ax)
    assert ax.get_xlabel() == "phase [deg]" and ax.get_ylabel() == "apparent charge [pC]"
    assert ax.pdvoid_twin.get_ylabel() == "applied voltage [kV]"
    assert isinstance(ax.pdvoid_mesh.norm, LogNorm)  # log colour scale of counts per cycle
    # the voltage curve is the scenario's sine: peak √2·18 kV (definition of rms)
    line = ax.pdvoid_twin.lines[0]
    assert np.max(np.abs(line.get_ydata())) == pytest.approx(np.sqrt(2) * 18.0, rel=1e-4)


def test_mesh_holds_counts_per_cycle(demo_result):
    # counting identity (common practice): the cells sum to the discharges per cycle
    mesh = pattern_mesh(demo_result, phase_bins=36, charge_bins=20)
    n = np.count_nonzero(demo_result.charge)
    assert mesh.rate.sum() * demo_result.cycles == pytest.approx(n)
    assert mesh.rate.shape == (21, 36)  # one empty row between the polarities (PhasePattern.mesh layout)


def test_pattern_from_histogram_only_result(render, demo_histogram_result):
    ax = phase_pattern(demo_histogram_result)
    render(ax)
    mesh = pattern_mesh(demo_histogram_result)
    h = demo_histogram_result.histogram
    # all events inside the kernel's charge edges are drawn, per cycle (counts / cycles)
    assert mesh.rate.sum() * demo_histogram_result.cycles == pytest.approx(h.counts.sum())
    assert mesh.log_charge  # the kernel's default edges are logarithmic: symmetric-log axis
    assert ax.get_yscale() == "symlog"


def test_pattern_from_events_and_phase_pattern(render, demo_result):
    ev = demo_result.events
    bare = Events(phase_deg=ev.phase_deg, charge=ev.charge, frequency=50.0, cycles=ev.cycles)
    ax = phase_pattern(bare)  # no scenario: the voltage is drawn as a unit sine in per unit
    render(ax)
    assert ax.pdvoid_twin.get_ylabel() == "applied voltage (shape) [p.u.]"
    pat = pattern(ev, 36, 30, "log", per_cycle=False)
    ax2 = phase_pattern(pat, voltage=False, colorbar=False)
    render(ax2)
    assert not hasattr(ax2, "pdvoid_twin")
    assert ax2.get_yscale() == "symlog"


def test_empty_result_draws_an_empty_pattern(render, scenario_factory):
    import pdvoid

    res = pdvoid.simulate(scenario_factory(rms=3e3), 5, 0)
    ax = phase_pattern(res)
    render(ax)
    assert any("no discharges" in t.get_text() for t in ax.texts)


def test_shared_colour_limits(render, demo_result):
    ax = phase_pattern(demo_result, vmin=1e-3, vmax=1.0)
    render(ax)
    assert ax.pdvoid_mesh.norm.vmin == 1e-3 and ax.pdvoid_mesh.norm.vmax == 1.0


def test_pattern_bad_input(demo_result):
    with pytest.raises(InputError):
        phase_pattern("not events")
    with pytest.raises(InputError, match="vmin"):
        phase_pattern(demo_result, vmin=-1.0)
    with pytest.raises(InputError, match="vmax must exceed vmin"):
        phase_pattern(demo_result, vmin=1.0, vmax=0.5)
    with pytest.raises(InputError, match="charge_bins"):
        phase_pattern(demo_result, charge_bins=3)
    with pytest.raises(InputError, match="supply"):
        phase_pattern(demo_result, supply=42)
    ev = Events(phase_deg=[], charge=[], frequency=50.0, cycles=1.0)
    with pytest.raises(InputError, match="charge_range"):
        phase_pattern(ev)  # no events and no range: the charge axis is unknown


def test_drawn_mesh_has_phase_on_x_and_charge_on_y(render):
    # Hand-built events (invented): 20 of +5.5 pC at 91 deg and 10 of -3.5 pC at 271 deg over 10 cycles. With
    # 36 phase bins (10 deg each) and 10 charge bins of 1 pC per polarity over 0-10 pC, hand counting gives
    # exactly two lit cells: [90, 100] deg x [5, 6] pC at 20/10 = 2 per cycle and [270, 280] deg x [-4, -3] pC
    # at 10/10 = 1 per cycle. The phase must be on the x axis (0-360 deg), the charge on the y axis.
    ev = Events(
        phase_deg=[91.0] * 20 + [271.0] * 10, charge=[5.5e-12] * 20 + [-3.5e-12] * 10, frequency=50.0, cycles=10.0
    )
    ax = phase_pattern(ev, phase_bins=36, charge_bins=20, charge_range=(0.0, 10e-12), voltage=False, colorbar=False)
    render(ax)
    corners = ax.pdvoid_mesh.get_coordinates()  # (rows + 1, columns + 1, 2): x, y of the cell corners
    values = np.ma.filled(ax.pdvoid_mesh.get_array(), 0.0)
    lit = {}
    for j, i in zip(*np.nonzero(values), strict=True):
        (x0, y0), (x1, y1) = corners[j, i], corners[j + 1, i + 1]
        lit[(round(float(x0), 6), round(float(x1), 6), round(float(y0), 6), round(float(y1), 6))] = values[j, i]
    assert lit == {(90.0, 100.0, 5.0, 6.0): pytest.approx(2.0), (270.0, 280.0, -4.0, -3.0): pytest.approx(1.0)}
    assert ax.get_xlim() == (0.0, 360.0)
    assert ax.get_ylim() == (-10.0, 10.0)  # symmetric about zero, in pC
    assert ax.get_xlabel() == "phase [deg]" and ax.get_ylabel() == "apparent charge [pC]"
