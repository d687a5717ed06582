"""sweep(): labelled Dataset, units, failed points, reproducibility across backends, NetCDF round trip."""

from __future__ import annotations

import numpy as np
import pytest
import xarray as xr

import pdvoid
from pdvoid import InputError
from pdvoid.sweeps import base_scenario, read_netcdf, sweep, write_netcdf
from pdvoid.sweeps.plan import point_seeds

GRID = {"void.diameter": [0.8e-3, 1.5e-3], "void.height": [1.0e-3, 7.0e-3]}  # 7 mm > 6 mm wall: impossible


@pytest.fixture(scope="module")
def serial_grid():
    from pdvoid.inputs.demo import demo_scenario

    return sweep(demo_scenario(), GRID, cycles=200, seed=42, workers=1, progress=False)


def test_grid_layout_units_and_seeds(serial_grid):
    ds = serial_grid
    assert ds["discharges_per_cycle"].dims == ("void.diameter", "void.height")
    assert ds["void.diameter"].values.tolist() == GRID["void.diameter"]
    assert ds["void.diameter"].attrs["units"] == "m"
    units = {v: ds[v].attrs.get("units") for v in ds.data_vars}
    assert units["mean_apparent_charge"] == "C" and units["average_discharge_current"] == "A"
    assert units["quadratic_rate"] == "C^2/s" and units["discharge_power"] == "W"
    assert units["inception_voltage"] == "V" and units["discharges_per_cycle"] == "1"
    # point (i, j) of a grid is flat index i*2 + j (C order); its seed is spawn(4)[index] of the master seed
    assert ds["seed"].values.ravel().tolist() == point_seeds(42, 4).tolist()
    assert ds.attrs["design"] == "grid" and ds.attrs["seed"] == 42 and ds.attrs["cycles"] == 200


def test_failed_point_is_recorded_not_fatal(serial_grid):
    ds = serial_grid
    bad = ds.sel({"void.height": 7.0e-3})
    assert np.all(np.isnan(bad["discharges_per_cycle"].values))
    assert all("void.height" in str(e) for e in bad["error"].values)
    good = ds.sel({"void.height": 1.0e-3})
    assert np.all(np.isfinite(good["discharges_per_cycle"].values))
    assert all(str(e) == "" for e in good["error"].values)
    assert ds.attrs["failed_points"] == 2


def test_point_equals_a_direct_simulation(serial_grid, demo):
    # the sweep's promise: a point is simulate(scenario.replace(...), cycles, seed); its numbers are checked here
    # against the event arrays of that direct simulation, not against the summary the sweep itself uses
    ds = serial_grid
    point = ds.sel({"void.diameter": 1.5e-3, "void.height": 1.0e-3})
    result = pdvoid.simulate(
        demo.replace(**{"void.diameter": 1.5e-3, "void.height": 1.0e-3}), cycles=200, seed=int(point["seed"])
    )
    q = result.charge
    assert q.size > 200  # more than one discharge per cycle: the checks below compare real numbers
    # hand calculation: discharges / cycles; mean |q| per discharge; P = Σq·u / T with T = 200 cycles / 50 Hz
    # (IEC 60270 clause 3 definition, from memory)
    assert float(point["discharges_per_cycle"]) == pytest.approx(q.size / 200, rel=1e-15)
    assert float(point["mean_apparent_charge"]) == pytest.approx(np.mean(np.abs(q)), rel=1e-12)
    assert float(point["largest_apparent_charge"]) == float(np.max(np.abs(q)))
    assert float(point["discharge_power"]) == pytest.approx(np.sum(q * result.voltage) / (200 / 50.0), rel=1e-9)
    assert float(point["inception_voltage"]) == pdvoid.compute_coefficients(result.scenario).inception_voltage


def test_local_processes_give_identical_results(serial_grid, demo):
    ds = sweep(demo, GRID, cycles=200, seed=42, workers=2, progress=False)
    xr.testing.assert_identical(ds, serial_grid)


def test_lhs_sweep_has_a_point_dimension(demo):
    ds = sweep(
        demo,
        {"void.diameter": (0.8e-3, 2e-3), "void.pressure": (3e4, 1.2e5, "log")},
        cycles=50,
        seed=1,
        design="lhs",
        samples=3,
        workers=1,
        progress=False,
    )
    assert ds["discharges_per_cycle"].dims == ("point",)
    assert ds["void.pressure"].dims == ("point",) and ds["void.pressure"].attrs["units"] == "Pa"
    assert ds["void.pressure"].attrs["sampling"].startswith("log-uniform")
    assert ds.attrs["samples"] == 3 and ds["point"].values.tolist() == [0, 1, 2]


