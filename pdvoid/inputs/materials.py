"""Parameter sets of host dielectrics and void gases (TOML files), loaded and validated.

The built-in sets live in ``pdvoid/parameter_sets/materials.toml`` and ``gases.toml``; every value there names
its source and a status (confirmed, derived, from memory, common practice, tuned). Users add their own with
:func:`load_materials` / :func:`load_gases` (same layout, same validation) or pass ``path=`` to
:func:`get_material` / :func:`get_gas`.
"""

from __future__ import annotations

import math
import os
import re
from collections.abc import Mapping
from dataclasses import dataclass, field
from functools import lru_cache
from importlib import resources
from pathlib import Path
from types import MappingProxyType
from typing import Any

from pdvoid.core.errors import InputError
from pdvoid.core.files import read_toml_file
from pdvoid.core.limits import MAX_TEXT_FILE_BYTES

__all__ = [
    "STATUSES",
    "IONIZATION_MODELS",
    "Material",
    "GasData",
    "Provenance",
    "get_material",
    "get_gas",
    "list_materials",
    "list_gases",
    "load_materials",
    "load_gases",
]

STATUSES = ("confirmed", "derived", "from memory", "common practice", "tuned")
IONIZATION_MODELS = ("morrow_lowke_air", "sf6_linear")
MAX_FILE_BYTES = MAX_TEXT_FILE_BYTES  #: largest parameter file [bytes] (see pdvoid.core.limits)
_NAME = re.compile(r"^[a-z][a-z0-9_]{0,63}$")
_MATERIALS_SCHEMA = "pdvoid.materials/1"
_GASES_SCHEMA = "pdvoid.gases/1"


@dataclass(frozen=True)
class Provenance:
    """Where one gas constant comes from: its unit, status and source.

    Attributes
    ----------
    unit : str
        Unit of the constant as written in the parameter file.
    status : str
        ``"confirmed"``, ``"derived"``, ``"from memory"``, ``"common practice"`` or ``"tuned"``.
    source : str
        The source (a reference key or a citation).
    note : str
        Free remarks; empty when none.
    spread : tuple of float or None
        (low, high) of the values quoted for this constant by different sources, in ``unit``, when it is not
        confirmed; pdvoid carries it into the inception band. None when no spread is given.
    """

    unit: str
    status: str
    source: str
    note: str = ""
    spread: tuple[float, float] | None = None


@dataclass(frozen=True)
class Material:
    """A host dielectric.

    Attributes
    ----------
    name : str
        key in the parameter set.
    permittivity : float
        relative permittivity near power frequency [-].
    description : str
        what the material is.
    source : str
        where the value comes from.
    status : str
        confirmed, derived, from memory, common practice or tuned.
    permittivity_range : tuple[float, float] or None
        typical spread (low, high) [-], or None.
    note : str
        free text.
    dielectric_strength : float or None
        typical short-time dielectric strength of the host [V/m] (a uniform-field test on specimens a few mm
        thick or thinner; it falls with thickness, duration, temperature and defects), or None when unknown.
    dielectric_strength_provenance : Provenance or None
        unit, status and source of ``dielectric_strength``.
    """

    name: str
    permittivity: float
    description: str
    source: str
    status: str
    permittivity_range: tuple[float, float] | None = None
    note: str = ""
    dielectric_strength: float | None = None
    dielectric_strength_provenance: Provenance | None = field(default=None, compare=False, repr=False)


