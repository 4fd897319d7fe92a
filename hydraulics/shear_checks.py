"""The shear checks of a lining, on arrays: design shear against permissible shear on bed, sides and bend.

Steps 2 to 4 of :mod:`hydraulics.stability` (HEC-15, 3rd ed., Chapter 3):
design shear tau_d = gamma d S at the maximum depth (Eq. 3.1), on the side
slopes K1 tau_d (Section 3.2) and in a bend Kb tau_d (Section 3.4); the
lining's permissible shear (stone: Eq. 6.7 with Table 6.1 at the particle
Reynolds number, K2 on side slopes, Appendix D on steep slopes; grass and soil:
Chapter 4; rolled products: the user's data-sheet value; gabion mattresses:
the designer's value, the fill checked against the mattress); and the safety
factor against the required one (Eq. 3.2). One channel
(:func:`hydraulics.stability.check_lining`) and thousands
(:mod:`hydraulics.many_reaches`) go through the same :func:`shear_checks`. Where each
value was read: :mod:`hydraulics.provenance`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from .roots import brentq

from . import validate
from .constants import GAMMA_WATER
from .errors import InputError, NoSolutionError
from .linings import hec15
from .linings.catalogue import Lining

__all__ = ["ShearCheckArray", "ShearChecks", "shear_checks"]


def _steep_incipient_shear(d50, theta, alpha, phi, shields, gs, gw):
    """Side shear [Pa] at which the Appendix D safety factor of this stone is 1."""
    def f(tau):
        return hec15._steep_sf(d50, tau, theta, alpha, phi, shields, gs, gw) - 1.0
    lo = 1e-9 * shields * (gs - gw) * d50
    hi = shields * (gs - gw) * d50
    for _ in range(200):
        if f(hi) < 0:
            break
        hi *= 2.0
    else:  # pragma: no cover - the factor falls to 0 with the shear
        raise NoSolutionError("steep-slope method: no incipient-motion shear found")
    if f(lo) <= 0:  # the bank alone is at its limit
        return 0.0
    return brentq(f, lo, hi, xtol=1e-12 * hi, rtol=1e-12, maxiter=200)


@dataclass
class ShearCheckArray:
    """One place where the shear is checked, over many channels: arrays with one entry per channel (SI).

    ``applies`` is False where a channel has no such place (no straight side
    slope, no bend); its ``safety_factor`` is inf there, so it never governs.
    For a rigid lining ``permissible_shear`` and ``safety_factor`` are nan.
    For the steep-slope method (``appendix_d``) ``safety_factor`` is the
    Appendix D factor and ``permissible_shear`` the side shear at which it is
    1 (nan unless asked for with ``incipient``).
    """

    location: np.ndarray           # object array of str: "bed", "side slopes", "left side slope", ... "bend"
    applies: np.ndarray            # bool
    design_shear: np.ndarray       # [Pa]
    permissible_shear: np.ndarray  # [Pa]
    safety_factor: np.ndarray      # [-]
    side_slope: np.ndarray | None  # Z of the side [H:V] (side checks only)
    shear_factor: np.ndarray | None  # K1 on a side, Kb in a bend (None on the bed)
    tractive_ratio: np.ndarray | None  # K2 where the stone's side resistance uses it, else nan (stone sides only)
    cannot_rest: np.ndarray        # bool: stone on a side as steep as or steeper than its angle of repose
    appendix_d: np.ndarray         # bool: side stone of a steep bed, checked by HEC-15 Appendix D


@dataclass
class ShearChecks:
    """Every place :func:`shear_checks` checked, for one lining over many channels (SI arrays).

    ``checks`` holds the bed first, then the left and the right side slope
    (where side slopes were given; where both sides are alike the two carry
    the same location, "side slopes", and the same numbers), then the bend
    (where a bend radius was given).
    """

    method: str                      # the lining's permissible-shear method ("none": rigid)
    design_shear: np.ndarray         # tau_d on the bed [Pa] (HEC-15 Eq. 3.1)
    permissible_shear: np.ndarray    # tau_p on the bed [Pa]; nan for a rigid lining
    required_safety_factor: np.ndarray  # [-]
    checks: list                     # of ShearCheckArray
    d50: np.ndarray | None = None    # stone only: D50 [m], particle Reynolds number Re*, Shields' F*
    reynolds: np.ndarray | None = None
    shields: np.ndarray | None = None

    @property
    def non_erodible(self) -> bool:
        return self.method == "none"

    def governing(self) -> np.ndarray:
        """Index into ``checks`` of each channel's lowest safety factor (the first on a tie; the bed if rigid)."""
        if self.non_erodible:
            return np.zeros(len(self.design_shear), dtype=np.intp)
        return np.argmin(np.column_stack([c.safety_factor for c in self.checks]), axis=1)

    def pick(self, name: str, governing=None) -> np.ndarray:
        """The governing check's values of the ShearCheckArray field ``name``, per channel."""
        gov = self.governing() if governing is None else governing
        return np.choose(gov, [getattr(c, name) for c in self.checks])

    @property
    def safety_factor(self) -> np.ndarray:
        """Lowest safety factor over the checks (nan for a rigid lining)."""
        return self.pick("safety_factor")

    @property
    def stable(self) -> np.ndarray:
        """Where every check holds (HEC-15 Eq. 3.2); True for a rigid lining."""
        if self.non_erodible:
            return np.ones(len(self.design_shear), dtype=bool)
        return self.safety_factor >= self.required_safety_factor


