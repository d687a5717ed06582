"""A calibrated posterior for a void's physics from a measured pattern: Bayesian synthetic likelihood sampled by
MCMC (``pdvoid.fit(..., method="posterior")``).

**Why this method.** The simulator has no likelihood we can write down (a sequence of discharges depends on every
earlier one through the deposited charge and the emission memory), so the inference must be likelihood-free. The
alternatives considered:

- *Rejection ABC / ABC-SMC* (Beaumont, Zhang & Balding 2002; Sisson, Fan & Tanaka 2007; Toni et al. 2009)
  accept parameters whose simulation lies within a tolerance ε of the data. The posterior is exact only as
  ε → 0, and with a finite ε (which a budget of a few thousand simulations forces) it is wider than the true
  posterior by an amount that depends on ε and the distance: intervals are then conservative by an unknown
  margin, which is the calibration problem we are solving. ABC-SMC also needs one fresh simulation per
  proposal, without common random numbers.
- *Neural posterior estimation* needs tens of thousands of training simulations and a neural-network
  library for a posterior of a few parameters; too heavy for a workbench.
- *Bayesian synthetic likelihood* (Wood 2010, Nature 466, 1102-1104; Price, Drovandi, Lee & Nott 2018,
  J. Comput. Graph. Stat. 27, 1-11), chosen here: at each parameter set θ, R simulations give the mean μ̂(θ)
  and covariance S(θ) of a short statistic vector s (:mod:`pdvoid.analysis.pattern_statistics`), taken as
  normal. It needs no tolerance, it is a smooth function of θ that a standard MCMC sampler handles, and counts
  and moments of thousands of discharges are close to normal.

**Likelihood with an estimated covariance** (our own arrangement of standard parts). A covariance re-estimated at
every θ from R = 20 runs in d = 12 dimensions is noisy: its inverse overstates the precision by a factor of about
(R - 1)/(R - d - 2) (the mean of an inverse Wishart matrix) and its log-determinant, rough from point to point,
shapes the posterior more than the data do. So the covariance is estimated *once*, from R0 = ``pilot`` (100)
simulations at the mode found in step 1 below, scaled by (R0 - 1)/(R0 - d - 2) so that its inverse is an unbiased
estimate of the precision, and kept fixed; at each θ only the mean μ̂(θ) is estimated, from R simulations (common
seeds). The measured statistics are then scored with the normal density N(s_obs; μ̂(θ), S0 (c + 1/R)), where c is
simulated / measured cycles (1 by default; the statistics' spread scales with the inverse length of the record,
assuming cycles independent of each other) and 1/R carries the sampling error of μ̂. The assumption is that the
covariance changes little across the posterior, which is narrow against the prior once the data are informative;
the coverage study tests the outcome. For the search of step 1 only, each point is scored with its own
covariance through the Student t predictive density with R - d degrees of freedom (Geisser & Cornfield 1963,
J. R. Stat. Soc. B 25, 368-376, from memory), which stays finite far from the data. A floor of
:data:`STATISTIC_FLOOR` is added to the diagonal.

**Sampler.** The affine-invariant ensemble sampler of Goodman & Weare (2010, Comm. App. Math. Comp. Sci. 5,
65-80) as implemented in emcee (Foreman-Mackey, Hogg, Lang & Goodman 2013, PASP 125, 306-312), in the
normalised coordinates u in [0, 1] of each parameter. Its walkers need no tuning of step sizes, which matters for
parameters whose scales differ by orders of magnitude.

**Common random numbers.** The R simulations at every θ use the same R seeds, so the synthetic log-likelihood is a
deterministic function of θ: the chain does not stick at a point whose likelihood was overestimated by chance (the
known weakness of a noisy likelihood in MCMC), and nearby θ are compared on the same random numbers. The price is
that μ̂(θ) carries the same sampling error (about S0/R) everywhere, which the term 1/R of the covariance accounts
for.

**Priors** (stated per parameter in the result): uniform on [low, high] of ``vary``, or log-uniform (uniform in
log of the value) for scale parameters, which is the default when low > 0 and high / low >= 10 (rates, times,
sizes spanning a decade); ``priors={"model.surface_rate_same": "log-uniform"}`` sets it explicitly. Parameter sets
the scenario refuses (e.g. a void taller than the insulation) have zero prior density.

**Steps.** (1) a Latin hypercube of ``8 k`` prior points (k parameters), the fixed covariance at the best of them,
and a bounded Nelder-Mead search from there give a starting point near the posterior mode, where the fixed
covariance is estimated again; (2) ``walkers`` walkers start in a ball about it (standard
deviation 0.05 of each normalised range) and run
``steps`` steps; the first ``burn`` are discarded; (3) the diagnostics: mean acceptance fraction (healthy between
about 0.2 and 0.5), integrated autocorrelation time τ per parameter (emcee's estimator; the effective sample size is
walkers × kept steps / τ), and the split potential scale reduction R̂ across the walkers' chains (Gelman et al.
2013, Bayesian Data Analysis, 3rd ed., section 11.4; values above 1.1 say the chains disagree); the result's
``notes`` say in plain words when any of them is poor; (4) the posterior-predictive check
(:mod:`pdvoid.analysis.predictive`).

**Credible intervals** are equal-tailed: the (1 - level)/2 and (1 + level)/2 quantiles of the kept samples. Their
coverage was checked on synthetic patterns with parameters drawn from the prior (``benchmarks/posterior_coverage.py``
and a reduced study in the tests).

**Reproducibility.** Every random number comes from the seed: the replicate seeds, the Latin hypercube, the
walkers' start and emcee's generator (a ``numpy.random.RandomState`` seeded from ``seed``). The simulations are
mapped with :func:`pdvoid.simulation.parallel.parallel_map`, which returns results in order whichever backend runs
them, so serial, local-process and Dask runs give bit-identical samples.
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, field
from typing import Any

import emcee
import numpy as np
from scipy.optimize import minimize
from scipy.stats import qmc

from pdvoid.analysis.fit import _check_measurement_model, _get, _Spec, _specs
from pdvoid.analysis.measured import measure
from pdvoid.analysis.pattern_statistics import STATISTIC_NAMES, PatternStatistics, pattern_statistics
from pdvoid.analysis.predictive import PredictiveCheck, predictive_check
from pdvoid.analysis.synthetic import measurement_effects
from pdvoid.core.errors import InputError, check_int, check_nonnegative, check_real
from pdvoid.inputs.measurement import Instrument, TestCircuit
from pdvoid.inputs.parameters import check_seed
from pdvoid.inputs.scenario import Scenario
from pdvoid.io.matrix import PatternMatrix
from pdvoid.simulation.events import Events
from pdvoid.simulation.parallel import local_workers, parallel_map
from pdvoid.simulation.simulate import simulate

__all__ = ["PosteriorResult", "posterior", "SyntheticLikelihood", "PRIORS", "STATISTIC_FLOOR"]

#: the prior kinds (per parameter)
PRIORS = ("uniform", "log-uniform")
#: standard deviation added in quadrature to every statistic (a resolution floor, in the statistic's own unit:
#: 0.001 of a half cycle or of a decade), so that a statistic that never varies (e.g. an empty half) still gives a
#: positive-definite covariance [-]
STATISTIC_FLOOR = 1e-3


class SyntheticLikelihood:
    """The statistic vector of the scenario's simulation at normalised parameters u, for one seed.

    Picklable, so it runs on worker processes or a Dask cluster.

    Parameters
    ----------
    statistics : PatternStatistics
        the reduction of patterns to statistics (from the measured pattern) [-].
    scenario : Scenario
        the starting scenario; the varied parameters replace its values [-].
    specs : tuple
        the varied parameters and their ranges [-].
    cycles : int
        simulated cycles per simulation [-].
    detector : dict or None
        keyword arguments of :func:`pdvoid.analysis.synthetic.measurement_effects`, or None [-].
    measurement : tuple of (TestCircuit, Instrument) or None
        the IEC 60270 forward model applied instead of ``detector`` [-].
    warmup : int
        cycles simulated first and discarded (the record starts on a void that has been active) [-].
    """

    def __init__(self, statistics: PatternStatistics, scenario: Scenario, specs: tuple[_Spec, ...], *, cycles: int,
                 detector: dict | None, measurement: tuple[TestCircuit, Instrument] | None,
                 warmup: int = 0) -> None:
        self.warmup = warmup
        self.stats = statistics
        self.scenario = scenario
        self.specs = specs
        self.cycles = cycles
        self.detector = detector
        self.measurement = measurement

    def scenario_at(self, u: np.ndarray) -> Scenario:
        """The scenario at normalised coordinates ``u`` (one in [0, 1] per parameter).

        Parameters
        ----------
        u : numpy.ndarray
            normalised coordinates [-].

        Returns
        -------
        Scenario
            The starting scenario with the varied values set.
        """
        return self.scenario.replace(**{s.name: s.to_value(x) for s, x in zip(self.specs, u, strict=True)})

    def __call__(self, task: tuple[np.ndarray, int]) -> np.ndarray:
        """The statistic vector for ``(u, seed)``; NaN everywhere when the scenario is impossible.

        Parameters
        ----------
        task : tuple of (numpy.ndarray, int)
            normalised coordinates and the simulation's seed [-].

        Returns
        -------
        numpy.ndarray
            The statistics in the order of :data:`pdvoid.analysis.pattern_statistics.STATISTIC_NAMES` [-].
        """
        u, seed = task
        try:
            res = simulate(self.scenario_at(u), cycles=self.cycles + self.warmup, seed=int(seed))
        except InputError:
            return np.full(len(STATISTIC_NAMES), np.nan)
        ev: Events | Any = res.events
        if self.warmup:
            cycle, t, v = np.asarray(ev.cycle), np.asarray(ev.time), np.asarray(ev.voltage)  # filled for simulations
            keep = cycle >= self.warmup
            f = ev.frequency
            ev = Events(phase_deg=ev.phase_deg[keep], charge=ev.charge[keep], frequency=f, cycles=float(self.cycles),
                        time=t[keep] - self.warmup / f, cycle=cycle[keep] - self.warmup, voltage=v[keep],
                        label=ev.label)
        if self.measurement is not None:
            ev = measure(ev, self.measurement[0], self.measurement[1], seed=int(seed))
        elif self.detector is not None:
            ev = measurement_effects(ev, int(seed), threshold=self.stats.threshold, **self.detector)
        return self.stats.of_events(ev.phase_deg, ev.charge, ev.cycles)

    def many(self, task: tuple[np.ndarray, tuple[int, ...]]) -> np.ndarray:
        """The statistic vectors at ``u`` for several seeds, one row each (one task for a worker).

        Parameters
        ----------
        task : tuple of (numpy.ndarray, tuple of int)
            normalised coordinates and the seeds [-].

        Returns
        -------
        numpy.ndarray
            Shape (seeds, statistics) [-].
        """
        u, seeds = task
        return np.array([self((u, s)) for s in seeds]).reshape(len(seeds), len(STATISTIC_NAMES))


def _moments(rows: np.ndarray) -> tuple[np.ndarray, np.ndarray] | None:
    if not np.all(np.isfinite(rows)):
        return None
    return rows.mean(axis=0), np.cov(rows, rowvar=False)


class _Evaluator:
    """log prior + synthetic log-likelihood at many points at once (emcee's ``vectorize=True`` form); keeps the
    mean and covariance of every point evaluated, for the predictive check."""

    def __init__(self, sl: SyntheticLikelihood, observed: np.ndarray, seeds: list[int], scale: float,
                 workers: int | None, client: Any) -> None:
        self.sl = sl
        self.observed = observed
        self.seeds = seeds
        self.scale = scale  # covariance of the measured statistics = scale x covariance of one simulation's
        self.workers = workers
        self.client = client
        self.records: dict[bytes, tuple[np.ndarray, np.ndarray]] = {}
        self.simulations = 0
        self.floor = np.eye(observed.size) * STATISTIC_FLOOR**2
        self.fixed: np.ndarray | None = None
        self.lanes = 2 if client is not None else (local_workers() if workers is None else workers)

    def observed_covariance(self, cov: np.ndarray) -> np.ndarray:
        """Covariance of s_obs - μ̂ (module docs): the fixed covariance S0 x (cycles ratio + 1/R) once it is set;
        before, the Student t scale matrix of the point's own covariance."""
        r, d = len(self.seeds), self.observed.size
        if self.fixed is not None:
            return self.fixed * (self.scale + 1.0 / r) + self.floor
        return cov * self.scale * (1.0 + 1.0 / r) * (r - 1.0) / (r - d) + self.floor

    def replicate_covariance(self, cov: np.ndarray) -> np.ndarray:
        """The same for a new simulation of the simulations' length."""
        r, d = len(self.seeds), self.observed.size
        if self.fixed is not None:
            return self.fixed * (1.0 + 1.0 / r) + self.floor
        return cov * (1.0 + 1.0 / r) * (r - 1.0) / (r - d) + self.floor

    def set_covariance(self, u: np.ndarray, seeds: list[int]) -> None:
        """Estimate the fixed covariance S0 from len(seeds) simulations at ``u`` (scaled so that its inverse is
        unbiased for the precision: factor (R0 - 1) / (R0 - d - 2))."""
        parts = parallel_map(self.sl.many, [(np.array(u, dtype=float), tuple(g)) for g in np.array_split(
            np.array(seeds), max(1, 2 * self.lanes))], workers=self.workers, client=self.client)
        rows = np.concatenate(parts)
        self.simulations += len(seeds)
        ok = rows[np.all(np.isfinite(rows), axis=1)]
        r0, d = ok.shape[0], self.observed.size
        if r0 < d + 5:
            raise InputError("the starting point found for the posterior gives no possible scenario; check the "
                             "ranges in vary")
        self.fixed = np.cov(ok, rowvar=False) * (r0 - 1.0) / (r0 - d - 2.0)

    def log_likelihood(self, mean: np.ndarray, cov: np.ndarray) -> float:
        """Log-likelihood of s_obs: normal with the fixed covariance once it is set; before, the multivariate
        Student t with R - d degrees of freedom of the point's own covariance (module docs)."""
        c = self.observed_covariance(cov)
        try:
            chol = np.linalg.cholesky(c)
        except np.linalg.LinAlgError:
            return -math.inf
        z = np.linalg.solve(chol, self.observed - mean)
        d = z.size
        q = float(z @ z)
        if self.fixed is not None:
            return float(-0.5 * q - np.sum(np.log(np.diag(chol))) - 0.5 * d * math.log(2.0 * math.pi))
        nu = len(self.seeds) - d
        return float(math.lgamma((nu + d) / 2.0) - math.lgamma(nu / 2.0) - 0.5 * d * math.log(nu * math.pi)
                     - np.sum(np.log(np.diag(chol))) - 0.5 * (nu + d) * math.log1p(q / nu))

    def __call__(self, points: np.ndarray) -> np.ndarray:
        pts = np.atleast_2d(np.asarray(points, dtype=float))
        out = np.full(pts.shape[0], -math.inf)
        inside = [i for i in range(pts.shape[0]) if np.all((pts[i] >= 0.0) & (pts[i] <= 1.0))]
        # one task per point and group of seeds: enough tasks to keep every worker busy, few enough to keep the
        # overhead of sending them small (the grouping does not change any result)
        groups = [tuple(g) for g in np.array_split(np.array(self.seeds), min(len(self.seeds), max(
            1, math.ceil(2 * self.lanes / max(len(inside), 1))))) if g.size]
        tasks = [(pts[i].copy(), g) for i in inside for g in groups]
        parts = parallel_map(self.sl.many, tasks, workers=self.workers, client=self.client) if tasks else []
        self.simulations += len(inside) * len(self.seeds)
        for j, i in enumerate(inside):
            mom = _moments(np.concatenate(parts[j * len(groups):(j + 1) * len(groups)]))
            if mom is None:
                continue
            self.records[pts[i].tobytes()] = mom
            out[i] = self.log_likelihood(*mom)
        return out


def _split_rhat(chains: np.ndarray) -> np.ndarray:
    """Split R̂ per parameter from chains of shape (steps, walkers, k): each walker's chain cut in two halves,
    R̂ = sqrt(var+ / W) with var+ = (n - 1) / n W + B / n (Gelman et al. 2013, Bayesian Data Analysis, 3rd ed.,
    section 11.4; section number from memory)."""
    n = chains.shape[0] // 2
    if n < 2:
        return np.full(chains.shape[2], np.nan)
    halves = np.concatenate([chains[:n], chains[n:2 * n]], axis=1)  # (n, 2 walkers, k)
    means = halves.mean(axis=0)
    w = halves.var(axis=0, ddof=1).mean(axis=0)
    b = n * means.var(axis=0, ddof=1)
    var_plus = (n - 1) / n * w + b / n
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.sqrt(var_plus / w)


@dataclass(frozen=True, eq=False)
class PosteriorResult:
    """Outcome of :func:`posterior` (``pdvoid.fit(..., method="posterior")``); values in SI.

    Attributes
    ----------
    parameters : tuple of str
        the varied parameters, in the order of the samples' columns.
    samples : numpy.ndarray
        kept posterior samples, one row each, shape (n, k) [SI].
    log_likelihood : numpy.ndarray
        synthetic log-likelihood of each sample [-].
    bounds : dict
        {parameter: (low, high)} of the prior [SI].
    priors : dict
        {parameter: "uniform" or "log-uniform"}.
    best : dict
        {parameter: value} of the kept sample with the largest synthetic likelihood [SI].
    check : PredictiveCheck
        the posterior-predictive check.
    acceptance : float
        mean acceptance fraction of the walkers [-].
    autocorrelation_time : dict
        {parameter: integrated autocorrelation time} in steps [-].
    effective_samples : dict
        {parameter: walkers x kept steps / autocorrelation time} [-].
    rhat : dict
        {parameter: split R̂ across the walkers} [-].
    notes : list of str
        plain-words warnings (short chains, poor mixing, poor fit); empty when all is well.
    statistics : numpy.ndarray
        the measured statistic vector [-].
    settings : dict
        replicates, walkers, steps, burn, cycles, seed, check draws, measured cycles, input kind.
    simulations : int
        simulations spent [-].
    elapsed : float
        wall time [s].
    scenario : Scenario
        the starting scenario with the posterior medians.
    """

    parameters: tuple
    samples: np.ndarray
    log_likelihood: np.ndarray
    bounds: dict
    priors: dict
    best: dict
    check: PredictiveCheck
    acceptance: float
    autocorrelation_time: dict
    effective_samples: dict
    rhat: dict
    notes: list
    statistics: np.ndarray
    settings: dict
    simulations: int
    elapsed: float
    scenario: Scenario
    chain: np.ndarray = field(repr=False, default_factory=lambda: np.empty(0))

    def _column(self, parameter: object) -> int:
        if not isinstance(parameter, str) or parameter not in self.parameters:
            raise InputError(f"parameter must be one of the fitted parameters {list(self.parameters)}; got "
                             f"{parameter!r}")
        return self.parameters.index(parameter)

    def credible_interval(self, parameter: str, level: float = 0.9) -> tuple[float, float]:
        """Equal-tailed credible interval of one parameter.

        Parameters
        ----------
        parameter : str
            one of :attr:`parameters`, e.g. ``"void.diameter"``.
        level : float
            probability inside the interval, 0 < level < 1 [-].

        Returns
        -------
        tuple of float
            (low, high), the (1 - level)/2 and (1 + level)/2 quantiles of the samples [SI].

        Raises
        ------
        InputError
            For an unknown parameter or a level outside (0, 1).
        """
        i = self._column(parameter)
        lv = check_real("level", level)
        if not 0.0 < lv < 1.0:
            raise InputError(f"level must lie strictly between 0 and 1; got {level!r}")
        lo, hi = np.quantile(self.samples[:, i], [(1.0 - lv) / 2.0, (1.0 + lv) / 2.0])
        return float(lo), float(hi)

    @property
    def median(self) -> dict:
        """{parameter: posterior median} [SI]."""
        return {p: float(np.median(self.samples[:, i])) for i, p in enumerate(self.parameters)}

    def table(self, truth: dict | None = None, level: float = 0.9) -> str:
        """A plain-text table: parameter, prior, (true,) median, credible interval, diagnostics; then the check.

        Parameters
        ----------
        truth : dict or None
            {parameter: true value} [SI] of synthetic data, shown in a "true" column, or None.
        level : float
            level of the credible intervals [-].

        Returns
        -------
        str
            The table and the predictive check in plain words.
        """
        head = ["parameter", "prior"] + (["true"] if truth else []) + [
            "median", f"{100 * level:g} % credible interval", "tau [steps]", "R-hat"]
        rows = [head]
        med = self.median
        for p in self.parameters:
            lo, hi = self.credible_interval(p, level)
            lo_b, hi_b = self.bounds[p]
            row = [p, f"{self.priors[p]} {lo_b:.3g} .. {hi_b:.3g}"] + ([f"{truth[p]:.4g}"] if truth else [])
            row += [f"{med[p]:.4g}", f"{lo:.4g} .. {hi:.4g}", f"{self.autocorrelation_time[p]:.1f}",
                    f"{self.rhat[p]:.3f}"]
            rows.append(row)
        widths = [max(len(r[i]) for r in rows) for i in range(len(head))]
        lines = ["  ".join(c.ljust(w) for c, w in zip(r, widths, strict=True)) for r in rows]
        s = self.settings
        lines.append(f"{self.samples.shape[0]} samples ({s['walkers']} walkers x {s['steps'] - s['burn']} steps after "
                     f"{s['burn']} burn-in), acceptance {self.acceptance:.2f}; {self.simulations} simulations of "
                     f"{s['cycles']} cycles in {self.elapsed:.1f} s")
        lines.append(self.check.summary())
        lines += [f"note: {n}" for n in self.notes]
        return "\n".join(lines)


def _priors(specs: tuple[_Spec, ...], priors: object) -> tuple[_Spec, ...]:
    if priors is None:
        return specs
    if not isinstance(priors, dict):
        raise InputError(f"priors must be None or a dict {{parameter: 'uniform' or 'log-uniform'}}; got {priors!r}")
    names = [s.name for s in specs]
    out = []
    for name in priors:
        if name not in names:
            raise InputError(f"priors names {name!r}, which is not in vary {names}")
    for s in specs:
        kind = priors.get(s.name, "log-uniform" if s.log else "uniform")
        if kind not in PRIORS:
            raise InputError(f"priors[{s.name!r}] must be 'uniform' or 'log-uniform'; got {kind!r}")
        if kind == "log-uniform" and s.low <= 0.0:
            raise InputError(f"priors[{s.name!r}] = 'log-uniform' needs low > 0; vary gives {s.low!r}")
        out.append(_Spec(s.name, s.low, s.high, kind == "log-uniform"))
    return tuple(out)


def _measured_cycles(measured: object) -> float:
    if isinstance(measured, PatternMatrix):
        return float(measured.cycles)
    ev = measured if isinstance(measured, Events) else getattr(measured, "events", None)
    if not isinstance(ev, Events):
        raise InputError(f"measured must be Events, a Result or a PatternMatrix; got {type(measured).__name__}")
    return float(ev.cycles)


def posterior(
    measured: Events | PatternMatrix | Any,
    scenario: Scenario,
    vary: dict,
    *,
    threshold: float = 0.0,
    cycles: int | None = None,
    warmup: int = 0,
    seed: int = 0,
    detector: dict | None = None,
    circuit: TestCircuit | None = None,
    instrument: Instrument | None = None,
    priors: dict | None = None,
    replicates: int = 20,
    walkers: int | None = None,
    steps: int = 80,
    burn: int | None = None,
    check_draws: int = 199,
    pilot: int = 100,
    workers: int | None = 1,
    client: Any = None,
) -> PosteriorResult:
    """Posterior of the values of ``vary`` given a measured pattern (method: :mod:`pdvoid.analysis.posterior`).

    Parameters
    ----------
    measured : Events, Result or PatternMatrix
        measured events (:func:`pdvoid.read_events`) or a count matrix with its observation time
        (:func:`pdvoid.read_pattern_matrix`).
    scenario : Scenario
        the starting scenario (its other parameters stay fixed).
    vary : dict
        {dotted parameter: (low, high)} in SI: the prior's range.
    threshold : float
        the measurement's detection limit [C]; applied to both sides.
    cycles : int or None
        simulated cycles per simulation [-]; None for the measured pattern's cycles (recommended). With another
        length the statistics' covariance is rescaled by cycles / measured cycles (assumes cycles independent
        of each other; the notes say so).
    warmup : int
        cycles each simulation runs first and discards, 0 ... 1000000 [-]: 0 when the record started as the voltage
        was applied (as :func:`pdvoid.analysis.synthetic.synthetic_measurement` makes it); more when the void had
        been discharging before the record started (the wait for a first electron is then not in the record).
    seed : int
        the seed of everything random [-].
    detector : dict or None
        keyword arguments of :func:`pdvoid.analysis.synthetic.measurement_effects` (noise [C], relative_noise
        [-], phase_resolution_deg [deg]), or None.
    circuit, instrument : TestCircuit and Instrument, or None
        the IEC 60270 forward model (:func:`pdvoid.measure`) applied to every simulation instead of ``detector``.
    priors : dict or None
        {parameter: "uniform" or "log-uniform"}; unnamed parameters get log-uniform when low > 0 and
        high / low >= 10, uniform otherwise.
    replicates : int
        simulations R per parameter set (common seeds), 8 ... 1000 [-]; more than the 12 statistics.
    walkers : int or None
        emcee walkers, even, at least 2 k + 2 [-]; None for max(8, 4 k) rounded up to even.
    steps : int
        steps per walker, 10 ... 100000 [-].
    burn : int or None
        steps discarded at the start [-]; None for steps // 3.
    pilot : int
        simulations R0 for the fixed covariance of the statistics, at least 24 [-].
    check_draws : int
        posterior draws of the predictive check, 100 ... 100000 [-] (so that p can fall below 0.01).
    workers : int or None
        local processes (1 = in this process; None = all cores).
    client : Any
        a dask.distributed Client or scheduler address (then ``workers`` is ignored).

    Returns
    -------
    PosteriorResult
        Samples, credible intervals, diagnostics and the predictive check.

    Raises
    ------
    InputError
        For bad arguments (checked before any simulation) or a measured pattern without discharges above the
        threshold.
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    specs = _priors(_specs(scenario, vary), priors)
    k = len(specs)
    threshold = check_nonnegative("threshold", threshold, "C")
    seed = check_seed(seed)
    replicates = check_int("replicates", replicates, 8, 1000)
    if replicates <= len(STATISTIC_NAMES):
        raise InputError(f"replicates must exceed the {len(STATISTIC_NAMES)} statistics (a covariance needs more "
                         f"simulations than entries); got {replicates}")
    if walkers is None:
        walkers = max(8, 4 * k)
        walkers += walkers % 2
    walkers = check_int("walkers", walkers, 2 * k + 2, 10_000)
    if walkers % 2:
        raise InputError(f"walkers must be even (the ensemble moves half the walkers at a time); got {walkers}")
    steps = check_int("steps", steps, 10, 100_000)
    burn = steps // 3 if burn is None else check_int("burn", burn, 0, steps - 5)
    check_draws = check_int("check_draws", check_draws, 100, 100_000)
    pilot = check_int("pilot", pilot, 2 * len(STATISTIC_NAMES), 100_000)
    if workers is not None:
        workers = check_int("workers", workers, 1, 1024)
    measurement = _check_measurement_model(detector, circuit, instrument, seed, threshold)
    measured_cycles = _measured_cycles(measured)
    if cycles is None:
        cycles = max(10, round(measured_cycles))
    cycles = check_int("cycles", cycles, 10, 10_000_000)
    warmup = check_int("warmup", warmup, 0, 1_000_000)
    stats, observed = pattern_statistics(measured, threshold)

    t0 = time.perf_counter()
    sl = SyntheticLikelihood(stats, scenario, specs, cycles=cycles, detector=detector, measurement=measurement,
                             warmup=warmup)
    seeds = [int(s) for s in np.random.SeedSequence([seed, 1]).generate_state(replicates)]
    ev = _Evaluator(sl, observed, seeds, cycles / measured_cycles, workers, client)
    notes: list[str] = []
    if abs(cycles - measured_cycles) > 0.01 * measured_cycles:
        notes.append(f"simulations of {cycles} cycles stand for a measurement of {measured_cycles:g} cycles: the "
                     "statistics' spread was rescaled assuming the cycles are independent of each other")

    # (1) a starting point near the mode: Latin hypercube, then Nelder-Mead on the deterministic (CRN) likelihood
    lhs = qmc.LatinHypercube(d=k, seed=np.random.default_rng([seed, 3])).random(8 * k)
    ll = ev(lhs)
    if not np.any(np.isfinite(ll)):
        raise InputError("no parameter set of the Latin hypercube over vary gave a possible scenario with a "
                         "finite likelihood; check the ranges in vary")
    u0 = lhs[int(np.argmax(ll))]
    # the fixed covariance, first at the best of the hypercube, then again at the mode the search finds
    pilot_seeds = [int(s) for s in np.random.SeedSequence([seed, 5]).generate_state(pilot)]
    ev.set_covariance(u0, pilot_seeds)

    def negative(u: np.ndarray) -> float:
        v = float(ev(np.clip(u, 0.0, 1.0)[None, :])[0])
        return -v if math.isfinite(v) else 1e300

    start_value = negative(u0)
    opt = minimize(negative, u0, method="Nelder-Mead", bounds=[(0.0, 1.0)] * k,
                   options={"maxfev": 20 * k, "xatol": 1e-3, "fatol": 1e-2})
    if opt.fun < start_value:
        u0 = np.clip(opt.x, 0.0, 1.0)
    ev.set_covariance(u0, pilot_seeds)
    # (2) the ensemble: a ball about the start, inside the prior
    rng = np.random.default_rng([seed, 4])
    p0 = np.clip(u0 + 0.05 * rng.standard_normal((walkers, k)), 1e-6, 1.0 - 1e-6)
    sampler = emcee.EnsembleSampler(walkers, k, ev, vectorize=True)
    state = emcee.State(p0, random_state=np.random.RandomState(seed).get_state())  # noqa: NPY002 (emcee's generator)
    sampler.run_mcmc(state, steps)
    chain = sampler.get_chain()  # (steps, walkers, k)
    kept = chain[burn:]
    flat = kept.reshape(-1, k)
    logl = sampler.get_log_prob()[burn:].reshape(-1)
    values = np.column_stack([[s.to_value(x) for x in flat[:, i]] for i, s in enumerate(specs)])
    # (3) diagnostics
    with np.errstate(divide="ignore", invalid="ignore"):  # a walker that never moved has no autocorrelation
        tau = np.atleast_1d(sampler.get_autocorr_time(discard=burn, tol=0))
    tau = np.where(np.isfinite(tau), tau, np.inf)
    acceptance = float(np.mean(sampler.acceptance_fraction))
    with np.errstate(divide="ignore", invalid="ignore"):
        rhat = _split_rhat(kept)
    names = tuple(s.name for s in specs)
    ess = {p: float(walkers * kept.shape[0] / max(t, 1.0)) for p, t in zip(names, tau, strict=True)}
    if not np.all(np.isfinite(tau)):
        notes.append("some walkers never moved after the burn-in (no autocorrelation time): the posterior is not "
                     "sampled; widen vary or check that the model can produce the pattern")
    elif kept.shape[0] < 10 * float(np.max(tau)):
        notes.append(f"the chain is short: {kept.shape[0]} kept steps against an autocorrelation time of up to "
                     f"{float(np.max(tau)):.0f} steps (at least 10 times as many recommended); intervals are rough, "
                     "run more steps")
    if not 0.15 <= acceptance <= 0.7:
        notes.append(f"acceptance fraction {acceptance:.2f} lies outside the healthy 0.15 - 0.7: the walkers mix "
                     "poorly")
    bad = [p for p, r in zip(names, rhat, strict=True) if not (r <= 1.1)]
    if bad:
        notes.append(f"the walkers' chains disagree (split R-hat above 1.1) for {', '.join(bad)}: the posterior "
                     "may not have converged")
    # (4) posterior-predictive check: draws spread evenly over the kept samples, one new seed each
    idx = np.linspace(0, flat.shape[0] - 1, check_draws).round().astype(int)
    check_seeds = [int(s) for s in np.random.SeedSequence([seed, 2]).generate_state(check_draws)]
    reps = parallel_map(sl, [(flat[i].copy(), s) for i, s in zip(idx, check_seeds, strict=True)], workers=workers,
                        client=client)
    moms = [ev.records[flat[i].tobytes()] for i in idx]
    means = np.array([m[0] for m in moms])
    check = predictive_check(observed, np.array(reps), means, np.array([ev.replicate_covariance(m[1]) for m in moms]),
                             np.array([ev.observed_covariance(m[1]) for m in moms]))
    if check.verdict != "consistent":
        notes.append(f"the predictive check finds a {check.verdict} (p = {check.p_value:.3g}): the credible "
                     "intervals describe the model's best compromise, not necessarily the object")
    best_row = int(np.argmax(logl))
    medians = np.median(flat, axis=0)
    return PosteriorResult(
        parameters=names, samples=values, log_likelihood=logl,
        bounds={s.name: (s.low, s.high) for s in specs},
        priors={s.name: ("log-uniform" if s.log else "uniform") for s in specs},
        best={s.name: float(values[best_row, i]) for i, s in enumerate(specs)},
        check=check, acceptance=acceptance,
        autocorrelation_time={p: float(t) for p, t in zip(names, tau, strict=True)},
        effective_samples=ess, rhat={p: float(r) for p, r in zip(names, rhat, strict=True)}, notes=notes,
        statistics=observed,
        settings={"replicates": replicates, "pilot": pilot, "walkers": walkers, "steps": steps, "burn": burn,
                  "cycles": cycles, "warmup": warmup,
                  "seed": seed, "check draws": check_draws, "measured cycles": measured_cycles,
                  "measured kind": "count matrix" if stats.binned else "events",
                  "start": {s.name: float(_get(scenario, s.name)) for s in specs}},
        simulations=ev.simulations + check_draws, elapsed=time.perf_counter() - t0,
        scenario=sl.scenario_at(medians), chain=chain,
    )
