"""Unit tests of pdvoid.inputs.materials and the built-in parameter sets (materials.toml, gases.toml)."""

from __future__ import annotations

import dataclasses
import tomllib
from importlib import resources

import pytest

from pdvoid import InputError
from pdvoid.core.references import REFERENCES
from pdvoid.inputs.materials import (
    STATUSES,
    GasData,
    Material,
    get_gas,
    get_material,
    list_gases,
    list_materials,
    load_gases,
    load_materials,
)

# Ranges of physics brief §11 (relative permittivity near power frequency), with their markers there.
BRIEF_RANGES = {
    "epoxy_cast": (3.5, 4.0),  # [C] 3.6 thelen.us
    "epoxy_silica_filled": (3.8, 6.0),  # [M] 3.8-4.5, up to ~6
    "polyethylene": (2.25, 2.5),  # [C] 2.27-2.5 thelen.us; 2.3 chungbuk
    "xlpe": (2.2, 2.5),  # [M]
    "ptfe": (2.0, 2.1),  # [C]
    "polyimide": (3.4, 3.4),  # [M] data sheet 3.4 at 1 kHz
    "silicone_rubber": (2.9, 3.5),  # [M] unfilled
    "pressboard_oil": (3.5, 4.5),  # [M]
    "epoxy_mica": (4.0, 5.0),  # [M]
    "glass_borosilicate": (4.3, 5.0),  # [C] Pyrex thelen.us
    "polycarbonate": (2.9, 3.0),  # [C] thelen.us
    "pmma": (2.6, 3.6),  # [C]/[M] 2.6 (GHz) - 3.6 (60 Hz)
}


def test_all_brief_materials_present_and_in_range():
    # Source: physics brief §11 table (values and ranges as marked above).
    assert set(list_materials()) == set(BRIEF_RANGES)
    for name, (lo, hi) in BRIEF_RANGES.items():
        m = get_material(name)
        assert isinstance(m, Material)
        assert lo <= m.permittivity <= hi, name
        assert m.name == name


def test_every_material_has_source_and_status():
    # Source: project rules (every value with its source and a status).
    for name in list_materials():
        m = get_material(name)
        assert m.source.strip() and m.description.strip()
        assert m.status in STATUSES
        if m.permittivity_range is not None:
            assert m.permittivity_range[0] <= m.permittivity <= m.permittivity_range[1]


def test_gases_present_with_provenance():
    # Source: project rules; physics brief §3.1, §6, §7, §11.
    assert list_gases() == ["air", "nitrogen", "sf6"]
    for name in list_gases():
        g = get_gas(name)
        assert isinstance(g, GasData)
        for field in ("permittivity", "critical_reduced_field", "b_constant", "exponent"):
            assert g.provenance[field].status in STATUSES
            assert g.provenance[field].source.strip()
        for key in g.references:
            assert key in REFERENCES, key
        assert 1.0 <= g.permittivity < 1.01


def test_gas_values():
    # Source: physics brief §3.1 (air 24.2, 8.6, 1/2 from memory; SF6 88.6, n = 1, B 4.278 derived), §7 (K).
    air, sf6, n2 = get_gas("air"), get_gas("sf6"), get_gas("nitrogen")
    assert (air.critical_reduced_field, air.b_constant, air.exponent) == (24.2, 8.6, 0.5)
    assert (sf6.critical_reduced_field, sf6.b_constant, sf6.exponent) == (88.6, 4.278, 1.0)
    assert air.k_streamer == 9.15 and sf6.k_streamer == 10.5 and n2.k_streamer is None
    assert air.ionization_model == "morrow_lowke_air" and sf6.ionization_model == "sf6_linear"
    assert n2.ionization_model is None
    assert sf6.paschen_a is None
    # Source: physics brief §11: air 1.000585 (thelen.us), N2 ~1.00055, SF6 ~1.002 (from memory)
    assert air.permittivity == 1.000585 and n2.permittivity == 1.00055 and sf6.permittivity == 1.002
    # Source: physics brief §6: N2 breakdown 30.4 kV at 1 cm, 101.3 kPa (confirmed), against the streamer formula's
    # own air value at 1 cm and 1 atm, 31.145 kV (derived; the empirical curve's 30.29 kV gave 24.3 and 31.27 kV)
    assert n2.critical_reduced_field == pytest.approx(24.2 * 30.4 / 31.1454, rel=1e-5)
    # Source: hvc_paschen (confirmed) 327 V at 7.5 um, 1 atm; naidu2013 (from memory) N2 251 V at 0.67 Torr cm
    assert air.paschen_minimum_voltage == 327.0 and air.paschen_minimum_pd == pytest.approx(7.5e-6 * 101325.0)
    assert n2.paschen_minimum_voltage == 251.0 and n2.paschen_minimum_pd == pytest.approx(0.67 * 1.33322368, rel=1e-5)
    assert sf6.paschen_minimum_voltage is None


