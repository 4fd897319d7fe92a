"""The design sheet PDF: what it prints (read back with pypdf), its fingerprint, signing, rendering.

The project is the shipped demo (resources/demo-project.json, an invented
site), with an invented title block filled in, printed in its own SI units and
as a US copy. Printed numbers are checked against independent computations:
Manning's equation solved here with scipy.optimize.brentq (Chow, V. T.,
Open-Channel Hydraulics, McGraw-Hill, 1959, Eq. 5-6), the relations of FHWA
HEC-15 (Kilgore and Cotton, Design of Roadside Channels with Flexible Linings,
3rd ed., 2005) written out here with their equation numbers, and a published
worked example.
"""

from __future__ import annotations

import copy
import datetime
import json
import math
import os
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest
from certs import make_test_certificate
from pypdf import PdfReader
from scipy.optimize import brentq

from app import project as P
from app.main import main
from app.sheet import approval_box, export_sheets, fingerprint, sheet_pdf, verify_pdf
from app.sheet.fingerprint import canonical_json, fingerprint_document
from app.sheet.section_drawing import choose_scale
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

DEMO_FILE = Path(str(P.demo_path()))
CHANNELS = ("East verge ditch", "North cut ditch", "Outfall swale", "Farm crossing pipe", "Surveyed outfall channel")
TITLE = P.SheetInfo(company="Example Engineering Co. (invented)", designer="A. Designer (invented)",
                    checker="B. Checker (invented)", approver="C. Approver, P.E. (invented)",
                    date_designed="2026-11-20", date_checked="2026-11-24", revision="B", project_number="INV-0417")
FOOT = 0.3048
G = 9.80665            # standard gravity [m/s^2]
GAMMA = 9810.0         # unit weight of water [N/m^3], HEC-15 SI value
GAMMA_STONE = 25900.0  # stone [N/m^3], HEC-15 Section 6.2
PSF = 47.880259        # Pa per lbf/ft^2 (NIST SP 811, 2008 ed., Appendix B.8)
GAMMA_WATER_PCF = GAMMA / 157.08746  # in lb/ft^3; 1 lbf/ft^3 = 157.087 N/m^3 (NIST SP 811, Appendix B.8)


@pytest.fixture(scope="module")
def project():
    """The demo project with an invented title block (the shipped demo leaves it for the user)."""
    proj = P.load(DEMO_FILE)
    proj.sheet = copy.deepcopy(TITLE)
    assert [c.name for c in proj.channels] == list(CHANNELS)
    return proj


@pytest.fixture(scope="module")
def sheet_file(project, tmp_path_factory):
    path = tmp_path_factory.mktemp("sheet") / "sheets.pdf"
    export_sheets(project, path, catalogue=SHIPPED)
    return path


@pytest.fixture(scope="module")
def pages(sheet_file):
    """{channel name: page text} of the demo in its own (SI) units."""
    return dict(zip(CHANNELS, (p.extract_text() for p in PdfReader(sheet_file).pages)))


@pytest.fixture(scope="module")
def us_pages(project, tmp_path_factory):
    """{channel name: page text} of a copy of the demo shown in US customary units."""
    proj = copy.deepcopy(project)
    proj.units = "us"
    path = tmp_path_factory.mktemp("sheet-us") / "sheets-us.pdf"
    export_sheets(proj, path, catalogue=SHIPPED)
    return dict(zip(CHANNELS, (p.extract_text() for p in PdfReader(path).pages)))


def _flat(text: str) -> str:
    return text.replace("\n", " ")


def _number_after(text: str, label: str) -> tuple[float, str]:
    """The number and unit printed after ``label`` on the sheet."""
    m = re.search(re.escape(label) + r"\s+(-?[0-9.]+)\s*([A-Za-z/³²]*)", text)
    assert m, f"{label!r} not found on the sheet"
    return float(m.group(1)), m.group(2)


def _approx3(expected: float, rel: float = 0.0):
    """A value printed to three significant figures: within half a unit of its last figure (plus ``rel``)."""
    unit = 10.0 ** (math.floor(math.log10(abs(expected))) - 2)
    return pytest.approx(expected, abs=0.5 * unit * 1.001 + rel * abs(expected))


def _rational_flow(channel) -> float:
    """Q = C i A [m^3/s] from the channel's flow basis (FHWA HEC-22, 3rd ed., 2009, Eq. 3-1, consistent SI units)."""
    b = channel.flow
    return b.runoff_coefficient * b.intensity * b.area


def _mannings_depth(b, z, q, n, s, k=1.0):
    """Normal depth of a trapezoid by brentq on Q = (k/n) A R^(2/3) S^(1/2) (Chow 1959, Eq. 5-6)."""
    def excess(y):
        area = (b + z * y) * y
        perim = b + 2 * y * math.sqrt(1 + z * z)
        return k / n * area * (area / perim) ** (2 / 3) * math.sqrt(s) - q

    return brentq(excess, 1e-6, 50.0, xtol=1e-12)


# ------------------------------------------------------------------ title block and results
def test_one_page_per_channel_with_title_block(project, pages):
    assert len(pages) == len(project.channels)
    info = project.sheet
    for i, (name, text) in enumerate(pages.items(), start=1):
        ch = project.channel(name)
        for value in (project.name.split(" (")[0], ch.name, ch.location, info.company.split(" (")[0],
                      info.designer, info.checker, info.approver, info.date_designed, info.date_checked,
                      info.project_number):
            assert value in text, f"{value!r} missing from sheet {i}"
        assert f"{i} of {len(pages)}" in text
        assert "REVISION" in text and info.revision in text
        for heading in ("TYPICAL SECTION", "INPUTS", "RESULTS", "RATING CURVE", "HAND CHECK", "LINING STABILITY",
                        "CAUTIONS", "SIGNATURE", "APPROVAL"):
            assert heading in text


def test_results_carry_units_us(us_pages):
    text = _flat(us_pages["Outfall swale"])
    for label, unit in (("Normal depth yn", "ft"), ("Critical depth yc", "ft"), ("Velocity V", "ft/s"),
                        ("Flow area A", "ft²"), ("Top width at top", "ft"), ("Design flow Q", "ft³/s"),
                        ("Top width T", "ft"), ("Total depth", "ft"), ("Freeboard", "ft"), ("Lined width", "ft"),
                        ("Bend radius Rc", "ft"), ("Minimum freeboard", "ft")):
        value, printed_unit = _number_after(text, label)
        assert math.isfinite(value)
        assert printed_unit == unit, f"{label}: unit {printed_unit!r}, expected {unit!r}"
    assert "Froude number Fr" in text and "Flow regime subcritical" in text
    assert "Manning's n used" in text
    for head in ("Design shear τ lb/ft²", "Permissible τp lb/ft²"):
        assert head in re.sub(r"\s+", " ", text), head
    assert re.search(r"Reason: stable, bend: [0-9.]+ lb/ft² against [0-9.]+ lb/ft² permissible", text)


