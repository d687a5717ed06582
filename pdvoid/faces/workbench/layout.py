"""The workbench's widgets and their arrangement (ipywidgets, imported through :func:`require`). No physics
and no callbacks here: :mod:`pdvoid.faces.workbench.app` wires them.

Every widget a test or a browser drives carries a CSS class ``pdvoid-<name>`` (e.g. ``pdvoid-diameter_mm``,
``pdvoid-status``, ``pdvoid-summary``).
"""

from __future__ import annotations

import html
import math
from dataclasses import dataclass
from typing import TYPE_CHECKING, TypeVar

from pdvoid.core.errors import InputError
from pdvoid.faces.workbench.controls import GROUPS, SPECS, Controls
from pdvoid.faces.workbench.optional import require

if TYPE_CHECKING:
    import ipywidgets as widgets

    from pdvoid.analysis.compare import Comparison

__all__ = ["Panel", "build_panel", "control_widget", "entry_widget", "summary_html", "message_html", "STALE_CSS"]

_LABEL_WIDTH = "190px"
_CONTROL_WIDTH = "370px"
_SLIDER_WIDTH = "296px"
_ENTRY_WIDTH = "70px"
#: how a view or number from an earlier, valid input is shown while the controls hold an input error
STALE_CSS = ".pdvoid-stale{opacity:0.35;filter:grayscale(100%);}"
_VIEW_WIDTH = "704px"

_W = TypeVar("_W", bound="widgets.DOMWidget")


def _style() -> dict[str, str]:
    return {"description_width": _LABEL_WIDTH}


def control_widget(name: str, value: float | str | bool) -> widgets.DOMWidget:
    """The widget of one control (see :data:`pdvoid.faces.workbench.controls.SPECS`), showing ``value``.

    A slider's range is widened to hold ``value`` (a slider would otherwise move the value silently).

    Parameters
    ----------
    name : str
        A key of :data:`pdvoid.faces.workbench.controls.SPECS` [-].
    value : float, str or bool
        The value shown [the display unit in the control's label].

    Returns
    -------
    ipywidgets.DOMWidget
        A FloatSlider, FloatText, IntText, Dropdown or Checkbox with the CSS class ``pdvoid-<name>``.

    Raises
    ------
    InputError
        For a slider whose spec lacks its range or step.
    """
    w = require("ipywidgets")
    spec = SPECS[name]
    common = {"description": spec.label, "style": _style(), "layout": w.Layout(width=_CONTROL_WIDTH)}
    if spec.kind == "slider":
        if spec.low is None or spec.high is None or spec.step is None:
            raise InputError(f"control {name!r}: a slider needs low, high and step; got {spec!r}")
        low = min(spec.low, float(value))
        high = max(spec.high, float(value))
        digits = max(0, -math.floor(math.log10(spec.step))) if spec.step < 1 else 0
        common["layout"] = w.Layout(width=_SLIDER_WIDTH)
        widget = w.FloatSlider(
            value=float(value),
            min=low,
            max=high,
            step=spec.step,
            continuous_update=False,
            readout=False,  # typed values go into the entry beside it, which does not clamp (entry_widget)
            readout_format=f".{digits + 1}f",
            **common,
        )
    elif spec.kind == "number":
        widget = w.FloatText(value=float(value), **common)
    elif spec.kind == "int":
        # text, parsed by the panel: a number widget would turn "1.5" into 15 in the browser
        widget = w.Text(value=str(int(value)), continuous_update=False, **common)
    elif spec.kind == "choice":
        widget = w.Dropdown(options=list(spec.choices), value=value, **common)
    else:
        widget = w.Checkbox(
            value=bool(value), description=spec.label, indent=False, layout=w.Layout(width=_CONTROL_WIDTH)
        )
    widget.tooltip = spec.tooltip  # a real tooltip; "" for none (None would show as "null")
    widget.add_class(f"pdvoid-{name}")
    return widget


