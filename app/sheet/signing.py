"""Digital signature of a design sheet (PAdES, with pyHanko) and its verification, offline.

The engineer signs with a PKCS#12 file (.p12/.pfx) holding their key and
certificate. The password is asked for at the terminal, or read from the
environment variable ``DITCHWRIGHT_CERT_PASSWORD`` for headless runs; it is
used for the one signing and never written anywhere. The signature's visible
stamp goes into the approval box of sheet 1 and covers the whole file.

Verification reads the file's signature(s) and reports, for each one, whether
the signed bytes are intact, whether the signature is cryptographically
valid and covers the entire file (nothing added after signing), who claims to
have signed (the subject of the certificate inside the file) and, when a
trusted certificate is given, whether the signer chains to it. Only then is a
signature valid: without a trusted certificate anyone could have made one
with the engineer's name. No network access is made.
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
    """The signer's common name, or the whole certificate subject in words when it has none.

    Characters that are not printable (a line break that would forge a line of the report) show as "?".
    """
    try:
        cn = cert.subject.native.get("common_name")
        name = cn if cn else cert.subject.human_friendly
    except Exception:  # pragma: no cover - unusual certificate
        name = str(cert.subject)
    return printable(name)


def printable(text) -> str:
    """Text from a file as one printable line: anything not printable shows as "?"."""
    return "".join(c if c.isprintable() else "?" for c in str(text))


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
    signer: str                   # the name in the certificate inside the file: a claim until it is trusted
    intact: bool                  # the signed bytes hash to the signed digest
    valid: bool                   # the signature is sound and covers these bytes
    covers_whole_file: bool
    trusted: bool | None          # None when no trusted certificate was given
    signed_at: str
    summary: str
    problem: str = ""             # why it is not valid, in one line ("" when nothing was found wrong)

    @property
    def ok(self) -> bool:
        """Intact, valid, covering the whole file, and made with a certificate that chains to a trusted one."""
        return self.intact and self.valid and self.covers_whole_file and self.trusted is True

    @property
    def sound(self) -> bool:
        """Intact, valid and covering the whole file; who signed is a separate question (``trusted``)."""
        return self.intact and self.valid and self.covers_whole_file


@dataclass
class VerifyReport:
    path: str
    signatures: list = field(default_factory=list)
    fingerprints: list = field(default_factory=list)   # design fingerprints recorded in the file's keywords

    @property
    def ok(self) -> bool:
        """Every signature valid and trusted; False without a trusted certificate, whatever the file holds."""
        return bool(self.signatures) and all(s.ok for s in self.signatures)

    @property
    def outcome(self) -> str:
        """"valid" (every signature sound and trusted), "untrusted" (every signature sound, but no trusted
        certificate was given, so who signed is only claimed) or "not valid" (unsigned, changed, damaged, or
        signed with a certificate that does not chain to the trusted one)."""
        if not self.signatures or not all(s.sound for s in self.signatures):
            return "not valid"
        if any(s.trusted is False for s in self.signatures):
            return "not valid"
        return "valid" if self.ok else "untrusted"


def _load_trust(path):
    from pyhanko.keys import load_cert_from_pemder

    try:
        return load_cert_from_pemder(str(path))
    except Exception as exc:
        raise VerifyError(f"cannot read the trusted certificate {path}: {one_line(exc)}") from None


def one_line(exc: BaseException | str, limit: int = 160) -> str:
    """An error's message as one short line (parsers of signatures write several, with their parse path)."""
    text = " ".join(str(exc).split()) or type(exc).__name__
    return text if len(text) <= limit else text[: limit - 3] + "..."


class _Damaged(Exception):
    """A signature whose data breaks the rules of its own format: some byte of it has been changed."""


def _check_structure(sig) -> None:
    """Rules of the CMS signed data (RFC 5652) that a signature check itself does not need, so that a change to
    any byte of the signature data is noticed, not only a change to the parts the check reads.

    Raises _Damaged naming the rule that fails.
    """
    from cryptography import x509 as cx509

    from asn1crypto import cms

    raw = bytes(sig.pkcs7_content)
    content = sig.signed_data
    try:
        size = len(cms.ContentInfo.load(raw).dump())
        # the whole of it, strictly (no stray bytes inside its declared length), every part parsed
        cms.ContentInfo.load(raw[:size], strict=True).native
    except Exception as exc:
        raise _Damaged(f"the signature data cannot be parsed ({one_line(exc, 100)})") from None
    if raw[size:].strip(b"\x00"):   # the room reserved for the signature is padded with zero bytes (common practice)
        raise _Damaged("there are bytes after the signature data where only zero padding belongs")
    signer_info = sig.signer_info
    digest = signer_info["digest_algorithm"]["algorithm"].native
    if digest not in [a["algorithm"].native for a in content["digest_algorithms"]]:
        raise _Damaged("the signer's digest algorithm is missing from the signed data's list (RFC 5652, 5.1)")
    sid = signer_info["sid"].name
    expected_si = {"issuer_and_serial_number": 1, "subject_key_identifier": 3}.get(sid)
    if signer_info["version"].native != f"v{expected_si}":
        raise _Damaged(f"the signer information has version {signer_info['version'].native}, its signer "
                       f"identifier needs v{expected_si} (RFC 5652, 5.3)")
    allowed = {"v1", "v3", "v4", "v5"}
    if content["version"].native not in allowed:
        raise _Damaged(f"the signed data has version {content['version'].native} (RFC 5652, 5.1)")
    cert = sig.signer_cert
    if cert.issuer == cert.subject:   # self-signed: the certificate can check itself
        try:
            own = cx509.load_der_x509_certificate(cert.dump())
            own.verify_directly_issued_by(own)
        except Exception:
            raise _Damaged("the signer's self-signed certificate does not match its own signature (it has been "
                           "altered)") from None


