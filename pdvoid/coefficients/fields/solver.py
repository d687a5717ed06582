"""Sparse direct solution of the assembled field problem, one factorisation for many right-hand sides.

:class:`FieldSolver` assembles a :class:`~pdvoid.coefficients.fields.layout.Layout` on a grid, factorises the
matrix once (scipy.sparse.linalg.splu) and then solves for any electrode potentials, free charges and
floating-conductor charges. Results are :class:`Potential` objects holding the cell potentials, from which
fields, electrode charges and void means follow.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from functools import cached_property

import numpy as np
import scipy.sparse.linalg as spla

from pdvoid.coefficients.fields.assembly import Assembly, assemble
from pdvoid.coefficients.fields.grid import Grid
from pdvoid.coefficients.fields.layout import ELECTRODES, Layout
from pdvoid.core.errors import InputError, check_array, check_choice, check_real
from pdvoid.core.units import EPSILON_0

__all__ = ["FieldSolver", "Potential"]


@dataclass(frozen=True, eq=False)
class Potential:
    """A solved potential.

    Attributes
    ----------
    solver : FieldSolver
        the :class:`FieldSolver` that produced it.
    unknowns : numpy.ndarray
        the solution vector (free cells, then floating conductors) [V].
    voltages : tuple[float, float]
        (ground, high) electrode potentials [V].
    """

    solver: FieldSolver
    unknowns: np.ndarray
    voltages: tuple[float, float]

    @cached_property
    def cells(self) -> np.ndarray:
        """Potential of every cell, conductor cells included, shape (nr, nz) [V]."""
        asm = self.solver.assembly
        v = np.empty(asm.cell_index.size)
        free = asm.cell_index >= 0
        v[free] = self.unknowns[asm.cell_index[free]]
        cid = asm.cell_conductor
        for e in range(2):
            v[cid == e] = self.voltages[e]
        for k in range(asm.n_floating):
            v[cid == 2 + k] = self.unknowns[asm.n_free + k]
        return v.reshape(self.solver.grid.shape)

    @property
    def floating_potentials(self) -> np.ndarray:
        """Potentials of the floating conductors [V]."""
        return self.unknowns[self.solver.assembly.n_free :].copy()

    def electrode_charge(self, electrode: str) -> float:
        """Charge on an electrode's surface, ε0 × outward flux of εr∇V into the dielectric [C].

        Parameters
        ----------
        electrode : str
            ``"ground"`` or ``"high"``.

        Returns
        -------
        float
            The charge [C].
        """
        e = ELECTRODES.index(check_choice("electrode", electrode, ELECTRODES))
        u, c = self.solver.assembly.electrode_links[e]
        return float(EPSILON_0 * np.sum(c * (self.voltages[e] - self.unknowns[u])))

    def void_mean_field(self) -> float:
        """Mean axial field component in the void, (1/Ω) ∫ E_z dΩ [V/m] (negative when pointing to ground).

        Returns
        -------
        float
            The mean axial void field [V/m].
        """
        asm = self.solver.assembly
        if asm.void_volume <= 0.0:
            raise InputError("the layout has no void (or the grid does not resolve it)")
        s = float(asm.polarization_source @ self.unknowns)
        s += float(asm.polarization_deposit @ np.asarray(self.voltages))
        return -s / asm.void_volume

    def __add__(self, other: Potential) -> Potential:
        if not isinstance(other, Potential) or other.solver is not self.solver:
            return NotImplemented
        return Potential(
            self.solver,
            self.unknowns + other.unknowns,
            (self.voltages[0] + other.voltages[0], self.voltages[1] + other.voltages[1]),
        )

    def __mul__(self, factor: float) -> Potential:
        f = check_real("factor", factor)
        return Potential(self.solver, f * self.unknowns, (f * self.voltages[0], f * self.voltages[1]))

    __rmul__ = __mul__


class FieldSolver:
    """Assemble and factorise a layout once; solve for many sources.

    Parameters
    ----------
    layout : Layout
        the field problem [-].
    grid : Grid
        the grid; its extent must match the layout [-].
    """

    def __init__(self, layout: Layout, grid: Grid, *, samples: int = 4) -> None:
        self.layout = layout
        self.grid = grid
        self.assembly: Assembly = assemble(layout, grid, samples=samples)
        self._lu = spla.splu(self.assembly.matrix, permc_spec="MMD_AT_PLUS_A")
        self._unit: dict[int, Potential] = {}

    def __repr__(self) -> str:
        return f"FieldSolver({self.grid!r}, {self.assembly.n_unknowns} unknowns)"

    def solve(
        self,
        voltages: Mapping[str, float] | None = None,
        *,
        charge: np.ndarray | None = None,
        floating_charges: np.ndarray | None = None,
    ) -> Potential:
        """Potential for given electrode voltages, free charge per unknown and floating-conductor charges.

        Parameters
        ----------
        voltages : Mapping[str, float], optional
            {"ground": V0, "high": V1}; missing electrodes are at 0 [V].
        charge : numpy.ndarray, optional
            free charge on each unknown (cells, then floating conductors) [C].
        floating_charges : numpy.ndarray, optional
            net charge of each floating conductor; default the layout's values [C].

        Returns
        -------
        Potential
            The solved potential.
        """
        asm = self.assembly
        v = np.zeros(2)
        if voltages is not None:
            if not isinstance(voltages, Mapping):
                raise InputError(f"voltages must be a mapping like {{'high': 1.0}}; got {voltages!r}")
            for name, value in voltages.items():
                v[ELECTRODES.index(check_choice("electrode", name, ELECTRODES))] = check_real(
                    f"voltages[{name!r}]", value
                )
        rhs = asm.coupling @ v
        if charge is not None:
            q = check_array("charge", charge)
            if q.size != asm.n_unknowns:
                raise InputError(f"charge must hold {asm.n_unknowns} values (one per unknown); got {q.size}")
            rhs = rhs + q / EPSILON_0
        fq = (
            np.array([q for _, q in self.layout.floating])
            if floating_charges is None
            else check_array("floating_charges", floating_charges)
        )
        if fq.size != asm.n_floating:
            raise InputError(f"floating_charges must hold {asm.n_floating} values; got {fq.size}")
        if fq.size:
            rhs = rhs.copy()
            rhs[asm.n_free :] += fq / EPSILON_0
        x = self._lu.solve(rhs)
        return Potential(self, x, (float(v[0]), float(v[1])))

    def apply_inverse(self, rhs: np.ndarray) -> np.ndarray:
        """A⁻¹ rhs with the stored factorisation (raw unknown vector; rhs in the matrix's own units) [-].

        Parameters
        ----------
        rhs : numpy.ndarray
            Right-hand side, one value per unknown.

        Returns
        -------
        numpy.ndarray
            The solution vector.
        """
        b = check_array("rhs", rhs)
        if b.size != self.assembly.n_unknowns:
            raise InputError(f"rhs must hold {self.assembly.n_unknowns} values; got {b.size}")
        return self._lu.solve(b)

    def unit(self, electrode: str) -> Potential:
        """Potential with 1 V on ``electrode``, 0 V on the other, and uncharged floating conductors [V].

        With ``electrode`` as the measuring electrode this is Pedersen's λ function (weighting potential).

        Parameters
        ----------
        electrode : str
            ``"ground"`` or ``"high"``: the electrode at 1 V.

        Returns
        -------
        Potential
            The unit potential (cached).
        """
        e = ELECTRODES.index(check_choice("electrode", electrode, ELECTRODES))
        if e not in self._unit:
            self._unit[e] = self.solve({electrode: 1.0}, floating_charges=np.zeros(self.assembly.n_floating))
        return self._unit[e]

    def induced_charge(self, charge: np.ndarray, electrode: str = "high") -> float:
        """Charge induced on a grounded ``electrode`` by free charge on the unknowns: q = −Σ Q λ [C].

        Parameters
        ----------
        charge : numpy.ndarray
            Free charge per unknown [C].
        electrode : str, optional
            The grounded electrode, ``"high"`` or ``"ground"``.

        Returns
        -------
        float
            The induced charge [C].

        References
        ----------
        Pedersen's λ-function concept (Green's reciprocity): A. Pedersen, G. C. Crichton, I. W. McAllister,
        'The theory and measurement of partial discharge transients', IEEE Trans. Electr. Insul. 26(3)
        (1991) 487-497 (from memory, bibliography key ``pedersen1991``).
        """
        q = check_array("charge", charge)
        if q.size != self.assembly.n_unknowns:
            raise InputError(f"charge must hold {self.assembly.n_unknowns} values; got {q.size}")
        return -float(self.unit(electrode).unknowns @ q)

    def capacitance(self) -> float:
        """Capacitance between the two electrodes of the modelled disc (floating conductors uncharged) [F].

        Returns
        -------
        float
            The capacitance [F].
        """
        return self.unit("high").electrode_charge("high")
