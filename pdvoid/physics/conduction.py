"""Conduction: the void field in a conducting (lossy) host, and conductivity laws of insulation.

A gas-filled ellipsoidal void (gas permittivity ε0, no gas conductivity) sits in a host of permittivity εr·ε0
and bulk conductivity σ; its wall may carry a surface conductance σ_s. The electrostatic ellipsoid solution
holds for complex permittivities ε̃ = ε + σ/s in the Laplace domain (Maxwell–Wagner–Sillars interfacial
relaxation), which turns the field enhancement into a first-order transfer function from the applied field to
the void field.

Derivation (also in the user guide, "Conducting insulation and DC supplies"):
For an ellipsoid of depolarisation factor N along a uniform far field E0, with interior permittivity ε_i and
exterior ε_e, the interior field is uniform: ``E_in = E0 · ε_e / (ε_e (1 − N) + N ε_i)`` (Stratton 1941).
Quasi-statics with conduction (∇·(σE + ∂(εE)/∂t) = 0, zero initial charge) is the same problem in the
Laplace variable s with ε → ε̃ = ε + σ/s. With ε̃_e = εr ε0 + σ/s and ε̃_i = ε0 + σ_i/s::

    H(s) = E_in/E0 = (s εr ε0 + σ) / (s ε0 (εr (1 − N) + N) + σ (1 − N) + N σ_i)
         = f_cap + (f_res − f_cap) / (1 + s τ)

    f_cap = εr / (εr (1 − N) + N)                 (s → ∞: the capacitive enhancement of today's model)
    f_res = σ / (σ (1 − N) + N σ_i)                (s → 0: steady DC; 1/(1 − N) for σ_i = 0)
    τ     = ε0 (εr (1 − N) + N) / (σ (1 − N) + N σ_i)

(partial fractions: H = a/c + (b/e − a/c)/(1 + s c/e) for H = (a s + b)/(c s + e)). For σ_i = 0 this is the
issue's τ = ε0 (εr (1 − N) + N)/((1 − N) σ). Limits: σ → 0 gives τ → ∞ and H = f_cap at every frequency; a
sphere (N = 1/3) gives f_cap = 3εr/(2εr + 1), f_res = 3/2, τ = ε0 (2εr + 1)/(2σ); a flat disc (N → 1) has
f_res → ∞ (in the closed form; a real void cannot exceed V/h) and a needle (N → 0) f_cap = f_res = 1.

The field of charge deposited on the wall by a discharge is a free solution of the same problem (no applied
field); its only uniform-field mode has the denominator's root as its rate, so it relaxes with the same τ.

Surface conduction (assumption): a wall conductance σ_s [S] is replaced by an equivalent gas conductivity
``σ_i = 4 σ_s / D`` with D the void diameter across the field. This is exact for a sphere (O'Konski 1960:
σ + 2 K_s/a with a = D/2) and for a cylinder whose side wall runs along the field (the side-wall conductance
σ_s π D/h in parallel with a gas column of section π D²/4 and length h); for other spheroids it is an
approximation (the wall charge no longer stays in the uniform-field mode).

References
----------
Stratton 1941 (ellipsoid in a uniform field); Wagner 1914 and Sillars 1937 (interfacial relaxation of ellipsoids
in a lossy host, from memory); O'Konski 1960 (surface conductance of a sphere, from memory); Eoll 1975 and
Jeroense & Morshuis 1998 (conductivity laws of HVDC insulation, from memory).
"""

from __future__ import annotations

import math

from pdvoid.core.errors import InputError, check_nonnegative, check_range
from pdvoid.core.units import BOLTZMANN, ELEMENTARY_CHARGE, EPSILON_0

__all__ = [
    "equivalent_void_conductivity",
    "void_field_transfer",
    "capacitive_void_enhancement",
    "resistive_void_enhancement",
    "void_relaxation_time",
    "arrhenius_conductivity",
    "exponential_conductivity",
]


