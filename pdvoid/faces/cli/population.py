"""The ``population`` command: the probability that a part with a population of voids passes a routine test."""

from __future__ import annotations

import argparse
from pathlib import Path
from typing import TYPE_CHECKING

from pdvoid.core.errors import InputError
from pdvoid.core.limits import MAX_TEXT_FILE_BYTES
from pdvoid.faces.cli import options
from pdvoid.faces.cli.output import SAFETY, emit, validity_notes

if TYPE_CHECKING:
    from pdvoid.inputs.population import VoidPopulation

length = options.quantity("length")

#: most lines of a diameters file [-]
MAX_SIZE_LINES = 100_000


def read_diameters(path: str) -> tuple[float, ...]:
    """Void diameters from a text file: one size with its unit per line (e.g. ``0.42 mm``); blank lines and lines
    starting with ``#`` are skipped.

    Parameters
    ----------
    path : str
        The file.

    Returns
    -------
    tuple of float
        The diameters [m].

    Raises
    ------
    InputError
        For an unreadable file, a line that is not a length with a unit (naming the line), or no size at all.
    """
    from pdvoid.core.files import read_text_bytes

    p = Path(path)
    text, _ = read_text_bytes(p, MAX_TEXT_FILE_BYTES, "the diameters file")
    out: list[float] = []
    for n, line in enumerate(text.splitlines(), start=1):
        item = line.strip()
        if not item or item.startswith("#"):
            continue
        if len(out) >= MAX_SIZE_LINES:
            raise InputError(f"{path}: more than {MAX_SIZE_LINES} sizes")
        out.append(options.list_quantity(item, "length", f"{path}, line {n}"))
    if not out:
        raise InputError(f"{path}: no void diameter in the file (one size with its unit per line, e.g. 0.4 mm)")
    return tuple(out)


def _population(ns: argparse.Namespace) -> VoidPopulation:
    from pdvoid.inputs.population import VoidPopulation

    given = [ns.diameters is not None, ns.diameters_file is not None, ns.median is not None]
    if sum(given) != 1:
        raise InputError("give the void sizes in one way: --diameters LIST, --diameters-file FILE, or --median with "
                         "--sigma and --largest (a log-normal distribution)")
    count = "fixed" if ns.fixed_count else "poisson"
    if ns.median is None and any(v is not None for v in (ns.sigma, ns.largest, ns.smallest)):
        raise InputError("--sigma, --smallest and --largest belong to a log-normal population: give --median too")
    if ns.diameters is not None:
        sizes = tuple(options.list_quantity(x, "length", "--diameters") for x in ns.diameters.split(",") if x.strip())
        if not sizes:
            raise InputError("--diameters needs at least one size, e.g. --diameters 0.3mm,0.5mm")
        return VoidPopulation(voids_per_part=ns.voids_per_part, diameters=sizes, count=count,
                              aspect_ratio=ns.aspect_ratio)
    if ns.diameters_file is not None:
        return VoidPopulation(voids_per_part=ns.voids_per_part, diameters=read_diameters(ns.diameters_file),
                              count=count, aspect_ratio=ns.aspect_ratio)
    return VoidPopulation(voids_per_part=ns.voids_per_part, median_diameter=ns.median, sigma=ns.sigma,
                          smallest=ns.smallest, largest=ns.largest, count=count, aspect_ratio=ns.aspect_ratio)


