"""Sweep checkpoints: every finished point is kept on disk as it completes, so an interrupted sweep resumes.

A checkpoint is a folder (``results.nc.parts`` beside the file of ``pdvoid sweep --out results.nc``) holding:

- ``plan.json``, written first: what the sweep is (``plan_sha256``, the SHA-256 of the plan, the base
  scenario, the cycles, the master seed, the metric function and the pdvoid version; the number of points);
- ``part-000000.json``, ``part-000001.json``, ...: each a batch of finished points (their flat indices and
  their outcomes, the metric values and the failure reason), with the ``plan_sha256`` they belong to;
- ``.pdvoid.lock`` while a sweep writes into it (:class:`pdvoid.core.files.FolderLock`): a second sweep
  aimed at the same checkpoint is refused.

Every file is written whole to a temporary name and renamed into place (:func:`pdvoid.core.files.atomic_write`),
so a kill, a full disk or an interrupt leaves each part either complete or absent. Numbers are stored as JSON
numbers in Python's shortest round-trip form, so a point read back is bit for bit the point computed: a resumed
sweep's Dataset is identical to an uninterrupted one. A checkpoint whose ``plan_sha256`` differs from the sweep
being resumed, a part of another sweep, a malformed part or a point stored twice is refused with an
:class:`pdvoid.InputError` ("incomplete or mixed checkpoint").
"""

from __future__ import annotations

import contextlib
import functools
import hashlib
import json
import os
import re
import time
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import Any

import numpy as np

from pdvoid._version import __version__
from pdvoid.core.errors import InputError
from pdvoid.core.files import FolderLock, atomic_write
from pdvoid.sweeps.plan import Plan

__all__ = [
    "PLAN_NAME",
    "Checkpoint",
    "checkpoint_path",
    "checkpoint_progress",
    "metrics_name",
    "plan_digest",
    "remove_checkpoint",
]

PLAN_NAME = "plan.json"
CHECKPOINT_FORMAT = "pdvoid-sweep-checkpoint"
CHECKPOINT_VERSION = 1
_PART = re.compile(r"^part-(\d{6,})\.json$")
#: largest plan or part file read back [bytes]
_MAX_FILE_BYTES = 1 << 30
#: a batch of finished points is written at most this often [s] (and always when the sweep stops)
FLUSH_SECONDS = 0.5

Outcome = tuple[dict[str, float], str]


def checkpoint_path(out: str | os.PathLike[str]) -> Path:
    """The checkpoint folder of a sweep written to ``out``: the same name with ``.parts`` appended.

    Parameters
    ----------
    out : str or os.PathLike
        The NetCDF file of the sweep, e.g. ``results.nc``.

    Returns
    -------
    pathlib.Path
        E.g. ``results.nc.parts``, in the same folder.
    """
    p = Path(out)
    return p.with_name(p.name + ".parts")


def metrics_name(metrics: Callable | None) -> str:
    """A stable name of a sweep's metric function, the same in every process (no memory addresses).

    Parameters
    ----------
    metrics : callable or None
        The metric function; None for the default metrics.

    Returns
    -------
    str
        ``"default"``; ``module.qualname`` for a function; for a ``functools.partial`` the function's name and
        its bound arguments; for another callable object its type's ``module.qualname``.
    """
    if metrics is None:
        return "default"
    if isinstance(metrics, functools.partial):
        return f"partial({metrics_name(metrics.func)}, args={metrics.args!r}, keywords={metrics.keywords!r})"
    qualname = getattr(metrics, "__qualname__", None)
    if isinstance(qualname, str):
        return f"{getattr(metrics, '__module__', '?')}.{qualname}"
    return f"{type(metrics).__module__}.{type(metrics).__qualname__} instance"


