"""The combined inception criterion against the empirical uniform-field breakdown curve of air.

See reference/lux_paschen/source.toml ([tolerance.combined]). Uniform field, 1 atm, 293.15 K; the gap is the
length along the field.
"""

from __future__ import annotations

import numpy as np
import pytest

from pdvoid.physics.inception import empirical_air_breakdown_voltage, inception_criterion

ATM = 101325.0


@pytest.mark.parametrize("criterion, high", [("streamer", 1.07), ("ionization_integral", 1.10)])
def test_uniform_field_air_25_um_to_10_mm(criterion, high):
    # Source: lux_paschen empirical formula (confirmed). Tolerance -5 % / +7 % with the streamer formula (source.toml:
    # measured +0.2 ... +6.0 %), -5 % / +10 % with the ionisation integral (Morrow-Lowke, K = 9.15), which meets the
    # Townsend branch only at 0.35 mm, where Paschen's A, B of bazelyan1998 lie 9 % above this curve (derived).
    for gap in np.geomspace(25e-6, 10e-3, 25):
        r = inception_criterion("air", ATM, gap, criterion=criterion)
        ratio = r.voltage / empirical_air_breakdown_voltage(gap)
        assert 0.95 <= ratio <= high, (gap, ratio)


def test_below_25_um_the_empirical_curve_is_a_lower_bound():
    # Source: lux_paschen formula (no minimum) and hvc_paschen (327 V minimum): from 10 um to 25 um the combined
    # criterion lies above the empirical curve and at most by the floor ratio 327 V / 216.5 V = 1.51 (derived).
    for gap in np.geomspace(10e-6, 25e-6, 12):
        ratio = inception_criterion("air", ATM, gap).voltage / empirical_air_breakdown_voltage(gap)
        assert 1.0 <= ratio <= 1.52, (gap, ratio)


def test_one_millimetre_and_one_centimetre_stay_streamer():
    # Source: lux_paschen: 4.345 kV at 1 mm, 30.30 kV at 1 cm (derived); the streamer formula decides there
    # (4.547 kV and 31.15 kV, physics brief section 3.1, from memory constants), within the +7 % band.
    for gap, u in ((1e-3, 4345.0), (1e-2, 30300.0)):
        r = inception_criterion("air", ATM, gap)
        assert r.regime == "streamer"
        assert r.voltage / u == pytest.approx(1.0, abs=0.07)
