"""Speed of pdvoid's void kernels, measured side by side in one run.

Prints: cycles/s and events/s of the field, network and wall-memory models with stochastic lag, and each model's
speed relative to today's field model measured in the same run; the ratio to a fixed-step implementation of the
field model (numba, 0.1° steps) and to a plain-Python loop; cold and warm (cached JIT) first-call times; the peak
memory of a 10⁶-cycle histogram-only run. Targets (issue "void models"): field model ≥ 1e6 cycles/s without
field-assisted emission and ≥ 2e5 with it, at about 3 discharges per cycle, ≥ 30× the fixed-step implementation,
warm first call ≤ 2 s, 10⁶-cycle histogram-only run under 200 MB; (issue 13) the wall-memory model at least a
third of the field model's speed (the richest form: the set niemeyer1995_full with volume detachment).

Run: python benchmarks/run.py [--quick]
"""

from __future__ import annotations

import dataclasses
import math
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

import pdvoid  # noqa: E402
from pdvoid.inputs.demo import demo_scenario  # noqa: E402
from pdvoid.models import kernel_arguments  # noqa: E402


def best_of(fn, repeats=3):
    best = math.inf
    out = None
    for _ in range(repeats):
        t0 = time.perf_counter()
        out = fn()
        best = min(best, time.perf_counter() - t0)
    return best, out


def scenarios():
    base = demo_scenario()  # about 3 discharges per cycle at 18 kV (invented demo example)
    net = base.replace(**{})
    net = pdvoid.Scenario(insulation=base.insulation, void=base.void, supply=base.supply,
                          model=pdvoid.NetworkModel(**{k: getattr(base.model, k) for k in (
                              "residual_ratio", "ionization_rate", "surface_rate_same", "surface_rate_reversed",
                              "surface_decay_time")}))
    # the wall-memory model with its parameter set niemeyer1995 and the demo's effective volume rate
    mem = dataclasses.replace(base, model=pdvoid.MemoryModel(ionization_rate=base.model.ionization_rate))
    mem_hv = pdvoid.Scenario(insulation=base.insulation, supply=base.supply, model=mem.model,
                             void=dataclasses.replace(base.void, height=base.void.height / 2,
                                                      position="high_voltage_electrode"))
    from pdvoid.inputs.model_sets import model_from_set

    # the richest form: set niemeyer1995_full (volume detachment; discharge spots, one spot in this sphere)
    rich = dataclasses.replace(base, model=model_from_set("niemeyer1995_full",
                                                          ionization_rate=base.model.ionization_rate))
    return {
        "field model": base,
        "field model, field-assisted": base.replace(**{"model.field_assisted": True,
                                                        "model.surface_rate_same": 4e3,
                                                        "model.surface_rate_reversed": 1.2e3}),
        "network model": net,
        "memory model (niemeyer1995)": mem,
        "memory model, on hv electrode": mem_hv,
        "memory model, richest (full set)": rich,
    }


def kernel_speed(cycles, rounds=3):
    print(f"\n== event kernels ({cycles} cycles, histogram-only, best of {rounds} interleaved rounds; 'vs field' by "
          "wall time and by process CPU time, which other load on the machine disturbs less)")
    print(f"{'scenario':34s} {'events/cycle':>12s} {'cycles/s':>12s} {'events/s':>12s} {'vs field':>9s} "
          f"{'(CPU)':>7s}")
    cases = scenarios()
    for sc in cases.values():
        pdvoid.simulate(sc, cycles=10, seed=1, histogram=True)  # compile / load cache
    wall = dict.fromkeys(cases, math.inf)
    cpu = dict.fromkeys(cases, math.inf)
    counts = {}
    for _ in range(rounds):
        for name, sc in cases.items():
            t0, c0 = time.perf_counter(), time.process_time()
            res = pdvoid.simulate(sc, cycles=cycles, seed=1, histogram=True)
            wall[name] = min(wall[name], time.perf_counter() - t0)
            cpu[name] = min(cpu[name], time.process_time() - c0)
            counts[name] = res.event_count
    rates = {name: cycles / wall[name] for name in cases}
    for name in cases:
        # speed relative to today's field model, measured in this same run (target for the memory model: >= 1/3)
        events_per_s = counts[name] * rates[name] / cycles
        print(f"{name:34s} {counts[name] / cycles:12.3f} {rates[name]:12.3e} {events_per_s:12.3e} "
              f"{rates[name] / rates['field model']:9.2f} {cpu['field model'] / cpu[name]:7.2f}")
    return rates


