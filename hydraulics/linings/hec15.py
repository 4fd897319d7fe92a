"""Relations of the permissible-shear-stress method for channel linings, SI.

Main reference: Kilgore, R. T. and Cotton, G. K., *Design of Roadside Channels
with Flexible Linings*, Hydraulic Engineering Circular No. 15, 3rd ed.,
FHWA-NHI-05-114, Federal Highway Administration, 2005 (cited below as
"HEC-15"). Chow, V. T., *Open-Channel Hydraulics*, McGraw-Hill, 1959, is cited
as "Chow (1959)".

Each relation is one function with its equation or table number. Whether
the value was read in the circular, and where, is kept in one place,
:mod:`hydraulics.provenance` (key given as ``provenance: <key>`` below);
values not yet read there are marked wherever they are printed and listed
on the sheet and in the window.

Functions that take user input check it (``InputError`` naming the field) and
flag a result outside the relation's range with a :class:`ValidityWarning`.
The ``_``-prefixed kernels do neither; the roughness models call them inside
the normal-depth iteration, where a warning per trial depth would be noise, and
report validity once through their ``check`` method instead.
"""

from __future__ import annotations

import math
import warnings
from typing import NamedTuple

import numpy as np
from ..roots import brentq

from .. import validate
from ..constants import G, GAMMA_WATER
from ..errors import InputError, NoSolutionError
from ..units import PSF
from ..wording import worded

__all__ = [
    "ValidityWarning", "NU_HEC15", "GAMMA_STONE", "SHIELDS_LOW", "SHIELDS_HIGH", "SF_LOW", "SF_HIGH",
    "RE_LOW", "RE_HIGH", "BLODGETT_RANGE", "BATHURST_RANGE", "STONE_SIZE_RANGE", "STEEP_SLOPE",
    "MIN_FREEBOARD", "FINE_D75", "COARSE_D75", "design_shear", "blodgett_n", "bathurst_n", "bathurst_n_manning",
    "strickler_n",
    "shear_velocity", "particle_reynolds", "shields_and_safety_factor", "stone_permissible_shear", "stone_size_note",
    "StoneSize", "required_d50", "required_d50_for_shear", "side_slope_factor", "bend_factor", "bend_protection_length",
    "tractive_force_ratio", "required_d50_side", "steep_slope_safety_factor", "required_d50_steep",
    "stone_layer_thickness", "DENSITY_STIFFNESS", "COVER_FACTOR", "cover_factor",
    "grass_roughness_coefficient", "vegetation_n", "soil_grain_n", "noncohesive_permissible_shear",
    "COHESIVE_COEFFICIENTS", "cohesive_permissible_shear", "effective_soil_shear",
    "vegetation_permissible_shear", "VEGETATED_SHEAR_RANGE", "VEGETATED_SHEAR_CAUTION", "RECP_CLASSES", "recp_typical_n", "recp_data_sheet_n",
    "MATTRESS_THICKNESS_RANGE", "GABION_FILL_FRACTION", "gabion_fill_check", "superelevation", "freeboard",
]


class ValidityWarning(UserWarning):
    """A result computed outside the published range of its relation."""


def _warn(message: str) -> None:
    warnings.warn(message, ValidityWarning, stacklevel=3)


# --------------------------------------------------------------------------
# constants of the method
# --------------------------------------------------------------------------

#: Kinematic viscosity used by HEC-15 in Eq. 6.9 [m^2/s], water at 15.5 C
#: (HEC-15 Section 6.2; provenance: particle_reynolds). The core's NU_WATER (20 C) is not used here
#: so that results match the circular.
NU_HEC15 = 1.131e-6

#: Typical specific weight of stone [N/m^3] (HEC-15 Section 6.2; provenance: gamma_stone).
GAMMA_STONE = 25900.0

#: HEC-15 Table 6.1 (provenance: table_6_1): F* = 0.047 and SF = 1.0 for
#: Re* <= 4e4; F* = 0.15 and SF = 1.5 for Re* >= 2e5; linear in Re* between.
SHIELDS_LOW, SHIELDS_HIGH = 0.047, 0.15
SF_LOW, SF_HIGH = 1.0, 1.5
RE_LOW, RE_HIGH = 4.0e4, 2.0e5

#: Range of Blodgett's relation, HEC-15 Eq. 6.1 (provenance: blodgett): 1.5 <= da/D50 <= 185.
BLODGETT_RANGE = (1.5, 185.0)
#: Range of Bathurst's relation, HEC-15 Eq. 6.2 (provenance: bathurst): 0.3 < da/D50 < 8.0.
BATHURST_RANGE = (0.3, 8.0)
#: Stone sizes the Chapter 6 procedures apply to [m]: 15 mm gravel to 550 mm
#: riprap (HEC-15 Chapter 6; provenance: size_classes).
STONE_SIZE_RANGE = (0.015, 0.550)
#: Bed slope above which HEC-15 sends riprap design to the steep-slope
#: procedure of Appendix D (provenance: steep_slope).
STEEP_SLOPE = 0.10
#: Minimum freeboard for roadside channels [m] (provenance: freeboard; local codes govern).
MIN_FREEBOARD = 0.15

# denominator of Eq. 6.1 vanishes at da/D50 = 10^(-2.25/5.23)
_BLODGETT_POLE = 10.0 ** (-2.25 / 5.23)


def _vec(*values):
    return any(isinstance(v, np.ndarray) for v in values)


def _span(values, scale=1.0, fmt=".3g") -> str:
    """'x' for one value, 'x..y' for several (for warning texts)."""
    a = np.asarray(values, dtype=float) * scale
    lo, hi = float(a.min()), float(a.max())
    return f"{lo:{fmt}}" if lo == hi else f"{lo:{fmt}}..{hi:{fmt}}"


# --------------------------------------------------------------------------
# Chapter 3: design shear, side slopes, bends
# --------------------------------------------------------------------------

def design_shear(depth, slope, gamma_water=GAMMA_WATER):
    r"""Design shear stress at the maximum depth, HEC-15 Eq. 3.1.

    .. math:: \tau_d = \gamma d S

    Parameters
    ----------
    depth : float or ndarray
        Maximum flow depth d [m], > 0.
    slope : float or ndarray
        Channel slope S [m/m].
    gamma_water : float
        Unit weight of water [N/m^3]; 9810 in HEC-15.

    Returns
    -------
    float or ndarray
        Design shear stress on the bed at the deepest point [Pa].

    References
    ----------
    HEC-15 Eq. 3.1 (verified: read in Section 3.1 and as quoted in Section 6.2).
    """
    d = validate.positive("depth", depth)
    s = validate.slope(slope)
    gw = validate.positive("gamma_water", gamma_water)
    return gw * d * s


def side_slope_factor(side_slope):
    r"""Ratio K1 of the maximum side shear to the bed shear, HEC-15 Chapter 3.

    .. math::
        K_1 = 0.77 \ (Z \le 1.5);\quad K_1 = 0.066 Z + 0.67 \ (1.5 < Z < 5);
        \quad K_1 = 1.0 \ (Z \ge 5)

    Parameters
    ----------
    side_slope : float or ndarray
        Side slope Z, horizontal to vertical (H:V), >= 0.

    Returns
    -------
    float or ndarray
        K1 [-]; the side shear is tau_s = K1 * tau_d.

    Notes
    -----
    HEC-15 Section 3.2, side slope stability (the number follows the order the
    chapter's opening states); not verified against the circular
    (provenance: ``side_factor``; the section could not be read in the copies
    searched). The three pieces meet at Z = 1.5 (0.769) and
    Z = 5 (1.000), a consistency check on the coefficients.
    Z = 0 (vertical walls) is given 0.77 as the steepest tabulated case.

    References
    ----------
    HEC-15 Section 3.2 (provenance: ``side_factor``).
    """
    z = validate.non_negative("side_slope", side_slope)
    if _vec(z):
        return np.where(z <= 1.5, 0.77, np.where(z < 5.0, 0.066 * z + 0.67, 1.0))
    return 0.77 if z <= 1.5 else (0.066 * z + 0.67 if z < 5.0 else 1.0)