@dataclass(frozen=True)
class GasData:
    """Constants of a void gas (SI).

    Attributes
    ----------
    name : str
        key in the parameter set.
    description : str
        what the gas is.
    permittivity : float
        relative permittivity [-].
    critical_reduced_field : float
        (E/p)_cr of the streamer formula [V/(Pa m)].
    b_constant : float
        B of the streamer formula [(Pa m)^n].
    exponent : float
        n of the streamer formula [-].
    paschen_a : float or None
        A of Paschen's law [1/(Pa m)], or None.
    paschen_b : float or None
        B of Paschen's law [V/(Pa m)], or None.
    secondary_emission : float or None
        γ of Paschen's law [-], or None.
    k_streamer : float or None
        ionisation-integral threshold K [-], or None.
    paschen_minimum_voltage : float or None
        measured minimum of the Paschen curve [V], or None.
    paschen_minimum_pd : float or None
        p·d of that minimum, p at 293.15 K [Pa m], or None.
    ionization_model : str or None
        "morrow_lowke_air", "sf6_linear" or None.
    references : tuple[str, ...]
        bibliography keys (pdvoid.core.references).
    notes : str
        free text.
    provenance : Mapping[str, Provenance]
        quantity name -> :class:`Provenance`.
    """

    name: str
    description: str
    permittivity: float
    critical_reduced_field: float
    b_constant: float
    exponent: float
    paschen_a: float | None = None
    paschen_b: float | None = None
    secondary_emission: float | None = None
    k_streamer: float | None = None
    ionization_model: str | None = None
    paschen_minimum_voltage: float | None = None
    paschen_minimum_pd: float | None = None
    references: tuple[str, ...] = ()
    notes: str = ""
    provenance: Mapping[str, Provenance] = field(default_factory=dict, compare=False, repr=False)


# quantity -> (unit, low, high, low_open, required)
_GAS_QUANTITIES: dict[str, tuple[str, float, float, bool, bool]] = {
    "permittivity": ("1", 1.0, 1.1, False, True),
    "critical_reduced_field": ("V/(Pa m)", 0.0, math.inf, True, True),
    "b_constant": ("(Pa m)^n", 0.0, math.inf, False, True),
    "exponent": ("1", 0.0, 1.0, True, True),
    "paschen_a": ("1/(Pa m)", 0.0, math.inf, True, False),
    "paschen_b": ("V/(Pa m)", 0.0, math.inf, True, False),
    "secondary_emission": ("1", 0.0, 1.0, True, False),
    "k_streamer": ("1", 0.0, 100.0, True, False),
    "paschen_minimum_voltage": ("V", 0.0, math.inf, True, False),
    "paschen_minimum_pd": ("Pa m", 0.0, math.inf, True, False),
}
_GAS_TEXT = {"description": True, "references": True, "notes": False, "ionization_model": False}
_MATERIAL_KEYS = {"description", "permittivity", "permittivity_range", "source", "status", "note",
                  "dielectric_strength"}
#: unit, lower and upper bound of a material's dielectric strength [V/m] (1 kV/mm to 10 MV/mm)
_STRENGTH_SPEC = ("V/m", 1e6, 1e10, False, False)


# ----------------------------------------------------------------------------------------- file reading
def _read_toml(path: str | os.PathLike[str]) -> tuple[str, dict[str, Any]]:
    try:
        data = read_toml_file(path, MAX_FILE_BYTES, "parameter file")  # bounded, regular files only, BOM accepted
    except InputError:
        raise
    except ValueError as exc:  # e.g. an integer of more digits than Python converts (int_max_str_digits)
        raise InputError(f"{path}: malformed TOML (the parameter file is not valid TOML): {exc}") from None
    return str(Path(path)), data


def _where(label: str, key: str) -> str:
    return f"parameter file {label}, [{key}]"


def _text(label: str, key: str, value: object, *, allow_empty: bool = False) -> str:
    if not isinstance(value, str) or (not allow_empty and not value.strip()):
        raise InputError(f"{_where(label, key)}: must be a non-empty string; got {value!r}")
    return value


def _number(label: str, key: str, value: object, low: float, high: float, low_open: bool) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError(f"{_where(label, key)}: must be a number; got {value!r}")
    x = float(value)
    ok = math.isfinite(x) and (x > low if low_open else x >= low) and x <= high
    if not ok:
        lb = "(" if low_open else "["
        raise InputError(f"{_where(label, key)}: must lie in {lb}{low:g}, {high:g}]; got {x!r}")
    return x


