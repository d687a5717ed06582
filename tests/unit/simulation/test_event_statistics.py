"""Statistics of the start-electron supply: the kernel's event times against the time-rescaling theorem.

For a point process with conditional intensity λ(t), the integrated intensities between successive events are
independent Exp(1) variables (time-rescaling theorem: E. N. Brown, R. Barbieri, V. Ventura, R. E. Kass,
L. M. Frank, 'The time-rescaling theorem and its application to neural spike train data analysis', Neural
Computation 14 (2002) 325-346). The intensity is recomputed here, independently of the kernel, from the events'
own fields and voltages by dense quadrature, and the rescaled intervals are KS-tested (scipy.stats.kstest) at a
fixed seed.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

import pdvoid


def _scenario(rms=18e3, **model):
    return pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
        void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3),
        supply=pdvoid.Sine(rms=rms, frequency=50.0),
        model=pdvoid.FieldModel(**model),
    )


def _rescaled_intervals(res, sc, n_max=400, samples=4000):
    """Λ_i = ∫ λ(t) dt over (t_{i-1}, t_i], from the model's definition of λ (issue text / physics brief §3.3)."""
    c = pdvoid.compute_coefficients(sc)
    m = sc.model
    g = c.field_enhancement / sc.insulation.thickness
    amp = math.sqrt(2.0) * sc.supply.rms
    w = 2.0 * math.pi * sc.supply.frequency
    e_inc = c.inception_field
    out = []
    for i in range(1, min(res.charge.size, n_max)):
        t0, t1 = res.time[i - 1], res.time[i]
        xq = res.field_after[i - 1] - g * res.voltage[i - 1]
        last_pol = math.copysign(1.0, res.charge[i - 1])
        t = np.linspace(t0, t1, samples)
        x = g * amp * np.sin(w * t) + xq
        above = np.abs(x) >= e_inc
        pol = np.sign(x)
        ns = np.where(pol == last_pol, m.surface_rate_same, m.surface_rate_reversed)
        surf = ns * np.exp(-(t - t0) / m.surface_decay_time)
        if m.field_assisted:
            surf = surf * np.exp(np.abs(x) / e_inc)
        lam = np.where(above, c.volume_electron_rate + surf, 0.0)
        out.append(np.trapezoid(lam, t))
    return np.array(out)


@pytest.mark.parametrize(
    "model",
    [
        dict(ionization_rate=2e11, surface_rate_same=0.0, surface_rate_reversed=0.0),  # constant N (volume)
        dict(ionization_rate=1e8, surface_rate_same=1e4, surface_rate_reversed=3e3, surface_decay_time=20e-3),
        dict(ionization_rate=1e9, surface_rate_same=5e3, surface_rate_reversed=1.5e3, surface_decay_time=20e-3,
             field_assisted=True),
    ],
    ids=["constant", "surface-memory", "field-assisted"],
)
def test_time_rescaling_gives_unit_exponentials(model):
    sc = _scenario(**model)
    res = pdvoid.simulate(sc, cycles=300, seed=11)
    lam = _rescaled_intervals(res, sc)
    assert lam.size >= 150
    # time-rescaling theorem (Brown et al. 2002): Λ_i ~ Exp(1); KS test (scipy.stats.kstest) at a fixed seed
    assert stats.kstest(lam, "expon").pvalue > 0.01
    assert lam.mean() == pytest.approx(1.0, abs=4.0 / math.sqrt(lam.size))


def test_constant_rate_time_lag_is_exponential_with_mean_one_over_n():
    # with a constant start-electron rate N, the statistical time lag after the field reaches E_inc is
    # exponential with mean 1/N (Poisson process; physics brief §3.3). The window after each discharge opens when
    # the field, recovering from E_res, reaches ±E_inc again; that instant is solved here in closed form.
    sc = _scenario(ionization_rate=0.0, surface_rate_same=0.0, surface_rate_reversed=0.0)
    n_rate = 2000.0
    sc = sc.replace(**{"model.surface_rate_same": n_rate, "model.surface_rate_reversed": n_rate,
                       "model.surface_decay_time": math.inf, "model.ionization_rate": 5e11})
    res = pdvoid.simulate(sc, cycles=400, seed=5)
    c = pdvoid.compute_coefficients(sc)
    g = c.field_enhancement / sc.insulation.thickness
    amp = math.sqrt(2.0) * sc.supply.rms
    w = 2.0 * math.pi * sc.supply.frequency
    rate = n_rate + c.volume_electron_rate
    lags = []
    for i in range(1, res.charge.size):
        xq = res.field_after[i - 1] - g * res.voltage[i - 1]
        pol = math.copysign(1.0, res.charge[i])
        t_prev, t_i = res.time[i - 1], res.time[i]
        # roots of g·A·sin(wt) + xq = pol·E_inc in (t_prev, t_i]: take the last upward crossing into the window
        s = (pol * c.inception_field - xq) / (g * amp)
        if abs(s) > 1.0:
            continue
        base = math.asin(s)
        cands = []
        k0 = math.floor(w * t_prev / (2 * math.pi)) - 1
        for k in range(k0, k0 + 4):
            for ph in (base, math.pi - base):
                tc = (ph + 2 * math.pi * k) / w
                if t_prev < tc <= t_i:
                    cands.append(tc)
        if len(cands) != 1:
            continue  # the window opened more than once: skip (rare at this rate)
        lags.append(t_i - cands[0])
    lags = np.array(lags)
    assert lags.size > 300
    # KS test against Exp(mean 1/N) (scipy.stats.kstest); mean within 4 standard errors
    assert stats.kstest(lags, "expon", args=(0.0, 1.0 / rate)).pvalue > 0.01
    assert lags.mean() == pytest.approx(1.0 / rate, rel=4.0 / math.sqrt(lags.size))
