"""Depth-dependent Manning's n of linings, as roughness models for the solvers.

Each model has ``manning_n(section, depth, slope)`` (the protocol of
:func:`hydraulics.normal_depth`): vectorised over ``depth`` (and ``slope``),
free of checks and warnings because the solver calls it at every trial depth.
``check(section, depth, slope)`` returns, once, the plain-language warnings for
a depth outside the relation's range of validity.

    import hydraulics as hy
    from hydraulics.linings import StoneRoughness
    section = hy.Trapezoid(bottom_width=0.4, side_slope=3.0)
    rough = StoneRoughness(d50=0.025)
    y = hy.normal_depth(section, flow=0.42, slope=0.008, n=rough)
    notes = rough.check(section, y, 0.008)
"""

from __future__ import annotations

import numpy as np

from .. import validate
from ..batch_reasons import object_array
from ..constants import GAMMA_WATER
from ..errors import InputError
from ..provenance import cite
from ..units import SI
from ..wording import in_units, printed_alike, restate_each, worded
from . import hec15
from .several_depths import depth_at_average, other_depth, other_side

__all__ = ["StoneRoughness", "VegetationRoughness", "FixedSlopeN", "EnergySlopeN", "STONE_METHODS", "SPLIT_BAND",
           "SWITCH_NOTE", "relation_switch_depth"]

#: Ways to compute the n of a stone lining.
STONE_METHODS = ("auto", "blodgett", "bathurst", "strickler")
#: Width of the band above da/D50 = 1.5 over which "auto" passes from Bathurst's n to
#: Blodgett's (a ratio: 1.5 to 1.53); a rule of this program, see StoneRoughness.
SPLIT_BAND = 1.02
#: What the mark at :meth:`StoneRoughness.switch_depth` means (the two relations do not meet there, so a rating
#: curve kinks), worded once for every picture of a rating curve.
SWITCH_NOTE = "n: Bathurst below, Blodgett above (da/D50 = 1.5)"
#: Largest exponent p of Bathurst's f(Fr) (HEC-15 Eq. 6.3) accepted in "auto": as p nears 1,
#: Bathurst's n with the Manning velocity has no stable value (a rule of this program).
P_LIMIT = 0.95
#: Relative width at which the bisection for the lowest usable Bathurst depth stops (a few float spacings).
BISECTION_RTOL = 1e-15


_SECTION_POINTS = np.arange(1, 65) / 65.0   # the k-section's interior points, as fractions of the log bracket


def _lowest_usable(usable, lo: float, hi: float) -> float:
    """The lowest depth in (lo, hi] at which ``usable`` holds (it fails at ``lo``, holds at ``hi`` and, as the
    bisection it replaces assumes, holds everywhere above the lowest such depth), to BISECTION_RTOL.

    A geometric k-section: each pass tries 64 depths spread evenly on a log scale over the bracket in one
    array call and keeps the interval where ``usable`` starts to hold, so about nine passes reach the width a
    one-depth-per-call bisection reaches in some 55 calls.
    """
    for _ in range(40):
        if hi <= lo * (1.0 + BISECTION_RTOL):
            break
        trial = lo * (hi / lo) ** _SECTION_POINTS
        ok = np.asarray(usable(trial)[0], dtype=bool)
        if ok.any():
            k = int(np.argmax(ok))
            new_lo, new_hi = (lo if k == 0 else float(trial[k - 1])), float(trial[k])
        else:
            new_lo, new_hi = float(trial[-1]), hi
        if (new_lo, new_hi) == (lo, hi):   # the bracket is down to neighbouring floats
            break
        lo, hi = new_lo, new_hi
    return hi


def _same_section(kept, section) -> bool:
    """True when ``section`` has the type and dimensions ``kept`` = (type, to_dict()) records, with at least one
    dimension an array (the section of a solve rebuilt to word its results: the lowest usable Bathurst depth
    found for the one holds for the other)."""
    if kept[0] is not type(section) or not section.is_vector:
        return False
    a, b = kept[1], section.to_dict()
    return a.keys() == b.keys() and all(np.array_equal(a[k], b[k]) for k in a)


def _average_depth(section, depth):
    g = section.properties(depth)
    top = g.top_width
    if np.any(np.asarray(top) <= 0):
        raise InputError("depth", "the water surface has no width at this depth (a full pipe); "
                                  "the lining relations need an open water surface")
    return g.area / top, g.area / g.wetted_perimeter, top


def _usable(section, d50, y):
    """(whether Bathurst's relation is usable at ``y``: da/D50 > 0.3, its range, and p <= P_LIMIT; da/D50)."""
    da, r, top = _average_depth(section, y)
    ratio = np.asarray(da / d50, float)
    _, p = hec15._bathurst_exponent(np.asarray(da, float), d50, np.asarray(top, float))
    return (ratio > hec15.BATHURST_RANGE[0]) & (np.asarray(p) <= P_LIMIT), ratio


#: ln of b in HEC-15 Eq. 6.6 where the exponent p = log10(0.755/b) of Eq. 6.3 equals P_LIMIT.
_LN_B_AT_LIMIT = np.log(0.755) - P_LIMIT * np.log(10.0)
#: Relative half-width of the bracket around a root in which the predicate is bisected (some 500 float spacings:
#: the rounding of a circle's area at small depths moves the turn by several dozen).
_POLISH_WIDTH = 1e-13


