"""Sweep outcomes → a labelled xarray Dataset (units in attributes), and its NetCDF file.

Layout:

- grid: one dimension per swept parameter, named by its dotted path ("void.diameter"), with the listed
  values as coordinate; random/lhs: one dimension "point" (0..n-1) with each parameter's values as a
  coordinate along it.
- one float64 variable per metric, ``attrs["units"]`` SI ("1" = dimensionless); NaN where the point failed
  or the metric is undefined there (the largest charge of a run without discharges);
- "seed" (int32): the simulation seed of each point; "error" (text): why a point failed, "" where it ran.
- dataset attributes: design, master seed (an integer; its decimal digits as text from 2**31 on, which
  NetCDF-3 integers cannot hold), cycles, samples, parameters, the base scenario as TOML text, the pdvoid
  version, the number of failed points.

Everything in the Dataset fits NetCDF-3 (no 64-bit integers, no booleans in attributes), so
``write_netcdf`` works with scipy alone.
"""

from __future__ import annotations

import os
import tomllib
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from pdvoid._version import __version__
from pdvoid.core.errors import InputError
from pdvoid.core.files import atomic_write
from pdvoid.core.optional import require
from pdvoid.inputs.scenario import Scenario, scenario_from_dict
from pdvoid.inputs.scenario_files import scenario_to_dict
from pdvoid.sweeps.checkpoint import metrics_name
from pdvoid.sweeps.metrics import DESCRIPTIONS, RESERVED, split_key
from pdvoid.sweeps.names import parameter_unit
from pdvoid.sweeps.plan import Plan

if TYPE_CHECKING:
    import xarray

__all__ = ["assemble", "write_netcdf", "read_netcdf", "base_scenario", "check_sweep_dataset", "SEEDS_CHECKED"]

_INT32_MAX = 2**31 - 1
COMMENT = (
    "simulated with pdvoid: engineering estimates from idealised models; test and acceptance levels come "
    "from the applicable standards"
)
SEEDING = (
    "point i simulates with seed SeedSequence(seed).spawn(n)[i].generate_state(1)[0] >> 1; random/lhs "
    "samples come from default_rng(SeedSequence(seed))"
)


def _metric_order(
    outcomes: Sequence[tuple[dict, str]], names: Sequence[str]
) -> dict[str, tuple[str, str | None]]:
    """key -> (variable, unit), in order of first appearance; clashes are InputError."""
    seen: dict[str, tuple[str, str | None]] = {}
    taken = {v: "a swept parameter" for v in names} | {v: "reserved" for v in RESERVED}
    for values, _ in outcomes:
        for key in values:
            if key in seen:
                continue
            var, unit = split_key(key)
            if var in taken:
                raise InputError(f"metric {key!r} gives the variable name {var!r}, which is {taken[var]}")
            taken[var] = f"the variable of metric {key!r}"
            seen[key] = (var, unit)
    return seen


