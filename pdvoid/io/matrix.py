"""Phase-resolved count matrices with their bin edges: :class:`PatternMatrix`, reader and writer.

Delimited layout read by :func:`read_pattern_matrix` (our own; comma, semicolon or tab delimiter as for event
lists, decimal comma with semicolons; ``#`` comment lines and blank lines anywhere)::

    # frequency = 50 Hz
    # cycles = 3000
    phase edges [deg],0,5,10,...,360
    charge edges [pC],-1000,-300,...,1000
    counts
    0,2,7,...
    ...

- ``phase edges [unit]`` (deg or rad) and ``charge edges [unit]`` (C, nC, pC, fC) lines, in either order, each
  followed by the strictly increasing bin edges: n_phase + 1 phase edges inside [0, 360] deg and
  n_charge + 1 signed charge edges.
- a line ``counts``, then exactly n_phase rows of n_charge whole numbers >= 0: row i holds the counts of phase
  bin i, column j those of charge bin j.
- the number of cycles and the frequency are required, as ``# cycles = ...`` / ``# frequency = ...`` comment
  lines or as options (see :mod:`pdvoid.io.options`).
"""

from __future__ import annotations

import os
import re
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
from numpy.typing import ArrayLike

from pdvoid.core.arrays import frozen_array as _frozen
from pdvoid.core.errors import InputError, check_array, check_choice, check_positive
from pdvoid.core.files import atomic_write
from pdvoid.io import lines as L
from pdvoid.io.columns import checked_column
from pdvoid.io.options import CommentKeys, check_layout_options, quantity_option
from pdvoid.simulation.events import Events, as_events
from pdvoid.simulation.results import Result

__all__ = ["PatternMatrix", "matrix_from_events", "read_pattern_matrix", "write_pattern_matrix"]

_EDGES = re.compile(r"^(phase|charge)\s+edges\s*(?:[\[(]\s*([^\[\]()]*?)\s*[\])])?$", re.IGNORECASE)




@dataclass(frozen=True, eq=False)
class PatternMatrix:
    """Counts of discharges per (phase bin, charge bin) over an observation of ``cycles`` AC cycles.

    Attributes
    ----------
    counts : numpy.ndarray
        whole numbers >= 0, shape (n_phase, n_charge) [-].
    phase_edges_deg : numpy.ndarray
        n_phase + 1 strictly increasing edges inside [0, 360] [deg].
    charge_edges : numpy.ndarray
        n_charge + 1 strictly increasing signed edges [C].
    cycles : float
        number of AC cycles observed [-].
    frequency : float
        supply frequency [Hz].
    label : str
        free text.
    extra : dict
        free dictionary (the readers put their summary and metadata here).
    """

    counts: np.ndarray
    phase_edges_deg: np.ndarray
    charge_edges: np.ndarray
    cycles: float
    frequency: float
    label: str = ""
    extra: dict = field(default_factory=dict)

    def __post_init__(self) -> None:
        object.__setattr__(self, "cycles", check_positive("cycles", self.cycles))
        object.__setattr__(self, "frequency", check_positive("frequency", self.frequency, "Hz"))
        pe = np.asarray(self.phase_edges_deg, dtype=float)
        ce = np.asarray(self.charge_edges, dtype=float)
        for name, e in (("phase_edges_deg", pe), ("charge_edges", ce)):
            if e.ndim != 1 or e.size < 2 or not np.all(np.isfinite(e)) or np.any(np.diff(e) <= 0.0):
                raise InputError(f"{name} must hold at least 2 finite, strictly increasing values")
        if pe[0] < 0.0 or pe[-1] > 360.0:
            raise InputError(f"phase_edges_deg must lie inside [0, 360] deg; got {pe[0]!r} ... {pe[-1]!r}")
        c = np.asarray(self.counts)
        if c.shape != (pe.size - 1, ce.size - 1):
            raise InputError(
                f"counts must have shape (phase bins, charge bins) = ({pe.size - 1}, {ce.size - 1}); "
                f"got {c.shape}"
            )
        object.__setattr__(self, "counts", _frozen(_checked_counts(c), np.int64))
        object.__setattr__(self, "phase_edges_deg", _frozen(pe))
        object.__setattr__(self, "charge_edges", _frozen(ce))
        if not isinstance(self.label, str):
            raise InputError(f"label must be text; got {self.label!r}")

    @property
    def total(self) -> int:
        """Number of discharges counted [-]."""
        return int(self.counts.sum())

    @property
    def phase_centres_deg(self) -> np.ndarray:
        """Centres of the phase bins [deg]."""
        e = self.phase_edges_deg
        return 0.5 * (e[:-1] + e[1:])

    def charge_centres(self, centre: str = "arithmetic") -> np.ndarray:
        """Bin centres of the charge axis [C].

        Parameters
        ----------
        centre : str
            "arithmetic" mean of the edges, or signed "geometric" mean (bins off 0) [-].

        Returns
        -------
        numpy.ndarray
            One centre per charge bin [C].

        Raises
        ------
        InputError
            For geometric centres when a bin contains or touches 0 C.
        """
        check_choice("centre", centre, ("arithmetic", "geometric"))
        lo, hi = self.charge_edges[:-1], self.charge_edges[1:]
        if centre == "arithmetic":
            return 0.5 * (lo + hi)
        if np.any(lo * hi <= 0.0):
            raise InputError("geometric charge centres need bins that neither contain nor touch 0 C")
        return np.sign(lo) * np.sqrt(lo * hi)

    def to_events(self, centre: str = "arithmetic") -> Events:
        """One event per count at its bin's centre (phase centre, charge centre); times unknown.

        An approximation for the analysis functions that take events: phases and charges are known only to
        their bin. Events at a charge centre of 0 (a bin symmetric about 0) have zero charge and count as no
        pulse in :mod:`pdvoid.analysis`.

        Parameters
        ----------
        centre : str
            "arithmetic" or "geometric" charge centre of each bin [-]

        Returns
        -------
        Events
            ``total`` events, label of the matrix, ``extra["from matrix"] = True``.

        Raises
        ------
        InputError
            When the matrix counts more than :data:`pdvoid.io.lines.MAX_ROWS` discharges, or for geometric centres
            of a bin that touches 0 C.
        """
        total = self.total
        if total > L.MAX_ROWS:
            raise InputError(
                f"the matrix counts {total} discharges, more than the event limit of {L.MAX_ROWS}"
            )
        qc = self.charge_centres(centre)
        pc = self.phase_centres_deg
        flat = self.counts.ravel()
        phase = np.repeat(np.repeat(pc, qc.size), flat)
        charge = np.repeat(np.tile(qc, pc.size), flat)
        return Events(
            phase_deg=phase,
            charge=charge,
            frequency=self.frequency,
            cycles=self.cycles,
            label=self.label or "events at the centres of a count matrix",
            extra={"from matrix": True},
        )


