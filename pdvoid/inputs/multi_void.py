"""Several voids in one part: :class:`MultiVoidScenario` and its scenario files (``[[void]]`` tables).

The voids share the insulation, the supply and the model parameters; each has its own size, shape, position,
gas, pressure and temperature. They are treated as independent: each void sees the applied field as if it were
alone (no field interaction between voids, which holds when they are several of their own sizes apart) and its
discharges add their apparent charges to one record. A one-void :class:`pdvoid.Scenario` is untouched by this
module; ``MultiVoidScenario.scenarios[i]`` is the one-void scenario of void ``i``.

File layout: a scenario file (:mod:`pdvoid.inputs.scenario_files`) whose ``[void]`` table is replaced by an
array of tables, one per void::

    [insulation]
    thickness = "6 mm"
    material = "epoxy_silica_filled"

    [[void]]
    diameter = "0.8 mm"
    height = "0.8 mm"

    [[void]]
    diameter = "2 mm"
    height = "1 mm"
    gas = "nitrogen"

    [supply]
    rms = "18 kV"

A file with a single ``[void]`` table is read as a one-void MultiVoidScenario.
"""

from __future__ import annotations

import os
import re
from dataclasses import dataclass, field, fields, replace
from pathlib import Path
from typing import Any

from pdvoid.core.errors import InputError, check_int
from pdvoid.core.files import atomic_write, read_toml_file
from pdvoid.inputs.model_parameters import ModelParameters, default_model
from pdvoid.inputs.parameters import Insulation, Periodic, Sine, Void
from pdvoid.inputs.scenario import Scenario, with_changes
from pdvoid.inputs.scenario_files import MAX_FILE_BYTES, parts_from_dict, scenario_to_dict

__all__ = ["MultiVoidScenario", "MAX_VOIDS", "read_multi_void_scenario", "multi_void_from_dict",
           "parameter_value", "numeric_parameters"]

#: most voids one MultiVoidScenario may hold [-]
MAX_VOIDS = 1000

_VOID_NAME = re.compile(r"^voids\[(\d{1,4})\]\.([a-z_]+)$")


