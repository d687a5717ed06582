"""Sweep files (TOML with units) and the ``sweep`` command: parsing, errors naming file and key, NetCDF."""

from __future__ import annotations

import argparse
import json
import textwrap

import pytest
import xarray as xr

from pdvoid import InputError
from pdvoid.faces.cli.sweep import register
from pdvoid.sweeps.files import read_sweep_file


def _write(path, text):
    path.write_text(textwrap.dedent(text), encoding="utf-8")
    return path


def _main(argv):
    """The command as pdvoid.cli will run it: a parser with the sweep sub-command; InputError -> exit 2."""
    parser = argparse.ArgumentParser(prog="pdvoid")
    register(parser.add_subparsers(dest="command", required=True))
    ns = parser.parse_args(argv)
    try:
        return ns.func(ns)
    except InputError as exc:
        print(f"pdvoid: error: {exc}")
        return 2


INLINE = """
    name = "test wall"
    [insulation]
    thickness = "6 mm"
    permittivity = 4.2
    [void]
    diameter = "1.5 mm"
    height = "1.5 mm"
    [supply]
    rms = "18 kV"
"""


def test_grid_file_with_units_and_inline_scenario(tmp_path):
    f = _write(
        tmp_path / "s.toml",
        INLINE
        + """
    [sweep]
    cycles = 100
    seed = 4
    [parameters]
    "void.diameter" = ["0.8 mm", "1.5 mm"]
    void.pressure = ["50 kPa", "1 atm"]
    """,
    )
    spec = read_sweep_file(f)
    # 1 atm = 101325 Pa exactly (scipy.constants.atm, CODATA); mm and kPa are SI prefixes
    assert spec.parameters == {"void.diameter": [0.8e-3, 1.5e-3], "void.pressure": [5e4, 101325.0]}
    assert (spec.design, spec.cycles, spec.seed, spec.samples) == ("grid", 100, 4, None)
    assert spec.scenario.insulation.thickness == 6e-3 and spec.scenario.name == "test wall"


def test_lhs_file_with_scenario_path_relative_to_the_sweep_file(tmp_path):
    (tmp_path / "base").mkdir()
    _write(tmp_path / "base" / "wall.toml", INLINE)
    f = _write(
        tmp_path / "s.toml",
        """
    scenario = "base/wall.toml"
    [sweep]
    design = "lhs"
    samples = 4
    [parameters]
    "void.diameter" = {low = "0.5 mm", high = "2 mm"}
    "model.ionization_rate" = {low = "1e6 1/(m3 s)", high = "1e10 1/(m3 s)", scale = "log"}
    """,
    )
    spec = read_sweep_file(f)
    assert spec.parameters["void.diameter"] == (0.5e-3, 2e-3, "linear")
    assert spec.parameters["model.ionization_rate"] == (1e6, 1e10, "log")
    assert spec.options() == {"design": "lhs", "cycles": 1000, "seed": 0, "samples": 4}


@pytest.mark.parametrize(
    ("body", "match"),
    [
        (
            INLINE + '[parameters]\n"void.diameter" = ["0.8 mm", "1.5 kV"]\n',
            r'parameters\."void\.diameter"\[1\]',
        ),
        (
            INLINE + '[parameters]\n"void.diameter" = {low = "1 mm", high = "2 mm"}\n',
            "grid design takes a list",
        ),
        (
            INLINE + '[sweep]\ndesign = "lhs"\nsamples = 3\n[parameters]\n"void.diameter" = ["1 mm"]\n',
            "bounds",
        ),
        (
            INLINE + '[sweep]\ndesign = "lhs"\n[parameters]\n"void.diameter" = {low = 1, high = 2}\n',
            "samples",
        ),
        (INLINE + '[sweep]\ncycles = 0\n[parameters]\n"void.diameter" = ["1 mm"]\n', "sweep.cycles"),
        (INLINE + '[sweep]\nworkers = 2\n[parameters]\n"void.diameter" = ["1 mm"]\n', "workers"),
        (INLINE + '[parameters]\n"void.radius" = ["1 mm"]\n', "radius"),
        (INLINE, "parameters"),
        ('[parameters]\n"void.diameter" = ["1 mm"]\n', "no base scenario"),
        ('scenario = "missing.toml"\n' + INLINE, "not both"),
        ('scenario = "missing.toml"\n[parameters]\n"void.diameter" = ["1 mm"]\n', "missing.toml"),
        ("[parameters\n", "malformed TOML"),
    ],
)
def test_bad_sweep_files_name_the_file_and_key(tmp_path, body, match):
    f = _write(tmp_path / "bad_sweep.toml", body)
    with pytest.raises(InputError, match=match) as info:
        read_sweep_file(f)
    assert "bad_sweep.toml" in str(info.value)


def test_sweep_command_writes_netcdf_and_reports_json(tmp_path, capsys):
    f = _write(
        tmp_path / "s.toml",
        INLINE
        + """
    [sweep]
    cycles = 100
    seed = 4
    [parameters]
    "void.diameter" = ["0.8 mm", "1.5 mm"]
    "void.height" = ["1 mm", "7 mm"]
    """,
    )
    out = tmp_path / "results.nc"
    assert _main(["sweep", str(f), "--out", str(out), "--workers", "1", "--json", "--no-progress"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["points"] == 4 and doc["failed_points"] == 2 and "high voltage can kill" in doc["safety"]
    ds = xr.load_dataset(out)
    assert ds["void.diameter"].values.tolist() == [0.8e-3, 1.5e-3] and ds.attrs["cycles"] == 100


def test_sweep_command_text_output_and_errors(tmp_path, capsys):
    f = _write(
        tmp_path / "s.toml", INLINE + '[sweep]\ncycles = 20\n[parameters]\n"void.height" = ["1 mm", "7 mm"]\n'
    )
    assert _main(["sweep", str(f), "--out", str(tmp_path / "r.nc"), "--workers", "1", "--no-progress"]) == 0
    text = capsys.readouterr().out
    assert "2 points (1 failed)" in text and "first failure: void.height" in text and "SAFETY" in text
    assert _main(["sweep", str(f), "--out", str(tmp_path / "no" / "r.nc"), "--workers", "1"]) == 2
    assert "does not exist" in capsys.readouterr().out
    with pytest.raises(SystemExit):  # argparse: --workers and --scheduler exclude each other
        _main(["sweep", str(f), "--out", "r.nc", "--workers", "1", "--scheduler", "tcp://127.0.0.1:1"])
