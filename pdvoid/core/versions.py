"""The versions of pdvoid, Python and the packages it uses, for bug reports."""

from __future__ import annotations

import platform
import sys
from importlib import metadata

from pdvoid._version import __version__

__all__ = ["show_versions", "versions"]

PACKAGES = ("numpy", "scipy", "numba", "llvmlite", "matplotlib", "pint", "tomli-w", "xarray", "dask",
            "distributed", "joblib", "tqdm", "ipywidgets", "jupyterlab", "netCDF4", "h5netcdf", "scipy")


def versions() -> dict[str, str]:
    """The versions of pdvoid, Python, the platform and every package pdvoid may use.

    Returns
    -------
    dict
        Name to version; ``"not installed"`` for an optional package that is absent.
    """
    out = {"pdvoid": __version__, "python": sys.version.split()[0], "platform": platform.platform()}
    for name in dict.fromkeys(PACKAGES):
        try:
            out[name] = metadata.version(name)
        except metadata.PackageNotFoundError:
            out[name] = "not installed"
    return out


def show_versions() -> None:
    """Print the versions of pdvoid, Python and the packages it uses (paste them into a bug report)."""
    rows = versions()
    width = max(map(len, rows))
    for name, version in rows.items():
        print(f"{name:<{width}}  {version}")
