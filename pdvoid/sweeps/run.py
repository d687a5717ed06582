"""sweep(scenario, parameters, ...) → xarray Dataset: many simulations over a design, wherever they run."""

from __future__ import annotations

from collections.abc import Callable, Mapping
from functools import partial
from typing import TYPE_CHECKING, Any

from pdvoid.core.errors import InputError, check_int
from pdvoid.core.optional import require
from pdvoid.inputs.scenario import Scenario
from pdvoid.simulation.parallel import parallel_map
from pdvoid.simulation.simulate import MAX_CYCLES
from pdvoid.sweeps.dataset import assemble
from pdvoid.sweeps.metrics import run_point
from pdvoid.sweeps.names import check_parameter_names
from pdvoid.sweeps.plan import make_plan

if TYPE_CHECKING:
    import xarray

__all__ = ["sweep"]


def sweep(
    scenario: Scenario,
    parameters: Mapping[str, Any],
    cycles: int = 1000,
    seed: int = 0,
    *,
    design: str = "grid",
    samples: int | None = None,
    client: Any = None,
    workers: int | None = None,
    metrics: Callable | None = None,
    progress: bool = True,
) -> xarray.Dataset:
    """Simulate ``scenario`` at every point of a parameter design and collect the metrics in a Dataset.

    Parameters
    ----------
    scenario : Scenario
        the base scenario; each point is ``scenario.replace(**changes)``.
    parameters : Mapping[str, Any]
        grid: {dotted name: list of values} [SI], e.g. {"void.diameter": [0.5e-3, 1e-3]}
        (text or True/False lists too); random/lhs: {dotted name: (low, high)} or (low, high, "log") [SI].
    cycles : int
        AC cycles per point [-].
    seed : int
        master seed [-]; point i runs with ``SeedSequence(seed).spawn(n)[i].generate_state(1)[0] >> 1``,
        so the Dataset is the same whoever runs it and in whatever order.
    design : str
        "grid", "random" or "lhs" (Latin hypercube).
    samples : int or None
        number of points for random/lhs [-]; must be None for grid.
    client : Any
        None to run locally; a ``dask.distributed.Client`` or a scheduler address string to run on
        Dask.
    workers : int or None
        local worker processes [-]: None = every core, 1 = serially in this process.
    metrics : Callable or None
        None for :func:`pdvoid.sweeps.metrics.default_metrics`; or a picklable function
        ``f(result) -> {"name [unit]": number}``.
    progress : bool
        show a progress bar (tqdm; notebook-aware).

    Returns
    -------
    xarray.Dataset
        ``xarray.Dataset`` (see :mod:`pdvoid.sweeps.dataset` for the layout). A point whose parameters are
        impossible (any InputError, e.g. a void taller than the insulation) has NaN metrics and its message in
        the "error" variable; the sweep goes on.

    Raises
    ------
    InputError
        bad arguments or parameter names (checked before anything runs).
    MissingDependencyError
        (an ImportError) xarray, tqdm, joblib or Dask is missing:
        ``pip install "pdvoid[sweep]"``.
    """
    require("xarray")
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    cycles = check_int("cycles", cycles, 1, MAX_CYCLES)
    if metrics is not None and not callable(metrics):
        raise InputError(f"metrics must be None or a function of a Result; got {type(metrics).__name__}")
    plan = make_plan(parameters, design=design, samples=samples, seed=seed)
    check_parameter_names(scenario, plan.names)
    func = partial(run_point, scenario=scenario, cycles=cycles, metrics=metrics)
    items = [(plan.changes(i), int(plan.seeds[i])) for i in range(plan.n_points)]
    outcomes = parallel_map(
        func,
        items,
        client=client,
        workers=workers,
        progress=progress,
        description=f"sweep ({plan.design}, {plan.n_points} points)",
    )
    return assemble(plan, outcomes, scenario=scenario, cycles=cycles, metrics=metrics)
