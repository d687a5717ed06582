"""Scenario files: TOML whose quantities may carry units ("1.2 mm", "12 kV", "50 Hz", "1 atm", "0.1 pF", "1 cm2").

Any unit pint knows is accepted when its dimension fits the key (:func:`pdvoid.core.units.parse_quantity`);
files written by pdvoid carry SI units.

Layout (every key optional unless the class requires it; bare numbers are SI)::

    name = "..."
    [insulation]   kind = "slab" (default) | "coaxial"; slab: thickness, permittivity, material, area,
                   dielectric_strength, conductivity (S/m); coaxial: inner_radius, outer_radius, permittivity,
                   material, dielectric_strength
    [void]         diameter, height, pressure, gas, temperature, shape, inception_length, radial_position
                   (coaxial only), surface_conductivity (S)
    [supply]       kind = "sine" | "periodic" | "dc" | "polarity_reversal" | "piecewise_linear" | "square_wave"
                   | "cosine_rectangular"; sine: rms, frequency, harmonics = [[order, fraction, phase_deg]]
                   periodic: samples (V, one period), frequency, max_harmonic
                   dc: voltage, ripple = [[order, fraction, phase_deg]], ripple_frequency, rise_time
                   polarity_reversal: voltage, hold_time, ramp_time, reversals, rise_time, ripple,
                   ripple_frequency; piecewise_linear: times (s), voltages (V)
    [model]        kind = "field" | "network"; residual_ratio, lag_free, ionization_rate, electron_yield,
                   surface_rate_same, surface_rate_reversed, surface_decay_time, field_assisted,
                   charge_decay_time, inception_criterion; network: capacitance_void, capacitance_series
    [document]     revision, author, checker, approver (the review pack's document control; optional)
    [acceptance]   charge, voltage_factor (the review pack's acceptance criterion; optional)

The [document] and [acceptance] tables are not part of the Scenario: :func:`read_review_settings` reads them
(:mod:`pdvoid.inputs.document`); they are checked, with unknown keys refused, whenever the file is read.
"""

from __future__ import annotations

import dataclasses
import math
import os
from dataclasses import fields
from pathlib import Path
from typing import TYPE_CHECKING, Any

from pdvoid.core.errors import InputError
from pdvoid.core.files import atomic_write, read_toml_bytes, read_toml_file
from pdvoid.core.limits import MAX_TEXT_FILE_BYTES
from pdvoid.core.units import parse_quantity
from pdvoid.inputs.coaxial import Coaxial
from pdvoid.inputs.document import AcceptanceCriterion, DocumentControl, acceptance_from_dict, document_from_dict
from pdvoid.inputs.geometries import insulation_class, insulation_kind
from pdvoid.inputs.model_parameters import model_class, model_kinds
from pdvoid.inputs.parameters import Insulation, Periodic, Sine, Void
from pdvoid.inputs.supplies import TimeSupply, supply_class, supply_kinds

if TYPE_CHECKING:
    from pdvoid.inputs.scenario import Scenario

__all__ = ["read_scenario_parts", "parts_from_dict", "scenario_to_dict", "write_scenario_file", "field_schema",
           "quantity_value", "read_review_settings"]

MAX_FILE_BYTES = MAX_TEXT_FILE_BYTES  #: largest scenario file [bytes] (see pdvoid.core.limits)

# key -> (dimension, SI unit written to files); None dimension = not a quantity (text, bool, list)
_DIMS: dict[str, dict[str, tuple[str | None, str]]] = {
    "insulation": {"thickness": ("length", "m"), "permittivity": ("dimensionless", ""),
                   "material": (None, ""), "area": ("area", "m2"),
                   "dielectric_strength": ("field", "V/m"), "conductivity": ("conductivity", "S/m")},
    "void": {"diameter": ("length", "m"), "height": ("length", "m"), "pressure": ("pressure", "Pa"),
             "gas": (None, ""), "temperature": ("temperature", "K"), "shape": (None, ""),
             "inception_length": ("length", "m"), "position": (None, ""),
             "radial_position": ("length", "m"),
             "field_enhancement": ("dimensionless", ""), "charge_per_field": ("charge per field", "C/(V/m)"),
             "sealed": (None, ""), "fill_temperature": ("temperature", "K"),
             "secondary_emission": ("dimensionless", ""), "surface_conductivity": ("conductance", "S")},
    "sine": {"rms": ("voltage", "V"), "frequency": ("frequency", "Hz"), "harmonics": (None, "")},
    "periodic": {"samples": (None, ""), "frequency": ("frequency", "Hz"), "max_harmonic": (None, "")},
}


