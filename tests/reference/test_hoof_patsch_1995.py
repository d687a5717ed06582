"""Pulse-sequence analysis after Hoof & Patsch (1995), checked on the lag-free three-capacitance model.

Definitions from memory (physics brief section 10); the expected Delta u values are derived in the brief,
section 1.4 ("Pulse-sequence check [D]"). See reference/hoof_patsch_1995/source.toml.
"""

from __future__ import annotations

import math
import tomllib
from pathlib import Path

import numpy as np
import pytest

import pdvoid
from pdvoid import InputError
from pdvoid.analysis.sequence import pulse_sequence
from pdvoid.simulation.events import Events

REF = Path(__file__).resolve().parents[2] / "reference" / "hoof_patsch_1995"
ATOL = tomllib.loads((REF / "source.toml").read_text())["tolerance"]["absolute_voltage"]

K = 0.1  # C_b / (C_b + C_c) [-]
V_I = 900.0  # void inception voltage [V]  -> V_i / k = 9 kV
V_R = 150.0  # void residual voltage [V]   -> V_r / k = 1.5 kV
V_M = 30e3  # applied peak voltage [V]    -> A = k V_m = 3 kV
F = 50.0  # [Hz]
Q_A = 5e-12  # apparent charge per discharge [C] (any value; the check is on voltages)


def lag_free_abc_events(cycles: int) -> Events:
    """Exact event sequence of the lag-free abc model (brief section 1.4, assumptions (a)-(e)).

    The void voltage is k V_a(t) - S, S the shift left by earlier discharges. A positive discharge fires when
    the rising V_a reaches (S + V_i)/k and adds V_i - V_r to S; a negative one fires when the falling V_a
    reaches (S - V_i)/k and subtracts V_i - V_r. Crossing angles come from arcsin.
    """
    two_pi = 2.0 * math.pi
    theta, shift = 0.0, 0.0
    rows = []
    end = two_pi * cycles
    while True:
        candidates = []
        up = (shift + V_I) / K
        if abs(up) <= V_M:
            base = math.asin(up / V_M)  # rising branch: cos >= 0
            n = math.ceil((theta - base) / two_pi + 1e-12)
            candidates.append((base + two_pi * n, +1))
        down = (shift - V_I) / K
        if abs(down) <= V_M:
            base = math.pi - math.asin(down / V_M)  # falling branch: cos <= 0
            n = math.ceil((theta - base) / two_pi + 1e-12)
            candidates.append((base + two_pi * n, -1))
        th, sign = min(candidates)
        if th >= end:
            break
        theta = th
        rows.append((theta, sign))
        shift += sign * (V_I - V_R)
    th = np.array([r[0] for r in rows])
    sign = np.array([r[1] for r in rows], dtype=float)
    cycle = np.floor(th / two_pi)
    phase = np.degrees(th - two_pi * cycle)
    return Events(
        phase_deg=np.where(phase >= 360.0, 0.0, phase),
        charge=sign * Q_A,
        frequency=F,
        cycles=float(cycles),
        time=th / (two_pi * F),
        cycle=cycle,
        voltage=V_M * np.sin(th),
    )


def test_generator_reproduces_the_deterministic_count():
    # physics brief section 1.4 [D]: N = 4 floor((A - V_r)/(V_i - V_r)) per cycle after the first peak = 12
    ev = lag_free_abc_events(6)
    n_steady = np.count_nonzero(ev.cycle >= 1)
    assert n_steady == 5 * 4 * math.floor((K * V_M - V_R) / (V_I - V_R))


