"""Fitting a void's physics to a measured pattern: recovery of hidden parameters from synthetic data.

The data are pdvoid's synthetic demo measurement (pdvoid/data/demo_measured.csv): the simulator with hidden
parameters plus detector effects, labelled synthetic. Recovering what we hid is a self-consistency check (the
standard parameter-recovery test for simulation-based inference), not an outside reference.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

import pdvoid
from pdvoid.analysis.fit import fit
from pdvoid.analysis.synthetic import DEMO_CIRCUIT, DEMO_INSTRUMENT, demo_measured_path, hidden_parameters
from pdvoid.inputs.demo import demo_scenario

DETECTOR = dict(noise=2e-12, relative_noise=0.03, phase_resolution_deg=1.0)


@pytest.fixture(scope="module")
def measured():
    return pdvoid.read_events(demo_measured_path())


# the fit explores void diameters up to about 2.8 mm (1.5 mm tall, 6 mm slab), where the closed forms are about 2 %
# off (solver, derived) and compute_coefficients says so with a ValidityWarning; that is expected here
@pytest.mark.filterwarnings("ignore::pdvoid.core.validity.ValidityWarning")
def test_recovers_hidden_parameters_from_a_wrong_start(measured):
    truth = hidden_parameters(measured)
    vary = {"void.diameter": (0.5e-3, 3e-3), "model.residual_ratio": (0.05, 0.6),
            "model.surface_rate_same": (1e3, 1e5)}
    start = demo_scenario()  # deliberately wrong: 1.5 mm, 0.25, 1e4 /s
    # the demo file was read through the IEC 60270 forward model; the fit puts the same instrument in the loop
    r = fit(measured, start, vary, threshold=10e-12, cycles=1000, seed=1, circuit=DEMO_CIRCUIT,
            instrument=DEMO_INSTRUMENT, popsize=6, maxiter=15)
    assert r.score < 0.5 * r.start_score
    # tolerances (our own): size within 8 %, residual ratio within 0.05, surface rate within a factor 2
    assert r.best["void.diameter"] == pytest.approx(truth["void.diameter"], rel=0.08)
    assert r.best["model.residual_ratio"] == pytest.approx(truth["model.residual_ratio"], abs=0.05)
    assert abs(math.log(r.best["model.surface_rate_same"] / truth["model.surface_rate_same"])) < math.log(2.0)
    for k in vary:
        lo, hi = r.ranges[k]
        assert lo <= r.best[k] <= hi
    assert r.identified["void.diameter"] and r.identified["model.residual_ratio"]
    lo, hi = r.ranges["void.diameter"]
    assert lo <= truth["void.diameter"] <= hi
    assert r.runs == len(r.scores) + 6 and r.points.shape == (len(r.scores), 3)
    assert "void.diameter" in r.table(truth)


def test_a_parameter_without_effect_is_reported_as_not_identified(measured):
    # a deposited-charge decay time of 1e3..1e5 s cannot act within a 10 s record: the data cannot pin it down
    vary = {"void.diameter": (1e-3, 2.5e-3), "model.charge_decay_time": (1e3, 1e5)}
    r = fit(measured, demo_scenario(), vary, threshold=10e-12, cycles=300, seed=2, detector=DETECTOR, popsize=5,
            maxiter=6, polish=False)
    assert not r.identified["model.charge_decay_time"]
    lo, hi = r.ranges["model.charge_decay_time"]
    assert hi / lo > 10.0


def test_same_seed_same_fit(measured):
    vary = {"void.diameter": (1e-3, 2.5e-3)}
    a = fit(measured, demo_scenario(), vary, cycles=200, seed=3, popsize=4, maxiter=3, polish=False)
    b = fit(measured, demo_scenario(), vary, cycles=200, seed=3, popsize=4, maxiter=3, polish=False)
    assert a.best == b.best and np.array_equal(a.scores, b.scores)


@pytest.mark.parametrize(
    "vary, match",
    [
        ({}, "vary"),
        ({"void.colour": (1, 2)}, "void.colour"),
        ({"void.diameter": (3e-3, 1e-3)}, "low < high"),
        ({"void.diameter": (0.0, math.inf)}, "finite"),
    ],
)
def test_bad_fit_requests(measured, vary, match):
    with pytest.raises(pdvoid.InputError, match=match):
        fit(measured, demo_scenario(), vary)


def test_circuit_and_instrument_go_together(measured):
    vary = {"void.diameter": (1e-3, 2.5e-3)}
    with pytest.raises(pdvoid.InputError, match="together"):
        fit(measured, demo_scenario(), vary, circuit=DEMO_CIRCUIT)
    with pytest.raises(pdvoid.InputError, match="not both"):
        fit(measured, demo_scenario(), vary, circuit=DEMO_CIRCUIT, instrument=DEMO_INSTRUMENT, detector=DETECTOR)
