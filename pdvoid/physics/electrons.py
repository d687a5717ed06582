"""Start electrons for a discharge in a void: volume supply by background ionisation, waiting statistics.

A discharge needs a field above inception *and* a free electron in the critical volume. Start electrons are
modelled as a Poisson process of rate N [1/s]; here the volume part from natural background radiation, and the
statistics that follow from a rate (mean statistical time lag, probability of no discharge in an interval).
"""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

from pdvoid.core.errors import check_range
from pdvoid.core.units import ATM, T_ROOM
from pdvoid.physics.checks import broadcast as _broadcast
from pdvoid.physics.checks import shape_out as _shape_out
from pdvoid.physics.checks import values as _values

__all__ = [
    "REFERENCE_IONIZATION_RATE",
    "volume_electron_rate",
    "statistical_time_lag_mean",
    "probability_of_no_discharge",
    "probability_of_discharge",
]

#: Ion pairs per m³ per s near the ground over land at 101325 Pa, 293.15 K: 10 per cm³ per s (hess1951).
REFERENCE_IONIZATION_RATE = 1.0e7


def volume_electron_rate(volume: npt.ArrayLike, pressure: npt.ArrayLike, temperature: npt.ArrayLike = T_ROOM, *,
                         ionization_rate: float = REFERENCE_IONIZATION_RATE,
                         electron_yield: float = 1.0) -> float | np.ndarray:
    """Start electrons per second from volume ionisation of the void gas: N_vol = G·(n/n0)·Ω·η.

    G is the ion-pair production rate at the reference density n0 (101325 Pa, 293.15 K); the rate scales with
    the gas density n/n0 = (p/101325 Pa)·(293.15 K/T) because the absorbed radiation dose per volume does.
    η is the fraction of ion pairs that give a free start electron (e.g. detachment from O2⁻ in air, or
    Niemeyer's factor (1 − η/α)); 1 counts every ion pair. A 1 mm diameter spherical void in air at 1 atm
    with G = 1e7 m⁻³ s⁻¹ receives 5.236e-3 s⁻¹, a mean wait of about 190 s.

    Validity: order-of-magnitude input. Near the ground over land G is about 2–20 cm⁻³ s⁻¹ (10 by Hess's
    estimate); radiation reaching a void inside solid insulation is attenuated and altered, and indoor radon
    can raise G considerably.

    Parameters
    ----------
    volume : array_like
        void volume Ω [m³], > 0.
    pressure : array_like
        gas pressure p [Pa], > 0.
    temperature : array_like, optional
        gas temperature T [K], > 0.
    ionization_rate : float, optional
        G, ion pairs per m³ per s at 101325 Pa and 293.15 K [1/(m³ s)], >= 0.
    electron_yield : float, optional
        η, start electrons per ion pair [-], in [0, 1].

    Returns
    -------
    float or numpy.ndarray
        Rate of start electrons N_vol [1/s].

    References
    ----------
    hess1951 (about 10 ion pairs per cm³ per s near ground), niemeyer1995 (volume term of the
    electron-generation rate, structure).
    """
    g = check_range("ionization_rate", ionization_rate, 0.0, math.inf, unit="1/(m³ s)")
    eta = check_range("electron_yield", electron_yield, 0.0, 1.0)
    v, s1 = _values("volume", volume, unit="m³")
    p, s2 = _values("pressure", pressure, unit="Pa")
    t, s3 = _values("temperature", temperature, unit="K")
    v, p, t = _broadcast(volume=v, pressure=p, temperature=t)
    density_ratio = (p / ATM) * (T_ROOM / t)
    return _shape_out(g * density_ratio * v * eta, s1 and s2 and s3)


def statistical_time_lag_mean(rate: npt.ArrayLike) -> float | np.ndarray:
    """Mean statistical time lag 1/N of a Poisson supply of start electrons of rate N.

    Parameters
    ----------
    rate : array_like
        start-electron rate N [1/s], > 0.

    Returns
    -------
    float or numpy.ndarray
        Mean waiting time for a start electron [s].

    References
    ----------
    niemeyer1995 (statistical time lag; exponential waiting times of a Poisson process, common practice).
    """
    n, s = _values("rate", rate, unit="1/s")
    return _shape_out(1.0 / n, s)


def probability_of_no_discharge(rate: npt.ArrayLike, duration: npt.ArrayLike) -> float | np.ndarray:
    """Probability that no start electron appears within a time t: exp(−N·t) (Poisson process).

    Parameters
    ----------
    rate : array_like
        start-electron rate N [1/s], >= 0.
    duration : array_like
        time interval t during which the field is above inception [s], >= 0.

    Returns
    -------
    float or numpy.ndarray
        Probability [-], in (0, 1].

    References
    ----------
    niemeyer1995 (discharge probability per step; common practice for a Poisson process).
    """
    n, s1 = _values("rate", rate, low_open=False, unit="1/s")
    t, s2 = _values("duration", duration, low_open=False, unit="s")
    n, t = _broadcast(rate=n, duration=t)
    return _shape_out(np.exp(-n * t), s1 and s2)


def probability_of_discharge(rate: npt.ArrayLike, duration: npt.ArrayLike) -> float | np.ndarray:
    """Probability of at least one start electron within a time t: 1 − exp(−N·t), accurate for small N·t.

    Parameters
    ----------
    rate : array_like
        start-electron rate N [1/s], >= 0.
    duration : array_like
        time interval t [s], >= 0.

    Returns
    -------
    float or numpy.ndarray
        Probability [-], in [0, 1).

    References
    ----------
    niemeyer1995 (P = 1 − exp(−N Δt), from memory for the exact form in the paper; common practice).
    """
    n, s1 = _values("rate", rate, low_open=False, unit="1/s")
    t, s2 = _values("duration", duration, low_open=False, unit="s")
    n, t = _broadcast(rate=n, duration=t)
    return _shape_out(-np.expm1(-n * t), s1 and s2)
