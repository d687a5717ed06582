"""The plain numbers and arrays one kernel call needs, shared by both models."""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from pdvoid.inputs.waveform import monotone_breakpoints

if TYPE_CHECKING:
    from pdvoid.inputs.parameters import Periodic, Sine
    from pdvoid.inputs.scenario import Scenario

__all__ = ["KernelArguments", "supply_arrays", "cathode_rate", "shared_arguments"]


@dataclass(frozen=True, eq=False)
class KernelArguments:
    """Kernel inputs in SI.

    The void quantity x is a field [V/m] (field model) or a voltage [V] (network model); ``x_to_field`` converts it
    to the void field [V/m].

    Attributes
    ----------
    frequency : float
        Supply frequency [Hz].
    orders : numpy.ndarray
        Harmonic orders of the supply [-].
    a_coef, b_coef : numpy.ndarray
        Sine and cosine amplitudes of each order [V].
    seg_fracs : numpy.ndarray
        Breakpoints of the monotone pieces of V, fractions of the period from 0 to 1 [-].
    pure_sine : bool
        True for a plain sine.
    gain : float
        g: void quantity per applied volt (f/d [1/m] or k [-]).
    x_inc, x_res : float
        Inception and residual value of the void quantity [V/m or V].
    charge_per_unit : float
        Apparent charge per unit drop of the void quantity [C/(V/m) or C/V].
    lag_free : bool
        True to discharge the instant |x| reaches x_inc.
    n_vol_pos, n_vol_neg : float
        Volume start-electron rate for positive and negative discharges [1/s].
    n_same, n_rev : float
        Surface emission rate after a discharge, same and reversed polarity [1/s].
    tau_s : float
        Decay time of the surface emission [s].
    field_assisted : bool
        True to multiply the rate by exp(|x|/x_inc).
    tau_q : float
        Decay time of the deposited quantity [s]; inf for none.
    x_to_field : float
        Void field per unit of the void quantity ([-] for the field model, 1/h [1/m] for the network model).
    references : tuple of str
        Bibliography keys the model relied on.
    """

    frequency: float
    orders: np.ndarray
    a_coef: np.ndarray
    b_coef: np.ndarray
    seg_fracs: np.ndarray
    pure_sine: bool
    gain: float
    x_inc: float
    x_res: float
    charge_per_unit: float
    lag_free: bool
    n_vol_pos: float
    n_vol_neg: float
    n_same: float
    n_rev: float
    tau_s: float
    field_assisted: bool
    tau_q: float
    x_to_field: float
    references: tuple[str, ...]

    def max_events_per_cycle(self, scale: float = 1.0) -> int:
        """An upper bound on discharges in one cycle with the supply multiplied by ``scale`` (each discharge
        lowers |x| by at least x_inc - x_res; on every monotone piece x travels at most the swing of g·V plus
        the decay of the deposited part).

        Parameters
        ----------
        scale : float, optional
            Factor on the supply waveform [-].

        Returns
        -------
        int
            The bound [-].
        """
        from pdvoid.inputs.waveform import evaluate

        if not np.isfinite(self.x_inc):
            return 1  # no self-sustained discharge is possible: the void never reaches an infinite x_inc
        v = scale * evaluate(self.seg_fracs, self.orders, self.a_coef, self.b_coef)
        swing = abs(self.gain) * float(np.sum(np.abs(np.diff(v))))
        vmax = abs(self.gain) * float(np.max(np.abs(v)))
        pieces = self.seg_fracs.size - 1
        if np.isfinite(self.tau_q):
            pieces *= 3
            swing += pieces * 2.0 * (vmax + self.x_inc)
            # the deposited part x_q decays at |dx_q/dt| = |x_q|/tau_q with |x_q| <= x_res + max|g V|, so over one
            # period it moves x by at most (x_res + max|g V|)·T/tau_q: with tau_q much shorter than the period
            # (slow supplies) the void recharges many times per cycle
            swing += 2.0 * (vmax + self.x_inc) / (self.frequency * self.tau_q)
        step = self.x_inc - self.x_res
        return int(np.ceil((swing + pieces * 2.0 * (vmax + self.x_inc)) / step)) + 4 * pieces + 4

    def prepare_state(self, state: np.ndarray) -> None:
        """Finish a new void state after the runner set up its first entries and seeded the generator (nothing
        here; a kernel with more than one state block, such as the memory model's discharge spots, fills the
        others).

        Parameters
        ----------
        state : numpy.ndarray
            The new state vector, updated in place.
        """

    @property
    def state_size(self) -> int:
        """Length of the void state vector of this kernel [-] (:data:`pdvoid.kernels.void_events.STATE_SIZE`).

        Returns
        -------
        int
            The length.
        """
        from pdvoid.kernels import void_events as K

        return K.STATE_SIZE

    def advance(
        self, state: np.ndarray, cycle_start: int, cycle_stop: int, a_coef: np.ndarray, b_coef: np.ndarray,
        store_events: bool, out_time: np.ndarray, out_charge: np.ndarray, out_before: np.ndarray,
        out_after: np.ndarray, max_per_cycle: int, hist_counts: np.ndarray, charge_edges: np.ndarray,
        totals: np.ndarray,
    ) -> tuple[int, int]:
        """One call of the event kernel these arguments belong to (here the shared kernel
        :func:`pdvoid.kernels.void_events.run_cycles`; a model with a kernel of its own overrides this).

        Parameters
        ----------
        state : numpy.ndarray
            The void state vector, updated in place.
        cycle_start, cycle_stop : int
            The cycles to run, [cycle_start, cycle_stop) [-].
        a_coef, b_coef : numpy.ndarray
            Sine and cosine amplitudes of the (scaled) supply [V].
        store_events : bool
            True to write events to the ``out_*`` buffers.
        out_time, out_charge, out_before, out_after : numpy.ndarray
            Event buffers: time [s], apparent charge [C], void quantity before and after [V/m or V].
        max_per_cycle : int
            Upper bound on events in one cycle [-].
        hist_counts : numpy.ndarray
            Phase x charge histogram (int64), updated in place.
        charge_edges : numpy.ndarray
            Charge bin edges of the histogram [C].
        totals : numpy.ndarray
            Running sums, updated in place.

        Returns
        -------
        tuple of int
            (events written, next cycle to run).
        """
        from pdvoid.kernels import void_events as K

        return K.run_cycles(
            state, cycle_start, cycle_stop, self.frequency, self.orders, a_coef, b_coef, self.seg_fracs,
            self.pure_sine, self.gain, self.x_inc, self.x_res, self.charge_per_unit, self.lag_free, self.n_vol_pos,
            self.n_vol_neg, self.n_same, self.n_rev, self.tau_s, self.field_assisted, self.tau_q, store_events,
            out_time, out_charge, out_before, out_after, max_per_cycle, hist_counts, charge_edges, totals,
        )


