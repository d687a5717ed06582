"""simulate(scenario, cycles, seed) → Result: drive the event kernel over whole AC cycles."""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from pdvoid._version import __version__
from pdvoid.coefficients.closed_form import supply_peak_factor
from pdvoid.coefficients.limits import warn_host_strength
from pdvoid.core.errors import InputError, check_int, check_range
from pdvoid.core.limits import MAX_CYCLES as _MAX_CYCLES
from pdvoid.core.limits import MAX_HISTOGRAM_CHARGE_EDGES, MAX_HISTOGRAM_PHASE_BINS, check_memory
from pdvoid.inputs.parameters import check_seed
from pdvoid.inputs.scenario import Scenario
from pdvoid.inputs.waveform import evaluate
from pdvoid.kernels import void_events as K
from pdvoid.models import kernel_arguments
from pdvoid.models.arguments import KernelArguments
from pdvoid.models.time_domain import needs_time_domain
from pdvoid.simulation.events import Events
from pdvoid.simulation.results import Histogram, Result
from pdvoid.simulation.time_domain import MAX_DURATION, simulate_time_domain

__all__ = ["simulate", "VoidRunner", "MAX_CYCLES"]

MAX_CYCLES = _MAX_CYCLES
_BUFFER_EVENTS = 1 << 18  # events per kernel call when events are stored (grows by calls, not by copying)
_MAX_STORED_EVENTS = 50_000_000
_BYTES_PER_STORED_EVENT = 12 * 8
_MAX_EVENTS_PER_CYCLE = 1_000_000  # about 1.6 GB of event arrays: beyond this use histogram mode


def _default_charge_edges(args: KernelArguments) -> np.ndarray:
    """Symmetric logarithmic charge edges for the histogram mode: 1e-3 to 10 times the lag-free charge."""
    q0 = abs(args.charge_per_unit * (args.x_inc - args.x_res))
    mags = np.geomspace(q0 * 1e-3, q0 * 10.0, 26)
    return np.concatenate([-mags[::-1], mags])


class VoidRunner:
    """A void that keeps its state (deposited charge, emission memory, generator) between runs, so the applied
    voltage can change from one run to the next, as in a stepped voltage test.

    The generator is numba's (process-global per thread): run one VoidRunner at a time per thread, or the
    streams interleave and runs are no longer reproducible.

    Parameters
    ----------
    scenario : Scenario
        the void and its supply; ``run(scale=...)`` multiplies the supply waveform.
    seed : int, optional
        seed of the random generator [-].
    """

    def __init__(self, scenario: Scenario, seed: int = 0, *, _args: KernelArguments | None = None) -> None:
        if not isinstance(scenario, Scenario):
            raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
        self.scenario = scenario
        self.seed = check_seed(seed)
        self.args = kernel_arguments(scenario) if _args is None else _args
        self.state = np.zeros(self.args.state_size)
        self.state[K.S_TLAST] = -np.inf
        self.totals = np.zeros(K.TOTALS_SIZE)
        self.totals[K.T_FIRST] = np.nan
        self.cycle = 0
        K.seed_generator(self.seed)
        if not self.args.lag_free:
            K.start_wait(self.state)
        self.args.prepare_state(self.state)

    def run(self, cycles: int, *, scale: float = 1.0, store: bool = True, counts: np.ndarray | None = None,
            charge_edges: np.ndarray | None = None
            ) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
        """Advance ``cycles`` whole cycles with the supply multiplied by ``scale`` [-].

        Returns (time [s], charge [C], field_before [V/m], field_after [V/m], voltage [V]) of the new events
        (empty arrays when ``store`` is False; the running sums in ``totals`` and ``counts`` still grow).

        Parameters
        ----------
        cycles : int
            Whole cycles to advance [-], 1 to 1e9.
        scale : float, optional
            Factor on the supply waveform [-], 0 to 1000.
        store : bool, optional
            True to return the new events; False to only accumulate the sums and ``counts``.
        counts : numpy.ndarray or None, optional
            Phase x charge histogram (int64) to add the events to, or None for none.
        charge_edges : numpy.ndarray or None, optional
            Charge bin edges of ``counts`` [C].

        Returns
        -------
        tuple of numpy.ndarray
            (time [s], charge [C], field_before [V/m], field_after [V/m], voltage [V]) of the new events.

        Raises
        ------
        InputError
            For bad ``cycles`` or ``scale``, or a scenario that could produce more than a million discharges per cycle.
        """
        cycles = check_int("cycles", cycles, 1, MAX_CYCLES)
        scale = check_range("scale", scale, 0.0, 1e3)
        a = self.args
        bound = a.max_events_per_cycle(scale)
        if counts is None:
            counts = np.zeros((0, 1), dtype=np.int64)
            charge_edges = np.array([0.0, 1.0])
        elif charge_edges is None:
            raise InputError("charge_edges [C] must be given together with counts")
        if bound > _MAX_EVENTS_PER_CYCLE:
            raise InputError(
                f"this scenario could produce up to {bound} discharges per cycle (residual field too close to the "
                "inception field for the applied voltage); lower model.residual_ratio or the voltage"
            )
        cap = min(bound * cycles, max(4 * _BUFFER_EVENTS, bound)) if store else 0
        pieces = []
        stop = self.cycle + cycles
        a_coef, b_coef = a.a_coef * scale, a.b_coef * scale
        while self.cycle < stop:
            bt, bq, bb, ba = (np.empty(cap) for _ in range(4))
            n, nxt = a.advance(self.state, self.cycle, stop, a_coef, b_coef, store, bt, bq, bb, ba, bound, counts,
                               charge_edges, self.totals)
            if n < 0 or nxt == self.cycle:
                raise RuntimeError("internal error: the event bound per cycle was exceeded; please report this")
            if store:
                pieces.append((bt[:n].copy(), bq[:n].copy(), bb[:n].copy(), ba[:n].copy()))
            self.cycle = nxt
        if not pieces:
            e = np.empty(0)
            return e, e, e, e, e
        t, q, xb, xa = (np.concatenate(p) for p in zip(*pieces, strict=True))
        f = a.frequency
        frac = t * f - np.floor(t * f)
        v = evaluate(frac, a.orders, a_coef, b_coef) if t.size else np.empty(0)
        return t, q, xb * a.x_to_field, xa * a.x_to_field, v


