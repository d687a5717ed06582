"""The immutable Result of a simulation, and its open file format (NPZ arrays + JSON metadata)."""

from __future__ import annotations

import json
import math
import os
import stat
import zipfile
from dataclasses import dataclass
from pathlib import Path
from typing import cast

import numpy as np

from pdvoid.coefficients import Coefficients, compute_coefficients
from pdvoid.core.errors import InputError, check_array, check_int, check_real
from pdvoid.core.files import atomic_write, check_run_file
from pdvoid.core.limits import MAX_DEFLATE_RATIO, MAX_RESULT_FILE_BYTES, check_memory, format_bytes
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
MAX_RESULT_FILE = MAX_RESULT_FILE_BYTES  # bytes (pdvoid.core.limits)


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

    def __post_init__(self) -> None:
        counts = np.asarray(self.counts)
        if counts.dtype.kind not in "iu" or counts.ndim != 2:
            raise InputError(f"counts must be a 2-D array of whole numbers; got {counts.dtype} of shape "
                             f"{counts.shape}")
        pe = check_array("phase_edges_deg", self.phase_edges_deg, min_size=2)
        ce = check_array("charge_edges", self.charge_edges, min_size=2)
        if counts.shape != (pe.size - 1, ce.size - 1):
            raise InputError(f"counts of shape {counts.shape} do not match {pe.size} phase and {ce.size} charge "
                             "edges")
        if counts.size and counts.min() < 0:
            raise InputError("counts must be >= 0")
        object.__setattr__(self, "below", check_int("below", self.below, 0))
        object.__setattr__(self, "above", check_int("above", self.above, 0))


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

    def __post_init__(self) -> None:
        from pdvoid.inputs.parameters import check_seed

        if not isinstance(self.events, Events):
            raise InputError(f"events must be pdvoid.Events; got {type(self.events).__name__}")
        if not isinstance(self.scenario, Scenario):
            raise InputError(f"scenario must be a pdvoid.Scenario; got {type(self.scenario).__name__}")
        if self.histogram is not None and not isinstance(self.histogram, Histogram):
            raise InputError(f"histogram must be a Histogram or None; got {type(self.histogram).__name__}")
        if not isinstance(self.version, str):
            raise InputError(f"version must be text; got {type(self.version).__name__}")
        if not isinstance(self.references, tuple) or not all(isinstance(r, str) for r in self.references):
            raise InputError("references must be a tuple of text")
        check_seed(self.seed)
        requested = check_int("requested_cycles", self.requested_cycles, 1)
        check_int("cycles", self.cycles, 0, requested)
        check_int("event_count", self.event_count, 0)
        for name in ("sum_abs_charge", "sum_charge_squared", "sum_charge_voltage"):
            check_real(name, getattr(self, name))
        t = self.first_discharge_time
        if isinstance(t, bool) or not isinstance(t, (int, float, np.floating)):
            raise InputError(f"first_discharge_time must be a number or nan; got {t!r}")

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

    def parameter_values(self) -> tuple[str, ...]:
        """The parameter-set values the run's model used, each with its unit, status and source (printed by
        :func:`pdvoid.cite` after the references).

        Returns
        -------
        tuple of str
            One line per value, under a heading per set (:func:`pdvoid.inputs.model_sets.parameter_value_lines`);
            empty when the model matches no built-in set.
        """
        from pdvoid.inputs.model_sets import parameter_value_lines

        return tuple(parameter_value_lines(self.scenario.model))

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
            # a supply without a period: the events' frequency is 1/duration (one observation window)
            "window_frequency": (None if getattr(self.scenario.supply, "periodic", True)
                                 else float(self.events.frequency).hex()),
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

    if not isinstance(path, (str, os.PathLike)):
        raise InputError(f"path must be a str or path; got {type(path).__name__}")
    p = Path(path)
    try:
        size = p.stat().st_size
    except OSError as exc:
        raise InputError(f"{p}: cannot read result file ({exc.strerror})") from None
    if size > MAX_RESULT_FILE:
        raise InputError(f"{p}: result file larger than {MAX_RESULT_FILE} bytes")
    if not stat.S_ISREG(p.stat().st_mode):
        raise InputError(f"{p}: not a regular file (a result is a .npz file)")
    check_run_file(p)
    data = _read_arrays(p, size)
    if "metadata" not in data:
        raise InputError(f"{p}: not a pdvoid result file (no metadata entry)")
    try:
        meta = json.loads(data["metadata"].tobytes().decode("utf-8"))
    except (ValueError, RecursionError) as exc:  # bad UTF-8, bad JSON, an integer of too many digits, deep nesting
        raise InputError(f"{p}: metadata is not valid JSON ({type(exc).__name__}: {str(exc)[:200]})") from None
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
        cycles = _meta_int(meta, "cycles", 1)
        requested = _meta_int(meta, "requested_cycles", 1)
        if cycles > requested:
            raise InputError(f"{p}: {cycles} cycles simulated but only {requested} requested")
        if getattr(scenario.supply, "periodic", True):  # every periodic supply has a frequency
            frequency = float(getattr(scenario.supply, "frequency"))  # noqa: B009
        else:  # a supply without a period: one observation window of the run's duration
            frequency = _hex_float(meta, "window_frequency")
            if frequency <= 0.0:
                raise InputError(f"{p}: window_frequency must be > 0 in the metadata")
        _check_events(p, data, cycles, frequency)
        event_count = _meta_int(meta, "event_count", 0)
        stored = int(data["charge"].size)
        hist = None
        if meta.get("histogram") is not None:
            hist = _histogram(p, data, meta["histogram"], event_count)
        elif stored != event_count:
            raise InputError(f"{p}: metadata counts {event_count} discharges but {stored} events are stored")
        ev = Events(
            phase_deg=data["phase_deg"], charge=data["charge"], frequency=frequency,
            cycles=float(cycles), time=data["time"],
            cycle=data["cycle"], voltage=data["voltage"], field_before=data["field_before"],
            field_after=data["field_after"], label=_meta_str(meta, "label", ""),
        )
        if "first_discharge_time" in meta:  # written since the field exists; None: no discharge
            first = meta["first_discharge_time"]
            first_time = math.nan if first is None else _hex_float(meta, "first_discharge_time")
            if not math.isnan(first_time) and not 0.0 <= first_time <= cycles / frequency:
                raise InputError(f"{p}: first discharge at {first_time!r} s lies outside the run")
        else:  # older file: the first stored event, else unknown
            first_time = float(ev.time[0]) if ev.time is not None and ev.time.size else math.nan
        sums = {k: _hex_float(meta, k) for k in ("sum_abs_charge", "sum_charge_squared", "sum_charge_voltage")}
        if sums["sum_abs_charge"] < 0.0 or sums["sum_charge_squared"] < 0.0:
            raise InputError(f"{p}: negative sum of |q| or q^2 in the metadata")
        if event_count == 0 and (sums["sum_abs_charge"] != 0.0 or sums["sum_charge_squared"] != 0.0):
            raise InputError(f"{p}: no discharge counted but the charge sums are not zero")
        refs = meta["references"]
        if not isinstance(refs, list) or not all(isinstance(r, str) for r in refs):
            raise InputError(f"{p}: references must be a list of text")
        seed = meta["seed"]
        if isinstance(seed, bool) or not isinstance(seed, int) or not 0 <= seed < 2**32:
            raise InputError(f"{p}: seed must be a whole number in [0, 2**32); got {seed!r}")
        return Result(
            events=ev, scenario=scenario, seed=seed, cycles=cycles, requested_cycles=requested,
            version=_meta_str(meta, "version", None), references=tuple(refs), histogram=hist,
            event_count=event_count, first_discharge_time=first_time, **sums,
        )
    except (KeyError, TypeError, ValueError, OverflowError, AttributeError) as exc:
        if isinstance(exc, InputError):
            if str(exc).startswith(str(p)):
                raise
            raise InputError(f"{p}: {exc}") from None
        raise InputError(f"{p}: malformed result metadata ({exc!r})") from None


