"""pdvoid: partial discharges in gas-filled voids in solid electrical insulation.

Results are engineering estimates. Test and acceptance levels come from the applicable standards; local codes and
licensed practice prevail. High voltage can kill.

The packages follow the data flow: :mod:`~pdvoid.core` → :mod:`~pdvoid.inputs` → :mod:`~pdvoid.physics` →
:mod:`~pdvoid.coefficients` → :mod:`~pdvoid.kernels` → :mod:`~pdvoid.models` → :mod:`~pdvoid.simulation` →
:mod:`~pdvoid.analysis`, :mod:`~pdvoid.io`, :mod:`~pdvoid.sweeps` → :mod:`~pdvoid.faces`.

The simulation core is imported at once; the analysis, measured-data, sweep and fit functions and the
:mod:`pdvoid.fields` solver are loaded on first use (PEP 562), so a plain simulation does not pay for
scipy.stats, scipy.signal or xarray.
"""

from __future__ import annotations

import importlib
from typing import Any

from pdvoid._version import __version__
from pdvoid.coefficients import Coefficients, compute_coefficients
from pdvoid.core.errors import InputError
from pdvoid.core.references import cite
from pdvoid.core.validity import ValidityWarning
from pdvoid.core.versions import show_versions
from pdvoid.inputs.coaxial import Coaxial
from pdvoid.inputs.measurement import Instrument, TestCircuit
from pdvoid.inputs.multi_void import MultiVoidScenario
from pdvoid.inputs.parameters import Insulation, Periodic, Sine, Void
from pdvoid.inputs.population import VoidPopulation
from pdvoid.inputs.scenario import Scenario
from pdvoid.inputs.supplies import DC, CosineRectangular, PiecewiseLinear, PolarityReversal, SquareWave
from pdvoid.models import FieldModel, MemoryModel, NetworkModel
from pdvoid.simulation.events import Events
from pdvoid.simulation.multi_void import MultiVoidResult, simulate_voids
from pdvoid.simulation.results import Result, load
from pdvoid.simulation.simulate import simulate

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
    "run_summary": "pdvoid.analysis.summary",
    "compare": "pdvoid.analysis.compare",
    "fit": "pdvoid.analysis.fitting",
    "void_count": "pdvoid.analysis.void_count",
    "acceptance_probability": "pdvoid.analysis.population",
    "read_events": "pdvoid.io",
    "read_pattern_matrix": "pdvoid.io",
    "sweep": "pdvoid.sweeps",
    "measure": "pdvoid.analysis.measured",
    "pulse_pair_reading": "pdvoid.analysis.measured",
    "pulse_resolution_time": "pdvoid.analysis.measured",
}
# public subpackages reachable as attributes after a plain ``import pdvoid``
_SUBPACKAGES = {
    "fields": "pdvoid.coefficients.fields",
    "plots": "pdvoid.faces.plots",
    "workbench": "pdvoid.faces.workbench",
    "analysis": "pdvoid.analysis",
    "io": "pdvoid.io",
    "sweeps": "pdvoid.sweeps",
}

__all__ = [
    "__version__", "InputError", "ValidityWarning", "cite", "show_versions", "Insulation", "Void", "Sine", "Periodic",
    "DC", "PolarityReversal", "PiecewiseLinear", "SquareWave", "CosineRectangular",
    "FieldModel", "MemoryModel", "NetworkModel", "Scenario", "Coefficients", "compute_coefficients", "Events",
    "simulate", "Result", "MultiVoidScenario", "simulate_voids", "MultiVoidResult", "VoidPopulation",
    "load", "Coaxial",
    "TestCircuit", "Instrument",
    *_LAZY,
]


def __getattr__(name: str) -> Any:
    """Import a subpackage or a lazily loaded name on first access (keeps ``import pdvoid`` light).

    Parameters
    ----------
    name : str
        The attribute asked for, e.g. ``"analysis"`` or a name of the lazily loaded public API.

    Returns
    -------
    object
        The module or object; it is cached in the package namespace.

    Raises
    ------
    AttributeError
        For a name pdvoid does not have.
    """
    if name in _SUBPACKAGES:
        value = importlib.import_module(_SUBPACKAGES[name])
    elif name in _LAZY:
        value = getattr(importlib.import_module(_LAZY[name]), name)
    else:
        raise AttributeError(f"module 'pdvoid' has no attribute {name!r}")
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    """The package's names, the lazily loaded ones included.

    Returns
    -------
    list of str
        Sorted names.
    """
    return sorted(set(globals()) | set(_LAZY) | set(_SUBPACKAGES))
