"""Behaviour of the wall-memory model against published trends, at fixed seeds, on invented scenarios (a 1.5 mm
spherical air void in a 6 mm slab, εr 4.2, at 2 × U_inc).

Sources of the expectations: in a lag-free, decay-free model the pattern per cycle does not depend on the
frequency, which enters only through the time scale (physics brief §1.4 and §5, derived); a frequency dependence
needs a finite electron supply or a charge decay (Forssén & Edin 2008 as summarised in the physics brief §5, from
memory: more and smaller discharges per cycle at low frequency, fewer and larger at high frequency).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

import pdvoid


def _scenario(model, frequency=50.0, ratio=2.0):
    sc = pdvoid.Scenario(insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
                         void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3),
                         supply=pdvoid.Sine(rms=10e3, frequency=frequency), model=model)
    u_inc = pdvoid.compute_coefficients(sc).inception_voltage
    return sc.replace(**{"supply.rms": ratio * u_inc})


def _per_cycle(model, frequency, cycles=400, seed=2):
    return pdvoid.simulate(_scenario(model, frequency), cycles=cycles, seed=seed)


def test_lag_free_decay_free_pattern_is_the_same_at_every_frequency():
    m = pdvoid.MemoryModel(ionization_rate=1e9, lag_free=True, charge_decay_time=math.inf)
    runs = [_per_cycle(m, f) for f in (5.0, 50.0, 500.0)]
    assert runs[0].event_count > 1000
    for r in runs[1:]:
        # the same discharges at the same phases with the same charges (time only rescaled; derived)
        assert r.event_count == runs[0].event_count
        np.testing.assert_allclose(r.events.phase_deg, runs[0].events.phase_deg, atol=1e-6)
        np.testing.assert_allclose(r.charge, runs[0].charge, rtol=1e-9)


def test_finite_supply_makes_the_pattern_depend_on_frequency():
    # a finite supply (statistical lag) without decay: the lag is a larger fraction of the period at high
    # frequency, so fewer but larger discharges per cycle (Forssén & Edin trend, from memory)
    m = pdvoid.MemoryModel(ionization_rate=1e9, charge_decay_time=math.inf)
    low, high = _per_cycle(m, 5.0), _per_cycle(m, 500.0)
    assert low.event_count > 1.5 * high.event_count
    assert np.abs(high.charge).mean() > 1.2 * np.abs(low.charge).mean()


def test_charge_decay_alone_makes_the_count_depend_on_frequency():
    # lag-free with the set's 0.1 s decay of the wall charge: at 5 Hz the charge decays by exp(-2) per cycle, at
    # 500 Hz by exp(-0.02), so the wall field left by the last discharge differs and with it the count
    m = pdvoid.MemoryModel(ionization_rate=1e9, lag_free=True)
    low, high = _per_cycle(m, 5.0), _per_cycle(m, 500.0)
    assert abs(low.event_count - high.event_count) > 0.03 * high.event_count


@pytest.mark.parametrize("ratio", [1.5, 2.0, 3.0])
def test_magnitudes_are_broad_with_a_finite_weibull_shape(ratio):
    # two-parameter Weibull fit of |q| (scipy.stats.weibull_min, location 0): a sharp lower edge at one charge
    # would give a very large shape; β near 1 would be an exponential-like spread. Fitted shapes of cavity
    # discharges are recalled between about 2 and 10 (Cacciari, Contin & Montanari 1995 and related work, from
    # memory, not confirmed); the tables of benchmarks/pattern_tables.py report β beside that range.
    res = pdvoid.simulate(_scenario(pdvoid.MemoryModel(ionization_rate=1e9), ratio=ratio), cycles=1000, seed=1)
    q = np.abs(res.charge)
    beta = stats.weibull_min.fit(q / q.mean(), floc=0.0)[0]
    assert q.size > 1000
    assert 1.5 < beta < 10.0
    assert np.percentile(q, 95) / np.percentile(q, 5) > 1.5
