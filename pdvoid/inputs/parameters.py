"""The scenario: insulation, void, supply and model, as frozen dataclasses in SI, validated on construction."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from pdvoid.core.errors import (
    InputError,
    check_array,
    check_bool,
    check_choice,
    check_positive,
    check_range,
    check_real,
)

__all__ = [
    "Insulation",
    "Void",
    "Sine",
    "Periodic",
    "GASES",
    "VOID_SHAPES",
]

GASES = ("air", "nitrogen", "sf6")
VOID_SHAPES = ("spheroid", "cylinder")
VOID_POSITIONS = ("centred", "high_voltage_electrode", "ground_electrode")
P0 = 101325.0  # reference pressure of the ion-pair production rate [Pa]


def _set(obj: object, name: str, value: object) -> None:
    object.__setattr__(obj, name, value)


@dataclass(frozen=True)
class Insulation:
    """A slab of solid insulation between plane electrodes.

    Attributes
    ----------
    thickness : float
        electrode spacing d [m], 1 µm to 1 m.
    permittivity : float or None
        relative permittivity εr of the host [-], 1 to 100. Taken from ``material`` when omitted.
    material : str or None
        name of a host material from the parameter sets (sets ``permittivity`` when that is omitted).
    area : float or None
        electrode area of the specimen [m²], optional; only the network model's C_a uses it.
    dielectric_strength : float or None
        typical short-time dielectric strength of the host [V/m], 0.1 kV/mm to 10 MV/mm, optional; when omitted,
        the material's tabulated value (if any) is used. Only the warning that the mean field approaches the
        strength of the host itself uses it (:func:`pdvoid.coefficients.limits.warn_host_strength`).
    conductivity : float
        bulk conductivity σ of the host [S/m], 0 to 1 S/m; 0 (default) is a perfect dielectric (today's model).
        With σ > 0 the void field relaxes from the capacitive to the resistive enhancement with the time constant
        of :func:`pdvoid.physics.conduction.void_relaxation_time` (field model only). For a temperature- or
        field-dependent σ evaluate :func:`~pdvoid.physics.conduction.arrhenius_conductivity` or
        :func:`~pdvoid.physics.conduction.exponential_conductivity` at the operating point.
    """

    thickness: float
    permittivity: float | None = None
    material: str | None = None
    area: float | None = None
    dielectric_strength: float | None = None
    conductivity: float = 0.0

    def __post_init__(self) -> None:
        _set(self, "thickness", check_range("insulation.thickness", self.thickness, 1e-6, 1.0, unit="m"))
        if self.permittivity is None:
            if self.material is None:
                raise InputError("insulation.permittivity or insulation.material must be given; got neither")
            from pdvoid.inputs.materials import get_material

            _set(self, "permittivity", float(get_material(self.material).permittivity))
        _set(self, "permittivity", check_range("insulation.permittivity", self.permittivity, 1.0, 100.0))
        if self.material is not None and not isinstance(self.material, str):
            raise InputError(f"insulation.material must be a material name; got {self.material!r}")
        if self.area is not None:
            _set(self, "area", check_positive("insulation.area", self.area, "m²"))
        if self.dielectric_strength is not None:
            _set(self, "dielectric_strength", check_range("insulation.dielectric_strength",
                                                          self.dielectric_strength, 1e5, 1e10, unit="V/m"))
        _set(self, "conductivity", check_range("insulation.conductivity", self.conductivity, 0.0, 1.0, unit="S/m"))


@dataclass(frozen=True)
class Void:
    """A gas-filled void, centred in the slab, its symmetry axis along the applied field.

    Attributes
    ----------
    diameter : float
        extent across the field [m].
    height : float
        extent along the field [m].
    pressure : float
        gas pressure [Pa], 100 Pa to 1 MPa.
    gas : str
        "air", "nitrogen" or "sf6".
    temperature : float
        gas temperature [K], 200 to 500 K.
    shape : str
        "spheroid" (closed-form field and induced charge) or "cylinder" (rim rounded with radius
        min(diameter, height)/2, any aspect ratio: a field-solver table, :mod:`pdvoid.coefficients.cylinder`;
        the layered-slab / three-capacitance formulas are its limit for a void much wider than the slab).
    inception_length : float or None
        the length l in the streamer criterion [m]; defaults to ``height``.
    position : str
        "centred" (far from both electrodes), or "high_voltage_electrode" / "ground_electrode" for a
        void whose flat side lies on that electrode (a half spheroid; closed forms by the image method).
    radial_position : float or None
        distance of the void centre from the cable axis [m], for a void in a :class:`pdvoid.Coaxial` insulation
        (required there, refused for a plane slab); the void must lie inside the wall, r_i < r ∓ height/2 < R.
    field_enhancement : float or None
        void field / (V/d) [-] from a numerical field solution (pdvoid.fields), replacing
        the closed form for geometries it does not cover; give it together with ``charge_per_field``.
    charge_per_field : float or None
        apparent charge per unit drop of the void field [C/(V/m)], likewise.
    sealed : bool
        False (default) for a vented void, whose gas keeps ``pressure`` at any ``temperature`` (its density
        falls as it heats); True for a sealed void, which keeps the gas density it had when it was closed at
        ``pressure`` and ``fill_temperature`` (its pressure rises in proportion to the absolute temperature,
        ideal gas). The inception field depends on the density, so a sealed void keeps it when heated.
    fill_temperature : float or None
        gas temperature [K], 200 to 500 K, at which a sealed void held ``pressure``; defaults to
        ``temperature`` (then sealed and vented agree). Only for ``sealed=True``.
    secondary_emission : float or None
        secondary-emission coefficient γ of the void wall as cathode [-], in (0, 1], for the Townsend branch of
        the inception criterion; default: the gas's reference γ (0.01 for air, see
        :data:`pdvoid.physics.townsend.WALL_SECONDARY_EMISSION`).
    surface_conductivity : float
        surface conductance σ_s of the void wall [S], 0 to 1 S; 0 (default) for none. It acts as a gas
        conductivity 4·σ_s/diameter (:func:`pdvoid.physics.conduction.equivalent_void_conductivity`; exact for a
        sphere, an approximation for other shapes), lowering the steady DC void field and shortening the
        relaxation time (field model only).
    """

    diameter: float
    height: float
    pressure: float = P0
    gas: str = "air"
    temperature: float = 293.15
    shape: str = "spheroid"
    inception_length: float | None = None
    position: str = "centred"
    field_enhancement: float | None = None
    charge_per_field: float | None = None
    sealed: bool = False
    fill_temperature: float | None = None
    secondary_emission: float | None = None
    radial_position: float | None = None
    surface_conductivity: float = 0.0

    def __post_init__(self) -> None:
        _set(self, "diameter", check_range("void.diameter", self.diameter, 1e-7, 1.0, unit="m"))
        _set(self, "height", check_range("void.height", self.height, 1e-7, 1.0, unit="m"))
        _set(self, "pressure", check_range("void.pressure", self.pressure, 100.0, 1e6, unit="Pa"))
        _set(self, "temperature", check_range("void.temperature", self.temperature, 200.0, 500.0, unit="K"))
        check_choice("void.gas", self.gas, GASES)
        check_choice("void.shape", self.shape, VOID_SHAPES)
        if self.inception_length is not None:
            _set(self, "inception_length",
                 check_range("void.inception_length", self.inception_length, 1e-7, 1.0, unit="m"))
        check_choice("void.position", self.position, VOID_POSITIONS)
        if self.radial_position is not None:
            _set(self, "radial_position", check_range("void.radial_position", self.radial_position, 0.0, 5.0,
                                                      low_open=True, unit="m"))
        given = (self.field_enhancement is not None, self.charge_per_field is not None)
        if given[0] != given[1]:
            raise InputError("void.field_enhancement and void.charge_per_field must be given together")
        if given[0]:
            _set(self, "field_enhancement", check_range("void.field_enhancement", self.field_enhancement, 0.0, 1e3,
                                                        low_open=True))
            _set(self, "charge_per_field", check_positive("void.charge_per_field", self.charge_per_field,
                                                          "C/(V/m)"))
        _set(self, "sealed", check_bool("void.sealed", self.sealed))
        if self.fill_temperature is not None:
            if not self.sealed:
                raise InputError(f"void.fill_temperature applies only to a sealed void (void.sealed = true); got "
                                 f"{self.fill_temperature!r} with sealed = false")
            _set(self, "fill_temperature", check_range("void.fill_temperature", self.fill_temperature, 200.0,
                                                       500.0, unit="K"))
        if self.secondary_emission is not None:
            _set(self, "secondary_emission", check_range("void.secondary_emission", self.secondary_emission, 0.0,
                                                         1.0, low_open=True))
        _set(self, "surface_conductivity", check_range("void.surface_conductivity", self.surface_conductivity, 0.0,
                                                       1.0, unit="S"))

    @property
    def gas_pressure(self) -> float:
        """Pressure of the gas at ``temperature`` [Pa]: ``pressure`` when vented; for a sealed void the fill
        pressure scaled by temperature / fill_temperature (constant density, ideal gas)."""
        if not self.sealed or self.fill_temperature is None:
            return float(self.pressure)
        return float(self.pressure) * float(self.temperature) / float(self.fill_temperature)

    @property
    def streamer_length(self) -> float:
        """The length used in the streamer criterion [m]."""
        return self.height if self.inception_length is None else float(self.inception_length)


@dataclass(frozen=True)
class Sine:
    """A sinusoidal supply, optionally with harmonics.

    V(t) = √2·rms·[sin(2πft) + Σ_k h_k·sin(2π·m_k·f·t + φ_k)]; t = 0 is the positive-going zero crossing of the
    fundamental, which is the phase reference of every event.

    Attributes
    ----------
    rms : float
        rms value of the fundamental [V], > 0 and ≤ 10 MV.
    frequency : float
        fundamental frequency [Hz], 0.01 Hz to 10 kHz.
    harmonics : tuple[tuple[int, float, float], ...]
        tuples (order m ≥ 2, fraction h of the fundamental in [0, 1], phase φ [deg]).
    """

    rms: float
    frequency: float = 50.0
    harmonics: tuple[tuple[int, float, float], ...] = ()

    def __post_init__(self) -> None:
        _set(self, "rms", check_range("supply.rms", self.rms, 0.0, 1e7, low_open=True, unit="V"))
        _set(self, "frequency", check_range("supply.frequency", self.frequency, 0.01, 1e4, unit="Hz"))
        hs = []
        if not isinstance(self.harmonics, (tuple, list)):
            raise InputError(f"supply.harmonics must be a list of (order, fraction, phase_deg); got {self.harmonics!r}")
        if len(self.harmonics) > 50:
            raise InputError(f"supply.harmonics may hold at most 50 entries; got {len(self.harmonics)}")
        for i, h in enumerate(self.harmonics):
            if not isinstance(h, (tuple, list)) or len(h) != 3:
                raise InputError(f"supply.harmonics[{i}] must be (order, fraction, phase_deg); got {h!r}")
            order, frac, ph = h
            if isinstance(order, bool) or not isinstance(order, (int, np.integer)) or not 2 <= order <= 200:
                raise InputError(f"supply.harmonics[{i}] order must be a whole number in [2, 200]; got {order!r}")
            frac = check_range(f"supply.harmonics[{i}] fraction", frac, 0.0, 1.0)
            ph = check_range(f"supply.harmonics[{i}] phase_deg", ph, -360.0, 360.0, unit="deg")
            hs.append((int(order), frac, ph))
        orders = [h[0] for h in hs]
        if len(set(orders)) != len(orders):
            raise InputError(f"supply.harmonics orders must be distinct; got {orders}")
        _set(self, "harmonics", tuple(hs))

    def fourier(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """(orders, a, b) with V(t) = Σ a_m sin(m ω t) + b_m cos(m ω t) [V].

        Returns
        -------
        tuple of numpy.ndarray
            ``(orders, a, b)``: harmonic orders m [-] and the sine and cosine amplitudes a_m, b_m [V].
        """
        amp = math.sqrt(2.0) * self.rms
        orders = [1] + [h[0] for h in self.harmonics]
        a = [amp] + [amp * h[1] * math.cos(math.radians(h[2])) for h in self.harmonics]
        b = [0.0] + [amp * h[1] * math.sin(math.radians(h[2])) for h in self.harmonics]
        return np.array(orders, dtype=float), np.array(a), np.array(b)

    @property
    def is_pure(self) -> bool:
        """True when every harmonic has zero amplitude (a plain sine)."""
        return all(h[1] == 0.0 for h in self.harmonics)


@dataclass(frozen=True, eq=False)
class Periodic:
    """Any periodic supply given as samples of one period, uniformly spaced, the first at t = 0.

    The kernel uses the trigonometric interpolant through the samples (their discrete Fourier series), which is
    smooth, periodic and passes through every sample. t = 0 is the phase reference of every event; put a
    positive-going zero crossing there for IEC 60270 phase angles.

    Attributes
    ----------
    samples : object
        applied voltage over one period [V], 4 to 4096 values.
    frequency : float
        repetition frequency [Hz], 0.01 Hz to 10 kHz.
    max_harmonic : int or None
        highest harmonic kept [-] (default: all the samples resolve, at most 64).
    """

    samples: Any
    frequency: float = 50.0
    max_harmonic: int | None = None

    def __post_init__(self) -> None:
        s = check_array("supply.samples", self.samples, min_size=4, max_size=4096)
        if np.ptp(s) == 0.0:
            raise InputError("supply.samples must not be constant; got a flat waveform")
        s = s.copy()
        s.setflags(write=False)
        _set(self, "samples", s)
        _set(self, "frequency", check_range("supply.frequency", self.frequency, 0.01, 1e4, unit="Hz"))
        nyq = (s.size - 1) // 2
        if self.max_harmonic is None:
            _set(self, "max_harmonic", min(nyq, 64))
        elif isinstance(self.max_harmonic, bool) or not isinstance(self.max_harmonic, (int, np.integer)) or not (
            1 <= self.max_harmonic <= nyq
        ):
            raise InputError(f"supply.max_harmonic must be a whole number in [1, {nyq}]; got {self.max_harmonic!r}")

    def fourier(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """(orders, a, b) with V(t) = Σ a_m sin(m ω t) + b_m cos(m ω t) [V], from the FFT of the samples.

        Harmonics 1 to ``max_harmonic`` are kept.

        Returns
        -------
        tuple of numpy.ndarray
            ``(orders, a, b)``: harmonic orders m [-] and the sine and cosine amplitudes a_m, b_m [V].

        Raises
        ------
        InputError
            When the samples do not have zero mean (not an AC supply).
        """
        n = self.samples.size
        c = np.fft.rfft(self.samples) / n
        if abs(c[0].real) > 1e-9 * np.max(np.abs(self.samples)):
            raise InputError(
                f"supply.samples must have zero mean (an AC supply); the mean is {c[0].real:.6g} V"
            )
        m = np.arange(1, self._harmonics() + 1)
        a = -2.0 * c[m].imag
        b = 2.0 * c[m].real
        return m.astype(float), a, b

    def _harmonics(self) -> int:
        if self.max_harmonic is None:  # __post_init__ sets it; never None after construction
            raise InputError("supply.max_harmonic is not set")
        return int(self.max_harmonic)

    @property
    def rms(self) -> float:
        """rms of the samples [V]."""
        return float(np.sqrt(np.mean(self.samples**2)))

    @property
    def is_pure(self) -> bool:
        """Always False: a sampled waveform is treated as a general periodic supply."""
        return False

    def __eq__(self, other: object) -> bool:
        return (
            isinstance(other, Periodic)
            and np.array_equal(self.samples, other.samples)
            and self.frequency == other.frequency
            and self.max_harmonic == other.max_harmonic
        )

    __hash__ = None  # type: ignore[assignment]


def check_seed(seed: object) -> int:
    """A seed for the generator: a whole number in [0, 2**32 - 1].

    Parameters
    ----------
    seed : object
        The seed to check (this function is the type gate; booleans and floats are refused).

    Returns
    -------
    int
        ``seed`` as a Python int.

    Raises
    ------
    InputError
        Unless ``seed`` is a whole number in [0, 4294967295].
    """
    if isinstance(seed, bool) or not isinstance(seed, (int, np.integer)) or not 0 <= int(seed) < 2**32:
        raise InputError(f"seed must be a whole number in [0, 4294967295]; got {seed!r}")
    return int(seed)


def real_or_none(name: str, value: object) -> float | None:
    """None, or ``value`` checked as a finite real number.

    Parameters
    ----------
    name : str
        The parameter's name, used in the error message.
    value : object
        None or a number (this function is the type gate).

    Returns
    -------
    float or None
        ``value`` as a float, or None.

    Raises
    ------
    InputError
        For a value that is neither None nor a finite real number.
    """
    return None if value is None else check_real(name, value)
