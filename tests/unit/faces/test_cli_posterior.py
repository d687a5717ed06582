"""``pdvoid fit --method posterior``: credible intervals and the predictive check in plain words, from an events
file or a count-matrix file (synthetic data, labelled so)."""

import json

import numpy as np
import pytest

from pdvoid.analysis.synthetic import synthetic_measurement
from pdvoid.faces.cli.command import main
from pdvoid.inputs.demo import demo_scenario, demo_scenario_path
from pdvoid.io.event_writer import write_events
from pdvoid.io.matrix import matrix_from_events, write_pattern_matrix

pytestmark = pytest.mark.filterwarnings("ignore::pdvoid.core.validity.ValidityWarning")

SETTINGS = ["--scenario", str(demo_scenario_path()), "--method", "posterior", "--vary", "void.diameter=1mm:2.5mm",
            "--threshold", "10pC", "--noise", "2pC", "--relative-noise", "0.03", "--phase-resolution", "1deg",
            "--replicates", "14", "--steps", "16", "--seed", "3"]


@pytest.fixture(scope="module")
def data():
    return synthetic_measurement(demo_scenario(), 100, 31337, hidden={"void.diameter": 1.8e-3}, threshold=10e-12,
                                 noise=2e-12, relative_noise=0.03, phase_resolution_deg=1.0)


def test_posterior_from_an_events_file_prints_intervals_and_the_check(tmp_path, capsys, data):
    path = write_events(data, tmp_path / "measured.csv")
    assert main(["fit", str(path), *SETTINGS]) == 0
    out = capsys.readouterr().out
    assert "90 % credible interval" in out and "void.diameter" in out
    assert "predictive check: consistent" in out
    assert "the fitted void can produce this pattern" in out


def test_posterior_from_a_matrix_file_as_json(tmp_path, capsys, data):
    m = matrix_from_events(data, np.linspace(0.0, 360.0, 37),
                           np.concatenate([-np.geomspace(1e-8, 1e-12, 21), np.geomspace(1e-12, 1e-8, 21)]))
    path = write_pattern_matrix(m, tmp_path / "matrix.csv")
    assert main(["fit", str(path), "--matrix", *SETTINGS, "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["measured kind"] == "count matrix"
    lo, hi = doc["credible intervals 90 %"]["void.diameter"]
    assert lo < 1.8e-3 < hi
    assert doc["predictive check"]["verdict"] in ("consistent", "doubtful fit", "poor fit")
    assert doc["priors"] == {"void.diameter": "uniform"}


def test_search_options_are_refused_with_the_posterior(tmp_path, capsys, data):
    path = write_events(data, tmp_path / "measured.csv")
    assert main(["fit", str(path), *SETTINGS, "--popsize", "8"]) == 2
    assert "popsize" in capsys.readouterr().err
    assert main(["fit", str(path), *SETTINGS[:2], "--vary", "void.diameter=1mm:2.5mm", "--matrix"]) == 2
    assert "--matrix" in capsys.readouterr().err
