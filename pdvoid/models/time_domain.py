"""Kernel arguments of the field model in the time domain: a conducting host, or a supply without a period.

The conduction coefficients come from :mod:`pdvoid.physics.conduction` with the depolarisation factor of the
coefficients; the capacitive enhancement is the coefficients' own field enhancement (closed form or field
solver), so a perfect dielectric gives today's void field.
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from pdvoid.core.errors import InputError
from pdvoid.core.validity import ValidityWarning
from pdvoid.models.arguments import cathode_rate
from pdvoid.physics.conduction import (
    capacitive_void_enhancement,
    equivalent_void_conductivity,
    resistive_void_enhancement,
    void_relaxation_time,
)

if TYPE_CHECKING:
    from pdvoid.coefficients.record import Coefficients
    from pdvoid.inputs.scenario import Scenario
    from pdvoid.inputs.supplies import SupplyPieces

__all__ = ["TimeDomainArguments", "ConductionCoefficients", "conduction_coefficients", "needs_time_domain",
           "time_domain_arguments"]


def needs_time_domain(scenario: Scenario) -> bool:
    """True when the scenario needs the time-domain kernel: a conducting host or wall, or a supply without a
    period. A perfect dielectric under a periodic supply keeps the cycle kernel (bit for bit as before).

    Parameters
    ----------
    scenario : Scenario
        The scenario.

    Returns
    -------
    bool
        Whether :func:`time_domain_arguments` applies.
    """
    from pdvoid.inputs.supplies import TimeSupply

    return (scenario.insulation.conductivity > 0.0 or scenario.void.surface_conductivity > 0.0
            or isinstance(scenario.supply, TimeSupply))


@dataclass(frozen=True)
class ConductionCoefficients:
    """The conduction side of the void field: H(s) = f_cap + (f_res − f_cap)/(1 + s τ).

    Attributes
    ----------
    capacitive_enhancement : float
        f_cap [-], the coefficients' field enhancement.
    resistive_enhancement : float
        f_res [-] (equal to f_cap in a perfect dielectric).
    relaxation_time : float
        τ [s]; inf in a perfect dielectric.
    void_conductivity : float
        Equivalent gas conductivity of the wall's surface conductance [S/m].
    notes : tuple of str
        Assumptions the numbers rest on, in plain words.
    """

    capacitive_enhancement: float
    resistive_enhancement: float
    relaxation_time: float
    void_conductivity: float
    notes: tuple[str, ...]


def conduction_coefficients(scenario: Scenario, c: Coefficients) -> ConductionCoefficients:
    """f_cap, f_res and τ of the scenario's void (see :mod:`pdvoid.physics.conduction`).

    Parameters
    ----------
    scenario : Scenario
        The scenario.
    c : Coefficients
        Its coefficients (field enhancement and depolarisation factor).

    Returns
    -------
    ConductionCoefficients
        The numbers and the assumptions they rest on.
    """
    ins, void = scenario.insulation, scenario.void
    sigma, sigma_s = ins.conductivity, void.surface_conductivity
    f_cap = c.field_enhancement
    notes: list[str] = []
    if sigma == 0.0 and sigma_s == 0.0:
        return ConductionCoefficients(f_cap, f_cap, math.inf, 0.0, ())
    n = c.depolarization
    er = float(ins.permittivity or 1.0)
    if not math.isfinite(n) or not 0.0 <= n < 1.0:
        raise InputError(f"conduction needs the void's depolarisation factor; this scenario gives {n!r} (a field "
                         "enhancement supplied without one, or a host of permittivity 1)")
    sigma_i = equivalent_void_conductivity(sigma_s, void.diameter) if sigma_s > 0.0 else 0.0
    if sigma_s > 0.0 and (void.shape != "spheroid" or void.diameter != void.height):
        notes.append("the wall's surface conductance acts as a gas conductivity 4·σ_s/diameter (exact for a sphere "
                     "and for a cylinder's side wall along the field; an approximation otherwise)")
    tau = void_relaxation_time(er, n, sigma, sigma_i)
    ratio = (resistive_void_enhancement(n, sigma, sigma_i) if sigma > 0.0 else 0.0) / capacitive_void_enhancement(
        er, n)
    if void.shape != "spheroid" or void.field_enhancement is not None:
        notes.append("the conduction response uses the spheroid of the same depolarisation factor (f_res/f_cap and τ "
                     "of that spheroid); the capacitive enhancement is the scenario's own")
    f_res = f_cap * ratio
    if f_res * void.height > ins.thickness:
        notes.append(f"the steady DC enhancement f_res = {f_res:.3g} would put more than the applied voltage across "
                     "the void (a flat void in a thin slab): the closed form overstates the DC void field")
    for note in notes:
        warnings.warn(note, ValidityWarning, stacklevel=3)
    return ConductionCoefficients(f_cap, f_res, tau, sigma_i, tuple(notes))


@dataclass(frozen=True, eq=False)
class TimeDomainArguments:
    """Plain numbers and arrays of one time-domain kernel run (:mod:`pdvoid.kernels.conduction_events`).

    Attributes
    ----------
    breaks : numpy.ndarray
        Supply pieces: starts with the end appended [s].
    pw : numpy.ndarray
        Per-piece table (level [V], slope [V/s], own sinusoid; ``PW_*`` columns of the kernel module).
    orders, a_coef, b_coef : numpy.ndarray
        Ripple (or periodic supply) orders [-] and sine and cosine amplitudes [V].
    params : numpy.ndarray
        The kernel's parameter vector (layout ``P_*`` of the kernel module).
    lag_free, field_assisted : bool
        The model's switches.
    conduction : ConductionCoefficients
        f_cap, f_res, τ and the assumptions.
    references : tuple of str
        Bibliography keys relied on.
    """

    breaks: np.ndarray
    pw: np.ndarray
    orders: np.ndarray
    a_coef: np.ndarray
    b_coef: np.ndarray
    params: np.ndarray
    lag_free: bool
    field_assisted: bool
    conduction: ConductionCoefficients
    references: tuple[str, ...]

    def voltage(self, t: np.ndarray) -> np.ndarray:
        """Applied voltage at times ``t`` [V].

        Parameters
        ----------
        t : numpy.ndarray
            Times [s] within the run.

        Returns
        -------
        numpy.ndarray
            V(t) [V].
        """
        from pdvoid.kernels import conduction_events as K

        t = np.asarray(t, dtype=float)
        k = np.clip(np.searchsorted(self.breaks, t, side="right") - 1, 0, self.pw.shape[0] - 1)
        return np.array([K.piece_voltage(float(ti), int(ki), self.breaks, self.pw,
                                         float(self.params[K.P_OMEGA]), self.orders, self.a_coef, self.b_coef)
                         for ti, ki in zip(t, k, strict=True)])


def _pieces(scenario: Scenario, end: float) -> SupplyPieces:
    from pdvoid.inputs.supplies import SupplyPieces, TimeSupply

    supply = scenario.supply
    if isinstance(supply, TimeSupply):
        return supply.pieces(end)
    orders, a, b = supply.fourier()
    z = np.zeros(1)
    return SupplyPieces(np.array([0.0, end]), z, z.copy(), float(supply.frequency), orders, a, b)


def time_domain_arguments(scenario: Scenario, c: Coefficients, end: float) -> TimeDomainArguments:
    """Time-domain kernel arguments of the field model for ``scenario`` run from 0 to ``end``.

    Parameters
    ----------
    scenario : Scenario
        The scenario (field model).
    c : Coefficients
        Its coefficients.
    end : float
        End of the run [s].

    Returns
    -------
    TimeDomainArguments
        The arguments.

    Raises
    ------
    InputError
        For a model other than the field model.
    """
    from pdvoid.kernels import conduction_events as K

    m = scenario.model
    if m.kind != "field":
        raise InputError(f"a conducting host or a supply without a period runs with the field model only; got "
                         f"model.kind = {m.kind!r}")
    cond = conduction_coefficients(scenario, c)
    d = scenario.insulation.thickness
    p = _pieces(scenario, end)
    tau = cond.relaxation_time
    tau_model = m.charge_decay_time
    rate_q = (0.0 if math.isinf(tau) else 1.0 / tau) + (0.0 if math.isinf(tau_model) else 1.0 / tau_model)
    par = np.zeros(K.PARAM_SIZE)
    par[K.P_GCAP] = cond.capacitive_enhancement / d
    par[K.P_G] = 0.0 if math.isinf(tau) else (cond.resistive_enhancement - cond.capacitive_enhancement) / d
    par[K.P_TAU] = tau
    par[K.P_TAUQ] = math.inf if rate_q == 0.0 else 1.0 / rate_q
    par[K.P_XINC] = c.inception_field
    par[K.P_XRES] = c.residual_field
    par[K.P_CPU] = c.charge_per_field
    par[K.P_NVOLP] = c.volume_electron_rate + cathode_rate(scenario, +1.0)
    par[K.P_NVOLN] = c.volume_electron_rate + cathode_rate(scenario, -1.0)
    par[K.P_NSAME] = m.surface_rate_same
    par[K.P_NREV] = m.surface_rate_reversed
    par[K.P_TAUS] = m.surface_decay_time
    par[K.P_OMEGA] = 2.0 * math.pi * p.ripple_frequency
    has_ripple = p.orders.size > 0 and (np.any(p.a_coef) or np.any(p.b_coef))
    par[K.P_SCAN] = 1.0 / (16.0 * float(np.max(p.orders)) * p.ripple_frequency) if has_ripple else math.inf
    refs = c.references + ("illias2011", "illias2011jpd")
    if cond.relaxation_time != math.inf:
        refs += ("conduction_derived", "maxwell_wagner", "stratton1941")
    if scenario.void.surface_conductivity > 0.0:
        refs += ("okonski1960",)
    return TimeDomainArguments(
        breaks=p.breaks, pw=p.table(), orders=p.orders, a_coef=p.a_coef, b_coef=p.b_coef,
        params=par, lag_free=m.lag_free, field_assisted=m.field_assisted, conduction=cond,
        references=tuple(dict.fromkeys(refs)),
    )
