"""The run's profile as one drawing model for window and sheet (app.run_drawing), on the demo's invented run."""

import numpy as np
import pytest

from app import project as pj
from app.run_design import design_run
from app.run_drawing import profile_model, station_step
from hydraulics.units import FOOT, SI, US
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone


@pytest.fixture(scope="module")
def design():
    project = pj.load(pj.demo_path())
    return design_run(project, project.runs[0], catalogue=SHIPPED)


def test_lines_are_the_station_table_in_the_users_units(design):
    m = profile_model(design, US)
    pts = design.result.points
    assert m.lines["invert"].x == pytest.approx([p.station / FOOT for p in pts])
    assert m.lines["invert"].y == pytest.approx([p.invert / FOOT for p in pts])
    assert m.lines["ditch_top"].y == pytest.approx([(p.invert + p.ditch_depth) / FOOT for p in pts])
    # the computed water surface passes through the profile's water surface at every design point with water
    ws, line = design.surface, m.lines["water_surface"]
    for i, p in enumerate(pts):
        if np.isfinite(ws.depth[i]):
            at = np.flatnonzero(np.isclose(line.x, p.station / FOOT, rtol=0, atol=1e-9))
            assert at.size and np.min(np.abs(line.y[at] - ws.water_surface[i] / FOOT)) < 1e-9
    assert line.x.min() == pytest.approx(pts[1].station / FOOT)   # no flow at the top of the run: no water there
    assert np.all(np.diff(line.x) >= 0)
    # normal depth dashed, critical depth dotted, at the design points
    wet = [i for i, p in enumerate(pts) if p.flow > 0]
    assert m.lines["normal"].y[wet] == pytest.approx([(pts[i].invert + pts[i].result.depth) / FOOT for i in wet
                                                      if pts[i].not_checked is None])
    assert m.lines["critical"].y[wet] == pytest.approx([(pts[i].invert + pts[i].critical_depth) / FOOT for i in wet])
    assert m.styles["normal"] == "dashed" and m.styles["critical"] == "dotted"
    assert m.length_unit == "ft"


def test_jumps_and_overtopped_stretches_are_marked():
    project = pj.load(pj.demo_path())
    run = project.runs[0]
    run.outfall.control, run.outfall.water_level = "level", 44.56 + 1.3   # invented: 0.3 m over the ditch top
    design = design_run(project, run, catalogue=SHIPPED)
    m = profile_model(design, SI)
    (jump,) = m.jumps
    assert jump.label == "jump 0+328.97" and jump.start == pytest.approx(design.surface.jumps[0].station)
    assert jump.low < jump.high
    over = [b for b in m.trouble if b.status == "overtopped"]
    assert len(over) == 1 and over[0].end == pytest.approx(700.0)
    first_over = design.surface.stations[np.argmax(design.surface.overtopped)]
    assert over[0].start == pytest.approx(first_over)
    shallow = [b for b in m.trouble if b.status == "too shallow"]
    assert shallow and shallow[-1].end < over[0].start          # freeboard lost before the banks are overtopped


def test_bands_grades_inflows_and_ticks(design):
    m = profile_model(design, SI)
    assert [b.label for b in m.stretches] == [q.lining_name for q in design.result.quantities]
    assert m.stretches[0].start == pytest.approx(0.0) and m.stretches[-1].end == pytest.approx(700.0)
    assert [g.text for g in m.grades] == ["0.60 %", "3.00 %", "0.60 %", "0.40 %"]
    names = {i.label for i in m.inflows}
    assert {"Pasture field A", "Woodlot", "Farmyard pipe", "North lanes verge"} <= names
    assert m.ticks[0] == (0.0, "0+000.00") and m.ticks[-1][1] == "0+700.00"
    assert m.outfall[0] == pytest.approx(700.0)


@pytest.mark.parametrize("length, step", [(700.0, 100.0), (2296.6, 500.0), (10000.0, 2000.0), (35.0, 10.0)])
def test_station_ticks_are_round(length, step):
    assert station_step(length, SI) == step


def test_lining_bands_name_the_grass_in_the_units_of_the_drawing(design):
    # the shipped grass is "about 150 mm tall": 150 / 25.4 = 5.9, about 6 in to whole inches (1 in = 25.4 mm
    # exactly, NIST Special Publication 811, 2008 ed., Appendix B.8)
    labels = [b.label for b in profile_model(design, US).stretches]
    assert any("about 6 in tall" in t for t in labels) and not any(" mm" in t for t in labels)
