"""``pdvoid sweep SWEEP.toml --out results.nc [--resume | --force] [--scheduler ADDRESS] [--workers N]``.

Runs a sweep file into a NetCDF file. Every finished point is kept in ``results.nc.parts`` as it completes; an
interrupted sweep (Ctrl-C, SIGTERM, a kill, a full disk) continues with ``--resume`` and ends with the same
file as an uninterrupted run. Hooked into the main parser by ``pdvoid.cli`` through :func:`register`.
"""

from __future__ import annotations

import argparse
import json
import shlex
import sys
import time
from pathlib import Path

from pdvoid.core.errors import InputError
from pdvoid.faces.cli import options
from pdvoid.faces.cli.output import SAFETY, json_safe
from pdvoid.faces.cli.progress import QUIET_HELP, progress_enabled
from pdvoid.faces.cli.stopping import exit_status, signal_name

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
        "Finished points are kept in OUT.parts as they complete; an interrupted sweep continues with --resume. "
        "Exit status 2 when every point failed. "
        'Needs the optional packages: pip install "pdvoid[sweep]".',
    )
    p.add_argument("sweep_file", metavar="SWEEP.toml", help="sweep file (TOML), e.g. demo_sweep.toml")
    p.add_argument("--out", required=True, help="NetCDF file to write, e.g. results.nc (finished points are kept "
                   "in results.nc.parts until it is written)")
    again = p.add_mutually_exclusive_group()
    again.add_argument("--resume", action="store_true", help="continue the interrupted sweep kept in OUT.parts "
                       "(refused if it is another sweep; default: refuse an existing one)")
    again.add_argument("--force", action="store_true", help="start over: discard OUT.parts and replace OUT "
                       "(default: refuse either)")
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
        help="local worker processes, e.g. 2 (default: every core; 1 = serial)",
    )
    p.add_argument("--no-progress", action="store_true", help="the same as --quiet (default: a progress bar)")
    p.add_argument("--quiet", action="store_true", help=QUIET_HELP)
    p.add_argument("--json", action="store_true", help="print a JSON summary instead of text (default: text)")
    p.set_defaults(func=run)
    return p


def _resume_command(ns: argparse.Namespace) -> str:
    words = ["pdvoid", "sweep", str(ns.sweep_file), "--out", str(ns.out), "--resume"]
    if ns.workers is not None:
        words += ["--workers", str(ns.workers)]
    if ns.scheduler is not None:
        words += ["--scheduler", ns.scheduler]
    return " ".join(shlex.quote(w) for w in words)


def _stopped(ns: argparse.Namespace, parts: Path, exc: KeyboardInterrupt) -> str:
    """What an interrupted sweep left and how to continue it."""
    from pdvoid.sweeps import checkpoint_progress

    try:
        progress = checkpoint_progress(parts)
    except InputError as err:
        progress, note = None, f" ({err})"
    else:
        note = ""
    head = f"pdvoid: sweep stopped ({signal_name(exc)})"
    if progress is None:
        return f"{head} before any point was kept{note}; {ns.out} was not changed. Run the command again."
    done, total = progress
    return (f"{head}: {done} of {total} points are kept in {parts}; {ns.out} was not changed. Continue with:\n"
            f"  {_resume_command(ns)}")


def run(ns: argparse.Namespace) -> int:
    """Execute the parsed ``sweep`` command.

    Parameters
    ----------
    ns : argparse.Namespace
        The parsed arguments of ``pdvoid sweep``.

    Returns
    -------
    int
        The exit status: 0; 2 when every point failed (the file is written with the reasons); 130 after SIGINT
        (Ctrl-C) and 143 after SIGTERM, with the finished points kept and the command that continues the sweep
        printed.

    Raises
    ------
    InputError
        For a bad output path, sweep file, an existing output or checkpoint without --resume or --force, or
        missing optional packages; it propagates to the caller (``pdvoid.faces.cli.command.main``).
    """
    from pdvoid.core.optional import MissingDependencyError
    from pdvoid.sweeps import checkpoint_path, checkpoint_progress, sweep_to_file
    from pdvoid.sweeps.files import read_sweep_file

    out = Path(ns.out)
    if not out.parent.is_dir():
        raise InputError(f"--out {ns.out}: the folder {out.parent} does not exist")
    if out.is_dir():
        raise InputError(f"--out {ns.out}: is a folder; give a file name such as results.nc")
    spec = read_sweep_file(ns.sweep_file)
    parts = checkpoint_path(out)
    before = checkpoint_progress(parts) if ns.resume else None
    if ns.resume and not ns.json:
        if before is None and not out.exists():
            print(f"no interrupted sweep in {parts}: starting from the beginning", file=sys.stderr)
        elif before is not None:
            print(f"resuming: {before[0]} of {before[1]} points were kept in {parts}", file=sys.stderr)
    start = time.perf_counter()
    try:
        ds = sweep_to_file(
            spec.scenario,
            spec.parameters,
            out,
            client=ns.scheduler,
            workers=ns.workers,
            progress=progress_enabled(ns.quiet or ns.no_progress),
            resume=ns.resume,
            overwrite=ns.force,
            **spec.options(),
        )
    except MissingDependencyError as exc:
        raise InputError(str(exc)) from None
    except KeyboardInterrupt as exc:
        print(_stopped(ns, parts, exc), file=sys.stderr)
        return exit_status(exc)
    seconds = time.perf_counter() - start
    metrics = [v for v in ds.data_vars if v not in ("seed", "error")]
    failed = int(ds.attrs["failed_points"])
    points = int(ds.attrs["points"])
    doc = {
        "sweep_file": str(ns.sweep_file),
        "out": str(out),
        "design": spec.design,
        "parameters": list(spec.parameters),
        "points": points,
        "failed_points": failed,
        "resumed_points": 0 if before is None else before[0],
        "cycles": spec.cycles,
        "seed": spec.seed,
        "variables": metrics,
        "seconds": round(seconds, 3),
        "where": f"dask scheduler {ns.scheduler}" if ns.scheduler else "local",
    }
    doc["safety"] = SAFETY
    status = 2 if points and failed == points else 0
    first = next((str(e) for e in ds["error"].values.ravel() if e), "")
    if status:
        print(f"pdvoid: error: every one of the {points} points failed (first: {first}); {out} holds the reasons "
              "in its error variable", file=sys.stderr)
    if ns.json:
        print(json.dumps(json_safe(doc), indent=2, allow_nan=False))
        return status
    resumed = f", {doc['resumed_points']} kept from before" if doc["resumed_points"] else ""
    print(
        f"sweep {spec.design}: {points} points ({failed} failed{resumed}) over {', '.join(spec.parameters)}, "
        f"{spec.cycles} cycles each, seed {spec.seed}, {seconds:.1f} s ({doc['where']})"
    )
    if failed:
        print(f"  first failure: {first}")
    print(f"wrote {out} (variables: {', '.join(map(str, metrics))})")
    print(SAFETY)
    return status