def _side_array(name, values, size):
    """Side slopes as a float array of ``size`` (nan: no such side), the finite ones checked >= 0."""
    z = np.broadcast_to(np.asarray(values, dtype=float), (size,)).astype(float)
    given = ~np.isnan(z)
    if given.any():
        validate.non_negative(name, z[given])
    return z


def _broadcast_size(*values) -> int:
    """Length of the 1-D arrays the given inputs broadcast to (1 for single values); refuses other shapes."""
    given = [v for v in values if v is not None]
    try:
        shape = np.broadcast_shapes(*(np.shape(v) for v in given))
    except ValueError:
        raise InputError("depth", "and the other inputs must be single values or arrays of one length, got shapes "
                                  f"{', '.join(str(np.shape(v)) for v in given)}") from None
    if len(shape) > 1:
        raise InputError("depth", f"and the other inputs must be at most 1-D, got shape {shape}")
    return shape[0] if shape else 1


def _bend_inputs(bend_radius, top_width, size):
    """Bend radius Rc and water-surface width T as arrays of ``size`` (Rc nan: straight), or (None, None)."""
    if bend_radius is None:
        return None, None
    if top_width is None:
        raise InputError("top_width", "is needed with bend_radius (Kb depends on Rc/T)")
    rc = np.broadcast_to(np.asarray(bend_radius, dtype=float), (size,))
    top = np.broadcast_to(np.atleast_1d(validate.positive("top_width", top_width)), (size,))
    bent = ~np.isnan(rc)
    if bent.any():
        validate.positive("bend_radius", rc[bent])
        short = bent & (rc < top / 2)
        if short.any():
            i = int(np.flatnonzero(short)[0])
            raise InputError("bend_radius", f"must be at least half the water-surface width ({top[i] / 2:.3g} m), "
                                            f"got {rc[i]:g} m: the inner bank would lie beyond the bend's centre")
    return rc, top


@dataclass
class _BedResistance:
    """The lining's permissible shear on the bed and the safety factor it must reach (arrays of one size)."""

    permissible: np.ndarray
    required: np.ndarray
    d50: np.ndarray | None = None     # stone only
    reynolds: np.ndarray | None = None
    shields: np.ndarray | None = None


def _stone_resistance(lining, y, s, d50, sf_min, size) -> _BedResistance:
    """Stone: tau_p = F* (gamma_s - gamma) D50 (HEC-15 Eq. 6.7), F* and SF from Table 6.1 at Re* (Eq. 6.9)."""
    if d50 is None:
        raise InputError("d50", f"lining {lining.key!r} needs a D50")
    d = np.broadcast_to(np.atleast_1d(validate.positive("d50", d50)), (size,))
    reynolds = hec15.particle_reynolds(y, s, d)
    shields, sf_table = hec15.shields_and_safety_factor(reynolds)
    tau_p = np.asarray(hec15.stone_permissible_shear(d, shields, float(lining.specific_weight)), dtype=float)
    return _BedResistance(tau_p, np.maximum(sf_table, sf_min), d, reynolds, shields)


