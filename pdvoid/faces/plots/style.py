"""The house style of pdvoid's plots: white background, perceptual colours, units on every axis.

No global matplotlib state is touched: figures are built with :class:`matplotlib.figure.Figure` (never pyplot)
and every style choice is set on the artists themselves, so a user's rcParams and open pyplot figures are left
alone.
"""

from __future__ import annotations

import math

import matplotlib as mpl
import numpy as np
from matplotlib.axes import Axes
from matplotlib.figure import Figure
from matplotlib.ticker import FuncFormatter, MaxNLocator, NullLocator

from pdvoid.core.errors import InputError
from pdvoid.core.units import UNITS

__all__ = [
    "FIGSIZE",
    "WIDE_FIGSIZE",
    "PATTERN_CMAP",
    "SEQUENTIAL_CMAP",
    "POSITIVE",
    "NEGATIVE",
    "VOLTAGE",
    "LEVEL",
    "new_axes",
    "new_figure",
    "finish_axes",
    "check_axes",
    "display_factor",
    "colour_cycle",
    "plain_log_ticks",
    "plain_number",
]

#: default size of a single plot [in]: fits the text width of an A4 page with 2 cm margins
FIGSIZE = (6.5, 4.0)
#: default size of a plot with a colour bar or side-by-side panels [in]
WIDE_FIGSIZE = (7.0, 4.2)
#: colour map of phase-resolved patterns (perceptually uniform)
PATTERN_CMAP = "viridis"
#: colour map for families of curves (perceptually uniform, readable in grey and by colour-blind readers)
SEQUENTIAL_CMAP = "cividis"

# fixed colours, taken from the perceptual maps so that the palette stays consistent
POSITIVE = "#1f6f8b"  # positive half cycle / positive charge (a viridis-like blue-teal)
NEGATIVE = "#d1861a"  # negative half cycle / negative charge (warm amber, distinct in grey)
VOLTAGE = "#555555"  # the applied voltage
LEVEL = "#b2182b"  # thresholds: inception, test level
RESIDUAL = "#2c7fb8"  # residual field level
GRID = "#e3e3e3"


def new_figure(figsize: tuple[float, float] = FIGSIZE, **kwargs) -> Figure:
    """A white figure with constrained layout (not registered with pyplot) [in]."""
    fig = Figure(figsize=figsize, layout="constrained", facecolor="white", **kwargs)
    return fig


def new_axes(ax: Axes | None, figsize: tuple[float, float] = FIGSIZE) -> Axes:
    """``ax`` itself, or the axes of a new white figure with constrained layout when ``ax`` is None."""
    if ax is None:
        return new_figure(figsize).add_subplot()
    if not isinstance(ax, Axes):
        raise InputError(f"ax must be a matplotlib Axes or None; got {type(ax).__name__}")
    return ax


def finish_axes(ax: Axes, *, grid: bool = True) -> Axes:
    """Apply the house style to ``ax``: white face, light grid behind the data, no top/right frame."""
    ax.set_facecolor("white")
    if grid:
        ax.grid(True, color=GRID, linewidth=0.6, zorder=0)
        ax.set_axisbelow(True)
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)
    ax.tick_params(labelsize=9)
    ax.xaxis.label.set_size(10)
    ax.yaxis.label.set_size(10)
    return ax


def check_axes(axes: object, count: int, name: str = "axes") -> list[Axes]:
    """``count`` matplotlib Axes from a sequence, or InputError."""
    try:
        items = list(axes)  # type: ignore[call-overload]
    except TypeError:
        raise InputError(
            f"{name} must be a sequence of {count} matplotlib Axes; got {type(axes).__name__}"
        ) from None
    if len(items) != count or not all(isinstance(a, Axes) for a in items):
        raise InputError(f"{name} must be a sequence of {count} matplotlib Axes; got {len(items)} items")
    return items


def display_factor(unit: str) -> float:
    """SI value per display unit, e.g. 1e3 for "kV" and 1e-12 for "pC" (pdvoid.core.units.UNITS)."""
    if not isinstance(unit, str) or unit not in UNITS:
        raise InputError(
            f"unit must be one of pdvoid.core.units.UNITS ({', '.join(u for u in UNITS if u)}); got {unit!r}"
        )
    factor = UNITS[unit][1]
    if not math.isfinite(factor) or factor <= 0.0:  # pragma: no cover - the table holds positive factors
        raise InputError(f"unit {unit!r} has no usable factor")
    return factor


def colour_cycle(n: int) -> list[tuple[float, float, float, float]]:
    """``n`` distinguishable colours from the perceptual map viridis (dark to green; the pale yellow end is
    left out so that every line stays readable on white)."""
    cmap = mpl.colormaps[PATTERN_CMAP]
    if n <= 1:
        return [cmap(0.2)]
    return [cmap(x) for x in np.linspace(0.0, 0.72, n)]


def plain_number(value: float, _pos: object = None) -> str:
    """A tick label without powers of ten: 0.002, 50, 1000 (a true minus sign)."""
    return f"{value:g}".replace("-", "\u2212")


def plain_log_ticks(axis: object, low: float, high: float) -> None:
    """Plain-number tick labels on a logarithmic axis whose data span ``low`` ... ``high`` (> 0): evenly
    spaced ticks within one decade, 0.2, 0.5, 1, 2, 5 ... labels over wider spans (not powers of ten)."""
    span = high / low if low > 0.0 else np.inf
    if span < 10.0:
        axis.set_major_locator(MaxNLocator(7))
        axis.set_minor_locator(NullLocator())
        axis.set_major_formatter(FuncFormatter(plain_number))
        return

    def minor(value: float, _pos: object = None) -> str:
        if value <= 0.0:
            return ""
        lead = int(round(value / 10.0 ** np.floor(np.log10(value) + 1e-12)))
        keep = (2, 3, 5) if span < 100.0 else (2, 5) if span < 1e4 else ()
        return plain_number(value) if lead in keep else ""

    axis.set_major_formatter(FuncFormatter(plain_number))
    axis.set_minor_formatter(FuncFormatter(minor))
