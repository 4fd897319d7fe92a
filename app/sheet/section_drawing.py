"""The dimensioned typical section, drawn to a stated scale with reportlab's vector graphics.

What is drawn is the one geometry of the section (:mod:`app.section_geometry`,
which the window's picture and the CAD drawing draw too): the channel boundary, the water at the
design depth, the critical depth, the lining band at its thickness; this
module places it on paper and adds the ground line at the top of the banks,
earth hatching and dimensions: bottom
width, side slopes as H:V with their angle theta, design depth, freeboard,
total depth and top width. Horizontal and vertical scales are equal and the
scale is a round ratio (1:N, or 1 in = N ft for US units) so that a printed
sheet at 100 % can be scaled off.
"""

from __future__ import annotations

import math

import numpy as np
from reportlab.graphics.shapes import Drawing, Group, Line, PolyLine, Polygon, Rect, String
from reportlab.lib import colors
from reportlab.pdfbase.pdfmetrics import stringWidth

from ..section_geometry import design_geometry, wet_polygons
from .fonts import FONT, register

PT_PER_M = 72 / 0.0254
#: Round scales, as paper : real ratios 1:N.
SI_SCALES = (5, 10, 20, 25, 50, 75, 100, 125, 150, 200, 250, 500, 1000, 2000)
#: US engineering scales 1 in = N ft, as 1:(12 N).
US_SCALES_FT = (0.5, 1, 2, 3, 4, 5, 8, 10, 20, 30, 40, 50, 100, 200)

INK = colors.black
THIN = 0.5
WATER = colors.Color(0.80, 0.89, 0.97)
LINING = colors.Color(0.82, 0.82, 0.82)
DIM = colors.Color(0.15, 0.15, 0.15)
SIZE = 6.5


def choose_scale(ratio_needed: float, us: bool, si_scales=SI_SCALES, us_scales_ft=US_SCALES_FT) -> tuple[float, str]:
    """The smallest round 1:N at least ``ratio_needed``; returns (N, wording).

    ``si_scales`` (1:N) and ``us_scales_ft`` (1 in = N ft) are the series to choose from (default: those of the
    typical section; a profile passes its own); beyond a series, N is rounded up to the next thousand (100 ft).
    """
    if us:
        for ft in us_scales_ft:
            if 12 * ft >= ratio_needed:
                return 12 * ft, f"1 in = {ft:g} ft (1:{12 * ft:g})"
        ft = math.ceil(ratio_needed / 12 / 100) * 100
        return 12 * ft, f"1 in = {ft:g} ft (1:{12 * ft:g})"
    for n in si_scales:
        if n >= ratio_needed:
            return n, f"1:{n}"
    n = math.ceil(ratio_needed / 1000) * 1000
    return n, f"1:{n}"


def _text(x, y, text, size=SIZE, anchor="start", angle=0.0, color=INK):
    s = String(0, 0, text, fontName=FONT, fontSize=size, fillColor=color, textAnchor=anchor)
    g = Group(s)
    c, sn = math.cos(math.radians(angle)), math.sin(math.radians(angle))
    g.transform = (c, sn, -sn, c, x, y)
    return g


def _arrow(x, y, dx, dy, size=3.0):
    """A filled arrowhead at (x, y) pointing along (dx, dy)."""
    n = math.hypot(dx, dy)
    ux, uy = dx / n, dy / n
    px, py = -uy, ux
    return Polygon([x, y, x - size * ux + 0.35 * size * px, y - size * uy + 0.35 * size * py,
                    x - size * ux - 0.35 * size * px, y - size * uy - 0.35 * size * py],
                   fillColor=DIM, strokeColor=None)


def _dim_h(g, x1, x2, y, label, above=True):
    """Horizontal dimension between x1 and x2 at height y, label centred above or below."""
    g.add(Line(x1, y, x2, y, strokeColor=DIM, strokeWidth=THIN))
    g.add(_arrow(x1, y, -1, 0))
    g.add(_arrow(x2, y, 1, 0))
    w = stringWidth(label, FONT, SIZE)
    mid = (x1 + x2) / 2
    if above and w + 4 > x2 - x1:  # does not fit between the arrows: beside the right one
        g.add(_text(x2 + 4, y - 2.2, label))
    else:  # below a short dimension the label may run past the arrows: the space under the section is free
        g.add(_text(mid, y + 2.0 if above else y - SIZE - 1.2, label, anchor="middle"))


