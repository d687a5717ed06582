"""Point-plane gap: tip field against the hyperboloid approximation of high-voltage handbooks.

Sources (reference/fields_kuffel_2000/source.toml): Kuffel, Zaengl & Kuffel, High Voltage Engineering:
Fundamentals (2000), field chapter: E_max = 2U / (r ln(1 + 4d/r)) for a hyperboloid point opposite a plane
(Mason's approximation; formula and attribution from memory). The exact hyperboloid result (derived here) is
2U / (r η0 ln((1+η0)/(1−η0))), η0 = sqrt(d/(d+r)).
"""

from __future__ import annotations

import pytest

from pdvoid.coefficients.fields import (
    FieldSolver,
    Hyperboloid,
    Layout,
    Rod,
    grid_for,
    hyperboloid_tip_field,
    mason_tip_field,
    surface_field,
)

R_TIP = 0.1e-3  # tip radius [m]


def _tip_field(layout: Layout, resolution: float = 10) -> float:
    s = FieldSolver(layout, grid_for(layout, resolution=resolution))
    return surface_field(s.unit("high"), "high").maximum


@pytest.mark.parametrize("ratio", [10, 20])
def test_hyperboloid_point_against_mason(ratio):
    # Source: kuffel2000 (from memory), Mason's formula; exact hyperboloid (derived). The modelled electrode
    # is a true hyperboloid, truncated at 10 gaps height and 20 gaps radius (the truncation lowers the tip field
    # by about 1 %, measured). Tolerances: 2 % against the exact hyperboloid; 5 % against Mason's form, which
    # itself differs from the exact hyperboloid by 4.2 % (d/r = 10) and 2.2 % (d/r = 20).
    gap = ratio * R_TIP
    lay = Layout(10 * gap, 20 * gap, 1.0, conductors=((Hyperboloid(R_TIP, gap), "high"),))
    e = _tip_field(lay)
    assert e == pytest.approx(hyperboloid_tip_field(1.0, R_TIP, gap), rel=0.02)
    assert e == pytest.approx(mason_tip_field(1.0, R_TIP, gap), rel=0.05)


def test_needle_point_plane_against_mason():
    # Source: kuffel2000 (from memory). A cylindrical needle with a hemispherical tip is not a hyperboloid:
    # its slimmer body shields the tip less. For a needle as long as the gap (d/r = 10 and 20) the tip field
    # was 12.7-13 % above Mason's value on fine grids, so the handbook formula warrants 15 % here and must
    # underestimate, not overestimate. (A needle 9 gaps long is about 50-60 % above: not tested, reported.)
    for ratio in (10, 20):
        gap = ratio * R_TIP
        lay = Layout(2 * gap, 20 * gap, 1.0, conductors=((Rod(R_TIP, gap, upward=True), "high"),))
        e = _tip_field(lay)
        mason = mason_tip_field(1.0, R_TIP, gap)
        assert e == pytest.approx(mason, rel=0.15)
        assert e > mason


def test_longer_needle_has_higher_tip_field():
    # common practice (electrostatics): at fixed gap and voltage, a longer needle raises the tip field
    gap = 10 * R_TIP
    short = _tip_field(Layout(2 * gap, 20 * gap, 1.0, conductors=((Rod(R_TIP, gap), "high"),)))
    long_ = _tip_field(Layout(6 * gap, 20 * gap, 1.0, conductors=((Rod(R_TIP, gap), "high"),)))
    assert long_ > 1.1 * short