def bend_factor(bend_radius, top_width):
    r"""Ratio Kb of the maximum shear in a bend to the straight-reach design shear.

    .. math::
        K_b = 2.00 \ (R_c/T \le 2);\quad
        K_b = 2.38 - 0.206 (R_c/T) + 0.0073 (R_c/T)^2 \ (2 < R_c/T < 10);\quad
        K_b = 1.05 \ (R_c/T \ge 10)

    Parameters
    ----------
    bend_radius : float or ndarray
        Radius of curvature of the bend centre line Rc [m], > 0.
    top_width : float or ndarray
        Water-surface width T [m], > 0.

    Returns
    -------
    float or ndarray
        Kb [-]; the bend shear is tau_b = Kb * tau_d.

    Notes
    -----
    HEC-15 Section 3.4, after Young et al., 1996; not verified against the
    circular (provenance: ``bend_factor``). HEC-22, 3rd ed., Eq. 5-15 and
    Chart 21 read Kb against Rc/B, B the bottom width: with T >= B the ratio
    Rc/T used here is the smaller and Kb the larger. The quadratic gives 1.997 at
    Rc/T = 2 and 1.050 at Rc/T = 10, so the pieces meet, a consistency check
    on the coefficients.

    References
    ----------
    HEC-15, Chapter 3.
    """
    rc = validate.positive("bend_radius", bend_radius)
    t = validate.positive("top_width", top_width)
    r = rc / t
    if _vec(r):
        mid = 2.38 - 0.206 * r + 0.0073 * r ** 2
        return np.where(r <= 2.0, 2.0, np.where(r < 10.0, mid, 1.05))
    if r <= 2.0:
        return 2.0
    return 2.38 - 0.206 * r + 0.0073 * r * r if r < 10.0 else 1.05


def bend_protection_length(hydraulic_radius, n):
    r"""Length of protection needed downstream of the end of a bend.

    .. math:: L_p = \alpha \frac{R^{7/6}}{n_b}, \quad \alpha = 0.736 \ \text{(SI)}

    Parameters
    ----------
    hydraulic_radius : float or ndarray
        Hydraulic radius R of the flow [m], > 0.
    n : float or ndarray
        Manning's n of the bend lining [s/m^(1/3)], > 0.

    Returns
    -------
    float or ndarray
        Length Lp [m] measured downstream from the end of the bend.

    Notes
    -----
    HEC-22, 3rd ed., 2009, Eq. 5-16, which gives HEC-15 Section 3.4's
    relation (provenance: ``bend_length``): Ku = 0.736 SI and 0.604 CU. The
    two constants differ by 0.3048^(-1/6), as they must for a length computed
    from R^(7/6)/n; the SI value is used here.

    References
    ----------
    HEC-22, 3rd ed., FHWA-NHI-10-009, 2009, Section 5.1.7, Eq. 5-16; HEC-15, Section 3.4.
    """
    r = validate.positive("hydraulic_radius", hydraulic_radius)
    nb = validate.positive("n", n)   # any n > 0: a lining's relation can give one above the range typed by hand
    return 0.736 * r ** (7.0 / 6.0) / nb


# --------------------------------------------------------------------------
# Chapter 6: stone linings, roughness
# --------------------------------------------------------------------------

def _blodgett_n(da, d50):
    ratio = da / d50
    return 0.319 * da ** (1.0 / 6.0) / (2.25 + 5.23 * (np.log10(ratio) if _vec(ratio) else math.log10(ratio)))


def blodgett_n(average_depth, d50):
    r"""Manning's n of a riprap or gravel lining by Blodgett's relation, HEC-15 Eq. 6.1.

    .. math:: n = \frac{\alpha\, d_a^{1/6}}{2.25 + 5.23 \log_{10}(d_a / D_{50})},
        \quad \alpha = 0.319 \ \text{(SI)}

    Parameters
    ----------
    average_depth : float or ndarray
        Average flow depth da = A/T [m], > 0.
    d50 : float or ndarray
        Median stone size D50 [m], > 0.

    Returns
    -------
    float or ndarray
        Manning's n [s/m^(1/3)].

    Notes
    -----
    Valid for 1.5 <= da/D50 <= 185 (HEC-15, verified); a ValidityWarning is
    issued outside. Below da/D50 = 10^(-2.25/5.23) = 0.371 the denominator is
    not positive and the relation has no meaning: InputError.

    References
    ----------
    HEC-15 Eq. 6.1 (verified); Blodgett, J. C., USGS WRI Report 86-4127, 1986.
    """
    da = validate.positive("average_depth", average_depth)
    d = validate.positive("d50", d50)
    ratio = np.asarray(da / d)
    if np.any(ratio <= _BLODGETT_POLE):
        raise InputError("average_depth", f"da/D50 must be > {_BLODGETT_POLE:.3f} for Blodgett's relation "
                                          f"(HEC-15 Eq. 6.1), got {float(np.min(ratio)):.3g}; "
                                          "use Bathurst's relation for shallow flow over large stone")
    lo, hi = BLODGETT_RANGE
    if np.any((ratio < lo) | (ratio > hi)):
        _warn(f"da/D50 = {_span(ratio)} is outside the range {lo:g} to {hi:g} of Blodgett's relation "
              "(HEC-15 Eq. 6.1)")
    return _blodgett_n(da, d)


def _floats(*values):
    """``values`` with each Python number as a numpy float: a power beyond the floats then gives inf or 0, as it
    does in an array, instead of raising OverflowError (a trial section far from any ditch, e.g. a rectangle a
    hair wide in the search for a bottom width)."""
    return tuple(v if isinstance(v, np.ndarray) else np.float64(v) for v in values)


def _bathurst_exponent(da, d50, top_width):
    """b of Eq. 6.6 and the exponent p of f(Fr) in Eq. 6.3 (all whether Bathurst's relation is usable needs)."""
    da, d50, top_width = _floats(da, d50, top_width)
    with np.errstate(over="ignore", divide="ignore", invalid="ignore"):
        b = 1.14 * (d50 / top_width) ** 0.453 * (da / d50) ** 0.814       # Eq. 6.6
        return b, np.log10(0.755 / b)                                     # exponent in Eq. 6.3


def _bathurst_terms(da, d50, top_width):
    """b, exponent of f(Fr), and the Froude-free part K of Eq. 6.2 (SI, alpha = 1)."""
    da, d50, top_width = _floats(da, d50, top_width)
    rel_w = top_width / d50
    b, p = _bathurst_exponent(da, d50, top_width)
    with np.errstate(over="ignore", divide="ignore", invalid="ignore"):
        f_reg = 13.434 * rel_w ** 0.492 * b ** (1.025 * rel_w ** 0.118)   # Eq. 6.4
        f_cg = (top_width / da) ** (-b)                                   # Eq. 6.5
        k = da ** (1.0 / 6.0) / (math.sqrt(G) * f_reg * f_cg)             # Eq. 6.2 without f(Fr)
    return b, p, k


def _bathurst_n(da, d50, top_width, froude):
    b, p, k = _bathurst_terms(da, d50, top_width)
    return k / (0.28 * froude / b) ** p                                   # Eq. 6.2 with 6.3


def bathurst_n(average_depth, d50, top_width, froude):
    r"""Manning's n of shallow flow over large stone by Bathurst's relation, HEC-15 Eq. 6.2.

    .. math::
        n = \frac{\alpha\, d_a^{1/6}}{\sqrt{g}\, f(Fr)\, f(REG)\, f(CG)}, \quad \alpha = 1.0 \ \text{(SI)}

        f(Fr) = (0.28\, Fr / b)^{\log_{10}(0.755/b)}, \quad
        f(REG) = 13.434 (T/D_{50})^{0.492}\, b^{1.025 (T/D_{50})^{0.118}}

        f(CG) = (T/d_a)^{-b}, \quad b = 1.14 (D_{50}/T)^{0.453} (d_a/D_{50})^{0.814}

    Parameters
    ----------
    average_depth : float or ndarray
        Average flow depth da = A/T [m], > 0.
    d50 : float or ndarray
        Median stone size D50 [m], > 0.
    top_width : float or ndarray
        Channel top width T [m], > 0.
    froude : float or ndarray
        Froude number V / sqrt(g da) [-], > 0.

    Returns
    -------
    float or ndarray
        Manning's n [s/m^(1/3)].

    Notes
    -----
    Valid for 0.3 < da/D50 < 8.0 (HEC-15, verified); a ValidityWarning is
    issued outside. The form of Eq. 6.2, its constant and its range were read
    in HEC-15; the expressions of Eq. 6.3 to 6.6 are not verified against
    the circular (provenance: ``bathurst_terms``; they appear as images in the
    copy that could be read).

    References
    ----------
    HEC-15 Eq. 6.2 to 6.6; Bathurst, J. C., 1991, as cited there.
    """
    da = validate.positive("average_depth", average_depth)
    d = validate.positive("d50", d50)
    t = validate.positive("top_width", top_width)
    fr = validate.positive("froude", froude)
    _bathurst_range_warning(da / d)
    return _bathurst_n(da, d, t, fr)


def _bathurst_range_warning(ratio):
    lo, hi = BATHURST_RANGE
    r = np.asarray(ratio)
    if np.any((r <= lo) | (r >= hi)):
        _warn(f"da/D50 = {_span(r)} is outside the range {lo:g} to {hi:g} of Bathurst's relation "
              "(HEC-15 Eq. 6.2)")