def _lowest_usable_each(section, d50, hi, where):
    """The lowest usable Bathurst depth of each element of ``section`` (array dimensions, D50 ``d50`` each)
    below ``hi``, for the elements ``where`` it is usable at ``hi`` (others: nan).

    Both conditions of :func:`_usable` rise with depth in these sections: da = A/T, and b of HEC-15 Eq. 6.6,
    proportional to T^-0.453 da^0.814 (d ln b / d ln y >= 0.34 in a trapezoid; checked on a circle in the
    tests). So the relation is usable from the larger of two depths on: where da/D50 = 0.3 and where
    p = P_LIMIT (b = 0.755 / 10^P_LIMIT). Each is a root found by Newton's method on ln y
    (:func:`_log_depth_root`). Rounding puts the predicate's turn within a few float spacings of that root,
    so the predicate is then bisected (to BISECTION_RTOL, as the search it replaces) in a bracket of
    _POLISH_WIDTH on either side, checked to hold the turn; an element whose bracket does not hold it is
    bisected on the predicate from 1e-9 D50 to ``hi``.
    """
    y = np.full(np.shape(hi), np.nan)
    at = np.flatnonzero(where)
    if not len(at):
        return y
    part = section.take(at) if len(at) < len(y) else section
    d, top_depth = d50[at], hi[at]
    low = 1e-9 * d
    first = _log_depth_root(part, _range_gap, d, low, top_depth, 0.45 * d)
    found = first.copy()
    short = np.flatnonzero(_exponent_gap(part.properties(first), first, d)[0] < 0)
    if len(short):  # b is still too small where da/D50 = 0.3: the depth where p = P_LIMIT lies higher
        sub = part.take(short) if len(short) < len(first) else part
        found[short] = _log_depth_root(sub, _exponent_gap, d[short], first[short], top_depth[short], first[short])
    # the predicate itself turns within a few float spacings of the root: bisected there, in a bracket checked
    lo, hi = found * (1.0 - _POLISH_WIDTH), found * (1.0 + _POLISH_WIDTH)
    bracketed = ~_usable(part, d, lo)[0] & _usable(part, d, hi)[0]
    found = _bisect_usable(part, d, lo, hi)
    doubt = np.flatnonzero(~bracketed)
    if len(doubt):  # the root did not bracket the turn: the whole search on the predicate, for those elements
        sub = part.take(doubt) if len(doubt) < len(found) else part
        found[doubt] = _bisect_usable(sub, d[doubt], low[doubt], top_depth[doubt])
    y[at] = found
    return y


def _range_gap(g, y, d50):
    """ln(da / (0.3 D50)) at the geometry ``g`` of depth ``y``, and its derivative in ln y
    (d da/dy = 1 - A T' / T^2 for da = A/T)."""
    return np.log(g.area / g.top_width) - np.log(hec15.BATHURST_RANGE[0] * d50), \
        y * (g.top_width / g.area - g.dT_dy / g.top_width)


def _exponent_gap(g, y, d50):
    """ln b - ln b at P_LIMIT, b = 1.14 (D50/T)^0.453 (da/D50)^0.814 (HEC-15 Eq. 6.6), at the geometry ``g`` of
    depth ``y``, and its derivative in ln y."""
    ln_d = np.log(d50)
    gap = np.log(1.14) + 0.453 * (ln_d - np.log(g.top_width)) + 0.814 * (np.log(g.area / g.top_width) - ln_d)
    rate = y * (0.814 * (g.top_width / g.area - g.dT_dy / g.top_width) - 0.453 * g.dT_dy / g.top_width)
    return gap - _LN_B_AT_LIMIT, rate


def _log_depth_root(section, gap, d50, low, high, start, steps: int = 60):
    """Depth where ``gap(geometry, y, d50)`` = (g, dg/d ln y) crosses zero upwards, per element, between ``low``
    (g < 0) and ``high`` (g >= 0): Newton's method on ln y, a step that leaves the bracket replaced by the
    bracket's geometric middle; stops after a step below 1e-13 |ln y| has been taken (Newton's steps shrink
    quadratically, so the depth is then as close as the rounding of ``gap`` lets it be) or after ``steps``."""
    lo, hi = np.log(low), np.log(high)
    x = np.clip(np.log(start), lo, hi)
    for _ in range(steps):
        y = np.exp(x)
        g, rate = gap(section.properties(y), y, d50)
        lo = np.where(g < 0, x, lo)
        hi = np.where(g < 0, hi, x)
        with np.errstate(divide="ignore", invalid="ignore"):
            step = g / rate
        new = x - step
        new = np.where((new >= lo) & (new <= hi), new, 0.5 * (lo + hi))   # also where the step is not finite
        done = np.abs(new - x) <= 1e-13 * np.maximum(1.0, np.abs(x))
        x = new
        if done.all():
            break
    return np.exp(x)


