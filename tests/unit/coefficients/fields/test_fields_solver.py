"""Finite-volume solver: exact 1-D limits, reciprocity, charge balance, floating conductors, reuse."""

from __future__ import annotations

import math

import numpy as np
import pytest

from pdvoid import InputError
from pdvoid.coefficients.fields import (
    FieldSolver,
    Grid,
    Layout,
    Slab,
    Spheroid,
    field_components,
    make_grid,
    specimen_layout,
)
from pdvoid.core.units import EPSILON_0


def _slab_solver(eps=3.0, layers=(), cells=(6, 17), faces_z=None):
    lay = Layout(2e-3, 5e-3, eps, dielectrics=layers)
    if faces_z is None:
        grid = make_grid(5e-3, 2e-3, cells=cells)
    else:
        grid = Grid(np.linspace(0, 5e-3, cells[0] + 1), np.asarray(faces_z))
    return FieldSolver(lay, grid)


def test_plane_capacitor_is_exact():
    # parallel-plate capacitance eps0 eps_r A / d (textbook); the 1-D problem is exact in finite volumes
    s = _slab_solver()
    c = s.capacitance()
    assert c == pytest.approx(EPSILON_0 * 3.0 * math.pi * 25e-6 / 2e-3, rel=1e-12)
    u = s.unit("high")
    np.testing.assert_allclose(u.cells, np.broadcast_to(s.grid.z / 2e-3, s.grid.shape), rtol=1e-12)
    er, ez = field_components(u)
    np.testing.assert_allclose(ez, -1.0 / 2e-3, rtol=1e-10)
    np.testing.assert_allclose(er, 0.0, atol=1e-9)


@pytest.mark.parametrize("aligned", [True, False])
def test_layered_capacitor_series_formula(aligned):
    # two layers in series: 1/C = d1/(eps0 e1 A) + d2/(eps0 e2 A) (textbook). The harmonic face average makes
    # this exact whether or not the interface lies on a face.
    zi = 0.8e-3 if aligned else 0.83e-3
    lay_layers = ((Slab(zi, 2e-3), 7.0),)
    faces = np.linspace(0.0, 2e-3, 11)
    s = _slab_solver(eps=2.0, layers=lay_layers, faces_z=faces)
    area = math.pi * 25e-6
    expected = 1.0 / (zi / (EPSILON_0 * 2.0 * area) + (2e-3 - zi) / (EPSILON_0 * 7.0 * area))
    assert s.capacitance() == pytest.approx(expected, rel=1e-12)


def test_specimen_layout_layers():
    lay = specimen_layout(2e-3, [(0.5e-3, 2.0), (1.5e-3, 5.0)])
    assert lay.permittivity == 2.0
    assert lay.layer_interfaces() == [0.5e-3]
    with pytest.raises(InputError):
        specimen_layout(2e-3, [(0.5e-3, 2.0), (1.0e-3, 5.0)])  # thicknesses do not add up
    with pytest.raises(InputError):
        specimen_layout(2e-3, [(0.5e-3, 0.5), (1.5e-3, 5.0)])  # permittivity below 1


@pytest.fixture(scope="module")
def void_solver():
    lay = Layout(4.0, 4.0, 4.0, void=Spheroid(1.2, 0.8, 1.7), floating=((Spheroid(0.6, 0.6, 3.0), 0.0),))
    grid = make_grid(4.0, 4.0, fine=0.05, focus_r=[(0, 0.6)], focus_z=[(1.3, 3.3)])
    return FieldSolver(lay, grid)


def test_reciprocity_induced_charge(void_solver):
    # Green's reciprocity (Pedersen's lambda function): the charge on an earthed electrode due to free charge
    # equals -sum(Q lambda). Exact for the symmetric discrete system, so round-off tolerance.
    rng = np.random.default_rng(7)
    q = rng.normal(size=void_solver.assembly.n_unknowns) * 1e-12
    q[void_solver.assembly.n_free :] = 0.0
    direct = void_solver.solve({}, charge=q, floating_charges=[0.0])
    for e in ("high", "ground"):
        assert direct.electrode_charge(e) == pytest.approx(void_solver.induced_charge(q, e), rel=1e-9)


def test_charge_balance(void_solver):
    # Gauss: all flux ends on electrodes (Neumann elsewhere), so electrode charges + free charge = 0
    rng = np.random.default_rng(3)
    q = rng.normal(size=void_solver.assembly.n_unknowns) * 1e-12
    q[void_solver.assembly.n_free :] = 0.0
    p = void_solver.solve({"high": 5.0}, charge=q, floating_charges=[0.0])
    total = p.electrode_charge("high") + p.electrode_charge("ground") + q.sum()
    assert abs(total) < 1e-9 * np.abs(q).sum()


