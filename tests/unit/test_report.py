"""The design-review pack: the PDF, its pages and texts, the figures, the sensitivity numbers, the CLI."""

from __future__ import annotations

import argparse
import dataclasses
import math
from pathlib import Path

import matplotlib

matplotlib.use("Agg")

import numpy as np  # noqa: E402
import pytest  # noqa: E402

import pdvoid  # noqa: E402
from pdvoid import InputError  # noqa: E402
from pdvoid.analysis.inception import inception  # noqa: E402
from pdvoid.faces.cli.report import register  # noqa: E402
from pdvoid.faces.report import SAFETY_NOTE, at_voltage, design_review, sensitivity  # noqa: E402

# the review pack varies the demo (thickness -20 %: a 1.5 mm sphere in 4.8 mm; a void nearly as tall as the slab),
# for which compute_coefficients rightly warns that the closed forms are about 2 % or more off (ValidityWarning)
pytestmark = pytest.mark.filterwarnings("ignore::pdvoid.core.validity.ValidityWarning")

SAFETY_WORDS = (
    "high voltage can kill",
    "engineering estimates",
    "applicable standards",
    "local codes and licensed practice prevail",
)


def _flat(text: str) -> str:
    """Page text with the line breaks of wrapped paragraphs and table cells removed."""
    return " ".join(text.split())


def _pdf_reader(path):
    """The written file read back by pypdf, a PDF library independent of the writer (matplotlib); pypdf is in
    the test extra, so a missing pypdf fails these tests instead of skipping the check."""
    from pypdf import PdfReader

    return PdfReader(str(path))


def _pdf_pages(path) -> int:
    return len(_pdf_reader(path).pages)


def _pdf_page_texts(path) -> list[str]:
    return [" ".join(p.extract_text().lower().split()) for p in _pdf_reader(path).pages]


@pytest.fixture(scope="module")
def demo_pack(tmp_path_factory):
    from pdvoid.inputs.demo import demo_scenario

    out = tmp_path_factory.mktemp("pack") / "review.pdf"
    return design_review(
        demo_scenario(), test_voltage=18e3, service_voltage=8e3, cycles=200, seed=1, out=out, figures="png"
    )


def test_pdf_written_with_all_pages(demo_pack):
    assert demo_pack.path.exists() and demo_pack.path.read_bytes()[:5] == b"%PDF-"
    assert _pdf_pages(demo_pack.path) == demo_pack.pages
    titles = demo_pack.page_titles
    assert titles[0].startswith("Design review")
    for needed in (
        "Margin chart",
        "Void field against time",
        "Phase-resolved pattern",
        "Sensitivity",
        "Assumptions and validity limits",
        "References",
    ):
        assert sum(t.startswith(needed) for t in titles) == 1, needed
    assert 7 <= demo_pack.pages <= 9  # summary may continue on a second page
    # the file itself, read back by pypdf: page i carries the title the pack reports for page i, and the
    # footer "page i of n"
    texts = _pdf_page_texts(demo_pack.path)
    n = demo_pack.pages
    for i, (title, text) in enumerate(zip(titles, texts, strict=True), start=1):
        assert " ".join(title.lower().split()) in text, (i, title)
        assert f"page {i} of {n}" in text, i


def test_safety_note_on_first_and_last_page(demo_pack):
    first, last = _flat(demo_pack.page_texts[0]).lower(), _flat(demo_pack.page_texts[-1]).lower()
    for words in SAFETY_WORDS:
        assert words in first and words in last
    assert all("high voltage can kill" in t for t in demo_pack.page_texts)  # the footer of every page
    # the file itself, read back by pypdf: the safety note on the first and the last page
    texts = _pdf_page_texts(demo_pack.path)
    assert len(texts) == demo_pack.pages
    assert "high voltage can kill" in texts[0] and "high voltage can kill" in texts[-1]


