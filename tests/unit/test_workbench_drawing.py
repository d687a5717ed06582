"""The workbench's persistent views (kept figures updated in place) and the histogram mode of big runs
(invented scenarios; no timing here: speed is measured by benchmarks/workbench_redraw.py)."""

from __future__ import annotations

import io

import numpy as np
import pytest

from pdvoid.faces.workbench.live import SEQUENCE_POINTS, LiveView, LiveViews
from pdvoid.faces.workbench.session import HISTOGRAM_FROM_CYCLES, SAMPLE_CYCLES, WorkbenchSession
from pdvoid.faces.workbench.views import VIEW_NAMES, figure_png, view_figure
from pdvoid.simulation.simulate import simulate

PNG = b"\x89PNG\r\n\x1a\n"  # PNG file signature (PNG specification, ISO/IEC 15948 section 5.2)


def _pixels(png: bytes) -> np.ndarray:
    from PIL import Image

    return np.asarray(Image.open(io.BytesIO(png)).convert("RGB"), dtype=float)


@pytest.fixture(scope="module")
def two_runs():
    s = WorkbenchSession(cycles=200, seed=1)
    first = s.run()
    s.set(voltage_kV=24.0)
    second = s.run()
    return first, second


def test_live_views_have_the_size_and_white_background_of_the_former_pictures(two_runs):
    out = two_runs[0]
    live = LiveViews()
    for name in VIEW_NAMES:
        new, old = live.render(name, out.result), figure_png(view_figure(name, out.result))
        assert new.startswith(PNG), name
        a, b = _pixels(new), _pixels(old)
        assert a.shape == b.shape, name
        # white background (house style): the corner pixel and most of the picture are white (255, 255, 255)
        assert (a[0, 0] == 255.0).all(), name
        assert np.mean(np.all(a == 255.0, axis=2)) > 0.5, name
        # the same picture in substance: most pixels agree with the freshly built figure (the axis labels sit
        # at fixed places now, so not all)
        same = np.mean(np.all(np.abs(a - b) < 8.0, axis=2))
        assert same > 0.9, (name, same)


def test_an_update_in_place_draws_what_a_new_view_draws(two_runs):
    first, second = two_runs
    reused, fresh = LiveViews(), LiveViews()
    for name in VIEW_NAMES:
        reused.render(name, first.result)
        # a view updated from the first run to the second shows exactly the picture of a view built for the
        # second: nothing of the first run is left on it
        assert reused.render(name, second.result) == fresh.render(name, second.result), name
        assert reused.render(name, second.result) != fresh.render(name, first.result), name


def test_a_view_that_cannot_be_drawn_shows_why_and_recovers(two_runs):
    out = two_runs[0]
    hist = simulate(out.scenario, cycles=50, seed=1, histogram=True)  # keeps no events
    view = LiveView("field")
    normal = view.render(out.result)
    message = view.render(hist)
    assert message != normal
    # the message picture is text on white: far fewer non-white pixels than the plot
    ink = [np.mean(np.any(_pixels(p) < 250.0, axis=2)) for p in (normal, message)]
    assert ink[1] < 0.3 * ink[0]
    assert view.render(out.result) == normal


def test_the_pulse_sequence_view_draws_at_most_its_point_budget():
    s = WorkbenchSession(cycles=3000, seed=2)
    out = s.run()
    pairs = out.result.event_count - 2  # one point per pair of consecutive pulse intervals (Hoof & Patsch)
    assert pairs > SEQUENCE_POINTS
    view = LiveView("sequence")
    view.render(out.result)
    drawn = sum(len(c.get_offsets()) for c in view._pairs)
    assert 0 < drawn <= SEQUENCE_POINTS
    labels = [c.get_label() for c in view._pairs]
    assert all("shown" in lab for lab in labels), labels
    # the legend counts every pair, not only those drawn
    counted = sum(int(lab.split("(")[1].split(",")[0]) for lab in labels)
    assert counted == pairs


def test_a_big_run_keeps_a_histogram_equal_to_the_binned_events_of_the_same_run():
    cycles = HISTOGRAM_FROM_CYCLES + 1000
    s = WorkbenchSession(cycles=cycles, seed=3)
    out = s.run()
    r = out.result
    assert r.histogram is not None and r.cycles == cycles
    assert out.sample is not None and out.sample.cycles == SAMPLE_CYCLES
    assert "histogram mode" in out.mode_note
    # independent check: the same run with every event kept, binned with numpy.histogram2d on the histogram's
    # own edges, gives the same counts (same seed: the same discharges)
    full = simulate(out.scenario, cycles=cycles, seed=3)
    h = r.histogram
    counts, _, _ = np.histogram2d(full.events.phase_deg, full.events.charge,
                                  bins=[h.phase_edges_deg, h.charge_edges])
    inside = (full.events.charge >= h.charge_edges[0]) & (full.events.charge <= h.charge_edges[-1])
    assert int(inside.sum()) == int(np.asarray(h.counts).sum())
    np.testing.assert_array_equal(np.asarray(h.counts), counts)
    assert r.event_count == full.event_count
    # the first cycles' events are those of the same seed's short run
    first = full.events.cycle < SAMPLE_CYCLES
    np.testing.assert_array_equal(out.sample.events.time, full.events.time[first])


def test_a_small_run_keeps_every_event():
    out = WorkbenchSession(cycles=200, seed=1).run()
    assert out.result.histogram is None and out.sample is None and out.mode_note == ""
    assert out.events_result is out.result


def test_big_run_in_the_panel_draws_every_view_and_says_histogram_mode():
    from pdvoid.faces.workbench import Workbench

    wb = Workbench(cycles=200, seed=1, delay=0.0)
    try:
        wb.widgets["cycles"].value = str(HISTOGRAM_FROM_CYCLES * 2)
        assert wb.wait(120)
        assert "histogram mode" in wb.panel.status.value
        assert "histogram mode" in wb.panel.summary.value
        for name, img in wb.panel.images.items():
            assert bytes(img.value).startswith(PNG), name
        assert "not available" not in wb.panel.status.value
    finally:
        wb.close()


def test_the_former_drawing_stays_available_and_a_bad_choice_is_refused():
    from pdvoid.core.errors import InputError
    from pdvoid.faces.workbench import Workbench

    with pytest.raises(InputError, match="drawing"):
        Workbench(drawing="fast")
    old, new = Workbench(drawing="new figures"), Workbench()
    try:
        for name in VIEW_NAMES:
            a, b = bytes(old.panel.images[name].value), bytes(new.panel.images[name].value)
            assert a.startswith(PNG) and b.startswith(PNG), name
            assert _pixels(a).shape == _pixels(b).shape, name
        assert old.outcome.summary == new.outcome.summary  # drawing changes the pictures only
    finally:
        old.close()
        new.close()
