"""The built-in demo: an invented scenario, its invented service and test voltages, and the synthetic
"measured" pattern made from it (labelled synthetic in the file itself)."""

from __future__ import annotations

from importlib import resources
from pathlib import Path

from pdvoid.inputs.scenario import Scenario, read_scenario

__all__ = ["DEMO_SERVICE_RMS", "DEMO_TEST_RMS", "demo_scenario", "demo_scenario_path", "demo_measured_path",
           "demo_sweep_path"]

DEMO_SERVICE_RMS = 8e3  # V, invented service voltage of the demo part
DEMO_TEST_RMS = 18e3  # V, invented test voltage of the demo part


def _example(name: str) -> Path:
    return Path(str(resources.files("pdvoid.inputs") / "examples" / name))


def demo_scenario_path() -> Path:
    """The demo scenario file, ``pdvoid/inputs/examples/demo.toml`` (an invented example).

    Returns
    -------
    pathlib.Path
        Path of the packaged file.
    """
    return _example("demo.toml")


def demo_sweep_path() -> Path:
    """The example sweep file, ``pdvoid/inputs/examples/demo_sweep.toml`` (an invented example).

    Returns
    -------
    pathlib.Path
        Path of the packaged file.
    """
    return _example("demo_sweep.toml")


def demo_measured_path() -> Path:
    """The synthetic demo pattern, ``pdvoid/inputs/examples/demo_measured.csv`` (made by the simulator with hidden
    parameters and detector effects; labelled SYNTHETIC in its header).

    Returns
    -------
    pathlib.Path
        Path of the packaged file.
    """
    return _example("demo_measured.csv")


def demo_scenario() -> Scenario:
    """The built-in demo scenario (an invented example: a 1.5 mm air bubble in 6 mm of filled cast epoxy).

    Returns
    -------
    pdvoid.Scenario
        The scenario read from :func:`demo_scenario_path`.
    """
    return read_scenario(demo_scenario_path())
