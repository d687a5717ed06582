"""Converters for command-line options: quantities must carry a unit; pure numbers are checked for range.

Each converter is meant as the ``type=`` of an ``argparse`` option. It raises ``argparse.ArgumentTypeError``,
which argparse prints as ``pdvoid <command>: error: argument --option: ...`` and exits with code 2. A quantity
written without a unit (``--test-voltage 18``) is refused: the message suggests the unit, because a bare number
read as volts would turn an 18 kV test into an 18 V one.
"""

from __future__ import annotations

import argparse
import math
import re
from collections.abc import Callable

from pdvoid.core.errors import InputError
from pdvoid.core.units import parse_quantity

__all__ = ["QUANTITY_EXAMPLES", "quantity", "list_quantity", "voltage", "charge", "time", "frequency", "angle",
           "phase_angle", "integer", "number", "seed", "QuantityConverter"]

#: dimension → (a unit, another unit, the number in the second per one of the first, the SI unit): the
#: suggestion of a refusal, e.g. 18 → "18kV or 18000V"
QUANTITY_EXAMPLES: dict[str, tuple[str, str, float, str]] = {
    "voltage": ("kV", "V", 1e3, "V"),
    "charge": ("pC", "C", 1e-12, "C"),
    "time": ("s", "ms", 1e3, "s"),
    "frequency": ("Hz", "kHz", 1e-3, "Hz"),
    "angle": ("deg", "rad", math.pi / 180.0, "deg"),
    "length": ("mm", "m", 1e-3, "m"),
    "pressure": ("kPa", "Pa", 1e3, "Pa"),
    "capacitance": ("pF", "nF", 1e-3, "F"),
}

_BARE_NUMBER = re.compile(r"^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*$|^\s*[-+]?(inf|infinity|nan)\s*$",
                          re.IGNORECASE)


class QuantityConverter:
    """An ``argparse`` ``type=`` that reads a quantity with a unit and returns it in SI.

    Parameters
    ----------
    dimension : str
        A dimension of :func:`pdvoid.core.units.parse_quantity` (``"voltage"``, ``"charge"``, ...).
    minimum : float
        The smallest value allowed [SI].
    allow_zero : bool
        Whether ``minimum`` itself (typically 0) is allowed [-].
    maximum : float or None
        The largest value allowed [SI]; None for no bound.
    """

    def __init__(self, dimension: str, minimum: float = 0.0, allow_zero: bool = False,
                 maximum: float | None = None) -> None:
        self.dimension = dimension
        self.minimum = minimum
        self.allow_zero = allow_zero
        self.maximum = maximum
        self.__name__ = dimension  # argparse names the converter in "invalid <name> value" messages

    def __call__(self, text: str) -> float:
        """Read ``text``.

        Parameters
        ----------
        text : str
            The option's value, e.g. ``"18kV"`` [-].

        Returns
        -------
        float
            The value [SI].

        Raises
        ------
        argparse.ArgumentTypeError
            For a bare number, a wrong unit, NaN or infinity, or a value below the allowed range.
        """
        if _BARE_NUMBER.match(text):
            raise argparse.ArgumentTypeError(f"{text.strip()!r} has no unit; write it with one, e.g. "
                                             f"{self.suggestion(text)}")
        try:
            value = parse_quantity(text, self.dimension, name=repr(text))
        except InputError as exc:
            raise argparse.ArgumentTypeError(str(exc)) from None
        if not math.isfinite(value):
            raise argparse.ArgumentTypeError(f"{text!r} must be a finite {self.dimension}")
        if value < self.minimum or (value == self.minimum and not self.allow_zero):
            bound = "at least" if self.allow_zero else "greater than"
            raise argparse.ArgumentTypeError(f"{text!r} must be {bound} {self.minimum:g} "
                                             f"{QUANTITY_EXAMPLES.get(self.dimension, ('', '', 1.0, 'SI'))[3]}")
        if self.maximum is not None and value > self.maximum:
            raise argparse.ArgumentTypeError(f"{text!r} must be at most {self.maximum:g} "
                                             f"{QUANTITY_EXAMPLES.get(self.dimension, ('', '', 1.0, 'SI'))[3]}")
        return value

    def suggestion(self, text: str) -> str:
        """Two ways to write the bare number ``text`` with a unit, e.g. ``"18kV or 18000V"``.

        Parameters
        ----------
        text : str
            The bare number as typed [-].

        Returns
        -------
        str
            The suggestion [-].
        """
        first, second, factor, _ = QUANTITY_EXAMPLES.get(self.dimension, ("", "", 1.0, ""))
        try:
            x = float(text)
        except ValueError:
            x = math.nan
        if not first:
            return "a value with its unit"
        if not math.isfinite(x):
            return f"1{first} or {factor:g}{second}"
        return f"{x:g}{first} or {x * factor:g}{second}"


