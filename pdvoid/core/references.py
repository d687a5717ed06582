"""Bibliography: keys -> full citations, and the record of which keys a computation relied on.

Every published formula in pdvoid names its key here. A :class:`~pdvoid.simulation.results.Result` carries the keys its
scenario used; :func:`cite` prints them. Status markers follow the project's physics brief: ``confirmed`` (checked
against public text), ``derived`` (derived here from stated equations and checked numerically), ``from memory``
(recalled, unconfirmed; never a test oracle on its own).
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass
from typing import Protocol, runtime_checkable

from pdvoid.core.errors import InputError

__all__ = ["Reference", "REFERENCES", "HasReferences", "HasParameterValues", "cite", "get_reference"]


@dataclass(frozen=True)
class Reference:
    """One bibliography entry.

    Attributes
    ----------
    key : str
        Short key used in code and results, e.g. ``"niemeyer1995"``.
    citation : str
        The full citation.
    status : str
        ``"confirmed"``, ``"derived"``, ``"from memory"`` or ``"common practice"`` (see the module docstring).
    """

    key: str
    citation: str
    status: str  # confirmed | derived | from memory | common practice

    def __str__(self) -> str:
        return f"[{self.key}] {self.citation} ({self.status})"


def _r(key: str, citation: str, status: str) -> tuple[str, Reference]:
    return key, Reference(key, citation, status)


REFERENCES: dict[str, Reference] = dict(
    [
        _r("dlmf19.33", "NIST Digital Library of Mathematical Functions, §19.33(iii) Depolarization factors, "
           "eq. 19.33.8 (F. W. J. Olver et al., eds., release 1.2)", "confirmed"),
        _r("carlson1995", "B. C. Carlson, 'Numerical computation of real or complex elliptic integrals', "
           "Numer. Algorithms 10 (1995) 13-26 (R_D as implemented by scipy.special.elliprd)", "confirmed"),
        _r("osborn1945", "J. A. Osborn, 'Demagnetizing factors of the general ellipsoid', Phys. Rev. 67 (1945) "
           "351-357 (closed forms for spheroids)", "from memory"),
        _r("stratton1941", "J. A. Stratton, Electromagnetic Theory, McGraw-Hill 1941, §3.25-3.27 (dielectric "
           "ellipsoid in a uniform field)", "from memory"),
        _r("crichton1989", "G. C. Crichton, P. W. Karlsson, A. Pedersen, 'Partial discharges in ellipsoidal and "
           "spheroidal voids', IEEE Trans. Electr. Insul. 24(2) (1989) 335-342", "from memory"),
        _r("pedersen1991", "A. Pedersen, G. C. Crichton, I. W. McAllister, 'The theory and measurement of "
           "partial discharge transients', IEEE Trans. Electr. Insul. 26(3) (1991) 487-497", "from memory"),
        _r("pedersen1995", "A. Pedersen, G. C. Crichton, I. W. McAllister, 'The functional relation between "
           "partial discharges and induced charge', IEEE Trans. Dielectr. Electr. Insul. 2(4) (1995) 535-543",
           "from memory"),
        _r("mcallister2002", "I. W. McAllister, 'Electric fields and electrical insulation', IEEE Trans. "
           "Dielectr. Electr. Insul. 9(5) (2002) 672-696", "confirmed"),
        _r("gemant1932", "A. Gemant, W. von Philippoff, 'Die Funkenstrecke mit Vorkondensator', Z. techn. Phys. "
           "13 (1932) 425", "from memory"),
        _r("kreuger1989", "F. H. Kreuger, Partial Discharge Detection in High-Voltage Equipment, Butterworths, "
           "London 1989 (three-capacitance model)", "from memory"),
        _r("wilson1927", "E. B. Wilson, 'Probable inference, the law of succession, and statistical inference', "
           "J. Amer. Stat. Assoc. 22 (1927) 209-212 (the score interval of a binomial proportion; as cited by "
           "scipy.stats.BinomTestResult.proportion_ci)", "confirmed"),
        _r("breiman1984", "L. Breiman, J. H. Friedman, R. A. Olshen, C. J. Stone, Classification and Regression "
           "Trees, Wadsworth, Belmont 1984 (the one-standard-error rule, section 3.4.3)", "from memory"),
        _r("hastie2009", "T. Hastie, R. Tibshirani, J. Friedman, The Elements of Statistical Learning, 2nd ed., "
           "Springer, New York 2009 (cross-validation and the one-standard-error rule, section 7.10)",
           "from memory"),
        _r("kuffel2000", "E. Kuffel, W. S. Zaengl, J. Kuffel, High Voltage Engineering: Fundamentals, 2nd ed., "
           "Newnes, Oxford 2000 (PD measurement chapter; gas breakdown chapter)", "from memory"),
        _r("kuffel2000_fields", "E. Kuffel, W. S. Zaengl, J. Kuffel, High Voltage Engineering: Fundamentals, "
           "2nd ed., Newnes, Oxford 2000 (electrostatic fields chapter: the coaxial cylindrical field "
           "E = V/(r ln(R/r_i)))", "from memory"),
        _r("niemeyer1995", "L. Niemeyer, 'A generalized approach to partial discharge modeling', IEEE Trans. "
           "Dielectr. Electr. Insul. 2(4) (1995) 510-528", "confirmed"),
        _r("gutfleisch1995", "F. Gutfleisch, L. Niemeyer, 'Measurement and simulation of PD in epoxy voids', "
           "IEEE Trans. Dielectr. Electr. Insul. 2(5) (1995) 729-743", "from memory"),
        _r("illias2011", "H. Illias, G. Chen, P. L. Lewin, 'Modeling of partial discharge activity in spherical "
           "cavities within a dielectric material', IEEE Electr. Insul. Mag. 27(1) (2011), "
           "doi:10.1109/MEI.2011.5699446", "confirmed"),
        _r("illias2011jpd", "H. Illias, G. Chen, P. L. Lewin, 'The influence of spherical cavity surface charge "
           "distribution on the sequence of partial discharge events', J. Phys. D: Appl. Phys. 44(24) (2011) "
           "245202", "confirmed"),
        _r("morrow1997", "R. Morrow, J. J. Lowke, 'Streamer propagation in air', J. Phys. D: Appl. Phys. 30 "
           "(1997) 614-627, appendix, doi:10.1088/0022-3727/30/4/017", "confirmed"),
        _r("raizer1991", "Yu. P. Raizer, Gas Discharge Physics, Springer, Berlin 1991, Table 4.1 (A, B of the "
           "first Townsend coefficient)", "from memory"),
        _r("bazelyan1998", "E. M. Bazelyan, Yu. P. Raizer, Spark Discharge, CRC Press 1998, p. 32 (air: A = 15 "
           "/(cm Torr), B = 365 V/(cm Torr), gamma = 0.01)", "confirmed"),
        _r("dakin1974", "T. W. Dakin et al., 'Breakdown of gases in uniform fields. Paschen curves for nitrogen, "
           "air and sulfur hexafluoride', Electra 32 (1974) 61-82", "from memory"),
        _r("hess1951", "V. F. Hess, in Compendium of Meteorology, American Meteorological Society 1951, "
           "atmospheric-electricity chapter, Table II (about 10 ion pairs per cm^3 per s near ground over land)",
           "confirmed"),
        _r("iec60270", "IEC 60270:2000+A1:2015, High-voltage test techniques - Partial discharge measurements, "
           "clause 3 (definitions of apparent charge, phase angle, I, D, P, n)", "from memory"),
        _r("iec60270_circuit", "IEC 60270:2000+A1:2015, High-voltage test techniques - Partial discharge "
           "measurements, clause 4 and figure 1 (test circuits: coupling capacitor, measuring impedance in series "
           "with it or with the test object) and clause 5 (calibration with a charge q0 = U0 C0 injected at the "
           "test object's terminals)", "from memory"),
        _r("iec60270_instrument", "IEC 60270:2000+A1:2015, clause 4.3 (wide-band instruments: f1 30-100 kHz, "
           "f2 <= 1 MHz (500 kHz recommended), bandwidth 100-900 kHz; narrow-band instruments: bandwidth 9-30 kHz, "
           "mid-band frequency 50 kHz-1 MHz; limit frequencies where the response has fallen by 6 dB; pulse "
           "resolution time: the shortest interval of two equal pulses whose reading changes by at most 10 %)",
           "from memory"),
        _r("butterworth1930", "S. Butterworth, 'On the theory of filter amplifiers', Wireless Engineer 7 (1930) "
           "536-541", "from memory"),
        _r("heaviside_expansion", "Partial-fraction (Heaviside) expansion of a rational transfer function, e.g. "
           "A. V. Oppenheim, A. S. Willsky, Signals and Systems, 2nd ed., Prentice Hall 1997, section 9.3",
           "from memory"),
        _r("rice1944", "S. O. Rice, 'Mathematical analysis of random noise', Bell System Technical Journal 23 "
           "(1944) 282-332 and 24 (1945) 46-156 (mean rate of level crossings of a Gaussian process)",
           "from memory"),
        _r("gulski1992", "E. Gulski, F. H. Kreuger, 'Computer-aided recognition of discharge sources', IEEE "
           "Trans. Electr. Insul. 27(1) (1992) 82-92", "from memory"),
        _r("gulski1993", "E. Gulski, 'Computer-aided measurement of partial discharges in HV equipment', IEEE "
           "Trans. Electr. Insul. 28(6) (1993) 969-983", "from memory"),
        _r("gulski1995", "E. Gulski, 'Digital analysis of partial discharges', IEEE Trans. Dielectr. Electr. "
           "Insul. 2(5) (1995) 822-837", "from memory"),
        _r("hoof1995", "M. Hoof, R. Patsch, 'Pulse-sequence analysis: a new method for investigating the "
           "physics of PD-induced ageing', IEE Proc.-Sci. Meas. Technol. 142(1) (1995) 95-101", "from memory"),
        _r("cacciari1995", "M. Cacciari, A. Contin, G. C. Montanari, 'Use of a mixed-Weibull distribution for "
           "the identification of PD phenomena', IEEE Trans. Dielectr. Electr. Insul. 2(4) (1995) 614-627",
           "from memory"),
        _r("forssen2008", "C. Forssén, H. Edin, 'Partial discharges in a cavity at variable applied frequency', "
           "Parts 1 and 2, IEEE Trans. Dielectr. Electr. Insul. 15(6) (2008) 1601-1616", "from memory"),
        _r("weibull1951", "W. Weibull, 'A statistical distribution function of wide applicability', J. Appl. "
           "Mech. 18 (1951) 293-297", "from memory"),
        _r("benard1953", "A. Benard, E. C. Bos-Levenbach, 'Het uitzetten van waarnemingen op "
           "waarschijnlijkheids-papier', Statistica Neerlandica 7 (1953) 163-173 (median ranks)", "from memory"),
        _r("meeker1998", "W. Q. Meeker, L. A. Escobar, Statistical Methods for Reliability Data, Wiley 1998",
           "from memory"),
        _r("smith1985", "R. L. Smith, 'Maximum likelihood estimation in a class of nonregular cases', "
           "Biometrika 72 (1985) 67-90", "from memory"),
        _r("efron1993", "B. Efron, R. J. Tibshirani, An Introduction to the Bootstrap, Chapman & Hall 1993",
           "from memory"),
        _r("brown2002", "E. N. Brown, R. Barbieri, V. Ventura, R. E. Kass, L. M. Frank, 'The time-rescaling "
           "theorem and its application to neural spike train data analysis', Neural Computation 14 (2002) "
           "325-346", "from memory"),
        _r("lewis1979", "P. A. W. Lewis, G. S. Shedler, 'Simulation of nonhomogeneous Poisson processes by "
           "thinning', Naval Research Logistics Quarterly 26(3) (1979) 403-413", "from memory"),
        _r("mckay1979", "M. D. McKay, R. J. Beckman, W. J. Conover, 'A comparison of three methods for selecting "
           "values of input variables in the analysis of output from a computer code', Technometrics 21(2) (1979) "
           "239-245", "from memory"),
        _r("richardson1911", "L. F. Richardson, 'The approximate arithmetical solution by finite differences of "
           "physical problems involving differential equations', Phil. Trans. R. Soc. A 210 (1911) 307-357",
           "from memory"),
        _r("cylinder_table", "pdvoid field-solver table of rounded-rim cylindrical voids, D/h 0.1-1000, er 1.5-100, "
           "with slab weights fitted to solver runs (pdvoid/coefficients/data/cylinder_isolated.npz; provenance in "
           "reference/cylinder_isolated/source.toml)", "derived"),
        _r("patankar1980", "S. V. Patankar, Numerical Heat Transfer and Fluid Flow, Hemisphere, New York 1980 "
           "(harmonic averaging of interface coefficients)", "from memory"),
        _r("mason1955", "J. H. Mason, 'Breakdown of solid dielectrics in divergent fields', Proc. IEE C 102 "
           "(1955) 254-263 (hyperboloid point-plane tip field), as quoted in Kuffel, Zaengl & Kuffel 2000",
           "from memory"),
        _r("codata2018", "E. Tiesinga et al., 'CODATA recommended values of the fundamental physical constants: "
           "2018', Rev. Mod. Phys. 93 (2021) 025010 (via scipy.constants)", "confirmed"),
        _r("lux_paschen", "J. Lux, notes on Paschen's law and the breakdown of air (web page, "
           "icestuff.com/~energy21/paschen2.htm; copy at neasmn.org): empirical air formula V = 24.22 x + "
           "6.08 sqrt(x) kV with x = 293 p d/(760 T), p in Torr, d in cm; air A, B, gamma quoted from "
           "Bazelyan & Raizer", "confirmed"),
        _r("schumann1923", "W. O. Schumann, Elektrische Durchbruchfeldstärke von Gasen, Springer, Berlin "
           "1923 (usual attribution of the empirical uniform-field breakdown formula of air)", "from memory"),
        _r("pedersen1970", "A. Pedersen, 'Criteria for spark breakdown in sulfur hexafluoride', IEEE Trans. "
           "Power App. Syst. PAS-89(8) (1970) 2043-2048 (linear effective ionisation of SF6, K = 10.5; "
           "attribution of the constants 27.7 /kV and 88.6 kV/(cm bar))", "from memory"),
        _r("mikropoulos2009", "P. N. Mikropoulos, V. N. Zagkanas, paper on positive corona inception in air, "
           "Proc. 16th Int. Symp. High Voltage Engineering (ISH), Cape Town 2009 (avalanche number 1e4, "
           "ionization integral about 9.2)", "confirmed"),
        _r("nitrogen_breakdown_tf", "Taylor & Francis book chapter, doi:10.1201/9780203025260-14, abstract: "
           "uniform-field breakdown of nitrogen about 30.4 kV for a 1 cm gap at 101.3 kPa", "confirmed"),
        _r("hvc_paschen", "High Voltage Connection, 'Paschen Curve: Voltage Breakdown vs Pressure' (web article, "
           "www.highvoltageconnection.com/articles/paschen-curve.html): minimum breakdown of air 327 V at "
           "standard atmospheric pressure, at a gap of 7.5 um (i.e. 0.570 Torr cm; temperature not stated)",
           "confirmed"),
        _r("shackelford2001", "J. F. Shackelford, W. Alexander (eds.), CRC Materials Science and Engineering "
           "Handbook, 3rd ed., CRC Press 2001, Table 296 'Dielectric strength of polymers' (short time, ASTM D149, "
           "V/mil; data compiled from Lynch, CRC Handbook of Materials Science vol. 3, 1975, and the ASM Engineered "
           "Materials Handbook vol. 2, 1988): cast acrylic sheet 450-530 V/mil", "confirmed"),
        _r("naidu2013", "M. S. Naidu, V. Kamaraju, High Voltage Engineering, McGraw-Hill (5th ed. 2013), gas "
           "breakdown chapter, table of minimum sparking potentials: air 327 V at 0.567 Torr cm, N2 251 V at "
           "0.67 Torr cm (table, edition and page from memory)", "from memory"),
        _r("massarczyk2017", "R. Massarczyk, P. Chu, C. Dugger, S. R. Elliott, K. Rielage, W. Xu, 'Paschen's law "
           "studies in cold gases', arXiv:1612.07170 (2017), abstract: the shift of the breakdown curve with gas "
           "temperature is explained by combining Paschen's law with the ideal gas law (density decides)",
           "confirmed"),
        _r("schottky1914", "W. Schottky, 'Über den Einfluß von Strukturwirkungen, besonders der Thomsonschen "
           "Bildkraft, auf die Elektronenemission der Metalle', Phys. Z. 15 (1914) 872-878 (image-force lowering "
           "of a surface barrier)", "from memory"),
        _r("kossyi1992", "I. A. Kossyi, A. Yu. Kostinsky, A. A. Matveyev, V. P. Silakov, 'Kinetic scheme of the "
           "non-equilibrium discharge in nitrogen-oxygen mixtures', Plasma Sources Sci. Technol. 1 (1992) 207-220 "
           "(detachment of O2- by N2 and O2 as fits in E/N)", "from memory"),
        _r("pancheshnyi2013", "S. Pancheshnyi, 'Effective ionization rate in nitrogen-oxygen mixtures', J. Phys. D: "
           "Appl. Phys. 46 (2013) 155201 (uses the detachment fits of kossyi1992)", "from memory"),
        _r("memory_illustrative", "pdvoid, memory model: illustrative parameter values chosen to give a few to "
           "tens of discharges per cycle in mm-size voids at 50 Hz, fitted to no measurement (each value of the "
           "parameter set says which)", "common practice"),
        _r("maxwell_wagner", "K. W. Wagner, 'Erklärung der dielektrischen Nachwirkungsvorgänge auf Grund "
           "Maxwellscher Vorstellungen', Arch. Elektrotech. 2 (1914) 371-387; R. W. Sillars, 'The properties of a "
           "dielectric containing semiconducting particles of various shapes', J. IEE 80 (1937) 378-394 "
           "(interfacial relaxation of an ellipsoid in a lossy host: complex permittivities in the electrostatic "
           "ellipsoid solution)", "from memory"),
        _r("okonski1960", "C. T. O'Konski, 'Electric properties of macromolecules. V. Theory of ionic "
           "polarization in polyelectrolytes', J. Phys. Chem. 64 (1960) 605-619 (a sphere of radius a with "
           "surface conductance K_s acts as a sphere of conductivity sigma + 2 K_s/a)", "from memory"),
        _r("eoll1975", "C. K. Eoll, 'Theory of stress distribution in insulation of high-voltage DC cables: "
           "Part I', IEEE Trans. Electr. Insul. EI-10(1) (1975) 27-35 (conductivity exp(alpha T + gamma E))",
           "from memory"),
        _r("jeroense1998", "M. J. P. Jeroense, P. H. F. Morshuis, 'Electric fields in HVDC paper-insulated "
           "cables', IEEE Trans. Dielectr. Electr. Insul. 5(2) (1998) 225-236 (Arrhenius-type conductivity "
           "sigma0 exp(-Ea/(k T)) exp(gamma E) of HVDC cable insulation)", "from memory"),
        _r("conduction_derived", "pdvoid, derived: void field in a conducting host as the response "
           "H(s) = f_cap + (f_res - f_cap)/(1 + s tau) of the complex-permittivity ellipsoid solution (docs, "
           "guide 'Conducting insulation and DC supplies')", "derived"),
        _r("breiman1984", "L. Breiman, J. H. Friedman, R. A. Olshen, C. J. Stone, Classification and Regression "
           "Trees, Wadsworth 1984, §3.4.3 (the one-standard-error rule)", "from memory"),
        _r("hastie2009", "T. Hastie, R. Tibshirani, J. Friedman, The Elements of Statistical Learning, 2nd ed., "
           "Springer 2009, §7.10 (cross-validation and the one-standard-error rule)", "from memory"),
        _r("wilson1927", "E. B. Wilson, 'Probable inference, the law of succession, and statistical inference', "
           "J. Am. Stat. Assoc. 22 (1927) 209-212 (the score interval of a binomial proportion)", "from memory"),
    ]
)


def get_reference(key: str) -> Reference:
    """The :class:`Reference` for ``key``; :class:`InputError` for an unknown key.

    Parameters
    ----------
    key : str
        A key of :data:`REFERENCES`.

    Returns
    -------
    Reference
        The entry.

    Raises
    ------
    InputError
        For an unknown key, listing the known ones.
    """
    try:
        return REFERENCES[key]
    except KeyError:
        raise InputError(f"unknown reference key {key!r}; known keys: {sorted(REFERENCES)}") from None


@runtime_checkable
class HasReferences(Protocol):
    """Anything that records the reference keys it relied on (a Result, Coefficients)."""

    @property
    def references(self) -> Iterable[str]:
        """The reference keys relied on, in order of first use."""
        ...


@runtime_checkable
class HasParameterValues(Protocol):
    """Anything that can list the parameter-set values it used, each with its source and status (a Result)."""

    def parameter_values(self) -> tuple[str, ...]:
        """One line per value: name, value and unit, status and source."""
        ...


def cite(source: str | Iterable[str] | HasReferences) -> str:
    """Full citations for a result, a scenario's coefficients, or an iterable of keys, one per line; for a result
    whose model comes from a parameter set, followed by the set's values as used, each with its source and status.

    Parameters
    ----------
    source : str or Iterable[str] or HasReferences
        A key, several keys, or an object with a ``references`` attribute (a Result, Coefficients).

    Returns
    -------
    str
        One full citation per line, each key once, in order of first use.

    Raises
    ------
    InputError
        For an unknown key or a ``source`` that is none of these.
    """
    keys: Iterable[str]
    if isinstance(source, str):
        keys = [source]
    elif isinstance(source, HasReferences):
        keys = source.references
    else:
        keys = source
    try:
        ordered = list(dict.fromkeys(keys))
    except TypeError:
        raise InputError(f"cite() needs a Result, Coefficients or keys; got {type(source).__name__}") from None
    text = "\n".join(str(get_reference(k)) for k in ordered)
    if isinstance(source, HasParameterValues):
        lines = source.parameter_values()
        if lines:
            text += "\n\nParameter values used:\n" + "\n".join(lines)
    return text