def test_summary_numbers_come_from_the_analysis(demo_pack):
    from pdvoid.inputs.demo import demo_scenario

    # the pack prints the analysis' numbers (pdvoid.analysis.inception; both criteria) and the margin
    est = inception(demo_scenario())
    page = _flat("\n".join(demo_pack.page_texts[:3]))  # the summary and its continuation pages
    for v in (est.inception_voltage_streamer, est.inception_voltage_integral, est.extinction_voltage):
        assert f"{v / 1e3:.3g}" in page
    assert demo_pack.margin == pytest.approx(est.inception_voltage / 18e3)
    assert f"{demo_pack.margin:.2f}: inception" in page
    # the simulated row: discharges per cycle and the mean / largest |q| per discharge in pC, computed here from
    # the run's event arrays (hand calculation; pC = 1e-12 C, SI prefix, common practice)
    res = demo_pack.result
    q = np.abs(res.charge)
    assert q.size > res.cycles  # more than one discharge per cycle: per discharge and per cycle differ
    assert f"{q.size / res.cycles:.3g}" in page
    assert f"{np.mean(q) * 1e12:.3g} / {np.max(q) * 1e12:.3g}" in page
    # material and gas data appear with their status (pdvoid.inputs.materials)
    assert "epoxy_silica_filled" in page and "from memory" in page and "air: critical reduced field" in page
    # the references page lists what the run used (pdvoid.cite)
    refs = demo_pack.page_texts[-1]
    for key in demo_pack.result.references:
        assert f"[{key}]" in refs


def test_figures_next_to_the_pdf(demo_pack):
    names = sorted(p.name for p in demo_pack.figures)
    assert names == [
        "review_field_time.png",
        "review_margin.png",
        "review_pattern.png",
        "review_sensitivity.png",
    ]
    for p in demo_pack.figures:
        assert p.parent == demo_pack.path.parent
        assert p.read_bytes()[:4] == b"\x89PNG"


def test_pack_below_inception_svg_without_service(tmp_path, scenario_factory):
    sc = scenario_factory()
    u_inc = pdvoid.compute_coefficients(sc).inception_voltage
    pack = design_review(sc, test_voltage=0.8 * u_inc, cycles=20, out=tmp_path / "low.pdf", figures="svg")
    assert _pdf_pages(pack.path) == pack.pages
    assert pack.result.event_count == 0  # below inception nothing discharges (lag-free or not)
    assert pack.margin == pytest.approx(1.25)
    assert pack.verdict == "discharge-free at the test level"
    assert "discharge-free at the test level" in _flat(pack.page_texts[0])
    assert "service voltage" not in pack.page_texts[0]
    assert all(p.suffix == ".svg" and p.read_bytes().lstrip().startswith(b"<?xml") for p in pack.figures)


def test_sensitivity_follows_the_scalings(demo):
    rows = {r.parameter: r for r in sensitivity(demo, 0.2)}
    base = pdvoid.compute_coefficients(demo)
    t = rows["insulation.thickness"]
    # spheroid in a uniform field: U_inc = E_inc·d/(f·peak factor) with E_inc and f independent of d, and the
    # induced charge ∝ 1/d (physics brief §2.1 and §2.3, derived)
    assert t.inception_high / base.inception_voltage == pytest.approx(1.2, rel=1e-12)
    assert t.charge_low / base.charge_per_discharge == pytest.approx(1.0 / 0.8, rel=1e-12)
    r = rows["model.residual_ratio"]
    # the residual field changes only the charge: q ∝ E_inc − E_res = (1 − ratio)·E_inc (physics brief §2.3)
    assert r.inception_low == r.inception_high == base.inception_voltage
    assert r.charge_high / base.charge_per_discharge == pytest.approx((1 - 0.3) / (1 - 0.25), rel=1e-12)
    assert len(rows) == 6


def test_sensitivity_marks_invalid_variations(scenario_factory):
    # a void of 5.5 mm height in 6 mm insulation: +20 % height is taller than the insulation (invalid)
    sc = scenario_factory(height=5.5e-3, diameter=6e-3)
    rows = {r.parameter: r for r in sensitivity(sc)}
    assert math.isnan(rows["void.height"].inception_high) and math.isfinite(rows["void.height"].inception_low)
    with pytest.raises(InputError, match="change"):
        sensitivity(sc, 1.5)


def test_at_voltage_scales_periodic_supplies(scenario_factory):
    sc = scenario_factory()
    wave = np.sin(2 * np.pi * np.arange(64) / 64) + 0.1 * np.sin(6 * np.pi * np.arange(64) / 64)
    per = pdvoid.Scenario(insulation=sc.insulation, void=sc.void, supply=pdvoid.Periodic(samples=wave * 1e4))
    assert at_voltage(per, 12e3).supply.rms == pytest.approx(12e3, rel=1e-12)
    assert at_voltage(sc, 12e3).supply.rms == 12e3


