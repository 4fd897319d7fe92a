"""Lining stability of one channel by the permissible-shear-stress method, with freeboard and quantities.

Pure core (numpy, scipy, standard library), SI throughout. Main reference:
Kilgore, R. T. and Cotton, G. K., *Design of Roadside Channels with Flexible
Linings*, Hydraulic Engineering Circular No. 15, 3rd ed., FHWA-NHI-05-114,
Federal Highway Administration, 2005 ("HEC-15"). The relations themselves are
in :mod:`hydraulics.linings.hec15`, each with its equation number; where each
was read is kept in :mod:`hydraulics.provenance`. This module only strings them
together in the order of HEC-15 Chapter 3:

1. normal depth with the lining's own (often depth-dependent) n, a coupled
   solve (:func:`hydraulics.analyse`);
2. design shear at the maximum depth, tau_d = gamma d S (HEC-15 Eq. 3.1);
   on each side slope K1 tau_d (HEC-15 Section 3.2); in a bend Kb tau_d with
   Kb from Rc/T, and the length of protection downstream of the bend
   (HEC-15 Section 3.4);
3. permissible shear of the lining: stone by Eq. 6.7 with F* and the
   safety factor from Table 6.1 at the particle Reynolds number, reduced on
   side slopes by the tractive force ratio K2, or by the steep-slope method of
   Appendix D on slopes steeper than ``hec15.STEEP_SLOPE``; grass from its soil
   and cover (Chapter 4); bare soil (Chapter 4); rolled products from the
   user's data-sheet value; gabion mattresses from the designer's value, with
   n from the rock fill (Chapter 7); rigid linings are treated as non-erodible;
4. the lining is stable where permissible / design >= the required safety
   factor at every location checked (HEC-15 Eq. 3.2, tau_p >= SF tau_d);
5. for stone, the smallest stable D50 and the layer thickness;
6. freeboard: a minimum plus the superelevation in a bend; total ditch depth
   and the top width at the top of the ditch.

The result keeps its numbers in SI and words its verdict on request in any
unit system (:meth:`StabilityResult.reason`), so every front end prints the
same sentence in its own units.

Steps 2 to 4 are :func:`hydraulics.shear_checks.shear_checks`, on arrays:
:func:`check_lining` calls it for one channel, and the inventory check
(:mod:`hydraulics.many_reaches`) for thousands at once, so each relation is strung
together in one place. Step 5 is :mod:`hydraulics.stone_size`, step 6
:mod:`hydraulics.freeboard`. What the check rests on, in words, is
:mod:`hydraulics.lining_notes`; the lined width, layer and cost per length
:mod:`hydraulics.lining_quantities`. Several linings in the same channel, one
row each, are :mod:`hydraulics.lining_comparison`.
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass, field

import numpy as np

from . import validate
from .analysis import ChannelResult, analyse
from .errors import InputError
from .freeboard import ditch_top
from .freeboard import freeboard_rule as _freeboard_rule
from .linings import hec15
from .linings.catalogue import Lining
from .linings.hec15 import ValidityWarning
from .linings.roughness import StoneRoughness, VegetationRoughness
from .lining_notes import FILTER_NOTE, method_notes, roughness_words
from .lining_quantities import lining_quantities
from .provenance import cite
from .shear_checks import ShearChecks, shear_checks
from .stone_size import _required_stone
from .units import SI, UnitSystem
from .wording import format_quantity, in_units, worded

__all__ = ["SELF_CLEANING_VELOCITY", "SELF_CLEANING_SOURCE", "ROADSIDE_SIDE_SLOPE", "ShearCheck", "StabilityResult",
           "check_lining", "side_slope_cautions", "silting_caution"]

#: Mean velocity below which fine sediment tends to settle in a lined channel [m/s]:
#: 0.6 m/s (2 ft/s), the low end of the "2 to 3 ft/s" Chow gives as a minimum
#: permissible (non-silting) velocity where the water carries little silt.
SELF_CLEANING_VELOCITY = 0.6096
SELF_CLEANING_SOURCE = (f"{cite('self_cleaning')}, minimum permissible velocity of 2 to 3 ft/s (0.6 to 0.9 m/s); "
                        "local manuals set their own value")


@dataclass(frozen=True)
class ShearCheck:
    """One place where the lining's shear is checked (SI).

    ``permissible_shear`` is the shear at incipient motion of the lining
    there (None for a rigid lining); the lining holds where
    ``safety_factor`` >= ``required_safety_factor``. For the steep-slope
    method (``method`` "appendix_d") ``safety_factor`` is the Appendix D
    moment ratio and ``permissible_shear`` the side shear at which it is 1.
    """

    location: str                 # "bed" | "side slopes" | "left side slope" | "right side slope" | "bend"
    design_shear: float           # [Pa]
    permissible_shear: float | None  # [Pa]; None: non-erodible
    required_safety_factor: float  # [-]
    safety_factor: float | None   # [-]; None: non-erodible
    passes: bool
    factor: str = ""              # how the design shear was found, e.g. "K1 = 0.87 (Z = 3)"
    method: str = ""              # "eq_6_7" | "k2" | "appendix_d" | "vegetation" | "soil" | "value" | "none"
    side_slope: float | None = None   # Z of the side checked [H:V]
    cannot_rest: bool = False     # stone on a side steeper than its angle of repose

    @property
    def margin(self) -> float:
        """safety_factor / required_safety_factor (inf for non-erodible); below 1 fails."""
        if self.safety_factor is None:
            return math.inf
        return self.safety_factor / self.required_safety_factor

    def words(self, units: UnitSystem = SI) -> str:
        """"side slopes: 1.4 lb/ft^2 against 1.1 lb/ft^2 permissible (safety factor 0.79, 1.00 needed)"."""
        if self.cannot_rest:
            what = "vertical walls" if self.side_slope == 0 else f"a {self.side_slope:g}:1 slope"
            return (f"{self.location}: {what} as steep as or steeper than the stone's angle of repose; "
                    "stone cannot rest there")
        if self.permissible_shear is None:
            return f"{self.location}: {format_quantity(self.design_shear, 'shear', units)}, non-erodible lining"
        kind = "Appendix D safety factor" if self.method == "appendix_d" else "safety factor"
        return (f"{self.location}: {format_quantity(self.design_shear, 'shear', units)} against "
                f"{format_quantity(self.permissible_shear, 'shear', units)} permissible "
                f"({kind} {self.safety_factor:.2f}, {self.required_safety_factor:.2f} needed)")


@dataclass
class StabilityResult:
    """Stability of one lining in one channel (SI). Build it with :func:`check_lining`.

    Shear fields: ``bed_shear`` (HEC-15 Eq. 3.1), ``side_shear`` (largest
    K1 tau_d of the sides, None without side slopes), ``bend_shear`` (None
    without a bend), ``permissible_shear`` (on the bed; None for rigid
    linings), ``permissible_shear_side`` (on the governing side slope where
    it differs from the bed, i.e. stone; else None), ``safety_factor`` (the
    lowest permissible/design ratio, or the Appendix D factor, over the
    checks), ``required_safety_factor`` (on the bed).

    Stone: ``required_d50`` is the smallest stable D50 for the flow, over
    every check: HEC-15's trial procedure (D50 -> depth and n -> required
    D50 by Eq. 6.8 with F* and SF from Re*) repeated until it settles, so a
    stone of that size, checked again, has ``safety_factor`` equal to the
    required one; ``required_d50_bed``, ``_side``, ``_bend`` are the parts at
    that state and ``required_d50_depth`` its depth.
    """

    lining_key: str
    lining_name: str
    category: str
    d50: float | None             # stone size checked [m]
    manning_n: float              # n at the design flow
    n_relation: str               # "constant" | "blodgett" | "bathurst" | "held" | "transition" | "strickler" | "vegetation" | "soil" | "override"
    n_source: str                 # the relation in words, with its source
    analysis: ChannelResult
    depth: float                  # normal depth = maximum depth d [m]
    velocity: float
    froude: float
    bed_shear: float
    side_shear: float | None
    side_slope_factor: float | None    # K1 of the governing side
    bend_radius: float | None
    bend_factor: float | None          # Kb
    bend_shear: float | None
    bend_protection_length: float | None  # Lp [m] downstream of the bend
    permissible_shear: float | None
    permissible_shear_side: float | None
    permissible_source: str
    required_safety_factor: float
    safety_factor: float | None
    stable: bool
    governs: str                  # location of the governing check, or "non-erodible"
    checks: list                  # ShearCheck list
    reynolds: float | None        # particle Reynolds number Re* (stone)
    shields: float | None         # F* (stone)
    required_d50: float | None    # smallest stable D50 over every check [m] (stone)
    required_d50_bed: float | None
    required_d50_side: float | None
    required_d50_bend: float | None
    required_d50_method: str | None   # "eq_6_8" | "appendix_d" (side slopes of a steep channel)
    required_d50_depth: float | None  # normal depth [m] with stone of the required size
    layer_thickness: float | None     # [m], by the catalogue rule at the D50 checked
    thickness_rule: str
    filter_note: str | None
    min_freeboard: float
    superelevation: float | None
    freeboard: float
    total_depth: float
    top_width_at_top: float
    lined_width: float            # lined perimeter per unit length [m^2/m = m]
    layer_volume: float | None    # [m^3/m]
    unit_cost: float | None       # the user's price per unit_cost_basis (SI)
    unit_cost_basis: str
    cost_per_length: float | None  # [$/m]; None without a unit cost
    notes: list = field(default_factory=list)
    warnings: list = field(default_factory=list)
    wave_allowance: float | None = None   # [m] the flow depth, where supercritical flow set the freeboard

    @property
    def verdict(self) -> str:
        """"stable", "not stable" or "non-erodible" (rigid linings)."""
        if self.permissible_shear is None and self.category == "rigid":
            return "non-erodible"
        return "stable" if self.stable else "not stable"

    def governing_check(self) -> ShearCheck | None:
        worst = None
        for c in self.checks:
            if worst is None or c.margin < worst.margin:
                worst = c
        return worst

    def reason(self, units: UnitSystem = SI) -> str:
        """The verdict and why, in words, in ``units`` (a :class:`hydraulics.units.UnitSystem`)."""
        if self.verdict == "non-erodible":
            return f"non-erodible: {self.lining_name} is a rigid lining, not checked for shear (common practice)"
        c = self.governing_check()
        text = f"{self.verdict}, {c.words(units)}"
        if self.required_d50 is not None and self.d50 is not None:
            text += (f"; smallest stable D50 {format_quantity(self.required_d50, 'small_length', units)} "
                     f"(given {format_quantity(self.d50, 'small_length', units)})")
        return text

    def cited_texts(self) -> list:
        """Every statement of method and caution of this check that may cite a publication (SI wording)."""
        used = []     # relations the check used whose place no text below happens to print
        if self.side_slope_factor is not None:
            used.append(cite("side_factor"))
            if self.category == "stone" and self.permissible_shear_side is not None:
                used += [cite("tractive_ratio"), cite("angle_of_repose"), cite("side_stone_size")]
        if self.bend_factor is not None:
            used += [cite("bend_factor"), cite("bend_length")]
        if self.n_relation in ("bathurst", "held", "transition"):
            used += [cite("bathurst_terms"), cite("relation_choice")]
        return [self.n_source, self.permissible_source, self.thickness_rule, self.reason(), self.freeboard_rule(),
                *self.warnings, *self.notes, *used]

    def freeboard_rule(self, units: UnitSystem = SI) -> str:
        """The freeboard rule applied, in words, with its source."""
        return _freeboard_rule(self.min_freeboard, self.superelevation, units, self.wave_allowance)

    def to_dict(self, units: UnitSystem = SI) -> dict:
        """JSON-friendly summary in ``units`` (numbers converted; words as they are)."""
        L = lambda v: None if v is None else float(units.from_si("length", v))  # noqa: E731
        T = lambda v: None if v is None else float(units.from_si("shear", v))  # noqa: E731
        cost = None if self.cost_per_length is None else float(units.from_si("cost_per_length", self.cost_per_length))
        out = {
            "bed_shear": T(self.bed_shear), "side_shear": T(self.side_shear),
            "permissible_shear": T(self.permissible_shear), "permissible_shear_side": T(self.permissible_shear_side),
            "safety_factor": self.safety_factor, "required_safety_factor": self.required_safety_factor,
            "stable": bool(self.stable), "verdict": self.verdict, "governs": self.governs,
            "reason": self.reason(units),
            "freeboard": L(self.freeboard), "freeboard_rule": self.freeboard_rule(units),
            "total_depth": L(self.total_depth), "top_width_at_top": L(self.top_width_at_top),
            "lined_width": L(self.lined_width),
            "layer_volume": None if self.layer_volume is None else float(units.from_si("volume_per_length",
                                                                                      self.layer_volume)),
            "cost_per_length": cost,
            "checks": [{"location": c.location, "design_shear": T(c.design_shear),
                        "permissible_shear": T(c.permissible_shear), "safety_factor": c.safety_factor,
                        "required_safety_factor": c.required_safety_factor, "passes": bool(c.passes),
                        "factor": c.factor} for c in self.checks],
            "notes": [in_units(n, units) for n in self.notes],
        }
        if self.bend_radius is not None:
            out.update({"bend_shear": T(self.bend_shear), "bend_factor": self.bend_factor,
                        "bend_protection_length": L(self.bend_protection_length),
                        "superelevation": L(self.superelevation)})
        if self.category == "stone":
            out.update({"d50": L(self.d50), "required_d50": L(self.required_d50),
                        "required_d50_bed": L(self.required_d50_bed), "required_d50_side": L(self.required_d50_side),
                        "required_d50_bend": L(self.required_d50_bend), "required_d50_method": self.required_d50_method,
                        "required_d50_depth": L(self.required_d50_depth),
                        "particle_reynolds": self.reynolds, "shields": self.shields,
                        "layer_thickness": L(self.layer_thickness), "filter_note": self.filter_note})
        elif self.layer_thickness is not None:
            out["layer_thickness"] = L(self.layer_thickness)
        return out


# --------------------------------------------------------------------------
# helpers
# --------------------------------------------------------------------------

def _dedupe(items):
    return list(dict.fromkeys(i for i in items if i))


#: Flattest side slope (H per 1 V) below which a roadside channel's sides get a caution (HEC-22 Section 5.2.2).
ROADSIDE_SIDE_SLOPE = 3.0


def _side_slope_cautions(section) -> list:
    """The cautions of :func:`side_slope_cautions` for ``section``; a rectangle's walls are a structure, not a
    slope, and get none."""
    if section.kind not in ("trapezoid", "triangle"):
        return []
    zs = section.side_slopes
    return side_slope_cautions(float(zs[0]), float(zs[1]))


def side_slope_cautions(left_slope: float, right_slope: float) -> list:
    """A caution for each side of a triangular or trapezoidal roadside channel steeper than 1V:3H (HEC-22 (2009)
    Section 5.2.2); the two sides as one where they are alike. Slopes are H per 1 V."""
    steep = [(label, z) for label, z in _side_labels(left_slope, right_slope) if z < ROADSIDE_SIDE_SLOPE]
    return [f"the {label} ({z:g}H:1V) {'are' if label == 'side slopes' else 'is'} steeper than 1V:3H: "
            f"{cite('side_slope_guidance')} asks for roadside channel sides of 1V:3H or flatter, 1V:4H or flatter "
            "where traffic safety may be of concern, and never steeper than the angle of repose of the soil or "
            "lining; local standards govern" for label, z in steep]


def silting_caution(velocity: float, min_velocity: float = SELF_CLEANING_VELOCITY):
    """The caution where the mean ``velocity`` [m/s] is below ``min_velocity`` [m/s]: silt may settle (see
    ``SELF_CLEANING_SOURCE``); worded once, restated in any units by :func:`hydraulics.wording.in_units`."""
    return worded("velocity {v} is below {v_min}, so silt may settle in the channel ({source})",
                  v=(velocity, "velocity"), v_min=(min_velocity, "velocity"), source=SELF_CLEANING_SOURCE)


def _sides(section):
    """[(label, Z)] of the side slopes to check, or [] for shapes without straight sides."""
    zs = section.side_slopes
    if zs is None:
        return []
    return _side_labels(float(zs[0]), float(zs[1]))


def _side_labels(z1: float, z2: float) -> list:
    """[(label, Z)]: both sides as "side slopes" where they are alike, else each by its name."""
    if z1 == z2:
        return [("side slopes", z1)]
    return [("left side slope", z1), ("right side slope", z2)]


# --------------------------------------------------------------------------
# the check
# --------------------------------------------------------------------------

def check_lining(section, flow, slope, lining: Lining, d50=None, bend_radius=None,
                 min_freeboard=hec15.MIN_FREEBOARD, *, n=None, min_safety_factor=1.0,
                 min_velocity=SELF_CLEANING_VELOCITY, size_stone: bool = True) -> StabilityResult:
    r"""Check one lining in one channel by HEC-15's permissible-shear method.

    .. math::
        \tau_d = \gamma d S \ \text{(Eq. 3.1)}, \quad \tau_s = K_1 \tau_d, \quad \tau_b = K_b \tau_d,
        \quad \text{stable where } \tau_p \ge SF\, \tau

    Parameters
    ----------
    section : hydraulics.Section
        Channel cross-section (SI).
    flow : float
        Design discharge Q [m^3/s], > 0.
    slope : float
        Bed slope S [m/m].
    lining : hydraulics.linings.Lining
        A catalogue entry (``Catalogue.get(key)``).
    d50 : float, optional
        Stone size D50 [m] for stone linings (default: the entry's own);
        refused for other linings.
    bend_radius : float, optional
        Centre-line radius Rc of the sharpest bend [m], >= half the water
        surface width; None for a straight reach.
    min_freeboard : float
        Minimum freeboard [m], >= 0 (default 0.15 m, see ``hydraulics.freeboard.FREEBOARD_SOURCE``).
    n : float, optional
        A constant Manning's n that replaces the lining's own roughness
        (stated in the result).
    min_safety_factor : float
        Safety factor required of non-stone linings [-], >= 1 (HEC-15 Eq. 3.2
        leaves it to the designer; 1.0 by default). Stone uses the larger of
        this and Table 6.1's value.
    min_velocity : float
        Velocity below which the channel is reported as not self-cleaning
        [m/s] (default ``SELF_CLEANING_VELOCITY``, see its source).
    size_stone : bool
        For stone, also find the smallest stable D50 by HEC-15's trial
        procedure (default). False checks the given stone only and leaves
        the ``required_d50`` fields None: most of the cost of a stone check,
        spared where many points are screened (a ditch run).

    Returns
    -------
    StabilityResult

    Raises
    ------
    InputError
        A bad input, naming the field; also a user-data catalogue entry whose
        values have not been filled in (the field is named).
    NoSolutionError
        No normal depth (for instance a pipe that cannot carry the flow).

    Notes
    -----
    Results outside a relation's range of validity are kept and reported in
    ``warnings``, in words. The stone side-slope check uses K2 (HEC-15
    Section 6.3.2) on mild slopes and Appendix D on
    slopes steeper than ``hec15.STEEP_SLOPE``. Shapes without straight
    sides (parabola, pipe, surveyed section) are checked on the bed and in
    the bend only. The bend check applies Kb to the bed shear; it is not
    combined with the side-slope factor.

    References
    ----------
    HEC-15 Chapters 3, 4 and 6 and Appendix D (see :mod:`hydraulics.linings.hec15`).
    """
    if not isinstance(lining, Lining):
        raise InputError("lining", f"must be a catalogue lining (Catalogue.get(key)), got {type(lining).__name__}")
    for name, value in (("flow", flow), ("slope", slope)):
        if np.ndim(value):
            raise InputError(name, "must be a single value for a lining check")
    q = float(validate.positive("flow", flow))
    s = float(validate.slope(slope))
    fb_min = float(validate.non_negative("min_freeboard", min_freeboard))
    sf_min = float(validate.number("min_safety_factor", min_safety_factor, low=1.0, low_inclusive=True))
    v_min = float(validate.non_negative("min_velocity", min_velocity))
    rc = None if bend_radius is None else float(validate.positive("bend_radius", bend_radius))

    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", ValidityWarning)
        result = _check(section, q, s, lining, d50, rc, fb_min, n, sf_min, v_min, size_stone)
    extra = []
    for w in caught:
        if issubclass(w.category, ValidityWarning):
            text = w.message.args[0] if w.message.args else ""
            extra.append(text if isinstance(text, str) else str(w.message))  # a Worded message stays one
        else:  # pragma: no cover - not ours: pass it on
            warnings.warn_explicit(w.message, w.category, w.filename, w.lineno)
    result.warnings = _dedupe(result.warnings + extra)
    return result


def _roughness_and_flow(section, q, s, lining, d, n_override):
    """Manning's n of the lining (or the user's constant n) and the coupled normal-depth solve.

    Returns (roughness, ChannelResult, relation, words of the relation, notes, warnings)."""
    notes, warn = [], []
    if n_override is not None:
        rough = float(validate.number("n", n_override, low=0.0, high=1.0))
        notes.append(f"Manning's n {rough:g} was given in place of the lining's own relation")
        relation, n_text = "override", f"constant n = {rough:g} given in place of the lining's own roughness"
    else:
        rough = lining.roughness(d)
    res = analyse(section, q, s, rough)
    if n_override is None:
        if isinstance(rough, StoneRoughness):
            relation = rough.relation(section, float(res.normal_depth), s)
        elif isinstance(rough, VegetationRoughness):
            relation = "vegetation"
        elif lining.roughness_data["model"] == "soil":
            relation = "soil"
        else:
            relation = "constant"
        n_text = roughness_words(lining, relation)
    if hasattr(rough, "check"):
        warn += rough.check(section, float(res.normal_depth), s)
    # the flow's own warnings (its regime) first, then the roughness relation's range, as the batch lists them
    return rough, res, relation, n_text, notes, list(res.warnings) + warn


def _stone_sizing(section, q, s, lining, n_fixed, sides, rc, sf_min, d):
    """The smallest stable stone on bed, sides and bend by HEC-15's trial procedure (size -> depth -> size).

    Returns (sizes by place, method, depth at the size, notes, warnings)."""
    notes, warn = [], []
    gs, phi = float(lining.specific_weight), float(lining.angle_of_repose)
    req, req_method, req_depth, converged, at_jump = _required_stone(section, q, s, lining, n_fixed, sides, rc, gs,
                                                                     phi, sf_min, d)
    if not converged:
        warn.append("the smallest stable D50 did not settle (the size and the depth it gives keep changing); "
                    "the value shown is the last trial: check it by hand")
    if at_jump:
        warn.append("the smallest stable D50 lies where the stone's n changes from Blodgett's relation to "
                    f"Bathurst's (da/D50 near 1.5, {cite('relation_choice')}) and the depth changes abruptly: a "
                    "slightly smaller stone gives deeper flow and fails; check the size by hand")
    needed = max((x for x in req.values() if x is not None and math.isfinite(x)), default=None)
    if needed is not None and req_depth is not None:
        re_needed = float(hec15.particle_reynolds(req_depth, s, needed))
        if hec15.RE_LOW < re_needed < hec15.RE_HIGH:
            notes.append(f"the smallest stable D50 has a particle Reynolds number of {re_needed:.3g} (HEC-15 Eq. "
                         f"6.9), inside the band where {cite('table_6_1')} passes from F* {hec15.SHIELDS_LOW:g}, "
                         f"SF {hec15.SF_LOW:g} to F* {hec15.SHIELDS_HIGH:g}, SF {hec15.SF_HIGH:g}; there F*/SF "
                         "rises with Re, so a slightly steeper grade can need a slightly smaller stone: size a "
                         "run of grades for its steepest stretch")
    return req, req_method, req_depth, notes, warn


def _largest_required(req):
    """The largest of the sizes needed on bed, sides and bend, checked against Chapter 6's size range.

    Returns (size or None, notes, warnings)."""
    sizes = [x for x in req.values() if x is not None]
    if not sizes:
        return None, [], []
    # rounded up by a relative 1e-7 so that the size passes its own check despite floating-point rounding
    required = max(sizes) * (1.0 + 1e-7)
    if math.isinf(required):
        return None, [], ["no stone size is stable on these side slopes (as steep as or steeper than the stone's "
                          "angle of repose, or beyond the steep-slope method); flatten the side slopes"]
    lo_d, hi_d = hec15.STONE_SIZE_RANGE
    if required > hi_d:
        return required, [], [worded("the smallest stable D50, {d}, is above {hi}, the largest size HEC-15 "
                                     "Chapter 6 covers", d=(required, "small_length"), hi=(hi_d, "small_length"))]
    if required < lo_d:
        return required, [worded("the smallest stable D50, {d}, is below {lo}, the smallest size HEC-15 Chapter 6 "
                                 "covers; use at least that", d=(required, "small_length"),
                                 lo=(lo_d, "small_length"))], []
    return required, [], []


def _check(section, q, s, lining, d50, rc, fb_min, n_override, sf_min, v_min, size_stone=True) -> StabilityResult:
    stone = lining.category == "stone"
    d = lining._d50(d50) if (stone or d50 is not None) else None  # refuses a D50 for a lining that is not stone
    rough, res, relation, n_text, notes, warn = _roughness_and_flow(section, q, s, lining, d, n_override)
    y, v, fr, top = float(res.normal_depth), float(res.velocity), float(res.froude), float(res.top_width)
    n_used = float(res.manning_n)
    if v < v_min:
        warn.append(silting_caution(v, v_min))
    warn += _side_slope_cautions(section)

    # -- design shear, permissible shear and the checks (HEC-15 Chapter 3) -----
    zs = section.side_slopes
    method = lining.permissible_data["method"]
    sc = shear_checks(lining, y, s, n_used, d50=d if stone else None,
                      left_slope=None if zs is None else float(zs[0]),
                      right_slope=None if zs is None else float(zs[1]),
                      bend_radius=rc, top_width=top, min_safety_factor=sf_min, incipient=True)
    tau_d = float(sc.design_shear[0])
    sides = [(label, z, float(hec15.side_slope_factor(z))) for label, z in _sides(section)]
    if not sides:
        notes.append(f"no side-slope check for a {section.kind} section (the side-slope factor K1 of HEC-15 "
                     "applies to straight side slopes)")
    kb = tau_b = lp = None
    if rc is not None:
        kb = float(sc.checks[-1].shear_factor[0])
        tau_b = float(sc.checks[-1].design_shear[0])
        lp = float(hec15.bend_protection_length(float(res.hydraulic_radius), n_used))
    rigid = sc.non_erodible
    tau_p = None if rigid else float(sc.permissible_shear[0])
    checks = _scalar_checks(sc, method, rc, top)

    # -- stone: the smallest stable sizes ------------------------------------
    req, req_method, req_depth, required = {"bed": None, "side": None, "bend": None}, None, None, None
    if stone and size_stone:
        req, req_method, req_depth, more_notes, more_warn = _stone_sizing(
            section, q, s, lining, rough if n_override is not None else None, sides, rc, sf_min, d)
        notes += more_notes
        warn += more_warn
    notes += method_notes(lining, method, s, n_used, tau_p)
    if stone and size_stone:
        required, more_notes, more_warn = _largest_required(req)
        notes += more_notes
        warn += more_warn
    req = {k: (None if (x is None or math.isinf(x)) else x) for k, x in req.items()}

    gov = min(checks, key=lambda c: c.margin)
    side_checks = [c for c in checks if c.side_slope is not None]
    side_gov = min(side_checks, key=lambda c: c.margin) if side_checks else None

    # -- freeboard, ditch depth and quantities ------------------------------
    ditch = ditch_top(section, y, v, top, fr, rc, fb_min)
    warn += ditch.warnings
    lined, thickness, volume, cost, more_notes = lining_quantities(lining, section, ditch.depth_at_top, d50)
    notes += more_notes

    return StabilityResult(
        lining_key=lining.key, lining_name=lining.name, category=lining.category, d50=d, manning_n=n_used,
        n_relation=relation, n_source=n_text, analysis=res, depth=y, velocity=v, froude=fr, bed_shear=tau_d,
        side_shear=max((k1 * tau_d for _, _, k1 in sides), default=None),
        side_slope_factor=None if not sides else max(k1 for _, _, k1 in sides),
        bend_radius=rc, bend_factor=kb, bend_shear=tau_b, bend_protection_length=lp,
        permissible_shear=tau_p,
        permissible_shear_side=side_gov.permissible_shear if (stone and side_gov is not None) else None,
        permissible_source=lining.permissible_data.get("source", ""),
        required_safety_factor=float(sc.required_safety_factor[0]), safety_factor=None if rigid else gov.safety_factor,
        stable=all(c.passes for c in checks), governs="non-erodible" if rigid else gov.location, checks=checks,
        reynolds=float(sc.reynolds[0]) if stone else None, shields=float(sc.shields[0]) if stone else None,
        required_d50=required, required_d50_bed=req["bed"],
        required_d50_side=req["side"], required_d50_bend=req["bend"],
        required_d50_method=req_method if stone else None, required_d50_depth=req_depth if stone else None,
        layer_thickness=thickness, thickness_rule=lining.thickness_data.get("source", ""),
        filter_note=FILTER_NOTE if stone else None, min_freeboard=fb_min, superelevation=ditch.superelevation,
        freeboard=ditch.freeboard, total_depth=ditch.total_depth, top_width_at_top=ditch.top_width,
        lined_width=lined, layer_volume=volume,
        unit_cost=None if lining.unit_cost is None else float(lining.unit_cost),
        unit_cost_basis=lining.unit_cost_basis, cost_per_length=cost, notes=_dedupe(notes), warnings=_dedupe(warn),
        wave_allowance=ditch.wave_allowance)


def _scalar_checks(sc: ShearChecks, method: str, rc, top) -> list:
    """The checks of a single channel (entry 0 of ``sc``) as ShearCheck objects, with how each shear was found."""
    out, seen = [], set()
    rigid = sc.non_erodible
    required = float(sc.required_safety_factor[0])
    for c in sc.checks:
        location = str(c.location[0])
        if not c.applies[0] or location in seen:  # alike sides: one check
            continue
        seen.add(location)
        design = float(c.design_shear[0])
        z = None if c.side_slope is None else float(c.side_slope[0])
        cannot = bool(c.cannot_rest[0])
        how = method
        if location == "bed":
            text = "HEC-15 Eq. 3.1"
        elif location == "bend":
            text = f"Kb = {float(c.shear_factor[0]):.3f} (Rc/T = {rc / top:.3g})"
        else:
            text = f"K1 = {float(c.shear_factor[0]):.3f} (Z = {z:g})"
            if method == "shields":
                how = "k2"
                if c.appendix_d[0]:
                    how, text = "appendix_d", text + "; HEC-15 Appendix D"
                elif not cannot:
                    text = f"K1 = {float(c.shear_factor[0]):.3f}, K2 = {float(c.tractive_ratio[0]):.3f} (Z = {z:g})"
        if method == "shields" and how == "shields":
            how = "eq_6_7"
        if rigid:
            out.append(ShearCheck(location, design, None, 1.0, None, True, text, "none", z))
            continue
        sf = float(c.safety_factor[0])
        out.append(ShearCheck(location, design, float(c.permissible_shear[0]), required, sf, sf >= required, text,
                              how, z, cannot_rest=cannot))
    return out
