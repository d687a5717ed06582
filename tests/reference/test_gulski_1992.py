"""Descriptors of phase-resolved distributions after Gulski & Kreuger (1992), Gulski (1993, 1995).

The definitions are from memory (physics brief section 10). The checks evaluate each definition independently
(scipy.stats / numpy) on the hand-made distributions in reference/gulski_1992/distributions.toml.
"""

from __future__ import annotations

import math
import tomllib
from pathlib import Path

import numpy as np
import pytest
from scipy import stats

from pdvoid.analysis.descriptors import (
    FINGERPRINT_NAMES,
    cross_correlation,
    discharge_asymmetry,
    fingerprint,
    kurtosis,
    modified_cross_correlation,
    number_of_peaks,
    phase_asymmetry,
    skewness,
)
from pdvoid.analysis.patterns import half_cycle_distributions
from pdvoid.simulation.events import Events

REF = Path(__file__).resolve().parents[2] / "reference" / "gulski_1992"
RTOL = tomllib.loads((REF / "source.toml").read_text())["tolerance"]["relative"]
DISTRIBUTIONS = tomllib.loads((REF / "distributions.toml").read_text())["distribution"]
X = np.arange(5.0, 180.0, 10.0)  # window centres of 10-degree windows (physics brief section 10)


def _events(phase, charge, cycles=1.0):
    phase = np.asarray(phase, dtype=float)
    return Events(phase_deg=phase, charge=np.asarray(charge, dtype=float), frequency=50.0, cycles=cycles,
                  time=phase / 360.0 / 50.0)


@pytest.mark.parametrize("dist", DISTRIBUTIONS, ids=[d["name"] for d in DISTRIBUTIONS])
def test_skewness_definition_vs_scipy_on_expanded_samples(dist):
    # scipy.stats.skew(bias=True) of np.repeat(x_i, y_i) is the weighted moment definition of the brief
    y = np.asarray(dist["y"], dtype=float)
    expected = stats.skew(np.repeat(X, dist["y"]), bias=True)
    assert skewness(X, y) == pytest.approx(expected, rel=RTOL, abs=1e-12)


@pytest.mark.parametrize("dist", DISTRIBUTIONS, ids=[d["name"] for d in DISTRIBUTIONS])
def test_kurtosis_definition_vs_scipy_on_expanded_samples(dist):
    # scipy.stats.kurtosis(fisher=True, bias=True): excess kurtosis, 0 for a normal shape
    y = np.asarray(dist["y"], dtype=float)
    expected = stats.kurtosis(np.repeat(X, dist["y"]), fisher=True, bias=True)
    assert kurtosis(X, y) == pytest.approx(expected, rel=RTOL, abs=1e-12)


@pytest.mark.parametrize("dist", DISTRIBUTIONS, ids=[d["name"] for d in DISTRIBUTIONS])
def test_number_of_peaks_hand_counted(dist):
    # peak counts counted by hand (distributions.toml), definition: dy/dx changes sign from + to -
    assert number_of_peaks(dist["y"]) == dist["peaks"]


def test_moments_are_weights_not_counts():
    # scaling all weights leaves weighted moments unchanged (definition: y_i enter as weights / sum y_i)
    y = np.asarray(DISTRIBUTIONS[1]["y"], dtype=float)
    assert skewness(X, 3.7e-12 * y) == pytest.approx(skewness(X, y), rel=1e-12)
    assert kurtosis(X, 3.7e-12 * y) == pytest.approx(kurtosis(X, y), rel=1e-12)


def test_symmetric_shape_has_zero_skewness_and_box_kurtosis():
    # textbook limits: a symmetric shape has Sk = 0; a discrete uniform over 4 points has excess kurtosis
    # -1.36 (= -6(n^2+1)/(5(n^2-1)) with n = 4, the discrete-uniform formula)
    y = np.zeros(18)
    y[4:8] = 1.0
    assert skewness(X, y) == pytest.approx(0.0, abs=1e-12)
    assert kurtosis(X, y) == pytest.approx(-6.0 * 17.0 / (5.0 * 15.0), rel=1e-12)


