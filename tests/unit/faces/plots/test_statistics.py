"""Half-cycle distributions and the Weibull probability plot."""

from __future__ import annotations

import numpy as np
import pytest

from pdvoid import InputError
from pdvoid.analysis.magnitudes import weibull_fit
from pdvoid.faces.plots import half_cycle, weibull_plot
from pdvoid.simulation.events import Events


@pytest.mark.parametrize("quantity", ["H_n", "H_qn", "H_qmax"])
def test_half_cycle_renders(render, demo_result, quantity):
    ax = half_cycle(demo_result, quantity)
    render(ax)
    assert ax.get_xlabel() == "phase within the half cycle [deg]"
    assert quantity in ax.get_ylabel()


def test_half_cycle_counts_per_cycle(demo_result):
    # H_n per cycle, summed over windows and both halves, is the number of nonzero discharges per cycle
    # (counting identity, common practice)
    ax = half_cycle(demo_result, "H_n", phase_windows=18)
    heights = [np.asarray(p.get_data().values) for p in ax.patches if not p.get_fill()]
    total = sum(h.sum() for h in heights)
    assert total == pytest.approx(np.count_nonzero(demo_result.charge) / demo_result.cycles)


def test_weibull_plot_renders_with_fit(render, demo_result):
    ax = weibull_plot(demo_result)
    render(ax)
    assert ax.get_xscale() == "log"
    assert ax.get_ylabel() == "cumulative probability [%]"
    # the legend reports the maximum-likelihood shape of the analysis function (scipy.stats.weibull_min.fit)
    fit = weibull_fit(demo_result, "+")
    texts = [t.get_text() for t in ax.get_legend().get_texts()]
    assert any(f"β = {fit.shape:.2f}" in t for t in texts)


def test_weibull_plot_three_parameters_and_few_points(render):
    rng = np.random.default_rng(3)
    q = 1e-12 * (20.0 + 30.0 * rng.weibull(1.5, 60))
    ev = Events(phase_deg=rng.uniform(0, 180, 60), charge=q, frequency=50.0, cycles=10.0)
    render(weibull_plot(ev, polarities=("both",), parameters=3))
    few = Events(phase_deg=[10.0, 20.0, 200.0], charge=[1e-12, 2e-12, -1e-12], frequency=50.0, cycles=1.0)
    render(weibull_plot(few))  # too few for a fit: points only


def test_statistics_bad_input(demo_result):
    with pytest.raises(InputError, match="quantity"):
        half_cycle(demo_result, "H_x")
    with pytest.raises(InputError, match="phase_windows"):
        half_cycle(demo_result, phase_windows=0)
    empty = Events(phase_deg=[], charge=[], frequency=50.0, cycles=1.0)
    with pytest.raises(InputError, match="no discharge magnitudes"):
        weibull_plot(empty)
    with pytest.raises(InputError, match="polarities"):
        weibull_plot(demo_result, polarities="+")
    with pytest.raises(InputError, match="parameters"):
        weibull_plot(demo_result, parameters=4)
    with pytest.raises(InputError):
        weibull_plot("not events")
