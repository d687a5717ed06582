"""Statistical descriptors of phase-resolved distributions after Gulski & Kreuger; the pattern fingerprint.

All definitions are quoted from the project's physics brief, section 10, which recalls them from Gulski &
Kreuger (gulski1992), Gulski (gulski1993) and Gulski (gulski1995) **from memory** (not checked against the
papers). Undefined values (no pulses in a half, zero spread, division by zero) are returned as NaN, never
guessed.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike
from scipy.signal import find_peaks

from pdvoid.analysis.patterns import (
    DISTRIBUTION_NAMES,
    HALVES,
    EventSource,
    _half_split,
    _stored_events,
    half_cycle_distributions,
)
from pdvoid.core.errors import InputError, check_array, check_int

__all__ = [
    "skewness",
    "kurtosis",
    "number_of_peaks",
    "discharge_asymmetry",
    "phase_asymmetry",
    "cross_correlation",
    "modified_cross_correlation",
    "fingerprint",
    "FINGERPRINT_NAMES",
]

def _distribution(x: ArrayLike, y: ArrayLike) -> tuple[np.ndarray, np.ndarray]:
    xa = check_array("x", x, min_size=1)
    ya = check_array("y", y, min_size=1)
    if xa.shape != ya.shape:
        raise InputError(f"x and y must have the same length; got {xa.size} and {ya.size}")
    if np.any(ya < 0.0):
        bad = int(np.argmax(ya < 0))
        raise InputError(f"y must be >= 0 everywhere (it is a weight); entry {bad} is {ya[bad]!r}")
    return xa, ya


def _moments(x: np.ndarray, y: np.ndarray) -> tuple[float, float, np.ndarray, float]:
    """(sum of weights, sigma, x - mu, ...) with the brief's weighted definitions."""
    w = float(y.sum())
    if w == 0.0:
        return 0.0, math.nan, x, math.nan
    mu = float(np.sum(x * y) / w)
    d = x - mu
    var = float(np.sum(d**2 * y) / w)
    return w, math.sqrt(var), d, mu


def skewness(x: ArrayLike, y: ArrayLike) -> float:
    """Skewness Sk of a distribution y(x), the values y_i taken as weights of the points x_i.

    Definition: mu = sum x_i y_i / sum y_i ; sigma^2 = sum (x_i - mu)^2 y_i / sum y_i ;
    Sk = sum (x_i - mu)^3 y_i / (sigma^3 sum y_i). Sk = 0 for a symmetric shape, > 0 for a tail to larger x.
    NaN if sum y_i = 0 or sigma = 0.

    Parameters
    ----------
    x : array_like
        window centres x_i (phase [deg], or any abscissa) [deg]
    y : array_like
        distribution values y_i >= 0 (counts or magnitudes) [-]

    Returns
    -------
    float
        Sk [-].

    References
    ----------
    gulski1992: E. Gulski, F. H. Kreuger, 'Computer-aided recognition of discharge sources', IEEE Trans.
    Electr. Insul. 27(1) (1992) 82-92; gulski1993: E. Gulski, 'Computer-aided measurement of partial
    discharges in HV equipment', IEEE Trans. Electr. Insul. 28(6) (1993) 969-983.
    Definition as quoted in the physics brief section 10 (from memory).
    Valid for any distribution with sum y_i > 0; no physical assumption.
    """
    xa, ya = _distribution(x, y)
    w, sigma, d, _ = _moments(xa, ya)
    if w == 0.0 or not sigma > 0.0:
        return math.nan
    return float(np.sum(d**3 * ya) / (sigma**3 * w))


