"""Package-level promises: light import, layering, references, the numba cache fall-back."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pdvoid

PKG = Path(pdvoid.__file__).parent


def test_import_loads_neither_matplotlib_nor_ipywidgets():
    code = "import sys, pdvoid; print('matplotlib' in sys.modules, 'ipywidgets' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True, timeout=120)
    assert out.stdout.split() == ["False", "False"]


def test_import_contracts_hold():
    # the stage layering, the faces' order, no cycles between siblings and the heavy-library rules live in
    # pyproject.toml [tool.importlinter]; lint-imports exits 0 only when every contract is kept
    exe = Path(sys.executable).with_name("lint-imports")
    out = subprocess.run([str(exe)], capture_output=True, text=True, timeout=300, cwd=PKG.parent)
    assert out.returncode == 0, out.stdout[-4000:] + out.stderr[-2000:]
    assert "0 broken" in out.stdout


def test_package_root_holds_only_stage_packages():
    stages = {"core", "inputs", "physics", "coefficients", "kernels", "models", "simulation", "analysis", "io",
              "sweeps", "faces"}
    entries = {p.name for p in PKG.iterdir() if p.name != "__pycache__"}
    assert entries == stages | {"__init__.py", "_version.py", "py.typed"}


def test_every_reference_key_used_in_docstrings_exists():
    from pdvoid.core.references import REFERENCES

    assert all(r.status in {"confirmed", "derived", "from memory", "common practice"} for r in REFERENCES.values())
    text = pdvoid.cite(["dlmf19.33", "morrow1997"])
    assert "Morrow" in text and "19.33" in text


def test_numba_cache_fallback_when_no_location_is_writable(tmp_path):
    # a read-only installation: numba's cache=True makes decoration fail with "cannot cache function";
    # pdvoid's njit_cached must fall back and still run
    code = (
        "import numba.core.caching as c\n"
        "def refuse(self, py_func):\n"
        "    raise RuntimeError('cannot cache function %r: no locator available for file %r' % ('f', 'x'))\n"
        "c.CacheImpl.__init__ = refuse\n"
        "from pdvoid.kernels.jit import njit_cached\n"
        "def f(x):\n"
        "    return x + 1\n"
        "print(njit_cached(f)(1))\n"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=120)
    assert out.returncode == 0, out.stderr
    assert out.stdout.strip() == "2"
