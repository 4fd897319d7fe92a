"""The water surface along a solved ditch run (hydraulics.run_water_surface) and where the run's outputs use it.

Checks:

* the glue hands the core exactly the run's data: the same depths as :func:`hydraulics.water_surface.water_surface`
  called directly with the layout's distances and inverts, the sections per point, the run's flows and the
  scheduled lining's n (a number for concrete, the stone model's n(depth) at the stretch's slope for riprap);
* a culvert-like outfall level whose backwater rises over the ditch top is flagged at the right stations: the
  stations expected are found from an independent integration of dy/dx = (S0 - Sf) / (1 - Fr^2) with scipy's
  solve_ivp (the GVF equation, as in tests/test_water_surface.py), written out here for the trapezoid;
* a profile that cannot be computed is said, its points marked "not computed" and their fit not checked;
* the outfall control in the project file (optional, "normal" when absent; refusals name the run and field);
* ``ditchwright run --json`` carries water_depth, water_surface and profile_type from the profile, the controls and
  the jumps; the CSV has the new columns.

All runs here are invented.
"""

import csv
import json
import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp

import hydraulics as hy
from app import project as pj
from app.main import main
from app.run_design import RunInputError, design_run
from hydraulics.ditch_run import Candidate, DitchRun, SectionRange, solve_run
from hydraulics.errors import InputError
from hydraulics.linings import load_catalogue
from hydraulics.linings.roughness import StoneRoughness
from hydraulics.rainfall import IdfTable
from hydraulics.run_inflow import PointInflow
from hydraulics.run_layout import StationRange
from hydraulics.run_water_surface import run_water_surface
from hydraulics.units import FOOT
from hydraulics.water_surface import water_surface
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

CAT = load_catalogue()
G = 9.80665
DURATIONS = np.array([300.0, 600.0, 1800.0, 3600.0, 7200.0])
IDF = IdfTable(DURATIONS, [10.0], (2.0e-4 * DURATIONS ** -0.7)[:, None])   # invented power-law table
B, Z = 0.6, 3.0
SECTION = hy.Trapezoid(bottom_width=B, side_slope=Z)


def invented_run(key="concrete", d50=None, profile=((0.0, 10.0), (300.0, 9.4)), flow=0.4, depth=0.8, **kw):
    """A straight invented ditch fed by one pipe at its top (so the flow is the same all along)."""
    end = profile[-1][0]
    return DitchRun(name="invented", profile=profile, outfall_station=end,
                    sections=(SectionRange(StationRange(0.0, end), SECTION, depth),),
                    candidates=(Candidate(CAT.get(key), d50, 50.0),), sub_areas=(), idf=IDF, return_period=10.0,
                    point_inflows=(PointInflow("pipe", 0.0, flow),), spacing=15.0, min_stretch=15.0, **kw)


# -- the glue against the core called directly ----------------------------------------------------------------------

def test_a_concrete_run_gives_the_cores_profile_with_the_catalogues_n():
    res = solve_run(invented_run(outfall_control="level", outfall_level=9.4 + 0.7))
    ws = run_water_surface(res)
    n = CAT.get("concrete").roughness(None)
    assert n == 0.015   # concrete, float finish (Chow 1959 Table 5-6, as the catalogue states)
    direct = water_surface(res.layout.x, res.layout.invert, SECTION, n, 0.4, outfall_level=10.1)
    assert np.array_equal(ws.depth, direct.depth)
    assert ws.profile_type == direct.profile_type
    assert np.allclose(ws.water_surface, res.layout.invert + ws.depth, rtol=0, atol=1e-12)
    assert ws.controls[-1]["where"] == "outfall" and ws.controls[-1]["level"] == pytest.approx(10.1)


