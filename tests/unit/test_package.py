"""Package-level promises: light import, layering, references, the numba cache fall-back."""

from __future__ import annotations

import ast
import re
import subprocess
import sys
import tokenize
import tomllib
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
    assert entries == stages | {"__init__.py", "__main__.py", "_version.py", "py.typed"}  # __main__: python -m pdvoid


# How pdvoid's text cites a bibliography key of pdvoid.core.references: the author (or source) in lower case
# followed by the year and an optional suffix ("morrow1997", "illias2011jpd", "iec60270"), or a DLMF section
# ("dlmf19.33"); in References sections, in parentheses ("(gulski1992, from memory)"), in brackets or in
# double backquotes. Keys without a year ("lux_paschen") cannot be told from other words in free text; they
# are checked where code or a parameter file lists keys (the tests below).
KEY_CITATION = re.compile(r"(?<![\w#.\\/@-])([a-z][a-z_]*\d{4,}[a-z]*|dlmf\d+(?:\.\d+)+)(?!\w)")
STATUSES = {"confirmed", "derived", "from memory", "common practice"}


def _sources() -> list[Path]:
    files = sorted(PKG.rglob("*.py"))
    assert len(files) > 50  # the whole package, every stage
    return files


def _where(found: dict[str, list[str]], known) -> dict[str, list[str]]:
    return {key: places for key, places in found.items() if key not in known}


def _docstring_citations() -> dict[str, list[str]]:
    """Key-like citations in every docstring of the package, read with ast from the source files: every string
    statement, i.e. the docstrings of modules, classes, functions and methods (nested ones too) and attribute
    docstrings."""
    found: dict[str, list[str]] = {}
    docstrings = 0
    for path in _sources():
        tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
        for node in ast.walk(tree):
            if not (isinstance(node, ast.Expr) and isinstance(node.value, ast.Constant)):
                continue
            if not isinstance(node.value.value, str):
                continue
            docstrings += 1
            for m in KEY_CITATION.finditer(node.value.value):
                found.setdefault(m.group(1), []).append(f"{path.relative_to(PKG.parent)}:{node.lineno}")
    assert docstrings > 300  # the package documents its functions and classes: not an empty pass
    return found


def test_reference_statuses_and_cite():
    from pdvoid.core.references import REFERENCES

    assert len(REFERENCES) > 20
    for key, ref in REFERENCES.items():
        assert ref.key == key and ref.citation.strip(), key
        assert ref.status in STATUSES, (key, ref.status)
    text = pdvoid.cite(["dlmf19.33", "morrow1997"])
    assert "Morrow" in text and "19.33" in text


def test_every_reference_key_cited_in_docstrings_exists():
    from pdvoid.core.references import REFERENCES

    found = _docstring_citations()
    missing = _where(found, REFERENCES)
    assert not missing, f"docstrings cite keys that pdvoid.core.references does not define: {missing}"
    # the scan reads the docstrings: the physics modules cite these (not an empty pass)
    assert {"morrow1997", "dlmf19.33", "niemeyer1995", "iec60270"} <= set(found)
    assert len(found) >= 20


