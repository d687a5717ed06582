"""A sweep's outcome drawn as one metric against one swept parameter (a NetCDF file of :mod:`pdvoid.sweeps`)."""

from __future__ import annotations

import itertools
from typing import Any

import numpy as np
from matplotlib.axes import Axes

from pdvoid.core.errors import InputError
from pdvoid.faces.plots.style import SEQUENTIAL_CMAP, colour_cycle, finish_axes, new_axes

__all__ = ["sweep_plot", "display_unit", "MAX_SWEEP_LINES"]

#: SI unit → (display unit, SI value per display unit): the people's units of the command line
_DISPLAY = {"C": ("pC", 1e-12), "V": ("kV", 1e3), "m": ("mm", 1e-3), "Pa": ("kPa", 1e3), "A": ("nA", 1e-9),
            "W": ("mW", 1e-3), "C^2/s": ("pC²/s", 1e-24), "1": ("-", 1.0), "": ("-", 1.0), "K": ("K", 1.0),
            "s": ("s", 1.0), "1/s": ("1/s", 1.0), "Hz": ("Hz", 1.0)}
#: most lines one plot draws (one per combination of the parameters not on the x axis)
MAX_SWEEP_LINES = 12


def display_unit(si_unit: str) -> tuple[str, float]:
    """The display unit of an SI unit as a sweep file writes it, and its factor.

    Parameters
    ----------
    si_unit : str
        The ``units`` attribute, e.g. ``"C"`` or ``"1"`` [-].

    Returns
    -------
    tuple of (str, float)
        (display unit, SI value per display unit), e.g. ``("pC", 1e-12)``; an unknown unit is kept as it is
        with factor 1.
    """
    return _DISPLAY.get(str(si_unit), (str(si_unit), 1.0))


def _label(name: str, attrs: dict[str, Any]) -> tuple[str, float]:
    unit, factor = display_unit(attrs.get("units", "1"))
    return f"{name} [{unit}]", factor


def _spread(values: np.ndarray) -> bool:
    good = values[np.isfinite(values)]
    return bool(good.size > 1 and np.all(good > 0) and good.max() / good.min() > 20.0)


def sweep_plot(ds: Any, metric: str = "discharges_per_cycle", parameter: str | None = None,
               ax: Axes | None = None) -> Axes:
    """One metric of a sweep against one swept parameter.

    A grid sweep draws a line per combination of the other parameters (at most :data:`MAX_SWEEP_LINES`); a
    random or Latin-hypercube sweep draws its points, coloured by a second parameter when there is one. Failed
    points (NaN) are left out and counted in the title. Axes are logarithmic when the values are positive and
    span more than a factor 20.

    Parameters
    ----------
    ds : xarray.Dataset
        A sweep dataset (:func:`pdvoid.sweeps.read_netcdf`) [-].
    metric : str
        The variable drawn on the y axis, e.g. ``"discharges_per_cycle"`` [-].
    parameter : str, optional
        The swept parameter on the x axis, e.g. ``"void.diameter"``; default the first one [-].
    ax : matplotlib.axes.Axes, optional
        Axes to draw into; None creates a figure [-].

    Returns
    -------
    matplotlib.axes.Axes
        The Axes drawn into.

    Raises
    ------
    InputError
        For a metric or parameter the dataset does not hold, or a grid with more than
        :data:`MAX_SWEEP_LINES` lines.
    """
    attrs = getattr(ds, "attrs", None)
    if not isinstance(attrs, dict) or "parameters" not in attrs or "design" not in attrs:
        raise InputError(f"ds must be a sweep dataset (pdvoid.sweeps.read_netcdf); got {type(ds).__name__}")
    names = [n for n in str(attrs["parameters"]).split(", ") if n]
    metrics = [str(v) for v in ds.data_vars if v not in ("seed", "error")]
    if metric not in metrics:
        raise InputError(f"metric {metric!r} is not in the sweep; choose one of {', '.join(metrics)}")
    parameter = names[0] if parameter is None else parameter
    if parameter not in names:
        raise InputError(f"parameter {parameter!r} was not swept; choose one of {', '.join(names)}")
    y_label, y_factor = _label(str(ds[metric].attrs.get("long_name", metric)), dict(ds[metric].attrs))
    x_label, x_factor = _label(parameter, dict(ds[parameter].attrs))
    ax = new_axes(ax)
    finish_axes(ax)
    y_all = np.asarray(ds[metric].values, dtype=float)
    failed = int(np.count_nonzero(~np.isfinite(y_all)))
    others = [n for n in names if n != parameter]
    if attrs["design"] == "grid":
        x = np.asarray(ds[parameter].values, dtype=float) / x_factor
        combos = list(itertools.product(*(range(ds.sizes[n]) for n in others)))
        if len(combos) > MAX_SWEEP_LINES:
            raise InputError(f"the grid holds {len(combos)} combinations of {', '.join(others)}: more than the "
                             f"{MAX_SWEEP_LINES} lines one plot can show; choose another parameter")
        colours = colour_cycle(len(combos))
        for colour, combo in zip(colours, combos, strict=True):
            sel = ds[metric].isel({n: i for n, i in zip(others, combo, strict=True)})
            y = np.asarray(sel.transpose(parameter).values, dtype=float) / y_factor
            words = []
            for n, i in zip(others, combo, strict=True):
                unit, factor = display_unit(ds[n].attrs.get("units", "1"))
                words.append(f"{n} = {float(ds[n].values[i]) / factor:g} {unit}")
            ax.plot(x, y, "o-", color=colour, lw=1.4, ms=4, label=", ".join(words) or None)
        if others:
            ax.legend(fontsize=8, frameon=False)
    else:
        x = np.asarray(ds[parameter].values, dtype=float) / x_factor
        y = y_all / y_factor
        if others:
            c_label, c_factor = _label(others[0], dict(ds[others[0]].attrs))
            c = np.asarray(ds[others[0]].values, dtype=float) / c_factor
            sc = ax.scatter(x, y, c=c, cmap=SEQUENTIAL_CMAP, s=18, zorder=3)
            ax.figure.colorbar(sc, ax=ax, label=c_label)
        else:
            ax.scatter(x, y, color=colour_cycle(1)[0], s=18, zorder=3)
    if _spread(np.asarray(ds[parameter].values, dtype=float)):
        ax.set_xscale("log")
    if _spread(y_all):
        ax.set_yscale("log")
    ax.set_xlabel(x_label)
    ax.set_ylabel(y_label)
    title = metric
    points = int(np.size(y_all))
    note = f"\n{failed} of the points have no value (failed, or undefined there) and are not drawn" if failed else ""
    ax.set_title(f"{title}: {attrs['design']} sweep of {points} points{note}", fontsize=9)
    return ax
