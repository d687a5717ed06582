"""A plain container of discharge events: what every analysis function accepts.

Simulated results (:class:`pdvoid.simulation.results.Result`) and measured data (:mod:`pdvoid.io`) both provide these
attributes, so analysis never needs to know where the events came from.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from pdvoid.core.arrays import frozen_array as _frozen
from pdvoid.core.errors import InputError, check_positive

__all__ = ["Events", "as_events"]


def _real(name: str, value: object) -> np.ndarray:
    """``value`` as a float array; complex, boolean, text and object entries are refused, never converted."""
    arr = np.asarray(value)
    if arr.dtype.kind not in "iuf":
        raise InputError(f"{name} must hold real numbers; got an array of {arr.dtype} (complex, boolean and text "
                         "values are refused, not converted)")
    return np.asarray(arr, dtype=float)


@dataclass(frozen=True, eq=False)
class Events:
    """Discharge events over an observation of whole AC cycles.

    Units: SI.

    Attributes
    ----------
    time : numpy.ndarray or None
        event times from the start of the observation [s]; NaN where unknown (phase-only data).
    phase_deg : numpy.ndarray
        phase from the positive-going zero crossing of the applied voltage [deg], in [0, 360).
    cycle : numpy.ndarray or None
        index of the AC cycle each event falls in [-] (float array holding whole numbers).
    charge : numpy.ndarray
        apparent charge, signed [C].
    voltage : numpy.ndarray or None
        instantaneous applied voltage at each event [V]; NaN where unknown.
    frequency : float
        supply frequency [Hz].
    cycles : float
        number of AC cycles observed [-] (the reference time is cycles / frequency).
    field_before, field_after : numpy.ndarray or None
        void field just before and after each event [V/m]; NaN where unknown.
    label : str
        free text (e.g. "simulated", "measured (synthetic demo data)").
    """

    phase_deg: np.ndarray
    charge: np.ndarray
    frequency: float
    cycles: float
    time: np.ndarray | None = None
    cycle: np.ndarray | None = None
    voltage: np.ndarray | None = None
    field_before: np.ndarray | None = None
    field_after: np.ndarray | None = None
    label: str = ""
    extra: dict = field(default_factory=dict)

    def __post_init__(self) -> None:
        if not isinstance(self.label, str):
            raise InputError(f"label must be text; got {type(self.label).__name__}")
        if not isinstance(self.extra, dict):
            raise InputError(f"extra must be a dict; got {type(self.extra).__name__}")
        f = check_positive("frequency", self.frequency, "Hz")
        c = check_positive("cycles", self.cycles)
        object.__setattr__(self, "frequency", f)
        object.__setattr__(self, "cycles", c)
        phase = _real("phase_deg", self.phase_deg)
        charge = _real("charge", self.charge)
        if phase.ndim != 1 or charge.ndim != 1 or phase.shape != charge.shape:
            raise InputError(
                f"phase_deg and charge must be 1-D arrays of equal length; got shapes {phase.shape} and "
                f"{charge.shape}"
            )
        n = phase.size
        if n and (not np.all(np.isfinite(phase)) or phase.min() < 0.0 or phase.max() >= 360.0):
            raise InputError("phase_deg must be finite and lie in [0, 360) deg")
        if n and not np.all(np.isfinite(charge)):
            raise InputError("charge must be finite everywhere")
        object.__setattr__(self, "phase_deg", _frozen(phase))
        object.__setattr__(self, "charge", _frozen(charge))
        filled: dict[str, np.ndarray] = {}
        for name in ("time", "cycle", "voltage", "field_before", "field_after"):
            v = getattr(self, name)
            if v is None:
                arr = np.full(n, np.nan)
            else:
                arr = _real(name, v)
                if arr.shape != (n,):
                    raise InputError(f"{name} must have shape ({n},) like phase_deg; got {arr.shape}")
            filled[name] = _frozen(arr)
            object.__setattr__(self, name, filled[name])
        if n and np.all(np.isnan(filled["cycle"])) and np.all(np.isfinite(filled["time"])):
            object.__setattr__(self, "cycle", _frozen(np.floor(filled["time"] * f)))

    @property
    def duration(self) -> float:
        """Reference time of the observation [s]."""
        return self.cycles / self.frequency

    @property
    def count(self) -> int:
        """Number of events [-]."""
        return int(self.charge.size)

    def __len__(self) -> int:
        return self.count


def as_events(obj: object) -> Events:
    """Accept an :class:`Events`, a Result (anything with ``.events``) or raise :class:`InputError`.

    Parameters
    ----------
    obj : object
        An Events, or anything with an ``events`` attribute holding one (a Result, measured data).

    Returns
    -------
    Events
        The events.

    Raises
    ------
    InputError
        For anything else.
    """
    if isinstance(obj, Events):
        return obj
    ev = getattr(obj, "events", None)
    if isinstance(ev, Events):
        return ev
    raise InputError(f"expected discharge events (a Result or Events); got {type(obj).__name__}")
