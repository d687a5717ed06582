"""Sphinx configuration of the pdvoid documentation.

Build: ``python -m sphinx -W --keep-going -b html docs docs/_build/html`` from the repository root (needs
``pip install ".[docs]"``). The notebooks in ``notebooks/`` are copied into ``docs/gallery/`` (not committed) and
executed during the build; the committed notebooks keep no outputs.
"""

from __future__ import annotations

import sys
from pathlib import Path

DOCS = Path(__file__).resolve().parent
ROOT = DOCS.parent
sys.path.insert(0, str(ROOT))

import pdvoid  # noqa: E402
from pdvoid.core.references import REFERENCES  # noqa: E402

project = "pdvoid"
author = "pdvoid developers"
copyright = "pdvoid developers"  # noqa: A001 - Sphinx's name
release = pdvoid.__version__
version = release

extensions = [
    "sphinx.ext.autodoc",
    "sphinx.ext.autosummary",
    "sphinx.ext.mathjax",
    "sphinx.ext.viewcode",
    "numpydoc",
    "myst_nb",
]

source_suffix = {".rst": "restructuredtext", ".md": "myst-nb", ".ipynb": "myst-nb"}
exclude_patterns = ["_build", "Thumbs.db", ".DS_Store", "**.ipynb_checkpoints", "jupyter_execute"]
templates_path = ["_templates"]
html_theme = "pydata_sphinx_theme"
html_title = f"pdvoid {release}"
html_theme_options = {
    "navigation_with_keys": False,
    "show_toc_level": 2,
    "footer_start": ["copyright"],
    "footer_end": ["sphinx-version"],
}
html_show_sourcelink = False

# API reference: autosummary writes one page per object from the docstrings (numpydoc style).
autosummary_generate = True
autosummary_imported_members = True
autodoc_default_options = {"members": True, "member-order": "bysource"}
autodoc_typehints = "none"  # the numpydoc Parameters sections carry types and units
autodoc_preserve_defaults = True
numpydoc_show_class_members = False
numpydoc_show_inherited_class_members = False
numpydoc_class_members_toctree = False
numpydoc_attributes_as_param_list = True
numpydoc_xref_param_type = False

# MyST and the executed notebook gallery
myst_enable_extensions = ["dollarmath", "colon_fence"]
nb_execution_mode = "cache"  # executed at build time; re-executed only when a notebook changes
nb_execution_timeout = 300  # seconds per cell
nb_execution_raise_on_error = True
nb_execution_show_tb = True
nb_merge_streams = True
nb_execution_cache_path = str(DOCS / "_build" / ".jupyter_cache")
nb_execution_excludepatterns: list[str] = []

# Docstrings write absolute values as |q|, |E| ...: in reStructuredText these are substitution references, so
# each one used in the code is defined to print itself.
_ABSOLUTE_VALUES = ("q", "E", "x", "V", "q_meas", "q_i", "q_m", "q_1", "E_v", "E_void", "E_1V", "V_c", "E(x)", "inf",
                    "a", "b", "U", "I", "Q", "sin")
rst_prolog = "\n".join(f".. |{n}| replace:: \\|{n}\\|" for n in _ABSOLUTE_VALUES) + "\n"

suppress_warnings = [
    # DEVELOPERS.md is included below the developer page's own title, so its sections start at H2
    "myst.header",
]


GALLERY_NOTE = (
    "**Safety.** High voltage can kill. The numbers below are engineering estimates from idealised models; test "
    "and acceptance levels come from the applicable standards; local codes and licensed practice prevail.\n\n"
    "**Data.** Every scenario here is an invented example, and a \"measured\" pattern is synthetic (pdvoid's "
    "own simulator with hidden parameters plus a detector model); nothing shown is a measurement."
)


def _copy_notebooks() -> None:
    """Copy notebooks/*.ipynb into docs/gallery/ so that Sphinx (which reads only its source tree) renders them,
    with the safety and data note added after the title cell. The copies are build products (git-ignored); the
    committed notebooks stay without outputs."""
    import nbformat

    target = DOCS / "gallery"
    target.mkdir(exist_ok=True)
    for path in sorted((ROOT / "notebooks").glob("*.ipynb")):
        nb = nbformat.read(path, as_version=4)
        note = nbformat.v4.new_markdown_cell(GALLERY_NOTE)
        if "id" in nb.cells[0]:
            note["id"] = "pdvoid-docs-note"  # fixed, so that an unchanged notebook gives an unchanged copy
        else:
            note.pop("id", None)
        nb.cells.insert(1, note)
        _write_if_changed(target / path.name, nbformat.writes(nb))


def _write_generated() -> None:
    """Pages written from the code itself so that they cannot drift: the bibliography and the command help."""
    out = DOCS / "_generated"
    out.mkdir(exist_ok=True)
    lines = []
    for key, ref in sorted(REFERENCES.items()):
        citation = "".join("\\" + ch if ch in "*`|_\\" else ch for ch in ref.citation)  # plain text in rST
        lines += [f"- ``{key}``: {citation} *({ref.status})*", ""]
    _write_if_changed(out / "references.inc", "\n".join(lines))

    import os

    from pdvoid.faces.cli import build_parser

    os.environ["COLUMNS"] = "100"  # argparse wraps at the terminal width: fix it for a reproducible page
    parser = build_parser()
    _write_if_changed(out / "cli_pdvoid.txt", parser.format_help())
    sub = next(a for a in parser._actions if a.__class__.__name__ == "_SubParsersAction")
    for name, p in sub.choices.items():
        _write_if_changed(out / f"cli_{name}.txt", p.format_help())


def _write_if_changed(path: Path, text: str) -> None:
    if not path.exists() or path.read_text(encoding="utf-8") != text:
        path.write_text(text, encoding="utf-8")


_copy_notebooks()
_write_generated()


# A module page documents what the module defines. A name it re-exports from a sibling module (e.g.
# pdvoid.physics.inception.density_equivalent_pressure, defined in pdvoid.physics.gas_density) is documented once,
# on its own module's page: the same docstring on two pages would give duplicate citation labels.
_current_module: list[str] = [""]


def _remember_module(app, what, name, obj, options, lines) -> None:
    if what == "module":
        _current_module[0] = name


def _skip_reexport(app, what, name, obj, skip, options):
    here = _current_module[0]
    defined = getattr(obj, "__module__", None)
    if what == "module" and here.startswith("pdvoid.") and isinstance(defined, str) and defined.startswith("pdvoid.") \
            and defined != here and callable(obj):
        return True
    return None


def setup(app):
    app.connect("autodoc-process-docstring", _remember_module)
    app.connect("autodoc-skip-member", _skip_reexport)
