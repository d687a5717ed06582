"""The pattern comparison score: zero for identical patterns, symmetric, monotone on controlled families,
threshold applied to both sides, finite with an empty side, parts equal to scipy's distances."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.spatial.distance import jensenshannon
from scipy.stats import ks_2samp, wasserstein_distance

import pdvoid
from pdvoid.analysis.compare import (
    DEFAULT_WEIGHTS,
    EMPTY_DISTANCE,
    PART_NAMES,
    cdf_distances,
    compare,
    summarise,
)
from pdvoid.io import PatternMatrix
from pdvoid.simulation.events import Events


def family(n=3000, shift=0.0, scale=1.0, seed=1, cycles=500.0):
    """A controlled pattern: phases uniform in 30-100 deg (+ half) and 210-280 deg (- half), shifted by
    ``shift`` deg; log-normal magnitudes around 100 pC times ``scale``; positive in the + half."""
    rng = np.random.default_rng(seed)
    half = rng.integers(0, 2, n)
    phase = rng.uniform(30.0, 100.0, n) + 180.0 * half + shift
    mag = 1e-10 * scale * 10.0 ** rng.normal(0.0, 0.15, n)
    return Events(phase_deg=phase, charge=np.where(half == 0, mag, -mag), frequency=50.0, cycles=cycles)


def test_identical_patterns_score_zero():
    a = family()
    c = compare(a, a)
    # every part is a distance between identical distributions: 0 by definition (scipy docs of each)
    assert c.score == 0.0 and all(c.parts[k] == 0.0 for k in PART_NAMES)


def test_symmetric():
    a, b = family(seed=1), family(n=2500, shift=7.0, scale=1.4, seed=2, cycles=400.0)
    ab, ba = compare(a, b), compare(b, a)
    # every part is a symmetric distance (JS, W1, KS, |log ratio|, the fingerprint form): common practice
    assert ab.score == pytest.approx(ba.score, rel=1e-12)
    for k in PART_NAMES:
        assert ab.parts[k] == pytest.approx(ba.parts[k], rel=1e-12, abs=1e-15), k


def test_grows_with_phase_shift_and_wasserstein_equals_the_shift():
    base = family()
    scores = []
    for shift in (0.0, 2.0, 5.0, 10.0, 20.0, 40.0, 70.0):
        c = compare(family(shift=shift), base)
        scores.append(c.score)
        # a translated sample is W1 = |shift| away (translation property of the 1-D Wasserstein distance;
        # Villani, Optimal Transport, 2009, common knowledge); the part divides by 180 deg
        assert c.parts["phase_wasserstein"] == pytest.approx(shift / 180.0, rel=1e-9, abs=1e-12)
    assert all(np.diff(scores) > 0.0), scores


def test_grows_with_magnitude_scale_and_wasserstein_is_log10_of_the_factor():
    base = family()
    scores = []
    for k in (1.0, 1.1, 1.3, 2.0, 5.0, 20.0):
        c = compare(family(scale=k), base)
        scores.append(c.score)
        # scaling |q| by k translates log10|q| by log10 k (translation property of W1, as above)
        assert c.parts["magnitude_wasserstein"] == pytest.approx(math.log10(k), rel=1e-9, abs=1e-12)
    assert all(np.diff(scores) > 0.0), scores


def test_rate_part_for_a_doubled_pattern():
    a = family(n=1000)
    twice = Events(
        phase_deg=np.tile(a.phase_deg, 2), charge=np.tile(a.charge, 2), frequency=50.0, cycles=a.cycles
    )
    c = compare(twice, a)
    n_plus = int(np.count_nonzero(a.phase_deg < 180.0))
    n_minus = a.count - n_plus
    w_plus = n_plus / a.count  # half weights: same shares on both sides
    expected = w_plus * math.log10((2 * n_plus + 0.5) / (n_plus + 0.5)) + (1 - w_plus) * math.log10(
        (2 * n_minus + 0.5) / (n_minus + 0.5)
    )  # definition in the docs
    assert c.parts["rate"] == pytest.approx(expected, rel=1e-12)
    # the shapes are identical: the distribution parts vanish (scipy normalises the JS histograms)
    for k in ("phase_js", "phase_wasserstein", "magnitude_wasserstein", "magnitude_ks"):
        assert c.parts[k] == pytest.approx(0.0, abs=1e-7), k


def test_threshold_removes_small_events_from_both_sides():
    a, b = family(seed=1), family(seed=2)
    rng = np.random.default_rng(3)
    small = Events(
        phase_deg=np.concatenate([b.phase_deg, rng.uniform(0, 360, 500)]),
        charge=np.concatenate([b.charge, rng.uniform(-4e-12, 4e-12, 500)]),
        frequency=50.0,
        cycles=b.cycles,
    )
    thr = 5e-12
    with_small = compare(a, small, threshold=thr)
    without = compare(a, b, threshold=thr)
    assert with_small.score == without.score  # the small events are gone before anything is computed
    assert with_small.removed == {"simulated": 0, "measured": 500} and with_small.kept["measured"] == b.count
    assert compare(a, small).score > without.score  # without the threshold they count


def test_empty_side_is_finite_and_documented():
    a = family(n=1000)
    empty = Events(phase_deg=[], charge=[], frequency=50.0, cycles=a.cycles)
    c = compare(a, empty)
    assert math.isfinite(c.score)
    for k, v in EMPTY_DISTANCE.items():
        assert c.parts[k] == v
    n_plus = int(np.count_nonzero(a.phase_deg < 180.0))
    w = n_plus / a.count
    expected = w * math.log10((n_plus + 0.5) / 0.5) + (1 - w) * math.log10((a.count - n_plus + 0.5) / 0.5)
    assert c.parts["rate"] == pytest.approx(expected, rel=1e-12)  # definition in the module docs
    both = compare(empty, empty)
    assert both.score == 0.0
    # everything below the threshold: the same as empty
    assert compare(a, family(n=800, seed=5), threshold=1.0).score == 0.0


def test_cdf_distances_match_scipy_with_ties():
    rng = np.random.default_rng(11)
    for _ in range(20):
        a = np.sort(np.round(rng.normal(size=rng.integers(1, 60)), 1))
        b = np.sort(np.round(rng.normal(0.3, 1.2, size=rng.integers(1, 60)), 1))
        w, d = cdf_distances(a, b)
        # scipy.stats.wasserstein_distance and ks_2samp are the oracles
        assert w == pytest.approx(wasserstein_distance(a, b), rel=1e-12, abs=1e-15)
        assert d == pytest.approx(ks_2samp(a, b).statistic, rel=1e-12)


def test_phase_js_matches_scipy_on_one_half():
    a, b = family(n=800, seed=4), family(n=900, shift=12.0, seed=5)
    a1 = Events(
        phase_deg=a.phase_deg[a.phase_deg < 180],
        charge=a.charge[a.phase_deg < 180],
        frequency=50.0,
        cycles=1.0,
    )
    b1 = Events(
        phase_deg=b.phase_deg[b.phase_deg < 180],
        charge=b.charge[b.phase_deg < 180],
        frequency=50.0,
        cycles=1.0,
    )
    edges = np.linspace(0.0, 180.0, 19)
    expected = jensenshannon(
        np.histogram(a1.phase_deg, edges)[0], np.histogram(b1.phase_deg, edges)[0], base=2
    )
    assert compare(a1, b1).parts["phase_js"] == pytest.approx(expected, rel=1e-12)  # scipy as oracle


def test_summary_reuse_gives_the_same_score():
    a, b = family(seed=1), family(seed=2, shift=3.0)
    thr = 9e-11
    target = summarise(b, threshold=thr)
    assert compare(a, target, threshold=thr).score == compare(a, b, threshold=thr).score
    with pytest.raises(pdvoid.InputError, match="PatternSummary made with threshold"):
        compare(a, target, threshold=0.0)


def test_weights():
    a, b = family(seed=1), family(seed=2, shift=5.0, scale=1.5)
    c = compare(a, b, weights={k: 0.0 for k in PART_NAMES if k != "rate"})
    assert c.score == c.parts["rate"]
    full = compare(a, b)
    expected = sum(DEFAULT_WEIGHTS[k] * full.parts[k] for k in PART_NAMES) / sum(DEFAULT_WEIGHTS.values())
    assert full.score == pytest.approx(expected, rel=1e-12)  # the documented weighted mean
    with pytest.raises(pdvoid.InputError, match="unknown parts"):
        compare(a, b, weights={"colour": 1.0})
    with pytest.raises(pdvoid.InputError, match=">= 0"):
        compare(a, b, weights={"rate": -1.0})
    with pytest.raises(pdvoid.InputError, match="at least one weight"):
        compare(a, b, weights=dict.fromkeys(PART_NAMES, 0.0))
    with pytest.raises(pdvoid.InputError, match="threshold"):
        compare(a, b, threshold=-1.0)


def test_accepts_results_and_count_matrices():
    from pdvoid.inputs.demo import demo_scenario

    r = pdvoid.simulate(demo_scenario(), cycles=40, seed=1)
    m = PatternMatrix(
        np.ones((4, 2)), [0.0, 90.0, 180.0, 270.0, 360.0], [-3e-10, 0.0, 3e-10], cycles=40.0, frequency=50.0
    )
    c = compare(r, m)
    assert math.isfinite(c.score) and c.kept["measured"] == 8
    assert "score" in c.table()


def test_histogram_only_results_are_refused():
    from pdvoid.inputs.demo import demo_scenario

    r = pdvoid.simulate(demo_scenario(), cycles=40, seed=1, histogram=True)
    with pytest.raises(pdvoid.InputError, match="histogram"):
        compare(r, family())
