"""`ditchwright import`: a project made from a LandXML 1.2 file (road profiles as ditch runs, cross-sections as
surveyed sections)."""

from __future__ import annotations

from . import COMMAND_HELP
from .common import CliError

HELP = COMMAND_HELP["import"]


def register(subparsers) -> None:
    p = subparsers.add_parser("import", help=HELP, description=HELP + ". Each profile (PVIs with parabolic vertical "
                              "curves, or station-elevation pairs) becomes a ditch run's invert; each cross-section "
                              "a surveyed section over the stretch nearer to it than to any other. What was imported "
                              "and what was skipped is printed; a file that cannot be read as a whole is refused and "
                              "nothing is written.")
    p.add_argument("file", metavar="FILE.xml", help="the LandXML 1.2 file")
    p.add_argument("--out", metavar="PROJECT.json", required=True,
                   help="the project file to write (an existing file of that name is replaced)")
    p.add_argument("--spacing", type=float, metavar="S",
                   help="design-point spacing of the runs in the file's length unit; vertical curves are sampled "
                        "at its whole multiples of station (default 50 ft or 15 m)")
    p.add_argument("--n", type=float, metavar="N",
                   help="Manning's n on every segment of the surveyed sections (default 0.030)")
    p.add_argument("--surface", metavar="NAME",
                   help="the cross-section surface (CrossSectSurf name) to take; default the first of each")
    p.set_defaults(run=run)


def run(args) -> int:
    from ..landxml_import import LandXMLError, import_landxml
    from ..project import ProjectFileError, ProjectSaveError

    try:
        report = import_landxml(args.file, args.out, spacing=args.spacing, n=args.n, surface=args.surface)
    except LandXMLError as exc:
        raise CliError(f"{args.file}: {exc}; nothing was written") from None
    except (ProjectFileError, ProjectSaveError) as exc:
        raise CliError(f"{args.file}: the project made from it is not valid ({exc}); nothing was written") from None
    except OSError as exc:
        raise CliError(f"cannot write {args.out}: {exc.strerror or exc}") from None
    for line in report.lines():
        print(line)
    print(f"wrote {args.out}")
    return 0
