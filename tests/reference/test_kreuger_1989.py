"""Three-capacitance (a-b-c) network model: hand-worked examples (reference/kreuger_1989/source.toml).

The model is that of Kreuger (1989), Gemant & Philippoff (1932) and Kuffel, Zaengl & Kuffel (2000) (all from
memory); no table of those books is transcribed. Every expected value below is hand arithmetic on the
relations of the physics brief §1.2-1.4 (derived), written out in the comments. ε0 is written out (CODATA
2018) so the test does not depend on pdvoid.core.units.
"""

from __future__ import annotations

import math
import tomllib
from pathlib import Path

import numpy as np
import pytest

from pdvoid.physics.iec60270 import discharge_power
from pdvoid.physics.network import (
    apparent_charge,
    discharge_energy,
    flat_void_capacitances,
    lag_free_discharges_per_cycle,
    lag_free_phases_deg,
    void_voltage_ratio,
)

EPS0 = 8.8541878128e-12  # F/m, CODATA 2018
CASES = tomllib.loads(
    (Path(__file__).parents[2] / "reference" / "kreuger_1989" / "lag_free_cases.toml").read_text(
        encoding="utf-8"
    )
)["case"]

# Flat void example: D = 5 mm, t = 1 mm, d = 10 mm, εr = 4, A = 100 cm² = 1e-2 m².
#   S = π (5e-3)²/4 = 1.9634954084936207e-5 m²
D, T, THICK, ER, AREA = 5e-3, 1e-3, 10e-3, 4.0, 1e-2
S = math.pi * D**2 / 4


def test_flat_void_capacitances_hand_example():
    # Source: brief §1.2 (kreuger1989 model). C_c = ε0 S/t = 8.8541878128e-12·1.9634955e-5/1e-3
    #   = 1.7385157e-13 F
    #   C_b = εr ε0 S/(d − t) = 4·8.8541878128e-12·1.9634955e-5/9e-3 = 7.7267365e-14 F
    #   C_a = εr ε0 (A − S)/d = 4·8.8541878128e-12·(1e-2 − 1.9634955e-5)/1e-2 = 3.5347211e-11 F
    caps = flat_void_capacitances(D, T, THICK, ER, specimen_area=AREA)
    assert caps.c == pytest.approx(1.7385157116e-13, rel=1e-10)
    assert caps.b == pytest.approx(7.7267364962e-14, rel=1e-10)
    assert caps.a == pytest.approx(3.5347210623e-11, rel=1e-10)
    assert caps.c == pytest.approx(EPS0 * S / T, rel=1e-12)


def test_void_voltage_ratio_hand_example():
    # Source: brief §1.2: k = C_b/(C_b + C_c) = εr t/(εr t + d − t) = 4·1/(4·1 + 9) = 4/13 = 0.307692...
    caps = flat_void_capacitances(D, T, THICK, ER)
    assert void_voltage_ratio(caps.b, caps.c) == pytest.approx(4.0 / 13.0, rel=1e-14)


def test_inception_voltage_and_apparent_charge_hand_example():
    # Source: brief §1.2-1.3. V_i = 4 kV, V_r = 1 kV in the void:
    #   U_i,peak = V_i/k = 4000·13/4 = 13000 V = V_i (1 + (d − t)/(εr t)) = 4000·(1 + 9/4)
    #   q_a = C_b (V_i − V_r) = 7.7267365e-14·3000 = 2.3180209e-10 C (231.8 pC)
    caps = flat_void_capacitances(D, T, THICK, ER)
    k = void_voltage_ratio(caps.b, caps.c)
    assert 4000.0 / k == pytest.approx(13000.0, rel=1e-14)
    assert apparent_charge(caps.b, 3000.0) == pytest.approx(2.31802094885e-10, rel=1e-10)
    assert apparent_charge(caps.b, -3000.0) == pytest.approx(-2.31802094885e-10, rel=1e-10)  # negative pulse


def test_discharge_energy_hand_example():
    # Source: brief §1.3. W = ½ (C_c + C_b)(V_i² − V_r²) = ½·(C_b·13/4)·(16e6 − 1e6)
    #   = ½·2.5111894e-13·15e6 = 1.8833920e-6 J;
    # identity W = ½ q_a U_inc (1 + V_r/V_i) = ½·2.3180209e-10·13000·1.25 = 1.8833920e-6 J.
    caps = flat_void_capacitances(D, T, THICK, ER)
    w = discharge_energy(caps.b, caps.c, 4000.0, 1000.0)
    assert w == pytest.approx(1.88339202094e-6, rel=1e-10)
    assert w == pytest.approx(0.5 * 2.31802094885e-10 * 13000.0 * 1.25, rel=1e-10)


