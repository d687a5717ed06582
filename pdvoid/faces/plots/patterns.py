"""The phase-resolved pattern: discharges per cycle over phase × apparent charge, with the applied voltage."""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np
from matplotlib.axes import Axes
from matplotlib.colors import LogNorm
from matplotlib.ticker import FuncFormatter

from pdvoid.analysis.patterns import PhasePattern, pattern
from pdvoid.core.errors import InputError, check_positive
from pdvoid.faces.plots.style import (
    MESH,
    PATTERN_CMAP,
    TWIN,
    VOLTAGE,
    WIDE_FIGSIZE,
    attach,
    finish_axes,
    new_axes,
    plain_number,
)
from pdvoid.inputs.parameters import Periodic, Sine
from pdvoid.inputs.waveform import evaluate
from pdvoid.simulation.events import Events
from pdvoid.simulation.results import Result

if TYPE_CHECKING:
    from matplotlib.cm import ScalarMappable
    from matplotlib.colorbar import Colorbar

__all__ = ["PatternMesh", "pattern_mesh", "phase_pattern", "draw_voltage", "rate_colorbar"]

_PC = 1e-12  # C per pC


@dataclass(frozen=True, eq=False)
class PatternMesh:
    """What a pattern plot draws.

    Attributes
    ----------
    phase_edges_deg : numpy.ndarray
        Phase edges [deg].
    charge_edges : numpy.ndarray
        Signed charge edges, increasing [C].
    rate : numpy.ndarray
        Discharges per cycle in each (charge, phase) cell, shape (charge cells, phase cells) [1/cycle].
    log_charge : bool
        True when the charge edges are logarithmic (drawn on a symmetric-log axis) [-].
    cycles : float
        Cycles observed [-].
    """

    phase_edges_deg: np.ndarray
    charge_edges: np.ndarray
    rate: np.ndarray
    log_charge: bool
    cycles: float


def _is_log(edges: np.ndarray) -> bool:
    pos = edges[edges > 0.0]
    if pos.size < 3:
        return False
    steps = np.diff(pos)
    return bool(pos.max() / pos.min() > 100.0 and steps.max() > 5.0 * steps.min())


def pattern_mesh(
    data: PhasePattern | Result | Events,
    *,
    phase_bins: int = 72,
    charge_bins: int = 60,
    charge_scale: str = "linear",
    charge_range: tuple[float, float] | None = None,
) -> PatternMesh:
    """The mesh of a pattern plot from a PhasePattern, a histogram-only Result, a Result or Events.

    Events are binned with :func:`pdvoid.analysis.patterns.pattern` (bins and range as there; without events
    and without ``charge_range`` the range is taken from the scenario's lag-free charge per discharge when a
    Result is given).

    Parameters
    ----------
    data : PhasePattern, Result or Events
        What to draw [-].
    phase_bins, charge_bins : int
        Bins when events are binned here [-].
    charge_scale : str
        "linear" or "log" when events are binned here [-].
    charge_range : tuple of float, optional
        (low, high) charge magnitudes [C]; None: from the data.

    Returns
    -------
    PatternMesh
        Edges and rates of the pattern.

    Raises
    ------
    InputError
        For data that is neither a pattern, a Result nor Events, or bad bins.
    """
    hist = getattr(data, "histogram", None)
    if isinstance(data, PhasePattern):
        x, y, z = data.mesh()
        rate = np.asarray(z, dtype=float) if data.per_cycle else np.asarray(z, dtype=float) / data.cycles
        return PatternMesh(x, y, rate, data.charge_scale == "log", float(data.cycles))
    source: Any = data  # a Result or anything shaped like one (duck-typed as before)
    if hist is not None and getattr(data, "events", None) is not None and source.events.count == 0:
        cycles = check_positive("result.cycles", float(source.cycles))
        counts = np.asarray(hist.counts, dtype=float)
        edges = np.asarray(hist.charge_edges, dtype=float)
        return PatternMesh(
            np.asarray(hist.phase_edges_deg, dtype=float), edges, counts.T / cycles, _is_log(edges), cycles
        )
    if not isinstance(data, Events) and not isinstance(getattr(data, "events", None), Events):
        raise InputError("phase_pattern needs a Result, Events or PhasePattern; got " + type(data).__name__)
    ev = data if isinstance(data, Events) else source.events
    if charge_range is None and not np.any(ev.charge != 0.0) and hasattr(data, "coefficients"):
        q0 = abs(float(source.coefficients().charge_per_discharge))
        charge_range = (q0 * 1e-2, q0 * 3.0) if charge_scale == "log" else (0.0, q0 * 3.0)
    pat = pattern(data, phase_bins, charge_bins, charge_scale, charge_range, per_cycle=True)
    x, y, z = pat.mesh()
    return PatternMesh(x, y, np.asarray(z, dtype=float), charge_scale == "log", float(pat.cycles))


