"""Flows that a stone lining carries uniformly at more than one depth.

A stone lining's n follows Bathurst's relation (HEC-15 Eq. 6.2) below da/D50 = 1.5
and Blodgett's (Eq. 6.1) above; this program passes from one to the other over
da/D50 = 1.5 to 1.5 x SPLIT_BAND (1.53), see
:class:`hydraulics.linings.roughness.StoneRoughness`. Where Blodgett's n at the
top of that band is larger than Bathurst's at its foot by more than the
conveyance gained between the two depths, the conveyance A R^(2/3) / n falls
across the band, and a range of flows has three uniform-flow depths: one below
da/D50 = 1.5, one in the band and one above it. The solver returns one of them,
the one its steps reach from its start; the others are as much a solution of
Manning's equation with this n. :func:`other_side` says, for a solved depth,
where another one lies, so that the front ends can say so.

Only the fall of the conveyance across the band is looked at (below the band
Bathurst's conveyance, above it Blodgett's, are taken to rise with depth, as
they do for the sections and stones of HEC-15's range). The test compares it
with a count of the roots on a fine grid of depths.
"""

from __future__ import annotations

import numpy as np

from ..errors import HydraulicsError
from ..solvers import flow_at_depth, normal_depth
from . import hec15

#: Relative margin by which a flow must exceed (or fall short of) the solved one for another depth to count:
#: far above the solver's tolerance on the flow (1e-10), far below any difference a design would notice.
MARGIN = 1e-7


def depth_at_average(section, average):
    """The depth [m] at which the average depth A/T of ``section`` equals ``average`` [m] (arrays broadcast).

    Trapezoids, rectangles and triangles in closed form: with B = b - c (z1 + z2), the root of
    (z1 + z2)/2 y^2 + B y - c b = 0, written so that no digits cancel; other sections by bisection on A/T,
    which rises with depth, to 1e-13 of the depth; nan where the section (a pipe) never has that average depth
    below its crown.
    """
    c = np.asarray(average, dtype=float)
    if hasattr(section, "_zsum") and hasattr(section, "bottom_width"):
        b, zs = np.asarray(section.bottom_width, dtype=float), np.asarray(section._zsum, dtype=float)
        lead = b - c * zs
        root = np.sqrt(lead * lead + 2.0 * zs * c * b)
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.where(lead > 0, 2.0 * c * b / np.where(lead > 0, lead + root, 1.0),
                            (root - lead) / np.where(zs > 0, zs, 1.0))
    return _bisect_average(section, c)


def _average(section, depth):
    g = section.properties(depth)
    return g.area / g.top_width


def _bisect_average(section, c):
    shape = np.broadcast_shapes(np.shape(c), *(np.shape(v) for v in section.to_dict().values()
                                               if isinstance(v, np.ndarray)))
    c = np.broadcast_to(c, shape)
    cap = section.capacity_depth
    lo = np.zeros(shape)
    if cap is not None:
        hi = np.broadcast_to(np.asarray(cap, dtype=float) * (1 - 1e-9), shape).copy()
        with np.errstate(divide="ignore", invalid="ignore"):
            reached = _average(section, hi) >= c
    else:
        hi = np.maximum(2.0 * c, 1e-9)
        for _ in range(200):   # A/T >= y/2 in an open section, so a few doublings reach it
            short = _average(section, hi) < c
            if not short.any():
                break
            hi = np.where(short, 2.0 * hi, hi)
        reached = np.ones(shape, dtype=bool)
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        below = _average(section, mid) < c
        lo, hi = np.where(below, mid, lo), np.where(below, hi, mid)
        if np.all(hi - lo <= 1e-13 * hi):
            break
    return np.where(reached, hi, np.nan)


def _band(section, d50):
    """The depths [m] at the foot (da/D50 = 1.5) and at the top (1.5 x SPLIT_BAND) of the change of relation."""
    from .roughness import SPLIT_BAND   # here, not at the top: the roughness module imports this one

    split = hec15.BLODGETT_RANGE[0]
    return depth_at_average(section, split * d50), depth_at_average(section, split * SPLIT_BAND * d50)


def _separable(model, section, values) -> bool:
    """Whether the elements of the 1-D ``values`` can be taken apart, with the section and the model's sizes (an
    inventory's reaches), so that only some of them are worked out."""
    return np.ndim(values) == 1 and hasattr(model, "take") and (not section.is_vector or hasattr(section, "take"))


def _parts(model, section, at):
    """The model and the section of the elements ``at``."""
    return model.take(at), section.take(at) if section.is_vector else section


