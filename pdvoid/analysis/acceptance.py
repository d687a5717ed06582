"""The verdict of a simulated run against an acceptance criterion such as "≤ 10 pC at 1.1 × U_test".

The verdict reads the run simulated at the criterion's voltage: its largest repeatedly occurring magnitude
(:func:`pdvoid.analysis.quantities.largest_repeated_magnitude`, pdvoid's own counting rule), the apparent charge
of a lag-free discharge (the coefficients), and where the voltage lies against the inception band of both
criteria (:func:`pdvoid.analysis.verdict.inception_band`). It says in words which assumption the outcome rests on:
the inception criteria, the model's discharge rule, or the start-electron supply.

The rule (our own; no standard prescribes how to judge a simulated pattern):

1. **fails** when the largest repeatedly occurring magnitude exceeds the limit;
2. **meets** when the voltage lies below the whole inception band (no discharge by either criterion);
3. **not shown** when no magnitude repeats at the rate although the voltage reaches the inception band (the
   outcome then rests on the start-electron supply or on the choice of criterion), or when the repeated
   magnitude is within the limit but a lag-free discharge is not;
4. **meets** otherwise: the repeated magnitude and the lag-free charge are both within the limit.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from pdvoid.analysis.quantities import DEFAULT_REPETITION_RATE, largest_repeated_magnitude
from pdvoid.analysis.verdict import DISCHARGE_FREE, INCONCLUSIVE, InceptionBand, inception_band, verdict
from pdvoid.core.errors import InputError, check_positive
from pdvoid.inputs.document import AcceptanceCriterion
from pdvoid.inputs.model_sets import sets_matching
from pdvoid.simulation.results import Result

__all__ = ["AcceptanceVerdict", "acceptance_verdict", "MEETS", "FAILS", "NOT_SHOWN", "COUNTING_RULE"]

#: the run meets the criterion
MEETS = "meets the acceptance criterion"
#: the run fails the criterion
FAILS = "fails the acceptance criterion"
#: the estimate cannot decide
NOT_SHOWN = "not shown (this estimate cannot decide)"

#: pdvoid's counting rule for the largest repeatedly occurring magnitude, in words
COUNTING_RULE = (
    "largest repeatedly occurring magnitude by pdvoid's own counting rule: the k-th largest |q| of the run, "
    "k = ceil(rate × observation time), i.e. the largest magnitude reached or exceeded at least {rate:g} times "
    "per second on average (IEC 60270 ties the quantity to an instrument's pulse-train response instead, which "
    "this rule does not model)"
)


def _pc(q: float) -> str:
    return f"{q * 1e12:.4g} pC"


def _kv(u: float) -> str:
    return f"{u / 1e3:.4g} kV rms" if math.isfinite(u) else "none"


@dataclass(frozen=True)
class AcceptanceVerdict:
    """A simulated run judged against an acceptance criterion (SI; voltages rms).

    Attributes
    ----------
    criterion : AcceptanceCriterion
        The criterion [-].
    test_voltage : float
        The test voltage the criterion's factor multiplies [V].
    voltage : float
        The voltage the criterion applies at and the run was simulated at [V].
    outcome : str
        :data:`MEETS`, :data:`FAILS` or :data:`NOT_SHOWN` [-].
    reason : str
        Why, in one or two plain sentences [-].
    rests_on : tuple of str
        The assumptions the outcome rests on, in words [-].
    largest_repeated : float
        The run's largest repeatedly occurring magnitude (0 when no magnitude repeats that often) [C].
    repetition_rate : float
        The rate of the counting rule [1/s].
    lag_free_charge : float
        Apparent charge of a lag-free discharge of the design [C].
    largest_charge : float
        Largest ``|q|`` of the run (0 without discharges) [C].
    discharges : int
        Discharges in the run [-].
    cycles : int
        Cycles simulated [-].
    inception_voltage : float
        Inception voltage by the criterion the simulation uses [V].
    band : InceptionBand
        The inception band of both criteria [V].
    band_verdict : str
        :func:`pdvoid.analysis.verdict.verdict` of the band at ``voltage`` [-].
    """

    criterion: AcceptanceCriterion
    test_voltage: float
    voltage: float
    outcome: str
    reason: str
    rests_on: tuple[str, ...]
    largest_repeated: float
    repetition_rate: float
    lag_free_charge: float
    largest_charge: float
    discharges: int
    cycles: int
    inception_voltage: float
    band: InceptionBand
    band_verdict: str

    @property
    def counting_rule(self) -> str:
        """The counting rule of :attr:`largest_repeated`, in words [-]."""
        return COUNTING_RULE.format(rate=self.repetition_rate)

    def describe(self) -> str:
        """The verdict in plain words, with the criterion, the voltage and what the outcome rests on.

        Returns
        -------
        str
            E.g. "Acceptance criterion ≤ 10 pC at 1.1 × U_test (19.8 kV rms): meets the acceptance criterion. ...".
        """
        rests = "; ".join(self.rests_on)
        return (f"Acceptance criterion {self.criterion.describe()} ({_kv(self.voltage)}): {self.outcome}. "
                f"{self.reason}. This rests on {rests}.")


def _criterion_name(result: Result) -> str:
    return result.scenario.model.inception_criterion.replace("_", " ").replace("ionization", "ionisation")


def _rests_on(result: Result, *, supply: bool, model: bool, criteria: bool) -> tuple[str, ...]:
    m = result.scenario.model
    out = []
    if criteria:
        out.append("the inception criteria and their constants (streamer criterion and ionisation integral)")
    if model:
        named = sets_matching(m)
        where = f"parameter set {', '.join(named)}" if named else "values as given (no named parameter set)"
        out.append(f"the {m.title}, {where}, E_res = {m.residual_ratio:g}·E_inc (sets the charge per discharge)")
    if supply:
        if m.lag_free:
            out.append("unlimited start electrons (lag-free), an idealisation: a real void waits for a start "
                       "electron")
        else:
            out.append("the start-electron supply assumed (illustrative rates unless fitted to a measured pattern; "
                       "it sets how often, and how far above inception, discharges start)")
    return tuple(out)


def acceptance_verdict(
    result: Result,
    criterion: AcceptanceCriterion,
    test_voltage: float,
    *,
    band: InceptionBand | None = None,
    repetition_rate: float = DEFAULT_REPETITION_RATE,
) -> AcceptanceVerdict:
    """Judge a run simulated at the criterion's voltage against the criterion (rule in the module docstring).

    Parameters
    ----------
    result : Result
        The run, simulated at ``criterion.voltage_factor × test_voltage`` (its supply's rms must match to 1e-9).
    criterion : AcceptanceCriterion
        The acceptance criterion [-].
    test_voltage : float
        The test voltage [V rms].
    band : InceptionBand, optional
        The inception band of the design (default: computed from the run's scenario) [V rms].
    repetition_rate : float
        Rate of the counting rule of the largest repeatedly occurring magnitude, > 0 [1/s].

    Returns
    -------
    AcceptanceVerdict
        The outcome, its reason and what it rests on.

    Raises
    ------
    pdvoid.InputError
        For a result that is not a Result holding its events, a criterion that is not an AcceptanceCriterion, a
        bad test voltage or rate, or a run simulated at another voltage.

    References
    ----------
    iec60270 (clause 3, the largest repeatedly occurring PD magnitude as the quantity limits are set on; wording
    from memory). The counting rule and the decision rule are ours; valid for any simulated run.
    """
    if not isinstance(result, Result):
        raise InputError(f"result must be a pdvoid.Result; got {type(result).__name__}")
    if not isinstance(criterion, AcceptanceCriterion):
        raise InputError(f"criterion must be a pdvoid.inputs.document.AcceptanceCriterion; got "
                         f"{type(criterion).__name__}")
    test_voltage = check_positive("test_voltage", test_voltage, "V")
    rate = check_positive("repetition_rate", repetition_rate, "1/s")
    if band is not None and not isinstance(band, InceptionBand):
        raise InputError(f"band must be an InceptionBand or None; got {type(band).__name__}")
    if result.events.count != result.event_count:
        raise InputError("result must hold its events (a histogram-only run has no magnitudes to count)")
    voltage = criterion.voltage_factor * test_voltage
    rms = float(result.scenario.supply.rms)
    if abs(rms - voltage) > 1e-9 * voltage:
        raise InputError(f"result must be simulated at voltage_factor × test_voltage = {voltage!r} V rms; its "
                         f"supply is {rms!r} V rms")
    band = inception_band(result.scenario) if band is None else band
    c = result.coefficients()
    q_rep = largest_repeated_magnitude(result, rate)
    q_lag = float(c.charge_per_discharge)
    charges = result.charge
    q_max = float(abs(charges).max()) if charges.size else 0.0
    limit = criterion.charge
    u_inc = float(c.inception_voltage)
    bv = verdict(band, voltage)
    n = result.event_count
    lag_words = f"a lag-free discharge would be {_pc(q_lag)}, {'above' if q_lag > limit else 'within'} the limit"
    if q_rep > limit:
        outcome = FAILS
        reason = (f"The largest repeatedly occurring magnitude of the run simulated at {_kv(voltage)}, "
                  f"{_pc(q_rep)}, exceeds the limit of {_pc(limit)} ({n} discharges in {result.cycles} cycles)")
        rests = _rests_on(result, supply=True, model=True, criteria=False)
    elif bv == DISCHARGE_FREE:
        outcome = MEETS
        reason = (f"{_kv(voltage)} lies below the inception band of both criteria ({band.describe()}): no "
                  "discharge is expected, so no magnitude can exceed the limit")
        rests = _rests_on(result, supply=False, model=False, criteria=True)
    elif q_rep == 0.0 and u_inc > voltage:
        outcome = NOT_SHOWN
        reason = (f"{_kv(voltage)} lies inside the inception band ({band.describe()}): below inception by the "
                  f"{_criterion_name(result)} criterion the simulation uses ({_kv(u_inc)}), so the run does not "
                  f"discharge, but not below it by every criterion; {lag_words}")
        rests = _rests_on(result, supply=False, model=True, criteria=True)
    elif q_rep == 0.0:
        outcome = NOT_SHOWN
        few = "no discharge" if n == 0 else f"only {n} discharge{'s' if n > 1 else ''}"
        reason = (f"{_kv(voltage)} lies above the inception voltage of the criterion used ({_kv(u_inc)}), but "
                  f"the run has {few} in {result.cycles} cycles, too few for any magnitude to repeat {rate:g} "
                  f"times per second; {lag_words}. A longer run, or a start-electron supply fitted to a measured "
                  "pattern, would decide")
        rests = _rests_on(result, supply=True, model=True, criteria=False)
    elif q_lag > limit:
        outcome = NOT_SHOWN
        reason = (f"The largest repeatedly occurring magnitude of the run, {_pc(q_rep)}, is within the limit of "
                  f"{_pc(limit)}, but {lag_words}")
        rests = _rests_on(result, supply=True, model=True, criteria=False)
    else:
        outcome = MEETS
        inside = (f"; {_kv(voltage)} lies inside the inception band ({band.describe()}), so the criteria disagree "
                  "whether it discharges at all" if bv == INCONCLUSIVE else "")
        reason = (f"The largest repeatedly occurring magnitude of the run simulated at {_kv(voltage)}, "
                  f"{_pc(q_rep)}, and the charge of a lag-free discharge, {_pc(q_lag)}, are within the limit of "
                  f"{_pc(limit)} ({n} discharges in {result.cycles} cycles){inside}")
        rests = _rests_on(result, supply=True, model=True, criteria=bool(inside))
    return AcceptanceVerdict(criterion, test_voltage, voltage, outcome, reason, rests, q_rep, rate, q_lag, q_max,
                             n, result.cycles, u_inc, band, bv)
