"""The smallest stable stone: HEC-15's trial procedure (size, depth, size) carried to a fixed point.

HEC-15, 3rd ed., Chapter 6: on the bed D50 >= SF d S / (F* (SG - 1))
(Eq. 6.8) with F* and SF from Table 6.1 at the particle Reynolds number
(Eq. 6.9); on the side slopes the bed shear times K1/K2 (Section 6.3.2), or
the steep-slope method of Appendix D on slopes steeper than
``hec15.STEEP_SLOPE``; in a bend Kb times the bed shear (Section 3.4). The
depth follows the size through the stone's own n, so the size is iterated
with the depth until both settle. Used by
:func:`hydraulics.stability.check_lining`. Where each value was read:
:mod:`hydraulics.provenance`.
"""

from __future__ import annotations

import math
import warnings

from .roots import brentq

from .constants import G, GAMMA_WATER
from .errors import NoSolutionError
from .linings import hec15
from .linings.hec15 import ValidityWarning


def _stone_sizes_at(y, top, s, sides, rc, gs, phi, sf_min):
    """{"bed", "side", "bend"} smallest stable D50 [m] at depth ``y`` (inf: none), and the method used."""
    tau_d = GAMMA_WATER * y * s
    out = {"bed": _size(tau_d, y, s, gs, sf_min), "side": None, "bend": None}
    method = "eq_6_8"
    steep = s > hec15.STEEP_SLOPE
    side_sizes = []
    for _, z, k1 in sides:
        theta = math.atan(1.0 / z) if z > 0 else math.pi / 2
        if theta >= math.radians(phi):
            side_sizes.append(math.inf)
        elif steep:
            method = "appendix_d"
            try:
                side_sizes.append(_steep_size(y, s, z, phi, gs, sf_min))
            except NoSolutionError:
                side_sizes.append(math.inf)
        else:
            k2 = float(hec15.tractive_force_ratio(z, phi))
            side_sizes.append(_size(k1 * tau_d / k2, y, s, gs, sf_min))
    if side_sizes:
        out["side"] = max(side_sizes)
    if rc is not None:
        out["bend"] = _size(float(hec15.bend_factor(rc, top)) * tau_d, y, s, gs, sf_min)
    return out, method


