"""`ditchwright verify`: is a signed design sheet intact, and was it signed by the engineer (offline)."""

from __future__ import annotations

import os

from . import COMMAND_HELP
from .common import CliError

HELP = COMMAND_HELP["verify"]

#: Exit statuses (also in the README's section on verify).
VALID, NOT_VALID, UNREADABLE, UNTRUSTED = 0, 1, 2, 4


def register(subparsers) -> None:
    p = subparsers.add_parser(
        "verify", help=HELP,
        description=HELP + ". Works offline. Exit status: 0 every signature intact and valid, made with a "
                           "certificate that chains to --trust CERT.pem; 1 not valid (unsigned, changed after "
                           "signing, damaged signature, or a signer that does not chain to CERT.pem); 2 the file "
                           "cannot be read; 4 intact but the signer not checked, because no --trust was given: "
                           "anyone can make a certificate with any name, so the name inside the file is only a claim.")
    p.add_argument("sheet", metavar="SHEET.pdf", help="the signed PDF")
    p.add_argument("--trust", metavar="CERT.pem",
                   help="the engineer's certificate (PEM or DER, e.g. exported from their .p12 with `openssl pkcs12 "
                        "-in engineer.p12 -clcerts -nokeys -out engineer.pem`), or their issuer's, obtained from "
                        "them and not from the sheet")
    p.set_defaults(run=run)


def _yes(value) -> str:
    return {True: "yes", False: "NO", None: "not checked (no --trust)"}[value]


def _print_trusted(s) -> None:
    """With a trusted certificate: each check by name."""
    print(f"    signed by           {s.signer}")
    if s.signed_at:
        print(f"    signed at           {s.signed_at} (signer's clock)")
    print(f"    intact              {_yes(s.intact)}")
    print(f"    valid               {_yes(s.valid)}")
    print(f"    covers whole file   {_yes(s.covers_whole_file)}")
    print(f"    trusted             {_yes(s.trusted)}")


def _print_untrusted(s) -> None:
    """Without one: intact or not, and the name the certificate in the file gives, as a claim."""
    print(f"    claims to be signed by  {s.signer} (the name in the certificate inside the file; not checked)")
    if s.signed_at:
        print(f"    signed at               {s.signed_at} (signer's clock)")
    print(f"    intact                  {'yes: unchanged since it was signed' if s.intact and s.valid else 'NO'}")
    print(f"    covers whole file       {_yes(s.covers_whole_file)}")
    print("    signer checked          no: give the engineer's certificate with --trust CERT.pem")


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
        if s.signer == "unknown":   # damaged: nothing more can be read from it
            print(f"  signature '{s.field}': NOT VALID: {s.problem}")
            continue
        print(f"  signature '{s.field}'")
        (_print_trusted if args.trust else _print_untrusted)(s)
        if s.problem:
            print(f"    problem             {s.problem}")
    for fp in report.fingerprints:
        print(f"  design fingerprint    {fp}")
    outcome = report.outcome
    if outcome == "valid":
        print("  result: INTACT AND VALID, signed with the trusted certificate")
        return VALID
    if outcome == "untrusted":
        names = ", ".join(sorted({f'"{s.signer}"' for s in report.signatures}))
        print(f"  result: INTACT, SIGNER NOT CHECKED: unchanged since it was signed with a certificate that "
              f"calls itself {names}; anyone can make a certificate with that name. Check it with "
              "--trust and the engineer's own certificate.")
        return UNTRUSTED
    print("  result: NOT VALID: do not rely on this sheet")
    return NOT_VALID
