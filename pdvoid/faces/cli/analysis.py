"""Command-line commands that read discharge sequences and inception margins: pattern, inception, margin."""

from __future__ import annotations

import argparse
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from pdvoid.core.errors import InputError
from pdvoid.faces.cli import options
from pdvoid.faces.cli.output import SAFETY, emit, fmt, notes_lines, validity_notes
from pdvoid.faces.cli.progress import QUIET_HELP, ProgressBar

if TYPE_CHECKING:
    from pdvoid.analysis.verdict import InceptionBand
    from pdvoid.simulation.events import Events
    from pdvoid.simulation.results import Result


def _load_events(path: str, cycles: int | None, frequency: float | None) -> Result | Events:
    p = Path(path)
    if p.suffix.lower() == ".npz":
        from pdvoid.simulation.results import load

        return load(p)
    from pdvoid.io import read_events

    return read_events(p, cycles=cycles, frequency=frequency)


def _cmd_pattern(ns: argparse.Namespace) -> int:
    from pdvoid.analysis.descriptors import fingerprint
    from pdvoid.analysis.patterns import pattern
    from pdvoid.analysis.quantities import iec60270
    from pdvoid.simulation.events import as_events

    ev = _load_events(ns.file, ns.cycles, ns.frequency)
    pat = pattern(ev, phase_bins=ns.phase_bins, charge_bins=ns.charge_bins, charge_scale=ns.charge_scale)
    q = iec60270(ev)
    events = as_events(ev)
    doc = {
        "file": ns.file,
        "cycles": events.cycles,
        "events": events.count,
        "discharges per cycle [-]": events.count / events.cycles,
        "pattern": {"counts": pat.counts, "phase_edges [deg]": pat.phase_edges_deg,
                    "charge_edges [pC]": np.asarray(pat.charge_edges) * 1e12},
        "iec60270": {"average discharge current I [A]": q.average_current, "quadratic rate D [C^2/s]":
                     q.quadratic_rate, "discharge power P [W]": q.power, "pulse repetition rate n [1/s]":
                     q.repetition_rate, "reference time [s]": q.reference_time},
        "fingerprint": fingerprint(ev),
        "safety": SAFETY,
    }
    reasons = {"discharge power P [W]": _power_gap(events)} if not np.isfinite(q.power) else {}
    if reasons:
        doc["not computed"] = reasons
    lines = [f"{ns.file}: {events.count} events over {events.cycles:g} cycles "
             f"({events.count / events.cycles:.4g} per cycle)"]
    for k, v in doc["iec60270"].items():
        lines.append(f"  {k:<40s} {_number_or_reason(v, reasons.get(k))}")
    lines.append("  descriptors:")
    for k, v in doc["fingerprint"].items():
        lines.append(f"    {k:<38s} {_number_or_reason(v)}")
    emit(doc, ns.json, lines)
    return 0


def _power_gap(events: Events) -> str:
    """Why the discharge power P = sum q_i u_i / T_ref cannot be computed for ``events``, in words."""
    u = events.voltage
    if u is None or not np.any(np.isfinite(u)):
        return ("cannot be computed: the file gives no applied voltage at the discharges (P needs the "
                "instantaneous voltage u_i of each one; add a voltage column, e.g. 'voltage [kV]')")
    return ("cannot be computed: some discharges in the file have no applied voltage (P needs the instantaneous "
            "voltage u_i of each one)")


def _number_or_reason(value: float, reason: str | None = None) -> str:
    """A table cell: the number, or why there is none (never "nan")."""
    if np.isfinite(value):
        return f"{value:.4g}"
    return reason or "not defined for these events"


def _inception_text(regime: str, reason: str, voltage: float) -> str:
    """The inception voltage in words: a number in kV rms, or the regime and its reason when there is none."""
    from pdvoid.analysis.verdict import regime_words

    if regime == "no self-sustained discharge" or not np.isfinite(voltage):
        return regime_words("no self-sustained discharge", reason)
    return f"{voltage / 1e3:.5g} kV rms ({regime} regime)"


def _band_doc(band: InceptionBand) -> dict[str, object]:
    return {"inception band [V rms]": [band.low, band.high], "criteria in the band": list(band.criteria),
            "inception voltage, streamer criterion [V rms]": band.streamer,
            "inception voltage, ionisation integral [V rms]": band.integral,
            "inception voltage, streamer criterion over the quoted (E/p)_cr spread [V rms]":
            list(band.streamer_range),
            "inception regime": band.regime, "inception reason": band.reason, "band": band.describe()}


