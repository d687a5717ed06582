"""Event-driven kernel of the field model in the time domain: a conducting host and supplies given as pieces.

The void field is x(t) = g_cap·V(t) + z(t) + q(t) [V/m]:

* g_cap = f_cap/d: the capacitive (instantaneous) part of the void field per applied volt;
* z: the conduction part, the response of G/(1 + s τ) to V with G = (f_res − f_cap)/d, i.e. τ dz/dt = G V − z
  (zero at energisation);
* q: the field of the charge deposited by discharges, q(t) = q0·exp(−(t − t0)/τ_q).

(:mod:`pdvoid.physics.conduction` derives H(s) = f_cap + (f_res − f_cap)/(1 + s τ).) On each piece of the supply,
V = level + slope·(t − t_k) + c·sin(w (t − t_k) + φ) + e·exp(−(t − t_k)/τ_p) + Σ_m a_m sin(m ω t) + b_m cos(m ω t)
(a sinusoid of the piece's own, e.g. a cosine transition, an exponential, e.g. a decay after switch-off, and a
ripple common to all pieces), z has the closed form
z(t) = P(t) + C·exp(−(t − t_z)/τ) with the particular solution
P(t) = G·[level + slope·(t − t_k − τ) + c (sin θ − wτ cos θ)/(1 + w²τ²) + e τ_p/(τ_p − τ) exp(−(t − t_k)/τ_p)]
       + G·Σ_m [(a_m + b_m r_m) sin + (b_m − a_m r_m) cos]/(1 + r_m²),
θ = w (t − t_k) + φ, r_m = m ω τ, and C set by the continuity of z at the start of the piece. Nothing is
integrated with a step.

Each piece is scanned in sub-intervals (1/16 of the period of the highest ripple harmonic, and 1/16 of a piece
longer than a tenth of a decay time; a shorter piece without ripple is one sub-interval); where dx/dt changes
sign inside one it is cut at the turning point (bisection), so x is monotone on every part. On a monotone part
the windows with ``|x|`` >= x_inc are bounded by bracketed Newton/bisection roots of x = ±x_inc; the
start-electron hazard is spent over them exactly as in :mod:`pdvoid.kernels.void_events` (closed form for a
decaying surface emission, thinning for the field-assisted factor). On constant pieces with ripple, spans where
``|x|`` provably stays below x_inc are skipped, and spans where it provably stays above are one window, from a
bound of the ripple and of the decay. A discharge sets x to sign(x)·x_res by changing q.

All functions that call each other live in this one module (numba's cache; see the toolchain notes).
"""

from __future__ import annotations

import math

import numpy as np

from pdvoid.kernels.jit import njit_cached

# state vector layout
S_T = 0  # current time [s]
S_K = 1  # current piece
S_CZ = 2  # amplitude of the free part of z at S_TZ [V/m]
S_TZ = 3  # reference time of S_CZ [s]
S_CQ = 4  # deposited-charge field at S_TQ [V/m]
S_TQ = 5  # reference time of S_CQ [s]
S_TLAST = 6  # time of the last discharge [s] (-inf before the first)
S_LASTPOL = 7  # polarity of the last discharge (+1, -1, 0 = none)
S_REMAIN = 8  # remaining exponential hazard of the current wait
S_COUNT = 9  # events so far
STATE_SIZE = 12

# per-piece table layout (columns of pw):
# V = level + slope (t - t_k) + amp sin(omega (t - t_k) + phase) + exp_amp exp(-(t - t_k)/exp_tau) + ripple
PW_LEVEL = 0
PW_SLOPE = 1
PW_AMP = 2
PW_OMEGA = 3
PW_PHASE = 4
PW_EXP = 5  # amplitude of an exponential term exp_amp·exp(-(t - t_k)/exp_tau) [V]
PW_EXPTAU = 6  # its time constant [s]
PW_SIZE = 7

