"""Townsend breakdown of a gas gap, the Paschen-minimum floor, and how they combine with the streamer criterion.

The streamer criteria of :mod:`pdvoid.physics.inception` (Niemeyer-type formula, ionisation integral) describe
breakdown in the mm–cm range but have no Paschen minimum: the formula's E·l falls towards zero as p·l → 0. This
module adds the two pieces that hold at small p·l:

- the Townsend criterion γ·(exp(α d) − 1) = 1 with α/p = A·exp(−B p/E), i.e. Paschen's law
  (:func:`townsend_breakdown_voltage`), with the secondary-emission coefficient γ of the cathode wall as a
  parameter;
- the Paschen-minimum floor (:func:`paschen_floor_voltage`): Paschen's law fitted through the *measured* minimum
  of the gas, which gives the left branch, the minimum itself and, left of the asymptote A·p·d ≤ ln(1 + 1/γ),
  no self-sustained discharge at all.

:func:`combine_criteria` joins them with a streamer field into one :class:`InceptionResult` (value, regime,
reason). Pressures enter as the density-equivalent pressure p·(293.15 K/T).

All p·d values here are SI (Pa m); 1 Torr cm = 1.33322368 Pa m.
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass
from typing import TYPE_CHECKING

from pdvoid.core.errors import check_choice, check_range
from pdvoid.core.units import T_ROOM
from pdvoid.core.validity import ValidityWarning

if TYPE_CHECKING:
    from pdvoid.inputs.materials import GasData

__all__ = [
    "TORR_CM",
    "REGIMES",
    "WALL_SECONDARY_EMISSION",
    "TOWNSEND_PD_MAX",
    "STREAMER_PD_MAX",
    "STREAMER_PD_MIN",
    "InceptionResult",
    "wall_secondary_emission",
    "townsend_breakdown_voltage",
    "paschen_floor_voltage",
    "combine_criteria",
]

#: 1 Torr cm in Pa m (exact: 101325/760 Pa x 0.01 m).
TORR_CM = 101325.0 / 760.0 * 0.01

#: The regimes an inception result can be in.
REGIMES = ("streamer", "townsend", "no self-sustained discharge")

#: Secondary-emission coefficient γ of a void wall acting as cathode, per wall kind [-].
#: "metal": 0.01, the γ of Bazelyan & Raizer's Paschen constants of air between metal electrodes (bazelyan1998,
#: confirmed via lux_paschen; "cathode dependent, poorly known"). "polymer": 0.01 as well (from memory: values
#: of 1e-3 to 1e-1 are used for dielectric surfaces in discharge models, and no measured value for epoxy or
#: polyethylene walls could be confirmed; the metal value is kept rather than an invented one). Pass the
#: coefficient of the wall explicitly (``pdvoid.Void(secondary_emission=...)``) when it is known.
WALL_SECONDARY_EMISSION = {"metal": 0.01, "polymer": 0.01}

#: Upper end [Pa m] of the p·d range where the Townsend fit A = 15 /(cm Torr), B = 365 V/(cm Torr) holds:
#: E/p ≥ 100 V/(cm Torr) (raizer1991, from memory) is reached at about 13 Torr cm for air; 20 Pa m = 15 Torr cm.
TOWNSEND_PD_MAX = 20.0

#: Upper end [Pa m] of the p·l range of the combined criterion: the streamer formula and the empirical
#: uniform-field curve it is checked against cover gaps up to δ·d ≈ 10 cm (lux_paschen; common practice).
STREAMER_PD_MAX = 1.0e4

#: Lower end [Pa m] of the p·l range of a streamer criterion used alone (a gas without Townsend constants):
#: about 0.1 mm at 1 atm (the stated range of :func:`pdvoid.physics.inception.streamer_inception_field`).
STREAMER_PD_MIN = 10.0


@dataclass(frozen=True)
class InceptionResult:
    """An inception field with the regime that set it and the reason, so callers can say why.

    Attributes
    ----------
    field : float
        Inception field inside the gas [V/m]; ``math.inf`` when no self-sustained discharge is possible.
    voltage : float
        field × length, the voltage across the gap at inception [V] (``math.inf`` likewise).
    regime : str
        ``"streamer"``, ``"townsend"`` or ``"no self-sustained discharge"`` (:data:`REGIMES`).
    reason : str
        One sentence saying which criterion decided and why.
    pd : float
        Density-equivalent pressure × length [Pa m].
    streamer_field : float
        The streamer criterion alone [V/m] (``inf`` where it cannot be met).
    townsend_field : float
        The Townsend criterion alone [V/m] (``inf`` left of its asymptote; NaN without Townsend constants).
    floor_field : float
        The Paschen-minimum floor [V/m] (NaN without Townsend constants).
    """

    field: float
    voltage: float
    regime: str
    reason: str
    pd: float
    streamer_field: float
    townsend_field: float
    floor_field: float

    @property
    def finite(self) -> bool:
        """True when a self-sustained discharge is possible (a finite inception field)."""
        return math.isfinite(self.field)


def wall_secondary_emission(wall: str) -> float:
    """Default secondary-emission coefficient γ of a void wall [-] (:data:`WALL_SECONDARY_EMISSION`).

    Parameters
    ----------
    wall : str
        ``"polymer"`` (a void inside solid insulation) or ``"metal"`` (an electrode as cathode).

    Returns
    -------
    float
        γ [-].
    """
    check_choice("wall", wall, tuple(WALL_SECONDARY_EMISSION))
    return WALL_SECONDARY_EMISSION[wall]


def _scalar(name: str, value: object, unit: str) -> float:
    return check_range(name, value, 0.0, math.inf, low_open=True, unit=unit)


def _gamma(value: object) -> float:
    return check_range("secondary_emission", value, 0.0, 1.0, low_open=True)


def townsend_breakdown_voltage(pressure: float, gap: float, *, a_coefficient: float, b_coefficient: float,
                               secondary_emission: float, temperature: float = T_ROOM,
                               check_validity: bool = True) -> float:
    """Townsend criterion γ(e^{αd} − 1) = 1 with α/p = A·e^{−Bp/E}: V_b = B·pd / ln(A·pd / ln(1 + 1/γ)).

    p is the density-equivalent pressure p·(293.15 K/T). Unlike :func:`pdvoid.physics.inception.paschen_voltage`
    (same formula), this function returns ``math.inf`` at and left of the asymptote A·pd ≤ ln(1 + 1/γ), where no
    Townsend discharge exists at any voltage.

    Validity: the air constants A = 15 /(cm Torr), B = 365 V/(cm Torr) fit α for E/p = 100–800 V/(cm Torr),
    i.e. from near the asymptote up to p·d ≈ 13 Torr cm (about 17 Pa m; 0.17 mm at 1 atm). A
    :class:`~pdvoid.core.validity.ValidityWarning` is given above :data:`TOWNSEND_PD_MAX` = 20 Pa m, where the
    formula over-predicts (1 cm at 1 atm: 35.5 kV against a measured ~30 kV).

    Parameters
    ----------
    pressure : float
        Gas pressure p [Pa], > 0.
    gap : float
        Gap d along the field [m], > 0.
    a_coefficient : float
        A [1/(Pa m)], > 0 (air: 11.2509 = 15 /(cm Torr)).
    b_coefficient : float
        B [V/(Pa m)], > 0 (air: 273.7725 = 365 V/(cm Torr)).
    secondary_emission : float
        γ of the cathode [-], in (0, 1].
    temperature : float
        Gas temperature T [K], > 0.
    check_validity : bool
        Warn outside the validity range (the combined criterion checks its own range instead).

    Returns
    -------
    float
        Breakdown voltage V_b [V], or ``math.inf``.

    References
    ----------
    bazelyan1998 (air A, B, γ = 0.01; confirmed via lux_paschen), raizer1991 (A, B table and E/p range; from
    memory).
    """
    a = _scalar("a_coefficient", a_coefficient, "1/(Pa m)")
    b = _scalar("b_coefficient", b_coefficient, "V/(Pa m)")
    g = _gamma(secondary_emission)
    pd = _scalar("pressure", pressure, "Pa") * (T_ROOM / _scalar("temperature", temperature, "K")) * _scalar(
        "gap", gap, "m")
    if check_validity and pd > TOWNSEND_PD_MAX:
        warnings.warn(f"townsend_breakdown_voltage: pd = {pd:.4g} Pa m is above {TOWNSEND_PD_MAX:g} Pa m, outside "
                      "the fit range E/p >= 100 V/(cm Torr) of A and B; the result over-predicts",
                      ValidityWarning, stacklevel=2)
    x = a * pd / math.log1p(1.0 / g)
    if x <= 1.0:
        return math.inf
    return b * pd / math.log(x)


def paschen_floor_voltage(pressure: float, gap: float, *, minimum_voltage: float, minimum_pd: float,
                          reference_emission: float, secondary_emission: float,
                          temperature: float = T_ROOM) -> float:
    """The lowest uniform-field breakdown voltage at p·d: the Paschen curve fitted through the measured minimum.

    Paschen's law V = B_m·pd / ln(A_m·pd / ln(1 + 1/γ)) with constants chosen (derived) so that at the γ of the
    measurement, γ_ref, its minimum is the measured one, V_min at (pd)_min:

        B_m = V_min / (pd)_min,     A_m = e·ln(1 + 1/γ_ref) / (pd)_min.

    For the wall's γ the minimum moves to (pd)_min,γ = e·ln(1 + 1/γ)/A_m with V_min,γ = B_m·(pd)_min,γ. The
    floor is that curve at and left of its minimum (the left branch, rising to infinity at the asymptote), and
    V_min,γ to the right of it: right of the minimum the fitted curve rises faster than measured (its B_m is a
    high-E/p value), so only the minimum itself is kept there as a lower bound. Air: 327 V at 0.570 Torr cm
    with γ = 0.01 gives B_m = 573.7 V/(cm Torr), A_m = 22.0 /(cm Torr), asymptote 0.210 Torr cm (2.8 µm at 1 atm).

    Validity: any p·d (it is a bound); the left branch is as uncertain as the measured minimum's position and
    ignores field emission, which lowers breakdown of metal gaps below about 5 µm (not of polymer voids).

    Parameters
    ----------
    pressure : float
        Gas pressure p [Pa], > 0.
    gap : float
        Gap d [m], > 0.
    minimum_voltage : float
        Measured V_min [V], > 0 (air: 327).
    minimum_pd : float
        Measured (pd)_min at 293.15 K [Pa m], > 0 (air: 0.7599 = 0.570 Torr cm).
    reference_emission : float
        γ_ref of the electrodes of that measurement [-], in (0, 1] (air: 0.01).
    secondary_emission : float
        γ of the void's cathode wall [-], in (0, 1].
    temperature : float
        Gas temperature T [K], > 0.

    Returns
    -------
    float
        Floor voltage [V]; ``math.inf`` at and left of the asymptote (no self-sustained discharge).

    References
    ----------
    hvc_paschen (327 V at 7.5 µm, 1 atm; confirmed), naidu2013 (327 V at 0.567 Torr cm; from memory),
    bazelyan1998 (γ = 0.01 of air between metal electrodes).
    """
    pd = _scalar("pressure", pressure, "Pa") * (T_ROOM / _scalar("temperature", temperature, "K")) * _scalar(
        "gap", gap, "m")
    v_fit, v_min_g, pd_min_g = _fit_through_minimum(pd, minimum_voltage, minimum_pd, reference_emission,
                                                    secondary_emission)
    return v_fit if pd < pd_min_g else v_min_g


def _fit_through_minimum(pd: float, minimum_voltage: float, minimum_pd: float, reference_emission: float,
                         secondary_emission: float) -> tuple[float, float, float]:
    """(Paschen fit through the measured minimum at pd [V] or inf, its minimum V_min,γ [V], (pd)_min,γ [Pa m])."""
    v_min = _scalar("minimum_voltage", minimum_voltage, "V")
    pd_min = _scalar("minimum_pd", minimum_pd, "Pa m")
    g_ref = _gamma(reference_emission)
    c = math.log1p(1.0 / _gamma(secondary_emission))
    b_m = v_min / pd_min
    a_m = math.e * math.log1p(1.0 / g_ref) / pd_min
    pd_min_g = math.e * c / a_m
    x = a_m * pd / c
    v_fit = b_m * pd / math.log(x) if x > 1.0 else math.inf
    return v_fit, b_m * pd_min_g, pd_min_g


def combine_criteria(gas: GasData, pressure: float, length: float, temperature: float, streamer_field: float, *,
                     secondary_emission: float | None = None, criterion: str = "streamer") -> InceptionResult:
    """One inception field from a streamer criterion, the Townsend criterion and the Paschen-minimum floor.

    The rule (our own, documented choice):

        E_inc = max( E_floor, min(E_Townsend, E_streamer) )

    - E_Townsend is Paschen's law with the wall's γ and the lower of two constant sets at each p·d: the
      gas's A, B (air: 15 /(cm Torr), 365 V/(cm Torr), fitted for E/p = 100–800 V/(cm Torr), bazelyan1998) and
      the fit through the measured minimum (:func:`paschen_floor_voltage`; high E/p). Each over-predicts
      outside its range (the first near its asymptote, the second right of the minimum), so the lower one is
      taken (derived; the two meet near 0.6 Torr cm for air).
    - ``min``: a self-sustained discharge starts by whichever mechanism needs the lower field — Townsend's
      (secondary emission from the cathode wall) or the streamer's (space-charge growth of one avalanche).
      This is the textbook picture of a Townsend regime at small p·d and a streamer regime at large p·d
      (kuffel2000, raizer1991; from memory), with the transition where the two criteria meet rather than at
      a fixed p·d. For air with the streamer formula they meet near 15 Torr cm (0.2 mm at 1 atm), with the
      ionisation integral near 0.4 mm. Taking the lower of the two keeps the ionisation integral (a streamer
      criterion with K ≈ 9.15) from over-predicting Townsend-regime voids: at 50 µm it exceeds the Townsend
      value by 65 %.
    - ``max`` with the floor: neither fit knows the Paschen minimum (the streamer formula falls towards zero,
      A = 15 /(cm Torr) puts the minimum at 305 V instead of the measured 327 V), so no result may lie below
      the measured curve's lower envelope (:func:`paschen_floor_voltage`); left of its asymptote no
      self-sustained discharge is possible and the field is infinite. For air the result is flat at 327 V
      from 0.57 to about 1.3 Torr cm (7.5–17 µm at 1 atm), where the measured curve rises slowly; there it errs
      low, the conservative side for a design margin.

    Validity: p·l from 0 (an infinite field is the answer there) up to :data:`STREAMER_PD_MAX` = 1e4 Pa m
    (about 10 cm at 1 atm); a :class:`~pdvoid.core.validity.ValidityWarning` above. A gas without Townsend
    constants (SF6, or a user gas) uses the streamer criterion alone, with a ValidityWarning below p·l =
    :data:`STREAMER_PD_MIN` = 10 Pa m, and for a linear α fit (n = 1) also below B/0.3 (SF6: 14.3 Pa m, where
    the fit holds within about ±30 % of (E/p)_lim; from memory).

    Parameters
    ----------
    gas : pdvoid.inputs.materials.GasData
        The gas constants (Townsend constants and measured minimum optional).
    pressure : float
        Gas pressure p [Pa], > 0.
    length : float
        Discharge length l along the field [m], > 0.
    temperature : float
        Gas temperature T [K], > 0.
    streamer_field : float
        The streamer criterion's field [V/m], > 0 (``math.inf`` where a streamer cannot form).
    secondary_emission : float, optional
        γ of the cathode wall [-] (default: the gas's reference γ, i.e. the electrodes of its measured curve).
    criterion : str
        Name of the streamer criterion, for the reason text.

    Returns
    -------
    InceptionResult
        The combined field with its regime and reason.

    References
    ----------
    bazelyan1998, raizer1991, hvc_paschen, naidu2013, niemeyer1995, morrow1997 (see the criteria combined).
    """
    p = _scalar("pressure", pressure, "Pa")
    l = _scalar("length", length, "m")
    t = _scalar("temperature", temperature, "K")
    e_s = check_range("streamer_field", streamer_field, 0.0, math.inf, low_open=True, unit="V/m", allow_inf=True)
    pd = p * (T_ROOM / t) * l
    if pd > STREAMER_PD_MAX * (1.0 + 1e-12):
        warnings.warn(f"inception criterion: p*l = {pd:.4g} Pa m (density-equivalent) is above "
                      f"{STREAMER_PD_MAX:g} Pa m, outside the range the streamer criterion was checked over "
                      "(gaps up to about 10 cm at 1 atm)", ValidityWarning, stacklevel=3)
    a_ab, b_ab, g_ref = gas.paschen_a, gas.paschen_b, gas.secondary_emission
    v_min_ref, pd_min_ref = gas.paschen_minimum_voltage, gas.paschen_minimum_pd
    if a_ab is None or b_ab is None or g_ref is None or v_min_ref is None or pd_min_ref is None:
        # lower end of the streamer constants' range: p*l = 10 Pa m for the formula (common practice, see
        # streamer_inception_field); for a linear alpha fit (n = 1) B/(p l) <= 0.3 as well (SF6: 14.3 Pa m)
        b_range = max(STREAMER_PD_MIN, gas.b_constant / 0.3 if gas.exponent == 1.0 else 0.0)
        if pd < b_range:
            warnings.warn(f"inception criterion: gas {gas.name!r} has no Townsend constants and no measured Paschen "
                          f"minimum, so only the streamer criterion is used; p*l = {pd:.4g} Pa m is below "
                          f"{b_range:.3g} Pa m, where it is extrapolated and may lie below the real Paschen "
                          "curve", ValidityWarning, stacklevel=3)
        reason = (f"{criterion} criterion ({gas.name} has no Townsend constants; the Townsend branch is not "
                  "available)")
        return InceptionResult(e_s, e_s * l, "streamer", reason, pd, e_s, math.nan, math.nan)
    gamma = g_ref if secondary_emission is None else _gamma(secondary_emission)
    v_ab = townsend_breakdown_voltage(p, l, a_coefficient=a_ab, b_coefficient=b_ab,
                                      secondary_emission=gamma, temperature=t, check_validity=False)
    v_fit, v_min_g, pd_min_g = _fit_through_minimum(pd, v_min_ref, pd_min_ref, g_ref, gamma)
    v_t = min(v_ab, v_fit)  # the Townsend criterion: each Paschen fit where it is the lower (see above)
    v_f = v_fit if pd < pd_min_g else v_min_g
    e_t, e_f = v_t / l, v_f / l
    torr_cm = pd / TORR_CM
    if math.isinf(e_f):
        asym = math.log1p(1.0 / gamma) / (math.e * math.log1p(1.0 / g_ref) / pd_min_ref)
        reason = (f"no self-sustained discharge: p*l = {pd:.4g} Pa m ({torr_cm:.3g} Torr cm) lies left of the "
                  f"Paschen asymptote {asym:.4g} Pa m of {gas.name} with wall gamma = {gamma:g}; an avalanche "
                  "cannot multiply enough to sustain itself at any voltage")
        return InceptionResult(math.inf, math.inf, REGIMES[2], reason, pd, e_s, e_t, e_f)
    e_mech = min(e_t, e_s)
    if e_f >= e_mech:
        regime = "townsend"
        reason = (f"Townsend regime, Paschen-minimum floor: p*l = {pd:.4g} Pa m ({torr_cm:.3g} Torr cm); the "
                  f"lowest breakdown voltage of {gas.name} at this p*l ({v_f:.4g} V, wall gamma = {gamma:g}) "
                  f"exceeds the Townsend ({v_t:.4g} V) and {criterion} ({e_s * l:.4g} V) criteria")
        field = e_f
    elif e_t <= e_s:
        regime = "townsend"
        reason = (f"Townsend regime: p*l = {pd:.4g} Pa m ({torr_cm:.3g} Torr cm); secondary emission from the "
                  f"wall (gamma = {gamma:g}) sustains a discharge at {v_t:.4g} V, below the {criterion} "
                  f"criterion's {e_s * l:.4g} V")
        field = e_t
    else:
        regime = "streamer"
        reason = (f"streamer regime: p*l = {pd:.4g} Pa m ({torr_cm:.3g} Torr cm); the {criterion} criterion "
                  f"({e_s * l:.4g} V) is met below the Townsend criterion ({v_t:.4g} V)")
        field = e_s
    return InceptionResult(field, field * l, regime, reason, pd, e_s, e_t, e_f)
