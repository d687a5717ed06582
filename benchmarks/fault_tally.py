"""Tally of bad inputs by outcome: a fixed catalogue, run against this checkout (or any older one).

Run from the repository folder::

    python benchmarks/fault_tally.py            # the counts per category
    python benchmarks/fault_tally.py --list     # also every case that is not handled
    PYTHONPATH=/tmp/old python benchmarks/fault_tally.py   # an older checkout, e.g. `git archive f615fd3`

The catalogue uses only the public API and the command line, so it runs unchanged against older versions. Each
case ends in one of these outcomes:

- ``handled``: refused with :class:`pdvoid.InputError` (or, on the command line, ``pdvoid ...: error:`` and exit
  2), or a correct result where the input is valid;
- ``non-InputError``: another exception escaped (TypeError, ValueError, OverflowError, ...) or the command line
  ended in an internal error or a traceback;
- ``silently accepted``: a string or boolean was taken as a number, or an inconsistent file was read as if it
  were fine;
- ``memory unguarded``: the request allocated beyond the limit (the case runs in a child process whose address
  space is capped at 3 GiB, with a 60 s time limit) instead of being refused before allocation;
- ``data lost``: something written by pdvoid could not be read back, or a value changed on the way (a count
  that wraps, a complex charge made real).

The categories of the issue's closing note are these outcomes; "memory exhaustion guarded" counts the memory
cases that end ``handled``.
"""

from __future__ import annotations

import argparse
import contextlib
import io
import json
import math
import os
import subprocess
import sys
import tempfile
import time
import zipfile
from collections import Counter
from collections.abc import Callable
from pathlib import Path

import numpy as np

if not os.environ.get("PYTHONPATH"):  # this checkout's pdvoid, not an installed one
    sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

import pdvoid  # noqa: E402
from pdvoid import InputError  # noqa: E402

HANDLED, OTHER, SILENT, MEMORY, LOST = "handled", "non-InputError", "silently accepted", "memory unguarded", \
    "data lost"

# values that are never a valid number: text, booleans, containers, complex, objects
_NOT_NUMBERS = {"text '5'": "5", "True": True, "complex": 1 + 1j, "list": [1.0], "dict": {}, "object": object()}
# numbers out of any sensible range
_BAD_NUMBERS = {"nan": math.nan, "inf": math.inf, "-1": -1.0, "huge int": 10**400}


def _scenario(**model):
    return pdvoid.Scenario(insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
                           void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3),
                           supply=pdvoid.Sine(rms=18e3, frequency=50.0),
                           model=pdvoid.FieldModel(lag_free=True, residual_ratio=0.2, **model))


def _events():
    t = np.array([0.001, 0.004, 0.012, 0.031, 0.052, 0.071])
    return pdvoid.Events(phase_deg=(t * 50 % 1) * 360, charge=np.array([1, -2, 3, -1, 2, -3]) * 1e-12,
                         frequency=50.0, cycles=4.0, time=t)


