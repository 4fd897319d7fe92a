"""DXF drawings (app.drawings, `ditchwright drawing`): files that CAD reads, in the right units, true to the design.

Sources outside the project:
- The $INSUNITS codes, 2 = feet and 6 = metres: the DXF format's published reference of header variables,
  "INSUNITS", table of values, and the same codes in the general-purpose ezdxf library (``ezdxf.units.FT``,
  ``ezdxf.units.M``, checked below); that the modelspace takes its length unit from $INSUNITS: ezdxf documentation, "DXF Units", Length Units
  (ezdxf.readthedocs.io/en/stable/concepts/units.html).
- What a dimension measures: ezdxf documentation, "Dimension", ``Dimension.get_measurement()``: the actual
  measurement in drawing units for linear dimensions, the angle in degrees for an angular dimension from three
  points (ezdxf.readthedocs.io/en/stable/dxfentities/dimension.html).
- A file is sound when ezdxf's audit finds no error: ezdxf documentation, "Drawing.audit" / "Auditor.has_errors".
The demo project is invented; the expected values come from the design (app.evaluate, app.run_design), not from the
drawing model.
"""

import copy
import json
import math

import ezdxf
import pytest

from app import project as pj
from app.drawings import export_drawings, make_drawings
from app.files import safe_file_name
from app.evaluate import evaluate_channel
from app.main import main
from app.run_design import design_run
from hydraulics.units import FOOT, SI, US
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

#: $INSUNITS codes (the DXF reference's header variable "INSUNITS", table of values).
INSUNITS_FEET, INSUNITS_METRES = 2, 6


def test_the_unit_codes_agree_with_the_dxf_library():
    import ezdxf.units
    assert (ezdxf.units.FT, ezdxf.units.M) == (INSUNITS_FEET, INSUNITS_METRES)

EXTRA_SECTIONS = {   # invented sections of every open shape, added to the demo's channels
    "Invented V-ditch": {"shape": "triangle", "left_slope": 3.0, "right_slope": 4.0},
    "Invented box channel": {"shape": "rectangle", "bottom_width": 1.2},
    "Invented swale": {"shape": "parabola", "top_width": 3.0, "at_depth": 0.6},
    "Invented lopsided ditch": {"shape": "trapezoid", "bottom_width": 0.9, "left_slope": 1.5, "right_slope": 3.0},
}


@pytest.fixture(scope="module")
def project(tmp_path_factory):
    data = json.loads(pj.demo_path().read_text(encoding="utf-8"))
    base = data["channels"][0]   # a concrete-lined channel: its lining is drawn with a thickness
    for name, section in EXTRA_SECTIONS.items():
        ch = copy.deepcopy(base)
        ch["name"], ch["section"] = name, section
        data["channels"].append(ch)
    path = tmp_path_factory.mktemp("project") / "shapes.json"
    path.write_text(json.dumps(data), encoding="utf-8")
    return pj.load(path)


@pytest.fixture(scope="module", params=["us", "si"])
def written(request, project, tmp_path_factory):
    out = tmp_path_factory.mktemp(f"dxf-{request.param}")
    return request.param, export_drawings(project, out, units=request.param, catalogue=SHIPPED)


def _units(key):
    return US if key == "us" else SI


def _ditch_outline(doc):
    lines = [e for e in doc.modelspace().query("LWPOLYLINE") if e.dxf.layer == "DITCH-OUTLINE"]
    assert len(lines) == 1
    return [(x, y) for x, y, *_ in lines[0].get_points()]


def test_every_file_passes_the_audit_reads_back_and_has_the_units(written, project):
    key, paths = written
    assert len(paths) == len(project.channels) + len(project.runs)
    for path in paths:
        doc = ezdxf.readfile(path)
        auditor = doc.audit()
        assert not auditor.has_errors and auditor.errors == [], (path, auditor.errors)
        assert doc.header["$INSUNITS"] == (INSUNITS_FEET if key == "us" else INSUNITS_METRES)
        assert "DITCHWRIGHT" in doc.styles
        texts = [e for e in doc.modelspace().query("TEXT")]
        assert texts and all(t.dxf.style == "DITCHWRIGHT" for t in texts)


