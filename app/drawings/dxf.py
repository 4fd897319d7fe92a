"""DXF drawings for CAD, written with ezdxf: a channel's typical section and a ditch run's profile.

The geometry comes from the one drawing model of each (:mod:`app.section_model`, :mod:`app.run_drawing`); this
module only places it on named layers in a DXF document. Drawing units are the project's length unit (1 unit =
1 ft or 1 m, stated in ``$INSUNITS``), so a CAD user can scale and reference the drawing as it is.

    doc = section_document(section_model(design, units), units)
    write_document(doc, "East verge ditch-section.dxf")
"""

from __future__ import annotations

import io
import math

import ezdxf
import numpy as np
from ezdxf import units as dxf_units
from ezdxf.enums import TextEntityAlignment

from hydraulics.units import UnitSystem
from hydraulics.wording import format_station

from ..files import write_atomic
from ..run_drawing import ProfileModel
from ..section_model import SectionModel, nice_size

__all__ = ["TEXT_STYLE", "DIM_STYLE", "SECTION_LAYERS", "PROFILE_LAYERS", "section_document", "profile_document",
           "document_bytes", "write_document", "exaggeration_for"]

TEXT_STYLE = "DITCHWRIGHT"
DIM_STYLE = "DITCHWRIGHT"
FONT = "DejaVuSans.ttf"

#: Layer name -> (ACI colour, line weight [1/100 mm], line type, what it holds).
SECTION_LAYERS = {
    "GROUND": (34, 35, "Continuous", "ground line beyond the banks and the earth around the excavation"),
    "DITCH-OUTLINE": (7, 50, "Continuous", "finished channel boundary up to the top of the ditch"),
    "LINING": (8, 25, "Continuous", "lining band at its layer thickness"),
    "WATER": (151, 0, "Continuous", "water at the design depth (fill)"),
    "WATER-SURFACE": (5, 35, "Continuous", "water surface at the design (normal) depth and its mark"),
    "CRITICAL-DEPTH": (1, 25, "DASHED", "critical depth"),
    "DIMENSIONS": (250, 18, "Continuous", "dimensions: widths, depths, freeboard, side slopes"),
    "TEXT": (7, 18, "Continuous", "labels and notes"),
}
PROFILE_LAYERS = {
    "INVERT": (7, 50, "Continuous", "invert of the ditch through its grade points"),
    "DITCH-TOP": (34, 25, "Continuous", "top of the ditch (invert plus ditch depth)"),
    "WATER-SURFACE": (150, 50, "Continuous", "water surface computed along the run (standard step method)"),
    "NORMAL-DEPTH": (140, 18, "DASHED-OPEN", "normal depth"),
    "CRITICAL-DEPTH": (1, 35, "DOTTED-SHORT", "critical depth"),
    "JUMPS": (1, 25, "Continuous", "hydraulic jumps, marked at the station of the toe"),
    "GRADES": (94, 18, "Continuous", "grade points and the grade of each stretch"),
    "STATIONS": (7, 18, "Continuous", "station line, ticks and labels"),
    "ELEVATIONS": (7, 18, "Continuous", "elevation scale"),
    "GRID": (9, 9, "Continuous", "elevation and station grid"),
    "LINING-STRETCHES": (30, 25, "Continuous", "lining stretches as labelled bands"),
    "TEXT": (7, 18, "Continuous", "title and notes"),
}

#: Line types of our own: name -> (pattern [total length, dash, gap, ...] at line-type scale 1, description).
#: Wide gaps keep normal depth readable as dashes where it runs along the computed water surface, and short dashes
#: draw critical depth's dots in every viewer (a dot of length zero vanishes in some).
LINETYPES = {"DASHED-OPEN": ([2.0, 1.2, -0.8], "Dashed, open __  __  __"),
             "DOTTED-SHORT": ([1.0, 0.25, -0.75], "Dotted . . . .")}

#: The width of an average character of the text style, as a fraction of the text height (DejaVu Sans, measured
#: on renderings of our labels: the height is the capital height, an average letter is a little wider).
CHAR_WIDTH = 0.8

#: Vertical exaggerations offered for a profile (common practice: 5, 10 or 20 for road ditches).
EXAGGERATIONS = (1, 2, 5, 10, 20, 50, 100)


def _insunits(units: UnitSystem) -> int:
    return dxf_units.FT if units.key == "us" else dxf_units.M


