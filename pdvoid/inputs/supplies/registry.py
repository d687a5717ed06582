"""The registry of supplies without a period and the piece description the kernels run on."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, ClassVar

import numpy as np

from pdvoid.core.errors import InputError, check_range

__all__ = ["SupplyPieces", "TimeSupply", "register_supply", "supply_class", "supply_kinds", "check_ripple"]

_REGISTRY: dict[str, type] = {}


@dataclass(frozen=True, eq=False)
class SupplyPieces:
    """V(t) on [0, end] as pieces ``level_k + slope_k·(t − breaks_k) + amp_k·sin(omega_k·(t − breaks_k) + phase_k)``
    on [breaks_k, breaks_k+1) plus a ripple ``Σ_m a_m sin(m ω t) + b_m cos(m ω t)`` on every piece.

    Attributes
    ----------
    breaks : numpy.ndarray
        Increasing piece boundaries from 0 to the end of the run [s] (K + 1 values).
    level : numpy.ndarray
        V at the start of each piece without the ripple [V] (K values).
    slope : numpy.ndarray
        dV/dt on each piece without the ripple [V/s] (K values).
    ripple_frequency : float
        Fundamental frequency of the ripple [Hz] (1 when there is none).
    orders : numpy.ndarray
        Ripple harmonic orders m [-] (possibly empty).
    a_coef, b_coef : numpy.ndarray
        Sine and cosine amplitudes of each order [V].
    amp, omega, phase : numpy.ndarray or None
        The piece's own sinusoid: amplitude [V], angular frequency [rad/s] (> 0 where amp is not 0) and phase
        [rad] (K values each), or None for none.
    exp_amp, exp_tau : numpy.ndarray or None
        The piece's own exponential ``exp_amp·exp(−(t − breaks_k)/exp_tau)``: amplitude [V] and time constant [s]
        (> 0 where exp_amp is not 0), or None for none.
    """

    breaks: np.ndarray
    level: np.ndarray
    slope: np.ndarray
    ripple_frequency: float
    orders: np.ndarray
    a_coef: np.ndarray
    b_coef: np.ndarray
    amp: np.ndarray | None = None
    omega: np.ndarray | None = None
    phase: np.ndarray | None = None
    exp_amp: np.ndarray | None = None
    exp_tau: np.ndarray | None = None

    def table(self) -> np.ndarray:
        """The per-piece table of the kernel: rows (level, slope, amp, omega, phase, exp_amp, exp_tau).

        Returns
        -------
        numpy.ndarray
            Shape (K, 7), float64.
        """
        k = self.level.size
        z = np.zeros(k)
        cols = [self.level, self.slope] + [z if c is None else c for c in (self.amp, self.omega, self.phase)]
        cols += [z if self.exp_amp is None else self.exp_amp, np.ones(k) if self.exp_tau is None else self.exp_tau]
        return np.ascontiguousarray(np.stack([np.asarray(c, dtype=float) for c in cols], axis=1))

    def voltage(self, t: np.ndarray) -> np.ndarray:
        """V at times ``t`` [V] (t in [0, end]).

        Parameters
        ----------
        t : numpy.ndarray
            Times from energisation [s].

        Returns
        -------
        numpy.ndarray
            The applied voltage [V].
        """
        t = np.asarray(t, dtype=float)
        k = np.clip(np.searchsorted(self.breaks, t, side="right") - 1, 0, self.level.size - 1)
        u = t - self.breaks[k]
        v = self.level[k] + self.slope[k] * u
        if self.amp is not None and self.omega is not None and self.phase is not None:
            v = v + self.amp[k] * np.sin(self.omega[k] * u + self.phase[k])
        if self.exp_amp is not None and self.exp_tau is not None:
            v = v + self.exp_amp[k] * np.exp(-u / self.exp_tau[k])
        w = 2.0 * math.pi * self.ripple_frequency
        for m, a, b in zip(self.orders, self.a_coef, self.b_coef, strict=True):
            v = v + a * np.sin(m * w * t) + b * np.cos(m * w * t)
        return v


class TimeSupply:
    """Base of the supplies without a period (mixin; the subclasses are frozen dataclasses).

    Attributes
    ----------
    kind : str
        Name in scenario files.
    field_units : dict
        Field name to (dimension or None, SI unit) for scenario files.
    periodic : bool
        False for a supply without a period (``simulate`` takes ``duration=``); True for one that repeats
        (it has a ``frequency`` [Hz] and runs for ``cycles=``).
    """

    kind: ClassVar[str]
    field_units: ClassVar[dict[str, tuple[str | None, str]]]
    periodic: ClassVar[bool] = False

    def pieces(self, end: float) -> SupplyPieces:  # pragma: no cover - each supply overrides it
        """The pieces of V(t) on [0, end].

        Parameters
        ----------
        end : float
            End of the run [s].

        Returns
        -------
        SupplyPieces
            The description the kernels run on.
        """
        raise NotImplementedError

    @property
    def peak(self) -> float:  # pragma: no cover - each supply overrides it
        """Largest ``|V|`` [V]."""
        raise NotImplementedError

    @property
    def rms(self) -> float:  # pragma: no cover - each supply overrides it
        """A representative rms value [V] (of the steady level and its ripple)."""
        raise NotImplementedError


def register_supply(cls: type) -> type:
    """Class decorator: make a supply known to scenario files under ``cls.kind``.

    Parameters
    ----------
    cls : type
        A :class:`TimeSupply` subclass.

    Returns
    -------
    type
        ``cls``.
    """
    kind = getattr(cls, "kind", None)
    if not isinstance(kind, str) or kind in ("sine", "periodic") or kind in _REGISTRY:
        raise InputError(f"a supply needs a new kind name; got {kind!r}")
    _REGISTRY[kind] = cls
    return cls


def supply_kinds() -> tuple[str, ...]:
    """Kinds of the registered supplies without a period, in registration order.

    Returns
    -------
    tuple of str
        The names.
    """
    return tuple(_REGISTRY)


def supply_class(kind: object) -> Any:
    """The supply class registered as ``kind``.

    Parameters
    ----------
    kind : object
        A kind name.

    Returns
    -------
    type
        The class.

    Raises
    ------
    InputError
        For an unknown kind.
    """
    if not isinstance(kind, str) or kind not in _REGISTRY:
        raise InputError(f"supply.kind must be one of 'sine', 'periodic', {', '.join(map(repr, _REGISTRY))}; "
                         f"got {kind!r}")
    return _REGISTRY[kind]


def check_ripple(ripple: object, name: str = "supply.ripple") -> tuple[tuple[int, float, float], ...]:
    """A ripple as harmonics: tuples (order m >= 1, fraction of the DC voltage in [0, 1], phase [deg]).

    Parameters
    ----------
    ripple : object
        The ripple to check (this function is the type gate).
    name : str, optional
        What to name in errors.

    Returns
    -------
    tuple
        The checked tuples.

    Raises
    ------
    InputError
        For a malformed entry, an order outside 1 to 200, a repeated order or more than 50 entries.
    """
    if not isinstance(ripple, (tuple, list)):
        raise InputError(f"{name} must be a list of (order, fraction, phase_deg); got {ripple!r}")
    if len(ripple) > 50:
        raise InputError(f"{name} may hold at most 50 entries; got {len(ripple)}")
    out = []
    for i, h in enumerate(ripple):
        if not isinstance(h, (tuple, list)) or len(h) != 3:
            raise InputError(f"{name}[{i}] must be (order, fraction, phase_deg); got {h!r}")
        order, frac, ph = h
        if isinstance(order, bool) or not isinstance(order, (int, np.integer)) or not 1 <= order <= 200:
            raise InputError(f"{name}[{i}] order must be a whole number in [1, 200]; got {order!r}")
        out.append((int(order), check_range(f"{name}[{i}] fraction", frac, 0.0, 1.0),
                    check_range(f"{name}[{i}] phase_deg", ph, -360.0, 360.0, unit="deg")))
    orders = [h[0] for h in out]
    if len(set(orders)) != len(orders):
        raise InputError(f"{name} orders must be distinct; got {orders}")
    return tuple(out)


def ripple_arrays(ripple: tuple[tuple[int, float, float], ...], amplitude: float
                  ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(orders, a, b) of a ripple ``Σ fraction·|V|·sin(m ω t + φ)`` [V].

    Parameters
    ----------
    ripple : tuple
        Checked ripple tuples (:func:`check_ripple`).
    amplitude : float
        The voltage the fractions refer to [V].

    Returns
    -------
    tuple of numpy.ndarray
        Orders [-], sine and cosine amplitudes [V].
    """
    orders = np.array([h[0] for h in ripple], dtype=float)
    a = np.array([amplitude * h[1] * math.cos(math.radians(h[2])) for h in ripple])
    b = np.array([amplitude * h[1] * math.sin(math.radians(h[2])) for h in ripple])
    return orders, a, b
