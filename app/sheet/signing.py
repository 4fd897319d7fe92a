"""Digital signature of a design sheet (PAdES, with pyHanko) and its verification, offline.

The engineer signs with a PKCS#12 file (.p12/.pfx) holding their key and
certificate. The password is asked for at the terminal, or read from the
environment variable ``DITCHWRIGHT_CERT_PASSWORD`` for headless runs; it is
used for the one signing and never written anywhere. The signature's visible
stamp goes into the approval box of sheet 1 and covers the whole file.

Verification reads the file's signature(s) and reports, for each one, whether
the signed bytes are intact, whether the signature is cryptographically
valid and covers the entire file (nothing added after signing), who signed
(the certificate's subject) and, when a trusted certificate is given,
whether the signer chains to it. No network access is made.
"""

from __future__ import annotations

import io
import logging
import os
from dataclasses import dataclass, field

from .layout import approval_box

PASSWORD_ENV = "DITCHWRIGHT_CERT_PASSWORD"
# pyHanko logs a traceback when a key file will not open; the caller reports it in one line instead.
logging.getLogger("pyhanko").addHandler(logging.NullHandler())
FIELD_NAME = "Approval"


class SigningError(Exception):
    """The sheet cannot be signed (unreadable certificate file, wrong password, ...)."""


class VerifyError(Exception):
    """The file cannot be checked (not a PDF, unreadable, ...)."""


def password_from_environment_or_prompt(p12_path, prompt=None) -> bytes:
    """The PKCS#12 password: DITCHWRIGHT_CERT_PASSWORD if set, else asked with getpass at a terminal."""
    value = os.environ.get(PASSWORD_ENV)
    if value is not None:
        return value.encode("utf-8")
    import getpass
    import sys

    if not sys.stdin or not sys.stdin.isatty():
        raise SigningError(f"no password for {p12_path}: set {PASSWORD_ENV} when running without a terminal")
    return getpass.getpass(prompt or f"Password for {p12_path}: ").encode("utf-8")


def load_signer(p12_path, password: bytes | str | None):
    """A pyHanko signer from a PKCS#12 file; SigningError when it cannot be opened."""
    from pyhanko.sign import signers

    if isinstance(password, str):
        password = password.encode("utf-8")
    if not os.path.isfile(p12_path):
        raise SigningError(f"no such certificate file: {p12_path}")
    try:
        signer = signers.SimpleSigner.load_pkcs12(str(p12_path), passphrase=password)
    except Exception as exc:  # pyHanko/cryptography raise several kinds for a bad file or password
        raise SigningError(f"cannot open {p12_path}: wrong password, or not a PKCS#12 key file ({exc})") from None
    if signer is None:
        raise SigningError(f"cannot open {p12_path}: wrong password, or not a PKCS#12 key file")
    return signer


def signer_name(cert) -> str:
    """The signer's common name, or the whole certificate subject in words when it has none."""
    try:
        cn = cert.subject.native.get("common_name")
        return cn if cn else cert.subject.human_friendly
    except Exception:  # pragma: no cover - unusual certificate
        return str(cert.subject)


def _wrap(text: str, width: int = 24) -> str:
    import textwrap

    return "\n".join(textwrap.wrap(text, width)) or text


def stamp_pdf(width: float, height: float, signer: str, when) -> bytes:
    """A one-page PDF the size of the stamp, in the sheet's font: who signed and when."""
    from reportlab.lib import colors
    from reportlab.pdfgen import canvas as rl_canvas
    from reportlab.platypus import Paragraph
    from reportlab.lib.styles import ParagraphStyle
    from xml.sax.saxutils import escape

    from .fonts import FONT, register

    register()
    buf = io.BytesIO()
    c = rl_canvas.Canvas(buf, pagesize=(width, height), initialFontName=FONT)
    c.setStrokeColor(colors.Color(0.1, 0.25, 0.55))
    c.setLineWidth(1.2)
    c.rect(1, 1, width - 2, height - 2, stroke=1, fill=0)
    style = ParagraphStyle("stamp", fontName=FONT, fontSize=7, leading=8.6,
                           textColor=colors.Color(0.1, 0.25, 0.55))
    text = (f"DIGITALLY SIGNED<br/>by {escape(signer)}<br/>{when:%Y-%m-%d %H:%M %Z}"
            "<br/>PAdES signature; check with<br/>ditchwright verify")
    p = Paragraph(text, style)
    _, h = p.wrap(width - 8, height)
    p.drawOn(c, 4, height - 5 - h)
    c.showPage()
    c.save()
    return buf.getvalue()


