"""The measuring side of an IEC 60270 test: the test circuit with its calibrator, and the PD instrument.

Frozen SI dataclasses, validated on construction; the formulas that use them live in
:mod:`pdvoid.physics.measuring_circuit` and :mod:`pdvoid.physics.bandpass`, the forward model in
:func:`pdvoid.measure`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from pdvoid.core.errors import (
    InputError,
    check_bool,
    check_choice,
    check_int,
    check_nonnegative,
    check_positive,
    check_range,
    check_real,
)

__all__ = ["TestCircuit", "Instrument", "INSTRUMENT_RANGES", "INSTRUMENT_KINDS"]

INSTRUMENT_KINDS = ("wideband", "narrowband")
#: IEC 60270 ranges of an instrument's frequencies [Hz] by kind, *from memory* of clause 4.3.3 (wide band) and
#: 4.3.4 (narrow band), not confirmed from a public source: wide band f_low 30-100 kHz, f_high <= 1 MHz
#: (500 kHz recommended), bandwidth f_high - f_low 100-900 kHz; narrow band bandwidth 9-30 kHz at a centre
#: (mid-band) frequency of 50 kHz-1 MHz.
INSTRUMENT_RANGES: dict[str, dict[str, tuple[float, float]]] = {
    "wideband": {"f_low": (30e3, 100e3), "f_high": (0.0, 1e6), "bandwidth": (100e3, 900e3)},
    "narrowband": {"bandwidth": (9e3, 30e3), "centre": (50e3, 1e6)},
}


def _set(obj: object, name: str, value: object) -> None:
    object.__setattr__(obj, name, value)


@dataclass(frozen=True)
class TestCircuit:
    """An IEC 60270 test circuit: test object, coupling capacitor, measuring impedance and calibrator.

    Attributes
    ----------
    test_object_capacitance : float
        C_a, the test object's capacitance at its terminals [F], 1 pF to 100 µF.
    coupling_capacitance : float
        C_k, the coupling capacitor [F], 1 pF to 100 µF.
    stray_capacitance : float
        C_s, stray capacitance of the high-voltage node to ground [F], >= 0 (default 0).
    arrangement : str
        where the measuring impedance sits: ``"coupling_capacitor"`` (in series with C_k, the usual
        arrangement; default) or ``"test_object"`` (in series with the test object's earthy end).
    measuring_resistance : float
        resistive part R_m of the measuring impedance [Ω] (default 50 Ω); with the capacitances it sets the
        time constant of the current through it.
    pulse_duration : float
        time constant of a discharge's own current pulse at the test object's terminals [s] (default 1 ns).
    calibrator_charge : float
        charge q_0 = U_0 C_0 the calibrator injects at the test object's terminals [C] (default 100 pC).
    calibrator_rise_time : float
        10-90 % rise time of the calibrator's voltage step [s] (default 60 ns, the largest IEC 60270 allows
        as recalled, "from memory"); its current pulse has the time constant rise_time / ln 9.
    calibrator_capacitance : float
        C_0, the calibrator's capacitor [F] (default 0: negligible); it adds to C_a during calibration only.
    """

    __test__ = False  # not a pytest test class despite its name

    test_object_capacitance: float
    coupling_capacitance: float
    stray_capacitance: float = 0.0
    arrangement: str = "coupling_capacitor"
    measuring_resistance: float = 50.0
    pulse_duration: float = 1e-9
    calibrator_charge: float = 100e-12
    calibrator_rise_time: float = 60e-9
    calibrator_capacitance: float = 0.0

    def __post_init__(self) -> None:
        _set(self, "test_object_capacitance",
             check_range("test_object_capacitance", self.test_object_capacitance, 1e-12, 1e-4, unit="F"))
        _set(self, "coupling_capacitance",
             check_range("coupling_capacitance", self.coupling_capacitance, 1e-12, 1e-4, unit="F"))
        _set(self, "stray_capacitance", check_range("stray_capacitance", self.stray_capacitance, 0.0, 1e-4, unit="F"))
        _set(self, "arrangement", check_choice("arrangement", self.arrangement, ("coupling_capacitor", "test_object")))
        _set(self, "measuring_resistance",
             check_range("measuring_resistance", self.measuring_resistance, 1e-3, 1e6, unit="ohm"))
        _set(self, "pulse_duration", check_range("pulse_duration", self.pulse_duration, 0.0, 1e-6, unit="s"))
        _set(self, "calibrator_charge",
             check_range("calibrator_charge", self.calibrator_charge, 1e-15, 1e-6, low_open=False, unit="C"))
        _set(self, "calibrator_rise_time",
             check_range("calibrator_rise_time", self.calibrator_rise_time, 0.0, 1e-6, unit="s"))
        _set(self, "calibrator_capacitance",
             check_range("calibrator_capacitance", self.calibrator_capacitance, 0.0, 1e-6, unit="F"))

    def describe(self) -> list[str]:
        """The circuit's assumptions in plain sentences (for reports).

        Returns
        -------
        list[str]
            one sentence per assumption.
        """
        where = ("in series with the coupling capacitor" if self.arrangement == "coupling_capacitor"
                 else "in series with the test object")
        return [
            f"Test object C_a = {self.test_object_capacitance * 1e12:.4g} pF, coupling capacitor "
            f"C_k = {self.coupling_capacitance * 1e12:.4g} pF, stray capacitance "
            f"C_s = {self.stray_capacitance * 1e12:.4g} pF; measuring impedance {where} "
            f"(R_m = {self.measuring_resistance:.4g} ohm); supply blocked for the pulses.",
            f"Calibrator: {self.calibrator_charge * 1e12:.4g} pC injected at the test object's terminals, "
            f"rise time {self.calibrator_rise_time * 1e9:.4g} ns, C_0 = {self.calibrator_capacitance * 1e12:.4g} "
            "pF (removed for the test).",
        ]


@dataclass(frozen=True)
class Instrument:
    """A quasi-integrating IEC 60270 PD instrument: band-pass, peak detector, noise, threshold and gating.

    Give a wide-band instrument by ``f_low`` and ``f_high`` (defaults 100 kHz and 500 kHz), a narrow-band one
    by ``centre`` and ``bandwidth`` (defaults 100 kHz and 9 kHz); the other pair is derived
    (f_low = centre − bandwidth/2, f_high = centre + bandwidth/2). The limits are where the response has
    fallen by 6 dB. Unless ``standard_ranges`` is False they must lie in :data:`INSTRUMENT_RANGES` (IEC 60270
    clause 4.3.3/4.3.4, from memory).

    Attributes
    ----------
    kind : str
        ``"wideband"`` or ``"narrowband"``.
    f_low, f_high : float or None
        lower and upper limit frequencies f_1, f_2 [Hz].
    centre, bandwidth : float or None
        mid-band frequency f_m and bandwidth Δf [Hz].
    order : int
        order N of the Butterworth prototype (2N poles), 1 ... 8 [-] (default 2).
    threshold : float
        smallest reading reported, as read after calibration [C] (default 0).
    noise : float
        RMS of the white background noise at the filter's output, as read after calibration [C] (default 0).
    interference : tuple of (float, float)
        periodic interference pulses ``(phase_deg, charge)`` repeating every cycle, charge as read after
        calibration [deg, C] (default none).
    gating : tuple of (float, float)
        phase windows ``(start_deg, stop_deg)`` in which the instrument reports nothing [deg] (default none).
    phase_resolution_deg : float
        width of the phase bins the instrument reports [deg]; 360 / width whole; 0 for none (default 0).
    hold_fraction : float
        the peak detector holds each reading until a single pulse's response would have fallen for good below
        this fraction of its peak, 1e-4 ... 0.5 [-] (default 0.01).
    standard_ranges : bool
        check the frequencies against the IEC 60270 ranges (default True).
    """

    kind: str = "wideband"
    f_low: float | None = None
    f_high: float | None = None
    centre: float | None = None
    bandwidth: float | None = None
    order: int = 2
    threshold: float = 0.0
    noise: float = 0.0
    interference: tuple[tuple[float, float], ...] = ()
    gating: tuple[tuple[float, float], ...] = ()
    phase_resolution_deg: float = 0.0
    hold_fraction: float = 0.01
    standard_ranges: bool = True

    def __post_init__(self) -> None:
        kind = check_choice("kind", self.kind, INSTRUMENT_KINDS)
        _set(self, "kind", kind)
        given_edges = self.f_low is not None or self.f_high is not None
        given_centre = self.centre is not None or self.bandwidth is not None
        if given_edges and given_centre:
            both = (self.f_low, self.f_high, self.centre, self.bandwidth)
            if any(v is None for v in both) or not (
                math.isclose(float(self.centre) - float(self.bandwidth) / 2.0, float(self.f_low), rel_tol=1e-9)  # type: ignore[arg-type]
                and math.isclose(float(self.centre) + float(self.bandwidth) / 2.0, float(self.f_high), rel_tol=1e-9)  # type: ignore[arg-type]
            ):
                raise InputError(
                    "give either f_low and f_high or centre and bandwidth (or all four, consistent); got "
                    f"f_low={self.f_low!r}, f_high={self.f_high!r}, centre={self.centre!r}, "
                    f"bandwidth={self.bandwidth!r}"
                )
            given_centre = False
        if given_centre or (kind == "narrowband" and not given_edges):
            fm = check_positive("centre", 100e3 if self.centre is None else self.centre, "Hz")
            df = check_positive("bandwidth", 9e3 if self.bandwidth is None else self.bandwidth, "Hz")
            if not df < 2.0 * fm:
                raise InputError(f"bandwidth must be less than twice the centre frequency; got {df!r} Hz at {fm!r} Hz")
            f1, f2 = fm - df / 2.0, fm + df / 2.0
        else:
            f1 = check_positive("f_low", 100e3 if self.f_low is None else self.f_low, "Hz")
            f2 = check_positive("f_high", 500e3 if self.f_high is None else self.f_high, "Hz")
            if not f2 > f1:
                raise InputError(f"f_high must exceed f_low; got f_low={f1!r} Hz, f_high={f2!r} Hz")
            fm, df = (f1 + f2) / 2.0, f2 - f1
        _set(self, "f_low", f1)
        _set(self, "f_high", f2)
        _set(self, "centre", fm)
        _set(self, "bandwidth", df)
        _set(self, "standard_ranges", check_bool("standard_ranges", self.standard_ranges))
        if self.standard_ranges:
            values = {"f_low": f1, "f_high": f2, "bandwidth": df, "centre": fm}
            for name, (lo, hi) in INSTRUMENT_RANGES[kind].items():
                v = values[name]
                if not lo * (1 - 1e-12) <= v <= hi * (1 + 1e-12):
                    raise InputError(
                        f"{name} = {v!r} Hz is outside the IEC 60270 range {lo!r} ... {hi!r} Hz of a {kind} "
                        "instrument (ranges from memory of clause 4.3); pass standard_ranges=False to allow it"
                    )
        _set(self, "order", check_int("order", self.order, 1, 8))
        _set(self, "threshold", check_nonnegative("threshold", self.threshold, "C"))
        _set(self, "noise", check_nonnegative("noise", self.noise, "C"))
        _set(self, "interference", tuple(_pairs("interference", self.interference, phase_only=False)))
        _set(self, "gating", tuple(_pairs("gating", self.gating, phase_only=True)))
        res = check_range("phase_resolution_deg", self.phase_resolution_deg, 0.0, 360.0, unit="deg")
        if res > 0.0 and not math.isclose(round(360.0 / res) * res, 360.0, rel_tol=1e-12):
            raise InputError(f"phase_resolution_deg must divide 360 deg into whole bins; got {res!r}")
        _set(self, "phase_resolution_deg", res)
        _set(self, "hold_fraction", check_range("hold_fraction", self.hold_fraction, 1e-4, 0.5, unit="-"))

    def describe(self) -> list[str]:
        """The instrument's assumptions in plain sentences (for reports).

        Returns
        -------
        list[str]
            one sentence per assumption.
        """
        assert self.f_low is not None and self.f_high is not None
        lines = [
            f"{self.kind.replace('band', '-band').capitalize()} quasi-integrating instrument: Butterworth "
            f"band-pass of order {2 * self.order}, -6 dB at {self.f_low / 1e3:.4g} kHz and "
            f"{self.f_high / 1e3:.4g} kHz; peak detector holding each reading until the output's envelope has "
            f"fallen below {self.hold_fraction:.2g} of the reading.",
            f"Threshold {self.threshold * 1e12:.4g} pC, white noise {self.noise * 1e12:.4g} pC RMS, "
            f"{len(self.interference)} periodic interference pulse(s) per cycle, {len(self.gating)} gated phase "
            f"window(s), phase resolution {self.phase_resolution_deg:.4g} deg.",
        ]
        return lines


def _pairs(name: str, value: object, *, phase_only: bool) -> list[tuple[float, float]]:
    if isinstance(value, (str, bytes)) or not hasattr(value, "__iter__"):
        raise InputError(f"{name} must be a sequence of pairs; got {value!r}")
    out = []
    for i, item in enumerate(value):
        if isinstance(item, (str, bytes)) or not hasattr(item, "__len__") or len(item) != 2:
            raise InputError(f"{name}[{i}] must be a pair; got {item!r}")
        a = check_range(f"{name}[{i}][0]", item[0], 0.0, 360.0, unit="deg")
        b = check_real(f"{name}[{i}][1]", item[1])
        if phase_only:
            b = check_range(f"{name}[{i}][1]", b, 0.0, 360.0, unit="deg")
        elif a >= 360.0:
            raise InputError(f"{name}[{i}][0] must lie in [0, 360) deg; got {a!r}")
        out.append((a, b))
    return out