def quantity(dimension: str, minimum: float = 0.0, allow_zero: bool = False,
             maximum: float | None = None) -> QuantityConverter:
    """A converter for a quantity of ``dimension`` that must be written with a unit.

    Parameters
    ----------
    dimension : str
        A dimension of :func:`pdvoid.core.units.parse_quantity` [-].
    minimum : float
        The smallest value allowed [SI].
    allow_zero : bool
        Whether ``minimum`` itself is allowed [-].
    maximum : float or None
        The largest value allowed [SI]; None for no bound.

    Returns
    -------
    QuantityConverter
        The converter, for ``argparse``'s ``type=``.
    """
    return QuantityConverter(dimension, minimum, allow_zero, maximum)


#: a positive voltage with a unit, e.g. ``18kV`` [V]
voltage = quantity("voltage")
#: a charge ≥ 0 with a unit, e.g. ``5pC`` [C]
charge = quantity("charge", allow_zero=True)
#: a positive time with a unit, e.g. ``1s`` [s]
time = quantity("time")
#: a positive frequency with a unit, e.g. ``50Hz`` [Hz]
frequency = quantity("frequency")
#: an angle ≥ 0 with a unit, e.g. ``2deg`` [deg]
angle = quantity("angle", allow_zero=True)
#: a phase resolution from 0 to 360 deg with a unit, e.g. ``2deg`` [deg]
phase_angle = quantity("angle", allow_zero=True, maximum=360.0)


def integer(minimum: int = 0, maximum: int | None = None) -> Callable[[str], int]:
    """A converter for a whole number in [``minimum``, ``maximum``] (counts, seeds, bins).

    Parameters
    ----------
    minimum : int
        The smallest value allowed [-].
    maximum : int, optional
        The largest value allowed [-].

    Returns
    -------
    callable
        ``str`` → ``int``, raising ``argparse.ArgumentTypeError`` outside the range.
    """
    def convert(text: str) -> int:
        try:
            if len(text) > 40:
                raise ValueError(text)
            value = int(text.strip())
        except ValueError:
            raise argparse.ArgumentTypeError(f"{text!r} is not a whole number") from None
        if value < minimum or (maximum is not None and value > maximum):
            allowed = f"from {minimum} to {maximum}" if maximum is not None else f"at least {minimum}"
            raise argparse.ArgumentTypeError(f"{text!r} is out of range; allowed: a whole number {allowed}")
        return value

    convert.__name__ = "integer"
    return convert


def _seed_converter() -> Callable[[str], int]:
    convert = integer(0, 2**32 - 1)
    convert.__name__ = "seed"
    return convert


#: a seed of the random generator: a whole number from 0 to 2**32 - 1 [-]
seed = _seed_converter()


def number(minimum: float = 0.0, maximum: float | None = None) -> Callable[[str], float]:
    """A converter for a finite pure number in [``minimum``, ``maximum``] (ratios, fractions).

    Parameters
    ----------
    minimum : float
        The smallest value allowed [-].
    maximum : float, optional
        The largest value allowed [-].

    Returns
    -------
    callable
        ``str`` → ``float``, raising ``argparse.ArgumentTypeError`` for NaN, infinity or a value outside the
        range.
    """
    def convert(text: str) -> float:
        try:
            value = float(text.strip())
        except ValueError:
            raise argparse.ArgumentTypeError(f"{text!r} is not a number") from None
        if not math.isfinite(value):
            raise argparse.ArgumentTypeError(f"{text!r} must be a finite number")
        if value < minimum or (maximum is not None and value > maximum):
            allowed = f"from {minimum:g} to {maximum:g}" if maximum is not None else f"at least {minimum:g}"
            raise argparse.ArgumentTypeError(f"{text!r} is out of range; allowed: a number {allowed}")
        return value

    convert.__name__ = "number"
    return convert


def list_quantity(text: str, dimension: str, name: str) -> float:
    """One item of a list option (``--values``, ``--vary``): a unit is required unless ``dimension`` is
    ``"dimensionless"``.

    Parameters
    ----------
    text : str
        The item, e.g. ``"0.5mm"`` [-].
    dimension : str
        A dimension of :func:`pdvoid.core.units.parse_quantity` [-].
    name : str
        The option, for the message [-].

    Returns
    -------
    float
        The value [SI].

    Raises
    ------
    pdvoid.InputError
        For a bare number where a unit is needed, or text :func:`~pdvoid.core.units.parse_quantity` refuses.
    """
    if dimension != "dimensionless" and _BARE_NUMBER.match(text):
        raise InputError(f"{name}: {text.strip()!r} has no unit; write it with one, e.g. "
                         f"{QuantityConverter(dimension).suggestion(text)}")
    return parse_quantity(text, dimension, name=name)
