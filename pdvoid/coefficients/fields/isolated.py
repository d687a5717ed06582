"""Field-solver coefficients of a rounded-rim cylindrical void far from the electrodes, and the shipped table.

:func:`isolated_cylinder` solves one cylinder (diameter D, height h, rim rounded with radius min(D, h)/2, axis
along the field) centred in a slab so thick that the electrodes no longer matter, on a grid graded towards the
rim (a 1000:1 disc needs fine cells only near its edge), and returns the two dimensionless numbers the closed
forms of :mod:`pdvoid.coefficients.cylinder` interpolate:

- the field enhancement f (mean axial field in the void per applied field V/d);
- the charge shape factor ``K_q = charge_per_field · d / (εr ε0 Ω)`` (Pedersen's K for an ellipsoid, where it
  equals 1/N; Ω the void volume).

:func:`build_cylinder_table` computes them on a grid of aspect ratios D/h and host permittivities and writes
``pdvoid/coefficients/data/cylinder_isolated.npz``; ``benchmarks/cylinder_table.py`` is the script that calls it.
"""

from __future__ import annotations

import time
from collections.abc import Callable
from pathlib import Path
from typing import Any

import numpy as np

from pdvoid.coefficients.fields.derived import FieldSolution, coefficients_from_solver
from pdvoid.coefficients.fields.geometry import RoundedCylinder
from pdvoid.coefficients.fields.grid import make_grid
from pdvoid.coefficients.fields.layout import specimen_layout
from pdvoid.coefficients.fields.solver import FieldSolver
from pdvoid.core.errors import check_positive, check_range
from pdvoid.core.units import EPSILON_0

__all__ = ["isolated_cylinder", "build_cylinder_table", "TABLE_ASPECTS", "TABLE_PERMITTIVITIES"]

#: aspect ratios D/h of the shipped table (log-spaced, about 5 points per decade) [-]
TABLE_ASPECTS = tuple(float(x) for x in np.round(np.logspace(-1.0, 3.0, 21), 6))
#: host permittivities of the shipped table [-]
TABLE_PERMITTIVITIES = (1.5, 2.0, 3.0, 4.0, 6.0, 10.0, 20.0, 40.0, 100.0)


def _solver(
    aspect: float, permittivity: float, height: float, thickness: float, center: float, fine: float,
    growth: float, max_ratio: float,
) -> FieldSolver:
    diameter = aspect * height
    rim = 0.5 * min(diameter, height)
    void = RoundedCylinder(diameter, height, center, rim)
    layout = specimen_layout(thickness, permittivity, void=void)
    r_rim = 0.5 * diameter
    # fine cells over the whole void when it is compact, else only near the rim and the axis; the field
    # inside a flat disc varies on the scale of its diameter, not its height
    band = 2.0 * height
    focus_r = [(0.0, r_rim)] if r_rim <= 4.0 * band else [(0.0, band), (r_rim - band, r_rim + 0.5 * band)]
    focus_z = [(center - 0.5 * height, center + 0.5 * height)]
    grid = make_grid(layout.outer_radius, thickness, fine=fine, focus_r=focus_r, focus_z=focus_z,
                     growth=growth, max_ratio=max_ratio)
    return FieldSolver(layout, grid)