#: the largest count a matrix may hold, in one bin and in total [-]: 2**53, exact as a float and far from the
#: int64 wrap at 2**63 (a count read as text passes through a float)
MAX_COUNT = 2**53


def _checked_counts(counts: np.ndarray) -> np.ndarray:
    """Counts as int64 after checking them: whole numbers >= 0, real (no complex, bool or text), each and their
    total at most :data:`MAX_COUNT` (so that no sum wraps).

    Parameters
    ----------
    counts : numpy.ndarray
        The counts, integer or float [-].

    Returns
    -------
    numpy.ndarray
        The counts as int64 [-].

    Raises
    ------
    InputError
        For anything else.
    """
    c = np.asarray(counts)
    if c.dtype.kind not in "iuf":
        raise InputError(f"counts must be whole numbers >= 0; got an array of {c.dtype}")
    if c.size == 0:
        return c.astype(np.int64)
    if c.dtype.kind == "f" and (not np.all(np.isfinite(c)) or np.any(c != np.floor(c))):
        raise InputError("counts must be whole numbers >= 0")
    if c.min() < 0:
        raise InputError("counts must be whole numbers >= 0")
    if c.max() > MAX_COUNT or float(c.sum(dtype=np.float64)) > MAX_COUNT:
        raise InputError(f"counts must be at most 2**53 = {MAX_COUNT} in each bin and in total; got "
                         f"{float(c.max()):.6g} in one bin, {float(c.sum(dtype=np.float64)):.6g} in total")
    return c.astype(np.int64)


