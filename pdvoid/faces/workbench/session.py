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
from typing import TYPE_CHECKING, Any

import numpy as np

from pdvoid.analysis.inception import inception
from pdvoid.analysis.regime import discharge_regime
from pdvoid.analysis.summary import run_summary
from pdvoid.core.errors import InputError
from pdvoid.core.validity import collect_validity_notes
from pdvoid.faces.summary_table import summary_dict
from pdvoid.faces.workbench.controls import CUSTOM_MATERIAL, PANEL_VALUES, Controls
from pdvoid.faces.workbench.messages import panel_message
from pdvoid.inputs.scenario import Scenario
from pdvoid.models.time_domain import needs_time_domain
from pdvoid.simulation.events import Events
from pdvoid.simulation.results import Result
from pdvoid.simulation.simulate import simulate

if TYPE_CHECKING:
    from pdvoid.analysis.compare import Comparison

__all__ = ["Outcome", "WorkbenchSession", "summary_numbers", "describe", "HISTOGRAM_FROM_CYCLES", "SAMPLE_CYCLES"]

#: runs of more cycles keep only the phase-resolved histogram (plus the events of the first cycles) [-]
HISTOGRAM_FROM_CYCLES = 20_000
#: cycles whose events a histogram-mode run keeps for the field and pulse-sequence views [-]
SAMPLE_CYCLES = 1000


@dataclass(frozen=True)
class Outcome:
    """What one update of the workbench produced.

    Attributes
    ----------
    controls : Controls
        The control values it ran with.
    scenario : Scenario or None
        The scenario (None when the controls were invalid).
    result : Result or None
        The simulation (None when invalid); partial when ``stopped``.
    summary : dict of str to float
        {"name [unit]": value} (empty when invalid).
    error : str
        The InputError message ("" when fine).
    stopped : bool
        True when the run was stopped before all cycles ran.
    seconds : float
        Wall time of simulation and summary [s].
    comparison : Comparison or None
        The comparison with the measured pattern (pdvoid.analysis.compare.Comparison) or None.
    comparison_error : str
        Why no comparison could be made ("" when fine or no measured pattern).
    validity_notes : tuple of str
        The :class:`~pdvoid.ValidityWarning` messages of this run's numbers (closed forms outside their verified
        range), collected rather than issued; the panel shows them in words next to the summary.
    regime : str
        The run's regime in words (:func:`pdvoid.analysis.regime.discharge_regime`: below inception, waiting for
        a start electron, discharging); "" when invalid.
    network_capacitances : tuple of float or None
        (C_c, C_b) the network model ran with, from the geometry or as typed; None for other models [F].
    model_note : str
        What the model's parameters mean for this run, in words (e.g. that the network model with capacitances
        from a spheroid's geometry reproduces the field model); "" when there is nothing to say.
    sample : Result or None
        For a run of more than :data:`HISTOGRAM_FROM_CYCLES` cycles (histogram mode: ``result`` keeps only the
        phase-resolved counts and the IEC 60270 sums), the events of its first :data:`SAMPLE_CYCLES` cycles with
        the same seed, drawn in the field and pulse-sequence views and compared with the measured pattern;
        None otherwise.
    """

    controls: Controls
    scenario: Scenario | None = None
    result: Result | None = None
    summary: dict[str, float] = field(default_factory=dict)
    error: str = ""
    stopped: bool = False
    seconds: float = 0.0
    comparison: Comparison | None = None
    comparison_error: str = ""
    regime: str = ""
    validity_notes: tuple[str, ...] = ()
    network_capacitances: tuple[float, float] | None = None
    model_note: str = ""
    sample: Result | None = None

    @property
    def ok(self) -> bool:
        """True when the controls were valid (no error)."""
        return not self.error

    @property
    def events_result(self) -> Result | None:
        """The result whose events the field and pulse-sequence views draw: :attr:`sample` in histogram mode,
        else :attr:`result`."""
        return self.sample if self.sample is not None else self.result

    @property
    def mode_note(self) -> str:
        """What a histogram-mode run shows, in words ("" for a run that kept every event)."""
        if self.sample is None or self.result is None:
            return ""
        text = (f"histogram mode ({self.result.requested_cycles} cycles > {HISTOGRAM_FROM_CYCLES}): the pattern "
                f"and the numbers cover all {self.result.cycles} cycles run; the field and pulse-sequence views "
                f"and the comparison show the events of the first {self.sample.cycles} cycles (same seed)")
        hist = self.result.histogram
        if hist is not None and hist.below + hist.above:
            top = float(hist.charge_edges[-1]) / 1e-12
            text += (f"; {hist.below + hist.above} discharges larger than ±{top:.4g} pC (1.25 times the largest of "
                     "the first cycles) are counted in the numbers but lie outside the pattern's range")
        return text


