"""The coefficients stage: a scenario's geometry, gas and supply reduced to the few numbers the models run on.

- :mod:`~pdvoid.coefficients.record`: the one :class:`Coefficients` type;
- :mod:`~pdvoid.coefficients.closed_form`: closed forms (spheroids, cylinders, voids on an electrode) and
  any numerical solution the scenario's void carries;
- :mod:`~pdvoid.coefficients.cylinder`: cylindrical voids of any aspect ratio (a shipped field-solver table);
- :mod:`~pdvoid.coefficients.limits`: the closed forms' limits, checked with a ValidityWarning;
- :mod:`~pdvoid.coefficients.fields`: the axisymmetric numerical field solver, which returns the same type.
"""

from __future__ import annotations

from pdvoid.coefficients.closed_form import compute_coefficients, supply_peak_factor
from pdvoid.coefficients.record import Coefficients

__all__ = ["Coefficients", "compute_coefficients", "supply_peak_factor"]
