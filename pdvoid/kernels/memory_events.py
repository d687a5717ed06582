"""Event-driven kernel of the wall-memory model (:mod:`pdvoid.models.memory`).

The void field is x(t) = g·V(t) + x_q(t) [V/m], with x_q the field of the net charge on the two walls along the
field: Q_hv on the wall facing the high-voltage electrode and Q_gnd on the wall facing the ground electrode [C]. A
wall that is a metal electrode holds no charge. x_q = (m_hv·Q_hv − m_gnd·Q_gnd)/c_true with m = 1/2 for each wall
of an insulated void (whose walls carry opposite charge) and m = 1 for the one dielectric wall of a void on an
electrode (the image charge in the metal supplies the rest of the dipole); c_true is the true wall charge per unit
field [C/(V/m)]. The net charges therefore follow from x_q alone. Each dielectric wall also keeps its inventories
of trapped electrons and of positive charge, Qe and Qp >= 0 [C], with Q = Qp − Qe: charge arriving on a wall
neutralises up to r·(its amount) of the opposite inventory there and the rest is trapped (r = 1: a wall holds only
its net charge, so only a net negative wall emits; r = 0: electrons and ions sit in separate traps; r is a
modelling choice of pdvoid, not from a source). The inventories and x_q decay with one time constant tau_q
(surface or bulk conduction).

Start electrons form a Poisson process of rate

    N(t) = N_vol,pol + a·Qe_c(t)·exp(β·sqrt(|x(t)|)),      a = ν0·exp(−Φ/(k_B T))/e,

(plus K(t)·ν_d(|x|)·(1 − η/α) with volume detachment, K the number of negative ions in the void; see below),
where Qe_c is the trapped electron charge of the cathode-side wall of the pending discharge (the ground-side wall
for positive discharges, whose field pushes electrons from that wall into the gas; the high-voltage-side wall for
negative ones), zero when that wall is metal; a metal cathode adds its constant rate to N_vol,pol. A discharge
needs |x| >= x_inc and a start electron. The field falls to pol·E_res with
E_res = e_st·(1 + w·(2U − 1)), U uniform on [0, 1): the streamer stability field with a uniform relative scatter w.
The field drop ΔE = x_before − x_after deposits c_true·|ΔE|: electrons on the high-voltage-side wall and ions on
the ground-side wall for a positive discharge (electrons drift against the field), the reverse for a negative one,
nothing on a metal wall. The apparent charge is c_app·ΔE.

Time is not discretised. As in :mod:`pdvoid.kernels.void_events` the period is cut into pieces where x is
monotone and every threshold crossing is a root found in closed form (pure sine, no decay) or by a bracketed
Newton iteration. The wait for a start electron is inverted in closed form while the wall term is zero, and by
thinning (Lewis & Shedler 1979) otherwise: candidates at a constant rate that bounds N(t) on a sub-window (the
decay factor is largest at its start; |x| is monotone on the window, so the Schottky factor is largest at an end),
each accepted with probability N(t)/bound. Thinning is exact in distribution; no step, no quadrature.

Volume detachment (optional): ion pairs form a Poisson process of rate S (their times drawn one gap at a time and
kept in the state), each leaving a negative ion lost at the rate 1/tau_ion; a discharge sweeps the ions out.
Below inception the count is only brought forward when needed: present ions survive Binomial(K, exp(−Δ/tau_ion)),
an ion formed at b survives with probability exp(−(t − b)/tau_ion). Above inception the count changes at the next
birth and at losses (rate K/tau_ion, drawn only while K > 0); between changes the start electrons are thinned with
the ion term bounded by K·ν_d(max |x|) (ν_d rises with the field, 1 − η/α <= 1). Exact in distribution; while no
ion is present and none is formed, a window costs no extra draw.

The helper functions are copies of those in :mod:`pdvoid.kernels.void_events` (numba's cache does not follow an
edited callee in another module, so every njit function this kernel calls lives here). Random numbers come from
numba's generator as seeded by ``seed_generator``.
"""

from __future__ import annotations

import math

import numpy as np

from pdvoid.kernels.jit import njit_cached

# state vector layout: entries 0..5 as in pdvoid.kernels.void_events (the runner initialises them alike)
S_XQ0 = 0  # field of the wall charges at time S_TQ [V/m]
S_TQ = 1  # reference time of the decaying quantities [s]
S_TLAST = 2  # time of the last discharge [s] (-inf before the first)
S_LASTPOL = 3  # polarity of the last discharge (+1, -1, 0 = none)
S_REMAIN = 4  # remaining exponential hazard of the current wait
S_COUNT = 5  # events so far
S_EHV = 6  # electrons trapped on the high-voltage-side wall at S_TQ, magnitude [C]
S_EGND = 7  # electrons trapped on the ground-side wall at S_TQ, magnitude [C]
S_PHV = 8  # positive charge on the high-voltage-side wall at S_TQ [C]
S_PGND = 9  # positive charge on the ground-side wall at S_TQ [C]
S_NION = 10  # negative ions in the void at S_TION (volume detachment) [-]
S_TION = 11  # reference time of S_NION [s]
S_TBIRTH = 12  # time of the next ion pair formed in the void [s] (0: not drawn yet)
STATE_SIZE = 13

# totals layout as in pdvoid.kernels.void_events
T_COUNT = 0
T_ABS = 1
T_SQ = 2
T_QU = 3
T_LOW = 4
T_HIGH = 5
T_FIRST = 6
TOTALS_SIZE = 8


@njit_cached
def seed_generator(seed: int) -> None:
    """Seed the generator used by :func:`run_cycles` (numba's own; numpy's legacy one without JIT).

    Parameters
    ----------
    seed : int
        Seed in [0, 2**32 - 1] [-].
    """
    np.random.seed(seed)


@njit_cached
def start_wait(state: np.ndarray) -> None:
    """Draw the exponential hazard the next discharge must accumulate (as in :mod:`pdvoid.kernels.void_events`).

    Parameters
    ----------
    state : numpy.ndarray
        One state block (layout ``S_*``); its ``S_REMAIN`` entry is set.
    """
    state[S_REMAIN] = np.random.exponential(1.0)


