"""The workbench's optional dependencies, through pdvoid's one door (:mod:`pdvoid.core.optional`)."""

from __future__ import annotations

from types import ModuleType

from pdvoid.core.optional import MissingDependencyError
from pdvoid.core.optional import require as _require

__all__ = ["WorkbenchDependencyError", "require", "INSTALL_HINT"]

INSTALL_HINT = 'pip install "pdvoid[workbench]"'
WorkbenchDependencyError = MissingDependencyError


def require(module: str = "ipywidgets") -> ModuleType:
    """Import ``module`` for the workbench.

    Parameters
    ----------
    module : str
        The module's import name [-].

    Returns
    -------
    types.ModuleType
        The imported module.

    Raises
    ------
    MissingDependencyError
        When it is not installed; the message names ``pdvoid[workbench]``.
    """
    return _require(module, feature="the workbench")
