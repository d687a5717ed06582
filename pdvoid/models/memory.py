"""Wall-memory model: per-wall surface charge, Niemeyer-type detrapping emission and a scattered residual field.

The void field is x = f·V/d + x_q with x_q the field of the charge on the two walls along the field; a metal wall
(the void on an electrode) holds none. Start electrons: volume ionisation, a metal cathode's constant emission,
and electrons detrapped from negative charge on the cathode-side dielectric wall at the rate
(|q|/e)·ν0·exp(−(Φ − ΔΦ_Schottky)/(k_B T)) (Niemeyer 1995). One decay time governs the wall charge, its field and
its emission. A discharge leaves the streamer stability field (pressure-scaled) with a uniform scatter. The event
kernel is :mod:`pdvoid.kernels.memory_events`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from pdvoid.coefficients.record import Coefficients
from pdvoid.core.errors import InputError, check_bool, check_range
from pdvoid.core.units import ATM, BOLTZMANN, ELEMENTARY_CHARGE, EPSILON_0
from pdvoid.inputs.model_parameters import ModelParameters, register_model
from pdvoid.models.arguments import KernelArguments, cathode_rate, shared_arguments
from pdvoid.physics.surface_emission import schottky_coefficient, schottky_lowering, streamer_stability_field

if TYPE_CHECKING:
    from pdvoid.inputs.scenario import Scenario

__all__ = ["MemoryModel", "MemoryKernelArguments", "wall_weights", "wall_charges", "AIR_STABILITY_FIELD",
           "MAX_SPOTS"]

#: Stability field of positive streamers in air at 101325 Pa and 293.15 K [V/m]: 0.5 kV/(mm·bar) (physics brief
#: §3.2, from memory), the default of :attr:`MemoryModel.stability_field`.
AIR_STABILITY_FIELD = 5.066e5

#: Largest number of discharge spots of one void (the kernel runs each spot) [-].
MAX_SPOTS = 400

_UNUSED = ("residual_ratio", "surface_rate_same", "surface_rate_reversed", "surface_decay_time", "field_assisted")


def wall_weights(position: str) -> tuple[float, float]:
    """Field weights (m_hv, m_gnd) of the high-voltage-side and ground-side walls: x_q = (m_hv·Q_hv − m_gnd·Q_gnd)/c.

    An insulated void has two dielectric walls carrying opposite charge (1/2 each); a void on an electrode has one
    dielectric wall, whose charge and its image in the metal form the whole dipole (1), and a metal wall (0) that
    holds no charge.

    Parameters
    ----------
    position : str
        ``void.position``: ``"centred"``, ``"high_voltage_electrode"`` or ``"ground_electrode"``.

    Returns
    -------
    tuple of float
        (m_hv, m_gnd) [-].
    """
    if position == "centred":
        return 0.5, 0.5
    if position == "high_voltage_electrode":
        return 0.0, 1.0
    if position == "ground_electrode":
        return 1.0, 0.0
    raise InputError(f"void.position must be 'centred', 'high_voltage_electrode' or 'ground_electrode'; "
                     f"got {position!r}")


def wall_charges(state: np.ndarray, args: MemoryKernelArguments) -> dict[str, float]:
    """The wall charges a void state holds, at the time of its last discharge (the state's reference time).

    Parameters
    ----------
    state : numpy.ndarray
        The state vector of a run of the memory model (``VoidRunner.state``; layout of
        :mod:`pdvoid.kernels.memory_events`).
    args : MemoryKernelArguments
        The run's kernel arguments (``VoidRunner.args``).

    Returns
    -------
    dict
        ``net_hv``, ``net_gnd``: net charge on the high-voltage-side and ground-side wall [C];
        ``electrons_hv``, ``electrons_gnd``: electrons trapped there (magnitude) [C]; ``positive_hv``,
        ``positive_gnd``: positive charge there [C] (for a dielectric wall net = positive − electrons); ``time``:
        the reference time [s].
    """
    from pdvoid.kernels import memory_events as M

    if not isinstance(args, MemoryKernelArguments):
        raise InputError(f"wall_charges needs the arguments of a memory-model run; got {type(args).__name__}")
    xq = float(state[M.S_XQ0])
    c = args.true_charge_per_field
    # x_q = (m_hv·Q_hv − m_gnd·Q_gnd)/c with Q_hv = −Q_gnd on an insulated void and no charge on a metal wall
    net_hv = c * xq if args.m_hv > 0.0 else 0.0
    net_gnd = -c * xq if args.m_gnd > 0.0 else 0.0
    return {"net_hv": net_hv, "net_gnd": net_gnd, "electrons_hv": float(state[M.S_EHV]),
            "electrons_gnd": float(state[M.S_EGND]), "positive_hv": float(state[M.S_PHV]),
            "positive_gnd": float(state[M.S_PGND]), "time": float(state[M.S_TQ])}


@dataclass(frozen=True, eq=False)
class MemoryKernelArguments(KernelArguments):
    """Kernel inputs of the wall-memory model in SI: those of :class:`KernelArguments` (``x_res`` is the mean
    residual field, the streamer stability field [V/m]) and the following.

    Attributes
    ----------
    res_width : float
        Relative half-width of the uniform residual-field scatter [-].
    true_charge_per_field : float
        Charge deposited on each dielectric wall per unit field drop [C/(V/m)].
    m_hv, m_gnd : float
        Field weights of the two walls (:func:`wall_weights`) [-].
    emit_coef : float
        ν0·exp(−Φ/(k_B T))/e, detrapped electrons per second per coulomb of trapped charge [1/(s C)].
    beta : float
        Schottky coefficient β: ΔΦ/(k_B T) = β·sqrt(|E|) [(V/m)^-1/2].
    recombination : float
        Fraction of the ions landing on a wall that neutralise electrons trapped there [-].
    detach : bool
        True for start electrons detached from negative ions in the void gas.
    ion_source : float
        Negative ions formed per second in the void [1/s].
    ion_tau : float
        Loss time of the negative ions [s].
    n_gas : float
        Gas number density [1/m³].
    n_cells : int
        Number of discharge spots of the void, each with its share (1/n_cells) of the charge per field drop and
        of the electron supply [-].
    """

    res_width: float = 0.0
    true_charge_per_field: float = 0.0
    m_hv: float = 0.5
    m_gnd: float = 0.5
    emit_coef: float = 0.0
    beta: float = 0.0
    recombination: float = 0.0
    detach: bool = False
    ion_source: float = 0.0
    ion_tau: float = math.inf
    n_gas: float = 1.0
    n_cells: int = 1

    def max_events_per_cycle(self, scale: float = 1.0) -> int:
        """An upper bound on discharges in one cycle (that of :class:`KernelArguments` with the largest residual
        field, the smallest possible field drop).

        Parameters
        ----------
        scale : float, optional
            Factor on the supply waveform [-].

        Returns
        -------
        int
            The bound [-].
        """
        import dataclasses

        widest = dataclasses.replace(self, x_res=self.x_res * (1.0 + self.res_width))
        return KernelArguments.max_events_per_cycle(widest, scale) * self.n_cells

    def prepare_state(self, state: np.ndarray) -> None:
        """Start the discharge spots after the first: each as the runner started the first (no discharge yet, a
        fresh exponential wait drawn in spot order; nothing is drawn for a single spot).

        Parameters
        ----------
        state : numpy.ndarray
            The new state vector (``n_cells`` blocks), updated in place.
        """
        from pdvoid.kernels import memory_events as M

        for k in range(1, self.n_cells):
            block = state[k * M.STATE_SIZE:(k + 1) * M.STATE_SIZE]
            block[M.S_TLAST] = -np.inf
            if not self.lag_free:
                M.start_wait(block)

    @property
    def state_size(self) -> int:
        """Length of the void state vector of :mod:`pdvoid.kernels.memory_events` [-].

        Returns
        -------
        int
            The length.
        """
        from pdvoid.kernels import memory_events as M

        return M.STATE_SIZE * self.n_cells

    def advance(
        self, state: np.ndarray, cycle_start: int, cycle_stop: int, a_coef: np.ndarray, b_coef: np.ndarray,
        store_events: bool, out_time: np.ndarray, out_charge: np.ndarray, out_before: np.ndarray,
        out_after: np.ndarray, max_per_cycle: int, hist_counts: np.ndarray, charge_edges: np.ndarray,
        totals: np.ndarray,
    ) -> tuple[int, int]:
        """One call of :func:`pdvoid.kernels.memory_events.run_memory_cycles` (arguments as
        :meth:`KernelArguments.advance`).

        Parameters
        ----------
        state : numpy.ndarray
            The void state vector (layout of :mod:`pdvoid.kernels.memory_events`), updated in place.
        cycle_start, cycle_stop : int
            The cycles to run [-].
        a_coef, b_coef : numpy.ndarray
            Sine and cosine amplitudes of the (scaled) supply [V].
        store_events : bool
            True to write events to the ``out_*`` buffers.
        out_time, out_charge, out_before, out_after : numpy.ndarray
            Event buffers.
        max_per_cycle : int
            Upper bound on events in one cycle [-].
        hist_counts : numpy.ndarray
            Phase x charge histogram (int64), updated in place.
        charge_edges : numpy.ndarray
            Charge bin edges [C].
        totals : numpy.ndarray
            Running sums, updated in place.

        Returns
        -------
        tuple of int
            (events written, next cycle to run).
        """
        from pdvoid.kernels import memory_events as M

        n, nxt = M.run_memory_cycles(
            state, cycle_start, cycle_stop, self.frequency, self.orders, a_coef, b_coef, self.seg_fracs,
            self.pure_sine, self.gain, self.x_inc, self.x_res, self.res_width, self.charge_per_unit,
            self.true_charge_per_field, self.m_hv, self.m_gnd, self.recombination, self.lag_free, self.n_vol_pos,
            self.n_vol_neg, self.emit_coef, self.beta, self.tau_q, self.detach, self.ion_source, self.ion_tau,
            self.n_gas, self.n_cells, store_events, out_time, out_charge, out_before,
            out_after, max_per_cycle, hist_counts, charge_edges, totals,
        )
        if store_events and self.n_cells > 1 and n > 1:
            # the kernel writes each cycle spot by spot: put the events of this call in time order
            order = np.argsort(out_time[:n], kind="stable")
            for buf in (out_time, out_charge, out_before, out_after):
                buf[:n] = buf[:n][order]
        return n, nxt


@register_model
@dataclass(frozen=True)
class MemoryModel(ModelParameters):
    """Induced-charge void model with per-wall surface-charge memory and Niemeyer-type detrapping emission.

    Defaults are the parameter set ``niemeyer1995`` (:func:`pdvoid.inputs.model_sets.model_from_set`), whose file
    gives every value's source and status. Of :class:`ModelParameters` it uses ``lag_free``, ``ionization_rate``,
    ``electron_yield``, ``charge_decay_time`` (the one decay of wall charge and emission), ``inception_criterion``
    and ``cathode_emission_rate`` (a metal wall as cathode); ``residual_ratio``, the ``surface_*`` rates and
    ``field_assisted`` belong to the field model's emission rule and must keep their defaults here.

    Attributes
    ----------
    parameter_set : str
        Name of the parameter set the values come from; its references are cited by every run.
    trap_depth : float
        Effective trap depth Φ/e of wall charge [V] (1 V ↔ 1 eV), > 0.
    attempt_frequency : float
        Attempt-to-escape frequency ν0 of trapped electrons [Hz], > 0.
    stability_field : float
        Streamer stability field at 101325 Pa and 293.15 K [V/m], scaled with the gas density; the default is
        the value for air (refused for another gas: give that gas's own).
    residual_scatter : float
        Relative half-width w of the uniform scatter of the residual field about the stability field [-], [0, 1].
    recombination : float
        Fraction r of the positive ions landing on a wall that neutralise electrons trapped there [-], [0, 1]
        (1: only the net negative charge of a wall emits; 0: electrons and ions sit in separate traps).
    charge_decay_time : float
        Decay time of the wall charge and its emission [s]; inf for none.
    volume_detachment : bool
        True for the volume supply through negative ions (air only): every ion pair of the volume ionisation
        (``ionization_rate``, times ``electron_yield``) leaves an O2⁻ ion; the ions build up between discharges
        with the loss time ``ion_lifetime`` and give start electrons above inception at the rate ν_d(E)·(1 − η/α)
        per ion (:mod:`pdvoid.physics.detachment`); a discharge sweeps them out. False: today's constant volume
        rate.
    ion_lifetime : float
        Loss time τ_ion of the negative ions (drift to the walls) [s], > 0, inf for none.
    discharge_spots : bool
        True to let a flat void discharge in spots: a spot of diameter ``spot_ratio`` times the gas gap (the void
        height along the field), n = floor((diameter/spot diameter)²) spots that discharge independently, each with
        1/n of the charge per field drop and of the electron supply (n = 1 when the spot is as wide as the void).
        False: the whole void discharges at once.
    spot_ratio : float
        Spot diameter over the gas gap [-], in [0.5, 20].
    ionization_rate, cathode_emission_rate, ... :
        As :class:`ModelParameters`.

    References
    ----------
    Niemeyer 1995; Gutfleisch & Niemeyer 1995; Schottky 1914; Crichton, Karlsson & Pedersen 1989; Pedersen,
    Crichton & McAllister 1991; Lewis & Shedler 1979 (see :func:`pdvoid.cite`).
    """

    kind = "memory"
    title = "wall-memory model (per-wall charge, detrapping emission)"
    caveat = (
        "its trap depth, residual-field scatter, recombination fraction and charge decay time are illustrative "
        "(chosen to reproduce published trends, fitted to no measurement; see the parameter set's statuses); fit "
        "them to a measured pattern before reading discharge counts or magnitudes quantitatively"
    )
    field_units = {**ModelParameters.field_units, "parameter_set": (None, ""), "trap_depth": ("voltage", "V"),
                   "attempt_frequency": ("frequency", "Hz"), "stability_field": ("field", "V/m"),
                   "residual_scatter": ("dimensionless", ""),
                   "recombination": ("dimensionless", ""), "volume_detachment": (None, ""),
                   "ion_lifetime": ("time", "s"), "discharge_spots": (None, ""),
                   "spot_ratio": ("dimensionless", "")}

    parameter_set: str = "niemeyer1995"
    trap_depth: float = 1.3
    attempt_frequency: float = 1e14
    stability_field: float = AIR_STABILITY_FIELD
    residual_scatter: float = 0.5
    recombination: float = 0.5
    charge_decay_time: float = 0.1
    cathode_emission_rate: float = 1e4
    volume_detachment: bool = False
    ion_lifetime: float = 1e-3
    discharge_spots: bool = False
    spot_ratio: float = 2.0

    def __post_init__(self) -> None:
        super().__post_init__()
        base = ModelParameters()
        for name in _UNUSED:
            if getattr(self, name) != getattr(base, name):
                raise InputError(f"model.{name} does not enter the memory model (it has its own residual field and "
                                 f"emission); leave it at {getattr(base, name)!r}; got {getattr(self, name)!r}")
        if not isinstance(self.parameter_set, str) or not self.parameter_set.isidentifier():
            raise InputError(f"model.parameter_set must be a parameter-set name; got {self.parameter_set!r}")
        object.__setattr__(self, "trap_depth", check_range("model.trap_depth", self.trap_depth, 0.0, 10.0,
                                                           low_open=True, unit="V"))
        object.__setattr__(self, "attempt_frequency", check_range("model.attempt_frequency",
                                                                  self.attempt_frequency, 0.0, 1e20,
                                                                  low_open=True, unit="Hz"))
        object.__setattr__(self, "stability_field", check_range("model.stability_field", self.stability_field,
                                                                0.0, 1e9, unit="V/m"))
        object.__setattr__(self, "residual_scatter", check_range("model.residual_scatter",
                                                                 self.residual_scatter, 0.0, 1.0))
        object.__setattr__(self, "recombination", check_range("model.recombination", self.recombination, 0.0, 1.0))
        check_bool("model.volume_detachment", self.volume_detachment)
        check_bool("model.discharge_spots", self.discharge_spots)
        object.__setattr__(self, "spot_ratio", check_range("model.spot_ratio", self.spot_ratio, 0.5, 20.0))
        object.__setattr__(self, "ion_lifetime", check_range("model.ion_lifetime", self.ion_lifetime, 0.0,
                                                             math.inf, low_open=True, unit="s", allow_inf=True))

    def references(self) -> tuple[str, ...]:
        """The bibliography keys of the model and its parameter set.

        Returns
        -------
        tuple of str
            Keys for :func:`pdvoid.cite`.
        """
        from pdvoid.inputs.model_sets import get_parameter_set, list_parameter_sets

        keys = ["niemeyer1995", "schottky1914", "lewis1979"]
        if self.volume_detachment:
            keys += ["kossyi1992", "pancheshnyi2013", "morrow1997"]
        if self.parameter_set in list_parameter_sets(self.kind):
            keys += list(get_parameter_set(self.parameter_set).references)
        else:
            raise InputError(f"model.parameter_set must be one of {list_parameter_sets(self.kind)!r}; "
                             f"got {self.parameter_set!r}")
        return tuple(dict.fromkeys(keys))

    def spot_count(self, diameter: float, height: float) -> int:
        """Number of discharge spots of a void: floor((D/(k·h))²) with k = ``spot_ratio``, at least 1; 1 without
        ``discharge_spots``.

        The rule takes a discharge in a flat void to cover a spot whose diameter is a few gas gaps (from memory:
        the streamer's surface discharge spreads over about the gap length on either side of its foot; the
        factor k is illustrative).

        Parameters
        ----------
        diameter : float
            Void diameter across the field D [m].
        height : float
            Void height along the field, the gas gap h [m].

        Returns
        -------
        int
            The number of spots [-].

        Raises
        ------
        InputError
            For more than :data:`MAX_SPOTS` spots (the kernel runs each one).
        """
        if not self.discharge_spots:
            return 1
        n = max(1, math.floor((diameter / (self.spot_ratio * height)) ** 2))
        if n > MAX_SPOTS:
            raise InputError(f"model.spot_ratio {self.spot_ratio:g} gives {n} discharge spots for a void of "
                             f"diameter {diameter:g} m and height {height:g} m; at most {MAX_SPOTS} are allowed "
                             f"(raise model.spot_ratio)")
        return n

    def assumptions(self) -> tuple[str, str]:
        """What this model assumes about the residual field and the start electrons, in plain words.

        Returns
        -------
        tuple of str
            The residual-field sentence and the start-electron sentence [-].
        """
        residual = (
            f"The residual field is the streamer stability field of the gas, {self.stability_field / 1e6:.3g} kV/mm "
            f"at 101.325 kPa and 293.15 K (from memory), scaled with the gas density and scattered uniformly by "
            f"±{self.residual_scatter * 100:.0f} % (illustrative); it sets the charge per discharge.")
        if self.discharge_spots:
            residual += (f" A discharge covers a spot {self.spot_ratio:g} gas gaps wide (from memory, illustrative "
                         f"factor), and the spots of a wide flat void discharge independently, each with its own "
                         f"wall charge whose field is taken as local to the spot.")
        volume = "volume ionisation"
        if self.volume_detachment:
            volume = (f"negative ions from the volume ionisation, built up between discharges with a loss time of "
                      f"{self.ion_lifetime:g} s (illustrative) and detached above inception (detachment rates "
                      f"from memory)")
        return (
            residual,
            f"Start electrons: {volume}, a metal cathode's emission and electrons detrapped from the "
            "charge earlier discharges left on the cathode-side wall (Niemeyer-type, Schottky-lowered); "
            + self.caveat + ".",
        )

    def kernel_arguments(self, scenario: Scenario, c: Coefficients) -> MemoryKernelArguments:
        """The kernel arguments of this model for ``scenario`` with coefficients ``c``.

        Parameters
        ----------
        scenario : pdvoid.Scenario
            The scenario this model belongs to.
        c : pdvoid.coefficients.Coefficients
            Its coefficients.

        Returns
        -------
        MemoryKernelArguments
            Plain floats and arrays for :mod:`pdvoid.kernels.memory_events`; the void quantity is the void field.

        Raises
        ------
        InputError
            For a gas other than air with the air stability field, a residual field that can reach the inception
            field, or a depolarisation factor the wall charge cannot be computed from.
        """
        void = scenario.void
        if void.gas != "air" and self.stability_field == AIR_STABILITY_FIELD:
            raise InputError(f"model.stability_field {AIR_STABILITY_FIELD:g} V/m is the value for air; give the "
                             f"stability field of {void.gas!r} (at 101325 Pa, 293.15 K)")
        e_st = float(streamer_stability_field(void.gas_pressure, void.temperature,
                                              reduced_field=max(self.stability_field, 1e-300) / ATM))
        if self.stability_field == 0.0:
            e_st = 0.0
        e_inc = c.inception_field
        if math.isfinite(e_inc) and e_st * (1.0 + self.residual_scatter) >= e_inc:
            raise InputError(
                f"model.stability_field {self.stability_field:g} V/m with model.residual_scatter "
                f"{self.residual_scatter:g} gives residual fields up to {e_st * (1 + self.residual_scatter):g} V/m, "
                f"not below the inception field {e_inc:g} V/m of this void")
        n = c.depolarization
        er = scenario.insulation.permittivity
        if not (math.isfinite(n) and 0.0 < n < 1.0) or er is None:
            raise InputError(f"the memory model needs a depolarisation factor in (0, 1) for the wall charge; got {n!r}")
        area = math.pi * void.diameter**2 / 4.0
        # uniform deposited polarisation P gives the field N·P/(ε0(εr(1−N)+N)) and P·area on each wall half
        true_per_field = area * EPSILON_0 * (er * (1.0 - n) + n) / n
        t_wall = void.temperature
        if math.isfinite(e_inc):
            # |x| <= |g·V| + |x_q| and |x_q| <= max|g·V| + residual: a bound on the field at a wall
            top = 2.0 * c.peak_factor * scenario.supply.rms * c.field_enhancement / scenario.insulation.thickness \
                + e_inc
            if float(schottky_lowering(top)) >= self.trap_depth * ELEMENTARY_CHARGE:
                raise InputError(f"model.trap_depth {self.trap_depth:g} V is lowered away by the void field "
                                 f"({top:g} V/m); the detrapping formula does not apply")
        emit = self.attempt_frequency * math.exp(-self.trap_depth * ELEMENTARY_CHARGE / (BOLTZMANN * t_wall))
        m_hv, m_gnd = wall_weights(void.position)
        shared = shared_arguments(scenario, c.volume_electron_rate)
        detach: dict[str, Any] = {}
        if self.volume_detachment:
            if void.gas != "air":
                raise InputError(f"model.volume_detachment applies to air (detachment from O2-); got void.gas "
                                 f"{void.gas!r}")
            # the volume ion pairs feed the negative ions; the constant rate keeps only the metal cathode's part
            shared.update(n_vol_pos=cathode_rate(scenario, +1.0), n_vol_neg=cathode_rate(scenario, -1.0))
            detach = {"detach": True, "ion_source": c.volume_electron_rate, "ion_tau": self.ion_lifetime,
                      "n_gas": void.gas_pressure / (BOLTZMANN * void.temperature)}
        shared.update(n_same=0.0, n_rev=0.0, tau_s=math.inf, field_assisted=False)
        n_cells = self.spot_count(void.diameter, void.height)
        if n_cells > 1:
            # each spot: its share of the charge per field drop and of the supply (volume, cathode area, ions)
            shared.update(n_vol_pos=shared["n_vol_pos"] / n_cells, n_vol_neg=shared["n_vol_neg"] / n_cells)
            if detach:
                detach["ion_source"] = detach["ion_source"] / n_cells
            true_per_field /= n_cells
        return MemoryKernelArguments(
            **shared,
            gain=c.field_enhancement / scenario.insulation.thickness,
            x_inc=e_inc, x_res=e_st, charge_per_unit=c.charge_per_field / n_cells, x_to_field=1.0, n_cells=n_cells,
            references=tuple(dict.fromkeys(c.references + ("crichton1989", "pedersen1991") + self.references())),
            res_width=self.residual_scatter, true_charge_per_field=true_per_field, m_hv=m_hv, m_gnd=m_gnd,
            emit_coef=emit / ELEMENTARY_CHARGE, beta=schottky_coefficient(t_wall), recombination=self.recombination,
            **detach,
        )
