"""The commands that run the simulator: ``demo`` (the built-in invented scenario) and ``simulate``."""

from __future__ import annotations

import argparse
import json
import math
import os
from pathlib import Path
from typing import TYPE_CHECKING

from pdvoid._version import __version__
from pdvoid.coefficients import compute_coefficients
from pdvoid.core.errors import InputError
from pdvoid.core.files import MANIFEST_NAME, RUN_FILES, FolderLock, atomic_write, scenario_digest, write_manifest
from pdvoid.core.limits import MAX_CYCLES
from pdvoid.faces.cli import options
from pdvoid.faces.cli.output import SAFETY, json_safe, notes_lines, validity_notes
from pdvoid.faces.cli.progress import QUIET_HELP, ProgressBar
from pdvoid.inputs.demo import DEMO_SERVICE_RMS, DEMO_TEST_RMS, demo_scenario

if TYPE_CHECKING:
    from pdvoid.simulation.results import Result


def _run_summary(result: Result) -> dict[str, float]:
    """The run's summary as ``{"label [display unit]": value}`` (NaN where a number does not exist)."""
    from pdvoid.analysis.summary import run_summary
    from pdvoid.faces.summary_table import summary_dict

    return summary_dict(run_summary(result))


def _regime(result: Result) -> dict[str, object]:
    """The run's regime in words and its expected first wait, with display units in the keys."""
    from pdvoid.analysis.regime import discharge_regime
    from pdvoid.inputs.parameters import Periodic, Sine

    if not isinstance(result.scenario.supply, (Sine, Periodic)):  # the regime analysis is per cycle of a sine
        n = result.event_count
        state = "discharging" if n else "no discharge"
        first = f", the first after {result.first_discharge_time:.4g} s" if n else ""
        return {"state": state, "text": f"{state}: {n} discharges in {result.duration:.6g} s{first} (the "
                "analysis of waits per cycle is for sine and Fourier-series supplies; not computed for a "
                f"{type(result.scenario.supply).__name__} supply)",
                "first discharge after [s]": result.first_discharge_time if n else float("nan")}
    r = discharge_regime(result.scenario, result)
    return {
        "state": r.state, "text": r.text, "first discharge after [s]": r.first_discharge_time,
        "mean wait for a first start electron [s]": r.mean_wait,
        "mean wait for a first start electron [cycles]": r.mean_wait_cycles,
        "cycles for a first discharge with 95 % probability [cycles]": r.cycles_for_95_percent,
        "fraction of the period above inception [-]": r.fraction_above_inception,
    }


def _value(v: float) -> str:
    return f"{v:10.4g}" if math.isfinite(v) else f"{'n/a':>10s}"


def _cmd_demo(ns: argparse.Namespace) -> int:
    from pdvoid.simulation.simulate import simulate

    sc = demo_scenario()
    with validity_notes() as notes:
        c = compute_coefficients(sc)
    rows = {
        "scenario": sc.name,
        "void field per kV applied [kV/mm per kV]": c.field_enhancement / sc.insulation.thickness * 1e3 / 1e6,
        "field enhancement f [-]": c.field_enhancement,
        "inception field, streamer criterion [kV/mm]": c.inception_field_streamer / 1e6,
        "inception field, ionisation integral K=9.15 [kV/mm]": c.inception_field_integral / 1e6,
        "inception voltage, streamer criterion [kV rms]": c.inception_voltage_streamer / 1e3,
        "inception voltage, ionisation integral [kV rms]": c.inception_voltage_integral / 1e3,
        "extinction voltage estimate [kV rms]": c.extinction_voltage / 1e3,
        "apparent charge per discharge (E_inc to E_res) [pC]": c.charge_per_discharge * 1e12,
    }
    runs = {}
    regimes = {}
    with validity_notes() as run_notes:
        for label, rms in (("service", DEMO_SERVICE_RMS), ("test", DEMO_TEST_RMS)):
            s2 = sc.replace(**{"supply.rms": rms})
            res = simulate(s2, cycles=ns.cycles, seed=ns.seed)
            runs[f"{label} voltage {rms / 1e3:g} kV rms"] = _run_summary(res)
            regimes[f"{label} voltage {rms / 1e3:g} kV rms"] = _regime(res)
    all_notes = list(dict.fromkeys(notes + run_notes))
    out = {"demo": rows, "inception regime": c.inception_regime, "inception reason": c.inception_reason,
           "simulations": runs, "regimes": regimes, "validity_notes": all_notes, "cycles": ns.cycles,
           "seed": ns.seed, "safety": SAFETY}
    if ns.json:
        print(json.dumps(json_safe(out), indent=2, allow_nan=False))
        return 0
    print(f"pdvoid demo — {sc.name}")
    print(f"  insulation: {sc.insulation.thickness * 1e3:g} mm, εr = {sc.insulation.permittivity:g}; void: "
          f"{sc.void.diameter * 1e3:g} mm × {sc.void.height * 1e3:g} mm {sc.void.gas} at "
          f"{sc.void.pressure / 1e3:g} kPa")
    for k, v in rows.items():
        if k != "scenario" and isinstance(v, float):
            print(f"  {k:<55s} {_value(v)}")
    print(f"  inception regime: {c.inception_regime} ({c.inception_reason})")
    for label, summ in runs.items():
        print(f"\n  simulation at {label}, {ns.cycles} cycles, seed {ns.seed}:")
        print(f"    regime: {regimes[label]['text']}")
        for k, v in summ.items():
            print(f"    {k:<53s} {_value(v)}")
    for line in notes_lines(all_notes):
        print("\n" + line if line.startswith("Validity") else line)
    print("\n" + SAFETY)
    return 0


