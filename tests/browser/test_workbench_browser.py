"""The workbench in a real browser: JupyterLab serves a temporary copy of the notebooks on 127.0.0.1, headless
Debian chromium (driven by Playwright) runs the workbench notebook, changes the void-size and pressure
controls and checks that the pictures and the summary numbers change. Marker ``browser``; writes
test-artifacts/workbench.png.

Run only when selected (``pytest -m browser``; the default run deselects the marker). Once selected it fails,
never skips, when chromium (/usr/bin/chromium) or the Python package playwright is missing. No browser is ever
downloaded: Playwright drives the system chromium.
"""

from __future__ import annotations

import os
import shutil
import socket
import subprocess
import sys
import time
import urllib.request
from pathlib import Path
from urllib.parse import urlparse

import pytest

pytestmark = [
    pytest.mark.browser,
    pytest.mark.filterwarnings("ignore::DeprecationWarning"),
    pytest.mark.filterwarnings("ignore::ResourceWarning"),
]

CHROMIUM = Path("/usr/bin/chromium")
REPO = Path(__file__).resolve().parents[2]
ARTIFACTS = REPO / "test-artifacts"
CHROMIUM_ARGS = [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
]
U_INC = "inception voltage"

_JS_IMAGE_DIGEST = """async (sel) => {
    const img = document.querySelector(sel);
    if (!img || !img.src) return null;
    const buf = await (await fetch(img.src)).arrayBuffer();
    const hash = await crypto.subtle.digest('SHA-256', buf);
    const hex = Array.from(new Uint8Array(hash)).map(b => b.toString(16).padStart(2, '0'));
    return hex.join('') + ':' + buf.byteLength;
}"""

_JS_SUMMARY_VALUE = """(name) => {
    for (const row of document.querySelectorAll('.pdvoid-summary tr')) {
        const cells = row.querySelectorAll('td');
        if (cells.length >= 2 && cells[0].innerText.trim() === name) return parseFloat(cells[1].innerText);
    }
    return null;
}"""

_JS_STATUS_HAS = """(words) => {
    const el = document.querySelector('.pdvoid-status');
    return !!el && words.every(w => el.innerText.includes(w));
}"""

_JS_KERNEL_IDLE = """() => {
    const app = window.jupyterapp;
    const w = app && app.shell.currentWidget;
    const kernel = w && w.sessionContext && w.sessionContext.session && w.sessionContext.session.kernel;
    return !!kernel && kernel.status === 'idle' && !!w.content;
}"""


def _free_port() -> int:
    with socket.socket(socket.AF_INET, socket.SOCK_STREAM) as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def _wait_for_status(base: str, proc: subprocess.Popen, timeout: float = 90.0) -> None:
    end = time.monotonic() + timeout
    while time.monotonic() < end:
        if proc.poll() is not None:
            raise RuntimeError(f"JupyterLab exited with code {proc.returncode}")
        try:
            with urllib.request.urlopen(f"{base}/api/status", timeout=2) as r:
                if r.status == 200:
                    return
        except OSError:
            time.sleep(0.3)
    raise TimeoutError(f"JupyterLab did not answer {base}/api/status within {timeout} s")


@pytest.fixture
def playwright_api():
    # selected with -m browser, this test must run: a missing browser or driver is a failure, never a skip
    if not CHROMIUM.exists():
        pytest.fail(f"chromium is not installed ({CHROMIUM} missing; apt-get install -y chromium)", pytrace=False)
    try:
        from playwright.sync_api import sync_playwright
    except ImportError:
        pytest.fail(
            "the Python package playwright is not installed (it is in the test extra: pip install '.[test]')",
            pytrace=False,
        )
    return sync_playwright