def test_bad_input(tmp_path, demo):
    good = {"test_voltage": 18e3, "cycles": 10, "out": tmp_path / "r.pdf"}
    with pytest.raises(InputError, match="scenario"):
        design_review("demo.toml", **good)
    for key, value, match in (
        ("test_voltage", -1.0, "test_voltage"),
        ("test_voltage", math.nan, "test_voltage"),
        ("service_voltage", 0.0, "service_voltage"),
        ("cycles", 0, "cycles"),
        ("seed", -1, "seed"),
        ("out", tmp_path / "r.png", ".pdf"),
        ("out", tmp_path / "missing" / "r.pdf", "does not exist"),
        ("figures", "jpg", "figures"),
    ):
        with pytest.raises(InputError, match=match):
            design_review(demo, **{**good, key: value})
    assert not (tmp_path / "r.pdf").exists()  # nothing written for bad input


def _parser():
    p = argparse.ArgumentParser(prog="pdvoid")
    register(p.add_subparsers(dest="command", required=True))
    return p


def test_cli_report(tmp_path, capsys):
    from pdvoid.inputs.demo import demo_scenario_path

    out = tmp_path / "cli.pdf"
    ns = _parser().parse_args(
        [
            "report",
            str(demo_scenario_path()),
            "--out",
            str(out),
            "--test-voltage",
            "18kV",
            "--service-voltage",
            "8 kV",
            "--cycles",
            "50",
            "--seed",
            "2",
            "--figures",
            "png",
        ]
    )
    assert ns.func(ns) == 0
    text = capsys.readouterr().out
    assert out.exists() and f"wrote {out}" in text and SAFETY_NOTE in text
    assert (tmp_path / "cli_margin.png").exists()


@pytest.mark.parametrize("value", ["18 furlong", "18", "-5kV"])
def test_cli_report_bad_voltage(tmp_path, value, capsys):
    from pdvoid.inputs.demo import demo_scenario_path

    # refused while parsing: a wrong unit, a bare number (no silent volts) and a negative level
    with pytest.raises(SystemExit) as exc:
        _parser().parse_args(["report", str(demo_scenario_path()), "--out", str(tmp_path / "x.pdf"),
                              f"--test-voltage={value}"])
    assert exc.value.code == 2 and "argument --test-voltage" in capsys.readouterr().err
    assert not (tmp_path / "x.pdf").exists()
    with pytest.raises(SystemExit):
        _parser().parse_args(["report", "x.toml"])  # --test-voltage is required


def test_cli_main_when_hooked(tmp_path, capsys):
    from pdvoid.faces import cli
    from pdvoid.inputs.demo import demo_scenario_path

    assert "report" in cli.build_parser().format_help()
    with pytest.raises(SystemExit) as exc:
        cli.main(["report", str(demo_scenario_path()), "--out", str(tmp_path / "m.pdf"), "--test-voltage=-5kV"])
    assert exc.value.code == 2 and "argument --test-voltage" in capsys.readouterr().err


def test_simulated_run_states_its_regime_and_first_discharge(demo_pack):
    # the summary page, read back by pypdf: the regime sentence and the first-discharge time of the run
    res = demo_pack.result
    assert res.event_count > 0
    texts = _pdf_page_texts(demo_pack.path)
    page = texts[0] + " " + texts[1]
    assert "simulated run at the test voltage: discharging: first discharge after" in page
    assert f"{res.time[0]:.3g}" in page  # the first event's time in s (hand calculation from the array)


def test_pack_above_inception_but_waiting_says_so(tmp_path, scenario_factory):
    # natural background ionisation, 37 % above inception: a mean wait of thousands of cycles, so a short run is
    # empty (tests/unit/analysis/test_regime.py); the pack must not read like "below inception"
    sc = scenario_factory()
    u_inc = pdvoid.compute_coefficients(sc).inception_voltage
    pack = design_review(sc, test_voltage=18e3, cycles=20, out=tmp_path / "wait.pdf")
    assert u_inc < 18e3 and pack.result.event_count == 0
    texts = _pdf_page_texts(pack.path)
    page = texts[0] + " " + texts[1]
    assert "but waiting for a start electron" in page
    assert "95 % chance of a first discharge within" in page
    assert "first discharge after none" in page


