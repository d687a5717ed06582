"""The workbench: the widgets of :mod:`pdvoid.faces.workbench.layout` wired to a :class:`WorkbenchSession`.

A control change updates the session at once and asks the :class:`DebouncedWorker` for a run; the run (in a
background thread, so the Stop button stays live) feeds the progress bar, then the images, the summary table
and the status line are replaced. Invalid input shows the InputError message in the panel.
"""

from __future__ import annotations

import math
import tempfile
import threading
import time
import traceback
from collections.abc import Callable, Iterator
from pathlib import Path
from typing import TYPE_CHECKING, Any

from pdvoid.core.errors import InputError, check_choice
from pdvoid.faces.workbench.controls import MAX_CYCLES, NETWORK_CONTROLS, SPECS, parse_whole_number
from pdvoid.faces.workbench.layout import build_panel, message_html, summary_html
from pdvoid.faces.workbench.messages import panel_message
from pdvoid.faces.workbench.optional import require
from pdvoid.faces.workbench.scheduler import DebouncedWorker
from pdvoid.faces.workbench.session import Outcome, WorkbenchSession, describe
from pdvoid.inputs.scenario import Scenario

if TYPE_CHECKING:
    import ipywidgets

    from pdvoid.faces.workbench.live import LiveViews

__all__ = ["Workbench", "open_workbench"]

#: how the views are drawn: kept figures updated in place, or new figures on each update (the former way)
DRAWINGS = ("in place", "new figures")
_WHOLE_RANGES = {"cycles": (1, MAX_CYCLES), "seed": (0, 2**32 - 1)}  # what the whole-number fields take


