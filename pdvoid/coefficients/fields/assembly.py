"""Finite-volume assembly of axisymmetric electrostatics, ∇·(ε∇V) = −ρ, on a graded r–z grid.

Cell-centred finite volumes. Each pair of neighbouring cell centres (and each cell next to a plane electrode) is
joined by a *link* with conductance ``c = ε_h A / L``: A is the shared face area (2πr·Δz for radial faces,
π(r+² − r−²) for axial faces), L the distance between the two points and ε_h the harmonic mean of the
permittivity along the segment between them. The harmonic mean is taken over the exact sub-segments cut by the
material outlines (found by bisection on the level sets), so an interface need not lie on a face. A link from a
free cell into a conductor ends at the conductor surface (Shortley–Weller-type cut), and that end takes the
conductor potential. Faces on the axis and at the outer radius carry no flux (Neumann).

Unknowns: the potentials of all cells outside conductors, then one potential per floating conductor whose
equation is its charge balance. With the free charge Q per cell [C] and the electrode potentials V_e the system
reads ``A x = ε0⁻¹·Q + B V`` in relative-permittivity units (A and B are symmetric-positive in the usual sense).

The discrete form keeps Green's reciprocity exactly (A symmetric), so induced charges computed from the weighting
potential (Pedersen's λ function) and from a direct solve agree to round-off.

References:
    Common practice for cell-centred finite volumes with harmonic face averaging: S. V. Patankar, Numerical
    Heat Transfer and Fluid Flow, Hemisphere 1980, §4.2-4 (from memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np
import scipy.sparse as sp

from pdvoid.coefficients.fields.geometry import crossing
from pdvoid.coefficients.fields.grid import Grid
from pdvoid.coefficients.fields.layout import ELECTRODES, Layout
from pdvoid.core.errors import InputError, check_int

__all__ = ["Assembly", "assemble"]

_MIN_CUT = 1e-6  # smallest fraction of a link left between a cell centre and a conductor surface


@dataclass(frozen=True, eq=False)
class Assembly:
    """The assembled linear system and what is needed to evaluate charges and mean fields.

    Units: lengths in m, conductances in m, i.e. relative permittivity x m.

    Attributes
    ----------
    grid, layout : Grid and Layout
        the inputs.
    matrix : sp.csc_matrix
        sparse (n, n) system matrix A (CSC).
    coupling : numpy.ndarray
        dense (n, 2) matrix B: column e couples the unknowns to electrode e (ground, high).
    cell_index : numpy.ndarray
        (nr*nz,) unknown index of each cell, -1 for conductor cells.
    cell_conductor : numpy.ndarray
        (nr*nz,) -1 free, 0 ground, 1 high, 2+k floating conductor k.
    n_free : int
        number of free cells; unknowns n_free.. are the floating potentials.
    electrode_links : tuple
        per electrode, (unknown indices, conductances) of the links ending on it.
    polarization_source : numpy.ndarray
        (n,) load of a unit uniform axial free polarisation in the void per unknown,
        Σ ± A ω over the axial links at that unknown (ω: the void share of the link's potential drop) [m^2];
        the same vector weighs the potentials in the mean axial void field, so reciprocity is exact.
    polarization_deposit : numpy.ndarray
        (2,) the same for the parts of the void wall that are electrode surface [m^2].
    void_volume : float
        Σ χ A Δz over axial links: the void volume in the quadrature of the mean field [m^3].
    cr : numpy.ndarray
        (nr+1, nz) radial-face conductances (zero on axis, outer radius and inside conductors) [m].
    cz : numpy.ndarray
        (nr, nz+1) axial-face conductances including the electrode faces [m].
    cut_r, cut_z : numpy.ndarray
        fraction of each link inside the dielectric (1 unless it ends on a conductor) [-].
    void_r, void_z : numpy.ndarray
        fraction of each link's length inside the void, averaged over its face [-].
    drop_r, drop_z : numpy.ndarray
        fraction of each link's potential drop across its void part (series split for the
        field normal to the outline, length split for the tangential field) [-].
    permittivity : numpy.ndarray
        (nr, nz) relative permittivity at the cell centres [-].
    """

    grid: Grid
    layout: Layout
    matrix: sp.csc_matrix
    coupling: np.ndarray
    cell_index: np.ndarray
    cell_conductor: np.ndarray
    n_free: int
    electrode_links: tuple
    polarization_source: np.ndarray
    polarization_deposit: np.ndarray
    void_volume: float
    cr: np.ndarray
    cz: np.ndarray
    cut_r: np.ndarray
    cut_z: np.ndarray
    void_r: np.ndarray
    void_z: np.ndarray
    drop_r: np.ndarray
    drop_z: np.ndarray
    permittivity: np.ndarray

    @property
    def n_unknowns(self) -> int:
        """Size of the linear system: free cells plus floating-conductor potentials [-]."""
        return self.matrix.shape[0]

    @property
    def n_floating(self) -> int:
        """Number of floating conductors [-]."""
        return len(self.layout.floating)


def _classify(layout: Layout, grid: Grid) -> tuple[np.ndarray, np.ndarray, list]:
    """Conductor id and owning region of every cell (flattened, C order over (nr, nz))."""
    rc, zc = grid.centres()
    rc, zc = rc.ravel(), zc.ravel()
    cid = np.full(rc.size, -1, dtype=np.int64)
    owner = np.full(rc.size, -1, dtype=np.int64)
    regions = []
    for reg, name in layout.conductors:
        regions.append((reg, ELECTRODES.index(name)))
    for k, (reg, _q) in enumerate(layout.floating):
        regions.append((reg, 2 + k))
    for m, (reg, ident) in enumerate(regions):
        inside = reg.contains(rc, zc)
        if not np.any(inside):
            raise InputError(
                f"the grid is too coarse to resolve conductor {reg!r}: no cell centre lies inside it; refine the grid"
            )
        clash = inside & (cid >= 0) & (cid != ident)
        if np.any(clash):
            raise InputError(f"conductor {reg!r} overlaps or touches another conductor at a different potential")
        cid = np.where(inside, ident, cid)
        owner = np.where(inside, m, owner)
    return cid, owner, regions


def _harmonic_line(layout: Layout, regs: list[Any], p_r: np.ndarray, p_z: np.ndarray, e_r: np.ndarray,
                   e_z: np.ndarray) -> tuple[np.ndarray, ...]:
    """Along straight segments p -> e (exact material sub-segments): the harmonic-mean relative permittivity,
    the fraction of the length inside the void and the fraction of the potential drop across the void part
    (the drop splits like the series resistances Δt/ε when the flux density along the segment is constant)."""
    eps = layout.permittivity_at(p_r, p_z)
    void = layout.void
    in_void = void.contains(p_r, p_z) if void is not None else np.zeros(p_r.shape, dtype=bool)
    length_frac = in_void.astype(float)
    drop_frac = length_frac.copy()
    ts = np.full((len(regs), p_r.size), np.nan)
    any_cross = np.zeros(p_r.size, dtype=bool)
    for m, reg in enumerate(regs):
        cross = (reg.level(p_r, p_z) < 0.0) != (reg.level(e_r, e_z) < 0.0)
        if np.any(cross):
            idx = np.flatnonzero(cross)
            ts[m, idx] = crossing(reg, p_r[idx], p_z[idx], e_r[idx], e_z[idx])
            any_cross |= cross
    idx = np.flatnonzero(any_cross)
    if idx.size:
        t = np.sort(ts[:, idx], axis=0)  # NaN sorts last
        t = np.where(np.isnan(t), 1.0, t)
        bounds = np.vstack([np.zeros(idx.size), t, np.ones(idx.size)])
        lengths = np.diff(bounds, axis=0)
        mids = 0.5 * (bounds[1:] + bounds[:-1])
        rr = p_r[idx] + mids * (e_r[idx] - p_r[idx])
        zz = p_z[idx] + mids * (e_z[idx] - p_z[idx])
        resist = lengths / layout.permittivity_at(rr, zz)
        total = np.sum(resist, axis=0)
        eps[idx] = 1.0 / total
        if void is not None:
            inside = void.contains(rr, zz)
            nu = np.sum(np.where(inside, lengths, 0.0), axis=0)
            harm = np.sum(np.where(inside, resist, 0.0), axis=0) / total
            # the series (harmonic) split holds for the field component normal to the outline; the tangential
            # component is continuous and splits with the length: blend with cos^2 of the outline normal
            kv = regs.index(void)
            tv = ts[kv, idx]
            has = np.isfinite(tv)
            cos2 = np.ones(idx.size)
            if np.any(has):
                j = np.flatnonzero(has)
                xr = p_r[idx][j] + tv[j] * (e_r[idx][j] - p_r[idx][j])
                xz = p_z[idx][j] + tv[j] * (e_z[idx][j] - p_z[idx][j])
                dr, dz = e_r[idx][j] - p_r[idx][j], e_z[idx][j] - p_z[idx][j]
                h = 1e-4 * np.hypot(dr, dz)
                gr = (void.level(xr + h, xz) - void.level(np.maximum(xr - h, 0.0), xz)) / (
                    xr + h - np.maximum(xr - h, 0.0)
                )
                gz = (void.level(xr, xz + h) - void.level(xr, xz - h)) / (2.0 * h)
                along = (gr * dr + gz * dz) / np.maximum(np.hypot(gr, gz) * np.hypot(dr, dz), 1e-300)
                cos2[j] = along**2
            length_frac[idx] = nu
            drop_frac[idx] = cos2 * harm + (1.0 - cos2) * nu
    return eps, length_frac, drop_frac


def _link_permittivity(
    layout: Layout, p_r: np.ndarray, p_z: np.ndarray, e_r: np.ndarray, e_z: np.ndarray, radial: np.ndarray,
    width: np.ndarray, samples: int
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Effective relative permittivity of links p -> e whose faces have the given transverse width, and the
    link's void length fraction and void potential-drop fraction (both averaged over the face area).

    Away from material outlines: the values at p. Where an outline passes through the rectangle spanned by the
    link and its face, the harmonic mean along ``samples`` lines parallel to the link, averaged
    arithmetically across the face (area-weighted by r for axial links): exact for layers both normal and
    parallel to the link ("series-parallel" average).
    """
    regs = layout.material_regions()
    out = layout.permittivity_at(p_r, p_z)
    inv = (layout.void.contains(p_r, p_z) if layout.void is not None else np.zeros(p_r.shape, bool)).astype(float)
    length_frac, drop_frac = inv, inv.copy()
    if not regs:
        return out, length_frac, drop_frac
    tr = np.where(radial, 0.0, 1.0)  # transverse unit vector: z for radial links, r for axial links
    tz = 1.0 - tr
    hw = 0.5 * width
    cand = np.zeros(p_r.size, dtype=bool)
    for reg in regs:
        s = [
            reg.level(x_r + sg * hw * tr, x_z + sg * hw * tz) < 0.0
            for x_r, x_z in ((p_r, p_z), (e_r, e_z))
            for sg in (-1.0, 0.0, 1.0)
        ]
        first = s[0]
        for other in s[1:]:
            cand |= other != first
    idx = np.flatnonzero(cand)
    if idx.size == 0:
        return out, length_frac, drop_frac
    offsets = (np.arange(samples) + 0.5) / samples - 0.5
    o = offsets[:, None] * width[idx][None, :]
    pr = p_r[idx][None, :] + o * tr[idx]
    pz = p_z[idx][None, :] + o * tz[idx]
    er = e_r[idx][None, :] + o * tr[idx]
    ez = e_z[idx][None, :] + o * tz[idx]
    h, nu, om = (
        a.reshape(pr.shape) for a in _harmonic_line(layout, regs, pr.ravel(), pz.ravel(), er.ravel(), ez.ravel())
    )
    wgt = np.where(radial[idx][None, :], 1.0, np.maximum(pr, 0.0))
    wgt = wgt + (wgt.sum(axis=0, keepdims=True) == 0.0)  # guard a zero-radius sample row
    wsum = np.sum(wgt, axis=0)
    out[idx] = np.sum(wgt * h, axis=0) / wsum
    length_frac[idx] = np.sum(wgt * nu, axis=0) / wsum
    drop_frac[idx] = np.sum(wgt * om, axis=0) / wsum
    return out, length_frac, drop_frac