# parameter vector layout
P_GCAP = 0  # f_cap/d [1/m]
P_G = 1  # (f_res - f_cap)/d [1/m]
P_TAU = 2  # relaxation time of z [s] (inf: none)
P_TAUQ = 3  # decay time of the deposited-charge field [s] (inf: none)
P_XINC = 4
P_XRES = 5
P_CPU = 6  # apparent charge per unit drop of x [C/(V/m)]
P_NVOLP = 7
P_NVOLN = 8
P_NSAME = 9
P_NREV = 10
P_TAUS = 11
P_OMEGA = 12  # angular frequency of the ripple fundamental [rad/s]
P_SCAN = 13  # longest scan sub-interval [s] (inf without ripple)
PARAM_SIZE = 14

# totals layout (as in void_events)
T_COUNT = 0
T_ABS = 1
T_SQ = 2
T_QU = 3
T_FIRST = 6
TOTALS_SIZE = 8


@njit_cached
def seed_generator(seed: int) -> None:
    """Seed the generator used by :func:`run_time` (numba's own; numpy's legacy one without JIT).

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
        The state vector (layout ``S_*``); its ``S_REMAIN`` entry is set.
    """
    state[S_REMAIN] = np.random.exponential(1.0)


@njit_cached
def piece_voltage(t: float, k: int, breaks: np.ndarray, pw: np.ndarray, omega: float,
                  orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray) -> float:
    """V(t) on piece k [V].

    Parameters
    ----------
    t : float
        Time from energisation [s].
    k : int
        Piece index [-].
    breaks, pw : numpy.ndarray
        Piece starts [s], levels [V] and slopes [V/s].
    omega : float
        Ripple angular frequency [rad/s].
    orders, a_coef, b_coef : numpy.ndarray
        Ripple orders [-] and amplitudes [V].

    Returns
    -------
    float
        The voltage [V].
    """
    u = t - breaks[k]
    v = pw[k, PW_LEVEL] + pw[k, PW_SLOPE] * u
    if pw[k, PW_AMP] != 0.0:
        v += pw[k, PW_AMP] * math.sin(pw[k, PW_OMEGA] * u + pw[k, PW_PHASE])
    if pw[k, PW_EXP] != 0.0:
        v += pw[k, PW_EXP] * math.exp(-u / pw[k, PW_EXPTAU])
    for i in range(orders.size):
        ph = orders[i] * omega * t
        v += a_coef[i] * math.sin(ph) + b_coef[i] * math.cos(ph)
    return v


@njit_cached
def _dv(t: float, k: int, breaks: np.ndarray, pw: np.ndarray, omega: float, orders: np.ndarray,
        a_coef: np.ndarray, b_coef: np.ndarray) -> float:
    d = pw[k, PW_SLOPE]
    if pw[k, PW_AMP] != 0.0:
        w = pw[k, PW_OMEGA]
        d += pw[k, PW_AMP] * w * math.cos(w * (t - breaks[k]) + pw[k, PW_PHASE])
    if pw[k, PW_EXP] != 0.0:
        d -= pw[k, PW_EXP] / pw[k, PW_EXPTAU] * math.exp(-(t - breaks[k]) / pw[k, PW_EXPTAU])
    for i in range(orders.size):
        w = orders[i] * omega
        ph = w * t
        d += w * (a_coef[i] * math.cos(ph) - b_coef[i] * math.sin(ph))
    return d


