"""Debounced background work for the workbench: run a job in one background thread a short pause after the
last request, and let a newer request or a Stop press end the running job early. No widgets here."""

from __future__ import annotations

import threading
import time
from collections.abc import Callable

from pdvoid.core.errors import check_range

__all__ = ["DebouncedWorker"]


class DebouncedWorker:
    """Runs ``job(should_stop)`` in a daemon thread ``delay`` seconds after the last :meth:`request`.

    ``should_stop()`` turns True when :meth:`stop` is called or a newer request arrives while the job runs, so
    a job that polls it (``pdvoid.simulate(..., should_stop=...)``) ends early; :meth:`superseded` tells the
    two apart. An exception escaping the job is passed to ``on_error`` (the thread goes on).

    Parameters
    ----------
    job : callable
        Called as job(should_stop) in the background thread; what it returns is ignored.
    delay : float
        Quiet time after the last request before the job starts, 0 to 10 [s].
    on_error : callable, optional
        Called with the exception when the job raises.

    Attributes
    ----------
    delay : float
        The quiet time [s].
    last_request_time : float
        ``time.perf_counter()`` at the last :meth:`request` [s].

    Raises
    ------
    InputError
        For a delay outside 0 ... 10 s.
    """

    def __init__(
        self,
        job: Callable[[Callable[[], bool]], object],
        delay: float = 0.1,
        on_error: Callable[[BaseException], None] | None = None,
    ) -> None:
        self._job = job
        self.delay = check_range("delay", delay, 0.0, 10.0, unit="s")
        self._on_error = on_error
        self._cond = threading.Condition()
        self._requested_at: float | None = None
        self._generation = 0
        self._running_generation = -1
        self._stop_pressed = False
        self._busy = False
        self._closed = False
        self._thread: threading.Thread | None = None
        self.last_request_time = time.perf_counter()

    # ---- called from the notebook's thread
    def request(self) -> None:
        """Ask for a (new) run after the quiet time; a running job is told to stop."""
        with self._cond:
            if self._closed:
                return
            self._generation += 1
            self._stop_pressed = False  # a new change is a new intent
            self._requested_at = time.monotonic()
            self.last_request_time = time.perf_counter()
            if self._thread is None or not self._thread.is_alive():
                self._thread = threading.Thread(target=self._loop, name="pdvoid-workbench", daemon=True)
                self._thread.start()
            self._cond.notify_all()

    def stop(self) -> None:
        """End the running (or pending) job early: it stops after its first chunk and keeps its result so
        far."""
        with self._cond:
            self._stop_pressed = True

    def close(self) -> None:
        """Stop the running job and end the thread."""
        with self._cond:
            self._closed = True
            self._stop_pressed = True
            self._cond.notify_all()

    def wait(self, timeout: float = 60.0) -> bool:
        """Block until no request is pending and no job runs.

        Parameters
        ----------
        timeout : float
            Longest wait [s].

        Returns
        -------
        bool
            True when idle, False on timeout.
        """
        end = time.monotonic() + timeout
        with self._cond:
            while self._requested_at is not None or self._busy:
                left = end - time.monotonic()
                if left <= 0.0:
                    return False
                self._cond.wait(left)
        return True

    @property
    def busy(self) -> bool:
        """True while a request is pending or a job runs."""
        with self._cond:
            return self._busy or self._requested_at is not None

    # ---- called from the job -------------------------------------------------------------------------------
    def superseded(self) -> bool:
        """True when a newer request arrived after the running job started.

        Returns
        -------
        bool
            Whether the running job is out of date.
        """
        return self._generation != self._running_generation

    def should_stop(self) -> bool:
        """True when the running job should end early: Stop was pressed, the worker closed or a newer request
        arrived.

        Returns
        -------
        bool
            Whether to stop.
        """
        return self._stop_pressed or self._closed or self.superseded()

    # ---- the thread
    def _loop(self) -> None:
        while True:
            with self._cond:
                while self._requested_at is None and not self._closed:
                    self._cond.wait()
                if self._closed:
                    return
                while True:  # debounce: wait until the requests pause for `delay`
                    requested = self._requested_at
                    if requested is None:  # only this thread clears it, so it cannot happen here
                        break
                    left = requested + self.delay - time.monotonic()
                    if left <= 0.0 or self._closed:
                        break
                    self._cond.wait(left)
                if self._closed:
                    return
                self._requested_at = None
                self._running_generation = self._generation
                self._busy = True
            try:
                self._job(self.should_stop)
            except Exception as exc:  # shown in the panel by on_error; the worker stays usable
                if self._on_error is not None:
                    self._on_error(exc)
            finally:
                with self._cond:
                    self._busy = False
                    self._cond.notify_all()
