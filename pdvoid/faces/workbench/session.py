"""The workbench without widgets: control values → scenario → simulation → summary numbers, the measured
pattern to compare with, and the messages the panel shows. Everything here runs (and is tested) without a
browser.
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path

from pdvoid.analysis.inception import inception
from pdvoid.analysis.summary import run_summary
from pdvoid.core.errors import InputError
from pdvoid.faces.summary_table import summary_dict
from pdvoid.faces.workbench.controls import CUSTOM_MATERIAL, Controls
from pdvoid.inputs.scenario import Scenario
from pdvoid.simulation.events import Events
from pdvoid.simulation.results import Result
from pdvoid.simulation.simulate import simulate

__all__ = ["Outcome", "WorkbenchSession", "summary_numbers", "describe"]


@dataclass(frozen=True)
class Outcome:
    """What one update of the workbench produced.

    Attributes:
        controls: the control values it ran with.
        scenario: the scenario (None when the controls were invalid).
        result: the simulation (None when invalid); partial when ``stopped``.
        summary: {"name [unit]": value} (empty when invalid).
        error: the InputError message ("" when fine).
        stopped: True when the run was stopped before all cycles ran.
        seconds: wall time of simulation and summary [s].
        comparison: the comparison with the measured pattern (pdvoid.analysis.compare.Comparison) or None.
        comparison_error: why no comparison could be made ("" when fine or no measured pattern).
    """

    controls: Controls
    scenario: Scenario | None = None
    result: Result | None = None
    summary: dict[str, float] = field(default_factory=dict)
    error: str = ""
    stopped: bool = False
    seconds: float = 0.0
    comparison: object | None = None
    comparison_error: str = ""

    @property
    def ok(self) -> bool:
        return not self.error


def summary_numbers(scenario: Scenario, result: Result, test_voltage: float) -> dict[str, float]:
    """The summary table: analytic inception and extinction, the margin to ``test_voltage`` [V rms] and the
    numbers of the simulated run (:func:`pdvoid.analysis.run_summary` in the display units of
    :mod:`pdvoid.faces.summary_table`), with units in the keys."""
    est = inception(scenario)
    out = {
        "inception voltage [kV rms]": est.inception_voltage / 1e3,
        "extinction voltage [kV rms]": est.extinction_voltage / 1e3,
        "applied voltage [kV rms]": scenario.supply.rms / 1e3,
        "test level [kV rms]": test_voltage / 1e3,
        "margin to test level U_inc/U_test [-]": est.inception_voltage / test_voltage,
        "inception field in the void [kV/mm]": est.inception_field / 1e6,
        "field enhancement [-]": est.field_enhancement,
        "cycles run [-]": float(result.cycles),
    }
    out.update(summary_dict(run_summary(result)))
    return out


def describe(controls: Controls) -> str:
    """A one-line description of the controls that matter most (the panel's status marker)."""
    return (
        f"void {controls.diameter_mm:g} mm × {controls.height_mm:g} mm, {controls.gas} at "
        f"{controls.pressure_kPa:g} kPa, εr {controls.permittivity:g}, {controls.thickness_mm:g} mm, "
        f"{controls.voltage_kV:g} kV rms, {controls.model} model"
    )


class WorkbenchSession:
    """Control values, the last outcome and an optional measured pattern.

    Args:
        scenario: the starting scenario (default: the built-in demo, an invented example).
        cycles, seed: run settings [-].
        test_voltage: test level for the margin [V rms]; default the scenario's applied voltage.
    """

    def __init__(
        self,
        scenario: Scenario | None = None,
        *,
        cycles: int = 200,
        seed: int = 1,
        test_voltage: float | None = None,
    ) -> None:
        if scenario is None:
            from pdvoid.inputs.demo import DEMO_TEST_RMS, demo_scenario

            scenario = demo_scenario()
            test_voltage = DEMO_TEST_RMS if test_voltage is None else test_voltage
        self.base = scenario
        self.controls = Controls.from_scenario(scenario, cycles=cycles, seed=seed, test_voltage=test_voltage)
        self.controls.run_settings()
        self.outcome: Outcome | None = None
        self.measured: Events | None = None
        self.measured_name = ""

    # ---- controls ------------------------------------------------------------------------------------------
    def set(self, **values) -> Controls:
        """Change control values. Choosing a host material sets its permittivity; typing a permittivity that
        is not the material's switches the material to the custom choice."""
        new = self.controls.changed(**values)
        if "material" in values and new.material != CUSTOM_MATERIAL and "permittivity" not in values:
            new = new.changed(permittivity=new.material_permittivity())
        elif "permittivity" in values and new.material_permittivity() != new.permittivity:
            new = new.changed(material=CUSTOM_MATERIAL)
        self.controls = new
        return new

    def scenario(self) -> Scenario:
        """The scenario of the current controls (raises InputError when they are impossible)."""
        return self.controls.to_scenario(self.base)

    # ---- running -------------------------------------------------------------------------------------------
    def run(
        self,
        progress: Callable[[int, int], None] | None = None,
        should_stop: Callable[[], bool] | None = None,
        chunk_cycles: int | None = None,
    ) -> Outcome:
        """Simulate the current controls. Invalid input gives an Outcome with ``error`` set, never an
        exception."""
        controls = self.controls
        t0 = time.perf_counter()
        try:
            scenario = controls.to_scenario(self.base)
            cycles, seed, test = controls.run_settings()
            if chunk_cycles is None:
                chunk_cycles = min(max(cycles // 50, 10), 5000)
            result = simulate(
                scenario,
                cycles=cycles,
                seed=seed,
                progress=progress,
                should_stop=should_stop,
                chunk_cycles=chunk_cycles,
            )
            summary = summary_numbers(scenario, result, test)
        except InputError as exc:
            outcome = Outcome(controls=controls, error=str(exc), seconds=time.perf_counter() - t0)
        else:
            comp, comp_err = self._compare(result)
            outcome = Outcome(
                controls=controls,
                scenario=scenario,
                result=result,
                summary=summary,
                stopped=not result.complete,
                seconds=time.perf_counter() - t0,
                comparison=comp,
                comparison_error=comp_err,
            )
        self.outcome = outcome
        return outcome

    # ---- measured pattern ----------------------------------------------------------------------------------
    def load_measured(
        self, path: str | Path, *, cycles: float | None = None, frequency: float | None = None
    ) -> str:
        """Read a measured event list (:func:`pdvoid.io.read_events`; a ``.npz`` file written by
        :meth:`pdvoid.Result.save` is read with :func:`pdvoid.load`) and keep it for comparison.

        Args:
            path: the file [-].
            cycles: AC cycles observed [-]; None: from the file.
            frequency: supply frequency [Hz]; None: from the file's ``# frequency = ...`` line.

        Returns:
            A one-line description. Raises InputError for unreadable files (the panel shows the message).
        """
        p = Path(path)
        if p.suffix.lower() == ".npz":
            from pdvoid.simulation.results import load

            events = load(p).events
        else:
            from pdvoid.io import read_events

            events = read_events(p, cycles=cycles, frequency=frequency)
        self.measured = events
        self.measured_name = p.name
        return f"{p.name}: {events.count} discharges in {events.cycles:g} cycles at {events.frequency:g} Hz"

    def clear_measured(self) -> None:
        self.measured = None
        self.measured_name = ""

    def _compare(self, result: Result) -> tuple[object | None, str]:
        if self.measured is None:
            return None, ""
        try:
            from pdvoid.analysis.compare import compare
        except ImportError:  # the comparison score is optional: the side-by-side plot still works
            return None, "no comparison score in this version"
        threshold = self.measured.extra.get("threshold") if isinstance(self.measured.extra, dict) else None
        threshold = threshold if isinstance(threshold, float) and math.isfinite(threshold) else 0.0
        try:
            return compare(result, self.measured, threshold=threshold), ""
        except InputError as exc:
            return None, str(exc)
