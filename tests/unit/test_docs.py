"""The documentation sources cover the public API, and the project files agree with the package (no Sphinx build:
these checks read the files)."""

from __future__ import annotations

import re
from pathlib import Path

import pytest

import pdvoid

ROOT = Path(__file__).resolve().parents[2]
API = ROOT / "docs" / "api"


def _documented_names() -> set[str]:
    """Names listed in the API reference sources: autosummary entries and object directives, last component."""
    names: set[str] = set()
    for path in sorted(API.rglob("*.rst")) + sorted(API.rglob("*.md")):
        if "generated" in path.parts:
            continue  # autosummary's output, not a source
        text = path.read_text(encoding="utf-8")
        for block in re.finditer(r"^\.\. autosummary::\n((?:[ \t]+.*\n|\n)*)", text, flags=re.M):
            for line in block.group(1).splitlines():
                entry = line.strip()
                if entry and not entry.startswith(":"):
                    names.add(entry.lstrip("~").rsplit(".", 1)[-1])
        for m in re.finditer(r"^\.\. (?:py:)?(?:data|function|class|attribute|auto\w+)::\s+([\w.~]+)", text, re.M):
            names.add(m.group(1).lstrip("~").rsplit(".", 1)[-1])
    return names


def test_every_name_in_pdvoid_all_is_in_the_api_reference():
    missing = sorted(set(pdvoid.__all__) - _documented_names())
    assert not missing, f"add these names of pdvoid.__all__ to docs/api/*.rst: {missing}"


@pytest.mark.parametrize("module", ["pdvoid.models", "pdvoid.io", "pdvoid.sweeps", "pdvoid.analysis",
                                    "pdvoid.coefficients", "pdvoid.coefficients.fields", "pdvoid.faces.plots",
                                    "pdvoid.inputs.materials"])
def test_the_public_names_of_each_subpackage_are_in_the_api_reference(module):
    import importlib

    names = set(importlib.import_module(module).__all__)
    missing = sorted(names - _documented_names())
    assert not missing, f"{module}: add to docs/api/*.rst: {missing}"


def test_every_physics_module_has_a_page():
    listed = (API / "physics.rst").read_text(encoding="utf-8")
    modules = sorted(p.stem for p in (ROOT / "pdvoid" / "physics").glob("*.py") if p.stem != "__init__")
    assert modules, "no physics modules found"
    assert [m for m in modules if f"pdvoid.physics.{m}\n" not in listed] == []


def test_citation_file_carries_the_package_version_and_license():
    text = (ROOT / "CITATION.cff").read_text(encoding="utf-8")
    assert re.search(r"^cff-version: 1\.2\.0$", text, re.M)
    assert re.search(rf"^version: {re.escape(pdvoid.__version__)}$", text, re.M)
    assert re.search(r"^license: BSD-3-Clause$", text, re.M)
    assert "BSD 3-Clause" in (ROOT / "LICENSE").read_text(encoding="utf-8")


def test_the_committed_notebooks_are_the_gallery():
    gallery = (ROOT / "docs" / "gallery.rst").read_text(encoding="utf-8")
    for nb in sorted((ROOT / "notebooks").glob("*.ipynb")):
        assert f"gallery/{nb.stem}\n" in gallery, f"{nb.name} is missing from docs/gallery.rst"


def test_every_page_that_shows_results_carries_the_safety_note():
    docs = ROOT / "docs"
    pages = [docs / "index.rst", docs / "getting_started.rst", docs / "gallery.rst", docs / "api" / "index.rst",
             *sorted((docs / "guide").glob("*.rst"))]
    assert [p.name for p in pages if ".. include:: /snippets/safety.txt" not in p.read_text(encoding="utf-8")] == []
    note = (docs / "snippets" / "safety.txt").read_text(encoding="utf-8")
    assert "High voltage can kill" in note and "applicable" in note and "licensed practice prevail" in note
