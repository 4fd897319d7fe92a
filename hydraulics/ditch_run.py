"""A ditch run solved station by station: flow, uniform-flow hydraulics, lining checks, a lining schedule, quantities.

The run is a ditch from a high point down to an outfall (:mod:`hydraulics.run_layout` for its stations and
grades). Its design flow grows as the sub-areas drain in (:mod:`hydraulics.run_inflow`, rational method as
FHWA HEC-22, 3rd ed., 2009, Section 3.2 applies it); the flow at a point depends on the travel time down the
ditch and the travel time on the ditch's velocity at those flows, so the two are iterated to a fixed point.
At every design point each candidate lining is checked by HEC-15's permissible-shear method
(:func:`hydraulics.stability.check_lining`: normal depth with the lining's own roughness, bed, side and bend
shear, freeboard, lined width, layer volume, cost per length); the cheapest buildable schedule follows
(:mod:`hydraulics.lining_schedule`), then the quantities of each stretch (:mod:`hydraulics.run_quantities`).

Rules of the program, stated with every result:

* travel velocity: at each point the fastest of the candidates' uniform-flow velocities, so that the travel
  time is not overestimated and the flow not underestimated; on a zero or adverse grade (no normal depth)
  the velocity at critical depth, the fastest a subcritical flow can run; at a point with no flow yet, the
  velocity of the next point downstream that has flow;
* the water depth is the normal depth of the scheduled lining (the water-surface profile of backwater and
  drawdown is not computed here);
* a point on a zero or adverse grade has no normal depth: it is reported, its linings are not checked, and
  the schedule may use any candidate there.

Everything is SI.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, field

import numpy as np

from . import validate
from .errors import ConvergenceError, HydraulicsError, InputError, NoSolutionError
from .lining_schedule import Schedule, cheapest_schedule
from .rational import RATIONAL_MAX_AREA
from .provenance import cite
from .run_inflow import FlowState, peak_flows, split_sub_areas, travel_times
from .run_layout import RunLayout, StationRange
from .run_quantities import stretch_quantities
from .sections import Section
from .solvers import critical_depth, normal_depth
from .stability import StabilityResult, check_lining
from .wording import worded

__all__ = ["SectionRange", "Bend", "Candidate", "DitchRun", "PointResult", "RunResult", "solve_run",
           "TRAVEL_TOLERANCE", "MAX_TRAVEL_ITERATIONS", "RUN_RULES"]

#: The travel-time iteration stops when no design point's travel time changes by more than this [s].
TRAVEL_TOLERANCE = 1e-3
MAX_TRAVEL_ITERATIONS = 100

RUN_RULES = (
    f"design flow at each point by the rational method, Q = C i A (HEC-22 Eq. 3-1) with i at the longest time to "
    f"the point ({cite('collecting_tc')}); where a part of the area that arrives sooner gives more, that flow "
    f"({cite('partial_area')}); units converted exactly (1 ac x 1 in/h = 1.008 ft^3/s, so US flows are 0.8 % above "
    "the customary Q = C i A; in SI Q = C i A / 360 with i in mm/h and A in ha)",
    "travel time down the ditch: at each point the fastest candidate lining's uniform-flow velocity (so the flow "
    "is not underestimated); on a zero or adverse grade the velocity at critical depth (the program's rule)",
    "water depth = normal depth with the scheduled lining; backwater from the outfall and drawdown are not computed",
    "a design point where two ranges meet takes the values of the range that begins there in the direction of "
    "flow (the program's convention)",
    "point inflows are added at their full flow with no timing (conservative)",
)


@dataclass(frozen=True)
class SectionRange:
    """The cross-section over a station range, with the depth of the ditch as built [m] (None: a closed section's
    own full depth)."""

    range: StationRange
    section: Section
    ditch_depth: float | None = None


@dataclass(frozen=True)
class Bend:
    """A bend over a station range, with its centre-line radius [m]."""

    range: StationRange
    radius: float


@dataclass(frozen=True)
class Candidate:
    """A lining the run may use: a catalogue entry (``hydraulics.linings.Lining``), a stone size [m] where it
    takes one (None: the entry's own), and a unit cost for this run (None: the catalogue's) per m^2 of lined
    surface or per m^3 of layer, as the entry's ``unit_cost_basis`` says."""

    lining: object
    d50: float | None = None
    unit_cost: float | None = None

    @property
    def label(self) -> str:
        return self.lining.name

    @property
    def price(self) -> float | None:
        """The unit cost that applies: this run's, else the catalogue's."""
        return self.lining.unit_cost if self.unit_cost is None else float(self.unit_cost)

    def cost_per_length(self, lined_width: float, layer_volume: float | None, mat_allowance: float) -> float:
        """[$ per m of ditch]: the price per m^2 times the lined width (with the allowance for laps and anchor
        trenches on grass and rolled products) or per m^3 times the layer volume per length; NaN when the price
        is per volume and the lining has no layer."""
        if self.lining.unit_cost_basis == "area":
            grows = self.lining.category in ("vegetation", "manufactured")
            return self.price * lined_width * ((1.0 + mat_allowance) if grows else 1.0)
        return math.nan if layer_volume is None else self.price * layer_volume


