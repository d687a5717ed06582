"""The workbench panel without a browser: set a widget's value, wait for the debounced background run, and
check the summary numbers and images (invented scenarios)."""

from __future__ import annotations

import subprocess
import sys
import threading
import time
from datetime import UTC, datetime

import pytest

import pdvoid
from pdvoid.faces.workbench.scheduler import DebouncedWorker

U_INC = "inception voltage [kV rms]"
PNG = b"\x89PNG\r\n\x1a\n"  # PNG file signature (PNG specification, ISO/IEC 15948 section 5.2)


@pytest.fixture
def wb():
    from pdvoid.faces.workbench import Workbench

    bench = Workbench(cycles=200, seed=1, delay=0.02)
    yield bench
    bench.close()


def _images(bench):
    return {name: bytes(img.value) for name, img in bench.panel.images.items()}


def test_panel_opens_with_images_and_summary(wb):
    for name, data in _images(wb).items():
        assert data.startswith(PNG), name
    assert "inception voltage" in wb.panel.summary.value and "kV rms" in wb.panel.summary.value
    assert wb.panel.status.value and "updated" in wb.panel.status.value
    assert wb.outcome.ok and wb.outcome.result.cycles == 200
    # the regime in words, in the status line and below the summary table
    assert wb.outcome.regime and "first discharge after" in wb.outcome.regime
    assert "first discharge after" in wb.panel.status.value and "first discharge after" in wb.panel.summary.value


# explores or shows voids large against the slab (e.g. 3 mm in 6 mm), for which compute_coefficients
# rightly warns that the closed forms are off (ValidityWarning)
@pytest.mark.filterwarnings("ignore::pdvoid.core.validity.ValidityWarning")
def test_larger_void_redraws_and_lowers_inception(wb):
    before, images = wb.outcome.summary[U_INC], _images(wb)
    wb.widgets["diameter_mm"].value = 3.0
    wb.widgets["height_mm"].value = 3.0
    assert wb.wait(60)
    # streamer criterion: larger void, lower inception field (Niemeyer 1995; physics brief §3.1)
    assert wb.outcome.summary[U_INC] < 0.95 * before
    assert wb.outcome.controls.diameter_mm == 3.0 and wb.outcome.controls.height_mm == 3.0
    after = _images(wb)
    assert after["field"] != images["field"] and after["pattern"] != images["pattern"]
    assert "void 3 mm × 3 mm" in wb.panel.status.value


def test_higher_pressure_raises_inception(wb):
    before = wb.outcome.summary[U_INC]
    wb.widgets["pressure_kPa"].value = 200.0
    assert wb.wait(60)
    # streamer criterion: E_inc grows with pressure (Niemeyer 1995; physics brief §3.1)
    assert wb.outcome.summary[U_INC] > 1.5 * before
    assert "200 kPa" in wb.panel.status.value


def test_invalid_height_shows_the_message_and_keeps_the_panel(wb):
    images = _images(wb)
    wb.widgets["height_mm"].value = 7.0  # taller than the 6 mm wall
    assert wb.wait(60)
    assert "void.height must be smaller than insulation.thickness" in wb.panel.error.value
    assert "input error" in wb.panel.status.value
    assert _images(wb) == images  # the last good pictures stay
    wb.widgets["height_mm"].value = 1.5
    assert wb.wait(60)
    assert wb.panel.error.value == "" and wb.outcome.ok


def test_material_dropdown_sets_the_permittivity_widget(wb):
    wb.widgets["material"].value = "polyethylene"
    assert wb.widgets["permittivity"].value == pdvoid.inputs.materials.get_material("polyethylene").permittivity
    wb.widgets["permittivity"].value = 3.1
    assert wb.widgets["material"].value == pdvoid.faces.workbench.CUSTOM_MATERIAL
    assert wb.wait(60)
    assert wb.outcome.scenario.insulation.permittivity == 3.1


def test_changes_in_quick_succession_give_one_run():
    from pdvoid.faces.workbench import Workbench

    bench = Workbench(cycles=200, seed=1, delay=0.3)
    try:
        runs = bench.runs
        for v in (1.6, 1.7, 1.8, 1.9):
            bench.widgets["diameter_mm"].value = v
        assert bench.wait(60)
        assert bench.runs == runs + 1
        assert bench.outcome.controls.diameter_mm == 1.9
    finally:
        bench.close()


def test_stop_button_ends_a_long_run(wb):
    wb.widgets["cycles"].value = 5_000_000
    deadline = time.monotonic() + 30
    while (
        not ("running" in wb.panel.status.value and wb.panel.progress.value > 0)
        and time.monotonic() < deadline
    ):
        time.sleep(0.005)
    wb.panel.stop.click()
    assert wb.wait(60)
    out = wb.outcome
    assert out.stopped and out.result.cycles < 5_000_000
    assert "stopped after" in wb.panel.status.value
    assert wb.panel.progress.value == out.result.cycles


