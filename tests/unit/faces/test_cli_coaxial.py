"""The commands simulate, inception and margin on the invented example cable (pdvoid/inputs/examples/cable.toml),
checked against hand values (tests/unit/coefficients/test_coaxial_coefficients.py shows the arithmetic)."""

from __future__ import annotations

import json
import math
from importlib import resources

import numpy as np
import pytest

import pdvoid
from pdvoid.faces.cli.command import main

CABLE = str(resources.files("pdvoid.inputs") / "examples" / "cable.toml")
# hand calculation: E_inc = 4.5474 MV/m (streamer formula, 1 mm of air at 1 atm, physics brief §3.1), local gap
# 10.5 mm x ln(13.5/8) = 5.49411 mm, sphere in XLPE f = 6.9/5.6: U_inc = E_inc x gap/(f sqrt 2) = 14.337 kV rms
U_HAND = 24.2 * 101325 * (1 + 8.6 / math.sqrt(101.325)) * 10.5e-3 * math.log(13.5 / 8) / (6.9 / 5.6 * math.sqrt(2))


def test_inception_command(capsys):
    assert main(["inception", CABLE, "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)["analytic"]
    assert doc["inception voltage [V rms]"] == pytest.approx(U_HAND, rel=1e-9)
    # the local field at 10.5 mm per mean field V/(R − r_i): 5.5 mm/5.49411 mm (hand)
    assert doc["local field at the void per mean field [-]"] == pytest.approx(5.5 / 5.49411, rel=1e-5)


def test_margin_command(capsys):
    assert main(["margin", CABLE, "--test-voltage", "20.8kV", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["verdict"] == "discharges expected"  # 20.8 kV > 14.34 kV
    largest = doc["largest discharge-free void"]
    assert largest["inception voltage [V rms]"] == pytest.approx(20.8e3, rel=1e-9)
    assert largest["diameter [m]"] < 1e-3
    # rows whose void would not fit in the wall at 10.5 mm are reported as not computed, not as a crash
    # (the default sizes run to 5 mm; at 10.5 mm from the axis a 5 mm sphere would reach the conductor)
    errors = doc["table errors (why a row was not computed)"]
    assert errors[-1].startswith("void.radial_position must keep the void (height 0.005 m) inside the insulation")
    assert all(e == "" or "radial_position" in e for e in errors)


def test_simulate_command(tmp_path, capsys):
    out = tmp_path / "run"
    assert main(["simulate", CABLE, "--cycles", "300", "--seed", "2", "--out", str(out), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    s = doc["summary"]
    assert s["discharges per cycle [-]"] > 0  # 20.8 kV is 145 % of the inception voltage
    # every apparent charge is Pedersen's charge per field drop at the cable terminals, by hand
    # 4π εr ε0 a³/(r ln(R/r_i)) (sphere, K = 3, physics brief §2.3 with the coaxial |∇λ|), times the drop of
    # the void field that the event records
    res = pdvoid.load(out / "result.npz")
    per_field = 4 * math.pi * 2.3 * 8.8541878128e-12 * 0.5e-3**3 / (10.5e-3 * math.log(13.5 / 8))
    assert res.charge.size > 0
    assert np.abs(res.charge) == pytest.approx(per_field * np.abs(res.field_before - res.field_after), rel=1e-9)
