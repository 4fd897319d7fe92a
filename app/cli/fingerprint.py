"""`ditchwright fingerprint`: recompute the design fingerprint printed on a sheet."""

from __future__ import annotations

from . import COMMAND_HELP
from .common import CliError
from .projectfile import load_project

HELP = COMMAND_HELP["fingerprint"]


def register(subparsers) -> None:
    p = subparsers.add_parser("fingerprint", help=HELP,
                              description=HELP + ", to compare with the one printed on a design sheet. With --run, "
                                                 "the fingerprint of a ditch run (its inputs, the project's rainfall, "
                                                 "its candidates' lining entries and the program version), as "
                                                 "printed on each page of the run's sheet.")
    p.add_argument("file", metavar="FILE", help="the project file")
    which = p.add_mutually_exclusive_group()
    which.add_argument("--channel", metavar="NAME", help="only this channel; default every channel, one a line")
    which.add_argument("--run", dest="run_name", metavar="NAME", help="the ditch run of this name")
    p.add_argument("--user-catalogue", metavar="FILE",
                   help="the user lining catalogue the sheet was made with (TOML), laid over the shipped one")
    p.set_defaults(run=run)


def run(args) -> int:
    from ..sheet.fingerprint import fingerprint, run_fingerprint
    from .lining_args import catalogue_from_args

    project = load_project(args.file)
    catalogue = catalogue_from_args(args)
    if getattr(args, "run_name", None) is not None:
        from hydraulics.errors import InputError

        try:
            ditch_run = project.run(args.run_name)
            print(run_fingerprint(project, ditch_run, catalogue=catalogue))
        except KeyError as exc:
            raise CliError(exc.args[0]) from None
        except InputError as exc:
            raise CliError(f'run "{args.run_name}": {exc}') from None
        return 0
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