def _other_resistance(lining, method, manning_n, d50, sf_min, size) -> _BedResistance:
    """Grass (Chapter 4 at the lining's n), bare soil, a data-sheet value, or none for a rigid lining."""
    if d50 is not None:
        raise InputError("d50", f"applies to stone linings only; {lining.key!r} is {lining.category}")
    if method == "none":
        return _BedResistance(np.full(size, np.nan), np.full(size, 1.0))
    if method == "vegetation":
        if manning_n is None:
            raise InputError("manning_n", f"is needed for the grass lining {lining.key!r} (its permissible "
                                          "shear depends on the lining's n)")
        tau_p = np.broadcast_to(np.asarray(hec15.vegetation_permissible_shear(
            float(lining.soil_permissible_shear()), float(lining.cover_factor()), manning_n,
            float(lining.soil_grain_n())), dtype=float), (size,))
    else:
        value = lining.soil_permissible_shear() if method == "soil" else lining.field_value("permissible", "shear")
        tau_p = np.full(size, float(validate.positive(f"lining {lining.key!r} permissible.shear", value)))
    return _BedResistance(tau_p, np.full(size, sf_min))


def _gabion_resistance(lining, d50, sf_min, size) -> _BedResistance:
    """A gabion mattress: the designer's permissible shear for the mattress, its fill checked against its thickness.

    HEC-15 Section 7.2 relates a mattress's permissible shear to its rock
    size and thickness; that relation could not be read for this program, so
    the value is the entry's own (user data). The rock fill is checked against
    the mattress thickness (:func:`hec15.gabion_fill_check`). On side slopes
    the mattress is checked like the bed, against K1 tau_d.
    """
    if d50 is not None:
        raise InputError("d50", f"a gabion mattress takes the D50 of its rock fill from its catalogue entry "
                                f"(stone.d50 of {lining.key!r})")
    hec15.gabion_fill_check(*lining.gabion_mattress())
    tau_p = float(validate.positive(f"lining {lining.key!r} permissible.shear", lining.field_value("permissible",
                                                                                                    "shear")))
    return _BedResistance(np.full(size, tau_p), np.full(size, sf_min))


def _bed_resistance(lining, method, y, s, manning_n, d50, sf_min, size) -> _BedResistance:
    """The lining's resistance on the bed by its permissible-shear method."""
    if method == "shields":
        return _stone_resistance(lining, y, s, d50, sf_min, size)
    if method == "gabion":
        return _gabion_resistance(lining, d50, sf_min, size)
    return _other_resistance(lining, method, manning_n, d50, sf_min, size)


def _ratio(permissible, design, applies):
    """Safety factor tau_p / tau where the check applies (inf where it does not, or where there is no shear)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        sf = np.where(design > 0, permissible / design, np.inf)
    return np.where(applies, sf, np.inf)


def _bed_check(tau, bed: _BedResistance, size) -> ShearCheckArray:
    everywhere, no = np.ones(size, dtype=bool), np.zeros(size, dtype=bool)
    return ShearCheckArray(np.repeat(np.array(["bed"], dtype=object), size), everywhere, tau, bed.permissible,
                           _ratio(bed.permissible, tau, everywhere), None, None, None, no, no)


def _stone_side(bed: _BedResistance, lining, z, applies, design, y, s, incipient):
    """A stone side slope: K2 tau_p on mild beds (Section 6.3.2), the Appendix D factor on steep ones, and 0
    where the side is as steep as the stone's angle of repose. Returns (permissible, factor, K2, cannot, steep)."""
    size = len(z)
    phi, gs = float(lining.angle_of_repose), float(lining.specific_weight)
    theta = np.arctan2(1.0, np.maximum(z, 0.0))      # the side's angle: arctan(1/z), pi/2 for a vertical side
    cannot = applies & (theta >= math.radians(phi))
    steep = applies & ~cannot & (s > hec15.STEEP_SLOPE)
    mild = applies & ~cannot & ~steep
    k2 = np.full(size, np.nan)
    if mild.any():
        k2[mild] = hec15.tractive_force_ratio(z[mild], phi)
    permissible = np.where(mild, k2 * bed.permissible, bed.permissible)
    permissible[cannot] = 0.0
    factor = _ratio(permissible, design, applies)
    if steep.any():
        d, shields = bed.d50, bed.shields
        factor[steep] = hec15.steep_slope_safety_factor(d[steep], y[steep], s[steep], z[steep], phi, shields[steep], gs)
        permissible[steep] = np.nan
        if incipient:
            alpha = np.arctan(s)
            for j in np.flatnonzero(steep):
                permissible[j] = _steep_incipient_shear(float(d[j]), float(theta[j]), float(alpha[j]),
                                                        math.radians(phi), float(shields[j]), gs, GAMMA_WATER)
    return permissible, factor, k2, cannot, steep


