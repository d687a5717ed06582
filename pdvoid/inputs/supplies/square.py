"""Square waves and PWM with a finite rise time: unipolar or bipolar, repeating (run for ``cycles=``)."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import ClassVar

import numpy as np

from pdvoid.core.errors import InputError, check_bool, check_range
from pdvoid.inputs.supplies.dc import check_voltage
from pdvoid.inputs.supplies.registry import SupplyPieces, TimeSupply, register_supply

__all__ = ["SquareWave"]


@register_supply
@dataclass(frozen=True)
class SquareWave(TimeSupply):
    """A trapezoidal square wave or PWM pulse train with linear edges of ``rise_time``.

    Bipolar: between −voltage and +voltage; the rising edges are centred on t = k/frequency (the positive-going
    zero crossings, the phase reference of events), the falling ones on (k + duty)/frequency; the run starts at
    t = 0 in the middle of the first rising edge (energised from 0 V). Unipolar: between 0 and voltage, each
    period starting with its rising edge at t = k/frequency and the falling edge at (k + duty)/frequency.

    Attributes
    ----------
    voltage : float
        Amplitude [V], signed, not zero, ``|V|`` <= 10 MV.
    frequency : float
        Repetition frequency [Hz], 0.01 Hz to 1 MHz.
    rise_time : float
        Duration of each edge [s] (0 to 100 % of the swing), > 0 and shorter than the shorter of the high and
        low parts.
    duty : float
        Fraction of the period between the rising and the falling edge [-], in (0, 1); 0.5 for a square wave.
    bipolar : bool
        True for ±voltage, False for 0 to voltage.
    """

    voltage: float
    frequency: float
    rise_time: float
    duty: float = 0.5
    bipolar: bool = True

    kind: ClassVar[str] = "square_wave"
    periodic: ClassVar[bool] = True
    field_units: ClassVar[dict[str, tuple[str | None, str]]] = {
        "voltage": ("voltage", "V"), "frequency": ("frequency", "Hz"), "rise_time": ("time", "s"),
        "duty": ("dimensionless", ""), "bipolar": (None, ""),
    }

    def __post_init__(self) -> None:
        object.__setattr__(self, "voltage", check_voltage("supply.voltage", self.voltage))
        object.__setattr__(self, "frequency", check_range("supply.frequency", self.frequency, 0.01, 1e6, unit="Hz"))
        object.__setattr__(self, "duty", check_range("supply.duty", self.duty, 0.0, 1.0, low_open=True,
                                                     high_open=True))
        object.__setattr__(self, "bipolar", check_bool("supply.bipolar", self.bipolar))
        r = check_range("supply.rise_time", self.rise_time, 0.0, 1e5, low_open=True, unit="s")
        longest = min(self.duty, 1.0 - self.duty) / self.frequency
        if r >= longest:
            raise InputError(f"supply.rise_time must be shorter than the shorter of the high and low parts "
                             f"({longest:g} s at this frequency and duty); got {r!r} s")
        object.__setattr__(self, "rise_time", r)

    def pieces(self, end: float) -> SupplyPieces:
        """The edges and flat parts on [0, end].

        Parameters
        ----------
        end : float
            End of the run [s], > 0 (at most 1e7 periods).

        Returns
        -------
        SupplyPieces
            The pieces (no ripple).
        """
        end = check_range("duration", end, 0.0, math.inf, low_open=True, unit="s")
        period = 1.0 / self.frequency
        n = int(math.ceil(end * self.frequency)) + 1
        if n > 10_000_001:
            raise InputError(f"a square-wave run of {end:g} s has more than 1e7 periods")
        v, r, d = self.voltage, self.rise_time, self.duty
        k = np.arange(n, dtype=float) * period
        if self.bipolar:
            starts = np.stack([k + r / 2, k + d * period - r / 2, k + d * period + r / 2, k + period - r / 2], 1)
            lv = np.tile([v, v, -v, -v], n)
            sl = np.tile([0.0, -2 * v / r, 0.0, 2 * v / r], n)
            breaks = np.concatenate([[0.0], starts.ravel()])
            level = np.concatenate([[0.0], lv])
            slope = np.concatenate([[2 * v / r], sl])
        else:
            starts = np.stack([k, k + r, k + d * period, k + d * period + r], 1)
            breaks = starts.ravel()
            level = np.tile([0.0, v, v, 0.0], n)
            slope = np.tile([v / r, 0.0, -v / r, 0.0], n)
        keep = max(int(np.searchsorted(breaks, end, side="left")), 1)
        e = np.empty(0)
        return SupplyPieces(np.append(breaks[:keep], end), level[:keep], slope[:keep], 1.0, e, e, e)

    @property
    def peak(self) -> float:
        """``|voltage|`` [V]."""
        return abs(self.voltage)

    @property
    def rms(self) -> float:
        """rms of the trapezoid [V]: V·sqrt(1 − 4 r f/3) bipolar, V·sqrt(duty − r f/3) unipolar."""
        rf = self.rise_time * self.frequency
        return abs(self.voltage) * math.sqrt(1.0 - 4.0 * rf / 3.0 if self.bipolar else self.duty - rf / 3.0)
