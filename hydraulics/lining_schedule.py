"""The cheapest buildable lining schedule along a ditch run.

A run of ditch has design points at stations x_0 < x_1 < ... < x_{N-1} [m]. At
each point every candidate lining has been checked for shear (HEC-15, the
permissible-shear method: Kilgore and Cotton, *Design of Roadside Channels with
Flexible Linings*, Hydraulic Engineering Circular No. 15, 3rd ed.,
FHWA-NHI-05-114, 2005, Eq. 3.2, tau_p >= SF tau_d; see
:mod:`hydraulics.stability`) and priced per metre of ditch. This module chooses
which candidate to build on each part of the run. The rules below are this
program's own (the minimum stretch length is common practice: a lining is not
changed every few metres); the method is exact under them.

Rules of a buildable schedule
-----------------------------
1. Each segment [x_i, x_{i+1}] gets one candidate. A *stretch* is a maximal run
   of segments with the same candidate, so neighbouring stretches differ.
2. Every stretch is at least ``min_length`` long, except when the whole run is
   shorter than ``min_length``: then one stretch covers the run. (Common
   practice. Lengths are compared to within 1e-9 of the largest station or
   of ``min_length``, so that rounding in the stations does not decide.)
3. Every design point of a stretch, both ends included, is *allowed* under the
   stretch's candidate, so a point where two stretches meet is allowed under
   both. A point is allowed under candidate k when its stability margin
   (permissible shear / (required safety factor x design shear)) is >= 1. At a
   *failing* point, where no candidate reaches 1, the allowed candidates are
   those with the largest margin there (ties within 1e-9 relative): the
   schedule carries the strongest candidate through it and reports the point
   in :attr:`Schedule.failing`. A NaN margin means the candidate cannot be
   used at that point at all.
4. The total cost is the least possible. The cost of candidate k on a segment
   is the trapezoidal rule on its price per metre at the two ends,
   (c[i,k] + c[i+1,k]) / 2 * (x_{i+1} - x_i). Among schedules of the same cost
   (to within 1e-9 of the sum over the segments of the dearest allowed
   candidate's cost, so that rounding does not decide) the one with fewer stretches is taken, then the one whose
   candidates, read segment by segment from the start of the run, take the
   lower index at the first segment where they differ.

Method
------
Dynamic programming over the design points, stretch boundaries at design
points, run from the end of the run towards its start so that the schedule can
be read off from the start with the tie rules. With P[j,k] the prefix sum of the
segment costs of candidate k, the cheapest rest of the run when a stretch of
candidate k starts at point i is

    F[i,k] = min over ends j (x_j - x_i >= min_length, points i..j allowed
             under k) of P[j,k] - P[i,k] + min over k' != k of F[j,k'],

with nothing left to pay at the last point. The ends j allowed for a start i
form one interval [a(i), b(i,k)] (a: the first point at least ``min_length``
away, b: the end of the run of points allowed under k), and the starts sharing
that run share its right end, so the inner minimum over j is carried as a
running minimum G[j,k] (the stretch is long enough at j: either change
candidate there or go on to j+1) instead of being searched again for each i.
Time O(N K^2) (the K^2 is the minimum over k' != k at each point), memory
O(N K); about 10 ms for N = 1000 points and K = 5 candidates. Where one candidate is allowed at every point and
is cheaper than every other on every segment (by more than twice the rounding allowance of rule 4), it alone is
the schedule, and the table is not filled.

Example: grass is not stable at 60 m and 90 m, so concrete is built from 30 m
to the end, and the grass stretch before it is long enough (20 m minimum).

>>> inf = float("inf")
>>> s = cheapest_schedule([0, 30, 60, 90, 120], [[1.5, inf], [1.2, inf], [0.7, inf], [0.9, inf], [1.4, inf]],
...                       [[10.0, 45.0]] * 5, min_length=20.0)
>>> [(t.start, t.end, t.choice, t.cost) for t in s.stretches]
[(0.0, 30.0, 0, 300.0), (30.0, 120.0, 1, 4050.0)]
>>> s.total_cost, s.choice_at.tolist(), bool(s.failing.any())
(4350.0, [0, 1, 1, 1], False)
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .errors import InputError, NoSolutionError
from .wording import worded

__all__ = ["MARGIN_TIE", "Schedule", "Stretch", "allowed_candidates", "cheapest_schedule"]

#: Margins within this fraction of the largest margin at a failing point count as equally strong (rule 3).
MARGIN_TIE = 1e-9
#: Costs within this fraction of the dearest possible cost of the run, and lengths within this fraction of the largest
#: station or min_length, count as equal (rules 2 and 4), so that rounding does not decide.
_ROUNDING = 1e-9
_INF = math.inf


@dataclass(frozen=True)
class Stretch:
    """One stretch of the schedule: a run of segments with the same candidate (SI)."""

    first: int        # index of its first design point
    last: int         # index of its last design point (inclusive), last > first
    choice: int       # candidate index 0..K-1
    start: float      # x_first [m]
    end: float        # x_last [m]
    length: float     # end - start [m]
    cost: float       # trapezoidal rule over its segments [currency]


@dataclass(frozen=True, eq=False)
class Schedule:
    """The cheapest buildable schedule (see the module's rules); arrays are read-only."""

    stretches: tuple          # Stretch, in station order, covering x_0..x_{N-1} without gaps
    total_cost: float         # sum of the stretches' costs [currency]
    choice_at: np.ndarray     # (N-1,) candidate index of each segment [x_i, x_{i+1}]
    failing: np.ndarray       # (N,) bool: no candidate is stable there; the strongest was used (rule 3)


def allowed_candidates(margin) -> tuple[np.ndarray, np.ndarray]:
    """Which candidates are allowed at each point (rule 3), and which points are failing.

    ``margin`` (N, K) [-] is the stability margin of each candidate at each point (NaN: cannot be used).
    Returns ``(allowed, failing)``: an (N, K) and an (N,) bool array. A point where every margin is NaN has no
    allowed candidate and is not marked failing.
    """
    m = np.asarray(margin, dtype=float)
    stable = m >= 1.0                      # NaN compares False
    usable = ~np.isnan(m)
    strongest = np.where(usable, m, -_INF).max(axis=1)
    failing = ~stable.any(axis=1) & usable.any(axis=1)
    with np.errstate(invalid="ignore"):      # inf - inf where a rigid lining is present: that row is not failing
        threshold = strongest - MARGIN_TIE * np.abs(strongest)
    near = usable & (m >= threshold[:, None])
    allowed = np.where(failing[:, None], near, stable)
    return allowed, failing


def cheapest_schedule(stations, margin, cost_per_length, min_length) -> Schedule:
    """The cheapest buildable lining schedule of a ditch run, exactly, under the module's rules 1 to 4.

    Parameters
    ----------
    stations : (N,) strictly increasing finite stations of the design points, N >= 2 [m]
    margin : (N, K) stability margin of candidate k at point i, permissible shear / (required safety factor x
        design shear) (HEC-15 Eq. 3.2); >= 1 is stable, +inf a non-erodible rigid lining, NaN: the candidate
        cannot be used at that point [-]
    cost_per_length : (N, K) price of candidate k per metre of ditch at point i, finite >= 0; NaN is accepted
        where the margin is NaN [currency/m]
    min_length : shortest stretch that may be built, >= 0 (common practice) [m]

    Returns
    -------
    Schedule
        stretches, total cost (trapezoidal rule on the prices per metre), the candidate of each segment and the
        failing points.

    Raises
    ------
    InputError
        a field has the wrong shape or a value outside its range (named with the value).
    NoSolutionError
        no schedule obeys the rules; the message names the stations (in metres) where, and why.

    Notes
    -----
    Time O(N K^2), memory O(N K); the method is in the module's docstring.
    """
    x, m, c, length = _checked(stations, margin, cost_per_length, min_length)
    n, k_count = m.shape
    allowed, failing = allowed_candidates(m)
    unusable = ~allowed.any(axis=1)
    if unusable.any():
        _raise_at_points("no candidate can be used at {points} (every margin there is NaN)", x[unusable])

    total_length = float(x[-1] - x[0])
    whole_run = total_length < length
    len_tol = _ROUNDING * max(1.0, float(np.abs(x).max()), length)
    # a[i]: the first point a stretch starting at i may end at (n: none)
    if whole_run:
        first_end = np.full(n, n, dtype=np.int64)
        first_end[0] = n - 1
    else:
        first_end = np.maximum(np.searchsorted(x, x + length - len_tol, side="left"), np.arange(n) + 1)
    both = allowed[:-1] & allowed[1:]
    with np.errstate(invalid="ignore"):
        seg = np.where(both, 0.5 * (c[:-1] + c[1:]) * np.diff(x)[:, None], 0.0)     # (N-1, K) [currency]
    prefix = np.vstack([np.zeros(k_count), np.cumsum(seg, axis=0)])
    cost_tol = _ROUNDING * float(seg.max(axis=1).sum())
    run_end = _run_ends(allowed)

    alone = _sole_cheapest(both, seg, cost_tol)
    if alone is not None:                  # the schedule is that candidate alone: no table to fill
        choice_at = [alone] * (n - 1)
    else:
        table = _Table(n, k_count, allowed.tolist(), seg.tolist(), prefix.tolist(), first_end.tolist(),
                       run_end.tolist(), cost_tol)
        table.fill()
        start_options = list(zip(table.fc[0], table.fn[0]))
        if _pick(start_options, cost_tol)[0] == _INF:
            _diagnose(x, allowed, first_end, run_end, table, length, whole_run)
        choice_at = table.read_off()

    stretches = []
    i = 0
    for j in range(1, n):
        if j == n - 1 or choice_at[j] != choice_at[i]:
            k = int(choice_at[i])
            cost = math.fsum(float(v) for v in seg[i:j, k])
            stretches.append(Stretch(first=i, last=j, choice=k, start=float(x[i]), end=float(x[j]),
                                     length=float(x[j] - x[i]), cost=cost))
            i = j
    choice = np.asarray(choice_at, dtype=np.int64)
    choice.setflags(write=False)
    failing = failing.copy()
    failing.setflags(write=False)
    return Schedule(stretches=tuple(stretches), total_cost=math.fsum(s.cost for s in stretches),
                    choice_at=choice, failing=failing)


def _sole_cheapest(both, seg, tol):
    """The candidate allowed on every segment (``both``) whose cost there (``seg``) is below every other allowed
    candidate's on each segment by more than twice the rounding allowance ``tol``, else None. It alone is then the
    schedule: one stretch (rules 1 to 3), and any other schedule costs more by more than ``tol`` (rule 4)."""
    for k in np.flatnonzero(both.all(axis=0)):
        with np.errstate(invalid="ignore"):
            dearer = np.where(both, seg - seg[:, k:k + 1], _INF)
        dearer[:, k] = _INF
        if dearer.min(initial=_INF) > 2.0 * tol:
            return int(k)
    return None


# -- the table of the dynamic programme ---------------------------------------------------------------------------

def _pick(options, tol):
    """The best of (cost, stretch count) options: least cost, then (among costs within tol of it) fewest stretches.

    Returns (cost, count, indices of the options that are equally best).
    """
    least = min(o[0] for o in options)
    if least == _INF:
        return _INF, _INF, []
    limit = least + tol
    fewest = min(o[1] for o in options if o[0] <= limit)
    best = [q for q, o in enumerate(options) if o[0] <= limit and o[1] == fewest]
    return min(options[q][0] for q in best), fewest, best


_STOP, _GO, _EITHER = 0, 1, 2


def _stop_or_go(sc, sn, wc, wn, tol):
    """_pick on two options, stop (sc, sn) and go on (wc, wn): which of them are equally best."""
    limit = (sc if sc <= wc else wc) + tol
    if sc > limit:
        return _GO
    if wc > limit or sn < wn:
        return _STOP
    if wn < sn:
        return _GO
    return _EITHER


class _Table:
    """F, G and H of the recursion (module docstring), as Python lists: K is small and the recursion sequential.

    fc/fn[i][k]: cost and stretch count of the cheapest rest of the run when a stretch of k starts at point i.
    gc/gn[i][k]: the same when a stretch of k is already long enough at i (change candidate at i, or go on).
    hc/hn[i][k]: the same when the stretch of k ends at i (the next stretch takes another candidate; nothing at
    the last point).
    """

    def __init__(self, n, k_count, allowed, seg, prefix, first_end, run_end, tol):
        self.n, self.k_count, self.allowed, self.seg, self.prefix = n, k_count, allowed, seg, prefix
        self.first_end, self.run_end, self.tol = first_end, run_end, tol
        blank = [[_INF] * k_count for _ in range(n)]
        self.fc, self.fn, self.gc, self.gn, self.hc, self.hn = ([row[:] for row in blank] for _ in range(6))

    def fill(self):
        # The two minima below are _pick written out for speed (same rule; the read-off uses _pick itself).
        n, kk, tol = self.n, self.k_count, self.tol
        fc, fn, gc, gn, hc, hn = self.fc, self.fn, self.gc, self.gn, self.hc, self.hn
        for i in range(n - 1, -1, -1):
            a = self.first_end[i]
            ok = self.allowed[i]
            fci, fni, hci, hni, gci, gni = fc[i], fn[i], hc[i], hn[i], gc[i], gn[i]
            if a < n:
                pa, pi, ends, gca, gna = self.prefix[a], self.prefix[i], self.run_end[i], gc[a], gn[a]
                for k in range(kk):
                    if ends[k] >= a and gca[k] < _INF:
                        fci[k] = pa[k] - pi[k] + gca[k]
                        fni[k] = 1 + gna[k]
            if i == n - 1:
                for k in range(kk):
                    if ok[k]:
                        hci[k] = gci[k] = 0.0
                        hni[k] = gni[k] = 0
                continue
            order = sorted(range(kk), key=fci.__getitem__)
            for k in range(kk):              # H: change from k to another candidate at i
                if not ok[k]:
                    continue
                least = fci[order[0]] if order[0] != k else (fci[order[1]] if kk > 1 else _INF)
                if least == _INF:
                    continue
                limit, best_c, best_n = least + tol, _INF, _INF
                for q in order:
                    cq = fci[q]
                    if cq > limit:
                        break
                    if q != k and (fni[q] < best_n or (fni[q] == best_n and cq < best_c)):
                        best_c, best_n = cq, fni[q]
                hci[k], hni[k] = best_c, best_n
            ok_next, seg_i, gc_next, gn_next = self.allowed[i + 1], self.seg[i], gc[i + 1], gn[i + 1]
            for k in range(kk):              # G: change at i, or go on to i + 1
                if not ok[k]:
                    continue
                if not ok_next[k] or gc_next[k] == _INF:
                    gci[k], gni[k] = hci[k], hni[k]
                    continue
                wc, wn = seg_i[k] + gc_next[k], gn_next[k]
                way = _stop_or_go(hci[k], hni[k], wc, wn, tol)
                if way == _GO or (way == _EITHER and wc < hci[k]):
                    gci[k], gni[k] = wc, wn
                else:
                    gci[k], gni[k] = hci[k], hni[k]

    def _next_choice(self, j, previous):
        """The lowest candidate among the equally best to start a stretch at j after ``previous`` (None: none)."""
        options = list(zip(self.fc[j], self.fn[j]))
        if previous is not None:
            options[previous] = (_INF, _INF)
        return min(_pick(options, self.tol)[2])

    def read_off(self) -> list:
        """The candidate of each segment, from the start, by the tie rules (rule 4)."""
        n, tol = self.n, self.tol
        choice = [0] * (n - 1)
        i, k = 0, self._next_choice(0, None)
        while True:
            j = self.first_end[i]
            while j < n - 1:
                way = _STOP if not self.allowed[j + 1][k] else _stop_or_go(
                    self.hc[j][k], self.hn[j][k], self.seg[j][k] + self.gc[j + 1][k], self.gn[j + 1][k], tol)
                if way == _STOP or (way == _EITHER and self._next_choice(j, k) < k):
                    break
                j += 1
            choice[i:j] = [k] * (j - i)
            if j == n - 1:
                return choice
            i, k = j, self._next_choice(j, k)


def _run_ends(allowed: np.ndarray) -> np.ndarray:
    """(N, K): the last point of the run of points allowed under k that goes through i; -1 if i is not allowed
    under k."""
    n = allowed.shape[0]
    index = np.arange(n)[:, None]
    blocked = np.where(allowed, n, index)                     # the points not allowed, n elsewhere
    next_blocked = np.minimum.accumulate(blocked[::-1], axis=0)[::-1]
    return np.where(allowed, next_blocked - 1, -1)


# -- why there is no schedule -------------------------------------------------------------------------------------

def _fail(template: str, **quantities) -> None:
    """Raise NoSolutionError with ``template`` worded (SI; the edges restate it with hydraulics.wording.in_units)."""
    raise NoSolutionError(worded("no buildable lining schedule: " + template, **quantities))


def _raise_at_points(template: str, points) -> None:
    names = {f"p{q}": (float(v), "length") for q, v in enumerate(points[:5])}
    listed = ", ".join("{" + name + "}" for name in names)
    if len(points) > 5:
        listed += f" and {len(points) - 5} more points"
    _fail(template.replace("{points}", listed), **names)


def _diagnose(x, allowed, first_end, run_end, table, length, whole_run) -> None:
    """Raise NoSolutionError naming where and why no schedule obeys the rules."""
    n = len(x)
    if whole_run:
        _fail("the run from {a} to {b} is shorter than the minimum stretch ({length}), so it must be one stretch, "
              "and no candidate is allowed at all of its design points", a=(x[0], "length"), b=(x[-1], "length"),
              length=(length, "length"))
    # segments that no stretch long enough can cover: a run of points allowed under some k that is at least
    # min_length long covers its segments, and only such runs do
    covered = np.zeros(n - 1, dtype=bool)
    for k in range(allowed.shape[1]):
        i = 0
        while i < n:
            end = int(run_end[i, k])
            if end < 0:
                i += 1
                continue
            if end > i and first_end[i] <= end:
                covered[i:end] = True
            i = end + 1
    if not covered.all():
        gaps, s = [], 0
        while s < n - 1:
            if covered[s]:
                s += 1
                continue
            t = s
            while t + 1 < n - 1 and not covered[t + 1]:
                t += 1
            gaps.append((s, t + 1))
            s = t + 1
        why = ("no candidate is allowed over a stretch of at least {length}" if length > 0 else
               "no candidate is allowed at both ends of a segment")
        parts, names = [], {"length": (length, "length")}
        for q, (p, r) in enumerate(gaps[:3]):
            parts.append(f"between {{a{q}}} and {{b{q}}} " + why)
            names[f"a{q}"], names[f"b{q}"] = (x[p], "length"), (x[r], "length")
        more = f"; and {len(gaps) - 3} more places" if len(gaps) > 3 else ""
        _fail("; ".join(parts) + more, **names)
    # every segment can be covered, but the stretches cannot be joined: the furthest point a schedule from the
    # start reaches and the nearest point a schedule from the end reaches back to bound the trouble. (Whether
    # neighbouring stretches differ does not matter here: two long-enough stretches of one candidate make one.)
    reach = np.zeros(n, dtype=bool)
    reach[0] = True
    for i in range(n - 1):
        if reach[i] and first_end[i] < n:
            for k in range(allowed.shape[1]):
                if run_end[i, k] >= first_end[i]:
                    reach[first_end[i]:run_end[i, k] + 1] = True
    back = np.array([any(v < _INF for v in row) for row in table.fc])
    back[n - 1] = True
    e, s = int(np.flatnonzero(reach).max()), int(np.flatnonzero(back).min())
    lo, hi = min(e, s), max(e, s)
    _fail("between {a} and {b} the stretches cannot be joined: no change of candidate at a design point allowed "
          "under both leaves the stretches on either side at least {length} long", a=(x[lo], "length"),
          b=(x[hi], "length"), length=(length, "length"))


# -- input checks -------------------------------------------------------------------------------------------------

def _array(field: str, value) -> np.ndarray:
    if isinstance(value, (str, bytes)) or value is None:
        raise InputError(field, f"must be an array of numbers, got {value!r}")
    try:
        return np.array(value, dtype=float)
    except (TypeError, ValueError):
        raise InputError(field, f"must be an array of numbers, got {value!r}") from None


def _checked(stations, margin, cost_per_length, min_length):
    x = _array("stations", stations)
    if x.ndim != 1:
        raise InputError("stations", f"must be a one-dimensional array of stations, got shape {x.shape}")
    if x.size < 2:
        raise InputError("stations", f"must hold at least 2 design points, got {x.size}")
    bad = ~np.isfinite(x)
    if bad.any():
        q = int(np.flatnonzero(bad)[0])
        raise InputError("stations", f"must be finite numbers, got {x[q]:g} at point {q}")
    step = np.diff(x)
    if (step <= 0).any():
        q = int(np.flatnonzero(step <= 0)[0])
        raise InputError("stations", f"must increase strictly, got {x[q + 1]:g} m after {x[q]:g} m "
                                     f"(points {q} and {q + 1})")
    n = x.size
    m = _array("margin", margin)
    if m.ndim != 2 or m.shape[0] != n:
        raise InputError("margin", f"must have shape (N, K) with N = {n} stations, got shape {m.shape}")
    if m.shape[1] < 1:
        raise InputError("margin", "must hold at least one candidate (K >= 1), got 0 columns")
    bad = (m < 0) | np.isneginf(m)
    if bad.any():
        i, k = (int(v) for v in np.argwhere(bad)[0])
        raise InputError("margin", f"must be >= 0, +inf for a rigid lining or NaN where the candidate cannot be "
                                   f"used, got {m[i, k]:g} at point {i}, candidate {k}")
    c = _array("cost_per_length", cost_per_length)
    if c.shape != m.shape:
        raise InputError("cost_per_length", f"must have the shape of margin {m.shape}, got shape {c.shape}")
    with np.errstate(invalid="ignore"):
        negative = c < 0
    if negative.any():
        i, k = (int(v) for v in np.argwhere(negative)[0])
        raise InputError("cost_per_length", f"must be >= 0, got {c[i, k]:g} at point {i}, candidate {k}")
    bad = np.isinf(c) | (np.isnan(c) & ~np.isnan(m))
    if bad.any():
        i, k = (int(v) for v in np.argwhere(bad)[0])
        raise InputError("cost_per_length", f"must be a finite number >= 0 (NaN only where the margin is NaN), "
                                            f"got {c[i, k]:g} at point {i}, candidate {k}")
    if isinstance(min_length, bool) or not isinstance(min_length, (int, float, np.integer, np.floating)):
        raise InputError("min_length", f"must be one number >= 0 [m], got {min_length!r}")
    length = float(min_length)
    if not math.isfinite(length) or length < 0:
        raise InputError("min_length", f"must be a finite number >= 0 [m], got {length:g}")
    return x, m, c, length
