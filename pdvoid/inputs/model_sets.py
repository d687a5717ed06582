"""Parameter sets of the void models, one per source: every value with its unit, source and status.

The built-in sets live in ``pdvoid/inputs/parameter_sets/model_sets.toml`` (``niemeyer1995`` for the wall-memory
model, ``field_defaults`` for today's field model exactly as its defaults). :func:`model_from_set` builds a model
from a set; values given as keywords replace the set's.
"""

from __future__ import annotations

import math
import os
from collections.abc import Mapping
from dataclasses import dataclass, fields
from functools import cache
from importlib import resources
from pathlib import Path
from types import MappingProxyType
from typing import Any

from pdvoid.core.errors import InputError
from pdvoid.core.references import REFERENCES
from pdvoid.inputs.materials import STATUSES, _read_toml
from pdvoid.inputs.model_parameters import ModelParameters, model_class

__all__ = ["SetValue", "ParameterSet", "load_model_sets", "list_parameter_sets", "get_parameter_set",
           "model_from_set", "sets_matching", "parameter_value_lines"]

SCHEMA = "pdvoid.model_sets/1"
_SET_KEYS = {"model", "description", "references"}
_VALUE_KEYS = {"value", "unit", "status", "source", "note"}


@dataclass(frozen=True)
class SetValue:
    """One value of a parameter set.

    Attributes
    ----------
    value : float or bool
        The value in SI [unit] (a bool for a switch of the model such as ``field_assisted``).
    unit : str
        Its SI unit ("" for a number).
    status : str
        ``confirmed``, ``derived``, ``from memory``, ``common practice`` or ``tuned`` (an illustrative value
        chosen to reproduce published trends, fitted to no measurement).
    source : str
        Where it comes from.
    note : str
        Further remarks ("" for none).
    """

    value: float | bool
    unit: str
    status: str
    source: str
    note: str = ""


@dataclass(frozen=True)
class ParameterSet:
    """A named set of model parameters from one source.

    Attributes
    ----------
    name : str
        Its name, e.g. ``"niemeyer1995"``.
    model : str
        The model kind it is for.
    description : str
        What it stands for.
    references : tuple of str
        Bibliography keys every run with the set cites.
    values : Mapping[str, SetValue]
        Parameter name to value.
    """

    name: str
    model: str
    description: str
    references: tuple[str, ...]
    values: Mapping[str, SetValue]

    def as_kwargs(self) -> dict[str, Any]:
        """The values as keyword arguments of the model class [SI].

        Returns
        -------
        dict
            Parameter name to value.
        """
        return {k: v.value for k, v in self.values.items()}

    def table(self) -> str:
        """A plain-text table of the values with unit, status and source.

        Returns
        -------
        str
            One line per value.
        """
        lines = [f"{self.name} ({self.model} model): {self.description}"]
        for k, v in self.values.items():
            shown = str(v.value).lower() if isinstance(v.value, bool) else f"{v.value:g}"
            lines.append(f"  {k} = {shown} {v.unit}  [{v.status}] {v.source}".rstrip())
        return "\n".join(lines)


def _where(label: str, key: str) -> str:
    return f"parameter file {label}, [{key}]"


def _set(label: str, name: str, entry: dict[str, Any]) -> ParameterSet:
    kind = entry.get("model")
    cls = model_class(kind)
    for key in ("description",):
        if not isinstance(entry.get(key), str) or not entry[key].strip():
            raise InputError(f"{_where(label, name + '.' + key)}: must be a non-empty string; got {entry.get(key)!r}")
    listed = entry.get("references", [])
    if not isinstance(listed, list) or not all(isinstance(r, str) and r in REFERENCES for r in listed):
        raise InputError(f"{_where(label, name + '.references')}: must be a list of known bibliography keys; "
                         f"got {listed!r}")
    names = {f.name for f in fields(cls)}
    values: dict[str, SetValue] = {}
    for key, table in entry.items():
        if key in _SET_KEYS:
            continue
        where = _where(label, f"{name}.{key}")
        if key not in names:
            raise InputError(f"{where}: not a parameter of the {kind} model; allowed: {', '.join(sorted(names))}")
        if not isinstance(table, dict) or set(table) - _VALUE_KEYS or not {"value", "unit", "status",
                                                                            "source"} <= set(table):
            raise InputError(f"{where}: must be a table with value, unit, status, source (and optional note)")
        v = table["value"]
        switch = isinstance(getattr(cls, key, None), bool)  # a switch of the model (e.g. field_assisted)
        if switch:
            if not isinstance(v, bool):
                raise InputError(f"{where}.value: must be true or false (model.{key} is a switch); got {v!r}")
        elif isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(float(v)):
            raise InputError(f"{where}.value: must be a finite number; got {v!r}")
        unit = cls.field_units[key][1]
        if table["unit"] != unit:
            raise InputError(f"{where}.unit: must be {unit!r} (the SI unit of model.{key}); got {table['unit']!r}")
        if table["status"] not in STATUSES:
            raise InputError(f"{where}.status: must be one of {', '.join(map(repr, STATUSES))}; "
                             f"got {table['status']!r}")
        for k in ("source", "note"):
            if k in table and (not isinstance(table[k], str) or not table[k].strip()):
                raise InputError(f"{where}.{k}: must be a non-empty string; got {table[k]!r}")
        values[key] = SetValue(v if switch else float(v), unit, table["status"], table["source"],
                               table.get("note", ""))
    ps = ParameterSet(name, str(kind), entry["description"], tuple(listed), MappingProxyType(values))
    cls(**ps.as_kwargs())  # every value within the model's own checks (InputError naming the parameter)
    return ps