def summary_numbers(scenario: Scenario, result: Result, test_voltage: float) -> dict[str, float]:
    """The summary table: analytic inception and extinction, the margin to ``test_voltage`` [V rms] and the
    numbers of the simulated run (:func:`pdvoid.analysis.run_summary` in the display units of
    :mod:`pdvoid.faces.summary_table`) and the expected wait for the first start electron
    (:func:`pdvoid.analysis.regime.discharge_regime`; inf below inception), with units in the keys.

    Parameters
    ----------
    scenario : Scenario
        The scenario that ran [-].
    result : Result
        Its simulation [-].
    test_voltage : float
        Test level for the margin [V rms].

    Returns
    -------
    dict of str to float
        {"name [unit]": value}.
    """
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
    regime = discharge_regime(scenario, result)
    out["mean wait for a first start electron [s]"] = regime.mean_wait
    out["cycles for a first discharge with 95 % probability [-]"] = regime.cycles_for_95_percent
    return out


def _network_state(scenario: Scenario) -> tuple[tuple[float, float] | None, str]:
    """(C_c, C_b) [F] of a network-model scenario and what they mean in words; (None, "") for other models."""
    model = scenario.model
    if not model.gain_from_network:
        return None, ""
    from pdvoid.coefficients import compute_coefficients

    c = compute_coefficients(scenario)
    caps = (float(c.capacitance_void), float(c.capacitance_series))
    values = f"C_c = {caps[0] / 1e-12:.4g} pF, C_b = {caps[1] / 1e-12:.4g} pF"
    if model.network_capacitances() is not None:
        return caps, f"network model with the typed capacitances {values}"
    note = f"network model with the capacitances from the geometry ({values})"
    if scenario.void.shape == "spheroid":
        note += ("; for a spheroid they are chosen to reproduce the field model's induced charge, so the pattern "
                 "equals the field model's; untick 'C_c and C_b from the geometry' to set them")
    return caps, note


def _histogram_edges(sample: Result) -> np.ndarray:
    """Signed charge edges of a histogram-mode run [C]: 60 linear cells per polarity up to 1.25 times the largest
    magnitude of the first cycles' events (3 times the lag-free charge per discharge without any), as the
    pattern of a run that keeps its events is binned (0 ... largest magnitude)."""
    mags = np.abs(sample.events.charge)
    top = 1.25 * float(mags.max()) if mags.size and mags.max() > 0.0 else 3.0 * abs(
        float(sample.coefficients().charge_per_discharge))
    return np.linspace(-top, top, 121)


def describe(controls: Controls) -> str:
    """A one-line description of the controls that matter most (the panel's status marker).

    Parameters
    ----------
    controls : Controls
        The control values.

    Returns
    -------
    str
        The description, in display units.
    """
    return (
        f"void {controls.diameter_mm:g} mm × {controls.height_mm:g} mm, {controls.gas} at "
        f"{controls.pressure_kPa:g} kPa, εr {controls.permittivity:g}, {controls.thickness_mm:g} mm, "
        f"{controls.voltage_kV:g} kV rms, {controls.model} model"
        + ("" if controls.parameter_set == PANEL_VALUES else f" (parameter set {controls.parameter_set})")
        + (f" (C_c {controls.capacitance_void_pF:.4g} pF, C_b {controls.capacitance_series_pF:.4g} pF)"
           if controls.model == "network" and not controls.network_from_geometry else "")
    )