def test_section_layers_hold_what_they_are_named_for(written):
    _, paths = written
    doc = ezdxf.readfile(next(p for p in paths if p.name == "East verge ditch-section.dxf"))
    msp = doc.modelspace()
    layers = {e.dxf.layer for e in msp}
    assert {"GROUND", "DITCH-OUTLINE", "LINING", "WATER", "WATER-SURFACE", "CRITICAL-DEPTH", "DIMENSIONS",
            "TEXT"} <= layers
    assert all(e.dxftype() == "DIMENSION" for e in msp if e.dxf.layer == "DIMENSIONS")
    assert {e.dxf.layer for e in msp.query("DIMENSION")} == {"DIMENSIONS"}


def test_the_section_note_gives_the_flow_and_n_as_the_results_panel_does(written, project):
    """The note's design flow and Manning's n read as in the window's results panel (and on the sheet, one rule:
    app.results.PANEL_FIELDS), e.g. n 0.0359 where three figures would give 0.036."""
    from app.channel_display import evaluate as evaluate_shown, panel_values
    from app.inputs import pretty
    from app.results import format_value, panel_field, rounded
    key, paths = written
    units = _units(key)
    for channel in project.channels:
        doc = ezdxf.readfile(next(p for p in paths if p.name == f"{channel.name}-section.dxf"))
        text = " ".join(e.dxf.text for e in doc.modelspace().query("TEXT"))
        values = panel_values(evaluate_shown(channel, Context(catalogue=SHIPPED, units=units)))
        flow = pretty(format_value(values["flow"], panel_field("flow"), units))    # m³/s as the drawing writes it
        n = rounded(values["manning_n"], panel_field("manning_n"))
        assert f"Design flow {flow}," in text and f"Manning's n {n}" in text, (channel.name, text)


def test_the_section_spans_the_top_width_at_the_top_of_the_ditch(written, project):
    key, paths = written
    k = 1 / FOOT if key == "us" else 1.0
    by_name = {p.name: p for p in paths}
    checked = 0
    for ch in project.channels:
        design = evaluate_channel(ch, catalogue=SHIPPED)
        pts = _ditch_outline(ezdxf.readfile(by_name[safe_file_name(ch.name, "-section.dxf")]))
        xs, ys = [p[0] for p in pts], [p[1] for p in pts]
        if design.section.kind == "circle":   # a pipe is drawn as its ring: its extents are the diameter
            assert max(xs) - min(xs) == pytest.approx(design.section.diameter * k, abs=1e-3)
            continue
        top = max(ys)
        assert top == pytest.approx(min(design.total_depth, design.section.full_depth or math.inf) * k, abs=1e-9)
        assert max(xs) - min(xs) == pytest.approx(design.top_width_at_top * k, abs=1e-9)
        checked += 1
    assert checked == len(project.channels) - 1


def _dimensions(doc):
    """Dimension entities by what they measure, from their labels."""
    out = {}
    for dim in doc.modelspace().query("DIMENSION"):
        text = dim.dxf.text
        name = text.split(" <>")[0] if "<>" in text else "slope " + text
        out.setdefault(name, []).append(dim)
    return out


