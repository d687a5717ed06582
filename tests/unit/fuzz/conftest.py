"""Settings of the fuzz suite: a fixed seed (derandomize), no example database, no deadline (numba compiles on the
first example). Test modules take them with ``settings(settings.get_profile("pdvoid-fuzz"), max_examples=n)``:
small example counts by default, bigger ones in the tests marked slow."""

from __future__ import annotations

import tracemalloc
from contextlib import contextmanager

import pytest
from hypothesis import HealthCheck, settings

settings.register_profile(
    "pdvoid-fuzz", derandomize=True, database=None, deadline=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture, HealthCheck.data_too_large,
                           HealthCheck.filter_too_much],
)


@contextmanager
def _allocation_limit(limit: int):
    tracemalloc.start()
    try:
        yield
        peak = tracemalloc.get_traced_memory()[1]
    finally:
        tracemalloc.stop()
    assert peak <= limit, f"allocated {peak} bytes, more than the limit of {limit}"


@pytest.fixture
def allocation_limit():
    """A context manager: fail when the Python and numpy allocations inside it peak above ``limit`` bytes."""
    return _allocation_limit
