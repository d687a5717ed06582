"""Physical constants (CODATA 2018 via scipy.constants), display-unit factors and quantity parsing.

Inside pdvoid everything is SI. Non-SI units appear only at the edges (files, CLI, plots) and are converted here.
"""

from __future__ import annotations

import re

from scipy import constants as _c

from pdvoid.core.errors import InputError

__all__ = ["EPSILON_0", "ELEMENTARY_CHARGE", "BOLTZMANN", "ATM", "TORR", "T_ROOM", "UNITS", "parse_quantity"]

EPSILON_0 = _c.epsilon_0  #: vacuum permittivity [F/m], CODATA 2018
ELEMENTARY_CHARGE = _c.e  #: [C], exact
BOLTZMANN = _c.k  #: [J/K], exact
ATM = _c.atm  #: standard atmosphere [Pa], exact 101325
TORR = _c.torr  #: [Pa] = 101325/760
T_ROOM = 293.15  #: reference temperature [K] used for gas data (20 degC), common practice

# unit symbol -> (dimension, factor to SI). Offsets (degC) are handled separately.
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
    # temperature (K only multiplicative; degC handled below)
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

_NUMBER = r"[-+]?(?:(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?|inf)"
_QUANTITY = re.compile(rf"^\s*({_NUMBER})\s*(\S.*?)?\s*$")


def parse_quantity(text: object, dimension: str, *, name: str = "value") -> float:
    """Turn ``12``, ``"12 kV"``, ``"1 atm"`` or ``"20 degC"`` into an SI float of the given dimension.

    A bare number is taken as SI. A unit of another dimension, an unknown unit, or text that is not a number
    raises :class:`InputError` naming ``name``. Angles come back in degrees (pdvoid's edge unit for phase).
    """
    if isinstance(text, bool):
        raise InputError(f"{name} must be a number or a quantity string like '1.2 mm'; got {text!r}")
    if isinstance(text, (int, float)):
        return float(text)
    if not isinstance(text, str):
        raise InputError(f"{name} must be a number or a quantity string like '1.2 mm'; got {text!r}")
    if len(text) > 100:
        raise InputError(f"{name}: quantity text longer than 100 characters: {text[:40]!r}...")
    m = _QUANTITY.match(text)
    if not m:
        raise InputError(f"{name} must be a number optionally followed by a unit, like '1.2 mm'; got {text!r}")
    number = float(m.group(1))
    unit = (m.group(2) or "").strip()
    if dimension == "temperature" and unit in ("degC", "°C"):
        return number + 273.15
    if unit not in UNITS:
        allowed = sorted(u for u, (d, _) in UNITS.items() if d == dimension)
        raise InputError(f"{name}: unknown unit {unit!r} in {text!r}; allowed for {dimension}: {allowed}")
    dim, factor = UNITS[unit]
    if dim != dimension and not (unit == "" and dimension):
        allowed = sorted(u for u, (d, _) in UNITS.items() if d == dimension)
        raise InputError(f"{name}: unit {unit!r} is a {dim}, but a {dimension} is needed; allowed: {allowed}")
    return number * factor
