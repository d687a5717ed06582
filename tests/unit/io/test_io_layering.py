"""pdvoid.io sits beside pdvoid.analysis: it may use errors, units, events, results and the scenario files,
never analysis or anything above (DESIGN.md's layers)."""

from __future__ import annotations

import ast
from pathlib import Path

import pdvoid.io

ALLOWED = {"errors", "units", "arrays", "events", "results", "scenario_files", "io", "__version__"}


def test_io_imports_only_lower_layers():
    bad = []
    for path in Path(pdvoid.io.__file__).parent.glob("*.py"):
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            if isinstance(node, ast.ImportFrom) and node.level >= 2:
                target = node.module.split(".")[0] if node.module else None
                names = [target] if target else [a.name for a in node.names]
                bad += [f"{path.name}:{node.lineno} imports {n}" for n in names if n not in ALLOWED]
            elif isinstance(node, ast.ImportFrom) and node.module and node.module.startswith("pdvoid."):
                n = node.module.split(".")[1]
                if n not in ALLOWED:
                    bad.append(f"{path.name}:{node.lineno} imports {n}")
    assert not bad, bad
