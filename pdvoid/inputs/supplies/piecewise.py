"""An arbitrary piecewise-linear supply, e.g. a measured waveform read from a CSV file."""

from __future__ import annotations

import math
import os
from dataclasses import dataclass
from pathlib import Path
from typing import Any, ClassVar

import numpy as np

from pdvoid.core.errors import InputError, check_array, check_range
from pdvoid.inputs.supplies.registry import SupplyPieces, TimeSupply, register_supply

__all__ = ["PiecewiseLinear"]


@register_supply
@dataclass(frozen=True, eq=False)
class PiecewiseLinear(TimeSupply):
    """V(t) through the points (times, voltages), linear between them; the last value holds afterwards.

    Attributes
    ----------
    times : object
        Sample times [s], 2 to 100 000 values, the first 0, strictly increasing.
    voltages : object
        Applied voltage at each time [V], ``|V|`` <= 10 MV, not all zero.
    """

    times: Any
    voltages: Any

    kind: ClassVar[str] = "piecewise_linear"
    periodic: ClassVar[bool] = False
    field_units: ClassVar[dict[str, tuple[str | None, str]]] = {"times": (None, ""), "voltages": (None, "")}

    def __post_init__(self) -> None:
        t = check_array("supply.times", self.times, min_size=2, max_size=100_000)
        v = check_array("supply.voltages", self.voltages, min_size=2, max_size=100_000)
        if t.shape != v.shape or t.ndim != 1:
            raise InputError(f"supply.times and supply.voltages must be 1-D of equal length; got {t.shape} and "
                             f"{v.shape}")
        if t[0] != 0.0 or np.any(np.diff(t) <= 0.0):
            raise InputError("supply.times must start at 0 s and increase strictly")
        if np.max(np.abs(v)) > 1e7:
            raise InputError(f"supply.voltages must lie in [-1e7, 1e7] V; got {np.max(np.abs(v))!r}")
        if not np.any(v):
            raise InputError("supply.voltages must not all be zero")
        for name, arr in (("times", t), ("voltages", v)):
            arr = arr.copy()
            arr.setflags(write=False)
            object.__setattr__(self, name, arr)

    @classmethod
    def from_csv(cls, path: str | os.PathLike[str], *, time_column: int = 0, voltage_column: int = 1,
                 time_offset: float = 0.0) -> PiecewiseLinear:
        """Read a comma-separated file of times [s] and voltages [V] (``#`` comments and one header line
        allowed).

        Parameters
        ----------
        path : str or os.PathLike
            The file.
        time_column, voltage_column : int, optional
            Column indices [-].
        time_offset : float, optional
            Subtracted from the times [s] (to start at 0).

        Returns
        -------
        PiecewiseLinear
            The supply.

        Raises
        ------
        InputError
            For a missing or malformed file, naming it.
        """
        p = Path(path)
        if not p.is_file():
            raise InputError(f"{p}: no such file (a CSV of time [s], voltage [V])")
        if p.stat().st_size > 50_000_000:
            raise InputError(f"{p}: larger than 50 MB")
        rows = []
        with p.open(encoding="utf-8") as fh:
            for number, line in enumerate(fh, 1):
                text = line.strip()
                if not text or text.startswith("#"):
                    continue
                cells = text.split(",")
                try:
                    rows.append((float(cells[time_column]), float(cells[voltage_column])))
                except (ValueError, IndexError):
                    if rows or number > 50:
                        raise InputError(f"{p}, line {number}: expected numbers in columns {time_column} and "
                                         f"{voltage_column}; got {text[:80]!r}") from None
        if not rows:
            raise InputError(f"{p}: no data rows")
        data = np.array(rows)
        off = check_range("time_offset", time_offset, -1e9, 1e9, unit="s")
        try:
            return cls(times=data[:, 0] - off, voltages=data[:, 1])
        except InputError as exc:
            raise InputError(f"{p}: {exc}") from None

    def pieces(self, end: float) -> SupplyPieces:
        """V(t) on [0, end] as the linear pieces between the samples.

        Parameters
        ----------
        end : float
            End of the run [s], > 0.

        Returns
        -------
        SupplyPieces
            The pieces (no ripple).
        """
        end = check_range("duration", end, 0.0, math.inf, low_open=True, unit="s")
        t, v = self.times, self.voltages
        slope = np.append(np.diff(v) / np.diff(t), 0.0)
        keep = max(int(np.searchsorted(t, end, side="left")), 1)
        e = np.empty(0)
        return SupplyPieces(np.append(t[:keep], end), v[:keep].astype(float), slope[:keep], 1.0, e, e, e)

    @property
    def peak(self) -> float:
        """Largest ``|V|`` of the samples [V]."""
        return float(np.max(np.abs(self.voltages)))

    @property
    def rms(self) -> float:
        """rms over the sampled span (exact for linear pieces) [V]."""
        t, v = self.times, self.voltages
        dt = np.diff(t)
        a, b = v[:-1], v[1:]
        return float(math.sqrt(np.sum(dt * (a * a + a * b + b * b) / 3.0) / (t[-1] - t[0])))

    def __eq__(self, other: object) -> bool:
        return (isinstance(other, PiecewiseLinear) and np.array_equal(self.times, other.times)
                and np.array_equal(self.voltages, other.voltages))

    __hash__ = None  # type: ignore[assignment]
