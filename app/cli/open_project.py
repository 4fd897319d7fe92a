"""`ditchwright open FILE`: open a project file in the window."""

from __future__ import annotations

from pathlib import Path

from . import COMMAND_HELP
from .common import CliError

HELP = COMMAND_HELP["open"]


def register(subparsers) -> None:
    p = subparsers.add_parser("open", help=HELP, description=HELP + ".")
    p.add_argument("file", metavar="FILE", help="project file (.json)")
    p.set_defaults(run=run)


def run(args) -> int:
    path = Path(args.file)
    if not path.is_file():
        raise CliError(f"no such project file: {path}")
    from ..gui.application import run as run_window  # Qt is loaded only for the window
    return run_window(path)
