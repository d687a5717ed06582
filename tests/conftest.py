"""Shared fixtures: small scenarios used across the test suite (invented test cases, not measured objects)."""

from __future__ import annotations

import math

import pytest

import pdvoid


def make_scenario(model=None, rms=18e3, frequency=50.0, diameter=1.5e-3, height=1.5e-3, thickness=6e-3,
                  permittivity=4.2, shape="spheroid", **void_kw):
    return pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=thickness, permittivity=permittivity),
        void=pdvoid.Void(diameter=diameter, height=height, shape=shape, **void_kw),
        supply=pdvoid.Sine(rms=rms, frequency=frequency),
        model=model if model is not None else pdvoid.FieldModel(),
    )


@pytest.fixture
def scenario_factory():
    return make_scenario


@pytest.fixture
def demo():
    from pdvoid.inputs.demo import demo_scenario

    return demo_scenario()


@pytest.fixture
def lag_free_field():
    return make_scenario(pdvoid.FieldModel(lag_free=True, residual_ratio=0.2))


SQRT2 = math.sqrt(2.0)
