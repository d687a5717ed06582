"""Event-driven kernel shared by both void models.

Both models reduce to one scalar "void quantity" x(t) = g·V(t) + x_q(t):

* field model: x is the void field [V/m], g = f/d, x_q the field of the deposited charge;
* network model: x is the void voltage [V], g = k = C_b/(C_b + C_c), x_q the voltage of the deposited charge.

A discharge can start only while |x| >= x_inc and, unless lag-free, only when a start electron appears. Start
electrons form a Poisson process of rate N(t) = N_vol + N_surf(t) with N_surf(t) = N_s·exp(-(t - t_last)/tau_s)
(N_s = n_same when the pending discharge repeats the last polarity, n_rev when it reverses; zero before the
first discharge), optionally times exp(|x|/x_inc). N_vol may differ by polarity (n_vol_pos, n_vol_neg): a void
bounded by an electrode receives extra start electrons when the metal wall is its cathode. At a discharge x falls
to sign(x)·x_res; the apparent charge is c·(x_before - x_after). The deposited quantity x_q may decay with time
constant tau_q.

Time is not discretised. The period is cut at the extrema of V into pieces where V is monotone; with charge
decay the pieces are cut again where dx/dt changes sign. On a monotone piece every threshold crossing is one root,
found in closed form for a pure sine without decay and otherwise by a bracketed Newton/bisection iteration to
machine precision. Each wait draws one exponential variate E and the discharge happens where the cumulative hazard
over the above-threshold windows reaches E (closed form or monotone Newton). With the field-assisted factor the
hazard has no closed form and the kernel uses thinning against a local bound of the rate (Lewis & Shedler 1979),
which is exact in distribution and has no step or quadrature error.

Random numbers come from numba's generator seeded by ``seed_generator`` (numpy's legacy stream when the JIT is
disabled, which gives identical draws). All functions that call each other live in this one module so numba's
cache never mixes an edited callee with a stale caller.
"""

from __future__ import annotations

import math

import numpy as np

from pdvoid.kernels.jit import njit_cached

# state vector layout (float64 array of length STATE_SIZE)
S_XQ0 = 0  # deposited quantity at time S_TQ
S_TQ = 1  # reference time of S_XQ0 [s]
S_TLAST = 2  # time of the last discharge [s] (-inf before the first)
S_LASTPOL = 3  # polarity of the last discharge (+1, -1, 0 = none)
S_REMAIN = 4  # remaining exponential hazard of the current wait
S_COUNT = 5  # events so far (all, including histogram mode)
STATE_SIZE = 8

# totals vector layout (histogram mode and always): count, sum|q|, sum q^2, sum q*u, below edges, above edges,
# time of the first discharge [s] (the caller initialises it to NaN; written when the count is still zero)
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
    """Draw the exponential hazard the next discharge must accumulate.

    Parameters
    ----------
    state : numpy.ndarray
        The void state vector (layout ``S_*`` above); its ``S_REMAIN`` entry is set.
    """
    state[S_REMAIN] = np.random.exponential(1.0)


@njit_cached
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
    v = 0.0
    for i in range(orders.size):
        ph = orders[i] * omega * t
        v += a_coef[i] * math.sin(ph) + b_coef[i] * math.cos(ph)
    return v


@njit_cached
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
    v = 0.0
    for i in range(orders.size):
        m = orders[i] * omega
        ph = m * t
        v += m * (a_coef[i] * math.cos(ph) - b_coef[i] * math.sin(ph))
    return v


@njit_cached
def _xq(t: float, xq0: float, tq: float, tau_q: float) -> float:
    if tau_q == math.inf or xq0 == 0.0:
        return xq0
    return xq0 * math.exp(-(t - tq) / tau_q)


@njit_cached
def _x(
    t: float, gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, xq0: float,
    tq: float, tau_q: float,
) -> float:
    return gain * voltage(t, omega, orders, a_coef, b_coef) + _xq(t, xq0, tq, tau_q)


