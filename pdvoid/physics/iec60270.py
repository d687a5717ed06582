"""Integrated partial-discharge quantities and the phase angle as defined in IEC 60270, clause 3.

The wording of the definitions is from memory of IEC 60270:2000+A1:2015 (status "from memory" in
:mod:`pdvoid.core.references`); the formulas are the standard ones. Charges are apparent charges in coulombs
(signed by pulse polarity), voltages in volts, times in seconds. Event arrays may be empty.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from pdvoid.core.errors import InputError, check_array, check_nonnegative, check_positive, check_real

__all__ = [
    "phase_angle_deg",
    "average_discharge_current",
    "quadratic_rate",
    "discharge_power",
    "repetition_rate",
]


def _events(name: str, value: npt.ArrayLike) -> np.ndarray:
    """A 1-D float array of finite entries (a scalar counts as one event)."""
    if isinstance(value, np.ndarray) and value.ndim == 0:
        value = value[()]
    return check_array(name, [value] if np.ndim(value) == 0 else value, ndim=1)


def phase_angle_deg(time: float, frequency: float, zero_crossing_time: float = 0.0) -> float | np.ndarray:
    """Phase angle of a pulse, φ = 360° · frac((t − t0) f), in [0°, 360°).

    t − t0 is counted from a positive-going zero crossing of the test voltage at t0; earlier or later zero
    crossings give the same phase (periodic extension).

    Parameters
    ----------
    time : float
        pulse time(s) t [s]
    frequency : float
        test-voltage frequency f [Hz]
    zero_crossing_time : float, optional
        time t0 of a positive-going zero crossing of the test voltage [s]

    Returns
    -------
    float or numpy.ndarray
        phase angle(s) [deg], a float for scalar ``time``.

    Notes
    -----
    Validity: strictly periodic test voltage of constant frequency.

    References
    ----------
    iec60270 (clause 3, phase angle; wording from memory).
    """
    f = check_positive("frequency", frequency, "Hz")
    t0 = check_real("zero_crossing_time", zero_crossing_time)
    scalar = np.ndim(time) == 0
    t = _events("time", time) if scalar else check_array("time", time, ndim=np.ndim(time))
    phase = 360.0 * np.mod((t - t0) * f, 1.0)
    phase[phase >= 360.0] = 0.0  # a fraction of 1 - 1e-17 rounds up to 1
    return float(phase[0]) if scalar else phase


def _reference_time(reference_time: float) -> float:
    return check_positive("reference_time", reference_time, "s")


def average_discharge_current(charge: np.ndarray, reference_time: float) -> float:
    """Average discharge current I = (|q_1| + … + |q_m|) / T_ref.

    Parameters
    ----------
    charge : numpy.ndarray
        apparent charges of the pulses in the reference time, signed [C]
    reference_time : float
        reference time interval T_ref [s]

    Returns
    -------
    float
        I [A]; 0 for no pulses.

    Notes
    -----
    Validity: pulses recorded over the whole reference interval.

    References
    ----------
    iec60270 (clause 3, average discharge current; wording from memory).
    """
    q = _events("charge", charge)
    return float(np.sum(np.abs(q)) / _reference_time(reference_time))


def quadratic_rate(charge: np.ndarray, reference_time: float) -> float:
    """Quadratic rate D = (q_1² + … + q_m²) / T_ref.

    Parameters
    ----------
    charge : numpy.ndarray
        apparent charges of the pulses in the reference time, signed [C]
    reference_time : float
        reference time interval T_ref [s]

    Returns
    -------
    float
        D [C²/s]; 0 for no pulses.

    Notes
    -----
    Validity: pulses recorded over the whole reference interval.

    References
    ----------
    iec60270 (clause 3, quadratic rate; wording from memory).
    """
    q = _events("charge", charge)
    return float(np.sum(q * q) / _reference_time(reference_time))


def discharge_power(charge: np.ndarray, voltage: np.ndarray, reference_time: float) -> float:
    """Discharge power P = (q_1 u_1 + … + q_m u_m) / T_ref, with signed products.

    Parameters
    ----------
    charge : numpy.ndarray
        apparent charges of the pulses, signed [C]
    voltage : numpy.ndarray
        instantaneous test voltage at each pulse u_i, signed, same length as ``charge`` [V]
    reference_time : float
        reference time interval T_ref [s]

    Returns
    -------
    float
        P [W]; 0 for no pulses.

    Notes
    -----
    Validity: pulses recorded over the whole reference interval.

    References
    ----------
    iec60270 (clause 3, discharge power; wording from memory).
    """
    q = _events("charge", charge)
    u = _events("voltage", voltage)
    if q.shape != u.shape:
        raise InputError(f"charge and voltage must have the same length; got {q.size} and {u.size}")
    return float(np.dot(q, u) / _reference_time(reference_time))


def repetition_rate(charge: np.ndarray, reference_time: float, threshold: float = 0.0) -> float:
    """Pulse repetition rate n = (number of pulses with |q| >= threshold) / T_ref.

    Parameters
    ----------
    charge : numpy.ndarray
        apparent charges of the pulses, signed [C]
    reference_time : float
        reference time interval T_ref [s]
    threshold : float, optional
        smallest magnitude counted, >= 0 [C]

    Returns
    -------
    float
        n [1/s]; 0 for no pulses.

    Notes
    -----
    Validity: pulses recorded over the whole reference interval.

    References
    ----------
    iec60270 (clause 3, pulse repetition rate; wording from memory).
    """
    q = _events("charge", charge)
    thr = check_nonnegative("threshold", threshold, "C")
    return float(np.count_nonzero(np.abs(q) >= thr) / _reference_time(reference_time))