def entry_widget(name: str, value: float) -> widgets.FloatText:
    """The typed-entry box beside slider ``name``: it shows the slider's value and takes typed values without
    clamping them (the panel widens the slider's range or says why a value is refused).

    Parameters
    ----------
    name : str
        A slider's key in :data:`pdvoid.faces.workbench.controls.SPECS` [-].
    value : float
        The value shown [the display unit in the control's label].

    Returns
    -------
    ipywidgets.FloatText
        The box, with the CSS class ``pdvoid-<name>-entry``.
    """
    w = require("ipywidgets")
    unit = SPECS[name].label.rpartition("[")[2].rstrip("]")
    box = w.FloatText(value=float(value), layout=w.Layout(width=_ENTRY_WIDTH),
                      tooltip=f"type a value [{unit}]; values beyond the slider's range extend it")
    box.add_class(f"pdvoid-{name}-entry")
    return box


def _no_null_tooltips(root: widgets.Widget) -> None:
    """Give every widget in ``root`` whose tooltip is unset the tooltip "" (ipywidgets shows None as the text
    "null")."""
    stack = [root]
    while stack:
        item = stack.pop()
        if getattr(item, "tooltip", "") is None:
            item.tooltip = ""
        stack.extend(getattr(item, "children", ()))


@dataclass
class Panel:
    """The widgets of one workbench (attributes are ipywidgets).

    Attributes
    ----------
    root : ipywidgets.VBox
        The whole panel.
    controls : dict of str to ipywidgets.DOMWidget
        One widget per control, by control name (see :data:`pdvoid.faces.workbench.controls.SPECS`).
    images : dict of str to ipywidgets.Image
        The "field", "pattern" and "sequence" views.
    entries : dict of str to ipywidgets.FloatText
        The typed-entry box beside each slider, by control name.
    summary, status, error : ipywidgets.HTML
        The summary table, the status line and the error message.
    notice : ipywidgets.HTML
        A remark on the last typed value (e.g. that a slider's range was widened to hold it).
    stale : ipywidgets.HTML
        The line that says the views and numbers are from an earlier input ("" when they are current).
    progress : ipywidgets.IntProgress
        Cycles run.
    stop : ipywidgets.Button
        The Stop button.
    measured : dict of str to ipywidgets.DOMWidget
        The measured-pattern section: "upload", "path", "cycles", "frequency", "load", "clear", "message",
        "image".
    export : dict of str to ipywidgets.DOMWidget
        The export section: "folder", "png", "svg", "overwrite", "button", "message".
    """

    root: widgets.VBox
    controls: dict[str, widgets.DOMWidget]
    entries: dict[str, widgets.FloatText]
    images: dict[str, widgets.Image]
    summary: widgets.HTML
    status: widgets.HTML
    error: widgets.HTML
    notice: widgets.HTML
    stale: widgets.HTML
    progress: widgets.IntProgress
    stop: widgets.Button
    measured: dict[str, widgets.DOMWidget]
    export: dict[str, widgets.DOMWidget]


def _heading(text: str) -> widgets.HTML:
    w = require("ipywidgets")
    return w.HTML(f"<b>{html.escape(text)}</b>")


def _image(name: str) -> widgets.Image:
    w = require("ipywidgets")
    hidden = w.Layout(max_width=_VIEW_WIDTH, height="auto", border="0", display="none")
    img = w.Image(format="png", layout=hidden)
    img.add_class(f"pdvoid-image-{name}")
    return img


def _labelled(widget: _W, cls: str) -> _W:
    widget.add_class(cls)
    return widget


