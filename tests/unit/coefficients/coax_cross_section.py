"""An independent two-dimensional check of the coaxial local-field model (test helper, not part of pdvoid).

The cross-section of a cable with a long cylindrical void parallel to the cable axis is a truly coaxial field
problem in which the void is *not* axisymmetric about its own axis: exactly what the local plane-slab model of
:mod:`pdvoid.coefficients.coaxial` approximates. This module solves it by finite volumes on a graded polar grid
(r, θ), θ ∈ [0, π] with mirror symmetry about the plane through the cable axis and the void centre, ε0 = 1:

- the weighting potential λ (1 on the inner conductor, 0 on the outer one) with the void present: its mean
  radial field over the void is the void field per volt applied;
- the potential of a uniform free polarisation P = 1 along the radius in the void (surface charge P·n on its
  wall), conductors earthed: its mean field over the void is the counter-field ΔE, and Green's reciprocity gives
  the charge induced on the inner conductor, q = −∫ρ λ, per unit cable length.

Nothing here is taken from pdvoid (own grid, own discretisation), so it can serve as an independent reference.
"""

from __future__ import annotations

import math

import numpy as np
import scipy.sparse as sp
import scipy.sparse.linalg as spla


def _graded(lo: float, hi: float, centre: float, band: float, h0: float, growth: float) -> np.ndarray:
    """Faces from lo to hi: spacing h0 within ``band`` of ``centre``, growing geometrically outside."""
    faces = [centre]
    for sign, end in ((1.0, hi), (-1.0, lo)):
        x, h = centre, h0
        while sign * (end - x) > 1e-12 * (hi - lo):
            if abs(x - centre) >= band:
                h *= growth
            step = min(h, sign * (end - x))
            if sign * (end - x) - step < 0.3 * h:  # do not leave a sliver cell at the end
                step = sign * (end - x)
            x += sign * step
            faces.append(x)
    return np.unique(np.array(faces))