def _new_document(units: UnitSystem, layers: dict, text_height: float):
    """A DXF document in ``units`` with our layers, our text style and our dimension style."""
    doc = ezdxf.new("R2010", setup=["linetypes"])
    doc.units = _insunits(units)
    doc.header["$MEASUREMENT"] = 0 if units.key == "us" else 1
    doc.header["$LUNITS"] = 2            # decimal
    doc.styles.add(TEXT_STYLE, font=FONT)
    for name, (pattern, description) in LINETYPES.items():
        doc.linetypes.add(name, pattern=pattern, description=description)
    for name, (color, weight, linetype, what) in layers.items():
        layer = doc.layers.add(name, color=color, linetype=linetype)
        layer.dxf.lineweight = weight
        layer.description = what
    h = text_height
    dim = doc.dimstyles.new(DIM_STYLE)
    for key, value in dict(dimtxt=h, dimasz=0.8 * h, dimexe=0.5 * h, dimexo=0.4 * h, dimgap=0.35 * h, dimtad=1,
                           dimdec=2, dimadec=1, dimzin=0, dimtih=0, dimtoh=0, dimtmove=2, dimdle=0,
                           dimdsep=ord("."), dimclrd=250, dimclre=250, dimclrt=7, dimlfac=1.0).items():
        dim.dxf.set(key, value)
    dim.dxf.dimtxsty = TEXT_STYLE
    doc.header["$DIMSTYLE"] = DIM_STYLE
    doc.header["$TEXTSTYLE"] = TEXT_STYLE
    return doc


def dxf_text(text: str) -> str:
    """Text as DXF shows it: a caret starts a control character there, so unit powers become superscripts."""
    return text.replace("^3", "\u00b3").replace("^2", "\u00b2").replace("^", "")


def _text(msp, text, x, y, h, layer="TEXT", align=TextEntityAlignment.LEFT, rotation=0.0):
    t = msp.add_text(dxf_text(text), height=h, rotation=rotation, dxfattribs={"style": TEXT_STYLE, "layer": layer})
    t.set_placement((x, y), align=align)
    return t


def _polyline(msp, xs, ys, layer, closed=False, **attribs):
    """Polylines through (xs, ys); NaN breaks the line into parts, single points are left out."""
    xs, ys = np.asarray(xs, float), np.asarray(ys, float)
    ok = np.isfinite(xs) & np.isfinite(ys)
    parts, start = [], None
    for i, good in enumerate(ok):
        if good and start is None:
            start = i
        if start is not None and (not good or i == len(ok) - 1):
            end = i + 1 if good else i
            if end - start > 1:
                parts.append(list(zip(xs[start:end], ys[start:end])))
            start = None
    for pts in parts:
        msp.add_lwpolyline(pts, close=closed, dxfattribs={"layer": layer, **attribs})
    return parts


def _hatch(msp, points, layer, pattern=None, scale=1.0, color=256):
    hatch = msp.add_hatch(color=color, dxfattribs={"layer": layer})
    hatch.paths.add_polyline_path(points, is_closed=True)
    if pattern:
        hatch.set_pattern_fill(pattern, scale=scale, color=color)
    return hatch


