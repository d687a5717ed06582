"""``pdvoid plot``: results, events files, sweeps and scenarios to PNG/SVG/PDF, written atomically, never over an
existing file without --force, bad input refused with exit status 2."""

from __future__ import annotations

import io
import re
import xml.etree.ElementTree as ET

import numpy as np
import pytest

from pdvoid.faces.cli.command import main
from pdvoid.inputs.demo import demo_measured_path, demo_scenario_path

PNG_MAGIC = b"\x89PNG\r\n\x1a\n"  # the PNG signature (ISO/IEC 15948, section 5.2)


def _svg_texts(path):
    """The texts of an SVG drawn by matplotlib: glyphs are paths, each text is kept in an XML comment."""
    ET.parse(path)  # well-formed XML
    return "\n".join(re.findall(r"<!-- (.*?) -->", path.read_text(encoding="utf-8")))


@pytest.fixture(scope="module")
def run(tmp_path_factory):
    out = tmp_path_factory.mktemp("plot") / "run"
    assert main(["simulate", str(demo_scenario_path()), "--cycles", "200", "--out", str(out), "--quiet"]) == 0
    return out


def _leftovers(folder):
    return [p.name for p in folder.iterdir() if p.name.endswith(".part")]


def test_png_of_a_result_is_white_and_of_the_asked_resolution(run, tmp_path, capsys):
    from matplotlib.image import imread

    out = tmp_path / "pattern.png"
    assert main(["plot", str(run / "result.npz"), "-o", str(out), "--dpi", "100"]) == 0
    said = capsys.readouterr().out
    assert "wrote" in said and "high voltage can kill" in said
    data = out.read_bytes()
    assert data[:8] == PNG_MAGIC
    img = imread(io.BytesIO(data))
    # the pattern's figure is 7.0 x 4.2 in (style.WIDE_FIGSIZE): 700 x 420 pixels at 100 dpi
    assert img.shape[:2] == (420, 700)
    assert np.allclose(img[0, 0, :3], 1.0) and np.allclose(img[-1, -1, :3], 1.0)  # white corners
    assert not _leftovers(tmp_path)


def test_a_run_folder_and_an_events_file_give_patterns_with_units_on_the_axes(run, tmp_path):
    for source, name in ((run, "folder.svg"), (run / "events.csv", "events.svg"), (demo_measured_path(), "m.svg")):
        out = tmp_path / name
        assert main(["plot", str(source), "-o", str(out)]) == 0
        texts = _svg_texts(out)
        for label in ("phase [deg]", "apparent charge [pC]", "discharges per cycle per cell [1/cycle]"):
            assert label in texts, (name, label)


def test_pdf_holds_the_labels(run, tmp_path):
    from pypdf import PdfReader

    out = tmp_path / "pattern.pdf"
    assert main(["plot", str(run / "result.npz"), "-o", str(out), "--charge-scale", "linear"]) == 0
    assert out.read_bytes()[:5] == b"%PDF-"
    text = PdfReader(str(out)).pages[0].extract_text()
    assert "phase [deg]" in text and "apparent charge [pC]" in text


def test_a_histogram_run_is_drawn(tmp_path, capsys):
    run = tmp_path / "hist"
    assert main(["simulate", str(demo_scenario_path()), "--cycles", "200", "--out", str(run), "--histogram",
                 "--quiet"]) == 0
    assert main(["plot", str(run / "result.npz"), "-o", str(tmp_path / "h.png")]) == 0
    assert (tmp_path / "h.png").read_bytes()[:8] == PNG_MAGIC


def test_an_existing_picture_is_kept_without_force(run, tmp_path, capsys):
    out = tmp_path / "p.png"
    out.write_bytes(b"keep me")
    assert main(["plot", str(run / "result.npz"), "-o", str(out)]) == 2
    err = capsys.readouterr().err
    assert err.startswith("pdvoid: error:") and "--force" in err
    assert out.read_bytes() == b"keep me"
    assert main(["plot", str(run / "result.npz"), "-o", str(out), "--force"]) == 0
    assert out.read_bytes()[:8] == PNG_MAGIC


