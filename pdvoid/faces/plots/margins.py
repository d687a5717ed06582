"""Design-margin charts: inception and extinction voltage against a swept input, and the sensitivity (tornado)
chart."""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from typing import Any

import numpy as np
from matplotlib.axes import Axes
from matplotlib.lines import Line2D
from matplotlib.patches import Patch

from pdvoid.analysis.margins import MarginTable
from pdvoid.core.errors import InputError, check_positive, check_real
from pdvoid.faces.plots.style import (
    FIGSIZE,
    LEVEL,
    NEGATIVE,
    POSITIVE,
    VOLTAGE,
    colour_cycle,
    display_factor,
    finish_axes,
    new_axes,
    plain_log_ticks,
)

#: legend entry of the shaded inception band
BAND_LABEL = "inception band (both criteria, spread of the streamer constant)"

__all__ = ["inception_chart", "sensitivity_chart", "crossings", "PARAMETER_NAMES"]

#: readable names of swept parameters
PARAMETER_NAMES = {
    "void.size": "void diameter (shape kept)",
    "void.diameter": "void diameter",
    "void.height": "void height",
    "void.pressure": "gas pressure",
    "void.temperature": "gas temperature",
    "void.inception_length": "streamer length",
    "insulation.thickness": "insulation thickness",
    "insulation.permittivity": "host permittivity",
    "model.residual_ratio": "residual field ratio",
    "supply.frequency": "supply frequency",
}
# SI unit of a table -> (display unit, SI per display unit)
_DISPLAY = {
    "m": ("mm", 1e-3),
    "Pa": ("kPa", 1e3),
    "K": ("K", 1.0),
    "Hz": ("Hz", 1.0),
    "-": ("-", 1.0),
    "1": ("-", 1.0),
    "": ("-", 1.0),
}
_TABLE_FIELDS = ("parameter", "unit", "values", "inception_voltage", "extinction_voltage")


def _check_tables(tables: MarginTable | Iterable[MarginTable]) -> list[Any]:
    candidates: Any = [tables] if all(hasattr(tables, f) for f in _TABLE_FIELDS) else tables
    try:
        items = list(candidates)
    except TypeError:
        raise InputError(
            f"tables must be a MarginTable or a list of them; got {type(tables).__name__}"
        ) from None
    if not items:
        raise InputError("tables must hold at least one MarginTable; got none")
    for i, t in enumerate(items):
        missing = [f for f in _TABLE_FIELDS if not hasattr(t, f)]
        if missing:
            raise InputError(f"tables[{i}] is not a MarginTable (no {', '.join(missing)})")
        n = np.asarray(t.values).shape
        if (
            len(n) != 1
            or n[0] < 1
            or np.asarray(t.inception_voltage).shape != n
            or np.asarray(t.extinction_voltage).shape != n
        ):
            raise InputError(
                f"tables[{i}]: values, inception_voltage and extinction_voltage must be 1-D arrays of "
                "one length"
            )
        if not np.all(np.isfinite(np.asarray(t.values, dtype=float))):
            raise InputError(f"tables[{i}]: values must be finite")
        if not np.any(np.isfinite(np.asarray(t.inception_voltage, dtype=float))):
            raise InputError(f"tables[{i}]: no finite inception voltage to draw")
        if t.parameter != items[0].parameter or t.unit != items[0].unit:
            raise InputError(
                f"all tables must sweep the same parameter; tables[{i}] sweeps {t.parameter!r} "
                f"[{t.unit}], tables[0] {items[0].parameter!r} [{items[0].unit}]"
            )
    return items