def load_model_sets(path: str | os.PathLike[str]) -> dict[str, ParameterSet]:
    """Read and validate a parameter-set file (layout of the built-in ``model_sets.toml``).

    Parameters
    ----------
    path : str or os.PathLike
        The TOML file.

    Returns
    -------
    dict
        Set name to :class:`ParameterSet`.

    Raises
    ------
    InputError
        For a missing or malformed file, naming the file and the key.
    """
    label, data = _read_toml(path)
    if data.get("schema") != SCHEMA:
        raise InputError(f"{_where(label, 'schema')}: expected {SCHEMA!r}; got {data.get('schema')!r}")
    out = {}
    for name, entry in data.items():
        if name == "schema":
            continue
        if not isinstance(entry, dict):
            raise InputError(f"{_where(label, name)}: unknown top-level key (sets must be tables)")
        out[name] = _set(label, name, entry)
    if not out:
        raise InputError(f"parameter file {label}: holds no sets")
    return out


@cache
def _builtin() -> Mapping[str, ParameterSet]:
    path = Path(str(resources.files("pdvoid.inputs.parameter_sets") / "model_sets.toml"))
    return MappingProxyType(load_model_sets(path))


def list_parameter_sets(model: str | None = None) -> list[str]:
    """Names of the built-in parameter sets, optionally only those for one model kind.

    Parameters
    ----------
    model : str or None, optional
        A model kind, or None for all.

    Returns
    -------
    list of str
        Set names.
    """
    return [k for k, v in _builtin().items() if model is None or v.model == model]


def get_parameter_set(name: object) -> ParameterSet:
    """The built-in parameter set ``name``.

    Parameters
    ----------
    name : object
        A name from :func:`list_parameter_sets`.

    Returns
    -------
    ParameterSet
        The set.

    Raises
    ------
    InputError
        For an unknown name, listing the known ones.
    """
    sets = _builtin()
    if not isinstance(name, str) or name not in sets:
        raise InputError(f"parameter set must be one of {', '.join(map(repr, sets))}; got {name!r}")
    return sets[name]


def model_from_set(name: str, **overrides: Any) -> ModelParameters:
    """A model built from the built-in parameter set ``name``; keywords replace the set's values.

    Parameters
    ----------
    name : str
        A name from :func:`list_parameter_sets`.
    **overrides : Any
        Model parameters that replace the set's.

    Returns
    -------
    ModelParameters
        An instance of the set's model class (for a model with a ``parameter_set`` field, it names the set).

    Raises
    ------
    InputError
        For an unknown set or a bad parameter.
    """
    ps = get_parameter_set(name)
    cls = model_class(ps.model)
    kwargs: dict[str, Any] = ps.as_kwargs()
    if "parameter_set" in {f.name for f in fields(cls)}:
        kwargs["parameter_set"] = name
    kwargs.update(overrides)
    return cls(**kwargs)


def parameter_value_lines(model: ModelParameters) -> list[str]:
    """The parameter-set values a model uses, one line each with its unit, status and source (the sets of
    :func:`sets_matching`); a value the model holds differently from its set is marked as given by the user.

    Parameters
    ----------
    model : ModelParameters
        A model instance.

    Returns
    -------
    list of str
        A heading per set, then one line per value; empty when the model matches no set.

    Raises
    ------
    InputError
        For anything but a model instance.
    """
    lines: list[str] = []
    for name in sets_matching(model):
        if name not in list_parameter_sets(model.kind):
            continue
        ps = get_parameter_set(name)
        lines.append(f"parameter set {name} ({ps.model} model):")
        for key, v in ps.values.items():
            used = getattr(model, key)
            shown = str(used).lower() if isinstance(used, bool) else f"{used:g}"
            unit = f" {v.unit}" if v.unit else ""
            if used == v.value:
                lines.append(f"  {key} = {shown}{unit}  [{v.status}] {v.source}")
            else:
                given = str(v.value).lower() if isinstance(v.value, bool) else f"{v.value:g}"
                lines.append(f"  {key} = {shown}{unit}  [given by the user; the set has {given}{unit}, "
                             f"{v.status}: {v.source}]")
        base = type(model)()
        for f in fields(model):
            if f.name in ps.values or f.name == "parameter_set" or getattr(model, f.name) == getattr(base, f.name):
                continue
            used = getattr(model, f.name)
            shown = str(used).lower() if isinstance(used, bool) else f"{used:g}"
            lines.append(f"  {f.name} = {shown}  [given by the user; not a value of the set]")
    return lines


def sets_matching(model: ModelParameters, ignore: tuple[str, ...] = ("ionization_rate", "lag_free")) -> list[str]:
    """The built-in parameter sets a model is built from: its own ``parameter_set`` when it has that field, else
    every set for its kind whose values it carries (fields not in a set at their class defaults).

    Parameters
    ----------
    model : ModelParameters
        A model instance.
    ignore : tuple of str, optional
        Fields left out of the comparison (by default the volume ionisation and the lag-free switch, which runs
        often change).

    Returns
    -------
    list of str
        Set names (empty when the model's values match no set).

    Raises
    ------
    InputError
        For anything but a model instance.
    """
    if not isinstance(model, ModelParameters):
        raise InputError(f"model must be a pdvoid model (e.g. pdvoid.FieldModel); got {type(model).__name__}")
    own = getattr(model, "parameter_set", None)
    if isinstance(own, str):
        return [own]
    base = type(model)()
    out = []
    for name in list_parameter_sets(model.kind):
        values = get_parameter_set(name).values
        same = all(
            getattr(model, f.name) == (values[f.name].value if f.name in values else getattr(base, f.name))
            for f in fields(model) if f.name not in ignore
        )
        if same:
            out.append(name)
    return out
