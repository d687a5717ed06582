"""How the command line stops: SIGTERM raises :class:`Terminated` (an interrupt like Ctrl-C) in the main thread.

Both unwind the command the same way (files being written are abandoned whole, locks released, a sweep keeps
its finished points); the command then ends with exit status 130 after SIGINT (Ctrl-C) and 143 after SIGTERM,
the shell conventions 128 + signal number.
"""

from __future__ import annotations

import contextlib
import signal
import threading
from collections.abc import Iterator
from types import FrameType

__all__ = ["Terminated", "sigterm_raises", "exit_status", "signal_name"]


class Terminated(KeyboardInterrupt):
    """Raised in the main thread when the process receives SIGTERM (while :func:`sigterm_raises` is active)."""


def _raise_terminated(signum: int, frame: FrameType | None) -> None:
    raise Terminated(f"signal {signum}")


@contextlib.contextmanager
def sigterm_raises() -> Iterator[None]:
    """Within the block, SIGTERM raises :class:`Terminated` in the main thread; the previous handler comes back
    afterwards. Outside the main thread (where handlers cannot be set) it does nothing.

    Yields
    ------
    None
    """
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    previous = signal.signal(signal.SIGTERM, _raise_terminated)
    try:
        yield
    finally:
        signal.signal(signal.SIGTERM, previous)


def exit_status(exc: KeyboardInterrupt) -> int:
    """The exit status after an interrupt: 143 for SIGTERM (:class:`Terminated`), 130 for SIGINT.

    Parameters
    ----------
    exc : KeyboardInterrupt
        The interrupt.

    Returns
    -------
    int
        128 + the signal number.
    """
    return 128 + (signal.SIGTERM if isinstance(exc, Terminated) else signal.SIGINT)


def signal_name(exc: KeyboardInterrupt) -> str:
    """``"SIGTERM"`` for :class:`Terminated`, ``"SIGINT"`` for another interrupt.

    Parameters
    ----------
    exc : KeyboardInterrupt
        The interrupt.

    Returns
    -------
    str
        The signal's name.
    """
    return "SIGTERM" if isinstance(exc, Terminated) else "SIGINT"
