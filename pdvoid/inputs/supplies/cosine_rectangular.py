"""The cosine-rectangular VLF test voltage: levels of ±V joined by half-cosine polarity changes (runs for
``cycles=``)."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import ClassVar

import numpy as np

from pdvoid.core.errors import InputError, check_range
from pdvoid.inputs.supplies.dc import check_voltage
from pdvoid.inputs.supplies.registry import SupplyPieces, TimeSupply, register_supply

__all__ = ["CosineRectangular"]


@register_supply
@dataclass(frozen=True)
class CosineRectangular(TimeSupply):
    """A cosine-rectangular wave: +V and −V held, each polarity change a half cosine of ``transition_time``.

    The positive-going polarity changes are centred on t = k/frequency (the phase reference of events) and the
    negative-going ones on (k + 1/2)/frequency; the run starts at t = 0 in the middle of the first positive-going
    change, V(t) = V·sin(π t/transition_time), i.e. energised from 0 V. (Cosine-rectangular is a VLF waveform for
    testing installed cables; the transition comes from the test set's resonant polarity reversal, common
    practice.)

    Attributes
    ----------
    voltage : float
        Level [V], signed, not zero, ``|V|`` <= 10 MV.
    frequency : float
        Repetition frequency [Hz], 0.001 Hz to 1 kHz (0.1 Hz for VLF).
    transition_time : float
        Duration of each polarity change from +V to −V [s], > 0 and shorter than half a period.
    """

    voltage: float
    frequency: float
    transition_time: float

    kind: ClassVar[str] = "cosine_rectangular"
    periodic: ClassVar[bool] = True
    field_units: ClassVar[dict[str, tuple[str | None, str]]] = {
        "voltage": ("voltage", "V"), "frequency": ("frequency", "Hz"), "transition_time": ("time", "s"),
    }

    def __post_init__(self) -> None:
        object.__setattr__(self, "voltage", check_voltage("supply.voltage", self.voltage))
        object.__setattr__(self, "frequency", check_range("supply.frequency", self.frequency, 1e-3, 1e3, unit="Hz"))
        r = check_range("supply.transition_time", self.transition_time, 0.0, 1e4, low_open=True, unit="s")
        if r >= 0.5 / self.frequency:
            raise InputError(f"supply.transition_time must be shorter than half a period ({0.5 / self.frequency:g} "
                             f"s); got {r!r} s")
        object.__setattr__(self, "transition_time", r)

    def pieces(self, end: float) -> SupplyPieces:
        """Holds and half-cosine changes on [0, end].

        Parameters
        ----------
        end : float
            End of the run [s], > 0 (at most 1e7 periods).

        Returns
        -------
        SupplyPieces
            The pieces (each change a piece with its own sinusoid).
        """
        end = check_range("duration", end, 0.0, math.inf, low_open=True, unit="s")
        period = 1.0 / self.frequency
        n = int(math.ceil(end * self.frequency)) + 1
        if n > 10_000_001:
            raise InputError(f"a cosine-rectangular run of {end:g} s has more than 1e7 periods")
        v, r = self.voltage, self.transition_time
        w = math.pi / r
        k = np.arange(n, dtype=float) * period
        # per period: hold +V, change to -V (V sin(w u + pi/2)), hold -V, change to +V (V sin(w u - pi/2))
        starts = np.stack([k + r / 2, k + period / 2 - r / 2, k + period / 2 + r / 2, k + period - r / 2], 1)
        breaks = np.concatenate([[0.0], starts.ravel()])
        level = np.concatenate([[0.0], np.tile([v, 0.0, -v, 0.0], n)])
        amp = np.concatenate([[v], np.tile([0.0, v, 0.0, v], n)])
        phase = np.concatenate([[0.0], np.tile([0.0, math.pi / 2, 0.0, -math.pi / 2], n)])
        keep = max(int(np.searchsorted(breaks, end, side="left")), 1)
        e = np.empty(0)
        return SupplyPieces(np.append(breaks[:keep], end), level[:keep], np.zeros(keep), 1.0, e, e, e,
                            amp=amp[:keep], omega=np.full(keep, w), phase=phase[:keep])

    @property
    def peak(self) -> float:
        """``|voltage|`` [V]."""
        return abs(self.voltage)

    @property
    def rms(self) -> float:
        """rms [V]: V·sqrt(1 − transition_time·frequency) (the changes average V²/2)."""
        return abs(self.voltage) * math.sqrt(1.0 - self.transition_time * self.frequency)