def _supply_words(sc: object) -> str:
    """Why the AC (50 Hz sine, perfect dielectric) analysis does not apply to ``sc``, or "" when it does."""
    from pdvoid.inputs.parameters import Periodic, Sine
    from pdvoid.models.time_domain import needs_time_domain

    sup = getattr(sc, "supply", None)
    if not isinstance(sup, (Sine, Periodic)):
        return f"a {type(sup).__name__} supply"
    if needs_time_domain(sc):  # type: ignore[arg-type]
        return "a conducting insulation (its void field depends on the frequency through conduction)"
    return ""


def _cmd_supply_inception(ns: argparse.Namespace, sc: object, why: str) -> int:
    """``pdvoid inception`` for a supply other than a sine in a perfect dielectric: the supply's own quantity."""
    from pdvoid.analysis.supply_inception import supply_inception

    if ns.ramp:
        raise InputError(f"--ramp simulates a stepped test over AC cycles of a sine in a perfect dielectric; this "
                         f"scenario has {why}: run the analytic estimate without --ramp, or simulate the voltage "
                         "levels with pdvoid simulate")
    with validity_notes() as notes:
        r = supply_inception(sc)  # type: ignore[arg-type]
    q = r.quantity
    values = {f"inception voltage [V, {q}]": r.inception_voltage,
              f"extinction voltage [V, {q}]": r.extinction_voltage,
              f"lag-free inception voltage [V, {q}]": r.lag_free_inception_voltage,
              f"transient inception voltage [V, {q}]": r.transient_inception_voltage,
              "voltage jump per edge at inception [V]": r.edge_inception_voltage,
              "voltage jump per edge at extinction [V]": r.edge_extinction_voltage,
              "void field per applied field [-]": r.enhancement, "relaxation time [s]": r.relaxation_time}
    values = {k: v for k, v in values.items() if not np.isnan(v)}
    doc: dict[str, object] = {"scenario": ns.scenario, "supply": r.supply, "quantity": q,
                              "analytic": values, "assumptions": list(r.notes), "validity_notes": notes,
                              "safety": SAFETY}
    lines = [f"{ns.scenario}: analytic, {r.supply} supply (voltages as {q})"]
    for k, v in values.items():
        shown = f"{v:.5g}" if np.isfinite(v) else "none at any voltage (see the notes)"
        lines.append(f"  {k:<52s} {shown}")
    lines += ["Assumptions:"] + [f"  - {n}" for n in r.notes]
    emit(doc, ns.json, lines + notes_lines(notes))
    return 0


def _cmd_inception(ns: argparse.Namespace) -> int:
    from pdvoid.analysis.inception import inception
    from pdvoid.analysis.verdict import band_from_coefficients
    from pdvoid.coefficients import compute_coefficients
    from pdvoid.inputs.scenario import Scenario

    sc0 = Scenario.from_file(ns.scenario)
    why = _supply_words(sc0)
    if why:
        return _cmd_supply_inception(ns, sc0, why)
    with validity_notes() as notes:
        sc = Scenario.from_file(ns.scenario)
        est = inception(sc)
        coef = compute_coefficients(sc)
        band = band_from_coefficients(coef)
        r = None
        if ns.ramp:
            with ProgressBar(ns.seeds, "stepped tests", "test", quiet=ns.quiet) as bar:
                r = inception(sc, ramp=True, step=ns.step, dwell=ns.dwell, threshold=ns.threshold,
                              repeat_count=ns.repeat_count, seeds=range(ns.seeds), progress=bar.update_to)
    analytic = {
        "inception voltage [V rms]": est.inception_voltage,
        "inception voltage, streamer criterion [V rms]": est.inception_voltage_streamer,
        "inception voltage, ionisation integral [V rms]": est.inception_voltage_integral,
        "extinction voltage estimate [V rms]": est.extinction_voltage,
        "inception field [V/m]": est.inception_field, "residual field [V/m]": est.residual_field,
        "field enhancement [-]": est.field_enhancement}
    if coef.local_field_factor != 1.0:  # a coaxial insulation: the enhancement is per mean field V/(R - r_i)
        analytic["local field at the void per mean field [-]"] = coef.local_field_factor
    doc: dict[str, object] = {"scenario": ns.scenario, "analytic": {**analytic, **_band_doc(band)}}
    said = _inception_text(est.inception_regime, est.inception_reason, est.inception_voltage)
    lines = [f"{ns.scenario}: analytic", f"  inception voltage: {said}"]
    if est.inception_reason and est.inception_regime != "no self-sustained discharge":
        lines.append(f"    why: {est.inception_reason}")
    if est.inception_regime != "no self-sustained discharge":
        lines.append(f"  {band.describe()}")
    lines += [f"  {k:<48s} {fmt(v, '', digits=5).rstrip()}" for k, v in analytic.items()]
    if r is not None:
        doc["ramp test"] = {
            "inception voltage [V rms]": r.inception_voltage, "inception voltage std [V rms]":
            r.inception_voltage_std, "extinction voltage [V rms]": r.extinction_voltage,
            "extinction voltage std [V rms]": r.extinction_voltage_std, "per seed inception [V rms]":
            r.inception_voltages, "per seed extinction [V rms]": r.extinction_voltages, "step [V]": r.step,
            "dwell [s]": r.dwell, "threshold [C]": r.threshold, "repeat count [-]": r.repeat_count}
        lines.append(f"simulated stepped test ({ns.seeds} seeds, step {r.step:.4g} V, dwell {r.dwell:.4g} s):")
        lines.append(f"  inception voltage [V rms]  {r.inception_voltage:.5g} ± {r.inception_voltage_std:.3g}")
        lines.append(f"  extinction voltage [V rms] {r.extinction_voltage:.5g} ± {r.extinction_voltage_std:.3g}")
    doc["validity_notes"] = notes
    doc["safety"] = SAFETY
    emit(doc, ns.json, lines + notes_lines(notes))
    return 0


