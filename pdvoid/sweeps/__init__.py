"""Parameter sweeps (grid, random, Latin hypercube) and the parallel map they run on.

``pdvoid.sweeps.sweep(scenario, {"void.diameter": [...]}, cycles=..., seed=...)`` returns an xarray Dataset;
``parallel_map(func, items, client=None, workers=None)`` runs any picklable function serially, on local
processes or on a Dask cluster with identical results. xarray, tqdm, joblib and Dask are optional:
``pip install "pdvoid[sweep]"``. Importing this package imports none of them.
"""

from __future__ import annotations

from pdvoid.core.optional import MissingDependencyError
from pdvoid.simulation.parallel import backend_name, local_workers, parallel_map
from pdvoid.sweeps.dataset import base_scenario, read_netcdf, write_netcdf
from pdvoid.sweeps.metrics import default_metrics
from pdvoid.sweeps.plan import Plan, grid_plan, lhs_plan, make_plan, point_seeds, random_plan
from pdvoid.sweeps.run import sweep

__all__ = [
    "sweep",
    "parallel_map",
    "local_workers",
    "backend_name",
    "Plan",
    "grid_plan",
    "random_plan",
    "lhs_plan",
    "make_plan",
    "point_seeds",
    "default_metrics",
    "write_netcdf",
    "read_netcdf",
    "base_scenario",
    "MissingDependencyError",
]
