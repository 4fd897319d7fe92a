"""Lining options shared by `calc` and `compare`: catalogue, lining choice, bend, freeboard.

Numbers are in the chosen unit system (D50, bend radius and freeboard in the
length unit, ft or m) and converted to SI here. Every refusal is one line
naming the option (exit status 2).
"""

from __future__ import annotations

from pathlib import Path

from hydraulics import units as hu
from hydraulics.errors import InputError
from hydraulics.linings import CatalogueError, hec15, load_catalogue
from hydraulics.lining_comparison import parse_choice

from .common import CliError, check_limit

LINING_HELP = ("lining from the catalogue, KEY or KEY:D50 (D50 in the length unit), e.g. concrete, riprap:0.5, "
               "gravel; see resources/linings.toml")


def add_lining_options(parser, *, many: bool) -> None:
    g = parser.add_argument_group("lining")
    if many:
        g.add_argument("--lining", action="append", metavar="KEY[:D50]", help=LINING_HELP + "; repeat to compare")
    else:
        g.add_argument("--lining", metavar="KEY[:D50]", help=LINING_HELP)
        g.add_argument("--d50", type=float, metavar="D", help="stone size D50 of a riprap or gravel lining (ft or m)")
    g.add_argument("--bend-radius", type=float, metavar="R",
                   help="centre-line radius of the sharpest bend (ft or m); adds bend shear and superelevation")
    g.add_argument("--min-freeboard", type=float, metavar="F",
                   help=f"minimum freeboard (ft or m); default {hec15.MIN_FREEBOARD:g} m (0.5 ft)")
    g.add_argument("--user-catalogue", metavar="FILE",
                   help="your own lining catalogue (TOML, same layout as the shipped one): prices, soils, "
                        "data-sheet values of blankets and mats")


def catalogue_from_args(args):
    """The shipped catalogue with --user-catalogue laid over it."""
    path = getattr(args, "user_catalogue", None)
    if path is not None and not Path(path).is_file():
        raise CliError(f"--user-catalogue: no such file: {path}")
    try:
        return load_catalogue(user_path=path)
    except CatalogueError as exc:
        raise CliError(f"--user-catalogue: {exc}") from None
    except OSError as exc:   # unreadable (permissions), a folder, a device that fails
        raise CliError(f"--user-catalogue: cannot read {path}: {exc.strerror or exc}") from None


def choice_from_text(text: str, units: hu.UnitSystem):
    """(key, D50 [m] or None) from 'KEY' or 'KEY:D50' typed in the user's length unit."""
    try:
        key, d50 = parse_choice(text)
    except InputError as exc:
        message = str(exc).split(": ", 1)[1]
        if exc.field == "d50":
            raise CliError(f"--lining {text}: D50 {message}") from None
        raise CliError(f"--lining: {message}") from None
    if d50 is not None:
        check_limit("d50", d50, units, option=f"--lining {text}: D50")
        d50 = units.to_si("length", d50)
    return key, d50


def require_stone_size(lining, d50, units: hu.UnitSystem, typed: str, d50_option: bool = True) -> None:
    """Refuse a stone lining chosen without its D50: the catalogue's typical size is no design value."""
    if d50 is None and lining.category == "stone":
        typical = "" if lining.d50 is None else \
            f" (the catalogue's typical {units.from_si('length', lining.d50):.3g} {units.label('length')} is not assumed)"
        raise CliError(f"--lining {typed}: give the stone size D50 in {units.label('length')}, as "
                       f"--lining {lining.key}:D50{' or --d50 D' if d50_option else ''}{typical}")


def lining_options_si(args, units: hu.UnitSystem) -> dict:
    """bend_radius and min_freeboard in SI, for check_lining / compare_linings."""
    out = {"bend_radius": None if args.bend_radius is None else units.to_si("length", args.bend_radius)}
    out["min_freeboard"] = (hec15.MIN_FREEBOARD if args.min_freeboard is None
                            else units.to_si("length", args.min_freeboard))
    return out


def explain(exc: InputError, units: hu.UnitSystem, top_width=None) -> CliError:
    """A core InputError from a lining check, as one line naming the option the user typed."""
    field = exc.field
    message = str(exc).split(": ", 1)[1] if ": " in str(exc) else str(exc)
    if field.startswith("lining '"):
        key, _, rest = field[len("lining '"):].partition("' ")
        hint = "; pass that file with --user-catalogue FILE" if "user data" in message else ""
        return CliError(f"--lining {key}: {rest} {message}{hint}")
    if field == "bend_radius" and top_width is not None:
        half = units.from_si("length", top_width / 2)
        return CliError(f"--bend-radius must be at least half the water-surface width "
                        f"({half:.3g} {units.label('length')}); the inner bank would lie beyond the bend's centre")
    return CliError(f"--{field.replace('_', '-')}: {message}")
