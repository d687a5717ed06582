"""Inception/margin chart and sensitivity (tornado) chart."""

from __future__ import annotations

import math
from types import SimpleNamespace

import numpy as np
import pytest

from pdvoid import InputError
from pdvoid.analysis.margins import largest_pd_free_void, margin_table
from pdvoid.faces.plots import crossings, inception_chart, sensitivity_chart


def _table(parameter="void.diameter", unit="m", scale=1.0, test_voltage=None):
    x = np.geomspace(0.2e-3, 4e-3, 20)
    inc = scale * 12e3 * (1e-3 / x) ** 0.3
    return SimpleNamespace(
        parameter=parameter,
        unit=unit,
        values=x,
        inception_voltage=inc,
        extinction_voltage=0.6 * inc,
        test_voltage=test_voltage,
    )


def test_crossings_linear_and_log():
    # hand computed: y = 10 − x meets 5 at x = 5 (falling); y = log10(x) meets 1 at x = 10 exactly in log x
    assert crossings(np.arange(11.0), 10.0 - np.arange(11.0), 5.0) == [(5.0, True)]
    x = np.array([1.0, 100.0])
    ((xc, falling),) = crossings(x, np.log10(x), 1.0, log_x=True)
    assert xc == pytest.approx(10.0) and not falling
    assert crossings(x, np.array([np.nan, 1.0]), 0.5) == []  # NaN samples are skipped, not guessed


# explores or shows voids large against the slab (e.g. 3 mm in 6 mm), for which compute_coefficients
# rightly warns that the closed forms are off (ValidityWarning)
@pytest.mark.filterwarnings("ignore::pdvoid.core.validity.ValidityWarning")
def test_chart_with_margin_tables_marks_largest_void(render, demo):
    values = np.geomspace(0.2e-3, 4e-3, 60)
    tables = [
        margin_table(demo, "void.size", values, 18e3),
        margin_table(demo.replace(**{"void.pressure": 50e3}), "void.size", values, 18e3),
    ]
    ax = inception_chart(tables, service_voltage=8e3, labels=["101 kPa", "50 kPa"])
    render(ax)
    assert ax.get_xlabel() == "void diameter (shape kept) [mm]"
    assert ax.get_ylabel() == "applied voltage, rms [kV]"
    # the crossing drawn on the chart agrees with the analysis' Brent root of U_inc(D) = U_test within the
    # interpolation error of 60 log-spaced samples (1 %, common practice for a chart)
    exact = largest_pd_free_void(demo, 18e3).diameter
    notes = [t.get_text() for t in ax.texts]
    assert len(notes) == 1 and "largest discharge-free" in notes[0]
    shown = float(notes[0].split(":")[-1].split()[0]) * 1e-3
    assert shown == pytest.approx(exact, rel=0.01)
    # the test level comes from the tables' own test_voltage when not given
    assert any(math.isclose(line.get_ydata()[0], 18.0) for line in ax.lines if len(line.get_ydata()) == 2)


def test_chart_with_plain_objects_pressure_sweep(render):
    x = np.linspace(20e3, 200e3, 30)
    t = SimpleNamespace(
        parameter="void.pressure",
        unit="Pa",
        values=x,
        inception_voltage=0.1 * x + 5e3,
        extinction_voltage=0.05 * x + 3e3,
        test_voltage=None,
    )
    ax = inception_chart(t, test_voltage=12e3)
    render(ax)
    assert ax.get_xlabel() == "gas pressure [kPa]"
    assert ax.get_xscale() == "linear"
    # rising curve: the mark is the smallest discharge-free pressure, 70 kPa (0.1·p + 5 kV = 12 kV)
    (note,) = [t.get_text() for t in ax.texts]
    assert "smallest" in note and "70 kPa" in note


def test_chart_several_tables_and_nan(render):
    a, b = _table(), _table(scale=1.4)
    b.inception_voltage[3] = np.nan  # an impossible combination inside the sweep
    render(inception_chart([a, b], service_voltage=6e3, test_voltage=10e3, extinction=False))


