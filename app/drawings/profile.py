"""A ditch run's profile as a DXF drawing: the one drawing model of the run (:mod:`app.run_drawing`) placed on the
profile's layers, stations to scale and elevations exaggerated above a round datum.

    doc = profile_document(profile_model(design, units), units)
"""

from __future__ import annotations

import math

import numpy as np
from ezdxf.enums import TextEntityAlignment

from hydraulics.units import UnitSystem
from hydraulics.wording import format_station

from ..run_drawing import ProfileModel, level_text
from .dxf import (
    CHAR_WIDTH,
    PROFILE_LAYERS,
    add_polyline,
    add_text,
    new_document,
    nice_size,
)

__all__ = ["EXAGGERATIONS", "exaggeration_for", "profile_document"]

#: Vertical exaggerations offered for a profile (common practice: 5, 10 or 20 for road ditches).
EXAGGERATIONS = (1, 2, 5, 10, 20, 50, 100)


def exaggeration_for(length: float, relief: float) -> float:
    """The vertical exaggeration that makes the relief about a fifth of the length: the largest of
    :data:`EXAGGERATIONS` not above that (common practice for road profiles)."""
    if relief <= 0:
        return float(EXAGGERATIONS[0])
    want = length / (5.0 * relief)
    return float(max([e for e in EXAGGERATIONS if e <= want] or [EXAGGERATIONS[0]]))


