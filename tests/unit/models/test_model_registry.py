"""Adding a model is one new module plus its registration: the worked example of the developers' guide, run.

``ScaledFieldModel`` is the guide's example: the field model with its apparent charge multiplied by a parameter.
In a package module it would carry the ``@register_model`` decorator; here the fixture registers it and removes
it again, so that the test model never leaks into other tests. The scenarios are invented test cases.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np
import pytest

import pdvoid
from pdvoid.core.errors import check_positive
from pdvoid.inputs.model_parameters import model_class, model_kinds, register_model, unregister_model
from pdvoid.models import FieldModel, KernelArguments, ModelParameters, kernel_arguments
from pdvoid.simulation.simulate import VoidRunner

CYCLES = 200
SEED = 11
SCALE = 2.5


@dataclass(frozen=True)
class ScaledFieldModel(FieldModel):
    """The field model with its apparent charge multiplied by ``charge_scale`` [-]."""

    kind = "scaled_field"
    title = "field model with scaled apparent charge"
    field_units = {**FieldModel.field_units, "charge_scale": ("dimensionless", "")}

    charge_scale: float = 1.0

    def __post_init__(self) -> None:
        super().__post_init__()
        object.__setattr__(self, "charge_scale", check_positive("model.charge_scale", self.charge_scale))

    def kernel_arguments(self, scenario, c):
        args = super().kernel_arguments(scenario, c)
        return dataclasses.replace(args, charge_per_unit=self.charge_scale * args.charge_per_unit)


@pytest.fixture
def registered():
    register_model(ScaledFieldModel)
    yield ScaledFieldModel
    unregister_model("scaled_field")


def _scenario(model):
    return pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
        void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3),
        supply=pdvoid.Sine(rms=18e3, frequency=50.0),
        model=model,
    )


def test_the_registry_knows_the_model_only_while_registered(registered):
    assert model_kinds()[:2] == ("field", "network")
    assert "scaled_field" in model_kinds()
    assert model_class("scaled_field") is ScaledFieldModel
    assert issubclass(ScaledFieldModel, ModelParameters)


def test_the_model_runs_through_simulate_unchanged_elsewhere(registered):
    result = pdvoid.simulate(_scenario(ScaledFieldModel(ionization_rate=1e9, charge_scale=SCALE)), CYCLES, SEED)
    assert result.event_count > CYCLES  # discharges in both half cycles of most cycles at this voltage
    pat = pdvoid.pattern(result, phase_bins=36, charge_bins=20)
    assert pat.total == result.event_count
    assert pdvoid.iec60270(result).average_current > 0.0


def test_charges_are_the_scale_times_the_field_models_for_the_same_seed(registered):
    field = _scenario(FieldModel(ionization_rate=1e9))
    scaled = _scenario(ScaledFieldModel(ionization_rate=1e9, charge_scale=SCALE))
    got = pdvoid.simulate(scaled, CYCLES, SEED)
    base = pdvoid.simulate(field, CYCLES, SEED)

    # independent expectation: the same kernel, driven directly with the field model's arguments and a charge
    # per unit field drop scaled by hand
    args = kernel_arguments(field)
    assert isinstance(args, KernelArguments)
    by_hand = dataclasses.replace(args, charge_per_unit=SCALE * args.charge_per_unit)
    t, q, _, _, _ = VoidRunner(field, SEED, _args=by_hand).run(CYCLES)

    assert got.event_count == base.event_count > 0
    np.testing.assert_array_equal(got.time, base.time)  # the scale changes no discharge time
    np.testing.assert_array_equal(got.time, t)
    np.testing.assert_array_equal(got.charge, q)
    np.testing.assert_allclose(got.charge, SCALE * base.charge, rtol=1e-12, atol=0.0)


def test_a_scenario_file_names_the_model_and_reads_back(registered, tmp_path):
    path = tmp_path / "scaled.toml"
    path.write_text(
        'name = "scaled"\n'
        '[insulation]\nthickness = "6 mm"\npermittivity = 4.2\n'
        '[void]\ndiameter = "1.5 mm"\nheight = "1.5 mm"\n'
        '[supply]\nkind = "sine"\nrms = "18 kV"\nfrequency = "50 Hz"\n'
        '[model]\nkind = "scaled_field"\ncharge_scale = 2.5\nresidual_ratio = 0.3\n',
        encoding="utf-8",
    )
    s = pdvoid.Scenario.from_file(path)
    assert isinstance(s.model, ScaledFieldModel)
    assert s.model.charge_scale == 2.5 and s.model.residual_ratio == 0.3
    again = pdvoid.Scenario.from_file(s.to_file(tmp_path / "again.toml"))
    assert again == s
    assert 'kind = "scaled_field"' in (tmp_path / "again.toml").read_text(encoding="utf-8")


def test_an_unknown_kind_names_the_registered_kinds(registered, tmp_path):
    path = tmp_path / "unknown.toml"
    path.write_text('[insulation]\nthickness = "6 mm"\npermittivity = 4.2\n[void]\ndiameter = "1 mm"\n'
                    'height = "1 mm"\n[supply]\nrms = "10 kV"\nfrequency = "50 Hz"\n[model]\nkind = "nonesuch"\n',
                    encoding="utf-8")
    with pytest.raises(pdvoid.InputError, match="nonesuch") as info:
        pdvoid.Scenario.from_file(path)
    for kind in ("field", "network", "scaled_field"):
        assert repr(kind) in str(info.value)
    with pytest.raises(pdvoid.InputError, match="'field', 'network'"):
        model_class("nonesuch")


def test_a_bad_scale_names_the_parameter(registered):
    with pytest.raises(pdvoid.InputError, match="model.charge_scale"):
        ScaledFieldModel(charge_scale=-1.0)


def test_registering_a_second_model_of_the_same_kind_fails(registered):
    @dataclass(frozen=True)
    class Impostor(FieldModel):
        kind = "scaled_field"

    with pytest.raises(pdvoid.InputError, match="registered already"):
        register_model(Impostor)
    assert model_class("scaled_field") is ScaledFieldModel
    register_model(ScaledFieldModel)  # registering the same class again is harmless


def test_unregistering_removes_the_kind_and_unknown_kinds_fail():
    register_model(ScaledFieldModel)
    assert unregister_model("scaled_field") is ScaledFieldModel
    assert "scaled_field" not in model_kinds()
    with pytest.raises(pdvoid.InputError, match="'field', 'network'"):
        unregister_model("scaled_field")
