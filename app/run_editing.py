"""Changing a ditch run's inputs without Qt, and one station of a solved run made into a channel.

The window's document turns each change into one undoable command with these; they work on
:mod:`app.project` objects alone and leave the one given unchanged (each change is a copy).

    new = with_run_value(run, "profile[2].elevation", 46.0)
    new = with_outfall_control(run, "level", 45.86)
    channel = station_channel(design, 12, "North verge ditch at 0+180.00", units)
"""

from __future__ import annotations

import copy
import re

from hydraulics.units import UnitSystem
from hydraulics.wording import format_station, in_units, worded

from .project import OUTFALL_CONTROLS, Channel, FlowBasis, LiningChoice, Run

__all__ = ["with_run_value", "run_value", "with_outfall_control", "station_channel", "StationNotOpenable",
           "cost_quantity", "RUN_ITEMS", "item_path", "OUTFALL_LEVEL_PATH"]

#: The outfall water level as the project file and the core's messages name it.
OUTFALL_LEVEL_PATH = "outfall.water_level"

#: The lists of a run the window edits item by item, and the attributes it changes in them.
RUN_ITEMS = {"profile": ("station", "elevation"), "candidates": ("unit_cost",),
             "sub_areas": ("area", "runoff_coefficient", "from_station")}
_PATH = re.compile(r"^(profile|candidates|sub_areas)\[(\d+)\]\.([a-z_]+)$")


def item_path(items: str, index: int, attribute: str) -> str:
    """``profile[2].elevation``: an item's value as the project file and the core's messages name it."""
    return f"{items}[{index}].{attribute}"


def _parse(path: str) -> tuple[str, int, str]:
    m = _PATH.match(path)
    if m is None or m.group(3) not in RUN_ITEMS[m.group(1)]:
        raise KeyError(f"unknown run input {path!r}; the window edits "
                       + ", ".join(f"{k}[i].{a}" for k, attrs in RUN_ITEMS.items() for a in attrs))
    return m.group(1), int(m.group(2)), m.group(3)


def run_value(run: Run, path: str):
    """The value of one input of ``run`` (SI), ``path`` like ``sub_areas[1].area``."""
    items, index, attribute = _parse(path)
    return getattr(getattr(run, items)[index], attribute)


def with_run_value(run: Run, path: str, value) -> Run:
    """A copy of ``run`` with one input changed (SI)."""
    items, index, attribute = _parse(path)
    out = copy.deepcopy(run)
    seq = getattr(out, items)
    if not 0 <= index < len(seq):
        raise KeyError(f"{path!r}: the run has {len(seq)} {items.replace('_', '-')}")
    setattr(seq[index], attribute, value)
    return out


def with_outfall_control(run: Run, control: str, water_level: float | None) -> Run:
    """A copy of ``run`` whose outfall is controlled by ``control`` ("normal", "critical" or "level") with the
    outfall water level ``water_level`` [m] (needed for "level"; kept, unused, with the other two so that going
    back to "level" finds it again)."""
    if control not in OUTFALL_CONTROLS:
        raise KeyError(f"outfall control {control!r}: must be one of {', '.join(OUTFALL_CONTROLS)}")
    if control == "level" and water_level is None:
        raise ValueError("the outfall control is a known water level, so give that level")
    out = copy.deepcopy(run)
    out.outfall.control = control
    out.outfall.water_level = None if water_level is None else float(water_level)
    return out


def cost_quantity(basis: str) -> str:
    """The unit-system quantity a unit cost is priced per: "surface" (per area of lined surface) or "volume"
    (per volume of the layer), as the catalogue entry's ``unit_cost_basis`` says."""
    return "surface" if basis == "area" else "volume"


class StationNotOpenable(ValueError):
    """A design point that makes no channel: no flow has reached it, or it has no falling grade."""


def station_channel(design, index: int, name: str, units: UnitSystem) -> Channel:
    """Design point ``index`` of ``design`` (an :class:`app.run_design.RunDesign`) as a channel of its own: its
    section, design flow, grade, scheduled lining (the run's other candidates for the comparison), bend radius
    and the run's minimum freeboard, all as the run computed them (SI). ``units`` words the location and notes.

    Raises StationNotOpenable, in words, where the point has no flow or no falling grade (no normal depth)."""
    p = design.result.points[index]
    run = design.run
    where = format_station(p.station, units)
    if p.flow <= 0 or p.grade <= 0:
        why = p.not_checked or ("no flow has reached this point yet" if p.flow <= 0 else "no falling grade")
        raise StationNotOpenable(f"Station {where} cannot be opened as a channel: {why}.")
    chosen = run.candidates[p.choice] if p.choice >= 0 else None
    lining = LiningChoice(chosen.key, chosen.d50) if chosen is not None else None
    others = [LiningChoice(c.key, c.d50) for c in run.candidates if c is not chosen]
    notes = in_units(worded("Opened from the ditch run {run} at station {where}: design flow {q} by the rational "
                            "method along the run, ditch depth as built {depth}. Edits here do not change the run.",
                            run=run.name, where=where, q=(p.flow, "flow"), depth=(p.ditch_depth, "length")), units)
    return Channel(name=name, location=f"{run.name}, station {where}",
                   flow=FlowBasis(method="typed", value=float(p.flow)), slope=float(p.grade),
                   section=copy.deepcopy(run.sections[p.section_index].section), lining=lining,
                   manning_n=None if lining is not None else 0.030, bend_radius=p.bend_radius,
                   min_freeboard=float(run.min_freeboard), alternatives=others, notes=notes)
