"""Weibull fits of discharge magnitudes against samples drawn from scipy.stats.weibull_min (fixed seeds).

Outside sources: scipy.stats.weibull_min (the sampled population), scipy.differentiate.hessian (numerical
check of the analytic Hessian), the likelihood equations of the 2-parameter Weibull distribution (derived by
hand, solved with scipy.optimize.brentq), and the asymptotic variance of the shape estimate
Var(ln beta_hat) = 6/(pi^2 n) of the 2-parameter Weibull maximum-likelihood estimate (standard result, from
memory; e.g. Cohen 1965, Technometrics 7).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats
from scipy.differentiate import hessian
from scipy.optimize import brentq

from pdvoid.analysis.magnitudes import (
    weibull_fit,
    weibull_log_likelihood_hessian,
    weibull_probability_points,
)
from pdvoid.simulation.events import Events


def _sample(shape, scale, n, seed, loc=0.0):
    rng = np.random.default_rng(seed)
    return stats.weibull_min.rvs(shape, loc=loc, scale=scale, size=n, random_state=rng)


@pytest.mark.parametrize("shape,scale", [(1.8, 5e-12), (0.9, 2e-10), (3.5, 1e-12)])
def test_two_parameter_recovery_n5000(shape, scale):
    # scipy.stats.weibull_min samples, n = 5000: shape within 5 %, scale within 5 %; 95 % intervals cover
    # truth
    x = _sample(shape, scale, 5000, seed=2024)
    fit = weibull_fit(x)
    assert fit.shape == pytest.approx(shape, rel=0.05)
    assert fit.scale == pytest.approx(scale, rel=0.05)
    assert fit.location == 0.0 and fit.n == 5000 and fit.parameters == 2
    assert fit.shape_ci[0] < shape < fit.shape_ci[1]
    assert fit.scale_ci[0] < scale < fit.scale_ci[1]


def _profile_mle(x):
    """The 2-parameter Weibull maximum-likelihood estimate by a second method: setting the derivatives of
    ln L = n ln b - n b ln a + (b - 1) sum ln x - sum (x/a)^b to zero gives (hand derivation)
    a^b = mean(x^b) and g(b) = sum x^b ln x / sum x^b - 1/b - mean(ln x) = 0, a single equation in the shape b,
    increasing in b, solved here by bracketing and bisection (scipy.optimize.brentq)."""
    lx = np.log(x)

    def g(b):
        w = np.exp(b * (lx - lx.max()))  # x^b up to a common factor (no overflow)
        return np.sum(w * lx) / np.sum(w) - 1.0 / b - lx.mean()

    b = brentq(g, 0.05, 50.0, xtol=1e-14, rtol=1e-14)
    a = math.exp(lx.max() + math.log(np.mean(np.exp(b * (lx - lx.max())))) / b)
    return b, a


def test_fit_is_the_maximum_likelihood_estimate():
    # the fit solves the likelihood equations of the 2-parameter Weibull distribution (see _profile_mle)
    x = _sample(2.2, 3e-12, 800, seed=5)
    b, a = _profile_mle(x)
    fit = weibull_fit(x)
    assert fit.shape == pytest.approx(b, rel=1e-4)
    assert fit.scale == pytest.approx(a, rel=1e-4)
    # and a small hand-made sample: 1, 2, 3, 5 and 8 pC
    small = np.array([1.0, 2.0, 3.0, 5.0, 8.0]) * 1e-12
    b5, a5 = _profile_mle(small)
    fit5 = weibull_fit(small)
    assert fit5.shape == pytest.approx(b5, rel=1e-4) and fit5.scale == pytest.approx(a5, rel=1e-4)


def test_fitted_cdf_is_the_weibull_formula():
    # F(q) = 1 - exp(-(q/alpha)^beta) (physics brief §10); at q = alpha it is 1 - 1/e = 0.632 (the 63.2 % quantile)
    fit = weibull_fit(_sample(1.7, 2e-12, 400, seed=6))
    q = np.array([0.1e-12, 1e-12, fit.scale, 5e-12])
    np.testing.assert_allclose(fit.cdf(q), 1.0 - np.exp(-((q / fit.scale) ** fit.shape)), rtol=1e-12)
    assert float(fit.cdf(np.array([fit.scale]))[0]) == pytest.approx(1.0 - math.exp(-1.0), rel=1e-12)


def test_fisher_standard_error_matches_asymptotic_value():
    # Var(ln beta_hat) = 6 / (pi^2 n) for the 2-parameter MLE (from memory; standard result): the 95 %
    # interval on ln(shape) has half-width 1.96 sqrt(6/(pi^2 n)); observed information agrees within 5 % at
    # n = 5000
    n = 5000
    fit = weibull_fit(_sample(1.5, 1.0, n, seed=11))
    half = 0.5 * (math.log(fit.shape_ci[1]) - math.log(fit.shape_ci[0]))
    assert half == pytest.approx(stats.norm.ppf(0.975) * math.sqrt(6.0 / (math.pi**2 * n)), rel=0.05)


def test_fisher_interval_coverage_over_seeds():
    # frequentist coverage of the 90 % shape interval over 200 seeded samples of n = 200 (binomial sd ~ 2 %)
    hits = 0
    for seed in range(200):
        fit = weibull_fit(_sample(2.0, 1e-12, 200, seed=1000 + seed), confidence=0.90)
        hits += fit.shape_ci[0] < 2.0 < fit.shape_ci[1]
    assert 0.84 <= hits / 200 <= 0.96


def test_bootstrap_interval_covers_truth_and_is_comparable():
    # percentile bootstrap (scipy.stats.bootstrap, fixed seed) vs Fisher interval on the same sample
    x = _sample(1.6, 4e-12, 400, seed=77)
    boot = weibull_fit(x, interval="bootstrap", n_resamples=199, seed=1)
    fish = weibull_fit(x)
    assert boot.shape == fish.shape
    assert boot.shape_ci[0] < 1.6 < boot.shape_ci[1]
    assert boot.scale_ci[0] < 4e-12 < boot.scale_ci[1]
    wb = boot.shape_ci[1] - boot.shape_ci[0]
    wf = fish.shape_ci[1] - fish.shape_ci[0]
    assert 0.6 < wb / wf < 1.6
    again = weibull_fit(x, interval="bootstrap", n_resamples=199, seed=1)
    assert again.shape_ci == boot.shape_ci  # fixed seed: reproducible


def test_three_parameter_recovery():
    # scipy.stats.weibull_min with location, n = 5000: shape within 10 %, location within 10 % of the scale
    shape, loc, scale = 3.0, 1e-12, 2e-12
    x = _sample(shape, scale, 5000, seed=31, loc=loc)
    fit = weibull_fit(x, parameters=3)
    assert fit.shape == pytest.approx(shape, rel=0.10)
    assert fit.location == pytest.approx(loc, abs=0.1 * scale)
    assert fit.scale == pytest.approx(scale, rel=0.10)
    assert fit.shape_ci[0] < shape < fit.shape_ci[1]
    assert fit.location_ci[0] < loc < fit.location_ci[1]
    assert fit.note == ""


def test_three_parameter_low_shape_has_no_fisher_interval():
    # documented: for shape <= 2 the 3-parameter MLE is not regular (smith1985, from memory) -> NaN + note
    x = _sample(1.3, 2e-12, 2000, seed=8, loc=0.5e-12)
    fit = weibull_fit(x, parameters=3)
    assert fit.shape <= 2.0
    assert math.isnan(fit.shape_ci[0]) and "bootstrap" in fit.note


def test_analytic_hessian_vs_scipy_differentiate():
    # scipy.differentiate.hessian of the summed scipy.stats.weibull_min.logpdf at an arbitrary point
    x = _sample(3.0, 2.0, 300, seed=3, loc=1.0)
    p = np.array([2.7, 2.1, 0.8])

    def loglik(t):
        xs = x.reshape((-1,) + (1,) * (t.ndim - 1))
        return np.sum(stats.weibull_min.logpdf(xs, t[0][None], loc=t[2][None], scale=t[1][None]), axis=0)

    num = hessian(loglik, p, initial_step=0.01).ddf
    # tolerance: the numerical result's own asymmetry (finite-difference error) is about 1e-5 relative
    np.testing.assert_allclose(weibull_log_likelihood_hessian(x, *p), num, rtol=1e-4)


def test_probability_points_median_ranks():
    # Benard's median-rank approximation F_i = (i - 0.3)/(n + 0.4) (common practice), hand-computed for n = 4
    q, f = weibull_probability_points([4e-12, 1e-12, 3e-12, 2e-12])
    np.testing.assert_allclose(q, [1e-12, 2e-12, 3e-12, 4e-12])
    np.testing.assert_allclose(f, [0.7 / 4.4, 1.7 / 4.4, 2.7 / 4.4, 3.7 / 4.4])


def test_probability_points_follow_the_sampled_cdf():
    # Dvoretzky-Kiefer-Wolfowitz inequality (Massart 1990 constant): with probability 0.99 the empirical CDF
    # of n samples stays within sqrt(ln(2/0.01)/(2n)) of the true CDF (scipy.stats.weibull_min.cdf); median
    # ranks differ from i/n by less than 1/n
    n = 5000
    x = _sample(2.5, 3e-12, n, seed=9)
    q, f = weibull_probability_points(x)
    eps = math.sqrt(math.log(2.0 / 0.01) / (2.0 * n)) + 1.0 / n
    assert np.max(np.abs(f - stats.weibull_min.cdf(q, 2.5, scale=3e-12))) < eps
    lq, lf = weibull_probability_points(x, linearized=True)
    np.testing.assert_allclose(lq, np.log(q))
    np.testing.assert_allclose(lf, np.log(-np.log(1.0 - f)))


def test_polarity_selection_from_events():
    # per-polarity fits use the magnitudes of that polarity only (documented)
    pos = _sample(2.0, 2e-12, 1500, seed=1)
    neg = _sample(1.2, 6e-12, 1500, seed=2)
    charge = np.concatenate([pos, -neg])
    ev = Events(phase_deg=np.linspace(0.0, 359.0, 3000), charge=charge, frequency=50.0, cycles=100.0)
    fp = weibull_fit(ev, polarity="+")
    fm = weibull_fit(ev, polarity="-")
    assert fp.n == 1500 and fm.n == 1500
    assert fp.shape == pytest.approx(2.0, rel=0.08) and fm.shape == pytest.approx(1.2, rel=0.08)
    assert fm.scale == pytest.approx(6e-12, rel=0.08)
    assert weibull_fit(ev, polarity="both").n == 3000
    q, _ = weibull_probability_points(ev, polarity="-")
    np.testing.assert_allclose(q, np.sort(neg))
