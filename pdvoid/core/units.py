"""Physical constants (CODATA 2018 via scipy.constants), display-unit factors and quantity parsing.

Inside pdvoid everything is SI. Non-SI units appear only at the edges (files, CLI, plots) and are converted here:
:func:`parse_quantity` accepts any unit the `pint <https://pint.readthedocs.io>`_ registry knows and checks its
dimension. The registry is created on first use, so ``import pdvoid`` does not import pint.
"""

from __future__ import annotations

import functools
import re
import threading
import tokenize
from typing import TYPE_CHECKING, Any

from scipy import constants as _c

from pdvoid.core.errors import InputError

if TYPE_CHECKING:
    import pint

__all__ = ["EPSILON_0", "ELEMENTARY_CHARGE", "BOLTZMANN", "ATM", "TORR", "T_ROOM", "UNITS", "DIMENSIONS",
           "MAX_QUANTITY_TEXT", "parse_quantity"]

EPSILON_0 = _c.epsilon_0  #: vacuum permittivity [F/m], CODATA 2018
ELEMENTARY_CHARGE = _c.e  #: [C], exact
BOLTZMANN = _c.k  #: [J/K], exact
ATM = _c.atm  #: standard atmosphere [Pa], exact 101325
TORR = _c.torr  #: [Pa] = 101325/760
T_ROOM = 293.15  #: reference temperature [K] used for gas data (20 degC), common practice

#: Display units for tables and plots: unit symbol -> (dimension, factor to SI). Parsing does not use this table
#: (it goes through pint); :mod:`pdvoid.io.columns` and the plots use it for the units they offer.
UNITS: dict[str, tuple[str, float]] = {
    # length
    "m": ("length", 1.0), "cm": ("length", 1e-2), "mm": ("length", 1e-3), "um": ("length", 1e-6),
    "µm": ("length", 1e-6),
    # voltage
    "V": ("voltage", 1.0), "kV": ("voltage", 1e3), "MV": ("voltage", 1e6),
    # field
    "V/m": ("field", 1.0), "kV/mm": ("field", 1e6), "kV/cm": ("field", 1e5), "MV/m": ("field", 1e6),
    # frequency
    "Hz": ("frequency", 1.0), "kHz": ("frequency", 1e3), "mHz": ("frequency", 1e-3),
    # pressure
    "Pa": ("pressure", 1.0), "kPa": ("pressure", 1e3), "MPa": ("pressure", 1e6), "bar": ("pressure", 1e5),
    "mbar": ("pressure", 1e2), "atm": ("pressure", ATM), "Torr": ("pressure", TORR),
    # temperature (K only multiplicative; degC has an offset)
    "K": ("temperature", 1.0),
    # time
    "s": ("time", 1.0), "ms": ("time", 1e-3), "us": ("time", 1e-6), "µs": ("time", 1e-6), "ns": ("time", 1e-9),
    # charge
    "C": ("charge", 1.0), "nC": ("charge", 1e-9), "pC": ("charge", 1e-12), "fC": ("charge", 1e-15),
    # angle
    "deg": ("angle", 1.0), "rad": ("angle", 57.29577951308232),
    # rates
    "1/s": ("rate", 1.0), "1/(m3 s)": ("rate density", 1.0), "1/(cm3 s)": ("rate density", 1e6),
    # dimensionless
    "": ("dimensionless", 1.0), "%": ("dimensionless", 1e-2),
}

