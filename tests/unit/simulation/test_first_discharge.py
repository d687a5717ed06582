"""Result.first_discharge_time: recorded by the kernel (also in histogram-only runs) and kept in result files."""

from __future__ import annotations

import json
import math
import os
import subprocess
import sys
import zipfile

import numpy as np

import pdvoid

_JIT_SCRIPT = """
import sys, numpy as np, pdvoid
from pdvoid.inputs.demo import demo_scenario
sc = demo_scenario()
r = pdvoid.simulate(sc, cycles=40, seed=5)
h = pdvoid.simulate(sc, cycles=40, seed=5, histogram=True)
np.save(sys.argv[1], np.array([r.first_discharge_time, r.time[0], h.first_discharge_time, r.event_count]))
"""


def test_first_discharge_time_is_the_first_event_compiled_and_without_jit(tmp_path):
    # the kernel's own record must equal the first stored event, compiled and as plain Python (NUMBA_DISABLE_JIT=1)
    out = {}
    for jit in ("0", "1"):
        env = dict(os.environ, NUMBA_DISABLE_JIT=jit)
        path = tmp_path / f"jit{jit}.npy"
        subprocess.run([sys.executable, "-c", _JIT_SCRIPT, str(path)], env=env, check=True, timeout=300)
        out[jit] = np.load(path)
    for jit in ("0", "1"):
        first, t0, hist_first, count = out[jit]
        assert count > 0
        assert first == t0  # exactly the first event's time
        assert hist_first == t0  # the histogram-only run records the same time without storing events
    np.testing.assert_array_equal(out["0"], out["1"])


def test_no_discharge_gives_nan(scenario_factory):
    # 2 kV rms across 6 mm is far below the inception field of a 1.5 mm air void (hand calculation: ~0.5 kV/mm
    # mean field against roughly 3 kV/mm needed)
    sc = scenario_factory(rms=2e3)
    res = pdvoid.simulate(sc, cycles=20, seed=0)
    assert res.event_count == 0 and math.isnan(res.first_discharge_time)
    hist = pdvoid.simulate(sc, cycles=20, seed=0, histogram=True)
    assert math.isnan(hist.first_discharge_time)


def _drop_first_time(path):
    # rewrite a result file as an older pdvoid wrote it: the same arrays, metadata without first_discharge_time
    with np.load(path, allow_pickle=False) as z:
        data = {k: z[k] for k in z.files}
    meta = json.loads(data["metadata"].tobytes().decode("utf-8"))
    del meta["first_discharge_time"]
    data["metadata"] = np.frombuffer(json.dumps(meta).encode("utf-8"), dtype=np.uint8)
    with open(path, "wb") as fh:
        np.savez_compressed(fh, **data)


def test_result_files_keep_the_first_discharge_time(tmp_path, demo, scenario_factory):
    res = pdvoid.simulate(demo, cycles=50, seed=1)
    back = pdvoid.load(res.save(tmp_path / "r.npz"))
    assert back.first_discharge_time == res.first_discharge_time == res.time[0]
    hist = pdvoid.simulate(demo, cycles=50, seed=1, histogram=True)
    back = pdvoid.load(hist.save(tmp_path / "h.npz"))
    assert back.first_discharge_time == res.time[0]
    none = pdvoid.simulate(scenario_factory(rms=2e3), cycles=5, seed=0)
    assert math.isnan(pdvoid.load(none.save(tmp_path / "n.npz")).first_discharge_time)
    # files of an older version: derived from the stored events, else unknown
    _drop_first_time(tmp_path / "r.npz")
    assert zipfile.is_zipfile(tmp_path / "r.npz")
    assert pdvoid.load(tmp_path / "r.npz").first_discharge_time == res.time[0]
    _drop_first_time(tmp_path / "h.npz")
    assert math.isnan(pdvoid.load(tmp_path / "h.npz").first_discharge_time)
