"""Scenario → the coefficients every model runs on (field enhancement, inception and residual field, charge per
field drop, capacitances, inception voltage), computed from the physics functions."""

from __future__ import annotations

import dataclasses
import math
from typing import TYPE_CHECKING

from pdvoid.coefficients.coaxial import local_gap, proximity_thickness, warn_coaxial_limits
from pdvoid.coefficients.cylinder import cylinder_coefficients
from pdvoid.coefficients.limits import (
    warn_closed_form_limits,
    warn_criteria_disagree,
    warn_host_strength,
    warn_near_paschen_minimum,
)
from pdvoid.coefficients.record import Coefficients
from pdvoid.core.errors import InputError
from pdvoid.inputs.coaxial import Coaxial
from pdvoid.inputs.materials import GasData, get_gas
from pdvoid.inputs.supplies import TimeSupply
from pdvoid.inputs.waveform import peak_value
from pdvoid.physics.electrons import volume_electron_rate
from pdvoid.physics.geometry import (
    depolarization_spheroid,
    field_enhancement,
    induced_charge_per_field,
    spheroid_volume,
)
from pdvoid.physics.inception import inception_criterion
from pdvoid.physics.network import flat_void_capacitances, spheroid_network_equivalent, void_voltage_ratio

if TYPE_CHECKING:
    from pdvoid.inputs.parameters import Periodic, Sine
    from pdvoid.inputs.scenario import Scenario

__all__ = ["compute_coefficients", "supply_peak_factor"]


def supply_peak_factor(supply: Sine | Periodic | TimeSupply) -> float:
    """Peak of |V| divided by the rms value the supply is specified with [-].

    Parameters
    ----------
    supply : Sine, Periodic or a supply without a period
        The supply.

    Returns
    -------
    float
        peak |V| / rms [-] (√2 for a plain sine; about 1 for DC).
    """
    if isinstance(supply, TimeSupply):  # a supply without a period knows its own peak
        return float(supply.peak) / float(supply.rms)
    orders, a, b = supply.fourier()
    return peak_value(orders, a, b) / supply.rms


