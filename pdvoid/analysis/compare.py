"""How far apart two phase-resolved patterns are: one documented score built from distances of distributions.

The score compares two event sets, typically a simulated and a measured one, and is the objective of
:func:`pdvoid.fit`. It is 0 for identical patterns and grows with the mismatch. Every part is symmetric, so
``compare(a, b)`` equals ``compare(b, a)``.

Steps:

1. **Detection threshold.** Events with |q| < ``threshold`` are removed from *both* sides (a measurement
   does not record pulses below its detection threshold, so a simulation must be cut the same way before
   it can be compared). Zero-charge events are not pulses and are removed too (the convention of
   :mod:`pdvoid.analysis.patterns`).
2. **Halves.** The kept events are split into the "+" (0-180 deg) and "-" (180-360 deg) voltage half
   cycles, the "-" half re-referenced to 0-180 deg. Each half-cycle distance below is averaged over the two
   halves with weights w_h = (share of side A's events in half h + share of side B's) / 2 (a side without
   events adds nothing; the weights are scaled to sum to 1).
3. **Parts** (all dimensionless; for each half):

   - ``phase_js``: Jensen-Shannon distance (base 2, in [0, 1]) between the phase histograms
     (``phase_bins`` equal bins over 0-180 deg), ``scipy.spatial.distance.jensenshannon``.
   - ``phase_wasserstein``: 1-D Wasserstein (earth mover's) distance between the event phases, divided by
     180 deg (in [0, 1]); the number ``scipy.stats.wasserstein_distance`` gives (:func:`cdf_distances`).
   - ``magnitude_wasserstein``: 1-D Wasserstein distance between log10 |q| [decades]: a pattern scaled by
     a factor k in magnitude is log10(k) away.
   - ``magnitude_ks``: two-sample Kolmogorov-Smirnov statistic of |q| (in [0, 1]), the number
     ``scipy.stats.ks_2samp(...).statistic`` gives.
   - ``rate``: discharges per cycle compared on a log scale [decades]: |log10((n_A + 0.5) / cycles_A) -
     log10((n_B + 0.5) / cycles_B)| with n the count in the half (0.5 is added so that an empty half gives
     a finite value).

   When a half holds events on one side only, its phase and magnitude distances take their largest value
   (:data:`EMPTY_DISTANCE`: 1 each, 1 decade for ``magnitude_wasserstein``); when it holds none on either
   side they are 0.

   Whole-pattern part:

   - ``fingerprint``: the descriptor vectors of :func:`pdvoid.analysis.descriptors.fingerprint`, compared
     entry by entry as |a - b| / (|a| + |b| + 1) (in [0, 1); close to the absolute difference for small
     values and to the relative difference for large ones) and averaged over the entries that are finite on
     both sides (NaN entries are ignored). NaN when no entry is comparable; the part then leaves the score.
     (The peak counts are always finite, so in practice this part is always defined.)

4. **Score** = sum_k w_k part_k / sum_k w_k over the parts with a finite value, with the weights
   :data:`DEFAULT_WEIGHTS` or those given. The score is finite whenever the inputs are, also when one side
   has no events: the half-cycle parts then take their empty values and ``rate`` grows with the other
   side's count. Two empty patterns over the same number of cycles score 0.

Cost: vectorised numpy; the samples are sorted once per pattern. For repeated comparisons against the same
measured pattern (a fit), :func:`summarise` it once and pass the :class:`PatternSummary` instead of the
events.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import TypeAlias

import numpy as np
from scipy.spatial.distance import jensenshannon

from pdvoid.analysis.descriptors import FINGERPRINT_NAMES, fingerprint
from pdvoid.analysis.patterns import HALVES, EventSource, _stored_events
from pdvoid.core.errors import InputError, check_int, check_nonnegative
from pdvoid.io.matrix import PatternMatrix
from pdvoid.simulation.events import Events

__all__ = [
    "PART_NAMES",
    "DEFAULT_WEIGHTS",
    "EMPTY_DISTANCE",
    "PatternSummary",
    "Comparison",
    "summarise",
    "compare",
    "PatternSource",
    "cdf_distances",
]

#: the parts of the score, in order
PART_NAMES: tuple[str, ...] = (
    "phase_js",
    "phase_wasserstein",
    "magnitude_wasserstein",
    "magnitude_ks",
    "rate",
    "fingerprint",
)
#: default weights of the parts (our own choice: the distribution parts count fully; the fingerprint, which
#: partly repeats them and is noisy for small event counts, counts half)
DEFAULT_WEIGHTS: dict[str, float] = {
    "phase_js": 1.0,
    "phase_wasserstein": 1.0,
    "magnitude_wasserstein": 1.0,
    "magnitude_ks": 1.0,
    "rate": 1.0,
    "fingerprint": 0.5,
}
#: value of a half-cycle part when only one side has events in that half
EMPTY_DISTANCE: dict[str, float] = {
    "phase_js": 1.0,
    "phase_wasserstein": 1.0,
    "magnitude_wasserstein": 1.0,
    "magnitude_ks": 1.0,
}


@dataclass(frozen=True, eq=False)
class PatternSummary:
    """What :func:`compare` needs of one pattern, computed once by :func:`summarise`.

    Attributes
    ----------
    threshold : float
        detection threshold applied [C].
    phase_bins : int
        phase bins per half cycle [-].
    phase_windows : int
        windows per half cycle of the fingerprint [-].
    cycles : float
        AC cycles observed [-].
    kept : int
        events kept (|q| >= threshold and q != 0) [-].
    removed : int
        events removed by the threshold or for zero charge [-].
    phases : dict
        per half ("+", "-"): phases of the kept events, 0-180 deg [deg].
    log_magnitudes : dict
        per half: log10 of |q| / (1 C) [-].
    histograms : dict
        per half: counts per phase bin [-].
    descriptors : numpy.ndarray
        the fingerprint, in the order of FINGERPRINT_NAMES [-].
    """

    threshold: float
    phase_bins: int
    phase_windows: int
    cycles: float
    kept: int
    removed: int
    phases: dict
    log_magnitudes: dict
    histograms: dict
    descriptors: np.ndarray

    @property
    def rate(self) -> float:
        """Kept discharges per cycle [-]."""
        return self.kept / self.cycles


#: what :func:`compare` and :func:`summarise` accept: events, a Result, a count matrix or a ready summary
PatternSource: TypeAlias = EventSource | PatternMatrix | PatternSummary


def summarise(
    events: PatternSource, threshold: float = 0.0, phase_bins: int = 18, phase_windows: int = 18
) -> PatternSummary:
    """Apply the threshold and prepare the distributions :func:`compare` uses (see module docs).

    Parameters
    ----------
    events : Events, Result, PatternMatrix or PatternSummary
        events, a Result, a count matrix (:class:`pdvoid.io.matrix.PatternMatrix`) or a summary [-]
    threshold : float
        detection threshold [C], >= 0; events with |q| < threshold are removed
    phase_bins : int
        equal phase bins per half cycle for the Jensen-Shannon part, 1 ... 100000 [-]
    phase_windows : int
        windows per half cycle of the fingerprint, 2 ... 100000 [-]

    Returns
    -------
    PatternSummary
        :class:`PatternSummary`.
    """
    if isinstance(events, PatternSummary):
        return events
    thr = check_nonnegative("threshold", threshold, "C")
    nb = check_int("phase_bins", phase_bins, 1, 100_000)
    nw = check_int("phase_windows", phase_windows, 2, 100_000)
    if isinstance(events, PatternMatrix):
        events = events.to_events()
    ev = _stored_events(events)  # refuses histogram-only results (their events were not kept)
    mag = np.abs(ev.charge)
    keep = (mag >= thr) & (mag > 0.0)
    phase = ev.phase_deg[keep]
    lq = np.log10(mag[keep])
    plus = phase < 180.0
    phases = {"+": np.sort(phase[plus]), "-": np.sort(phase[~plus] - 180.0)}
    logs = {"+": np.sort(lq[plus]), "-": np.sort(lq[~plus])}
    edges = np.linspace(0.0, 180.0, nb + 1)
    hists = {h: np.histogram(phases[h], bins=edges)[0].astype(float) for h in HALVES}
    kept_events = Events(phase_deg=phase, charge=ev.charge[keep], frequency=ev.frequency, cycles=ev.cycles)
    fp = fingerprint(kept_events, nw)
    return PatternSummary(
        threshold=thr,
        phase_bins=nb,
        phase_windows=nw,
        cycles=ev.cycles,
        kept=int(keep.sum()),
        removed=int(ev.count - keep.sum()),
        phases=phases,
        log_magnitudes=logs,
        histograms=hists,
        descriptors=np.array([fp[k] for k in FINGERPRINT_NAMES]),
    )


@dataclass(frozen=True)
class Comparison:
    """The outcome of :func:`compare`.

    Attributes
    ----------
    score : float
        the combined score (0 for identical patterns) [-].
    parts : dict
        {part name: value} for every part in PART_NAMES (NaN where undefined) [-].
    weights : dict
        the weights used [-].
    threshold : float
        detection threshold applied to both sides [C].
    kept : dict
        events kept per side, {"simulated": n, "measured": n} [-].
    removed : dict
        events removed per side by the threshold (or for zero charge) [-].
    rates : dict
        kept discharges per cycle per side [-].
    """

    score: float
    parts: dict
    weights: dict
    threshold: float
    kept: dict
    removed: dict
    rates: dict

    def table(self) -> str:
        """The parts, weights and score as a small text table.

        Returns
        -------
        str
            One line per part, then the score, the threshold and the kept and removed counts.
        """
        rows = [f"{'part':<24s}{'value':>12s}{'weight':>9s}"]
        for k in PART_NAMES:
            rows.append(f"{k:<24s}{self.parts[k]:>12.4g}{self.weights[k]:>9.3g}")
        rows.append(f"{'score':<24s}{self.score:>12.4g}")
        rows.append(f"threshold {self.threshold:.4g} C; kept {self.kept}; removed {self.removed}")
        return "\n".join(rows)


def _weights(weights: Mapping[str, float] | None) -> dict[str, float]:
    if weights is None:
        return dict(DEFAULT_WEIGHTS)
    if not isinstance(weights, Mapping):
        raise InputError(f"weights must be a mapping {{part name: weight}}; got {weights!r}")
    unknown = [k for k in weights if k not in PART_NAMES]
    if unknown:
        raise InputError(f"weights names unknown parts {unknown}; parts: {', '.join(PART_NAMES)}")
    w = dict(DEFAULT_WEIGHTS)
    for k, v in weights.items():
        w[k] = check_nonnegative(f"weights[{k!r}]", v)
    if not any(v > 0.0 for v in w.values()):
        raise InputError("at least one weight must be > 0")
    return w


def cdf_distances(a: np.ndarray, b: np.ndarray) -> tuple[float, float]:
    """(1-D Wasserstein distance, Kolmogorov-Smirnov statistic) of two sorted, non-empty samples.

    W1 = integral |F_a(x) - F_b(x)| dx and D = max |F_a(x) - F_b(x)| over the empirical distribution
    functions: the same numbers as ``scipy.stats.wasserstein_distance(a, b)`` and
    ``scipy.stats.ks_2samp(a, b).statistic`` (checked in the tests), computed in one pass from samples
    sorted once in :func:`summarise`.

    Parameters
    ----------
    a : numpy.ndarray
        sorted sample (same unit as b) [-]
    b : numpy.ndarray
        sorted sample [-]

    Returns
    -------
    tuple[float, float]
        (W1 in the unit of the samples, D in [0, 1]).
    """
    merged = np.concatenate([a, b])
    order = np.argsort(merged, kind="stable")  # two sorted runs: linear time
    values = merged[order]
    from_a = order < a.size
    cdf_a = np.cumsum(from_a) / a.size
    cdf_b = np.cumsum(~from_a) / b.size
    last = np.empty(values.size, dtype=bool)  # last of each run of equal values: the CDFs there
    last[:-1] = values[1:] != values[:-1]
    last[-1] = True
    diff = np.abs(cdf_a[last] - cdf_b[last])
    return float(np.sum(diff[:-1] * np.diff(values[last]))), float(
        diff.max()
    )  # no BLAS call: steadier timing


def _half_parts(a: PatternSummary, b: PatternSummary, h: str) -> dict[str, float]:
    na, nb = a.phases[h].size, b.phases[h].size
    if na == 0 and nb == 0:
        parts = dict.fromkeys(EMPTY_DISTANCE, 0.0)
    elif na == 0 or nb == 0:
        parts = dict(EMPTY_DISTANCE)
    else:
        w_mag, ks_mag = cdf_distances(a.log_magnitudes[h], b.log_magnitudes[h])
        parts = {
            "phase_js": float(jensenshannon(a.histograms[h], b.histograms[h], base=2.0)),
            "phase_wasserstein": cdf_distances(a.phases[h], b.phases[h])[0] / 180.0,
            "magnitude_wasserstein": w_mag,
            "magnitude_ks": ks_mag,
        }
    parts["rate"] = abs(math.log10((na + 0.5) / a.cycles) - math.log10((nb + 0.5) / b.cycles))
    return parts


def _fingerprint_distance(x: np.ndarray, y: np.ndarray) -> float:
    ok = np.isfinite(x) & np.isfinite(y)
    if not ok.any():
        return math.nan
    d = np.abs(x[ok] - y[ok]) / (np.abs(x[ok]) + np.abs(y[ok]) + 1.0)
    return float(d.mean())


def compare(
    simulated: PatternSource,
    measured: PatternSource,
    threshold: float = 0.0,
    weights: Mapping[str, float] | None = None,
    *,
    phase_bins: int = 18,
    phase_windows: int = 18,
) -> Comparison:
    """Combined distance between two patterns (definition in :mod:`pdvoid.analysis.compare`).

    Parameters
    ----------
    simulated : Events, Result, PatternMatrix or PatternSummary
        events, a Result, a count matrix (:class:`pdvoid.io.matrix.PatternMatrix`) or a summary from
        :func:`summarise` [-]
    measured : Events, Result, PatternMatrix or PatternSummary
        the same kinds [-]
    threshold : float
        detection threshold [C], >= 0: events with |q| < threshold are removed from both sides
    weights : Mapping[str, float] or None
        {part name: weight >= 0} replacing entries of DEFAULT_WEIGHTS [-]
    phase_bins : int
        equal phase bins per half cycle for the Jensen-Shannon part [-]
    phase_windows : int
        windows per half cycle of the fingerprint [-]

    Returns
    -------
    Comparison
        :class:`Comparison` (score 0 for identical inputs; symmetric in its two inputs).

    Raises
    ------
    InputError
        for bad arguments, or a PatternSummary made with another threshold or binning.
    """
    thr = check_nonnegative("threshold", threshold, "C")
    w = _weights(weights)
    sides = []
    for name, obj in (("simulated", simulated), ("measured", measured)):
        s = summarise(obj, thr, phase_bins, phase_windows)
        if (s.threshold, s.phase_bins, s.phase_windows) != (thr, phase_bins, phase_windows):
            raise InputError(
                f"{name} is a PatternSummary made with threshold {s.threshold!r} C, phase_bins "
                f"{s.phase_bins}, phase_windows {s.phase_windows}; this comparison uses {thr!r} C, "
                f"{phase_bins}, {phase_windows}"
            )
        sides.append(s)
    a, b = sides
    share = {}
    for h in HALVES:
        share[h] = (a.phases[h].size / a.kept if a.kept else 0.0) + (
            b.phases[h].size / b.kept if b.kept else 0.0
        )
    total = sum(share.values())
    hw = {h: (share[h] / total if total > 0 else 0.5) for h in HALVES}
    parts = dict.fromkeys(PART_NAMES, 0.0)
    for h in HALVES:
        for k, v in _half_parts(a, b, h).items():
            parts[k] += hw[h] * v
    parts["fingerprint"] = _fingerprint_distance(a.descriptors, b.descriptors)
    num = sum(w[k] * parts[k] for k in PART_NAMES if math.isfinite(parts[k]) and w[k] > 0)
    den = sum(w[k] for k in PART_NAMES if math.isfinite(parts[k]) and w[k] > 0)
    if den == 0:  # only possible when the fingerprint alone is weighted and undefined
        raise InputError("no part with a weight > 0 is defined for these patterns; weight another part")
    score = num / den
    return Comparison(
        score=score,
        parts=parts,
        weights=w,
        threshold=thr,
        kept={"simulated": a.kept, "measured": b.kept},
        removed={"simulated": a.removed, "measured": b.removed},
        rates={"simulated": a.rate, "measured": b.rate},
    )
