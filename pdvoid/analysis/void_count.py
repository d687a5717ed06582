"""How many voids does a measured pattern support? Fit one, two, three ... voids and compare the explanations.

Engine: :func:`pdvoid.fit` (differential evolution on the comparison score, common random numbers) fits each
explanation: k copies of the scenario's void (a :class:`~pdvoid.inputs.multi_void.MultiVoidScenario`), each
with its own values of the per-void parameters in ``vary`` (``"void.diameter"`` becomes ``"voids[0].diameter"``,
``"voids[1].diameter"``, ...), the shared ones (``"model.*"``, ``"insulation.*"``) common to all.

Criterion: a held-out score with the one-standard-error rule.

1. Held-out score. Each explanation's best point is re-simulated with ``check_seeds`` fresh seeds, the same
   seeds for every explanation, none of them used in the fit, and scored against the measured pattern. The fit's
   own best score is optimistic (it was selected on one seed, so it partly fits that seed's noise, and an
   explanation with more voids has more freedom to do so); the held-out mean is not.
2. One-standard-error rule (Breiman, Friedman, Olshen & Stone 1984, Classification and Regression Trees,
   Wadsworth, §3.4.3; Hastie, Tibshirani & Friedman 2009, The Elements of Statistical Learning, 2nd ed.,
   Springer, §7.10): among the explanations, take the one with the lowest held-out mean; then choose the
   *fewest* voids whose held-out mean exceeds that lowest one by no more than one standard error of the paired
   difference (the differences seed by seed, so the noise the explanations share cancels) or by ``tolerance``,
   whichever is larger. The explanations are nested (a void of k + 1 may shrink below inception and vanish), so
   more voids never fit worse in principle; the rule asks the improvement to stand out of the simulation noise
   before an extra void is accepted.

Why not AIC or BIC: both need a maximised log-likelihood, and the comparison score is a weighted sum of
distribution distances, not a log-likelihood; treating it as one would need a scale (a "temperature") that
nothing in the data fixes, and AIC's penalty of one unit per parameter would then be arbitrary. The held-out
score needs no such scale. What it does not guard against: an explanation that fits the *measured* sample's own
chance fluctuations (the measured record is one sample and is shared by every explanation); with records of
hundreds of cycles or more that effect is small against the simulation noise the rule already allows for.
"""

from __future__ import annotations

import math
import time
from collections.abc import Sequence
from dataclasses import dataclass, replace
from typing import Any

import numpy as np

from pdvoid.analysis.compare import PatternSource
from pdvoid.analysis.fit import FitObjective, FitResult, _specs, fit
from pdvoid.core.errors import InputError, check_int, check_nonnegative
from pdvoid.inputs.measurement import Instrument, TestCircuit
from pdvoid.inputs.multi_void import MAX_VOIDS, MultiVoidScenario
from pdvoid.inputs.parameters import check_seed
from pdvoid.inputs.scenario import Scenario

__all__ = ["VoidCountResult", "void_count", "void_vary", "CHECK_SEED_OFFSET"]

#: the held-out seeds are seed + CHECK_SEED_OFFSET + j (mod 2**32): apart from the fit's seed and its noise seeds
CHECK_SEED_OFFSET = 100_003


