"""Solver runs behind the slab weights and the electrode-proximity envelope of pdvoid.coefficients.cylinder.

Run: python benchmarks/cylinder_slab_study.py > runs.txt   (about two minutes on one core)

Prints one line per solve (the format of reference/cylinder_isolated/slab_runs.txt), then the least-squares fits:

- slab weights w = x²/(x² + b x + c), x = D/d, of the field enhancement and of the charge per field, from flat
  rounded-rim cylinders ("C" lines; pdvoid.coefficients.cylinder.SLAB_WEIGHT_FIELD / SLAB_WEIGHT_CHARGE);
- the envelope scale·(h/d)^p·(D/d)^q of the error of far-from-electrode formulas for compact spheroids ("S"
  lines: D/h = 0.3 to 3, max(D, h)/d = 0.3 to 0.7, errors relative to the same spheroid at max(D, h)/d = 0.1;
  PROXIMITY_* constants). The S lines are in reference/cylinder_isolated/proximity_runs.txt.
"""

from __future__ import annotations

import numpy as np
from scipy.optimize import least_squares

from pdvoid.coefficients.cylinder import isolated_cylinder_factors
from pdvoid.coefficients.fields import coefficients_for
from pdvoid.coefficients.fields.isolated import isolated_cylinder
from pdvoid.core.units import EPSILON_0

H = 1e-3


def runs() -> list[tuple]:
    out = []
    plan = [(a, 4.0, x) for a in (10.0, 30.0, 100.0) for x in (0.25, 0.5, 1.0, 2.0, 4.0, 8.0)]
    plan += [(30.0, er, x) for er in (2.0, 10.0) for x in (0.5, 1.0, 2.0, 4.0)]
    for a, er, x in plan:
        d = a * H / x
        if d <= 1.3 * H:
            continue
        f, k, _ = isolated_cylinder(a, er, thickness=d, resolution=32, extrapolate=False)
        out.append(("C", a, er, x, d, f, k))
        print(*out[-1], flush=True)
    for a in (1.0, 3.0, 0.3):
        for x in (0.1, 0.2, 0.3, 0.5, 0.7):
            d = max(a, 1.0) * H / x
            f, k, _ = isolated_cylinder(a, 4.0, thickness=d, resolution=32, extrapolate=False)
            out.append(("K", a, 4.0, x, d, f, k))
            print(*out[-1], flush=True)
    for a in (0.3, 0.5, 1.0, 2.0, 3.0):
        for x in (0.1, 0.3, 0.35, 0.4, 0.45, 0.5, 0.6, 0.7):
            d = max(a, 1.0) * H / x
            s = coefficients_for(d, 4.0, a * H, H, resolution=32)
            kq = s.charge_per_field * d / (4.0 * EPSILON_0 * s.void_volume)
            out.append(("S", a, 4.0, x, d, s.field_enhancement, kq))
            print(*out[-1], flush=True)
    return out


def fit(rows: list[tuple]) -> None:
    flat = [r for r in rows if r[0] == "C"]

    def weight(x, b, c):
        return x * x / (x * x + b * x + c)

    def res_f(p):
        out = []
        for _, a, er, _x, d, f, _k in flat:
            n, _ = isolated_cylinder_factors(a, er)
            s = (1 - n) + H / d * weight(a * H / d, *p)
            out.append(1 / (1 / er + s * (1 - 1 / er)) / f - 1)
        return out

    def res_q(p):
        out = []
        for _, a, er, _x, d, _f, k in flat:
            _, kq = isolated_cylinder_factors(a, er)
            out.append(kq * d / (d - H * weight(a * H / d, *p)) / k - 1)
        return out

    pf = least_squares(res_f, [2.0, 2.0]).x
    pq = least_squares(res_q, [2.0, 2.0]).x
    print(f"# w_f (b, c) = {pf}, largest residual {np.max(np.abs(res_f(pf))):.4f}")
    print(f"# w_q (b, c) = {pq}, largest residual {np.max(np.abs(res_q(pq))):.4f}")
    pts = []
    for a in (0.3, 0.5, 1.0, 2.0, 3.0):
        sph = [r for r in rows if r[0] == "S" and r[1] == a]
        f0, k0 = sph[0][5], sph[0][6]
        for _, _a, _er, _x, d, f, k in sph[1:]:
            err = max(abs(f0 / f - 1), abs(k0 / k - 1))
            if err > 0.002:  # below the solver's noise the ratio says nothing
                pts.append((H / d, a * H / d, err))
    p = np.array(pts)
    design = np.c_[np.ones(len(p)), np.log(p[:, 0]), np.log(p[:, 1])]
    sol, *_ = np.linalg.lstsq(design, np.log(p[:, 2]), rcond=None)
    print(f"# proximity envelope: scale {np.exp(sol[0]):.3f}, (h/d) exponent {sol[1]:.3f}, (D/d) exponent {sol[2]:.3f}")


if __name__ == "__main__":
    fit(runs())