@pytest.fixture
def lab(tmp_path):
    """JupyterLab on 127.0.0.1 serving a temporary copy of notebooks/, with its own config and settings."""
    root = tmp_path / "notebooks"
    shutil.copytree(REPO / "notebooks", root, ignore=shutil.ignore_patterns(".ipynb_checkpoints"))
    env = dict(os.environ)
    for var, sub in (
        ("JUPYTER_CONFIG_DIR", "config"),
        ("JUPYTERLAB_SETTINGS_DIR", "settings"),
        ("JUPYTERLAB_WORKSPACES_DIR", "workspaces"),
        ("JUPYTER_RUNTIME_DIR", "runtime"),
    ):
        (tmp_path / sub).mkdir()
        env[var] = str(tmp_path / sub)
    # no news or update checks (they would ask to reach the internet, and their prompt covers the panel)
    news = tmp_path / "settings" / "@jupyterlab" / "apputils-extension"
    news.mkdir(parents=True)
    (news / "notification.jupyterlab-settings").write_text(
        '{"fetchNews": "false", "checkForUpdates": false}', encoding="utf-8"
    )
    env["PATH"] = str(Path(sys.executable).parent) + os.pathsep + env.get("PATH", "")
    env["PYDEVD_DISABLE_FILE_VALIDATION"] = "1"
    port = _free_port()
    log = open(tmp_path / "jupyterlab.log", "wb")  # noqa: SIM115 - closed below
    proc = subprocess.Popen(
        [
            sys.executable,
            "-m",
            "jupyterlab",
            "--no-browser",
            "--ip=127.0.0.1",
            f"--port={port}",
            "--ServerApp.port_retries=0",
            "--ServerApp.token=",
            "--ServerApp.password=",
            "--allow-root",
            "--LabApp.expose_app_in_browser=True",
            f"--ServerApp.root_dir={root}",
        ],
        cwd=root,
        env=env,
        stdout=log,
        stderr=subprocess.STDOUT,
    )
    base = f"http://127.0.0.1:{port}"
    try:
        _wait_for_status(base, proc)
        yield base
    finally:
        proc.terminate()
        try:
            proc.wait(15)
        except subprocess.TimeoutExpired:
            proc.kill()
            proc.wait(10)
        log.close()


def _local_only(route) -> None:
    url = route.request.url
    host = urlparse(url[5:] if url.startswith("blob:") else url).hostname
    if host == "127.0.0.1" or url.startswith("data:"):
        route.continue_()
    else:
        route.abort()


def _set_slider(page, name: str, value: str) -> float:
    """Type ``value`` into the entry box beside slider ``name`` and press Enter; returns the time [s]."""
    return _type_into(page, f".pdvoid-{name}-entry input", value)


def _type_into(page, selector: str, value: str) -> float:
    """Type ``value`` into the input ``selector`` and press Enter; returns the time [s]."""
    box = page.locator(selector)
    box.click()
    box.fill(value)
    t0 = time.perf_counter()
    box.press("Enter")
    return t0


def _wait_updated(page, words: list[str], timeout_ms: int = 60_000) -> None:
    page.wait_for_function(_JS_STATUS_HAS, arg=["updated:", *words], timeout=timeout_ms)


def _images(page) -> dict[str, str]:
    return {
        v: page.evaluate(_JS_IMAGE_DIGEST, f"img.pdvoid-image-{v}") for v in ("field", "pattern", "sequence")
    }