#: dimension name -> (pint unit the value is returned in, example units for error messages). The returned unit
#: is SI except for ``"angle"``, which comes back in degrees (pdvoid's edge unit for phase).
DIMENSIONS: dict[str, tuple[str, str]] = {
    "length": ("m", "'1.2 mm', '1200 um', '0.12 cm'"),
    "area": ("m**2", "'1 cm2', '1 cm^2', '100 mm2'"),
    "voltage": ("V", "'18 kV', '500 V'"),
    "field": ("V/m", "'2 kV/mm', '30 kV/cm', '3e6 V/m'"),
    "frequency": ("Hz", "'50 Hz', '1 kHz'"),
    "pressure": ("Pa", "'1 atm', '101.3 kPa', '1 bar', '760 Torr', '14.7 psi'"),
    "temperature": ("K", "'293.15 K', '20 degC', '20 °C'"),
    "time": ("s", "'3 us', '3 µs', '20 ms', '1 s'"),
    "charge": ("C", "'10 pC', '1 nC'"),
    "capacitance": ("F", "'0.1 pF', '1e-13 F'"),
    "charge per field": ("C/(V/m)", "'1e-18 C/(V/m)', '1e-12 pC/(V/m)', '1 pC/(kV/mm)'"),
    "angle": ("degree", "'90 deg', '1.57 rad'"),
    "rate": ("1/s", "'100 1/s', '0.1 1/ms'"),
    "rate density": ("1/(m**3 * s)", "'2e6 1/(m3 s)', '2 1/(cm3 s)'"),
    "dimensionless": ("dimensionless", "'0.3', '30 %'"),
    "conductivity": ("S/m", "'1e-14 S/m', '1e-12 S/cm'"),
    "conductance": ("S", "'1e-15 S', '1 fS'"),
}

#: longest quantity text accepted (a scenario value or CLI option, never a document)
MAX_QUANTITY_TEXT = 100

# A decimal number (no NaN; "inf" is allowed, e.g. for a decay time that never ends), then an optional unit.
_NUMBER = r"[-+]?(?:(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?|inf)"
_QUANTITY = re.compile(rf"^\s*({_NUMBER})\s*(\S.*?)?\s*$")
# Characters a unit expression may contain: letters (including µ, μ, °), digits, powers, products and quotients.
_UNIT_TEXT = re.compile(r"^[A-Za-z0-9_µμ°%²³·*/^()., -]+$")
# "cm2", "m3" -> "cm**2", "m**3" (an exponent written straight after the unit symbol)
_TRAILING_POWER = re.compile(r"(?<=[A-Za-zµμ])(\d+)(?![\w.])")

_registry: pint.UnitRegistry[Any] | None = None
_registry_lock = threading.Lock()  # one registry per process: units of two registries cannot be combined


def _unit_registry() -> pint.UnitRegistry[Any]:
    """The pint registry, created (and pint imported) on first use."""
    global _registry
    with _registry_lock:
        if _registry is None:
            import pint

            reg: pint.UnitRegistry[Any] = pint.UnitRegistry()
            reg.define("Torr = torr")  # the symbol used in SI documents; pint knows only the lower-case name
            _registry = reg
        return _registry


@functools.lru_cache(maxsize=256)
def _parse_unit(unit: str) -> pint.Unit:
    """A unit expression as a pint unit (cached: scenario files repeat the same few units)."""
    reg = _unit_registry()
    expression = _TRAILING_POWER.sub(r"**\1", unit.replace("·", "*").replace("²", "**2").replace("³", "**3"))
    return reg.parse_units(expression)


def _allowed(dimension: str) -> str:
    target, examples = DIMENSIONS[dimension]
    bare = "a bare number" if dimension == "dimensionless" else f"a bare number in {target}"
    return f"a {dimension!r} quantity such as {examples}, or {bare}"