def _bisect_usable(section, d50, lo, hi):
    """The lowest depth in (lo, hi] where :func:`_usable` holds, per element, by geometric halving to
    BISECTION_RTOL (about 55 steps from 1e-9 D50)."""
    for _ in range(100):
        mid = np.sqrt(lo * hi)
        ok, _ = _usable(section, d50, mid)
        hi = np.where(ok, mid, hi)
        lo = np.where(ok, lo, mid)
        if np.all(hi <= lo * (1.0 + BISECTION_RTOL)):
            break
    return hi


class StoneRoughness:
    """Manning's n of a riprap, cobble or gravel lining from its D50 (HEC-15 Section 6.1).

    Parameters
    ----------
    d50 : float or ndarray
        Median stone size [m], > 0. An array gives each element of a section
        whose dimensions are arrays of that shape its own size (an inventory's
        stone reaches of every size in one solve); each element's n is the one
        a model of its size alone gives.
    method : str
        "auto" (default): Blodgett's relation, HEC-15 Eq. 6.1, where
        da/D50 >= 1.5 and Bathurst's relation, Eq. 6.2, below (the split
        HEC-15 recommends); "blodgett" or "bathurst" to force one relation
        at every depth; "strickler" for the depth-independent
        n = 0.034 D^(1/6) (D in ft; Chow, 1959).

    Notes
    -----
    da = A/T is the average depth of HEC-15. Bathurst's Froude number comes
    from Manning's equation (:func:`hec15.bathurst_n_manning`); the pair has
    a solution only where the exponent p = log10(0.755/b) of Eq. 6.3 is below
    1 (b > 0.0755), and it is very sensitive as p approaches 1.

    Rule of this program (not of HEC-15), in "auto" only: below the lowest
    depth at which Bathurst's relation is usable (da/D50 > 0.3, its range, and
    p <= P_LIMIT = 0.95), n is held at Bathurst's value at that depth (at the
    same slope), so that n is continuous; if it is usable nowhere below
    da/D50 = 1.5, n is held at Blodgett's value at da/D50 = 1.5. Such depths
    are normally only trial depths of the solver; without the rule the
    relation there gives arbitrary n and false or missing normal depths.
    :meth:`check` reports a result that falls there.

    The two relations do not meet at da/D50 = 1.5, so n would jump there and
    some flows would have no uniform-flow depth. Second rule of this program,
    in "auto" only: for 1.5 <= da/D50 < 1.5 * SPLIT_BAND (1.53) n passes
    log-linearly from Bathurst's to Blodgett's value; in effect such a flow
    runs at da/D50 of about 1.5 with the n that carries it. Where Bathurst's n
    is below Blodgett's the flow near the switch may have more than one
    uniform-flow depth.
    """

    def __init__(self, d50, method: str = "auto"):
        self.d50 = validate.positive("d50", d50)
        if np.ndim(self.d50) > 1:
            raise InputError("d50", "must be one stone size, or a 1-D array of one per element")
        if method not in STONE_METHODS:
            raise InputError("method", f"must be one of {', '.join(STONE_METHODS)}, got {method!r}")
        self.method = method
        self.n_hold = hec15._blodgett_n(hec15.BLODGETT_RANGE[0] * self.d50, self.d50)
        # (section, (its type, dimensions) or None, depth, limits) of the last section whose lowest usable
        # Bathurst depth was found
        self._limits = None

    def __repr__(self):
        size = f"{self.d50:g}" if not np.ndim(self.d50) else f"<{np.size(self.d50)} sizes>"
        return f"StoneRoughness(d50={size}, method={self.method!r})"

    def take(self, index) -> "StoneRoughness":
        """The model of the elements ``index`` of a section with 1-D array dimensions (itself where that is
        every element, or where there is nothing per element to take).

        The lowest usable Bathurst depths found for the section carry over, those of the elements taken, with
        the section's dimensions at them (they depend on D50 and the section alone).
        """
        kept = self._limits
        dims = None if kept is None or kept[1] is None else kept[1][1]
        if np.ndim(self.d50):
            size = np.size(self.d50)
        elif dims is not None and np.ndim(kept[2]) == 1:
            size = np.size(kept[2])
        else:
            return self
        chosen = np.arange(size)[index]
        if chosen.size == size and np.array_equal(chosen, np.arange(size)):
            return self
        part = StoneRoughness(self.d50[chosen] if np.ndim(self.d50) else self.d50, self.method)
        if dims is not None and all(np.shape(v) in ((), (size,)) for v in dims.values()):
            y_lim = kept[2][chosen] if np.shape(kept[2]) == (size,) else kept[2]
            limits = None if kept[3] is None else tuple(v[chosen] if np.shape(v) == (size,) else v for v in kept[3])
            at = {k: v[chosen] if np.ndim(v) else v for k, v in dims.items()}
            part._limits = (None, (kept[1][0], at), y_lim, limits)
        return part

    def _regions(self, section, depth, slope):
        """(n, relation code) arrays: 0 Blodgett, 1 Bathurst, 2 held value (auto rule)."""
        da, r, top = _average_depth(section, depth)
        ratio = np.asarray(da / self.d50, dtype=float)
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            blod = np.where(ratio > hec15._BLODGETT_POLE, hec15._blodgett_n(np.asarray(da, float), self.d50), np.nan)
        if self.method in ("auto", "blodgett"):
            # a depth in Blodgett's own range (most trial depths) needs neither Bathurst's terms nor the lowest
            # depth where Bathurst's relation is usable: those are worked out only where they are used
            need = ratio < hec15.BLODGETT_RANGE[0] * SPLIT_BAND
            if self.method == "blodgett" or not need.any():
                return blod, np.zeros(ratio.shape, int)
            if ratio.ndim and not need.all():
                n, code = blod.copy(), np.zeros(ratio.shape, int)
                if not section.is_vector and not np.ndim(self.d50):
                    at_slope = slope[need] if np.ndim(slope) else slope
                    n[need], code[need] = self._regions(section, np.asarray(depth, float)[need], at_slope)
                    return n, code
                # element by element (a section or stone size per element): the elements that need them only
                at = np.flatnonzero(need)
                pick = lambda v: v[at] if np.shape(v) == ratio.shape else v  # noqa: E731
                y_lim, lim = self._lowest_bathurst_depth(section) if self.method == "auto" else (None, None)
                n[at], code[at] = self._bathurst_regions(
                    *(pick(np.asarray(v, float)) for v in (da, r, top, depth)), pick(np.asarray(slope, float)),
                    pick(self.d50), pick(self.n_hold), pick(y_lim), None if lim is None else tuple(map(pick, lim)),
                    blod[at], ratio[at])
                return n, code
        if self.method == "blodgett":
            return blod, np.zeros(ratio.shape, int)
        y_lim, lim = self._lowest_bathurst_depth(section) if self.method == "auto" else (None, None)
        return self._bathurst_regions(np.asarray(da, float), np.asarray(r, float), np.asarray(top, float), depth,
                                      slope, self.d50, self.n_hold, y_lim, lim, blod, ratio)

    def _bathurst_regions(self, da, r, top, depth, slope, d50, n_hold, y_lim, lim, blod, ratio):
        """:meth:`_regions` where Bathurst's relation may be used, on values of one shape (or scalars): da, R,
        T, depth, slope, D50 and the held n, the lowest usable Bathurst depth and (da, T, R) there (auto only),
        Blodgett's n and da/D50."""
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            terms = hec15._bathurst_terms(da, d50, top)
            p = terms[1]
            bath = np.asarray(hec15._bathurst_n_manning_terms(terms, da, r, slope), dtype=float)
        if self.method == "bathurst":
            return bath, np.ones(ratio.shape, int)
        split = hec15.BLODGETT_RANGE[0]
        below = np.asarray(depth) < y_lim
        bath_ok = ~below & (np.asarray(p) < 1.0) & np.isfinite(bath) & (bath > 0)
        code = np.where(ratio >= split * SPLIT_BAND, 0,
                        np.where(ratio >= split, np.where(bath_ok, 3, 0), np.where(bath_ok, 1, 2)))
        # the ramp and the held value only where they are used (the solver's trial depths rarely need them)
        ramp = held = n_hold
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            if np.any(code == 3):
                w = np.log(np.maximum(ratio, split) / split) / np.log(SPLIT_BAND)
                ramp = np.exp((1.0 - w) * np.log(np.where(code == 3, bath, 1.0))
                              + w * np.log(np.where(code == 3, blod, 1.0)))
            if lim is not None and np.any(code == 2):
                # Bathurst's n at the lowest depth where it is usable, at this slope: n is continuous there
                held = self._held_n(code == 2, d50, n_hold, lim, slope)
        n = np.select([code == 0, code == 1, code == 3], [blod, bath, ramp], held)
        return n, code

    @staticmethod
    def _held_n(where, d50, n_hold, lim, slope):
        """Bathurst's n at the lowest depth where it is usable (``lim``: da, T and R there), at ``slope``, where it
        is finite and positive, else ``n_hold``; worked out only ``where`` it is held (elsewhere ``n_hold``)."""
        def held(pick):
            n = np.asarray(hec15._bathurst_n_manning(pick(lim[0]), pick(d50), pick(lim[1]), pick(lim[2]),
                                                     pick(slope)), dtype=float)
            return np.where(np.isfinite(n) & (n > 0), n, pick(n_hold))

        if not np.ndim(where) or where.all():
            return held(lambda v: v)
        out = np.array(np.broadcast_to(np.asarray(n_hold, dtype=float), where.shape))
        out[where] = held(lambda v: np.asarray(v)[where] if np.shape(v) == where.shape else v)
        return out

    def _lowest_bathurst_depth(self, section):
        """Lowest depth at which Bathurst's relation is usable (da/D50 > 0.3 and p <= P_LIMIT).

        Returns (depth, (da, T, R) there), or (inf, None) if it is not usable below
        da/D50 = 1.5. Found once per section (to BISECTION_RTOL) and kept: for one section by a geometric
        k-section on the predicate, for a section with array dimensions by :func:`_lowest_usable_each`.
        """
        hit = self._limits
        if hit is not None and (hit[0] is section or (hit[1] is not None and _same_section(hit[1], section))):
            return hit[2], hit[3]
        split = hec15.BLODGETT_RANGE[0]
        usable = lambda y: _usable(section, self.d50, y)  # noqa: E731

        start = 1e-3 * self.d50  # a depth every section holds (a pipe may be smaller than 1 m)
        shape = np.shape(section.properties(start).area)
        hi = np.full(shape, start)
        if not shape:  # one section: the 80 doublings below tried in one array call, the first that reaches it kept
            grown = start * 2.0 ** np.arange(81)
            if section.capacity_depth is not None:
                grown = np.minimum(grown, float(section.capacity_depth) * (1 - 1e-9))
            with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
                reached = np.asarray(usable(grown[:80])[1]) >= split
            hi = np.asarray(grown[int(np.argmax(reached)) if reached.any() else 80])
        for _ in range(80 if shape else 0):  # grow to a depth where da/D50 reaches the split
            ok, ratio = usable(hi if shape else float(hi))
            grow = np.asarray(ratio) < split
            if not grow.any():
                break
            hi = np.where(grow, hi * 2.0, hi)
            if section.capacity_depth is not None:
                hi = np.minimum(hi, np.asarray(section.capacity_depth) * (1 - 1e-9))
        ok_hi, _ = usable(hi if shape else float(hi))
        if not np.any(ok_hi):
            result = (np.inf, None)
        elif not shape:
            y = np.asarray(_lowest_usable(usable, 1e-9 * self.d50, float(hi)))
        else:
            y = np.where(ok_hi, _lowest_usable_each(section, np.broadcast_to(self.d50, shape), hi, ok_hi), np.inf)
        if np.any(ok_hi):
            yy = y if shape else float(y)
            finite = np.isfinite(y)
            if finite.all():
                da, r, top = _average_depth(section, yy)
                result = (yy, (da, top, r))
            elif not shape or not finite.any():
                result = (yy, None)
            else:  # each element on its own: nan where Bathurst's relation is usable nowhere (n_hold is held there)
                da, r, top = _average_depth(section, np.where(finite, y, start))
                result = (yy, tuple(np.where(finite, v, np.nan) for v in (da, top, r)))
        # keep the last section only, with its dimensions where they are arrays (see _same_section)
        self._limits = (section, (type(section), section.to_dict()) if section.is_vector else None, *result)
        return result

    def switch_depth(self, section) -> float | None:
        """Depth [m] at which da/D50 = 1.5, where "auto" passes from Bathurst's relation (below) to Blodgett's.

        The two relations do not meet there (HEC-15 Eq. 6.1 holds for 1.5 <= da/D50 <= 185, Eq. 6.2 for
        0.3 < da/D50 < 8.0), so a rating curve kinks at this depth and the smallest stable D50 can change
        abruptly across it: the front ends mark it and say so. None for a forced relation, or where the
        section (a pipe) never reaches that average depth
        (:func:`hydraulics.linings.several_depths.depth_at_average`).
        """
        if self.method != "auto":
            return None
        depth = float(depth_at_average(section, hec15.BLODGETT_RANGE[0] * self.d50))
        return depth if np.isfinite(depth) else None

    def manning_n(self, section, depth, slope):
        """Manning's n [s/m^(1/3)] at ``depth`` [m] and ``slope`` [m/m]; no checks (solver use)."""
        if self.method == "strickler":
            n = 0.034 * (self.d50 / 0.3048) ** (1.0 / 6.0)
            return np.full(np.shape(depth), n) if np.ndim(depth) else n
        n, _ = self._regions(section, depth, slope)
        return n if np.ndim(n) else float(n)

    def relation(self, section, depth, slope=0.01) -> str:
        """Relation used at a (scalar) ``depth``: "blodgett", "bathurst", "held", "transition" or "strickler"."""
        if self.method == "strickler":
            return "strickler"
        _, code = self._regions(section, depth, slope)
        return ("blodgett", "bathurst", "held", "transition")[int(np.max(code))]

    def check(self, section, depth, slope) -> list[str]:
        """Warnings, in words, for ``depth`` outside the range of the relation used (with an array of sizes,
        the warnings of each size in turn, see :meth:`check_each`)."""
        return [note for notes in self.check_each(section, depth, slope).values() for note in notes]

    def relations(self, section, depth, slope, flow=None):
        """(da/D50, the relation used: 0 Blodgett, 1 Bathurst, 2 held, 3 the ramp between, where another
        uniform-flow depth of the same flow lies: -1 below the change of relation, +1 above it, 0 none found,
        see :func:`hydraulics.linings.several_depths.other_side`) at the normal ``depth``, per element, each as an
        array of the shape of ``depth`` and the sizes broadcast; zeros for "strickler" (``flow``: the flow that
        runs at ``depth``, where the caller has it). What :meth:`check_each` and :meth:`check_elements` word,
        worked out once for both where they are given it."""
        shape = np.broadcast_shapes(np.shape(depth), np.shape(self.d50))
        if self.method == "strickler":
            return np.zeros(shape), np.zeros(shape, dtype=int), np.zeros(shape, dtype=np.int8)
        depth = np.broadcast_to(np.asarray(depth, float), shape)
        da, _, _ = _average_depth(section, depth)
        return (np.broadcast_to(np.asarray(da / self.d50, dtype=float), shape),
                np.broadcast_to(self._regions(section, depth, slope)[1], shape),
                np.broadcast_to(other_side(self, section, depth, slope, flow), shape))

    def check_each(self, section, depth, slope, relations=None) -> dict:
        """{D50: the warnings of :meth:`check` for the elements of that size}, smallest size first; the
        relations are evaluated once for all sizes (or given: :meth:`relations` at the same depths)."""
        if not np.ndim(self.d50):
            return {float(self.d50): self._notes(self.d50, section, depth, slope)}
        ratio, code, side = self.relations(section, depth, slope) if relations is None else relations
        return {d: self._notes(d, None, None, None, ratio[self.d50 == d], code[self.d50 == d])
                for d in np.unique(self.d50).tolist()}

    def check_elements(self, section, depth, slope, units=None, relations=None) -> np.ndarray:
        """The warnings :meth:`check` gives each element on its own, as one text an element ("; " between two;
        "" where none), in ``units`` (None: SI): what a one-channel check of that element says. ``relations``:
        :meth:`relations` at the same depths, where the caller has it.

        Elements of one size whose da/D50 prints alike (three significant figures) and falls under the same
        relation and range share a text, worded once; a da/D50 within 1e-9 of a rounding tie is worded alone.
        """
        d50 = np.broadcast_to(np.asarray(self.d50, dtype=float), np.shape(depth))
        out = np.empty(d50.shape, dtype=object)
        out.fill("")
        if not out.size:
            return out
        lo, hi = hec15.STONE_SIZE_RANGE
        flag = ((d50 < lo) | (d50 > hi)).astype(int)                # 1: the size note
        ratio, code, side = self.relations(section, depth, slope) if relations is None else relations
        if self.method != "strickler":
            (a, b), (c, e) = hec15.BLODGETT_RANGE, hec15.BATHURST_RANGE
            ranged = (((code == 0) & ((ratio < a) | (ratio > b))) | ((code == 1) & ((ratio <= c) | (ratio >= e)))
                      | (code == 2) | (code == 3))
            flag = flag + 2 * ranged * (1 + code)                     # the relation's note, by relation
        several = np.flatnonzero(side)     # another uniform-flow depth: its own note, after the others
        if len(several):
            others = other_depth(self, section, depth, slope, side).flat[several]
            several, others = several[np.isfinite(others)], others[np.isfinite(others)]    # where it is found
            notes = self._several_depths_notes(side.flat[several], others, units)
        some = np.flatnonzero(flag)
        if not len(some):
            if len(several):
                out.flat[several] = object_array(notes)
            return out
        printed, clear = printed_alike(ratio[some], whole_numbers=False)   # as "%.3g" writes da/D50
        printed = np.where(clear, printed, -1 - np.arange(len(some)))          # a tie alone
        _, size_of = np.unique(d50[some], return_inverse=True)
        # one number a group: size and notes (real part), the printed da/D50 where a note quotes it (imaginary)
        key = (size_of.ravel() * 16.0 + flag[some]) + 1j * np.where(flag[some] > 1, printed, 0)
        _, first, which = np.unique(key, return_index=True, return_inverse=True)
        mark, frames, texts = "\x00", {}, []     # a group's sentence is filled once; only da/D50 is written each time
        for i, g in zip(some[first].tolist(), np.real(key[first]).tolist()):
            if g not in frames:
                said = self._notes(float(d50.flat[i]), None, None, None, ratio.flat[i:i + 1], code.flat[i:i + 1],
                                   shown=mark)
                frames[g] = "; ".join(str(t) if units is None else in_units(t, units) for t in said)
            texts.append(frames[g].replace(mark, f"{float(ratio.flat[i]):.3g}"))
        out.flat[some] = object_array(texts)[which.ravel()]
        if len(several):
            before = out.flat[several].tolist()
            out.flat[several] = object_array([f"{a}; {b}" if a else b for a, b in zip(before, notes)])
        return out

    @staticmethod
    def _several_depths_notes(sides, others, units) -> list:
        """The note of :meth:`_notes` on another uniform-flow depth, for each element: ``sides`` (-1 below, +1
        above the change of relation) and ``others`` (that depth [m]), in ``units`` (None: SI); the rest of the
        sentence written once, only the depth each time."""
        out = np.empty(len(sides), dtype=object)
        for where in (-1, 1):
            at = np.flatnonzero(sides == where)
            if len(at):
                note = _several_depths_note(where, float(others[at[0]]))
                out[at] = restate_each(note, "other", others[at].tolist(), SI if units is None else units)
        return out.tolist()

    def _notes(self, d50, section, depth, slope, ratio=None, code=None, shown=None) -> list[str]:
        """The warnings of one stone size ``d50``: from ``ratio`` (da/D50) and ``code`` (the relations used) where
        given, else worked out at the normal ``depth`` (one depth), and then the other uniform-flow depth too,
        noted where one is found (:mod:`hydraulics.linings.several_depths`; the batch notes it reach by reach,
        :meth:`check_elements`); ``shown`` in place of the da/D50 written, where given."""
        other = None
        out = []
        lo, hi = hec15.STONE_SIZE_RANGE
        if not lo <= d50 <= hi:
            out.append(worded("D50 = {d} is outside the {lo} to {hi} range of the HEC-15 Chapter 6 procedures",
                              d=(d50, "small_length"), lo=(lo, "small_length"), hi=(hi, "small_length")))
        if self.method == "strickler":
            return out
        if ratio is None:
            da, _, _ = _average_depth(section, depth)
            ratio = np.asarray(da / d50, dtype=float)
            _, code = self._regions(section, depth, slope)
            side = other_side(self, section, depth, slope)
            other = other_depth(self, section, depth, slope, side)
        ratio, code = np.asarray(ratio, dtype=float), np.asarray(code)

        def text(where):   # the da/D50 of the elements a note is about, not of every element of this size
            return hec15._span(ratio[where]) if shown is None else shown

        a, b = hec15.BLODGETT_RANGE
        if np.any(where := (code == 0) & ((ratio < a) | (ratio > b))):
            out.append(f"da/D50 = {text(where)} is outside {a:g} to {b:g}, the range of Blodgett's relation "
                       "(HEC-15 Eq. 6.1)")
        a, b = hec15.BATHURST_RANGE
        if np.any(where := (code == 1) & ((ratio <= a) | (ratio >= b))):
            out.append(f"da/D50 = {text(where)} is outside {a:g} to {b:g}, the range of Bathurst's relation "
                       "(HEC-15 Eq. 6.2)")
        if np.any(where := code == 3):
            out.append(f"da/D50 = {text(where)}: at the change from Bathurst's to Blodgett's relation "
                       f"({cite('relation_choice')}) "
                       f"n is taken between the two (a rule of this program, for da/D50 from 1.5 to "
                       f"{1.5 * SPLIT_BAND:.3g})")
        if np.any(where := code == 2):
            out.append(f"da/D50 = {text(where)}: the flow is too shallow for Bathurst's relation (HEC-15 Eq. 6.2); "
                       "n is held at its value at the lowest usable depth, a rule of this program, not of HEC-15")
        if other is not None and np.size(other) == 1 and np.isfinite(other).all():
            out.append(_several_depths_note(int(np.ravel(side)[0]), float(np.ravel(other)[0])))
        return out

    def to_dict(self) -> dict:
        return {"model": "stone", "d50": self.d50, "method": self.method}


