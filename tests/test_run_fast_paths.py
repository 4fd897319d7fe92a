"""A ditch run solved by the program's quick paths against the same run computed plainly in this file.

The quick paths of ``hydraulics.ditch_run.solve_run``: each travel-time round starts from an Anderson mix of the
last rounds; after a round that tries every candidate, rounds try each point's fastest candidate of it alone; the
last round's flows and normal depths are the run's own (not solved again); and the rational-method search of
``hydraulics.run_inflow.peak_flows`` skips blocks of pieces on bounds of the intensity.

The plain computation here: a plain fixed-point iteration from zero travel time; in each round the flow at every
design point by the rational method over every joined piece in arrival order (the rule stated in
hydraulics.run_inflow's text: the largest i(D) x C A arrived by D over the arrival times D), every candidate's normal
depth by the scalar solver at every point and the fastest velocity (the rule stated in hydraulics.ditch_run's text,
written out in tests/test_run_screening.py); then the full one-channel check of every candidate at every point
(hydraulics.stability.check_lining), the program's rule for the points it does not check, and the cheapest schedule
of those prices (hydraulics.lining_schedule, tested against brute force in tests/test_lining_schedule.py).

Both iterations stop on a travel time whose next round changes it by at most TRAVEL_TOLERANCE, reached along
different paths: the travel times agree within a few times that tolerance (each lies within TRAVEL_TOLERANCE / (1 -
r) of the fixed point, r about 0.1 per round on these runs) and the flows to about 1e-7 relative. What must be the
same: the stretches of the schedule and the candidate at every point, and every depth, which is the root the scalar
solve finds from its own start (with a stone lining's depth-dependent n several depths can carry one flow; the
stone run below has such points): at the run's own flows to 1e-9 relative, and at the plain flows to 1e-5 (the
next root lies some 1 % away). This is a test of equivalence; the published checks of the same computation are in
tests/test_run_published.py, tests/test_rational_accumulation_data.py and tests/test_stability.py.
"""

import math
from types import SimpleNamespace

import numpy as np
import pytest

import hydraulics as hy
from app import project as pj
from app.run_design import design_run
from hydraulics.ditch_run import TRAVEL_TOLERANCE, Candidate, DitchRun, SectionRange, solve_run
from hydraulics.errors import HydraulicsError
from hydraulics.lining_schedule import cheapest_schedule
from hydraulics.run_inflow import PointInflow, SubArea, peak_flows, split_sub_areas, travel_times
from hydraulics.run_layout import StationRange
from hydraulics.run_screening import Screening
from hydraulics.solvers import normal_depth
from hydraulics.stability import check_lining
from test_run_screening import CAT, IDF, _velocity_by_hand
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

STONE_SECTION = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
#: Riprap of D50 0.15 m in STONE_SECTION on a 2 % grade: Q(y) falls between depths of about 0.371 and 0.380 m
#: (Bathurst's n passing to Blodgett's, hydraulics.linings.StoneRoughness), so flows of about 0.44 to 0.58 m^3/s
#: have three normal depths.
SEVERAL_DEPTHS = (0.45, 0.57)


def _stone_run():
    """An invented run lined with stone: four candidates (two riprap sizes), flows that cross SEVERAL_DEPTHS on a
    2 % grade, then a steeper stretch; sub-areas spread and at a point, a pipe at the top and a culvert below."""
    subs = (SubArea("verge", 4.0e4, 0.55, 420.0, StationRange(0.0, 300.0)),
            SubArea("field", 5.0e4, 0.4, 900.0, StationRange(150.0, 150.0)),
            SubArea("yard", 2.0e4, 0.8, 300.0, StationRange(240.0, 420.0)))
    candidates = (Candidate(CAT.get("grass_good_sod"), None, 7.5), Candidate(CAT.get("riprap"), 0.15, 60.0),
                  Candidate(CAT.get("riprap"), 0.3, 90.0), Candidate(CAT.get("concrete"), None, 70.0))
    return DitchRun(name="stone", profile=((0.0, 30.0), (300.0, 24.0), (420.0, 18.0)), outfall_station=420.0,
                    sections=(SectionRange(StationRange(0.0, 420.0), STONE_SECTION, 1.5),), candidates=candidates,
                    sub_areas=subs, idf=IDF, return_period=10.0,
                    point_inflows=(PointInflow("pipe", 0.0, 0.3), PointInflow("culvert", 60.0, 0.12)),
                    spacing=10.0, min_stretch=30.0)