def kurtosis(x: ArrayLike, y: ArrayLike) -> float:
    """Excess kurtosis Ku of a distribution y(x), the values y_i taken as weights of the points x_i.

    Definition: Ku = sum (x_i - mu)^4 y_i / (sigma^4 sum y_i) - 3, with mu and sigma as in :func:`skewness`;
    Ku = 0 for a normal shape, > 0 for a sharper one. NaN if sum y_i = 0 or sigma = 0.

    Parameters
    ----------
    x : array_like
        window centres x_i [deg]
    y : array_like
        distribution values y_i >= 0 [-]

    Returns
    -------
    float
        Ku [-].

    References
    ----------
    gulski1992: E. Gulski, F. H. Kreuger, 'Computer-aided recognition of discharge sources', IEEE Trans.
    Electr. Insul. 27(1) (1992) 82-92; gulski1993: E. Gulski, 'Computer-aided measurement of partial
    discharges in HV equipment', IEEE Trans. Electr. Insul. 28(6) (1993) 969-983.
    Definition as quoted in the physics brief section 10 (from memory).
    Valid for any distribution with sum y_i > 0; no physical assumption.
    """
    xa, ya = _distribution(x, y)
    w, sigma, d, _ = _moments(xa, ya)
    if w == 0.0 or not sigma > 0.0:
        return math.nan
    return float(np.sum(d**4 * ya) / (sigma**4 * w) - 3.0)


def number_of_peaks(y: ArrayLike) -> int:
    """Number of peaks Pe: the number of local maxima over the windows, where dy/dx changes sign from + to -.

    A flat top (equal neighbouring values) counts once when y rises before it and falls after it; a maximum in
    the first or last window does not count (dy/dx does not change sign there). Computed with
    ``scipy.signal.find_peaks``.

    Parameters
    ----------
    y : array_like
        distribution values over consecutive windows [-]

    Returns
    -------
    int
        Pe [-].

    References
    ----------
    gulski1992: E. Gulski, F. H. Kreuger, 'Computer-aided recognition of discharge sources', IEEE Trans.
    Electr. Insul. 27(1) (1992) 82-92; gulski1993: E. Gulski, 'Computer-aided measurement of partial
    discharges in HV equipment', IEEE Trans. Electr. Insul. 28(6) (1993) 969-983.
    Definition as quoted in the physics brief section 10 (from memory).
    Valid for any sequence; no physical assumption.
    """
    ya = check_array("y", y, min_size=1)
    return int(find_peaks(ya)[0].size)


def _half_means(events: EventSource) -> dict[str, tuple[int, float]]:
    split = _half_split(_stored_events(events))
    return {h: (int(m.size), float(m.sum())) for h, (_, m) in split.items()}


def discharge_asymmetry(events: EventSource) -> float:
    """Discharge asymmetry Q = (Q_s- / N-) / (Q_s+ / N+), the ratio of mean magnitudes in the two half cycles.

    Q_s is the sum of magnitudes |q| and N the pulse count in the "-" (180-360 deg) and "+" (0-180 deg)
    voltage half cycles. NaN if either half holds no pulse. Zero-charge events are left out.

    Parameters
    ----------
    events : Events or Result
        discharge events or a result holding them [-]

    Returns
    -------
    float
        Q [-].

    References
    ----------
    gulski1992: E. Gulski, F. H. Kreuger, 'Computer-aided recognition of discharge sources', IEEE Trans.
    Electr. Insul. 27(1) (1992) 82-92; gulski1993: E. Gulski, 'Computer-aided measurement of partial
    discharges in HV equipment', IEEE Trans. Electr. Insul. 28(6) (1993) 969-983.
    Definition as quoted in the physics brief section 10 (from memory).
    Valid for any event set; no physical assumption.
    """
    h = _half_means(events)
    (n_p, s_p), (n_m, s_m) = h["+"], h["-"]
    if n_p == 0 or n_m == 0:
        return math.nan
    return (s_m / n_m) / (s_p / n_p)