def test_section_1_4_delta_u_same_polarity_and_polarity_change():
    # physics brief section 1.4 / 10 [D]: Delta u = +-(V_i - V_r)/k = +-7.5 kV for same-polarity neighbours,
    # -+(V_i + V_r)/k = -+10.5 kV across a polarity change (sign of the later pulse's polarity)
    seq = pulse_sequence(lag_free_abc_events(5))
    q_prev = seq.charge[:-1]
    q_next = seq.charge[1:]
    same = seq.same_polarity
    assert same.sum() > 20 and (~same).sum() > 5
    np.testing.assert_allclose(seq.delta_u[same], np.sign(q_next[same]) * 7.5e3, rtol=0, atol=ATOL)
    np.testing.assert_allclose(seq.delta_u[~same], np.sign(q_next[~same]) * 10.5e3, rtol=0, atol=ATOL)
    assert np.all(np.sign(q_prev[~same]) == -np.sign(q_next[~same]))
    values = np.unique(np.round(seq.delta_u / 1e3, 6))
    np.testing.assert_allclose(values, [-10.5, -7.5, 7.5, 10.5])


def test_delta_u_pairs_fall_on_four_points():
    # consequence of the section 1.4 check: (Delta u_n, Delta u_{n-1}) pairs take only the combinations of
    # the four values, and each Delta u follows a Delta u of the same sign or the polarity-change value
    seq = pulse_sequence(lag_free_abc_events(5))
    nxt = np.round(seq.delta_u_next / 1e3, 6)
    prev = np.round(seq.delta_u_previous / 1e3, 6)
    pairs = set(zip(nxt, prev, strict=True))
    allowed = {-10.5, -7.5, 7.5, 10.5}
    assert all(a in allowed and b in allowed for a, b in pairs)
    assert seq.charge_n.size == seq.delta_u.size
    assert np.all(np.abs(seq.charge_n) == pytest.approx(Q_A))


def test_delta_phase_and_delta_t_agree():
    # definitions: Delta phi (elapsed phase) = 360 deg * f * Delta t for a consistent time base
    seq = pulse_sequence(lag_free_abc_events(3))
    np.testing.assert_allclose(seq.delta_phase_deg, 360.0 * F * seq.delta_t, rtol=1e-9, atol=1e-9)
    assert np.all(seq.delta_phase_deg > 0.0)


def _lag_free_network_result(histogram=False):
    """The lag-free three-capacitance model through the public simulate path (k = 0.1, V_r/V_i = 1/6)."""
    c_b = 1e-13
    base = pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.0),
        void=pdvoid.Void(diameter=2e-3, height=1e-3),
        supply=pdvoid.Sine(rms=10e3, frequency=F),
        model=pdvoid.NetworkModel(
            lag_free=True,
            residual_ratio=V_R / V_I,
            capacitance_void=c_b * (1.0 / K - 1.0),
            capacitance_series=c_b,
        ),
    )
    v_i = pdvoid.compute_coefficients(base).inception_field * 1e-3  # void inception voltage E_inc * h [V]
    sc = base.replace(**{"supply.rms": (V_M / V_I) * v_i / math.sqrt(2.0)})  # same A / V_i as above
    return pdvoid.simulate(sc, cycles=5, seed=0, histogram=histogram), v_i


def test_section_1_4_delta_u_through_simulate():
    # physics brief section 1.4 [D] through pdvoid.simulate (lag-free network model): Delta u is exactly
    # +-(V_i - V_r)/k for same-polarity neighbours and -+(V_i + V_r)/k across a polarity change
    res, v_i = _lag_free_network_result()
    v_r = v_i * V_R / V_I
    seq = pulse_sequence(res)
    same = seq.same_polarity
    sign_next = np.sign(seq.charge[1:])
    assert same.sum() > 20 and (~same).sum() > 5
    np.testing.assert_allclose(seq.delta_u[same], sign_next[same] * (v_i - v_r) / K, rtol=1e-9)
    np.testing.assert_allclose(seq.delta_u[~same], sign_next[~same] * (v_i + v_r) / K, rtol=1e-9)


def test_histogram_only_result_is_refused():
    # a histogram-only run keeps no event list: the analysis must say so instead of returning nothing
    res, _ = _lag_free_network_result(histogram=True)
    assert res.event_count > 0
    with pytest.raises(InputError, match="histogram"):
        pulse_sequence(res)
