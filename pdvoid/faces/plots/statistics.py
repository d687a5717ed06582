"""Per-half-cycle distributions against phase, and the Weibull probability plot of magnitudes."""

from __future__ import annotations

import numpy as np
from matplotlib.axes import Axes
from matplotlib.lines import Line2D

from pdvoid.analysis.magnitudes import weibull_fit, weibull_probability_points
from pdvoid.analysis.patterns import half_cycle_distributions
from pdvoid.core.errors import InputError, check_choice, check_int
from pdvoid.faces.plots.style import FIGSIZE, NEGATIVE, POSITIVE, finish_axes, new_axes, plain_log_ticks
from pdvoid.simulation.events import Events
from pdvoid.simulation.results import Result

__all__ = ["half_cycle", "weibull_plot", "HALF_CYCLE_LABELS"]

_PC = 1e-12  # C per pC

#: y-axis labels of the half-cycle distributions
HALF_CYCLE_LABELS = {
    "H_n": "H_n: pulses per cycle in each window [1/cycle]",
    "H_qn": "H_qn: mean apparent charge |q| [pC]",
    "H_qmax": "H_qmax: largest apparent charge |q| [pC]",
}
_HALF_NAMES = {"+": "positive half cycle (0–180 deg)", "-": "negative half cycle (180–360 deg)"}


def half_cycle(
    events: Result | Events, quantity: str = "H_n", ax: Axes | None = None, *, phase_windows: int = 36
) -> Axes:
    """One phase-resolved distribution per voltage half cycle, the negative half re-referenced to 0–180 deg.

    H_n is shown per cycle (pulses per cycle in each window) so that runs of different length compare;
    H_qn and H_qmax in pC. Definitions: :func:`pdvoid.analysis.patterns.half_cycle_distributions`.

    Parameters
    ----------
    events : Result or Events
        Discharge events or a Result that stored them [-].
    quantity : str
        "H_n", "H_qn" or "H_qmax" [-].
    ax : matplotlib.axes.Axes, optional
        Axes to draw into; None creates a figure [-].
    phase_windows : int
        Windows per half cycle, 1 ... 3600 [-].

    Returns
    -------
    matplotlib.axes.Axes
        ``ax``, or the Axes of a new figure when ``ax`` is None.

    Raises
    ------
    InputError
        For an unknown ``quantity``, a bad ``phase_windows`` or input without events.
    """
    quantity = check_choice("quantity", quantity, tuple(HALF_CYCLE_LABELS))
    phase_windows = check_int("phase_windows", phase_windows, 1, 3600)
    d = half_cycle_distributions(events, phase_windows)
    ax = new_axes(ax, FIGSIZE)
    finish_axes(ax)
    for half, colour in (("+", POSITIVE), ("-", NEGATIVE)):
        y = np.asarray(d.get(quantity, half), dtype=float)
        y = y / d.cycles if quantity == "H_n" else y / _PC
        ax.stairs(y, d.window_edges_deg, color=colour, lw=1.8, label=_HALF_NAMES[half], fill=False, zorder=3)
        ax.stairs(y, d.window_edges_deg, color=colour, alpha=0.12, fill=True, zorder=2)
    ax.set_xlim(0.0, 180.0)
    ax.set_xticks(np.arange(0.0, 181.0, 30.0))
    ax.set_ylim(bottom=0.0)
    ax.set_xlabel("phase within the half cycle [deg]")
    ax.set_ylabel(HALF_CYCLE_LABELS[quantity])
    ax.legend(fontsize=8, frameon=False, loc="upper right")
    return ax


_PROBABILITY_TICKS = (0.1, 1.0, 5.0, 10.0, 20.0, 40.0, 63.2, 80.0, 95.0, 99.0, 99.9)  # [%]


def _weibull_y(f: np.ndarray | float) -> np.ndarray:
    """ln(−ln(1 − F)): the Weibull-paper ordinate [-]."""
    return np.log(-np.log1p(-np.asarray(f, dtype=float)))


