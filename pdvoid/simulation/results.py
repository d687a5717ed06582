"""The immutable Result of a simulation, and its open file format (NPZ arrays + JSON metadata)."""

from __future__ import annotations

import json
import math
import os
import zipfile
from dataclasses import dataclass
from pathlib import Path
from typing import cast

import numpy as np

from pdvoid.coefficients import Coefficients, compute_coefficients
from pdvoid.core.errors import InputError
from pdvoid.core.files import atomic_write, check_run_file
from pdvoid.inputs.scenario import Scenario
from pdvoid.simulation.events import Events

__all__ = ["Result", "Histogram", "load"]

_FORMAT = "pdvoid-result"
_FORMAT_VERSION = 1
_EVENT_FIELDS = ("time", "phase_deg", "cycle", "charge", "voltage", "field_before", "field_after")
_CSV_HEADER = {
    "time": "time [s]", "phase_deg": "phase [deg]", "cycle": "cycle [-]", "charge": "charge [C]",
    "voltage": "voltage [V]", "field_before": "field_before [V/m]", "field_after": "field_after [V/m]",
}
MAX_RESULT_FILE = 4 * 1024**3  # bytes


@dataclass(frozen=True, eq=False)
class Histogram:
    """Phase-resolved counts accumulated inside the kernel (histogram-only runs).

    counts[i, j]: events in phase bin i (edges phase_edges_deg [deg]) and charge bin j (edges charge_edges [C]);
    below / above: events whose charge fell outside the charge edges (counted, never dropped silently).

    Attributes
    ----------
    counts : numpy.ndarray
        Counts per (phase bin, charge bin), int64 [-].
    phase_edges_deg : numpy.ndarray
        Phase bin edges over 0..360 [deg].
    charge_edges : numpy.ndarray
        Signed apparent-charge bin edges, increasing [C].
    below, above : int
        Events with a charge below the first or above the last edge [-].
    """

    counts: np.ndarray
    phase_edges_deg: np.ndarray
    charge_edges: np.ndarray
    below: int = 0
    above: int = 0