def sign_pdf(data: bytes, p12_path, password, page: str, reason: str = "Design sheet approved",
             location: str | None = None) -> bytes:
    """Sign the PDF bytes; the visible stamp fills the approval box of the first page."""
    import datetime
    import tempfile

    from pyhanko.pdf_utils.incremental_writer import IncrementalPdfFileWriter
    from pyhanko.sign import fields, signers
    from pyhanko.sign.fields import SigSeedSubFilter
    from pyhanko.stamp import StaticStampStyle

    signer = load_signer(p12_path, password)
    name = signer_name(signer.signing_cert)
    box = tuple(int(round(v)) for v in approval_box(page))
    writer = IncrementalPdfFileWriter(io.BytesIO(data))
    fields.append_signature_field(writer, fields.SigFieldSpec(FIELD_NAME, on_page=0, box=box))
    meta = signers.PdfSignatureMetadata(field_name=FIELD_NAME, subfilter=SigSeedSubFilter.PADES,
                                        reason=reason, location=location, name=name)
    when = datetime.datetime.now(datetime.timezone.utc)
    stamp = stamp_pdf(box[2] - box[0], box[3] - box[1], name, when)
    with tempfile.TemporaryDirectory() as tmp:
        stamp_file = os.path.join(tmp, "stamp.pdf")
        with open(stamp_file, "wb") as fh:
            fh.write(stamp)
        style = StaticStampStyle.from_pdf_file(stamp_file, border_width=0)
        out = io.BytesIO()
        signers.PdfSigner(meta, signer, stamp_style=style).sign_pdf(writer, output=out)
    return out.getvalue()


@dataclass
class SignatureReport:
    field: str
    signer: str
    intact: bool                  # the signed bytes hash to the signed digest
    valid: bool                   # the signature is sound and covers these bytes
    covers_whole_file: bool
    trusted: bool | None          # None when no trusted certificate was given
    signed_at: str
    summary: str

    @property
    def ok(self) -> bool:
        return self.intact and self.valid and self.covers_whole_file and self.trusted is not False


@dataclass
class VerifyReport:
    path: str
    signatures: list = field(default_factory=list)
    fingerprints: list = field(default_factory=list)   # design fingerprints recorded in the file's keywords

    @property
    def ok(self) -> bool:
        return bool(self.signatures) and all(s.ok for s in self.signatures)


def _load_trust(path):
    from pyhanko.keys import load_cert_from_pemder

    try:
        return load_cert_from_pemder(str(path))
    except Exception as exc:
        raise VerifyError(f"cannot read the trusted certificate {path}: {exc}") from None


def verify_pdf(path, trust=None) -> VerifyReport:
    """Check every signature in the PDF at ``path``; ``trust`` is a PEM/DER certificate file or None."""
    from pyhanko.pdf_utils.reader import PdfFileReader
    from pyhanko.sign.validation import validate_pdf_signature
    from pyhanko_certvalidator import ValidationContext

    try:
        with open(path, "rb") as fh:
            data = fh.read()
    except OSError as exc:
        raise VerifyError(f"cannot read {path}: {exc}") from None
    try:
        reader = PdfFileReader(io.BytesIO(data), strict=False)
        embedded = list(reader.embedded_signatures)
    except Exception as exc:
        raise VerifyError(f"{path} is not a readable PDF: {exc}") from None
    report = VerifyReport(path=str(path), fingerprints=_fingerprints(reader))
    roots = [_load_trust(trust)] if trust else []
    for sig in embedded:
        context = ValidationContext(trust_roots=roots, allow_fetching=False) if roots else \
            ValidationContext(trust_roots=[sig.signer_cert], allow_fetching=False)
        try:
            status = validate_pdf_signature(sig, context)
        except Exception as exc:  # a damaged signature container
            report.signatures.append(SignatureReport(
                field=sig.field_name, signer="unknown", intact=False, valid=False, covers_whole_file=False,
                trusted=False if roots else None, signed_at="", summary=f"signature cannot be read: {exc}"))
            continue
        from pyhanko.sign.validation.status import SignatureCoverageLevel

        whole = status.coverage == SignatureCoverageLevel.ENTIRE_FILE
        when = status.signer_reported_dt.strftime("%Y-%m-%d %H:%M:%S %Z") if status.signer_reported_dt else ""
        report.signatures.append(SignatureReport(
            field=sig.field_name, signer=signer_name(status.signing_cert), intact=bool(status.intact),
            # "valid": the signature is sound and vouches for these very bytes (pyHanko's valid alone
            # only says the signature value matches the signed attributes)
            valid=bool(status.valid and status.intact), covers_whole_file=whole, trusted=bool(status.trusted) if roots else None,
            signed_at=when, summary=status.summary()))
    return report


def _fingerprints(reader) -> list:
    """Design fingerprints written into the document information's keywords by the sheet."""
    try:
        info = reader.trailer_view.get("/Info")
        words = str(info.get_object().get("/Keywords", "")) if info is not None else ""
    except Exception:
        return []
    return [w.split("=", 1)[1] for w in words.replace(",", " ").split() if w.startswith("ditchwright-fingerprint=")]