def _bathurst_n_manning(da, d50, top_width, hydraulic_radius, slope):
    # Fr = V / sqrt(g da) with V = R^(2/3) S^(1/2) / n, so Fr = c / n and Eq. 6.2
    # reads n = K (b n / (0.28 c))^p, i.e. n^(1-p) = K (b / (0.28 c))^p.
    return _bathurst_n_manning_terms(_bathurst_terms(da, d50, top_width), da, hydraulic_radius, slope)


def _bathurst_n_manning_terms(terms, da, hydraulic_radius, slope):
    """:func:`_bathurst_n_manning` from the terms (b, p, K) of :func:`_bathurst_terms` at ``da``."""
    b, p, k = terms
    sqrt = np.sqrt if _vec(da, hydraulic_radius, slope, b) else math.sqrt
    c = hydraulic_radius ** (2.0 / 3.0) * sqrt(slope) / sqrt(G * da)
    one_minus_p = 1.0 - p
    vector = _vec(da, hydraulic_radius, slope, b)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        om = np.asarray(one_minus_p, dtype=float)
        base = np.asarray(k * (b / (0.28 * c)) ** p, dtype=float)
        safe = np.abs(om) > 1e-9
        n = np.where(safe, base ** (1.0 / np.where(safe, om, 1.0)), np.nan)
    n = n if vector else float(n)
    return n


def bathurst_n_manning(average_depth, d50, top_width, hydraulic_radius, slope):
    r"""Bathurst's n (HEC-15 Eq. 6.2) with the Froude number from Manning's equation.

    In uniform flow V = R^(2/3) S^(1/2) / n, so Fr depends on n itself. With
    f(Fr) a power of Fr (Eq. 6.3) the pair has the closed-form solution

    .. math:: n = \left[K \left(\frac{b}{0.28\, c}\right)^{p}\right]^{1/(1-p)},
        \quad c = \frac{R^{2/3} S^{1/2}}{\sqrt{g d_a}}, \quad p = \log_{10}(0.755/b)

    where K is Eq. 6.2 without f(Fr).

    Parameters
    ----------
    average_depth : float or ndarray
        Average flow depth da = A/T [m], > 0.
    d50 : float or ndarray
        Median stone size D50 [m], > 0.
    top_width : float or ndarray
        Channel top width T [m], > 0.
    hydraulic_radius : float or ndarray
        Hydraulic radius R = A/P [m], > 0.
    slope : float or ndarray
        Energy (bed) slope S [m/m].

    Returns
    -------
    float or ndarray
        Manning's n [s/m^(1/3)] consistent with Eq. 6.2 and Manning's equation.

    Notes
    -----
    Same range as :func:`bathurst_n`. At b = 0.0755 (p = 1) n drops out and
    there is no solution: NoSolutionError.

    References
    ----------
    HEC-15 Eq. 6.2 to 6.6 (see :func:`bathurst_n`); Manning's equation, Chow (1959) Eq. 5-6.
    """
    da = validate.positive("average_depth", average_depth)
    d = validate.positive("d50", d50)
    t = validate.positive("top_width", top_width)
    r = validate.positive("hydraulic_radius", hydraulic_radius)
    s = validate.slope(slope)
    _bathurst_range_warning(da / d)
    n = _bathurst_n_manning(da, d, t, r, s)
    if not np.all(np.isfinite(n)):
        raise NoSolutionError("Bathurst's relation with Manning's equation has no solution where "
                              "b = 0.0755 (the Froude term cancels); use Blodgett's relation")
    return n


def strickler_n(d50):
    r"""Manning's n of a stone bed by Strickler's relation as given by Chow (1959).

    .. math:: n = 0.034\, D^{1/6} \quad (D \text{ in ft}),
        \text{ i.e. } n = 0.034\, (D/0.3048)^{1/6} \ (D \text{ in m})

    Parameters
    ----------
    d50 : float or ndarray
        Stone size D [m] (D50 here), > 0.

    Returns
    -------
    float or ndarray
        Manning's n [s/m^(1/3)], independent of depth.

    Notes
    -----
    Chow (1959), Chapter 5, Strickler's formula with the coefficient 0.034
    for D in feet; not verified (provenance: ``strickler``). Offered as a simple alternative; HEC-15
    recommends Eq. 6.1/6.2 for riprap and gravel linings.

    References
    ----------
    Chow (1959); Strickler, A., 1923.
    """
    d = validate.positive("d50", d50)
    return 0.034 * (d / 0.3048) ** (1.0 / 6.0)


# --------------------------------------------------------------------------
# Chapter 6: stone linings, permissible shear and sizing
# --------------------------------------------------------------------------

def shear_velocity(depth, slope):
    r"""Shear velocity at the maximum depth, HEC-15 Section 6.2 (provenance: ``shear_velocity``).

    .. math:: V_* = \sqrt{g d S}

    Parameters
    ----------
    depth : float or ndarray
        Maximum flow depth d [m], > 0.
    slope : float or ndarray
        Channel slope S [m/m].

    Returns
    -------
    float or ndarray
        V* [m/s].

    References
    ----------
    HEC-15 Section 6.2.
    """
    d = validate.positive("depth", depth)
    s = validate.slope(slope)
    return np.sqrt(G * d * s) if _vec(d, s) else math.sqrt(G * d * s)


def particle_reynolds(depth, slope, d50, nu=NU_HEC15):
    r"""Particle Reynolds number, HEC-15 Eq. 6.9.

    .. math:: Re_* = \frac{V_* D_{50}}{\nu}, \quad V_* = \sqrt{g d S}

    Parameters
    ----------
    depth : float or ndarray
        Maximum flow depth d [m], > 0.
    slope : float or ndarray
        Channel slope S [m/m].
    d50 : float or ndarray
        Median stone size D50 [m], > 0.
    nu : float
        Kinematic viscosity [m^2/s]; HEC-15 uses 1.131e-6 (15.5 C).

    Returns
    -------
    float or ndarray
        Re* [-].

    References
    ----------
    HEC-15 Eq. 6.9 (verified, with nu).
    """
    d = validate.positive("d50", d50)
    v = validate.positive("nu", nu)
    return shear_velocity(depth, slope) * d / v


def _shields_sf(re):
    t = (re - RE_LOW) / (RE_HIGH - RE_LOW)
    if _vec(t):
        t = np.clip(t, 0.0, 1.0)  # Table 6.1 is flat outside the interpolation band
    else:
        t = min(1.0, max(0.0, t))
    return SHIELDS_LOW + (SHIELDS_HIGH - SHIELDS_LOW) * t, SF_LOW + (SF_HIGH - SF_LOW) * t


def shields_and_safety_factor(reynolds):
    r"""Shields parameter F* and safety factor SF from the particle Reynolds number.

    ========================  ======================  ======================
    Re*                       F*                      SF
    ========================  ======================  ======================
    <= 4e4                    0.047                   1.0
    4e4 to 2e5                linear interpolation    linear interpolation
    >= 2e5                    0.15                    1.5
    ========================  ======================  ======================

    Parameters
    ----------
    reynolds : float or ndarray
        Particle Reynolds number Re* [-], > 0 (:func:`particle_reynolds`).

    Returns
    -------
    (float or ndarray, float or ndarray)
        (F*, SF) [-].

    Notes
    -----
    HEC-15 Table 6.1, not verified (provenance: ``table_6_1``). The constant rows are the table's own
    values, not a clamp of an extrapolated relation.

    References
    ----------
    HEC-15 Table 6.1.
    """
    re = validate.positive("reynolds", reynolds)
    return _shields_sf(re)


def stone_permissible_shear(d50, shields=SHIELDS_LOW, gamma_stone=GAMMA_STONE, gamma_water=GAMMA_WATER):
    r"""Permissible shear stress of a stone lining, HEC-15 Eq. 6.7.

    .. math:: \tau_p = F_* (\gamma_s - \gamma) D_{50}

    Parameters
    ----------
    d50 : float or ndarray
        Median stone size D50 [m], > 0.
    shields : float or ndarray
        Shields parameter F* [-] (Table 6.1; 0.047 for Re* <= 4e4).
    gamma_stone : float or ndarray
        Specific weight of the stone [N/m^3], > gamma_water (25 900 typical).
    gamma_water : float
        Specific weight of water [N/m^3] (9810).

    Returns
    -------
    float or ndarray
        Permissible shear tau_p [Pa].

    Notes
    -----
    Sizes outside 15 mm to 550 mm (the Chapter 6 range) give a ValidityWarning.

    References
    ----------
    HEC-15 Eq. 6.7 (verified).
    """
    d = validate.positive("d50", d50)
    f = validate.positive("shields", shields)
    gw = validate.positive("gamma_water", gamma_water)
    gs = validate.number("gamma_stone", gamma_stone, low=gw, hint=" (the stone must be heavier than water)")
    _stone_size_warning(d)
    return f * (gs - gw) * d


