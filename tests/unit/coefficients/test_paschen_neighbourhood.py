"""A ValidityWarning for voids near the Paschen minimum (within a factor 3 of its p·d), none elsewhere."""

from __future__ import annotations

import warnings

import pytest

import pdvoid
from pdvoid.coefficients.limits import PASCHEN_NEIGHBOURHOOD

PD_MIN = 0.7599  # p·d of the measured air minimum [Pa m] (0.570 Torr cm; hvc_paschen, confirmed)


def _notes(scenario):
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", pdvoid.ValidityWarning)
        c = pdvoid.compute_coefficients(scenario)
    return c, [str(w.message) for w in caught if "Paschen minimum" in str(w.message)]


@pytest.mark.parametrize(("size", "near"), [
    (10e-6, True),   # p·l = 1.01 Pa m: a factor 1.3 above the minimum
    (3e-6, True),    # 0.304 Pa m: a factor 2.5 below
    (30e-6, False),  # 3.04 Pa m: a factor 4 above
    (1.5e-3, False),  # the demo void, 152 Pa m
])
def test_warned_exactly_near_the_minimum(demo, size, near):
    assert PASCHEN_NEIGHBOURHOOD == 3.0
    c, notes = _notes(demo.replace(**{"void.diameter": size, "void.height": size}))
    assert bool(notes) == near
    if near:
        assert "327 V" in notes[0] and "uncertain" in notes[0]


def test_no_warning_where_no_discharge_is_possible(demo):
    # 1 µm at 1 atm: left of the Paschen asymptote; the reason says so, a warning would add nothing
    c, notes = _notes(demo.replace(**{"void.diameter": 1e-6, "void.height": 1e-6}))
    assert c.inception_regime == "no self-sustained discharge" and notes == []
    assert 101325.0 * 1e-6 < PD_MIN / PASCHEN_NEIGHBOURHOOD