def plan_digest(plan: Plan, scenario_text: str, cycles: int, metrics: Callable | None) -> str:
    """SHA-256 of everything that decides a sweep's Dataset: a checkpoint resumes only the same sweep.

    Parameters
    ----------
    plan : Plan
        The points, their values and seeds [-].
    scenario_text : str
        The base scenario in its scenario-file (TOML) form [-].
    cycles : int
        AC cycles per point [-].
    metrics : callable or None
        The metric function (named by :func:`metrics_name`) [-].

    Returns
    -------
    str
        64 hexadecimal digits; it covers the design, parameter names, every point's values and seed, the grid
        shape, the sampling bounds, the master seed, the cycles, the scenario, the metrics and the pdvoid
        version.
    """
    h = hashlib.sha256()

    def put(label: str, data: bytes) -> None:
        h.update(label.encode("utf-8"))
        h.update(len(data).to_bytes(8, "little"))
        h.update(data)

    put("format", f"{CHECKPOINT_FORMAT} {CHECKPOINT_VERSION}".encode())
    put("pdvoid", __version__.encode())
    put("design", plan.design.encode())
    put("seed", str(int(plan.seed)).encode())
    put("cycles", str(int(cycles)).encode())
    put("metrics", metrics_name(metrics).encode())
    put("scenario", scenario_text.encode("utf-8"))
    put("shape", repr(tuple(int(s) for s in plan.shape)).encode())
    for name in plan.names:
        arr = np.ascontiguousarray(plan.values[name])
        put("name", name.encode("utf-8"))
        put("dtype", arr.dtype.str.encode())
        put("values", arr.tobytes())
    put("bounds", repr(sorted((k, float(a), float(b)) for k, (a, b) in plan.bounds.items())).encode())
    put("log_scale", repr(tuple(plan.log_scale)).encode())
    put("seeds", np.ascontiguousarray(plan.seeds, dtype="<i4").tobytes())
    return h.hexdigest()


def _head(folder: Path) -> str:
    return f"{folder}: incomplete or mixed checkpoint"


def _read_json(path: Path, folder: Path) -> Any:
    try:
        if path.stat().st_size > _MAX_FILE_BYTES:
            raise InputError(f"{_head(folder)}: {path.name} is larger than {_MAX_FILE_BYTES} bytes")
        with open(path, "rb") as fh:
            return json.loads(fh.read().decode("utf-8"))
    except (OSError, UnicodeDecodeError, json.JSONDecodeError, RecursionError) as exc:
        raise InputError(f"{_head(folder)}: {path.name} is unreadable ({exc})") from None


def _read_plan(folder: Path) -> dict[str, Any] | None:
    path = folder / PLAN_NAME
    if not path.is_file():
        return None
    doc = _read_json(path, folder)
    if (
        not isinstance(doc, dict)
        or doc.get("format") != CHECKPOINT_FORMAT
        or not isinstance(doc.get("plan_sha256"), str)
        or isinstance(doc.get("points"), bool)
        or not isinstance(doc.get("points"), int)
        or doc["points"] < 0
    ):
        raise InputError(f"{_head(folder)}: {PLAN_NAME} is not a pdvoid sweep checkpoint plan")
    if doc.get("format_version") != CHECKPOINT_VERSION:
        raise InputError(
            f"{_head(folder)}: {PLAN_NAME} has format version {doc.get('format_version')!r}; this pdvoid reads "
            f"version {CHECKPOINT_VERSION}"
        )
    return doc


def _part_files(folder: Path) -> list[Path]:
    return sorted((p for p in folder.iterdir() if _PART.match(p.name)), key=lambda p: p.name)


def _leftovers(folder: Path) -> list[Path]:
    """Temporary files of writes that were killed before their rename (never read)."""
    return [p for p in folder.iterdir() if p.name.startswith(".") and p.name.endswith(".part")]


def _outcome(entry: Any, where: str) -> Outcome:
    if (
        not isinstance(entry, list)
        or len(entry) != 2
        or not isinstance(entry[0], dict)
        or not isinstance(entry[1], str)
    ):
        raise InputError(f"{where}: an outcome must be [{{metric: number}}, error text]; got {entry!r:.200}")
    values = {}
    for key, v in entry[0].items():
        if isinstance(v, bool) or not isinstance(v, (int, float)):
            raise InputError(f"{where}: metric {key!r} is not a number: {v!r:.100}")
        values[key] = float(v)
    return values, entry[1]


