"""pdvoid: partial discharges in gas-filled voids in solid electrical insulation.

Results are engineering estimates. Test and acceptance levels come from the applicable standards; local codes and
licensed practice prevail. High voltage can kill.
"""

from __future__ import annotations

__version__ = "0.1.0"

from .analysis import (  # noqa: E402
    compare,
    design_margin,
    fingerprint,
    fit,
    iec60270,
    inception,
    largest_pd_free_void,
    margin_table,
    pattern,
    pulse_sequence,
    weibull_fit,
)
from .errors import InputError  # noqa: E402
from .events import Events  # noqa: E402
from .io import read_events  # noqa: E402
from .parameters import FieldModel, Insulation, NetworkModel, Periodic, Sine, Void
from .references import cite  # noqa: E402
from .results import Result, load  # noqa: E402
from .scenario import Scenario  # noqa: E402
from .simulate import simulate  # noqa: E402
from .sweeps import sweep  # noqa: E402

__all__ = [
    "InputError", "cite", "__version__", "Events", "Insulation", "Void", "Sine", "Periodic", "FieldModel",
    "NetworkModel", "Scenario", "simulate", "Result", "load", "pattern", "fingerprint", "iec60270", "inception",
    "largest_pd_free_void", "margin_table", "design_margin", "pulse_sequence", "weibull_fit", "sweep",
    "read_events", "fit", "compare",
]
