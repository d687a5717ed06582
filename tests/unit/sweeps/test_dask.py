"""The same sweep on a Dask LocalCluster (loopback, two worker processes) as serially: identical Dataset."""

from __future__ import annotations

import distributed
import pytest
import xarray as xr

from pdvoid.sweeps import parallel_map, sweep

PARAMS = {"void.diameter": [0.8e-3, 1.5e-3], "supply.rms": [12e3, 18e3]}


@pytest.fixture(scope="module")
def cluster():
    with distributed.LocalCluster(
        n_workers=2, threads_per_worker=1, processes=True, dashboard_address=None, host="127.0.0.1"
    ) as c:
        yield c


def test_dask_client_and_scheduler_address_give_the_serial_result(cluster, demo):
    serial = sweep(demo, PARAMS, cycles=200, seed=9, workers=1, progress=False)
    with distributed.Client(cluster, set_as_default=False) as client:
        on_client = sweep(demo, PARAMS, cycles=200, seed=9, client=client, progress=False)
        assert client.status == "running"  # a client passed in is left open for its owner
    on_address = sweep(demo, PARAMS, cycles=200, seed=9, client=cluster.scheduler_address, progress=False)
    xr.testing.assert_identical(on_client, serial)
    xr.testing.assert_identical(on_address, serial)


def test_dask_map_keeps_order_and_raises_task_errors(cluster):
    import math

    with distributed.Client(cluster, set_as_default=False) as client:
        assert parallel_map(math.factorial, range(30), client=client) == [
            math.factorial(x) for x in range(30)
        ]
        with pytest.raises(ValueError, match="math domain"):
            parallel_map(math.sqrt, [1.0, -1.0], client=client)


def test_unreachable_scheduler_is_an_input_error():
    import math

    import dask

    from pdvoid import InputError

    with dask.config.set({"distributed.comm.timeouts.connect": "1s"}):
        with pytest.raises(InputError, match="cannot connect to the Dask scheduler"):
            parallel_map(math.sqrt, [1.0], client="tcp://127.0.0.1:1")  # port 1: nothing listens on loopback
