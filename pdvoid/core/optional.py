"""The one door for optional dependencies (sweeps, workbench): import them by name, or say which extra to
install."""

from __future__ import annotations

import importlib
from types import ModuleType

__all__ = ["MissingDependencyError", "require", "available"]

# module -> the pip extra of pdvoid that brings it
_EXTRA = {
    "xarray": "sweep",
    "dask": "sweep",
    "distributed": "sweep",
    "tqdm": "sweep",
    "tqdm.auto": "sweep",
    "joblib": "sweep",
    "ipywidgets": "workbench",
    "ipykernel": "workbench",
    "jupyterlab": "workbench",
}
_FEATURE = {"sweep": "parameter sweeps", "workbench": "the workbench"}


class MissingDependencyError(ImportError):
    """An optional package that this feature needs is not installed.

    A subclass of ImportError (not of InputError: the input was fine, the installation lacks a package), so
    ``except ImportError`` catches it. The message names the package and the extra to install.
    """


def require(module: str, *, feature: str | None = None) -> ModuleType:
    """Import ``module`` or raise :class:`MissingDependencyError` naming the extra, e.g. ``pdvoid[sweep]``.

    Parameters
    ----------
    module : str
        Dotted module name, e.g. ``"dask.distributed"``.
    feature : str or None, optional
        What needs it, for the message; default: the feature of the module's extra.

    Returns
    -------
    types.ModuleType
        The imported module.

    Raises
    ------
    MissingDependencyError
        (an ImportError) when the module cannot be imported; the message names the extra to install.
    """
    try:
        return importlib.import_module(module)
    except ImportError as exc:
        extra = _EXTRA.get(module, "all")
        feature = feature or _FEATURE.get(extra, "this feature")
        top = module.split(".")[0]
        raise MissingDependencyError(
            f"{feature}: needs the optional package {top!r}, which is not installed ({exc}); "
            f'install it with: pip install "pdvoid[{extra}]"'
        ) from exc


def available(module: str) -> bool:
    """True when ``module`` can be imported (it is imported to find out).

    Parameters
    ----------
    module : str
        Dotted module name.

    Returns
    -------
    bool
        Whether the import succeeded.
    """
    try:
        importlib.import_module(module)
    except ImportError:
        return False
    return True
