"""The command line: ``pdvoid demo``, ``pdvoid simulate`` and the other commands.

Every report states that results are engineering estimates; test and acceptance levels come from the applicable
standards; local codes and licensed practice prevail.
"""

from __future__ import annotations

import argparse
import json
import math
import sys
from collections.abc import Sequence
from pathlib import Path

from .errors import InputError

SAFETY = (
    "SAFETY: high voltage can kill. These results are engineering estimates from idealised models. Test and "
    "acceptance levels come from the applicable standards; local codes and licensed practice prevail."
)

DEMO_SERVICE_RMS = 8e3  # V, invented service voltage of the demo part
DEMO_TEST_RMS = 18e3  # V, invented test voltage of the demo part


def demo_scenario_path() -> Path:
    return Path(__file__).with_name("examples") / "demo.toml"


def demo_scenario():
    """The built-in demo scenario (an invented example)."""
    from .scenario import Scenario

    return Scenario.from_file(demo_scenario_path())


def _fmt(value: float, unit: str, scale: float = 1.0, digits: int = 4) -> str:
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return "n/a"
    return f"{value / scale:.{digits}g} {unit}"


def _run_summary(result) -> dict:
    from .analysis.summary import run_summary

    return run_summary(result)


def _cmd_demo(ns: argparse.Namespace) -> int:
    from .simulate import simulate

    sc = demo_scenario()
    c = sc.coefficients()
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
    for label, rms in (("service", DEMO_SERVICE_RMS), ("test", DEMO_TEST_RMS)):
        s2 = sc.replace(**{"supply.rms": rms})
        res = simulate(s2, cycles=ns.cycles, seed=ns.seed)
        runs[f"{label} voltage {rms / 1e3:g} kV rms"] = _run_summary(res)
    out = {"demo": rows, "simulations": runs, "cycles": ns.cycles, "seed": ns.seed, "safety": SAFETY}
    if ns.json:
        print(json.dumps(out, indent=2, default=float))
        return 0
    print(f"pdvoid demo — {sc.name}")
    print(f"  insulation: {sc.insulation.thickness * 1e3:g} mm, εr = {sc.insulation.permittivity:g}; void: "
          f"{sc.void.diameter * 1e3:g} mm × {sc.void.height * 1e3:g} mm {sc.void.gas} at "
          f"{sc.void.pressure / 1e3:g} kPa")
    for k, v in rows.items():
        if k != "scenario":
            print(f"  {k:<55s} {v:10.4g}")
    for label, summ in runs.items():
        print(f"\n  simulation at {label}, {ns.cycles} cycles, seed {ns.seed}:")
        for k, v in summ.items():
            print(f"    {k:<53s} {v:10.4g}")
    print("\n" + SAFETY)
    return 0


def _cmd_simulate(ns: argparse.Namespace) -> int:
    from .scenario import Scenario
    from .simulate import simulate

    sc = Scenario.from_file(ns.scenario)
    res = simulate(sc, cycles=ns.cycles, seed=ns.seed)
    out = Path(ns.out)
    out.mkdir(parents=True, exist_ok=True)
    res.save(out / "result.npz")
    res.to_csv(out / "events.csv")
    summ = _run_summary(res)
    doc = {"scenario": str(ns.scenario), "cycles": ns.cycles, "seed": ns.seed, "summary": summ,
           "files": [str(out / "result.npz"), str(out / "events.csv"), str(out / "summary.json")],
           "references": list(res.references), "safety": SAFETY}
    (out / "summary.json").write_text(json.dumps(doc, indent=2, default=float), encoding="utf-8")
    if ns.json:
        print(json.dumps(doc, indent=2, default=float))
    else:
        for k, v in summ.items():
            print(f"{k:<53s} {v:10.4g}")
        print(f"wrote {', '.join(doc['files'])}")
        print(SAFETY)
    return 0


def build_parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="pdvoid", description="Partial discharges in gas-filled voids: fields, "
                                "inception, AC-cycle simulation, phase-resolved patterns. " + SAFETY)
    sub = p.add_subparsers(dest="command", required=True)
    d = sub.add_parser("demo", help="run the built-in demo scenario (an invented example)")
    d.add_argument("--cycles", type=int, default=2000, help="AC cycles to simulate (default 2000)")
    d.add_argument("--seed", type=int, default=1, help="random seed (default 1)")
    d.add_argument("--json", action="store_true", help="print JSON instead of text")
    d.set_defaults(func=_cmd_demo)
    s = sub.add_parser("simulate", help="simulate a scenario file and write result, events CSV and summary")
    s.add_argument("scenario", help="scenario TOML file")
    s.add_argument("--cycles", type=int, default=1000)
    s.add_argument("--seed", type=int, default=0)
    s.add_argument("--out", required=True, help="output folder")
    s.add_argument("--json", action="store_true")
    s.set_defaults(func=_cmd_simulate)
    from . import cli_analysis, cli_fit, cli_report, cli_sweep

    for module in (cli_analysis, cli_fit, cli_report, cli_sweep):
        module.register(sub)
    return p


def main(argv: Sequence[str] | None = None) -> int:
    parser = build_parser()
    ns = parser.parse_args(argv)
    try:
        return int(ns.func(ns) or 0)
    except InputError as exc:
        print(f"pdvoid: error: {exc}", file=sys.stderr)
        return 2


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
