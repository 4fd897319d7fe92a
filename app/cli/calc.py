"""`ditchwright calc`: one channel's uniform-flow state, and with --lining its stability, as a table or JSON."""

from __future__ import annotations

from dataclasses import replace

from hydraulics import provenance
from hydraulics import units as hu
from hydraulics.errors import InputError
from hydraulics.wording import format_quantity, in_units

from ..evaluate import WIDTH_SHAPES, evaluate_channel, lining_json, width_for_depth
from ..project import Channel, FlowBasis, LiningChoice
from ..results import CHANNEL_FIELDS, EXTRA_FIELDS, convert, format_value, panel_field, rounded
from ..lining_names import STONE_SIZE, name_in_units
from ..verdicts import Verdict, with_tokens
from . import COMMAND_HELP
from .common import (CliError, add_channel_options, check_dimensions, check_numbers, emit_json, require, section_from_args,
                     side_slopes, table, unit_labels)
from .lining_args import (add_lining_options, catalogue_from_args, choice_from_text, explain, lining_options_si,
                          require_stone_size)

HELP = COMMAND_HELP["calc"]


def register(subparsers) -> None:
    p = subparsers.add_parser("calc", help=HELP, description=HELP + "; with --lining, check the lining's "
                              "stability (FHWA HEC-15 permissible shear), freeboard and ditch depth.")
    add_channel_options(p)
    p.add_argument("--max-depth", type=float, metavar="Y",
                   help="allowable flow depth, with --find bottom-width")
    p.add_argument("--find", choices=("bottom-width",),
                   help="find the bottom width that keeps normal depth <= --max-depth")
    add_lining_options(p, many=False)
    p.add_argument("--json", action="store_true", help="print JSON instead of a table")
    p.set_defaults(run=run)


def _lining(args, units):
    """(LiningChoice, catalogue) from --lining/--d50/--user-catalogue, or (None, None); refuses options that need a
    lining, and a lining the catalogue cannot give as asked."""
    if args.lining is None:
        for opt in ("d50", "bend_radius", "min_freeboard", "user_catalogue"):
            if getattr(args, opt) is not None:
                raise CliError(f"--{opt.replace('_', '-')} is used with --lining")
        return None, None
    if args.n is not None:
        raise CliError("give --n or --lining, not both (the lining sets its own Manning's n)")
    key, d50 = choice_from_text(args.lining, units)
    if args.d50 is not None:
        if d50 is not None:
            raise CliError("give the D50 once: --lining KEY:D50 or --d50 D, not both")
        d50 = units.to_si("length", args.d50)
    catalogue = catalogue_from_args(args)
    try:
        lining = catalogue.get(key)
        require_stone_size(lining, d50, units, args.lining)
        lining.roughness(d50)  # refuses a D50 for a lining that takes none, and unfilled user data
    except InputError as exc:
        raise explain(exc, units) from None
    return LiningChoice(key, d50), catalogue


def solve(args):
    """Return (ChannelDesign, found bottom width [m] or None) from the options: the channel they describe,
    evaluated by the one evaluation every front end shares (:func:`app.evaluate.evaluate_channel`)."""
    check_numbers(args)
    units = hu.system(args.units)
    lining, catalogue = _lining(args, units)
    require(args, "flow", "slope")
    if lining is None:
        require(args, "n")
    options = lining_options_si(args, units) if lining is not None else {}
    channel = Channel(name="calc", flow=FlowBasis(value=units.to_si("flow", args.flow)), slope=args.slope,
                      lining=lining, manning_n=args.n if lining is None else None, **options)
    catalogue = catalogue if catalogue is not None else catalogue_from_args(args)
    found = None
    if args.find == "bottom-width":
        if args.shape not in WIDTH_SHAPES:
            raise CliError("--find bottom-width works for a trapezoid or a rectangle")
        if args.bottom_width is not None:
            raise CliError("--bottom-width is what --find bottom-width solves for; leave it out")
        require(args, "max_depth")
        check_dimensions(args, skip=("bottom_width",))
        channel.section = {"shape": args.shape, **side_slopes(args)}
        channel, found = width_for_depth(channel, units.to_si("length", args.max_depth), catalogue)
    else:
        if args.max_depth is not None:
            raise CliError("--max-depth is used with --find bottom-width")
        channel.section = section_from_args(args).to_dict()
    try:
        return evaluate_channel(channel, catalogue), found
    except InputError as exc:
        if lining is None:
            raise
        top = None
        if exc.field == "bend_radius":   # the message quotes half the width of the same channel without its bend
            top = evaluate_channel(replace(channel, bend_radius=None), catalogue).analysis.top_width
        raise explain(exc, units, top) from None


