"""Inverse designs: the bottom width for an allowable depth, the slope range for a velocity band.

Both invert Manning's equation (Chow, V. T., *Open-Channel Hydraulics*, 1959,
Eq. 5-6) with a bracketed root finder (scipy.optimize.brentq) on a quantity
that is monotone in the unknown: at a fixed depth the conveyance grows with
bottom width, and at a fixed flow the normal-depth velocity grows with slope.
"""

from __future__ import annotations

import math

from .roots import brentq

from . import validate
from .errors import NoSolutionError
from .sections import Rectangle, Trapezoid, _slopes
from .solvers import _n_value, normal_depth, resolve_roughness
from .wording import worded


def _log_capacity(section, depth, slope, rough):
    g = section._geometry(depth)
    n = _n_value(rough, section, depth, slope)
    return math.log(g.area / n) + 2 / 3 * math.log(g.area / g.wetted_perimeter) + 0.5 * math.log(slope)


def bottom_width_for_depth(flow, slope, n, max_depth, side_slope=None, *, left_slope=None, right_slope=None):
    """Smallest bottom width [m] whose normal depth is at most ``max_depth``.

    With side slopes of 0 the section is a rectangle, otherwise a trapezoid.
    Returns 0.0 when a V-ditch of these side slopes already runs no deeper than
    ``max_depth``. The width is found to a relative 1e-12 and checked by
    solving the normal depth at that width.

    Parameters
    ----------
    flow : float
        Design discharge Q [m^3/s].
    slope : float
        Bed slope S [m/m].
    n : float or roughness model
        Manning's n [s/m^(1/3)].
    max_depth : float
        Allowable flow depth [m].
    side_slope, left_slope, right_slope : float
        Side slopes H:V (omit all for a rectangle).
    """
    q = validate.positive("flow", flow)
    s = validate.slope(slope)
    y = validate.positive("max_depth", max_depth)
    z1, z2 = _slopes(side_slope, left_slope, right_slope, required=False)
    rough = resolve_roughness(None, n)
    target = math.log(q)

    def make(b):
        if z1 == 0 and z2 == 0:
            return Rectangle(bottom_width=b)
        return Trapezoid(bottom_width=b, left_slope=z1, right_slope=z2)

    def excess(b):
        return _log_capacity(make(b), y, s, rough) - target

    if z1 + z2 > 0 and excess(0.0) >= 0:
        return 0.0
    lo = 0.0 if z1 + z2 > 0 else 1e-12 * y
    hi = max(y, 1e-3)
    for _ in range(200):
        if excess(hi) > 0:
            break
        lo, hi = hi, 2 * hi
    else:  # pragma: no cover - needs a flow beyond any float width
        raise NoSolutionError(worded("no bottom width up to {b} keeps the normal depth within the depth limit",
                                     b=(hi, "length", "g")))
    b = brentq(excess, lo, hi, xtol=1e-14 * hi, rtol=1e-14, maxiter=200)
    # brentq may stop a hair on the wrong side; step to the side that meets the limit.
    while excess(b) < 0:
        b = b * (1 + 1e-13) + 1e-15
    check = normal_depth(make(b), q, s, n)
    if check > y * (1 + 1e-9):   # a depth-dependent n (stone far larger than the depth): the flow has two depths
        raise NoSolutionError(worded("no bottom width keeps the normal depth within {y_max} with this "
                                     "roughness: at the width {b}, where that depth carries the flow, the same flow "
                                     "also runs uniformly at {y} (the lining's n changes with the depth and the "
                                     "section)", b=(b, "length", "g"), y=(check, "length", "g"),
                                     y_max=(y, "length", "g")))
    return b


def slope_range_for_velocity(section, flow, n, min_velocity, max_velocity):
    """Bed slopes [m/m] that keep the normal-depth velocity within [min, max].

    Returns ``(s_min, s_max)``. ``s_min`` is 0.0 when even a slope of 1e-8
    gives more than ``min_velocity`` (no lower limit); ``s_max`` is None when
    even the steepest slope the core accepts (1.0) stays below
    ``max_velocity`` (no upper limit). Raises ``NoSolutionError`` when no
    accepted slope reaches ``min_velocity``, or when even a slope of 1e-8 is
    faster than ``max_velocity``.

    Parameters
    ----------
    section : Section
    flow : float
        Q [m^3/s].
    n : float or roughness model
        Manning's n [s/m^(1/3)].
    min_velocity : float
        Self-cleaning (or anti-siltation) minimum [m/s], > 0.
    max_velocity : float
        Largest velocity the lining tolerates [m/s], > min_velocity.
    """
    q = validate.positive("flow", flow)
    vmin = validate.positive("min_velocity", min_velocity)
    vmax = validate.number("max_velocity", max_velocity, low=vmin)
    s_lo, s_hi = 1e-8, validate.MAX_SLOPE

    def log_excess(log_s, v):
        s = math.exp(log_s)
        y = normal_depth(section, q, s, n)
        return math.log(q / section._geometry(y).area / v)

    def slope_for(v):
        """Slope with velocity v; "below" if even s_lo is faster, "above" if s_hi is slower."""
        if log_excess(math.log(s_hi), v) < 0:
            return "above"
        if log_excess(math.log(s_lo), v) > 0:
            return "below"
        return math.exp(brentq(log_excess, math.log(s_lo), math.log(s_hi), args=(v,), xtol=1e-13, rtol=1e-14))

    s_min, s_max = slope_for(vmin), slope_for(vmax)
    if s_min == "above":
        raise NoSolutionError(worded("no slope up to {s} gives a velocity of {v} for this flow and section",
                                     s=f"{s_hi:g}", v=(vmin, "velocity", "g")))
    if s_max == "below":
        raise NoSolutionError(worded("even a slope of {s} gives more than {v} for this flow and section",
                                     s=f"{s_lo:g}", v=(vmax, "velocity", "g")))
    return (0.0 if s_min == "below" else s_min), (None if s_max == "above" else s_max)
