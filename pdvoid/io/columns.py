"""Column names and units of event files: ``"name [unit]"`` header fields, options, and conversion to SI.

Recognised column names (case-insensitive; spaces and underscores are the same):

========================  ==============================  ===================================
name (synonyms)           meaning                          units accepted
========================  ==============================  ===================================
phase (phase angle)       phase from the positive-going    deg, rad
                          zero crossing of the voltage
charge (apparent charge)  apparent charge, signed          C, nC, pC, fC
time                      time from the start of the       s, ms, us (or µs), ns
                          observation
cycle (cycle index)       index of the AC cycle            - (or no unit, or 1)
voltage (applied voltage) instantaneous applied voltage    V, kV, MV
field_before, field_after void field before/after a PD     V/m, kV/mm, kV/cm, MV/m
skip                      a column to read and ignore      any
========================  ==============================  ===================================

A unit goes in square brackets (``charge [pC]``) or round brackets (``charge (pC)``).
"""

from __future__ import annotations

import re
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

from pdvoid.core.errors import InputError
from pdvoid.core.units import parse_quantity

__all__ = [
    "Column",
    "COLUMN_DIMENSIONS",
    "COLUMN_UNITS",
    "unit_factor",
    "checked_column",
    "parse_column",
    "resolve_columns",
    "column_label",
    "SI_UNITS",
]

#: column name -> the dimension its unit must have; any unit pint knows of that dimension is accepted
#: (:func:`pdvoid.core.units.parse_quantity`), e.g. "pC", "nC" or "uC" for a charge, "us" or "min" for a time
COLUMN_DIMENSIONS: dict[str, str] = {
    "phase": "angle",
    "charge": "charge",
    "time": "time",
    "voltage": "voltage",
    "field_before": "field",
    "field_after": "field",
}
#: column name -> the usual units, shown as examples in messages (any unit of the column's dimension is accepted)
COLUMN_UNITS: dict[str, tuple[str, ...]] = {
    "phase": ("deg", "rad"),
    "charge": ("C", "nC", "pC", "fC"),
    "time": ("s", "ms", "us", "µs", "ns"),
    "cycle": ("-",),
    "voltage": ("V", "kV", "MV"),
    "field_before": ("V/m", "kV/mm", "kV/cm", "MV/m"),
    "field_after": ("V/m", "kV/mm", "kV/cm", "MV/m"),
}
#: the unit each column is written in by pdvoid's writers (SI; phase in degrees)
SI_UNITS: dict[str, str] = {
    "phase": "deg",
    "charge": "C",
    "time": "s",
    "cycle": "-",
    "voltage": "V",
    "field_before": "V/m",
    "field_after": "V/m",
}
_SYNONYMS = {
    "phase": "phase",
    "phase angle": "phase",
    "charge": "charge",
    "apparent charge": "charge",
    "time": "time",
    "cycle": "cycle",
    "cycle index": "cycle",
    "voltage": "voltage",
    "applied voltage": "voltage",
    "field before": "field_before",
    "field after": "field_after",
    "skip": "skip",
}
_FIELD = re.compile(r"^\s*([A-Za-z][A-Za-z0-9_ ]*?)\s*(?:[\[(]\s*([^\[\]()]*?)\s*[\])])?\s*$")


@dataclass(frozen=True)
class Column:
    """One column of an event file.

    Attributes
    ----------
    name : str
        Canonical column name (time, cycle, phase, charge, voltage, field_before, field_after or skip).
    unit : str or None
        The unit as written in the file or the options; None if not given.
    """

    name: str
    unit: str | None

    @property
    def factor(self) -> float:
        """Factor from the column's unit to SI [-]; 1 for cycle and skip, NaN while the unit is unknown."""
        if self.name == "cycle" or self.name == "skip":
            return 1.0
        return unit_factor(self.name, self.unit) if self.unit is not None else float("nan")


