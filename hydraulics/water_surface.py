"""The water surface along a run: gradually varied flow, its controls and hydraulic jumps (SI).

Public API
----------
``water_surface(distance, bed, sections, n, flow, *, outfall="normal", outfall_level=None, inlet="normal",
max_step=10.0, step_tolerance=1e-4) -> WaterSurface``
    The profile over a sequence of design points. ``distance`` [m] rises in the direction of flow (strictly),
    ``bed`` [m] is the invert elevation at each point, ``sections`` one :class:`~hydraulics.sections.Section`
    or one per point, ``n`` Manning's n [s/m^(1/3)] as one value, a callable ``n(depth)`` for a depth-dependent
    lining (a :class:`~hydraulics.linings.roughness.FixedSlopeN` or, for grass at the energy slope,
    :class:`~hydraulics.linings.roughness.EnergySlopeN` made for the point's own section is faster: a grass
    lining's n is then taken in closed form, and many stretches' normal depths are solved in one array call),
    or one of those per point (``None`` for a surveyed section, which carries its own composite n),
    ``flow`` [m^3/s] one value or one per point (it changes at inflow points). A point's section, n and flow
    apply from that point downstream to the next one (the water leaving the point); the last point keeps its
    own. Controls: ``outfall`` "normal", "critical" or "level" (with ``outfall_level`` [m], the water-surface
    elevation standing at the outfall, e.g. a culvert headwater or a receiving stream; giving
    ``outfall_level`` alone means "level"); ``inlet`` "normal", "critical" or a depth [m] held at the top
    (e.g. the flow leaving a pipe). ``max_step`` [m] is the longest computation step; ``step_tolerance`` [-]
    sets the error allowed in a step's depth, relative to the depth (see "Step control").
``specific_force(section, flow, depth)`` -> M = Q^2 / (g A) + A y_bar [m^3].
``sequent_depth(section, flow, depth)`` -> the other depth of equal specific force [m].
``friction_slope(section, flow, n, depth)`` -> S_f = (Q n / (A R^(2/3)))^2 [-].
``depth_gradient(section, flow, n, slope, depth)`` -> dy/dx = (S0 - S_f) / (1 - Fr^2) [-].
``profile_type(depth, normal_depth, critical_depth, slope)`` -> "M1", "M2", ... (see "Profile types").

:class:`WaterSurface` (one entry per design point unless said otherwise): ``distance``, ``bed``, ``depth``,
``water_surface`` (bed + depth), ``profile_type``, ``regime`` ("subcritical", "supercritical", "critical" or
"not computed"), ``normal_depth`` (NaN where the grade is flat or adverse, or the section cannot carry the flow
at a normal depth), ``critical_depth``, ``velocity``, ``froude``, ``energy`` (energy grade elevation),
``messages`` (a list of worded messages per point), ``stretch_types`` (the profile types met between point i
and i + 1, in flow order), ``jumps`` (a list of :class:`Jump`: ``distance`` of the toe, ``upstream_depth``,
``downstream_depth``, ``length``, ``froude``, ``kind``, ``notes``; ``as_dict()`` gives the first four and
more), ``controls`` (what was assumed at each end, with its depth and level, whether it governs, and its
message), ``notes`` (the run's messages) and the computation nodes ``detail_distance``, ``detail_bed``,
``detail_depth``, ``detail_profile_type`` for drawing.

Method
------
* Energy equation between two sections 1 (downstream) and 2, a distance L apart (the standard step method):
  z2 + y2 + V2^2 / (2 g) = z1 + y1 + V1^2 / (2 g) + h_f, with the friction loss h_f = L (S_f1 + S_f2) / 2,
  the arithmetic mean of the two sections' friction slopes (the trapezoidal rule for the loss over the step;
  the program's choice). Energy balance as in TxDOT, *Hydraulic Design Manual*, Ch. 7 Sec. 6 ("Standard Step
  Procedure"), and the standard step equations H1 + So dL = H2 + Sf dL restated in Eqs. 2.173 to 2.176 of a
  manual's Section 2.8 (see :mod:`hydraulics.provenance`, keys ``gvf_energy`` and ``gvf_sf_average``). The
  kinetic-energy coefficient is 1; expansion and contraction losses and the losses where inflow joins are not
  counted (a step only changes the flow and the section at a design point).
* Friction slope from Manning's equation with the slope term the energy slope,
  S_f = (Q n / (A R^(2/3)))^2 (Kitsap County Stormwater Design Manual, App. F, F.2.3.2: S_f = n^2 V^2 /
  (2.21 R^1.33) in US units).
* The same energy equation carries the water surface across a change of section or of flow at a design point
  (a step of length zero) and across grade breaks (the bed is continuous; only the slope changes).
* Each step is solved for the depth on its branch: above critical depth on a subcritical step, below it on a
  supercritical one. On its branch the energy balance is monotonic in the depth, so the root is unique;
  Newton's method safeguarded by bisection meets it to HEAD_TOLERANCE (1e-10 m of head) or raises
  ConvergenceError. Its first trial is one Newton step from the known depth, taken with the known state's own
  terms (so it costs no evaluation); the root does not depend on it. A Newton step whose remainder, estimated as
  (1/2) r'' dy^2 with the curvature r'' of the residual from the change of its derivative since the last depth,
  is within a tenth of HEAD_TOLERANCE is the root without one more evaluation (the head, the friction slope and
  their derivatives carried to it to second order, the curvatures again from the change since the last depth).
  When the branch has no root (the energy cannot be carried), the pass records critical depth there and goes on
  from it.

Step control
------------
A stretch between design points is cut into equal steps no longer than ``max_step``. Each step's error is estimated
from the step itself (an embedded estimate, no extra solve): the standard step takes the friction loss by the
trapezoidal rule, whose error is -(L^3 / 12) f''(xi) (M. Hjorth-Jensen, *Computational Physics*, "Error in the
trapezoidal rule", compphysics.github.io), to leading order -(L^2 / 12) (f'(b) - f'(a)) with the end derivatives
(mathematics-online.org, "Trapezoid Rule", the asymptotic expansion of its error); here f' = dS_f/dx =
(dS_f/dy)(dy/dx) at each end, with dy/dx = (S0 - S_f) / (1 - Fr^2), and the error of the energy balance is carried
to the depth through the balance's derivative (the program's use of these). A step whose estimated error is within
STEP_ERROR_SHARE (0.2) of ``step_tolerance`` times the depth is kept. Any other is taken again in steps of its
length over a power of two, the power chosen from the error of the last step tried (the error goes as the cube of
the step; with a margin of 0.9, up to three halvings or doublings at once, none shorter than MIN_STEP = 1 mm), each
kept only once its own estimate is within the allowance, so that the steps shorten where the profile turns quickly
(as just upstream of a change of flow) and lengthen again after. On the subcritical pass a stretch tries its first
step at the length the last stretch's first step asked for (stretches along a run turn alike where the flow changes
at every point), so that the whole step is not tried in vain. Whole powers keep the choices discrete: two
computations that differ in the last digits take the same steps. The share is chosen so that the profile lies at
least as close to a fine-step reference as with the halving used before (each step against its two halves;
``tests/test_water_surface_step_control.py`` measures both). Next to critical depth (1 - Fr^2 within NEAR_CRITICAL)
the estimate has no value, and where one end of a step has no root on its branch there is nothing to estimate: such
a step is taken once whole and once as two halves, and halved again while the two differ by more than
``step_tolerance`` times the depth (down to MIN_STEP), the two-half answer kept.

Solving many steps at once
--------------------------
On the subcritical pass, a run of nodes whose sections are of the trapezoid family (open top), whose n is constant
or known in closed form and whose grades are all steep or all not is solved at once on arrays (``STEPS_ON_ARRAYS``):
the energy balances of all its steps, each tying a depth to the one below it, form a system whose Jacobian is upper
bidiagonal; Newton's method on all the depths together (each correction from the triangular banded system, LAPACK's
``dtbtrs``; a depth that would fall to critical depth goes halfway down to it instead) meets every balance to
HEAD_TOLERANCE. Information runs upstream only, so the depths below any step are those of that step's own solve. The
steps are then cut by the same error estimate as above: a piece whose estimate exceeds half the allowance is cut
into 2, 4 or 8 even pieces (the cube law of the error, margin 0.9, none shorter than MIN_STEP) and the whole is
solved again from the last answer (linearly between its pieces' ends), until every piece is within half the
allowance (even pieces are not sized one after the other, so they are held to half the allowance: the profile then
lies as close to the fine-step reference as with the steps taken one at a time,
``tests/test_water_surface_step_control.py``). A round that is cut again meets its balances to _CHAIN_LOOSE (1e-5 m
of head) only, since its depths serve the error estimate alone; the last round meets them to HEAD_TOLERANCE and is
checked again. Each Newton iteration solves only the pieces upstream of the most downstream one whose balance is not
met (those below it keep their depths). Below the most downstream piece whose balance is not met on the subcritical
branch, lies next to critical depth (1 - Fr^2 within NEAR_CRITICAL), has no error estimate or an n out of range, the
answer is kept; from that step on the steps are taken one at a time as above (16 of them, then the arrays are tried
again; twice as many each time they stop short at once). Python's cyclic garbage collector is held while a profile
is computed (:mod:`hydraulics.collector`).

Controls and regimes
--------------------
The subcritical profile is computed upstream from the downstream control, the supercritical one downstream from
the upstream control, as TxDOT's *Hydraulic Design Manual* Ch. 8 Sec. 3 ("Direct Step Backwater Method") sets
the starting depths: on a mild slope the higher of critical depth and the tailwater at the outlet, working
upstream; on a steep slope with the tailwater below critical depth, critical depth at the entrance, working
downstream. So the subcritical pass starts from the outfall control (a level below critical depth does not
control: critical depth is used and said), and the supercritical pass from the inlet control (normal depth
at the top only where the first stretch is steep). Where a mild (or flat, or adverse) stretch meets a steep one
both passes find no root and the flow passes through critical depth at the break. Where both passes have a
depth, the one of larger specific force governs (the supercritical flow pushes the jump downstream until
its specific force falls to that of the subcritical flow). The supercritical pass goes on only from a node where
it governs, or starts afresh from critical depth where the flow passes through it (a control): downstream of a
jump it is gone until the next such control.

Hydraulic jump
--------------
Where the governing profile changes from supercritical to subcritical, the toe of the jump is where the
specific force M = Q^2 / (g A) + A y_bar (the momentum function, preserved across a jump) of the supercritical
profile equals that of the subcritical one, found on a finer grid of 16 steps between the two computation
nodes (at the downstream node where the finer steps carry the supercritical flow all the way). The sequent depth solves M(y2) = M(y1) on the section (in a rectangle this is Belanger's
y2 / y1 = (sqrt(1 + 8 Fr1^2) - 1) / 2, Chow 1959 Eq. 3-21). The length is taken as 6 y2 (L = 6 y2 for
4 < Fr1 < 20, somewhat less outside that range, so an upper estimate there); the kind of jump is named by Fr1
(undular 1 to 1.7, weak to 2.5, oscillating to 4.5, steady to 9, strong above). The momentum balance is that of
a jump on a level bed: the weight of the water in the roller on a sloping bed and the friction under it are not
counted.

Profile types
-------------
By the bed slope (mild M: y_n > y_c, steep S: y_n < y_c, critical C: y_n = y_c, horizontal H, adverse A) and
the depth against normal and critical depth: M1 y > y_n > y_c, M2 y_n > y > y_c, M3 y < y_c; S1 y > y_c,
S2 y_c > y > y_n, S3 y < y_n; C1, C3; H2, H3 and A2, A3 above and below critical depth (a flat or adverse
grade has no normal depth, and none is made up). A depth within PROFILE_BAND (0.1 %) of normal depth is
"uniform", of critical depth "critical" (classification restated in *Planning and Evaluation of Irrigation
Projects*, Elsevier, 2017, Table 3.9).

Examples
--------
Backwater (an M1 curve) behind a level of 1.2 m at the outfall of a mild trapezoidal ditch (invented numbers):

>>> import hydraulics as hy
>>> from hydraulics.water_surface import water_surface
>>> ws = water_surface([0, 100, 200], [1.2, 1.0, 0.8], hy.Trapezoid(bottom_width=0.5, side_slope=2.0),
...                    0.03, 0.4, outfall_level=1.2 + 0.8)
>>> [round(float(d), 3) for d in ws.depth], ws.profile_type
([0.811, 1.003, 1.2], ['M1', 'M1', 'M1'])
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from numbers import Real

import numpy as np
from scipy.linalg.lapack import dtbtrs

from . import provenance, validate
from .collector import collector_held
from .constants import G
from .errors import ConvergenceError, HydraulicsError, InputError, NoSolutionError
from .sections import Section, Trapezoid
from .solvers import solve_critical_depth, solve_normal_depth
from .wording import worded

__all__ = ["water_surface", "WaterSurface", "Jump", "specific_force", "sequent_depth", "friction_slope",
           "depth_gradient", "profile_type", "HEAD_TOLERANCE", "MIN_STEP", "PROFILE_BAND", "JUMP_LENGTH_RATIO",
           "PROFILE_TYPES"]

#: Every step's energy balance is met to this head [m].
HEAD_TOLERANCE = 1e-10
#: Shortest step the step control cuts to [m].
MIN_STEP = 1e-3
#: A step is kept when its estimated depth error is within this share of ``step_tolerance`` times the depth [-].
STEP_ERROR_SHARE = 0.2
#: Within this of critical depth in 1 - Fr^2 [-] the error estimate has no value (dy/dx grows without bound):
#: steps there are halved and compared with their halves instead.
NEAR_CRITICAL = 1e-3
#: A depth within this fraction of normal (critical) depth is called uniform (critical) [-].
PROFILE_BAND = 1e-3
#: Length of a hydraulic jump over its sequent depth, L = 6 y2 [-] (see provenance key ``jump_length``).
JUMP_LENGTH_RATIO = 6.0
#: Froude number range in which L = 6 y2 was measured (outside it the jump is somewhat shorter).
JUMP_LENGTH_FROUDE = (4.0, 20.0)
#: Kinds of jump by the upstream Froude number (lower bound, name), see provenance key ``jump_kinds``.
JUMP_KINDS = ((1.0, "undular"), (1.7, "weak"), (2.5, "oscillating"), (4.5, "steady"), (9.0, "strong"))
#: Grid between two computation nodes on which the toe of a jump is located.
JUMP_GRID = 16
#: All the profile types this module names.
PROFILE_TYPES = ("M1", "M2", "M3", "S1", "S2", "S3", "C1", "C3", "H2", "H3", "A2", "A3", "uniform", "critical")

_LOG2_MARGIN = -math.log2(0.9)  # the step control's margin of 0.9 on a step's length
_OK, _CRIT, _TOP = 0, 1, 2  # a pass's state at a node: a depth on its branch, no root (critical), above the top
_MAX_NEWTON = 100


# ------------------------------------------------------------------------------------------------ single sections

def _roughness(field_name, n, section):
    """n(depth) for one point: a constant, a callable, or a surveyed section's own composite n; as (n(depth),
    the constant or None, a key, and the callable itself where it has n = k R^e (A R^(2/3))^f in closed form for
    this very section (a grass lining's :class:`~hydraulics.linings.roughness.FixedSlopeN` or
    :class:`~hydraulics.linings.roughness.EnergySlopeN`), else None)."""
    if n is None:
        if hasattr(section, "composite_n"):
            return section.composite_n, None, ("composite", id(section)), None
        raise InputError(field_name, "is missing (Manning's n, a number > 0, or a function n(depth))")
    if callable(n):
        def checked(y, fn=n):
            value = fn(y)
            # type() first: the abstract isinstance check is a tenth of a long profile's time
            if not ((type(value) is float or isinstance(value, Real)) and math.isfinite(value) and 0 < value < 1):
                raise InputError(field_name, f"n(depth) must give a number between 0 and 1, got {value!r} at "
                                             f"depth {y:.6g} m")
            return float(value)
        closed = getattr(n, "closed_form", None) is not None and getattr(n, "section", None) is section
        return checked, None, ("function", id(n)), n if closed else None
    value = validate.number(field_name, n, low=0.0, high=1.0, hint=" (Manning's n is a small number such as 0.013)")
    if not isinstance(value, float):
        raise InputError(field_name, "must be one number per point")
    return (lambda y, v=value: v), value, ("constant", value), None


class _ModelN:
    """Adapter from n(depth) to the solvers' roughness protocol."""

    def __init__(self, fn):
        self.fn = fn

    def manning_n(self, section, depth, slope):
        if np.ndim(depth):
            return np.vectorize(self.fn, otypes=[float])(depth)
        return self.fn(float(depth))