def _several_depths_note(side: int, other: float):
    """The caution for a flow with another uniform-flow depth (see :mod:`hydraulics.linings.several_depths`):
    ``side`` -1 below the change of relation, +1 above it; ``other`` that depth [m]."""
    words = ("da/D50 below 1.5, Bathurst's n" if side < 0
             else f"da/D50 above {1.5 * SPLIT_BAND:.3g}, Blodgett's n")
    return worded("this flow has another uniform-flow depth with this stone, {other} (" + words + "): n rises "
                  "across the change from Bathurst's relation to Blodgett's ({source}); check the reach at both "
                  "depths and design for the worse", source=cite("relation_choice"), other=(other, "length"))


class VegetationRoughness:
    """Manning's n of a grass lining, HEC-15 Chapter 4: n = Cn (gamma R S)^-0.4.

    Parameters
    ----------
    density_stiffness : float
        Density-stiffness coefficient Cs [-] (HEC-15 Table 4.3), > 0.
    stem_height : float
        Stem height h [m], > 0.
    gamma_water : float
        Unit weight of water [N/m^3].

    Notes
    -----
    n falls as the flow deepens and bends the grass; the relations are from
    memory (see :func:`hec15.grass_roughness_coefficient`).
    """

    def __init__(self, density_stiffness, stem_height, gamma_water=GAMMA_WATER):
        self.density_stiffness = validate.positive("density_stiffness", density_stiffness)
        self.stem_height = validate.positive("stem_height", stem_height)
        self.gamma_water = validate.positive("gamma_water", gamma_water)
        if np.ndim(self.density_stiffness) or np.ndim(self.stem_height):
            raise InputError("density_stiffness", "must be a single value for a roughness model")
        self.cn = hec15.grass_roughness_coefficient(self.density_stiffness, self.stem_height)

    def __repr__(self):
        return f"VegetationRoughness(density_stiffness={self.density_stiffness:g}, stem_height={self.stem_height:g})"

    def boundary_shear(self, section, depth, slope):
        """Mean boundary shear tau_o = gamma R S [Pa]; no checks (solver use: the depth is the solver's own)."""
        g = section._geometry(depth)
        return self.gamma_water * g.area / g.wetted_perimeter * slope

    def manning_n(self, section, depth, slope):
        """Manning's n [s/m^(1/3)] at ``depth`` [m] and ``slope`` [m/m]; no checks (solver use)."""
        return hec15._vegetation_n(self.cn, self.boundary_shear(section, depth, slope))

    def closed_form(self, slope=None, flow=None):
        """(k, e, f) with n = k R^e (A R^(2/3))^f [s/m^(1/3)], the same relation n = Cn (gamma R S)^-0.4 in closed
        form for a solver stepping through many depths (R [m] and A [m^2] of the depth).

        At a fixed ``slope`` S [m/m]: k = Cn (gamma S)^-0.4, e = -0.4, f = 0. At the energy slope of the ``flow``
        Q [m^3/s] itself, S = S_f = (Q n / (A R^(2/3)))^2 (Manning's equation with the energy slope), n appears on
        both sides: n^1.8 = Cn gamma^-0.4 R^-0.4 (Q / (A R^(2/3)))^-0.8, so k = (Cn gamma^-0.4 Q^-0.8)^(1/1.8),
        e = -0.4/1.8 and f = 0.8/1.8. At normal depth the energy slope is the bed slope, and the two give one n.
        """
        if (slope is None) == (flow is None):
            raise InputError("slope", "give either a slope or a flow for the closed form of grass n")
        if flow is None:
            return float(self.cn * (self.gamma_water * slope) ** -0.4), -0.4, 0.0
        return (float((self.cn * self.gamma_water ** -0.4 * flow ** -0.8) ** (1 / 1.8)), -0.4 / 1.8, 0.8 / 1.8)

    def energy_slope_n(self, section, depth, flow):
        """Manning's n [s/m^(1/3)] at ``depth`` [m] with the mean boundary shear taken at the energy slope of
        ``flow`` [m^3/s] itself (see :meth:`closed_form`); no checks (solver use)."""
        k, e, f = self.closed_form(flow=flow)
        g = section._geometry(depth)
        radius = g.area / g.wetted_perimeter
        return k * radius ** e * (g.area * radius ** (2 / 3)) ** f

    def check(self, section, depth, slope) -> list[str]:
        """Warnings for a flow the vegetated-lining relation does not describe well."""
        out = []
        if np.any(np.asarray(depth) < self.stem_height):
            out.append(worded("flow depth below the stem height ({h}): the grass is not submerged, which the "
                              f"HEC-15 roughness relation of grass does not describe ({cite('grass_n')})",
                              h=(float(self.stem_height), "length")))
        return out

    def check_elements(self, section, depth, slope, units=None) -> np.ndarray:
        """The warning of :meth:`check` for each element on its own ("" where none), in ``units`` (None: SI)."""
        depth = np.atleast_1d(np.asarray(depth, dtype=float))
        out = np.empty(depth.shape, dtype=object)
        out.fill("")
        low = depth < self.stem_height
        if low.any():
            (text,) = self.check(section, float(depth[low][0]), slope)
            out[low] = str(text) if units is None else in_units(text, units)
        return out

    def to_dict(self) -> dict:
        return {"model": "vegetation", "density_stiffness": self.density_stiffness, "stem_height": self.stem_height}


