"""A ditch run solved station by station: flow, uniform-flow hydraulics, lining checks, a lining schedule, quantities.

The run is a ditch from a high point down to an outfall (:mod:`hydraulics.run_layout` for its stations and
grades). Its design flow grows as the sub-areas drain in (:mod:`hydraulics.run_inflow`, rational method as
FHWA HEC-22, 3rd ed., 2009, Section 3.2 applies it); the flow at a point depends on the travel time down the
ditch and the travel time on the ditch's velocity at those flows, so the two are iterated to a fixed point.
At every design point each candidate lining is screened by HEC-15's permissible-shear method, on arrays over
the points of each section (:mod:`hydraulics.run_screening`: normal depth with the lining's own roughness, bed,
side and bend shear, freeboard, lined width, layer volume; the numbers and verdict of
:func:`hydraulics.stability.check_lining` for each point), and priced per length; the cheapest buildable schedule
follows (:mod:`hydraulics.lining_schedule`), then the quantities of each stretch
(:mod:`hydraulics.run_quantities`). The travel velocities of each round are array solves too, one per section and
candidate; between rounds that try every candidate, rounds try each point's fastest alone, each round starts from
an Anderson mix of the last ones, and the last round's flows and normal depths are the run's own (see
:func:`solve_run`; tests/test_run_fast_paths.py holds them to the plain iteration). The full check of a point
(``PointResult.checks``, with the scheduled stone sized) and the cautions of the scheduled linings
(``RunResult.warnings``) are made by ``check_lining`` when first asked for and kept, so that solving a run stays
quick enough to follow an edit.

Rules of the program, stated with every result:

* travel velocity: at each point the fastest of the candidates' uniform-flow velocities, so that the travel
  time is not overestimated and the flow not underestimated; on a zero or adverse grade (no normal depth)
  the velocity at critical depth, the fastest a subcritical flow can run; at a point with no flow yet, the
  velocity of the next point downstream that has flow;
* the lining checks, the schedule and the quantities use normal depth with each lining, the design depth of
  HEC-15's permissible-shear method; the water surface along the run (backwater from the outfall, drawdown,
  hydraulic jumps) and the fit of the ditch against it are computed from the solved run by
  :mod:`hydraulics.run_water_surface`, with the outfall control the run states (``outfall_control``);
* a point on a zero or adverse grade has no normal depth: it is reported, its linings are not checked, and
  the schedule may use any candidate there.

Everything is SI.
"""

from __future__ import annotations

import math
import re
from collections.abc import Sequence
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
from .run_screening import Screening, screen_lining, solvable
from .sections import Section
from .solvers import critical_depth, normal_depth, solve_normal_depth
from .stability import StabilityResult, check_lining
from .wording import worded, worded_sizes

__all__ = ["SectionRange", "Bend", "Candidate", "DitchRun", "PointResult", "PointChecks", "RunResult", "solve_run",
           "TRAVEL_TOLERANCE", "MAX_TRAVEL_ITERATIONS", "RUN_RULES", "NORMAL_DEPTH_FIT", "OUTFALL_CONTROLS",
           "ranges_of", "stretches"]

#: The travel-time iteration stops when no design point's travel time changes by more than this [s].
TRAVEL_TOLERANCE = 1e-3
MAX_TRAVEL_ITERATIONS = 100
#: Earlier rounds the next travel time is mixed from (Anderson mixing, :func:`_mixed_travel_time`).
TRAVEL_MIXING = 2

#: The run's warning where normal depth plus freeboard is above the ditch as built (a front end that checks the fit
#: on the water-surface profile, :mod:`hydraulics.run_water_surface`, shows that check instead).
NORMAL_DEPTH_FIT = "normal depth plus freeboard is above the ditch as built {where}: deepen the ditch"

#: What may stand at the outfall: normal depth, critical depth (a free overfall) or a known water level.
OUTFALL_CONTROLS = ("normal", "critical", "level")