def _read_parts(folder: Path, digest: str, n: int) -> dict[int, Outcome]:
    done: dict[int, Outcome] = {}
    for path in _part_files(folder):
        where = f"{_head(folder)}: {path.name}"
        doc = _read_json(path, folder)
        if not isinstance(doc, dict) or doc.get("format") != CHECKPOINT_FORMAT:
            raise InputError(f"{where} is not a part of a pdvoid sweep checkpoint")
        if doc.get("plan_sha256") != digest:
            raise InputError(f"{where} belongs to another sweep (its plan_sha256 differs from {PLAN_NAME})")
        indices, outcomes = doc.get("indices"), doc.get("outcomes")
        if not isinstance(indices, list) or not isinstance(outcomes, list) or len(indices) != len(outcomes):
            raise InputError(f"{where}: indices and outcomes must be lists of the same length")
        for i, entry in zip(indices, outcomes, strict=True):
            if isinstance(i, bool) or not isinstance(i, int) or not 0 <= i < n:
                raise InputError(f"{where}: point index {i!r} is not in 0..{n - 1}")
            if i in done:
                raise InputError(f"{where}: point {i} is stored twice")
            done[i] = _outcome(entry, where)
    return done


def checkpoint_progress(path: str | os.PathLike[str]) -> tuple[int, int] | None:
    """How far the sweep in a checkpoint folder got.

    Parameters
    ----------
    path : str or os.PathLike
        The checkpoint folder.

    Returns
    -------
    tuple of (int, int) or None
        (finished points, points of the sweep); None when the folder does not exist or holds no plan yet (a
        sweep stopped before it wrote one: nothing to resume).

    Raises
    ------
    InputError
        "incomplete or mixed checkpoint" for a malformed plan or part, a part of another sweep or a point
        stored twice.
    """
    folder = Path(path)
    if not folder.is_dir():
        return None
    doc = _read_plan(folder)
    if doc is None:
        if _part_files(folder):
            raise InputError(f"{_head(folder)}: parts without a {PLAN_NAME}")
        return None
    return len(_read_parts(folder, doc["plan_sha256"], doc["points"])), int(doc["points"])


def remove_checkpoint(path: str | os.PathLike[str]) -> None:
    """Delete a checkpoint folder written by a sweep: its parts first, the plan last, then the folder.

    Only the files a checkpoint holds are removed (parts, plan, the temporary files of interrupted writes and a
    lock left by a process that no longer runs); the folder itself goes when nothing else is left in it.

    Parameters
    ----------
    path : str or os.PathLike
        The checkpoint folder; nothing happens when it does not exist.

    Raises
    ------
    InputError
        When a live sweep holds the folder's lock, or the path is not a folder.
    """
    folder = Path(path)
    if not folder.exists():
        return
    if not folder.is_dir():
        raise InputError(f"{folder}: is not a checkpoint folder")
    with FolderLock(folder):
        clear_files(folder)
    with contextlib.suppress(OSError):
        folder.rmdir()


def clear_files(folder: Path) -> None:
    """Remove the parts (first), the leftovers and the plan (last): a kill midway leaves a resumable state."""
    for p in _part_files(folder) + _leftovers(folder):
        p.unlink(missing_ok=True)
    (folder / PLAN_NAME).unlink(missing_ok=True)


