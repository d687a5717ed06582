"""Reproductions of bad inputs that used to end in a traceback, a silent acceptance or exhausted memory; each now
ends in a clear InputError (``pdvoid: error: ...``, exit 2). Expectations: the project's bad-input rules."""

from __future__ import annotations

import time

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import pdvoid
from pdvoid import InputError, Scenario
from pdvoid.analysis import ramp_test
from pdvoid.faces import cli
from pdvoid.inputs.demo import demo_measured_path, demo_scenario, demo_scenario_path, demo_sweep_path
from pdvoid.inputs.scenario_files import parts_from_dict
from pdvoid.sweeps.files import read_sweep_file

DEMO = demo_scenario_path().read_text(encoding="utf-8")


def _file(tmp_path, text, name="s.toml"):
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return p


def test_missing_key_is_named(tmp_path):
    text = "\n".join(line for line in DEMO.splitlines() if not line.startswith("height"))
    with pytest.raises(InputError, match=r"missing key void.height"):
        Scenario.from_file(_file(tmp_path, text))


def test_kind_in_void_is_an_unknown_key(tmp_path):
    text = DEMO.replace("[void]\n", '[void]\nkind = "sphere"\n')
    with pytest.raises(InputError, match=r"unknown key void.kind"):
        Scenario.from_file(_file(tmp_path, text))


def test_byte_order_mark_is_accepted(tmp_path):
    p = tmp_path / "bom.toml"
    p.write_bytes(b"\xef\xbb\xbf" + DEMO.encode("utf-8"))
    assert Scenario.from_file(p) == Scenario.from_file(demo_scenario_path())


def test_huge_integer_and_deep_nesting_are_refused(tmp_path):
    big = DEMO.replace('thickness = "6 mm"', "thickness = " + "9" * 400)
    with pytest.raises(InputError, match="insulation.thickness"):
        Scenario.from_file(_file(tmp_path, big))
    deep = "a = " + "[" * 20000 + "]" * 20000 + "\n"
    with pytest.raises(InputError, match="nests tables or arrays too deeply|malformed TOML"):
        Scenario.from_file(_file(tmp_path, deep, "deep.toml"))


@pytest.mark.parametrize("reader", [Scenario.from_file, read_sweep_file])
def test_devices_are_not_read(reader):
    start = time.perf_counter()
    with pytest.raises(InputError, match="not a regular file"):
        reader("/dev/zero")  # used to read without end and exhaust memory
    assert time.perf_counter() - start < 5.0


def test_seeds_are_bounded_before_allocation():
    with pytest.raises(InputError, match="got 1000000000"):
        ramp_test(demo_scenario(), seeds=range(10**9))  # used to build a list of 1e9 ints
    with pytest.raises(InputError, match="more than 1000"):
        ramp_test(demo_scenario(), seeds=iter(range(10**9)))
    with pytest.raises(InputError, match="iterable of whole numbers"):
        ramp_test(demo_scenario(), seeds="12")


@pytest.mark.parametrize("argv, words", [
    (["inception", "{demo}", "--ramp", "--seeds", "1000000000"], "from 1 to 1000"),
    (["pattern", "{demo}", "--phase-bins", "30000", "--charge-bins", "30000"], "from 1 to 3600"),
    (["margin", "{demo}", "--test-voltage", "18kV", "--nominal-voltage", "0V"], "greater than 0"),
    (["sweep", "{sweep}", "--out", "{tmp}/s.nc", "--scheduler", "nonsense"], "must look like"),
])
def test_cli_refuses_with_one_line(argv, words, tmp_path, capsys):
    argv = [a.format(demo=demo_scenario_path(), sweep=demo_sweep_path(), tmp=tmp_path) for a in argv]
    try:
        code = cli.main(argv)
    except SystemExit as exc:  # argparse's own refusal
        code = exc.code
    assert code == 2
    err = capsys.readouterr().err
    assert words in err and "Traceback" not in err


def test_unreachable_scheduler_fails_fast(tmp_path, capsys):
    pytest.importorskip("distributed")
    start = time.perf_counter()
    code = cli.main(["sweep", str(demo_sweep_path()), "--out", str(tmp_path / "s.nc"), "--scheduler",
                     "tcp://127.0.0.1:9"])  # port 9 (discard): nothing listens
    assert code == 2 and "cannot connect to the Dask scheduler" in capsys.readouterr().err
    assert time.perf_counter() - start < 30.0  # a 5 s connect timeout; it used to wait 60 s, then a traceback


def test_internal_errors_are_reported_without_a_traceback(monkeypatch, capsys):
    import pdvoid.faces.cli.simulate as sim

    def broken(ns):
        raise ZeroDivisionError("float division by zero")

    monkeypatch.setattr(sim, "_cmd_demo", broken)
    parser_code = cli.main(["demo", "--cycles", "5"])
    err = capsys.readouterr().err
    # the parser bound the function before the patch, so the demo may simply run; the patched path is tested below
    if parser_code == 1:
        assert "internal error: ZeroDivisionError" in err and "please file it" in err
    from pdvoid.faces.cli import command

    monkeypatch.setattr(command, "build_parser", lambda: _parser_calling(broken))
    assert command.main(["x"]) == 1
    err = capsys.readouterr().err
    assert "internal error: ZeroDivisionError" in err and "please file it" in err and "Traceback" not in err


