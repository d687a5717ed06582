"""pdvoid.Coaxial, Void.radial_position and coaxial scenario files: construction, round trips and bad input
(every refusal names the parameter, the value and what is allowed)."""

from __future__ import annotations

from importlib import resources

import pytest

import pdvoid
from pdvoid import InputError
from pdvoid.inputs.scenario import read_scenario, scenario_from_dict, write_scenario


def cable(**kw):
    args = {"inner_radius": 8e-3, "outer_radius": 13.5e-3, "permittivity": 2.3, **kw}
    return pdvoid.Coaxial(**args)


def void(r=10.5e-3, **kw):
    return pdvoid.Void(diameter=kw.pop("diameter", 1e-3), height=kw.pop("height", 1e-3), radial_position=r, **kw)


def test_wall_thickness_is_derived_and_material_sets_permittivity():
    c = pdvoid.Coaxial(inner_radius=8e-3, outer_radius=13.5e-3, material="xlpe")
    assert c.thickness == 13.5e-3 - 8e-3
    assert c.permittivity == 2.3  # materials.toml [xlpe] (physics brief §11: XLPE 2.3, from memory)
    assert isinstance(c, pdvoid.Insulation)


@pytest.mark.parametrize(("kw", "words"), [
    ({"inner_radius": 13.5e-3}, r"insulation.inner_radius must be smaller than insulation.outer_radius \(0.0135 m\); "
                                r"got 0.0135 m"),
    ({"inner_radius": 20e-3}, r"insulation.inner_radius must be smaller .*got 0.02 m"),
    ({"inner_radius": -1e-3}, r"insulation.inner_radius must lie in \[1e-05, 5\] m; got -0.001"),
    ({"outer_radius": 0.0}, r"insulation.outer_radius must lie in \[1e-05, 5\] m; got 0.0"),
    ({"inner_radius": "8 mm"}, r"insulation.inner_radius"),
    ({"area": 1e-2}, r"insulation.area does not apply to a coaxial insulation .*; got 0.01"),
    ({"permittivity": 0.5}, r"insulation.permittivity must lie in \[1, 100\]"),
    ({"inner_radius": 0.5, "outer_radius": 2.0}, r"insulation.thickness must lie in"),
])
def test_bad_cable_is_refused(kw, words):
    with pytest.raises(InputError, match=words):
        cable(**kw)


def test_radii_are_keyword_only():
    with pytest.raises(TypeError):
        pdvoid.Coaxial(8e-3, 13.5e-3)  # the radii must be named


def test_void_placement_is_checked():
    sup = pdvoid.Sine(rms=20e3)
    pdvoid.Scenario(cable(), void(), sup)  # fits
    with pytest.raises(InputError, match=r"void.radial_position must keep the void \(height 0.001 m\) inside the "
                                         r"insulation between r_i = 0.008 m and R = 0.0135 m, i.e. lie in "
                                         r"\(0.0085, 0.013\) m; got 0.0132 m"):
        pdvoid.Scenario(cable(), void(13.2e-3), sup)
    with pytest.raises(InputError, match=r"lie in \(0.0085, 0.013\) m; got 0.008"):
        pdvoid.Scenario(cable(), void(8e-3), sup)
    with pytest.raises(InputError, match=r"void.radial_position must lie in \(0, 5\] m; got -0.01"):
        void(-10e-3)
    with pytest.raises(InputError, match="void.radial_position .* is required for a coaxial insulation"):
        pdvoid.Scenario(cable(), pdvoid.Void(diameter=1e-3, height=1e-3), sup)
    with pytest.raises(InputError, match="void.radial_position applies only to a coaxial insulation"):
        pdvoid.Scenario(pdvoid.Insulation(thickness=6e-3, permittivity=4.0), void(), sup)
    with pytest.raises(InputError, match="void.position must be 'centred' in a coaxial insulation"):
        pdvoid.Scenario(cable(), void(position="ground_electrode"), sup)


def test_derived_thickness_cannot_be_replaced():
    sc = pdvoid.Scenario(cable(), void(), pdvoid.Sine(rms=20e3))
    with pytest.raises(InputError, match="'insulation.thickness' is derived in a Coaxial"):
        sc.replace(**{"insulation.thickness": 6e-3})
    assert sc.replace(**{"insulation.outer_radius": 14e-3}).insulation.thickness == 14e-3 - 8e-3


def test_example_cable_file_reads_and_round_trips(tmp_path):
    path = resources.files("pdvoid.inputs") / "examples" / "cable.toml"
    sc = read_scenario(path)
    assert isinstance(sc.insulation, pdvoid.Coaxial)
    # the values the file states (cable.toml)
    assert (sc.insulation.inner_radius, sc.insulation.outer_radius) == (8e-3, 13.5e-3)
    assert sc.void.radial_position == 10.5e-3
    out = write_scenario(sc, tmp_path / "again.toml")
    assert "kind = \"coaxial\"" in out.read_text() and "thickness" not in out.read_text()
    assert read_scenario(out) == sc


def test_plane_slab_files_are_written_as_before(tmp_path):
    # a plane slab gets no insulation.kind key, so files written before the coaxial geometry stay identical
    sc = pdvoid.Scenario(pdvoid.Insulation(thickness=6e-3, permittivity=4.0), pdvoid.Void(1e-3, 1e-3),
                         pdvoid.Sine(rms=10e3))
    text = write_scenario(sc, tmp_path / "slab.toml").read_text()
    assert "kind = \"slab\"" not in text and "radial_position" not in text


BASE = {"insulation": {"kind": "coaxial", "inner_radius": "8 mm", "outer_radius": "13.5 mm", "material": "xlpe"},
        "void": {"diameter": "1 mm", "height": "1 mm", "radial_position": "10.5 mm"},
        "supply": {"rms": "20 kV"}}


@pytest.mark.parametrize(("part", "key", "value", "words"), [
    ("insulation", "kind", "cable", r"insulation.kind must be one of 'slab', 'coaxial'; got 'cable'"),
    ("insulation", "outer_radius", "7 mm", r"insulation.inner_radius must be smaller than "
                                          r"insulation.outer_radius \(0.007 m\); got 0.008 m"),
    ("insulation", "thickness", "5 mm", r"unknown key insulation.thickness; allowed: conductivity, "
                                        r"dielectric_strength, inner_radius, material, outer_radius, permittivity"),
    ("insulation", "inner_radius", "8 kV", r"insulation.inner_radius"),
    ("void", "radial_position", "14 mm", r"void.radial_position must keep the void .* got 0.014 m"),
    ("void", "radial_position", "-1 mm", r"void.radial_position must lie in \(0, 5\] m; got -0.001"),
])
def test_bad_scenario_files_are_refused(part, key, value, words):
    data = {k: dict(v) for k, v in BASE.items()}
    data[part][key] = value
    with pytest.raises(InputError, match=words):
        scenario_from_dict(data, source="cable.toml")


def test_missing_radius_is_named():
    data = {k: dict(v) for k, v in BASE.items()}
    del data["insulation"]["outer_radius"]
    with pytest.raises(InputError, match="missing key insulation.outer_radius"):
        scenario_from_dict(data, source="cable.toml")
