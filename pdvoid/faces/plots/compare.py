"""Simulated against measured: two patterns side by side on one colour scale, and the per-half-cycle counts
overlaid."""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np
from matplotlib.axes import Axes

from pdvoid.analysis.patterns import half_cycle_distributions, pattern
from pdvoid.core.errors import InputError, check_int
from pdvoid.faces.plots.patterns import phase_pattern, rate_colorbar
from pdvoid.faces.plots.style import MESH, NEGATIVE, POSITIVE, attached, check_axes, finish_axes, new_figure
from pdvoid.simulation.events import Events, as_events
from pdvoid.simulation.results import Result

__all__ = ["compare"]


def _stored_events(obj: Result | Events, name: str) -> Events:
    ev = as_events(obj)
    recorded = getattr(obj, "event_count", ev.count)
    if not isinstance(obj, Events) and int(recorded) != ev.count:
        raise InputError(
            f"{name} is a histogram-only result ({int(recorded)} discharges, no stored events); "
            "the comparison needs the events"
        )
    return ev


def compare(
    simulated: Result | Events,
    measured: Result | Events,
    axes: Sequence[Axes] | None = None,
    *,
    phase_bins: int = 72,
    charge_bins: int = 60,
    phase_windows: int = 36,
    labels: tuple[str, str] = ("simulated", "measured"),
) -> list[Axes]:
    """Simulated and measured phase-resolved patterns side by side (same bins, same colour scale) and their
    per-half-cycle pulse counts (H_n per cycle) overlaid.

    Parameters
    ----------
    simulated, measured : Result or Events
        Discharge events or Results that stored them [-].
    axes : sequence of matplotlib.axes.Axes, optional
        Three Axes (simulated pattern, measured pattern, overlay); None creates a figure [-].
    phase_bins, charge_bins : int
        Pattern bins (the charge range spans both data sets) [-].
    phase_windows : int
        Windows per half cycle of the overlay, 1 ... 3600 [-].
    labels : tuple of str
        Names of the two data sets [-].

    Returns
    -------
    list of matplotlib.axes.Axes
        [simulated pattern Axes, measured pattern Axes, overlay Axes]: the given ``axes``, or those of a new
        figure when ``axes`` is None.

    Raises
    ------
    InputError
        For inputs without events, when neither holds a discharge, or bad axes/labels.
    """
    sim = _stored_events(simulated, "simulated")
    meas = _stored_events(measured, "measured")
    phase_windows = check_int("phase_windows", phase_windows, 1, 3600)
    if (
        isinstance(labels, str)
        or not isinstance(labels, (tuple, list))
        or len(labels) != 2
        or not all(isinstance(s, str) for s in labels)
    ):
        raise InputError(f"labels must be two strings; got {labels!r}")
    mags = np.abs(np.concatenate([sim.charge, meas.charge]))
    mags = mags[mags > 0.0]
    if mags.size == 0:
        raise InputError("neither data set holds a discharge with nonzero charge; nothing to compare")
    charge_range = (0.0, float(mags.max()))
    pats = [pattern(e, phase_bins, charge_bins, "linear", charge_range, per_cycle=True) for e in (sim, meas)]
    rates = np.concatenate([np.asarray(p.values, dtype=float).ravel() for p in pats])
    rates = rates[rates > 0.0]
    vmin, vmax = float(rates.min()), float(rates.max())
    if vmax <= vmin:
        vmax = vmin * 10.0

    if axes is None:
        fig = new_figure((10.0, 7.6))
        mosaic = fig.subplot_mosaic([["sim", "meas"], ["overlay", "overlay"]], height_ratios=[1.15, 1.0])
        ax_sim, ax_meas, ax_over = mosaic["sim"], mosaic["meas"], mosaic["overlay"]
    else:
        ax_sim, ax_meas, ax_over = check_axes(axes, 3)
    for ax, p, src, title in (
        (ax_sim, pats[0], simulated, labels[0]),
        (ax_meas, pats[1], measured, labels[1]),
    ):
        phase_pattern(
            p,
            ax=ax,
            supply=getattr(getattr(src, "scenario", None), "supply", None),
            vmin=vmin,
            vmax=vmax,
            colorbar=False,
        )
        ax.set_title(f"{title}: {int(p.total)} discharges in {p.cycles:g} cycles", fontsize=10)
    rate_colorbar(attached(ax_sim, MESH), [ax_sim, ax_meas])

    finish_axes(ax_over)
    for ev, ls, name in ((sim, "-", labels[0]), (meas, "--", labels[1])):
        d = half_cycle_distributions(ev, phase_windows)
        for half, colour in (("+", POSITIVE), ("-", NEGATIVE)):
            y = np.asarray(d.get("H_n", half), dtype=float) / d.cycles
            word = "positive" if half == "+" else "negative"
            ax_over.stairs(
                y,
                d.window_edges_deg,
                color=colour,
                lw=1.8 if ls == "-" else 1.4,
                ls=ls,
                label=f"{name}, {word} half cycle",
                zorder=3,
            )
    ax_over.set_xlim(0.0, 180.0)
    ax_over.set_xticks(np.arange(0.0, 181.0, 30.0))
    ax_over.set_ylim(bottom=0.0)
    ax_over.set_xlabel("phase within the half cycle [deg]")
    ax_over.set_ylabel("H_n: pulses per cycle in each window [1/cycle]")
    ax_over.legend(fontsize=8, frameon=False, ncols=2, loc="upper right")
    return [ax_sim, ax_meas, ax_over]
