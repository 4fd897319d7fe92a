"""`ditchwright calc`: one channel's uniform-flow state, as a table or JSON."""

from __future__ import annotations

import hydraulics as hy
from hydraulics import units as hu

from ..results import CHANNEL_FIELDS, convert, format_value
from .common import (CliError, add_channel_options, check_dimensions, check_numbers, emit_json, require, section_from_args,
                     side_slopes, table, unit_labels)

HELP = "compute normal and critical depth, velocity, Froude number and shear for one channel"


def register(subparsers) -> None:
    p = subparsers.add_parser("calc", help=HELP, description=HELP + ".")
    add_channel_options(p)
    p.add_argument("--max-depth", type=float, metavar="Y",
                   help="allowable flow depth, with --find bottom-width")
    p.add_argument("--find", choices=("bottom-width",),
                   help="solve for the bottom width that keeps normal depth <= --max-depth")
    p.add_argument("--json", action="store_true", help="print JSON instead of a table")
    p.set_defaults(run=run)


def solve(args):
    """Return (section, ChannelResult, found bottom width or None), all SI."""
    check_numbers(args)
    require(args, "flow", "slope", "n")
    units = hu.system(args.units)
    flow = units.to_si("flow", args.flow)
    found = None
    if args.find == "bottom-width":
        if args.shape not in ("trapezoid", "rectangle"):
            raise CliError("--find bottom-width works for a trapezoid or a rectangle")
        if args.bottom_width is not None:
            raise CliError("--bottom-width is what --find bottom-width solves for; leave it out")
        require(args, "max_depth")
        check_dimensions(args, skip=("bottom_width",))
        max_depth = units.to_si("length", args.max_depth)
        slopes = side_slopes(args)
        found = hy.bottom_width_for_depth(flow, args.slope, args.n, max_depth, **slopes)
        if found == 0.0:
            section = hy.Triangle(**slopes)
        elif args.shape == "rectangle":
            section = hy.Rectangle(bottom_width=found)
        else:
            section = hy.Trapezoid(bottom_width=found, **slopes)
    else:
        if args.max_depth is not None:
            raise CliError("--max-depth is used with --find bottom-width")
        section = section_from_args(args)
    return section, hy.analyse(section, flow, args.slope, args.n), found


def run(args) -> int:
    units = hu.system(args.units)
    section, result, found = solve(args)
    if args.json:
        out = {f.key: convert(getattr(result, f.key), f.quantity, units) for f in CHANNEL_FIELDS}
        if found is not None:
            out["bottom_width"] = units.from_si("length", found)
        out["units"] = unit_labels(units)
        out["warnings"] = list(result.warnings)
        emit_json(out)
        return 0
    rows = []
    if found is not None:
        rows.append(("Bottom width found", f"{units.from_si('length', found):.3f} {units.label('length')}"))
    rows += [(f.label, format_value(getattr(result, f.key), f, units)) for f in CHANNEL_FIELDS]
    print(f"Uniform flow in a {section.kind}, {args.flow:g} {units.label('flow')} "
          f"on {args.slope:g} {units.label('slope')}:")
    print(table(rows))
    for w in result.warnings:
        print(f"  Warning: {w}")
    return 0
