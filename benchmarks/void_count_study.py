"""How often pdvoid.void_count recognises the number of hidden voids, over several synthetic patterns.

Each pattern is made by pdvoid.simulate_voids with hidden voids (two of 0.8 mm and 3 mm, or one of 1.6 mm, all
1 mm tall, in a 6 mm slab at 18 kV: synthetic data) and its own seed; the fits use other seeds. Prints, for each
case, the share of patterns recognised with the right number of voids and the time per study.

Run: python benchmarks/void_count_study.py [patterns] [--full]
(default 8 patterns per case with the reduced settings of the fast test: one or two voids, 500 cycles per
evaluation, 12 generations; --full: one to three voids, 1000 cycles, 30 generations, as the slow test).
"""

from __future__ import annotations

import sys
import time
import warnings

import pdvoid
from pdvoid.analysis.void_count import void_count

TEMPLATE = pdvoid.Scenario(
    insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
    void=pdvoid.Void(diameter=1e-3, height=1e-3),
    supply=pdvoid.Sine(rms=18e3),
    model=pdvoid.FieldModel(residual_ratio=0.25, ionization_rate=1e9, surface_rate_same=1e4,
                            surface_rate_reversed=3e3, surface_decay_time=0.02),
)
CASES = {"two voids (0.8 mm, 3 mm)": (0.8e-3, 3e-3), "one void (1.6 mm)": (1.6e-3,)}
REDUCED = dict(counts=(1, 2), cycles=500, popsize=6, maxiter=12, check_seeds=6, seed=1)
FULL = dict(counts=(1, 2, 3), cycles=1000, maxiter=30, seed=1)


def main() -> None:
    args = [a for a in sys.argv[1:] if not a.startswith("--")]
    patterns = int(args[0]) if args else 8
    settings = FULL if "--full" in sys.argv else REDUCED
    warnings.simplefilter("ignore", pdvoid.ValidityWarning)  # large trial voids in a 6 mm slab: expected
    print(f"settings: {settings}")
    for name, diameters in CASES.items():
        hidden = pdvoid.MultiVoidScenario.from_scenario(TEMPLATE, [pdvoid.Void(diameter=d, height=1e-3)
                                                                   for d in diameters])
        right, times, found = 0, [], []
        for k in range(patterns):
            measured = pdvoid.simulate_voids(hidden, 1000, seed=500_000 + k).events
            t0 = time.perf_counter()
            r = void_count(measured, TEMPLATE, {"void.diameter": (0.3e-3, 5e-3)}, **settings)
            times.append(time.perf_counter() - t0)
            found.append(r.supported)
            right += r.supported == len(diameters)
        print(f"{name}: recognised {right} of {patterns} (supported counts {found}); "
              f"{sum(times) / len(times):.1f} s per study")


if __name__ == "__main__":
    main()