def _check_section(section, field_name="section"):
    if not isinstance(section, Section):
        raise InputError(field_name, f"must be a channel section (Trapezoid, Circle, ...), got {type(section).__name__}")
    if section.is_vector:
        raise InputError(field_name, "must have single dimensions (not arrays) for a water-surface profile")


def friction_slope(section, flow, n, depth):
    """Friction (energy) slope by Manning's equation, S_f = (Q n / (A R^(2/3)))^2 [-].

    Kitsap County Stormwater Design Manual, App. F, F.2.3.2 (S_f = n^2 V^2 / (2.21 R^1.33) in US units).
    ``flow`` [m^3/s] > 0, ``n`` [s/m^(1/3)] a number or a callable n(depth), ``depth`` [m] > 0.
    """
    _check_section(section)
    q = validate.positive("flow", flow)
    y = float(validate.positive("depth", depth))
    fn = _roughness("n", n, section)[0]
    g = section.properties(y)
    return (q * fn(y) / (g.area * (g.area / g.wetted_perimeter) ** (2 / 3))) ** 2


def depth_gradient(section, flow, n, slope, depth):
    """Slope of the water depth along the flow, dy/dx = (S0 - S_f) / (1 - Q^2 T / (g A^3)) [-].

    The differential equation of gradually varied flow (*Planning and Evaluation of Irrigation Projects*,
    Elsevier, 2017, Eq. 3.150). ``slope`` S0 [m/m] may be zero or negative (adverse); ``depth`` [m] must
    not be critical depth, where the equation has no finite value.
    """
    s0 = validate.number("slope", slope)
    sf = friction_slope(section, flow, n, depth)
    g = section.properties(float(depth))
    fr2 = flow * flow * g.top_width / (G * g.area ** 3)
    if fr2 == 1.0:
        raise NoSolutionError("dy/dx is infinite at critical depth")
    return (s0 - sf) / (1 - fr2)


def specific_force(section, flow, depth):
    """Specific force (momentum function) M = Q^2 / (g A) + A y_bar [m^3], preserved across a hydraulic jump.

    A y_bar is the first moment of the flow area about the water surface
    (:meth:`~hydraulics.sections.Section.first_moment`); for a trapezoid M = b y^2 / 2 + m y^3 / 3 +
    Q^2 / (g y (b + m y)). See provenance key ``specific_force``.
    """
    _check_section(section)
    q = validate.positive("flow", flow)
    y = float(validate.positive("depth", depth))
    return q * q / (G * section.area(y)) + section.first_moment(y)


