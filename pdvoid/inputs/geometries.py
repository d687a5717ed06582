"""The registry of insulation geometries (plane slab, coaxial) and the check that a void fits in its insulation.

A new insulation geometry is a new module (a subclass of :class:`pdvoid.Insulation`) plus one line in
:data:`INSULATION_KINDS`; scenario files name it with ``[insulation] kind = "..."``.
"""

from __future__ import annotations

from pdvoid.core.errors import InputError
from pdvoid.inputs.coaxial import Coaxial
from pdvoid.inputs.parameters import Insulation, Void

__all__ = ["INSULATION_KINDS", "insulation_kind", "insulation_class", "check_void_placement"]

#: scenario-file kind -> insulation class ("slab" is the default kind)
INSULATION_KINDS: dict[str, type[Insulation]] = {"slab": Insulation, "coaxial": Coaxial}


def insulation_kind(insulation: Insulation) -> str:
    """The scenario-file kind of an insulation (``"slab"`` or ``"coaxial"``).

    Parameters
    ----------
    insulation : pdvoid.Insulation
        Any registered insulation.

    Returns
    -------
    str
        Its kind.
    """
    for kind, cls in reversed(list(INSULATION_KINDS.items())):  # subclasses are registered after their bases
        if isinstance(insulation, cls):
            return kind
    raise InputError(f"insulation must be one of {', '.join(c.__name__ for c in INSULATION_KINDS.values())}; "
                     f"got {type(insulation).__name__}")


def insulation_class(kind: object) -> type[Insulation]:
    """The insulation class registered under ``kind``.

    Parameters
    ----------
    kind : object
        ``"slab"`` or ``"coaxial"`` (anything else, also a non-string from a file, raises).

    Returns
    -------
    type
        The class.
    """
    if not isinstance(kind, str) or kind not in INSULATION_KINDS:
        raise InputError(f"insulation.kind must be one of {', '.join(repr(k) for k in INSULATION_KINDS)}; "
                         f"got {kind!r}")
    return INSULATION_KINDS[kind]


def check_void_placement(insulation: Insulation, void: Void) -> None:
    """InputError unless the void lies inside its insulation.

    A plane slab takes no ``void.radial_position``. A coaxial insulation needs one, with the void's radial
    extent inside the wall: r_i < radial_position − height/2 and radial_position + height/2 < R; its void must
    be "centred" (a void on a conductor is not modelled for the coaxial geometry).

    Parameters
    ----------
    insulation : pdvoid.Insulation
        The insulation.
    void : pdvoid.Void
        The void.

    Raises
    ------
    InputError
        Naming the parameter, its value and the allowed range.
    """
    r = void.radial_position
    if not isinstance(insulation, Coaxial):
        if r is not None:
            raise InputError(f"void.radial_position applies only to a coaxial insulation (pdvoid.Coaxial); got "
                             f"{r!r} m with a plane slab")
        return
    a, b, h = insulation.inner_radius, insulation.outer_radius, void.height
    if r is None:
        raise InputError(f"void.radial_position (distance of the void centre from the cable axis [m]) is required "
                         f"for a coaxial insulation; allowed: ({a + h / 2:g}, {b - h / 2:g}) m")
    if not a + 0.5 * h < r < b - 0.5 * h:
        raise InputError(f"void.radial_position must keep the void (height {h:g} m) inside the insulation between "
                         f"r_i = {a:g} m and R = {b:g} m, i.e. lie in ({a + h / 2:g}, {b - h / 2:g}) m; got {r!r} m")
    if void.position != "centred":
        raise InputError(f"void.position must be 'centred' in a coaxial insulation (a void on a conductor is not "
                         f"modelled there); got {void.position!r}")