def _parser_calling(func):
    import argparse

    p = argparse.ArgumentParser()
    p.add_argument("x")
    p.set_defaults(func=func)
    return p


# ---------------------------------------------------------------------------------------------- fuzz
_VALUES = st.one_of(st.integers(-10**30, 10**30), st.floats(allow_nan=True), st.text(max_size=12), st.booleans(),
                    st.lists(st.integers(), max_size=3),
                    st.dictionaries(st.text(max_size=5), st.integers(), max_size=2))
_KEYS = {"insulation": ["thickness", "permittivity", "material", "area", "dielectric_strength", "x"],
         "void": ["diameter", "height", "pressure", "gas", "temperature", "shape", "position", "sealed", "kind"],
         "supply": ["kind", "rms", "frequency", "harmonics", "samples"],
         "model": ["kind", "residual_ratio", "ionization_rate", "surface_rate_same", "field_assisted"]}


@st.composite
def _scenario_dicts(draw):
    base = {"insulation": {"thickness": "6 mm", "permittivity": 4.2},
            "void": {"diameter": "1 mm", "height": "1 mm", "pressure": "1 atm", "gas": "air"},
            "supply": {"rms": "10 kV", "frequency": "50 Hz"}, "model": {"kind": "field"}}
    for _ in range(draw(st.integers(1, 4))):
        part = draw(st.sampled_from(sorted(_KEYS)))
        key = draw(st.sampled_from(_KEYS[part]))
        if draw(st.booleans()):
            base[part][key] = draw(_VALUES)
        else:
            base[part].pop(key, None)
    return base