def _check_out_folder(out: Path, force: bool) -> None:
    """Refuse an output folder that cannot hold the run, or that holds one already (without ``--force``),
    before any work."""
    if out.exists() and not out.is_dir():
        raise InputError(f"--out: {out} exists and is not a folder")
    probe = out
    while not probe.exists():
        probe = probe.parent
    if not probe.is_dir():
        raise InputError(f"--out: {out} cannot be created: {probe} is not a folder")
    if not os.access(probe, os.W_OK | os.X_OK):
        raise InputError(f"--out: {out} cannot be written: no write permission in {probe}")
    held = [n for n in (*RUN_FILES, MANIFEST_NAME) if (out / n).exists()]
    if held and not force:
        raise InputError(f"--out: {out} already holds a run ({', '.join(held)}); give --force to overwrite it, or "
                         "choose another folder")


def _run_length(sc: object, cycles: int | None, duration: float | None) -> tuple[int | None, float | None]:
    """``(cycles, duration)`` for the scenario's supply: ``--cycles`` for a periodic supply (default 1000),
    ``--duration`` for one without a period (required); the wrong one is refused before any work."""
    supply = getattr(sc, "supply", None)
    periodic = bool(getattr(supply, "periodic", True))
    name = type(supply).__name__
    if periodic:
        if duration is not None:
            raise InputError(f"--duration is for supplies without a period; this {name} supply repeats: give "
                             f"--cycles instead (got --duration {duration:g} s)")
        return (1000 if cycles is None else cycles), None
    if cycles is not None:
        raise InputError(f"--cycles is for periodic supplies; a {name} supply has no period: give --duration "
                         f"instead, e.g. --duration 1000s (got --cycles {cycles})")
    if duration is None:
        raise InputError(f"a {name} supply has no period: give --duration, the simulated time from energisation, "
                         "e.g. --duration 1000s")
    return None, duration


def _cmd_simulate(ns: argparse.Namespace) -> int:
    from pdvoid.inputs.scenario import Scenario
    from pdvoid.inputs.scenario_files import scenario_to_dict
    from pdvoid.simulation.simulate import DEFAULT_PHASE_BINS, simulate

    if ns.phase_bins is not None and not ns.histogram:
        raise InputError("--phase-bins sets the bins of --histogram; give --histogram with it")
    sc = Scenario.from_file(ns.scenario)
    cycles, duration = _run_length(sc, ns.cycles, ns.duration)
    out = Path(ns.out)
    # --histogram keeps no event list, so there is no events.csv to write either
    files = tuple(n for n in RUN_FILES if n != "events.csv" or not (ns.no_events or ns.histogram))
    _check_out_folder(out, ns.force)
    with FolderLock(out):
        _check_out_folder(out, ns.force)  # again under the lock: another run may have finished meanwhile
        total, unit = (cycles, "cycle") if cycles is not None else (1, "run")
        with validity_notes() as notes, ProgressBar(total, "simulating", unit, quiet=ns.quiet) as bar:
            res = simulate(sc, cycles=cycles, duration=duration, seed=ns.seed, progress=bar.update_to,
                           histogram=ns.histogram, phase_bins=ns.phase_bins or DEFAULT_PHASE_BINS)
            c = compute_coefficients(sc)
        # an overwritten folder is marked incomplete first: a run killed from here on leaves a folder that
        # readers refuse, never a mix of old and new files that looks complete
        (out / MANIFEST_NAME).unlink(missing_ok=True)
        res.save(out / "result.npz")
        if "events.csv" in files:
            res.to_csv(out / "events.csv")
        else:  # an events.csv of an earlier run overwritten with --force is not part of this one
            (out / "events.csv").unlink(missing_ok=True)
        summ = _run_summary(res)
        regime = _regime(res)
        doc = {"scenario": str(ns.scenario), "cycles": cycles, "duration [s]": res.duration, "seed": ns.seed,
               "model": {"kind": sc.model.kind, "title": sc.model.title, "assumptions": sc.model.caveat},
               "summary": summ,
               "regime": regime, "inception regime": c.inception_regime, "inception reason": c.inception_reason,
               "validity_notes": notes,
               "mode": "histogram" if ns.histogram else "events",
               "files": [str(out / n) for n in files] + [str(out / MANIFEST_NAME)],
               "references": list(res.references), "safety": SAFETY}
        text = json.dumps(json_safe(doc), indent=2, allow_nan=False)
        with atomic_write(out / "summary.json", "w", encoding="utf-8", newline="\n") as fh:
            fh.write(text)
        digest = scenario_digest(json.dumps(json_safe(scenario_to_dict(sc)), sort_keys=True, allow_nan=False))
        write_manifest(out, files, {
            "pdvoid_version": __version__, "scenario_file": str(ns.scenario), "scenario_sha256": digest,
            "seed": ns.seed, "cycles": res.cycles, "frequency_hz": res.frequency,
            "mode": "histogram" if ns.histogram else "events", "events_file": "events.csv" in files,
        })
    if ns.json:
        print(text)
    else:
        if duration is not None:
            print(f"simulated {duration:.6g} s from energisation (a supply without a period: one observation window)")
        else:
            print(f"simulated {res.cycles} cycles ({res.duration:.6g} s)")
        print(f"regime: {regime['text']}")
        print(f"model: {sc.model.title}; assumptions: {sc.model.caveat}")
        if c.inception_regime != "streamer":
            print(f"inception: {c.inception_regime} ({c.inception_reason})")
        for k, v in summ.items():
            if duration is not None and "per cycle" in k:
                continue  # one observation window: "per cycle" would mean per run
            print(f"{k:<53s} {_value(v)}")
        for line in notes_lines(notes):
            print(line)
        print(f"wrote {', '.join(doc['files'])}")
        print(SAFETY)
    return 0



