"""Models turn a Scenario into kernel arguments. Adding a model never touches analysis or plots."""

from __future__ import annotations

from ..parameters import FieldModel, NetworkModel
from ..scenario import Scenario
from .arguments import KernelArguments
from .field import field_kernel_arguments
from .network import network_kernel_arguments

__all__ = ["KernelArguments", "kernel_arguments"]


def kernel_arguments(scenario: Scenario) -> KernelArguments:
    """The kernel arguments for ``scenario``'s model."""
    c = scenario.coefficients()
    if isinstance(scenario.model, NetworkModel):
        return network_kernel_arguments(scenario, c)
    if isinstance(scenario.model, FieldModel):
        return field_kernel_arguments(scenario, c)
    raise TypeError(f"unknown model {type(scenario.model).__name__}")  # unreachable: Scenario validates
