"""Unit tests of pdvoid.physics.network: capacitances, spheroid equivalent, lag-free oracles, validation."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from pdvoid import InputError
from pdvoid.core.units import EPSILON_0
from pdvoid.physics.geometry import (
    depolarization_spheroid,
    field_enhancement,
    induced_charge_per_field,
    layered_field_enhancement,
    spheroid_volume,
)
from pdvoid.physics.network import (
    apparent_charge,
    discharge_energy,
    flat_void_capacitances,
    lag_free_discharges_per_cycle,
    lag_free_phases_deg,
    spheroid_network_equivalent,
    void_voltage_ratio,
)


# --- an independent exact event simulation of the lag-free network model (physics brief §1.4 assumptions) ---
def simulate_lag_free(peak, v_i, v_r, cycles, shift=0.0):
    """Phases [deg, absolute] and polarities of lag-free discharges, starting at the rising zero crossing.

    Void voltage v(θ) = A sin θ + s. In a rising stretch (θ from −90° to 90° mod 360°) a discharge fires when
    v reaches +V_i and resets v to +V_r (s drops by V_i − V_r); in a falling stretch likewise at −V_i. Each
    crossing is solved exactly with arcsin on the monotone branch.
    """
    events = []
    for m in range(cycles):
        base = 2.0 * math.pi * m
        # rising stretch of cycle m (the first one starts at θ = 0)
        while peak + shift >= v_i:  # the maximum A + s still reaches V_i
            theta = base + math.asin((v_i - shift) / peak)
            events.append((math.degrees(theta), +1))
            shift -= v_i - v_r
        # falling stretch (90° ... 270°): v = A sin θ + s decreases to −A + s
        while -peak + shift <= -v_i:
            theta = base + math.pi - math.asin((-v_i - shift) / peak)
            events.append((math.degrees(theta), -1))
            shift += v_i - v_r
    return events


def steady_cycle(events, cycles):
    """Events of the last simulated cycle, phases taken from −90° of that cycle's rising stretch."""
    start = 360.0 * (cycles - 1) - 90.0
    return [(p - 360.0 * (cycles - 1), s) for p, s in events if start <= p < start + 360.0]


@settings(max_examples=150)
@given(
    peak=st.floats(min_value=0.0, max_value=60.0),
    v_i=st.floats(min_value=0.5, max_value=10.0),
    frac_r=st.floats(min_value=0.0, max_value=0.95),
)
def test_lag_free_formulas_match_event_simulation(peak, v_i, frac_r):
    # Source: physics brief §1.4 (derived, checked there on 804 cases): count and phases from the closed forms
    # must equal an exact event simulation started from an uncharged void at phase 0 (assumptions (a)-(e)).
    v_r = frac_r * v_i
    ratio = (peak - v_r) / (v_i - v_r)
    assume(
        abs(ratio - round(ratio)) > 1e-6
    )  # an exact integer ratio puts a discharge on the peak (degenerate)
    cycles = 4
    last = steady_cycle(simulate_lag_free(peak, v_i, v_r, cycles), cycles)
    assert lag_free_discharges_per_cycle(peak, v_i, v_r) == len(last)
    pos = np.array([p for p, s in last if s > 0])
    neg = np.array([p for p, s in last if s < 0])
    phases = lag_free_phases_deg(peak, v_i, v_r)
    np.testing.assert_allclose(pos, phases, atol=1e-9)
    np.testing.assert_allclose(neg, phases + 180.0, atol=1e-9)
    assert np.all((phases > -90.0) & (phases <= 90.0))
    assert np.all(np.diff(phases) > 0)


def test_history_dependence_odd_family():
    # Source: physics brief §1.4 (derived): A = 10, V_i = 3, V_r = 0.5 with a pre-existing shift S0 = 1.2 V
    # settles at 14 discharges per cycle instead of the zero-start 12. The closed forms describe the
    # zero-start state only.
    cycles = 5
    assert len(steady_cycle(simulate_lag_free(10.0, 3.0, 0.5, cycles, shift=1.2), cycles)) == 14
    assert len(steady_cycle(simulate_lag_free(10.0, 3.0, 0.5, cycles), cycles)) == 12
    assert lag_free_discharges_per_cycle(10.0, 3.0, 0.5) == 12


def test_lag_free_exact_integer_ratio():
    # Source: brief §1.4 formula: A = 3, V_i = 1, V_r = 0 → (3 − 0)/1 = 3 exactly → n1 = 3, N = 12; the last
    # positive discharge has sin φ = (1 + 2·1)/3 = 1 → φ = 90° (on the peak).
    assert lag_free_discharges_per_cycle(3.0, 1.0, 0.0) == 12
    phases = lag_free_phases_deg(3.0, 1.0, 0.0)
    assert phases[-1] == 90.0
    assert phases[0] == pytest.approx(math.degrees(math.asin(-2.0 / 3.0)), abs=1e-12)  # (1 − 3)/3


