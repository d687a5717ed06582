"""Field lines and the ionisation-integral (streamer) criterion along them."""

from __future__ import annotations

import numpy as np
import pytest

from pdvoid import InputError
from pdvoid.coefficients.fields import (
    FieldSolver,
    Layout,
    Rod,
    Spheroid,
    coefficients_from_solver,
    grid_for,
    make_grid,
    specimen_layout,
)
from pdvoid.coefficients.fields.streamer import streamer_inception_voltage, trace_field_line
from pdvoid.physics.ionization import ionization_integral_inception_field


def test_uniform_gap_equals_uniform_field_criterion():
    # Source: the uniform-field streamer criterion α_eff(U/d)·d = K (brief §7, Morrow–Lowke α_eff) as computed
    # by pdvoid.physics.inception; in a plane gap the field line is the whole gap, so the two must agree to
    # root-finding precision.
    lay = Layout(1e-3, 2e-3, 1.0)
    s = FieldSolver(lay, make_grid(2e-3, 1e-3, cells=(4, 20)))
    res = streamer_inception_voltage(s, start=(0.0, 0.5e-3))
    assert res.voltage == pytest.approx(ionization_integral_inception_field(1e-3) * 1e-3, rel=1e-6)
    assert res.avalanche_length == pytest.approx(1e-3, rel=1e-9)


def test_spherical_void_chord():
    # Source: uniform inner field f E0 of a sphere (Stratton 1941, from memory) over the axial chord 2a:
    # U = E_ii(2a) d / f with E_ii from pdvoid.physics.inception. Tolerance 2 % (the numerical axial field is
    # slightly non-uniform next to the outline on this grid).
    a, d = 0.5e-3, 4e-3
    lay = specimen_layout(d, 4.0, void=Spheroid(2 * a, 2 * a, d / 2))
    s = FieldSolver(lay, grid_for(lay, resolution=20))
    f = coefficients_from_solver(s).field_enhancement
    res = streamer_inception_voltage(s, inside="void")
    assert res.voltage == pytest.approx(ionization_integral_inception_field(2 * a) * d / f, rel=0.02)
    assert res.avalanche_length == pytest.approx(2 * a, rel=1e-4)  # stops on the outline


def test_needle_inception_and_field_line():
    lay = Layout(10e-3, 20e-3, 1.0, conductors=((Rod(0.1e-3, 5e-3), "high"),))
    s = FieldSolver(lay, grid_for(lay, resolution=10))
    res = streamer_inception_voltage(s)
    line = res.line
    # the line leaves the apex and ends on the ground plane; the avalanche region is near the tip only
    assert line.z[line.start_index] == pytest.approx(5e-3, abs=0.02e-3)
    assert line.z.min() == pytest.approx(0.0, abs=1e-12)
    assert 0.0 < res.avalanche_length < 2.5e-3
    # common practice: a divergent field starts streamers below the uniform-field value for the same gap
    assert res.voltage < ionization_integral_inception_field(5e-3) * 5e-3
    # a sharper tip incepts at a lower voltage
    sharp = Layout(10e-3, 20e-3, 1.0, conductors=((Rod(0.05e-3, 5e-3), "high"),))
    assert streamer_inception_voltage(FieldSolver(sharp, grid_for(sharp, resolution=10))).voltage < res.voltage


def test_trace_is_a_field_line():
    lay = Layout(10e-3, 20e-3, 1.0, floating=((Spheroid(2e-3, 2e-3, 5e-3), 0.0),))
    s = FieldSolver(lay, grid_for(lay, resolution=10))
    line = trace_field_line(s.unit("high"), (1.5e-3, 8e-3))
    assert np.all(np.diff(line.s) > 0)
    # against the field it climbs to the high-voltage plate; along it, it ends on the sphere or the ground plate
    assert line.z[0] == pytest.approx(10e-3, abs=1e-12)
    end = (line.r[-1], line.z[-1])
    on_sphere = abs(np.hypot(end[0], end[1] - 5e-3) - 1e-3) < 1e-9
    assert on_sphere or end[1] == pytest.approx(0.0, abs=1e-12)


def test_bad_input():
    lay = Layout(1e-3, 2e-3, 1.0)
    s = FieldSolver(lay, make_grid(2e-3, 1e-3, cells=(4, 8)))
    with pytest.raises(InputError):
        streamer_inception_voltage(s, k_streamer=0.0)
    with pytest.raises(InputError):
        streamer_inception_voltage(s, gas="neon")
    with pytest.raises(InputError):
        streamer_inception_voltage(s, inside="void")  # no void
    with pytest.raises(InputError):
        streamer_inception_voltage(s, pressure=-1.0)
    with pytest.raises(InputError):
        trace_field_line(s.unit("high"), (5e-3, 0.5e-3))  # outside
    with pytest.raises(InputError):
        trace_field_line(s.unit("high"), (0.0, 0.5e-3), step_factor=2.0)
