"""``pdvoid simulate --histogram`` and ``--no-events``: what the run folder holds, its manifest, and readers that
accept such a folder but refuse one with an expected file missing."""

from __future__ import annotations

import json

import numpy as np
import pytest

import pdvoid
from pdvoid.faces.cli.command import main
from pdvoid.inputs.demo import demo_scenario_path
from pdvoid.simulation.results import load

CYCLES = "300"


def _run(tmp_path, name, *extra):
    out = tmp_path / name
    assert main(["simulate", str(demo_scenario_path()), "--cycles", CYCLES, "--seed", "4", "--out", str(out),
                 "--quiet", *extra]) == 0
    return out


def _manifest(out):
    return json.loads((out / "manifest.json").read_text(encoding="utf-8"))


def test_histogram_keeps_the_counts_not_the_events(tmp_path, capsys):
    hist = _run(tmp_path, "hist", "--histogram", "--phase-bins", "36")
    full = _run(tmp_path, "full")
    capsys.readouterr()
    assert sorted(p.name for p in hist.iterdir()) == ["manifest.json", "result.npz", "summary.json"]
    doc = _manifest(hist)
    assert doc["mode"] == "histogram" and doc["events_file"] is False
    assert [f["name"] for f in doc["files"]] == ["result.npz", "summary.json"]
    h, e = load(hist / "result.npz"), load(full / "result.npz")
    assert h.events.count == 0 and h.histogram is not None and h.histogram.counts.shape[0] == 36
    # the same seed drives the same discharges with and without the event list: the kernel's counts equal the
    # events of the full run binned independently with numpy over the same edges
    assert h.event_count == e.events.count > 0
    ref, _, _ = np.histogram2d(e.phase_deg, e.charge, bins=[h.histogram.phase_edges_deg, h.histogram.charge_edges])
    assert np.array_equal(h.histogram.counts, ref.astype(np.int64))
    assert h.histogram.counts.sum() + h.histogram.below + h.histogram.above == e.events.count
    assert h.sum_abs_charge == pytest.approx(float(np.sum(np.abs(e.charge))), rel=1e-12)


def test_no_events_writes_no_csv_and_the_readers_accept_the_folder(tmp_path, capsys):
    out = _run(tmp_path, "noev", "--no-events")
    capsys.readouterr()
    assert not (out / "events.csv").exists()
    doc = _manifest(out)
    assert doc["mode"] == "events" and doc["events_file"] is False
    res = load(out / "result.npz")  # the manifest matches: accepted
    assert res.events.count == res.event_count > 0
    assert main(["pattern", str(out / "result.npz"), "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["events"] == res.events.count


def test_a_missing_expected_file_is_refused(tmp_path, capsys):
    out = _run(tmp_path, "noev", "--no-events")
    (out / "summary.json").unlink()
    capsys.readouterr()
    assert main(["pattern", str(out / "result.npz")]) == 2
    err = capsys.readouterr().err
    assert err.startswith("pdvoid: error:") and "summary.json is listed in the manifest but missing" in err
    full = _run(tmp_path, "full")
    (full / "events.csv").unlink()
    capsys.readouterr()
    assert main(["pattern", str(full / "result.npz")]) == 2
    assert "events.csv is listed in the manifest but missing" in capsys.readouterr().err


def test_an_events_file_dropped_into_a_no_events_folder_is_refused(tmp_path, capsys):
    out = _run(tmp_path, "noev", "--no-events")
    load(out / "result.npz").to_csv(tmp_path / "events.csv")
    (out / "events.csv").write_bytes((tmp_path / "events.csv").read_bytes())
    capsys.readouterr()
    assert main(["pattern", str(out / "events.csv")]) == 2
    assert "the manifest does not list events.csv" in capsys.readouterr().err


def test_force_without_events_removes_the_old_events_file(tmp_path, capsys):
    out = _run(tmp_path, "run")
    assert (out / "events.csv").exists()
    _run(tmp_path, "run", "--no-events", "--force")
    capsys.readouterr()
    assert not (out / "events.csv").exists()  # no file of the earlier run left beside the new one
    pdvoid.core.files.verify_manifest(out, required=("result.npz", "summary.json"))


def test_phase_bins_without_histogram_is_refused_before_any_work(tmp_path, capsys):
    out = tmp_path / "x"
    assert main(["simulate", str(demo_scenario_path()), "--out", str(out), "--phase-bins", "36"]) == 2
    assert capsys.readouterr().err.startswith("pdvoid: error: --phase-bins")
    assert not out.exists()


@pytest.mark.parametrize("bad", ["0", "3601", "many"])
def test_bad_phase_bins_exit_2(tmp_path, bad, capsys):
    with pytest.raises(SystemExit) as stop:
        main(["simulate", str(demo_scenario_path()), "--out", str(tmp_path / "x"), "--histogram",
              "--phase-bins", bad])
    assert stop.value.code == 2
    assert "error: argument --phase-bins" in capsys.readouterr().err