def test_lag_free_below_and_at_inception():
    # Source: brief §1.4: N = 0 for A < V_i; at A = V_i: n1 = floor((V_i − V_r)/(V_i − V_r)) = 1, N = 4.
    assert lag_free_discharges_per_cycle(2.999, 3.0, 0.5) == 0
    assert lag_free_phases_deg(2.999, 3.0, 0.5).size == 0
    assert lag_free_discharges_per_cycle(0.0, 3.0, 0.5) == 0
    assert lag_free_discharges_per_cycle(3.0, 3.0, 0.5) == 4
    assert isinstance(lag_free_discharges_per_cycle(3.0, 3.0, 0.5), int)


@pytest.mark.parametrize(
    "args",
    [
        (-1.0, 3.0, 0.5),
        (10.0, 0.0, 0.0),
        (10.0, 3.0, 3.0),
        (10.0, 3.0, -0.1),
        (math.nan, 3.0, 0.5),
        (10.0, math.inf, 0.5),
        (10.0, 3.0, math.nan),
    ],
)
def test_lag_free_validation(args):
    # Source: helper rules: A >= 0, V_i > 0, 0 <= V_r < V_i, all finite.
    with pytest.raises(InputError):
        lag_free_discharges_per_cycle(*args)
    with pytest.raises(InputError):
        lag_free_phases_deg(*args)


# --- capacitances -------------------------------------------------------------------------------------------
def test_flat_void_capacitances_formulas_and_arrays():
    # Source: brief §1.2 (kreuger1989 model): C_c = ε0 S/t, C_b = εr ε0 S/(d − t), C_a = εr ε0 (A − S)/d.
    d_void, t, d, er, area = 2e-3, np.array([0.1e-3, 0.5e-3]), 5e-3, 3.0, 1e-3
    s = math.pi * d_void**2 / 4
    caps = flat_void_capacitances(d_void, t, d, er, specimen_area=area)
    np.testing.assert_allclose(caps.c, EPSILON_0 * s / t, rtol=1e-15)
    np.testing.assert_allclose(caps.b, er * EPSILON_0 * s / (d - t), rtol=1e-15)
    np.testing.assert_allclose(caps.a, er * EPSILON_0 * (area - s) / d, rtol=1e-15)
    assert flat_void_capacitances(d_void, 1e-4, d, er).a is None
    assert type(flat_void_capacitances(d_void, 1e-4, d, er).b) is float


@given(
    er=st.floats(min_value=1.0, max_value=20.0),
    t_over_d=st.floats(min_value=1e-4, max_value=0.99),
)
def test_flat_void_ratio_matches_layered_field(er, t_over_d):
    # Source: brief §1.2 (derived): k = εr t/(εr t + d − t), and the void field k V/t equals the layered-slab
    # field f V/d, i.e. f = k d/t.
    d = 1e-2
    t = t_over_d * d
    caps = flat_void_capacitances(5e-3, t, d, er)
    k = void_voltage_ratio(caps.b, caps.c)
    assert k == pytest.approx(er * t / (er * t + d - t), rel=1e-13)
    assert layered_field_enhancement(er, t, d) == pytest.approx(k * d / t, rel=1e-13)


def test_flat_void_validation():
    with pytest.raises(InputError, match="height must be smaller than thickness"):
        flat_void_capacitances(1e-3, 2e-3, 2e-3, 4.0)
    with pytest.raises(InputError, match="specimen_area must exceed"):
        flat_void_capacitances(1e-2, 1e-3, 2e-3, 4.0, specimen_area=math.pi * 1e-4 / 4)
    with pytest.raises(InputError, match="permittivity"):
        flat_void_capacitances(1e-3, 1e-4, 2e-3, 0.5)
    with pytest.raises(InputError, match="diameter"):
        flat_void_capacitances(math.nan, 1e-4, 2e-3, 4.0)
    with pytest.raises(InputError, match="specimen_area"):
        flat_void_capacitances(1e-3, 1e-4, 2e-3, 4.0, specimen_area=-1.0)


# --- spheroid equivalent ------------------------------------------------------------------------------------
@pytest.mark.parametrize("er", [1.0, 2.3, 4.0])
def test_spheroid_equivalent_reproduces_induced_charge(er):
    # Source: brief §2.3 and §4 (derived): k = f h/d and C_b ΔV_c = Pedersen's q with ΔE = ΔV_c/h.
    dia, h, d = 1e-3, 0.4e-3, 10e-3
    eq = spheroid_network_equivalent(dia, h, d, er)
    n = depolarization_spheroid(dia, h)
    f = field_enhancement(er, n)
    assert eq.k == pytest.approx(f * h / d, rel=1e-14)
    assert void_voltage_ratio(eq.c_b, eq.c_c) == pytest.approx(eq.k, rel=1e-13)
    dv = 1500.0
    q = induced_charge_per_field(er, n, spheroid_volume(dia, h), d) * dv / h
    assert apparent_charge(eq.c_b, dv) == pytest.approx(q, rel=1e-14)