def phase_asymmetry(events: EventSource) -> float:
    """Phase asymmetry Phi = phi_in- / phi_in+, the ratio of the inception phases of the first PD per half.

    phi_in+ is the smallest phase of a pulse in the "+" half (0-180 deg); phi_in- the smallest phase of a
    pulse in the "-" half, measured from 180 deg. "First" is taken as earliest in the half cycle (smallest
    phase over all cycles). NaN if either half holds no pulse or phi_in+ = 0. Zero-charge events are left out.

    Parameters
    ----------
    events : Events or Result
        discharge events or a result holding them [-]

    Returns
    -------
    float
        Phi [-].

    References
    ----------
    gulski1992: E. Gulski, F. H. Kreuger, 'Computer-aided recognition of discharge sources', IEEE Trans.
    Electr. Insul. 27(1) (1992) 82-92; gulski1993: E. Gulski, 'Computer-aided measurement of partial
    discharges in HV equipment', IEEE Trans. Electr. Insul. 28(6) (1993) 969-983.
    Definition as quoted in the physics brief section 10 (from memory).
    Valid for any event set; no physical assumption.
    """
    split = _half_split(_stored_events(events))
    p_plus, p_minus = split["+"][0], split["-"][0]
    if p_plus.size == 0 or p_minus.size == 0:
        return math.nan
    first_plus = float(p_plus.min())
    if first_plus == 0.0:
        return math.nan
    return float(p_minus.min()) / first_plus


def cross_correlation(y_plus: ArrayLike, y_minus: ArrayLike) -> float:
    """Cross-correlation factor cc between two distributions over the same n windows (Pearson correlation).

    Definition: cc = [sum x y - sum x sum y / n] / sqrt([sum x^2 - (sum x)^2 / n] [sum y^2 - (sum y)^2 / n]),
    with x = H_qn+ and y = H_qn- in window i (any pair of distributions may be given). cc = 1 for identical
    shapes. NaN if either distribution is constant.

    Parameters
    ----------
    y_plus : array_like
        distribution over the "+" half, one value per window [-]
    y_minus : array_like
        distribution over the "-" half, same windows [-]

    Returns
    -------
    float
        cc in [-1, 1] [-].

    References
    ----------
    gulski1992: E. Gulski, F. H. Kreuger, 'Computer-aided recognition of discharge sources', IEEE Trans.
    Electr. Insul. 27(1) (1992) 82-92; gulski1993: E. Gulski, 'Computer-aided measurement of partial
    discharges in HV equipment', IEEE Trans. Electr. Insul. 28(6) (1993) 969-983.
    Definition as quoted in the physics brief section 10 (from memory).
    Valid for any pair of distributions; no physical assumption.
    """
    x = check_array("y_plus", y_plus, min_size=2)
    y = check_array("y_minus", y_minus, min_size=2)
    if x.shape != y.shape:
        raise InputError(f"y_plus and y_minus must have the same length; got {x.size} and {y.size}")
    n = x.size
    sxx = float(np.sum(x * x) - np.sum(x) ** 2 / n)
    syy = float(np.sum(y * y) - np.sum(y) ** 2 / n)
    sxy = float(np.sum(x * y) - np.sum(x) * np.sum(y) / n)
    if not (sxx > 0.0 and syy > 0.0):
        return math.nan
    return float(np.clip(sxy / math.sqrt(sxx * syy), -1.0, 1.0))


def modified_cross_correlation(events: EventSource, phase_windows: int = 18) -> float:
    """Modified cross-correlation mcc = Q * Phi * cc.

    Q is :func:`discharge_asymmetry`, Phi :func:`phase_asymmetry` and cc :func:`cross_correlation` of H_qn+
    and H_qn- over ``phase_windows`` windows per half cycle. NaN if any factor is undefined.

    Parameters
    ----------
    events : Events or Result
        discharge events or a result holding them [-]
    phase_windows : int
        number of equal windows per half cycle [-]

    Returns
    -------
    float
        mcc [-].

    References
    ----------
    gulski1992: E. Gulski, F. H. Kreuger, 'Computer-aided recognition of discharge sources', IEEE Trans.
    Electr. Insul. 27(1) (1992) 82-92; gulski1993: E. Gulski, 'Computer-aided measurement of partial
    discharges in HV equipment', IEEE Trans. Electr. Insul. 28(6) (1993) 969-983.
    Definition as quoted in the physics brief section 10 (from memory).
    Valid for any event set; no physical assumption.
    """
    d = half_cycle_distributions(events, phase_windows)
    cc = cross_correlation(d.qn_plus, d.qn_minus)
    return discharge_asymmetry(events) * phase_asymmetry(events) * cc


