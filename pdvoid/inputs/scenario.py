"""The Scenario: insulation, void, supply and model together, checked for fit, with its scenario files."""

from __future__ import annotations

import os
from dataclasses import dataclass, field, fields, replace
from pathlib import Path
from typing import Any

from pdvoid.core.errors import InputError
from pdvoid.inputs.geometries import check_void_placement
from pdvoid.inputs.model_parameters import ModelParameters, default_model
from pdvoid.inputs.parameters import Insulation, Periodic, Sine, Void
from pdvoid.inputs.scenario_files import parts_from_dict, read_scenario_parts, write_scenario_file
from pdvoid.inputs.supplies import TimeSupply

__all__ = ["Scenario", "with_changes", "read_scenario", "write_scenario", "scenario_from_dict"]

PARTS = ("insulation", "void", "supply", "model")


@dataclass(frozen=True)
class Scenario:
    """Everything one simulation needs: insulation, void, supply and model.

    Attributes
    ----------
    insulation : pdvoid.Insulation or pdvoid.Coaxial
        The host slab, or a cable's coaxial insulation (then ``void.radial_position`` places the void).
    void : pdvoid.Void
        The gas-filled void.
    supply : pdvoid.Sine, pdvoid.Periodic, pdvoid.DC, pdvoid.PolarityReversal or pdvoid.PiecewiseLinear
        The applied voltage (periodic supplies run for ``cycles``, the others for a ``duration``).
    model : pdvoid.FieldModel or pdvoid.NetworkModel, optional
        The void model and its parameters (default: the field model with default parameters).
    name : str, optional
        A label of at most 200 characters.

    Raises
    ------
    pdvoid.InputError
        When a part has the wrong type or the parts do not fit together (e.g. a void taller than the insulation).

    See Also
    --------
    pdvoid.compute_coefficients : the numbers the models run on.
    """

    insulation: Insulation
    void: Void
    supply: Sine | Periodic | TimeSupply
    model: ModelParameters = field(default_factory=default_model)
    name: str = ""

    def __post_init__(self) -> None:
        for attr, cls in (("insulation", Insulation), ("void", Void), ("supply", (Sine, Periodic, TimeSupply)),
                          ("model", ModelParameters)):
            if not isinstance(getattr(self, attr), cls):
                raise InputError(f"scenario.{attr} has the wrong type: {type(getattr(self, attr)).__name__}")
        d = self.insulation.thickness
        if self.void.height >= d:
            raise InputError(
                f"void.height must be smaller than insulation.thickness ({d:g} m); got {self.void.height:g} m"
            )
        check_void_placement(self.insulation, self.void)
        if not isinstance(self.name, str) or len(self.name) > 200:
            raise InputError(f"scenario.name must be text of at most 200 characters; got {self.name!r}")

    @property
    def periodic_supply(self) -> Sine | Periodic:
        """The supply when it is periodic (:class:`pdvoid.Sine` or :class:`pdvoid.Periodic`).

        Raises
        ------
        pdvoid.InputError
            For a supply without a period (DC, polarity reversal, piecewise-linear), naming it: analyses built on
            the supply's period (phase, cycles, ramp tests) do not apply to it.
        """
        if isinstance(self.supply, (Sine, Periodic)):
            return self.supply
        raise InputError(f"this needs a periodic supply (sine or periodic); scenario.supply is a "
                         f"{type(self.supply).__name__}, which has no period")

    def replace(self, **changes: Any) -> Scenario:
        """A copy with dotted-path changes, e.g. ``replace(**{"void.diameter": 2e-3})``.

        Parameters
        ----------
        **changes
            ``"part.field": value`` pairs (SI values).

        Returns
        -------
        Scenario
            The changed copy (validated anew).
        """
        return with_changes(self, changes)

    @classmethod
    def from_file(cls, path: str | os.PathLike[str]) -> Scenario:
        """Read a TOML scenario file (see :func:`read_scenario`).

        Parameters
        ----------
        path : str or os.PathLike
            The file.

        Returns
        -------
        Scenario
            The scenario it describes.
        """
        return _assemble(read_scenario_parts(path), str(path))

    def to_file(self, path: str | os.PathLike[str]) -> Path:
        """Write this scenario as a TOML file that :meth:`from_file` restores exactly.

        Parameters
        ----------
        path : str or os.PathLike
            The file to write.

        Returns
        -------
        pathlib.Path
            The file written.
        """
        return write_scenario_file(self, path)


def read_scenario(path: str | os.PathLike[str]) -> Scenario:
    """Read a TOML scenario file whose quantities may carry units.

    Parameters
    ----------
    path : str or os.PathLike
        The file.

    Returns
    -------
    Scenario
        The scenario; errors name the file and the key (TOML syntax errors: line and column).
    """
    return _assemble(read_scenario_parts(path), str(path))


def write_scenario(scenario: Scenario, path: str | os.PathLike[str]) -> Path:
    """Write a TOML scenario file that :func:`read_scenario` restores exactly.

    Parameters
    ----------
    scenario : Scenario
        The scenario.
    path : str or os.PathLike
        The file to write.

    Returns
    -------
    pathlib.Path
        The file written.
    """
    return write_scenario_file(scenario, path)


def scenario_from_dict(data: dict[str, Any], *, source: str = "scenario") -> Scenario:
    """Build a Scenario from the dictionary form of a scenario file.

    Parameters
    ----------
    data : dict
        The parsed TOML document.
    source : str
        What error messages start with (a file name).

    Returns
    -------
    Scenario
        The scenario.
    """
    return _assemble(parts_from_dict(data, source=source), source)


def _assemble(parts: dict[str, Any], source: str) -> Scenario:
    try:
        return Scenario(**parts)
    except InputError as exc:
        if str(exc).startswith(source):
            raise
        raise InputError(f"{source}: {exc}") from None


def with_changes(scenario: Scenario, changes: dict[str, Any]) -> Scenario:
    """Apply ``{"void.diameter": 2e-3, "model.residual_ratio": 0.3, ...}`` to a scenario.

    Parameters
    ----------
    scenario : Scenario
        The scenario to change.
    changes : dict
        ``"part.field": value`` pairs (SI values).

    Returns
    -------
    Scenario
        The changed copy (validated anew).
    """
    if not isinstance(changes, dict):
        raise InputError(f"changes must be a dictionary of 'part.field': value; got {type(changes).__name__}")
    parts: dict[str, dict[str, Any]] = {}
    for key, value in changes.items():
        if not isinstance(key, str) or key.count(".") != 1:
            raise InputError(f"parameter names look like 'void.diameter'; got {key!r}")
        part, name = key.split(".")
        if part not in PARTS:
            raise InputError(f"{key!r}: the part must be insulation, void, supply or model")
        obj = getattr(scenario, part)
        if name not in {f.name for f in fields(obj)}:
            raise InputError(f"{key!r}: {type(obj).__name__} has no field {name!r}")
        if name not in {f.name for f in fields(obj) if f.init}:
            raise InputError(f"{key!r} is derived in a {type(obj).__name__} and cannot be changed; change what it is "
                             f"derived from ({', '.join(f.name for f in fields(obj) if f.init)})")
        parts.setdefault(part, {})[name] = value
    new = {part: replace(getattr(scenario, part), **kv) for part, kv in parts.items()}
    return replace(scenario, **new)