def test_spheroid_equivalent_sphere_hand_value():
    # Source: brief §2.3 (sphere, K = 3): q = 4π εr ε0 a³ ΔE/d; with ΔE = ΔV/h, h = 2a: C_b = 2π εr ε0 a²/d.
    # k = f h/d with f = 3εr/(2εr + 1) (Stratton 1941). Hand: εr = 4, a = 0.5 mm, d = 10 mm →
    # C_b = 2π·4·ε0·0.25e-6/1e-2 = 2π·ε0·1e-4, k = (12/9)·1e-3/1e-2 = 0.133333...
    eq = spheroid_network_equivalent(1e-3, 1e-3, 1e-2, 4.0)
    assert eq.c_b == pytest.approx(2 * math.pi * EPSILON_0 * 1e-4, rel=1e-14)
    assert eq.k == pytest.approx(0.4 / 3.0, rel=1e-14)
    assert eq.c_c == pytest.approx(eq.c_b * (7.5 - 1.0), rel=1e-13)  # 1/k − 1 = 7.5 − 1


@pytest.mark.parametrize("er", [2.3, 4.0])
@pytest.mark.parametrize("scale", [1e-2, 1e-3, 1e-4])
def test_flat_spheroid_approaches_flat_void_network(er, scale):
    # Source: brief §2.3 last line (derived): for a flat void (K → 1) Pedersen's q equals the network apparent
    # charge C_b ΔV_c when t ≪ d. Compared with a cylinder of the same height and volume (S = Ω/h =
    # (2/3)πD²/4), the deviation is O(t/d) + O(εr h/D); both shrink with `scale`.
    d = 1e-2
    h = scale * d  # t/d = scale
    dia = h / scale  # h/D = scale
    eq = spheroid_network_equivalent(dia, h, d, er)
    caps = flat_void_capacitances(dia * math.sqrt(2.0 / 3.0), h, d, er)
    k_flat = void_voltage_ratio(caps.b, caps.c)
    bound = 4.0 * er * scale
    assert abs(eq.c_b / caps.b - 1.0) < bound
    assert abs(eq.c_c / caps.c - 1.0) < bound
    assert abs(eq.k / k_flat - 1.0) < bound
    # q = C_b ΔV for the same void-voltage drop, again within O(t/d)
    assert abs(apparent_charge(eq.c_b, 100.0) / apparent_charge(caps.b, 100.0) - 1.0) < bound
    # and the error really is first order (not a constant offset): halving the scale roughly halves it
    eq2 = spheroid_network_equivalent(dia, h / 2, d, er)
    caps2 = flat_void_capacitances(dia * math.sqrt(2.0 / 3.0), h / 2, d, er)
    assert abs(eq2.c_b / caps2.b - 1.0) < abs(eq.c_b / caps.b - 1.0)


def test_spheroid_equivalent_rejects_large_void():
    # k = f h/d >= 1 breaks the small-void model: a flat void of half the slab thickness with εr = 4.
    with pytest.raises(InputError, match="void too large"):
        spheroid_network_equivalent(50e-3, 5e-3, 10e-3, 4.0)
    with pytest.raises(InputError, match="height must be smaller than thickness"):
        spheroid_network_equivalent(1e-3, 10e-3, 10e-3, 4.0)


# --- apparent charge and energy -----------------------------------------------------------------------------
def test_apparent_charge_signed_and_vectorised():
    # Source: brief §1.3: q_a = C_b ΔV, sign of the void-voltage polarity. Hand: 1e-13 F · ±2000 V = ±2e-10 C.
    assert apparent_charge(1e-13, 2000.0) == pytest.approx(2e-10, rel=1e-15)
    assert apparent_charge(1e-13, -2000.0) == pytest.approx(-2e-10, rel=1e-15)
    np.testing.assert_allclose(apparent_charge(1e-13, np.array([1.0, -3.0])), [1e-13, -3e-13], rtol=1e-15)


def test_discharge_energy_stiff_vs_charge_form():
    # Source: brief §1.3 (derived): ½ (C_c + C_b)(V_i² − V_r²) = ½ q_a U_inc (1 + V_r/V_i), U_inc = V_i/k.
    c_b, c_c, vi, vr = 2e-14, 3e-13, 3500.0, 700.0
    k = void_voltage_ratio(c_b, c_c)
    w = discharge_energy(c_b, c_c, vi, vr)
    assert w == pytest.approx(0.5 * apparent_charge(c_b, vi - vr) * (vi / k) * (1 + vr / vi), rel=1e-13)


@pytest.mark.parametrize(
    "args",
    [
        (0.0, 1e-13, 3.0, 1.0),
        (1e-13, -1e-13, 3.0, 1.0),
        (1e-13, 1e-13, 0.0, 0.0),
        (1e-13, 1e-13, 3.0, 3.0),
        (1e-13, 1e-13, 3.0, -1.0),
        (math.nan, 1e-13, 3.0, 1.0),
    ],
)
def test_discharge_energy_validation(args):
    with pytest.raises(InputError):
        discharge_energy(*args)


def test_apparent_charge_and_ratio_validation():
    for bad in (0.0, -1e-12, math.nan, math.inf):
        with pytest.raises(InputError, match="c_b"):
            apparent_charge(bad, 1.0)
        with pytest.raises(InputError):
            void_voltage_ratio(1e-12, bad)
    with pytest.raises(InputError, match="delta_v"):
        apparent_charge(1e-12, math.nan)
