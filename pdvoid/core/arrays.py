"""Read-only arrays for pdvoid's immutable result objects."""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

__all__ = ["frozen_array"]


def frozen_array(a: npt.ArrayLike, dtype: type = float) -> np.ndarray:
    """A contiguous copy-if-needed of ``a`` as ``dtype`` with the write flag cleared.

    Parameters
    ----------
    a : array_like
        The values.
    dtype : type, optional
        Element type of the result.

    Returns
    -------
    numpy.ndarray
        A read-only contiguous array (a copy unless ``a`` already had the layout and type).
    """
    out: np.ndarray = np.ascontiguousarray(a, dtype=dtype)
    out.setflags(write=False)
    return out
