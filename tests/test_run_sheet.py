"""The design sheet of a ditch run: what it prints (read back with pypdf), its scales, its pages, its fingerprint
and signature.

The run is the demo's invented "North verge ditch" (resources/demo-project.json), and an invented long run made
here. The sheet must print the one answer of app.run_design (the same as ``ditchwright run``), so the printed
cells are compared with the application layer's; the scale is checked against the paper's own measure (72 pt to
the inch, 1 in = 0.0254 m exactly: NIST SP 811, 2008 ed., Appendix B.8, "inch ... 2.54 E-02 m").
"""

from __future__ import annotations

import copy
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest
from certs import make_test_certificate
from pypdf import PdfReader
from reportlab.graphics.shapes import PolyLine

from app import project as P
from app.main import main
from app.run_design import design_run
from app.run_drawing import profile_model
from app.sheet import export_sheets, run_fingerprint, verify_pdf
from app.sheet.fonts import register
from app.sheet.profile_drawing import (INVERT, SI_HORIZONTAL, US_HORIZONTAL_FT, choose_profile_scales,
                                       profile_drawing)
from hydraulics import units as hu
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

DEMO_FILE = Path(str(P.demo_path()))
RUN = "North verge ditch"
TITLE = P.SheetInfo(company="Example Engineering Co. (invented)", designer="A. Designer (invented)",
                    checker="B. Checker (invented)", approver="C. Approver, P.E. (invented)",
                    date_designed="2026-11-20", revision="A", project_number="INV-0417")
PT_PER_INCH = 72.0
M_PER_INCH = 0.0254      # exact (NIST SP 811, 2008 ed., Appendix B.8)
STATION_SI = re.compile(r"\b\d+\+\d{3}\.\d{2}\b")
STATION_US = re.compile(r"\b\d+\+\d{2}\.\d{2}\b")


@pytest.fixture(scope="module")
def project():
    proj = P.load(DEMO_FILE)
    proj.sheet = copy.deepcopy(TITLE)
    return proj


@pytest.fixture(scope="module")
def design(project):
    return design_run(project, project.run(RUN), catalogue=SHIPPED)


def _pages(proj, tmp_path_factory, name):
    path = tmp_path_factory.mktemp(name) / f"{name}.pdf"
    export_sheets(proj, path, channels=[], runs=[RUN], catalogue=SHIPPED)
    return path, [p.extract_text() for p in PdfReader(path).pages]


@pytest.fixture(scope="module")
def si_sheet(project, tmp_path_factory):
    return _pages(project, tmp_path_factory, "run-si")


@pytest.fixture(scope="module")
def us_sheet(project, tmp_path_factory):
    proj = copy.deepcopy(project)
    proj.units = "us"
    return _pages(proj, tmp_path_factory, "run-us")


def _flat(pages) -> str:
    """The pages' text with every run of white space (pypdf breaks table cells onto lines) as one space."""
    return re.sub(r"\s+", " ", " ".join([pages] if isinstance(pages, str) else pages))


# ------------------------------------------------------------------ what is printed
def test_every_station_printed_as_the_run_command_writes_it(design, si_sheet, us_sheet):
    for units, (_, pages), pattern in ((hu.system("si"), si_sheet, STATION_SI), (hu.system("us"), us_sheet, STATION_US)):
        text = _flat(pages)
        rows = design.station_rows(units)
        assert rows[0]["station"] == ("0+000.00" if units.key == "si" else "0+00.00")
        for row in rows:
            assert pattern.fullmatch(row["station"])
            # the station's whole row as printed, in order: station, invert, grade
            assert f"{row['station']} {row['invert']} {row['slope']}" in text, row["station"]
        positions = [text.index(f"{r['station']} {r['invert']} {r['slope']}") for r in rows]
        assert positions == sorted(positions)   # in order along the run


def test_schedule_linings_and_total_cost(design, si_sheet):
    _, pages = si_sheet
    text = _flat(pages)
    schedule = text.split("LINING SCHEDULE", 1)[1].split("THE RUN", 1)[0]
    rows = design.schedule_rows(hu.system("si"))
    assert len(rows) == 4
    for r in rows:
        lining_start = r["lining"].split(",")[0]
        assert lining_start in schedule
        assert f"{r['from_station']} {r['to_station']}" in schedule
        assert r["cost"] in schedule
    total = design.result.total_cost
    assert f"Total cost of the run $ {total:,.0f}" in schedule
    # the stretches' printed costs (each to the dollar) add up to the printed total within their rounding
    costs = [float(r["cost"].replace("$", "").replace(",", "")) for r in rows]
    assert abs(sum(costs) - round(total)) <= 0.5 * len(costs) + 0.5
    # the stone size to a tenth, as the channels' results and lining names give it (issue 19, one rounding rule)
    assert "Rock riprap, D50 150.0 mm" in schedule and "stone mass: 40.3 t" in schedule


