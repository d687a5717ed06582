"""Inception under each supply: DC, VLF (sine and cosine-rectangular) and repetitive fast edges (square waves, PWM).

All voltages here follow from the discharge-free void field, computed exactly from the transfer of the conducting
host (:mod:`pdvoid.physics.conduction`)::

    H(s) = f_cap + (f_res − f_cap)/(1 + s τ)        (void field per applied mean field)

- **DC**: in steady DC the void field is the resistive one, f_res·V/d, so the (repetitive) DC inception voltage
  is E_inc·d/f_res. At switch-on the field starts from the capacitive value f_cap·V/d and relaxes to f_res·V/d
  with τ; the largest field of that transient gives the *switch-on* inception voltage (only a few discharges
  there if f_res < f_cap). The DC inception voltage the user gets is the steady one: repetitive discharges under
  DC need the field they recover to after each discharge, which is E∞ = f_res·V/d.
- **VLF** (any sine, and the cosine-rectangular wave): the periodic steady state of the void field, harmonic by
  harmonic through H(j m ω). At 0.1 Hz, with τ comparable to the period, ``|H|`` lies between f_cap and f_res.
- **Repetitive edges** (:class:`pdvoid.SquareWave`): the repetitive PD inception and extinction voltages (RPDIV,
  RPDEV) in the sense of IEC TS 60034-18-41:2014 (edition 1.0; the definitions as recalled from memory: RPDIV the
  lowest peak-to-peak voltage at which PD occur on more than half of the impulses of one polarity — "more than
  five PD pulses on ten impulses" — when the voltage is raised; RPDEV the voltage at which they stop doing so when
  it is lowered).

The rise time enters only through what pdvoid models: (1) conduction (negligible unless τ is comparable to
the rise time, which no practical insulation reaches) and (2) the statistical lag: a discharge needs a start
electron while ``|E_void| >= E_inc``, and the time spent above inception per impulse is the flat part plus the
part of the edges above the threshold, so a slower edge shortens that window. Not modelled: the overshoot at the
machine terminals and the uneven voltage distribution along a winding for fast edges (both of which make real
RPDIV depend on rise time), space-charge and surface-charge memory between impulses beyond the model's own.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.optimize import brentq

from pdvoid.coefficients import Coefficients, compute_coefficients
from pdvoid.core.errors import InputError, check_range
from pdvoid.inputs.parameters import Periodic, Sine
from pdvoid.inputs.scenario import Scenario
from pdvoid.inputs.supplies import DC, CosineRectangular, PolarityReversal, SquareWave
from pdvoid.inputs.supplies.registry import SupplyPieces
from pdvoid.models.arguments import cathode_rate
from pdvoid.models.time_domain import ConductionCoefficients, conduction_coefficients

__all__ = ["SupplyInception", "supply_inception", "dc_inception", "vlf_inception", "repetitive_inception",
           "transfer_magnitude"]

#: share of impulses of one polarity with a discharge that counts as repetitive (IEC TS 60034-18-41:2014, from
#: memory: more than five PD pulses on ten impulses)
_REPETITION_CRITERION = 0.5

_SAMPLES = 1 << 15  # samples per period of the Fourier route (relative error of the peak below 1e-6)


@dataclass(frozen=True)
class SupplyInception:
    """Inception and extinction of a void under one supply, in the quantity that supply is specified in.

    Attributes
    ----------
    supply : str
        The supply's kind ("dc", "sine", "cosine_rectangular", "square_wave", "polarity_reversal").
    quantity : str
        What the voltages are, in words (e.g. "DC voltage", "rms voltage", "peak-to-peak voltage").
    inception_voltage : float
        Repetitive inception voltage [V] in ``quantity`` (inf when none at any voltage).
    extinction_voltage : float
        Extinction voltage [V] in ``quantity``.
    transient_inception_voltage : float
        The voltage at which the largest field of the transient (switch-on, reversal) first reaches the
        inception field [V]; NaN when there is no transient.
    lag_free_inception_voltage : float
        Where the peak void field first reaches the inception field, without statistical lag [V].
    edge_inception_voltage, edge_extinction_voltage : float
        The voltage jump of one edge at inception and at extinction [V] (square waves; NaN otherwise).
    enhancement : float
        The void field per applied mean field that sets ``inception_voltage`` [-] (f_res for DC, the peak of
        the periodic response per peak volt for periodic supplies).
    relaxation_time : float
        τ of the host [s] (inf for a perfect dielectric).
    notes : tuple of str
        Assumptions, in plain words.
    """

    supply: str
    quantity: str
    inception_voltage: float
    extinction_voltage: float
    transient_inception_voltage: float
    lag_free_inception_voltage: float
    edge_inception_voltage: float
    edge_extinction_voltage: float
    enhancement: float
    relaxation_time: float
    notes: tuple[str, ...]


def transfer_magnitude(omega: float, capacitive: float, resistive: float, relaxation_time: float) -> float:
    """``|H(jω)|`` of H(s) = f_cap + (f_res − f_cap)/(1 + s τ): the void field amplitude per applied field [-].

    Parameters
    ----------
    omega : float
        Angular frequency [rad/s], >= 0.
    capacitive : float
        f_cap [-], > 0.
    resistive : float
        f_res [-], >= 0.
    relaxation_time : float
        τ [s], > 0 (inf: a perfect dielectric, ``|H|`` = f_cap).

    Returns
    -------
    float
        ``|H(jω)|`` [-].

    References
    ----------
    Derived from the complex-permittivity solution of an ellipsoid in a lossy host (Wagner 1914, Sillars 1937,
    from memory; user guide "Conducting insulation and DC supplies"). Validity: as
    :func:`pdvoid.physics.conduction.void_field_transfer`.
    """
    w = check_range("omega", omega, 0.0, math.inf, unit="rad/s")
    fc = check_range("capacitive", capacitive, 0.0, math.inf, low_open=True)
    fr = check_range("resistive", resistive, 0.0, math.inf)
    tau = check_range("relaxation_time", relaxation_time, 0.0, math.inf, low_open=True, unit="s")
    if math.isinf(tau):
        return fc
    return abs(fc + (fr - fc) / (1.0 + 1j * w * tau))


def _setup(scenario: Scenario) -> tuple[Coefficients, ConductionCoefficients, float, list[str]]:
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    c = compute_coefficients(scenario)
    cond = conduction_coefficients(scenario, c)
    return c, cond, float(scenario.insulation.thickness), list(cond.notes)


def _h(cond: ConductionCoefficients, omega: np.ndarray) -> np.ndarray:
    fc, fr, tau = cond.capacitive_enhancement, cond.resistive_enhancement, cond.relaxation_time
    if math.isinf(tau):
        return np.full(np.shape(omega), fc, dtype=complex)
    return fc + (fr - fc) / (1.0 + 1j * omega * tau)


def _phi(u: float) -> float:
    """u − 1 + e^{−u} without cancellation (u >= 0)."""
    if u < 1e-4:
        return u * u * (0.5 - u / 6.0 + u * u / 24.0)
    return u + math.expm1(-u)


class _Linear:
    """Exact discharge-free void field x = g V + z, τ ż = G V − z, over linear supply pieces (per volt)."""

    def __init__(self, g: float, big_g: float, tau: float) -> None:
        self.g, self.G, self.tau = g, (0.0 if math.isinf(tau) else big_g), tau

    def z_at(self, z0: float, a: float, b: float, s: float) -> float:
        if math.isinf(self.tau):
            return z0
        u = s / self.tau
        e = math.exp(-u)
        return z0 * e + self.G * (-a * math.expm1(-u) + b * self.tau * _phi(u))

    def x_at(self, z0: float, a: float, b: float, s: float) -> float:
        return self.g * (a + b * s) + self.z_at(z0, a, b, s)

    def turn(self, z0: float, a: float, b: float, length: float) -> float | None:
        """Where x has its one stationary point inside the piece, or None."""
        if math.isinf(self.tau) or b == 0.0 and self.G * a == z0:
            return None
        d = self.G * b - (self.G * a - z0) / self.tau
        if d == 0.0:
            return None
        r = (self.g + self.G) * b / d
        if not 0.0 < r < 1.0:
            return None
        s = -self.tau * math.log(r)
        return s if 0.0 < s < length else None


def _pieces_arrays(pieces: SupplyPieces) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    if pieces.amp is not None and np.any(pieces.amp != 0.0) or pieces.exp_amp is not None and np.any(
            pieces.exp_amp != 0.0):
        raise InputError("this estimate needs a supply of linear pieces (level and slope only)")
    return np.asarray(pieces.breaks, float), np.asarray(pieces.level, float), np.asarray(pieces.slope, float)


def _run_peak(lin: _Linear, breaks: np.ndarray, level: np.ndarray, slope: np.ndarray, z0: float = 0.0
              ) -> tuple[float, float]:
    """(max ``|x|`` over the pieces, z at the end) from z0 at the first break (per volt)."""
    peak, z = 0.0, z0
    for k in range(level.size):
        a, b, length = level[k], slope[k], breaks[k + 1] - breaks[k]
        cands = [0.0, length]
        s = lin.turn(z, a, b, length)
        if s is not None:
            cands.append(s)
        peak = max(peak, *(abs(lin.x_at(z, a, b, c)) for c in cands))
        z = lin.z_at(z, a, b, length)
    return peak, z


def _time_beyond(lin: _Linear, breaks: np.ndarray, level: np.ndarray, slope: np.ndarray, z0: float, level_x: float,
                 sign: float) -> float:
    """Time on the pieces during which sign·x >= level_x (exact roots on the monotone parts)."""
    total, z = 0.0, z0
    for k in range(level.size):
        a, b, length = level[k], slope[k], breaks[k + 1] - breaks[k]
        pts = [0.0, length]
        s = lin.turn(z, a, b, length)
        if s is not None:
            pts.insert(1, s)
        for s0, s1 in zip(pts[:-1], pts[1:], strict=True):
            f0 = sign * lin.x_at(z, a, b, s0) - level_x
            f1 = sign * lin.x_at(z, a, b, s1) - level_x
            if f0 >= 0.0 and f1 >= 0.0:
                total += s1 - s0
            elif f0 * f1 < 0.0:
                zz = z
                root = brentq(lambda q, zz=zz, a=a, b=b: sign * lin.x_at(zz, a, b, q) - level_x, s0, s1,
                              xtol=1e-15 * length + 1e-300, rtol=1e-15)
                total += (s1 - root) if f1 >= 0.0 else (root - s0)
        z = lin.z_at(z, a, b, length)
    return total


def dc_inception(scenario: Scenario) -> SupplyInception:
    """DC inception of the scenario's void under a :class:`pdvoid.DC` or :class:`pdvoid.PolarityReversal` supply.

    The repetitive DC inception voltage is E_inc·d/f_res (the steady, resistive void field; with a ripple the
    peak of the steady void field including the ripple's response through H(j m ω)). The transient inception
    voltage is the one at which the largest field of the transient reaches E_inc: at switch-on (the field jumps
    to f_cap·V/d, for a finite rise time the exact ramp response, then relaxes to f_res·V/d), and for a
    polarity reversal the field just after the reversal of an uncharged void.

    Parameters
    ----------
    scenario : Scenario
        A scenario with a DC or PolarityReversal supply.

    Returns
    -------
    SupplyInception
        Voltages as "DC voltage" [V] (the level; the supply's sign is dropped).

    Raises
    ------
    InputError
        For another supply.

    Notes
    -----
    Lag-free, the DC extinction voltage equals the inception voltage: after each discharge the void field
    recovers towards the same E∞ = f_res·V/d, so discharges go on exactly while E∞ > E_inc. In a perfect
    dielectric host (σ = 0 and no wall conduction) there is no steady conduction field: the void discharges at
    most at switch-on and then, unless the model's deposited charge decays, never again, so the repetitive DC
    inception voltage is infinite.

    References
    ----------
    The transfer H(s) of :mod:`pdvoid.physics.conduction` (Stratton 1941; Wagner 1914, Sillars 1937, from
    memory); the ramp response is derived here (user guide, "Inception under each supply").
    """
    c, cond, d, notes = _setup(scenario)
    sup = scenario.supply
    if not isinstance(sup, (DC, PolarityReversal)):
        raise InputError(f"dc_inception needs a DC or PolarityReversal supply; scenario.supply is a "
                         f"{type(sup).__name__}")
    e_inc = c.inception_field
    fc, fr, tau = cond.capacitive_enhancement, cond.resistive_enhancement, cond.relaxation_time
    v = abs(sup.voltage)
    lin = _Linear(fc / d, (fr - fc) / d, tau)
    # the steady field per DC volt with the ripple's periodic response
    orders, a, b = _ripple(sup)
    steady = fr / d if not math.isinf(tau) else 0.0
    if orders.size and steady > 0.0:
        w = 2.0 * math.pi * sup.ripple_frequency
        t = np.arange(8192) / 8192.0 / sup.ripple_frequency
        hm = _h(cond, orders * w)
        x = steady + sum(abs(hm[i]) / d * (a[i] / v * np.sin(orders[i] * w * t + np.angle(hm[i]))
                                           + b[i] / v * np.cos(orders[i] * w * t + np.angle(hm[i])))
                         for i in range(orders.size))
        steady = float(np.max(np.abs(x)))
        notes.append("the ripple's steady void field is sampled at 8192 points per ripple period (relative error "
                     "of its peak below 1e-6)")
    u_inc = e_inc / steady if steady > 0.0 else math.inf
    if steady == 0.0:
        notes.append("a perfect dielectric host under DC: no steady conduction field; the void can discharge at "
                     "switch-on only (transient inception voltage), and repetitive DC discharges need the "
                     "insulation's conductivity or a decaying deposited charge")
    # the transient without ripple: exact over the supply's linear pieces from an uncharged void
    if isinstance(sup, DC):
        end = sup.rise_time + (0.0 if math.isinf(tau) else 50.0 * tau)
        if sup.off_time is not None:
            notes.append("the switch-off at off_time is not part of this estimate (the reversed discharges after "
                         "switching off are simulated)")
        pieces = DC(voltage=sup.voltage, rise_time=sup.rise_time).pieces(max(end, sup.rise_time * 2.0, 1e-9))
        what = "switch-on"
    else:
        end = float(sup.reversal_starts()[-1] + sup.ramp_time) + (0.0 if math.isinf(tau) else 50.0 * tau)
        pieces = PolarityReversal(voltage=sup.voltage, hold_time=sup.hold_time, ramp_time=sup.ramp_time,
                                  reversals=sup.reversals, rise_time=sup.rise_time).pieces(end)
        what = "energisation and reversals"
    br, lv, sl = _pieces_arrays(pieces)
    peak, _ = _run_peak(lin, br, lv / v, sl / v)
    u_tr = float(e_inc / peak) if peak > 0.0 else math.inf
    notes.append(f"the DC inception voltage is the steady one (void field f_res·V/d = {fr:.4g}·V/d, set by "
                 f"conduction); the {what} transient peaks at {peak * d:.4g}·V/d and gives the transient "
                 "inception voltage, at which only the transient discharges")
    return SupplyInception(supply=sup.kind, quantity="DC voltage", inception_voltage=u_inc, extinction_voltage=u_inc,
                           transient_inception_voltage=u_tr, lag_free_inception_voltage=u_inc,
                           edge_inception_voltage=math.nan, edge_extinction_voltage=math.nan,
                           enhancement=steady * d, relaxation_time=tau, notes=tuple(notes))


def _ripple(sup: DC | PolarityReversal) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    p = sup.pieces(1.0)
    return np.asarray(p.orders, float), np.asarray(p.a_coef, float), np.asarray(p.b_coef, float)


def vlf_inception(scenario: Scenario) -> SupplyInception:
    """PDIV and PDEV under a sine (e.g. VLF 0.1 Hz) or :class:`pdvoid.CosineRectangular` supply with conduction.

    The periodic steady state of the discharge-free void field is built harmonic by harmonic through
    H(j m ω) (for the cosine-rectangular wave from 32768 samples per period, FFT); PDIV = E_inc / (peak void
    field per volt), PDEV = ((E_inc + E_res)/2) / (peak void field per volt), the AC estimate of pdvoid.

    Parameters
    ----------
    scenario : Scenario
        A scenario with a Sine, Periodic or CosineRectangular supply.

    Returns
    -------
    SupplyInception
        Voltages in V rms (sine, Fourier series) or as the level (peak) of the cosine-rectangular wave.

    Raises
    ------
    InputError
        For another supply.

    Notes
    -----
    The PDEV estimate assumes the deposited charge holds from one half period to the next; when τ is not long
    against the period it relaxes in between and the extinction voltage moves towards the inception voltage.

    References
    ----------
    Transfer H(s) as :func:`transfer_magnitude`; PDIV/PDEV as defined in IEC 60270 clause 3 (from memory).
    """
    c, cond, d, notes = _setup(scenario)
    sup = scenario.supply
    if isinstance(sup, (Sine, Periodic)):
        orders, a, b = sup.fourier()
        w = 2.0 * math.pi * sup.frequency
        t = np.arange(_SAMPLES) / _SAMPLES / sup.frequency
        hm = _h(cond, np.asarray(orders, float) * w)
        x = np.zeros_like(t)
        for i, m in enumerate(orders):
            ph = np.angle(hm[i])
            x += abs(hm[i]) * (a[i] * np.sin(m * w * t + ph) + b[i] * np.cos(m * w * t + ph))
        vs = np.zeros_like(t)
        for i, m in enumerate(orders):
            vs += a[i] * np.sin(m * w * t) + b[i] * np.cos(m * w * t)
        per_volt = float(np.max(np.abs(x))) / d / sup.rms
        gain = float(np.max(np.abs(x)) / np.max(np.abs(vs)))
        quantity, kind = "rms voltage", "sine" if isinstance(sup, Sine) else "periodic"
    elif isinstance(sup, CosineRectangular):
        period = 1.0 / sup.frequency
        t = period + np.arange(_SAMPLES) / _SAMPLES * period
        v = sup.pieces(3.0 * period).voltage(t) / abs(sup.voltage)
        spec = np.fft.rfft(v)
        spec *= _h(cond, 2.0 * math.pi * sup.frequency * np.arange(spec.size))
        per_volt = float(np.max(np.abs(np.fft.irfft(spec, n=_SAMPLES)))) / d
        gain = per_volt * d
        quantity, kind = "peak (level) voltage", sup.kind
    else:
        raise InputError(f"vlf_inception needs a Sine, Periodic or CosineRectangular supply; scenario.supply is a "
                         f"{type(sup).__name__}")
    tau = cond.relaxation_time
    if not math.isinf(tau):
        wt = 2.0 * math.pi * sup.frequency * tau
        notes.append(f"conduction: ωτ = {wt:.3g} at the fundamental; the void field per applied field is "
                     f"{gain:.4g} here, between f_cap = {cond.capacitive_enhancement:.4g} and f_res = "
                     f"{cond.resistive_enhancement:.4g}")
        if wt < 10.0:
            notes.append("the deposited charge relaxes with the same τ within a period: the PDEV estimate (charge "
                         "held between half periods) is a lower bound; PDEV lies between it and the PDIV")
    u_inc = c.inception_field / per_volt
    u_ext = 0.5 * (c.inception_field + c.residual_field) / per_volt
    return SupplyInception(supply=kind, quantity=quantity, inception_voltage=u_inc, extinction_voltage=u_ext,
                           transient_inception_voltage=math.nan, lag_free_inception_voltage=u_inc,
                           edge_inception_voltage=math.nan, edge_extinction_voltage=math.nan,
                           enhancement=gain, relaxation_time=tau, notes=tuple(notes))


def repetitive_inception(scenario: Scenario, probability: float = _REPETITION_CRITERION
                         ) -> SupplyInception:
    """RPDIV and RPDEV of the void under a :class:`pdvoid.SquareWave` (square wave or PWM with linear edges).

    - Lag-free RPDIV: the peak-to-peak voltage at which the peak of the periodic discharge-free void field
      (exact over the linear pieces, with conduction) reaches E_inc.
    - RPDIV (returned as ``inception_voltage``): the lowest peak-to-peak voltage at which an impulse of one
      polarity has a discharge with probability >= ``probability``: 1 − exp(−N·t_above) >= p, with N the start-
      electron rate of an uncharged void (the model's volume rate plus cathode emission; no surface emission yet)
      and t_above the time per period during which the void field of that polarity is at or beyond E_inc.
    - RPDEV (``extinction_voltage``), lag-free: once discharging on every edge, the void field after each
      discharge is ±E_res and the next edge swings it by Δx (the field change per edge); discharges go on while
      Δx >= E_inc + E_res. Valid when τ is long against the period.

    Parameters
    ----------
    scenario : Scenario
        A scenario with a SquareWave supply.
    probability : float, optional
        Share of impulses of one polarity with a discharge that counts as repetitive [-], in (0, 1) (default
        0.5, IEC TS 60034-18-41:2014 from memory).

    Returns
    -------
    SupplyInception
        Voltages as "peak-to-peak voltage" [V]; ``edge_*`` the voltage jump of one edge [V] (equal to the
        peak-to-peak voltage for pdvoid's square waves, which have no overshoot).

    Raises
    ------
    InputError
        For another supply or a bad ``probability``.

    References
    ----------
    IEC TS 60034-18-41:2014, Rotating electrical machines - Part 18-41: Partial discharge free electrical
    insulation systems (Type I) used in rotating electrical machines fed from voltage converters (edition 1.0;
    the RPDIV/RPDEV definitions and the five-in-ten criterion from memory). Void field from H(s) as
    :func:`transfer_magnitude`; the statistical lag as the Poisson start-electron supply of the kernels
    (Niemeyer 1995, from memory).
    """
    p = check_range("probability", probability, 0.0, 1.0, low_open=True, high_open=True)
    c, cond, d, notes = _setup(scenario)
    sup = scenario.supply
    if not isinstance(sup, SquareWave):
        raise InputError(f"repetitive_inception needs a SquareWave supply; scenario.supply is a {type(sup).__name__}")
    period = 1.0 / sup.frequency
    v = abs(sup.voltage)
    pp = 2.0 * v if sup.bipolar else v
    pcs = sup.pieces(3.0 * period)
    br, lv, sl = _pieces_arrays(pcs)
    i0 = int(np.searchsorted(br, period, side="left"))
    per = 4
    br, lv, sl = br[i0:i0 + per + 1], lv[i0:i0 + per] / pp, sl[i0:i0 + per] / pp
    fc, fr, tau = cond.capacitive_enhancement, cond.resistive_enhancement, cond.relaxation_time
    lin = _Linear(fc / d, (fr - fc) / d, tau)
    # periodic steady state: z(T) = A z0 + B
    _, bz = _run_peak(lin, br, lv, sl, 0.0)
    z0 = 0.0 if math.isinf(tau) else bz / (-math.expm1(-period / tau))
    peak, _ = _run_peak(lin, br, lv, sl, z0)
    e_inc, e_res = c.inception_field, c.residual_field
    u_lf = float(e_inc / peak)
    # field change of one edge (per peak-to-peak volt): the rising edge is piece 0 (unipolar) or 3 (bipolar)
    k = 0 if not sup.bipolar else 3
    zk = z0
    for j in range(k):
        zk = lin.z_at(zk, lv[j], sl[j], br[j + 1] - br[j])
    length = br[k + 1] - br[k]
    dx = abs(lin.x_at(zk, lv[k], sl[k], length) - lin.x_at(zk, lv[k], sl[k], 0.0))
    u_ext = float((e_inc + e_res) / dx)
    if not math.isinf(tau) and tau < 100.0 * period:
        notes.append(f"τ = {tau:.3g} s is not long against the period: the deposited charge relaxes between edges "
                     "and the lag-free RPDEV estimate (charge held) is a lower bound")
    # statistical RPDIV per polarity
    need = -math.log1p(-p)
    rates = {+1.0: c.volume_electron_rate + cathode_rate(scenario, +1.0),
             -1.0: c.volume_electron_rate + cathode_rate(scenario, -1.0)}
    best = math.inf
    for sign, rate in rates.items():
        if rate <= 0.0:
            continue
        t_need = need / rate

        def short(u: float, sign: float = sign, t_need: float = t_need) -> float:
            return _time_beyond(lin, br, lv, sl, z0, e_inc / u, sign) - t_need

        hi = u_lf * 1e3
        if short(hi) < 0.0:
            continue
        lo = u_lf * (1.0 + 1e-12)
        best = min(best, lo if short(lo) >= 0.0 else float(brentq(short, lo, hi, rtol=1e-12)))
    if math.isinf(best):
        notes.append(f"the start-electron supply ({c.volume_electron_rate:.3g} 1/s) is too small for a discharge "
                     f"on {p:.0%} of the impulses at any voltage up to 1000 times the lag-free RPDIV: the "
                     "statistical lag dominates")
    notes.append("rise-time dependence through conduction and the statistical lag only; the terminal overshoot and "
                 "the voltage distribution along a winding are not modelled")
    return SupplyInception(supply=sup.kind, quantity="peak-to-peak voltage", inception_voltage=best,
                           extinction_voltage=u_ext, transient_inception_voltage=math.nan,
                           lag_free_inception_voltage=u_lf, edge_inception_voltage=best,
                           edge_extinction_voltage=u_ext, enhancement=float(peak * pp / v * d),
                           relaxation_time=tau, notes=tuple(notes))


def supply_inception(scenario: Scenario) -> SupplyInception:
    """Inception and extinction in the quantity of the scenario's supply (dispatches by supply kind).

    DC and polarity reversal: :func:`dc_inception`; sine, Fourier series and cosine-rectangular:
    :func:`vlf_inception`; square wave and PWM: :func:`repetitive_inception`.

    Parameters
    ----------
    scenario : Scenario
        The scenario.

    Returns
    -------
    SupplyInception
        The estimate.

    Raises
    ------
    InputError
        For a supply without an estimate here (a piecewise-linear supply), naming it.
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    sup = scenario.supply
    if isinstance(sup, (DC, PolarityReversal)):
        return dc_inception(scenario)
    if isinstance(sup, (Sine, Periodic, CosineRectangular)):
        return vlf_inception(scenario)
    if isinstance(sup, SquareWave):
        return repetitive_inception(scenario)
    raise InputError(f"no inception estimate for a {type(sup).__name__} supply: its voltage is not a level, a sine "
                     "or an impulse train; simulate it (pdvoid.simulate(..., duration=...)) and read the discharges")
