"""Scenario files: TOML whose quantities may carry units ("1.2 mm", "12 kV", "50 Hz", "1 atm").

Layout (every key optional unless the class requires it; bare numbers are SI)::

    name = "..."
    [insulation]   thickness, permittivity, material, area
    [void]         diameter, height, pressure, gas, temperature, shape, inception_length
    [supply]       kind = "sine" | "periodic"; sine: rms, frequency, harmonics = [[order, fraction, phase_deg]]
                   periodic: samples (V, one period), frequency, max_harmonic
    [model]        kind = "field" | "network"; residual_ratio, lag_free, ionization_rate, electron_yield,
                   surface_rate_same, surface_rate_reversed, surface_decay_time, field_assisted,
                   charge_decay_time, inception_criterion; network: capacitance_void, capacitance_series
"""

from __future__ import annotations

import math
import os
import tomllib
from dataclasses import fields
from pathlib import Path
from typing import Any

from .errors import InputError
from .parameters import FieldModel, Insulation, NetworkModel, Periodic, Sine, Void
from .scenario import Scenario
from .units import parse_quantity

__all__ = ["read_scenario", "write_scenario", "scenario_to_dict", "scenario_from_dict"]

MAX_FILE_BYTES = 1_000_000

# key -> (dimension, SI unit written to files); None dimension = not a quantity (text, bool, list)
_DIMS: dict[str, dict[str, tuple[str | None, str]]] = {
    "insulation": {"thickness": ("length", "m"), "permittivity": ("dimensionless", ""),
                   "material": (None, ""), "area": ("area", "m2")},
    "void": {"diameter": ("length", "m"), "height": ("length", "m"), "pressure": ("pressure", "Pa"),
             "gas": (None, ""), "temperature": ("temperature", "K"), "shape": (None, ""),
             "inception_length": ("length", "m"), "position": (None, ""),
             "field_enhancement": ("dimensionless", ""), "charge_per_field": ("charge per field", "C/(V/m)")},
    "sine": {"rms": ("voltage", "V"), "frequency": ("frequency", "Hz"), "harmonics": (None, "")},
    "periodic": {"samples": (None, ""), "frequency": ("frequency", "Hz"), "max_harmonic": (None, "")},
    "model": {"residual_ratio": ("dimensionless", ""), "lag_free": (None, ""),
              "ionization_rate": ("rate density", "1/(m3 s)"), "electron_yield": ("dimensionless", ""),
              "surface_rate_same": ("rate", "1/s"), "surface_rate_reversed": ("rate", "1/s"),
              "surface_decay_time": ("time", "s"), "field_assisted": (None, ""),
              "charge_decay_time": ("time", "s"), "inception_criterion": (None, ""),
              "capacitance_void": ("capacitance", "F"), "capacitance_series": ("capacitance", "F"),
              "cathode_emission_rate": ("rate", "1/s")},
}
_SI_ONLY = {"area": "m2", "capacitance": "F", "charge per field": "C/(V/m)"}


def _quantity(value: Any, dim: str, where: str) -> float:
    if dim in _SI_ONLY:
        if isinstance(value, str):
            text = value.strip()
            unit = _SI_ONLY[dim]
            if text.endswith(unit):
                text = text[: -len(unit)]
            try:
                return float(text)
            except ValueError:
                raise InputError(f"{where}: expected a number in {unit}; got {value!r}") from None
        return parse_quantity(value, "dimensionless", name=where)
    return parse_quantity(value, dim, name=where)


def _section(data: dict, key: str, schema: dict, source: str) -> dict:
    sec = data.get(key, {})
    if not isinstance(sec, dict):
        raise InputError(f"{source}: [{key}] must be a table")
    out = {}
    for k, v in sec.items():
        if k == "kind":
            continue
        if k not in schema:
            raise InputError(f"{source}: unknown key {key}.{k}; allowed: {', '.join(sorted(schema))}")
        dim, _ = schema[k]
        out[k] = _quantity(v, dim, f"{source}: {key}.{k}") if dim is not None else v
    return out


def scenario_from_dict(data: dict, *, source: str = "scenario") -> Scenario:
    """Build a Scenario from the dictionary form of a scenario file; errors start with ``source``."""
    try:
        return _from_dict(data, source)
    except InputError as exc:
        if str(exc).startswith(source):
            raise
        raise InputError(f"{source}: {exc}") from None


