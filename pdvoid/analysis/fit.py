"""Fit a void's physics to a measured phase-resolved pattern.

The objective is the combined comparison score (:func:`pdvoid.analysis.compare.compare`) between the measured
events and a simulation of the scenario with the varied parameters, passed through the same detector model
(:func:`pdvoid.analysis.synthetic.measurement_effects`: noise, threshold, phase resolution) when one is given.
The simulation is stochastic, so every evaluation uses the same seed (common random numbers): the objective is
then a deterministic function of the parameters and differences between nearby points are not drowned in noise.

Search: a global differential evolution (scipy.optimize.differential_evolution; Storn & Price 1997) in
normalised coordinates (logarithmic for parameters whose bounds span a decade or more), then a bounded
Nelder-Mead refinement from the best point.

Uncertainty: the best point is re-simulated with ``noise_seeds`` other seeds; their scores have mean m and
standard deviation σ (the score's own noise; the best score itself is biased low, having been selected on one
seed). Every evaluated point scoring at most m + ``acceptance`` × σ (and at least ``tolerance`` above the best) is
accepted: points below that level cannot be told apart from the best by the simulation's noise. This is an
approximate-Bayesian acceptance region (Beaumont, Zhang & Balding 2002, rejection ABC with the
evaluated points as proposals — our approximation); each parameter's range is the span of its accepted values.
A parameter whose accepted span covers more than half of its (normalised) bounds is reported as not identified
by the data, rather than given with false precision.
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass
from typing import Any, TypeVar

import numpy as np
from numpy.typing import ArrayLike
from scipy.optimize import differential_evolution, minimize

from pdvoid.analysis.compare import PatternSource, compare, summarise
from pdvoid.analysis.measured import measure
from pdvoid.analysis.synthetic import measurement_effects
from pdvoid.core.errors import InputError, check_bool, check_int, check_nonnegative, check_positive
from pdvoid.inputs.measurement import Instrument, TestCircuit
from pdvoid.inputs.multi_void import MultiVoidScenario, numeric_parameters, parameter_value
from pdvoid.inputs.parameters import check_seed
from pdvoid.inputs.scenario import Scenario
from pdvoid.simulation.events import Events
from pdvoid.simulation.multi_void import MultiVoidResult, simulate_voids
from pdvoid.simulation.simulate import simulate

__all__ = ["FitResult", "fit", "FitObjective", "PENALTY"]

#: score given to parameter sets the scenario rejects (e.g. a void taller than the insulation) [-]
PENALTY = 10.0


@dataclass(frozen=True)
class _Spec:
    name: str
    low: float
    high: float
    log: bool

    def to_value(self, u: float) -> float:
        u = min(max(float(u), 0.0), 1.0)
        if self.log:
            return math.exp(math.log(self.low) + u * (math.log(self.high) - math.log(self.low)))
        return self.low + u * (self.high - self.low)

    def to_unit(self, x: float) -> float:
        if self.log:
            return (math.log(x) - math.log(self.low)) / (math.log(self.high) - math.log(self.low))
        return (x - self.low) / (self.high - self.low)


class FitObjective:
    """Score of a parameter vector (normalised coordinates in [0, 1]) against the measured pattern.

    Picklable, so it runs on worker processes or a Dask cluster.

    Parameters
    ----------
    measured : Events, Result, PatternMatrix or PatternSummary
        The measured pattern; summarised once with ``threshold`` [-].
    scenario : Scenario or MultiVoidScenario
        The starting scenario; the varied parameters replace its values [-].
    specs : tuple of _Spec
        The varied parameters with their ranges (normalised coordinate 0 = low, 1 = high) [-].
    threshold : float
        Detection threshold applied to both sides [C].
    cycles : int
        Simulated cycles per evaluation [-].
    seed : int
        Seed of every evaluation (common random numbers) [-].
    detector : dict or None
        Keyword arguments of :func:`pdvoid.analysis.synthetic.measurement_effects`, or None [-].
    measurement : tuple of (TestCircuit, Instrument) or None
        The IEC 60270 forward model :func:`pdvoid.measure` applied to every simulation instead of
        ``detector`` [-].
    """

    def __init__(self, measured: PatternSource, scenario: Scenario | MultiVoidScenario, specs: tuple[_Spec, ...], *,
                 threshold: float, cycles: int, seed: int, detector: dict | None,
                 measurement: tuple[TestCircuit, Instrument] | None = None) -> None:
        self.measurement = measurement
        self.scenario = scenario
        self.specs = specs
        self.threshold = threshold
        self.cycles = cycles
        self.seed = seed
        self.detector = detector
        self.measured = summarise(measured, threshold)

    def scenario_at(self, u: Sequence[float] | np.ndarray) -> Scenario | MultiVoidScenario:
        """The scenario at normalised coordinates ``u``.

        Parameters
        ----------
        u : sequence of float or numpy.ndarray
            One coordinate in [0, 1] per varied parameter [-].

        Returns
        -------
        Scenario
            The starting scenario with the varied parameters set.

        Raises
        ------
        InputError
            When the parameter values make an impossible scenario.
        """
        return self.scenario.replace(**{s.name: s.to_value(x) for s, x in zip(self.specs, u, strict=True)})

    def score(self, u: Sequence[float] | np.ndarray, seed: int | None = None) -> float:
        """The comparison score of the simulation at ``u`` (:func:`pdvoid.analysis.compare.compare`).

        Parameters
        ----------
        u : sequence of float or numpy.ndarray
            One coordinate in [0, 1] per varied parameter [-].
        seed : int or None
            Seed of the simulation; None for the objective's seed [-].

        Returns
        -------
        float
            The score (0 for identical patterns) [-]; :data:`PENALTY` when the scenario is impossible.
        """
        seed = self.seed if seed is None else seed
        try:
            sc = self.scenario_at(u)
            res = (simulate_voids(sc, cycles=self.cycles, seed=seed) if isinstance(sc, MultiVoidScenario)
                   else simulate(sc, cycles=self.cycles, seed=seed))
        except InputError:
            return PENALTY
        ev: Events | Any = res
        if self.measurement is not None:
            ev = measure(res, self.measurement[0], self.measurement[1], seed=seed)
        elif self.detector is not None:
            ev = measurement_effects(res.events if isinstance(res, MultiVoidResult) else res, seed,
                                     threshold=self.threshold, **self.detector)
        return float(compare(ev, self.measured, self.threshold).score)

    def __call__(self, u: Sequence[float] | np.ndarray) -> float:
        return self.score(u)


_Item = TypeVar("_Item")


class _RecordingMap:
    """The map differential evolution evaluates its population with: records every (point, score)."""

    def __init__(self, workers: int | None, client: Any,
                 progress: Callable[[int, int], None] | None = None, total: int = 0) -> None:
        self.workers = workers
        self.client = client
        self.points: list[np.ndarray] = []
        self.scores: list[float] = []
        self.progress = progress
        self.total = total
        self.done = 0

    def run(self, func: Callable[[_Item], float], items: list[_Item]) -> list[float]:
        """Evaluate without recording."""
        if (self.workers == 1 and self.client is None) or len(items) == 1:
            out = [func(x) for x in items]
        else:
            from pdvoid.simulation.parallel import parallel_map

            out = parallel_map(func, items, workers=self.workers, client=self.client)
        self.done += len(items)
        if self.progress is not None:
            self.progress(min(self.done, self.total), self.total)
        return out

    def __call__(self, func: Callable[[np.ndarray], float], iterable: Iterable[ArrayLike]) -> list[float]:
        items = [np.array(x, dtype=float) for x in iterable]
        out = self.run(func, items)
        self.points.extend(items)
        self.scores.extend(float(v) for v in out)
        return out


@dataclass(frozen=True, eq=False)
class FitResult:
    """Outcome of :func:`fit` (values in SI).

    Attributes
    ----------
    best : dict[str, float]
        {parameter: best value}.
    ranges : dict[str, tuple[float, float]]
        {parameter: (low, high)} of the accepted region.
    identified : dict[str, bool]
        {parameter: False when the data cannot pin it down (accepted span > half its bounds)}.
    score : float
        comparison score at the best values (common random numbers) [-].
    noise : float
        standard deviation of the score over other seeds at the best values [-].
    start : dict[str, float]
        {parameter: value in the starting scenario}.
    start_score : float
        the score of the starting values [-].
    bounds : dict[str, tuple[float, float]]
        {parameter: (low, high)} searched.
    runs : int
        simulations spent [-].
    elapsed : float
        wall time of the fit [s].
    scenario : Scenario or MultiVoidScenario
        the starting scenario with the best values.
    points, scores : numpy.ndarray
        every evaluated parameter set (SI, one row each) and its score.
    """

    best: dict[str, float]
    ranges: dict[str, tuple[float, float]]
    identified: dict[str, bool]
    score: float
    noise: float
    start: dict[str, float]
    start_score: float
    bounds: dict[str, tuple[float, float]]
    runs: int
    elapsed: float
    scenario: Scenario | MultiVoidScenario
    points: np.ndarray
    scores: np.ndarray

    def table(self, truth: dict[str, float] | None = None) -> str:
        """A plain-text table: parameter, (true,) start, fitted, range, identified.

        Parameters
        ----------
        truth : dict of str to float or None
            {parameter: true value} [SI] to show in a "true" column (synthetic data), or None.

        Returns
        -------
        str
            The table, one line per parameter.
        """
        head = ["parameter"] + (["true"] if truth else []) + ["start", "fitted", "range", "identified"]
        rows = [head]
        for k, v in self.best.items():
            lo, hi = self.ranges[k]
            row = [k] + ([f"{truth[k]:.4g}"] if truth else [])
            row += [f"{self.start[k]:.4g}", f"{v:.4g}", f"{lo:.4g} .. {hi:.4g}",
                    "yes" if self.identified[k] else "no"]
            rows.append(row)
        widths = [max(len(r[i]) for r in rows) for i in range(len(head))]
        lines = ["  ".join(c.ljust(w) for c, w in zip(r, widths, strict=True)) for r in rows]
        lines.append(f"score {self.score:.4g} (start {self.start_score:.4g}, noise σ {self.noise:.3g}); "
                     f"{self.runs} simulations in {self.elapsed:.1f} s")
        return "\n".join(lines)


def _specs(scenario: Scenario | MultiVoidScenario, vary: dict) -> tuple[_Spec, ...]:
    if not isinstance(vary, dict) or not vary:
        raise InputError("vary must be a non-empty dict {'void.diameter': (low, high), ...}")
    if len(vary) > 20:
        raise InputError(f"vary may hold at most 20 parameters; got {len(vary)}")
    numeric = numeric_parameters(scenario)
    specs = []
    for name, bounds in vary.items():
        if name not in numeric:
            raise InputError(f"vary: {name!r} is not a numeric scenario parameter; choose from {sorted(numeric)}")
        if not isinstance(bounds, (tuple, list)) or len(bounds) != 2:
            raise InputError(f"vary[{name!r}] must be (low, high); got {bounds!r}")
        lo = float(bounds[0]) if not isinstance(bounds[0], bool) else math.nan
        hi = float(bounds[1]) if not isinstance(bounds[1], bool) else math.nan
        if not (math.isfinite(lo) and math.isfinite(hi) and lo < hi):
            raise InputError(f"vary[{name!r}] needs finite low < high; got {bounds!r}")
        specs.append(_Spec(name, lo, hi, lo > 0.0 and hi / lo >= 10.0))
    return tuple(specs)


_DETECTOR_KEYS = {"noise", "relative_noise", "phase_resolution_deg"}


def _check_measurement_model(detector: dict | None, circuit: object, instrument: object, seed: int,
                            threshold: float) -> tuple[TestCircuit, Instrument] | None:
    """Check a fit's model of the measurement before any simulation: a simple detector model, or a test circuit
    with an instrument (not both).

    Parameters
    ----------
    detector : dict or None
        ``measurement_effects`` settings (keys ``noise``, ``relative_noise``, ``phase_resolution_deg``) [-].
    circuit, instrument : TestCircuit and Instrument, or None
        the measuring chain, given together [-].
    seed : int
        seed the detector model is tried with [-].
    threshold : float
        detection threshold [C].

    Returns
    -------
    tuple of (TestCircuit, Instrument) or None
        the measuring chain, or None when there is none.

    Raises
    ------
    InputError
        For a detector that is not such a dict or whose settings the detector model refuses, a circuit without
        an instrument (or the reverse), or a detector together with a measuring chain.
    """
    if detector is not None:
        if not isinstance(detector, dict) or not set(detector) <= _DETECTOR_KEYS:
            raise InputError(f"detector must be None or a dict with keys from {sorted(_DETECTOR_KEYS)}; got "
                             f"{detector!r}"[:300])
        # the detector model checks its own settings: try them once on no events, before any simulation
        measurement_effects(Events(phase_deg=np.empty(0), charge=np.empty(0), frequency=50.0, cycles=1.0), seed,
                            threshold=threshold, **detector)
    if circuit is None and instrument is None:
        return None
    if not isinstance(circuit, TestCircuit) or not isinstance(instrument, Instrument):
        raise InputError("circuit and instrument must be given together as a pdvoid.TestCircuit and a "
                         f"pdvoid.Instrument; got {type(circuit).__name__} and {type(instrument).__name__}")
    if detector is not None:
        raise InputError("give either detector or circuit and instrument, not both")
    return circuit, instrument


def fit(
    measured: PatternSource,
    scenario: Scenario | MultiVoidScenario,
    vary: dict,
    *,
    threshold: float = 0.0,
    cycles: int = 1000,
    seed: int = 0,
    detector: dict | None = None,
    circuit: TestCircuit | None = None,
    instrument: Instrument | None = None,
    popsize: int = 8,
    maxiter: int = 30,
    polish: bool = True,
    noise_seeds: int = 6,
    acceptance: float = 2.0,
    tolerance: float = 0.005,
    workers: int | None = 1,
    client: Any = None,
    progress: Callable[[int, int], None] | None = None,
) -> FitResult:
    """Find the values of ``vary`` whose simulated pattern best matches ``measured``.

    Parameters
    ----------
    measured : Events, Result, PatternMatrix or PatternSummary
        measured events (:func:`pdvoid.read_events`), a Result, or a count matrix.
    scenario : Scenario or MultiVoidScenario
        the starting scenario (its other parameters stay fixed); a MultiVoidScenario is simulated with
        :func:`pdvoid.simulate_voids` and its voids' parameters are named ``"voids[i].diameter"``.
    vary : dict
        {dotted parameter: (low, high)} in SI.
    threshold : float
        the measurement's detection limit [C]; applied to both sides.
    cycles : int
        simulated cycles per evaluation [-].
    seed : int
        the common seed of every evaluation [-].
    detector : dict or None
        keyword arguments of :func:`pdvoid.analysis.synthetic.measurement_effects` (noise [C],
        relative_noise [-], phase_resolution_deg [deg]) to pass simulations through the same measurement
        effects as the data; None for none.
    circuit, instrument : TestCircuit and Instrument, or None
        the IEC 60270 forward model (:func:`pdvoid.measure`) to pass every simulation through, in place of
        ``detector``; give both or neither.
    popsize, maxiter : int
        differential evolution's population multiplier and generations [-].
    polish : bool
        refine the best point with bounded Nelder-Mead.
    noise_seeds : int
        extra seeds to measure the score's noise at the best point [-].
    acceptance : float
        accepted points score at most mean + ``acceptance`` × σ of the best point's scores over
        other seeds [-].
    tolerance : float
        the smallest margin of the accepted scores above the best score [-].
    workers : int or None
        processes for the population (1 = in this process; None = all local cores).
    client : Any
        a dask.distributed Client or scheduler address (then ``workers`` is ignored).
    progress : Callable[[int, int], None], optional
        called as progress(simulations_done, at_most) after each batch of simulations; ``at_most`` is the
        budget of the start, every generation, the polish and the noise seeds (an early stop ends below it).

    Returns
    -------
    FitResult
        The best values, their accepted ranges and whether each is identified, the scores and the runs.

    Raises
    ------
    InputError
        For a bad scenario, ``vary``, threshold, detector or run settings (checked before any simulation).
    """
    if not isinstance(scenario, (Scenario, MultiVoidScenario)):
        raise InputError(f"scenario must be a pdvoid.Scenario or pdvoid.MultiVoidScenario; got "
                         f"{type(scenario).__name__}")
    specs = _specs(scenario, vary)
    threshold = check_nonnegative("threshold", threshold, "C")
    cycles = check_int("cycles", cycles, 10, 10_000_000)
    popsize = check_int("popsize", popsize, 4, 200)
    maxiter = check_int("maxiter", maxiter, 1, 10_000)
    noise_seeds = check_int("noise_seeds", noise_seeds, 2, 1000)
    acceptance = check_positive("acceptance", acceptance)
    tolerance = check_nonnegative("tolerance", tolerance)
    seed = check_seed(seed)
    polish = check_bool("polish", polish)
    if workers is not None:
        workers = check_int("workers", workers, 1, 1024)
    measurement = _check_measurement_model(detector, circuit, instrument, seed, threshold)
    t0 = time.perf_counter()
    objective = FitObjective(measured, scenario, specs, threshold=threshold, cycles=cycles, seed=seed,
                             detector=detector, measurement=measurement)
    start = {s.name: float(_get(scenario, s.name)) for s in specs}
    x0 = np.array([min(max(s.to_unit(start[s.name]), 0.0), 1.0) if start[s.name] > 0 or not s.log else 0.5
                   for s in specs])
    if progress is not None and not callable(progress):
        raise InputError(f"progress must be callable or None; got {type(progress).__name__}")
    # scipy's population is popsize × parameters; the polish is capped at maxfev (Nelder-Mead may run a few more)
    budget = (1 + popsize * len(specs) * (maxiter + 1) + (40 * len(specs) if polish else 0) + noise_seeds)
    mapper = _RecordingMap(workers, client, progress, budget)
    start_score = mapper(objective, [x0])[0]
    de = differential_evolution(
        objective, [(0.0, 1.0)] * len(specs), popsize=popsize, maxiter=maxiter, tol=1e-3, seed=seed, x0=x0,
        polish=False, updating="deferred", workers=mapper, init="latinhypercube",
    )
    best_u, best_score = np.array(de.x), float(de.fun)
    if polish:
        def recorded(u):
            return mapper(objective, [np.clip(u, 0.0, 1.0)])[0]

        loc = minimize(recorded, best_u, method="Nelder-Mead", bounds=[(0.0, 1.0)] * len(specs),
                       options={"maxfev": 40 * len(specs), "xatol": 1e-3, "fatol": 1e-4})
        if loc.fun < best_score:
            best_u, best_score = np.clip(loc.x, 0.0, 1.0), float(loc.fun)
    noise_scores = mapper.run(_SeededScore(objective, best_u), list(range(seed + 1, seed + 1 + noise_seeds)))
    noise = float(np.std(noise_scores, ddof=1))
    # the best point re-simulated with other random numbers scores about mean(noise_scores) ± noise: the CRN
    # optimum is biased low (selected on one seed), so the acceptance level starts from that mean
    level = max(float(np.mean(noise_scores)) + acceptance * noise, best_score + tolerance)
    pts = np.array(mapper.points)
    scs = np.array(mapper.scores)
    ok = scs <= level
    best, ranges, identified = {}, {}, {}
    for i, s in enumerate(specs):
        best[s.name] = s.to_value(best_u[i])
        acc = np.clip(pts[ok, i], 0.0, 1.0)
        ranges[s.name] = (s.to_value(acc.min()), s.to_value(acc.max()))
        identified[s.name] = bool(acc.max() - acc.min() <= 0.5)
    values = np.array([[s.to_value(u) for s, u in zip(specs, row, strict=True)] for row in pts])
    return FitResult(
        best=best, ranges=ranges, identified=identified, score=best_score, noise=noise, start=start,
        start_score=float(start_score), bounds={s.name: (s.low, s.high) for s in specs},
        runs=len(mapper.scores) + noise_seeds,
        elapsed=time.perf_counter() - t0, scenario=objective.scenario_at(best_u), points=values, scores=scs,
    )


class _SeededScore:
    """The objective at a fixed point, as a function of the seed (for the noise estimate)."""

    def __init__(self, objective: FitObjective, u: np.ndarray) -> None:
        self.objective = objective
        self.u = np.array(u)

    def __call__(self, seed: int | np.integer) -> float:
        return self.objective.score(self.u, seed=int(seed))


def _get(scenario: Scenario | MultiVoidScenario, name: str) -> float:
    return float(parameter_value(scenario, name))