def isolated_cylinder(
    aspect: float,
    permittivity: float,
    *,
    resolution: float = 48.0,
    slab_factor: float = 8.0,
    growth: float = 1.1,
    extrapolate: bool = True,
    thickness: float | None = None,
) -> tuple[float, float, FieldSolution]:
    """Field enhancement and charge shape factor of a rounded-rim cylinder centred far from the electrodes.

    The void has height h = 1 mm and diameter ``aspect`` mm (the results depend only on the ratios). With
    ``extrapolate`` the layout is also solved at 2/3 of the resolution and both numbers are extrapolated to zero
    spacing assuming first-order convergence, ``x = 3 x_fine − 2 x_coarse`` (the staircase representation of
    the curved rim converges to first order; the grids are not nested, so this is done on the two derived
    numbers rather than with :func:`~pdvoid.coefficients.fields.derived.coefficients_from_solver`).

    Parameters
    ----------
    aspect : float
        Diameter / height D/h, 1e-2 to 1e4 [-].
    permittivity : float
        Host relative permittivity εr, 1 to 1000 [-].
    resolution : float
        Cells across the smaller of D and h in the fine region [-].
    slab_factor : float
        Slab thickness as a multiple of max(D, h) [-].
    growth : float
        Neighbour ratio of cell sizes away from the void [-].
    extrapolate : bool
        Also solve at 2/3 of the resolution and extrapolate [-].
    thickness : float, optional
        Slab thickness [m] (h = 1e-3 m); overrides ``slab_factor``, for studies of the slab effect.

    Returns
    -------
    tuple
        (f [-], K_q = charge_per_field·d/(εr ε0 Ω) [-], the :class:`FieldSolution` of the fine grid).

    References
    ----------
    pedersen1991, crichton1989 (induced charge via the weighting potential); richardson1911 (extrapolation,
    common practice).
    """
    a = check_range("aspect", aspect, 1e-2, 1e4)
    er = check_range("permittivity", permittivity, 1.0, 1e3)
    res = check_positive("resolution", resolution)
    h = 1e-3
    d = slab_factor * max(a * h, h) if thickness is None else check_positive("thickness", thickness, "m")

    def one(r: float) -> tuple[float, float, FieldSolution]:
        fine = min(a * h, h) / r
        max_ratio = max(200.0, 0.1 * d / fine)
        sol = coefficients_from_solver(_solver(a, er, h, d, 0.5 * d, fine, growth, max_ratio))
        return sol.field_enhancement, sol.charge_per_field * d / (er * EPSILON_0 * sol.void_volume), sol

    f1, k1, sol = one(res)
    if not extrapolate:
        return f1, k1, sol
    f0, k0, _ = one(res / 1.5)
    return 3.0 * f1 - 2.0 * f0, 3.0 * k1 - 2.0 * k0, sol


def build_cylinder_table(
    path: str | Path,
    *,
    aspects: tuple[float, ...] = TABLE_ASPECTS,
    permittivities: tuple[float, ...] = TABLE_PERMITTIVITIES,
    resolution: float = 48.0,
    slab_factor: float = 8.0,
    log: Callable[[str], object] = print,
) -> dict[str, Any]:
    """Compute the isolated-cylinder table with :func:`isolated_cylinder` and write it as ``.npz``.

    Parameters
    ----------
    path : str or pathlib.Path
        Output file (``.npz``) [-].
    aspects, permittivities : tuple of float
        Table nodes: D/h and εr [-].
    resolution, slab_factor : float
        Passed to :func:`isolated_cylinder` (Richardson extrapolation on) [-].
    log : callable
        Receives one progress line per solve [-].

    Returns
    -------
    dict
        The arrays written: ``aspect``, ``permittivity``, ``field_enhancement`` and ``charge_factor`` (shape
        (aspects, permittivities)), the fine-grid values before extrapolation (``*_fine``, the convergence
        evidence), ``unknowns`` and the settings.
    """
    from pdvoid._version import __version__

    f = np.empty((len(aspects), len(permittivities)))
    kq = np.empty_like(f)
    f_raw = np.empty_like(f)
    kq_raw = np.empty_like(f)
    unknowns = np.empty(f.shape, dtype=np.int64)
    for i, a in enumerate(aspects):
        for j, er in enumerate(permittivities):
            t0 = time.perf_counter()
            f[i, j], kq[i, j], sol = isolated_cylinder(a, er, resolution=resolution, slab_factor=slab_factor)
            unknowns[i, j] = sol.unknowns
            f_raw[i, j] = sol.field_enhancement
            kq_raw[i, j] = sol.charge_per_field * sol.thickness / (er * EPSILON_0 * sol.void_volume)
            log(f"D/h = {a:10.4g}  er = {er:6.3g}  f = {f[i, j]:.6f}  K_q = {kq[i, j]:.6f}  "
                f"({sol.unknowns} unknowns, {time.perf_counter() - t0:.2f} s)")
    out: dict[str, Any] = {
        "aspect": np.asarray(aspects, float),
        "permittivity": np.asarray(permittivities, float),
        "field_enhancement": f,
        "charge_factor": kq,
        "field_enhancement_fine": f_raw,
        "charge_factor_fine": kq_raw,
        "unknowns": unknowns,
        "resolution": np.float64(resolution),
        "slab_factor": np.float64(slab_factor),
        "pdvoid_version": np.str_(__version__),
    }
    np.savez(Path(path), **out)
    return out