def _dim_v(g, x, y1, y2, label, side="right"):
    """Vertical dimension between y1 and y2 at x; label along it, or beside it when it does not fit."""
    g.add(Line(x, y1, x, y2, strokeColor=DIM, strokeWidth=THIN))
    g.add(_arrow(x, y1, 0, -1))
    g.add(_arrow(x, y2, 0, 1))
    w = stringWidth(label, FONT, SIZE)
    if w + 6 < y2 - y1:
        g.add(_text(x - 2.0, (y1 + y2) / 2, label, anchor="middle", angle=90))
    else:
        g.add(_text(x + 3 if side == "right" else x - 3, (y1 + y2) / 2 - 2.2, label,
                    anchor="start" if side == "right" else "end"))


def _ext(g, x1, y1, x2, y2):
    g.add(Line(x1, y1, x2, y2, strokeColor=DIM, strokeWidth=0.3))


def lining_caption(sheet) -> str:
    """What the boundary of the drawing shows: the lining and its layer thickness."""
    t = sheet.thickness or 0.0
    if t > 0:
        return f"Lining: {sheet.lining_label}; layer t = {sheet.format.stone(t)}, drawn to scale"
    if sheet.design.stability is not None:
        return f"Lining: {sheet.lining_label}; no layer thickness (heavy line)"
    return "No lining chosen (heavy line: the channel boundary)"


