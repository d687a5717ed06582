"""The ``pdvoid plot`` command: a picture of a result, an events file, a sweep or a (fitted) scenario.

::

    pdvoid plot run1/result.npz -o pattern.png          # the phase-resolved pattern of a result
    pdvoid plot measured.csv --cycles 500 -o meas.svg    # the pattern of an events file
    pdvoid plot sweep.nc --metric mean_apparent_charge -o sweep.pdf
    pdvoid plot fitted.toml --measured measured.csv -o fit.png   # simulated and measured side by side

The kind of input is read from its name (``.npz`` result or a run folder, ``.nc`` sweep, ``.toml`` scenario,
anything else an events file) and the format from the output's (PNG, SVG or PDF). The picture is written
atomically and an existing file is kept unless ``--force`` is given.
"""

from __future__ import annotations

import argparse
from pathlib import Path
from typing import Any

from pdvoid.core.errors import InputError
from pdvoid.core.limits import MAX_CYCLES
from pdvoid.faces.cli import options
from pdvoid.faces.cli.output import SAFETY

__all__ = ["register", "FORMATS", "input_kind"]

#: output formats, by file name ending
FORMATS = ("png", "svg", "pdf")
KINDS = ("auto", "pattern", "sweep", "scenario")


def input_kind(path: Path) -> str:
    """What a file to plot holds, judged by its name: ``"result"``, ``"events"``, ``"sweep"`` or ``"scenario"``.

    Parameters
    ----------
    path : pathlib.Path
        The file (or a run folder written by ``pdvoid simulate``) [-].

    Returns
    -------
    str
        The kind [-].
    """
    if path.is_dir() or path.suffix.lower() == ".npz":
        return "result"
    if path.suffix.lower() == ".nc":
        return "sweep"
    if path.suffix.lower() == ".toml":
        return "scenario"
    return "events"


