"""The one exception pdvoid raises for bad input, and the helpers that build its messages.

Every message names the parameter (or file and line), the value received and what is allowed.
"""

from __future__ import annotations

import math
from collections.abc import Iterable

import numpy as np

__all__ = [
    "InputError",
    "check_real",
    "check_positive",
    "check_nonnegative",
    "check_range",
    "check_choice",
    "check_int",
    "check_bool",
    "check_array",
]


class InputError(ValueError):
    """Bad input to a pdvoid function, constructor or file reader.

    The message names the parameter or file line, the value received and what is allowed.
    """


def _show(value: object) -> str:
    text = repr(value)
    return text if len(text) <= 80 else text[:77] + "..."


def check_real(name: str, value: object) -> float:
    """Return ``value`` as a finite float, or raise :class:`InputError` naming ``name``.

    Parameters
    ----------
    name : str
        The parameter's name, used in the error message.
    value : object
        The value to check; any object (this function is the type gate).

    Returns
    -------
    float
        ``value`` as a Python float.

    Raises
    ------
    InputError
        For a boolean, a non-number (strings are never converted) or a non-finite number.
    """
    if isinstance(value, bool) or not isinstance(value, (int, float, np.integer, np.floating)):
        raise InputError(f"{name} must be a real number; got {_show(value)} of type {type(value).__name__}")
    try:
        x = float(value)
    except OverflowError:  # an int beyond the float range
        raise InputError(f"{name} must be a finite real number; got an integer of {len(str(abs(int(value))))} "
                         "digits, beyond the float range") from None
    if not math.isfinite(x):
        raise InputError(f"{name} must be finite; got {x!r}")
    return x


def check_positive(name: str, value: object, unit: str = "") -> float:
    """A finite number > 0.

    Parameters
    ----------
    name : str
        The parameter's name, used in the error message.
    value : object
        The value to check; any object (this function is the type gate).
    unit : str, optional
        Unit named in the error message [-].

    Returns
    -------
    float
        ``value`` as a float.

    Raises
    ------
    InputError
        Unless ``value`` is a finite real number > 0.
    """
    x = check_real(name, value)
    if x <= 0.0:
        raise InputError(f"{name} must be > 0{' ' + unit if unit else ''}; got {x!r}")
    return x


def check_nonnegative(name: str, value: object, unit: str = "") -> float:
    """A finite number >= 0.

    Parameters
    ----------
    name : str
        The parameter's name, used in the error message.
    value : object
        The value to check; any object (this function is the type gate).
    unit : str, optional
        Unit named in the error message [-].

    Returns
    -------
    float
        ``value`` as a float.

    Raises
    ------
    InputError
        Unless ``value`` is a finite real number >= 0.
    """
    x = check_real(name, value)
    if x < 0.0:
        raise InputError(f"{name} must be >= 0{' ' + unit if unit else ''}; got {x!r}")
    return x


def check_range(
    name: str,
    value: object,
    low: float,
    high: float,
    *,
    low_open: bool = False,
    high_open: bool = False,
    unit: str = "",
    allow_inf: bool = False,
) -> float:
    """A number inside [low, high] (ends open as asked); ``allow_inf`` lets +inf through when high is inf.

    Parameters
    ----------
    name : str
        The parameter's name, used in the error message.
    value : object
        The value to check; any object (this function is the type gate).
    low, high : float
        The interval's ends, in the unit of ``value``.
    low_open, high_open : bool, optional
        True to exclude that end.
    unit : str, optional
        Unit named in the error message [-].
    allow_inf : bool, optional
        True to accept ``+inf`` (e.g. a decay time that never ends) when ``high`` is inf.

    Returns
    -------
    float
        ``value`` as a float.

    Raises
    ------
    InputError
        For a non-number or a value outside the interval, naming the interval and ``unit``.
    """
    if allow_inf and isinstance(value, (float, np.floating)) and float(value) == math.inf:
        x = math.inf
    else:
        x = check_real(name, value)
    lo_ok = x > low if low_open else x >= low
    hi_ok = x < high if high_open else x <= high
    if not (lo_ok and hi_ok):
        lb = "(" if low_open else "["
        hb = ")" if high_open else "]"
        u = f" {unit}" if unit else ""
        raise InputError(f"{name} must lie in {lb}{low:g}, {high:g}{hb}{u}; got {x!r}")
    return x


