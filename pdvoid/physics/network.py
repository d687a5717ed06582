"""Three-capacitance (a-b-c) network quantities of a void and the lag-free discharge oracles under AC.

C_c is the void (gas gap), C_b the solid in series with it, C_a the rest of the specimen. Capacitances in
farads, voltages in volts. Array inputs broadcast where natural; the lag-free functions take scalars.
"""

from __future__ import annotations

import math
from fractions import Fraction
from typing import NamedTuple

import numpy as np
import numpy.typing as npt

from pdvoid.core.errors import InputError, check_nonnegative, check_positive, check_range, check_real
from pdvoid.core.units import EPSILON_0
from pdvoid.physics.checks import broadcast_named as _broadcast
from pdvoid.physics.checks import checked as _checked
from pdvoid.physics.checks import less_than as _less_than
from pdvoid.physics.checks import positive as _positive
from pdvoid.physics.checks import scalar_or_array as _out
from pdvoid.physics.geometry import (
    _spheroid_axial,
    field_enhancement,
    induced_charge_per_field,
    spheroid_volume,
)

__all__ = [
    "VoidCapacitances",
    "NetworkEquivalent",
    "flat_void_capacitances",
    "void_voltage_ratio",
    "spheroid_network_equivalent",
    "apparent_charge",
    "discharge_energy",
    "lag_free_discharges_per_cycle",
    "lag_free_phases_deg",
]


class VoidCapacitances(NamedTuple):
    """The three capacitances of the a-b-c network [F]; ``a`` is None when the specimen area is not given.

    Attributes
    ----------
    a : float or numpy.ndarray or None
        C_a, the healthy insulation in parallel [F].
    b : float or numpy.ndarray
        C_b, the solid in series with the void [F].
    c : float or numpy.ndarray
        C_c, the void [F].
    """

    a: float | np.ndarray | None
    b: float | np.ndarray
    c: float | np.ndarray


class NetworkEquivalent(NamedTuple):
    """Network capacitances equivalent to a spheroidal void [F], and the void voltage ratio k [-].

    Attributes
    ----------
    c_b : float or numpy.ndarray
        C_b, in series with the void [F].
    c_c : float or numpy.ndarray
        C_c, the void [F].
    k : float or numpy.ndarray
        k = C_b / (C_b + C_c), void voltage per applied volt [-].
    """

    c_b: float | np.ndarray
    c_c: float | np.ndarray
    k: float | np.ndarray


def flat_void_capacitances(
    diameter: npt.ArrayLike,
    height: npt.ArrayLike,
    thickness: npt.ArrayLike,
    permittivity: npt.ArrayLike,
    specimen_area: npt.ArrayLike | None = None,
) -> VoidCapacitances:
    """Capacitances of a flat cylindrical void centred in a slab between plane electrodes.

    Void of area S = π D²/4 and height t in a slab of thickness d and area A:
    ``C_c = ε0 S / t``, ``C_b = εr ε0 S / (d − t)``, ``C_a = εr ε0 (A − S) / d``.

    Parameters
    ----------
    diameter : array_like
        void diameter across the field D [m]
    height : array_like
        void height along the field t, < thickness [m]
    thickness : array_like
        slab thickness (electrode spacing) d [m]
    permittivity : array_like
        relative permittivity of the solid εr, >= 1 [-]
    specimen_area : array_like, optional
        electrode area A, > S; None leaves C_a undetermined [m²]

    Returns
    -------
    VoidCapacitances
        VoidCapacitances(a, b, c) [F]; ``a`` is None when ``specimen_area`` is None.

    Notes
    -----
    Validity: void much wider than tall and than its distance to the electrodes (edge fields neglected; the
    void and the solid column above and below it are treated as parallel-plate capacitors), gas
    permittivity 1. The capacitances are fitting quantities, not field quantities (pedersen1991).

    References
    ----------
    gemant1932; kreuger1989; kuffel2000 (PD-measurement chapter).
    """
    dia = _positive("diameter", diameter, "m")
    t = _positive("height", height, "m")
    d = _positive("thickness", thickness, "m")
    er = _checked("permittivity", permittivity, 1.0)
    _less_than("height", t, "thickness", d)
    dia_, t_, d_, er_ = _broadcast(diameter=dia, height=t, thickness=d, permittivity=er)
    s = math.pi / 4.0 * dia_ * dia_
    c_c = EPSILON_0 * s / t_
    c_b = er_ * EPSILON_0 * s / (d_ - t_)
    inputs = (diameter, height, thickness, permittivity)
    c_a = None
    if specimen_area is not None:
        area = _positive("specimen_area", specimen_area, "m^2")
        area_, s_ = _broadcast(specimen_area=area, void_area=s)
        if np.any(area_ <= s_):
            i = int(np.flatnonzero((area_ <= s_).ravel())[0])
            raise InputError(
                f"specimen_area must exceed the void area pi*diameter**2/4 = {s_.ravel()[i]!r} m^2; "
                f"got {area_.ravel()[i]!r} m^2"
            )
        c_a = _out(er_ * EPSILON_0 * (area_ - s_) / d_, *inputs, specimen_area)
    return VoidCapacitances(c_a, _out(c_b, *inputs), _out(c_c, *inputs))


