"""The drawing of a ditch run's profile, as one model that the window (matplotlib) and the sheet (PDF) both draw.

Everything is already in the user's units and worded: the front ends only place lines, bands, markers and
labels. Qt-free, no plotting library.

    model = profile_model(design, units)
    model.lines["invert"].x, model.lines["invert"].y
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from hydraulics.ditch_run import ranges_of
from hydraulics.units import UnitSystem
from hydraulics.wording import format_station

from .lining_names import name_in_units
from .results import grade_text
from .run_design import RunDesign
from .run_summary import TROUBLE, station_states

__all__ = ["Polyline", "Band", "Marker", "GradeLabel", "JumpMark", "ProfileModel", "profile_model", "station_step",
           "level_text"]


@dataclass(frozen=True)
class Polyline:
    """One line along the run: stations ``x`` and elevations ``y`` (user's units; NaN breaks the line)."""

    label: str
    x: np.ndarray
    y: np.ndarray


@dataclass(frozen=True)
class Band:
    """A station range with a label: a lining stretch (status "stretch") or a trouble spot (a key of
    :data:`app.run_summary.TROUBLE`: "not stable", "overtopped", "too shallow", "not computed": the water surface
    could not be computed, "not checked")."""

    start: float
    end: float
    label: str
    status: str


@dataclass(frozen=True)
class Marker:
    """An inflow: where it enters (``start`` = ``end`` for one station, a range for a spread sub-area)."""

    start: float
    end: float
    label: str


@dataclass(frozen=True)
class GradeLabel:
    x: float          # the middle of the grade stretch
    y: float          # its invert there
    text: str         # "0.60 %"
    falling: bool = True   # the invert falls along the stationing (a label fits under it on the upstream side)


@dataclass(frozen=True)
class JumpMark:
    """A hydraulic jump: the station of its toe and of the end of its roller, the water surface before and after
    it (user's units), and its label ("jump 0+329.14")."""

    start: float
    end: float
    low: float
    high: float
    label: str


@dataclass
class ProfileModel:
    """The profile of one run in the user's units (``length_unit``), ready to draw."""

    title: str
    length_unit: str
    first_station: float
    last_station: float
    lines: dict                                     # name -> Polyline: invert, ditch_top, water_surface, normal,
                                                    # critical
    stretches: list = field(default_factory=list)   # Band, status "stretch"
    trouble: list = field(default_factory=list)     # Band, other statuses
    inflows: list = field(default_factory=list)     # Marker
    grades: list = field(default_factory=list)      # GradeLabel
    ticks: list = field(default_factory=list)       # (station, "0+100.00")
    outfall: tuple = ()                             # (station, invert, label)
    grade_points: Polyline | None = None            # the invert profile's points as given (grade breaks), by station
    jumps: list = field(default_factory=list)       # JumpMark
    #: how each line is drawn, by name: "solid", "dashed" (normal depth, the ditch top) or "dotted" (critical depth)
    styles: dict = field(default_factory=lambda: dict(LINE_STYLES))

    def y_range(self) -> tuple[float, float]:
        """The lowest and highest elevation drawn."""
        ys = np.concatenate([ln.y[np.isfinite(ln.y)] for ln in self.lines.values()])
        return float(ys.min()), float(ys.max())


#: How each line of the profile is drawn (every front end follows it).
LINE_STYLES = {"invert": "solid", "ditch_top": "dashed", "water_surface": "solid", "normal": "dashed",
               "critical": "dotted"}


def level_text(value: float) -> str:
    """An elevation (or a factor) as the profile drawings write it: every figure it has, to 12 significant
    (10000.25 kept whole, where "%g" gave 10000.2), none of the float's own noise."""
    return f"{value:.12g}"


def station_step(length: float, units: UnitSystem, ticks: int = 8) -> float:
    """A round spacing of station ticks [user's length unit] giving about ``ticks`` ticks over ``length``: 1, 2 or
    5 times a power of ten, at least 10 (common practice for profile grids)."""
    raw = max(length / max(ticks, 1), 1e-9)
    power = 10 ** math.floor(math.log10(raw))
    for m in (1, 2, 5, 10):
        if m * power >= raw:
            return max(m * power, 10.0)
    return max(10 * power, 10.0)


def profile_model(design: RunDesign, units: UnitSystem) -> ProfileModel:
    """The profile of ``design`` (an app.run_design.RunDesign) in ``units``."""
    res = design.result
    L = lambda v: np.asarray(units.from_si("length", np.asarray(v, dtype=float)), dtype=float)  # noqa: E731
    pts = res.points
    ws = design.surface
    stations = L([p.station for p in pts])
    invert = L([p.invert for p in pts])
    top = L([p.invert + p.ditch_depth for p in pts])
    normal = L(ws.invert + ws.normal_depth)
    crit = L(ws.invert + ws.critical_depth)
    order = np.argsort(stations)
    lines = {name: Polyline(label, stations[order], y[order]) for name, label, y in (
        ("ditch_top", "Top of ditch", top), ("invert", "Invert", invert),
        ("normal", "Normal depth", normal), ("critical", "Critical depth", crit))}
    # the computed water surface through every computation node of the profile (smoother than the design points)
    if ws.profile is not None:
        prof = ws.profile
        xs = L(res.layout.station_of(prof.detail_distance))
        ys = L(prof.detail_bed + prof.detail_depth)
        o = np.argsort(xs, kind="stable")
        lines["water_surface"] = Polyline("Water surface (computed)", xs[o], ys[o])
    else:
        lines["water_surface"] = Polyline("Water surface (not computed)", stations[order],
                                          np.full(stations.size, np.nan))
    lines = {k: lines[k] for k in ("ditch_top", "invert", "water_surface", "normal", "critical")}
    model = ProfileModel(title=design.run.name, length_unit=units.label("length"),
                         first_station=float(L(res.layout.first_station)), last_station=float(L(res.layout.last_station)),
                         lines=lines)
    for q in res.quantities:
        a, b = sorted((float(L(q.start)), float(L(q.end))))
        model.stretches.append(Band(a, b, name_in_units(q.lining_name, units), "stretch"))
    states = station_states(design)   # the one answer of the station table, the run sheet and the run command
    for status in TROUBLE:
        for a, b in _spans([status in st.trouble for st in states], stations):
            model.trouble.append(Band(a, b, status, status))
    for j in ws.jumps:
        a, b = float(L(j.station)), float(L(j.end_station))
        z = float(L(np.interp(res.layout.x_of(j.station), res.layout.x, res.layout.invert)))
        model.jumps.append(JumpMark(a, b, z + float(L(j.jump.upstream_depth)), z + float(L(j.jump.downstream_depth)),
                                    f"jump {format_station(j.station, units)}"))
    for sa in design.run.sub_areas:
        a = float(L(sa.from_station))
        b = a if sa.to_station is None else float(L(sa.to_station))
        model.inflows.append(Marker(min(a, b), max(a, b), sa.name))
    for pi in design.run.point_inflows:
        s = float(L(pi.station))
        model.inflows.append(Marker(s, s, pi.name))
    lay = res.layout
    for j, g in enumerate(lay.grades):
        s0, s1 = lay.station_of([lay.profile_x[j], lay.profile_x[j + 1]])
        mid = 0.5 * (s0 + s1)
        model.grades.append(GradeLabel(float(L(mid)), float(L(np.interp(0.5 * (lay.profile_x[j] + lay.profile_x[j + 1]),
                                                                       lay.profile_x, lay.profile_z))),
                                       grade_text(g), bool(g >= 0)))
    step = station_step(model.last_station - model.first_station, units)
    k0 = math.ceil(model.first_station / step - 1e-9)
    k1 = math.floor(model.last_station / step + 1e-9)
    model.ticks = [(k * step, format_station(units.to_si("length", k * step), units)) for k in range(k0, k1 + 1)]
    prof = sorted(design.run.profile, key=lambda p: p.station)
    model.grade_points = Polyline("Grade points", L([p.station for p in prof]), L([p.elevation for p in prof]))
    out = design.run.outfall
    model.outfall = (float(L(out.station)), float(L(pts[-1].invert)),
                     f"Outfall: {out.kind}" if out.kind else "Outfall")
    return model


def _spans(mask, stations) -> list:
    """(from, to) station ranges, in the user's units, over which ``mask`` holds at consecutive points."""
    return [tuple(sorted((float(a), float(b)))) for a, b in ranges_of(mask, stations)]