# ------------------------------------------------------------------------------------------- the Python API
def _api_cases(tmp: Path) -> list[tuple[str, Callable[[], object], str]]:
    """(name, call, kind) with kind "number" (text/bool must be refused) or "any" (only the exception type)."""
    sc = _scenario()
    ev = _events()
    res = pdvoid.simulate(sc, cycles=10, seed=1)
    csv = tmp / "events.csv"
    csv.write_text("# frequency = 50 Hz\n# cycles = 4\ntime [s],charge [pC]\n0.001,1\n0.004,-2\n0.012,3\n",
                   encoding="utf-8")
    mat = tmp / "matrix.csv"
    mat.write_text("# frequency = 50 Hz\n# cycles = 10\nphase edges [deg],0,180,360\ncharge edges [pC],-1,0,1\n"
                   "counts\n1,0\n0,1\n", encoding="utf-8")
    calls: dict[str, tuple[Callable[..., object], dict, dict[str, str]]] = {
        "Insulation": (pdvoid.Insulation, {"thickness": 6e-3, "permittivity": 4.2},
                       {"thickness": "number", "permittivity": "number", "area": "number",
                        "dielectric_strength": "number", "material": "any"}),
        "Void": (pdvoid.Void, {"diameter": 1e-3, "height": 1e-3},
                 {k: "number" for k in ("diameter", "height", "pressure", "temperature", "inception_length",
                                        "field_enhancement", "charge_per_field", "fill_temperature",
                                        "secondary_emission")} | {"gas": "any", "shape": "any", "position": "any",
                                                                 "sealed": "any"}),
        "Sine": (pdvoid.Sine, {"rms": 1e4}, {"rms": "number", "frequency": "number", "harmonics": "any"}),
        "Periodic": (pdvoid.Periodic, {"samples": [0.0, 1.0, 0.0, -1.0]},
                     {"samples": "any", "frequency": "number", "max_harmonic": "number"}),
        "FieldModel": (pdvoid.FieldModel, {}, {k: "number" for k in (
            "residual_ratio", "ionization_rate", "electron_yield", "surface_rate_same", "surface_rate_reversed",
            "surface_decay_time", "charge_decay_time", "cathode_emission_rate")} | {
            "lag_free": "any", "field_assisted": "any", "inception_criterion": "any"}),
        "MemoryModel": (pdvoid.MemoryModel, {}, {k: "number" for k in (
            "residual_ratio", "trap_depth", "attempt_frequency", "stability_field", "residual_scatter",
            "recombination")} | {"parameter_set": "any"}),
        "NetworkModel": (pdvoid.NetworkModel, {}, {"residual_ratio": "number", "capacitance_void": "number",
                                                   "capacitance_series": "number"}),
        "Scenario": (pdvoid.Scenario, {"insulation": sc.insulation, "void": sc.void, "supply": sc.supply},
                     {"insulation": "any", "void": "any", "supply": "any", "model": "any", "name": "any"}),
        "compute_coefficients": (pdvoid.compute_coefficients, {"scenario": sc}, {"scenario": "any"}),
        "Events": (pdvoid.Events, {"phase_deg": ev.phase_deg, "charge": ev.charge, "frequency": 50.0,
                                   "cycles": 4.0},
                   {"frequency": "number", "cycles": "number", "phase_deg": "any", "charge": "any", "time": "any",
                    "label": "any", "extra": "any"}),
        "simulate": (pdvoid.simulate, {"scenario": sc, "cycles": 5},
                     {"scenario": "any", "cycles": "number", "seed": "number", "histogram": "any",
                      "chunk_cycles": "number"}),
        "simulate(histogram)": (pdvoid.simulate, {"scenario": sc, "cycles": 5, "histogram": True},
                                {"phase_bins": "number", "charge_edges": "any"}),
        "load": (pdvoid.load, {"path": tmp / "r.npz"}, {"path": "any"}),
        "pattern": (pdvoid.pattern, {"events": ev},
                    {"events": "any", "phase_bins": "number", "charge_bins": "number", "charge_scale": "any",
                     "charge_range": "any", "per_cycle": "any"}),
        "fingerprint": (pdvoid.fingerprint, {"events": ev}, {"events": "any", "phase_windows": "number"}),
        "iec60270": (pdvoid.iec60270, {"events": ev}, {"events": "any", "window": "any", "threshold": "number"}),
        "inception": (pdvoid.inception, {"scenario": sc}, {"scenario": "any", "ramp": "any"}),
        "inception(ramp)": (pdvoid.inception, {"scenario": sc, "ramp": True, "dwell": 0.02, "step": 2e3},
                            {"dwell": "number", "step": "number", "start": "number", "threshold": "number",
                             "repeat_count": "number", "seeds": "any", "max_voltage": "number"}),
        "largest_pd_free_void": (pdvoid.largest_pd_free_void, {"scenario": sc, "test_voltage": 18e3},
                                 {"scenario": "any", "test_voltage": "number"}),
        "margin_table": (pdvoid.margin_table, {"scenario": sc, "values": [1e-3, 2e-3], "test_voltage": 18e3},
                         {"scenario": "any", "parameter": "any", "values": "any", "test_voltage": "number"}),
        "design_margin": (pdvoid.design_margin, {"scenario": sc, "nominal_voltage": 8e3},
                          {"scenario": "any", "nominal_voltage": "number", "test_factor": "number"}),
        "pulse_sequence": (pdvoid.pulse_sequence, {"events": ev}, {"events": "any"}),
        "weibull_fit": (pdvoid.weibull_fit, {"data": ev},
                        {"data": "any", "polarity": "any", "parameters": "number", "confidence": "number",
                         "interval": "any", "n_resamples": "number", "seed": "number"}),
        "run_summary": (pdvoid.run_summary, {"result": res}, {"result": "any"}),
        "compare": (pdvoid.compare, {"simulated": res, "measured": ev},
                    {"simulated": "any", "measured": "any", "threshold": "number", "weights": "any",
                     "phase_bins": "number", "phase_windows": "number"}),
        "fit": (pdvoid.fit, {"measured": ev, "scenario": sc, "vary": {"void.height": (5e-4, 2e-3)}, "cycles": 10,
                             "popsize": 4, "maxiter": 1, "polish": False, "noise_seeds": 2},
                {"measured": "any", "scenario": "any", "vary": "any", "threshold": "number", "cycles": "number",
                 "seed": "number", "detector": "any", "popsize": "number", "maxiter": "number", "polish": "any",
                 "noise_seeds": "number", "acceptance": "number", "tolerance": "number", "workers": "number"}),
        "read_events": (pdvoid.read_events, {"path": csv},
                        {"path": "any", "cycles": "number", "duration": "any", "frequency": "any", "columns": "any",
                         "units": "any", "delimiter": "any", "decimal": "any"}),
        "read_pattern_matrix": (pdvoid.read_pattern_matrix, {"path": mat},
                                {"path": "any", "cycles": "number", "frequency": "any", "delimiter": "any",
                                 "decimal": "any"}),
        "cite": (pdvoid.cite, {"source": sc}, {"source": "any"}),
    }
    res.save(tmp / "r.npz")
    cases = []
    for name, (func, base, params) in calls.items():
        for param, kind in params.items():
            values = dict(_NOT_NUMBERS)
            if kind == "number":
                values |= _BAD_NUMBERS
            for label, value in values.items():
                kwargs = {**base, param: value}
                cases.append((f"{name}({param}={label})",
                              (lambda f=func, kw=kwargs: f(**kw)),
                              "number" if kind == "number" and label in ("text '5'", "True") else "any"))
    return cases


