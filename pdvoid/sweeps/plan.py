"""Sweep designs: which parameter values each point of a sweep runs with, and the seed of every point.

Three designs:

- ``grid``: every combination of the listed values (one dimension per parameter, first parameter slowest);
- ``random``: ``samples`` points drawn uniformly inside (low, high) bounds;
- ``lhs``: a Latin hypercube of ``samples`` points inside the bounds
  (:class:`scipy.stats.qmc.LatinHypercube`): each parameter's range is cut into ``samples`` equal strata and
  every stratum holds exactly one point.

Bounds may carry a third entry ``"log"`` to sample uniformly in the logarithm (rates spanning decades).

Seeds: one master seed makes everything. Point ``i`` simulates with
``SeedSequence(seed).spawn(n)[i].generate_state(1)[0] >> 1`` (a 31-bit integer, so that it fits the 32-bit
signed integers of NetCDF-3 files); the random and Latin-hypercube samplers draw from
``default_rng(SeedSequence(seed))``, the root of the same tree, whose stream is independent of its children.
A point's seed depends only on the master seed and its index, never on who runs it or in which order.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np
from scipy.stats import qmc

from pdvoid.core.errors import InputError, check_int, check_real
from pdvoid.inputs.parameters import check_seed

__all__ = [
    "Plan",
    "DESIGNS",
    "MAX_POINTS",
    "grid_plan",
    "random_plan",
    "lhs_plan",
    "make_plan",
    "point_seeds",
]

DESIGNS = ("grid", "random", "lhs")
MAX_POINTS = 10_000_000


@dataclass(frozen=True, eq=False)
class Plan:
    """The points of a sweep.

    Attributes
    ----------
    design : str
        "grid", "random" or "lhs".
    names : tuple[str, ...]
        swept parameters as dotted scenario paths, e.g. ("void.diameter", "void.pressure").
    shape : tuple[int, ...]
        grid: the number of values of each parameter; random/lhs: (samples,).
    values : dict[str, numpy.ndarray]
        per parameter, its value at every point (flat, length n_points, grid in C order) [SI].
    axes : dict[str, numpy.ndarray]
        grid only: the listed values of each parameter [SI].
    bounds : dict[str, tuple[float, float]]
        random/lhs only: (low, high) of each parameter [SI].
    log_scale : tuple[str, ...]
        names sampled uniformly in the logarithm.
    seed : int
        the master seed [-].
    seeds : numpy.ndarray
        the simulation seed of every point (flat, int32) [-].
    """

    design: str
    names: tuple[str, ...]
    shape: tuple[int, ...]
    values: dict[str, np.ndarray]
    seed: int
    seeds: np.ndarray
    axes: dict[str, np.ndarray] = field(default_factory=dict)
    bounds: dict[str, tuple[float, float]] = field(default_factory=dict)
    log_scale: tuple[str, ...] = ()

    @property
    def n_points(self) -> int:
        """Number of points [-]."""
        return int(self.seeds.size)

    def changes(self, index: int) -> dict[str, object]:
        """The dotted-path changes of one point as plain Python values (for ``Scenario.replace``).

        Parameters
        ----------
        index : int
            Flat index of the point, 0 ... n_points − 1 [-].

        Returns
        -------
        dict of str to object
            {dotted name: value} [SI].
        """
        return {name: self.values[name][index].item() for name in self.names}


def point_seeds(seed: int, n: int) -> np.ndarray:
    """The simulation seeds of points 0..n-1: ``SeedSequence(seed).spawn(n)[i].generate_state(1)[0] >> 1``.

    Parameters
    ----------
    seed : int
        master seed [-], 0 to 2**32 - 1.
    n : int
        number of points [-].

    Returns
    -------
    numpy.ndarray
        int32 array of seeds in [0, 2**31 - 1] [-].
    """
    seed = check_seed(seed)
    n = check_int("n", n, 0, MAX_POINTS)
    children = np.random.SeedSequence(seed).spawn(n)
    return np.array([int(c.generate_state(1, dtype=np.uint32)[0]) >> 1 for c in children], dtype=np.int32)


def _check_names(parameters: Mapping) -> tuple[str, ...]:
    if not isinstance(parameters, Mapping) or not parameters:
        raise InputError(
            f"parameters must be a non-empty mapping like {{'void.diameter': [...]}}; got {parameters!r}"
        )
    names = tuple(parameters)
    for name in names:
        if not isinstance(name, str) or name.count(".") != 1 or not all(name.split(".")):
            raise InputError(f"parameter names look like 'void.diameter'; got {name!r}")
    return names


def _axis(name: str, values: object) -> np.ndarray:
    """One grid axis: all numbers (→ float), all text, or all True/False; finite, distinct, non-empty."""
    if isinstance(values, (str, bytes)) or not isinstance(values, (Sequence, np.ndarray)):
        raise InputError(f"{name}: grid values must be a list of values; got {values!r}")
    items = list(np.asarray(values, dtype=object).ravel()) if isinstance(values, np.ndarray) else list(values)
    if not items:
        raise InputError(f"{name}: the list of grid values is empty")
    if all(isinstance(v, (bool, np.bool_)) for v in items):
        arr = np.array(items, dtype=bool)
    elif all(isinstance(v, str) for v in items):
        arr = np.array(items, dtype=str)
    elif all(
        isinstance(v, (int, float, np.integer, np.floating)) and not isinstance(v, (bool, np.bool_))
        for v in items
    ):
        arr = np.array([check_real(f"{name}[{i}]", v) for i, v in enumerate(items)], dtype=float)
    else:
        raise InputError(
            f"{name}: grid values must be all numbers, all text or all True/False; got {items!r}"
        )
    if len(set(arr.tolist())) != arr.size:
        raise InputError(f"{name}: grid values must be distinct; got {items!r}")
    return arr


def grid_plan(parameters: Mapping[str, Sequence], seed: int = 0) -> Plan:
    """Every combination of the listed values.

    Parameters
    ----------
    parameters : Mapping[str, Sequence]
        {dotted name: list of values} [SI], e.g. {"void.diameter": [0.5e-3, 1e-3]}; numbers, text
        (e.g. "void.gas") or True/False.
    seed : int
        master seed [-].

    Returns
    -------
    Plan
        :class:`Plan` with one dimension per parameter; the first parameter varies slowest.
    """
    names = _check_names(parameters)
    seed = check_seed(seed)
    axes = {name: _axis(name, parameters[name]) for name in names}
    shape = tuple(a.size for a in axes.values())
    n = math.prod(shape)
    if n > MAX_POINTS:
        raise InputError(f"the grid has {n} points; at most {MAX_POINTS} are allowed")
    mesh = np.meshgrid(*axes.values(), indexing="ij")
    values = {name: m.ravel() for name, m in zip(names, mesh, strict=True)}
    return Plan(
        design="grid",
        names=names,
        shape=shape,
        values=values,
        seed=seed,
        seeds=point_seeds(seed, n),
        axes=axes,
    )


def _bounds(name: str, spec: object) -> tuple[float, float, bool]:
    if (
        not isinstance(spec, (tuple, list))
        or len(spec) not in (2, 3)
        or (len(spec) == 3 and spec[2] not in ("log", "linear"))
    ):
        raise InputError(f"{name}: bounds must be (low, high) or (low, high, 'log'); got {spec!r}")
    low = check_real(f"{name} low bound", spec[0])
    high = check_real(f"{name} high bound", spec[1])
    if not low < high:
        raise InputError(f"{name}: the low bound must be below the high bound; got ({low!r}, {high!r})")
    log = len(spec) == 3 and spec[2] == "log"
    if log and low <= 0.0:
        raise InputError(f"{name}: log-scale bounds must be > 0; got low = {low!r}")
    return low, high, log


def _sampled_plan(design: str, bounds: Mapping, samples: int, seed: int) -> Plan:
    names = _check_names(bounds)
    seed = check_seed(seed)
    samples = check_int("samples", samples, 1, MAX_POINTS)
    spec = {name: _bounds(name, bounds[name]) for name in names}
    rng = np.random.default_rng(np.random.SeedSequence(seed))
    d = len(names)
    if design == "lhs":
        unit = qmc.LatinHypercube(d=d, rng=rng).random(samples)
    else:
        unit = rng.random((samples, d))
    lo = np.array([math.log(s[0]) if s[2] else s[0] for s in spec.values()])
    hi = np.array([math.log(s[1]) if s[2] else s[1] for s in spec.values()])
    scaled = qmc.scale(unit, lo, hi)
    values = {}
    for j, (name, (low, high, log)) in enumerate(spec.items()):
        col = np.exp(scaled[:, j]) if log else scaled[:, j]
        values[name] = np.clip(col, low, high)  # exp(log(x)) may round one ulp past a bound
    return Plan(
        design=design,
        names=names,
        shape=(samples,),
        values=values,
        seed=seed,
        seeds=point_seeds(seed, samples),
        bounds={n: (s[0], s[1]) for n, s in spec.items()},
        log_scale=tuple(n for n, s in spec.items() if s[2]),
    )


def random_plan(bounds: Mapping[str, tuple], samples: int, seed: int = 0) -> Plan:
    """``samples`` points drawn independently and uniformly inside the bounds.

    Parameters
    ----------
    bounds : Mapping[str, tuple]
        {dotted name: (low, high)} or (low, high, "log") [SI].
    samples : int
        number of points [-].
    seed : int
        master seed [-].

    Returns
    -------
    Plan
        The points (flat, length ``samples``) and their seeds.
    """
    return _sampled_plan("random", bounds, samples, seed)


def lhs_plan(bounds: Mapping[str, tuple], samples: int, seed: int = 0) -> Plan:
    """A Latin hypercube: each parameter's range in ``samples`` equal strata, each stratum hit exactly once.

    Parameters
    ----------
    bounds : Mapping[str, tuple]
        {dotted name: (low, high)} or (low, high, "log") [SI]; strata are equal in the logarithm for
        "log".
    samples : int
        number of points [-].
    seed : int
        master seed [-].

    Returns
    -------
    Plan
        The points (flat, length ``samples``) and their seeds.

    References
    ----------
    [mckay1979] McKay, Beckman and Conover (1979), "A comparison of three methods for selecting values of input
    variables in the analysis of output from a computer code", Technometrics 21(2), 239-245 (the design);
    implemented by :class:`scipy.stats.qmc.LatinHypercube` (scrambled: a random position inside each
    stratum).
    """
    return _sampled_plan("lhs", bounds, samples, seed)


def make_plan(
    parameters: Mapping, *, design: str = "grid", samples: int | None = None, seed: int = 0
) -> Plan:
    """The plan for ``design``: grid takes value lists (no ``samples``); random/lhs: bounds and samples.

    Parameters
    ----------
    parameters : Mapping
        Grid: {dotted name: list of values} [SI]; random/lhs: {dotted name: (low, high)} or
        (low, high, "log") [SI].
    design : str
        "grid", "random" or "lhs" [-].
    samples : int or None
        Number of points for random/lhs; None for grid [-].
    seed : int
        Master seed [-].

    Returns
    -------
    Plan
        The points and their seeds.

    Raises
    ------
    InputError
        For an unknown design, ``samples`` with a grid or without random/lhs, or bad parameters.
    """
    if design not in DESIGNS:
        raise InputError(f"design must be one of {', '.join(map(repr, DESIGNS))}; got {design!r}")
    if design == "grid":
        if samples is not None:
            raise InputError(
                f"samples applies to the random and lhs designs only; got samples={samples!r} with "
                "design='grid'"
            )
        return grid_plan(parameters, seed)
    if samples is None:
        raise InputError(f"design={design!r} needs samples (the number of points)")
    return _sampled_plan(design, parameters, samples, seed)
