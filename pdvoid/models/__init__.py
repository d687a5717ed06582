"""The models stage: one module per void model, each a registered :class:`ModelParameters` subclass that turns a
scenario and its coefficients into kernel arguments. Adding a model touches this package and nothing else.

- :mod:`~pdvoid.models.field`: :class:`FieldModel` (Pedersen's induced charge);
- :mod:`~pdvoid.models.memory`: :class:`MemoryModel` (per-wall charge, detrapping emission);
- :mod:`~pdvoid.models.network`: :class:`NetworkModel` (three capacitances);
- :mod:`~pdvoid.models.arguments`: :class:`KernelArguments`, the plain numbers a kernel call needs;
- :mod:`~pdvoid.models.protocol`: :class:`VoidModel`, what a model provides, and :func:`kernel_arguments`.
"""

# ruff: noqa: I001  (the import order below is the registration order)
from __future__ import annotations

from pdvoid.inputs.model_parameters import ModelParameters, model_class, model_kinds, register_model
from pdvoid.models.arguments import KernelArguments
from pdvoid.models.field import FieldModel
from pdvoid.models.network import NetworkModel
from pdvoid.models.protocol import VoidModel, kernel_arguments

# registered after the two original models: registration order is the order of model_kinds()
from pdvoid.models.memory import MemoryModel

__all__ = ["FieldModel", "KernelArguments", "MemoryModel", "ModelParameters", "NetworkModel", "VoidModel",
           "kernel_arguments", "model_class", "model_kinds", "register_model"]