@dataclass(frozen=True)
class DitchRun:
    """Everything a run needs (SI). ``profile``: (station, elevation) points [m]; ``outfall_station`` one end of
    the run [m]; ``spacing`` the largest distance between design points [m]; ``min_stretch`` the shortest stretch
    of one lining [m]; ``idf`` an intensity-duration-frequency relation (``hydraulics.rainfall``);
    ``return_period`` [yr]; ``min_duration`` the shortest duration intensities are read at [s];
    ``min_freeboard`` [m]; ``mat_allowance`` the extra fraction of seeded or mat surface for laps and anchor
    trenches [-]; ``stone_porosity`` the voids of a riprap layer [-] (for its mass)."""

    name: str
    profile: tuple
    outfall_station: float
    sections: tuple
    candidates: tuple
    sub_areas: tuple
    idf: object
    return_period: float
    point_inflows: tuple = ()
    bends: tuple = ()
    spacing: float = 15.0
    min_stretch: float = 15.0
    min_duration: float = 300.0
    min_freeboard: float = 0.15
    mat_allowance: float = 0.0
    stone_porosity: float = 0.4


@dataclass
class PointResult:
    """One design point: its candidates' checks (None where not checked) and the scheduled one."""

    index: int
    station: float
    x: float
    invert: float
    grade: float
    flow: float
    section_index: int
    section: Section
    ditch_depth: float
    bend_radius: float | None
    checks: list                      # StabilityResult | None per candidate
    errors: list                      # message per candidate where it could not be checked, else None
    choice: int = -1                  # scheduled candidate
    failing: bool = False             # no candidate is stable here
    not_checked: str | None = None    # why no lining was checked here (zero or adverse grade, no flow)

    @property
    def result(self) -> StabilityResult | None:
        return None if self.choice < 0 else self.checks[self.choice]

    @property
    def critical_depth(self) -> float | None:
        if self.flow <= 0:
            return None
        return float(critical_depth(self.section, self.flow))

    @property
    def fits(self) -> bool | None:
        r = self.result
        return None if r is None else bool(r.total_depth <= self.ditch_depth * (1 + 1e-9))


@dataclass
class RunResult:
    run: DitchRun
    layout: RunLayout
    flows: FlowState
    travel_time: np.ndarray            # tau at each point [s]
    iterations: int
    points: list                       # PointResult
    schedule: Schedule
    quantities: list                   # StretchQuantities per stretch
    warnings: list = field(default_factory=list)
    notes: list = field(default_factory=list)

    @property
    def total_cost(self) -> float:
        return float(sum(q.cost for q in self.quantities))


def _margin(result: StabilityResult) -> float:
    """The check's margin (safety factor over the one required, lowest over the checks; inf when non-erodible),
    kept on the side of its verdict."""
    m = min((c.margin for c in result.checks), default=math.inf)
    if result.stable:
        return max(m, 1.0)
    return min(m, math.nextafter(1.0, 0.0))


