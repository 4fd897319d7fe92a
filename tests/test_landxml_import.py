"""LandXML 1.2 in: profiles as ditch runs' inverts, cross-sections as surveyed sections, refusals naming element and
line, nothing written on a refusal, and the ``ditchwright import`` command.

The small files are written here after the element definitions of the LandXML schema documentation (Profile,
ProfAlign with PVI and ParaCurve "station elevation" text and a ``length`` attribute, ProfSurf and CrossSectSurf with
PntList2D pairs, Units with Metric/Imperial and linearUnit; see app/landxml_import.py for where they were read).
"""

from __future__ import annotations

import re
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from app import project as pj
from app.landxml_import import LandXMLError, import_landxml, parabola_elevation, read_landxml
from app.main import main

ROOT = Path(__file__).resolve().parents[1]
FT = 0.3048
NS = "http://www.landxml.org/schema/LandXML-1.2"


def landxml(body: str, units: str = '<Imperial linearUnit="foot"/>', ns: str = NS, version: str = "1.2") -> str:
    return (f'<?xml version="1.0"?>\n<LandXML xmlns="{ns}" version="{version}">\n<Units>{units}</Units>\n'
            f'<Project name="Test road"/>\n{body}\n</LandXML>\n')


def alignment(profile: str, sections: str = "", name: str = "CL") -> str:
    return (f'<Alignments><Alignment name="{name}">\n<Profile>\n{profile}\n</Profile>\n'
            + (f"<CrossSects>\n{sections}\n</CrossSects>\n" if sections else "") + "</Alignment></Alignments>")


def write(tmp_path, text: str, name: str = "road.xml") -> Path:
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return p


# A crest curve worked in a public answer on laying out vertical curves (mathhelpforum.com, thread 118633, "am i
# getting right quadratic formula"): PVC 0+00 at 1067.29 ft, PVI 2+50 at 1070.64 ft, PVT 5+00 at 1066.215 ft
# (L = 500 ft), elevations on the curve 1+00: 1068.32, 2+00: 1068.726, 3+00: 1068.511, 4+00: 1067.674, and the high
# point at 2+15.43, elevation 1068.733.
CREST = """<ProfAlign name="FG">
<PVI>0 1067.29</PVI>
<ParaCurve length="500">250 1070.64</ParaCurve>
<PVI>500 1066.215</PVI>
</ProfAlign>"""
WORKED = [(100.0, 1068.32, 0.005), (200.0, 1068.726, 0.0005), (300.0, 1068.511, 0.0005), (400.0, 1067.674, 0.0005),
          (500.0, 1066.215, 0.0005)]

DITCH = "-10 1070 -4 1066 0 1067 4 1066.5 10 1071"


def test_parabola_closed_form_against_worked_example():
    g1 = (1070.64 - 1067.29) / 250
    g2 = (1066.215 - 1070.64) / 250
    for station, expected, tol in WORKED:
        assert parabola_elevation(station, 250.0, 1070.64, g1, g2, 500.0) == pytest.approx(expected, abs=tol)
    # the high point (mathhelpforum worked example): 2+15.43, 1068.733
    assert parabola_elevation(215.43, 250.0, 1070.64, g1, g2, 500.0) == pytest.approx(1068.733, abs=0.0005)


def test_pvi_profile_with_vertical_curve_sampled_on_the_parabola(tmp_path):
    project, report = read_landxml(write(tmp_path, landxml(alignment(CREST))))
    run = project.runs[0]
    st = np.array([p.station for p in run.profile]) / FT
    z = np.array([p.elevation for p in run.profile]) / FT
    # sampled at every 50 ft (the default US spacing) from the PVC to the PVT
    assert st.tolist() == pytest.approx(list(np.arange(0, 501, 50.0)))
    for station, expected, tol in WORKED:
        assert z[st.tolist().index(station)] == pytest.approx(expected, abs=tol)
    # every sample equals the closed form (E_PVC + g1 x + (g2 - g1) x^2 / 2L)
    g1, g2 = (1070.64 - 1067.29) / 250, (1066.215 - 1070.64) / 250
    closed = 1067.29 + g1 * st + (g2 - g1) * st ** 2 / (2 * 500)
    assert z == pytest.approx(closed, abs=1e-9)
    assert run.spacing == pytest.approx(50 * FT)
    assert any("1 vertical curve" in line for line in report.imported)


