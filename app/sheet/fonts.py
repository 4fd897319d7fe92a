"""The one font of the design sheet: DejaVu Sans, as shipped inside matplotlib.

The sheet embeds a single TrueType font and uses it for every string, the
rating-curve plot included, so that the symbols an engineer writes (delta,
theta, tau, gamma, >=, superscript 2 and 3, square root) print and can be
copied out of the PDF. The font is registered twice: with reportlab, which
embeds a subset of it, and with svglib, which otherwise maps the plot's
``DejaVu Sans`` to Helvetica (not embedded, and without those symbols).
"""

from __future__ import annotations

import os

FONT = "DejaVuSans"          # reportlab's name for it
SVG_FAMILY = "DejaVu Sans"   # the family matplotlib writes into its SVG

_registered = False


def font_path() -> str:
    """Path of DejaVuSans.ttf in matplotlib's data folder."""
    import matplotlib

    path = os.path.join(matplotlib.get_data_path(), "fonts", "ttf", "DejaVuSans.ttf")
    if not os.path.isfile(path):  # pragma: no cover - a broken matplotlib install
        raise FileNotFoundError(f"the sheet font is missing: {path}")
    return path


def register() -> str:
    """Register the font with reportlab and svglib (once); returns its reportlab name."""
    global _registered
    if _registered:
        return FONT
    from reportlab.pdfbase import pdfmetrics
    from reportlab.pdfbase.ttfonts import TTFont
    from svglib import fonts as svgfonts

    path = font_path()
    pdfmetrics.registerFont(TTFont(FONT, path))
    # Every weight and style the plot might ask for maps to the one embedded face
    # (svglib registers the file again under the same reportlab name).
    for weight in ("normal", "bold"):
        for style in ("normal", "italic"):
            name, ok = svgfonts.register_font(SVG_FAMILY, path, weight=weight, style=style, rlgFontName=FONT)
            if not ok:  # pragma: no cover - svglib could not read the file
                raise RuntimeError(f"svglib could not register the sheet font {path}")
    # reportlab's graphics renderer starts every drawing in its default font
    # (Helvetica), which puts a non-embedded font into the PDF even when no
    # string uses it; start drawings in the sheet font instead.
    from reportlab.graphics import shapes

    shapes.STATE_DEFAULTS["fontName"] = FONT
    _registered = True
    return FONT
