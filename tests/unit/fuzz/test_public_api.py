"""Fuzz the public constructors and functions of ``pdvoid.__all__``: arguments drawn from valid values and from
values that are never valid (text, booleans, complex, containers, NaN, huge integers). Each call gives its object
or raises InputError; a string or a boolean given for a number is never accepted."""

from __future__ import annotations

import math
import warnings

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import pdvoid
from pdvoid import InputError

FUZZ = settings.get_profile("pdvoid-fuzz")

_HOSTILE = st.one_of(st.text(max_size=6), st.booleans(), st.none(), st.complex_numbers(max_magnitude=10),
                     st.integers(-10**400, 10**400), st.just(math.nan), st.just(math.inf), st.just(-math.inf),
                     st.lists(st.floats(), max_size=2), st.dictionaries(st.text(max_size=3), st.integers(), max_size=1),
                     st.just(object()))
_NOT_A_NUMBER = (str, bool, complex, list, dict, type(None))


def _scenario():
    return pdvoid.Scenario(insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
                           void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3),
                           supply=pdvoid.Sine(rms=18e3, frequency=50.0),
                           model=pdvoid.FieldModel(lag_free=True, residual_ratio=0.2))


def _events():
    t = np.array([0.001, 0.004, 0.012, 0.031, 0.052, 0.071])
    return pdvoid.Events(phase_deg=(t * 50 % 1) * 360, charge=np.array([1, -2, 3, -1, 2, -3]) * 1e-12,
                         frequency=50.0, cycles=4.0, time=t)


