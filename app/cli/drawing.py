"""`ditchwright drawing`: DXF drawings of a project for CAD, one typical section per channel, one profile per run."""

from __future__ import annotations

from hydraulics import units as hu
from hydraulics.errors import InputError, NoSolutionError

from . import COMMAND_HELP
from .common import CliError
from .projectfile import load_project

HELP = COMMAND_HELP["drawing"]


def register(subparsers) -> None:
    p = subparsers.add_parser("drawing", help=HELP, description=HELP + ". Files are named after the channel or "
                              "run (NAME-section.dxf, NAME-profile.dxf); an existing file of that name is replaced.")
    p.add_argument("project", metavar="PROJECT", help="the project file")
    p.add_argument("--out", metavar="DIR", required=True, help="the folder to write into (made when missing)")
    p.add_argument("--channel", metavar="NAME", action="append",
                   help="this channel's section (repeat for several); with neither --channel nor --run, every "
                        "channel and every run")
    p.add_argument("--run", dest="run_name", metavar="NAME", action="append",
                   help="this ditch run's profile (repeat for several)")
    p.add_argument("--units", choices=("us", "si"), default=None,
                   help="drawing units: us (1 unit = 1 ft) or si (1 unit = 1 m); default the project's own")
    p.add_argument("--user-catalogue", metavar="FILE",
                   help="your own lining catalogue (TOML) laid over the shipped one")
    p.set_defaults(run=run)


def run(args) -> int:
    from ..drawings import export_drawings
    from .lining_args import catalogue_from_args

    project = load_project(args.project)
    catalogue = catalogue_from_args(args)
    try:
        written = export_drawings(project, args.out, channels=args.channel, runs=args.run_name, units=args.units,
                                  catalogue=catalogue)
    except KeyError as exc:
        raise CliError(exc.args[0]) from None
    except InputError as exc:   # a value of the file, named as it is there
        said = exc.in_units(hu.system(args.units or project.units))
        raise CliError(f"{exc.channel}: {said}" if getattr(exc, "channel", None) else said) from None
    except NoSolutionError as exc:
        where, said = getattr(exc, "channel", None), exc.in_units(hu.system(args.units or project.units))
        raise CliError(f"{where}: no solution: {said}" if where else f"no solution: {said}", status=3) from None
    except OSError as exc:
        raise CliError(f"cannot write into {args.out}: {exc.strerror or exc}") from None
    if not written:
        print(f"nothing to draw: {args.project} has no channels and no runs")
    for path in written:
        print(f"wrote {path}")
    return 0
