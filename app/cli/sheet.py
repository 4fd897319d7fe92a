"""`ditchwright sheet`: the design sheets of a project as one PDF, optionally signed."""

from __future__ import annotations

import sys

from hydraulics import units as hu
from hydraulics.errors import InputError, NoSolutionError

from . import COMMAND_HELP
from .common import CliError
from .projectfile import load_project

HELP = COMMAND_HELP["sheet"]


def register(subparsers) -> None:
    p = subparsers.add_parser("sheet", help=HELP, description=HELP + ". The certificate's password is asked "
                              "for, or read from DITCHWRIGHT_CERT_PASSWORD when there is no terminal; it is "
                              "never stored.")
    p.add_argument("project", metavar="PROJECT.json", help="the project file")
    p.add_argument("--channel", metavar="NAME", action="append",
                   help="this channel (repeat for several); with neither --channel nor --run, every channel and "
                        "every run")
    p.add_argument("--run", dest="run_name", metavar="NAME", action="append",
                   help="this ditch run (repeat for several): its profile to scale, lining schedule, sub-areas, "
                        "rainfall and station table; with --run alone, only the runs named")
    p.add_argument("-o", "--output", metavar="OUT.pdf", required=True, help="the PDF to write")
    p.add_argument("--sign", metavar="CERT.p12", help="sign with this PKCS#12 key file (PAdES)")
    p.add_argument("--page", choices=("letter", "a4"), default="letter", help="paper size (default letter)")
    p.add_argument("--user-catalogue", metavar="FILE",
                   help="your own lining catalogue (TOML) laid over the shipped one; the fingerprints printed "
                        "include the lining entries used, so pass the same file to `ditchwright fingerprint`")
    p.set_defaults(run=run)


def run(args) -> int:
    from ..sheet import SheetLayoutError, SigningError, export_sheets
    from .lining_args import catalogue_from_args

    project = load_project(args.project)
    if not args.output.lower().endswith(".pdf"):
        raise CliError(f"-o must name a .pdf file, got {args.output!r}")
    catalogue = catalogue_from_args(args)
    runs = getattr(args, "run_name", None)
    if args.channel or runs:
        channels, runs = args.channel or [], runs or []
    else:
        channels, runs = None, None        # neither: every channel and every run
    try:
        notes = export_sheets(project, args.output, channels=channels, page=args.page, sign=args.sign,
                              catalogue=catalogue, runs=runs)
    except KeyError as exc:
        raise CliError(exc.args[0]) from None
    except InputError as exc:   # a value of the file, named as it is there, not as an option
        said = exc.in_units(hu.system(project.units))
        raise CliError(f"{exc.channel}: {said}" if getattr(exc, "channel", None) else said) from None
    except NoSolutionError as exc:
        raise CliError(f"{exc.channel}: no solution: {exc.in_units(hu.system(project.units))}", status=3) from None
    except (SigningError, SheetLayoutError) as exc:
        raise CliError(str(exc)) from None
    except OSError as exc:
        raise CliError(f"cannot write {args.output}: {exc.strerror or exc}") from None
    for note in notes:
        print(f"ditchwright sheet: note: {note}", file=sys.stderr)
    n_channels = len(project.channels) if channels is None else len(channels)
    n_runs = len(project.runs) if runs is None else len(runs)
    what = [f"{n} {word}{'s' if n != 1 else ''}" for n, word in ((n_channels, "channel sheet"), (n_runs, "run sheet"))
            if n or word == "channel sheet" and not n_runs]
    print(f"wrote {args.output}: {', '.join(what)}, {args.page}{', signed' if args.sign else ''}")
    return 0
