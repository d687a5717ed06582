"""Event lists in delimited text: :func:`read_events` and :func:`describe_read` (writer: event_writer).

File layout read by :func:`read_events`:

- UTF-8 text; lines end with ``\\n`` or ``\\r\\n``.
- Comment lines start with ``#`` (after optional spaces) and may appear anywhere; blank lines are skipped.
  Both are counted in the summary. ``# key = value`` comment lines can carry the frequency, number of
  cycles, duration, detection threshold and label (see :mod:`pdvoid.io.options`).
- The first other line is the header: column names with units, e.g. ``phase [deg],charge [pC]`` or
  ``time [s],charge [nC],cycle [-],voltage [kV]`` (names and units: :mod:`pdvoid.io.columns`). A file without
  header starts with data; then ``columns=`` (and ``units=``) must name the columns.
- Fields are separated by commas, semicolons or tabs. Without ``delimiter=`` the header (or first data) line
  decides: ``;`` if present, else tab, else ``,``. The decimal mark is ``.``; a decimal comma is accepted with
  the semicolon delimiter (detected from the first data line holding a ``.`` or ``,``) or when declared with
  ``decimal=","`` (not with the comma delimiter). Thousands separators are not accepted.
- Every other line is a data row: one number per column (plain decimal or exponent notation).

How time, phase and cycles are found:

- With a time column, the frequency is required (``frequency=`` or ``# frequency = 50 Hz``). The phase is
  360 deg times the fractional part of time x frequency and the cycle index its whole part. If the file also
  has a phase (or cycle) column, it is kept and must agree with the time within :data:`PHASE_TOLERANCE_DEG`
  (or :data:`CYCLE_TOLERANCE` cycles). Times must be >= 0 and must not decrease (equal times are allowed). The
  observation is ``cycles=`` or ``duration=`` (option or comment); without either it is the number of whole
  cycles from cycle 0 to the cycle of the last event, floor(t_last f) + 1 (reported in the summary).
- Without a time column, the phase column is used as it is (it must lie in [0, 360) deg) and the reference
  time is required: ``cycles=`` or ``duration=`` (option or comment), and the frequency too. A cycle column,
  if present, must hold whole numbers in [0, cycles); the times are then (cycle + phase / 360) / frequency,
  otherwise they are unknown (NaN).

Nothing is dropped silently: a malformed line raises :class:`~pdvoid.core.errors.InputError` naming the file, the
line and the reason. Limits: :data:`pdvoid.io.lines.MAX_FILE_BYTES`, ``MAX_LINE_CHARS`` and ``MAX_ROWS``
(events).
"""

from __future__ import annotations

import os
from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from pdvoid.core.errors import InputError
from pdvoid.core.files import check_run_file
from pdvoid.io import lines as L
from pdvoid.io.columns import Column, column_label, resolve_columns
from pdvoid.io.options import CommentKeys, check_layout_options, quantity_option
from pdvoid.simulation.events import Events

if TYPE_CHECKING:
    from pdvoid.io.matrix import PatternMatrix

__all__ = ["read_events", "describe_read", "PHASE_TOLERANCE_DEG", "CYCLE_TOLERANCE"]

PHASE_TOLERANCE_DEG = 1e-3  #: largest allowed difference between a phase column and the phase from time [deg]
CYCLE_TOLERANCE = 1e-5  #: largest allowed |cycle + phase/360 - time x frequency| [cycles]
_FULL_TURN_BELOW_360 = np.nextafter(360.0, 0.0)


def _is_number(field: str, decimal_comma: bool) -> bool:
    try:
        float(field.replace(",", ".") if decimal_comma else field)
    except ValueError:
        return False
    return True