def _status(label: str, key: str, value: object) -> str:
    if value not in STATUSES:
        raise InputError(f"{_where(label, key)}: status must be one of {', '.join(map(repr, STATUSES))}; "
                         f"got {value!r}")
    return str(value)


def _entries(label: str, data: dict[str, Any], schema: str) -> dict[str, dict[str, Any]]:
    out: dict[str, dict[str, Any]] = {}
    for key, value in data.items():
        if key == "schema":
            if value != schema:
                raise InputError(f"{_where(label, 'schema')}: expected {schema!r}; got {value!r}")
            continue
        if not isinstance(value, dict):
            raise InputError(f"{_where(label, key)}: unknown top-level key (entries must be tables)")
        if not _NAME.match(key):
            raise InputError(f"{_where(label, key)}: name must be snake_case (a-z, 0-9, _; starting with a "
                             "letter; at most 64 characters)")
        out[key] = value
    if not out:
        raise InputError(f"parameter file {label}: holds no entries")
    return out


# ----------------------------------------------------------------------------------------- materials
def _material(label: str, name: str, entry: dict[str, Any]) -> Material:
    unknown = sorted(set(entry) - _MATERIAL_KEYS)
    if unknown:
        raise InputError(f"{_where(label, name + '.' + unknown[0])}: unknown key; allowed: "
                         f"{', '.join(sorted(_MATERIAL_KEYS))}")
    for req in ("description", "permittivity", "source", "status"):
        if req not in entry:
            raise InputError(f"{_where(label, name)}: missing key {req!r}")
    eps = _number(label, f"{name}.permittivity", entry["permittivity"], 1.0, 1e4, False)
    rng = None
    if "permittivity_range" in entry:
        raw = entry["permittivity_range"]
        if not isinstance(raw, list) or len(raw) != 2:
            raise InputError(f"{_where(label, name + '.permittivity_range')}: must be [low, high]; "
                             f"got {raw!r}")
        lo = _number(label, f"{name}.permittivity_range", raw[0], 1.0, 1e4, False)
        hi = _number(label, f"{name}.permittivity_range", raw[1], 1.0, 1e4, False)
        if not lo <= eps <= hi:
            raise InputError(f"{_where(label, name + '.permittivity_range')}: [{lo:g}, {hi:g}] must contain "
                             f"permittivity {eps:g}")
        rng = (lo, hi)
    strength, strength_prov = None, None
    if "dielectric_strength" in entry:
        strength, strength_prov = _quantity(label, f"{name}.dielectric_strength", entry["dielectric_strength"],
                                            _STRENGTH_SPEC)
    return Material(
        name=name,
        permittivity=eps,
        description=_text(label, f"{name}.description", entry["description"]),
        source=_text(label, f"{name}.source", entry["source"]),
        status=_status(label, f"{name}.status", entry["status"]),
        permittivity_range=rng,
        note=_text(label, f"{name}.note", entry.get("note", ""), allow_empty=True),
        dielectric_strength=strength,
        dielectric_strength_provenance=strength_prov,
    )


def load_materials(path: str | os.PathLike[str]) -> dict[str, Material]:
    """Read and validate a materials file (layout of the built-in ``materials.toml``).

    Parameters
    ----------
    path : str or os.PathLike
        the TOML file (at most 1 MB).

    Returns
    -------
    dict[str, Material]
        Material name -> :class:`Material`.

    Raises
    ------
    InputError
        naming the file, the key and the problem (missing, unknown, out of range, εr < 1).
    """
    label, data = _read_toml(path)
    return {name: _material(label, name, e) for name, e in _entries(label, data, _MATERIALS_SCHEMA).items()}


