"""Graded r–z grids for the axisymmetric finite-volume field solver.

A grid is a tensor product of face coordinates in r (from the axis, r = 0, to the outer radius) and in z (from
the ground electrode, z = 0, to the high-voltage electrode, z = thickness). Cells are the rectangles between
faces; the unknowns sit at cell centres.

Spacing is fine near *focus* intervals (a void, a needle tip, an inclusion) and grows geometrically away from
them: the local spacing is ``h(x) = min(h0 + (growth - 1) * dist(x, focus), max_ratio * h0)``, so neighbouring
cells differ by about the factor ``growth``. Fixed *break* points (layer interfaces) always fall on faces.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from pdvoid.core.arrays import frozen_array as _frozen
from pdvoid.core.errors import InputError, check_int, check_positive, check_range

__all__ = ["Grid", "graded_faces", "make_grid"]

_SAMPLES = 40001  # resolution of the numerical inverse of the cell-count function (common practice)




@dataclass(frozen=True, eq=False)
class Grid:
    """An axisymmetric tensor-product grid of cells.

    Attributes
    ----------
    r_faces : numpy.ndarray
        radial face positions, increasing, ``r_faces[0] == 0`` (the axis) [m].
    z_faces : numpy.ndarray
        axial face positions, increasing, ``z_faces[0] == 0`` (ground electrode) [m].
    Derived arrays have shape ``(nr, nz)`` for cells (index ``[i, j]`` = radial ``i``, axial ``j``).
    """

    r_faces: np.ndarray
    z_faces: np.ndarray

    def __post_init__(self) -> None:
        for name in ("r_faces", "z_faces"):
            a = np.asarray(getattr(self, name), dtype=float)
            if a.ndim != 1 or a.size < 2 or not np.all(np.isfinite(a)):
                raise InputError(f"{name} must be a finite 1-D array of at least 2 faces; got shape {a.shape}")
            if np.any(np.diff(a) <= 0.0):
                raise InputError(f"{name} must be strictly increasing")
            if a[0] != 0.0:
                raise InputError(f"{name} must start at 0; got {a[0]!r}")
            object.__setattr__(self, name, _frozen(a))

    @property
    def shape(self) -> tuple[int, int]:
        """(nr, nz): number of cells in r and z."""
        return self.r_faces.size - 1, self.z_faces.size - 1

    @property
    def outer_radius(self) -> float:
        """Outer radius of the domain [m]."""
        return float(self.r_faces[-1])

    @property
    def thickness(self) -> float:
        """Axial extent of the domain (electrode gap) [m]."""
        return float(self.z_faces[-1])

    @property
    def r(self) -> np.ndarray:
        """Radial cell centres [m], shape (nr,)."""
        return 0.5 * (self.r_faces[1:] + self.r_faces[:-1])

    @property
    def z(self) -> np.ndarray:
        """Axial cell centres [m], shape (nz,)."""
        return 0.5 * (self.z_faces[1:] + self.z_faces[:-1])

    @property
    def dr(self) -> np.ndarray:
        """Radial cell widths [m], shape (nr,)."""
        return np.diff(self.r_faces)

    @property
    def dz(self) -> np.ndarray:
        """Axial cell heights [m], shape (nz,)."""
        return np.diff(self.z_faces)

    @property
    def ring_area(self) -> np.ndarray:
        """Area of the annulus under each radial cell, pi (r+^2 - r-^2) [m^2], shape (nr,)."""
        return math.pi * (self.r_faces[1:] ** 2 - self.r_faces[:-1] ** 2)

    @property
    def volume(self) -> np.ndarray:
        """Cell volumes (rings) [m^3], shape (nr, nz)."""
        return np.outer(self.ring_area, self.dz)

    def centres(self) -> tuple[np.ndarray, np.ndarray]:
        """Cell-centre coordinates as two (nr, nz) arrays (R, Z) [m].

        Returns
        -------
        tuple of numpy.ndarray
            ``(R, Z)``, each of shape (nr, nz) [m].
        """
        return np.meshgrid(self.r, self.z, indexing="ij")

    @property
    def smallest_spacing(self) -> tuple[float, float]:
        """Smallest cell width in r and in z [m]."""
        return float(self.dr.min()), float(self.dz.min())

    def __repr__(self) -> str:
        hr, hz = self.smallest_spacing
        return (
            f"Grid({self.shape[0]} x {self.shape[1]} cells, R = {self.outer_radius:.4g} m, "
            f"d = {self.thickness:.4g} m, min spacing {hr:.3g} m x {hz:.3g} m)"
        )


def _distance(x: np.ndarray, focus: Sequence[tuple[float, float]]) -> np.ndarray:
    if not focus:  # no focus: uniform spacing
        return np.zeros_like(x)
    d = np.full_like(x, np.inf)
    for lo, hi in focus:
        d = np.minimum(d, np.maximum(np.maximum(lo - x, x - hi), 0.0))
    return d


def _check_focus(length: float, focus: Sequence[tuple[float, float]]) -> list[tuple[float, float]]:
    out = []
    try:
        items = list(focus)
    except TypeError:
        raise InputError(f"focus must be a sequence of (low, high) intervals; got {focus!r}") from None
    for k, item in enumerate(items):
        try:
            lo, hi = (float(v) for v in item)
        except (TypeError, ValueError):
            raise InputError(f"focus[{k}] must be a (low, high) pair of numbers; got {item!r}") from None
        if not (math.isfinite(lo) and math.isfinite(hi)) or hi < lo:
            raise InputError(f"focus[{k}] must be finite with low <= high; got {item!r}")
        out.append((min(max(lo, 0.0), length), min(max(hi, 0.0), length)))
    return out


def graded_faces(
    length: float,
    *,
    cells: int | None = None,
    fine: float | None = None,
    focus: Sequence[tuple[float, float]] = (),
    breaks: Sequence[float] = (),
    growth: float = 1.1,
    max_ratio: float = 30.0,
) -> np.ndarray:
    """Face positions on [0, length], fine near the focus intervals and graded geometrically away from them.

    Give exactly one of ``cells`` (total number of cells; the fine spacing is found by bisection) or ``fine``
    (the spacing inside the focus intervals). Without focus intervals the spacing is uniform.

    Parameters
    ----------
    length : float
        extent of the axis [m].
    cells : int, optional
        number of cells wanted [-].
    fine : float, optional
        spacing inside the focus intervals [m].
    focus : Sequence[tuple[float, float]], optional
        intervals (low, high) that get the fine spacing [m].
    breaks : Sequence[float], optional
        points strictly inside (0, length) that must be faces, e.g. layer interfaces [m].
    growth : float, optional
        ratio of neighbouring cell sizes away from the focus, in (1, 2] [-].
    max_ratio : float, optional
        largest ratio of the coarsest to the finest spacing, >= 1 [-].

    Returns
    -------
    numpy.ndarray
        Increasing face positions starting at 0 and ending at ``length`` [m].
    """
    length = check_positive("length", length, "m")
    growth = check_range("growth", growth, 1.0, 2.0, low_open=True)
    max_ratio = check_range("max_ratio", max_ratio, 1.0, 1e6)
    if (cells is None) == (fine is None):
        raise InputError("give exactly one of cells or fine")
    foc = _check_focus(length, focus)
    brk = sorted({float(check_range("breaks", b, 0.0, length, low_open=True, high_open=True)) for b in breaks})
    stops = np.array([0.0, *brk, length])
    x = np.unique(np.concatenate([np.linspace(0.0, length, _SAMPLES), stops]))
    dist = _distance(x, foc)

    def density(h0: float) -> np.ndarray:
        return 1.0 / np.minimum(h0 + (growth - 1.0) * dist, max_ratio * h0)

    def counts(h0: float) -> np.ndarray:
        w = density(h0)
        cum = np.concatenate([[0.0], np.cumsum(0.5 * (w[1:] + w[:-1]) * np.diff(x))])
        return cum

    if fine is not None:
        h0 = check_positive("fine", fine, "m")
        if h0 > length:
            raise InputError(f"fine must be <= length ({length:g} m); got {h0!r}")
        target = None
    else:
        target = check_int("cells", cells, 1, 10_000_000)
        if target < len(stops) - 1:
            raise InputError(f"cells must be >= {len(stops) - 1} (one per segment between breaks); got {target}")
        lo, hi = length * 1e-9, length * max_ratio
        for _ in range(200):
            mid = math.sqrt(lo * hi)
            if counts(mid)[-1] > target:
                lo = mid
            else:
                hi = mid
            if hi / lo < 1.0 + 1e-12:
                break
        h0 = hi
    cum = counts(h0)
    idx = np.searchsorted(x, stops)
    seg_counts = np.diff(cum[idx])
    n_seg = np.maximum(1, np.rint(seg_counts).astype(int))
    if target is not None:
        while n_seg.sum() != target:  # fix rounding: adjust the segment with the largest relative error
            err = (n_seg - seg_counts) / np.maximum(seg_counts, 1e-300)
            if n_seg.sum() > target:
                k = int(np.argmax(np.where(n_seg > 1, err, -np.inf)))
                n_seg[k] -= 1
            else:
                n_seg[k := int(np.argmin(err))] += 1
    faces = [np.array([0.0])]
    for s in range(len(stops) - 1):
        a, b = idx[s], idx[s + 1]
        c = cum[a : b + 1] - cum[a]
        targets = np.linspace(0.0, c[-1], n_seg[s] + 1)[1:]
        pts = np.interp(targets, c, x[a : b + 1])
        pts[-1] = stops[s + 1]
        faces.append(pts)
    f = np.concatenate(faces)
    if np.any(np.diff(f) <= 0.0):
        raise InputError("grid generation produced coincident faces; use fewer cells or a larger fine spacing")
    return f


def make_grid(
    outer_radius: float,
    thickness: float,
    *,
    cells: tuple[int, int] | None = None,
    fine: float | tuple[float, float] | None = None,
    focus_r: Sequence[tuple[float, float]] = (),
    focus_z: Sequence[tuple[float, float]] = (),
    breaks_z: Sequence[float] = (),
    growth: float = 1.1,
    max_ratio: float = 30.0,
) -> Grid:
    """A graded :class:`Grid` on [0, outer_radius] x [0, thickness].

    Parameters
    ----------
    outer_radius : float
        radius of the modelled disc [m].
    thickness : float
        electrode gap [m].
    cells : tuple[int, int], optional
        (nr, nz) numbers of cells [-]; or give ``fine``.
    fine : float or tuple[float, float], optional
        spacing in the focus intervals, one value or (r, z) [m].
    focus_r : Sequence[tuple[float, float]], optional
        radial intervals to refine [m].
    focus_z : Sequence[tuple[float, float]], optional
        axial intervals to refine [m].
    breaks_z : Sequence[float], optional
        axial positions that must be faces (layer interfaces) [m].
    growth : float, optional
        neighbour ratio of cell sizes away from the focus [-].
    max_ratio : float, optional
        largest coarse-to-fine spacing ratio [-].

    Returns
    -------
    Grid
        The grid.
    """
    if cells is not None:
        try:
            nr, nz = cells
        except (TypeError, ValueError):
            raise InputError(f"cells must be a pair (nr, nz); got {cells!r}") from None
        kw_r: dict = {"cells": nr}
        kw_z: dict = {"cells": nz}
    elif fine is not None:
        fr, fz = (fine, fine) if isinstance(fine, (int, float)) or np.ndim(fine) == 0 else tuple(fine)
        kw_r, kw_z = {"fine": fr}, {"fine": fz}
    else:
        raise InputError("give cells=(nr, nz) or fine=spacing")
    r_faces = graded_faces(outer_radius, focus=focus_r, growth=growth, max_ratio=max_ratio, **kw_r)
    z_faces = graded_faces(thickness, focus=focus_z, breaks=breaks_z, growth=growth, max_ratio=max_ratio, **kw_z)
    return Grid(r_faces, z_faces)