def test_si_sheet_prints_si_units(pages):
    text = _flat(pages["North cut ditch"])
    assert _number_after(text, "Normal depth yn")[1] == "m"
    assert _number_after(text, "Velocity V")[1] == "m/s"
    assert _number_after(text, "Design flow Q")[1] == "m³/s"
    assert "Design shear τ  Pa" in text and "Permissible τp  Pa" in text
    assert re.search(r"Reason: not stable, side slopes: [0-9.]+ Pa against [0-9.]+ Pa permissible", text)
    assert re.search(r"Required D50 [0-9.]+ mm smallest stable", text)
    body = text.split("CAUTIONS")[0]
    assert not re.search(r"\d (ft|in|lb/ft²|ft/s|ft³/s)\b", body)  # no US unit in an SI sheet's body
    assert "2 of 5" in text


def test_printed_normal_depth_solves_mannings_equation(project, us_pages):
    # The outfall swale is lined with riprap, whose n depends on the depth (Blodgett, HEC-15 Eq. 6.1): the
    # printed depth must satisfy Manning's equation with the printed n (Chow 1959, Eq. 5-6, customary
    # constant 1.486 = (1/0.3048)^(1/3)), solved here with brentq for the rational-method flow.
    ch = project.channel("Outfall swale")
    text = _flat(us_pages["Outfall swale"])
    n = float(re.search(r"Manning's n used ([0-9.]+) \[1\]", text).group(1))
    y = _mannings_depth(ch.section["bottom_width"] / FOOT, ch.section["left_slope"], _rational_flow(ch) / FOOT ** 3,
                        n, ch.slope, k=1.486)
    printed, unit = _number_after(text, "Normal depth yn")
    assert unit == "ft"
    assert printed == _approx3(y, rel=1e-4)  # 1.486 vs 1.4859 moves the depth by about 0.004 %
    assert n != ch.manning_n  # with a lining, the lining's n is used, not the channel's


def test_published_trapezoid_example_prints_its_normal_depth(tmp_path):
    # Chow, Open-Channel Hydraulics (1959), Chapter 6, Example 6-2 (example number not verified):
    # b = 20 ft, z = 2, S = 0.0016, n = 0.025, Q = 400 ft^3/s -> yn = 3.36 ft.
    ch = P.Channel(name="Chow trapezoid", flow=P.FlowBasis(value=400 * FOOT ** 3), slope=0.0016,
                   section={"shape": "trapezoid", "bottom_width": 20 * FOOT, "left_slope": 2.0, "right_slope": 2.0},
                   manning_n=0.025, min_freeboard=1.0 * FOOT)
    proj = P.Project(name="Published example check", units="us", channels=[ch])
    data, _ = sheet_pdf(proj, catalogue=SHIPPED)
    out = tmp_path / "chow.pdf"
    out.write_bytes(data)
    text = PdfReader(out).pages[0].extract_text()
    value, unit = _number_after(text, "Normal depth yn")
    assert unit == "ft"
    assert value == pytest.approx(3.36, rel=0.005)
    # no lining: the typed n is used and the sheet says the stability was not checked
    assert "HYDRAULICS ONLY" in text and "Manning's n used 0.0250 (typed)" in text.replace("\n", " ")
    assert "Manning's n 0.025 (typed in the project)" in text.replace("\n", " ")


def test_symbols_print_and_extract(us_pages):
    text = us_pages["Outfall swale"]
    for symbol in ("Δ", "≥", "²", "³", "θ", "τ", "γ", "√"):
        assert symbol in text, f"{symbol!r} does not extract from the sheet"
    assert "Flow Q (ft³/s)" in text  # from the rating plot, through svglib with the sheet font


def test_only_the_sheet_font_is_used(sheet_file):
    reader = PdfReader(sheet_file)
    fonts = set()
    for page in reader.pages:
        res = page["/Resources"]
        for ref in res.get("/Font", {}).values():
            fonts.add(str(ref.get_object()["/BaseFont"]))
        for xo in (res.get("/XObject") or {}).values():
            for ref in (xo.get_object().get("/Resources", {}).get("/Font", {}) or {}).values():
                fonts.add(str(ref.get_object()["/BaseFont"]))
    assert fonts and all(f.endswith("+DejaVuSans") for f in fonts), fonts
    for f in fonts:
        assert "+" in f  # a subset tag: the font is embedded


def test_hand_check_numbers_agree_as_printed(us_pages):
    text = _flat(us_pages["Outfall swale"])
    y = float(re.search(r"At the normal depth y = ([0-9.]+) ft", text).group(1))
    m = re.search(r"A = \(b \+ z y\) y = \(([0-9.]+) \+ ([0-9.]+) × ([0-9.]+)\) × [0-9.]+ = ([0-9.]+) ft²", text)
    b, z, y2, area = (float(g) for g in m.groups())
    assert y2 == y
    assert (b + z * y) * y == pytest.approx(area, rel=5e-4)
    factor = float(re.search(r"A R\^\(2/3\) = [0-9.]+ × [0-9.]+\^\(2/3\) = ([0-9.]+)", text).group(1))
    target = float(re.search(r"Q n / \(k √S\) = [^=]+= ([0-9.]+)", text).group(1))
    assert factor == pytest.approx(target, rel=1e-3)
    # tau = gamma d S with the printed numbers (HEC-15, Kilgore and Cotton, 3rd ed., 2005, Eq. 3.1)
    g, d, s, tau = (float(v) for v in re.search(
        r"τd = γ d S = ([0-9.]+) lb/ft³ × ([0-9.]+) ft × ([0-9.]+) = ([0-9.]+) lb/ft²", text).groups())
    assert g * d * s == pytest.approx(tau, rel=2e-3)
    assert g == pytest.approx(GAMMA_WATER_PCF, rel=1e-3)  # 9810 N/m^3 in lb/ft^3
    # SF = tau_p / tau of the governing check, as printed in the shear-check table
    tp, td, sf = (float(v) for v in re.search(r"SF = τp / τ = ([0-9.]+) / ([0-9.]+) = ([0-9.]+) \(bend", text).groups())
    assert tp / td == pytest.approx(sf, abs=0.006)


