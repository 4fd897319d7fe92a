"""Entry point of the ``ditchwright`` command."""

from __future__ import annotations

import argparse
import os
import sys
import tempfile
import traceback

from . import __version__
from .cli import COMMAND_HELP, command_module


class _Parser(argparse.ArgumentParser):
    """Reports a usage error in one line (and exit status 2), without the usage block."""

    def error(self, message):
        self.exit(2, f"{self.prog}: error: {message}\n")


def build_parser(command: str | None = None) -> argparse.ArgumentParser:
    """The whole command line; with ``command`` (a command name), only that command's options are set up and
    the others are listed by name and help alone, so that their modules are not imported."""
    parser = _Parser(prog="ditchwright",
                     description="Design lined drainage channels: normal and critical depth, lining "
                                 "stability, design sheets. Results assist design; a licensed engineer "
                                 "checks them against local codes.")
    parser.add_argument("--version", action="version", version=f"ditchwright {__version__}")
    parser.add_argument("--screenshot", nargs="+", metavar="PATH", default=None,
                        help="PATH [FILE]: render the main window offscreen (on FILE, or on the demo project) "
                             "to the PNG file PATH, at least 1280x800, and exit")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    for name, help_text in COMMAND_HELP.items():
        if command is None or name == command:
            command_module(name).register(sub)
        else:
            sub.add_parser(name, help=help_text)
    return parser


def _command_named(argv) -> str:
    """The command the arguments name (the first argument that is a command's name), or "" for none."""
    return next((a for a in argv if a in COMMAND_HELP), "")


def main(argv=None) -> int:
    argv = sys.argv[1:] if argv is None else list(argv)
    command = _command_named(argv)
    if command == "batch":   # before its modules start threads (see the function)
        from .cli.heap import share_one_heap
        share_one_heap()
    parser = build_parser(command)
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
    from hydraulics.errors import InputError, NoSolutionError

    from .cli.common import CliError, option_name

    try:
        return args.run(args)
    except CliError as exc:
        print(f"ditchwright {args.command}: error: {exc}", file=sys.stderr)
        return exc.status
    except InputError as exc:
        # The core names its field; show it as the option the user typed, in the units of the command.
        print(f"ditchwright {args.command}: error: {option_name(exc.field)}: "
              f"{exc.in_units(_units_of(args)).split(': ', 1)[1]}", file=sys.stderr)
        return 2
    except NoSolutionError as exc:
        print(f"ditchwright {args.command}: no solution: {exc.in_units(_units_of(args))}", file=sys.stderr)
        return 3
    except BrokenPipeError:  # output piped into `head` and the like
        sys.stderr.close()
        return 0
    except KeyboardInterrupt:  # Ctrl+C: a line, not a traceback; files are written whole or not at all
        print(f"ditchwright {args.command}: interrupted; a file it was writing is left as it was",
              file=sys.stderr)
        return INTERRUPTED_STATUS
    except Exception as exc:  # noqa: BLE001 - the last resort: never a traceback on the terminal
        return _report_unexpected(args.command, exc)


def _units_of(args):
    """The unit system a command's numbers are in (its --units; SI for a command without one)."""
    from hydraulics import units as hu

    return hu.system(getattr(args, "units", None) or "si")


#: Exit status when the user interrupts a command (Ctrl+C): 128 + SIGINT, as shells report it (common practice).
INTERRUPTED_STATUS = 130
#: Exit status when the program itself failed (not the input): distinct from 2 (bad input) and 3 (no solution).
UNEXPECTED_STATUS = 70


def _report_unexpected(command: str, exc: BaseException) -> int:
    """One line on stderr for an error the program did not foresee, with the traceback kept in a report file."""
    what = f"{type(exc).__name__}: {exc}".splitlines()[0][:200] if str(exc) else type(exc).__name__
    try:
        fd, path = tempfile.mkstemp(prefix="ditchwright-error-", suffix=".txt")
        with os.fdopen(fd, "w", encoding="utf-8", errors="backslashreplace") as fh:
            fh.write(f"ditchwright {__version__}, command {command!r}\n")
            fh.write(f"arguments: {sys.argv[1:]!r}\n\n")
            fh.write("".join(traceback.format_exception(exc)))
        where = f"; the details are in {path} (please send that file with a bug report)"
    except OSError as report_error:
        where = f"; no report could be written ({report_error.strerror or report_error})"
    print(f"ditchwright {command}: internal error ({what}){where}", file=sys.stderr)
    return UNEXPECTED_STATUS


if __name__ == "__main__":
    sys.exit(main())
