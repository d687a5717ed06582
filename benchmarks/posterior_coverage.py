"""Coverage of the posterior fit's 90 % credible intervals, and the time of a 3-parameter posterior.

1. Coverage study: ``--patterns`` (default 21) synthetic patterns of the demo void, each with a diameter and a
   residual ratio drawn from the prior (uniform 1.3-2.5 mm, uniform 0.1-0.5), made by an independent path (the
   void runner advanced in chunks of 25 cycles, phases folded here, then the detector model, with seeds
   10**6 + i that the fit never uses; the record starts after 100 cycles of activity, on both sides). For each
   pattern the posterior (2 parameters, 200-cycle patterns, 8 walkers x 100 steps) gives
   90 % credible intervals; the script prints, per parameter, how often they hold the truth (target 80-97 %), and
   how often the predictive check wrongly flags a pattern the model made (p < 0.01).
2. Speed: a 3-parameter posterior (diameter, residual ratio, surface emission rate) on a 1000-cycle synthetic
   pattern with the default settings on 2 local processes (target <= 2 min on 2 cores), and the predictive check
   of a surface-discharge-like pattern (one polarity, pulses at the voltage peak).

SYNTHETIC DATA, NOT MEASUREMENTS. Run: python benchmarks/posterior_coverage.py [--patterns 20]
"""

from __future__ import annotations

import argparse
import os
import time
import warnings

import numpy as np

from pdvoid.analysis.posterior import posterior
from pdvoid.analysis.synthetic import measurement_effects, synthetic_measurement
from pdvoid.core.validity import ValidityWarning
from pdvoid.inputs.demo import demo_scenario
from pdvoid.simulation.events import Events
from pdvoid.simulation.simulate import VoidRunner

DETECTOR = dict(noise=2e-12, relative_noise=0.03, phase_resolution_deg=1.0)
THRESHOLD = 10e-12
# smaller voids often wait longer than the whole record for a first electron (no discharge to fit): the prior starts
# at 1.3 mm
PRIOR = {"void.diameter": (1.3e-3, 2.5e-3), "model.residual_ratio": (0.1, 0.5)}
VARY3 = {"void.diameter": (0.5e-3, 3e-3), "model.residual_ratio": (0.05, 0.6), "model.surface_rate_same": (1e3, 1e5)}
HIDDEN3 = {"void.diameter": 1.8e-3, "model.residual_ratio": 0.32, "model.surface_rate_same": 1.6e4}


#: cycles the void runs before each record starts (discarded on both sides, ``warmup=`` of the fit): the record is
#: taken on an active void, as a measurement usually is; without it the wait for a first electron (seconds for the
#: smaller voids here) makes the discharge count bimodal, which a normal synthetic likelihood does not describe
WARMUP = 100