class FixedSlopeN:
    """A lining model's Manning's n as a function of the depth alone, the slope held at ``slope`` [m/m] (as a
    profile takes the n of a stone lining at the bed slope of its stretch): ``n(depth)`` [s/m^(1/3)].

    ``closed_form`` is the model's (k, e, f) with n = k R^e (A R^(2/3))^f at that slope where the model has one
    (:meth:`VegetationRoughness.closed_form`), else None; a solver may use it in place of the call, with the
    same ``section``.
    """

    __slots__ = ("model", "section", "slope", "closed_form")

    def __init__(self, model, section, slope):
        self.model, self.section, self.slope = model, section, float(slope)
        form = getattr(model, "closed_form", None)
        self.closed_form = form(slope=self.slope) if form is not None else None

    def __call__(self, depth):
        return float(self.model.manning_n(self.section, depth, self.slope))

    def __repr__(self):
        return f"FixedSlopeN({self.model!r}, slope={self.slope:g})"


class EnergySlopeN:
    """A grass lining's Manning's n as a function of the depth alone for one ``flow`` [m^3/s], the mean boundary
    shear taken at the energy slope of that flow (:meth:`VegetationRoughness.energy_slope_n`), as inside
    gradually varied flow: ``n(depth)`` [s/m^(1/3)]. ``closed_form`` as for :class:`FixedSlopeN`.

    HEC-22 (2009) Eq. 5-12 gives the mean shear as tau = gamma R S with S the "average bed slope or energy
    slope" (provenance key ``boundary_shear_slope``); in uniform flow the two are one, in backwater the energy
    slope is flatter and the grass stands rougher.
    """

    __slots__ = ("model", "section", "flow", "closed_form")

    def __init__(self, model, section, flow):
        if not isinstance(model, VegetationRoughness):
            raise InputError("model", f"n at the energy slope is made for a grass lining, got {model!r}")
        self.model, self.section, self.flow = model, section, float(validate.positive("flow", flow))
        self.closed_form = model.closed_form(flow=self.flow)

    def __call__(self, depth):
        return float(self.model.energy_slope_n(self.section, depth, self.flow))

    def __repr__(self):
        return f"EnergySlopeN({self.model!r}, flow={self.flow:g})"


def relation_switch_depth(roughness, section) -> float | None:
    """Depth [m] where a stone lining's n changes relation (:meth:`StoneRoughness.switch_depth`); None for any
    other roughness (a number, grass, soil, a surveyed section's own n)."""
    return roughness.switch_depth(section) if isinstance(roughness, StoneRoughness) else None