class Checkpoint:
    """The finished points of one sweep in a checkpoint folder; the caller holds the folder's lock.

    Parameters
    ----------
    folder : str or os.PathLike
        The checkpoint folder (it exists: the lock was taken in it).
    digest : str
        The sweep's :func:`plan_digest`.
    points : int
        The number of points of the sweep [-].
    info : dict
        What the sweep is, stored in the plan file for people reading it (JSON-serialisable).
    resume : bool
        True to keep the points a previous run finished (their plan must match ``digest``); False requires the
        folder to hold no checkpoint.

    Raises
    ------
    InputError
        Resuming a checkpoint of another sweep, or ``resume=False`` with a checkpoint present; a malformed
        checkpoint.
    """

    def __init__(self, folder: str | os.PathLike[str], digest: str, points: int, info: dict[str, Any],
                 resume: bool) -> None:
        self.folder = Path(folder)
        self.digest = digest
        self.points = int(points)
        self._buffer: list[tuple[int, Outcome]] = []
        self._last_flush = time.monotonic()
        doc = _read_plan(self.folder)
        parts = _part_files(self.folder)
        if doc is None and parts:
            raise InputError(f"{_head(self.folder)}: parts without a {PLAN_NAME}")
        if doc is not None and not resume:
            done = len(_read_parts(self.folder, doc["plan_sha256"], doc["points"]))
            raise InputError(
                f"{self.folder} holds an interrupted sweep ({done} of {doc['points']} points finished): resume "
                "it, or remove the checkpoint to start over"
            )
        if doc is not None and doc["plan_sha256"] != digest:
            raise InputError(
                f"{self.folder} holds a checkpoint of a different sweep (the plan, base scenario, cycles, seed, "
                "metrics or pdvoid version differ): it cannot be resumed with these settings; remove it to "
                "start over"
            )
        for p in _leftovers(self.folder):
            p.unlink(missing_ok=True)
        if doc is None:
            plan_doc = {"format": CHECKPOINT_FORMAT, "format_version": CHECKPOINT_VERSION, "plan_sha256": digest,
                        "points": self.points, "pdvoid_version": __version__, **info}
            with atomic_write(self.folder / PLAN_NAME, "w", encoding="utf-8", newline="\n") as fh:
                json.dump(plan_doc, fh, indent=2)
                fh.write("\n")
            self.done: dict[int, Outcome] = {}
        else:
            self.done = _read_parts(self.folder, digest, self.points)
        self._next = 1 + max((int(_PART.match(p.name).group(1)) for p in parts), default=-1)  # type: ignore[union-attr]

    @property
    def remaining(self) -> list[int]:
        """Flat indices of the points not finished yet, in plan order [-]."""
        return [i for i in range(self.points) if i not in self.done]

    def add(self, indices: Sequence[int], outcomes: Sequence[Outcome]) -> None:
        """Record finished points; they are written at most every ``FLUSH_SECONDS`` (see :meth:`flush`).

        Parameters
        ----------
        indices : sequence of int
            Flat indices of the points [-].
        outcomes : sequence of (dict, str)
            Their (metrics, error) outcomes [-].
        """
        for i, o in zip(indices, outcomes, strict=True):
            self.done[int(i)] = o
            self._buffer.append((int(i), o))
        if time.monotonic() - self._last_flush >= FLUSH_SECONDS:
            self.flush()

    def flush(self) -> None:
        """Write the points recorded since the last flush as one new part file (atomically)."""
        if not self._buffer:
            return
        doc = {"format": CHECKPOINT_FORMAT, "plan_sha256": self.digest,
               "indices": [i for i, _ in self._buffer],
               "outcomes": [[values, err] for _, (values, err) in self._buffer]}
        text = json.dumps(doc, separators=(",", ":"))
        with atomic_write(self.folder / f"part-{self._next:06d}.json", "w", encoding="utf-8", newline="\n") as fh:
            fh.write(text)
        self._next += 1
        self._buffer.clear()
        self._last_flush = time.monotonic()

    def outcomes(self) -> list[Outcome]:
        """Every point's outcome in plan order (all points must be finished).

        Returns
        -------
        list of (dict, str)
            (metrics, error) per point [-].

        Raises
        ------
        InputError
            When points are missing.
        """
        missing = self.points - len(self.done)
        if missing:
            raise InputError(f"{self.folder}: {missing} of {self.points} points are not finished")
        return [self.done[i] for i in range(self.points)]

    def clear(self) -> None:
        """Remove this checkpoint's files (parts first, plan last); the lock stays with its holder."""
        clear_files(self.folder)


def holds_checkpoint(folder: Path) -> bool:
    """True when ``folder`` holds a plan or parts (anything to resume), False for a missing or empty folder."""
    if not folder.is_dir():
        return False
    return (folder / PLAN_NAME).exists() or bool(_part_files(folder))