def test_verdict_band_and_validity_notes_in_the_pdf(tmp_path, capsys):
    import warnings

    from pdvoid.analysis.verdict import inception_band
    from pdvoid.faces import cli
    from pdvoid.inputs.demo import demo_scenario

    # a 2.5 mm void in the demo's 6 mm wall: the closed forms warn that it is not small against the slab
    sc = demo_scenario().replace(**{"void.diameter": 2.5e-3, "void.height": 2.5e-3})
    c = pdvoid.compute_coefficients(sc)  # the two criteria, independently of the pack
    lo, hi = sorted((c.inception_voltage_streamer, c.inception_voltage_integral))
    assert lo < hi
    # the streamer criterion over the quoted spread of (E/p)_cr, 24.2 ... 25.2 V/(Pa m) (physics brief 3.1)
    hi_band = max(hi, c.inception_voltage_streamer * 25.2 / 24.2)
    test = 0.5 * (lo + hi)  # between the criteria: the verdict cannot be a clear one
    path = tmp_path / "big.toml"
    sc.to_file(path)
    out = tmp_path / "band.pdf"
    with warnings.catch_warnings():
        warnings.simplefilter("error")  # validity warnings are notes in the pack, not raw warnings
        code = cli.main(["report", str(path), "--out", str(out), f"--test-voltage={test:.6f} V", "--cycles", "20"])
    assert code == 0
    printed = capsys.readouterr().out
    assert "inconclusive: the criteria disagree" in printed and "Validity notes" in printed
    page = _pdf_page_texts(out)[0]
    assert "inconclusive: the criteria disagree" in page
    assert f"inception band {lo / 1e3:.4g} to {hi_band / 1e3:.4g} kv rms" in page
    assert "validity notes on these numbers" in page and "not small against the slab" in page
    assumptions = next(t for t in _pdf_page_texts(out) if "assumptions and validity limits" in t)
    assert "validity notes: (1)" in assumptions and "not small against the slab" in assumptions
    assert inception_band(sc).notes  # the same note the analysis stage gives for this design
    assert "discharge-free at the test level" not in page and "expected to stay" not in page


def test_assumptions_page_states_the_model_rules():
    # project rule: the review pack says in words what the model's residual field and electrons rest on
    import dataclasses

    from pdvoid.faces.plots.review import _ASSUMPTIONS
    from pdvoid.inputs.demo import demo_scenario

    sc = demo_scenario()
    assert any("{residual}" in t for t in _ASSUMPTIONS) and any("{electrons}" in t for t in _ASSUMPTIONS)
    assert sc.model.assumptions()[0].startswith("The residual field E_res = 0.25·E_inc")  # the demo's value
    mem = dataclasses.replace(sc, model=pdvoid.MemoryModel())
    residual, electrons = mem.model.assumptions()
    assert "0.507 kV/mm" in residual and "±50 %" in residual and "from memory" in residual  # 5.066e5 V/m
    assert "detrapped" in electrons and "fitted to no measurement" in electrons


def test_assumptions_page_names_where_the_void_sits(tmp_path):
    # found trying the pack on a void on the high-voltage electrode: the page said "centred in" regardless
    import dataclasses

    from pdvoid.faces.report import design_review
    from pdvoid.inputs.demo import demo_scenario

    sc = demo_scenario()
    sc = dataclasses.replace(sc, void=dataclasses.replace(sc.void, position="high_voltage_electrode", height=0.75e-3))
    out = tmp_path / "pack.pdf"
    design_review(sc, test_voltage=18e3, service_voltage=8e3, cycles=20, seed=1, out=out)
    page = next(t for t in _pdf_page_texts(out) if "assumptions and validity limits" in t)
    assert "on the high-voltage electrode of a plane slab" in page and "centred in" not in page


def test_input_table_names_the_model_and_its_parameter_set(scenario_factory):
    from pdvoid.faces.report import _input_rows
    from pdvoid.inputs.model_sets import model_from_set, sets_matching

    base = scenario_factory()
    rows = {r[0]: r for r in _input_rows(base)}
    assert rows["model"][1] == base.model.title
    mem = dataclasses.replace(base, model=pdvoid.MemoryModel())
    assert {r[0]: r for r in _input_rows(mem)}["model parameter set"][1] == "niemeyer1995"
    ill = dataclasses.replace(base, model=model_from_set("illias2011", ionization_rate=3e9))
    assert {r[0]: r for r in _input_rows(ill)}["model parameter set"][1] == "illias2011"
    assert sets_matching(pdvoid.FieldModel()) == ["field_defaults"]
    assert sets_matching(pdvoid.FieldModel(residual_ratio=0.3)) == []
    with pytest.raises(pdvoid.InputError, match="model"):
        sets_matching("field")