def test_builtin_files_only_use_valid_statuses():
    # Source: project rules; reads the raw TOML so nothing the loader drops can hide.
    root = resources.files("pdvoid.inputs.parameter_sets")
    gases = tomllib.loads((root / "gases.toml").read_text(encoding="utf-8"))
    for name, entry in gases.items():
        if name == "schema":
            continue
        for value in entry.values():
            if isinstance(value, dict):
                assert value["status"] in STATUSES


def test_frozen():
    # Source: project rules (frozen dataclasses).
    with pytest.raises(dataclasses.FrozenInstanceError):
        get_material("xlpe").permittivity = 3.0  # type: ignore[misc]
    with pytest.raises(dataclasses.FrozenInstanceError):
        get_gas("air").exponent = 1.0  # type: ignore[misc]


def test_unknown_names_list_known_ones():
    # Source: project rules.
    with pytest.raises(InputError, match="known: air, nitrogen, sf6"):
        get_gas("argon")
    with pytest.raises(InputError, match="epoxy_cast"):
        get_material("granite")
    with pytest.raises(InputError, match="unknown material"):
        get_material(3.6)  # type: ignore[arg-type]


# ------------------------------------------------------------------------------------------ user files
MATERIAL_OK = """
schema = "pdvoid.materials/1"
[my_resin]
description = "in-house casting resin"
permittivity = 3.9
permittivity_range = [3.7, 4.1]
source = "our dielectric spectroscopy, 50 Hz, 2025"
status = "confirmed"
"""

GAS_OK = """
[dry_nitrogen]
description = "bottled N2"
references = ["nitrogen_breakdown_tf"]
notes = "user set"
permittivity = {value = 1.00055, unit = "1", status = "from memory", source = "brief"}
critical_reduced_field = {value = 24.3, unit = "V/(Pa m)", status = "derived", source = "scaled from air"}
b_constant = {value = 8.6, unit = "(Pa m)^n", status = "from memory", source = "air"}
exponent = {value = 0.5, unit = "1", status = "from memory", source = "air"}
paschen_a = {value = 9.0, unit = "1/(Pa m)", status = "from memory", source = "raizer1991"}
paschen_b = {value = 256.5, unit = "V/(Pa m)", status = "from memory", source = "raizer1991"}
secondary_emission = {value = 0.01, unit = "1", status = "common practice", source = "as air"}
"""


def test_user_material_round_trip(tmp_path):
    # Source: the file written here (round trip).
    path = tmp_path / "mats.toml"
    path.write_text(MATERIAL_OK, encoding="utf-8")
    mats = load_materials(path)
    m = mats["my_resin"]
    assert (m.permittivity, m.permittivity_range, m.status) == (3.9, (3.7, 4.1), "confirmed")
    assert get_material("my_resin", path=path) == m
    with pytest.raises(InputError, match="known: my_resin"):
        get_material("xlpe", path=path)


def test_user_gas_round_trip(tmp_path):
    # Source: the file written here (round trip).
    path = tmp_path / "gas.toml"
    path.write_text(GAS_OK, encoding="utf-8")
    g = get_gas("dry_nitrogen", path=str(path))
    assert (g.critical_reduced_field, g.paschen_a, g.secondary_emission) == (24.3, 9.0, 0.01)
    assert g.provenance["critical_reduced_field"].status == "derived"
    assert g.ionization_model is None and g.k_streamer is None