def _checked(permittivity: object, depolarization: object, conductivity: object,
             void_conductivity: object) -> tuple[float, float, float, float]:
    er = check_range("permittivity", permittivity, 1.0, 1e3)
    n = check_range("depolarization", depolarization, 0.0, 1.0, high_open=True)
    sigma = check_nonnegative("conductivity", conductivity, "S/m")
    sigma_i = check_nonnegative("void_conductivity", void_conductivity, "S/m")
    return er, n, sigma, sigma_i


def equivalent_void_conductivity(surface_conductivity: float, diameter: float) -> float:
    """The gas conductivity that stands for a conducting void wall, σ_i = 4 σ_s / D [S/m].

    Parameters
    ----------
    surface_conductivity : float
        Surface conductance of the void wall σ_s [S], >= 0.
    diameter : float
        Void extent across the field D [m], > 0.

    Returns
    -------
    float
        σ_i [S/m].

    Notes
    -----
    Validity: exact for a sphere (σ_i = 2 σ_s/a, a = D/2) and for a cylinder whose side wall is parallel to the
    field; an approximation for other spheroids (stated as an assumption wherever it is used).

    References
    ----------
    C. T. O'Konski, "Electric properties of macromolecules. V. Theory of ionic polarization in
    polyelectrolytes", J. Phys. Chem. 64 (1960) 605-619 (from memory).
    """
    s = check_nonnegative("surface_conductivity", surface_conductivity, "S")
    d = check_range("diameter", diameter, 0.0, math.inf, low_open=True, unit="m")
    return 4.0 * s / d


def void_field_transfer(s: complex, permittivity: float, depolarization: float, conductivity: float,
                        void_conductivity: float = 0.0) -> complex:
    """H(s) = E_void/E_applied of an ellipsoidal gas void in a conducting host, from the complex permittivities.

    ``H(s) = ε̃_e / (ε̃_e (1 − N) + N ε̃_i)`` with ε̃_e = εr ε0 + σ/s, ε̃_i = ε0 + σ_i/s (evaluated directly,
    not through f_cap, f_res and τ, so that tests can check those against it).

    Parameters
    ----------
    s : complex
        Laplace variable [1/s], not 0 (use :func:`resistive_void_enhancement` for s → 0); j·ω for a sine.
    permittivity : float
        Relative permittivity of the host εr [-], 1 to 1000.
    depolarization : float
        Depolarisation factor N along the field [-], in [0, 1).
    conductivity : float
        Bulk conductivity of the host σ [S/m], >= 0.
    void_conductivity : float, optional
        Equivalent gas conductivity σ_i [S/m] (:func:`equivalent_void_conductivity`), >= 0.

    Returns
    -------
    complex
        H(s) [-].

    Notes
    -----
    Validity: void small compared with the insulation thickness and its distance to the electrodes; linear,
    homogeneous, isotropic host; quasi-static fields.

    References
    ----------
    J. A. Stratton, Electromagnetic Theory (McGraw-Hill 1941), §3.25-3.27 (from memory); K. W. Wagner (1914),
    R. W. Sillars (1937) for complex permittivities in the ellipsoid solution (from memory).
    """
    er, n, sigma, sigma_i = _checked(permittivity, depolarization, conductivity, void_conductivity)
    try:
        sc = complex(s)
    except (TypeError, ValueError):
        raise InputError(f"s must be a complex number [1/s]; got {s!r}") from None
    if sc == 0 or not (math.isfinite(sc.real) and math.isfinite(sc.imag)):
        raise InputError(f"s must be finite and not zero [1/s]; got {s!r}")
    ee = er * EPSILON_0 + sigma / sc
    ei = EPSILON_0 + sigma_i / sc
    return complex(ee / (ee * (1.0 - n) + n * ei))


