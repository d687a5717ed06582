"""The ``progress=`` callbacks of the long analyses (the command line's progress bars hang on them)."""

from __future__ import annotations

import pytest

import pdvoid
from pdvoid.analysis.inception import ramp_test
from pdvoid.inputs.demo import demo_measured_path, demo_scenario


def test_ramp_test_reports_each_repeated_test():
    calls = []
    r = ramp_test(demo_scenario(), seeds=range(3), dwell=0.1, step=1e3, progress=lambda d, n: calls.append((d, n)))
    assert calls == [(1, 3), (2, 3), (3, 3)]  # one call per seed, after its test
    assert r.inception_voltages.size == 3


@pytest.mark.filterwarnings("ignore::pdvoid.ValidityWarning")  # trial voids up to 3 mm wide in the 6 mm slab
def test_fit_reports_its_simulations_up_to_the_budget():
    calls = []
    measured = pdvoid.read_events(demo_measured_path())
    r = pdvoid.fit(measured, demo_scenario(), {"void.diameter": (0.5e-3, 3e-3)}, cycles=20, popsize=4, maxiter=1,
                   progress=lambda d, n: calls.append((d, n)))
    # budget: 1 start + popsize 4 x 1 parameter x (1 + 1) generations + 40 polish + 6 noise seeds = 55
    assert {n for _, n in calls} == {55}
    done = [d for d, _ in calls]
    assert done == sorted(done) and done[0] == 1 and done[-1] == min(r.runs, 55)


@pytest.mark.parametrize("bad", [5, "bar"])
def test_a_progress_that_cannot_be_called_is_refused_before_any_work(bad):
    with pytest.raises(pdvoid.InputError, match="progress must be callable"):
        ramp_test(demo_scenario(), progress=bad)
    with pytest.raises(pdvoid.InputError, match="progress must be callable"):
        pdvoid.fit(pdvoid.read_events(demo_measured_path()), demo_scenario(), {"void.diameter": (0.5e-3, 3e-3)},
                   progress=bad)
