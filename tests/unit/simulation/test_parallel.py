"""parallel_map: same results, same order, serially and on local processes; errors surface clearly."""

from __future__ import annotations

import math
import sys

import pytest

from pdvoid import InputError
from pdvoid.core.optional import MissingDependencyError, require
from pdvoid.simulation import parallel as execute
from pdvoid.simulation.parallel import backend_name, parallel_map

# functions from the standard library: picklable by reference in any worker (test modules are not importable
# by name in worker processes under pytest's importlib mode)
ITEMS = list(range(37))


def test_serial_map_in_order():
    assert parallel_map(math.factorial, ITEMS, workers=1) == [math.factorial(x) for x in ITEMS]
    assert backend_name(workers=1) == "serial"


def test_local_processes_give_the_same_list_in_order():
    out = parallel_map(math.factorial, ITEMS, workers=2)
    assert out == [math.factorial(x) for x in ITEMS]
    assert backend_name(workers=2) == "loky"


def test_stdlib_forkserver_pool_when_joblib_is_missing(monkeypatch):
    real = execute.available
    monkeypatch.setattr(execute, "available", lambda m: False if m == "joblib" else real(m))
    assert backend_name(workers=2) == "processes"
    try:
        assert parallel_map(math.factorial, ITEMS[:9], workers=2) == [math.factorial(x) for x in ITEMS[:9]]
        pool = execute._stdlib_pools[2]
        assert pool._mp_context.get_start_method() in (
            "forkserver",
            "spawn",
        )  # never fork (hangs after numba)
    finally:
        execute._shutdown_stdlib_pools()


def test_a_failing_task_raises_in_the_caller():
    with pytest.raises(ValueError, match="math domain"):
        parallel_map(math.sqrt, [4.0, -1.0, 9.0], workers=2)
    with pytest.raises(ValueError, match="math domain"):
        parallel_map(math.sqrt, [4.0, -1.0, 9.0], workers=1)


def test_empty_input_and_progress_bar(capsys):
    assert parallel_map(math.sqrt, [], workers=2) == []
    assert parallel_map(math.sqrt, [4.0, 9.0], workers=1, progress=True, description="roots") == [2.0, 3.0]
    assert "roots" in capsys.readouterr().err  # tqdm writes to stderr
    parallel_map(math.sqrt, [4.0, 9.0], workers=1, progress=False)
    assert capsys.readouterr().err == ""


@pytest.mark.parametrize(
    ("kwargs", "match"),
    [
        ({"workers": 0}, "workers"),
        ({"workers": 1.5}, "workers"),
        ({"progress": "yes"}, "progress"),
        ({"client": 42}, "client"),
        ({"client": "  "}, "empty"),
    ],
)
def test_bad_arguments(kwargs, match):
    with pytest.raises(InputError, match=match):
        parallel_map(math.sqrt, [1.0], **kwargs)


def test_uncallable_function():
    with pytest.raises(InputError, match="callable"):
        parallel_map(3, [1.0])


def test_missing_optional_package_names_the_extra(monkeypatch):
    monkeypatch.setitem(sys.modules, "xarray", None)  # makes "import xarray" fail as if it were not installed
    with pytest.raises(MissingDependencyError, match=r'pip install "pdvoid\[sweep\]"') as info:
        require("xarray")
    assert isinstance(info.value, ImportError) and "xarray" in str(info.value)


def test_a_reused_pool_whose_manager_thread_ended_is_replaced():
    # a loky executor whose manager thread has ended accepts tasks and never runs them (the hang seen once in a
    # full test run): _local_executor must hand out a fresh executor instead
    pytest.importorskip("joblib")
    import threading

    from pdvoid.simulation import parallel

    assert parallel_map(math.factorial, ITEMS[:6], workers=2) == [math.factorial(x) for x in ITEMS[:6]]
    executor = parallel._local_executor(2)
    ended = threading.Thread(target=lambda: None)
    ended.start()
    ended.join()
    real = executor._executor_manager_thread
    executor._executor_manager_thread = ended
    try:
        fresh = parallel._local_executor(2)
        assert fresh is not executor
        assert parallel_map(math.factorial, ITEMS[:6], workers=2) == [math.factorial(x) for x in ITEMS[:6]]
    finally:
        executor._executor_manager_thread = real
