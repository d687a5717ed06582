"""Writing event lists as delimited text that :func:`pdvoid.io.read_events` reads back without options."""

from __future__ import annotations

import os
from collections.abc import Mapping, Sequence
from pathlib import Path

import numpy as np

from pdvoid.core.errors import InputError, check_choice
from pdvoid.core.files import atomic_write
from pdvoid.io import lines as L
from pdvoid.io.columns import SI_UNITS, checked_column, column_label
from pdvoid.simulation.events import Events

__all__ = ["write_events"]

_ORDER = ("time", "cycle", "phase", "charge", "voltage", "field_before", "field_after")
_ATTR = {"phase": "phase_deg"}


def write_events(
    events: Events,
    path: str | os.PathLike,
    *,
    columns: Sequence[str] | None = None,
    units: Mapping[str, str] | None = None,
    formats: Mapping[str, str] | None = None,
    metadata: Mapping[str, object] | None = None,
    comments: Sequence[str] = (),
    delimiter: str = ",",
) -> Path:
    """Write events as a delimited file that :func:`read_events` reads back without options.

    The file starts with the ``comments`` (each line prefixed by ``# ``), then ``# frequency``, ``# cycles``,
    ``# label`` and one ``# key = value`` line per ``metadata`` entry, then the header and the rows. Numbers
    are written with 17 significant digits unless ``formats`` says otherwise, so SI units round-trip exactly;
    other units round-trip to within rounding of the unit factor.

    Parameters
    ----------
    events : Events
        the events [-]
    path : str or os.PathLike
        the file to write [-]
    columns : Sequence[str] or None
        names to write, from time, cycle, phase, charge, voltage, field_before, field_after; default:
        every one whose values are all finite [-]
    units : Mapping[str, str] or None
        {name: unit} for the header, default SI (phase in deg) [-]
    formats : Mapping[str, str] or None
        {name: printf format}, e.g. ``{"charge": "%.2f"}`` [-]
    metadata : Mapping[str, object] or None
        extra ``# key = value`` lines (keys: letters, digits, _ . -) [-]
    comments : Sequence[str]
        free comment lines written first [-]
    delimiter : str
        "," or ";" or "\\t" [-]

    Returns
    -------
    Path
        the path written.
    """
    if not isinstance(events, Events):
        raise InputError(f"events must be pdvoid Events; got {type(events).__name__}")
    check_choice("delimiter", delimiter, (",", ";", "\t"))
    names = (
        list(columns)
        if columns is not None
        else [n for n in _ORDER if np.all(np.isfinite(getattr(events, _ATTR.get(n, n))))]
    )
    units = dict(units or {})
    formats = dict(formats or {})
    cols = []
    if len(set(names)) != len(names):
        raise InputError(f"columns may not repeat a name; got {names}")
    for n in names:
        check_choice("columns entry", n, _ORDER)
        arr = np.asarray(getattr(events, _ATTR.get(n, n)), dtype=float)
        if not np.all(np.isfinite(arr)):
            raise InputError(f"column {n!r} holds non-finite values; leave it out")
        col = checked_column(n, units.get(n, SI_UNITS[n]), f"units[{n!r}]")
        cols.append((n, arr / col.factor, formats.get(n, "%.17g"), col.unit))
    for line in comments:
        if "\n" in str(line) or "\r" in str(line):
            raise InputError("comment lines may not contain line breaks")
    p = Path(path)
    head = [f"# {c}" for c in comments]
    head += [f"# frequency = {events.frequency!r} Hz", f"# cycles = {events.cycles!r}"]
    if events.label:
        if "\n" in events.label or "\r" in events.label:
            raise InputError("the events' label may not contain line breaks")
        head.append(f"# label = {events.label}")
    for k, v in (metadata or {}).items():
        if L.parse_comment_key(f"# {k} = {v}") != (str(k).strip().lower(), str(v)):
            raise InputError(f"metadata key {k!r} or value {v!r} cannot be written as a '# key = value' line")
        head.append(f"# {k} = {v}")
    header = delimiter.join(column_label(n, u) for n, _, _, u in cols)
    with atomic_write(p, "w", encoding="utf-8", newline="\n") as fh:
        fh.write("\n".join(head) + "\n" + header + "\n")
        if events.count and cols:
            np.savetxt(
                fh,
                np.column_stack([a for _, a, _, _ in cols]),
                delimiter=delimiter,
                fmt=[fm for _, _, fm, _ in cols],
            )
    return p