def register(sub: argparse._SubParsersAction[argparse.ArgumentParser]) -> None:
    """Add the ``demo`` and ``simulate`` commands to the sub-parsers ``sub``.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The sub-parsers of the main parser (from ``ArgumentParser.add_subparsers``).
    """
    d = sub.add_parser("demo", help="run the built-in demo scenario (an invented example)",
                       epilog="example: pdvoid demo --cycles 500 --json")
    d.add_argument("--cycles", type=options.integer(1, MAX_CYCLES), default=2000,
                   help="AC cycles to simulate at each of the two voltages, e.g. 500 (default 2000)")
    d.add_argument("--seed", type=options.seed, default=1,
                   help="seed of the random generator, 0 to 2**32-1, e.g. 7 (default 1)")
    d.add_argument("--json", action="store_true", help="print JSON instead of text (default: text)")
    d.set_defaults(func=_cmd_demo)
    s = sub.add_parser("simulate", help="simulate a scenario file and write result, events CSV and summary",
                       epilog="example: pdvoid simulate demo.toml --out run1 --cycles 100000 --histogram")
    s.add_argument("scenario", help="scenario TOML file, e.g. demo.toml (pdvoid/inputs/examples/)")
    s.add_argument("--cycles", type=options.integer(1, MAX_CYCLES), default=None,
                   help="cycles to simulate for a periodic supply (sine, square wave, cosine-rectangular), e.g. "
                   "100000 (default 1000)")
    s.add_argument("--duration", type=options.time, default=None,
                   help="simulated time from energisation for a supply without a period (DC, polarity reversal, "
                   "piecewise linear), with a unit, e.g. 1000s (default: none, required for such a supply)")
    s.add_argument("--seed", type=options.seed, default=0,
                   help="seed of the random generator, 0 to 2**32-1, e.g. 7 (default 0)")
    s.add_argument("--out", required=True, help="output folder, e.g. run1: result.npz, events.csv, summary.json "
                   "and, written last, manifest.json (file sizes and SHA-256); locked while the run writes")
    s.add_argument("--histogram", action="store_true",
                   help="keep only the phase-resolved count matrix and the IEC 60270 sums, not the event list "
                   "(memory and files independent of the number of discharges, for long runs); writes no "
                   "events.csv (default: keep every event)")
    s.add_argument("--phase-bins", type=options.integer(1, 3600), default=None,
                   help="phase bins over 0-360 deg of --histogram, e.g. 180 (default 72)")
    s.add_argument("--no-events", action="store_true",
                   help="write no events.csv (result.npz still holds the events; default: write it)")
    s.add_argument("--force", action="store_true", help="overwrite a run already in --out (default: refuse)")
    s.add_argument("--quiet", action="store_true", help=QUIET_HELP)
    s.add_argument("--json", action="store_true", help="print the summary as JSON instead of text (default: text)")
    s.set_defaults(func=_cmd_simulate)
