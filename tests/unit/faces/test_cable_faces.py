"""The review pack and the workbench session on the invented example cable (pdvoid/inputs/examples/cable.toml):
they run, and the numbers they show are the coaxial ones (hand values in
tests/unit/coefficients/test_coaxial_coefficients.py)."""

from __future__ import annotations

import math
from importlib import resources

import pytest

import pdvoid
from pdvoid.faces.report import design_review
from pdvoid.faces.workbench import WorkbenchSession
from pdvoid.inputs.scenario import read_scenario

# 1 mm air sphere at 10.5 mm in XLPE between 8 and 13.5 mm: U_inc = E_inc r ln(R/r_i)/(f sqrt 2), hand
U_HAND = 24.2 * 101325 * (1 + 8.6 / math.sqrt(101.325)) * 10.5e-3 * math.log(13.5 / 8) / (6.9 / 5.6 * math.sqrt(2))


@pytest.fixture(scope="module")
def cable():
    return read_scenario(resources.files("pdvoid.inputs") / "examples" / "cable.toml")


def test_review_pack_of_a_cable(cable, tmp_path):
    pack = design_review(cable, test_voltage=20.8e3, service_voltage=12e3, cycles=50, seed=1,
                         out=tmp_path / "cable.pdf")
    assert pack.path.read_bytes()[:5] == b"%PDF-"
    assert pack.estimate.inception_voltage == pytest.approx(U_HAND, rel=1e-9)
    assert pack.verdict == "discharges expected"  # 20.8 kV > 14.3 kV
    # the assumptions page says where the void sits: in the cable's insulation (8 and 13.5 mm radii, 10.5 mm from
    # the axis, as the example file sets them), not in a plane slab
    page = next(t for t in pack.page_texts if t.startswith("Assumptions and validity limits"))
    flat = " ".join(page.split())
    assert "in the coaxial insulation of a cable (conductor radius 8 mm, screen radius 13.5 mm)" in flat
    assert "10.5 mm from the axis" in flat and "plane slab" not in flat


def test_workbench_session_keeps_the_cable(cable):
    session = WorkbenchSession(cable, cycles=20)
    assert session.scenario() == cable  # the panel's values give the scenario back unchanged
    session.set(thickness_mm=6.0)  # the wall thickness control moves the outer radius, keeps the inner one
    moved = session.scenario().insulation
    assert isinstance(moved, pdvoid.Coaxial)
    assert (moved.inner_radius, moved.outer_radius) == (8e-3, pytest.approx(14e-3, rel=1e-12))
    assert session.run().ok