@dataclass(frozen=True, eq=False)
class Result:
    """What one simulation produced: the events, the scenario, the seed, the package version and references.

    Event arrays (SI): time [s], phase_deg [deg], cycle [-], charge [C] (apparent, signed), voltage [V] (applied,
    at each event), field_before / field_after [V/m] (in the void). In histogram-only runs the event arrays are
    empty and ``histogram`` plus the IEC 60270 sums hold the outcome.

    Attributes
    ----------
    events : Events
        The discharge events (empty in histogram-only runs).
    scenario : Scenario
        The scenario simulated.
    seed : int
        Seed of the random generator [-].
    cycles : int
        Cycles simulated [-].
    requested_cycles : int
        Cycles asked for [-]; more than ``cycles`` when the run was stopped early.
    version : str
        pdvoid version that produced the result.
    references : tuple of str
        Bibliography keys the scenario relied on (:func:`pdvoid.cite`).
    histogram : Histogram or None
        Phase-resolved counts of a histogram-only run, else None.
    event_count : int
        Number of discharges, also in histogram-only runs [-].
    sum_abs_charge : float
        Σ |q| over all discharges [C].
    sum_charge_squared : float
        Σ q² over all discharges [C²].
    sum_charge_voltage : float
        Σ q·u over all discharges (signed), u the applied voltage at the discharge [C·V].
    first_discharge_time : float
        Time of the first discharge from the start of the run [s], also in histogram-only runs; NaN when the run
        had none (or, for a histogram-only file written before this field existed, when it is unknown).
    """

    events: Events
    scenario: Scenario
    seed: int
    cycles: int
    requested_cycles: int
    version: str
    references: tuple[str, ...]
    histogram: Histogram | None
    event_count: int
    sum_abs_charge: float
    sum_charge_squared: float
    sum_charge_voltage: float
    first_discharge_time: float = math.nan

    # event arrays, straight from the events
    @property
    def time(self) -> np.ndarray:
        """Event times from the start of the run [s]."""
        return cast(np.ndarray, self.events.time)  # Events fills every array in __post_init__

    @property
    def phase_deg(self) -> np.ndarray:
        """Event phases from the positive-going zero crossing of the supply [deg], in [0, 360)."""
        return self.events.phase_deg

    @property
    def cycle(self) -> np.ndarray:
        """Index of the AC cycle of each event [-] (whole numbers as floats)."""
        return cast(np.ndarray, self.events.cycle)  # Events fills every array in __post_init__

    @property
    def charge(self) -> np.ndarray:
        """Apparent charge of each event, signed [C]."""
        return self.events.charge

    @property
    def voltage(self) -> np.ndarray:
        """Applied voltage at each event [V]."""
        return cast(np.ndarray, self.events.voltage)  # Events fills every array in __post_init__

    @property
    def field_before(self) -> np.ndarray:
        """Void field just before each event [V/m]."""
        return cast(np.ndarray, self.events.field_before)  # Events fills every array in __post_init__

    @property
    def field_after(self) -> np.ndarray:
        """Void field just after each event [V/m]."""
        return cast(np.ndarray, self.events.field_after)  # Events fills every array in __post_init__

    @property
    def frequency(self) -> float:
        """Supply frequency [Hz]."""
        return self.events.frequency

    @property
    def duration(self) -> float:
        """Simulated time [s]."""
        return self.cycles / self.events.frequency

    @property
    def complete(self) -> bool:
        """False when the run was stopped before all requested cycles."""
        return self.cycles == self.requested_cycles

    @property
    def discharges_per_cycle(self) -> float:
        """Mean number of discharges per simulated cycle [-] (0 when no cycle ran)."""
        return self.event_count / self.cycles if self.cycles else 0.0

    def coefficients(self) -> Coefficients:
        """The coefficients of the result's scenario (recomputed; the same as at simulation time).

        Returns
        -------
        Coefficients
            See :func:`pdvoid.compute_coefficients`.
        """
        return compute_coefficients(self.scenario)

    # ---- files -------------------------------------------------------------------------------------------
    def save(self, path: str | os.PathLike[str]) -> Path:
        """Write an NPZ file: event arrays, histogram arrays and a JSON metadata entry (scenario, seed, version,
        references, sums). Exactly restored by :func:`load`.

        Parameters
        ----------
        path : str or os.PathLike
            File to write (``.npz``).

        Returns
        -------
        pathlib.Path
            The path written.
        """
        from pdvoid.inputs.scenario_files import scenario_to_dict

        p = Path(path)
        meta = {
            "format": _FORMAT, "format_version": _FORMAT_VERSION, "scenario": scenario_to_dict(self.scenario),
            "seed": self.seed, "cycles": self.cycles, "requested_cycles": self.requested_cycles,
            "version": self.version, "references": list(self.references), "event_count": self.event_count,
            "sum_abs_charge": self.sum_abs_charge.hex(), "sum_charge_squared": self.sum_charge_squared.hex(),
            "sum_charge_voltage": self.sum_charge_voltage.hex(), "label": self.events.label,
            "first_discharge_time": (None if math.isnan(self.first_discharge_time)
                                     else float(self.first_discharge_time).hex()),
            "histogram": None if self.histogram is None else {"below": self.histogram.below,
                                                              "above": self.histogram.above},
        }
        arrays = {name: getattr(self.events, name) for name in _EVENT_FIELDS}
        if self.histogram is not None:
            arrays["hist_counts"] = self.histogram.counts
            arrays["hist_phase_edges_deg"] = self.histogram.phase_edges_deg
            arrays["hist_charge_edges"] = self.histogram.charge_edges
        arrays["metadata"] = np.frombuffer(json.dumps(meta).encode("utf-8"), dtype=np.uint8)
        with atomic_write(p) as fh:
            np.savez_compressed(fh, **arrays)
        return p

    def to_csv(self, path: str | os.PathLike[str]) -> Path:
        """Events as CSV with units in the column headers (full double precision), preceded by comment lines
        with the supply frequency and the number of cycles observed, so that :func:`pdvoid.read_events` gives
        the same reference time (cycles / frequency) and hence the same IEC 60270 quantities as the result.

        Parameters
        ----------
        path : str or os.PathLike
            File to write.

        Returns
        -------
        pathlib.Path
            The path written.
        """
        p = Path(path)
        cols = np.column_stack([getattr(self.events, n) for n in _EVENT_FIELDS]) if self.events.count else None
        header = ",".join(_CSV_HEADER[n] for n in _EVENT_FIELDS)
        comments = (f"# events of a pdvoid {self.version} simulation (seed {self.seed})\n"
                    f"# frequency = {self.events.frequency!r} Hz\n"
                    f"# cycles = {int(self.cycles)}\n")
        with atomic_write(p, "w", encoding="utf-8", newline="\n") as fh:
            fh.write(comments + header + "\n")
            if cols is not None:
                np.savetxt(fh, cols, delimiter=",", fmt="%.17g")
        return p


