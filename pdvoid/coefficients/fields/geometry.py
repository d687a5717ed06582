"""Axisymmetric shapes for the field solver, described by level-set functions.

Every shape is a region of the (r, z) half-plane (r >= 0, z measured from the ground electrode) with a function
``level(r, z)`` that is negative inside, positive outside and zero on the outline. The solver only needs that
sign and the position where it changes along a grid line, which :func:`crossing` finds by bisection; the level
function need not be a true distance.
"""

from __future__ import annotations

import math
from abc import ABC, abstractmethod
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from pdvoid.core.errors import InputError, check_array, check_positive, check_real

__all__ = ["Region", "Spheroid", "RoundedCylinder", "Rod", "Hyperboloid", "Slab", "Outline", "crossing"]


class Region(ABC):
    """An axisymmetric region: negative ``level`` inside."""

    @abstractmethod
    def level(self, r: np.ndarray, z: np.ndarray) -> np.ndarray:
        """Level-set value at (r, z): < 0 inside, > 0 outside [m or dimensionless].

        Parameters
        ----------
        r, z : numpy.ndarray
            Radial and axial coordinates, broadcast together [m].

        Returns
        -------
        numpy.ndarray
            The level value at each point [m or dimensionless]; only its sign and zero set matter.
        """

    @abstractmethod
    def bounds(self) -> tuple[float, float, float]:
        """(largest radius, lowest z, highest z) of the region [m].

        Returns
        -------
        tuple of float
            ``(r_max, z_low, z_high)`` [m].
        """

    def volume(self) -> float | None:
        """Exact volume where known [m^3], else None.

        Returns
        -------
        float or None
            The volume [m^3], or None when there is no closed form.
        """
        return None

    def smallest_feature(self) -> float:
        """A length that the grid must resolve (e.g. a height or a tip radius) [m].

        Returns
        -------
        float
            The length [m].
        """
        rmax, zlo, zhi = self.bounds()
        return min(rmax, zhi - zlo)

    def contains(self, r: np.ndarray, z: np.ndarray) -> np.ndarray:
        """True where (r, z) lies inside.

        Parameters
        ----------
        r, z : numpy.ndarray
            Radial and axial coordinates, broadcast together [m].

        Returns
        -------
        numpy.ndarray
            Boolean array, True inside (level < 0).
        """
        return self.level(np.asarray(r, float), np.asarray(z, float)) < 0.0


@dataclass(frozen=True)
class Spheroid(Region):
    """A spheroid on the axis (sphere when diameter == height).

    Attributes
    ----------
    diameter : float
        extent across the field (equatorial diameter 2a) [m].
    height : float
        extent along the field (polar diameter 2c) [m].
    center : float
        axial position of the centre above the ground electrode [m].
    """

    diameter: float
    height: float
    center: float

    def __post_init__(self) -> None:
        check_positive("diameter", self.diameter, "m")
        check_positive("height", self.height, "m")
        check_real("center", self.center)

    def level(self, r: np.ndarray, z: np.ndarray) -> np.ndarray:
        """Level-set value at (r, z): < 0 inside, > 0 outside [m or dimensionless].

        Parameters
        ----------
        r, z : numpy.ndarray
            Radial and axial coordinates, broadcast together [m].

        Returns
        -------
        numpy.ndarray
            The level value at each point [m or dimensionless]; only its sign and zero set matter.
        """
        a, c = 0.5 * self.diameter, 0.5 * self.height
        return (np.hypot(r / a, (z - self.center) / c) - 1.0) * min(a, c)

    def bounds(self) -> tuple[float, float, float]:
        """(largest radius, lowest z, highest z) of the region [m].

        Returns
        -------
        tuple of float
            ``(r_max, z_low, z_high)`` [m].
        """
        return 0.5 * self.diameter, self.center - 0.5 * self.height, self.center + 0.5 * self.height

    def volume(self) -> float:
        """Exact volume where known [m^3].

        Returns
        -------
        float
            The volume [m^3].
        """
        return math.pi / 6.0 * self.diameter**2 * self.height

    def smallest_feature(self) -> float:
        """A length that the grid must resolve (e.g. a height or a tip radius) [m].

        Returns
        -------
        float
            The length [m].
        """
        return min(self.diameter, self.height)