def test_rational_flow_basis_is_printed(us_pages):
    text = _flat(us_pages["Outfall swale"])
    assert "rational method" in text and "runoff coefficient C 0.45" in text and "Time of concentration" in text
    m = re.search(r"Q = C i A u = ([0-9.]+) × ([0-9.]+) × ([0-9.]+) × ([0-9.]+) = ([0-9.]+) ft³/s", text)
    c, i, a, u, q = (float(v) for v in m.groups())
    # 1 acre-inch per hour in ft^3/s: 43560 ft^2 x (1/12) ft / 3600 s = 1.00833 (exact unit factors)
    assert u == pytest.approx(43560 / 12 / 3600, rel=1e-4)
    assert c * i * a * u == pytest.approx(q, rel=1e-3)  # i and A carry 4 figures


def test_cautions_and_out_of_range_warnings(pages, us_pages):
    from app.sheet.content import in_units
    from hydraulics.units import system

    text = _flat(us_pages["Outfall swale"])
    assert "Design assistance only" in text and "licensed" in text
    # the swale runs at 1.56 ft/s, below the 2 ft/s self-cleaning velocity (Chow 1959, Sec. 7-3, 2 to 3 ft/s,
    # not verified): flagged, restated in the sheet's units
    assert "Velocity 1.56 ft/s is below 2.00 ft/s, so silt may settle" in text
    # the evaluation's notes: the lining's own n replaces the channel's
    # (the n used as the results print it, app.results.PANEL_FIELDS)
    assert "Note: The lining's own n (0.0696) is used; the channel's Manning's n 0.035 applies only" in text
    # every SI amount in a US sheet's cautions has its US equivalent beside it (nothing left to annotate)
    cautions = text.split("CAUTIONS, NOTES AND SOURCES")[1].split("Design fingerprint")[0]
    assert in_units(cautions, system("us")) == cautions
    # near-critical flow (band 0.8 to 1.2, common practice, not verified): the gravel ditch at Fr 1.02
    assert re.search(r"Froude number 1\.0\d is near critical \(band 0\.8 to 1\.2", _flat(pages["North cut ditch"]))


# ------------------------------------------------------------------ fingerprint
def test_printed_fingerprint_equals_the_command(project, pages, capsys):
    for name, text in pages.items():
        printed = re.search(r"Design fingerprint SHA-256: ([0-9a-f]{64})", text).group(1)
        assert main(["fingerprint", str(DEMO_FILE), "--channel", name]) == 0
        assert capsys.readouterr().out.strip() == printed
    assert main(["fingerprint", str(DEMO_FILE)]) == 0
    lines = capsys.readouterr().out.strip().splitlines()
    assert [line.split("  ", 1)[1] for line in lines] == [c.name for c in project.channels]


def test_fingerprint_follows_design_inputs_only(project):
    ch = copy.deepcopy(project.channel("Outfall swale"))
    base = fingerprint(ch, catalogue=SHIPPED)
    renamed = copy.deepcopy(ch)
    renamed.name, renamed.location, renamed.notes = "Other name", "elsewhere", "a note"
    assert fingerprint(renamed, catalogue=SHIPPED) == base
    as_float = copy.deepcopy(ch)
    as_float.section = dict(ch.section, left_slope=4, right_slope=4)  # 4 and 4.0 are the same input
    assert fingerprint(as_float, catalogue=SHIPPED) == base
    steeper = copy.deepcopy(ch)
    steeper.slope = ch.slope * 1.001
    assert fingerprint(steeper, catalogue=SHIPPED) != base
    assert fingerprint(ch, version="9.9.9", catalogue=SHIPPED) != base
    doc = fingerprint_document(ch, catalogue=SHIPPED)
    assert doc.startswith('{"inputs":{') and '"program":"ditchwright"' in doc
    data = json.loads(doc)
    assert sorted(data["linings"]) == ["concrete", "grass_good_sod", "gravel", "riprap"]  # own and alternatives
    assert canonical_json(data) == doc  # canonical: sorted keys, no spaces between tokens


def test_fingerprint_of_a_damaged_file_is_a_one_line_error(tmp_path, capsys):
    bad = tmp_path / "bad.json"
    bad.write_text("{ not json")
    assert main(["fingerprint", str(bad)]) == 2
    err = capsys.readouterr().err
    assert "Traceback" not in err and err.count("\n") == 1


# ------------------------------------------------------------------ signing
@pytest.fixture(scope="module")
def certificate(tmp_path_factory):
    """A self-signed EC P-256 certificate made for the test, as PKCS#12 (password 'pw-test') and PEM."""
    p12, pem, cert = make_test_certificate(tmp_path_factory.mktemp("cert"), "Test Engineer (invented)")
    return p12, pem


@pytest.fixture(scope="module")
def signed_file(project, certificate, tmp_path_factory):
    p12, _ = certificate
    path = tmp_path_factory.mktemp("signed") / "signed.pdf"
    export_sheets(project, path, sign=(p12, "pw-test"), catalogue=SHIPPED)
    return path


def test_signed_sheet_validates(signed_file, certificate, capsys):
    _, pem = certificate
    report = verify_pdf(signed_file, trust=pem)
    assert report.ok
    (sig,) = report.signatures
    assert sig.intact and sig.valid and sig.covers_whole_file and sig.trusted
    assert sig.signer == "Test Engineer (invented)"
    assert main(["verify", str(signed_file), "--trust", str(pem)]) == 0
    out = capsys.readouterr().out
    assert "Test Engineer (invented)" in out and "INTACT AND VALID" in out


def test_stamp_sits_in_the_approval_box(signed_file):
    reader = PdfReader(signed_file)
    widgets = [a.get_object() for a in reader.pages[0].get("/Annots", []) if a.get_object().get("/FT") == "/Sig"]
    assert len(widgets) == 1
    rect = [float(v) for v in widgets[0]["/Rect"]]
    x1, y1, x2, y2 = approval_box("letter")
    assert rect == pytest.approx([round(x1), round(y1), round(x2), round(y2)], abs=0.01)
    appearance = widgets[0]["/AP"]["/N"].get_object()  # the visible stamp
    bbox = [float(v) for v in appearance["/BBox"]]
    assert abs(bbox[2] - bbox[0]) > 50 and abs(bbox[3] - bbox[1]) > 50


def test_one_changed_byte_fails_validation(signed_file, certificate, tmp_path, capsys):
    _, pem = certificate
    data = bytearray(signed_file.read_bytes())
    text = bytes(data)
    i = text.index(b"CHANNEL DESIGN SHEET") if b"CHANNEL DESIGN SHEET" in text else len(data) // 3
    data[i] ^= 0x01
    changed = tmp_path / "changed.pdf"
    changed.write_bytes(bytes(data))
    report = verify_pdf(changed, trust=pem)
    assert not report.ok
    assert not report.signatures[0].intact
    assert main(["verify", str(changed), "--trust", str(pem)]) == 1
    assert "NOT VALID" in capsys.readouterr().out


