"""Accuracy of the cylinder coefficients (pdvoid.coefficients.cylinder) against the field solver, off the table nodes.

Run: python benchmarks/cylinder_accuracy.py [--quick]

For aspect ratios D/h and permittivities between the nodes of the shipped table, prints the relative error of the
field enhancement f and of the charge per field of :func:`pdvoid.coefficients.cylinder.cylinder_coefficients`
against two solver set-ups that differ from the one that made the table:

- "graded": :func:`pdvoid.coefficients.fields.isolated.isolated_cylinder` at 40 cells (not 48) across the smaller
  dimension, slab 10 x max(D, h) thick (not 8), extrapolated from 40 and 26.7;
- "default": :func:`pdvoid.fields.coefficients_for` with its own grid (grid_for, resolution 30, Richardson
  extrapolation), slab 10 x max(D, h) thick; only up to D/h = 30, where that grid stays affordable.

The slab is thick but finite, so the closed form is evaluated for the same slab thickness.
"""

from __future__ import annotations

import argparse
import time

from pdvoid.coefficients.cylinder import cylinder_coefficients
from pdvoid.coefficients.fields import coefficients_for
from pdvoid.coefficients.fields.isolated import isolated_cylinder
from pdvoid.core.units import EPSILON_0

ASPECTS = (0.13, 0.3, 0.5, 1.0, 2.2, 3.3, 7.0, 15.0, 33.0, 70.0, 150.0, 330.0, 700.0, 1000.0)
PERMITTIVITIES = (1.2, 2.5, 5.0, 8.0, 30.0, 70.0)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="only er = 2.5 and 8")
    args = parser.parse_args()
    ers = (2.5, 8.0) if args.quick else PERMITTIVITIES
    h = 1e-3
    print("method   D/h      er     f_solver  err_f    cpf_err")
    for a in ASPECTS:
        for er in ers:
            d = 10.0 * max(a, 1.0) * h
            c = cylinder_coefficients(a * h, h, d, er)
            t0 = time.perf_counter()
            f, kq, _ = isolated_cylinder(a, er, resolution=40.0, slab_factor=10.0)
            cpf = kq * er * EPSILON_0 * c.volume / d
            print(f"graded  {a:8.3g} {er:6.3g}  {f:9.5f}  {c.field_enhancement / f - 1:+.4f}  "
                  f"{c.charge_per_field / cpf - 1:+.4f}  ({time.perf_counter() - t0:.1f} s)", flush=True)
            if a <= 30.0 and er in (2.5, 8.0):
                s = coefficients_for(d, er, a * h, h, void_shape="cylinder", resolution=30.0)
                print(f"default {a:8.3g} {er:6.3g}  {s.field_enhancement:9.5f}  "
                      f"{c.field_enhancement / s.field_enhancement - 1:+.4f}  "
                      f"{c.charge_per_field / s.charge_per_field - 1:+.4f}", flush=True)


if __name__ == "__main__":
    main()