def _supply_of(data: PhasePattern | Result | Events, supply: Sine | Periodic | None) -> Sine | Periodic | None:
    if supply is not None:
        if not hasattr(supply, "fourier"):
            raise InputError(f"supply must be a pdvoid Sine or Periodic supply; got {type(supply).__name__}")
        return supply
    scenario = getattr(data, "scenario", None)
    found: Sine | Periodic | None = getattr(scenario, "supply", None)
    return found


def draw_voltage(ax: Axes, supply: Sine | Periodic | None, *, zero_aligned: bool = True) -> Axes:
    """Draw one period of the applied voltage over phase on a twin axis of ``ax`` and return the twin.

    With a supply: its waveform in kV. Without: a unit sine in per unit of its peak (the phase reference of
    pdvoid's events is the positive-going zero crossing of the applied voltage).

    Parameters
    ----------
    ax : matplotlib.axes.Axes
        The pattern's Axes (phase in deg on its x axis); the twin is also kept as ``ax.pdvoid_twin``.
    supply : Sine or Periodic or None
        The supply whose waveform is drawn; None: a unit sine.
    zero_aligned : bool
        Put the voltage zero in the middle of the twin axis [-].

    Returns
    -------
    matplotlib.axes.Axes
        The twin Axes of the voltage.
    """
    phase = np.linspace(0.0, 360.0, 721)
    if supply is None:
        v, label = np.sin(np.radians(phase)), "applied voltage (shape) [p.u.]"
    else:
        orders, a, b = supply.fourier()
        v, label = evaluate(phase / 360.0, orders, a, b) / 1e3, "applied voltage [kV]"
    vax = ax.twinx()
    vax.plot(phase, v, color=VOLTAGE, lw=1.3, ls=(0, (5, 2)), zorder=6)
    top = 1.12 * float(np.max(np.abs(v)))
    if zero_aligned:
        vax.set_ylim(-top, top)
    vax.set_ylabel(label, color=VOLTAGE)
    vax.tick_params(labelsize=9, colors=VOLTAGE)
    for side in ("top", "left"):
        vax.spines[side].set_visible(False)
    ax.set_zorder(vax.get_zorder() + 1)
    ax.patch.set_visible(False)
    attach(ax, TWIN, vax)
    return vax


def rate_colorbar(mesh: ScalarMappable, axes: list[Axes], pad: float = 0.02) -> Colorbar:
    """The colour bar of a pattern's rate, with plain-number tick labels.

    Parameters
    ----------
    mesh : matplotlib.cm.ScalarMappable
        The pattern's mesh (``ax.pdvoid_mesh`` of :func:`phase_pattern`).
    axes : list of matplotlib.axes.Axes
        The Axes the colour bar takes its room from.
    pad : float
        Gap between the Axes and the colour bar, a fraction of the Axes [-].

    Returns
    -------
    matplotlib.colorbar.Colorbar
        The colour bar.
    """
    cb = axes[0].figure.colorbar(mesh, ax=axes, pad=pad, fraction=0.045, aspect=30)
    cb.set_label("discharges per cycle per cell [1/cycle]", size=9)
    cb.ax.tick_params(labelsize=8, which="both")
    cb.ax.yaxis.set_major_formatter(FuncFormatter(plain_number))
    cb.ax.yaxis.set_minor_formatter(
        FuncFormatter(lambda v, p: plain_number(v) if _leading(v) in (2, 5) else "")
    )
    return cb


def _leading(value: float) -> int:
    if value <= 0.0:
        return 0
    return int(round(value / 10.0 ** np.floor(np.log10(value) + 1e-12)))


