"""A population of voids per part, as a process study or a CT scan of sample parts would give it.

Sizes: either a list of measured void diameters (each void of a part is drawn from the list with replacement, so
the list stands for the size distribution), or a log-normal distribution truncated to a stated range (the largest
size must be stated, so no void is drawn that cannot fit the insulation). Count: the number of voids per part is
Poisson-distributed with the given mean (voids scattered independently through the material: the standard model
of randomly placed defects) or fixed. Shape: every void has the height ``aspect_ratio`` × diameter and the gas,
pressure, position and shape of the design's void.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from pdvoid.core.errors import InputError, check_array, check_choice, check_positive, check_range

__all__ = ["VoidPopulation", "COUNT_KINDS", "MAX_VOIDS_PER_PART"]

#: how the number of voids per part is distributed
COUNT_KINDS = ("poisson", "fixed")
#: largest mean (or fixed) number of voids per part [-]
MAX_VOIDS_PER_PART = 1000.0


@dataclass(frozen=True, eq=False)
class VoidPopulation:
    """The voids of one part, as a distribution over parts.

    Give either ``diameters`` (a list of measured sizes) or ``median_diameter``, ``sigma`` and ``largest`` (a
    truncated log-normal distribution).

    Attributes
    ----------
    voids_per_part : float
        Mean number of voids per part [-], 0 to 1000 (a whole number when ``count`` is "fixed").
    diameters : tuple of float or None
        Measured void diameters [m], 1 to 100000 values, each 0.1 µm to 1 m.
    median_diameter : float or None
        Median of the log-normal distribution of diameters [m].
    sigma : float or None
        Standard deviation of the natural logarithm of the diameter [-], 0.01 to 5.
    smallest, largest : float or None
        The log-normal distribution truncated to [smallest, largest] [m]; ``largest`` required, ``smallest``
        defaults to 0.1 µm (the smallest void pdvoid accepts).
    count : str
        "poisson" (default) or "fixed".
    aspect_ratio : float or None
        Height / diameter of every void [-], 0.01 to 100; None: that of the design's void.

    Raises
    ------
    pdvoid.InputError
        For a missing or contradictory choice of sizes, or a value outside its range.
    """

    voids_per_part: float
    diameters: tuple[float, ...] | None = None
    median_diameter: float | None = None
    sigma: float | None = None
    smallest: float | None = None
    largest: float | None = None
    count: str = "poisson"
    aspect_ratio: float | None = None

    def __post_init__(self) -> None:
        lam = check_range("voids_per_part", self.voids_per_part, 0.0, MAX_VOIDS_PER_PART)
        object.__setattr__(self, "voids_per_part", lam)
        check_choice("count", self.count, COUNT_KINDS)
        if self.count == "fixed" and lam != math.floor(lam):
            raise InputError(f"voids_per_part must be a whole number when count is 'fixed'; got {lam!r}")
        lognormal = (self.median_diameter, self.sigma, self.largest)
        if self.diameters is not None:
            if any(v is not None for v in (*lognormal, self.smallest)):
                raise InputError("give either diameters (a list of sizes) or median_diameter, sigma and largest "
                                 "(a log-normal distribution), not both")
            d = check_array("diameters", self.diameters, min_size=1, max_size=100_000)
            if d.ndim != 1 or d.min() < 1e-7 or d.max() > 1.0:
                raise InputError(f"diameters must be a list of sizes from 1e-07 m to 1 m; got values from "
                                 f"{d.min()!r} to {d.max()!r} m")
            object.__setattr__(self, "diameters", tuple(float(x) for x in d))
        else:
            if any(v is None for v in lognormal):
                raise InputError("a log-normal population needs median_diameter [m], sigma [-] and largest [m] "
                                 "(the largest size drawn; it must fit the insulation); or give diameters instead")
            object.__setattr__(self, "median_diameter",
                               check_range("median_diameter", self.median_diameter, 1e-7, 1.0, unit="m"))
            object.__setattr__(self, "sigma", check_range("sigma", self.sigma, 0.01, 5.0))
            lo = 1e-7 if self.smallest is None else check_range("smallest", self.smallest, 1e-7, 1.0, unit="m")
            hi = check_range("largest", self.largest, 1e-7, 1.0, unit="m")
            if not lo < hi:
                raise InputError(f"smallest must be below largest; got {lo!r} m and {hi!r} m")
            object.__setattr__(self, "smallest", lo)
            object.__setattr__(self, "largest", hi)
        if self.aspect_ratio is not None:
            object.__setattr__(self, "aspect_ratio", check_range("aspect_ratio", self.aspect_ratio, 0.01, 100.0))

    @property
    def kind(self) -> str:
        """"sizes" (a list of diameters) or "lognormal"."""
        return "sizes" if self.diameters is not None else "lognormal"

    @property
    def largest_diameter(self) -> float:
        """The largest diameter the population can hold [m]."""
        if self.diameters is not None:
            return max(self.diameters)
        return float(self.largest)  # type: ignore[arg-type]  # set in __post_init__

    def fraction_below(self, diameter: float) -> float:
        """The share of voids with a diameter strictly below ``diameter`` (the size distribution function).

        Parameters
        ----------
        diameter : float
            The size [m], > 0.

        Returns
        -------
        float
            The share [-], 0 to 1: the fraction of listed sizes below it, or the truncated log-normal
            distribution function.
        """
        d = check_positive("diameter", diameter, "m")
        if self.diameters is not None:
            return float(np.count_nonzero(np.asarray(self.diameters) < d)) / len(self.diameters)
        from scipy.special import ndtr

        lo, hi = self._bounds()
        mu, s = math.log(float(self.median_diameter)), float(self.sigma)  # type: ignore[arg-type]
        c_lo, c_hi = ndtr((math.log(lo) - mu) / s), ndtr((math.log(hi) - mu) / s)
        c = ndtr((math.log(min(max(d, lo), hi)) - mu) / s)
        return float((c - c_lo) / (c_hi - c_lo))

    def _bounds(self) -> tuple[float, float]:
        return float(self.smallest), float(self.largest)  # type: ignore[arg-type]  # set in __post_init__

    def draw_diameters(self, rng: np.random.Generator, n: int) -> np.ndarray:
        """``n`` void diameters drawn from the population.

        Parameters
        ----------
        rng : numpy.random.Generator
            The generator.
        n : int
            How many [-].

        Returns
        -------
        numpy.ndarray
            Diameters [m]: drawn from the list with replacement, or from the truncated log-normal distribution by
            inverting its distribution function (uniform draws between its values at the bounds).
        """
        if self.diameters is not None:
            return np.asarray(self.diameters)[rng.integers(0, len(self.diameters), size=n)]
        from scipy.special import ndtr, ndtri

        lo, hi = self._bounds()
        mu, s = math.log(float(self.median_diameter)), float(self.sigma)  # type: ignore[arg-type]
        u = rng.uniform(ndtr((math.log(lo) - mu) / s), ndtr((math.log(hi) - mu) / s), size=n)
        return np.clip(np.exp(mu + s * ndtri(u)), lo, hi)  # clip: rounding of exp(log(x)) at the bounds only

    def draw_counts(self, rng: np.random.Generator, parts: int) -> np.ndarray:
        """The number of voids of each of ``parts`` parts.

        Parameters
        ----------
        rng : numpy.random.Generator
            The generator.
        parts : int
            How many parts [-].

        Returns
        -------
        numpy.ndarray
            Counts, int64 [-].
        """
        if self.count == "fixed":
            return np.full(parts, int(self.voids_per_part), dtype=np.int64)
        return rng.poisson(self.voids_per_part, size=parts).astype(np.int64)

    def no_void_at_or_above(self, diameter: float) -> float:
        """Probability that a part holds no void of ``diameter`` or larger.

        Poisson count with mean λ: exp(-λ (1 - F)), F the share below ``diameter`` (thinning of a Poisson
        process); fixed count n: F^n.

        Parameters
        ----------
        diameter : float
            The size [m].

        Returns
        -------
        float
            The probability [-].
        """
        f = self.fraction_below(diameter)
        if self.count == "fixed":
            return f ** int(self.voids_per_part)
        return math.exp(-self.voids_per_part * (1.0 - f))