def build_panel(controls: Controls, title: str, export_folder: str = "") -> Panel:
    """All widgets of the workbench, arranged: controls on the left, views and summary on the right, the
    measured-pattern and export sections folded below.

    Parameters
    ----------
    controls : Controls
        The values the controls show.
    title : str
        The scenario's name, shown in the header [-].
    export_folder : str
        The folder the export field shows at first [-].

    Returns
    -------
    Panel
        The widgets.
    """
    w = require("ipywidgets")
    values = controls.__dict__
    ctl = {name: control_widget(name, values[name]) for name in SPECS}
    entries = {name: entry_widget(name, values[name]) for name, spec in SPECS.items() if spec.kind == "slider"}

    def row(n: str) -> widgets.DOMWidget:
        return w.HBox([ctl[n], entries[n]]) if n in entries else ctl[n]

    left = []
    for group, names in GROUPS.items():
        if group == "model parameters":
            continue
        left.append(_heading(group))
        left.extend(row(n) for n in names)
    model_box = w.VBox([ctl[n] for n in GROUPS["model parameters"]])
    fold = w.Accordion(
        children=[model_box],
        titles=("model parameters",),
        selected_index=None,
        layout=w.Layout(width=_CONTROL_WIDTH),
    )
    fold.add_class("pdvoid-model-parameters")
    progress = _labelled(
        w.IntProgress(
            value=0,
            min=0,
            max=max(int(controls.cycles), 1),
            description="cycles run",
            tooltip="cycles simulated so far in this run",
            style=_style(),
            layout=w.Layout(width="300px"),
        ),
        "pdvoid-progress",
    )
    stop = _labelled(
        w.Button(
            description="Stop",
            button_style="warning",
            tooltip="stop the running simulation",
            layout=w.Layout(width="64px"),
        ),
        "pdvoid-stop",
    )
    left += [fold, w.HBox([progress, stop])]

    images = {name: _image(name) for name in ("field", "pattern", "sequence")}
    summary = _labelled(w.HTML(layout=w.Layout(width="370px")), "pdvoid-summary")
    status = _labelled(w.HTML(), "pdvoid-status")
    error = _labelled(w.HTML(), "pdvoid-error")
    notice = _labelled(w.HTML(), "pdvoid-notice")
    stale = _labelled(w.HTML(), "pdvoid-stale-note")
    right = w.VBox(
        [
            status,
            error,
            notice,
            stale,
            images["field"],
            images["pattern"],
            w.HBox([images["sequence"], summary], layout=w.Layout(align_items="flex-start")),
        ],
        layout=w.Layout(width="790px"),
    )

    measured = {
        "upload": _labelled(
            w.FileUpload(accept=".csv,.txt,.tsv,.dat,.npz", multiple=False, description="upload file",
                         tooltip="choose an event file on this computer; it is compared as soon as it arrives"),
            "pdvoid-upload",
        ),
        "path": _labelled(
            w.Text(
                placeholder="or a path to the file",
                description="file path",
                tooltip="a file on the machine that runs the kernel; press 'Load and compare' to read it",
                style=_style(),
                layout=w.Layout(width="520px"),
            ),
            "pdvoid-measured-path",
        ),
        "cycles": w.FloatText(
            value=0.0,
            description="cycles observed [-]",
            tooltip="AC cycles the measurement covers; 0: from the file",
            style=_style(),
            layout=w.Layout(width=_CONTROL_WIDTH),
        ),
        "frequency": w.FloatText(
            value=0.0,
            description="frequency [Hz]",
            tooltip="supply frequency of the measurement; 0: from the file",
            style=_style(),
            layout=w.Layout(width=_CONTROL_WIDTH),
        ),
        "load": _labelled(w.Button(description="Load and compare", button_style="primary",
                                   tooltip="read the file last chosen (upload or typed path) and compare"),
                          "pdvoid-load"),
        "clear": _labelled(w.Button(description="Clear", tooltip="forget the measured pattern and the upload"),
                           "pdvoid-clear"),
        "message": _labelled(w.HTML(), "pdvoid-measured-message"),
        "image": _image("comparison"),
    }
    m = measured
    measured_box = w.VBox(
        [
            w.HTML(
                "An event list as delimited text with units in the header (e.g. "
                "<code>phase [deg],charge [pC]</code>), or a result file (.npz). Cycles observed and "
                "frequency: 0 takes them from the file's <code># cycles = ...</code> and "
                "<code># frequency = ...</code> lines."
            ),
            w.HBox([m["upload"], m["path"]]),
            m["cycles"],
            m["frequency"],
            w.HBox([m["load"], m["clear"]]),
            m["message"],
            m["image"],
        ]
    )
    export = {
        "folder": _labelled(
            w.Text(
                value=export_folder, description="folder", style=_style(), layout=w.Layout(width="520px"),
                tooltip="folder to write into (created if missing); a relative path is taken from the kernel's "
                        "working folder",
            ),
            "pdvoid-export-folder",
        ),
        "png": w.Checkbox(value=True, description="figures as PNG", indent=False,
                          tooltip="write each view as a PNG picture"),
        "svg": w.Checkbox(value=True, description="figures as SVG", indent=False,
                          tooltip="write each view as an SVG drawing"),
        "overwrite": _labelled(
            w.Checkbox(value=False, description="replace existing files", indent=False,
                       tooltip="without it, an export that would replace files stops and names them"),
            "pdvoid-export-overwrite",
        ),
        "button": _labelled(
            w.Button(
                description="Export",
                button_style="primary",
                tooltip="figures, scenario (TOML) and result (NPZ)",
            ),
            "pdvoid-export",
        ),
        "message": _labelled(w.HTML(), "pdvoid-export-message"),
    }
    e = export
    export_box = w.VBox([e["folder"], w.HBox([e["png"], e["svg"], e["overwrite"]]), e["button"], e["message"]])
    lower = w.Accordion(
        children=[measured_box, export_box],
        titles=("compare with a measured pattern", "export figures, scenario and result"),
        selected_index=None,
    )
    header = w.HTML(
        f"<h3 style='margin:4px 0'>pdvoid workbench</h3><div>{html.escape(title)}</div>"
        "<div style='color:#8a1c1c;font-size:90%'>Engineering estimates from idealised models. "
        "Test and acceptance levels come from the applicable standards. High voltage can kill.</div>"
        f"<style>{STALE_CSS}</style>"
    )
    # the views move below the controls when the notebook is narrower than both columns
    left_box = w.VBox(left, layout=w.Layout(width="390px"))
    columns = w.HBox([left_box, right], layout=w.Layout(flex_flow="row wrap"))
    root = w.VBox([header, columns, lower])
    root.add_class("pdvoid-workbench")
    _no_null_tooltips(root)
    return Panel(
        root=root,
        controls=ctl,
        entries=entries,
        images=images,
        summary=summary,
        status=status,
        error=error,
        notice=notice,
        stale=stale,
        progress=progress,
        stop=stop,
        measured=measured,
        export=export,
    )


