"""What every void model's parameters share (the start-electron supply and the discharge rule), and the registry
that maps a model's ``kind`` (as written in scenario files) to its class.

A model lives in one module of :mod:`pdvoid.models`: a frozen dataclass derived from :class:`ModelParameters`,
decorated with :func:`register_model`. Nothing below the models stage names a concrete model; the coefficients
stage reads only the class attributes and methods declared here.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import ClassVar, TypeVar

from pdvoid.core.errors import InputError, check_bool, check_choice, check_nonnegative, check_range

__all__ = ["ModelParameters", "register_model", "unregister_model", "model_class", "model_kinds", "default_model"]

INCEPTION_CRITERIA = ("streamer", "ionization_integral")


def _set(obj: object, name: str, value: object) -> None:
    object.__setattr__(obj, name, value)


@dataclass(frozen=True)
class ModelParameters:
    """Parameters every void model shares: the residual field, the inception criterion and the start-electron
    supply. A concrete model derives from this class (see :class:`pdvoid.FieldModel`).

    Attributes
    ----------
    residual_ratio : float
        E_res / E_inc [-], in [0, 1). Default 0.25: a typical fitted value, not a published constant (the
        residual field is a free parameter in fitted models; physics brief §3.2, from memory).
    lag_free : bool
        True for unlimited start electrons (a discharge exactly when |E_v| reaches E_inc).
    ionization_rate : float
        G, ion pairs per m³ per s at 101325 Pa and 293.15 K [1/(m³ s)]. Default 1e7 (about 10 per cm³ per s near
        ground over land; Hess, Compendium of Meteorology 1951, confirmed).
    electron_yield : float
        η, fraction of ion pairs that yields a free start electron [-]. Default 1.
    surface_rate_same : float
        N_s when the pending discharge repeats the last polarity [1/s]. Default 1e4: an illustrative value that
        gives a few discharges per cycle in mm-size voids, not fitted to any measurement (such rates are fitted
        per case in the literature, e.g. Illias, Chen & Lewin 2011).
    surface_rate_reversed : float
        N_s when the polarity reverses [1/s]. Default 3e3 (illustrative; lower than surface_rate_same as the
        memory rule of Illias, Chen & Lewin 2011 requires).
    surface_decay_time : float
        τ_s of the surface emission after a discharge [s]. Default 20 ms (illustrative).
    field_assisted : bool
        Multiply the surface rate by exp(|E_v|/E_inc) (Illias, Chen & Lewin 2011).
    charge_decay_time : float
        τ_q of the deposited charge's field [s]; inf for no decay.
    inception_criterion : str
        ``"streamer"`` (the streamer-inception formula, default) or ``"ionization_integral"`` (the
        effective-ionisation integral reaching K over the void height).
    cathode_emission_rate : float
        Extra start electrons [1/s] when the void lies on an electrode and the metal wall is the cathode of the
        pending discharge (electrons from the metal). Default 0; illustrative values are hundreds to thousands
        per second.
    kind : str
        The model's name in scenario files (``[model] kind = ...``); set by each concrete model.
    title : str
        A plain description for reports and the workbench.
    caveat : str
        What the model's default values rest on, in plain words, shown next to its results by the command line
        and the review pack.
    gain_from_network : bool
        True when the model's void quantity follows the three-capacitance ratio k (void field per applied volt
        k/h) rather than the field enhancement (f/d).
    field_units : dict
        Field name to (dimension, SI unit) for scenario files; a model with fields of its own extends it.
    """

    kind: ClassVar[str] = ""
    title: ClassVar[str] = ""
    caveat: ClassVar[str] = (
        "the start-electron supply (volume ionisation rate, surface emission rates and their decay) uses "
        "illustrative values unless the scenario sets them; fit them to a measured pattern (pdvoid fit) before "
        "reading discharge counts or magnitudes quantitatively"
    )
    gain_from_network: ClassVar[bool] = False
    #: field name -> (dimension, SI unit) for scenario files; dimension None for text, flags and lists
    field_units: ClassVar[dict[str, tuple[str | None, str]]] = {
        "residual_ratio": ("dimensionless", ""), "lag_free": (None, ""),
        "ionization_rate": ("rate density", "1/(m3 s)"), "electron_yield": ("dimensionless", ""),
        "surface_rate_same": ("rate", "1/s"), "surface_rate_reversed": ("rate", "1/s"),
        "surface_decay_time": ("time", "s"), "field_assisted": (None, ""),
        "charge_decay_time": ("time", "s"), "inception_criterion": (None, ""),
        "cathode_emission_rate": ("rate", "1/s"),
    }

    residual_ratio: float = 0.25
    lag_free: bool = False
    ionization_rate: float = 1.0e7
    electron_yield: float = 1.0
    surface_rate_same: float = 1.0e4
    surface_rate_reversed: float = 3.0e3
    surface_decay_time: float = 20e-3
    field_assisted: bool = False
    charge_decay_time: float = math.inf
    inception_criterion: str = "streamer"
    cathode_emission_rate: float = 0.0

    def __post_init__(self) -> None:
        check_choice("model.inception_criterion", self.inception_criterion, INCEPTION_CRITERIA)
        _set(self, "residual_ratio", check_range("model.residual_ratio", self.residual_ratio, 0.0, 1.0,
                                                 high_open=True))
        check_bool("model.lag_free", self.lag_free)
        check_bool("model.field_assisted", self.field_assisted)
        _set(self, "ionization_rate", check_nonnegative("model.ionization_rate", self.ionization_rate,
                                                        "ion pairs/(m³ s)"))
        _set(self, "electron_yield", check_range("model.electron_yield", self.electron_yield, 0.0, 1.0))
        _set(self, "surface_rate_same", check_nonnegative("model.surface_rate_same", self.surface_rate_same, "1/s"))
        _set(self, "surface_rate_reversed",
             check_nonnegative("model.surface_rate_reversed", self.surface_rate_reversed, "1/s"))
        _set(self, "surface_decay_time", check_range("model.surface_decay_time", self.surface_decay_time, 0.0,
                                                     math.inf, low_open=True, unit="s", allow_inf=True))
        _set(self, "cathode_emission_rate",
             check_nonnegative("model.cathode_emission_rate", self.cathode_emission_rate, "1/s"))
        _set(self, "charge_decay_time", check_range("model.charge_decay_time", self.charge_decay_time, 0.0,
                                                    math.inf, low_open=True, unit="s", allow_inf=True))

    def assumptions(self) -> tuple[str, str]:
        """What the model assumes about the residual field and the start electrons, in plain words (the review
        pack's assumptions page); a model with other rules overrides it.

        Returns
        -------
        tuple of str
            The residual-field sentence and the start-electron sentence [-].
        """
        return (
            f"The residual field E_res = {self.residual_ratio:g}·E_inc is a model parameter, not a measured "
            "constant; it sets the charge per discharge and the extinction estimate.",
            "Start electrons: volume ionisation and surface emission rates are illustrative unless fitted to "
            "measurements. The statistical time lag makes an observed inception voltage higher and scattered; a "
            "short test can miss a void entirely.",
        )

    def network_capacitances(self) -> tuple[float, float] | None:
        """(C_c, C_b) the model prescribes instead of the geometry's, or None [F].

        Returns
        -------
        tuple of float or None
            None unless the model carries capacitances of its own.
        """
        return None


_REGISTRY: dict[str, type[ModelParameters]] = {}
M = TypeVar("M", bound=type[ModelParameters])


def register_model(cls: M) -> M:
    """Register a model class under its ``kind`` (a class decorator).

    Parameters
    ----------
    cls : type
        A frozen dataclass derived from :class:`ModelParameters` with a non-empty ``kind``.

    Returns
    -------
    type
        ``cls`` itself.
    """
    if not (isinstance(cls, type) and issubclass(cls, ModelParameters)):
        raise InputError(f"a model must derive from ModelParameters; got {cls!r}")
    kind = cls.kind
    if not isinstance(kind, str) or not kind.isidentifier():
        raise InputError(f"a model's kind must be a plain name; got {kind!r}")
    if kind in _REGISTRY and _REGISTRY[kind] is not cls:
        raise InputError(f"a model of kind {kind!r} is registered already ({_REGISTRY[kind].__name__})")
    _REGISTRY[kind] = cls
    return cls


def unregister_model(kind: str) -> type[ModelParameters]:
    """Remove the model registered under ``kind`` from the registry (for tests and interactive sessions).

    Parameters
    ----------
    kind : str
        A registered kind (see :func:`model_kinds`).

    Returns
    -------
    type
        The class that was registered under ``kind``.

    Raises
    ------
    pdvoid.InputError
        For an unknown kind, naming the kinds there are.
    """
    cls = model_class(kind)
    del _REGISTRY[kind]
    return cls


def model_kinds() -> tuple[str, ...]:
    """The registered model kinds, in registration order.

    Returns
    -------
    tuple of str
        E.g. ``("field", "network")``.
    """
    return tuple(_REGISTRY)


def model_class(kind: object) -> type[ModelParameters]:
    """The model class registered under ``kind``.

    Parameters
    ----------
    kind : object
        A registered kind (see :func:`model_kinds`); anything else (also a non-string from a file) raises.

    Returns
    -------
    type
        The model's class.

    Raises
    ------
    pdvoid.InputError
        For an unknown kind, naming the kinds there are.
    """
    if not isinstance(kind, str) or kind not in _REGISTRY:
        raise InputError(f"model.kind must be one of {', '.join(map(repr, _REGISTRY))}; got {kind!r}")
    return _REGISTRY[kind]


def default_model() -> ModelParameters:
    """A model with default parameters: the field model (the first registered kind).

    Returns
    -------
    ModelParameters
        An instance of the first registered model class.
    """
    if not _REGISTRY:
        raise InputError("no void model is registered (import pdvoid to register the built-in models)")
    return next(iter(_REGISTRY.values()))()
