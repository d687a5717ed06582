"""Several voids in one scenario: construction, bad input, and ``[[void]]`` scenario files."""

from __future__ import annotations

import pytest

import pdvoid
from pdvoid.inputs.multi_void import multi_void_from_dict, numeric_parameters, parameter_value

INS = pdvoid.Insulation(thickness=6e-3, permittivity=4.0)
SUPPLY = pdvoid.Sine(rms=18e3)
SMALL = pdvoid.Void(diameter=0.8e-3, height=1e-3)
LARGE = pdvoid.Void(diameter=2e-3, height=1e-3, gas="nitrogen", pressure=80e3)


def two_voids() -> pdvoid.MultiVoidScenario:
    return pdvoid.MultiVoidScenario(insulation=INS, voids=(SMALL, LARGE), supply=SUPPLY, name="two")


def test_each_void_is_its_own_one_void_scenario():
    m = two_voids()
    assert m.count == 2
    # the one-void scenarios hold exactly the shared parts and each void (the definition of the class)
    for i, v in enumerate((SMALL, LARGE)):
        sc = m.scenario(i)
        assert sc.void == v and sc.insulation == INS and sc.supply == SUPPLY and sc.model == m.model
    assert m.scenarios == (m.scenario(0), m.scenario(1))


def test_from_scenario_keeps_the_shared_parts():
    sc = pdvoid.Scenario(insulation=INS, void=SMALL, supply=SUPPLY, name="one")
    m = pdvoid.MultiVoidScenario.from_scenario(sc)
    assert m.voids == (SMALL,) and m.scenario(0) == sc  # one void: the very scenario it came from
    m2 = pdvoid.MultiVoidScenario.from_scenario(sc, [SMALL, LARGE])
    assert m2.voids == (SMALL, LARGE) and m2.name == "one"


@pytest.mark.parametrize("voids, words", [
    ((), "1 to"),
    (SMALL, "sequence"),
    ((SMALL, "big"), "voids[1]"),
    ((SMALL, pdvoid.Void(diameter=1e-3, height=7e-3)), "voids[1]: void.height"),
])
def test_bad_voids_are_refused_naming_the_void(voids, words):
    with pytest.raises(pdvoid.InputError, match=words.replace("[", r"\[").replace("]", r"\]")):
        pdvoid.MultiVoidScenario(insulation=INS, voids=voids, supply=SUPPLY)


def test_replace_names_each_void_by_index():
    m = two_voids().replace(**{"voids[1].diameter": 3e-3, "supply.rms": 20e3})
    assert m.voids[1].diameter == 3e-3 and m.voids[0] == SMALL and m.supply.rms == 20e3
    with pytest.raises(pdvoid.InputError, match="only 2 voids"):
        two_voids().replace(**{"voids[2].diameter": 1e-3})
    with pytest.raises(pdvoid.InputError, match="name the void"):
        two_voids().replace(**{"void.diameter": 1e-3})
    with pytest.raises(pdvoid.InputError, match="no field"):
        two_voids().replace(**{"voids[0].radius": 1e-3})


def test_numeric_parameters_and_values():
    m = two_voids()
    names = numeric_parameters(m)
    assert {"voids[0].diameter", "voids[1].pressure", "insulation.thickness", "model.residual_ratio"} <= names
    assert not any(n.startswith("void.") for n in names)
    assert parameter_value(m, "voids[1].pressure") == 80e3
    assert parameter_value(m.scenario(0), "void.diameter") == 0.8e-3


def test_file_round_trip_is_exact(tmp_path):
    m = two_voids()
    path = m.to_file(tmp_path / "two.toml")
    text = path.read_text()
    assert text.count("[[void]]") == 2  # an array of tables, one per void (the documented layout)
    assert pdvoid.MultiVoidScenario.from_file(path) == m


def test_a_one_void_file_reads_as_one_void(tmp_path):
    sc = pdvoid.Scenario(insulation=INS, void=SMALL, supply=SUPPLY, name="one")
    path = sc.to_file(tmp_path / "one.toml")
    before = path.read_bytes()
    m = pdvoid.MultiVoidScenario.from_file(path)
    assert m.voids == (SMALL,) and m.scenario(0) == sc
    assert path.read_bytes() == before  # reading changes nothing, and one-void files are written as before
    assert "[[void]]" not in before.decode() and "[void]" in before.decode()


def test_a_several_void_file_read_as_one_scenario_says_what_to_do(tmp_path):
    path = two_voids().to_file(tmp_path / "two.toml")
    with pytest.raises(pdvoid.InputError, match="MultiVoidScenario.from_file"):
        pdvoid.Scenario.from_file(path)


BASE = {"insulation": {"thickness": "6 mm", "permittivity": 4.0}, "supply": {"rms": "18 kV"}}


@pytest.mark.parametrize("void, words", [
    ([], "non-empty"),
    ("x", "table or a non-empty array"),
    ([{"diameter": "1 mm", "height": "1 mm"}, 3], "void 2: each"),
    ([{"diameter": "1 mm", "height": "1 mm"}, {"diameter": "1 mm"}], "void 2: missing key void.height"),
    ([{"diameter": "1 mm", "height": "1 mm"}, {"diameter": "1 kg", "height": "1 mm"}], "void 2"),
    ([{"diameter": "1 mm", "height": "1 mm", "colour": "red"}], "unknown key void.colour"),
])
def test_bad_void_tables_are_refused_naming_the_void(void, words):
    with pytest.raises(pdvoid.InputError, match=words):
        multi_void_from_dict({**BASE, "void": void}, source="f.toml")


def test_missing_void_is_refused():
    with pytest.raises(pdvoid.InputError, match="missing"):
        multi_void_from_dict(BASE, source="f.toml")


def test_malformed_toml_names_the_file(tmp_path):
    p = tmp_path / "bad.toml"
    p.write_text("[[void]\n")
    with pytest.raises(pdvoid.InputError, match="bad.toml"):
        pdvoid.MultiVoidScenario.from_file(p)
