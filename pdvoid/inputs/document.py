"""What a design-review pack records besides the physics: its document control (revision and the people who
write, check and approve it) and the acceptance criterion its verdict is drawn against.

Both may be set in a scenario file, next to the scenario, as the optional tables::

    [document]     revision, author, checker, approver (text; a field left out prints as a blank line to sign)
    [acceptance]   charge ("10 pC"), voltage_factor (1.1: the criterion applies at 1.1 × the test voltage)

and from the command line (``pdvoid report --revision --author --checker --approver --acceptance-charge
--acceptance-voltage-factor``), where an option overrides the file's value. Unknown keys are errors.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, fields, replace
from typing import Any

from pdvoid.core.errors import InputError, check_positive
from pdvoid.core.units import parse_quantity

__all__ = ["DocumentControl", "AcceptanceCriterion", "document_from_dict", "acceptance_from_dict",
           "DOCUMENT_KEYS", "ACCEPTANCE_KEYS", "MAX_FIELD_CHARACTERS", "MAX_VOLTAGE_FACTOR"]

#: the keys of a scenario file's [document] table
DOCUMENT_KEYS = ("revision", "author", "checker", "approver")
#: the keys of a scenario file's [acceptance] table
ACCEPTANCE_KEYS = ("charge", "voltage_factor")
MAX_FIELD_CHARACTERS = 120  #: longest revision or name accepted [characters]
MAX_VOLTAGE_FACTOR = 10.0  #: largest voltage factor of an acceptance criterion [-]


def _text(name: str, value: object) -> str:
    if not isinstance(value, str):
        raise InputError(f"{name} must be text; got {value!r}")
    text = value.strip()
    if len(text) > MAX_FIELD_CHARACTERS:
        raise InputError(f"{name} must have at most {MAX_FIELD_CHARACTERS} characters; got {len(text)}")
    if any(not ch.isprintable() for ch in text):
        raise InputError(f"{name} must be one line of printable text; got {value!r}")
    return text


@dataclass(frozen=True)
class DocumentControl:
    """The document-control fields of a review pack. An empty field is printed as a blank line to sign.

    Attributes
    ----------
    revision : str
        The pack's revision, e.g. "A" or "2" [-].
    author, checker, approver : str
        Who wrote, checked and approved the pack [-].

    Raises
    ------
    pdvoid.InputError
        For a field that is not one line of printable text of at most :data:`MAX_FIELD_CHARACTERS` characters.
    """

    revision: str = ""
    author: str = ""
    checker: str = ""
    approver: str = ""

    def __post_init__(self) -> None:
        for f in fields(self):
            object.__setattr__(self, f.name, _text(f"document.{f.name}", getattr(self, f.name)))

    def updated(self, **changes: str | None) -> DocumentControl:
        """This record with the fields given (not None) replaced, e.g. command-line options over a file's values.

        Parameters
        ----------
        **changes : str or None
            New values of revision, author, checker or approver; None keeps the present value [-].

        Returns
        -------
        DocumentControl
            The updated record.

        Raises
        ------
        pdvoid.InputError
            For an unknown field or a bad value.
        """
        unknown = sorted(set(changes) - set(DOCUMENT_KEYS))
        if unknown:
            raise InputError(f"unknown document field {unknown[0]!r}; allowed: {', '.join(DOCUMENT_KEYS)}")
        return replace(self, **{k: v for k, v in changes.items() if v is not None})


@dataclass(frozen=True)
class AcceptanceCriterion:
    """An acceptance criterion on the discharge magnitude: at most ``charge`` at ``voltage_factor`` × the test
    voltage (e.g. "≤ 10 pC at 1.1 × U_test"; the limit and the factor come from the applicable standard or the
    purchaser's specification, not from pdvoid).

    Attributes
    ----------
    charge : float
        The largest acceptable apparent charge, > 0 [C].
    voltage_factor : float
        The voltage the criterion applies at, as a multiple of the test voltage, 0 < factor ≤
        :data:`MAX_VOLTAGE_FACTOR` [-]. Default 1.

    Raises
    ------
    pdvoid.InputError
        For a charge that is not positive and finite, or a factor outside (0, 10].
    """

    charge: float
    voltage_factor: float = 1.0

    def __post_init__(self) -> None:
        object.__setattr__(self, "charge", check_positive("acceptance.charge", self.charge, "C"))
        factor = check_positive("acceptance.voltage_factor", self.voltage_factor)
        if factor > MAX_VOLTAGE_FACTOR:
            raise InputError(f"acceptance.voltage_factor must lie in (0, {MAX_VOLTAGE_FACTOR:g}]; got {factor!r}")
        object.__setattr__(self, "voltage_factor", factor)

    def describe(self) -> str:
        """The criterion in words, e.g. "≤ 10 pC at 1.1 × U_test".

        Returns
        -------
        str
            The criterion [-].
        """
        return f"≤ {self.charge * 1e12:.4g} pC at {self.voltage_factor:.4g} × U_test"


def _table(data: dict[str, Any], part: str, keys: tuple[str, ...], source: str) -> dict[str, Any] | None:
    sec = data.get(part)
    if sec is None:
        return None
    if not isinstance(sec, dict):
        raise InputError(f"{source}: [{part}] must be a table")
    unknown = sorted(set(sec) - set(keys))
    if unknown:
        raise InputError(f"{source}: unknown key {part}.{unknown[0]}; allowed: {', '.join(keys)}")
    return sec


def document_from_dict(data: dict[str, Any], *, source: str = "scenario") -> DocumentControl:
    """The document control of a parsed scenario file's [document] table (all fields empty without one).

    Parameters
    ----------
    data : dict
        The parsed TOML document [-].
    source : str
        What to name in error messages (a file name) [-].

    Returns
    -------
    DocumentControl
        The fields the table sets; the others empty.

    Raises
    ------
    pdvoid.InputError
        For a [document] that is not a table, an unknown key or a bad value, naming the file and the key.
    """
    sec = _table(data, "document", DOCUMENT_KEYS, source)
    if sec is None:
        return DocumentControl()
    try:
        return DocumentControl(**sec)
    except InputError as exc:
        raise InputError(f"{source}: {exc}") from None


def acceptance_from_dict(data: dict[str, Any], *, source: str = "scenario") -> AcceptanceCriterion | None:
    """The acceptance criterion of a parsed scenario file's [acceptance] table (None without one).

    Parameters
    ----------
    data : dict
        The parsed TOML document [-].
    source : str
        What to name in error messages (a file name) [-].

    Returns
    -------
    AcceptanceCriterion or None
        The criterion; ``charge`` is required in the table, ``voltage_factor`` defaults to 1.

    Raises
    ------
    pdvoid.InputError
        For an [acceptance] that is not a table, an unknown or missing key or a bad value, naming the file and
        the key.
    """
    sec = _table(data, "acceptance", ACCEPTANCE_KEYS, source)
    if sec is None:
        return None
    if "charge" not in sec:
        raise InputError(f"{source}: missing key acceptance.charge (e.g. charge = \"10 pC\")")
    charge = parse_quantity(sec["charge"], "charge", name=f"{source}: acceptance.charge")
    factor = sec.get("voltage_factor", 1.0)
    if isinstance(factor, bool) or not isinstance(factor, (int, float)) or not math.isfinite(float(factor)):
        raise InputError(f"{source}: acceptance.voltage_factor must be a number such as 1.1; got {factor!r}")
    try:
        return AcceptanceCriterion(charge=charge, voltage_factor=float(factor))
    except InputError as exc:
        raise InputError(f"{source}: {exc}") from None