def sequent_depth(section, flow, depth):
    """The other depth of equal specific force (the sequent or conjugate depth of a hydraulic jump) [m].

    Solves Q^2 / (g A2) + A2 y_bar2 = Q^2 / (g A1) + A1 y_bar1 on the same section by Brent's method to a
    relative tolerance of 1e-12. Given a supercritical depth it returns the subcritical one and the other way
    round; at critical depth it returns critical depth. In a rectangle this is Belanger's relation
    y2 / y1 = (sqrt(1 + 8 Fr1^2) - 1) / 2 (Chow 1959, Eq. 3-21).

    A rectangle 2 m wide carrying 4 m^3/s at 0.3 m (Fr1 = 2 / (0.3 sqrt(g 0.3)) = 3.886) jumps to
    0.3 (sqrt(1 + 8 Fr1^2) - 1) / 2 = 1.5058 m:

    >>> import hydraulics as hy
    >>> round(sequent_depth(hy.Rectangle(bottom_width=2.0), 4.0, 0.3), 4)
    1.5058
    """
    from scipy.optimize import brentq

    _check_section(section)
    q = validate.positive("flow", flow)
    y = float(validate.positive("depth", depth))
    yc = float(solve_critical_depth(section, q).depth)
    m1 = specific_force(section, q, y)

    def excess(h):
        return q * q / (G * section._geometry(h).area) + section._first_moment(h) - m1

    if abs(y - yc) <= 1e-12 * yc:
        return yc
    if y < yc:
        hi = section.full_depth if section.full_depth is not None else 2.0 * yc
        if section.full_depth is None:
            while excess(hi) < 0:
                hi *= 2.0
        elif excess(hi) < 0:
            raise NoSolutionError(worded("the sequent depth of {y} lies above the top of the section ({top}): the "
                                         "jump would overtop it", y=(y, "length", "g"), top=(hi, "length", "g")))
        return brentq(excess, yc, hi, xtol=1e-15, rtol=1e-12, maxiter=200)
    lo = 0.5 * yc
    while excess(lo) < 0:
        lo *= 0.5
        if lo < 1e-300:
            raise ConvergenceError(f"no supercritical sequent depth found for {y:.6g} m")
    return brentq(excess, lo, yc, xtol=1e-15, rtol=1e-12, maxiter=200)


def profile_type(depth, normal_depth, critical_depth, slope):
    """The gradually varied flow profile type of ``depth`` [m] ("M1" ... "A3", "uniform" or "critical").

    ``normal_depth`` [m] is ignored on a flat or adverse ``slope`` [m/m] (there is none); on a falling grade it
    may be ``inf`` (the section cannot carry the flow at a normal depth, which is then above any depth here).
    Classification restated in *Planning and Evaluation of Irrigation Projects* (Elsevier, 2017), Table 3.9;
    a depth within PROFILE_BAND (0.1 %) of critical or normal depth is "critical" or "uniform".

    >>> profile_type(1.2, 0.9, 0.5, 0.001), profile_type(0.3, 0.2, 0.5, 0.05), profile_type(0.6, None, 0.5, -0.01)
    ('M1', 'S2', 'A2')
    """
    y, yc = float(depth), float(critical_depth)
    if abs(y - yc) <= PROFILE_BAND * yc:
        return "critical"
    if slope < 0:
        return "A2" if y > yc else "A3"
    if slope == 0:
        return "H2" if y > yc else "H3"
    yn = float(normal_depth)
    if math.isfinite(yn) and abs(y - yn) <= PROFILE_BAND * yn:
        return "uniform"
    if abs(yn - yc) <= PROFILE_BAND * yc:
        return "C1" if y > yc else "C3"
    if yn > yc:
        return "M1" if y > yn else ("M2" if y > yc else "M3")
    return "S1" if y > yc else ("S2" if y > yn else "S3")


# ------------------------------------------------------------------------------------------------ the run's model

class _Props:
    """What applies at a computation node: section, roughness, flow and the slope of its stretch."""

    __slots__ = ("section", "nfn", "nconst", "nkey", "nsource", "npow", "flow", "slope", "yc", "yn", "yn_note",
                 "top", "index", "_trap", "_at_yc", "_at_top")

    def __init__(self, section, rough, flow, slope, index):
        self.section, (self.nfn, self.nconst, self.nkey, self.nsource) = section, rough
        self.npow = None if self.nsource is None else self.nsource.closed_form  # n = k R^e (A R^(2/3))^f
        self.flow, self.slope = flow, slope
        self.index = index
        self.yc = self.yn = math.nan
        self.yn_note = None
        self.top = section.full_depth if section.full_depth is None else float(section.full_depth)
        # the trapezoid family's closed forms inline (the same formulas as Trapezoid._geometry), for speed
        self._trap = ((float(section.bottom_width), float(section._zsum), float(section._psum))
                      if isinstance(section, Trapezoid) else None)
        self._at_yc = self._at_top = None

    def key(self, section_key):
        """Equal keys: equal props. Slopes from elevations and distances differ in their last digits along one
        straight grade, so they are compared to 12 significant digits."""
        return (self.flow, float(f"{self.slope:.12g}"), self.nkey, section_key)

    # -- hydraulics at one depth (scalar fast path) --
    def head_terms(self, y):
        """Specific energy E [m], friction slope S_f [-], dE/dy and dS_f/dy at depth ``y``.

        dS_f/dy follows from ln S_f = 2 ln n - 2 ln A - 4/3 ln R with d ln A/dy = T/A and d ln R/dy = T/A - P'/P;
        d ln n/dy is counted where n = k R^e (A R^(2/3))^f is known in closed form ((e + 2f/3) d ln R/dy + f T/A),
        else taken as zero (it only steers Newton's method: the energy balance itself uses n at the depth)."""
        if self._trap is not None:
            b, zs, ps = self._trap
            t = b + zs * y
            a = (b + 0.5 * zs * y) * y
            p = b + ps * y
            dp = ps
        else:
            g = self.section._geometry(y)
            a, p, t, dp = g.area, g.wetted_perimeter, g.top_width, g.dP_dy
        q = self.flow
        r = a / p
        conveyance = a * r ** (2 / 3)
        t_a, dp_p = t / a, dp / p
        dlogn = 0.0
        if self.nconst is not None:
            n = self.nconst
        elif self.npow is not None:
            k, e, f = self.npow
            n = k * r ** e if f == 0.0 else k * r ** e * conveyance ** f
            if not 0.0 < n < 1.0:
                n = self.nfn(y)  # the model itself, which refuses an n out of range by name
            dlogn = (e + 2 / 3 * f) * (t_a - dp_p) + f * t_a
        else:
            n = self.nfn(y)
            h = 1e-6 * y  # d ln n/dy by a difference: the step control's error estimate needs dS_f/dy whole
            dlogn = math.log(n / self.nfn(y - h)) / h
        v2g = q * q / (2 * G * a * a)
        sf = (q * n / conveyance) ** 2
        de = 1 - 2 * v2g * t_a
        dsf = sf * (2 * dlogn - 10 / 3 * t_a + 4 / 3 * dp_p)
        return y + v2g, sf, de, dsf

    def at_critical(self):
        """head_terms at critical depth, worked out once."""
        if self._at_yc is None:
            self._at_yc = self.head_terms(self.yc)
        return self._at_yc

    def at_top(self):
        """head_terms at the top of a closed section, worked out once."""
        if self._at_top is None:
            self._at_top = self.head_terms(self.top)
        return self._at_top

    def force(self, y):
        return self.flow ** 2 / (G * self.section._geometry(y).area) + self.section._first_moment(y)


@dataclass(slots=True)
class _Node:
    x: float
    z: float
    props: _Props
    point: int  # design point index, or -1 for a step node, -2 for the upstream side of a change at a point


@dataclass(slots=True)
class _State:
    y: float
    status: int
    energy: float = math.nan  # specific energy [m]
    sf: float = math.nan
    de: float = math.nan      # dE/dy and dS_f/dy at the depth (the next step's first trial)
    dsf: float = math.nan


def _state(props, y, status):
    if status == _TOP or not math.isfinite(y):
        return _State(y, status)
    return _State(y, status, *props.head_terms(y))