def test_assumptions_page_states_the_measuring_circuit(tmp_path):
    from pdvoid.faces.report import design_review
    from pdvoid.inputs.demo import demo_scenario

    sc = demo_scenario()
    out = tmp_path / "pack.pdf"
    circuit = pdvoid.TestCircuit(test_object_capacitance=100e-12, coupling_capacitance=1e-9)
    design_review(sc, test_voltage=18e3, cycles=20, seed=1, out=out, circuit=circuit,
                  instrument=pdvoid.Instrument(kind="narrowband", centre=200e3, bandwidth=9e3))
    page = next(t for t in _pdf_page_texts(out) if "assumptions and validity limits" in t)
    assert "measuring circuit" in page and "narrow-band" in page and "coupling capacitor" in page
    plain = tmp_path / "plain.pdf"
    design_review(sc, test_voltage=18e3, cycles=20, seed=1, out=plain)
    page = next(t for t in _pdf_page_texts(plain) if "assumptions and validity limits" in t)
    assert "ideal instrument" in page
    with pytest.raises(pdvoid.InputError, match="together"):
        design_review(sc, test_voltage=18e3, cycles=20, out=tmp_path / "x.pdf", circuit=circuit)


def test_input_origin_follows_the_file_not_the_value(tmp_path):
    from pdvoid.faces.report import _file_keys, _input_rows
    from pdvoid.inputs.demo import demo_scenario_path

    # the demo file sets residual_ratio = 0.25 and surface_rate_same = 1e4, both equal to pdvoid's defaults: they
    # come from the file all the same; electron_yield and charge_decay_time it does not set
    path = demo_scenario_path()
    rows = {r[0]: r[3] for r in _input_rows(pdvoid.Scenario.from_file(path), _file_keys(path))}
    assert rows["model: residual ratio"] == "scenario file"
    assert rows["model: surface rate same"] == "scenario file"
    assert rows["void diameter (across the field)"] == "scenario file"
    assert rows["model: electron yield"] == "pdvoid default"
    assert rows["model: charge decay time"] == "pdvoid default"
    assert rows["supply harmonics (order: fraction at phase)"] == "pdvoid default"
    # a memory model naming its set: values the file leaves out come from the set
    mem = tmp_path / "memory.toml"
    mem.write_text(path.read_text(encoding="utf-8").split("[model]")[0]
                   + '[model]\nkind = "memory"\ntrap_depth = "1.2 V"\n', encoding="utf-8")
    rows = {r[0]: r[3] for r in _input_rows(pdvoid.Scenario.from_file(mem), _file_keys(mem))}
    assert rows["model: trap depth"] == "scenario file"
    assert rows["model: attempt frequency"] == "parameter set niemeyer1995"
    # without a file the origin is the Scenario object, and a value equal to the default says so
    rows = {r[0]: r[3] for r in _input_rows(pdvoid.Scenario.from_file(path))}
    assert rows["model: residual ratio"] == "Scenario object (default value)"
    assert "pdvoid default" not in rows["void diameter (across the field)"]


def test_input_table_of_a_cable_gives_its_radii():
    from importlib import resources

    from pdvoid.faces.report import _file_keys, _input_rows

    # the invented example cable sets the two radii and the void's radial position; the wall is derived from the
    # radii (R - r_i = 13.5 mm - 8 mm = 5.5 mm, by hand), not a default
    path = Path(str(resources.files("pdvoid.inputs") / "examples" / "cable.toml"))
    rows = {r[0]: r for r in _input_rows(pdvoid.Scenario.from_file(path), _file_keys(path))}
    assert rows["conductor radius (inner radius of the insulation)"][1:] == ["8", "mm", "scenario file"]
    assert rows["outer radius of the insulation"][1:] == ["13.5", "mm", "scenario file"]
    assert rows["insulation wall"][1] == "5.5" and rows["insulation wall"][3].startswith("derived")
    assert rows["void centre from the cable axis"][1:] == ["10.5", "mm", "scenario file"]
    assert "insulation thickness" not in rows


