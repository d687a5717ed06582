"""``pdvoid sweep SWEEP.toml --out results.nc [--scheduler ADDRESS] [--workers N]``: run a sweep file.

Hooked into the main parser by ``pdvoid.cli`` through :func:`register`.
"""

from __future__ import annotations

import argparse
import json
import time
from pathlib import Path

from pdvoid.core.errors import InputError
from pdvoid.faces.cli import options
from pdvoid.faces.cli.output import SAFETY

__all__ = ["register", "run"]


def register(subparsers: argparse._SubParsersAction[argparse.ArgumentParser]) -> argparse.ArgumentParser:
    """Add the ``sweep`` command to an argparse sub-parser collection.

    Parameters
    ----------
    subparsers : argparse._SubParsersAction
        The sub-parsers of the main parser (from ``ArgumentParser.add_subparsers``).

    Returns
    -------
    argparse.ArgumentParser
        The parser of the ``sweep`` command.
    """
    p = subparsers.add_parser(
        "sweep",
        help="run a parameter sweep file (grid, random or Latin hypercube) and write a NetCDF file",
        description="Run the sweep described in SWEEP.toml (base scenario, [sweep] design, cycles, seed, "
        "samples, [parameters]) on local processes or a Dask scheduler and write the results as NetCDF. "
        'Needs the optional packages: pip install "pdvoid[sweep]".',
    )
    p.add_argument("sweep_file", metavar="SWEEP.toml", help="sweep file (TOML)")
    p.add_argument("--out", required=True, help="NetCDF file to write, e.g. results.nc")
    where = p.add_mutually_exclusive_group()
    where.add_argument(
        "--scheduler",
        metavar="ADDRESS",
        default=None,
        help="run on the Dask scheduler at ADDRESS (e.g. tcp://127.0.0.1:8786)",
    )
    where.add_argument(
        "--workers",
        type=options.integer(1),
        default=None,
        metavar="N",
        help="local worker processes (default: every core; 1 = serial)",
    )
    p.add_argument("--no-progress", action="store_true", help="do not show a progress bar")
    p.add_argument("--json", action="store_true", help="print a JSON summary instead of text")
    p.set_defaults(func=run)
    return p


def run(ns: argparse.Namespace) -> int:
    """Execute the parsed ``sweep`` command.

    Parameters
    ----------
    ns : argparse.Namespace
        The parsed arguments of ``pdvoid sweep``.

    Returns
    -------
    int
        The exit status, 0.

    Raises
    ------
    InputError
        For a bad output path, sweep file or missing optional packages; it propagates to the caller
        (``pdvoid.faces.cli.command.main``).
    """
    from pdvoid.core.optional import MissingDependencyError
    from pdvoid.sweeps import sweep, write_netcdf
    from pdvoid.sweeps.files import read_sweep_file

    out = Path(ns.out)
    if not out.parent.is_dir():
        raise InputError(f"--out {ns.out}: the folder {out.parent} does not exist")
    if out.is_dir():
        raise InputError(f"--out {ns.out}: is a folder; give a file name such as results.nc")
    spec = read_sweep_file(ns.sweep_file)
    start = time.perf_counter()
    try:
        ds = sweep(
            spec.scenario,
            spec.parameters,
            client=ns.scheduler,
            workers=ns.workers,
            progress=not ns.no_progress,
            **spec.options(),
        )
    except MissingDependencyError as exc:
        raise InputError(str(exc)) from None
    seconds = time.perf_counter() - start
    write_netcdf(ds, out)
    metrics = [v for v in ds.data_vars if v not in ("seed", "error")]
    failed = int(ds.attrs["failed_points"])
    doc = {
        "sweep_file": str(ns.sweep_file),
        "out": str(out),
        "design": spec.design,
        "parameters": list(spec.parameters),
        "points": int(ds.attrs["points"]),
        "failed_points": failed,
        "cycles": spec.cycles,
        "seed": spec.seed,
        "variables": metrics,
        "seconds": round(seconds, 3),
        "where": f"dask scheduler {ns.scheduler}" if ns.scheduler else "local",
    }
    doc["safety"] = SAFETY
    if ns.json:
        print(json.dumps(doc, indent=2))
        return 0
    print(
        f"sweep {spec.design}: {doc['points']} points ({failed} failed) over {', '.join(spec.parameters)}, "
        f"{spec.cycles} cycles each, seed {spec.seed}, {seconds:.1f} s ({doc['where']})"
    )
    if failed:
        first = next(str(e) for e in ds["error"].values.ravel() if e)
        print(f"  first failure: {first}")
    print(f"wrote {out} (variables: {', '.join(map(str, metrics))})")
    print(SAFETY)
    return 0