def _solve_step(props, z, known, z_known, length, upstream, from_props=None):
    """Depth at a node ``length`` [m] from a known state, on the subcritical (``upstream``) or supercritical branch.

    Energy balance (standard step, mean friction slope): going upstream z + E - L/2 S_f = z_k + E_k + L/2 S_fk;
    going downstream z + E + L/2 S_f = z_k + E_k - L/2 S_fk. Returns a _State (status _CRIT when the branch has no
    root, _TOP when the subcritical root lies above the section's top).

    The first trial is one Newton step from the known depth, worked out from the known state's own terms (the
    two nodes of a step of some length share their props), which lies close to the root on a short step. Across a
    change of flow at a point (a step of length zero, ``from_props`` the known state's props, on the same
    section) the known terms are carried to the new flow: at the known depth the velocity head scales with
    (Q / Q_known)^2 and dE/dy = 1 - (Q / Q_known)^2 (1 - dE/dy_known).
    """
    half = 0.5 * length
    c = -half if upstream else half
    target = (z_known - z) + known.energy + (half if upstream else -half) * known.sf
    yc = props.yc
    e_c, sf_c, _, _ = props._at_yc or props.at_critical()
    if e_c + c * sf_c - target >= -HEAD_TOLERANCE:
        return _State(yc, _CRIT)
    on_branch = known.status == _OK and (known.y > yc) == upstream
    if upstream:  # residual rises with depth above critical depth
        lo, hi = yc, math.inf
        if props.top is not None:
            hi = props.top
            e_t, sf_t, _, _ = props.at_top()
            if e_t + c * sf_t - target < 0:
                return _State(hi, _TOP)
        y = known.y if on_branch else 1.1 * yc
        if y >= hi:
            y = 0.5 * (lo + hi)
    else:  # residual falls with depth below critical depth
        lo, hi = 0.0, yc
        y = known.y if on_branch else 0.9 * yc
    # the last depth and dE/dy, dS_f/dy there (the known state's, on a step of length), for the curvatures of the
    # head and friction slope (see the module's "Method")
    y_last = de_last = dsf_last = math.nan
    if on_branch and length == 0.0 and from_props is not None and from_props.section is props.section:
        ratio = (props.flow / from_props.flow) ** 2
        dr = 1.0 - ratio * (1.0 - known.de)
        if dr != 0.0:
            trial = y - (known.energy - known.y) * (ratio - 1.0) / dr
            if lo < trial < hi:
                y = trial
    elif on_branch and length > 0.0 and y == known.y:
        dr = known.de + c * known.dsf
        if dr != 0.0:
            trial = y - (known.energy + c * known.sf - target) / dr
            if lo < trial < hi:
                y, y_last, de_last, dsf_last = trial, known.y, known.de, known.dsf
    head_terms = props.head_terms
    for _ in range(_MAX_NEWTON):
        e, sf, de, dsf = head_terms(y)
        r = e + c * sf - target
        if -HEAD_TOLERANCE <= r <= HEAD_TOLERANCE:
            return _State(y, _OK, e, sf, de, dsf)
        if (r < 0) == upstream:
            lo = y
        else:
            hi = y
        dr = de + c * dsf
        step = y - r / dr if dr != 0 else math.nan
        if lo < step < hi:  # false for nan, and for inf (hi is at most inf)
            move = step - y
            if y != y_last:
                e2, sf2 = (de - de_last) / (y - y_last), (dsf - dsf_last) / (y - y_last)   # d2E/dy2, d2S_f/dy2
                if abs(e2 + c * sf2) * move * move <= 0.2 * HEAD_TOLERANCE:
                    # the residual after this step, (1/2) r'' move^2, is within a tenth of the tolerance: the step
                    # is the root, the terms carried to it to second order
                    return _State(step, _OK, e + (de + 0.5 * e2 * move) * move, sf + (dsf + 0.5 * sf2 * move) * move,
                                  de + e2 * move, dsf + sf2 * move)
            y_last, de_last, dsf_last = y, de, dsf
            y_new = step
        elif hi == math.inf:
            y_new = 2.0 * y
        else:
            y_new = 0.5 * (lo + hi)
        if hi != math.inf and hi - lo <= 1e-14 * hi:  # the bracket is down to rounding
            return _state(props, y_new, _OK)
        y = y_new
    raise ConvergenceError(f"the energy balance of a step did not converge in {_MAX_NEWTON} iterations "
                           f"(depth {y:.6g} m, head residual {r:.3g} m, tolerance {HEAD_TOLERANCE:g} m)")


def _step_error(props, known, new, length, upstream):
    """Estimated error of a step's depth [m] (see "Step control"): the trapezoidal rule's error in the friction
    loss, (L^2 / 12) times the change of dS_f/dx = (dS_f/dy)(dy/dx) between the step's ends, dy/dx = (S0 - S_f) /
    (1 - Fr^2) (the gradually varied flow equation; 1 - Fr^2 = dE/dy), carried to the depth through the step's
    energy balance (over its derivative dE/dy -/+ L/2 dS_f/dy)."""
    s0 = props.slope
    change = new.dsf * (s0 - new.sf) / new.de - known.dsf * (s0 - known.sf) / known.de
    slope = new.de + (-0.5 if upstream else 0.5) * length * new.dsf
    return math.inf if slope == 0.0 else abs(length * length / 12.0 * change / slope)


def _error_ratio(props, known, new, length, upstream, tol):
    """A step's estimated error over the error allowed (see "Step control"); None where it cannot be estimated
    (an end without a root on its branch, or next to critical depth)."""
    if new.status != _OK or known.status != _OK or not abs(known.de) > NEAR_CRITICAL < abs(new.de):
        return None
    error = _step_error(props, known, new, length, upstream)
    allowed = STEP_ERROR_SHARE * tol * new.y
    if error != error:  # nan: no estimate
        return None
    return error / allowed if allowed > 0.0 else (0.0 if error == 0.0 else math.inf)


def _levels(ratio):
    """How many times to halve a step whose error ratio is ``ratio`` (negative: how many times it may be doubled)
    so that its error falls within the allowance: the error goes as the cube of the step, with a margin of 0.9;
    at most 3 either way."""
    if not ratio > 0.0:
        return -3
    if ratio == math.inf:
        return 3
    return max(-3, min(3, math.ceil(math.log2(ratio) / 3.0 + _LOG2_MARGIN)))


def _advance(props, known, x0, z0, x1, z1, upstream, tol, new=None, from_props=None, hint=None):
    """Carry ``known`` (at x0, z0) to (x1, z1) on one stretch, in steps whose estimated error is within the
    tolerance (see "Step control" in the module's text).

    ``new`` is the whole step's answer where the caller has it already; ``from_props`` the known state's props
    where they are not ``props`` (a change at a point). ``hint``, a one-item list, holds how many times to halve
    the first step, from the error of the last stretch's first step (on a run whose stretches turn alike, as
    where the flow changes at every point); the stretch leaves its own there."""
    length = abs(x1 - x0)
    deepest = max(1, int(math.log2(length / MIN_STEP))) if length >= 2.0 * MIN_STEP else 0
    level = min(deepest, hint[0]) if hint is not None and known.status == _OK else 0
    if level == 0:
        if new is None:
            new = _solve_step(props, z1, known, z0, length, upstream, from_props)
        if length == 0.0 or (new.status != _OK and known.status != _OK):
            return new
        ratio = _error_ratio(props, known, new, length, upstream, tol)
        if ratio is None:
            return _halved(props, known, x0, z0, x1, z1, upstream, tol, new)
        if ratio <= 1.0 or deepest == 0:
            if hint is not None:
                hint[0] = 0
            return new
        level = min(deepest, max(1, _levels(ratio)))
    # shorter steps of length / 2^level (positions exact in binary, choices by whole levels), each sized from the
    # error of the last one tried and checked in turn
    s, done = known, 0.0
    while True:
        piece = min(0.5 ** level, 1.0 - done)
        fa, fb = done, done + piece
        xa, za, xb, zb = x0 + fa * (x1 - x0), z0 + fa * (z1 - z0), x0 + fb * (x1 - x0), z0 + fb * (z1 - z0)
        new = _solve_step(props, zb, s, za, piece * length, upstream)
        ratio = _error_ratio(props, s, new, piece * length, upstream, tol)
        if ratio is None:
            new = _halved(props, s, xa, za, xb, zb, upstream, tol, new)
            if new.status != _OK:
                return _State(props.yc, new.status) if new.status == _CRIT else _State(math.nan, _TOP)
        elif ratio > 1.0 and level < deepest:
            level = min(deepest, level + max(1, _levels(ratio)))
            continue
        if hint is not None and done == 0.0:  # the length the first step's own error asks for
            hint[0] = max(0, level + _levels(ratio)) if ratio is not None else level
        s, done = new, fb
        if done >= 1.0:
            return s
        if ratio is not None:
            level = max(0, level + _levels(ratio)) if ratio < 1.0 else level


def _halved(props, known, x0, z0, x1, z1, upstream, tol, new):
    """The step from ``known`` to (x1, z1), whose whole answer is ``new``, where its error cannot be estimated:
    taken as two halves, halved again while the whole and the halves differ by more than the tolerance, down to
    MIN_STEP."""
    length = abs(x1 - x0)
    xm, zm = 0.5 * (x0 + x1), 0.5 * (z0 + z1)
    a = _solve_step(props, zm, known, z0, 0.5 * length, upstream)
    if a.status != _OK:
        return _State(props.yc, a.status) if a.status == _CRIT else _State(math.nan, _TOP)
    b = _solve_step(props, z1, a, zm, 0.5 * length, upstream)
    if b.status != _OK:
        return b if b.status == _CRIT else _State(math.nan, _TOP)
    if (new.status == _OK and abs(new.y - b.y) <= tol * b.y) or 0.5 * length < MIN_STEP:
        return b
    a = _advance(props, known, x0, z0, xm, zm, upstream, tol, a)  # the first half's whole step is ``a``
    if a.status != _OK:
        return _State(props.yc, a.status) if a.status == _CRIT else _State(math.nan, _TOP)
    return _advance(props, a, xm, zm, x1, z1, upstream, tol)


# ------------------------------------------------------------------------------------------------ subcritical chain

_CHAIN_NEWTON = 40      # Newton iterations of one chain solve
_CHAIN_REFINE = 6       # rounds of refinement of a chain's steps
_CHAIN_LOOSE = 1e-5     # head [m] to which a round's balances are met while its pieces are still being cut
_CHAIN_SHARE = 0.5      # of the allowed step error, within which a chain's pieces are kept
_CHAIN_BACKOFF = 16     # node steps taken one at a time after a chain stopped short (doubled while it keeps failing)
#: The subcritical pass solves runs of steps on arrays; False takes every step one at a time (tests compare the two).
STEPS_ON_ARRAYS = True


