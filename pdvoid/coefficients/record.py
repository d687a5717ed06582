"""The one record of the coefficients stage: what every model and kernel runs on, whether the geometry comes from
closed forms or from the numerical field solver."""

from __future__ import annotations

import math
from dataclasses import dataclass, fields
from typing import Any

__all__ = ["Coefficients", "METHODS"]

METHODS = ("closed form", "field solver")


@dataclass(frozen=True)
class Coefficients:
    """The coefficients of one scenario, in SI units.

    Returned by :func:`pdvoid.compute_coefficients` (closed forms, or a numerical solution the scenario's void
    carries) and by :func:`pdvoid.fields.coefficients` (the numerical field solver); the models and kernels
    read nothing else about the geometry.

    Attributes
    ----------
    field_enhancement : float
        Void field per applied uniform field V/d [-] (per mean field V/(R − r_i) in a coaxial insulation; see
        ``local_field_factor``).
    depolarization : float
        Depolarisation factor N along the field [-] (an effective value for a cylinder or a solved outline).
    volume : float
        Void volume Ω [m³].
    inception_field : float
        E_inc inside the void by the model's criterion [V/m], joined with the Townsend branch and the
        Paschen-minimum floor (:func:`pdvoid.physics.inception.inception_criterion`); ``inf`` where no
        self-sustained discharge is possible (then no discharges are simulated).
    inception_field_streamer : float
        E_inc by the streamer formula, joined with the Townsend branch likewise [V/m].
    inception_field_integral : float
        E_inc by the ionisation integral, joined with the Townsend branch likewise [V/m] (NaN where the gas has
        no ionisation model).
    residual_field : float
        E_res, the void field a discharge leaves [V/m].
    charge_per_field : float
        Apparent charge per unit drop of the void field [C/(V/m)].
    charge_per_discharge : float
        Apparent charge of a lag-free discharge, (E_inc − E_res)·charge_per_field [C].
    inception_voltage : float
        Applied rms voltage at which the void field first reaches E_inc [V]; ``inf`` with an infinite E_inc.
    inception_voltage_streamer : float
        The same by the streamer criterion [V].
    inception_voltage_integral : float
        The same by the ionisation-integral criterion [V].
    extinction_voltage : float
        The lowest applied rms voltage that sustains lag-free discharges once started, (E_inc + E_res)/2 in place
        of E_inc (three-capacitance model, physics brief §1.4, derived) [V].
    capacitance_void : float
        C_c of the three-capacitance network [F].
    capacitance_series : float
        C_b of the network [F].
    capacitance_parallel : float
        C_a of the network [F] (NaN without a specimen area).
    void_voltage_ratio : float
        k = C_b/(C_b + C_c) [-].
    volume_electron_rate : float
        N_vol, start electrons per second from volume ionisation [1/s].
    peak_factor : float
        Peak of |V| divided by the supply's rms value [-].
    references : tuple of str
        Bibliography keys the numbers rest on (:func:`pdvoid.cite`).
    method : str
        Where the geometry coefficients come from: ``"closed form"`` or ``"field solver"``.
    solution : pdvoid.fields.FieldSolution or None
        The numerical field solution behind the geometry coefficients (grid, capacitance, polarisation
        responses), or None for closed forms.
    inception_regime : str
        What set ``inception_field``: ``"streamer"``, ``"townsend"`` or ``"no self-sustained discharge"``.
    inception_reason : str
        One sentence saying why (criterion, p·l, the competing values), for reports and warnings.
    inception_voltage_streamer_range : tuple of float
        (low, high) streamer-criterion inception voltage [V rms] over the quoted spread of the gas's
        streamer constant (E/p)_cr, where its parameter set gives one (air: 24.2 to 25.2 V/(Pa m), both from
        memory); (NaN, NaN) when the gas quotes no spread.
    critical_field_range : tuple of float
        That spread of (E/p)_cr [V/(Pa m)], (NaN, NaN) when none is quoted.
    local_field_factor : float
        Applied field at the void centre per mean field V/thickness [-]: 1 in a plane slab; in a coaxial
        insulation (R − r_i)/(r ln(R/r_i)), which ``field_enhancement`` includes (the void's own enhancement is
        ``field_enhancement / local_field_factor``).
    """

    field_enhancement: float
    depolarization: float
    volume: float
    inception_field: float
    inception_field_streamer: float
    inception_field_integral: float
    residual_field: float
    charge_per_field: float
    charge_per_discharge: float
    inception_voltage: float
    inception_voltage_streamer: float
    inception_voltage_integral: float
    extinction_voltage: float
    capacitance_void: float
    capacitance_series: float
    capacitance_parallel: float
    void_voltage_ratio: float
    volume_electron_rate: float
    peak_factor: float
    references: tuple[str, ...]
    method: str = "closed form"
    solution: Any = None
    inception_regime: str = "streamer"
    inception_reason: str = ""
    inception_voltage_streamer_range: tuple[float, float] = (math.nan, math.nan)
    critical_field_range: tuple[float, float] = (math.nan, math.nan)
    local_field_factor: float = 1.0

    def as_dict(self) -> dict[str, Any]:
        """The numbers as a plain dictionary (the numerical solution, if any, left out).

        Returns
        -------
        dict
            Attribute name to value, SI units.
        """
        return {f.name: getattr(self, f.name) for f in fields(self) if f.name != "solution"}