def _from_dict(data: dict, source: str) -> Scenario:
    if not isinstance(data, dict):
        raise InputError(f"{source}: a scenario must be a table")
    unknown = set(data) - {"name", "insulation", "void", "supply", "model"}
    if unknown:
        raise InputError(f"{source}: unknown top-level keys {sorted(unknown)}; allowed: name, insulation, void, "
                         "supply, model")
    for part in ("insulation", "void", "supply"):
        if part not in data:
            raise InputError(f"{source}: missing [{part}] table")
    ins = Insulation(**_section(data, "insulation", _DIMS["insulation"], source))
    void = Void(**_section(data, "void", _DIMS["void"], source))
    sup = data["supply"]
    kind = sup.get("kind", "sine") if isinstance(sup, dict) else None
    if kind == "sine":
        kw = _section(data, "supply", _DIMS["sine"], source)
        if "harmonics" in kw:
            h = kw["harmonics"]
            if not isinstance(h, list):
                raise InputError(f"{source}: supply.harmonics must be a list of [order, fraction, phase_deg]")
            kw["harmonics"] = tuple(tuple(x) if isinstance(x, list) else x for x in h)
        supply: Sine | Periodic = Sine(**kw)
    elif kind == "periodic":
        kw = _section(data, "supply", _DIMS["periodic"], source)
        supply = Periodic(**kw)
    else:
        raise InputError(f"{source}: supply.kind must be 'sine' or 'periodic'; got {kind!r}")
    mod = data.get("model", {})
    mkind = mod.get("kind", "field") if isinstance(mod, dict) else None
    if mkind not in ("field", "network"):
        raise InputError(f"{source}: model.kind must be 'field' or 'network'; got {mkind!r}")
    schema = dict(_DIMS["model"])
    if mkind == "field":
        schema.pop("capacitance_void")
        schema.pop("capacitance_series")
    kw = _section(data, "model", schema, source)
    model = FieldModel(**kw) if mkind == "field" else NetworkModel(**kw)
    return Scenario(insulation=ins, void=void, supply=supply, model=model, name=data.get("name", ""))


def read_scenario(path: str | os.PathLike) -> Scenario:
    """Read a TOML scenario file; errors name the file and the key (TOML syntax errors: line and column)."""
    p = Path(path)
    try:
        size = p.stat().st_size
        if size > MAX_FILE_BYTES:
            raise InputError(f"{p}: scenario file larger than {MAX_FILE_BYTES} bytes ({size})")
        text = p.read_text(encoding="utf-8")
    except OSError as exc:
        raise InputError(f"{p}: cannot read scenario file ({exc.strerror})") from None
    except UnicodeDecodeError as exc:
        raise InputError(f"{p}: not UTF-8 text ({exc.reason} at byte {exc.start})") from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"{p}: malformed TOML: {exc}") from None
    return scenario_from_dict(data, source=str(p))


def _q(value: float | None, unit: str) -> Any:
    if value is None:
        return None
    if unit == "":
        return value
    return f"{value!r} {unit}" if math.isfinite(value) else f"inf {unit}"


def scenario_to_dict(s: Scenario) -> dict:
    """The dictionary form of a scenario: quantities as exact strings with SI units (round-trips bit for bit)."""
    out: dict[str, Any] = {"name": s.name}
    for part, obj, schema in (("insulation", s.insulation, _DIMS["insulation"]), ("void", s.void, _DIMS["void"])):
        out[part] = {}
        for f in fields(obj):
            v = getattr(obj, f.name)
            if v is None:
                continue
            dim, unit = schema[f.name]
            out[part][f.name] = _q(v, unit) if dim is not None and unit and dim not in _SI_ONLY else v
    if isinstance(s.supply, Sine):
        out["supply"] = {"kind": "sine", "rms": _q(s.supply.rms, "V"), "frequency": _q(s.supply.frequency, "Hz")}
        if s.supply.harmonics:
            out["supply"]["harmonics"] = [list(h) for h in s.supply.harmonics]
    else:
        out["supply"] = {"kind": "periodic", "samples": [float(x) for x in s.supply.samples],
                         "frequency": _q(s.supply.frequency, "Hz"), "max_harmonic": int(s.supply.max_harmonic)}
    m = s.model
    out["model"] = {"kind": "network" if isinstance(m, NetworkModel) else "field"}
    for f in fields(m):
        v = getattr(m, f.name)
        if v is None:
            continue
        dim, unit = _DIMS["model"][f.name]
        out["model"][f.name] = _q(v, unit) if dim is not None and unit else v
    return out


def write_scenario(s: Scenario, path: str | os.PathLike) -> Path:
    """Write a TOML scenario file that :func:`read_scenario` restores exactly."""
    import tomli_w

    p = Path(path)
    with open(p, "wb") as fh:
        tomli_w.dump(scenario_to_dict(s), fh)
    return p
