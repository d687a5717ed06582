"""Package-level promises: light import, layering, references, the numba cache fall-back."""

from __future__ import annotations

import ast
import subprocess
import sys
from pathlib import Path

import pdvoid

PKG = Path(pdvoid.__file__).parent


def test_import_loads_neither_matplotlib_nor_ipywidgets():
    code = "import sys, pdvoid; print('matplotlib' in sys.modules, 'ipywidgets' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True, timeout=120)
    assert out.stdout.split() == ["False", "False"]


# layer rank: a module may import only modules of lower or equal rank (DESIGN.md's arrows)
RANK = {
    "errors": 0, "units": 0, "references": 0, "optional": 0, "arrays": 0,
    "physics": 1, "parameters": 1, "materials": 1, "waveform": 1, "events": 1, "parameter_sets": 1,
    "coefficients": 2, "scenario": 2, "scenario_files": 2, "kernels": 2,
    "models": 3,
    "simulate": 4, "results": 4,
    "analysis": 5, "io": 5, "fields": 5, "sweeps": 5, "data": 1,
    "plots": 6,
    "report": 7, "workbench": 7, "cli": 7, "cli_analysis": 7, "cli_report": 7, "cli_sweep": 7, "cli_fit": 7,
}


def _top(module_path: Path) -> str:
    rel = module_path.relative_to(PKG).with_suffix("")
    return rel.parts[0]


def _imports(path: Path):
    tree = ast.parse(path.read_text(encoding="utf-8"))
    pkg_parts = path.relative_to(PKG).parent.parts
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom):
            if node.level:
                base = list(pkg_parts[: len(pkg_parts) - node.level + 1])
                mod = (node.module or "").split(".") if node.module else []
                target = base + mod
                if not target:
                    for alias in node.names:
                        yield alias.name, node.lineno
                else:
                    yield target[0], node.lineno
            elif node.module and node.module.startswith("pdvoid"):
                parts = node.module.split(".")
                yield (parts[1] if len(parts) > 1 else node.names[0].name), node.lineno
        elif isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name.startswith("pdvoid."):
                    yield alias.name.split(".")[1], node.lineno


def test_layering_contract():
    bad = []
    for path in PKG.rglob("*.py"):
        top = _top(path)
        if top == "__init__" or top == "__main__":
            continue
        rank = RANK.get(top)
        assert rank is not None, f"{path}: module {top!r} has no layer in the contract"
        for target, line in _imports(path):
            if target in RANK and RANK[target] > rank:
                bad.append(f"{path.relative_to(PKG)}:{line} imports {target} (layer {RANK[target]} > {rank})")
    assert not bad, "\n".join(bad)


def test_heavy_libraries_only_where_allowed():
    allowed = {"numba": {"physics", "kernels"}, "matplotlib": {"plots", "report", "workbench"},
               "ipywidgets": {"workbench"}}
    bad = []
    for path in PKG.rglob("*.py"):
        tree = ast.parse(path.read_text(encoding="utf-8"))
        for node in ast.walk(tree):
            names = []
            if isinstance(node, ast.Import):
                names = [a.name.split(".")[0] for a in node.names]
            elif isinstance(node, ast.ImportFrom) and node.module and not node.level:
                names = [node.module.split(".")[0]]
            for n in names:
                if n in allowed and _top(path) not in allowed[n]:
                    bad.append(f"{path.relative_to(PKG)} imports {n}")
    assert not bad, "\n".join(bad)


def test_every_reference_key_used_in_docstrings_exists():
    from pdvoid.references import REFERENCES

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
