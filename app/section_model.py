"""The drawing of a channel's typical section, as one model that any front end draws (today the DXF writer).

Everything is in the user's length unit, to scale (x across the channel with the invert's centre at 0, y up from
the invert), and worded: a front end only places the lines, areas, levels, dimensions and notes. The model does
not depend on the section's shape: the ditch, the ground, the lining band and the water are polylines, the levels
are heights with their extent across the section, and each dimension says what it measures between which points
and where its line runs. Qt-free, no drawing library.

    model = section_model(design, units)      # design: app.evaluate.ChannelDesign
    model.ditch.x, model.ditch.y              # the finished surface up to the top of the ditch
    [d.key for d in model.dimensions]         # bottom_width, design_depth, freeboard, total_depth, ...
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from hydraulics.units import UnitSystem

from .section_geometry import offset_polyline, to_ground  # the one offset of a drawn outline

__all__ = ["Line", "Level", "Dimension", "SectionModel", "section_model", "offset_polyline", "level_runs",
           "nice_size", "slope_text"]


@dataclass(frozen=True)
class Line:
    """A polyline (``closed``: a polygon) in the user's length unit."""

    key: str
    x: tuple
    y: tuple
    closed: bool = False

    def points(self) -> list[tuple[float, float]]:
        return list(zip(self.x, self.y))


@dataclass(frozen=True)
class Level:
    """A horizontal level across the section: its height above the invert and its extent (left, right)."""

    key: str        # "water_surface", "critical_depth", "ditch_top"
    label: str      # what it is, with its value, in words
    height: float
    left: float
    right: float


@dataclass(frozen=True)
class Dimension:
    """One dimension to draw.

    ``kind`` "horizontal" or "vertical": the distance between ``p1`` and ``p2`` along x or y, its line through
    ``at``; "angle": the angle at ``center`` turning anticlockwise from the direction of ``p1`` to that of ``p2``,
    its arc through ``at``. ``value`` is what it measures (a length in the user's unit, or an angle in degrees),
    ``name`` the words before the value ("bottom width"), ``text`` the whole label ("bottom width 2.00 m",
    "3H:1V"). ``text_at`` is the middle of the label, written horizontally, when it goes beside the dimension
    rather than along its line (None: along the line, above it).
    """

    key: str
    kind: str
    p1: tuple
    p2: tuple
    at: tuple
    value: float
    name: str
    text: str
    center: tuple | None = None
    text_at: tuple | None = None


@dataclass
class SectionModel:
    """The typical section of one channel in the user's length unit (``length_unit``), ready to draw."""

    title: str
    shape: str                      # the section's kind: trapezoid, triangle, rectangle, parabola, circle, irregular
    length_unit: str
    text_height: float              # a legible text height for a drawing of this size [length unit]
    ditch: Line                     # the finished channel boundary up to the top of the ditch (a pipe: its ring)
    top_width: float                # width of the ditch at its top (a pipe: its diameter)
    top_height: float               # the top of the ditch above the invert (a pipe: its crown)
    ground: list = field(default_factory=list)       # Line: the ground beyond the banks (a survey: its ends)
    earth: Line | None = None                       # closed: a band of earth under the ground and the excavation
    lining: Line | None = None                      # closed: the lining band at its thickness
    lining_thickness: float | None = None
    water: list = field(default_factory=list)        # closed Lines: the water at the design depth
    levels: dict = field(default_factory=dict)       # key -> Level
    dimensions: list = field(default_factory=list)   # Dimension
    marks: list = field(default_factory=list)        # Line: symbols (the water-surface triangle)
    notes: list = field(default_factory=list)        # lines of text: what the drawing shows

    def extents(self, key: str = "ditch") -> tuple[float, float, float, float]:
        """(xmin, ymin, xmax, ymax) of the ditch outline (``key`` "ditch") or of every line drawn ("all")."""
        lines = [self.ditch] if key == "ditch" else [self.ditch, *self.ground, *self.water,
                                                     *([self.lining] if self.lining else []),
                                                     *([self.earth] if self.earth else [])]
        xs = np.concatenate([np.asarray(ln.x, float) for ln in lines])
        ys = np.concatenate([np.asarray(ln.y, float) for ln in lines])
        return float(xs.min()), float(ys.min()), float(xs.max()), float(ys.max())


