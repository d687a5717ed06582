"""Field lines and the streamer (ionisation-integral) criterion along them.

By linearity the field lines do not depend on the applied voltage, so one traced line of the 1 V solution
gives the ionisation integral ∫ α_eff(U |E_1V|) ds for every voltage U, and the lowest voltage at which it
reaches K follows from a one-dimensional root search.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.interpolate import RegularGridInterpolator
from scipy.ndimage import distance_transform_edt
from scipy.optimize import brentq

from pdvoid.coefficients.fields.geometry import Region, crossing
from pdvoid.coefficients.fields.maps import field_components, surface_field
from pdvoid.coefficients.fields.solver import FieldSolver, Potential
from pdvoid.core.errors import InputError, check_choice, check_positive, check_range, check_real
from pdvoid.core.units import ATM, T_ROOM

__all__ = ["FieldLine", "trace_field_line", "StreamerInception", "streamer_inception_voltage"]


@dataclass(frozen=True)
class FieldLine:
    """A field line through a start point, ordered by arc length.

    Attributes
    ----------
    r, z : numpy.ndarray
        points of the line [m].
    s : numpy.ndarray
        arc length from the first point [m].
    field : numpy.ndarray
        |E| at the points for the traced potential [V/m].
    start_index : int
        index of the start point [-].
    """

    r: np.ndarray
    z: np.ndarray
    s: np.ndarray
    field: np.ndarray
    start_index: int


class _Field:
    """Bilinear interpolation of (E_r, E_z) on cell centres; conductor cells take their nearest free value."""

    def __init__(self, potential: Potential) -> None:
        s = potential.solver
        er, ez = field_components(potential)
        cond = (s.assembly.cell_conductor >= 0).reshape(s.grid.shape)
        if cond.any():
            _, (ii, jj) = distance_transform_edt(cond, return_indices=True)
            er, ez = er[ii, jj], ez[ii, jj]
        pts = (s.grid.r, s.grid.z)
        self.er = RegularGridInterpolator(pts, er, bounds_error=False, fill_value=None)
        self.ez = RegularGridInterpolator(pts, ez, bounds_error=False, fill_value=None)
        self.rf, self.zf = s.grid.r_faces, s.grid.z_faces

    def __call__(self, r: float, z: float) -> tuple[float, float]:
        p = np.array([[max(r, 0.0), z]])
        return float(self.er(p)[0]), float(self.ez(p)[0])

    def spacing(self, r: float, z: float) -> float:
        i = min(max(int(np.searchsorted(self.rf, r)) - 1, 0), self.rf.size - 2)
        j = min(max(int(np.searchsorted(self.zf, z)) - 1, 0), self.zf.size - 2)
        return min(self.rf[i + 1] - self.rf[i], self.zf[j + 1] - self.zf[j])


def _walk(
    fld: _Field,
    r: float,
    z: float,
    sign: float,
    inside: Region | None,
    stops: list[Region],
    radius: float,
    height: float,
    max_length: float,
    step_factor: float,
) -> list[tuple[float, float]]:
    pts = []
    length = 0.0
    for _ in range(1_000_000):
        h = step_factor * fld.spacing(r, z)
        er, ez = fld(r, z)
        m = math.hypot(er, ez)
        if m == 0.0:
            break
        rm, zm = r + 0.5 * h * sign * er / m, z + 0.5 * h * sign * ez / m
        er2, ez2 = fld(rm, zm)
        m2 = math.hypot(er2, ez2)
        if m2 == 0.0:
            break
        rn, zn = r + h * sign * er2 / m2, z + h * sign * ez2 / m2
        rn = abs(rn)  # the axis is a symmetry line
        t = 1.0
        if zn < 0.0:
            t = min(t, z / (z - zn))
        if zn > height:
            t = min(t, (height - z) / (zn - z))
        if rn > radius:
            t = min(t, (radius - r) / (rn - r))
        for reg, leaving in ([(inside, True)] if inside is not None else []) + [(c, False) for c in stops]:
            a = reg.level(np.array(r), np.array(z)) < 0.0
            b = reg.level(np.array(rn), np.array(zn)) < 0.0
            if leaving and a and not b:  # leaving the confining region
                t = min(t, float(crossing(reg, np.array(r), np.array(z), np.array(rn), np.array(zn))))
            elif not leaving and b:  # entering (or staying in) a conductor
                t = 0.0 if a else min(t, float(crossing(reg, np.array(r), np.array(z), np.array(rn), np.array(zn))))
        if t <= 0.0:
            break
        rn, zn = r + t * (rn - r), z + t * (zn - z)
        length += t * h
        pts.append((rn, zn))
        r, z = rn, zn
        if t < 1.0 or length >= max_length:
            break
    return pts


def trace_field_line(
    potential: Potential,
    start: tuple[float, float],
    *,
    inside: Region | None = None,
    max_length: float | None = None,
    step_factor: float = 0.5,
) -> FieldLine:
    """Trace the field line through ``start`` in both directions (midpoint-rule steps of half a cell).

    The line stops at the electrodes, the outer radius, any conductor surface and, if ``inside`` is given, at
    that region's outline (crossings found by bisection).

    Parameters
    ----------
    potential : Potential
        a solved potential [V].
    start : tuple[float, float]
        (r, z) of the start point [m].
    inside : Region, optional
        keep the line inside this region (e.g. the void) [-].
    max_length : float, optional
        longest length traced in each direction; default the electrode gap [m].
    step_factor : float, optional
        step length as a fraction of the local cell size, in (0, 1] [-].

    Returns
    -------
    FieldLine
        The traced line with positions [m] and |E| along it [V/m].
    """
    if not isinstance(potential, Potential):
        raise InputError(f"potential must be a Potential; got {type(potential).__name__}")
    s = potential.solver
    try:
        r0, z0 = (check_real("start", v) for v in start)
    except TypeError:
        raise InputError(f"start must be an (r, z) pair; got {start!r}") from None
    if not (0.0 <= r0 <= s.grid.outer_radius and 0.0 <= z0 <= s.grid.thickness):
        raise InputError(f"start point {start!r} lies outside the domain")
    if inside is not None and not isinstance(inside, Region):
        raise InputError(f"inside must be a Region or None; got {inside!r}")
    length = s.grid.thickness if max_length is None else check_positive("max_length", max_length, "m")
    step = check_range("step_factor", step_factor, 0.0, 1.0, low_open=True)
    stops = [reg for reg, _ in s.layout.conductors] + [reg for reg, _ in s.layout.floating]
    fld = _Field(potential)
    args = (inside, stops, s.grid.outer_radius, s.grid.thickness, length, step)
    back = _walk(fld, r0, z0, -1.0, *args)[::-1]
    fwd = _walk(fld, r0, z0, 1.0, *args)
    pts = np.array(back + [(r0, z0)] + fwd)
    seg = np.hypot(np.diff(pts[:, 0]), np.diff(pts[:, 1]))
    keep = np.concatenate([[True], seg > 0.0])
    pts = pts[keep]
    arc = np.concatenate([[0.0], np.cumsum(np.hypot(np.diff(pts[:, 0]), np.diff(pts[:, 1])))])
    e = np.array([math.hypot(*fld(r, z)) for r, z in pts])
    start_index = int(np.count_nonzero(keep[: len(back) + 1]) - 1)
    return FieldLine(pts[:, 0], pts[:, 1], arc, e, start_index)


@dataclass(frozen=True)
class StreamerInception:
    """Lowest voltage at which the ionisation integral along a field line reaches K.

    Attributes
    ----------
    voltage : float
        voltage on the high-voltage electrode [V].
    line : FieldLine
        the field line of the 1 V solution used [-].
    avalanche_length : float
        length of the stretch with α_eff > 0 at that voltage [m].
    """

    voltage: float
    line: FieldLine
    avalanche_length: float


def _default_start(solver: FieldSolver, inside: Region | None) -> tuple[float, float]:
    unit = solver.unit("high")
    if inside is not None:
        rmax, zlo, zhi = inside.bounds()
        return 0.0, 0.5 * (max(zlo, 0.0) + min(zhi, solver.grid.thickness))
    best, where = -1.0, (0.0, 0.5 * solver.grid.thickness)
    names = sorted({name for _, name in solver.layout.conductors})
    for c in [*names, *range(len(solver.layout.floating))]:
        sf = surface_field(unit, c)
        if sf.maximum > best:
            best, where = sf.maximum, sf.where_maximum
    if best < 0.0:
        from pdvoid.coefficients.fields.maps import field_magnitude

        e = field_magnitude(unit)
        i, j = np.unravel_index(int(np.argmax(e)), e.shape)
        where = (float(solver.grid.r[i]), float(solver.grid.z[j]))
    return where


def streamer_inception_voltage(
    solver: FieldSolver,
    *,
    start: tuple[float, float] | None = None,
    inside: Region | str | None = None,
    k_streamer: float = 9.15,
    pressure: float = ATM,
    temperature: float = T_ROOM,
    gas: str = "air",
) -> StreamerInception:
    """Lowest high-voltage-electrode voltage at which ∫ α_eff ds along a field line reaches K.

    The line passes through ``start`` (default: the void centre when ``inside`` is given, else the largest
    conductor surface field, else the largest cell field); the integral runs over the contiguous stretch
    around the start where α_eff > 0 (the avalanche region), with pdvoid.physics.inception.streamer_integral.

    Parameters
    ----------
    solver : FieldSolver
        the factorised field problem [-].
    start : tuple[float, float], optional
        (r, z) of the start point [m].
    inside : Region or str, optional
        a Region, "void", or None: confine the line to it (a void's gas) [-].
    k_streamer : float, optional
        threshold K of the criterion [-]; 9.15 (avalanche of 1e4) by default.
    pressure : float, optional
        gas pressure [Pa].
    temperature : float, optional
        gas temperature [K].
    gas : str, optional
        "air" or "sf6" [-].

    Returns
    -------
    StreamerInception
        :class:`StreamerInception`.

    References
    ----------
    morrow1997 (α_eff of air, via pdvoid.physics.inception); the streamer criterion itself as in the
    physics brief §7 (Raether–Meek; K about 9.15-9.2 from mikropoulos2009, confirmed).
    """
    from pdvoid.physics.ionization import effective_ionization_air, sf6_effective_ionization, streamer_integral

    if not isinstance(solver, FieldSolver):
        raise InputError(f"solver must be a FieldSolver; got {type(solver).__name__}")
    k = check_range("k_streamer", k_streamer, 0.0, 100.0, low_open=True)
    p = check_positive("pressure", pressure, "Pa")
    temp = check_positive("temperature", temperature, "K")
    check_choice("gas", gas, ("air", "sf6"))
    if isinstance(inside, str):
        check_choice("inside", inside, ("void",))
        if solver.layout.void is None:
            raise InputError("inside='void' but the layout has no void")
        inside = solver.layout.void
    if start is None:
        start = _default_start(solver, inside)
    line = trace_field_line(solver.unit("high"), start, inside=inside)
    if line.s[-1] <= 0.0:
        raise InputError("the field line has zero length (start point on a boundary?)")

    def alpha(field: np.ndarray) -> np.ndarray:
        f = np.maximum(field, 1e-30)
        if gas == "air":
            return np.asarray(effective_ionization_air(f, p, temp))
        return np.asarray(sf6_effective_ionization(f, p, temp))

    def stretch(u: float) -> tuple[int, int]:
        pos = alpha(u * line.field) > 0.0
        i0 = line.start_index if pos[line.start_index] else int(np.argmax(line.field))
        if not pos[i0]:
            return i0, i0
        lo, hi = i0, i0
        while lo > 0 and pos[lo - 1]:
            lo -= 1
        while hi < pos.size - 1 and pos[hi + 1]:
            hi += 1
        return lo, hi

    def integral(u: float) -> float:
        lo, hi = stretch(u)
        if hi - lo < 1:
            return 0.0
        return float(
            streamer_integral(u * line.field[lo : hi + 1], line.s[lo : hi + 1], pressure=p, temperature=temp, gas=gas)
        )

    emax = float(line.field.max())
    if emax <= 0.0:
        raise InputError("the field is zero along the line")
    u_lo = 1e-3 / emax  # far below any critical field
    u_hi = 1e3 / emax
    while integral(u_hi) < k:
        u_hi *= 2.0
        if u_hi * emax > 1e12:
            raise InputError("the ionisation integral does not reach K along this line")
    while integral(u_lo) >= k:  # pragma: no cover - u_lo is far below the critical field
        u_lo *= 0.5
    u = brentq(lambda x: integral(x) - k, u_lo, u_hi, xtol=1e-12 * u_hi, rtol=1e-10)
    lo, hi = stretch(u)
    return StreamerInception(voltage=float(u), line=line, avalanche_length=float(line.s[hi] - line.s[lo]))