@njit_cached(inline="always")
def voltage(t: float, omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray) -> float:
    """V(t) = sum_m a_m sin(m w t) + b_m cos(m w t) [V].

    Parameters
    ----------
    t : float
        Time from the positive-going zero crossing [s].
    omega : float
        Angular frequency of the fundamental [rad/s].
    orders : numpy.ndarray
        Harmonic orders m [-].
    a_coef, b_coef : numpy.ndarray
        Sine and cosine amplitudes of each order [V].

    Returns
    -------
    float
        The applied voltage [V].
    """
    if orders.size == 1 and b_coef[0] == 0.0:  # a plain sine: the same value without the zero cosine term
        return 0.0 + a_coef[0] * math.sin(orders[0] * omega * t)
    v = 0.0
    for i in range(orders.size):
        ph = orders[i] * omega * t
        v += a_coef[i] * math.sin(ph) + b_coef[i] * math.cos(ph)
    return v


@njit_cached(inline="always")
def voltage_slope(
    t: float, omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray,
) -> float:
    """dV/dt [V/s].

    Parameters
    ----------
    t : float
        Time from the positive-going zero crossing [s].
    omega : float
        Angular frequency of the fundamental [rad/s].
    orders : numpy.ndarray
        Harmonic orders m [-].
    a_coef, b_coef : numpy.ndarray
        Sine and cosine amplitudes of each order [V].

    Returns
    -------
    float
        dV/dt [V/s].
    """
    if orders.size == 1 and b_coef[0] == 0.0:  # a plain sine: the same value without the zero sine term
        m = orders[0] * omega
        return 0.0 + m * (a_coef[0] * math.cos(m * t))
    v = 0.0
    for i in range(orders.size):
        m = orders[i] * omega
        ph = m * t
        v += m * (a_coef[i] * math.cos(ph) - b_coef[i] * math.sin(ph))
    return v


@njit_cached(inline="always")
def _xq(t: float, xq0: float, tq: float, tau_q: float) -> float:
    if tau_q == math.inf or xq0 == 0.0:
        return xq0
    return xq0 * math.exp(-(t - tq) / tau_q)


@njit_cached(inline="always")
def _x(
    t: float, gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, xq0: float,
    tq: float, tau_q: float,
) -> float:
    return gain * voltage(t, omega, orders, a_coef, b_coef) + _xq(t, xq0, tq, tau_q)


@njit_cached(inline="always")
def _dx(
    t: float, gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, xq0: float,
    tq: float, tau_q: float,
) -> float:
    d = gain * voltage_slope(t, omega, orders, a_coef, b_coef)
    if tau_q != math.inf and xq0 != 0.0:
        d -= _xq(t, xq0, tq, tau_q) / tau_q
    return d


@njit_cached(inline="always")
def _x_dx(
    t: float, gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, xq0: float,
    tq: float, tau_q: float,
) -> tuple[float, float]:
    """(x(t), dx/dt) with one evaluation of the sines, cosines and decay factor; the same floating-point operations
    as :func:`_x` and :func:`_dx`, so bit-identical to them."""
    v = 0.0
    w = 0.0
    for i in range(orders.size):
        m = orders[i] * omega
        ph = m * t
        sn = math.sin(ph)
        cs = math.cos(ph)
        v += a_coef[i] * sn + b_coef[i] * cs
        w += m * (a_coef[i] * cs - b_coef[i] * sn)
    xq = _xq(t, xq0, tq, tau_q)
    d = gain * w
    if tau_q != math.inf and xq0 != 0.0:
        d -= xq / tau_q
    return gain * v + xq, d


@njit_cached(inline="always")
def _dx_ddx(
    t: float, gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, xq0: float,
    tq: float, tau_q: float,
) -> tuple[float, float]:
    """(dx/dt, d²x/dt²) with one evaluation of the sines, cosines and decay factor; the same floating-point
    operations as :func:`_dx` and :func:`_ddx`, so bit-identical to them."""
    w = 0.0
    dd = 0.0
    for i in range(orders.size):
        m = orders[i] * omega
        ph = m * t
        sn = math.sin(ph)
        cs = math.cos(ph)
        w += m * (a_coef[i] * cs - b_coef[i] * sn)
        dd -= m * m * (a_coef[i] * sn + b_coef[i] * cs)
    d = gain * w
    dd *= gain
    if tau_q != math.inf and xq0 != 0.0:
        xq = _xq(t, xq0, tq, tau_q)
        d -= xq / tau_q
        dd += xq / (tau_q * tau_q)
    return d, dd


@njit_cached
def _root_x(
    target: float, t0: float, t1: float, gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray,
    b_coef: np.ndarray, xq0: float, tq: float, tau_q: float,
) -> float:
    """Root of x(t) = target on [t0, t1] where x is monotone and brackets target: Newton with bisection guard."""
    f0 = _x(t0, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q) - target
    f1 = _x(t1, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q) - target
    if f0 == 0.0:
        return t0
    if f1 == 0.0:
        return t1
    t = t0 + (t1 - t0) * f0 / (f0 - f1)  # regula falsi start
    return _newton_x(target, t0, t1, f0, t, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)


@njit_cached
def _root_x_sine(
    target: float, t0: float, t1: float, f0: float, f1: float, amp_g: float, cycle_t: float, seg: int,
    gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, xq0: float, tq: float,
    tau_q: float, xq_t0: float,
) -> float:
    """:func:`_root_x` for a pure sine with decaying x_q, given f0 = x(t0) − target, f1 = x(t1) − target and
    xq_t0 = x_q(t0):
    Newton started from the closed-form root of amp_g·sin(w t) + x_q(t*) = target with x_q frozen at the root
    t* of the same equation with x_q(t0) (x_q moves little over the piece)."""
    if f0 == 0.0:
        return t0
    if f1 == 0.0:
        return t1
    g0 = _root_sine(target, t0, t1, amp_g, omega, cycle_t, seg, xq_t0)
    t = _root_sine(target, t0, t1, amp_g, omega, cycle_t, seg, _xq(g0, xq0, tq, tau_q))
    return _newton_x(target, t0, t1, f0, t, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)


