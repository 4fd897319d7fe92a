"""Changing a ditch run's inputs without Qt, and one station of a solved run made into a channel.

The window's document turns each change into one undoable command with these; they work on
:mod:`app.project` objects alone and leave the one given unchanged (each change is a copy).

    new = with_run_value(run, "profile[2].elevation", 46.0)
    new = with_outfall_control(run, "level", 45.86)
    new = with_item_added(run, "bends", 0)          # a bend after the first, to be edited
    new = with_item_removed(run, "profile", 3)       # or ValueError, in words, why not
    channel = station_channel(design, 12, "North verge ditch at 0+180.00", units)
"""

from __future__ import annotations

import copy
import re

from hydraulics.units import UnitSystem, system
from hydraulics.wording import format_station, in_units, worded

from .editing import numbered
from .project import (OUTFALL_CONTROLS, Channel, FlowBasis, LiningChoice, Outfall, PointInflowInput, ProfilePoint,
                      Run, RunBend, RunCandidate, RunSection, SubAreaInput)

__all__ = ["with_run_value", "run_value", "with_outfall_control", "with_item_added", "with_item_removed", "new_run",
           "starting_run",
           "station_channel", "StationNotOpenable", "cost_quantity", "RUN_ITEMS", "RUN_SETTINGS", "ADDABLE",
           "item_path", "OUTFALL_LEVEL_PATH", "REPLACEABLE", "with_item_replaced"]

#: The outfall water level as the project file and the core's messages name it.
OUTFALL_LEVEL_PATH = "outfall.water_level"

#: The lists of a run the window edits item by item, and the attributes it changes in them.
RUN_ITEMS = {"profile": ("station", "elevation"), "candidates": ("unit_cost",),
             "sub_areas": ("area", "runoff_coefficient", "from_station", "to_station"),
             "sections": ("from_station", "to_station", "ditch_depth"),
             "bends": ("from_station", "to_station", "radius"),
             "point_inflows": ("station", "flow")}
#: Values of the run itself the window edits: name -> (quantity of hydraulics.units, "" a pure number).
RUN_SETTINGS = {"return_period": "", "spacing": "length", "min_stretch": "length", "min_freeboard": "length"}
#: The lists an item can be added to or removed from in the window, with the fewest items each must keep.
ADDABLE = {"profile": 2, "sections": 1, "candidates": 1, "sub_areas": 0, "bends": 0, "point_inflows": 0}
_PATH = re.compile(r"^(" + "|".join(RUN_ITEMS) + r")\[(\d+)\]\.([a-z_]+)$")


def item_path(items: str, index: int, attribute: str) -> str:
    """``profile[2].elevation``: an item's value as the project file and the core's messages name it."""
    return f"{items}[{index}].{attribute}"


def _parse(path: str) -> tuple[str, int | None, str]:
    if path in RUN_SETTINGS:
        return "", None, path
    m = _PATH.match(path)
    if m is None or m.group(3) not in RUN_ITEMS[m.group(1)]:
        raise KeyError(f"unknown run input {path!r}; the window edits "
                       + ", ".join([f"{k}[i].{a}" for k, attrs in RUN_ITEMS.items() for a in attrs]
                                   + list(RUN_SETTINGS)))
    return m.group(1), int(m.group(2)), m.group(3)


def run_value(run: Run, path: str):
    """The value of one input of ``run`` (SI), ``path`` like ``sub_areas[1].area``."""
    items, index, attribute = _parse(path)
    return getattr(run if index is None else getattr(run, items)[index], attribute)


def with_run_value(run: Run, path: str, value) -> Run:
    """A copy of ``run`` with one input changed (SI)."""
    items, index, attribute = _parse(path)
    out = copy.deepcopy(run)
    if index is None:
        setattr(out, attribute, value)
        return out
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