def test_other_trust_anchor_is_not_trusted(signed_file, tmp_path):
    from cryptography import x509
    from cryptography.hazmat.primitives import hashes, serialization
    from cryptography.hazmat.primitives.asymmetric import ec
    from cryptography.x509.oid import NameOID

    key = ec.generate_private_key(ec.SECP256R1())
    name = x509.Name([x509.NameAttribute(NameOID.COMMON_NAME, "Someone else")])
    now = datetime.datetime.now(datetime.timezone.utc)
    cert = (x509.CertificateBuilder().subject_name(name).issuer_name(name).public_key(key.public_key())
            .serial_number(1).not_valid_before(now).not_valid_after(now + datetime.timedelta(days=1))
            .sign(key, hashes.SHA256()))
    other = tmp_path / "other.pem"
    other.write_bytes(cert.public_bytes(serialization.Encoding.PEM))
    report = verify_pdf(signed_file, trust=other)
    assert report.signatures[0].intact and report.signatures[0].trusted is False and not report.ok


def test_unsigned_sheet_does_not_verify(sheet_file, capsys):
    assert main(["verify", str(sheet_file)]) == 1
    assert "not signed" in capsys.readouterr().out


def test_cli_signs_with_password_from_environment(certificate, tmp_path, monkeypatch, capsys):
    p12, pem = certificate
    out = tmp_path / "cli.pdf"
    monkeypatch.setenv("DITCHWRIGHT_CERT_PASSWORD", "pw-test")
    assert main(["sheet", str(DEMO_FILE), "--channel", "Outfall swale", "-o", str(out),
                 "--sign", str(p12), "--page", "a4"]) == 0
    assert verify_pdf(out, trust=pem).ok
    box = PdfReader(out).pages[0].mediabox
    assert (float(box.width), float(box.height)) == pytest.approx((595.2756, 841.8898), abs=0.01)  # ISO 216 A4
    monkeypatch.setenv("DITCHWRIGHT_CERT_PASSWORD", "wrong")
    assert main(["sheet", str(DEMO_FILE), "-o", str(tmp_path / "x.pdf"), "--sign", str(p12)]) == 2
    err = capsys.readouterr().err
    assert "wrong password" in err and "Traceback" not in err
    assert not (tmp_path / "x.pdf").exists()


def test_cli_without_password_and_terminal_refuses(certificate, tmp_path, monkeypatch, capsys):
    p12, _ = certificate
    monkeypatch.delenv("DITCHWRIGHT_CERT_PASSWORD", raising=False)
    monkeypatch.setattr(sys, "stdin", open(os.devnull))
    assert main(["sheet", str(DEMO_FILE), "-o", str(tmp_path / "x.pdf"), "--sign", str(p12)]) == 2
    assert "DITCHWRIGHT_CERT_PASSWORD" in capsys.readouterr().err