@dataclass(frozen=True)
class RoundedCylinder(Region):
    """A cylinder on the axis whose rim (edge) is rounded with a torus of radius ``rim_radius``.

    ``rim_radius == height / 2`` gives a disc with a fully rounded edge; ``rim_radius == height / 2 ==
    diameter / 2`` gives a sphere; ``rim_radius`` -> 0 gives a sharp-edged cylinder.

    Attributes
    ----------
    diameter : float
        cylinder diameter [m].
    height : float
        cylinder height along the field [m].
    center : float
        axial position of the centre above the ground electrode [m].
    rim_radius : float
        radius of the rounded edge, 0 < rim_radius <= min(height, diameter) / 2 [m].
    """

    diameter: float
    height: float
    center: float
    rim_radius: float

    def __post_init__(self) -> None:
        check_positive("diameter", self.diameter, "m")
        check_positive("height", self.height, "m")
        check_real("center", self.center)
        check_positive("rim_radius", self.rim_radius, "m")
        limit = 0.5 * min(self.height, self.diameter)
        if self.rim_radius > limit * (1.0 + 1e-12):
            raise InputError(f"rim_radius must be <= min(height, diameter)/2 = {limit:g} m; got {self.rim_radius!r}")

    def level(self, r: np.ndarray, z: np.ndarray) -> np.ndarray:
        """Level-set value at (r, z): < 0 inside, > 0 outside [m or dimensionless].

        Parameters
        ----------
        r, z : numpy.ndarray
            Radial and axial coordinates, broadcast together [m].

        Returns
        -------
        numpy.ndarray
            The level value at each point [m or dimensionless]; only its sign and zero set matter.
        """
        rho = self.rim_radius
        qx = r - 0.5 * self.diameter + rho
        qy = np.abs(z - self.center) - 0.5 * self.height + rho
        outside = np.hypot(np.maximum(qx, 0.0), np.maximum(qy, 0.0))
        return outside + np.minimum(np.maximum(qx, qy), 0.0) - rho

    def bounds(self) -> tuple[float, float, float]:
        """(largest radius, lowest z, highest z) of the region [m].

        Returns
        -------
        tuple of float
            ``(r_max, z_low, z_high)`` [m].
        """
        return 0.5 * self.diameter, self.center - 0.5 * self.height, self.center + 0.5 * self.height

    def volume(self) -> float:
        """Exact volume where known [m^3].

        Returns
        -------
        float
            The volume [m^3].
        """
        big_r, h, rho = 0.5 * self.diameter, self.height, self.rim_radius
        corner = (big_r - rho) * rho**2 * (1.0 - math.pi / 4.0) + rho**3 / 6.0  # Pappus, per corner / (2 pi)
        return math.pi * big_r**2 * h - 4.0 * math.pi * corner

    def smallest_feature(self) -> float:
        """A length that the grid must resolve (e.g. a height or a tip radius) [m].

        Returns
        -------
        float
            The length [m].
        """
        return min(self.height, self.diameter, 4.0 * self.rim_radius)


@dataclass(frozen=True)
class Rod(Region):
    """A rod of radius ``tip_radius`` on the axis with a hemispherical tip: a needle or protrusion.

    Attributes
    ----------
    tip_radius : float
        radius of the rod and of its hemispherical tip [m].
    apex : float
        axial position of the tip apex [m].
    upward : bool
        True if the rod body extends upward from the apex (attached to the upper electrode) [-].
    """

    tip_radius: float
    apex: float
    upward: bool = True

    def __post_init__(self) -> None:
        check_positive("tip_radius", self.tip_radius, "m")
        check_real("apex", self.apex)

    def level(self, r: np.ndarray, z: np.ndarray) -> np.ndarray:
        """Level-set value at (r, z): < 0 inside, > 0 outside [m or dimensionless].

        Parameters
        ----------
        r, z : numpy.ndarray
            Radial and axial coordinates, broadcast together [m].

        Returns
        -------
        numpy.ndarray
            The level value at each point [m or dimensionless]; only its sign and zero set matter.
        """
        rho = self.tip_radius
        s = (z - self.apex) if self.upward else (self.apex - z)  # distance beyond the apex into the body
        along = np.maximum(rho - s, 0.0)  # axial offset from the tip-sphere centre where below it
        return np.hypot(r, along) - rho

    def bounds(self) -> tuple[float, float, float]:
        """(largest radius, lowest z, highest z) of the region [m].

        Returns
        -------
        tuple of float
            ``(r_max, z_low, z_high)`` [m].
        """
        if self.upward:
            return self.tip_radius, self.apex, math.inf
        return self.tip_radius, -math.inf, self.apex

    def smallest_feature(self) -> float:
        """A length that the grid must resolve (e.g. a height or a tip radius) [m].

        Returns
        -------
        float
            The length [m].
        """
        return self.tip_radius


