"""Sweep files: a base scenario, the design and the swept parameters in one TOML file.

Layout (quantities may carry units, bare numbers are SI)::

    scenario = "demo.toml"        # a scenario file, relative to this file ...
    # ... or the scenario inline: name = "...", [insulation], [void], [supply], [model] as in scenario files

    [sweep]
    design = "lhs"                # "grid" (default), "random" or "lhs"
    cycles = 2000                 # AC cycles per point (default 1000)
    seed = 1                      # master seed (default 0)
    samples = 50                  # random/lhs only

    [parameters]                  # grid: lists of values; random/lhs: bounds tables
    "void.diameter" = {low = "0.5 mm", high = "2 mm"}
    "void.pressure" = {low = "20 kPa", high = "1 atm", scale = "log"}
    # grid example: "void.diameter" = ["0.5 mm", "1 mm", "1.5 mm"]; "void.gas" = ["air", "SF6"]

Unquoted dotted keys (``void.diameter = [...]``) work too. Every error names the file and the key.
"""

from __future__ import annotations

import os
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from pdvoid.core.errors import InputError, check_int
from pdvoid.core.files import read_toml_file
from pdvoid.inputs.parameters import check_seed
from pdvoid.inputs.scenario import Scenario, read_scenario, scenario_from_dict
from pdvoid.inputs.scenario_files import MAX_FILE_BYTES
from pdvoid.simulation.simulate import MAX_CYCLES
from pdvoid.sweeps.names import check_parameter_names, parse_parameter_value
from pdvoid.sweeps.plan import DESIGNS, MAX_POINTS

__all__ = ["SweepSpec", "read_sweep_file"]

_PARTS = ("insulation", "void", "supply", "model")
_TOP = {"scenario", "name", *_PARTS, "sweep", "parameters"}
_SWEEP_KEYS = {"design", "cycles", "seed", "samples"}
_BOUND_KEYS = {"low", "high", "scale"}


@dataclass(frozen=True)
class SweepSpec:
    """A sweep file's content: pass it on as ``sweep(spec.scenario, spec.parameters, **spec.options())``.

    Attributes
    ----------
    scenario : Scenario
        The base scenario.
    parameters : dict of str to Any
        Grid: {dotted name: list of values} [SI]; random/lhs: {dotted name: (low, high, scale)} [SI].
    design : str
        "grid", "random" or "lhs".
    cycles : int
        AC cycles per point [-].
    seed : int
        Master seed [-].
    samples : int or None
        Number of points for random/lhs [-]; None for grid.
    source : str
        The file it was read from.
    """

    scenario: Scenario
    parameters: dict[str, Any]
    design: str = "grid"
    cycles: int = 1000
    seed: int = 0
    samples: int | None = None
    source: str = ""

    def options(self) -> dict[str, Any]:
        """The keyword arguments of :func:`pdvoid.sweeps.sweep` that the file sets.

        Returns
        -------
        dict of str to Any
            ``{"design", "cycles", "seed", "samples"}``.
        """
        return {"design": self.design, "cycles": self.cycles, "seed": self.seed, "samples": self.samples}


def _load(p: Path) -> dict:
    return read_toml_file(p, MAX_FILE_BYTES, "sweep file")


def _base_scenario(data: dict, p: Path) -> Scenario:
    inline = [k for k in ("name", *_PARTS) if k in data]
    if "scenario" in data:
        if inline:
            raise InputError(
                f'{p}: give the scenario either as scenario = "file.toml" or inline, not both '
                f"(found scenario and {', '.join(inline)})"
            )
        ref = data["scenario"]
        if not isinstance(ref, str) or not ref.strip():
            raise InputError(f"{p}: scenario must be the path of a scenario file; got {ref!r}")
        path = Path(ref)
        if not path.is_absolute():
            path = p.parent / path
        try:
            return read_scenario(path)
        except InputError as exc:
            raise InputError(f"{p}: scenario = {ref!r}: {exc}") from None
    if not inline:
        raise InputError(
            f'{p}: no base scenario: add scenario = "file.toml" or [insulation], [void], [supply] tables'
        )
    return scenario_from_dict({k: data[k] for k in inline}, source=str(p))


def _flatten(params: dict, p: Path) -> dict[str, Any]:
    out: dict[str, Any] = {}
    for key, value in params.items():
        if "." in key:
            out[key] = value
        elif key in _PARTS and isinstance(value, dict) and not (set(value) & _BOUND_KEYS):
            for field, v in value.items():
                out[f"{key}.{field}"] = v
        else:
            raise InputError(f'{p}: parameters.{key}: parameter names look like "void.diameter"')
    return out