def test_export_writes_figures_scenario_and_result(wb, tmp_path):
    paths = wb.export(tmp_path / "out")
    names = sorted(p.name for p in paths)
    assert "pdvoid_scenario.toml" in names and "pdvoid_result.npz" in names
    for view in ("field", "pattern", "sequence"):
        assert f"pdvoid_{view}.png" in names and f"pdvoid_{view}.svg" in names
    assert (tmp_path / "out" / "pdvoid_field.png").read_bytes().startswith(PNG)
    assert pdvoid.Scenario.from_file(tmp_path / "out" / "pdvoid_scenario.toml") == wb.outcome.scenario
    assert pdvoid.load(tmp_path / "out" / "pdvoid_result.npz").event_count == wb.outcome.result.event_count
    assert "written" in wb.panel.export["message"].value


def test_export_without_a_format_says_so(wb, tmp_path):
    wb.panel.export["png"].value = False
    wb.panel.export["svg"].value = False
    assert wb.export(tmp_path / "out") == []
    assert "choose at least one figure format" in wb.panel.export["message"].value


def test_export_into_an_impossible_folder_shows_a_message(wb, tmp_path):
    blocker = tmp_path / "file"
    blocker.write_text("x", encoding="utf-8")
    assert wb.export(blocker / "sub") == []
    assert "cannot be created" in wb.panel.export["message"].value


def test_measured_pattern_from_a_path_is_compared(wb, tmp_path):
    from pdvoid.io import write_events

    path = write_events(wb.outcome.result.events, tmp_path / "measured.csv")
    m = wb.panel.measured
    m["path"].value = str(path)
    m["load"].click()
    assert wb.wait(60)
    assert "measured.csv" in m["message"].value
    assert bytes(m["image"].value).startswith(PNG)
    assert "comparison score" in wb.panel.summary.value
    # identical patterns score 0 (definition in pdvoid.analysis.compare)
    assert wb.outcome.comparison.score == pytest.approx(0.0, abs=1e-12)


def test_uploaded_measured_file_is_read(wb):
    content = b"# frequency = 50 Hz\n# cycles = 100\nphase [deg],charge [pC]\n30,120\n210,-110\n"
    m = wb.panel.measured
    m["upload"].value = (
        {
            "name": "upload.csv",
            "type": "text/csv",
            "size": len(content),
            "content": memoryview(content),
            "last_modified": datetime.now(UTC),
        },
    )
    assert wb.wait(60)
    assert "upload.csv: 2 discharges in 100 cycles" in m["message"].value
    assert wb.outcome.comparison is not None and wb.outcome.comparison.score > 0.0


def test_bad_measured_file_shows_the_reader_message(wb, tmp_path):
    bad = tmp_path / "bad.csv"
    bad.write_text("phase [deg],charge [pC]\n400,1\n", encoding="utf-8")
    m = wb.panel.measured
    m["path"].value = str(bad)
    m["cycles"].value = 10.0
    m["frequency"].value = 50.0
    m["load"].click()
    assert "phase outside [0, 360) deg" in m["message"].value


def test_redraw_latency_for_200_cycles_is_reported(wb):
    wb.worker.delay = 0.0
    wb.widgets["pressure_kPa"].value = 120.0
    assert wb.wait(60)
    # the issue asks for about 0.3 s on a quiet machine; shared CI machines are slower, so only a loose bound
    assert 0.0 < wb.last_latency < 5.0


def test_import_loads_neither_ipywidgets_nor_matplotlib():
    code = (
        "import sys, pdvoid, pdvoid.faces.workbench; "
        "print('ipywidgets' in sys.modules, 'matplotlib' in sys.modules)"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.split() == ["False", "False"]


def test_missing_ipywidgets_names_the_extra(monkeypatch):
    from pdvoid.faces.workbench import WorkbenchDependencyError, optional

    monkeypatch.setitem(sys.modules, "ipywidgets", None)  # "import ipywidgets" fails as if not installed
    with pytest.raises(WorkbenchDependencyError, match=r'pip install "pdvoid\[workbench\]"'):
        optional.require("ipywidgets")


def test_worker_debounces_and_reports_errors():
    calls, errors = [], []
    done = threading.Event()

    def job(should_stop):
        calls.append(time.monotonic())
        if len(calls) == 2:
            done.set()
            raise RuntimeError("boom")

    w = DebouncedWorker(job, delay=0.05, on_error=errors.append)
    try:
        for _ in range(5):
            w.request()
        assert w.wait(10)
        assert len(calls) == 1
        w.request()
        assert done.wait(10) and w.wait(10)
        assert len(calls) == 2 and str(errors[0]) == "boom"
    finally:
        w.close()
    with pytest.raises(pdvoid.InputError, match="delay"):
        DebouncedWorker(job, delay=-1.0)
