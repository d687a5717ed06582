"""What a swept parameter is: its dimension and SI unit, read from the scenario-file schema; value parsing."""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import fields

from pdvoid.core.errors import InputError
from pdvoid.inputs.scenario import Scenario, with_changes
from pdvoid.inputs.scenario_files import field_schema, quantity_value

__all__ = ["check_parameter_names", "parameter_dimension", "parameter_unit", "parse_parameter_value"]


def _schema_entry(name: str, scenario: Scenario) -> tuple[str | None, str] | None:
    part, field = name.split(".")
    return field_schema(part, getattr(scenario, part)).get(field)


def check_parameter_names(scenario: Scenario, names: Iterable[str]) -> None:
    """Raise InputError unless every dotted name is a field of ``scenario`` (checked before any run).

    Parameters
    ----------
    scenario : Scenario
        The base scenario of the sweep [-].
    names : iterable of str
        Dotted parameter names such as ``"void.diameter"`` [-].

    Raises
    ------
    InputError
        Naming the first name that is not text like "part.field", or names no field of the scenario.
    """
    for name in names:
        if not isinstance(name, str) or name.count(".") != 1:
            raise InputError(f"parameter names look like 'void.diameter'; got {name!r}")
        part, field = name.split(".")
        obj = getattr(scenario, part, None) if part in ("insulation", "void", "supply", "model") else None
        if obj is None:
            raise InputError(f"{name!r}: the part must be insulation, void, supply or model")
        if field not in {f.name for f in fields(obj)}:
            raise InputError(f"{name!r}: {type(obj).__name__} has no field {field!r}")
    # the same path Scenario.replace takes, with the current values: catches anything the loop above missed
    with_changes(scenario, {n: getattr(getattr(scenario, n.split(".")[0]), n.split(".")[1]) for n in names})


def parameter_dimension(name: str, scenario: Scenario) -> str | None:
    """The physical dimension of a dotted parameter.

    Parameters
    ----------
    name : str
        Dotted parameter name [-].
    scenario : Scenario
        The scenario whose part holds the parameter [-].

    Returns
    -------
    str or None
        "length", "pressure", ...; None for text, flags and lists.
    """
    entry = _schema_entry(name, scenario)
    return None if entry is None else entry[0]


def parameter_unit(name: str, scenario: Scenario) -> str | None:
    """The SI unit of a dotted parameter as written in files.

    Parameters
    ----------
    name : str
        Dotted parameter name [-].
    scenario : Scenario
        The scenario whose part holds the parameter [-].

    Returns
    -------
    str or None
        "m", "Pa", "1/s" ("1" for dimensionless), or None for parameters that are not quantities (text, flags,
        lists).
    """
    entry = _schema_entry(name, scenario)
    if entry is None or entry[0] is None:
        return None
    return entry[1] or "1"


def parse_parameter_value(
    name: str, value: float | str | bool, scenario: Scenario, where: str
) -> float | str | bool:
    """A parameter value from a sweep file.

    Parameters
    ----------
    name : str
        Dotted parameter name [-].
    value : float or str or bool
        A quantity ("1.5 mm", "1 atm"; bare numbers are SI), or text, a whole number or True/False for the
        parameters that are not quantities [-].
    scenario : Scenario
        The scenario whose part holds the parameter [-].
    where : str
        Prefix of error messages (file and key) [-].

    Returns
    -------
    float or str or bool
        The value in SI, or the text, number or flag as given.

    Raises
    ------
    InputError
        For text that is not a quantity of the parameter's dimension, or a value of the wrong kind.
    """
    dim = parameter_dimension(name, scenario)
    if dim is None:
        if isinstance(value, (str, bool, int)):
            return value
        raise InputError(f"{where}: {name} takes text, a whole number or true/false; got {value!r}")
    return quantity_value(value, dim, where)
