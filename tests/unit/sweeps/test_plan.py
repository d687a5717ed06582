"""Sweep designs: grid order, random bounds, Latin-hypercube strata, seeds from one master seed."""

from __future__ import annotations

import numpy as np
import pytest

from pdvoid import InputError
from pdvoid.sweeps.plan import grid_plan, lhs_plan, make_plan, point_seeds, random_plan


def test_point_seeds_follow_the_documented_seedsequence_recipe():
    # numpy.random.SeedSequence.spawn is the documented way to derive independent child streams (numpy docs,
    # "Parallel random number generation"); the recipe is checked against numpy directly, not against itself
    children = np.random.SeedSequence(1234).spawn(5)
    expected = [int(c.generate_state(1, dtype=np.uint32)[0]) >> 1 for c in children]
    assert point_seeds(1234, 5).tolist() == expected
    assert point_seeds(1234, 5).dtype == np.int32


def test_point_seed_depends_on_index_not_on_sweep_size():
    # spawn(n)[i] has spawn_key (i,) whatever n is (numpy SeedSequence semantics)
    assert point_seeds(7, 3).tolist() == point_seeds(7, 10)[:3].tolist()
    assert point_seeds(7, 3).tolist() != point_seeds(8, 3).tolist()


def test_grid_is_every_combination_first_parameter_slowest():
    plan = grid_plan({"void.diameter": [1e-3, 2e-3], "void.pressure": [5e4, 1e5, 2e5]}, seed=3)
    assert plan.shape == (2, 3) and plan.n_points == 6
    assert plan.values["void.diameter"].tolist() == [1e-3] * 3 + [2e-3] * 3
    assert plan.values["void.pressure"].tolist() == [5e4, 1e5, 2e5] * 2
    assert plan.changes(4) == {"void.diameter": 2e-3, "void.pressure": 1e5}
    assert isinstance(plan.changes(4)["void.diameter"], float)  # plain Python values for Scenario.replace


def test_grid_accepts_text_and_flags():
    plan = grid_plan({"void.gas": ["air", "SF6"], "model.lag_free": [True, False]})
    assert plan.changes(1) == {"void.gas": "air", "model.lag_free": False}
    assert isinstance(plan.changes(1)["model.lag_free"], bool)


@pytest.mark.parametrize("design", ["random", "lhs"])
def test_sampled_designs_are_reproducible_from_the_seed_and_stay_inside_bounds(design):
    bounds = {"void.diameter": (0.5e-3, 2e-3), "model.ionization_rate": (1e6, 1e10, "log")}
    a = make_plan(bounds, design=design, samples=40, seed=11)
    b = make_plan(bounds, design=design, samples=40, seed=11)
    c = make_plan(bounds, design=design, samples=40, seed=12)
    for name in bounds:
        assert np.array_equal(a.values[name], b.values[name])
        assert not np.array_equal(a.values[name], c.values[name])
        low, high = bounds[name][:2]
        assert np.all((a.values[name] >= low) & (a.values[name] <= high))
    assert a.log_scale == ("model.ionization_rate",)


def test_lhs_hits_each_stratum_once_per_dimension():
    # Latin hypercube definition (McKay, Beckman and Conover 1979, Technometrics 21(2)): with n samples each
    # parameter's range is cut into n equal strata and every stratum holds exactly one sample
    n = 25
    plan = lhs_plan(
        {
            "void.diameter": (0.5e-3, 2e-3),
            "void.pressure": (2e4, 2e5),
            "model.ionization_rate": (1e6, 1e10, "log"),
        },
        samples=n,
        seed=5,
    )
    for name, (low, high) in plan.bounds.items():
        x = plan.values[name]
        if name in plan.log_scale:  # strata equal in the logarithm
            x, low, high = np.log(x), np.log(low), np.log(high)
        strata = np.minimum(np.floor((x - low) / (high - low) * n).astype(int), n - 1)
        assert sorted(strata.tolist()) == list(range(n)), name


def test_random_design_is_not_stratified():
    # a control for the test above: 25 independent uniform draws almost never fill all 25 strata
    # (probability 25!/25**25 ~ 1e-10, elementary combinatorics)
    plan = random_plan({"void.diameter": (0.0, 1.0)}, samples=25, seed=5)
    strata = np.floor(plan.values["void.diameter"] * 25).astype(int)
    assert len(set(strata.tolist())) < 25


@pytest.mark.parametrize(
    ("call", "match"),
    [
        (lambda: grid_plan({}), "non-empty"),
        (lambda: grid_plan({"diameter": [1.0]}), "void.diameter"),
        (lambda: grid_plan({"void.diameter": []}), "empty"),
        (lambda: grid_plan({"void.diameter": [1e-3, 1e-3]}), "distinct"),
        (lambda: grid_plan({"void.diameter": [1e-3, "air"]}), "all numbers"),
        (lambda: grid_plan({"void.diameter": [1e-3, float("nan")]}), "finite"),
        (lambda: grid_plan({"void.diameter": "1 mm"}), "list"),
        (lambda: grid_plan({"void.diameter": [1e-3]}, seed=-1), "seed"),
        (lambda: random_plan({"void.diameter": (2e-3, 1e-3)}, samples=3), "below"),
        (lambda: random_plan({"void.diameter": (0.0, 1e-3, "log")}, samples=3), "> 0"),
        (lambda: random_plan({"void.diameter": (0.0, 1e-3, "cubic")}, samples=3), "bounds"),
        (lambda: random_plan({"void.diameter": [1e-3, 2e-3, 3e-3, 4e-3]}, samples=3), "bounds"),
        (lambda: lhs_plan({"void.diameter": (1e-3, 2e-3)}, samples=0), "samples"),
        (lambda: make_plan({"void.diameter": [1e-3]}, design="grid", samples=3), "samples"),
        (lambda: make_plan({"void.diameter": (1e-3, 2e-3)}, design="lhs"), "samples"),
        (lambda: make_plan({"void.diameter": [1e-3]}, design="sobol"), "design"),
    ],
)
def test_bad_designs_are_input_errors(call, match):
    with pytest.raises(InputError, match=match):
        call()