def test_each_dimension_measures_the_designed_value(written, project):
    key, paths = written
    k = 1 / FOOT if key == "us" else 1.0
    by_name = {p.name: p for p in paths}
    for ch in project.channels:
        design = evaluate_channel(ch, catalogue=SHIPPED)
        sec = design.section
        if sec.kind in ("circle", "irregular"):
            continue
        dims = _dimensions(ezdxf.readfile(by_name[safe_file_name(ch.name, "-section.dxf")]))
        yn, total = float(design.analysis.normal_depth), float(design.total_depth)
        expected = {"top width": design.top_width_at_top * k, "yn": yn * k, "freeboard": (total - yn) * k,
                    "total depth": total * k}
        if sec.kind in ("trapezoid", "rectangle"):
            expected["bottom width"] = float(sec.bottom_width) * k
        for name, value in expected.items():
            assert len(dims[name]) == 1, (ch.name, name)
            assert dims[name][0].get_measurement() == pytest.approx(value, abs=1e-9), (ch.name, name)
        assert design.freeboard * k == pytest.approx(expected["freeboard"], abs=1e-9)
        slopes = [z for z in (sec.left_slope, sec.right_slope) if z > 0] if sec.kind != "parabola" else []
        drawn = [d for name, ds in dims.items() if name.startswith("slope ") for d in ds]
        assert sorted(d.dxf.text for d in drawn) == sorted(f"{z:g}H:1V" for z in slopes), ch.name
        for d in drawn:   # a side slope of zH:1V makes atan(1/z) with the horizontal
            z = float(d.dxf.text.split("H")[0])
            assert d.get_measurement() == pytest.approx(math.degrees(math.atan(1 / z)), abs=1e-9)


def test_the_profile_invert_runs_through_the_grade_points(written, project):
    key, paths = written
    k = 1 / FOOT if key == "us" else 1.0
    run = project.runs[0]
    doc = ezdxf.readfile(next(p for p in paths if p.name == safe_file_name(run.name, "-profile.dxf")))
    msp = doc.modelspace()
    ve = float(doc.header.custom_vars.get("VERTICAL_EXAGGERATION"))
    datum = float(doc.header.custom_vars.get("DATUM_ELEVATION"))
    stated = [t.dxf.text for t in msp.query("TEXT") if t.dxf.text.startswith("Vertical exaggeration")]
    assert len(stated) == 1 and stated[0].startswith(f"Vertical exaggeration {ve:g}:1")
    assert f"datum {datum:g}" in stated[0]
    inverts = [e for e in msp.query("LWPOLYLINE") if e.dxf.layer == "INVERT"]
    assert len(inverts) == 1
    pts = [(x, y) for x, y, *_ in inverts[0].get_points()]
    profile = sorted(run.profile, key=lambda p: p.station)
    assert len(pts) == len(profile)
    for (x, y), p in zip(pts, profile):
        assert x == pytest.approx(p.station * k, abs=1e-9)
        assert y / ve + datum == pytest.approx(p.elevation * k, abs=1e-9)
    layers = {e.dxf.layer for e in msp}
    assert {"INVERT", "DITCH-TOP", "WATER-SURFACE", "GRADES", "STATIONS", "LINING-STRETCHES", "TEXT"} <= layers
    grades = [t.dxf.text for t in msp.query("TEXT") if t.dxf.layer == "GRADES"]
    assert grades == ["grade 0.60 %", "grade 3.00 %", "grade 0.60 %", "grade 0.40 %"]   # as the run's stretches
    stations = [t.dxf.text for t in msp.query("TEXT") if t.dxf.layer == "STATIONS"]
    assert stations[0] == ("0+00.00" if key == "us" else "0+000.00")


def test_the_profile_lines_of_the_water_are_told_apart(written, project):
    """Normal depth dashed and critical depth dotted, each with gaps a viewer draws (no dash of length zero), in
    colours other than the computed water surface's; the notes say the surface is computed, not normal depth."""
    key, paths = written
    doc = ezdxf.readfile(next(p for p in paths if p.name == safe_file_name(project.runs[0].name, "-profile.dxf")))
    colours = {name: doc.layers.get(name).dxf.color for name in ("WATER-SURFACE", "NORMAL-DEPTH", "CRITICAL-DEPTH")}
    assert len(set(colours.values())) == 3
    for layer, kind in (("NORMAL-DEPTH", "dashed"), ("CRITICAL-DEPTH", "dotted")):
        pattern = doc.linetypes.get(doc.layers.get(layer).dxf.linetype).simplified_line_pattern()
        dashes, gaps = pattern[0::2], pattern[1::2]            # lengths: dash, gap, dash, gap...
        assert dashes and gaps and all(d > 0 for d in dashes) and all(g > 0 for g in gaps)
        assert (max(dashes) > max(gaps)) == (kind == "dashed")        # a dot is shorter than its gap
    notes = " ".join(t.dxf.text for t in doc.modelspace().query("TEXT") if t.dxf.layer == "TEXT")
    assert "water surface computed along the run" in notes and "no backwater" not in notes