@pytest.mark.parametrize("i,j", [(0, 1), (1, 2), (2, 6), (3, 5)])
def test_cross_correlation_vs_numpy_corrcoef(i, j):
    # cc is Pearson's correlation coefficient: numpy.corrcoef
    a = np.asarray(DISTRIBUTIONS[i]["y"], dtype=float)
    b = np.asarray(DISTRIBUTIONS[j]["y"], dtype=float)
    assert cross_correlation(a, b) == pytest.approx(np.corrcoef(a, b)[0, 1], rel=RTOL, abs=1e-12)


def test_cross_correlation_limits():
    # definition: cc = 1 for identical shapes, -1 for mirrored linear ones, NaN for a constant distribution
    a = np.asarray(DISTRIBUTIONS[0]["y"], dtype=float)
    assert cross_correlation(a, 2.0 * a) == pytest.approx(1.0)
    assert cross_correlation([1.0, 2.0, 3.0], [3.0, 2.0, 1.0]) == pytest.approx(-1.0)
    assert math.isnan(cross_correlation(a, np.ones_like(a)))


def _hand_made_events():
    # + half: 1 pC at 20 deg, 3 pC at 25 deg (window 20-30: mean 2 pC), 2 pC at 100 deg
    # - half: 2 pC at 210, 4 pC at 215 (window 30-40 re-referenced: mean 3 pC), 6 pC at 290 deg (110 re-ref.)
    phase = [20.0, 25.0, 100.0, 210.0, 215.0, 290.0]
    charge = [1e-12, 3e-12, 2e-12, -2e-12, -4e-12, -6e-12]
    return _events(phase, charge)


def test_discharge_asymmetry_hand_computed():
    # Q = (Q_s-/N-)/(Q_s+/N+) = (12/3)/(6/3) = 2, computed by hand from the definition
    assert discharge_asymmetry(_hand_made_events()) == pytest.approx(2.0, rel=1e-12)


def test_phase_asymmetry_hand_computed():
    # Phi = phi_in-/phi_in+ = (210 - 180)/20 = 1.5, computed by hand from the definition
    assert phase_asymmetry(_hand_made_events()) == pytest.approx(1.5, rel=1e-12)


def test_modified_cross_correlation_is_product_of_independent_parts():
    # mcc = Q Phi cc, with cc computed by numpy.corrcoef on the hand-built H_qn+ and H_qn- (10-deg windows)
    ev = _hand_made_events()
    qn_plus = np.zeros(18)
    qn_minus = np.zeros(18)
    qn_plus[2], qn_plus[10] = 2e-12, 2e-12
    qn_minus[3], qn_minus[11] = 3e-12, 6e-12
    d = half_cycle_distributions(ev, 18)
    np.testing.assert_allclose(d.qn_plus, qn_plus, rtol=1e-12)
    np.testing.assert_allclose(d.qn_minus, qn_minus, rtol=1e-12)
    cc = np.corrcoef(qn_plus, qn_minus)[0, 1]
    assert modified_cross_correlation(ev, 18) == pytest.approx(2.0 * 1.5 * cc, rel=1e-10)
    fp = fingerprint(ev, 18)
    assert fp["cross-correlation"] == pytest.approx(cc, rel=1e-10)
    assert fp["modified cross-correlation"] == pytest.approx(2.0 * 1.5 * cc, rel=1e-10)


def test_fingerprint_entries_match_single_descriptors():
    # fingerprint is the documented fixed-order collection of the single descriptors (scipy-checked above)
    rng = np.random.default_rng(7)
    phase = np.concatenate([rng.normal(60.0, 20.0, 400) % 180.0, 180.0 + rng.normal(70.0, 30.0, 300) % 180.0])
    charge = np.concatenate([rng.lognormal(-27.0, 0.5, 400), -rng.lognormal(-26.5, 0.5, 300)])
    ev = _events(phase, charge, cycles=50.0)
    fp = fingerprint(ev)
    assert tuple(fp) == FINGERPRINT_NAMES and len(fp) == 22
    d = half_cycle_distributions(ev, 18)
    expanded = np.repeat(d.window_centres_deg, d.n_minus.astype(int))
    assert fp["skewness H_n-"] == pytest.approx(stats.skew(expanded, bias=True), rel=1e-10)
    assert fp["kurtosis H_n-"] == pytest.approx(stats.kurtosis(expanded, bias=True), rel=1e-10)
    assert fp["skewness H_qmax+"] == pytest.approx(skewness(d.window_centres_deg, d.qmax_plus), rel=1e-12)
    assert fp["peaks H_qn+"] == float(number_of_peaks(d.qn_plus))
