"""sweep(scenario, parameters, ...) → xarray Dataset: many simulations over a design, wherever they run.

With ``checkpoint=FOLDER`` every finished point is kept on disk as it completes
(:mod:`pdvoid.sweeps.checkpoint`) and ``resume=True`` continues an interrupted sweep;
:func:`sweep_to_file` runs a sweep into a NetCDF file the way ``pdvoid sweep --out`` does.
"""

from __future__ import annotations

import contextlib
import os
from collections.abc import Callable, Mapping
from functools import partial
from pathlib import Path
from typing import TYPE_CHECKING, Any

from pdvoid.core.errors import InputError, check_int
from pdvoid.core.files import FolderLock
from pdvoid.core.optional import require
from pdvoid.inputs.scenario import Scenario
from pdvoid.simulation.parallel import parallel_map
from pdvoid.simulation.simulate import MAX_CYCLES
from pdvoid.sweeps.checkpoint import (
    Checkpoint,
    checkpoint_path,
    clear_files,
    holds_checkpoint,
    metrics_name,
    plan_digest,
)
from pdvoid.sweeps.dataset import _scenario_text, assemble, write_netcdf
from pdvoid.sweeps.metrics import run_point
from pdvoid.sweeps.names import check_parameter_names
from pdvoid.sweeps.plan import Plan, make_plan

if TYPE_CHECKING:
    import xarray

__all__ = ["sweep", "sweep_to_file"]



