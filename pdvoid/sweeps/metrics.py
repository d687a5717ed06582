"""What a sweep records at each point: the default metrics (SI, snake_case) and the worker function.

A metric function takes a :class:`pdvoid.simulation.results.Result` and returns ``{"name [unit]": number}``; the sweep
turns each key into a variable ``name`` with ``attrs["units"] = unit``. It must be picklable (defined at
module level) to run on worker processes or Dask.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Mapping

import numpy as np

from pdvoid.analysis.summary import run_summary
from pdvoid.coefficients import compute_coefficients
from pdvoid.core.errors import InputError
from pdvoid.inputs.scenario import Scenario
from pdvoid.simulation.simulate import simulate

__all__ = ["default_metrics", "split_key", "run_point", "DESCRIPTIONS", "RESERVED"]

#: variable names the sweep itself uses
RESERVED = ("seed", "error", "point")

# run_summary key -> (variable, factor to SI, SI unit)
_SUMMARY: dict[str, tuple[str, float, str]] = {
    "discharges per cycle [-]": ("discharges_per_cycle", 1.0, "1"),
    "mean apparent charge [pC]": ("mean_apparent_charge", 1e-12, "C"),
    "largest apparent charge [pC]": ("largest_apparent_charge", 1e-12, "C"),
    "average discharge current I [nA]": ("average_discharge_current", 1e-9, "A"),
    "quadratic rate D [pC²/s]": ("quadratic_rate", 1e-24, "C^2/s"),
    "discharge power P [mW]": ("discharge_power", 1e-3, "W"),
    "pulse repetition rate n [1/s]": ("pulse_repetition_rate", 1.0, "1/s"),
}

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
    """``"mean charge [pC]"`` → ``("mean_charge", "pC")``; no brackets: no unit (None); "-" → "1"."""
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


def default_metrics(result) -> dict[str, float]:
    """run_summary's numbers in SI plus the analytic inception and extinction voltage.

    Returns ``{"discharges_per_cycle [1]", "mean_apparent_charge [C]", "largest_apparent_charge [C]",
    "average_discharge_current [A]", "quadratic_rate [C^2/s]", "discharge_power [W]",
    "pulse_repetition_rate [1/s]", "inception_voltage [V]", "extinction_voltage [V]"}`` (rms voltages).
    A key run_summary adds later is kept with its own unit, unconverted.
    """
    out: dict[str, float] = {}
    summary = run_summary(result)
    for var, _, unit in _SUMMARY.values():
        out[f"{var} [{unit}]"] = math.nan  # present even when run_summary leaves it out
    for key, value in summary.items():
        if key in _SUMMARY:
            var, factor, unit = _SUMMARY[key]
            out[f"{var} [{unit}]"] = float(value) * factor
        else:
            var, unit = split_key(key)
            out[f"{var} [{unit}]" if unit else var] = float(value)
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
    """Run one sweep point: ``item = (changes, seed)``.

    Returns (metrics, "") on success and ({}, message) when the point is impossible (any InputError from the
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