def _cmd_margin(ns: argparse.Namespace) -> int:
    from pdvoid.analysis.margins import design_margin, largest_pd_free_void, margin_table
    from pdvoid.analysis.verdict import inception_band, verdict
    from pdvoid.inputs.scenario import Scenario

    why = _supply_words(Scenario.from_file(ns.scenario))
    if why:
        raise InputError(f"pdvoid margin compares an rms test voltage with the inception of a sine in a perfect "
                         f"dielectric; this scenario has {why}, so that comparison would be wrong. Use pdvoid "
                         "inception: it gives the inception voltage in the supply's own quantity (DC level, VLF "
                         "level, peak-to-peak of the impulses)")
    with validity_notes() as notes:
        sc = Scenario.from_file(ns.scenario)
        values = None
        if ns.values:
            unit_dim = {"void.size": "length", "void.diameter": "length", "void.height": "length",
                        "void.pressure": "pressure",
                        "insulation.thickness": "length"}.get(ns.parameter, "dimensionless")
            values = [options.list_quantity(v, unit_dim, "--values") for v in ns.values.split(",")]
        band = inception_band(sc)
        table = margin_table(sc, ns.parameter, values, test_voltage=ns.test_voltage)
        lv = largest_pd_free_void(sc, ns.test_voltage)
        dm = None
        if ns.nominal_voltage is not None:
            dm = design_margin(sc, ns.nominal_voltage, ns.test_voltage / ns.nominal_voltage)
    all_notes = list(dict.fromkeys([*band.notes, *notes]))
    outcome = verdict(band, ns.test_voltage)
    doc: dict[str, object] = {
        "scenario": ns.scenario, "test voltage [V rms]": ns.test_voltage, "verdict": outcome,
        **_band_doc(band), "table": table.as_rows(), "table validity notes": list(table.notes),
        "table errors (why a row was not computed)": list(table.errors),
        "largest discharge-free void": {"diameter [m]": lv.diameter, "height [m]": lv.height,
                                        "inception voltage [V rms]": lv.inception_voltage,
                                        "limited by": lv.limited_by or "none"}}
    lines = [f"{ns.scenario}: margin against a test at {ns.test_voltage / 1e3:.4g} kV rms",
             f"  verdict: {outcome}", f"  {band.describe()}"]
    if band.single_criterion and band.criteria:
        lines.append("  (the verdict rests on one criterion only)")
    rows = table.as_rows()
    keys = list(rows[0].keys())
    lines.append("  " + " | ".join(keys))
    row_notes = list(table.notes) if len(table.notes) == len(rows) else [""] * len(rows)
    row_errors = list(table.errors) if len(table.errors) == len(rows) else [""] * len(rows)
    for row, note, error in zip(rows, row_notes, row_errors, strict=True):
        if error:  # an impossible combination: say why instead of a row of nan
            lines.append(f"  {row[keys[0]]:.4g} | not computed: {error}")
            continue
        lines.append("  " + " | ".join(f"{row[k]:.4g}" for k in keys) + (" *" if note else ""))
    if any(row_notes):
        lines.append("  * closed forms outside their verified range for this row (--json lists why)")
    lines.append(f"  largest discharge-free void at this shape: diameter {lv.diameter * 1e3:.4g} mm, height "
                 f"{lv.height * 1e3:.4g} mm" + (f" (limited by {lv.limited_by})" if lv.limited_by else ""))
    if dm is not None:
        doc["design"] = {"nominal voltage [V rms]": dm.nominal_voltage, "test factor [-]": dm.test_factor,
                         "inception margin to test level [-]": dm.margin,
                         "extinction margin to nominal voltage [-]": dm.extinction_margin}
        lines.append(f"  this void: inception/test = {dm.margin:.3g}, extinction/nominal = "
                     f"{dm.extinction_margin:.3g}")
    doc["validity_notes"] = all_notes
    doc["safety"] = SAFETY
    emit(doc, ns.json, lines + notes_lines(all_notes))
    return 0


