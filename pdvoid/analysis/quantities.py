"""IEC 60270 integrated quantities of a discharge sequence over a reference window, and the largest repeatedly
occurring magnitude (our own documented definition)."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from pdvoid.analysis.patterns import EventSource, _filled, _stored_events
from pdvoid.core.errors import InputError, check_nonnegative, check_positive, check_real
from pdvoid.physics.iec60270 import average_discharge_current, discharge_power, quadratic_rate, repetition_rate
from pdvoid.simulation.events import Events

__all__ = ["IECQuantities", "iec60270", "largest_repeated_magnitude", "DEFAULT_REPETITION_RATE"]

#: Default repetition rate of :func:`largest_repeated_magnitude` [1/s]: 100 per second, about two pulses per
#: cycle at 50 Hz. Our own choice (see the function's docstring).
DEFAULT_REPETITION_RATE = 100.0


@dataclass(frozen=True)
class IECQuantities:
    """IEC 60270 quantities over a reference window.

    Attributes
    ----------
    average_current : float
        I = sum |q_i| / T_ref [A].
    quadratic_rate : float
        D = sum q_i^2 / T_ref [C^2/s].
    power : float
        P = sum q_i u_i / T_ref [W]; NaN when an event in the window lacks its applied voltage.
    repetition_rate : float
        n = (pulses with |q| >= threshold) / T_ref [1/s].
    reference_time : float
        T_ref = stop - start [s].
    count : int
        number of events in the window (all, whatever their magnitude) [-].
    window : tuple[float, float]
        (start, stop) [s] of the window measured from the start of the observation.
    threshold : float
        smallest magnitude counted in the repetition rate [C].
    """

    average_current: float
    quadratic_rate: float
    power: float
    repetition_rate: float
    reference_time: float
    count: int
    window: tuple[float, float]
    threshold: float


def _select(ev: Events, window: tuple[float, float] | None) -> tuple[np.ndarray, tuple[float, float]]:
    """Boolean mask of the events in ``window`` and the checked (start, stop) [s]."""
    duration = ev.duration
    if window is None:
        return np.ones(ev.count, dtype=bool), (0.0, duration)
    if isinstance(window, (str, bytes)) or not hasattr(window, "__len__") or len(window) != 2:
        raise InputError(f"window must be None or a pair (start, stop) in s; got {window!r}")
    start = check_real("window[0]", window[0])
    stop = check_real("window[1]", window[1])
    slack = 1e-12 * duration  # rounding of cycles / frequency
    if start < 0.0 or stop > duration + slack or not stop > start:
        raise InputError(
            f"window must satisfy 0 <= start < stop <= {duration!r} s (the observation); "
            f"got ({start!r}, {stop!r})"
        )
    time = _filled(ev.time)
    if ev.count and not np.all(np.isfinite(time)):
        bad = int(np.argmax(~np.isfinite(time)))
        raise InputError(f"a window needs the time of every event; event {bad} has time={time[bad]!r}")
    return (time >= start) & (time < stop), (start, min(stop, duration))


def iec60270(
    events: EventSource, window: tuple[float, float] | None = None, threshold: float = 0.0
) -> IECQuantities:
    """Average discharge current, quadratic rate, discharge power and repetition rate over a reference window.

    The formulas are those of IEC 60270 clause 3 (as quoted in the physics brief section 9), evaluated by
    :mod:`pdvoid.physics.iec60270` on the events with start <= t < stop: I = sum |q_i| / T_ref,
    D = sum q_i^2 / T_ref, P = sum q_i u_i / T_ref (signed products, u_i the instantaneous applied voltage),
    n = (number of pulses with |q| >= threshold) / T_ref, with T_ref = stop - start. Without ``window`` the
    whole observation (0 ... cycles / frequency) is the reference time.

    Parameters
    ----------
    events : Events or Result
        discharge events or a result holding them [-]
    window : tuple[float, float] or None
        (start, stop) from the start of the observation, 0 <= start < stop <= duration [s]; None: all
    threshold : float
        smallest magnitude counted in the repetition rate, >= 0 [C]

    Returns
    -------
    IECQuantities
        :class:`IECQuantities`.

    Raises
    ------
    InputError
        window outside the observation or not increasing; a window on events without times.

    References
    ----------
    iec60270: IEC 60270:2000+A1:2015, High-voltage test techniques - Partial discharge measurements,
    clause 3 (definitions; wording from memory). Valid for apparent charges recorded over the whole
    window.
    """
    ev = _stored_events(events)
    thr = check_nonnegative("threshold", threshold, "C")
    mask, (start, stop) = _select(ev, window)
    t_ref = stop - start
    q = ev.charge[mask]
    u = _filled(ev.voltage)[mask]
    power = discharge_power(q, u, t_ref) if np.all(np.isfinite(u)) else math.nan
    return IECQuantities(
        average_current=average_discharge_current(q, t_ref),
        quadratic_rate=quadratic_rate(q, t_ref),
        power=power,
        repetition_rate=repetition_rate(q, t_ref, threshold=thr),
        reference_time=t_ref,
        count=int(q.size),
        window=(start, stop),
        threshold=thr,
    )


def largest_repeated_magnitude(
    events: EventSource,
    repetition_rate: float = DEFAULT_REPETITION_RATE,
    window: tuple[float, float] | None = None,
) -> float:
    """The largest magnitude |q| reached or exceeded at least ``repetition_rate`` times per second.

    Our own documented definition: with T_ref the reference time and k = ceil(repetition_rate * T_ref) (a
    relative rounding allowance of 1e-12 on the product), the result is the k-th largest |q| in the window,
    i.e. the largest value q* such that the pulses with |q| >= q* occur at least repetition_rate times per
    second on average. If fewer than k pulses occur, no magnitude repeats that often and the result is 0 C.
    The default 100 /s is about two pulses per cycle at 50 Hz.

    IEC 60270 instead ties the "largest repeatedly occurring PD magnitude" to the reading of an instrument
    with the standard's specified pulse-train response (from memory); this function does not model an
    instrument.

    Parameters
    ----------
    events : Events or Result
        discharge events or a result holding them [-]
    repetition_rate : float
        required rate of pulses at or above the magnitude, > 0 [1/s]
    window : tuple[float, float] or None
        (start, stop) as in :func:`iec60270` [s]; None: the whole observation

    Returns
    -------
    float
        magnitude [C] (>= 0).

    References
    ----------
    iec60270 (clause 3, largest repeatedly occurring PD magnitude; wording from memory) for the notion;
    the counting rule is ours. Valid for any event set.
    """
    ev = _stored_events(events)
    rate = check_positive("repetition_rate", repetition_rate, "1/s")
    mask, (start, stop) = _select(ev, window)
    product = rate * (stop - start)
    k = max(1, math.ceil(product * (1.0 - 1e-12)))
    mags = np.sort(np.abs(ev.charge[mask]))[::-1]
    if k > mags.size:
        return 0.0
    return float(mags[k - 1])