def test_a_lining_stretch_is_a_band_per_schedule_line(project):
    (drawing,) = make_drawings(project, runs=[project.runs[0].name], units="si", catalogue=SHIPPED)
    msp = drawing.document.modelspace()
    bands = [e for e in msp.query("LWPOLYLINE") if e.dxf.layer == "LINING-STRETCHES"]
    design = design_run(project, project.runs[0], catalogue=SHIPPED)
    spans = sorted((min(q.start, q.end), max(q.start, q.end)) for q in design.result.quantities)
    drawn = sorted((min(p[0] for p in b.get_points()), max(p[0] for p in b.get_points())) for b in bands)
    assert [v for span in drawn for v in span] == pytest.approx([v for span in spans for v in span])


def test_safe_file_names():
    """The one rule of app.files, for drawings and the sheet's suggested name alike. The characters refused
    (< > : " / \\ | ? *), the device names reserved with any extension (CON ... LPT9; "NUL.txt is equivalent to NUL")
    and no trailing space or period: Microsoft, "Naming Files, Paths, and Namespaces" (Win32 documentation)."""
    assert safe_file_name("East verge ditch", ".dxf") == "East verge ditch.dxf"
    assert safe_file_name("a/b:c*d?", ".dxf") == "a-b - c-d.dxf"
    assert safe_file_name("../..", ".dxf") == "unnamed.dxf"
    assert safe_file_name("CON", ".dxf") == "_CON.dxf" and safe_file_name("lpt1.x", ".dxf") == "_lpt1.x.dxf"
    assert safe_file_name("Fossé nord. ", ".dxf") == "Fossé nord.dxf"        # letters of any language kept
    assert safe_file_name("x" * 300, ".dxf") == "x" * 100 + ".dxf"


def test_names_alike_once_made_safe_get_numbered(project):
    data = project.to_dict()
    data["channels"] = [dict(data["channels"][0], name="Ditch A/B"), dict(data["channels"][0], name="ditch a*b")]
    data["runs"] = []
    names = [d.file_name for d in make_drawings(pj.Project.from_dict(data), catalogue=SHIPPED)]
    assert names == ["Ditch A-B-section.dxf", "ditch a-b_2-section.dxf"]


def _cli(capsys, *args):
    code = main(["drawing", *map(str, args)])
    out, err = capsys.readouterr()
    return code, out, err


def test_the_command_writes_the_chosen_files(capsys, tmp_path):
    demo = pj.demo_path()
    code, out, err = _cli(capsys, demo, "--out", tmp_path / "a", "--channel", "East verge ditch", "--channel",
                          "Farm crossing pipe", "--run", "North verge ditch", "--units", "us")
    assert code == 0 and err == ""
    names = sorted(p.name for p in (tmp_path / "a").iterdir())
    assert names == ["East verge ditch-section.dxf", "Farm crossing pipe-section.dxf",
                     "North verge ditch-profile.dxf"]
    assert out.splitlines() == [f"wrote {tmp_path / 'a' / n}" for n in (
        "East verge ditch-section.dxf", "Farm crossing pipe-section.dxf", "North verge ditch-profile.dxf")]
    assert ezdxf.readfile(tmp_path / "a" / names[0]).header["$INSUNITS"] == INSUNITS_FEET
    code, out, err = _cli(capsys, demo, "--out", tmp_path / "b")   # every channel and run, the project's units
    assert code == 0
    project = pj.load(demo)
    assert len(list((tmp_path / "b").iterdir())) == len(project.channels) + len(project.runs)
    assert ezdxf.readfile(tmp_path / "b" / "North verge ditch-profile.dxf").header["$INSUNITS"] == (
        INSUNITS_METRES if project.units == "si" else INSUNITS_FEET)