def profile_document(model: ProfileModel, units: UnitSystem, exaggeration: float | None = None):
    """An ezdxf document of the run profile ``model``: stations along x (1 drawing unit = 1 length unit), elevations
    along y drawn ``exaggeration`` times (default :func:`exaggeration_for`) above a round datum elevation."""
    L = model.length_unit
    x0, x1 = model.first_station, model.last_station
    length = max(x1 - x0, 1e-9)
    lo, hi = model.y_range()
    gp = model.grade_points
    if gp is not None:
        lo, hi = min(lo, float(np.min(gp.y))), max(hi, float(np.max(gp.y)))
    ve = float(exaggeration) if exaggeration else exaggeration_for(length, hi - lo)
    step = nice_size(max(hi - lo, 1e-6) / 4)                 # elevation grid
    datum = math.floor((lo - 0.5 * step) / step) * step
    top_elev = math.ceil((hi + 0.25 * step) / step) * step
    h = nice_size(length / 90)

    def Y(z):
        return (np.asarray(z, float) - datum) * ve

    doc = new_document(units, PROFILE_LAYERS, h)
    doc.header.custom_vars.append("VERTICAL_EXAGGERATION", level_text(ve))
    doc.header.custom_vars.append("DATUM_ELEVATION", level_text(datum))
    msp = doc.modelspace()
    y_top = float(Y(top_elev))

    # grid and elevation scale
    k = 0
    while datum + k * step <= top_elev + 1e-9:
        z = datum + k * step
        y = float(Y(z))
        msp.add_line((x0, y), (x1, y), dxfattribs={"layer": "GRID"})
        msp.add_line((x0 - 0.6 * h, y), (x0, y), dxfattribs={"layer": "ELEVATIONS"})
        add_text(msp, level_text(z), x0 - 0.9 * h, y - 0.4 * h, 0.8 * h, layer="ELEVATIONS",
                 align=TextEntityAlignment.RIGHT)
        k += 1
    msp.add_line((x0, 0.0), (x0, y_top), dxfattribs={"layer": "ELEVATIONS"})
    add_text(msp, f"Elevation ({L})", x0 - 0.9 * h, y_top + 0.8 * h, 0.8 * h, layer="ELEVATIONS",
          align=TextEntityAlignment.RIGHT)

    # stations
    msp.add_line((x0, 0.0), (x1, 0.0), dxfattribs={"layer": "STATIONS"})
    for s, label in model.ticks:
        msp.add_line((s, 0.0), (s, -0.6 * h), dxfattribs={"layer": "STATIONS"})
        msp.add_line((s, 0.0), (s, y_top), dxfattribs={"layer": "GRID"})
        add_text(msp, label, s, -1.8 * h, 0.8 * h, layer="STATIONS", align=TextEntityAlignment.CENTER)

    # the lines along the run
    lines = model.lines
    if gp is not None:
        add_polyline(msp, gp.x, Y(gp.y), "INVERT")
    else:
        add_polyline(msp, lines["invert"].x, Y(lines["invert"].y), "INVERT")
    add_polyline(msp, lines["ditch_top"].x, Y(lines["ditch_top"].y), "DITCH-TOP")
    add_polyline(msp, lines["water_surface"].x, Y(lines["water_surface"].y), "WATER-SURFACE")
    if "normal" in lines:
        add_polyline(msp, lines["normal"].x, Y(lines["normal"].y), "NORMAL-DEPTH", ltscale=h / 2)
    if "critical" in lines:
        add_polyline(msp, lines["critical"].x, Y(lines["critical"].y), "CRITICAL-DEPTH", ltscale=h / 2)
    for jm in model.jumps:
        msp.add_line((jm.start, float(Y(jm.low))), (jm.start, float(Y(jm.high)) + 1.5 * h), dxfattribs={"layer": "JUMPS"})
        add_text(msp, jm.label, jm.start, float(Y(jm.high)) + 1.7 * h, 0.7 * h, layer="JUMPS",
              align=TextEntityAlignment.BOTTOM_CENTER)

    # grade points and grades
    if gp is not None:
        for x, z in zip(gp.x, gp.y):
            msp.add_circle((float(x), float(Y(z))), radius=0.25 * h, dxfattribs={"layer": "GRADES"})
    px, py = (gp.x, gp.y) if gp is not None else (lines["invert"].x, lines["invert"].y)
    for g in model.grades:
        i = int(np.clip(np.searchsorted(px, g.x) - 1, 0, len(px) - 2))
        angle = math.degrees(math.atan2(float(Y(py[i + 1]) - Y(py[i])), float(px[i + 1] - px[i])))
        n = math.radians(angle - 90)
        gx, gy = g.x + 1.0 * h * math.cos(n), float(Y(g.y)) + 1.0 * h * math.sin(n)
        add_text(msp, f"grade {g.text}", gx, gy, 0.8 * h, layer="GRADES", align=TextEntityAlignment.TOP_CENTER,
              rotation=angle)

    # the outfall: a mark from the invert up past the top of the ditch, labelled above it
    if model.outfall:
        s, z, label = model.outfall
        tops = lines["ditch_top"]
        j = int(np.argmin(np.abs(np.asarray(tops.x, float) - s)))
        y_mark = float(Y(tops.y[j])) + 2.0 * h if np.isfinite(tops.y[j]) else float(Y(z)) + 2.0 * h
        msp.add_line((s, float(Y(z))), (s, y_mark), dxfattribs={"layer": "TEXT"})
        add_text(msp, f"{label} {format_station(units.to_si('length', s), units)}", s, y_mark + 0.4 * h, 0.8 * h,
              align=TextEntityAlignment.BOTTOM_RIGHT if s >= x1 - 1e-9 else TextEntityAlignment.BOTTOM_LEFT)

    # lining stretches, as bands under the station labels
    b_top, b_bot = -3.0 * h, -5.0 * h
    for band in model.stretches:
        pts = [(band.start, b_top), (band.end, b_top), (band.end, b_bot), (band.start, b_bot)]
        msp.add_lwpolyline(pts, close=True, dxfattribs={"layer": "LINING-STRETCHES"})
        label = band.label
        room = band.end - band.start
        size = 0.7 * h
        if len(label) * CHAR_WIDTH * size > room - 0.4 * h:   # a short stretch: the label shortened to what fits
            fit = max(int((room - 0.4 * h) / (CHAR_WIDTH * size)), 0)
            label = (label[:max(fit - 1, 0)] + "\u2026") if fit >= 2 else ""
        if label:
            add_text(msp, label, 0.5 * (band.start + band.end), 0.5 * (b_top + b_bot), size, layer="LINING-STRETCHES",
                  align=TextEntityAlignment.MIDDLE_CENTER)
    add_text(msp, "Lining", x0 - 0.9 * h, 0.5 * (b_top + b_bot) - 0.35 * h, 0.7 * h, layer="LINING-STRETCHES",
          align=TextEntityAlignment.RIGHT)

    # a key of the lines, above the plot at the right
    key = [("INVERT", "invert", {}), ("DITCH-TOP", "top of ditch", {}), ("WATER-SURFACE", "water surface", {}),
           ("NORMAL-DEPTH", "normal depth", {"ltscale": h / 2}), ("CRITICAL-DEPTH", "critical depth", {"ltscale": h / 2})]
    kx = x1
    for layer, label, extra in reversed(key):
        kx -= len(label) * CHAR_WIDTH * 0.8 * h
        add_text(msp, label, kx, y_top + 0.7 * h, 0.8 * h)
        msp.add_line((kx - 4.0 * h, y_top + 1.1 * h), (kx - 0.5 * h, y_top + 1.1 * h),
                     dxfattribs={"layer": layer, **extra})
        kx -= 5.5 * h

    # title and notes above the profile
    notes = [f"Profile: {model.title}",
             f"Vertical exaggeration {ve:g}:1 (stations 1 drawing unit = 1 {L}; elevations drawn {ve:g} times, "
             f"above datum {level_text(datum)} {L})",
             "Invert through the grade points; water surface computed along the run (standard step method, from "
             "the outfall control); normal depth dashed, critical depth dotted"]
    for i, line in enumerate(notes):
        add_text(msp, line, x0, y_top + (len(notes) - i) * 1.7 * h + 1.5 * h, h * (1.4 if i == 0 else 0.9))
    return doc
