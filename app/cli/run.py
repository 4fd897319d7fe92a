"""`ditchwright run`: every ditch run of a project (or one), station by station, with its lining schedule."""

from __future__ import annotations

import csv
import io

from hydraulics import units as hu
from hydraulics.errors import ConvergenceError, InputError, NoSolutionError
from hydraulics.wording import format_station

from . import COMMAND_HELP
from .common import CliError, emit_json
from .projectfile import load_project

HELP = COMMAND_HELP["run"]

#: Columns of the readable station table: (key of the station rows, heading).
TEXT_COLUMNS = (("station", "Station"), ("flow", "Flow"), ("slope", "Grade"), ("lining", "Lining"),
                ("normal_depth", "Normal"), ("water_depth", "Depth"), ("profile_type", "Profile"),
                ("water_surface", "Surface"), ("velocity", "Velocity"), ("froude", "Fr"), ("bed_shear", "Bed shear"),
                ("permissible_shear", "Permissible"), ("safety_factor", "SF"), ("freeboard", "Freeboard"),
                ("fits", "Fits"))

CAUTION = ("Results assist design; they do not replace the judgement of a licensed engineer, who checks them "
           "against local codes before construction.")


def register(subparsers) -> None:
    p = subparsers.add_parser("run", help=HELP, description=HELP + ". " + CAUTION)
    p.add_argument("project", metavar="PROJECT.json", help="the project file")
    p.add_argument("--run", dest="run_name", metavar="NAME", help="only the run of this name; default every run")
    p.add_argument("--units", choices=("us", "si"), default=None,
                   help="unit system of the output: us or si; default the project's own")
    p.add_argument("--json", action="store_true", help="print the results as JSON")
    p.add_argument("--csv", metavar="FILE", help="write the station table of every run computed to FILE (CSV)")
    p.add_argument("--user-catalogue", metavar="FILE",
                   help="your own lining catalogue (TOML) laid over the shipped one")
    p.set_defaults(run=run)


def run(args) -> int:
    from ..files import write_atomic
    from ..run_design import design_run
    from .lining_args import catalogue_from_args

    project = load_project(args.project)
    units = hu.system(args.units or project.units)
    if not project.runs:
        raise CliError(f"{args.project} has no ditch runs")
    try:
        runs = [project.run(args.run_name)] if args.run_name else list(project.runs)
    except KeyError as exc:
        raise CliError(exc.args[0]) from None
    catalogue = catalogue_from_args(args)
    designs = []
    for r in runs:
        try:
            designs.append(design_run(project, r, catalogue))
        except InputError as exc:
            raise CliError(exc.in_units(units)) from None
        except (NoSolutionError, ConvergenceError) as exc:
            raise CliError(f'run "{r.name}": no solution: {exc.in_units(units)}', status=3) from None
    if args.csv:
        try:
            write_atomic(args.csv, _csv_text(designs, units).encode("utf-8"))
        except OSError as exc:
            raise CliError(f"cannot write {args.csv}: {exc.strerror or exc}") from None
    if args.json:
        emit_json({"units": _unit_labels(units), "runs": [d.to_dict(units) for d in designs]})
    else:
        print("\n\n".join(_text(d, units) for d in designs))
        print(f"\n{CAUTION}")
    return 0


def _unit_labels(units: hu.UnitSystem) -> dict:
    keys = ("length", "small_length", "flow", "velocity", "shear", "slope", "drainage_area", "intensity", "duration",
            "surface", "volume", "mass", "cost")
    return {k: units.label(k) for k in keys}


def _csv_text(designs, units) -> str:
    from ..files import spreadsheet_safe
    from ..results import RUN_STATION_FIELDS

    out = io.StringIO()
    keys = [k for k in designs[0].station_rows(units)[0]] if designs else []
    writer = csv.writer(out, lineterminator="\r\n")
    head = ["run"] + [f"{k} [{units.label(RUN_STATION_FIELDS[k].quantity)}]"
                      if k in RUN_STATION_FIELDS and RUN_STATION_FIELDS[k].quantity not in ("", "slope") else k
                      for k in keys]
    writer.writerow(head)
    for d in designs:
        for row in d.station_rows(units):
            writer.writerow([spreadsheet_safe(d.run.name)] + [spreadsheet_safe(row[k]) for k in keys])
    return out.getvalue()


def _text(design, units) -> str:
    from ..results import RUN_TABLE_FIELDS, format_value, grade_text
    from ..run_summary import run_summary

    summary = run_summary(design, units)
    res = design.result
    run = design.run
    L = lambda v: format_value(v, RUN_TABLE_FIELDS["length"], units)  # noqa: E731
    lines = [f'Run "{run.name}": {L(res.layout.length)} from {format_station(res.layout.first_station, units)} to '
             f"{format_station(res.layout.last_station, units)}, {run.return_period:g}-year storm, outfall at "
             f"{format_station(run.outfall.station, units)}{f' ({run.outfall.kind})' if run.outfall.kind else ''}",
             "", "Lining schedule"]
    for s in summary.stretches:   # the schedule as the window's results panel and the run sheet state it
        lines.append(f"  {s['from_station']:>10} to {s['to_station']:>10}  {s['lining']}, {s['length']} "
                     f"{summary.length_unit}, {s['cost']}")
        lines.append("      " + "; ".join(f"{item} {amount} {unit}" for item, amount, unit in s["quantities"]))
    lines.append(f"  Total cost: {summary.total_cost}")
    rows = design.station_rows(units)
    from ..results import RUN_STATION_FIELDS
    heads = []
    for key, head in TEXT_COLUMNS:
        q = RUN_STATION_FIELDS[key].quantity
        unit = "" if key == "station" or q in ("", "slope") else f" [{units.label(q)}]"
        heads.append(head + unit)
    cells = [[row[k] if k != "slope" else grade_text(float(row[k])) for k, _ in TEXT_COLUMNS] for row in rows]
    widths = [max(len(h), *(len(c[i]) for c in cells)) for i, h in enumerate(heads)]
    lines += ["", "Stations", "  " + "  ".join(h.rjust(w) for h, w in zip(heads, widths))]
    for c, st in zip(cells, summary.states):   # what is wrong at each point, as the window and the sheet say it
        words = st.trouble_words() or ([st.why] if st.why else [])
        mark = f"  <- {', '.join(words)}" if words else ""
        lines.append("  " + "  ".join(x.rjust(w) for x, w in zip(c, widths)) + mark)
    lines.append("  (Depth: water depth from the water-surface profile, used for the fit of the ditch; the shear "
                 "check uses normal depth, HEC-15's design depth)")
    lines += ["", "Water-surface controls"] + [f"  - {t}" for t in summary.controls]
    lines += ["", "Hydraulic jumps"] + ([f"  - {t}" for t in summary.jumps] or ["  - none"])
    if summary.warnings:
        lines += ["", "Warnings"] + [f"  - {w}" for w in summary.warnings]
    lines += ["", "Method"] + [f"  - {n}" for n in summary.notes]
    if summary.not_verified:
        lines += ["", "Not verified against the circular"] + [f"  - {n}" for n in summary.not_verified]
    return "\n".join(lines)
