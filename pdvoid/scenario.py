"""The Scenario: insulation, void, supply and model together, checked for fit; its coefficients and files."""

from __future__ import annotations

from dataclasses import dataclass, field, fields, replace
from typing import Any

from .coefficients import Coefficients, compute_coefficients
from .errors import InputError
from .parameters import FieldModel, Insulation, NetworkModel, Periodic, Sine, Void

__all__ = ["Scenario", "with_changes"]


@dataclass(frozen=True)
class Scenario:
    """Everything one simulation needs: insulation, void, supply and model.

    Raises InputError when the parts do not fit together (e.g. a void taller than the insulation).
    """

    insulation: Insulation
    void: Void
    supply: Sine | Periodic
    model: FieldModel | NetworkModel = field(default_factory=FieldModel)
    name: str = ""

    def __post_init__(self) -> None:
        for attr, cls in (("insulation", Insulation), ("void", Void), ("supply", (Sine, Periodic)),
                          ("model", (FieldModel, NetworkModel))):
            if not isinstance(getattr(self, attr), cls):
                raise InputError(f"scenario.{attr} has the wrong type: {type(getattr(self, attr)).__name__}")
        d = self.insulation.thickness
        if self.void.height >= d:
            raise InputError(
                f"void.height must be smaller than insulation.thickness ({d:g} m); got {self.void.height:g} m"
            )
        if not isinstance(self.name, str) or len(self.name) > 200:
            raise InputError(f"scenario.name must be text of at most 200 characters; got {self.name!r}")

    def coefficients(self) -> Coefficients:
        """The numbers the kernels run on (:class:`pdvoid.coefficients.Coefficients`)."""
        return compute_coefficients(self)

    def replace(self, **changes: Any) -> Scenario:
        """A copy with dotted-path changes, e.g. ``replace(**{"void.diameter": 2e-3})``."""
        return with_changes(self, changes)

    @classmethod
    def from_file(cls, path) -> Scenario:
        from .scenario_files import read_scenario  # same layer; imported here to avoid an import cycle

        return read_scenario(path)

    def to_file(self, path) -> None:
        from .scenario_files import write_scenario  # same layer; imported here to avoid an import cycle

        write_scenario(self, path)


def with_changes(scenario: Scenario, changes: dict[str, Any]) -> Scenario:
    """Apply ``{"void.diameter": 2e-3, "model.residual_ratio": 0.3, ...}`` to a scenario."""
    parts: dict[str, dict[str, Any]] = {}
    for key, value in changes.items():
        if not isinstance(key, str) or key.count(".") != 1:
            raise InputError(f"parameter names look like 'void.diameter'; got {key!r}")
        part, name = key.split(".")
        if part not in ("insulation", "void", "supply", "model"):
            raise InputError(f"{key!r}: the part must be insulation, void, supply or model")
        obj = getattr(scenario, part)
        if name not in {f.name for f in fields(obj)}:
            raise InputError(f"{key!r}: {type(obj).__name__} has no field {name!r}")
        parts.setdefault(part, {})[name] = value
    new = {part: replace(getattr(scenario, part), **kv) for part, kv in parts.items()}
    return replace(scenario, **new)
