"""The void field against time: the picture that explains the discharge sequence.

Between discharges the void field is E_v(t) = g·V(t) + E_q(t), with g = f/d the void field per applied
volt and E_q the field of the charge deposited by earlier discharges (constant, or decaying with the model's
charge_decay_time). At each discharge E_q jumps so that E_v falls from field_before to field_after. The
trace is rebuilt exactly from the stored events: E_q = field_after − g·u at each event. For the network
model the events' fields are the void voltage divided by the void height and g = k/h, the same formula.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from matplotlib.axes import Axes
from matplotlib.lines import Line2D

from pdvoid.coefficients import compute_coefficients
from pdvoid.core.errors import InputError, check_int
from pdvoid.faces.plots.style import (
    FIGSIZE,
    LEVEL,
    NEGATIVE,
    POSITIVE,
    RESIDUAL,
    TWIN,
    VOLTAGE,
    attach,
    finish_axes,
    new_axes,
)
from pdvoid.inputs.scenario import Scenario
from pdvoid.inputs.waveform import evaluate
from pdvoid.simulation.events import Events
from pdvoid.simulation.results import Result

__all__ = ["FieldTrace", "void_field_trace", "field_time"]

FIELD_COLOUR = "#2d1e5f"  # the void field (dark end of the perceptual maps)
_KV_PER_MM = 1e6  # V/m per kV/mm


@dataclass(frozen=True, eq=False)
class FieldTrace:
    """The void field over a time window, rebuilt from a result's events.

    Attributes
    ----------
    time : numpy.ndarray
        Sample times; every discharge time appears twice (field just before, then just after) [s].
    field : numpy.ndarray
        Void field at ``time`` [V/m].
    voltage : numpy.ndarray
        Applied voltage at ``time`` [V].
    gain : float
        Void field per applied volt, f/d [1/m].
    inception_field, residual_field : float
        E_inc and E_res in the void [V/m].
    event_index : numpy.ndarray
        Indices (into the result's events) of the discharges inside the window [-].
    start, stop : float
        The window [s].
    """

    time: np.ndarray
    field: np.ndarray
    voltage: np.ndarray
    gain: float
    inception_field: float
    residual_field: float
    event_index: np.ndarray
    start: float
    stop: float


@dataclass(frozen=True, eq=False)
class _StoredEvents:
    """The event arrays of a Result that the trace reads, each a float array (Events fills a value it does not
    know with NaN, so none is missing)."""

    time: np.ndarray
    cycle: np.ndarray
    charge: np.ndarray
    voltage: np.ndarray
    field_before: np.ndarray
    field_after: np.ndarray
    count: int
    cycles: float
    frequency: float


def _stored(ev: Events) -> _StoredEvents:
    def arr(values: np.ndarray | None) -> np.ndarray:
        return np.asarray(values, dtype=float)

    return _StoredEvents(
        arr(ev.time),
        arr(ev.cycle),
        ev.charge,
        arr(ev.voltage),
        arr(ev.field_before),
        arr(ev.field_after),
        ev.count,
        ev.cycles,
        ev.frequency,
    )


def _result_parts(result: Result) -> tuple[_StoredEvents, Scenario]:
    ev = getattr(result, "events", None)
    scenario = getattr(result, "scenario", None)
    if not isinstance(ev, Events) or not isinstance(scenario, Scenario):
        raise InputError(
            "the field-versus-time plot needs a simulation Result (events and scenario); got "
            + type(result).__name__
        )
    recorded = getattr(result, "event_count", ev.count)
    if int(recorded) != ev.count:
        raise InputError(
            f"this result recorded {int(recorded)} discharges but stored {ev.count} events (a histogram-only "
            "run); "
            "the field-versus-time plot needs every event (simulate(..., histogram=False))"
        )
    stored = _stored(ev)
    if ev.count and not (
        np.all(np.isfinite(stored.time))
        and np.all(np.isfinite(stored.voltage))
        and np.all(np.isfinite(stored.field_after))
        and np.all(np.isfinite(stored.field_before))
    ):
        raise InputError("the field-versus-time plot needs the time, voltage and void fields of every event")
    return stored, scenario


def void_field_trace(
    result: Result, start_cycle: int = 0, cycles: int = 3, points_per_cycle: int = 720
) -> FieldTrace:
    """Rebuild the void field of a simulation over ``cycles`` whole cycles from ``start_cycle``.

    E_v(t) = g·V(t) + E_q(t) with g = field_enhancement / insulation.thickness; after each discharge k
    E_q(t) = (field_after_k − g·voltage_k)·exp(−(t − t_k)/τ_q) (τ_q = model.charge_decay_time, inf for none);
    before the first discharge of the run E_q = 0 (the simulation starts from an uncharged void).

    Parameters
    ----------
    result : Result
        A simulation Result that stored its events [-].
    start_cycle : int
        First cycle shown, 0 ... result.cycles - 1 [-].
    cycles : int
        Number of whole cycles, 1 ... 100 [-].
    points_per_cycle : int
        Samples per cycle between discharges, 16 ... 100000 [-].

    Returns
    -------
    FieldTrace
        The rebuilt trace.

    Raises
    ------
    InputError
        For anything but a Result with stored events, or bad cycle numbers.
    """
    ev, scenario = _result_parts(result)
    total = int(round(ev.cycles))
    start_cycle = check_int("start_cycle", start_cycle, 0, max(total - 1, 0))
    cycles = check_int("cycles", cycles, 1, 100)
    points_per_cycle = check_int("points_per_cycle", points_per_cycle, 16, 100_000)
    c = compute_coefficients(scenario)
    gain = c.field_enhancement / scenario.insulation.thickness
    tau = float(scenario.model.charge_decay_time)
    orders, a, b = scenario.periodic_supply.fourier()
    f = ev.frequency
    t0 = start_cycle / f
    t1 = (start_cycle + cycles) / f

    def volt(t: np.ndarray) -> np.ndarray:
        return evaluate(t * f - np.floor(t * f), orders, a, b)

    order = np.argsort(ev.time, kind="stable")
    times = ev.time[order]
    inside = order[(times >= t0) & (times < t1)]
    before = order[times < t0]
    if before.size:
        k = before[-1]
        eq, tq = float(ev.field_after[k] - gain * ev.voltage[k]), float(ev.time[k])
    else:
        eq, tq = 0.0, t0

    def deposited(t: np.ndarray, eq0: float, tq0: float) -> np.ndarray:
        if not math.isfinite(tau) or eq0 == 0.0:
            return np.full_like(t, eq0)
        return eq0 * np.exp(-(t - tq0) / tau)

    bounds = np.concatenate([[t0], ev.time[inside], [t1]])
    ts, es = [], []
    for i in range(bounds.size - 1):
        ta, tb = bounds[i], bounds[i + 1]
        n = max(2, int(math.ceil((tb - ta) * f * points_per_cycle)) + 1)
        t = np.linspace(ta, tb, n)
        ts.append(t)
        es.append(gain * volt(t) + deposited(t, eq, tq))
        if i < inside.size:  # the discharge at tb resets the deposited field
            k = inside[i]
            eq, tq = float(ev.field_after[k] - gain * ev.voltage[k]), float(ev.time[k])
    time = np.concatenate(ts)
    return FieldTrace(
        time=time,
        field=np.concatenate(es),
        voltage=volt(time),
        gain=float(gain),
        inception_field=float(c.inception_field),
        residual_field=float(c.residual_field),
        event_index=inside,
        start=t0,
        stop=t1,
    )


def _first_active_cycle(ev: _StoredEvents, cycles: int) -> int:
    total = int(round(ev.cycles))
    if ev.count == 0:
        return 0
    first = int(np.nanmin(ev.cycle))
    return max(0, min(first, total - cycles))


def field_time(
    result: Result,
    cycles: int = 3,
    start_cycle: int | None = None,
    ax: Axes | None = None,
    *,
    points_per_cycle: int = 720,
    legend: bool = True,
) -> Axes:
    """Plot the void field against time with the applied voltage, the inception and residual levels and every
    discharge (a vertical segment from the field just before to just after it).

    The applied voltage is drawn on a twin axis whose scale is matched to the field axis by the gain g = f/d,
    so the voltage curve is also the field an uncharged void would see; the distance between the two curves is
    the field of the deposited charge.

    Parameters
    ----------
    result : Result
        A simulation Result that stored its events [-].
    cycles : int
        Number of whole cycles shown, 1 ... 100 [-].
    start_cycle : int, optional
        First cycle shown; None: the first cycle with a discharge (or 0 without discharges) [-].
    ax : matplotlib.axes.Axes, optional
        Axes to draw into; None creates a figure [-].
    points_per_cycle : int
        Samples per cycle of the trace, 16 ... 100000 [-].
    legend : bool
        Draw the legend below the axes [-].

    Returns
    -------
    matplotlib.axes.Axes
        ``ax``, or the Axes of a new figure when ``ax`` is None: the Axes of the void field (the voltage axis
        is its twin, kept as ``ax.pdvoid_twin``).

    Raises
    ------
    InputError
        For anything but a Result with stored events, or bad cycle numbers.
    """
    ev, _ = _result_parts(result)
    cycles = check_int("cycles", cycles, 1, 100)
    if start_cycle is None:
        start_cycle = _first_active_cycle(ev, cycles)
    tr = void_field_trace(result, start_cycle, cycles, points_per_cycle)
    ax = new_axes(ax, FIGSIZE)
    finish_axes(ax)
    ms = 1e3
    ax.plot(tr.time * ms, tr.field / _KV_PER_MM, color=FIELD_COLOUR, lw=1.4, zorder=3, label="void field")
    e_inc, e_res = tr.inception_field / _KV_PER_MM, tr.residual_field / _KV_PER_MM
    for sign in (1.0, -1.0):
        ax.axhline(sign * e_inc, color=LEVEL, lw=1.0, ls="--", zorder=2)
        if e_res > 0.0:
            ax.axhline(sign * e_res, color=RESIDUAL, lw=1.0, ls=":", zorder=2)
    ax.axhline(0.0, color="#999999", lw=0.6, zorder=1)
    idx = tr.event_index
    if idx.size:
        t = ev.time[idx] * ms
        fb = ev.field_before[idx] / _KV_PER_MM
        fa = ev.field_after[idx] / _KV_PER_MM
        colours = np.where(ev.charge[idx] >= 0.0, POSITIVE, NEGATIVE)
        ax.vlines(t, fa, fb, colors=list(colours), lw=2.2, zorder=4)
        ax.scatter(t, fb, s=14, c=colours, zorder=5, edgecolors="white", linewidths=0.4)
    else:
        ax.text(
            0.5,
            0.04,
            "no discharges in these cycles",
            transform=ax.transAxes,
            ha="center",
            va="bottom",
            fontsize=9,
            color="#444444",
        )
    top = 1.15 * max(float(np.max(np.abs(tr.field))), tr.inception_field) / _KV_PER_MM
    ax.set_ylim(-top, top)
    ax.set_xlim(tr.start * ms, tr.stop * ms)
    ax.set_xlabel("time [ms]")
    ax.set_ylabel("void field [kV/mm]")

    vax = ax.twinx()
    vax.plot(tr.time * ms, tr.voltage / 1e3, color=VOLTAGE, lw=1.0, ls=(0, (5, 2)), zorder=1)
    vtop = top * _KV_PER_MM / tr.gain / 1e3
    vax.set_ylim(-vtop, vtop)
    vax.set_ylabel("applied voltage [kV]", color=VOLTAGE)
    vax.tick_params(labelsize=9, colors=VOLTAGE)
    for side in ("top", "left"):
        vax.spines[side].set_visible(False)
    ax.set_zorder(vax.get_zorder() + 1)
    ax.patch.set_visible(False)
    attach(ax, TWIN, vax)  # the voltage axis, for callers that want to restyle it

    if legend:
        handles = [
            Line2D([], [], color=FIELD_COLOUR, lw=1.4, label="void field"),
            Line2D(
                [],
                [],
                color=VOLTAGE,
                lw=1.0,
                ls=(0, (5, 2)),
                label="applied voltage (right axis) = field of an uncharged void",
            ),
            Line2D([], [], color=LEVEL, lw=1.0, ls="--", label="± inception field"),
            Line2D([], [], color=RESIDUAL, lw=1.0, ls=":", label="± residual field"),
            Line2D([], [], color=POSITIVE, lw=2.2, marker="o", ms=4, label="discharge, positive"),
            Line2D([], [], color=NEGATIVE, lw=2.2, marker="o", ms=4, label="discharge, negative"),
        ]
        ax.legend(
            handles=handles,
            loc="upper center",
            bbox_to_anchor=(0.5, -0.16),
            ncols=2,
            fontsize=8,
            frameon=False,
        )
    return ax
