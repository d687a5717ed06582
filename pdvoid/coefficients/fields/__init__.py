"""Axisymmetric numerical field solver and what it derives.

``pdvoid.fields`` is this subpackage. Layers of it (each imports only those above it):

- :mod:`~pdvoid.coefficients.fields.grid`: graded r–z grids;
- :mod:`~pdvoid.coefficients.fields.geometry`: shapes as level sets (spheroid, rounded cylinder, needle, hyperboloid,
  slab, polygon outline);
- :mod:`~pdvoid.coefficients.fields.layout`: the field problem (electrodes, dielectrics, void, floating conductors);
- :mod:`~pdvoid.coefficients.fields.assembly`, :mod:`~pdvoid.coefficients.fields.solver`: finite-volume assembly
  and sparse LU;
- :mod:`~pdvoid.coefficients.fields.maps`: field maps, surface fields, critical regions, lowest critical voltage;
- :mod:`~pdvoid.coefficients.fields.pointplane`: exact and handbook apex fields of a point-plane gap;
- :mod:`~pdvoid.coefficients.fields.streamer`: field lines and the ionisation-integral (streamer) inception voltage;
- :mod:`~pdvoid.coefficients.fields.derived`: coefficients for the fast models (:func:`coefficients_for` from plain SI
  arguments, :func:`coefficients` from a scenario);
- :mod:`~pdvoid.coefficients.fields.timedomain`: the conductive-void time-domain reference model.

Everything is SI: lengths in m, potentials in V, fields in V/m, charges in C.
"""

from __future__ import annotations

from pdvoid.coefficients.fields.derived import (
    FieldSolution,
    coefficients,
    coefficients_for,
    coefficients_from_solver,
    equivalent_depolarization,
    peak_enhancement,
    solve_scenario,
    void_region,
    with_field_solution,
)
from pdvoid.coefficients.fields.geometry import Hyperboloid, Outline, Region, Rod, RoundedCylinder, Slab, Spheroid
from pdvoid.coefficients.fields.grid import Grid, graded_faces, make_grid
from pdvoid.coefficients.fields.layout import ELECTRODES, Layout, grid_for, specimen_layout
from pdvoid.coefficients.fields.maps import (
    SurfaceField,
    critical_region,
    field_components,
    field_magnitude,
    lowest_voltage,
    region_mask,
    surface_field,
)
from pdvoid.coefficients.fields.pointplane import hyperboloid_tip_field, mason_tip_field
from pdvoid.coefficients.fields.solver import FieldSolver, Potential
from pdvoid.coefficients.fields.streamer import (
    FieldLine,
    StreamerInception,
    streamer_inception_voltage,
    trace_field_line,
)
from pdvoid.coefficients.fields.timedomain import TimeDomainResult, conductive_void_reference

__all__ = [
    "ELECTRODES",
    "FieldSolution",
    "FieldLine",
    "FieldSolver",
    "Grid",
    "Hyperboloid",
    "Layout",
    "Outline",
    "Potential",
    "Region",
    "Rod",
    "RoundedCylinder",
    "Slab",
    "Spheroid",
    "StreamerInception",
    "SurfaceField",
    "TimeDomainResult",
    "coefficients",
    "coefficients_for",
    "coefficients_from_solver",
    "solve_scenario",
    "with_field_solution",
    "conductive_void_reference",
    "critical_region",
    "equivalent_depolarization",
    "field_components",
    "field_magnitude",
    "graded_faces",
    "grid_for",
    "hyperboloid_tip_field",
    "lowest_voltage",
    "make_grid",
    "mason_tip_field",
    "peak_enhancement",
    "region_mask",
    "specimen_layout",
    "streamer_inception_voltage",
    "surface_field",
    "trace_field_line",
    "void_region",
]