RUN_RULES = (
    f"design flow at each point by the rational method, Q = C i A (HEC-22 Eq. 3-1) with i at the longest time to "
    f"the point ({cite('collecting_tc')}); where a part of the area that arrives sooner gives more, that flow "
    f"({cite('partial_area')}); units converted exactly (1 ac x 1 in/h = 1.008 ft^3/s, so US flows are 0.8 % above "
    "the customary Q = C i A; in SI Q = C i A / 360 with i in mm/h and A in ha)",
    "travel time down the ditch: at each point the fastest candidate lining's uniform-flow velocity (so the flow "
    "is not underestimated); on a zero or adverse grade the velocity at critical depth (the program's rule)",
    "lining checks, schedule and quantities on normal depth with each lining (the design depth of HEC-15's "
    "permissible-shear method)",
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
    trenches [-]; ``stone_porosity`` the voids of a riprap layer [-] (for its mass); ``outfall_control`` what
    controls the water surface at the outfall: "normal" (normal depth, the default), "critical" (a free overfall)
    or "level" (a known water-surface elevation ``outfall_level`` [m], such as a culvert's headwater or a
    receiving stream); used by :mod:`hydraulics.run_water_surface`."""

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
    outfall_control: str = "normal"
    outfall_level: float | None = None


class PointChecks(Sequence):
    """The full lining check of each candidate at one design point (a ``StabilityResult``, or None where no check
    was made: no flow yet, a zero or adverse grade, or the check could not be made there).

    Each is made by :func:`hydraulics.stability.check_lining` when first asked for, and kept: the run itself
    only screens the candidates on arrays (:mod:`hydraulics.run_screening`). The scheduled candidate, where it is
    stone, is also sized (its smallest stable D50); the others are checked as given.
    """

    def __init__(self, point: "PointResult", run: DitchRun, screening: Screening):
        self._point, self._run, self._screening = point, run, screening
        self._made = {}

    def __len__(self) -> int:
        return len(self._run.candidates)

    def __getitem__(self, k):
        if isinstance(k, slice):
            return [self[i] for i in range(len(self))[k]]
        k = range(len(self))[k]
        if k not in self._made:
            self._made[k] = self._check(k)
        return self._made[k]

    def made(self) -> list:
        """The candidates whose full check has been made so far (indices)."""
        return sorted(self._made)

    def _check(self, k: int) -> StabilityResult | None:
        p, run = self._point, self._run
        if p.not_checked is not None or not self._screening.checked[p.index, k]:
            return None
        c = run.candidates[k]
        return check_lining(p.section, p.flow, p.grade, c.lining, d50=c.d50, bend_radius=p.bend_radius,
                            min_freeboard=run.min_freeboard,
                            size_stone=k == p.choice and c.lining.category == "stone")

    def __repr__(self) -> str:
        return f"PointChecks(point {self._point.index}, made {self.made()})"


@dataclass(eq=False)
class PointResult:
    """One design point: its candidates' full checks (``checks``, made when first asked for), the errors of those
    that could not be checked (words, else None), and the scheduled one (``result``)."""

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
    checks: PointChecks | None = None  # StabilityResult | None per candidate, made on first access
    errors: list | None = None         # message per candidate where it could not be checked, else None
    choice: int = -1                  # scheduled candidate
    failing: bool = False             # no candidate is stable here
    not_checked: str | None = None    # why no lining was checked here (zero or adverse grade, no flow)
    total_depth: float | None = None  # the scheduled candidate's depth plus freeboard [m] (from the screening)

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
        t = self.total_depth
        return None if t is None else bool(t <= self.ditch_depth * (1 + 1e-9))


@dataclass(eq=False)
class RunResult:
    """A solved run. ``screening`` holds every candidate at every point as (points, candidates) arrays (depth,
    margin, lined width, total depth...; :mod:`hydraulics.run_screening`): what a live view draws from.

    ``run_warnings`` are the run's own warnings, ready with the result (grades, failing or overtopped stretches,
    checks that could not be made, drainage area). ``warnings`` adds to them, in their place, the cautions of
    the scheduled linings' full checks (ranges of validity, stone sizing...), once per kind and lining over each
    range of points: those need the full check at every checked point, made on first access to ``warnings``
    (or :meth:`check_warnings`) and kept, so that solving a run stays quick and a front end pays for them only
    when it shows them.
    """

    run: DitchRun
    layout: RunLayout
    flows: FlowState
    travel_time: np.ndarray            # tau at each point [s]
    iterations: int
    schedule: Schedule
    quantities: list                   # StretchQuantities per stretch
    screening: Screening
    section_index: np.ndarray          # the section range of each point
    bend_radius: np.ndarray            # [m] at each point, nan on a straight reach
    ditch_depth: np.ndarray            # depth of the ditch as built at each point [m]
    choice: np.ndarray                 # scheduled candidate at each point
    failing: np.ndarray                # bool: no candidate is stable at this checked point
    checked: np.ndarray                # bool: the point has flow on a falling grade (its linings are checked)
    run_warnings: list = field(default_factory=list)
    notes: list = field(default_factory=list)
    checks_at: int = 0                 # where in run_warnings the checks' cautions go
    _cautions: list | None = field(default=None, repr=False)
    _points: list | None = field(default=None, repr=False)

    @property
    def total_cost(self) -> float:
        return float(sum(q.cost for q in self.quantities))

    @property
    def points(self) -> list:
        """A PointResult per design point (made on first access; their full checks when asked for)."""
        if self._points is None:
            self._points = _points(self)
        return self._points

    def scheduled(self, name: str) -> np.ndarray:
        """The screened ``name`` (a field of :data:`hydraulics.run_screening.SCREEN_FIELDS`) of the scheduled
        candidate at each point; nan where its lining was not checked."""
        values = getattr(self.screening, name)[np.arange(self.choice.size), self.choice]
        ok = self.checked & self.screening.checked[np.arange(self.choice.size), self.choice]
        return np.where(ok, values, np.nan)

    def check_warnings(self) -> list:
        """The cautions of the scheduled linings' full checks, once per kind and lining over each range of points
        where they hold (the first point's numbers quoted). Makes each scheduled check on the first call."""
        if self._cautions is None:
            self._cautions = _check_cautions(self.points)
        return list(self._cautions)

    @property
    def warnings(self) -> list:
        """Every warning of the run: ``run_warnings`` with the checks' cautions in their place."""
        at = self.checks_at
        return [*self.run_warnings[:at], *self.check_warnings(), *self.run_warnings[at:]]


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
            raise InputError(f"candidates[{k}].unit_cost", worded("is missing for {name}: the cheapest lining can "
                                                                  "only be chosen when every candidate has a unit cost",
                                                                  name=worded_sizes(c.lining.name)))
        validate.non_negative(f"candidates[{k}].unit_cost", c.price)
    for k, b in enumerate(run.bends):
        validate.positive(f"bends[{k}].radius", b.radius)
    if run.outfall_control not in OUTFALL_CONTROLS:
        raise InputError("outfall.control", f"must be one of {', '.join(OUTFALL_CONTROLS)}, got "
                                            f"{run.outfall_control!r}")
    if run.outfall_control == "level":
        if run.outfall_level is None:
            raise InputError("outfall.water_level", "is missing: the outfall control is a known water level, so give "
                                                    "that level (an elevation [m])")
        validate.number("outfall.water_level", run.outfall_level)


def _travel_velocity(points, roughness) -> np.ndarray:
    """The velocity used to time travel down the ditch at each point (see the module's rules) [m/s]."""
    sections = {p.section_index: p.section for p in points}
    which = np.array([p.section_index for p in points], dtype=int)
    flow = np.array([p.flow for p in points], dtype=float)
    grade = np.array([p.grade for p in points], dtype=float)
    return _travel_velocities(sections, which, flow, grade, roughness)[0]


def _normal_depths(section, flow, slope, rough):
    """Normal depth of each flow [m], nan where it has none (what ``normal_depth`` refuses with NoSolutionError):
    one array solve, with the flows a closed section cannot surely carry left to the scalar solve. Returns the
    depths and, when the one array solve took every flow, its DepthSolution (else None)."""
    y = np.full(flow.size, np.nan)
    whole = None
    sure, near = solvable(section, flow, slope, rough)
    try:
        if sure.all():
            whole = solve_normal_depth(section, flow, slope, rough)
            y[:] = whole.depth
        elif sure.any():
            y[sure] = normal_depth(section, flow[sure], slope[sure], rough)
    except HydraulicsError:            # the array solve could not be made: every flow on its own
        near, whole = np.ones(flow.size, dtype=bool), None
    for i in np.flatnonzero(near).tolist():
        try:
            y[i] = normal_depth(section, float(flow[i]), float(slope[i]), rough)
        except NoSolutionError:
            y[i] = np.nan
    return y, whole


def _critical_depths(section, flow) -> np.ndarray:
    """Critical depth of each flow [m]: one array solve (the scalar solves, and their errors, if it fails)."""
    try:
        return np.asarray(critical_depth(section, flow), dtype=float).reshape(flow.shape)
    except HydraulicsError:
        return np.array([critical_depth(section, float(q)) for q in flow], dtype=float)


def _travel_velocities(sections: dict, which, flow, grade, roughness, only=None):
    """:func:`_travel_velocity` on arrays: one array solve per section and candidate [m/s].

    ``sections`` maps a section index to its Section, ``which`` gives each point's section index, ``flow`` [m^3/s]
    and ``grade`` [m/m] each point's; ``roughness`` the candidates' roughness (a number or a model). Returns the
    velocities, the normal-depth solutions made on the way ({(section index, candidate): DepthSolution of the
    section's points with flow on a falling grade, in point order} where one array solve took them all) and the
    fastest candidate at each point (-1: none, the velocity is at critical depth or the point has no flow).

    With ``only`` (a candidate per point, as the last such call gave) each point tries that candidate alone:
    the same velocities wherever it is still the fastest (no solutions are returned then).
    """
    v = np.full(flow.size, np.nan)
    fastest = np.full(flow.size, -1)
    solutions = {}
    for index, section in sections.items():
        rows = np.flatnonzero((which == index) & (flow > 0))
        falling = rows[grade[rows] > 0]
        best = np.zeros(falling.size)
        for k, rough in enumerate(roughness):
            at = slice(None) if only is None else np.flatnonzero(only[falling] == k)
            q = flow[falling[at]]
            if not q.size:
                continue
            y, whole = _normal_depths(section, q, grade[falling[at]], rough)
            if only is None:
                solutions[index, k] = whole
            solved = ~np.isnan(y)
            if solved.any():
                speed = np.zeros(q.size)
                speed[solved] = q[solved] / section.properties(y[solved]).area
                faster = speed > best[at]
                best[at] = np.where(faster, speed, best[at])
                fastest[falling[at][faster]] = k
        v[falling[best > 0]] = best[best > 0]
        still = rows[np.isnan(v[rows])]          # zero or adverse grade, or no normal depth for any candidate
        if still.size:
            yc = _critical_depths(section, flow[still])
            v[still] = flow[still] / section.properties(yc).area
    if np.all(np.isnan(v)):
        return np.ones(flow.size), solutions, fastest  # no flow anywhere: no travel to time
    # a point without flow takes the velocity of the next point downstream with flow; the last ones, the previous
    idx = np.where(~np.isnan(v), np.arange(v.size), v.size)
    nxt = np.minimum.accumulate(idx[::-1])[::-1]
    filled = np.where(nxt < v.size, v[np.minimum(nxt, v.size - 1)], np.nan)
    last = v[~np.isnan(v)][-1]
    return np.where(np.isnan(filled), last, filled), solutions, fastest


def _mixed_travel_time(rounds: list, step, image, change) -> np.ndarray:
    """The travel time to try next, from this round's (the travel time it gave, ``image``, and ``step``, that less
    the one it started from; ``change`` the largest step [s]) and the earlier ``rounds`` (kept in that list).

    Anderson mixing (Anderson, D. G., 1965, J. ACM 12(4); the form with differences of residuals, e.g. Walker, H. F.
    and Ni, P., 2011, SIAM J. Numer. Anal. 49(4)) over the last TRAVEL_MIXING rounds: the images combined with the
    weights that make the combined step least in the least-squares sense. The plain image is taken instead on the
    first round, after a round whose step grew (the history starts again there), and where the mixed travel time
    would not rise along the run. Only the start of each round changes: the iteration still stops on a plain
    round, where the travel time it started from changes by at most TRAVEL_TOLERANCE.
    """
    if rounds and change > rounds[-1][2]:
        rounds.clear()
    rounds.append((step, image, change))
    del rounds[:-(TRAVEL_MIXING + 1)]
    if len(rounds) < 2:
        return image
    d_step = np.column_stack([b[0] - a[0] for a, b in zip(rounds, rounds[1:])])
    d_image = np.column_stack([b[1] - a[1] for a, b in zip(rounds, rounds[1:])])
    weights = np.linalg.lstsq(d_step, step, rcond=None)[0]
    mixed = image - d_image @ weights
    if not (np.all(np.isfinite(mixed)) and mixed[0] == image[0] and np.all(np.diff(mixed) > 0)):
        return image
    return mixed


def solve_run(run: DitchRun) -> RunResult:
    """Solve a ditch run (see the module's text). Raises InputError for bad input (naming the item),
    NoSolutionError where no buildable schedule exists, ConvergenceError if the travel time does not settle.

    Every candidate is screened at every point on arrays (:mod:`hydraulics.run_screening`); the full check of a
    point's candidates (``PointResult.checks``, ``PointResult.result``) and the cautions of the scheduled
    linings (``RunResult.warnings``) are made when first asked for.
    """
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
    bend = np.array([np.nan] + [float(b.radius) for b in run.bends])[bend_at + 1]   # nan: straight
    pieces = split_sub_areas(layout, run.sub_areas)
    total_area = sum(a.area for a in run.sub_areas)
    sections = {int(k): run.sections[int(k)].section for k in np.unique(which)}
    grade = np.asarray(layout.grade, dtype=float)

    # -- flow and travel time to a fixed point --------------------------------
    # The result is the travel time whose next round changes it by no more than TRAVEL_TOLERANCE, with the flows
    # of that travel time: the last round's flows and normal depths are then the run's own (not solved again).
    # A round that tries every candidate is followed by rounds that try each point's fastest of that round alone
    # (the same velocities while it stays the fastest) until they settle; only a round of every candidate ends it.
    roughness = [c.lining.roughness(c.d50) for c in run.candidates]
    tau = np.zeros(layout.x.size)
    rounds, fastest = [], None
    for iteration in range(1, MAX_TRAVEL_ITERATIONS + 1):
        state = peak_flows(layout, pieces, run.point_inflows, tau, run.idf, run.return_period, run.min_duration)
        velocity, solutions, found = _travel_velocities(sections, which, state.flow, grade, roughness, fastest)
        new_tau = travel_times(layout.x, velocity)
        change = float(np.max(np.abs(new_tau - tau)))
        if change <= TRAVEL_TOLERANCE and fastest is None:
            break
        # after every candidate: the fastest alone; once those settle, every candidate again
        fastest = found if fastest is None else (None if change <= TRAVEL_TOLERANCE else fastest)
        tau = _mixed_travel_time(rounds, new_tau - tau, new_tau, change)
    else:
        raise ConvergenceError(f"the travel time down the ditch did not settle in {MAX_TRAVEL_ITERATIONS} rounds "
                               f"(last change {change:.3g} s): the flow and the ditch velocity keep changing each other")
    flow = np.asarray(state.flow, dtype=float)

    # -- every candidate at every point, on arrays ------------------------------
    n, k_count = layout.x.size, len(run.candidates)
    screening = Screening.empty(n, k_count)
    wet, falling = flow > 0, grade > 0
    for index, section in sections.items():
        rows = np.flatnonzero((which == index) & wet & falling)
        if not rows.size:
            continue
        bent = None if np.isnan(bend[rows]).all() else bend[rows]
        for k, c in enumerate(run.candidates):
            screening.put((rows, k), screen_lining(section, flow[rows], grade[rows], c.lining, d50=c.d50,
                                                 bend_radius=bent, min_freeboard=run.min_freeboard,
                                                 roughness=roughness[k], normal=solutions.get((index, k))))
    margin = np.where(screening.checked, screening.margin, np.nan)
    lined, volume = screening.lined_width.copy(), screening.layer_volume.copy()
    cost = np.full((n, k_count), np.nan)
    for k, c in enumerate(run.candidates):
        ok = screening.checked[:, k]
        if c.lining.unit_cost_basis == "area":
            grows = c.lining.category in ("vegetation", "manufactured")
            cost[ok, k] = c.price * lined[ok, k] * ((1.0 + run.mat_allowance) if grows else 1.0)
        else:
            cost[ok, k] = c.price * volume[ok, k]      # NaN where the lining has no layer
    # A point not checked (no flow yet, no falling grade) lets any candidate pass (margin 1 where there is no
    # flow, 0 on a flat or adverse grade, so it is flagged) and takes its widths and prices from the nearest
    # checked point downstream (upstream at the end of the run).
    checkable = wet & falling
    checked = checkable & screening.checked.any(axis=1)
    if not checked.any():
        tried = [(i, k) for i in np.flatnonzero(checkable).tolist() for k in range(k_count)
                 if screening.errors[i][k] is not None]
        if not tried:
            raise NoSolutionError("no design point of the run could be checked (no flow, or no falling grade "
                                  "anywhere)")
        i, k = tried[0]   # every point with flow on a falling grade refused every candidate: say why at the first
        raise NoSolutionError(worded("no design point of the run could be checked with any candidate lining: at "
                                     "{s}, {lining}: {why}", s=(float(layout.stations[i]), "station"),
                                     lining=worded_sizes(run.candidates[k].label), why=screening.errors[i][k]))
    nxt = np.minimum.accumulate(np.where(checked, np.arange(n), n)[::-1])[::-1]
    prev = np.maximum.accumulate(np.where(checked, np.arange(n), -1))
    donor = np.where(nxt < n, nxt, prev)
    lost = np.flatnonzero(~checked)
    for arr in (cost, lined, volume):
        arr[lost] = arr[donor[lost]]
    margin[lost] = np.where(np.isfinite(cost[lost]), np.where(wet[lost], 0.0, 1.0)[:, None], np.nan)
    schedule = cheapest_schedule(layout.x, margin, cost, run.min_stretch)
    choice = np.asarray(schedule.choice_at)[np.minimum(np.arange(n), n - 2)]
    failing = np.asarray(schedule.failing) & checkable

    depth_of = np.array([float(r.section.full_depth) if r.ditch_depth is None else float(r.ditch_depth)
                         for r in run.sections])
    quantities = []
    for s in schedule.stretches:
        rows = slice(s.first, s.last + 1)
        quantities.append(stretch_quantities(
            layout.x[rows], lined[rows, s.choice], volume[rows, s.choice], run.candidates[s.choice],
            choice=s.choice, start=float(layout.stations[s.first]), end=float(layout.stations[s.last]),
            mat_allowance=run.mat_allowance, stone_porosity=run.stone_porosity))
    result = RunResult(run=run, layout=layout, flows=state, travel_time=tau, iterations=iteration,
                       schedule=schedule, quantities=quantities, screening=screening, section_index=which,
                       bend_radius=bend, ditch_depth=depth_of[which], choice=choice, failing=failing,
                       checked=checkable)
    result.run_warnings, result.checks_at, result.notes = _run_messages(result, total_area)
    return result


def _points(res: RunResult) -> list:
    """The PointResult of every design point of ``res`` (their full checks made on first access)."""
    run, layout, screening = res.run, res.layout, res.screening
    total = res.scheduled("total_depth")
    points = []
    rows = zip(layout.stations.tolist(), layout.x.tolist(), layout.invert.tolist(), layout.grade.tolist(),
               res.flows.flow.tolist(), res.section_index.tolist(), res.bend_radius.tolist(),
               res.ditch_depth.tolist(), res.choice.tolist(), res.failing.tolist(), total.tolist(), screening.errors)
    for i, (st, x, z, g, q, k, rc, depth, ch, fail, top, errs) in enumerate(rows):
        if not q > 0:
            why = "no flow has reached this point yet"
        elif not g > 0:
            why = ("zero grade" if g == 0 else "adverse grade") + (
                ": no normal depth, so no lining check; the water-surface profile is needed here")
        else:
            why = None
        p = PointResult(index=i, station=st, x=x, invert=z, grade=g, flow=q, section_index=k,
                        section=run.sections[k].section, ditch_depth=depth, bend_radius=None if rc != rc else rc,
                        errors=list(errs), choice=ch, failing=fail, not_checked=why,
                        total_depth=None if top != top else top)
        p.checks = PointChecks(p, run, screening)
        points.append(p)
    return points


def ranges_of(mask, stations) -> list:
    """(first station, last station) of each run of True in ``mask`` (in point order)."""
    out, start = [], None
    for i, m in enumerate(mask):
        if m and start is None:
            start = i
        if (not m or i == len(mask) - 1) and start is not None:
            end = i if m else i - 1
            out.append((stations[start], stations[end]))
            start = None
    return out


def stretches(ranges):
    """The stretches ``ranges`` ((first, last) station pairs, as :func:`ranges_of` gives) in words, for one message
    about all of them: "at 0+150.00, from 0+495.00 to 0+510.00 and from 0+660.00 to 0+700.00" (a stretch of one
    design point is "at" it). Each station is restated in the reader's units (:func:`hydraulics.wording.worded`)."""
    parts, where = [], {}
    for k, (a, b) in enumerate(ranges):
        where[f"a{k}"] = (a, "station")
        if a == b:
            parts.append(f"at {{a{k}}}")
        else:
            parts.append(f"from {{a{k}}} to {{b{k}}}")
            where[f"b{k}"] = (b, "station")
    text = parts[-1] if len(parts) == 1 else ", ".join(parts[:-1]) + " and " + parts[-1]
    return worded(text, **where)


def _run_messages(res: RunResult, total_area: float):
    """The run's own warnings (and where in them the checks' cautions go) and its notes."""
    run, layout, state, screening = res.run, res.layout, res.flows, res.screening
    warnings, notes = [], []
    at = lambda s: (s, "station")  # noqa: E731
    for j, g in enumerate(layout.grades):
        if g <= 0:
            a, b = layout.station_of([layout.profile_x[j], layout.profile_x[j + 1]])
            warnings.append(worded("{kind} grade from {a} to {b} ({g} %): no normal depth there; the lining is not "
                                   "checked on this stretch and the water backs up (the water-surface profile is not "
                                   "computed here)", kind="zero" if g == 0 else "adverse", a=at(min(a, b)),
                                   b=at(max(a, b)), g=f"{100 * g:.2f}"))
    stations = layout.stations.tolist()
    if failing := ranges_of(res.failing.tolist(), stations):
        warnings.append(worded("no candidate lining is stable {where}: the strongest candidate is scheduled there "
                               "and still fails; add a stronger lining or change the section",
                               where=stretches(failing)))
    with np.errstate(invalid="ignore"):
        over = res.scheduled("total_depth") > res.ditch_depth * (1 + 1e-9)   # nan (not checked) compares False
    if short := ranges_of(over.tolist(), stations):
        warnings.append(worded(NORMAL_DEPTH_FIT, where=stretches(short)))
    if partial := ranges_of(state.partial.tolist(), stations):
        notes.append(worded("{where} a part of the drainage area that reaches the ditch sooner gives a larger peak "
                            "than the whole area (partial-area case); the larger flow is used",
                            where=stretches(partial)))
    for i, k in zip(*np.nonzero(res.checked[:, None] & ~screening.checked)):
        err = screening.errors[i][k]
        if err is not None:
            warnings.append(worded("{lining} could not be checked at {s}: {err}",
                                   lining=worded_sizes(run.candidates[k].label), s=at(stations[i]), err=err))
    checks_at = len(warnings)      # the scheduled checks' cautions come here (RunResult.warnings)
    if total_area > RATIONAL_MAX_AREA:
        warnings.append(worded("the run drains {area} in all, above the {limit} usually allowed for the rational "
                               "method ({src}); use a hydrograph method", area=(total_area, "drainage_area"),
                               limit=(RATIONAL_MAX_AREA, "drainage_area"), src=cite("rational_area")))
    notes.extend(RUN_RULES)
    return warnings, checks_at, notes


def _check_cautions(points) -> list:
    """The checks' own cautions, once per kind and lining over each range of points where they hold (the first
    point's numbers are quoted), from the scheduled linings' full checks (made here where not yet made)."""
    warnings = []
    at = lambda s: (s, "station")  # noqa: E731
    stations = [p.station for p in points]
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
    for (name, _), span in spans.items():
        lining = worded_sizes(name)  # "about 150 mm tall" restated in the user's units with the rest
        for first, last, w in span:
            if first == last:
                warnings.append(worded("at {s} ({lining}): {w}", s=at(stations[first]), lining=lining, w=w))
            else:
                warnings.append(worded("from {a} to {b} ({lining}), at {a}: {w}", a=at(stations[first]),
                                       b=at(stations[last]), lining=lining, w=w))
    return warnings
