"""Volume start electrons by detachment from negative ions in the wall-memory model (model.volume_detachment).

Oracle for the time-rescaling test, derived independently of the kernel (which draws the ion count itself): with
ions born at rate S, lost at rate 1/τ and each starting a discharge at the hazard h(E) = ν_d(E)·(1 − η/α) above
inception, the ion count is a Poisson population; given no discharge since the last one, the expected count m obeys
dm/dt = S − m/τ − h·m (thinning of a Poisson population), and the discharge intensity given the event history is
h·m. Its integral between consecutive discharges, Λ_i, is Exp(1) by the time-rescaling theorem (Brown et al. 2002).
h comes from pdvoid.physics.detachment (the published fits); m is integrated exactly step by step on a fine grid.
Scenarios are invented test cases; the wall emission is switched off by deep traps (2.5 eV: ~1e-29 /s per
electron).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import optimize, stats

import pdvoid
from pdvoid.physics.detachment import avalanche_start_probability, detachment_frequency_air

KB = 1.380649e-23  # CODATA 2018, exact


def _scenario(**model):
    kw = {"volume_detachment": True, "trap_depth": 2.5, "ionization_rate": 5.7e11, "ion_lifetime": 1e-3,
          **model}
    return pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
        void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3),
        supply=pdvoid.Sine(rms=18e3, frequency=50.0), model=pdvoid.MemoryModel(**kw))


def _rescaled(res, sc):
    c = pdvoid.compute_coefficients(sc)
    g = c.field_enhancement / sc.insulation.thickness
    amp = math.sqrt(2.0) * sc.supply.rms
    w = 2 * math.pi * sc.supply.frequency
    e_inc = c.inception_field
    p, temp = sc.void.gas_pressure, sc.void.temperature
    src = c.volume_electron_rate  # ion pairs per second in the void
    tau = sc.model.ion_lifetime
    tau_q = sc.model.charge_decay_time
    out = []
    t_prev, xq, m = 0.0, 0.0, 0.0
    for i in range(res.charge.size):
        t_end = res.time[i]

        def x_of(t, t_prev=t_prev, xq=xq):
            return g * amp * np.sin(w * t) + xq * np.exp(-(t - t_prev) / tau_q)

        # windows where |x| >= E_inc: sign changes of |x| − E_inc on a fine grid, refined by brentq
        grid = np.linspace(t_prev, t_end, max(200, int((t_end - t_prev) * w * 200)))
        f = np.abs(x_of(grid)) - e_inc
        cuts = [t_prev]
        for k in np.nonzero(np.sign(f[:-1]) != np.sign(f[1:]))[0]:
            cuts.append(optimize.brentq(lambda t: abs(x_of(t)) - e_inc, grid[k], grid[k + 1], xtol=1e-15))
        cuts.append(t_end)
        lam = 0.0
        for a, b in zip(cuts[:-1], cuts[1:], strict=True):
            if b <= a:
                continue
            if abs(x_of(0.5 * (a + b))) < e_inc:
                m = src * tau + (m - src * tau) * math.exp(-(b - a) / tau)  # no hazard below inception
                continue

            # dm/dt = S − r·m with r = 1/τ + h, solved exactly on each step of a geometric grid with h taken at
            # the step's midpoint (the grid resolves the nanosecond depletion of the stored ions at the window start)
            t = a + np.concatenate(([0.0], np.geomspace(min(1e-13, (b - a) / 10), b - a, 3000)))
            dt = np.diff(t)
            e = np.abs(x_of(0.5 * (t[1:] + t[:-1])))
            h = detachment_frequency_air(e, p, temp) * avalanche_start_probability(e, p, temp)
            r = 1.0 / tau + h
            m_star = src / r
            decay = np.exp(-r * dt)
            for k in range(dt.size):
                lam += h[k] * (m_star[k] * dt[k] + (m - m_star[k]) * (1.0 - decay[k]) / r[k])
                m = m_star[k] + (m - m_star[k]) * decay[k]
        if i > 0:
            out.append(lam)
        # a discharge sweeps the ions; the wall field after it
        m = 0.0
        t_prev = t_end
        xq = res.field_after[i] - g * res.voltage[i]
    return np.array(out)


def test_time_rescaling_of_the_detachment_hazard_gives_unit_exponentials():
    sc = _scenario()
    lam = np.concatenate([_rescaled(pdvoid.simulate(sc, cycles=150, seed=seed), sc) for seed in (1, 2, 3)])
    assert lam.size >= 1000
    # time-rescaling theorem (Brown et al. 2002): Λ_i ~ Exp(1); KS test (scipy.stats.kstest) at three fixed seeds pooled
    assert stats.kstest(lam, "expon").pvalue > 0.01
    assert lam.mean() == pytest.approx(1.0, abs=4.0 / math.sqrt(lam.size))


def test_stored_ions_shorten_the_lag_against_a_constant_supply_of_the_same_ion_pairs():
    # with ions stored between discharges the first start electron comes at or just after inception far more
    # often than with the same ion pairs as a constant rate of free electrons (expected from the store: the
    # probability of at least one stored ion is 1 − exp(−S·τ) = 0.63 here, derived)
    det = pdvoid.simulate(_scenario(), cycles=200, seed=3)
    const = pdvoid.simulate(_scenario(volume_detachment=False), cycles=200, seed=3)
    c = pdvoid.compute_coefficients(_scenario())

    def over(res):
        return np.abs(res.field_before) / c.inception_field

    assert np.median(over(det)) < np.median(over(const))


def test_detachment_is_refused_for_another_gas_and_bad_lifetimes():
    with pytest.raises(pdvoid.InputError, match="ion_lifetime"):
        pdvoid.MemoryModel(volume_detachment=True, ion_lifetime=0.0)
    with pytest.raises(pdvoid.InputError, match="volume_detachment"):
        pdvoid.MemoryModel(volume_detachment=1)
    sc = pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
        void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3, gas="nitrogen"),
        supply=pdvoid.Sine(rms=18e3), model=pdvoid.MemoryModel(volume_detachment=True, stability_field=4e5))
    with pytest.raises(pdvoid.InputError, match="air"):
        pdvoid.simulate(sc, cycles=2, seed=1)


def test_cite_names_the_detachment_sources():
    res = pdvoid.simulate(_scenario(), cycles=2, seed=1)
    text = pdvoid.cite(res)
    for key in ("kossyi1992", "morrow1997"):
        assert key in text
