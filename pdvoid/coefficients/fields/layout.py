"""What the field solver models: electrodes, dielectrics, the gas void and conductive inclusions.

A :class:`Layout` is a disc of insulation of radius ``outer_radius`` between two plane electrodes: ``"ground"``
at z = 0 and ``"high"`` at z = ``thickness``. Shaped conductors (a needle or protrusion) can be attached to either
electrode; floating conductors (conductive inclusions) carry a fixed net charge (zero by default) and take
whatever potential that requires. The outer radius and the axis carry no normal field (Neumann).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from pdvoid.coefficients.fields.geometry import Hyperboloid, Region, Rod, Slab
from pdvoid.coefficients.fields.grid import Grid, make_grid
from pdvoid.core.errors import InputError, check_choice, check_positive, check_range, check_real

__all__ = ["Layout", "ELECTRODES", "specimen_layout", "grid_for"]

ELECTRODES = ("ground", "high")  #: the two plane electrodes: z = 0 and z = thickness


def _tuple(name: str, value: Any) -> tuple[Any, ...]:
    try:
        return tuple(value)
    except TypeError:
        raise InputError(f"{name} must be a sequence; got {value!r}") from None


@dataclass(frozen=True)
class Layout:
    """A field problem: plane electrodes, dielectrics, an optional gas void, shaped and floating conductors.

    Attributes
    ----------
    thickness : float
        electrode gap; ground at z = 0, high voltage at z = thickness [m].
    outer_radius : float
        radius of the modelled disc; zero normal field there [m].
    permittivity : float
        relative permittivity of the background insulation [-].
    dielectrics : tuple
        (region, relative permittivity) pairs; later entries override earlier ones [-].
    void : Region or None
        the gas-filled void, or None; a void reaching through an electrode plane is cut by it (a
        hemisphere centred on the plane is a hemispherical void on that electrode) [-].
    gas_permittivity : float
        relative permittivity of the gas in the void [-].
    conductors : tuple
        (region, electrode name) pairs: shaped parts of an electrode, e.g. a needle [-].
    floating : tuple
        (region, net charge) pairs: conductive inclusions with a fixed net charge [C].
    """

    thickness: float
    outer_radius: float
    permittivity: float
    dielectrics: tuple = ()
    void: Region | None = None
    gas_permittivity: float = 1.0
    conductors: tuple = ()
    floating: tuple = ()

    def __post_init__(self) -> None:
        check_positive("thickness", self.thickness, "m")
        check_positive("outer_radius", self.outer_radius, "m")
        check_range("permittivity", self.permittivity, 1.0, 1e6)
        check_range("gas_permittivity", self.gas_permittivity, 1.0, 1e6)
        diel = _tuple("dielectrics", self.dielectrics)
        for k, item in enumerate(diel):
            if not (isinstance(item, tuple) and len(item) == 2 and isinstance(item[0], Region)):
                raise InputError(f"dielectrics[{k}] must be a (Region, permittivity) pair; got {item!r}")
            check_range(f"dielectrics[{k}] permittivity", item[1], 1.0, 1e6)
        object.__setattr__(self, "dielectrics", tuple((reg, float(eps)) for reg, eps in diel))
        if self.void is not None and not isinstance(self.void, Region):
            raise InputError(f"void must be a Region or None; got {self.void!r}")
        cond = _tuple("conductors", self.conductors)
        for k, item in enumerate(cond):
            if not (isinstance(item, tuple) and len(item) == 2 and isinstance(item[0], Region)):
                raise InputError(f"conductors[{k}] must be a (Region, electrode name) pair; got {item!r}")
            check_choice(f"conductors[{k}] electrode", item[1], ELECTRODES)
        object.__setattr__(self, "conductors", cond)
        flo = _tuple("floating", self.floating)
        for k, item in enumerate(flo):
            if not (isinstance(item, tuple) and len(item) == 2 and isinstance(item[0], Region)):
                raise InputError(f"floating[{k}] must be a (Region, net charge) pair; got {item!r}")
            check_real(f"floating[{k}] net charge", item[1])
        object.__setattr__(self, "floating", tuple((reg, float(q)) for reg, q in flo))
        regions = [r for r, _ in self.dielectrics + self.conductors + self.floating]
        if self.void is not None:
            regions.append(self.void)
        for reg in regions:
            rmax, zlo, zhi = reg.bounds()
            if math.isfinite(rmax) and rmax > self.outer_radius:
                raise InputError(f"{reg!r} reaches r = {rmax:g} m, beyond outer_radius = {self.outer_radius:g} m")
        if self.void is not None:  # a void may reach through an electrode plane: the plane then cuts it
            _, zlo, zhi = self.void.bounds()
            if not (zhi > 0.0 and zlo < self.thickness):
                raise InputError(
                    f"the void spans z = {zlo:g} .. {zhi:g} m and misses the insulation 0 .. {self.thickness:g} m"
                )

    # -- material -------------------------------------------------------------------------------------------
    def permittivity_at(self, r: np.ndarray, z: np.ndarray) -> np.ndarray:
        """Relative permittivity at (r, z), the void included [-].

        Parameters
        ----------
        r, z : numpy.ndarray
            Radial and axial coordinates, broadcast together [m].

        Returns
        -------
        numpy.ndarray
            Relative permittivity at each point [-].
        """
        r, z = np.broadcast_arrays(np.asarray(r, float), np.asarray(z, float))
        eps = np.full(r.shape, float(self.permittivity))
        for reg, e in self.dielectrics:
            eps = np.where(reg.contains(r, z), e, eps)
        if self.void is not None:
            eps = np.where(self.void.contains(r, z), self.gas_permittivity, eps)
        return eps

    def material_regions(self) -> list[Region]:
        """Regions whose outlines are permittivity interfaces.

        Returns
        -------
        list of Region
            The dielectric regions and the void.
        """
        regs = [reg for reg, _ in self.dielectrics]
        if self.void is not None:
            regs.append(self.void)
        return regs

    # -- grid hints -----------------------------------------------------------------------------------------
    def layer_interfaces(self) -> list[float]:
        """Axial positions of slab interfaces strictly inside the gap (grid faces are put there) [m].

        Returns
        -------
        list of float
            Sorted axial positions [m].
        """
        out = set()
        for reg, _ in self.dielectrics:
            if isinstance(reg, Slab):
                for zz in (reg.bottom, reg.top):
                    if 0.0 < zz < self.thickness:
                        out.add(float(zz))
        return sorted(out)

    def features(self) -> list[Region]:
        """Regions that need a fine grid: the void, shaped and floating conductors, non-slab dielectrics.

        Returns
        -------
        list of Region
            The regions.
        """
        regs = [reg for reg, _ in self.dielectrics if not isinstance(reg, Slab)]
        if self.void is not None:
            regs.append(self.void)
        regs += [reg for reg, _ in self.conductors] + [reg for reg, _ in self.floating]
        return regs

    def focus(self) -> tuple[list[tuple[float, float]], list[tuple[float, float]], float]:
        """Refinement intervals in r and z, and the smallest feature length [m].

        Returns
        -------
        tuple
            Radial intervals [m], axial intervals [m] and the smallest feature length [m].
        """
        fr: list[tuple[float, float]] = []
        fz: list[tuple[float, float]] = []
        small = math.inf
        for reg in self.features():
            rmax, zlo, zhi = reg.bounds()
            small = min(small, reg.smallest_feature())
            if isinstance(reg, Hyperboloid):
                rho = reg.tip_radius
                fr.append((0.0, 2.0 * rho))
                fz.append((reg.apex - rho, reg.apex + 2.0 * rho))
                continue
            if isinstance(reg, Rod):  # refine around the tip only
                rho = reg.tip_radius
                fr.append((0.0, 2.0 * rho))
                fz.append(
                    (reg.apex - rho, reg.apex + 2.0 * rho) if reg.upward else (reg.apex - 2.0 * rho, reg.apex + rho)
                )
                continue
            fr.append((0.0, rmax))
            fz.append((max(zlo, 0.0), min(zhi, self.thickness)))
        for zz in self.layer_interfaces():
            small = min(small, self.thickness)
            fz.append((zz, zz))
        return fr, fz, small


def _layers(thickness: float, permittivity: float | Sequence[tuple[float, float]]
            ) -> tuple[float, tuple[tuple[Slab, float], ...]]:
    """Background permittivity and slab dielectrics from a float or (layer thickness, εr) pairs."""
    if np.ndim(permittivity) == 0 and not isinstance(permittivity, (list, tuple)):
        return check_range("permittivity", permittivity, 1.0, 1e6), ()
    items = _tuple("permittivity", permittivity)
    if not items:
        raise InputError("permittivity: the layer list is empty")
    z = 0.0
    slabs = []
    for k, item in enumerate(items):
        try:
            t, e = item
        except (TypeError, ValueError):
            raise InputError(
                f"permittivity[{k}] must be a (layer thickness, permittivity) pair; got {item!r}"
            ) from None
        t = check_positive(f"permittivity[{k}] layer thickness", t, "m")
        e = check_range(f"permittivity[{k}] permittivity", e, 1.0, 1e6)
        slabs.append((Slab(z, z + t), e))
        z += t
    if abs(z - thickness) > 1e-9 * thickness:
        raise InputError(f"the layer thicknesses add up to {z:g} m but thickness is {thickness:g} m")
    slabs[-1] = (Slab(slabs[-1][0].bottom, thickness), slabs[-1][1])
    return slabs[0][1], tuple(slabs[1:])


def specimen_layout(
    thickness: float,
    permittivity: float | Sequence[tuple[float, float]],
    *,
    void: Region | None = None,
    gas_permittivity: float = 1.0,
    needle_tip_radius: float | None = None,
    needle_length: float | None = None,
    needle_electrode: str = "high",
    inclusions: Sequence[tuple[float, float]] = (),
    outer_radius: float | None = None,
) -> Layout:
    """A :class:`Layout` from plain geometry arguments: slab, void, needle and conductive spheres.

    Parameters
    ----------
    thickness : float
        electrode gap [m].
    permittivity : float or Sequence[tuple[float, float]]
        relative permittivity of the insulation, or (layer thickness [m], εr) pairs listed from
        the ground electrode upward [-].
    void : Region, optional
        the gas void (e.g. :class:`~pdvoid.coefficients.fields.geometry.Spheroid`), or None [-].
    gas_permittivity : float, optional
        relative permittivity of the void gas [-].
    needle_tip_radius : float, optional
        radius of a needle (rod with hemispherical tip) on ``needle_electrode`` [m].
    needle_length : float, optional
        length of that needle from its electrode to the apex, < thickness [m].
    needle_electrode : str, optional
        "high" (needle hangs from the upper electrode) or "ground" (stands on the lower) [-].
    inclusions : Sequence[tuple[float, float]], optional
        (diameter [m], centre height [m]) of uncharged floating conductive spheres [-].
    outer_radius : float, optional
        radius of the modelled disc [m]; default: the largest feature radius + 2 x thickness.

    Returns
    -------
    Layout
        The field problem.
    """
    thickness = check_positive("thickness", thickness, "m")
    background, slabs = _layers(thickness, permittivity)
    from pdvoid.coefficients.fields.geometry import Spheroid  # local import keeps the module header short

    conductors = []
    if (needle_tip_radius is None) != (needle_length is None):
        raise InputError("give both needle_tip_radius and needle_length, or neither")
    if needle_tip_radius is not None:
        rho = check_positive("needle_tip_radius", needle_tip_radius, "m")
        length = check_range("needle_length", needle_length, 0.0, thickness, low_open=True, high_open=True, unit="m")
        if length < rho:
            raise InputError(
                f"needle_length must be >= needle_tip_radius ({rho:g} m) so that the tip is a "
                f"full hemisphere; got {length!r}"
            )
        check_choice("needle_electrode", needle_electrode, ELECTRODES)
        if needle_electrode == "high":
            conductors.append((Rod(rho, thickness - length, upward=True), "high"))
        else:
            conductors.append((Rod(rho, length, upward=False), "ground"))
    floating = []
    for k, item in enumerate(_tuple("inclusions", inclusions)):
        try:
            dia, zc = item
        except (TypeError, ValueError):
            raise InputError(f"inclusions[{k}] must be a (diameter, centre height) pair; got {item!r}") from None
        dia = check_positive(f"inclusions[{k}] diameter", dia, "m")
        zc = check_range(
            f"inclusions[{k}] centre height",
            zc,
            0.5 * dia,
            thickness - 0.5 * dia,
            low_open=True,
            high_open=True,
            unit="m",
        )
        floating.append((Spheroid(dia, dia, zc), 0.0))
    widest = max(
        [0.0] + [reg.bounds()[0] for reg, _ in conductors + floating] + ([void.bounds()[0]] if void is not None else [])
    )
    if outer_radius is None:
        outer_radius = widest + 2.0 * thickness
    return Layout(
        thickness=thickness,
        outer_radius=outer_radius,
        permittivity=background,
        dielectrics=slabs,
        void=void,
        gas_permittivity=gas_permittivity,
        conductors=tuple(conductors),
        floating=tuple(floating),
    )


def grid_for(
    layout: Layout,
    *,
    cells: tuple[int, int] | None = None,
    resolution: float = 40.0,
    growth: float = 1.1,
    max_ratio: float = 200.0,
) -> Grid:
    """A graded grid for ``layout``: fine over the void and conductors, coarser towards the edges.

    Parameters
    ----------
    layout : Layout
        the field problem [-].
    cells : tuple[int, int], optional
        (nr, nz) numbers of cells; if None, the fine spacing is the smallest feature / resolution [-].
    resolution : float, optional
        cells across the smallest feature (void height or diameter, tip radius) [-].
    growth : float, optional
        neighbour ratio of cell sizes away from the features [-].
    max_ratio : float, optional
        largest coarse-to-fine spacing ratio [-].

    Returns
    -------
    Grid
        A grid refined around the layout's features.
    """
    if not isinstance(layout, Layout):
        raise InputError(f"layout must be a Layout; got {type(layout).__name__}")
    fr, fz, small = layout.focus()
    kw: dict = {"growth": growth, "max_ratio": max_ratio, "breaks_z": layout.layer_interfaces()}
    if cells is not None:
        return make_grid(layout.outer_radius, layout.thickness, cells=cells, focus_r=fr, focus_z=fz, **kw)
    res = check_range("resolution", resolution, 1.0, 1e5)
    if not math.isfinite(small):
        small = layout.thickness
    fine = min(small / res, layout.thickness / 4.0)
    return make_grid(layout.outer_radius, layout.thickness, fine=fine, focus_r=fr, focus_z=fz, **kw)
