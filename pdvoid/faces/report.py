"""The design-review pack: a multi-page PDF (and optional PNG/SVG figures) for one void in one design.

Pages: summary (document control: date, revision, input file and its SHA-256, pdvoid version, author, checker
and approver; the acceptance verdict; scenario with units and data sources, inception and extinction by both
criteria, margins to the test and service levels), margin chart, void field against time, phase-resolved
pattern, sensitivity chart, assumptions and validity limits, references and the safety note. No physics of its
own: every number comes from the scenario's coefficients, :mod:`pdvoid.analysis` and :func:`pdvoid.simulate`.
"""

from __future__ import annotations

import datetime as _dt
import hashlib
import math
import os
from dataclasses import dataclass, fields, replace
from pathlib import Path
from typing import Any

import numpy as np

from pdvoid._version import __version__
from pdvoid.analysis.acceptance import AcceptanceVerdict, acceptance_verdict
from pdvoid.analysis.inception import InceptionEstimate, inception
from pdvoid.analysis.margins import MarginTable, largest_pd_free_void, margin_table
from pdvoid.analysis.regime import discharge_regime
from pdvoid.analysis.summary import run_summary
from pdvoid.analysis.verdict import InceptionBand, inception_band, verdict
from pdvoid.coefficients import compute_coefficients
from pdvoid.core.errors import InputError, check_int, check_positive
from pdvoid.core.references import cite
from pdvoid.core.validity import collect_validity_notes
from pdvoid.faces.summary_table import summary_dict
from pdvoid.inputs.coaxial import Coaxial
from pdvoid.inputs.document import AcceptanceCriterion, DocumentControl, acceptance_from_dict, document_from_dict
from pdvoid.inputs.materials import get_gas, get_material
from pdvoid.inputs.measurement import Instrument, TestCircuit
from pdvoid.inputs.model_sets import sets_matching
from pdvoid.inputs.parameters import Periodic, check_seed
from pdvoid.inputs.scenario import Scenario
from pdvoid.simulation.results import Result
from pdvoid.simulation.simulate import simulate

__all__ = [
    "SAFETY_NOTE",
    "SENSITIVITY_INPUTS",
    "ReviewPack",
    "SensitivityRow",
    "design_review",
    "sensitivity",
    "at_voltage",
    "InputFile",
    "iso_date",
    "pattern_assumptions",
]

#: printed on the first and last page of every pack and by the command line
SAFETY_NOTE = (
    "Safety: high voltage can kill. Only trained and authorised people may set up, energise or approach "
    "high-voltage tests. The numbers in this pack are engineering estimates from idealised models, not test "
    "results. Test and acceptance levels come from the applicable standards; local codes and licensed "
    "practice prevail."
)

#: inputs varied by the sensitivity chart: (scenario path, label)
SENSITIVITY_INPUTS = (
    ("void.diameter", "void diameter"),
    ("void.height", "void height"),
    ("void.pressure", "gas pressure"),
    ("insulation.permittivity", "host permittivity"),
    ("insulation.thickness", "insulation thickness"),
    ("model.residual_ratio", "residual field ratio"),
)


@dataclass(frozen=True)
class SensitivityRow:
    """One input varied by ±change (values SI; NaN where the varied scenario is not valid).

    Attributes
    ----------
    parameter, label : str
        Scenario path and readable name [-].
    low, high : float
        The input at (1 − change) and (1 + change) times its value [SI].
    inception_low, inception_high, inception_base : float
        Inception voltage [V rms].
    charge_low, charge_high, charge_base : float
        Lag-free apparent charge per discharge [C].
    """

    parameter: str
    label: str
    low: float
    high: float
    inception_low: float
    inception_high: float
    inception_base: float
    charge_low: float
    charge_high: float
    charge_base: float