@settings(max_examples=150, derandomize=True, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(_scenario_dicts())
def test_fuzz_scenario_dicts_give_a_scenario_or_input_error(data):
    try:
        Scenario(**parts_from_dict(data, source="fuzz"))
    except InputError:
        pass


@settings(max_examples=60, derandomize=True, deadline=None,
          suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(extra=st.lists(st.sampled_from(["--cycles", "--seed", "--json", "-1", "0", "1e3", "18", "18kV", "nan", "x",
                                 "--test-voltage", "--values", "--parameter", "void.size", "--phase-bins", ""]),
                max_size=6),
       command=st.sampled_from(["inception", "margin", "pattern"]))
def test_fuzz_cli_arguments_never_trace_back(extra, command, capsys):
    argv = [command, str(demo_scenario_path()), *extra]
    try:
        code = cli.main(argv)
    except SystemExit as exc:
        code = exc.code
    err = capsys.readouterr().err
    assert code in (0, 2), err
    assert "Traceback" not in err and "internal error" not in err


def test_histogram_bins_without_histogram_mode_are_refused(demo):
    import numpy as np

    from pdvoid import simulate

    with pytest.raises(InputError, match="give histogram=True"):  # used to be silently ignored
        simulate(demo, cycles=2, charge_edges=np.array([-1e-9, 0.0, 1e-9]))
    with pytest.raises(InputError, match="give histogram=True"):
        simulate(demo, cycles=2, phase_bins=36)


def test_margin_rows_not_computed_say_why(capsys):
    # voids of 5 to 7 mm do not fit into the demo's 6 mm wall: those rows used to print "nan | nan | nan"
    code = cli.main(["margin", str(demo_scenario_path()), "--test-voltage", "18kV", "--values", "1mm,5mm,7mm"])
    assert code == 0
    out = capsys.readouterr().out
    assert "not computed: void.height must be smaller than insulation.thickness" in out
    assert "nan" not in out.split("largest discharge-free")[0]


# ------------------------------------------------------------------ found by the API audit and the fuzz suite
@pytest.mark.parametrize("call", [
    lambda: pdvoid.Insulation(thickness=10**400, permittivity=4.2),  # OverflowError before
    lambda: pdvoid.Void(diameter=1e-3, height=1e-3, pressure=10**400),
    lambda: pdvoid.FieldModel(surface_decay_time=10**400),  # allow_inf path: OverflowError before
    lambda: pdvoid.weibull_fit(10**400),  # check_array: OverflowError before
    lambda: pdvoid.weibull_fit(np.array([1e-12 + 1j, 2e-12])),  # complex: imaginary part silently dropped before
    lambda: pdvoid.weibull_fit([True, False, True]),  # booleans taken as 1 and 0 before
    lambda: pdvoid.compute_coefficients("demo.toml"),  # AttributeError before
    lambda: pdvoid.largest_pd_free_void(None, 18e3),  # AttributeError before
    lambda: pdvoid.design_margin("x", 8e3),  # AttributeError before
    lambda: pdvoid.margin_table(demo_scenario(), parameter=["void.size"]),  # TypeError (unhashable) before
    lambda: pdvoid.load(3),  # TypeError before
])
def test_public_functions_refuse_with_input_error(call):
    with pytest.raises(InputError):
        call()


@pytest.mark.parametrize("kwargs, words", [
    ({"seed": True}, "seed"),  # True was taken as seed 1
    ({"seed": -1}, "seed"),  # scipy's ValueError before
    ({"seed": "5"}, "seed"),
    ({"workers": True}, "workers"),  # True was taken as 1 worker
    ({"workers": 0}, "workers"),
    ({"polish": "no"}, "polish"),
    ({"detector": {"nosie": 1e-12}}, "detector must be None or a dict with keys"),
    ({"detector": {"phase_resolution_deg": 7.0}}, "phase_resolution_deg must divide 360"),
    ({"detector": "strong"}, "detector"),
])
def test_fit_checks_its_arguments_before_any_simulation(kwargs, words):
    sc = demo_scenario()
    measured = pdvoid.read_events(demo_measured_path())
    start = time.perf_counter()
    with pytest.raises(InputError, match=words):
        pdvoid.fit(measured, sc, {"void.height": (5e-4, 2e-3)}, cycles=10, popsize=4, maxiter=1, **kwargs)
    assert time.perf_counter() - start < 5.0  # refused before the first simulation batch


def test_scenario_file_with_an_integer_of_5000_digits(tmp_path, capsys):
    # Python refuses to convert it (int_max_str_digits); it used to end in "internal error: ValueError"
    p = _file(tmp_path, DEMO.replace('thickness = "6 mm"', "thickness = " + "9" * 5000))
    with pytest.raises(InputError, match="malformed TOML"):
        Scenario.from_file(p)
    assert cli.main(["inception", str(p)]) == 2
    assert "internal error" not in capsys.readouterr().err


@pytest.mark.parametrize("argv, words", [
    (["demo", "--seed", "-1"], "from 0 to 4294967295"),
    (["demo", "--cycles", str(10**12)], "from 1 to 1000000000"),
    (["simulate", "{demo}", "--seed", "x", "--out", "{tmp}/o"], "not a whole number"),
    (["fit", "{measured}", "--scenario", "{demo}", "--vary", "void.height=0.5mm:2mm", "--seed", "-1"],
     "from 0 to 4294967295"),
    (["fit", "{measured}", "--scenario", "{demo}", "--vary", "void.height=0.5mm:2mm", "--workers", "0"],
     "from 1 to 1024"),
    (["fit", "{measured}", "--scenario", "{demo}", "--vary", "void.height=0.5mm:2mm", "--popsize", "2"],
     "from 4 to 200"),
    (["fit", "{measured}", "--scenario", "{demo}", "--vary", "void.height=0.5mm:2mm", "--phase-resolution",
      "400deg"], "at most 360 deg"),
    (["fit", "{measured}", "--scenario", "{demo}", "--vary", "void.height=0.5mm:2mm", "--relative-noise", "5"],
     "from 0 to 1"),
])
def test_options_are_refused_at_parse_time(argv, words, tmp_path, capsys):
    argv = [a.format(demo=demo_scenario_path(), measured=demo_measured_path(), tmp=tmp_path) for a in argv]
    with pytest.raises(SystemExit) as exc:
        cli.main(argv)
    assert exc.value.code == 2
    err = capsys.readouterr().err
    assert words in err and "error: argument" in err


def test_fit_phase_resolution_1deg_runs(capsys):
    code = cli.main(["fit", str(demo_measured_path()), "--scenario", str(demo_scenario_path()), "--vary",
                     "void.height=0.5mm:2mm", "--phase-resolution", "1deg", "--cycles", "10", "--popsize", "4",
                     "--maxiter", "1", "--json"])
    assert code == 0
    assert "best" in capsys.readouterr().out


def test_pattern_bins_are_checked_against_the_memory_budget(monkeypatch):
    from pdvoid.simulation.events import Events

    ev = Events(phase_deg=[10.0, 200.0], charge=[1e-12, -1e-12], frequency=50.0, cycles=1.0)
    with pytest.raises(InputError, match=r"30000 phase x 30000 charge bins would take 3.6e\+04 GB|would take 36 GB"):
        pdvoid.pattern(ev, phase_bins=30000, charge_bins=30000)  # used 21 GB
    monkeypatch.setenv("PDVOID_MEMORY_LIMIT", "1MB")
    with pytest.raises(InputError, match="PDVOID_MEMORY_LIMIT"):
        pdvoid.pattern(ev, phase_bins=3600, charge_bins=1000)
    with pytest.raises(InputError, match="a histogram of 3600 phase x 10000 charge bins would take"):
        pdvoid.simulate(demo_scenario(), cycles=1, histogram=True, phase_bins=3600,
                        charge_edges=np.linspace(-1e-9, 1e-9, 10001))


def test_sweep_file_with_an_integer_too_long_to_convert_is_refused(tmp_path):
    # Python refuses to convert integers of more than sys.int_info.str_digits_check_threshold digits (4300 by
    # default, CPython 3.11 docs "Integer string conversion length limitation"); the reader names the file.
    p = tmp_path / "sweep.toml"
    p.write_text("[sweep]\nseed = " + "9" * 5000 + "\n", encoding="utf-8")
    with pytest.raises(InputError, match="sweep.toml"):
        read_sweep_file(p)