def test_a_riprap_run_takes_the_stone_models_n_at_the_stretchs_slope():
    profile = ((0.0, 10.0), (150.0, 9.4), (300.0, 9.25))      # 0.4 % then 0.1 %
    res = solve_run(invented_run("riprap", 0.3, profile=profile, flow=0.6, depth=1.5, outfall_control="critical"))
    ws = run_water_surface(res)
    stone = StoneRoughness(0.3)   # D50 0.3 m: da/D50 below 1.5, Bathurst's relation, whose n depends on the slope
    grades = res.layout.grade
    fns = [lambda y, s=float(s): float(stone.manning_n(SECTION, y, s)) for s in grades]
    direct = water_surface(res.layout.x, res.layout.invert, SECTION, fns, 0.6, outfall="critical")
    assert np.allclose(ws.depth, direct.depth, rtol=1e-12, atol=0)
    one_slope = water_surface(res.layout.x, res.layout.invert, SECTION, fns[0], 0.6, outfall="critical")
    assert not np.allclose(ws.depth, one_slope.depth, rtol=1e-3, atol=0)   # the slope taken matters here
    assert ws.profile_type[-1] == "critical" and "M2" in ws.profile_type


def test_points_without_flow_have_no_water_and_the_profile_starts_below_them():
    run = invented_run()
    run = DitchRun(**{**run.__dict__, "point_inflows": (PointInflow("pipe", 90.0, 0.4),)})
    res = solve_run(run)
    ws = run_water_surface(res)
    dry = res.flows.flow <= 0
    assert dry.any() and all(t == "no flow" for t, d in zip(ws.profile_type, dry) if d)
    assert np.isnan(ws.depth[dry]).all() and np.isfinite(ws.depth[~dry]).all()
    assert ws.first == int(np.argmax(~dry)) and ws.controls[0]["station"] == pytest.approx(90.0)


# -- a high outfall level backs water over the ditch top ------------------------------------------------------------

def reference_depths(q, n, s0, x_out, y_out, x_eval):
    """Depths by integrating dy/dx = (S0 - Sf) / (1 - Fr^2) upstream from the outfall (trapezoid written out)."""
    def rhs(_, y):
        a = (B + Z * y[0]) * y[0]
        p = B + 2 * y[0] * math.sqrt(1 + Z * Z)
        t = B + 2 * Z * y[0]
        sf = (q * n / (a * (a / p) ** (2 / 3))) ** 2
        return [(s0 - sf) / (1 - q * q * t / (G * a ** 3))]
    order = np.argsort(x_eval)[::-1]
    sol = solve_ivp(rhs, (x_out, x_eval[order][-1]), [y_out], t_eval=x_eval[order], method="DOP853", rtol=1e-11,
                    atol=1e-13)
    assert sol.success
    out = np.empty_like(x_eval)
    out[order] = sol.y[0]
    return out


def test_a_culvert_headwater_above_the_ditch_top_is_flagged_at_the_right_stations():
    # an invented 300 m concrete ditch at 0.2 %, 0.8 m deep, ending at a culvert whose headwater stands 1.0 m above
    # the outfall invert: 0.2 m above the top of the ditch there
    slope, level = 0.002, 9.4 + 1.0
    run = invented_run(profile=((0.0, 10.0), (300.0, 9.4)), outfall_control="level", outfall_level=level)
    res = solve_run(run)
    ws = run_water_surface(res)
    x = res.layout.x
    expected_depth = reference_depths(0.4, 0.015, slope, x[-1], 1.0, x)
    top = res.layout.invert + 0.8
    expected_over = res.layout.invert + expected_depth > top
    assert expected_over[-1] and not expected_over[0]            # the test case has both kinds of station
    clear = np.abs(res.layout.invert + expected_depth - top) > 0.005     # none within 5 mm of the top
    assert np.array_equal(ws.overtopped[clear], expected_over[clear])
    first_over = res.layout.stations[np.argmax(ws.overtopped)]
    assert any(f"above the top of the ditch from 0+{first_over:06.2f} to 0+300.00" in w for w in ws.warnings)
    assert any("outfall water level 10.4 m is above the top of the ditch at the outfall (10.2 m)" in w
               for w in ws.warnings)
    assert all(f is False for f, o in zip(ws.fits, ws.overtopped) if o)
    assert ws.profile_type[-1] == "M1"