# -- the typical section --------------------------------------------------------------------------------------------
def section_document(model: SectionModel, units: UnitSystem):
    """An ezdxf document of the typical section ``model``, to scale (1 drawing unit = 1 length unit)."""
    h = model.text_height
    doc = _new_document(units, SECTION_LAYERS, h)
    msp = doc.modelspace()
    if model.earth is not None:   # ANSI31: lines 3.175 units apart in a metric drawing, 0.125 in an imperial one
        base = 0.125 if units.key == "us" else 3.175
        _hatch(msp, model.earth.points(), "GROUND", pattern="ANSI31", scale=0.45 * h / base)
    for g in model.ground:
        _polyline(msp, g.x, g.y, "GROUND")
    for w in model.water:
        _hatch(msp, w.points(), "WATER").set_solid_fill(color=151)
    if model.lining is not None:
        _hatch(msp, model.lining.points(), "LINING").set_solid_fill(color=9)
        _polyline(msp, model.lining.x, model.lining.y, "LINING", closed=True)
    _polyline(msp, model.ditch.x, model.ditch.y, "DITCH-OUTLINE", closed=model.ditch.closed)

    levels = model.levels
    ws = levels.get("water_surface")
    if ws is not None:
        msp.add_line((ws.left, ws.height), (ws.right, ws.height), dxfattribs={"layer": "WATER-SURFACE"})
        for mark in model.marks:
            _polyline(msp, mark.x, mark.y, "WATER-SURFACE", closed=True)
        mx = max(mark.x) if model.marks else ws.left
        _text(msp, f"WS yn {ws.height:.2f}", mx + 0.3 * h, ws.height + 0.25 * h, 0.8 * h)
    cd = levels.get("critical_depth")
    if cd is not None:
        msp.add_line((cd.left, cd.height), (cd.right, cd.height),
                     dxfattribs={"layer": "CRITICAL-DEPTH", "ltscale": h / 4})
        below = ws is None or cd.height <= ws.height
        y = cd.height - 1.05 * h if below else cd.height + 0.25 * h
        _text(msp, f"yc {cd.height:.2f}", cd.right - 0.6 * h if below else cd.right - 0.3 * h, y, 0.8 * h,
              align=TextEntityAlignment.RIGHT)

    for d in model.dimensions:
        attribs = {"layer": "DIMENSIONS"}
        beside = {"dimtih": 1, "dimtoh": 1} if d.text_at is not None else None   # horizontal label, placed
        if d.kind == "angle":
            dim = msp.add_angular_dim_3p(base=d.at, center=d.center, p1=d.p1, p2=d.p2, text=dxf_text(d.text),
                                         location=d.text_at, text_rotation=0.0 if d.text_at else None,
                                         dimstyle=DIM_STYLE, override=beside,
                                         dxfattribs=attribs)
        else:   # "<>" is the measured value, so the label stays true if the drawing is edited
            text = dxf_text(f"{d.name} <> {units.label('length')}")
            dim = msp.add_linear_dim(base=d.at, p1=d.p1, p2=d.p2, location=d.text_at,
                                     angle=0 if d.kind == "horizontal" else 90, text=text, dimstyle=DIM_STYLE,
                                     override=beside, dxfattribs=attribs)
        dim.render()

    x0, y0, x1, y1 = model.extents("all")
    top = max(y1, model.top_height) + 5.0 * h
    for i, line in enumerate(model.notes):
        _text(msp, line, x0, top + (len(model.notes) - 1 - i) * 1.6 * h, h * (1.3 if i == 0 else 0.9))
    return doc