#: keys written only when not zero (their default), so files of lossless scenarios read as before
_OMIT_WHEN_ZERO = ("conductivity", "surface_conductivity")


#: keys of a coaxial insulation that a plane slab does not have
_COAXIAL_DIMS: dict[str, tuple[str | None, str]] = {"inner_radius": ("length", "m"), "outer_radius": ("length", "m")}


def _insulation_schema(cls: type) -> dict[str, tuple[str | None, str]]:
    """The [insulation] keys of an insulation class: the slab's, or the coaxial ones (no thickness or area)."""
    if issubclass(cls, Coaxial):
        return {**{k: v for k, v in _DIMS["insulation"].items() if k not in ("thickness", "area")}, **_COAXIAL_DIMS}
    return dict(_DIMS["insulation"])


def field_schema(part: str, obj: Any) -> dict[str, tuple[str | None, str]]:
    """The scenario-file schema of one part: field name to (dimension, SI unit as written in files).

    Parameters
    ----------
    part : str
        ``"insulation"``, ``"void"``, ``"supply"`` or ``"model"``.
    obj : object
        The part itself (the supply's and the model's schema depend on their kind).

    Returns
    -------
    dict
        Field name to (dimension or None for text, flags and lists; SI unit).
    """
    if part == "model":
        return dict(obj.field_units)
    if part == "supply":
        if isinstance(obj, TimeSupply):
            return dict(obj.field_units)
        return dict(_DIMS["sine" if isinstance(obj, Sine) else "periodic"])
    if part == "insulation":
        return _insulation_schema(type(obj))
    if part not in _DIMS:
        raise InputError(f"the part must be insulation, void, supply or model; got {part!r}")
    return dict(_DIMS[part])


def quantity_value(value: float | str, dim: str, where: str) -> float:
    """A quantity from a file: a number (SI) or text with a unit of dimension ``dim``, as an SI float.

    Parameters
    ----------
    value : float or str
        E.g. ``1.2e-3`` or ``"1.2 mm"``.
    dim : str
        The dimension required (``"length"``, ``"pressure"``, ...).
    where : str
        What to name in an error.

    Returns
    -------
    float
        The value in SI units.
    """
    return parse_quantity(value, dim, name=where)


def _section(data: dict, key: str, schema: dict, source: str) -> dict:
    sec = data.get(key, {})
    if not isinstance(sec, dict):
        raise InputError(f"{source}: [{key}] must be a table")
    out = {}
    for k, v in sec.items():
        if k == "kind" and key in ("supply", "model", "insulation"):
            continue
        if k not in schema:
            raise InputError(f"{source}: unknown key {key}.{k}; allowed: {', '.join(sorted(schema))}")
        dim, _ = schema[k]
        out[k] = quantity_value(v, dim, f"{source}: {key}.{k}") if dim is not None else v
    return out


def parts_from_dict(data: dict, *, source: str = "scenario") -> dict[str, Any]:
    """The parts of a scenario (insulation, void, supply, model, name) from the dictionary form of a scenario
    file, each constructed and validated.

    Parameters
    ----------
    data : dict
        The parsed TOML document.
    source : str
        What to name in error messages (a file name).

    Returns
    -------
    dict
        Keyword arguments of :class:`pdvoid.Scenario`.
    """
    try:
        return _from_dict(data, source)
    except InputError as exc:
        if str(exc).startswith(source):
            raise
        raise InputError(f"{source}: {exc}") from None


