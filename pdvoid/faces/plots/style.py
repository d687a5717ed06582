"""The house style of pdvoid's plots: white background, perceptual colours, units on every axis.

No global matplotlib state is touched: figures are built with :class:`matplotlib.figure.Figure` (never pyplot)
and every style choice is set on the artists themselves, so a user's rcParams and open pyplot figures are left
alone.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from typing import Any

import matplotlib as mpl
import numpy as np
from matplotlib.artist import Artist
from matplotlib.axes import Axes
from matplotlib.axis import Axis
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
    "attach",
    "attached",
    "TWIN",
    "MESH",
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

#: attribute of an Axes that holds its twin voltage axis (set by the pattern and field plots)
TWIN = "pdvoid_twin"
#: attribute of a pattern's Axes that holds its QuadMesh
MESH = "pdvoid_mesh"


def new_figure(figsize: tuple[float, float] = FIGSIZE, **kwargs: Any) -> Figure:
    """A white figure with constrained layout, not registered with pyplot.

    Parameters
    ----------
    figsize : tuple of float
        Width and height [in].
    **kwargs
        Further arguments of :class:`matplotlib.figure.Figure`.

    Returns
    -------
    matplotlib.figure.Figure
        The new figure.
    """
    fig = Figure(figsize=figsize, layout="constrained", facecolor="white", **kwargs)
    return fig


def new_axes(ax: Axes | None, figsize: tuple[float, float] = FIGSIZE) -> Axes:
    """``ax`` itself, or the axes of a new white figure with constrained layout when ``ax`` is None.

    Parameters
    ----------
    ax : matplotlib.axes.Axes or None
        Axes to draw into; None creates a figure.
    figsize : tuple of float
        Size of the new figure [in].

    Returns
    -------
    matplotlib.axes.Axes
        ``ax``, or the Axes of the new figure.

    Raises
    ------
    InputError
        When ``ax`` is neither None nor a matplotlib Axes.
    """
    if ax is None:
        return new_figure(figsize).add_subplot()
    if not isinstance(ax, Axes):
        raise InputError(f"ax must be a matplotlib Axes or None; got {type(ax).__name__}")
    return ax


def finish_axes(ax: Axes, *, grid: bool = True) -> Axes:
    """Apply the house style to ``ax``: white face, light grid behind the data, no top/right frame.

    Parameters
    ----------
    ax : matplotlib.axes.Axes
        The Axes to style.
    grid : bool
        Draw the light grid [-].

    Returns
    -------
    matplotlib.axes.Axes
        ``ax``.
    """
    ax.set_facecolor("white")
    if grid:
        ax.grid(True, color=GRID, linewidth=0.6, zorder=0)
        ax.set_axisbelow(True)
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)
    ax.tick_params(labelsize=9)
    ax.xaxis.label.set_fontsize(10)
    ax.yaxis.label.set_fontsize(10)
    return ax


def check_axes(axes: Iterable[Axes], count: int, name: str = "axes") -> list[Axes]:
    """``count`` matplotlib Axes from a sequence.

    Parameters
    ----------
    axes : iterable of matplotlib.axes.Axes
        The Axes given by the caller.
    count : int
        How many are needed [-].
    name : str
        The parameter's name, for the error message [-].

    Returns
    -------
    list of matplotlib.axes.Axes
        The Axes, in order.

    Raises
    ------
    InputError
        When ``axes`` is not a sequence of ``count`` Axes.
    """
    try:
        items = list(axes)
    except TypeError:
        raise InputError(
            f"{name} must be a sequence of {count} matplotlib Axes; got {type(axes).__name__}"
        ) from None
    if len(items) != count or not all(isinstance(a, Axes) for a in items):
        raise InputError(f"{name} must be a sequence of {count} matplotlib Axes; got {len(items)} items")
    return items


def display_factor(unit: str) -> float:
    """SI value per display unit, e.g. 1e3 for "kV" and 1e-12 for "pC".

    Parameters
    ----------
    unit : str
        A key of :data:`pdvoid.core.units.UNITS` [-].

    Returns
    -------
    float
        SI value of one display unit [SI unit per display unit].

    Raises
    ------
    InputError
        For a unit that is not in the table.
    """
    if not isinstance(unit, str) or unit not in UNITS:
        raise InputError(
            f"unit must be one of pdvoid.core.units.UNITS ({', '.join(u for u in UNITS if u)}); got {unit!r}"
        )
    factor = UNITS[unit][1]
    if not math.isfinite(factor) or factor <= 0.0:  # pragma: no cover - the table holds positive factors
        raise InputError(f"unit {unit!r} has no usable factor")
    return factor


def colour_cycle(n: int) -> list[tuple[float, float, float, float]]:
    """``n`` distinguishable colours from the perceptual map viridis.

    The colours run from dark to green; the pale yellow end is left out so that every line stays readable on
    white.

    Parameters
    ----------
    n : int
        Number of colours [-]; 1 or less gives one colour.

    Returns
    -------
    list of tuple of float
        RGBA colours, each component 0 ... 1 [-].
    """
    cmap = mpl.colormaps[PATTERN_CMAP]
    if n <= 1:
        return [cmap(0.2)]
    return [cmap(x) for x in np.linspace(0.0, 0.72, n)]


def plain_number(value: float, _pos: int | None = None) -> str:
    """A tick label without powers of ten: 0.002, 50, 1000 (a true minus sign).

    Parameters
    ----------
    value : float
        The tick value [display unit].
    _pos : int, optional
        The tick position matplotlib passes to a formatter (unused) [-].

    Returns
    -------
    str
        The label.
    """
    return f"{value:g}".replace("-", "\u2212")


def plain_log_ticks(axis: Axis, low: float, high: float) -> None:
    """Plain-number tick labels on a logarithmic axis whose data span ``low`` ... ``high`` (> 0).

    Within one decade the ticks are evenly spaced; over wider spans the labels read 0.2, 0.5, 1, 2, 5 ...
    (never powers of ten).

    Parameters
    ----------
    axis : matplotlib.axis.Axis
        The axis to label (``ax.xaxis`` or ``ax.yaxis``).
    low, high : float
        Smallest and largest data value on the axis [display unit].
    """
    span = high / low if low > 0.0 else np.inf
    if span < 10.0:
        axis.set_major_locator(MaxNLocator(7))
        axis.set_minor_locator(NullLocator())
        axis.set_major_formatter(FuncFormatter(plain_number))
        return

    def minor(value: float, _pos: int | None = None) -> str:
        if value <= 0.0:
            return ""
        lead = int(round(value / 10.0 ** np.floor(np.log10(value) + 1e-12)))
        keep = (2, 3, 5) if span < 100.0 else (2, 5) if span < 1e4 else ()
        return plain_number(value) if lead in keep else ""

    axis.set_major_formatter(FuncFormatter(plain_number))
    axis.set_minor_formatter(FuncFormatter(minor))


def attach(ax: Axes, name: str, artist: Artist) -> None:
    """Keep ``artist`` on ``ax`` as the attribute ``name`` (:data:`TWIN` or :data:`MESH`), for callers that
    want to restyle it.

    Parameters
    ----------
    ax : matplotlib.axes.Axes
        The Axes that carries the artist.
    name : str
        The attribute name, :data:`TWIN` or :data:`MESH` [-].
    artist : matplotlib.artist.Artist
        The twin Axes or the mesh.
    """
    setattr(ax, name, artist)


def attached(ax: Axes, name: str) -> Any:
    """The artist :func:`attach` kept on ``ax`` as ``name``.

    Parameters
    ----------
    ax : matplotlib.axes.Axes
        The Axes that carries the artist.
    name : str
        The attribute name, :data:`TWIN` or :data:`MESH` [-].

    Returns
    -------
    Any
        The artist (a twin Axes for :data:`TWIN`, a QuadMesh for :data:`MESH`).

    Raises
    ------
    AttributeError
        When ``ax`` carries no such artist (it was not drawn by the plot that sets it).
    """
    return getattr(ax, name)