def void_voltage_ratio(c_b: npt.ArrayLike, c_c: npt.ArrayLike) -> float | np.ndarray:
    """Ratio k of void voltage to applied voltage before any discharge (stiff source): k = C_b/(C_b + C_c).

    Parameters
    ----------
    c_b : array_like
        capacitance of the solid in series with the void [F]
    c_c : array_like
        capacitance of the void [F]

    Returns
    -------
    float or numpy.ndarray
        k, in (0, 1) [-]

    Notes
    -----
    Validity: three-capacitance network, stiff source, no discharge yet, no leakage; C_a does not enter.

    References
    ----------
    kreuger1989; kuffel2000; gemant1932.
    """
    b = _positive("c_b", c_b, "F")
    c = _positive("c_c", c_c, "F")
    b_, c_ = _broadcast(c_b=b, c_c=c)
    return _out(b_ / (b_ + c_), c_b, c_c)


def spheroid_network_equivalent(
    diameter: npt.ArrayLike, height: npt.ArrayLike, thickness: npt.ArrayLike, permittivity: npt.ArrayLike
) -> NetworkEquivalent:
    """Network capacitances (C_b, C_c) and voltage ratio k reproducing the induced charge of a spheroid.

    Derivation (physics brief §2.3 and §4): the void field is uniform, E_void = f V/d with f the field
    enhancement, so the void voltage measured along its height h is V_c = E_void h and

        k = V_c / V = f h / d.

    A drop ΔV_c of the void voltage is a drop ΔE = ΔV_c / h of the void field, which induces
    q = K εr ε0 Ω ΔE / d (Pedersen, K = 1/N, Ω = π D² h/6). Requiring q = C_b ΔV_c (the network's apparent
    charge) gives

        C_b = K εr ε0 Ω / (d h),     and from k = C_b/(C_b + C_c):  C_c = C_b (1/k − 1).

    For a flat spheroid (h/D → 0, K → 1, f → εr) this tends to the flat-void network of a cylinder with the
    same height and the same volume (area S = Ω/h = (2/3)·π D²/4): C_b → εr ε0 S/d, k → εr h/d,
    C_c → ε0 S/h, i.e. :func:`flat_void_capacitances` within O(h/d) and O(εr h/D).

    Parameters
    ----------
    diameter : array_like
        void diameter across the field D [m]
    height : array_like
        void height along the field h, < thickness [m]
    thickness : array_like
        electrode spacing d [m]
    permittivity : array_like
        relative permittivity of the host εr, >= 1 [-]

    Returns
    -------
    NetworkEquivalent
        NetworkEquivalent(c_b [F], c_c [F], k [-]).

    Notes
    -----
    Validity: as :func:`pdvoid.physics.geometry.induced_charge_per_field` (void small compared with its
    distance to the electrodes, uniform counter-field, homogeneous linear host, plane electrodes). A void so
    large that f h/d >= 1 violates it and is rejected.

    References
    ----------
    crichton1989; pedersen1991 (induced charge); kreuger1989, gemant1932 (network); derived here
    (k = f h/d).
    """
    dia = _positive("diameter", diameter, "m")
    h = _positive("height", height, "m")
    d = _positive("thickness", thickness, "m")
    er = _checked("permittivity", permittivity, 1.0)
    _less_than("height", h, "thickness", d)
    dia_, h_, d_, er_ = _broadcast(diameter=dia, height=h, thickness=d, permittivity=er)
    n = _spheroid_axial(dia_, h_)
    f = field_enhancement(er_, n)
    k = f * h_ / d_
    if np.any(k >= 1.0):
        i = int(np.flatnonzero((k >= 1.0).ravel())[0])
        raise InputError(
            f"void too large for the small-void model: field_enhancement*height/thickness = {k.ravel()[i]!r} "
            "must be < 1 (height much smaller than thickness is required)"
        )
    c_b = induced_charge_per_field(er_, n, spheroid_volume(dia_, h_), d_) / h_
    c_c = c_b * (1.0 / k - 1.0)
    inputs = (diameter, height, thickness, permittivity)
    return NetworkEquivalent(_out(c_b, *inputs), _out(c_c, *inputs), _out(k, *inputs))


