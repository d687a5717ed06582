"""Level-set shapes: inside/outside, exact volumes, crossing points."""

from __future__ import annotations

import math

import numpy as np
import pytest

from pdvoid import InputError
from pdvoid.coefficients.fields import Hyperboloid, Outline, Rod, RoundedCylinder, Slab, Spheroid
from pdvoid.coefficients.fields.geometry import crossing


def test_spheroid_inside_and_volume():
    s = Spheroid(2.0, 1.0, 5.0)
    assert s.contains(np.array(0.9), np.array(5.0))
    assert not s.contains(np.array(1.1), np.array(5.0))
    assert s.contains(np.array(0.0), np.array(5.45))
    assert not s.contains(np.array(0.0), np.array(5.55))
    # spheroid volume (4/3) pi a^2 c, textbook
    assert s.volume() == pytest.approx(4.0 / 3.0 * math.pi * 1.0 * 0.5)


def test_rounded_cylinder_limits():
    # rim radius = half height = half diameter: a sphere (volume 4/3 pi R^3, textbook)
    assert RoundedCylinder(2.0, 2.0, 0.0, 1.0).volume() == pytest.approx(4.0 / 3.0 * math.pi)
    # vanishing rim radius: the plain cylinder pi R^2 H
    assert RoundedCylinder(2.0, 0.5, 0.0, 1e-9).volume() == pytest.approx(math.pi * 0.5, rel=1e-8)
    c = RoundedCylinder(4.0, 1.0, 0.0, 0.5)
    assert c.contains(np.array(1.9), np.array(0.0))
    assert not c.contains(np.array(1.95), np.array(0.45))  # cut away by the rounded rim
    with pytest.raises(InputError):
        RoundedCylinder(4.0, 1.0, 0.0, 0.6)


def test_rounded_cylinder_volume_by_quadrature():
    # Pappus volume vs a direct midpoint quadrature of the level set (common practice)
    c = RoundedCylinder(3.0, 1.0, 0.0, 0.3)
    r = (np.arange(1500) + 0.5) / 1000.0
    z = (np.arange(1000) + 0.5) / 1000.0 - 0.5
    R, Z = np.meshgrid(r, z, indexing="ij")
    vol = np.sum(c.contains(R, Z) * 2 * np.pi * R) * 1e-6
    assert vol == pytest.approx(c.volume(), rel=2e-3)


def test_rod_and_hyperboloid():
    rod = Rod(0.1, 1.0, upward=True)
    assert rod.contains(np.array(0.0), np.array(1.05))
    assert rod.contains(np.array(0.09), np.array(5.0))
    assert not rod.contains(np.array(0.0), np.array(0.95))
    down = Rod(0.1, 1.0, upward=False)
    assert down.contains(np.array(0.0), np.array(0.95))
    assert not down.contains(np.array(0.0), np.array(1.05))
    h = Hyperboloid(0.5, 2.0)
    # apex at z = d and radius of curvature r: points on the axis above the apex are inside
    assert h.contains(np.array(0.0), np.array(2.01))
    assert not h.contains(np.array(0.0), np.array(1.99))
    # osculating circle at the apex: a point at angle 0.1 rad on it lies on the outline to O(angle^4)
    t = 0.1
    pr, pz = 0.5 * math.sin(t), 2.0 + 0.5 * (1 - math.cos(t))
    assert abs(h.level(np.array(pr), np.array(pz))) < 1e-4


def test_slab_and_outline():
    s = Slab(1.0, 2.0)
    assert s.contains(np.array(100.0), np.array(1.5))
    assert not s.contains(np.array(0.0), np.array(2.5))
    sq = Outline([0.0, 1.0, 1.0, 0.0], [0.0, 0.0, 2.0, 2.0])
    # Pappus: rectangle [0,1] x [0,2] revolved = cylinder pi 1^2 2
    assert sq.volume() == pytest.approx(2.0 * math.pi)
    assert sq.contains(np.array(0.5), np.array(1.0))
    assert not sq.contains(np.array(1.5), np.array(1.0))
    assert sq.level(np.array(1.5), np.array(1.0)) == pytest.approx(0.5)
    with pytest.raises(InputError):
        Outline([0.0, -1.0, 1.0], [0.0, 1.0, 2.0])
    with pytest.raises(InputError):
        Outline([0.0, 1.0, 2.0], [0.0, 0.0, 0.0])


def test_crossing_is_accurate():
    s = Spheroid(2.0, 2.0, 0.0)
    t = crossing(s, np.array([0.0, 0.5]), np.array([0.0, 0.0]), np.array([2.0, 0.5]), np.array([0.0, 2.0]))
    np.testing.assert_allclose(t, [0.5, math.sqrt(1 - 0.25) / 2.0], atol=1e-12)


@pytest.mark.parametrize(
    "make",
    [
        lambda: Spheroid(0.0, 1.0, 0.0),
        lambda: Spheroid(1.0, -1.0, 0.0),
        lambda: Spheroid(1.0, 1.0, float("nan")),
        lambda: Rod(0.0, 1.0),
        lambda: Hyperboloid(1.0, 0.0),
        lambda: Slab(2.0, 1.0),
    ],
)
def test_bad_shapes(make):
    with pytest.raises(InputError):
        make()