@pytest.mark.parametrize("argv, message", [
    (["sheet", str(DEMO_FILE), "-o", "x.pdf", "--channel", "No such ditch"], "no channel named"),
    (["sheet", "missing-project.json", "-o", "x.pdf"], "no such file"),
    (["sheet", str(DEMO_FILE), "-o", "x.txt"], ".pdf"),
    (["verify", "missing.pdf"], "no such file"),
    (["verify", str(DEMO_FILE)], "not a readable PDF"),
], ids=["unknown-channel", "missing-project", "not-pdf", "missing-sheet", "not-a-pdf"])
def test_cli_bad_input_exits_2_in_one_line(argv, message, tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    assert main(argv) == 2
    err = capsys.readouterr().err
    assert message in err and "Traceback" not in err


def test_unsolvable_channel_exits_3(tmp_path, capsys):
    ch = P.Channel(name="Too small pipe", flow=P.FlowBasis(value=5.0), slope=0.001,
                   section={"shape": "circle", "diameter": 0.3}, manning_n=0.013)
    path = tmp_path / "pipe.json"
    P.save(P.Project(name="Invented pipe", channels=[ch]), path)
    assert main(["sheet", str(path), "-o", str(tmp_path / "pipe.pdf")]) == 3
    assert "Traceback" not in capsys.readouterr().err


# ------------------------------------------------------------------ drawing and rendering
def test_section_scale_is_the_smallest_round_one_that_fits():
    assert choose_scale(30, us=True) == (36, "1 in = 3 ft (1:36)")
    assert choose_scale(36, us=True)[0] == 36
    assert choose_scale(21, us=False) == (25, "1:25")


def test_every_page_renders_with_pdftoppm(signed_file, tmp_path):
    exe = shutil.which("pdftoppm")
    if exe is None:
        if os.environ.get("CI"):
            pytest.fail("pdftoppm (Debian poppler-utils) is needed in CI")
        pytest.skip("pdftoppm (poppler-utils) not installed here")
    n = len(PdfReader(signed_file).pages)
    subprocess.run([exe, "-png", "-r", "40", str(signed_file), str(tmp_path / "page")], check=True,
                   capture_output=True, timeout=120)
    pngs = sorted(tmp_path.glob("page-*.png"))
    assert len(pngs) == n
    assert all(p.stat().st_size > 2000 for p in pngs)


def test_sheet_package_needs_no_qt():
    code = ("import sys, app.sheet, app.sheet.layout, app.cli.sheet; "
            "print(','.join(m for m in ('PySide6', 'PyQt5', 'PyQt6') if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True,
                         cwd=Path(__file__).parent.parent)
    assert out.stdout.strip() == ""


# ------------------------------------------------------------------ lining catalogue and logo
def test_stone_lining_from_the_catalogue_sets_n_and_thickness(tmp_path):
    # Riprap D50 = 150 mm with no n typed: n comes from the catalogue's stone relation, and the
    # layer is drawn 1.5 D50 = 225 mm thick (common practice; HEC-15, 3rd ed., Section 6.4, not verified).
    ch = P.Channel(name="Riprap chute (invented)", flow=P.FlowBasis(value=0.7), slope=0.04,
                   section={"shape": "trapezoid", "bottom_width": 1.0, "left_slope": 2.0, "right_slope": 2.0},
                   lining=P.LiningChoice("riprap", 0.15), manning_n=None)
    proj = P.Project(name="Invented chute", units="si", channels=[ch])
    path = tmp_path / "chute.pdf"
    export_sheets(proj, path, catalogue=SHIPPED)
    text = PdfReader(path).pages[0].extract_text().replace("\n", " ")
    # stone sizes to a tenth of a mm, as the window's results panel writes them (app.results.PANEL_FIELDS)
    assert "Rock riprap, D50 150.0 mm" in text
    assert "layer thickness t 225.0 mm" in text  # 1.5 D50
    assert re.search(r"Manning's n used [0-9.]+ \[1\]", text)
    assert "[1] Manning n: " in text and "[2] permissible shear: HEC-15" in text


def _image_count(path) -> int:
    count = 0
    for page in PdfReader(path).pages:
        for xo in (page["/Resources"].get("/XObject") or {}).values():
            if xo.get_object().get("/Subtype") == "/Image":
                count += 1
    return count


def test_logo_slot_is_empty_unless_the_user_fills_it(project, tmp_path):
    from PIL import Image

    plain = tmp_path / "plain.pdf"
    export_sheets(project, plain, channels=project.channels[0].name, catalogue=SHIPPED)
    assert _image_count(plain) == 0  # no default brand
    logo = tmp_path / "logo.png"
    Image.new("RGB", (60, 30), (20, 90, 160)).save(logo)
    proj = copy.deepcopy(project)
    proj.sheet.logo = str(logo)
    with_logo = tmp_path / "logo.pdf"
    assert export_sheets(proj, with_logo, channels=project.channels[0].name, catalogue=SHIPPED) == []
    assert _image_count(with_logo) == 1
    proj.sheet.logo = str(tmp_path / "missing.png")
    notes = export_sheets(proj, tmp_path / "nologo.pdf", channels=project.channels[0].name, catalogue=SHIPPED)
    assert notes and "logo file not found" in notes[0]


# ------------------------------------------------------------------ lining stability block
def _check_row(text: str, location: str) -> list:
    """(design shear, permissible, SF achieved, SF required, result) of one row of the shear-check table."""
    m = re.search(re.escape(location) + r"\s+([0-9.]+)\s+([0-9.]+|non-erodible)\s+([0-9.]+|—)\s+([0-9.]+|—)\s+"
                  r"(passes|FAILS|non-erodible)", text)
    assert m, f"no check row for {location!r}"
    return list(m.groups())


def _k1(z):
    """Side-slope shear factor, K1 = 0.066 Z + 0.67 for 1.5 < Z < 5 (HEC-15 Eq. 3.4, not verified)."""
    return 0.066 * z + 0.67


def _kb(rc_t):
    """Bend shear factor, Kb = 2.38 - 0.206 Rc/T + 0.0073 (Rc/T)^2 for 2 < Rc/T < 10 (HEC-15 Eq. 3.5, not verified)."""
    return 2.38 - 0.206 * rc_t + 0.0073 * rc_t ** 2


def test_stability_block_reads_back_with_units(project, pages):
    text = _flat(pages["Outfall swale"])
    assert "LINING STABILITY" in text and "STABLE" in text and "NOT STABLE" not in text
    assert "Design shear τ  Pa" in text and "Permissible τp  Pa" in text
    assert re.search(r"SF\s+achieved\s+SF\s+required\s+Result\s+\(SF ≥ required\)", text)
    ch = project.channel("Outfall swale")
    y = _number_after(text, "Normal depth yn")[0]
    bed, sides, bend = (_check_row(text, loc) for loc in ("bed", "side slopes", "bend"))
    # bed shear tau = gamma y S at the printed depth (HEC-15, 3rd ed., Eq. 3.1)
    assert float(bed[0]) == pytest.approx(GAMMA * y * ch.slope, rel=3e-3)
    assert float(sides[0]) == pytest.approx(_k1(4.0) * float(bed[0]), rel=3e-3)  # Z = 4: K1 = 0.934
    rc_t = float(re.search(r"Kb = [0-9.]+ \(Rc/T = ([0-9.]+)\)", text).group(1))
    kb = float(re.search(r"Kb ([0-9.]+);", text).group(1))
    assert kb == pytest.approx(_kb(rc_t), rel=2e-3)
    assert float(bend[0]) == pytest.approx(kb * float(bed[0]), rel=3e-3)
    # riprap D50 = 150 mm: tau_p = F* (gamma_s - gamma) D50 with F* = 0.047 below Re* = 4e4 (HEC-15 Eq. 6.7 and
    # Table 6.1, table not verified); on the 4H:1V sides times K2 = (1 - sin^2 theta / sin^2 phi)^(1/2) with the
    # 42 degree angle of repose of the catalogue (HEC-15 Section 6.3, not verified)
    reynolds = float(re.search(r"particle Reynolds number Re\* ([0-9.]+): F\* 0\.047", text).group(1))
    assert reynolds < 4e4
    tau_p = 0.047 * (GAMMA_STONE - GAMMA) * 0.15
    assert float(bed[1]) == _approx3(tau_p)
    k2 = math.sqrt(1 - math.sin(math.atan(1 / 4)) ** 2 / math.sin(math.radians(42)) ** 2)
    assert float(sides[1]) == _approx3(k2 * tau_p)
    for row in (bed, sides, bend):
        design, permissible, sf, required, result = row
        # SF = tau_p / tau from the unrounded shears: the shears printed to 0.01 (the results panel's rounding,
        # app.results.PANEL_FIELDS) give it to within their rounding
        ratio = float(permissible) / float(design)
        rounding = 0.005 / float(permissible) + 0.005 / float(design)
        assert float(sf) == pytest.approx(ratio, abs=ratio * rounding + 0.005)
        assert float(required) == 1.0 and result == "passes"
    # the verdict's reason names the governing check with its units, and the smallest stable stone
    assert re.search(r"Reason: stable, bend: 53\.3 Pa against 113 Pa permissible \(safety factor 2\.13, 1\.00 "
                     r"needed\); smallest stable D50 55\.8 mm \(given 150 mm\)", text)
    assert "Required D50 55.8 mm smallest stable, given D50 enough" in text
    assert "layer thickness t 225.0 mm" in text  # 1.5 D50 (common practice)
    # freeboard: the minimum plus the superelevation V^2 T / (g Rc) (HEC-15 Section 3.4, not verified)
    m = re.search(r"Freeboard ([0-9.]+) m = minimum 0\.200 m \+ superelevation ([0-9.]+) m \[(\d)\]", text)
    fb, se, ref = float(m.group(1)), float(m.group(2)), m.group(3)
    v, t = _number_after(text, "Velocity V")[0], _number_after(text, "Top width T")[0]
    # printed V and T carry the results' decimals (app.results.PANEL_FIELDS: 2 and 3): V^2 T within their rounding
    assert se == pytest.approx(v ** 2 * t / (G * ch.bend_radius), rel=2 * 0.005 / v + 0.0005 / t + 0.002)
    assert fb == pytest.approx(0.200 + se, abs=0.0006)
    assert f"[{ref}] freeboard: minimum freeboard 0.200 m (HEC-22 (2009) Section 5.2.4" in text
    total = _number_after(text, "Total depth")[0]
    assert total == pytest.approx(y + fb, abs=0.0011)
    # top width at the top of the ditch: b + 2 Z (total depth), trapezoid geometry
    assert _number_after(text, "Top width at top")[0] == pytest.approx(1.0 + 2 * 4 * total, rel=3e-3)
    # length of protection below the bend, Lp = 0.736 R^(7/6) / n (SI; HEC-15 Section 3.4, not verified)
    r, n = _number_after(text, "Hydraulic radius R")[0], float(re.search(r"Manning's n used ([0-9.]+)", text).group(1))
    lp = float(re.search(r"protect ([0-9.]+) m downstream", text).group(1))
    assert lp == pytest.approx(0.736 * r ** (7 / 6) / n, rel=6e-3)


def test_failing_stone_lining_prints_not_stable_and_the_required_d50(project, pages, us_pages):
    text = _flat(pages["North cut ditch"])
    assert "NOT STABLE" in text
    bed, sides = _check_row(text, "bed"), _check_row(text, "side slopes")
    assert bed[4] == "FAILS" and sides[4] == "FAILS"
    # gravel D50 = 25 mm: tau_p = 0.047 (gamma_s - gamma) D50 (HEC-15 Eq. 6.7, F* below Re* = 4e4, Table 6.1)
    reynolds = float(re.search(r"particle Reynolds number Re\* ([0-9.]+): F\* ([0-9.]+)", text).group(1))
    assert reynolds < 4e4 and "F* 0.047" in text
    assert float(bed[1]) == _approx3(0.047 * (GAMMA_STONE - GAMMA) * 0.025)
    m = re.search(r"Reason: not stable, side slopes: ([0-9.]+) Pa against ([0-9.]+) Pa permissible "
                  r"\(safety factor ([0-9.]+), 1\.00 needed\); smallest stable D50 ([0-9.]+) mm \(given 25\.0 mm\)",
                  text)
    assert m, "the reason of a failing lining"
    # the reason (the core's three figures) and the check table (the results panel's 0.01) give the same values
    for worded, printed in zip(m.groups()[:3], sides[:3]):
        assert float(worded) == _approx3(float(printed), rel=0.005 / float(printed))
    # required D50 with its parts; the bed part by HEC-15 Eq. 6.8, D50 = SF tau / (F* (gamma_s - gamma)),
    # SF = 1.0 and F* = 0.047 (Table 6.1, not verified), at the printed depth of the required state
    # (stone sizes in mm to a tenth, the depth in m to a thousandth: the results panel's rounding)
    req = re.search(r"Required D50 ([0-9.]+) mm smallest stable, given D50 too small "
                    r"\(bed ([0-9.]+) mm, side slopes ([0-9.]+) mm at depth ([0-9.]+) m; HEC-15 Eq. 6.8\)", text)
    assert req, "the required D50"
    d_mm, d_bed, d_side, depth = (float(v) for v in req.groups())
    assert float(m.group(4)) == _approx3(d_mm, rel=0.05 / d_mm)   # the reason's three figures of the tenth
    assert d_mm == max(d_bed, d_side)
    slope = project.channel("North cut ditch").slope
    assert d_bed / 1000 == pytest.approx(GAMMA * depth * slope / (0.047 * (GAMMA_STONE - GAMMA)), rel=4e-3)
    assert "layer thickness t 37.5 mm" in text  # 1.5 D50 = 37.5 mm (common practice)
    assert "Note: Place a granular filter or a geotextile beneath the stone" in text
    # the same in US units: the reason and the required size in ft (and inches)
    us = _flat(us_pages["North cut ditch"])
    assert re.search(r"Reason: not stable, side slopes: [0-9.]+ lb/ft² against [0-9.]+ lb/ft² permissible", us)
    assert re.search(r"Required D50 ([0-9.]+) in smallest stable", us)


def test_rigid_lining_is_non_erodible(pages):
    text = _flat(pages["East verge ditch"])
    assert "NON-ERODIBLE" in text
    assert "Reason: non-erodible: Concrete, float finish (general paved ditch) is a rigid lining" in text
    assert _check_row(text, "bed")[1:4] == ["non-erodible", "—", "—"]


def test_channel_without_lining_is_hydraulics_only(pages):
    for name, n_words in (("Farm crossing pipe", "0.013 (typed in the project)"),
                          ("Surveyed outfall channel", "the survey's own, per segment: 0.045, 0.035")):
        text = _flat(pages[name])
        assert "HYDRAULICS ONLY" in text and "Reason: no lining chosen" in text
        assert n_words in text


# ------------------------------------------------------------------ lining comparison
def _comparison_row(text: str, name: str) -> list:
    m = re.search(re.escape(name) + r"\s+([0-9.]+)\s+([0-9.]+)\s+([0-9.]+)\s+([0-9.]+)\s+([0-9.]+)\s+"
                  r"([0-9.]+|non-erodible)\s+([0-9.]+ / [0-9.]+|—)\s+(Stable|Not stable|Non-erodible)", text)
    assert m, f"no comparison row for {name!r}"
    return list(m.groups())


def test_comparison_table_reads_back_with_units(project, pages, us_pages):
    text = _flat(pages["Outfall swale"])
    assert "LINING COMPARISON" in text
    assert [name for name, t in pages.items() if "LINING COMPARISON" in t] == ["Outfall swale"]
    for head in ("Depth  m", "V m/s", "τ Pa", "τp Pa", "Lined  m", "Layer m³/m", "SF / req."):
        assert head in text, head
    table = text.split("LINING COMPARISON")[1].split("CAUTIONS")[0]
    # the channel's lining is repeated among the alternatives of the demo: one row only
    # (named as in the window's lining list and in ditchwright compare: the one comparison table)
    assert table.count("Rock riprap, D50 150.0 mm") == 1
    own = _comparison_row(table, "* Rock riprap, D50 150.0 mm")
    grass = _comparison_row(table, "Grass, sod-forming, good stand, about 150 mm tall")
    gravel = _comparison_row(table, "Gravel mulch, D50 25.0 mm")
    concrete = _comparison_row(table, "Concrete, float finish (general paved ditch)")
    # the channel's own lining agrees with the stability block and the results
    assert float(own[1]) == _number_after(text, "Normal depth yn")[0] and own[7] == "Stable"
    bend = _check_row(text, "bend")
    # the shears agree with the check table's within its three figures (the comparison prints the decimals of
    # the one comparison table, as the window and ditchwright compare do)
    assert [float(v) for v in own[4:6]] == [_approx3(float(v)) for v in bend[0:2]]
    assert own[6] == f"{bend[2]} / {bend[3]}"
    # concrete: constant n, so the depth is Manning's with that n (Chow 1959, Eq. 5-6), solved by brentq
    ch = project.channel("Outfall swale")
    y = _mannings_depth(1.0, 4.0, _rational_flow(ch), float(concrete[0]), ch.slope)
    assert float(concrete[1]) == _approx3(y)
    # a non-erodible lining has no governing check: its row shows the bed, tau = gamma y S (HEC-15 Eq. 3.1)
    assert float(concrete[4]) == _approx3(GAMMA * y * ch.slope)
    assert concrete[5:8] == ["non-erodible", "—", "Non-erodible"]
    # grass: tau_p = tau_p,soil / (1 - CF) (n / ns)^2 (HEC-15 Eq. 4.7, not verified) with the fine soil of the
    # catalogue, tau_p,soil = 1.0 Pa, the cover factor of a good sod, CF = 0.9 (HEC-15 Table 4.5, not verified)
    # and the soil grain roughness ns = 0.016 (HEC-15 Chapter 4, not verified)
    assert float(grass[5]) == _approx3(1.0 / (1 - 0.9) * (float(grass[0]) / 0.016) ** 2, rel=3e-3)
    # gravel fails in the bend and names the stone it would need
    assert gravel[7] == "Not stable" and re.search(r"Not stable \(bend\); needs D50 ≥ 55\.8 mm", table)
    # riprap: rougher than concrete, so deeper and slower
    assert float(own[1]) > float(concrete[1]) and float(own[2]) < float(concrete[2])
    assert "No cost column" in text
    us = re.sub(r"\s+", " ", us_pages["Outfall swale"])
    for head in ("Depth ft", "V ft/s", "τ lb/ft²", "τp lb/ft²", "Lined ft", "Layer ft³/ft"):
        assert head in us, head


# ------------------------------------------------------------------ user catalogue: fingerprint and costs
USER_CATALOGUE = """schema_version = 1
[[lining]]
key = "riprap"
unit_cost = 120.0
"""


def test_lining_entry_changes_the_fingerprint_and_prices_the_comparison(project, tmp_path, capsys):
    from app.evaluate import load_default_catalogue

    user = tmp_path / "prices.toml"
    user.write_text(USER_CATALOGUE)
    priced = load_default_catalogue(user)
    ch = project.channel("Outfall swale")
    shipped = fingerprint(ch, catalogue=SHIPPED)
    assert fingerprint(ch, catalogue=priced) != shipped  # a changed entry of a lining the channel uses
    paved = project.channel("East verge ditch")
    # riprap not used there: no change
    assert fingerprint(paved, catalogue=priced) == fingerprint(paved, catalogue=SHIPPED)

    out = tmp_path / "priced.pdf"
    assert main(["sheet", str(DEMO_FILE), "--channel", ch.name, "-o", str(out), "--user-catalogue",
                 str(user)]) == 0
    capsys.readouterr()
    text = _flat(PdfReader(out).pages[0].extract_text())
    printed = re.search(r"Design fingerprint SHA-256: ([0-9a-f]{64})", text).group(1)
    assert main(["fingerprint", str(DEMO_FILE), "--channel", ch.name, "--user-catalogue", str(user)]) == 0
    assert capsys.readouterr().out.strip() == printed
    assert main(["fingerprint", str(DEMO_FILE), "--channel", ch.name]) == 0
    assert capsys.readouterr().out.strip() == shipped != printed
    assert "linings.toml + prices.toml" in text
    # the cost column: $120 per m^3 of layer times the printed layer volume per m of channel
    assert re.search(r"Cost\s+\$/m", text) and "No cost column" not in text
    m = re.search(r"\* Rock riprap, D50 150\.0 mm.*?Stable \(bend\)\s+([0-9.]+)\s+([0-9.]+)\s+([0-9.,]+)", text)
    layer, cost = float(m.group(2)), float(m.group(3).replace(",", ""))
    assert cost == pytest.approx(120.0 * layer, rel=5e-3)


def test_fingerprint_refuses_an_unknown_lining_in_one_line(tmp_path, capsys):
    ch = P.Channel(name="Odd ditch", lining=P.LiningChoice("no_such_lining"), manning_n=None)
    path = tmp_path / "odd.json"
    P.save(P.Project(name="Invented", channels=[ch]), path)
    assert main(["fingerprint", str(path)]) == 2
    err = capsys.readouterr().err
    assert "no_such_lining" in err and "Traceback" not in err and err.count("\n") == 1


# ------------------------------------------------------------------ layout fallback and units in core sentences
def test_long_comparison_stays_on_one_page(tmp_path):
    from hydraulics.linings import load_catalogue

    keys = [lin.key for lin in load_catalogue() if not lin.user_data]
    ch = P.Channel(name="Many linings (invented)", flow=P.FlowBasis(value=0.5), slope=0.01,
                   section={"shape": "trapezoid", "bottom_width": 0.6, "left_slope": 3.0, "right_slope": 3.0},
                   lining=P.LiningChoice("riprap", 0.1), manning_n=None, bend_radius=20.0,
                   alternatives=[P.LiningChoice(k) for k in keys if k != "riprap"])
    data, _ = sheet_pdf(P.Project(name="Invented comparison", units="us", channels=[ch]), catalogue=SHIPPED)
    out = tmp_path / "many.pdf"
    out.write_bytes(data)
    reader = PdfReader(out)
    assert len(reader.pages) == 1
    text = reader.pages[0].extract_text().replace("\n", " ")
    from app.evaluate import evaluate_channel

    from app.comparison_table import comparison_table
    from app.context import Context
    from hydraulics.units import US

    # the linings as the sheet names them: the one comparison table's names (grass heights in inches here)
    design = evaluate_channel(ch, catalogue=SHIPPED)
    names = [r.name for r in comparison_table(design.comparison, Context(load_catalogue(), US)).rows]
    shown = [nm for nm in names if nm in text.split("CAUTIONS")[0]]
    assert len(shown) == len(names), set(names) - set(shown)  # every lining is in a row or in the note
    assert "about 6 in tall" in text and "150 mm" not in text   # the good-stand grass, 150 mm = 5.9 in


def test_core_sentences_get_the_sheet_units():
    from app.sheet.content import in_units
    from hydraulics.units import system

    us, si = system("us"), system("si")
    # 1 Pa = 1 / 47.880 lb/ft^2 and 25 mm = 0.984 in (exact inch 25.4 mm; NIST SP 811, Appendix B.8)
    assert in_units("soil permissible shear 1 Pa here", us) == "soil permissible shear 1 Pa (0.0209 lb/ft²) here"
    assert in_units("D50 = 25 mm is small", us) == "D50 = 25 mm (0.984 in) is small"
    assert in_units("the depth (0.5 m) is", us) == "the depth (0.5 m (1.64 ft)) is"
    # equivalents already given are left alone, and an SI system is left as it is
    for text in ("about 0.15 m (0.5 ft) for", "of 2 to 3 ft/s (0.6 to 0.9 m/s) (not verified)",
                 "velocity 0.50 m/s (1.63 ft/s) is below", "5.42 min by Kirpich"):
        assert in_units(text, us) == text
    assert in_units("soil permissible shear 1 Pa, 25 900 N/m^3", si) == "soil permissible shear 1 Pa, 25 900 N/m³"
    assert in_units("25 900 N/m^3", us) == "25 900 N/m³"  # a number with a thousands space is not split


def _drawing_matches_tables(text: str) -> None:
    """The drawing's labels print the same numbers as the tables (one rounding for each value)."""
    flat = _flat(text)
    drawing, tables = flat.split("INPUTS")[0], flat.split("INPUTS", 1)[1]
    assert _number_after(drawing, "yn") == _number_after(tables, "Normal depth yn")
    for in_drawing, in_table in (("top width", "Top width at top"), ("total depth", "Total depth"),
                                 ("freeboard", "Freeboard"), ("yc", "Critical depth yc"), ("diameter D", "diameter D"),
                                 ("b", "bottom width b")):
        if re.search(r"(?<!\w)" + re.escape(in_drawing) + r"\s+[0-9]", drawing):  # a pipe has no total depth
            assert _number_after(drawing, in_drawing) == _number_after(tables, in_table), in_drawing


def test_drawing_labels_round_as_the_tables(pages, us_pages):
    for text in [*pages.values(), *us_pages.values()]:
        _drawing_matches_tables(text)
    # the surveyed section: the top width is that at the top of the ditch, not the width of the survey (6.8 m)
    assert _number_after(pages["Surveyed outfall channel"], "Top width at top")[0] < 6.8


def test_values_not_yet_verified_are_marked_and_listed_once(pages, us_pages):
    """Every place cited from a value not yet read in its publication carries the mark, and the sheet lists
    those places once, under one heading (hydraulics/provenance.py holds the register)."""
    from hydraulics import provenance as pv
    for text in (*pages.values(), *us_pages.values()):
        flat = _flat(text)
        assert pv.unmarked(flat) == []
        if not pv.cited_not_verified([flat]):   # a page that cites only verified values has no such list
            assert pv.NOT_VERIFIED_TITLE not in flat
            continue
        assert flat.count(pv.NOT_VERIFIED_TITLE) == 1
        listed = flat.split(pv.NOT_VERIFIED_TITLE)[1].split("Design fingerprint")[0]
        cited = flat.replace(listed, "")
        for key in pv.cited_not_verified([cited]):
            assert pv.cite(key) in listed, key
    swale = _flat(pages["Outfall swale"]).split(pv.NOT_VERIFIED_TITLE)[1]
    assert "HEC-15 Table 6.1" + pv.NOT_VERIFIED_MARK in swale and "HEC-15 Section 3.4" + pv.NOT_VERIFIED_MARK in swale


def test_supercritical_freeboard_is_said_to_be_the_flow_depth(pages):
    """East verge ditch runs supercritical (concrete, 1.2 %): its freeboard is the flow depth, and the sheet says
    which rule set it (HEC-15 Section 2.1.1: waves whose height approaches the depth of flow)."""
    text = _flat(pages["East verge ditch"])
    yn = _number_after(text, "Normal depth yn")[0]
    assert _number_after(text, "Freeboard")[0] == yn
    assert "the flow depth (supercritical flow: waves as high as the depth)" in text
    assert "raised to" in text and ", the minimum" not in text


def test_each_page_text_is_built_once_per_text_size(monkeypatch):
    """The page's text does not depend on the rating curve's height, so fitting the page builds and measures it
    once per text size tried, never once per (size, curve height) pair (issue: sheet speed)."""
    import app.sheet.layout as layout

    calls, fitted = [], []
    real_build, real_fit = layout._build, layout._fit_blocks
    monkeypatch.setattr(layout, "_build", lambda sheet, size, *rest: calls.append(size) or real_build(sheet, size, *rest))
    monkeypatch.setattr(layout, "_fit_blocks", lambda *a: fitted.append(real_fit(*a)) or fitted[-1])
    demo = P.load(DEMO_FILE)
    sheet_pdf(demo, runs=(), catalogue=SHIPPED)
    assert len(fitted) == len(demo.channels)
    tried = sum(layout.TEXT_SIZES.index(size) + 1 for _, size, _ in fitted)   # sizes tried, largest first
    assert len(calls) == tried


def test_a_sheet_crowded_with_cautions_leaves_out_the_comparison_table_and_names_its_linings(tmp_path):
    """A trickle on a 1:1 grade in a wide bend gathers so many cautions that a letter page held no comparison
    table: the sheet was refused. Now the table goes and a line names each lining with its verdict (invented
    channel, found by a random search over project files)."""
    data = {"format": "ditchwright-project", "schema_version": 2, "name": "x", "units": "si",
            "channels": [{"name": "C", "flow": {"method": "typed", "value": 1e-06}, "slope": 1.0,
                          "section": {"shape": "rectangle", "bottom_width": 0.3}, "lining": {"key": "concrete"},
                          "bend_radius": 100000.0, "min_freeboard": 0.27, "alternatives": [{"key": "gravel"}]}]}
    src, out = tmp_path / "crowded.json", tmp_path / "crowded.pdf"
    src.write_text(json.dumps(data), encoding="utf-8")
    assert main(["sheet", str(src), "-o", str(out)]) == 0
    (page,) = PdfReader(out).pages
    text = _flat(page.extract_text())
    assert "The table is left out, its 2 linings named here for lack of room:" in text
    assert "(the channel's lining): Non-erodible" in text and "D50 25.0 mm: Not stable (side slopes)" in text
    between = text.split("LINING COMPARISON")[1].split("CAUTIONS, NOTES AND SOURCES")[0]
    assert between.strip().startswith("The table is left out")           # no table under the heading
