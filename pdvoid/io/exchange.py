"""pdvoid's own self-describing format for exchanging discharge patterns: "pdvoid-pattern", version 1.

A UTF-8 text file in three parts (designed for pdvoid; not modelled on any instrument's export)::

    pdvoid-pattern 1                          <- line 1: format name, one space, version (a whole number)
    {                                         <- header: one JSON object (RFC 8259; no NaN), any number of
      "kind": "events",                          lines, ended by a line holding only ---
      "label": "synthetic demo",
      "frequency [Hz]": 50.0,
      "cycles": 1000.0,
      "threshold [C]": 1e-11,
      "columns": ["time [s]", "phase [deg]", "cycle [-]", "charge [C]", "voltage [V]"],
      "rows": 3358,
      "provenance": {"source": "...", ...},
      "written by": "pdvoid 0.1.0"
    }
    ---
    time [s],phase [deg],cycle [-],charge [C],voltage [V]     <- events: the columns again, then the rows
    0.0011883,21.39,0,1.0258e-10,12345.6
    ...

Header keys:

- ``kind`` (required): ``"events"`` or ``"matrix"``.
- ``frequency [Hz]`` (required, > 0), ``cycles`` (required, > 0): supply frequency and AC cycles observed.
- ``label`` (text), ``threshold [C]`` (the detection threshold, >= 0, or null), ``provenance`` (a JSON object:
  where the data came from, free form), ``written by`` (text): optional.
- events: ``columns`` (required): names with units as in :mod:`pdvoid.io.columns` (the writer uses SI:
  s, deg, -, C, V, V/m); phase and charge are required, time, cycle, voltage, field_before, field_after
  optional. ``rows`` (required): the number of data rows.
- matrix: ``phase edges [deg]`` (n_phase + 1 values), ``charge edges [C]`` (n_charge + 1 values) and ``shape``
  ([n_phase, n_charge]); the data part is n_phase rows of n_charge whole-number counts, without a column line.

Data part: comma-separated, ``.`` decimal mark, one row per line, no comments or blank lines. The writer
prints 17 significant digits, so numbers round-trip exactly. ``nan`` is allowed in the optional event
columns (value unknown) and nowhere else. Limits as for all readers (:mod:`pdvoid.io.lines`); the header may
hold at most :data:`MAX_HEADER_CHARS` characters.
"""

from __future__ import annotations

import json
import math
import os
from collections.abc import Mapping
from pathlib import Path
from typing import Literal, overload

import numpy as np

from pdvoid.core.errors import InputError
from pdvoid.core.files import atomic_write
from pdvoid.io import lines as L
from pdvoid.io.columns import SI_UNITS, column_label, parse_column
from pdvoid.io.matrix import MAX_COUNT, PatternMatrix
from pdvoid.simulation.events import Events, as_events
from pdvoid.simulation.results import Result

__all__ = ["EXCHANGE_FORMAT", "EXCHANGE_VERSION", "MAX_HEADER_CHARS", "write_exchange", "read_exchange"]

EXCHANGE_FORMAT = "pdvoid-pattern"  #: format name on line 1
EXCHANGE_VERSION = 1  #: the version this pdvoid writes and reads
MAX_HEADER_CHARS = 1_000_000  #: longest JSON header [characters]

_OPTIONAL = ("time", "cycle", "voltage", "field_before", "field_after")
_ATTR = {"phase": "phase_deg"}


def _provenance_of(obj: Events | Result | PatternMatrix) -> dict:
    """Provenance of a simulation Result: source, seed, cycles, version and scenario; {} for other objects."""
    if not isinstance(obj, Result):
        return {}
    from pdvoid.inputs.scenario_files import scenario_to_dict

    return {
        "source": "pdvoid simulation",
        "seed": obj.seed,
        "cycles": obj.cycles,
        "pdvoid version": obj.version,
        "scenario": scenario_to_dict(obj.scenario),
    }


def _json(header: dict) -> str:
    try:
        return json.dumps(header, indent=1, allow_nan=False, ensure_ascii=False)
    except (TypeError, ValueError) as exc:
        raise InputError(
            f"provenance must hold only JSON values (text, finite numbers, lists, objects): {exc}"
        ) from None


