"""Read-only arrays for pdvoid's immutable result objects."""

from __future__ import annotations

import numpy as np

__all__ = ["frozen_array"]


def frozen_array(a, dtype: type = float) -> np.ndarray:
    """A contiguous copy-if-needed of ``a`` as ``dtype`` with the write flag cleared."""
    a = np.ascontiguousarray(a, dtype=dtype)
    a.setflags(write=False)
    return a
