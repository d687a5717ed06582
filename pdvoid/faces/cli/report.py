"""The ``pdvoid report`` command: write the design-review pack of a scenario file.

Hooked into :mod:`pdvoid.cli` through :func:`register`::

    pdvoid report SCENARIO.toml --out review.pdf --test-voltage 18kV [--service-voltage 8kV]
                  [--figures png|svg] [--cycles N] [--seed S]
"""

from __future__ import annotations

import argparse

from pdvoid.faces.cli import options

__all__ = ["register"]


def register(subparsers: argparse._SubParsersAction[argparse.ArgumentParser]) -> argparse.ArgumentParser:
    """Add the ``report`` command to ``subparsers``. The command's function is stored as ``func`` and returns
    the exit code.

    Parameters
    ----------
    subparsers : argparse._SubParsersAction
        The sub-parsers of the main parser (from ``ArgumentParser.add_subparsers``).

    Returns
    -------
    argparse.ArgumentParser
        The parser of the ``report`` command.
    """
    p = subparsers.add_parser(
        "report",
        help="write a design-review pack (multi-page PDF, optional PNG/SVG figures) for a scenario file",
        description="Write a design-review pack: scenario with sources, inception and extinction, margins to "
        "the test and service levels, margin chart, void field against time, phase-resolved pattern, "
        "sensitivity chart, assumptions, references and the safety note.",
    )
    p.add_argument("scenario", help="scenario TOML file")
    p.add_argument("--out", default="review.pdf", help="PDF file to write (default review.pdf)")
    p.add_argument(
        "--test-voltage",
        type=options.voltage,
        required=True,
        help="test voltage, rms, with a unit, e.g. 18kV or '18 kV' (a bare number is refused)",
    )
    p.add_argument("--service-voltage", type=options.voltage, default=None,
                   help="service voltage, rms, with a unit, e.g. 8kV")
    p.add_argument(
        "--figures",
        choices=("png", "svg"),
        default=None,
        help="also write each chart as PNG or SVG next to the PDF",
    )
    p.add_argument(
        "--cycles", type=options.integer(1, 1_000_000), default=2000,
        help="cycles simulated at the test voltage (default 2000)",
    )
    p.add_argument("--seed", type=options.seed, default=1, help="random seed (default 1)")
    p.set_defaults(func=_cmd_report)
    return p


def _cmd_report(ns: argparse.Namespace) -> int:
    from pdvoid.faces.report import SAFETY_NOTE, design_review
    from pdvoid.inputs.scenario import Scenario

    test = ns.test_voltage
    service = ns.service_voltage
    scenario = Scenario.from_file(ns.scenario)
    pack = design_review(
        scenario,
        test_voltage=test,
        service_voltage=service,
        cycles=ns.cycles,
        seed=ns.seed,
        out=ns.out,
        figures=ns.figures,
        scenario_file=ns.scenario,
    )
    est = pack.estimate
    if pack.band is not None:  # always set by design_review
        print(f"verdict at the test voltage {test / 1e3:.4g} kV rms: {pack.verdict}")
        print(pack.band.describe())
    if est.inception_regime != "no self-sustained discharge":  # otherwise the band's words above say it
        print(
            f"inception voltage {est.inception_voltage / 1e3:.4g} kV rms ({est.inception_regime} regime), "
            f"extinction estimate {est.extinction_voltage / 1e3:.4g} kV rms, margin {pack.margin:.3g}"
        )
    notes = list(pack.validity_notes) + list(pack.variation_notes)
    if notes:
        print("Validity notes (results outside the verified range of the closed forms; listed in the pack):")
        for n in notes:
            print(f"  - {n}")
    print(f"wrote {pack.path} ({pack.pages} pages)")
    for f in pack.figures:
        print(f"wrote {f}")
    print(SAFETY_NOTE)
    return 0
