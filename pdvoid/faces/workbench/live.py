"""The workbench's on-screen views as persistent figures updated in place.

Each view keeps one :class:`matplotlib.figure.Figure` with its Agg canvas, Axes, legend, colour bar and data
artists for the life of the panel; an update replaces only the data (``set_data``, ``set_offsets``,
``set_segments``, a new QuadMesh handed to the kept colour bar) and the limits, redraws the canvas and encodes
its pixels as PNG. Building a figure, its layout and its first draw, which cost most of a redraw before, happen
once. The look is that of :func:`pdvoid.plots.field_time`, :func:`pdvoid.plots.phase_pattern` and
:func:`pdvoid.plots.pulse_sequence_plot` (white background, viridis, units on every axis); exported files are
still drawn by those functions (:mod:`pdvoid.faces.workbench.views`).

The pulse-sequence view draws at most :data:`SEQUENCE_POINTS` points (every k-th pair of a long run, the
legend says so), so a big run draws in about the time of a small one.

matplotlib is imported when a view is built, never when this module is imported.
"""

from __future__ import annotations

import io
import math
import textwrap
from typing import TYPE_CHECKING, Any

import numpy as np

from pdvoid.core.errors import InputError
from pdvoid.simulation.results import Result

if TYPE_CHECKING:
    from matplotlib.artist import Artist
    from matplotlib.axes import Axes
    from matplotlib.figure import Figure

__all__ = ["LiveView", "LiveViews", "SEQUENCE_POINTS", "FIELD_CYCLES"]

#: most points the on-screen pulse-sequence view draws; longer runs show every k-th pair [-]
SEQUENCE_POINTS = 4000
#: whole cycles the on-screen field view shows [-]
FIELD_CYCLES = 3
_KV_PER_MM = 1e6  # V/m per kV/mm
_PC = 1e-12  # C per pC
_MS = 1e3  # ms per s


def _png(fig: Figure, overlay: Any = None) -> bytes:
    """Redraw ``fig`` on its Agg canvas, lay ``overlay`` (a PIL RGBA image of the fixed texts, or None) over
    it and encode the pixels as PNG (fast compression)."""
    from PIL import Image

    canvas: Any = fig.canvas
    canvas.draw()
    w, h = canvas.get_width_height(physical=True)
    img = Image.frombuffer("RGBA", (w, h), canvas.buffer_rgba(), "raw", "RGBA", 0, 1)
    if overlay is not None:
        img = Image.alpha_composite(img, overlay)
    buf = io.BytesIO()
    img.convert("RGB").save(buf, format="png", compress_level=1)
    return buf.getvalue()


def _fix_label(ax: Axes, which: str, inches: float) -> Artist:
    """Put the axis label of ``ax`` at a fixed distance from the spine (``which``: "x" below, "y" left, "yr"
    right) [in], so that it is drawn at the same place on every update; returns the label."""
    fig: Any = ax.figure
    box = ax.get_position()
    width, height = box.width * fig.get_figwidth(), box.height * fig.get_figheight()
    if which == "x":
        ax.xaxis.set_label_coords(0.5, -inches / height)
        return ax.xaxis.label
    ax.yaxis.set_label_coords(-inches / width if which == "y" else 1.0 + inches / width, 0.5)
    return ax.yaxis.label