def nice_size(target: float) -> float:
    """The round size (1, 2, 2.5 or 5 times a power of ten) nearest below ``target`` > 0."""
    power = 10 ** math.floor(math.log10(target))
    for m in (5, 2.5, 2, 1):
        if m * power <= target * (1 + 1e-12):
            return m * power
    return power


def slope_text(z: float) -> str:
    """A side slope as a ratio: ``3H:1V``."""
    return f"{z:g}H:1V"


def level_runs(x, y, level, closed=False) -> list[list[tuple[float, float]]]:
    """The parts of the boundary (x, y) at or below ``level``, each with its two ends on the level: the wet
    polygons of water standing at ``level`` (``closed``: the boundary is a ring, as a pipe)."""
    x, y = np.asarray(x, float), np.asarray(y, float)
    if closed:   # start the ring at its highest point so that each wet part is one run
        k = int(np.argmax(y))
        x, y = np.roll(x, -k), np.roll(y, -k)
        x, y = np.append(x, x[0]), np.append(y, y[0])
    runs, run = [], []
    for i in range(len(x)):
        below = y[i] <= level
        if i > 0 and (y[i - 1] <= level) != below:
            t = (level - y[i - 1]) / (y[i] - y[i - 1])
            run.append((float(x[i - 1] + t * (x[i] - x[i - 1])), float(level)))
            if not below:
                runs.append(run)
                run = []
        if below:
            run.append((float(x[i]), float(y[i])))
    if run:
        runs.append(run)
    return [r for r in runs if len(r) > 2 or (len(r) == 2 and abs(r[0][0] - r[1][0]) > 1e-12)]


def _span(runs) -> tuple[float, float] | None:
    if not runs:
        return None
    return min(p[0] for p in runs[0]), max(p[0] for p in runs[-1])


def _line(key, x, y, closed=False) -> Line:
    return Line(key, tuple(float(v) for v in x), tuple(float(v) for v in y), closed)


