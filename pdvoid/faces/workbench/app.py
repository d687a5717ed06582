"""The workbench: the widgets of :mod:`pdvoid.faces.workbench.layout` wired to a :class:`WorkbenchSession`.

A control change updates the session at once and asks the :class:`DebouncedWorker` for a run; the run (in a
background thread, so the Stop button stays live) feeds the progress bar, then the images, the summary table
and the status line are replaced. Invalid input shows the InputError message in the panel.
"""

from __future__ import annotations

import tempfile
import threading
import time
import traceback
from collections.abc import Callable
from pathlib import Path
from typing import TYPE_CHECKING, Any

from pdvoid.core.errors import InputError
from pdvoid.faces.workbench.layout import build_panel, message_html, summary_html
from pdvoid.faces.workbench.optional import require
from pdvoid.faces.workbench.scheduler import DebouncedWorker
from pdvoid.faces.workbench.session import Outcome, WorkbenchSession, describe
from pdvoid.inputs.scenario import Scenario

if TYPE_CHECKING:
    import ipywidgets

__all__ = ["Workbench", "open_workbench"]


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
    ) -> None:
        require("ipywidgets")
        self.session = WorkbenchSession(scenario, cycles=cycles, seed=seed, test_voltage=test_voltage)
        self.panel = build_panel(self.session.controls, self.session.base.name or "scenario")
        self.worker = DebouncedWorker(self._job, delay=delay, on_error=self._internal_error)
        self._render_lock = threading.Lock()
        self._syncing = False
        self._last_progress = 0.0
        self._upload_dir: Path | None = None
        self.last_latency = float("nan")  #: seconds from the last change to its redrawn panel [s]
        self.runs = 0  #: completed updates [-]
        for name, widget in self.panel.controls.items():
            widget.observe(self._on_change(name), names="value")
        self.panel.stop.on_click(lambda _b: self.worker.stop())
        m = self.panel.measured
        m["load"].on_click(lambda _b: self._load_measured())
        m["clear"].on_click(lambda _b: self._clear_measured())
        m["upload"].observe(lambda _c: self._load_measured(), names="value")
        self.panel.export["button"].on_click(lambda _b: self.export())
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
        """Write figures, scenario and result into ``folder``. Errors are shown in the panel and return an
        empty list.

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
        try:
            with self._render_lock:
                paths = export(
                    e["folder"].value if folder is None else folder,
                    self.session.outcome,
                    self.session.measured,
                    formats=formats,
                )
        except InputError as exc:
            e["message"].value = message_html(str(exc), "error")
            return []
        listing = "written:\n" + "\n".join(str(p) for p in paths)
        e["message"].value = message_html(listing, "info", compact=True)
        return paths

    def __repr__(self) -> str:
        return f"<pdvoid Workbench: {describe(self.session.controls)}>"

    # ---- callbacks -----------------------------------------------------------------------------------------
    def _on_change(self, name: str) -> Callable[[dict[str, Any]], None]:
        def handler(change: dict[str, Any]) -> None:
            if self._syncing:
                return
            try:
                self.session.set(**{name: change["new"]})
            except InputError as exc:
                self.panel.error.value = message_html(str(exc), "error")
                return
            self._sync_widgets()
            self.panel.status.value = message_html(f"update pending: {describe(self.session.controls)}", "")
            self.worker.request()

        return handler

    def _sync_widgets(self) -> None:
        """Show values the session changed on its own (a material sets the permittivity and back)."""
        self._syncing = True
        try:
            for name in ("material", "permittivity"):
                value = getattr(self.session.controls, name)
                if self.panel.controls[name].value != value:
                    self.panel.controls[name].value = value
        finally:
            self._syncing = False

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
        from pdvoid.faces.workbench.views import render_comparison, render_views

        p = self.panel
        r = outcome.result
        if not outcome.ok or r is None:
            p.error.value = message_html(outcome.error, "error")
            p.status.value = message_html(f"not run (input error): {describe(outcome.controls)}", "error")
            return
        validity = "; ".join(outcome.validity_notes)
        note = "; ".join(x for x in (outcome.regime,
                                     validity and f"validity notes: {validity}",
                                     outcome.comparison_error and f"comparison: {outcome.comparison_error}") if x)
        p.summary.value = summary_html(outcome.summary, outcome.comparison, note)
        p.error.value = ""
        p.progress.max = max(int(r.requested_cycles), 1)
        p.progress.value = int(r.cycles)
        t0 = time.perf_counter()
        with self._render_lock:
            for name, png in render_views(outcome):
                _put_image(p.images[name], png)
        state = f"stopped after {r.cycles} of {r.requested_cycles} cycles" if outcome.stopped else "updated"
        p.status.value = message_html(
            f"{state}: {describe(outcome.controls)}; {r.cycles} cycles, {r.event_count} discharges "
            f"({outcome.regime}); simulated in {outcome.seconds:.2f} s, drawn in {time.perf_counter() - t0:.2f} s",
            "info",
        )
        if self.session.measured is not None:  # after the status: the main views come first
            with self._render_lock:
                _put_image(p.measured["image"], render_comparison(outcome, self.session.measured))

    def _internal_error(self, exc: BaseException) -> None:
        text = "".join(traceback.format_exception(type(exc), exc, exc.__traceback__))
        self.panel.error.value = message_html(f"internal error (please report it):\n{text}", "error")

    # ---- measured pattern ----------------------------------------------------------------------------------
    def _measured_file(self) -> Path | None:
        m = self.panel.measured
        files = m["upload"].value
        if files:
            item = files[0]
            if self._upload_dir is None:
                self._upload_dir = Path(tempfile.mkdtemp(prefix="pdvoid-upload-"))
            path = self._upload_dir / Path(item["name"]).name
            path.write_bytes(bytes(item["content"]))
            return path
        text = m["path"].value.strip()
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