def fixed_step_comparison(cycles_event, cycles_fixed, cycles_python):
    from fixed_step import fixed_step_loop, fixed_step_numba

    print("\n== against a fixed-step implementation of the same model (0.1° steps)")
    for name, sc in scenarios().items():
        if name.startswith(("network", "memory")):
            continue
        a = kernel_arguments(sc)
        args = (50.0, a.a_coef[0], a.gain, a.x_inc, a.x_res, a.charge_per_unit, a.n_vol_pos, a.n_same, a.n_rev,
                a.tau_s, a.field_assisted, 1)
        fixed_step_numba(10, 3600, *args)
        t_event, res = best_of(lambda sc=sc: pdvoid.simulate(sc, cycles=cycles_event, seed=1, histogram=True))
        t_fixed, (n_fixed, _) = best_of(lambda args=args: fixed_step_numba(cycles_fixed, 3600, *args))
        t_py, _ = best_of(lambda args=args: fixed_step_loop(cycles_python, 3600, *args), repeats=1)
        per_event = t_event / cycles_event
        print(f"{name:34s} event-driven {1 / per_event:10.3e} cycles/s | fixed-step numba "
              f"{cycles_fixed / t_fixed:10.3e} cycles/s | plain Python {cycles_python / t_py:8.1f} cycles/s")
        print(f"{'':34s} ratio event-driven / fixed-step numba = {t_fixed / cycles_fixed / per_event:8.1f}×   "
              f"/ plain Python = {t_py / cycles_python / per_event:10.0f}×")
        print(f"{'':34s} discharges per cycle: event-driven {res.event_count / cycles_event:.3f}, "
              f"fixed-step {n_fixed / cycles_fixed:.3f}")


FIRST_CALL = """
import time
t0 = time.perf_counter()
import pdvoid
from pdvoid.inputs.demo import demo_scenario
r = pdvoid.simulate(demo_scenario(), cycles=100, seed=1)
print(time.perf_counter() - t0)
"""


def first_call_times():
    print("\n== first call (import + first simulate in a new process)")
    with tempfile.TemporaryDirectory() as cache:
        env = dict(os.environ, NUMBA_CACHE_DIR=cache)
        times = []
        for _ in range(3):
            out = subprocess.run([sys.executable, "-c", FIRST_CALL], env=env, capture_output=True, text=True,
                                 check=True)
            times.append(float(out.stdout.strip()))
    print(f"cold (empty cache): {times[0]:.2f} s   warm (cached JIT): {min(times[1:]):.2f} s")


MEMORY = """
import resource, pdvoid
from pdvoid.inputs.demo import demo_scenario
r = pdvoid.simulate(demo_scenario(), cycles={cycles}, seed=1, histogram=True)
print(r.event_count, resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024)
"""


def memory(cycles):
    print(f"\n== peak memory of a {cycles:.0e}-cycle histogram-only run")
    out = subprocess.run([sys.executable, "-c", MEMORY.format(cycles=cycles)], capture_output=True, text=True,
                         check=True)
    n, mb = out.stdout.split()
    base = subprocess.run([sys.executable, "-c", MEMORY.format(cycles=1)], capture_output=True, text=True,
                          check=True).stdout.split()[1]
    print(f"{int(n)} events; peak resident memory {float(mb):.0f} MB (the same process after 1 cycle: "
          f"{float(base):.0f} MB)")


def main():
    quick = "--quick" in sys.argv
    print(f"pdvoid {pdvoid.__version__} benchmarks; python {sys.version.split()[0]}; "
          f"{os.cpu_count()} cores (one used)")
    kernel_speed(20_000 if quick else 100_000, 3 if quick else 5)
    fixed_step_comparison(20_000 if quick else 100_000, 200 if quick else 2_000, 2 if quick else 10)
    first_call_times()
    memory(100_000 if quick else 1_000_000)


if __name__ == "__main__":
    main()