#: Round starting values of a new run or a new item in each unit system: (quantity, US customary, SI), shown
#: values (common practice: a short roadside ditch at 1 % on a small trapezoid, a 10-minute sub-area).
STARTING = {
    "length": ("length", 500.0, 150.0),
    "grade": ("", 0.01, 0.01),
    "bottom_width": ("length", 2.0, 0.6),
    "ditch_depth": ("length", 2.0, 0.6),
    "area": ("drainage_area", 2.5, 1.0),
    "inflow": ("flow", 2.0, 0.05),
    "bend_length": ("length", 50.0, 15.0),
    "radius": ("length", 100.0, 30.0),
    "spacing": ("length", 50.0, 15.0),
    "min_freeboard": ("length", 0.5, 0.15),
}


def _start(name: str, units: str) -> float:
    """The SI value of starting value ``name`` in unit system ``units``."""
    quantity, us, si = STARTING[name]
    shown = us if units == "us" else si
    return float(system(units).to_si(quantity, shown)) if quantity else shown


def with_item_added(run: Run, items: str, after: int | None = None, units: str = "si", item=None) -> Run:
    """A copy of ``run`` with one item added to the list ``items`` (a key of :data:`ADDABLE`) after item
    ``after`` (the last when None), to be edited in place; ``units`` picks round values for an item made from
    nothing; ``item`` is the item itself where it cannot be made up (a candidate lining: the user's choice).

    A grade point goes half way between ``after`` and the next point (the ends of the run stay where they are);
    a section range is split at its middle, the new half keeping its shape; a sub-area, bend or inflow copies
    item ``after`` under a new name, or starts at round values when the list is empty."""
    if items not in ADDABLE:
        raise KeyError(f"items {items!r}: the window adds to {', '.join(ADDABLE)}")
    out = copy.deepcopy(run)
    seq = getattr(out, items)
    k = len(seq) - 1 if after is None else after
    if seq and not 0 <= k < len(seq):
        raise KeyError(f"{items}[{k}]: the run has {len(seq)}")
    first, last = run.profile[0].station, run.profile[-1].station
    if items == "candidates":
        if not isinstance(item, RunCandidate):
            raise ValueError("a candidate lining is added by choosing it from the catalogue")
        if any(c.key == item.key and c.d50 == item.d50 for c in seq):
            raise ValueError(f"The run has the lining {item.key!r} among its candidates already.")
        seq.insert(k + 1, copy.deepcopy(item))
    elif items == "profile":
        k = min(k, len(seq) - 2)
        a, b = seq[k], seq[k + 1]
        seq.insert(k + 1, ProfilePoint((a.station + b.station) / 2, (a.elevation + b.elevation) / 2))
    elif items == "sections":
        rs = seq[k]
        middle = (rs.from_station + rs.to_station) / 2
        second = copy.deepcopy(rs)
        rs.to_station, second.from_station = middle, middle
        seq.insert(k + 1, second)
    elif seq:
        item = copy.deepcopy(seq[k])
        if hasattr(item, "name"):
            item.name = numbered(item.name, {i.name for i in seq})
        seq.insert(k + 1, item)
    elif items == "sub_areas":
        seq.append(SubAreaInput(name="Sub-area 1", area=_start("area", units),
                                time_of_concentration={"method": "typed", "value": 600.0}, from_station=first,
                                to_station=last, runoff_coefficient=0.5))
    elif items == "bends":
        middle, half = (first + last) / 2, _start("bend_length", units) / 2
        seq.append(RunBend(max(first, middle - half), min(last, middle + half), _start("radius", units)))
    else:
        seq.append(PointInflowInput(name="Inflow 1", station=first, flow=_start("inflow", units)))
    return out


