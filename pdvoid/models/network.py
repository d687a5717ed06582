"""Network model: the three-capacitance (Gemant–Philippoff) void with the same start-electron supply.

x is the void voltage V_c = k·V + V_q [V] with k = C_b/(C_b + C_c); a discharge drops it to sign·V_r; the
apparent charge is C_b·ΔV (Kreuger 1989; Kuffel, Zaengl & Kuffel 2000). V_i = E_inc·h and V_r = E_res·h with h
the void height.
"""

from __future__ import annotations

from ..coefficients import Coefficients
from ..scenario import Scenario
from .arguments import KernelArguments, cathode_rate, supply_arrays

__all__ = ["network_kernel_arguments"]


def network_kernel_arguments(scenario: Scenario, c: Coefficients) -> KernelArguments:
    m = scenario.model
    h = scenario.void.height
    orders, a, b, seg, pure = supply_arrays(scenario.supply)
    return KernelArguments(
        frequency=scenario.supply.frequency, orders=orders, a_coef=a, b_coef=b, seg_fracs=seg, pure_sine=pure,
        gain=c.void_voltage_ratio, x_inc=c.inception_field * h, x_res=c.residual_field * h,
        charge_per_unit=c.capacitance_series, lag_free=m.lag_free,
        n_vol_pos=c.volume_electron_rate + cathode_rate(scenario, +1.0),
        n_vol_neg=c.volume_electron_rate + cathode_rate(scenario, -1.0),
        n_same=m.surface_rate_same, n_rev=m.surface_rate_reversed, tau_s=m.surface_decay_time,
        field_assisted=m.field_assisted, tau_q=m.charge_decay_time, x_to_field=1.0 / h,
        references=c.references + ("gemant1932", "kreuger1989", "illias2011"),
    )