def unit_factor(name: str, unit: str, where: str = "column") -> float:
    """Factor from ``unit`` to the SI unit of column ``name`` (degrees for the phase) [-].

    Parameters
    ----------
    name : str
        Canonical column name with a dimension (:data:`COLUMN_DIMENSIONS`) [-].
    unit : str
        Any unit of that dimension pint knows, e.g. ``"pC"`` [-].
    where : str
        Prefix of error messages (file and line) [-].

    Returns
    -------
    float
        The factor: a value in ``unit`` times it is the value in SI.

    Raises
    ------
    InputError
        For a unit of another dimension or one pint does not know.
    """
    dim = COLUMN_DIMENSIONS[name]
    try:
        return parse_quantity(f"1 {unit}", dim, name=f"unit of column {name!r}")
    except InputError:
        raise InputError(f"{where}: unit {unit!r} is not accepted for column {name!r}: it needs a unit of {dim} "
                         f"(for example {', '.join(COLUMN_UNITS[name])})") from None


def column_label(name: str, unit: str | None = None) -> str:
    """``"charge [pC]"``: the header text of a column.

    Parameters
    ----------
    name : str
        Canonical column name [-].
    unit : str or None
        Unit to show; None for the column's SI unit [-].

    Returns
    -------
    str
        ``"name [unit]"``.
    """
    return f"{name} [{unit if unit is not None else SI_UNITS[name]}]"


def _unit(name: str, unit: str | None, where: str) -> str | None:
    if unit is None or name == "skip":
        return unit
    u = unit.strip()
    if name == "cycle":
        if u in ("", "-", "1"):
            return "-"
        raise InputError(f"{where}: the cycle column is a whole number without unit ('-'); got unit {unit!r}")
    if u == "":
        return None
    unit_factor(name, u, where)  # raises InputError for a unit of the wrong dimension
    return u


def checked_column(name: str, unit: str, where: str) -> Column:
    """A :class:`Column` for a canonical ``name`` with a ``unit`` that column accepts.

    Parameters
    ----------
    name : str
        Canonical column name [-].
    unit : str
        Its unit (any unit of the column's dimension, :data:`COLUMN_DIMENSIONS`) [-].
    where : str
        Prefix of error messages (file and line) [-].

    Returns
    -------
    Column
        The checked column.

    Raises
    ------
    InputError
        For an unknown name, or a missing or unaccepted unit.
    """
    if name not in COLUMN_UNITS:
        raise InputError(f"{where}: unknown column {name!r}; known: {', '.join(COLUMN_UNITS)}")
    u = _unit(name, unit, where)
    if u is None:
        raise InputError(f"{where}: column {name!r} needs a unit (accepted: {', '.join(COLUMN_UNITS[name])})")
    return Column(name, u)


def parse_column(text: str, where: str) -> Column:
    """Parse ``"charge [pC]"``, ``"charge (pC)"`` or ``"charge"`` into a :class:`Column`.

    Parameters
    ----------
    text : str
        One column name of a header line or of the ``columns`` option [-].
    where : str
        Prefix of error messages (file and line, or the option) [-].

    Returns
    -------
    Column
        Canonical name and unit (None when the text gives none).

    Raises
    ------
    InputError
        When ``text`` is not text, not a column name, names an unknown column or gives an unaccepted unit.
    """
    if not isinstance(text, str):
        raise InputError(f"{where}: a column must be text like 'charge [pC]'; got {text!r}")
    m = _FIELD.match(text)
    if not m:
        raise InputError(f"{where}: {text[:60]!r} is not a column name like 'charge [pC]'")
    key = re.sub(r"[\s_]+", " ", m.group(1).strip().lower())
    if key not in _SYNONYMS:
        names = ", ".join(sorted(set(_SYNONYMS.values())))
        raise InputError(
            f"{where}: unknown column {m.group(1)!r}; known columns: {names} (use 'skip' to ignore a column)"
        )
    name = _SYNONYMS[key]
    unit = m.group(2)
    return Column(name, _unit(name, unit, where))


def _as_list(columns: str | Sequence[str], where: str) -> list[str]:
    if isinstance(columns, str):
        parts = [c for c in re.split(r"[,;\t]", columns)]
    elif isinstance(columns, Sequence) and not isinstance(columns, (bytes, bytearray)):
        parts = list(columns)
    else:
        raise InputError(
            f"{where} must be a list of column names or a text like 'phase [deg],charge [pC]'; "
            f"got {columns!r}"
        )
    if not parts:
        raise InputError(f"{where} must name at least one column")
    return parts