def assemble(
    plan: Plan,
    outcomes: Sequence[tuple[dict[str, float], str]],
    *,
    scenario: Scenario,
    cycles: int,
    metrics: Callable | None = None,
) -> xarray.Dataset:
    """Build the sweep Dataset from the plan and one (metrics, error) outcome per point (flat, plan order).

    Parameters
    ----------
    plan : Plan
        The points and their seeds [-].
    outcomes : sequence of (dict of str to float, str)
        Per point, ({"name [unit]": value}, "") or ({}, error message) [-].
    scenario : Scenario
        The base scenario (stored as the ``scenario_toml`` attribute) [-].
    cycles : int
        AC cycles per point [-].
    metrics : callable or None
        The metric function used; None for the default metrics [-].

    Returns
    -------
    xarray.Dataset
        One variable per metric (``units`` and ``long_name`` attributes), ``seed`` and ``error``, on the grid's
        dimensions or on ``point``; the settings as attributes.

    Raises
    ------
    InputError
        When the number of outcomes differs from the plan's points, or metric names clash.
    MissingDependencyError
        When xarray is missing.
    """
    xr = require("xarray")
    n = plan.n_points
    if len(outcomes) != n:
        raise InputError(f"expected {n} outcomes (one per point); got {len(outcomes)}")
    order = _metric_order(outcomes, plan.names)
    if plan.design == "grid":
        dims = plan.names
        coords = {name: (name, plan.axes[name], _param_attrs(name, scenario, plan)) for name in plan.names}
    else:
        dims = ("point",)
        coords = {"point": ("point", np.arange(n, dtype=np.int32), {"long_name": "sweep point"})}
        coords |= {
            name: ("point", plan.values[name], _param_attrs(name, scenario, plan)) for name in plan.names
        }
    data = {}
    for key, (var, unit) in order.items():
        arr = np.full(n, np.nan)
        for i, (values, _) in enumerate(outcomes):
            if key in values:
                arr[i] = values[key]
        attrs = {"long_name": DESCRIPTIONS.get(var, var.replace("_", " "))}
        if unit is not None:
            attrs["units"] = unit
        data[var] = (dims, arr.reshape(plan.shape), attrs)
    errors = [err for _, err in outcomes]
    data["seed"] = (dims, plan.seeds.reshape(plan.shape), {"long_name": DESCRIPTIONS["seed"], "units": "1"})
    data["error"] = (
        dims,
        np.array(errors, dtype=str).reshape(plan.shape),
        {"long_name": DESCRIPTIONS["error"]},
    )
    ds_attrs: dict[str, str | int] = {
        "title": "pdvoid parameter sweep",
        "design": plan.design,
        # NetCDF-3 attributes hold 32-bit signed integers: a master seed of 2**31 or more is kept as its digits
        "seed": int(plan.seed) if plan.seed <= _INT32_MAX else str(int(plan.seed)),
        "cycles": int(cycles),
        "parameters": ", ".join(plan.names),
        "points": int(n),
        "failed_points": int(sum(1 for e in errors if e)),
        "metrics": metrics_name(metrics),
        "seeding": SEEDING,
        "scenario_toml": _scenario_text(scenario),
        "pdvoid_version": __version__,
        "comment": COMMENT,
    }
    if plan.design != "grid":
        ds_attrs["samples"] = int(n)
    return xr.Dataset(data, coords=coords, attrs=ds_attrs)


def _param_attrs(name: str, scenario: Scenario, plan: Plan) -> dict:
    attrs: dict = {"long_name": f"swept parameter {name}"}
    unit = parameter_unit(name, scenario)
    if unit is not None:
        attrs["units"] = unit
    if name in plan.bounds:
        low, high = plan.bounds[name]
        attrs["sampled_low"] = float(low)
        attrs["sampled_high"] = float(high)
        attrs["sampling"] = ("log-uniform" if name in plan.log_scale else "uniform") + (
            ", Latin hypercube" if plan.design == "lhs" else ", independent"
        )
    return attrs


def _scenario_text(scenario: Scenario) -> str:
    import tomli_w

    return tomli_w.dumps(scenario_to_dict(scenario))


def base_scenario(ds: xarray.Dataset) -> Scenario:
    """The scenario a sweep Dataset started from (its points are ``base_scenario(ds).replace(...)``).

    Parameters
    ----------
    ds : xarray.Dataset
        A Dataset from :func:`pdvoid.sweeps.sweep` or :func:`read_netcdf` [-].

    Returns
    -------
    Scenario
        The base scenario, read from the ``scenario_toml`` attribute.

    Raises
    ------
    InputError
        When the Dataset has no such attribute, or it does not hold a valid scenario.
    """
    text = getattr(ds, "attrs", {}).get("scenario_toml")
    if not isinstance(text, str):
        raise InputError("this Dataset has no 'scenario_toml' attribute: it was not made by pdvoid.sweeps")
    return scenario_from_dict(tomllib.loads(text), source="sweep dataset attribute scenario_toml")