def assemble(layout: Layout, grid: Grid, *, samples: int = 4) -> Assembly:
    """Assemble the finite-volume system of ``layout`` on ``grid`` (fully vectorised).

    Parameters
    ----------
    layout : Layout
        the field problem [-].
    grid : Grid
        the grid [-].
    samples : int, optional
        lines across each face used to average the permittivity where an outline passes, >= 1 [-].

    Returns
    -------
    Assembly
        The assembled system.
    """
    samples = check_int("samples", samples, 1, 64)
    if not isinstance(layout, Layout):
        raise InputError(f"layout must be a Layout; got {type(layout).__name__}")
    if not isinstance(grid, Grid):
        raise InputError(f"grid must be a Grid; got {type(grid).__name__}")
    tol = 1e-9
    if (
        abs(grid.thickness - layout.thickness) > tol * layout.thickness
        or abs(grid.outer_radius - layout.outer_radius) > tol * layout.outer_radius
    ):
        raise InputError(
            f"grid extent {grid.outer_radius:g} x {grid.thickness:g} m does not match the layout "
            f"{layout.outer_radius:g} x {layout.thickness:g} m"
        )
    nr, nz = grid.shape
    rf = grid.r_faces
    ncell = nr * nz
    cid, owner, cregions = _classify(layout, grid)
    flat = np.arange(ncell).reshape(nr, nz)
    R, Z = grid.centres()

    # ---- links: (a, b) cell ends or boundary; b = -1 - e for plane electrode e ----------------------------
    # radial links
    a_r = flat[:-1, :].ravel()
    b_r = flat[1:, :].ravel()
    area_r = (2.0 * math.pi * rf[1:-1, None] * grid.dz[None, :]).ravel()
    # axial links: interior, bottom (ground), top (high)
    a_zi = flat[:, :-1].ravel()
    b_zi = flat[:, 1:].ravel()
    ring = grid.ring_area
    area_zi = np.repeat(ring, nz - 1)
    a_all = np.concatenate([a_r, a_zi, flat[:, 0], flat[:, -1]])
    b_all = np.concatenate([b_r, b_zi, np.full(nr, -1), np.full(nr, -2)])
    area = np.concatenate([area_r, area_zi, ring, ring])
    Rf, Zf = R.ravel(), Z.ravel()
    pa_r, pa_z = Rf[a_all], Zf[a_all]
    pb_r = np.where(b_all >= 0, Rf[np.maximum(b_all, 0)], pa_r)
    pb_z = np.where(b_all >= 0, Zf[np.maximum(b_all, 0)], np.where(b_all == -1, 0.0, grid.thickness))
    n_r, n_zi = a_r.size, a_zi.size
    is_z = np.zeros(a_all.size, dtype=bool)
    is_z[n_r:] = True

    ca = cid[a_all]
    cb = np.where(b_all >= 0, cid[np.maximum(b_all, 0)], -b_all - 1)  # boundary: electrode id 0 / 1
    keep = ~((ca >= 0) & (cb >= 0))
    # orient cut links so that p is the free end
    swap = (ca >= 0) & (cb < 0)
    p_r = np.where(swap, pb_r, pa_r)
    p_z = np.where(swap, pb_z, pa_z)
    q_r = np.where(swap, pa_r, pb_r)
    q_z = np.where(swap, pa_z, pb_z)
    length = np.hypot(q_r - p_r, q_z - p_z)
    frac = np.ones(a_all.size)
    cut = keep & ((ca >= 0) | (cb >= 0))
    cond_cell = np.where(swap, a_all, b_all)  # the conductor-side cell (or boundary marker)
    for m, (reg, _ident) in enumerate(cregions):
        sel = np.flatnonzero(cut & (cond_cell >= 0) & (owner[np.maximum(cond_cell, 0)] == m))
        if sel.size:
            frac[sel] = crossing(reg, p_r[sel], p_z[sel], q_r[sel], q_z[sel])
    frac = np.maximum(frac, _MIN_CUT)
    eps_h = np.zeros(a_all.size)
    nu = np.zeros(a_all.size)
    omega = np.zeros(a_all.size)
    k = np.flatnonzero(keep)
    radial = ~is_z
    width = np.concatenate([np.tile(grid.dz, nr - 1), np.repeat(grid.dr, nz - 1), grid.dr, grid.dr])
    e_r = p_r + frac * (q_r - p_r)
    e_z = p_z + frac * (q_z - p_z)
    eps_h[k], nu[k], omega[k] = _link_permittivity(layout, p_r[k], p_z[k], e_r[k], e_z[k], radial[k], width[k], samples)
    cond = np.where(keep, eps_h * area / (frac * length), 0.0)

    # ---- unknown numbering ----------------------------------------------------------------------------------
    free = cid < 0
    n_free = int(free.sum())
    cell_index = np.full(ncell, -1, dtype=np.int64)
    cell_index[free] = np.arange(n_free)
    nflo = len(layout.floating)
    n = n_free + nflo

    def unknown(cell: np.ndarray, conductor: np.ndarray) -> np.ndarray:
        """Unknown index of a link end: free cell or floating conductor; -1 for a fixed electrode."""
        u = np.where(conductor < 0, cell_index[np.maximum(cell, 0)], -1)
        return np.where(conductor >= 2, n_free + conductor - 2, u)

    ua = unknown(a_all, ca)
    ub = unknown(b_all, cb)
    both = keep & (ua >= 0) & (ub >= 0)
    rows = np.concatenate([ua[both], ub[both], ua[both], ub[both]])
    cols = np.concatenate([ua[both], ub[both], ub[both], ua[both]])
    vals = np.concatenate([cond[both], cond[both], -cond[both], -cond[both]])
    electrode_links = []
    coupling = np.zeros((n, 2))
    for e in range(2):
        one_a = keep & (ua >= 0) & (ub < 0) & (cb == e)
        one_b = keep & (ub >= 0) & (ua < 0) & (ca == e)
        u = np.concatenate([ua[one_a], ub[one_b]])
        c = np.concatenate([cond[one_a], cond[one_b]])
        electrode_links.append((u, c))
        rows = np.concatenate([rows, u])
        cols = np.concatenate([cols, u])
        vals = np.concatenate([vals, c])
        np.add.at(coupling[:, e], u, c)
    matrix = sp.csc_matrix(sp.coo_matrix((vals, (rows, cols)), shape=(n, n)))
    if nflo:
        diag = matrix.diagonal()[n_free:]
        if np.any(diag <= 0.0):
            raise InputError("a floating conductor has no dielectric neighbour on this grid; refine the grid")

    # ---- uniform axial polarisation in the void: free charge, deposit on electrodes, quadrature volume -------
    # ∫_void ∂V/∂z dΩ ≈ Σ_axial links A ω (V_up − V_low), ω the void share of the link's potential drop; the same
    # weights are the load of the deposited charge, so reciprocity stays exact. Void volume: Σ A ν L.
    iz = np.flatnonzero(is_z)
    kz = keep[iz]
    w = omega[iz] * area[iz]
    void_volume = float(np.sum((nu[iz] * area[iz] * frac[iz] * length[iz])[kz]))
    # orientation: for axial links the 'a' end is below except the top boundary link (a below the plane)
    up = np.where(b_all[iz] == -1, a_all[iz], b_all[iz])  # upper end
    low = np.where(b_all[iz] == -1, b_all[iz], a_all[iz])
    c_up = np.where(up >= 0, cid[np.maximum(up, 0)], -up - 1)
    c_low = np.where(low >= 0, cid[np.maximum(low, 0)], -low - 1)
    u_up = unknown(up, c_up)
    u_low = unknown(low, c_low)
    source = np.zeros(n)
    deposit = np.zeros(2)
    for uu, cc, sign in ((u_up, c_up, 1.0), (u_low, c_low, -1.0)):
        ok = kz & (w > 0.0)
        m = ok & (uu >= 0)
        np.add.at(source, uu[m], sign * w[m])
        for e in range(2):
            deposit[e] += sign * float(np.sum(w[ok & (uu < 0) & (cc == e)]))

    # ---- per-face arrays for field evaluation and the conduction model ----------------------------------------
    def faces(values: np.ndarray, fill: float) -> tuple[np.ndarray, np.ndarray]:
        fr = np.full((nr + 1, nz), fill)
        fr[1:-1, :] = values[:n_r].reshape(nr - 1, nz)
        fz = np.full((nr, nz + 1), fill)
        fz[:, 1:-1] = values[n_r : n_r + n_zi].reshape(nr, nz - 1)
        fz[:, 0] = values[n_r + n_zi : n_r + n_zi + nr]
        fz[:, -1] = values[n_r + n_zi + nr :]
        return fr, fz

    cr, cz = faces(cond, 0.0)
    cut_r, cut_z = faces(frac, 1.0)
    void_r, void_z = faces(np.where(keep, nu, 0.0), 0.0)
    drop_r, drop_z = faces(np.where(keep, omega, 0.0), 0.0)
    return Assembly(
        grid=grid,
        layout=layout,
        matrix=matrix,
        coupling=coupling,
        cell_index=cell_index,
        cell_conductor=cid,
        n_free=n_free,
        electrode_links=tuple(electrode_links),
        polarization_source=source,
        polarization_deposit=deposit,
        void_volume=void_volume,
        cr=cr,
        cz=cz,
        cut_r=cut_r,
        cut_z=cut_z,
        void_r=void_r,
        void_z=void_z,
        drop_r=drop_r,
        drop_z=drop_z,
        permittivity=layout.permittivity_at(R, Z),
    )