def stability_rows(stab, units) -> list:
    """(label, value) rows of a lining check, in the user's units, rounded as the window's results panel and the
    sheet round them (app.results.PANEL_FIELDS)."""
    # stone sizes and layer thicknesses in mm or inches, to a tenth, as the window's results panel and the sheet
    stone = lambda v: format_value(v, STONE_SIZE, units)  # noqa: E731
    shown = lambda v, key: format_value(v, panel_field(key), units)  # noqa: E731
    T = lambda v: shown(v, "bed_shear")  # noqa: E731
    sf = lambda v: rounded(v, panel_field("safety_factor"))  # noqa: E731
    rows = [("Lining", f"{name_in_units(stab.lining_name, units)} ({stab.lining_key})"),
            ("Manning's n used", f"{shown(stab.manning_n, 'manning_n')}, {stab.n_source}")]
    if stab.d50 is not None:
        rows.append(("D50", stone(stab.d50)))
    rows.append(("Bed shear (HEC-15 Eq. 3.1)", T(stab.bed_shear)))
    if stab.side_shear is not None:
        rows.append(("Side-slope shear (K1)", T(stab.side_shear)))
    if stab.bend_shear is not None:
        rows.append(("Bend shear (Kb)", f"{T(stab.bend_shear)} (Kb = {rounded(stab.bend_factor, EXTRA_FIELDS['bend_factor'])})"))
        rows.append(("Protection below the bend", shown(stab.bend_protection_length, "bend_protection_length")))
    if stab.permissible_shear is not None:
        rows.append(("Permissible shear", T(stab.permissible_shear)))
    if stab.permissible_shear_side is not None:
        rows.append(("Permissible on side slopes", T(stab.permissible_shear_side)))
    if stab.safety_factor is not None:
        rows.append(("Safety factor", f"{sf(stab.safety_factor)} ({sf(stab.required_safety_factor)} needed)"))
    rows.append(("Verdict", stab.reason(units)))
    if stab.required_d50 is not None:
        rows.append(("Smallest stable D50", stone(stab.required_d50)))
    if stab.layer_thickness is not None:
        rows.append(("Layer thickness", stone(stab.layer_thickness)))
    if stab.superelevation is not None:
        # to three figures, as the sheet words it: a superelevation of a few millimetres keeps its size
        rows.append(("Superelevation in the bend", format_quantity(stab.superelevation, "length", units)))
    rows += [("Freeboard", shown(stab.freeboard, "freeboard")),
             ("Total ditch depth", shown(stab.total_depth, "total_depth")),
             ("Top width at top of ditch", shown(stab.top_width_at_top, "top_width_at_top"))]
    return rows


def run(args) -> int:
    units = hu.system(args.units)
    design, found = solve(args)
    section, result, stab = design.section, design.analysis, design.stability
    warnings = [in_units(w, units) for w in (result.warnings if stab is None else stab.warnings)]
    texts = result.warnings if stab is None else stab.cited_texts()
    unverified = provenance.not_verified_lines(provenance.cited_not_verified(texts))
    if args.json:
        out = {f.key: convert(getattr(result, f.key), f.quantity, units) for f in CHANNEL_FIELDS}
        if found is not None:
            out["bottom_width"] = units.from_si("length", found)
        if stab is not None:
            out["lining"] = lining_json(stab, units)
            out["stability"] = stab.to_dict(units)
            with_tokens(out, stab)
        # without a lining calc checks hydraulics only, whatever the ditch's depth (no ditch depth is given)
        out["verdict"] = (Verdict.HYDRAULICS_ONLY if stab is None else design.verdict).token
        out["units"] = unit_labels(units)
        out["warnings"] = warnings
        out["not_verified"] = unverified
        emit_json(out)
        return 0
    rows = []
    if found is not None:
        field = EXTRA_FIELDS["bottom_width"]
        rows.append((field.label, format_value(found, field, units)))
    rows += [(f.label, format_value(getattr(result, f.key), f, units)) for f in CHANNEL_FIELDS]
    print(f"Uniform flow in a {section.kind}, {args.flow:g} {units.label('flow')} "
          f"on {args.slope:g} {units.label('slope')}:")
    print(table(rows))
    if stab is not None:
        print("Lining stability (FHWA HEC-15 permissible shear):")
        print(table(stability_rows(stab, units)))
        print(f"  Freeboard rule: {stab.freeboard_rule(units)}")
        for note in stab.notes:
            print(f"  Note: {in_units(note, units)}")
    for w in warnings:
        print(f"  Warning: {w}")
    if unverified:
        print(f"{provenance.NOT_VERIFIED_TITLE} ({provenance.NOT_VERIFIED_MARK}; check each before relying on "
              "this result):")
        for line in unverified:
            print(f"  {line}")
    return 0