def register(sub: argparse._SubParsersAction[argparse.ArgumentParser]) -> None:
    """Add the ``pattern``, ``inception`` and ``margin`` commands to the sub-parsers ``sub``.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The sub-parsers of the main parser (from ``ArgumentParser.add_subparsers``).
    """
    p = sub.add_parser("pattern", help="phase-resolved pattern, IEC 60270 quantities and descriptors of a result "
                       "(.npz) or an events file")
    p.add_argument("file", help="result (.npz, e.g. run1/result.npz) or events file (e.g. measured.csv)")
    p.add_argument("--cycles", type=options.integer(1), default=None,
                   help="observed cycles, for event files without time (a count, e.g. 500)")
    p.add_argument("--frequency", type=options.frequency, default=None,
                   help="supply frequency for event files, e.g. 50Hz")
    p.add_argument("--phase-bins", type=options.integer(1, 3600), default=72, help="phase bins, e.g. 36 (default 72)")
    p.add_argument("--charge-bins", type=options.integer(1, 10000), default=50,
                   help="charge bins, e.g. 40 (default 50)")
    p.add_argument("--charge-scale", choices=("log", "linear"), default="log",
                   help="charge bins: log (symmetric) or linear (default log)")
    p.add_argument("--json", action="store_true", help="print JSON instead of text (default: text)")
    p.set_defaults(func=_cmd_pattern)

    i = sub.add_parser("inception", help="inception and extinction voltages: analytic, and a simulated "
                       "stepped-voltage test with --ramp")
    i.add_argument("scenario", help="scenario TOML file, e.g. demo.toml")
    i.add_argument("--ramp", action="store_true",
                   help="also simulate a stepped-voltage test (default: the analytic estimate only)")
    i.add_argument("--step", type=options.voltage, default=None,
                   help="voltage step of --ramp, e.g. 0.2kV (default: 2 %% of the analytic inception voltage)")
    i.add_argument("--dwell", type=options.time, default=1.0, help="time per step, e.g. 1s (default 1s)")
    i.add_argument("--threshold", type=options.charge, default=0.0,
                   help="detection threshold of --ramp, e.g. 5pC (default 0pC)")
    i.add_argument("--repeat-count", type=options.integer(1), default=10,
                   help="pulses per dwell that count as repetitive, e.g. 20 (default 10)")
    i.add_argument("--seeds", type=options.integer(1, 1000), default=5,
                   help="number of repeated tests, 1 to 1000, e.g. 10 (default 5)")
    i.add_argument("--quiet", action="store_true", help=QUIET_HELP)
    i.add_argument("--json", action="store_true", help="print JSON instead of text (default: text)")
    i.set_defaults(func=_cmd_inception)

    m = sub.add_parser("margin", help="inception margin against a test level, and the largest discharge-free void")
    m.add_argument("scenario", help="scenario TOML file, e.g. demo.toml")
    m.add_argument("--test-voltage", type=options.voltage, required=True,
                   help="test voltage, rms, with a unit, e.g. 18kV")
    m.add_argument("--nominal-voltage", type=options.voltage, default=None,
                   help="nominal voltage, rms, with a unit, e.g. 10kV (default: none)")
    m.add_argument("--parameter", default="void.size", help="swept input, e.g. void.height (default void.size)")
    m.add_argument("--values", default=None,
                   help="comma-separated values with units, e.g. 0.2mm,0.5mm,1mm (default: 25 sizes "
                   "from 0.1 to 5 mm for void.size)")
    m.add_argument("--json", action="store_true", help="print JSON instead of text (default: text)")
    m.set_defaults(func=_cmd_margin)


__all__ = ["register", "InputError"]