def apparent_charge(c_b: npt.ArrayLike, delta_v: npt.ArrayLike) -> float | np.ndarray:
    """Apparent charge of one discharge in the network model: q_a = C_b ΔV (signed like ΔV).

    The charge the source must deliver to restore the test-object voltage when the void voltage changes by
    ΔV; it is the factor k = C_b/(C_b + C_c) smaller than the charge change of the void network.

    Parameters
    ----------
    c_b : array_like
        capacitance of the solid in series with the void [F]
    delta_v : array_like
        change of void voltage in the discharge, V_i − V_r with the polarity of the void voltage [V]

    Returns
    -------
    float or numpy.ndarray
        apparent charge [C], signed.

    Notes
    -----
    Validity: three-capacitance network; the measured charge equals q_a only after calibration of the whole
    circuit (iec60270); finite coupling capacitance lowers it by C_k/(C_a + C_k).

    References
    ----------
    kreuger1989; kuffel2000; iec60270 (definition of apparent charge).
    """
    b = _positive("c_b", c_b, "F")
    dv = _checked("delta_v", delta_v, -math.inf, low_open=True, unit="V")
    b_, dv_ = _broadcast(c_b=b, delta_v=dv)
    return _out(b_ * dv_, c_b, delta_v)


def _voltages(inception_voltage: float, residual_voltage: float) -> tuple[float, float]:
    vi = check_positive("inception_voltage", inception_voltage, "V")
    vr = check_range("residual_voltage", residual_voltage, 0.0, vi, high_open=True, unit="V")
    return vi, vr


def discharge_energy(
    c_b: npt.ArrayLike, c_c: npt.ArrayLike, inception_voltage: float, residual_voltage: float
) -> float | np.ndarray:
    """Energy dissipated in one discharge of the network model: W = ½ (C_c + C_b)(V_i² − V_r²).

    Equivalently W = ½ q_a U_inc (1 + V_r/V_i) with q_a = C_b (V_i − V_r) and U_inc = V_i/k the applied
    voltage at inception; for V_r = 0 the textbook ½ q_a U_inc.

    Parameters
    ----------
    c_b : array_like
        capacitance of the solid in series with the void [F]
    c_c : array_like
        capacitance of the void [F]
    inception_voltage : float
        void voltage at which the discharge starts V_i, > 0 [V]
    residual_voltage : float
        void voltage after the discharge V_r, in [0, V_i) [V]

    Returns
    -------
    float or numpy.ndarray
        energy per discharge [J]

    Notes
    -----
    Validity: three-capacitance network, stiff source (V_a constant during the discharge).

    References
    ----------
    kreuger1989; kuffel2000; derived (physics brief §1.3).
    """
    b = _positive("c_b", c_b, "F")
    c = _positive("c_c", c_c, "F")
    vi, vr = _voltages(inception_voltage, residual_voltage)
    b_, c_ = _broadcast(c_b=b, c_c=c)
    return _out(0.5 * (c_ + b_) * (vi - vr) * (vi + vr), c_b, c_c)


