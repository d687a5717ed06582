"""The limits the closed-form coefficients assume, checked for a scenario, with a warning for each one it leaves.

:func:`warn_closed_form_limits` is called by :func:`pdvoid.compute_coefficients`. It issues a
:class:`~pdvoid.core.validity.ValidityWarning` when

- the void is close to an electrode or large against the slab, so that the expected error of the closed forms
  (:func:`pdvoid.coefficients.cylinder.electrode_proximity_error`) exceeds :data:`ERROR_TOLERANCE` (2 %): for a
  sphere centred in the slab that happens above h/d = 0.31 (the demo void, 1.5 mm in 6 mm, h/d = 0.25, is
  about 1 % off and is not flagged); for a spheroid also when the slab shares the voltage (a flat spheroid whose
  diameter is comparable with the slab thickness: the spheroid closed forms ignore the slab);
- a cylinder's diameter/height ratio lies outside the range the shipped solver table verifies (0.1 to 1000).

:func:`warn_host_strength` flags a mean bulk field at or above :data:`STRENGTH_FRACTION` of the host's typical
short-time dielectric strength (the void model assumes the host itself stays intact); it is called at the
inception voltage by :func:`pdvoid.compute_coefficients`, at the supply's peak by :func:`pdvoid.simulate` and at
the test level by the margin searches.

Nothing is checked when the scenario carries a numerical field solution (``void.field_enhancement``).
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from pdvoid.coefficients.coaxial import peak_field_per_volt
from pdvoid.coefficients.cylinder import TABLE_ASPECT_RANGE, electrode_proximity_error
from pdvoid.core.validity import warn_validity
from pdvoid.inputs.coaxial import Coaxial

if TYPE_CHECKING:
    from pdvoid.inputs.parameters import Insulation

__all__ = ["ERROR_TOLERANCE", "CRITERIA_TOLERANCE", "PASCHEN_NEIGHBOURHOOD", "warn_closed_form_limits",
           "warn_criteria_disagree", "warn_near_paschen_minimum", "STRENGTH_FRACTION", "HOST_STRENGTH_MARK",
           "host_strength",
           "warn_host_strength"]

#: expected relative error of the closed forms above which compute_coefficients warns [-]
ERROR_TOLERANCE = 0.02
#: relative difference of the two inception criteria above which compute_coefficients warns [-]; for mm voids in
#: air at 1 atm they agree within about 3 % (physics brief §3.1: within 5-9 % of the empirical curve)
CRITERIA_TOLERANCE = 0.10
#: factor of p·l around the Paschen minimum within which compute_coefficients warns [-]: there the breakdown
#: voltage is set by the Townsend mechanism and rests on the wall's secondary-emission coefficient γ (from memory
#: for polymer walls) and on the measured minimum, not on the streamer constants (common practice: the minimum
#: region of measured Paschen curves spans about a factor 3 in p·d either side)
PASCHEN_NEIGHBOURHOOD = 3.0
#: fraction of the host's typical short-time dielectric strength at which the mean bulk peak field is flagged
#: [-]. Common practice: tabulated short-time strengths come from thin specimens and ramp tests; thick parts under
#: long AC stress fail at a fraction of them, and designs work well below (a factor 2 is a mild allowance).
STRENGTH_FRACTION = 0.5
#: words every host-strength warning carries (so that a caller that already warned at its own voltage can tell them)
HOST_STRENGTH_MARK = "of its typical short-time dielectric strength"

_ADVICE = "use pdvoid.fields.coefficients(scenario) for the numerical field solution"


def _percent(x: float) -> str:
    return f"{x * 100:.1f} %" if x < 0.1 else f"{x * 100:.0f} %"


def _mm(x: float) -> str:
    return f"{x * 1e3:.3g} mm"


def warn_closed_form_limits(shape: str, diameter: float, height: float, thickness: float, permittivity: float,
                            position: str = "centred", depolarization: float | None = None) -> list[str]:
    """Warn (:class:`~pdvoid.core.validity.ValidityWarning`) for every closed-form limit the void leaves.

    Parameters
    ----------
    shape : str
        "spheroid" or "cylinder" [-].
    diameter, height, thickness : float
        Void diameter D, void height h and slab thickness d [m].
    permittivity : float
        Host relative permittivity [-].
    position : str
        "centred", "high_voltage_electrode" or "ground_electrode" (a void on an electrode is checked as its
        mirrored whole, of height 2h in a slab 2d thick) [-].
    depolarization : float, optional
        N of the spheroid closed forms (they ignore the slab); not used for a cylinder, whose closed form
        includes the slab [-].

    Returns
    -------
    list of str
        The warning messages issued (empty in the ordinary case) [-].
    """
    messages = []
    mirror = 1.0 if position == "centred" else 2.0
    where = "" if position == "centred" else " on the electrode"
    err = electrode_proximity_error(diameter, mirror * height, mirror * thickness,
                                    depolarization if shape == "spheroid" else None, permittivity)
    if err > ERROR_TOLERANCE:
        messages.append(
            f"the void{where} is {_mm(height)} tall and {_mm(diameter)} wide in a {_mm(thickness)} slab: it is "
            f"not small against the slab, and the closed-form field enhancement and charge per field may be off "
            f"by about {_percent(err)} (they hold within {ERROR_TOLERANCE * 100:g} % for a void far from the "
            f"electrodes); {_ADVICE}"
        )
    if shape == "cylinder":
        aspect = diameter / height
        lo, hi = TABLE_ASPECT_RANGE
        # a relative slack of 1e-9 keeps the ends of the range (e.g. 1000:1 built as d and d/1000) inside it
        if aspect < lo * (1.0 - 1e-9):
            messages.append(
                f"the cylindrical void is {_mm(height)} tall and only {_mm(diameter)} wide (diameter/height "
                f"{aspect:.3g}): a tall narrow cylinder outside the verified range {lo:g} to {hi:g}; its field "
                f"enhancement and charge per field are extrapolated towards the needle limit (f -> 1) and may be "
                f"off by several %; {_ADVICE}"
            )
        elif aspect > hi * (1.0 + 1e-9):
            messages.append(
                f"the cylindrical void has diameter/height {aspect:.4g}, outside the verified range {lo:g} to "
                f"{hi:g}; its coefficients are extrapolated with the flat-disc asymptote (1 - N proportional to "
                f"height/diameter), probably within 1 %, but unverified; {_ADVICE}"
            )
    for m in messages:
        warn_validity(m)
    return messages


def warn_criteria_disagree(streamer_field: float, integral_field: float) -> str | None:
    """Warn (:class:`~pdvoid.core.validity.ValidityWarning`) when the two inception criteria differ by more than
    :data:`CRITERIA_TOLERANCE` (10 %): the inception voltage is then uncertain by that much, and a verdict
    against a test level may depend on the criterion.

    Parameters
    ----------
    streamer_field, integral_field : float
        Inception field by the streamer formula and by the ionisation integral [V/m]; nothing is checked when
        either is not finite (a criterion unavailable for the gas, or no self-sustained discharge).

    Returns
    -------
    str or None
        The message issued, or None.
    """
    if not (math.isfinite(streamer_field) and math.isfinite(integral_field)):
        return None
    low, high = sorted((streamer_field, integral_field))
    if high <= low * (1.0 + CRITERIA_TOLERANCE):
        return None
    message = (
        f"the two inception criteria disagree by {_percent(high / low - 1.0)}: the streamer formula gives "
        f"{streamer_field / 1e6:.4g} kV/mm, the ionisation integral {integral_field / 1e6:.4g} kV/mm in the void; "
        "the inception voltage is uncertain by that much (compare both against a test level)"
    )
    warn_validity(message)
    return message


def warn_near_paschen_minimum(pd: float, minimum_pd: float | None, minimum_voltage: float | None, gas: str,
                              regime: str) -> str | None:
    """Warn (:class:`~pdvoid.core.validity.ValidityWarning`) when the void's p·l lies within a factor
    :data:`PASCHEN_NEIGHBOURHOOD` of the gas's Paschen minimum, where the inception voltage rests on the wall's
    secondary-emission coefficient and the measured minimum rather than on the streamer constants.

    Parameters
    ----------
    pd : float
        Density-equivalent pressure × discharge length of the void [Pa m].
    minimum_pd, minimum_voltage : float or None
        p·d [Pa m] and voltage [V] of the gas's Paschen minimum (None: the gas has no Townsend data).
    gas : str
        The gas's name, for the message [-].
    regime : str
        The inception regime; nothing is issued for "no self-sustained discharge", whose reason says it all.

    Returns
    -------
    str or None
        The message issued, or None.
    """
    if minimum_pd is None or minimum_voltage is None or not math.isfinite(pd):
        return None
    if regime == "no self-sustained discharge":
        return None
    if not minimum_pd / PASCHEN_NEIGHBOURHOOD <= pd <= minimum_pd * PASCHEN_NEIGHBOURHOOD:
        return None
    message = (
        f"p*l = {pd:.3g} Pa m is near the Paschen minimum of {gas} ({minimum_voltage:.0f} V at {minimum_pd:.3g} Pa m): "
        "the inception voltage follows from the Townsend criterion and the measured minimum, and depends on the "
        "secondary emission of the void wall (its γ is from memory for polymer walls); treat it as uncertain by "
        "tens of per cent"
    )
    warn_validity(message)
    return message


def host_strength(insulation: Insulation) -> tuple[float, str] | None:
    """The host's typical short-time dielectric strength and where it comes from.

    Parameters
    ----------
    insulation : Insulation
        The insulation: its own ``dielectric_strength`` wins; otherwise its material's tabulated value.

    Returns
    -------
    tuple of (float, str) or None
        Strength [V/m] and a short source text ("given in the scenario", or the material and the status of its
        tabulated value); None when neither is known.
    """
    if insulation.dielectric_strength is not None:
        return float(insulation.dielectric_strength), "given in the scenario"
    if insulation.material is None:
        return None
    from pdvoid.inputs.materials import get_material

    mat = get_material(insulation.material)
    if mat.dielectric_strength is None:
        return None
    prov = mat.dielectric_strength_provenance
    where = f"typical for {mat.name}"
    if prov is not None:
        where += f", {prov.status}"
    return float(mat.dielectric_strength), where


def warn_host_strength(insulation: Insulation, peak_voltage: float, situation: str) -> str | None:
    """Warn (:class:`~pdvoid.core.validity.ValidityWarning`) when the mean bulk field reaches
    :data:`STRENGTH_FRACTION` of the host's typical dielectric strength.

    The mean bulk field is peak_voltage / thickness, the field of the intact slab far from the void. The void models
    assume that the host withstands it; near its short-time strength the insulation itself may fail, and a verdict
    about the void says little.

    Parameters
    ----------
    insulation : Insulation
        The insulation (thickness and strength, see :func:`host_strength`).
    peak_voltage : float
        Peak applied voltage [V]; nothing is checked when it is not finite and positive.
    situation : str
        Where the voltage comes from, for the message (e.g. "at the test level") [-].

    Returns
    -------
    str or None
        The message issued, or None (below the fraction, or no strength known).
    """
    if not (math.isfinite(peak_voltage) and peak_voltage > 0.0):
        return None
    known = host_strength(insulation)
    if known is None:
        return None
    strength, source = known
    coaxial = isinstance(insulation, Coaxial)  # the field is highest at the inner conductor
    if coaxial:
        field = peak_voltage * peak_field_per_volt(insulation)
        where = f"at the inner conductor, {peak_voltage / 1e3:.4g} kV over a {_mm(insulation.thickness)} wall"
    else:
        field = peak_voltage / insulation.thickness
        where = f"{peak_voltage / 1e3:.4g} kV over {_mm(insulation.thickness)}"
    ratio = field / strength
    if ratio < STRENGTH_FRACTION:
        return None
    message = (
        f"{situation} the {'highest' if coaxial else 'mean'} field in the host is {field / 1e6:.3g} kV/mm peak "
        f"({where}), which is {ratio * 100:.0f} % {HOST_STRENGTH_MARK} "
        f"{strength / 1e6:.3g} kV/mm ({source}): the insulation itself may fail, which the void model does "
        "not describe"
    )
    warn_validity(message)
    return message
