"""Pages and charts of the design-review pack (:func:`pdvoid.faces.report.design_review` computes; this module
lays out)."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING

from matplotlib.axes import Axes
from matplotlib.figure import Figure

from pdvoid.core.errors import InputError
from pdvoid.faces.plots.field import field_time
from pdvoid.faces.plots.margins import inception_chart, sensitivity_chart
from pdvoid.faces.plots.pages import PageWriter, figure_text
from pdvoid.faces.plots.patterns import phase_pattern
from pdvoid.faces.plots.style import new_figure

if TYPE_CHECKING:
    from pdvoid.analysis.acceptance import AcceptanceVerdict
    from pdvoid.analysis.inception import InceptionEstimate
    from pdvoid.analysis.margins import LargestVoid, MarginTable
    from pdvoid.analysis.verdict import InceptionBand
    from pdvoid.faces.report import SensitivityRow
    from pdvoid.inputs.document import DocumentControl
    from pdvoid.inputs.scenario import Scenario
    from pdvoid.simulation.results import Result

__all__ = ["Context", "Pages", "build_pages", "standalone_chart", "CHART_NAMES"]

CHART_NAMES = ("margin", "field_time", "pattern", "sensitivity")


@dataclass(frozen=True, eq=False)
class Context:
    """Everything the pack shows, computed by :func:`pdvoid.faces.report.design_review` (voltages V rms, SI).

    Attributes
    ----------
    scenario : Scenario
        The design.
    estimate : InceptionEstimate
        Analytic inception and extinction of the design (V rms).
    result : Result
        The simulation at the test voltage.
    test_voltage : float
        Test level [V rms].
    service_voltage : float or None
        Service level; None when not given [V rms].
    sensitivity : list of SensitivityRow
        The inputs varied by the sensitivity chart.
    summary : dict of str to float
        Numbers of the simulated run, ``{"name [unit]": value}``.
    largest, largest_service : LargestVoid or None
        Largest discharge-free void at the test and at the service level (None without a service level).
    tables : list of MarginTable
        Inception against void size for the margin chart.
    material, gas, inputs : list of list of str
        Table rows of the material and gas data and of the scenario's inputs.
    references : str
        The references of the run, one per line.
    safety : str
        The safety note.
    version : str
        The pdvoid version.
    cycles : int
        Cycles simulated [-].
    seed : int
        Random seed [-].
    regime : str
        The regime of the simulated run in words (:func:`pdvoid.analysis.regime.discharge_regime`); empty for
        none.
    band : InceptionBand or None
        Inception voltages of both criteria and their band (None: the verdict uses ``estimate`` alone) [V rms].
    verdict : str
        The band's verdict at the test level (:func:`pdvoid.analysis.verdict.verdict`); empty without a band.
    validity_notes : tuple of str
        Validity notes of the design's own coefficients (the numbers on the summary page).
    variation_notes : tuple of str
        Validity notes of the varied designs of the margin chart, the sensitivity chart and the void searches.
    measurement_notes : tuple of str
        The measuring chain's assumptions (:meth:`pdvoid.TestCircuit.describe`,
        :meth:`pdvoid.Instrument.describe`); empty when no measuring chain was given.
    document : DocumentControl or None
        Revision, author, checker and approver; None or an empty field prints a blank line to sign.
    date : str
        Date and time of the run, ISO 8601 (UTC); empty: not stated.
    input_name, input_sha256 : str or None
        The scenario file's name and the SHA-256 of its bytes; None for a Scenario given without its file.
    acceptance : AcceptanceVerdict or None
        The verdict against the acceptance criterion; None when no criterion was given.
    pattern_notes : tuple of str
        What the simulated pattern rests on, in words (:func:`pdvoid.faces.report.pattern_assumptions`).
    """

    scenario: Scenario
    estimate: InceptionEstimate
    result: Result
    test_voltage: float
    service_voltage: float | None
    sensitivity: list[SensitivityRow]
    summary: dict[str, float]
    largest: LargestVoid
    largest_service: LargestVoid | None
    tables: list[MarginTable]
    material: list[list[str]]
    gas: list[list[str]]
    inputs: list[list[str]]
    references: str
    safety: str
    version: str
    cycles: int
    seed: int
    regime: str = ""
    band: InceptionBand | None = None
    verdict: str = ""
    validity_notes: tuple[str, ...] = ()
    variation_notes: tuple[str, ...] = ()
    measurement_notes: tuple[str, ...] = ()
    document: DocumentControl | None = None
    date: str = ""
    input_name: str | None = None
    input_sha256: str | None = None
    acceptance: AcceptanceVerdict | None = None
    pattern_notes: tuple[str, ...] = ()


@dataclass(frozen=True)
class Pages:
    """The pages of the pack.

    Attributes
    ----------
    figures : list of matplotlib.figure.Figure
        One figure per A4 page, in order.
    titles : list of str
        The title of each page.
    texts : list of str
        All text drawn on each page.
    """

    figures: list[Figure]
    titles: list[str]
    texts: list[str]


def _number(v: float) -> str:
    return f"{v:.3g}" if math.isfinite(v) else "none"


def _field_pair(streamer: float, integral: float) -> str:
    """The inception fields of both criteria [V/m] in kV/mm; a criterion without a solution said in words."""
    def one(v: float) -> str:
        return f"{v / 1e6:.3g}" if math.isfinite(v) else "no solution"

    return f"{one(streamer)} / {one(integral)}"


def _charges(summary: dict[str, float]) -> str:
    """Mean and largest simulated apparent charge [pC], or that the run had no discharge (never "nan")."""
    mean = summary.get("mean apparent charge [pC]", math.nan)
    largest = summary.get("largest apparent charge [pC]", math.nan)
    if summary.get("discharges per cycle [-]", 0.0) == 0.0 or not math.isfinite(largest):
        return "none: no discharge in the simulated run"
    return f"{mean:.3g} / {largest:.3g}"


def _kv(v: float | None) -> str:
    return "n/a" if v is None or not math.isfinite(v) else f"{v / 1e3:.3g}"


def _margin(u_inc: float, level: float, what: str) -> str:
    ratio = u_inc / level
    pct = abs(ratio - 1.0) * 100.0
    if ratio >= 1.0:
        return f"{ratio:.2f}: inception {pct:.0f} % above the {what} voltage"
    return f"{ratio:.2f}: inception {pct:.0f} % below the {what} voltage"


def _band_margin(ctx: Context, level: float, what: str) -> str:
    text = _margin(ctx.estimate.inception_voltage, level, what) + " (criterion used)"
    band = ctx.band
    if band is not None and not band.single_criterion and math.isfinite(band.high):
        text += f"; both criteria: {band.low / level:.2f} to {band.high / level:.2f}"
    return text


def _kv4(v: float) -> str:
    return "n/a" if not math.isfinite(v) else f"{v / 1e3:.4g}"


def _void_text(lv: LargestVoid | None) -> str:
    if lv is None:  # no level, no search (Context.largest_service without a service voltage)
        return "n/a"
    size = f"{lv.diameter * 1e3:.3g} mm × {lv.height * 1e3:.3g} mm (diameter × height)"
    if lv.limited_by == "insulation":
        return f"at least {size}: every void up to half the insulation thickness stays discharge-free"
    if lv.limited_by == "smallest":
        return "none: even a 1 µm void of this shape would discharge"
    return size


def _verdict(ctx: Context) -> str:
    u, ut = ctx.estimate.inception_voltage, ctx.test_voltage
    band = ctx.band
    if band is None:
        word = "above" if u >= ut else "below"
        return (f"Inception voltage {_kv(u)} kV rms lies {word} the test voltage {_kv(ut)} kV rms (margin "
                f"{u / ut:.2f}, one criterion).")
    if band.regime == "no self-sustained discharge":
        return f"Verdict at the test voltage {_kv4(ut)} kV rms: {ctx.verdict}. {band.describe()}."
    words = band.describe()  # both criteria, the band and the quoted spread of the streamer constant
    where = words[:1].upper() + words[1:]
    return f"Verdict at the test voltage {_kv4(ut)} kV rms: {ctx.verdict}. {where}; {band.regime} regime."


def _pattern_caption(ctx: Context) -> str:
    m = ctx.scenario.model
    electrons = ("unlimited start electrons (lag-free)" if m.lag_free else
                 "the start-electron supply of the assumptions page (illustrative rates unless fitted)")
    return (f"Simulated with the {m.title} and {electrons}: the pattern's counts and magnitudes rest on both "
            "(see 'What the simulated pattern rests on').")


def _notes_section(w: PageWriter, ctx: Context) -> None:
    if ctx.validity_notes:
        w.heading("Validity notes on these numbers")
        w.bullets(list(ctx.validity_notes), size=8.0)
    if ctx.variation_notes:
        w.heading("Validity notes on the varied designs (margin chart, sensitivity, void searches)", size=10)
        w.bullets(list(ctx.variation_notes), size=7.5)


#: printed for an empty name, signature or date: a line to sign on
BLANK = "_" * 18


def _document_section(w: PageWriter, ctx: Context) -> None:
    doc = ctx.document
    rev = doc.revision if doc is not None else ""
    if ctx.input_name is None:
        name, digest = "none: the scenario was given as a Python object, not read from a file", "none (no file)"
    else:
        name, digest = ctx.input_name, ctx.input_sha256 or "none"
    w.table(
        ["document control", ""],
        [
            ["date of the run (ISO 8601, UTC)", ctx.date or BLANK],
            ["revision", rev or BLANK],
            ["input file (scenario)", name],
            ["SHA-256 of the input file", digest],
            ["pdvoid version", ctx.version],
            ["simulation", f"{ctx.cycles} cycles from an uncharged void, seed {ctx.seed}"],
        ],
        [0.3, 0.7],
        size=7.5,
    )
    people = [(role, getattr(doc, key, "") if doc is not None else "")
              for role, key in (("author", "author"), ("checker", "checker"), ("approver", "approver"))]
    w.table(["role", "name", "signature", "date"], [[r, n or BLANK, BLANK, BLANK] for r, n in people],
            [0.16, 0.42, 0.24, 0.18], size=7.5)


def _pc(q: float) -> str:
    return f"{q * 1e12:.4g} pC"


def _acceptance_section(w: PageWriter, ctx: Context) -> None:
    a = ctx.acceptance
    if a is None:
        w.box("Acceptance: no acceptance criterion was given, so this pack gives no acceptance verdict (set one "
              "with pdvoid report --acceptance-charge 10pC --acceptance-voltage-factor 1.1, or an [acceptance] "
              "table in the scenario file; the limit comes from the applicable standard or specification).",
              size=9.0, colour="#1b2a49", face="#f1f4fa")
        return
    w.box(f"Acceptance verdict: {a.outcome}. Criterion {a.criterion.describe()}, i.e. at most "
          f"{_pc(a.criterion.charge)} at {_kv4(a.voltage)} kV rms.", size=9.5, colour="#1b2a49", face="#f1f4fa")
    if a.largest_repeated > 0.0:
        rep = _pc(a.largest_repeated)
    else:
        rep = f"0 pC: no magnitude repeats {a.repetition_rate:g} times per second in the run"
    largest = _pc(a.largest_charge) if a.discharges else "none: no discharge in the run"
    rows = [
        ["acceptance voltage, rms", f"{_kv4(a.voltage)} kV ({a.criterion.voltage_factor:.4g} × "
                                    f"{_kv4(a.test_voltage)} kV)"],
        ["largest repeatedly occurring magnitude (pdvoid's counting rule, below)", rep],
        ["apparent charge of a lag-free discharge", _pc(a.lag_free_charge)],
        ["largest single discharge in the run", largest],
        ["discharges in the run at the acceptance voltage",
         f"{a.discharges} in {a.cycles} cycles" + (
             "" if a.voltage == a.test_voltage else " (a run of its own, same cycles and seed)")],
        ["inception band (both criteria)", a.band.describe()],
        ["the band at the acceptance voltage", a.band_verdict],
        ["validity of the design's own numbers",
         f"{len(ctx.validity_notes)} validity note(s), listed below" if ctx.validity_notes else
         "within the verified range of the closed forms (no validity note on the design itself)"],
        ["why", a.reason],
        ["the verdict rests on", "; ".join(a.rests_on)],
    ]
    w.table(["acceptance", "value"], rows, [0.34, 0.66], size=7.5)
    w.paragraph(f"Counting rule: the {a.counting_rule}. The chart pages show the run at the test voltage.",
                size=7.0, colour="#444444")


def _summary_page(w: PageWriter, ctx: Context) -> None:
    sc, est, c = ctx.scenario, ctx.estimate, ctx.result.coefficients()
    w.new_page("Design review: partial discharges in a gas-filled void")
    w.paragraph(sc.name or "(unnamed scenario)", size=10, weight="bold")
    _document_section(w, ctx)
    w.box(ctx.safety, size=8.5)
    _acceptance_section(w, ctx)
    w.box(_verdict(ctx), size=9.5, colour="#1b2a49", face="#f1f4fa")
    _notes_section(w, ctx)
    w.heading("Inception, extinction and margins")
    rows = [
        ["inception voltage, streamer criterion", _kv(est.inception_voltage_streamer), "kV rms"],
        ["inception voltage, ionisation integral", _kv(est.inception_voltage_integral), "kV rms"],
        [
            "inception voltage used (criterion: " + sc.model.inception_criterion.replace("_", " ") + ")",
            _kv(est.inception_voltage),
            "kV rms",
        ],
        ["inception regime", est.inception_reason or est.inception_regime, "-"],
        ["extinction voltage estimate, (E_inc + E_res)/2", _kv(est.extinction_voltage), "kV rms"],
        [
            "inception field in the void, streamer / integral",
            _field_pair(c.inception_field_streamer, c.inception_field_integral),
            "kV/mm",
        ],
        ["residual field in the void", f"{c.residual_field / 1e6:.3g}", "kV/mm"],
        ["field enhancement f = E_void / (V/d)", f"{c.field_enhancement:.3g}", "-"],
        ["apparent charge of a lag-free discharge", f"{c.charge_per_discharge * 1e12:.3g}", "pC"],
        ["test voltage", _kv(ctx.test_voltage), "kV rms"],
        [
            "margin to the test voltage, U_inc / U_test",
            _band_margin(ctx, ctx.test_voltage, "test"),
            "-",
        ],
        ["largest discharge-free void at the test voltage (this shape)", _void_text(ctx.largest), "-"],
    ]
    if ctx.service_voltage is not None:
        us = ctx.service_voltage
        rows += [
            ["service voltage", _kv(us), "kV rms"],
            [
                "margin to the service voltage, U_inc / U_service",
                _band_margin(ctx, us, "service"),
                "-",
            ],
            [
                "extinction / service voltage (> 1: discharges started by a transient die out)",
                f"{est.extinction_voltage / us:.2f}",
                "-",
            ],
            ["largest discharge-free void at the service voltage", _void_text(ctx.largest_service), "-"],
        ]
    s = ctx.summary
    rows += [
        [
            "simulated at the test voltage: discharges per cycle",
            f"{s['discharges per cycle [-]']:.3g}",
            "1/cycle",
        ],
        [
            "simulated: mean / largest apparent charge",
            _charges(s),
            "pC",
        ],
        ["simulated: first discharge after", _number(s.get("first discharge after [s]", math.nan)), "s"],
        [
            "simulated: discharges per cycle from the first discharge on",
            _number(s.get("discharges per cycle from the first discharge on [-]", math.nan)),
            "1/cycle",
        ],
    ]
    w.table(["quantity", "value", "unit"], rows, [0.52, 0.36, 0.12])
    if ctx.regime:
        w.paragraph(f"Simulated run at the test voltage: {ctx.regime}.", size=8.5)
    w.heading("Scenario")
    w.table(["input", "value", "unit", "origin"], ctx.inputs, [0.42, 0.2, 0.12, 0.26])
    w.heading("Material and gas data: source and status")
    w.table(
        ["quantity", "value", "unit", "status", "source"],
        ctx.material + ctx.gas,
        [0.2, 0.1, 0.1, 0.13, 0.47],
        size=7.5,
    )
    w.paragraph(
        "Status: confirmed (checked against public text), derived (derived here and checked "
        "numerically), from memory (recalled, not confirmed), common practice.",
        size=7.5,
        colour="#444444",
    )


def draw_margin(ctx: Context, ax: Axes) -> None:
    """Draw the margin chart of the pack (inception against void size, the design's size marked).

    Parameters
    ----------
    ctx : Context
        What the pack shows.
    ax : matplotlib.axes.Axes
        Axes to draw into.
    """
    p = ctx.scenario.void.pressure
    labels = [f"gas at {p / 1e3:.4g} kPa (design)", f"gas at {p / 2e3:.4g} kPa"][: len(ctx.tables)]
    inception_chart(ctx.tables, ctx.service_voltage, ctx.test_voltage, ax=ax, labels=labels)
    d = ctx.scenario.void.diameter * 1e3
    ax.axvline(d, color="#222222", lw=1.0, ls=(0, (1, 1.5)), zorder=2)
    ax.annotate(
        f"this design: {d:.3g} mm",
        (d, 0.03),
        xycoords=("data", "axes fraction"),
        xytext=(4, 0),
        textcoords="offset points",
        fontsize=8,
        rotation=90,
        va="bottom",
        ha="left",
        color="#222222",
        bbox={"boxstyle": "square,pad=0.15", "fc": "white", "ec": "none"},
    )


def draw_field(ctx: Context, ax: Axes) -> None:
    """Draw the void field against time of the simulation at the test voltage.

    Parameters
    ----------
    ctx : Context
        What the pack shows.
    ax : matplotlib.axes.Axes
        Axes to draw into.
    """
    field_time(ctx.result, cycles=3, ax=ax)


def draw_pattern(ctx: Context, ax: Axes) -> None:
    """Draw the phase-resolved pattern of the simulation at the test voltage.

    Parameters
    ----------
    ctx : Context
        What the pack shows.
    ax : matplotlib.axes.Axes
        Axes to draw into.
    """
    phase_pattern(ctx.result, ax=ax)


def draw_sensitivity(ctx: Context, ax_u: Axes, ax_q: Axes) -> None:
    """Draw the two sensitivity charts: inception voltage and lag-free apparent charge.

    Parameters
    ----------
    ctx : Context
        What the pack shows.
    ax_u : matplotlib.axes.Axes
        Axes of the inception-voltage chart.
    ax_q : matplotlib.axes.Axes
        Axes of the apparent-charge chart.
    """
    rows_u = [(r.label, r.inception_low, r.inception_high, r.inception_base) for r in ctx.sensitivity]
    rows_q = [(r.label, r.charge_low, r.charge_high, r.charge_base) for r in ctx.sensitivity]
    sensitivity_chart(rows_u, ax=ax_u, quantity="inception voltage, rms", unit="kV")
    sensitivity_chart(rows_q, ax=ax_q, quantity="apparent charge of a lag-free discharge", unit="pC")


def standalone_chart(ctx: Context, name: str) -> Figure:
    """One chart of the pack as its own figure (for PNG/SVG export).

    Parameters
    ----------
    ctx : Context
        What the pack shows.
    name : str
        One of :data:`CHART_NAMES` [-].

    Returns
    -------
    matplotlib.figure.Figure
        The chart.

    Raises
    ------
    InputError
        For an unknown chart name.
    """
    if name not in CHART_NAMES:
        raise InputError(f"chart name must be one of {CHART_NAMES}; got {name!r}")
    if name == "sensitivity":
        fig = new_figure((6.5, 8.0))
        a, b = fig.subplots(2, 1)
        draw_sensitivity(ctx, a, b)
        return fig
    fig = new_figure((7.0, 4.6))
    ax = fig.add_subplot()
    {"margin": draw_margin, "field_time": draw_field, "pattern": draw_pattern}[name](ctx, ax)
    return fig


_ASSUMPTIONS = (
    "The void is an idealised {shape} {where}, its axis along the "
    "field; the host is a homogeneous linear dielectric. Other geometries need the numerical field solver.",
    "Field enhancement and induced (apparent) charge use closed forms valid for a void small compared with "
    "its distance to the electrodes (here height/thickness = {h_d:.2f}; the margin chart stops where the "
    "void height reaches half the thickness).",
    "Inception: streamer criterion E_inc = (E/p)_cr·p·(1 + B/(p·l)^n) with l = {l_mm:.3g} mm; the ionisation "
    "integral of the effective ionisation coefficient is shown as a second estimate. The two differ by "
    "{spread:.0f} % here; treat the spread as part of the uncertainty.",
    "{residual}",
    "The extinction estimate (E_inc + E_res)/2 is derived for lag-free discharges; a real extinction voltage "
    "depends on history and lies between it and the inception voltage.",
    "{electrons}",
    "Not modelled: ageing of the void surface and gas, surface conductivity, temperature rise, several "
    "voids, the measuring circuit (coupling capacitor, bandwidth) and noise. Apparent charges are those a "
    "calibrated IEC 60270 system would read for this void alone.",
    "The simulation starts from an uncharged void at the positive-going zero crossing of the test voltage "
    "and runs {cycles} cycles with seed {seed}; other seeds give other patterns of the same statistics.",
)


def _where(sc: Scenario) -> str:
    """Where the void sits, in words: in a plane slab, or in a cable's coaxial insulation."""
    ins = sc.insulation
    inner, outer = getattr(ins, "inner_radius", None), getattr(ins, "outer_radius", None)
    r = sc.void.radial_position
    if inner is not None and outer is not None and r is not None:
        return (f"in the coaxial insulation of a cable (conductor radius {inner * 1e3:.4g} mm, screen radius "
                f"{outer * 1e3:.4g} mm), its centre {r * 1e3:.4g} mm from the axis, in the local radial field "
                "V/(r ln(R/r_i))")
    where = {"centred": "centred in", "high_voltage_electrode": "on the high-voltage electrode of",
             "ground_electrode": "on the ground electrode of"}[sc.void.position]
    return f"{where} a plane slab between plane electrodes"


def _assumptions_page(w: PageWriter, ctx: Context) -> None:
    sc, est = ctx.scenario, ctx.estimate
    a, b = est.inception_voltage_streamer, est.inception_voltage_integral
    spread = abs(a - b) / min(a, b) * 100.0 if math.isfinite(b) else math.nan
    w.new_page("Assumptions and validity limits")
    h_d = sc.void.height / sc.insulation.thickness
    values = {
        "shape": "spheroid" if sc.void.shape == "spheroid" else "flat cylinder (disc)",
        "where": _where(sc),
        "h_d": h_d,
        "l_mm": sc.void.streamer_length * 1e3,
        "spread": spread,
        "residual": sc.model.assumptions()[0],
        "electrons": sc.model.assumptions()[1],
        "cycles": ctx.cycles,
        "seed": ctx.seed,
    }
    w.bullets([t.format(**values) for t in _ASSUMPTIONS])
    if ctx.pattern_notes:
        w.heading("What the simulated pattern rests on")
        w.bullets(list(ctx.pattern_notes), size=8.5)
    w.heading("Measuring circuit")
    if ctx.measurement_notes:
        w.bullets(["Charges are read through a simulated IEC 60270 measuring chain (pdvoid.measure), calibrated "
                   "with the calibrator below; instrument frequency ranges from memory of IEC 60270 clause 4.3.",
                   *ctx.measurement_notes], size=8.5)
    else:
        w.paragraph("Charges are apparent charges at the test object's terminals as an ideal instrument would read "
                    "them: no test circuit, band-pass, calibration error, resolution time or noise is modelled "
                    "(pass a test circuit and an instrument to model them).", size=8.5)
    if not math.isfinite(spread):
        w.paragraph("The ionisation-integral estimate is not available for this gas and length.", size=8.5)
    if ctx.validity_notes:  # the checks of pdvoid.coefficients.limits for this design (also on the summary page)
        w.box("Validity notes: " + " ".join(f"({i}) {n}." for i, n in enumerate(ctx.validity_notes, start=1)),
              size=8.5)
    elif ctx.band is None and h_d > 0.3:  # a context built without the analysis' notes: the rough rule
        w.box(
            "Validity warning: the void is not small compared with the insulation thickness; the closed-form "
            "field and charge are outside their validity range. Use the numerical field solver.",
            size=8.5,
        )


def _references_page(w: PageWriter, ctx: Context) -> None:
    w.new_page("References used by this run")
    w.paragraph(
        "Status in brackets: confirmed, derived, from memory, common practice.", size=8.5, colour="#444444"
    )
    w.bullets(ctx.references.splitlines(), size=8.5)
    w.heading("Safety")
    w.box(ctx.safety, size=9.5)


def build_pages(ctx: Context) -> Pages:
    """All pages of the pack, in order.

    Parameters
    ----------
    ctx : Context
        What the pack shows.

    Returns
    -------
    Pages
        The page figures with their titles and texts.
    """
    w = PageWriter(
        footer=lambda i, n: (
            f"pdvoid {ctx.version} design-review pack · engineering estimates, not "
            f"test results · high voltage can kill · page {i} of {n}"
        )
    )
    _summary_page(w, ctx)
    chart = w.chart_page(
        "Margin chart: inception voltage against void size",
        "Inception (solid) and extinction (dashed) voltage of a void of the design's shape against its "
        "diameter, at the design's gas pressure and at half of it (voids cast under vacuum or degassed may "
        "hold gas below atmospheric pressure). Where an inception curve crosses the test level the largest "
        "discharge-free void is marked: every smaller void of this shape stays discharge-free at the test "
        "voltage by this estimate. Analytic coefficients, no simulation.",
    )
    draw_margin(ctx, chart.add_subplot())
    chart = w.chart_page(
        "Void field against time at the test voltage",
        "The void field (solid) between discharges is the field of an uncharged void, i.e. the applied "
        "voltage times f/d (dashed, right axis), plus the field of the charge deposited by earlier "
        "discharges. A discharge can start once |E_void| reaches the inception field (red dashed) and a "
        "start electron is available; it drops the field to the residual field (blue dotted). Vertical "
        "segments mark each discharge, from the field just before to just after it. The first cycles with "
        "discharges are shown.",
    )
    draw_field(ctx, chart.add_subplot())
    chart = w.chart_page(
        "Phase-resolved pattern at the test voltage",
        f"Discharges per cycle in each cell of phase × apparent charge over {ctx.result.cycles} simulated "
        "cycles (logarithmic colour scale; empty cells white), with the applied voltage drawn over it. "
        "Phase is measured from the positive-going zero crossing of the applied voltage (IEC 60270 "
        "convention). " + _pattern_caption(ctx),
        chart_height=5.6,
    )
    draw_pattern(ctx, chart.add_subplot())
    chart = w.chart_page(
        "Sensitivity: how the estimates move with each input",
        "Each input lowered (amber) and raised (blue) by 20 % with all others kept; bars run from the "
        "design value to the changed value, the largest swing on top. Top: inception voltage. Bottom: "
        "apparent charge of a lag-free discharge, the typical magnitude. Inputs whose change makes the "
        "scenario invalid are marked. Analytic coefficients, no simulation.",
        chart_height=7.4,
    )
    ax_u, ax_q = chart.subplots(2, 1)
    draw_sensitivity(ctx, ax_u, ax_q)
    _assumptions_page(w, ctx)
    _references_page(w, ctx)
    figs = w.finish()
    return Pages(figures=figs, titles=list(w.titles), texts=[figure_text(f) for f in figs])
