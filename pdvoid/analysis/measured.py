"""What an IEC 60270 instrument reads: apparent charges through a test circuit, a band-pass and a peak detector.

The forward model, in the order a measurement applies it:

1. Test circuit (:class:`pdvoid.TestCircuit`, :mod:`pdvoid.physics.measuring_circuit`): a fraction
   q_m / q of each apparent charge reaches the measuring impedance, as a current pulse shaped by the discharge's
   own duration and the circuit's RC time constant.
2. Instrument (:class:`pdvoid.Instrument`, :mod:`pdvoid.physics.bandpass`): a Butterworth band-pass with the
   instrument's -6 dB limits, normalised so that a charge Q arriving as an impulse reads Q (the uncalibrated
   reading); the output of every pulse is its analytic response, superposed with its neighbours' only when they
   are closer than the response lasts (:func:`pdvoid.kernels.instrument_response.bandpass_readings`), and read
   by a peak detector. The reading of an isolated pulse, the pulse resolution time and the superposition error of
   close pulses therefore come out of the filter.
3. Calibration (IEC 60270 clause 5, from memory): a calibrator injecting q_0 at the test object's terminals is
   read through the same chain; the scale factor q_0 / reading turns every later reading into pC "as
   calibrated". The calibrator's slower current pulse and its capacitor C_0 (present during calibration only)
   leave the small calibration errors a real calibration has.
4. Noise, threshold and gating: white noise at the filter's output (RMS given as read after calibration) adds a
   Gaussian error to each reading and reports noise peaks above the threshold at the mean rate of Rice's
   formula (:func:`pdvoid.physics.bandpass.rice_crossing_rate`, for both polarities; peak heights
   sqrt(u² + 2σ² E) with E exponential, the Rayleigh tail above the level u — common practice approximation);
   periodic interference pulses at fixed phases pass the same chain; readings below the threshold and in gated
   phase windows are dropped; phases are rounded to the instrument's phase resolution.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from pdvoid.analysis.patterns import _filled
from pdvoid.core.errors import InputError, check_bool, check_positive
from pdvoid.inputs.measurement import Instrument, TestCircuit
from pdvoid.inputs.parameters import check_seed
from pdvoid.kernels.instrument_response import bandpass_readings
from pdvoid.physics.bandpass import bandpass_zpk, impulse_residues, noise_moments, rice_crossing_rate
from pdvoid.physics.measuring_circuit import charge_transfer_ratio, circuit_time_constant
from pdvoid.simulation.events import Events, as_events

__all__ = ["InstrumentResponse", "instrument_response", "measure", "pulse_pair_reading", "pulse_resolution_time"]

#: a lone pulse's output is followed until its bound has fallen to this fraction of its peak [-]
WINDOW_FRACTION = 1e-4
#: grid steps per period of the upper limit frequency [-]
STEPS_PER_PERIOD = 64
#: largest number of noise peaks :func:`measure` will add (more means the threshold sits in the noise)
MAX_NOISE_EVENTS = 1_000_000


@dataclass(frozen=True, eq=False)
class InstrumentResponse:
    """The measuring chain reduced to numbers: responses, times and the calibration.

    Attributes
    ----------
    poles, residues : numpy.ndarray
        poles [1/s] and residues [1/s] of the uncalibrated output per unit charge at the measuring impedance,
        for a discharge's current pulse.
    transfer_ratio : float
        q_m / q of the test (calibrator removed) [-].
    calibration_transfer_ratio : float
        q_m / q while the calibrator (with C_0) is connected [-].
    peak, peak_time : float
        signed peak of the unit response on the grid [-] and its time after the pulse's arrival [s].
    calibration_reading : float
        uncalibrated reading of the calibrator's charge [C].
    scale : float
        the factor every uncalibrated reading is multiplied by: the calibration factor
        ``|q_0 / calibration_reading|`` (:attr:`calibration_factor`, positive) times the :attr:`polarity`, so
        that a lone positive pulse reads positive
        (a narrow-band output's carrier can put the calibrator's and a discharge's largest half-wave at
        opposite signs; polarity is referred to a lone discharge's response) [-].
    dt : float
        grid step [s].
    window : float
        time after which a lone pulse's output bound is below ``WINDOW_FRACTION`` of its peak [s].
    hold : float
        peak detector hold time: when the envelope bound Σ_k |r_k| exp(Re p_k t) of a lone pulse has fallen to
        the instrument's hold fraction of its peak [s].
    noise_moments : tuple[float, float]
        spectral moments m_0, m_2 of the band-pass [rad/s, (rad/s)^3].
    """

    poles: np.ndarray
    residues: np.ndarray
    transfer_ratio: float
    calibration_transfer_ratio: float
    peak: float
    peak_time: float
    calibration_reading: float
    scale: float
    dt: float
    window: float
    hold: float
    noise_moments: tuple[float, float]

    @property
    def calibration_factor(self) -> float:
        """The calibration factor q_0 / ``|calibration_reading|``: the calibrator's charge over the magnitude of
        its uncalibrated reading, always positive [-]."""
        return abs(self.scale)

    @property
    def polarity(self) -> float:
        """+1 when a lone positive discharge's largest output half-wave is positive, -1 when it is negative (a
        narrow-band output's carrier can do that); the readings are referred to it so that a positive discharge
        reads positive [-]."""
        return math.copysign(1.0, self.peak)


def _unit_response(poles: np.ndarray, residues: np.ndarray, t: np.ndarray) -> np.ndarray:
    return np.real(np.exp(np.outer(t, poles)) @ residues)


def _check_pair(circuit: object, instrument: object) -> tuple[TestCircuit, Instrument]:
    if not isinstance(circuit, TestCircuit):
        raise InputError(f"circuit must be a pdvoid.TestCircuit; got {type(circuit).__name__}")
    if not isinstance(instrument, Instrument):
        raise InputError(f"instrument must be a pdvoid.Instrument; got {type(instrument).__name__}")
    return circuit, instrument


def instrument_response(circuit: TestCircuit, instrument: Instrument) -> InstrumentResponse:
    """Reduce a test circuit and an instrument to the responses, times and calibration factor used by
    :func:`measure`.

    Parameters
    ----------
    circuit : TestCircuit
        the test circuit and its calibrator [-]
    instrument : Instrument
        the PD instrument [-]

    Returns
    -------
    InstrumentResponse
        :class:`InstrumentResponse`.

    Notes
    -----
    The band-pass gain is normalised so that a charge arriving as an impulse reads its own value; the grid step
    is 1 / (64 f_high), so a sampled peak is low by at most 1 − cos(π/64) ≈ 0.12 % (the same for the calibrator
    and the pulses, so it cancels in the calibrated reading).

    References
    ----------
    iec60270_circuit, iec60270_instrument, butterworth1930, heaviside_expansion (see the module docstring).
    """
    c, inst = _check_pair(circuit, instrument)
    assert inst.f_low is not None and inst.f_high is not None
    z, p, k = bandpass_zpk(inst.f_low, inst.f_high, inst.order)
    dt = 1.0 / (STEPS_PER_PERIOD * inst.f_high)
    sigma = float(np.min(-p.real))

    def span(poles: np.ndarray, res: np.ndarray, peak: float) -> float:
        s = float(np.min(-poles.real))
        return max(math.log(float(np.sum(np.abs(res))) / (WINDOW_FRACTION * abs(peak))) / s, 10 * dt)

    # normalisation: the impulse response's peak (on a fine grid over its main lobes)
    p0, r0 = impulse_residues(z, p, k)
    t_fine = np.arange(0.0, 8.0 / sigma, dt / 4.0)
    gain = 1.0 / float(np.max(np.abs(_unit_response(p0, r0, t_fine))))

    def chain(tau_source: float, capacitance_extra: float) -> tuple[float, np.ndarray, np.ndarray]:
        ratio = charge_transfer_ratio(c.test_object_capacitance + capacitance_extra, c.coupling_capacitance,
                                      c.stray_capacitance, c.arrangement)
        tau_c = circuit_time_constant(c.measuring_resistance, c.test_object_capacitance + capacitance_extra,
                                      c.coupling_capacitance, c.stray_capacitance, c.arrangement)
        poles, res = impulse_residues(z, p, k * gain, (tau_source, tau_c))
        return ratio, poles, res

    def peak_of(poles: np.ndarray, res: np.ndarray) -> tuple[float, float, np.ndarray]:
        t = np.arange(0.0, 8.0 / sigma, dt)
        y = _unit_response(poles, res, t)
        i = int(np.argmax(np.abs(y)))
        return float(y[i]), float(t[i]), y

    ratio, poles, res = chain(c.pulse_duration, 0.0)
    peak, peak_time, _ = peak_of(poles, res)
    window = span(poles, res, peak)
    t = np.arange(0.0, window + dt, dt)
    envelope = np.exp(np.outer(t, poles.real)) @ np.abs(res)  # the bound sum_k |x_k(t)| of a lone pulse
    above = np.nonzero(envelope >= inst.hold_fraction * abs(peak))[0]
    hold = float(t[above[-1]]) + dt
    ratio_cal, pc, rc = chain(c.calibrator_rise_time / math.log(9.0), c.calibrator_capacitance)
    peak_cal, _, _ = peak_of(pc, rc)
    cal_reading = c.calibrator_charge * ratio_cal * peak_cal
    return InstrumentResponse(
        poles=poles, residues=res, transfer_ratio=ratio, calibration_transfer_ratio=ratio_cal, peak=peak,
        peak_time=peak_time, calibration_reading=cal_reading,
        scale=c.calibrator_charge / abs(cal_reading) * math.copysign(1.0, peak), dt=dt,
        window=window, hold=hold, noise_moments=noise_moments(z, p, k),
    )


def _times(ev: Events) -> np.ndarray:
    time = _filled(ev.time)
    if ev.count and not np.all(np.isfinite(time)):
        cycle = _filled(ev.cycle)
        if not np.all(np.isfinite(cycle)):
            raise InputError("measure needs the time or the cycle of every event; some events have neither")
        time = np.where(np.isfinite(time), time, (cycle + ev.phase_deg / 360.0) / ev.frequency)
    return time


def _in_gates(phase: np.ndarray, gates: tuple[tuple[float, float], ...]) -> np.ndarray:
    out = np.zeros(phase.shape, dtype=bool)
    for a, b in gates:
        out |= ((phase >= a) & (phase < b)) if a <= b else ((phase >= a) | (phase < b))
    return out


def measure(
    result_or_events: object,
    circuit: TestCircuit,
    instrument: Instrument,
    calibrate: bool = True,
    seed: int = 0,
) -> Events:
    """The events an IEC 60270 instrument would report for simulated (or any) apparent charges.

    Parameters
    ----------
    result_or_events : Result or Events
        apparent charges at the test object's terminals with their times (or cycles and phases) [-]
    circuit : TestCircuit
        test circuit and calibrator [-]
    instrument : Instrument
        PD instrument: band-pass, noise, threshold, interference, gating, phase resolution [-]
    calibrate : bool, optional
        True: readings scaled by the calibration (read in C of apparent charge); False: the uncalibrated
        readings, i.e. the charge reaching the measuring impedance as the instrument's own gain shows it [-]
    seed : int, optional
        seed of the noise, ``numpy.random.default_rng([seed, 2])``, 0 ... 2**32 - 1 [-]

    Returns
    -------
    Events
        the readings as a measured file holds them: ``phase_deg`` (rounded to the phase resolution), signed
        ``charge`` (as read) [C], ``cycle``, ``time`` of each reading's peak [s], the input's label with
        "(as measured)", ``extra["instrument"]`` recording the chain (transfer ratio, calibration factor
        q_0 / ``|reading|`` (positive) and the polarity the readings were referred to,
        hold and window times, counts) and ``extra["threshold"]`` the threshold in the units read [C].

    Raises
    ------
    InputError
        for a bad source, circuit, instrument or seed, events without times or cycles, or a threshold so close
        to the noise that the instrument would report more than a million noise peaks.

    Notes
    -----
    Readings whose peak falls after the end of the observation are dropped. Superposition is exact for pulses
    closer than the response's window; farther pulses' tails (below 1e-4 of their peak) are neglected.

    References
    ----------
    iec60270_circuit, iec60270_instrument, rice1944 (see the module docstring).
    """
    ev = as_events(result_or_events)
    c, inst = _check_pair(circuit, instrument)
    calibrate = check_bool("calibrate", calibrate)
    seed = check_seed(seed)
    resp = instrument_response(c, inst)
    time = _times(ev)
    q = ev.charge
    f = ev.frequency
    duration = ev.cycles / f
    if inst.interference:
        ncyc = math.ceil(ev.cycles)
        base = np.arange(ncyc, dtype=float)
        it = np.concatenate([(base + ph / 360.0) / f for ph, _ in inst.interference])
        iq = np.concatenate([np.full(ncyc, qq) for _, qq in inst.interference])
        keep = it < duration
        time = np.concatenate([time, it[keep]])
        q = np.concatenate([q, iq[keep]])
    order = np.argsort(time, kind="stable")
    gain = resp.calibration_factor
    trigger = inst.threshold / gain
    t_read, raw, _ = bandpass_readings(
        np.ascontiguousarray(time[order]), np.ascontiguousarray(q[order] * resp.transfer_ratio), resp.poles,
        resp.residues, resp.dt, resp.window, resp.hold, trigger, inst.hold_fraction, resp.peak, resp.peak_time,
    )
    rng = np.random.default_rng([seed, 2])
    sigma = inst.noise / gain
    n_noise = 0
    if sigma > 0.0:
        raw = raw + sigma * rng.standard_normal(raw.size)
        m0, m2 = resp.noise_moments
        rate = 2.0 * rice_crossing_rate(trigger, sigma, m0, m2)
        expected = rate * duration
        if expected > MAX_NOISE_EVENTS:
            raise InputError(
                f"threshold={inst.threshold!r} C sits in the noise (noise={inst.noise!r} C RMS): the instrument "
                f"would report about {expected:.3g} noise peaks; raise the threshold"
            )
        n_noise = int(rng.poisson(expected))
        nt = rng.uniform(0.0, duration, n_noise)
        mag = np.sqrt(trigger**2 + 2.0 * sigma**2 * rng.standard_exponential(n_noise))
        sign = np.where(rng.random(n_noise) < 0.5, -1.0, 1.0)
        t_read = np.concatenate([t_read, nt])
        raw = np.concatenate([raw, sign * mag])
        o = np.argsort(t_read, kind="stable")
        t_read, raw = t_read[o], raw[o]
    reading = raw * resp.scale if calibrate else raw * resp.polarity
    threshold_read = inst.threshold if calibrate else trigger
    cycle = np.floor(t_read * f)
    phase = 360.0 * (t_read * f - cycle)
    phase = np.clip(phase, 0.0, np.nextafter(360.0, 0.0))
    keep = (np.abs(raw) >= trigger) & (t_read < duration) & ~_in_gates(phase, inst.gating)
    res = inst.phase_resolution_deg
    phase, cycle, reading = phase[keep], cycle[keep], reading[keep]
    if res > 0.0:
        phase = np.minimum((np.floor(phase / res) + 0.5) * res, np.nextafter(360.0, 0.0))
    record = {
        "kind": inst.kind,
        "f_low": inst.f_low,
        "f_high": inst.f_high,
        "order": inst.order,
        "transfer_ratio": resp.transfer_ratio,
        "calibration_factor": resp.calibration_factor,
        "reading_polarity": resp.polarity,
        "calibrated": calibrate,
        "hold": resp.hold,
        "window": resp.window,
        "threshold": inst.threshold,
        "noise": inst.noise,
        "phase_resolution_deg": res,
        "input pulses": int(ev.count),
        "interference pulses": int(q.size - ev.count),
        "noise peaks": n_noise,
        "reported": int(keep.sum()),
    }
    label = f"{ev.label} (as measured)" if ev.label else "as measured"
    return Events(
        phase_deg=phase, charge=reading, frequency=f, cycles=ev.cycles, time=(cycle + phase / 360.0) / f,
        cycle=cycle, label=label, extra={"instrument": record, "threshold": threshold_read},
    )


def pulse_pair_reading(
    circuit: TestCircuit, instrument: Instrument, spacing: float, opposite: bool = False
) -> tuple[float, int]:
    """The largest reading of two equal pulses ``spacing`` apart, relative to a lone pulse's reading.

    Parameters
    ----------
    circuit : TestCircuit
        test circuit [-]
    instrument : Instrument
        instrument (its noise, threshold, gating and phase resolution are not applied) [-]
    spacing : float
        time between the pulses, > 0 [s]
    opposite : bool, optional
        the second pulse of opposite polarity [-]

    Returns
    -------
    tuple[float, int]
        (largest ``|reading|`` of the pair / ``|reading|`` of one pulse [-], number of readings reported [-]).

    References
    ----------
    iec60270_instrument (pulse resolution time: the reading of a pulse pair; from memory).
    """
    c, inst = _check_pair(circuit, instrument)
    dt_pair = check_positive("spacing", spacing, "s")
    return _pair_reading(instrument_response(c, inst), inst, dt_pair, check_bool("opposite", opposite))


def _pair_reading(resp: InstrumentResponse, inst: Instrument, dt_pair: float, opposite: bool) -> tuple[float, int]:
    q = 1e-12
    t = np.array([0.0, dt_pair])
    qq = np.array([q, -q if opposite else q]) * resp.transfer_ratio
    _, raw, _ = bandpass_readings(t, qq, resp.poles, resp.residues, resp.dt, resp.window, resp.hold,
                                  1e-6 * abs(q * resp.peak), inst.hold_fraction, resp.peak, resp.peak_time)
    single = abs(q * resp.transfer_ratio * resp.peak)
    return float(np.max(np.abs(raw)) / single), int(raw.size)


def pulse_resolution_time(circuit: TestCircuit, instrument: Instrument, tolerance: float = 0.1,
                    opposite: bool = False) -> float:
    """Pulse resolution time read from the simulated instrument: the longest spacing of two equal pulses whose
    reading still differs from a lone pulse's by more than ``tolerance``.

    Parameters
    ----------
    circuit : TestCircuit
        test circuit [-]
    instrument : Instrument
        instrument [-]
    tolerance : float, optional
        relative change of the reading, 0 < tolerance < 1 [-] (IEC 60270: 10 %, from memory)
    opposite : bool, optional
        pulses of opposite polarity [-]

    Returns
    -------
    float
        T_r [s], to within one grid step of the instrument's response.

    References
    ----------
    iec60270_instrument (pulse resolution time; from memory).
    """
    c, inst = _check_pair(circuit, instrument)
    tol = check_positive("tolerance", tolerance)
    if not tol < 1.0:
        raise InputError(f"tolerance must lie in (0, 1); got {tol!r}")
    opposite = check_bool("opposite", opposite)
    resp = instrument_response(c, inst)
    for s in np.arange(resp.hold, 0.0, -resp.dt)[:-1]:
        r, _ = _pair_reading(resp, inst, float(s), opposite)
        if abs(r - 1.0) > tol:
            return float(s)
    return 0.0