def test_curve_ends_are_tangent_to_the_grades(tmp_path):
    body = """<ProfAlign name="sag">
<PVI>0 100</PVI><ParaCurve length="40">100 98</ParaCurve><PVI>200 101</PVI></ProfAlign>"""
    project, _ = read_landxml(write(tmp_path, landxml(alignment(body), '<Metric linearUnit="meter"/>')),
                              spacing=10.0)
    prof = [(p.station, p.elevation) for p in project.runs[0].profile]
    st = [s for s, _ in prof]
    assert st == pytest.approx([0, 80, 90, 100, 110, 120, 200])
    g1, g2 = -0.02, 0.03
    e = lambda s: parabola_elevation(s, 100.0, 98.0, g1, g2, 40.0)  # noqa: E731
    # the curve's ends lie on the tangents, and its slope there equals the tangents' grades
    assert e(80.0) == pytest.approx(100 + g1 * 80)
    assert e(120.0) == pytest.approx(98 + g2 * 20)
    h = 1e-4
    assert (e(80.0 + h) - e(80.0)) / h == pytest.approx(g1, abs=1e-5)
    assert (e(120.0) - e(120.0 - h)) / h == pytest.approx(g2, abs=1e-5)
    # the straight grades before and after are kept at their PVIs
    assert prof[0] == pytest.approx((0.0, 100.0))
    assert prof[-1] == pytest.approx((200.0, 101.0))


def test_station_elevation_profile_si(tmp_path):
    body = '<ProfSurf name="ditch invert"><PntList2D>0 52.0 180 50.92 330 46.42 700 44.56</PntList2D></ProfSurf>'
    project, report = read_landxml(write(tmp_path, landxml(alignment(body), '<Metric linearUnit="meter"/>')))
    assert project.units == "si"
    run = project.runs[0]
    assert [(p.station, p.elevation) for p in run.profile] == [(0, 52.0), (180, 50.92), (330, 46.42), (700, 44.56)]
    assert run.outfall.station == 700   # the lower end
    assert run.spacing == 15.0
    assert run.name == "CL ditch invert"
    assert "metre" not in report.notes[0] and "meter" in report.notes[0]


def test_millimetres_and_survey_feet_are_converted(tmp_path):
    body = '<ProfSurf name="p"><PntList2D>0 52000 1000 51000</PntList2D></ProfSurf>'
    project, _ = read_landxml(write(tmp_path, landxml(alignment(body), '<Metric linearUnit="millimeter"/>')))
    assert [v for p in project.runs[0].profile for v in (p.station, p.elevation)] == pytest.approx([0, 52.0, 1.0, 51.0])
    body = '<ProfSurf name="p"><PntList2D>0 3937 3937 0</PntList2D></ProfSurf>'
    project, _ = read_landxml(write(tmp_path, landxml(alignment(body), '<Imperial linearUnit="USSurveyFoot"/>')))
    # NIST, "U.S. survey foot": 1 ft (survey) = 1200/3937 m, so 3937 survey feet are 1200 m
    assert project.runs[0].profile[1].station == pytest.approx(1200.0)
    assert project.units == "us"


def test_cross_sections_become_surveyed_sections_with_station_ranges(tmp_path):
    sections = "\n".join(f'<CrossSect sta="{s}"><CrossSectSurf name="EG"><PntList2D>{DITCH}</PntList2D>'
                         f'</CrossSectSurf><CrossSectSurf name="FG"><PntList2D>-5 1 0 0 5 1</PntList2D>'
                         f'</CrossSectSurf></CrossSect>' for s in (100, 200, 400))
    project, report = read_landxml(write(tmp_path, landxml(alignment(CREST, sections))), n=0.04)
    run = project.runs[0]
    ranges = [(round(s.from_station / FT, 6), round(s.to_station / FT, 6)) for s in run.sections]
    assert ranges == [(0, 150), (150, 300), (300, 500)]
    sec = run.sections[0].section
    assert sec["shape"] == "irregular" and run.sections[0].ditch_depth is None
    assert sec["stations"] == pytest.approx([v * FT for v in (-10, -4, 0, 4, 10)])
    assert sec["elevations"] == pytest.approx([v * FT for v in (1070, 1066, 1067, 1066.5, 1071)])
    assert sec["n"] == 0.04
    assert any("left out: FG" in n for n in report.notes)
    # another surface chosen by name
    project, _ = read_landxml(write(tmp_path, landxml(alignment(CREST, sections))), surface="FG")
    assert project.runs[0].sections[0].section["elevations"] == pytest.approx([FT, 0, FT])


