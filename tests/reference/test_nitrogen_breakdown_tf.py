"""Nitrogen at 1 cm and 1 atm: 30.4 kV (reference/nitrogen_breakdown_tf)."""

from __future__ import annotations

import pytest

from pdvoid.inputs.materials import get_gas
from pdvoid.physics.inception import gas_inception_field, inception_criterion, streamer_inception_field

ATM = 101325.0


def test_one_centimetre_at_one_atmosphere_is_30p4_kilovolts():
    # Source: nitrogen_breakdown_tf (confirmed): about 30.4 kV for 1 cm at 101.3 kPa (1 atm used, 0.02 % apart).
    n2 = get_gas("nitrogen")
    e = streamer_inception_field(ATM, 1e-2, critical_reduced_field=n2.critical_reduced_field,
                                 b_constant=n2.b_constant, exponent=n2.exponent)
    assert e * 1e-2 == pytest.approx(30.4e3, rel=1e-4)
    assert gas_inception_field("nitrogen", ATM, 1e-2) * 1e-2 == pytest.approx(30.4e3, rel=1e-4)
    assert inception_criterion("nitrogen", ATM, 1e-2).regime == "streamer"


def test_constant_derived_against_the_formulas_own_air_value():
    # Source: derived: N2 / air = 30.4 kV / (air streamer formula at 1 cm, 1 atm = 31.145 kV), with equal B and n.
    air = gas_inception_field("air", ATM, 1e-2, combined=False) * 1e-2
    assert air == pytest.approx(31145.4, rel=1e-5)
    assert get_gas("nitrogen").critical_reduced_field == pytest.approx(24.2 * 30.4e3 / air, rel=1e-5)