@dataclass(frozen=True, eq=False)
class VoidCountResult:
    """Outcome of :func:`void_count`.

    Attributes
    ----------
    counts : tuple of int
        The numbers of voids tried [-].
    fits : dict
        {number of voids: :class:`pdvoid.analysis.fit.FitResult`}.
    held_out : dict
        {number of voids: held-out scores, one per check seed, numpy array} [-].
    held_out_mean : dict
        {number of voids: mean held-out score} [-].
    standard_error : dict
        {number of voids: standard error of its paired difference to the lowest held-out mean} [-] (0 for the
        lowest itself).
    lowest : int
        The number of voids with the lowest held-out mean [-].
    supported : int
        The number of voids the data support (one-standard-error rule, module docs) [-].
    tolerance : float
        The smallest margin allowed by the rule [-].
    check_seeds : tuple of int
        The held-out seeds [-].
    elapsed : float
        Wall time [s].
    """

    counts: tuple[int, ...]
    fits: dict[int, FitResult]
    held_out: dict[int, np.ndarray]
    held_out_mean: dict[int, float]
    standard_error: dict[int, float]
    lowest: int
    supported: int
    tolerance: float
    check_seeds: tuple[int, ...]
    elapsed: float

    @property
    def scenario(self) -> MultiVoidScenario:
        """The best scenario with the supported number of voids."""
        sc = self.fits[self.supported].scenario
        if not isinstance(sc, MultiVoidScenario):  # void_count always fits MultiVoidScenarios
            raise InputError("internal error: a void-count fit returned a one-void scenario")
        return sc

    def table(self) -> str:
        """A plain-text table: voids, fitted per-void values, fit score, held-out mean ± standard error.

        Returns
        -------
        str
            One line per number of voids, then the verdict in words.
        """
        lines = [f"{'voids':>5}  {'fit score':>9}  {'held-out':>9}  {'± s.e.':>7}  fitted values"]
        for k in self.counts:
            r = self.fits[k]
            vals = ", ".join(f"{n}={v:.4g}" for n, v in r.best.items())
            mark = "  <- supported" if k == self.supported else ""
            lines.append(f"{k:>5}  {r.score:>9.4g}  {self.held_out_mean[k]:>9.4g}  {self.standard_error[k]:>7.2g}  "
                         f"{vals}{mark}")
        lines.append(f"The data support {self.supported} void{'s' if self.supported != 1 else ''}: the fewest whose "
                     f"held-out score (over {len(self.check_seeds)} fresh seeds) lies within one standard error "
                     f"(or {self.tolerance:g}) of the lowest ({self.lowest} void{'s' if self.lowest != 1 else ''}).")
        return "\n".join(lines)


def void_vary(scenario: Scenario, vary: dict, count: int) -> dict[str, tuple[float, float]]:
    """Expand per-void names of ``vary`` to ``count`` voids: ``"void.x"`` → ``"voids[0].x"`` ... ``"voids[k-1].x"``.

    Parameters
    ----------
    scenario : Scenario
        The one-void template (its parameters are checked against ``vary``).
    vary : dict
        {dotted parameter: (low, high)} in SI, as for :func:`pdvoid.fit`.
    count : int
        Number of voids [-].

    Returns
    -------
    dict
        The expanded ranges; shared parameters (``model.*``, ``insulation.*``) unchanged.
    """
    _specs(scenario, vary)  # the one-void names and ranges are checked as pdvoid.fit checks them
    out: dict[str, tuple[float, float]] = {}
    for name, bounds in vary.items():
        if name.startswith("void."):
            for i in range(count):
                out[f"voids[{i}].{name[5:]}"] = (float(bounds[0]), float(bounds[1]))
        else:
            out[name] = (float(bounds[0]), float(bounds[1]))
    return out


def _start(scenario: Scenario, vary: dict, count: int) -> MultiVoidScenario:
    """k copies of the template void with the per-void parameters spread over their ranges (at (i + 1)/(k + 1) of
    each range, on a log scale where the range spans a decade): identical copies would start the search on the
    symmetric line where the voids cannot be told apart."""
    if count == 1:
        return MultiVoidScenario.from_scenario(scenario)
    voids = []
    for i in range(count):
        changes: dict[str, Any] = {}
        for name, (lo, hi) in vary.items():
            if not name.startswith("void."):
                continue
            u = (i + 1) / (count + 1)
            log = lo > 0.0 and hi / lo >= 10.0
            changes[name[5:]] = math.exp(math.log(lo) + u * math.log(hi / lo)) if log else lo + u * (hi - lo)
        try:
            voids.append(replace(scenario.void, **changes))
        except InputError:
            voids.append(scenario.void)
    return MultiVoidScenario.from_scenario(scenario, voids)