def check_choice(name: str, value: object, choices: Iterable[str]) -> str:
    """One of a fixed set of strings (case-sensitive).

    Parameters
    ----------
    name : str
        The parameter's name, used in the error message.
    value : object
        The value to check; any object (this function is the type gate).
    choices : Iterable[str]
        The allowed strings.

    Returns
    -------
    str
        ``value``.

    Raises
    ------
    InputError
        Unless ``value`` is one of ``choices``; the message lists them.
    """
    options = list(choices)
    if not isinstance(value, str) or value not in options:
        raise InputError(f"{name} must be one of {', '.join(map(repr, options))}; got {_show(value)}")
    return value


def check_int(name: str, value: object, low: int | None = None, high: int | None = None) -> int:
    """A whole number (not bool) inside [low, high].

    Parameters
    ----------
    name : str
        The parameter's name, used in the error message.
    value : object
        The value to check; any object (this function is the type gate).
    low, high : int or None, optional
        Inclusive bounds; None for no bound.

    Returns
    -------
    int
        ``value`` as a Python int.

    Raises
    ------
    InputError
        For a boolean, a non-integer (floats such as ``3.0`` included) or a value out of range.
    """
    if isinstance(value, bool) or not isinstance(value, (int, np.integer)):
        raise InputError(f"{name} must be a whole number; got {_show(value)}")
    v = int(value)
    if (low is not None and v < low) or (high is not None and v > high):
        raise InputError(f"{name} must lie in [{low}, {high}]; got {v}")
    return v


def check_bool(name: str, value: object) -> bool:
    """A real bool (not 0/1, not a string).

    Parameters
    ----------
    name : str
        The parameter's name, used in the error message.
    value : object
        The value to check; any object (this function is the type gate).

    Returns
    -------
    bool
        ``value`` as a Python bool.

    Raises
    ------
    InputError
        Unless ``value`` is a bool or a numpy bool.
    """
    if not isinstance(value, (bool, np.bool_)):
        raise InputError(f"{name} must be True or False; got {_show(value)}")
    return bool(value)


def check_array(
    name: str,
    value: object,
    *,
    ndim: int = 1,
    min_size: int = 0,
    max_size: int | None = None,
    finite: bool = True,
) -> np.ndarray:
    """A float array of the given dimension with finite entries.

    Parameters
    ----------
    name : str
        The parameter's name, used in the error message.
    value : object
        The value to check; any object (this function is the type gate).
    ndim : int, optional
        Required number of dimensions.
    min_size, max_size : int or None, optional
        Bounds on the number of entries; ``max_size`` None for no bound.
    finite : bool, optional
        True to require every entry finite.

    Returns
    -------
    numpy.ndarray
        ``value`` as a float array (a view when no conversion was needed).

    Raises
    ------
    InputError
        For values that are not real numbers, the wrong dimension or size, or a non-finite entry (named by index).
    """
    try:
        raw = np.asarray(value)
        if raw.dtype.kind not in "iuf":  # complex, boolean, text and objects are refused, never converted
            raise TypeError(f"an array of {raw.dtype}")
        arr = np.asarray(raw, dtype=float)
    except (TypeError, ValueError, OverflowError) as exc:
        raise InputError(f"{name} must be an array of real numbers; got {_show(value)}") from exc
    if arr.ndim != ndim:
        raise InputError(f"{name} must be {ndim}-dimensional; got shape {arr.shape}")
    if arr.size < min_size:
        raise InputError(f"{name} must hold at least {min_size} values; got {arr.size}")
    if max_size is not None and arr.size > max_size:
        raise InputError(f"{name} may hold at most {max_size} values; got {arr.size}")
    if finite and not np.all(np.isfinite(arr)):
        bad = int(np.flatnonzero(~np.isfinite(arr.ravel()))[0])
        raise InputError(f"{name} must be finite everywhere; entry {bad} is {arr.ravel()[bad]!r}")
    return arr