def _quarter_count(peak_void_voltage: float, inception_voltage: float, residual_voltage: float) -> int:
    """n1 = floor((A − V_r)/(V_i − V_r)) for A >= V_i, else 0, evaluated exactly on the given floats."""
    a = check_nonnegative("peak_void_voltage", peak_void_voltage, "V")
    vi, vr = _voltages(inception_voltage, residual_voltage)
    if a < vi:
        return 0
    fa, fi, fr = Fraction(a), Fraction(vi), Fraction(vr)
    return math.floor((fa - fr) / (fi - fr))


def lag_free_discharges_per_cycle(
    peak_void_voltage: float, inception_voltage: float, residual_voltage: float
) -> int:
    """Discharges per AC cycle in the periodic steady state of the lag-free network model.

    ``N = 4 · floor((A − V_r)/(V_i − V_r))`` for A >= V_i, else 0, with A = k V_m the peak void voltage
    without discharges. The floor is taken exactly on the given floating-point values (rational arithmetic);
    at exact integer ratios the last discharge falls on the voltage peak, a degenerate case for any
    simulation.

    Assumptions: stiff sinusoidal source; a discharge occurs the instant |V_c| reaches V_i (no statistical
    lag, no overvoltage) and sets V_c to ±V_r; no charge decay; uncharged void at the rising zero crossing
    with the full amplitude applied at once. The steady state depends on history: other initial charge can
    give 4·n1 ± 2 per cycle.

    Parameters
    ----------
    peak_void_voltage : float
        peak void voltage without discharges A = k V_m, >= 0 [V]
    inception_voltage : float
        void inception voltage V_i, > 0 [V]
    residual_voltage : float
        void residual voltage V_r, in [0, V_i) [V]

    Returns
    -------
    int
        discharges per cycle (whole number, multiple of 4) [-]

    Notes
    -----
    Validity: the assumptions above; independent of frequency.

    References
    ----------
    derived (physics brief §1.4, checked against exact event simulation); model of kreuger1989,
    kuffel2000.
    """
    return 4 * _quarter_count(peak_void_voltage, inception_voltage, residual_voltage)


def lag_free_phases_deg(
    peak_void_voltage: float, inception_voltage: float, residual_voltage: float
) -> np.ndarray:
    """Steady-state phases of the positive discharges of the lag-free network model.

    ``sin φ_j = (V_i + (j − 1 − n1)(V_i − V_r)) / A`` for j = 1 … 2·n1, with n1 as in
    :func:`lag_free_discharges_per_cycle`; φ_j lies in (−90°, 90°] measured from the rising zero crossing of
    the applied voltage, so the first discharges come before that zero crossing. The negative discharges sit
    at φ_j + 180°. The exact sine is <= 1 by the definition of n1; a rounding excess of a few ulps at an exact
    integer ratio is set to 1.

    Parameters
    ----------
    peak_void_voltage : float
        peak void voltage without discharges A = k V_m, >= 0 [V]
    inception_voltage : float
        void inception voltage V_i, > 0 [V]
    residual_voltage : float
        void residual voltage V_r, in [0, V_i) [V]

    Returns
    -------
    numpy.ndarray
        phases in ascending order [deg]; empty when A < V_i.

    Notes
    -----
    Validity: the assumptions of :func:`lag_free_discharges_per_cycle`.

    References
    ----------
    derived (physics brief §1.4); model of kreuger1989, kuffel2000.
    """
    n1 = _quarter_count(peak_void_voltage, inception_voltage, residual_voltage)
    a = check_real("peak_void_voltage", peak_void_voltage)
    vi, vr = float(inception_voltage), float(residual_voltage)
    if n1 == 0:
        return np.empty(0)
    j = np.arange(1, 2 * n1 + 1, dtype=float)
    s = (vi + (j - 1.0 - n1) * (vi - vr)) / a
    return np.degrees(np.arcsin(np.minimum(s, 1.0)))
