"""A ditch run solved station by station (hydraulics.ditch_run, app.run_design).

Checks: every station equals the one-channel evaluation of the same inputs (app.evaluate, the path the window,
sheet and ``calc`` use); the travel time is a fixed point of the flow-velocity iteration; the quantities of each
kind of lining against a hand computation (lined width b + 2 d sqrt(1 + z^2) up to design depth plus freeboard,
common practice; stone layer 1.5 D50, HEC-15 Section 6.4, as the catalogue states; paving 0.10 m, the catalogue's
common-practice thickness); the schedule's cost equal to the sum of its stretches; adverse grades reported. Runs
and data are invented.
"""

import math

import numpy as np
import pytest
from scipy.optimize import brentq

import hydraulics as hy
from app import project as pj
from app.evaluate import evaluate_channel
from app.run_design import RunInputError, design_run
from hydraulics.constants import G
from hydraulics.ditch_run import Candidate, DitchRun, SectionRange, solve_run
from hydraulics.errors import InputError
from hydraulics.linings import load_catalogue
from hydraulics.rainfall import IdfTable
from hydraulics.run_inflow import PointInflow, travel_times
from hydraulics.run_layout import StationRange

CAT = load_catalogue()
DURATIONS = np.array([300.0, 600.0, 1800.0, 3600.0, 7200.0])
IDF = IdfTable(DURATIONS, [10.0], (2.0e-4 * DURATIONS ** -0.7)[:, None])   # invented power-law table


@pytest.fixture(scope="module")
def demo():
    project = pj.load(pj.demo_path())
    return project, design_run(project, project.runs[0], catalogue=CAT)


def test_every_station_is_the_one_channel_answer(demo):
    project, design = demo
    for p in design.result.points:
        r = p.result
        if p.not_checked is not None:
            continue
        cand = design.run.candidates[p.choice]
        channel = pj.Channel(name="station", flow=pj.FlowBasis(method="typed", value=p.flow), slope=p.grade,
                             section=design.run.sections[p.section_index].section,
                             lining=pj.LiningChoice(cand.key, cand.d50), manning_n=None, bend_radius=p.bend_radius,
                             min_freeboard=design.run.min_freeboard)
        one = evaluate_channel(channel, CAT)
        assert r.depth == pytest.approx(one.analysis.normal_depth, rel=1e-12)
        assert r.velocity == pytest.approx(one.analysis.velocity, rel=1e-12)
        assert r.stable == one.stability.stable
        assert r.total_depth == pytest.approx(one.total_depth, rel=1e-12)


def test_the_steep_stretch_gets_a_stronger_lining_and_nothing_fails(demo):
    _, design = demo
    res = design.result
    steep = [p for p in res.points if p.grade > 0.02 and p.not_checked is None]
    assert steep and all(design.run.candidates[p.choice].key != "grass_good_sod" for p in steep)
    assert not any(p.failing for p in res.points)
    assert all(p.result.stable for p in res.points if p.not_checked is None)
    assert res.total_cost == pytest.approx(res.schedule.total_cost, rel=1e-9)
    assert res.total_cost == pytest.approx(sum(s.cost for s in res.schedule.stretches), rel=1e-9)
    # stretches cover the run end to end
    stations = [(q.start, q.end) for q in res.quantities]
    assert stations[0][0] == pytest.approx(0.0) and stations[-1][1] == pytest.approx(700.0)
    assert all(a[1] == pytest.approx(b[0]) for a, b in zip(stations, stations[1:]))


def test_the_travel_time_is_settled(demo):
    _, design = demo
    res = design.result
    from hydraulics.ditch_run import _travel_velocity
    roughness = [c.lining.roughness(c.d50) for c in res.run.candidates]
    again = travel_times(res.layout.x, _travel_velocity(res.points, roughness))
    assert np.max(np.abs(again - res.travel_time)) <= 1e-3 * 10
    assert res.iterations >= 2
    assert np.all(np.diff(res.travel_time) > 0)


def _straight_run(key, d50=None, price=10.0, allowance=0.0, flow=0.4, grade=0.004, length=120.0):
    section = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
    return DitchRun(name="test", profile=((0.0, 10.0), (length, 10.0 - grade * length)), outfall_station=length,
                    sections=(SectionRange(StationRange(0.0, length), section, 1.5),),
                    candidates=(Candidate(CAT.get(key), d50, price),), sub_areas=(), idf=IDF, return_period=10.0,
                    point_inflows=(PointInflow("pipe", 0.0, flow),), spacing=30.0, min_stretch=15.0,
                    mat_allowance=allowance), section


def _manning_depth(q, s, n, b=0.6, z=3.0):
    """Normal depth from Manning's equation solved independently with scipy's brentq (SI, K = 1)."""
    def residual(y):
        a, p = (b + z * y) * y, b + 2 * y * math.sqrt(1 + z * z)
        return a * (a / p) ** (2 / 3) * math.sqrt(s) / n - q
    return brentq(residual, 1e-6, 10.0, xtol=1e-14)