def _from_dict(data: dict, source: str) -> dict[str, Any]:
    if not isinstance(data, dict):
        raise InputError(f"{source}: a scenario must be a table")
    unknown = set(data) - {"name", "insulation", "void", "supply", "model", "document", "acceptance"}
    if unknown:
        raise InputError(f"{source}: unknown top-level keys {sorted(unknown)}; allowed: name, insulation, void, "
                         "supply, model, document, acceptance")
    if isinstance(data.get("void"), list):
        raise InputError(f"{source}: the file holds an array of [[void]] tables (several voids); read it with "
                         "pdvoid.MultiVoidScenario.from_file, or give one [void] table")
    document_from_dict(data, source=source)  # not part of the Scenario, but checked whenever the file is read
    acceptance_from_dict(data, source=source)
    for part in ("insulation", "void", "supply"):
        if part not in data:
            raise InputError(f"{source}: missing [{part}] table")
    isec = data["insulation"]
    ins_cls = insulation_class(isec.get("kind", "slab")) if isinstance(isec, dict) else Insulation
    ins = _build(ins_cls, _section(data, "insulation", _insulation_schema(ins_cls), source), "insulation", source)
    void = _build(Void, _section(data, "void", _DIMS["void"], source), "void", source)
    sup = data["supply"]
    kind = sup.get("kind", "sine") if isinstance(sup, dict) else None
    if kind == "sine":
        kw = _section(data, "supply", _DIMS["sine"], source)
        if "harmonics" in kw:
            h = kw["harmonics"]
            if not isinstance(h, list):
                raise InputError(f"{source}: supply.harmonics must be a list of [order, fraction, phase_deg]")
            kw["harmonics"] = tuple(tuple(x) if isinstance(x, list) else x for x in h)
        supply: Sine | Periodic | TimeSupply = _build(Sine, kw, "supply", source)
    elif kind == "periodic":
        kw = _section(data, "supply", _DIMS["periodic"], source)
        supply = _build(Periodic, kw, "supply", source)
    elif kind in supply_kinds():
        scls = supply_class(kind)
        kw = _section(data, "supply", scls.field_units, source)
        if "ripple" in kw:
            r = kw["ripple"]
            if not isinstance(r, list):
                raise InputError(f"{source}: supply.ripple must be a list of [order, fraction, phase_deg]")
            kw["ripple"] = tuple(tuple(x) if isinstance(x, list) else x for x in r)
        supply = _build(scls, kw, "supply", source)
    else:
        allowed = ", ".join(repr(k) for k in ("sine", "periodic", *supply_kinds()))
        raise InputError(f"{source}: supply.kind must be one of {allowed}; got {kind!r}")
    mod = data.get("model", {})
    mkind = mod.get("kind", model_kinds()[0]) if isinstance(mod, dict) else None
    try:
        cls = model_class(mkind)
    except InputError as exc:
        raise InputError(f"{source}: {exc}") from None
    kw = _section(data, "model", cls.field_units, source)
    return {"insulation": ins, "void": void, "supply": supply, "model": _build(cls, kw, "model", source),
            "name": data.get("name", "")}


def _build(cls: Any, kw: dict[str, Any], part: str, source: str) -> Any:
    """``cls(**kw)`` with every required field present: a missing one is named, not a TypeError."""
    missing = [f.name for f in dataclasses.fields(cls) if f.init and f.name not in kw
               and f.default is dataclasses.MISSING and f.default_factory is dataclasses.MISSING]
    if missing:
        raise InputError(f"{source}: missing key {part}.{missing[0]} (required in [{part}]: "
                         f"{', '.join(part + '.' + m for m in missing)})")
    return cls(**kw)


def read_scenario_parts(path: str | os.PathLike[str]) -> dict[str, Any]:
    """Read a TOML scenario file into the keyword arguments of :class:`pdvoid.Scenario`.

    Parameters
    ----------
    path : str or os.PathLike
        The file.

    Returns
    -------
    dict
        insulation, void, supply, model and name, each validated. Errors name the file and the key (TOML syntax
        errors: line and column).
    """
    p = Path(path) if isinstance(path, (str, os.PathLike)) else path
    try:
        data = read_toml_file(p, MAX_FILE_BYTES, "scenario file")
    except InputError:
        raise
    except ValueError as exc:  # e.g. an integer of more digits than Python converts (int_max_str_digits)
        raise InputError(f"{p}: malformed TOML (the scenario file is not valid TOML): {exc}") from None
    return parts_from_dict(data, source=str(p))


