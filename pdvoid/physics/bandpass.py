"""The quasi-integrating band-pass of an IEC 60270 instrument, and the rate at which noise crosses a threshold.

IEC 60270 (clause 4.3, as recalled, "from memory") describes conventional PD instruments by their lower and upper
limit frequencies f_1, f_2, at which the response has fallen by 6 dB from its pass-band value:

* wide-band instruments: 30 kHz <= f_1 <= 100 kHz, f_2 <= 1 MHz (500 kHz recommended),
  100 kHz <= Δf = f_2 − f_1 <= 900 kHz;
* narrow-band instruments: bandwidth 9 kHz <= Δf <= 30 kHz at a mid-band frequency
  50 kHz <= f_m <= 1 MHz (f_1 = f_m − Δf/2, f_2 = f_m + Δf/2).

Because a PD current pulse is much shorter than 1/f_2, its spectrum is flat over the pass band and the filter's
output peak is proportional to the pulse's charge whatever its shape ("quasi-integration"). The standard
prescribes no filter type; we use a Butterworth band-pass (Butterworth 1930) whose -6 dB frequencies are the
standard's limits: with the low-pass prototype of order N, ``|H|`` = 1/2 at the prototype frequency Ω = 3^(1/(2N)),
so the -3 dB band edges ω_a', ω_b' handed to the design satisfy ω_a' ω_b' = ω_1 ω_2 and
ω_b' − ω_a' = (ω_2 − ω_1) / 3^(1/(2N)).
"""

from __future__ import annotations

import math

import numpy as np
from scipy import signal

from pdvoid.core.errors import InputError, check_int, check_nonnegative, check_positive

__all__ = ["bandpass_zpk", "impulse_residues", "noise_moments", "rice_crossing_rate"]


def bandpass_zpk(f_low: float, f_high: float, order: int = 2) -> tuple[np.ndarray, np.ndarray, float]:
    """Analog Butterworth band-pass with -6 dB at ``f_low`` and ``f_high`` and unit gain at the geometric centre.

    Parameters
    ----------
    f_low : float
        lower limit frequency f_1 (response down 6 dB), > 0 [Hz]
    f_high : float
        upper limit frequency f_2 (response down 6 dB), > f_low [Hz]
    order : int, optional
        order N of the low-pass prototype, 1 ... 8 (the band-pass has 2N poles) [-]

    Returns
    -------
    tuple[numpy.ndarray, numpy.ndarray, float]
        zeros [rad/s], poles [rad/s] and gain [(rad/s)^N] of H(s) (``scipy.signal`` zpk convention).

    Notes
    -----
    Validity: any 0 < f_low < f_high. The IEC 60270 ranges are checked by :class:`pdvoid.Instrument`
    (:data:`pdvoid.inputs.measurement.INSTRUMENT_RANGES`), not here.

    References
    ----------
    butterworth1930: S. Butterworth, 'On the theory of filter amplifiers', Wireless Engineer 7 (1930) 536-541
    (maximally flat response ``|H|^2`` = 1/(1 + Ω^(2N))); iec60270_instrument (limit frequencies at -6 dB; from
    memory). The design is ``scipy.signal.butter(N, [ω_a', ω_b'], 'bandpass', analog=True, output='zpk')``.
    """
    f1 = check_positive("f_low", f_low, "Hz")
    f2 = check_positive("f_high", f_high, "Hz")
    n = check_int("order", order, 1, 8)
    if not f2 > f1:
        raise InputError(f"f_high must exceed f_low; got f_low={f1!r} Hz, f_high={f2!r} Hz")
    w1, w2 = 2.0 * math.pi * f1, 2.0 * math.pi * f2
    w0 = math.sqrt(w1 * w2)
    b3 = (w2 - w1) / 3.0 ** (1.0 / (2 * n))
    # ω_a' ω_b' = ω0², ω_b' − ω_a' = b3
    wa = -b3 / 2.0 + math.sqrt(b3 * b3 / 4.0 + w0 * w0)
    z, p, k = signal.butter(n, [wa, wa + b3], btype="bandpass", analog=True, output="zpk")
    return np.real(np.asarray(z)).astype(float), np.asarray(p, dtype=complex), float(np.real(k))


