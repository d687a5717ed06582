"""Simulated against measured."""

from __future__ import annotations

import numpy as np
import pytest

import pdvoid
from pdvoid import InputError
from pdvoid.faces.plots import compare
from pdvoid.faces.plots.style import new_figure
from pdvoid.simulation.events import Events


@pytest.fixture(scope="module")
def measured():
    from pdvoid.inputs.demo import demo_scenario

    demo = demo_scenario()
    # stand-in for a measurement: the demo at 20 kV, another seed, phases and charges only (synthetic data)
    r = pdvoid.simulate(demo.replace(**{"supply.rms": 20e3}), 150, 7)
    return Events(
        phase_deg=r.phase_deg, charge=r.charge, frequency=50.0, cycles=150.0, label="measured (synthetic)"
    )


def test_compare_shares_the_colour_scale(render, demo_result, measured):
    axes = compare(demo_result, measured)
    assert len(axes) == 3
    render(axes)
    a, b = axes[0].pdvoid_mesh.norm, axes[1].pdvoid_mesh.norm
    assert (a.vmin, a.vmax) == (b.vmin, b.vmax)
    # same charge axis on both panels
    assert axes[0].get_ylim() == axes[1].get_ylim()
    # the overlay holds four step curves (two data sets x two half cycles)
    assert len(axes[2].patches) == 4
    # the largest cell rate of either pattern sets the top of the shared scale
    rates = np.concatenate([np.ravel(ax.pdvoid_mesh.get_array().compressed()) for ax in axes[:2]])
    assert a.vmax == pytest.approx(rates.max())


def test_compare_into_given_axes(render, demo_result, measured):
    fig = new_figure((10, 4))
    given = fig.subplots(1, 3)
    axes = compare(demo_result, measured, axes=given, labels=("model", "lab"))
    assert list(axes) == list(given)
    render(axes)
    assert axes[1].get_title().startswith("lab")


def test_compare_bad_input(demo_result, demo_histogram_result, measured):
    with pytest.raises(InputError):
        compare(demo_result, "measured.csv")
    with pytest.raises(InputError, match="histogram"):
        compare(demo_histogram_result, measured)
    with pytest.raises(InputError, match="3 matplotlib Axes"):
        compare(demo_result, measured, axes=[1, 2, 3])
    with pytest.raises(InputError, match="labels"):
        compare(demo_result, measured, labels="ab")
    empty = Events(phase_deg=[], charge=[], frequency=50.0, cycles=1.0)
    with pytest.raises(InputError, match="neither"):
        compare(empty, empty)
