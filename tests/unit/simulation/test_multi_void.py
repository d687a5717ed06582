"""The superposed record of several independent voids (pdvoid.simulate_voids)."""

from __future__ import annotations

import numpy as np
import pytest

import pdvoid
from pdvoid.simulation.multi_void import void_seeds

INS = pdvoid.Insulation(thickness=6e-3, permittivity=4.0)
SUPPLY = pdvoid.Sine(rms=18e3)
MODEL = pdvoid.FieldModel(ionization_rate=1e9, surface_rate_same=1e4, surface_rate_reversed=3e3)
SMALL = pdvoid.Void(diameter=0.8e-3, height=1e-3)
LARGE = pdvoid.Void(diameter=2e-3, height=1e-3, gas="nitrogen")


def multi(*voids):
    return pdvoid.MultiVoidScenario(insulation=INS, voids=voids, supply=SUPPLY, model=MODEL)


def test_one_void_gives_the_one_void_simulation_bit_for_bit():
    m = multi(SMALL)
    a = pdvoid.simulate(m.scenario(0), cycles=300, seed=17)
    b = pdvoid.simulate_voids(m, cycles=300, seed=17)
    for name in ("time", "phase_deg", "cycle", "charge", "voltage", "field_before", "field_after"):
        assert np.array_equal(getattr(a.events, name), getattr(b.events, name)), name
    assert b.seeds == (17,) and np.all(b.void_index == 0)


def test_seeds_follow_the_documented_derivation():
    # void 0: the master seed; void k >= 1: the first 32-bit word of SeedSequence([seed, k]) (numpy's own)
    expected = (5, *(int(np.random.SeedSequence([5, k]).generate_state(1, dtype=np.uint32)[0]) for k in (1, 2)))
    assert void_seeds(5, 3) == expected
    assert len(set(void_seeds(0, 50))) == 50  # distinct streams


def test_two_voids_are_the_union_of_their_own_runs_merged_by_time():
    m = multi(SMALL, LARGE)
    r = pdvoid.simulate_voids(m, cycles=400, seed=3)
    seeds = void_seeds(3, 2)
    # independent path: each void alone through the ordinary one-void simulate with its own seed
    alone = [pdvoid.simulate(m.scenario(i), cycles=400, seed=seeds[i]) for i in range(2)]
    assert r.counts_per_void == tuple(a.event_count for a in alone) and all(c > 50 for c in r.counts_per_void)
    assert r.event_count == r.events.count == sum(a.events.count for a in alone)
    assert np.all(np.diff(r.time) >= 0.0)
    for i, a in enumerate(alone):
        mine = r.void_index == i
        assert np.array_equal(r.time[mine], a.time) and np.array_equal(r.charge[mine], a.charge)
    # the larger void discharges with larger magnitudes (charge per field grows with the void's size)
    assert np.median(np.abs(r.charge[r.void_index == 1])) > 2 * np.median(np.abs(r.charge[r.void_index == 0]))
    assert r.events.cycles == 400.0 and r.duration == pytest.approx(400 / 50.0)


def test_same_seed_same_record_other_seed_other_record():
    m = multi(SMALL, LARGE)
    a, b = pdvoid.simulate_voids(m, 200, seed=9), pdvoid.simulate_voids(m, 200, seed=9)
    c = pdvoid.simulate_voids(m, 200, seed=10)
    assert np.array_equal(a.time, b.time) and np.array_equal(a.void_index, b.void_index)
    assert not np.array_equal(a.time, c.time)


def test_a_void_below_inception_adds_nothing():
    tiny = pdvoid.Void(diameter=0.05e-3, height=0.05e-3)  # analytic inception far above 18 kV in this slab
    assert pdvoid.inception(pdvoid.Scenario(insulation=INS, void=tiny, supply=SUPPLY)).inception_voltage > 30e3
    r = pdvoid.simulate_voids(multi(SMALL, tiny), 200, seed=1)
    assert r.counts_per_void[1] == 0 and np.all(r.void_index == 0)


def test_analysis_takes_the_superposed_record():
    r = pdvoid.simulate_voids(multi(SMALL, LARGE), 200, seed=2)
    q = pdvoid.iec60270(r)
    # IEC 60270 average current of the merged record: the sum of |q| over the reference time (clause 3)
    assert q.average_current == pytest.approx(np.sum(np.abs(r.charge)) / r.duration, rel=1e-12)


def test_bad_input_is_refused_before_work():
    m = multi(SMALL)
    with pytest.raises(pdvoid.InputError, match="MultiVoidScenario"):
        pdvoid.simulate_voids(m.scenario(0))
    with pytest.raises(pdvoid.InputError, match="cycles"):
        pdvoid.simulate_voids(m, cycles=0)
    with pytest.raises(pdvoid.InputError, match="seed"):
        pdvoid.simulate_voids(m, seed=-1)
