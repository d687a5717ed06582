"""``pdvoid.fit``: one entry point for the two ways of fitting a void's physics to a measured pattern.

- ``method="search"`` (the default): the best values and an acceptance range from a global search,
  :func:`pdvoid.analysis.fit.fit`;
- ``method="posterior"``: a calibrated posterior with credible intervals and a posterior-predictive check,
  :func:`pdvoid.analysis.posterior.posterior`.
"""

from __future__ import annotations

from typing import Any

from pdvoid.analysis.fit import FitResult
from pdvoid.analysis.fit import fit as search_fit
from pdvoid.analysis.posterior import PosteriorResult, posterior
from pdvoid.core.errors import InputError
from pdvoid.inputs.scenario import Scenario

__all__ = ["fit", "METHODS"]

#: the fitting methods
METHODS = ("search", "posterior")


def fit(measured: Any, scenario: Scenario, vary: dict, *, method: str = "search",
        **options: Any) -> FitResult | PosteriorResult:
    """Fit the values of ``vary`` to a measured pattern, by search or as a posterior.

    Parameters
    ----------
    measured : Events, Result or PatternMatrix
        measured events (:func:`pdvoid.read_events`) or a count matrix with its observation time
        (:func:`pdvoid.read_pattern_matrix`); the search also takes a ready PatternSummary.
    scenario : Scenario
        the starting scenario (its other parameters stay fixed).
    vary : dict
        {dotted parameter: (low, high)} in SI.
    method : str
        "search" (:func:`pdvoid.analysis.fit.fit`: best values and acceptance ranges) or "posterior"
        (:func:`pdvoid.analysis.posterior.posterior`: samples, credible intervals, predictive check).
    **options
        the keyword arguments of the chosen method's function (see there); one that belongs to the other
        method is refused.

    Returns
    -------
    FitResult or PosteriorResult
        :class:`pdvoid.analysis.fit.FitResult` for "search", :class:`pdvoid.analysis.posterior.PosteriorResult`
        for "posterior".

    Raises
    ------
    InputError
        For an unknown method, an option of the other method, or any bad argument of the chosen one.
    """
    if not isinstance(method, str) or method not in METHODS:
        raise InputError(f"method must be one of {', '.join(repr(m) for m in METHODS)}; got {method!r}")
    func = search_fit if method == "search" else posterior
    allowed = set(func.__code__.co_varnames[:func.__code__.co_argcount + func.__code__.co_kwonlyargcount]) - {
        "measured", "scenario", "vary"}
    unknown = sorted(set(options) - allowed)
    if unknown:
        raise InputError(f"{', '.join(unknown)}: not an option of method={method!r}; its options are "
                         f"{', '.join(sorted(allowed))}")
    return func(measured, scenario, vary, **options)
