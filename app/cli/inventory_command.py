"""`ditchwright batch`: check a whole ditch inventory (CSV or GeoPackage) at once."""

from __future__ import annotations

import argparse
import os
import sys
import time
from pathlib import Path

from hydraulics.linings import CatalogueError, load_catalogue

from .. import inventory as ai
from . import COMMAND_HELP
from .common import CliError

HELP = COMMAND_HELP["batch"]
#: From an inventory file of this many bytes (some 20,000 reaches) a progress bar is drawn (on a terminal).
PROGRESS_FROM_BYTES = 1_000_000
#: Problem rows listed on stderr; all of them are in the results file's reason column.
MAX_LISTED = 50

EPILOG = f"""\
columns: {', '.join(ai.INPUT_COLUMNS)} (all in the header, blank where not relevant; other columns are
carried through). Lengths in ft or m, flow in ft^3/s or m^3/s, side slopes H:V, slope as a ratio.
Results add: {', '.join(ai.RESULT_COLUMNS)}, in the same units.
A GeoPackage (.gpkg) inventory is a layer of lines with the same columns; without a 'length' column each
reach's length is measured on its line (a projected coordinate system is needed for that). A .gpkg results
file is a layer with the input's geometry, coordinate system and attributes and the result columns; CSV and
GeoPackage may be mixed. With --plot, a GeoPackage inventory's map is saved beside the plot (NAME-map.png).
exit status: 0 every row was checked; 1 results written but some rows are invalid (listed on stderr,
reason in the file); 2 the file or an option cannot be used (nothing written)."""


