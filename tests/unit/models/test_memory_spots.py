"""Discharge spots of flat voids in the wall-memory model (model.discharge_spots, spot_ratio).

Expected values by hand: the spot count floor((D/(k·h))²); with a lag-free, scatter-free model every spot is the
whole void scaled by 1/n, so its discharges come at the whole void's times with 1/n of its charge (the model's
definition: independent spots sharing the charge per field drop). Scenarios are invented test cases.
"""

from __future__ import annotations

import warnings

import numpy as np
import pytest

import pdvoid


def _flat(diameter, height=0.3e-3, ratio=1.5, **model):
    m = pdvoid.MemoryModel(**{"ionization_rate": 1e9, "discharge_spots": True, **model})
    sc = pdvoid.Scenario(insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
                         void=pdvoid.Void(diameter=diameter, height=height), supply=pdvoid.Sine(rms=1.0), model=m)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", pdvoid.ValidityWarning)
        u_inc = pdvoid.compute_coefficients(sc).inception_voltage
    return sc.replace(**{"supply.rms": ratio * u_inc})


def _run(sc, **kw):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", pdvoid.ValidityWarning)
        return pdvoid.simulate(sc, **kw)


def test_spot_count_by_hand():
    m = pdvoid.MemoryModel(discharge_spots=True)
    assert m.spot_count(6e-3, 0.3e-3) == 100  # (6/(2·0.3))² = 100
    assert m.spot_count(2e-3, 0.3e-3) == 11  # (2/0.6)² = 11.1
    assert m.spot_count(1e-3, 1e-3) == 1  # the spot is wider than the void
    assert pdvoid.MemoryModel().spot_count(6e-3, 0.3e-3) == 1  # spots off: the whole void
    assert pdvoid.MemoryModel(discharge_spots=True, spot_ratio=4.0).spot_count(6e-3, 0.3e-3) == 25


def test_magnitudes_of_wide_flat_voids_grow_much_less_than_the_area():
    # D from 2 to 6 mm at 0.3 mm height: D² grows 9-fold; the whole-void discharge grows with it, a spot does not
    whole = {d: _run(_flat(d, discharge_spots=False), cycles=300, seed=1) for d in (2e-3, 6e-3)}
    spots = {d: _run(_flat(d), cycles=300, seed=1) for d in (2e-3, 6e-3)}
    for runs in (whole, spots):
        assert all(r.event_count > 100 for r in runs.values())
    growth_whole = np.abs(whole[6e-3].charge).mean() / np.abs(whole[2e-3].charge).mean()
    growth_spots = np.abs(spots[6e-3].charge).mean() / np.abs(spots[2e-3].charge).mean()
    assert growth_whole > 5.0
    assert growth_spots < 1.5


def test_lag_free_spots_are_the_whole_void_scaled():
    # lag-free and no scatter: each of the n spots discharges at the whole void's times with 1/n of its charge
    kw = {"lag_free": True, "residual_scatter": 0.0, "charge_decay_time": 0.05}
    whole = _run(_flat(2e-3, discharge_spots=False, **kw), cycles=20, seed=1)
    sc = _flat(2e-3, **kw)
    n = sc.model.spot_count(2e-3, 0.3e-3)
    spots = _run(sc, cycles=20, seed=1)
    assert n == 11 and whole.event_count > 20
    assert spots.event_count == n * whole.event_count
    np.testing.assert_allclose(spots.time.reshape(-1, n), np.repeat(whole.time[:, None], n, axis=1), rtol=1e-13)
    np.testing.assert_allclose(spots.charge.reshape(-1, n) * n, np.repeat(whole.charge[:, None], n, axis=1),
                               rtol=1e-9)


def test_one_spot_is_the_whole_void_bit_for_bit():
    a = _run(_flat(1e-3, height=0.6e-3, discharge_spots=False, ionization_rate=1e11), cycles=100, seed=4)
    # a spot of 1.2 mm is wider than the 1 mm void: n = 1
    b = _run(_flat(1e-3, height=0.6e-3, ionization_rate=1e11), cycles=100, seed=4)
    assert a.event_count > 50
    np.testing.assert_array_equal(a.time, b.time)
    np.testing.assert_array_equal(a.charge, b.charge)


def test_spotted_void_is_the_same_in_chunks_with_events_in_time_order():
    sc = _flat(3e-3, ionization_rate=1e11)
    a = _run(sc, cycles=60, seed=8)
    b = _run(sc, cycles=60, seed=8, chunk_cycles=7)
    h = _run(sc, cycles=60, seed=8, histogram=True)
    assert a.event_count > 50
    np.testing.assert_array_equal(a.time, b.time)
    np.testing.assert_array_equal(a.charge, b.charge)
    assert np.all(np.diff(a.time) >= 0.0)
    assert h.event_count == a.event_count
    assert h.first_discharge_time == a.time[0]


@pytest.mark.parametrize(("kwargs", "match"), [({"spot_ratio": 0.1}, "spot_ratio"),
                                               ({"discharge_spots": "yes"}, "discharge_spots")])
def test_bad_spot_parameters_are_refused(kwargs, match):
    with pytest.raises(pdvoid.InputError, match=match):
        pdvoid.MemoryModel(**kwargs)


def test_too_many_spots_are_refused_before_the_run():
    sc = _flat(6e-3, height=0.1e-3, spot_ratio=0.5)  # (6/0.05)² = 14400 spots
    with pytest.raises(pdvoid.InputError, match="spot_ratio"):
        _run(sc, cycles=2, seed=1)
