"""The design flow along a ditch run by the rational method, from its drainage sub-areas and point inflows.

At every design point the peak flow is found as the road-drainage manuals
apply the rational method to a channel that collects several areas
(FHWA HEC-22, *Urban Drainage Design Manual*, 3rd ed., 2009, Section 3.2,
Eq. 3-1, Q = C i A; the time of concentration of a downstream point is the
longest travel time to it, each area's own time plus its travel time in the
ditch):

* each sub-area has its own C, A and time of concentration t_c; it enters
  the ditch at a station, or spread evenly along a station range (then it is
  split at the design points into pieces, each entering over one segment);
* a piece entering at distance x_e reaches the design point at x after
  T = t_c + tau(x) - tau(x_e), where tau is the travel time down the ditch
  (integral of dx / V with the ditch's own velocity, trapezoidal rule
  between design points);
* the flow at x is the largest of i(D) * sum(C A over the pieces with
  T <= D), over every arrival time D of a piece that has joined by x, with
  i(D) read from the run's intensity-duration-frequency relation at
  max(D, t_min). The longest D gives the whole-area flow; a shorter one
  with a larger result is the partial-area case (a smaller, faster part of
  the area giving the larger peak), which is then used and reported. The
  pieces arriving later than D are left out entirely: the usual simple form
  of the check (the program's rule, conservative for the whole area and
  simple for the partial one).
* point inflows (a pipe from upstream) are typed flows and are added as
  they are, with no timing (stated with the result).

The ditch velocity depends on the flow and the flow on the travel time, so
:func:`peak_flows` is called inside a fixed-point iteration by the run
(:mod:`hydraulics.ditch_run`). Everything here is SI: areas [m^2],
durations [s], intensities [m/s], flows [m^3/s].
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from . import validate
from .errors import InputError
from .run_layout import POINT_TOLERANCE, RunLayout, StationRange
from .wording import worded

__all__ = ["SubArea", "PointInflow", "Pieces", "FlowState", "split_sub_areas", "peak_flows", "travel_times"]


@dataclass(frozen=True)
class SubArea:
    """A drainage sub-area: its name, area [m^2], runoff coefficient C [-], own time of concentration [s], and
    where it enters the ditch (``entry``: a StationRange, from == to for entry at one station)."""

    name: str
    area: float
    runoff_coefficient: float
    time_of_concentration: float
    entry: StationRange

    def check(self, field: str) -> None:
        validate.positive(f"{field}.area", self.area)
        validate.number(f"{field}.runoff_coefficient", self.runoff_coefficient, low=0.0, high=1.0,
                        low_inclusive=False)
        validate.positive(f"{field}.time_of_concentration", self.time_of_concentration)
        validate.number(f"{field}.from_station", self.entry.start)
        validate.number(f"{field}.to_station", self.entry.end)
        if self.entry.end < self.entry.start:
            raise InputError(f"{field}.to_station", worded("must not be before from_station ({a}), got {b}",
                                                           a=(self.entry.start, "length"),
                                                           b=(self.entry.end, "length")))


@dataclass(frozen=True)
class PointInflow:
    """A flow that enters the ditch at one station [m], such as a pipe from upstream [m^3/s]."""

    name: str
    station: float
    flow: float


@dataclass(frozen=True)
class Pieces:
    """The drainage pieces of a run: each sub-area at one station is one piece, a spread one is split at the
    design points. ``origin``: design point where its travel down the ditch starts; ``join``: first design point
    that carries it; ``ca``: C A [m^2]; ``tc``: its own time of concentration [s]; ``source``: index of its
    sub-area. ``plan``: what :func:`peak_flows` worked out from the order of arrival alone, kept for its next call
    with the same order (the last rounds of a run's travel-time iteration)."""

    origin: np.ndarray
    join: np.ndarray
    ca: np.ndarray
    tc: np.ndarray
    source: np.ndarray
    plan: dict = field(default_factory=dict, compare=False, repr=False)


@dataclass(frozen=True)
class FlowState:
    """The rational-method flow at each design point (arrays over the points, SI).

    ``ca`` total C A joined [m^2]; ``duration`` the governing duration D [s] (the whole area's time of
    concentration, or the shorter one of the partial-area case; at least t_min); ``intensity`` i(D) [m/s];
    ``rational_flow`` i(D) x the C A arriving within D [m^3/s]; ``governing_ca`` that C A [m^2];
    ``partial`` True where a part of the area gives the larger flow; ``point_flow`` the sum of point inflows
    joined [m^3/s]; ``flow`` their sum, the design flow [m^3/s]; ``whole_duration`` the longest arrival time
    (the time of concentration of the whole area) [s].
    """

    ca: np.ndarray
    duration: np.ndarray
    intensity: np.ndarray
    rational_flow: np.ndarray
    governing_ca: np.ndarray
    partial: np.ndarray
    point_flow: np.ndarray
    flow: np.ndarray
    whole_duration: np.ndarray


def split_sub_areas(layout: RunLayout, sub_areas) -> Pieces:
    """The drainage pieces of ``sub_areas`` (SubArea list) at the design points of ``layout``.

    A sub-area entering at one station is one piece, joining at the design
    point there. One spread over a range is split into one piece per segment
    between the design points in the range, each with C A in proportion to
    the segment's length, starting its travel at the segment's upstream end
    and joining at its downstream end.
    """
    origin, join, ca, tc, source = [], [], [], [], []
    for k, sa in enumerate(sub_areas):
        field = f"sub_areas[{k}]"
        sa.check(field)
        layout.check_on_run(f"{field}.from_station", sa.entry.start)
        layout.check_on_run(f"{field}.to_station", sa.entry.end)
        total = sa.area * sa.runoff_coefficient
        a, b = layout.x_range(sa.entry) if sa.entry.end > sa.entry.start else (float(layout.x_of(sa.entry.start)),) * 2
        if b - a <= POINT_TOLERANCE:
            i = int(np.argmin(np.abs(layout.x - a)))
            origin.append(i), join.append(i), ca.append(total), tc.append(sa.time_of_concentration), source.append(k)
            continue
        i0 = int(np.argmin(np.abs(layout.x - a)))
        i1 = int(np.argmin(np.abs(layout.x - b)))
        seg = np.diff(layout.x[i0:i1 + 1])
        for j, length in enumerate(seg):
            origin.append(i0 + j), join.append(i0 + j + 1), ca.append(total * length / (b - a))
            tc.append(sa.time_of_concentration), source.append(k)
    return Pieces(origin=np.asarray(origin, int), join=np.asarray(join, int), ca=np.asarray(ca, float),
                  tc=np.asarray(tc, float), source=np.asarray(source, int))


def travel_times(x, velocity) -> np.ndarray:
    """Travel time tau [s] from the upstream end to each design point: the integral of dx / V by the trapezoidal
    rule between design points (``x`` [m] ascending, ``velocity`` [m/s] > 0 at each point)."""
    v = np.asarray(velocity, dtype=float)
    if np.any(~(v > 0)):
        raise InputError("velocity", "must be > 0 at every design point to time the travel down the ditch")
    seg = np.diff(np.asarray(x, float)) * 0.5 * (1.0 / v[:-1] + 1.0 / v[1:])
    return np.concatenate([[0.0], np.cumsum(seg)])


#: Pieces per block of the search for the governing duration (see :func:`peak_flows`).
_BLOCK = 16
#: A block is left out only when its bound is below the known flow by more than this fraction (rounding).
_BOUND_MARGIN = 1e-12


def _arrival_plan(pieces: Pieces, order, n: int) -> dict:
    """What :func:`peak_flows` needs that depends on the order of arrival ``order`` alone (``n`` design points):
    the pieces' t_c, C A and joining point in that order, padded to whole blocks (``blocks`` of them, ``pad``
    pieces added); the C A joined at each point in each block (``in_block``, ``joined_in`` where any) and arrived
    by each block's end (``by_end``); the first and last joined piece at each point (positions in arrival order;
    -1: none). Its arrays are read-only, being kept for later calls."""
    count = order.size
    blocks = -(-count // _BLOCK)
    pad = blocks * _BLOCK - count
    tc = np.concatenate([pieces.tc[order], np.full(pad, pieces.tc[order[-1]])])
    ca = np.concatenate([pieces.ca[order], np.zeros(pad)])
    join = np.concatenate([pieces.join[order], np.full(pad, n)])
    # C A joined at each point in each block, and arrived by each block's end
    cell = np.minimum(join, n) * blocks + np.arange(blocks * _BLOCK) // _BLOCK
    in_block = np.bincount(cell, weights=ca, minlength=(n + 1) * blocks).reshape(n + 1, blocks)
    in_block = np.cumsum(in_block, axis=0)[:n]
    # first and last joined piece at each point (positions in arrival order; -1: none)
    position = np.arange(blocks * _BLOCK)
    last = np.full(n + 1, -1)
    first = np.full(n + 1, blocks * _BLOCK)
    np.maximum.at(last, np.minimum(join, n), position)
    np.minimum.at(first, np.minimum(join, n), position)
    plan = dict(tc=tc, ca=ca, join=join, in_block=in_block, joined_in=in_block > 0,   # every piece has C A > 0
                by_end=np.cumsum(in_block, axis=1), last=np.maximum.accumulate(last)[:n],
                first=np.minimum.accumulate(first)[:n])
    for a in plan.values():
        a.setflags(write=False)
    return dict(plan, blocks=blocks, pad=pad)


#: Design points per group of the coarse bound on a block's intensity (see :func:`_block_bound`).
_GROUP = 32


def _block_bound(key, tau, rows, soonest, whole, idf, return_period, min_duration, blocks) -> np.ndarray:
    """(points, blocks): an upper bound on the intensity at the first arrival of each block at each point, where
    the block has a joined piece there (elsewhere any number).

    The design points are taken in groups of ``_GROUP`` along the run; a block's first piece (arrival-order key
    ``key`` = t_c - tau(entry)) arrives at a point of the group no sooner than at the group's least travel time,
    and the intensity falls as the duration grows, so the intensity read there, at no less than the soonest
    arrival of any point nor t_min, bounds it for the whole group.
    """
    n = tau.size
    starts = np.arange(0, n, _GROUP)
    least_tau = np.minimum.reduceat(tau, starts)
    low = max(float(np.min(soonest[rows])), min_duration)
    first = key[::_BLOCK][:blocks]
    d = np.clip(first[None, :] + least_tau[:, None], low, max(float(np.max(whole[rows])), low))
    return np.repeat(idf.intensity(d, return_period), np.diff(np.r_[starts, n]), axis=0)


def peak_flows(layout: RunLayout, pieces: Pieces, inflows, tau, idf, return_period: float,
               min_duration: float) -> FlowState:
    """The design flow at every design point for travel times ``tau`` [s] (see the module's text).

    ``idf`` has ``intensity(duration [s] array, return_period [yr]) -> [m/s]``; ``min_duration`` t_min [s] is the
    shortest duration the intensity is read at. A duration the relation does not cover is refused by it.

    Notes
    -----
    A piece's arrival time at point i is t_c + tau(i) - tau(x_e): the pieces arrive in the same order at every
    point (by t_c - tau(x_e)), so they are sorted once. For each point the flow is the largest i(D) x (C A
    arrived by D) over the arrival times D of the pieces joined there. Where the relation says its intensity
    falls as the duration grows (``idf.falls_with_duration``, true of :class:`hydraulics.rainfall.IdfTable` and
    :class:`hydraulics.rainfall.IdfFormula`), the pieces are taken in blocks of ``_BLOCK`` and a block is
    searched only when i(its first arrival) x (C A arrived by its last) can reach the whole area's flow: the
    others cannot hold the largest. That test is made first on a coarse bound of i (:func:`_block_bound`, one
    reading per block and group of points), then on i itself for the blocks the bound leaves in. Every duration
    the search would read is still offered to the relation, so it refuses the same durations. What depends on the
    order of arrival alone is kept in ``pieces.plan`` for the next call with the same order.
    """
    n = layout.x.size
    tau = np.asarray(tau, dtype=float)
    point_flow = np.zeros(n)
    for k, inflow in enumerate(inflows):
        q = validate.positive(f"point_inflows[{k}].flow", inflow.flow)
        layout.check_on_run(f"point_inflows[{k}].station", inflow.station)
        i = int(np.argmin(np.abs(layout.x - float(layout.x_of(inflow.station)))))
        point_flow[i:] += q
    zeros = np.zeros(n)
    if pieces.ca.size == 0:
        return FlowState(ca=zeros, duration=zeros.copy(), intensity=zeros.copy(), rational_flow=zeros.copy(),
                         governing_ca=zeros.copy(), partial=np.zeros(n, bool), point_flow=point_flow,
                         flow=point_flow.copy(), whole_duration=zeros.copy())
    # the pieces in order of arrival (the same at every point), padded to whole blocks with pieces never joined
    order = np.argsort(pieces.tc - tau[pieces.origin], kind="stable")
    plan = pieces.plan
    if plan.get("n") != n or not np.array_equal(plan["order"], order):
        plan.clear()
        plan.update(_arrival_plan(pieces, order, n), order=order, n=n)
    tc, ca, join, blocks = plan["tc"], plan["ca"], plan["join"], plan["blocks"]
    in_block, joined_in, by_end, first, last = (plan[k] for k in ("in_block", "joined_in", "by_end", "first", "last"))
    t_entry = np.concatenate([tau[pieces.origin][order], np.full(plan["pad"], tau[pieces.origin][order[-1]])])

    def arrival(rows, at):
        """Arrival time [s] at the points ``rows`` of the pieces at sorted positions ``at``."""
        return tc[at] + tau[rows] - t_entry[at]

    has = last >= 0
    rows = np.flatnonzero(has)
    whole, soonest = np.zeros(n), np.zeros(n)
    whole[rows] = arrival(rows, last[rows])
    soonest[rows] = arrival(rows, first[rows])
    if not rows.size:
        return FlowState(ca=zeros, duration=zeros.copy(), intensity=zeros.copy(), rational_flow=zeros.copy(),
                         governing_ca=zeros.copy(), partial=np.zeros(n, bool), point_flow=point_flow,
                         flow=point_flow.copy(), whole_duration=zeros.copy())
    # the relation refuses what the search would read: the shortest and the longest duration
    idf.intensity(np.maximum(np.array([np.min(soonest[rows]), np.max(whole[rows])]), min_duration), return_period)

    search = joined_in
    if getattr(idf, "falls_with_duration", False) and blocks > 1:
        # a block can hold the peak only if i(its first arrival) x (C A arrived by its end) reaches the whole
        # area's flow; i there is at most i(the point's first arrival)
        least, most = np.zeros(n), np.zeros(n)
        least[rows] = (1.0 - _BOUND_MARGIN) * idf.intensity(np.maximum(whole[rows], min_duration), return_period) \
            * by_end[rows, -1]
        most[rows] = idf.intensity(np.maximum(soonest[rows], min_duration), return_period)
        search = joined_in & (np.minimum(_block_bound(tc - t_entry, tau, rows, soonest, whole, idf, return_period,
                                                      min_duration, blocks), most[:, None]) * by_end
                              >= least[:, None])
        p_i, b_i = np.nonzero(search)
        # no joined piece of a block arrives before its first piece, nor before the point's first one
        d0 = np.maximum(np.clip(arrival(p_i, b_i * _BLOCK), soonest[p_i], whole[p_i]), min_duration)
        search[p_i, b_i] = idf.intensity(d0, return_period) * by_end[p_i, b_i] >= least[p_i]
    pair_row, pair_block = np.nonzero(search)

    def in_pairs(values):
        """(pairs, _BLOCK): ``values`` (one per sorted position) of the pieces of each pair's block."""
        return values.reshape(blocks, _BLOCK)[pair_block]

    joined = in_pairs(join) <= pair_row[:, None]
    before = np.where(pair_block > 0, by_end[pair_row, np.maximum(pair_block - 1, 0)], 0.0)
    cum = before[:, None] + np.cumsum(np.where(joined, in_pairs(ca), 0.0), axis=1)
    d_eff = np.maximum(in_pairs(tc) + tau[pair_row][:, None] - in_pairs(t_entry), min_duration)   # arrival()
    intensity = np.zeros(joined.shape)
    intensity[joined] = idf.intensity(d_eff[joined], return_period)
    q = np.where(joined, intensity * cum, -np.inf)
    inner = np.argmax(q, axis=1)
    pair_q = q[np.arange(q.shape[0]), inner]
    # the largest over each point's blocks, the first (earliest arrival) on a tie
    starts = np.flatnonzero(np.r_[True, pair_row[1:] != pair_row[:-1]])
    top = np.maximum.reduceat(pair_q, starts)
    best_pair = np.minimum.reduceat(np.where(pair_q == np.repeat(top, np.diff(np.r_[starts, pair_q.size])),
                                             np.arange(pair_q.size), pair_q.size), starts)
    pts = pair_row[starts]
    col = inner[best_pair]
    rational, gov_ca, duration, inten = (np.zeros(n) for _ in range(4))
    rational[pts] = q[best_pair, col]
    gov_ca[pts] = cum[best_pair, col]
    duration[pts] = d_eff[best_pair, col]
    inten[pts] = intensity[best_pair, col]
    ca_total = np.where(has, by_end[:, -1], 0.0)
    return FlowState(ca=ca_total, duration=duration, intensity=inten, rational_flow=rational, governing_ca=gov_ca,
                     partial=has & (gov_ca < ca_total * (1 - 1e-9)), point_flow=point_flow,
                     flow=rational + point_flow, whole_duration=whole)
