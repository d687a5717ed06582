"""The ``fit`` command: fit a void's physics to a measured pattern file."""

from __future__ import annotations

import argparse
import json

from pdvoid.core.errors import InputError
from pdvoid.faces.cli import options
from pdvoid.faces.cli.output import SAFETY, json_safe, notes_lines, validity_notes
from pdvoid.faces.cli.progress import QUIET_HELP, ProgressBar

_DIMENSION = {"void.diameter": "length", "void.height": "length", "insulation.thickness": "length",
              "void.pressure": "pressure", "void.temperature": "temperature", "model.surface_rate_same": "rate",
              "model.surface_rate_reversed": "rate", "model.surface_decay_time": "time",
              "model.charge_decay_time": "time", "model.ionization_rate": "rate density"}


def parse_vary(items: list[str]) -> dict[str, tuple[float, float]]:
    """Parse ``--vary`` items: ``["void.diameter=0.5mm:3mm", "model.residual_ratio=0.05:0.6"]`` → {name: (low,
    high)} in SI.

    Parameters
    ----------
    items : list of str
        ``NAME=LOW:HIGH`` with units [-].

    Returns
    -------
    dict of str to tuple of float
        The range of each name [SI].

    Raises
    ------
    InputError
        For an item without ``=`` and ``:`` or a value whose unit does not fit the name.
    """
    out = {}
    for item in items:
        if "=" not in item or ":" not in item.split("=", 1)[1]:
            raise InputError(f"--vary must look like NAME=LOW:HIGH (e.g. void.diameter=0.5mm:3mm); got {item!r}")
        name, rng = item.split("=", 1)
        lo, hi = rng.split(":", 1)
        dim = _DIMENSION.get(name.strip(), "dimensionless")
        out[name.strip()] = (options.list_quantity(lo, dim, f"--vary {name} low"),
                             options.list_quantity(hi, dim, f"--vary {name} high"))
    return out


def _cmd_fit(ns: argparse.Namespace) -> int:
    if ns.method == "posterior":
        return _cmd_posterior(ns)
    if ns.matrix or ns.warmup:
        raise InputError("--matrix and --warmup need --method posterior (the search reads event files and starts "
                         "every simulation as the voltage is applied)")
    from pdvoid.analysis.fit import fit
    from pdvoid.analysis.synthetic import hidden_parameters
    from pdvoid.inputs.scenario import Scenario
    from pdvoid.io import read_events

    measured = read_events(ns.measured, cycles=ns.cycles_measured, frequency=ns.frequency)
    sc = Scenario.from_file(ns.scenario)
    vary = parse_vary(ns.vary)
    threshold = ns.threshold
    detector = None
    if ns.noise is not None or ns.phase_resolution is not None:
        detector = {"noise": 0.0 if ns.noise is None else ns.noise,
                    "relative_noise": ns.relative_noise,
                    "phase_resolution_deg": 0.0 if ns.phase_resolution is None else ns.phase_resolution}
    # trial designs outside the closed forms' range: notes, not raw warnings
    with validity_notes() as notes, ProgressBar(0, "fitting", "simulation", quiet=ns.quiet) as bar:
        r = fit(measured, sc, vary, threshold=threshold, cycles=1000 if ns.cycles is None else ns.cycles,
                seed=ns.seed, detector=detector,
                popsize=8 if ns.popsize is None else ns.popsize, maxiter=30 if ns.maxiter is None else ns.maxiter,
                workers=ns.workers, progress=bar.update_to)
    truth = None
    try:
        hidden = hidden_parameters(measured)
        truth = {k: hidden[k] for k in vary if k in hidden} or None
    except InputError:
        truth = None
    doc = {"measured": ns.measured, "best": r.best, "ranges": r.ranges, "identified": r.identified,
           "score": r.score, "score noise": r.noise, "start": r.start, "start score": r.start_score,
           "simulations": r.runs, "elapsed [s]": r.elapsed, "validity_notes": notes, "safety": SAFETY}
    if truth and len(truth) == len(vary):
        doc["hidden (synthetic data)"] = truth
    if ns.json:
        print(json.dumps(json_safe(doc), indent=2, allow_nan=False))
    else:
        print(r.table(truth if truth and len(truth) == len(vary) else None))
        for line in notes_lines(notes):
            print(line)
        print(SAFETY)
    if ns.out:
        r.scenario.to_file(ns.out)
    return 0