def _required_stone(section, q, s, lining, n_fixed, sides, rc, gs, phi, sf_min, d_start, max_iter=40):
    """Smallest stable D50 for the flow: HEC-15's trial procedure carried to convergence.

    The trial procedure of HEC-15 Chapter 6 (assume D50, find the depth and
    n, find the D50 required, repeat) is the fixed-point iteration
    D -> req(D). Larger stone is rougher, so the flow runs deeper, but the
    required size grows much more slowly than D50 itself and the iteration
    contracts (stops at a relative change of 1e-10). Where the roughness
    changes from Blodgett's relation to Bathurst's (da/D50 = 1.5) the depth
    can jump as D50 passes the switch and there may be no fixed point: the
    iterates then alternate about the jump, and the smallest stable size
    (D >= req(D)) is found by bisection between them. Returns
    (sizes, method, depth, converged, at_jump).
    """
    from .solvers import normal_depth

    def depth(dd):
        if n_fixed is not None:
            return float(normal_depth(section, q, s, n_fixed))
        # A trial size is only a step of the search: where the solver cannot settle on a depth (the
        # conveyance of the "auto" stone n is not monotone just above da/D50 = 1.5), nudge the trial.
        for nudge in (1.0, 1.0 + 1e-6, 1.0 + 1e-4, 1.0 - 1e-4, 1.0 + 1e-3):
            try:
                return float(normal_depth(section, q, s, lining.roughness(dd * nudge)))
            except NoSolutionError as exc:
                last = exc
        raise NoSolutionError(f"sizing the stone: no normal depth with a trial D50 of {dd * 1000:.4g} mm ({last})")

    def state(dd):
        y = depth(dd)
        sizes, method = _stone_sizes_at(y, float(section.top_width(y)), s, sides, rc, gs, phi, sf_min)
        return max(x for x in sizes.values() if x is not None), sizes, method, y

    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        dd = d_start
        lo, hi = 0.0, math.inf       # largest size seen to fail, smallest seen to hold
        hi_state = None
        last = None                  # (trial, required - trial) of the step before
        for _ in range(max_iter):
            new, sizes, method, y = state(dd)
            if math.isinf(new) or n_fixed is not None or abs(new - dd) <= 1e-10 * new:
                return sizes, method, y, True, False
            if new > dd:
                lo = max(lo, dd)
            elif dd < hi:
                hi, hi_state = dd, (sizes, method, y)
            if lo > 0 and hi < math.inf and not lo < new < hi:
                break                # the iterates alternate about a jump
            # The next trial: the secant step on required(D) - D = 0 through this trial and the one before (it
            # reaches the fixed point in a few steps where plain substitution needs a dozen), kept only where it
            # stays between the sizes seen to fail and to hold; else the trial procedure's own next size.
            gap, following = new - dd, new
            if last is not None and gap != last[1]:
                secant = dd - gap * (dd - last[0]) / (gap - last[1])
                if max(lo, 0.0) < secant < hi and math.isfinite(secant):
                    following = secant
            last = (dd, gap)
            dd = following
        else:
            return sizes, method, y, False, False
        for _ in range(200):         # bisection for the smallest size that holds
            if hi - lo <= 1e-10 * hi:
                break
            mid = math.sqrt(lo * hi)
            new, sizes, method, y = state(mid)
            if new > mid:
                lo = mid
            else:
                hi, hi_state = mid, (sizes, method, y)
        sizes, method, y = hi_state
        sizes = dict(sizes)
        key = max((k for k in sizes if sizes[k] is not None), key=lambda k: sizes[k])
        sizes[key] = hi              # the governing size is the smallest stone that holds, not its own need
        return sizes, method, y, True, True


def _size(tau, depth, slope, gamma_stone, sf_min):
    """Smallest D50 [m] resisting ``tau`` with the larger of Table 6.1's SF and ``sf_min``."""
    size = hec15.required_d50_for_shear(tau, depth, slope, gamma_stone)
    if size.safety_factor >= sf_min:
        return float(size.d50)
    # D F*(D) / max(SF(D), sf_min) rises with D (F*/SF rises with Re*), so one root lies above Table 6.1's size
    c = math.sqrt(G * depth * slope) / hec15.NU_HEC15

    def excess(dd):
        f, sf = hec15._shields_sf(c * dd)
        return f * (gamma_stone - GAMMA_WATER) * dd - max(sf, sf_min) * tau
    lo = hi = float(size.d50)
    while excess(hi) < 0:
        hi *= 2.0
    return brentq(excess, lo, hi, xtol=1e-14, rtol=1e-12)


def _steep_size(depth, slope, z, phi, gamma_stone, sf_min):
    size = hec15.required_d50_steep(depth, slope, z, phi, gamma_stone)
    if size.safety_factor >= sf_min:
        return float(size.d50)
    theta, alpha, ph = math.atan(1.0 / z), math.atan(slope), math.radians(phi)
    tau_side = hec15.side_slope_factor(z) * GAMMA_WATER * depth * slope
    c = math.sqrt(G * depth * slope) / hec15.NU_HEC15

    def excess(dd):
        f, sf = hec15._shields_sf(c * dd)
        return hec15._steep_sf(dd, tau_side, theta, alpha, ph, f, gamma_stone, GAMMA_WATER) - max(sf, sf_min)
    lo, hi = float(size.d50), float(size.d50)
    for _ in range(80):
        if excess(hi) > 0:
            break
        hi *= 2.0
    else:
        raise NoSolutionError("no stone size reaches the required safety factor on this side slope")
    return brentq(excess, lo, hi, xtol=1e-14, rtol=1e-12)