def _run_api(call: Callable[[], object], kind: str) -> str:
    import warnings

    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            call()
    except InputError:
        return HANDLED
    except Exception:
        return OTHER
    return SILENT if kind == "number" else HANDLED


# ------------------------------------------------------------------------------------------ the command line
def _cli_cases(tmp: Path) -> list[tuple[str, list[str]]]:
    from pdvoid.inputs.demo import demo_measured_path, demo_scenario_path, demo_sweep_path

    demo, meas = str(demo_scenario_path()), str(demo_measured_path())
    fit = ["fit", meas, "--scenario", demo, "--vary", "void.height=0.5mm:2mm", "--cycles", "10", "--popsize", "4",
           "--maxiter", "1"]
    bad_scenarios = {
        "missing void.height": demo_scenario_path().read_text().replace("height", "#height", 1),
        "kind in [void]": demo_scenario_path().read_text().replace("[void]\n", '[void]\nkind = "sphere"\n'),
        "long integer": demo_scenario_path().read_text().replace('thickness = "6 mm"', "thickness = " + "9" * 5000),
        "deep nesting": "a = " + "[" * 20000 + "]" * 20000 + "\n",
        "not UTF-8": "\xff\xfe[insulation]\n",
        "empty": "",
    }
    cases = []
    for label, text in bad_scenarios.items():
        p = tmp / f"bad-{len(cases)}.toml"
        p.write_text(text, encoding="utf-8", errors="surrogateescape") if label != "not UTF-8" else \
            p.write_bytes(b"\xff\xfe[insulation]\n")
        cases.append((f"scenario file: {label}", ["inception", str(p)]))
    bom = tmp / "bom.toml"
    bom.write_bytes(b"\xef\xbb\xbf" + demo_scenario_path().read_bytes())
    cases.append(("scenario file: byte-order mark (valid)", ["inception", str(bom), "--json"]))
    cases += [
        ("fit --phase-resolution 1deg (valid)", [*fit, "--phase-resolution", "1deg"]),
        ("fit --phase-resolution 400deg", [*fit, "--phase-resolution", "400deg"]),
        ("fit --seed -1", [*fit, "--seed", "-1"]),
        ("fit --workers 0", [*fit, "--workers", "0"]),
        ("fit --popsize 2", [*fit, "--popsize", "2"]),
        ("fit --cycles 1", [*fit[:-6], "--cycles", "1"]),
        ("margin --nominal-voltage 0V", ["margin", demo, "--test-voltage", "18kV", "--nominal-voltage", "0V"]),
        ("margin --test-voltage 18 (no unit)", ["margin", demo, "--test-voltage", "18"]),
        ("margin --values with nan", ["margin", demo, "--test-voltage", "18kV", "--values", "nan,1mm"]),
        ("demo --seed -1", ["demo", "--seed", "-1"]),
        ("demo --seed 2**32", ["demo", "--seed", str(2**32)]),
        ("demo --cycles 0", ["demo", "--cycles", "0"]),
        ("demo --cycles 10**12", ["demo", "--cycles", str(10**12)]),
        ("simulate --seed x", ["simulate", demo, "--seed", "x", "--out", str(tmp / "o1")]),
        ("report --cycles 10**9", ["report", demo, "--test-voltage", "18kV", "--cycles", str(10**9), "--out",
                                   str(tmp / "r.pdf")]),
        ("pattern of a directory", ["pattern", str(tmp)]),
        ("pattern of /dev/null", ["pattern", "/dev/null"]),
        ("inception of /dev/zero", ["inception", "/dev/zero"]),
        ("sweep of /dev/zero", ["sweep", "/dev/zero", "--out", str(tmp / "s.nc")]),
        ("sweep --scheduler nonsense", ["sweep", str(demo_sweep_path()), "--out", str(tmp / "s.nc"), "--scheduler",
                                        "nonsense"]),
        ("inception --ramp --seeds 0", ["inception", demo, "--ramp", "--seeds", "0"]),
    ]
    return cases