def _demo_run():
    project = pj.load(pj.demo_path())
    return design_run(project, project.runs[0], catalogue=SHIPPED).result.run


def _plain_flows(layout, pieces, inflows, tau, idf, return_period, min_duration):
    """The rational-method flow at every point, piece by piece (hydraulics.run_inflow's text) [m^3/s]."""
    order = np.argsort(pieces.tc - tau[pieces.origin], kind="stable")       # arrival order, the same at every point
    flow = np.zeros(layout.x.size)
    for i in range(layout.x.size):
        joined = order[pieces.join[order] <= i]
        if joined.size:
            arrival = pieces.tc[joined] + tau[i] - tau[pieces.origin[joined]]
            flow[i] = np.max(idf.intensity(np.maximum(arrival, min_duration), return_period)
                             * np.cumsum(pieces.ca[joined]))
    for inflow in inflows:
        flow[int(np.argmin(np.abs(layout.x - float(layout.x_of(inflow.station))))):] += inflow.flow
    return flow


def _plain_iteration(run, res):
    """Travel time and flows by the plain fixed-point iteration from zero (on the layout and sections of ``res``)."""
    layout, pieces = res.layout, split_sub_areas(res.layout, run.sub_areas)
    roughness = [c.lining.roughness(c.d50) for c in run.candidates]
    tau = np.zeros(layout.x.size)
    for _ in range(100):
        flow = _plain_flows(layout, pieces, run.point_inflows, tau, run.idf, run.return_period, run.min_duration)
        points = [SimpleNamespace(index=i, flow=float(flow[i]), grade=float(layout.grade[i]),
                                  section=run.sections[int(res.section_index[i])].section) for i in range(flow.size)]
        new_tau = travel_times(layout.x, _velocity_by_hand(points, roughness))
        if np.max(np.abs(new_tau - tau)) <= TRAVEL_TOLERANCE:
            return tau, flow
        tau = new_tau
    raise AssertionError("the plain iteration did not settle")


def _plain_schedule(run, res, flow):
    """The cheapest schedule from every candidate's full check at every point at ``flow`` (the program's rule where
    a point is not checked: any candidate passes, margin 1 without flow and 0 on a flat or adverse grade, widths
    and prices from the nearest checked point downstream, upstream at the end of the run)."""
    n, count = flow.size, len(run.candidates)
    screening = Screening.empty(n, count)
    grade = res.layout.grade
    for i in np.flatnonzero((flow > 0) & (grade > 0)):
        section = run.sections[int(res.section_index[i])].section
        bend = None if math.isnan(res.bend_radius[i]) else float(res.bend_radius[i])
        for k, c in enumerate(run.candidates):
            try:
                r = check_lining(section, float(flow[i]), float(grade[i]), c.lining, d50=c.d50, bend_radius=bend,
                                 min_freeboard=run.min_freeboard, size_stone=False)
            except HydraulicsError:
                continue
            screening.put_result((i, k), r, section)
    margin = np.where(screening.checked, screening.margin, np.nan)
    cost = np.full((n, count), np.nan)
    for i, k in zip(*np.nonzero(screening.checked)):
        volume = screening.layer_volume[i, k]
        cost[i, k] = run.candidates[k].cost_per_length(screening.lined_width[i, k],
                                                       None if math.isnan(volume) else volume, run.mat_allowance)
    checked = screening.checked.any(axis=1)
    for i in np.flatnonzero(~checked):
        later = np.flatnonzero(checked[i:])
        donor = i + later[0] if later.size else np.flatnonzero(checked[:i])[-1]
        cost[i] = cost[donor]
        margin[i] = np.where(np.isfinite(cost[i]), 0.0 if flow[i] > 0 else 1.0, np.nan)
    return cheapest_schedule(res.layout.x, margin, cost, run.min_stretch), screening


