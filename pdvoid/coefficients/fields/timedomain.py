"""Time-domain reference model: a void whose gas conducts while it discharges (current continuity).

On the same grid and with the same finite volumes as the electrostatic solver, the model integrates

    ∇·(σ∇V) + ∂/∂t ∇·(ε∇V) = 0

with σ = 0 everywhere except in the void while it discharges. Between discharges the free charge Q in the
dielectric is frozen, so the potential is U(t)·λ + (the potential of Q) and the mean void field is known in
closed form; the model jumps straight to the next instant at which the mean in-void field magnitude reaches the
inception field (lag-free: a start electron is always there). The gas conductivity is then switched on and the
charge relaxes by implicit (backward-Euler) steps, (ε0 A + Δt G) V⁺ = Q + ε0 B U + Δt g U, until the mean void
field has fallen to the residual field; the last step is interpolated so that the residual field is met
exactly. The apparent charge of a discharge is the change of the charge induced on the measuring electrode
by the free charge (Pedersen's λ function), minus any charge the gas conducts into that electrode directly.

Assumptions (lag-free reference): no statistical time lag, no wall (surface) conduction, no charge decay between
discharges, σ uniform in the void while it conducts, the supply voltage held during each discharge (its
duration, a few ε0/σ, is negligible against the period).

References:
    illias2011 (the conductive-cavity finite-element approach, confirmed for the paper; parameter values not
    used); pedersen1991 (λ function, from memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import scipy.sparse as sp
import scipy.sparse.linalg as spla
from scipy.optimize import brentq

from pdvoid.coefficients.fields.layout import ELECTRODES
from pdvoid.coefficients.fields.solver import FieldSolver
from pdvoid.core.arrays import frozen_array as _frozen
from pdvoid.core.errors import InputError, check_choice, check_int, check_positive, check_real
from pdvoid.core.units import EPSILON_0

__all__ = ["TimeDomainResult", "conductive_void_reference"]

REFERENCES = ("illias2011", "pedersen1991")




@dataclass(frozen=True, eq=False)
class TimeDomainResult:
    """Discharges of the time-domain reference model (one entry per discharge).

    Attributes
    ----------
    time : numpy.ndarray
        instant of inception [s].
    phase_deg : numpy.ndarray
        phase of the supply at inception [deg], in [0, 360).
    cycle : numpy.ndarray
        index of the supply cycle [-].
    charge : numpy.ndarray
        apparent charge on the measuring electrode, signed [C].
    field_before : numpy.ndarray
        mean axial in-void field at inception (signed) [V/m].
    field_after : numpy.ndarray
        mean axial in-void field when the gas stops conducting [V/m].
    voltage : numpy.ndarray
        supply voltage at inception [V].
    steps : int
        implicit time steps taken in all discharges [-].
    references : tuple[str, ...]
        bibliography keys [-].
    """

    time: np.ndarray
    phase_deg: np.ndarray
    cycle: np.ndarray
    charge: np.ndarray
    field_before: np.ndarray
    field_after: np.ndarray
    voltage: np.ndarray
    steps: int
    references: tuple[str, ...] = REFERENCES

    def __len__(self) -> int:
        return int(self.time.size)


def _conduction(solver: FieldSolver, sigma: float) -> tuple[sp.csc_matrix, np.ndarray]:
    """Conductance matrix of the discharging void and its coupling to the electrode planes [S].

    Every link with a part in the void conducts, with σ A/L weighted by that part's length share. These are
    exactly the links that carry weight in the mean-void-field quadrature, so a fully relaxed void has zero
    mean field, as in the continuum.
    """
    asm = solver.assembly
    g = solver.grid
    nr, nz = g.shape
    idx = asm.cell_index.reshape(nr, nz)
    if not (asm.void_r.any() or asm.void_z.any()):
        raise InputError("the grid does not resolve the void; refine it")
    area_r = 2.0 * math.pi * g.r_faces[1:-1, None] * g.dz[None, :]
    gr = sigma * asm.void_r[1:-1, :] * area_r / (np.diff(g.r)[:, None] * asm.cut_r[1:-1, :])
    dzc = np.diff(g.z)
    gz = sigma * asm.void_z[:, 1:-1] * g.ring_area[:, None] / (dzc[None, :] * asm.cut_z[:, 1:-1])
    a = np.concatenate([idx[:-1, :][gr > 0], idx[:, :-1][gz > 0]])
    b = np.concatenate([idx[1:, :][gr > 0], idx[:, 1:][gz > 0]])
    c = np.concatenate([gr[gr > 0], gz[gz > 0]])
    if np.any((a < 0) | (b < 0)):
        raise InputError("the void touches a shaped or floating conductor; the conduction model does not support that")
    rows, cols, vals = [a, b, a, b], [a, b, b, a], [c, c, -c, -c]
    couple = np.zeros((asm.n_unknowns, 2))
    for e, j in ((0, 0), (1, nz)):  # void parts next to the electrode planes conduct into them
        ge = sigma * asm.void_z[:, j] * g.ring_area / (0.5 * g.dz[min(j, nz - 1)])
        sel = ge > 0
        u = idx[sel, min(j, nz - 1)]
        rows.append(u)
        cols.append(u)
        vals.append(ge[sel])
        np.add.at(couple[:, e], u, ge[sel])
    n = asm.n_unknowns
    mat = sp.coo_matrix((np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))), shape=(n, n))
    return sp.csc_matrix(mat), couple


def conductive_void_reference(
    solver: FieldSolver,
    *,
    amplitude: float,
    frequency: float,
    inception_field: float,
    residual_field: float,
    cycles: int = 1,
    gas_conductivity: float = 1e-2,
    steps_per_time_constant: float = 10.0,
    measuring_electrode: str = "high",
    max_discharges: int = 10_000,
) -> TimeDomainResult:
    """Run the lag-free conductive-void reference model under U(t) = amplitude · sin(2π f t) on "high".

    Parameters
    ----------
    solver : FieldSolver
        a factorised :class:`~pdvoid.coefficients.fields.solver.FieldSolver` whose layout has a void [-].
    amplitude : float
        peak supply voltage on the high-voltage electrode [V].
    frequency : float
        supply frequency [Hz].
    inception_field : float
        mean in-void field magnitude at which the gas starts to conduct [V/m].
    residual_field : float
        mean in-void field magnitude at which it stops, 0 <= residual < inception [V/m].
    cycles : int, optional
        supply cycles to simulate, starting at phase 0 with an uncharged void [-].
    gas_conductivity : float, optional
        conductivity of the discharging gas [S/m].
    steps_per_time_constant : float, optional
        implicit steps per ε0/σ (the shortest relaxation time of the void) [-].
    measuring_electrode : str, optional
        electrode whose induced charge is the apparent charge [-].
    max_discharges : int, optional
        safety limit on the number of discharges [-].

    Returns
    -------
    TimeDomainResult
        :class:`TimeDomainResult`.
    """
    if not isinstance(solver, FieldSolver):
        raise InputError(f"solver must be a FieldSolver; got {type(solver).__name__}")
    if solver.layout.void is None:
        raise InputError("the layout has no void")
    amp = check_positive("amplitude", amplitude, "V")
    freq = check_positive("frequency", frequency, "Hz")
    e_inc = check_positive("inception_field", inception_field, "V/m")
    e_res = check_real("residual_field", residual_field)
    if not 0.0 <= e_res < e_inc:
        raise InputError(f"residual_field must lie in [0, inception_field = {e_inc:g}) V/m; got {e_res!r}")
    n_cycles = check_int("cycles", cycles, 1, 1_000_000)
    sigma = check_positive("gas_conductivity", gas_conductivity, "S/m")
    spt = check_positive("steps_per_time_constant", steps_per_time_constant)
    m = ELECTRODES.index(check_choice("measuring_electrode", measuring_electrode, ELECTRODES))
    limit = check_int("max_discharges", max_discharges, 1)

    asm = solver.assembly
    omega_v = asm.void_volume
    src = asm.polarization_source
    lam_h = solver.unit("high")
    lam_m = solver.unit(measuring_electrode)
    e_per_volt = lam_h.void_mean_field()  # mean E_z per volt on "high" (negative)
    w = solver.apply_inverse(src)  # A^-1 src: mean field of free charge Q is -(w·Q)/(ε0 Ω)
    g_mat, couple = _conduction(solver, sigma)
    dt = EPSILON_0 * solver.layout.gas_permittivity / (sigma * spt)
    eps_a = EPSILON_0 * asm.matrix
    stepper = spla.splu(sp.csc_matrix(eps_a + dt * g_mat), permc_spec="MMD_AT_PLUS_A")
    bu = EPSILON_0 * asm.coupling[:, 1] + dt * couple[:, 1]  # RHS per volt on "high"

    stop = max(e_res, 1e-9 * e_inc)  # a zero residual field is approached to 1e-9 of the inception field
    period = 1.0 / freq
    t_end = n_cycles * period
    q = np.zeros(asm.n_unknowns)  # free charge per unknown [C]
    absorbed = np.zeros(2)  # charge conducted into each electrode by the gas [C]

    def field_of(volt: float, charge: np.ndarray) -> float:
        return volt * e_per_volt - float(w @ charge) / (EPSILON_0 * omega_v)

    def volt_at(t: float) -> float:
        return amp * math.sin(2.0 * math.pi * freq * t)

    out: dict[str, list[float]] = {k: [] for k in ("time", "charge", "before", "after", "voltage")}
    total_steps = 0
    t = 0.0
    grid_t = np.linspace(0.0, period, 721)
    while t < t_end and len(out["time"]) < limit:
        e_q = field_of(0.0, q)
        # next instant with |U e_λ + e_q| >= e_inc, searched on a fine phase grid then refined
        ts = t + grid_t
        ts = np.append(ts[ts < t_end], t_end) if ts[-1] > t_end else ts
        if ts.size < 2:
            break
        vals = np.abs(amp * np.sin(2.0 * math.pi * freq * ts) * e_per_volt + e_q) - e_inc
        hit = np.flatnonzero(vals[1:] >= 0.0)
        if hit.size == 0:
            if ts[-1] >= t_end:
                break
            t = float(ts[-1])
            continue
        k = int(hit[0]) + 1
        if vals[k - 1] >= 0.0:  # already at or above inception (right after a discharge): start now
            t_star = float(ts[k - 1])
        else:
            t_star = brentq(
                lambda tt, eq=e_q: abs(volt_at(tt) * e_per_volt + eq) - e_inc, ts[k - 1], ts[k], xtol=1e-15, rtol=1e-13
            )
        u = volt_at(t_star)
        e0 = field_of(u, q)
        sign = 1.0 if e0 > 0 else -1.0
        q_before = q.copy()
        abs_before = absorbed.copy()
        e_prev, q_prev, a_prev = e0, q.copy(), absorbed.copy()
        for _ in range(200_000):
            v = stepper.solve(q_prev + bu * u)
            q_new = eps_a @ v - EPSILON_0 * asm.coupling[:, 1] * u
            inflow = np.array([float(couple[:, e] @ v) - couple[:, e].sum() * (u if e == 1 else 0.0) for e in range(2)])
            a_new = a_prev + dt * inflow
            e_new = field_of(u, q_new)
            total_steps += 1
            if sign * e_new <= stop:
                s = (sign * e_prev - stop) / (sign * (e_prev - e_new))
                q = q_prev + s * (q_new - q_prev)
                absorbed = a_prev + s * (a_new - a_prev)
                break
            e_prev, q_prev, a_prev = e_new, q_new, a_new
        else:  # pragma: no cover - guarded by the relaxation physics
            raise InputError("the void field did not relax to the residual field; check gas_conductivity")
        dq = q - q_before
        apparent = -float(lam_m.unknowns @ dq) - float(absorbed[m] - abs_before[m])
        out["time"].append(t_star)
        out["charge"].append(apparent)
        out["before"].append(e0)
        out["after"].append(field_of(u, q))
        out["voltage"].append(u)
        t = t_star + 1e-12 * period
    time = np.array(out["time"])
    return TimeDomainResult(
        time=_frozen(time),
        phase_deg=_frozen(np.mod(360.0 * freq * time, 360.0)),
        cycle=_frozen(np.floor(freq * time + 1e-12)),
        charge=_frozen(out["charge"]),
        field_before=_frozen(out["before"]),
        field_after=_frozen(out["after"]),
        voltage=_frozen(out["voltage"]),
        steps=total_steps,
    )