def _validate(run: DitchRun) -> None:
    if not run.candidates:
        raise InputError("candidates", "is empty: give at least one lining the run may use")
    validate.positive("return_period", run.return_period)
    validate.positive("min_duration", run.min_duration)
    validate.non_negative("min_stretch", run.min_stretch)
    validate.non_negative("min_freeboard", run.min_freeboard)
    validate.number("mat_allowance", run.mat_allowance, low=0.0, high=1.0, low_inclusive=True)
    validate.number("stone_porosity", run.stone_porosity, low=0.0, high=0.7, low_inclusive=True)
    for k, c in enumerate(run.candidates):
        if c.price is None:
            raise InputError(f"candidates[{k}].unit_cost", f"is missing for {c.lining.name}: the cheapest lining can "
                                                           "only be chosen when every candidate has a unit cost")
        validate.non_negative(f"candidates[{k}].unit_cost", c.price)
    for k, b in enumerate(run.bends):
        validate.positive(f"bends[{k}].radius", b.radius)


def _travel_velocity(points, roughness) -> np.ndarray:
    """The velocity used to time travel down the ditch at each point (see the module's rules) [m/s]."""
    v = np.full(len(points), np.nan)
    for p in points:
        if p.flow <= 0:
            continue
        if p.grade > 0:
            best = 0.0
            for rough in roughness:
                try:
                    y = normal_depth(p.section, p.flow, p.grade, rough)
                except NoSolutionError:
                    continue
                best = max(best, p.flow / float(p.section.properties(y).area))
            if best > 0:
                v[p.index] = best
                continue
        yc = critical_depth(p.section, p.flow)
        v[p.index] = p.flow / float(p.section.properties(yc).area)
    if np.all(np.isnan(v)):
        return np.ones(len(points))  # no flow anywhere: no travel to time
    # a point without flow takes the velocity of the next point downstream with flow; the last ones, the previous
    idx = np.where(~np.isnan(v), np.arange(v.size), v.size)
    nxt = np.minimum.accumulate(idx[::-1])[::-1]
    filled = np.where(nxt < v.size, v[np.minimum(nxt, v.size - 1)], np.nan)
    last = v[~np.isnan(v)][-1]
    return np.where(np.isnan(filled), last, filled)


