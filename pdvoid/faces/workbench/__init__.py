"""The pdvoid workbench: an ipywidgets panel to move void size, gas pressure, host permittivity, supply and
model parameters and see the void field, the phase-resolved pattern, the pulse sequence and the summary
numbers change; compare with a measured pattern; export figures, scenario and result.

``pdvoid.faces.workbench.open_workbench()`` displays it in a notebook (``pip install "pdvoid[workbench]"``).
:class:`WorkbenchSession` is the same logic without widgets (control values → scenario → run → summary).
Importing this package imports neither ipywidgets nor matplotlib; both are loaded when a panel is built or
drawn.
"""

from __future__ import annotations

from pdvoid.faces.workbench.app import Workbench, open_workbench
from pdvoid.faces.workbench.controls import CUSTOM_MATERIAL, SPECS, Controls
from pdvoid.faces.workbench.optional import WorkbenchDependencyError
from pdvoid.faces.workbench.session import Outcome, WorkbenchSession, summary_numbers

__all__ = [
    "Workbench",
    "open_workbench",
    "WorkbenchSession",
    "Controls",
    "Outcome",
    "summary_numbers",
    "SPECS",
    "CUSTOM_MATERIAL",
    "WorkbenchDependencyError",
]