@njit_cached
def _particular(t: float, k: int, breaks: np.ndarray, pw: np.ndarray, orders: np.ndarray,
                a_coef: np.ndarray, b_coef: np.ndarray, par: np.ndarray) -> float:
    """P(t): the particular solution of tau dz/dt = G V - z on piece k."""
    g = par[P_G]
    if g == 0.0:
        return 0.0
    tau = par[P_TAU]
    omega = par[P_OMEGA]
    u = t - breaks[k]
    p = pw[k, PW_LEVEL] + pw[k, PW_SLOPE] * (u - tau) if pw[k, PW_SLOPE] != 0.0 else pw[k, PW_LEVEL]
    if pw[k, PW_AMP] != 0.0:
        # response to c sin(th), th = w u + phase: c (sin th - r cos th)/(1 + r^2), r = w tau
        r = pw[k, PW_OMEGA] * tau
        th = pw[k, PW_OMEGA] * u + pw[k, PW_PHASE]
        p += pw[k, PW_AMP] * (math.sin(th) - r * math.cos(th)) / (1.0 + r * r)
    if pw[k, PW_EXP] != 0.0:
        # response to c exp(-u/tp): c tp/(tp - tau) exp(-u/tp); at tp = tau: c (u/tau) exp(-u/tau)
        tp = pw[k, PW_EXPTAU]
        if abs(tp - tau) <= 1e-9 * tau:
            p += pw[k, PW_EXP] * (u / tau) * math.exp(-u / tau)
        else:
            p += pw[k, PW_EXP] * tp / (tp - tau) * math.exp(-u / tp)
    for i in range(orders.size):
        w = orders[i] * omega
        r = w * tau
        ph = w * t
        p += ((a_coef[i] + b_coef[i] * r) * math.sin(ph) + (b_coef[i] - a_coef[i] * r) * math.cos(ph)) / (1.0 + r * r)
    return g * p


@njit_cached
def _z(t: float, k: int, breaks: np.ndarray, pw: np.ndarray, orders: np.ndarray,
       a_coef: np.ndarray, b_coef: np.ndarray, par: np.ndarray, state: np.ndarray) -> float:
    if par[P_G] == 0.0:
        return 0.0
    return _particular(t, k, breaks, pw, orders, a_coef, b_coef, par) + state[S_CZ] * math.exp(
        -(t - state[S_TZ]) / par[P_TAU])


@njit_cached
def _q(t: float, par: np.ndarray, state: np.ndarray) -> float:
    if state[S_CQ] == 0.0 or par[P_TAUQ] == math.inf:
        return state[S_CQ]
    return state[S_CQ] * math.exp(-(t - state[S_TQ]) / par[P_TAUQ])


@njit_cached
def void_field(t: float, k: int, breaks: np.ndarray, pw: np.ndarray, orders: np.ndarray,
               a_coef: np.ndarray, b_coef: np.ndarray, par: np.ndarray, state: np.ndarray) -> float:
    """x(t) = g_cap V + z + q on piece k [V/m].

    Parameters
    ----------
    t : float
        Time [s].
    k : int
        Piece index [-].
    breaks, pw : numpy.ndarray
        Piece starts [s], levels [V] and slopes [V/s].
    orders, a_coef, b_coef : numpy.ndarray
        Ripple orders [-] and amplitudes [V].
    par : numpy.ndarray
        Parameters (layout ``P_*``).
    state : numpy.ndarray
        State (layout ``S_*``).

    Returns
    -------
    float
        The void field [V/m].
    """
    v = piece_voltage(t, k, breaks, pw, par[P_OMEGA], orders, a_coef, b_coef)
    return par[P_GCAP] * v + _z(t, k, breaks, pw, orders, a_coef, b_coef, par, state) + _q(t, par, state)


@njit_cached
def _dx(t: float, k: int, breaks: np.ndarray, pw: np.ndarray, orders: np.ndarray,
        a_coef: np.ndarray, b_coef: np.ndarray, par: np.ndarray, state: np.ndarray) -> float:
    omega = par[P_OMEGA]
    d = par[P_GCAP] * _dv(t, k, breaks, pw, omega, orders, a_coef, b_coef)
    if par[P_G] != 0.0:
        v = piece_voltage(t, k, breaks, pw, omega, orders, a_coef, b_coef)
        z = _z(t, k, breaks, pw, orders, a_coef, b_coef, par, state)
        d += (par[P_G] * v - z) / par[P_TAU]
    if par[P_TAUQ] != math.inf:
        d -= _q(t, par, state) / par[P_TAUQ]
    return d


