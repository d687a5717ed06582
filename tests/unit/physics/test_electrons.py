"""Unit tests of pdvoid.physics.electrons: start-electron supply and waiting-time statistics."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from pdvoid import InputError
from pdvoid.physics.electrons import (
    probability_of_discharge,
    probability_of_no_discharge,
    statistical_time_lag_mean,
    volume_electron_rate,
)


def test_volume_rate_formula():
    # Source: N = G (n/n0) Omega eta (physics brief §3.3/§8): 1e7 x 0.5 x 2e-9 x 0.25 = 2.5e-3 /s at 0.5 atm.
    assert volume_electron_rate(2e-9, 101325.0 / 2, electron_yield=0.25) == pytest.approx(2.5e-3, rel=1e-14)
    assert volume_electron_rate(2e-9, 101325.0, electron_yield=0.0) == 0.0
    assert volume_electron_rate(2e-9, 101325.0, ionization_rate=0.0) == 0.0


def test_volume_rate_vectorised():
    # Source: element-wise evaluation of the same formula (common practice).
    v = np.array([1e-9, 2e-9, 4e-9])
    out = volume_electron_rate(v, 101325.0)
    np.testing.assert_allclose(out, 1e7 * v, rtol=1e-14)
    assert isinstance(volume_electron_rate(1e-9, 101325.0), float)


@pytest.mark.parametrize("kwargs, match", [
    (dict(volume=0.0), "volume"),
    (dict(volume=-1e-9), "volume"),
    (dict(pressure=0.0), "pressure"),
    (dict(temperature=math.nan), "temperature"),
    (dict(electron_yield=1.5), "electron_yield"),
    (dict(electron_yield=-0.1), "electron_yield"),
    (dict(ionization_rate=-1.0), "ionization_rate"),
    (dict(ionization_rate=math.inf), "ionization_rate"),
    (dict(volume=[1e-9, -1e-9]), r"volume\[1\]"),
])
def test_volume_rate_rejects_bad_input(kwargs, match):
    # Source: project rules (0 <= eta <= 1; positive volume, pressure, temperature).
    args = dict(volume=1e-9, pressure=101325.0, temperature=293.15)
    args.update(kwargs)
    with pytest.raises(InputError, match=match):
        volume_electron_rate(args.pop("volume"), args.pop("pressure"), args.pop("temperature"), **args)


def test_time_lag_and_probabilities():
    # Source: Poisson process (common practice): mean wait 1/N; P(no event in t) = exp(-N t).
    assert statistical_time_lag_mean(4.0) == 0.25
    assert probability_of_no_discharge(2.0, 0.5) == pytest.approx(math.exp(-1.0), rel=1e-15)
    assert probability_of_no_discharge(0.0, 10.0) == 1.0
    assert probability_of_discharge(2.0, 0.5) == pytest.approx(1.0 - math.exp(-1.0), rel=1e-15)
    # accurate for tiny N t (expm1): 1e-20 would be lost as 1 - exp(-1e-20) = 0 in double precision
    assert probability_of_discharge(1e-20, 1.0) == pytest.approx(1e-20, rel=1e-12)
    np.testing.assert_allclose(probability_of_no_discharge(np.array([0.0, 1.0]), 2.0), [1.0, math.exp(-2.0)])


@settings(max_examples=50)
@given(n=st.floats(0.0, 1e6), t=st.floats(0.0, 10.0))
def test_probabilities_complementary_and_bounded(n, t):
    # Source: probability axioms: P(none) + P(at least one) = 1, both in [0, 1].
    p0 = probability_of_no_discharge(n, t)
    p1 = probability_of_discharge(n, t)
    assert 0.0 <= p0 <= 1.0 and 0.0 <= p1 <= 1.0
    assert p0 + p1 == pytest.approx(1.0, abs=1e-12)


@pytest.mark.parametrize("call, match", [
    (lambda: statistical_time_lag_mean(0.0), "rate"),
    (lambda: statistical_time_lag_mean(-1.0), "rate"),
    (lambda: probability_of_no_discharge(-1.0, 1.0), "rate"),
    (lambda: probability_of_no_discharge(1.0, -1.0), "duration"),
    (lambda: probability_of_discharge(1.0, math.inf), "duration"),
])
def test_statistics_reject_bad_input(call, match):
    # Source: project rules.
    with pytest.raises(InputError, match=match):
        call()
