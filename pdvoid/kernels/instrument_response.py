"""The PD instrument's output and peak detector on a pulse train: superposed analytic responses, event-driven.

Each input pulse of charge q_i at time t_i adds q_i Σ_k r_k exp(p_k (t − t_i)) to the filter's output (the
poles p_k and residues r_k come from :func:`pdvoid.physics.bandpass.impulse_residues`). Pulses whose outputs do
not overlap (spacing at least ``window``) are read in one step from the single-pulse peak; only pulses closer than
``window`` are superposed, on a grid of step ``dt`` started at the group's first pulse, through the modal states
x_k(t) = Σ_i q_i r_k exp(p_k (t − t_i)), advanced by exp(p_k dt) per step.

Peak detector (our own simple model of a quasi-peak reading): an event starts when |y| exceeds the trigger
level and reads the signed y of largest magnitude until the output has settled: at least ``hold`` after the
start (the time a lone pulse's envelope bound Σ_k |x_k| takes to fall to the hold fraction of its peak) and
until the envelope bound Σ_k |x_k| of the superposed output is below the hold fraction of the reading. It
re-arms afterwards for a level of at least the hold fraction of the last reading, so the ringing of one pulse
never reads as a second pulse.
"""

from __future__ import annotations

import numpy as np

from pdvoid.kernels.jit import njit_cached

__all__ = ["bandpass_readings"]


@njit_cached
def bandpass_readings(time, charge, poles, residues, dt, window, hold, trigger, hold_fraction, peak, peak_time):  # noqa: PLR0913
    """Readings of the peak detector for pulses sorted by time.

    Parameters
    ----------
    time : numpy.ndarray
        pulse arrival times, ascending [s]
    charge : numpy.ndarray
        charge of each pulse at the filter's input (raw instrument units) [C]
    poles, residues : numpy.ndarray
        complex poles [1/s] and residues [1/s] of the unit-charge response
    dt : float
        grid step of superposed groups [s]
    window : float
        spacing from which pulses are read alone [s]
    hold : float
        shortest hold of the peak detector [s]
    trigger : float
        smallest |y| that starts an event [C]
    hold_fraction : float
        re-arm level as a fraction of the last reading [-]
    peak, peak_time : float
        signed peak of the unit-charge response on the grid, and its time after arrival [C/C, s]

    Returns
    -------
    tuple
        (event_time [s], reading [C], pulses [-]): the time of each reading's peak, the signed reading and the
        number of input pulses that arrived during its hold.
    """
    n = time.size
    cap = 2 * n + 16
    ev_t = np.empty(cap)
    ev_q = np.empty(cap)
    ev_n = np.empty(cap, dtype=np.int64)
    m = 0
    npole = poles.size
    step = np.exp(poles * dt)
    x = np.zeros(npole, dtype=np.complex128)
    i = 0
    while i < n:
        j = i
        while j + 1 < n and time[j + 1] - time[j] < window:
            j += 1
        if j == i:
            r = charge[i] * peak
            if abs(r) > trigger:
                if m < cap:
                    ev_t[m] = time[i] + peak_time
                    ev_q[m] = r
                    ev_n[m] = 1
                    m += 1
            i += 1
            continue
        # superpose pulses i..j on a grid from time[i]
        t0 = time[i]
        nsteps = int((time[j] - t0 + window) / dt) + 2
        for k in range(npole):
            x[k] = 0.0
        nxt = i
        in_event = False
        end = 0.0
        best = 0.0
        best_t = 0.0
        count = 0
        rearm = trigger
        s = -1
        while s + 1 < nsteps:
            s += 1
            tg = t0 + s * dt
            while nxt <= j and time[nxt] <= tg:
                a = tg - time[nxt]
                for k in range(npole):
                    x[k] += charge[nxt] * residues[k] * np.exp(poles[k] * a)
                if in_event:
                    count += 1
                nxt += 1
            y = 0.0
            for k in range(npole):
                y += x[k].real
            if not in_event:
                bound = 0.0
                for k in range(npole):
                    bound += abs(x[k])
                if bound <= rearm and nxt <= j and abs(y) <= rearm:
                    # nothing can trigger before the next pulse: jump to its grid step (exact advance)
                    s_next = int(np.ceil((time[nxt] - t0) / dt))
                    if s_next > s + 1:
                        for k in range(npole):
                            x[k] *= np.exp(poles[k] * ((s_next - 1 - s) * dt))
                        s = s_next - 2
                        continue
                if abs(y) > rearm:
                    in_event = True
                    end = tg + hold
                    best = y
                    best_t = tg
                    count = 1
            else:
                if abs(y) > abs(best):
                    best = y
                    best_t = tg
                bound = 0.0
                for k in range(npole):
                    bound += abs(x[k])
                if tg >= end and bound < hold_fraction * abs(best):
                    if m < cap:
                        ev_t[m] = best_t
                        ev_q[m] = best
                        ev_n[m] = count
                        m += 1
                    in_event = False
                    rearm = max(trigger, hold_fraction * abs(best))
            for k in range(npole):
                x[k] *= step[k]
        if in_event and m < cap:
            ev_t[m] = best_t
            ev_q[m] = best
            ev_n[m] = count
            m += 1
        i = j + 1
    return ev_t[:m], ev_q[:m], ev_n[:m]