def test_stone_size_of_the_run_rounded_as_the_channels(design, us_sheet, capsys):
    # 0.15 m = 150.0 mm = 5.9 in (150 / 25.4 = 5.906; 1 in = 25.4 mm exactly, NIST Special Publication 811,
    # 2008 ed., Appendix B.8): the schedule, the candidate table and `ditchwright run` to a tenth, as a channel.
    us = hu.system("us")
    riprap = next(r for r in design.schedule_rows(us) if r["key"] == "riprap")
    assert riprap["lining"] == "Rock riprap, D50 5.9 in"
    assert next(c for c in design.candidate_rows(us) if c["key"] == "riprap")["d50"] == "5.9 in"
    assert next(c for c in design.candidate_rows(hu.system("si")) if c["key"] == "riprap")["d50"] == "150.0 mm"
    text = _flat(us_sheet[1])
    assert "Rock riprap, D50 5.9 in" in text and "D50 6 in" not in text
    assert main(["run", str(DEMO_FILE), "--run", RUN, "--units", "us"]) == 0
    out = capsys.readouterr().out
    assert "Rock riprap, D50 5.9 in" in out and "D50 6 in" not in out


def test_scale_statement_and_drawing_at_that_scale(design, si_sheet, us_sheet):
    assert "Horizontal 1:5000, vertical 1:200 (vertical exaggeration 25×)" in si_sheet[1][0]
    assert "Horizontal 1 in = 400 ft, vertical 1 in = 20 ft (vertical exaggeration 20×)" in us_sheet[1][0]
    register()
    for key, along in (("si", PT_PER_INCH / M_PER_INCH / 5000), ("us", PT_PER_INCH / 400)):
        units = hu.system(key)
        model = profile_model(design, units)
        drawing, scales = profile_drawing(model, units, 552.0, 290.0)
        assert scales.along == pytest.approx(along)
        # the invert as drawn spans the run's length at that scale (700 m; 2296.6 ft)
        inverts = [s for s in drawing.contents if isinstance(s, PolyLine) and s.strokeColor == INVERT]
        xs = [x for line in inverts for x in line.points[0::2]]
        assert max(xs) - min(xs) == pytest.approx((model.last_station - model.first_station) * along)


def test_profile_scale_is_the_largest_round_one_that_fits():
    # 700 m on 512 pt: 1:2500 needs 794 pt, 1:5000 needs 397 pt
    s = choose_profile_scales(700.0, 10.0, 512.0, 200.0, us=False)
    assert s.horizontal == 5000 and 700.0 / s.horizontal / M_PER_INCH * PT_PER_INCH <= 512.0
    smaller = SI_HORIZONTAL[SI_HORIZONTAL.index(5000) - 1]
    assert 700.0 / smaller / M_PER_INCH * PT_PER_INCH > 512.0
    us = choose_profile_scales(2296.6, 30.0, 512.0, 200.0, us=True)
    assert us.horizontal == 12 * 400 and "1 in = 400 ft" in us.statement
    assert 2296.6 / US_HORIZONTAL_FT[US_HORIZONTAL_FT.index(400) - 1] * PT_PER_INCH > 512.0
    assert s.vertical <= s.horizontal and us.vertical <= us.horizontal


def test_sub_areas_rainfall_and_units_in_headings(project, design, si_sheet, us_sheet):
    text = _flat(si_sheet[1])
    for row in design.sub_area_rows(hu.system("si")):
        assert row["name"] in text and row["runoff_coefficient"] in text
    assert "weighted by area over 2 land covers" in text and "Kirpich" in text and "TR-55" in text
    assert f"Source: {project.rainfall['source']}" in text
    assert "10-year (used)" in text and "10-year storm used" in text
    assert "Farmyard pipe" in text
    for heads in ("Invert m", "Q m³/s", "τ bed Pa", "i mm/h", "Σ C A ha", "tc min"):
        assert heads in text, heads
    us_text = _flat(us_sheet[1])
    for heads in ("Invert ft", "Q ft³/s", "τ bed lb/ft²", "i in/h", "Σ C A ac"):
        assert heads in us_text, heads