def test_workbench_reacts_to_void_size_and_pressure(playwright_api, lab):
    ARTIFACTS.mkdir(exist_ok=True)
    timings = {}
    with playwright_api() as pw:
        browser = pw.chromium.launch(executable_path=str(CHROMIUM), headless=True, args=CHROMIUM_ARGS)
        page = browser.new_page(viewport={"width": 1600, "height": 1500})
        page.route("**/*", _local_only)
        try:
            t0 = time.perf_counter()
            page.goto(f"{lab}/lab/tree/workbench.ipynb?reset", wait_until="domcontentloaded")
            page.wait_for_function(_JS_KERNEL_IDLE, timeout=90_000)
            page.evaluate("window.jupyterapp.commands.execute('notebook:run-all-cells')")
            _wait_updated(page, ["void 1.5 mm × 1.5 mm"], timeout_ms=90_000)
            timings["open and first draw [s]"] = time.perf_counter() - t0
            page.wait_for_selector("img.pdvoid-image-field", state="visible")
            start_images = _images(page)
            start_u = page.evaluate(_JS_SUMMARY_VALUE, U_INC)
            assert all(start_images.values()) and start_u and 5.0 < start_u < 50.0

            t_change = _set_slider(page, "diameter_mm", "2.5")
            _wait_updated(page, ["void 2.5 mm × 1.5 mm"])
            timings["diameter change to redrawn panel, in the browser [s]"] = time.perf_counter() - t_change
            size_images = _images(page)
            size_u = page.evaluate(_JS_SUMMARY_VALUE, U_INC)
            # a larger void discharges at a lower voltage (streamer criterion, Niemeyer 1995; physics brief
            # §3.1)
            assert size_u < start_u
            assert size_images["field"] != start_images["field"]
            assert size_images["pattern"] != start_images["pattern"]

            t_change = _set_slider(page, "pressure_kPa", "130")
            _wait_updated(page, ["air at 130 kPa"])
            timings["pressure change to redrawn panel, in the browser [s]"] = time.perf_counter() - t_change
            pressure_images = _images(page)
            pressure_u = page.evaluate(_JS_SUMMARY_VALUE, U_INC)
            # a higher gas pressure raises the inception field (streamer criterion, Niemeyer 1995)
            assert pressure_u > size_u
            assert pressure_images["pattern"] != size_images["pattern"]
            assert pressure_images["field"] != size_images["field"]
            assert page.locator(".pdvoid-error").inner_text().strip() == ""
            # the regime in words, in the status line and under the summary (18 kV is above inception here)
            assert "discharging: first discharge after" in page.locator(".pdvoid-status").inner_text()

            page.evaluate("window.jupyterapp.shell.collapseLeft()")
            page.locator(".pdvoid-workbench").evaluate("e => e.scrollIntoView({block: 'start'})")
            page.wait_for_timeout(300)
            page.screenshot(path=str(ARTIFACTS / "workbench.png"))

            # no label carries the tooltip "null" (ipywidgets writes an unset tooltip so)
            assert page.locator(".pdvoid-workbench [title='null']").count() == 0

            # a seed of 1.5 is refused in words, and the old views are greyed and marked out of date
            _type_into(page, ".pdvoid-seed input", "1.5")
            page.wait_for_function("() => document.querySelector('.pdvoid-error').innerText.includes('seed')")
            assert "not a whole number" in page.locator(".pdvoid-error").inner_text()
            assert page.locator("img.pdvoid-image-pattern.pdvoid-stale").count() == 1
            assert "Out of date" in page.locator(".pdvoid-stale-note").inner_text()
            page.locator(".pdvoid-stale-note").evaluate("e => e.scrollIntoView({block: 'start'})")
            page.screenshot(path=str(ARTIFACTS / "workbench-stale.png"))
            _type_into(page, ".pdvoid-seed input", "1")

            # a void taller than the wall: the message in mm, not in metres
            _set_slider(page, "height_mm", "7")
            page.wait_for_function("() => document.querySelector('.pdvoid-error').innerText.includes('7 mm')")
            assert "void height must be smaller than insulation thickness (6 mm)" in page.locator(
                ".pdvoid-error").inner_text()
            _set_slider(page, "height_mm", "1.5")
            _wait_updated(page, ["void 2.5 mm × 1.5 mm"])
            assert page.locator("img.pdvoid-stale").count() == 0

            # below inception the panel says so in words, not only with zero discharges
            _set_slider(page, "voltage_kV", "8")
            _wait_updated(page, ["8 kV rms", "below inception"])
            assert "0 discharges" in page.locator(".pdvoid-status").inner_text()
        except Exception:
            page.screenshot(path=str(ARTIFACTS / "workbench-failure.png"))
            raise
        finally:
            try:
                page.evaluate("window.jupyterapp.serviceManager.sessions.shutdownAll()")
            finally:
                browser.close()
    print("; ".join(f"{k} {v:.2f}" for k, v in timings.items()))


#: browser redraw measurement: (control, entry values in turn, the status words that mark each value drawn)
_LATENCY_CHANGES = (
    ("diameter_mm", ("1.6", "1.7", "1.5"), lambda v: [f"void {v} mm × 1.5 mm"]),
    ("height_mm", ("1.4", "1.6", "1.5"), lambda v: [f"× {v} mm, air"]),
    ("pressure_kPa", ("90", "110", "101.325"), lambda v: [f"air at {v} kPa"]),
    ("voltage_kV", ("17", "19", "18"), lambda v: [f"{v} kV rms"]),
)


def _open_workbench(page, lab: str, notebook: str) -> None:
    page.goto(f"{lab}/lab/tree/{notebook}?reset", wait_until="domcontentloaded")
    page.wait_for_function(_JS_KERNEL_IDLE, timeout=90_000)
    page.evaluate("window.jupyterapp.commands.execute('notebook:run-all-cells')")
    _wait_updated(page, ["void 1.5 mm × 1.5 mm"], timeout_ms=90_000)
    page.wait_for_selector("img.pdvoid-image-field", state="visible")