def matrix_from_events(
    events: Events | Result, phase_edges_deg: ArrayLike, charge_edges: ArrayLike
) -> PatternMatrix:
    """Count events into a :class:`PatternMatrix` (bins [a, b), the last one [a, b]).

    Parameters
    ----------
    events : Events or Result
        discharge events or a result holding them [-]
    phase_edges_deg : array_like
        phase edges inside [0, 360] [deg]
    charge_edges : array_like
        signed charge edges [C]

    Returns
    -------
    PatternMatrix
        The counts, the edges, and the events' cycles and frequency.

    Raises
    ------
    InputError
        if any event lies outside the edges (nothing is dropped).
    """
    ev = as_events(events)
    pe = check_array("phase_edges_deg", phase_edges_deg, min_size=2)
    ce = check_array("charge_edges", charge_edges, min_size=2)
    probe = PatternMatrix(
        np.zeros((pe.size - 1, ce.size - 1)), pe, ce, ev.cycles, ev.frequency
    )  # checks edges
    counts, _, _ = np.histogram2d(ev.phase_deg, ev.charge, bins=[probe.phase_edges_deg, probe.charge_edges])
    missed = ev.count - int(counts.sum())
    if missed:
        raise InputError(
            f"{missed} events lie outside the given edges; widen phase_edges_deg or charge_edges"
        )
    return PatternMatrix(np.rint(counts), pe, ce, ev.cycles, ev.frequency, label=ev.label)


def read_pattern_matrix(
    path: str | os.PathLike,
    *,
    cycles: float | None = None,
    frequency: float | str | None = None,
    delimiter: str | None = None,
    decimal: str | None = None,
) -> PatternMatrix:
    """Read a phase-resolved count matrix with its bin edges (layout: :mod:`pdvoid.io.matrix`).

    Parameters
    ----------
    path : str or os.PathLike
        the file [-]
    cycles : float or None
        number of AC cycles observed [-], unless the file has ``# cycles = ...``
    frequency : float or str or None
        supply frequency [Hz], unless the file has ``# frequency = ...``
    delimiter : str or None
        ",", ";" or "\\t"; None to detect [-]
    decimal : str or None
        "." or ","; None to detect (a decimal comma only with ";") [-]

    Returns
    -------
    PatternMatrix
        :class:`PatternMatrix` with ``extra["summary"]`` and ``extra["metadata"]``.
    """
    p = L.checked_path(path)
    check_layout_options(delimiter, decimal)
    opt_cycles = quantity_option("cycles", cycles, "dimensionless")
    opt_frequency = quantity_option("frequency", frequency, "frequency")
    keys = CommentKeys(p)
    edges: dict[str, tuple[np.ndarray, str | None, int]] = {}
    parser: L.RowParser | None = None
    counts_line = None
    nlines = comments = 0
    for lineno, text in L.iter_lines(p):
        nlines = lineno
        s = text.strip()
        if not s:
            continue
        if s.startswith("#"):
            comments += 1
            kv = L.parse_comment_key(s)
            if kv is not None:
                keys.add(kv[0], kv[1], lineno)
            continue
        if delimiter is None:
            delimiter = L.sniff_delimiter(s)
        if decimal is None and delimiter == ";" and ("," in s or "." in s):
            decimal = "," if "," in s else "."
            if parser is not None:
                parser.decimal = decimal
        if parser is not None:
            parser.add(lineno, s)
            continue
        fields = L.split_fields(s, delimiter)
        if fields[0].lower() == "counts":
            if any(fields[1:]):
                raise L.line_error(p, lineno, "the 'counts' line holds nothing else")
            missing = [k for k in ("phase", "charge") if k not in edges]
            if missing:
                raise L.line_error(p, lineno, f"'counts' comes before the {' and '.join(missing)} edges line")
            counts_line = lineno
            parser = L.RowParser(p, edges["charge"][0].size - 1, delimiter, decimal or ".")
            continue
        m = _EDGES.match(fields[0])
        if not m:
            raise L.line_error(
                p,
                lineno,
                f"expected 'phase edges [deg]', 'charge edges [pC]' or 'counts'; got {fields[0][:40]!r}",
            )
        kind = m.group(1).lower()
        if kind in edges:
            raise L.line_error(p, lineno, f"a second {kind} edges line (the first is line {edges[kind][2]})")
        try:
            col = checked_column(kind, m.group(2) or "", "unit")
        except InputError as exc:
            raise L.line_error(p, lineno, str(exc)) from None
        if len(fields) < 3:
            raise L.line_error(p, lineno, f"{kind} edges must be at least 2 values")
        row = L.RowParser(p, len(fields) - 1, delimiter, decimal or ".", field_offset=1)
        row.add(lineno, delimiter.join(fields[1:]))
        values = row.result()[0][0] * col.factor
        if values.size < 2 or np.any(np.diff(values) <= 0.0):
            raise L.line_error(p, lineno, f"{kind} edges must be at least 2 strictly increasing values")
        if kind == "phase":
            values = np.where(np.isclose(values, 360.0, rtol=1e-12, atol=0.0), 360.0, values)  # rad rounding
            if values[0] < 0.0 or values[-1] > 360.0:
                raise L.line_error(p, lineno, "phase edges must lie inside [0, 360] deg")
        edges[kind] = (values, col.unit, lineno)
    if parser is None:
        raise L.line_error(p, None, "no 'counts' line: the file is not a count matrix (see pdvoid.io.matrix)")
    counts, linenos = parser.result()
    n_phase = edges["phase"][0].size - 1
    if counts.shape[0] != n_phase:
        where = int(linenos[n_phase]) if counts.shape[0] > n_phase else None
        raise L.line_error(p, where, f"{counts.shape[0]} count rows for {n_phase} phase bins")
    bad = (counts < 0) | (counts != np.floor(counts)) | (counts > MAX_COUNT)
    if bad.any():
        bad_row = int(np.argwhere(bad)[0][0])
        raise L.line_error(p, int(linenos[bad_row]), "counts must be whole numbers from 0 to 2**53")
    f, f_src = keys.quantity("frequency", opt_frequency)
    c, c_src = keys.quantity("cycles", opt_cycles)
    if f is None:
        raise L.line_error(p, None, "frequency unknown: give frequency= or a comment line '# frequency = ...'")
    if c is None:
        raise L.line_error(p, None, "cycles unknown: give cycles= or a comment line '# cycles = ...'")
    summary = {
        "file": str(p),
        "lines": nlines,
        "comment lines": comments,
        "counts line": counts_line,
        "phase bins": n_phase,
        "charge bins": edges["charge"][0].size - 1,
        "phase edges unit": edges["phase"][1],
        "charge edges unit": edges["charge"][1],
        "discharges counted": int(counts.sum()),
        "frequency [Hz]": f,
        "frequency from": f_src,
        "cycles": c,
        "cycles from": c_src,
    }
    return PatternMatrix(
        counts,
        edges["phase"][0],
        edges["charge"][0],
        c,
        f,
        label=keys.text("label") or f"read from {p.name}",
        extra={"summary": summary, "metadata": keys.metadata},
    )


