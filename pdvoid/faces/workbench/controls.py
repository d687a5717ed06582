"""The workbench's control values as plain data (display units carried in the names), and their translation to
and from a :class:`pdvoid.Scenario`. No widgets here: the widget layer builds one widget per :data:`SPECS`
entry.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, fields, replace
from typing import Any

from pdvoid.core.errors import InputError, check_bool, check_choice, check_int, check_real
from pdvoid.inputs.coaxial import Coaxial
from pdvoid.inputs.materials import get_material, list_materials
from pdvoid.inputs.model_parameters import model_class, model_kinds
from pdvoid.inputs.model_sets import get_parameter_set, list_parameter_sets, model_from_set
from pdvoid.inputs.parameters import GASES, Insulation, Periodic, Sine, check_seed
from pdvoid.inputs.scenario import Scenario

__all__ = ["Controls", "ControlSpec", "SPECS", "GROUPS", "CUSTOM_MATERIAL", "PANEL_VALUES", "MAX_CYCLES",
           "NETWORK_CONTROLS", "parse_whole_number"]

CUSTOM_MATERIAL = "(custom permittivity)"  #: the material choice that means "permittivity as typed"
PANEL_VALUES = "(panel values)"  #: the parameter-set choice that means "the model parameters as typed"
MAX_CYCLES = 10_000_000  #: most cycles one workbench run may ask for [-]

_MM, _KPA, _KV, _MS, _PF = 1e-3, 1e3, 1e3, 1e-3, 1e-12
#: the controls that only the network model reads
NETWORK_CONTROLS = ("network_from_geometry", "capacitance_void_pF", "capacitance_series_pF")
_WHOLE = re.compile(r"[+-]?\d+")


def parse_whole_number(label: str, text: object, low: int, high: int) -> int:
    """A whole number typed into the panel: digits only (spaces and ``_`` between digit groups allowed), inside
    [low, high]. "1.5", "1e3" or "ten" are refused, never rounded or stripped to digits.

    Parameters
    ----------
    label : str
        The control's name as the panel shows it, for the message [-].
    text : object
        What was typed (a str; an int is accepted as is) [-].
    low, high : int
        Inclusive bounds [-].

    Returns
    -------
    int
        The number [-].

    Raises
    ------
    InputError
        Naming the control, what was typed and what is allowed.
    """
    allowed = f"a whole number from {low} to {high}"
    if isinstance(text, bool) or not isinstance(text, (str, int)):
        raise InputError(f"{label} must be {allowed}; got {text!r}")
    raw = text if isinstance(text, int) else None
    if raw is None:
        assert isinstance(text, str)
        cleaned = re.sub(r"(?<=\d)[ _](?=\d)", "", text.strip())
        if not _WHOLE.fullmatch(cleaned):
            raise InputError(f"{label} must be {allowed}; got {text.strip()!r} (not a whole number)")
        raw = int(cleaned)
    if not low <= raw <= high:
        raise InputError(f"{label} must be {allowed}; got {raw}")
    return raw


@dataclass(frozen=True)
class ControlSpec:
    """How one control is shown: label with unit, widget kind, for sliders range and step, and a longer
    explanation shown when the pointer rests on it.

    Attributes
    ----------
    label : str
        The label, with the display unit in brackets [-].
    kind : str
        "slider" (float), "number" (free float entry), "int", "choice" or "bool" [-].
    low, high, step : float or None
        Range and step of a slider [display unit]; None for other kinds.
    choices : tuple of str
        The options of a "choice" [-].
    tooltip : str
        The longer explanation [-].
    """

    label: str
    kind: str
    low: float | None = None
    high: float | None = None
    step: float | None = None
    choices: tuple[str, ...] = ()
    tooltip: str = ""


SPECS: dict[str, ControlSpec] = {
    "diameter_mm": ControlSpec(
        "void diameter [mm]", "slider", 0.05, 10.0, 0.05,
        tooltip="size of the void across the applied field (drag, or type a value into the box beside)"),
    "height_mm": ControlSpec(
        "void height [mm]", "slider", 0.05, 10.0, 0.05,
        tooltip="size of the void along the applied field; it must be smaller than the insulation thickness"),
    "gas": ControlSpec("gas in the void", "choice", choices=GASES, tooltip="the gas filling the void"),
    "pressure_kPa": ControlSpec(
        "gas pressure [kPa]", "slider", 1.0, 1000.0, 0.5,
        tooltip="absolute gas pressure in the void; 101.325 kPa is one atmosphere"),
    "material": ControlSpec(
        "host material", "choice", choices=(CUSTOM_MATERIAL, *list_materials()),
        tooltip="the solid insulation around the void; choosing one sets its permittivity"),
    "permittivity": ControlSpec(
        "relative permittivity [-]", "number",
        tooltip="relative permittivity of the host insulation; typing a value switches the material to custom"),
    "thickness_mm": ControlSpec(
        "insulation thickness [mm]", "number", tooltip="distance between the electrodes through the insulation"),
    "voltage_kV": ControlSpec(
        "applied voltage [kV rms]", "slider", 0.5, 100.0, 0.1,
        tooltip="rms value of the applied AC voltage (drag, or type a value into the box beside)"),
    "frequency_Hz": ControlSpec("frequency [Hz]", "number", tooltip="frequency of the applied voltage"),
    "model": ControlSpec(
        "void model", "choice", choices=model_kinds(),
        tooltip="field: Pedersen's induced charge; network: the three-capacitance circuit (its capacitances "
                "below); memory: wall memory of earlier discharges"),
    "network_from_geometry": ControlSpec(
        "C_c and C_b from the geometry", "bool",
        tooltip="network model: take the capacitances from the void and insulation geometry (then the pattern "
                "equals the field model's, by construction); untick to type C_c and C_b"),
    "capacitance_void_pF": ControlSpec(
        "void capacitance C_c [pF]", "number",
        tooltip="network model: capacitance of the void itself (C_c); used when 'from the geometry' is unticked"),
    "capacitance_series_pF": ControlSpec(
        "series capacitance C_b [pF]", "number",
        tooltip="network model: capacitance of the sound insulation in series with the void (C_b); used when "
                "'from the geometry' is unticked"),
    "parameter_set": ControlSpec(
        "parameter set", "choice", choices=(PANEL_VALUES, *list_parameter_sets()),
        tooltip="a named set of model parameters, each value with its source (pdvoid.cite lists them); the set "
                "must be for the chosen model; its values replace the panel's model parameters except volume "
                "ionisation and 'no time lag'"),
    "residual_ratio": ControlSpec(
        "residual / inception [-]", "number",
        tooltip="residual field after a discharge divided by the inception field, 0 to < 1"),
    "ionization_rate": ControlSpec(
        "volume ionisation [1/(m³ s)]", "number",
        tooltip="effective volume ionisation rate: ion pairs per m³ per s at 1 atm and 20 °C"),
    "surface_rate_same": ControlSpec(
        "surface, same [1/s]", "number",
        tooltip="surface emission rate when the next discharge repeats the polarity of the last one"),
    "surface_rate_reversed": ControlSpec(
        "surface, reversed [1/s]", "number",
        tooltip="surface emission rate when the next discharge reverses the polarity of the last one"),
    "surface_decay_time_ms": ControlSpec(
        "surface decay time [ms]", "number",
        tooltip="decay time of the surface emission after a discharge"),
    "field_assisted": ControlSpec(
        "field-assisted surface emission", "bool",
        tooltip="multiply the surface emission rate by exp(|E_void| / E_inception)"),
    "lag_free": ControlSpec(
        "no time lag (unlimited electrons)", "bool",
        tooltip="a discharge exactly when the void field reaches the inception field"),
    "cycles": ControlSpec(
        "cycles [-]", "int", tooltip="AC cycles per run, a whole number from 1 to 10000000"),
    "seed": ControlSpec(
        "seed [-]", "int",
        tooltip="seed of the random numbers, a whole number from 0 to 4294967295; the same seed repeats a run"),
    "test_voltage_kV": ControlSpec(
        "test level [kV rms]", "number", tooltip="the test voltage the margin U_inc / U_test refers to"),
}

#: the controls in the order and groups the panel shows them
GROUPS: dict[str, tuple[str, ...]] = {
    "void": ("diameter_mm", "height_mm", "gas", "pressure_kPa"),
    "insulation": ("material", "permittivity", "thickness_mm"),
    "supply and run": ("voltage_kV", "frequency_Hz", "model", "network_from_geometry", "capacitance_void_pF",
                       "capacitance_series_pF", "parameter_set", "cycles", "seed", "test_voltage_kV"),
    "model parameters": (
        "residual_ratio",
        "ionization_rate",
        "surface_rate_same",
        "surface_rate_reversed",
        "surface_decay_time_ms",
        "field_assisted",
        "lag_free",
    ),
}


@dataclass(frozen=True)
class Controls:
    """Every value the workbench panel shows, in the display unit its name carries.

    Build one from a scenario with :meth:`from_scenario`; :meth:`to_scenario` turns it back into a Scenario,
    raising :class:`pdvoid.InputError` for impossible values or combinations (e.g. a void taller than the
    insulation). Inputs the panel does not show (temperature, shape, harmonics, charge decay, ...) are kept
    from the base scenario.

    Attributes
    ----------
    diameter_mm, height_mm : float
        Void diameter (across the field) and height (along the field) [mm].
    gas : str
        Gas in the void, one of :data:`pdvoid.inputs.parameters.GASES` [-].
    pressure_kPa : float
        Gas pressure [kPa].
    material : str
        Host material, or :data:`CUSTOM_MATERIAL` for a typed permittivity [-].
    permittivity : float
        Relative permittivity of the host [-].
    thickness_mm : float
        Insulation thickness [mm].
    voltage_kV : float
        Applied voltage [kV rms].
    frequency_Hz : float
        Supply frequency [Hz].
    model : str
        Void model kind [-].
    network_from_geometry : bool
        Network model: the capacitances C_c and C_b from the geometry (True) or as typed (False) [-].
    capacitance_void_pF, capacitance_series_pF : float
        Network model: C_c of the void and C_b of the insulation in series with it; with
        ``network_from_geometry`` they show the geometry's values after a run (0 before the first) [pF].
    parameter_set : str
        A parameter set for that model (:func:`pdvoid.inputs.model_sets.list_parameter_sets`), or
        :data:`PANEL_VALUES` for the model parameters as shown [-].
    residual_ratio : float
        Residual field / inception field [-].
    ionization_rate : float
        Volume ionisation rate [1/(m³ s)].
    surface_rate_same, surface_rate_reversed : float
        Surface emission rates for the same and the reversed polarity [1/s].
    surface_decay_time_ms : float
        Decay time of the surface emission [ms].
    field_assisted : bool
        Field-assisted surface emission [-].
    lag_free : bool
        No statistical time lag [-].
    cycles : int
        Cycles per run [-].
    seed : int
        Random seed [-].
    test_voltage_kV : float
        Test level for the margin [kV rms].
    """

    diameter_mm: float = 1.5
    height_mm: float = 1.5
    gas: str = "air"
    pressure_kPa: float = 101.325
    material: str = CUSTOM_MATERIAL
    permittivity: float = 4.2
    thickness_mm: float = 6.0
    voltage_kV: float = 18.0
    frequency_Hz: float = 50.0
    model: str = "field"
    network_from_geometry: bool = True
    capacitance_void_pF: float = 0.0
    capacitance_series_pF: float = 0.0
    parameter_set: str = PANEL_VALUES
    residual_ratio: float = 0.25
    ionization_rate: float = 1e9
    surface_rate_same: float = 1e4
    surface_rate_reversed: float = 3e3
    surface_decay_time_ms: float = 20.0
    field_assisted: bool = False
    lag_free: bool = False
    cycles: int = 200
    seed: int = 1
    test_voltage_kV: float = 18.0

    @classmethod
    def from_scenario(
        cls, scenario: Scenario, *, cycles: int = 200, seed: int = 1, test_voltage: float | None = None
    ) -> Controls:
        """The controls showing ``scenario``.

        Parameters
        ----------
        scenario : Scenario
            The scenario shown [-].
        cycles : int
            Cycles per run [-].
        seed : int
            Random seed [-].
        test_voltage : float, optional
            Test level; None: the applied voltage [V rms].

        Returns
        -------
        Controls
            The control values.

        Raises
        ------
        InputError
            For anything but a Scenario.
        """
        if not isinstance(scenario, Scenario):
            raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
        ins, void, sup, mod = scenario.insulation, scenario.void, scenario.periodic_supply, scenario.model
        if ins.permittivity is None:  # Insulation always sets it (from its material when not given)
            raise InputError("scenario.insulation.permittivity is not set")
        material = ins.material if ins.material in SPECS["material"].choices else CUSTOM_MATERIAL
        caps = mod.network_capacitances()
        return cls(
            diameter_mm=void.diameter / _MM,
            height_mm=void.height / _MM,
            gas=void.gas,
            pressure_kPa=void.pressure / _KPA,
            material=material,
            permittivity=float(ins.permittivity),
            thickness_mm=ins.thickness / _MM,
            voltage_kV=sup.rms / _KV,
            frequency_Hz=sup.frequency,
            model=mod.kind,
            network_from_geometry=caps is None,
            capacitance_void_pF=0.0 if caps is None else caps[0] / _PF,
            capacitance_series_pF=0.0 if caps is None else caps[1] / _PF,
            parameter_set=getattr(mod, "parameter_set", PANEL_VALUES),
            residual_ratio=mod.residual_ratio,
            ionization_rate=mod.ionization_rate,
            surface_rate_same=mod.surface_rate_same,
            surface_rate_reversed=mod.surface_rate_reversed,
            surface_decay_time_ms=mod.surface_decay_time / _MS,
            field_assisted=mod.field_assisted,
            lag_free=mod.lag_free,
            cycles=cycles,
            seed=seed,
            test_voltage_kV=(sup.rms if test_voltage is None else test_voltage) / _KV,
        )

    def changed(self, **values: Any) -> Controls:
        """A copy with some values changed.

        Parameters
        ----------
        **values : float, str or bool
            New values, named as the fields [display unit of each field].

        Returns
        -------
        Controls
            The changed copy.

        Raises
        ------
        InputError
            For unknown names.
        """
        known = {f.name for f in fields(self)}
        unknown = sorted(set(values) - known)
        if unknown:
            raise InputError(f"unknown workbench controls {unknown}; known: {', '.join(sorted(known))}")
        return replace(self, **values)

    def material_permittivity(self) -> float | None:
        """The permittivity of the chosen host material, or None for a custom permittivity.

        Returns
        -------
        float or None
            Relative permittivity [-].
        """
        if self.material == CUSTOM_MATERIAL:
            return None
        return float(get_material(self.material).permittivity)

    def to_scenario(self, base: Scenario) -> Scenario:
        """The scenario these controls describe, starting from ``base`` for everything the panel does not
        show.

        Parameters
        ----------
        base : Scenario
            Where the inputs the panel does not show come from [-].

        Returns
        -------
        Scenario
            The scenario (SI).

        Raises
        ------
        InputError
            Naming the control and the value for anything impossible.
        """
        check_choice("gas", self.gas, GASES)
        check_choice("model", self.model, model_kinds())
        check_choice("host material", self.material, SPECS["material"].choices)
        eps = check_real("relative permittivity", self.permittivity)
        material = self.material if self.material_permittivity() == eps else None
        thickness = check_real("insulation thickness", self.thickness_mm) * _MM
        ins: Insulation
        if isinstance(base.insulation, Coaxial):
            # a cable's wall: the inner radius is kept, the outer one follows the thickness shown
            cable = base.insulation
            same = math.isclose(thickness, cable.thickness, rel_tol=1e-12)
            outer = cable.outer_radius if same else cable.inner_radius + thickness
            ins = replace(cable, outer_radius=outer, permittivity=eps, material=material)
        else:
            ins = replace(base.insulation, thickness=thickness, permittivity=eps, material=material)
        void = replace(
            base.void,
            diameter=check_real("void diameter", self.diameter_mm) * _MM,
            height=check_real("void height", self.height_mm) * _MM,
            gas=self.gas,
            pressure=check_real("gas pressure", self.pressure_kPa) * _KPA,
        )
        rms = check_real("applied voltage", self.voltage_kV) * _KV
        freq = check_real("frequency", self.frequency_Hz)
        supply: Sine | Periodic
        if isinstance(base.supply, Periodic):
            scale = rms / base.supply.rms if base.supply.rms > 0 else math.nan
            supply = Periodic(base.supply.samples * scale, freq, base.supply.max_harmonic)
        else:
            harmonics = base.supply.harmonics if isinstance(base.supply, Sine) else ()
            supply = Sine(rms=rms, frequency=freq, harmonics=harmonics)
        shared = {
            f.name: getattr(base.model, f.name)
            for f in fields(base.model)
            if f.name in {g.name for g in fields(model_class(self.model))}
        }
        shared.update(
            residual_ratio=self.residual_ratio,
            ionization_rate=self.ionization_rate,
            surface_rate_same=self.surface_rate_same,
            surface_rate_reversed=self.surface_rate_reversed,
            surface_decay_time=check_real("surface emission decay time", self.surface_decay_time_ms) * _MS,
            field_assisted=self.field_assisted,
            lag_free=self.lag_free,
        )
        if "capacitance_void" in {g.name for g in fields(model_class(self.model))}:
            shared.update(self._network_capacitances())
        check_choice("parameter set", self.parameter_set, SPECS["parameter_set"].choices)
        if self.parameter_set == PANEL_VALUES:
            model = model_class(self.model)(**shared)
        else:
            made_for = get_parameter_set(self.parameter_set).model
            if made_for != self.model:
                raise InputError(f"parameter set {self.parameter_set!r} is for the {made_for} model; the void model "
                                 f"chosen is {self.model!r} (choose {made_for!r} or another set)")
            if base.model.kind == self.model and getattr(base.model, "parameter_set", None) == self.parameter_set:
                # the base scenario's own model from this set: keep its values (it may have changed some)
                model = replace(base.model, ionization_rate=self.ionization_rate, lag_free=self.lag_free)
            else:
                model = model_from_set(self.parameter_set, ionization_rate=self.ionization_rate,
                                       lag_free=self.lag_free)
        return Scenario(insulation=ins, void=void, supply=supply, model=model, name=base.name)

    def _network_capacitances(self) -> dict[str, float | None]:
        """The network model's capacitances: None (from the geometry) or the typed values, checked [F]."""
        if check_bool("C_c and C_b from the geometry", self.network_from_geometry):
            return {"capacitance_void": None, "capacitance_series": None}
        out: dict[str, float | None] = {}
        for key, label, value in (("capacitance_void", "void capacitance C_c", self.capacitance_void_pF),
                                  ("capacitance_series", "series capacitance C_b", self.capacitance_series_pF)):
            v = check_real(label, value)
            if v <= 0.0:
                raise InputError(f"{label} must be > 0 pF when the capacitances are not taken from the geometry; "
                                 f"got {v:g} pF (tick 'C_c and C_b from the geometry' or type a positive value)")
            out[key] = v * _PF
        return out

    def run_settings(self) -> tuple[int, int, float]:
        """The run settings, checked.

        Returns
        -------
        tuple of (int, int, float)
            (cycles [-], seed [-], test voltage [V rms]).

        Raises
        ------
        InputError
            For cycles outside 1 ... :data:`MAX_CYCLES`, a bad seed or a test level that is not positive.
        """
        cycles = check_int("cycles", self.cycles, 1, MAX_CYCLES)
        seed = check_seed(self.seed)
        test = check_real("test level", self.test_voltage_kV)
        if test <= 0.0:
            raise InputError(f"test level must be > 0 kV rms; got {test!r}")
        return cycles, seed, test * _KV