class _Scan:
    """One pass over a delimited file: comments, blank lines, the header and the data rows."""

    def __init__(self, path: Path, delimiter: str | None, decimal: str | None) -> None:
        self.path = path
        self.delimiter = delimiter
        self.decimal = decimal
        self.keys = CommentKeys(path)
        self.lines = self.comments = self.blank = 0
        self.first: tuple[int, str, list[str]] | None = None  # first content line: (lineno, text, fields)

    def lines_of(self):
        """Yield (lineno, text) of content lines, counting and collecting the rest."""
        for lineno, text in L.iter_lines(self.path):
            self.lines = lineno
            s = text.strip()
            if not s:
                self.blank += 1
                continue
            if s.startswith("#"):
                self.comments += 1
                kv = L.parse_comment_key(s)
                if kv is not None:
                    self.keys.add(kv[0], kv[1], lineno)
                continue
            yield lineno, s

    def decide_decimal(self, text: str) -> str | None:
        if self.decimal is None and self.delimiter == ";" and ("," in text or "." in text):
            self.decimal = "," if "," in text else "."
        return self.decimal


def _table(
    scan: _Scan, columns: str | Sequence[str] | None, units: Mapping[str, str] | None
) -> tuple[list[Column], np.ndarray, np.ndarray, int | None]:
    """Read the whole file: (columns, values (rows, ncols) in file units, line numbers, header line)."""
    parser: L.RowParser | None = None
    cols: list[Column] | None = None
    header_line: int | None = None
    for lineno, s in scan.lines_of():
        if parser is None:
            if scan.delimiter is None:
                scan.delimiter = L.sniff_delimiter(s)
            fields = L.split_fields(s, scan.delimiter)
            comma = scan.decimal == "," or (scan.decimal is None and scan.delimiter == ";")
            if all(_is_number(f, comma) for f in fields):
                if columns is None:
                    raise L.line_error(
                        scan.path,
                        lineno,
                        "data without a header line; the first line must name "
                        "the columns (e.g. 'phase [deg],charge [pC]'), or give "
                        "columns=",
                    )
                cols = resolve_columns(None, f"{scan.path} (columns=)", columns, units)
            else:
                cols = resolve_columns(fields, f"{scan.path}, line {lineno}", columns, units)
                header_line = lineno
            parser = L.RowParser(scan.path, len(cols), scan.delimiter, scan.decide_decimal("") or ".")
            if header_line is not None:
                continue
        if scan.decimal is None:
            parser.decimal = scan.decide_decimal(s) or "."
        parser.add(lineno, s)
    if parser is None or cols is None:  # cols is set together with parser
        if columns is None:
            raise L.line_error(
                scan.path, None, "no header line and no data (the file holds only comments or blank lines)"
            )
        cols = resolve_columns(None, f"{scan.path} (columns=)", columns, units)
        return cols, np.empty((0, len(cols))), np.empty(0, dtype=np.int64), None
    values, linenos = parser.result()
    return cols, values, linenos, header_line


def _first_line(linenos: np.ndarray, mask: np.ndarray) -> int:
    return int(linenos[int(np.argmax(mask))])


def _whole_cycles(scan: _Scan, cyc: np.ndarray, linenos: np.ndarray) -> None:
    bad = (cyc < 0) | (cyc != np.floor(cyc))
    if bad.any():
        raise L.line_error(scan.path, _first_line(linenos, bad), "cycle must be a whole number >= 0")


