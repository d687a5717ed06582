"""Design margins: inception voltage against void size and other inputs, the largest discharge-free void, and the
margin of a design against a test level.

All from the analytic coefficients (no simulation), so a table of hundreds of points takes milliseconds.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, fields

import numpy as np
from numpy.typing import ArrayLike
from scipy.optimize import brentq

from pdvoid.analysis.verdict import band_from_coefficients
from pdvoid.coefficients import Coefficients, compute_coefficients
from pdvoid.coefficients.closed_form import supply_peak_factor
from pdvoid.coefficients.coaxial import proximity_thickness
from pdvoid.coefficients.limits import HOST_STRENGTH_MARK, warn_host_strength
from pdvoid.core.errors import InputError, check_array, check_positive
from pdvoid.core.validity import collect_validity_notes, warn_validity
from pdvoid.inputs.scenario import Scenario

__all__ = ["MarginTable", "margin_table", "LargestVoid", "largest_pd_free_void", "DesignMargin", "design_margin",
           "SQRT3"]

SQRT3 = math.sqrt(3.0)  #: test factor √3·U0, common practice in routine PD tests of extruded cables

_UNITS = {
    "void.size": "m", "void.diameter": "m", "void.height": "m", "void.pressure": "Pa", "void.temperature": "K",
    "insulation.thickness": "m", "insulation.permittivity": "-", "model.residual_ratio": "-",
    "void.inception_length": "m",
}


@dataclass(frozen=True, eq=False)
class MarginTable:
    """Inception and extinction voltage along one swept input.

    Attributes
    ----------
    parameter : str
        dotted name ("void.size" = diameter at the scenario's aspect ratio).
    unit : str
        SI unit of ``values``.
    values : numpy.ndarray
        swept values [unit].
    inception_voltage, extinction_voltage : numpy.ndarray
        applied rms voltages [V]; NaN where the combination is impossible.
    test_voltage : float or None
        the test level [V rms] or None.
    margin : numpy.ndarray or None
        inception_voltage / test_voltage [-] (None without a test level).
    errors : tuple[str, ...]
        the InputError message per value ("" where fine).
    inception_low, inception_high : numpy.ndarray or None
        per value, the lower and upper end of the inception band: the smaller and the larger inception voltage
        of the two criteria (streamer formula, at both ends of the quoted spread of its (E/p)_cr where the gas
        gives one, and ionisation integral; one criterion where the other is not available) [V rms]. None for
        tables built without them.
    notes : tuple[str, ...]
        per value, the validity warnings of its closed-form coefficients joined by "; " ("" where none). The
        table issues one :class:`~pdvoid.core.validity.ValidityWarning` naming how many rows have notes.
    """

    parameter: str
    unit: str
    values: np.ndarray
    inception_voltage: np.ndarray
    extinction_voltage: np.ndarray
    test_voltage: float | None
    margin: np.ndarray | None
    errors: tuple[str, ...]
    notes: tuple[str, ...] = ()
    inception_low: np.ndarray | None = None
    inception_high: np.ndarray | None = None

    def as_rows(self) -> list[dict[str, float]]:
        """The table as rows with SI units in the keys (for printing, JSON or a DataFrame).

        Returns
        -------
        list of dict of str to float
            One row per value: ``{"<parameter> [<unit>]", "inception voltage [V rms]",
            "extinction voltage [V rms]"}`` and, with a test level, ``"margin to test level [-]"``.
        """
        rows = []
        for i, v in enumerate(self.values):
            row = {f"{self.parameter} [{self.unit}]": float(v),
                   "inception voltage [V rms]": float(self.inception_voltage[i]),
                   "extinction voltage [V rms]": float(self.extinction_voltage[i])}
            if self.margin is not None:
                row["margin to test level [-]"] = float(self.margin[i])
            rows.append(row)
        return rows


def _check_parameter(scenario: Scenario, parameter: object) -> None:
    numeric = {f"{part}.{f.name}" for part in ("insulation", "void", "model")
               for f in fields(getattr(scenario, part))
               if isinstance(getattr(getattr(scenario, part), f.name), float)}
    numeric |= {"void.size", "supply.frequency"}
    if not isinstance(parameter, str) or parameter not in numeric:
        raise InputError(f"parameter must be one of {sorted(numeric)}; got {parameter!r}")


def _changed(scenario: Scenario, parameter: str, value: float) -> Scenario:
    if parameter == "void.size":
        aspect = scenario.void.height / scenario.void.diameter
        return scenario.replace(**{"void.diameter": value, "void.height": value * aspect})
    return scenario.replace(**{parameter: value})


def _noted_coefficients(scenario: Scenario) -> tuple[Coefficients, tuple[str, ...]]:
    """Coefficients of ``scenario`` with the validity warnings they raise collected rather than issued (the
    searches below try voids outside the closed forms' range that are not part of the answer)."""
    with collect_validity_notes() as notes:
        c = compute_coefficients(scenario)
    return c, tuple(notes)


def margin_table(scenario: Scenario, parameter: str = "void.size", values: ArrayLike | None = None,
                 test_voltage: float | None = None) -> MarginTable:
    """Inception and extinction voltage of ``scenario`` as ``parameter`` takes ``values``.

    Parameters
    ----------
    scenario : Scenario
        the base scenario.
    parameter : str
        a dotted scenario field ("void.pressure", "insulation.permittivity", ...) or "void.size"
        (the diameter, with the height following at the scenario's aspect ratio).
    values : array_like or None
        the values [SI]; default 25 sizes from 0.1 to 5 mm (log-spaced) for "void.size".
    test_voltage : float or None
        the test level [V rms] for the margin column.

    Returns
    -------
    MarginTable
        Inception and extinction voltage per value [V rms] (NaN where the combination is impossible, with the
        reason in ``errors``), and the margin when ``test_voltage`` is given.

    Raises
    ------
    InputError
        For a bad scenario, an unknown parameter, missing or bad values, or a test voltage <= 0.
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    _check_parameter(scenario, parameter)
    if values is None:
        if parameter != "void.size":
            raise InputError(f"values are needed for parameter {parameter!r}")
        values = np.geomspace(0.1e-3, 5e-3, 25)
    vals = check_array("values", values, min_size=1, max_size=100_000)
    if test_voltage is not None:
        test_voltage = check_positive("test_voltage", test_voltage, "V")
    inc = np.full(vals.size, np.nan)
    ext = np.full(vals.size, np.nan)
    low = np.full(vals.size, np.nan)
    high = np.full(vals.size, np.nan)
    errors = []
    notes = []
    for i, v in enumerate(vals):
        try:
            c, row_notes = _noted_coefficients(_changed(scenario, parameter, float(v)))
        except InputError as exc:  # an impossible combination (e.g. a void taller than the insulation)
            errors.append(str(exc))
            notes.append("")
            continue
        notes.append("; ".join(row_notes))
        inc[i], ext[i] = c.inception_voltage, c.extinction_voltage
        row_band = band_from_coefficients(c)
        low[i], high[i] = row_band.low, row_band.high
        errors.append("")
    margin = inc / test_voltage if test_voltage is not None else None
    flagged = sum(1 for n in notes if n)
    if flagged:
        warn_validity(f"{flagged} of {vals.size} rows of the margin table rest on closed forms outside their "
                      "verified range (MarginTable.notes says which and why)")
    return MarginTable(parameter=parameter, unit=_UNITS.get(parameter, "SI"), values=vals, inception_voltage=inc,
                       extinction_voltage=ext, test_voltage=test_voltage, margin=margin, errors=tuple(errors),
                       notes=tuple(notes), inception_low=low, inception_high=high)


@dataclass(frozen=True)
class LargestVoid:
    """The largest discharge-free void at a test level, at the scenario's aspect ratio.

    Attributes
    ----------
    diameter, height : float
        of that void [m].
    inception_voltage : float
        its inception voltage [V rms] (= the test voltage unless limited).
    limited_by : str
        "" when the inception voltage equals the test voltage; "insulation" when even a void half as
        tall as the insulation stays discharge-free (the closed forms are not valid beyond); "smallest" when
        even a 1 µm void would discharge.
    notes : tuple[str, ...]
        validity warnings of the closed-form coefficients of that void (also issued as a
        :class:`~pdvoid.core.validity.ValidityWarning`); the trial voids of the search issue none.
    """

    diameter: float
    height: float
    inception_voltage: float
    limited_by: str
    notes: tuple[str, ...] = ()


def largest_pd_free_void(scenario: Scenario, test_voltage: float) -> LargestVoid:
    """The void diameter (at the scenario's aspect ratio) whose analytic inception voltage equals
    ``test_voltage``: every smaller void of that shape stays discharge-free at the test level.

    The inception voltage falls monotonically with size at fixed shape (the breakdown field of the gas falls
    with the gap length in the streamer and the Townsend regime alike, and the field enhancement stays), so the
    root is unique; Brent's method on log(size). Voids too small for a self-sustained discharge (infinite
    inception voltage) count as discharge-free.

    Parameters
    ----------
    scenario : Scenario
        The design; its void's aspect ratio is kept [-].
    test_voltage : float
        The test level [V rms], > 0.

    Returns
    -------
    LargestVoid
        Diameter and height of that void [m], its inception voltage [V rms] and what limited the search.

    Raises
    ------
    InputError
        For a test voltage <= 0.
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    test_voltage = check_positive("test_voltage", test_voltage, "V")
    host_note = warn_host_strength(scenario.insulation, test_voltage * supply_peak_factor(scenario.supply),
                                   "at the test level")
    aspect = scenario.void.height / scenario.void.diameter
    # the closed forms need a void small compared with the insulation: search up to half its thickness (in a
    # coaxial insulation: up to the distance from the void centre to the nearer conductor)
    d_max = min(0.5 * proximity_thickness(scenario.insulation, scenario.void) / aspect, 1.0)
    # the smallest void Void accepts (diameter and height >= 0.1 µm), with a margin against rounding in d·aspect
    d_min = max(1e-6, 1e-7 / min(aspect, 1.0)) * (1.0 + 1e-9)

    def u_inc(d: float) -> float:
        return _noted_coefficients(_changed(scenario, "void.size", d))[0].inception_voltage

    def answer(d: float, limited_by: str) -> LargestVoid:
        c, notes = _noted_coefficients(_changed(scenario, "void.size", d))
        if host_note is not None:  # said once, at the test level
            notes = tuple(n for n in notes if HOST_STRENGTH_MARK not in n) + (host_note,)
        for note in notes:
            if HOST_STRENGTH_MARK not in note:
                warn_validity(note)
        return LargestVoid(d, d * aspect, c.inception_voltage, limited_by, notes)

    hi_u, lo_u = u_inc(d_min), u_inc(d_max)
    if lo_u >= test_voltage:
        return answer(d_max, "insulation")
    if hi_u <= test_voltage:
        return answer(d_min, "smallest")
    big = 1e6 * test_voltage  # stands in for an infinite inception voltage, so that Brent's steps stay finite

    def excess(lx: float) -> float:
        return min(u_inc(math.exp(lx)), big) - test_voltage

    x = brentq(excess, math.log(d_min), math.log(d_max), xtol=1e-12, rtol=1e-13)
    return answer(math.exp(x), "")


@dataclass(frozen=True)
class DesignMargin:
    """Margin of a design against a test level given as a multiple of the nominal voltage.

    Attributes
    ----------
    nominal_voltage, test_voltage, inception_voltage, extinction_voltage : float
        [V rms].
    test_factor : float
        test_voltage / nominal_voltage [-].
    margin : float
        inception_voltage / test_voltage [-] (> 1: discharge-free at the test level).
    extinction_margin : float
        extinction_voltage / nominal_voltage [-] (> 1: discharges started by a transient die
        out at the nominal voltage).
    largest_void_diameter : float
        the largest discharge-free void at the test level, at the scenario's shape [m].
    """

    nominal_voltage: float
    test_voltage: float
    test_factor: float
    inception_voltage: float
    extinction_voltage: float
    margin: float
    extinction_margin: float
    largest_void_diameter: float


def design_margin(scenario: Scenario, nominal_voltage: float, test_factor: float = SQRT3) -> DesignMargin:
    """Margin of ``scenario`` against a test at ``test_factor`` × ``nominal_voltage``.

    The default √3 ≈ 1.73 × U0 is common practice in routine PD tests of extruded cables (the applicable
    standard rules).

    Parameters
    ----------
    scenario : Scenario
        The design [-].
    nominal_voltage : float
        Nominal (service) voltage U0 [V rms], > 0.
    test_factor : float
        Test level / nominal voltage [-], > 0.

    Returns
    -------
    DesignMargin
        Voltages [V rms], margins [-] and the largest discharge-free void at the test level [m].

    Raises
    ------
    InputError
        For a nominal voltage or test factor <= 0.
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    nominal_voltage = check_positive("nominal_voltage", nominal_voltage, "V")
    test_factor = check_positive("test_factor", test_factor)
    c = compute_coefficients(scenario)
    u_test = nominal_voltage * test_factor
    lv = largest_pd_free_void(scenario, u_test)
    return DesignMargin(
        nominal_voltage=nominal_voltage, test_voltage=u_test, test_factor=test_factor,
        inception_voltage=c.inception_voltage, extinction_voltage=c.extinction_voltage,
        margin=c.inception_voltage / u_test, extinction_margin=c.extinction_voltage / nominal_voltage,
        largest_void_diameter=lv.diameter,
    )