def section_model(design, units: UnitSystem, title: str | None = None) -> SectionModel:
    """The typical section of ``design`` (an :class:`app.evaluate.ChannelDesign`) in ``units``."""
    k = float(units.from_si("length", 1.0))
    L = units.label("length")
    sec = design.section
    kind = sec.kind
    yn = float(design.analysis.normal_depth) * k
    yc = float(design.analysis.critical_depth) * k
    full = None if sec.full_depth is None else float(sec.full_depth) * k
    total = float(design.total_depth) * k
    top = total if full is None else min(total, full)
    st = design.stability
    t = float(st.layer_thickness) * k if st is not None and st.layer_thickness else 0.0
    closed = kind == "circle"
    surveyed = kind == "irregular"

    def fmt(v):
        return f"{v:.2f} {L}"

    # the boundary: open shapes up to the top of the ditch; a pipe its ring; a survey the whole of it
    if closed:
        bx, by = (np.asarray(a, float) * k for a in sec.outline(sec.full_depth))
        top = full
    elif surveyed:
        bx, by = (np.asarray(a, float) * k for a in sec.outline(sec.full_depth))
        bx = bx - float(bx[int(np.argmin(by))])   # the invert at x = 0
    else:
        bx, by = (np.asarray(a, float) * k for a in sec.outline(top / k))
    reach = max(top, yn, yc)

    def boundary_at(level):
        """The outer ends (left, right) of the boundary at ``level``; open shapes are followed above their top."""
        if closed or surveyed:
            return _span(level_runs(bx, by, level, closed))
        ox, oy = (np.asarray(a, float) * k for a in sec.outline(max(reach, level) / k))
        return _span(level_runs(ox, oy, level))

    # the ditch outline to its top
    if surveyed:
        runs = level_runs(bx, by, top)
        left, right = _span(runs) if runs else (float(bx.min()), float(bx.max()))
        inside = (bx > left) & (bx < right)
        dx = np.concatenate([[left], bx[inside], [right]])
        dy = np.concatenate([[top], by[inside], [top]])
        ditch = _line("ditch", dx, dy)
        ground = [_line("ground", np.append(bx[bx <= left], left), np.append(by[bx <= left], top)),
                  _line("ground", np.insert(bx[bx >= right], 0, right), np.insert(by[bx >= right], 0, top))]
        ground = [g for g in ground if len(g.x) > 1]
    else:
        ditch = _line("ditch", bx, by, closed)
        dx, dy = bx, by
        left, right = float(bx.min()), float(bx.max())
        ground = []
    top_width = right - left

    span = max(right - left, top, 1e-9)
    h = nice_size(span / 45.0)            # text height: about a 45th of the section's size, rounded down
    model = SectionModel(title=title or design.channel.name, shape=kind, length_unit=L, text_height=h,
                         ditch=ditch, top_width=top_width, top_height=top, ground=ground)

    # the lining band at its thickness (an open section's outer face cut off at the ground)
    outer_x, outer_y = dx, dy
    if t > 0 and not closed:
        ox, oy = offset_polyline(dx, dy, t)
        ox, oy = to_ground(ox, oy, top)
        model.lining = _line("lining", np.concatenate([dx, ox[::-1]]), np.concatenate([dy, oy[::-1]]), closed=True)
        model.lining_thickness = t
        outer_x, outer_y = ox, oy

    # the ground beyond the banks and the earth around the excavation
    if not closed:
        berm = max(0.2 * top_width, 4 * h)
        gl, gr = float(min(outer_x[0], left)), float(max(outer_x[-1], right))
        if not surveyed:
            model.ground = [_line("ground", [gl - berm, gl], [top, top]), _line("ground", [gr, gr + berm], [top, top])]
        gx = np.concatenate([g.x for g in model.ground[:1]] + [outer_x] + [g.x for g in model.ground[1:]])
        gy = np.concatenate([g.y for g in model.ground[:1]] + [outer_y] + [g.y for g in model.ground[1:]])
        ex, ey = offset_polyline(gx, gy, 1.2 * h)   # the band below the surface of the ground (right-hand side)
        model.earth = _line("earth", np.concatenate([gx, ex[::-1]]), np.concatenate([gy, ey[::-1]]), closed=True)

    # water at the design depth, the water surface and the critical depth
    for run in level_runs(bx, by, min(yn, top) if not closed else yn, closed):
        model.water.append(_line("water", [p[0] for p in run], [p[1] for p in run], closed=True))
    ws = boundary_at(yn)
    if ws is not None:
        model.levels["water_surface"] = Level("water_surface", f"water surface at the design depth, yn {fmt(yn)}",
                                              yn, *ws)
        mx = ws[0] + 0.25 * (ws[1] - ws[0])
        model.marks.append(_line("water_mark", [mx, mx - 0.5 * h, mx + 0.5 * h], [yn, yn + 0.85 * h, yn + 0.85 * h],
                                 closed=True))
    cs = boundary_at(yc)
    if cs is not None:
        model.levels["critical_depth"] = Level("critical_depth", f"critical depth, yc {fmt(yc)}", yc, *cs)
    top_word = "crown of the pipe" if closed else "top of the ditch"
    model.levels["ditch_top"] = Level("ditch_top", f"{top_word}, {fmt(top)} above the invert", top, left, right)

    # dimensions
    D = model.dimensions

    def beside(text, x, y, side):
        """The middle of a horizontal label ``text`` beside the point (x, y): to its "left" or "right"."""
        w = 0.8 * h * len(text)
        return (x - 0.8 * h - w / 2, y) if side == "left" else (x + 0.8 * h + w / 2, y)
    x_out_l = min(model.extents("all")[0], left) - 2.5 * h
    x_out_r = max(model.extents("all")[2], right) + 2.5 * h
    inv_l = float(dx[int(np.argmin(dy))]) if not closed else 0.0
    if closed:
        D.append(Dimension("diameter", "horizontal", (left, top / 2), (right, top / 2), (0.0, top + 2.5 * h),
                           top_width, "diameter", f"diameter {fmt(top_width)}"))
    else:
        D.append(Dimension("top_width", "horizontal", (left, top), (right, top), (0.0, top + 2.5 * h), top_width,
                           "top width", f"top width {fmt(top_width)}"))
    wl = ws[0] if ws is not None else inv_l
    y_n = min(yn, top)
    text = f"yn {fmt(y_n)}"
    D.append(Dimension("design_depth", "vertical", (inv_l, 0.0), (wl, y_n), (x_out_l, 0.0), y_n, "yn", text,
                       text_at=beside(text, x_out_l, y_n / 2, "left")))
    if top > yn:
        word = "to crown" if closed else "freeboard"
        text = f"{word} {fmt(top - yn)}"
        D.append(Dimension("freeboard", "vertical", (wl, yn), (left if not closed else 0.0, top), (x_out_l, yn),
                           top - yn, word, text,
                           text_at=beside(text, x_out_l, max((yn + top) / 2, y_n / 2 + 1.2 * h), "left")))
    inv_r = float(dx[len(dx) - 1 - int(np.argmin(dy[::-1]))]) if not closed else 0.0
    word = "crown" if closed else "total depth"
    text = f"{word} {fmt(top)}"
    D.append(Dimension("total_depth", "vertical", (inv_r, 0.0), (right if not closed else 0.0, top), (x_out_r, 0.0),
                       top, word, text, text_at=beside(text, x_out_r, top / 2, "right")))
    if kind in ("trapezoid", "rectangle", "triangle"):
        b = float(sec.bottom_width) * k
        z1, z2 = float(sec.left_slope), float(sec.right_slope)
        if b > 0:
            y_b = (min(model.earth.y) if model.earth else 0.0) - 2.0 * h   # under the earth band
            D.append(Dimension("bottom_width", "horizontal", (-b / 2, 0.0), (b / 2, 0.0), (0.0, y_b), b,
                               "bottom width", f"bottom width {fmt(b)}", text_at=(0.0, y_b - 1.0 * h)))
        for key, z, x_top, sign in (("left_slope", z1, left, 1.0), ("right_slope", z2, right, -1.0)):
            if z <= 0:
                continue
            angle = math.degrees(math.atan(1.0 / z))
            run = math.hypot(z * top, top)
            r = min(2.0 * h, 0.45 * run)
            c = (x_top, top)
            inward = (x_top + sign * r, top)                                  # along the top, into the ditch
            down = (x_top + sign * r * z / math.hypot(z, 1.0), top - r / math.hypot(z, 1.0))   # down the bank
            mid = math.radians(angle / 2)
            at = (x_top + sign * r * math.cos(mid), top - r * math.sin(mid))
            # anticlockwise from p1 to p2: the left bank turns from the bank down to the top, the right one back
            p1, p2 = (down, inward) if sign > 0 else (inward, down)
            text = slope_text(z)
            w = 0.8 * h * len(text)
            label_at = (x_top + sign * (r + 1.0 * h + w / 2), top - 0.8 * h)   # inside the ditch, by the arc
            D.append(Dimension(key, "angle", p1, p2, at, angle, "side slope", text, center=c, text_at=label_at))

    # the notes
    model.notes.append(f"Typical section: {model.title}")
    model.notes.append(f"Drawn to scale: 1 drawing unit = 1 {L}, horizontal and vertical alike")
    if st is not None:
        lining = st.lining_name + (f", layer {t:.2f} {L} thick, drawn to scale" if t > 0 else "")
        model.notes.append(f"Lining: {lining}")
    else:
        model.notes.append("No lining chosen" if not closed else "Pipe: the inside of its wall")
    q = float(units.from_si("flow", design.flow))
    model.notes.append(f"Design flow {q:.3g} {units.label('flow')}, slope {design.channel.slope:.4g} "
                       f"{units.label('slope')}, Manning's n {float(design.analysis.manning_n):.3g}")
    if total > top + 1e-9:
        model.notes.append(f"Too shallow: the design depth plus freeboard ({fmt(total)}) is above the "
                           f"{'crown' if closed else 'top of the survey'} ({fmt(top)})")
    return model
