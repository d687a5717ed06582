"""Shared helpers for the plot tests: Agg backend, a unit-label check, rendering to memory, small results."""

from __future__ import annotations

import io
import re

import matplotlib

matplotlib.use("Agg")

import pytest  # noqa: E402
from matplotlib import _pylab_helpers  # noqa: E402
from matplotlib.axes import Axes  # noqa: E402

import pdvoid  # noqa: E402

UNIT = re.compile(r"\[[^\[\]]+\]")


def assert_axis_units(axes) -> None:
    """Every axis that shows tick labels, of every Axes in the figure of ``axes`` (twins and colour bars
    included), has a non-empty label with a unit in brackets, e.g. "phase [deg]" or "ratio [-]"."""
    items = axes if isinstance(axes, (list, tuple)) else [axes]
    fig = items[0].figure
    fig.draw_without_rendering()  # fixes the tick labels
    checked = 0
    for ax in fig.axes:
        for axis in (ax.xaxis, ax.yaxis):
            if not axis.get_visible():
                continue
            shown = [t for t in axis.get_ticklabels(which="both") if t.get_visible() and t.get_text().strip()]
            if not shown:
                continue
            label = axis.get_label().get_text()
            assert label.strip(), f"an axis of {ax!r} shows ticks but has no label"
            assert UNIT.search(label), f"axis label {label!r} has no unit in brackets"
            checked += 1
    for ax in items:  # the returned Axes themselves: both axes labelled
        assert isinstance(ax, Axes)
        assert UNIT.search(ax.get_xlabel()) and UNIT.search(ax.get_ylabel()), (
            ax.get_xlabel(),
            ax.get_ylabel(),
        )
    assert checked >= 2


@pytest.fixture
def render():
    """render(ax_or_axes) -> PNG bytes: checks units, saves to memory; closes the figures afterwards."""
    figs = []
    managers = _pylab_helpers.Gcf.get_num_fig_managers()

    def _render(axes, fmt="png"):
        assert_axis_units(axes)
        first = axes[0] if isinstance(axes, (list, tuple)) else axes
        figs.append(first.figure)
        buf = io.BytesIO()
        first.figure.savefig(buf, format=fmt)
        data = buf.getvalue()
        assert len(data) > 1000
        return data

    yield _render
    # library code never registers figures with pyplot
    assert _pylab_helpers.Gcf.get_num_fig_managers() == managers
    for f in figs:
        f.clear()


@pytest.fixture(scope="session")
def demo_result():
    """The demo scenario over 300 cycles, seed 1 (an invented example; stochastic but seeded)."""
    from pdvoid.inputs.demo import demo_scenario

    return pdvoid.simulate(demo_scenario(), 300, 1)


@pytest.fixture(scope="session")
def demo_histogram_result():
    from pdvoid.inputs.demo import demo_scenario

    return pdvoid.simulate(demo_scenario(), 200, 1, histogram=True)
