"""A reader that closes the pipe early (``pdvoid demo | head -1``) ends the command quietly: no traceback."""

from __future__ import annotations

import os
import sys

from pdvoid.faces.cli import main


def test_closed_output_pipe_is_not_a_traceback(monkeypatch):
    read_end, write_end = os.pipe()
    os.close(read_end)  # the reader is gone before the first line: every write gets EPIPE
    out = os.fdopen(write_end, "w", buffering=1)
    monkeypatch.setattr(sys, "stdout", out)
    try:
        assert main(["demo", "--cycles", "20"]) == 0
    finally:
        monkeypatch.undo()
        out.close()  # its descriptor now points at the null device
