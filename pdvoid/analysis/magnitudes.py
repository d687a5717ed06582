"""Weibull statistics of discharge magnitudes |q|: maximum-likelihood fits with confidence intervals, and
probability-plot points.

The fits are scipy's maximum-likelihood fits (``scipy.stats.weibull_min.fit``); this module adds the
selection of magnitudes by polarity, the confidence intervals and the checks.
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike
from scipy import stats

from pdvoid.analysis.patterns import EventSource, _stored_events
from pdvoid.core.errors import (
    InputError,
    check_array,
    check_choice,
    check_int,
    check_positive,
    check_range,
    check_real,
)
from pdvoid.simulation.events import Events
from pdvoid.simulation.results import Result

__all__ = [
    "WeibullFit",
    "weibull_fit",
    "weibull_probability_points",
    "weibull_log_likelihood_hessian",
]

_MIN_SAMPLES = {2: 5, 3: 10}


def _magnitudes(data: EventSource | ArrayLike, polarity: str, name: str = "magnitudes") -> np.ndarray:
    """Positive magnitudes [C] from events (selected by charge sign) or from an array of magnitudes."""
    pol = check_choice("polarity", polarity, ("+", "-", "both"))
    if isinstance(data, (Events, Result)):
        q = _stored_events(data).charge
        if pol == "+":
            return q[q > 0.0]
        if pol == "-":
            return -q[q < 0.0]
        return np.abs(q[q != 0.0])
    if isinstance(data, (str, bytes, dict)):
        kind = type(data).__name__
        raise InputError(f"{name} must be discharge events or an array of magnitudes [C]; got {kind}")
    if pol != "both":
        raise InputError(
            f"polarity={pol!r} needs discharge events (signed charges); an array of magnitudes takes "
            "polarity='both'"
        )
    x = check_array(name, data)
    if np.any(x <= 0.0):
        bad = int(np.argmax(x <= 0.0))
        raise InputError(f"{name} must be > 0 C everywhere (magnitudes |q|); entry {bad} is {x[bad]!r}")
    return x


def weibull_log_likelihood_hessian(
    magnitudes: np.ndarray, shape: float, scale: float, location: float = 0.0
) -> np.ndarray:
    """Analytic Hessian of the Weibull log-likelihood with respect to (shape, scale, location).

    With z_i = (x_i - location) / scale, w_i = z_i^shape and L_i = ln z_i, the log-likelihood is
    l = sum [ln shape - ln scale + (shape - 1) L_i - w_i]; the second derivatives follow by differentiation
    (derived here, checked against ``scipy.differentiate.hessian`` in the tests).

    Parameters
    ----------
    magnitudes : numpy.ndarray
        sample values x_i > location [C]
    shape : float
        Weibull shape beta > 0 [-]
    scale : float
        Weibull scale eta > 0 [C]
    location : float
        Weibull location gamma < min x_i [C]

    Returns
    -------
    numpy.ndarray
        3 x 3 array, order (shape, scale, location), units of l per product of parameter units.

    References
    ----------
    weibull1951: W. Weibull, 'A statistical distribution function of wide applicability', J. Appl. Mech.
    18 (1951) 293-297 (from memory); the density is scipy.stats.weibull_min's. Valid for x_i > location.
    """
    x = check_array("magnitudes", magnitudes, min_size=1)
    b = check_positive("shape", shape)
    e = check_positive("scale", scale, "C")
    g = check_real("location", location)
    d = x - g
    if np.any(d <= 0.0):
        raise InputError(f"location must be < min(magnitudes) = {x.min()!r}; got {g!r}")
    z = d / e
    L = np.log(z)
    w = z**b
    h = np.empty((3, 3))
    h[0, 0] = np.sum(-1.0 / b**2 - w * L**2)
    h[0, 1] = np.sum(-1.0 + w + b * w * L) / e
    h[1, 1] = -(b / e**2) * np.sum((w - 1.0) + b * w)
    h[0, 2] = np.sum((w + b * w * L - 1.0) / d)
    h[1, 2] = -(b**2 / e) * np.sum(w / d)
    h[2, 2] = -(b - 1.0) * np.sum((b * w + 1.0) / d**2)
    h[1, 0], h[2, 0], h[2, 1] = h[0, 1], h[0, 2], h[1, 2]
    return h


@dataclass(frozen=True)
class WeibullFit:
    """A Weibull fit F(q) = 1 - exp(-((q - location) / scale)^shape) of discharge magnitudes.

    Attributes
    ----------
    shape : float
        beta [-].
    scale : float
        alpha, the 63.2 % quantile above the location [C].
    location : float
        q0 [C]; 0 for a 2-parameter fit.
    shape_ci, scale_ci, location_ci : tuple[float, float]
        (low, high) confidence intervals; location_ci is (0, 0) for a
        2-parameter fit (fixed); NaN where no valid interval exists (see ``note``).
    n : int
        number of magnitudes fitted [-].
    parameters : int
        2 or 3.
    polarity : str
        "+", "-" or "both".
    confidence : float
        confidence level of the intervals [-].
    interval : str
        "fisher" or "bootstrap".
    note : str
        empty, or why an interval is NaN.
    """

    shape: float
    scale: float
    location: float
    shape_ci: tuple[float, float]
    scale_ci: tuple[float, float]
    location_ci: tuple[float, float]
    n: int
    parameters: int
    polarity: str
    confidence: float
    interval: str
    note: str = ""

    def cdf(self, charge: ArrayLike) -> np.ndarray:
        """Fitted cumulative probability at magnitudes ``charge`` (0 below the location).

        Parameters
        ----------
        charge : array_like
            Magnitudes |q| [C].

        Returns
        -------
        numpy.ndarray
            F(q) of the same shape [-].
        """
        q = check_array("charge", charge, ndim=np.ndim(charge))
        return stats.weibull_min.cdf(q, self.shape, loc=self.location, scale=self.scale)


def _fit(z: np.ndarray, parameters: int) -> tuple[float, float, float]:
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", RuntimeWarning)
        if parameters == 2:
            c, loc, sc = stats.weibull_min.fit(z, floc=0.0)
        else:
            c, loc, sc = stats.weibull_min.fit(z)
    return float(c), float(sc), float(loc)


def _fisher_intervals(
    z: np.ndarray, shape: float, scale: float, loc: float, parameters: int, zq: float
) -> tuple[list[tuple[float, float]], str]:
    nan = (math.nan, math.nan)
    if parameters == 3 and shape <= 2.0:
        return [nan, nan, nan], (
            "3-parameter fit with shape <= 2: the maximum-likelihood estimate is not regular (smith1985), "
            "so no Fisher interval is given; use interval='bootstrap'"
        )
    h = weibull_log_likelihood_hessian(z, shape, scale, loc)[:parameters, :parameters]
    try:
        cov = np.linalg.inv(-h)
    except np.linalg.LinAlgError:
        cov = np.full((parameters, parameters), np.nan)
    var = np.diag(cov)
    if not np.all(np.isfinite(var)) or np.any(var <= 0.0):
        return [nan, nan, nan], "observed information matrix is not positive definite; no Fisher interval"
    se = np.sqrt(var)
    out = [
        (shape * math.exp(-zq * se[0] / shape), shape * math.exp(zq * se[0] / shape)),
        (scale * math.exp(-zq * se[1] / scale), scale * math.exp(zq * se[1] / scale)),
        (loc - zq * float(se[2]), loc + zq * float(se[2])) if parameters == 3 else (0.0, 0.0),
    ]
    return out, ""


def weibull_fit(
    data: EventSource | ArrayLike,
    polarity: str = "both",
    parameters: int = 2,
    confidence: float = 0.95,
    *,
    interval: str = "fisher",
    n_resamples: int = 999,
    seed: int = 0,
) -> WeibullFit:
    """Maximum-likelihood Weibull fit of discharge magnitudes |q| with confidence intervals.

    Two-parameter CDF F(q) = 1 - exp[-(q/alpha)^beta] (alpha the scale, the 63.2 % quantile; beta the shape);
    three-parameter: q replaced by q - q0. Fit: ``scipy.stats.weibull_min.fit`` with ``floc=0`` (2 parameters)
    or free location (3 parameters), on magnitudes divided by their median (for numerical conditioning; shape
    is unchanged and scale and location are scaled back).

    Confidence intervals:
      - ``interval="fisher"`` (default): Wald intervals from the observed Fisher information (the analytic
        Hessian of the log-likelihood at the estimate, :func:`weibull_log_likelihood_hessian`), taken on the
        logarithm of shape and scale (so they stay positive) and linear for the location. Common practice for
        reliability data (meeker1998, from memory). For a 3-parameter fit they are given only when the shape
        exceeds 2, where the estimate is regular (smith1985, from memory); otherwise NaN with a ``note``.
      - ``interval="bootstrap"``: percentile bootstrap intervals from ``scipy.stats.bootstrap`` with
        ``n_resamples`` refits and a fixed ``seed`` (efron1993, from memory). Costs n_resamples fits.

    Parameters
    ----------
    data : Events or Result or array_like
        discharge events (a result, Events) or an array of magnitudes > 0 [C]
    polarity : str
        "+" (charge > 0), "-" (charge < 0) or "both" (all nonzero); arrays take "both" [-]
    parameters : int
        2 or 3 [-]
    confidence : float
        confidence level of the intervals, in (0, 1) [-]
    interval : str
        "fisher" or "bootstrap" [-]
    n_resamples : int
        bootstrap resamples, 10 ... 100000 [-]
    seed : int
        bootstrap random seed, >= 0 [-]

    Returns
    -------
    WeibullFit
        :class:`WeibullFit` (scale, location and their intervals in C).

    Raises
    ------
    InputError
        fewer than 5 (2-parameter) or 10 (3-parameter) magnitudes, all magnitudes equal,
        non-finite or non-positive magnitudes, bad options, or a fit that fails.

    References
    ----------
    weibull1951: W. Weibull, 'A statistical distribution function of wide applicability', J. Appl. Mech.
    18 (1951) 293-297 (from memory). cacciari1995 for its use on PD magnitudes (from memory).
    meeker1998: W. Q. Meeker, L. A. Escobar, Statistical Methods for Reliability Data, Wiley 1998 (normal-
    approximation intervals on the log scale; from memory). smith1985: R. L. Smith, 'Maximum likelihood
    estimation in a class of nonregular cases', Biometrika 72(1) (1985) 67-90 (from memory).
    efron1993: B. Efron, R. J. Tibshirani, An Introduction to the Bootstrap, Chapman & Hall 1993
    (percentile interval; from memory). Valid for independent magnitudes from one Weibull population; for
    mixed sources fit each source separately.
    """
    npar = check_int("parameters", parameters, 2, 3)
    conf = check_range("confidence", confidence, 0.0, 1.0, low_open=True, high_open=True)
    how = check_choice("interval", interval, ("fisher", "bootstrap"))
    nres = check_int("n_resamples", n_resamples, 10, 100_000)
    rng_seed = check_int("seed", seed, 0)
    x = _magnitudes(data, polarity, "data")
    need = _MIN_SAMPLES[npar]
    if x.size < need:
        raise InputError(f"a {npar}-parameter Weibull fit needs at least {need} magnitudes; got {x.size}")
    if np.all(x == x[0]):
        raise InputError(f"all {x.size} magnitudes are equal ({x[0]!r} C); a Weibull fit is undefined")

    s = float(np.median(x))
    z = x / s
    shape, scale, loc = _fit(z, npar)
    if not (math.isfinite(shape) and math.isfinite(scale) and math.isfinite(loc) and shape > 0 and scale > 0):
        raise InputError(f"the Weibull fit failed (shape={shape!r}, scale={scale!r}, location={loc!r})")
    if npar == 3 and not loc < z.min():
        raise InputError("the 3-parameter Weibull fit put the location above the smallest magnitude")

    zq = float(stats.norm.ppf(0.5 + conf / 2.0))
    note = ""
    if how == "fisher":
        cis, note = _fisher_intervals(z, shape, scale, loc, npar, zq)
    else:
        def statistic(sample: np.ndarray) -> np.ndarray:
            c, e, g = _fit(sample, npar)
            return np.array([c, e, g])

        res = stats.bootstrap(
            (z,), statistic, vectorized=False, n_resamples=nres, method="percentile",
            confidence_level=conf, rng=np.random.default_rng(rng_seed),
        )
        lo, hi = res.confidence_interval.low, res.confidence_interval.high
        cis = [(float(lo[i]), float(hi[i])) for i in range(3)]
        if npar == 2:
            cis[2] = (0.0, 0.0)

    def back(ci: tuple[float, float]) -> tuple[float, float]:
        return (float(ci[0]) * s, float(ci[1]) * s)

    return WeibullFit(
        shape=shape,
        scale=scale * s,
        location=loc * s if npar == 3 else 0.0,
        shape_ci=cis[0],
        scale_ci=back(cis[1]),
        location_ci=back(cis[2]),
        n=int(x.size),
        parameters=npar,
        polarity=polarity,
        confidence=conf,
        interval=how,
        note=note,
    )


def weibull_probability_points(
    data: EventSource | ArrayLike, polarity: str = "both", *, linearized: bool = False
) -> tuple[np.ndarray, np.ndarray]:
    """Points for a Weibull probability plot: sorted magnitudes and their median-rank probabilities.

    The i-th smallest of n magnitudes (i = 1 ... n) gets the median rank F_i = (i - 0.3) / (n + 0.4)
    (Benard's approximation, often called Bernard's; common practice in Weibull analysis). On Weibull paper,
    ln(-ln(1 - F)) against ln q is a straight line of slope beta for a 2-parameter Weibull sample.

    Parameters
    ----------
    data : Events or Result or array_like
        discharge events or an array of magnitudes > 0 [C]
    polarity : str
        "+", "-" or "both" (arrays: "both") [-]
    linearized : bool
        if True return (ln(q / 1 C), ln(-ln(1 - F))) instead of (q, F) [-]

    Returns
    -------
    tuple[numpy.ndarray, numpy.ndarray]
        (x, y): magnitudes q [C] and probabilities F [-], or their linearized forms [-].

    Raises
    ------
    InputError
        no magnitudes, or bad magnitudes or options.

    References
    ----------
    benard1953: A. Benard, E. C. Bos-Levenbach, 'Het uitzetten van waarnemingen op waarschijnlijkheids-
    papier', Statistica Neerlandica 7 (1953) 163-173 (median-rank approximation; from memory; common
    practice). Valid for a complete (uncensored) sample.
    """
    x = np.sort(_magnitudes(data, polarity, "data"))
    n = x.size
    if n == 0:
        raise InputError(f"no magnitudes to plot for polarity={polarity!r}")
    if not isinstance(linearized, (bool, np.bool_)):
        raise InputError(f"linearized must be True or False; got {linearized!r}")
    f = (np.arange(1, n + 1) - 0.3) / (n + 0.4)
    if linearized:
        return np.log(x), np.log(-np.log1p(-f))
    return x, f
