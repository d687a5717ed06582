"""Field maps: linear scaling, critical regions, lowest voltage, surface fields, masks."""

from __future__ import annotations

import numpy as np
import pytest

from pdvoid import InputError
from pdvoid.coefficients.fields import (
    FieldSolver,
    Layout,
    Rod,
    Spheroid,
    critical_region,
    field_magnitude,
    grid_for,
    lowest_voltage,
    region_mask,
    specimen_layout,
    surface_field,
)


@pytest.fixture(scope="module")
def void_solver():
    lay = specimen_layout(4e-3, 4.0, void=Spheroid(1e-3, 1e-3, 2e-3))
    return FieldSolver(lay, grid_for(lay, resolution=16))


def test_void_field_inside_is_nearly_uniform(void_solver):
    # a sphere in a uniform field has a uniform inner field (standard electrostatics, Stratton 1941, from memory)
    e = field_magnitude(void_solver.unit("high"))
    inner = region_mask(void_solver, "void")
    r, z = void_solver.grid.centres()
    core = inner & (np.hypot(r, z - 2e-3) < 0.35e-3)
    assert np.ptp(e[core]) / e[core].mean() < 0.02


def test_critical_region_and_lowest_voltage(void_solver):
    e1 = field_magnitude(void_solver.unit("high"))
    void = region_mask(void_solver, "void")
    ecrit = 3e6
    u = lowest_voltage(void_solver, ecrit, "void")
    # linearity (common practice): at u the peak void field equals ecrit
    assert u * e1[void].max() == pytest.approx(ecrit, rel=1e-12)
    below = critical_region(0.999 * u * void_solver.unit("high"), ecrit, "void")
    above = critical_region(1.05 * u * void_solver.unit("high"), ecrit, "void")
    assert not below.any() and above.any()
    assert set(zip(*np.nonzero(above), strict=True)) <= set(zip(*np.nonzero(void), strict=True))


def test_needle_tip_is_the_critical_spot():
    lay = Layout(10e-3, 20e-3, 1.0, conductors=((Rod(0.2e-3, 4e-3, upward=True), "high"),))
    s = FieldSolver(lay, grid_for(lay, resolution=8))
    sf = surface_field(s.unit("high"), "high")
    r, z = sf.where_maximum
    assert r < 0.05e-3 and z == pytest.approx(4e-3, abs=0.02e-3)  # the apex
    u = lowest_voltage(s, 3e6, "dielectric")
    assert u == pytest.approx(3e6 / sf.maximum, rel=1e-9)  # the surface value dominates the cell values
    assert u < 3e6 * 4e-3  # lower than the uniform-field estimate over the tip gap


def test_masks_and_bad_input(void_solver):
    shape = void_solver.grid.shape
    assert region_mask(void_solver, "all").all()
    solid = region_mask(void_solver, "solid")
    assert not (solid & region_mask(void_solver, "void")).any()
    with pytest.raises(InputError):
        region_mask(void_solver, "gas")
    with pytest.raises(InputError):
        region_mask(void_solver, np.ones((2, 2), dtype=bool))
    with pytest.raises(InputError):
        critical_region(void_solver.unit("high"), -1.0)
    with pytest.raises(InputError):
        lowest_voltage(void_solver, float("nan"))
    with pytest.raises(InputError):
        surface_field(void_solver.unit("high"), "high")  # no shaped electrode part
    with pytest.raises(InputError):
        surface_field(void_solver.unit("high"), 0)  # no floating conductor
    with pytest.raises(InputError):
        field_magnitude(np.zeros(shape))  # type: ignore[arg-type]
    lay = specimen_layout(4e-3, 4.0)
    with pytest.raises(InputError):
        region_mask(FieldSolver(lay, grid_for(lay, cells=(4, 4))), "void")
