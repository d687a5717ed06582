"""A run summary for people: rows of (label with its display unit, value in that unit).

:func:`pdvoid.analysis.summary.run_summary` gives SI numbers; this module is the one place that turns them into
pC, nA and mW for the command line, the workbench and the report.
"""

from __future__ import annotations

from pdvoid.analysis.summary import RunSummary
from pdvoid.core.errors import InputError

__all__ = ["SUMMARY_ROWS", "summary_rows", "summary_dict"]

#: (label with display unit, RunSummary attribute, factor from SI to the display unit), in display order
SUMMARY_ROWS: tuple[tuple[str, str, float], ...] = (
    ("first discharge after [s]", "first_discharge_time", 1.0),
    ("discharges per cycle [-]", "discharges_per_cycle", 1.0),
    ("discharges per cycle from the first discharge on [-]", "discharges_per_cycle_after_first", 1.0),
    ("mean apparent charge [pC]", "mean_apparent_charge", 1e12),
    ("largest apparent charge [pC]", "largest_apparent_charge", 1e12),
    ("average discharge current I [nA]", "average_discharge_current", 1e9),
    ("quadratic rate D [pC²/s]", "quadratic_rate", 1e24),
    ("discharge power P [mW]", "discharge_power", 1e3),
    ("pulse repetition rate n [1/s]", "pulse_repetition_rate", 1.0),
    ("pulse repetition rate from the first discharge on [1/s]", "pulse_repetition_rate_after_first", 1.0),
)


def summary_rows(summary: RunSummary) -> list[tuple[str, float]]:
    """The summary as display rows.

    Parameters
    ----------
    summary : RunSummary
        The SI summary of a run.

    Returns
    -------
    list of (str, float)
        ``(label [display unit], value in the display unit)`` in :data:`SUMMARY_ROWS` order; NaN stays NaN
        (e.g. the largest charge of a run without event arrays).

    Raises
    ------
    InputError
        When ``summary`` is not a RunSummary.
    """
    if not isinstance(summary, RunSummary):
        raise InputError(f"summary must be a pdvoid.analysis.summary.RunSummary; got {type(summary).__name__}")
    return [(label, float(getattr(summary, name)) * factor) for label, name, factor in SUMMARY_ROWS]


def summary_dict(summary: RunSummary) -> dict[str, float]:
    """The display rows as ``{"label [unit]": value}`` (for tables and JSON documents with units in the keys).

    Parameters
    ----------
    summary : RunSummary
        The SI summary of a run.

    Returns
    -------
    dict of str to float
        The rows of :func:`summary_rows`.
    """
    return dict(summary_rows(summary))
