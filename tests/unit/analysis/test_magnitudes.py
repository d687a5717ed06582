"""Weibull fit options and bad input (recovery checks against scipy are in
tests/reference/test_scipy_weibull.py)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from pdvoid import InputError
from pdvoid.analysis.magnitudes import (
    WeibullFit,
    weibull_fit,
    weibull_log_likelihood_hessian,
    weibull_probability_points,
)
from pdvoid.simulation.events import Events

SAMPLE = stats.weibull_min.rvs(2.0, scale=1e-12, size=50, random_state=np.random.default_rng(0))


def test_result_is_frozen_and_cdf_is_the_weibull_formula():
    # cdf is F(q) = 1 - exp(-(q/alpha)^beta) with the fitted parameters (physics brief §10)
    fit = weibull_fit(SAMPLE)
    assert isinstance(fit, WeibullFit)
    with pytest.raises(AttributeError):
        fit.shape = 1.0  # type: ignore[misc]
    q = np.array([0.5e-12, 1e-12])
    np.testing.assert_allclose(fit.cdf(q), 1.0 - np.exp(-((q / fit.scale) ** fit.shape)), rtol=1e-12)
    assert fit.location_ci == (0.0, 0.0)
    assert fit.shape_ci[0] < fit.shape < fit.shape_ci[1]


def test_higher_confidence_gives_wider_interval():
    # property of nested confidence intervals (common practice)
    a = weibull_fit(SAMPLE, confidence=0.8)
    b = weibull_fit(SAMPLE, confidence=0.99)
    assert b.shape_ci[0] < a.shape_ci[0] < a.shape_ci[1] < b.shape_ci[1]


@pytest.mark.parametrize(
    "data,kwargs",
    [
        ([], {}),
        ([1e-12, 2e-12, 3e-12, 4e-12], {}),  # fewer than 5
        (SAMPLE[:8], {"parameters": 3}),  # fewer than 10
        ([1e-12] * 10, {}),  # all equal
        (np.append(SAMPLE, math.nan), {}),
        (np.append(SAMPLE, -1e-12), {}),
        (np.append(SAMPLE, 0.0), {}),
        ("1 pC", {}),
        (None, {}),
        (SAMPLE, {"polarity": "+"}),  # arrays carry no polarity
        (SAMPLE, {"polarity": "pos"}),
        (SAMPLE, {"parameters": 4}),
        (SAMPLE, {"parameters": 2.0}),
        (SAMPLE, {"confidence": 1.0}),
        (SAMPLE, {"confidence": 0.0}),
        (SAMPLE, {"interval": "profile"}),
        (SAMPLE, {"interval": "bootstrap", "n_resamples": 5}),
        (SAMPLE, {"interval": "bootstrap", "seed": -1}),
    ],
)
def test_weibull_fit_bad_input(data, kwargs):
    with pytest.raises(InputError):
        weibull_fit(data, **kwargs)


def test_events_without_pulses_of_a_polarity():
    ev = Events(phase_deg=[10.0] * 6, charge=SAMPLE[:6], frequency=50.0, cycles=1.0)
    with pytest.raises(InputError, match="at least"):
        weibull_fit(ev, polarity="-")
    with pytest.raises(InputError):
        weibull_probability_points(ev, polarity="-")


def test_probability_points_bad_input():
    with pytest.raises(InputError):
        weibull_probability_points([])
    with pytest.raises(InputError):
        weibull_probability_points([1e-12, -1e-12])
    with pytest.raises(InputError):
        weibull_probability_points(SAMPLE, linearized="yes")


def test_hessian_bad_input():
    with pytest.raises(InputError):
        weibull_log_likelihood_hessian(SAMPLE, 0.0, 1e-12)
    with pytest.raises(InputError):
        weibull_log_likelihood_hessian(SAMPLE, 2.0, -1e-12)
    with pytest.raises(InputError):
        weibull_log_likelihood_hessian(SAMPLE, 2.0, 1e-12, location=float(SAMPLE.min()))
    with pytest.raises(InputError):
        weibull_log_likelihood_hessian([math.nan], 2.0, 1e-12)
