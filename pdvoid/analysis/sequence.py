"""Pulse-sequence analysis after Hoof & Patsch (1995): changes of the applied voltage, time and phase between
consecutive discharges."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from pdvoid.analysis.patterns import EventSource, _filled, _stored_events
from pdvoid.core.arrays import frozen_array as _frozen
from pdvoid.core.errors import InputError

__all__ = ["PulseSequence", "pulse_sequence"]




@dataclass(frozen=True, eq=False)
class PulseSequence:
    """Differences between consecutive discharges n-1 and n (n = 1 ... N-1, events in time order).

    Attributes
    ----------
    time : numpy.ndarray
        event times in time order, N values [s].
    charge : numpy.ndarray
        signed apparent charges in time order, N values [C].
    voltage : numpy.ndarray
        applied voltage at each event in time order, N values [V].
    delta_u : numpy.ndarray
        Delta u_n = u(t_n) - u(t_{n-1}), N-1 values [V].
    delta_t : numpy.ndarray
        Delta t_n = t_n - t_{n-1}, N-1 values [s].
    delta_phase_deg : numpy.ndarray
        Delta phi_n, the phase elapsed from pulse n-1 to pulse n, N-1 values [deg].
    """

    time: np.ndarray
    charge: np.ndarray
    voltage: np.ndarray
    delta_u: np.ndarray
    delta_t: np.ndarray
    delta_phase_deg: np.ndarray

    @property
    def charge_n(self) -> np.ndarray:
        """q_n for n = 1 ... N-1, aligned with :attr:`delta_u` (the pairs (q_n, Delta u_n)) [C]."""
        return self.charge[1:]

    @property
    def delta_u_previous(self) -> np.ndarray:
        """Delta u_{n-1} for n = 2 ... N-1, aligned with :attr:`delta_u_next` [V]."""
        return self.delta_u[:-1]

    @property
    def delta_u_next(self) -> np.ndarray:
        """Delta u_n for n = 2 ... N-1; (delta_u_next, delta_u_previous) = (Delta u_n, Delta u_{n-1}) [V]."""
        return self.delta_u[1:]

    @property
    def delta_phase_previous_deg(self) -> np.ndarray:
        """Delta phi_{n-1} for n = 2 ... N-1 [deg]."""
        return self.delta_phase_deg[:-1]

    @property
    def delta_phase_next_deg(self) -> np.ndarray:
        """Delta phi_n for n = 2 ... N-1 [deg]."""
        return self.delta_phase_deg[1:]

    @property
    def same_polarity(self) -> np.ndarray:
        """True where q_n and q_{n-1} have the same sign, aligned with :attr:`delta_u` [-]."""
        s = np.sign(self.charge)
        return s[1:] == s[:-1]


def pulse_sequence(events: EventSource) -> PulseSequence:
    """Pulse-sequence analysis: Delta u, Delta t and Delta phi between consecutive discharges.

    For consecutive pulses n-1 and n (events sorted by time, stable for equal times):
    Delta u_n = u(t_n) - u(t_{n-1}), the change of the instantaneous applied voltage between them;
    Delta t_n = t_n - t_{n-1}; Delta phi_n = phi_n - phi_{n-1} + 360 deg x (cycle_n - cycle_{n-1}), i.e. the
    phase elapsed, which equals phi_n - phi_{n-1} for pulses in the same cycle and adds 360 deg per
    positive-going zero crossing between them (so Delta phi >= 0). The pairs (Delta u_n, Delta u_{n-1}) and
    (q_n, Delta u_n) are available as :attr:`PulseSequence.delta_u_next` /
    :attr:`~PulseSequence.delta_u_previous` and :attr:`~PulseSequence.charge_n` /
    :attr:`~PulseSequence.delta_u`. Zero-charge events are kept (they are recorded events). Fewer than two
    events give empty differences.

    Parameters
    ----------
    events : Events or Result
        discharge events (or a result holding them) with finite time, voltage and cycle for every
        event [-]

    Returns
    -------
    PulseSequence
        :class:`PulseSequence`.

    Raises
    ------
    InputError
        when an event lacks its time, applied voltage or cycle index.

    References
    ----------
    hoof1995: M. Hoof, R. Patsch, 'Pulse-sequence analysis: a new method for investigating the physics of
    PD-induced ageing', IEE Proc.-Sci. Meas. Technol. 142(1) (1995) 95-101 (definitions as quoted in the
    physics brief section 10, from memory). Valid for any event sequence recorded without gaps.
    """
    ev = _stored_events(events)
    for name in ("time", "voltage", "cycle"):
        arr = getattr(ev, name)
        if arr.size and not np.all(np.isfinite(arr)):
            bad = int(np.argmax(~np.isfinite(arr)))
            raise InputError(
                f"pulse-sequence analysis needs the {name} of every event; "
                f"event {bad} has {name}={arr[bad]!r}"
            )
    time, voltage, cycle = _filled(ev.time), _filled(ev.voltage), _filled(ev.cycle)
    order = np.argsort(time, kind="stable")
    t = time[order]
    u = voltage[order]
    q = ev.charge[order]
    phase = ev.phase_deg[order]
    cyc = cycle[order]
    return PulseSequence(
        time=_frozen(t),
        charge=_frozen(q),
        voltage=_frozen(u),
        delta_u=_frozen(np.diff(u)),
        delta_t=_frozen(np.diff(t)),
        delta_phase_deg=_frozen(np.diff(phase) + 360.0 * np.diff(cyc)),
    )