def impulse_residues(
    zeros: np.ndarray, poles: np.ndarray, gain: float, time_constants: tuple[float, ...] = ()
) -> tuple[np.ndarray, np.ndarray]:
    """Poles and residues of H(s) / Π(1 + s τ_j): the response to a unit charge arriving as a pulse current.

    A current pulse i(t) = (q/τ) exp(−t/τ) has the Laplace transform q / (1 + sτ); a chain of such first-order
    stages (the source pulse, the test circuit) multiplies these factors. With all poles distinct,
    y(t) = q Σ_k r_k exp(p_k t) for t >= 0 with r_k = N(p_k) / D'(p_k) (Heaviside's expansion).

    Parameters
    ----------
    zeros, poles : numpy.ndarray
        zeros and poles of H(s) [rad/s]
    gain : float
        gain of H(s) [-]
    time_constants : tuple of float, optional
        τ_j > 0 of the first-order stages before the filter; 0 means an impulse (no stage) [s]

    Returns
    -------
    tuple[numpy.ndarray, numpy.ndarray]
        poles p_k [1/s] and residues r_k [1/s] (complex; conjugate pairs for a real response).

    Notes
    -----
    Validity: distinct poles (two equal time constants are separated by a relative 1e-6, which changes the
    response by less than 1e-6 relative); more zeros than poles are not allowed (strictly proper H).

    References
    ----------
    heaviside_expansion: partial-fraction (Heaviside) expansion of a rational transfer function, as in any
    text on the Laplace transform, e.g. A. V. Oppenheim, A. S. Willsky, Signals and Systems, 2nd ed.,
    Prentice Hall 1997, section 9.3 (from memory).
    """
    z = np.asarray(zeros, dtype=complex)
    p = list(np.asarray(poles, dtype=complex))
    k = float(gain)
    seen: list[float] = []
    for tau in time_constants:
        t = check_nonnegative("time_constants", tau, "s")
        if t == 0.0:
            continue
        while any(abs(t - s) <= 1e-9 * s for s in seen) or any(abs(-1.0 / t - q) <= 1e-9 * abs(q) for q in p):
            t *= 1.0 + 1e-6
        seen.append(t)
        p.append(complex(-1.0 / t))
        k /= t  # 1 / (1 + sτ) = (1/τ) / (s + 1/τ)
    poles_all = np.array(p, dtype=complex)
    if z.size >= poles_all.size:
        raise InputError("impulse_residues needs a strictly proper transfer function (fewer zeros than poles)")
    res = np.empty_like(poles_all)
    for i, pk in enumerate(poles_all):
        others = np.delete(poles_all, i)
        res[i] = k * np.prod(pk - z) / np.prod(pk - others)
    return poles_all, res


def noise_moments(zeros: np.ndarray, poles: np.ndarray, gain: float) -> tuple[float, float]:
    """Spectral moments m_0 = ∫ ``|H(jω)|²`` dω and m_2 = ∫ω² ``|H(jω)|²`` dω over ω >= 0 (numerical quadrature).

    For white noise at the filter's input these give the output variance (∝ m_0) and, with m_2, the mean rate of
    crossings of a level (:func:`rice_crossing_rate`).

    Parameters
    ----------
    zeros, poles : numpy.ndarray
        zeros and poles of H(s) [rad/s]
    gain : float
        gain of H(s) [-]

    Returns
    -------
    tuple[float, float]
        m_0 [rad/s], m_2 [(rad/s)^3].

    Notes
    -----
    Validity: band-pass responses that fall at least as 1/ω far above the band (m_2 converges only if ``|H|``
    falls faster than ω^-1.5; with a prototype order N >= 1 and N zeros at 0, ``|H|`` ~ ω^-N, so m_2 needs N >= 2;
    for N = 1 the integral is cut at 100 times the upper pole frequency).

    References
    ----------
    rice1944 (spectral moments of a stationary Gaussian process).
    """
    p = np.asarray(poles, dtype=complex)
    wmax = 100.0 * float(np.max(np.abs(p)))
    wmin = 1e-4 * float(np.min(np.abs(p)))
    w = np.geomspace(wmin, wmax, 20001)
    _, h = signal.freqs_zpk(zeros, p, gain, worN=w)
    h2 = np.abs(h) ** 2
    return float(np.trapezoid(h2, w)), float(np.trapezoid(w * w * h2, w))


def rice_crossing_rate(level: float, sigma: float, m0: float, m2: float) -> float:
    """Mean rate of up-crossings of ``level`` by a stationary Gaussian process: ν = (1/2π) √(m_2/m_0) e^(−u²/2σ²).

    Parameters
    ----------
    level : float
        u, the level crossed [unit of the process]
    sigma : float
        σ, the process's standard deviation, > 0 [same unit]
    m0, m2 : float
        spectral moments of the process (any common scale), > 0

    Returns
    -------
    float
        ν [1/s].

    Notes
    -----
    Validity: stationary zero-mean Gaussian process with a finite m_2.

    References
    ----------
    rice1944: S. O. Rice, 'Mathematical analysis of random noise', Bell System Technical Journal 23 (1944)
    282-332, equation (3.3-5) for the expected number of zeros and its level-crossing form (equation number from
    memory).
    """
    u = float(level)
    s = check_positive("sigma", sigma)
    a = check_positive("m0", m0)
    b = check_positive("m2", m2)
    return math.sqrt(b / a) / (2.0 * math.pi) * math.exp(-u * u / (2.0 * s * s))