def test_builtin_files_reload_identically():
    # Source: the built-in files read through the public user-file loaders give the same objects.
    root = resources.files("pdvoid.inputs.parameter_sets")
    with resources.as_file(root / "materials.toml") as p:
        assert load_materials(p) == {n: get_material(n) for n in list_materials()}
    with resources.as_file(root / "gases.toml") as p:
        assert load_gases(p) == {n: get_gas(n) for n in list_gases()}


@pytest.mark.parametrize("edit, match", [
    (("permittivity = 3.9", "permittivity = 0.9"), r"\[my_resin.permittivity\].*\[1, 10000\]"),
    (("permittivity = 3.9", "permittivity = -2"), r"my_resin.permittivity"),
    (("permittivity = 3.9", "permittivity = \"3.9\""), r"my_resin.permittivity.*number"),
    (("permittivity = 3.9", "permittivity = nan"), r"my_resin.permittivity"),
    (("permittivity = 3.9", "permitivity = 3.9"), r"\[my_resin.permitivity\]: unknown key"),
    (("status = \"confirmed\"", "status = \"measured\""), r"my_resin.status.*confirmed"),
    (("status = \"confirmed\"", ""), r"\[my_resin\]: missing key 'status'"),
    (("source = \"our dielectric spectroscopy, 50 Hz, 2025\"", "source = \"  \""), r"my_resin.source"),
    (("[3.7, 4.1]", "[4.0, 4.1]"), r"my_resin.permittivity_range.*contain"),
    (("[3.7, 4.1]", "[3.7]"), r"my_resin.permittivity_range"),
    (("[my_resin]", "[My-Resin]"), r"snake_case"),
    (("schema = \"pdvoid.materials/1\"", "schema = \"pdvoid.gases/1\""), r"\[schema\]"),
    (("schema = \"pdvoid.materials/1\"", "schema = \"pdvoid.materials/1\"\ncolour = \"red\""), r"\[colour\]"),
    (("permittivity = 3.9", "permittivity = 3.9\npermittivity = 4.0"), r"not valid TOML"),
])
def test_malformed_material_file_names_file_and_key(tmp_path, edit, match):
    # Source: project rules (InputError naming file, key and problem; reject eps_r < 1, unknown keys).
    path = tmp_path / "bad_materials.toml"
    path.write_text(MATERIAL_OK.replace(*edit), encoding="utf-8")
    with pytest.raises(InputError, match=match) as info:
        load_materials(path)
    assert "bad_materials.toml" in str(info.value)


@pytest.mark.parametrize("edit, match", [
    (('unit = "V/(Pa m)"', 'unit = "kV/(cm bar)"'), r"dry_nitrogen.critical_reduced_field.unit.*SI"),
    (("value = 0.5, unit", "value = 1.5, unit"), r"dry_nitrogen.exponent.value.*\(0, 1\]"),
    (("value = 1.00055", "value = 0.99"), r"dry_nitrogen.permittivity.value"),
    (("value = 0.01", "value = 0.0"), r"dry_nitrogen.secondary_emission.value"),
    (('status = "derived"', 'status = "guessed"'), r"dry_nitrogen.critical_reduced_field.status"),
    (('source = "scaled from air"', 'sauce = "x"'), r"dry_nitrogen.critical_reduced_field.sauce\]: unknown"),
    (("exponent = {", "exponentt = {"), r"\[dry_nitrogen.exponentt\]: unknown key"),
    (('references = ["nitrogen_breakdown_tf"]', 'references = "x"'), r"dry_nitrogen.references"),
    (('description = "bottled N2"', ""), r"missing key 'description'"),
    (('paschen_a = {value = 9.0, unit = "1/(Pa m)", status = "from memory", source = "raizer1991"}', ""),
     r"go together"),
    (('notes = "user set"', 'ionization_model = "townsend"'), r"ionization_model.*morrow_lowke_air"),
    (('notes = "user set"', 'ionization_model = "sf6_linear"'), r"needs k_streamer"),
    (('exponent = {value = 0.5, unit = "1", status = "from memory", source = "air"}', "exponent = 0.5"),
     r"dry_nitrogen.exponent\]: must be a table"),
])
def test_malformed_gas_file_names_file_and_key(tmp_path, edit, match):
    # Source: project rules (InputError naming file, key and problem; wrong units refused, not converted).
    path = tmp_path / "bad_gases.toml"
    text = GAS_OK.replace(*edit)
    assert text != GAS_OK
    path.write_text(text, encoding="utf-8")
    with pytest.raises(InputError, match=match) as info:
        load_gases(path)
    assert "bad_gases.toml" in str(info.value)


