"""The progress bar of the long commands (simulate, sweep, fit, inception --ramp): count, rate and ETA on stderr.

The bar is drawn with tqdm on standard error only, so standard output stays clean for ``--json`` and pipes. It
is off when standard error is not a terminal (a log file, a CI job, a pipe) or with ``--quiet``, and it appears
only once a run has lasted a second, so quick commands print nothing extra.
"""

from __future__ import annotations

import sys
from types import TracebackType
from typing import IO, Any

__all__ = ["ProgressBar", "QUIET_HELP", "DELAY", "MIN_INTERVAL", "progress_enabled"]

#: seconds a run lasts before its bar appears [s]
DELAY = 1.0
#: least time between two redraws of the bar [s]
MIN_INTERVAL = 0.1

#: help text of the ``--quiet`` option of every long command
QUIET_HELP = ("no progress bar on stderr (default: a bar with count and ETA when stderr is a terminal and the run "
              "lasts over a second)")


def progress_enabled(quiet: bool, stream: IO[str] | None = None) -> bool:
    """Whether a progress bar should be drawn: not ``quiet`` and ``stream`` (default stderr) is a terminal.

    Parameters
    ----------
    quiet : bool
        The command's ``--quiet`` [-].
    stream : file object, optional
        Where the bar would go; default ``sys.stderr`` [-].

    Returns
    -------
    bool
        True to draw the bar [-].
    """
    out = sys.stderr if stream is None else stream
    try:
        return not quiet and bool(out.isatty())
    except (AttributeError, ValueError):  # a closed or unusual stream
        return False


class ProgressBar:
    """A context manager around a tqdm bar; its :meth:`update_to` is a ``progress(done, total)`` callback.

    Parameters
    ----------
    total : int
        Units of work in the whole run, e.g. cycles [-].
    what : str
        What is counted, shown before the bar, e.g. ``"simulating"`` [-].
    unit : str
        The counted unit, e.g. ``"cycle"`` [-].
    quiet : bool
        True for no bar at all [-].
    stream : file object, optional
        Where the bar goes; default ``sys.stderr`` [-].
    delay : float, optional
        Seconds before the bar first appears [s]; default :data:`DELAY`, so quick runs show none.
    """

    def __init__(self, total: int, what: str, unit: str, *, quiet: bool = False, stream: IO[str] | None = None,
                 delay: float | None = None) -> None:
        self.stream = sys.stderr if stream is None else stream
        self.enabled = progress_enabled(quiet, self.stream)
        self.total = int(total)
        self._bar: Any = None
        if self.enabled:
            from tqdm import tqdm  # the plain terminal bar: never a notebook widget from the command line

            self._bar = tqdm(total=self.total, desc=what, unit=unit, file=self.stream,
                             delay=DELAY if delay is None else delay, mininterval=MIN_INTERVAL,
                             dynamic_ncols=True, leave=False, unit_scale=self.total >= 100_000)

    def update_to(self, done: int, total: int | None = None) -> None:
        """Move the bar to ``done`` of ``total`` (the signature of pdvoid's ``progress=`` callbacks).

        Parameters
        ----------
        done : int
            Units finished so far [-].
        total : int, optional
            Units in the whole run, when it changed [-].
        """
        if self._bar is None:
            return
        if total is not None and int(total) != self._bar.total:
            self._bar.total = int(total)
        self._bar.update(int(done) - self._bar.n)

    def close(self) -> None:
        """Remove the bar from the terminal."""
        if self._bar is not None:
            self._bar.close()
            self._bar = None

    def __enter__(self) -> ProgressBar:
        return self

    def __exit__(self, exc_type: type[BaseException] | None, exc: BaseException | None,
                 tb: TracebackType | None) -> None:
        self.close()