class LiveView:
    """One persistent view: a Figure on an Agg canvas whose data artists are replaced on each update.

    Parameters
    ----------
    name : str
        "field", "pattern" or "sequence" [-].

    Attributes
    ----------
    name : str
        The view's name.
    figure : matplotlib.figure.Figure
        The kept figure (never registered with pyplot).

    Raises
    ------
    InputError
        For an unknown view name.
    """

    def __init__(self, name: str) -> None:
        from matplotlib.backends.backend_agg import FigureCanvasAgg

        from pdvoid.faces.workbench.views import SCREEN_DPI, _figure

        if name not in ("field", "pattern", "sequence"):
            raise InputError(f"view must be 'field', 'pattern' or 'sequence'; got {name!r}")
        self.name = name
        self.figure = _figure(name)
        self.figure.set_dpi(SCREEN_DPI)
        FigureCanvasAgg(self.figure)
        self._static: list[Artist] = []  # drawn once into the fixed layer
        self._overlay: Any = None
        self._message = self.figure.text(0.5, 0.5, "", ha="center", va="center", fontsize=10, color="#444444",
                                         visible=False)
        self._build()

    # ---- public --------------------------------------------------------------------------------------------
    def render(self, result: Result) -> bytes:
        """Update the view to ``result`` and return its PNG bytes; a view that cannot be drawn for this result
        shows its InputError message instead (as :func:`pdvoid.faces.workbench.views.view_figure` does).

        Parameters
        ----------
        result : Result
            The simulation (with stored events; the pattern view also takes a histogram-only result) [-].

        Returns
        -------
        bytes
            The PNG file.
        """
        try:
            self._update(result)
        except InputError as exc:
            self._show_message(f"{self.name} view not available: {exc}")
            return _png(self.figure)
        self._show_message("")
        return _png(self.figure, self._fixed_layer())

    # ---- drawing, per view ---------------------------------------------------------------------------------
    def _fixed_layer(self) -> Any:
        """The texts that never change (axis labels, the field view's legend, the colour-bar label) drawn once
        on a transparent layer and laid over every later picture: text is most of a redraw's cost."""
        if self._overlay is None:
            from PIL import Image

            canvas: Any = self.figure.canvas
            renderer = canvas.get_renderer()
            renderer.clear()
            for artist in self._static:
                artist.set_visible(True)
                artist.draw(renderer)
                artist.set_visible(False)  # from now on in the layer only
            w, h = canvas.get_width_height(physical=True)
            self._overlay = Image.frombuffer("RGBA", (w, h), canvas.buffer_rgba(), "raw", "RGBA", 0, 1).copy()
        return self._overlay

    def _show_message(self, text: str) -> None:
        for ax in self.figure.axes:
            ax.set_visible(not text)
        self._message.set_text("\n".join(textwrap.wrap(text, 70)))
        self._message.set_visible(bool(text))

    def _build(self) -> None:
        getattr(self, f"_build_{self.name}")()

    def _update(self, result: Result) -> None:
        getattr(self, f"_update_{self.name}")(result)

    # field
    def _build_field(self) -> None:
        from matplotlib.collections import LineCollection
        from matplotlib.lines import Line2D

        from pdvoid.faces.plots.field import FIELD_COLOUR
        from pdvoid.faces.plots.style import LEVEL, NEGATIVE, POSITIVE, RESIDUAL, VOLTAGE, finish_axes

        ax = self.figure.add_subplot()
        finish_axes(ax)
        self._field = ax.plot([], [], color=FIELD_COLOUR, lw=1.4, zorder=3, label="void field")[0]
        self._levels = [ax.axhline(0.0, color=LEVEL, lw=1.0, ls="--", zorder=2) for _ in range(2)]
        self._residuals = [ax.axhline(0.0, color=RESIDUAL, lw=1.0, ls=":", zorder=2) for _ in range(2)]
        ax.axhline(0.0, color="#999999", lw=0.6, zorder=1)
        self._jumps = LineCollection([], lw=2.2, zorder=4)
        ax.add_collection(self._jumps)
        self._dots = ax.scatter([], [], s=14, zorder=5, edgecolors="white", linewidths=0.4)
        self._none = ax.text(0.5, 0.04, "no discharges in these cycles", transform=ax.transAxes, ha="center",
                             va="bottom", fontsize=9, color="#444444", visible=False)
        ax.set_xlabel("time [ms]")
        ax.set_ylabel("void field [kV/mm]")
        vax = ax.twinx()
        self._voltage = vax.plot([], [], color=VOLTAGE, lw=1.0, ls=(0, (5, 2)), zorder=1)[0]
        vax.set_ylabel("applied voltage [kV]", color=VOLTAGE)
        vax.tick_params(labelsize=9, colors=VOLTAGE)
        for side in ("top", "left"):
            vax.spines[side].set_visible(False)
        ax.set_zorder(vax.get_zorder() + 1)
        ax.patch.set_visible(False)
        handles = [
            Line2D([], [], color=FIELD_COLOUR, lw=1.4, label="void field"),
            Line2D([], [], color=VOLTAGE, lw=1.0, ls=(0, (5, 2)),
                   label="applied voltage (right axis) = field of an uncharged void"),
            Line2D([], [], color=LEVEL, lw=1.0, ls="--", label="± inception field"),
            Line2D([], [], color=RESIDUAL, lw=1.0, ls=":", label="± residual field"),
            Line2D([], [], color=POSITIVE, lw=2.2, marker="o", ms=4, label="discharge, positive"),
            Line2D([], [], color=NEGATIVE, lw=2.2, marker="o", ms=4, label="discharge, negative"),
        ]
        legend = ax.legend(handles=handles, loc="upper center", bbox_to_anchor=(0.5, -0.16), ncols=2, fontsize=8,
                           frameon=False)
        self._static += [_fix_label(ax, "x", 0.27), _fix_label(ax, "y", 0.4), _fix_label(vax, "yr", 0.42), legend]
        self._ax, self._vax = ax, vax

    def _update_field(self, result: Result) -> None:
        from matplotlib.colors import to_rgba_array

        from pdvoid.faces.plots.field import _first_active_cycle, _result_parts, void_field_trace
        from pdvoid.faces.plots.style import NEGATIVE, POSITIVE

        ev, _ = _result_parts(result)
        tr = void_field_trace(result, _first_active_cycle(ev, FIELD_CYCLES), FIELD_CYCLES, 720)
        t = tr.time * _MS
        self._field.set_data(t, tr.field / _KV_PER_MM)
        self._voltage.set_data(t, tr.voltage / 1e3)
        e_inc, e_res = tr.inception_field / _KV_PER_MM, tr.residual_field / _KV_PER_MM
        for line, sign in zip(self._levels, (1.0, -1.0), strict=True):
            line.set_ydata([sign * e_inc, sign * e_inc])
        for line, sign in zip(self._residuals, (1.0, -1.0), strict=True):
            line.set_ydata([sign * e_res, sign * e_res])
            line.set_visible(e_res > 0.0)
        idx = tr.event_index
        te = ev.time[idx] * _MS
        fb = ev.field_before[idx] / _KV_PER_MM
        fa = ev.field_after[idx] / _KV_PER_MM
        colours: Any = to_rgba_array(np.where(ev.charge[idx] >= 0.0, POSITIVE, NEGATIVE)) if idx.size else (
            np.empty((0, 4)))
        self._jumps.set_segments(list(np.stack([np.column_stack([te, fa]), np.column_stack([te, fb])], axis=1)))
        self._jumps.set_colors(colours)
        self._dots.set_offsets(np.column_stack([te, fb]))
        self._dots.set_facecolor(colours)
        self._none.set_visible(idx.size == 0)
        top = 1.15 * max(float(np.max(np.abs(tr.field))), tr.inception_field) / _KV_PER_MM
        self._ax.set_ylim(-top, top)
        self._ax.set_xlim(tr.start * _MS, tr.stop * _MS)
        vtop = top * _KV_PER_MM / tr.gain / 1e3
        self._vax.set_ylim(-vtop, vtop)

    # pattern
    def _build_pattern(self) -> None:
        from matplotlib.colors import LogNorm
        from matplotlib.ticker import FuncFormatter

        from pdvoid.faces.plots.style import PATTERN_CMAP, VOLTAGE, finish_axes, plain_number
        from pdvoid.faces.workbench.views import _pattern_colorbar

        ax = self.figure.add_subplot()
        finish_axes(ax, grid=False)
        self._mesh = ax.pcolormesh(np.array([0.0, 360.0]), np.array([-1.0, 1.0]), np.ones((1, 1)),
                                   cmap=PATTERN_CMAP, norm=LogNorm(0.1, 1.0), shading="flat", zorder=2)
        ax.axhline(0.0, color="#999999", lw=0.6, zorder=3)
        ax.set_xlim(0.0, 360.0)
        ax.set_xticks(np.arange(0.0, 361.0, 45.0))
        ax.set_xlabel("phase [deg]")
        ax.set_ylabel("apparent charge [pC]")
        self._none = ax.text(0.5, 0.5, "", transform=ax.transAxes, ha="center", va="center", fontsize=10,
                             color="#444444", visible=False)
        vax = ax.twinx()
        self._voltage = vax.plot([], [], color=VOLTAGE, lw=1.3, ls=(0, (5, 2)), zorder=6)[0]
        vax.set_ylabel("applied voltage [kV]", color=VOLTAGE)
        vax.tick_params(labelsize=9, colors=VOLTAGE)
        for side in ("top", "left"):
            vax.spines[side].set_visible(False)
        ax.set_zorder(vax.get_zorder() + 1)
        ax.patch.set_visible(False)
        self._cbar = _pattern_colorbar(self.figure, self._mesh)
        self._static += [_fix_label(ax, "x", 0.27), _fix_label(ax, "y", 0.48), _fix_label(vax, "yr", 0.42),
                         _fix_label(self._cbar.ax, "yr", 0.55)]
        self._plain = FuncFormatter(plain_number)
        self._ax, self._vax = ax, vax

    def _update_pattern(self, result: Result) -> None:
        from matplotlib.colors import LogNorm
        from matplotlib.ticker import AutoLocator, ScalarFormatter

        from pdvoid.faces.plots.patterns import pattern_mesh
        from pdvoid.faces.plots.style import PATTERN_CMAP, VOLTAGE
        from pdvoid.faces.workbench.views import _colorbar_labels
        from pdvoid.inputs.waveform import evaluate

        mesh = pattern_mesh(result)
        ax = self._ax
        positive = mesh.rate[mesh.rate > 0.0]
        lo = float(positive.min()) if positive.size else 1e-3
        hi = float(positive.max()) if positive.size else 1.0
        if hi <= lo:
            hi = lo * 10.0
        y = mesh.charge_edges / _PC
        self._mesh.remove()
        self._mesh = ax.pcolormesh(mesh.phase_edges_deg, y, np.ma.masked_less_equal(mesh.rate, 0.0),
                                   cmap=PATTERN_CMAP, norm=LogNorm(lo, hi), shading="flat", zorder=2)
        self._cbar.update_normal(self._mesh)
        _colorbar_labels(self._cbar)
        top = float(np.max(np.abs(y)))
        if mesh.log_charge:
            lin = float(np.min(np.abs(y[y != 0.0])))
            ax.set_yscale("symlog", linthresh=lin, linscale=1.0)
            ax.yaxis.set_major_formatter(self._plain)
        elif ax.get_yscale() != "linear":
            ax.set_yscale("linear")
            ax.yaxis.set_major_locator(AutoLocator())
            ax.yaxis.set_major_formatter(ScalarFormatter())
        ax.set_ylim(-top, top)
        self._none.set_text(f"no discharges in {mesh.cycles:g} cycles")
        self._none.set_visible(not positive.size)
        phase = np.linspace(0.0, 360.0, 721)
        supply: Any = result.scenario.supply
        if hasattr(supply, "fourier"):
            orders, a, b = supply.fourier()
            v, label = evaluate(phase / 360.0, orders, a, b) / 1e3, "applied voltage [kV]"
        else:  # as phase_pattern: a unit sine marks the phase reference
            v, label = np.sin(np.radians(phase)), "applied voltage (shape) [p.u.]"
        self._voltage.set_data(phase, v)
        if label != self._vax.yaxis.label.get_text():  # a supply without a period: redraw the fixed layer
            self._vax.set_ylabel(label, color=VOLTAGE)
            self._overlay = None
        vtop = 1.12 * float(np.max(np.abs(v)))
        self._vax.set_ylim(-vtop, vtop)

    # sequence
    def _build_sequence(self) -> None:
        from pdvoid.faces.plots.sequence import SEQUENCE_KINDS
        from pdvoid.faces.plots.style import NEGATIVE, POSITIVE, finish_axes

        ax = self.figure.add_subplot()
        finish_axes(ax)
        self._pairs = [ax.scatter([], [], s=10, color=c, alpha=0.8, lw=0, zorder=3) for c in (POSITIVE, NEGATIVE)]
        ax.axhline(0.0, color="#999999", lw=0.6, zorder=1)
        ax.axvline(0.0, color="#999999", lw=0.6, zorder=1)
        self._none = ax.text(0.5, 0.5, "too few discharges for a pulse sequence", transform=ax.transAxes,
                             ha="center", va="center", fontsize=10, color="#444444", visible=False)
        xl, yl = SEQUENCE_KINDS["du"]
        ax.set_xlabel(xl, fontsize=9)
        ax.set_ylabel(yl, fontsize=9)
        self._static += [_fix_label(ax, "x", 0.27), _fix_label(ax, "y", 0.42)]
        self._ax = ax

    def _update_sequence(self, result: Result) -> None:
        from pdvoid.analysis.sequence import pulse_sequence

        ps = pulse_sequence(result)
        x, y, q = ps.delta_u_previous / 1e3, ps.delta_u_next / 1e3, ps.charge[2:]
        total = x.size
        counts = (int(np.count_nonzero(q > 0.0)), int(np.count_nonzero(q < 0.0)))
        stride = max(1, math.ceil(total / SEQUENCE_POINTS))
        x, y, q = x[::stride], y[::stride], q[::stride]
        many = x.size > 500
        ax = self._ax
        legend = ax.get_legend()
        if legend is not None:
            legend.remove()
        shown = []
        for dots, sel, word, count in zip(self._pairs, (q > 0.0, q < 0.0), ("positive", "negative"), counts,
                                          strict=True):
            dots.set_offsets(np.column_stack([x[sel], y[sel]]))
            dots.set_sizes([5.0 if many else 10.0])
            dots.set_alpha(0.5 if many else 0.8)
            n = int(np.count_nonzero(sel))
            dots.set_label(f"pulse n {word} ({count}" + (f", every {stride}th shown" if stride > 1 else "") + ")")
            dots.set_visible(n > 0)
            if n:
                shown.append(dots)
        self._none.set_visible(total == 0)
        if total:
            pad_x = 0.05 * (float(x.max() - x.min()) or 1.0)
            pad_y = 0.05 * (float(y.max() - y.min()) or 1.0)
            ax.set_xlim(float(x.min()) - pad_x, float(x.max()) + pad_x)
            ax.set_ylim(float(y.min()) - pad_y, float(y.max()) + pad_y)
            ax.legend(handles=shown, fontsize=8, frameon=False, loc="best", markerscale=1.5)
        else:
            ax.set_xlim(-0.055, 0.055)
            ax.set_ylim(-0.055, 0.055)


class LiveViews:
    """The three persistent on-screen views of one workbench, built on first use.

    Attributes
    ----------
    views : dict of str to LiveView
        The views built so far, by name.
    """

    def __init__(self) -> None:
        self.views: dict[str, LiveView] = {}

    def render(self, name: str, result: Result) -> bytes:
        """PNG bytes of view ``name`` updated to ``result``.

        Parameters
        ----------
        name : str
            "field", "pattern" or "sequence" [-].
        result : Result
            The simulation [-].

        Returns
        -------
        bytes
            The PNG file.

        Raises
        ------
        InputError
            For an unknown view name.
        """
        view = self.views.get(name)
        if view is None:
            view = self.views[name] = LiveView(name)
        return view.render(result)
