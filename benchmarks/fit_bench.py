"""Speed of a six-parameter fit to the 1000-cycle synthetic demo pattern, serial and on all local cores.

Target (issue "measured patterns"): ≤ 60 s on 2 cores. Run: python benchmarks/fit_bench.py
"""

from __future__ import annotations

import os
import time

import pdvoid
from pdvoid.analysis.fit import fit
from pdvoid.analysis.synthetic import demo_measured_path, hidden_parameters
from pdvoid.inputs.demo import demo_scenario

VARY = {
    "void.diameter": (0.5e-3, 3e-3),
    "void.height": (0.5e-3, 3e-3),
    "model.residual_ratio": (0.05, 0.6),
    "model.surface_rate_same": (1e3, 1e5),
    "model.surface_rate_reversed": (1e2, 1e5),
    "model.surface_decay_time": (2e-3, 0.2),
}
DETECTOR = dict(noise=2e-12, relative_noise=0.03, phase_resolution_deg=1.0)


def main() -> None:
    measured = pdvoid.read_events(demo_measured_path())
    sc = demo_scenario()
    # the synthetic data used the demo scenario with the hidden parameters changed
    truth = {k: float(getattr(getattr(sc, k.split(".")[0]), k.split(".")[1])) for k in VARY}
    truth.update(hidden_parameters(measured))
    print(f"six-parameter fit to {measured.cycles:g} measured cycles ({measured.count} events, synthetic demo "
          f"data); {os.cpu_count()} cores")
    for label, workers in (("serial", 1), ("all local cores", None)):
        t0 = time.perf_counter()
        r = fit(measured, demo_scenario(), VARY, threshold=10e-12, cycles=1000, seed=1, detector=DETECTOR,
                workers=workers)
        dt = time.perf_counter() - t0
        print(f"\n{label}: {dt:.1f} s for {r.runs} simulations ({dt / r.runs * 1e3:.1f} ms each)")
    print(r.table(truth))


if __name__ == "__main__":
    main()