def weibull_plot(
    events: Result | Events,
    ax: Axes | None = None,
    *,
    polarities: tuple[str, ...] = ("+", "-"),
    parameters: int = 2,
    max_points: int = 2000,
) -> Axes:
    """Weibull probability plot of discharge magnitudes with the maximum-likelihood fit of each polarity.

    Points: sorted |q| against median ranks (:func:`pdvoid.analysis.magnitudes.weibull_probability_points`) on
    Weibull paper (ln(−ln(1 − F)) against log |q|); lines: the fits of
    :func:`pdvoid.analysis.magnitudes.weibull_fit`, drawn where a polarity has at least 5 (2-parameter) or 10
    (3-parameter) magnitudes. More than ``max_points`` points per polarity are thinned evenly by rank for
    drawing only (the fit uses all).

    Parameters
    ----------
    events : Result or Events
        Discharge events or a Result that stored them [-].
    ax : matplotlib.axes.Axes, optional
        Axes to draw into; None creates a figure [-].
    polarities : tuple of str
        Any of "+", "-", "both" [-].
    parameters : int
        2 or 3 (Weibull parameters of the fit) [-].
    max_points : int
        Points drawn per polarity, 10 ... 1000000 [-].

    Returns
    -------
    matplotlib.axes.Axes
        ``ax``, or the Axes of a new figure when ``ax`` is None.

    Raises
    ------
    InputError
        When no polarity has a magnitude, or for bad options.
    """
    if isinstance(polarities, str) or not isinstance(polarities, (tuple, list)) or not polarities:
        raise InputError(f"polarities must be a non-empty tuple of '+', '-', 'both'; got {polarities!r}")
    for p in polarities:
        check_choice("polarities entry", p, ("+", "-", "both"))
    parameters = check_int("parameters", parameters, 2, 3)
    max_points = check_int("max_points", max_points, 10, 1_000_000)
    ax = new_axes(ax, FIGSIZE)
    finish_axes(ax)
    colours = {"+": POSITIVE, "-": NEGATIVE, "both": "#2d1e5f"}
    names = {"+": "positive", "-": "negative", "both": "all"}
    drawn = 0
    lo_q, hi_q = np.inf, 0.0
    y_lo, y_hi = np.inf, -np.inf
    for p in polarities:
        try:
            q, f = weibull_probability_points(events, p)
        except InputError as exc:
            if "no magnitudes" in str(exc):
                continue
            raise
        drawn += 1
        keep = np.unique(np.rint(np.linspace(0, q.size - 1, min(q.size, max_points))).astype(int))
        label = f"{names[p]}: n = {q.size}"
        need = 5 if parameters == 2 else 10
        fit = None
        if q.size >= need and np.ptp(q) > 0.0:
            fit = weibull_fit(events, p, parameters)
            label += f", β = {fit.shape:.2f}, α = {fit.scale / _PC:.3g} pC"
        ax.scatter(
            q[keep] / _PC,
            _weibull_y(f[keep]),
            s=9,
            color=colours[p],
            alpha=0.55,
            lw=0,
            label=label,
            zorder=3,
            rasterized=q.size > 500,
        )
        lo_q, hi_q = min(lo_q, float(q[0])), max(hi_q, float(q[-1]))
        y_lo, y_hi = min(y_lo, float(_weibull_y(f[0]))), max(y_hi, float(_weibull_y(f[-1])))
        if fit is not None:
            qq = np.geomspace(max(q[0], fit.location * (1 + 1e-9)) if fit.location > 0 else q[0], q[-1], 200)
            F = np.clip(fit.cdf(qq), 1e-6, 1 - 1e-9)
            ax.plot(qq / _PC, _weibull_y(F), color=colours[p], lw=1.5, zorder=4)
    if not drawn:
        raise InputError(f"no discharge magnitudes for polarities {tuple(polarities)}; nothing to plot")
    ax.set_xscale("log")
    plain_log_ticks(ax.xaxis, lo_q / _PC, hi_q / _PC)
    ticks = np.array(_PROBABILITY_TICKS)
    ax.set_yticks(_weibull_y(ticks / 100.0))
    ax.set_yticklabels([f"{t:g}" for t in ticks])
    ax.set_ylim(min(float(_weibull_y(0.0005)), y_lo - 0.3), max(float(_weibull_y(0.9995)), y_hi + 0.2))
    ax.set_xlabel("apparent charge |q| [pC]")
    ax.set_ylabel("cumulative probability [%]")
    handles, _ = ax.get_legend_handles_labels()
    handles.append(
        Line2D(
            [],
            [],
            color="#555555",
            lw=1.5,
            label=f"lines: {parameters}-parameter Weibull fit (maximum likelihood)",
        )
    )
    ax.legend(handles=handles, fontsize=8, frameon=False, loc="upper left")
    return ax
