"""Parameter sweeps (grid, random, Latin hypercube) and the parallel map they run on.

``pdvoid.sweeps.sweep(scenario, {"void.diameter": [...]}, cycles=..., seed=...)`` returns an xarray Dataset;
``parallel_map(func, items, client=None, workers=None)`` runs any picklable function serially, on local
processes or on a Dask cluster with identical results. ``sweep(..., checkpoint=FOLDER, resume=True)`` and
``sweep_to_file(...)`` keep every finished point on disk so that an interrupted sweep continues where it
stopped. xarray, tqdm, joblib and Dask are optional: ``pip install "pdvoid[sweep]"``. Importing this package
imports none of them.
"""

from __future__ import annotations

from pdvoid.core.optional import MissingDependencyError
from pdvoid.simulation.parallel import backend_name, local_workers, parallel_map
from pdvoid.sweeps.checkpoint import checkpoint_path, checkpoint_progress, remove_checkpoint
from pdvoid.sweeps.dataset import base_scenario, check_sweep_dataset, read_netcdf, write_netcdf
from pdvoid.sweeps.metrics import default_metrics
from pdvoid.sweeps.plan import Plan, grid_plan, lhs_plan, make_plan, point_seeds, random_plan
from pdvoid.sweeps.run import sweep, sweep_to_file

__all__ = [
    "sweep",
    "sweep_to_file",
    "checkpoint_path",
    "checkpoint_progress",
    "remove_checkpoint",
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
    "check_sweep_dataset",
    "base_scenario",
    "MissingDependencyError",
]