def solve_run(run: DitchRun) -> RunResult:
    """Solve a ditch run (see the module's text). Raises InputError for bad input (naming the item),
    NoSolutionError where no buildable schedule exists, ConvergenceError if the travel time does not settle."""
    _validate(run)
    prof = np.asarray(run.profile, dtype=float)
    if prof.ndim != 2 or prof.shape[1] != 2:
        raise InputError("profile", "must be a list of (station, elevation) points")
    def ends(name, items, rng):
        return [pair for k, it in enumerate(items) for pair in ((f"{name}[{k}].from_station", rng(it).start),
                                                                 (f"{name}[{k}].to_station", rng(it).end))]
    extra = ends("sections", run.sections, lambda r: r.range) + ends("bends", run.bends, lambda b: b.range)
    extra += ends("sub_areas", run.sub_areas, lambda a: a.entry)
    extra += [(f"point_inflows[{k}].station", p.station) for k, p in enumerate(run.point_inflows)]
    layout = RunLayout(prof[:, 0], prof[:, 1], run.outfall_station, run.spacing, extra)
    which = layout.covering("sections", [r.range for r in run.sections])
    for k, r in enumerate(run.sections):
        if r.ditch_depth is None and r.section.full_depth is None:
            raise InputError(f"sections[{k}].ditch_depth", "is missing: an open section needs the depth of the ditch "
                                                            "as built")
        if r.ditch_depth is not None:
            validate.positive(f"sections[{k}].ditch_depth", r.ditch_depth)
    bend_at = layout.within([b.range for b in run.bends]) if run.bends else np.full(layout.x.size, -1)
    pieces = split_sub_areas(layout, run.sub_areas)
    total_area = sum(a.area for a in run.sub_areas)

    points = []
    for i in range(layout.x.size):
        sr = run.sections[which[i]]
        depth = float(sr.section.full_depth) if sr.ditch_depth is None else float(sr.ditch_depth)
        points.append(PointResult(index=i, station=float(layout.stations[i]), x=float(layout.x[i]),
                                  invert=float(layout.invert[i]), grade=float(layout.grade[i]), flow=0.0,
                                  section_index=int(which[i]), section=sr.section, ditch_depth=depth,
                                  bend_radius=None if bend_at[i] < 0 else float(run.bends[bend_at[i]].radius),
                                  checks=[None] * len(run.candidates), errors=[None] * len(run.candidates)))

    # -- flow and travel time to a fixed point --------------------------------
    roughness = [c.lining.roughness(c.d50) for c in run.candidates]
    tau = np.zeros(layout.x.size)
    for iteration in range(1, MAX_TRAVEL_ITERATIONS + 1):
        state = peak_flows(layout, pieces, run.point_inflows, tau, run.idf, run.return_period, run.min_duration)
        for p, q in zip(points, state.flow):
            p.flow = float(q)
        new_tau = travel_times(layout.x, _travel_velocity(points, roughness))
        change = float(np.max(np.abs(new_tau - tau)))
        tau = new_tau
        if change <= TRAVEL_TOLERANCE:
            break
    else:
        raise ConvergenceError(f"the travel time down the ditch did not settle in {MAX_TRAVEL_ITERATIONS} rounds "
                               f"(last change {change:.3g} s): the flow and the ditch velocity keep changing each other")
    state = peak_flows(layout, pieces, run.point_inflows, tau, run.idf, run.return_period, run.min_duration)
    for p, q in zip(points, state.flow):
        p.flow = float(q)

    # -- every candidate at every point ------------------------------------
    shape = (len(points), len(run.candidates))
    margin, cost, lined, volume = (np.full(shape, np.nan) for _ in range(4))
    for p in points:
        if p.flow <= 0:
            p.not_checked = "no flow has reached this point yet"
            continue
        if p.grade <= 0:
            p.not_checked = ("zero grade" if p.grade == 0 else "adverse grade") + (
                ": no normal depth, so no lining check; the water-surface profile is needed here")
            continue
        for k, c in enumerate(run.candidates):
            try:
                r = check_lining(p.section, p.flow, p.grade, c.lining, d50=c.d50, bend_radius=p.bend_radius,
                                 min_freeboard=run.min_freeboard, size_stone=False)
            except HydraulicsError as exc:
                p.errors[k] = str(exc)
                continue
            p.checks[k] = r
            margin[p.index, k] = _margin(r)
            lined[p.index, k] = r.lined_width
            volume[p.index, k] = np.nan if r.layer_volume is None else r.layer_volume
            cost[p.index, k] = c.cost_per_length(r.lined_width, r.layer_volume, run.mat_allowance)
    # A point not checked (no flow yet, no falling grade) lets any candidate pass (margin 1 where there is no
    # flow, 0 on a flat or adverse grade, so it is flagged) and takes its widths and prices from the nearest
    # checked point downstream (upstream at the end of the run).
    checked = np.array([p.not_checked is None and any(r is not None for r in p.checks) for p in points])
    if not checked.any():
        raise NoSolutionError("no design point of the run could be checked (no flow, or no falling grade anywhere)")
    n = len(points)
    nxt = np.minimum.accumulate(np.where(checked, np.arange(n), n)[::-1])[::-1]
    prev = np.maximum.accumulate(np.where(checked, np.arange(n), -1))
    donor = np.where(nxt < n, nxt, prev)
    for i in np.where(~checked)[0]:
        for arr in (cost, lined, volume):
            arr[i] = arr[donor[i]]
        margin[i] = np.where(np.isfinite(cost[i]), 1.0 if points[i].flow <= 0 else 0.0, np.nan)
    schedule = cheapest_schedule(layout.x, margin, cost, run.min_stretch)
    for p in points:
        p.choice = int(schedule.choice_at[min(p.index, n - 2)])
        p.failing = bool(schedule.failing[p.index]) and p.not_checked is None
    for p in points:   # the smallest stable stone where stone is scheduled (the costly part of its check)
        c = run.candidates[p.choice]
        if p.not_checked is None and p.checks[p.choice] is not None and c.lining.category == "stone":
            p.checks[p.choice] = check_lining(p.section, p.flow, p.grade, c.lining, d50=c.d50,
                                              bend_radius=p.bend_radius, min_freeboard=run.min_freeboard)
    quantities = []
    for s in schedule.stretches:
        rows = slice(s.first, s.last + 1)
        quantities.append(stretch_quantities(
            layout.x[rows], lined[rows, s.choice], volume[rows, s.choice], run.candidates[s.choice],
            choice=s.choice, start=float(layout.stations[s.first]), end=float(layout.stations[s.last]),
            mat_allowance=run.mat_allowance, stone_porosity=run.stone_porosity))

    warnings, notes = _run_messages(run, layout, state, points, total_area)
    return RunResult(run=run, layout=layout, flows=state, travel_time=tau, iterations=iteration, points=points,
                     schedule=schedule, quantities=quantities, warnings=warnings, notes=notes)


