"""A ditch run on arrays (hydraulics.run_screening, the travel velocities of hydraulics.ditch_run) against the
one-channel path it stands for.

The run screens every candidate at every design point with the array forms of HEC-15's permissible-shear method
(Kilgore and Cotton, HEC-15, 3rd ed., FHWA-NHI-05-114, 2005: Eq. 3.1 design shear, Eq. 3.2 tau_p >= SF tau,
Section 3.2 side slopes, Section 3.4 bends, Chapter 4 grass and soil, Chapter 6 stone) and times the travel down the
ditch with array solves of Manning's equation. Here every screened number must be the one
hydraulics.stability.check_lining gives for that channel (within 1e-9 relative, the verdict exactly, the same words
where a check cannot be made), and every travel velocity the one the rule gives point by point with scalar solves.
Channels, flows and runs are invented at random (reproducible seeds); the published checks of the one-channel path
itself are in tests/test_stability.py and tests/test_published_cases.py.
"""

import math
from types import SimpleNamespace

import numpy as np
import pytest

import hydraulics as hy
from app import project as pj
from app.run_design import design_run
from hydraulics.ditch_run import Candidate, DitchRun, SectionRange, _travel_velocity, solve_run
from hydraulics.errors import HydraulicsError, NoSolutionError
from hydraulics.linings import load_catalogue
from hydraulics.rainfall import IdfTable
from hydraulics.run_inflow import PointInflow, SubArea
from hydraulics.run_layout import StationRange
from hydraulics.run_screening import screen_lining
from hydraulics.solvers import critical_depth, max_flow, normal_depth
from hydraulics.stability import check_lining
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

CAT = load_catalogue()
#: Every shipped lining that needs no data from the user (a data sheet or a site investigation).
READY = [lining.key for lining in CAT if not lining.user_data]
DURATIONS = np.array([300.0, 600.0, 1800.0, 3600.0, 7200.0, 14400.0])
IDF = IdfTable(DURATIONS, [10.0], (2.0e-4 * DURATIONS ** -0.7)[:, None])   # invented power-law table


def _section(rng, kind):
    if kind == "trapezoid":
        return hy.Trapezoid(bottom_width=rng.uniform(0.3, 2.0), left_slope=rng.uniform(1.5, 4.0),
                            right_slope=rng.choice([2.0, 3.0, rng.uniform(1.0, 4.0)]))
    if kind == "triangle":
        return hy.Triangle(side_slope=rng.uniform(1.5, 5.0))
    if kind == "rectangle":
        return hy.Rectangle(bottom_width=rng.uniform(0.4, 2.5))
    return hy.Circle(diameter=rng.uniform(0.6, 1.8))


def _margin(r):
    """check_lining's margin as the schedule takes it: the lowest safety factor over the checks divided by the
    required one (inf: non-erodible), kept on the side of the verdict."""
    m = min((c.margin for c in r.checks), default=math.inf)
    return max(m, 1.0) if r.stable else min(m, math.nextafter(1.0, 0.0))


def _scalar_values(section, r):
    full = section.full_depth
    return {"depth": r.depth, "velocity": r.velocity, "froude": r.froude, "manning_n": r.manning_n,
            "top_width": float(r.analysis.top_width), "bed_shear": r.bed_shear,
            "safety_factor": math.nan if r.safety_factor is None else r.safety_factor,
            "required_safety_factor": r.required_safety_factor, "margin": _margin(r), "freeboard": r.freeboard,
            "total_depth": r.total_depth,
            "depth_at_top": r.total_depth if full is None else min(r.total_depth, float(full)),
            "lined_width": r.lined_width, "layer_volume": math.nan if r.layer_volume is None else r.layer_volume}


def _same(a, b):
    if math.isnan(b) or math.isinf(b):
        return (math.isnan(a) and math.isnan(b)) or a == b
    return a == pytest.approx(b, rel=1e-9, abs=1e-300)


@pytest.mark.parametrize("kind", ["trapezoid", "triangle", "rectangle", "circle"])
def test_every_screened_number_is_the_one_channel_check(kind):
    rng = np.random.default_rng(["trapezoid", "triangle", "rectangle", "circle"].index(kind))
    compared = errors = unstable = 0
    for key in READY + ["blanket_user"]:
        lining = CAT.get(key)
        for _ in range(2):
            section = _section(rng, kind)
            size = 16
            slope = 10 ** rng.uniform(-3.3, -0.9, size)
            flow = 10 ** rng.uniform(-2.0, 0.6, size)
            if kind == "circle":     # mostly part full, a few beyond what the pipe can carry
                flow = np.minimum(flow, max_flow(section, slope, 0.015) * rng.uniform(0.05, 1.2, size))
            bend = np.where(rng.random(size) < 0.4, rng.uniform(0.3, 40.0, size), np.nan)   # some too tight
            d50 = float(rng.uniform(0.05, 0.5)) if lining.category == "stone" and rng.random() < 0.7 else None
            screen = screen_lining(section, flow, slope, lining, d50=d50, bend_radius=bend, min_freeboard=0.2)
            for i in range(size):
                try:
                    r = check_lining(section, float(flow[i]), float(slope[i]), lining, d50=d50,
                                     bend_radius=None if np.isnan(bend[i]) else float(bend[i]), min_freeboard=0.2,
                                     size_stone=False)
                except HydraulicsError as exc:
                    assert not screen.checked[i] and screen.errors[i] == str(exc)
                    errors += 1
                    continue
                assert screen.checked[i] and screen.errors[i] is None
                assert bool(screen.stable[i]) == r.stable
                assert (screen.margin[i] >= 1.0) == r.stable
                for name, value in _scalar_values(section, r).items():
                    assert _same(float(getattr(screen, name)[i]), value), (key, name, i)
                compared += 1
                unstable += not r.stable
    assert compared > 300 and errors > 0 and unstable > 0     # the cases above occur