def _cmd_population(ns: argparse.Namespace) -> int:
    from pdvoid.analysis.population import acceptance_probability
    from pdvoid.inputs.scenario import Scenario

    design = Scenario.from_file(ns.scenario)
    pop = _population(ns)
    with validity_notes() as notes:
        r = acceptance_probability(design, pop, ns.level, ns.duration, voltage=ns.voltage, parts=ns.parts,
                                   seed=ns.seed, quantity=ns.quantity, confidence=ns.confidence,
                                   workers=ns.workers)
    doc = {
        "scenario": ns.scenario, "pass probability": r.probability, "interval": list(r.interval),
        "confidence": r.confidence, "interval method": "Wilson score (Monte-Carlo sampling error only)",
        "parts": r.parts, "passed": r.passed, "acceptance level [C]": r.level, "quantity": r.quantity,
        "test voltage [V rms]": r.voltage, "duration [s]": r.duration, "cycles": r.cycles,
        "discharge-free diameter [m]": r.pd_free_diameter,
        "probability of no void at or above it (analytic lower bound)": r.pd_free_probability,
        "population": pop.kind, "voids per part": pop.voids_per_part, "count": pop.count, "seed": r.seed,
        "elapsed [s]": r.elapsed, "notes": list(r.notes) + list(notes), "safety": SAFETY,
    }
    emit(doc, ns.json, [r.summary(), *(f"note: {n}" for n in notes)])
    return 0


def register(sub: argparse._SubParsersAction[argparse.ArgumentParser]) -> None:
    """Add the ``population`` command to the sub-parsers ``sub``.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The sub-parsers of the main parser (from ``ArgumentParser.add_subparsers``).
    """
    p = sub.add_parser("population", help="probability that a part with a population of voids passes a routine "
                       "test (acceptance level at a test voltage for a test duration)")
    p.add_argument("scenario", help="design scenario TOML, e.g. demo.toml (insulation, model, supply; its void gives "
                   "gas, shape, position and, unless --aspect-ratio, the height/diameter ratio)")
    p.add_argument("--level", type=options.quantity("charge"), required=True,
                   help="acceptance level: a part passes at or below it, e.g. 10pC")
    p.add_argument("--duration", type=options.time, required=True, help="test duration, e.g. 60s")
    p.add_argument("--voltage", type=options.voltage, default=None,
                   help="test voltage (rms), e.g. 18kV (default: the scenario's supply)")
    p.add_argument("--voids-per-part", type=options.number(0.0, 1000.0), required=True,
                   help="mean number of voids per part (Poisson), or the number with --fixed-count, e.g. 3")
    p.add_argument("--fixed-count", action="store_true", help="every part holds exactly --voids-per-part voids "
                   "(default: a Poisson number)")
    p.add_argument("--diameters", default=None, help="measured void diameters, comma-separated, e.g. 0.3mm,0.5mm")
    p.add_argument("--diameters-file", default=None, help="text file of measured diameters, one per line with unit, "
                   "e.g. ct_sizes.txt")
    p.add_argument("--median", type=length, default=None, help="median diameter of a log-normal population, e.g. 0.4mm")
    p.add_argument("--sigma", type=options.number(0.01, 5.0), default=None,
                   help="standard deviation of ln(diameter) of the log-normal population, e.g. 0.5")
    p.add_argument("--smallest", type=length, default=None,
                   help="smallest diameter of the log-normal population, e.g. 0.05mm")
    p.add_argument("--largest", type=length, default=None,
                   help="largest diameter of the log-normal population, e.g. 2mm")
    p.add_argument("--aspect-ratio", type=options.number(0.01, 100.0), default=None,
                   help="height/diameter of every void, e.g. 0.5 (default: that of the scenario's void)")
    p.add_argument("--parts", type=options.integer(1, 1_000_000), default=1000,
                   help="parts to simulate, e.g. 5000 (default 1000)")
    p.add_argument("--quantity", choices=("largest", "repeated"), default="largest",
                   help="a part's level: largest (the largest apparent charge) or repeated (the largest "
                   "repeatedly occurring one, 100 per second) (default largest)")
    p.add_argument("--confidence", type=options.number(0.5, 0.9999), default=0.95,
                   help="confidence level of the interval, e.g. 0.99 (default 0.95)")
    p.add_argument("--seed", type=options.seed, default=0, help="random seed, e.g. 7 (default 0)")
    p.add_argument("--workers", type=options.integer(1, 1024), default=1,
                   help="worker processes, e.g. 2 (default 1; the estimate is the same for any number)")
    p.add_argument("--json", action="store_true", help="print JSON instead of text (default: text)")
    p.set_defaults(func=_cmd_population)
