"""The inception band of both criteria and its verdict against a test level (pdvoid.analysis.verdict)."""

from __future__ import annotations

import math
import warnings

import pytest

import pdvoid
from pdvoid.analysis.verdict import (
    DISCHARGE_FREE,
    DISCHARGES_EXPECTED,
    INCONCLUSIVE,
    band_from_criteria,
    inception_band,
    verdict,
)


@pytest.mark.parametrize(
    ("test_kV", "expected"),
    [
        (8.0, DISCHARGE_FREE),  # whole band 9 ... 11 kV above the test level (hand calculation)
        (8.999, DISCHARGE_FREE),
        (9.0, INCONCLUSIVE),  # the lower criterion is just met: the criteria disagree
        (10.0, INCONCLUSIVE),
        (10.999, INCONCLUSIVE),
        (11.0, DISCHARGES_EXPECTED),  # both criteria met at the test level
        (18.0, DISCHARGES_EXPECTED),
    ],
)
def test_hand_made_band_against_test_levels(test_kV, expected):
    band = band_from_criteria(11e3, 9e3)  # streamer 11 kV, integral 9 kV: band 9 ... 11 kV (hand-made)
    assert (band.low, band.high) == (9e3, 11e3)
    assert band.criteria == ("streamer", "ionisation integral")
    assert verdict(band, test_kV * 1e3) == expected


def test_band_order_does_not_matter():
    a, b = band_from_criteria(9e3, 11e3), band_from_criteria(11e3, 9e3)
    assert (a.low, a.high) == (b.low, b.high) == (9e3, 11e3)
    assert a.spread == pytest.approx(2.0 / 9.0, rel=1e-15)  # (11 - 9) / 9, hand calculation


def test_demo_band_is_the_two_criteria_of_compute_coefficients(demo):
    c = pdvoid.compute_coefficients(demo)
    band = inception_band(demo)
    u_s, u_i = c.inception_voltage_streamer, c.inception_voltage_integral
    assert math.isfinite(u_s) and math.isfinite(u_i) and u_s != u_i
    assert band.low == min(u_s, u_i) and band.high == max(u_s, u_i)
    assert band.streamer == u_s and band.integral == u_i
    assert band.regime == c.inception_regime and band.reason == c.inception_reason
    # a test level between the two criteria is inconclusive; 10 % outside either end is not
    assert verdict(band, 0.5 * (u_s + u_i)) == INCONCLUSIVE
    assert verdict(band, 0.9 * band.low) == DISCHARGE_FREE
    assert verdict(band, 1.1 * band.high) == DISCHARGES_EXPECTED
    text = band.describe()
    assert f"{band.low / 1e3:.4g}" in text and f"{band.high / 1e3:.4g}" in text


def test_one_criterion_when_the_integral_is_unavailable(demo):
    n2 = demo.replace(**{"void.gas": "nitrogen"})
    c = pdvoid.compute_coefficients(n2)
    assert math.isnan(c.inception_voltage_integral)  # no ionisation data for nitrogen in gases.toml
    band = inception_band(n2)
    assert band.single_criterion and band.criteria == ("streamer",)
    assert band.low == band.high == c.inception_voltage_streamer
    assert "streamer criterion only" in band.describe() and "not available" in band.describe()
    assert verdict(band, 0.9 * band.low) == DISCHARGE_FREE
    assert verdict(band, 1.1 * band.low) == DISCHARGES_EXPECTED


def test_no_criterion_is_inconclusive():
    band = band_from_criteria(math.nan, math.nan)
    assert band.criteria == () and verdict(band, 10e3) == INCONCLUSIVE


def test_no_self_sustained_discharge_is_discharge_free(demo):
    tiny = demo.replace(**{"void.diameter": 1e-6, "void.height": 1e-6})
    band = inception_band(tiny)
    assert band.regime == "no self-sustained discharge" and math.isinf(band.low)
    assert verdict(band, 100e3) == DISCHARGE_FREE
    assert band.describe().startswith("no self-sustained discharge: ")


def test_validity_warnings_become_notes(demo):
    big = demo.replace(**{"void.diameter": 3e-3, "void.height": 3e-3})  # half the 6 mm slab
    with warnings.catch_warnings():
        warnings.simplefilter("error")  # nothing escapes as a warning
        band = inception_band(big)
    assert band.notes and "not small against the slab" in band.notes[0]
    assert inception_band(demo).notes == ()


@pytest.mark.parametrize("bad", [0.0, -1e3, math.inf, math.nan])
def test_verdict_refuses_a_bad_test_voltage(bad):
    with pytest.raises(pdvoid.InputError, match="test_voltage"):
        verdict(band_from_criteria(9e3, 11e3), bad)