# ---- reading a result file: headers first, then only what they promise -------------------------------------
#: entry name -> (allowed dtypes, number of dimensions)
_ARRAYS: dict[str, tuple[tuple[str, ...], int]] = {
    **{name: (("<f8",), 1) for name in _EVENT_FIELDS},
    "hist_counts": (("<i8",), 2),
    "hist_phase_edges_deg": (("<f8",), 1),
    "hist_charge_edges": (("<f8",), 1),
    "metadata": (("|u1",), 1),
}
_MAX_METADATA_BYTES = 10_000_000


def _read_arrays(p: Path, size: int) -> dict[str, np.ndarray]:
    """The arrays of a result file, each checked from its header (name, dtype, shape, size) before it is read.

    Only stored or deflated members are read; the arrays together must fit the memory budget, and a deflated
    member may not claim more than :data:`~pdvoid.core.limits.MAX_DEFLATE_RATIO` bytes per compressed byte, so
    that loading takes memory proportional to the file.
    """
    from numpy.lib import format as npformat

    try:
        zf = zipfile.ZipFile(p)
    except (OSError, zipfile.BadZipFile, ValueError, EOFError, NotImplementedError, RuntimeError) as exc:
        raise InputError(f"{p}: not a pdvoid result file ({exc})") from None
    with zf:
        infos = zf.infolist()
        if len(infos) > len(_ARRAYS):
            raise InputError(f"{p}: not a pdvoid result file ({len(infos)} entries; at most {len(_ARRAYS)})")
        if "metadata.npy" not in {info.filename for info in infos}:
            raise InputError(f"{p}: not a pdvoid result file (no metadata entry)")
        plan = []
        total = 0
        for info in infos:
            name = info.filename[:-4] if info.filename.endswith(".npy") else info.filename
            if name not in _ARRAYS or not info.filename.endswith(".npy"):
                raise InputError(f"{p}: not a pdvoid result file (unexpected entry {info.filename!r})")
            if info.compress_type not in (zipfile.ZIP_STORED, zipfile.ZIP_DEFLATED):
                raise InputError(f"{p}: entry {info.filename!r} uses a compression this reader does not accept "
                                 "(stored or deflated only)")
            if info.flag_bits & 0x1:
                raise InputError(f"{p}: entry {info.filename!r} is encrypted")
            if info.file_size > MAX_DEFLATE_RATIO * max(info.compress_size, 1) + 1024:
                raise InputError(f"{p}: entry {info.filename!r} claims {format_bytes(info.file_size)} from "
                                 f"{format_bytes(info.compress_size)}, more than deflate can give (corrupt file)")
            total += info.file_size
            plan.append((name, info))
        check_memory(f"loading the result file {p} ({format_bytes(size)} on disk)", total)
        data: dict[str, np.ndarray] = {}
        for name, info in plan:
            dtypes, ndim = _ARRAYS[name]
            try:
                with zf.open(info) as fh:
                    version = npformat.read_magic(fh)
                    if version == (1, 0):
                        shape, fortran, dtype = npformat.read_array_header_1_0(fh, max_header_size=10_000)
                    elif version == (2, 0):
                        shape, fortran, dtype = npformat.read_array_header_2_0(fh, max_header_size=10_000)
                    else:
                        raise ValueError(f"array format version {version}")
                    if dtype.str not in dtypes or len(shape) != ndim or fortran and ndim > 1:
                        raise InputError(f"{p}: entry {name!r} holds {dtype.str} of shape {shape}; expected "
                                         f"{' or '.join(dtypes)} with {ndim} dimension(s)")
                    count = math.prod(shape)
                    header_bytes = fh.tell()
                    if count * dtype.itemsize != info.file_size - header_bytes:
                        raise InputError(f"{p}: entry {name!r} declares shape {shape} ({count * dtype.itemsize} "
                                         f"bytes) but holds {info.file_size - header_bytes} bytes")
                    if name == "metadata" and count > _MAX_METADATA_BYTES:
                        raise InputError(f"{p}: metadata entry larger than {_MAX_METADATA_BYTES} bytes")
                    raw = fh.read(count * dtype.itemsize)
            except InputError:
                raise
            except Exception as exc:  # noqa: BLE001 - numpy's header parser and zipfile raise many kinds
                # (SyntaxError, tokenize.TokenError, NotImplementedError, zlib.error, ...) for damaged bytes
                if isinstance(exc, MemoryError):
                    raise
                raise InputError(f"{p}: entry {name!r} is damaged ({exc})") from None
            if len(raw) != count * dtype.itemsize:
                raise InputError(f"{p}: entry {name!r} ends early")
            data[name] = np.frombuffer(raw, dtype=dtype).reshape(shape)
    return data