@pytest.mark.parametrize("option, name, words", [("--channel", "No such ditch", "no channel named 'No such ditch'"),
                                                 ("--run", "No such run", "no run named 'No such run'")])
def test_an_unknown_channel_or_run_is_refused_in_one_line(capsys, tmp_path, option, name, words):
    code, out, err = _cli(capsys, pj.demo_path(), "--out", tmp_path / "x", option, name)
    assert code == 2 and out == ""
    assert len(err.strip().splitlines()) == 1 and err.startswith("ditchwright drawing: error: ") and words in err
    assert not (tmp_path / "x").exists()


def test_a_channel_that_cannot_be_computed_leaves_the_folder_as_it_was(capsys, tmp_path):
    data = json.loads(pj.demo_path().read_text(encoding="utf-8"))
    data["channels"][1]["slope"] = -0.01
    path = tmp_path / "bad.json"
    path.write_text(json.dumps(data), encoding="utf-8")
    out_dir = tmp_path / "out"
    code, out, err = _cli(capsys, path, "--out", out_dir)
    assert code == 2 and len(err.strip().splitlines()) == 1
    assert 'North cut ditch' in err and "slope" in err
    assert not out_dir.exists()


def test_a_profile_high_above_sea_keeps_its_datum_and_levels_whole(tmp_path):
    """A run at levels near 10,000 m (a local survey datum) with little relief (invented): the datum in the header and the
    elevation labels kept only six figures ("%g"), so a grid line at 10000.25 read 10000.2 and the invert read back through the header sat
    centimetres off (found by a random search over LandXML files). The invert, the grid and the labels now agree
    with the header."""
    data = json.loads(pj.demo_path().read_text(encoding="utf-8"))
    run = data["runs"][0]
    low = min(p["elevation"] for p in run["profile"])
    high = max(p["elevation"] for p in run["profile"])
    for p in run["profile"]:                        # 0.6 m of relief from 10000.31 m: a grid of 0.25 m
        p["elevation"] = 10000.31 + (p["elevation"] - low) * 0.6 / (high - low)
    path = tmp_path / "high.json"
    path.write_text(json.dumps(data), encoding="utf-8")
    project = pj.load(path)
    (drawn,) = export_drawings(project, tmp_path / "dxf", runs=[project.runs[0].name], channels=[], units="si",
                               catalogue=SHIPPED)
    doc = ezdxf.readfile(drawn)
    msp = doc.modelspace()
    ve = float(doc.header.custom_vars.get("VERTICAL_EXAGGERATION"))
    datum = float(doc.header.custom_vars.get("DATUM_ELEVATION"))
    (invert,) = [e for e in msp.query("LWPOLYLINE") if e.dxf.layer == "INVERT"]
    profile = sorted(project.runs[0].profile, key=lambda p: p.station)
    assert [y / ve + datum for _x, y, *_ in invert.get_points()] == pytest.approx([p.elevation for p in profile],
                                                                                   abs=1e-6)
    grid = sorted({round(e.dxf.start[1] / ve + datum, 6) for e in msp.query("LINE")
                   if e.dxf.layer == "GRID" and e.dxf.start[1] == e.dxf.end[1]})
    labels = [float(t.dxf.text) for t in msp.query("TEXT") if t.dxf.layer == "ELEVATIONS" and t.dxf.text[0].isdigit()]
    assert labels == pytest.approx(grid, abs=1e-6)
