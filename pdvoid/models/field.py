"""Field model: Pedersen's induced charge with a Niemeyer-type stochastic start-electron supply.

x is the void field E_v = f·V/d + E_q [V/m]; a discharge drops it to sign(E_v)·E_res; the apparent charge is
K·εr·ε0·Ω·ΔE/d (Crichton, Karlsson & Pedersen 1989; Pedersen, Crichton & McAllister 1991). Start electrons:
volume ionisation plus surface emission with the polarity memory rule of Illias, Chen & Lewin (2011).
"""

from __future__ import annotations

from ..coefficients import Coefficients
from ..scenario import Scenario
from .arguments import KernelArguments, cathode_rate, supply_arrays

__all__ = ["field_kernel_arguments"]


def field_kernel_arguments(scenario: Scenario, c: Coefficients) -> KernelArguments:
    m = scenario.model
    orders, a, b, seg, pure = supply_arrays(scenario.supply)
    return KernelArguments(
        frequency=scenario.supply.frequency, orders=orders, a_coef=a, b_coef=b, seg_fracs=seg, pure_sine=pure,
        gain=c.field_enhancement / scenario.insulation.thickness,
        x_inc=c.inception_field, x_res=c.residual_field, charge_per_unit=c.charge_per_field,
        lag_free=m.lag_free, n_vol_pos=c.volume_electron_rate + cathode_rate(scenario, +1.0),
        n_vol_neg=c.volume_electron_rate + cathode_rate(scenario, -1.0), n_same=m.surface_rate_same,
        n_rev=m.surface_rate_reversed, tau_s=m.surface_decay_time, field_assisted=m.field_assisted,
        tau_q=m.charge_decay_time, x_to_field=1.0,
        references=c.references + ("illias2011", "illias2011jpd"),
    )
