"""The per-cycle event bound grows with need: charge decay much faster than the period (slow supplies) makes a
void recharge many times per cycle, and the simulation must follow rather than fail."""

from __future__ import annotations

import numpy as np
import pytest

import pdvoid
from pdvoid.models.protocol import kernel_arguments


@pytest.mark.parametrize(("frequency", "decay_time"), [(0.1, 10e-3), (0.01, 10e-3), (0.01, 1e-3), (50.0, 1e-4)])
def test_slow_supply_with_fast_charge_decay_runs(demo, frequency, decay_time):
    sc = demo.replace(**{"supply.frequency": frequency, "model.charge_decay_time": decay_time,
                         "model.lag_free": True})
    res = pdvoid.simulate(sc, cycles=2, seed=3)
    assert res.cycles == 2 and res.event_count > 0
    # the bound is an upper bound of what happened in every cycle (its derivation: total travel of the void
    # quantity over a period divided by the smallest travel between two discharges)
    per_cycle = np.bincount(res.events.cycle.astype(int), minlength=2)
    assert per_cycle.max() <= kernel_arguments(sc).max_events_per_cycle(1.0)


def test_recharging_count_follows_the_decay_time(demo):
    # lag-free, quasi-static half cycle: after each discharge the deposited field decays towards zero with tau_q
    # and the void discharges again when |E| climbs back to E_inc; halving tau_q about doubles the discharges per
    # cycle when tau_q is far below the period (hand argument: the recharge interval is proportional to tau_q)
    base = {"supply.frequency": 0.01, "model.lag_free": True}
    n1 = pdvoid.simulate(demo.replace(**base, **{"model.charge_decay_time": 20e-3}), cycles=1, seed=0).event_count
    n2 = pdvoid.simulate(demo.replace(**base, **{"model.charge_decay_time": 10e-3}), cycles=1, seed=0).event_count
    assert n2 / n1 == pytest.approx(2.0, rel=0.05)
