"""Background ionisation near the ground (Hess, Compendium of Meteorology 1951) as a start-electron supply.

See reference/hess_1951/source.toml.
"""

from __future__ import annotations

import math

import pytest

from pdvoid.physics.electrons import (
    REFERENCE_IONIZATION_RATE,
    statistical_time_lag_mean,
    volume_electron_rate,
)

SPHERE_1MM = math.pi / 6.0 * (1e-3) ** 3  # volume of a 1 mm diameter sphere [m³]


def test_table_ii_rate_in_si():
    # Source: hess1951 Table II (confirmed): about 10 ion pairs per cm³ per s; 1 cm³ = 1e-6 m³, so
    # 1e7 per m³ per s.
    assert REFERENCE_IONIZATION_RATE == pytest.approx(10.0 / 1e-6, rel=1e-15)


def test_one_millimetre_void_rate():
    # Source: physics brief §8 (derived from hess1951): a 1 mm diameter void receives 5.236e-3 /s at q = 10.
    n = volume_electron_rate(SPHERE_1MM, 101325.0, 293.15)
    assert n == pytest.approx(5.236e-3, rel=1e-4)
    # mean statistical time lag about 190 s (physics brief §3.3: "a mean wait of 190-1000 s")
    assert statistical_time_lag_mean(n) == pytest.approx(190.99, rel=1e-4)


def test_cosmic_ray_share():
    # Source: Hess & Vancour (1950, confirmed): cosmic rays alone 1.88 ion pairs per cm³ per s at sea level;
    # physics brief §8 (derived): 9.844e-4 /s in a 1 mm void.
    n = volume_electron_rate(SPHERE_1MM, 101325.0, ionization_rate=1.88e6)
    assert n == pytest.approx(9.844e-4, rel=1e-4)


def test_rate_scales_with_gas_density():
    # Source: common practice: ionisation per volume by penetrating radiation is proportional to gas density,
    # so half the pressure, or twice the absolute temperature, halves the rate.
    n0 = volume_electron_rate(SPHERE_1MM, 101325.0)
    assert volume_electron_rate(SPHERE_1MM, 101325.0 / 2) == pytest.approx(n0 / 2, rel=1e-12)
    assert volume_electron_rate(SPHERE_1MM, 101325.0, 2 * 293.15) == pytest.approx(n0 / 2, rel=1e-12)