def stone_size_note(d50) -> str | None:
    """The words of the ValidityWarning for stone sizes ``d50`` [m] (one or several) outside the 15 to 550 mm
    range of the HEC-15 Chapter 6 procedures (:data:`STONE_SIZE_RANGE`), or None where every size is within it.
    The sizes are quoted as one value or as the smallest to the largest."""
    lo, hi = STONE_SIZE_RANGE
    d = np.asarray(d50)
    if not np.any((d < lo) | (d > hi)):
        return None
    smallest, largest = float(d.min()), float(d.max())
    sizes = {"d": (smallest, "small_length")} if smallest == largest else \
        {"d": (smallest, "small_length"), "d_max": (largest, "small_length")}
    return worded("D50 = {d}" + (" to {d_max}" if len(sizes) > 1 else "") + " is outside the {lo} to {hi} range "
                  "of the HEC-15 Chapter 6 procedures", lo=(lo, "small_length"), hi=(hi, "small_length"), **sizes)


def _stone_size_warning(d50):
    note = stone_size_note(d50)
    if note is not None:
        _warn(note)


class StoneSize(NamedTuple):
    """Result of a stone sizing: D50 and the Table 6.1 values used for it."""

    d50: object          # [m]
    shields: object      # F* [-]
    safety_factor: object  # SF [-]
    reynolds: object     # Re* [-]


def _required_d50_scalar(k, c):
    """Root of D = k SF(cD) / F*(cD) (k = d S / (SG - 1), c = V*/nu); unique, see required_d50."""
    d_low = k * SF_LOW / SHIELDS_LOW            # Re* <= 4e4 branch
    if c * d_low <= RE_LOW:
        return d_low
    d_high = k * SF_HIGH / SHIELDS_HIGH         # Re* >= 2e5 branch
    if c * d_high >= RE_HIGH:
        return d_high
    # interpolation band: D (F0 + dF t) = k (S0 + dS t), t = (cD - Re0) / dRe, a quadratic in D
    dre = RE_HIGH - RE_LOW
    df, dsf = SHIELDS_HIGH - SHIELDS_LOW, SF_HIGH - SF_LOW
    a = df * c / dre
    b = SHIELDS_LOW - df * RE_LOW / dre - k * dsf * c / dre
    cc = -k * (SF_LOW - dsf * RE_LOW / dre)
    disc = b * b - 4 * a * cc
    root = (-b + math.sqrt(disc)) / (2 * a)
    return root


def required_d50(depth, slope, gamma_stone=GAMMA_STONE, gamma_water=GAMMA_WATER, nu=NU_HEC15):
    r"""Smallest stable D50 for the channel bed, HEC-15 Eq. 6.8 with Table 6.1.

    .. math:: D_{50} = \frac{SF\, d\, S}{F_* (SG - 1)}, \quad SG = \gamma_s / \gamma

    where F* and SF follow from Re* = sqrt(g d S) D50 / nu (Eq. 6.9, Table 6.1),
    so D50 appears on both sides.

    Parameters
    ----------
    depth : float or ndarray
        Maximum flow depth d [m], > 0 (held fixed: the change of n with D50 is
        the caller's coupled solve).
    slope : float or ndarray
        Channel slope S [m/m].
    gamma_stone, gamma_water : float
        Specific weights [N/m^3].
    nu : float
        Kinematic viscosity [m^2/s] (1.131e-6 in HEC-15).

    Returns
    -------
    StoneSize
        (d50 [m], shields F*, safety_factor SF, reynolds Re*).

    Notes
    -----
    The iteration of HEC-15 is solved exactly: SF/F* falls as Re* rises
    (from 1.0/0.047 = 21.3 to 1.5/0.15 = 10), so D - k SF/F* increases with D
    and has one root, found in the flat branches directly or as the root of a
    quadratic in the interpolation band. Results outside 15-550 mm give a
    ValidityWarning.

    References
    ----------
    HEC-15 Eq. 6.8 and 6.9 (read), Table 6.1 (not verified; provenance: ``table_6_1``).
    """
    d = validate.positive("depth", depth)
    s = validate.slope(slope)
    gw = validate.positive("gamma_water", gamma_water)
    gs = validate.number("gamma_stone", gamma_stone, low=gw, hint=" (the stone must be heavier than water)")
    v = validate.positive("nu", nu)
    size = _stone_size(gw * d * s, d, s, gs, gw, v)
    _stone_size_warning(size.d50)
    return size


def _stone_size(tau, d, s, gs, gw, v) -> StoneSize:
    """Eq. 6.8 for a design shear tau (checked inputs; arrays element by element)."""
    k = tau / (gs - gw)
    c = (np.sqrt(G * d * s) if _vec(d, s) else math.sqrt(G * d * s)) / v
    if _vec(k, c):
        kk, cc = np.broadcast_arrays(np.asarray(k, float), np.asarray(c, float))
        d50 = np.array([_required_d50_scalar(a, b) for a, b in zip(kk.ravel(), cc.ravel())]).reshape(kk.shape)
    else:
        d50 = _required_d50_scalar(k, c)
    re = c * d50
    f, sf = _shields_sf(re)
    return StoneSize(d50, f, sf, re)


def required_d50_for_shear(design_shear_value, depth, slope, gamma_stone=GAMMA_STONE, gamma_water=GAMMA_WATER,
                           nu=NU_HEC15):
    r"""Smallest D50 whose permissible shear, with Table 6.1's safety factor, resists a given shear.

    .. math:: F_* (\gamma_s - \gamma) D_{50} \ge SF\, \tau, \quad
        F_*, SF \text{ from } Re_* = \sqrt{g d S}\, D_{50} / \nu

    This is Eq. 6.8 with the bed shear gamma d S replaced by any design shear
    tau (for instance K1 tau_d / K2 on a side slope, or Kb tau_d in a bend);
    the particle Reynolds number keeps the shear velocity of the straight
    channel at its maximum depth, as in Eq. 6.9.

    Parameters and result are those of :func:`required_d50` (single values
    here, depth and slope for Re* only), with ``design_shear_value`` the
    shear the stone must resist [Pa], > 0.

    Notes
    -----
    With tau = gamma d S it equals :func:`required_d50`. In the flat parts
    of Table 6.1 (F* and SF constant) the result is proportional to tau, so
    a side-slope size K1/K2 times the bed size (HEC-15 Section 6.3.2; its equation number not read) follows;
    in the interpolation band the size is solved exactly for the stated
    criterion instead. No range warning is issued: the caller words it.

    References
    ----------
    HEC-15 Eq. 6.7 to 6.9 (read), Table 6.1 (not verified; provenance: ``table_6_1``).
    """
    tau = validate.positive("design_shear", design_shear_value)
    d = validate.positive("depth", depth)
    s = validate.slope(slope)
    gw = validate.positive("gamma_water", gamma_water)
    gs = validate.number("gamma_stone", gamma_stone, low=gw, hint=" (the stone must be heavier than water)")
    v = validate.positive("nu", nu)
    if _vec(tau, d, s):
        raise InputError("design_shear", "must be a single value here")
    return _stone_size(tau, d, s, gs, gw, v)


def tractive_force_ratio(side_slope, angle_of_repose):
    r"""Tractive force ratio K2 of stone on a side slope, HEC-15 Section 6.3.2.

    .. math:: K_2 = \sqrt{1 - \frac{\sin^2\theta}{\sin^2\phi}}, \quad \theta = \arctan(1/Z)

    Parameters
    ----------
    side_slope : float or ndarray
        Side slope Z (H:V), > 0.
    angle_of_repose : float or ndarray
        Angle of repose of the stone phi [degrees], 0 < phi < 90.

    Returns
    -------
    float or ndarray
        K2 [-], the ratio of the stone's resistance on the side to that on the bed.

    Raises
    ------
    NoSolutionError
        The side slope is as steep as or steeper than the angle of repose: the
        stone cannot rest there at all.

    Notes
    -----
    HEC-15 Section 6.3.2, after Anderson et al., 1970; not verified against
    the circular (provenance: ``tractive_ratio``). HEC-15 Figure 6.2 gives phi
    from D50 and stone shape (about 40 to 42 degrees for angular riprap; not
    verified, provenance: ``angle_of_repose``).

    References
    ----------
    HEC-15 Section 6.3.2.
    """
    z = validate.positive("side_slope", side_slope)
    phi = validate.number("angle_of_repose", angle_of_repose, low=0.0, high=90.0, high_inclusive=False)
    theta = np.arctan(1.0 / np.asarray(z))
    ratio = np.sin(theta) / np.sin(np.radians(phi))
    if np.any(ratio >= 1.0):
        raise NoSolutionError(f"side slope {float(np.min(z)):g}:1 is as steep as or steeper than the stone's "
                              f"angle of repose ({float(np.max(phi)):g} degrees); stone cannot rest on it")
    k2 = np.sqrt(1.0 - ratio ** 2)
    return k2 if _vec(z, phi) else float(k2)