def capacitive_void_enhancement(permittivity: float, depolarization: float) -> float:
    """f_cap = εr / (εr (1 − N) + N): the void field per applied field for changes much faster than τ [-].

    Parameters
    ----------
    permittivity : float
        Relative permittivity of the host εr [-], 1 to 1000.
    depolarization : float
        Depolarisation factor N along the field [-], in [0, 1).

    Returns
    -------
    float
        f_cap [-] (the field enhancement of a perfect dielectric host).

    Notes
    -----
    Validity: as :func:`void_field_transfer`; H(s → ∞).

    References
    ----------
    J. A. Stratton, Electromagnetic Theory (McGraw-Hill 1941), §3.25-3.27 (from memory).
    """
    er, n, _, _ = _checked(permittivity, depolarization, 0.0, 0.0)
    return er / (er * (1.0 - n) + n)


def resistive_void_enhancement(depolarization: float, conductivity: float, void_conductivity: float = 0.0) -> float:
    """f_res = σ / (σ (1 − N) + N σ_i): the void field per applied field in steady DC [-].

    For a non-conducting gas and wall (σ_i = 0) this is 1/(1 − N), whatever σ > 0.

    Parameters
    ----------
    depolarization : float
        Depolarisation factor N along the field [-], in [0, 1).
    conductivity : float
        Bulk conductivity of the host σ [S/m], > 0 (for σ = 0 there is no steady conduction state).
    void_conductivity : float, optional
        Equivalent gas conductivity σ_i [S/m], >= 0.

    Returns
    -------
    float
        f_res [-].

    Notes
    -----
    Validity: as :func:`void_field_transfer`; H(s → 0). For a flat void (N → 1) the closed form grows without
    bound; a real void's field is limited by the voltage across the insulation.

    References
    ----------
    Derived from the complex-permittivity solution (module docstring); Wagner 1914, Sillars 1937 (from memory).
    """
    _, n, sigma, sigma_i = _checked(1.0, depolarization, conductivity, void_conductivity)
    if sigma == 0.0:
        raise InputError("conductivity must be > 0 S/m for a steady DC enhancement; got 0.0")
    return sigma / (sigma * (1.0 - n) + n * sigma_i)


def void_relaxation_time(permittivity: float, depolarization: float, conductivity: float,
                         void_conductivity: float = 0.0) -> float:
    """τ = ε0 (εr (1 − N) + N) / (σ (1 − N) + N σ_i): relaxation time of the void field [s].

    Both the capacitive-to-resistive transition of the field from the supply and the decay of the field of the
    charge discharges deposit on the wall follow exp(−t/τ).

    Parameters
    ----------
    permittivity : float
        Relative permittivity of the host εr [-], 1 to 1000.
    depolarization : float
        Depolarisation factor N along the field [-], in [0, 1).
    conductivity : float
        Bulk conductivity of the host σ [S/m], >= 0.
    void_conductivity : float, optional
        Equivalent gas conductivity σ_i [S/m], >= 0.

    Returns
    -------
    float
        τ [s]; ``inf`` when σ = σ_i = 0 (a perfect dielectric: no relaxation).

    Notes
    -----
    Validity: as :func:`void_field_transfer`.

    References
    ----------
    Derived from the complex-permittivity solution (module docstring); Wagner 1914, Sillars 1937 (from memory).
    """
    er, n, sigma, sigma_i = _checked(permittivity, depolarization, conductivity, void_conductivity)
    rate = sigma * (1.0 - n) + n * sigma_i
    if rate == 0.0:
        return math.inf
    return EPSILON_0 * (er * (1.0 - n) + n) / rate


