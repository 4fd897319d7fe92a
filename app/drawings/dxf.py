"""What every DXF drawing shares, written with ezdxf: the one table of layers, the text and dimension styles, the
document set-up, drawing helpers and writing a file.

The drawings themselves are :mod:`app.drawings.section` (a channel's typical section) and
:mod:`app.drawings.profile` (a ditch run's profile). Drawing units are the project's length unit (1 unit = 1 ft or
1 m, stated in ``$INSUNITS``), so a CAD user can scale and reference the drawing as it is.

    doc = new_document(units, SECTION_LAYERS, text_height)
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

from ..files import write_atomic

__all__ = ["TEXT_STYLE", "DIM_STYLE", "LAYERS", "SECTION_LAYERS", "PROFILE_LAYERS", "CHAR_WIDTH", "new_document",
           "nice_size", "dxf_text", "add_text", "add_polyline", "add_hatch", "document_bytes", "write_document"]

TEXT_STYLE = "DITCHWRIGHT"
DIM_STYLE = "DITCHWRIGHT"
FONT = "DejaVuSans.ttf"

#: Every layer of our drawings, defined once: name -> (ACI colour, line weight [1/100 mm], line type, what it holds).
LAYERS = {
    # the typical section
    "GROUND": (34, 35, "Continuous", "ground line beyond the banks and the earth around the excavation"),
    "DITCH-OUTLINE": (7, 50, "Continuous", "finished channel boundary up to the top of the ditch"),
    "LINING": (8, 25, "Continuous", "lining band at its layer thickness"),
    "WATER": (151, 0, "Continuous", "water at the design depth (fill)"),
    "DIMENSIONS": (250, 18, "Continuous", "dimensions: widths, depths, freeboard, side slopes"),
    # both
    "WATER-SURFACE": (150, 35, "Continuous", ("water surface: at the design (normal) depth in a section, with its "
                                            "mark; computed along a run (standard step method) in a profile")),
    "CRITICAL-DEPTH": (1, 35, "DOTTED-SHORT", "critical depth"),
    "TEXT": (7, 18, "Continuous", "title, labels and notes"),
    # the profile of a run
    "INVERT": (7, 50, "Continuous", "invert of the ditch through its grade points"),
    "DITCH-TOP": (34, 25, "Continuous", "top of the ditch (invert plus ditch depth)"),
    "NORMAL-DEPTH": (140, 18, "DASHED-OPEN", "normal depth"),
    "JUMPS": (1, 25, "Continuous", "hydraulic jumps, marked at the station of the toe"),
    "GRADES": (94, 18, "Continuous", "grade points and the grade of each stretch"),
    "STATIONS": (7, 18, "Continuous", "station line, ticks and labels"),
    "ELEVATIONS": (7, 18, "Continuous", "elevation scale"),
    "GRID": (9, 9, "Continuous", "elevation and station grid"),
    "LINING-STRETCHES": (30, 25, "Continuous", "lining stretches as labelled bands"),
}
#: The layers each drawing has (the entries of :data:`LAYERS` it draws on).
SECTION_LAYERS = ("GROUND", "DITCH-OUTLINE", "LINING", "WATER", "WATER-SURFACE", "CRITICAL-DEPTH", "DIMENSIONS",
                  "TEXT")
PROFILE_LAYERS = ("INVERT", "DITCH-TOP", "WATER-SURFACE", "NORMAL-DEPTH", "CRITICAL-DEPTH", "JUMPS", "GRADES",
                  "STATIONS", "ELEVATIONS", "GRID", "LINING-STRETCHES", "TEXT")

#: Line types of our own: name -> (pattern [total length, dash, gap, ...] at line-type scale 1, description).
#: Wide gaps keep normal depth readable as dashes where it runs along the computed water surface, and short dashes
#: draw critical depth's dots in every viewer (a dot of length zero vanishes in some).
LINETYPES = {"DASHED-OPEN": ([2.0, 1.2, -0.8], "Dashed, open __  __  __"),
             "DOTTED-SHORT": ([1.0, 0.25, -0.75], "Dotted . . . .")}

#: The width of an average character of the text style, as a fraction of the text height (DejaVu Sans, measured
#: on renderings of our labels: the height is the capital height, an average letter is a little wider).
CHAR_WIDTH = 0.8


def nice_size(target: float) -> float:
    """The round size (1, 2, 2.5 or 5 times a power of ten) nearest below ``target`` > 0: text heights and grid
    steps."""
    power = 10 ** math.floor(math.log10(target))
    for m in (5, 2.5, 2, 1):
        if m * power <= target * (1 + 1e-12):
            return m * power
    return power


def _insunits(units: UnitSystem) -> int:
    return dxf_units.FT if units.key == "us" else dxf_units.M


def new_document(units: UnitSystem, layers: tuple, text_height: float):
    """A DXF document in ``units`` with the ``layers`` named (from :data:`LAYERS`), our text style and our dimension
    style for text ``text_height`` high: the one set-up of every drawing."""
    doc = ezdxf.new("R2010", setup=["linetypes"])
    doc.units = _insunits(units)
    doc.header["$MEASUREMENT"] = 0 if units.key == "us" else 1
    doc.header["$LUNITS"] = 2            # decimal
    doc.styles.add(TEXT_STYLE, font=FONT)
    for name, (pattern, description) in LINETYPES.items():
        doc.linetypes.add(name, pattern=pattern, description=description)
    for name in layers:
        color, weight, linetype, what = LAYERS[name]
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


def add_text(msp, text, x, y, h, layer="TEXT", align=TextEntityAlignment.LEFT, rotation=0.0):
    t = msp.add_text(dxf_text(text), height=h, rotation=rotation, dxfattribs={"style": TEXT_STYLE, "layer": layer})
    t.set_placement((x, y), align=align)
    return t


def add_polyline(msp, xs, ys, layer, closed=False, **attribs):
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


def add_hatch(msp, points, layer, pattern=None, scale=1.0, color=256):
    hatch = msp.add_hatch(color=color, dxfattribs={"layer": layer})
    hatch.paths.add_polyline_path(points, is_closed=True)
    if pattern:
        hatch.set_pattern_fill(pattern, scale=scale, color=color)
    return hatch


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