@pytest.fixture(scope="module", params=["demo", "stone"])
def solved(request):
    run = _demo_run() if request.param == "demo" else _stone_run()
    res = solve_run(run)
    tau, flow = _plain_iteration(run, res)
    schedule, screening = _plain_schedule(run, res, flow)
    return SimpleNamespace(name=request.param, run=run, res=res, tau=tau, flow=flow, schedule=schedule,
                           screening=screening)


def test_the_search_for_the_peak_is_the_plain_one_at_any_travel_time(solved):
    run, res = solved.run, solved.res
    pieces = split_sub_areas(res.layout, run.sub_areas)
    rng = np.random.default_rng(7)
    for tau in (res.travel_time, np.zeros(res.layout.x.size), res.travel_time * rng.uniform(0.5, 2.0),
                np.cumsum(np.r_[0.0, rng.uniform(0.0, 40.0, res.layout.x.size - 1)])):
        args = (res.layout, pieces, run.point_inflows, tau, run.idf, run.return_period, run.min_duration)
        np.testing.assert_allclose(peak_flows(*args).flow, _plain_flows(*args), rtol=1e-12, atol=0.0)


def test_travel_time_and_flows_are_the_plain_iteration_ones(solved):
    res = solved.res
    np.testing.assert_allclose(res.travel_time, solved.tau, rtol=0.0, atol=3 * TRAVEL_TOLERANCE)
    np.testing.assert_allclose(res.flows.flow, solved.flow, rtol=1e-6, atol=0.0)
    # and the run's own flows are those of its own travel time
    pieces = split_sub_areas(res.layout, solved.run.sub_areas)
    np.testing.assert_array_equal(res.flows.flow, peak_flows(res.layout, pieces, solved.run.point_inflows,
                                                             res.travel_time, solved.run.idf,
                                                             solved.run.return_period, solved.run.min_duration).flow)


def test_every_depth_is_the_root_the_scalar_solve_finds(solved):
    run, res = solved.run, solved.res
    checked = res.screening.checked & solved.screening.checked
    assert checked.sum() >= 0.9 * solved.screening.checked.sum() > 0
    for i, k in zip(*np.nonzero(checked)):
        section = run.sections[int(res.section_index[i])].section
        rough = run.candidates[k].lining.roughness(run.candidates[k].d50)
        at_own = normal_depth(section, float(res.flows.flow[i]), float(res.layout.grade[i]), rough)
        assert res.screening.depth[i, k] == pytest.approx(at_own, rel=1e-9)
        assert res.screening.depth[i, k] == pytest.approx(solved.screening.depth[i, k], rel=1e-5)


def test_the_schedule_is_the_plain_one(solved):
    res, plain = solved.res, solved.schedule
    assert [(s.first, s.last, s.choice) for s in res.schedule.stretches] == \
        [(s.first, s.last, s.choice) for s in plain.stretches]
    np.testing.assert_array_equal(res.schedule.choice_at, plain.choice_at)
    assert res.total_cost == pytest.approx(plain.total_cost, rel=1e-6)


def test_the_stone_run_has_points_with_several_depths():
    """The stone run reaches the flows where riprap of D50 0.15 m has several normal depths on its 2 % grade: the
    rule (the scalar solve's root) is then tested on them above."""
    run = _stone_run()
    res = solve_run(run)
    rough = run.candidates[1].lining.roughness(0.15)
    y = np.geomspace(0.05, 1.2, 40001)
    g = STONE_SECTION.properties(y)
    several = 0
    for i in np.flatnonzero(np.isclose(res.layout.grade, 0.02) & res.screening.checked[:, 1]):
        q = float(res.flows.flow[i])
        carried = g.area * (g.area / g.wetted_perimeter) ** (2 / 3) * math.sqrt(0.02) \
            / rough.manning_n(STONE_SECTION, y, np.full(y.size, 0.02))
        roots = np.count_nonzero(np.diff(np.sign(carried - q)) != 0)
        several += roots >= 3
        if SEVERAL_DEPTHS[0] <= q <= SEVERAL_DEPTHS[1]:
            assert roots >= 3
    assert several >= 3