def _latencies(page, passes: int = 2) -> list[tuple[str, float]]:
    """Seconds from a typed change (Enter) to the status line that says the new value is drawn."""
    every = []
    for _ in range(passes):
        for name, values, words in _LATENCY_CHANGES:
            for value in values:
                before = _images(page)
                t0 = _set_slider(page, name, value)
                _wait_updated(page, words(value))
                every.append((name, time.perf_counter() - t0))
                assert _images(page)["pattern"] != before["pattern"]  # the pictures were redrawn
    return every


def test_redraw_latency_big_run_and_stop_in_the_browser(playwright_api, lab, tmp_path):
    """Redraw latency per control (change typed → status says it is drawn, pictures included) with the former
    drawing (new figures, a copy of the workbench notebook that asks for it) and the persistent views, a
    10⁶-cycle run in histogram mode, and Stop during a 10⁷-cycle run; prints the table and writes it and
    screenshots to test-artifacts/."""
    import json
    import statistics

    ARTIFACTS.mkdir(exist_ok=True)
    nb = json.loads((REPO / "notebooks" / "workbench.ipynb").read_text(encoding="utf-8"))
    for cell in nb["cells"]:
        if cell["cell_type"] == "code":
            cell["source"] = "".join(cell["source"]).replace("open_workbench()",
                                                             'open_workbench(drawing="new figures")')
    (tmp_path / "notebooks" / "workbench_former.ipynb").write_text(json.dumps(nb), encoding="utf-8")
    lines = []
    with playwright_api() as pw:
        browser = pw.chromium.launch(executable_path=str(CHROMIUM), headless=True, args=CHROMIUM_ARGS)
        page = browser.new_page(viewport={"width": 1600, "height": 1500})
        page.route("**/*", _local_only)
        try:
            measured = {}
            for label, notebook in (("before (new figures)", "workbench_former.ipynb"),
                                    ("after (in place)", "workbench.ipynb")):
                _open_workbench(page, lab, notebook)
                measured[label] = _latencies(page)
                page.evaluate("window.jupyterapp.serviceManager.sessions.shutdownAll()")
            lines.append("redraw in the browser, 200 cycles: median / max [s]")
            lines.append(f"  {'control':14s}" + "".join(f"{lab:>24s}" for lab in measured))
            for name in [*(c[0] for c in _LATENCY_CHANGES), "all"]:
                cells = []
                for every in measured.values():
                    got = [t for n, t in every if name in (n, "all")]
                    cells.append(f"{statistics.median(got):.3f} / {max(got):.3f}")
                lines.append(f"  {name:14s}" + "".join(f"{c:>24s}" for c in cells))
            # the persistent views keep the redraw within the 0.3 s median; generous, to catch a
            # regression to the former drawing, not to time the machine
            assert statistics.median(t for _, t in measured["after (in place)"]) < 1.0

            _open_workbench(page, lab, "workbench.ipynb")
            page.evaluate("window.jupyterapp.shell.collapseLeft()")
            t0 = _type_into(page, ".pdvoid-cycles input", "1000000")
            _wait_updated(page, ["1000000 cycles,", "histogram mode"], timeout_ms=120_000)
            lines.append(f"10^6 cycles, change to redrawn panel in the browser: {time.perf_counter() - t0:.2f} s")
            page.locator(".pdvoid-workbench").evaluate("e => e.scrollIntoView({block: 'start'})")
            page.wait_for_timeout(300)
            page.screenshot(path=str(ARTIFACTS / "workbench-histogram.png"))

            _type_into(page, ".pdvoid-cycles input", "10000000")
            page.wait_for_function(_JS_STATUS_HAS, arg=["running:"], timeout=60_000)
            page.wait_for_timeout(1000)
            t0 = time.perf_counter()
            page.locator(".pdvoid-stop button, button.pdvoid-stop").first.click()
            page.wait_for_function(_JS_STATUS_HAS, arg=["stopped after"], timeout=60_000)
            stop = time.perf_counter() - t0
            lines.append(f"Stop 1 s into a 10^7-cycle run, click to the stopped panel drawn: {stop:.2f} s")
            page.wait_for_timeout(300)
            page.screenshot(path=str(ARTIFACTS / "workbench-stopped.png"))
            assert stop < 5.0  # generous: the benchmark's figure is the measurement, this only catches a hang
        except Exception:
            page.screenshot(path=str(ARTIFACTS / "workbench-failure.png"))
            raise
        finally:
            try:
                page.evaluate("window.jupyterapp.serviceManager.sessions.shutdownAll()")
            finally:
                browser.close()
    (ARTIFACTS / "redraw-latency.txt").write_text("\n".join(lines) + "\n", encoding="utf-8")
    print("\n".join(lines))