def _run_cli(argv: list[str]) -> str:
    from pdvoid.faces import cli

    err = io.StringIO()
    with contextlib.redirect_stderr(err), contextlib.redirect_stdout(io.StringIO()):
        try:
            code = cli.main(argv)
        except SystemExit as exc:
            code = exc.code
        except Exception:
            return OTHER
    text = err.getvalue()
    if "Traceback" in text or "internal error" in text:
        return OTHER
    return HANDLED if code in (0, 2) else OTHER


# -------------------------------------------------------------------------------------------------- memory
_MEMORY_CASES = {
    "pattern --phase-bins 30000 --charge-bins 30000": "from pdvoid.faces import cli; import sys; "
    "sys.exit(cli.main(['pattern', sys.argv[1], '--phase-bins', "
    "'30000', '--charge-bins', '30000']))",
    "pattern(phase_bins=30000, charge_bins=30000)": "import pdvoid; r = pdvoid.load(__import__('sys').argv[1]); "
    "pdvoid.pattern(r, phase_bins=30000, charge_bins=30000)",
    "inception --ramp --seeds 1000000000": "from pdvoid.faces import cli; from pdvoid.inputs.demo import "
    "demo_scenario_path as d; import sys; sys.exit(cli.main(['inception', str(d()), '--ramp', '--seeds', "
    "'1000000000']))",
    "ramp_test(seeds=range(10**9))": "import pdvoid; from pdvoid.inputs.demo import demo_scenario; "
    "pdvoid.inception(demo_scenario(), ramp=True, seeds=range(10**9))",
    "inception of /dev/zero": "import pdvoid; pdvoid.Scenario.from_file('/dev/zero')",
    "load a 2.3 MB result of 2.4 GB zeros": "import pdvoid, sys; pdvoid.load(sys.argv[2])",
    "simulate(histogram=True, 3600 bins x 10**4 edges)": "import pdvoid, numpy as np; "
    "from pdvoid.inputs.demo import demo_scenario; pdvoid.simulate(demo_scenario(), cycles=1, histogram=True, "
    "phase_bins=3600, charge_edges=np.linspace(-1e-9, 1e-9, 10001))",
}
_CAP = 3 * 1024**3


