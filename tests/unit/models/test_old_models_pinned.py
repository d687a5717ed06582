"""Today's field and network models reproduce bit for bit: seeded runs hashed before the memory model was added.

The expected digests were computed with the code of commit 68de687 (before ``pdvoid.models.memory`` existed);
any change to the shared kernel, the models' arguments or the runner that alters a single bit of these events
fails here. Scenarios are invented test cases (a raised ionisation rate so that discharges start at once).
"""

from __future__ import annotations

import hashlib

import numpy as np
import pytest

import pdvoid


def _scenario(model, **void_kw):
    return pdvoid.Scenario(
        insulation=pdvoid.Insulation(thickness=6e-3, permittivity=4.2),
        void=pdvoid.Void(diameter=1.5e-3, height=1.5e-3, **void_kw),
        supply=pdvoid.Sine(rms=18e3, frequency=50.0), model=model)


CASES = {
    "field_default": (lambda: _scenario(pdvoid.FieldModel(ionization_rate=3e10)), 689,
                      "3e404da40aeeca1277458d8ee3ac17a249dfb0538a769c80c81f8e964a126a1d"),
    "field_assisted_decay": (lambda: _scenario(pdvoid.FieldModel(ionization_rate=3e10, field_assisted=True,
                                                                 charge_decay_time=5e-3)), 693,
                             "aec68d9976abdc64573ce479d46231545b699226bdce685e992e0ee9bb2333ae"),
    "field_electrode": (lambda: _scenario(pdvoid.FieldModel(ionization_rate=3e10, cathode_emission_rate=500.0),
                                          position="high_voltage_electrode"), 525,
                        "7f8143e4b614fefb81c9dbe233c6f51f468eb52d6e3cd7d31245a4c9a6bd654d"),
    "network_default": (lambda: _scenario(pdvoid.NetworkModel(ionization_rate=3e10)), 689,
                        "7b54f56f1e3eea08a8dde7b200b460141285d00e9e672dfeedb20e7c32d87e3d"),
}


@pytest.mark.parametrize("name", sorted(CASES))
def test_seeded_run_matches_the_digest_from_before_the_memory_model(name):
    make, count, digest = CASES[name]
    res = pdvoid.simulate(make(), cycles=200, seed=7)
    e = res.events
    h = hashlib.sha256()
    for a in (e.time, e.charge, e.field_before, e.field_after, e.voltage):
        h.update(np.ascontiguousarray(a, dtype=np.float64).tobytes())
    assert res.event_count == count
    assert h.hexdigest() == digest