def test_every_reference_key_in_comments_strings_and_parameter_files_exists():
    # the same citations in every string literal (messages, notes) and comment of the package, read with
    # tokenize, and in the packaged TOML files; their "references" arrays must list known keys only
    from pdvoid.core.references import REFERENCES

    text_tokens = {tokenize.STRING, tokenize.COMMENT, getattr(tokenize, "FSTRING_MIDDLE", tokenize.STRING)}
    found: dict[str, list[str]] = {}
    for path in _sources():
        with path.open("rb") as fh:
            for tok in tokenize.tokenize(fh.readline):
                if tok.type in text_tokens:
                    for m in KEY_CITATION.finditer(tok.string):
                        found.setdefault(m.group(1), []).append(f"{path.relative_to(PKG.parent)}:{tok.start[0]}")
    listed: dict[str, list[str]] = {}
    tomls = sorted(PKG.rglob("*.toml"))
    assert tomls
    for path in tomls:
        text = path.read_text(encoding="utf-8")
        for m in KEY_CITATION.finditer(text):
            found.setdefault(m.group(1), []).append(str(path.relative_to(PKG.parent)))

        def walk(node, where):
            if isinstance(node, dict):
                for k, v in node.items():
                    if k == "references":
                        assert isinstance(v, list), where
                        for key in v:
                            listed.setdefault(key, []).append(f"{where}.{k}")
                    walk(v, f"{where}.{k}")

        walk(tomllib.loads(text), str(path.relative_to(PKG.parent)))
    missing = _where(found, REFERENCES)
    assert not missing, f"strings, comments or TOML files cite keys that are not defined: {missing}"
    missing = _where(listed, REFERENCES)
    assert not missing, f"TOML references arrays list keys that are not defined: {missing}"
    assert {"lux_paschen", "nitrogen_breakdown_tf", "morrow1997"} <= set(listed)  # gases.toml lists keys


def _reference_name(node: ast.AST) -> bool:
    name = node.id if isinstance(node, ast.Name) else node.attr if isinstance(node, ast.Attribute) else ""
    return re.fullmatch(r"_?(refs|references|reference_keys)", name, flags=re.IGNORECASE) is not None


def _listed_strings(node: ast.AST):
    """String constants an expression puts into a list of keys: literals, tuples/lists/sets, ``a + b``,
    ``x if c else y`` and the positional arguments of calls such as ``tuple(...)``, not subscripts."""
    if isinstance(node, ast.Constant) and isinstance(node.value, str):
        yield node
    elif isinstance(node, (ast.Tuple, ast.List, ast.Set)):
        for e in node.elts:
            yield from _listed_strings(e)
    elif isinstance(node, ast.BinOp):
        yield from _listed_strings(node.left)
        yield from _listed_strings(node.right)
    elif isinstance(node, ast.IfExp):
        yield from _listed_strings(node.body)
        yield from _listed_strings(node.orelse)
    elif isinstance(node, ast.Starred):
        yield from _listed_strings(node.value)
    elif isinstance(node, ast.Call):
        for a in node.args:
            yield from _listed_strings(a)


def test_every_reference_key_in_code_reference_tuples_exists():
    # keys the code records at run time: ``references=...`` arguments, assignments to ``refs`` /
    # ``references`` / ``REFERENCES`` and ``refs.append(...)``-style calls (pdvoid/core/references.py, which
    # defines the keys, is left out)
    from pdvoid.core.references import REFERENCES

    found: dict[str, list[str]] = {}
    for path in _sources():
        if path == PKG / "core" / "references.py":
            continue
        tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
        for node in ast.walk(tree):
            exprs: list[ast.AST] = []
            if isinstance(node, ast.keyword) and node.arg == "references":
                exprs.append(node.value)
            elif isinstance(node, (ast.Assign, ast.AnnAssign, ast.AugAssign)) and node.value is not None:
                targets = node.targets if isinstance(node, ast.Assign) else [node.target]
                if any(_reference_name(t) for t in targets):
                    exprs.append(node.value)
            elif (
                isinstance(node, ast.Call)
                and isinstance(node.func, ast.Attribute)
                and node.func.attr in ("append", "extend", "add", "insert")
                and _reference_name(node.func.value)
            ):
                exprs.extend(node.args)
            for e in exprs:
                for c in _listed_strings(e):
                    found.setdefault(c.value, []).append(f"{path.relative_to(PKG.parent)}:{c.lineno}")
    missing = _where(found, REFERENCES)
    assert not missing, f"code records reference keys that are not defined: {missing}"
    # keyword tuples, conditional appends and module constants are all seen (not an empty pass)
    assert {"illias2011jpd", "pedersen1970", "mcallister2002", "gemant1932", "hess1951"} <= set(found)


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
