"""The wall-memory model (pdvoid.models.memory) against independent expectations.

Scenarios are invented test cases. Closed forms used as oracles: the field enhancement of a sphere
f = 3εr/(2εr + 1) and its depolarisation N = 1/3 (standard electrostatics, physics brief §2.1); the wall charge of a
uniform deposited polarisation P, P·πa² per half wall, with field N·P/(ε0(εr(1−N)+N)) (physics brief §2.3, derived);
the detrapping rate (|q|/e)·ν0·exp(−(Φ − sqrt(e³|E|/(4πε0)))/(k_B T)) (physics brief §3.3, structure from memory,
here only the model's own definition); the time-rescaling theorem (Brown et al. 2002).
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from scipy import optimize, stats

import pdvoid
from pdvoid.models.memory import wall_charges
from pdvoid.simulation.simulate import VoidRunner

EPS0 = 8.8541878128e-12  # CODATA 2018
E = 1.602176634e-19  # CODATA 2018, exact
KB = 1.380649e-23  # CODATA 2018, exact
ER = 4.2
D_SLAB = 6e-3
DIAM = 1.5e-3


def _scenario(model, rms=18e3, position="centred", height=DIAM, frequency=50.0):
    return pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=D_SLAB, permittivity=ER),
        void=pdvoid.Void(diameter=DIAM, height=height, position=position),
        supply=pdvoid.Sine(rms=rms, frequency=frequency), model=model)


def _true_charge_per_field_sphere():
    # uniform P on a sphere (N = 1/3): field N·P/(ε0(εr(1−N)+N)), charge P·π a² on each half (brief §2.3, derived)
    n = 1.0 / 3.0
    return math.pi * (DIAM / 2) ** 2 * EPS0 * (ER * (1 - n) + n) / n


# ------------------------------------------------------------------------------------------ hand calculations
@pytest.mark.parametrize("r", [0.0, 0.5, 1.0])
def test_per_wall_charge_after_two_discharges_matches_a_hand_calculation(r):
    # lag-free, no residual scatter, decay 20 ms; amplitude 1.2·E_inc in the void: one positive discharge at
    # E_inc on the rising quarter, one negative at −E_inc on the falling half (checked: exactly two in cycle 0)
    tau = 20e-3
    m0 = pdvoid.MemoryModel(lag_free=True, residual_scatter=0.0, charge_decay_time=tau, recombination=r)
    probe = _scenario(m0)
    e_inc = pdvoid.compute_coefficients(probe).inception_field
    g = 3 * ER / (2 * ER + 1) / D_SLAB  # sphere: f = 3εr/(2εr+1) (brief §2.1)
    amp = 1.2 * e_inc / g
    sc = _scenario(m0, rms=amp / math.sqrt(2.0))
    runner = VoidRunner(sc, seed=0)
    t, q, before, after, _ = runner.run(1)
    assert q.size == 2 and q[0] > 0 > q[1]
    w = 2 * math.pi * 50.0
    e_st = 5.066e5  # the set's stability field at 101325 Pa, 293.15 K (from memory, brief §3.2)
    t1 = math.asin(e_inc / (g * amp)) / w
    xq1 = e_st - g * amp * math.sin(w * t1)

    def field(tt):
        return g * amp * math.sin(w * tt) + xq1 * math.exp(-(tt - t1) / tau)

    t2 = optimize.brentq(lambda tt: field(tt) + e_inc, 0.25 / 50.0, 0.75 / 50.0, xtol=1e-15)
    assert t[0] == pytest.approx(t1, rel=1e-12)
    assert t[1] == pytest.approx(t2, rel=1e-9)
    c = _true_charge_per_field_sphere()
    k = math.exp(-(t2 - t1) / tau)
    d1 = c * (e_inc - e_st)  # charge of the first (positive) discharge on each wall
    d2 = c * (e_inc - e_st)  # and of the second (negative) one
    # positive discharge: electrons d1 to the high-voltage-side wall, ions d1 to the ground-side wall; both decay
    # by k until the negative discharge brings electrons d2 to the ground side and ions d2 to the high-voltage
    # side, each neutralising min(opposite inventory, r·d2) there
    n = min(d1 * k, r * d2)
    expected = {"electrons_hv": d1 * k - n, "positive_hv": d2 - n, "positive_gnd": d1 * k - n,
                "electrons_gnd": d2 - n, "net_gnd": d1 * k - d2, "net_hv": d2 - d1 * k}
    got = wall_charges(runner.state, runner.args)
    for key, v in expected.items():
        assert got[key] == pytest.approx(v, rel=1e-9, abs=1e-9 * d1), key
    assert got["time"] == t[1]


@pytest.mark.parametrize(("position", "metal", "dielectric"), [("high_voltage_electrode", "hv", "gnd"),
                                                               ("ground_electrode", "gnd", "hv")])
def test_void_on_a_metal_electrode_keeps_memory_on_one_wall_only(position, metal, dielectric):
    sc = _scenario(pdvoid.MemoryModel(ionization_rate=1e9), position=position, height=DIAM / 2)
    runner = VoidRunner(sc, seed=3)
    _, q, _, _, _ = runner.run(300)
    assert (q > 0).sum() > 50 and (q < 0).sum() > 50
    w = wall_charges(runner.state, runner.args)
    assert w[f"net_{metal}"] == 0.0 and w[f"electrons_{metal}"] == 0.0 and w[f"positive_{metal}"] == 0.0
    assert w[f"net_{dielectric}"] != 0.0
    # the dielectric wall's inventories add up to its net charge (which follows from the void field alone)
    assert w[f"positive_{dielectric}"] - w[f"electrons_{dielectric}"] == pytest.approx(w[f"net_{dielectric}"],
                                                                                        rel=1e-9)


def test_insulated_void_carries_opposite_net_charge_and_electrons_on_both_walls():
    runner = VoidRunner(_scenario(pdvoid.MemoryModel(ionization_rate=1e9)), seed=3)
    held = {"hv": 0, "gnd": 0}
    events = 0
    for _ in range(30):  # the state after every 10 cycles (an arriving ion charge may clear one inventory)
        events += runner.run(10)[1].size
        if events == 0:
            continue  # no discharge yet: no wall charge
        w = wall_charges(runner.state, runner.args)
        assert w["net_hv"] == -w["net_gnd"] != 0.0
        for side in ("hv", "gnd"):
            held[side] += w[f"electrons_{side}"] > 0.0
            assert w[f"positive_{side}"] - w[f"electrons_{side}"] == pytest.approx(w[f"net_{side}"], rel=1e-9)
    assert held["hv"] > 15 and held["gnd"] > 15, held


# ------------------------------------------------------------------------------------------ time rescaling
def _rescaled(res, sc, samples=3000, n_max=500):
    """Λ_i = ∫ N(t) dt over (t_{i-1}, t_i] within |x| >= E_inc, N from the model's definition (module docstring of
    pdvoid.kernels.memory_events), the wall inventories rebuilt here from the events by the deposit rule."""
    m = sc.model
    c = pdvoid.compute_coefficients(sc)
    g = c.field_enhancement / sc.insulation.thickness
    amp = math.sqrt(2.0) * sc.supply.rms
    w = 2 * math.pi * sc.supply.frequency
    e_inc = c.inception_field
    n = c.depolarization
    c_true = math.pi * (DIAM / 2) ** 2 * EPS0 * (ER * (1 - n) + n) / n
    tau = m.charge_decay_time
    temp = sc.void.temperature
    a = m.attempt_frequency * math.exp(-m.trap_depth * E / (KB * temp)) / E
    beta = math.sqrt(E**3 / (4 * math.pi * EPS0)) / (KB * temp)
    pos = sc.void.position
    metal_hv, metal_gnd = pos == "high_voltage_electrode", pos == "ground_electrode"
    # extra start electrons from a metal cathode: the high-voltage electrode is the cathode of negative discharges
    cath_pos = m.cathode_emission_rate if metal_gnd else 0.0
    cath_neg = m.cathode_emission_rate if metal_hv else 0.0
    r = m.recombination
    inv = {"e_hv": 0.0, "e_gnd": 0.0, "p_hv": 0.0, "p_gnd": 0.0}
    out = []
    for i in range(min(res.charge.size, n_max)):
        dx = res.field_before[i] - res.field_after[i]
        if i > 0:
            t0, t1 = res.time[i - 1], res.time[i]
            xq = res.field_after[i - 1] - g * res.voltage[i - 1]
            t = np.linspace(t0, t1, samples)
            shrink = np.exp(-(t - t0) / tau) if math.isfinite(tau) else np.ones_like(t)
            x = g * amp * np.sin(w * t) + xq * shrink
            pol = np.sign(x)
            trapped = np.where(pol > 0, 0.0 if metal_gnd else inv["e_gnd"], 0.0 if metal_hv else inv["e_hv"])
            lam = c.volume_electron_rate + np.where(pol > 0, cath_pos, cath_neg) \
                + a * trapped * shrink * np.exp(beta * np.sqrt(np.abs(x)))
            lam = np.where(np.abs(x) >= e_inc, lam, 0.0)
            out.append(np.trapezoid(lam, t))
            d = math.exp(-(t1 - t0) / tau) if math.isfinite(tau) else 1.0
            for key in inv:
                inv[key] *= d
        dq = c_true * abs(dx)
        # electrons to the high-voltage side in a positive discharge, ions to the ground side; the reverse in a
        # negative one; arriving charge neutralises up to r·dq of the opposite inventory
        e_side, p_side = ("hv", "gnd") if dx > 0 else ("gnd", "hv")
        if not (metal_hv if e_side == "hv" else metal_gnd):
            nr = min(inv["p_" + e_side], r * dq)
            inv["p_" + e_side] -= nr
            inv["e_" + e_side] += dq - nr
        if not (metal_hv if p_side == "hv" else metal_gnd):
            nr = min(inv["e_" + p_side], r * dq)
            inv["e_" + p_side] -= nr
            inv["p_" + p_side] += dq - nr
    return np.array(out)


@pytest.mark.parametrize(
    ("model", "position"),
    [
        (dict(ionization_rate=1e9, charge_decay_time=math.inf, trap_depth=1.45, recombination=0.0), "centred"),
        (dict(ionization_rate=1e9), "centred"),
        (dict(ionization_rate=1e9, charge_decay_time=30e-3, trap_depth=1.15, recombination=1.0), "centred"),
        (dict(ionization_rate=1e9, cathode_emission_rate=300.0), "high_voltage_electrode"),
        (dict(ionization_rate=1e9, cathode_emission_rate=300.0), "ground_electrode"),
    ],
    ids=["no-decay", "set-niemeyer1995", "fast-decay", "on-hv-electrode", "on-ground-electrode"],
)
def test_time_rescaling_of_the_detrapping_and_cathode_hazards_gives_unit_exponentials(model, position):
    sc = _scenario(pdvoid.MemoryModel(**model), position=position,
                   height=DIAM if position == "centred" else DIAM / 2)
    res = pdvoid.simulate(sc, cycles=400, seed=11)
    lam = _rescaled(res, sc)
    assert lam.size >= 150
    # time-rescaling theorem (Brown et al. 2002): Λ_i ~ Exp(1); KS test (scipy.stats.kstest) at a fixed seed
    assert stats.kstest(lam, "expon").pvalue > 0.01
    assert lam.mean() == pytest.approx(1.0, abs=4.0 / math.sqrt(lam.size))


def test_residual_field_is_uniform_about_the_stability_field():
    m = pdvoid.MemoryModel(ionization_rate=1e9, residual_scatter=0.4)
    res = pdvoid.simulate(_scenario(m), cycles=300, seed=2)
    e_st = 5.066e5  # 101325 Pa, 293.15 K: no density scaling
    r = np.abs(res.field_after) / e_st
    assert r.size > 300
    # E_res = E_st·(1 + w(2U − 1)), U ~ U(0, 1): KS against the uniform law on [1 − w, 1 + w]
    assert stats.kstest(r, "uniform", args=(0.6, 0.8)).pvalue > 0.01


def test_stability_field_scales_with_gas_density():
    # E_st ∝ p/T (brief §3.2): half the pressure, half the residual field (no scatter)
    m = pdvoid.MemoryModel(ionization_rate=1e9, residual_scatter=0.0)
    sc = _scenario(m)
    low = sc.replace(**{"void.pressure": 0.5 * 101325.0})
    a = pdvoid.simulate(sc, cycles=20, seed=1)
    b = pdvoid.simulate(low, cycles=20, seed=1)
    assert np.abs(a.field_after) == pytest.approx(5.066e5, rel=1e-12)
    assert np.abs(b.field_after) == pytest.approx(0.5 * 5.066e5, rel=1e-12)


# ------------------------------------------------------------------------------------------ published trends
def test_mean_apparent_charge_rises_with_applied_voltage():
    # measured void patterns show the mean magnitude rising with the amplitude (issue 13, from memory of
    # Illias, Chen & Lewin 2011); here from 1.05 to 3 times the inception voltage, at a raised volume rate
    base = _scenario(pdvoid.MemoryModel(ionization_rate=1e9))
    u_inc = pdvoid.compute_coefficients(base).inception_voltage
    means = []
    for ratio in (1.05, 3.0):
        res = pdvoid.simulate(base.replace(**{"supply.rms": ratio * u_inc}), cycles=3000, seed=4)
        assert res.event_count > 20
        means.append(np.mean(np.abs(res.charge)))
    assert means[1] > 1.1 * means[0]


def test_electrode_bounded_void_is_asymmetric_and_its_polarity_flips_with_the_electrode():
    # Forssén & Edin 2008 as summarised by Illias, Chen & Lewin 2011: electrode-bounded cavities give asymmetric
    # patterns; moving the void to the other electrode swaps the roles of the half cycles (mirror symmetry)
    m = pdvoid.MemoryModel(ionization_rate=1e9)
    hv = pdvoid.simulate(_scenario(m, position="high_voltage_electrode", height=DIAM / 2), cycles=3000, seed=5)
    gnd = pdvoid.simulate(_scenario(m, position="ground_electrode", height=DIAM / 2), cycles=3000, seed=5)

    def ratio(res):
        q = res.charge
        return (q > 0).sum() / (q < 0).sum(), q[q > 0].mean() / -q[q < 0].mean()

    n_hv, q_hv = ratio(hv)
    n_gnd, q_gnd = ratio(gnd)
    # on the high-voltage electrode the metal is the cathode of the negative discharges: a ready supply, so more
    # and smaller negative discharges; the dielectric cathode of the positive ones emits only its trapped charge
    assert n_hv < 1 / 1.2 and q_hv > 1.2
    assert n_gnd > 1.2 and q_gnd < 1 / 1.2
    # mirror symmetry: the ratios swap (within the statistical scatter of 3000 cycles)
    assert n_gnd == pytest.approx(1 / n_hv, rel=0.05)
    assert q_gnd == pytest.approx(1 / q_hv, rel=0.05)


def test_insulated_void_is_symmetric():
    res = pdvoid.simulate(_scenario(pdvoid.MemoryModel(ionization_rate=1e9)), cycles=2000, seed=5)
    q = res.charge
    assert (q > 0).sum() / (q < 0).sum() == pytest.approx(1.0, abs=0.02)


# ------------------------------------------------------------------------------------------ parameters
def test_defaults_are_the_niemeyer1995_set_and_field_defaults_is_todays_field_model():
    from pdvoid.inputs.model_sets import model_from_set

    assert model_from_set("niemeyer1995") == pdvoid.MemoryModel()
    assert model_from_set("field_defaults") == pdvoid.FieldModel()
    sc = _scenario(pdvoid.FieldModel(ionization_rate=3e10))
    a = pdvoid.simulate(sc, cycles=50, seed=7)
    b = pdvoid.simulate(dataclasses.replace(sc, model=model_from_set("field_defaults", ionization_rate=3e10)),
                        cycles=50, seed=7)
    assert a.event_count > 0 and np.array_equal(a.time, b.time) and np.array_equal(a.charge, b.charge)


def test_illias2011_set_is_the_field_model_with_their_memory_rule(tmp_path):
    # Illias, Chen & Lewin 2011 (physics brief §3.3, polarity rule confirmed): the surface emission is higher when
    # the polarity repeats than when it reverses, and carries the factor exp(|E|/E_inc) (from memory)
    from pdvoid.inputs.model_sets import get_parameter_set, list_parameter_sets, load_model_sets, model_from_set

    assert "illias2011" in list_parameter_sets("field")
    m = model_from_set("illias2011")
    assert isinstance(m, pdvoid.FieldModel) and m.field_assisted is True
    assert m.surface_rate_same > m.surface_rate_reversed > 0.0
    ps = get_parameter_set("illias2011")
    assert "illias2011" in ps.references and ps.values["surface_rate_same"].status == "tuned"
    assert "field_assisted = true" in ps.table()
    res = pdvoid.simulate(_scenario(model_from_set("illias2011", ionization_rate=1e9)), cycles=200, seed=2)
    assert res.event_count > 200
    # a switch takes true or false only; a number for it is refused, naming the key
    bad = tmp_path / "sets.toml"
    bad.write_text('schema = "pdvoid.model_sets/1"\n[mine]\nmodel = "field"\ndescription = "x"\n'
                   '[mine.field_assisted]\nvalue = 1\nunit = ""\nstatus = "tuned"\nsource = "mine"\n',
                   encoding="utf-8")
    with pytest.raises(pdvoid.InputError, match="field_assisted.*true or false"):
        load_model_sets(bad)


def test_cite_of_a_run_lists_the_parameter_set_references():
    res = pdvoid.simulate(_scenario(pdvoid.MemoryModel(ionization_rate=1e9)), cycles=5, seed=1)
    text = pdvoid.cite(res)
    for key in ("niemeyer1995", "gutfleisch1995", "schottky1914", "lewis1979", "memory_illustrative", "hess1951"):
        assert f"[{key}]" in text


@pytest.mark.parametrize(
    ("kwargs", "match"),
    [
        (dict(residual_ratio=0.3), "residual_ratio"),
        (dict(field_assisted=True), "field_assisted"),
        (dict(surface_rate_same=10.0), "surface_rate_same"),
        (dict(trap_depth=0.0), "trap_depth"),
        (dict(residual_scatter=1.5), "residual_scatter"),
        (dict(stability_field=-1.0), "stability_field"),
    ],
)
def test_bad_parameters_are_refused(kwargs, match):
    with pytest.raises(pdvoid.InputError, match=match):
        pdvoid.MemoryModel(**kwargs)


def test_unknown_parameter_set_and_other_gas_are_refused_before_the_run():
    with pytest.raises(pdvoid.InputError, match="parameter_set"):
        pdvoid.simulate(_scenario(pdvoid.MemoryModel(parameter_set="nonexistent")), cycles=1)
    sc = _scenario(pdvoid.MemoryModel()).replace(**{"void.gas": "nitrogen"})
    with pytest.raises(pdvoid.InputError, match="stability_field"):
        pdvoid.simulate(sc, cycles=1)
    with pytest.raises(pdvoid.InputError, match="inception field"):
        pdvoid.simulate(_scenario(pdvoid.MemoryModel(stability_field=3e6)), cycles=1)


def test_scenario_file_selects_the_model_by_name_and_round_trips(tmp_path):
    sc = _scenario(pdvoid.MemoryModel(ionization_rate=1e9, trap_depth=1.3))
    path = tmp_path / "memory.toml"
    sc.to_file(path)
    text = path.read_text()
    assert 'kind = "memory"' in text
    from pdvoid.inputs.scenario import read_scenario

    back = read_scenario(path)
    assert back.model == sc.model


def test_parameter_set_file_errors_name_the_key(tmp_path):
    from pdvoid.inputs.model_sets import load_model_sets

    p = tmp_path / "sets.toml"
    p.write_text('schema = "pdvoid.model_sets/1"\n[x]\nmodel = "memory"\ndescription = "d"\nreferences = []\n'
                 '[x.trap_depth]\nvalue = 1.0\nunit = "eV"\nstatus = "from memory"\nsource = "s"\n')
    with pytest.raises(pdvoid.InputError, match=r"\[x.trap_depth\].unit"):
        load_model_sets(p)
    p.write_text('schema = "pdvoid.model_sets/1"\n[x]\nmodel = "memory"\ndescription = "d"\nreferences = []\n'
                 '[x.bogus]\nvalue = 1.0\nunit = ""\nstatus = "from memory"\nsource = "s"\n')
    with pytest.raises(pdvoid.InputError, match="not a parameter"):
        load_model_sets(p)


# ------------------------------------------------------------------------------------------ reproducibility
_JIT_SCRIPT = """
import sys, numpy as np, pdvoid
sc = pdvoid.Scenario(insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
                     void=pdvoid.Void(diameter=1.5e-3, height=0.75e-3, position="{position}"),
                     supply=pdvoid.Sine(rms=18e3), model=pdvoid.MemoryModel({model}))
