"""Supplies given as pieces (DC, polarity reversal, piecewise-linear, square wave, cosine-rectangular), one module
each, and their registry.

Each supply is a frozen dataclass with a ``kind`` (its name in scenario files), ``field_units`` (its file
schema), ``peak`` and ``rms`` [V], and :meth:`pieces`, which describes V(t) from t = 0 (the instant of
energisation: V = 0 before) as pieces ``V(t) = level_k + slope_k (t − t_k)`` (optionally with a sinusoid of
their own) plus a ripple
``Σ_m a_m sin(m ω t) + b_m cos(m ω t)`` common to all pieces (:class:`SupplyPieces`). The kernels run on these
pieces exactly (closed forms on each piece, bracketed roots), with no time step.

- :mod:`~pdvoid.inputs.supplies.dc`: :class:`DC` (with ripple and a rise time at energisation);
- :mod:`~pdvoid.inputs.supplies.reversal`: :class:`PolarityReversal` (DC reversed with a linear ramp);
- :mod:`~pdvoid.inputs.supplies.piecewise`: :class:`PiecewiseLinear` (samples, e.g. a measured supply from CSV);
- :mod:`~pdvoid.inputs.supplies.square`: :class:`SquareWave` (square waves and PWM with a finite rise time; it
  repeats, so it runs for ``cycles=`` and has a ``frequency``);
- :mod:`~pdvoid.inputs.supplies.cosine_rectangular`: :class:`CosineRectangular` (the VLF cosine-rectangular wave,
  half-cosine polarity changes; runs for ``cycles=``).
"""

# ruff: noqa: I001  (the import order below is the registration order)
from __future__ import annotations

from pdvoid.inputs.supplies.registry import (
    SupplyPieces,
    check_ripple,
    register_supply,
    supply_class,
    supply_kinds,
    TimeSupply,
)
from pdvoid.inputs.supplies.dc import DC
from pdvoid.inputs.supplies.reversal import PolarityReversal
from pdvoid.inputs.supplies.piecewise import PiecewiseLinear
from pdvoid.inputs.supplies.square import SquareWave
from pdvoid.inputs.supplies.cosine_rectangular import CosineRectangular

__all__ = ["DC", "CosineRectangular", "PiecewiseLinear", "PolarityReversal", "SquareWave", "SupplyPieces",
           "TimeSupply", "check_ripple", "register_supply", "supply_class", "supply_kinds"]