def required_d50_side(d50_bottom, side_slope, angle_of_repose):
    r"""Stone size needed on the side slopes from the size needed on the bed, HEC-15 Section 6.3.2.

    .. math:: D_{50,sides} = \frac{K_1}{K_2} D_{50,bottom}

    Parameters
    ----------
    d50_bottom : float or ndarray
        D50 required on the bed [m], > 0 (:func:`required_d50`).
    side_slope : float or ndarray
        Side slope Z (H:V), > 0.
    angle_of_repose : float or ndarray
        Angle of repose phi [degrees].

    Returns
    -------
    float or ndarray
        D50 required on the sides [m].

    Notes
    -----
    HEC-15 Section 6.3.2 (provenance: ``tractive_ratio``, not verified). For
    mild slopes; on steep slopes use :func:`required_d50_steep`.

    References
    ----------
    HEC-15 Section 6.3.2.
    """
    d = validate.positive("d50_bottom", d50_bottom)
    return side_slope_factor(side_slope) / tractive_force_ratio(side_slope, angle_of_repose) * d


def _steep_sf(d50, tau_side, theta, alpha, phi, shields, gs, gw):
    """Safety factor of a stone on a side slope in flow down a sloping bed (HEC-15 Appendix D).

    Floats use the math module (this runs inside root finders); any array argument, numpy.
    """
    m = np if _vec(d50, tau_side, theta, alpha, phi, shields, gs) else math
    eta = tau_side / (shields * (gs - gw) * d50)                     # stability number
    tphi = m.tan(phi)
    beta = m.atan(m.cos(alpha) / (2.0 * m.sin(theta) / (eta * tphi) + m.sin(alpha)))
    eta_p = eta * (1.0 + m.sin(alpha + beta)) / 2.0
    return m.cos(theta) * tphi / (eta_p * tphi + m.sin(theta) * m.cos(beta))


def steep_slope_safety_factor(d50, depth, slope, side_slope, angle_of_repose, shields=SHIELDS_LOW,
                              gamma_stone=GAMMA_STONE, gamma_water=GAMMA_WATER):
    r"""Safety factor of side-slope stone in flow down a steep bed, HEC-15 Appendix D.

    .. math::
        SF = \frac{\cos\theta \tan\phi}{\eta' \tan\phi + \sin\theta \cos\beta},\quad
        \eta = \frac{K_1 \gamma d S}{F_* (\gamma_s - \gamma) D_{50}}

        \eta' = \eta \frac{1 + \sin(\alpha + \beta)}{2},\quad
        \beta = \arctan\frac{\cos\alpha}{2 \sin\theta / (\eta \tan\phi) + \sin\alpha}

    with theta the side-slope angle, alpha the bed-slope angle and phi the
    angle of repose.

    Parameters
    ----------
    d50 : float or ndarray
        Stone size D50 [m], > 0.
    depth : float or ndarray
        Maximum flow depth d [m], > 0.
    slope : float or ndarray
        Bed slope S [m/m].
    side_slope : float or ndarray
        Side slope Z (H:V), > 0.
    angle_of_repose : float or ndarray
        phi [degrees], 0 < phi < 90.
    shields : float or ndarray
        F* [-].
    gamma_stone, gamma_water : float
        Specific weights [N/m^3].

    Returns
    -------
    float or ndarray
        Safety factor against rolling [-]; >= the Table 6.1 SF when stable.

    Notes
    -----
    HEC-15 Appendix D (Eq. D.2 to D.6 not verified, provenance: ``steep_method``; after
    Stevens and Simons' safety-factor method). On a flat bank (theta -> 0) it
    reduces to 1/eta, i.e. to Eq. 6.7/6.8, which the tests check. The form of
    Eq. D.1 (D50 = SF d S Delta / (F* (SG - 1))) was read in HEC-15.

    References
    ----------
    HEC-15 Appendix D.
    """
    d = validate.positive("d50", d50)
    y = validate.positive("depth", depth)
    s = validate.slope(slope)
    z = validate.positive("side_slope", side_slope)
    phi = validate.number("angle_of_repose", angle_of_repose, low=0.0, high=90.0, high_inclusive=False)
    f = validate.positive("shields", shields)
    gw = validate.positive("gamma_water", gamma_water)
    gs = validate.number("gamma_stone", gamma_stone, low=gw)
    tau_side = side_slope_factor(z) * gw * y * s
    if _vec(d, y, s, z, phi, f):
        return _steep_sf(d, tau_side, np.arctan(1.0 / z), np.arctan(s), np.radians(phi), f, gs, gw)
    return _steep_sf(d, tau_side, math.atan(1.0 / z), math.atan(s), math.radians(phi), f, gs, gw)


def required_d50_steep(depth, slope, side_slope, angle_of_repose, gamma_stone=GAMMA_STONE,
                       gamma_water=GAMMA_WATER, nu=NU_HEC15):
    r"""Smallest stable D50 on the side slopes of a steep channel, HEC-15 Appendix D.

    Solves steep_slope_safety_factor(D50) = SF(Re*(D50)) for D50, with F* and
    SF from Table 6.1 at Re* = sqrt(g d S) D50 / nu; the result equals
    Eq. D.1, D50 = SF d S Delta / (F* (SG - 1)).

    Parameters
    ----------
    depth : float
        Maximum flow depth d [m], > 0.
    slope : float
        Bed slope S [m/m].
    side_slope : float
        Side slope Z (H:V), > 0.
    angle_of_repose : float
        phi [degrees].
    gamma_stone, gamma_water : float
        Specific weights [N/m^3].
    nu : float
        Kinematic viscosity [m^2/s].

    Returns
    -------
    StoneSize
        (d50 [m], shields, safety_factor, reynolds) at the solution.

    Raises
    ------
    NoSolutionError
        The side slope cannot hold stone of that angle of repose at the
        required safety factor, however large.

    Notes
    -----
    HEC-15 Appendix D (provenance: ``steep_method``; see :func:`steep_slope_safety_factor`).
    HEC-15 applies it to slopes above 10 %. The stone's actual safety factor
    rises with D50 toward cos(theta) tan(phi) / sin(theta) cos(beta), so a
    root exists only if that limit exceeds the required SF.

    References
    ----------
    HEC-15 Appendix D, Eq. D.1.
    """
    y = validate.positive("depth", depth)
    s = validate.slope(slope)
    z = validate.positive("side_slope", side_slope)
    phi_deg = validate.number("angle_of_repose", angle_of_repose, low=0.0, high=90.0, high_inclusive=False)
    gw = validate.positive("gamma_water", gamma_water)
    gs = validate.number("gamma_stone", gamma_stone, low=gw)
    v = validate.positive("nu", nu)
    theta, alpha, phi = math.atan(1.0 / z), math.atan(s), math.radians(phi_deg)
    tau_side = side_slope_factor(z) * gw * y * s
    c = math.sqrt(G * y * s) / v

    def excess(d50):
        f, sf = _shields_sf(c * d50)
        return _steep_sf(d50, tau_side, theta, alpha, phi, f, gs, gw) - sf

    lo = 1e-6
    hi = max(_required_d50_scalar(y * s / (gs / gw - 1.0), c) * 4.0, 1e-3)
    for _ in range(60):
        if excess(hi) > 0:
            break
        hi *= 2.0
        if hi > 1e3:
            raise NoSolutionError(f"no stone size is stable on a {z:g}:1 side slope with an angle of repose of "
                                  f"{phi_deg:g} degrees at slope {s:g}; flatten the side slope")
    if excess(lo) > 0:
        raise NoSolutionError("steep-slope stone sizing found no lower bracket")  # pragma: no cover
    d50 = brentq(excess, lo, hi, xtol=1e-12, rtol=1e-12, maxiter=200)
    re = c * d50
    f, sf = _shields_sf(re)
    _stone_size_warning(d50)
    return StoneSize(d50, f, sf, re)


