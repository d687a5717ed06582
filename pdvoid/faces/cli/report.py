"""The ``pdvoid report`` command: write the design-review pack of a scenario file.

Hooked into :mod:`pdvoid.cli` through :func:`register`::

    pdvoid report SCENARIO.toml --out review.pdf --test-voltage 18kV [--service-voltage 8kV]
                  [--figures png|svg] [--cycles N] [--seed S]
                  [--acceptance-charge 10pC] [--acceptance-voltage-factor 1.1]
                  [--revision A] [--author NAME] [--checker NAME] [--approver NAME]

The document-control fields and the acceptance criterion may also come from the scenario file's [document] and
[acceptance] tables (:mod:`pdvoid.inputs.document`); an option given here overrides the file's value.
"""

from __future__ import annotations

import argparse

from pdvoid.faces.cli import options
from pdvoid.inputs.document import MAX_VOLTAGE_FACTOR

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
    p.add_argument("scenario", help="scenario TOML file, e.g. demo.toml")
    p.add_argument("--out", default="review.pdf", help="PDF file to write, e.g. pack.pdf (default review.pdf)")
    p.add_argument(
        "--test-voltage",
        type=options.voltage,
        required=True,
        help="test voltage, rms, with a unit, e.g. 18kV or '18 kV' (a bare number is refused)",
    )
    p.add_argument("--service-voltage", type=options.voltage, default=None,
                   help="service voltage, rms, with a unit, e.g. 8kV (default: none)")
    p.add_argument(
        "--figures",
        choices=("png", "svg"),
        default=None,
        help="also write each chart as png or svg next to the PDF (default: none)",
    )
    p.add_argument(
        "--cycles", type=options.integer(1, 1_000_000), default=2000,
        help="cycles simulated at the test voltage, e.g. 5000 (default 2000)",
    )
    p.add_argument("--seed", type=options.seed, default=1, help="random seed, e.g. 7 (default 1)")
    acc = p.add_argument_group(
        "acceptance criterion",
        "the verdict '<= charge at factor x test voltage', from a run simulated at that voltage; overrides the "
        "scenario file's [acceptance] table (charge = \"10 pC\", voltage_factor = 1.1)",
    )
    acc.add_argument("--acceptance-charge", type=options.quantity("charge"), default=None,
                     help="largest acceptable apparent charge, with a unit, e.g. 10pC (default: the scenario "
                     "file's, else no acceptance verdict)")
    acc.add_argument("--acceptance-voltage-factor", type=_factor, default=None,
                     help="the criterion applies at this multiple of the test voltage, e.g. 1.1 (default: the "
                     "scenario file's, else 1)")
    doc = p.add_argument_group(
        "document control",
        "printed on the first page; overrides the scenario file's [document] table; a field left empty prints "
        "as a blank line to sign",
    )
    doc.add_argument("--revision", default=None, help="revision of the pack, e.g. A (default: the file's, else blank)")
    doc.add_argument("--author", default=None, help="who wrote the pack, e.g. 'A. Name' (default: the file's, else "
                     "blank)")
    doc.add_argument("--checker", default=None,
                     help="who checked it, e.g. 'B. Name' (default: the file's, else blank)")
    doc.add_argument("--approver", default=None,
                     help="who approved it, e.g. 'C. Name' (default: the file's, else blank)")
    p.set_defaults(func=_cmd_report)
    return p


def _factor(text: str) -> float:
    """The acceptance voltage factor: a number in (0, 10]."""
    value = options.number(0.0, MAX_VOLTAGE_FACTOR)(text)
    if value == 0.0:
        raise argparse.ArgumentTypeError(f"{text!r} is out of range; allowed: a number > 0 and at most "
                                         f"{MAX_VOLTAGE_FACTOR:g}")
    return value


def _cmd_report(ns: argparse.Namespace) -> int:
    from pdvoid.core.errors import InputError
    from pdvoid.faces.report import SAFETY_NOTE, design_review
    from pdvoid.inputs.document import AcceptanceCriterion
    from pdvoid.inputs.scenario import Scenario
    from pdvoid.inputs.scenario_files import read_review_settings

    test = ns.test_voltage
    service = ns.service_voltage
    scenario = Scenario.from_file(ns.scenario)
    document, criterion, _ = read_review_settings(ns.scenario)
    document = document.updated(revision=ns.revision, author=ns.author, checker=ns.checker, approver=ns.approver)
    if ns.acceptance_charge is not None or ns.acceptance_voltage_factor is not None:
        charge = ns.acceptance_charge if ns.acceptance_charge is not None else (
            criterion.charge if criterion is not None else None)
        if charge is None:
            raise InputError("--acceptance-voltage-factor needs a limit: give --acceptance-charge (e.g. 10pC) or "
                             "set charge in the scenario file's [acceptance] table")
        factor = ns.acceptance_voltage_factor if ns.acceptance_voltage_factor is not None else (
            criterion.voltage_factor if criterion is not None else 1.0)
        criterion = AcceptanceCriterion(charge=charge, voltage_factor=factor)
    pack = design_review(
        scenario,
        test_voltage=test,
        service_voltage=service,
        cycles=ns.cycles,
        seed=ns.seed,
        out=ns.out,
        figures=ns.figures,
        scenario_file=ns.scenario,
        document=document,
        acceptance=criterion,
    )
    est = pack.estimate
    if pack.acceptance is not None:
        print(pack.acceptance.describe())
    else:
        print("no acceptance criterion given (--acceptance-charge, or [acceptance] in the scenario file): no "
              "acceptance verdict")
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
