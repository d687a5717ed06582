"""Time a DC run of 1e4 s simulated time through pdvoid.simulate (time-domain kernel), and the DC repetition
rate against the host conductivity.

Invented test case (not a measured object): a 1 mm spherical air void in 10 mm of insulation (εr = 4) at 40 kV DC.
Prints the wall-clock time of each run after a warm-up call (the first call pays numba's start-up) and, side by
side, the same simulated time of a 50 Hz AC run of the same peak for scale. Run from the repository root:

    PYTHONPATH=. python benchmarks/dc_run.py
"""

from __future__ import annotations

import math
import time
import warnings

import pdvoid
from pdvoid.physics.conduction import void_relaxation_time


def scenario(sigma: float, supply: object, lag_free: bool = False) -> pdvoid.Scenario:
    return pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=10e-3, permittivity=4.0, conductivity=sigma),
        void=pdvoid.Void(diameter=1e-3, height=1e-3),
        supply=supply,  # type: ignore[arg-type]
        model=pdvoid.FieldModel(lag_free=lag_free, ionization_rate=1e10),
    )


def timed(label: str, run) -> pdvoid.Result:
    t0 = time.perf_counter()
    r = run()
    dt = time.perf_counter() - t0
    print(f"{label:55s} {dt:8.3f} s wall   {r.event_count:8d} discharges   {r.event_count / r.duration:10.4g} /s")
    return r


def main() -> None:
    warnings.simplefilter("ignore", pdvoid.ValidityWarning)
    peak = 40e3
    pdvoid.simulate(scenario(1e-13, pdvoid.DC(peak)), duration=10.0)  # warm-up (compilation / cache load)
    print("DC runs of 1e4 s simulated time (after a warm-up call):")
    timed("DC 40 kV, sigma 1e-13 S/m", lambda: pdvoid.simulate(scenario(1e-13, pdvoid.DC(peak)), duration=1e4))
    timed("DC 40 kV, sigma 1e-11 S/m", lambda: pdvoid.simulate(scenario(1e-11, pdvoid.DC(peak)), duration=1e4))
    timed("DC 40 kV + 1 % ripple at 300 Hz, sigma 1e-13 S/m",
          lambda: pdvoid.simulate(scenario(1e-13, pdvoid.DC(peak, ripple=((1, 0.01, 0.0),))), duration=1e4))
    timed("DC 40 kV + 1 % ripple at 300 Hz, lag-free",
          lambda: pdvoid.simulate(scenario(1e-13, pdvoid.DC(peak, ripple=((1, 0.01, 0.0),)), True), duration=1e4))
    ac = timed("for scale: AC 50 Hz, same peak, 100 s (cycle kernel)",
               lambda: pdvoid.simulate(scenario(0.0, pdvoid.Sine(peak / math.sqrt(2))), cycles=5000))
    print()
    print("Periodic supplies, side by side (the time-domain kernel against the cycle kernel):")
    lossless = timed("AC 50 Hz, 2000 cycles, perfect dielectric (cycle kernel)",
                     lambda: pdvoid.simulate(scenario(0.0, pdvoid.Sine(peak / math.sqrt(2))), cycles=2000))
    lossy = timed("AC 50 Hz, 2000 cycles, sigma 1e-30 S/m (time-domain kernel)",
                  lambda: pdvoid.simulate(scenario(1e-30, pdvoid.Sine(peak / math.sqrt(2))), cycles=2000))
    del lossless, lossy
    sq = pdvoid.SquareWave(peak, frequency=1e3, rise_time=1e-6)
    timed("square wave 1 kHz, 1 us edges, 1e5 edges, lag-free", lambda: pdvoid.simulate(
        scenario(0.0, sq, True), cycles=50_000))
    print()
    print("DC repetition rate against conductivity (lag-free and with the statistical lag; 1e5 s runs):")
    print(f"{'sigma [S/m]':>12s} {'tau [s]':>12s} {'lag-free [1/s]':>16s} {'with lag [1/s]':>16s} {'AC/DC (lag)':>12s}")
    for sigma in (1e-16, 1e-15, 1e-14, 1e-13, 1e-12, 1e-11, 1e-10):
        rates = []
        for lag_free in (True, False):
            r = pdvoid.simulate(scenario(sigma, pdvoid.DC(peak), lag_free), duration=1e5, seed=1)
            rates.append(r.event_count / r.duration)
        tau = void_relaxation_time(4.0, 1.0 / 3.0, sigma)
        ratio = ac.event_count / ac.duration / rates[1] if rates[1] else math.inf
        print(f"{sigma:12.0e} {tau:12.4g} {rates[0]:16.4g} {rates[1]:16.4g} {ratio:12.3g}")


if __name__ == "__main__":
    main()
