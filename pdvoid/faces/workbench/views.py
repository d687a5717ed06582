"""The workbench's pictures and files: its views rendered to PNG bytes (for Image widgets, which show the same
in JupyterLab and the classic notebook), and the export of figures, scenario and result into a folder.

matplotlib is imported here only, through :mod:`pdvoid.plots` (Figure objects, never pyplot).
"""

from __future__ import annotations

import io
import math
import os
import textwrap
from collections.abc import Iterator
from pathlib import Path
from typing import TYPE_CHECKING

from pdvoid.core.errors import InputError
from pdvoid.core.files import atomic_write
from pdvoid.faces.workbench.session import Outcome
from pdvoid.simulation.events import Events
from pdvoid.simulation.results import Result

if TYPE_CHECKING:
    from matplotlib.cm import ScalarMappable
    from matplotlib.colorbar import Colorbar
    from matplotlib.figure import Figure

__all__ = [
    "VIEW_NAMES",
    "SCREEN_DPI",
    "view_figure",
    "render_views",
    "render_comparison",
    "view_source",
    "figure_png",
    "export",
]

SCREEN_DPI = 80  #: pixels per inch of the on-screen images [1/in]
EXPORT_DPI = 200  #: pixels per inch of exported PNG files [1/in]
VIEW_NAMES = ("field", "pattern", "sequence")

# on-screen sizes [in]: 8.8 in × 80 dpi ≈ 700 px, the width of the view column
_SIZES = {"field": (8.8, 3.3), "pattern": (8.8, 3.6), "sequence": (5.0, 3.8), "comparison": (8.8, 6.4)}
# fixed margins (left, right, bottom, top) [in]: a layout engine would triple the drawing time of each update
_MARGINS = {
    "field": (0.75, 0.75, 1.05, 0.1),
    "pattern": (0.75, 1.8, 0.5, 0.1),
    "sequence": (0.75, 0.15, 0.55, 0.1),
}
_COLORBAR = (1.0, 0.14)  # pattern colour bar: distance of its left edge from the right edge, width [in]


def _figure(name: str) -> Figure:
    from matplotlib.figure import Figure

    from pdvoid.faces.plots import new_figure

    if name not in _MARGINS:
        return new_figure(_SIZES[name])
    w, h = _SIZES[name]
    left, right, bottom, top = _MARGINS[name]
    fig = Figure(figsize=(w, h), facecolor="white")
    fig.subplots_adjust(left=left / w, right=1.0 - right / w, bottom=bottom / h, top=1.0 - top / h)
    return fig


def _pattern_colorbar(fig: Figure, mesh: ScalarMappable) -> Colorbar:
    """The pattern view's colour bar of ``mesh`` in its fixed place at the right of the figure."""
    w, h = _SIZES["pattern"]
    _, _, bottom, top = _MARGINS["pattern"]
    cax = fig.add_axes((1.0 - _COLORBAR[0] / w, bottom / h, _COLORBAR[1] / w, 1.0 - (bottom + top) / h))
    cb = fig.colorbar(mesh, cax=cax)
    cb.set_label("discharges per cycle per cell [1/cycle]", size=9)
    cb.ax.tick_params(labelsize=8, which="both")
    _colorbar_labels(cb)
    return cb


def _colorbar_labels(cb: Colorbar) -> None:
    """Plain-number tick labels on the pattern's colour bar (again after each change of its norm, which resets
    them)."""
    from matplotlib.ticker import FuncFormatter, NullFormatter

    from pdvoid.faces.plots.style import plain_number

    cb.ax.yaxis.set_major_formatter(FuncFormatter(plain_number))
    low, high = cb.norm.vmin, cb.norm.vmax
    wide = low is not None and high is not None and low > 0.0 and high / low > 1e3
    # over more than three decades the labels at 2 and 5 would crowd the bar: the decades alone
    cb.ax.yaxis.set_minor_formatter(NullFormatter() if wide else FuncFormatter(_minor_label))


def _minor_label(value: float, _pos: int | None = None) -> str:
    """Minor colour-bar labels at 2 and 5 times a power of ten only, as plain numbers."""
    from pdvoid.faces.plots.style import plain_number

    if value <= 0.0:
        return ""
    lead = round(value / 10.0 ** math.floor(math.log10(value) + 1e-12))
    return plain_number(value) if lead in (2, 5) else ""