def section_drawing(sheet, width: float, height: float, min_height: float = 88.0) -> tuple[Drawing, str]:
    """A Drawing ``width`` x at most ``height`` [pt] of the channel's typical section, and its scale in words.

    The scale is the largest round one at which the section fits; the drawing
    is then made only as tall as it needs (at least ``min_height``).
    """
    register()
    us = sheet.units.key == "us"
    design = sheet.design
    geo = design_geometry(design, sheet.units)
    k = geo.to_units                  # the user's length unit per metre: every length below is in that unit
    yn, yc, total, t = geo.normal_depth, geo.critical_depth, geo.total_depth, geo.thickness
    open_top, closed, surveyed = geo.open_top, geo.closed, geo.surveyed
    fmt = sheet.format  # the tables' rounding, so a value reads the same in the drawing

    def length(v):   # a dimension of the section, as the inputs print it
        return fmt.shown(v, "length")

    def shown(v, key):   # a value of the design, as the results print it (app.results.PANEL_FIELDS)
        return fmt.shown_value(v, key)

    x, z = geo.boundary
    top_z = geo.top
    xo, zo = geo.outer_to_ground
    x_min, x_max = float(min(x.min(), xo.min())), float(max(x.max(), xo.max()))
    z_min = float(min(z.min(), zo.min()))
    real_w = x_max - x_min
    real_h = float(max(z.max(), total)) - z_min
    ground_pt = 28.0 if open_top else 0.0   # ground line beyond each bank [pt]
    dim_gap = 6.0 if open_top else 14.0     # dimension lines clear of the hatching of a pipe

    left, right, bottom, top = 74.0, 74.0, 35.0, 20.0
    avail_w = width - left - right - 2 * ground_pt
    avail_h = height - bottom - top
    s_needed = min(avail_w / real_w, avail_h / real_h)  # pt per unit of length
    ratio, scale_text = choose_scale(PT_PER_M / (s_needed * k), us)
    s_m = PT_PER_M / ratio            # pt per m
    s = s_m / k                       # pt per unit of length
    height = max(min_height, min(height, real_h * s + bottom + top + 8))
    avail_h = height - bottom - top
    x0 = left + ground_pt + (avail_w - real_w * s) / 2 - x_min * s
    y0 = bottom - z_min * s  # spare height goes above the drawing, so that the scale line stays close

    def X(v):
        return x0 + v * s

    def Y(v):
        return y0 + v * s

    d = Drawing(width, height)
    g = Group()
    d.add(g)
    blue, red = colors.Color(0.1, 0.3, 0.7), colors.Color(0.7, 0.1, 0.1)

    # water at the design depth, then the critical depth as a dashed line
    for px_, pz_ in geo.water:
        g.add(Polygon([c for px, pz in zip(px_, pz_) for c in (X(px), Y(pz))], fillColor=WATER, strokeColor=None))
    xl_w = xr_w = None
    if geo.surface is not None:
        xl_w, xr_w = geo.surface
        g.add(Line(X(xl_w), Y(yn), X(xr_w), Y(yn), strokeColor=blue, strokeWidth=0.8))
        # water-surface mark: an inverted triangle standing on the surface
        mx = X(xl_w + 0.2 * (xr_w - xl_w))  # left of the critical depth's label (at the right)
        g.add(Polygon([mx, Y(yn), mx - 3, Y(yn) + 5, mx + 3, Y(yn) + 5], fillColor=None,
                      strokeColor=blue, strokeWidth=0.6))
        ws = "design WS"
        if abs(yc - yn) * s <= 1.0:  # the critical depth's line would lie on the water surface
            ws += f" \u2248 critical depth yc {shown(yc, 'critical_depth')}"
        g.add(_text(mx + 5, Y(yn) + 1.2, ws, color=blue, size=SIZE - 0.5))
    if geo.critical is not None and abs(yc - yn) * s > 1.0:
        xl_c, xr_c = geo.critical
        g.add(Line(X(xl_c), Y(yc), X(xr_c), Y(yc), strokeColor=red, strokeWidth=0.5, strokeDashArray=[2, 1.5]))
        # above its line when above the water surface (clear of the "design WS" label), else below it
        _critical_label(g, x, z, yc, yn, s, X, Y, f"critical depth yc {shown(yc, 'critical_depth')}", f"yc {shown(yc, 'critical_depth')}", red)

    # lining band (to scale) or a heavy boundary line when its thickness is not known
    if geo.lining_band is not None:
        band = [c for px, pz in zip(*geo.lining_band) for c in (X(px), Y(pz))]
        g.add(Polygon(band, fillColor=LINING, strokeColor=INK, strokeWidth=THIN))
    else:
        g.add(PolyLine([c for px, pz in zip(x, z) for c in (X(px), Y(pz))], strokeColor=INK, strokeWidth=1.4))
    # earth hatching along the outside of the excavation (lining's outer face)
    _hatch(g, [X(v) for v in xo], [Y(v) for v in zo])

    xl, xr = geo.top_edges
    gl, gr = geo.ground_edges
    if surveyed:
        el, er = X(xl), X(xr)  # extension lines at the top of the ditch start at its edges
    else:
        el, er = X(gl) - ground_pt, X(gr) + ground_pt
    if open_top:
        # ground line beyond the top of both banks, with earth hatching below it
        for a, b in ((X(gl) - ground_pt, X(gl)), (X(gr), X(gr) + ground_pt)):
            g.add(Line(a, Y(top_z), b, Y(top_z), strokeColor=INK, strokeWidth=0.9))
            n = max(2, int((b - a) / 5))
            for i in range(n):
                hx = a + (i + 0.7) * (b - a) / n
                g.add(Line(hx, Y(top_z), hx - 3, Y(top_z) - 3, strokeColor=INK, strokeWidth=0.35))
        g.add(_text(X(gr) + ground_pt, Y(top_z) + 2.0, "ground", anchor="end", size=SIZE - 0.5))

    # top width above
    y_top = Y(top_z) + 12
    _ext(g, X(xl), Y(top_z) + 2, X(xl), y_top + 2)
    _ext(g, X(xr), Y(top_z) + 2, X(xr), y_top + 2)
    _dim_h(g, X(xl), X(xr), y_top, f"diameter D {length(xr - xl)}" if closed else f"top width {shown(xr - xl, 'top_width_at_top')}")

    # design depth and freeboard at the left, total depth at the right; labels horizontal
    x_invert = geo.invert_x
    xd_l = X(gl) - ground_pt - dim_gap
    xd_r = X(gr) + ground_pt + dim_gap
    _ext(g, X(x_invert) - 2, Y(0), xd_l - 2, Y(0))
    _ext(g, X(x_invert) + 2, Y(0), xd_r + 2, Y(0))
    _ext(g, el, Y(top_z), xd_l - 2, Y(top_z))
    _ext(g, er, Y(top_z), xd_r + 2, Y(top_z))
    if xl_w is not None:
        _ext(g, X(xl_w) - 2, Y(yn), xd_l - 2, Y(yn))
    _dim_v(g, xd_l, Y(0), Y(min(yn, top_z)), f"yn {shown(yn, 'normal_depth')}", side="left")
    if total > yn:
        _dim_v(g, xd_l, Y(yn), Y(top_z), f"{'to crown' if closed else 'freeboard'} {shown(total - yn, 'freeboard')}",
               side="left")
    _dim_v(g, xd_r, Y(0), Y(top_z), f"{'crown' if closed else 'total depth'} {shown(total, 'total_depth')}", side="right")

    # bottom width and side slopes for the trapezoid family
    if geo.side_slopes is not None:
        b = geo.bottom_width
        y_b = Y(0) - t * s - 10
        if b > 0:
            _ext(g, X(-b / 2), Y(0) - 2, X(-b / 2), y_b - 2)
            _ext(g, X(b / 2), Y(0) - 2, X(b / 2), y_b - 2)
            _dim_h(g, X(-b / 2), X(b / 2), y_b, f"b {length(b)}", above=False)
        for side, zs in (("left", geo.side_slopes[0]), ("right", geo.side_slopes[1])):
            if zs <= 0:
                continue
            theta = math.degrees(math.atan(1 / zs))
            zm = 0.5 * top_z
            xm = (-b / 2 - zs * zm) if side == "left" else (b / 2 + zs * zm)
            # parallel to the slope, on the ground side, beyond the hatching
            gap = t * s + 9 + SIZE
            c, sn = math.cos(math.radians(theta)), math.sin(math.radians(theta))
            nx = -sn if side == "left" else sn
            g.add(_text(X(xm) + nx * gap, Y(zm) - c * gap, f"{zs:g}H:1V (\u03b8 = {theta:.1f}\u00b0)",
                        anchor="middle", angle=-theta if side == "left" else theta))

    # the scale with a scale bar (the lining's caption goes beside the heading: lining_caption)
    bar_real = _bar_length(width * 0.2 / s_m, us)
    bx, by = 8.0, 5.0
    bar_pt = bar_real * s_m
    g.add(Rect(bx, by, bar_pt / 2, 2.5, fillColor=INK, strokeColor=INK, strokeWidth=0.3))
    g.add(Rect(bx + bar_pt / 2, by, bar_pt / 2, 2.5, fillColor=colors.white, strokeColor=INK, strokeWidth=0.3))
    bar_label = f"{bar_real / 0.3048:g} ft" if us else f"{bar_real:g} m"
    g.add(_text(bx + bar_pt + 4, by - 0.3, f"{bar_label}     Scale {scale_text} when printed at 100 %, "
                                          "horizontal and vertical alike"))
    return d, scale_text


