"""Voids in coaxial (cable) insulation: the local plane-slab equivalent the closed forms and the field solver use,
and the limits of that model, checked with a ValidityWarning.

A void small against its radius r sees the applied field of the cylindrical capacitor, E = V/(r ln(R/r_i)), and
Pedersen's weighting field of the inner conductor has the same magnitude there, |∇λ| = 1/(r ln(R/r_i))
(:mod:`pdvoid.physics.coaxial`). Both are those of a plane slab of thickness

    d_loc = r ln(R/r_i)      (:func:`local_gap`),

so every plane-slab result carries over with d replaced by d_loc: the void field is f V/d_loc (f the void's own
enhancement), the apparent charge at the cable terminals per field drop is K εr ε0 Ω/d_loc, and the inception
voltage follows from the existing inception criteria at that local field. ``Coefficients.field_enhancement`` stays
"void field per V/thickness" (thickness = R − r_i), so it includes the geometric factor (R − r_i)/d_loc and every
model runs unchanged; ``Coefficients.local_field_factor`` holds that factor.

What the local-slab model leaves out, and when :func:`warn_coaxial_limits` says so (ValidityWarning):

- the 1/r change of the applied field across the void: h r/(r² − h²/4) ≈ h/r between the void's inner and outer
  walls (:func:`pdvoid.physics.coaxial.coaxial_field_variation`). The field at the inner wall is higher than the
  centre value by about h/(2r); the mean void field and the induced charge differ from it only in second order,
  about (h/r)²/20 for a sphere. Flagged above :data:`FIELD_VARIATION_LIMIT` (10 %);
- the curvature of the equipotentials across the void's width: the field direction turns by D/(2r) over half the
  width. Flagged above :data:`CURVATURE_LIMIT` (0.1 rad, a cosine error below 0.5 %);
- the curvature of the conductors next to the void, for a void close to one: the electrode-proximity check of the
  plane slab is applied with the distance to the nearer conductor.
"""

from __future__ import annotations

import math

from pdvoid.core.validity import warn_validity
from pdvoid.inputs.coaxial import Coaxial
from pdvoid.inputs.parameters import Insulation, Void
from pdvoid.physics.coaxial import coaxial_field_per_volt, coaxial_field_variation

__all__ = ["FIELD_VARIATION_LIMIT", "CURVATURE_LIMIT", "local_gap", "local_field_factor", "peak_field_per_volt",
           "proximity_thickness", "warn_coaxial_limits"]

#: relative change of the applied field across the void (≈ h/r) above which the thin-void model is flagged [-]
FIELD_VARIATION_LIMIT = 0.10
#: turn of the field direction over half the void's width, D/(2r) [rad], above which the model is flagged
CURVATURE_LIMIT = 0.10

_ADVICE = ("the local plane-slab model evaluates the applied and weighting fields at the void centre; treat the "
           "result as an estimate")


def local_gap(insulation: Insulation, void: Void) -> float:
    """Thickness of the plane slab with the same applied field per volt at the void centre [m].

    ``insulation.thickness`` for a plane slab (the same float, so plane-slab results are unchanged);
    r ln(R/r_i) for a :class:`pdvoid.Coaxial` insulation with the void at r = ``void.radial_position``.

    Parameters
    ----------
    insulation : pdvoid.Insulation
        The insulation (plane slab or coaxial).
    void : pdvoid.Void
        The void (its ``radial_position`` for a coaxial insulation).

    Returns
    -------
    float
        d_loc = V / E_applied(void centre) [m].

    References
    ----------
    kuffel2000_fields (coaxial field, from memory); pedersen1991 (λ function, from memory).
    """
    if not isinstance(insulation, Coaxial):
        return insulation.thickness
    r = _radius(void)
    return 1.0 / float(coaxial_field_per_volt(r, insulation.inner_radius, insulation.outer_radius))


def local_field_factor(insulation: Insulation, void: Void) -> float:
    """Applied field at the void centre per mean field V/thickness [-]: 1 for a plane slab,
    (R − r_i)/(r ln(R/r_i)) for a coaxial insulation.

    Parameters
    ----------
    insulation : pdvoid.Insulation
        The insulation.
    void : pdvoid.Void
        The void.

    Returns
    -------
    float
        thickness / :func:`local_gap` [-].
    """
    if not isinstance(insulation, Coaxial):
        return 1.0
    return insulation.thickness / local_gap(insulation, void)


def peak_field_per_volt(insulation: Insulation) -> float:
    """Highest applied field in the intact insulation per volt [1/m]: 1/thickness for a plane slab, the field
    at the inner conductor 1/(r_i ln(R/r_i)) for a coaxial insulation.

    Parameters
    ----------
    insulation : pdvoid.Insulation
        The insulation.

    Returns
    -------
    float
        E_max / V [1/m].
    """
    if not isinstance(insulation, Coaxial):
        return 1.0 / insulation.thickness
    a = insulation.inner_radius
    return float(coaxial_field_per_volt(a, a, insulation.outer_radius))


def proximity_thickness(insulation: Insulation, void: Void) -> float:
    """The slab thickness the closed forms' electrode-proximity check uses [m]: ``thickness`` for a plane slab;
    twice the distance from the void centre to the nearer conductor for a coaxial insulation (a centred void in
    that slab is as close to an electrode).

    Parameters
    ----------
    insulation : pdvoid.Insulation
        The insulation.
    void : pdvoid.Void
        The void.

    Returns
    -------
    float
        The thickness [m].
    """
    if not isinstance(insulation, Coaxial):
        return insulation.thickness
    r = _radius(void)
    return 2.0 * min(r - insulation.inner_radius, insulation.outer_radius - r)


def warn_coaxial_limits(insulation: Insulation, void: Void) -> list[str]:
    """Warn (:class:`~pdvoid.core.validity.ValidityWarning`) where a void in a coaxial insulation is not small
    against its radius (nothing for a plane slab).

    Parameters
    ----------
    insulation : pdvoid.Insulation
        The insulation.
    void : pdvoid.Void
        The void.

    Returns
    -------
    list of str
        The messages issued.
    """
    if not isinstance(insulation, Coaxial):
        return []
    r = _radius(void)
    h, width = void.height, void.diameter
    messages = []
    variation = float(coaxial_field_variation(h, r))
    if variation > FIELD_VARIATION_LIMIT:
        messages.append(
            f"the void is {h * 1e3:.3g} mm tall (radially) at {r * 1e3:.4g} mm from the cable axis: the applied "
            f"field changes by {variation * 100:.0f} % across it (limit {FIELD_VARIATION_LIMIT * 100:g} %; the "
            f"field at its inner wall is about {50 * h / r:.0f} % above the centre value used, the mean field and "
            f"the apparent charge are off by about {100 * (h / r) ** 2 / 20:.1g} %); {_ADVICE}"
        )
    turn = 0.5 * width / r
    if turn > CURVATURE_LIMIT:
        messages.append(
            f"the void is {width * 1e3:.3g} mm wide at {r * 1e3:.4g} mm from the cable axis: the radial field "
            f"turns by {math.degrees(turn):.0f} degrees over half its width (limit "
            f"{math.degrees(CURVATURE_LIMIT):.1f} degrees); {_ADVICE}"
        )
    for m in messages:
        warn_validity(m)
    return messages


def _radius(void: Void) -> float:
    r = void.radial_position
    if r is None:  # the Scenario requires it for a coaxial insulation
        from pdvoid.core.errors import InputError

        raise InputError("void.radial_position is required for a coaxial insulation; got None")
    return float(r)