def read_events(
    path: str | os.PathLike,
    *,
    cycles: float | None = None,
    duration: float | str | None = None,
    frequency: float | str | None = None,
    columns: Sequence[str] | str | None = None,
    units: Mapping[str, str] | None = None,
    delimiter: str | None = None,
    decimal: str | None = None,
) -> Events:
    """Read a discharge event list (time or phase, apparent charge; optional cycle, voltage) from text.

    The file layout, the rules for time, phase and the observation, and the limits are described in
    :mod:`pdvoid.io.delimited`. A summary of what was read is stored in ``events.extra["summary"]`` (see
    :func:`describe_read`); ``# key = value`` comments in ``events.extra["metadata"]``; a declared detection
    threshold in ``events.extra["threshold"]`` [C].

    Parameters
    ----------
    path : str or os.PathLike
        the file [-]
    cycles : float or None
        number of AC cycles observed [-]; needed without a time column (or ``duration``)
    duration : float or str or None
        observation time [s] (number or text like ``"60 s"``); alternative to ``cycles``
    frequency : float or str or None
        supply frequency [Hz] (number or text like ``"50 Hz"``); needed unless the file has
        ``# frequency = ...``
    columns : Sequence[str] or str or None
        column names with units for files without header (e.g. ``["phase [deg]", "charge [pC]"]`` or
        ``"phase [deg],charge [pC]"``); with a header the names must agree [-]
    units : Mapping[str, str] or None
        {column: unit} for columns whose unit is not given otherwise, e.g. ``{"charge": "nC"}`` [-]
    delimiter : str or None
        ",", ";" or "\\t"; None to detect [-]
    decimal : str or None
        "." or ","; None to detect (a decimal comma only with ";") [-]

    Returns
    -------
    Events
        :class:`pdvoid.simulation.events.Events` in SI units.

    Raises
    ------
    InputError
        naming the file (and the line) for every malformed input; see the module docs.
    """
    p = L.checked_path(path)
    check_run_file(p)
    check_layout_options(delimiter, decimal)
    opt_cycles = quantity_option("cycles", cycles, "dimensionless")
    opt_duration = quantity_option("duration", duration, "time")
    opt_frequency = quantity_option("frequency", frequency, "frequency")
    if opt_cycles is not None and opt_duration is not None:
        raise InputError("give cycles= or duration=, not both")
    scan = _Scan(p, delimiter, decimal)
    cols, values, linenos, header_line = _table(scan, columns, units)
    data = {c.name: values[:, i] * c.factor for i, c in enumerate(cols) if c.name != "skip"}
    raw = {c.name: values[:, i] for i, c in enumerate(cols) if c.name != "skip"}
    unit = {c.name: c.unit for c in cols}
    n = values.shape[0]

    f, f_src = scan.keys.quantity("frequency", opt_frequency)
    c_opt, c_src = scan.keys.quantity("cycles", opt_cycles)
    d_opt, d_src = scan.keys.quantity("duration", opt_duration)
    threshold, _ = scan.keys.quantity("threshold", None)
    if c_opt is not None and d_opt is not None:
        raise L.line_error(p, None, f"both cycles ({c_src}) and duration ({d_src}) are given; give one")
    if f is None:
        what = "has a time column" if "time" in data else "has no time column (phase and cycles need it too)"
        raise L.line_error(
            p,
            None,
            f"the supply frequency is unknown: the file {what}; give frequency= [Hz] or "
            "add a comment line '# frequency = 50 Hz'",
        )
    n_cycles, cyc_src = (c_opt, c_src) if c_opt is not None else (None, None)
    if d_opt is not None:
        n_cycles, cyc_src = d_opt * f, f"duration ({d_src}) x frequency"

    if "phase" in data:
        ph = data["phase"]
        if unit["phase"] == "rad":  # a value just below 2 pi rad may round up to 360 deg
            ph = np.where((ph >= 360.0) & (raw["phase"] < 2.0 * np.pi), _FULL_TURN_BELOW_360, ph)
        bad = (ph < 0.0) | (ph >= 360.0)
        if bad.any():
            raise L.line_error(p, _first_line(linenos, bad), "phase outside [0, 360) deg")
        data["phase"] = ph
    if "cycle" in data:
        _whole_cycles(scan, data["cycle"], linenos)

    if "time" in data:
        t = data["time"]
        if (t < 0.0).any():
            raise L.line_error(p, _first_line(linenos, t < 0.0), "negative time")
        dec = np.diff(t) < 0.0
        if dec.any():
            raise L.line_error(
                p, int(linenos[int(np.argmax(dec)) + 1]), "time decreases (times must not decrease)"
            )
        tf = t * f
        cyc_t = np.floor(tf)
        ph_t = np.minimum((tf - cyc_t) * 360.0, _FULL_TURN_BELOW_360)
        if "phase" in data:
            d = np.abs((data["phase"] - ph_t + 180.0) % 360.0 - 180.0)
            bad = d > PHASE_TOLERANCE_DEG
            if bad.any():
                i = int(np.argmax(bad))
                raise L.line_error(
                    p,
                    int(linenos[i]),
                    f"phase {float(data['phase'][i])!r} deg disagrees with the phase "
                    f"from time and frequency ({float(ph_t[i])!r} deg)",
                )
        else:
            data["phase"] = ph_t
        if "cycle" in data:
            bad = np.abs(data["cycle"] + data["phase"] / 360.0 - tf) > CYCLE_TOLERANCE
            if bad.any():
                raise L.line_error(p, _first_line(linenos, bad), "cycle disagrees with time x frequency")
        else:
            data["cycle"] = cyc_t
        if n_cycles is None:
            if n == 0:
                raise L.line_error(p, None, "no events: give cycles= or duration= (the observation time)")
            n_cycles, cyc_src = (
                float(cyc_t[-1] + 1.0),
                "whole cycles up to the last event, floor(t_last f) + 1",
            )
        beyond = tf >= n_cycles
        if beyond.any():
            raise L.line_error(
                p, _first_line(linenos, beyond), f"time lies beyond the observation of {n_cycles!r} cycles"
            )
    else:
        if n_cycles is None:
            raise L.line_error(
                p,
                None,
                "the file has no time column, so the observation time is unknown: give "
                "cycles= or duration= (or a comment line '# cycles = ...')",
            )
        if "cycle" in data:
            beyond = data["cycle"] >= n_cycles
            if beyond.any():
                raise L.line_error(
                    p,
                    _first_line(linenos, beyond),
                    f"cycle index beyond the observation of {n_cycles!r} cycles",
                )
            data["time"] = (data["cycle"] + data["phase"] / 360.0) / f

    label = scan.keys.text("label") or f"read from {p.name}"
    summary = {
        "file": str(p),
        "lines": scan.lines,
        "comment lines": scan.comments,
        "blank lines": scan.blank,
        "header line": header_line,
        "data lines": n,
        "events": n,
        "columns": [column_label(c.name, c.unit) if c.name != "skip" else "skip" for c in cols],
        "delimiter": L.delimiter_name(scan.delimiter or ","),
        "decimal mark": scan.decimal or ".",
        "frequency [Hz]": f,
        "frequency from": f_src,
        "cycles": n_cycles,
        "cycles from": cyc_src,
        "time span [s]": (float(np.min(data["time"])), float(np.max(data["time"])))
        if "time" in data and n
        else None,
        "phase range [deg]": (float(data["phase"].min()), float(data["phase"].max())) if n else None,
        "charge range [C]": (float(data["charge"].min()), float(data["charge"].max())) if n else None,
        "zero-charge events": int(np.count_nonzero(data["charge"] == 0.0)),
        "threshold [C]": threshold,
    }
    extra: dict[str, object] = {"summary": summary, "metadata": scan.keys.metadata}
    if threshold is not None:
        extra["threshold"] = threshold
    return Events(
        phase_deg=data["phase"],
        charge=data["charge"],
        frequency=f,
        cycles=n_cycles,
        time=data.get("time"),
        cycle=data.get("cycle"),
        voltage=data.get("voltage"),
        field_before=data.get("field_before"),
        field_after=data.get("field_after"),
        label=label,
        extra=extra,
    )


def describe_read(data: Events | PatternMatrix) -> str:
    """A few lines of text saying what a pdvoid reader read (events or a count matrix).

    Parameters
    ----------
    data : Events or PatternMatrix
        what :func:`read_events`, :func:`pdvoid.io.read_pattern_matrix` or
        :func:`pdvoid.io.read_exchange` returned [-]

    Returns
    -------
    str
        One ``key: value`` line per entry of the reader's summary.

    Raises
    ------
    InputError
        When ``data`` holds no reader summary.
    """
    extra = getattr(data, "extra", None)
    summary = extra.get("summary") if isinstance(extra, dict) else None
    if not isinstance(summary, dict):
        raise InputError("describe_read needs events returned by a pdvoid reader (no summary found)")
    out = []
    for k, v in summary.items():
        if isinstance(v, float):
            v = f"{v:.6g}"
        elif isinstance(v, tuple):
            v = " ... ".join(f"{x:.6g}" for x in v)
        elif isinstance(v, list):
            v = ", ".join(map(str, v))
        elif v is None:
            v = "-"
        out.append(f"{k}: {v}")
    return "\n".join(out)
