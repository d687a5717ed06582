"""Side by side: a DC run of 1e4 s simulated time and a PWM run of 1e6 edges (time-domain kernel).

Invented test case (not a measured object): a 1 mm spherical air void in 10 mm of insulation (εr = 4,
σ = 1e-13 S/m) at 40 kV DC; the same void under a bipolar 10 kHz square wave of ±40 kV with 100 ns edges for
5e5 periods (1e6 edges), with the statistical lag, and once more with a start-electron supply so high that
most edges discharge. Prints the wall-clock and process CPU time of each run (best of
three, after a warm-up call that pays numba's start-up), the discharges, and the ratio PWM/DC measured in the same
run; target (issue 14): each under a few seconds on one core. Run from the repository root:

    PYTHONPATH=. python benchmarks/supply_runs.py [--profile]

``--profile`` runs the PWM case once under cProfile: the split of the run between the kernel calls and the Python
around them (building the supply pieces).
"""

from __future__ import annotations

import cProfile
import math
import pstats
import sys
import time
import warnings

import pdvoid


def scenario(supply: object, ionization_rate: float = 1e10) -> pdvoid.Scenario:
    return pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=10e-3, permittivity=4.0, conductivity=1e-13),
        void=pdvoid.Void(diameter=1e-3, height=1e-3),
        supply=supply,  # type: ignore[arg-type]
        model=pdvoid.FieldModel(ionization_rate=ionization_rate),
    )


def best(run, repeats: int = 3) -> tuple[float, float, pdvoid.Result]:
    wall, cpu, out = math.inf, math.inf, None
    for _ in range(repeats):
        t0, c0 = time.perf_counter(), time.process_time()
        out = run()
        wall, cpu = min(wall, time.perf_counter() - t0), min(cpu, time.process_time() - c0)
    assert out is not None
    return wall, cpu, out


def main() -> None:
    warnings.simplefilter("ignore", pdvoid.ValidityWarning)
    dc = scenario(pdvoid.DC(40e3))
    pwm = scenario(pdvoid.SquareWave(40e3, frequency=1e4, rise_time=100e-9))
    pdvoid.simulate(dc, duration=10.0, seed=1)  # warm-up (compilation or cache load)
    pdvoid.simulate(pwm, cycles=10, seed=1)
    if "--profile" in sys.argv:
        prof = cProfile.Profile()
        prof.enable()
        pdvoid.simulate(pwm, cycles=500_000, seed=1)
        prof.disable()
        pstats.Stats(prof).sort_stats("cumulative").print_stats(15)
        return
    rows = {"DC 40 kV, 1e4 s": best(lambda: pdvoid.simulate(dc, duration=1e4, seed=1)),
            "PWM ±40 kV 10 kHz, 100 ns edges, 1e6 edges": best(lambda: pdvoid.simulate(pwm, cycles=500_000, seed=1)),
            "the same, start electrons 1e14 /(m3 s) (busy)": best(lambda: pdvoid.simulate(
                scenario(pwm.supply, 1e14), cycles=500_000, seed=1))}
    print(f"{'run':46s} {'wall [s]':>9s} {'CPU [s]':>9s} {'discharges':>11s}")
    for label, (wall, cpu, r) in rows.items():
        print(f"{label:46s} {wall:9.3f} {cpu:9.3f} {r.event_count:11d}")
    (w_dc, c_dc, _), (w_pwm, c_pwm, _), _ = rows.values()
    print(f"PWM/DC: {w_pwm / w_dc:.3g} by wall time, {c_pwm / c_dc:.3g} by CPU time")


if __name__ == "__main__":
    main()