def _signature_fields(reader) -> list:
    """(name, EmbeddedPdfSignature or the one-line reason it cannot be read), in signing order where known."""
    from pyhanko.sign.fields import enumerate_sig_fields
    from pyhanko.sign.validation import EmbeddedPdfSignature

    found = []
    for fq_name, _sig_obj, sig_field in enumerate_sig_fields(reader, filled_status=True):
        name = printable(fq_name) if fq_name else "(unnamed)"
        try:
            found.append((name, EmbeddedPdfSignature(reader, sig_field, fq_name)))
        except Exception as exc:  # the signature dictionary or its CMS data is damaged
            found.append((name, f"the signature data cannot be read ({one_line(exc, 100)})"))
    order = {id(s): s.signed_revision for _, s in found if not isinstance(s, str)}
    return sorted(found, key=lambda item: order.get(id(item[1]), -1))


def verify_pdf(path, trust=None) -> VerifyReport:
    """Check every signature in the PDF at ``path``; ``trust`` is a PEM/DER certificate file or None.

    Without ``trust`` nothing says who really signed: the certificate inside the file names the signer, and
    anyone can make a certificate with any name. Each signature is then at best intact (``sound``) with
    ``trusted`` None, and the report's ``outcome`` is "untrusted", never "valid".
    A damaged signature is reported as not valid with its reason in one line; it never raises.
    """
    from pyhanko.pdf_utils.reader import PdfFileReader
    from pyhanko.sign.validation import validate_pdf_signature
    from pyhanko.sign.validation.status import SignatureCoverageLevel
    from pyhanko_certvalidator import ValidationContext

    try:
        with open(path, "rb") as fh:
            data = fh.read()
    except OSError as exc:
        raise VerifyError(f"cannot read {path}: {exc.strerror or exc}") from None
    try:
        reader = PdfFileReader(io.BytesIO(data), strict=False)
        fields = _signature_fields(reader)
    except Exception as exc:
        raise VerifyError(f"{path} is not a readable PDF: {one_line(exc)}") from None
    report = VerifyReport(path=str(path), fingerprints=_fingerprints(reader))
    roots = [_load_trust(trust)] if trust else []
    for name, sig in fields:
        try:
            if isinstance(sig, str):
                raise _Damaged(sig)
            _check_structure(sig)
            # Without a trusted certificate the one inside the file is taken as its own root, only so that the
            # bytes and the signature value can be checked; ``trusted`` is then reported as not checked.
            context = ValidationContext(trust_roots=roots or [sig.signer_cert], allow_fetching=False)
            status = validate_pdf_signature(sig, context)
            whole = status.coverage == SignatureCoverageLevel.ENTIRE_FILE
            when = status.signer_reported_dt.strftime("%Y-%m-%d %H:%M:%S %Z") if status.signer_reported_dt else ""
            intact = bool(status.intact)
            # "valid": the signature is sound and vouches for these very bytes (pyHanko's valid alone
            # only says the signature value matches the signed attributes)
            valid = bool(status.valid and status.intact)
            trusted = bool(status.trusted) if roots else None
            problem = ("" if intact and valid and whole and trusted is not False else
                       "the signed bytes have been changed" if not intact else
                       "the signature does not match the signed data" if not valid else
                       "something was added to the file after it was signed" if not whole else
                       "the signer's certificate does not chain to the trusted certificate")
            report.signatures.append(SignatureReport(
                field=name, signer=signer_name(status.signing_cert), intact=intact, valid=valid,
                covers_whole_file=whole, trusted=trusted, signed_at=when, summary=one_line(status.summary()),
                problem=problem))
        except Exception as exc:  # a damaged signature: reported, never raised
            report.signatures.append(SignatureReport(
                field=name, signer="unknown", intact=False, valid=False, covers_whole_file=False,
                trusted=False if roots else None, signed_at="", summary="damaged",
                problem=str(exc) if isinstance(exc, _Damaged) else
                f"the signature cannot be checked ({type(exc).__name__}: {one_line(exc, 100)})"))
    return report


def _fingerprints(reader) -> list:
    """Design fingerprints written into the document information's keywords by the sheet."""
    try:
        info = reader.trailer_view.get("/Info")
        words = str(info.get_object().get("/Keywords", "")) if info is not None else ""
    except Exception:
        return []
    return [w.split("=", 1)[1] for w in words.replace(",", " ").split() if w.startswith("ditchwright-fingerprint=")]
