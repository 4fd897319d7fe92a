"""A channel's typical section as a DXF drawing: the one geometry of the drawn cross-section
(:mod:`app.section_geometry`, which the window and the sheet draw too) placed on the section's layers to scale,
1 drawing unit = 1 length unit, with real dimension entities and notes.

What this module adds to the geometry is only its placing on paper: a text height for the drawing's size, the
ground beyond the banks and a band of earth around the excavation, where each dimension line runs and where its
label goes, and the notes.

    doc = section_document(design, units)      # design: app.evaluate.ChannelDesign
"""

from __future__ import annotations

import math

import numpy as np
from ezdxf.enums import TextEntityAlignment

from hydraulics.units import UnitSystem

from ..lining_names import name_in_units
from ..results import format_value, panel_field, rounded
from ..section_geometry import SectionGeometry, design_geometry, offset_polyline
from .dxf import (
    CHAR_WIDTH,
    DIM_STYLE,
    SECTION_LAYERS,
    add_hatch,
    add_polyline,
    add_text,
    dxf_text,
    new_document,
    nice_size,
)

__all__ = ["section_document", "text_height", "section_notes"]


def text_height(geo: SectionGeometry) -> float:
    """A legible text height for the drawing of ``geo``: about a 45th of the section's size, rounded down."""
    width = geo.top_edges[1] - geo.top_edges[0]
    return nice_size(max(width, geo.top, 1e-9) / 45.0)


def section_notes(design, geo: SectionGeometry, units: UnitSystem, title: str) -> list[str]:
    """The lines of text that say what the drawing shows."""
    L = geo.length_unit

    def fmt(v):
        return f"{v:.2f} {L}"

    st = design.stability
    notes = [f"Typical section: {title}", f"Drawn to scale: 1 drawing unit = 1 {L}, horizontal and vertical alike"]
    if st is not None:
        notes.append(f"Lining: {name_in_units(st.lining_name, units)}"
                     + (f", layer {geo.thickness:.2f} {L} thick, drawn to scale" if geo.thickness > 0 else ""))
    else:
        notes.append("Pipe: the inside of its wall" if geo.closed else "No lining chosen")
    # the flow and n as the results panel and the sheet print them (the one rounding rule, app.results)
    notes.append(f"Design flow {format_value(design.flow, panel_field('flow'), units)}, slope "
                 f"{design.channel.slope:.4g} {units.label('slope')}, Manning's n "
                 f"{rounded(float(design.analysis.manning_n), panel_field('manning_n'))}")
    asked = float(design.total_depth) * geo.to_units
    if asked > geo.top + 1e-9:
        notes.append(f"Too shallow: the design depth plus freeboard ({fmt(asked)}) is above the "
                     f"{'crown' if geo.closed else 'top of the survey'} ({fmt(geo.top)})")
    return notes


