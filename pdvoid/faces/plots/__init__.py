"""Plots of pdvoid (matplotlib only): every function takes ``ax=None`` and returns the Axes it drew into.

Figures are built with :class:`matplotlib.figure.Figure` (never pyplot), white, with constrained layout,
perceptual colour maps and a unit in brackets on every axis label. Display a returned Axes' figure in a
notebook with ``ax.figure`` or save it with ``ax.figure.savefig(...)``.
"""

from __future__ import annotations

from pdvoid.faces.plots.compare import compare
from pdvoid.faces.plots.field import FieldTrace, field_time, void_field_trace
from pdvoid.faces.plots.margins import crossings, inception_chart, sensitivity_chart
from pdvoid.faces.plots.patterns import pattern_mesh, phase_pattern
from pdvoid.faces.plots.sequence import pulse_sequence_plot
from pdvoid.faces.plots.statistics import half_cycle, weibull_plot
from pdvoid.faces.plots.style import new_axes, new_figure
from pdvoid.faces.plots.sweeps import sweep_plot

__all__ = [
    "field_time",
    "void_field_trace",
    "FieldTrace",
    "phase_pattern",
    "pattern_mesh",
    "half_cycle",
    "weibull_plot",
    "pulse_sequence_plot",
    "inception_chart",
    "sensitivity_chart",
    "crossings",
    "compare",
    "sweep_plot",
    "new_figure",
    "new_axes",
]