def _side_checks(lining, stone, bed: _BedResistance, tau, y, s, left_slope, right_slope, size, incipient) -> list:
    """The left and right side slopes: design shear K1 tau_d (HEC-15 Section 3.2) against the side's resistance."""
    z1 = _side_array("left_slope", left_slope, size)
    z2 = z1 if right_slope is None else _side_array("right_slope", right_slope, size)
    same = (z1 == z2) | (np.isnan(z1) & np.isnan(z2))
    no = np.zeros(size, dtype=bool)
    out = []
    for z, label in ((z1, "left side slope"), (z2, "right side slope")):
        applies = ~np.isnan(z)
        zz = np.where(applies, z, 0.0)
        k1 = np.asarray(hec15.side_slope_factor(zz), dtype=float)
        design = k1 * tau
        if stone:
            permissible, factor, k2, cannot, steep = _stone_side(bed, lining, zz, applies, design, y, s, incipient)
        else:
            permissible, k2, cannot, steep = bed.permissible.copy(), None, no, no
            factor = _ratio(permissible, design, applies)
        place = np.empty(size, dtype=object)   # references to two texts, not a new str for each reach
        place.fill(label)
        place[same] = "side slopes"
        out.append(ShearCheckArray(place, applies, design, permissible, factor, z, k1, k2, cannot, steep))
    return out


def _bend_check(bed: _BedResistance, tau, rc, top, size) -> ShearCheckArray:
    """The bend: design shear Kb tau_d with Kb from Rc/T (HEC-15 Section 3.4); not combined with K1."""
    bent = ~np.isnan(rc)
    kb = np.full(size, np.nan)
    if bent.any():
        kb[bent] = hec15.bend_factor(rc[bent], top[bent])
    design = kb * tau
    no = np.zeros(size, dtype=bool)
    return ShearCheckArray(np.repeat(np.array(["bend"], dtype=object), size), bent, design, bed.permissible,
                           _ratio(bed.permissible, design, bent), None, kb, None, no, no)


