"""Regenerate the isolated-cylinder coefficient table shipped in pdvoid/coefficients/data/cylinder_isolated.npz.

Run: python benchmarks/cylinder_table.py [--out PATH] [--resolution R]

Solves a rounded-rim cylindrical void (rim radius min(D, h)/2) centred in a slab 8 x max(D, h) thick for every
aspect ratio D/h and host permittivity of the table (pdvoid.coefficients.fields.isolated.TABLE_ASPECTS and
TABLE_PERMITTIVITIES), at 48 and 32 cells across the smaller dimension, extrapolated to zero spacing. Takes about
five minutes on one core. reference/cylinder_isolated/source.toml says how the shipped file was made.
"""

from __future__ import annotations

import argparse
import time
from pathlib import Path

from pdvoid.coefficients.fields.isolated import build_cylinder_table

DEFAULT = Path(__file__).resolve().parents[1] / "pdvoid" / "coefficients" / "data" / "cylinder_isolated.npz"


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--out", type=Path, default=DEFAULT)
    parser.add_argument("--resolution", type=float, default=48.0)
    args = parser.parse_args()
    t0 = time.perf_counter()
    build_cylinder_table(args.out, resolution=args.resolution, log=lambda s: print(s, flush=True))
    print(f"wrote {args.out} in {time.perf_counter() - t0:.0f} s")


if __name__ == "__main__":
    main()