class WorkbenchSession:
    """Control values, the last outcome and an optional measured pattern.

    Parameters
    ----------
    scenario : Scenario, optional
        The starting scenario (default: the built-in demo, an invented example).
    cycles, seed : int
        Run settings [-].
    test_voltage : float, optional
        Test level for the margin; default the scenario's applied voltage [V rms].

    Attributes
    ----------
    base : Scenario
        The starting scenario; inputs the panel does not show come from it.
    controls : Controls
        The current control values.
    outcome : Outcome or None
        The last update (None before the first run).
    measured : Events or None
        The measured pattern to compare with.
    measured_name : str
        File name of the measured pattern ("" without one).

    Raises
    ------
    InputError
        For a bad scenario or run settings.
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
    def set(self, **values: Any) -> Controls:
        """Change control values. Choosing a host material sets its permittivity; typing a permittivity that
        is not the material's switches the material to the custom choice. Typing a network capacitance unticks
        "from the geometry"; unticking it starts the typed capacitances from the geometry's.

        Parameters
        ----------
        **values : float, str or bool
            New values, named as the fields of :class:`Controls` [display unit of each field].

        Returns
        -------
        Controls
            The new control values.

        Raises
        ------
        InputError
            For unknown control names.
        """
        new = self.controls.changed(**values)
        if "material" in values and new.material != CUSTOM_MATERIAL and "permittivity" not in values:
            new = new.changed(permittivity=new.material_permittivity())
        elif "permittivity" in values and new.material_permittivity() != new.permittivity:
            new = new.changed(material=CUSTOM_MATERIAL)
        typed_caps = {"capacitance_void_pF", "capacitance_series_pF"} & set(values)
        if typed_caps and "network_from_geometry" not in values and any(
                values[k] != getattr(self.controls, k) for k in typed_caps):
            new = new.changed(network_from_geometry=False)  # a typed capacitance is meant to be used
        if values.get("network_from_geometry") is False and min(new.capacitance_void_pF,
                                                                 new.capacitance_series_pF) <= 0.0:
            try:  # start the typed values from the geometry's
                caps, _ = _network_state(new.changed(network_from_geometry=True, model="network")
                                         .to_scenario(self.base))
            except InputError:
                caps = None
            if caps is not None:
                new = new.changed(capacitance_void_pF=caps[0] / 1e-12, capacitance_series_pF=caps[1] / 1e-12)
        self.controls = new
        return new

    def scenario(self) -> Scenario:
        """The scenario of the current controls.

        Returns
        -------
        Scenario
            The scenario (SI).

        Raises
        ------
        InputError
            When the controls are impossible.
        """
        return self.controls.to_scenario(self.base)

    # ---- running -------------------------------------------------------------------------------------------
    def run(
        self,
        progress: Callable[[int, int], None] | None = None,
        should_stop: Callable[[], bool] | None = None,
        chunk_cycles: int | None = None,
    ) -> Outcome:
        """Simulate the current controls. Invalid input gives an Outcome with ``error`` set, never an
        exception.

        Parameters
        ----------
        progress : callable, optional
            Called as progress(cycles_done, cycles_total) after each chunk.
        should_stop : callable, optional
            Polled after each chunk; True ends the run early (the outcome is then ``stopped``).
        chunk_cycles : int, optional
            Cycles per chunk [-]; None: about 1/50 of the run, 10 ... 5000.

        Returns
        -------
        Outcome
            What the run produced (also kept as :attr:`outcome`).
        """
        controls = self.controls
        t0 = time.perf_counter()
        with collect_validity_notes() as notes:
            try:
                scenario = controls.to_scenario(self.base)
                cycles, seed, test = controls.run_settings()
                if chunk_cycles is None:
                    chunk_cycles = min(max(cycles // 50, 10), 5000)
                sample = edges = None
                if cycles > HISTOGRAM_FROM_CYCLES and not needs_time_domain(scenario):
                    sample = simulate(scenario, cycles=SAMPLE_CYCLES, seed=seed)
                    edges = _histogram_edges(sample)
                result = simulate(
                    scenario,
                    cycles=cycles,
                    seed=seed,
                    histogram=sample is not None,
                    charge_edges=edges,
                    progress=progress,
                    should_stop=should_stop,
                    chunk_cycles=chunk_cycles,
                )
                if sample is not None and result.cycles < sample.cycles:  # stopped early: as far as it ran
                    sample = simulate(scenario, cycles=max(result.cycles, 1), seed=seed)
                summary = summary_numbers(scenario, result, test)
                regime = discharge_regime(scenario, result).text
                caps, model_note = _network_state(scenario)
            except InputError as exc:
                error: str | None = panel_message(str(exc))
            else:
                error = None
        if error is not None:
            outcome = Outcome(controls=controls, error=error, seconds=time.perf_counter() - t0)
        else:
            comp, comp_err = self._compare(result if sample is None else sample)
            if caps is not None and controls.network_from_geometry:
                # show the geometry's capacitances (they become the typed values when the box is unticked)
                shown = {"capacitance_void_pF": caps[0] / 1e-12, "capacitance_series_pF": caps[1] / 1e-12}
                if self.controls is controls:
                    self.controls = controls.changed(**shown)
                controls = controls.changed(**shown)
            outcome = Outcome(
                controls=controls,
                network_capacitances=caps,
                model_note=model_note,
                scenario=scenario,
                result=result,
                summary=summary,
                stopped=not result.complete,
                seconds=time.perf_counter() - t0,
                comparison=comp,
                comparison_error=comp_err,
                regime=regime,
                validity_notes=tuple(notes),
                sample=sample,
            )
        self.outcome = outcome
        return outcome

    # ---- measured pattern ----------------------------------------------------------------------------------
    def load_measured(
        self, path: str | Path, *, cycles: float | None = None, frequency: float | None = None
    ) -> str:
        """Read a measured event list (:func:`pdvoid.io.read_events`; a ``.npz`` file written by
        :meth:`pdvoid.Result.save` is read with :func:`pdvoid.load`) and keep it for comparison.

        Parameters
        ----------
        path : str or pathlib.Path
            The file [-].
        cycles : float, optional
            AC cycles observed; None: from the file [-].
        frequency : float, optional
            Supply frequency; None: from the file's ``# frequency = ...`` line [Hz].

        Returns
        -------
        str
            A one-line description.

        Raises
        ------
        InputError
            For unreadable files (the panel shows the message).
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
        """Forget the measured pattern."""
        self.measured = None
        self.measured_name = ""

    def _compare(self, result: Result) -> tuple[Comparison | None, str]:
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