def _grid_values(name: str, spec: Any, scenario: Scenario, p: Path) -> list:
    where = f'{p}: parameters."{name}"'
    if not isinstance(spec, list):
        raise InputError(
            f'{where}: the grid design takes a list of values, e.g. ["0.5 mm", "1 mm"]; got {spec!r}'
        )
    if not spec:
        raise InputError(f"{where}: the list of values is empty")
    return [parse_parameter_value(name, v, scenario, f"{where}[{i}]") for i, v in enumerate(spec)]


def _bounds(name: str, spec: Any, scenario: Scenario, p: Path) -> tuple:
    where = f'{p}: parameters."{name}"'
    if not isinstance(spec, dict) or not {"low", "high"} <= set(spec) or set(spec) - _BOUND_KEYS:
        raise InputError(
            f'{where}: random and lhs designs take bounds like {{low = "0.5 mm", high = "2 mm"}} '
            f'(optional scale = "log"); got {spec!r}'
        )
    low = parse_parameter_value(name, spec["low"], scenario, f"{where}.low")
    high = parse_parameter_value(name, spec["high"], scenario, f"{where}.high")
    if isinstance(low, (str, bool)):
        raise InputError(f"{where}.low: only numeric parameters can be sampled; got {low!r}")
    if isinstance(high, (str, bool)):
        raise InputError(f"{where}.high: only numeric parameters can be sampled; got {high!r}")
    scale = spec.get("scale", "linear")
    if scale not in ("linear", "log"):
        raise InputError(f'{where}.scale must be "linear" or "log"; got {scale!r}')
    return (float(low), float(high), scale)


def read_sweep_file(path: str | os.PathLike) -> SweepSpec:
    """Read a sweep file (see the module docstring).

    Parameters
    ----------
    path : str or os.PathLike
        The TOML file [-].

    Returns
    -------
    SweepSpec
        The base scenario, the parameters in SI and the sweep settings.

    Raises
    ------
    InputError
        Naming the file and the key, for an unreadable file, unknown keys, a bad scenario, parameter names or
        values, or bad settings.
    """
    p = Path(path)
    data = _load(p)
    unknown = set(data) - _TOP
    if unknown:
        raise InputError(f"{p}: unknown top-level keys {sorted(unknown)}; allowed: {', '.join(sorted(_TOP))}")
    scenario = _base_scenario(data, p)
    opts = data.get("sweep", {})
    if not isinstance(opts, dict):
        raise InputError(f"{p}: [sweep] must be a table")
    bad = set(opts) - _SWEEP_KEYS
    if bad:
        raise InputError(
            f"{p}: unknown key(s) {sorted(bad)} in [sweep]; allowed: {', '.join(sorted(_SWEEP_KEYS))}"
        )
    design = opts.get("design", "grid")
    if design not in DESIGNS:
        raise InputError(f"{p}: sweep.design must be one of {', '.join(map(repr, DESIGNS))}; got {design!r}")
    try:
        cycles = check_int("cycles", opts.get("cycles", 1000), 1, MAX_CYCLES)
        seed = check_seed(opts.get("seed", 0))
        samples = opts.get("samples")
        if design == "grid" and samples is not None:
            raise InputError("samples applies to the random and lhs designs only")
        if design != "grid":
            if samples is None:
                raise InputError(f"design = {design!r} needs samples (the number of points)")
            samples = check_int("samples", samples, 1, MAX_POINTS)
    except InputError as exc:
        raise InputError(f"{p}: sweep.{exc}") from None
    params = data.get("parameters")
    if not isinstance(params, dict) or not params:
        raise InputError(f"{p}: missing or empty [parameters] table")
    flat = _flatten(params, p)
    try:
        check_parameter_names(scenario, flat)
    except InputError as exc:
        raise InputError(f"{p}: parameters: {exc}") from None
    if design == "grid":
        parsed: dict[str, list | tuple] = {name: _grid_values(name, spec, scenario, p) for name, spec in flat.items()}
    else:
        parsed = {name: _bounds(name, spec, scenario, p) for name, spec in flat.items()}
    return SweepSpec(
        scenario=scenario,
        parameters=parsed,
        design=design,
        cycles=cycles,
        seed=seed,
        samples=samples,
        source=str(p),
    )