# ----------------------------------------------------------------------------------------- gases
def _quantity(label: str, key: str, table: object, spec: tuple[str, float, float, bool, bool]
              ) -> tuple[float, Provenance]:
    unit, low, high, low_open, _ = spec
    if not isinstance(table, dict):
        raise InputError(f"{_where(label, key)}: must be a table with value, unit, status, source; "
                         f"got {table!r}")
    allowed = {"value", "unit", "status", "source", "note", "spread"}
    unknown = sorted(set(table) - allowed)
    if unknown:
        raise InputError(f"{_where(label, key + '.' + unknown[0])}: unknown key; "
                         f"allowed: {', '.join(sorted(allowed))}")
    for req in ("value", "unit", "status", "source"):
        if req not in table:
            raise InputError(f"{_where(label, key)}: missing key {req!r}")
    if table["unit"] != unit:
        raise InputError(f"{_where(label, key + '.unit')}: must be {unit!r} (SI); got {table['unit']!r}")
    value = _number(label, f"{key}.value", table["value"], low, high, low_open)
    spread = None
    if "spread" in table:
        raw = table["spread"]
        if not isinstance(raw, list) or len(raw) != 2:
            raise InputError(f"{_where(label, key + '.spread')}: must be [low, high]; got {raw!r}")
        lo = _number(label, f"{key}.spread", raw[0], low, high, low_open)
        hi = _number(label, f"{key}.spread", raw[1], low, high, low_open)
        if not lo <= value <= hi:
            raise InputError(f"{_where(label, key + '.spread')}: [{lo:g}, {hi:g}] must contain the value {value:g}")
        spread = (lo, hi)
    prov = Provenance(unit=unit, status=_status(label, f"{key}.status", table["status"]),
                      source=_text(label, f"{key}.source", table["source"]),
                      note=_text(label, f"{key}.note", table.get("note", ""), allow_empty=True), spread=spread)
    return value, prov


def _gas(label: str, name: str, entry: dict[str, Any]) -> GasData:
    unknown = sorted(set(entry) - set(_GAS_QUANTITIES) - set(_GAS_TEXT))
    if unknown:
        raise InputError(f"{_where(label, name + '.' + unknown[0])}: unknown key; allowed: "
                         f"{', '.join(sorted(set(_GAS_QUANTITIES) | set(_GAS_TEXT)))}")
    for req in [k for k, s in _GAS_QUANTITIES.items() if s[4]] + [k for k, r in _GAS_TEXT.items() if r]:
        if req not in entry:
            raise InputError(f"{_where(label, name)}: missing key {req!r}")
    values: dict[str, float | None] = {}
    provenance: dict[str, Provenance] = {}
    for key, spec in _GAS_QUANTITIES.items():
        if key in entry:
            values[key], provenance[key] = _quantity(label, f"{name}.{key}", entry[key], spec)
        else:
            values[key] = None
    paschen = [k for k in ("paschen_a", "paschen_b", "secondary_emission") if values[k] is not None]
    if paschen and len(paschen) != 3:
        raise InputError(f"{_where(label, name)}: paschen_a, paschen_b and secondary_emission go together; "
                         f"got only {', '.join(paschen)}")
    minimum = [k for k in ("paschen_minimum_voltage", "paschen_minimum_pd") if values[k] is not None]
    if minimum and (len(minimum) != 2 or len(paschen) != 3):
        raise InputError(f"{_where(label, name)}: paschen_minimum_voltage and paschen_minimum_pd go together and "
                         f"need paschen_a, paschen_b and secondary_emission; got {', '.join(minimum + paschen)}")
    refs = entry["references"]
    if not isinstance(refs, list) or not all(isinstance(r, str) and r for r in refs):
        raise InputError(f"{_where(label, name + '.references')}: must be a list of key strings; "
                         f"got {refs!r}")
    model = entry.get("ionization_model")
    if model is not None and model not in IONIZATION_MODELS:
        raise InputError(f"{_where(label, name + '.ionization_model')}: must be one of "
                         f"{', '.join(map(repr, IONIZATION_MODELS))}; got {model!r}")
    if model is not None and values["k_streamer"] is None:
        raise InputError(f"{_where(label, name)}: ionization_model needs k_streamer")
    return GasData(
        name=name,
        description=_text(label, f"{name}.description", entry["description"]),
        permittivity=values["permittivity"],  # type: ignore[arg-type]
        critical_reduced_field=values["critical_reduced_field"],  # type: ignore[arg-type]
        b_constant=values["b_constant"],  # type: ignore[arg-type]
        exponent=values["exponent"],  # type: ignore[arg-type]
        paschen_a=values["paschen_a"],
        paschen_b=values["paschen_b"],
        secondary_emission=values["secondary_emission"],
        k_streamer=values["k_streamer"],
        ionization_model=model,
        paschen_minimum_voltage=values["paschen_minimum_voltage"],
        paschen_minimum_pd=values["paschen_minimum_pd"],
        references=tuple(refs),
        notes=_text(label, f"{name}.notes", entry.get("notes", ""), allow_empty=True),
        provenance=MappingProxyType(provenance),
    )