def _critical_label(g, x, z, yc, yn, s, X, Y, label, short, color):
    """The critical depth's label at the right end of its line, where it fits inside the boundary.

    Tried in turn, with the full label and then the short one: below the line,
    then above it when the water surface is high enough above it (the "design
    WS" label sits above the water surface at the left). A critical depth above
    the water surface is labelled above its line.
    """
    size = SIZE - 0.5
    h = (size + 1.5) / s  # the label's height [m]

    def span(level):
        runs = wet_polygons(x, z, level) if level > 0 else []
        return (min(p[0] for p in runs[0]), max(p[0] for p in runs[-1])) if runs else None

    places = [("above", yc)] if yc > yn else [("below", yc - h), ("above", yc)]
    for text in (label, short):
        w = stringWidth(text, FONT, size) + 8
        for where, narrowest in places:
            if where == "above" and yc < yn and (yn - yc) < h:
                continue  # no room between the critical line and the water surface
            edges = span(narrowest)
            if edges is not None and w <= (edges[1] - edges[0]) * s:
                y = Y(yc) + 1.2 if where == "above" else Y(yc) - size - 0.5
                g.add(_text(X(edges[1]) - 4, y, text, color=color, size=size, anchor="end"))
                return
    edges = span(yc) or (float(np.min(x)), float(np.max(x)))
    g.add(_text(X((edges[0] + edges[1]) / 2), Y(yc) - size - 0.5, short, color=color, size=size, anchor="middle"))


def _hatch(g, xs, ys, spacing=5.0, size=3.0):
    """Short slanted ticks on the right-hand side of the paper polyline (xs, ys): ground."""
    carry = spacing / 2
    for i in range(len(xs) - 1):
        dx, dy = xs[i + 1] - xs[i], ys[i + 1] - ys[i]
        seg = math.hypot(dx, dy)
        if seg < 1e-9:
            continue
        ux, uy = dx / seg, dy / seg
        nx, ny = uy, -ux  # right-hand normal: into the ground
        pos = carry
        while pos < seg:
            px, py = xs[i] + ux * pos, ys[i] + uy * pos
            g.add(Line(px, py, px + size * (nx - 0.6 * ux), py + size * (ny - 0.6 * uy),
                       strokeColor=INK, strokeWidth=0.3))
            pos += spacing
        carry = pos - seg


def _bar_length(max_real: float, us: bool) -> float:
    """A round scale-bar length [m] not above ``max_real`` [m]."""
    unit = 0.3048 if us else 1.0
    for v in (100, 50, 20, 10, 5, 4, 2, 1, 0.5, 0.2, 0.1):
        if v * unit <= max_real:
            return v * unit
    return 0.1 * unit