class _Chain:
    """The subcritical pass's steps between nodes solved many at once (see "Solving many steps at once").

    Per node: its props' coefficients in arrays (trapezoid family, Manning's n constant or in closed form
    n = k R^e (A R^(2/3))^f, open top; ``able`` marks such nodes; ``first`` the first node of the run of able
    nodes on grades of one kind a node lies in)."""

    def __init__(self, nodes):
        props = [nd.props for nd in nodes]
        count = len(nodes)
        rows, table = {}, []  # one row per distinct props (a run shares them between nodes)
        for p in props:
            if id(p) not in rows:
                rows[id(p)] = len(table)
                if p._trap is None or p.top is not None or (p.nconst is None and p.npow is None):
                    table.append((math.nan,) * 10)
                else:
                    k, e, f = (p.nconst, 0.0, 0.0) if p.nconst is not None else p.npow
                    table.append((*p._trap, p.flow, k, e, f, p.slope, p.yc, p.yn))
        table = np.array(table)[[rows[id(p)] for p in props]]
        coef = table[:, :9]  # b, zsum, psum, Q, k, e, f, S0, yc
        able = ~np.isnan(coef[:, 0])
        self.able = able
        self.coef = coef
        self.yn = table[:, 9]
        self.x = np.array([nd.x for nd in nodes])
        self.z = np.array([nd.z for nd in nodes])
        # the first node of the run of able nodes of one kind of grade (steep, or not) each node lies in: a chain
        # ends where the grade turns steep or mild, where the subcritical profile most often ends at critical
        # depth, so that a chain stopping short there costs no solve of the steps above it
        yc, yn = coef[:, 8], table[:, 9]
        kind = np.where(able, np.where(yn < yc, 2, 1), 0)   # nan yn (flat, adverse): not steep
        index = np.arange(count)
        self.first = np.maximum.accumulate(np.where(np.r_[True, kind[1:] != kind[:-1]], index, 0))

    @staticmethod
    def terms(c, y, powers=True):
        """head_terms of :class:`_Props` on arrays (the same formulas): E, S_f, dE/dy, dS_f/dy, n; ``powers``
        False where every n is constant (e = f = 0)."""
        b, zs, ps, q, k, e, f = c[0], c[1], c[2], c[3], c[4], c[5], c[6]
        t = b + zs * y
        a = (b + 0.5 * zs * y) * y
        p = b + ps * y
        r = a / p
        conveyance = a * np.cbrt(r * r)
        t_a, dp_p = t / a, ps / p
        if powers:
            n = k * np.exp(e * np.log(r) + f * np.log(conveyance))
            dlogn2 = 2.0 * ((e + 2 / 3 * f) * (t_a - dp_p) + f * t_a)
        else:
            n, dlogn2 = k, 0.0
        v2g = q * q / (2 * G * a * a)
        sf = (q * n / conveyance) ** 2
        return y + v2g, sf, 1 - 2 * v2g * t_a, sf * (dlogn2 - 10 / 3 * t_a + 4 / 3 * dp_p), n

    def solve(self, end, known, tol):
        """States of the nodes above node ``end`` (whose state ``known`` is), carried upstream from it over the run
        of able nodes it lies below; returns the states of the nodes accepted, the most downstream last (a run of
        nodes ending next to ``end``; empty where none is)."""
        steps = np.arange(self.first[end - 1], end)          # node step s: from node s + 1 up to node s
        x0, x1 = self.x[steps], self.x[steps + 1]
        z0, z1 = self.z[steps], self.z[steps + 1]
        length = x1 - x0
        coef = np.ascontiguousarray(self.coef[steps].T)     # one row per coefficient, to gather pieces from
        powers = bool(np.any(coef[5:7] != 0.0))
        # pieces: the node step each lies in, and its ends as fractions of the step from its upstream node
        owner = np.arange(steps.size)
        u0, u1 = np.zeros(steps.size), np.ones(steps.size)
        y = None
        for rnd in range(_CHAIN_REFINE):
            share = u1 - u0
            full = length[owner]
            half = 0.5 * share * full
            zu = z0[owner] + u0 * (z1 - z0)[owner]
            c = coef.take(owner, axis=1)                     # a piece's props: its step's upstream node's
            yc = c[8]
            if y is None:
                yn = self.yn[steps[owner]]
                y = np.maximum(np.where(np.isfinite(yn) & (yn > yc), yn, known.y), 1.05 * yc)
            size = y.size
            zd = np.append(zu[1:], self.z[end])             # a piece's downstream end: the next piece's upstream end
            # head terms at every piece's upstream end and, last, at the known state below them all: a piece's
            # downstream end is the next column
            ext = np.empty((4, size + 1))
            ext[:, size] = known.energy, known.sf, known.de, known.dsf
            e, sf, de, dsf = ext[:, :-1]
            e_d, sf_d, de_d, dsf_d = ext[:, 1:]
            n, resid = np.empty(size), np.empty(size)
            # a round that will be cut again needs its depths only for the error estimate: it meets the balances
            # to _CHAIN_LOOSE; a round with nothing left to cut then goes on to HEAD_TOLERANCE and is checked again
            head_tol, evaluated = (_CHAIN_LOOSE if rnd < _CHAIN_REFINE - 1 else HEAD_TOLERANCE), False
            while True:
                hi = size  # the pieces above the most downstream one not met: those below it keep their depths
                with np.errstate(all="ignore"):
                    for iteration in range(_CHAIN_NEWTON + 1):
                        if not evaluated:
                            ext[0, :hi], ext[1, :hi], ext[2, :hi], ext[3, :hi], n[:hi] = self.terms(
                                c[:, :hi], y[:hi], powers)
                            h = half[:hi]
                            resid[:hi] = (zu[:hi] + e[:hi] - h * sf[:hi]) - (zd[:hi] + e_d[:hi] + h * sf_d[:hi])
                        evaluated = False
                        missed = np.flatnonzero(~(np.abs(resid[:hi]) <= head_tol))
                        if missed.size == 0 or iteration == _CHAIN_NEWTON:  # the pieces not met are refused below
                            break
                        # Newton on the depths at once: the Jacobian is upper bidiagonal (a piece's balance ties its
                        # two ends), so each depth's correction depends on those downstream of it alone, and the
                        # depths below the last piece not met need none
                        hi = int(missed[-1]) + 1
                        h = half[:hi]
                        ab = np.empty((2, hi))
                        ab[0, 0] = 0.0
                        ab[0, 1:] = -(de_d[:hi - 1] + h[:-1] * dsf_d[:hi - 1])
                        ab[1] = de[:hi] - h * dsf[:hi]
                        delta, info = dtbtrs(ab, -resid[:hi], uplo="U")  # the banded triangular system, in LAPACK
                        if info != 0:
                            return []
                        was, ych = y[:hi], yc[:hi]
                        y_new = was + delta
                        # on the subcritical branch: at most halfway down to critical depth at once
                        y_new = np.where(y_new > ych, y_new, ych + 0.5 * (was - ych))
                        y[:hi] = np.where(np.isfinite(y_new), y_new, 1.05 * ych)
                    ok = np.abs(resid) <= head_tol
                    # a piece is good where its balance is met on the subcritical branch, away from critical depth
                    # (where the error estimate has no value), with n in range and its error estimated
                    good = (ok & (y > yc) & (np.abs(de) > NEAR_CRITICAL) & (np.abs(de_d) > NEAR_CRITICAL) & (n > 0)
                            & (n < 1))
                    s0, piece = c[7], 2.0 * half
                    change = dsf * (s0 - sf) / de - dsf_d * (s0 - sf_d) / de_d
                    error = np.abs(piece * piece / 12.0 * change / (de - half * dsf))
                    ratio = np.where(full > 0.0, error / (STEP_ERROR_SHARE * tol * y), 0.0)
                    good &= ratio >= 0.0                          # false for nan: no estimate
                bad = np.flatnonzero(~good)
                last_bad = int(owner[bad[-1]]) if bad.size else -1
                # pieces are kept within half the allowance: even steps, not sized one after the other as the steps
                # taken one at a time are, keep the profile as close to a fine-step reference that way
                refine = (ratio > _CHAIN_SHARE) & (half >= MIN_STEP) & (owner > last_bad)
                if refine.any() or head_tol == HEAD_TOLERANCE:
                    break
                head_tol, evaluated = HEAD_TOLERANCE, True       # the depths stand: their terms are evaluated
            if not refine.any():
                break
            if rnd == _CHAIN_REFINE - 1:   # still refining after the last round: only what lies below the pieces
                last_bad = max(last_bad, int(owner[np.flatnonzero(refine)[-1]]))   # to refine is accepted
                break
            # into 2^m pieces, m from the cube law of the error (margin 0.9) to within the share, 1 to 3, none shorter
            # than MIN_STEP
            m = np.zeros(size)
            m[refine] = np.clip(np.ceil(np.log2(ratio[refine] / _CHAIN_SHARE) / 3.0 + _LOG2_MARGIN), 1, 3)
            m = np.minimum(m, np.floor(np.log2(np.maximum(2.0 * half, MIN_STEP) / MIN_STEP)))
            count = (2 ** m).astype(int)
            start = np.cumsum(count) - count
            k = np.arange(count.sum()) - np.repeat(start, count)
            y = _cut_depths(y, known.y, count, k)
            sub = np.repeat(share / count, count)
            owner, u0 = np.repeat(owner, count), np.repeat(u0, count) + k * sub
            u1 = u0 + sub
        at_node = np.flatnonzero(u0 == 0.0)[last_bad + 1:]   # each step's first piece starts at its upstream node
        return [_State(*v) for v in zip(y[at_node].tolist(), [_OK] * at_node.size, e[at_node].tolist(),
                                         sf[at_node].tolist(), de[at_node].tolist(), dsf[at_node].tolist())]


