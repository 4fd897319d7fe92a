"""`ditchwright compare`: the same channel and flow with several linings, one row each."""

from __future__ import annotations

from dataclasses import replace

from hydraulics import units as hu
from hydraulics.errors import InputError
from hydraulics.wording import in_units

from ..comparison_table import ComparisonTable, comparison_table
from ..context import Context
from ..evaluate import evaluate_channel, lining_comparison
from ..project import Channel, FlowBasis, LiningChoice
from ..verdicts import with_tokens

from . import COMMAND_HELP
from .common import CliError, add_channel_options, check_numbers, emit_json, require, section_from_args
from .lining_args import (add_lining_options, catalogue_from_args, choice_from_text, explain, lining_options_si,
                          require_stone_size)

HELP = COMMAND_HELP["compare"]

def register(subparsers) -> None:
    p = subparsers.add_parser("compare", help=HELP, description=HELP + " (FHWA HEC-15 permissible shear). "
                              "Costs come only from unit costs in your --user-catalogue.")
    add_channel_options(p)
    add_lining_options(p, many=True)
    p.add_argument("--json", action="store_true", help="print a JSON list of rows instead of a table")
    p.set_defaults(run=run)


def render(table: ComparisonTable) -> str:
    """The one comparison table (:mod:`app.comparison_table`) as aligned text, units in the headings."""
    heads = [table.heading(f, "()") for f in table.columns]
    cells = table.body()
    widths = [max(len(h), *(len(c[i]) for c in cells)) for i, h in enumerate(heads)]
    lines = ["  ".join(h.ljust(w) for h, w in zip(heads, widths))]
    lines.append("  ".join("-" * w for w in widths))
    lines += ["  ".join(c.ljust(w) for c, w in zip(row, widths)) for row in cells]
    return "\n".join(lines)


def run(args) -> int:
    check_numbers(args)
    units = hu.system(args.units)
    if args.n is not None:
        raise CliError("compare takes Manning's n from each lining; leave --n out")
    if not args.lining:
        raise CliError("--lining is required (give it once per lining to compare, e.g. --lining concrete "
                       "--lining riprap:0.5)")
    require(args, "flow", "slope")
    choices = [choice_from_text(text, units) for text in args.lining]
    catalogue = catalogue_from_args(args)
    for text, (key, d50) in zip(args.lining, choices):
        try:
            require_stone_size(catalogue.get(key), d50, units, text, d50_option=False)
        except InputError as exc:
            raise explain(exc, units) from None
    options = lining_options_si(args, units)
    channel = Channel(name="compare", flow=FlowBasis(value=units.to_si("flow", args.flow)), slope=args.slope,
                      section=section_from_args(args).to_dict(), manning_n=None, **options)
    try:
        rows = lining_comparison(channel, catalogue, choices)
    except InputError as exc:
        top = None
        if exc.field == "bend_radius":
            straight = replace(channel, lining=LiningChoice(*choices[0]), bend_radius=None)
            top = evaluate_channel(straight, catalogue).analysis.top_width
        raise explain(exc, units, top) from None
    section = channel.build_section()
    data = with_tokens({"comparison": [r.to_dict(units) for r in rows]}, full_depth=section.full_depth,
                       rows=rows)["comparison"]
    if args.json:
        emit_json(data)
        return 0
    print(f"Linings for a {section.kind}, {args.flow:g} {units.label('flow')} on {args.slope:g} "
          f"{units.label('slope')} (FHWA HEC-15 permissible shear):")
    print(render(comparison_table(rows, Context(catalogue, units), section.full_depth)))
    for r in rows:
        print(f"  {r.key}: {r.result.reason(units) if r.result is not None else in_units(r.reason, units)}")
        for w in r.warnings:
            print(f"    Warning: {in_units(w, units)}")
    if all(d["cost_per_length"] is None for d in data):
        print("  Cost: no unit costs set; add unit_cost to linings in a --user-catalogue file")
    return 0
