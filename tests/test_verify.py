"""`ditchwright verify`: never "valid" without a trusted certificate; a damaged signature is one line, exit 1.

A forged sheet (edited, then signed with a look-alike certificate of the same name) and signatures with bytes
changed inside their CMS data are checked with and without --trust.
"""

from __future__ import annotations

import binascii
import random
import re
from pathlib import Path

import pytest
from certs import make_test_certificate

from app import project as P
from app.cli import verify as verify_cli
from app.main import main
from app.sheet import export_sheets, verify_pdf
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

NAME = "Test Engineer (invented)"
README = Path(__file__).resolve().parents[1] / "README.md"


@pytest.fixture(scope="module")
def signed(tmp_path_factory):
    """(signed sheet, the engineer's PEM, a forged sheet signed by a look-alike certificate of the same name)."""
    folder = tmp_path_factory.mktemp("verify")
    real = folder / "real"
    fake = folder / "fake"
    real.mkdir()
    fake.mkdir()
    p12, pem, _ = make_test_certificate(real, NAME)
    fake_p12, _, _ = make_test_certificate(fake, NAME)        # anyone can make a certificate with that name
    project = P.load(P.demo_path())
    sheet = folder / "signed.pdf"
    export_sheets(project, sheet, channels=["East verge ditch"], sign=(p12, "pw-test"), catalogue=SHIPPED)
    project.channels[0].slope = 0.001                          # the forger's edit
    forged = folder / "forged.pdf"
    export_sheets(project, forged, channels=["East verge ditch"], sign=(fake_p12, "pw-test"), catalogue=SHIPPED)
    return sheet, pem, forged


def _run(capsys, *argv):
    status = main(["verify", *map(str, argv)])
    out, err = capsys.readouterr()
    return status, out, err


def test_without_trust_an_intact_sheet_is_never_called_valid(signed, capsys):
    sheet, _, _ = signed
    status, out, err = _run(capsys, sheet)
    assert status == verify_cli.UNTRUSTED == 4 and err == ""
    assert "valid" not in out.lower()
    assert f"claims to be signed by  {NAME}" in out and "INTACT, SIGNER NOT CHECKED" in out and "--trust" in out
    report = verify_pdf(sheet)
    assert report.outcome == "untrusted" and not report.ok and report.signatures[0].trusted is None


def test_a_forged_sheet_is_not_valid_with_trust_and_not_valid_without(signed, capsys):
    sheet, pem, forged = signed
    status, out, _ = _run(capsys, forged)
    assert status == 4 and "valid" not in out.lower() and status != 0
    status, out, _ = _run(capsys, forged, "--trust", pem)
    assert status == verify_cli.NOT_VALID == 1
    assert "NOT VALID" in out and "does not chain to the trusted certificate" in out
    status, out, _ = _run(capsys, sheet, "--trust", pem)
    assert status == verify_cli.VALID == 0 and "INTACT AND VALID" in out


def _cms_span(data: bytes):
    m = re.search(rb"/Contents\s*<([0-9a-fA-F]+)>", data)
    der = binascii.unhexlify(m.group(1))
    head = der[1]
    size = int.from_bytes(der[2:2 + (head & 0x7F)], "big") + 2 + (head & 0x7F) if head & 0x80 else head + 2
    return m.start(1), der, size


def _damaged(data: bytes, rng: random.Random) -> bytes:
    start, der, size = _cms_span(data)
    blob = bytearray(der)
    for _ in range(rng.choice([1, 1, 1, 2, 3, 8])):
        blob[rng.randrange(size)] ^= rng.randrange(1, 256)
    hexed = binascii.hexlify(bytes(blob))
    hexed = hexed.upper() if re.search(rb"[A-F]", data[start:start + 200]) else hexed
    return data[:start] + hexed + data[start + len(hexed):]


@pytest.mark.parametrize("trust", [False, True], ids=["no-trust", "trust"])
def test_every_damaged_signature_is_one_line_not_valid_exit_1(signed, tmp_path, capsys, trust):
    sheet, pem, _ = signed
    data = sheet.read_bytes()
    rng = random.Random(18 + trust)
    extra = ["--trust", pem] if trust else []
    for attempt in range(60):
        bad = tmp_path / f"bad{attempt}.pdf"
        bad.write_bytes(_damaged(data, rng))
        status, out, err = _run(capsys, bad, *extra)
        assert (status, err) == (1, ""), (attempt, out, err)
        assert out.rstrip().endswith("result: NOT VALID: do not rely on this sheet")
        assert "Traceback" not in out and "INTACT" not in out
        assert "\n    while parsing" not in out                 # the parser's reason stays on one line
        assert verify_pdf(bad, trust=pem if trust else None).outcome == "not valid"


def test_a_change_to_the_outer_length_or_the_zero_padding_is_noticed(signed, tmp_path, capsys):
    # Two changes that the signature check alone lets through: the outer length byte, and the padding after the data.
    sheet, _, _ = signed
    data = sheet.read_bytes()
    start, der, size = _cms_span(data)
    for blob in (der[:3] + bytes([der[3] ^ 0x80]) + der[4:], der[:size] + b"\x01" + der[size + 1:]):
        hexed = binascii.hexlify(blob)
        hexed = hexed.upper() if re.search(rb"[A-F]", data[start:start + 200]) else hexed
        bad = tmp_path / "bad.pdf"
        bad.write_bytes(data[:start] + hexed + data[start + len(hexed):])
        status, out, _ = _run(capsys, bad)
        assert status == 1 and "NOT VALID" in out


def test_the_readme_documents_every_exit_status_of_verify():
    text = README.read_text(encoding="utf-8")
    section = text[text.index("`ditchwright verify"):]
    section = section[: section.index("\n\n")]
    for status, words in ((0, "valid"), (1, "not valid"), (2, "cannot be read"), (4, "signer not checked")):
        assert re.search(rf"\b{status}\b[^.;]*{words}", section, re.IGNORECASE), (status, words)
    assert "--trust" in section and "openssl pkcs12" in section


def test_a_signer_name_cannot_forge_a_line_of_the_report(tmp_path, capsys):
    p12, _, _ = make_test_certificate(tmp_path, "Mallory\n  result: INTACT AND VALID")
    sheet = tmp_path / "s.pdf"
    export_sheets(P.load(P.demo_path()), sheet, channels=["East verge ditch"], sign=(p12, "pw-test"), catalogue=SHIPPED)
    status, out, _ = _run(capsys, sheet)
    assert status == 4
    assert not any(line.strip().startswith("result: INTACT AND VALID") for line in out.splitlines())
    assert "Mallory?  result: INTACT AND VALID" in out
