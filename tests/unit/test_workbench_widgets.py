"""The workbench panel without a browser: set a widget's value, wait for the debounced background run, and
check the summary numbers and images (invented scenarios)."""

from __future__ import annotations

import html
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


def _text(widget):
    """An HTML widget's text as the browser shows it (entities such as &#x27; decoded)."""
    return html.unescape(widget.value)


def _stale(widget):
    return "pdvoid-stale" in widget._dom_classes


def test_invalid_height_shows_the_message_in_mm_and_greys_the_old_views(wb):
    images = _images(wb)
    wb.widgets["height_mm"].value = 7.0  # taller than the 6 mm wall
    assert wb.wait(60)
    # the panel's labels and units (mm), not the SI keys and metres of the scenario check
    assert "void height must be smaller than insulation thickness (6 mm); got 7 mm" in _text(wb.panel.error)
    assert "void.height" not in _text(wb.panel.error) and " m;" not in _text(wb.panel.error)
    assert "input error" in _text(wb.panel.status)
    assert _images(wb) == images  # the last good pictures stay, greyed and marked out of date
    assert all(_stale(img) for img in wb.panel.images.values()) and _stale(wb.panel.summary)
    assert "Out of date" in _text(wb.panel.stale) and "void 1.5 mm × 1.5 mm" in _text(wb.panel.stale)
    assert wb.export() == [] and "input error" in _text(wb.panel.export["message"])
    wb.widgets["height_mm"].value = 1.5
    assert wb.wait(60)
    assert _text(wb.panel.error) == "" and wb.outcome.ok
    assert _text(wb.panel.stale) == "" and not any(_stale(img) for img in wb.panel.images.values())


def test_a_seed_that_is_not_a_whole_number_is_refused_with_a_message(wb):
    images, runs = _images(wb), wb.runs
    wb.widgets["seed"].value = "1.5"  # a number widget in the browser made this 15
    assert "seed must be a whole number from 0 to 4294967295; got '1.5' (not a whole number)" in _text(wb.panel.error)
    assert wb.session.controls.seed == 1 and wb.wait(60) and wb.runs == runs  # nothing ran
    assert _images(wb) == images and all(_stale(img) for img in wb.panel.images.values())
    wb.widgets["cycles"].value = "2e3"
    assert "cycles must be a whole number from 1 to 10000000; got '2e3'" in _text(wb.panel.error)
    wb.widgets["cycles"].value = "300"
    wb.widgets["seed"].value = "2"
    assert wb.wait(60)
    assert wb.outcome.ok and wb.outcome.result.cycles == 300 and wb.outcome.controls.seed == 2
    assert _text(wb.panel.error) == "" and not _stale(wb.panel.summary)


def test_a_typed_value_beyond_a_slider_is_used_and_the_panel_says_so(wb):
    entry, slider = wb.panel.entries["pressure_kPa"], wb.widgets["pressure_kPa"]
    entry.value = 1500.0  # beyond the slider's 1000 kPa: a slider readout would clamp it silently
    assert wb.wait(60)
    assert slider.value == 1500.0 and slider.max == 1500.0 and wb.outcome.controls.pressure_kPa == 1500.0
    assert ("gas pressure 1500 kPa lies beyond the slider's range (1 to 1000 kPa): the value is used as typed"
            in _text(wb.panel.notice))
    entry.value = -5.0  # no slider can hold it: the scenario check says why, in kPa
    assert wb.wait(60)
    assert "gas pressure must lie in [0.1, 1000] kPa; got -5 kPa" in _text(wb.panel.error)
    wb.widgets["diameter_mm"].value = 2.0  # the entry box follows the slider
    assert wb.panel.entries["diameter_mm"].value == 2.0


def test_no_widget_shows_a_null_tooltip_and_every_control_explains_itself(wb):
    import ipywidgets

    stack, seen = [wb.panel.root], 0
    while stack:
        w = stack.pop()
        stack.extend(getattr(w, "children", ()))
        if isinstance(w, ipywidgets.DOMWidget) and hasattr(w, "tooltip"):
            seen += 1
            assert w.tooltip is not None, w  # ipywidgets writes None as the label title "null"
            if getattr(w, "description", ""):
                assert w.tooltip, f"{w.description!r} has no tooltip"
    assert seen > 30
    assert all(pdvoid.faces.workbench.SPECS[n].tooltip for n in pdvoid.faces.workbench.SPECS)