@njit_cached
def _root(target: float, t0: float, t1: float, k: int, breaks: np.ndarray, pw: np.ndarray,
          orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, par: np.ndarray, state: np.ndarray) -> float:
    """Root of x(t) = target on [t0, t1] where x is monotone and brackets it: Newton with a bisection guard."""
    f0 = void_field(t0, k, breaks, pw, orders, a_coef, b_coef, par, state) - target
    f1 = void_field(t1, k, breaks, pw, orders, a_coef, b_coef, par, state) - target
    if f0 == 0.0:
        return t0
    if f1 == 0.0:
        return t1
    lo, hi = t0, t1
    flo = f0
    t = t0 + (t1 - t0) * f0 / (f0 - f1)
    for _ in range(200):
        if not (lo < t < hi):
            t = 0.5 * (lo + hi)
        f = void_field(t, k, breaks, pw, orders, a_coef, b_coef, par, state) - target
        if f == 0.0:
            return t
        if (f > 0.0) == (flo > 0.0):
            lo, flo = t, f
        else:
            hi = t
        if hi - lo <= 4e-16 * max(abs(hi), 1e-300) + 1e-300:
            return 0.5 * (lo + hi)
        d = _dx(t, k, breaks, pw, orders, a_coef, b_coef, par, state)
        tn = t - f / d if d != 0.0 else 0.5 * (lo + hi)
        if abs(tn - t) <= 2e-16 * abs(t) + 1e-300:
            return tn if lo <= tn <= hi else t
        t = tn
    return 0.5 * (lo + hi)


@njit_cached
def _turn(t0: float, t1: float, d0: float, k: int, breaks: np.ndarray, pw: np.ndarray,
          orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, par: np.ndarray, state: np.ndarray) -> float:
    """The turning point of x in (t0, t1] given opposite slope signs at the ends (bisection)."""
    lo, hi = t0, t1
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        dm = _dx(mid, k, breaks, pw, orders, a_coef, b_coef, par, state)
        if (dm > 0.0) == (d0 > 0.0) and dm != 0.0:
            lo = mid
        else:
            hi = mid
        if hi - lo <= 4e-16 * max(abs(hi), 1e-300) + 1e-300:
            break
    return hi


@njit_cached
def _safe_skip(t: float, k: int, pw: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, orders: np.ndarray,
               par: np.ndarray, state: np.ndarray) -> tuple[float, bool]:
    """On a constant piece with ripple: (span, False) with a time span from t in which ``|x|`` cannot reach
    x_inc, or (span, True) with one in which ``|x|`` stays >= x_inc with the sign of x(t); (0, False) if neither.

    x = A0 + ripple + Cz·exp(-(t'-t_z)/tau) + q(t'), with ``|ripple|`` <= R and the decaying parts drifting by at
    most (``|Cz(t)|``/tau + ``|q(t)|``/tau_q)·Δ over Δ: so ``|x|`` < x_inc for Δ < (x_inc - ``|slow(t)|`` - R)/rate (inf
    when nothing decays)."""
    g = par[P_G]
    tau = par[P_TAU]
    r_bound = 0.0
    for i in range(orders.size):
        amp = math.sqrt(a_coef[i] * a_coef[i] + b_coef[i] * b_coef[i])
        w = orders[i] * par[P_OMEGA] * tau if g != 0.0 else 0.0
        r_bound += abs(par[P_GCAP]) * amp + (abs(g) * amp / math.sqrt(1.0 + w * w) if g != 0.0 else 0.0)
    cz = 0.0
    rate = 0.0
    if g != 0.0:
        cz = state[S_CZ] * math.exp(-(t - state[S_TZ]) / tau)
        rate += abs(cz) / tau
    qn = _q(t, par, state)
    if par[P_TAUQ] != math.inf:
        rate += abs(qn) / par[P_TAUQ]
    slow = (par[P_GCAP] + g) * pw[k, PW_LEVEL] + cz + qn
    margin = par[P_XINC] - abs(slow) - r_bound
    inside = False
    if margin <= 0.0:
        margin = abs(slow) - r_bound - par[P_XINC]
        if margin <= 0.0:
            return 0.0, False
        inside = True
    if rate == 0.0:
        return math.inf, inside
    return margin / rate, inside


