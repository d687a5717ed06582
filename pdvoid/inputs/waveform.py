"""Shape analysis of a periodic supply given as a Fourier series: monotone pieces and peak value."""

from __future__ import annotations

import numpy as np
from scipy.optimize import brentq

__all__ = ["monotone_breakpoints", "peak_value", "evaluate"]


def evaluate(phase_frac: np.ndarray, orders: np.ndarray, a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """V at fractions of the period [V]: Σ a_m sin(2π m x) + b_m cos(2π m x).

    Parameters
    ----------
    phase_frac : numpy.ndarray
        Fractions x of the period [-] (any shape).
    orders : numpy.ndarray
        Harmonic orders m [-].
    a, b : numpy.ndarray
        Sine and cosine amplitudes of each order [V].

    Returns
    -------
    numpy.ndarray
        The voltage at each fraction, shape of ``phase_frac`` [V].
    """
    x = np.asarray(phase_frac, dtype=float)[..., None] * (2.0 * np.pi * orders)
    return np.sum(a * np.sin(x) + b * np.cos(x), axis=-1)


def _slope(x: float, orders: np.ndarray, a: np.ndarray, b: np.ndarray) -> float:
    ph = 2.0 * np.pi * orders * x
    return float(np.sum(orders * (a * np.cos(ph) - b * np.sin(ph))))


def monotone_breakpoints(orders: np.ndarray, a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """Fractions of the period, 0 = x_0 < x_1 < ... < x_K = 1, with V monotone on each piece.

    The zeros of dV/dt are bracketed on a grid of 64 points per period of the highest harmonic (a trigonometric
    polynomial of order M has at most 2M zeros per period, so neighbouring zeros are far wider apart than this
    grid except at double roots, which do not change monotonicity) and refined with Brent's method.

    Parameters
    ----------
    orders : numpy.ndarray
        Harmonic orders m [-].
    a, b : numpy.ndarray
        Sine and cosine amplitudes of each order [V].

    Returns
    -------
    numpy.ndarray
        Increasing breakpoints from 0 to 1 [-].
    """
    m = int(np.max(orders))
    n = 64 * m
    x = np.arange(n + 1) / n
    d = np.array([_slope(xi, orders, a, b) for xi in x])
    cuts = [0.0]
    for i in range(n):
        if d[i] == 0.0 and 0 < i:
            cuts.append(float(x[i]))
        elif d[i] * d[i + 1] < 0.0:
            cuts.append(float(brentq(_slope, x[i], x[i + 1], args=(orders, a, b), xtol=1e-15, rtol=1e-15)))
    cuts.append(1.0)
    out = np.unique(np.array(cuts))
    return out[(out >= 0.0) & (out <= 1.0)]


def peak_value(orders: np.ndarray, a: np.ndarray, b: np.ndarray) -> float:
    """max over the period of |V| [V], taken at the breakpoints (the extrema of V).

    Parameters
    ----------
    orders : numpy.ndarray
        Harmonic orders m [-].
    a, b : numpy.ndarray
        Sine and cosine amplitudes of each order [V].

    Returns
    -------
    float
        The peak of |V| [V].
    """
    br = monotone_breakpoints(orders, a, b)
    return float(np.max(np.abs(evaluate(br, orders, a, b))))
