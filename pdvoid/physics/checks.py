"""Array-aware input checks shared by the physics modules (scalars stay scalars, arrays broadcast)."""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

from pdvoid.core.errors import InputError, check_array, check_nonnegative, check_positive, check_range

__all__ = ["values", "shape_out", "broadcast", "checked", "positive", "broadcast_named", "scalar_or_array",
           "less_than"]


def values(name: str, value: npt.ArrayLike, *, low: float = 0.0, low_open: bool = True, high: float = math.inf,
            unit: str = "") -> tuple[np.ndarray, bool]:
    """``value`` (number or array) as a float array checked against (low, high]; and whether it was scalar.

    Parameters
    ----------
    name : str
        The parameter's name, used in error messages.
    value : array_like
        A number or an array of numbers.
    low : float, optional
        Lower end of the interval (low, high] ([low, high] when not ``low_open``).
    low_open : bool, optional
        True to exclude ``low``.
    high : float, optional
        Upper end of the interval (included).
    unit : str, optional
        Unit named in the error message.

    Returns
    -------
    tuple
        The float array (0-d for a scalar) and whether the input was a scalar.

    Raises
    ------
    InputError
        For a non-number or an entry outside the interval.
    """
    def check(label: str, x: object) -> float:
        if high == math.inf and low == 0.0:
            return (check_positive if low_open else check_nonnegative)(label, x, unit)
        return check_range(label, x, low, high, low_open=low_open, unit=unit)

    if np.ndim(value) == 0:
        if isinstance(value, np.ndarray):
            value = value.item()
        return np.asarray(check(name, value), dtype=float), True
    arr = check_array(name, value, ndim=int(np.ndim(value)), min_size=1)
    ok = (arr > low if low_open else arr >= low) & (arr <= high)
    if not np.all(ok):
        i = int(np.flatnonzero(~ok.ravel())[0])
        check(f"{name}[{i}]", float(arr.ravel()[i]))
    return arr, False


def shape_out(result: np.ndarray, scalar: bool) -> float | np.ndarray:
    """A float when ``scalar``, else the array.

    Parameters
    ----------
    result : numpy.ndarray
        The computed values.
    scalar : bool
        Whether the inputs were scalars.

    Returns
    -------
    float or numpy.ndarray
        ``float(result)`` or ``result``.
    """
    return float(result) if scalar else result


def broadcast(**arrays: np.ndarray) -> list[np.ndarray]:
    """Broadcast arrays together; InputError naming them if their shapes do not fit.

    Parameters
    ----------
    **arrays : numpy.ndarray
        The arrays, by name.

    Returns
    -------
    list of numpy.ndarray
        The broadcast arrays, in the order given.

    Raises
    ------
    InputError
        When the shapes are not broadcast-compatible.
    """
    try:
        return list(np.broadcast_arrays(*arrays.values()))
    except ValueError:
        shapes = ", ".join(f"{k} {np.shape(v)}" for k, v in arrays.items())
        raise InputError(f"array arguments must have broadcast-compatible shapes; got {shapes}") from None


def checked(
    name: str,
    value: npt.ArrayLike,
    low: float,
    high: float = math.inf,
    *,
    low_open: bool = False,
    high_open: bool = False,
    unit: str = "",
) -> float | np.ndarray:
    """``value`` as a float (scalar input) or float array; every entry finite and inside the interval.

    Parameters
    ----------
    name : str
        The parameter's name, used in error messages.
    value : array_like
        A number or an array of numbers.
    low, high : float
        The interval's ends.
    low_open, high_open : bool, optional
        True to exclude that end (an infinite ``high`` is always open).
    unit : str, optional
        Unit named in the error message.

    Returns
    -------
    float or numpy.ndarray
        A float for scalar input, else a float array.

    Raises
    ------
    InputError
        For a non-number or an entry outside the interval (named by index).
    """
    if isinstance(value, np.ndarray) and value.ndim == 0:
        value = value[()]
    if np.ndim(value) == 0:
        return check_range(
            name, value, low, high, low_open=low_open, high_open=high_open or high == math.inf, unit=unit
        )
    arr = check_array(name, value, ndim=np.ndim(value))
    lo_ok = arr > low if low_open else arr >= low
    hi_ok = arr < high if (high_open or high == math.inf) else arr <= high
    bad = ~(lo_ok & hi_ok)
    if np.any(bad):
        i = int(np.flatnonzero(bad.ravel())[0])
        lb = "(" if low_open else "["
        hb = ")" if (high_open or high == math.inf) else "]"
        u = f" {unit}" if unit else ""
        raise InputError(f"{name} must lie in {lb}{low:g}, {high:g}{hb}{u}; entry {i} is {arr.ravel()[i]!r}")
    return arr


def positive(name: str, value: npt.ArrayLike, unit: str = "") -> float | np.ndarray:
    """``value`` as a float or float array with every entry finite and > 0.

    Parameters
    ----------
    name : str
        The parameter's name, used in error messages.
    value : array_like
        A number or an array of numbers.
    unit : str, optional
        Unit named in the error message.

    Returns
    -------
    float or numpy.ndarray
        A float for scalar input, else a float array.

    Raises
    ------
    InputError
        For a non-number or an entry <= 0 (named by index).
    """
    return checked(name, value, 0.0, low_open=True, unit=unit)


def broadcast_named(**named: npt.ArrayLike) -> list[np.ndarray]:
    """Broadcast checked inputs together; InputError naming them if their shapes do not fit.

    Parameters
    ----------
    **named : array_like
        The checked inputs, by name.

    Returns
    -------
    list of numpy.ndarray
        Float arrays broadcast together, in the order given.

    Raises
    ------
    InputError
        When the shapes are not broadcast-compatible.
    """
    try:
        return list(np.broadcast_arrays(*(np.asarray(v, dtype=float) for v in named.values())))
    except ValueError:
        shapes = ", ".join(f"{k} {np.shape(v)}" for k, v in named.items())
        raise InputError(f"array shapes do not broadcast together: {shapes}") from None


def scalar_or_array(x: np.ndarray, *inputs: npt.ArrayLike) -> float | np.ndarray:
    """A float when every input was a scalar, else the array.

    Parameters
    ----------
    x : numpy.ndarray
        The computed values.
    *inputs : array_like
        The inputs the values were computed from.

    Returns
    -------
    float or numpy.ndarray
        ``x`` as a float, or ``x`` itself.
    """
    if all(np.ndim(v) == 0 for v in inputs):
        return float(np.asarray(x).reshape(()))
    return x


def less_than(name_small: str, small: npt.ArrayLike, name_large: str, large: npt.ArrayLike, unit: str = "m") -> None:
    """InputError unless small < large everywhere.

    Parameters
    ----------
    name_small : str
        Name of the smaller parameter, used in the error message.
    small : array_like
        Its values.
    name_large : str
        Name of the larger parameter, used in the error message.
    large : array_like
        Its values, broadcast with ``small``.
    unit : str, optional
        Unit named in the error message.

    Raises
    ------
    InputError
        Where ``small >= large``, naming both values.
    """
    s, g = broadcast_named(**{name_small: small, name_large: large})
    bad = ~(s < g)
    if np.any(bad):
        i = int(np.flatnonzero(bad.ravel())[0])
        raise InputError(
            f"{name_small} must be smaller than {name_large}; got {name_small} = {s.ravel()[i]!r} {unit} and "
            f"{name_large} = {g.ravel()[i]!r} {unit}"
        )
