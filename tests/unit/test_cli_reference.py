"""``pdvoid materials`` and ``pdvoid cite``: every value with its status and source, the references of a run."""

from __future__ import annotations

import json
import re

import pytest

import pdvoid
from pdvoid.core.references import REFERENCES
from pdvoid.faces.cli.command import main
from pdvoid.inputs.demo import demo_scenario_path
from pdvoid.inputs.materials import STATUSES, get_gas, get_material, list_gases, list_materials


def _strict(name):
    raise ValueError(f"not strict JSON: {name}")


def test_materials_json_lists_every_material_and_gas_with_status_and_source(capsys):
    assert main(["materials", "--json"]) == 0
    rows = json.loads(capsys.readouterr().out, parse_constant=_strict)["rows"]
    names = {(r["kind"], r["name"]) for r in rows}
    assert names == {("material", n) for n in list_materials()} | {("gas", n) for n in list_gases()}
    assert all(r["status"] in STATUSES and r["source"].strip() and r["unit"] for r in rows)
    for name in list_materials():
        eps = next(r for r in rows if r["name"] == name and r["quantity"] == "relative permittivity")
        assert eps["value"] == get_material(name).permittivity and eps["unit"] == "-"
    # PMMA: 450 V/mil in the CRC handbook table the file cites; 1 mil = 25.4 um exactly, so 17.72 kV/mm
    pmma = next(r for r in rows if r["name"] == "pmma" and r["quantity"].startswith("dielectric strength"))
    assert pmma["unit"] == "kV/mm" and pmma["value"] == pytest.approx(450 / 25.4, rel=2e-3)
    air_k = next(r for r in rows if r["name"] == "air" and r["quantity"] == "k streamer")
    assert air_k["value"] == get_gas("air").k_streamer


def test_materials_text_and_kind(capsys):
    assert main(["materials"]) == 0
    text = capsys.readouterr().out
    for name in list_materials() + list_gases():
        assert f"\n{name} (" in text
    assert "from memory" in text and "source:" in text and "kV/mm" in text and "nan" not in text
    assert text.rstrip().endswith("licensed practice prevail.")  # the safety note closes the report
    assert main(["materials", "--kind", "gases", "--json"]) == 0
    rows = json.loads(capsys.readouterr().out)["rows"]
    assert rows and {r["kind"] for r in rows} == {"gas"}


def test_materials_refuses_an_unknown_kind(capsys):
    with pytest.raises(SystemExit) as stop:
        main(["materials", "--kind", "metals"])
    assert stop.value.code == 2 and "invalid choice: 'metals'" in capsys.readouterr().err


def test_cite_a_scenario_gives_the_references_its_run_records(capsys):
    assert main(["cite", str(demo_scenario_path()), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out, parse_constant=_strict)
    run = pdvoid.simulate(pdvoid.Scenario.from_file(demo_scenario_path()), 20, 0)  # what the run itself records
    assert [e["key"] for e in doc["references"]] == list(dict.fromkeys(run.references))
    assert all(e["citation"] == REFERENCES[e["key"]].citation for e in doc["references"])
    assert main(["cite", str(demo_scenario_path())]) == 0
    text = capsys.readouterr().out
    assert text.count("\n[") == len(doc["references"])


def test_cite_without_a_scenario_gives_the_whole_bibliography(capsys):
    assert main(["cite"]) == 0
    text = capsys.readouterr().out
    assert text.startswith(f"the whole bibliography of pdvoid, {len(REFERENCES)} references")
    assert all(f"[{k}]" in text for k in REFERENCES)


def test_cite_bibtex_like_records_are_balanced(capsys):
    assert main(["cite", str(demo_scenario_path()), "--format", "bibtex"]) == 0
    text = capsys.readouterr().out
    keys = re.findall(r"^@misc\{([^,]+),$", text, flags=re.MULTILINE)
    assert keys == list(dict.fromkeys(pdvoid.simulate(pdvoid.Scenario.from_file(demo_scenario_path()), 20, 0)
                                      .references))
    unescaped = re.sub(r"\\[{}]", "", text)
    assert unescaped.count("{") == unescaped.count("}")  # every record and field closed


def test_cite_a_missing_scenario_exits_2(tmp_path, capsys):
    assert main(["cite", str(tmp_path / "none.toml")]) == 2
    err = capsys.readouterr().err
    assert err.startswith("pdvoid: error:") and "none.toml" in err
