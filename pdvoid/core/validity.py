"""Warnings for results computed outside the range a formula was verified for.

A :class:`ValidityWarning` says, in plain words and numbers, which assumption of a closed form a scenario leaves
and how large the error may be, and names the better method (usually the numerical field solver,
``pdvoid.fields.coefficients(scenario)``). It is a :class:`UserWarning`, so ``warnings.simplefilter("error",
ValidityWarning)`` turns it into an exception and ``"ignore"`` silences it.
"""

from __future__ import annotations

import sys
import warnings
from collections.abc import Iterator
from contextlib import contextmanager
from types import FrameType

__all__ = ["ValidityWarning", "warn_validity", "collect_validity_notes"]


class ValidityWarning(UserWarning):
    """A result relies on a formula outside the range in which it was verified."""


def _caller_level() -> int:
    """Stack level of the first frame outside pdvoid (at least 2), so the warning points at the user's code."""
    level = 2
    frame: FrameType | None = sys._getframe(2)  # the caller of warn_validity's caller
    while frame is not None and frame.f_globals.get("__name__", "").startswith("pdvoid."):
        frame = frame.f_back
        level += 1
    return level


def warn_validity(message: str, stacklevel: int | None = None) -> None:
    """Issue a :class:`ValidityWarning`.

    Parameters
    ----------
    message : str
        What is outside the verified range, by how much, the expected error and what to use instead [-].
    stacklevel : int, optional
        Passed to :func:`warnings.warn`; by default the first frame outside the pdvoid package, so that the
        warning names the line of user code that asked for the result [-].
    """
    warnings.warn(message, ValidityWarning, stacklevel=_caller_level() if stacklevel is None else stacklevel)


@contextmanager
def collect_validity_notes() -> Iterator[list[str]]:
    """Collect the :class:`ValidityWarning` messages issued inside the ``with`` block instead of issuing them.

    The list yielded is filled, in order and without repeats, when the block ends; any other warning is issued
    again as it came. Searches use it for trial designs that are not part of their answer, and the faces use it
    to show the notes in words next to the numbers they qualify.

    Yields
    ------
    list of str
        The notes [-].
    """
    notes: list[str] = []
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", ValidityWarning)
        yield notes
    notes.extend(dict.fromkeys(str(w.message) for w in caught if issubclass(w.category, ValidityWarning)))
    for w in caught:
        if not issubclass(w.category, ValidityWarning):
            warnings.warn_explicit(w.message, w.category, w.filename, w.lineno)