def test_network_model_shows_and_takes_its_capacitances(wb):
    field = wb.outcome
    caps = [wb.widgets[n] for n in ("network_from_geometry", "capacitance_void_pF", "capacitance_series_pF")]
    assert all(w.disabled for w in caps)  # only the network model reads them
    wb.widgets["model"].value = "network"
    assert wb.wait(60)
    net = wb.outcome
    assert not any(w.disabled for w in caps) and caps[0].value is True
    # the geometry's capacitances are shown: C_b = K εr ε0 Ω / (d h) for the spheroid equivalent (physics
    # module pdvoid.physics.network, derivation in spheroid_network_equivalent), recomputed here by hand
    from pdvoid.inputs.materials import get_material

    d, h, er = 6e-3, 1.5e-3, get_material("epoxy_silica_filled").permittivity
    omega = 3.141592653589793 * (1.5e-3) ** 2 * h / 6.0  # sphere of 1.5 mm: K = 1/N = 3
    c_b = 3.0 * er * 8.8541878128e-12 * omega / (d * h)
    assert caps[2].value == pytest.approx(c_b / 1e-12, rel=1e-6)
    # with those capacitances a spheroid's network reproduces the field model's induced charge: same numbers
    # (to rounding), and the panel says why
    assert net.summary["mean apparent charge [pC]"] == pytest.approx(field.summary["mean apparent charge [pC]"],
                                                                      rel=1e-12)
    assert "chosen to reproduce the field model" in _text(wb.panel.summary)
    caps[2].value = 2.0 * caps[2].value  # a typed C_b: the box unticks and the run changes
    assert caps[0].value is False
    assert wb.wait(60)
    typed = wb.outcome
    assert typed.scenario.model.capacitance_series == pytest.approx(2.0 * c_b, rel=1e-6)
    assert typed.summary["mean apparent charge [pC]"] != pytest.approx(net.summary["mean apparent charge [pC]"])
    assert "typed capacitances" in _text(wb.panel.summary) and "C_b" in _text(wb.panel.status)
    caps[1].value = 0.0
    assert wb.wait(60)
    assert "void capacitance C_c must be > 0 pF" in _text(wb.panel.error)


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
    wb.widgets["cycles"].value = "5000000"
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


def test_export_goes_outside_the_working_folder_by_default(tmp_path, monkeypatch):
    from pathlib import Path

    from pdvoid.faces.workbench import Workbench

    monkeypatch.setenv("HOME", str(tmp_path / "home"))  # Path.home() reads HOME on POSIX
    monkeypatch.chdir(tmp_path)
    bench = Workbench(cycles=20, delay=0.02)
    try:
        folder = Path(bench.panel.export["folder"].value)
        assert folder.is_absolute() and folder == tmp_path / "home" / "pdvoid_export"
        custom = Workbench(cycles=20, delay=0.02, export_folder=tmp_path / "mine")
        assert custom.panel.export["folder"].value == str(tmp_path / "mine")
        custom.close()
    finally:
        bench.close()


def test_export_never_replaces_files_without_being_asked(wb, tmp_path):
    out = tmp_path / "out"
    first = wb.export(out)
    before = {p: p.read_bytes() for p in first}
    wb.widgets["voltage_kV"].value = 20.0
    assert wb.wait(60)
    assert wb.export(out) == []
    message = wb.panel.export["message"].value
    assert "nothing written" in message and "exist already" in message and "pdvoid_scenario.toml" in message
    assert {p: p.read_bytes() for p in first} == before  # untouched
    wb.panel.export["overwrite"].value = True
    again = wb.export(out)
    assert sorted(again) == sorted(first) and "(replaced)" in wb.panel.export["message"].value
    assert pdvoid.Scenario.from_file(out / "pdvoid_scenario.toml").supply.rms == 20e3
    assert not [p for p in out.iterdir() if p.name.startswith(".") or p.suffix == ".tmp"]  # no temporary left


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


def _upload(bench, name, content):
    bench.panel.measured["upload"].value = (
        {"name": name, "type": "text/csv", "size": len(content), "content": memoryview(content),
         "last_modified": datetime.now(UTC)},
    )


def test_a_path_typed_after_an_upload_is_read_also_after_clear(wb, tmp_path):
    m = wb.panel.measured
    _upload(wb, "upload.csv", b"# frequency = 50 Hz\n# cycles = 100\nphase [deg],charge [pC]\n30,120\n210,-110\n")
    assert wb.wait(60) and "upload.csv" in m["message"].value
    typed = tmp_path / "typed.csv"
    typed.write_text("# frequency = 50 Hz\n# cycles = 10\nphase [deg],charge [pC]\n40,90\n220,-95\n230,-80\n",
                     encoding="utf-8")
    m["path"].value = str(typed)
    m["load"].click()
    assert wb.wait(60)
    assert "typed.csv: 3 discharges in 10 cycles" in m["message"].value and wb.session.measured_name == "typed.csv"
    _upload(wb, "upload.csv", b"# frequency = 50 Hz\n# cycles = 100\nphase [deg],charge [pC]\n30,120\n")
    assert wb.wait(60) and wb.session.measured_name == "upload.csv"  # a newer upload wins
    m["clear"].click()
    assert wb.wait(60)
    assert wb.session.measured is None and m["upload"].value == () and m["message"].value == ""
    m["load"].click()  # after Clear the typed path is what is read
    assert wb.wait(60)
    assert wb.session.measured_name == "typed.csv" and "typed.csv" in m["message"].value


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
