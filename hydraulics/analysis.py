"""The full uniform-flow analysis of one channel (or of arrays of channels).

Collects normal and critical depth with the quantities a designer reads off
them. Formulas (Chow, V. T., *Open-Channel Hydraulics*, McGraw-Hill, 1959):

* velocity V = Q / A;
* Froude number Fr = V / sqrt(g D) on the hydraulic depth D = A / T (Eq. 1-5);
* specific energy E = y + V^2 / (2 g) at normal depth (Eq. 3-1, alpha = 1);
* critical slope S_c = (Q n / (A_c R_c^(2/3)))^2, the slope at which normal
  depth equals critical depth (Sec. 6-6);
* bed shear at the deepest point tau_d = gamma y S (FHWA HEC-15, Kilgore and
  Cotton, 3rd ed., 2005, Eq. 3.1) and mean boundary shear tau_0 = gamma R S
  (Chow 1959, Eq. 8-5).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from .constants import G, GAMMA_WATER, NU_WATER
from .solvers import _n_value, resolve_roughness, solve_critical_depth, solve_normal_depth
from .validate import LIMITS
from .wording import significant, worded

#: Froude numbers in this band are near critical: the water surface is wavy and
#: unstable and small changes of n or flow swap the regime (see NEAR_CRITICAL_SOURCE).
NEAR_CRITICAL_BAND = (0.8, 1.2)
NEAR_CRITICAL_SOURCE = "common practice; design manuals differ slightly on the limits"
#: Cautions on the flow regime, one wording for every front end; ``{fr}`` is the Froude number as text.
NEAR_CRITICAL_CAUTION = ("Froude number {fr} is near critical (band %g to %g; %s): the water surface will be "
                         "unstable and wavy and small changes of n or flow swap the regime; allow extra freeboard or "
                         "change the slope or section") % (*NEAR_CRITICAL_BAND, NEAR_CRITICAL_SOURCE)
SUPERCRITICAL_CAUTION = ("Froude number {fr} is supercritical, above the near-critical band: surface waves whose "
                         "height approaches the depth of flow, and splash and surge on steep grades (HEC-15 Section "
                         "2.1.1); the freeboard needs special consideration, a hydraulic jump forms where the grade "
                         "flattens, and the lining through and below the jump needs protection")
#: Below this Reynolds number (V R / nu) the flow is not fully turbulent and
#: Manning's equation with a constant n does not apply (Chow 1959, Sec. 1-5 and
#: Fig. 8-1: laminar below about 500, transitional up to about 2000 on R).
MIN_TURBULENT_REYNOLDS = 2000.0
#: Caution where the flow is not fully turbulent, one wording for every front end; ``{re}`` is the Reynolds number
#: as text (a whole number).
TURBULENCE_CAUTION = ("Reynolds number {re} is below %g: the flow is not fully turbulent and Manning's equation is "
                      "outside its range") % MIN_TURBULENT_REYNOLDS
#: Caution on a pipe above its full-flow capacity (common practice: above the full-pipe flow there are two part-full
#: depths, the lower one is returned, and any disturbance can seal the pipe); ``{q_full}`` the capacity.
FULL_PIPE_CAUTION = ("the flow is above the pipe's full-flow capacity ({q_full}): it runs just below the crown, where "
                     "a small disturbance makes it surcharge; use a larger pipe")
#: The largest Manning's n accepted as input (hydraulics.validate.LIMITS, common practice); a lining's relation that
#: gives more (stone in a trickle at a tiny Froude number, Bathurst's relation) has left the flows it describes.
HIGHEST_N = LIMITS["n"].high
#: Caution where a lining's relation gives an n above HIGHEST_N; ``{n}`` is n as text.
HIGH_N_CAUTION = ("Manning's n {n} from the lining's relation is above %g, the largest n this program accepts as "
                  "input (common practice): the relation is far outside the flows it describes, and the depth and "
                  "velocity are not reliable") % HIGHEST_N
#: Regime is called "critical" when |Fr - 1| is below this (to rounding).
CRITICAL_TOLERANCE = 1e-6


@dataclass
class ChannelResult:
    """Uniform-flow state of a channel, SI. Fields are floats, or ndarrays for array input."""

    flow: object
    slope: object
    normal_depth: object
    critical_depth: object
    velocity: object
    froude: object
    regime: object
    area: object
    wetted_perimeter: object
    top_width: object
    hydraulic_radius: object
    hydraulic_depth: object
    critical_slope: object
    specific_energy: object
    bed_shear: object
    mean_shear: object
    manning_n: object
    reynolds: object
    iterations: int
    residual: object
    warnings: list = field(default_factory=list)


_REGIMES = np.array(["subcritical", "supercritical", "critical"])


def flow_regime(froude):
    """"subcritical" (Fr < 1), "supercritical" (Fr > 1) or "critical" (|Fr - 1| < 1e-6)."""
    if np.ndim(froude):
        fr = np.asarray(froude)
        code = np.where(np.abs(fr - 1) < CRITICAL_TOLERANCE, 2, 1 - (fr < 1))
        return _REGIMES[code]  # one gather rather than two string-array selections
    if abs(froude - 1) < CRITICAL_TOLERANCE:
        return "critical"
    return "subcritical" if froude < 1 else "supercritical"


def froude_cautions(froude) -> list[str]:
    """The regime cautions for a Froude number (or array: one text per kind, with a count)."""
    fr = np.asarray(froude, dtype=float)
    lo, hi = NEAR_CRITICAL_BAND
    out = []
    for mask, text in (((fr >= lo) & (fr <= hi), NEAR_CRITICAL_CAUTION), (fr > hi, SUPERCRITICAL_CAUTION)):
        if np.any(mask):
            out.append(_count(mask) + text.format(fr=_fmt(fr, mask)))
    return out


def _count(mask) -> str:
    m = np.asarray(mask)
    return "" if m.ndim == 0 else f"{int(m.sum())} of {m.size} channels: "


def full_pipe_flow(section, slope, n_used):
    """Manning's flow of the pipe ``section`` running full [m^3/s], Q = (1/n) A R^(2/3) S^(1/2) (Chow 1959,
    Eq. 5-6), at ``slope`` with ``n_used``, the n of its normal depth (arrays broadcast).

    No range check on n: a stone lining's relation can give an n above the range accepted as input (a large
    stone in a small pipe), and its cautions say so; the capacity is still the one that n gives.
    """
    d = np.asarray(section.diameter, dtype=float)
    full = section._geometry(np.broadcast_to(d, np.broadcast_shapes(d.shape, np.shape(slope), np.shape(n_used)))
                             if np.ndim(slope) or np.ndim(n_used) or d.ndim else float(d))
    sqrt = np.sqrt if np.ndim(slope) else math.sqrt
    return full.area * (full.area / full.wetted_perimeter) ** (2 / 3) * sqrt(slope) / n_used


def analyse(section, flow, slope, n=None, normal=None) -> ChannelResult:
    """Normal and critical depth with every derived quantity; see the module notes.

    Parameters are those of :func:`hydraulics.normal_depth`. Raises what that
    function raises. ``warnings`` lists, in words, results near or beyond the
    limits of the method (near-critical flow, non-turbulent flow, a pipe
    running above its full-flow capacity). ``normal``: the
    :class:`~hydraulics.solvers.DepthSolution` of ``solve_normal_depth(section,
    flow, slope, n)`` when the caller has made it already (a ditch run solves
    its normal depths for the travel time first); it is used as it is.
    """
    sol = solve_normal_depth(section, flow, slope, n) if normal is None else normal
    crit = solve_critical_depth(section, flow)
    y, yc = sol.depth, crit.depth
    vector = np.ndim(y) > 0
    q = np.broadcast_to(np.asarray(flow, dtype=float), np.shape(y)) if vector else float(flow)
    s = np.broadcast_to(np.asarray(slope, dtype=float), np.shape(y)) if vector else float(slope)
    sqrt = np.sqrt if vector else math.sqrt
    rough = resolve_roughness(section, n)

    geo = section._geometry(y)
    area, perim, top = geo.area, geo.wetted_perimeter, geo.top_width
    radius = area / perim
    hyd_depth = area / top
    v = q / area
    fr = v / sqrt(G * hyd_depth)
    n_used = _n_value(rough, section, y, s)

    cgeo = section._geometry(yc)
    rc = cgeo.area / cgeo.wetted_perimeter
    n_crit = _n_value(rough, section, yc, s)
    s_crit = (q * n_crit / (cgeo.area * rc ** (2 / 3))) ** 2
    reynolds = v * radius / NU_WATER

    warnings = froude_cautions(fr)
    lam = reynolds < MIN_TURBULENT_REYNOLDS
    if np.any(lam):
        re_text = f"{float(reynolds):.0f}" if np.ndim(reynolds) == 0 else _fmt(reynolds, lam)
        warnings.append(_count(lam) + TURBULENCE_CAUTION.format(re=re_text))
    high_n = np.asarray(n_used) > HIGHEST_N   # only a relation's n can be: a number given is refused above it
    if np.any(high_n):
        n_text = significant(float(n_used)) if np.ndim(n_used) == 0 else f"up to {significant(np.max(n_used))}"
        warnings.append(_count(high_n) + HIGH_N_CAUTION.format(n=n_text))
    if section.kind == "circle":
        # Above the full-pipe flow there are two part-full depths; the lower one is returned,
        # and any disturbance can seal the pipe (common practice).
        q_full = full_pipe_flow(section, s, n_used)
        over = q > q_full
        if np.any(over):
            if vector:
                warnings.append(_count(over) + FULL_PIPE_CAUTION.format(q_full=f"{_fmt(q_full, over)} m^3/s"))
            else:
                warnings.append(worded(FULL_PIPE_CAUTION, q_full=(float(q_full), "flow")))
    return ChannelResult(
        flow=q, slope=s, normal_depth=y, critical_depth=yc, velocity=v, froude=fr,
        regime=flow_regime(fr), area=area, wetted_perimeter=perim, top_width=top,
        hydraulic_radius=radius, hydraulic_depth=hyd_depth, critical_slope=s_crit,
        specific_energy=y + v * v / (2 * G), bed_shear=GAMMA_WATER * y * s,
        mean_shear=GAMMA_WATER * radius * s, manning_n=n_used, reynolds=reynolds,
        iterations=max(sol.iterations, crit.iterations), residual=sol.residual, warnings=warnings)


def _fmt(values, mask) -> str:
    arr = np.asarray(values)
    return f"{float(arr):.2f}" if arr.ndim == 0 else f"up to {float(np.max(arr[mask])):.3g}"
