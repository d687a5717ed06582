"""Volume start electrons from negative ions: field-dependent detachment from O2⁻ in air, the ion population that
builds up between discharges, and the avalanche factor (1 − η/α).

In air a free electron from background ionisation attaches to oxygen within nanoseconds at low field, so the volume
supply between discharges is stored as negative ions. They give start electrons by collisional detachment, whose
rate rises steeply with the reduced field E/N, and an electron set free starts a growing avalanche only if it is
not attached first: the factor (1 − η/α) for α > η, zero below the critical field.
"""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

from pdvoid.core.errors import check_range
from pdvoid.core.units import BOLTZMANN
from pdvoid.physics.checks import broadcast as _broadcast
from pdvoid.physics.checks import shape_out as _shape_out
from pdvoid.physics.checks import values as _values
from pdvoid.physics.ionization import morrow_lowke_coefficients

__all__ = ["AIR_N2_FRACTION", "AIR_O2_FRACTION", "O2_ION_MOBILITY", "o2_detachment_rate_coefficients",
           "detachment_frequency_air", "avalanche_start_probability", "negative_ion_population",
           "ion_drift_time"]

#: Number fraction of nitrogen (argon counted with it) in dry air [-] (common practice).
AIR_N2_FRACTION = 0.79
#: Number fraction of oxygen in dry air [-] (common practice).
AIR_O2_FRACTION = 0.21
#: Mobility of O2⁻ in air at 101325 Pa and 293.15 K [m²/(V s)]: about 2.5 cm²/(V s) (from memory).
O2_ION_MOBILITY = 2.5e-4

_TD = 1e-21  # 1 Td = 1e-21 V m²


def o2_detachment_rate_coefficients(reduced_field: npt.ArrayLike
                                    ) -> tuple[float | np.ndarray, float | np.ndarray]:
    """Rate coefficients of collisional detachment O2⁻ + N2 → O2 + N2 + e and O2⁻ + O2 → 2 O2 + e.

    k_N2 = 1.24e-11·exp(−(179/(8.8 + E/N))²) cm³/s and k_O2 = 6.9e-10·exp(−(198/(5.6 + E/N))²) cm³/s with E/N in
    Td (1 Td = 1e-21 V m²), returned in m³/s.

    Validity: ion temperature set by the field (the fits use E/N as the variable), roughly 0–1000 Td; at room
    temperature and low E/N the rates are negligible (thermal detachment from O2⁻ is slow at 293 K).

    Parameters
    ----------
    reduced_field : array_like
        E/N [V m²], >= 0.

    Returns
    -------
    tuple[float | numpy.ndarray, float | numpy.ndarray]
        (k_N2, k_O2) [m³/s].

    References
    ----------
    kossyi1992 (the fits, from memory: coefficients as recalled from their use in pancheshnyi2013; not confirmed
    against the papers).
    """
    x, s = _values("reduced_field", reduced_field, low_open=False, unit="V m²")
    td = x / _TD
    k_n2 = 1.24e-17 * np.exp(-(179.0 / (8.8 + td)) ** 2)
    k_o2 = 6.9e-16 * np.exp(-(198.0 / (5.6 + td)) ** 2)
    return _shape_out(k_n2, s), _shape_out(k_o2, s)


def detachment_frequency_air(field: npt.ArrayLike, pressure: npt.ArrayLike,
                             temperature: npt.ArrayLike = 293.15) -> float | np.ndarray:
    """Detachment frequency of an O2⁻ ion in air: ν_d = N·(x_N2·k_N2(E/N) + x_O2·k_O2(E/N)), N = p/(k_B T).

    Validity: dry air (x_N2 = 0.79, x_O2 = 0.21); as :func:`o2_detachment_rate_coefficients`.

    Parameters
    ----------
    field : array_like
        Field magnitude E [V/m], >= 0.
    pressure : array_like
        Gas pressure p [Pa], > 0.
    temperature : array_like, optional
        Gas temperature T [K], > 0.

    Returns
    -------
    float or numpy.ndarray
        ν_d [1/s].

    References
    ----------
    kossyi1992 (rate coefficients, from memory).
    """
    e, s1 = _values("field", field, low_open=False, unit="V/m")
    p, s2 = _values("pressure", pressure, unit="Pa")
    t, s3 = _values("temperature", temperature, unit="K")
    e, p, t = _broadcast(field=e, pressure=p, temperature=t)
    n = p / (BOLTZMANN * t)
    k_n2, k_o2 = o2_detachment_rate_coefficients(e / n)
    return _shape_out(n * (AIR_N2_FRACTION * np.asarray(k_n2) + AIR_O2_FRACTION * np.asarray(k_o2)),
                      s1 and s2 and s3)