def stone_layer_thickness(d50, d100=None, multiple=1.5):
    r"""Thickness of a riprap or gravel layer: the larger of 1.5 D50 and D100.

    Parameters
    ----------
    d50 : float or ndarray
        Median stone size [m], > 0.
    d100 : float or ndarray, optional
        Largest stone size [m], >= d50, when the gradation is known.
    multiple : float
        Multiple of D50 [-], >= 1 (1.5 by the rule).

    Returns
    -------
    float or ndarray
        Layer thickness [m].

    Notes
    -----
    Common practice, also in HEC-15 Section 6.4 (not verified against the
    circular; provenance: ``layer_thickness``): the thickness should be at
    least D100 or 1.5 D50, whichever is greater. A granular filter or
    geotextile is normally needed beneath (provenance: ``filter``).

    References
    ----------
    HEC-15 Section 6.4.
    """
    d = validate.positive("d50", d50)
    m = validate.number("multiple", multiple, low=1.0, low_inclusive=True)
    t = m * d
    if d100 is None:
        return t
    dmax = validate.positive("d100", d100)
    if np.any(np.asarray(dmax) < np.asarray(d)):
        raise InputError("d100", f"must be >= d50 ({float(np.max(d)):g} m), got {float(np.min(dmax)):g}")
    return np.maximum(t, dmax) if _vec(t, dmax) else max(t, dmax)


# --------------------------------------------------------------------------
# Chapter 4: vegetation and bare soil
# --------------------------------------------------------------------------

#: Density-stiffness coefficient Cs [-] by stand condition, HEC-15 Table 4.3
#: (not verified against the circular; provenance: ``table_4_3``).
DENSITY_STIFFNESS = {"excellent": 580.0, "very_good": 290.0, "good": 106.0, "fair": 24.0, "poor": 8.6}

#: Cover factor CF [-] by growth form and stand condition, HEC-15 Table 4.5
#: ("cover factor values for uniform stands of grass"; not verified, provenance: ``table_4_5``).
COVER_FACTOR = {
    "sod": {"excellent": 0.98, "very_good": 0.95, "good": 0.90, "fair": 0.84, "poor": 0.75},
    "bunch": {"excellent": 0.55, "very_good": 0.53, "good": 0.50, "fair": 0.47, "poor": 0.41},
    "mixed": {"excellent": 0.82, "very_good": 0.79, "good": 0.75, "fair": 0.70, "poor": 0.62},
}


def cover_factor(growth_form: str, condition: str) -> float:
    """Cover factor CF of a grass stand, HEC-15 Table 4.5 (provenance: ``table_4_5``).

    Parameters
    ----------
    growth_form : str
        "sod", "bunch" or "mixed".
    condition : str
        "excellent", "very_good", "good", "fair" or "poor".

    Returns
    -------
    float
        CF [-], the fraction of the soil surface the cover protects.
    """
    if growth_form not in COVER_FACTOR:
        raise InputError("growth_form", f"must be one of {', '.join(COVER_FACTOR)}, got {growth_form!r}")
    row = COVER_FACTOR[growth_form]
    if condition not in row:
        raise InputError("condition", f"must be one of {', '.join(row)}, got {condition!r}")
    return row[condition]


def grass_roughness_coefficient(density_stiffness, stem_height):
    r"""Grass roughness coefficient Cn, HEC-15 Chapter 4.

    .. math:: C_n = \alpha\, C_s^{0.10} h^{0.528}, \quad \alpha = 0.35 \ \text{(SI)}

    Parameters
    ----------
    density_stiffness : float or ndarray
        Density-stiffness coefficient Cs [-], > 0 (Table 4.3).
    stem_height : float or ndarray
        Stem height h [m], > 0.

    Returns
    -------
    float or ndarray
        Cn [-] for :func:`vegetation_n`.

    Notes
    -----
    HEC-15 Section 4.1, after Kouwen's model; not verified (provenance: ``grass_cn``). The
    SI constant 0.35 could not be checked against the customary one. Since
    :func:`vegetation_n` gives one n for one Cn in either unit system, Cn must
    be the same number in both; with the same Cs in both, the SI constant is
    the customary one times (1 / 0.3048)^0.528 = 1.873, so 0.35 SI goes with
    0.187 customary (a customary 0.237 would mean 0.444 SI, a Cn 27 % higher).

    References
    ----------
    HEC-15 Section 4.1; Kouwen, N. and Li, R.-M., 1981, as cited there.
    """
    cs = validate.positive("density_stiffness", density_stiffness)
    h = validate.positive("stem_height", stem_height)
    return 0.35 * cs ** 0.10 * h ** 0.528


def _vegetation_n(cn, boundary_shear):
    return cn * boundary_shear ** -0.4


def vegetation_n(roughness_coefficient, boundary_shear):
    r"""Manning's n of a grass lining, HEC-15 Chapter 4.

    .. math:: n = \alpha\, C_n\, \tau_o^{-0.4}, \quad \alpha = 1.0 \ \text{(SI)}, \quad \tau_o = \gamma R S

    Parameters
    ----------
    roughness_coefficient : float or ndarray
        Grass roughness coefficient Cn [-] (:func:`grass_roughness_coefficient`).
    boundary_shear : float or ndarray
        Mean boundary shear tau_o = gamma R S [Pa], > 0.

    Returns
    -------
    float or ndarray
        Manning's n [s/m^(1/3)]: it falls as the flow bends the grass.

    Notes
    -----
    HEC-15 Section 4.1, not verified (provenance: ``grass_n``): alpha = 1.0
    SI and 0.213 CU; the two differ by 47.88^0.4 = 4.70, the pascal-to-lb/ft^2
    factor to the power 0.4, a consistency check. Read in the circular's
    Chapter 4 (provenance: ``grass_n_varies``): grass stems bend as depth and
    shear grow, so "a grass-lined channel cannot be described by a single
    roughness coefficient"; the resistance equation follows Kouwen's model
    (its Appendix C.2). Hence n is computed at each depth from the boundary
    shear there.

    References
    ----------
    HEC-15 Section 4.1.
    """
    cn = validate.positive("roughness_coefficient", roughness_coefficient)
    tau = validate.positive("boundary_shear", boundary_shear)
    return _vegetation_n(cn, tau)


#: Non-cohesive soils finer than this D75 [m] share one permissible shear and
#: one grain roughness (HEC-15 Section 4.3: 1.3 mm, 0.05 in; provenance: ``soil_n``).
FINE_D75 = 1.3e-3
#: Upper D75 of the non-cohesive soil relation [m] (50 mm, provenance: ``soil_noncohesive``; coarser
#: material is designed as gravel by Chapter 6).
COARSE_D75 = 50e-3


def soil_grain_n(d75=None):
    r"""Manning's n of the soil grains, ns, HEC-15 Chapter 4.

    .. math:: n_s = 0.016 \ (D_{75} < 1.3 \text{ mm or cohesive});\quad
        n_s = 0.015\, D_{75}^{1/6} \ (D_{75} \text{ in mm})

    Parameters
    ----------
    d75 : float or ndarray, optional
        Soil size of which 75 % is finer [m]; None for cohesive or fine soil.

    Returns
    -------
    float or ndarray
        ns [s/m^(1/3)].

    Notes
    -----
    HEC-15 Section 4.3, not verified (provenance: ``soil_n``): alpha = 0.015
    SI with D75 in mm, 0.026 CU with D75 in inches. Both give 0.0156 at
    1.3 mm, matching the 0.016 used for finer soil, a consistency check.

    References
    ----------
    HEC-15 Section 4.3.
    """
    if d75 is None:
        return 0.016
    d = validate.positive("d75", d75)
    mm = np.asarray(d) * 1000.0
    ns = np.where(d < FINE_D75, 0.016, 0.015 * mm ** (1.0 / 6.0))
    return ns if _vec(d) else float(ns)


def noncohesive_permissible_shear(d75):
    r"""Permissible shear of a non-cohesive soil, HEC-15 Chapter 4.

    .. math:: \tau_{p,soil} = 1.0 \text{ Pa} \ (D_{75} < 1.3 \text{ mm});\quad
        \tau_{p,soil} = 0.75\, D_{75} \ (D_{75} \text{ in mm}, 1.3 \le D_{75} \le 50)

    Parameters
    ----------
    d75 : float or ndarray
        Soil size of which 75 % is finer [m], > 0.

    Returns
    -------
    float or ndarray
        tau_p,soil [Pa].

    Notes
    -----
    HEC-15 Section 4.3, not verified (provenance: ``soil_noncohesive``):
    0.75 SI with D75 in mm and 0.4 CU with D75 in inches; both give about
    1.0 Pa at 1.3 mm, matching the fine-soil value. Above 50 mm the
    material is gravel: ValidityWarning (use Chapter 6).

    References
    ----------
    HEC-15 Section 4.3.
    """
    d = validate.positive("d75", d75)
    if np.any(np.asarray(d) > COARSE_D75):
        _warn(f"D75 above {COARSE_D75 * 1000:g} mm: design the material as gravel (HEC-15 Chapter 6)")
    mm = np.asarray(d) * 1000.0
    tau = np.where(d < FINE_D75, 1.0, 0.75 * mm)
    return tau if _vec(d) else float(tau)


