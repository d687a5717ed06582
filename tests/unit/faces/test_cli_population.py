"""The ``population`` command: the pass probability of a part with a population of voids."""

import json

import pytest

import pdvoid
from pdvoid.analysis.population import acceptance_probability
from pdvoid.faces.cli.command import main
from pdvoid.inputs.population import VoidPopulation

DESIGN = pdvoid.Scenario(
    insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
    void=pdvoid.Void(diameter=1e-3, height=1e-3),
    supply=pdvoid.Sine(rms=18e3),
    model=pdvoid.FieldModel(ionization_rate=1e9, surface_rate_same=1e4, surface_rate_reversed=3e3),
)


@pytest.fixture()
def design(tmp_path):
    return DESIGN.to_file(tmp_path / "design.toml")


def test_population_command_gives_the_library_numbers(design, tmp_path, capsys):
    sizes = tmp_path / "ct.txt"
    sizes.write_text("# synthetic CT scan sizes\n0.3 mm\n0.6 mm\n\n1.2 mm\n", encoding="utf-8")
    argv = ["population", str(design), "--level", "50pC", "--duration", "1s", "--voids-per-part", "2",
            "--diameters-file", str(sizes), "--parts", "40", "--seed", "4", "--json"]
    assert main(argv) == 0
    doc = json.loads(capsys.readouterr().out)
    # the same call through the library (the command adds nothing of its own to the numbers)
    ref = acceptance_probability(DESIGN, VoidPopulation(voids_per_part=2, diameters=(0.3e-3, 0.6e-3, 1.2e-3)),
                                 50e-12, 1.0, parts=40, seed=4)
    assert doc["pass probability"] == ref.probability and doc["interval"] == list(ref.interval)
    assert doc["cycles"] == 50 and doc["population"] == "sizes"


def test_population_command_text_with_a_lognormal_population(design, capsys):
    argv = ["population", str(design), "--level", "100pC", "--duration", "0.5s", "--voltage", "16kV",
            "--voids-per-part", "1", "--fixed-count", "--median", "0.5mm", "--sigma", "0.4", "--largest", "1.5mm",
            "--parts", "10"]
    assert main(argv) == 0
    out = capsys.readouterr().out
    assert "pass probability" in out and "16 kV" in out and "SAFETY" in out


@pytest.mark.parametrize("extra, words", [
    ([], "one way"),
    (["--diameters", "0.3mm", "--median", "1mm"], "one way"),
    (["--diameters", "0.3"], "no unit"),
    (["--sigma", "0.5", "--diameters", "0.3mm"], "log-normal"),
    (["--median", "0.5mm", "--sigma", "0.5"], "largest"),
    (["--diameters", "0.3mm", "--fixed-count"], "whole number"),
])
def test_population_command_refuses_bad_populations(design, capsys, extra, words):
    argv = ["population", str(design), "--level", "10pC", "--duration", "1s", "--voids-per-part", "1.5", *extra]
    assert main(argv) == 2
    assert words in capsys.readouterr().err


def test_a_bad_diameters_file_names_the_line(design, tmp_path, capsys):
    sizes = tmp_path / "ct.txt"
    sizes.write_text("0.3 mm\nlarge\n", encoding="utf-8")
    argv = ["population", str(design), "--level", "10pC", "--duration", "1s", "--voids-per-part", "1",
            "--diameters-file", str(sizes)]
    assert main(argv) == 2
    assert "line 2" in capsys.readouterr().err
    empty = tmp_path / "empty.txt"
    empty.write_text("# nothing\n", encoding="utf-8")
    argv[-1] = str(empty)
    assert main(argv) == 2
    assert "no void diameter" in capsys.readouterr().err