def supply_arrays(supply: Sine | Periodic) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, bool]:
    """(orders, a, b, breakpoints, pure_sine) for the kernel.

    Parameters
    ----------
    supply : Sine or Periodic
        The supply.

    Returns
    -------
    tuple
        Harmonic orders [-], sine and cosine amplitudes [V], breakpoints of the monotone pieces as fractions of the
        period [-], and whether the supply is a plain sine.
    """
    orders, a, b = supply.fourier()
    pure = bool(supply.is_pure)
    if pure:
        orders, a, b = orders[:1], a[:1], b[:1]
        seg = np.array([0.0, 0.25, 0.75, 1.0])
    else:
        seg = monotone_breakpoints(orders, a, b)
    return orders, a, b, seg, pure


def cathode_rate(scenario: Scenario, polarity: float) -> float:
    """Extra start electrons [1/s] for discharges of ``polarity`` (+1: void field along the field of the positive
    half cycle) in a void bounded by an electrode: model.cathode_emission_rate when the metal wall is the
    cathode of that discharge, else 0.

    The positive half cycle drives electrons towards the high-voltage electrode, so a void on the high-voltage
    electrode has the metal as its cathode in negative discharges, a void on the ground electrode in positive
    ones (electron drift against the field; the metal supplies electrons far more readily than the dielectric
    wall — the mechanism behind the asymmetric patterns of electrode-bounded cavities reported by Forssén &
    Edin 2008, as summarised by Illias, Chen & Lewin 2011).

    Parameters
    ----------
    scenario : Scenario
        The scenario (its void position and model).
    polarity : float
        +1 or -1: the polarity of the discharge.

    Returns
    -------
    float
        The extra start-electron rate [1/s].
    """
    position = scenario.void.position
    if position == "centred":
        return 0.0
    cathode_polarity = -1.0 if position == "high_voltage_electrode" else 1.0
    return scenario.model.cathode_emission_rate if polarity == cathode_polarity else 0.0


def shared_arguments(scenario: Scenario, volume_electron_rate: float) -> dict[str, Any]:
    """The kernel arguments every model takes alike: the supply's Fourier series and monotone pieces, and the
    start-electron supply of the scenario's model (volume rate by polarity with the cathode emission of a void on
    an electrode, surface emission with its memory rule, charge decay).

    Parameters
    ----------
    scenario : Scenario
        The scenario; its ``model`` holds the start-electron parameters.
    volume_electron_rate : float
        Start electrons per second from volume ionisation, from the coefficients [1/s].

    Returns
    -------
    dict
        Keyword arguments of :class:`KernelArguments` (all but the model's void quantity, gain, thresholds,
        charge per unit, ``x_to_field`` and references).
    """
    m = scenario.model
    orders, a, b, seg, pure = supply_arrays(scenario.periodic_supply)
    return {
        "frequency": scenario.periodic_supply.frequency, "orders": orders, "a_coef": a, "b_coef": b, "seg_fracs": seg,
        "pure_sine": pure, "lag_free": m.lag_free,
        "n_vol_pos": volume_electron_rate + cathode_rate(scenario, +1.0),
        "n_vol_neg": volume_electron_rate + cathode_rate(scenario, -1.0),
        "n_same": m.surface_rate_same, "n_rev": m.surface_rate_reversed, "tau_s": m.surface_decay_time,
        "field_assisted": m.field_assisted, "tau_q": m.charge_decay_time,
    }
