"""discharge_regime: below inception, waiting for a start electron, discharging; the expected first wait."""

from __future__ import annotations

import math

import numpy as np
import pytest

import pdvoid
from pdvoid.analysis.regime import REGIME_STATES, discharge_regime, fraction_of_sine_above
from pdvoid.core.errors import InputError


def _scenario(rms=18e3, ionization_rate=1e7, supply=None, **model):
    # invented test case: a 1.5 mm spherical air void in 6 mm of insulation, inception near 13.2 kV rms
    return pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
        void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3),
        supply=supply if supply is not None else pdvoid.Sine(rms=rms, frequency=50.0),
        model=pdvoid.FieldModel(ionization_rate=ionization_rate, **model),
    )


@pytest.mark.parametrize("x", [0.0, 0.3, 0.5, math.sqrt(0.5), 0.9, 1.0])
def test_fraction_of_sine_above_a_level(x):
    # |sin θ| >= x on [asin x, π − asin x] in each half period: 1 − (2/π)·asin(x) (textbook trigonometry)
    expected = 1.0 - 2.0 / math.pi * math.asin(x)
    assert fraction_of_sine_above(x) == pytest.approx(expected, abs=1e-15)
    # and against counting a fine grid of the sine (hand calculation)
    theta = (np.arange(200000) + 0.5) / 200000 * 2.0 * math.pi
    assert fraction_of_sine_above(x) == pytest.approx(np.mean(np.abs(np.sin(theta)) >= x), abs=1e-4)
    assert fraction_of_sine_above(0.5) == pytest.approx(2.0 / 3.0, abs=1e-15)  # asin(1/2) = π/6 (textbook)


def test_fraction_of_sine_above_rejects_bad_levels():
    assert fraction_of_sine_above(1.5) == 0.0
    with pytest.raises(InputError, match="level"):
        fraction_of_sine_above(-0.1)


def test_wait_and_95_percent_cycles_follow_the_exponential_law():
    sc = _scenario(ionization_rate=3e8)
    c = pdvoid.compute_coefficients(sc)
    r = discharge_regime(sc)
    assert r.state == "waiting for a start electron" and r.state in REGIME_STATES
    # hand calculation: fraction of the period above inception for a sine, 1 − (2/π)·asin(U_inc/U)
    frac = 1.0 - 2.0 / math.pi * math.asin(c.inception_voltage / 18e3)
    assert r.fraction_above_inception == pytest.approx(frac, rel=1e-9)
    # hazard per cycle N_vol·frac·T (no surface emission before the first discharge; centred void, no cathode
    # emission): mean wait 1/H cycles, 95 % of first discharges within −ln(0.05)·mean (exponential law)
    mean_cycles = 1.0 / (c.volume_electron_rate * frac / 50.0)
    assert r.start_electron_rate == pytest.approx(c.volume_electron_rate, rel=1e-12)
    assert r.mean_wait_cycles == pytest.approx(mean_cycles, rel=1e-9)
    assert r.mean_wait == pytest.approx(mean_cycles / 50.0, rel=1e-9)
    assert r.cycles_for_95_percent == pytest.approx(-math.log(0.05) * mean_cycles, rel=1e-9)
    assert "waiting for a start electron" in r.text and "95 %" in r.text


def test_sampled_sine_gives_the_closed_form_wait():
    # the grid path (any waveform) against the closed form of a pure sine (same waveform as samples)
    samples = math.sqrt(2.0) * 18e3 * np.sin(2 * np.pi * np.arange(256) / 256)
    sine = discharge_regime(_scenario(ionization_rate=3e8))
    grid = discharge_regime(_scenario(ionization_rate=3e8, supply=pdvoid.Periodic(samples=samples, frequency=50.0)))
    assert grid.fraction_above_inception == pytest.approx(sine.fraction_above_inception, abs=2e-4)
    assert grid.mean_wait_cycles == pytest.approx(sine.mean_wait_cycles, rel=1e-3)


def test_below_inception():
    r = discharge_regime(_scenario(rms=5e3))
    assert r.state == "below inception"
    assert r.fraction_above_inception == 0.0 and r.mean_wait == math.inf
    c = pdvoid.compute_coefficients(_scenario(rms=5e3))
    assert r.voltage_ratio == pytest.approx(5e3 / c.inception_voltage, rel=1e-9)  # hand calculation
    assert r.text.startswith("below inception")
    res = pdvoid.simulate(_scenario(rms=5e3), 20, 0)
    assert discharge_regime(res.scenario, res).state == "below inception"


def test_lag_free_has_no_wait():
    r = discharge_regime(_scenario(lag_free=True))
    assert r.state == "discharging"
    assert (r.mean_wait, r.mean_wait_cycles, r.cycles_for_95_percent) == (0.0, 0.0, 0.0)
    assert "lag-free" in r.text


def test_a_result_decides_between_waiting_and_discharging():
    sc = _scenario()  # natural background ionisation: a mean wait of thousands of cycles
    empty = pdvoid.simulate(sc, 50, 0)
    assert empty.event_count == 0
    r = discharge_regime(sc, empty)
    assert r.state == "waiting for a start electron"
    # exp(−cycles/mean) for an empty run (Poisson, hand calculation)
    assert r.probability_of_no_discharge == pytest.approx(math.exp(-50 / r.mean_wait_cycles), rel=1e-12)
    assert "no discharge in the 1 s simulated" in r.text
    fast = _scenario(ionization_rate=1e10)
    res = pdvoid.simulate(fast, 50, 0)
    r = discharge_regime(fast, res)
    assert r.state == "discharging" and r.first_discharge_time == res.time[0]
    assert "first discharge after" in r.text
    with pytest.raises(InputError, match="another scenario"):
        discharge_regime(sc, res)
    with pytest.raises(InputError, match="Result"):
        discharge_regime(sc, "run")  # type: ignore[arg-type]  # the wrong type on purpose


SEEDS = list(range(24))


def test_simulated_first_discharges_follow_the_predicted_distribution():
    # fixed seed list; the kernel's first-discharge cycle against the predicted exponential law
    sc = _scenario(ionization_rate=3e8)
    r = discharge_regime(sc)
    firsts = []
    for seed in SEEDS:
        res = pdvoid.simulate(sc, 3000, seed, histogram=True)
        firsts.append(res.first_discharge_time * 50.0)  # in cycles
    firsts = np.array(firsts)
    assert np.all(np.isfinite(firsts))
    # the exposure before the first discharge is exponential with mean 1/H cycles; the first discharge lies
    # within its cycle, so its time in cycles is that exposure plus up to one cycle: mean 1/H + about 0.5,
    # standard error mean/√n (exponential law); 4 standard errors
    se = r.mean_wait_cycles / math.sqrt(len(SEEDS))
    assert abs(firsts.mean() - (r.mean_wait_cycles + 0.5)) < 4.0 * se
    # the 95 % bound: more than 19 of 24 inside it (binomial with p = 0.95, P(X <= 19) ≈ 0.006; hand calculation)
    assert np.count_nonzero(firsts <= r.cycles_for_95_percent + 1.0) >= 20
    # and the median of an exponential law is ln 2·mean (textbook); loose bounds
    assert 0.4 * r.mean_wait_cycles < np.median(firsts) < 1.1 * r.mean_wait_cycles