def _charge_sum(result):  # a user metric: picklable because it is defined at module level
    return {"total charge [C]": float(np.sum(np.abs(result.charge))), "count": result.event_count}


def test_custom_metrics_and_their_units(demo):
    ds = sweep(
        demo, {"supply.rms": [15e3, 18e3]}, cycles=50, seed=3, workers=1, progress=False, metrics=_charge_sum
    )
    assert set(ds.data_vars) == {"total_charge", "count", "seed", "error"}
    assert ds["total_charge"].attrs["units"] == "C" and "units" not in ds["count"].attrs
    assert ds["supply.rms"].attrs["units"] == "V"


def test_netcdf_round_trip_keeps_values_and_attributes(serial_grid, tmp_path):
    path = write_netcdf(serial_grid, tmp_path / "sweep.nc")
    back = read_netcdf(path)
    xr.testing.assert_identical(back, serial_grid)  # values, coordinates, dtypes and every attribute
    assert base_scenario(back) == base_scenario(serial_grid)
    raw = xr.load_dataset(path)  # a plain xarray reader sees the same numbers and units
    assert raw["mean_apparent_charge"].attrs["units"] == "C"
    np.testing.assert_array_equal(raw["seed"].values, serial_grid["seed"].values)


def test_base_scenario_restores_the_start(serial_grid, demo):
    assert base_scenario(serial_grid) == demo


def test_text_parameter_sweep_round_trips(demo, tmp_path):
    ds = sweep(demo, {"void.gas": ["air", "no-such-gas"]}, cycles=20, seed=0, workers=1, progress=False)
    assert ds["error"].sel({"void.gas": "air"}).item() == ""
    assert "no-such-gas" in ds["error"].sel({"void.gas": "no-such-gas"}).item()
    back = read_netcdf(write_netcdf(ds, tmp_path / "gas.nc"))
    xr.testing.assert_identical(back, ds)


@pytest.mark.parametrize(
    ("args", "kwargs", "match"),
    [
        ((), {"parameters": {"void.diameterr": [1e-3]}}, "diameterr"),
        ((), {"parameters": {"gas.pressure": [1e5]}}, "part"),
        ((), {"parameters": {"void.diameter": [1e-3]}, "cycles": 0}, "cycles"),
        ((), {"parameters": {"void.diameter": [1e-3]}, "metrics": "mean"}, "metrics"),
        ((), {"parameters": {"void.diameter": [1e-3]}, "design": "lhs"}, "samples"),
    ],
)
def test_bad_arguments_fail_before_running(demo, args, kwargs, match):
    with pytest.raises(InputError, match=match):
        sweep(demo, *args, workers=1, progress=False, **kwargs)


def test_scenario_must_be_a_scenario():
    with pytest.raises(InputError, match="Scenario"):
        sweep({"void": {}}, {"void.diameter": [1e-3]}, workers=1, progress=False)


def _bad_names(result):  # "seed" is the sweep's own variable
    return {"seed [1]": 1.0}


def _not_a_number(result):
    return {"label": "high"}


@pytest.mark.parametrize(("metric", "match"), [(_bad_names, "reserves"), (_not_a_number, "real number")])
def test_a_broken_metric_fails_its_points_not_the_sweep(demo, metric, match):
    ds = sweep(demo, {"supply.rms": [15e3, 18e3]}, cycles=10, seed=3, workers=1, progress=False,
               metrics=metric)
    assert ds.attrs["failed_points"] == 2
    assert all(match in str(e) for e in ds["error"].values)


def test_scenarios_survive_pickling_for_worker_processes(demo):
    import pickle

    wave = 18e3 * np.sqrt(2) * np.sin(np.linspace(0, 2 * np.pi, 64, endpoint=False))
    periodic = pdvoid.Scenario(insulation=demo.insulation, void=demo.void, model=demo.model,
                               supply=pdvoid.Periodic(samples=wave))
    for sc in (demo, periodic):
        assert pickle.loads(pickle.dumps(sc)) == sc