def _cut_depths(y, y_end, count, k):
    """First depths of the pieces that the pieces become when piece i is cut into ``count[i]`` even pieces (``k``
    numbers the new pieces within their piece): the last answer, ``y`` at the pieces' upstream ends (``y_end``
    below the last), linearly between each piece's ends. Only a first trial: the Newton solve that follows meets
    the balances whatever it is."""
    parent = np.repeat(np.arange(y.size), count)
    out = y[parent]
    inside = np.flatnonzero(k)                       # the new pieces that start inside the piece they were cut from
    if inside.size:
        p = parent[inside]
        t = k[inside] / count[p]
        out[inside] += t * (np.append(y[1:], y_end)[p] - y[p])
    return out


# ------------------------------------------------------------------------------------------------ results

@dataclass(frozen=True)
class Jump:
    """A hydraulic jump: its toe, sequent depths and length, SI."""

    distance: float          # toe of the jump, along the flow [m]
    upstream_depth: float    # supercritical depth at the toe y1 [m]
    downstream_depth: float  # sequent depth y2 [m]
    length: float            # length of the jump [m]
    froude: float            # Froude number at the toe [-]
    kind: str                # undular, weak, oscillating, steady, strong
    notes: tuple = ()

    def as_dict(self) -> dict:
        return {"distance": self.distance, "upstream_depth": self.upstream_depth,
                "downstream_depth": self.downstream_depth, "length": self.length, "froude": self.froude,
                "kind": self.kind}


@dataclass
class WaterSurface:
    """The computed water surface at each design point (arrays of the points' length), SI; see module docs."""

    distance: np.ndarray
    bed: np.ndarray
    depth: np.ndarray
    water_surface: np.ndarray
    profile_type: list
    regime: list
    normal_depth: np.ndarray
    critical_depth: np.ndarray
    velocity: np.ndarray
    froude: np.ndarray
    energy: np.ndarray
    messages: list
    stretch_types: list
    jumps: list
    controls: dict
    notes: list = field(default_factory=list)
    detail_distance: np.ndarray = None
    detail_bed: np.ndarray = None
    detail_depth: np.ndarray = None
    detail_profile_type: list = None


# ------------------------------------------------------------------------------------------------ input

def _per_point(field_name, value, count, kind):
    if kind == "section":
        if isinstance(value, Section):
            return [value] * count
    elif kind == "n":
        if value is None or callable(value) or isinstance(value, Real):
            return [value] * count
    elif kind == "flow":
        if isinstance(value, Real) and not isinstance(value, bool):
            return [value] * count
    try:
        items = list(value)
    except TypeError:
        raise InputError(field_name, f"must be one value or one per point ({count}), got {value!r}") from None
    if len(items) != count:
        raise InputError(field_name, f"needs one value per point ({count}), got {len(items)}")
    return items


def _inputs(distance, bed, sections, n, flow):
    x = np.atleast_1d(np.asarray(validate.number("distance", distance), dtype=float))
    z = np.atleast_1d(np.asarray(validate.number("bed", bed), dtype=float))
    if x.ndim != 1 or x.size < 2:
        raise InputError("distance", f"needs at least two points, got {x.size}")
    if z.shape != x.shape:
        raise InputError("bed", f"needs one elevation per point ({x.size}), got {z.size}")
    steps = np.diff(x)
    if (steps <= 0).any():
        i = int(np.argmax(steps <= 0))
        raise InputError("distance", f"must rise strictly in the direction of flow (point {i + 2}: {x[i + 1]:g} m "
                                     f"after {x[i]:g} m)")
    secs = _per_point("sections", sections, x.size, "section")
    checked = set()  # a run repeats one section object at many points: each is checked once
    for i, s in enumerate(secs):
        if id(s) not in checked:
            _check_section(s, f"sections[{i}]")
            checked.add(id(s))
    ns = _per_point("n", n, x.size, "n")
    made = {}  # likewise one roughness per n object and section (the message names its first point)
    rough = []
    for i, v in enumerate(ns):
        key = (id(v), id(secs[i]))
        if key not in made:
            made[key] = _roughness(f"n[{i}]", v, secs[i])
        rough.append(made[key])
    # a float array (a run's flows) is checked at once; anything else one at a time, naming a bad one
    if (isinstance(flow, np.ndarray) and flow.dtype.kind == "f" and flow.shape == x.shape
            and bool(np.all(np.isfinite(flow))) and bool(np.all(flow > 0))):
        qs = flow.tolist()
    else:
        qs = [float(validate.positive(f"flow[{i}]", v)) for i, v in enumerate(_per_point("flow", flow, x.size, "flow"))]
    for i, v in enumerate(ns):  # an n made for one flow (grass at the energy slope) must meet that flow
        made_for = getattr(v, "flow", None)
        if made_for is not None and abs(made_for - qs[i]) > 1e-12 * qs[i]:
            raise InputError(f"n[{i}]", f"is made for a flow of {made_for:g} m^3/s, but the point carries "
                                        f"{qs[i]:g} m^3/s")
    return x, z, secs, rough, qs


def _at(x):
    return (x, "length")


# ------------------------------------------------------------------------------------------------ the profile

@collector_held()
def water_surface(distance, bed, sections, n, flow, *, outfall="normal", outfall_level=None, inlet="normal",
                  max_step=10.0, step_tolerance=1e-4) -> WaterSurface:
    """The water surface along a run by the standard step method, with its controls and hydraulic jumps.

    See the module documentation for the inputs, the method, its sources and the returned fields.

    Raises
    ------
    InputError
        A missing or malformed input, named; a normal-depth control on a stretch that does not fall.
    NoSolutionError
        No critical depth at a point (a closed or surveyed section too small for the flow).
    ConvergenceError
        A step's energy balance did not reach HEAD_TOLERANCE.
    """
    x, z, secs, rough, qs = _inputs(distance, bed, sections, n, flow)
    outfall, level, inlet = _checked_controls(outfall, outfall_level, inlet)
    max_step = float(validate.positive("max_step", max_step))
    step_tolerance = float(validate.number("step_tolerance", step_tolerance, low=0.0, high=0.1))
    point_props = _point_props(x, z, secs, rough, qs)
    nodes = _nodes(x, z, point_props, max_step)
    down = _subcritical_pass(nodes, z[-1], outfall, level, step_tolerance)
    up = _supercritical_pass(nodes, inlet, down.states, step_tolerance)
    depth, branch = up.depth, up.branch
    jumps = [_locate_jump(nodes[k], nodes[k + 1], up.states[k], down.states[k + 1], step_tolerance)
             for k in range(len(nodes) - 1) if branch[k] == "sup" and branch[k + 1] == "sub"]
    node_types = ["not computed" if not math.isfinite(y) else profile_type(y, node.props.yn, node.props.yc,
                                                                           node.props.slope)
                  for y, node in zip(depth.tolist(), nodes)]
    point_nodes = [k for k, node in enumerate(nodes) if node.point >= 0]
    points = _point_results(nodes, point_nodes, depth, branch, z, down.stop_at)
    controls = {"outfall": _outfall_control(nodes, outfall, z[-1], down, depth, branch, points.messages[-1]),
                "inlet": _inlet_control(nodes, inlet, z[0], up.states[0], depth, branch, points.messages[0]),
                "critical_sections": sorted({nodes[k].x for k in range(1, len(nodes) - 1) if branch[k] == "crit"})}
    _mark_jumps(jumps, x, points.messages)
    d = depth[point_nodes]
    return WaterSurface(
        distance=x, bed=z, depth=d, water_surface=z + d, profile_type=[node_types[k] for k in point_nodes],
        regime=points.regime, normal_depth=np.array([p.yn if p.slope > 0 and math.isfinite(p.yn) else math.nan
                                                     for p in point_props]),
        critical_depth=np.array([p.yc for p in point_props]), velocity=points.velocity, froude=points.froude,
        energy=points.energy, messages=points.messages, stretch_types=_stretch_types(node_types, point_nodes),
        jumps=jumps, controls=controls, notes=down.notes,
        detail_distance=np.array([node.x for node in nodes]), detail_bed=np.array([node.z for node in nodes]),
        detail_depth=depth, detail_profile_type=node_types)


def _checked_controls(outfall, outfall_level, inlet):
    """(outfall kind, outfall level or None, inlet) as given, or InputError saying what is wrong."""
    level = None
    if outfall_level is not None:
        if outfall not in ("normal", "level"):
            raise InputError("outfall", f"is {outfall!r} but an outfall_level was given; use 'level' or leave it out")
        outfall = "level"
        level = float(validate.number("outfall_level", outfall_level))
    elif outfall not in ("normal", "critical", "level"):
        raise InputError("outfall", f"must be 'normal', 'critical' or 'level', got {outfall!r}")
    elif outfall == "level":
        raise InputError("outfall_level", "is missing (the water-surface elevation at the outfall [m])")
    if isinstance(inlet, str):
        if inlet not in ("normal", "critical"):
            raise InputError("inlet", f"must be 'normal', 'critical' or a depth in m, got {inlet!r}")
    else:
        inlet = float(validate.positive("inlet", inlet))
    return outfall, level, inlet


