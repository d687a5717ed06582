"""The parallel map every many-run feature uses: serially, on local worker processes, or on a Dask cluster.

``parallel_map(func, items)`` returns ``[func(x) for x in items]`` in the order of ``items``, whichever
backend runs it, so a deterministic ``func`` gives identical results serially, on local processes and on Dask.

Local processes are never forked from this process: once a parallel numba kernel has run, a fork-based pool
hangs. The local backend is joblib's loky executor (fresh interpreters, reused between calls so the numba
start-up is paid once per worker) when joblib is installed, otherwise the standard library's
ProcessPoolExecutor with the ``forkserver`` start method (``spawn`` where forkserver does not exist).
"""

from __future__ import annotations

import atexit
import concurrent.futures as cf
import contextlib
import multiprocessing
import os
from collections.abc import Callable, Iterable, Sequence
from functools import partial
from typing import Any

from pdvoid.core.errors import InputError, check_int
from pdvoid.core.optional import available, require

__all__ = ["parallel_map", "local_workers", "backend_name"]

_MAX_WORKERS = 1024
_stdlib_pools: dict[int, cf.ProcessPoolExecutor] = {}


def local_workers() -> int:
    """The number of cores this process may use [-] (CPU affinity and container limits respected).

    Returns
    -------
    int
        At least 1.
    """
    if available("joblib"):
        import joblib

        return max(1, int(joblib.cpu_count()))
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:  # pragma: no cover - platforms without sched_getaffinity
        return max(1, os.cpu_count() or 1)


def backend_name(client: Any = None, workers: int | None = None) -> str:
    """Which backend ``parallel_map`` would use: "serial", "loky", "processes" (stdlib) or "dask".

    Parameters
    ----------
    client : object, optional
        As for :func:`parallel_map`: None, a Dask client or a scheduler address.
    workers : int or None, optional
        As for :func:`parallel_map`.

    Returns
    -------
    str
        ``"serial"``, ``"loky"``, ``"processes"`` or ``"dask"``.
    """
    if client is not None:
        return "dask"
    if _resolve_workers(workers) == 1:
        return "serial"
    return "loky" if available("joblib") else "processes"


def _resolve_workers(workers: int | None) -> int:
    if workers is None:
        return local_workers()
    return check_int("workers", workers, 1, _MAX_WORKERS)


def _run_chunk(func: Callable, chunk: Sequence) -> list:
    return [func(x) for x in chunk]


_MAX_CHUNK = 64