def _bomb(tmp: Path, result: Path) -> Path:
    """A result file whose histogram counts are 2.4 GB of zeros, deflated to about 2.3 MB."""
    with np.load(result) as z:
        arrays = {k: z[k] for k in z.files}
    meta = json.loads(arrays["metadata"].tobytes())
    meta["histogram"] = {"below": 0, "above": 0}
    arrays["metadata"] = np.frombuffer(json.dumps(meta).encode(), np.uint8)
    arrays["hist_phase_edges_deg"] = np.linspace(0, 360, 73)
    arrays["hist_charge_edges"] = np.linspace(-1e-9, 1e-9, 51)  # the counts below claim far more bins
    out = tmp / "bomb.npz"
    with zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED, compresslevel=9) as zf:
        for k, v in arrays.items():
            with zf.open(k + ".npy", "w", force_zip64=True) as fh:
                np.lib.format.write_array(fh, v)
        with zf.open("hist_counts.npy", "w", force_zip64=True) as fh:
            np.lib.format.write_array_header_1_0(fh, {"descr": "<i8", "fortran_order": False,
                                                      "shape": (72, 4_166_667)})
            block = bytes(1 << 24)
            left = 72 * 4_166_667 * 8
            while left:
                fh.write(block[:min(left, len(block))])
                left -= min(left, len(block))
    return out


_PEAK_LIMIT = 1024**3  # a case whose process peaks above this resident size was not refused before allocating
PEAKS: dict[str, float] = {}


def _run_memory(name: str, code: str, args: list[str]) -> str:
    """Run one memory case in a child capped at 3 GiB of address space; its peak resident size goes to PEAKS."""
    prelude = (f"import resource; resource.setrlimit(resource.RLIMIT_AS, ({_CAP}, {_CAP}))\n"
               "import pdvoid\n"
               "try:\n    exec(compile(CODE, 'case', 'exec'))\n"
               "except pdvoid.InputError:\n    raise SystemExit(2)\n"
               "except MemoryError:\n    raise SystemExit(99)\n")
    with tempfile.TemporaryFile() as err:
        proc = subprocess.Popen([sys.executable, "-c", f"CODE = {code!r}\n" + prelude, *args],
                                stdout=subprocess.DEVNULL, stderr=err)
        deadline = time.monotonic() + 60
        while True:
            pid, status, usage = os.wait4(proc.pid, os.WNOHANG)
            if pid:
                break
            if time.monotonic() > deadline:
                proc.kill()
                pid, status, usage = os.wait4(proc.pid, 0)
                PEAKS[name] = usage.ru_maxrss * 1024.0
                return MEMORY
            time.sleep(0.05)
        proc.returncode = os.waitstatus_to_exitcode(status)
        err.seek(0)
        stderr = err.read().decode(errors="replace")
    PEAKS[name] = usage.ru_maxrss * 1024.0  # kB on Linux
    if proc.returncode == 99 or "MemoryError" in stderr or proc.returncode < 0 or PEAKS[name] > _PEAK_LIMIT:
        return MEMORY
    if proc.returncode == 2 and "Traceback" not in stderr:
        return HANDLED
    return HANDLED if proc.returncode == 0 else OTHER


