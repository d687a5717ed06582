"""The statistic vector of a phase-resolved pattern that the posterior fit compares: defined for event lists and
for count matrices.

:func:`pdvoid.fit` with ``method="posterior"`` (:mod:`pdvoid.analysis.posterior`) needs a short vector of numbers
s(pattern) whose distribution over repeated simulations is close to normal (the synthetic likelihood). This module
defines it, our own choice, built from the same ingredients as :func:`pdvoid.analysis.compare.compare` (halves,
threshold, phases re-referenced to 0-180 deg, log10 of the magnitude):

1. **Threshold.** Events with ``|q| < threshold`` and zero-charge events are removed (as in
   :mod:`pdvoid.analysis.compare`).
2. **Halves.** Events with phase in [0, 180) deg form the "+" half, the others the "-" half (phase - 180 deg).
3. **One pseudo-event per half** at the centre of the half (90 deg) and at the reference magnitude
   ``reference_log_magnitude`` (the median log10 ``|q|`` of the measured pattern, fixed once per fit) is added to each
   half with weight 1, so that every entry below is defined also for a half without discharges; with the
   thousands of discharges of a measured pattern its pull is a fraction of a percent.
4. **Six numbers per half** (with x = phase / 180 deg in [0, 1) and y = log10(``|q|`` / 1 C); weights w = 1 per
   event, or the counts of a matrix):

   - ``rate``: log10((n + 0.5) / cycles), n the discharges of the half (no pseudo-event) [decades];
   - ``phase_mean``, ``phase_std``: weighted mean and standard deviation of x [-];
   - ``magnitude_mean``, ``magnitude_std``: weighted mean and standard deviation of y [decades];
   - ``phase_magnitude_cov``: weighted covariance of x and y (does the magnitude rise or fall across the
     half?) [decades].

   The vector is ordered as :data:`STATISTIC_NAMES` ("+" half first), 12 numbers.

**Count matrices.** A :class:`pdvoid.io.matrix.PatternMatrix` knows each discharge only to its bin. Its
statistics are computed with every count at its bin's centre (phase centre; arithmetic centre of the charge
edges; bins centred on 0 C hold no pulses), and a simulation compared with it is first counted into the *same*
bins (events outside the matrix's edges are not counted, as the instrument would not have counted them). Both
sides therefore go through the same binning and the statistic means the same on both. Event lists are used as
they are (no binning).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from pdvoid.analysis.patterns import HALVES, EventSource, _stored_events
from pdvoid.core.errors import InputError, check_nonnegative, check_real
from pdvoid.io.matrix import PatternMatrix

__all__ = ["STATISTIC_NAMES", "STATISTIC_WORDS", "PatternStatistics", "pattern_statistics"]

_PER_HALF = ("rate", "phase_mean", "phase_std", "magnitude_mean", "magnitude_std", "phase_magnitude_cov")
#: names of the statistic vector's entries, in order
STATISTIC_NAMES: tuple[str, ...] = tuple(f"{h}{k}" for h in ("+", "-") for k in _PER_HALF)
_HALF_WORDS = {"+": "positive half cycle", "-": "negative half cycle"}
_WORDS = {
    "rate": "discharges per cycle (log10)",
    "phase_mean": "mean phase (fraction of the half cycle)",
    "phase_std": "spread of phase (fraction of the half cycle)",
    "magnitude_mean": "mean magnitude (log10 of |q| in C)",
    "magnitude_std": "spread of magnitude (decades)",
    "phase_magnitude_cov": "trend of magnitude with phase (covariance)",
}
#: plain words for each entry, for reports
STATISTIC_WORDS: dict[str, str] = {f"{h}{k}": f"{_WORDS[k]}, {_HALF_WORDS[h]}" for h in ("+", "-")
                                   for k in _PER_HALF}


def _half_stats(x: np.ndarray, y: np.ndarray, w: np.ndarray, cycles: float, ref: float) -> list[float]:
    n = float(w.sum())
    # the pseudo-event (x = 0.5, y = ref, weight 1) keeps every moment defined
    wt = n + 1.0
    mx = (float(np.dot(w, x)) + 0.5) / wt
    my = (float(np.dot(w, y)) + ref) / wt
    dx = x - mx
    dy = y - my
    vx = (float(np.dot(w, dx * dx)) + (0.5 - mx) ** 2) / wt
    vy = (float(np.dot(w, dy * dy)) + (ref - my) ** 2) / wt
    cxy = (float(np.dot(w, dx * dy)) + (0.5 - mx) * (ref - my)) / wt
    return [math.log10((n + 0.5) / cycles), mx, math.sqrt(vx), my, math.sqrt(vy), cxy]


@dataclass(frozen=True)
class PatternStatistics:
    """How patterns are reduced to the statistic vector (definition in :mod:`pdvoid.analysis.pattern_statistics`).

    Attributes
    ----------
    threshold : float
        detection threshold: events with ``|q|`` below it are removed [C].
    reference_log_magnitude : float
        log10 of the pseudo-event's magnitude in C [-].
    phase_edges_deg : numpy.ndarray or None
        phase bin edges of a measured count matrix (simulations are counted into them), or None for events [deg].
    charge_edges : numpy.ndarray or None
        signed charge bin edges of that matrix, or None [C].
    """

    threshold: float
    reference_log_magnitude: float
    phase_edges_deg: np.ndarray | None = None
    charge_edges: np.ndarray | None = None

    def __post_init__(self) -> None:
        check_nonnegative("threshold", self.threshold, "C")
        check_real("reference_log_magnitude", self.reference_log_magnitude)
        if (self.phase_edges_deg is None) != (self.charge_edges is None):
            raise InputError("phase_edges_deg and charge_edges go together (the bins of a count matrix) or are "
                             "both None (events)")

    @property
    def binned(self) -> bool:
        """True when simulations are counted into a measured matrix's bins first."""
        return self.phase_edges_deg is not None

    def _vector(self, phase: np.ndarray, charge: np.ndarray, weight: np.ndarray, cycles: float) -> np.ndarray:
        mag = np.abs(charge)
        keep = (mag >= self.threshold) & (mag > 0.0) & (weight > 0)
        phase, mag, weight = phase[keep], mag[keep], weight[keep].astype(float)
        plus = phase < 180.0
        out: list[float] = []
        for h in HALVES:
            sel = plus if h == "+" else ~plus
            x = (phase[sel] - (0.0 if h == "+" else 180.0)) / 180.0
            out += _half_stats(x, np.log10(mag[sel]), weight[sel], cycles, self.reference_log_magnitude)
        return np.array(out)

    def of_events(self, phase_deg: np.ndarray, charge: np.ndarray, cycles: float) -> np.ndarray:
        """The statistic vector of events (counted into the matrix's bins first when :attr:`binned`).

        Parameters
        ----------
        phase_deg : numpy.ndarray
            event phases in [0, 360) [deg].
        charge : numpy.ndarray
            signed apparent charges [C].
        cycles : float
            AC cycles observed [-].

        Returns
        -------
        numpy.ndarray
            12 numbers in the order of :data:`STATISTIC_NAMES`.
        """
        phase = np.asarray(phase_deg, dtype=float)
        charge = np.asarray(charge, dtype=float)
        if self.phase_edges_deg is not None and self.charge_edges is not None:
            pe, ce = self.phase_edges_deg, self.charge_edges
            ip = np.searchsorted(pe, phase, side="right") - 1
            iq = np.searchsorted(ce, charge, side="right") - 1
            # bins [a, b), the last one [a, b] (as matrix_from_events)
            ip[phase == pe[-1]] = pe.size - 2
            iq[charge == ce[-1]] = ce.size - 2
            inside = (ip >= 0) & (ip < pe.size - 1) & (iq >= 0) & (iq < ce.size - 1)
            pc = 0.5 * (pe[:-1] + pe[1:])
            qc = 0.5 * (ce[:-1] + ce[1:])
            phase, charge = pc[ip[inside]], qc[iq[inside]]
        return self._vector(phase, charge, np.ones(phase.size), cycles)

    def of_matrix(self, matrix: PatternMatrix) -> np.ndarray:
        """The statistic vector of a count matrix (every count at its bin's centre).

        Parameters
        ----------
        matrix : PatternMatrix
            the counts and their edges [-].

        Returns
        -------
        numpy.ndarray
            12 numbers in the order of :data:`STATISTIC_NAMES`.
        """
        pc = matrix.phase_centres_deg
        qc = matrix.charge_centres()
        phase = np.repeat(pc, qc.size)
        charge = np.tile(qc, pc.size)
        return self._vector(phase, charge, matrix.counts.ravel(), matrix.cycles)


