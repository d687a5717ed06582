"""The one place that decides how pdvoid's kernels are compiled.

``njit_cached`` compiles with ``numba.njit(cache=True)``. When numba finds no writable cache location (a read-only
installation without ``NUMBA_CACHE_DIR``), ``cache=True`` makes the decoration fail with ``RuntimeError: cannot
cache function``; we then compile without a cache, so pdvoid still imports and runs (slower first call).
"""

from __future__ import annotations

import logging
from collections.abc import Callable
from typing import Any

import numba

__all__ = ["njit_cached"]

_log = logging.getLogger("pdvoid")


def njit_cached(func: Callable[..., Any] | None = None, **options: Any) -> Any:
    """``numba.njit(cache=True)`` with a fall-back to ``cache=False`` when no cache location is writable.

    Parameters
    ----------
    func : callable or None, optional
        The function to compile; None when used as ``@njit_cached(**options)``.
    **options : Any
        Further options of ``numba.njit``.

    Returns
    -------
    object
        The compiled dispatcher, or a decorator when ``func`` is None.
    """

    def wrap(f: Callable[..., Any]) -> Any:
        try:
            return numba.njit(cache=True, **options)(f)
        except RuntimeError as exc:  # numba: "cannot cache function ...: no locator available"
            if "cannot cache" not in str(exc):
                raise
            _log.info("numba cache unavailable for %s; compiling without cache (%s)", f.__name__, exc)
            return numba.njit(cache=False, **options)(f)

    return wrap if func is None else wrap(func)
