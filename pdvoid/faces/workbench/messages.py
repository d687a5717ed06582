"""The workbench's messages in the panel's units: an :class:`pdvoid.InputError` raised below the faces names SI
keys and values ("void.height must be smaller than insulation.thickness (0.006 m); got 0.008 m"); the panel
shows mm, kPa and kV, so its messages are rewritten to the panel's labels and units before they are shown.
"""

from __future__ import annotations

import re

__all__ = ["PANEL_KEYS", "panel_message"]

#: SI key of a scenario input → (the panel's label, SI unit, display unit, SI value per display unit)
PANEL_KEYS: dict[str, tuple[str, str, str, float]] = {
    "void.diameter": ("void diameter", "m", "mm", 1e-3),
    "void.height": ("void height", "m", "mm", 1e-3),
    "void.pressure": ("gas pressure", "Pa", "kPa", 1e3),
    "void.gas": ("gas in the void", "", "", 1.0),
    "insulation.thickness": ("insulation thickness", "m", "mm", 1e-3),
    "insulation.permittivity": ("relative permittivity", "", "", 1.0),
    "supply.rms": ("applied voltage", "V", "kV rms", 1e3),
    "supply.frequency": ("frequency", "Hz", "Hz", 1.0),
    "model.residual_ratio": ("residual / inception", "", "", 1.0),
    "model.ionization_rate": ("volume ionisation", "", "", 1.0),
    "model.surface_rate_same": ("surface, same", "1/s", "1/s", 1.0),
    "model.surface_rate_reversed": ("surface, reversed", "1/s", "1/s", 1.0),
    "model.surface_decay_time": ("surface decay time", "s", "ms", 1e-3),
    "model.capacitance_void": ("void capacitance C_c", "F", "pF", 1e-12),
    "model.capacitance_series": ("series capacitance C_b", "F", "pF", 1e-12),
}

# SI unit → (display unit, SI value per display unit) for numbers written with their unit
_UNITS = {"m": ("mm", 1e-3), "Pa": ("kPa", 1e3), "V": ("kV", 1e3), "s": ("ms", 1e-3), "F": ("pF", 1e-12)}
_NUM = r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?"
_KEY = re.compile("|".join(re.escape(k) for k in sorted(PANEL_KEYS, key=len, reverse=True)))
_INTERVAL = re.compile(rf"([\[(])({_NUM}|inf), ({_NUM}|inf)([\])]) ({'|'.join(_UNITS)})\b")
_WITH_UNIT = re.compile(rf"(?<![\w.])({_NUM}) ({'|'.join(_UNITS)})(?![\w/³²])")
_GOT = re.compile(rf"\bgot ({_NUM})(?![\d.eE+-])(?!\s*[A-Za-z])")


def _show(value: str, scale: float) -> str:
    if value == "inf":
        return value
    return f"{float(value) / scale:.6g}"


def panel_message(text: str) -> str:
    """``text`` with the SI keys replaced by the panel's labels and SI values by the panel's units (mm, kPa, kV
    rms, ms, pF); a message without SI keys or values is returned unchanged.

    Parameters
    ----------
    text : str
        An error message [-].

    Returns
    -------
    str
        The message as the panel shows it [-].
    """
    first = _KEY.search(text)
    lead = PANEL_KEYS[first.group(0)] if first else None

    def interval(m: re.Match[str]) -> str:
        unit, scale = _UNITS[m.group(5)]
        if lead is not None and lead[1] == m.group(5):
            unit = lead[2]
        return f"{m.group(1)}{_show(m.group(2), scale)}, {_show(m.group(3), scale)}{m.group(4)} {unit}"

    def with_unit(m: re.Match[str]) -> str:
        unit, scale = _UNITS[m.group(2)]
        if lead is not None and lead[1] == m.group(2):
            unit = lead[2]
        return f"{_show(m.group(1), scale)} {unit}"

    out = _INTERVAL.sub(interval, text)
    if lead is not None and lead[1] in _UNITS:  # a bare "got 0.008" after a key in m: the value in mm
        out = _GOT.sub(lambda m: f"got {_show(m.group(1), lead[3])} {lead[2]}", out)
    out = _WITH_UNIT.sub(with_unit, out)
    return _KEY.sub(lambda m: PANEL_KEYS[m.group(0)][0], out)