def crossings(x: np.ndarray, y: np.ndarray, level: float, *, log_x: bool = False) -> list[tuple[float, bool]]:
    """Where the sampled curve y(x) crosses ``level``, by linear interpolation between neighbouring finite
    samples (in log x when ``log_x``).

    Parameters
    ----------
    x : numpy.ndarray
        Sample positions [any unit].
    y : numpy.ndarray
        Curve values at ``x``; non-finite samples are skipped [any unit].
    level : float
        The level crossed [same unit as y].
    log_x : bool
        Interpolate in log x (where both neighbours are > 0) [-].

    Returns
    -------
    list of tuple of (float, bool)
        (x, falling) pairs: x of each crossing [same unit as x]; ``falling`` is True where y drops below the
        level as x grows.
    """
    x = np.asarray(x, dtype=float)
    y = np.asarray(y, dtype=float)
    out: list[tuple[float, bool]] = []
    order = np.argsort(x)
    x, y = x[order], y[order]
    ok = np.isfinite(y)
    x, y = x[ok], y[ok]
    for i in range(x.size - 1):
        a, b = y[i] - level, y[i + 1] - level
        if a == 0.0:
            out.append((float(x[i]), b < 0.0))
        elif a * b < 0.0:
            w = a / (a - b)
            if log_x and x[i] > 0 and x[i + 1] > 0:
                xc = math.exp(math.log(x[i]) + w * (math.log(x[i + 1]) - math.log(x[i])))
            else:
                xc = x[i] + w * (x[i + 1] - x[i])
            out.append((float(xc), b < a))
    return out


def inception_chart(
    tables: MarginTable | Iterable[MarginTable],
    service_voltage: float | None = None,
    test_voltage: float | None = None,
    ax: Axes | None = None,
    *,
    labels: Sequence[str] | None = None,
    extinction: bool = True,
) -> Axes:
    """Inception voltage (solid) and extinction voltage (dashed) against the swept input for one or several
    margin tables, with the service and test levels and the largest (or smallest) discharge-free value marked
    where an inception curve crosses the test level.

    Parameters
    ----------
    tables : MarginTable or iterable of MarginTable
        A MarginTable (pdvoid.analysis.margins.margin_table) or a list of them over the same parameter [-].
    service_voltage : float, optional
        Service level; None: not drawn [V rms].
    test_voltage : float, optional
        Test level; None: the tables' own test_voltage, if any [V rms].
    ax : matplotlib.axes.Axes, optional
        Axes to draw into; None creates a figure [-].
    labels : sequence of str, optional
        One legend label per table; default: the tables' ``label`` attribute or "curve i" [-].
    extinction : bool
        Draw the extinction voltages [-].

    Returns
    -------
    matplotlib.axes.Axes
        ``ax``, or the Axes of a new figure when ``ax`` is None.

    Raises
    ------
    InputError
        For tables that are not MarginTables, sweep different parameters or hold no valid value, and for
        non-positive voltages.
    """
    items = _check_tables(tables)
    if labels is not None:
        if (
            isinstance(labels, str)
            or len(labels) != len(items)
            or not all(isinstance(s, str) for s in labels)
        ):
            raise InputError(f"labels must be {len(items)} strings, one per table; got {labels!r}")
    if service_voltage is not None:
        service_voltage = check_positive("service_voltage", service_voltage, "V")
    if test_voltage is None:
        own = {getattr(t, "test_voltage", None) for t in items} - {None}
        test_voltage = own.pop() if len(own) == 1 else None
    if test_voltage is not None:
        test_voltage = check_positive("test_voltage", test_voltage, "V")
    parameter, unit = items[0].parameter, items[0].unit
    dunit, factor = _DISPLAY.get(unit, (unit, 1.0))
    name = PARAMETER_NAMES.get(parameter, parameter)
    all_x = np.concatenate([np.asarray(t.values, dtype=float) for t in items])
    log_x = bool(np.all(all_x > 0.0) and all_x.max() / all_x.min() >= 20.0)

    ax = new_axes(ax, FIGSIZE)
    finish_axes(ax)
    colours = colour_cycle(len(items))
    handles: list[Line2D | Patch] = []
    marks = []
    band_drawn = False
    for i, t in enumerate(items):
        x = np.asarray(t.values, dtype=float)
        order = np.argsort(x)
        x = x[order]
        inc = np.asarray(t.inception_voltage, dtype=float)[order]
        ext = np.asarray(t.extinction_voltage, dtype=float)[order]
        label = (
            labels[i]
            if labels is not None
            else getattr(t, "label", None) or ("inception voltage" if len(items) == 1 else f"curve {i + 1}")
        )
        ax.plot(x / factor, inc / 1e3, color=colours[i], lw=1.8, zorder=3)
        low, high = getattr(t, "inception_low", None), getattr(t, "inception_high", None)
        if low is not None and high is not None:
            lo = np.asarray(low, dtype=float)[order]
            hi = np.asarray(high, dtype=float)[order]
            finite = np.isfinite(lo) & np.isfinite(hi)
            if np.any(finite & (hi > lo)):  # the band of the two criteria, where they differ
                ax.fill_between(x / factor, lo / 1e3, hi / 1e3, where=finite, color=colours[i], alpha=0.22,
                                lw=0, zorder=2)
                band_drawn = True
        if extinction:
            ax.plot(x / factor, ext / 1e3, color=colours[i], lw=1.3, ls="--", zorder=3)
        handles.append(Line2D([], [], color=colours[i], lw=1.8, label=label))
        if test_voltage is not None:
            for xc, falling in crossings(x, inc, test_voltage, log_x=log_x):
                marks.append((xc, falling, colours[i]))
    if band_drawn:
        handles.append(Patch(facecolor="#777777", alpha=0.22, label=BAND_LABEL))
    if extinction:
        handles.append(Line2D([], [], color="#777777", lw=1.8, label="inception (solid)"))
        handles.append(Line2D([], [], color="#777777", lw=1.3, ls="--", label="extinction (dashed)"))
    for level, text, style in ((service_voltage, "service", (0, (6, 2, 1, 2))), (test_voltage, "test", "-")):
        if level is None:
            continue
        level_colour = LEVEL if text == "test" else VOLTAGE
        ax.axhline(level / 1e3, color=level_colour, lw=1.2, ls=style, zorder=2)
        handles.append(
            Line2D([], [], color=level_colour, lw=1.2, ls=style, label=f"{text} voltage {level / 1e3:.3g} kV")
        )
    test_kv = math.nan if test_voltage is None else test_voltage / 1e3  # marks exist only with a test level
    for i, (xc, falling, colour) in enumerate(sorted(marks)):
        ax.plot(
            [xc / factor], [test_kv], marker="o", ms=7, mfc="white", mec=colour, mew=2, zorder=5
        )
        ax.axvline(xc / factor, color=colour, lw=0.9, ls=":", zorder=2)
        word = "largest" if falling else "smallest"
        above = i % 2 == 0  # alternate above and below the test level so that neighbours do not collide
        ax.annotate(
            f"{word} discharge-free: {xc / factor:.3g} {dunit}",
            (xc / factor, test_kv),
            xytext=(7, 9 if above else -9),
            textcoords="offset points",
            va="bottom" if above else "top",
            fontsize=8,
            color="#222222",
            bbox={"boxstyle": "round,pad=0.25", "fc": "white", "ec": colour, "lw": 0.8},
            zorder=6,
        )
    if log_x:
        ax.set_xscale("log")
        plain_log_ticks(ax.xaxis, all_x.min() / factor, all_x.max() / factor)
    ax.set_ylim(bottom=0.0)
    ax.set_xlabel(f"{name} [{dunit}]")
    ax.set_ylabel("applied voltage, rms [kV]")
    ax.legend(
        handles=handles,
        fontsize=8,
        loc="best",
        frameon=True,
        facecolor="white",
        edgecolor="none",
        framealpha=0.92,
    ).set_zorder(7)
    return ax


