"""A DC supply whose polarity is reversed with a linear ramp, once or several times (as in HVDC type tests)."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import ClassVar

import numpy as np

from pdvoid.core.errors import check_int, check_range
from pdvoid.inputs.supplies.dc import check_voltage, ripple_peak
from pdvoid.inputs.supplies.registry import SupplyPieces, TimeSupply, check_ripple, register_supply, ripple_arrays

__all__ = ["PolarityReversal"]


@register_supply
@dataclass(frozen=True)
class PolarityReversal(TimeSupply):
    """DC at ``voltage`` from t = 0, reversed to ``-voltage`` after ``hold_time`` by a linear ramp of
    ``ramp_time``, held again for ``hold_time`` and so on, ``reversals`` times; the last level then stays.

    Attributes
    ----------
    voltage : float
        Level before the first reversal [V], signed, not zero, ``|V|`` <= 10 MV.
    hold_time : float
        Time at each level before a reversal [s], 1 µs to 1e6 s (the first hold counts from energisation).
    ramp_time : float
        Duration of each reversal, from +V to −V [s], 1 ns to 1e5 s.
    reversals : int
        Number of reversals [-], 1 to 1000.
    rise_time : float
        Linear rise from 0 V at energisation [s], 0 to ``hold_time``.
    ripple : tuple[tuple[int, float, float], ...]
        Ripple harmonics as for :class:`pdvoid.DC` (fractions of ``|voltage|``).
    ripple_frequency : float
        Fundamental frequency of the ripple [Hz], 0.01 Hz to 1 MHz.
    """

    voltage: float
    hold_time: float
    ramp_time: float
    reversals: int = 1
    rise_time: float = 0.0
    ripple: tuple[tuple[int, float, float], ...] = ()
    ripple_frequency: float = 300.0

    kind: ClassVar[str] = "polarity_reversal"
    periodic: ClassVar[bool] = False
    field_units: ClassVar[dict[str, tuple[str | None, str]]] = {
        "voltage": ("voltage", "V"), "hold_time": ("time", "s"), "ramp_time": ("time", "s"),
        "reversals": (None, ""), "rise_time": ("time", "s"), "ripple": (None, ""),
        "ripple_frequency": ("frequency", "Hz"),
    }

    def __post_init__(self) -> None:
        object.__setattr__(self, "voltage", check_voltage("supply.voltage", self.voltage))
        object.__setattr__(self, "hold_time", check_range("supply.hold_time", self.hold_time, 1e-6, 1e6, unit="s"))
        object.__setattr__(self, "ramp_time", check_range("supply.ramp_time", self.ramp_time, 1e-9, 1e5, unit="s"))
        object.__setattr__(self, "reversals", check_int("supply.reversals", self.reversals, 1, 1000))
        object.__setattr__(self, "rise_time", check_range("supply.rise_time", self.rise_time, 0.0, self.hold_time,
                                                          unit="s"))
        object.__setattr__(self, "ripple", check_ripple(self.ripple))
        object.__setattr__(self, "ripple_frequency", check_range("supply.ripple_frequency", self.ripple_frequency,
                                                                 0.01, 1e6, unit="Hz"))

    def reversal_starts(self) -> np.ndarray:
        """Start times of the reversal ramps [s].

        Returns
        -------
        numpy.ndarray
            ``reversals`` times.
        """
        k = np.arange(self.reversals)
        return (k + 1) * self.hold_time + k * self.ramp_time

    def pieces(self, end: float) -> SupplyPieces:
        """V(t) on [0, end]: rise, levels and ramps, with the ripple.

        Parameters
        ----------
        end : float
            End of the run [s], > 0.

        Returns
        -------
        SupplyPieces
            The pieces.
        """
        end = check_range("duration", end, 0.0, math.inf, low_open=True, unit="s")
        v = self.voltage
        breaks, level, slope = [0.0], [], []
        if self.rise_time > 0.0:
            breaks.append(self.rise_time)
            level.append(0.0)
            slope.append(v / self.rise_time)
        sign = 1.0
        for start in self.reversal_starts():
            breaks += [float(start), float(start + self.ramp_time)]
            level += [sign * v, sign * v]
            slope += [0.0, -2.0 * sign * v / self.ramp_time]
            sign = -sign
        level.append(sign * v)
        slope.append(0.0)
        # pieces are [breaks[k], breaks[k+1]); keep those that start before the end, then close at the end
        b = np.array(breaks)
        keep = int(np.searchsorted(b, end, side="left"))
        keep = max(keep, 1)
        orders, a, bb = ripple_arrays(self.ripple, abs(v))
        return SupplyPieces(np.append(b[:keep], end), np.array(level[:keep]), np.array(slope[:keep]),
                            self.ripple_frequency, orders, a, bb)

    @property
    def peak(self) -> float:
        """Largest ``|V|`` [V] (the level with its ripple)."""
        return ripple_peak(abs(self.voltage), *ripple_arrays(self.ripple, abs(self.voltage)))

    @property
    def rms(self) -> float:
        """rms of a level with its ripple [V]."""
        return math.sqrt(self.voltage**2 * (1.0 + 0.5 * sum(h[1] ** 2 for h in self.ripple)))
