"""Speed of the simulated IEC 60270 measuring chain, measured side by side with the simulation it reads.

Prints, for one simulated result of the demo scenario (an invented scenario): the time to simulate it, and the time
to read its pulses through a wide-band and a narrow-band instrument, with the ratio of each to the simulation
time and the pulses per second through the chain. The narrow-band response lasts longer (about 1/bandwidth), so
more earlier pulses overlap each pulse and the chain is slower per pulse; a dense train (a pulse every 20 µs, an
invented worst case) shows that cost. No target is set by an issue; the
figures are for the closing note and for regressions.

Run: python benchmarks/measuring_chain.py [--quick]
"""

from __future__ import annotations

import math
import sys
import time

import numpy as np

import pdvoid
from pdvoid.analysis.measured import measure
from pdvoid.inputs.demo import demo_scenario


def best_of(fn, repeats=3):
    best = math.inf
    out = None
    for _ in range(repeats):
        t0 = time.perf_counter()
        out = fn()
        best = min(best, time.perf_counter() - t0)
    return best, out


def main(quick: bool = False) -> None:
    cycles = 2_000 if quick else 20_000
    scenario = demo_scenario()
    circuit = pdvoid.TestCircuit(test_object_capacitance=100e-12, coupling_capacitance=1e-9)
    instruments = {
        "wide-band 100-500 kHz": pdvoid.Instrument("wideband", f_low=100e3, f_high=500e3),
        "narrow-band 200 kHz / 9 kHz": pdvoid.Instrument("narrowband", centre=200e3, bandwidth=9e3),
    }
    pdvoid.simulate(scenario, cycles=10, seed=1)  # compile / load the kernels before timing
    t_sim, result = best_of(lambda: pdvoid.simulate(scenario, cycles=cycles, seed=1))
    pulses = result.events.count
    print(f"demo scenario (invented), {cycles} cycles, {pulses} pulses; simulate: {t_sim:.3f} s")
    print(f"{'instrument':<30} {'time [s]':>9} {'pulses/s':>11} {'ratio to simulate':>18}")
    for name, inst in instruments.items():
        measure(result, circuit, inst, seed=0)  # warm
        t, ev = best_of(lambda inst=inst: measure(result, circuit, inst, seed=0), repeats=1 if not quick else 2)
        print(f"{name:<30} {t:9.3f} {pulses / t:11.4g} {t / t_sim:18.2f}   ({ev.count} readings)")
    n = 20_000 if quick else 200_000
    spacing = 20e-6
    time_s = spacing * (1.0 + np.arange(n))
    freq = 50.0
    dense = pdvoid.Events(phase_deg=(time_s * freq % 1.0) * 360.0, charge=np.full(n, 50e-12), frequency=freq,
                          cycles=math.ceil(time_s[-1] * freq), time=time_s,
                          cycle=np.floor(time_s * freq), label="invented dense train")
    print(f"dense train: {n} pulses of 50 pC every {spacing * 1e6:.0f} us (invented)")
    for name, inst in instruments.items():
        t, ev = best_of(lambda inst=inst: measure(dense, circuit, inst, seed=0), repeats=1)
        print(f"{name:<30} {t:9.3f} {n / t:11.4g} {'':>18}   ({ev.count} readings)")


if __name__ == "__main__":
    main(quick="--quick" in sys.argv)