def write_exchange(
    data: Events | Result | PatternMatrix,
    path: str | os.PathLike,
    *,
    provenance: dict | None = None,
    threshold: float | None = None,
) -> Path:
    """Write events (or a Result) or a :class:`PatternMatrix` in the "pdvoid-pattern" format.

    Parameters
    ----------
    data : Events or Result or PatternMatrix
        :class:`pdvoid.simulation.events.Events`, a Result, or a :class:`PatternMatrix` [-]
    path : str or os.PathLike
        the file to write [-]
    provenance : dict or None
        JSON-able description of where the data came from; merged over the provenance a Result
        supplies (source, seed, cycles, version, scenario) [-]
    threshold : float or None
        detection threshold of the data [C], >= 0; default: ``extra["threshold"]`` if present [-]

    Returns
    -------
    Path
        the path written.
    """
    from pdvoid._version import __version__

    if provenance is not None and not isinstance(provenance, dict):
        raise InputError(f"provenance must be a dict; got {type(provenance).__name__}")
    prov = {**_provenance_of(data), **(provenance or {})}
    obj: Events | PatternMatrix
    if isinstance(data, PatternMatrix):
        obj = data
    else:
        obj = as_events(data)
        problem = _time_problem({"time": obj.time, "cycle": obj.cycle, "phase": obj.phase_deg}, obj.frequency,
                                obj.cycles)
        if problem is not None:
            raise InputError(f"event {problem[0]} cannot be written: {problem[1]} (the reader would refuse it)")
    if threshold is None:
        threshold = obj.extra.get("threshold") if isinstance(obj.extra, dict) else None
    if threshold is not None and (
        not isinstance(threshold, (int, float)) or not math.isfinite(threshold) or threshold < 0
    ):
        raise InputError(f"threshold must be a finite number >= 0 C; got {threshold!r}")
    table: np.ndarray | None
    header: dict = {
        "kind": "matrix" if isinstance(obj, PatternMatrix) else "events",
        "label": obj.label,
        "frequency [Hz]": obj.frequency,
        "cycles": obj.cycles,
        "threshold [C]": None if threshold is None else float(threshold),
    }
    if isinstance(obj, PatternMatrix):
        header.update(
            {
                "phase edges [deg]": obj.phase_edges_deg.tolist(),
                "charge edges [C]": obj.charge_edges.tolist(),
                "shape": list(obj.counts.shape),
            }
        )
        table, fmt, names = obj.counts, "%d", None
    else:
        names = ["phase", "charge"] + [n for n in _OPTIONAL if not np.all(np.isnan(getattr(obj, n)))]
        table = np.column_stack([getattr(obj, _ATTR.get(n, n)) for n in names]) if obj.count else None
        fmt = "%.17g"
        header.update({"columns": [column_label(n, SI_UNITS[n]) for n in names], "rows": obj.count})
    header.update({"provenance": prov, "written by": f"pdvoid {__version__}"})
    text = _json(header)
    if len(text) > MAX_HEADER_CHARS:
        raise InputError(f"the header would exceed {MAX_HEADER_CHARS} characters (provenance too large)")
    p = Path(path)
    with atomic_write(p, "w", encoding="utf-8", newline="\n") as fh:
        fh.write(f"{EXCHANGE_FORMAT} {EXCHANGE_VERSION}\n{text}\n---\n")
        if names is not None:
            fh.write(",".join(header["columns"]) + "\n")
        if table is not None and table.size:
            np.savetxt(fh, table, delimiter=",", fmt=fmt)
    return p


def _reject_constant(name: str) -> float:
    raise ValueError(f"{name} is not a JSON number")


@overload
def _number(header: dict, key: str, p: Path, *, required: Literal[True] = True, allow_zero: bool = False) -> float: ...


@overload
def _number(
    header: dict, key: str, p: Path, *, required: Literal[False], allow_zero: bool = False
) -> float | None: ...


def _number(
    header: dict, key: str, p: Path, *, required: bool = True, allow_zero: bool = False
) -> float | None:
    v = header.get(key)
    if v is None and not required:
        return None
    if (
        isinstance(v, bool)
        or not isinstance(v, (int, float))
        or not math.isfinite(v)
        or v < 0
        or (v == 0 and not allow_zero)
    ):
        need = ">= 0" if allow_zero else "> 0"
        raise L.line_error(p, None, f"header {key!r} must be a number {need}; got {v!r}")
    return float(v)


def _edges(header: dict, key: str, p: Path) -> np.ndarray:
    v = header.get(key)
    if not isinstance(v, list) or not all(isinstance(x, (int, float)) and not isinstance(x, bool) for x in v):
        raise L.line_error(p, None, f"header {key!r} must be a list of numbers")
    return np.asarray(v, dtype=float)


