"""README's Python example runs as written (first python block), and the quick start says what CI runs."""

from __future__ import annotations

import re
from pathlib import Path

import pdvoid

README = Path(__file__).parents[2] / "README.md"


def test_readme_python_example_runs(tmp_path, monkeypatch):
    text = README.read_text(encoding="utf-8")
    block = re.findall(r"```python\n(.*?)```", text, flags=re.S)[0]
    monkeypatch.chdir(tmp_path)
    ns: dict = {}
    exec(compile(block, "README.md", "exec"), ns)  # noqa: S102 - our own README
    assert ns["result"].event_count > 0  # the example voltage lies above inception
    assert ns["same"].event_count == ns["result"].event_count


def test_readme_starts_with_the_job_and_gives_two_quick_start_commands():
    text = README.read_text(encoding="utf-8")
    first_paragraph = text.split("\n\n")[1]
    assert "void" in first_paragraph and "pattern" in first_paragraph
    quick = text.split("## Quick start")[1].split("##")[0]
    commands = re.findall(r"```bash\n(.*?)```", quick, flags=re.S)
    assert len(commands) == 2 and "pdvoid demo" in commands[0] and "pytest" in commands[1]
    ci = (README.parent / ".ci" / "run").read_text(encoding="utf-8")
    for cmd in commands:
        assert cmd.strip() in ci
    assert "high voltage can kill" in text.lower()
    assert pdvoid.__version__