@njit_cached
def _discharge(t_d: float, pol: float, k: int, breaks: np.ndarray, pw: np.ndarray,
               orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, par: np.ndarray, state: np.ndarray,
               lag_free: bool, n_written: int, out_time: np.ndarray, out_charge: np.ndarray,
               out_before: np.ndarray, out_after: np.ndarray, out_voltage: np.ndarray, totals: np.ndarray) -> None:
    """A discharge of polarity pol at t_d: x falls to pol·x_res (through q); the event is written at n_written."""
    v_d = piece_voltage(t_d, k, breaks, pw, par[P_OMEGA], orders, a_coef, b_coef)
    x_before = void_field(t_d, k, breaks, pw, orders, a_coef, b_coef, par, state)
    if abs(x_before) < par[P_XINC]:
        x_before = pol * par[P_XINC]  # a root a rounding error short of the threshold
    x_after = pol * par[P_XRES]
    q = par[P_CPU] * (x_before - x_after)
    state[S_CQ] = _q(t_d, par, state) + (x_after - x_before)
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
    out_time[n_written] = t_d
    out_charge[n_written] = q
    out_before[n_written] = x_before
    out_after[n_written] = x_after
    out_voltage[n_written] = v_d


@njit_cached
def _surface_level(pol: float, last_pol: float, n_same: float, n_rev: float) -> float:
    if last_pol == 0.0:
        return 0.0
    if pol == last_pol:
        return n_same
    return n_rev


@njit_cached
def _invert_closed(t0: float, t1: float, need: float, ns: float, n_vol: float, tau_s: float,
                   t_last: float) -> tuple[float, float]:
    """Spend hazard `need` of the rate n_vol + ns·exp(-(t - t_last)/tau_s) from t0 on (as in void_events):
    (t, need) where it is reached, or (t1, hazard of the window)."""
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
def _consume(t0: float, t1: float, x0: float, x1: float, pol: float, k: int, breaks: np.ndarray,
             pw: np.ndarray, orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray,
             par: np.ndarray, state: np.ndarray, field_assisted: bool) -> float:
    """Spend the remaining hazard over the above-threshold window [t0, t1] (``|x|`` = x0, x1 at its ends): the
    discharge time, or -1.0 when the window ends first (the hazard spent is subtracted)."""
    need = state[S_REMAIN]
    n_vol = par[P_NVOLP] if pol > 0.0 else par[P_NVOLN]
    ns = _surface_level(pol, state[S_LASTPOL], par[P_NSAME], par[P_NREV])
    tau_s = par[P_TAUS]
    x_inc = par[P_XINC]
    t_last = state[S_TLAST]
    if not field_assisted or ns == 0.0:
        t, spent = _invert_closed(t0, t1, need, ns, n_vol, tau_s, t_last)
        if spent < need:
            state[S_REMAIN] = need - spent
            return -1.0
        return t
    # thinning against a bound of the rate on sub-windows no longer than tau_s (Lewis & Shedler 1979)
    t = t0
    while t < t1:
        sub_end = t1
        if tau_s != math.inf and t + tau_s < t1:
            sub_end = t + tau_s
        xa = x0 if t == t0 else abs(void_field(t, k, breaks, pw, orders, a_coef, b_coef, par, state))
        xb = x1 if sub_end == t1 else abs(void_field(sub_end, k, breaks, pw, orders, a_coef, b_coef, par,
                                                     state))
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
            x = abs(void_field(t, k, breaks, pw, orders, a_coef, b_coef, par, state))
            expo = x / x_inc
            if tau_s != math.inf:
                expo -= (t - t_last) / tau_s
            if u <= n_vol + ns * math.exp(expo):
                return t
    return -1.0


@njit_cached
def _enter_piece(k: int, t: float, zval: float, breaks: np.ndarray, pw: np.ndarray,
                 orders: np.ndarray, a_coef: np.ndarray, b_coef: np.ndarray, par: np.ndarray,
                 state: np.ndarray) -> None:
    """Start piece k at time t with the conduction part z = zval (continuous across pieces)."""
    state[S_K] = k
    if par[P_G] != 0.0:
        state[S_CZ] = zval - _particular(t, k, breaks, pw, orders, a_coef, b_coef, par)
        state[S_TZ] = t


