"""Reader options and the key = value comment lines that may stand in for them.

Recognised comment keys (case-insensitive), one per line, anywhere in a delimited file::

    # frequency = 50 Hz        supply frequency (a number is taken as Hz)
    # cycles = 3000            number of AC cycles observed (the reference time is cycles / frequency)
    # duration = 60 s          observation time (a number is taken as s); cycles = duration * frequency
    # threshold = 5 pC         the measurement's detection threshold (stored, not applied; a number is C)
    # label = free text        a label for the events

Every other ``# key = value`` line is kept, as text, in the summary's ``"metadata"``; other comment lines are
only counted. A key given twice with different values, or given both as a comment and as an option with a
different value, is an :class:`~pdvoid.core.errors.InputError`.
"""

from __future__ import annotations

import math
from pathlib import Path

from pdvoid.core.errors import InputError, check_choice, check_positive
from pdvoid.core.units import parse_quantity
from pdvoid.io.lines import line_error

__all__ = ["RECOGNISED_KEYS", "quantity_option", "CommentKeys", "check_layout_options"]

#: comment keys with a meaning for the readers -> dimension of their value ("" for text)
RECOGNISED_KEYS: dict[str, str] = {
    "frequency": "frequency",
    "cycles": "dimensionless",
    "duration": "time",
    "threshold": "charge",
    "label": "",
}
_UNITS = {"frequency": "Hz", "cycles": "", "duration": "s", "threshold": "C"}


def quantity_option(
    name: str, value: float | str | None, dimension: str, *, allow_zero: bool = False
) -> float | None:
    """An option given as a number (SI) or a quantity text like ``"50 Hz"``; None stays None.

    Parameters
    ----------
    name : str
        The option: "frequency", "cycles", "duration" or "threshold" [-].
    value : float or str or None
        A number in SI, or text with a unit of ``dimension`` [-].
    dimension : str
        The dimension the unit must have (e.g. "frequency") [-].
    allow_zero : bool
        True to accept 0 (the threshold) [-].

    Returns
    -------
    float or None
        The value in SI, > 0 (or 0 when allowed); None when ``value`` is None.

    Raises
    ------
    InputError
        For text that is not a quantity of ``dimension``, or a value <= 0 (< 0 with ``allow_zero``).
    """
    if value is None:
        return None
    x = parse_quantity(value, dimension, name=name) if isinstance(value, str) else value
    if allow_zero and x == 0:
        return 0.0
    return check_positive(name, x, _UNITS.get(name, ""))


class CommentKeys:
    """Collects ``# key = value`` lines of one file; resolves them against the options.

    Parameters
    ----------
    path : Path
        The file (for messages) [-].

    Attributes
    ----------
    path : Path
        The file.
    values : dict of str to (str, int)
        {key: (value text, line number)} of every ``# key = value`` line seen.
    """

    def __init__(self, path: Path) -> None:
        self.path = path
        self.values: dict[str, tuple[str, int]] = {}

    def add(self, key: str, value: str, lineno: int) -> None:
        """Record one ``# key = value`` line.

        Parameters
        ----------
        key : str
            The key, lower case [-].
        value : str
            The value text [-].
        lineno : int
            Its line number [-].

        Raises
        ------
        InputError
            When the key was given before with another value.
        """
        if key in self.values and self.values[key][0] != value:
            first = self.values[key][1]
            raise line_error(
                self.path,
                lineno,
                f"{key!r} is given again with another value ({value!r}; line "
                f"{first} gave {self.values[key][0]!r})",
            )
        self.values.setdefault(key, (value, lineno))

    @property
    def metadata(self) -> dict[str, str]:
        """All key = value comments, as text."""
        return {k: v for k, (v, _) in self.values.items()}

    def text(self, key: str) -> str | None:
        """The text of a key, or None when the file does not give it.

        Parameters
        ----------
        key : str
            The key, lower case [-].

        Returns
        -------
        str or None
            The value text.
        """
        return self.values[key][0] if key in self.values else None

    def quantity(self, key: str, option: float | None) -> tuple[float | None, str | None]:
        """(value, source) for a recognised numeric key from the option and/or its comment line.

        Parameters
        ----------
        key : str
            One of the numeric :data:`RECOGNISED_KEYS` [-].
        option : float or None
            The option's value in SI, None when not given [SI].

        Returns
        -------
        tuple of (float or None, str or None)
            The value in SI and where it came from ("option", "option (agrees with the file)" or
            "comment line <n>"); (None, None) when neither gives it.

        Raises
        ------
        InputError
            Naming the line, for a comment value that is not a valid quantity or that disagrees with the option.
        """
        dim = RECOGNISED_KEYS[key]
        from_comment = None
        if key in self.values:
            text, lineno = self.values[key]
            try:
                x = parse_quantity(text, dim, name=key)
                if not (key == "threshold" and x == 0.0):
                    x = check_positive(key, x, _UNITS[key])
            except InputError as exc:
                raise line_error(self.path, lineno, str(exc)) from None
            from_comment = (x, lineno)
        if option is not None and from_comment is not None:
            x, lineno = from_comment
            if not math.isclose(x, option, rel_tol=1e-9, abs_tol=0.0):
                raise line_error(
                    self.path, lineno, f"{key} = {x!r} in the file, but {key}={option!r} was given"
                )
            return option, "option (agrees with the file)"
        if option is not None:
            return option, "option"
        if from_comment is not None:
            return from_comment[0], f"comment line {from_comment[1]}"
        return None, None


def check_layout_options(delimiter: str | None, decimal: str | None) -> None:
    """Validate the ``delimiter`` and ``decimal`` options of the text readers (None = detect).

    Parameters
    ----------
    delimiter : str or None
        ",", ";" or "\\t" [-].
    decimal : str or None
        "." or "," [-].

    Raises
    ------
    InputError
        For another value, or a decimal comma with a comma delimiter.
    """
    if delimiter is not None:
        check_choice("delimiter", delimiter, (",", ";", "\t"))
    if decimal is not None:
        check_choice("decimal", decimal, (".", ","))
    if delimiter == "," and decimal == ",":
        raise InputError("decimal=',' cannot be used with delimiter=','")