@dataclass(frozen=True)
class Hyperboloid(Region):
    """A hyperboloid-of-revolution point electrode above the ground plane z = 0, body extending upward.

    In prolate spheroidal coordinates with foci at z = ±f (ξ >= 1, 0 <= η <= 1, z = f ξ η) the plane z = 0 is
    η = 0 and this electrode is the region η >= η0, with apex f η0 = ``apex`` and apex radius of curvature
    f (1 − η0²)/η0 = ``tip_radius``. This is the geometry behind the handbook point-plane formula (see
    :func:`pdvoid.coefficients.fields.pointplane.hyperboloid_tip_field`).

    Attributes
    ----------
    tip_radius : float
        radius of curvature at the apex [m].
    apex : float
        gap between apex and ground plane [m].
    """

    tip_radius: float
    apex: float

    def __post_init__(self) -> None:
        check_positive("tip_radius", self.tip_radius, "m")
        check_positive("apex", self.apex, "m")

    @property
    def eta0(self) -> float:
        """η0 = sqrt(d / (d + r)) [-]."""
        return math.sqrt(self.apex / (self.apex + self.tip_radius))

    @property
    def focal_distance(self) -> float:
        """f = d / η0 [m]."""
        return self.apex / self.eta0

    def level(self, r: np.ndarray, z: np.ndarray) -> np.ndarray:
        """Level-set value at (r, z): < 0 inside, > 0 outside [m or dimensionless].

        Parameters
        ----------
        r, z : numpy.ndarray
            Radial and axial coordinates, broadcast together [m].

        Returns
        -------
        numpy.ndarray
            The level value at each point [m or dimensionless]; only its sign and zero set matter.
        """
        f = self.focal_distance
        eta = (np.hypot(r, z + f) - np.hypot(r, z - f)) / (2.0 * f)
        return (self.eta0 - eta) * f

    def bounds(self) -> tuple[float, float, float]:
        """(largest radius, lowest z, highest z) of the region [m].

        Returns
        -------
        tuple of float
            ``(r_max, z_low, z_high)`` [m].
        """
        return math.inf, self.apex, math.inf

    def smallest_feature(self) -> float:
        """A length that the grid must resolve (e.g. a height or a tip radius) [m].

        Returns
        -------
        float
            The length [m].
        """
        return self.tip_radius


@dataclass(frozen=True)
class Slab(Region):
    """All radii between two axial positions: a dielectric layer.

    Attributes
    ----------
    bottom : float
        lower face [m].
    top : float
        upper face, > bottom [m].
    """

    bottom: float
    top: float

    def __post_init__(self) -> None:
        check_real("bottom", self.bottom)
        check_real("top", self.top)
        if not self.top > self.bottom:
            raise InputError(f"Slab top must be > bottom; got bottom={self.bottom!r}, top={self.top!r}")

    def level(self, r: np.ndarray, z: np.ndarray) -> np.ndarray:
        """Level-set value at (r, z): < 0 inside, > 0 outside [m or dimensionless].

        Parameters
        ----------
        r, z : numpy.ndarray
            Radial and axial coordinates, broadcast together [m].

        Returns
        -------
        numpy.ndarray
            The level value at each point [m or dimensionless]; only its sign and zero set matter.
        """
        return np.maximum(self.bottom - z, z - self.top) + 0.0 * r

    def bounds(self) -> tuple[float, float, float]:
        """(largest radius, lowest z, highest z) of the region [m].

        Returns
        -------
        tuple of float
            ``(r_max, z_low, z_high)`` [m].
        """
        return math.inf, self.bottom, self.top

    def smallest_feature(self) -> float:
        """A length that the grid must resolve (e.g. a height or a tip radius) [m].

        Returns
        -------
        float
            The length [m].
        """
        return self.top - self.bottom