def phase_pattern(
    data: PhasePattern | Result | Events,
    ax: Axes | None = None,
    *,
    phase_bins: int = 72,
    charge_bins: int = 60,
    charge_scale: str = "linear",
    charge_range: tuple[float, float] | None = None,
    voltage: bool = True,
    supply: Sine | Periodic | None = None,
    cmap: str = PATTERN_CMAP,
    vmin: float | None = None,
    vmax: float | None = None,
    colorbar: bool = True,
) -> Axes:
    """Phase-resolved pattern: discharges per cycle over phase × apparent charge (both polarities), on a
    logarithmic colour scale, with the applied voltage drawn over it on a twin axis.

    Parameters
    ----------
    data : Result, Events or PhasePattern
        A Result (with events, or histogram-only), Events or a PhasePattern [-].
    ax : matplotlib.axes.Axes, optional
        Axes to draw into; None creates a figure [-].
    phase_bins, charge_bins : int
        Bins when events are binned here (see analysis.patterns.pattern) [-].
    charge_scale : str
        "linear" or "log" (a symmetric-log axis) when events are binned here [-].
    charge_range : tuple of float, optional
        (low, high) magnitudes [C]; None: from the data.
    voltage : bool
        Draw the applied voltage (from ``supply``, else the result's scenario, else a unit sine) [-].
    supply : Sine or Periodic, optional
        A pdvoid Sine or Periodic whose waveform is drawn [-].
    cmap : str
        Colour map name (perceptually uniform: viridis, cividis, ...) [-].
    vmin, vmax : float, optional
        Colour limits in discharges per cycle per cell [1/cycle]; None: from the data.
    colorbar : bool
        Draw a colour bar [-].

    Returns
    -------
    matplotlib.axes.Axes
        ``ax``, or the Axes of a new figure when ``ax`` is None: the pattern's Axes (the voltage axis is
        ``ax.pdvoid_twin``; the mesh is ``ax.pdvoid_mesh``).

    Raises
    ------
    InputError
        For input that is not a pattern, bad bins or limits.
    """
    mesh = pattern_mesh(
        data,
        phase_bins=phase_bins,
        charge_bins=charge_bins,
        charge_scale=charge_scale,
        charge_range=charge_range,
    )
    sup = _supply_of(data, supply)
    ax = new_axes(ax, WIDE_FIGSIZE)
    finish_axes(ax, grid=False)
    rate = np.ma.masked_less_equal(mesh.rate, 0.0)
    positive = mesh.rate[mesh.rate > 0.0]
    lo = float(positive.min()) if positive.size else 1e-3
    hi = float(positive.max()) if positive.size else 1.0
    if vmin is not None:
        lo = check_positive("vmin", vmin, "1/cycle")
    if vmax is not None:
        hi = check_positive("vmax", vmax, "1/cycle")
    if hi <= lo:
        if vmin is not None and vmax is not None:
            raise InputError(f"vmax must exceed vmin; got vmin={lo!r}, vmax={hi!r}")
        hi = lo * 10.0
    y = mesh.charge_edges / _PC
    qm = ax.pcolormesh(
        mesh.phase_edges_deg,
        y,
        rate,
        cmap=cmap,
        norm=LogNorm(lo, hi),
        shading="flat",
        rasterized=True,
        zorder=2,
    )
    attach(ax, MESH, qm)
    top = float(np.max(np.abs(y)))
    ax.set_ylim(-top, top)
    if mesh.log_charge:
        lin = float(np.min(np.abs(y[y != 0.0])))
        ax.set_yscale("symlog", linthresh=lin, linscale=1.0)
        ax.yaxis.set_major_formatter(FuncFormatter(plain_number))
    ax.axhline(0.0, color="#999999", lw=0.6, zorder=3)
    ax.set_xlim(0.0, 360.0)
    ax.set_xticks(np.arange(0.0, 361.0, 45.0))
    ax.set_xlabel("phase [deg]")
    ax.set_ylabel("apparent charge [pC]")
    if not positive.size:
        ax.text(
            0.5,
            0.5,
            f"no discharges in {mesh.cycles:g} cycles",
            transform=ax.transAxes,
            ha="center",
            va="center",
            fontsize=10,
            color="#444444",
        )
    if voltage:
        draw_voltage(ax, sup)
    if colorbar:
        rate_colorbar(qm, [ax], pad=0.02)
    return ax