def register(subparsers) -> None:
    p = subparsers.add_parser("batch", help=HELP, description=HELP + ".", epilog=EPILOG,
                              formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("inventory", metavar="INVENTORY.csv|.gpkg", help="the inventory to check")
    p.add_argument("--layer", metavar="NAME", help="the layer of a GeoPackage inventory (default: its only layer)")
    p.add_argument("-o", "--output", metavar="RESULTS.csv|.gpkg", required=True, help="results file to write")
    p.add_argument("--units", choices=("us", "si"), default="us",
                   help="unit system of the inventory and the results: us (ft, ft^3/s, lb/ft^2) or "
                        "si (m, m^3/s, Pa); default us")
    p.add_argument("--plot", metavar="PATH", help="also save a summary plot (.png, .pdf or .svg), and for a "
                                                  "GeoPackage inventory a map of the reaches beside it")
    p.add_argument("--units-checked", action="store_true",
                   help="check an inventory whose columns look typed in different unit systems (refused "
                        "otherwise) once you have made sure of its units")
    p.add_argument("--user-catalogue", metavar="TOML",
                   help="user lining catalogue over the shipped one (same layout; prices, data-sheet values)")
    bar = p.add_mutually_exclusive_group()
    bar.add_argument("--progress", dest="progress", action="store_true", default=None,
                     help="always draw the progress bar")
    bar.add_argument("--no-progress", dest="progress", action="store_false", help="never draw it")
    p.set_defaults(run=run)


def _same_file(a: Path, b: Path) -> bool:
    try:
        return b.exists() and os.path.samefile(a, b)
    except OSError:
        return False


def run(args) -> int:
    source, target = Path(args.inventory), Path(args.output)
    if _same_file(source, target):
        raise CliError(f"the results file {target} is the inventory itself; write the results elsewhere")
    if args.plot is not None and Path(args.plot).suffix.lower() not in ai.PLOT_FORMATS:
        raise CliError(f"--plot {args.plot}: the name must end in {', '.join(ai.PLOT_FORMATS)}")
    if args.plot is not None and not Path(args.plot).resolve().parent.is_dir():
        raise CliError(f"--plot {args.plot}: no such folder: {Path(args.plot).resolve().parent}")
    try:   # the shipped catalogue, with --user-catalogue laid over it
        catalogue = load_catalogue(user_path=args.user_catalogue)
    except (CatalogueError, OSError) as exc:
        raise CliError(f"--user-catalogue {args.user_catalogue}: {exc}") from None
    start = time.perf_counter()
    show = args.progress if args.progress is not None else (
        source.is_file() and source.stat().st_size >= PROGRESS_FROM_BYTES and sys.stderr.isatty())
    bar = ProgressBar("checking", enabled=show, percent=True)
    try:
        tally = ai.check_file(source, target, args.units, progress=bar, catalogue=catalogue, problems=MAX_LISTED,
                              layer=args.layer, units_checked=args.units_checked)
    except ai.MixedUnits as exc:
        raise CliError(f"{source}: {exc} Nothing was written; if the units are right, run again with "
                       f"--units-checked.") from None
    except ai.InventoryError as exc:
        raise CliError(str(exc)) from None
    except OSError as exc:
        raise CliError(f"cannot write {target}: {exc.strerror or exc}") from None
    finally:
        bar.close()
    elapsed = time.perf_counter() - start
    if tally.units_finding is not None:      # one-sided (a warning), or mixed and checked by the user
        print(f"warning: {tally.units_finding.text}", file=sys.stderr)
    for line, ident, verdict, reason in tally.problems:
        name = f" (id {ident!r})" if ident else ""
        where = f":{line}" if tally.row_word == "line" else f": {tally.row_word} {line}"
        print(f"{tally.source}{where}{name}: {verdict}: {reason}", file=sys.stderr)
    if tally.problem_count > MAX_LISTED:
        print(f"... and {tally.problem_count - MAX_LISTED:,} more; every one has its reason in {target}",
              file=sys.stderr)
    print(tally.summary(elapsed))
    print(f"  results: {target}")
    if args.plot is not None:
        from ..inventory import plots   # matplotlib, loaded only when a plot is asked for

        try:
            plots.plot_summary(tally, args.plot, title=f"Ditch inventory {source.name}")
        except OSError as exc:
            raise CliError(f"--plot {args.plot}: cannot write the plot: {exc.strerror or exc} (the results were "
                           f"written to {target})") from None
        print(f"  plot: {args.plot}")
        if tally.lines is not None:
            where = map_path(args.plot)
            try:
                plots.plot_map(tally.lines, tally.counts(), where, title=f"Ditch inventory {source.name}")
            except OSError as exc:
                raise CliError(f"--plot {args.plot}: cannot write the map {where}: {exc.strerror or exc} (the "
                               f"results were written to {target})") from None
            print(f"  map: {where}")
    return 1 if tally.counts()["invalid"] else 0


def map_path(plot) -> Path:
    """Where the map goes: beside the summary plot ``plot``, ``-map`` added to its name (same format)."""
    plot = Path(plot)
    return plot.with_name(f"{plot.stem}-map{plot.suffix}")


class ProgressBar:
    """A one-line progress bar on a terminal stream; silent when the stream is not a terminal."""

    def __init__(self, label: str, stream=None, enabled: bool | None = None, width: int = 30, percent=False):
        """``percent``: show the share done only (not ``done/total``, e.g. bytes of a file)."""
        self.stream = stream if stream is not None else sys.stderr
        self.percent = percent
        self.enabled = self.stream.isatty() if enabled is None else enabled
        self.label, self.width, self.shown = label, width, False

    def __call__(self, done: int, total: int) -> None:
        if not self.enabled or total <= 0:
            return
        filled = int(self.width * done / total)
        self.stream.write(f"\r{self.label} [{'#' * filled}{'.' * (self.width - filled)}] "
                          f"{100 * done / total:3.0f}%{'' if self.percent else f' {done:,}/{total:,}'}")
        self.stream.flush()
        self.shown = True

    def close(self) -> None:
        if self.shown:
            self.stream.write("\n")
            self.stream.flush()
            self.shown = False
