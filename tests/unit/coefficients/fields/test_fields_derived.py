"""Coefficients for the fast models: structure, consistency, limits, bad input."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest

import pdvoid
from pdvoid import InputError
from pdvoid.coefficients.fields import (
    FieldSolution,
    FieldSolver,
    Spheroid,
    coefficients_for,
    coefficients_from_solver,
    equivalent_depolarization,
    grid_for,
    hyperboloid_tip_field,
    mason_tip_field,
    specimen_layout,
    void_region,
)
from pdvoid.core.units import EPSILON_0

D = 40e-3  # electrode gap far larger than the voids below [m]


@pytest.fixture(scope="module")
def sphere():
    return coefficients_for(D, 4.0, 2e-3, 2e-3, resolution=20, extrapolate=False)


def test_is_frozen_plain_floats(sphere):
    assert isinstance(sphere, FieldSolution)
    with pytest.raises(dataclasses.FrozenInstanceError):
        sphere.field_enhancement = 2.0  # type: ignore[misc]
    for name in ("field_enhancement", "charge_per_field", "void_volume", "depolarization", "capacitance"):
        assert type(getattr(sphere, name)) is float
    assert sphere.grid_shape[0] > 10 and sphere.unknowns > 100
    assert "pedersen1991" in sphere.references


def test_internal_consistency(sphere):
    # charge_per_field = |q/ΔE| and, for an ellipsoid, equals K εr ε0 Ω / d with K = 1/N (Pedersen; brief §2.3)
    c = sphere
    assert c.charge_per_field == pytest.approx(
        abs(c.induced_charge_per_polarization / c.counter_field_per_polarization), rel=1e-12
    )
    pedersen = c.host_permittivity * EPSILON_0 * c.void_volume / (c.depolarization * D)
    assert c.charge_per_field == pytest.approx(pedersen, rel=0.02)
    # reciprocity: q per P = Ω f / d (brief §2.3, magnitude)
    assert abs(c.induced_charge_per_polarization) == pytest.approx(c.void_volume * c.field_enhancement / D, rel=1e-9)
    # the equivalent three-capacitance network reproduces k = f l / d and q = C_b ΔV_c
    k = c.capacitance_series / (c.capacitance_series + c.capacitance_void)
    assert k == pytest.approx(c.field_enhancement * c.void_height / D, rel=1e-12)
    assert c.capacitance_parallel > 0


def test_measuring_electrode_sign_and_magnitude():
    lay = specimen_layout(D, 3.0, void=Spheroid(2e-3, 1e-3, 0.3 * D))
    s = FieldSolver(lay, grid_for(lay, resolution=16))
    hi = coefficients_from_solver(s, "high")
    lo = coefficients_from_solver(s, "ground")
    # two-terminal object: the external circuit delivers equal and opposite charges (Kirchhoff)
    assert hi.induced_charge_per_polarization == pytest.approx(-lo.induced_charge_per_polarization, rel=1e-9)
    assert hi.charge_per_field == pytest.approx(lo.charge_per_field, rel=1e-9)


def test_equivalent_depolarization_limits():
    # f = εr / (εr (1 − N) + N): sphere N = 1/3 gives 3εr/(2εr+1) (standard electrostatics, brief §2.1)
    assert equivalent_depolarization(3 * 4.0 / 9.0, 4.0) == pytest.approx(1.0 / 3.0)
    assert equivalent_depolarization(4.0, 4.0) == pytest.approx(1.0)  # flat disc: f = εr
    assert equivalent_depolarization(1.0, 4.0) == pytest.approx(0.0)  # needle: f = 1
    assert math.isnan(equivalent_depolarization(1.0, 1.0))


def test_more_layers_and_shapes_run():
    # layered slab with the void at the interface; a rounded cylinder; a void on the electrode
    c1 = coefficients_for(
        4e-3, [(2e-3, 2.3), (2e-3, 4.5)], 1e-3, 0.5e-3, void_center=2e-3, resolution=12, extrapolate=False
    )
    # Bracket by hand calculation. The oblate void (diameter 1 mm, height 0.5 mm, c/a = 0.5) has N = 0.527200
    # (physics brief §2.2, derived: the same axis ratio as its oblate check case). Without the void the slab
    # carries one displacement D through both 2 mm layers (continuity of the normal D), so the layer fields are
    # E1 = U/(d1 + d2 e1/e2) = 1.32353 U/d (e1 = 2.3) and E2 = E1 e1/e2 = 0.67647 U/d (e2 = 4.5). The same void
    # wholly inside one layer would see f_i E_i with f = e/(e (1 - N) + N) (physics brief §2.1):
    # 1.4245 x 1.32353 = 1.8854 in the 2.3 layer, 1.6951 x 0.67647 = 1.1467 in the 4.5 layer. A void on the
    # interface has host of both kinds around it and lies between the two (a physical bracket, not a theorem;
    # 3 % allowed for the coarse grid).
    n = 0.527200
    e1, e2 = 2.3, 4.5
    layer1 = 4e-3 / (2e-3 + 2e-3 * e1 / e2)  # E1 / (U/d)
    layer2 = layer1 * e1 / e2
    inside1 = e1 / (e1 * (1.0 - n) + n) * layer1
    inside2 = e2 / (e2 * (1.0 - n) + n) * layer2
    assert (inside2, inside1) == (pytest.approx(1.1467, abs=1e-4), pytest.approx(1.8854, abs=1e-4))
    assert 0.97 * inside2 < c1.field_enhancement < 1.03 * inside1
    c2 = coefficients_for(
        4e-3, 3.0, 2e-3, 0.4e-3, void_shape="cylinder", rim_radius=0.1e-3, resolution=12, extrapolate=False
    )
    assert c2.void_volume == pytest.approx(void_region(2e-3, 0.4e-3, 2e-3, "cylinder", 0.1e-3).volume(), rel=0.01)
    c3 = coefficients_for(4e-3, 3.0, 1e-3, 0.5e-3, void_center=0.25e-3, resolution=12, extrapolate=False)
    assert c3.void_height == pytest.approx(0.5e-3)
    # a flat cylinder has the larger enhancement (closer to the disc limit f = εr)
    assert c2.field_enhancement > c3.field_enhancement


def test_needle_and_inclusion_raise_void_field():
    base = coefficients_for(4e-3, 3.0, 0.5e-3, 0.5e-3, void_center=1.5e-3, resolution=10, extrapolate=False)
    needle = coefficients_for(
        4e-3,
        3.0,
        0.5e-3,
        0.5e-3,
        void_center=1.5e-3,
        needle_tip_radius=0.1e-3,
        needle_length=2.0e-3,
        resolution=10,
        extrapolate=False,
    )
    incl = coefficients_for(
        4e-3, 3.0, 0.5e-3, 0.5e-3, void_center=1.5e-3, inclusions=[(0.4e-3, 2.2e-3)], resolution=10, extrapolate=False
    )
    # a conductor between the void and the high-voltage plane concentrates the field on the void
    assert needle.field_enhancement > 1.2 * base.field_enhancement
    assert incl.field_enhancement > base.field_enhancement


def test_point_plane_formulas():
    # Mason's form 2U/(r ln(1+4d/r)) (kuffel2000, from memory) and the exact hyperboloid result agree for r << d
    assert mason_tip_field(1.0, 1.0, 1e4) == pytest.approx(hyperboloid_tip_field(1.0, 1.0, 1e4), rel=2e-3)
    assert hyperboloid_tip_field(1.0, 1.0, 10.0) / mason_tip_field(1.0, 1.0, 10.0) == pytest.approx(1.042, abs=1e-3)


@pytest.mark.parametrize(
    "kwargs",
    [
        {"thickness": 0.0},
        {"permittivity": 0.9},
        {"permittivity": float("nan")},
        {"void_diameter": -1e-3},
        {"void_height": float("inf")},
        {"void_shape": "cube"},
        {"void_center": 10e-3},
        {"rim_radius": 1e-3},
        {"needle_tip_radius": 1e-4},
        {"needle_tip_radius": 1e-4, "needle_length": 5e-3},
        {"inclusions": [(1e-3, 0.1e-3)]},
        {"measuring_electrode": "earth"},
        {"resolution": 0.0},
        {"extrapolate": "yes"},
        {"gas_permittivity": 0.5},
    ],
)
def test_bad_input(kwargs):
    args = {
        "thickness": 4e-3,
        "permittivity": 3.0,
        "void_diameter": 1e-3,
        "void_height": 1e-3,
        "resolution": 8,
        "extrapolate": False,
    }
    args.update(kwargs)
    with pytest.raises(InputError):
        coefficients_for(**args)


def test_bad_other_input():
    with pytest.raises(InputError):
        equivalent_depolarization(-1.0, 4.0)
    with pytest.raises(InputError):
        mason_tip_field(1.0, 0.0, 1.0)
    with pytest.raises(InputError):
        hyperboloid_tip_field(1.0, 1.0, -1.0)
    with pytest.raises(InputError):
        coefficients_from_solver("solver")  # type: ignore[arg-type]
    lay = specimen_layout(4e-3, 3.0)
    with pytest.raises(InputError):  # no void
        coefficients_from_solver(FieldSolver(lay, grid_for(lay, cells=(4, 4))))


def test_scenario_wrapper_matches_closed_form():
    # the closed-form spheroid coefficients of the scenario (pdvoid.coefficients.closed_form, DLMF 19.33 based) and the
    # field solver must agree for a small void far from the electrodes (brief §2.1-2.3; plate images < 0.1 %)
    from pdvoid.coefficients.fields import coefficients
    from pdvoid.inputs.parameters import Insulation, Sine, Void
    from pdvoid.inputs.scenario import Scenario

    sc = Scenario(Insulation(20e-3, 4.0), Void(1.5e-3, 0.75e-3), Sine(10e3))
    num = coefficients(sc)
    ref = pdvoid.compute_coefficients(sc)
    assert num.field_enhancement == pytest.approx(ref.field_enhancement, rel=0.005)
    assert num.charge_per_field == pytest.approx(ref.charge_per_field, rel=0.01)
    assert num.volume == pytest.approx(ref.volume, rel=0.005)
    with pytest.raises(InputError):
        coefficients(sc, thickness=1.0)
    with pytest.raises(InputError):
        coefficients(object())


def test_polygon_outline_void():
    # a 96-gon outline of a sphere revolved about the axis must behave like the sphere (Stratton 1941 f)
    from pdvoid.coefficients.fields import Outline

    t = np.linspace(-np.pi / 2, np.pi / 2, 97)
    outline = Outline(1e-3 * np.cos(t), D / 2 + 1e-3 * np.sin(t))
    lay = specimen_layout(D, 4.0, void=outline)
    c = coefficients_from_solver(FieldSolver(lay, grid_for(lay, resolution=20)))
    assert c.field_enhancement == pytest.approx(3 * 4.0 / 9.0, rel=0.01)
    assert c.void_volume == pytest.approx(outline.volume(), rel=0.01)