@njit_cached
def _dx(
    t: float, gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, xq0: float,
    tq: float, tau_q: float,
) -> float:
    d = gain * voltage_slope(t, omega, orders, a_coef, b_coef)
    if tau_q != math.inf and xq0 != 0.0:
        d -= _xq(t, xq0, tq, tau_q) / tau_q
    return d


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
    lo, hi = t0, t1
    flo = f0
    t = t0 + (t1 - t0) * f0 / (f0 - f1)  # regula falsi start
    for _ in range(100):
        if not (lo < t < hi):
            t = 0.5 * (lo + hi)
        f = _x(t, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q) - target
        if f == 0.0:
            return t
        if (f > 0.0) == (flo > 0.0):
            lo, flo = t, f
        else:
            hi = t
        if hi - lo <= 4e-16 * max(abs(hi), 1e-300) + 1e-300:
            return 0.5 * (lo + hi)
        d = _dx(t, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
        tn = t - f / d if d != 0.0 else 0.5 * (lo + hi)
        if abs(tn - t) <= 2e-16 * abs(t) + 1e-300:
            return tn if lo <= tn <= hi else t
        t = tn
    return 0.5 * (lo + hi)


@njit_cached
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


@njit_cached
def _surface_level(pol: float, last_pol: float, n_same: float, n_rev: float) -> float:
    if last_pol == 0.0:
        return 0.0
    if pol == last_pol:
        return n_same
    return n_rev


@njit_cached
def _rate(
    t: float, pol: float, state: np.ndarray, n_vol: float, n_same: float, n_rev: float, tau_s: float,
    field_assisted: bool, x_inc: float, gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray,
    b_coef: np.ndarray, tau_q: float,
) -> float:
    ns = _surface_level(pol, state[S_LASTPOL], n_same, n_rev)
    r = n_vol
    if ns > 0.0:
        expo = 0.0
        if tau_s != math.inf:
            expo = -(t - state[S_TLAST]) / tau_s
        if field_assisted:
            x = _x(t, gain, omega, orders, a_coef, b_coef, state[S_XQ0], state[S_TQ], tau_q)
            expo += abs(x) / x_inc
        r += ns * math.exp(expo)
    return r


@njit_cached
def _invert_closed(
    t0: float, t1: float, need: float, ns: float, n_vol: float, tau_s: float, t_last: float,
) -> tuple[float, float]:
    """Spend hazard `need` of the rate n_vol + ns·exp(-(t - t_last)/tau_s) from t0 on.

    Returns (t, spent): t in [t0, t1] where the hazard reaches `need`, or (t1, hazard of the whole window) when
    it does not. With u = (t - t0)/tau_s the hazard is a·u + c·(1 - exp(-u)), a = n_vol·tau_s,
    c = ns·tau_s·exp(-(t0 - t_last)/tau_s): increasing and concave, so Newton from u = 0 climbs monotonically
    to the root."""
    if ns == 0.0 or tau_s == math.inf:
        r = n_vol + ns
        h = r * (t1 - t0)
        if h < need:
            return t1, h
        return t0 + need / r, need
    a = n_vol * tau_s
    c = ns * tau_s * math.exp(-(t0 - t_last) / tau_s)
    u1 = (t1 - t0) / tau_s
    h1 = a * u1 + c * (1.0 - math.exp(-u1))
    if h1 < need:
        return t1, h1
    if a == 0.0:
        u = -math.log(1.0 - need / c)
    else:
        u = need / (a + c)
        for _ in range(100):
            e = math.exp(-u)
            du = (need - a * u - c * (1.0 - e)) / (a + c * e)
            u += du
            if du <= 1e-15 * u:
                break
    t = t0 + u * tau_s
    return (t if t < t1 else t1), need


@njit_cached
def _consume_window(
    t0: float, t1: float, x0: float, x1: float, pol: float, state: np.ndarray, n_vol: float, n_same: float,
    n_rev: float, tau_s: float, field_assisted: bool, x_inc: float, gain: float, omega: float, orders: np.ndarray,
    a_coef: np.ndarray, b_coef: np.ndarray, tau_q: float,
) -> float:
    """Spend the remaining hazard over the above-threshold window [t0, t1].

    x0, x1 are |x| at t0 and t1. Returns the discharge time, or -1.0 when the window ends first (the hazard
    spent is subtracted from state[S_REMAIN])."""
    need = state[S_REMAIN]
    ns = _surface_level(pol, state[S_LASTPOL], n_same, n_rev)
    if not field_assisted or ns == 0.0:
        t, spent = _invert_closed(t0, t1, need, ns, n_vol, tau_s, state[S_TLAST])
        if spent < need:
            state[S_REMAIN] = need - spent
            return -1.0
        return t
    # Field-assisted emission has no closed-form hazard: thinning (Lewis & Shedler 1979), exact in distribution.
    # Candidates come at a constant rate lam that bounds N(t) on a sub-window no longer than tau_s (the decay
    # factor is largest at the sub-window start; |x| is monotone on the window, so exp(|x|/x_inc) is largest at
    # an end); a candidate at t is accepted with probability N(t)/lam. A lower bound of N on the sub-window
    # accepts most candidates without evaluating N (a squeeze; the same draws, the same answer).
    t = t0
    t_last = state[S_TLAST]
    while t < t1:
        sub_end = t1
        if tau_s != math.inf and t + tau_s < t1:
            sub_end = t + tau_s
        xa = x0 if t == t0 else abs(_x(t, gain, omega, orders, a_coef, b_coef, state[S_XQ0], state[S_TQ], tau_q))
        if sub_end == t1:
            xb = x1
        else:
            xb = abs(_x(sub_end, gain, omega, orders, a_coef, b_coef, state[S_XQ0], state[S_TQ], tau_q))
        hi = max(xa, xb) / x_inc
        lo = min(xa, xb) / x_inc
        if tau_s != math.inf:
            hi -= (t - t_last) / tau_s
            lo -= (sub_end - t_last) / tau_s
        lam = n_vol + ns * math.exp(hi)
        floor = n_vol + ns * math.exp(lo)
        while True:
            t += np.random.exponential(1.0) / lam
            if t >= sub_end:
                t = sub_end
                break
            u = np.random.random() * lam
            if u <= floor:
                return t
            if u <= _rate(t, pol, state, n_vol, n_same, n_rev, tau_s, field_assisted, x_inc,
                          gain, omega, orders, a_coef, b_coef, tau_q):
                return t
    return -1.0


@njit_cached
def _monotone_end(
    t: float, t_end: float, gain: float, omega: float, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray,
    xq0: float, tq: float, tau_q: float,
) -> float:
    """With charge decay, x may turn inside a V-monotone piece: the first sign change of dx/dt after t
    (scanned on 16 sub-intervals, then bisected), or t_end."""
    n = 16
    h = (t_end - t) / n
    d0 = _dx(t, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
    a = t
    for i in range(1, n + 1):
        b = t + h * i if i < n else t_end
        d1 = _dx(b, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
        if (d1 > 0.0) != (d0 > 0.0) and d1 != 0.0:
            lo, hi = a, b
            for _ in range(200):
                mid = 0.5 * (lo + hi)
                dm = _dx(mid, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
                if (dm > 0.0) == (d0 > 0.0):
                    lo = mid
                else:
                    hi = mid
                if hi - lo <= 4e-16 * abs(hi):
                    break
            return hi
        a = b
    return t_end


@njit_cached
def run_cycles(
    state: np.ndarray,
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
    x_res: float,
    charge_per_unit: float,
    lag_free: bool,
    n_vol_pos: float,
    n_vol_neg: float,
    n_same: float,
    n_rev: float,
    tau_s: float,
    field_assisted: bool,
    tau_q: float,
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
    """Advance the void over AC cycles [cycle_start, cycle_stop).

    Events are written to the out_* buffers (when store_events) and always accumulated into totals and, when
    hist_counts has rows, into the phase x charge histogram (rows = phase bins over 0..360 deg, columns = bins
    between charge_edges [C]). Returns (events written, next cycle). The loop stops early, at a cycle boundary,
    when the buffers have room for fewer than max_per_cycle further events; the caller then grows them.

    Parameters
    ----------
    state : numpy.ndarray
        The void state vector (layout ``S_*`` above), updated in place.
    cycle_start, cycle_stop : int
        The cycles to run, [cycle_start, cycle_stop) [-].
    frequency : float
        Supply frequency [Hz].
    orders : numpy.ndarray
        Harmonic orders m [-].
    a_coef, b_coef : numpy.ndarray
        Sine and cosine amplitudes of each order [V].
    seg_fracs : numpy.ndarray
        Breakpoints of the monotone pieces of V, as fractions of the period from 0 to 1 [-].
    pure_sine : bool
        True for a plain sine (closed-form threshold crossings without decay).
    gain : float
        g: void quantity per applied volt (f/d [1/m] for the field model, k [-] for the network model).
    x_inc, x_res : float
        Inception and residual value of the void quantity [V/m or V].
    charge_per_unit : float
        Apparent charge per unit drop of the void quantity [C/(V/m) or C/V].
    lag_free : bool
        True to discharge the instant |x| reaches x_inc (no start-electron wait).
    n_vol_pos, n_vol_neg : float
        Volume start-electron rate for positive and negative discharges [1/s].
    n_same, n_rev : float
        Surface emission rate after a discharge, for the same and the reversed polarity [1/s].
    tau_s : float
        Decay time of the surface emission rate [s].
    field_assisted : bool
        True to multiply the rate by exp(|x|/x_inc).
    tau_q : float
        Decay time of the deposited quantity [s]; inf for none.
    store_events : bool
        True to write events to the ``out_*`` buffers.
    out_time, out_charge, out_before, out_after : numpy.ndarray
        Event buffers: time [s], apparent charge [C], void quantity before and after [V/m or V].
    max_per_cycle : int
        Upper bound on events in one cycle [-]; the loop stops when the buffers have less room.
    hist_counts : numpy.ndarray
        Phase x charge histogram, int64, updated in place; zero rows for none.
    charge_edges : numpy.ndarray
        Charge bin edges of the histogram [C].
    totals : numpy.ndarray
        Running sums (layout ``T_*`` above), updated in place.

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
    # V at the ends of the monotone pieces (the same in every period) and the swing of g·V over a period
    v_seg = np.empty(n_seg + 1)
    for k in range(n_seg + 1):
        v_seg[k] = voltage(seg_fracs[k] * period, omega, orders, a_coef, b_coef)
    gv_max = gain * v_seg.max()
    gv_min = gain * v_seg.min()
    cycle = cycle_start
    while cycle < cycle_stop:
        if store_events and capacity - n_written < max_per_cycle:
            break
        # without decay nothing can happen in a cycle whose void quantity stays inside (-x_inc, x_inc)
        if not decay and state[S_XQ0] + gv_max < x_inc and state[S_XQ0] + gv_min > -x_inc:
            cycle += 1
            continue
        cycle_t = cycle * period
        for seg in range(n_seg):
            ta = cycle_t + seg_fracs[seg] * period
            tb = cycle_t + seg_fracs[seg + 1] * period
            t = ta
            xt = gain * v_seg[seg] + state[S_XQ0]  # exact only without decay; recomputed below otherwise
            leaving = False  # True right after a window closed at a threshold crossing
            while t < tb:
                piece_end = tb
                xq0 = state[S_XQ0]
                tq = state[S_TQ]
                if decay:
                    piece_end = _monotone_end(t, tb, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
                    xt = _x(t, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
                    xe = _x(piece_end, gain, omega, orders, a_coef, b_coef, xq0, tq, tau_q)
                    rising = xe >= xt
                else:
                    xe = gain * v_seg[seg + 1] + xq0
                    rising = v_seg[seg + 1] >= v_seg[seg]
                    if gain < 0.0:
                        rising = not rising
                # the next above-threshold window [t_in, t_out] on this monotone piece, and its polarity
                inside = False
                if not leaving and (xt >= x_inc or xt <= -x_inc):
                    pol = 1.0 if xt > 0.0 else -1.0
                    if (pol > 0.0) == rising or pol * xe >= x_inc:
                        t_out = piece_end
                    elif pure_sine and not decay:
                        t_out = _root_sine(pol * x_inc, t, piece_end, amp_g, omega, cycle_t, seg, xq0)
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
                    # heading for the threshold of the polarity x is moving towards
                    pol = 1.0 if rising else -1.0
                    if pol * xe < x_inc:
                        if not decay:
                            break
                        t = piece_end
                        continue
                    if pure_sine and not decay:
                        t_in = _root_sine(pol * x_inc, t, piece_end, amp_g, omega, cycle_t, seg, xq0)
                    else:
                        t_in = _root_x(pol * x_inc, t, piece_end, gain, omega, orders, a_coef, b_coef,
                                       xq0, tq, tau_q)
                    t_out = piece_end
                    x_in = x_inc
                    x_out = abs(xe)
                # when does the discharge happen inside the window?
                if lag_free:
                    t_d = t_in
                else:
                    n_vol = n_vol_pos if pol > 0.0 else n_vol_neg
                    t_d = _consume_window(t_in, t_out, x_in, x_out, pol, state, n_vol, n_same, n_rev, tau_s,
                                          field_assisted, x_inc, gain, omega, orders, a_coef, b_coef, tau_q)
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
                x_before = gain * v_d + _xq(t_d, xq0, tq, tau_q)
                if lag_free and not decay:
                    x_before = pol * x_inc if abs(x_before) < x_inc else x_before
                x_after = pol * x_res
                q = charge_per_unit * (x_before - x_after)
                state[S_XQ0] = x_after - gain * v_d
                state[S_TQ] = t_d
                state[S_TLAST] = t_d
                state[S_LASTPOL] = pol
                state[S_COUNT] += 1.0
                if not lag_free:
                    state[S_REMAIN] = np.random.exponential(1.0)
                if totals[T_COUNT] == 0.0:
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
                        return -1, cycle  # bound violated: reported as an internal error by the caller
                    out_time[n_written] = t_d
                    out_charge[n_written] = q
                    out_before[n_written] = x_before
                    out_after[n_written] = x_after
                    n_written += 1
                t = t_d
                xt = x_after
        cycle += 1
    return n_written, cycle
