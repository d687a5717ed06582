"""Execute every notebook in notebooks/ with nbclient (marker ``notebook``) and check what it shows."""

from __future__ import annotations

import base64
import time
from pathlib import Path

import ipykernel  # noqa: F401 - the notebooks need a kernel
import nbclient
import nbformat
import pytest

pytestmark = [
    pytest.mark.notebook,
    pytest.mark.filterwarnings("ignore::DeprecationWarning"),
    pytest.mark.filterwarnings("ignore::RuntimeWarning"),
]

NOTEBOOKS = Path(__file__).resolve().parents[2] / "notebooks"
NAMES = ("quick_start", "patterns_and_descriptors", "inception_and_margins", "workbench")  # this file's own
ALL = sorted(p.stem for p in NOTEBOOKS.glob("*.ipynb"))  # every notebook in the folder is executed
TIMEOUT = 120  # seconds per cell and per notebook
PNG = b"\x89PNG\r\n\x1a\n"  # PNG file signature (PNG specification, ISO/IEC 15948 section 5.2)


def _execute(name: str, tmp_path: Path):
    nb = nbformat.read(NOTEBOOKS / f"{name}.ipynb", as_version=4)
    client = nbclient.NotebookClient(
        nb, timeout=TIMEOUT, kernel_name="python3", resources={"metadata": {"path": str(tmp_path)}}
    )
    t0 = time.perf_counter()
    client.execute()
    seconds = time.perf_counter() - t0
    assert seconds < TIMEOUT, f"{name} took {seconds:.1f} s"
    return nb


def test_notebooks_are_committed_without_outputs():
    assert set(NAMES) <= set(ALL)
    for name in ALL:
        nb = nbformat.read(NOTEBOOKS / f"{name}.ipynb", as_version=4)
        nbformat.validate(nb)
        assert nb.nbformat == 4 and nb.metadata.kernelspec.name == "python3"
        if name in NAMES:
            assert "invented" in " ".join(c.source for c in nb.cells if c.cell_type == "markdown"), name
        for cell in nb.cells:
            if cell.cell_type == "code":
                assert cell.outputs == [] and cell.execution_count is None, name


@pytest.mark.parametrize("name", [n for n in ALL if n != "workbench"])
def test_notebook_runs_and_draws(name, tmp_path):
    nb = _execute(name, tmp_path)
    outputs = [o for c in nb.cells if c.cell_type == "code" for o in c.outputs]
    assert not [o for o in outputs if o.output_type == "error"]
    # a figure left as a cell's value is drawn, not shown as its text ("<Figure size 1000x760 with 6 Axes>")
    for cell in (c for c in nb.cells if c.cell_type == "code"):
        for o in cell.outputs:
            data = o.get("data", {})
            shown = data.get("text/plain", "")
            if shown.startswith(("<Figure", "<Axes", "[<Axes")):
                assert "image/png" in data, f"{name}: {shown!r} instead of the picture, from\n{cell.source}"
    plotting = [c for c in nb.cells if c.cell_type == "code" and (".figure" in c.source or "plt.show" in c.source)]
    images = [o for o in outputs if "image/png" in o.get("data", {})]
    assert len(images) >= len(plotting), f"{name}: {len(images)} pictures from {len(plotting)} figure cells"
    if name not in NAMES:
        return  # another notebook: executing cleanly is the check
    assert len(images) >= 2, f"{name} showed {len(images)} figures"
    text = "".join(o.get("text", "") for o in outputs if o.output_type == "stream")
    assert "kV" in text or "pC" in text or "[-]" in text


def test_workbench_notebook_holds_png_images_in_its_widget_state(tmp_path):
    nb = _execute("workbench", tmp_path)
    state = nb.metadata["widgets"]["application/vnd.jupyter.widget-state+json"]["state"]
    images = [m for m in state.values() if m["model_name"] == "ImageModel"]
    pngs = []
    for model in images:
        assert model["state"]["format"] == "png"
        for buf in model.get("buffers", []):
            data = base64.b64decode(buf["data"]) if buf.get("encoding") == "base64" else buf["data"]
            if buf["path"] == ["value"] and data.startswith(PNG):
                pngs.append(data)
    assert len(pngs) >= 3  # field, pattern and pulse-sequence views
    html = [m["state"].get("value", "") for m in state.values() if m["model_name"] == "HTMLModel"]
    assert any("inception voltage" in h and "kV rms" in h for h in html)
    assert any("updated:" in h for h in html)