def write_netcdf(ds: xarray.Dataset, path: str | os.PathLike, *, engine: str = "scipy") -> Path:
    """Write the sweep Dataset to a NetCDF file.

    Parameters
    ----------
    ds : xarray.Dataset
        a Dataset from :func:`pdvoid.sweeps.sweep`.
    path : str or os.PathLike
        file to write.
    engine : str
        xarray backend; "scipy" (default, no extra package) writes NetCDF-3 classic, readable by every
        NetCDF tool; "netcdf4" or "h5netcdf" write NetCDF-4 if those packages are installed.

    Returns
    -------
    Path
        The path written.

    Raises
    ------
    InputError
        When ``ds`` is not a Dataset or the file cannot be written.
    """
    xr = require("xarray")
    if not isinstance(ds, xr.Dataset):
        raise InputError(f"ds must be an xarray.Dataset; got {type(ds).__name__}")
    p = Path(path)
    try:
        # written whole to a temporary file beside the target and renamed into place: a full disk or a kill
        # leaves the previous file as it was, never a partial one
        with atomic_write(p) as fh:
            fh.write(ds.to_netcdf(engine=engine))
    except OSError as exc:
        raise InputError(f"{p}: cannot write NetCDF file ({exc.strerror or exc})") from None
    return p


#: at most this many point seeds are recomputed when a file is checked (evenly spaced, first and last included)
SEEDS_CHECKED = 10_000
_REQUIRED_ATTRS = ("design", "seed", "cycles", "points", "failed_points", "parameters", "scenario_toml")


def _whole(value: object) -> int | None:
    if isinstance(value, str) and value.isascii() and value.isdigit() and len(value) <= 10:
        return int(value)  # a master seed beyond the 32-bit integers of NetCDF-3 attributes
    if isinstance(value, (bool, np.bool_)) or not isinstance(value, (int, np.integer)):
        return None
    return int(value)