@njit_cached
def initialise(state: np.ndarray, breaks: np.ndarray, pw: np.ndarray, orders: np.ndarray,
               a_coef: np.ndarray, b_coef: np.ndarray, par: np.ndarray) -> None:
    """An uncharged void in an unpolarised host at t = 0 (the instant of energisation).

    Parameters
    ----------
    state : numpy.ndarray
        The state vector (layout ``S_*``), set in place.
    breaks, pw : numpy.ndarray
        Piece starts [s], levels [V] and slopes [V/s].
    orders, a_coef, b_coef : numpy.ndarray
        Ripple orders [-] and amplitudes [V].
    par : numpy.ndarray
        Parameters (layout ``P_*``).
    """
    state[:] = 0.0
    state[S_TLAST] = -math.inf
    _enter_piece(0, 0.0, 0.0, breaks, pw, orders, a_coef, b_coef, par, state)


@njit_cached
def run_time(
    state: np.ndarray,
    t_stop: float,
    breaks: np.ndarray,
    pw: np.ndarray,
    orders: np.ndarray,
    a_coef: np.ndarray,
    b_coef: np.ndarray,
    par: np.ndarray,
    lag_free: bool,
    field_assisted: bool,
    out_time: np.ndarray,
    out_charge: np.ndarray,
    out_before: np.ndarray,
    out_after: np.ndarray,
    out_voltage: np.ndarray,
    totals: np.ndarray,
) -> int:
    """Advance the void from ``state[S_T]`` to ``t_stop`` or until the event buffers are full.

    Parameters
    ----------
    state : numpy.ndarray
        The state vector (layout ``S_*``; :func:`initialise`), updated in place.
    t_stop : float
        End of this call [s], at most ``breaks[-1]``.
    breaks, pw : numpy.ndarray
        Piece starts with the end appended [s] (K + 1), levels [V] and slopes [V/s] (K).
    orders, a_coef, b_coef : numpy.ndarray
        Ripple orders [-] and sine and cosine amplitudes [V].
    par : numpy.ndarray
        Parameters (layout ``P_*``).
    lag_free : bool
        True to discharge the instant ``|x|`` reaches x_inc.
    field_assisted : bool
        True to multiply the surface emission by exp(``|x|``/x_inc).
    out_time, out_charge, out_before, out_after, out_voltage : numpy.ndarray
        Event buffers: time [s], apparent charge [C], void field before and after [V/m], applied voltage [V].
    totals : numpy.ndarray
        Running sums (layout ``T_*``), updated in place.

    Returns
    -------
    int
        Events written; the call ends early (state saved) when the buffers are full.
    """
    capacity = out_time.size
    n_written = 0
    x_inc = par[P_XINC]
    n_pieces = pw.shape[0]
    t = state[S_T]
    k = int(state[S_K])
    while t < t_stop:
        if n_written >= capacity:
            break
        piece_end = breaks[k + 1]
        if piece_end > t_stop:
            piece_end = t_stop
        h = breaks[k + 1] - breaks[k]
        if h > 0.1 * par[P_TAU] or h > 0.1 * par[P_TAUQ]:
            h /= 16.0  # the decaying parts may turn x inside a long piece: scan it
        if pw[k, PW_EXP] != 0.0 and h > 0.1 * pw[k, PW_EXPTAU]:
            h /= 16.0
        if pw[k, PW_AMP] != 0.0 and h > 0.4 / pw[k, PW_OMEGA]:
            h = 0.4 / pw[k, PW_OMEGA]  # 1/16 of the period of the piece's own sinusoid
        if par[P_SCAN] < h:
            h = par[P_SCAN]
            if pw[k, PW_SLOPE] == 0.0 and pw[k, PW_AMP] == 0.0 and pw[k, PW_EXP] == 0.0:
                skip, inside = _safe_skip(t, k, pw, a_coef, b_coef, orders, par, state)
                if inside and not lag_free and not field_assisted and skip > 4.0 * h:
                    # one window over the whole span: the hazard does not depend on x
                    w1 = t + skip if t + skip < piece_end else piece_end
                    pol = 1.0 if void_field(t, k, breaks, pw, orders, a_coef, b_coef, par, state) > 0.0 \
                        else -1.0
                    t_d = _consume(t, w1, 0.0, 0.0, pol, k, breaks, pw, orders, a_coef, b_coef, par,
                                   state, False)
                    if t_d >= 0.0:
                        _discharge(t_d, pol, k, breaks, pw, orders, a_coef, b_coef, par, state, lag_free,
                                   n_written, out_time, out_charge, out_before, out_after, out_voltage, totals)
                        n_written += 1
                        t = t_d
                        continue
                    t = w1
                    if t >= breaks[k + 1] and k + 1 < n_pieces:
                        zval = _z(t, k, breaks, pw, orders, a_coef, b_coef, par, state)
                        k += 1
                        _enter_piece(k, t, zval, breaks, pw, orders, a_coef, b_coef, par, state)
                    continue
                if not inside and skip > 4.0 * h:
                    t = t + skip if t + skip < piece_end else piece_end
                    if t >= breaks[k + 1] and k + 1 < n_pieces:
                        zval = _z(t, k, breaks, pw, orders, a_coef, b_coef, par, state)
                        k += 1
                        _enter_piece(k, t, zval, breaks, pw, orders, a_coef, b_coef, par, state)
                    continue
        b = t + h
        if b > piece_end or piece_end - b < 1e-9 * h:
            b = piece_end
        d0 = _dx(t, k, breaks, pw, orders, a_coef, b_coef, par, state)
        d1 = _dx(b, k, breaks, pw, orders, a_coef, b_coef, par, state)
        if d0 != 0.0 and d1 != 0.0 and (d0 > 0.0) != (d1 > 0.0):
            b = _turn(t, b, d0, k, breaks, pw, orders, a_coef, b_coef, par, state)
        xa = void_field(t, k, breaks, pw, orders, a_coef, b_coef, par, state)
        xb = void_field(b, k, breaks, pw, orders, a_coef, b_coef, par, state)
        rising = xb >= xa
        t_d = -1.0
        pol = 0.0
        for w in range(2):
            # window w: the first in time order, then the second (see the module docstring)
            if rising:
                pol = -1.0 if w == 0 else 1.0
            else:
                pol = 1.0 if w == 0 else -1.0
            first_end = w == 0
            x_start = xa if first_end else xb
            if pol * x_start < x_inc:
                continue
            if first_end:
                w0 = t
                if pol * xb >= x_inc:
                    w1 = b
                else:
                    w1 = _root(pol * x_inc, t, b, k, breaks, pw, orders, a_coef, b_coef, par, state)
                x0, x1 = abs(xa), (abs(xb) if w1 == b else x_inc)
            else:
                w1 = b
                if pol * xa >= x_inc:
                    w0 = t
                else:
                    w0 = _root(pol * x_inc, t, b, k, breaks, pw, orders, a_coef, b_coef, par, state)
                x0, x1 = (abs(xa) if w0 == t else x_inc), abs(xb)
            if lag_free:
                t_d = w0
                break
            if w1 <= w0:
                continue
            t_d = _consume(w0, w1, x0, x1, pol, k, breaks, pw, orders, a_coef, b_coef, par, state,
                           field_assisted)
            if t_d >= 0.0:
                break
        if t_d >= 0.0:
            _discharge(t_d, pol, k, breaks, pw, orders, a_coef, b_coef, par, state, lag_free, n_written,
                       out_time, out_charge, out_before, out_after, out_voltage, totals)
            n_written += 1
            t = t_d
            continue
        t = b
        if t >= breaks[k + 1] and k + 1 < n_pieces:
            zval = _z(t, k, breaks, pw, orders, a_coef, b_coef, par, state)
            k += 1
            _enter_piece(k, t, zval, breaks, pw, orders, a_coef, b_coef, par, state)
    state[S_T] = t
    state[S_K] = k
    return n_written
