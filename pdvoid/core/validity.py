"""The warning pdvoid gives when a formula is evaluated outside the range it was fitted or derived for."""

from __future__ import annotations

__all__ = ["ValidityWarning"]


class ValidityWarning(UserWarning):
    """A published formula was evaluated outside its stated validity range.

    The result is still returned (an extrapolation); the message names the formula, the quantity, its value and
    the range the formula's docstring states.
    """