def _check_rows(rows: Iterable[tuple[str, float, float, float]]) -> list[tuple[str, float, float, float]]:
    if isinstance(rows, (str, bytes)) or not isinstance(rows, Iterable):
        raise InputError(f"rows must be a list of (label, low_value, high_value, base_value); got {rows!r}")
    out = []
    for i, row in enumerate(rows):
        if isinstance(row, (str, bytes)) or not hasattr(row, "__len__") or len(row) != 4:
            raise InputError(f"rows[{i}] must be (label, low_value, high_value, base_value); got {row!r}")
        label, low, high, base = row
        if not isinstance(label, str) or not label.strip():
            raise InputError(f"rows[{i}] label must be non-empty text; got {label!r}")
        b = check_real(f"rows[{i}] base_value", base)
        vals = []
        for what, v in (("low_value", low), ("high_value", high)):
            if isinstance(v, float) and (math.isnan(v) or v == math.inf):
                # NaN: a variation outside the valid range; +inf: no self-sustained discharge at any voltage
                vals.append(v)
            else:
                vals.append(check_real(f"rows[{i}] {what}", v))
        out.append((label, vals[0], vals[1], b))
    if not out:
        raise InputError("rows must hold at least one (label, low_value, high_value, base_value); got none")
    return out


def sensitivity_chart(
    rows: Iterable[tuple[str, float, float, float]],
    ax: Axes | None = None,
    *,
    quantity: str = "inception voltage, rms",
    unit: str = "kV",
    low_label: str = "input −20 %",
    high_label: str = "input +20 %",
) -> Axes:
    """Tornado chart: how a result moves when each input is lowered or raised, largest swing on top.

    Parameters
    ----------
    rows : iterable of tuple of (str, float, float, float)
        (label, low_value, high_value, base_value) per input, values in SI (e.g. V, C); a NaN low or high
        value marks a variation outside the valid range, +inf one with no self-sustained discharge at any voltage
        (an infinite inception voltage); both are labelled so [-].
    ax : matplotlib.axes.Axes, optional
        Axes to draw into; None creates a figure [-].
    quantity : str
        What the values are (x-axis label) [-].
    unit : str
        Display unit of the values, a key of pdvoid.core.units.UNITS (e.g. "kV", "pC") [-].
    low_label, high_label : str
        Legend labels of the two variations [-].

    Returns
    -------
    matplotlib.axes.Axes
        ``ax``, or the Axes of a new figure when ``ax`` is None.

    Raises
    ------
    InputError
        For malformed rows, non-finite base values or an unknown unit.
    """
    items = _check_rows(rows)
    factor = display_factor(unit)
    if len({r[3] for r in items}) != 1:
        raise InputError(
            f"all rows must share one base_value (the unchanged design); got {sorted({r[3] for r in items})}"
        )
    base = items[0][3] / factor

    def swing(r: tuple[str, float, float, float]) -> float:
        s = np.nanmax([abs(v - r[3]) if math.isfinite(v) else math.nan for v in r[1:3]] + [0.0])
        return float(s)

    items = sorted(items, key=swing)  # barh draws from the bottom: largest swing ends on top
    ax = new_axes(ax, FIGSIZE)
    finish_axes(ax)
    ax.grid(False, axis="y")
    ypos = np.arange(len(items))
    span = max(
        [abs(v / factor - base) for r in items for v in r[1:3] if math.isfinite(v)]
        + [abs(base) * 1e-3, 1e-300]
    )
    for y, (_label, low, high, _) in zip(ypos, items, strict=True):
        for value, colour, dy in ((low, NEGATIVE, -0.18), (high, POSITIVE, 0.18)):
            if not math.isfinite(value):
                ax.text(
                    base + 0.02 * span,
                    y + dy,
                    "no self-sustained discharge" if value == math.inf else "outside the valid range",
                    va="center",
                    ha="left",
                    fontsize=7,
                    color="#666666",
                )
                continue
            v = value / factor
            ax.barh(y + dy, v - base, left=base, height=0.34, color=colour, alpha=0.85, zorder=3)
            rel = (value / factor - base) / base * 100.0 if base != 0.0 else math.nan
            if rel == 0.0:
                ax.text(
                    base + 0.02 * span,
                    y + dy,
                    "no change",
                    va="center",
                    ha="left",
                    fontsize=7,
                    color="#666666",
                )
            elif math.isfinite(rel):
                text = f"{rel:+.1f} %".replace("-", "\u2212")
                ax.text(
                    v + (0.02 * span if v >= base else -0.02 * span),
                    y + dy,
                    text,
                    va="center",
                    ha="left" if v >= base else "right",
                    fontsize=7,
                    color="#333333",
                )
    ax.axvline(base, color="#222222", lw=1.0, zorder=4)
    ax.set_yticks(ypos, [r[0] for r in items], fontsize=9)
    ax.set_xlim(base - 1.35 * span, base + 1.35 * span)
    ax.set_ylim(-0.7, len(items) - 0.3)
    ax.set_xlabel(f"{quantity} [{unit}]")
    ax.set_ylabel("input varied [-]")
    ax.legend(
        handles=[
            Line2D([], [], color=NEGATIVE, lw=6, label=low_label),
            Line2D([], [], color=POSITIVE, lw=6, label=high_label),
            Line2D([], [], color="#222222", lw=1.0, label=f"design: {base:.4g} {unit}"),
        ],
        fontsize=8,
        frameon=False,
        loc="lower right",
    )
    return ax
