"""The void field against time: exact reconstruction from the events, rendering, bad input."""

from __future__ import annotations

import math

import numpy as np
import pytest

import pdvoid
from pdvoid import InputError
from pdvoid.faces.plots import field_time, void_field_trace


def _check_trace_matches_events(result, start, cycles):
    tr = void_field_trace(result, start, cycles, points_per_cycle=64)
    ev = result.events
    assert tr.event_index.size > 0
    for k in tr.event_index:
        at = np.flatnonzero(tr.time == ev.time[k])
        assert at.size == 2  # the trace holds the field just before and just after each discharge
        # the kernel's own field_before (root of the threshold crossing / hazard) against the rebuilt
        # E_v = g·V + E_q of the reduced field model (physics brief §4, derived); float rounding only
        assert tr.field[at[0]] == pytest.approx(ev.field_before[k], rel=1e-9, abs=1e-9 * tr.inception_field)
        assert tr.field[at[1]] == pytest.approx(ev.field_after[k], rel=1e-12, abs=1e-6)
    return tr


def test_trace_reproduces_every_discharge_field_model(demo_result):
    tr = _check_trace_matches_events(demo_result, int(demo_result.events.cycle[0]), 5)
    # the field after each discharge is ±E_res exactly (model definition, residual_ratio·E_inc)
    after = demo_result.events.field_after[tr.event_index]
    np.testing.assert_allclose(np.abs(after), tr.residual_field, rtol=1e-12)


def test_trace_with_charge_decay_network_model_and_harmonics(scenario_factory):
    # decaying deposited charge, the three-capacitance model, and a supply with a 3rd harmonic: the same
    # reconstruction must hold (E_q decays as exp(-t/τ_q) between discharges; kernel docstring)
    model = pdvoid.NetworkModel(lag_free=True, residual_ratio=0.3, charge_decay_time=4e-3)
    sc = scenario_factory(model=model)
    sc = pdvoid.Scenario(
        insulation=sc.insulation,
        void=sc.void,
        model=model,
        supply=pdvoid.Sine(rms=18e3, harmonics=((3, 0.2, 30.0),)),
    )
    res = pdvoid.simulate(sc, 20, 0)
    _check_trace_matches_events(res, 2, 4)


def test_lag_free_discharges_start_exactly_at_inception(lag_free_field):
    # lag-free model: a discharge happens when |E_v| reaches E_inc (physics brief §1.4 assumption (b))
    res = pdvoid.simulate(lag_free_field, 10, 0)
    tr = _check_trace_matches_events(res, 3, 2)
    np.testing.assert_allclose(np.abs(res.events.field_before[tr.event_index]), tr.inception_field, rtol=1e-9)


def test_trace_before_first_discharge_is_the_uncharged_field(demo_result):
    # before any discharge E_q = 0, so E_v = (f/d)·V exactly (field enhancement, physics brief §2.1)
    tr = void_field_trace(demo_result, 0, 1)
    first = demo_result.events.time.min()
    sel = tr.time < min(first, tr.stop)
    np.testing.assert_allclose(tr.field[sel], tr.gain * tr.voltage[sel], rtol=1e-12, atol=1e-6)
    c = demo_result.coefficients()
    assert tr.gain == pytest.approx(c.field_enhancement / demo_result.scenario.insulation.thickness)
    # the supply is a pure sine of 18 kV rms: peak √2·18 kV (definition of rms)
    assert np.max(np.abs(tr.voltage)) == pytest.approx(math.sqrt(2) * 18e3, rel=1e-4)


def test_field_time_renders(render, demo_result):
    ax = field_time(demo_result)
    png = render(ax)
    assert png[:4] == b"\x89PNG"
    assert ax.get_ylabel() == "void field [kV/mm]"
    assert ax.pdvoid_twin.get_ylabel() == "applied voltage [kV]"
    # the voltage axis is matched to the field axis through the gain g = f/d (so both curves coincide for an
    # uncharged void)
    g = demo_result.coefficients().field_enhancement / demo_result.scenario.insulation.thickness
    top = ax.get_ylim()[1] * 1e6
    assert ax.pdvoid_twin.get_ylim()[1] * 1e3 == pytest.approx(top / g)
    # the window starts at the first cycle with a discharge
    first = int(demo_result.events.cycle.min())
    assert ax.get_xlim()[0] == pytest.approx(first / 50.0 * 1e3)


def test_field_time_into_given_axes_and_svg(render, demo_result):
    from pdvoid.faces.plots.style import new_figure

    fig = new_figure()
    ax0 = fig.add_subplot()
    ax = field_time(demo_result, cycles=2, start_cycle=0, ax=ax0, legend=False)
    assert ax is ax0
    assert render(ax, fmt="svg").lstrip().startswith(b"<?xml")


def test_field_time_without_discharges(render, scenario_factory):
    res = pdvoid.simulate(scenario_factory(rms=3e3), 5, 0)  # far below inception: no discharge
    assert res.event_count == 0
    ax = field_time(res)
    render(ax)
    assert any("no discharges" in t.get_text() for t in ax.texts)


def test_field_time_bad_input(demo_result, demo_histogram_result):
    with pytest.raises(InputError):
        field_time(demo_result.events)  # needs the scenario
    with pytest.raises(InputError, match="histogram"):
        field_time(demo_histogram_result)
    with pytest.raises(InputError, match="cycles"):
        field_time(demo_result, cycles=0)
    with pytest.raises(InputError, match="start_cycle"):
        field_time(demo_result, start_cycle=10**6)
    with pytest.raises(InputError, match="ax"):
        field_time(demo_result, ax="not an axes")
