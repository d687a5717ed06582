"""The inception band of a void (both inception criteria) and the verdict it gives against a test level.

The streamer criterion and the ionisation-integral criterion give two inception voltages that may differ by tens
of percent for a flat void. A verdict drawn from one of them alone can flip when the other is used; the band
[min, max] of the two makes the disagreement visible, and :func:`verdict` says "inconclusive" when the test level
falls inside it. Where the gas's streamer constant (E/p)_cr is from memory and its parameter set quotes a spread
(air: 24.2 to 25.2 V/(Pa m)), the streamer criterion enters the band at both ends of that spread.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from pdvoid.coefficients import Coefficients, compute_coefficients
from pdvoid.core.errors import check_positive
from pdvoid.core.validity import collect_validity_notes
from pdvoid.inputs.scenario import Scenario

__all__ = ["InceptionBand", "inception_band", "regime_words", "band_from_criteria", "band_from_coefficients",
           "verdict", "DISCHARGE_FREE",
           "DISCHARGES_EXPECTED", "INCONCLUSIVE"]

#: the whole band lies above the test level
DISCHARGE_FREE = "discharge-free at the test level"
#: the whole band lies at or below the test level
DISCHARGES_EXPECTED = "discharges expected"
#: the test level lies inside the band
INCONCLUSIVE = "inconclusive: the criteria disagree"


def regime_words(regime: str, reason: str) -> str:
    """The regime and its reason as one phrase, e.g. "no self-sustained discharge: p*l = ... ".

    Parameters
    ----------
    regime : str
        "streamer", "townsend" or "no self-sustained discharge" [-].
    reason : str
        Why, in one sentence (may already start with the regime) [-].

    Returns
    -------
    str
        The phrase [-].
    """
    if not reason:
        return regime
    return reason if reason.startswith(regime) else f"{regime}: {reason}"


@dataclass(frozen=True)
class InceptionBand:
    """The inception voltages of the two criteria and the band they span (applied voltages in V rms).

    Attributes
    ----------
    low, high : float
        The smaller and the larger inception voltage of the available criteria [V]; infinite when no
        self-sustained discharge is possible.
    streamer : float
        Inception voltage by the streamer criterion [V] (NaN if unavailable).
    integral : float
        Inception voltage by the ionisation-integral criterion [V] (NaN if unavailable, e.g. a gas without
        ionisation data).
    criteria : tuple of str
        The criteria the band is made of: ``("streamer", "ionisation integral")`` or one of them.
    regime : str
        The inception regime of the scenario's own criterion ("streamer", "townsend" or "no self-sustained
        discharge").
    reason : str
        Why that regime, in one sentence.
    notes : tuple of str
        Validity notes (the messages of the :class:`~pdvoid.core.validity.ValidityWarning` issued while computing).
    streamer_range : tuple of float
        (low, high) streamer-criterion inception voltage [V] over the quoted spread of the gas's (E/p)_cr; both
        NaN when the gas quotes none. ``low`` and ``high`` include it.
    critical_field_range : tuple of float
        That spread of (E/p)_cr [V/(Pa m)]; NaN when none.
    """

    low: float
    high: float
    streamer: float
    integral: float
    criteria: tuple[str, ...]
    regime: str = "streamer"
    reason: str = ""
    notes: tuple[str, ...] = ()
    streamer_range: tuple[float, float] = (math.nan, math.nan)
    critical_field_range: tuple[float, float] = (math.nan, math.nan)

    @property
    def single_criterion(self) -> bool:
        """Whether only one criterion was available [-]."""
        return len(self.criteria) < 2

    @property
    def spread(self) -> float:
        """Relative width of the band, (high - low) / low [-] (NaN if undefined)."""
        if not (math.isfinite(self.low) and math.isfinite(self.high)) or self.low <= 0:
            return math.nan
        return (self.high - self.low) / self.low

    def describe(self) -> str:
        """The band in words, with the inception voltages in kV rms.

        Returns
        -------
        str
            E.g. "inception band 9.1 to 10.8 kV rms (streamer 10.8 kV, ionisation integral 9.1 kV)".
        """
        if self.regime == "no self-sustained discharge":
            return regime_words(self.regime, self.reason)
        if not self.criteria:
            return "no inception criterion available"
        if self.single_criterion:
            missing = "ionisation integral" if self.criteria == ("streamer",) else "streamer criterion"
            spread = self._spread_words() if self.criteria == ("streamer",) else ""
            value = (f"inception band {self.low / 1e3:.4g} to {self.high / 1e3:.4g} kV rms" if spread
                     else f"inception voltage {self.low / 1e3:.4g} kV rms")
            return (f"{value} by the {self.criteria[0]} criterion only{spread} (the {missing} is not available "
                    "for this gas)")
        return (f"inception band {self.low / 1e3:.4g} to {self.high / 1e3:.4g} kV rms (streamer "
                f"{self.streamer / 1e3:.4g} kV{self._spread_words()}, ionisation integral "
                f"{self.integral / 1e3:.4g} kV)")

    def _spread_words(self) -> str:
        lo, hi = self.streamer_range
        if math.isnan(lo) or math.isnan(hi) or hi <= lo:
            return ""
        c_lo, c_hi = self.critical_field_range
        return (f", {lo / 1e3:.4g} to {hi / 1e3:.4g} kV over the quoted (E/p)_cr {c_lo:g} to {c_hi:g} V/(Pa m), "
                "from memory")


def band_from_criteria(streamer: float, integral: float, regime: str = "streamer", reason: str = "",
                       notes: tuple[str, ...] = (),
                       streamer_range: tuple[float, float] = (math.nan, math.nan),
                       critical_field_range: tuple[float, float] = (math.nan, math.nan)) -> InceptionBand:
    """The band of two criteria's inception voltages; a NaN one is left out.

    Parameters
    ----------
    streamer : float
        Inception voltage by the streamer criterion [V] (NaN if unavailable).
    integral : float
        Inception voltage by the ionisation-integral criterion [V] (NaN if unavailable).
    regime : str
        The inception regime [-].
    reason : str
        Why that regime [-].
    notes : tuple of str
        Validity notes [-].
    streamer_range : tuple of float
        Streamer-criterion inception voltage at both ends of the quoted spread of (E/p)_cr [V] (NaN: none);
        included in the band when the streamer criterion is.
    critical_field_range : tuple of float
        That spread [V/(Pa m)] (NaN: none).

    Returns
    -------
    InceptionBand
        The band; ``low`` and ``high`` are NaN when neither criterion is available.
    """
    named = [(n, float(v)) for n, v in (("streamer", streamer), ("ionisation integral", integral))
             if not math.isnan(float(v))]
    values = [v for _, v in named]
    s_range = (float(streamer_range[0]), float(streamer_range[1]))
    if not math.isnan(float(streamer)):
        values += [u for u in s_range if not math.isnan(u)]
    low = min(values) if values else math.nan
    high = max(values) if values else math.nan
    return InceptionBand(low, high, float(streamer), float(integral), tuple(n for n, _ in named), regime, reason,
                         tuple(notes), s_range,
                         (float(critical_field_range[0]), float(critical_field_range[1])))


def band_from_coefficients(c: Coefficients, notes: tuple[str, ...] = ()) -> InceptionBand:
    """The inception band of computed coefficients: both criteria and the streamer constant's quoted spread.

    Parameters
    ----------
    c : Coefficients
        The coefficients (:func:`pdvoid.compute_coefficients`).
    notes : tuple of str
        Validity notes to carry [-].

    Returns
    -------
    InceptionBand
        The band [V rms].
    """
    return band_from_criteria(c.inception_voltage_streamer, c.inception_voltage_integral, c.inception_regime,
                              c.inception_reason, tuple(notes), c.inception_voltage_streamer_range,
                              c.critical_field_range)


def inception_band(scenario: Scenario) -> InceptionBand:
    """The inception band of ``scenario``: both criteria from its coefficients.

    Validity warnings issued while computing are not re-issued: they are returned in ``notes``.

    Parameters
    ----------
    scenario : Scenario
        The scenario.

    Returns
    -------
    InceptionBand
        Both criteria's inception voltages [V rms], the band, the regime and the validity notes.
    """
    with collect_validity_notes() as notes:
        c = compute_coefficients(scenario)
    return band_from_coefficients(c, tuple(notes))


def verdict(band: InceptionBand, test_voltage: float) -> str:
    """The verdict of the band against a test level.

    Parameters
    ----------
    band : InceptionBand
        The inception band [V rms].
    test_voltage : float
        The test voltage [V rms].

    Returns
    -------
    str
        :data:`DISCHARGE_FREE` when the whole band lies above the test level, :data:`DISCHARGES_EXPECTED` when
        it lies at or below it, :data:`INCONCLUSIVE` when the test level is inside the band (or no criterion is
        available).

    Raises
    ------
    pdvoid.InputError
        For a test voltage that is not positive and finite.
    """
    check_positive("test_voltage", test_voltage, "V")
    if math.isnan(band.low) or math.isnan(band.high):
        return INCONCLUSIVE
    if band.low > test_voltage:
        return DISCHARGE_FREE
    if band.high <= test_voltage:
        return DISCHARGES_EXPECTED
    return INCONCLUSIVE
