"""Pulse-sequence plots: voltage change between consecutive discharges (after Hoof & Patsch)."""

from __future__ import annotations

import numpy as np
from matplotlib.axes import Axes

from pdvoid.analysis.sequence import pulse_sequence
from pdvoid.core.errors import check_choice
from pdvoid.faces.plots.style import FIGSIZE, NEGATIVE, POSITIVE, finish_axes, new_axes
from pdvoid.simulation.events import Events
from pdvoid.simulation.results import Result

__all__ = ["pulse_sequence_plot", "SEQUENCE_KINDS"]

#: kind -> (x label, y label)
SEQUENCE_KINDS = {
    "du": ("Δu(n−1), applied voltage change from pulse n−2 to n−1 [kV]", "Δu(n), from pulse n−1 to n [kV]"),
    "q_du": ("Δu(n), applied voltage change from pulse n−1 to n [kV]", "apparent charge q(n) [pC]"),
    "dphi": ("Δφ(n−1), phase elapsed from pulse n−2 to n−1 [deg]", "Δφ(n), from pulse n−1 to n [deg]"),
}


def pulse_sequence_plot(events: Result | Events, kind: str = "du", ax: Axes | None = None) -> Axes:
    """Pulse-sequence plot of consecutive discharges (:func:`pdvoid.analysis.sequence.pulse_sequence`).

    kind "du": Δu(n) against Δu(n−1), the changes of the applied voltage between consecutive pulses;
    "q_du": the charge q(n) against Δu(n); "dphi": Δφ(n) against Δφ(n−1). Points are coloured by the
    polarity of pulse n.

    Parameters
    ----------
    events : Result or Events
        Discharge events (with time, applied voltage and cycle) or a Result that stored them [-].
    kind : str
        "du", "q_du" or "dphi" [-].
    ax : matplotlib.axes.Axes, optional
        Axes to draw into; None creates a figure [-].

    Returns
    -------
    matplotlib.axes.Axes
        ``ax``, or the Axes of a new figure when ``ax`` is None.

    Raises
    ------
    InputError
        For an unknown ``kind`` or events without the times and voltages a sequence needs.

    References
    ----------
    hoof1995: M. Hoof, R. Patsch, 'Pulse-sequence analysis: a new method for investigating the physics of
    PD-induced ageing', IEE Proc.-Sci. Meas. Technol. 142(1) (1995) 95-101 (from memory).
    """
    kind = check_choice("kind", kind, tuple(SEQUENCE_KINDS))
    ps = pulse_sequence(events)
    ax = new_axes(ax, FIGSIZE)
    finish_axes(ax)
    if kind == "du":
        x, y, q = ps.delta_u_previous / 1e3, ps.delta_u_next / 1e3, ps.charge[2:]
    elif kind == "q_du":
        x, y, q = ps.delta_u / 1e3, ps.charge_n / 1e-12, ps.charge_n
    else:
        x, y, q = ps.delta_phase_previous_deg, ps.delta_phase_next_deg, ps.charge[2:]
    many = x.size > 500
    for sel, colour, name in (
        (q > 0.0, POSITIVE, "pulse n positive"),
        (q < 0.0, NEGATIVE, "pulse n negative"),
    ):
        if np.any(sel):
            ax.scatter(
                x[sel],
                y[sel],
                s=10 if not many else 5,
                color=colour,
                alpha=0.5 if many else 0.8,
                lw=0,
                label=f"{name} ({int(np.count_nonzero(sel))})",
                zorder=3,
                rasterized=many,
            )
    if x.size == 0:
        ax.text(
            0.5,
            0.5,
            "too few discharges for a pulse sequence",
            transform=ax.transAxes,
            ha="center",
            va="center",
            fontsize=10,
            color="#444444",
        )
    else:
        ax.legend(fontsize=8, frameon=False, loc="best", markerscale=1.5)
    if kind != "dphi":
        ax.axhline(0.0, color="#999999", lw=0.6, zorder=1)
        ax.axvline(0.0, color="#999999", lw=0.6, zorder=1)
    xl, yl = SEQUENCE_KINDS[kind]
    ax.set_xlabel(xl)
    ax.set_ylabel(yl)
    return ax