def _time_problem(data: Mapping[str, np.ndarray | None], f: float, cycles: float) -> tuple[int, str] | None:
    """The first event (index, reason) whose known time or cycle breaks the rules of :func:`pdvoid.read_events`
    (times >= 0, non-decreasing, inside the observation; phase and cycle agreeing with the time within its
    tolerances; cycles whole and inside the observation), or None. NaN marks an unknown value."""
    from pdvoid.io.delimited import CYCLE_TOLERANCE, PHASE_TOLERANCE_DEG

    t, cyc, ph = data.get("time"), data.get("cycle"), np.asarray(data["phase"])
    end = cycles / f
    if t is not None:
        if np.any(np.isinf(t)):
            return int(np.argmax(np.isinf(t))), "time must be finite (or nan: unknown)"
        known = np.flatnonzero(~np.isnan(t))
        tk = t[known]
        ph_t = (tk * f - np.floor(tk * f)) * 360.0
        off = np.abs(ph_t - ph[known])
        off = np.minimum(off, 360.0 - off)
        for bad, why in (((tk < 0.0), "time before the start of the observation (< 0 s)"),
                         ((tk > end * (1.0 + 1e-12)), f"time after the end of the observation ({end!r} s)"),
                         (np.r_[False, np.diff(tk) < 0.0], "time earlier than the event before"),
                         ((off > PHASE_TOLERANCE_DEG), f"phase does not match the time at {f!r} Hz")):
            if bad.any():
                return int(known[np.argmax(bad)]), why
    if cyc is not None:
        if np.any(np.isinf(cyc)):
            return int(np.argmax(np.isinf(cyc))), "cycle must be finite (or nan: unknown)"
        known = np.flatnonzero(~np.isnan(cyc))
        ck = cyc[known]
        bad = (ck != np.floor(ck)) | (ck < 0) | (ck >= max(cycles, 1.0))
        if bad.any():
            return int(known[np.argmax(bad)]), f"cycle must be a whole number from 0 to below {cycles:g}"
        if t is not None:
            both = np.flatnonzero(~np.isnan(t) & ~np.isnan(cyc))
            gap = np.abs(cyc[both] + ph[both] / 360.0 - t[both] * f)
            bad = gap > CYCLE_TOLERANCE
            if bad.any():
                return int(both[np.argmax(bad)]), "cycle does not match the time"
    return None