def resolve_columns(
    header: list[str] | None,
    header_where: str,
    columns: str | Sequence[str] | None,
    units: Mapping[str, str] | None,
) -> list[Column]:
    """The columns of an event file from its header line and/or the ``columns`` and ``units`` options.

    Rules: with both a header and ``columns``, the names must agree column by column, except that a
    ``skip`` in ``columns`` accepts any header name (units may be given in either; where both give one,
    they must agree). ``units`` ({name: unit}) supplies units missing from both;
    it may not contradict a unit already given. Every column except cycle and skip needs a unit in the end.
    Names may not repeat (except skip); charge and one of phase or time are required.

    Parameters
    ----------
    header : list of str or None
        The fields of the header line; None for a file without header [-].
    header_where : str
        Prefix of error messages about the header (file and line) [-].
    columns : str or Sequence[str] or None
        The ``columns`` option: names with units as a list or as one text like ``"phase [deg],charge [pC]"`` [-].
    units : Mapping[str, str] or None
        The ``units`` option: {column name: unit} for columns whose unit is given nowhere else [-].

    Returns
    -------
    list of Column
        One column per field, each with its unit (every column but cycle and skip has one).

    Raises
    ------
    InputError
        When the header and the options disagree, a unit is missing or contradicted, a name repeats, or the
        charge column or both phase and time are missing.
    """
    if columns is None:
        cols = [parse_column(t, f"{header_where}, column {i}") for i, t in enumerate(header or [], 1)]
    else:
        given = [parse_column(t, f"columns[{i}]") for i, t in enumerate(_as_list(columns, "columns"))]
        cols = given
        if header is not None:
            if len(header) != len(given):
                raise InputError(
                    f"{header_where}: the header has {len(header)} columns, but columns= gives {len(given)}"
                )
            cols = []
            for i, (g, t) in enumerate(zip(given, header, strict=True), 1):
                if g.name == "skip":  # a skipped column may carry any name in the header
                    cols.append(g)
                    continue
                h = parse_column(t, f"{header_where}, column {i}")
                if h.name != g.name:
                    raise InputError(
                        f"{header_where}: column {i} is {h.name!r} in the header, but columns= gives "
                        f"{g.name!r}"
                    )
                if g.unit is not None and h.unit is not None and g.unit != h.unit:
                    raise InputError(
                        f"{header_where}: column {h.name!r} has unit {h.unit!r} in the header but "
                        f"{g.unit!r} in columns="
                    )
                cols.append(Column(g.name, g.unit if g.unit is not None else h.unit))
    if units is not None:
        if not isinstance(units, Mapping):
            raise InputError(
                f"units must be a mapping {{column name: unit}}, e.g. {{'charge': 'pC'}}; got {units!r}"
            )
        names = {c.name for c in cols}
        out = []
        canon_units = {}
        for k, v in units.items():
            col = parse_column(k, "units")
            if col.name not in names:
                raise InputError(
                    f"units names column {k!r}, which the file does not have (columns: "
                    f"{[c.name for c in cols]})"
                )
            if not isinstance(v, str):
                raise InputError(f"units[{k!r}] must be a unit text like 'pC'; got {v!r}")
            canon_units[col.name] = _unit(col.name, v, f"units[{k!r}]")
        for c in cols:
            u = canon_units.get(c.name)
            if u is not None and c.unit is not None and u != c.unit:
                raise InputError(
                    f"units gives {u!r} for column {c.name!r}, which already has unit {c.unit!r}"
                )
            out.append(Column(c.name, c.unit if c.unit is not None else u))
        cols = out
    seen = set()
    for c in cols:
        if c.name != "skip" and c.name in seen:
            raise InputError(f"{header_where}: column {c.name!r} appears twice")
        seen.add(c.name)
        if c.name not in ("skip", "cycle") and c.unit is None:
            raise InputError(
                f"{header_where}: column {c.name!r} has no unit; write it as '{c.name} [unit]' or give "
                f"units={{'{c.name}': ...}} (accepted: {', '.join(COLUMN_UNITS[c.name])})"
            )
    if "charge" not in seen:
        raise InputError(f"{header_where}: no charge column (columns: {[c.name for c in cols]})")
    if "phase" not in seen and "time" not in seen:
        raise InputError(
            f"{header_where}: needs a phase or a time column (columns: {[c.name for c in cols]})"
        )
    return cols
