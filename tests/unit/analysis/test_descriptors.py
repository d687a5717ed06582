"""Descriptor edge cases, the fingerprint's order and NaN rules, and bad input (definitions: physics brief
section 10; numeric checks against scipy are in tests/reference/test_gulski_1992.py)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from pdvoid import InputError
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


def test_fingerprint_order_is_fixed():
    # documented order: per distribution the skewness, kurtosis, peaks of "+" then "-", then Q, Phi, cc, mcc
    assert FINGERPRINT_NAMES[:6] == (
        "skewness H_n+", "skewness H_n-", "kurtosis H_n+", "kurtosis H_n-", "peaks H_n+", "peaks H_n-",
    )
    assert FINGERPRINT_NAMES[6] == "skewness H_qn+"
    assert FINGERPRINT_NAMES[12] == "skewness H_qmax+"
    assert FINGERPRINT_NAMES[-4:] == (
        "discharge asymmetry", "phase asymmetry", "cross-correlation", "modified cross-correlation",
    )
    assert len(set(FINGERPRINT_NAMES)) == 22


def test_mirror_symmetric_pattern(make_events):
    # definitions: a pattern whose "-" half mirrors the "+" half gives Q = Phi = cc = mcc = 1 and equal
    # descriptors of both halves
    rng = np.random.default_rng(3)
    phase = rng.uniform(5.0, 120.0, 300)
    mag = rng.lognormal(-27.0, 0.4, 300)
    ev = make_events(np.concatenate([phase, phase + 180.0]), np.concatenate([mag, -mag]), cycles=20.0)
    fp = fingerprint(ev)
    for key in ("discharge asymmetry", "phase asymmetry", "cross-correlation", "modified cross-correlation"):
        assert fp[key] == pytest.approx(1.0, rel=1e-12)
    for name in FINGERPRINT_NAMES[:18:2]:
        minus = name[:-1] + "-"
        assert fp[name] == pytest.approx(fp[minus], rel=1e-12, abs=1e-12)


def test_fingerprint_nan_when_a_half_is_empty(make_events):
    # undefined descriptors are NaN (documented), never guessed
    ev = make_events([10.0, 30.0, 50.0, 52.0], [1e-12, 2e-12, 1e-12, 3e-12])
    fp = fingerprint(ev, phase_windows=9)
    for key in ("skewness H_n-", "kurtosis H_qn-", "discharge asymmetry", "phase asymmetry",
                "cross-correlation", "modified cross-correlation"):
        assert math.isnan(fp[key]), key
    assert fp["peaks H_n-"] == 0.0
    assert math.isfinite(fp["skewness H_n+"])


def test_fingerprint_of_no_events_is_all_nan_or_zero():
    from pdvoid.simulation.events import Events

    fp = fingerprint(Events(phase_deg=[], charge=[], frequency=50.0, cycles=5.0))
    assert all(math.isnan(v) or v == 0.0 for v in fp.values())
    assert all(v == 0.0 for k, v in fp.items() if k.startswith("peaks"))


def test_moment_nan_cases():
    # definition: undefined for sum y = 0 or sigma = 0
    x = [5.0, 15.0, 25.0]
    assert math.isnan(skewness(x, [0.0, 0.0, 0.0]))
    assert math.isnan(kurtosis(x, [0.0, 4.0, 0.0]))


def test_phase_asymmetry_nan_at_zero_inception(make_events):
    # Phi = phi_in-/phi_in+ is undefined when phi_in+ = 0
    assert math.isnan(phase_asymmetry(make_events([0.0, 200.0], [1e-12, -1e-12])))


def test_zero_charge_events_are_not_pulses(make_events):
    # documented: zero-charge events are left out of Q and Phi
    ev = make_events([5.0, 20.0, 190.0, 220.0], [0.0, 1e-12, 0.0, -2e-12])
    assert discharge_asymmetry(ev) == pytest.approx(2.0)
    assert phase_asymmetry(ev) == pytest.approx(2.0)


def test_number_of_peaks_small_cases():
    # hand-counted
    assert number_of_peaks([1.0]) == 0
    assert number_of_peaks([0.0, 1.0, 0.0]) == 1
    assert number_of_peaks([0.0, 1.0, 1.0, 2.0, 0.0]) == 1


@pytest.mark.parametrize(
    "call",
    [
        lambda: skewness([1.0, 2.0], [1.0]),
        lambda: skewness([1.0, math.nan], [1.0, 1.0]),
        lambda: kurtosis([1.0, 2.0], [1.0, -1.0]),
        lambda: kurtosis([], []),
        lambda: skewness("abc", [1.0, 2.0, 3.0]),
        lambda: number_of_peaks([[1.0, 2.0]]),
        lambda: number_of_peaks([1.0, math.inf]),
        lambda: cross_correlation([1.0, 2.0], [1.0, 2.0, 3.0]),
        lambda: cross_correlation([1.0], [1.0]),
        lambda: discharge_asymmetry([1.0, 2.0]),
        lambda: phase_asymmetry(None),
        lambda: modified_cross_correlation("x"),
        lambda: fingerprint(3.0),
    ],
)
def test_bad_input(call):
    with pytest.raises(InputError):
        call()


def test_fingerprint_bad_windows(make_events):
    ev = make_events([10.0, 200.0], [1e-12, -1e-12])
    for bad in (1, 0, 2.0, "18"):
        with pytest.raises(InputError):
            fingerprint(ev, phase_windows=bad)