def parse_quantity(text: float | str, dimension: str, *, name: str = "value") -> float:
    """Turn ``12``, ``"12 kV"``, ``"1 atm"`` or ``"20 degC"`` into an SI float of the given dimension.

    Any unit the pint registry knows is accepted, provided its dimension matches: ``"0.1 pF"``, ``"1 cm2"``,
    ``"2 kV/mm"``, ``"7 psi"``, ``"0.5 Torr"``, ``"3 µs"``. A bare number (or a number without a unit) is taken as
    SI. Nothing is evaluated as Python.

    Parameters
    ----------
    text : float or str
        A number (taken as SI) or a number followed by a unit, at most :data:`MAX_QUANTITY_TEXT` characters. The
        number may be ``inf`` (e.g. a charge decay time that never ends) but not NaN. Booleans are refused.
    dimension : str
        One of the keys of :data:`DIMENSIONS`: ``"length"``, ``"area"``, ``"voltage"``, ``"field"``,
        ``"frequency"``, ``"pressure"``, ``"temperature"``, ``"time"``, ``"charge"``, ``"capacitance"``,
        ``"charge per field"``, ``"angle"``, ``"rate"``, ``"rate density"``, ``"conductivity"``, ``"conductance"``
        or ``"dimensionless"`` (which also takes ``"%"``).
    name : str
        What to name in an error message (a parameter, option or file key).

    Returns
    -------
    float
        The value in SI units of ``dimension``; angles in degrees [deg] (pdvoid's edge unit for phase).

    Raises
    ------
    pdvoid.InputError
        For a boolean or another non-number, over-long text, text that is not a number optionally followed by a
        unit, an unknown unit, or a unit of another dimension; the message names ``name``, the value and what is
        allowed.
    """
    if dimension not in DIMENSIONS:
        raise InputError(f"dimension must be one of {', '.join(map(repr, DIMENSIONS))}; got {dimension!r}")
    if isinstance(text, bool) or not isinstance(text, (int, float, str)):
        raise InputError(f"{name} must be a number or a quantity string like '1.2 mm'; got {text!r}")
    if isinstance(text, (int, float)):
        try:
            return float(text)
        except OverflowError:
            raise InputError(f"{name} is too large a number to be a quantity; got an integer of "
                             f"{len(str(abs(text)))} digits") from None
    if len(text) > MAX_QUANTITY_TEXT:
        raise InputError(f"{name}: quantity text longer than {MAX_QUANTITY_TEXT} characters: {text[:40]!r}...")
    m = _QUANTITY.match(text)
    if not m:
        raise InputError(f"{name} must be a number optionally followed by a unit, like '1.2 mm'; got {text!r}")
    number = float(m.group(1))
    unit = (m.group(2) or "").strip()
    if not unit:
        return number
    if not _UNIT_TEXT.match(unit):
        raise InputError(f"{name}: {unit!r} in {text!r} is not a unit expression; expected {_allowed(dimension)}")
    import pint

    try:
        parsed = _parse_unit(unit)
    except pint.UndefinedUnitError:
        raise InputError(f"{name}: unknown unit {unit!r} in {text!r}; expected {_allowed(dimension)}") from None
    # pint's unit parser reports malformed expressions through several exception types; all mean "not a unit"
    except (pint.PintError, ValueError, TypeError, AttributeError, AssertionError, SyntaxError,
            tokenize.TokenError):
        raise InputError(f"{name}: cannot read the unit {unit!r} in {text!r}; expected {_allowed(dimension)}") \
            from None
    reg = _unit_registry()
    target = reg.parse_units(DIMENSIONS[dimension][0])
    # pint counts angles as dimensionless; tell them apart by the radian in the root units
    is_angle = "radian" in str(reg.get_root_units(parsed)[1])
    wants_angle = dimension == "angle"
    if parsed.dimensionality != target.dimensionality or is_angle != wants_angle:
        raise InputError(f"{name}: the unit {unit!r} in {text!r} does not have the dimension {dimension!r}; "
                         f"expected {_allowed(dimension)}")
    try:
        return float(reg.Quantity(number, parsed).to(target).magnitude)
    except pint.PintError:  # e.g. an offset unit inside a product ("degC/s" never reaches here; "degC**2" would)
        raise InputError(f"{name}: cannot convert {text!r} to {DIMENSIONS[dimension][0]}; expected "
                         f"expected {_allowed(dimension)}") from None