# ---------------------------------------------------------------------------------------- files pdvoid reads
def _file_cases(tmp: Path, result: Path) -> list[tuple[str, Callable[[], object], str]]:
    """Inconsistent files of pdvoid's own formats ("refuse": must be refused), and round trips ("keep")."""
    with np.load(result) as z:
        arrays = {k: z[k] for k in z.files}
    meta = json.loads(arrays.pop("metadata").tobytes())

    def npz(name, meta_change=None, **changes):
        m = json.loads(json.dumps(meta))
        (meta_change or (lambda _: None))(m)
        p = tmp / f"{name}.npz"
        np.savez_compressed(p, metadata=np.frombuffer(json.dumps(m).encode(), np.uint8), **{**arrays, **changes})
        return lambda: pdvoid.load(p)

    t = arrays["time"]
    cases = [
        ("result: more cycles than requested", npz("c1", lambda m: m.update(cycles=m["requested_cycles"] + 5)),
         "refuse"),
        ("result: events after the last cycle", npz("c2", lambda m: m.update(cycles=1, requested_cycles=1)),
         "refuse"),
        ("result: event count differs from the events", npz("c3", lambda m: m.update(event_count=1)), "refuse"),
        ("result: one array shorter", npz("c4", charge=arrays["charge"][:-1]), "refuse"),
        ("result: complex charges", npz("c5", charge=arrays["charge"].astype(complex)), "refuse"),
        ("result: negative times", npz("c6", time=-t), "refuse"),
        ("result: times decreasing", npz("c7", time=t[::-1].copy()), "refuse"),
        ("result: cycle numbers not matching the times", npz("c8", cycle=arrays["cycle"] + 1), "refuse"),
        ("result: seed negative", npz("c9", lambda m: m.update(seed=-1)), "refuse"),
        ("result: cycles a float", npz("c10", lambda m: m.update(cycles=10.5)), "refuse"),
    ]
    hist = pdvoid.simulate(_scenario(), cycles=10, seed=1, histogram=True).save(tmp / "h.npz")
    with np.load(hist) as z:
        harr = {k: z[k] for k in z.files}
    hmeta = json.loads(harr.pop("metadata").tobytes())

    def hnpz(name, **changes):
        p = tmp / f"{name}.npz"
        np.savez_compressed(p, metadata=np.frombuffer(json.dumps(hmeta).encode(), np.uint8), **{**harr, **changes})
        return lambda: pdvoid.load(p)

    neg = harr["hist_counts"].copy()
    neg[0, 0] = -5
    wrap = np.zeros_like(harr["hist_counts"])
    wrap[0, :2] = 2**62
    cases += [
        ("result: negative histogram counts", hnpz("h1", hist_counts=neg), "refuse"),
        ("result: histogram counts adding past 2**63", hnpz("h2", hist_counts=wrap), "refuse"),
        ("result: histogram shape not matching its edges", hnpz("h3", hist_counts=harr["hist_counts"][:-1]),
         "refuse"),
    ]
    # exchange files
    from pdvoid.io import read_exchange, write_exchange

    ev = _events()
    xp = write_exchange(ev, tmp / "x.txt")
    lines = xp.read_text().splitlines()
    start = lines.index("---") + 2

    def exchange(name, edit):
        p = tmp / f"{name}.txt"
        rows = list(lines)
        edit(rows)
        p.write_text("\n".join(rows) + "\n")
        return lambda: read_exchange(p)

    def negate_time(rows):
        cols = rows[start - 1].split(",")
        i = next(k for k, c in enumerate(cols) if c.startswith("time"))
        f = rows[start].split(",")
        f[i] = "-" + f[i]
        rows[start] = ",".join(f)

    def reverse(rows):
        rows[start:] = rows[start:][::-1]

    def cycles_small(rows):
        rows[:start] = [r.replace('"cycles": 4.0', '"cycles": 1.0') for r in rows[:start]]

    cases += [
        ("exchange: a negative time", exchange("x1", negate_time), "refuse"),
        ("exchange: times decreasing", exchange("x2", reverse), "refuse"),
        ("exchange: events beyond the cycles observed", exchange("x3", cycles_small), "refuse"),
    ]
    # count matrices
    m = tmp / "m.csv"
    m.write_text("# frequency = 50 Hz\n# cycles = 10\nphase edges [deg],0,180,360\ncharge edges [pC],-1,0,1\n"
                 "counts\n9223372036854775808,0\n0,1\n", encoding="utf-8")
    cases.append(("count matrix: a count of 2**63 (wraps in int64)", lambda: pdvoid.read_pattern_matrix(m),
                  "refuse"))
    cases.append(("Events: complex charges", lambda: pdvoid.Events(phase_deg=[1.0], charge=np.array([1e-12 + 1j]),
                                                                  frequency=50, cycles=1), "refuse"))
    # round trips that must keep everything
    from pdvoid.io.matrix import PatternMatrix

    big = PatternMatrix(np.array([[2**53, 0], [0, 1]]), [0, 180, 360], [-1e-12, 0, 1e-12], 10, 50)

    def matrix_round_trip():
        from pdvoid.io import write_pattern_matrix

        back = pdvoid.read_pattern_matrix(write_pattern_matrix(big, tmp / "big.csv"))
        return int(back.counts[0, 0]) == 2**53 and back.total == big.total

    def unsorted_events_round_trip():
        tt = np.array([0.004, 0.001])
        e = pdvoid.Events(phase_deg=(tt * 50 % 1) * 360, charge=[1e-12, 2e-12], frequency=50, cycles=1, time=tt)
        try:
            p = write_exchange(e, tmp / "unsorted.txt")
        except InputError:
            return True  # refused when written: nothing is lost later
        try:
            read_exchange(p)
        except InputError:
            return False  # written, then refused when read: lost
        return True

    def result_round_trip():
        back = pdvoid.load(result)
        return back.event_count == meta["event_count"] and np.array_equal(back.time, t)

    cases += [
        ("round trip: count matrix with 2**53 in a bin", matrix_round_trip, "keep"),
        ("round trip: events written then read (exchange)", unsorted_events_round_trip, "keep"),
        ("round trip: result file", result_round_trip, "keep"),
    ]
    return cases