def test_floating_conductor_charge_and_symmetry():
    # an uncharged sphere centred between the plates floats at half the voltage (symmetry)
    lay = Layout(4.0, 4.0, 2.0, floating=((Spheroid(1.0, 1.0, 2.0), 0.0),))
    grid = make_grid(4.0, 4.0, fine=0.05, focus_r=[(0, 0.5)], focus_z=[(1.5, 2.5)])
    s = FieldSolver(lay, grid)
    u = s.unit("high")
    assert u.floating_potentials[0] == pytest.approx(0.5, abs=1e-6)
    # a charged inclusion raises its potential; linearity in the charge
    p1 = s.solve({"high": 1.0}, floating_charges=[1e-12])
    p2 = s.solve({"high": 1.0}, floating_charges=[2e-12])
    assert p2.floating_potentials[0] - u.floating_potentials[0] == pytest.approx(
        2 * (p1.floating_potentials[0] - u.floating_potentials[0]), rel=1e-9
    )
    assert p1.floating_potentials[0] > u.floating_potentials[0]


def test_superposition_and_reuse(void_solver):
    a = void_solver.solve({"high": 2.0}, floating_charges=[0.0])
    b = void_solver.solve({"ground": 1.0}, floating_charges=[0.0])
    c = void_solver.solve({"high": 2.0, "ground": 1.0}, floating_charges=[0.0])
    np.testing.assert_allclose((a + b).unknowns, c.unknowns, rtol=1e-10, atol=1e-12)
    np.testing.assert_allclose((2.0 * void_solver.unit("high")).unknowns, a.unknowns, rtol=1e-10, atol=1e-12)


def test_void_mean_field_uniform_slab():
    # a void filling a whole layer: mean field in it is the layer field of the series capacitor (textbook)
    lay = Layout(3.0, 2.0, 4.0, void=Slab(1.0, 2.0))
    s = FieldSolver(lay, make_grid(2.0, 3.0, cells=(3, 30)))
    e_void = s.unit("high").void_mean_field()
    # D continuous: eps_g E_g = eps E_s ; E_g h_g + 2 E_s = 1 V
    e_g = 1.0 / (1.0 + 2.0 / 4.0)
    assert e_void == pytest.approx(-e_g, rel=1e-10)
    assert s.assembly.void_volume == pytest.approx(math.pi * 4.0 * 1.0, rel=1e-12)


def test_bad_solver_input(void_solver):
    with pytest.raises(InputError):
        void_solver.solve({"top": 1.0})
    with pytest.raises(InputError):
        void_solver.solve({"high": float("nan")})
    with pytest.raises(InputError):
        void_solver.solve({}, charge=np.zeros(3))
    with pytest.raises(InputError):
        void_solver.solve({}, floating_charges=[0.0, 1.0])
    with pytest.raises(InputError):
        void_solver.unit("earth")
    with pytest.raises(InputError):
        FieldSolver(Layout(1.0, 1.0, 2.0), make_grid(2.0, 1.0, cells=(3, 3)))  # extent mismatch
    with pytest.raises(InputError):  # conductor smaller than a cell: not resolved
        lay = Layout(1.0, 1.0, 2.0, floating=((Spheroid(0.01, 0.01, 0.5), 0.0),))
        FieldSolver(lay, make_grid(1.0, 1.0, cells=(4, 4)))


@pytest.mark.parametrize(
    "kwargs",
    [
        {"thickness": -1.0},
        {"outer_radius": 0.0},
        {"permittivity": 0.5},
        {"gas_permittivity": float("inf")},
        {"void": "sphere"},
        {"void": Spheroid(1.0, 1.0, 5.0)},
        {"conductors": ((Spheroid(0.2, 0.2, 0.5), "top"),)},
        {"floating": ((Spheroid(0.2, 0.2, 0.5), float("nan")),)},
        {"dielectrics": ((Slab(0.1, 0.2), 0.0),)},
        {"void": Spheroid(4.0, 0.2, 0.5)},
    ],
)
def test_bad_layout(kwargs):
    base = {"thickness": 1.0, "outer_radius": 1.0, "permittivity": 2.0}
    base.update(kwargs)
    with pytest.raises(InputError):
        Layout(**base)