def _check_output(ns: argparse.Namespace) -> tuple[Path, str]:
    """The output file and its format, refused before any work: format, folder, an existing file."""
    out = Path(ns.output)
    fmt = out.suffix.lower().lstrip(".")
    if fmt not in FORMATS:
        raise InputError(f"-o/--output {ns.output}: the name must end in .png, .svg or .pdf (the format is read "
                         "from it)")
    folder = out.parent if str(out.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(f"-o/--output {ns.output}: the folder {folder} does not exist")
    if out.is_dir():
        raise InputError(f"-o/--output {ns.output}: is a folder; give a file name such as pattern.png")
    if out.exists() and not ns.force:
        raise InputError(f"-o/--output {ns.output} exists; give --force to overwrite it, or choose another name")
    source = Path(ns.file)
    if out.exists() and source.exists() and out.resolve() == source.resolve():
        raise InputError(f"-o/--output {ns.output} is the input file itself")
    return out, fmt


def _result_path(path: Path) -> Path:
    if path.is_dir():
        inner = path / "result.npz"
        if not inner.is_file():
            raise InputError(f"{path}: a folder to plot must be a run folder of pdvoid simulate (with result.npz)")
        return inner
    return path


def _pattern_figure(ns: argparse.Namespace, data: Any, title: str) -> Any:
    from pdvoid.faces.plots import phase_pattern

    ax = phase_pattern(data, phase_bins=ns.phase_bins, charge_bins=ns.charge_bins, charge_scale=ns.charge_scale)
    ax.set_title(title, fontsize=9)
    return ax.figure


def _scenario_figure(ns: argparse.Namespace, path: Path) -> tuple[Any, str]:
    from pdvoid.faces.plots import compare
    from pdvoid.faces.plots.style import new_figure
    from pdvoid.inputs.scenario import Scenario
    from pdvoid.simulation.simulate import simulate

    sc = Scenario.from_file(path)
    measured = None
    if ns.measured is not None:
        from pdvoid.io import read_events

        measured = read_events(ns.measured, cycles=ns.cycles, frequency=ns.frequency)
    result = simulate(sc, cycles=ns.simulate_cycles, seed=ns.seed)
    head = f"{path.name}: simulated, {ns.simulate_cycles} cycles, seed {ns.seed}"
    if measured is None:
        return _pattern_figure(ns, result, head), "simulated pattern"
    fig = new_figure((11.0, 7.0))
    grid = fig.add_gridspec(2, 2)
    axes = [fig.add_subplot(grid[0, 0]), fig.add_subplot(grid[0, 1]), fig.add_subplot(grid[1, :])]
    compare(result, measured, axes, phase_bins=ns.phase_bins, charge_bins=ns.charge_bins,
            labels=("simulated", f"measured ({Path(ns.measured).name})"))
    fig.suptitle(head, fontsize=9)
    return fig, "simulated and measured patterns side by side"


def _sweep_figure(ns: argparse.Namespace, path: Path) -> Any:
    from pdvoid.core.optional import MissingDependencyError
    from pdvoid.faces.plots.sweeps import sweep_plot

    try:
        from pdvoid.sweeps import read_netcdf

        ds = read_netcdf(path)
    except MissingDependencyError as exc:
        raise InputError(str(exc)) from None
    ax = sweep_plot(ds, metric=ns.metric, parameter=ns.parameter)
    return ax.figure


def _cmd_plot(ns: argparse.Namespace) -> int:
    from pdvoid.core.files import atomic_write

    out, fmt = _check_output(ns)
    source = Path(ns.file)
    if not source.exists():
        raise InputError(f"{ns.file}: no such file")
    kind = input_kind(source)
    wanted = {"pattern": ("result", "events"), "sweep": ("sweep",), "scenario": ("scenario",)}
    if ns.kind != "auto" and kind not in wanted[ns.kind]:
        raise InputError(f"--kind {ns.kind}: {ns.file} looks like a {kind} file (judged by its name)")
    if kind != "scenario" and ns.measured is not None:
        raise InputError("--measured goes with a scenario file (e.g. the output of pdvoid fit --out)")
    if kind != "sweep" and (ns.metric is not None or ns.parameter is not None):
        raise InputError("--metric and --parameter go with a sweep file (.nc)")
    if kind == "sweep":
        if ns.metric is None:
            ns.metric = "discharges_per_cycle"
        fig, what = _sweep_figure(ns, source), f"{ns.metric} against a swept parameter"
    elif kind == "scenario":
        fig, what = _scenario_figure(ns, source)
    elif kind == "result":
        from pdvoid.simulation.results import load

        res = load(_result_path(source))
        mode = "histogram run" if res.histogram is not None else "events"
        fig = _pattern_figure(ns, res, f"{source.name}: {res.cycles} cycles, seed {res.seed} ({mode})")
        what = "phase-resolved pattern"
    else:
        from pdvoid.io import read_events

        ev = read_events(source, cycles=ns.cycles, frequency=ns.frequency)
        fig = _pattern_figure(ns, ev, f"{source.name}: {ev.count} events over {ev.cycles:g} cycles")
        what = "phase-resolved pattern"
    with atomic_write(out, "wb") as fh:
        fig.savefig(fh, format=fmt, dpi=ns.dpi, facecolor="white")
    print(f"wrote {out} ({what}, {fmt.upper()})")
    print(SAFETY)
    return 0


def register(sub: argparse._SubParsersAction[argparse.ArgumentParser]) -> argparse.ArgumentParser:
    """Add the ``plot`` command to the sub-parsers ``sub``.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The sub-parsers of the main parser (from ``ArgumentParser.add_subparsers``).

    Returns
    -------
    argparse.ArgumentParser
        The parser of the ``plot`` command.
    """
    p = sub.add_parser(
        "plot", help="draw a result, events file, sweep or fitted scenario as PNG, SVG or PDF",
        description="Draw a picture: the phase-resolved pattern of a result (.npz or a run folder) or an events "
        "file; a metric against a swept parameter for a sweep file (.nc); the simulated pattern of a scenario "
        "file (.toml, e.g. written by pdvoid fit --out), beside a measured one with --measured. White background, "
        "viridis/cividis colours, a unit on every axis.",
        epilog="example: pdvoid plot run1/result.npz -o pattern.png",
    )
    p.add_argument("file", help="what to draw, e.g. run1/result.npz, measured.csv, sweep.nc or fitted.toml")
    p.add_argument("-o", "--output", required=True,
                   help="picture to write; the format is read from the ending, e.g. pattern.png, .svg or .pdf")
    p.add_argument("--force", action="store_true", help="overwrite an existing picture (default: refuse)")
    p.add_argument("--kind", choices=KINDS, default="auto",
                   help="what FILE holds: auto (from its name), pattern, sweep or scenario; another kind than "
                   "the name suggests is refused (default auto)")
    p.add_argument("--charge-scale", choices=("log", "linear"), default="log",
                   help="apparent-charge axis of a pattern: log (symmetric) or linear (default log)")
    p.add_argument("--phase-bins", type=options.integer(1, 3600), default=72,
                   help="phase bins of a pattern drawn from events, e.g. 36 (default 72)")
    p.add_argument("--charge-bins", type=options.integer(1, 10000), default=60,
                   help="charge bins of a pattern drawn from events, e.g. 40 (default 60)")
    p.add_argument("--cycles", type=options.integer(1), default=None,
                   help="AC cycles observed in an events file without a time column, e.g. 500 (default: from "
                   "the file)")
    p.add_argument("--frequency", type=options.frequency, default=None,
                   help="supply frequency of an events file, e.g. 50Hz (default: from the file's comments)")
    p.add_argument("--metric", default=None,
                   help="sweep variable on the y axis, e.g. mean_apparent_charge (default discharges_per_cycle)")
    p.add_argument("--parameter", default=None,
                   help="swept parameter on the x axis, e.g. void.pressure (default: the first swept one)")
    p.add_argument("--measured", default=None,
                   help="with a scenario file: a measured events file drawn beside the simulation, e.g. "
                   "measured.csv (default: none)")
    p.add_argument("--simulate-cycles", type=options.integer(1, MAX_CYCLES), default=1000,
                   help="cycles simulated for a scenario file, e.g. 2000 (default 1000)")
    p.add_argument("--seed", type=options.seed, default=0,
                   help="seed of the simulation of a scenario file, e.g. 7 (default 0)")
    p.add_argument("--dpi", type=options.integer(50, 600), default=150,
                   help="resolution of a PNG in dots per inch, 50 to 600, e.g. 300 (default 150)")
    p.set_defaults(func=_cmd_plot)
    return p