def write_pattern_matrix(
    matrix: PatternMatrix,
    path: str | os.PathLike,
    *,
    charge_unit: str = "C",
    phase_unit: str = "deg",
    metadata: Mapping[str, object] | None = None,
    comments: Sequence[str] = (),
    delimiter: str = ",",
) -> Path:
    """Write a :class:`PatternMatrix` in the layout :func:`read_pattern_matrix` reads (17 significant digits).

    Parameters
    ----------
    matrix : PatternMatrix
        the matrix [-]
    path : str or os.PathLike
        the file to write [-]
    charge_unit : str
        unit of the charge edges: C, nC, pC, fC [-]
    phase_unit : str
        unit of the phase edges: deg or rad [-]
    metadata : Mapping[str, object] or None
        extra ``# key = value`` lines [-]
    comments : Sequence[str]
        free comment lines written first [-]
    delimiter : str
        ",", ";" or "\\t" [-]

    Returns
    -------
    Path
        The path written.
    """
    if not isinstance(matrix, PatternMatrix):
        raise InputError(f"matrix must be a PatternMatrix; got {type(matrix).__name__}")
    check_choice("delimiter", delimiter, (",", ";", "\t"))
    qc = checked_column("charge", charge_unit, "charge_unit")
    pc = checked_column("phase", phase_unit, "phase_unit")
    head = [f"# {c}" for c in comments]
    head += [f"# frequency = {matrix.frequency!r} Hz", f"# cycles = {matrix.cycles!r}"]
    if matrix.label:
        head.append(f"# label = {matrix.label}")
    for k, v in (metadata or {}).items():
        if L.parse_comment_key(f"# {k} = {v}") != (str(k).strip().lower(), str(v)):
            raise InputError(f"metadata key {k!r} or value {v!r} cannot be written as a '# key = value' line")
        head.append(f"# {k} = {v}")
    if any("\n" in h or "\r" in h for h in head):
        raise InputError("comment lines may not contain line breaks")

    def row(label: str, values: np.ndarray) -> str:
        return delimiter.join([label] + [f"{x:.17g}" for x in values])

    p = Path(path)
    with atomic_write(p, "w", encoding="utf-8", newline="\n") as fh:
        fh.write("\n".join(head) + "\n")
        fh.write(row(f"phase edges [{pc.unit}]", matrix.phase_edges_deg / pc.factor) + "\n")
        fh.write(row(f"charge edges [{qc.unit}]", matrix.charge_edges / qc.factor) + "\n")
        fh.write("counts\n")
        np.savetxt(fh, matrix.counts, delimiter=delimiter, fmt="%d")
    return p