r = pdvoid.simulate(sc, cycles=40, seed=2)
np.save(sys.argv[1], np.stack([r.time, r.charge, r.field_before, r.field_after]))
"""


@pytest.mark.parametrize(("position", "model"), [
    ("centred", "ionization_rate=3e10"), ("high_voltage_electrode", "ionization_rate=3e10"),
    ("centred", "ionization_rate=5e11, volume_detachment=True")], ids=["centred", "on-hv-electrode", "detachment"])
def test_jit_disabled_gives_the_same_events(tmp_path, position, model):
    # the memory kernel's source run as plain Python (NUMBA_DISABLE_JIT=1) must give the same events
    import os
    import subprocess
    import sys

    out = {}
    for jit in ("0", "1"):
        path = tmp_path / f"jit{jit}.npy"
        subprocess.run([sys.executable, "-c", _JIT_SCRIPT.format(position=position, model=model), str(path)],
                       env=dict(os.environ, NUMBA_DISABLE_JIT=jit), check=True, timeout=300)
        out[jit] = np.load(path)
    assert out["0"].shape[1] > 20
    np.testing.assert_allclose(out["0"], out["1"], rtol=1e-12, atol=0)


def test_same_seed_same_events_chunking_and_histogram_agree():
    sc = _scenario(pdvoid.MemoryModel(ionization_rate=1e9))
    a = pdvoid.simulate(sc, cycles=300, seed=8)
    b = pdvoid.simulate(sc, cycles=300, seed=8, chunk_cycles=7)
    h = pdvoid.simulate(sc, cycles=300, seed=8, histogram=True)
    assert a.event_count > 100
    assert np.array_equal(a.time, b.time) and np.array_equal(a.charge, b.charge)
    assert h.event_count == a.event_count and h.sum_abs_charge == pytest.approx(a.sum_abs_charge, rel=1e-12)


def test_turning_point_of_the_sine_path_matches_the_scan():
    # the zone bound of _monotone_end_sine (no scan) finds the same first sign change of dx/dt as the 16-point scan
    # with Newton refinement of _monotone_end, on random pieces, decays and wall fields (including fallbacks)
    from pdvoid.kernels import memory_events as M

    rng = np.random.default_rng(1)
    omega = 2 * math.pi * 50.0
    orders, b = np.array([1.0]), np.array([0.0])
    fr = (0.0, 0.25, 0.75, 1.0)
    turned = 0
    for _ in range(2000):
        gain, amp = 300.0, rng.uniform(5e3, 3e4)
        a = np.array([amp])
        tau, xq0 = 10 ** rng.uniform(-3, 0), rng.uniform(-3e6, 3e6)
        cycle_t = int(rng.integers(0, 50)) * 0.02
        tq = cycle_t - rng.uniform(0, 0.02)
        seg = int(rng.integers(0, 3))
        ta, tb = cycle_t + fr[seg] * 0.02, cycle_t + fr[seg + 1] * 0.02
        t = rng.uniform(ta, tb)
        scan = M._monotone_end(t, tb, gain, omega, orders, a, b, xq0, tq, tau)
        zone = M._monotone_end_sine(t, tb, gain * amp, cycle_t, gain, omega, orders, a, b, xq0, tq, tau)
        assert zone == pytest.approx(scan, rel=1e-12, abs=1e-15)
        turned += scan < tb
    assert turned > 200


def test_piece_end_of_the_sine_path_gives_monotone_or_quiet_pieces():
    # every piece _piece_end_sine returns is, on 400 sample points (a hand check independent of its zone bounds),
    # either monotone in x or inside (-x_inc, x_inc); and the pieces make progress to the end of the V piece
    from pdvoid.kernels import memory_events as M

    rng = np.random.default_rng(2)
    omega = 2 * math.pi * 50.0
    orders, b = np.array([1.0]), np.array([0.0])
    fr = (0.0, 0.25, 0.75, 1.0)
    quiet = monotone = 0
    for _ in range(600):
        gain, amp = 300.0, rng.uniform(5e3, 3e4)
        a = np.array([amp])
        tau, xq0 = 10 ** rng.uniform(-3, 0), rng.uniform(-3e6, 3e6)
        x_inc = gain * amp * rng.uniform(0.3, 1.2)
        cycle_t = int(rng.integers(0, 50)) * 0.02
        tq = cycle_t - rng.uniform(0, 0.02)
        seg = int(rng.integers(0, 3))
        ta, tb = cycle_t + fr[seg] * 0.02, cycle_t + fr[seg + 1] * 0.02
        t = rng.uniform(ta, tb)
        steps = 0
        while t < tb and steps < 20:
            gva = gain * M.voltage(t, omega, orders, a, b)
            xqa = M._xq(t, xq0, tq, tau)
            end = M._piece_end_sine(t, tb, gain * amp, cycle_t, gain, omega, orders, a, b, xq0, tq, tau, x_inc,
                                    gva, xqa)
            assert t < end <= tb
            s = np.linspace(t, end, 400)
            x = np.array([M._x(u, gain, omega, orders, a, b, xq0, tq, tau) for u in s])
            dx = np.diff(x)
            tol = 1e-9 * np.abs(x).max()
            if np.all(np.abs(x) < x_inc):
                quiet += 1
            else:
                assert np.all(dx >= -tol) or np.all(dx <= tol)
                monotone += 1
            t, steps = end, steps + 1
        assert t == tb
    assert quiet > 100 and monotone > 100


def test_cite_of_a_run_lists_the_parameter_set_values_with_source_and_status():
    # the set's values as used, each with its status and source; a value given by the user is marked as such
    res = pdvoid.simulate(_scenario(pdvoid.MemoryModel(ionization_rate=1e9, volume_detachment=True)), cycles=2,
                          seed=1)
    text = pdvoid.cite(res)
    assert "Parameter values used:" in text
    assert "parameter set niemeyer1995 (memory model):" in text
    assert "  trap_depth = 1.3 V  [tuned] effective trap depth" in text
    assert "  attempt_frequency = 1e+14 Hz  [from memory]" in text
    assert "  ionization_rate = 1e+09 1/(m3 s)  [given by the user; the set has 1e+07 1/(m3 s), confirmed:" in text
    assert "  volume_detachment = true  [given by the user; not a value of the set]" in text
    # today's field model at its defaults: the set field_defaults
    field = pdvoid.simulate(_scenario(pdvoid.FieldModel()), cycles=2, seed=1)
    assert "  residual_ratio = 0.25  [common practice]" in pdvoid.cite(field)
    # keys alone: citations only
    assert "Parameter values used" not in pdvoid.cite(["niemeyer1995"])
