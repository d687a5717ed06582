"""Does the fitted void explain the measured pattern at all? A posterior-predictive check.

After :func:`pdvoid.fit` with ``method="posterior"`` the question is no longer only *which* parameters, but whether
*any* parameters of the model produce a pattern like the measured one (a surface discharge, a corona or several
voids at once do not look like one void, and a fit to them is confidently wrong).

**Discrepancy.** For a parameter set θ the synthetic likelihood (:mod:`pdvoid.analysis.posterior`) holds the mean
μ(θ) of the statistic vector s (:mod:`pdvoid.analysis.pattern_statistics`) and its covariance Σ (the fixed one of
the fit, for a record of the measured length and for one of the simulated length). The discrepancy of a pattern
s is the squared Mahalanobis distance D(s; θ) = (s - μ(θ))ᵀ Σ⁻¹ (s - μ(θ)).

**Posterior-predictive p-value** (Gelman, Meng & Stern 1996): for M parameter sets θ_j drawn from the posterior
sample, one new pattern s_j is simulated at θ_j with a seed of its own (never one of the fit's common seeds) and

    p = (1 + #{j : D(s_j; θ_j) >= D(s_obs; θ_j)}) / (M + 1).

A small p says that patterns simulated from the posterior are almost never as far from the model's prediction as
the measured one is. The p-value is conservative: the data were used to choose the θ_j, which makes D(s_obs; θ_j)
small, so under a model that is right p is spread about 0.5 rather than uniform and P(p <= α) <= α
approximately (Meng 1994; Robins, van der Vaart & Ventura 2000): a good fit is flagged by chance in at most about
α of cases. The coverage benchmark (``benchmarks/posterior_coverage.py``) counts how often it flags good fits.

**What counts as a poor fit** (our own levels, common practice for p-values): p < 0.01: *poor fit*, the model
cannot produce this pattern and its parameter values should not be reported as the void's; 0.01 <= p < 0.05:
*doubtful fit*; otherwise *consistent*. Consistent is not proof: other mechanisms may produce the same
statistics.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from pdvoid.analysis.pattern_statistics import STATISTIC_NAMES, STATISTIC_WORDS

__all__ = ["PredictiveCheck", "POOR_FIT_LEVEL", "DOUBTFUL_FIT_LEVEL", "predictive_check", "mahalanobis"]

#: p-value below which the fit is called poor [-]
POOR_FIT_LEVEL = 0.01
#: p-value below which the fit is called doubtful [-]
DOUBTFUL_FIT_LEVEL = 0.05


def mahalanobis(s: np.ndarray, mean: np.ndarray, cov: np.ndarray) -> float:
    """Squared Mahalanobis distance (s - mean)ᵀ cov⁻¹ (s - mean).

    Parameters
    ----------
    s, mean : numpy.ndarray
        vectors of the same length [-].
    cov : numpy.ndarray
        symmetric positive-definite matrix [-].

    Returns
    -------
    float
        The distance [-]; inf when ``cov`` is not positive definite.
    """
    try:
        chol = np.linalg.cholesky(cov)
    except np.linalg.LinAlgError:
        return math.inf
    z = np.linalg.solve(chol, s - mean)
    return float(z @ z)


@dataclass(frozen=True)
class PredictiveCheck:
    """The outcome of the posterior-predictive check (definition in :mod:`pdvoid.analysis.predictive`).

    Attributes
    ----------
    p_value : float
        posterior-predictive p-value in (0, 1] [-].
    verdict : str
        "consistent", "doubtful fit" or "poor fit".
    draws : int
        posterior draws M, one new simulation each [-].
    observed_discrepancy : numpy.ndarray
        D(s_obs; θ_j) per draw [-].
    replicated_discrepancy : numpy.ndarray
        D(s_j; θ_j) per draw [-].
    z_scores : dict[str, float]
        {statistic: (measured - predicted mean) / predicted standard deviation}, averaged over the draws [-].
    """

    p_value: float
    verdict: str
    draws: int
    observed_discrepancy: np.ndarray
    replicated_discrepancy: np.ndarray
    z_scores: dict

    @property
    def poor(self) -> bool:
        """True when p < :data:`POOR_FIT_LEVEL`."""
        return self.p_value < POOR_FIT_LEVEL

    def worst(self, n: int = 3) -> list[tuple[str, float]]:
        """The ``n`` statistics farthest from the model's prediction, as (name, z-score).

        Parameters
        ----------
        n : int
            how many [-].

        Returns
        -------
        list of tuple of (str, float)
            Largest ``|z|`` first.
        """
        return sorted(self.z_scores.items(), key=lambda kv: -abs(kv[1]))[:n]

    def summary(self) -> str:
        """The check in plain words, a few lines.

        Returns
        -------
        str
            The verdict with the p-value, what it means, and the statistics farthest from the prediction.
        """
        meaning = {
            "consistent": "the fitted void can produce this pattern (patterns simulated from the posterior are often "
                          "as far from the prediction as the measured one)",
            "doubtful fit": "the measured pattern is farther from the prediction than most simulated ones; treat the "
                            "fitted values with caution",
            "poor fit": "the model cannot produce this pattern; the fitted values do not describe the object (another "
                        "mechanism, e.g. surface discharge, or several voids, may be at work)",
        }[self.verdict]
        lines = [f"predictive check: {self.verdict} (p = {self.p_value:.3g} over {self.draws} posterior draws; poor "
                 f"below {POOR_FIT_LEVEL:g}, doubtful below {DOUBTFUL_FIT_LEVEL:g})", f"  {meaning}"]
        lines.append("  farthest from the prediction: " + "; ".join(
            f"{STATISTIC_WORDS[k]} ({z:+.1f} standard deviations)" for k, z in self.worst()))
        return "\n".join(lines)


def predictive_check(observed: np.ndarray, replicated: np.ndarray, means: np.ndarray, covariances: np.ndarray,
                     observed_covariances: np.ndarray | None = None) -> PredictiveCheck:
    """The posterior-predictive p-value from draws that have been simulated already.

    Parameters
    ----------
    observed : numpy.ndarray
        the measured statistic vector, shape (d,) [-].
    replicated : numpy.ndarray
        one new simulated statistic vector per draw, shape (M, d); rows of NaN for draws whose simulation
        failed count as not exceeding [-].
    means : numpy.ndarray
        the synthetic likelihood's mean at each draw, shape (M, d) [-].
    covariances : numpy.ndarray
        its covariance at each draw, shape (M, d, d), for the replicated patterns' length [-].
    observed_covariances : numpy.ndarray or None
        the same for the measured pattern's length (when the simulations are shorter or longer than the
        measurement), or None when the lengths agree [-].

    Returns
    -------
    PredictiveCheck
        The p-value, verdict and per-statistic z-scores.
    """
    m = replicated.shape[0]
    cov_obs = covariances if observed_covariances is None else observed_covariances
    d_obs = np.array([mahalanobis(observed, means[j], cov_obs[j]) for j in range(m)])
    d_rep = np.array([mahalanobis(replicated[j], means[j], covariances[j]) if np.all(np.isfinite(replicated[j]))
                      else -math.inf for j in range(m)])
    p = (1.0 + float(np.sum(d_rep >= d_obs))) / (m + 1.0)
    sd = np.sqrt(np.array([np.diag(c) for c in cov_obs]))
    z = np.mean((observed[None, :] - means) / sd, axis=0)
    verdict = "poor fit" if p < POOR_FIT_LEVEL else "doubtful fit" if p < DOUBTFUL_FIT_LEVEL else "consistent"
    return PredictiveCheck(p_value=p, verdict=verdict, draws=m, observed_discrepancy=d_obs,
                           replicated_discrepancy=d_rep,
                           z_scores={k: float(v) for k, v in zip(STATISTIC_NAMES, z, strict=True)})