def test_a_profile_that_cannot_be_computed_is_said_and_not_replaced_by_normal_depth():
    # normal depth at the outfall of a ditch whose last stretch rises: no normal depth to start from
    run = invented_run(profile=((0.0, 10.0), (200.0, 9.5), (300.0, 9.6)))
    res = solve_run(run)
    ws = run_water_surface(res)
    assert ws.error and "normal depth needs a falling last stretch" in ws.error
    assert ws.profile_type == ["not computed"] * len(ws.profile_type)
    assert np.isnan(ws.depth).all() and all(f is None for f in ws.fits)
    assert any("could not be computed from 0+000.00 to 0+300.00" in w and "no fallback to normal depth" in w
               for w in ws.warnings)
    # a free overfall there is computable
    ok = run_water_surface(solve_run(invented_run(profile=((0.0, 10.0), (200.0, 9.5), (300.0, 9.6)),
                                                  outfall_control="critical")))
    assert ok.error is None and np.isfinite(ok.depth).all() and ok.profile_type[-1] == "critical"


def test_a_bad_outfall_control_is_refused_by_name():
    with pytest.raises(InputError) as err:
        solve_run(invented_run(outfall_control="weir"))
    assert err.value.field == "outfall.control"
    with pytest.raises(InputError) as err:
        solve_run(invented_run(outfall_control="level"))
    assert err.value.field == "outfall.water_level"


# -- the project file -----------------------------------------------------------------------------------------------

def test_a_file_without_an_outfall_control_opens_with_normal_depth(tmp_path):
    doc = json.loads(pj.dumps(pj.load(pj.demo_path())))
    doc["runs"][0]["outfall"].pop("control", None)
    path = tmp_path / "old.json"
    path.write_text(json.dumps(doc))
    project = pj.load(path)
    assert project.runs[0].outfall.control == "normal"
    project.runs[0].outfall.control, project.runs[0].outfall.water_level = "level", 45.9
    pj.save(project, path)
    again = pj.load(path)
    assert again.runs[0].outfall == pj.Outfall(700.0, project.runs[0].outfall.kind, 45.9, "level")


@pytest.mark.parametrize("outfall, message", [
    ({"control": "weir"}, r'runs\[0\] "North verge ditch": outfall.control: must be one of "normal", "critical", '
                          r'"level"'),
    ({"control": "level", "water_level": None},
     r'runs\[0\] "North verge ditch": outfall.water_level: is missing'),
])
def test_a_bad_outfall_control_in_a_file_is_refused_naming_the_run_and_field(tmp_path, outfall, message):
    doc = json.loads(pj.dumps(pj.load(pj.demo_path())))
    doc["runs"][0]["outfall"].update(outfall)
    path = tmp_path / "bad.json"
    path.write_text(json.dumps(doc))
    with pytest.raises(pj.ProjectFileError, match=message):
        pj.load(path)


def test_a_bad_outfall_control_set_in_the_model_names_the_run():
    project = pj.load(pj.demo_path())
    project.runs[0].outfall.control = "level"
    project.runs[0].outfall.water_level = None
    with pytest.raises(RunInputError, match=r'runs\[0\] "North verge ditch": outfall.water_level: is missing'):
        design_run(project, project.runs[0], catalogue=SHIPPED)


# -- the command's outputs ------------------------------------------------------------------------------------------

@pytest.fixture(scope="module")
def high_outfall(tmp_path_factory):
    """The demo with an invented culvert headwater 1.3 m above the outfall invert (0.3 m over the ditch top)."""
    project = pj.load(pj.demo_path())
    project.runs[0].outfall.control, project.runs[0].outfall.water_level = "level", 44.56 + 1.3
    path = tmp_path_factory.mktemp("hw") / "high.json"
    pj.save(project, path)
    return path


