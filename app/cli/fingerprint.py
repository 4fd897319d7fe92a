"""`ditchwright fingerprint`: recompute the design fingerprint printed on a sheet."""

from __future__ import annotations

from .common import CliError
from .projectfile import load_project

HELP = "print the design fingerprint (SHA-256 of a channel's inputs and the program version)"


def register(subparsers) -> None:
    p = subparsers.add_parser("fingerprint", help=HELP,
                              description=HELP + ", to compare with the one printed on a design sheet.")
    p.add_argument("file", metavar="FILE", help="the project file")
    p.add_argument("--channel", metavar="NAME", help="only this channel; default every channel, one a line")
    p.set_defaults(run=run)


def run(args) -> int:
    from ..sheet.fingerprint import fingerprint

    project = load_project(args.file)
    if args.channel is not None:
        try:
            channels = [project.channel(args.channel)]
        except KeyError as exc:
            raise CliError(exc.args[0]) from None
        print(fingerprint(channels[0]))
        return 0
    for ch in project.channels:
        print(f"{fingerprint(ch)}  {ch.name}")
    return 0
