"""A straightforward fixed-step implementation of the same void model, for comparison only.

Time advances in steps of 0.1° of phase; in each step above the inception field a discharge happens with
probability 1 − exp(−N·Δt). Its answer depends on the step, which is why pdvoid does not work this way. The same
loop runs compiled (numba) and as plain Python.
"""

from __future__ import annotations

import math

import numpy as np
from numba import njit


def fixed_step_loop(cycles, steps_per_cycle, frequency, amp, gain, x_inc, x_res, c_q, n_vol, n_same, n_rev, tau_s,
                    field_assisted, seed):
    np.random.seed(seed)
    dt = 1.0 / (frequency * steps_per_cycle)
    w = 2.0 * math.pi * frequency
    xq = 0.0
    t_last = -1e300
    last_pol = 0.0
    count = 0
    qsum = 0.0
    for k in range(cycles * steps_per_cycle):
        t = k * dt
        x = gain * amp * math.sin(w * t) + xq
        if abs(x) >= x_inc:
            pol = 1.0 if x > 0.0 else -1.0
            rate = n_vol
            if last_pol != 0.0:
                ns = n_same if pol == last_pol else n_rev
                s = ns * math.exp(-(t - t_last) / tau_s)
                if field_assisted:
                    s *= math.exp(abs(x) / x_inc)
                rate += s
            if np.random.random() < 1.0 - math.exp(-rate * dt):
                x_after = pol * x_res
                q = c_q * (x - x_after)
                xq += x_after - x
                t_last = t
                last_pol = pol
                count += 1
                qsum += abs(q)
    return count, qsum


fixed_step_numba = njit(cache=False)(fixed_step_loop)