def _point_props(x, z, secs, rough, qs) -> list:
    """The :class:`_Props` of each design point (equal ones shared) with critical and normal depth solved."""
    slopes = (z[:-1] - z[1:]) / np.diff(x)
    point_slope = np.append(slopes, slopes[-1])
    shared, point_props, section_keys = {}, [], {}
    for i in range(x.size):
        p = _Props(secs[i], rough[i], qs[i], float(point_slope[i]), i)
        if id(secs[i]) not in section_keys:  # sections of one shape and dimensions are one section
            section_keys[id(secs[i])] = repr(secs[i].to_dict())
        point_props.append(shared.setdefault(p.key(section_keys[id(secs[i])]), p))
    _depths_in_arrays(list(shared.values()), section_keys)
    for p in shared.values():
        if math.isnan(p.yc):
            try:
                p.yc = float(solve_critical_depth(p.section, p.flow).depth)
            except NoSolutionError as exc:
                raise NoSolutionError(worded("no critical depth at distance {x}: {why}", x=(x[p.index], "length", "g"),
                                             why=exc.said())) from None
        if p.slope > 0 and math.isnan(p.yn):
            try:
                n_arg = p.nconst if p.nconst is not None else (
                    None if p.nkey[0] == "composite" else _ModelN(p.nfn))
                p.yn = float(solve_normal_depth(p.section, p.flow, p.slope, n_arg).depth)
            except InputError as exc:
                raise InputError("bed", f"the stretch from {x[p.index]:g} m has a grade of {p.slope:g}: "
                                        f"{exc}") from None
            except NoSolutionError as exc:
                p.yn = math.inf
                p.yn_note = exc.said()
    return point_props


def _depths_in_arrays(props, section_keys) -> None:
    """Critical and normal depth of many props at once: one array solve per section (critical depth) and per
    section and constant n or grass model (normal depth), the same solvers as one at a time. A group whose array
    solve raises is left to the one-at-a-time solves, which name the point; so is a stone or surveyed section's
    n (its normal depth may have several roots, and the scalar steps choose one)."""
    by_section = {}
    for p in props:
        by_section.setdefault(section_keys[id(p.section)], []).append(p)
    for group in by_section.values():
        if len(group) < 2:
            continue
        try:
            yc = solve_critical_depth(group[0].section, np.array([p.flow for p in group])).depth
        except HydraulicsError:
            continue
        for p, y in zip(group, yc.tolist()):
            p.yc = y
        normal = {}
        for p in group:
            if not p.slope > 0:
                continue
            if p.nconst is not None:
                normal.setdefault("constant", []).append(p)
            elif p.nsource is not None and abs(getattr(p.nsource, "slope", p.slope) - p.slope) <= 1e-12 * p.slope:
                # grass whose n is taken at the stretch's own slope, or at the energy slope (the bed slope at
                # normal depth): the model itself, vectorised over the slopes
                normal.setdefault(id(p.nsource.model), []).append(p)
        for kind, members in normal.items():
            if len(members) < 2:
                continue
            flows = np.array([p.flow for p in members])
            grades = np.array([p.slope for p in members])
            n_arg = np.array([p.nconst for p in members]) if kind == "constant" else members[0].nsource.model
            try:
                yn = solve_normal_depth(members[0].section, flows, grades, n_arg).depth
            except HydraulicsError:
                continue
            for p, y in zip(members, yn.tolist()):
                p.yn = y


def _nodes(x, z, point_props, max_step) -> list:
    """Computation nodes: each point, the steps of its stretch, and the upstream side of a change at the next
    point."""
    nodes = []
    xs, zs = x.tolist(), z.tolist()
    for i in range(len(xs) - 1):
        p = point_props[i]
        x0, z0, dx, dz = xs[i], zs[i], xs[i + 1] - xs[i], zs[i + 1] - zs[i]
        nodes.append(_Node(x0, z0, p, i))
        pieces = max(1, math.ceil(dx / max_step - 1e-9))
        for k in range(1, pieces):
            f = k / pieces
            nodes.append(_Node(x0 + f * dx, z0 + f * dz, p, -1))
        if point_props[i + 1] is not p:
            nodes.append(_Node(xs[i + 1], zs[i + 1], p, -2))
    nodes.append(_Node(xs[-1], zs[-1], point_props[-1], len(xs) - 1))
    return nodes


@dataclass
class _Downstream:
    """The subcritical pass: the state at each node, the outfall's depth, whether it lies below critical depth
    (and so does not control), its message, where the profile rose above the section's top, and notes."""

    states: list
    y0: float
    start: _State
    below_critical: bool
    message: str | None
    stop_at: float | None
    notes: list


def _subcritical_pass(nodes, z_out, outfall, level, tol) -> _Downstream:
    """The subcritical profile, computed upstream from the outfall control."""
    last = nodes[-1].props
    if outfall == "normal":
        if last.slope <= 0:
            raise InputError("outfall", f"normal depth needs a falling last stretch, its grade is {last.slope:g}; "
                                        "give the outfall water level, or choose critical depth (a free outfall)")
        if not math.isfinite(last.yn):
            raise NoSolutionError(worded("no normal depth at the outfall: {why}", why=last.yn_note))
        y0 = last.yn
    elif outfall == "critical":
        y0 = last.yc
    else:
        y0 = level - z_out
    message = None
    below_critical = y0 <= last.yc and outfall != "critical"
    if outfall == "level" and below_critical:
        message = worded("the outfall water level {level} is below the critical-depth level {crit}: it does not "
                         "control, the flow passes through critical depth at the outfall",
                         level=(level, "length"), crit=(z_out + last.yc, "length"))
        start = _State(last.yc, _OK)
    elif outfall == "normal" and below_critical:
        start = _State(last.yc, _CRIT)  # supercritical normal depth: no subcritical control at the outfall
        message = worded("normal depth at the outfall ({y}) is below critical depth ({yc}) on the steep last "
                         "stretch: it does not control, the depth there is set from upstream",
                         y=(y0, "length"), yc=(last.yc, "length"))
    elif last.top is not None and y0 > last.top:
        start = _State(math.nan, _TOP)
        message = worded("the outfall water level {level} is above the top of the section ({top} deep): the "
                         "flow there is not open-channel flow, and the water surface is not computed",
                         level=(level, "length"), top=(last.top, "length"))
    else:
        start = _State(y0, _OK)
    sub = [None] * len(nodes)
    sub[-1] = _state(last, start.y, start.status)
    hint = [0]
    stop_at = nodes[-1].x if start.status == _TOP else None
    chain, alone, backoff = _Chain(nodes) if STEPS_ON_ARRAYS else None, 0, _CHAIN_BACKOFF
    k = len(nodes) - 2
    while k >= 0:
        a, b = nodes[k], nodes[k + 1]
        known = sub[k + 1]
        if known.status == _TOP:
            sub[k] = _State(math.nan, _TOP)
            k -= 1
            continue
        if STEPS_ON_ARRAYS and alone == 0 and known.status == _OK and chain.able[k] and known.y > b.props.yc:
            states = chain.solve(k + 1, known, tol)
            if states:
                sub[k + 1 - len(states):k + 1] = states
                k -= len(states)
                backoff = _CHAIN_BACKOFF
            if k >= 0 and chain.able[k]:  # stopped short: the next steps one at a time
                alone, backoff = backoff, 2 * backoff if not states else backoff
            continue
        alone = max(0, alone - 1)
        if known.status == _CRIT:
            known = _state(b.props, b.props.yc, _CRIT)
        # Two nodes a step apart lie on one stretch and share its props; at a change at a point (a step of length
        # zero) the energy is carried onto the props of the node reached.
        s = _advance(a.props, known, b.x, b.z, a.x, a.z, True, tol, from_props=b.props,
                     hint=hint if a.x != b.x else None)
        if s.status == _TOP and stop_at is None:
            stop_at = a.x
        sub[k] = s
        k -= 1
    notes = []
    if stop_at is not None:
        notes.append(worded("the subcritical water surface rises above the top of the section at {at}: the profile "
                            "upstream of it is not computed", at=_at(stop_at)))
    return _Downstream(sub, y0, start, below_critical, message, stop_at, notes)


@dataclass
class _Upstream:
    """The supercritical pass: its state at each node, and at each node the depth that governs and which profile
    gave it ("sub", "sup", "crit" or "none")."""

    states: list
    depth: np.ndarray
    branch: list


def _supercritical_pass(nodes, inlet, sub, tol) -> _Upstream:
    """The supercritical profile downstream from the inlet, deciding at each node which profile governs (the
    larger specific force). Supercritical flow goes on only from a node where it governs, or starts afresh from
    critical depth where the flow passes through it (a control); downstream of a jump it is gone until the next
    such control."""
    first = nodes[0].props
    if inlet == "normal":
        start = _State(first.yn, _OK) if first.slope > 0 and first.yn < first.yc else _State(first.yc, _CRIT)
    elif inlet == "critical":
        start = _State(first.yc, _OK)
    else:
        start = _State(inlet, _OK) if inlet < first.yc else _State(first.yc, _CRIT)
    size = len(nodes)
    sup = [None] * size
    depth = [math.nan] * size
    branch = [""] * size
    for k, node in enumerate(nodes):
        p = node.props
        if k == 0:
            u = _state(first, start.y, start.status)
        elif branch[k - 1] in ("sup", "crit"):
            a = nodes[k - 1]
            known = sup[k - 1] if branch[k - 1] == "sup" else _state(a.props, a.props.yc, _CRIT)
            u = _advance(p, known, a.x, a.z, node.x, node.z, False, tol, from_props=a.props)
        else:
            u = _State(p.yc, _CRIT)  # subcritical upstream, no control between: no supercritical flow here
        sup[k] = u
        s = sub[k]
        if s.status == _OK and (u.status != _OK or p.force(u.y) <= p.force(s.y)):
            branch[k], depth[k] = "sub", s.y
        elif u.status == _OK:
            branch[k], depth[k] = "sup", u.y
        elif s.status == _TOP:
            branch[k] = "none"
        else:
            branch[k], depth[k] = "crit", p.yc
    return _Upstream(sup, np.array(depth), branch)