def test_section_1_4_brief_worked_count():
    # Source: brief §1.4 (derived): A = 10, V_i = 3, V_r = 0.5:
    #   n1 = floor(9.5/2.5) = floor(3.8) = 3, N = 4·3 = 12.
    assert lag_free_discharges_per_cycle(10.0, 3.0, 0.5) == 12


def test_section_1_4_brief_worked_phases():
    # Source: brief §1.4 (derived): sin φ_j = (3 + (j − 4)·2.5)/10 for j = 1..6
    #   = −4.5/10, −2/10, 0.5/10, 3/10, 5.5/10, 8/10 = −0.45, −0.2, 0.05, 0.3, 0.55, 0.8
    #   → φ = −26.7437°, −11.5370°, 2.8660°, 17.4576°, 33.3670°, 53.1301° (arcsin by hand table / calculator)
    phases = lag_free_phases_deg(10.0, 3.0, 0.5)
    np.testing.assert_allclose(
        np.sin(np.radians(phases)), [-0.45, -0.2, 0.05, 0.3, 0.55, 0.8], rtol=0, atol=1e-15
    )
    np.testing.assert_allclose(phases, [-26.7437, -11.5370, 2.8660, 17.4576, 33.3670, 53.1301], atol=5e-5)


@pytest.mark.parametrize("case", CASES, ids=[c["name"] for c in CASES])
def test_section_1_4_lag_free_cases_file(case):
    # Source: reference/kreuger_1989/lag_free_cases.toml (hand arithmetic on brief §1.4, derived).
    a, vi, vr = case["peak"], case["inception"], case["residual"]
    assert lag_free_discharges_per_cycle(a, vi, vr) == case["per_cycle"] == 4 * case["n1"]
    phases = lag_free_phases_deg(a, vi, vr)
    assert phases.size == 2 * case["n1"]
    np.testing.assert_allclose(np.sin(np.radians(phases)), case["sines"], rtol=0, atol=1e-14)


def test_section_1_4_pulse_sequence_steps():
    # Source: brief §1.4 / §10 (derived): consecutive same-polarity PDs differ by (V_i − V_r)/k in applied
    # voltage, a polarity change by −(V_i + V_r)/k. With k = 1 (applied = void voltage) and A = 10, V_i = 3,
    # V_r = 0.5: positive PDs at u = 3 + (j − 4)·2.5 = −4.5, −2, 0.5, 3, 5.5, 8 (steps +2.5 = V_i − V_r); the
    # first negative PD at φ_1 + 180° has u = −10·sin φ_1 = +4.5, so the step from the last positive PD is
    # 4.5 − 8 = −3.5 = −(V_i + V_r).
    a, vi, vr = 10.0, 3.0, 0.5
    u_pos = a * np.sin(np.radians(lag_free_phases_deg(a, vi, vr)))
    np.testing.assert_allclose(np.diff(u_pos), 2.5, rtol=1e-13)
    u_first_neg = a * np.sin(np.radians(lag_free_phases_deg(a, vi, vr)[0] + 180.0))
    assert u_first_neg - u_pos[-1] == pytest.approx(-(vi + vr), rel=1e-13)


def test_section_1_4_discharge_power_equals_dissipation():
    # Source: brief §1.4 (derived energy identity): in the periodic steady state the IEC 60270 discharge power
    # P = f Σ q_i u_i (signed, one cycle, T_ref = 1/f) equals N f W. By hand for the flat-void example with
    # V_i = 4 kV, V_r = 1 kV, V_m = 40 kV: A = k V_m = 40000·4/13 = 12307.7 V, n1 = floor(11307.7/3000) = 3,
    # N = 12; Σ q u = 2 n1 q_a (V_i + V_r)/k = 6·2.3180209e-10·5000·13/4 = 2.2600704e-5 J per cycle;
    # N W = 12·1.8833920e-6 = 2.2600704e-5 J per cycle (equal: 6·q_a·5000·3.25 = 12·½·q_a·13000·1.25).
    f = 50.0
    caps = flat_void_capacitances(D, T, THICK, ER)
    k = void_voltage_ratio(caps.b, caps.c)
    vi, vr, vm = 4000.0, 1000.0, 40000.0
    n = lag_free_discharges_per_cycle(k * vm, vi, vr)
    assert n == 12
    phases = lag_free_phases_deg(k * vm, vi, vr)
    qa = apparent_charge(caps.b, vi - vr)
    q = np.concatenate([np.full(phases.size, qa), np.full(phases.size, -qa)])
    u = vm * np.sin(np.radians(np.concatenate([phases, phases + 180.0])))
    p = discharge_power(q, u, 1.0 / f)
    assert p == pytest.approx(n * f * discharge_energy(caps.b, caps.c, vi, vr), rel=1e-12)
    assert p / f == pytest.approx(2.26007e-5, rel=1e-5)