def test_cli_pack_labels_file_inputs_and_has_no_nan(tmp_path, capsys, scenario_factory):
    from pdvoid.inputs.demo import demo_scenario_path

    out = tmp_path / "cli.pdf"
    ns = _parser().parse_args(["report", str(demo_scenario_path()), "--out", str(out), "--test-voltage", "8kV",
                               "--cycles", "20"])
    assert ns.func(ns) == 0  # 8 kV: below the demo's inception (about 13 kV), so no discharge is simulated
    texts = _pdf_page_texts(out)
    table = next(t for t in texts if "scenario input value unit origin" in t)
    assert "residual ratio 0.25 - scenario file" in table
    assert "mean / largest apparent charge none: no discharge in the simulated run" in " ".join(texts)
    _assert_no_nan(texts)


def _assert_no_nan(texts):
    """No "nan" as a word on any page (plain words instead), nor "None" for an empty field."""
    import re

    for i, text in enumerate(texts):
        words = re.findall(r"[a-z]+", text.lower())
        assert "nan" not in words and "none none" not in text and " None" not in text, i


def test_no_nan_in_any_pack(tmp_path, demo_pack, scenario_factory):
    # every kind of run the pack meets: discharging (the demo), below inception, above inception but waiting for a
    # start electron, and a criterion between the two inception criteria; each with an acceptance verdict
    from pdvoid.inputs.document import AcceptanceCriterion

    _assert_no_nan(_pdf_page_texts(demo_pack.path))
    sc = scenario_factory()
    u_inc = pdvoid.compute_coefficients(sc).inception_voltage
    crit = AcceptanceCriterion(charge=10e-12, voltage_factor=1.1)
    for name, test in (("low", 0.5 * u_inc), ("waiting", 18e3)):
        pack = design_review(sc, test_voltage=test, cycles=20, out=tmp_path / f"{name}.pdf", acceptance=crit)
        assert pack.acceptance is not None
        _assert_no_nan(_pdf_page_texts(pack.path))
    wide = sc.replace(**{"void.diameter": 2.5e-3, "void.height": 2.5e-3})
    pack = design_review(wide, test_voltage=18e3, cycles=20, out=tmp_path / "wide.pdf", acceptance=crit)
    _assert_no_nan(_pdf_page_texts(pack.path))


def test_sensitivity_of_a_cable_moves_the_outer_radius():
    import warnings
    from importlib import resources

    from pdvoid.faces.report import sensitivity

    path = Path(str(resources.files("pdvoid.inputs") / "examples" / "cable.toml"))
    sc = pdvoid.Scenario.from_file(path)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", pdvoid.ValidityWarning)
        row = {r.parameter: r for r in sensitivity(sc)}["insulation.thickness"]
    assert row.label.startswith("insulation wall")
    # the local field of a cable, E = V / (r ln(R / r_i)) (cylindrical capacitor, Kuffel, Zaengl & Kuffel 2000,
    # from memory): with r and r_i kept, the inception voltage scales as ln(R' / r_i) / ln(R / r_i)
    a, b, wall = 8e-3, 13.5e-3, 5.5e-3
    for factor, got in ((0.8, row.inception_low), (1.2, row.inception_high)):
        expected = row.inception_base * math.log((a + factor * wall) / a) / math.log(b / a)
        assert got == pytest.approx(expected, rel=1e-9)


@pytest.mark.parametrize("supply", ["dc", "conducting"])
def test_pack_refuses_a_design_it_cannot_judge(tmp_path, supply):
    # the pack's margins are rms test voltages against a sine's inception in a perfect dielectric: a DC supply or
    # a conducting host is refused in words before any work, never judged as a 50 Hz sine
    base = pdvoid.Scenario(insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.0),
                           void=pdvoid.Void(diameter=1e-3, height=1e-3), supply=pdvoid.Sine(rms=10e3))
    if supply == "dc":
        sc = dataclasses.replace(base, supply=pdvoid.DC(voltage=30e3))
    else:
        sc = dataclasses.replace(base, insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.0,
                                                                    conductivity=1e-12))
    out = tmp_path / "pack.pdf"
    with pytest.raises(pdvoid.InputError, match="review pack compares rms test voltages"):
        design_review(sc, test_voltage=20e3, out=out)
    assert not out.exists()
