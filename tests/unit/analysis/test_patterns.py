"""Phase-resolved pattern, half-cycle distributions and H(q)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from pdvoid import InputError
from pdvoid.analysis.patterns import half_cycle_distributions, magnitude_distribution, pattern
from pdvoid.simulation.events import Events


@pytest.mark.parametrize("scale", ["log", "linear"])
@pytest.mark.parametrize("phase_bins,charge_bins", [(72, 50), (1, 2), (360, 8), (7, 100)])
def test_every_nonzero_event_counted_once(random_events, scale, phase_bins, charge_bins):
    # counting identity (common practice for histograms): each nonzero event lands in exactly one bin
    pat = pattern(random_events, phase_bins, charge_bins, scale)
    nonzero = int(np.count_nonzero(random_events.charge))
    assert pat.counts.sum() == nonzero
    assert pat.zero_count == 7
    assert pat.outside_count == 0
    assert pat.counts.shape == (phase_bins, charge_bins)
    assert pat.charge_edges.size == charge_bins + 2
    assert np.all(np.diff(pat.charge_edges) >= 0.0)


@pytest.mark.parametrize("scale", ["log", "linear"])
def test_polarities_land_in_their_own_columns(random_events, scale):
    # common practice: negative charges in the negative half of the charge axis, positive in the positive half
    pat = pattern(random_events, 36, 20, scale)
    m = 10
    q = random_events.charge
    assert pat.counts[:, :m].sum() == np.count_nonzero(q < 0)
    assert pat.counts[:, m:].sum() == np.count_nonzero(q > 0)


@pytest.mark.parametrize("scale", ["log", "linear"])
def test_each_event_lies_inside_its_bin_limits(random_events, scale):
    # independent recount with the documented rule: magnitude bins [a, b), top bin closed, mirrored columns
    pat = pattern(random_events, 12, 10, scale)
    m = 5
    me, pe = pat.magnitude_edges, pat.phase_edges_deg
    brute = np.zeros_like(pat.counts)
    for ph, q in zip(random_events.phase_deg, random_events.charge, strict=True):
        if q == 0.0:
            continue
        i = int(ph // 30.0)
        k = min(int(np.flatnonzero(me <= abs(q))[-1]), m - 1)
        col = m + k if q > 0 else m - 1 - k
        assert pat.bin_lower[col] <= q <= pat.bin_upper[col]
        brute[i, col] += 1
    assert np.array_equal(brute, pat.counts)
    np.testing.assert_allclose(pe, np.arange(0.0, 361.0, 30.0))


def test_hand_made_pattern_positions(make_events):
    # hand-counted: linear axis 0..4 pC in 2 bins per polarity (edges 0, 2, 4 pC), 4 phase bins of 90 deg
    ev = make_events([10.0, 100.0, 200.0, 350.0, 95.0], [1e-12, -3e-12, -1e-12, 4e-12, 0.0], cycles=2.0)
    pat = pattern(ev, phase_bins=4, charge_bins=4, charge_scale="linear", per_cycle=True)
    expected = np.zeros((4, 4), dtype=int)
    expected[0, 2] = 1  # +1 pC at 10 deg: positive, 0-2 pC
    expected[1, 0] = 1  # -3 pC at 100 deg: negative, 2-4 pC (most negative column first)
    expected[2, 1] = 1  # -1 pC at 200 deg: negative, 0-2 pC
    expected[3, 3] = 1  # +4 pC at 350 deg: top edge included
    assert np.array_equal(pat.counts, expected)
    assert pat.zero_count == 1
    np.testing.assert_allclose(pat.magnitude_edges, [0.0, 2e-12, 4e-12])
    np.testing.assert_allclose(pat.values, expected / 2.0)  # per cycle: 2 cycles observed
    np.testing.assert_allclose(pat.charge_centres, [-3e-12, -1e-12, 1e-12, 3e-12])
    np.testing.assert_allclose(pat.phase_centres_deg, [45.0, 135.0, 225.0, 315.0])
    x, y, z = pat.mesh()  # mesh layout: one zero row between the polarities, rows follow charge_edges
    assert z.shape == (5, 4) and x.size == 5 and y.size == 6
    np.testing.assert_allclose(z[:, 0], [0.0, 0.0, 0.0, 0.5, 0.0])
    np.testing.assert_allclose(z[2], 0.0)


def test_log_axis_is_symmetric_and_geometric(make_events):
    # symmetric signed log bins: mirrored geometric edges, 1 pC .. 1 nC in 3 decades per polarity
    ev = make_events([10.0, 200.0], [1e-12, -1e-9])
    pat = pattern(ev, 2, 6, "log")
    np.testing.assert_allclose(pat.magnitude_edges, [1e-12, 1e-11, 1e-10, 1e-9], rtol=1e-12)
    np.testing.assert_allclose(pat.charge_edges_negative, [-1e-9, -1e-10, -1e-11, -1e-12], rtol=1e-12)
    assert pat.counts[0, 3] == 1  # +1 pC: smallest positive magnitude bin
    assert pat.counts[1, 0] == 1  # -1 nC: most negative bin
    np.testing.assert_allclose(pat.charge_centres[3], math.sqrt(1e-12 * 1e-11), rtol=1e-12)


def test_single_magnitude_log_axis_widened_half_a_decade(make_events):
    # documented rule: all magnitudes equal -> range q/sqrt(10) .. q*sqrt(10)
    ev = make_events([10.0, 200.0], [2e-12, -2e-12])
    pat = pattern(ev, 4, 2, "log")
    np.testing.assert_allclose(pat.magnitude_edges, [2e-12 / math.sqrt(10), 2e-12 * math.sqrt(10)])
    assert pat.total == 2


def test_explicit_range_counts_outside_events(make_events):
    # counting identity: counts + zero + outside = all events
    ev = make_events([1.0, 2.0, 3.0, 4.0], [1e-12, 5e-12, -20e-12, 0.0])
    pat = pattern(ev, 4, 4, "log", charge_range=(2e-12, 10e-12))
    assert pat.total == 1 and pat.outside_count == 2 and pat.zero_count == 1


def test_empty_events_need_a_range():
    ev = Events(phase_deg=[], charge=[], frequency=50.0, cycles=10.0)
    with pytest.raises(InputError, match="charge_range"):
        pattern(ev)
    pat = pattern(ev, 4, 4, "linear", charge_range=(0.0, 1e-12))
    assert pat.total == 0


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(
    st.lists(
        st.tuples(
            st.floats(0.0, 359.999, allow_nan=False),
            st.floats(1e-15, 1e-8, allow_nan=False),
            st.booleans(),
        ),
        min_size=1,
        max_size=40,
    ),
    st.sampled_from(["log", "linear"]),
    st.integers(1, 50),
    st.integers(1, 25),
)
def test_counted_once_property(make_events, rows, scale, nphase, half_bins):
    # counting identity (common practice): sum of counts equals the number of nonzero events
    phase = [r[0] for r in rows]
    charge = [r[1] if r[2] else -r[1] for r in rows]
    ev = make_events(phase, charge)
    pat = pattern(ev, nphase, 2 * half_bins, scale)
    assert pat.total == len(rows)
    assert pat.outside_count == 0


def test_half_cycle_distributions_hand_made(make_events):
    # hand-computed H_n, H_qn, H_qmax for 3 windows of 60 deg per half (definitions: physics brief section 10)
    ev = make_events(
        [10.0, 20.0, 70.0, 190.0, 300.0, 310.0, 359.0, 40.0],
        [1e-12, -3e-12, 2e-12, -4e-12, 1e-12, 5e-12, -2e-12, 0.0],
    )
    d = half_cycle_distributions(ev, phase_windows=3)
    np.testing.assert_allclose(d.window_centres_deg, [30.0, 90.0, 150.0])
    np.testing.assert_array_equal(d.n_plus, [2, 1, 0])
    np.testing.assert_allclose(d.qn_plus, [2e-12, 2e-12, 0.0])
    np.testing.assert_allclose(d.qmax_plus, [3e-12, 2e-12, 0.0])
    # "-" half re-referenced: 10, 120, 130, 179 deg
    np.testing.assert_array_equal(d.n_minus, [1, 0, 3])
    np.testing.assert_allclose(d.qn_minus, [4e-12, 0.0, 8e-12 / 3])
    np.testing.assert_allclose(d.qmax_minus, [4e-12, 0.0, 5e-12])
    np.testing.assert_array_equal(d.get("H_n", "-"), d.n_minus)


def test_magnitude_distribution_splits_halves(random_events):
    # counting identity: H(q) of both halves holds every nonzero event
    h = magnitude_distribution(random_events, bins=20, scale="log")
    assert h.count_plus.sum() + h.count_minus.sum() == np.count_nonzero(random_events.charge)
    nz = random_events.charge != 0
    assert h.count_plus.sum() == np.count_nonzero(nz & (random_events.phase_deg < 180.0))
    lin = magnitude_distribution(random_events, bins=20, scale="linear", charge_range=(0.0, 1e-11))
    assert lin.outside_count == np.count_nonzero(np.abs(random_events.charge) > 1e-11)
    assert lin.centres.size == 20


@pytest.mark.parametrize(
    "kwargs",
    [
        {"phase_bins": 0},
        {"phase_bins": 2.5},
        {"phase_bins": True},
        {"charge_bins": 3},
        {"charge_bins": 0},
        {"charge_scale": "ln"},
        {"charge_range": (0.0, 1e-12)},  # log axis needs low > 0
        {"charge_range": (2e-12, 1e-12)},
        {"charge_range": (math.nan, 1e-12)},
        {"charge_range": (1e-12,)},
        {"charge_range": "1 pC"},
        {"per_cycle": 1},
    ],
)
def test_pattern_bad_input(random_events, kwargs):
    with pytest.raises(InputError):
        pattern(random_events, **kwargs)


def test_bad_event_input(make_events):
    for bad in (None, [1.0, 2.0], "events", {"charge": [1.0]}):
        with pytest.raises(InputError):
            pattern(bad)
        with pytest.raises(InputError):
            half_cycle_distributions(bad)
    with pytest.raises(InputError):
        make_events([10.0, math.nan], [1e-12, 1e-12])
    with pytest.raises(InputError):
        make_events([10.0], [math.inf])


def test_half_cycle_and_distribution_bad_options(random_events):
    with pytest.raises(InputError):
        half_cycle_distributions(random_events, phase_windows=0)
    with pytest.raises(InputError):
        half_cycle_distributions(random_events).get("H_q", "+")
    with pytest.raises(InputError):
        magnitude_distribution(random_events, bins=0)
    with pytest.raises(InputError):
        magnitude_distribution(random_events, scale="exp")
