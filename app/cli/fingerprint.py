"""`ditchwright fingerprint`: recompute the design fingerprint printed on a sheet."""

from __future__ import annotations

from .common import CliError
from .projectfile import load_project

HELP = "print the design fingerprint (SHA-256 of a channel's inputs, its lining entries and the program version)"


def register(subparsers) -> None:
    p = subparsers.add_parser("fingerprint", help=HELP,
                              description=HELP + ", to compare with the one printed on a design sheet.")
    p.add_argument("file", metavar="FILE", help="the project file")
    p.add_argument("--channel", metavar="NAME", help="only this channel; default every channel, one a line")
    p.add_argument("--user-catalogue", metavar="FILE",
                   help="the user lining catalogue the sheet was made with (TOML), laid over the shipped one")
    p.set_defaults(run=run)


def run(args) -> int:
    from ..sheet.fingerprint import fingerprint
    from .lining_args import catalogue_from_args

    project = load_project(args.file)
    catalogue = catalogue_from_args(args)
    if args.channel is not None:
        try:
            channel = project.channel(args.channel)
        except KeyError as exc:
            raise CliError(exc.args[0]) from None
        print(fingerprint(channel, catalogue=catalogue))
        return 0
    for ch in project.channels:
        print(f"{fingerprint(ch, catalogue=catalogue)}  {ch.name}")
    return 0
