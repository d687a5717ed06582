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
    # the streamer formula E = (E/p)_cr p (1 + B/sqrt(p l)) is linear in (E/p)_cr (physics brief 3.1), so the
    # quoted spread 24.2 ... 25.2 V/(Pa m) of air (both from memory) moves the streamer voltage by 25.2/24.2
    u_s_high = u_s * 25.2 / 24.2
    assert band.streamer_range == pytest.approx((u_s, u_s_high), rel=1e-12)
    assert band.critical_field_range == (24.2, 25.2)
    assert band.low == min(u_s, u_i) and band.high == pytest.approx(max(u_s_high, u_i), rel=1e-12)
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


def test_band_spans_the_quoted_spread_of_the_streamer_constant():
    # hand-made numbers: criteria 10 and 10.5 kV, the streamer constant's spread moves it to 10 ... 10.4 kV
    band = band_from_criteria(10e3, 10.5e3, streamer_range=(10e3, 10.4e3), critical_field_range=(24.2, 25.2))
    assert (band.low, band.high) == (10e3, 10.5e3)
    band = band_from_criteria(10e3, 9e3, streamer_range=(10e3, 10.4e3), critical_field_range=(24.2, 25.2))
    assert (band.low, band.high) == (9e3, 10.4e3)
    assert verdict(band, 10.2e3) == INCONCLUSIVE  # above both criteria's nominal values, inside the spread
    assert "24.2 to 25.2 V/(Pa m), from memory" in band.describe()
    # no spread quoted: the band of the two criteria alone
    assert "(E/p)_cr" not in band_from_criteria(10e3, 9e3).describe()
    # a spread without its criterion does not enter the band
    only_integral = band_from_criteria(math.nan, 9e3, streamer_range=(10e3, 10.4e3))
    assert (only_integral.low, only_integral.high) == (9e3, 9e3)
