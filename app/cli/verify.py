"""`ditchwright verify`: is a signed design sheet intact, and who signed it (offline)."""

from __future__ import annotations

import os

from .common import CliError

HELP = "check the digital signature of a design sheet: intact, valid, who signed"


def register(subparsers) -> None:
    p = subparsers.add_parser("verify", help=HELP, description=HELP + ". Works offline. Exit status 0 only when "
                              "every signature is intact and valid (and, with --trust, made with a certificate "
                              "that chains to CERT.pem); 1 when not; 2 when the file cannot be read.")
    p.add_argument("sheet", metavar="SHEET.pdf", help="the signed PDF")
    p.add_argument("--trust", metavar="CERT.pem", help="the certificate (PEM or DER) to trust, e.g. the engineer's "
                                                       "own or their issuer's")
    p.set_defaults(run=run)


def _yes(value) -> str:
    return {True: "yes", False: "NO", None: "not checked (no --trust)"}[value]


def run(args) -> int:
    from ..sheet import VerifyError, verify_pdf

    if not os.path.isfile(args.sheet):
        raise CliError(f"no such file: {args.sheet}")
    if args.trust and not os.path.isfile(args.trust):
        raise CliError(f"no such file: {args.trust}")
    try:
        report = verify_pdf(args.sheet, trust=args.trust)
    except VerifyError as exc:
        raise CliError(str(exc)) from None
    print(f"{args.sheet}:")
    if not report.signatures:
        print("  not signed: the file has no digital signature")
    for s in report.signatures:
        print(f"  signature '{s.field}'")
        print(f"    signed by           {s.signer}")
        if s.signed_at:
            print(f"    signed at           {s.signed_at} (signer's clock)")
        print(f"    intact              {_yes(s.intact)}")
        print(f"    valid               {_yes(s.valid)}")
        print(f"    covers whole file   {_yes(s.covers_whole_file)}")
        print(f"    trusted             {_yes(s.trusted)}")
    for fp in report.fingerprints:
        print(f"  design fingerprint    {fp}")
    print("  result: " + ("INTACT AND VALID" if report.ok else "NOT VALID: do not rely on this sheet"))
    return 0 if report.ok else 1