def test_file_problems(tmp_path):
    # Source: project rules (missing file, > 1 MB, not UTF-8, empty).
    with pytest.raises(InputError, match="not found"):
        load_materials(tmp_path / "missing.toml")
    with pytest.raises(InputError, match="not found"):
        load_gases(tmp_path)
    big = tmp_path / "big.toml"
    big.write_text(MATERIAL_OK + "#" * 1_000_001, encoding="utf-8")
    with pytest.raises(InputError, match="big.toml.*byte limit"):
        load_materials(big)
    latin = tmp_path / "latin.toml"
    latin.write_bytes(MATERIAL_OK.replace("in-house", "hausgemacht \xe9").encode("latin-1"))
    with pytest.raises(InputError, match="latin.toml.*UTF-8"):
        load_materials(latin)
    empty = tmp_path / "empty.toml"
    empty.write_text('schema = "pdvoid.materials/1"\n', encoding="utf-8")
    with pytest.raises(InputError, match="no entries"):
        load_materials(empty)
    with pytest.raises(InputError, match="path"):
        load_materials(42)  # type: ignore[arg-type]


def test_user_gas_paschen_minimum_needs_its_pair_and_the_paschen_constants(tmp_path):
    # Source: gases.toml schema: paschen_minimum_voltage and paschen_minimum_pd go together, with A, B, gamma.
    path = tmp_path / "gas.toml"
    v = 'paschen_minimum_voltage = {value = 251.0, unit = "V", status = "from memory", source = "naidu2013"}\n'
    pd = 'paschen_minimum_pd = {value = 0.893, unit = "Pa m", status = "from memory", source = "naidu2013"}\n'
    path.write_text(GAS_OK + v + pd, encoding="utf-8")
    g = get_gas("dry_nitrogen", path=str(path))
    assert (g.paschen_minimum_voltage, g.paschen_minimum_pd) == (251.0, 0.893)
    path.write_text(GAS_OK + v, encoding="utf-8")
    with pytest.raises(InputError, match="paschen_minimum_voltage and paschen_minimum_pd go together"):
        get_gas("dry_nitrogen", path=str(path))
    no_paschen = "\n".join(x for x in GAS_OK.splitlines() if not x.startswith(("paschen_", "secondary_")))
    path.write_text(no_paschen + "\n" + v + pd, encoding="utf-8")
    with pytest.raises(InputError, match="need paschen_a"):
        get_gas("dry_nitrogen", path=str(path))


def test_constant_spread_is_read_and_checked(tmp_path):
    # physics brief 3.1 (from memory): (E/p)_cr of air is quoted as 24.2 and as 25.2 V/(Pa m)
    air = get_gas("air").provenance["critical_reduced_field"]
    assert air.spread == (24.2, 25.2)
    assert get_gas("nitrogen").provenance["critical_reduced_field"].spread is None  # derived, no spread
    path = tmp_path / "gas.toml"
    old = 'critical_reduced_field = {value = 24.3, unit = "V/(Pa m)", status = "derived", source = "scaled from air"}'
    for spread, match in (("[24.0, 25.0]", None), ("[24.5, 25.0]", "must contain"), ("[24.0]", r"\[low, high\]")):
        path.write_text(GAS_OK.replace(old, old[:-1] + f", spread = {spread}}}"), encoding="utf-8")
        if match is None:
            assert load_gases(path)["dry_nitrogen"].provenance["critical_reduced_field"].spread == (24.0, 25.0)
        else:
            with pytest.raises(InputError, match=match):
                load_gases(path)