def test_warnings_method_not_verified_and_cautions(design, si_sheet):
    _, pages = si_sheet
    text = _flat(pages)
    assert "licensed engineer" in text and "local codes" in text
    first = _flat(pages[:1])
    assert "CAUTIONS" in first and "licensed engineer" in first  # on the first page, with the profile
    assert "The water surface shown is computed along the run" in text and "design depth of HEC-15" in text
    assert "NOT VERIFIED AGAINST THE CIRCULAR" in text and "HEC-15 Table 6.1†" in text
    assert "WARNINGS" in text and "Kirpich's data" in text
    assert "METHOD" in text and "travel time down the ditch" in text


def test_title_block_and_fingerprint_on_every_page(project, si_sheet, capsys):
    _, pages = si_sheet
    assert main(["fingerprint", str(DEMO_FILE), "--run", RUN]) == 0
    expected = capsys.readouterr().out.strip()
    assert re.fullmatch(r"[0-9a-f]{64}", expected)
    assert expected == run_fingerprint(project, project.run(RUN), catalogue=SHIPPED)
    for k, text in enumerate(pages, start=1):
        assert "DITCH RUN DESIGN SHEET" in text and RUN in text
        assert f"{k} of {len(pages)}" in text and "SIGNATURE" in text and "APPROVAL" in text
        printed = re.search(r"Design fingerprint SHA-256: ([0-9a-f]{64})", text).group(1)
        assert printed == expected


def test_run_fingerprint_follows_design_inputs(project):
    run = project.run(RUN)
    base = run_fingerprint(project, run, catalogue=SHIPPED)
    renamed = copy.deepcopy(run)
    renamed.name, renamed.notes = "Other name", "a note"
    assert run_fingerprint(project, renamed, catalogue=SHIPPED) == base
    steeper = copy.deepcopy(run)
    steeper.profile[1].elevation -= 0.01
    assert run_fingerprint(project, steeper, catalogue=SHIPPED) != base
    wetter = copy.deepcopy(project)
    wetter.rainfall["intensities"][0][1] *= 1.01
    assert run_fingerprint(wetter, run, catalogue=SHIPPED) != base
    assert run_fingerprint(project, run, version="9.9.9", catalogue=SHIPPED) != base


# ------------------------------------------------------------------ a long run over several pages
def _long_run(project) -> P.Run:
    """An invented 2.4 km ditch at 1 % with one grass section and one sub-area spread along it."""
    run = copy.deepcopy(project.run(RUN))
    run.name = "Invented long ditch"
    run.profile = [P.ProfilePoint(0.0, 80.0), P.ProfilePoint(2400.0, 56.0)]
    run.outfall = P.Outfall(2400.0, "invented stream")
    run.sections = [P.RunSection(0.0, 2400.0, {"shape": "trapezoid", "bottom_width": 0.9, "left_slope": 3.0,
                                                "right_slope": 3.0}, 1.2)]
    run.bends, run.point_inflows = [], []
    run.sub_areas = [P.SubAreaInput("Invented verge strip", 24000.0, {"method": "typed", "value": 300.0}, 0.0, 2400.0,
                                    runoff_coefficient=0.6)]
    run.spacing = 15.0
    return run


def test_station_table_continues_over_pages(project, tmp_path):
    proj = copy.deepcopy(project)
    long_run = _long_run(proj)
    proj.runs.append(long_run)
    path = tmp_path / "long.pdf"
    export_sheets(proj, path, channels=[], runs=[long_run.name], catalogue=SHIPPED)
    pages = [p.extract_text() for p in PdfReader(path).pages]
    rows = design_run(proj, long_run, catalogue=SHIPPED).station_rows(hu.system("si"))
    assert len(rows) > 150
    with_rows = [k for k, t in enumerate(pages) if any(f"{r['station']} {r['invert']}" in _flat(t) for r in rows)]
    assert len(with_rows) >= 3
    for k in with_rows:   # the heading row is repeated on every page the table continues on
        assert re.search(r"Station\s", pages[k]) and "Invert" in pages[k] and "Status" in pages[k]
    text = _flat(pages)
    positions = [text.index(f"{r['station']} {r['invert']} {r['slope']}") for r in rows]
    assert positions == sorted(positions)   # every point once, in order
    for k, t in enumerate(pages, start=1):
        assert f"{k} of {len(pages)}" in t and f"page {k} of {len(pages)} of this run" in t