def _points(rng, sections):
    """Invented design points over ``sections``: flows (some none yet), grades (some flat or adverse)."""
    points = []
    for index, section in enumerate(sections):
        for _ in range(40):
            grade = float(rng.choice([0.0, -0.004, *(10 ** rng.uniform(-3.3, -1.0, 6))]))
            flow = 0.0 if rng.random() < 0.1 else float(10 ** rng.uniform(-2.0, 0.5))
            if section.full_depth is not None and flow > 0:
                flow = min(flow, 0.9 * float(max_flow(section, max(grade, 1e-3), 0.015)))
            points.append(SimpleNamespace(index=len(points), section_index=index, section=section, flow=flow,
                                          grade=grade))
    return points


def _velocity_by_hand(points, roughness):
    """The module's rule, point by point with scalar solves: the fastest candidate's uniform-flow velocity where
    the grade falls (a candidate without a normal depth is passed over), else the velocity at critical depth; a
    point without flow takes the next one's downstream (the last ones, the one before)."""
    v = [math.nan] * len(points)
    for p in points:
        if p.flow <= 0:
            continue
        best = 0.0
        if p.grade > 0:
            for rough in roughness:
                try:
                    y = normal_depth(p.section, p.flow, p.grade, rough)
                except NoSolutionError:
                    continue
                best = max(best, p.flow / float(p.section.properties(y).area))
        if best == 0.0:
            best = p.flow / float(p.section.properties(critical_depth(p.section, p.flow)).area)
        v[p.index] = best
    later = math.nan
    for i in range(len(v) - 1, -1, -1):
        later = v[i] = v[i] if not math.isnan(v[i]) else later
    last = next(x for x in reversed(v) if not math.isnan(x))
    return np.array([last if math.isnan(x) else x for x in v])


@pytest.mark.parametrize("seed", range(4))
def test_travel_velocities_are_the_rule_point_by_point(seed):
    rng = np.random.default_rng(100 + seed)
    sections = [_section(rng, kind) for kind in rng.permutation(["trapezoid", "triangle", "rectangle", "circle"])]
    keys = ["riprap", "gravel", "grass_good_sod", "grass_poor_bunch", "concrete", "asphalt", "soil_fine_noncohesive"]
    chosen = rng.choice(keys, 3, replace=False)
    roughness = [CAT.get(k).roughness(0.3 if k == "riprap" and rng.random() < 0.5 else None) for k in chosen]
    points = _points(rng, sections)
    np.testing.assert_allclose(_travel_velocity(points, roughness), _velocity_by_hand(points, roughness),
                               rtol=1e-9)


def _stone_run():
    section = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
    return DitchRun(name="test", profile=((0.0, 20.0), (200.0, 8.0), (400.0, 7.6)), outfall_station=400.0,
                    sections=(SectionRange(StationRange(0.0, 400.0), section, 1.5),),
                    candidates=(Candidate(CAT.get("grass_good_sod"), None, 7.5),
                                Candidate(CAT.get("riprap"), 0.6, 20.0), Candidate(CAT.get("concrete"), None, 70.0)),
                    sub_areas=(SubArea("verge", 2.0e4, 0.6, 600.0, StationRange(0.0, 400.0)),), idf=IDF,
                    return_period=10.0, point_inflows=(PointInflow("pipe", 0.0, 0.3),), spacing=20.0,
                    min_stretch=40.0)


def test_solving_a_run_makes_no_full_check_until_one_is_asked_for():
    res = solve_run(_stone_run())
    assert all(p.checks.made() == [] for p in res.points)
    p = next(p for p in res.points if p.not_checked is None)
    r = p.result
    assert p.checks.made() == [p.choice] and p.checks[p.choice] is r        # made once, then kept
    c = res.run.candidates[p.choice]
    again = check_lining(p.section, p.flow, p.grade, c.lining, d50=c.d50, bend_radius=p.bend_radius,
                         min_freeboard=res.run.min_freeboard, size_stone=c.lining.category == "stone")
    assert r.depth == again.depth and r.stable == again.stable and r.required_d50 == again.required_d50
    for k in range(len(res.run.candidates)):
        assert p.checks[k].depth == pytest.approx(res.screening.depth[p.index, k], rel=1e-9)
    # the scheduled stone is sized, as before; the run's warnings carry the checks' cautions once asked for
    stone = [q for q in res.points if q.not_checked is None and q.choice == 1]
    assert stone and stone[0].result.required_d50 is not None
    assert stone[0].checks[0].required_d50 is None
    assert len(res.warnings) == len(res.run_warnings) + len(res.check_warnings())
    assert any("Rock riprap" in w for w in res.check_warnings())     # D50 0.6 m is above HEC-15's stone range


def test_the_demo_run_reports_only_what_its_scheduled_linings_lean_on():
    project = pj.load(pj.demo_path())
    design = design_run(project, project.runs[0], catalogue=SHIPPED)
    res = design.result
    scheduled = {k for p in res.points if p.not_checked is None for k in [p.choice]}
    texts = [*design.warnings, *design.notes, *(t for b in design.bases for t in (b.coefficient_method, b.time_method))]
    for p in res.points:
        if p.not_checked is None:
            texts += p.result.cited_texts()
    assert design.not_verified == hy.provenance.not_verified_lines(hy.provenance.cited_not_verified(texts))
    made = {k for p in res.points for k in p.checks.made()}
    assert made == scheduled            # nothing else was checked in full to word the run