def _cmd_posterior(ns: argparse.Namespace) -> int:
    from pdvoid.analysis.posterior import posterior
    from pdvoid.analysis.synthetic import hidden_parameters
    from pdvoid.inputs.scenario import Scenario
    from pdvoid.io import read_events, read_pattern_matrix
    from pdvoid.io.matrix import PatternMatrix
    from pdvoid.simulation.events import Events

    if ns.popsize is not None or ns.maxiter is not None:
        raise InputError("--popsize and --maxiter belong to --method search; the posterior takes --walkers, "
                         "--steps and --replicates")
    measured: Events | PatternMatrix
    if ns.matrix:
        measured = read_pattern_matrix(ns.measured, cycles=ns.cycles_measured, frequency=ns.frequency)
    else:
        measured = read_events(ns.measured, cycles=ns.cycles_measured, frequency=ns.frequency)
    sc = Scenario.from_file(ns.scenario)
    vary = parse_vary(ns.vary)
    detector = None
    if ns.noise is not None or ns.phase_resolution is not None:
        detector = {"noise": 0.0 if ns.noise is None else ns.noise,
                    "relative_noise": ns.relative_noise,
                    "phase_resolution_deg": 0.0 if ns.phase_resolution is None else ns.phase_resolution}
    with validity_notes() as notes:
        r = posterior(measured, sc, vary, threshold=ns.threshold, cycles=ns.cycles, warmup=ns.warmup,
                      seed=ns.seed, detector=detector, replicates=ns.replicates, walkers=ns.walkers, steps=ns.steps,
                      workers=ns.workers)
    truth = None
    if isinstance(measured, Events):
        try:
            hidden = hidden_parameters(measured)
            truth = {k: hidden[k] for k in vary if k in hidden} or None
        except InputError:
            truth = None
    if truth and len(truth) != len(vary):
        truth = None
    c = r.check
    if ns.json:
        doc = {"measured": ns.measured, "method": "posterior", "measured kind": r.settings["measured kind"],
               "priors": r.priors, "bounds": r.bounds, "median": r.median, "best": r.best,
               "credible intervals 90 %": {p: r.credible_interval(p, 0.9) for p in r.parameters},
               "predictive check": {"p-value": c.p_value, "verdict": c.verdict, "draws": c.draws,
                                    "farthest statistics (z)": dict(c.worst()), "in words": c.summary()},
               "diagnostics": {"acceptance": r.acceptance, "autocorrelation time [steps]": r.autocorrelation_time,
                               "effective samples": r.effective_samples, "split R-hat": r.rhat},
               "notes": r.notes, "settings": r.settings, "simulations": r.simulations, "elapsed [s]": r.elapsed,
               "validity_notes": notes, "safety": SAFETY}
        if truth:
            doc["hidden (synthetic data)"] = truth
        print(json.dumps(json_safe(doc), indent=2, allow_nan=False))
    else:
        print(r.table(truth))
        for line in notes_lines(notes):
            print(line)
        print(SAFETY)
    if ns.out:
        r.scenario.to_file(ns.out)
    return 0


def register(sub: argparse._SubParsersAction[argparse.ArgumentParser]) -> None:
    """Add the ``fit`` command to the sub-parsers ``sub``.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The sub-parsers of the main parser (from ``ArgumentParser.add_subparsers``).
    """
    f = sub.add_parser("fit", help="fit a void's parameters to a measured pattern file")
    f.add_argument("measured", help="events file (e.g. header 'phase [deg],charge [pC]'), or a count matrix with "
                                    "--matrix")
    f.add_argument("--scenario", required=True, help="starting scenario TOML, e.g. demo.toml")
    f.add_argument("--vary", action="append", required=True,
                   help="a parameter and its range, NAME=LOW:HIGH with units, e.g. "
                   "void.diameter=0.5mm:3mm; repeat for more")
    f.add_argument("--threshold", type=options.charge, default="0C",
                   help="detection threshold of the measurement, e.g. 5pC (default 0C)")
    f.add_argument("--noise", type=options.charge, default=None, help="charge noise of the detector model, e.g. 2pC "
                   "(default: none)")
    f.add_argument("--relative-noise", type=options.number(0.0, 1.0), default=0.0,
                   help="relative charge noise of the detector model, a ratio, e.g. 0.05 (default 0)")
    f.add_argument("--phase-resolution", type=options.phase_angle, default=None,
                   help="phase resolution of the detector model, e.g. 2deg (default: exact phases)")
    f.add_argument("--cycles", type=options.integer(10, 10_000_000), default=None,
                   help="simulated cycles per simulation, e.g. 2000 (default: search 1000, posterior the measured "
                   "cycles)")
    f.add_argument("--cycles-measured", type=options.integer(1), default=None,
                   help="cycles of a phase-only measured file (a count, e.g. 500; default: from the file)")
    f.add_argument("--frequency", type=options.frequency, default=None,
                   help="supply frequency of the measured file, e.g. 50Hz (default: from the file)")
    f.add_argument("--seed", type=options.seed, default=0, help="random seed, e.g. 7 (default 0)")
    f.add_argument("--method", choices=("search", "posterior"), default="search",
                   help="search: best values and acceptance ranges; posterior: credible intervals and a check "
                        "whether the model can produce the pattern at all (default: search)")
    f.add_argument("--matrix", action="store_true",
                   help="the measured file is a phase-resolved count matrix (with --method posterior; default: an "
                   "events file)")
    f.add_argument("--popsize", type=options.integer(4, 200), default=None,
                   help="search: population size per parameter, 4 to 200, e.g. 15 (default 8)")
    f.add_argument("--maxiter", type=options.integer(1, 10_000), default=None,
                   help="search: generations, e.g. 50 (default 30)")
    f.add_argument("--replicates", type=options.integer(13, 1000), default=20,
                   help="posterior: simulations per parameter set, e.g. 40 (default 20)")
    f.add_argument("--walkers", type=options.integer(4, 10_000), default=None,
                   help="posterior: ensemble walkers, even, e.g. 16 (default max(8, 4 x parameters))")
    f.add_argument("--warmup", type=options.integer(0, 1_000_000), default=0,
                   help="posterior: cycles simulated and discarded before each simulated record, when the void had "
                        "been discharging before the measurement started, e.g. 100 (default 0)")
    f.add_argument("--steps", type=options.integer(10, 100_000), default=80,
                   help="posterior: steps per walker, e.g. 150 (default 80)")
    f.add_argument("--workers", type=options.integer(1, 1024), default=1, help="worker processes, e.g. 2 (default 1)")
    f.add_argument("--out", default=None, help="write the fitted scenario (TOML) here, e.g. fitted.toml (default: "
                   "none)")
    f.add_argument("--quiet", action="store_true", help=QUIET_HELP)
    f.add_argument("--json", action="store_true", help="print JSON instead of text (default: text)")
    f.set_defaults(func=_cmd_fit)