def test_unusable_parts_are_skipped_with_reasons(tmp_path):
    sections = (f'<CrossSect sta="100"><CrossSectSurf name="EG"><PntList2D>{DITCH}</PntList2D></CrossSectSurf>'
                '</CrossSect>'
                '<CrossSect sta="200"><CrossSectSurf name="EG"><PntList2D>-5 0 0 1 5 2</PntList2D></CrossSectSurf>'
                '</CrossSect>'
                f'<CrossSect sta="900"><CrossSectSurf name="EG"><PntList2D>{DITCH}</PntList2D></CrossSectSurf>'
                '</CrossSect>')
    circ = '<ProfAlign name="circ"><PVI>0 10</PVI><CircCurve length="20" radius="500">50 11</CircCurve>' \
           '<PVI>100 10</PVI></ProfAlign>'
    project, report = read_landxml(write(tmp_path, landxml(alignment(CREST + circ, sections))))
    assert len(project.runs) == 1
    text = "\n".join(report.skipped)
    assert "CircCurve at line" in text and "circular" in text
    assert 'CrossSect at line' in text and "cannot be a surveyed ditch section" in text   # a slope, not a ditch
    assert "lies off the run" in text                                                   # sta 900 beyond 500 ft
    assert len(project.runs[0].sections) == 1


# -- refusals: the element and its line are named, nothing is written --------------------------------------------

REFUSALS = {
    "not XML": ("this is not < xml", "not an XML file"),
    "not LandXML": ('<?xml version="1.0"?>\n<Road/>', "root element is Road (line 2)"),
    "another version": (landxml(alignment(CREST), ns="http://www.landxml.org/schema/LandXML-1.1"),
                        "LandXML at line 2 is version 1.1"),
    "version attribute": (landxml(alignment(CREST), version="1.0"), 'LandXML at line 2 says version="1.0"'),
    "no units": ('<?xml version="1.0"?>\n<LandXML xmlns="%s"><Alignments/></LandXML>' % NS, "no Units element"),
    "missing elevation at a PVI": (landxml(alignment('<ProfAlign name="FG">\n<PVI>0 100</PVI>\n<PVI>50</PVI>\n'
                                                     '</ProfAlign>')),
                                   'PVI at line 9: needs "station elevation", got the elevation is missing'),
    "missing elevation in a point list": (landxml(alignment('<ProfSurf name="EG">\n<PntList2D>0 1 50</PntList2D>\n'
                                                            '</ProfSurf>')),
                                          "PntList2D at line 8: 3 numbers, so the elevation of the last station"),
    "stations out of order": (landxml(alignment('<ProfAlign name="FG">\n<PVI>0 100</PVI>\n<PVI>80 99</PVI>\n'
                                                '<PVI>60 98</PVI>\n</ProfAlign>')),
                              "PVI at line 10: station 60 does not follow 80"),
    "cross-sections out of order": (landxml(alignment(CREST, '<CrossSect sta="300"/>\n<CrossSect sta="100"/>')),
                                    "CrossSect at line 15: sta 100 does not follow 300"),
    "one point": (landxml(alignment('<ProfAlign name="FG">\n<PVI>0 100</PVI>\n</ProfAlign>')),
                  'ProfAlign "FG" at line 7: a profile needs at least two points, got 1'),
    "curve at the end": (landxml(alignment('<ProfAlign name="FG">\n<PVI>0 100</PVI>\n'
                                           '<ParaCurve length="10">50 99</ParaCurve>\n</ProfAlign>')),
                         "ParaCurve at line 9: a vertical curve needs a grade on each side"),
    "curve too long": (landxml(alignment('<ProfAlign name="FG">\n<PVI>0 100</PVI>\n'
                                         '<ParaCurve length="200">50 99</ParaCurve>\n<PVI>100 100</PVI>\n'
                                         '</ProfAlign>')),
                       "ParaCurve at line 9: the curve's length (200) reaches beyond"),
    "curve without length": (landxml(alignment('<ProfAlign name="FG">\n<PVI>0 100</PVI>\n'
                                               '<ParaCurve>50 99</ParaCurve>\n<PVI>100 100</PVI>\n</ProfAlign>')),
                             "ParaCurve at line 9: the attribute length is missing"),
    "not a number": (landxml(alignment('<ProfAlign name="FG">\n<PVI>0 100</PVI>\n<PVI>50 abc</PVI>\n</ProfAlign>')),
                     "PVI at line 9: 'abc' is not a number"),
    "unknown unit": (landxml(alignment(CREST), '<Imperial linearUnit="chain"/>'),
                     'Imperial at line 3: linearUnit="chain" is not one this program reads'),
    "no alignments": (landxml(""), "no Alignments/Alignment"),
}


