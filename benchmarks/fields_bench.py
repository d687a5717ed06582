"""Benchmark of the axisymmetric field solver: coefficients on a 200 x 400 grid (issue 7 target <= 2 s).

Run: python benchmarks/fields_bench.py [--repeat N]

Prints, for a 1 mm spherical void in a 2 mm epoxy slab: the time to assemble, factorise and solve one
200 x 400 grid (coefficients_for with extrapolate=False), the same with Richardson extrapolation (adds a
100 x 200 grid), and the split between assembly, factorisation and the solves. Times are the best of N runs.
Then the time per simulated cycle of the time-domain reference model and of the reduced model (pdvoid.simulate).
"""

from __future__ import annotations

import argparse
import time

import numpy as np

import pdvoid


def best(fn, repeat: int) -> tuple[float, object]:
    out = None
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        out = fn()
        times.append(time.perf_counter() - t0)
    return min(times), out


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=3)
    args = parser.parse_args()
    from pdvoid.coefficients.fields import FieldSolver, coefficients_for, grid_for, specimen_layout, void_region
    from pdvoid.coefficients.fields.assembly import assemble

    geometry = dict(thickness=2e-3, permittivity=4.0, void_diameter=1e-3, void_height=1e-3)
    t, c = best(lambda: coefficients_for(**geometry, cells=(200, 400), extrapolate=False), args.repeat)
    print(f"coefficients_for, 200 x 400 grid ({c.unknowns} unknowns):      {t:6.3f} s   (target <= 2 s)")
    print(f"  f = {c.field_enhancement:.5f}, charge_per_field = {c.charge_per_field:.5e} C/(V/m)")
    t, c = best(lambda: coefficients_for(**geometry, cells=(200, 400), extrapolate=True), args.repeat)
    print(f"coefficients_for, 200 x 400 + 100 x 200 (extrapolated):    {t:6.3f} s")
    print(f"  f = {c.field_enhancement:.5f}, charge_per_field = {c.charge_per_field:.5e} C/(V/m)")

    layout = specimen_layout(2e-3, 4.0, void=void_region(1e-3, 1e-3, 1e-3))
    grid = grid_for(layout, cells=(200, 400))
    ta, _ = best(lambda: assemble(layout, grid), args.repeat)
    tf, solver = best(lambda: FieldSolver(layout, grid), args.repeat)
    rhs = np.random.default_rng(1).normal(size=solver.assembly.n_unknowns)
    ts, _ = best(lambda: solver.apply_inverse(rhs), args.repeat)
    print(f"  assembly {ta:.3f} s, assembly + LU factorisation {tf:.3f} s, one extra solve {ts * 1e3:.1f} ms")

    cycle_benchmark(args.repeat)


def cycle_benchmark(repeat: int) -> None:
    """Time per simulated cycle: time-domain reference vs the reduced model (pdvoid.simulate), lag-free."""
    from pdvoid.coefficients.fields import (
        FieldSolver,
        conductive_void_reference,
        grid_for,
        specimen_layout,
        void_region,
    )

    try:
        import importlib

        simulate_module = importlib.import_module("pdvoid.simulate")
        from pdvoid import FieldModel, Insulation, Sine, Void
        from pdvoid.inputs.scenario import Scenario
    except ImportError as exc:  # the reduced model is another part of the package
        print(f"reduced model not available ({exc}); skipping the per-cycle comparison")
        return
    base = Scenario(Insulation(2e-3, 4.0), Void(1e-3, 1e-3), Sine(1.0), FieldModel(lag_free=True))
    coef = pdvoid.compute_coefficients(base)
    rms = 2.0 * coef.inception_voltage  # twice the inception voltage: a few discharges per cycle
    scenario = Scenario(Insulation(2e-3, 4.0), Void(1e-3, 1e-3), Sine(rms), FieldModel(lag_free=True))
    coef = pdvoid.compute_coefficients(scenario)
    simulate_module.simulate(scenario, cycles=10, seed=1)  # compile / warm up
    n_red = 20000
    t_red, res = best(lambda: simulate_module.simulate(scenario, cycles=n_red, seed=1), repeat)
    per_red = t_red / n_red
    layout = specimen_layout(2e-3, 4.0, void=void_region(1e-3, 1e-3, 1e-3))
    solver = FieldSolver(layout, grid_for(layout))
    n_td = 5
    t_td, ref = best(
        lambda: conductive_void_reference(
            solver,
            amplitude=rms * 2**0.5,
            frequency=scenario.supply.frequency,
            inception_field=coef.inception_field,
            residual_field=coef.residual_field,
            cycles=n_td,
        ),
        1,
    )
    per_td = t_td / n_td
    print(f"time per cycle, reduced model (simulate, lag-free):      {per_red * 1e6:8.2f} us")
    print(
        f"time per cycle, time-domain reference ({solver.grid.shape[0]} x {solver.grid.shape[1]} grid, "
        f"{len(ref) / n_td:.0f} discharges/cycle, {ref.steps // max(len(ref), 1)} steps each): "
        f"{per_td * 1e3:8.2f} ms"
    )
    print(f"ratio time-domain / reduced: {per_td / per_red:,.0f}   (target >= 1000)")


if __name__ == "__main__":
    main()
