"""The time-domain run of the field model: a conducting host, or a supply without a period (``duration=``)."""

from __future__ import annotations

import math
from collections.abc import Callable

import numpy as np

from pdvoid._version import __version__
from pdvoid.coefficients.closed_form import compute_coefficients
from pdvoid.core.errors import InputError
from pdvoid.core.limits import check_memory
from pdvoid.inputs.scenario import Scenario
from pdvoid.kernels import conduction_events as K
from pdvoid.models.time_domain import time_domain_arguments
from pdvoid.simulation.events import Events
from pdvoid.simulation.results import Result

__all__ = ["simulate_time_domain", "MAX_DURATION"]

MAX_DURATION = 1e9  #: longest simulated time of one run [s] (about 32 years)
_BUFFER = 1 << 16  # events per kernel call
_MAX_STORED_EVENTS = 50_000_000
_BYTES_PER_STORED_EVENT = 12 * 8


def simulate_time_domain(
    scenario: Scenario, *, seed: int, cycles: int | None, duration: float | None,
    progress: Callable[[int, int], None] | None = None, should_stop: Callable[[], bool] | None = None,
    chunk_cycles: int | None = None,
) -> Result:
    """Run the time-domain kernel from energisation (t = 0, uncharged void, unpolarised host).

    Called by :func:`pdvoid.simulate` (which checks the arguments): ``cycles`` for a periodic supply in a
    conducting host, ``duration`` [s] for a supply without a period. For the latter the result holds one
    observation window: ``Result.cycles`` is 1, the events' ``frequency`` is 1/duration and their "phase" is
    the fraction of the run times 360 deg (there is no supply phase).

    Parameters
    ----------
    scenario : Scenario
        The scenario (field model).
    seed : int
        Seed [-] (checked).
    cycles : int or None
        Whole cycles of a periodic supply [-] (checked), else None.
    duration : float or None
        Simulated time [s] (checked) for a supply without a period, else None.
    progress : Callable[[int, int], None], optional
        Called as progress(done, total) after each chunk (cycles, or 1 of 1 for a duration).
    should_stop : Callable[[], bool], optional
        Polled after each chunk of cycles (periodic supplies only).
    chunk_cycles : int, optional
        Cycles per kernel call (periodic supplies only).

    Returns
    -------
    Result
        The events and sums, as :func:`pdvoid.simulate` returns them.
    """
    f = 1.0
    total = 1
    if cycles is not None:
        f = float(getattr(scenario.supply, "frequency"))  # every periodic supply has one  # noqa: B009
        total = int(cycles)
        end = total / f
        chunk = max(1, min(total, chunk_cycles or 1000))
        stop_cycles = [min(total, n) for n in range(chunk, total + chunk, chunk)]
        stops = [n / f for n in stop_cycles]
    elif duration is not None:
        if should_stop is not None or chunk_cycles is not None:
            raise InputError("should_stop and chunk_cycles apply to periodic supplies (cycles=); a run of a "
                             "supply without a period is one piece (duration=)")
        end = float(duration)
        stops, stop_cycles = [end], [1]
    else:
        raise InputError("give cycles= (periodic supply) or duration= [s] (supply without a period)")
    periodic = cycles is not None
    c = compute_coefficients(scenario)
    args = time_domain_arguments(scenario, c, end)
    state = np.zeros(K.STATE_SIZE)
    totals = np.zeros(K.TOTALS_SIZE)
    totals[K.T_FIRST] = np.nan
    K.seed_generator(seed)
    K.initialise(state, args.breaks, args.pw, args.orders, args.a_coef, args.b_coef, args.params)
    if not args.lag_free:
        K.start_wait(state)
    pieces: list[tuple[np.ndarray, ...]] = []
    stored = 0
    done = 0
    finite = math.isfinite(c.inception_field)
    for t_stop, n_cycles in zip(stops, stop_cycles, strict=True):
        while finite and state[K.S_T] < t_stop:
            bufs = [np.empty(_BUFFER) for _ in range(5)]
            t_before = state[K.S_T]
            n = K.run_time(state, t_stop, args.breaks, args.pw, args.orders, args.a_coef,
                           args.b_coef, args.params, args.lag_free, args.field_assisted, *bufs, totals)
            if n == 0 and state[K.S_T] <= t_before:
                raise RuntimeError("internal error: the time-domain kernel made no progress; please report this")
            pieces.append(tuple(b[:n].copy() for b in bufs))
            stored += n
            if stored > _MAX_STORED_EVENTS:
                raise InputError(f"more than {_MAX_STORED_EVENTS} events would be stored; shorten the run")
            check_memory(f"storing {stored} events", _BYTES_PER_STORED_EVENT * stored)
        done = n_cycles
        if progress is not None:
            progress(done, total)
        if should_stop is not None and should_stop():
            break
    if pieces:
        t, q, xb, xa, v = (np.concatenate(p) for p in zip(*pieces, strict=True))
    else:
        t = q = xb = xa = v = np.empty(0)
    if periodic:
        freq, n_obs, requested = f, done, total
    else:
        freq, n_obs, requested = 1.0 / end, 1, 1
    frac = t * freq - np.floor(t * freq)
    phase = np.minimum(frac * 360.0, np.nextafter(360.0, 0.0))
    events = Events(
        phase_deg=phase, charge=q, frequency=freq, cycles=float(n_obs), time=t,
        cycle=np.minimum(np.floor(t * freq), n_obs - 1), voltage=v, field_before=xb, field_after=xa,
        label="simulated",
    )
    return Result(
        events=events, scenario=scenario, seed=seed, cycles=n_obs, requested_cycles=requested, version=__version__,
        references=args.references, histogram=None, event_count=int(totals[K.T_COUNT]),
        sum_abs_charge=float(totals[K.T_ABS]), sum_charge_squared=float(totals[K.T_SQ]),
        sum_charge_voltage=float(totals[K.T_QU]), first_discharge_time=float(totals[K.T_FIRST]),
    )