def _chunks(n: int, workers: int) -> list[range]:
    """Index ranges: about eight chunks per worker, at most 64 tasks each (load balance, progress updates),
    so that many tiny tasks share one round trip."""
    size = min(_MAX_CHUNK, max(1, n // (8 * workers)))
    return [range(i, min(n, i + size)) for i in range(0, n, size)]


def _progress_bar(total: int, enabled: bool, description: str) -> Any:
    if not enabled:
        return None
    tqdm = require("tqdm.auto", feature="progress bars").tqdm
    return tqdm(total=total, desc=description or None, unit="task")


def _stdlib_pool(workers: int) -> cf.ProcessPoolExecutor:
    pool = _stdlib_pools.get(workers)
    if pool is None:
        methods = multiprocessing.get_all_start_methods()
        ctx = multiprocessing.get_context("forkserver" if "forkserver" in methods else "spawn")
        pool = cf.ProcessPoolExecutor(max_workers=workers, mp_context=ctx)
        _stdlib_pools[workers] = pool
    return pool


@atexit.register
def _shutdown_stdlib_pools() -> None:
    for pool in _stdlib_pools.values():
        pool.shutdown(wait=False, cancel_futures=True)
    _stdlib_pools.clear()


def _local_executor(workers: int) -> cf.Executor:
    """The reusable local process pool (loky when joblib is installed, else a stdlib pool).

    A reused loky executor whose manager thread has already ended (its workers gone, but neither flagged broken
    nor shut down) would accept tasks and never run them: such an executor is replaced by a fresh one. Seen on a
    loaded 2-core machine after many parallel runs with idle gaps in one process. Idle workers keep loky's
    default timeout (10 s), so workers orphaned by a killed main process exit soon after.
    """
    if available("joblib"):
        from joblib.externals.loky import get_reusable_executor

        executor = get_reusable_executor(max_workers=workers)
        manager = getattr(executor, "_executor_manager_thread", None)
        if manager is not None and not manager.is_alive():
            executor = get_reusable_executor(max_workers=workers, reuse=False, kill_workers=True)
        return executor
    return _stdlib_pool(workers)


#: ``on_result(indices, results)``: told in the calling process as each chunk of items finishes
OnResult = Callable[[range, list[Any]], None]


def _collect(futures: dict[Any, range], n: int, bar: Any, wait_any: Callable[[list[Any]], Iterable[Any]],
             on_result: OnResult | None = None, on_interrupt: Callable[[], None] | None = None) -> list[Any]:
    """Gather chunk results into a list of n; on a failure cancel what has not started and re-raise; on an
    interrupt call ``on_interrupt`` (stop the workers) instead when it is given."""
    out: list[Any] = [None] * n
    try:
        for fut in wait_any(list(futures)):
            rng = futures[fut]
            values = fut.result()
            for i, v in zip(rng, values, strict=True):
                out[i] = v
            if on_result is not None:
                on_result(rng, values)
            if bar is not None:
                bar.update(len(rng))
    except (KeyboardInterrupt, SystemExit):
        if on_interrupt is not None:
            on_interrupt()
        else:
            for fut in futures:
                fut.cancel()
        raise
    except BaseException:
        for fut in futures:
            fut.cancel()
        raise
    finally:
        if bar is not None:
            bar.close()
    return out


#: how long to wait for a Dask scheduler to answer before giving up [s]
SCHEDULER_TIMEOUT = 5.0


def _dask_client(client: Any) -> tuple[Any, bool]:
    """(client, owned): a Client as given, or a new one connected to a scheduler address string."""
    distributed = require("distributed", feature="Dask clusters")
    if isinstance(client, str):
        if not client.strip():
            raise InputError("client (scheduler address) must not be empty")
        if "://" not in client and ":" not in client:
            raise InputError(f"client (scheduler address) must look like 'tcp://host:8786'; got {client!r}")
        try:
            return distributed.Client(client, set_as_default=False, timeout=f"{SCHEDULER_TIMEOUT:g}s"), True
        except (OSError, TimeoutError) as exc:
            raise InputError(f"cannot connect to the Dask scheduler at {client!r}: {exc}") from None
    if not isinstance(client, distributed.Client):
        raise InputError(
            f"client must be a dask.distributed.Client or a scheduler address like 'tcp://host:8786'; got "
            f"{type(client).__name__}"
        )
    return client, False


def _dask_map(func: Callable[[Any], Any], items: list[Any], client: Any, make_bar: Callable[[], Any],
              on_result: OnResult | None = None) -> list[Any]:
    distributed = require("distributed", feature="Dask clusters")
    client, owned = _dask_client(client)
    try:
        bar = make_bar()
        threads = sum(w.get("nthreads", 1) for w in client.scheduler_info()["workers"].values()) or 1
        chunks = _chunks(len(items), threads)
        futures = {
            client.submit(_run_chunk, func, [items[i] for i in rng], pure=False): rng for rng in chunks
        }
        return _collect(futures, len(items), bar, partial(distributed.as_completed, loop=client.loop), on_result)
    finally:
        if owned:
            client.close()


def parallel_map(
    func: Callable[[Any], Any],
    items: Iterable[Any],
    *,
    client: Any = None,
    workers: int | None = None,
    progress: bool = False,
    description: str = "",
    on_result: OnResult | None = None,
) -> list[Any]:
    """``[func(x) for x in items]``, in order, run serially, on local processes or on a Dask cluster.

    Parameters
    ----------
    func : Callable[[Any], Any]
        a function of one argument, picklable (defined at module level, or a functools.partial of one)
        for the process and Dask backends; exceptions it raises stop the map and are re-raised here
        (tasks not yet started are cancelled).
    items : Iterable[Any]
        the arguments, picklable.
    client : object, optional
        None for local execution; a ``dask.distributed.Client``, or a scheduler address string
        such as ``"tcp://127.0.0.1:8786"`` (a client is opened and closed for this call), to run on Dask.
    workers : int, optional
        local worker processes [-]; None uses every core this process may use; 1 runs serially in
        this process. Ignored with ``client``.
    progress : bool, optional
        show a progress bar (tqdm, notebook-aware).
    description : str, optional
        label of the progress bar.
    on_result : Callable[[range, list], None], optional
        called in this process as each chunk of items finishes, with the chunk's indices into ``items`` and
        its results (serially: after every item), e.g. to store finished work as it completes; an exception
        it raises stops the map like one from ``func``.

    Returns
    -------
    list[Any]
        The results in the order of ``items``.

    Raises
    ------
    InputError
        bad ``workers`` or ``client``.
    MissingDependencyError
        (an ImportError) Dask or tqdm is needed and not installed.

    Notes
    -----
    An interrupt (``KeyboardInterrupt``, or ``SystemExit`` from a signal handler) while local worker processes
    run stops those workers instead of letting them finish their chunks; the next call starts fresh ones.
    """
    if not callable(func):
        raise InputError(f"func must be callable; got {type(func).__name__}")
    if not isinstance(progress, bool):
        raise InputError(f"progress must be True or False; got {progress!r}")
    if on_result is not None and not callable(on_result):
        raise InputError(f"on_result must be None or callable; got {type(on_result).__name__}")
    items = list(items)
    n = len(items)
    local = _resolve_workers(workers) if client is None else 1
    if n == 0:
        return []
    if client is not None:
        return _dask_map(func, items, client, lambda: _progress_bar(n, progress, description), on_result)
    bar = _progress_bar(n, progress, description)
    if local == 1 or n == 1:
        out = []
        try:
            for i, x in enumerate(items):
                out.append(func(x))
                if on_result is not None:
                    on_result(range(i, i + 1), out[i:])
                if bar is not None:
                    bar.update(1)
        finally:
            if bar is not None:
                bar.close()
        return out
    try:
        executor = _local_executor(local)
    except BaseException:
        if bar is not None:
            bar.close()
        raise
    futures = {executor.submit(_run_chunk, func, [items[i] for i in rng]): rng for rng in _chunks(n, local)}
    return _collect(futures, n, bar, cf.as_completed, on_result, partial(_stop_workers, executor, local))


def _stop_workers(executor: cf.Executor, workers: int) -> None:
    """Stop the local worker processes now (after an interrupt), instead of letting them run their chunks.

    The processes are terminated first and the pool is shut down after: the pool then fails the pending tasks
    itself (cancelling them first races with the pool's own bookkeeping). The next call starts a fresh pool.
    """
    if _stdlib_pools.get(workers) is executor:
        del _stdlib_pools[workers]
    for proc in list((getattr(executor, "_processes", None) or {}).values()):
        with contextlib.suppress(OSError, ValueError, AttributeError):
            proc.terminate()
    with contextlib.suppress(Exception):
        executor.shutdown(wait=True)
