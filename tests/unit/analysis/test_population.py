"""Void populations for design: the probability that a part passes a routine test (pdvoid.acceptance_probability)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

import pdvoid
from pdvoid.analysis.population import acceptance_probability, wilson_interval
from pdvoid.inputs.population import VoidPopulation

DESIGN = pdvoid.Scenario(
    insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
    void=pdvoid.Void(diameter=1e-3, height=1e-3),
    supply=pdvoid.Sine(rms=18e3),
    model=pdvoid.FieldModel(residual_ratio=0.25, ionization_rate=1e9, surface_rate_same=1e4,
                            surface_rate_reversed=3e3, surface_decay_time=0.02),
)
LAG_FREE = DESIGN.replace(**{"model.lag_free": True})


@pytest.mark.parametrize("k, n, c", [(0, 10, 0.95), (10, 10, 0.95), (37, 50, 0.9), (1, 1000, 0.99), (500, 1000, 0.5)])
def test_wilson_interval_matches_scipy(k, n, c):
    # reference: scipy.stats.binomtest(k, n).proportion_ci(method="wilson") (Wilson 1927, no continuity correction)
    ref = stats.binomtest(k, n).proportion_ci(confidence_level=c, method="wilson")
    lo, hi = wilson_interval(k, n, c)
    assert lo == pytest.approx(ref.low, abs=1e-12) and hi == pytest.approx(ref.high, abs=1e-12)


def test_wilson_interval_refuses_bad_input():
    for args, words in (((3, 2), "passed"), ((0, 0), "total"), ((1, 2, 1.0), "confidence")):
        with pytest.raises(pdvoid.InputError, match=words):
            wilson_interval(*args)


def test_voids_all_below_inception_always_pass():
    sizes = (0.1e-3, 0.15e-3, 0.2e-3)
    for d in sizes:  # independent check: the analytic inception voltage of each size lies above the test voltage
        assert pdvoid.inception(DESIGN.replace(**{"void.diameter": d, "void.height": d})).inception_voltage > 18e3
    pop = VoidPopulation(voids_per_part=5, diameters=sizes, aspect_ratio=1.0)
    r = acceptance_probability(DESIGN, pop, level=1e-12, duration=1.0, parts=50, seed=3)
    assert r.probability == 1.0 and r.passed == 50 and np.all(r.levels == 0.0)
    assert r.pd_free_probability == 1.0 and np.all(r.discharging_voids == 0)
    # the interval at k = n: Wilson's upper end is 1, its lower end n/(n + z^2) (scipy as the reference)
    assert r.interval == pytest.approx(stats.binomtest(50, 50).proportion_ci(method="wilson")[:2])


def test_one_size_with_a_known_magnitude_passes_or_fails_by_the_level():
    # lag-free field model: every discharge drops the void field from E_inc to E_res, so each apparent charge is
    # charge_per_field * (E_inc - E_res) (the kernel's definition, from the closed-form coefficients)
    d = 1.5e-3
    c = pdvoid.compute_coefficients(LAG_FREE.replace(**{"void.diameter": d, "void.height": d}))
    assert c.inception_voltage < 18e3
    q0 = c.charge_per_field * (c.inception_field - c.residual_field)
    pop = VoidPopulation(voids_per_part=1, diameters=(d,), count="fixed", aspect_ratio=1.0)
    above = acceptance_probability(LAG_FREE, pop, level=1.01 * q0, duration=0.2, parts=5, seed=1)
    below = acceptance_probability(LAG_FREE, pop, level=0.99 * q0, duration=0.2, parts=5, seed=1)
    assert above.probability == 1.0 and below.probability == 0.0
    assert np.allclose(below.levels, q0, rtol=1e-9)
    rep = acceptance_probability(LAG_FREE, pop, level=0.99 * q0, duration=0.2, parts=5, seed=1, quantity="repeated")
    assert rep.probability == 0.0  # two equal pulses per cycle repeat 100 times a second at 50 Hz
    assert above.pd_free_probability == 0.0  # every part holds a discharging void


def test_tiny_level_gives_the_analytic_probability_of_no_discharging_void():
    # lag-free: a void at or above the largest discharge-free size discharges in the first cycle; with a level
    # below any discharge a part passes exactly when it holds no such void. Poisson count: P = exp(-lam (1 - F))
    sizes = (0.2e-3, 0.3e-3, 0.6e-3, 1.0e-3, 1.5e-3)
    lam = 1.2
    pop = VoidPopulation(voids_per_part=lam, diameters=sizes, aspect_ratio=1.0)
    r = acceptance_probability(LAG_FREE, pop, level=1e-15, duration=0.1, parts=400, seed=11)
    d_free = pdvoid.largest_pd_free_void(LAG_FREE, 18e3).diameter
    share_below = sum(s < d_free for s in sizes) / len(sizes)
    expected = math.exp(-lam * (1.0 - share_below))  # Poisson thinning (any probability textbook)
    assert 0.0 < share_below < 1.0
    assert r.pd_free_probability == pytest.approx(expected, rel=1e-12)
    lo, hi = wilson_interval(r.passed, r.parts, 0.999)
    assert lo <= expected <= hi


def test_fixed_count_bound_is_the_power_of_the_share():
    sizes = (0.2e-3, 1.5e-3)
    pop = VoidPopulation(voids_per_part=3, diameters=sizes, count="fixed", aspect_ratio=1.0)
    r = acceptance_probability(LAG_FREE, pop, level=1e-15, duration=0.1, parts=200, seed=2)
    assert r.pd_free_probability == pytest.approx(0.5**3)  # each void below the free size with probability 1/2
    assert np.all(r.void_counts == 3)
    lo, hi = wilson_interval(r.passed, r.parts, 0.999)
    assert lo <= 0.125 <= hi


def test_lognormal_sizes_follow_the_truncated_distribution():
    pop = VoidPopulation(voids_per_part=2, median_diameter=0.5e-3, sigma=0.5, smallest=0.1e-3, largest=2e-3)
    ref = stats.lognorm(s=0.5, scale=0.5e-3)  # scipy's log-normal: the reference distribution function
    lo, hi = ref.cdf(0.1e-3), ref.cdf(2e-3)
    for d in (0.2e-3, 0.5e-3, 1e-3):
        assert pop.fraction_below(d) == pytest.approx((ref.cdf(d) - lo) / (hi - lo), rel=1e-10)
    draws = pop.draw_diameters(np.random.default_rng(0), 4000)
    assert draws.min() >= 0.1e-3 and draws.max() <= 2e-3
    ks = stats.kstest(draws, lambda x: (ref.cdf(x) - lo) / (hi - lo))
    assert ks.pvalue > 0.01  # a fixed seed: the draws are not distinguishable from the truncated log-normal


def test_same_seed_same_estimate():
    pop = VoidPopulation(voids_per_part=2, median_diameter=0.6e-3, sigma=0.5, largest=2e-3)
    a = acceptance_probability(DESIGN, pop, level=50e-12, duration=0.5, parts=20, seed=5)
    b = acceptance_probability(DESIGN, pop, level=50e-12, duration=0.5, parts=20, seed=5)
    assert np.array_equal(a.levels, b.levels) and a.passed == b.passed
    assert "pass probability" in a.summary() and a.cycles == 25


@pytest.mark.parametrize("kwargs, words", [
    (dict(voids_per_part=-1, diameters=(1e-3,)), "voids_per_part"),
    (dict(voids_per_part=1.5, diameters=(1e-3,), count="fixed"), "whole number"),
    (dict(voids_per_part=1, diameters=(1e-3,), count="some"), "count"),
    (dict(voids_per_part=1), "log-normal population needs"),
    (dict(voids_per_part=1, median_diameter=1e-3, sigma=0.5), "largest"),
    (dict(voids_per_part=1, diameters=(1e-3,), median_diameter=1e-3), "not both"),
    (dict(voids_per_part=1, diameters=(0.0,)), "diameters"),
    (dict(voids_per_part=1, median_diameter=1e-3, sigma=0.5, largest=1e-3, smallest=2e-3), "smallest"),
    (dict(voids_per_part=1, diameters=(1e-3,), aspect_ratio=0.0), "aspect_ratio"),
])
def test_bad_populations_are_refused(kwargs, words):
    with pytest.raises(pdvoid.InputError, match=words):
        VoidPopulation(**kwargs)


@pytest.mark.parametrize("kwargs, words", [
    (dict(level=0.0), "level"),
    (dict(duration=-1.0), "duration"),
    (dict(parts=0), "parts"),
    (dict(quantity="mean"), "quantity"),
    (dict(confidence=1.0), "confidence"),
    (dict(voltage=-5.0), "voltage"),
    (dict(seed=-1), "seed"),
])
def test_bad_settings_are_refused(kwargs, words):
    pop = VoidPopulation(voids_per_part=1, diameters=(1e-3,))
    args = dict(level=10e-12, duration=1.0) | kwargs
    with pytest.raises(pdvoid.InputError, match=words):
        acceptance_probability(DESIGN, pop, **args)


def test_a_population_that_does_not_fit_the_insulation_is_refused():
    pop = VoidPopulation(voids_per_part=1, diameters=(1e-3, 7e-3), aspect_ratio=1.0)
    with pytest.raises(pdvoid.InputError, match="largest void"):
        acceptance_probability(DESIGN, pop, level=10e-12, duration=1.0)


def test_worker_processes_give_the_same_estimate():
    pop = VoidPopulation(voids_per_part=2, diameters=(0.3e-3, 0.8e-3, 1.2e-3))
    a = acceptance_probability(DESIGN, pop, level=60e-12, duration=0.2, parts=12, seed=8)
    b = acceptance_probability(DESIGN, pop, level=60e-12, duration=0.2, parts=12, seed=8, workers=2)
    assert np.array_equal(a.levels, b.levels) and a.passed == b.passed  # each part has its own seed
    with pytest.raises(pdvoid.InputError, match="workers"):
        acceptance_probability(DESIGN, pop, level=60e-12, duration=0.2, workers=0)