def load_gases(path: str | os.PathLike[str]) -> dict[str, GasData]:
    """Read and validate a gases file (layout of the built-in ``gases.toml``; values SI with the unit stated).

    Parameters
    ----------
    path : str or os.PathLike
        the TOML file (at most 1 MB).

    Returns
    -------
    dict[str, GasData]
        Gas name -> :class:`GasData`.

    Raises
    ------
    InputError
        naming the file, the key and the problem (missing, unknown, wrong unit, out of range).
    """
    label, data = _read_toml(path)
    return {name: _gas(label, name, e) for name, e in _entries(label, data, _GASES_SCHEMA).items()}


# ----------------------------------------------------------------------------------------- built-in sets
def _builtin_path(filename: str) -> Path:
    return Path(str(resources.files("pdvoid.inputs.parameter_sets") / filename))


@lru_cache(maxsize=1)
def _builtin_materials() -> Mapping[str, Material]:
    return MappingProxyType(load_materials(_builtin_path("materials.toml")))


@lru_cache(maxsize=1)
def _builtin_gases() -> Mapping[str, GasData]:
    return MappingProxyType(load_gases(_builtin_path("gases.toml")))


def _lookup(kind: str, name: object, table: Mapping[str, Any], origin: str) -> Any:
    if not isinstance(name, str) or name not in table:
        raise InputError(f"unknown {kind} {name!r} in {origin}; known: {', '.join(sorted(table))}")
    return table[name]


def list_materials() -> list[str]:
    """Names of the built-in host materials, sorted.

    Returns
    -------
    list of str
        The material keys.
    """
    return sorted(_builtin_materials())


def list_gases() -> list[str]:
    """Names of the built-in gases, sorted.

    Returns
    -------
    list of str
        The gas keys.
    """
    return sorted(_builtin_gases())


def get_material(name: str, path: str | os.PathLike[str] | None = None) -> Material:
    """A host material by name, from the built-in set or, with ``path``, from that user file.

    Parameters
    ----------
    name : str
        material key, e.g. "epoxy_cast", "xlpe".
    path : str or os.PathLike, optional
        optional user materials file [TOML].

    Returns
    -------
    Material
        The material with its values and their sources.

    Raises
    ------
    InputError
        for an unknown name (listing the known ones) or a bad file.
    """
    if path is None:
        return _lookup("material", name, _builtin_materials(), "the built-in materials")
    return _lookup("material", name, load_materials(path), f"file {path}")


def get_gas(name: str, path: str | os.PathLike[str] | None = None) -> GasData:
    """A void gas by name, from the built-in set or, with ``path``, from that user file.

    Parameters
    ----------
    name : str
        gas key, e.g. "air", "nitrogen", "sf6".
    path : str or os.PathLike, optional
        optional user gases file [TOML].

    Returns
    -------
    GasData
        The gas with its parameter set and sources.

    Raises
    ------
    InputError
        for an unknown name (listing the known ones) or a bad file.
    """
    if path is None:
        return _lookup("gas", name, _builtin_gases(), "the built-in gases")
    return _lookup("gas", name, load_gases(path), f"file {path}")
