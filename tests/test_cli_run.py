"""`ditchwright run`: the readable summary, the JSON layout (a contract), the station CSV, and refusals.

The demo run is invented; the checks are that the outputs carry the one answer of app.run_design in the units
asked for, with every key the command's documented layout names.
"""

import csv
import json

import pytest

from app import project as pj
from app.main import main
from app.run_design import design_run
from hydraulics.units import FOOT, US
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

STATION_KEYS = {"station", "invert", "slope", "ca", "tc", "intensity", "flow", "shape", "dimensions", "ditch_depth",
                "manning_n", "normal_depth", "critical_depth", "water_depth", "water_surface", "velocity", "froude",
                "regime", "bed_shear", "side_shear", "permissible_shear", "safety_factor", "lining", "stable",
                "freeboard", "fits", "profile_type", "overtopped"}


def run_cli(capsys, *args):
    status = main(["run", str(pj.demo_path()), *args])
    out = capsys.readouterr()
    return status, out.out, out.err


def test_json_layout_in_us_units(capsys):
    status, out, _ = run_cli(capsys, "--json", "--units", "us")
    assert status == 0
    data = json.loads(out)
    assert data["units"]["length"] == "ft" and data["units"]["drainage_area"] == "ac"
    (run,) = data["runs"]
    assert {"name", "length", "return_period", "stations", "schedule", "total_cost", "warnings"} <= set(run)
    assert run["length"] == pytest.approx(700.0 / FOOT)
    assert all(STATION_KEYS <= set(s) for s in run["stations"])
    first_flowing = next(s for s in run["stations"] if s["flow"] > 0)
    assert set(first_flowing["dimensions"]) == {"bottom_width", "left_slope", "right_slope"}
    assert first_flowing["dimensions"]["bottom_width"] == pytest.approx(0.6 / FOOT)
    for stretch in run["schedule"]:
        assert {"from_station", "to_station", "lining", "length", "quantities", "cost"} <= set(stretch)
        assert all({"item", "amount", "unit"} <= set(q) for q in stretch["quantities"])
    assert run["total_cost"] == pytest.approx(sum(s["cost"] for s in run["schedule"]))
    # the same answer as the application layer, converted
    project = pj.load(pj.demo_path())
    design = design_run(project, project.runs[0], catalogue=SHIPPED)
    assert run["total_cost"] == pytest.approx(design.result.total_cost)
    p = design.result.points[-1]
    assert run["stations"][-1]["water_depth"] == pytest.approx(design.surface.depth[-1] / FOOT)
    assert run["stations"][-1]["normal_depth"] == pytest.approx(p.result.depth / FOOT)
    assert run["stations"][-1]["flow"] == pytest.approx(US.from_si("flow", p.flow))
    assert run["stations"][-1]["ca"] == pytest.approx(US.from_si("drainage_area", design.result.flows.ca[-1]))


def test_text_summary_and_csv(capsys, tmp_path):
    out_csv = tmp_path / "stations.csv"
    status, out, _ = run_cli(capsys, "--csv", str(out_csv), "--run", "North verge ditch")
    assert status == 0
    assert 'Run "North verge ditch": 700.00 m from 0+000.00 to 0+700.00' in out
    assert "Lining schedule" in out and "Total cost: $" in out and "licensed engineer" in out
    rows = list(csv.reader(out_csv.open(encoding="utf-8")))
    assert rows[0][0] == "run" and "flow [m^3/s]" in rows[0]
    project = pj.load(pj.demo_path())
    design = design_run(project, project.runs[0], catalogue=SHIPPED)
    assert len(rows) == 1 + len(design.result.points)
    assert rows[1][1] == "0+000.00" and rows[-1][1] == "0+700.00"


@pytest.mark.parametrize("trigger", sorted("=+-@\t\r"))
def test_the_station_table_keeps_a_formula_like_run_name_as_text(capsys, tmp_path, trigger):
    """Issue 18, item 3: a text cell a spreadsheet would run gets a leading apostrophe (app.files.spreadsheet_safe,
    common practice against CSV formula injection); the numbers, negative ones included, stay numbers."""
    project = pj.load(pj.demo_path())
    name = f"{trigger}HYPERLINK(\"http://example.invalid\")"
    project.runs[0].name = name
    path, out_csv = tmp_path / "p.json", tmp_path / "stations.csv"
    pj.save(project, path)
    assert main(["run", str(path), "--csv", str(out_csv), f"--run={name}"]) == 0
    rows = list(csv.reader(out_csv.open(encoding="utf-8", newline="")))
    assert {r[0] for r in rows[1:]} == {"'" + name}
    cells = [c for r in rows[1:] for c in r[1:]]
    assert not any(c[:1] and c[:1] in "=+@\t\r" for c in cells)
    assert sum(c[:1].isdigit() and c.replace(".", "").isdigit() for c in cells) > len(rows)    # numbers as numbers


@pytest.mark.parametrize("args, words", [
    (["--run", "No such ditch"], "no run named 'No such ditch'"),
])
def test_refusals_are_one_line(capsys, args, words):
    status, _, err = run_cli(capsys, *args)
    assert status == 2 and words in err and len(err.strip().splitlines()) == 1


def test_a_project_without_runs_is_refused(capsys, tmp_path):
    project = pj.load(pj.demo_path())
    project.runs = []
    path = tmp_path / "p.json"
    pj.save(project, path)
    assert main(["run", str(path)]) == 2
    assert "has no ditch runs" in capsys.readouterr().err


def test_a_bad_run_names_the_run_and_the_item(capsys, tmp_path):
    project = pj.load(pj.demo_path())
    project.runs[0].candidates[1].unit_cost = None
    path = tmp_path / "p.json"
    pj.save(project, path)
    assert main(["run", str(path)]) == 2
    err = capsys.readouterr().err
    assert 'runs[0] "North verge ditch": candidates[1].unit_cost: is missing for Rock riprap' in err


@pytest.mark.parametrize("units, height, other", [("si", "about 150 mm tall", " in tall"),
                                                   ("us", "about 6 in tall", " mm tall")])
def test_the_run_warnings_name_the_grass_in_the_units_asked_for(capsys, units, height, other):
    # The demo's grass is "about 150 mm tall" in the shipped catalogue; 150 mm / 25.4 mm per inch = 5.91 in,
    # a rough size to whole inches: 6 in (1 in = 25.4 mm exactly, NIST Special Publication 811, 2008 ed.,
    # Appendix B.8). The warnings quote it in the run's units, as the schedule names the lining.
    status, out, _ = run_cli(capsys, "--units", units)
    assert status == 0
    warnings = out.split("\nWarnings\n", 1)[1].split("\n\n", 1)[0]
    grass = [line for line in warnings.splitlines() if "Grass" in line]
    assert grass and all(height in line for line in grass)
    assert other not in out
    data = json.loads(run_cli(capsys, "--json", "--units", units)[1])
    assert any(height in w for w in data["runs"][0]["warnings"]) and not any(other in w for w in data["runs"][0]["warnings"])