def _meta_int(meta: dict, key: str, low: int) -> int:
    value = meta[key]
    if isinstance(value, bool) or not isinstance(value, int) or not low <= value <= 2**62:
        raise InputError(f"{key} must be a whole number >= {low} in the metadata; got {value!r}")
    return value


def _meta_str(meta: dict, key: str, default: str | None) -> str:
    value = meta.get(key, default) if default is not None else meta[key]
    if not isinstance(value, str):
        raise InputError(f"{key} must be text in the metadata; got {value!r}")
    return value


def _hex_float(meta: dict, key: str) -> float:
    value = meta[key]
    if not isinstance(value, str) or len(value) > 40:
        raise InputError(f"{key} must be a float written in hex in the metadata; got {value!r}")
    x = float.fromhex(value)
    if not math.isfinite(x):
        raise InputError(f"{key} must be finite in the metadata; got {value!r}")
    return x


def _check_events(p: Path, data: dict[str, np.ndarray], cycles: int, frequency: float) -> None:
    """Event arrays of one length; times finite, >= 0, non-decreasing and inside the run; cycles matching them."""
    n = data["charge"].size
    for name in _EVENT_FIELDS:
        if data[name].size != n:
            raise InputError(f"{p}: event array {name!r} holds {data[name].size} values, charge {n}")
    if n == 0:
        return
    t, cyc = data["time"], data["cycle"]
    for name in ("time", "cycle", "charge", "phase_deg"):
        if not np.all(np.isfinite(data[name])):
            raise InputError(f"{p}: event array {name!r} is not finite everywhere")
    if t[0] < 0.0 or np.any(np.diff(t) < 0.0):
        raise InputError(f"{p}: event times must be >= 0 and non-decreasing")
    end = cycles / frequency
    if t[-1] > end * (1.0 + 1e-12):
        raise InputError(f"{p}: an event at {t[-1]!r} s lies after the end of the {cycles} cycles ({end!r} s)")
    if np.any(cyc != np.floor(t * frequency)) or cyc[-1] >= cycles:
        raise InputError(f"{p}: event cycles must be the whole cycles of the event times, from 0 to {cycles - 1}")
    frac = t * frequency - cyc
    if np.any(np.abs(np.minimum(frac * 360.0, np.nextafter(360.0, 0.0)) - data["phase_deg"]) > 1e-6):
        raise InputError(f"{p}: event phases do not match the event times at {frequency!r} Hz")


