"""Network model: the three-capacitance (Gemant–Philippoff) void with the same start-electron supply.

x is the void voltage V_c = k·V + V_q [V] with k = C_b/(C_b + C_c); a discharge drops it to sign·V_r; the
apparent charge is C_b·ΔV (Kreuger 1989; Kuffel, Zaengl & Kuffel 2000). V_i = E_inc·h and V_r = E_res·h with h
the void height.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

from pdvoid.coefficients.record import Coefficients
from pdvoid.core.errors import InputError, check_positive
from pdvoid.inputs.model_parameters import ModelParameters, register_model
from pdvoid.models.arguments import KernelArguments, shared_arguments

if TYPE_CHECKING:
    from pdvoid.inputs.scenario import Scenario

__all__ = ["NetworkModel"]


@register_model
@dataclass(frozen=True)
class NetworkModel(ModelParameters):
    """Three-capacitance (Gemant–Philippoff) void model with the same start-electron options as
    :class:`FieldModel`.

    Capacitances come from the geometry (flat cylindrical void: parallel-plate formulas; spheroid: the documented
    equivalent that reproduces the induced charge) unless given here.

    Attributes
    ----------
    capacitance_void : float, optional
        C_c [F] (give both or neither of C_c and C_b).
    capacitance_series : float, optional
        C_b [F].
    **kwargs
        The parameters of :class:`pdvoid.inputs.model_parameters.ModelParameters`.

    References
    ----------
    Gemant & Philippoff 1932; Kreuger 1989; Kuffel, Zaengl & Kuffel 2000 (see :func:`pdvoid.cite`).
    """

    kind = "network"
    title = "network model (three capacitances)"
    gain_from_network = True
    field_units = {**ModelParameters.field_units, "capacitance_void": ("capacitance", "F"),
                   "capacitance_series": ("capacitance", "F")}

    capacitance_void: float | None = None
    capacitance_series: float | None = None

    def __post_init__(self) -> None:
        super().__post_init__()
        given = (self.capacitance_void is not None, self.capacitance_series is not None)
        if given[0] != given[1]:
            raise InputError("model.capacitance_void and model.capacitance_series must be given together")
        if given[0]:
            object.__setattr__(self, "capacitance_void",
                               check_positive("model.capacitance_void", self.capacitance_void, "F"))
            object.__setattr__(self, "capacitance_series",
                               check_positive("model.capacitance_series", self.capacitance_series, "F"))

    def network_capacitances(self) -> tuple[float, float] | None:
        """(C_c, C_b) when given, else None [F].

        Returns
        -------
        tuple of float or None
            The capacitances this model prescribes.
        """
        if self.capacitance_void is None or self.capacitance_series is None:
            return None
        return float(self.capacitance_void), float(self.capacitance_series)

    def kernel_arguments(self, scenario: Scenario, c: Coefficients) -> KernelArguments:
        """The kernel arguments of this model for ``scenario`` with coefficients ``c``.

        Parameters
        ----------
        scenario : pdvoid.Scenario
            The scenario this model belongs to.
        c : pdvoid.coefficients.Coefficients
            Its coefficients.

        Returns
        -------
        pdvoid.models.KernelArguments
            Plain floats and arrays for the kernel; the void quantity is the void voltage [V].
        """
        h = scenario.void.height
        return KernelArguments(
            **shared_arguments(scenario, c.volume_electron_rate),
            gain=c.void_voltage_ratio, x_inc=c.inception_field * h, x_res=c.residual_field * h,
            charge_per_unit=c.capacitance_series, x_to_field=1.0 / h,
            references=c.references + ("gemant1932", "kreuger1989", "illias2011"),
        )
