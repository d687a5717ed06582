"""Detrapping emission, Schottky lowering and the streamer stability field (pdvoid.physics.surface_emission)."""

from __future__ import annotations

import math

import numpy as np
import pytest

import pdvoid
from pdvoid.physics.surface_emission import (
    detrapping_rate,
    schottky_coefficient,
    schottky_lowering,
    streamer_stability_field,
)

E = 1.602176634e-19  # CODATA 2018, exact
EPS0 = 8.8541878128e-12  # CODATA 2018
KB = 1.380649e-23  # CODATA 2018, exact


def test_schottky_lowering_at_one_and_ten_megavolt_per_metre():
    # sqrt(e·E/(4π ε0)) in volts: 0.03795 V at 1 MV/m, 0.1200 V at 10 MV/m (derived from the formula with CODATA
    # constants; the image-force lowering of Schottky 1914, from memory)
    assert schottky_lowering(1e6) / E == pytest.approx(0.037947, rel=1e-4)
    assert schottky_lowering(1e7) / E == pytest.approx(0.120000, rel=1e-3)
    np.testing.assert_allclose(schottky_lowering(np.array([0.0, 4e6])), [0.0, 2 * schottky_lowering(1e6)])


def test_schottky_coefficient_is_the_lowering_over_kt_per_root_field():
    t = 300.0
    assert schottky_coefficient(t) * math.sqrt(2.5e6) == pytest.approx(schottky_lowering(2.5e6) / (KB * t),
                                                                       rel=1e-12)


def test_detrapping_rate_example_of_the_docstring():
    # 100 pC, Φ = 1 eV, ν0 = 1e14 1/s, 293.15 K, 5 MV/m: (q/e)·ν0·exp(−(Φ − ΔΦ)/kT) (physics brief §3.3 structure,
    # from memory; numbers derived here)
    expected = 100e-12 / E * 1e14 * math.exp(-(E - math.sqrt(E**3 * 5e6 / (4 * math.pi * EPS0))) / (KB * 293.15))
    got = detrapping_rate(100e-12, 5e6, trap_depth=E, attempt_frequency=1e14)
    assert got == pytest.approx(expected, rel=1e-8)  # CODATA 2018 here, scipy's constants in pdvoid
    assert got == pytest.approx(1.154e7, rel=1e-3)
    # linear in the charge, sign ignored
    assert detrapping_rate(-200e-12, 5e6, trap_depth=E, attempt_frequency=1e14) == pytest.approx(2 * got)


def test_detrapping_refuses_a_field_that_removes_the_barrier():
    with pytest.raises(pdvoid.InputError, match="trap_depth"):
        detrapping_rate(1e-12, 1e12, trap_depth=0.1 * E, attempt_frequency=1e14)
    with pytest.raises(pdvoid.InputError, match="attempt_frequency"):
        detrapping_rate(1e-12, 1e6, trap_depth=E, attempt_frequency=0.0)


def test_stability_field_of_air_scales_with_density():
    # 0.5 kV/(mm·bar) = 5 V/(Pa m) for positive streamers in air (physics brief §3.2, from memory)
    assert streamer_stability_field(1e5) == pytest.approx(5e5)
    assert streamer_stability_field(1e5, 2 * 293.15) == pytest.approx(2.5e5)
    np.testing.assert_allclose(streamer_stability_field(np.array([1e5, 2e5])), [5e5, 1e6])
    with pytest.raises(pdvoid.InputError, match="pressure"):
        streamer_stability_field(-1.0)