#: Coefficients of the cohesive-soil relation, HEC-15 Table 4.6 (not verified
#: against the circular, provenance: ``table_4_6``; after Temple et al., 1987).
#: Per soil class: list of (PI low, PI high, c1, c2, c3, c4, c5, c6) in SI (tau
#: in Pa). The low-PI and high-PI rows of each class agree at PI = 20 to within 0.5 %, a consistency check.
COHESIVE_COEFFICIENTS = {
    "GM": [(10, 20, 1.07, 14.3, 47.7, 1.42, -0.61, 4.8e-3), (20, math.inf, 0.0, 0.0, 0.076, 1.42, -0.61, 48.0)],
    "GC": [(10, 20, 0.0477, 2.86, 42.9, 1.42, -0.61, 4.8e-2), (20, math.inf, 0.0, 0.0, 0.119, 1.42, -0.61, 48.0)],
    "SM": [(10, 20, 1.07, 7.15, 11.9, 1.42, -0.61, 4.8e-3), (20, math.inf, 0.0, 0.0, 0.058, 1.42, -0.61, 48.0)],
    "SC": [(10, 20, 1.07, 14.3, 47.7, 1.42, -0.61, 4.8e-3), (20, math.inf, 0.0, 0.0, 0.076, 1.42, -0.61, 48.0)],
    "ML": [(10, 20, 1.07, 7.15, 11.9, 1.48, -0.57, 4.8e-3), (20, math.inf, 0.0, 0.0, 0.058, 1.48, -0.57, 48.0)],
    "CL": [(10, 20, 1.07, 14.3, 47.7, 1.48, -0.57, 4.8e-3), (20, math.inf, 0.0, 0.0, 0.076, 1.48, -0.57, 48.0)],
    "MH": [(10, 20, 0.0477, 2.86, 42.9, 1.38, -0.373, 4.8e-2), (20, math.inf, 0.0, 0.0, 0.119, 1.38, -0.373, 48.0)],
    "CH": [(20, math.inf, 0.0, 0.0, 0.097, 1.38, -0.373, 48.0)],
}


def cohesive_permissible_shear(soil_class: str, plasticity_index, void_ratio):
    r"""Permissible shear of a cohesive soil, HEC-15 Chapter 4.

    .. math:: \tau_{p,soil} = (c_1 PI^2 + c_2 PI + c_3)(c_4 + c_5 e)^2 c_6

    Parameters
    ----------
    soil_class : str
        Unified soil class: GM, GC, SM, SC, ML, CL, MH or CH.
    plasticity_index : float
        PI [-] (percent as a number, e.g. 16), >= 10 (>= 20 for CH).
    void_ratio : float
        Void ratio e [-], > 0.

    Returns
    -------
    float
        tau_p,soil [Pa].

    Notes
    -----
    HEC-15 Section 4.3 and Table 4.6, not verified (provenance: ``table_4_6``; after Temple
    et al., 1987). Soils with PI < 10 are treated as non-cohesive
    (:func:`noncohesive_permissible_shear`): InputError here. A void ratio
    above 2 gives a ValidityWarning (outside typical compacted soils).

    References
    ----------
    HEC-15 Section 4.3; Temple, D. M. et al., USDA Agriculture Handbook 667, 1987.
    """
    key = str(soil_class).strip().upper()
    if key not in COHESIVE_COEFFICIENTS:
        raise InputError("soil_class", f"must be one of {', '.join(COHESIVE_COEFFICIENTS)}, got {soil_class!r}")
    rows = COHESIVE_COEFFICIENTS[key]
    pi = validate.number("plasticity_index", plasticity_index, low=0.0)
    e = validate.positive("void_ratio", void_ratio)
    if pi < rows[0][0]:
        raise InputError("plasticity_index", f"must be >= {rows[0][0]:g} for a cohesive {key} soil, got {pi:g}; "
                                             "a less plastic soil is designed as non-cohesive (by D75)")
    if e > 2.0:
        _warn(f"void ratio {e:g} is unusually high for the cohesive-soil relation (HEC-15 Table 4.6)")
    for lo, hi, c1, c2, c3, c4, c5, c6 in rows:
        if lo <= pi < hi or (hi == math.inf and pi >= lo):
            if c4 + c5 * e <= 0:
                raise InputError("void_ratio", f"must be < {-c4 / c5:.3g} for a {key} soil in this relation, got {e:g}")
            return (c1 * pi * pi + c2 * pi + c3) * (c4 + c5 * e) ** 2 * c6
    raise AssertionError("unreachable")  # pragma: no cover


def effective_soil_shear(design_shear_value, cover, n, n_soil):
    r"""Shear reaching the soil beneath a grass cover, HEC-15 Chapter 4.

    .. math:: \tau_e = \tau_d (1 - C_F) (n_s / n)^2

    Parameters
    ----------
    design_shear_value : float or ndarray
        Design shear tau_d [Pa], >= 0.
    cover : float or ndarray
        Cover factor CF [-], 0 <= CF < 1.
    n : float or ndarray
        Manning's n of the vegetated lining, > 0.
    n_soil : float or ndarray
        Grain roughness of the soil ns, > 0.

    Returns
    -------
    float or ndarray
        tau_e [Pa], compared with tau_p,soil.

    References
    ----------
    HEC-15 Section 4.2 (provenance: ``grass_shear``, not verified).
    """
    tau = validate.non_negative("design_shear", design_shear_value)
    cf = validate.number("cover_factor", cover, low=0.0, high=1.0, low_inclusive=True, high_inclusive=False)
    nv = validate.positive("n", n)
    ns = validate.positive("n_soil", n_soil)
    return tau * (1.0 - cf) * (ns / nv) ** 2


#: Permissible shear published for vegetated soils [Pa]: 0.5 to 4 lb/ft^2 (Fischenich, 2001, Stability Thresholds
#: for Stream Restoration Materials; provenance: ``vegetated_shear_range``). Not part of HEC-15: a plausibility
#: bound above which :func:`vegetation_permissible_shear` warns.
VEGETATED_SHEAR_RANGE = (0.5 * PSF, 4.0 * PSF)
#: The caution above that bound (the value itself is in the results; one wording for every reach, so that a batch
#: says it as a single channel's check does).
VEGETATED_SHEAR_CAUTION = worded("permissible shear of the grass lining above {hi}, the top of the range published "
                                 "for vegetated soils (Fischenich, 2001, Stability Thresholds for Stream Restoration "
                                 "Materials): check the cover factor and the soil beneath",
                                 hi=(VEGETATED_SHEAR_RANGE[1], "shear"))


def vegetation_permissible_shear(soil_permissible, cover, n, n_soil):
    r"""Permissible shear of a grass lining on its soil, HEC-15 Chapter 4.

    .. math:: \tau_p = \frac{\tau_{p,soil}}{1 - C_F} \left(\frac{n}{n_s}\right)^2

    (the design shear at which the effective soil shear reaches tau_p,soil).

    Parameters
    ----------
    soil_permissible : float or ndarray
        tau_p,soil [Pa], > 0.
    cover : float or ndarray
        Cover factor CF [-], 0 <= CF < 1.
    n : float or ndarray
        Manning's n of the vegetated lining at the design flow, > 0.
    n_soil : float or ndarray
        Grain roughness of the soil ns, > 0.

    Returns
    -------
    float or ndarray
        tau_p [Pa] of the lining.

    Notes
    -----
    A result above the top of the range published for vegetated soils,
    4 lb/ft^2 (:data:`VEGETATED_SHEAR_RANGE`), gives a ValidityWarning: with a
    cover factor near 1 (0.98, the program's Table 4.5 value for an excellent
    sod stand) the factor 1 / (1 - CF) reaches 50, and the shipped excellent
    sod on fine soil gets ten times that figure. The value is returned as
    computed.

    References
    ----------
    HEC-15 Section 4.2 (provenance: ``grass_shear``, not verified); Fischenich, C., Stability Thresholds for Stream
    Restoration Materials, May 2001 (provenance: ``vegetated_shear_range``).
    """
    tp = validate.positive("soil_permissible_shear", soil_permissible)
    cf = validate.number("cover_factor", cover, low=0.0, high=1.0, low_inclusive=True, high_inclusive=False)
    nv = validate.positive("n", n)
    ns = validate.positive("n_soil", n_soil)
    out = tp / (1.0 - cf) * (nv / ns) ** 2
    top = float(np.max(out))
    if top > VEGETATED_SHEAR_RANGE[1]:
        # the value itself is in the results; one wording for every group of reaches lets a batch say it once
        _warn(VEGETATED_SHEAR_CAUTION)
    return out


# --------------------------------------------------------------------------
# Chapter 5: rolled erosion control products (RECPs)
# --------------------------------------------------------------------------