def independent_pattern(values: dict, cycles: int, seed: int) -> Events:
    """Synthetic events made without the fit's simulator call (runner in chunks after WARMUP cycles, detector
    model)."""
    sc = demo_scenario().replace(**values)
    runner = VoidRunner(sc, seed)
    runner.run(WARMUP)
    pieces = [runner.run(25)[:2] for _ in range(cycles // 25)]
    t = np.concatenate([p[0] for p in pieces])
    q = np.concatenate([p[1] for p in pieces])
    f = sc.supply.frequency
    t = t - WARMUP / f
    cyc = np.floor(t * f)
    phase = np.minimum((t * f - cyc) * 360.0, np.nextafter(360.0, 0.0))
    ev = Events(phase_deg=phase, charge=q, frequency=f, cycles=float(cycles), time=t, cycle=cyc)
    return measurement_effects(ev, seed, threshold=THRESHOLD, **DETECTOR)


def surface_like(cycles: int, seed: int) -> Events:
    """One polarity only, every pulse near the voltage peak (90 ± 6 deg), 3 per cycle, about 60 pC."""
    rng = np.random.default_rng(seed)
    n = 3 * cycles
    phase = np.clip(rng.normal(90.0, 6.0, n), 0.0, 179.9)
    charge = 60e-12 * np.exp(rng.normal(0.0, 0.3, n))
    cycle = np.sort(rng.integers(0, cycles, n)).astype(float)
    return Events(phase_deg=phase, charge=charge, frequency=50.0, cycles=float(cycles), cycle=cycle,
                  time=(cycle + phase / 360.0) / 50.0, label="synthetic surface-discharge-like pattern")


def coverage(patterns: int, walkers: int, steps: int) -> None:
    rng = np.random.default_rng(2027)
    hits = dict.fromkeys(PRIOR, 0)
    flagged = done = 0
    pvals = []
    t0 = time.perf_counter()
    for i in range(patterns):
        truth = {k: float(rng.uniform(*b)) for k, b in PRIOR.items()}
        data = independent_pattern(truth, 200, 10**6 + i)
        if data.count < 20:
            print(f"pattern {i:2d}: {data.count} discharges above the threshold, too few to fit; skipped", flush=True)
            continue
        done += 1
        r = posterior(data, demo_scenario(), PRIOR, threshold=THRESHOLD, detector=DETECTOR, seed=i, replicates=20,
                      walkers=walkers, steps=steps, check_draws=100, warmup=WARMUP, workers=2)
        line = []
        for k in PRIOR:
            lo, hi = r.credible_interval(k, 0.9)
            ok = lo <= truth[k] <= hi
            hits[k] += ok
            line.append(f"{k} {truth[k]:.4g} in [{lo:.4g}, {hi:.4g}] {'yes' if ok else 'NO'}")
        flagged += r.check.poor
        pvals.append(r.check.p_value)
        print(f"pattern {i:2d}: " + "; ".join(line) + f"; check p = {r.check.p_value:.3f}; {r.elapsed:.0f} s",
              flush=True)
    print(f"\ncoverage of the 90 % credible intervals over {done} fitted patterns (target 80-97 %):")
    for k in PRIOR:
        print(f"  {k}: {hits[k]} of {done} = {100 * hits[k] / max(done, 1):.0f} %")
    print(f"predictive check on patterns the model made: {flagged} of {done} flagged as poor fits (p < 0.01); "
          f"median p {np.median(pvals):.2f}")
    print(f"coverage study: {time.perf_counter() - t0:.0f} s")


def speed() -> None:
    data = synthetic_measurement(demo_scenario(), 1000, 987654, hidden=HIDDEN3, threshold=THRESHOLD, **DETECTOR)
    print(f"\n3-parameter posterior on a {data.cycles:g}-cycle synthetic pattern ({data.count} events); "
          f"{os.cpu_count()} cores, 2 worker processes, default settings")
    t0 = time.perf_counter()
    r = posterior(data, demo_scenario(), VARY3, threshold=THRESHOLD, detector=DETECTOR, seed=1, workers=2)
    dt = time.perf_counter() - t0
    print(f"time: {dt:.1f} s for {r.simulations} simulations (target <= 120 s on 2 cores)")
    print(r.table(HIDDEN3))
    bad = posterior(surface_like(1000, 3), demo_scenario(), VARY3, threshold=THRESHOLD, detector=DETECTOR, seed=1,
                    workers=2)
    print("\nsurface-discharge-like pattern (synthetic):")
    print(bad.check.summary())


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--patterns", type=int, default=21,
                    help="patterns drawn (default 21: one record of the draws has no discharge)")
    ap.add_argument("--walkers", type=int, default=8, help="walkers of each coverage posterior (default 8)")
    ap.add_argument("--steps", type=int, default=100, help="steps of each coverage posterior (default 100)")
    ap.add_argument("--skip-coverage", action="store_true")
    ap.add_argument("--skip-speed", action="store_true")
    ns = ap.parse_args()
    warnings.simplefilter("ignore", ValidityWarning)  # trial voids wide against the slab: closed forms ~2 % off
    if not ns.skip_coverage:
        print(f"coverage posteriors: {ns.walkers} walkers x {ns.steps} steps, 20 replicates, 200-cycle records")
        coverage(ns.patterns, ns.walkers, ns.steps)
    if not ns.skip_speed:
        speed()


if __name__ == "__main__":
    main()
