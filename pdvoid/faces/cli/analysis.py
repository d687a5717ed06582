"""Command-line commands that read discharge sequences and inception margins: pattern, inception, margin."""

from __future__ import annotations

import argparse
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from pdvoid.core.errors import InputError
from pdvoid.core.units import parse_quantity
from pdvoid.faces.cli.output import SAFETY, emit

if TYPE_CHECKING:
    from pdvoid.simulation.events import Events
    from pdvoid.simulation.results import Result


def _voltage(text: str) -> float:
    return parse_quantity(text, "voltage", name="voltage")


def _charge(text: str) -> float:
    return parse_quantity(text, "charge", name="charge")


def _time(text: str) -> float:
    return parse_quantity(text, "time", name="time")






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
    lines = [f"{ns.file}: {events.count} events over {events.cycles:g} cycles "
             f"({events.count / events.cycles:.4g} per cycle)"]
    for k, v in doc["iec60270"].items():
        lines.append(f"  {k:<40s} {v:.4g}")
    lines.append("  descriptors:")
    for k, v in doc["fingerprint"].items():
        lines.append(f"    {k:<38s} {v:.4g}")
    emit(doc, ns.json, lines)
    return 0


def _cmd_inception(ns: argparse.Namespace) -> int:
    from pdvoid.analysis.inception import inception
    from pdvoid.inputs.scenario import Scenario

    sc = Scenario.from_file(ns.scenario)
    est = inception(sc)
    doc = {"scenario": ns.scenario, "analytic": {
        "inception voltage [V rms]": est.inception_voltage,
        "inception voltage, streamer criterion [V rms]": est.inception_voltage_streamer,
        "inception voltage, ionisation integral [V rms]": est.inception_voltage_integral,
        "extinction voltage estimate [V rms]": est.extinction_voltage,
        "inception field [V/m]": est.inception_field, "residual field [V/m]": est.residual_field,
        "field enhancement [-]": est.field_enhancement}, "safety": SAFETY}
    lines = [f"{ns.scenario}: analytic"] + [f"  {k:<48s} {v:.5g}" for k, v in doc["analytic"].items()]
    if ns.ramp:
        r = inception(sc, ramp=True, step=ns.step, dwell=ns.dwell, threshold=ns.threshold,
                      repeat_count=ns.repeat_count, seeds=range(ns.seeds))
        doc["ramp test"] = {
            "inception voltage [V rms]": r.inception_voltage, "inception voltage std [V rms]":
            r.inception_voltage_std, "extinction voltage [V rms]": r.extinction_voltage,
            "extinction voltage std [V rms]": r.extinction_voltage_std, "per seed inception [V rms]":
            r.inception_voltages, "per seed extinction [V rms]": r.extinction_voltages, "step [V]": r.step,
            "dwell [s]": r.dwell, "threshold [C]": r.threshold, "repeat count [-]": r.repeat_count}
        lines.append(f"simulated stepped test ({ns.seeds} seeds, step {r.step:.4g} V, dwell {r.dwell:.4g} s):")
        lines.append(f"  inception voltage [V rms]  {r.inception_voltage:.5g} ± {r.inception_voltage_std:.3g}")
        lines.append(f"  extinction voltage [V rms] {r.extinction_voltage:.5g} ± {r.extinction_voltage_std:.3g}")
    emit(doc, ns.json, lines)
    return 0


def _cmd_margin(ns: argparse.Namespace) -> int:
    from pdvoid.analysis.margins import design_margin, largest_pd_free_void, margin_table
    from pdvoid.inputs.scenario import Scenario

    sc = Scenario.from_file(ns.scenario)
    values = None
    if ns.values:
        unit_dim = {"void.size": "length", "void.diameter": "length", "void.height": "length",
                    "void.pressure": "pressure", "insulation.thickness": "length"}.get(ns.parameter, "dimensionless")
        values = [parse_quantity(v, unit_dim, name=f"--values {v!r}") for v in ns.values.split(",")]
    table = margin_table(sc, ns.parameter, values, test_voltage=ns.test_voltage)
    lv = largest_pd_free_void(sc, ns.test_voltage)
    doc = {"scenario": ns.scenario, "test voltage [V rms]": ns.test_voltage, "table": table.as_rows(),
           "largest discharge-free void": {"diameter [m]": lv.diameter, "height [m]": lv.height,
                                           "inception voltage [V rms]": lv.inception_voltage,
                                           "limited by": lv.limited_by or "none"},
           "safety": SAFETY}
    lines = [f"{ns.scenario}: margin against a test at {ns.test_voltage / 1e3:.4g} kV rms"]
    keys = list(doc["table"][0].keys())
    lines.append("  " + " | ".join(keys))
    for row in doc["table"]:
        lines.append("  " + " | ".join(f"{row[k]:.4g}" for k in keys))
    lines.append(f"  largest discharge-free void at this shape: diameter {lv.diameter * 1e3:.4g} mm, height "
                 f"{lv.height * 1e3:.4g} mm" + (f" (limited by {lv.limited_by})" if lv.limited_by else ""))
    if ns.nominal_voltage is not None:
        dm = design_margin(sc, ns.nominal_voltage, ns.test_voltage / ns.nominal_voltage)
        doc["design"] = {"nominal voltage [V rms]": dm.nominal_voltage, "test factor [-]": dm.test_factor,
                         "inception margin to test level [-]": dm.margin,
                         "extinction margin to nominal voltage [-]": dm.extinction_margin}
        lines.append(f"  this void: inception/test = {dm.margin:.3g}, extinction/nominal = "
                     f"{dm.extinction_margin:.3g}")
    emit(doc, ns.json, lines)
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
    p.add_argument("file")
    p.add_argument("--cycles", type=int, default=None, help="observed cycles, for event files without time")
    p.add_argument("--frequency", type=float, default=None, help="supply frequency [Hz] for event files")
    p.add_argument("--phase-bins", type=int, default=72)
    p.add_argument("--charge-bins", type=int, default=50)
    p.add_argument("--charge-scale", choices=("log", "linear"), default="log")
    p.add_argument("--json", action="store_true")
    p.set_defaults(func=_cmd_pattern)

    i = sub.add_parser("inception", help="inception and extinction voltages: analytic, and a simulated "
                       "stepped-voltage test with --ramp")
    i.add_argument("scenario")
    i.add_argument("--ramp", action="store_true")
    i.add_argument("--step", type=_voltage, default=None, help="voltage step, e.g. 0.2kV")
    i.add_argument("--dwell", type=_time, default=1.0, help="time per step, e.g. 1s")
    i.add_argument("--threshold", type=_charge, default=0.0, help="detection threshold, e.g. 5pC")
    i.add_argument("--repeat-count", type=int, default=10, help="pulses per dwell that count as repetitive")
    i.add_argument("--seeds", type=int, default=5, help="number of repeated tests")
    i.add_argument("--json", action="store_true")
    i.set_defaults(func=_cmd_inception)

    m = sub.add_parser("margin", help="inception margin against a test level, and the largest discharge-free void")
    m.add_argument("scenario")
    m.add_argument("--test-voltage", type=_voltage, required=True, help="e.g. 18kV (rms)")
    m.add_argument("--nominal-voltage", type=_voltage, default=None, help="e.g. 10kV (rms)")
    m.add_argument("--parameter", default="void.size", help="swept input (default void.size)")
    m.add_argument("--values", default=None, help="comma-separated values with units, e.g. 0.2mm,0.5mm,1mm")
    m.add_argument("--json", action="store_true")
    m.set_defaults(func=_cmd_margin)


__all__ = ["register", "InputError"]
