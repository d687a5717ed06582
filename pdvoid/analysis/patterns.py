"""Phase-resolved patterns, half-cycle distributions and the magnitude distribution of discharge events.

Conventions used throughout :mod:`pdvoid.analysis`:

- Events with zero charge are not pulses. They never enter a bin or a window; :class:`PhasePattern`
  reports how many there were in ``zero_count`` so that ``counts.sum() + zero_count + outside_count``
  equals the number of events.
- The half cycles are those of the applied voltage: the "+" half is 0-180 deg, the "-" half is 180-360
  deg and is re-referenced to 0-180 deg (phase minus 180 deg). Magnitudes are |q|. This is the split of
  the phase-resolved distributions used by Gulski & Kreuger (gulski1992, from memory).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TypeAlias

import numpy as np

from pdvoid.core.arrays import frozen_array as _frozen
from pdvoid.core.errors import InputError, check_bool, check_choice, check_int, check_real
from pdvoid.core.limits import MAX_BINS, check_memory
from pdvoid.simulation.events import Events, as_events
from pdvoid.simulation.results import Result

__all__ = [
    "PhasePattern",
    "HalfCycleDistributions",
    "MagnitudeDistribution",
    "pattern",
    "half_cycle_distributions",
    "magnitude_distribution",
    "DISTRIBUTION_NAMES",
    "HALVES",
    "EventSource",
]

#: what the event-based analysis functions accept: the events themselves or a simulation Result that kept them
EventSource: TypeAlias = Events | Result

#: names of the phase-resolved distributions of :class:`HalfCycleDistributions`
DISTRIBUTION_NAMES: tuple[str, ...] = ("H_n", "H_qn", "H_qmax")
#: the two voltage half cycles
HALVES: tuple[str, ...] = ("+", "-")

_MAX_BINS = MAX_BINS




def _stored_events(obj: EventSource) -> Events:
    """:func:`pdvoid.simulation.events.as_events`, refusing results that did not store their events (histogram runs)."""
    ev = as_events(obj)
    recorded = getattr(obj, "event_count", None)
    if isinstance(recorded, (int, np.integer)) and not isinstance(obj, Events) and int(recorded) != ev.count:
        raise InputError(
            f"this result recorded {int(recorded)} discharges but stored {ev.count} events (a histogram-only "
            "run); event-based analysis needs a run that keeps every event (simulate(..., histogram=False))"
        )
    return ev


def _filled(values: np.ndarray | None) -> np.ndarray:
    """An optional event array (time, cycle, voltage, fields), which :class:`Events` always fills (NaN where
    unknown)."""
    if values is None:
        raise InputError("these events lack an event array that Events always fills (time, cycle or voltage)")
    return values


def _half_split(ev: Events) -> dict[str, tuple[np.ndarray, np.ndarray]]:
    """Nonzero events per voltage half: {"+": (phase [deg] in [0, 180), |q| [C]), "-": (phase - 180, |q|)}."""
    nz = ev.charge != 0.0
    phase = ev.phase_deg[nz]
    mag = np.abs(ev.charge[nz])
    plus = phase < 180.0
    return {"+": (phase[plus], mag[plus]), "-": (phase[~plus] - 180.0, mag[~plus])}


def _magnitude_edges(
    mag: np.ndarray, nbins: int, scale: str, charge_range: tuple[float, float] | None, *,
    name: str = "charge_range"
) -> np.ndarray:
    """``nbins + 1`` increasing magnitude edges [C], linear or log, from the data or ``charge_range``."""
    if charge_range is None:
        if mag.size == 0:
            raise InputError(
                f"{name} is needed when there are no events with nonzero charge (the charge axis cannot be "
                "taken from the data); give (low, high) magnitudes in C"
            )
        if scale == "log":
            low, high = float(mag.min()), float(mag.max())
            if low == high:  # one magnitude only: half a decade either side (documented in pattern())
                low, high = low / np.sqrt(10.0), high * np.sqrt(10.0)
        else:
            low, high = 0.0, float(mag.max())
    else:
        if (
            isinstance(charge_range, (str, bytes))
            or not hasattr(charge_range, "__len__")
            or len(charge_range) != 2
        ):
            raise InputError(
                f"{name} must be None or a pair (low, high) of magnitudes [C]; got {charge_range!r}"
            )
        low = check_real(f"{name}[0]", charge_range[0])
        high = check_real(f"{name}[1]", charge_range[1])
        if scale == "log" and low <= 0.0:
            raise InputError(f"{name}[0] must be > 0 C for a logarithmic charge axis; got {low!r}")
        if low < 0.0:
            raise InputError(f"{name}[0] must be >= 0 C (it is a magnitude); got {low!r}")
        if not high > low:
            raise InputError(f"{name} must satisfy low < high; got ({low!r}, {high!r})")
    edges = np.geomspace(low, high, nbins + 1) if scale == "log" else np.linspace(low, high, nbins + 1)
    edges[0], edges[-1] = low, high  # exact end points: the extreme events must fall inside
    return edges


@dataclass(frozen=True, eq=False)
class PhasePattern:
    """Counts of discharges over phase x apparent charge (both polarities), accumulated over the observation.

    Attributes
    ----------
    counts : numpy.ndarray
        number of events per (phase bin, charge bin), shape (phase_bins, charge_bins) [-]. The first
        ``charge_bins // 2`` columns hold negative charges, from the most negative bin up; the others hold
        positive charges, from the smallest magnitude up.
    phase_edges_deg : numpy.ndarray
        phase bin edges, 0 ... 360 [deg].
    magnitude_edges : numpy.ndarray
        the ``charge_bins // 2 + 1`` increasing magnitude edges of both polarities [C].
    charge_edges : numpy.ndarray
        ``-magnitude_edges[::-1]`` followed by ``magnitude_edges``, length ``charge_bins + 2``,
        increasing [C]. The interval between the two middle entries, (-magnitude_edges[0],
        magnitude_edges[0]), is not a bin (for a linear axis from 0 it has zero width). Use
        :attr:`bin_lower` / :attr:`bin_upper` for the limits of each column.
    charge_scale : str
        "log" or "linear".
    cycles : float
        number of AC cycles observed [-].
    per_cycle : bool
        whether :attr:`values` is the mean count per cycle (True) or the accumulated count (False).
    zero_count : int
        events with zero charge, counted in no bin [-].
    outside_count : int
        events with nonzero charge whose magnitude lies outside ``charge_range`` [-].
    """

    counts: np.ndarray
    phase_edges_deg: np.ndarray
    magnitude_edges: np.ndarray
    charge_scale: str
    cycles: float
    per_cycle: bool
    zero_count: int
    outside_count: int

    @property
    def charge_edges(self) -> np.ndarray:
        """Signed edges [C]: negative mirror then positive edges (length charge_bins + 2; see class docs)."""
        return _frozen(np.concatenate([-self.magnitude_edges[::-1], self.magnitude_edges]))

    @property
    def charge_edges_negative(self) -> np.ndarray:
        """Increasing edges [C] of the negative columns ``counts[:, :charge_bins // 2]``."""
        return _frozen(-self.magnitude_edges[::-1])

    @property
    def charge_edges_positive(self) -> np.ndarray:
        """Increasing edges [C] of the positive columns ``counts[:, charge_bins // 2:]``."""
        return self.magnitude_edges

    @property
    def bin_lower(self) -> np.ndarray:
        """Lower charge limit of each column [C]."""
        m = self.magnitude_edges
        return _frozen(np.concatenate([-m[::-1][:-1], m[:-1]]))

    @property
    def bin_upper(self) -> np.ndarray:
        """Upper charge limit of each column [C]."""
        m = self.magnitude_edges
        return _frozen(np.concatenate([-m[::-1][1:], m[1:]]))

    @property
    def charge_centres(self) -> np.ndarray:
        """Centre of each column [C]: arithmetic mean of its limits (linear), signed geometric mean (log)."""
        m = self.magnitude_edges
        mid = np.sqrt(m[:-1] * m[1:]) if self.charge_scale == "log" else 0.5 * (m[:-1] + m[1:])
        return _frozen(np.concatenate([-mid[::-1], mid]))

    @property
    def phase_centres_deg(self) -> np.ndarray:
        """Centre of each phase bin [deg]."""
        e = self.phase_edges_deg
        return _frozen(0.5 * (e[:-1] + e[1:]))

    @property
    def rate_per_cycle(self) -> np.ndarray:
        """Mean number of events per cycle in each bin, counts / cycles [-]."""
        return _frozen(self.counts / self.cycles)

    @property
    def values(self) -> np.ndarray:
        """What was asked for: :attr:`rate_per_cycle` if ``per_cycle`` else :attr:`counts`."""
        return self.rate_per_cycle if self.per_cycle else self.counts

    def mesh(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """(phase_edges_deg [deg], charge_edges [C], z) for a mesh plot over the signed charge axis.

        ``z`` has shape (charge_bins + 1, phase_bins): :attr:`values` transposed, with one row inserted for the
        interval between the polarities, which is always 0 (events there are in ``zero_count`` or
        ``outside_count``). This is the layout ``matplotlib.pyplot.pcolormesh(x_edges, y_edges, z)`` expects.

        Returns
        -------
        tuple of (numpy.ndarray, numpy.ndarray, numpy.ndarray)
            Phase edges [deg], signed charge edges [C] and ``z`` [-, or 1/cycle with ``per_cycle``].
        """
        v = np.asarray(self.values, dtype=float)
        m = v.shape[1] // 2
        z = np.concatenate([v[:, :m], np.zeros((v.shape[0], 1)), v[:, m:]], axis=1).T
        return self.phase_edges_deg, self.charge_edges, _frozen(z)

    @property
    def total(self) -> int:
        """Number of events counted in the bins [-]."""
        return int(self.counts.sum())


def pattern(
    events: EventSource,
    phase_bins: int = 72,
    charge_bins: int = 50,
    charge_scale: str = "log",
    charge_range: tuple[float, float] | None = None,
    per_cycle: bool = False,
) -> PhasePattern:
    """Phase-resolved pattern: counts of discharges per phase bin and apparent-charge bin, both polarities.

    The charge axis is symmetric: ``charge_bins // 2`` bins for negative and as many for positive charge, with
    the same magnitude edges mirrored. A logarithmic axis ("log") uses geometrically spaced magnitude edges,
    i.e. symmetric signed logarithmic bins; a linear axis uses equally spaced ones. Every event with nonzero
    charge inside the magnitude range is counted exactly once; magnitude bins are half-open [a, b) except the
    top one, which includes its upper edge (as ``numpy.histogram``). Zero-charge events are counted in no bin
    (``zero_count``); events outside an explicit ``charge_range`` in ``outside_count``.

    Without ``charge_range`` the magnitude range comes from the data: [min |q|, max |q|] over nonzero events
    for "log" (widened to half a decade either side when all magnitudes are equal) and [0, max |q|] for
    "linear".

    Parameters
    ----------
    events : Events or Result
        discharge events or a result holding them (see :func:`pdvoid.simulation.events.as_events`) [-]
    phase_bins : int
        number of equal phase bins over 0-360 deg, 1 ... 100000 [-]
    charge_bins : int
        total number of charge bins, even (half per polarity), 2 ... 100000 [-]
    charge_scale : str
        "log" or "linear" [-]
    charge_range : tuple[float, float] or None
        (low, high) magnitude range [C], 0 <= low < high (low > 0 for "log"); None: from the
        data
    per_cycle : bool
        if True, :attr:`PhasePattern.values` gives counts per cycle [-]

    Returns
    -------
    PhasePattern
        :class:`PhasePattern`.

    Raises
    ------
    InputError
        for bad bins or range, or when the range must come from the data and there is no event
        with nonzero charge.
    """
    ev = _stored_events(events)
    nphase = check_int("phase_bins", phase_bins, 1, _MAX_BINS)
    ncharge = check_int("charge_bins", charge_bins, 2, _MAX_BINS)
    if ncharge % 2:
        raise InputError(f"charge_bins must be even (half the bins per polarity); got {ncharge}")
    # the two halves, their joined copy, the rounded counts and the per-cycle values: five arrays of 8 bytes
    check_memory(f"a pattern of {nphase} phase x {ncharge} charge bins", 5 * 8 * nphase * ncharge)
    scale = check_choice("charge_scale", charge_scale, ("log", "linear"))
    per = check_bool("per_cycle", per_cycle)
    m = ncharge // 2

    nz = ev.charge != 0.0
    mag_edges = _magnitude_edges(np.abs(ev.charge[nz]), m, scale, charge_range)
    phase_edges = np.linspace(0.0, 360.0, nphase + 1)

    halves = []
    for positive in (False, True):
        sel = nz & ((ev.charge > 0.0) if positive else (ev.charge < 0.0))
        h, _, _ = np.histogram2d(ev.phase_deg[sel], np.abs(ev.charge[sel]), bins=[phase_edges, mag_edges])
        halves.append(h if positive else h[:, ::-1])
    counts = np.rint(np.hstack(halves)).astype(np.int64)
    zero = int(np.count_nonzero(~nz))
    outside = int(np.count_nonzero(nz)) - int(counts.sum())
    return PhasePattern(
        counts=_frozen(counts, np.int64),
        phase_edges_deg=_frozen(phase_edges),
        magnitude_edges=_frozen(mag_edges),
        charge_scale=scale,
        cycles=ev.cycles,
        per_cycle=per,
        zero_count=zero,
        outside_count=outside,
    )


@dataclass(frozen=True, eq=False)
class HalfCycleDistributions:
    """Phase-resolved distributions per voltage half cycle over equal phase windows (gulski1992).

    Attributes
    ----------
    window_edges_deg : numpy.ndarray
        window edges, 0 ... 180 [deg] (the "-" half is re-referenced to 0-180 deg).
    window_centres_deg : numpy.ndarray
        window centres x_i [deg].
    n_plus, n_minus : numpy.ndarray
        H_n, number of pulses per window [-].
    qn_plus, qn_minus : numpy.ndarray
        H_qn, mean magnitude |q| per window [C]; 0 where the window holds no pulse.
    qmax_plus, qmax_minus : numpy.ndarray
        H_qmax, largest magnitude per window [C]; 0 where the window holds no pulse.
    cycles : float
        number of AC cycles observed [-].
    """

    window_edges_deg: np.ndarray
    window_centres_deg: np.ndarray
    n_plus: np.ndarray
    n_minus: np.ndarray
    qn_plus: np.ndarray
    qn_minus: np.ndarray
    qmax_plus: np.ndarray
    qmax_minus: np.ndarray
    cycles: float

    def get(self, name: str, half: str) -> np.ndarray:
        """One of the distributions by name and half.

        Parameters
        ----------
        name : str
            "H_n", "H_qn" or "H_qmax" [-].
        half : str
            "+" or "-" [-].

        Returns
        -------
        numpy.ndarray
            The distribution over the phase windows of that half.

        Raises
        ------
        InputError
            For another name or half.
        """
        check_choice("name", name, DISTRIBUTION_NAMES)
        check_choice("half", half, HALVES)
        field = {"H_n": "n", "H_qn": "qn", "H_qmax": "qmax"}[name]
        return getattr(self, f"{field}_{'plus' if half == '+' else 'minus'}")


def half_cycle_distributions(events: EventSource, phase_windows: int = 18) -> HalfCycleDistributions:
    """H_n, H_qn and H_qmax versus phase for the "+" (0-180 deg) and "-" (180-360 deg) voltage half cycles.

    Definitions (physics brief section 10, after Gulski & Kreuger; from memory): per phase window, H_n is the
    number of pulses, H_qn the mean pulse magnitude and H_qmax the largest pulse magnitude. The "-" half is
    re-referenced to 0-180 deg. Windows are half-open [a, b). Zero-charge events are left out. In a window
    without pulses H_qn and H_qmax are 0 (our convention, so that the distributions can serve as weights).

    Parameters
    ----------
    events : Events or Result
        discharge events or a result holding them [-]
    phase_windows : int
        number of equal windows per half cycle, 1 ... 100000 (18 gives 10 deg windows) [-]

    Returns
    -------
    HalfCycleDistributions
        :class:`HalfCycleDistributions`.

    References
    ----------
    gulski1992: E. Gulski, F. H. Kreuger, 'Computer-aided recognition of discharge sources', IEEE Trans.
    Electr. Insul. 27(1) (1992) 82-92 (from memory). Valid for any event set; no physical assumption.
    """
    ev = _stored_events(events)
    nw = check_int("phase_windows", phase_windows, 1, _MAX_BINS)
    edges = np.linspace(0.0, 180.0, nw + 1)
    out: dict[str, np.ndarray] = {}
    for half, (phase, mag) in _half_split(ev).items():
        suffix = "plus" if half == "+" else "minus"
        idx = np.clip(np.searchsorted(edges, phase, side="right") - 1, 0, nw - 1)
        n = np.bincount(idx, minlength=nw).astype(float)
        total = np.bincount(idx, weights=mag, minlength=nw)
        qmax = np.zeros(nw)
        np.maximum.at(qmax, idx, mag)
        mean = np.divide(total, n, out=np.zeros(nw), where=n > 0)
        out[f"n_{suffix}"] = _frozen(n)
        out[f"qn_{suffix}"] = _frozen(mean)
        out[f"qmax_{suffix}"] = _frozen(qmax)
    return HalfCycleDistributions(
        window_edges_deg=_frozen(edges),
        window_centres_deg=_frozen(0.5 * (edges[:-1] + edges[1:])),
        cycles=ev.cycles,
        **out,
    )


@dataclass(frozen=True, eq=False)
class MagnitudeDistribution:
    """H(q): number of pulses per magnitude bin, per voltage half cycle.

    Attributes
    ----------
    edges : numpy.ndarray
        increasing magnitude edges [C].
    count_plus, count_minus : numpy.ndarray
        pulses per bin in the "+" (0-180 deg) and "-" (180-360 deg) halves [-].
    scale : str
        "log" or "linear".
    cycles : float
        number of AC cycles observed [-].
    outside_count : int
        nonzero events outside an explicit range [-].
    """

    edges: np.ndarray
    count_plus: np.ndarray
    count_minus: np.ndarray
    scale: str
    cycles: float
    outside_count: int

    @property
    def centres(self) -> np.ndarray:
        """Bin centres [C]: arithmetic (linear) or geometric (log) mean of the edges."""
        e = self.edges
        return _frozen(np.sqrt(e[:-1] * e[1:]) if self.scale == "log" else 0.5 * (e[:-1] + e[1:]))


def magnitude_distribution(
    events: EventSource,
    bins: int = 50,
    scale: str = "log",
    charge_range: tuple[float, float] | None = None,
) -> MagnitudeDistribution:
    """H(q), the number of pulses versus magnitude |q|, for each voltage half cycle (gulski1992, from memory).

    Both halves share the same edges. The range rules are those of :func:`pattern`; zero-charge events are
    left out; bins are [a, b) except the top one, which includes its upper edge.

    Parameters
    ----------
    events : Events or Result
        discharge events or a result holding them [-]
    bins : int
        number of magnitude bins, 1 ... 100000 [-]
    scale : str
        "log" or "linear" [-]
    charge_range : tuple[float, float] or None
        (low, high) magnitude range [C]; None: from the data

    Returns
    -------
    MagnitudeDistribution
        :class:`MagnitudeDistribution`.

    References
    ----------
    gulski1992 (from memory). Valid for any event set.
    """
    ev = _stored_events(events)
    nb = check_int("bins", bins, 1, _MAX_BINS)
    sc = check_choice("scale", scale, ("log", "linear"))
    nz = ev.charge != 0.0
    edges = _magnitude_edges(np.abs(ev.charge[nz]), nb, sc, charge_range)
    split = _half_split(ev)
    cp = np.histogram(split["+"][1], bins=edges)[0]
    cm = np.histogram(split["-"][1], bins=edges)[0]
    outside = int(np.count_nonzero(nz)) - int(cp.sum() + cm.sum())
    return MagnitudeDistribution(
        edges=_frozen(edges),
        count_plus=_frozen(cp, np.int64),
        count_minus=_frozen(cm, np.int64),
        scale=sc,
        cycles=ev.cycles,
        outside_count=outside,
    )