def avalanche_start_probability(field: npt.ArrayLike, pressure: npt.ArrayLike,
                                temperature: npt.ArrayLike = 293.15) -> float | np.ndarray:
    """Probability that a free electron starts a growing avalanche instead of attaching: 1 − η/α for α > η, else 0.

    α and η = η2 + η3 are the Morrow & Lowke fits for air (:func:`pdvoid.physics.ionization.morrow_lowke_coefficients`).

    Validity: a uniform field over the avalanche path; air; that of the Morrow & Lowke fits.

    Parameters
    ----------
    field : array_like
        Field magnitude E [V/m], >= 0 (0 gives 0).
    pressure : array_like
        Gas pressure p [Pa], > 0.
    temperature : array_like, optional
        Gas temperature T [K], > 0.

    Returns
    -------
    float or numpy.ndarray
        The probability [-], in [0, 1).

    References
    ----------
    niemeyer1995 (the factor (1 − η/α) of the volume electron supply, from memory for its equation number);
    morrow1997 (α and η).
    """
    e, s1 = _values("field", field, low_open=False, unit="V/m")
    p, s2 = _values("pressure", pressure, unit="Pa")
    t, s3 = _values("temperature", temperature, unit="K")
    e, p, t = _broadcast(field=e, pressure=p, temperature=t)
    n = p / (BOLTZMANN * t)
    out = np.zeros(e.shape)
    pos = e > 0.0
    if np.any(pos):
        alpha, eta2, eta3 = morrow_lowke_coefficients(e[pos], n[pos])
        a = np.asarray(alpha)
        out[pos] = np.where(a > np.asarray(eta2) + np.asarray(eta3),
                            1.0 - (np.asarray(eta2) + np.asarray(eta3)) / np.where(a > 0.0, a, 1.0), 0.0)
    return _shape_out(out, s1 and s2 and s3)


def negative_ion_population(time: npt.ArrayLike, initial: float, source: float, lifetime: float
                            ) -> float | np.ndarray:
    """Negative ions in the void a time t after a reference instant: dn/dt = S − n/τ, so
    n(t) = S·τ + (n0 − S·τ)·exp(−t/τ), and n0 + S·t for τ = inf.

    Validity: a constant source and a constant loss time (drift to the walls taken at a fixed field); detachment
    between discharges neglected (it is tiny below inception, :func:`detachment_frequency_air`).

    Parameters
    ----------
    time : array_like
        Time since the reference instant t [s], >= 0.
    initial : float
        Ions at the reference instant n0 [-], >= 0.
    source : float
        Ion pairs formed per second in the void S [1/s], >= 0.
    lifetime : float
        Loss time τ [s], > 0 (inf for none).

    Returns
    -------
    float or numpy.ndarray
        n(t) [-].

    References
    ----------
    Solution of the linear rate equation (derived); the build-up of negative ions between discharges as a start
    electron store follows niemeyer1995 (from memory).
    """
    t, s = _values("time", time, low_open=False, unit="s")
    n0 = check_range("initial", initial, 0.0, math.inf)
    src = check_range("source", source, 0.0, math.inf, unit="1/s")
    tau = check_range("lifetime", lifetime, 0.0, math.inf, low_open=True, unit="s", allow_inf=True)
    if math.isinf(tau):
        return _shape_out(n0 + src * t, s)
    return _shape_out(src * tau + (n0 - src * tau) * np.exp(-t / tau), s)


def ion_drift_time(length: float, field: float, pressure: float, temperature: float = 293.15,
                   mobility: float = O2_ION_MOBILITY) -> float:
    """Time for a negative ion to drift across a gap: l/(μ·E) with the mobility scaled by the gas density,
    μ = μ0·(n0/n).

    Validity: drift at low E/N (mobility independent of the field); a uniform field.

    Parameters
    ----------
    length : float
        Gap along the field l [m], > 0.
    field : float
        Field magnitude E [V/m], > 0.
    pressure : float
        Gas pressure [Pa], > 0.
    temperature : float, optional
        Gas temperature [K], > 0.
    mobility : float, optional
        Ion mobility μ0 at 101325 Pa, 293.15 K [m²/(V s)], > 0.

    Returns
    -------
    float
        The drift time [s].

    References
    ----------
    Mobility of O2⁻ in air about 2.5 cm²/(V s) (from memory); density scaling of the mobility (common practice).
    """
    ln = check_range("length", length, 0.0, math.inf, low_open=True, unit="m")
    e = check_range("field", field, 0.0, math.inf, low_open=True, unit="V/m")
    p = check_range("pressure", pressure, 0.0, math.inf, low_open=True, unit="Pa")
    t = check_range("temperature", temperature, 0.0, math.inf, low_open=True, unit="K")
    mu0 = check_range("mobility", mobility, 0.0, math.inf, low_open=True, unit="m²/(V s)")
    mu = mu0 * (101325.0 / p) * (t / 293.15)
    return ln / (mu * e)
