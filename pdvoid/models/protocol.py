"""What a void model provides, and the one call that turns a scenario into kernel arguments."""

from __future__ import annotations

from typing import TYPE_CHECKING, ClassVar, Protocol, runtime_checkable

from pdvoid.coefficients.closed_form import compute_coefficients
from pdvoid.coefficients.record import Coefficients
from pdvoid.core.errors import InputError
from pdvoid.models.arguments import KernelArguments

if TYPE_CHECKING:
    from pdvoid.inputs.scenario import Scenario

__all__ = ["VoidModel", "kernel_arguments"]


@runtime_checkable
class VoidModel(Protocol):
    """The protocol of a void model: a registered, frozen dataclass of its parameters that also knows its kernel
    arguments (see the developers' guide, "Adding a model").

    Attributes
    ----------
    kind : str
        Its name in scenario files.
    title : str
        A plain description for reports and the workbench.
    caveat : str
        What its default values rest on, in plain words, shown next to its results.
    gain_from_network : bool
        True when the void field per applied volt is k/h of the three-capacitance network, else f/d.
    """

    kind: ClassVar[str]
    title: ClassVar[str]
    caveat: ClassVar[str]
    gain_from_network: ClassVar[bool]

    def network_capacitances(self) -> tuple[float, float] | None:
        """(C_c, C_b) the model prescribes, or None [F].

        Returns
        -------
        tuple of float or None
            The void and series capacitances [F], or None when the coefficients supply them.
        """

    def kernel_arguments(self, scenario: Scenario, c: Coefficients) -> KernelArguments:
        """The plain floats and arrays of one kernel call.

        Parameters
        ----------
        scenario : Scenario
            The scenario to run.
        c : Coefficients
            Its coefficients (:func:`pdvoid.compute_coefficients`).

        Returns
        -------
        KernelArguments
            Everything the event kernel needs, in SI.
        """


def kernel_arguments(scenario: Scenario) -> KernelArguments:
    """The kernel arguments for ``scenario``'s model.

    Parameters
    ----------
    scenario : pdvoid.Scenario
        The scenario to run.

    Returns
    -------
    KernelArguments
        What the event kernel needs, from the model's own :meth:`VoidModel.kernel_arguments`.
    """
    from pdvoid.models.time_domain import needs_time_domain

    if needs_time_domain(scenario):
        raise InputError("a conducting host or a supply without a period runs in the time domain: use "
                         "pdvoid.simulate(scenario, ...) (the cycle kernel and its runner do not apply)")
    model = scenario.model
    if not isinstance(model, VoidModel):
        raise InputError(f"scenario.model {type(model).__name__} does not implement the void-model protocol")
    return model.kernel_arguments(scenario, compute_coefficients(scenario))
