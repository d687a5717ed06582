"""A DC supply, energised at t = 0, with an optional ripple given as harmonics of a stated frequency."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import ClassVar

import numpy as np

from pdvoid.core.errors import InputError, check_range
from pdvoid.inputs.supplies.registry import SupplyPieces, TimeSupply, check_ripple, register_supply, ripple_arrays
from pdvoid.inputs.waveform import evaluate, monotone_breakpoints

__all__ = ["DC", "check_voltage", "ripple_peak"]


def check_voltage(name: str, value: object) -> float:
    """A signed supply voltage, not zero, with ``|V|`` <= 10 MV [V].

    Parameters
    ----------
    name : str
        What to name in errors.
    value : object
        The value (this function is the type gate).

    Returns
    -------
    float
        The voltage [V].
    """
    v = check_range(name, value, -1e7, 1e7, unit="V")
    if v == 0.0:
        raise InputError(f"{name} must not be zero (a supply of 0 V applies nothing); got 0.0")
    return v


def ripple_peak(level: float, orders: np.ndarray, a: np.ndarray, b: np.ndarray) -> float:
    """max over a ripple period of ``|level + ripple|`` [V], at the extrema of the ripple.

    Parameters
    ----------
    level : float
        The DC level [V].
    orders, a, b : numpy.ndarray
        Ripple orders [-] and sine and cosine amplitudes [V].

    Returns
    -------
    float
        The peak [V].
    """
    if orders.size == 0 or not np.any(a) and not np.any(b):
        return abs(level)
    br = monotone_breakpoints(orders, a, b)
    return float(np.max(np.abs(level + evaluate(br, orders, a, b))))


@register_supply
@dataclass(frozen=True)
class DC(TimeSupply):
    """A DC voltage switched on at t = 0, with optional ripple.

    V(t) = voltage·[min(t/rise_time, 1) + Σ_k h_k·sin(2π·m_k·ripple_frequency·t + φ_k)] for t >= 0 (the ripple
    is present from energisation on; with ``rise_time = 0`` the level is a step at t = 0). With ``off_time`` the
    supply is switched off then: V falls to 0 at once (``decay_time = 0``) or as voltage·exp(−(t − off_time)/
    decay_time), e.g. the test object discharging through the divider.

    Attributes
    ----------
    voltage : float
        DC level [V], signed, not zero, ``|V|`` <= 10 MV.
    ripple : tuple[tuple[int, float, float], ...]
        Ripple harmonics (order m >= 1, amplitude as a fraction h of ``|voltage|`` in [0, 1], phase φ [deg]).
    ripple_frequency : float
        Fundamental frequency of the ripple [Hz], 0.01 Hz to 1 MHz (e.g. 300 Hz behind a six-pulse bridge on
        50 Hz, common practice).
    rise_time : float
        Duration of the linear rise from 0 V at energisation [s], 0 to 1e5 s.
    off_time : float or None
        Time of switching off [s], after the rise, at most 1e9 s; None (default) for a supply that stays on. Not
        with a ripple (the ripple would go on after switching off).
    decay_time : float
        Time constant of the decay after ``off_time`` [s], 0 (a step to 0 V) to 1e6 s.
    """

    voltage: float
    ripple: tuple[tuple[int, float, float], ...] = ()
    ripple_frequency: float = 300.0
    rise_time: float = 0.0
    off_time: float | None = None
    decay_time: float = 0.0

    kind: ClassVar[str] = "dc"
    periodic: ClassVar[bool] = False
    field_units: ClassVar[dict[str, tuple[str | None, str]]] = {
        "voltage": ("voltage", "V"), "ripple": (None, ""), "ripple_frequency": ("frequency", "Hz"),
        "rise_time": ("time", "s"), "off_time": ("time", "s"), "decay_time": ("time", "s"),
    }

    def __post_init__(self) -> None:
        object.__setattr__(self, "voltage", check_voltage("supply.voltage", self.voltage))
        object.__setattr__(self, "ripple", check_ripple(self.ripple))
        object.__setattr__(self, "ripple_frequency", check_range("supply.ripple_frequency", self.ripple_frequency,
                                                                 0.01, 1e6, unit="Hz"))
        object.__setattr__(self, "rise_time", check_range("supply.rise_time", self.rise_time, 0.0, 1e5, unit="s"))
        object.__setattr__(self, "decay_time", check_range("supply.decay_time", self.decay_time, 0.0, 1e6, unit="s"))
        if self.off_time is not None:
            off = check_range("supply.off_time", self.off_time, 0.0, 1e9, low_open=True, unit="s")
            if off < self.rise_time:
                raise InputError(f"supply.off_time must come after the rise ({self.rise_time:g} s); got {off!r} s")
            if self.ripple:
                raise InputError("supply.off_time cannot be combined with supply.ripple (the ripple would go on "
                                 "after switching off)")
            object.__setattr__(self, "off_time", off)
        elif self.decay_time != 0.0:
            raise InputError(f"supply.decay_time applies only with supply.off_time; got {self.decay_time!r} s")

    def _ripple(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        return ripple_arrays(self.ripple, abs(self.voltage))

    def pieces(self, end: float) -> SupplyPieces:
        """V(t) on [0, end] as pieces (a rise, then the level) with the ripple.

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
        orders, a, b = self._ripple()
        v = self.voltage
        if self.rise_time == 0.0:
            breaks, level, slope = [0.0], [v], [0.0]
        else:
            breaks, level, slope = [0.0, self.rise_time], [0.0, v], [v / self.rise_time, 0.0]
        exp_amp = [0.0] * len(level)
        exp_tau = [1.0] * len(level)
        if self.off_time is not None:
            breaks.append(self.off_time)
            if self.decay_time == 0.0:
                level.append(0.0)
                exp_amp.append(0.0)
                exp_tau.append(1.0)
            else:
                level.append(0.0)
                exp_amp.append(v)
                exp_tau.append(self.decay_time)
            slope.append(0.0)
        br = np.array(breaks)
        keep = max(int(np.searchsorted(br, end, side="left")), 1)
        return SupplyPieces(np.append(br[:keep], end), np.array(level[:keep]), np.array(slope[:keep]),
                            self.ripple_frequency, orders, a, b, exp_amp=np.array(exp_amp[:keep]),
                            exp_tau=np.array(exp_tau[:keep]))

    @property
    def peak(self) -> float:
        """Largest ``|V|`` once the level is reached [V]."""
        return ripple_peak(self.voltage, *self._ripple())

    @property
    def rms(self) -> float:
        """rms of the steady level with its ripple [V]: sqrt(V² + Σ (h·V)²/2)."""
        return math.sqrt(self.voltage**2 * (1.0 + 0.5 * sum(h[1] ** 2 for h in self.ripple)))