def test_json_carries_the_profile_controls_and_jumps(capsys, high_outfall):
    assert main(["run", str(high_outfall), "--json", "--units", "us"]) == 0
    (run,) = json.loads(capsys.readouterr().out)["runs"]
    stations = run["stations"]
    assert all({"water_depth", "water_surface", "profile_type", "normal_depth", "fits", "overtopped"} <= set(s)
               for s in stations)
    wet = [s for s in stations if s["flow"] > 0]
    assert all(s["water_surface"] == pytest.approx(s["invert"] + s["water_depth"], abs=1e-9) for s in wet)
    assert stations[0]["profile_type"] == "no flow" and stations[0]["water_depth"] is None
    last = stations[-1]
    assert last["water_surface"] == pytest.approx((44.56 + 1.3) / FOOT) and last["profile_type"] == "M1"
    assert last["overtopped"] is True and last["fits"] is False
    assert last["water_depth"] > last["normal_depth"]             # backwater, not normal depth
    assert run["depths_used"] == {"shear_check": "normal_depth", "fit_check": "water_depth"}
    assert run["outfall"]["control"] == "level" and run["outfall"]["water_level"] == pytest.approx(45.86 / FOOT)
    wheres = [c["where"] for c in run["controls"]]
    assert wheres[0] == "inlet" and wheres[-1] == "outfall"
    out = run["controls"][-1]
    assert out["kind"] == "level" and out["level"] == pytest.approx(45.86 / FOOT) and out["governs"] is True
    assert out["station"] == pytest.approx(700.0 / FOOT)
    (jump,) = run["jumps"]   # where the concrete chute meets the mild grass stretch at 0+330
    assert set(jump) >= {"station", "upstream_depth", "downstream_depth", "length"}
    assert 300.0 / FOOT < jump["station"] <= 330.0 / FOOT
    assert jump["upstream_depth"] < jump["downstream_depth"] and jump["length"] == pytest.approx(
        6 * jump["downstream_depth"])   # L = 6 y2, the core's rule (hydraulics.water_surface)
    assert any("above the top of the ditch from" in w for w in run["warnings"])


def test_text_lists_controls_and_jumps_and_csv_has_the_new_columns(capsys, tmp_path, high_outfall):
    out_csv = tmp_path / "st.csv"
    assert main(["run", str(high_outfall), "--units", "si", "--csv", str(out_csv)]) == 0
    text = capsys.readouterr().out
    assert "Water-surface controls" in text and "outfall, 0+700.00: water level, level 45.86 m" in text
    assert "Hydraulic jumps" in text and "  - at 0+328.97" in text
    assert "<- overtopped" in text
    rows = list(csv.reader(out_csv.open(encoding="utf-8")))
    head = rows[0]
    for column in ("water_depth [m]", "water_surface [m]", "profile_type", "overtopped"):
        assert column in head, column
    last = dict(zip(head, rows[-1]))
    assert last["profile_type"] == "M1" and last["water_surface [m]"] == "45.86" and last["overtopped"] == "yes"


@pytest.mark.parametrize("rounds", [1, 2])
def test_a_chain_still_refining_after_its_last_round_keeps_only_the_steps_below(monkeypatch, rounds):
    """Where the steps of a chain still need cutting after the last round of refinement, the states of the steps
    below the last one to refine are kept and the rest is stepped again (an invented run with a free overfall once
    indexed past the end of its arrays there: a traceback in `ditchwright run`). With fewer rounds the profile is
    the same to within the step tolerance (1e-4 of the depth)."""
    import hydraulics.water_surface as wsm

    res = solve_run(invented_run(profile=((0.0, 10.0), (150.0, 8.0), (300.0, 7.9)), outfall_control="critical"))
    reference = run_water_surface(res)
    monkeypatch.setattr(wsm, "_CHAIN_REFINE", rounds)
    fewer = run_water_surface(res)
    assert fewer.error is None and np.isfinite(fewer.depth).all()
    assert fewer.depth == pytest.approx(reference.depth, rel=1e-4)


def test_a_run_whose_every_flow_overtops_its_section_says_so():
    """Every design point has flow on a falling grade, and every candidate is refused there because the flow
    overtops the surveyed section: the run once said "no flow, or no falling grade anywhere" (found by a random
    search over LandXML files). It names the first point and the core's reason (invented run)."""
    import dataclasses
    slot = hy.Irregular([0.0, 0.1, 0.2], [1.0, 0.0, 1.0], 0.03)       # 1 m deep, 0.2 m wide at the top
    run = invented_run(flow=0.1)                       # critical depth inside the slot, normal depth above it
    run = dataclasses.replace(run, sections=(dataclasses.replace(run.sections[0], section=slot, ditch_depth=None),))
    with pytest.raises(hy.NoSolutionError) as err:
        solve_run(run)
    said = str(err.value)
    assert said.startswith("no design point of the run could be checked with any candidate lining: at 0+000.00")
    assert "the flow overtops the section" in said
