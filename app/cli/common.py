"""Options and helpers shared by the sub-commands: one channel described on the command line.

Every number the user types is in the chosen unit system; it is converted to SI
here, before the core sees it, and results are converted back on output.
"""

from __future__ import annotations

import argparse
import json
import math
import sys

import hydraulics as hy
from hydraulics import units as hu
from hydraulics import validate as hv
from hydraulics.sections import SHAPE_DIMENSIONS

from ..inputs import Input, input_named

_DIMENSION_OPTIONS = ("bottom_width", "side_slope", "left_slope", "right_slope", "diameter", "top_width", "at_depth")


class CliError(Exception):
    """A refusal to report in one line; ``status`` is the exit code (2 bad input, 3 no solution)."""

    def __init__(self, message: str, status: int = 2):
        super().__init__(message)
        self.status = status


def option_name(field: str) -> str:
    return "--" + field.replace("_", "-")


def add_channel_options(parser: argparse.ArgumentParser) -> None:
    """The options that describe one channel (shape, dimensions, slope, flow, n, units)."""
    parser.add_argument("--units", choices=("us", "si"), default="us",
                        help="unit system of every number in and out: us (ft, ft^3/s, lb/ft^2) "
                             "or si (m, m^3/s, Pa); default us")
    parser.add_argument("--shape", choices=tuple(SHAPE_DIMENSIONS), default="trapezoid",
                        help="cross-section shape (default trapezoid)")
    g = parser.add_argument_group("section dimensions (length units)")
    g.add_argument("--bottom-width", type=float, metavar="B", help="bottom width (trapezoid, rectangle)")
    g.add_argument("--side-slope", type=float, metavar="Z", help="both side slopes, horizontal per 1 vertical")
    g.add_argument("--left-slope", type=float, metavar="Z1", help="left side slope H:V")
    g.add_argument("--right-slope", type=float, metavar="Z2", help="right side slope H:V")
    g.add_argument("--diameter", type=float, metavar="D", help="pipe diameter (circle)")
    g.add_argument("--top-width", type=float, metavar="T", help="parabola: top width at --at-depth")
    g.add_argument("--at-depth", type=float, metavar="Y", help="parabola: depth at which --top-width is measured")
    h = parser.add_argument_group("flow")
    h.add_argument("--slope", type=float, metavar="S", help="bed slope as a ratio (ft/ft or m/m), e.g. 0.005 for 0.5 %%")
    h.add_argument("--flow", type=float, metavar="Q", help="design discharge (ft^3/s or m^3/s)")
    h.add_argument("--n", type=float, metavar="N", help="Manning's n")


#: The numeric options, each named as the channel input it gives (app.inputs), whose range it takes from there.
NUMBER_OPTIONS = ("flow", "slope", "n", "bottom_width", "side_slope", "left_slope", "right_slope", "diameter",
                  "top_width", "at_depth", "max_depth", "d50", "bend_radius", "min_freeboard")
#: --max-depth is no input of a channel: the depth that --find bottom-width keeps within.
MAX_DEPTH = Input("max_depth", "Allowable flow depth", "length")
#: Options typed in another unit than the form's: the stone size in ft or m (the form's is in inches or mm).
_OPTION_QUANTITY = {"d50": "length"}


def option_input(field: str, shape: str | None = None) -> Input:
    """The input an option gives; a dimension's is that of ``shape`` (a rectangle's width may not be 0)."""
    return MAX_DEPTH if field == "max_depth" else input_named(field, shape)


def check_numbers(args) -> None:
    """Every numeric option given must be finite and in its input's range (app.inputs), then within the range of
    a design input (hydraulics.validate.LIMITS) (exit 2 otherwise)."""
    units = hu.system(args.units)
    for field in NUMBER_OPTIONS:
        value = getattr(args, field, None)
        if value is None:
            continue
        if not math.isfinite(value):
            raise CliError(f"{option_name(field)} must be a finite number, got {value}")
        spec = option_input(field, getattr(args, "shape", None))
        quantity = _OPTION_QUANTITY.get(field, spec.quantity)
        if not spec.holds(float(units.to_si(quantity, value)) if quantity else value):
            raise CliError(f"{option_name(field)} must be {spec.allowed(units, plain=True)}, got {value:g}"
                           f"{spec.percent_hint(value)}")
        check_limit(field, value, units)


def check_limit(field: str, value: float, units: hu.UnitSystem, option: str | None = None) -> None:
    """Refuse a value typed in ``units`` that lies outside the design range of ``field`` (hydraulics.validate)."""
    limit = hv.limit_for(field)
    if limit is None:
        return
    si = float(units.to_si(limit.quantity, value))
    problem = hv.outside_limit(field, si, units, typed=value)
    if problem:
        raise CliError(f"{option or option_name(field)} {problem}")


def require(args, *fields):
    for f in fields:
        if getattr(args, f, None) is None:
            raise CliError(f"{option_name(f)} is required")


def check_dimensions(args, *, skip=()):
    """Refuse dimension options that do not apply to the shape, or required ones left out."""
    required, allowed = SHAPE_DIMENSIONS[args.shape]
    given = {f for f in _DIMENSION_OPTIONS if getattr(args, f) is not None}
    stray = sorted(given - allowed)
    if stray:
        raise CliError(f"{option_name(stray[0])} does not apply to a {args.shape}")
    for f in sorted(required - set(skip)):
        if f not in given:
            raise CliError(f"{option_name(f)} is required for a {args.shape}")
    if args.shape in ("trapezoid", "triangle") and "side_slope" not in given \
            and not {"left_slope", "right_slope"} <= given:
        raise CliError(f"--side-slope (or --left-slope and --right-slope) is required for a {args.shape}")
    if args.side_slope is not None and (args.left_slope is not None or args.right_slope is not None):
        raise CliError("give --side-slope or --left-slope/--right-slope, not both")


def side_slopes(args) -> dict:
    """The side-slope keyword arguments for a section, as the user gave them."""
    if args.shape in ("rectangle", "parabola", "circle"):
        return {}
    if args.side_slope is not None:
        return {"side_slope": args.side_slope}
    return {"left_slope": args.left_slope, "right_slope": args.right_slope}


def section_from_args(args):
    """Build the SI section from the shape options; refuses options that do not apply."""
    check_dimensions(args)
    units = hu.system(args.units)
    length = lambda v: None if v is None else units.to_si("length", v)  # noqa: E731
    slopes = side_slopes(args)
    if args.shape == "trapezoid":
        return hy.Trapezoid(bottom_width=length(args.bottom_width), **slopes)
    if args.shape == "triangle":
        return hy.Triangle(**slopes)
    if args.shape == "rectangle":
        return hy.Rectangle(bottom_width=length(args.bottom_width))
    if args.shape == "parabola":
        return hy.Parabola(top_width=length(args.top_width), at_depth=length(args.at_depth))
    return hy.Circle(diameter=length(args.diameter))


def unit_labels(units: hu.UnitSystem) -> dict:
    keys = ("length", "flow", "velocity", "area", "shear", "slope")
    return {k: units.label(k) for k in keys}


def emit_json(data) -> None:
    json.dump(data, sys.stdout, indent=2, allow_nan=False)
    sys.stdout.write("\n")


def table(rows) -> str:
    """Two aligned columns: label, value-with-unit."""
    rows = list(rows)
    width = max(len(label) for label, _ in rows)
    return "\n".join(f"  {label:<{width}}  {value}" for label, value in rows)