def _message_figure(name: str, message: str) -> Figure:
    fig = _figure(name)
    ax = fig.add_subplot()
    ax.set_axis_off()
    ax.text(
        0.5,
        0.5,
        "\n".join(textwrap.wrap(message, 70)),
        ha="center",
        va="center",
        fontsize=10,
        color="#444444",
        transform=ax.transAxes,
    )
    return fig


def view_figure(name: str, result: Result, measured: Result | Events | None = None) -> Figure:
    """The matplotlib Figure of one view. A view that cannot be drawn for this result shows its InputError
    message instead.

    Parameters
    ----------
    name : str
        "field", "pattern", "sequence" or "comparison" (needs ``measured``) [-].
    result : Result
        The simulation [-].
    measured : Result or Events, optional
        The measured pattern of the comparison view [-].

    Returns
    -------
    matplotlib.figure.Figure
        The view (never registered with pyplot).

    Raises
    ------
    InputError
        For an unknown view name.
    """
    from pdvoid.faces import plots

    if name not in _SIZES:
        raise InputError(f"view must be one of {tuple(_SIZES)}; got {name!r}")
    fig = _figure(name)
    try:
        if name == "field":
            plots.field_time(result, cycles=3, ax=fig.add_subplot())
        elif name == "pattern":
            from pdvoid.faces.plots.style import MESH, attached

            ax = plots.phase_pattern(result, ax=fig.add_subplot(), colorbar=False)
            _pattern_colorbar(fig, attached(ax, MESH))
        elif name == "sequence":
            ax = plots.pulse_sequence_plot(result, "du", ax=fig.add_subplot())
            ax.xaxis.label.set_fontsize(9)
            ax.yaxis.label.set_fontsize(9)
        else:
            if measured is None:
                raise InputError("the comparison needs a measured pattern; load one first")
            mosaic = fig.subplot_mosaic([["sim", "meas"], ["overlay", "overlay"]], height_ratios=[1.15, 1.0])
            plots.compare(result, measured, [mosaic["sim"], mosaic["meas"], mosaic["overlay"]])
    except InputError as exc:
        fig = _message_figure(name, f"{name} view not available: {exc}")
    return fig


def view_source(outcome: Outcome, name: str) -> Result:
    """The result view ``name`` draws: the whole run for the pattern; for the field, pulse-sequence and
    comparison views the events of the first cycles when the run kept only a histogram
    (:attr:`Outcome.sample`).

    Parameters
    ----------
    outcome : Outcome
        A workbench update with a result.
    name : str
        A view name [-].

    Returns
    -------
    Result
        The result to draw.

    Raises
    ------
    InputError
        When the outcome has no result.
    """
    result = outcome.result if name == "pattern" else outcome.events_result
    if result is None:
        raise InputError(f"there is nothing to draw: {outcome.error or 'no result'}")
    return result


def figure_png(fig: Figure, dpi: float = SCREEN_DPI) -> bytes:
    """PNG bytes of a Figure (fast compression: the panel redraws often).

    Parameters
    ----------
    fig : matplotlib.figure.Figure
        The figure.
    dpi : float
        Resolution [1/in].

    Returns
    -------
    bytes
        The PNG file.
    """
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=dpi, facecolor="white", pil_kwargs={"compress_level": 1})
    return buf.getvalue()


def render_views(outcome: Outcome) -> Iterator[tuple[str, bytes]]:
    """The field, pattern and pulse-sequence views of a successful outcome, one at a time (a generator, so
    the panel can show each picture as soon as it is drawn).

    Parameters
    ----------
    outcome : Outcome
        A workbench update with a result.

    Returns
    -------
    iterator of tuple of (str, bytes)
        (view name, PNG bytes) for each of :data:`VIEW_NAMES`.

    Raises
    ------
    InputError
        When the outcome has no result.
    """
    if outcome.result is None:
        raise InputError(f"there is nothing to draw: {outcome.error or 'no result'}")
    return ((name, figure_png(view_figure(name, view_source(outcome, name)))) for name in VIEW_NAMES)


