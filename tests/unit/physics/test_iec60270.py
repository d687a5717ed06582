"""Unit tests of pdvoid.physics.iec60270 on a hand-computed event set (IEC 60270 clause 3 formulas, wording
from memory; physics brief §9)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from pdvoid import InputError
from pdvoid.physics.iec60270 import (
    average_discharge_current,
    discharge_power,
    phase_angle_deg,
    quadratic_rate,
    repetition_rate,
)

# Hand event set: four pulses in one 50 Hz cycle, T_ref = 0.02 s.
#   q = +100 pC, −50 pC, +20 pC, −200 pC;  u = +5 kV, −3 kV, +1 kV, −8 kV
Q = np.array([100e-12, -50e-12, 20e-12, -200e-12])
U = np.array([5e3, -3e3, 1e3, -8e3])
T_REF = 0.02


def test_average_discharge_current_hand():
    # Source: IEC 60270 cl. 3 (brief §9): I = Σ|q|/T_ref = (100 + 50 + 20 + 200) pC / 0.02 s
    #   = 370e-12/0.02 = 1.85e-8 A.
    assert average_discharge_current(Q, T_REF) == pytest.approx(1.85e-8, rel=1e-14)


def test_quadratic_rate_hand():
    # Source: IEC 60270 cl. 3 (brief §9): D = Σq²/T_ref = (1e-20 + 2.5e-21 + 4e-22 + 4e-20)/0.02
    #   = 5.29e-20/0.02 = 2.645e-18 C²/s.
    assert quadratic_rate(Q, T_REF) == pytest.approx(2.645e-18, rel=1e-14)


def test_discharge_power_hand():
    # Source: IEC 60270 cl. 3 (brief §9): P = Σ q u/T_ref with signed products
    #   = (1e-10·5e3 + (−5e-11)(−3e3) + 2e-11·1e3 + (−2e-10)(−8e3))/0.02
    #   = (5e-7 + 1.5e-7 + 2e-8 + 1.6e-6)/0.02 = 2.27e-6/0.02 = 1.135e-4 W.
    assert discharge_power(Q, U, T_REF) == pytest.approx(1.135e-4, rel=1e-14)


def test_discharge_power_signed_products():
    # Source: IEC 60270 cl. 3: products are signed, so a pulse against the voltage polarity subtracts.
    #   (+30 pC)(−2 kV)/0.02 s = −6e-8/0.02 = −3e-6 W.
    assert discharge_power([30e-12], [-2e3], T_REF) == pytest.approx(-3e-6, rel=1e-14)


def test_repetition_rate_hand():
    # Source: IEC 60270 cl. 3 (brief §9): n = count/T_ref. All 4 pulses: 4/0.02 = 200 /s. Threshold 50 pC
    # (inclusive): |q| = 100, 50, 200 pC count → 3/0.02 = 150 /s. Threshold 150 pC: only 200 pC → 50 /s.
    assert repetition_rate(Q, T_REF) == pytest.approx(200.0, rel=1e-15)
    assert repetition_rate(Q, T_REF, threshold=50e-12) == pytest.approx(150.0, rel=1e-15)
    assert repetition_rate(Q, T_REF, threshold=150e-12) == pytest.approx(50.0, rel=1e-15)


def test_empty_event_set_gives_zero():
    # Source: IEC 60270 cl. 3 sums over no pulses are 0.
    empty = np.array([])
    assert average_discharge_current(empty, 1.0) == 0.0
    assert quadratic_rate(empty, 1.0) == 0.0
    assert discharge_power(empty, empty, 1.0) == 0.0
    assert repetition_rate(empty, 1.0) == 0.0


def test_phase_angle_hand():
    # Source: IEC 60270 cl. 3 (brief §9): φ = 360°·frac((t − t0) f). f = 50 Hz, t0 = 1 ms:
    #   t = 1 ms → 0°, 6 ms → 0.25 → 90°, 11 ms → 0.5 → 180°, 20.5 ms → 0.975 → 351°,
    #   0.5 ms → −0.025 → frac 0.975 → 351°, 41 ms → 2.0 → 0°.
    t = np.array([1e-3, 6e-3, 11e-3, 20.5e-3, 0.5e-3, 41e-3])
    np.testing.assert_allclose(
        phase_angle_deg(t, 50.0, 1e-3), [0.0, 90.0, 180.0, 351.0, 351.0, 0.0], atol=1e-9
    )
    assert phase_angle_deg(6e-3, 50.0, 1e-3) == pytest.approx(90.0, abs=1e-9)
    assert type(phase_angle_deg(6e-3, 50.0)) is float


@given(st.floats(min_value=-1e3, max_value=1e3), st.floats(min_value=1e-3, max_value=1e6))
def test_phase_angle_range(t, f):
    # Source: IEC 60270 cl. 3: the phase angle lies in [0°, 360°).
    p = phase_angle_deg(t, f)
    assert 0.0 <= p < 360.0


def test_phase_angle_just_before_zero_crossing():
    # A time a hair before t0: frac rounds to 1.0 in floating point; the phase must still be < 360.
    assert 0.0 <= phase_angle_deg(-1e-20, 50.0) < 360.0


@pytest.mark.parametrize("bad_t", [0.0, -1.0, math.nan, math.inf])
def test_reference_time_validation(bad_t):
    for call in (
        lambda: average_discharge_current(Q, bad_t),
        lambda: quadratic_rate(Q, bad_t),
        lambda: discharge_power(Q, U, bad_t),
        lambda: repetition_rate(Q, bad_t),
    ):
        with pytest.raises(InputError, match="reference_time"):
            call()


def test_event_array_validation():
    with pytest.raises(InputError, match="charge must be finite"):
        average_discharge_current([1e-12, math.nan], 1.0)
    with pytest.raises(InputError, match="same length"):
        discharge_power(Q, U[:3], T_REF)
    with pytest.raises(InputError, match="voltage"):
        discharge_power(Q, [1.0, 2.0, math.inf, 4.0], T_REF)
    with pytest.raises(InputError, match="1-dimensional"):
        quadratic_rate(np.ones((2, 2)), 1.0)
    with pytest.raises(InputError, match="threshold"):
        repetition_rate(Q, T_REF, threshold=-1e-12)
    with pytest.raises(InputError, match="frequency"):
        phase_angle_deg(0.0, 0.0)
    with pytest.raises(InputError, match="time"):
        phase_angle_deg([0.0, math.nan], 50.0)
    with pytest.raises(InputError, match="real"):
        average_discharge_current(["a"], 1.0)