class Workbench:
    """An interactive panel for one void scenario (ipywidgets; JupyterLab and the classic notebook).

    ``show()`` returns the panel widget; :func:`open_workbench` displays it in one call.

    Parameters
    ----------
    scenario : Scenario, optional
        The starting scenario (default: the built-in demo, an invented example).
    cycles, seed : int
        Run settings [-].
    test_voltage : float, optional
        Test level for the margin; default the demo's test level or the applied voltage [V rms].
    delay : float
        Quiet time after the last change before a run starts [s].
    export_folder : str or pathlib.Path, optional
        The folder the export field shows at first; default ``~/pdvoid_export`` (outside any project folder;
        an export never replaces files unless asked to) [-].
    drawing : str
        "in place": the views are kept figures whose data is replaced on each update
        (:mod:`pdvoid.faces.workbench.live`); "new figures": each update builds new figures, the former way
        (kept to measure the difference, ``benchmarks/workbench_redraw.py``) [-].

    Attributes
    ----------
    session : WorkbenchSession
        Control values, the last outcome and the measured pattern.
    panel : Panel
        The widgets.
    worker : DebouncedWorker
        Runs the updates in the background.
    last_latency : float
        Seconds from the last change to its redrawn panel [s].
    runs : int
        Completed updates [-].

    Raises
    ------
    WorkbenchDependencyError
        When ipywidgets is not installed.
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
        delay: float = 0.05,
        export_folder: str | Path | None = None,
        drawing: str = "in place",
    ) -> None:
        require("ipywidgets")
        self.drawing = check_choice("drawing", drawing, DRAWINGS)
        self.session = WorkbenchSession(scenario, cycles=cycles, seed=seed, test_voltage=test_voltage)
        if export_folder is None:
            export_folder = Path.home() / "pdvoid_export"
        if not isinstance(export_folder, (str, Path)):
            raise InputError(f"export_folder must be a folder path; got {export_folder!r}")
        folder = str(Path(export_folder).expanduser().resolve())
        self.panel = build_panel(self.session.controls, self.session.base.name or "scenario", folder)
        self.worker = DebouncedWorker(self._job, delay=delay, on_error=self._internal_error)
        self._render_lock = threading.Lock()
        self._live: LiveViews | None = None
        self._syncing = False
        self._last_progress = 0.0
        self._upload_dir: Path | None = None
        self._measured_choice = ""  # "upload" or "path": the file source the user chose last
        self._shown: Outcome | None = None  # the outcome the views and numbers show
        self.last_latency = float("nan")  #: seconds from the last change to its redrawn panel [s]
        self.runs = 0  #: completed updates [-]
        for name, widget in self.panel.controls.items():
            widget.observe(self._on_change(name), names="value")
        for name, box in self.panel.entries.items():
            box.observe(self._on_entry(name), names="value")
        self.panel.stop.on_click(lambda _b: self.worker.stop())
        m = self.panel.measured
        m["load"].on_click(lambda _b: self._load_measured())
        m["clear"].on_click(lambda _b: self._clear_measured())
        m["upload"].observe(self._on_upload, names="value")
        m["path"].observe(self._on_path, names="value")
        self.panel.export["button"].on_click(lambda _b: self.export())
        self._sync_widgets()
        self.update_now()

    # ---- public --------------------------------------------------------------------------------------------
    def show(self) -> ipywidgets.VBox:
        """The panel widget (display it, or leave it as a cell's last expression).

        Returns
        -------
        ipywidgets.VBox
            The panel.
        """
        return self.panel.root

    @property
    def widgets(self) -> dict[str, ipywidgets.DOMWidget]:
        """The control widgets by control name (see :data:`pdvoid.faces.workbench.controls.SPECS`)."""
        return self.panel.controls

    @property
    def outcome(self) -> Outcome | None:
        """The last update (None before the first)."""
        return self.session.outcome

    def update_now(self) -> Outcome:
        """Run and redraw in the calling thread (no debounce).

        Returns
        -------
        Outcome
            What the run produced.
        """
        self.worker.last_request_time = time.perf_counter()
        return self._job(lambda: False)

    def wait(self, timeout: float = 60.0) -> bool:
        """Block until pending updates are drawn.

        Parameters
        ----------
        timeout : float
            Longest wait [s].

        Returns
        -------
        bool
            True when everything is drawn, False on timeout.
        """
        return self.worker.wait(timeout)

    def close(self) -> None:
        """Stop the background thread and close the widgets."""
        self.worker.close()
        self.panel.root.close()

    def export(self, folder: str | Path | None = None) -> list[Path]:
        """Write figures, scenario and result into ``folder`` (atomic writes). Existing files are replaced only
        when the panel's "replace existing files" box is ticked, and the message names the replaced ones.
        Errors are shown in the panel and return an empty list.

        Parameters
        ----------
        folder : str or pathlib.Path, optional
            Where to write; default: the panel's folder field [-].

        Returns
        -------
        list of pathlib.Path
            The paths written.
        """
        from pdvoid.faces.workbench.views import export

        e = self.panel.export
        formats = tuple(f for f in ("png", "svg") if e[f].value)
        target = e["folder"].value if folder is None else folder
        try:
            if self._stale():
                raise InputError("nothing exported: the controls hold an input error, and the views are from an "
                                 "earlier input; fix the input first")
            before = {p for p in Path(str(target)).expanduser().glob("*")} if str(target).strip() else set()
            with self._render_lock:
                paths = export(target, self.session.outcome, self.session.measured, formats=formats,
                               overwrite=bool(e["overwrite"].value))
        except InputError as exc:
            e["message"].value = message_html(str(exc), "error")
            return []
        lines = [f"{p}{' (replaced)' if p.resolve() in {b.resolve() for b in before} else ''}" for p in paths]
        e["message"].value = message_html("written:\n" + "\n".join(lines), "info", compact=True)
        return paths

    def __repr__(self) -> str:
        return f"<pdvoid Workbench: {describe(self.session.controls)}>"

    # ---- callbacks -----------------------------------------------------------------------------------------
    def _on_change(self, name: str) -> Callable[[dict[str, Any]], None]:
        spec = SPECS[name]

        def handler(change: dict[str, Any]) -> None:
            if self._syncing:
                return
            value = change["new"]
            self.panel.notice.value = ""
            try:
                if spec.kind == "int":
                    value = parse_whole_number(spec.label.partition(" [")[0], value, *_WHOLE_RANGES[name])
                self.session.set(**{name: value})
            except InputError as exc:
                self._input_error(panel_message(str(exc)))
                return
            self._sync_widgets()
            self.panel.status.value = message_html(f"update pending: {describe(self.session.controls)}", "")
            self.worker.request()

        return handler

    def _on_entry(self, name: str) -> Callable[[dict[str, Any]], None]:
        """A value typed into the box beside slider ``name``: moved onto the slider, whose range is widened
        (and the panel says so) when the value lies beyond it; a value a slider cannot hold (zero or negative)
        goes to the session, whose check explains what is allowed."""
        slider = self.panel.controls[name]
        label, _, unit = SPECS[name].label.partition(" [")
        unit = unit.rstrip("]")

        def handler(change: dict[str, Any]) -> None:
            if self._syncing:
                return
            value = float(change["new"])
            if slider.min <= value <= slider.max:
                self.panel.notice.value = ""
                slider.value = value
                return
            if value <= 0.0 or not math.isfinite(value):
                self.panel.notice.value = ""
                self.session.set(**{name: value})
                self.worker.request()  # the run reports the input error in the panel's units
                return
            old = (slider.min, slider.max)
            self._syncing = True
            try:
                slider.max = max(slider.max, value)
                slider.min = min(slider.min, value)
            finally:
                self._syncing = False
            slider.value = value
            self.panel.notice.value = message_html(
                f"{label} {value:g} {unit} lies beyond the slider's range ({old[0]:g} to {old[1]:g} {unit}): the "
                f"value is used as typed and the slider now reaches it", "info")

        return handler

    def _sync_widgets(self) -> None:
        """Show values the session changed on its own (a material sets the permittivity and back; the network
        model's capacitances from the geometry), the sliders' entry boxes, and enable the network model's
        controls only when it is chosen."""
        c = self.session.controls
        self._syncing = True
        try:
            for name in ("material", "permittivity", *NETWORK_CONTROLS):
                value = getattr(c, name)
                if self.panel.controls[name].value != value:
                    self.panel.controls[name].value = value
            for name, box in self.panel.entries.items():
                if box.value != getattr(c, name):
                    box.value = getattr(c, name)
            for name in NETWORK_CONTROLS:
                self.panel.controls[name].disabled = c.model != "network"
        finally:
            self._syncing = False

    def _stale(self) -> bool:
        return bool(self.panel.stale.value)

    def _mark_stale(self, stale: bool) -> None:
        """Grey the views and numbers, and say why, while they do not show the controls' values."""
        p = self.panel
        targets = [*p.images.values(), p.summary, p.measured["image"]]
        for widget in targets:
            if stale:
                widget.add_class("pdvoid-stale")
            else:
                widget.remove_class("pdvoid-stale")
        last = self._shown
        shown = describe(last.controls) if last is not None else "an earlier input"
        p.stale.value = message_html(
            f"Out of date: the pictures and numbers below are from the last valid input ({shown}), not from the "
            "controls as they are now. Correct the input above to update them.", "error") if stale else ""

    def _input_error(self, text: str) -> None:
        self.panel.error.value = message_html(text, "error")
        self.panel.status.value = message_html(f"not run (input error): {describe(self.session.controls)}",
                                               "error")
        self._mark_stale(True)

    def _progress(self, done: int, total: int) -> None:
        now = time.perf_counter()
        if done < total and now - self._last_progress < 0.15:
            return
        self._last_progress = now
        p = self.panel.progress
        p.max = max(int(total), 1)
        p.value = int(done)

    def _job(self, should_stop: Callable[[], bool]) -> Outcome:
        requested = self.worker.last_request_time
        controls = self.session.controls
        self.panel.status.value = message_html(f"running: {describe(controls)}", "")
        self.panel.progress.max = max(int(controls.cycles), 1)
        self.panel.progress.value = 0
        outcome = self.session.run(progress=self._progress, should_stop=should_stop)
        if self.worker.superseded() and threading.current_thread() is self.worker._thread:
            return outcome  # a newer change is pending; its run redraws
        self._show(outcome)
        self.last_latency = time.perf_counter() - requested
        self.runs += 1
        return outcome

    def _show(self, outcome: Outcome) -> None:
        """Numbers first (they are ready at once), then the pictures, then the status line that says
        "updated"."""
        from pdvoid.faces.workbench.views import render_comparison

        p = self.panel
        r = outcome.result
        if not outcome.ok or r is None:
            p.error.value = message_html(outcome.error, "error")
            p.status.value = message_html(f"not run (input error): {describe(outcome.controls)}", "error")
            self._mark_stale(True)
            return
        if outcome.network_capacitances is not None:
            self._sync_widgets()  # the capacitances from the geometry
        validity = "; ".join(outcome.validity_notes)
        note = "; ".join(x for x in (outcome.regime, outcome.mode_note, outcome.model_note,
                                     validity and f"validity notes: {validity}",
                                     outcome.comparison_error and f"comparison: {outcome.comparison_error}") if x)
        p.summary.value = summary_html(outcome.summary, outcome.comparison, note)
        p.error.value = ""
        p.progress.max = max(int(r.requested_cycles), 1)
        p.progress.value = int(r.cycles)
        t0 = time.perf_counter()
        with self._render_lock:
            for name, png in self._render(outcome):
                _put_image(p.images[name], png)
        self._shown = outcome
        self._mark_stale(False)  # before the status line: "updated" there is the signal that the views are current
        state = f"stopped after {r.cycles} of {r.requested_cycles} cycles" if outcome.stopped else "updated"
        p.status.value = message_html(
            f"{state}: {describe(outcome.controls)}; {r.cycles} cycles, {r.event_count} discharges "
            f"({outcome.regime})"
            + ("" if outcome.sample is None else
               f"; histogram mode, field and pulse sequence of the first {outcome.sample.cycles} cycles")
            + f"; simulated in {outcome.seconds:.2f} s, drawn in {time.perf_counter() - t0:.2f} s",
            "info",
        )
        if self.session.measured is not None:  # after the status: the main views come first
            with self._render_lock:
                _put_image(p.measured["image"], render_comparison(outcome, self.session.measured))

    def _render(self, outcome: Outcome) -> Iterator[tuple[str, bytes]]:
        """(view name, PNG bytes) of each main view, drawn as :attr:`drawing` says."""
        from pdvoid.faces.workbench.views import VIEW_NAMES, render_views, view_source

        if self.drawing == "new figures":
            yield from render_views(outcome)
            return
        from pdvoid.faces.workbench.live import LiveViews

        if self._live is None:
            self._live = LiveViews()
        for name in VIEW_NAMES:
            yield name, self._live.render(name, view_source(outcome, name))

    def _internal_error(self, exc: BaseException) -> None:
        text = "".join(traceback.format_exception(type(exc), exc, exc.__traceback__))
        self.panel.error.value = message_html(f"internal error (please report it):\n{text}", "error")

    # ---- measured pattern ----------------------------------------------------------------------------------
    def _on_upload(self, change: dict[str, Any]) -> None:
        if change["new"]:  # an emptied upload (Clear) reads nothing
            self._measured_choice = "upload"
            self._load_measured()

    def _on_path(self, change: dict[str, Any]) -> None:
        self._measured_choice = "path" if str(change["new"]).strip() else ""

    def _measured_file(self) -> Path | None:
        """The file the user chose last: the upload, or the typed path when it was typed after the upload."""
        m = self.panel.measured
        files = m["upload"].value
        text = m["path"].value.strip()
        if files and (self._measured_choice == "upload" or not text):
            item = files[0]
            if self._upload_dir is None:
                self._upload_dir = Path(tempfile.mkdtemp(prefix="pdvoid-upload-"))
            path = self._upload_dir / Path(item["name"]).name
            path.write_bytes(bytes(item["content"]))
            return path
        return Path(text).expanduser() if text else None

    def _load_measured(self) -> None:
        m = self.panel.measured
        path = self._measured_file()
        if path is None:
            m["message"].value = message_html("choose a file to upload or type its path", "error")
            return
        cycles = m["cycles"].value or None
        frequency = m["frequency"].value or None
        try:
            text = self.session.load_measured(path, cycles=cycles, frequency=frequency)
        except InputError as exc:
            m["message"].value = message_html(str(exc), "error")
            return
        m["message"].value = message_html(f"measured: {text}", "info")
        self.worker.request()

    def _clear_measured(self) -> None:
        self.session.clear_measured()
        m = self.panel.measured
        m["upload"].value = ()  # forget the upload too: a path typed next is what Load reads
        self._measured_choice = "path" if m["path"].value.strip() else ""
        m["message"].value = ""
        _put_image(m["image"], b"")
        self.worker.request()


def _put_image(widget: ipywidgets.Image, png: bytes) -> None:
    """Show ``png`` in an Image widget; an empty value hides it (no broken-image icon)."""
    widget.value = png
    widget.layout.display = "" if png else "none"


def open_workbench(scenario: Scenario | None = None, **options: Any) -> Workbench:
    """Open the workbench in a notebook in one call: builds :class:`Workbench`, displays its panel and returns
    it.

    Parameters
    ----------
    scenario : Scenario, optional
        The starting scenario (default: the built-in demo, an invented example).
    **options
        cycles, seed, test_voltage [V rms], delay [s] (see :class:`Workbench`).

    Returns
    -------
    Workbench
        The displayed workbench.
    """
    wb = Workbench(scenario, **options)
    from IPython.display import display

    display(wb.show())
    return wb