def render_comparison(outcome: Outcome, measured: Result | Events) -> bytes:
    """PNG bytes of the simulated-against-measured view.

    Parameters
    ----------
    outcome : Outcome
        A workbench update with a result.
    measured : Result or Events
        The measured pattern.

    Returns
    -------
    bytes
        The PNG file.

    Raises
    ------
    InputError
        When the outcome has no result.
    """
    if outcome.result is None:
        raise InputError(f"there is nothing to compare: {outcome.error or 'no result'}")
    return figure_png(view_figure("comparison", view_source(outcome, "comparison"), measured))


def export(
    folder: str | Path,
    outcome: Outcome | None,
    measured: Result | Events | None = None,
    formats: tuple[str, ...] = ("png", "svg"),
    stem: str = "pdvoid",
    overwrite: bool = False,
) -> list[Path]:
    """Write the figures (``formats`` from png, svg, pdf), the scenario (TOML, :meth:`Scenario.to_file`) and
    the result (:meth:`Result.save`, NPZ) of ``outcome`` into ``folder`` (created if missing).

    Every file is written to a temporary file beside its target and renamed into place, so an interrupted
    export leaves no half-written file. Files that exist already are replaced only with ``overwrite``;
    otherwise nothing is written and the error names them.

    Parameters
    ----------
    folder : str or pathlib.Path
        Where to write (created if missing) [-].
    outcome : Outcome or None
        The workbench update to export (None before the first one).
    measured : Result or Events, optional
        The measured pattern; adds the comparison view [-].
    formats : tuple of str
        Figure formats, from "png", "svg", "pdf" [-].
    stem : str
        File-name prefix [-].
    overwrite : bool
        Replace files of the same names; False: refuse and name them [-].

    Returns
    -------
    list of pathlib.Path
        The paths written.

    Raises
    ------
    InputError
        When there is no result, a format is unknown, the stem is not a plain prefix, the folder cannot be
        created or (without ``overwrite``) a file to write exists already.
    """
    if outcome is None or outcome.result is None or outcome.scenario is None:
        raise InputError(
            "nothing to export yet: the last update has no result"
            + (f" ({outcome.error})" if outcome is not None and outcome.error else "")
        )
    bad = [f for f in formats if f not in ("png", "svg", "pdf")]
    if bad or not formats:
        raise InputError(f"choose at least one figure format from png, svg, pdf; got {formats!r}")
    if not isinstance(stem, str) or not stem or any(c in stem for c in "/\\:"):
        raise InputError(f"stem must be a plain file-name prefix; got {stem!r}")
    if not isinstance(overwrite, bool):
        raise InputError(f"overwrite must be True or False; got {overwrite!r}")
    if not isinstance(folder, (str, os.PathLike)) or not str(folder).strip():
        raise InputError(f"export folder must be a folder path; got {folder!r}")
    out = Path(folder).expanduser().resolve()
    names = list(VIEW_NAMES) + (["comparison"] if measured is not None else [])
    targets = [out / f"{stem}_{name}.{fmt}" for name in names for fmt in formats]
    scenario_path, result_path = out / f"{stem}_scenario.toml", out / f"{stem}_result.npz"
    existing = [p for p in (*targets, scenario_path, result_path) if p.exists()]
    if existing and not overwrite:
        raise InputError(f"export stopped, nothing written: {len(existing)} file(s) in {str(out)!r} exist already "
                         f"({', '.join(p.name for p in existing)}); choose another folder or tick 'replace "
                         "existing files'")
    try:
        out.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise InputError(f"export folder {str(out)!r} cannot be created: {exc}") from None
    written: list[Path] = []
    for name in names:
        fig = view_figure(name, view_source(outcome, name), measured)
        for fmt in formats:
            path = out / f"{stem}_{name}.{fmt}"
            with atomic_write(path, "wb") as fh:
                fig.savefig(fh, format=fmt, dpi=EXPORT_DPI, facecolor="white")
            written.append(path)
    outcome.scenario.to_file(scenario_path)  # both write atomically (pdvoid.core.files.atomic_write)
    written.append(scenario_path)
    written.append(outcome.result.save(result_path))
    return written
