"""Field model: Pedersen's induced charge with a Niemeyer-type stochastic start-electron supply.

x is the void field E_v = f·V/d + E_q [V/m]; a discharge drops it to sign(E_v)·E_res; the apparent charge is
K·εr·ε0·Ω·ΔE/d (Crichton, Karlsson & Pedersen 1989; Pedersen, Crichton & McAllister 1991). Start electrons:
volume ionisation plus surface emission with the polarity memory rule of Illias, Chen & Lewin (2011).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

from pdvoid.coefficients.record import Coefficients
from pdvoid.inputs.model_parameters import ModelParameters, register_model
from pdvoid.models.arguments import KernelArguments, shared_arguments

if TYPE_CHECKING:
    from pdvoid.inputs.scenario import Scenario

__all__ = ["FieldModel"]


@register_model
@dataclass(frozen=True)
class FieldModel(ModelParameters):
    """Induced-charge void model with stochastic start electrons (Pedersen's induced charge; Niemeyer-type
    electron supply).

    The void quantity is the void field; a discharge lowers it to the residual field and the apparent charge
    follows from Pedersen's induced charge. Every parameter is one of :class:`ModelParameters`.

    References
    ----------
    Crichton, Karlsson & Pedersen 1989; Pedersen, Crichton & McAllister 1991; Niemeyer 1995; Illias, Chen &
    Lewin 2011 (see :func:`pdvoid.cite`).
    """

    kind = "field"
    title = "field model (Pedersen's induced charge)"

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
            Plain floats and arrays for the kernel; the void quantity is the void field [V/m].
        """
        return KernelArguments(
            **shared_arguments(scenario, c.volume_electron_rate),
            gain=c.field_enhancement / scenario.insulation.thickness,
            x_inc=c.inception_field, x_res=c.residual_field, charge_per_unit=c.charge_per_field, x_to_field=1.0,
            references=c.references + ("illias2011", "illias2011jpd"),
        )
