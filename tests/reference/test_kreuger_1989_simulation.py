"""The simulated lag-free three-capacitance void against the closed forms of its periodic steady state.

Source of the model: F. H. Kreuger, Partial Discharge Detection in High-Voltage Equipment (1989); E. Kuffel,
W. S. Zaengl, J. Kuffel, High Voltage Engineering: Fundamentals (2000), PD chapter (from memory for the
attribution). The closed forms — N = 4·floor((A − V_r)/(V_i − V_r)) and sin φ_j = (V_i + (j − 1 − n1)(V_i − V_r))/A
— are derived from that model under its assumptions (stiff source, lag-free, uncharged void at the rising zero
crossing; physics brief §1.4, derived) and transcribed per case in reference/kreuger_1989/lag_free_cases.toml.
"""

from __future__ import annotations

import math
import tomllib
from pathlib import Path

import numpy as np
import pytest

import pdvoid

CASES = tomllib.loads(
    (Path(__file__).parents[2] / "reference" / "kreuger_1989" / "lag_free_cases.toml").read_text()
)["case"]


def _network_scenario(peak, inception, residual, k=0.4, frequency=50.0):
    """A network-model scenario whose void voltages are the case's, scaled by V_i(gas)/inception."""
    c_b = 1e-13
    c_c = c_b * (1.0 / k - 1.0)
    base = pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.0),
        void=pdvoid.Void(diameter=2e-3, height=1e-3),
        supply=pdvoid.Sine(rms=10e3, frequency=frequency),
        model=pdvoid.NetworkModel(lag_free=True, residual_ratio=residual / inception, capacitance_void=c_c,
                                  capacitance_series=c_b),
    )
    c = pdvoid.compute_coefficients(base)
    v_i = c.inception_field * 1e-3  # void voltage at inception = E_inc · h
    scale = v_i / inception
    rms = peak * scale / (k * math.sqrt(2.0))
    return base.replace(**{"supply.rms": rms}), scale


@pytest.mark.parametrize("case", [c for c in CASES if c["per_cycle"] > 0], ids=lambda c: c["name"])
def test_discharges_per_cycle_and_steady_state_phases(case):
    sc, scale = _network_scenario(case["peak"], case["inception"], case["residual"])
    res = pdvoid.simulate(sc, cycles=40, seed=0)
    # count per cycle in windows that start at the peak (90°), where no steady-state discharge sits, so that a
    # discharge exactly at a zero crossing (sin φ = 0) is not split between two windows by rounding
    window = np.floor(res.time * sc.supply.frequency - 0.25).astype(int)
    counts = np.bincount(window[window >= 0], minlength=39)[:39]
    # periodic steady state after the first peak: exactly 4·n1 per cycle (Kreuger 1989 model, brief §1.4 derived)
    assert np.all(counts == case["per_cycle"])
    # first quarter holds n1 discharges (brief §1.4)
    assert np.sum(window < 0) == case["n1"]
    # steady-state phases: positive at asin(sines), negative 180° later (brief §1.4, derived); compared in the
    # same peak-anchored frame: phase measured from 90°
    expected_pos = np.degrees(np.arcsin(case["sines"]))
    expected = np.sort(np.concatenate([expected_pos, expected_pos + 180.0]) - 90.0) % 360.0
    got = np.sort((res.phase_deg[window == 20] - 90.0) % 360.0)
    assert got == pytest.approx(np.sort(expected), abs=1e-7)
    # apparent charge C_b·(V_i − V_r) for every steady-state discharge (three-capacitance model)
    q = np.abs(res.charge[res.cycle >= 1])
    assert q == pytest.approx(1e-13 * (case["inception"] - case["residual"]) * scale, rel=1e-9)


def test_below_inception_nothing_happens():
    case = next(c for c in CASES if c["per_cycle"] == 0)
    sc, _ = _network_scenario(case["peak"], case["inception"], case["residual"])
    assert pdvoid.simulate(sc, cycles=20, seed=0).event_count == 0


def test_frequency_independence_of_the_lag_free_count():
    # the count is independent of frequency in the idealised model (brief §1.4, derived)
    case = CASES[0]
    counts = []
    for f in (0.1, 50.0, 5000.0):
        sc, _ = _network_scenario(case["peak"], case["inception"], case["residual"], frequency=f)
        counts.append(pdvoid.simulate(sc, cycles=10, seed=0).event_count)
    assert counts[0] == counts[1] == counts[2]


def test_discharge_power_equals_dissipated_energy():
    # energy balance in the lag-free steady state: IEC 60270 P = f·Σ q·u equals N·f·W with
    # W = ½ (C_c + C_b)(V_i² − V_r²) (brief §1.3-1.4, derived from the three-capacitance model)
    case = CASES[0]
    sc, scale = _network_scenario(case["peak"], case["inception"], case["residual"])
    res = pdvoid.simulate(sc, cycles=30, seed=0)
    steady = res.cycle >= 1
    f = sc.supply.frequency
    p_iec = np.sum(res.charge[steady] * res.voltage[steady]) * f / 29
    c_b = 1e-13
    c_c = c_b * (1.0 / 0.4 - 1.0)
    v_i, v_r = case["inception"] * scale, case["residual"] * scale
    w = 0.5 * (c_c + c_b) * (v_i**2 - v_r**2)
    assert p_iec == pytest.approx(case["per_cycle"] * f * w, rel=1e-9)