# -- the profile of a run -----------------------------------------------------------------------------------------
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

    doc = _new_document(units, PROFILE_LAYERS, h)
    doc.header.custom_vars.append("VERTICAL_EXAGGERATION", f"{ve:g}")
    doc.header.custom_vars.append("DATUM_ELEVATION", f"{datum:g}")
    msp = doc.modelspace()
    y_top = float(Y(top_elev))

    # grid and elevation scale
    k = 0
    while datum + k * step <= top_elev + 1e-9:
        z = datum + k * step
        y = float(Y(z))
        msp.add_line((x0, y), (x1, y), dxfattribs={"layer": "GRID"})
        msp.add_line((x0 - 0.6 * h, y), (x0, y), dxfattribs={"layer": "ELEVATIONS"})
        _text(msp, f"{z:g}", x0 - 0.9 * h, y - 0.4 * h, 0.8 * h, layer="ELEVATIONS", align=TextEntityAlignment.RIGHT)
        k += 1
    msp.add_line((x0, 0.0), (x0, y_top), dxfattribs={"layer": "ELEVATIONS"})
    _text(msp, f"Elevation ({L})", x0 - 0.9 * h, y_top + 0.8 * h, 0.8 * h, layer="ELEVATIONS",
          align=TextEntityAlignment.RIGHT)

    # stations
    msp.add_line((x0, 0.0), (x1, 0.0), dxfattribs={"layer": "STATIONS"})
    for s, label in model.ticks:
        msp.add_line((s, 0.0), (s, -0.6 * h), dxfattribs={"layer": "STATIONS"})
        msp.add_line((s, 0.0), (s, y_top), dxfattribs={"layer": "GRID"})
        _text(msp, label, s, -1.8 * h, 0.8 * h, layer="STATIONS", align=TextEntityAlignment.CENTER)

    # the lines along the run
    lines = model.lines
    if gp is not None:
        _polyline(msp, gp.x, Y(gp.y), "INVERT")
    else:
        _polyline(msp, lines["invert"].x, Y(lines["invert"].y), "INVERT")
    _polyline(msp, lines["ditch_top"].x, Y(lines["ditch_top"].y), "DITCH-TOP")
    _polyline(msp, lines["water_surface"].x, Y(lines["water_surface"].y), "WATER-SURFACE")
    if "normal" in lines:
        _polyline(msp, lines["normal"].x, Y(lines["normal"].y), "NORMAL-DEPTH", ltscale=h / 2)
    if "critical" in lines:
        _polyline(msp, lines["critical"].x, Y(lines["critical"].y), "CRITICAL-DEPTH", ltscale=h / 2)
    for jm in model.jumps:
        msp.add_line((jm.start, float(Y(jm.low))), (jm.start, float(Y(jm.high)) + 1.5 * h), dxfattribs={"layer": "JUMPS"})
        _text(msp, jm.label, jm.start, float(Y(jm.high)) + 1.7 * h, 0.7 * h, layer="JUMPS",
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
        _text(msp, f"grade {g.text}", gx, gy, 0.8 * h, layer="GRADES", align=TextEntityAlignment.TOP_CENTER,
              rotation=angle)

    # the outfall: a mark from the invert up past the top of the ditch, labelled above it
    if model.outfall:
        s, z, label = model.outfall
        tops = lines["ditch_top"]
        j = int(np.argmin(np.abs(np.asarray(tops.x, float) - s)))
        y_mark = float(Y(tops.y[j])) + 2.0 * h if np.isfinite(tops.y[j]) else float(Y(z)) + 2.0 * h
        msp.add_line((s, float(Y(z))), (s, y_mark), dxfattribs={"layer": "TEXT"})
        _text(msp, f"{label} {format_station(units.to_si('length', s), units)}", s, y_mark + 0.4 * h, 0.8 * h,
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
            _text(msp, label, 0.5 * (band.start + band.end), 0.5 * (b_top + b_bot), size, layer="LINING-STRETCHES",
                  align=TextEntityAlignment.MIDDLE_CENTER)
    _text(msp, "Lining", x0 - 0.9 * h, 0.5 * (b_top + b_bot) - 0.35 * h, 0.7 * h, layer="LINING-STRETCHES",
          align=TextEntityAlignment.RIGHT)

    # a key of the lines, above the plot at the right
    key = [("INVERT", "invert", {}), ("DITCH-TOP", "top of ditch", {}), ("WATER-SURFACE", "water surface", {}),
           ("NORMAL-DEPTH", "normal depth", {"ltscale": h / 2}), ("CRITICAL-DEPTH", "critical depth", {"ltscale": h / 2})]
    kx = x1
    for layer, label, extra in reversed(key):
        kx -= len(label) * CHAR_WIDTH * 0.8 * h
        _text(msp, label, kx, y_top + 0.7 * h, 0.8 * h)
        msp.add_line((kx - 4.0 * h, y_top + 1.1 * h), (kx - 0.5 * h, y_top + 1.1 * h),
                     dxfattribs={"layer": layer, **extra})
        kx -= 5.5 * h

    # title and notes above the profile
    notes = [f"Profile: {model.title}",
             f"Vertical exaggeration {ve:g}:1 (stations 1 drawing unit = 1 {L}; elevations drawn {ve:g} times, "
             f"above datum {datum:g} {L})",
             "Invert through the grade points; water surface computed along the run (standard step method, from "
             "the outfall control); normal depth dashed, critical depth dotted"]
    for i, line in enumerate(notes):
        _text(msp, line, x0, y_top + (len(notes) - i) * 1.7 * h + 1.5 * h, h * (1.4 if i == 0 else 0.9))
    return doc


# -- writing ----------------------------------------------------------------------------------------------------------
def document_bytes(doc) -> bytes:
    """The DXF file of ``doc`` as bytes: ezdxf writes the text to a stream and encodes it as the document
    declares (``Drawing.write`` and ``Drawing.encode``)."""
    stream = io.StringIO()
    doc.write(stream)
    return doc.encode(stream.getvalue())


def write_document(doc, path) -> None:
    """Write ``doc`` to ``path`` in one step: a failure leaves any earlier file of that name as it was."""
    write_atomic(path, document_bytes(doc))
