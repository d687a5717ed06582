"""What a sweep records at each point: the default metrics (SI, snake_case) and the worker function.

A metric function takes a :class:`pdvoid.simulation.results.Result` and returns ``{"name [unit]": number}``; the sweep
turns each key into a variable ``name`` with ``attrs["units"] = unit``. It must be picklable (defined at
module level) to run on worker processes or Dask.
"""

from __future__ import annotations

import re
from collections.abc import Callable, Mapping

import numpy as np

from pdvoid.analysis.summary import RunSummary, run_summary
from pdvoid.coefficients import compute_coefficients
from pdvoid.core.errors import InputError
from pdvoid.inputs.scenario import Scenario
from pdvoid.simulation.results import Result
from pdvoid.simulation.simulate import simulate

__all__ = ["default_metrics", "split_key", "run_point", "DESCRIPTIONS", "RESERVED", "SUMMARY_VARIABLES"]

#: variable names the sweep itself uses
RESERVED = ("seed", "error", "point")

#: RunSummary attributes a sweep records (variable name = attribute name, unit = RunSummary.UNITS)
SUMMARY_VARIABLES = (
    "discharges_per_cycle", "mean_apparent_charge", "largest_apparent_charge", "average_discharge_current",
    "quadratic_rate", "discharge_power", "pulse_repetition_rate",
)

#: long_name attributes of the default variables
DESCRIPTIONS: dict[str, str] = {
    "discharges_per_cycle": "discharges per AC cycle",
    "mean_apparent_charge": "mean magnitude of the apparent charge",
    "largest_apparent_charge": "largest magnitude of the apparent charge",
    "average_discharge_current": "average discharge current I (IEC 60270)",
    "quadratic_rate": "quadratic rate D (IEC 60270)",
    "discharge_power": "discharge power P (IEC 60270)",
    "pulse_repetition_rate": "pulse repetition rate n (IEC 60270)",
    "inception_voltage": "inception voltage, rms of the applied voltage (analytic, model's criterion)",
    "extinction_voltage": "extinction voltage estimate, rms of the applied voltage (analytic)",
    "seed": "simulation seed of the point",
    "error": "why the point failed (empty when it ran)",
}

_KEY = re.compile(r"^\s*(.*?)\s*\[([^\[\]]*)\]\s*$")


def split_key(key: str) -> tuple[str, str | None]:
    """Split a metric key into a variable name and a unit: ``"mean charge [pC]"`` → ``("mean_charge", "pC")``.

    Parameters
    ----------
    key : str
        ``"name [unit]"`` or ``"name"`` [-].

    Returns
    -------
    tuple of (str, str or None)
        The variable name (snake_case) and the unit; None without brackets, "1" for "-" or "".

    Raises
    ------
    InputError
        When ``key`` is not text or gives no usable variable name (it must start with a letter).
    """
    if not isinstance(key, str):
        raise InputError(f"metric names must be text like 'name [unit]'; got {key!r}")
    m = _KEY.match(key)
    name, unit = (m.group(1), m.group(2).strip()) if m else (key, None)
    var = re.sub(r"[^0-9A-Za-z]+", "_", name).strip("_").lower()
    if not var or var[0].isdigit():
        raise InputError(f"metric name {key!r} does not give a usable variable name (letters first)")
    if unit == "-" or unit == "":
        unit = "1"
    return var, unit


def default_metrics(result: Result) -> dict[str, float]:
    """The sweep's default numbers of one run, in SI.

    The numbers of :func:`pdvoid.analysis.summary.run_summary` named in :data:`SUMMARY_VARIABLES` plus the
    analytic inception and extinction voltage of the run's scenario.

    Parameters
    ----------
    result : pdvoid.simulation.results.Result
        The simulated point [-].

    Returns
    -------
    dict of str to float
        ``{"discharges_per_cycle [1]", "mean_apparent_charge [C]", "largest_apparent_charge [C]",
        "average_discharge_current [A]", "quadratic_rate [C^2/s]", "discharge_power [W]",
        "pulse_repetition_rate [1/s]", "inception_voltage [V]", "extinction_voltage [V]"}`` (rms voltages);
        ``largest_apparent_charge`` is NaN for a run without event arrays.
    """
    summary = run_summary(result)
    out = {f"{name} [{RunSummary.UNITS[name]}]": float(getattr(summary, name)) for name in SUMMARY_VARIABLES}
    c = compute_coefficients(result.scenario)
    out["inception_voltage [V]"] = float(c.inception_voltage)
    out["extinction_voltage [V]"] = float(c.extinction_voltage)
    return out


def _numbers(values: object) -> dict[str, float]:
    if not isinstance(values, Mapping):
        raise InputError(f"a metric function must return a dict of numbers; got {type(values).__name__}")
    out = {}
    variables: dict[str, str] = {}
    for key, v in values.items():
        var, _ = split_key(key)
        if var in RESERVED:
            raise InputError(f"metric {key!r} gives the variable name {var!r}, which the sweep reserves")
        if var in variables:
            raise InputError(f"metrics {variables[var]!r} and {key!r} both give the variable name {var!r}")
        variables[var] = key
        if isinstance(v, bool) or not isinstance(v, (int, float, np.integer, np.floating)):
            raise InputError(f"metric {key!r} must be a real number; got {v!r}")
        out[key] = float(v)
    return out


def run_point(
    item: tuple[dict, int], *, scenario: Scenario, cycles: int, metrics: Callable | None = None
) -> tuple[dict[str, float], str]:
    """Run one sweep point.

    Parameters
    ----------
    item : tuple of (dict, int)
        ``(changes, seed)``: the dotted-path changes of the base scenario [SI] and the point's seed [-].
    scenario : Scenario
        The base scenario [-].
    cycles : int
        AC cycles to simulate [-].
    metrics : callable or None
        ``f(result) -> {"name [unit]": number}``; None for :func:`default_metrics` [-].

    Returns
    -------
    tuple of (dict of str to float, str)
        (metrics, "") on success and ({}, message) when the point is impossible (any InputError from the
        changed scenario, the simulation or the metric function). Other exceptions propagate: they are bugs.
    """
    changes, seed = item
    try:
        point = scenario.replace(**changes)
        result = simulate(point, cycles=cycles, seed=seed)
        values = _numbers((metrics or default_metrics)(result))
    except InputError as exc:
        return {}, str(exc) or "InputError"
    return values, ""