#: phase bins of the histogram mode unless asked otherwise [-]
DEFAULT_PHASE_BINS = 72


def simulate(
    scenario: Scenario,
    cycles: int | None = None,
    seed: int = 0,
    *,
    duration: float | None = None,
    histogram: bool = False,
    phase_bins: int = DEFAULT_PHASE_BINS,
    charge_edges: np.ndarray | None = None,
    progress: Callable[[int, int], None] | None = None,
    should_stop: Callable[[], bool] | None = None,
    chunk_cycles: int | None = None,
) -> Result:
    """Simulate ``cycles`` AC cycles of ``scenario`` from an uncharged void at the positive-going zero crossing,
    or, for a supply without a period (:class:`pdvoid.DC`, :class:`pdvoid.PolarityReversal`,
    :class:`pdvoid.PiecewiseLinear`), ``duration`` seconds from energisation.

    A conducting host or void wall (``insulation.conductivity`` or ``void.surface_conductivity`` > 0) runs the
    field model's time-domain kernel (:mod:`pdvoid.kernels.conduction_events`), also under a periodic supply;
    a perfect dielectric under a periodic supply runs the cycle kernel exactly as before.

    Parameters
    ----------
    scenario : Scenario
        the insulation, void, supply and model.
    cycles : int, optional
        number of whole AC cycles [-], 1 to 1e9 (default 1000), for periodic supplies only.
    seed : int, optional
        seed of the random generator [-]; the same seed gives bit-identical results.
    duration : float, optional
        simulated time from energisation [s], 1 ns to 1e9 s; required for supplies without a period and refused
        for periodic ones. The result then holds one observation window (``Result.cycles`` = 1, event "phase" =
        fraction of the run × 360 deg).
    histogram : bool, optional
        True to keep only the phase-resolved counts and the IEC 60270 sums (memory independent of
        the number of events); False to keep every event.
    phase_bins : int, optional
        phase bins over 0..360 deg for the histogram mode [-].
    charge_edges : numpy.ndarray, optional
        signed apparent-charge bin edges for the histogram mode [C], increasing; events outside
        are counted in ``Histogram.below`` / ``above``. Default: symmetric log bins around the lag-free charge.
    progress : Callable[[int, int], None], optional
        called as progress(cycles_done, cycles) after each chunk.
    should_stop : Callable[[], bool], optional
        polled after each chunk; True ends the run early (the result says how many cycles ran).
    chunk_cycles : int, optional
        cycles per kernel call (default: chosen from the event bound).

    Returns
    -------
    Result
        :class:`pdvoid.simulation.results.Result`.
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    if getattr(scenario.supply, "periodic", True):
        if duration is not None:
            raise InputError(f"duration= is for supplies without a period; this {type(scenario.supply).__name__} "
                             f"supply is periodic: give cycles= instead (got duration={duration!r})")
        cycles = check_int("cycles", 1000 if cycles is None else cycles, 1, MAX_CYCLES)
    else:
        if cycles is not None:
            raise InputError(f"cycles= is for periodic supplies; a {type(scenario.supply).__name__} supply has no "
                             f"period: give duration= [s] instead (got cycles={cycles!r})")
        if duration is None:
            raise InputError(f"a {type(scenario.supply).__name__} supply has no period: give duration= [s]")
        duration = check_range("duration", duration, 1e-9, MAX_DURATION, unit="s")
    seed = check_seed(seed)
    if needs_time_domain(scenario):
        if histogram or charge_edges is not None or phase_bins != DEFAULT_PHASE_BINS:
            raise InputError("histogram mode is not available for a conducting host or a supply without a period "
                             "(every event is kept); leave histogram, phase_bins and charge_edges unset")
        if chunk_cycles is not None:
            chunk_cycles = check_int("chunk_cycles", chunk_cycles, 1, MAX_CYCLES)
        warn_host_strength(scenario.insulation, scenario.supply.rms * supply_peak_factor(scenario.supply),
                           "at the supply's peak")
        return simulate_time_domain(scenario, seed=seed, cycles=cycles, duration=duration, progress=progress,
                                    should_stop=should_stop, chunk_cycles=chunk_cycles)
    assert cycles is not None
    if not isinstance(histogram, bool):
        raise InputError(f"histogram must be True or False; got {histogram!r}")
    if not histogram and (charge_edges is not None or phase_bins != DEFAULT_PHASE_BINS):
        raise InputError("charge_edges and phase_bins set the histogram mode's bins; give histogram=True with them "
                         "(without it every event is kept and they would be ignored)")
    args = kernel_arguments(scenario)
    warn_host_strength(scenario.insulation, scenario.supply.rms * supply_peak_factor(scenario.supply),
                       "at the supply's peak")
    bound = args.max_events_per_cycle(1.0)
    if histogram:
        phase_bins = check_int("phase_bins", phase_bins, 1, MAX_HISTOGRAM_PHASE_BINS)
        try:
            edges = _default_charge_edges(args) if charge_edges is None else np.asarray(charge_edges, dtype=float)
        except (TypeError, ValueError):
            raise InputError("charge_edges must be an array of real numbers [C]") from None
        if edges.ndim != 1 or edges.size < 2 or edges.size > MAX_HISTOGRAM_CHARGE_EDGES or not np.all(
            np.isfinite(edges)
        ) or np.any(np.diff(edges) <= 0):
            raise InputError(f"charge_edges must be 2 to {MAX_HISTOGRAM_CHARGE_EDGES} finite, strictly increasing "
                             "values [C]")
        check_memory(f"a histogram of {phase_bins} phase x {edges.size - 1} charge bins", 8 * phase_bins
                     * (edges.size - 1))
        counts = np.zeros((phase_bins, edges.size - 1), dtype=np.int64)
    else:
        edges = np.array([0.0, 1.0])
        counts = np.zeros((0, 1), dtype=np.int64)
    if chunk_cycles is None:
        chunk_cycles = max(1, min(cycles, _BUFFER_EVENTS // max(bound, 1), 100_000))
    chunk_cycles = check_int("chunk_cycles", chunk_cycles, 1, MAX_CYCLES)

    runner = VoidRunner(scenario, seed, _args=args)
    pieces: list[tuple[np.ndarray, ...]] = []
    stored = 0
    while runner.cycle < cycles:
        stop = min(cycles, runner.cycle + chunk_cycles)
        piece = runner.run(stop - runner.cycle, store=not histogram, counts=counts, charge_edges=edges)
        if not histogram:
            pieces.append(piece)
            stored += piece[0].size
            if stored > _MAX_STORED_EVENTS:
                raise InputError(
                    f"more than {_MAX_STORED_EVENTS} events would be stored; use simulate(..., histogram=True)"
                )
            # each stored event: five arrays in the pieces, five after joining them, phase and cycle [8 bytes]
            check_memory(f"storing {stored} events after {runner.cycle} of {cycles} cycles (use "
                         "simulate(..., histogram=True) for long runs)", _BYTES_PER_STORED_EVENT * stored)
        if progress is not None:
            progress(runner.cycle, cycles)
        if should_stop is not None and should_stop():
            break
    done = runner.cycle
    totals = runner.totals

    if pieces:
        t, q, xb, xa, v = (np.concatenate(p) for p in zip(*pieces, strict=True))
    else:
        t = q = xb = xa = v = np.empty(0)
    f = args.frequency
    frac = t * f - np.floor(t * f)
    phase = np.minimum(frac * 360.0, np.nextafter(360.0, 0.0))
    events = Events(
        phase_deg=phase, charge=q, frequency=f, cycles=float(done), time=t, cycle=np.floor(t * f),
        voltage=v, field_before=xb, field_after=xa, label="simulated",
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
        sum_charge_voltage=float(totals[K.T_QU]), first_discharge_time=float(totals[K.T_FIRST]),
    )