def _ranges_of(mask, stations) -> list:
    """(first station, last station) of each run of True in ``mask``."""
    out, start = [], None
    for i, m in enumerate(mask):
        if m and start is None:
            start = i
        if (not m or i == len(mask) - 1) and start is not None:
            end = i if m else i - 1
            out.append((stations[start], stations[end]))
            start = None
    return out


def _run_messages(run, layout, state, points, total_area):
    warnings, notes = [], []
    at = lambda s: (s, "station")  # noqa: E731
    for j, g in enumerate(layout.grades):
        if g <= 0:
            a, b = layout.station_of([layout.profile_x[j], layout.profile_x[j + 1]])
            warnings.append(worded("{kind} grade from {a} to {b} ({g} %): no normal depth there; the lining is not "
                                   "checked on this stretch and the water backs up (the water-surface profile is not "
                                   "computed here)", kind="zero" if g == 0 else "adverse", a=at(min(a, b)),
                                   b=at(max(a, b)), g=f"{100 * g:.2f}"))
    stations = [p.station for p in points]
    for a, b in _ranges_of([p.failing for p in points], stations):
        warnings.append(worded("no candidate lining is stable from {a} to {b}: the strongest candidate is scheduled "
                               "there and still fails; add a stronger lining or change the section", a=at(a), b=at(b)))
    for a, b in _ranges_of([p.fits is False for p in points], stations):
        warnings.append(worded("water plus freeboard is above the ditch as built from {a} to {b}: deepen the ditch",
                               a=at(a), b=at(b)))
    for a, b in _ranges_of(list(state.partial), stations):
        notes.append(worded("from {a} to {b} a part of the drainage area that reaches the ditch sooner gives a larger "
                            "peak than the whole area (partial-area case); the larger flow is used", a=at(a), b=at(b)))
    for p in points:
        for k, err in enumerate(p.errors):
            if err is not None:
                warnings.append(worded("{lining} could not be checked at {s}: {err}",
                                       lining=run.candidates[k].label, s=at(p.station), err=err))
    # The checks' own cautions, once per kind and lining over each range of points where they hold (the first
    # point's numbers are quoted)
    spans = {}
    for p in points:
        r = p.result if p.not_checked is None else None
        for w in ([] if r is None else r.warnings):
            key = (r.lining_name, re.sub(r"\d+(\.\d+)?", "#", getattr(w, "template", str(w))))
            span = spans.get(key)
            if span is not None and span[-1][1] == p.index - 1:
                span[-1][1] = p.index
            else:
                spans.setdefault(key, []).append([p.index, p.index, w])
    for (lining, _), span in spans.items():
        for first, last, w in span:
            if first == last:
                warnings.append(worded("at {s} ({lining}): {w}", s=at(stations[first]), lining=lining, w=w))
            else:
                warnings.append(worded("from {a} to {b} ({lining}), at {a}: {w}", a=at(stations[first]),
                                       b=at(stations[last]), lining=lining, w=w))
    if total_area > RATIONAL_MAX_AREA:
        warnings.append(worded("the run drains {area} in all, above the {limit} usually allowed for the rational "
                               "method ({src}); use a hydrograph method", area=(total_area, "drainage_area"),
                               limit=(RATIONAL_MAX_AREA, "drainage_area"), src=cite("rational_area")))
    notes.extend(RUN_RULES)
    return warnings, notes