_CELL = "padding:1px 6px 1px 0;border:0;"


def _fmt(value: float) -> str:
    if not math.isfinite(value):
        return "n/a"
    return f"{value:.4g}"


def summary_html(summary: dict[str, float], comparison: Comparison | None = None, note: str = "") -> str:
    """The summary numbers as an HTML table ("name [unit]" keys split into name and unit columns).

    Parameters
    ----------
    summary : dict of str to float
        {"name [unit]": value}.
    comparison : Comparison, optional
        Adds its score as the last row.
    note : str
        A remark below the table [-].

    Returns
    -------
    str
        The HTML.
    """
    rows = []
    items = list(summary.items())
    if comparison is not None:
        items.append(("comparison score, 0 = identical [-]", float(comparison.score)))
    for key, value in items:
        name, _, unit = key.rpartition(" [")
        name, unit = (name, unit.rstrip("]")) if name else (key, "")
        rows.append(
            # long names wrap, so that the value and its unit stay in view in a narrow panel
            f"<tr><td style='{_CELL}'>{html.escape(name)}</td>"
            f"<td style='{_CELL}text-align:right;white-space:nowrap'>{_fmt(value)}</td>"
            f"<td style='{_CELL}color:#555;white-space:nowrap'>{html.escape(unit)}</td></tr>"
        )
    extra = f"<div style='color:#555;font-size:90%'>{html.escape(note)}</div>" if note else ""
    return (
        "<div style='font-size:12px;line-height:1.35;padding-left:8px'><b>summary</b>"
        "<table style='border-collapse:collapse;margin-top:2px'>"
        + "".join(rows)
        + "</table>"
        + extra
        + "</div>"
    )


def message_html(text: str, kind: str = "info", compact: bool = False) -> str:
    """A short message box.

    Parameters
    ----------
    text : str
        The message; "" gives "" [-].
    kind : str
        "info", "error" or "" (neutral) [-].
    compact : bool
        Smaller, tighter text for long lists [-].

    Returns
    -------
    str
        The HTML.
    """
    if not text:
        return ""
    colour = {"info": "#1f4e79", "error": "#8a1c1c"}.get(kind, "#333333")
    background = {"info": "#eef4fa", "error": "#fbeaea"}.get(kind, "#f5f5f5")
    tight = ";line-height:1.3;font-size:12px" if compact else ""
    return (
        f"<div style='color:{colour};background:{background};padding:4px 8px;border-radius:3px;"
        f"white-space:pre-wrap{tight}'>{html.escape(text)}</div>"
    )
