"""The warning that the host's mean field approaches its own dielectric strength, and the sourced strengths."""

from __future__ import annotations

import dataclasses
import warnings

import pytest

import pdvoid
from pdvoid import InputError, Insulation, ValidityWarning
from pdvoid.analysis import largest_pd_free_void
from pdvoid.coefficients.limits import STRENGTH_FRACTION, host_strength, warn_host_strength
from pdvoid.inputs.materials import get_material, load_materials

V_PER_MIL = 1.0 / 25.4e-6  # 1 mil = 25.4 µm exactly (definition of the inch)


def test_strengths_against_their_sources():
    # shackelford2001, Table 296: cast acrylic sheet, general purpose type I, 450-530 V/mil (short time, ASTM D149)
    pmma = get_material("pmma")
    assert 450 * V_PER_MIL * 0.999 < pmma.dielectric_strength < 530 * V_PER_MIL
    assert pmma.dielectric_strength_provenance.status == "confirmed"
    assert "shackelford2001" in pmma.dielectric_strength_provenance.source
    # public dielectric table (radiopolyus.ru): polyethylene 40 kV/mm, PTFE 25 kV/mm
    assert get_material("polyethylene").dielectric_strength == pytest.approx(40e6)
    assert get_material("ptfe").dielectric_strength == pytest.approx(25e6)
    # every strength carries its unit, status and source
    for name in ("epoxy_cast", "epoxy_silica_filled", "xlpe", "polycarbonate"):
        prov = get_material(name).dielectric_strength_provenance
        assert prov.unit == "V/m" and prov.status == "from memory" and prov.source.strip()
    # a material without a tabulated strength is not checked
    assert get_material("polyimide").dielectric_strength is None
    assert host_strength(Insulation(thickness=1e-3, material="polyimide")) is None
    assert host_strength(Insulation(thickness=1e-3, permittivity=3.0)) is None


def test_threshold_and_message():
    ins = Insulation(thickness=2e-3, material="polyethylene")  # 40 kV/mm
    # 39.9 kV peak over 2 mm = 19.95 kV/mm, just below half of 40 kV/mm: no warning
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        assert warn_host_strength(ins, 0.998 * STRENGTH_FRACTION * 40e6 * 2e-3, "at the test level") is None
    with pytest.warns(ValidityWarning, match=r"50 % of its typical short-time dielectric strength 40 kV/mm"):
        msg = warn_host_strength(ins, 40e3, "at the test level")  # 20 kV/mm: exactly half
    assert msg.startswith("at the test level the mean field in the host is 20 kV/mm peak (40 kV over 2 mm)")
    assert "polyethylene, confirmed" in msg
    # the scenario's own value wins over the table
    own = Insulation(thickness=2e-3, material="polyethylene", dielectric_strength=100e6)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        assert warn_host_strength(own, 40e3, "x") is None
    with pytest.warns(ValidityWarning, match=r"given in the scenario"):
        warn_host_strength(own, 120e3, "x")
    # no finite positive voltage: nothing to check
    assert warn_host_strength(ins, float("inf"), "x") is None


@pytest.mark.parametrize("bad", [0.0, -1e6, 1e3, float("nan"), "20 kV/mm", True])
def test_insulation_strength_rejects_bad_input(bad):
    # project rules: InputError naming the parameter, no coercion of strings or booleans
    with pytest.raises(InputError, match="insulation.dielectric_strength"):
        Insulation(thickness=1e-3, permittivity=3.0, dielectric_strength=bad)


def test_tiny_void_incepts_above_the_host_strength(demo):
    # a 3 µm void in the demo slab (6 mm, silica-filled epoxy, 16.7 kV/mm from memory) needs about 1.65 MV rms
    # (Townsend regime): far beyond the host, and the warning says so
    void = dataclasses.replace(demo.void, diameter=3e-6, height=3e-6)
    sc = dataclasses.replace(demo, void=void)
    with pytest.warns(ValidityWarning) as record:
        c = pdvoid.compute_coefficients(sc)
    texts = [str(w.message) for w in record]
    host = [t for t in texts if t.startswith("at the inception voltage the mean field in the host")]
    assert len(host) == 1
    peak_field = c.inception_voltage * c.peak_factor / demo.insulation.thickness
    assert f"{peak_field / 1e6:.3g} kV/mm" in host[0]


def test_demo_at_its_voltages_is_not_flagged(demo):
    # the demo runs at 18 kV rms over 6 mm: 4.2 kV/mm peak, a quarter of 16.7 kV/mm
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        pdvoid.compute_coefficients(demo)
        pdvoid.simulate(demo, cycles=2, seed=1)


def test_simulate_and_margin_search_warn_at_their_voltage(demo):
    hot = dataclasses.replace(demo, supply=dataclasses.replace(demo.supply, rms=60e3))  # 14.1 kV/mm peak
    with pytest.warns(ValidityWarning, match=r"at the supply's peak the mean field in the host is 14.1 kV/mm"):
        pdvoid.simulate(hot, cycles=1, seed=1)
    with pytest.warns(ValidityWarning) as rec:  # the answer, a 17 µm void, is also near the Paschen minimum
        lv = largest_pd_free_void(demo, 60e3)
    assert any(str(w.message).startswith("at the test level the mean field in the host is 14.1 kV/mm") for w in rec)
    hosts = [n for n in lv.notes if "dielectric strength" in n]
    assert len(hosts) == 1 and hosts[0].startswith("at the test level")  # said once, not per candidate void
    assert sum("dielectric strength" in str(w.message) for w in rec) == 1


def test_material_file_strength_is_validated(tmp_path):
    base = ('schema = "pdvoid.materials/1"\n[my_resin]\ndescription = "x"\npermittivity = 3.9\nsource = "s"\n'
            'status = "confirmed"\n')
    good = tmp_path / "good.toml"
    good.write_text(base + 'dielectric_strength = {value = 2.2e7, unit = "V/m", status = "confirmed", '
                    'source = "our ramp test"}\n', encoding="utf-8")
    assert load_materials(good)["my_resin"].dielectric_strength == 2.2e7
    for entry, match in (('{value = 22, unit = "kV/mm", status = "confirmed", source = "s"}', "SI"),
                         ('{value = 1.0, unit = "V/m", status = "confirmed", source = "s"}', r"\[1e\+06"),
                         ('22e6', "must be a table")):
        bad = tmp_path / "bad.toml"
        bad.write_text(base + f"dielectric_strength = {entry}\n", encoding="utf-8")
        with pytest.raises(InputError, match=match):
            load_materials(bad)
