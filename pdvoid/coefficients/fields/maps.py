"""Field maps from a solved potential: cell fields, conductor surface fields, critical regions.

All maps scale linearly with the applied voltage, so the lowest voltage at which any field exceeds a critical
field follows from one solution with 1 V on the high-voltage electrode.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from pdvoid.coefficients.fields.layout import ELECTRODES
from pdvoid.coefficients.fields.solver import FieldSolver, Potential
from pdvoid.core.errors import InputError, check_choice, check_int, check_positive

__all__ = [
    "field_components",
    "field_magnitude",
    "region_mask",
    "SurfaceField",
    "surface_field",
    "critical_region",
    "lowest_voltage",
]

WHERE = ("all", "dielectric", "void", "solid")
_ORDER = 3  # polynomial order of the one-sided surface-field fit (tested against a conducting sphere)


def _end_fields(
    flux_density: np.ndarray, dv: np.ndarray, length: np.ndarray, nu: np.ndarray, omega: np.ndarray, gas_a: np.ndarray,
    gas_b: np.ndarray, eps_a: np.ndarray, eps_b: np.ndarray,
) -> tuple[np.ndarray, np.ndarray]:
    """Field along a link at its two end cells: εr·E/εr from the flux density in a single material; where the
    link crosses the void outline, the potential drop splits into a void and a solid part (fractions ω and ν
    of the drop and of the length), giving the field on each side."""
    ea = flux_density / eps_a
    eb = flux_density / eps_b
    cross = (nu > 0.0) & (nu < 1.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        e_gas = dv * omega / (nu * length)
        e_solid = dv * (1.0 - omega) / ((1.0 - nu) * length)
    ea = np.where(cross, np.where(gas_a, e_gas, e_solid), ea)
    eb = np.where(cross, np.where(gas_b, e_gas, e_solid), eb)
    return ea, eb


def field_components(potential: Potential) -> tuple[np.ndarray, np.ndarray]:
    """Radial and axial field components at the cell centres, shape (nr, nz) [V/m].

    Each cell averages the field of its two faces in each direction. On a face inside one material the field
    is the face's flux density divided by the cell's permittivity (continuous normal D); on a face whose link
    crosses the void outline, the link's potential drop is split between gas and solid as in the assembly
    (series split for the field normal to the outline, length split for the tangential one). Cells inside
    conductors get zero.

    Parameters
    ----------
    potential : Potential
        A solved potential.

    Returns
    -------
    tuple of numpy.ndarray
        ``(E_r, E_z)``, each of shape (nr, nz) [V/m].

    Raises
    ------
    InputError
        Unless ``potential`` is a Potential.
    """
    if not isinstance(potential, Potential):
        raise InputError(f"potential must be a Potential; got {type(potential).__name__}")
    s = potential.solver
    asm = s.assembly
    g = s.grid
    v = potential.cells
    nr, nz = g.shape
    eps = asm.permittivity
    void = s.layout.void
    gas = void.contains(*g.centres()) if void is not None else np.zeros((nr, nz), dtype=bool)
    # axial faces, including the electrode faces (boundary potential on the far side)
    vz = np.empty((nr, nz + 2))
    vz[:, 1:-1] = v
    vz[:, 0] = potential.voltages[0]
    vz[:, -1] = potential.voltages[1]
    dvz = vz[:, :-1] - vz[:, 1:]  # V_below - V_above on each axial face
    dz_face = asm.cz * dvz / g.ring_area[:, None]  # εr E_z
    zc = np.concatenate([[0.0], g.z, [g.thickness]])
    lz = np.diff(zc)[None, :] * asm.cut_z
    ez_lo, ez_hi = _end_fields(
        dz_face[:, 1:-1],
        dvz[:, 1:-1],
        lz[:, 1:-1],
        asm.void_z[:, 1:-1],
        asm.drop_z[:, 1:-1],
        gas[:, :-1],
        gas[:, 1:],
        eps[:, :-1],
        eps[:, 1:],
    )
    below = np.concatenate([dz_face[:, :1] / eps[:, :1], ez_hi], axis=1)  # field on each cell's lower face
    above = np.concatenate([ez_lo, dz_face[:, -1:] / eps[:, -1:]], axis=1)  # ... and on its upper face
    ez = 0.5 * (below + above)
    # radial faces (none on the axis or at the outer radius)
    area_r = 2.0 * math.pi * g.r_faces[1:-1, None] * g.dz[None, :]
    dvr = v[:-1] - v[1:]
    dr_face = asm.cr[1:-1] * dvr / area_r
    lr = np.diff(g.r)[:, None] * asm.cut_r[1:-1]
    er_in, er_out = _end_fields(
        dr_face, dvr, lr, asm.void_r[1:-1], asm.drop_r[1:-1], gas[:-1], gas[1:], eps[:-1], eps[1:]
    )
    inner = np.concatenate([np.zeros((1, nz)), er_out], axis=0)  # field on each cell's inner face
    outer = np.concatenate([er_in, np.zeros((1, nz))], axis=0)
    er = 0.5 * (inner + outer)
    cond = (asm.cell_conductor >= 0).reshape(nr, nz)
    return np.where(cond, 0.0, er), np.where(cond, 0.0, ez)


def field_magnitude(potential: Potential) -> np.ndarray:
    """|E| at the cell centres, shape (nr, nz) [V/m].

    Parameters
    ----------
    potential : Potential
        A solved potential.

    Returns
    -------
    numpy.ndarray
        |E|, shape (nr, nz) [V/m].
    """
    er, ez = field_components(potential)
    return np.hypot(er, ez)


def region_mask(solver: FieldSolver, where: str | np.ndarray = "dielectric") -> np.ndarray:
    """Boolean (nr, nz) mask of cells: "all", "dielectric" (outside conductors), "void" or "solid".

    A boolean array of shape (nr, nz) is passed through (after a shape check).

    Parameters
    ----------
    solver : FieldSolver
        The assembled solver.
    where : str or numpy.ndarray, optional
        ``"all"``, ``"dielectric"``, ``"void"``, ``"solid"`` or a boolean (nr, nz) mask.

    Returns
    -------
    numpy.ndarray
        Boolean mask of shape (nr, nz).

    Raises
    ------
    InputError
        For another ``where``, a mask of the wrong shape or type, or ``"void"`` without a void.
    """
    if not isinstance(solver, FieldSolver):
        raise InputError(f"solver must be a FieldSolver; got {type(solver).__name__}")
    shape = solver.grid.shape
    if isinstance(where, np.ndarray):
        if where.shape != shape or where.dtype != bool:
            raise InputError(f"a mask must be a boolean array of shape {shape}; got {where.dtype} {where.shape}")
        return where
    check_choice("where", where, WHERE)
    asm = solver.assembly
    free = (asm.cell_conductor < 0).reshape(shape)
    if where == "all":
        return np.ones(shape, dtype=bool)
    if where == "dielectric":
        return free
    void = solver.layout.void
    if void is None:
        inside = np.zeros(shape, dtype=bool)
    else:
        inside = void.contains(*solver.grid.centres())
    if where == "void":
        if not np.any(inside):
            raise InputError("where='void' but the layout has no void resolved on this grid")
        return inside & free
    return free & ~inside


@dataclass(frozen=True)
class SurfaceField:
    """Field on a conductor surface at the points where grid lines cross it.

    Attributes
    ----------
    r, z : numpy.ndarray
        crossing points [m].
    magnitude : numpy.ndarray
        |E| at each point (the grid-line component divided by the cosine of the surface normal) [V/m].
    """

    r: np.ndarray
    z: np.ndarray
    magnitude: np.ndarray

    @property
    def maximum(self) -> float:
        """Largest surface field [V/m]."""
        return float(self.magnitude.max()) if self.magnitude.size else 0.0

    @property
    def where_maximum(self) -> tuple[float, float]:
        """(r, z) of the largest surface field [m]."""
        k = int(np.argmax(self.magnitude))
        return float(self.r[k]), float(self.z[k])


def _conductor_id(solver: FieldSolver, conductor: str | int) -> tuple[int, list[Any]]:
    lay = solver.layout
    if isinstance(conductor, str):
        e = ELECTRODES.index(check_choice("conductor", conductor, ELECTRODES))
        regs = [reg for reg, name in lay.conductors if name == conductor]
        if not regs:
            raise InputError(
                f"electrode {conductor!r} has no shaped part (needle); its plane surface field is "
                "the face field of field_components"
            )
        return e, regs
    k = check_int("conductor", conductor, 0, len(lay.floating) - 1)
    return 2 + k, [lay.floating[k][0]]


def _normal_cos(regions: list, r: np.ndarray, z: np.ndarray, axial: bool, h: float) -> np.ndarray:
    def lev(rr: np.ndarray, zz: np.ndarray) -> np.ndarray:
        return np.min([reg.level(rr, zz) for reg in regions], axis=0)

    gr = (lev(r + h, z) - lev(np.maximum(r - h, 0.0), z)) / (r + h - np.maximum(r - h, 0.0))
    gz = (lev(r, z + h) - lev(r, z - h)) / (2.0 * h)
    norm = np.hypot(gr, gz)
    norm = np.where(norm > 0.0, norm, 1.0)
    return np.abs(gz if axial else gr) / norm


def _surface_slope(
    vl: np.ndarray, fr: np.ndarray, xs: np.ndarray, a: np.ndarray, b: np.ndarray, step: int, s1: np.ndarray, vc: float,
    order: int,
) -> np.ndarray:
    """Slope at the surface of the polynomial through the surface potential and ``order`` free cells.

    The cell next to the surface is skipped: the symmetric cut-link scheme keeps the potential second-order
    accurate but its local error there, divided by a possibly tiny distance, would dominate the slope
    (checked on a conducting sphere, where skipping it brings the pole field within 1 % at h = a/14).
    Lines with too few free cells fall back to a lower order.
    """
    n = a.size
    nodes = np.zeros((n, order))
    vals = np.zeros((n, order))
    okall = np.ones(n, dtype=bool)
    for k in range(order):
        idx = b - step * (1 + k)
        ok = (idx >= 0) & (idx < xs.size)
        idx_c = np.clip(idx, 0, xs.size - 1)
        ok &= fr[a, idx_c]
        okall &= ok
        nodes[:, k] = s1 + np.abs(xs[idx_c] - xs[b])
        vals[:, k] = vl[a, idx_c] - vc
    m = np.arange(1, order + 1)
    vand = nodes[:, :, None] ** m[None, None, :]
    out = np.full(n, np.nan)
    if np.any(okall):
        out[okall] = np.linalg.solve(vand[okall], vals[okall][:, :, None])[:, 0, 0]
    if not np.all(okall) and order > 1:  # near the domain edge or another conductor: lower order
        out[~okall] = _surface_slope(vl, fr, xs, a[~okall], b[~okall], step, s1[~okall], vc, order - 1)
    return out


def surface_field(potential: Potential, conductor: str | int, *, min_cosine: float = 0.5) -> SurfaceField:
    """|E| on the surface of a shaped electrode part ("high"/"ground") or floating conductor (its index).

    Along every grid line that enters the conductor, the potential of the conductor surface and of the two
    nearest free cells define a quadratic whose slope at the surface is the field component along the line
    (second-order one-sided difference). Dividing by the cosine between the line and the surface normal gives
    |E| (the field is normal to a conductor). Points where that cosine is below ``min_cosine`` are skipped.

    Parameters
    ----------
    potential : Potential
        a solved potential [V].
    conductor : str or int
        "high", "ground" (their shaped parts) or the index of a floating conductor [-].
    min_cosine : float, optional
        smallest accepted cosine between grid line and surface normal, in (0, 1] [-].

    Returns
    -------
    SurfaceField
        Points on the surface and |E| there [m, V/m].
    """
    if not isinstance(potential, Potential):
        raise InputError(f"potential must be a Potential; got {type(potential).__name__}")
    solver = potential.solver
    ident, regions = _conductor_id(solver, conductor)
    min_cosine = float(check_positive("min_cosine", min_cosine))
    if min_cosine > 1.0:
        raise InputError(f"min_cosine must be <= 1; got {min_cosine!r}")
    asm = solver.assembly
    g = solver.grid
    nr, nz = g.shape
    cid = asm.cell_conductor.reshape(nr, nz)
    v = potential.cells
    vc = potential.cells[cid == ident][0]
    out_r, out_z, out_e = [], [], []
    rc, zc = g.r, g.z
    h = 1e-3 * min(g.smallest_spacing)
    free = cid < 0
    for axial in (True, False):
        for step in (1, -1):  # the conductor lies at +step along the line from the first free cell
            cf = cid if axial else cid.T
            fr = free if axial else free.T
            m = np.zeros(cf.shape, dtype=bool)
            if step == 1:
                m[:, 1:-1] = fr[:, 1:-1] & (cf[:, 2:] == ident) & fr[:, :-2]
            else:
                m[:, 1:-1] = fr[:, 1:-1] & (cf[:, :-2] == ident) & fr[:, 2:]
            a, b = np.nonzero(m)  # first free cell, (line index, position along the line)
            if a.size == 0:
                continue
            xs = zc if axial else rc
            cutf = asm.cut_z if axial else asm.cut_r.T
            vl = v if axial else v.T
            face = np.maximum(b, b + step)
            s1 = cutf[a, face] * np.abs(xs[b + step] - xs[b])
            along = xs[b] + step * s1
            slope = _surface_slope(vl, fr, xs, a, b, step, s1, vc, _ORDER)
            other = (rc if axial else zc)[a]
            pr, pz = (other, along) if axial else (along, other)
            cos = _normal_cos(regions, pr, pz, axial, h)
            ok = (cos >= min_cosine) & np.isfinite(slope)
            out_r.append(pr[ok])
            out_z.append(pz[ok])
            out_e.append(np.abs(slope[ok]) / cos[ok])
    if not out_e:
        raise InputError("no grid line crosses the conductor surface; refine the grid")
    return SurfaceField(np.concatenate(out_r), np.concatenate(out_z), np.concatenate(out_e))


def critical_region(potential: Potential, critical_field: float, where: str | np.ndarray = "dielectric") -> np.ndarray:
    """Boolean (nr, nz) mask of cells in ``where`` whose |E| exceeds ``critical_field``.

    Parameters
    ----------
    potential : Potential
        a solved potential [V].
    critical_field : float
        field threshold [V/m].
    where : str or numpy.ndarray, optional
        "all", "dielectric", "void", "solid" or a boolean mask [-].

    Returns
    -------
    numpy.ndarray
        Boolean mask of shape (nr, nz).
    """
    ec = check_positive("critical_field", critical_field, "V/m")
    mask = region_mask(potential.solver, where)
    return mask & (field_magnitude(potential) > ec)


def lowest_voltage(
    solver: FieldSolver, critical_field: float, where: str | np.ndarray = "dielectric", *, include_surface: bool = True
) -> float:
    """Lowest voltage on the high-voltage electrode at which |E| somewhere in ``where`` exceeds the critical field.

    By linearity U = E_crit / max|E_1V|, with E_1V the field for 1 V on the high-voltage electrode (floating
    conductors uncharged). With ``include_surface`` the surface fields of shaped electrodes and floating
    conductors are included (they are the maxima at a needle tip or on an inclusion); cell-centre values
    underestimate a surface maximum on coarse grids.

    Parameters
    ----------
    solver : FieldSolver
        the factorised field problem [-].
    critical_field : float
        field threshold [V/m].
    where : str or numpy.ndarray, optional
        "all", "dielectric", "void", "solid" or a boolean mask [-].
    include_surface : bool, optional
        include conductor surface fields [-].

    Returns
    -------
    float
        Voltage magnitude [V].
    """
    ec = check_positive("critical_field", critical_field, "V/m")
    unit = solver.unit("high")
    mask = region_mask(solver, where)
    emax = float(np.max(field_magnitude(unit)[mask], initial=0.0))
    if include_surface and not (isinstance(where, str) and where == "void"):
        names = sorted({name for _, name in solver.layout.conductors})
        for c in [*names, *range(len(solver.layout.floating))]:
            emax = max(emax, surface_field(unit, c).maximum)
    if emax <= 0.0:
        raise InputError("the field is zero everywhere in the selected region")
    return ec / emax