def compute_coefficients(scenario: Scenario) -> Coefficients:
    """All coefficients of a :class:`pdvoid.inputs.scenario.Scenario` (see :class:`Coefficients`).

    Parameters
    ----------
    scenario : Scenario
        The scenario.

    Returns
    -------
    Coefficients
        Its coefficients in SI, with the reference keys relied on.

    Raises
    ------
    InputError
        When the scenario's geometry lies outside the closed forms (e.g. a spheroid too tall for its network
        equivalent when the model needs it), or the inception criterion has no data for the gas; for anything
        that is not a Scenario.
    """
    from pdvoid.inputs.scenario import Scenario

    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    ins, void, model = scenario.insulation, scenario.void, scenario.model
    d, er = ins.thickness, ins.permittivity
    if er is None:  # Insulation fills it in from its material; never None after construction
        raise InputError("insulation.permittivity or insulation.material must be given; got neither")
    D, h = void.diameter, void.height
    refs = ["niemeyer1995", "gutfleisch1995", "hess1951"]
    # the plane slab with the applied and weighting fields of the void centre: d itself for a plane slab,
    # r ln(R/r_i) in a coaxial insulation (pdvoid.coefficients.coaxial)
    coax = isinstance(ins, Coaxial)
    d_loc = local_gap(ins, void)
    if coax:
        refs += ["kuffel2000_fields", "pedersen1991"]
        warn_coaxial_limits(ins, void)

    if void.shape == "spheroid":
        # a void on an electrode is half a spheroid; with its mirror image in the equipotential electrode it is a
        # whole spheroid of height 2h (method of images): same field, and the real half carries half the dipole
        h_full = h if void.position == "centred" else 2.0 * h
        # the physics functions return floats for float inputs; float() only tells the type checker so
        n = float(depolarization_spheroid(D, h_full))
        f = float(field_enhancement(er, n))
        omega = float(spheroid_volume(D, h_full)) * (h / h_full)
        c_field = float(induced_charge_per_field(er, n, omega, d_loc))
        if f * h < d_loc:
            if void.position == "centred":
                equivalent = spheroid_network_equivalent(D, h, d_loc, er)
                c_b, c_c = float(equivalent.c_b), float(equivalent.c_c)
            else:
                c_b, c_c = c_field / h, c_field / h * (d / (f * h) - 1.0)
        elif model.gain_from_network and model.network_capacitances() is None:
            raise InputError(
                f"void.height {h:g} m is too large for the network equivalent of a spheroid in "
                + (f"the local gap r ln(R/r_i) = {d_loc:g} m of the coaxial insulation (needs f·height < gap; "
                   if coax else f"insulation.thickness {d:g} m (needs f·height < thickness; ")
                + f"f = {f:.4g})"
            )
        else:
            c_b = c_c = math.nan  # the field model does not need the network equivalent
        refs += ["dlmf19.33", "osborn1945", "stratton1941", "crichton1989", "pedersen1991"]
    else:  # cylinder, any aspect ratio: solver table + slab weight (pdvoid.coefficients.cylinder)
        # a void on an electrode: the same image construction as for the spheroid (mirrored void of height 2h
        # centred in a slab 2d thick; same field, same charge per field)
        mirror = 1.0 if void.position == "centred" else 2.0
        cyl = cylinder_coefficients(D, mirror * h, mirror * d_loc, er)
        f, n, c_field = cyl.field_enhancement, cyl.depolarization, cyl.charge_per_field
        omega = cyl.volume / mirror
        c_b = c_field / h
        k_eq = f * h / d_loc
        c_c = c_b * (1.0 / k_eq - 1.0) if k_eq < 1.0 else math.nan
        refs += ["cylinder_table", "crichton1989", "pedersen1991", "stratton1941", "gemant1932", "kreuger1989",
                 "kuffel2000"]
    if void.field_enhancement is None:
        warn_closed_form_limits(void.shape, D, h, proximity_thickness(ins, void), er, void.position, n)
    # a numerical field solution replaces the closed forms (Void requires both values together)
    if void.field_enhancement is not None and void.charge_per_field is not None:
        f, c_field = void.field_enhancement, void.charge_per_field
        n = (er / f - er) / (1.0 - er) if er > 1.0 and f != er else math.nan
        k_eq = f * h / d_loc
        c_b = c_field / h
        c_c = c_b * (1.0 / k_eq - 1.0) if k_eq < 1.0 else math.nan
        refs.append("pedersen1991")
    c_a = math.nan
    if ins.area is not None:
        s_void = math.pi * D * D / 4.0
        if ins.area <= s_void:
            raise InputError(f"insulation.area must exceed the void's cross-section {s_void:g} m²; got {ins.area:g}")
        c_parallel = flat_void_capacitances(D, min(h, 0.999 * d), d, er, specimen_area=ins.area).a
        c_a = math.nan if c_parallel is None else float(c_parallel)  # never None: the area is given

    l_str = void.streamer_length
    # the gas state: a sealed void keeps its density when heated (its pressure rises), a vented one its pressure
    p_gas, t_gas, gamma = void.gas_pressure, void.temperature, void.secondary_emission
    r_str = inception_criterion(void.gas, p_gas, l_str, t_gas, criterion="streamer", secondary_emission=gamma)
    e_str = r_str.field
    r_int = None
    try:
        r_int = inception_criterion(void.gas, p_gas, l_str, t_gas, criterion="ionization_integral",
                                    secondary_emission=gamma)
        e_int = r_int.field
        refs.append("morrow1997" if void.gas == "air" else "pedersen1970")
    except InputError:
        # the second estimate is unavailable (no ionisation data for this gas); that is only an error when the
        # model relies on it
        if model.inception_criterion == "ionization_integral":
            raise
        e_int = math.nan
    warn_criteria_disagree(e_str, e_int)
    gas_data = get_gas(void.gas)
    warn_near_paschen_minimum(r_str.pd, gas_data.paschen_minimum_pd, gas_data.paschen_minimum_voltage, void.gas,
                              r_str.regime)
    chosen = r_str if model.inception_criterion == "streamer" else r_int
    assert chosen is not None
    e_inc = chosen.field
    if chosen.regime != "streamer":
        refs += ["bazelyan1998", "hvc_paschen"]
    if void.sealed:
        refs.append("massarczyk2017")  # breakdown follows the density (Paschen's law with the ideal gas law)
    e_res = model.residual_ratio * e_inc if math.isfinite(e_inc) else math.inf

    given = model.network_capacitances()
    if given is not None:  # a network model with capacitances of its own
        c_c, c_b = given
        c_field = c_b * h
    k = float(void_voltage_ratio(c_b, c_c)) if math.isfinite(c_b) else math.nan
    if model.gain_from_network:
        gain_field = k / h  # void field per applied volt
        refs += ["gemant1932", "kreuger1989"]
    else:
        gain_field = f / d_loc
    pf = supply_peak_factor(scenario.supply)

    def u_inc(e: float) -> float:
        if math.isinf(e):
            return math.inf  # no self-sustained discharge at any voltage
        return e / (gain_field * pf) if math.isfinite(e) else math.nan

    e_range, cr_range = _streamer_spread(gas_data, p_gas, l_str, t_gas, gamma, e_str)
    if math.isfinite(e_inc):
        warn_host_strength(scenario.insulation, e_inc / gain_field, "at the inception voltage")
    n_vol = float(volume_electron_rate(omega, p_gas, void.temperature,
                                       ionization_rate=model.ionization_rate, electron_yield=model.electron_yield))
    # the field enhancement is per mean field V/d; in a coaxial insulation it includes the local field factor
    f_eff = gain_field * d if model.gain_from_network or coax else f
    return Coefficients(
        field_enhancement=f_eff,
        depolarization=n,
        volume=omega,
        inception_field=e_inc,
        inception_field_streamer=e_str,
        inception_field_integral=e_int,
        residual_field=e_res,
        charge_per_field=c_field,
        charge_per_discharge=c_field * (e_inc - e_res) if math.isfinite(e_inc) else 0.0,
        inception_voltage=u_inc(e_inc),
        inception_voltage_streamer=u_inc(e_str),
        inception_voltage_integral=u_inc(e_int),
        extinction_voltage=u_inc(0.5 * (e_inc + e_res)),
        capacitance_void=c_c,
        capacitance_series=c_b,
        capacitance_parallel=c_a,
        void_voltage_ratio=k,
        volume_electron_rate=n_vol,
        peak_factor=pf,
        references=tuple(dict.fromkeys(refs)),
        method="closed form" if void.field_enhancement is None else "field solver",
        inception_regime=chosen.regime,
        inception_reason=chosen.reason,
        inception_voltage_streamer_range=(u_inc(e_range[0]), u_inc(e_range[1])),
        critical_field_range=cr_range,
        local_field_factor=d / d_loc if coax else 1.0,
    )


def _streamer_spread(gas_data: GasData, pressure: float, length: float, temperature: float,
                     gamma: float | None, e_str: float) -> tuple[tuple[float, float], tuple[float, float]]:
    """The streamer-criterion inception field [V/m] at both ends of the quoted spread of (E/p)_cr [V/(Pa m)]
    (the combined criterion recomputed with each end), or NaNs when the gas quotes no spread."""
    prov = gas_data.provenance.get("critical_reduced_field")
    if prov is None or prov.spread is None or not math.isfinite(e_str):
        return (math.nan, math.nan), (math.nan, math.nan)
    ends = []
    for value in prov.spread:
        alt = dataclasses.replace(gas_data, critical_reduced_field=value)
        ends.append(inception_criterion(alt, pressure, length, temperature, criterion="streamer",
                                        secondary_emission=gamma).field)
    return (min(ends), max(ends)), (float(prov.spread[0]), float(prov.spread[1]))