@dataclass(frozen=True)
class MultiVoidScenario:
    """Several independent voids in one insulation under one supply, with one set of model parameters.

    Attributes
    ----------
    insulation : pdvoid.Insulation
        The host slab.
    voids : tuple of pdvoid.Void
        The voids, 1 to :data:`MAX_VOIDS`; each must fit the insulation as in :class:`pdvoid.Scenario`. Their
        order is their index in the simulated record (``void_index``).
    supply : pdvoid.Sine or pdvoid.Periodic
        The applied voltage.
    model : pdvoid.FieldModel or pdvoid.NetworkModel, optional
        The void model and its parameters, shared by every void (default: the field model).
    name : str, optional
        A label of at most 200 characters.

    Raises
    ------
    pdvoid.InputError
        When ``voids`` is not a non-empty sequence of :class:`pdvoid.Void`, or a void does not fit the insulation
        (the message names the void by its index).

    Notes
    -----
    The voids do not interact: each sees the applied field as if alone. That holds for voids several of their
    own sizes apart from each other (the dipole field of a void falls with the cube of the distance); for voids
    close together the superposed pattern is an approximation.
    """

    insulation: Insulation
    voids: tuple[Void, ...]
    supply: Sine | Periodic
    model: ModelParameters = field(default_factory=default_model)
    name: str = ""

    def __post_init__(self) -> None:
        voids = self.voids
        if isinstance(voids, Void) or not isinstance(voids, (tuple, list)):
            raise InputError(f"voids must be a sequence of pdvoid.Void (one per void); got {type(voids).__name__}")
        if not 1 <= len(voids) <= MAX_VOIDS:
            raise InputError(f"voids must hold 1 to {MAX_VOIDS} voids; got {len(voids)}")
        for i, v in enumerate(voids):
            if not isinstance(v, Void):
                raise InputError(f"voids[{i}] must be a pdvoid.Void; got {type(v).__name__}")
        object.__setattr__(self, "voids", tuple(voids))
        for i in range(len(voids)):
            try:
                self.scenario(i)
            except InputError as exc:
                raise InputError(f"voids[{i}]: {exc}") from None

    @property
    def count(self) -> int:
        """Number of voids [-]."""
        return len(self.voids)

    def scenario(self, index: int) -> Scenario:
        """The one-void scenario of void ``index`` (the shared insulation, supply and model).

        Parameters
        ----------
        index : int
            The void's index, 0 to ``count - 1`` [-].

        Returns
        -------
        Scenario
            That void alone; its name is the multi-void name with `` (void i)`` appended when there are several.
        """
        i = check_int("index", index, 0, len(self.voids) - 1)
        label = self.name if len(self.voids) == 1 else f"{self.name} (void {i})"[:200]
        return Scenario(insulation=self.insulation, void=self.voids[i], supply=self.supply, model=self.model,
                        name=label)

    @property
    def scenarios(self) -> tuple[Scenario, ...]:
        """One one-void :class:`pdvoid.Scenario` per void, in order."""
        return tuple(self.scenario(i) for i in range(len(self.voids)))

    @classmethod
    def from_scenario(cls, scenario: Scenario, voids: tuple[Void, ...] | list[Void] | None = None
                      ) -> MultiVoidScenario:
        """The voids ``voids`` (default: the scenario's own void alone) in the insulation, supply and model of
        ``scenario``.

        Parameters
        ----------
        scenario : Scenario
            Gives the insulation, supply, model and name.
        voids : sequence of pdvoid.Void or None
            The voids; None for ``(scenario.void,)``.

        Returns
        -------
        MultiVoidScenario
            The multi-void scenario.
        """
        if not isinstance(scenario, Scenario):
            raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
        return cls(insulation=scenario.insulation, voids=(scenario.void,) if voids is None else tuple(voids),
                   supply=scenario.periodic_supply, model=scenario.model, name=scenario.name)

    def replace(self, **changes: Any) -> MultiVoidScenario:
        """A copy with dotted-path changes: ``"voids[1].diameter"`` for one void, ``"insulation.thickness"``,
        ``"supply.rms"`` or ``"model.residual_ratio"`` for the shared parts.

        Parameters
        ----------
        **changes
            ``"name": value`` pairs (SI values).

        Returns
        -------
        MultiVoidScenario
            The changed copy (validated anew).
        """
        voids = list(self.voids)
        shared: dict[str, Any] = {}
        per_void: dict[int, dict[str, Any]] = {}
        for key, value in changes.items():
            m = _VOID_NAME.match(key)
            if m:
                i, name = int(m.group(1)), m.group(2)
                if i >= len(voids):
                    raise InputError(f"{key!r}: there are only {len(voids)} voids (indices 0 to {len(voids) - 1})")
                if name not in {f.name for f in fields(Void)}:
                    raise InputError(f"{key!r}: Void has no field {name!r}")
                per_void.setdefault(i, {})[name] = value
            elif key.startswith("void."):
                raise InputError(f"{key!r}: name the void, e.g. 'voids[0].{key[5:]}' (this scenario holds "
                                 f"{len(voids)} voids)")
            else:
                shared[key] = value
        for i, kv in per_void.items():
            voids[i] = replace(voids[i], **kv)
        base = with_changes(self.scenario(0), shared) if shared else self.scenario(0)
        return MultiVoidScenario(insulation=base.insulation, voids=tuple(voids), supply=base.periodic_supply,
                                 model=base.model, name=self.name)

    @classmethod
    def from_file(cls, path: str | os.PathLike[str]) -> MultiVoidScenario:
        """Read a scenario file with one ``[void]`` table or several ``[[void]]`` tables.

        Parameters
        ----------
        path : str or os.PathLike
            The file.

        Returns
        -------
        MultiVoidScenario
            The scenario it describes.
        """
        return read_multi_void_scenario(path)

    def to_file(self, path: str | os.PathLike[str]) -> Path:
        """Write this scenario as a TOML file with one ``[[void]]`` table per void; :meth:`from_file` restores
        it exactly.

        Parameters
        ----------
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
            tomli_w.dump(self.to_dict(), fh)
        return p

    def to_dict(self) -> dict[str, Any]:
        """The dictionary form of the file (quantities as exact strings with SI units).

        Returns
        -------
        dict
            The TOML document; ``"void"`` holds a list of tables.
        """
        first = scenario_to_dict(self.scenario(0))
        first["name"] = self.name
        first["void"] = [scenario_to_dict(self.scenario(i))["void"] for i in range(len(self.voids))]
        return first


def multi_void_from_dict(data: dict[str, Any], *, source: str = "scenario") -> MultiVoidScenario:
    """Build a MultiVoidScenario from the dictionary form of a scenario file (``void`` a table or a list of
    tables).

    Parameters
    ----------
    data : dict
        The parsed TOML document.
    source : str
        What error messages start with (a file name).

    Returns
    -------
    MultiVoidScenario
        The scenario; errors name the source and the void (``void 1`` is the first ``[[void]]`` table).
    """
    if not isinstance(data, dict):
        raise InputError(f"{source}: a scenario must be a table")
    entries = data.get("void")
    if isinstance(entries, dict):
        entries = [entries]
    if entries is None:
        raise InputError(f"{source}: missing [void] table or [[void]] tables")
    if not isinstance(entries, list) or not entries:
        raise InputError(f"{source}: void must be a table or a non-empty array of tables ([[void]]); got "
                         f"{type(entries).__name__}")
    if len(entries) > MAX_VOIDS:
        raise InputError(f"{source}: at most {MAX_VOIDS} [[void]] tables; got {len(entries)}")
    all_parts = []
    for i, entry in enumerate(entries):
        where = source if len(entries) == 1 else f"{source}, void {i + 1}"
        if not isinstance(entry, dict):
            raise InputError(f"{where}: each [[void]] entry must be a table; got {type(entry).__name__}")
        all_parts.append(parts_from_dict({**data, "void": entry}, source=where))
    parts = all_parts[0]
    voids = [p["void"] for p in all_parts]
    try:
        return MultiVoidScenario(insulation=parts["insulation"], voids=tuple(voids), supply=parts["supply"],
                                 model=parts["model"], name=parts["name"])
    except InputError as exc:
        raise InputError(f"{source}: {exc}") from None


def read_multi_void_scenario(path: str | os.PathLike[str]) -> MultiVoidScenario:
    """Read a scenario file with one ``[void]`` table or several ``[[void]]`` tables (module docs).

    Parameters
    ----------
    path : str or os.PathLike
        The file.

    Returns
    -------
    MultiVoidScenario
        The scenario; errors name the file, the void and the key.
    """
    if not isinstance(path, (str, os.PathLike)):
        raise InputError(f"path must be a str or path; got {type(path).__name__}")
    p = Path(path)
    try:
        data = read_toml_file(p, MAX_FILE_BYTES, "scenario file")
    except InputError:
        raise
    except ValueError as exc:
        raise InputError(f"{p}: malformed TOML (the scenario file is not valid TOML): {exc}") from None
    return multi_void_from_dict(data, source=str(p))


def numeric_parameters(scenario: Scenario | MultiVoidScenario) -> set[str]:
    """The dotted names of the real-valued parameters of a scenario (what a fit may vary).

    Parameters
    ----------
    scenario : Scenario or MultiVoidScenario
        The scenario.

    Returns
    -------
    set of str
        ``"insulation.x"``, ``"model.x"`` and ``"void.x"`` (one void) or ``"voids[i].x"`` (several voids).
    """
    def real(obj: Any) -> list[str]:
        return [f.name for f in fields(obj) if isinstance(getattr(obj, f.name), float)]

    out = {f"{part}.{n}" for part in ("insulation", "model") for n in real(getattr(scenario, part))}
    if isinstance(scenario, MultiVoidScenario):
        out |= {f"voids[{i}].{n}" for i, v in enumerate(scenario.voids) for n in real(v)}
    else:
        out |= {f"void.{n}" for n in real(scenario.void)}
    return out


def parameter_value(scenario: Scenario | MultiVoidScenario, name: str) -> Any:
    """The value of a dotted parameter (``"void.diameter"``, ``"voids[1].diameter"``, ``"model.x"``).

    Parameters
    ----------
    scenario : Scenario or MultiVoidScenario
        The scenario.
    name : str
        The dotted name.

    Returns
    -------
    object
        The value (SI).
    """
    m = _VOID_NAME.match(name) if isinstance(name, str) else None
    if m and isinstance(scenario, MultiVoidScenario):
        i = int(m.group(1))
        if i >= scenario.count:
            raise InputError(f"{name!r}: there are only {scenario.count} voids")
        return getattr(scenario.voids[i], m.group(2))
    if not isinstance(name, str) or name.count(".") != 1:
        raise InputError(f"parameter names look like 'void.diameter' or 'voids[0].diameter'; got {name!r}")
    part, field_name = name.split(".")
    if not hasattr(scenario, part) or part == "voids":
        raise InputError(f"{name!r}: unknown part {part!r}")
    return getattr(getattr(scenario, part), field_name)
