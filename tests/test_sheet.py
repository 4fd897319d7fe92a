"""The design sheet PDF: what it prints (read back with pypdf), its fingerprint, signing, rendering.

The project used is invented (tests/data/invented-sheet-project.json). Printed
numbers are checked against independent computations: Manning's equation
solved here with scipy.optimize.brentq (Chow, V. T., Open-Channel Hydraulics,
McGraw-Hill, 1959, Eq. 5-6, customary constant 1.486 = (1/0.3048)^(1/3)) and a
published worked example.
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
from pypdf import PdfReader
from scipy.optimize import brentq

from app import project as P
from app.main import main
from app.sheet import approval_box, export_sheets, fingerprint, sheet_pdf, verify_pdf
from app.sheet.fingerprint import canonical_json, fingerprint_document
from app.sheet.section_drawing import choose_scale

DATA = Path(__file__).parent / "data"
PROJECT_FILE = DATA / "invented-sheet-project.json"
FOOT = 0.3048


@pytest.fixture(scope="module")
def project():
    return P.load(PROJECT_FILE)


@pytest.fixture(scope="module")
def sheet_file(project, tmp_path_factory):
    path = tmp_path_factory.mktemp("sheet") / "sheets.pdf"
    export_sheets(project, path)
    return path


@pytest.fixture(scope="module")
def pages(sheet_file):
    return [p.extract_text() for p in PdfReader(sheet_file).pages]


def _number_after(text: str, label: str) -> tuple[float, str]:
    """The number and unit printed after ``label`` on the sheet."""
    m = re.search(re.escape(label) + r"\s+(-?[0-9.]+)\s*([A-Za-z/³²]*)", text)
    assert m, f"{label!r} not found on the sheet"
    return float(m.group(1)), m.group(2)


# ------------------------------------------------------------------ title block and results
def test_one_page_per_channel_with_title_block(project, pages):
    assert len(pages) == len(project.channels)
    info = project.sheet
    for i, (text, ch) in enumerate(zip(pages, project.channels), start=1):
        for value in (project.name.split(" (")[0], ch.name, ch.location, info.company.split(" (")[0],
                      info.designer, info.checker, info.approver, info.date_designed, info.date_checked,
                      info.project_number):
            assert value in text, f"{value!r} missing from sheet {i}"
        assert f"{i} of {len(pages)}" in text
        assert "REVISION" in text and info.revision in text
        for heading in ("TYPICAL SECTION", "INPUTS", "RESULTS", "RATING CURVE", "HAND CHECK", "LINING STABILITY",
                        "CAUTIONS", "SIGNATURE", "APPROVAL"):
            assert heading in text


def test_results_carry_units_us(pages):
    text = pages[0]
    for label, unit in (("Normal depth yn", "ft"), ("Critical depth yc", "ft"), ("Velocity V", "ft/s"),
                        ("Flow area A", "ft²"), ("Top width at top", "ft"), ("Design flow Q", "ft³/s"),
                        ("Top width T", "ft"), ("Total depth", "ft"), ("Freeboard", "ft"),
                        ("Lined width", "ft")):
        value, printed_unit = _number_after(text.replace("\n", " "), label)
        assert math.isfinite(value)
        if unit:
            assert printed_unit == unit, f"{label}: unit {printed_unit!r}, expected {unit!r}"
    assert "Froude number Fr" in text and "Flow regime subcritical" in text.replace("\n", " ")
    assert "Manning's n used" in text


def _mannings_depth(b, z, q, n, s, k=1.486):
    """Normal depth of a trapezoid by brentq on Q = (k/n) A R^(2/3) S^(1/2) (Chow 1959, Eq. 5-6)."""
    def excess(y):
        area = (b + z * y) * y
        perim = b + 2 * y * math.sqrt(1 + z * z)
        return k / n * area * (area / perim) ** (2 / 3) * math.sqrt(s) - q

    return brentq(excess, 1e-6, 50.0, xtol=1e-10)


def test_printed_normal_depth_solves_mannings_equation(project, pages):
    # The first channel is lined with grass, whose n depends on the flow (HEC-15 Ch. 4): the printed depth
    # must satisfy Manning's equation with the printed n (Chow 1959, Eq. 5-6), solved here with brentq
    # instead of the program's coupled solver.
    ch = project.channels[0]
    text = pages[0].replace("\n", " ")
    n = float(re.search(r"Manning's n used ([0-9.]+) \[1\]", text).group(1))
    y = _mannings_depth(ch.section["bottom_width"] / FOOT, ch.section["left_slope"], ch.flow.value / FOOT ** 3,
                        n, ch.slope)
    printed, unit = _number_after(pages[0], "Normal depth yn")
    assert unit == "ft"
    assert printed == pytest.approx(y, rel=3e-3)  # 1.486 vs 1.4859 and 3 printed figures
    assert n != ch.manning_n  # with a lining, the lining's n is used, not the channel's


def test_published_trapezoid_example_prints_its_normal_depth(tmp_path):
    # Chow, Open-Channel Hydraulics (1959), Chapter 6, Example 6-2 (example number from memory):
    # b = 20 ft, z = 2, S = 0.0016, n = 0.025, Q = 400 ft^3/s -> yn = 3.36 ft.
    ch = P.Channel(name="Chow trapezoid", flow=P.FlowBasis(value=400 * FOOT ** 3), slope=0.0016,
                   section={"shape": "trapezoid", "bottom_width": 20 * FOOT, "left_slope": 2.0, "right_slope": 2.0},
                   manning_n=0.025, min_freeboard=1.0 * FOOT)
    proj = P.Project(name="Published example check", units="us", channels=[ch])
    data, _ = sheet_pdf(proj)
    out = tmp_path / "chow.pdf"
    out.write_bytes(data)
    text = PdfReader(out).pages[0].extract_text()
    value, unit = _number_after(text, "Normal depth yn")
    assert unit == "ft"
    assert value == pytest.approx(3.36, rel=0.005)
    # no lining: the typed n is used and the sheet says the stability was not checked
    assert "NOT CHECKED" in text and "Manning's n used 0.025 (typed)" in text.replace("\n", " ")
    assert "Manning's n 0.025 (typed in the project)" in text.replace("\n", " ")


def test_si_project_prints_si_units(project, tmp_path):
    proj = copy.deepcopy(project)
    proj.units = "si"
    path = tmp_path / "si.pdf"
    export_sheets(proj, path, channels=[proj.channels[1].name])
    text = PdfReader(path).pages[0].extract_text()
    assert _number_after(text, "Normal depth yn")[1] == "m"
    assert _number_after(text, "Velocity V")[1] == "m/s"
    assert _number_after(text, "Design flow Q")[1] == "m³/s"
    flat = text.replace("\n", " ")
    assert "Design shear τ  Pa" in flat and "Permissible τp  Pa" in flat
    assert re.search(r"Reason: not stable, left side slope: [0-9.]+ Pa against [0-9.]+ Pa permissible", flat)
    assert re.search(r"Required D50 [0-9.]+ m \([0-9.]+ mm\)", flat)
    assert " ft" not in flat.split("CAUTIONS")[0].replace("45 ft downstream", "")  # no US unit in the body
    assert "1 of 1" in text


def test_symbols_print_and_extract(pages):
    text = pages[0]
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


def test_hand_check_numbers_agree_as_printed(pages):
    text = pages[0].replace("\n", " ")
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
    assert g == pytest.approx(9810 / (4.4482216152605 / FOOT ** 3), rel=1e-3)  # 9810 N/m^3 in lb/ft^3


def test_rational_flow_basis_is_printed(pages):
    text = pages[1].replace("\n", " ")
    assert "rational method" in text and "runoff coefficient C 0.45" in text and "Time of concentration" in text
    m = re.search(r"Q = C i A u = ([0-9.]+) × ([0-9.]+) × ([0-9.]+) × ([0-9.]+) = ([0-9.]+) ft³/s", text)
    c, i, a, u, q = (float(v) for v in m.groups())
    # 1 acre-inch per hour in ft^3/s: 43560 ft^2 x (1/12) ft / 3600 s = 1.00833 (exact unit factors)
    assert u == pytest.approx(43560 / 12 / 3600, rel=1e-4)
    assert c * i * a * u == pytest.approx(q, rel=3e-3)


def test_cautions_and_out_of_range_warnings(pages):
    text = pages[0].replace("\n", " ")
    assert "Design assistance only" in text and "licensed" in text
    # the grass ditch runs at 1.63 ft/s, below the 2 ft/s self-cleaning velocity (Chow 1959, Sec. 7-3,
    # 2 to 3 ft/s, from memory): flagged, with the US value beside the SI one
    assert "(1.63 ft/s) is below 0.61 m/s (2.0 ft/s)" in text
    # the evaluation's notes: the lining's own n replaces the channel's
    assert "Note: The lining's own n (0.0676) is used; the channel's Manning's n 0.035 applies only without" in text
    # an SI amount in a note gets its US equivalent: 1 Pa = 0.0209 lb/ft^2 (1 lbf/ft^2 = 47.880 Pa,
    # NIST SP 811, 2008, Appendix B.8)
    assert "soil permissible shear 1 Pa (0.0209 lb/ft²)" in text


# ------------------------------------------------------------------ fingerprint
def test_printed_fingerprint_equals_the_command(project, pages, capsys):
    for text, ch in zip(pages, project.channels):
        printed = re.search(r"Design fingerprint SHA-256: ([0-9a-f]{64})", text).group(1)
        assert main(["fingerprint", str(PROJECT_FILE), "--channel", ch.name]) == 0
        assert capsys.readouterr().out.strip() == printed
    assert main(["fingerprint", str(PROJECT_FILE)]) == 0
    lines = capsys.readouterr().out.strip().splitlines()
    assert [line.split("  ", 1)[1] for line in lines] == [c.name for c in project.channels]


def test_fingerprint_follows_design_inputs_only(project):
    ch = copy.deepcopy(project.channels[0])
    base = fingerprint(ch)
    renamed = copy.deepcopy(ch)
    renamed.name, renamed.location, renamed.notes = "Other name", "elsewhere", "a note"
    assert fingerprint(renamed) == base
    as_float = copy.deepcopy(ch)
    as_float.section = dict(ch.section, left_slope=3, right_slope=3)  # 3 and 3.0 are the same input
    assert fingerprint(as_float) == base
    steeper = copy.deepcopy(ch)
    steeper.slope = ch.slope * 1.001
    assert fingerprint(steeper) != base
    assert fingerprint(ch, version="9.9.9") != base
    doc = fingerprint_document(ch)
    assert doc.startswith('{"inputs":{') and '"program":"ditchwright"' in doc
    data = json.loads(doc)
    assert sorted(data["linings"]) == ["concrete", "grass_good_sod", "riprap"]  # own lining and alternatives
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
    from cryptography import x509
    from cryptography.hazmat.primitives import hashes, serialization
    from cryptography.hazmat.primitives.asymmetric import ec
    from cryptography.hazmat.primitives.serialization import pkcs12
    from cryptography.x509.oid import NameOID

    folder = tmp_path_factory.mktemp("cert")
    key = ec.generate_private_key(ec.SECP256R1())
    name = x509.Name([x509.NameAttribute(NameOID.COMMON_NAME, "Test Engineer (invented)")])
    now = datetime.datetime.now(datetime.timezone.utc)
    cert = (x509.CertificateBuilder().subject_name(name).issuer_name(name).public_key(key.public_key())
            .serial_number(x509.random_serial_number()).not_valid_before(now - datetime.timedelta(days=1))
            .not_valid_after(now + datetime.timedelta(days=30))
            .add_extension(x509.KeyUsage(digital_signature=True, content_commitment=True, key_encipherment=False,
                                         data_encipherment=False, key_agreement=False, key_cert_sign=False,
                                         crl_sign=False, encipher_only=False, decipher_only=False), critical=True)
            .sign(key, hashes.SHA256()))
    p12 = folder / "engineer.p12"
    p12.write_bytes(pkcs12.serialize_key_and_certificates(b"engineer", key, cert, None,
                                                          serialization.BestAvailableEncryption(b"pw-test")))
    pem = folder / "engineer.pem"
    pem.write_bytes(cert.public_bytes(serialization.Encoding.PEM))
    return p12, pem


@pytest.fixture(scope="module")
def signed_file(project, certificate, tmp_path_factory):
    p12, _ = certificate
    path = tmp_path_factory.mktemp("signed") / "signed.pdf"
    export_sheets(project, path, sign=(p12, "pw-test"))
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
    assert main(["sheet", str(PROJECT_FILE), "--channel", "Culvert outfall swale", "-o", str(out),
                 "--sign", str(p12), "--page", "a4"]) == 0
    assert verify_pdf(out, trust=pem).ok
    box = PdfReader(out).pages[0].mediabox
    assert (float(box.width), float(box.height)) == pytest.approx((595.2756, 841.8898), abs=0.01)  # ISO 216 A4
    monkeypatch.setenv("DITCHWRIGHT_CERT_PASSWORD", "wrong")
    assert main(["sheet", str(PROJECT_FILE), "-o", str(tmp_path / "x.pdf"), "--sign", str(p12)]) == 2
    err = capsys.readouterr().err
    assert "wrong password" in err and "Traceback" not in err
    assert not (tmp_path / "x.pdf").exists()


def test_cli_without_password_and_terminal_refuses(certificate, tmp_path, monkeypatch, capsys):
    p12, _ = certificate
    monkeypatch.delenv("DITCHWRIGHT_CERT_PASSWORD", raising=False)
    monkeypatch.setattr(sys, "stdin", open(os.devnull))
    assert main(["sheet", str(PROJECT_FILE), "-o", str(tmp_path / "x.pdf"), "--sign", str(p12)]) == 2
    assert "DITCHWRIGHT_CERT_PASSWORD" in capsys.readouterr().err


@pytest.mark.parametrize("argv, message", [
    (["sheet", str(PROJECT_FILE), "-o", "x.pdf", "--channel", "No such ditch"], "no channel named"),
    (["sheet", "missing-project.json", "-o", "x.pdf"], "no such file"),
    (["sheet", str(PROJECT_FILE), "-o", "x.txt"], ".pdf"),
    (["verify", "missing.pdf"], "no such file"),
    (["verify", str(PROJECT_FILE)], "not a readable PDF"),
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
    # layer is drawn 1.5 D50 = 225 mm thick (common practice; HEC-15, 3rd ed., Section 6.4, from memory).
    ch = P.Channel(name="Riprap chute (invented)", flow=P.FlowBasis(value=0.7), slope=0.04,
                   section={"shape": "trapezoid", "bottom_width": 1.0, "left_slope": 2.0, "right_slope": 2.0},
                   lining=P.LiningChoice("riprap", 0.15), manning_n=None)
    proj = P.Project(name="Invented chute", units="si", channels=[ch])
    path = tmp_path / "chute.pdf"
    export_sheets(proj, path)
    text = PdfReader(path).pages[0].extract_text().replace("\n", " ")
    assert "Rock riprap, D50 0.150 m (150 mm)" in text
    assert "layer thickness t 0.225 m (225 mm)" in text  # 1.5 D50
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
    export_sheets(project, plain, channels=project.channels[0].name)
    assert _image_count(plain) == 0  # no default brand
    logo = tmp_path / "logo.png"
    Image.new("RGB", (60, 30), (20, 90, 160)).save(logo)
    proj = copy.deepcopy(project)
    proj.sheet.logo = str(logo)
    with_logo = tmp_path / "logo.pdf"
    assert export_sheets(proj, with_logo, channels=project.channels[0].name) == []
    assert _image_count(with_logo) == 1
    proj.sheet.logo = str(tmp_path / "missing.png")
    notes = export_sheets(proj, tmp_path / "nologo.pdf", channels=project.channels[0].name)
    assert notes and "logo file not found" in notes[0]


# ------------------------------------------------------------------ lining stability block
GAMMA_WATER_PCF = 9810 / 157.08746  # 9810 N/m^3 (HEC-15 SI value) in lb/ft^3; 1 lbf/ft^3 = 157.087 N/m^3
PSF = 47.880259  # Pa per lbf/ft^2 (NIST SP 811, 2008 ed., Appendix B.8)


def _check_row(text: str, location: str) -> list:
    """(design shear, permissible, SF achieved, SF required, result) of one row of the shear-check table."""
    m = re.search(re.escape(location) + r"\s+([0-9.]+)\s+([0-9.]+|non-erodible)\s+([0-9.]+|—)\s+([0-9.]+|—)\s+"
                  r"(passes|FAILS|non-erodible)", text)
    assert m, f"no check row for {location!r}"
    return list(m.groups())


def test_stability_block_reads_back_with_units(pages):
    text = pages[0].replace("\n", " ")
    assert "LINING STABILITY" in text and "STABLE" in text and "NOT STABLE" not in text
    assert "Design shear τ  lb/ft²" in text and "Permissible τp  lb/ft²" in text
    assert re.search(r"SF\s+achieved\s+SF\s+required\s+Result\s+\(SF ≥ required\)", text)
    y = _number_after(text, "Normal depth yn")[0]
    bed, sides, bend = (_check_row(text, loc) for loc in ("bed", "side slopes", "bend"))
    # bed shear tau = gamma y S at the printed depth (HEC-15, 3rd ed., Eq. 3.1)
    assert float(bed[0]) == pytest.approx(GAMMA_WATER_PCF * y * 0.005, rel=4e-3)
    # side slopes: K1 = 0.066 Z + 0.67 for 1.5 < Z < 5 (HEC-15 Eq. 3.4, from memory): 0.868 at Z = 3
    assert float(sides[0]) == pytest.approx((0.066 * 3 + 0.67) * float(bed[0]), rel=2e-3)
    # bend: Kb = 2.38 - 0.206 (Rc/T) + 0.0073 (Rc/T)^2 for 2 < Rc/T < 10 (HEC-15 Eq. 3.5, from memory)
    rc_t = float(re.search(r"Kb = [0-9.]+ \(Rc/T = ([0-9.]+)\)", text).group(1))
    kb = float(re.search(r"Kb ([0-9.]+);", text).group(1))
    assert kb == pytest.approx(2.38 - 0.206 * rc_t + 0.0073 * rc_t ** 2, rel=2e-3)
    assert float(bend[0]) == pytest.approx(kb * float(bed[0]), rel=2e-3)
    # grass: tau_p = tau_p,soil / (1 - CF) (n / ns)^2 (HEC-15 Eq. 4.7, from memory) with the printed values
    soil, cf, ns, n = (float(v) for v in re.search(
        r"soil permissible shear ([0-9.]+) Pa \([^)]*\), cover factor ([0-9.]+), soil grain n ([0-9.]+), "
        r"lining n ([0-9.]+)", text).groups())
    assert float(bed[1]) == pytest.approx(soil / (1 - cf) * (n / ns) ** 2 / PSF, rel=6e-3)
    for row in (bed, sides, bend):
        design, permissible, sf, required, result = row
        assert float(sf) == pytest.approx(float(permissible) / float(design), abs=0.01)
        assert float(required) == 1.0 and result == "passes"
    # the verdict's reason names the governing check with its units
    assert re.search(r"Reason: stable, bend: 0\.994 lb/ft² against 3\.73 lb/ft² permissible \(safety factor 3\.75, "
                     r"1\.00 needed\)", text)
    assert re.search(r"Safety factor|SF = τp / τ = [0-9.]+ / [0-9.]+ = 3\.75 \(bend, 1\.00 required\)", text)
    # freeboard with its rule and source, superelevation V^2 T / (g Rc) (HEC-15 Section 3.4, from memory)
    assert re.search(r"Freeboard 0\.519 ft = minimum 0\.500 ft \+ superelevation 0\.0191 ft \[(\d)\]", text)
    v, t = _number_after(text, "Velocity V")[0], _number_after(text, "Top width T")[0]
    rc = _number_after(text, "Bend radius Rc")[0]
    assert 0.0191 == pytest.approx(v ** 2 * t / (32.174 * rc), rel=0.02)  # printed V, T, Rc carry 3 figures
    assert "freeboard: minimum freeboard 0.500 ft (HEC-15 Section 2" in text
    total = _number_after(text, "Total depth")[0]
    assert total == pytest.approx(y + 0.519, abs=0.006)
    # top width at the top of the ditch: b + 2 z (total depth), trapezoid geometry
    assert _number_after(text, "Top width at top")[0] == pytest.approx(2.0 + 2 * 3 * total, rel=3e-3)


def test_failing_stone_lining_prints_not_stable_and_the_required_d50(pages):
    text = pages[1].replace("\n", " ")
    assert "NOT STABLE" in text
    bed = _check_row(text, "bed")
    left = _check_row(text, "left side slope")
    assert bed[4] == "FAILS" and left[4] == "FAILS"
    # gravel D50 = 25 mm: tau_p = F* (gamma_s - gamma) D50 with F* = 0.047 (HEC-15 Eq. 6.7; Table 6.1 below
    # Re* = 4e4, from memory) and gamma_s = 25.9 kN/m^3 (HEC-15 Section 6.2)
    reynolds = float(re.search(r"particle Reynolds number Re\* ([0-9.]+): F\* ([0-9.]+)", text).group(1))
    assert reynolds < 4e4 and "F* 0.047" in text
    assert float(bed[1]) == pytest.approx(0.047 * (25900 - 9810) * 0.025 / PSF, rel=3e-3)
    m = re.search(r"Reason: not stable, left side slope: ([0-9.]+) lb/ft² against ([0-9.]+) lb/ft² permissible "
                  r"\(safety factor ([0-9.]+), 1\.00 needed\); smallest stable D50 ([0-9.]+) ft \(given 0\.0820 ft\)",
                  text)
    assert m, "the reason of a failing lining"
    assert (m.group(1), m.group(2), m.group(3)) == (left[0], left[1], left[2])
    # required D50 printed with its parts; the bed part by HEC-15 Eq. 6.8, D50 = SF tau / (F* (gamma_s - gamma)),
    # SF = 1.0 and F* = 0.047 (Table 6.1, from memory), at the printed depth of the required state
    req = re.search(r"Required D50 ([0-9.]+) ft \(([0-9.]+) in\) smallest stable, given D50 too small "
                    r"\(bed ([0-9.]+) ft, side slopes ([0-9.]+) ft at depth ([0-9.]+) ft; HEC-15 Eq. 6.8\)", text)
    assert req, "the required D50"
    d_ft, d_in, d_bed, d_side, depth = (float(v) for v in req.groups())
    assert d_ft == float(m.group(4)) and d_in == pytest.approx(d_ft * 12, rel=3e-3)
    assert d_ft == max(d_bed, d_side)
    tau_bed = 9810 * depth * FOOT * 0.012  # Pa
    assert d_bed * FOOT == pytest.approx(tau_bed / (0.047 * (25900 - 9810)), rel=7e-3)
    assert "layer thickness t 0.123 ft (1.48 in)" in text  # 1.5 D50 = 37.5 mm (common practice)
    assert "Note: Place a granular filter or a geotextile beneath the stone" in text


def test_rigid_lining_is_non_erodible(tmp_path):
    ch = P.Channel(name="Paved ditch (invented)", flow=P.FlowBasis(value=0.4), slope=0.01,
                   section={"shape": "trapezoid", "bottom_width": 0.6, "left_slope": 2.0, "right_slope": 2.0},
                   lining=P.LiningChoice("concrete"), manning_n=None)
    data, _ = sheet_pdf(P.Project(name="Invented paved ditch", units="si", channels=[ch]))
    out = tmp_path / "paved.pdf"
    out.write_bytes(data)
    text = PdfReader(out).pages[0].extract_text().replace("\n", " ")
    assert "NON-ERODIBLE" in text
    assert "Reason: non-erodible: Concrete, float finish (general paved ditch) is a rigid lining" in text
    assert _check_row(text, "bed")[1:4] == ["non-erodible", "—", "—"]


# ------------------------------------------------------------------ lining comparison
def _comparison_row(text: str, name: str) -> list:
    m = re.search(re.escape(name) + r"\s+([0-9.]+)\s+([0-9.]+)\s+([0-9.]+)\s+([0-9.]+)\s+([0-9.]+)\s+"
                  r"([0-9.]+|non-erodible)\s+([0-9.]+ / [0-9.]+|—)\s+(stable|not stable|non-erodible)", text)
    assert m, f"no comparison row for {name!r}"
    return list(m.groups())


def test_comparison_table_reads_back_with_units(project, pages):
    text = pages[0].replace("\n", " ")
    assert "LINING COMPARISON" in text and "LINING COMPARISON" not in pages[1]
    for head in ("Depth  ft", "V ft/s", "τ lb/ft²", "τp lb/ft²", "Lined  ft", "Layer  ft³/ft", "SF / req."):
        assert head in text, head
    own = _comparison_row(text, "* Grass, sod-forming, good stand, about 150 mm tall")
    riprap = _comparison_row(text, "Rock riprap, D50 0.492 ft (5.91 in)")
    concrete = _comparison_row(text, "Concrete, float finish (general paved ditch)")
    # the channel's own lining agrees with the stability block and the results
    assert float(own[1]) == _number_after(text, "Normal depth yn")[0] and own[7] == "stable"
    bend = _check_row(text, "bend")
    assert own[4:6] == bend[0:2] and own[6] == f"{bend[2]} / {bend[3]}"
    # concrete: constant n, so the depth is Manning's with that n (Chow 1959, Eq. 5-6), solved by brentq
    ch = project.channels[0]
    n = float(concrete[0])
    y = _mannings_depth(ch.section["bottom_width"] / FOOT, 3.0, ch.flow.value / FOOT ** 3, n, ch.slope)
    assert float(concrete[1]) == pytest.approx(y, rel=4e-3)
    assert float(concrete[4]) == pytest.approx(GAMMA_WATER_PCF * float(concrete[1]) * ch.slope, rel=5e-3)
    assert concrete[5:8] == ["non-erodible", "—", "non-erodible"]
    # riprap: rougher than concrete, so deeper and slower
    assert float(riprap[1]) > float(concrete[1]) and float(riprap[2]) < float(concrete[2])
    assert "No cost column" in text


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
    ch = project.channels[0]
    shipped = fingerprint(ch)
    assert fingerprint(ch, catalogue=priced) != shipped  # a changed entry of a lining the channel uses
    lone = copy.deepcopy(ch)
    lone.alternatives = []
    assert fingerprint(lone, catalogue=priced) == fingerprint(lone)  # riprap not used: no change

    out = tmp_path / "priced.pdf"
    assert main(["sheet", str(PROJECT_FILE), "--channel", ch.name, "-o", str(out), "--user-catalogue",
                 str(user)]) == 0
    capsys.readouterr()
    text = PdfReader(out).pages[0].extract_text().replace("\n", " ")
    printed = re.search(r"Design fingerprint SHA-256: ([0-9a-f]{64})", text).group(1)
    assert main(["fingerprint", str(PROJECT_FILE), "--channel", ch.name, "--user-catalogue", str(user)]) == 0
    assert capsys.readouterr().out.strip() == printed
    assert main(["fingerprint", str(PROJECT_FILE), "--channel", ch.name]) == 0
    assert capsys.readouterr().out.strip() == shipped != printed
    assert "linings.toml + prices.toml" in text
    # the cost column: $120 per m^3 of layer times the printed layer volume per ft (1 ft^3 = 0.0283168 m^3)
    assert re.search(r"Cost\s+\$/ft", text) and "No cost column" not in text
    m = re.search(r"Rock riprap, D50 0\.492 ft \(5\.91 in\).*?stable \(bend\)\s+([0-9.]+)\s+([0-9.]+)\s+([0-9.]+)", text)
    layer, cost = float(m.group(2)), float(m.group(3))
    assert cost == pytest.approx(120.0 * layer * 0.0283168, rel=5e-3)


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
    data, _ = sheet_pdf(P.Project(name="Invented comparison", units="us", channels=[ch]))
    out = tmp_path / "many.pdf"
    out.write_bytes(data)
    reader = PdfReader(out)
    assert len(reader.pages) == 1
    text = reader.pages[0].extract_text().replace("\n", " ")
    from app.evaluate import evaluate_channel

    names = [r.name for r in evaluate_channel(ch).comparison]
    shown = [nm for nm in names if nm in text.split("CAUTIONS")[0]]
    assert len(shown) == len(names), set(names) - set(shown)  # every lining is in a row or in the note


def test_core_sentences_get_the_sheet_units():
    from app.sheet.content import in_units
    from hydraulics.units import system

    us, si = system("us"), system("si")
    # 1 Pa = 1 / 47.880 lb/ft^2 and 25 mm = 0.984 in (exact inch 25.4 mm; NIST SP 811, Appendix B.8)
    assert in_units("soil permissible shear 1 Pa here", us) == "soil permissible shear 1 Pa (0.0209 lb/ft²) here"
    assert in_units("D50 = 25 mm is small", us) == "D50 = 25 mm (0.984 in) is small"
    assert in_units("the depth (0.5 m) is", us) == "the depth (0.5 m (1.64 ft)) is"
    # equivalents already given are left alone, and an SI system is left as it is
    for text in ("about 0.15 m (0.5 ft) for", "of 2 to 3 ft/s (0.6 to 0.9 m/s) (from memory)",
                 "velocity 0.50 m/s (1.63 ft/s) is below", "5.42 min by Kirpich"):
        assert in_units(text, us) == text
    assert in_units("soil permissible shear 1 Pa, 25 900 N/m^3", si) == "soil permissible shear 1 Pa, 25 900 N/m³"
    assert in_units("25 900 N/m^3", us) == "25 900 N/m³"  # a number with a thousands space is not split


def _drawing_matches_tables(text: str) -> None:
    """The drawing's labels print the same numbers as the tables (one rounding for each value)."""
    flat = text.replace("\n", " ")
    pairs = (("top width", "Top width at top"), ("yn", "Normal depth yn"), ("total depth", "Total depth"),
             ("freeboard", "Freeboard"))
    drawing = flat.split("INPUTS")[0]
    tables = flat.split("INPUTS", 1)[1]
    for in_drawing, in_table in pairs:
        assert _number_after(drawing, in_drawing) == _number_after(tables, in_table), in_drawing
    if "critical depth yc" in drawing:
        assert _number_after(drawing, "critical depth yc") == _number_after(tables, "Critical depth yc")


def test_drawing_labels_round_as_the_tables(pages, tmp_path):
    for text in pages:
        _drawing_matches_tables(text)
    # a surveyed section: the top width is that at the top of the ditch, not the width of the survey
    ch = P.Channel(name="Surveyed channel (invented)", flow=P.FlowBasis(value=0.6), slope=0.003,
                   section={"shape": "irregular", "stations": [0.0, 1.5, 2.6, 3.2, 3.9, 5.0, 6.8],
                            "elevations": [1.25, 0.85, 0.3, 0.0, 0.25, 0.8, 1.1], "n": 0.035},
                   manning_n=0.035, min_freeboard=0.2)
    data, _ = sheet_pdf(P.Project(name="Invented survey", units="us", channels=[ch]))
    out = tmp_path / "survey.pdf"
    out.write_bytes(data)
    text = PdfReader(out).pages[0].extract_text()
    _drawing_matches_tables(text)
    assert _number_after(text, "Top width at top")[0] < 6.8 / FOOT  # narrower than the survey