def _histogram(p: Path, data: dict[str, np.ndarray], hmeta: object, event_count: int) -> Histogram:
    if not isinstance(hmeta, dict):
        raise InputError("histogram must be a table in the metadata")
    for name in ("hist_counts", "hist_phase_edges_deg", "hist_charge_edges"):
        if name not in data:
            raise InputError(f"{p}: histogram metadata but no {name!r} array")
    counts, pe, ce = data["hist_counts"], data["hist_phase_edges_deg"], data["hist_charge_edges"]
    if counts.shape != (pe.size - 1, ce.size - 1) or pe.size < 2 or ce.size < 2:
        raise InputError(f"{p}: histogram counts of shape {counts.shape} do not match {pe.size} phase and "
                         f"{ce.size} charge edges")
    for name, e in (("phase", pe), ("charge", ce)):
        if not np.all(np.isfinite(e)) or np.any(np.diff(e) <= 0):
            raise InputError(f"{p}: histogram {name} edges must be finite and strictly increasing")
    if pe[0] != 0.0 or pe[-1] != 360.0:
        raise InputError(f"{p}: histogram phase edges must run from 0 to 360 deg")
    if counts.size and counts.min() < 0:
        raise InputError(f"{p}: histogram counts must be >= 0")
    below = _meta_int(hmeta, "below", 0)
    above = _meta_int(hmeta, "above", 0)
    # a sum in int64 could wrap: bound it in float64 first; below 2**62 the exact int64 sum cannot overflow
    if counts.size and float(counts.sum(dtype=np.float64)) > 2.0**62:
        raise InputError(f"{p}: histogram counts add up to more than 2**62 events")
    total = int(counts.sum()) if counts.size else 0
    if total + below + above != event_count:
        raise InputError(f"{p}: histogram holds {total} + {below} below + {above} above events but the metadata "
                         f"counts {event_count}")
    return Histogram(counts=counts, phase_edges_deg=pe, charge_edges=ce, below=below, above=above)
