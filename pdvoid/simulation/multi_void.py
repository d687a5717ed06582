"""simulate_voids(scenario, cycles, seed) → MultiVoidResult: the superposed pattern of independent voids.

Each void of a :class:`~pdvoid.inputs.multi_void.MultiVoidScenario` is simulated alone by
:func:`pdvoid.simulate` with its own seed (:func:`void_seeds`), over the same cycles from the same start (an
uncharged void at the positive-going zero crossing); the events of all voids are merged by time into one record,
each event keeping the index of its void. Independent voids add their apparent charges to the terminals, so the
merged record is what a detector without pulse overlap sees; pulses of two voids closer in time than the
detector's resolution would overlap in a real instrument (:func:`pdvoid.measure` models that).

A one-void MultiVoidScenario gives exactly the events of ``simulate(scenario.scenario(0), cycles, seed)``: void 0
always gets the master seed.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from pdvoid.core.arrays import frozen_array
from pdvoid.core.errors import InputError, check_int
from pdvoid.core.limits import MAX_CYCLES
from pdvoid.inputs.multi_void import MultiVoidScenario
from pdvoid.inputs.parameters import check_seed
from pdvoid.simulation.events import Events
from pdvoid.simulation.results import Result
from pdvoid.simulation.simulate import simulate

__all__ = ["MultiVoidResult", "simulate_voids", "void_seeds"]


def void_seeds(seed: int, count: int) -> tuple[int, ...]:
    """The seed of each void from the master seed: void 0 gets ``seed`` itself, void k ≥ 1 the first 32-bit word
    of ``numpy.random.SeedSequence([seed, k])``.

    SeedSequence hashes its entropy so that nearby inputs give unrelated streams (O'Neill's seed_seq design as
    adopted by NumPy, NEP 19); the derivation is fixed, so the same master seed always gives the same seeds.

    Parameters
    ----------
    seed : int
        The master seed, 0 to 2**32 - 1 [-].
    count : int
        Number of voids, 1 or more [-].

    Returns
    -------
    tuple of int
        One seed per void [-].
    """
    seed = check_seed(seed)
    count = check_int("count", count, 1, 1_000_000)
    derived = [int(np.random.SeedSequence([seed, k]).generate_state(1, dtype=np.uint32)[0]) for k in range(1, count)]
    return (seed, *derived)


@dataclass(frozen=True, eq=False)
class MultiVoidResult:
    """The superposed record of several voids: merged events, the void of each event, and each void's own run.

    Every analysis function that takes a :class:`pdvoid.Result` takes this too (it has ``events``).

    Attributes
    ----------
    events : Events
        All voids' events merged by time (ties in void order) [SI].
    void_index : numpy.ndarray
        Index of the void of each merged event, int64 [-].
    results : tuple of Result
        Each void's own result, in void order.
    scenario : MultiVoidScenario
        The scenario simulated.
    seed : int
        The master seed [-].
    seeds : tuple of int
        The seed of each void (:func:`void_seeds`) [-].
    cycles : int
        Cycles simulated [-] (the smallest over the voids if a run was stopped early).
    requested_cycles : int
        Cycles asked for [-].
    """

    events: Events
    void_index: np.ndarray
    results: tuple[Result, ...]
    scenario: MultiVoidScenario
    seed: int
    seeds: tuple[int, ...]
    cycles: int
    requested_cycles: int

    @property
    def event_count(self) -> int:
        """Number of discharges of all voids [-]."""
        return int(sum(r.event_count for r in self.results))

    @property
    def counts_per_void(self) -> tuple[int, ...]:
        """Number of discharges of each void [-]."""
        return tuple(int(r.event_count) for r in self.results)

    @property
    def charge(self) -> np.ndarray:
        """Apparent charge of each merged event, signed [C]."""
        return self.events.charge

    @property
    def phase_deg(self) -> np.ndarray:
        """Phase of each merged event [deg]."""
        return self.events.phase_deg

    @property
    def time(self) -> np.ndarray:
        """Time of each merged event [s]."""
        return self.events.time  # type: ignore[return-value]  # Events fills every array

    @property
    def duration(self) -> float:
        """Simulated time [s]."""
        return self.cycles / self.events.frequency


def simulate_voids(scenario: MultiVoidScenario, cycles: int = 1000, seed: int = 0) -> MultiVoidResult:
    """Simulate every void of ``scenario`` alone and merge their events by time (module docs).

    Parameters
    ----------
    scenario : MultiVoidScenario
        The voids with their shared insulation, supply and model.
    cycles : int, optional
        Whole AC cycles [-], 1 to 1e9.
    seed : int, optional
        Master seed [-]; each void's seed follows from it (:func:`void_seeds`), so the same seed gives
        bit-identical results.

    Returns
    -------
    MultiVoidResult
        The merged events with the void of each, and each void's result.

    Raises
    ------
    InputError
        For a scenario that is not a MultiVoidScenario, or bad ``cycles`` or ``seed`` (before any simulation).
    """
    if not isinstance(scenario, MultiVoidScenario):
        raise InputError(f"scenario must be a pdvoid.MultiVoidScenario; got {type(scenario).__name__} (use "
                         "pdvoid.simulate for a one-void pdvoid.Scenario)")
    cycles = check_int("cycles", cycles, 1, MAX_CYCLES)
    seed = check_seed(seed)
    seeds = void_seeds(seed, scenario.count)
    results = tuple(simulate(sc, cycles=cycles, seed=s) for sc, s in zip(scenario.scenarios, seeds, strict=True))
    if len(results) == 1:
        r = results[0]
        merged = r.events
        index = np.zeros(r.events.count, dtype=np.int64)
    else:
        t = np.concatenate([r.time for r in results])
        index = np.concatenate([np.full(r.events.count, i, dtype=np.int64) for i, r in enumerate(results)])
        order = np.argsort(t, kind="stable")  # equal times keep the void order
        ev0 = results[0].events
        merged = Events(
            phase_deg=np.concatenate([r.phase_deg for r in results])[order],
            charge=np.concatenate([r.charge for r in results])[order],
            frequency=ev0.frequency, cycles=float(cycles), time=t[order],
            cycle=np.concatenate([r.cycle for r in results])[order],
            voltage=np.concatenate([r.voltage for r in results])[order],
            field_before=np.concatenate([r.field_before for r in results])[order],
            field_after=np.concatenate([r.field_after for r in results])[order],
            label=f"simulated ({len(results)} voids)",
        )
        index = index[order]
    done = min(r.cycles for r in results)
    return MultiVoidResult(events=merged, void_index=frozen_array(index, np.int64), results=results, scenario=scenario,
                           seed=seed, seeds=seeds, cycles=done, requested_cycles=cycles)