def _names() -> tuple[str, ...]:
    names = []
    for dist in DISTRIBUTION_NAMES:
        for stat in ("skewness", "kurtosis", "peaks"):
            for half in HALVES:
                names.append(f"{stat} {dist}{half}")
    names += ["discharge asymmetry", "phase asymmetry", "cross-correlation", "modified cross-correlation"]
    return tuple(names)


#: The fixed order of :func:`fingerprint`: for each of H_n, H_qn, H_qmax the skewness, kurtosis and number of
#: peaks of the "+" then the "-" half; then Q, Phi, cc (of H_qn) and mcc. 22 entries.
FINGERPRINT_NAMES: tuple[str, ...] = _names()


def fingerprint(events: EventSource, phase_windows: int = 18) -> dict[str, float]:
    """Descriptor vector of a pattern: {descriptor name: value} in the fixed order :data:`FINGERPRINT_NAMES`.

    Entries: "skewness H_n+", "skewness H_n-", "kurtosis H_n+", "kurtosis H_n-", "peaks H_n+", "peaks H_n-",
    the same six for H_qn and for H_qmax, then "discharge asymmetry" (Q), "phase asymmetry" (Phi),
    "cross-correlation" (cc of H_qn+ and H_qn-) and "modified cross-correlation" (mcc). Skewness and kurtosis
    use the window centres x_i (deg, 0-180) as abscissa. Undefined entries (for instance no pulses in a half)
    are NaN. All values are floats (peak counts too), dimensionless.

    Parameters
    ----------
    events : Events or Result
        discharge events or a result holding them [-]
    phase_windows : int
        number of equal windows per half cycle, >= 2 (18 gives 10 deg windows) [-]

    Returns
    -------
    dict[str, float]
        dict of 22 floats.

    References
    ----------
    gulski1992: E. Gulski, F. H. Kreuger, 'Computer-aided recognition of discharge sources', IEEE Trans.
    Electr. Insul. 27(1) (1992) 82-92; gulski1993: E. Gulski, 'Computer-aided measurement of partial
    discharges in HV equipment', IEEE Trans. Electr. Insul. 28(6) (1993) 969-983.
    Definition as quoted in the physics brief section 10 (from memory).
    Valid for any event set; no physical assumption.
    """
    ev = _stored_events(events)
    nw = check_int("phase_windows", phase_windows, 2, 100_000)
    d = half_cycle_distributions(ev, nw)
    x = d.window_centres_deg
    out: dict[str, float] = {}
    for dist in DISTRIBUTION_NAMES:
        ys = {h: d.get(dist, h) for h in HALVES}
        for h in HALVES:
            out[f"skewness {dist}{h}"] = skewness(x, ys[h])
        for h in HALVES:
            out[f"kurtosis {dist}{h}"] = kurtosis(x, ys[h])
        for h in HALVES:
            out[f"peaks {dist}{h}"] = float(number_of_peaks(ys[h]))
    q = discharge_asymmetry(ev)
    phi = phase_asymmetry(ev)
    cc = cross_correlation(d.qn_plus, d.qn_minus)
    out["discharge asymmetry"] = q
    out["phase asymmetry"] = phi
    out["cross-correlation"] = cc
    out["modified cross-correlation"] = q * phi * cc
    return {name: out[name] for name in FINGERPRINT_NAMES}

