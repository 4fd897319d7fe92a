"""The run's profile as one drawing model for window and sheet (app.run_drawing), on the demo's invented run."""

import numpy as np
import pytest

from app import project as pj
from app.run_design import design_run
from app.run_drawing import profile_model, station_step
from hydraulics.units import FOOT, SI, US


@pytest.fixture(scope="module")
def design():
    project = pj.load(pj.demo_path())
    return design_run(project, project.runs[0])


def test_lines_are_the_station_table_in_the_users_units(design):
    m = profile_model(design, US)
    pts = design.result.points
    assert m.lines["invert"].x == pytest.approx([p.station / FOOT for p in pts])
    assert m.lines["invert"].y == pytest.approx([p.invert / FOOT for p in pts])
    assert m.lines["ditch_top"].y == pytest.approx([(p.invert + p.ditch_depth) / FOOT for p in pts])
    checked = [i for i, p in enumerate(pts) if p.not_checked is None]
    assert m.lines["water_surface"].y[checked] == pytest.approx(
        [(pts[i].invert + pts[i].result.depth) / FOOT for i in checked])
    assert np.isnan(m.lines["water_surface"].y[0])          # no flow at the top of the run
    assert m.length_unit == "ft"


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