def void_count(
    measured: PatternSource,
    scenario: Scenario,
    vary: dict,
    *,
    counts: Sequence[int] = (1, 2, 3),
    threshold: float = 0.0,
    cycles: int = 1000,
    seed: int = 0,
    detector: dict | None = None,
    circuit: TestCircuit | None = None,
    instrument: Instrument | None = None,
    popsize: int = 8,
    maxiter: int = 30,
    polish: bool = True,
    check_seeds: int = 8,
    tolerance: float = 0.01,
    workers: int | None = 1,
    client: Any = None,
) -> VoidCountResult:
    """Fit explanations with ``counts`` voids and report how many voids the measured pattern supports.

    Parameters
    ----------
    measured : Events, Result, PatternMatrix or PatternSummary
        The measured pattern (as for :func:`pdvoid.fit`).
    scenario : Scenario
        The one-void template: every void of an explanation starts as its void; insulation, supply and model
        are shared.
    vary : dict
        {dotted parameter: (low, high)} in SI; ``"void.*"`` names are fitted per void, the others shared.
    counts : sequence of int
        The numbers of voids to try, distinct, 1 to 10 each, in increasing order (default 1, 2, 3) [-].
    threshold : float
        The measurement's detection limit [C] (as for :func:`pdvoid.fit`).
    cycles : int
        Simulated cycles per evaluation [-].
    seed : int
        The common seed of every fit [-]; the held-out seeds follow from it (:data:`CHECK_SEED_OFFSET`).
    detector : dict or None
        The detector model, as for :func:`pdvoid.fit`.
    circuit, instrument : TestCircuit and Instrument, or None
        The IEC 60270 forward model, as for :func:`pdvoid.fit` (give both or neither).
    popsize, maxiter : int
        Differential evolution's population multiplier and generations [-], as for :func:`pdvoid.fit`.
    polish : bool
        Refine each best point with Nelder-Mead, as for :func:`pdvoid.fit`.
    check_seeds : int
        Fresh seeds for the held-out score, 3 to 1000 [-].
    tolerance : float
        The smallest margin of the one-standard-error rule [-], >= 0 (score units).
    workers : int or None
        Processes for the fits' populations, as for :func:`pdvoid.fit`.
    client : Any
        A dask.distributed Client, as for :func:`pdvoid.fit`.

    Returns
    -------
    VoidCountResult
        Each explanation's fit and held-out scores, and the supported number of voids.

    Raises
    ------
    InputError
        For a bad scenario, ``vary``, ``counts`` or setting (checked before any simulation).

    References
    ----------
    breiman1984 (one-standard-error rule, §3.4.3) and hastie2009 (§7.10, cross-validation and the rule);
    full citations in the module docs. Valid as a comparison of explanations that :func:`pdvoid.fit` can fit;
    the voids are independent (:class:`pdvoid.MultiVoidScenario`).
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a one-void pdvoid.Scenario (the template of every void); got "
                         f"{type(scenario).__name__}")
    if isinstance(counts, (str, bytes)) or not isinstance(counts, Sequence) or not counts:
        raise InputError(f"counts must be a non-empty sequence of numbers of voids, e.g. (1, 2, 3); got {counts!r}")
    ks = tuple(check_int(f"counts[{i}]", k, 1, min(10, MAX_VOIDS)) for i, k in enumerate(counts))
    if any(b <= a for a, b in zip(ks, ks[1:], strict=False)):
        raise InputError(f"counts must be distinct and increasing; got {counts!r}")
    seed = check_seed(seed)
    nchk = check_int("check_seeds", check_seeds, 3, 1000)
    tolerance = check_nonnegative("tolerance", tolerance)
    threshold = check_nonnegative("threshold", threshold, "C")
    if (circuit is None) != (instrument is None):
        raise InputError("circuit and instrument must be given together (or neither)")
    measurement = None if circuit is None or instrument is None else (circuit, instrument)
    vary_by_k = {k: void_vary(scenario, vary, k) for k in ks}
    for k in ks:  # every name and range checked on the k-void scenario before any fit runs
        _specs(_start(scenario, vary, k), vary_by_k[k])
    t0 = time.perf_counter()
    seeds = tuple((seed + CHECK_SEED_OFFSET + j) % 2**32 for j in range(nchk))
    fits: dict[int, FitResult] = {}
    held: dict[int, np.ndarray] = {}
    for k in ks:
        r = fit(measured, _start(scenario, vary, k), vary_by_k[k], threshold=threshold, cycles=cycles, seed=seed,
                detector=detector, circuit=circuit, instrument=instrument, popsize=popsize, maxiter=maxiter,
                polish=polish, workers=workers, client=client)
        fits[k] = r
        check = FitObjective(measured, r.scenario, (), threshold=float(threshold), cycles=cycles, seed=seed,
                             detector=detector,
                             measurement=measurement)
        held[k] = np.array([check.score([], seed=s) for s in seeds])
    means = {k: float(np.mean(v)) for k, v in held.items()}
    lowest = min(ks, key=lambda k: (means[k], k))
    se = {k: (0.0 if k == lowest else float(np.std(held[k] - held[lowest], ddof=1) / math.sqrt(nchk))) for k in ks}
    supported = next(k for k in ks if means[k] - means[lowest] <= max(se[k], tolerance))
    return VoidCountResult(counts=ks, fits=fits, held_out=held, held_out_mean=means, standard_error=se,
                           lowest=lowest, supported=supported, tolerance=tolerance, check_seeds=seeds,
                           elapsed=time.perf_counter() - t0)