def solve_cross_section(inner_radius: float, outer_radius: float, permittivity: float, void_radius: float,
                        void_centre: float, cells_across: int = 40, growth: float = 1.08,
                        samples: int = 6) -> dict[str, float]:
    """Mean void field per volt, counter-field per unit polarisation and induced charge per unit length.

    Parameters are SI lengths and the host's relative permittivity; ``cells_across`` cells span the void
    diameter. Returns ``field_per_volt`` [1/m], ``counter_field`` [(V/m) per (C/m²) with ε0 = 1] and
    ``induced_charge`` [C/m per (C/m²), ε0 = 1, signed].
    """
    a, b, er, rv, r0 = inner_radius, outer_radius, permittivity, void_radius, void_centre
    h0 = 2.0 * rv / cells_across
    rf = _graded(a, b, r0, 1.3 * rv, h0, growth)
    tf = _graded(0.0, math.pi, 0.0, 1.3 * rv / r0, h0 / r0, growth)
    tf = tf[tf >= 0.0]
    nr, nt = rf.size - 1, tf.size - 1
    rc, tc = 0.5 * (rf[1:] + rf[:-1]), 0.5 * (tf[1:] + tf[:-1])
    dr, dt = np.diff(rf), np.diff(tf)
    # void fraction of every cell by sub-sampling
    s = (np.arange(samples) + 0.5) / samples
    rs = rf[:-1, None] + dr[:, None] * s[None, :]  # (nr, samples)
    ts = tf[:-1, None] + dt[:, None] * s[None, :]  # (nt, samples)
    x = rs[:, None, :, None] * np.cos(ts[None, :, None, :])
    y = rs[:, None, :, None] * np.sin(ts[None, :, None, :])
    inside = (x - r0) ** 2 + y**2 < rv * rv
    w = rs[:, None, :, None] * np.ones_like(ts[None, :, None, :])  # area weight r dr dθ
    frac = (inside * w).sum(axis=(2, 3)) / w.sum(axis=(2, 3))  # (nr, nt)
    eps = 1.0 / (frac / 1.0 + (1.0 - frac) / er)  # series mixture in a partly filled cell
    area = rc[:, None] * dr[:, None] * dt[None, :]
    idx = np.arange(nr * nt).reshape(nr, nt)
    rows, cols, vals = [], [], []
    diag = np.zeros((nr, nt))
    bnd_inner = np.zeros((nr, nt))  # coefficient of the inner-conductor potential (Dirichlet)
    # radial faces between cells i and i+1
    g = rf[1:-1, None] * dt[None, :] / (rc[1:] - rc[:-1])[:, None]
    e_f = 2.0 / (1.0 / eps[:-1] + 1.0 / eps[1:])
    c = (g * e_f)
    for p, q in ((idx[:-1], idx[1:]), (idx[1:], idx[:-1])):
        rows.append(p.ravel())
        cols.append(q.ravel())
        vals.append(c.ravel())
    diag[:-1] -= c
    diag[1:] -= c
    # the conductors (half a cell away)
    c_in = rf[0] * dt * eps[0] / (rc[0] - rf[0])
    c_out = rf[-1] * dt * eps[-1] / (rf[-1] - rc[-1])
    diag[0] -= c_in
    diag[-1] -= c_out
    bnd_inner[0] = c_in
    # angular faces between cells j and j+1 (mirror planes at θ = 0 and π carry no flux)
    g = dr[:, None] / (rc[:, None] * (tc[1:] - tc[:-1])[None, :])
    e_f = 2.0 / (1.0 / eps[:, :-1] + 1.0 / eps[:, 1:])
    c = g * e_f
    for p, q in ((idx[:, :-1], idx[:, 1:]), (idx[:, 1:], idx[:, :-1])):
        rows.append(p.ravel())
        cols.append(q.ravel())
        vals.append(c.ravel())
    diag[:, :-1] -= c
    diag[:, 1:] -= c
    rows.append(idx.ravel())
    cols.append(idx.ravel())
    vals.append(diag.ravel())
    mat = sp.csc_matrix((np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))), shape=(nr * nt,) * 2)
    lu = spla.splu(mat)
    lam = lu.solve(-bnd_inner.ravel()).reshape(nr, nt)  # λ = 1 on the inner conductor
    # flux of a uniform P = x̂ (radial at the void centre) out of every cell: Σ faces P_f·n len_f
    px = frac  # cell polarisation (x component), P = 1 inside
    rhs = np.zeros((nr, nt))
    pf = 0.5 * (px[:-1] + px[1:]) * np.cos(tc)[None, :] * rf[1:-1, None] * dt[None, :]
    rhs[:-1] += pf
    rhs[1:] -= pf
    tfi = tf[1:-1]
    pf = -0.5 * (px[:, :-1] + px[:, 1:]) * np.sin(tfi)[None, :] * dr[:, None]
    rhs[:, :-1] += pf
    rhs[:, 1:] -= pf
    phi = lu.solve(rhs.ravel()).reshape(nr, nt)

    def mean_ex(u: np.ndarray, inner: float) -> float:
        # cell-centre gradient (central differences, one-sided at the ends), E = −∇u, x component
        pad = np.vstack([np.full((1, nt), inner), u, np.zeros((1, nt))])
        rp = np.concatenate(([rf[0]], rc, [rf[-1]]))
        e_r = -(pad[2:] - pad[:-2]) / (rp[2:] - rp[:-2])[:, None]
        padt = np.hstack([u[:, :1], u, u[:, -1:]])  # mirror planes
        tp = np.concatenate(([-tc[0]], tc, [2.0 * math.pi - tc[-1]]))
        e_t = -(padt[:, 2:] - padt[:, :-2]) / (tp[2:] - tp[:-2])[None, :] / rc[:, None]
        e_x = e_r * np.cos(tc)[None, :] - e_t * np.sin(tc)[None, :]
        wgt = frac * area
        return float((e_x * wgt).sum() / wgt.sum())

    return {
        "field_per_volt": mean_ex(lam, 1.0),
        "counter_field": mean_ex(phi, 0.0),
        # q = −∫ρ λ with ∫ρ over a cell = −(flux of P out of it); ×2 for the mirrored half
        "induced_charge": 2.0 * float((rhs * lam).sum()),
        "cells": float(nr * nt),
    }