SC, EV = _scenario(), _events()
MULTI = pdvoid.MultiVoidScenario.from_scenario(SC, (SC.void, pdvoid.Void(diameter=0.8e-3, height=0.8e-3)))
POPULATION = pdvoid.VoidPopulation(voids_per_part=2.0, diameters=(0.3e-3, 1.5e-3))
# name -> (callable, valid keyword arguments, {parameter: its valid values}, parameters that are numbers)
CATALOGUE = {
    "Insulation": (pdvoid.Insulation, {"thickness": 6e-3, "permittivity": 4.2},
                   {"thickness": [1e-4, 6e-3, 0.1], "permittivity": [1.0, 4.2, 100.0], "area": [None, 1e-2],
                    "dielectric_strength": [None, 2e7]},
                   {"thickness", "permittivity", "area", "dielectric_strength"}),
    "Coaxial": (pdvoid.Coaxial, {"inner_radius": 8e-3, "outer_radius": 13.5e-3, "permittivity": 2.3},
                {"inner_radius": [1e-3, 8e-3], "outer_radius": [9e-3, 13.5e-3, 0.5], "permittivity": [1.0, 2.3],
                 "material": [None, "xlpe"], "dielectric_strength": [None, 2e7], "area": [None]},
                {"inner_radius", "outer_radius", "permittivity", "dielectric_strength"}),
    "Void": (pdvoid.Void, {"diameter": 1e-3, "height": 1e-3},
             {"diameter": [1e-5, 1e-3, 1e-2], "height": [1e-5, 1e-3], "pressure": [1e3, 101325.0, 1e6],
              "temperature": [250.0, 293.15], "gas": ["air", "SF6", "N2"], "shape": ["spheroid", "cylinder"],
              "sealed": [True, False], "field_enhancement": [None, 1.5], "secondary_emission": [None, 0.01],
              "radial_position": [None, 1e-2]},
             {"diameter", "height", "pressure", "temperature", "field_enhancement", "secondary_emission",
              "radial_position"}),
    "Sine": (pdvoid.Sine, {"rms": 1e4}, {"rms": [1.0, 1e4, 1e6], "frequency": [1.0, 50.0, 1e4],
                                         "harmonics": [(), ((3, 0.1, 0.0),)]}, {"rms", "frequency"}),
    "Periodic": (pdvoid.Periodic, {"samples": [0.0, 1.0, 0.0, -1.0]},
                 {"samples": [[0.0, 1.0, 0.0, -1.0], np.sin(np.linspace(0, 6.28, 64))], "frequency": [50.0],
                  "max_harmonic": [None, 3]}, {"frequency", "max_harmonic"}),
    "FieldModel": (pdvoid.FieldModel, {},
                   {"residual_ratio": [0.0, 0.25, 0.9], "lag_free": [True, False], "ionization_rate": [0.0, 1e7],
                    "surface_rate_same": [0.0, 1e4], "surface_decay_time": [1e-3, math.inf],
                    "charge_decay_time": [math.inf, 1.0]},
                   {"residual_ratio", "ionization_rate", "surface_rate_same", "surface_decay_time",
                    "charge_decay_time"}),
    "MemoryModel": (pdvoid.MemoryModel, {}, {"residual_ratio": [0.25], "recombination": [0.0, 0.5, 1.0]},
                    {"residual_ratio", "recombination"}),
    "NetworkModel": (pdvoid.NetworkModel, {}, {"residual_ratio": [0.25]}, {"residual_ratio"}),
    "Scenario": (pdvoid.Scenario, {"insulation": SC.insulation, "void": SC.void, "supply": SC.supply},
                 {"model": [SC.model], "name": ["", "x"]}, set()),
    "Events": (pdvoid.Events, {"phase_deg": EV.phase_deg, "charge": EV.charge, "frequency": 50.0, "cycles": 4.0},
               {"frequency": [50.0], "cycles": [4.0, 10.0], "time": [None, EV.time], "label": ["", "m"]},
               {"frequency", "cycles"}),
    "simulate": (pdvoid.simulate, {"scenario": SC, "cycles": 3},
                 # cycles=None is the documented default (1000 cycles) of a periodic supply
                 {"cycles": [1, 3, None], "seed": [0, 2**32 - 1], "histogram": [False]}, {"cycles", "seed"}),
    "pattern": (pdvoid.pattern, {"events": EV},
                {"phase_bins": [1, 72, 3600], "charge_bins": [2, 50], "charge_scale": ["log", "linear"],
                 "per_cycle": [True, False]}, {"phase_bins", "charge_bins"}),
    "fingerprint": (pdvoid.fingerprint, {"events": EV}, {"phase_windows": [1, 18]}, {"phase_windows"}),
    "iec60270": (pdvoid.iec60270, {"events": EV}, {"threshold": [0.0, 1e-12], "window": [None, (0.0, 0.08)]},
                 {"threshold"}),
    "design_margin": (pdvoid.design_margin, {"scenario": SC, "nominal_voltage": 8e3},
                      {"nominal_voltage": [1e3, 8e3], "test_factor": [1.0, 1.7]}, {"nominal_voltage", "test_factor"}),
    "largest_pd_free_void": (pdvoid.largest_pd_free_void, {"scenario": SC, "test_voltage": 18e3},
                             {"test_voltage": [5e3, 18e3]}, {"test_voltage"}),
    "pulse_sequence": (pdvoid.pulse_sequence, {"events": EV}, {}, set()),
    "weibull_fit": (pdvoid.weibull_fit, {"data": EV}, {"polarity": ["both", "positive"], "parameters": [2, 3],
                                                        "confidence": [0.9, 0.95]}, {"parameters", "confidence"}),
    "compare": (pdvoid.compare, {"simulated": EV, "measured": EV}, {"threshold": [0.0], "phase_bins": [18, 36]},
                {"threshold", "phase_bins"}),
    "MultiVoidScenario": (pdvoid.MultiVoidScenario, {"insulation": SC.insulation, "voids": (SC.void,),
                                                     "supply": SC.supply},
                          {"voids": [(SC.void,), [SC.void, pdvoid.Void(diameter=0.5e-3, height=0.5e-3)]],
                           "model": [SC.model], "name": ["", "x"]}, set()),
    "simulate_voids": (pdvoid.simulate_voids, {"scenario": MULTI, "cycles": 3},
                       {"cycles": [1, 3], "seed": [0, 2**32 - 1]}, {"cycles", "seed"}),
    "VoidPopulation": (pdvoid.VoidPopulation, {"voids_per_part": 2.0, "diameters": (1e-3, 2e-4)},
                       {"voids_per_part": [0.0, 1.0, 3.0], "count": ["poisson", "fixed"],
                        "aspect_ratio": [None, 0.5, 2.0]},
                       {"voids_per_part", "aspect_ratio"}),
    "acceptance_probability": (pdvoid.acceptance_probability,
                               {"scenario": SC, "population": POPULATION, "level": 1e-10, "duration": 0.04,
                                "parts": 2},
                               {"level": [1e-12, 1e-9], "duration": [0.02, 0.04], "parts": [1, 2],
                                "voltage": [None, 15e3], "quantity": ["largest", "repeated"],
                                "confidence": [0.9, 0.95], "seed": [0, 7]},
                               {"level", "duration", "parts", "voltage", "confidence", "seed"}),
}


@st.composite
def _calls(draw):
    name = draw(st.sampled_from(sorted(CATALOGUE)))
    func, base, valid, numbers = CATALOGUE[name]
    kwargs = dict(base)
    params = sorted(set(valid) | set(base))
    hostile = {}
    for param in draw(st.lists(st.sampled_from(params), max_size=3, unique=True)):
        if draw(st.booleans()) and param in valid:
            kwargs[param] = draw(st.sampled_from(valid[param]))
        else:
            kwargs[param] = hostile[param] = draw(_HOSTILE)
    return name, func, kwargs, {p for p, v in hostile.items() if p in numbers and isinstance(v, _NOT_A_NUMBER)
                                and not (v is None and p in valid and None in valid[p])}


def _check(call):
    name, func, kwargs, wrong = call
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            func(**kwargs)
    except InputError:
        return
    assert not wrong, f"{name} accepted {', '.join(f'{p}={kwargs[p]!r}' for p in sorted(wrong))} as a number"


@settings(FUZZ, max_examples=200)
@given(_calls())
def test_public_calls_give_an_object_or_input_error(call):
    _check(call)


@pytest.mark.slow
@settings(FUZZ, max_examples=5000)
@given(_calls())
def test_public_calls_give_an_object_or_input_error_long(call):
    _check(call)