def check_sweep_dataset(ds: xarray.Dataset, source: str = "dataset") -> None:
    """Refuse a sweep Dataset whose parts do not fit together (a damaged, edited or mixed file).

    Checked: the attributes a sweep writes (design, master seed, cycles, points, failed points, parameters,
    base scenario) are present and valid; each swept parameter is a coordinate and the dimensions are those of
    the design (grid: one per parameter; random/lhs: ``point`` = 0..n−1); ``seed``, ``error`` and every metric
    lie on exactly those dimensions; the number of points and of failed points agree with the variables;
    failed points have NaN metrics; the seeds are the master seed's (all of them up to
    :data:`SEEDS_CHECKED` points, else that many evenly spaced ones).

    Parameters
    ----------
    ds : xarray.Dataset
        A Dataset read from a sweep file [-].
    source : str
        What it was read from, for messages [-].

    Raises
    ------
    InputError
        "incomplete or inconsistent sweep file: ..." with the first disagreement found.
    """
    from pdvoid.sweeps.plan import DESIGNS

    head = f"{source}: incomplete or inconsistent sweep file"
    attrs = ds.attrs
    missing = [a for a in _REQUIRED_ATTRS if a not in attrs]
    if attrs.get("title") != "pdvoid parameter sweep" or missing:
        raise InputError(f"{head}: not written by pdvoid.sweeps (missing attributes: "
                         f"{', '.join(missing) or 'title'})")
    design = attrs["design"]
    if design not in DESIGNS:
        raise InputError(f"{head}: design {design!r} is not one of {', '.join(DESIGNS)}")
    numbers = {k: _whole(attrs[k]) for k in ("seed", "cycles", "points", "failed_points")}
    for key, low in (("seed", 0), ("cycles", 1), ("points", 0), ("failed_points", 0)):
        value = numbers[key]
        if value is None or value < low:
            raise InputError(f"{head}: attribute {key} must be a whole number >= {low}; got {attrs[key]!r}")
    n, failed, master = numbers["points"], numbers["failed_points"], numbers["seed"]
    assert n is not None and failed is not None and master is not None
    if not isinstance(attrs["parameters"], str) or not attrs["parameters"].strip():
        raise InputError(f"{head}: attribute parameters must name the swept parameters")
    names = tuple(attrs["parameters"].split(", "))
    absent = [name for name in names if name not in ds.coords]
    if absent:
        raise InputError(f"{head}: swept parameter(s) {', '.join(absent)} missing as coordinates")
    dims = names if design == "grid" else ("point",)
    for name in names:
        if ds[name].dims != ((name,) if design == "grid" else ("point",)):
            raise InputError(f"{head}: coordinate {name} lies on {ds[name].dims}, not on {dims}")
    if design != "grid":
        if "point" not in ds.coords or not np.array_equal(ds["point"].values, np.arange(ds.sizes.get("point", 0))):
            raise InputError(f"{head}: the point coordinate must number the points 0..n-1")
    for required in ("seed", "error"):
        if required not in ds.data_vars:
            raise InputError(f"{head}: variable {required!r} is missing")
    for variable in ds.data_vars:
        if ds[variable].dims != dims:
            raise InputError(f"{head}: variable {variable!r} lies on {ds[variable].dims}, not on {dims}")
    size = int(np.prod([ds.sizes[d] for d in dims]))
    if size != n:
        raise InputError(f"{head}: attribute points = {n} but the variables hold {size} points")
    errors = np.asarray(ds["error"].values).astype(str).ravel()
    bad = errors != ""
    if int(bad.sum()) != failed:
        raise InputError(f"{head}: attribute failed_points = {failed} but {int(bad.sum())} points carry an error")
    for metric in ds.data_vars:
        if metric in ("seed", "error"):
            continue
        values = np.asarray(ds[metric].values)
        if not np.issubdtype(values.dtype, np.floating):
            raise InputError(f"{head}: metric {metric!r} is not floating point ({values.dtype})")
        if np.any(np.isfinite(values.ravel()[bad])):
            raise InputError(f"{head}: metric {metric!r} has values at points that failed")
    seeds = np.asarray(ds["seed"].values).ravel()
    if not np.issubdtype(seeds.dtype, np.integer):
        raise InputError(f"{head}: variable seed is not integer ({seeds.dtype})")
    picks: list[int] = np.unique(np.linspace(0, n - 1, min(n, SEEDS_CHECKED)).round()).astype(int).tolist()
    for i in picks:
        expected = int(np.random.SeedSequence(master, spawn_key=(int(i),)).generate_state(1, dtype=np.uint32)[0]) >> 1
        if int(seeds[i]) != expected:
            raise InputError(f"{head}: the seed of point {int(i)} is not that of master seed {master} (points "
                             "from different sweeps?)")
    try:
        base_scenario(ds)
    except InputError as exc:
        raise InputError(f"{head}: {exc}") from None


def read_netcdf(path: str | os.PathLike, *, engine: str | None = None) -> xarray.Dataset:
    """Read a sweep NetCDF file fully into memory (the file is closed on return) and check it.

    Parameters
    ----------
    path : str or os.PathLike
        The file [-].
    engine : str or None
        xarray backend; None to let xarray choose [-].

    Returns
    -------
    xarray.Dataset
        The sweep Dataset (the ``error`` variable as text).

    Raises
    ------
    InputError
        When the file does not exist, is not a readable NetCDF file, or is not a consistent sweep file
        (:func:`check_sweep_dataset`: missing attributes or variables, wrong dimensions, counts that disagree
        with the variables, seeds of another sweep).
    """
    xr = require("xarray")
    p = Path(path)
    if not p.is_file():
        raise InputError(f"{p}: no such file")
    try:
        ds = xr.load_dataset(p, engine=engine)
    except (OSError, ValueError, TypeError, KeyError, IndexError, RuntimeError) as exc:
        raise InputError(f"{p}: not a readable NetCDF file ({type(exc).__name__}: {exc})") from None
    if "error" in ds:
        ds["error"] = ds["error"].astype(str)  # NetCDF-3 text comes back as objects
    check_sweep_dataset(ds, str(p))
    return ds