def pattern_statistics(measured: EventSource | PatternMatrix, threshold: float = 0.0) -> tuple[PatternStatistics,
                                                                                             np.ndarray]:
    """The reduction for a measured pattern and the measured statistic vector.

    Parameters
    ----------
    measured : Events, Result or PatternMatrix
        measured events (:func:`pdvoid.read_events`) or a count matrix (:func:`pdvoid.read_pattern_matrix`).
    threshold : float
        detection threshold of the measurement [C], >= 0.

    Returns
    -------
    tuple of (PatternStatistics, numpy.ndarray)
        The reduction (with the measured pattern's median log10 ``|q|`` as reference and, for a matrix, its
        bins) and the 12 measured statistics in the order of :data:`STATISTIC_NAMES`.

    Raises
    ------
    InputError
        For another kind of input, or a pattern without any discharge at or above the threshold (nothing to
        fit).
    """
    thr = check_nonnegative("threshold", threshold, "C")
    if isinstance(measured, PatternMatrix):
        qc = np.abs(measured.charge_centres())
        counts = measured.counts.sum(axis=0)
        ok = (qc >= thr) & (qc > 0.0) & (counts > 0)
        if not ok.any():
            raise InputError("measured: the count matrix holds no discharge at or above the threshold "
                             f"{thr:.4g} C; there is nothing to fit")
        logs, w = np.log10(qc[ok]), counts[ok].astype(float)
        order = np.argsort(logs, kind="stable")
        cum = np.cumsum(w[order])
        median = float(logs[order][np.searchsorted(cum, 0.5 * cum[-1])])  # weighted (lower) median
        stats = PatternStatistics(thr, median, measured.phase_edges_deg, measured.charge_edges)
        return stats, stats.of_matrix(measured)
    try:
        ev = _stored_events(measured)
    except InputError:
        raise
    except (TypeError, AttributeError):
        raise InputError(f"measured must be Events, a Result or a PatternMatrix; got {type(measured).__name__}"
                         ) from None
    mag = np.abs(ev.charge)
    ok = (mag >= thr) & (mag > 0.0)
    if not ok.any():
        raise InputError(f"measured: the pattern holds no discharge at or above the threshold {thr:.4g} C; there "
                         "is nothing to fit")
    stats = PatternStatistics(thr, float(np.median(np.log10(mag[ok]))))
    return stats, stats.of_events(ev.phase_deg, ev.charge, ev.cycles)