def read_review_settings(
    path: str | os.PathLike[str],
) -> tuple[DocumentControl, AcceptanceCriterion | None, bytes]:
    """The review-pack settings of a scenario file: its [document] and [acceptance] tables, and the file's bytes
    as read (for the pack's SHA-256, so that the hash is that of the text the settings came from).

    Parameters
    ----------
    path : str or os.PathLike
        The scenario file.

    Returns
    -------
    tuple
        (DocumentControl, AcceptanceCriterion or None, the file's content as bytes).

    Raises
    ------
    pdvoid.InputError
        For a file that cannot be read or is not valid TOML, and for an unknown key or bad value in either
        table, naming the file and the key.
    """
    data, raw = read_toml_bytes(path, MAX_FILE_BYTES, "scenario file")
    p = Path(path)
    return document_from_dict(data, source=str(p)), acceptance_from_dict(data, source=str(p)), raw


def _q(value: float | None, unit: str) -> Any:
    if value is None:
        return None
    if unit == "":
        return value
    return f"{value!r} {unit}" if math.isfinite(value) else f"inf {unit}"


def scenario_to_dict(s: Scenario) -> dict[str, Any]:
    """The dictionary form of a scenario: quantities as exact strings with SI units (round-trips bit for bit).

    Parameters
    ----------
    s : pdvoid.Scenario
        The scenario.

    Returns
    -------
    dict
        The TOML document as a dictionary.
    """
    out: dict[str, Any] = {"name": s.name}
    for part, obj, schema in (("insulation", s.insulation, _insulation_schema(type(s.insulation))),
                              ("void", s.void, _DIMS["void"])):
        out[part] = {}
        if part == "insulation" and isinstance(obj, Coaxial):
            out[part]["kind"] = insulation_kind(obj)
        for f in fields(obj):
            v = getattr(obj, f.name)
            if v is None or not f.init or (f.name in _OMIT_WHEN_ZERO and v == 0.0):
                continue
            dim, unit = schema[f.name]
            out[part][f.name] = _q(v, unit) if dim is not None and unit else v
    if isinstance(s.supply, TimeSupply):
        sup = s.supply
        out["supply"] = {"kind": sup.kind}
        for f in fields(sup):  # type: ignore[arg-type]  # every registered supply is a dataclass
            v = getattr(sup, f.name)
            if v is None:
                continue
            dim, unit = sup.field_units[f.name]
            if f.name == "ripple":
                if v:
                    out["supply"]["ripple"] = [list(h) for h in v]
            elif dim is None and hasattr(v, "tolist"):
                out["supply"][f.name] = [float(x) for x in v]
            else:
                out["supply"][f.name] = _q(v, unit) if dim is not None and unit else v
    elif isinstance(s.supply, Sine):
        out["supply"] = {"kind": "sine", "rms": _q(s.supply.rms, "V"), "frequency": _q(s.supply.frequency, "Hz")}
        if s.supply.harmonics:
            out["supply"]["harmonics"] = [list(h) for h in s.supply.harmonics]
    else:
        out["supply"] = {"kind": "periodic", "samples": [float(x) for x in s.supply.samples],
                         "frequency": _q(s.supply.frequency, "Hz")}
        if s.supply.max_harmonic is not None:  # always set once the supply is constructed
            out["supply"]["max_harmonic"] = int(s.supply.max_harmonic)
    m = s.model
    out["model"] = {"kind": m.kind}
    for f in fields(m):
        v = getattr(m, f.name)
        if v is None:
            continue
        dim, unit = m.field_units[f.name]
        out["model"][f.name] = _q(v, unit) if dim is not None and unit else v
    return out


def write_scenario_file(s: Scenario, path: str | os.PathLike[str]) -> Path:
    """Write a TOML scenario file that :func:`pdvoid.inputs.scenario.read_scenario` restores exactly.

    Parameters
    ----------
    s : pdvoid.Scenario
        The scenario.
    path : str or os.PathLike
        The file to write.

    Returns
    -------
    pathlib.Path
        The file written.
    """
    import tomli_w

    p = Path(path)
    with atomic_write(p, "wb") as fh:
        tomli_w.dump(scenario_to_dict(s), fh)
    return p