# ------------------------------------------------------------------ signing and the command
def test_signed_run_sheet_verifies_as_intact(project, tmp_path):
    p12, pem, _ = make_test_certificate(tmp_path, "Test Engineer (invented)")
    path = tmp_path / "signed-run.pdf"
    export_sheets(project, path, channels=[], runs=[RUN], sign=(p12, "pw-test"), catalogue=SHIPPED)
    report = verify_pdf(path, trust=pem)
    assert report.ok
    (sig,) = report.signatures
    assert sig.intact and sig.valid and sig.covers_whole_file and sig.trusted
    data = bytearray(path.read_bytes())
    at = data.index(b"DITCH") if b"DITCH" in data else len(data) // 3
    data[at] ^= 0x01
    broken = tmp_path / "broken.pdf"
    broken.write_bytes(bytes(data))
    assert not verify_pdf(broken, trust=pem).signatures[0].intact


def test_command_run_only_and_everything(project, tmp_path, capsys):
    only = tmp_path / "only.pdf"
    assert main(["sheet", str(DEMO_FILE), "-o", str(only), "--run", RUN]) == 0
    assert "1 run sheet" in capsys.readouterr().out
    texts = [p.extract_text() for p in PdfReader(only).pages]
    assert all("DITCH RUN DESIGN SHEET" in t for t in texts) and not any("CHANNEL DESIGN SHEET" in t for t in texts)
    everything = tmp_path / "all.pdf"
    assert main(["sheet", str(DEMO_FILE), "-o", str(everything)]) == 0
    assert "5 channel sheets, 1 run sheet" in capsys.readouterr().out
    texts = [p.extract_text() for p in PdfReader(everything).pages]
    assert sum("CHANNEL DESIGN SHEET" in t for t in texts) == len(project.channels)
    assert sum("DITCH RUN DESIGN SHEET" in t for t in texts) == len(texts) - len(project.channels)
    assert main(["sheet", str(DEMO_FILE), "-o", str(tmp_path / "x.pdf"), "--run", "No such run"]) == 2
    err = capsys.readouterr().err
    assert "no run named" in err and "Traceback" not in err


def test_fingerprint_command_refuses_an_unknown_run(capsys):
    assert main(["fingerprint", str(DEMO_FILE), "--run", "No such run"]) == 2
    assert "no run named" in capsys.readouterr().err


def test_every_run_page_renders(si_sheet, tmp_path):
    exe = shutil.which("pdftoppm")
    if exe is None:
        pytest.skip("pdftoppm (poppler-utils) not installed here")
    path, pages = si_sheet
    subprocess.run([exe, "-png", "-r", "40", str(path), str(tmp_path / "page")], check=True, capture_output=True,
                   timeout=120)
    pngs = sorted(tmp_path.glob("page-*.png"))
    assert len(pngs) == len(pages) and all(p.stat().st_size > 2000 for p in pngs)


def test_run_sheet_modules_need_no_qt():
    code = ("import sys, app.sheet.run_layout, app.sheet.profile_drawing, app.sheet.run_content; "
            "print(','.join(m for m in ('PySide6', 'PyQt5', 'PyQt6') if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True,
                         cwd=Path(__file__).parent.parent)
    assert out.stdout.strip() == ""


def test_the_sheet_shows_the_water_surface_its_controls_and_jumps(project, tmp_path):
    """An invented culvert headwater 0.3 m over the ditch top at the outfall: the profile's legend names the computed
    water surface, normal depth and critical depth, the jump is labelled at its station, the stations say
    OVERTOPPED, and the controls and the jumps are listed."""
    proj = copy.deepcopy(project)
    proj.runs[0].outfall.control, proj.runs[0].outfall.water_level = "level", 44.56 + 1.3
    path = tmp_path / "high.pdf"
    export_sheets(proj, path, channels=[], runs=[proj.runs[0].name], catalogue=SHIPPED)
    text = _flat([p.extract_text() for p in PdfReader(path).pages])
    for words in ("Water surface (computed)", "Normal depth", "Critical depth", "Hydraulic jump", "jump 0+328.97",
                  "OVERTOPPED", "TOO SHALLOW", "WATER SURFACE: CONTROLS", "HYDRAULIC JUMPS",
                  "outfall, 0+700.00: water level, level 45.86 m (depth 1.300 m), governs",
                  "control: water level 45.86 m"):
        assert words in text, words
    assert re.search(r"at 0\+328\.9\d: 0\.2\d\d m to 0\.5\d\d m over 3\.\d\d m \(oscillating", text)