class _Setup:
    """A checked sweep: the plan, the point function and what identifies the sweep (before anything runs)."""

    def __init__(self, scenario: Scenario, parameters: Mapping[str, Any], cycles: int, seed: int, design: str,
                 samples: int | None, metrics: Callable | None) -> None:
        require("xarray")
        if not isinstance(scenario, Scenario):
            raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
        self.cycles = check_int("cycles", cycles, 1, MAX_CYCLES)
        if metrics is not None and not callable(metrics):
            raise InputError(f"metrics must be None or a function of a Result; got {type(metrics).__name__}")
        self.plan: Plan = make_plan(parameters, design=design, samples=samples, seed=seed)
        check_parameter_names(scenario, self.plan.names)
        self.scenario = scenario
        self.metrics = metrics
        self.func = partial(run_point, scenario=scenario, cycles=self.cycles, metrics=metrics)

    def digest(self) -> str:
        return plan_digest(self.plan, _scenario_text(self.scenario), self.cycles, self.metrics)

    def info(self) -> dict[str, Any]:
        plan = self.plan
        return {"design": plan.design, "parameters": list(plan.names), "cycles": self.cycles,
                "seed": int(plan.seed), "metrics": metrics_name(self.metrics)}

    def run(self, indices: list[int], *, client: Any, workers: int | None, progress: bool,
            store: Checkpoint | None) -> list[Any]:
        plan = self.plan
        items = [(plan.changes(i), int(plan.seeds[i])) for i in indices]
        done = plan.n_points - len(indices)
        description = f"sweep ({plan.design}, {plan.n_points} points" + (f", {done} done before)" if done else ")")
        on_result = None
        if store is not None:
            def on_result(rng: range, values: list[Any]) -> None:
                store.add([indices[k] for k in rng], values)
        try:
            return parallel_map(self.func, items, client=client, workers=workers, progress=progress,
                                description=description, on_result=on_result)
        finally:
            if store is not None:
                # what finished is kept, also on an interrupt or an error; a failing write (a full disk) must not
                # hide the error that stopped the sweep
                with contextlib.suppress(OSError, InputError):
                    store.flush()

    def assemble(self, outcomes: list[Any]) -> xarray.Dataset:
        return assemble(self.plan, outcomes, scenario=self.scenario, cycles=self.cycles, metrics=self.metrics)

    def open_store(self, folder: Path, resume: bool) -> Checkpoint:
        """The checkpoint in ``folder`` (whose lock the caller holds): refused if it is another sweep's."""
        return Checkpoint(folder, self.digest(), self.plan.n_points, self.info(), resume)

    def finish(self, store: Checkpoint, *, client: Any, workers: int | None, progress: bool) -> xarray.Dataset:
        """Run the points ``store`` does not hold yet, storing each as it finishes; the whole Dataset."""
        remaining = store.remaining
        if remaining:
            self.run(remaining, client=client, workers=workers, progress=progress, store=store)
            store.flush()
        return self.assemble(store.outcomes())


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
    checkpoint: str | os.PathLike[str] | None = None,
    resume: bool = False,
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
    checkpoint : str or os.PathLike or None
        a folder in which every finished point is stored as it completes (:mod:`pdvoid.sweeps.checkpoint`),
        locked while the sweep runs; it is kept when the sweep ends (delete it with
        :func:`pdvoid.sweeps.remove_checkpoint`). None stores nothing.
    resume : bool
        continue the sweep stored in ``checkpoint``: only the points not finished there run, and the Dataset
        is identical to that of an uninterrupted sweep. A checkpoint of another sweep (other parameters,
        scenario, cycles, seed, metrics or pdvoid version) is refused; a missing or empty one starts from the
        beginning. With ``resume=False`` a checkpoint folder that holds a sweep is refused. A metric function
        is known by its module and qualified name (:func:`pdvoid.sweeps.checkpoint.metrics_name`), not by its
        code: give a changed function another name before resuming.

    Returns
    -------
    xarray.Dataset
        ``xarray.Dataset`` (see :mod:`pdvoid.sweeps.dataset` for the layout). A point whose parameters are
        impossible (any InputError, e.g. a void taller than the insulation) has NaN metrics and its message in
        the "error" variable; the sweep goes on.

    Raises
    ------
    InputError
        bad arguments or parameter names (checked before anything runs); a checkpoint that holds a sweep
        without ``resume=True``, one of a different sweep, or one that a running sweep holds.
    MissingDependencyError
        (an ImportError) xarray, tqdm, joblib or Dask is missing:
        ``pip install "pdvoid[sweep]"``.
    """
    setup = _Setup(scenario, parameters, cycles, seed, design, samples, metrics)
    if not isinstance(resume, bool):
        raise InputError(f"resume must be True or False; got {resume!r}")
    if checkpoint is None:
        if resume:
            raise InputError("resume=True needs checkpoint= (the folder of the interrupted sweep)")
        outcomes = setup.run(list(range(setup.plan.n_points)), client=client, workers=workers, progress=progress,
                             store=None)
        return setup.assemble(outcomes)
    folder = _checkpoint_folder(checkpoint)
    with FolderLock(folder):
        store = setup.open_store(folder, resume)
        return setup.finish(store, client=client, workers=workers, progress=progress)


def _checkpoint_folder(checkpoint: str | os.PathLike[str]) -> Path:
    if not isinstance(checkpoint, (str, os.PathLike)) or isinstance(checkpoint, bytes):
        raise InputError(f"checkpoint must be a folder path or None; got {type(checkpoint).__name__}")
    folder = Path(checkpoint)
    if folder.exists() and not folder.is_dir():
        raise InputError(f"checkpoint {folder}: exists and is not a folder")
    return folder


def _check_target(out: Path, parts: Path, resume: bool, overwrite: bool) -> None:
    """Refuse what would lose or mix work: an existing file or checkpoint without resume or overwrite."""
    if out.is_dir():
        raise InputError(f"{out}: is a folder; give a file name such as results.nc")
    if parts.exists() and not parts.is_dir():
        raise InputError(f"{parts}: exists and is not a folder (the checkpoint of {out.name} goes there)")
    if overwrite:
        return
    if resume:
        if out.exists() and not holds_checkpoint(parts):
            raise InputError(f"{out} exists and there is no interrupted sweep to resume in {parts}; give "
                             "overwrite (--force) to run it again")
        return
    if holds_checkpoint(parts):
        raise InputError(f"{parts} holds an interrupted sweep of {out.name}: resume it (--resume), or give "
                         "overwrite (--force) to start over")
    if out.exists():
        raise InputError(f"{out} exists; give overwrite (--force) to replace it, or choose another file")


def _with_resume_hint(exc: OSError | InputError, store: Checkpoint) -> OSError | InputError:
    """The same error, saying that the finished points are kept and how to continue."""
    hint = (f"{len(store.done)} of {store.points} points are kept in {store.folder}; continue with resume=True "
            "(pdvoid sweep ... --resume)")
    if isinstance(exc, InputError):
        return InputError(f"{exc}; {hint}")
    return OSError(exc.errno, f"{exc.strerror or exc}; {hint}", exc.filename)


def sweep_to_file(
    scenario: Scenario,
    parameters: Mapping[str, Any],
    out: str | os.PathLike[str],
    cycles: int = 1000,
    seed: int = 0,
    *,
    design: str = "grid",
    samples: int | None = None,
    client: Any = None,
    workers: int | None = None,
    metrics: Callable | None = None,
    progress: bool = True,
    resume: bool = False,
    overwrite: bool = False,
    engine: str = "scipy",
) -> xarray.Dataset:
    """Run a sweep into a NetCDF file, keeping every finished point in ``OUT.parts`` until the file is written.

    What ``pdvoid sweep --out`` does. Before anything runs, an existing ``out`` or an existing checkpoint is
    refused unless ``resume`` or ``overwrite`` says what to do with it. The checkpoint folder ``OUT.parts``
    (:func:`pdvoid.sweeps.checkpoint.checkpoint_path`) is locked while the sweep runs, so a second sweep aimed
    at the same file is refused. The NetCDF file is written whole to a temporary name and renamed into place
    (a full disk or a kill leaves the previous file as it was); the checkpoint is removed only after that.

    Parameters
    ----------
    scenario, parameters, cycles, seed, design, samples, client, workers, metrics, progress
        As for :func:`sweep`.
    out : str or os.PathLike
        The NetCDF file to write [-].
    resume : bool
        Continue the interrupted sweep in ``OUT.parts`` (refused if it is another sweep); without a checkpoint
        it starts from the beginning, but an existing ``out`` is then refused. ``out`` is replaced at the end.
    overwrite : bool
        Start over: delete a checkpoint in ``OUT.parts`` and replace ``out`` at the end.
    engine : str
        As for :func:`pdvoid.sweeps.write_netcdf` [-].

    Returns
    -------
    xarray.Dataset
        The Dataset written, identical whether the sweep ran at once or was resumed.

    Raises
    ------
    InputError
        Everything :func:`sweep` refuses; ``out`` or ``OUT.parts`` present without ``resume`` or
        ``overwrite``; both ``resume`` and ``overwrite``; a folder of ``out`` that does not exist; a sweep
        already writing to ``out``; a NetCDF file that cannot be written.
    """
    setup = _Setup(scenario, parameters, cycles, seed, design, samples, metrics)
    for name, flag in (("resume", resume), ("overwrite", overwrite)):
        if not isinstance(flag, bool):
            raise InputError(f"{name} must be True or False; got {flag!r}")
    if resume and overwrite:
        raise InputError("give resume or overwrite, not both: resume continues the sweep, overwrite starts over")
    if not isinstance(out, (str, os.PathLike)) or isinstance(out, bytes):
        raise InputError(f"out must be a file path; got {type(out).__name__}")
    target = Path(out)
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(f"{target}: the folder {folder} does not exist")
    parts = checkpoint_path(target)
    _check_target(target, parts, resume, overwrite)  # before the lock creates the checkpoint folder
    created = not parts.exists()
    try:
        with FolderLock(parts):
            _check_target(target, parts, resume, overwrite)  # again under the lock: another sweep may have ended
            if overwrite:
                clear_files(parts)
            store = setup.open_store(parts, resume)
            try:
                ds = setup.finish(store, client=client, workers=workers, progress=progress)
                write_netcdf(ds, target, engine=engine)
            except (OSError, InputError) as exc:
                raise _with_resume_hint(exc, store) from None
            clear_files(parts)
        with contextlib.suppress(OSError):
            parts.rmdir()
    except InputError:
        if created and parts.is_dir() and not any(parts.iterdir()):
            with contextlib.suppress(OSError):
                parts.rmdir()
        raise
    return ds