@njit_cached
def _newton_x(
    target: float, lo: float, hi: float, flo: float, t: float, gain: float, omega: float, orders: np.ndarray,
    a_coef: np.ndarray, b_coef: np.ndarray, xq0: float, tq: float, tau_q: float,
) -> float:
    """Newton's method for x(t) = target from t with the bracket [lo, hi] (x(lo) − target = flo) as guard."""
    for _ in range(100):
        if not (lo < t < hi):
            t = 0.5 * (lo + hi)
        xv, d = _x_dx(t, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
        f = xv - target
        if f == 0.0:
            return t
        if (f > 0.0) == (flo > 0.0):
            lo, flo = t, f
        else:
            hi = t
        if hi - lo <= 4e-16 * max(abs(hi), 1e-300) + 1e-300:
            return 0.5 * (lo + hi)
        tn = t - f / d if d != 0.0 else 0.5 * (lo + hi)
        if abs(tn - t) <= 2e-16 * abs(t) + 1e-300:
            return tn if lo <= tn <= hi else t
        t = tn
    return 0.5 * (lo + hi)


@njit_cached(inline="always")
def _root_sine(
    target: float, t0: float, t1: float, amp_g: float, omega: float, cycle_t: float, seg: int, xq0: float,
) -> float:
    """Closed-form root of g·A·sin(w t) + xq0 = target on the piece `seg` (0 rising, 1 falling, 2 rising)."""
    s = (target - xq0) / amp_g
    if s > 1.0:
        s = 1.0
    elif s < -1.0:
        s = -1.0
    a = math.asin(s)
    if seg == 0:
        ph = a
    elif seg == 1:
        ph = math.pi - a
    else:
        ph = 2.0 * math.pi + a
    t = cycle_t + ph / omega
    if t < t0:
        t = t0
    elif t > t1:
        t = t1
    return t


@njit_cached(inline="always")
def _ddx(
    t: float, gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, xq0: float,
    tq: float, tau_q: float,
) -> float:
    """d²x/dt² [V/(m s²)]."""
    d = 0.0
    for i in range(orders.size):
        m = orders[i] * omega
        ph = m * t
        d -= m * m * (a_coef[i] * math.sin(ph) + b_coef[i] * math.cos(ph))
    d *= gain
    if tau_q != math.inf and xq0 != 0.0:
        d += _xq(t, xq0, tq, tau_q) / (tau_q * tau_q)
    return d


@njit_cached
def _monotone_end(
    t: float, t_end: float, gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray,
    xq0: float, tq: float, tau_q: float,
) -> float:
    """With charge decay, x may turn inside a V-monotone piece: the first sign change of dx/dt after t (scanned on
    16 sub-intervals as in :mod:`pdvoid.kernels.void_events`, then located by Newton's method on dx/dt with a
    bisection guard, to machine precision), or t_end."""
    n = 16
    h = (t_end - t) / n
    d0 = _dx(t, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
    a = t
    for i in range(1, n + 1):
        b = t + h * i if i < n else t_end
        d1 = _dx(b, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
        if (d1 > 0.0) != (d0 > 0.0) and d1 != 0.0:
            lo, hi = a, b
            s = 0.5 * (lo + hi)
            for _ in range(200):
                dm, dd = _dx_ddx(s, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
                if dm == 0.0:
                    return s
                if (dm > 0.0) == (d0 > 0.0):
                    lo = s
                else:
                    hi = s
                if hi - lo <= 4e-16 * abs(hi):
                    break
                sn = s - dm / dd if dd != 0.0 else 0.5 * (lo + hi)
                if abs(sn - s) <= 1e-15 * abs(s):
                    return hi if hi - s <= 4e-15 * abs(s) else s  # converged to machine precision
                if not (lo < sn < hi):
                    sn = 0.5 * (lo + hi)
                s = sn
            return hi
        a = b
    return t_end


@njit_cached
def _dx_root(
    lo: float, hi: float, d_lo: float, d_hi: float, start: float, gain: float, omega: float, orders: np.ndarray,
    a_coef: np.ndarray, b_coef: np.ndarray, xq0: float, tq: float, tau_q: float,
) -> float:
    """The sign change of dx/dt in [lo, hi] (dx/dt = d_lo at lo and d_hi of the other sign at hi, monotone
    between): Newton's method on dx/dt from ``start`` (from the secant point when start is outside the bracket),
    with a bisection guard, to machine precision; hi when it ends on the bracket."""
    pos = d_lo > 0.0
    s = start
    if not (lo < s < hi):
        s = lo + (hi - lo) * d_lo / (d_lo - d_hi)
    if not (lo < s < hi):
        s = 0.5 * (lo + hi)
    for _ in range(200):
        dm, dd = _dx_ddx(s, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
        if dm == 0.0:
            return s
        if (dm > 0.0) == pos:
            lo = s
        else:
            hi = s
        if hi - lo <= 4e-16 * abs(hi):
            break
        sn = s - dm / dd if dd != 0.0 else 0.5 * (lo + hi)
        if abs(sn - s) <= 1e-15 * abs(s):
            return hi if hi - s <= 4e-15 * abs(s) else s  # converged to machine precision
        if not (lo < sn < hi):
            sn = 0.5 * (lo + hi)
        s = sn
    return hi


@njit_cached
def _monotone_end_sine(
    t: float, t_end: float, amp_g: float, cycle_t: float, gain: float, omega: float, orders: np.ndarray,
    a_coef: np.ndarray, b_coef: np.ndarray, xq0: float, tq: float, tau_q: float,
) -> float:
    """:func:`_monotone_end` for a pure sine g·V = amp_g·sin(w t), without a scan.

    With X = |x_q(t)| (the largest on [t, t_end], x_q decays) and W = |amp_g|·w, dx/dt keeps the sign of g·V'
    wherever |cos(w s)| > c = X/(tau_q·W): outside the zones of phase half-width asin(c) about the extremes of V
    (phases pi/2 and 3pi/2 of the cycle). Inside a zone |g·V''| >= W·w·sqrt(1 − c²); when that exceeds
    |x_q''| <= X/tau_q², x is strictly convex or concave there and dx/dt changes sign at most once. So dx/dt is
    sampled at the zone edges only and a sign change is located by :func:`_dx_root` in its zone. When the bounds
    do not hold (c >= 1/2 or a weak curvature) the scan of :func:`_monotone_end` is used. Returns the same turning
    point as the scan wherever the scan finds one, and never misses two sign changes in one sub-interval.
    """
    big_w = abs(amp_g) * omega
    big_x = abs(_xq(t, xq0, tq, tau_q))
    c = big_x / (tau_q * big_w)
    if c >= 0.5 or big_w * omega * math.sqrt(1.0 - c * c) <= 2.0 * big_x / (tau_q * tau_q):
        return _monotone_end(t, t_end, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
    half = math.asin(c) / omega
    quarter = 0.5 * math.pi / omega
    a = t
    d0 = _dx(t, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
    # sample points: the zone edges inside (t, t_end), then t_end; outside the zones dx/dt cannot change sign
    for k in range(5):
        if k == 4:
            b = t_end
        else:
            b = cycle_t + quarter * (1 + 2 * (k // 2)) + (half if k % 2 else -half)
            if b <= t or b >= t_end:
                continue
        d1 = _dx(b, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
        if (d1 > 0.0) != (d0 > 0.0) and d1 != 0.0:
            start = _turn_start(a, b, amp_g, cycle_t, omega, xq0, tq, tau_q)
            return _dx_root(a, b, d0, d1, start, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
        a = b
        d0 = d1
    return t_end


@njit_cached(inline="always")
def _turn_start(
    a: float, b: float, amp_g: float, cycle_t: float, omega: float, xq0: float, tq: float, tau_q: float,
) -> float:
    """Newton start for the turning point of x in the zone [a, b] of a pure sine: amp_g·w·cos(w(e + u)) =
    x_q(e)/tau_q about the extremum e of the zone, in closed form with one fixed-point step (-1.0 when none)."""
    quarter = 0.5 * math.pi / omega
    mid = 0.5 * (a + b)
    e = cycle_t + quarter
    sgn = 1.0
    if abs(mid - (e + 2.0 * quarter)) < abs(mid - e):
        e += 2.0 * quarter
        sgn = -1.0
    r = _xq(e, xq0, tq, tau_q) / (tau_q * amp_g * omega)
    start = -1.0
    if -1.0 < r < 1.0:
        start = e - sgn * math.asin(r) / omega
        r = _xq(start, xq0, tq, tau_q) / (tau_q * amp_g * omega)  # one fixed-point step
        if -1.0 < r < 1.0:
            start = e - sgn * math.asin(r) / omega
    return start


@njit_cached
def _piece_end_sine(
    t: float, t_end: float, amp_g: float, cycle_t: float, gain: float, omega: float, orders: np.ndarray,
    a_coef: np.ndarray, b_coef: np.ndarray, xq0: float, tq: float, tau_q: float, x_inc: float, gva: float,
    xqa: float,
) -> float:
    """The end of the next piece from t on which x has no threshold crossing it cannot find as a monotone piece
    (pure sine with decaying x_q; V monotone on [t, t_end]; gva = g·V(t), xqa = x_q(t)).

    With the zones of :func:`_monotone_end_sine` (dx/dt keeps the sign of g·V' outside them, x is strictly convex
    or concave inside): outside a zone x is monotone up to the next zone edge, which is returned without any
    evaluation. Inside a zone dx/dt changes sign at most once: without a sign change x is monotone to the zone's
    end; with one, the zone's rest is returned as a piece when |x| < x_inc holds on all of it (bounded by the end
    values of the monotone g·V and x_q), since a piece inside (−x_inc, x_inc) is passed over whatever its shape;
    otherwise the turning point is located as in :func:`_monotone_end_sine`. Falls back to that function when the
    zone bounds do not hold.
    """
    big_w = abs(amp_g) * omega
    big_x = abs(xqa)
    c = big_x / (tau_q * big_w)
    if c >= 0.5 or big_w * omega * math.sqrt(1.0 - c * c) <= 2.0 * big_x / (tau_q * tau_q):
        return _monotone_end(t, t_end, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
    half = math.asin(c) / omega
    quarter = 0.5 * math.pi / omega
    for k in range(2):
        e = cycle_t + quarter * (1 + 2 * k)
        zs = e - half
        ze = e + half
        if t < zs:
            return zs if zs < t_end else t_end
        if t < ze:
            b = ze if ze < t_end else t_end
            d0 = gain * voltage_slope(t, omega, orders, a_coef, b_coef) - xqa / tau_q  # = _dx(t, ...) bit for bit
            d1 = _dx(b, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
            if (d1 > 0.0) == (d0 > 0.0) or d1 == 0.0:
                return b
            gvb = gain * voltage(b, omega, orders, a_coef, b_coef)
            xqb = _xq(b, xq0, tq, tau_q)
            if max(gva, gvb) + max(xqa, xqb) < x_inc and min(gva, gvb) + min(xqa, xqb) > -x_inc:
                return b
            start = _turn_start(t, b, amp_g, cycle_t, omega, xq0, tq, tau_q)
            return _dx_root(t, b, d0, d1, start, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
    return t_end


@njit_cached(inline="always")
def _wall_amplitude(pol: float, state: np.ndarray, emit_coef: float, m_hv: float, m_gnd: float) -> float:
    """a·Qe_c at the reference time S_TQ for the cathode-side wall of a discharge of polarity pol [1/s] (zero when
    that wall is a metal electrode)."""
    if pol > 0.0:
        if m_gnd == 0.0:
            return 0.0
        return emit_coef * state[S_EGND]
    if m_hv == 0.0:
        return 0.0
    return emit_coef * state[S_EHV]


@njit_cached(inline="always")
def detachment_hazard(x_abs: float, n_gas: float) -> float:
    """Start electrons per second per negative ion at the field x_abs: ν_d·(1 − η/α) (air), the same formulas as
    :func:`pdvoid.physics.detachment.detachment_frequency_air` and
    :func:`pdvoid.physics.detachment.avalanche_start_probability` (a copy for the kernel; a test compares them).

    Parameters
    ----------
    x_abs : float
        Field magnitude [V/m], >= 0.
    n_gas : float
        Gas number density [1/m³], > 0.

    Returns
    -------
    float
        The hazard per ion [1/s].
    """
    if x_abs <= 0.0:
        return 0.0
    td = x_abs / n_gas / 1e-21
    nu = n_gas * (0.79 * (1.24e-17 * math.exp(-(179.0 / (8.8 + td)) ** 2))
                  + 0.21 * (6.9e-16 * math.exp(-(198.0 / (5.6 + td)) ** 2)))
    n_cm = n_gas * 1e-6
    xr = (x_abs * 1e-2) / n_cm
    if xr > 1.5e-15:
        alpha = 2.0e-16 * math.exp(-7.248e-15 / xr)
    else:
        alpha = 6.619e-17 * math.exp(-5.593e-15 / xr)
    if xr > 1.05e-15:
        eta2 = 8.889e-5 * xr + 2.567e-19
    else:
        eta2 = max(6.089e-4 * xr - 2.893e-19, 0.0)
    eta = eta2 + n_cm * 4.7778e-59 * xr ** -1.2749
    if alpha <= eta:
        return 0.0
    return nu * (1.0 - eta / alpha)


@njit_cached
def detachment_bound(x_abs: float, n_gas: float) -> float:
    """ν_d at x_abs, an upper bound on :func:`detachment_hazard` for every field up to x_abs (ν_d rises with the
    field and 1 − η/α <= 1) [1/s].

    Parameters
    ----------
    x_abs : float
        Field magnitude [V/m], >= 0.
    n_gas : float
        Gas number density [1/m³], > 0.

    Returns
    -------
    float
        The bound [1/s].
    """
    td = x_abs / n_gas / 1e-21
    return n_gas * (0.79 * (1.24e-17 * math.exp(-(179.0 / (8.8 + td)) ** 2))
                    + 0.21 * (6.9e-16 * math.exp(-(198.0 / (5.6 + td)) ** 2)))


@njit_cached(inline="always")
def emission_rate(
    t: float, pol: float, state: np.ndarray, n_vol: float, emit_coef: float, beta: float, m_hv: float,
    m_gnd: float, gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray,
    tau_q: float, ions: float = 0.0, n_gas: float = 1.0,
) -> float:
    """N(t), the start-electron rate for a discharge of polarity ``pol`` at time ``t`` [1/s] (module docstring).

    Parameters
    ----------
    t : float
        Time [s], not before the state's reference time.
    pol : float
        Polarity of the pending discharge, +1 or -1.
    state : numpy.ndarray
        The void state vector (layout ``S_*``).
    n_vol : float
        Volume (and metal-cathode) rate for this polarity [1/s].
    emit_coef : float
        a = ν0·exp(−Φ/(k_B T))/e [1/(s C)].
    beta : float
        Schottky coefficient β [(V/m)^-1/2].
    m_hv, m_gnd : float
        Field weights of the two walls (0 for a metal wall).
    gain : float
        Void field per applied volt [1/m].
    omega : float
        Angular frequency [rad/s].
    orders : numpy.ndarray
        Harmonic orders [-].
    a_coef, b_coef : numpy.ndarray
        Sine and cosine amplitudes [V].
    tau_q : float
        Decay time of the wall charges [s]; inf for none.
    ions : float, optional
        Negative ions in the void now [-] (0: no detachment term).
    n_gas : float, optional
        Gas number density [1/m³] (for the detachment term).

    Returns
    -------
    float
        The rate [1/s].
    """
    amp = _wall_amplitude(pol, state, emit_coef, m_hv, m_gnd)
    if amp == 0.0 and ions == 0.0:
        return n_vol
    x = _x(t, gain, omega, orders, a_coef, b_coef, state[S_XQ0], state[S_TQ], tau_q)
    rate = n_vol
    if amp != 0.0:
        expo = 0.0
        if tau_q != math.inf:
            expo = -(t - state[S_TQ]) / tau_q
        rate += amp * math.exp(expo + beta * math.sqrt(abs(x)))
    if ions != 0.0:
        rate += ions * detachment_hazard(abs(x), n_gas)
    return rate


@njit_cached
def _thin(
    t0: float, t1: float, x0: float, x1: float, pol: float, state: np.ndarray, n_vol: float, amp: float,
    ions: float, n_gas: float, emit_coef: float, beta: float, m_hv: float, m_gnd: float, gain: float,
    omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, tau_q: float,
) -> float:
    """Thinning (Lewis & Shedler 1979) on [t0, t1], where |x| is monotone (x0, x1 at the ends) and the ion count
    is constant: the first start electron, or -1.0 when none comes before t1."""
    t = t0
    tq = state[S_TQ]
    while t < t1:
        sub_end = t1
        if tau_q != math.inf and t + tau_q < t1:
            sub_end = t + tau_q
        xa = x0 if t == t0 else abs(_x(t, gain, omega, orders, a_coef, b_coef, state[S_XQ0], tq, tau_q))
        if sub_end == t1:
            xb = x1
        else:
            xb = abs(_x(sub_end, gain, omega, orders, a_coef, b_coef, state[S_XQ0], tq, tau_q))
        lam = n_vol
        floor = n_vol
        if amp != 0.0:
            hi = beta * math.sqrt(max(xa, xb))
            lo = beta * math.sqrt(min(xa, xb))
            if tau_q != math.inf:
                hi -= (t - tq) / tau_q
                lo -= (sub_end - tq) / tau_q
            lam += amp * math.exp(hi)
            floor += amp * math.exp(lo)
        if ions != 0.0:
            lam += ions * detachment_bound(max(xa, xb), n_gas)
        if lam <= 0.0:
            t = sub_end
            continue
        while True:
            t += np.random.exponential(1.0) / lam
            if t >= sub_end:
                t = sub_end
                break
            u = np.random.random() * lam
            if u <= floor:
                return t
            if u <= emission_rate(t, pol, state, n_vol, emit_coef, beta, m_hv, m_gnd, gain, omega, orders,
                                  a_coef, b_coef, tau_q, ions, n_gas):
                return t
    return -1.0


@njit_cached
def _next_birth(state: np.ndarray, after: float, ion_source: float) -> float:
    """The next ion pair after ``after``: the births form a Poisson process of rate S, independent of the
    discharges (exponential gaps, drawn one at a time) [s]."""
    if ion_source <= 0.0:
        return math.inf
    t = state[S_TBIRTH]
    if t == 0.0:
        t = after
    return t + np.random.exponential(1.0) / ion_source


@njit_cached
def _ions_to(t: float, state: np.ndarray, ion_source: float, ion_tau: float) -> None:
    """Bring the negative-ion count from its reference time to t (no detachment below inception): each present ion
    survives with probability exp(−Δ/τ) (Binomial), and each ion pair formed meanwhile, at its birth time b, with
    probability exp(−(t − b)/τ); births before the reference time were swept out by a discharge."""
    if state[S_TBIRTH] == 0.0:
        state[S_TBIRTH] = _next_birth(state, state[S_TION], ion_source)
    dt = t - state[S_TION]
    if dt <= 0.0:
        return
    k = state[S_NION]
    if k > 0.0 and ion_tau != math.inf:
        k = float(np.random.binomial(int(k), math.exp(-dt / ion_tau)))
    while state[S_TBIRTH] < t:
        b = state[S_TBIRTH]
        if b >= state[S_TION]:
            if ion_tau == math.inf or np.random.random() < math.exp(-(t - b) / ion_tau):
                k += 1.0
        state[S_TBIRTH] = _next_birth(state, b, ion_source)
    state[S_NION] = k
    state[S_TION] = t


@njit_cached
def _consume(
    t0: float, t1: float, x0: float, x1: float, pol: float, state: np.ndarray, n_vol: float, emit_coef: float,
    beta: float, m_hv: float, m_gnd: float, gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray,
    b_coef: np.ndarray, tau_q: float, detach: bool, ion_source: float, ion_tau: float, n_gas: float,
) -> float:
    """The discharge time in the above-threshold window [t0, t1] (|x| = x0, x1 at its ends), or -1.0 when the
    window ends first. With ``detach`` the negative ions are brought to t0; inside the window their count changes
    at the next birth (the Poisson process of ion pairs) and at losses (rate K/τ, drawn only while K > 0);
    between those changes the start electrons are thinned with the ion term K·ν_d·(1 − η/α) added."""
    amp = _wall_amplitude(pol, state, emit_coef, m_hv, m_gnd)
    if not detach:
        if amp == 0.0:
            # constant rate n_vol: spend the remaining exponential hazard in closed form
            need = state[S_REMAIN]
            h = n_vol * (t1 - t0)
            if h < need:
                state[S_REMAIN] = need - h
                return -1.0
            t = t0 + need / n_vol
            return t if t < t1 else t1
        return _thin(t0, t1, x0, x1, pol, state, n_vol, amp, 0.0, 1.0, emit_coef, beta, m_hv, m_gnd, gain, omega,
                     orders, a_coef, b_coef, tau_q)
    _ions_to(t0, state, ion_source, ion_tau)
    t = t0
    xa = x0
    while t < t1:
        k = state[S_NION]
        end = t1
        born = False
        if state[S_TBIRTH] < end:
            end = state[S_TBIRTH]
            born = True
        if k > 0.0 and ion_tau != math.inf:
            t_loss = t + np.random.exponential(1.0) * ion_tau / k
            if t_loss < end:
                end = t_loss
                born = False
        xb = x1
        if end < t1:
            xb = abs(_x(end, gain, omega, orders, a_coef, b_coef, state[S_XQ0], state[S_TQ], tau_q))
        hit = _thin(t, end, xa, xb, pol, state, n_vol, amp, k, n_gas, emit_coef, beta, m_hv, m_gnd, gain, omega,
                    orders, a_coef, b_coef, tau_q)
        if hit >= 0.0:
            state[S_TION] = hit
            return hit
        if end < t1:
            if born:
                state[S_NION] = k + 1.0
                state[S_TBIRTH] = _next_birth(state, end, ion_source)
            else:
                state[S_NION] = k - 1.0
        t = end
        xa = xb
    state[S_TION] = t1
    return -1.0


@njit_cached
def run_memory_cycles(
    state_all: np.ndarray,
    cycle_start: int,
    cycle_stop: int,
    frequency: float,
    orders: np.ndarray,
    a_coef: np.ndarray,
    b_coef: np.ndarray,
    seg_fracs: np.ndarray,
    pure_sine: bool,
    gain: float,
    x_inc: float,
    res_mean: float,
    res_width: float,
    charge_per_unit: float,
    true_charge_per_field: float,
    m_hv: float,
    m_gnd: float,
    recombination: float,
    lag_free: bool,
    n_vol_pos: float,
    n_vol_neg: float,
    emit_coef: float,
    beta: float,
    tau_q: float,
    detach: bool,
    ion_source: float,
    ion_tau: float,
    n_gas: float,
    n_cells: int,
    store_events: bool,
    out_time: np.ndarray,
    out_charge: np.ndarray,
    out_before: np.ndarray,
    out_after: np.ndarray,
    max_per_cycle: int,
    hist_counts: np.ndarray,
    charge_edges: np.ndarray,
    totals: np.ndarray,
) -> tuple[int, int]:
    """Advance the void over AC cycles [cycle_start, cycle_stop) (same contract as
    :func:`pdvoid.kernels.void_events.run_cycles`).

    Parameters
    ----------
    state_all : numpy.ndarray
        The state vectors of the void's discharge spots, one after the other (layout ``S_*`` each, ``n_cells``
        of them), updated in place.
    cycle_start, cycle_stop : int
        The cycles to run [-].
    frequency : float
        Supply frequency [Hz].
    orders : numpy.ndarray
        Harmonic orders [-].
    a_coef, b_coef : numpy.ndarray
        Sine and cosine amplitudes [V].
    seg_fracs : numpy.ndarray
        Breakpoints of the monotone pieces of V, fractions of the period [-].
    pure_sine : bool
        True for a plain sine.
    gain : float
        Void field per applied volt [1/m].
    x_inc : float
        Inception field [V/m].
    res_mean : float
        Mean residual field, the streamer stability field [V/m].
    res_width : float
        Relative half-width w of the uniform residual-field scatter [-], in [0, 1].
    charge_per_unit : float
        Apparent charge per unit field drop [C/(V/m)].
    true_charge_per_field : float
        Charge deposited on each dielectric wall per unit field drop, c_true [C/(V/m)].
    m_hv, m_gnd : float
        Field weights of the high-voltage-side and ground-side walls (0 for a metal wall).
    recombination : float
        Fraction r of the ions landing on a wall that neutralise electrons trapped there [-], in [0, 1].
    lag_free : bool
        True to discharge the instant |x| reaches x_inc.
    n_vol_pos, n_vol_neg : float
        Volume (and metal-cathode) start-electron rate for positive and negative discharges [1/s].
    emit_coef : float
        a = ν0·exp(−Φ/(k_B T))/e [1/(s C)].
    beta : float
        Schottky coefficient β [(V/m)^-1/2].
    tau_q : float
        Decay time of the wall charges [s]; inf for none.
    detach : bool
        True for start electrons detached from negative ions in the void gas (air).
    ion_source : float
        Negative ions formed per second in the void, S [1/s].
    ion_tau : float
        Loss time of the negative ions, τ_ion [s]; inf for none.
    n_gas : float
        Gas number density [1/m³].
    n_cells : int
        Number of discharge spots, each an independent copy of the void with its share of the charge and supply
        (1: the whole void discharges); each cycle is run for every spot in turn, so the random stream does not
        depend on how the cycles are split into calls. Events of one call are in spot order within a cycle.
    store_events : bool
        True to write events to the ``out_*`` buffers.
    out_time, out_charge, out_before, out_after : numpy.ndarray
        Event buffers: time [s], apparent charge [C], void field before and after [V/m].
    max_per_cycle : int
        Upper bound on events in one cycle [-].
    hist_counts : numpy.ndarray
        Phase x charge histogram, int64, updated in place; zero rows for none.
    charge_edges : numpy.ndarray
        Charge bin edges of the histogram [C].
    totals : numpy.ndarray
        Running sums (layout ``T_*``), updated in place.

    Returns
    -------
    tuple of int
        (events written, next cycle to run).
    """
    period = 1.0 / frequency
    omega = 2.0 * math.pi * frequency
    n_seg = seg_fracs.size - 1
    decay = tau_q != math.inf
    amp_g = gain * a_coef[0] if pure_sine else 0.0
    capacity = out_time.size
    n_written = 0
    phase_bins = hist_counts.shape[0]
    n_qbins = charge_edges.size - 1
    dep_hv = 1.0 if m_hv > 0.0 else 0.0
    dep_gnd = 1.0 if m_gnd > 0.0 else 0.0
    v_seg = np.empty(n_seg + 1)
    for k in range(n_seg + 1):
        v_seg[k] = voltage(seg_fracs[k] * period, omega, orders, a_coef, b_coef)
    gv_max = gain * v_seg.max()
    gv_min = gain * v_seg.min()
    cycle = cycle_start
    while cycle < cycle_stop:
        if store_events and capacity - n_written < max_per_cycle:
            break
        cycle_t = cycle * period
        for cell in range(n_cells):
            state = state_all[cell * STATE_SIZE:(cell + 1) * STATE_SIZE]
            if not decay and state[S_XQ0] + gv_max < x_inc and state[S_XQ0] + gv_min > -x_inc:
                continue
            c_t = -1.0  # cached g·V and x_q at the time c_t, and x_q at c_tb (valid until the next discharge)
            c_gv = 0.0
            c_xq = 0.0
            c_tb = -1.0
            c_xqb = 0.0
            for seg in range(n_seg):
                ta = cycle_t + seg_fracs[seg] * period
                tb = cycle_t + seg_fracs[seg + 1] * period
                t = ta
                xt = gain * v_seg[seg] + state[S_XQ0]
                leaving = False
                while t < tb:
                    piece_end = tb
                    xq0 = state[S_XQ0]
                    tq = state[S_TQ]
                    xqa = xq0
                    if decay:
                        # exact skip: on [t, tb] V is monotone and x_q decays monotonically, so x stays between the
                        # sums of their end values; a piece inside (-x_inc, x_inc) holds no threshold crossing
                        if t == c_t:
                            gva = c_gv
                            xqa = c_xq
                        else:
                            gva = gain * voltage(t, omega, orders, a_coef, b_coef)
                            xqa = _xq(t, xq0, tq, tau_q)
                        gvb = gain * v_seg[seg + 1]
                        if tb == c_tb:
                            xqb = c_xqb
                        else:
                            xqb = _xq(tb, xq0, tq, tau_q)
                            c_tb = tb
                            c_xqb = xqb
                        if max(gva, gvb) + max(xqa, xqb) < x_inc and min(gva, gvb) + min(xqa, xqb) > -x_inc:
                            break
                        # g·V and the decaying x_q moving the same way: x is monotone on the whole piece
                        if (gvb - gva > 0.0) == (xqb - xqa > 0.0) or xqb == xqa:
                            piece_end = tb
                        else:
                            if pure_sine:
                                piece_end = _piece_end_sine(t, tb, amp_g, cycle_t, gain, omega, orders, a_coef,
                                                            b_coef, xq0, tq, tau_q, x_inc, gva, xqa)
                            else:
                                piece_end = _monotone_end(t, tb, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
                        xt = gva + xqa  # = _x(t, ...) bit for bit
                        c_t = piece_end
                        c_gv = gain * voltage(piece_end, omega, orders, a_coef, b_coef)
                        c_xq = xqb if piece_end == tb else _xq(piece_end, xq0, tq, tau_q)
                        xe = c_gv + c_xq
                        rising = xe >= xt
                    else:
                        xe = gain * v_seg[seg + 1] + xq0
                        rising = v_seg[seg + 1] >= v_seg[seg]
                        if gain < 0.0:
                            rising = not rising
                    inside = False
                    if not leaving and (xt >= x_inc or xt <= -x_inc):
                        pol = 1.0 if xt > 0.0 else -1.0
                        if (pol > 0.0) == rising or pol * xe >= x_inc:
                            t_out = piece_end
                        elif pure_sine and not decay:
                            t_out = _root_sine(pol * x_inc, t, piece_end, amp_g, omega, cycle_t, seg, xq0)
                        elif pure_sine:
                            t_out = _root_x_sine(pol * x_inc, t, piece_end, xt - pol * x_inc, xe - pol * x_inc, amp_g,
                                                 cycle_t, seg, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q,
                                                 xqa)
                        else:
                            t_out = _root_x(pol * x_inc, t, piece_end, gain, omega, orders, a_coef, b_coef,
                                            xq0, tq, tau_q)
                        if t_out > t:
                            inside = True
                            t_in = t
                            x_in = abs(xt)
                            x_out = abs(xe) if t_out == piece_end else x_inc
                    leaving = False
                    if not inside:
                        pol = 1.0 if rising else -1.0
                        if pol * xe < x_inc:
                            if not decay:
                                break
                            t = piece_end
                            continue
                        if pure_sine and not decay:
                            t_in = _root_sine(pol * x_inc, t, piece_end, amp_g, omega, cycle_t, seg, xq0)
                        elif pure_sine:
                            t_in = _root_x_sine(pol * x_inc, t, piece_end, xt - pol * x_inc, xe - pol * x_inc, amp_g,
                                                 cycle_t, seg, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q,
                                                 xqa)
                        else:
                            t_in = _root_x(pol * x_inc, t, piece_end, gain, omega, orders, a_coef, b_coef,
                                           xq0, tq, tau_q)
                        t_out = piece_end
                        x_in = x_inc
                        x_out = abs(xe)
                    if lag_free:
                        t_d = t_in
                    else:
                        n_vol = n_vol_pos if pol > 0.0 else n_vol_neg
                        t_d = _consume(t_in, t_out, x_in, x_out, pol, state, n_vol, emit_coef, beta, m_hv, m_gnd,
                                       gain, omega, orders, a_coef, b_coef, tau_q, detach, ion_source, ion_tau, n_gas)
                        if t_d < 0.0:
                            if t_out >= piece_end:
                                t = piece_end
                                if not decay:
                                    break
                                continue
                            t = t_out
                            xt = pol * x_inc
                            leaving = True
                            continue
                    # discharge at t_d
                    v_d = voltage(t_d, omega, orders, a_coef, b_coef)
                    shrink = 1.0
                    if decay:
                        shrink = math.exp(-(t_d - tq) / tau_q)
                    # = gain·v_d + _xq(t_d, ...) bit for bit, with the decay factor computed once
                    x_before = gain * v_d + (xq0 * shrink if decay and xq0 != 0.0 else xq0)
                    if lag_free and not decay:
                        x_before = pol * x_inc if abs(x_before) < x_inc else x_before
                    e_res = res_mean
                    if res_width > 0.0:
                        e_res = res_mean * (1.0 + res_width * (2.0 * np.random.random() - 1.0))
                    x_after = pol * e_res
                    dx = x_before - x_after
                    q = charge_per_unit * dx
                    for k in range(S_EHV, S_PGND + 1):
                        state[k] *= shrink
                    dq = true_charge_per_field * abs(dx)
                    # electrons go to the high-voltage side in a positive discharge, ions to the ground side (the
                    # reverse in a negative one); arriving charge neutralises up to r·dq of the opposite inventory
                    e_wall, p_wall = (S_EHV, S_PHV) if pol > 0.0 else (S_EGND, S_PGND)
                    if (dep_hv if pol > 0.0 else dep_gnd) > 0.0:
                        n_rec = min(state[p_wall], recombination * dq)
                        state[p_wall] -= n_rec
                        state[e_wall] += dq - n_rec
                    e_wall, p_wall = (S_EGND, S_PGND) if pol > 0.0 else (S_EHV, S_PHV)
                    if (dep_gnd if pol > 0.0 else dep_hv) > 0.0:
                        n_rec = min(state[e_wall], recombination * dq)
                        state[e_wall] -= n_rec
                        state[p_wall] += dq - n_rec
                    if detach:
                        # the discharge sweeps the void's negative ions; a new population builds up from t_d
                        state[S_NION] = 0.0
                        state[S_TION] = t_d
                    state[S_XQ0] = x_after - gain * v_d
                    state[S_TQ] = t_d
                    # the state changed: g·V(t_d) is known, x_q(t_d) is the new S_XQ0 (decay factor exp(0) = 1)
                    c_t = t_d
                    c_gv = gain * v_d
                    c_xq = state[S_XQ0]
                    c_tb = -1.0
                    state[S_TLAST] = t_d
                    state[S_LASTPOL] = pol
                    state[S_COUNT] += 1.0
                    if not lag_free:
                        state[S_REMAIN] = np.random.exponential(1.0)
                    if totals[T_COUNT] == 0.0 or t_d < totals[T_FIRST]:
                        totals[T_FIRST] = t_d
                    totals[T_COUNT] += 1.0
                    totals[T_ABS] += abs(q)
                    totals[T_SQ] += q * q
                    totals[T_QU] += q * v_d
                    if phase_bins > 0:
                        frac = t_d * frequency - cycle
                        ib = int(frac * phase_bins)
                        if ib >= phase_bins:
                            ib = phase_bins - 1
                        elif ib < 0:
                            ib = 0
                        if q < charge_edges[0]:
                            totals[T_LOW] += 1.0
                        elif q >= charge_edges[n_qbins]:
                            totals[T_HIGH] += 1.0
                        else:
                            jb = np.searchsorted(charge_edges, q, side="right") - 1
                            hist_counts[ib, jb] += 1
                    if store_events:
                        if n_written >= capacity:
                            return -1, cycle
                        out_time[n_written] = t_d
                        out_charge[n_written] = q
                        out_before[n_written] = x_before
                        out_after[n_written] = x_after
                        n_written += 1
                    t = t_d
                    xt = x_after
        cycle += 1
    return n_written, cycle