@pytest.mark.parametrize(("argv", "words"), [
    (["-o", "{tmp}/p.jpg"], "must end in .png, .svg or .pdf"),
    (["-o", "{tmp}/missing/p.png"], "does not exist"),
    (["-o", "{tmp}"], "must end in"),
    (["-o", "{tmp}/p.png", "--metric", "discharges_per_cycle"], "go with a sweep file"),
    (["-o", "{tmp}/p.png", "--measured", "x.csv"], "goes with a scenario file"),
    (["-o", "{tmp}/p.png", "--kind", "sweep"], "looks like a result file"),
])
def test_bad_input_is_refused_with_exit_2_and_nothing_written(run, tmp_path, argv, words, capsys):
    argv = [a.replace("{tmp}", str(tmp_path)) for a in argv]
    assert main(["plot", str(run / "result.npz"), *argv]) == 2
    err = capsys.readouterr().err
    assert err.startswith("pdvoid: error:") and words in err
    assert not list(tmp_path.iterdir())


def test_a_damaged_input_leaves_no_picture_and_no_temporary_file(tmp_path, capsys):
    bad = tmp_path / "broken.npz"
    bad.write_bytes(b"not a zip file")
    assert main(["plot", str(bad), "-o", str(tmp_path / "p.png")]) == 2
    assert capsys.readouterr().err.startswith("pdvoid: error:")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["broken.npz"]


@pytest.mark.parametrize("bad", ["10", "601", "x"])
def test_bad_dpi_exit_2(run, tmp_path, bad, capsys):
    with pytest.raises(SystemExit) as stop:
        main(["plot", str(run / "result.npz"), "-o", str(tmp_path / "p.png"), "--dpi", bad])
    assert stop.value.code == 2 and "argument --dpi" in capsys.readouterr().err


def test_a_scenario_beside_a_measured_pattern(tmp_path):
    out = tmp_path / "fit.svg"
    assert main(["plot", str(demo_scenario_path()), "--measured", str(demo_measured_path()), "--simulate-cycles",
                 "200", "-o", str(out)]) == 0
    texts = _svg_texts(out)
    assert "simulated" in texts and "measured (demo_measured.csv)" in texts and "phase within the half cycle [deg]" \
        in texts


@pytest.fixture(scope="module")
def sweep_file(tmp_path_factory):
    pytest.importorskip("xarray")
    from pdvoid.inputs.scenario import Scenario
    from pdvoid.sweeps import sweep_to_file

    out = tmp_path_factory.mktemp("sweep") / "s.nc"
    sweep_to_file(Scenario.from_file(demo_scenario_path()), {"void.diameter": [1e-3, 2e-3],
                  "void.pressure": [50e3, 101.325e3]}, out, cycles=100, seed=1, workers=1, progress=False)
    return out


def test_a_sweep_metric_against_its_parameter(sweep_file, tmp_path, capsys):
    from pdvoid.faces.plots.sweeps import sweep_plot
    from pdvoid.sweeps import read_netcdf

    out = tmp_path / "sweep.svg"
    assert main(["plot", str(sweep_file), "--metric", "mean_apparent_charge", "-o", str(out)]) == 0
    texts = _svg_texts(out)
    assert "void.diameter [mm]" in texts and "[pC]" in texts
    ds = read_netcdf(sweep_file)
    ax = sweep_plot(ds, "mean_apparent_charge", "void.pressure")
    assert ax.get_xlabel() == "void.pressure [kPa]"
    # one line per diameter; the y data are the dataset's values in pC (1 pC = 1e-12 C, SI prefix pico)
    lines = ax.get_lines()
    assert len(lines) == 2
    for i, line in enumerate(lines):
        assert np.allclose(line.get_xdata(), [50.0, 101.325])
        assert np.allclose(line.get_ydata(), ds["mean_apparent_charge"].isel({"void.diameter": i}).values / 1e-12,
                           equal_nan=True)
    assert main(["plot", str(sweep_file), "--metric", "nope", "-o", str(tmp_path / "x.png")]) == 2
    assert "choose one of discharges_per_cycle" in capsys.readouterr().err
    assert main(["plot", str(sweep_file), "--parameter", "void.height", "-o", str(tmp_path / "x.png")]) == 2
    assert "was not swept" in capsys.readouterr().err
