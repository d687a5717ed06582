"""Graded grids: cell counts, breaks on faces, bounded growth, uniform spacing without focus."""

from __future__ import annotations

import numpy as np
import pytest

from pdvoid import InputError
from pdvoid.coefficients.fields import Grid, graded_faces, make_grid


def test_uniform_without_focus():
    # common practice: no focus interval means equal spacing
    f = graded_faces(2.0, cells=8)
    np.testing.assert_allclose(np.diff(f), 0.25, rtol=1e-9)


def test_exact_cell_count_and_ends():
    f = graded_faces(10.0, cells=137, focus=[(4.0, 5.0)], growth=1.1)
    assert f.size == 138
    assert f[0] == 0.0 and f[-1] == 10.0
    assert np.all(np.diff(f) > 0)


def test_fine_spacing_inside_focus_and_bounded_growth():
    f = graded_faces(10.0, fine=0.01, focus=[(4.0, 5.0)], growth=1.1, max_ratio=50.0)
    h = np.diff(f)
    mid = 0.5 * (f[1:] + f[:-1])
    inside = (mid > 4.05) & (mid < 4.95)
    np.testing.assert_allclose(h[inside], 0.01, rtol=0.02)
    ratio = h[1:] / h[:-1]
    assert ratio.max() < 1.1 * 1.05 and ratio.min() > 1 / (1.1 * 1.05)  # design growth, small slack
    assert h.max() <= 50.0 * 0.01 * 1.05


def test_breaks_are_faces():
    f = graded_faces(3.0, cells=40, breaks=[1.234, 2.5], focus=[(1.0, 1.5)])
    for b in (1.234, 2.5):
        assert np.min(np.abs(f - b)) < 1e-12


def test_grid_geometry():
    g = make_grid(2.0, 1.0, cells=(4, 5))
    assert g.shape == (4, 5)
    # sum of ring volumes is the cylinder volume pi R^2 d (exact geometry)
    assert g.volume.sum() == pytest.approx(np.pi * 4.0 * 1.0, rel=1e-12)
    assert g.ring_area.sum() == pytest.approx(np.pi * 4.0, rel=1e-12)


@pytest.mark.parametrize(
    "kwargs",
    [
        {"cells": 0},
        {"cells": 3.5},
        {"fine": -1.0},
        {"fine": 0.1, "cells": 10},
        {},
        {"cells": 10, "growth": 0.9},
        {"cells": 10, "focus": [(2.0, 1.0)]},
        {"cells": 10, "breaks": [5.0]},
        {"cells": 10, "focus": [(float("nan"), 1.0)]},
    ],
)
def test_bad_input(kwargs):
    with pytest.raises(InputError):
        graded_faces(1.0, **kwargs)


def test_bad_grid():
    with pytest.raises(InputError):
        Grid(np.array([0.0, 1.0, 0.5]), np.array([0.0, 1.0]))
    with pytest.raises(InputError):
        Grid(np.array([0.1, 1.0]), np.array([0.0, 1.0]))
    with pytest.raises(InputError):
        make_grid(1.0, 1.0)
    with pytest.raises(InputError):
        graded_faces(float("inf"), cells=4)
