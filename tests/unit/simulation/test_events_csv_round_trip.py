"""pdvoid's own events.csv carries the frequency and the cycles observed: read back, it gives exactly the IEC 60270
quantities of the result it came from (the reference time is cycles / frequency)."""

from __future__ import annotations

import pytest

import pdvoid


def test_events_csv_gives_the_same_iec_quantities_as_the_result(demo, tmp_path):
    # 2000 cycles of the demo at a low ionisation rate: the first discharge comes late, so a reader that took the
    # span of the events as the observation time would overestimate every rate
    sc = demo.replace(**{"model.ionization_rate": 1e7})
    res = pdvoid.simulate(sc, cycles=2000, seed=5)
    assert res.event_count > 0
    path = res.to_csv(tmp_path / "events.csv")
    text = path.read_text(encoding="utf-8")
    assert "# frequency = 50.0 Hz" in text and "# cycles = 2000" in text
    back = pdvoid.read_events(path)
    assert back.cycles == 2000 and back.frequency == 50.0
    q_res, q_back = pdvoid.iec60270(res), pdvoid.iec60270(back)
    for name in ("average_current", "quadratic_rate", "repetition_rate"):
        assert getattr(q_back, name) == pytest.approx(getattr(q_res, name), rel=1e-12)
