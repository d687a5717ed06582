"""pdvoid: partial discharges in gas-filled voids in solid electrical insulation.

Results are engineering estimates. Test and acceptance levels come from the applicable standards; local codes and
licensed practice prevail. High voltage can kill.

The simulation core is imported at once; the analysis, measured-data, sweep and fit functions are loaded on first
use (PEP 562), so a plain simulation does not pay for scipy.stats, scipy.signal or xarray.
"""

from __future__ import annotations

import importlib

__version__ = "0.1.0"

from .errors import InputError  # noqa: E402
from .events import Events  # noqa: E402
from .parameters import FieldModel, Insulation, NetworkModel, Periodic, Sine, Void  # noqa: E402
from .references import cite  # noqa: E402
from .results import Result, load  # noqa: E402
from .scenario import Scenario  # noqa: E402
from .simulate import simulate  # noqa: E402

# public name -> module that defines it (loaded on first access)
_LAZY = {
    "pattern": "pdvoid.analysis.patterns",
    "fingerprint": "pdvoid.analysis.descriptors",
    "iec60270": "pdvoid.analysis.quantities",
    "inception": "pdvoid.analysis.inception",
    "largest_pd_free_void": "pdvoid.analysis.margins",
    "margin_table": "pdvoid.analysis.margins",
    "design_margin": "pdvoid.analysis.margins",
    "pulse_sequence": "pdvoid.analysis.sequence",
    "weibull_fit": "pdvoid.analysis.magnitudes",
    "compare": "pdvoid.analysis.compare",
    "fit": "pdvoid.analysis.fit",
    "read_events": "pdvoid.io",
    "sweep": "pdvoid.sweeps",
}

__all__ = [
    "InputError", "cite", "__version__", "Events", "Insulation", "Void", "Sine", "Periodic", "FieldModel",
    "NetworkModel", "Scenario", "simulate", "Result", "load", *_LAZY,
]


def __getattr__(name: str):
    module = _LAZY.get(name)
    if module is None:
        raise AttributeError(f"module 'pdvoid' has no attribute {name!r}")
    value = getattr(importlib.import_module(module), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(_LAZY))
