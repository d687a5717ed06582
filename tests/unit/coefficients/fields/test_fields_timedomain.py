"""Time-domain conductive-void reference model against the reduced (induced-charge) model, lag-free."""

from __future__ import annotations

import math

import numpy as np
import pytest

from pdvoid import InputError
from pdvoid.coefficients.fields import FieldSolver, Spheroid, coefficients_from_solver, grid_for, specimen_layout
from pdvoid.coefficients.fields.timedomain import conductive_void_reference

E_INC, E_RES = 3e6, 0.5e6
GAP = 4e-3


def _run(diameter, height, resolution, cycles=1):
    lay = specimen_layout(GAP, 4.0, void=Spheroid(diameter, height, GAP / 2))
    s = FieldSolver(lay, grid_for(lay, resolution=resolution))
    c = coefficients_from_solver(s)
    amplitude = 2.5 * E_INC * GAP / c.field_enhancement  # peak in-void field without discharges: 2.5 E_inc
    r = conductive_void_reference(
        s, amplitude=amplitude, frequency=50.0, inception_field=E_INC, residual_field=E_RES, cycles=cycles
    )
    return r, c


@pytest.mark.parametrize("diameter, height", [(1e-3, 1e-3), (2e-3, 1e-3)])
def test_apparent_charge_matches_reduced_model(diameter, height):
    # Issue 7: time-domain reference vs reduced model within 5 % (lag-free, spherical and oblate void).
    # Reduced model: q = charge_per_field (E_inc − E_res) (Pedersen's induced charge, brief §2.3) on the same
    # grid. For an ellipsoid the conducting void deposits exactly the uniform-polarisation pattern in the
    # continuum; on the grid the difference falls linearly with the spacing (sphere: 2 % at resolution 64,
    # 5 % at 32, measured), hence resolution 48 for the sphere.
    r, c = _run(diameter, height, 48 if diameter == height else 24)
    q_reduced = c.charge_per_field * (E_INC - E_RES)
    assert len(r) == 7
    np.testing.assert_allclose(np.abs(r.charge), q_reduced, rtol=0.05)
    np.testing.assert_allclose(np.abs(r.field_after), E_RES, rtol=1e-9)


def test_phases_and_signs_follow_the_lag_free_formula():
    # Source: physics brief §1.4 (derived, exact for the lag-free model with instant drop to the residual):
    # sin φ_j = (E_i + (j − 1 − n1)(E_i − E_r)) / A, n1 = floor((A − E_r)/(E_i − E_r)), negative discharges at
    # φ_j + 180°; first quarter: n1 discharges. Here A = 2.5 E_inc, so n1 = 2.
    r, _ = _run(2e-3, 1e-3, 12, cycles=2)
    a = 2.5 * E_INC
    n1 = math.floor((a - E_RES) / (E_INC - E_RES))
    steady = np.degrees(np.arcsin([(E_INC + (j - 1 - n1) * (E_INC - E_RES)) / a for j in range(1, 2 * n1 + 1)]))
    pos = np.sort(np.mod(steady, 360.0))
    neg = np.sort(np.mod(steady + 180.0, 360.0))
    second = r.phase_deg[r.cycle == 1]
    second_pos = np.sort(second[r.charge[r.cycle == 1] > 0])
    second_neg = np.sort(second[r.charge[r.cycle == 1] < 0])
    np.testing.assert_allclose(second_pos, pos, atol=1e-6)
    np.testing.assert_allclose(second_neg, neg, atol=1e-6)
    # brief §2.3 sign: a discharge with the void field in the applied direction of a positive HV electrode
    # gives a positive apparent charge on the HV electrode
    first = r.charge[0]
    assert r.voltage[0] > 0 and first > 0
    # first cycle: n1 in the first quarter, 2 n1 negative ones, then the positive ones before 360° (formula)
    assert np.count_nonzero(r.cycle == 0) == n1 + 2 * n1 + np.count_nonzero(pos > 270.0)


def test_no_discharge_below_inception():
    lay = specimen_layout(GAP, 4.0, void=Spheroid(1e-3, 1e-3, GAP / 2))
    s = FieldSolver(lay, grid_for(lay, resolution=8))
    c = coefficients_from_solver(s)
    amplitude = 0.99 * E_INC * GAP / c.field_enhancement
    r = conductive_void_reference(
        s, amplitude=amplitude, frequency=50.0, inception_field=E_INC, residual_field=E_RES, cycles=2
    )
    assert len(r) == 0 and r.steps == 0


def test_bad_input():
    lay = specimen_layout(GAP, 4.0, void=Spheroid(1e-3, 1e-3, GAP / 2))
    s = FieldSolver(lay, grid_for(lay, resolution=6))
    ok = {"amplitude": 1e4, "frequency": 50.0, "inception_field": E_INC, "residual_field": E_RES}
    for change in (
        {"amplitude": -1.0},
        {"frequency": 0.0},
        {"inception_field": float("nan")},
        {"residual_field": E_INC},
        {"residual_field": -1.0},
        {"cycles": 0},
        {"gas_conductivity": 0.0},
        {"measuring_electrode": "top"},
    ):
        with pytest.raises(InputError):
            conductive_void_reference(s, **{**ok, **change})
    with pytest.raises(InputError):
        conductive_void_reference("solver", **ok)  # type: ignore[arg-type]
    no_void = specimen_layout(GAP, 4.0)
    with pytest.raises(InputError):
        conductive_void_reference(FieldSolver(no_void, grid_for(no_void, cells=(4, 4))), **ok)
