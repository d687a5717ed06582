"""Point-plane gap: the apex field of a hyperboloid point electrode, exact and in Mason's handbook form."""

from __future__ import annotations

import math

from pdvoid.core.errors import check_positive

__all__ = ["hyperboloid_tip_field", "mason_tip_field"]


def hyperboloid_tip_field(voltage: float, tip_radius: float, gap: float) -> float:
    """Apex field of a hyperboloid-of-revolution point electrode opposite a plane (exact electrostatics).

    E_max = 2U / (r η0 ln((1 + η0)/(1 − η0))), η0 = sqrt(d / (d + r)); the potential is
    U artanh(η)/artanh(η0) in prolate spheroidal coordinates. For r ≪ d it tends to Mason's 2U/(r ln(4d/r)).

    Parameters
    ----------
    voltage : float
        point-to-plane voltage U [V].
    tip_radius : float
        apex radius of curvature r [m].
    gap : float
        apex-to-plane distance d [m].

    Returns
    -------
    float
        Apex field magnitude [V/m].

    References
    ----------
    Derived here (Laplace's equation in prolate spheroidal coordinates; status: derived). The
    hyperboloid model of the point-plane gap is the one behind the handbook formula quoted in kuffel2000
    (field chapter; from memory). Valid for the ideal infinite hyperboloid and plane.
    """
    u = check_positive("voltage", voltage, "V")
    r = check_positive("tip_radius", tip_radius, "m")
    d = check_positive("gap", gap, "m")
    eta0 = math.sqrt(d / (d + r))
    return 2.0 * u / (r * eta0 * math.log((1.0 + eta0) / (1.0 - eta0)))


def mason_tip_field(voltage: float, tip_radius: float, gap: float) -> float:
    """Mason's approximation of the tip field of a point-plane gap: E_max = 2U / (r ln(1 + 4d/r)).

    Parameters
    ----------
    voltage : float
        point-to-plane voltage U [V].
    tip_radius : float
        tip radius of curvature r [m].
    gap : float
        tip-to-plane distance d [m].

    Returns
    -------
    float
        Tip field magnitude [V/m].

    References
    ----------
    kuffel2000, field chapter (hyperboloid point-plane approximation attributed to J. H. Mason; status
    from memory). Validity: hyperboloidal tips with r ≪ d; it differs from the exact hyperboloid result
    (:func:`hyperboloid_tip_field`) by 4 % at d/r = 10 and 0.5 % at d/r = 100. A cylindrical needle
    with a hemispherical tip has a markedly higher tip field (about 30 % at d/r = 10).
    """
    u = check_positive("voltage", voltage, "V")
    r = check_positive("tip_radius", tip_radius, "m")
    d = check_positive("gap", gap, "m")
    return 2.0 * u / (r * math.log1p(4.0 * d / r))
