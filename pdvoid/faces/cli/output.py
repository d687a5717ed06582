"""What every command prints: the safety note, strict JSON, and numbers with their units."""

from __future__ import annotations

import json
import math
import os
from typing import Any

import numpy as np

from pdvoid.core.validity import collect_validity_notes

__all__ = ["SAFETY", "json_safe", "emit", "fmt", "validity_notes", "notes_lines"]

SAFETY = (
    "SAFETY: high voltage can kill. These results are engineering estimates from idealised models. Test and "
    "acceptance levels come from the applicable standards; local codes and licensed practice prevail."
)


def json_safe(obj: object) -> object:
    """A JSON-safe copy of ``obj``: NaN/inf → None, numpy → Python, dict keys as text.

    Parameters
    ----------
    obj : object
        A dict, list, tuple, numpy array or scalar, nested in any way.

    Returns
    -------
    object
        The same structure of dicts, lists and Python scalars.
    """
    if isinstance(obj, dict):
        return {str(k): json_safe(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [json_safe(v) for v in obj]
    if isinstance(obj, np.ndarray):
        return json_safe(obj.tolist())
    if isinstance(obj, (np.floating, float)):
        x = float(obj)
        return x if math.isfinite(x) else None
    if isinstance(obj, np.integer):
        return int(obj)
    if isinstance(obj, np.bool_):
        return bool(obj)
    if isinstance(obj, os.PathLike):
        return os.fspath(obj)
    if isinstance(obj, (set, frozenset)):
        return [json_safe(v) for v in sorted(obj, key=str)]
    return obj


def emit(doc: dict[str, Any], as_json: bool, text_lines: list[str]) -> None:
    """Print a command's outcome: ``doc`` as strict JSON, or ``text_lines`` followed by the safety note.

    Parameters
    ----------
    doc : dict
        The outcome, for ``--json`` [-].
    as_json : bool
        Print JSON instead of text [-].
    text_lines : list of str
        The text report [-].
    """
    if as_json:
        print(json.dumps(json_safe(doc), indent=2, allow_nan=False))
    else:
        print("\n".join(text_lines))
        print(SAFETY)


def fmt(value: float | None, unit: str, scale: float = 1.0, digits: int = 4) -> str:
    """A number with its unit, "n/a" for None or a non-finite value.

    Parameters
    ----------
    value : float or None
        The value [SI].
    unit : str
        The display unit written after the number [-].
    scale : float
        SI value per display unit [SI unit per display unit].
    digits : int
        Significant digits [-].

    Returns
    -------
    str
        E.g. "12.5 kV".
    """
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return "n/a"
    return f"{value / scale:.{digits}g} {unit}"


#: collect the validity warnings of a command's numbers (:func:`pdvoid.core.validity.collect_validity_notes`)
validity_notes = collect_validity_notes


def notes_lines(notes: list[str] | tuple[str, ...]) -> list[str]:
    """The text lines of validity notes: a "Validity notes" heading and one line per note (none if no notes).

    Parameters
    ----------
    notes : sequence of str
        The notes [-].

    Returns
    -------
    list of str
        The lines [-].
    """
    unique = list(dict.fromkeys(n for n in notes if n))
    if not unique:
        return []
    return ["Validity notes (results outside the verified range of the closed forms):"] + [f"  - {n}"
                                                                                            for n in unique]
