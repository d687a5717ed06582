"""Axisymmetric numerical field solver and what it derives.

Layers of this subpackage (each imports only those above it):

- :mod:`~pdvoid.fields.grid`: graded r–z grids;
- :mod:`~pdvoid.fields.geometry`: shapes as level sets (spheroid, rounded cylinder, needle, hyperboloid,
  slab, polygon outline);
- :mod:`~pdvoid.fields.layout`: the field problem (electrodes, dielectrics, void, floating conductors);
- :mod:`~pdvoid.fields.assembly`, :mod:`~pdvoid.fields.solver`: finite-volume assembly and sparse LU;
- :mod:`~pdvoid.fields.maps`: field maps, surface fields, critical regions, lowest critical voltage;
- :mod:`~pdvoid.fields.pointplane`: exact and handbook apex fields of a point-plane gap;
- :mod:`~pdvoid.fields.streamer`: field lines and the ionisation-integral (streamer) inception voltage;
- :mod:`~pdvoid.fields.derived`: coefficients for the fast models (:func:`coefficients_for` from plain SI
  arguments, :func:`coefficients` from a scenario);
- :mod:`~pdvoid.fields.timedomain`: the conductive-void time-domain reference model.

Everything is SI: lengths in m, potentials in V, fields in V/m, charges in C.
"""

from __future__ import annotations

from .derived import (
    FieldCoefficients,
    coefficients,
    coefficients_for,
    coefficients_from_solver,
    equivalent_depolarization,
    peak_enhancement,
    void_region,
    with_field_solution,
)
from .geometry import Hyperboloid, Outline, Region, Rod, RoundedCylinder, Slab, Spheroid
from .grid import Grid, graded_faces, make_grid
from .layout import ELECTRODES, Layout, grid_for, specimen_layout
from .maps import (
    SurfaceField,
    critical_region,
    field_components,
    field_magnitude,
    lowest_voltage,
    region_mask,
    surface_field,
)
from .pointplane import hyperboloid_tip_field, mason_tip_field
from .solver import FieldSolver, Potential
from .streamer import FieldLine, StreamerInception, streamer_inception_voltage, trace_field_line
from .timedomain import TimeDomainResult, conductive_void_reference

__all__ = [
    "ELECTRODES",
    "FieldCoefficients",
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