def section_document(design, units: UnitSystem, title: str | None = None):
    """An ezdxf document of the typical section of ``design`` (an :class:`app.evaluate.ChannelDesign`) in ``units``,
    to scale (1 drawing unit = 1 length unit)."""
    geo = design_geometry(design, units)
    h = text_height(geo)
    doc = new_document(units, SECTION_LAYERS, h)
    msp = doc.modelspace()
    top, (left, right) = geo.top, geo.top_edges
    dx, dy = geo.ditch

    # the ground beyond the banks (a survey's own) and a band of earth under it and around the excavation
    earth = None
    ground = [tuple(np.asarray(a, float) for a in b) for b in geo.banks]
    if not geo.closed:
        if not geo.surveyed:
            berm = max(0.2 * (right - left), 4 * h)
            gl, gr = geo.ground_edges
            ground = [(np.array([gl - berm, gl]), np.array([top, top])), (np.array([gr, gr + berm]), np.array([top, top]))]
        gx, gz = geo.outer_to_ground     # a survey's runs from end to end, past its banks
        if not geo.surveyed:
            gx = np.concatenate([ground[0][0], gx, ground[1][0]])
            gz = np.concatenate([ground[0][1], gz, ground[1][1]])
        ex, ez = offset_polyline(gx, gz, 1.2 * h)   # the band below the surface of the ground (right-hand side)
        earth = (np.concatenate([gx, ex[::-1]]), np.concatenate([gz, ez[::-1]]))
        base = 0.125 if units.key == "us" else 3.175   # ANSI31: lines 3.175 units apart (metric), 0.125 (imperial)
        add_hatch(msp, list(zip(*earth)), "GROUND", pattern="ANSI31", scale=0.45 * h / base)
    for g in ground:
        add_polyline(msp, g[0], g[1], "GROUND")
    for wx, wz in geo.water:
        add_hatch(msp, list(zip(wx, wz)), "WATER").set_solid_fill(color=151)
    if geo.lining_band is not None:
        add_hatch(msp, list(zip(*geo.lining_band)), "LINING").set_solid_fill(color=9)
        add_polyline(msp, *geo.lining_band, "LINING", closed=True)
    add_polyline(msp, dx, dy, "DITCH-OUTLINE", closed=geo.closed)

    # the water surface with its mark, and the critical depth
    yn, yc = geo.normal_depth, geo.critical_depth
    if geo.surface is not None:
        wl, wr = geo.surface
        msp.add_line((wl, yn), (wr, yn), dxfattribs={"layer": "WATER-SURFACE"})
        mx = wl + 0.25 * (wr - wl)
        add_polyline(msp, [mx, mx - 0.5 * h, mx + 0.5 * h], [yn, yn + 0.85 * h, yn + 0.85 * h], "WATER-SURFACE",
                     closed=True)
        add_text(msp, f"WS yn {yn:.2f}", mx + 0.8 * h, yn + 0.25 * h, 0.8 * h)
    if geo.critical is not None:
        cl, cr = geo.critical
        msp.add_line((cl, yc), (cr, yc), dxfattribs={"layer": "CRITICAL-DEPTH", "ltscale": h / 4})
        below = geo.surface is None or yc <= yn
        add_text(msp, f"yc {yc:.2f}", cr - (0.6 if below else 0.3) * h, yc - 1.05 * h if below else yc + 0.25 * h,
                 0.8 * h, align=TextEntityAlignment.RIGHT)

    # the dimensions, outside what is drawn
    drawn = [(np.asarray(dx, float), np.asarray(dy, float)), *ground, *([earth] if earth else []),
             *([geo.lining_band] if geo.lining_band is not None else [])]
    x_min, x_max = min(float(v[0].min()) for v in drawn), max(float(v[0].max()) for v in drawn)
    y_max = max(float(v[1].max()) for v in drawn)
    L = geo.length_unit
    x_out_l, x_out_r = min(x_min, left) - 2.5 * h, max(x_max, right) + 2.5 * h
    bottom = np.flatnonzero(np.asarray(dy) <= float(np.min(dy)) + 1e-12)   # the invert's points, left to right
    inv_l, inv_r = (0.0, 0.0) if geo.closed else (float(dx[bottom[0]]), float(dx[bottom[-1]]))

    def beside(label, x, y, side):
        """The middle of a horizontal label beside the point (x, y): to its "left" or "right"."""
        w = CHAR_WIDTH * h * len(label)
        return (x - 0.8 * h - w / 2, y) if side == "left" else (x + 0.8 * h + w / 2, y)

    def linear(name, p1, p2, at, vertical, label_at=None):
        # "<>" is the measured value, so the label stays true if the drawing is edited
        override = {"dimtih": 1, "dimtoh": 1} if label_at is not None else None   # a horizontal label, placed
        msp.add_linear_dim(base=at, p1=p1, p2=p2, location=label_at, angle=90 if vertical else 0,
                           text=dxf_text(f"{name} <> {L}"), dimstyle=DIM_STYLE, override=override,
                           dxfattribs={"layer": "DIMENSIONS"}).render()

    name = "diameter" if geo.closed else "top width"
    y_top = top / 2 if geo.closed else top
    linear(name, (left, y_top), (right, y_top), (0.0, top + 2.5 * h), vertical=False)
    wl = geo.surface[0] if geo.surface is not None else inv_l
    y_n = min(yn, top)
    linear("yn", (inv_l, 0.0), (wl, y_n), (x_out_l, 0.0), True,
           beside(f"yn {y_n:.2f} {L}", x_out_l, y_n / 2, "left"))
    if top > yn:
        word = "to crown" if geo.closed else "freeboard"
        linear(word, (wl, yn), (0.0 if geo.closed else left, top), (x_out_l, yn), True,
               beside(f"{word} {top - yn:.2f} {L}", x_out_l, max((yn + top) / 2, y_n / 2 + 1.2 * h), "left"))
    word = "crown" if geo.closed else "total depth"
    linear(word, (inv_r, 0.0), (0.0 if geo.closed else right, top), (x_out_r, 0.0), True,
           beside(f"{word} {top:.2f} {L}", x_out_r, top / 2, "right"))
    if geo.side_slopes is not None:   # the trapezoid family: bottom width and each side slope as an angle
        b = geo.bottom_width
        if b > 0:
            y_b = (float(earth[1].min()) if earth else 0.0) - 2.0 * h   # under the earth band
            linear("bottom width", (-b / 2, 0.0), (b / 2, 0.0), (0.0, y_b), False, (0.0, y_b - 1.0 * h))
        for z, x_top, sign in ((geo.side_slopes[0], left, 1.0), (geo.side_slopes[1], right, -1.0)):
            if z > 0:
                _slope_angle(msp, z, x_top, top, sign, h)

    y_notes = max(y_max, top) + 5.0 * h
    notes = section_notes(design, geo, units, title or design.channel.name)
    for i, line in enumerate(notes):
        add_text(msp, line, x_min, y_notes + (len(notes) - 1 - i) * 1.6 * h, h * (1.3 if i == 0 else 0.9))
    return doc


def _slope_angle(msp, z, x_top, top, sign, h):
    """The side slope zH:1V of the bank whose top is at (x_top, top) (``sign`` +1: the left bank, -1: the right),
    as the angular dimension atan(1/z) between the bank and the top, labelled inside the ditch by its arc."""
    run = math.hypot(z * top, top)
    r = min(2.0 * h, 0.45 * run)
    inward = (x_top + sign * r, top)                                                   # along the top, into the ditch
    down = (x_top + sign * r * z / math.hypot(z, 1.0), top - r / math.hypot(z, 1.0))   # down the bank
    mid = math.atan(1.0 / z) / 2
    at = (x_top + sign * r * math.cos(mid), top - r * math.sin(mid))
    # anticlockwise from p1 to p2: the left bank turns from the bank down to the top, the right one back
    p1, p2 = (down, inward) if sign > 0 else (inward, down)
    label = f"{z:g}H:1V"
    label_at = (x_top + sign * (r + 1.0 * h + CHAR_WIDTH * h * len(label) / 2), top - 0.8 * h)
    msp.add_angular_dim_3p(base=at, center=(x_top, top), p1=p1, p2=p2, text=dxf_text(label), location=label_at,
                           text_rotation=0.0, dimstyle=DIM_STYLE, override={"dimtih": 1, "dimtoh": 1},
                           dxfattribs={"layer": "DIMENSIONS"}).render()
