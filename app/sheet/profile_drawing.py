"""The profile of a ditch run drawn to stated horizontal and vertical scales with reportlab's vector graphics.

It draws :class:`app.run_drawing.ProfileModel`, the one drawing model the window draws too: the invert, the
top of the ditch, the computed water surface, the normal-depth (dashed) and critical-depth (dotted) lines and
the hydraulic jumps (marked with their station) along the stations, the grade
of each stretch, the inflows above the plot (a point inflow as an arrow, a sub-area spread along the ditch as a
bracket), the outfall, and under the plot the lining stretches as labelled bands (numbered as the lining
schedule) and any trouble spots (overtopped, not stable, too shallow, not computed, not checked) as red bands.

Both scales are round ratios from a series of the usual profile scales (common practice: 1:500 to 1:5000
along, 1:50 to 1:500 up, or 1 in = 50 to 500 ft along and 1 in = 5 to 50 ft up), chosen as the section's scale
is (:func:`app.sheet.section_drawing.choose_scale`): the smallest of the series at which the run fits the
width, then the smallest vertical scale at which its elevations fit the height, never smaller than the
horizontal one. A printed sheet at 100 % can be scaled off; the statement says which scales and the vertical
exaggeration.

The model's values are in the user's length unit; here they are only placed on paper.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from reportlab.graphics.shapes import Drawing, Group, Line, PolyLine, Polygon, Rect, String
from reportlab.lib import colors
from reportlab.pdfbase.pdfmetrics import stringWidth

from ..run_drawing import level_text
from .fonts import FONT
from .section_drawing import PT_PER_M, choose_scale

#: Round profile scales along the run (1:N) and up (1:N), SI.
SI_HORIZONTAL = (100, 200, 250, 500, 1000, 2000, 2500, 5000, 10000, 20000, 25000, 50000, 100000)
SI_VERTICAL = (10, 20, 25, 50, 100, 200, 250, 500, 1000)
#: US customary: 1 in = N ft along and up (the divisions of an engineer's scale, 10 to 60, by decades).
US_HORIZONTAL_FT = (10, 20, 30, 40, 50, 60, 100, 200, 300, 400, 500, 600, 1000, 2000, 3000, 4000, 5000, 6000, 10000)
US_VERTICAL_FT = (1, 2, 3, 4, 5, 6, 10, 20, 30, 40, 50, 60, 100, 200)
PT_PER_INCH = 72.0

INK = colors.black
GRID = colors.Color(0.86, 0.86, 0.86)
GREY = colors.Color(0.45, 0.45, 0.45)
INVERT = colors.black
TOP = colors.Color(0.55, 0.35, 0.15)
WATER_LINE = colors.Color(0.10, 0.35, 0.75)
WATER_FILL = colors.Color(0.80, 0.89, 0.97)
CRITICAL = colors.Color(0.80, 0.15, 0.15)
TROUBLE = colors.Color(0.85, 0.15, 0.15)
TROUBLE_FILL = colors.Color(0.98, 0.85, 0.85)
INFLOW = colors.Color(0.15, 0.45, 0.20)
#: Fills of the lining bands, one per lining in order of first appearance.
BAND_FILLS = (colors.Color(0.80, 0.90, 0.76), colors.Color(0.84, 0.84, 0.84), colors.Color(0.93, 0.88, 0.74),
              colors.Color(0.76, 0.84, 0.92), colors.Color(0.92, 0.80, 0.88))
SIZE = 6.0
LEFT = 34.0        # room for the elevation labels [pt]
RIGHT = 6.0
ROW = 8.5          # one row of inflow labels [pt]
STATION_ROW = 10.0
BAND = 12.0
LEGEND = 11.0
#: Dash patterns of the model's line styles (app.run_drawing.LINE_STYLES) [pt on, pt off].
DASHES = {"solid": None, "dashed": (3, 2), "dotted": (0.6, 1.4)}


@dataclass(frozen=True)
class ProfileScales:
    """The scales chosen: paper points per user length unit along and up, and the statement printed."""

    horizontal: float   # 1:N
    vertical: float     # 1:N
    along: float        # [pt per user length unit]
    up: float           # [pt per user length unit]
    statement: str


def _unit_pt(us: bool) -> float:
    """Paper points per user length unit at 1:1 (a foot or a metre)."""
    return 12 * PT_PER_INCH if us else PT_PER_M


def _words(n: float, us: bool) -> str:
    return f"1 in = {n / 12:g} ft" if us else f"1:{n:g}"


def choose_profile_scales(length: float, span: float, width: float, height: float, us: bool) -> ProfileScales:
    """Round scales at which ``length`` along and ``span`` up (user's length unit) fit ``width`` x ``height`` [pt]."""
    unit = _unit_pt(us)
    h, _ = choose_scale(length * unit / max(width, 1.0), us, SI_HORIZONTAL, US_HORIZONTAL_FT)
    v, _ = choose_scale(span * unit / max(height, 1.0), us, SI_VERTICAL, US_VERTICAL_FT)
    v = min(v, h)
    exaggeration = h / v
    statement = f"Horizontal {_words(h, us)}, vertical {_words(v, us)}"
    statement += f" (vertical exaggeration {exaggeration:g}\u00d7)" if exaggeration != 1 else " (not exaggerated)"
    return ProfileScales(h, v, unit / h, unit / v, statement)


def nice_step(span: float, lines: int = 6) -> float:
    """A round grid spacing (1, 2 or 5 times a power of ten) giving about ``lines`` lines over ``span``."""
    raw = max(span / max(lines, 1), 1e-9)
    power = 10 ** math.floor(math.log10(raw))
    for m in (1, 2, 5, 10):
        if m * power >= raw * 0.999:
            return m * power
    return 10 * power


def _text(x, y, text, size=SIZE, anchor="start", color=INK, angle=0.0):
    s = String(0, 0, text, fontName=FONT, fontSize=size, fillColor=color, textAnchor=anchor)
    g = Group(s)
    c, sn = math.cos(math.radians(angle)), math.sin(math.radians(angle))
    g.transform = (c, sn, -sn, c, x, y)
    return g


def fit_text(text: str, size: float, width: float) -> str:
    """``text`` shortened with an ellipsis to ``width`` [pt]; '' when not even one letter fits."""
    if stringWidth(text, FONT, size) <= width:
        return text
    while text and stringWidth(text + "\u2026", FONT, size) > width:
        text = text[:-1]
    return text + "\u2026" if text else ""


def _runs(x, y):
    """The finite pieces of a polyline (NaN breaks it) as lists of (x, y)."""
    out, run = [], []
    for a, b in zip(x, y):
        if np.isfinite(b):
            run.append((float(a), float(b)))
        elif run:
            out.append(run)
            run = []
    if run:
        out.append(run)
    return out


def _rows(items, gap=4.0):
    """Row index for each (left, right) extent [pt] so that no two in a row overlap (first row that has room)."""
    ends, rows = [], []
    for left, right in items:
        for k, end in enumerate(ends):
            if left >= end + gap:
                ends[k] = right
                rows.append(k)
                break
        else:
            ends.append(right)
            rows.append(len(ends) - 1)
    return rows


def _legend(model) -> list:
    """The legend's entries: (kind, colour, line width, dash, label)."""
    entries = [("line", INVERT, 1.2, None, model.lines["invert"].label),
               ("line", TOP, 0.9, None, model.lines["ditch_top"].label),
               ("line", WATER_LINE, 0.9, None, model.lines["water_surface"].label),
               ("line", WATER_LINE, 0.5, DASHES["dashed"], model.lines["normal"].label),
               ("line", CRITICAL, 0.6, DASHES["dotted"], model.lines["critical"].label),
               ("arrow", INFLOW, 0, None, "Inflow (point; bracket: spread along the ditch)")]
    if model.jumps:
        entries.append(("jump", CRITICAL, 1.6, None, "Hydraulic jump"))
    if model.trouble:
        entries.append(("box", TROUBLE, 0, None, "Trouble spot"))
    return entries


def profile_drawing(model, units, width: float, height: float, band_numbers=None) -> tuple[Drawing, ProfileScales]:
    """The profile of ``model`` (an app.run_drawing.ProfileModel in ``units``) in at most ``width`` x ``height``
    [pt]; returns the drawing (as tall as it needs) and the scales.

    ``band_numbers`` labels the lining bands ("1", "2", ... as the schedule numbers its stretches); default their
    order along the run.
    """
    from .content import pretty_unit

    us = units.key == "us"
    unit = pretty_unit(model.length_unit)
    first, last = model.first_station, model.last_station
    length = max(last - first, 1e-9)
    plot_w = width - LEFT - RIGHT

    # inflow labels above the plot, in rows that do not overlap (their extents depend on the horizontal scale)
    trial = choose_profile_scales(length, 1.0, plot_w, 100.0, us)
    kx = trial.along

    def px(s):
        return LEFT + (s - first) * kx

    extents = []
    for m in model.inflows:
        w = stringWidth(m.label, FONT, SIZE - 0.5)
        if m.end > m.start:
            mid = 0.5 * (px(m.start) + px(m.end))
            extents.append((min(px(m.start), mid - w / 2), max(px(m.end), mid + w / 2)))
        else:
            extents.append((px(m.start) - 3, px(m.start) + 4 + w))
    rows = _rows(extents)
    n_rows = (max(rows) + 1) if rows else 0
    top_room = n_rows * ROW + (6.0 if n_rows else 2.0)
    entries = _legend(model)
    legend_at, x, row = [], LEFT, 0
    for entry in entries:
        wide = 17 + stringWidth(entry[-1], FONT, SIZE - 0.5)
        if x > LEFT and x + wide > width:
            x, row = LEFT, row + 1
        legend_at.append((x, row))
        x += wide + 10
    legend_rows = row + 1
    bottom_room = STATION_ROW + BAND + 3 + (BAND + 2 if model.trouble else 0) + LEGEND * legend_rows + 4

    y_lo, y_hi = model.y_range()
    step = nice_step(max(y_hi - y_lo, 1e-6), 5)
    z0 = math.floor(y_lo / step + 1e-9) * step
    z1 = math.ceil(y_hi / step - 1e-9) * step
    scales = choose_profile_scales(length, z1 - z0, plot_w, height - top_room - bottom_room, us)
    ky = scales.up
    plot_h = (z1 - z0) * ky
    total_h = bottom_room + plot_h + top_room
    base = bottom_room   # y of the plot's bottom edge

    def py(z):
        return base + (z - z0) * ky

    d = Drawing(width, total_h)
    right = px(last)

    # grid and axes
    for s, label in model.ticks:
        x = px(s)
        d.add(Line(x, base, x, base + plot_h, strokeColor=GRID, strokeWidth=0.4))
        d.add(Line(x, base, x, base - 2, strokeColor=INK, strokeWidth=0.5))
        d.add(_text(x, base - 8, label, SIZE - 0.5, "middle"))
    k = 0
    while z0 + k * step <= z1 + 1e-9:
        z = z0 + k * step
        y = py(z)
        d.add(Line(LEFT, y, right, y, strokeColor=GRID, strokeWidth=0.4))
        d.add(_text(LEFT - 3, y - 2, level_text(z), SIZE - 0.5, "end"))
        k += 1
    d.add(Rect(LEFT, base, right - LEFT, plot_h, fillColor=None, strokeColor=GREY, strokeWidth=0.5))
    d.add(_text(8, base + plot_h / 2, f"Elevation ({unit})", SIZE - 0.5, "middle", GREY, angle=90))

    # water between the invert and the water surface
    inv, ws = model.lines["invert"], model.lines["water_surface"]
    for piece in _runs(ws.x, ws.y):
        if len(piece) < 2:
            continue
        xs = [p[0] for p in piece]
        bottom = np.interp(xs, inv.x, inv.y)
        pts = []
        for (s, z) in piece:
            pts += [px(s), py(z)]
        for s, z in zip(reversed(xs), reversed(bottom)):
            pts += [px(s), py(float(z))]
        d.add(Polygon(pts, fillColor=WATER_FILL, strokeColor=None))
    styles = {"ditch_top": (TOP, 0.9, None), "invert": (INVERT, 1.2, None),
              "water_surface": (WATER_LINE, 0.9, None), "normal": (WATER_LINE, 0.5, DASHES["dashed"]),
              "critical": (CRITICAL, 0.6, DASHES["dotted"])}
    for name in ("ditch_top", "critical", "normal", "water_surface", "invert"):
        line = model.lines.get(name)
        if line is None:
            continue
        colour, w, dash = styles[name]
        dash = DASHES[model.styles[name]] if name in model.styles and name != "ditch_top" else dash
        for piece in _runs(line.x, line.y):
            pts = [v for s, z in piece for v in (px(s), py(z))]
            if len(pts) >= 4:
                d.add(PolyLine(pts, strokeColor=colour, strokeWidth=w, strokeDashArray=dash))

    # grades under the invert (above the top of the ditch where there is no room below)
    top = model.lines["ditch_top"]
    for g in model.grades:
        x = px(g.x)
        half = 0.5 * stringWidth(g.text, FONT, SIZE) + 2
        span = np.linspace(g.x - half / kx, g.x + half / kx, 9)   # the stations under the label
        below = py(float(np.min(np.interp(span, inv.x, inv.y)))) - 7.5
        if below > base + 1:
            d.add(_text(x, below, g.text, SIZE, "middle", INK))
        else:
            d.add(_text(x, py(float(np.max(np.interp(span, top.x, top.y)))) + 3, g.text, SIZE, "middle", INK))

    # hydraulic jumps: a stroke from the depth before to the depth after, labelled with the station of the toe
    for jm in model.jumps:
        x = px(jm.start)
        d.add(Line(x, py(jm.low), x, py(jm.high), strokeColor=CRITICAL, strokeWidth=1.6))
        d.add(Line(x, py(jm.high), x, py(jm.high) + 9, strokeColor=CRITICAL, strokeWidth=0.5))
        w = stringWidth(jm.label, FONT, SIZE - 0.5)
        d.add(Rect(x - w / 2 - 1.5, py(jm.high) + 9, w + 3, 7, fillColor=colors.white, strokeColor=None))
        d.add(_text(x, py(jm.high) + 10.5, jm.label, SIZE - 0.5, "middle", CRITICAL))

    # the outfall
    if model.outfall:
        s, z, label = model.outfall
        x, y = px(s), py(z)
        d.add(Line(x, y, x, base + plot_h, strokeColor=INK, strokeWidth=0.6, strokeDashArray=(1.5, 1.5)))
        d.add(Rect(x - 2, y - 2, 4, 4, fillColor=INK, strokeColor=None))
        text = fit_text(label, SIZE - 0.5, plot_w * 0.45)
        inside = x - LEFT > stringWidth(text, FONT, SIZE - 0.5) + 6
        d.add(_text(x - 3 if inside else x + 3, base + plot_h - 8, text, SIZE - 0.5, "end" if inside else "start"))

    # inflows above the plot
    y_row0 = base + plot_h + 4
    for m, row in zip(model.inflows, rows):
        y = y_row0 + row * ROW
        if m.end > m.start:
            a, b = px(m.start), px(m.end)
            d.add(Line(a, y + 1.5, b, y + 1.5, strokeColor=INFLOW, strokeWidth=0.7))
            for xe in (a, b):
                d.add(Line(xe, y - 0.5, xe, y + 3.5, strokeColor=INFLOW, strokeWidth=0.7))
            mid = 0.5 * (a + b)
            w = stringWidth(m.label, FONT, SIZE - 0.5)
            d.add(Rect(mid - w / 2 - 1.5, y - 0.5, w + 3, 6.5, fillColor=colors.white, strokeColor=None))
            d.add(_text(mid, y + 0.2, m.label, SIZE - 0.5, "middle", INFLOW))
        else:
            x = px(m.start)
            y_plot = base + plot_h
            d.add(Line(x, y_plot + 4, x, y + 6, strokeColor=INFLOW, strokeWidth=0.6))
            d.add(Polygon([x, y_plot + 0.5, x - 2.0, y_plot + 4.5, x + 2.0, y_plot + 4.5], fillColor=INFLOW,
                          strokeColor=None))
            d.add(_text(x + 3.5, y + 0.2, m.label, SIZE - 0.5, "start", INFLOW))

    # lining stretches and trouble spots as bands under the stations
    y_band = base - STATION_ROW - BAND
    d.add(_text(LEFT - 3, y_band + 3.5, "Lining", SIZE - 0.5, "end", GREY))
    fills = {}
    for k, b in enumerate(model.stretches):
        fill = fills.setdefault(b.label, BAND_FILLS[len(fills) % len(BAND_FILLS)])
        a, e = px(b.start), px(b.end)
        d.add(Rect(a, y_band, max(e - a, 0.5), BAND, fillColor=fill, strokeColor=INK, strokeWidth=0.4))
        number = band_numbers[k] if band_numbers else str(k + 1)
        text = fit_text(f"{number} {b.label}", SIZE - 0.5, e - a - 3) or fit_text(number, SIZE - 0.5, e - a - 1)
        if text:
            d.add(_text(0.5 * (a + e), y_band + 3.8, text, SIZE - 0.5, "middle"))
    if model.trouble:
        y_tr = y_band - 3 - BAND
        d.add(_text(LEFT - 3, y_tr + 3.5, "Trouble", SIZE - 0.5, "end", TROUBLE))
        for b in model.trouble:
            a, e = px(b.start), px(b.end)
            if e - a < 2.0:   # one design point: a mark of visible width
                a, e = a - 1.5, e + 1.5
            d.add(Rect(a, y_tr, e - a, BAND, fillColor=TROUBLE_FILL, strokeColor=TROUBLE, strokeWidth=0.6))
            text = fit_text(b.label, SIZE - 0.5, e - a - 2)
            if text:
                d.add(_text(0.5 * (a + e), y_tr + 3.8, text, SIZE - 0.5, "middle", TROUBLE))

    # legend, in as many rows as it needs
    for (kind, colour, w, dash, label), (x, row) in zip(entries, legend_at):
        y_leg = 3.0 + (legend_rows - 1 - row) * LEGEND
        if kind == "line":
            d.add(Line(x, y_leg + 2.2, x + 14, y_leg + 2.2, strokeColor=colour, strokeWidth=w, strokeDashArray=dash))
        elif kind == "jump":
            d.add(Line(x + 7, y_leg - 0.5, x + 7, y_leg + 5, strokeColor=colour, strokeWidth=w))
        elif kind == "arrow":
            d.add(Polygon([x + 7, y_leg, x + 4.8, y_leg + 4.5, x + 9.2, y_leg + 4.5], fillColor=colour,
                          strokeColor=None))
        else:
            d.add(Rect(x + 2, y_leg, 10, 4.5, fillColor=TROUBLE_FILL, strokeColor=colour, strokeWidth=0.6))
        d.add(_text(x + 17, y_leg, label, SIZE - 0.5, "start", colour if kind != "line" else INK))
    return d, scales
