"""The IEC 60270 test circuit: how much of a test object's apparent charge reaches the measuring impedance.

Circuit (the standard's basic arrangements, figure 1 as recalled, "from memory"): the test object, seen from its
terminals as a capacitance C_a, is connected in parallel with a coupling capacitor C_k; a stray capacitance C_s
(high-voltage lead and bushings to ground) sits in parallel with both; the supply is decoupled by a blocking
impedance that is open for the fast pulse currents. The measuring impedance Z_m is either in series with C_k
(at its earthy end, the usual arrangement) or in series with the test object (at its earthy end).

Derivation (Kirchhoff, our own, consistent with the physics brief section 1.3). A discharge, seen from the
terminals, is a short current pulse injecting the apparent charge q between the terminals of C_a (that is the
definition of apparent charge). Z_m is a resistor at the pulse's end (it passes the charge, storing none), so
once the pulse current has settled the injected charge has been shared between the capacitances the source
sees:

* Z_m in series with C_k: the source (across C_a) sees C_a in parallel with the outer loop C_k || C_s; the
  high-voltage node drops by ΔV = q / (C_a + C_k + C_s) and the charge through the C_k branch, hence through
  Z_m, is q_m = C_k ΔV = q C_k / (C_a + C_k + C_s).
* Z_m in series with the test object: all of the charge that leaves C_a through the outer loop returns through
  Z_m, and the outer loop is C_k || C_s, so q_m = q (C_k + C_s) / (C_a + C_k + C_s).

A calibrator (a step voltage U_0 through a small capacitor C_0, q_0 = U_0 C_0) connected across the test object
adds C_0 in parallel with C_a while it is connected; it is removed before the test, so the calibration sees the
ratio with C_a + C_0 and the test the ratio with C_a alone (the calibration error this leaves is the ratio of the
two, close to 1 for C_0 << C_a + C_k).
"""

from __future__ import annotations

from pdvoid.core.errors import check_choice, check_nonnegative, check_positive

__all__ = ["ARRANGEMENTS", "charge_transfer_ratio", "circuit_time_constant"]

#: where the measuring impedance sits: in series with the coupling capacitor, or with the test object
ARRANGEMENTS = ("coupling_capacitor", "test_object")


def charge_transfer_ratio(
    test_object_capacitance: float,
    coupling_capacitance: float,
    stray_capacitance: float = 0.0,
    arrangement: str = "coupling_capacitor",
) -> float:
    """Charge reaching the measuring impedance per unit apparent charge, q_m / q.

    Z_m in series with C_k: q_m / q = C_k / (C_a + C_k + C_s). Z_m in series with the test object:
    q_m / q = (C_k + C_s) / (C_a + C_k + C_s). See the module docstring for the derivation.

    Parameters
    ----------
    test_object_capacitance : float
        C_a, the test object's capacitance at its terminals, > 0 [F]
    coupling_capacitance : float
        C_k, the coupling capacitor, > 0 [F]
    stray_capacitance : float, optional
        C_s, stray capacitance of the high-voltage node to ground, >= 0 [F]
    arrangement : str, optional
        ``"coupling_capacitor"`` (Z_m in series with C_k) or ``"test_object"`` (Z_m in series with C_a) [-]

    Returns
    -------
    float
        q_m / q in (0, 1) [-].

    Notes
    -----
    Validity: lumped circuit (leads short compared with the pulse's wavelength), blocking impedance open for the
    pulse, Z_m resistive and small compared with the capacitive reactances over the pulse's spectrum.

    References
    ----------
    iec60270_circuit: IEC 60270:2000, clause 4 and figure 1 (test circuits; from memory). The ratio is derived
    here by charge conservation (physics brief section 1.3 gives the same for Z_m in series with C_k); the
    same result is given in F. H. Kreuger, Partial Discharge Detection in High-Voltage Equipment, Butterworths
    1989, chapter on detection circuits (from memory).
    """
    ca = check_positive("test_object_capacitance", test_object_capacitance, "F")
    ck = check_positive("coupling_capacitance", coupling_capacitance, "F")
    cs = check_nonnegative("stray_capacitance", stray_capacitance, "F")
    where = check_choice("arrangement", arrangement, ARRANGEMENTS)
    total = ca + ck + cs
    return ck / total if where == "coupling_capacitor" else (ck + cs) / total


def circuit_time_constant(
    measuring_resistance: float,
    test_object_capacitance: float,
    coupling_capacitance: float,
    stray_capacitance: float = 0.0,
    arrangement: str = "coupling_capacitor",
) -> float:
    """Time constant with which the transferred charge flows through a resistive measuring impedance.

    The loop through Z_m = R_m holds two capacitances in series: the branch holding Z_m and the rest of the
    circuit in parallel. Z_m in series with C_k: τ = R_m C_k (C_a + C_s) / (C_a + C_k + C_s). Z_m in series
    with the test object: τ = R_m C_a (C_k + C_s) / (C_a + C_k + C_s). The current through Z_m after an
    impulsive injection is then i(t) = (q_m / τ) exp(−t/τ).

    Parameters
    ----------
    measuring_resistance : float
        R_m, the resistive part of the measuring impedance, > 0 [Ω]
    test_object_capacitance : float
        C_a, > 0 [F]
    coupling_capacitance : float
        C_k, > 0 [F]
    stray_capacitance : float, optional
        C_s, >= 0 [F]
    arrangement : str, optional
        ``"coupling_capacitor"`` or ``"test_object"`` [-]

    Returns
    -------
    float
        τ [s].

    Notes
    -----
    Validity: as :func:`charge_transfer_ratio`; a real measuring impedance is an RLC network whose extra
    poles lie outside the instrument's band (common practice), so only its resistance is kept.

    References
    ----------
    iec60270_circuit (first-order RC circuit, derived here by Kirchhoff's laws).
    """
    rm = check_positive("measuring_resistance", measuring_resistance, "ohm")
    ca = check_positive("test_object_capacitance", test_object_capacitance, "F")
    ck = check_positive("coupling_capacitance", coupling_capacitance, "F")
    cs = check_nonnegative("stray_capacitance", stray_capacitance, "F")
    where = check_choice("arrangement", arrangement, ARRANGEMENTS)
    total = ca + ck + cs
    series = ck * (ca + cs) / total if where == "coupling_capacitor" else ca * (ck + cs) / total
    return rm * series