def sensitivity(scenario: Scenario, change: float = 0.2) -> list[SensitivityRow]:
    """Inception voltage and lag-free charge per discharge when each input of :data:`SENSITIVITY_INPUTS` is
    lowered and raised by ``change``, all else kept.

    Recomputed from the coefficients of ``scenario.replace(...)``; a variation that makes the scenario invalid
    gives NaN. For a cable (:class:`~pdvoid.Coaxial`) the insulation wall is varied by moving the outer radius,
    the conductor radius and the void's radial position kept.

    Parameters
    ----------
    scenario : Scenario
        The design [-].
    change : float
        The relative change, a fraction, 0 < change < 1 [-].

    Returns
    -------
    list of SensitivityRow
        One row per input of :data:`SENSITIVITY_INPUTS`, in that order.

    Raises
    ------
    InputError
        For anything but a Scenario, or a change outside (0, 1).
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    change = check_positive("change", change)
    if change >= 1.0:
        raise InputError(f"change must lie in (0, 1); got {change!r}")
    base = compute_coefficients(scenario)
    rows = []
    for path, label in SENSITIVITY_INPUTS:
        part, name = path.split(".")
        value = float(getattr(getattr(scenario, part), name))
        out = []
        inner = getattr(scenario.insulation, "inner_radius", None)
        if path == "insulation.thickness" and inner is not None:
            label = "insulation wall (outer radius moved)"  # a cable: the wall is outer minus inner radius
        for factor in (1.0 - change, 1.0 + change):
            try:
                if path == "insulation.thickness" and inner is not None:
                    varied = scenario.replace(**{"insulation.outer_radius": inner + value * factor})
                else:
                    varied = scenario.replace(**{path: value * factor})
                c = compute_coefficients(varied)
                out.append((c.inception_voltage, c.charge_per_discharge))
            except InputError:
                out.append((math.nan, math.nan))
        rows.append(
            SensitivityRow(
                path,
                label,
                value * (1.0 - change),
                value * (1.0 + change),
                out[0][0],
                out[1][0],
                base.inception_voltage,
                out[0][1],
                out[1][1],
                base.charge_per_discharge,
            )
        )
    return rows


def at_voltage(scenario: Scenario, rms: float) -> Scenario:
    """``scenario`` with its supply scaled to ``rms`` (a sine's rms replaced; periodic samples scaled).

    Parameters
    ----------
    scenario : Scenario
        The design [-].
    rms : float
        The new rms voltage [V].

    Returns
    -------
    Scenario
        The scaled scenario.

    Raises
    ------
    InputError
        For a voltage that is not positive.
    """
    rms = check_positive("rms", rms, "V")
    if isinstance(scenario.supply, Periodic):
        s = scenario.supply
        return replace(scenario, supply=replace(s, samples=np.asarray(s.samples) * (rms / s.rms)))
    return scenario.replace(**{"supply.rms": rms})


@dataclass(frozen=True, eq=False)
class ReviewPack:
    """What :func:`design_review` wrote.

    Attributes
    ----------
    path : pathlib.Path
        The PDF.
    pages : int
        Number of pages [-].
    page_titles : tuple of str
        Title of each page.
    page_texts : tuple of str
        All text drawn on each page (for search and checks).
    figures : tuple of pathlib.Path
        PNG/SVG files written next to the PDF.
    estimate : InceptionEstimate
        Inception and extinction of the scenario (V rms).
    result : Result
        The simulation at the test voltage.
    test_voltage, service_voltage : float
        Test and service level (service None when not given) [V rms].
    margin : float
        Inception voltage / test voltage [-].
    band : InceptionBand or None
        Inception voltages of both criteria and their band [V rms].
    verdict : str
        The band's verdict at the test level (:func:`pdvoid.analysis.verdict.verdict`) [-].
    validity_notes : tuple of str
        Validity notes of the design's own coefficients [-].
    variation_notes : tuple of str
        Validity notes of the varied designs (margin chart, sensitivity, void searches) [-].
    document : DocumentControl
        Revision, author, checker and approver as printed (empty fields print as blank lines to sign) [-].
    date : str
        Date and time of the run, ISO 8601 in UTC, as printed [-].
    input_file : InputFile or None
        The scenario file's name and SHA-256 (None for a Scenario given without its file) [-].
    acceptance : AcceptanceVerdict or None
        The verdict against the acceptance criterion (None when no criterion was given) [-].
    acceptance_result : Result or None
        The simulation at the criterion's voltage (``result`` itself when the factor is 1) [-].
    """

    path: Path
    pages: int
    page_titles: tuple[str, ...]
    page_texts: tuple[str, ...]
    figures: tuple[Path, ...]
    estimate: InceptionEstimate
    result: Result
    test_voltage: float
    service_voltage: float | None
    margin: float
    band: InceptionBand | None = None
    verdict: str = ""
    validity_notes: tuple[str, ...] = ()
    variation_notes: tuple[str, ...] = ()
    document: DocumentControl = DocumentControl()
    date: str = ""
    input_file: InputFile | None = None
    acceptance: AcceptanceVerdict | None = None
    acceptance_result: Result | None = None


@dataclass(frozen=True)
class InputFile:
    """The scenario file a pack was made from, as the document-control block names it.

    Attributes
    ----------
    name : str
        The file's name (without its folder) [-].
    sha256 : str
        SHA-256 of the file's bytes as read, 64 hex digits [-].
    keys : frozenset of str
        The keys the file sets, as "part.key" (e.g. "model.residual_ratio") [-].
    document : DocumentControl
        The file's [document] table (empty fields without one) [-].
    acceptance : AcceptanceCriterion or None
        The file's [acceptance] table (None without one) [-].
    """

    name: str
    sha256: str
    keys: frozenset[str]
    document: DocumentControl
    acceptance: AcceptanceCriterion | None


def iso_date(when: _dt.datetime | None = None) -> str:
    """A time in ISO 8601 in UTC to the second, e.g. "2026-12-04T19:40:12Z" (now when not given).

    Parameters
    ----------
    when : datetime.datetime, optional
        A time zone aware time (default: now) [-].

    Returns
    -------
    str
        The time in UTC, ISO 8601 [-].

    Raises
    ------
    InputError
        For anything but a time zone aware datetime.
    """
    if when is None:
        when = _dt.datetime.now(_dt.UTC)
    if not isinstance(when, _dt.datetime) or when.tzinfo is None or when.utcoffset() is None:
        raise InputError(f"date must be a time zone aware datetime.datetime (e.g. datetime.now(timezone.utc)); "
                         f"got {when!r}")
    return when.astimezone(_dt.UTC).strftime("%Y-%m-%dT%H:%M:%SZ")


def _check_out(out: str | os.PathLike[str], figures: str | None) -> tuple[Path, str | None]:
    if not isinstance(out, (str, os.PathLike)):
        raise InputError(f"out must be a file path ending in .pdf; got {out!r}")
    path = Path(out)
    if path.suffix.lower() != ".pdf":
        raise InputError(f"out must end in .pdf; got {str(path)!r}")
    if not path.parent.is_dir():
        raise InputError(f"out: the folder {str(path.parent)!r} does not exist")
    if figures not in (None, "png", "svg"):
        raise InputError(f"figures must be None, 'png' or 'svg'; got {figures!r}")
    return path, figures


def _check_ac_design(scenario: Scenario) -> None:
    """Refuse, in plain words, a design the pack cannot judge: its margins compare rms test voltages with the
    inception of a sine (or Fourier-series) supply in a perfect dielectric."""
    from pdvoid.inputs.parameters import Sine
    from pdvoid.models.time_domain import needs_time_domain

    sup = scenario.supply
    why = ""
    if not isinstance(sup, (Sine, Periodic)):
        why = f"a {type(sup).__name__} supply"
    elif needs_time_domain(scenario):
        why = "a conducting insulation (its void field depends on the frequency through conduction)"
    if why:
        raise InputError(f"the review pack compares rms test voltages with the inception of a sine in a perfect "
                         f"dielectric; this scenario has {why}, so its margins would be wrong. Use pdvoid inception "
                         "(the inception voltage in the supply's own quantity: DC level, VLF level, peak-to-peak "
                         "of the impulses) and pdvoid simulate --duration or --cycles for the discharges")


def design_review(
    scenario: Scenario,
    *,
    test_voltage: float,
    service_voltage: float | None = None,
    cycles: int = 2000,
    seed: int = 1,
    out: str | os.PathLike[str] = "review.pdf",
    figures: str | None = None,
    circuit: TestCircuit | None = None,
    instrument: Instrument | None = None,
    scenario_file: str | os.PathLike[str] | None = None,
    document: DocumentControl | None = None,
    acceptance: AcceptanceCriterion | None = None,
    date: _dt.datetime | None = None,
) -> ReviewPack:
    """Write the design-review pack of ``scenario`` as a multi-page PDF.

    The simulation runs at the test voltage (the supply scaled to ``test_voltage``) for ``cycles`` cycles
    from an uncharged void with ``seed``. The margin chart sweeps the void size at the scenario's shape
    (:func:`pdvoid.analysis.margins.margin_table`) for the scenario's pressure and half of it; the sensitivity
    chart varies each input by ±20 % (:func:`sensitivity`). The verdict uses the band of both inception criteria
    (:func:`pdvoid.analysis.verdict.inception_band`). Validity warnings raised while computing are not issued:
    the summary page lists them next to the numbers they qualify, and the pack returns them
    (``validity_notes`` for the design itself, ``variation_notes`` for the varied designs).

    The first page opens with the document control: the date of the run (ISO 8601, UTC), the revision, the
    scenario file's name and SHA-256, the pdvoid version, and author, checker and approver (a field left empty is
    a blank line to sign). With an acceptance criterion the run is simulated again at the criterion's voltage
    (same cycles and seed; the test-voltage run itself when the factor is 1) and judged by
    :func:`pdvoid.analysis.acceptance.acceptance_verdict`.

    Parameters
    ----------
    scenario : Scenario
        The design [-].
    test_voltage : float
        Test level [V rms].
    service_voltage : float, optional
        Service level [V rms].
    cycles : int
        Cycles simulated at the test voltage, 1 ... 1000000 [-].
    seed : int
        Random seed, 0 ... 2**32 − 1 [-].
    out : str or os.PathLike
        The PDF file (its folder must exist) [-].
    figures : str, optional
        None, "png" or "svg": also write each chart as a file next to the PDF [-].
    circuit, instrument : TestCircuit and Instrument, optional
        the measuring chain whose assumptions the assumptions page states; without them the page says that
        charges are apparent charges read by an ideal instrument [-].
    scenario_file : str or os.PathLike, optional
        The file ``scenario`` was read from: the scenario table then gives each input's origin (scenario file,
        parameter set or pdvoid default) from the keys the file sets, not from the values; without it the
        origin is the Scenario object [-]. Its name and SHA-256 (of the bytes read) go into the document
        control, and its [document] and [acceptance] tables are used where ``document`` or ``acceptance`` is not
        given. It must describe ``scenario``.
    document : DocumentControl, optional
        Revision, author, checker and approver (default: the scenario file's [document] table, else blank) [-].
    acceptance : AcceptanceCriterion, optional
        The acceptance criterion (default: the scenario file's [acceptance] table, else none: the pack then says
        that no acceptance verdict is given) [-].
    date : datetime.datetime, optional
        The date of the run, time zone aware (default: now) [-].

    Returns
    -------
    ReviewPack
        What was written, with the estimate and the simulation.

    Raises
    ------
    InputError
        For a bad scenario, voltages, cycles, seed, path, figure format, document, criterion or date, or a
        scenario file that does not describe ``scenario``.
    """
    from matplotlib.backends.backend_pdf import PdfPages

    from pdvoid.faces.plots import review as rp

    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    _check_ac_design(scenario)
    test_voltage = check_positive("test_voltage", test_voltage, "V")
    if service_voltage is not None:
        service_voltage = check_positive("service_voltage", service_voltage, "V")
    cycles = check_int("cycles", cycles, 1, 1_000_000)
    seed = check_seed(seed)
    path, fmt = _check_out(out, figures)
    if scenario_file is not None and not isinstance(scenario_file, (str, os.PathLike)):
        raise InputError(f"scenario_file must be a path to the scenario's TOML file; got {scenario_file!r}")
    if document is not None and not isinstance(document, DocumentControl):
        raise InputError(f"document must be a pdvoid.inputs.document.DocumentControl; got {type(document).__name__}")
    if acceptance is not None and not isinstance(acceptance, AcceptanceCriterion):
        raise InputError("acceptance must be a pdvoid.inputs.document.AcceptanceCriterion; got "
                         f"{type(acceptance).__name__}")
    run_date = iso_date(date)
    source = None if scenario_file is None else _read_input_file(scenario_file, scenario)
    given = None if source is None else source.keys
    if document is None:
        document = DocumentControl() if source is None else source.document
    if acceptance is None and source is not None:
        acceptance = source.acceptance
    measurement_notes: tuple[str, ...] = ()
    if circuit is not None or instrument is not None:
        if not isinstance(circuit, TestCircuit) or not isinstance(instrument, Instrument):
            raise InputError("circuit and instrument must be given together as a pdvoid.TestCircuit and a "
                             f"pdvoid.Instrument; got {type(circuit).__name__} and {type(instrument).__name__}")
        measurement_notes = tuple(circuit.describe() + instrument.describe())

    band = inception_band(scenario)  # the design's own validity notes come back in band.notes
    with collect_validity_notes() as noted:
        est = inception(scenario)
        result = simulate(at_voltage(scenario, test_voltage), cycles, seed)
        rows = sensitivity(scenario)
        largest = largest_pd_free_void(scenario, test_voltage)
        largest_service = (
            largest_pd_free_void(scenario, service_voltage) if service_voltage is not None else None
        )
        tables = _margin_tables(scenario, test_voltage)
        regime = discharge_regime(result.scenario, result).text
        judged: AcceptanceVerdict | None = None
        at_acceptance: Result | None = None
        if acceptance is not None:
            at_acceptance = (result if acceptance.voltage_factor == 1.0 else
                             simulate(at_voltage(scenario, acceptance.voltage_factor * test_voltage), cycles, seed))
            judged = acceptance_verdict(at_acceptance, acceptance, test_voltage, band=band)
    own = band.notes
    variations = tuple(n for n in dict.fromkeys(noted) if n not in own)
    outcome = verdict(band, test_voltage)
    ctx = rp.Context(
        scenario=scenario,
        estimate=est,
        result=result,
        test_voltage=test_voltage,
        service_voltage=service_voltage,
        sensitivity=rows,
        summary=summary_dict(run_summary(result)),
        largest=largest,
        largest_service=largest_service,
        tables=tables,
        material=_material_rows(scenario),
        gas=_gas_rows(scenario),
        inputs=_input_rows(scenario, given),
        references=cite(result),
        safety=SAFETY_NOTE,
        version=__version__,
        cycles=cycles,
        seed=seed,
        regime=regime,
        band=band,
        verdict=outcome,
        validity_notes=own,
        variation_notes=variations,
        measurement_notes=measurement_notes,
        document=document,
        date=run_date,
        input_name=None if source is None else source.name,
        input_sha256=None if source is None else source.sha256,
        acceptance=judged,
        pattern_notes=pattern_assumptions(scenario, given),
    )
    # the pages recompute coefficients of designs computed above, whose notes ctx already holds
    with collect_validity_notes():
        pages = rp.build_pages(ctx)
    meta = {
        "Title": f"Design review: {scenario.name or 'void in solid insulation'}",
        "Author": document.author or "pdvoid",
        "Subject": "Partial discharges in a gas-filled void: inception, margins, simulated pattern",
        "Creator": f"pdvoid {__version__}",
        "CreationDate": None,
    }
    with PdfPages(path, metadata=meta) as pdf:
        for fig in pages.figures:
            pdf.savefig(fig)
    written = []
    if fmt is not None:
        for name in rp.CHART_NAMES:
            with collect_validity_notes():
                fig = rp.standalone_chart(ctx, name)
            target = path.with_name(f"{path.stem}_{name}.{fmt}")
            fig.savefig(target, format=fmt, dpi=200)
            written.append(target)
    return ReviewPack(
        path=path,
        pages=len(pages.figures),
        page_titles=tuple(pages.titles),
        page_texts=tuple(pages.texts),
        figures=tuple(written),
        estimate=est,
        result=result,
        test_voltage=test_voltage,
        service_voltage=service_voltage,
        margin=est.inception_voltage / test_voltage,
        band=band,
        verdict=outcome,
        validity_notes=own,
        variation_notes=variations,
        document=document,
        date=run_date,
        input_file=source,
        acceptance=judged,
        acceptance_result=at_acceptance,
    )


def _margin_tables(scenario: Scenario, test_voltage: float) -> list[MarginTable]:
    """Inception against void size at the scenario's shape, for its pressure and half of it."""
    d, h, thick = scenario.void.diameter, scenario.void.height, scenario.insulation.thickness
    hi = min(5.0 * d, 0.5 * thick * d / h, 1.0)  # the closed forms need a void small against the thickness
    lo = max(d / 20.0, 1e-6)
    values = np.geomspace(lo, hi, 60)
    p = scenario.void.pressure
    tables = [margin_table(scenario, "void.size", values, test_voltage)]
    half = scenario.replace(**{"void.pressure": 0.5 * p}) if 0.5 * p >= 100.0 else None
    if half is not None:
        tables.append(margin_table(half, "void.size", values, test_voltage))
    return tables


def _material_rows(scenario: Scenario) -> list[list[str]]:
    ins = scenario.insulation
    if ins.material is None:
        return [["host permittivity", f"{ins.permittivity:g}", "-", "scenario input", "given directly"]]
    m = get_material(ins.material)
    if m.permittivity != ins.permittivity:
        return [
            [
                "host permittivity",
                f"{ins.permittivity:g}",
                "-",
                "scenario input",
                f"overrides {m.name} ({m.permittivity:g}; {m.source})",
            ]
        ]
    rng = f"; typical {m.permittivity_range[0]:g}–{m.permittivity_range[1]:g}" if m.permittivity_range else ""
    return [[f"host permittivity ({m.name})", f"{m.permittivity:g}", "-", m.status, m.source + rng]]


def _gas_rows(scenario: Scenario) -> list[list[str]]:
    g = get_gas(scenario.void.gas)
    rows = []
    for key, prov in g.provenance.items():
        unit = "-" if prov.unit == "1" else prov.unit
        rows.append(
            [f"{g.name}: {key.replace('_', ' ')}", f"{getattr(g, key):.6g}", unit, prov.status, prov.source]
        )
    return rows


_MODEL_UNITS = {
    "residual_ratio": ("-", 1.0),
    "ionization_rate": ("1/(m³ s)", 1.0),
    "electron_yield": ("-", 1.0),
    "surface_rate_same": ("1/s", 1.0),
    "surface_rate_reversed": ("1/s", 1.0),
    "surface_decay_time": ("ms", 1e-3),
    "charge_decay_time": ("ms", 1e-3),
    "capacitance_void": ("pF", 1e-12),
    "capacitance_series": ("pF", 1e-12),
}


def _keys_of(data: dict[str, Any]) -> frozenset[str]:
    return frozenset(f"{part}.{key}" for part in ("insulation", "void", "supply", "model")
                     if isinstance(data.get(part), dict) for key in data[part])


def _file_keys(path: str | os.PathLike[str]) -> frozenset[str]:
    """The keys a scenario file sets, as "part.key" (e.g. "model.residual_ratio")."""
    from pdvoid.core.files import read_toml_file
    from pdvoid.inputs.scenario_files import MAX_FILE_BYTES

    return _keys_of(read_toml_file(Path(path), MAX_FILE_BYTES, "scenario file"))


def _read_input_file(path: str | os.PathLike[str], scenario: Scenario) -> InputFile:
    """The scenario file read once: its keys, review settings and the SHA-256 of the very bytes parsed; refused
    when it does not describe ``scenario`` (the pack would name the wrong file)."""
    from pdvoid.core.files import read_toml_bytes
    from pdvoid.inputs.scenario import scenario_from_dict
    from pdvoid.inputs.scenario_files import MAX_FILE_BYTES, scenario_to_dict

    p = Path(path)
    data, raw = read_toml_bytes(p, MAX_FILE_BYTES, "scenario file")
    described = scenario_from_dict(data, source=str(p))
    if scenario_to_dict(described) != scenario_to_dict(scenario):
        raise InputError(f"scenario_file: {str(p)!r} does not describe the scenario given (read it with "
                         "pdvoid.Scenario.from_file, or leave scenario_file out)")
    return InputFile(p.name, hashlib.sha256(raw).hexdigest(), _keys_of(data),
                     document_from_dict(data, source=str(p)), acceptance_from_dict(data, source=str(p)))


#: model fields that make up the start-electron supply: field -> (words, unit, scale)
_SUPPLY_FIELDS = {
    "ionization_rate": ("volume ionisation G", "ion pairs/(m³ s) at 101.325 kPa and 293.15 K", 1.0),
    "electron_yield": ("electron yield η", "", 1.0),
    "surface_rate_same": ("surface emission, same polarity as the last discharge", "/s", 1.0),
    "surface_rate_reversed": ("surface emission, polarity reversed", "/s", 1.0),
    "surface_decay_time": ("its decay time τ_s", "ms", 1e-3),
    "cathode_emission_rate": ("emission from a metal cathode wall", "/s", 1.0),
}


def _short(v: float) -> str:
    """A number in 3 significant digits with a plain exponent ("1e9", not "1e+09")."""
    text = f"{v:.3g}"
    if "e" in text:
        mantissa, exponent = text.split("e")
        return f"{mantissa}e{int(exponent)}"
    return text


def pattern_assumptions(scenario: Scenario, given: frozenset[str] | None = None) -> tuple[str, ...]:
    """What the simulated pattern of ``scenario`` rests on, in plain words: the model and its parameter set, the
    inception criterion and the start-electron supply (each rate with its value and where it came from). The
    start of the run (uncharged void, cycles, seed) is stated on the assumptions page beside these.

    Parameters
    ----------
    scenario : Scenario
        The design [-].
    given : frozenset of str, optional
        The keys the scenario file sets (see :class:`InputFile`); None for a Scenario built in Python [-].

    Returns
    -------
    tuple of str
        One sentence per assumption [-].

    Raises
    ------
    InputError
        For anything but a Scenario.
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    m = scenario.model
    named = sets_matching(m)
    where = (f"the values of parameter set {', '.join(named)}" if named
             else "values as given (no named parameter set matches them; see the scenario table)")
    out = [f"Model: the {m.title}, with {where}; inception by the "
           f"{m.inception_criterion.replace('_', ' ').replace('ionization', 'ionisation')} criterion."]
    if m.lag_free:
        out.append("Start electrons: unlimited (lag-free). Every discharge starts the moment the void field reaches "
                   "the inception field; a real void waits for a start electron, so its discharges start later, "
                   "larger and scattered. The pattern is an idealisation, not a prediction of a measured one.")
    else:
        parts = []
        for name, (words, unit, scale) in _SUPPLY_FIELDS.items():
            value = getattr(m, name, None)
            if value is None or (name == "cathode_emission_rate" and value == 0.0):
                continue
            text = "no decay" if math.isinf(value) else f"{_short(value / scale)}{' ' + unit if unit else ''}"
            key = f"model.{name}"
            origin = ("" if given is None else " (scenario file)" if key in given else " (pdvoid's default)")
            parts.append(f"{words} = {text}{origin}")
        if getattr(m, "field_assisted", False):
            parts.append("surface emission field-assisted, × exp(|E_v|/E_inc)")
        defaults = given is not None and not any(f"model.{k}" in given for k in _SUPPLY_FIELDS)
        tail = (" None of these is set in the scenario file: the pattern rests on pdvoid's illustrative defaults."
                if defaults else "")
        out.append("Start electrons (the supply the pattern rests on): " + "; ".join(parts) + ". These rates "
                   "are illustrative unless fitted to a measured pattern (pdvoid fit); they set how long the void "
                   "waits for a discharge, how far above inception it starts and so its charge." + tail)
    return tuple(out)


def _input_rows(scenario: Scenario, given: frozenset[str] | None = None) -> list[list[str]]:
    """The scenario table: input, value, unit and origin. With ``given`` (the keys the scenario file sets) the
    origin says where each value came from: "scenario file", "parameter set <name>" (a memory model's values
    from its named set) or "pdvoid default"; without it (a Scenario built in Python) every value is the
    Scenario object's, and a model value equal to pdvoid's default says so."""
    ins, void, sup, model = scenario.insulation, scenario.void, scenario.periodic_supply, scenario.model
    own_set = getattr(model, "parameter_set", None)
    set_values: frozenset[str] = frozenset()
    if isinstance(own_set, str):
        from pdvoid.inputs.model_sets import get_parameter_set

        set_values = frozenset(get_parameter_set(own_set).values)
    defaults = type(model)()

    def origin(key: str) -> str:
        if given is None:
            part, _, name = key.partition(".")
            if part == "model" and getattr(defaults, name, None) == getattr(model, name):
                return "Scenario object (default value)"
            return "Scenario object"
        if key in given:
            return "scenario file"
        if key.startswith("model.") and key[6:] in set_values:
            return f"parameter set {own_set}"
        return "pdvoid default"

    if isinstance(ins, Coaxial):  # a cable: the wall follows from the two radii
        radial = void.radial_position
        rows = [
            ["conductor radius (inner radius of the insulation)", f"{ins.inner_radius * 1e3:.4g}", "mm",
             origin("insulation.inner_radius")],
            ["outer radius of the insulation", f"{ins.outer_radius * 1e3:.4g}", "mm",
             origin("insulation.outer_radius")],
            ["insulation wall", f"{ins.thickness * 1e3:.4g}", "mm", "derived: outer minus inner radius"],
            ["void centre from the cable axis", "-" if radial is None else f"{radial * 1e3:.4g}", "mm",
             origin("void.radial_position")],
        ]
    else:
        rows = [["insulation thickness", f"{ins.thickness * 1e3:.4g}", "mm", origin("insulation.thickness")]]
    rows += [
        ["void diameter (across the field)", f"{void.diameter * 1e3:.4g}", "mm", origin("void.diameter")],
        ["void height (along the field)", f"{void.height * 1e3:.4g}", "mm", origin("void.height")],
        ["void shape", void.shape, "-", origin("void.shape")],
        ["gas", void.gas, "-", origin("void.gas")],
        ["gas pressure", f"{void.pressure / 1e3:.4g}", "kPa", origin("void.pressure")],
        ["gas temperature", f"{void.temperature:.4g}", "K", origin("void.temperature")],
        [
            "streamer length",
            f"{void.streamer_length * 1e3:.4g}",
            "mm",
            origin("void.inception_length") if void.inception_length is not None else "default: the void height",
        ],
    ]
    if isinstance(sup, Periodic):
        rows.append(["supply waveform", f"periodic, {sup.samples.size} samples", "-", origin("supply.samples")])
    else:
        harm = ", ".join(f"{m}: {h:g} at {p:g} deg" for m, h, p in sup.harmonics) or "none"
        rows.append(["supply harmonics (order: fraction at phase)", harm, "-", origin("supply.harmonics")])
    rows.append(["supply frequency", f"{sup.frequency:g}", "Hz", origin("supply.frequency")])
    kind = model.title
    rows.append(["model", kind, "-", origin("model.kind")])
    named = sets_matching(model)
    rows.append(["model parameter set", ", ".join(named) or "none (values as given)", "-",
                 "its values' sources: pdvoid.cite" if named else origin("model.parameter_set")])
    for f in fields(model):
        v = getattr(model, f.name)
        if v is None or f.name == "parameter_set":
            continue
        unit, scale = _MODEL_UNITS.get(f.name, ("-", 1.0))
        if isinstance(v, bool) or isinstance(v, str):
            text = str(v)
        elif math.isinf(v):
            text = "none (no decay)" if "decay" in f.name else "inf"
        else:
            text = f"{v / scale:.4g}"
        rows.append([f"model: {f.name.replace('_', ' ')}", text, unit, origin(f"model.{f.name}")])
    return rows
