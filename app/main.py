"""Entry point of the ``ditchwright`` command."""

from __future__ import annotations

import argparse
import sys

from hydraulics.errors import InputError, NoSolutionError

from . import __version__
from .cli import COMMANDS
from .cli.common import CliError, option_name


class _Parser(argparse.ArgumentParser):
    """Reports a usage error in one line (and exit status 2), without the usage block."""

    def error(self, message):
        self.exit(2, f"{self.prog}: error: {message}\n")


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="ditchwright",
                     description="Design lined drainage channels: normal and critical depth, lining "
                                 "stability, design sheets. Results assist design; a licensed engineer "
                                 "checks them against local codes.")
    parser.add_argument("--version", action="version", version=f"ditchwright {__version__}")
    parser.add_argument("--screenshot", nargs="+", metavar="PATH", default=None,
                        help="PATH [FILE]: render the main window offscreen (on FILE, or on the demo project) "
                             "to the PNG file PATH, at least 1280x800, and exit")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    for module in COMMANDS:
        module.register(sub)
    return parser


def main(argv=None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    if args.screenshot is not None:
        if args.command is not None or len(args.screenshot) > 2:
            parser.error("--screenshot takes PATH and an optional FILE, and no command")
        from .gui.application import screenshot
        return screenshot(*args.screenshot)
    if args.command is None:
        # No command: the desktop window (the demo project on the first start).
        from .gui.application import run as run_window
        return run_window()
    try:
        return args.run(args)
    except CliError as exc:
        print(f"ditchwright {args.command}: error: {exc}", file=sys.stderr)
        return exc.status
    except InputError as exc:
        # The core names its field; show it as the option the user typed.
        print(f"ditchwright {args.command}: error: {option_name(exc.field)}: {str(exc).split(': ', 1)[1]}",
              file=sys.stderr)
        return 2
    except NoSolutionError as exc:
        print(f"ditchwright {args.command}: no solution: {exc}", file=sys.stderr)
        return 3
    except BrokenPipeError:  # output piped into `head` and the like
        sys.stderr.close()
        return 0


if __name__ == "__main__":
    sys.exit(main())