@dataclass
class _Points:
    """Per design point: regime, velocity, Froude number, energy level and messages."""

    regime: list
    velocity: np.ndarray
    froude: np.ndarray
    energy: np.ndarray
    messages: list


def _point_results(nodes, point_nodes, depth, branch, z, stop_at) -> _Points:
    """Regime, velocity, Froude number, energy level and messages at each design point from the depths of the
    profile (nan where it is not computed)."""
    count = len(point_nodes)
    props = [nodes[k].props for k in point_nodes]
    y = depth[point_nodes]
    area, top = np.full(count, math.nan), np.full(count, math.nan)
    groups = {}  # the points of each section object, with a depth: its geometry once on their depths
    for i, p in enumerate(props):
        groups.setdefault(id(p.section), (p.section, []))[1].append(i)
    for section, rows in groups.values():
        rows = np.array(rows)
        rows = rows[np.isfinite(y[rows])]
        if rows.size:
            g = section._geometry(y[rows])
            area[rows], top[rows] = g.area, g.top_width
    with np.errstate(divide="ignore", invalid="ignore"):
        velocity = np.array([p.flow for p in props]) / area
        froude = np.where(top > 0, velocity / np.sqrt(G * area / top), math.inf)
    computed = np.isfinite(y)
    froude[~computed] = math.nan
    energy = z + y + velocity ** 2 / (2 * G)
    regime, messages = [], [[] for _ in range(count)]
    for i, (k, p, fr, known) in enumerate(zip(point_nodes, props, froude.tolist(), computed.tolist())):
        if p.yn_note:
            messages[i].append(worded("no normal depth: {why}", why=p.yn_note))
        if not known:
            regime.append("not computed")
            messages[i].append(worded("not computed: the water surface downstream rises above the top of the "
                                      "section (at {at})", at=_at(stop_at)))
            continue
        regime.append("critical" if branch[k] == "crit" or abs(fr - 1) <= 1e-6 else
                      "supercritical" if fr > 1 else "subcritical")
        if branch[k] == "crit" and 0 < i < count - 1:
            messages[i].append("the flow passes through critical depth here: a control, which sets the water "
                               "surface upstream (as where a milder stretch meets a steeper one)")
    return _Points(regime, velocity, froude, energy, messages)


def _stretch_types(node_types, point_nodes) -> list:
    """The profile types met along each stretch between design points, in the order met."""
    out = []
    for a, b in zip(point_nodes, point_nodes[1:]):
        seen = []
        for t in node_types[a:b]:
            if t not in seen:
                seen.append(t)
        out.append(seen)
    return out


def _outfall_control(nodes, outfall, z_out, down, depth, branch, messages) -> dict:
    """What the outfall control became; its message (if any) is added to the last point's ``messages``."""
    last, k = nodes[-1].props, len(nodes) - 1
    message = down.message
    governs = branch[k] == "sub" and down.start.status == _OK and not down.below_critical
    if branch[k] == "sup" and outfall != "critical" and not down.below_critical:
        what = "water level" if outfall == "level" else "normal depth"
        try:
            y2 = sequent_depth(last.section, last.flow, float(depth[k]))
            message = worded("the {what} at the outfall cannot hold: the supercritical flow arriving there "
                             "(depth {y1}) would need a depth of {y2} to jump, so the jump forms beyond the "
                             "outfall", what=what, y1=(depth[k], "length"), y2=(y2, "length"))
        except NoSolutionError as exc:
            message = worded("the {what} at the outfall cannot hold: the supercritical flow arriving there (depth "
                             "{y1}) keeps going; {why}", what=what, y1=(depth[k], "length"), why=exc.said())
    if message:
        messages.append(message)
    return {"kind": outfall, "depth": float(down.y0), "level": float(z_out + down.y0), "governs": bool(governs),
            "message": message}


def _inlet_control(nodes, inlet, z_in, assumed, depth, branch, messages) -> dict:
    """What the inlet control became (``assumed``: the supercritical state at the top); its message (if any) is
    added to the first point's ``messages``."""
    first = nodes[0].props
    inlet_depth = first.yn if inlet == "normal" else first.yc if inlet == "critical" else inlet
    message = None
    if assumed.status == _OK and branch[0] == "sub":
        message = worded("the supercritical inflow assumed at the top (depth {y}) is drowned by the water backed up "
                         "from downstream (depth {y2}): a jump at or above the top of the run",
                         y=(assumed.y, "length"), y2=(depth[0], "length"))
    elif isinstance(inlet, float) and inlet >= first.yc:
        message = worded("the depth {y} given at the top is not below critical depth ({yc}): it cannot control "
                         "the flow from upstream; the depth there comes from downstream",
                         y=(inlet, "length"), yc=(first.yc, "length"))
    if message:
        messages.append(message)
    known = math.isfinite(inlet_depth)
    return {"kind": inlet if isinstance(inlet, str) else "depth",
            "depth": float(inlet_depth) if known else math.nan,
            "level": float(z_in + inlet_depth) if known else math.nan,
            "governs": bool(branch[0] == "sup"), "message": message}


def _mark_jumps(jumps, x, messages) -> None:
    """A caution at each design point a jump covers."""
    for jump in jumps:
        for i in range(x.size):
            if jump.distance <= x[i] <= jump.distance + jump.length:
                messages[i].append(worded("in the hydraulic jump from {a} to {b} ({kind}, Froude number {fr}): "
                                          "turbulence and surface waves; the lining through and below the jump "
                                          "needs protection", a=_at(jump.distance),
                                          b=_at(jump.distance + jump.length), kind=jump.kind,
                                          fr=f"{jump.froude:.2f}"))


def _jump_kind(fr):
    kind = "undular"
    for low, name in JUMP_KINDS:
        if fr >= low:
            kind = name
    return kind


def _locate_jump(a, b, sup_a, sub_b, tol):
    """The toe of the jump between nodes ``a`` (supercritical governs) and ``b`` (subcritical governs)."""
    p = a.props
    if a.x == b.x:  # at a change of section or flow: the jump stands at the point
        x_toe, y1 = a.x, sup_a.y
    else:
        m = JUMP_GRID
        xs = [a.x + (b.x - a.x) * i / m for i in range(m + 1)]
        zs = [a.z + (b.z - a.z) * i / m for i in range(m + 1)]
        ups = [sup_a]
        for i in range(1, m + 1):
            known = ups[-1] if ups[-1].status == _OK else _state(p, p.yc, _CRIT)
            s = _advance(p, known, xs[i - 1], zs[i - 1], xs[i], zs[i], False, tol)
            ups.append(_state(p, s.y, s.status) if s.status == _OK else _State(p.yc, _CRIT))
        downs = [None] * (m + 1)
        downs[m] = sub_b
        for i in range(m - 1, -1, -1):
            known = downs[i + 1] if downs[i + 1].status == _OK else _state(p, p.yc, _CRIT)
            s = _advance(p, known, xs[i + 1], zs[i + 1], xs[i], zs[i], True, tol)
            downs[i] = _state(p, s.y, s.status) if s.status == _OK else _State(p.yc, _CRIT)
        diff = [p.force(u.y) - p.force(w.y if w.status == _OK else p.yc) for u, w in zip(ups, downs)]
        i = next((i for i in range(1, m + 1) if diff[i] <= 0), None)
        if i is None:  # the finer steps carry the supercritical flow to the far node: the toe stands there
            i, f = m, 1.0
        else:
            f = min(1.0, max(0.0, diff[i - 1] / (diff[i - 1] - diff[i]))) if diff[i - 1] != diff[i] else 1.0
        x_toe = xs[i - 1] + f * (xs[i] - xs[i - 1])
        y1 = ups[i - 1].y + f * (ups[i].y - ups[i - 1].y)
    y2 = sequent_depth(p.section, p.flow, y1)
    g = p.section._geometry(y1)
    fr = p.flow / g.area / math.sqrt(G * g.area / g.top_width)
    notes = [f"sequent depth from the momentum balance on a level bed (specific force preserved: "
             f"{provenance.cite('specific_force')}); length L = 6 y2 ({provenance.cite('jump_length')})"]
    lo, hi = JUMP_LENGTH_FROUDE
    if not lo < fr < hi:
        notes.append(f"Froude number {fr:.2f} is outside {lo:g} to {hi:g}, where L = 6 y2 was measured; the jump is "
                     "somewhat shorter there, so the length given is an upper estimate")
    if a.x == b.x:
        notes.append("the jump stands at a change of section or flow; its sequent depth is that of the upstream "
                     "section")
    return Jump(distance=float(x_toe), upstream_depth=float(y1), downstream_depth=float(y2),
                length=float(JUMP_LENGTH_RATIO * y2), froude=float(fr), kind=_jump_kind(fr), notes=tuple(notes))