#: Manning's n of the three classes of rolled erosion control product, (minimum, typical, maximum) [s/m^(1/3)]:
#: the RECP rows of HEC-15 Table 2.1, "a rough estimate of roughness for the three different classes of
#: products" (HEC-15 Section 2.1.3), as given in HEC-22, 3rd ed. (2009), Table 5-1, which cites HEC-15 for them
#: (provenance: ``recp_n_classes``). The classes are those of HEC-15 Table 5.1 (provenance: ``recp_types``):
#: jute net, curled wood mat and synthetic mat are the circular's examples of each.
RECP_CLASSES = {
    "open_weave_textile": (0.022, 0.025, 0.028),
    "erosion_control_blanket": (0.028, 0.035, 0.045),
    "turf_reinforcement_mat": (0.024, 0.030, 0.036),
}


def recp_typical_n(product_class: str) -> tuple:
    """Manning's n (minimum, typical, maximum) of a class of RECP, HEC-15 Table 2.1 (as given in HEC-22 Table 5-1).

    Parameters
    ----------
    product_class : str
        "open_weave_textile", "erosion_control_blanket" or "turf_reinforcement_mat" (HEC-15 Table 5.1).

    Returns
    -------
    tuple of float
        (minimum, typical, maximum) n [s/m^(1/3)].

    Notes
    -----
    The circular gives these as a rough estimate for a class; a product's
    own n (its data sheet, HEC-15 Chapter 5) is what a design uses.

    Examples
    --------
    >>> recp_typical_n("turf_reinforcement_mat")   # HEC-22 (2009) Table 5-1, HEC-15 Table 2.1
    (0.024, 0.03, 0.036)
    """
    if product_class not in RECP_CLASSES:
        raise InputError("product_class", f"must be one of {', '.join(RECP_CLASSES)}, got {product_class!r}")
    return RECP_CLASSES[product_class]


def recp_data_sheet_n(n, product_class: str):
    """A product's data-sheet Manning's n, checked against the range of its class (HEC-15 Table 2.1).

    Parameters
    ----------
    n : float
        Manning's n from the product's data sheet [s/m^(1/3)], > 0.
    product_class : str
        The product's class (see :func:`recp_typical_n`).

    Returns
    -------
    float
        ``n`` itself. A value outside the class's minimum to maximum gives a
        ValidityWarning: the table is a rough estimate, so such an n is not
        refused, but it is worth checking against the data sheet.

    References
    ----------
    HEC-15 Table 2.1 and Section 2.1.3, as given in HEC-22, 3rd ed. (2009), Table 5-1 (provenance:
    ``recp_n_classes``).
    """
    lo, _, hi = recp_typical_n(product_class)
    value = float(validate.number("n", n, low=0.0, high=1.0))
    if not lo <= value <= hi:
        _warn(f"data-sheet Manning's n {value:g} is outside {lo:g} to {hi:g}, the range HEC-15 Table 2.1 gives for "
              f"{product_class.replace('_', ' ')}s (a rough estimate for the class, as given in HEC-22 (2009) "
              "Table 5-1): check the value against the product's data sheet")
    return value


# --------------------------------------------------------------------------
# Chapter 7: gabion mattresses
# --------------------------------------------------------------------------
# HEC-15 Section 7.1: Manning's n of a gabion mattress is that of its rock fill, by the riprap and gravel
# relations of Section 6.1 with the D50 of the basket rock; the effect of the mesh is neglected (provenance:
# ``gabion_n``). The catalogue gives a gabion entry the stone roughness model with the fill's D50.

#: The usual thickness of a gabion mattress [m]: "0.5 to 1.5 ft" (Freeman and Fischenich, 2000, ERDC
#: TN-EMRRP-SR-22, p. 1; provenance: ``mattress_thickness``). Thicker units are gabion baskets.
MATTRESS_THICKNESS_RANGE = (0.5 * 0.3048, 1.5 * 0.3048)
#: Largest rock of the fill as a fraction of the mattress thickness: "not greater than 2/3 of the thickness of
#: the basket or mattress" (common practice; provenance: ``gabion_fill_size``).
GABION_FILL_FRACTION = 2.0 / 3.0


def gabion_fill_check(rock_d50, thickness):
    """Check the rock fill of a gabion mattress against the mattress thickness.

    Parameters
    ----------
    rock_d50 : float
        Median size D50 of the rock fill [m], > 0.
    thickness : float
        Mattress thickness [m], > 0.

    Returns
    -------
    float
        rock_d50 / thickness [-].

    Raises
    ------
    InputError
        A fill whose D50 is not smaller than the mattress thickness (the rock
        cannot fit).

    Notes
    -----
    ValidityWarning where the D50 exceeds two thirds of the thickness (then
    most of the fill is larger than the common rule of at most 2/3 of the
    thickness allows; provenance: ``gabion_fill_size``), and where the
    thickness is outside 0.5 to 1.5 ft (0.15 to 0.46 m), the usual range of
    mattresses (Freeman and Fischenich, 2000; provenance:
    ``mattress_thickness``).

    References
    ----------
    Freeman, G. E. and Fischenich, J. C., Gabions for Streambank Erosion Control, U.S. Army Engineer Research and
    Development Center, ERDC TN-EMRRP-SR-22, May 2000.
    """
    d = float(validate.positive("rock_d50", rock_d50))
    t = float(validate.positive("thickness", thickness))
    if d >= t:
        raise InputError("rock_d50", f"must be smaller than the mattress thickness ({t:g} m), got {d:g} m")
    lo, hi = MATTRESS_THICKNESS_RANGE
    if not lo <= t <= hi:
        _warn(worded("mattress thickness {t} is outside {lo} to {hi}, the usual thickness of a gabion mattress "
                     "(Freeman and Fischenich, 2000, ERDC TN-EMRRP-SR-22)", t=(t, "small_length"),
                     lo=(lo, "small_length"), hi=(hi, "small_length")))
    if d > GABION_FILL_FRACTION * t:
        _warn(worded("rock fill D50 {d} is more than two thirds of the mattress thickness {t}: most of the fill is "
                     "larger than the largest stone a mattress normally takes (2/3 of its thickness, common "
                     "practice)", d=(d, "small_length"), t=(t, "small_length")))
    return d / t


# --------------------------------------------------------------------------
# freeboard
# --------------------------------------------------------------------------

def superelevation(velocity, top_width, bend_radius):
    r"""Rise of the water surface on the outside of a bend.

    .. math:: \Delta d = \frac{V^2 T}{g R_c}

    Parameters
    ----------
    velocity : float or ndarray
        Mean velocity V [m/s], >= 0.
    top_width : float or ndarray
        Water-surface width T [m], > 0.
    bend_radius : float or ndarray
        Radius of the bend centre line Rc [m], > 0.

    Returns
    -------
    float or ndarray
        Superelevation [m] to add to the depth at the outer bank.

    Notes
    -----
    HEC-22, 3rd ed., 2009, Section 5.1.6, Eq. 5-11, after HEC-15 Section 3.4
    (provenance: ``superelevation``): valid for subcritical flow. HEC-22 puts
    the outer bank's water surface delta d / 2 above the centre line's; the
    whole delta d is returned here and added to the freeboard, the safer
    reading.

    References
    ----------
    HEC-15 Section 3.4.
    """
    v = validate.non_negative("velocity", velocity)
    t = validate.positive("top_width", top_width)
    rc = validate.positive("bend_radius", bend_radius)
    return v * v * t / (G * rc)


def freeboard(velocity=None, top_width=None, bend_radius=None, minimum=MIN_FREEBOARD):
    """Freeboard above the design depth: the minimum plus any bend superelevation.

    Parameters
    ----------
    velocity : float, optional
        Mean velocity V [m/s]; needed with a bend.
    top_width : float, optional
        Water-surface width T [m]; needed with a bend.
    bend_radius : float, optional
        Bend radius Rc [m]; None for a straight reach.
    minimum : float
        Minimum freeboard [m], >= 0 (0.15 m by default, see MIN_FREEBOARD).

    Returns
    -------
    float or ndarray
        Freeboard [m]; total ditch depth = design depth + freeboard.

    Notes
    -----
    Rule (provenance: ``freeboard``, not verified): HEC-15 Section 2 suggests a minimum of about 0.15 m
    (0.5 ft) for roadside channels and adding the superelevation of Section
    3.4 in bends. Local design codes govern and may ask for more (for example
    on supercritical flow, where surface waves approach the depth).
    """
    fb = validate.non_negative("minimum", minimum)
    if bend_radius is None:
        return fb
    if velocity is None or top_width is None:
        raise InputError("velocity", "velocity and top_width are needed for the superelevation in a bend")
    return fb + superelevation(velocity, top_width, bend_radius)