def test_quantities_of_a_paved_stretch_by_hand():
    run, _ = _straight_run("concrete", price=70.0)
    res = solve_run(run)
    y = _manning_depth(0.4, 0.004, 0.015)         # concrete float finish, n 0.015 (Chow 1959 Table 5-6)
    lined = 0.6 + 2 * (y + 0.15) * math.sqrt(10)   # up to design depth plus 0.15 m freeboard
    (q,) = res.quantities
    assert q.amount("lined surface") == pytest.approx(lined * 120.0, rel=1e-9)
    assert q.amount("paving volume") == pytest.approx(lined * 120.0 * 0.10, rel=1e-9)
    assert q.cost == pytest.approx(70.0 * lined * 120.0, rel=1e-9)


def test_quantities_of_a_stone_stretch_by_hand():
    run, _ = _straight_run("riprap", d50=0.15, price=95.0)
    res = solve_run(run)
    r = res.points[-1].result
    lined = 0.6 + 2 * r.total_depth * math.sqrt(10)
    (q,) = res.quantities
    volume = lined * 120.0 * 1.5 * 0.15           # layer 1.5 D50 (HEC-15 Section 6.4, the catalogue's rule)
    assert q.amount("stone layer volume") == pytest.approx(volume, rel=1e-9)
    assert q.amount("stone mass") == pytest.approx(volume * 0.6 * 25900.0 / G, rel=1e-9)
    assert q.amount("filter or geotextile surface") == pytest.approx(lined * 120.0, rel=1e-9)
    assert q.cost == pytest.approx(95.0 * volume, rel=1e-9)
    assert r.required_d50 is not None and r.required_d50 <= 0.15   # the scheduled stone is sized as well


def test_quantities_of_a_grass_stretch_with_an_allowance():
    run, _ = _straight_run("grass_good_sod", price=7.5, allowance=0.1)
    res = solve_run(run)
    r = res.points[-1].result
    lined = 0.6 + 2 * r.total_depth * math.sqrt(10)
    (q,) = res.quantities
    assert q.amount("lined surface") == pytest.approx(lined * 120.0, rel=1e-9)
    seeded = [it for it in q.items if it.item.startswith("seeded")]
    assert seeded[0].amount == pytest.approx(lined * 120.0 * 1.1, rel=1e-9)
    assert q.cost == pytest.approx(7.5 * lined * 120.0 * 1.1, rel=1e-9)


def test_an_adverse_stretch_is_reported_and_not_checked():
    section = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
    run = DitchRun(name="dip", profile=((0.0, 10.0), (100.0, 9.5), (160.0, 9.6), (300.0, 9.0)), outfall_station=300.0,
                   sections=(SectionRange(StationRange(0.0, 300.0), section, 1.2),),
                   candidates=(Candidate(CAT.get("concrete"), None, 70.0),), sub_areas=(), idf=IDF,
                   return_period=10.0, point_inflows=(PointInflow("pipe", 0.0, 0.3),))
    res = solve_run(run)
    flat = [p for p in res.points if 100.0 <= p.station < 160.0]
    assert flat and all(p.not_checked and p.not_checked.startswith("adverse grade") for p in flat)
    assert any("adverse grade from 0+100.00 to 0+160.00" in w for w in res.warnings)
    assert all(p.not_checked is None for p in res.points if p.station >= 160.0)


def test_a_candidate_without_a_price_is_refused():
    run, _ = _straight_run("concrete", price=None)
    with pytest.raises(InputError) as err:
        solve_run(run)
    assert err.value.field == "candidates[0].unit_cost"


def test_bad_run_input_names_the_run_and_the_item():
    project = pj.load(pj.demo_path())
    run = project.runs[0]
    run.candidates[0].key = "no_such_lining"
    with pytest.raises(RunInputError, match=r'runs\[0\] "North verge ditch": candidates\[0\].key'):
        design_run(project, run, catalogue=CAT)
    project = pj.load(pj.demo_path())
    project.runs[0].sections[1].from_station = 340.0
    with pytest.raises(RunInputError, match="gap from 0\\+330.00 to 0\\+340.00"):
        design_run(project, project.runs[0], catalogue=CAT)
    project = pj.load(pj.demo_path())
    project.runs[0].sub_areas[0].to_station = 900.0
    with pytest.raises(RunInputError, match=r"sub_areas\[0\].to_station: must lie on the run"):
        design_run(project, project.runs[0], catalogue=CAT)


def test_stretches_are_named_once_each_in_one_message():
    """Where a caution holds along several stretches, one message names them all; a stretch of one design point
    is "at" it (the program's own wording), and the stations follow the reader's units."""
    from hydraulics.ditch_run import ranges_of, stretches
    from hydraulics.units import US

    stations = [0.0, 15.0, 30.0, 45.0, 60.0, 75.0]
    ranges = ranges_of([False, True, False, True, True, True], stations)
    assert ranges == [(15.0, 15.0), (45.0, 75.0)]
    words = stretches(ranges)
    assert str(words) == "at 0+015.00 and from 0+045.00 to 0+075.00"
    assert words.in_units(US) == "at 0+49.21 and from 1+47.64 to 2+46.06"
    assert str(stretches([(0.0, 15.0), (30.0, 30.0), (60.0, 75.0)])) == \
        "from 0+000.00 to 0+015.00, at 0+030.00 and from 0+060.00 to 0+075.00"