class Outline(Region):
    """Any closed outline in the (r, z) half-plane, given as a polygon (r >= 0), revolved about the axis.

    Points on the axis close the outline there. The level function is the signed distance to the polygon
    (negative inside by the even–odd rule).

    Parameters
    ----------
    r : array_like
        radial coordinates of the polygon vertices, >= 0 [m].
    z : array_like
        axial coordinates of the polygon vertices [m].
    """

    def __init__(self, r: npt.ArrayLike, z: npt.ArrayLike) -> None:
        rr = check_array("r", r, min_size=3)
        zz = check_array("z", z, min_size=3)
        if rr.shape != zz.shape:
            raise InputError(f"r and z must have the same length; got {rr.size} and {zz.size}")
        if np.any(rr < 0.0):
            raise InputError("r must be >= 0 everywhere (the outline lies in the half-plane r >= 0)")
        self.r0, self.z0 = rr, zz
        self.r1, self.z1 = np.roll(rr, -1), np.roll(zz, -1)
        area = 0.5 * np.sum(self.r0 * self.z1 - self.r1 * self.z0)
        if abs(area) <= 1e-14 * (np.ptp(rr) * np.ptp(zz) + 1e-300):
            raise InputError("the outline encloses no area")

    def level(self, r: np.ndarray, z: np.ndarray) -> np.ndarray:
        """Level-set value at (r, z): < 0 inside, > 0 outside [m or dimensionless].

        Parameters
        ----------
        r, z : numpy.ndarray
            Radial and axial coordinates, broadcast together [m].

        Returns
        -------
        numpy.ndarray
            The level value at each point [m or dimensionless]; only its sign and zero set matter.
        """
        r = np.asarray(r, float)
        z = np.asarray(z, float)
        shape = np.broadcast(r, z).shape
        pr = np.broadcast_to(r, shape).ravel()[:, None]
        pz = np.broadcast_to(z, shape).ravel()[:, None]
        ex, ez = self.r1 - self.r0, self.z1 - self.z0
        wx, wz = pr - self.r0, pz - self.z0
        t = np.clip((wx * ex + wz * ez) / np.maximum(ex * ex + ez * ez, 1e-300), 0.0, 1.0)
        dist = np.hypot(wx - t * ex, wz - t * ez).min(axis=1)
        cond = (self.z0 <= pz) != (self.z1 <= pz)
        with np.errstate(divide="ignore", invalid="ignore"):
            xcross = self.r0 + (pz - self.z0) * ex / np.where(ez == 0.0, 1.0, ez)
        inside = (np.count_nonzero(cond & (pr < xcross), axis=1) % 2) == 1
        return np.where(inside, -dist, dist).reshape(shape)

    def bounds(self) -> tuple[float, float, float]:
        """(largest radius, lowest z, highest z) of the region [m].

        Returns
        -------
        tuple of float
            ``(r_max, z_low, z_high)`` [m].
        """
        return float(self.r0.max()), float(self.z0.min()), float(self.z0.max())

    def volume(self) -> float:
        # Pappus: V = 2 pi * integral of r over the cross-section (Green's theorem on the polygon)
        """Exact volume where known [m^3].

        Returns
        -------
        float
            The volume [m^3].
        """
        a = self.r0 * self.z1 - self.r1 * self.z0
        return float(abs(np.sum(a * (self.r0 + self.r1)) / 6.0) * 2.0 * math.pi)

    def __repr__(self) -> str:
        return f"Outline({self.r0.size} vertices)"


def crossing(
    region: Region, r0: np.ndarray, z0: np.ndarray, r1: np.ndarray, z1: np.ndarray, iterations: int = 48
) -> np.ndarray:
    """Where the outline of ``region`` crosses the segments (r0, z0) -> (r1, z1).

    The level function must change sign between the two ends of every segment. Bisection.

    Parameters
    ----------
    region : Region
        The region whose outline is sought.
    r0, z0, r1, z1 : numpy.ndarray
        Segment ends [m].
    iterations : int, optional
        Bisection steps [-].

    Returns
    -------
    numpy.ndarray
        Fraction t in [0, 1] of the way from the first end to the crossing [-].
    """
    r0, z0, r1, z1 = (np.asarray(a, float) for a in (r0, z0, r1, z1))
    lo = np.zeros(r0.shape)
    hi = np.ones(r0.shape)
    s0 = region.level(r0, z0) < 0.0
    for _ in range(iterations):
        mid = 0.5 * (lo + hi)
        sm = region.level(r0 + mid * (r1 - r0), z0 + mid * (z1 - z0)) < 0.0
        same = sm == s0
        lo = np.where(same, mid, lo)
        hi = np.where(same, hi, mid)
    return 0.5 * (lo + hi)