def arrhenius_conductivity(reference_conductivity: float, activation_energy: float, temperature: float,
                           reference_temperature: float = 293.15, field_coefficient: float = 0.0,
                           field: float = 0.0) -> float:
    """σ(T, E) = σ_ref · exp(−(Ea/k_B)(1/T − 1/T_ref)) · exp(γ |E|) [S/m], an Arrhenius-type law.

    The form σ0·exp(−Ea/(k_B T))·exp(γ E) used for the field and temperature dependence of HVDC cable
    insulation, written about a reference state so that σ_ref is a measured value.

    Parameters
    ----------
    reference_conductivity : float
        σ at T_ref and zero field [S/m], > 0.
    activation_energy : float
        Ea [eV], 0 to 5 (values near 1 eV are typical of polymeric cable insulation; from memory).
    temperature : float
        Insulation temperature T [K], 200 to 500 K.
    reference_temperature : float, optional
        T_ref [K], 200 to 500 K.
    field_coefficient : float, optional
        γ [m/V], 0 to 1e-5 (of order 1e-8 to 1e-7 m/V for XLPE, from memory).
    field : float, optional
        Local field in the insulation [V/m], |E| <= 1e9.

    Returns
    -------
    float
        σ [S/m].

    Notes
    -----
    Validity: the temperature and field range over which the constants were fitted; pdvoid evaluates the law at
    one operating point and runs with that constant σ (the kernel does not follow a field-dependent σ).

    References
    ----------
    M. J. P. Jeroense, P. H. F. Morshuis, "Electric fields in HVDC paper-insulated cables", IEEE Trans. Dielectr.
    Electr. Insul. 5(2) (1998) 225-236 (from memory).
    """
    s0 = check_range("reference_conductivity", reference_conductivity, 0.0, 1e3, low_open=True, unit="S/m")
    ea = check_range("activation_energy", activation_energy, 0.0, 5.0, unit="eV")
    t = check_range("temperature", temperature, 200.0, 500.0, unit="K")
    t0 = check_range("reference_temperature", reference_temperature, 200.0, 500.0, unit="K")
    g = check_range("field_coefficient", field_coefficient, 0.0, 1e-5, unit="m/V")
    e = check_range("field", field, -1e9, 1e9, unit="V/m")
    ea_j = ea * ELEMENTARY_CHARGE
    return s0 * math.exp(-ea_j / BOLTZMANN * (1.0 / t - 1.0 / t0) + g * abs(e))


def exponential_conductivity(reference_conductivity: float, temperature_coefficient: float, temperature: float,
                             reference_temperature: float = 293.15, field_coefficient: float = 0.0,
                             field: float = 0.0) -> float:
    """σ(T, E) = σ_ref · exp(α (T − T_ref)) · exp(γ |E|) [S/m], the exponential law of Eoll.

    Parameters
    ----------
    reference_conductivity : float
        σ at T_ref and zero field [S/m], > 0.
    temperature_coefficient : float
        α [1/K], 0 to 1 (about 0.1 /K for oil-impregnated paper, from memory).
    temperature : float
        Insulation temperature T [K], 200 to 500 K.
    reference_temperature : float, optional
        T_ref [K], 200 to 500 K.
    field_coefficient : float, optional
        γ [m/V], 0 to 1e-5.
    field : float, optional
        Local field in the insulation [V/m], |E| <= 1e9.

    Returns
    -------
    float
        σ [S/m].

    Notes
    -----
    Validity: as :func:`arrhenius_conductivity` (evaluated at one operating point).

    References
    ----------
    C. K. Eoll, "Theory of stress distribution in insulation of high-voltage DC cables: Part I", IEEE Trans.
    Electr. Insul. EI-10(1) (1975) 27-35 (from memory).
    """
    s0 = check_range("reference_conductivity", reference_conductivity, 0.0, 1e3, low_open=True, unit="S/m")
    a = check_range("temperature_coefficient", temperature_coefficient, 0.0, 1.0, unit="1/K")
    t = check_range("temperature", temperature, 200.0, 500.0, unit="K")
    t0 = check_range("reference_temperature", reference_temperature, 200.0, 500.0, unit="K")
    g = check_range("field_coefficient", field_coefficient, 0.0, 1e-5, unit="m/V")
    e = check_range("field", field, -1e9, 1e9, unit="V/m")
    return s0 * math.exp(a * (t - t0) + g * abs(e))