def shear_checks(lining: Lining, depth, slope, manning_n=None, *, d50=None, left_slope=None, right_slope=None,
                 bend_radius=None, top_width=None, min_safety_factor=1.0, incipient=False) -> ShearChecks:
    r"""Design shear against the lining's permissible shear on the bed, the side slopes and in a bend, on arrays.

    .. math::
        \tau_d = \gamma d S \ \text{(Eq. 3.1)}, \quad \tau_s = K_1 \tau_d, \quad \tau_b = K_b \tau_d,
        \quad \text{stable where } \tau_p / \tau \ge SF \ \text{(Eq. 3.2)}

    The permissible shear tau_p by the lining's method:

    * stone (``shields``): Eq. 6.7, tau_p = F* (gamma_s - gamma) D50, with
      F* and the required safety factor SF from Table 6.1 at the particle
      Reynolds number Re* (Eq. 6.9); SF is at least ``min_safety_factor``.
      On a side slope the stone's resistance is K2 tau_p (tractive force
      ratio, Section 6.3.2) on beds up to ``hec15.STEEP_SLOPE``; on steeper
      beds the side stone is checked by the safety factor of Appendix D.
      Stone cannot rest on a side as steep as or steeper than its angle of
      repose (safety factor 0 there);
    * grass (``vegetation``): from its soil and cover at the lining's n
      (Chapter 4);
    * bare soil (``soil``): the soil's permissible shear (Chapter 4);
    * rolled products (``value``): the user's data-sheet value;
    * gabion mattresses (``gabion``): the designer's value for the
      mattress (HEC-15 Section 7.2's relation could not be read), its rock
      fill checked against its thickness; side slopes against K1 tau_d;
    * rigid linings (``none``): non-erodible, not checked (common practice:
      the method is written for flexible linings).

    Parameters
    ----------
    lining : hydraulics.linings.Lining
        A catalogue entry (``Catalogue.get(key)``).
    depth : float or ndarray
        Maximum flow depth d [m], > 0 (normal depth).
    slope : float or ndarray
        Bed slope S [m/m], > 0 and <= 1.
    manning_n : float or ndarray, optional
        Manning's n at the design flow [s/m^(1/3)], > 0; needed for grass.
    d50 : float or ndarray, optional
        Stone size D50 [m], > 0; needed for stone, refused for other linings.
    left_slope, right_slope : float or ndarray, optional
        Side slopes Z [H:V], >= 0; nan (or None for all) where a channel has
        no straight side slopes (pipes, parabolas). ``right_slope`` defaults
        to ``left_slope``.
    bend_radius : float or ndarray, optional
        Centre-line radius Rc of a bend [m], >= half the water-surface width;
        nan (or None for all) for a straight reach.
    top_width : float or ndarray, optional
        Water-surface width T [m], > 0; needed with ``bend_radius`` (Kb is a
        function of Rc/T).
    min_safety_factor : float
        Safety factor required [-], >= 1 (the larger of it and Table 6.1's
        for stone).
    incipient : bool
        Also find, for the Appendix D checks, the side shear at which the
        factor is 1 (a root search per channel; else nan).

    Returns
    -------
    ShearChecks
        Arrays with one entry per channel (inputs broadcast together, at least 1-D).

    Raises
    ------
    InputError
        A bad input, naming the field; also a user-data catalogue entry whose
        values have not been filled in.

    Notes
    -----
    A relation used outside its range of validity gives a ValidityWarning
    (for instance a D50 outside 15 to 550 mm). Which relations were read in
    HEC-15 and which are not yet verified is kept in
    :mod:`hydraulics.provenance`. The bend check
    applies Kb to the bed shear; it is not combined with K1.

    References
    ----------
    Kilgore, R. T. and Cotton, G. K., Design of Roadside Channels with Flexible
    Linings, HEC-15, 3rd ed., FHWA-NHI-05-114, 2005: Chapters 3 to 7 and
    Appendix D.
    """
    if not isinstance(lining, Lining):
        raise InputError("lining", f"must be a catalogue lining (Catalogue.get(key)), got {type(lining).__name__}")
    size = _broadcast_size(depth, slope, manning_n, d50, left_slope, right_slope, bend_radius, top_width)
    y = np.broadcast_to(np.atleast_1d(validate.positive("depth", depth)), (size,))
    s = np.broadcast_to(np.atleast_1d(validate.slope(slope)), (size,))
    sf_min = float(validate.number("min_safety_factor", min_safety_factor, low=1.0, low_inclusive=True))
    method = lining.permissible_data["method"]
    tau = hec15.design_shear(y, s)
    rc, top = _bend_inputs(bend_radius, top_width, size)
    stone = method == "shields"
    bed = _bed_resistance(lining, method, y, s, manning_n, d50, sf_min, size)
    checks = [_bed_check(tau, bed, size)]
    if left_slope is not None:
        checks += _side_checks(lining, stone, bed, tau, y, s, left_slope, right_slope, size, incipient)
    if rc is not None:
        checks.append(_bend_check(bed, tau, rc, top, size))
    if method == "none":
        for c in checks:
            c.safety_factor = np.full(size, np.nan)
    return ShearChecks(method, tau, bed.permissible, bed.required, checks, bed.d50, bed.reynolds, bed.shields)