def load(path: str | os.PathLike[str]) -> Result:
    """Read a result written by :meth:`Result.save`. Malformed files raise :class:`InputError` naming the file.

    Parameters
    ----------
    path : str or os.PathLike
        A file written by :meth:`Result.save`.

    Returns
    -------
    Result
        The result, bit for bit as saved.

    Raises
    ------
    InputError
        For a missing, over-large or malformed file, naming it.
    """
    from pdvoid.inputs.scenario import scenario_from_dict

    p = Path(path)
    try:
        size = p.stat().st_size
    except OSError as exc:
        raise InputError(f"{p}: cannot read result file ({exc.strerror})") from None
    if size > MAX_RESULT_FILE:
        raise InputError(f"{p}: result file larger than {MAX_RESULT_FILE} bytes")
    check_run_file(p)
    try:
        with np.load(p, allow_pickle=False) as z:
            data = {k: z[k] for k in z.files}
    except (OSError, ValueError, zipfile.BadZipFile, EOFError) as exc:
        raise InputError(f"{p}: not a pdvoid result file ({exc})") from None
    if "metadata" not in data:
        raise InputError(f"{p}: not a pdvoid result file (no metadata entry)")
    try:
        meta = json.loads(data["metadata"].tobytes().decode("utf-8"))
    except (UnicodeDecodeError, json.JSONDecodeError) as exc:
        raise InputError(f"{p}: metadata is not valid JSON ({exc})") from None
    if not isinstance(meta, dict) or meta.get("format") != _FORMAT:
        raise InputError(f"{p}: metadata does not describe a pdvoid result")
    if meta.get("format_version") != _FORMAT_VERSION:
        raise InputError(f"{p}: result format version {meta.get('format_version')!r}; this pdvoid reads "
                         f"{_FORMAT_VERSION}")
    missing = [n for n in _EVENT_FIELDS if n not in data]
    if missing:
        raise InputError(f"{p}: missing event arrays {missing}")
    try:
        scenario = scenario_from_dict(meta["scenario"], source=str(p))
        ev = Events(
            phase_deg=data["phase_deg"], charge=data["charge"], frequency=scenario.supply.frequency,
            cycles=float(meta["cycles"]), time=data["time"], cycle=data["cycle"], voltage=data["voltage"],
            field_before=data["field_before"], field_after=data["field_after"], label=meta.get("label", ""),
        )
        hist = None
        if meta.get("histogram") is not None:
            hist = Histogram(counts=data["hist_counts"], phase_edges_deg=data["hist_phase_edges_deg"],
                             charge_edges=data["hist_charge_edges"], below=int(meta["histogram"]["below"]),
                             above=int(meta["histogram"]["above"]))
        if "first_discharge_time" in meta:  # written since the field exists; None: no discharge
            first = meta["first_discharge_time"]
            first_time = math.nan if first is None else float.fromhex(first)
        else:  # older file: the first stored event, else unknown
            first_time = float(ev.time[0]) if ev.time is not None and ev.time.size else math.nan
        return Result(
            events=ev, scenario=scenario, seed=int(meta["seed"]), cycles=int(meta["cycles"]),
            requested_cycles=int(meta["requested_cycles"]), version=str(meta["version"]),
            references=tuple(meta["references"]), histogram=hist, event_count=int(meta["event_count"]),
            sum_abs_charge=float.fromhex(meta["sum_abs_charge"]),
            sum_charge_squared=float.fromhex(meta["sum_charge_squared"]),
            sum_charge_voltage=float.fromhex(meta["sum_charge_voltage"]), first_discharge_time=first_time,
        )
    except (KeyError, TypeError, ValueError) as exc:
        if isinstance(exc, InputError):
            raise
        raise InputError(f"{p}: malformed result metadata ({exc!r})") from None
