"""Scenario files (TOML with units) and result files (NPZ + JSON) round-trip exactly; bad files are named."""

from __future__ import annotations

import math

import numpy as np
import pytest

import pdvoid
from pdvoid.inputs.scenario import read_scenario


def test_scenario_round_trip_is_exact(tmp_path, demo):
    sc = demo.replace(**{"supply.harmonics": ((3, 0.05, 10.0),), "model.charge_decay_time": 0.1})
    p = tmp_path / "s.toml"
    sc.to_file(p)
    assert pdvoid.Scenario.from_file(p) == sc
    inf = sc.replace(**{"model.charge_decay_time": math.inf})
    inf.to_file(p)
    assert pdvoid.Scenario.from_file(p) == inf


def test_periodic_and_network_scenarios_round_trip(tmp_path):
    sc = pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=3e-3, permittivity=2.3, area=1e-2),
        void=pdvoid.Void(diameter=2e-3, height=0.2e-3, shape="cylinder", gas="sf6", pressure=2e5),
        supply=pdvoid.Periodic(samples=np.sin(2 * np.pi * np.arange(32) / 32) * 1e4, frequency=60.0),
        model=pdvoid.NetworkModel(capacitance_void=1e-13, capacitance_series=2e-14, lag_free=True),
    )
    p = tmp_path / "n.toml"
    sc.to_file(p)
    assert pdvoid.Scenario.from_file(p) == sc


def test_units_in_scenario_files(tmp_path):
    p = tmp_path / "u.toml"
    p.write_text(
        '[insulation]\nthickness = "0.6 cm"\npermittivity = 4\n'
        '[void]\ndiameter = "1200 um"\nheight = "1.2 mm"\npressure = "760 Torr"\ntemperature = "20 degC"\n'
        '[supply]\nrms = "12 kV"\nfrequency = "60 Hz"\n[model]\nsurface_decay_time = "5 ms"\n'
    )
    sc = read_scenario(p)
    assert sc.insulation.thickness == pytest.approx(6e-3)
    assert sc.void.diameter == pytest.approx(1.2e-3)
    assert sc.void.pressure == pytest.approx(101325.0)  # 760 Torr = 1 atm (definition of the torr)
    assert sc.void.temperature == pytest.approx(293.15)
    assert sc.supply.rms == 12e3 and sc.supply.frequency == 60.0
    assert sc.model.surface_decay_time == pytest.approx(5e-3)


@pytest.mark.parametrize(
    "text, match",
    [
        ("[insulation\nthickness = 1", "malformed TOML"),
        ('[insulation]\nthickness = "6 kV"\npermittivity = 4\n[void]\ndiameter=1e-3\nheight=1e-3\n[supply]\nrms=1e4',
         "insulation.thickness"),
        ('[insulation]\nthickness = 6e-3\npermittivity = 4\n[void]\ndiameter=1e-3\nheight=1e-3\ncolour="red"\n'
         '[supply]\nrms=1e4', "void.colour"),
        ('[insulation]\nthickness = 6e-3\npermittivity = 4\n[void]\ndiameter=1e-3\nheight=1e-3\ngas="xenon"\n'
         '[supply]\nrms=1e4', "void.gas"),
        ('[insulation]\nthickness = 6e-3\npermittivity = 4\n[void]\ndiameter=1e-3\nheight=1e-3\n'
         '[supply]\nrms=1e4\nfrequency=0', "supply.frequency"),
        ('[insulation]\nthickness = 6e-3\npermittivity = 4\n[void]\ndiameter=1e-3\nheight=7e-3\n'
         '[supply]\nrms=1e4', "void.height"),
        ('[insulation]\nthickness = 6e-3\npermittivity = 4\n[void]\ndiameter=1e-3\nheight=1e-3\n'
         '[supply]\nrms=1e4\n[model]\nsurface_rate_same=-3', "surface_rate_same"),
        ('[insulation]\nthickness = 6e-3\npermittivity = 4\n[void]\ndiameter=1e-3\nheight=1e-3\n', "supply"),
    ],
)
def test_bad_scenario_files_name_the_problem(tmp_path, text, match):
    p = tmp_path / "bad.toml"
    p.write_text(text)
    with pytest.raises(pdvoid.InputError, match=match) as err:
        read_scenario(p)
    assert str(p) in str(err.value)


def test_missing_and_huge_files(tmp_path):
    with pytest.raises(pdvoid.InputError, match="cannot read"):
        read_scenario(tmp_path / "nope.toml")
    big = tmp_path / "big.toml"
    big.write_text("# " + "x" * 1_100_000)
    with pytest.raises(pdvoid.InputError, match="larger than"):
        read_scenario(big)


def test_result_round_trip_is_exact(tmp_path, demo):
    res = pdvoid.simulate(demo, cycles=200, seed=9)
    assert res.event_count > 100
    p = res.save(tmp_path / "r.npz")
    back = pdvoid.load(p)
    for name in ("time", "phase_deg", "cycle", "charge", "voltage", "field_before", "field_after"):
        assert np.array_equal(getattr(back, name), getattr(res, name))
    assert back.scenario == res.scenario and back.seed == 9 and back.version == pdvoid.__version__
    assert back.sum_charge_voltage == res.sum_charge_voltage and back.references == res.references
    hist = pdvoid.simulate(demo, cycles=100, seed=9, histogram=True)
    back = pdvoid.load(hist.save(tmp_path / "h.npz"))
    assert np.array_equal(back.histogram.counts, hist.histogram.counts)


def test_csv_has_units_in_headers(tmp_path, demo):
    res = pdvoid.simulate(demo, cycles=50, seed=2)
    p = res.to_csv(tmp_path / "e.csv")
    lines = [line for line in p.read_text().splitlines() if not line.startswith("#")]
    assert lines[0] == ("time [s],phase [deg],cycle [-],charge [C],voltage [V],field_before [V/m],"
                        "field_after [V/m]")
    n_comments = sum(1 for line in p.read_text().splitlines() if line.startswith("#"))
    data = np.loadtxt(p, delimiter=",", skiprows=n_comments + 1, ndmin=2)
    assert np.array_equal(data[:, 3], res.charge)


def test_loading_junk_raises_input_error(tmp_path):
    p = tmp_path / "junk.npz"
    p.write_bytes(b"not a zip file at all")
    with pytest.raises(pdvoid.InputError, match="junk.npz"):
        pdvoid.load(p)
    np.savez(tmp_path / "other.npz", a=np.arange(3))
    with pytest.raises(pdvoid.InputError, match="metadata"):
        pdvoid.load(tmp_path / "other.npz")


def test_electrode_void_and_solved_coefficients_round_trip(tmp_path, demo):
    sc = demo.replace(**{"void.position": "ground_electrode", "void.height": 0.7e-3, "void.field_enhancement": 1.3,
                         "void.charge_per_field": 1.5e-17, "model.cathode_emission_rate": 4e3})
    p = tmp_path / "e.toml"
    sc.to_file(p)
    assert pdvoid.Scenario.from_file(p) == sc
    with pytest.raises(pdvoid.InputError, match="together"):
        pdvoid.Void(diameter=1e-3, height=1e-3, field_enhancement=1.2)
    with pytest.raises(pdvoid.InputError, match="void.position"):
        pdvoid.Void(diameter=1e-3, height=1e-3, position="floating")