def read_exchange(path: str | os.PathLike) -> Events | PatternMatrix:
    """Read a "pdvoid-pattern" file (see module docs): :class:`Events` or :class:`PatternMatrix`.

    The header's ``provenance`` goes to ``extra["provenance"]``, its threshold to ``extra["threshold"]``,
    and a summary of what was read to ``extra["summary"]``.

    Parameters
    ----------
    path : str or os.PathLike
        The file [-].

    Returns
    -------
    Events or PatternMatrix
        Events for ``kind = "events"``, a count matrix for ``kind = "matrix"``.

    Raises
    ------
    InputError
        naming the file and the line for anything that does not follow the format.
    """
    p = L.checked_path(path)
    lines = L.iter_lines(p)
    first = next(lines, None)
    if first is None or not first[1].startswith(EXCHANGE_FORMAT + " "):
        raise L.line_error(
            p, 1, f"not a {EXCHANGE_FORMAT} file (line 1 must be '{EXCHANGE_FORMAT} {EXCHANGE_VERSION}')"
        )
    version = first[1][len(EXCHANGE_FORMAT) + 1 :].strip()
    if version != str(EXCHANGE_VERSION):
        raise L.line_error(p, 1, f"format version {version!r}; this pdvoid reads version {EXCHANGE_VERSION}")
    chunks: list[str] = []
    size = 0
    end = None
    for lineno, text in lines:
        if text.strip() == "---":
            end = lineno
            break
        size += len(text) + 1
        if size > MAX_HEADER_CHARS:
            raise L.line_error(p, lineno, f"header longer than {MAX_HEADER_CHARS} characters")
        chunks.append(text)
    if end is None:
        raise L.line_error(p, None, "no line '---' ends the header")
    try:
        header = json.loads("\n".join(chunks), parse_constant=_reject_constant)
    except (ValueError, RecursionError) as exc:
        raise L.line_error(p, 2, f"the header is not valid JSON ({exc})") from None
    if not isinstance(header, dict):
        raise L.line_error(p, 2, "the header must be a JSON object")
    kind = header.get("kind")
    if kind not in ("events", "matrix"):
        raise L.line_error(p, 2, f"header 'kind' must be 'events' or 'matrix'; got {kind!r}")
    f = _number(header, "frequency [Hz]", p)
    cycles = _number(header, "cycles", p)
    threshold = _number(header, "threshold [C]", p, required=False, allow_zero=True)
    label = header.get("label", "")
    prov = header.get("provenance", {})
    if not isinstance(label, str) or not isinstance(prov, dict):
        raise L.line_error(p, 2, "header 'label' must be text and 'provenance' an object")
    extra: dict[str, object] = {"provenance": prov, "metadata": {}}
    if threshold is not None:
        extra["threshold"] = threshold
    summary = {
        "file": str(p),
        "format": f"{EXCHANGE_FORMAT} {EXCHANGE_VERSION}",
        "kind": kind,
        "header lines": end,
        "frequency [Hz]": f,
        "cycles": cycles,
        "threshold [C]": threshold,
    }

    if kind == "matrix":
        pe, ce = _edges(header, "phase edges [deg]", p), _edges(header, "charge edges [C]", p)
        shape = header.get("shape")
        if shape != [pe.size - 1, ce.size - 1]:
            raise L.line_error(
                p,
                2,
                f"header 'shape' {shape!r} does not match the edges ({pe.size - 1} phase, "
                f"{ce.size - 1} charge bins)",
            )
        parser = L.RowParser(p, ce.size - 1, ",", ".")
        for lineno, text in lines:
            parser.add(lineno, text)
        counts, linenos = parser.result()
        if counts.shape[0] != pe.size - 1:
            raise L.line_error(p, None, f"{counts.shape[0]} count rows; the header says {pe.size - 1}")
        bad = (counts < 0) | (counts != np.floor(counts)) | (counts > MAX_COUNT)
        if bad.any():
            raise L.line_error(p, int(linenos[np.argwhere(bad)[0][0]]), "counts must be whole numbers from 0 to "
                               "2**53")
        summary.update(
            {"phase bins": pe.size - 1, "charge bins": ce.size - 1, "discharges counted": int(counts.sum())}
        )
        try:
            return PatternMatrix(counts, pe, ce, cycles, f, label=label, extra={**extra, "summary": summary})
        except InputError as exc:
            raise L.line_error(p, None, str(exc)) from None

    columns = header.get("columns")
    rows = header.get("rows")
    if not isinstance(columns, list) or isinstance(rows, bool) or not isinstance(rows, int) or rows < 0:
        raise L.line_error(p, 2, "an events header needs 'columns' (a list) and 'rows' (a whole number >= 0)")
    cols = [parse_column(c, f"{p}, header column {i}") for i, c in enumerate(columns, 1)]
    names = [c.name for c in cols]
    if len(set(names)) != len(names) or "skip" in names or "phase" not in names or "charge" not in names:
        raise L.line_error(p, 2, f"columns must name phase and charge once each (and no skip); got {columns}")
    for c in cols:
        if c.name != "cycle" and c.unit is None:
            raise L.line_error(p, 2, f"column {c.name!r} has no unit")
    col_line = next(lines, None)
    if col_line is None or [t.strip() for t in col_line[1].split(",")] != [str(c) for c in columns]:
        raise L.line_error(
            p, end + 1, f"the column line must repeat the header's columns: {','.join(columns)}"
        )
    nan_ok = tuple(i for i, n in enumerate(names) if n in _OPTIONAL)
    parser = L.RowParser(p, len(cols), ",", ".", nan_columns=nan_ok)
    for lineno, text in lines:
        parser.add(lineno, text)
    values, linenos = parser.result()
    if values.shape[0] != rows:
        raise L.line_error(p, None, f"{values.shape[0]} data rows; the header says {rows}")
    data = {c.name: values[:, i] * c.factor for i, c in enumerate(cols)}
    ph = data["phase"]
    bad = (ph < 0.0) | (ph >= 360.0)
    if bad.any():
        raise L.line_error(p, int(linenos[np.argmax(bad)]), "phase outside [0, 360) deg")
    problem = _time_problem(data, f, cycles)
    if problem is not None:
        raise L.line_error(p, int(linenos[problem[0]]), problem[1])
    summary.update({"columns": list(columns), "events": rows})
    try:
        return Events(
            phase_deg=ph,
            charge=data["charge"],
            frequency=f,
            cycles=cycles,
            time=data.get("time"),
            cycle=data.get("cycle"),
            voltage=data.get("voltage"),
            field_before=data.get("field_before"),
            field_after=data.get("field_after"),
            label=label,
            extra={**extra, "summary": summary},
        )
    except InputError as exc:
        raise L.line_error(p, None, str(exc)) from None
