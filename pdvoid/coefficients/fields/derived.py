"""Coefficients for the fast discharge models, computed from the numerical field solution.

The fast models see geometry only through a few numbers: the field enhancement f (mean field in the void per
applied uniform field V/d), the apparent charge per unit drop of the in-void field, the void volume and network
capacitances. :func:`coefficients_for` computes them for any axisymmetric layout with one factorisation and
three solves:

1. λ, the weighting potential (1 V on the measuring electrode, 0 V on the other): gives f and, by Green's
   reciprocity, the charge induced by any free charge in the void;
2. the potential of a uniform axial "free polarisation" P deposited in the void (surface charge σ = P·n on the
   void wall, all electrodes earthed): gives the counter-field ΔE it sets up inside the void;
3. (the other electrode's unit potential, for the capacitance check).

The apparent charge per unit field drop is ``charge_per_field = |q(P) / ΔE(P)|``; for a spheroid far from the
electrodes it equals Pedersen's K εr ε0 Ω / d.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field, replace
from typing import TYPE_CHECKING, Any

import numpy as np

from pdvoid.coefficients.closed_form import compute_coefficients
from pdvoid.coefficients.coaxial import local_gap
from pdvoid.coefficients.fields.geometry import Region, RoundedCylinder, Spheroid
from pdvoid.coefficients.fields.layout import ELECTRODES, Layout, grid_for, specimen_layout
from pdvoid.coefficients.fields.maps import field_magnitude, region_mask
from pdvoid.coefficients.fields.solver import FieldSolver
from pdvoid.coefficients.record import Coefficients
from pdvoid.core.errors import InputError, check_bool, check_choice, check_positive, check_range
from pdvoid.core.validity import warn_validity
from pdvoid.inputs.coaxial import Coaxial
from pdvoid.physics.coaxial import coaxial_field_variation

if TYPE_CHECKING:
    from pdvoid.inputs.scenario import Scenario

__all__ = [
    "FieldSolution",
    "coefficients",
    "solve_scenario",
    "coefficients_from_solver",
    "coefficients_for",
    "void_region",
    "equivalent_depolarization",
    "peak_enhancement",
]

REFERENCES = ("pedersen1991", "crichton1989", "stratton1941", "mcallister2002")


@dataclass(frozen=True)
class FieldSolution:
    """Geometry coefficients of a void computed by the field solver (all SI, plain floats).

    Attributes
    ----------
    field_enhancement : float
        mean axial field in the void per applied uniform field V/d [-].
    charge_per_field : float
        apparent charge on the measuring electrode per unit drop of the mean in-void field,
        for a uniform free polarisation deposited in the void [C/(V/m)].
    void_volume : float
        void volume (the solver's quadrature of it) [m^3].
    depolarization : float
        equivalent depolarisation factor N with f = εr / (εr (1 − N) + N εg), εr the host
        permittivity at the void centre; NaN when εr equals the gas permittivity [-].
    counter_field_per_polarization : float
        mean axial in-void field set up by a unit uniform free polarisation,
        electrodes earthed (negative) [(V/m)/(C/m^2)].
    induced_charge_per_polarization : float
        charge induced on the measuring electrode by a unit uniform free
        polarisation, signed (negative for an upward P and the upper electrode) [C/(C/m^2)] = [m^2].
    capacitance : float
        capacitance between the electrodes of the modelled disc [F].
    capacitance_series : float
        equivalent three-capacitance C_b = charge_per_field / void_height [F].
    capacitance_void : float
        equivalent C_c from k = C_b/(C_b + C_c) = f·void_height/thickness [F] (NaN if k >= 1).
    capacitance_parallel : float
        equivalent C_a = capacitance − C_b C_c/(C_b + C_c) for the modelled disc [F].
    void_voltage_ratio : float
        k = f·void_height/thickness (physics brief §4: the field model equals the
        three-capacitance model with this k) [-].
    thickness : float
        electrode gap [m].
    void_height : float
        axial extent of the void [m].
    host_permittivity : float
        host relative permittivity at the void centre [-].
    gas_permittivity : float
        relative permittivity of the void gas [-].
    outer_radius : float
        radius of the modelled disc [m].
    measuring_electrode : str
        "high" or "ground" [-].
    grid_shape : tuple[int, int]
        (nr, nz) cells [-].
    smallest_spacing : tuple[float, float]
        smallest cell size (r, z) [m].
    unknowns : int
        size of the linear system [-].
    references : tuple[str, ...]
        bibliography keys (pdvoid.core.references) [-].
    """

    field_enhancement: float
    charge_per_field: float
    void_volume: float
    depolarization: float
    counter_field_per_polarization: float
    induced_charge_per_polarization: float
    capacitance: float
    capacitance_series: float
    capacitance_void: float
    capacitance_parallel: float
    void_voltage_ratio: float
    thickness: float
    void_height: float
    host_permittivity: float
    gas_permittivity: float
    outer_radius: float
    measuring_electrode: str
    grid_shape: tuple[int, int]
    smallest_spacing: tuple[float, float]
    unknowns: int
    references: tuple[str, ...] = field(default=REFERENCES)

    @property
    def volume(self) -> float:
        """Alias of ``void_volume`` (the name used by :class:`pdvoid.coefficients.closed_form.Coefficients`) [m^3]."""
        return self.void_volume

    @property
    def shape_factor(self) -> float:
        """Pedersen's K = 1/N of the equivalent depolarisation factor [-]."""
        return 1.0 / self.depolarization


def equivalent_depolarization(field_enhancement: float, permittivity: float, gas_permittivity: float = 1.0) -> float:
    """Depolarisation factor N of the ellipsoid with the same field enhancement f.

    Inverts f = εr / (εr + N (εg − εr)) (uniformly polarised ellipsoid): N = (εr/f − εr)/(εg − εr).

    Parameters
    ----------
    field_enhancement : float
        f [-], > 0.
    permittivity : float
        host relative permittivity εr [-].
    gas_permittivity : float, optional
        void relative permittivity εg [-].

    Returns
    -------
    float
        N [-]; NaN when εr == εg (f = 1 whatever the shape).

    References
    ----------
    stratton1941 (dielectric ellipsoid in a uniform field, from memory); crichton1989 (K = 1/N notation).
    Exact for ellipsoids far from electrodes; an equivalent value otherwise.
    """
    f = check_positive("field_enhancement", field_enhancement)
    er = check_range("permittivity", permittivity, 1.0, 1e6)
    eg = check_range("gas_permittivity", gas_permittivity, 1.0, 1e6)
    if er == eg:
        return math.nan
    return (er / f - er) / (eg - er)


def void_region(
    diameter: float, height: float, center: float, shape: str = "spheroid", rim_radius: float | None = None
) -> Region:
    """A void outline from plain parameters: "spheroid" or "cylinder" (with rounded rim).

    Parameters
    ----------
    diameter : float
        extent across the field [m].
    height : float
        extent along the field [m].
    center : float
        axial position of the centre above the ground electrode [m].
    shape : str, optional
        "spheroid" or "cylinder" [-].
    rim_radius : float, optional
        rounding radius of the cylinder rim, default height/2 (fully rounded edge) [m].

    Returns
    -------
    Region
        A :class:`Spheroid` or :class:`RoundedCylinder`.
    """
    check_choice("shape", shape, ("spheroid", "cylinder"))
    if shape == "spheroid":
        if rim_radius is not None:
            raise InputError("rim_radius applies to shape='cylinder' only")
        return Spheroid(diameter, height, center)
    rho = (
        0.5 * min(check_positive("height", height, "m"), check_positive("diameter", diameter, "m"))
        if rim_radius is None
        else rim_radius
    )
    return RoundedCylinder(diameter, height, center, rho)


def _primary(solver: FieldSolver, measuring_electrode: str) -> dict:
    """The solved quantities every coefficient derives from (floats)."""
    if not isinstance(solver, FieldSolver):
        raise InputError(f"solver must be a FieldSolver; got {type(solver).__name__}")
    check_choice("measuring_electrode", measuring_electrode, ELECTRODES)
    lay: Layout = solver.layout
    asm = solver.assembly
    if lay.void is None:
        raise InputError("the layout has no void; coefficients need one")
    if asm.void_volume <= 0.0 or not np.any(asm.polarization_source):
        raise InputError("the grid does not resolve the void; refine it")
    d = lay.thickness
    f = -d * solver.unit("high").void_mean_field()  # applied field of +1 V on top is -1/d along z
    src = asm.polarization_source  # load of a uniform axial free polarisation P = 1 C/m^2 [C]
    pol = solver.solve({}, charge=src, floating_charges=np.zeros(asm.n_floating))
    counter = pol.void_mean_field()  # [V/m per C/m^2]
    m = ELECTRODES.index(measuring_electrode)
    q = -float(solver.unit(measuring_electrode).unknowns @ src) - float(asm.polarization_deposit[m])
    if not counter < 0.0:
        raise InputError("the counter-field of the deposited charge is not negative: the void is not resolved")
    return {
        "f": float(f),
        "counter": float(counter),
        "q": q,
        "volume": float(asm.void_volume),
        "capacitance": float(solver.capacitance()),
    }


def _build(p: dict, solver: FieldSolver, measuring_electrode: str) -> FieldSolution:
    lay = solver.layout
    d = lay.thickness
    if lay.void is None:  # coefficients_for always builds a layout with a void
        raise InputError("the layout has no void; the coefficients need one")
    _, zlo, zhi = lay.void.bounds()
    height = min(zhi, d) - max(zlo, 0.0)
    zc = 0.5 * (max(zlo, 0.0) + min(zhi, d))
    host = float(
        Layout(d, lay.outer_radius, lay.permittivity, lay.dielectrics).permittivity_at(np.array(0.0), np.array(zc))
    )
    f = p["f"]
    depol = equivalent_depolarization(f, host, lay.gas_permittivity) if f > 0 else math.nan
    cpf = abs(p["q"] / p["counter"])
    cb = cpf / height
    k = f * height / d
    cc = cb * (1.0 / k - 1.0) if 0.0 < k < 1.0 else math.nan
    ca = p["capacitance"] - cb * (1.0 - k) if 0.0 < k < 1.0 else math.nan
    return FieldSolution(
        field_enhancement=f,
        charge_per_field=float(cpf),
        void_volume=p["volume"],
        depolarization=float(depol),
        counter_field_per_polarization=p["counter"],
        induced_charge_per_polarization=p["q"],
        capacitance=p["capacitance"],
        capacitance_series=float(cb),
        capacitance_void=float(cc),
        capacitance_parallel=float(ca),
        void_voltage_ratio=float(k),
        thickness=float(d),
        void_height=float(height),
        host_permittivity=host,
        gas_permittivity=float(lay.gas_permittivity),
        outer_radius=float(lay.outer_radius),
        measuring_electrode=measuring_electrode,
        grid_shape=solver.grid.shape,
        smallest_spacing=solver.grid.smallest_spacing,
        unknowns=int(solver.assembly.n_unknowns),
    )


def coefficients_from_solver(
    solver: FieldSolver, measuring_electrode: str = "high", coarse: FieldSolver | None = None
) -> FieldSolution:
    """:class:`FieldSolution` of the void of an assembled, factorised layout.

    Parameters
    ----------
    solver : FieldSolver
        a :class:`FieldSolver` whose layout has a void [-].
    measuring_electrode : str, optional
        "high" or "ground": the electrode whose induced charge is the apparent charge [-].
    coarse : FieldSolver, optional
        the same layout on a grid twice as coarse; if given, the primary quantities (f, the
        counter-field, the induced charge, the volume, the capacitance) are Richardson-extrapolated,
        x = 2 x_fine − x_coarse, assuming the first-order convergence these show for smooth voids [-].

    Returns
    -------
    FieldSolution
        The void's coefficients.

    References
    ----------
    Richardson extrapolation: L. F. Richardson, Phil. Trans. R. Soc. A 210 (1911) 307-357 (common
    practice; from memory).
    """
    p = _primary(solver, measuring_electrode)
    if coarse is not None:
        if not isinstance(coarse, FieldSolver) or coarse.layout != solver.layout:
            raise InputError("coarse must be a FieldSolver of the same layout")
        pc = _primary(coarse, measuring_electrode)
        p = {k: 2.0 * p[k] - pc[k] for k in p}
    return _build(p, solver, measuring_electrode)


def coefficients_for(
    thickness: float,
    permittivity: float | Sequence[tuple[float, float]],
    void_diameter: float,
    void_height: float,
    *,
    void_shape: str = "spheroid",
    rim_radius: float | None = None,
    void_center: float | None = None,
    gas_permittivity: float = 1.0,
    needle_tip_radius: float | None = None,
    needle_length: float | None = None,
    needle_electrode: str = "high",
    inclusions: Sequence[tuple[float, float]] = (),
    outer_radius: float | None = None,
    cells: tuple[int, int] | None = None,
    resolution: float = 40.0,
    growth: float = 1.1,
    measuring_electrode: str = "high",
    extrapolate: bool = True,
) -> FieldSolution:
    """Field-solver coefficients of a void in a slab between plane electrodes, from plain SI arguments.

    Parameters
    ----------
    thickness : float
        electrode gap [m].
    permittivity : float or Sequence[tuple[float, float]]
        insulation relative permittivity, or (layer thickness [m], εr) pairs from the ground
        electrode up [-].
    void_diameter : float
        void extent across the field [m].
    void_height : float
        void extent along the field [m].
    void_shape : str, optional
        "spheroid" or "cylinder" (rounded rim) [-].
    rim_radius : float, optional
        rim rounding radius of a cylinder, default void_height/2 [m].
    void_center : float, optional
        height of the void centre above the ground electrode, default thickness/2; use
        void_height/2 for a void on the ground electrode [m].
    gas_permittivity : float, optional
        relative permittivity of the void gas [-].
    needle_tip_radius : float, optional
        tip radius of a needle on ``needle_electrode`` [m].
    needle_length : float, optional
        needle length from its electrode [m].
    needle_electrode : str, optional
        "high" or "ground" [-].
    inclusions : Sequence[tuple[float, float]], optional
        (diameter, centre height) of uncharged conductive spheres [m].
    outer_radius : float, optional
        radius of the modelled disc; default widest feature + 2 x thickness [m].
    cells : tuple[int, int], optional
        (nr, nz) grid cells; default from ``resolution`` [-].
    resolution : float, optional
        cells across the smallest feature when ``cells`` is None [-].
    growth : float, optional
        neighbour ratio of cell sizes away from features [-].
    measuring_electrode : str, optional
        "high" or "ground" [-].
    extrapolate : bool, optional
        also solve on a grid twice as coarse and Richardson-extrapolate (about 1.3 x the work;
        errors drop from about 1-2 % to about 0.2 % for smooth voids at the default resolution) [-].

    Returns
    -------
    FieldSolution
        :class:`FieldSolution` (grid information is that of the fine grid).

    References
    ----------
    pedersen1991, crichton1989 (induced charge via the λ function), mcallister2002; all from memory
    except mcallister2002 (confirmed). The finite-volume discretisation is common practice.
    """
    thickness = check_positive("thickness", thickness, "m")
    zc = 0.5 * thickness if void_center is None else void_center
    void = void_region(void_diameter, void_height, zc, void_shape, rim_radius)
    layout = specimen_layout(
        thickness,
        permittivity,
        void=void,
        gas_permittivity=gas_permittivity,
        needle_tip_radius=needle_tip_radius,
        needle_length=needle_length,
        needle_electrode=needle_electrode,
        inclusions=inclusions,
        outer_radius=outer_radius,
    )
    grid = grid_for(layout, cells=cells, resolution=resolution, growth=growth)
    coarse = None
    if check_bool("extrapolate", extrapolate):
        half = None if cells is None else (max(2, cells[0] // 2), max(2, cells[1] // 2))
        coarse = FieldSolver(layout, grid_for(layout, cells=half, resolution=0.5 * resolution, growth=growth))
    return coefficients_from_solver(FieldSolver(layout, grid), measuring_electrode, coarse)


def peak_enhancement(solver: FieldSolver, where: str | np.ndarray = "dielectric") -> float:
    """Largest cell-centre |E| in ``where`` per applied uniform field V/d [-].

    Parameters
    ----------
    solver : FieldSolver
        The assembled solver.
    where : str or numpy.ndarray, optional
        Cells considered, as for :func:`region_mask`.

    Returns
    -------
    float
        Peak |E| per V/d [-] (0 when no cell is selected).
    """
    u = solver.unit("high")
    mask = region_mask(solver, where)
    return float(np.max(field_magnitude(u)[mask], initial=0.0) * solver.layout.thickness)


def solve_scenario(scenario: Scenario, **options: Any) -> FieldSolution:
    """Field-solver coefficients for a scenario's insulation and void.

    Reads ``scenario.insulation.thickness``, ``scenario.insulation.permittivity``, ``scenario.void.diameter``,
    ``scenario.void.height``, ``scenario.void.shape`` and ``scenario.void.position`` (a void on an electrode is
    the half of a spheroid of twice its height that lies in the insulation).

    A void in a :class:`pdvoid.Coaxial` insulation is not axisymmetric about its own (radial) axis, and the
    solver is: it is solved in the **local plane slab**, a slab of the wall thickness R − r_i with the void at
    its distance r − r_i from the high-voltage (inner) electrode, and scaled to the cable's applied and
    weighting fields at the void centre, V/(r ln(R/r_i)) and 1/(r ln(R/r_i)): ``field_enhancement`` is then
    the void field per local applied field, and ``charge_per_field`` the apparent charge at the cable terminals
    (slab value × (R − r_i)/(r ln(R/r_i))). This keeps the void shape and the nearness of the conductors and
    neglects the 1/r change of the applied field across the void (h/r between its walls; the mean void field
    and the charge change in second order, about (h/r)²/20 for a sphere, checked against a two-dimensional
    cross-section solution in the tests) and the curvature of the conductors; a ValidityWarning says so
    every time. The other capacitances of the solution are those of the modelled slab disc. Every other option of
    :func:`coefficients_for` (rim_radius, needle, inclusions, grid settings, measuring electrode,
    extrapolation) passes through.

    Parameters
    ----------
    scenario : Scenario
        a :class:`pdvoid.Scenario` or any object with those attributes [-].
    **options : Any
        keyword arguments of :func:`coefficients_for` [-].

    Returns
    -------
    FieldSolution
        :class:`FieldSolution`, comparable field by field with :func:`pdvoid.compute_coefficients` for
        field_enhancement, depolarization, volume, charge_per_field and the capacitances.
    """
    try:
        ins, void = scenario.insulation, scenario.void
        thickness, permittivity = ins.thickness, ins.permittivity
        diameter, height = void.diameter, void.height
    except AttributeError as exc:
        raise InputError(
            f"scenario must have insulation.thickness, insulation.permittivity, void.diameter and void.height; {exc}"
        ) from None
    if permittivity is None:
        raise InputError("scenario.insulation.permittivity must be given (or taken from its material); got None")
    for name in ("thickness", "permittivity", "void_diameter", "void_height"):
        if name in options:
            raise InputError(f"{name} comes from the scenario; do not pass it as an option")
    if isinstance(ins, Coaxial):
        return _coaxial_solution(scenario, options)
    position = getattr(void, "position", "centred")
    if position != "centred" and "void_center" not in options:
        height = 2.0 * height
        options["void_center"] = 0.0 if position == "ground_electrode" else thickness
    if "void_shape" not in options:
        options["void_shape"] = getattr(void, "shape", "spheroid")
    return coefficients_for(thickness, permittivity, diameter, height, **options)


def _coaxial_solution(scenario: Scenario, options: dict[str, Any]) -> FieldSolution:
    """The local plane-slab solution of a void in a coaxial insulation (see :func:`solve_scenario`)."""
    ins, void = scenario.insulation, scenario.void
    if not isinstance(ins, Coaxial) or ins.permittivity is None:  # solve_scenario sends only a Coaxial here
        raise InputError("a coaxial solution needs a pdvoid.Coaxial insulation with its permittivity")
    if "void_center" in options or "measuring_electrode" in options:
        raise InputError("void_center and measuring_electrode come from the coaxial scenario (the void's "
                         "radial_position; the inner conductor); do not pass them as options")
    if void.radial_position is None:  # the Scenario requires it for a coaxial insulation
        raise InputError("void.radial_position is required for a coaxial insulation; got None")
    r = float(void.radial_position)
    d, d_loc = ins.thickness, local_gap(ins, void)
    options.setdefault("void_shape", void.shape)
    # the inner conductor is the high-voltage electrode at z = d, the outer one the earthed electrode at z = 0
    slab = coefficients_for(d, ins.permittivity, void.diameter, void.height, void_center=ins.outer_radius - r,
                            measuring_electrode="high", **options)
    warn_validity(
        f"coaxial insulation: the field solver solved the void in the local plane slab ({d * 1e3:.4g} mm thick, the "
        f"void {(r - ins.inner_radius) * 1e3:.4g} mm from the high-voltage side) and scaled it to the cable's local "
        f"field and weighting field at r = {r * 1e3:.4g} mm (factor {d / d_loc:.4g}); it neglects the 1/r change "
        f"of the field across the void ({float(coaxial_field_variation(void.height, r)) * 100:.2g} % here; the "
        "mean void field and the apparent charge are affected in second order, about (h/r)^2/20) and the "
        "curvature of the conductors"
    )
    cpf = slab.charge_per_field * d / d_loc
    return replace(slab, charge_per_field=cpf, capacitance_series=cpf / slab.void_height,
                   references=slab.references + ("kuffel2000_fields",))


def coefficients(scenario: Scenario, **options: Any) -> Coefficients:
    """The coefficients of a scenario with its geometry solved numerically: the same :class:`Coefficients` type
    :func:`pdvoid.compute_coefficients` returns, with ``method="field solver"`` and the
    :class:`FieldSolution` in ``solution``.

    Parameters
    ----------
    scenario : Scenario
        a :class:`pdvoid.Scenario` [-].
    **options : Any
        keyword arguments of :func:`coefficients_for` (rim_radius, needle, inclusions, grid settings,
        measuring electrode, extrapolation) [-].

    Returns
    -------
    Coefficients
        :class:`pdvoid.coefficients.Coefficients`; the gas, supply and model parts are those of the closed forms.
    """
    solution = solve_scenario(scenario, **options)
    c = compute_coefficients(with_field_solution(scenario, solution))
    return replace(c, method="field solver", solution=solution)


def with_field_solution(scenario: Scenario, solution: FieldSolution | Coefficients) -> Scenario:
    """``scenario`` with its void's field enhancement and charge per field taken from a numerical solution, so
    that :func:`pdvoid.simulate` runs the solved geometry through the same kernels at full speed.

    Parameters
    ----------
    scenario : Scenario
        The scenario.
    solution : FieldSolution or Coefficients
        A numerical solution, or the Coefficients of :func:`coefficients` holding one.

    Returns
    -------
    Scenario
        A copy with ``void.field_enhancement`` and ``void.charge_per_field`` set.

    Raises
    ------
    InputError
        For closed-form Coefficients, another kind of solution, or a ``scenario`` that is not a Scenario.
    """
    if isinstance(solution, Coefficients):
        if solution.solution is None:
            raise InputError("solution must be a FieldSolution or the Coefficients of pdvoid.fields.coefficients; "
                             "got closed-form Coefficients")
        solution = solution.solution
    if not isinstance(solution, FieldSolution):
        raise InputError(f"solution must be a FieldSolution or Coefficients; got {type(solution).__name__}")
    try:
        return scenario.replace(**{"void.field_enhancement": solution.field_enhancement,
                                   "void.charge_per_field": solution.charge_per_field})
    except AttributeError:
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}") from None
