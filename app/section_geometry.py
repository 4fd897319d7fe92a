"""The one geometry of the drawn cross-section, that the window's picture and the design sheet's drawing both draw.

A solved channel's typical section as lines and levels in the user's length
unit, invert at z = 0 and the section centred on x = 0: the channel boundary up
to the top of the ditch (a pipe's whole ring, a survey's every point), the
lining's outer face at its layer thickness, the water at normal depth, the
levels of the water surface, the critical depth and the top of the ditch, and
the values the dimensions state (depth, freeboard, total depth, widths, side
slopes). The boundary is the core's ``Section.outline``; nothing here computes
hydraulics. The front ends only place, style and label what they are given:
the window (:mod:`app.gui.plots`, matplotlib) frames it with ground and soil,
the sheet (:mod:`app.sheet.section_drawing`, reportlab) draws it to a printed
scale, the CAD drawing (:mod:`app.drawings.section`, ezdxf) draws it to scale on
layers. Qt-free, no plotting library.

    geo = section_geometry(section, normal_depth, critical_depth, total_depth, units, lining_thickness)
    geo = design_geometry(design, units)      # the same, for an app.evaluate.ChannelDesign
    geo.boundary, geo.water, geo.surface, geo.dimensions["freeboard"]
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from hydraulics.units import UnitSystem

__all__ = ["SectionGeometry", "section_geometry", "design_geometry", "offset_polyline", "wet_polygons", "to_ground"]

Line = tuple  # (x array, z array)


@dataclass(frozen=True)
class SectionGeometry:
    """A section as drawn, in ``length_unit`` (the user's); see :func:`section_geometry` for each part."""

    kind: str                    # the core's section kind: trapezoid, triangle, rectangle, parabola, circle, irregular
    length_unit: str             # label of the unit every length here is in ("m", "ft")
    to_units: float              # user's length unit per metre (multiply an SI length to draw it here)
    boundary: Line               # the channel boundary (a pipe: the closed ring from the crown)
    outer: Line                  # the lining's outer face, mitred (the boundary itself without a thickness)
    outer_to_ground: Line        # the outer face with an open section's two ends carried to the top of the ditch
    ditch: Line                  # the boundary up to the top of the ditch (a survey: between its top edges)
    banks: list                  # a survey's ground beyond the top edges, [left, right] Lines (else empty)
    lining_band: Line | None     # closed: boundary, then the outer face back (None without a thickness)
    thickness: float             # lining layer thickness (0 when not known)
    normal_depth: float
    critical_depth: float
    total_depth: float           # design depth plus freeboard, at most the section's full depth
    top: float                   # level of the top of the ditch: total depth (open), crown (pipe), total (survey)
    full_depth: float | None     # the section's own full depth (a pipe's crown, a survey's lower bank), or None
    water: list                  # polygons [(x, z)] of the water at normal depth, one per wet run
    surface: tuple | None        # (left, right) ends of the water surface
    critical: tuple | None       # (left, right) ends of the critical-depth line
    top_edges: tuple             # (left, right) of the top width (a pipe's diameter, a survey's width at its top)
    ground_edges: tuple          # (left, right) where the ground meets the excavation (its outer face)
    invert_x: float              # x of the lowest point
    bottom_width: float | None   # trapezoid family (0 for a V-ditch), else None
    side_slopes: tuple | None    # (left, right) H:V, trapezoid family, else None
    slope_points: tuple | None   # (left x, right x, z): each bank at half the top's height, trapezoid family
    dimensions: dict = field(default_factory=dict)   # the values the dimensions state (see section_geometry)

    @property
    def closed(self) -> bool:
        return self.kind == "circle"

    @property
    def open_top(self) -> bool:
        return self.kind in ("trapezoid", "triangle", "rectangle", "parabola")

    @property
    def surveyed(self) -> bool:
        return self.kind == "irregular"


def section_geometry(section, normal_depth: float, critical_depth: float, total_depth: float, units: UnitSystem,
                     lining_thickness: float | None = None) -> SectionGeometry:
    """The drawn geometry of ``section`` (a :class:`hydraulics.Section`) with water at ``normal_depth`` [m],
    critical depth ``critical_depth`` [m] and the top of the ditch at ``total_depth`` [m] (design depth plus
    freeboard), its lining ``lining_thickness`` [m] thick (None or 0: not known), in ``units``.

    ``dimensions`` holds, in the user's length unit: ``normal_depth``, ``critical_depth``, ``freeboard`` (top of
    the ditch, or crown, less the normal depth), ``total_depth``, ``top_width`` (between ``top_edges``),
    ``surface_width`` (the water surface), ``bottom_width`` (trapezoid family) and ``thickness``.
    """
    k = float(units.from_si("length", 1.0))
    yn, yc = float(normal_depth) * k, float(critical_depth) * k
    full_si = section.full_depth
    full = None if full_si is None else float(full_si) * k
    total = float(total_depth) * k if full is None else min(float(total_depth) * k, full)
    t = float(lining_thickness or 0.0) * k
    kind = section.kind
    x, z = (np.asarray(a, float) * k for a in section.outline(total / k))
    if kind == "circle":            # the ring from the crown, closed, so that the water is one run
        i = int(np.argmax(z))
        x, z = np.roll(x[:-1], -i), np.roll(z[:-1], -i)
        x, z = np.append(x, x[0]), np.append(z, z[0])
        total = full
    elif kind == "irregular":       # a survey, centred as the other sections are
        x = x - (x.min() + x.max()) / 2
    open_top = kind in ("trapezoid", "triangle", "rectangle", "parabola")
    top = total if kind in ("circle", "irregular") else float(z[0])
    if t > 0:
        xo, zo = offset_polyline(x, z, t)
        xg, zg = to_ground(xo, zo, top) if open_top else (xo, zo)
    else:
        xo, zo = xg, zg = x, z
    water = [(np.array([p[0] for p in poly]), np.array([p[1] for p in poly])) for poly in wet_polygons(x, z, yn)]
    surface = _extent(x, z, yn)
    critical = _extent(x, z, yc)
    if kind == "circle":
        top_edges = (float(x.min()), float(x.max()))
    elif kind == "irregular":       # the top width at the top of the ditch (design depth plus freeboard)
        top_edges = _extent(x, z, top) or (float(x.min()), float(x.max()))
    else:
        top_edges = (float(x[0]), float(x[-1]))
    if kind == "irregular":         # the ends of the survey
        ground_edges = (float(min(x.min(), xg.min())), float(max(x.max(), xg.max())))
    else:
        ground_edges = (min(top_edges[0], float(xg[0])), max(top_edges[1], float(xg[-1])))
    bottom = slopes = slope_points = None
    if section.side_slopes is not None:
        bottom = float(section.bottom_width) * k
        slopes = tuple(float(v) for v in section.side_slopes)
        mid = 0.5 * top
        slope_points = (-bottom / 2 - slopes[0] * mid, bottom / 2 + slopes[1] * mid, mid)
    dims = {"normal_depth": yn, "critical_depth": yc, "freeboard": top - yn, "total_depth": total,
            "top_width": top_edges[1] - top_edges[0],
            "surface_width": None if surface is None else surface[1] - surface[0],
            "bottom_width": bottom, "thickness": t}
    ditch, banks = _ditch_and_banks(x, z, top, top_edges) if kind == "irregular" else ((x, z), [])
    band = None if t <= 0 else (np.concatenate([x, xg[::-1]]), np.concatenate([z, zg[::-1]]))
    return SectionGeometry(kind, units.label("length"), k, (x, z), (xo, zo), (xg, zg), ditch, banks, band, t, yn, yc,
                           total, top, full,
                           water, surface, critical, top_edges, ground_edges, float(x[int(np.argmin(z))]), bottom,
                           slopes, slope_points, dims)


def design_geometry(design, units: UnitSystem) -> SectionGeometry:
    """:func:`section_geometry` of a solved channel (an :class:`app.evaluate.ChannelDesign`): its normal and
    critical depths, its total depth and its lining's layer thickness (none without a lining)."""
    st = design.stability
    return section_geometry(design.section, design.analysis.normal_depth, design.analysis.critical_depth,
                            design.total_depth, units, None if st is None else st.layer_thickness)


def _ditch_and_banks(x, z, top, edges):
    """A survey (x, z) split at its top edges (left, right) at level ``top``: the ditch between them, ends on the
    level, and the ground beyond each (a bank with no point beyond its edge is left out)."""
    left, right = edges
    inside = (x > left) & (x < right)
    ditch = (np.concatenate([[left], x[inside], [right]]), np.concatenate([[top], z[inside], [top]]))
    lo, hi = x <= left, x >= right
    banks = [(np.append(x[lo], left), np.append(z[lo], top)), (np.insert(x[hi], 0, right), np.insert(z[hi], 0, top))]
    return ditch, [b for b in banks if len(b[0]) > 1]


def _extent(x, z, level):
    """(leftmost, rightmost) x of the water standing at ``level`` over the boundary, or None when it is dry."""
    runs = wet_polygons(x, z, level) if level > 0 else []
    return (min(p[0] for p in runs[0]), max(p[0] for p in runs[-1])) if runs else None


def offset_polyline(x, z, distance):
    """The polyline moved ``distance`` to its right-hand side (into the ground for a left-to-right outline).

    Mitred joins: each interior point is the intersection of the two moved segments; a join sharper than
    about 157 degrees gets both moved ends instead.
    """
    pts = np.column_stack([x, z]).astype(float)
    d = np.diff(pts, axis=0)
    keep = np.hypot(d[:, 0], d[:, 1]) > 1e-12
    pts = np.vstack([pts[0], pts[1:][keep]])
    d = np.diff(pts, axis=0)
    length = np.hypot(d[:, 0], d[:, 1])
    normal = np.column_stack([d[:, 1], -d[:, 0]]) / length[:, None]
    out = [pts[0] + distance * normal[0]]
    for i in range(1, len(pts) - 1):
        n1, n2 = normal[i - 1], normal[i]
        bis = n1 + n2
        cos_half = np.dot(bis, n1) / max(np.linalg.norm(bis), 1e-12)
        if np.linalg.norm(bis) < 1e-9 or cos_half < 0.2:
            out.append(pts[i] + distance * n1)
            out.append(pts[i] + distance * n2)
        else:
            out.append(pts[i] + distance * bis / np.linalg.norm(bis) / cos_half)
    out.append(pts[-1] + distance * normal[-1])
    out = np.array(out)
    return out[:, 0], out[:, 1]


def wet_polygons(x, z, level):
    """Polygons [(x, z) points] of water standing at ``level`` over the boundary (x, z), one per wet run."""
    polys, run = [], []
    for i in range(len(x)):
        below = z[i] <= level
        if i > 0 and (z[i - 1] <= level) != below:
            f = (level - z[i - 1]) / (z[i] - z[i - 1])
            run.append((x[i - 1] + f * (x[i] - x[i - 1]), level))
            if not below:
                polys.append(run)
                run = []
        if below:
            run.append((x[i], z[i]))
    if len(run) > 2:
        polys.append(run)
    return [p for p in polys if len(p) > 2]


def to_ground(xo, zo, level):
    """The outer face (xo, zo) of an open section's lining, its two ends moved along their segments to ``level``."""
    xo, zo = np.array(xo, float), np.array(zo, float)
    for end, nxt in ((0, 1), (-1, -2)):
        dz = zo[nxt] - zo[end]
        if abs(dz) > 1e-12:
            f = (level - zo[end]) / dz
            xo[end], zo[end] = xo[end] + f * (xo[nxt] - xo[end]), level
    return xo, zo