def _run_file(call: Callable[[], object], kind: str) -> str:
    import warnings

    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            out = call()
    except InputError:
        return HANDLED if kind == "refuse" else LOST
    except Exception:
        return OTHER
    if kind == "keep":
        return HANDLED if out else LOST
    return SILENT


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--list", action="store_true", help="list every case that is not handled")
    ap.add_argument("--no-memory", action="store_true", help="skip the memory cases (child processes)")
    ap.add_argument("--json", action="store_true")
    ns = ap.parse_args(argv)
    tally: dict[str, Counter] = {}
    bad: list[tuple[str, str, str]] = []
    start = time.perf_counter()
    with tempfile.TemporaryDirectory() as d:
        tmp = Path(d)
        result = pdvoid.simulate(_scenario(), cycles=10, seed=1).save(tmp / "res.npz")
        groups: list[tuple[str, list[tuple[str, Callable[[], str]]]]] = [
            ("Python API", [(n, (lambda c=c, k=k: _run_api(c, k))) for n, c, k in _api_cases(tmp)]),
            ("command line", [(n, (lambda a=a: _run_cli(a))) for n, a in _cli_cases(tmp)]),
            ("own file formats", [(n, (lambda c=c, k=k: _run_file(c, k))) for n, c, k in _file_cases(tmp, result)]),
        ]
        if not ns.no_memory:
            bomb = _bomb(tmp, result)
            groups.append(("memory", [(n, (lambda n=n, c=c: _run_memory(n, c, [str(result), str(bomb)])))
                                      for n, c in _MEMORY_CASES.items()]))
        for group, cases in groups:
            tally[group] = Counter()
            for name, run in cases:
                outcome = run()
                tally[group][outcome] += 1
                if outcome != HANDLED:
                    bad.append((group, name, outcome))
    took = time.perf_counter() - start
    cols = [HANDLED, OTHER, SILENT, MEMORY, LOST]
    if ns.json:
        print(json.dumps({"pdvoid": pdvoid.__version__, "tally": {g: dict(c) for g, c in tally.items()},
                          "not handled": bad, "peak memory [bytes]": PEAKS, "seconds": round(took, 1)}, indent=1))
        return 0
    print(f"pdvoid {pdvoid.__version__} from {Path(pdvoid.__file__).parent}; {took:.0f} s")
    print(f"{'group':18s}" + "".join(f"{c:>20s}" for c in cols) + f"{'cases':>8s}")
    for g, c in tally.items():
        print(f"{g:18s}" + "".join(f"{c.get(k, 0):20d}" for k in cols) + f"{sum(c.values()):8d}")
    total = sum(tally.values(), Counter())
    print(f"{'all':18s}" + "".join(f"{total.get(k, 0):20d}" for k in cols) + f"{sum(total.values()):8d}")
    if "memory" in tally:
        print(f"memory exhaustion guarded: {tally['memory'].get(HANDLED, 0)} of {sum(tally['memory'].values())}")
    if ns.list:
        for n, peak in PEAKS.items():
            print(f"  peak resident memory {peak / 1e6:8.0f} MB: {n}")
        for g, n, o in bad:
            print(f"  [{o}] {g}: {n}")
    return 0


if __name__ == "__main__":
    os.environ.setdefault("PYTHONWARNINGS", "ignore")
    sys.exit(main())