def test_chart_bad_input():
    with pytest.raises(InputError, match="at least one"):
        inception_chart([])
    with pytest.raises(InputError, match="not a MarginTable"):
        inception_chart([object()])
    with pytest.raises(InputError, match="same parameter"):
        inception_chart([_table(), _table("void.height")])
    with pytest.raises(InputError, match="test_voltage"):
        inception_chart(_table(), test_voltage=-1.0)
    with pytest.raises(InputError, match="service_voltage"):
        inception_chart(_table(), service_voltage=float("nan"))
    with pytest.raises(InputError, match="labels"):
        inception_chart([_table(), _table()], labels=["one"])
    t = _table()
    t.inception_voltage = np.full(20, np.nan)
    with pytest.raises(InputError, match="no finite inception"):
        inception_chart(t)


ROWS = [
    ("void diameter", 12.0e3, 14.0e3, 13.2e3),
    ("gas pressure", 11.0e3, 15.0e3, 13.2e3),
    ("residual ratio", 13.2e3, 13.2e3, 13.2e3),
    ("insulation thickness", float("nan"), 15e3, 13.2e3),
]


def test_sensitivity_chart(render):
    ax = sensitivity_chart(ROWS)
    render(ax)
    assert ax.get_xlabel() == "inception voltage, rms [kV]"
    # largest swing on top: pressure (4 kV) above diameter (2 kV) above residual ratio (0)
    labels = [t.get_text() for t in ax.get_yticklabels()]
    assert labels[-1] == "gas pressure" and labels[0] == "residual ratio"
    texts = [t.get_text() for t in ax.texts]
    assert "outside the valid range" in texts and "no change" in texts
    # bars start at the design value (13.2 kV) and reach the varied value
    ends = sorted(round(p.get_x() + p.get_width(), 6) for p in ax.patches)
    assert 11.0 in ends and 15.0 in ends


def test_sensitivity_chart_other_unit(render):
    ax = sensitivity_chart(
        [("void diameter", 80e-12, 130e-12, 100e-12)], quantity="charge per discharge", unit="pC"
    )
    render(ax)
    assert ax.get_xlabel() == "charge per discharge [pC]"
    assert any("+30.0 %" in t.get_text() for t in ax.texts)


def test_sensitivity_bad_input():
    with pytest.raises(InputError, match="at least one"):
        sensitivity_chart([])
    with pytest.raises(InputError, match="rows\\[0\\]"):
        sensitivity_chart([("a", 1.0, 2.0)])
    with pytest.raises(InputError, match="label"):
        sensitivity_chart([("", 1.0, 2.0, 1.5)])
    with pytest.raises(InputError, match="base_value"):
        sensitivity_chart([("a", 1.0, 2.0, float("inf"))])
    with pytest.raises(InputError, match="one base_value"):
        sensitivity_chart([("a", 1.0, 2.0, 1.5), ("b", 1.0, 2.0, 1.6)])
    with pytest.raises(InputError, match="unit"):
        sensitivity_chart(ROWS, unit="furlong")
    with pytest.raises(InputError, match="rows"):
        sensitivity_chart("rows")


def test_chart_shades_the_band_of_the_two_criteria(render, demo):
    from matplotlib.collections import PolyCollection

    import pdvoid

    values = np.geomspace(0.5e-3, 1.8e-3, 7)  # within the closed forms' verified range in the 6 mm wall
    table = margin_table(demo, "void.size", values, 18e3)
    # the band's ends are the smaller and the larger of the two criteria of each row (compute_coefficients,
    # criterion by criterion: a second path through the analysis)
    for i, d in enumerate(values):
        c = pdvoid.compute_coefficients(demo.replace(**{"void.diameter": d, "void.height": d}))
        lo, hi = sorted((c.inception_voltage_streamer, c.inception_voltage_integral))
        # and the streamer voltage at the other quoted (E/p)_cr of air: linear in it (physics brief 3.1)
        hi = max(hi, c.inception_voltage_streamer * 25.2 / 24.2)
        assert table.inception_low[i] == pytest.approx(lo, rel=1e-12)
        assert table.inception_high[i] == pytest.approx(hi, rel=1e-12)
    assert np.all(table.inception_low <= table.inception_voltage) and np.all(
        table.inception_voltage <= table.inception_high)
    ax = inception_chart(table)
    render(ax)
    shaded = [c for c in ax.collections if isinstance(c, PolyCollection)]
    assert len(shaded) == 1
    labels = [t.get_text() for t in ax.get_legend().get_texts()]
    assert "inception band (both criteria, spread of the streamer constant)" in labels