@pytest.mark.parametrize("case", list(REFUSALS), ids=list(REFUSALS))
def test_refusals_name_element_and_line_and_write_nothing(tmp_path, case):
    text, expected = REFUSALS[case]
    src = write(tmp_path, text)
    out = tmp_path / "project.json"
    with pytest.raises(LandXMLError) as err:
        import_landxml(src, out)
    assert expected in str(err.value)
    where = re.search(r"(\w+)(?: \"[^\"]*\")? at line (\d+)", str(err.value))
    if where:   # the line named holds the element named
        assert f"<{where[1]}" in text.splitlines()[int(where[2]) - 1]
    assert not out.exists()
    assert list(tmp_path.iterdir()) == [src]   # no temporary file left either


def test_refusal_leaves_an_existing_project_untouched(tmp_path):
    out = tmp_path / "project.json"
    out.write_text("old", encoding="utf-8")
    src = write(tmp_path, landxml(alignment('<ProfAlign name="FG"><PVI>0 100</PVI></ProfAlign>')))
    with pytest.raises(LandXMLError):
        import_landxml(src, out)
    assert out.read_text(encoding="utf-8") == "old"


# -- the command -----------------------------------------------------------------------------------------------

def test_command_writes_a_project_that_opens(tmp_path, capsys):
    sections = f'<CrossSect sta="100"><CrossSectSurf name="EG"><PntList2D>{DITCH}</PntList2D></CrossSectSurf>' \
               '</CrossSect>'
    src = write(tmp_path, landxml(alignment(CREST, sections)))
    out = tmp_path / "road.json"
    assert main(["import", str(src), "--out", str(out), "--spacing", "100"]) == 0
    printed = capsys.readouterr().out
    assert 'imported: run "CL FG"' in printed and f"wrote {out}" in printed
    assert "note: each run still needs its drainage sub-areas" in printed
    project = pj.load(out)
    assert project.name == "Test road" and project.units == "us"
    run = project.run("CL FG")
    assert [round(p.station / FT, 6) for p in run.profile] == [0, 100, 200, 300, 400, 500]
    assert run.sections[0].section["shape"] == "irregular"
    assert run.sections[0].from_station == 0 and run.sections[0].to_station == pytest.approx(500 * FT)


def test_command_refusal_exit_status_and_message(tmp_path, capsys):
    src = write(tmp_path, landxml(alignment('<ProfAlign name="FG">\n<PVI>0 100</PVI>\n<PVI>50</PVI>\n</ProfAlign>')))
    out = tmp_path / "road.json"
    assert main(["import", str(src), "--out", str(out)]) == 2
    err = capsys.readouterr().err
    assert err.startswith("ditchwright import: error: ")
    assert "PVI at line 9" in err and "nothing was written" in err and "Traceback" not in err
    assert not out.exists()


def test_command_in_a_fresh_process_loads_lxml_only_when_run(tmp_path):
    src = write(tmp_path, landxml(alignment(CREST)))
    out = tmp_path / "road.json"
    done = subprocess.run([sys.executable, "-m", "app.main", "import", str(src), "--out", str(out)],
                          cwd=ROOT, capture_output=True, text=True, timeout=120)
    assert done.returncode == 0, done.stderr
    assert "wrote" in done.stdout and out.exists()
    code = "import sys, app.main; app.main.build_parser(); print('lxml' in sys.modules)"
    shown = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True, timeout=120)
    assert shown.stdout.strip() == "False"


@pytest.mark.parametrize("spacing", [1e-4, 1e-300])
def test_a_spacing_giving_too_many_design_points_is_refused_before_sampling(tmp_path, spacing):
    """A spacing a hair wide once sampled the vertical curves at every multiple of it, taking minutes and all
    the memory (found by a random search over LandXML files); it is refused by the count of design points the
    profile would get, the limit a run has (hydraulics.run_layout.MAX_DESIGN_POINTS)."""
    body = """<ProfAlign name="sag">
<PVI>0 100</PVI><ParaCurve length="40">100 98</ParaCurve><PVI>200 101</PVI></ProfAlign>"""
    refused = r"the spacing gives .* design points; at most 200,000 \(use a larger --spacing\)"
    with pytest.raises(LandXMLError, match=refused):
        read_landxml(write(tmp_path, landxml(alignment(body), '<Metric linearUnit="meter"/>')), spacing=spacing)