def with_item_removed(run: Run, items: str, index: int) -> Run:
    """A copy of ``run`` without item ``index`` of the list ``items``; ValueError, in words, where the run cannot
    do without it: the ends of the profile, the last section, fewer items than :data:`ADDABLE` allows. A
    section's stations go to its neighbour (the one before, or after for the first), so the sections still
    cover the run."""
    if items not in ADDABLE:
        raise KeyError(f"items {items!r}: the window removes from {', '.join(ADDABLE)}")
    seq = getattr(run, items)
    if not 0 <= index < len(seq):
        raise KeyError(f"{items}[{index}]: the run has {len(seq)}")
    keep = ADDABLE[items]
    if items == "profile" and index in (0, len(seq) - 1):
        raise ValueError("The first and last grade points are the ends of the run: change their station or "
                         "elevation instead of deleting them.")
    if len(seq) <= keep:
        what = {"profile": "grade points", "sections": "section", "candidates": "candidate lining"}[items]
        raise ValueError(f"A run keeps at least {keep} {what}: add another before deleting this one.")
    out = copy.deepcopy(run)
    seq = getattr(out, items)
    gone = seq.pop(index)
    if items == "sections":
        if index > 0:
            seq[index - 1].to_station = gone.to_station
        else:
            seq[0].from_station = gone.from_station
    return out


def new_run(name: str, units: str, candidates) -> Run:
    """A new run at the round starting values of ``units`` (see :data:`STARTING`), lined with one of
    ``candidates`` (:class:`RunCandidate`, copied; each needs a unit cost, its own or the catalogue's, for the
    cheapest to be chosen): two grade points, one trapezoidal section, one sub-area draining in along its whole
    length, the outfall at its lower end controlled by normal depth."""
    length, grade = _start("length", units), _start("grade", units)
    top = 100.0 if units == "si" else float(system(units).to_si("length", 100.0))
    section = {"shape": "trapezoid", "bottom_width": _start("bottom_width", units), "left_slope": 3.0,
               "right_slope": 3.0}
    run = Run(name=name, profile=[ProfilePoint(0.0, top), ProfilePoint(length, top - grade * length)],
              outfall=Outfall(station=length), sections=[RunSection(0.0, length, section, _start("ditch_depth", units))],
              candidates=copy.deepcopy(list(candidates)), sub_areas=[],
              spacing=_start("spacing", units), min_stretch=_start("spacing", units),
              min_freeboard=_start("min_freeboard", units))
    return with_item_added(run, "sub_areas", units=units)


#: Linings a new run may use when there is no run to copy them from: (catalogue key, D50 [m]); the user types
#: their unit costs (the shipped catalogue has none).
NEW_RUN_LININGS = (("grass_good_sod", None), ("riprap", 0.15), ("concrete", None))


def starting_run(project, catalogue, like: Run | None = None) -> Run:
    """A new run for ``project`` (:func:`new_run` in its units) named "Run k" (the first k not in use), with the
    candidates of the run ``like`` or, without one, those of :data:`NEW_RUN_LININGS` in ``catalogue``."""
    if like is not None:
        candidates = like.candidates
    else:
        candidates = [RunCandidate(key, d50) for key, d50 in NEW_RUN_LININGS if key in catalogue]
    names = {r.name for r in project.runs}
    name = next(f"Run {k}" for k in range(1, len(names) + 2) if f"Run {k}" not in names)
    return new_run(name, project.units, candidates)


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


#: The lists whose items the window replaces whole (edited in a dialog), with the item class each holds.
REPLACEABLE = {"sub_areas": SubAreaInput, "sections": RunSection}


def with_item_replaced(run: Run, items: str, index: int, item) -> Run:
    """A copy of ``run`` whose item ``index`` of the list ``items`` (a key of :data:`REPLACEABLE`) is ``item``
    (copied): a sub-area or section edited as a whole, its time of concentration, land covers or shape with it."""
    if items not in REPLACEABLE:
        raise KeyError(f"items {items!r}: the window replaces whole items of {', '.join(REPLACEABLE)}")
    if not isinstance(item, REPLACEABLE[items]):
        raise TypeError(f"{items}[{index}] takes a {REPLACEABLE[items].__name__}, got {type(item).__name__}")
    seq = getattr(run, items)
    if not 0 <= index < len(seq):
        raise KeyError(f"{items}[{index}]: the run has {len(seq)}")
    out = copy.deepcopy(run)
    getattr(out, items)[index] = copy.deepcopy(item)
    return out