def _flow_at(model, section, depth, slope, where):
    """The flow Manning's equation gives at ``depth`` with the model's n (:func:`hydraulics.solvers.flow_at_depth`)
    at the elements ``where`` (a mask) of 1-D arrays, nan elsewhere; only those elements are evaluated where the
    section and the model can be taken apart (an inventory's reaches)."""
    out = np.full(depth.shape, np.nan)
    if not where.any():
        return out
    at = np.flatnonzero(where)
    if _separable(model, section, depth):
        stone, part = _parts(model, section, at)
        out[at] = flow_at_depth(part, depth[at], slope[at], stone)
    else:
        out[where] = np.broadcast_to(np.asarray(flow_at_depth(section, depth, slope, model)), depth.shape)[where]
    return out


def other_side(model, section, depth, slope, flow=None):
    """Where another uniform-flow depth of the flow that runs at ``depth`` [m] (normal depth at ``slope``) lies,
    per element: -1 below da/D50 = 1.5 (Bathurst's relation), +1 above 1.5 x SPLIT_BAND (Blodgett's), 0 none
    found (int array of the broadcast shape). ``model`` is a StoneRoughness in its "auto" method (any other
    gives zeros: one relation at every depth); ``flow``: the flow [m^3/s] that runs at ``depth``, where the caller
    has it (else Manning's equation gives it)."""
    d50 = np.asarray(model.d50, dtype=float)
    depth = np.asarray(depth, dtype=float)
    shape = np.broadcast_shapes(depth.shape, d50.shape, np.shape(slope))
    side = np.zeros(shape, dtype=np.int8)
    if getattr(model, "method", None) != "auto" or not side.size:
        return side
    foot, top = (np.broadcast_to(v, shape) for v in _band(section, d50))
    depth = np.broadcast_to(depth, shape)
    # the flow (Manning's equation at the bed slope) just below the foot of the band (Bathurst's n, or the value
    # held below its usable depths) for a depth at or above the foot, and at the top of the band (Blodgett's n)
    # for a depth at or below the top
    at_foot = np.isfinite(foot) & (depth >= foot)
    at_top = np.isfinite(top) & (depth <= top)
    if not (at_foot.any() or at_top.any()):
        return side
    slope = np.broadcast_to(np.asarray(slope, dtype=float), shape)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        here = flow_at_depth(section, depth, slope, model) if flow is None else np.broadcast_to(flow, shape)
        below = _flow_at(model, section, np.where(at_foot, foot, depth) * (1 - 1e-9), slope, at_foot)
        # just above the top, where every depth is in Blodgett's relation alone (n is continuous there)
        above = _flow_at(model, section, np.where(at_top, top, depth) * (1 + 1e-9), slope, at_top)
        more_below = at_foot & (below > here * (1 + MARGIN))
        more_above = at_top & (above < here * (1 - MARGIN))
    side[more_below] = -1
    side[more_above & ~more_below] = 1
    return side


def other_depth(model, section, depth, slope, side):
    """The other uniform-flow depth [m] of the flow that runs at ``depth`` where :func:`other_side` found one
    (``side``: -1 below the change of relation, +1 above it), nan elsewhere or where it cannot be solved: the
    normal depth of the same flow (Manning's at ``depth``) between no depth and the foot of the band, or between
    the top of the band and no limit, where the flow Manning's equation gives crosses it once."""
    side = np.asarray(side)
    out = np.full(side.shape, np.nan)
    at = np.flatnonzero(side)
    if not len(at):
        return out
    depth, slope, d50 = (np.broadcast_to(np.asarray(v, dtype=float), side.shape)
                         for v in (depth, slope, model.d50))
    if _separable(model, section, side):
        try:   # the reaches of an inventory in one solve
            out[at] = _solve_other(*_parts(model, section, at), depth[at], slope[at], d50[at], side[at] > 0)
            return out
        except HydraulicsError:
            pass   # one that cannot be solved spoils the set: each on its own below
    for i in at.tolist():
        one = np.unravel_index(i, side.shape)
        part = section.take([i]) if section.is_vector else section
        stone = model.take([i]) if np.ndim(model.d50) else model
        try:
            out[one] = float(np.ravel(_solve_other(stone, part, float(depth[one]), float(slope[one]),
                                                   float(d50[one]), bool(side[one] > 0)))[0])
        except HydraulicsError:
            pass
    return out


def _solve_other(model, section, depth, slope, d50, up):
    """:func:`other_depth` of one depth (floats) or of 1-D arrays of reaches, as the normal depth in the bracket."""
    foot, top = _band(section, d50)
    low, high = np.where(up, top, 0.0), np.where(up, np.inf, foot * (1 - 1e-9))
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        flow = flow_at_depth(section, depth, slope, model)
    if np.ndim(depth):
        return normal_depth(section, flow, slope, model, within=(low, high))
    return normal_depth(section, float(flow), slope, model, within=(float(low), float(high)))
