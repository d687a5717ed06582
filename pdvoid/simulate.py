"""simulate(scenario, cycles, seed) → Result: drive the event kernel over whole AC cycles."""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from . import __version__
from .errors import InputError, check_int
from .events import Events
from .kernels import void_events as K
from .models import kernel_arguments
from .parameters import check_seed
from .results import Histogram, Result
from .scenario import Scenario
from .waveform import evaluate

__all__ = ["simulate", "MAX_CYCLES"]

MAX_CYCLES = 10**9
_BUFFER_EVENTS = 1 << 18  # events per kernel call when events are stored (grows by calls, not by copying)
_MAX_STORED_EVENTS = 50_000_000  # about 1.6 GB of event arrays: beyond this use histogram mode


def _default_charge_edges(args) -> np.ndarray:
    """Symmetric logarithmic charge edges for the histogram mode: 1e-3 to 10 times the lag-free charge."""
    q0 = abs(args.charge_per_unit * (args.x_inc - args.x_res))
    mags = np.geomspace(q0 * 1e-3, q0 * 10.0, 26)
    return np.concatenate([-mags[::-1], mags])


def simulate(
    scenario: Scenario,
    cycles: int = 1000,
    seed: int = 0,
    *,
    histogram: bool = False,
    phase_bins: int = 72,
    charge_edges: np.ndarray | None = None,
    progress: Callable[[int, int], None] | None = None,
    should_stop: Callable[[], bool] | None = None,
    chunk_cycles: int | None = None,
) -> Result:
    """Simulate ``cycles`` AC cycles of ``scenario`` from an uncharged void at the positive-going zero crossing.

    Args:
        scenario: the insulation, void, supply and model.
        cycles: number of whole AC cycles [-], 1 to 1e9.
        seed: seed of the random generator [-]; the same seed gives bit-identical results.
        histogram: True to keep only the phase-resolved counts and the IEC 60270 sums (memory independent of
            the number of events); False to keep every event.
        phase_bins: phase bins over 0..360 deg for the histogram mode [-].
        charge_edges: signed apparent-charge bin edges for the histogram mode [C], increasing; events outside
            are counted in ``Histogram.below`` / ``above``. Default: symmetric log bins around the lag-free charge.
        progress: called as progress(cycles_done, cycles) after each chunk.
        should_stop: polled after each chunk; True ends the run early (the result says how many cycles ran).
        chunk_cycles: cycles per kernel call (default: chosen from the event bound).

    Returns:
        :class:`pdvoid.results.Result`.
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    cycles = check_int("cycles", cycles, 1, MAX_CYCLES)
    seed = check_seed(seed)
    if not isinstance(histogram, bool):
        raise InputError(f"histogram must be True or False; got {histogram!r}")
    args = kernel_arguments(scenario)
    bound = args.max_events_per_cycle()
    if bound > 10_000_000:
        raise InputError(
            f"this scenario could produce up to {bound} discharges per cycle (residual field too close to the "
            "inception field for the applied voltage); raise model.residual_ratio's distance from 1 or lower "
            "the voltage"
        )
    if histogram:
        phase_bins = check_int("phase_bins", phase_bins, 1, 3600)
        edges = _default_charge_edges(args) if charge_edges is None else np.asarray(charge_edges, dtype=float)
        if edges.ndim != 1 or edges.size < 2 or edges.size > 10_001 or not np.all(np.isfinite(edges)) or np.any(
            np.diff(edges) <= 0
        ):
            raise InputError("charge_edges must be 2 to 10001 finite, strictly increasing values [C]")
        counts = np.zeros((phase_bins, edges.size - 1), dtype=np.int64)
    else:
        edges = np.array([0.0, 1.0])
        counts = np.zeros((0, 1), dtype=np.int64)
    if chunk_cycles is None:
        chunk_cycles = max(1, min(cycles, _BUFFER_EVENTS // max(bound, 1), 100_000))
    chunk_cycles = check_int("chunk_cycles", chunk_cycles, 1, MAX_CYCLES)

    state = np.zeros(K.STATE_SIZE)
    state[K.S_TLAST] = -np.inf
    totals = np.zeros(K.TOTALS_SIZE)
    K.seed_generator(seed)
    if not args.lag_free:
        K.start_wait(state)
    cap = max(bound * min(chunk_cycles, cycles), 16) if not histogram else 0
    pieces: list[tuple[np.ndarray, ...]] = []
    stored = 0
    done = 0
    while done < cycles:
        stop = min(cycles, done + chunk_cycles)
        bt = np.empty(cap)
        bq = np.empty(cap)
        bb = np.empty(cap)
        ba = np.empty(cap)
        n, nxt = K.run_cycles(
            state, done, stop, args.frequency, args.orders, args.a_coef, args.b_coef, args.seg_fracs,
            args.pure_sine, args.gain, args.x_inc, args.x_res, args.charge_per_unit, args.lag_free, args.n_vol,
            args.n_same, args.n_rev, args.tau_s, args.field_assisted, args.tau_q, not histogram, bt, bq, bb, ba,
            bound, counts, edges, totals,
        )
        if n < 0:
            raise RuntimeError("internal error: the event bound per cycle was exceeded; please report this")
        if not histogram:
            pieces.append((bt[:n].copy(), bq[:n].copy(), bb[:n].copy(), ba[:n].copy()))
            stored += n
            if stored > _MAX_STORED_EVENTS:
                raise InputError(
                    f"more than {_MAX_STORED_EVENTS} events would be stored; use simulate(..., histogram=True)"
                )
        done = nxt
        if progress is not None:
            progress(done, cycles)
        if should_stop is not None and should_stop():
            break

    if pieces:
        t, q, xb, xa = (np.concatenate(p) for p in zip(*pieces, strict=True))
    else:
        t = q = xb = xa = np.empty(0)
    f = args.frequency
    frac = t * f - np.floor(t * f)
    phase = np.minimum(frac * 360.0, np.nextafter(360.0, 0.0))
    v = evaluate(frac, args.orders, args.a_coef, args.b_coef) if t.size else np.empty(0)
    events = Events(
        phase_deg=phase, charge=q, frequency=f, cycles=float(done), time=t, cycle=np.floor(t * f),
        voltage=v, field_before=xb * args.x_to_field, field_after=xa * args.x_to_field, label="simulated",
    )
    hist = None
    if histogram:
        hist = Histogram(
            counts=counts, phase_edges_deg=np.linspace(0.0, 360.0, phase_bins + 1), charge_edges=edges,
            below=int(totals[K.T_LOW]), above=int(totals[K.T_HIGH]),
        )
    return Result(
        events=events, scenario=scenario, seed=seed, cycles=done, requested_cycles=cycles, version=__version__,
        references=args.references, histogram=hist, event_count=int(totals[K.T_COUNT]),
        sum_abs_charge=float(totals[K.T_ABS]), sum_charge_squared=float(totals[K.T_SQ]),
        sum_charge_voltage=float(totals[K.T_QU]),
    )
