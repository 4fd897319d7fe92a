"""Page layout of the design sheet: one portrait page per channel, Letter or A4.

From the top: a header, the typical section, two columns (inputs and results;
rating curve and hand check), the lining stability, comparison and cautions,
then the design fingerprint and the title block with the signature block and
the approval box (where a digital signature's stamp goes). Text is wrapped in
its box; if a page's text does not fit, the text size steps down to a floor,
and below that the sheet refuses rather than cut anything off.
"""

from __future__ import annotations

import io
import os
from dataclasses import dataclass
from xml.sax.saxutils import escape

from reportlab.lib import colors
from reportlab.lib.pagesizes import A4, letter
from reportlab.lib.styles import ParagraphStyle
from reportlab.pdfbase.pdfmetrics import stringWidth
from reportlab.pdfgen import canvas as rl_canvas
from reportlab.platypus import Paragraph, Table, TableStyle

from .. import __version__
from .fonts import FONT, register
from .rating import rating_drawing
from .section_drawing import section_drawing

PAGES = {"letter": letter, "a4": A4}
MARGIN_LEFT, MARGIN_RIGHT, MARGIN_TOP, MARGIN_BOTTOM = 36.0, 24.0, 24.0, 24.0
TITLE_HEIGHT = 112.0
FINGERPRINT_HEIGHT = 13.0
GAP = 6.0
TEXT_SIZES = (8.0, 7.5, 7.0, 6.6, 6.2)
GREY = colors.Color(0.45, 0.45, 0.45)
RULE = colors.Color(0.55, 0.55, 0.55)
VERDICT_COLOURS = {"STABLE": colors.Color(0.1, 0.5, 0.2), "NOT STABLE": colors.Color(0.75, 0.1, 0.1),
                   "NOT CHECKED": colors.Color(0.75, 0.45, 0.0)}
#: Title-block cell widths as fractions of the frame width (company, project, signatures, approval, sheet).
CELL_FRACTIONS = (0.20, 0.27, 0.27, 0.17, 0.09)


class SheetLayoutError(ValueError):
    """The sheet's text does not fit on its page even at the smallest text size."""


@dataclass(frozen=True)
class Box:
    x: float
    y: float
    w: float
    h: float


def page_size(page: str):
    try:
        return PAGES[page]
    except KeyError:
        raise ValueError(f"page must be one of {', '.join(PAGES)}, got {page!r}") from None


def title_cells(page: str) -> list:
    """The title block's cells (company, project, signatures, approval, sheet) as Boxes [pt]."""
    pw, _ = page_size(page)
    width = pw - MARGIN_LEFT - MARGIN_RIGHT
    x = MARGIN_LEFT
    cells = []
    for frac in CELL_FRACTIONS:
        w = width * frac
        cells.append(Box(x, MARGIN_BOTTOM, w, TITLE_HEIGHT))
        x += w
    return cells


def approval_box(page: str) -> tuple:
    """(x1, y1, x2, y2) [pt] of the digital signature stamp inside the approval box."""
    b = title_cells(page)[3]
    return (b.x + 3, b.y + 3, b.x + b.w - 3, b.y + b.h - 14)


# ------------------------------------------------------------------ text helpers
def _styles(size: float) -> dict:
    base = ParagraphStyle("body", fontName=FONT, fontSize=size, leading=size * 1.22, textColor=colors.black)
    return {
        "body": base,
        "label": ParagraphStyle("label", parent=base, textColor=colors.Color(0.2, 0.2, 0.2)),
        "calc": ParagraphStyle("calc", parent=base, leftIndent=6, firstLineIndent=-6),
        "small": ParagraphStyle("small", parent=base, fontSize=size - 0.8, leading=(size - 0.8) * 1.2),
        "bullet": ParagraphStyle("bullet", parent=base, leftIndent=8, bulletIndent=0, bulletFontName=FONT),
    }


def _p(text: str, style) -> Paragraph:
    return Paragraph(escape(text), style)


def _bold(c, x, y, text, size, stroke=0.25, char_space=0.0):
    """Text drawn emboldened with the one sheet font: filled and outlined with a thin stroke."""
    c.saveState()
    t = c.beginText(x, y)
    t.setFont(FONT, size)
    t.setTextRenderMode(2)
    t.setCharSpace(char_space)
    c.setLineWidth(stroke)
    t.textOut(text)
    t.setTextRenderMode(0)
    t.setCharSpace(0)
    c.drawText(t)
    c.restoreState()


def _heading(c, x, y, w, text):
    """A section heading: spaced capitals, emboldened, with a rule under."""
    _bold(c, x, y - 8, text.upper(), 7.8, stroke=0.2, char_space=0.4)
    c.saveState()
    c.setStrokeColor(RULE)
    c.setLineWidth(0.5)
    c.line(x, y - 11, x + w, y - 11)
    c.restoreState()
    return y - 14


HEADING_H = 14


def _item_table(items, width, st) -> Table:
    label_w = width * 0.42
    rows = [[_p(i.label, st["label"]), _p(i.value, st["body"])] for i in items]
    t = Table(rows, colWidths=[label_w, width - label_w])
    t.setStyle(TableStyle([
        ("VALIGN", (0, 0), (-1, -1), "TOP"), ("FONT", (0, 0), (-1, -1), FONT),
        ("LEFTPADDING", (0, 0), (-1, -1), 1), ("RIGHTPADDING", (0, 0), (-1, -1), 2),
        ("TOPPADDING", (0, 0), (-1, -1), 0.6), ("BOTTOMPADDING", (0, 0), (-1, -1), 0.6),
        ("LINEBELOW", (0, 0), (-1, -1), 0.25, colors.Color(0.85, 0.85, 0.85)),
    ]))
    return t


def _comparison_table(rows, width, st, units) -> Table:
    from .content import pretty_unit

    head = ["Lining", "n", "Depth", "Velocity", f"\u03c4 / \u03c4p ({pretty_unit(units.label('shear'))})", "SF",
            "Verdict", "Cost"]
    data = [[_p(h, st["label"]) for h in head]]
    for r in rows:
        data.append([_p(v, st["body"]) for v in (r.lining, r.n, r.depth, r.velocity, r.shear, r.safety_factor,
                                                   r.verdict, r.cost)])
    fr = (0.22, 0.07, 0.11, 0.11, 0.19, 0.07, 0.12, 0.11)
    t = Table(data, colWidths=[width * f for f in fr])
    t.setStyle(TableStyle([
        ("VALIGN", (0, 0), (-1, -1), "TOP"), ("FONT", (0, 0), (-1, -1), FONT),
        ("LEFTPADDING", (0, 0), (-1, -1), 1), ("RIGHTPADDING", (0, 0), (-1, -1), 2),
        ("TOPPADDING", (0, 0), (-1, -1), 0.6), ("BOTTOMPADDING", (0, 0), (-1, -1), 0.6),
        ("LINEBELOW", (0, 0), (-1, 0), 0.5, RULE),
    ]))
    return t


def _height(flowables, width) -> float:
    return sum(f.wrap(width, 10_000)[1] for f in flowables)


def _draw_flow(c, flowables, x, y, width) -> float:
    """Draw flowables top-down from y; returns the y below them."""
    for f in flowables:
        _, h = f.wrap(width, 10_000)
        f.drawOn(c, x, y - h)
        y -= h
    return y


# ------------------------------------------------------------------ page parts
def _blocks(sheet, size, col_w, full_w):
    """The text blocks at one text size: left column, right-column text, bottom block."""
    st = _styles(size)
    left = [("Inputs", [_item_table(sheet.inputs, col_w, st)]),
            ("Results (uniform flow at the design discharge)", [_item_table(sheet.results, col_w, st)])]
    calc = [_p(line, st["calc"]) for line in sheet.hand_check]
    right_text = [("Hand check (numbers as printed)", calc)]
    bottom = []
    stab = []
    if sheet.stability is not None:
        stab.append(_item_table(sheet.stability, full_w - 96, st))
    else:
        stab.append(_p(sheet.stability_note, st["body"]))
    bottom.append(("Lining stability", stab))
    if sheet.comparison is not None:
        comp = []
        if sheet.comparison:
            comp.append(_comparison_table(sheet.comparison, full_w, st, sheet.units))
        if sheet.comparison_note:
            comp.append(_p(sheet.comparison_note, st["body"]))
        bottom.append(("Lining comparison", comp))
    bottom.append(("Cautions", [Paragraph(escape(t), st["bullet"], bulletText="\u2022") for t in sheet.cautions]))
    return left, right_text, bottom


def _blocks_height(blocks, width):
    return sum(HEADING_H + _height(fl, width) + 3 for _, fl in blocks)


def draw_page(c, sheet, info, page: str, number: int, count: int, logo_note: list) -> None:
    """Draw one channel's sheet on the canvas ``c`` (one page)."""
    pw, ph = page_size(page)
    full_w = pw - MARGIN_LEFT - MARGIN_RIGHT
    x0 = MARGIN_LEFT
    top = ph - MARGIN_TOP
    col_w = (full_w - 2 * GAP) / 2

    # header
    _bold(c, x0, top - 12, "CHANNEL DESIGN SHEET", 12, stroke=0.35)
    c.setFont(FONT, 8)
    c.drawRightString(x0 + full_w, top - 6, _fit(f"{sheet.channel}", FONT, 8, full_w * 0.6))
    c.setFillColor(GREY)
    c.drawRightString(x0 + full_w, top - 15, _fit(sheet.location or "location not given", FONT, 7, full_w * 0.6))
    c.setFillColor(colors.black)
    c.setStrokeColor(colors.black)
    c.setLineWidth(0.8)
    c.line(x0, top - 19, x0 + full_w, top - 19)
    y = top - 22

    # typical section
    y = _heading(c, x0, y, full_w, "Typical section")
    sec, _ = section_drawing(sheet, full_w, 175)
    sec.drawOn(c, x0, y - sec.height)
    y -= sec.height + GAP

    body_bottom = MARGIN_BOTTOM + TITLE_HEIGHT + FINGERPRINT_HEIGHT + GAP
    rating_h = 150.0
    for size in TEXT_SIZES:
        left, right_text, bottom = _blocks(sheet, size, col_w, full_w)
        h_left = _blocks_height(left, col_w)
        h_right = HEADING_H + rating_h + 3 + _blocks_height(right_text, col_w)
        h_bottom = _blocks_height(bottom, full_w)
        if max(h_left, h_right) + GAP + h_bottom <= y - body_bottom:
            break
    else:
        raise SheetLayoutError(f"the sheet for channel {sheet.channel!r} has more text than fits on a "
                               f"{page} page (cautions or comparison too long)")

    # two columns
    yl = y
    for title, fl in left:
        yl = _heading(c, x0, yl, col_w, title)
        yl = _draw_flow(c, fl, x0, yl, col_w) - 3
    xr = x0 + col_w + 2 * GAP
    yr = _heading(c, xr, y, col_w, "Rating curve")
    rd = rating_drawing(sheet, col_w, rating_h)
    rd.drawOn(c, xr, yr - rating_h)
    yr -= rating_h + 3
    for title, fl in right_text:
        yr = _heading(c, xr, yr, col_w, title)
        yr = _draw_flow(c, fl, xr, yr, col_w) - 3
    c.setStrokeColor(RULE)
    c.setLineWidth(0.4)
    c.line(x0 + col_w + GAP, y - 2, x0 + col_w + GAP, min(yl, yr) + 2)
    yb = min(yl, yr) - GAP

    # stability, comparison, cautions
    for title, fl in bottom:
        yb = _heading(c, x0, yb, full_w, title)
        if title == "Lining stability":
            _verdict(c, x0 + full_w - 90, yb + 1, 90, sheet.verdict)
            top_of_text = yb
            yb = _draw_flow(c, fl, x0, yb, full_w - 96) - 3
            if sheet.verdict_reason and sheet.stability is not None:
                yb = _draw_flow(c, [_p(f"Reason: {sheet.verdict_reason}", _styles(size)["body"])], x0, yb,
                                full_w - 96) - 3
            yb = min(yb, top_of_text - 22)
        else:
            yb = _draw_flow(c, fl, x0, yb, full_w) - 3

    _fingerprint_strip(c, sheet, x0, MARGIN_BOTTOM + TITLE_HEIGHT, full_w)
    _title_block(c, sheet, info, page, number, count, logo_note)


def _verdict(c, x, y_top, w, verdict):
    colour = VERDICT_COLOURS.get(verdict, colors.black)
    c.saveState()
    c.setStrokeColor(colour)
    c.setFillColor(colour)
    c.setLineWidth(1.2)
    c.rect(x, y_top - 18, w, 17, stroke=1, fill=0)
    width = stringWidth(verdict, FONT, 8.5)
    _bold(c, x + (w - width) / 2, y_top - 12.5, verdict, 8.5, stroke=0.3)
    c.restoreState()


def _fit(text, font, size, width) -> str:
    """``text`` shortened with an ellipsis to fit ``width`` [pt]."""
    if stringWidth(text, font, size) <= width:
        return text
    while text and stringWidth(text + "\u2026", font, size) > width:
        text = text[:-1]
    return text + "\u2026"


def _fingerprint_strip(c, sheet, x, y, w):
    c.setStrokeColor(colors.black)
    c.setLineWidth(0.8)
    c.rect(x, y, w, FINGERPRINT_HEIGHT, stroke=1, fill=0)
    c.setFont(FONT, 6.5)
    c.drawString(x + 3, y + 4, f"Design fingerprint SHA-256: {sheet.fingerprint}")
    c.setFillColor(GREY)
    c.drawRightString(x + w - 3, y + 4, f"inputs + Ditchwright {sheet.version}")
    c.setFillColor(colors.black)


def _caption(c, box, text):
    c.setFont(FONT, 5.2)
    c.setFillColor(GREY)
    c.drawString(box.x + 2.5, box.y + box.h - 7, text.upper())
    c.setFillColor(colors.black)


def _cell_lines(c, box, rows, top_offset=9.0, size=7.0):
    """(caption, value) pairs stacked down the cell, each value wrapped to the cell width."""
    st = ParagraphStyle("cell", fontName=FONT, fontSize=size, leading=size * 1.18)
    y = box.y + box.h - top_offset
    for caption, value in rows:
        c.setFont(FONT, 5.2)
        c.setFillColor(GREY)
        c.drawString(box.x + 2.5, y - 5, caption.upper())
        c.setFillColor(colors.black)
        p = Paragraph(escape(value) if value else "&nbsp;", st)
        _, h = p.wrap(box.w - 5, 100)
        p.drawOn(c, box.x + 2.5, y - 6 - h)
        y -= 6 + h + 2.5
    return y


def _title_block(c, sheet, info, page, number, count, logo_note):
    company, proj, sign, approval, sheet_cell = title_cells(page)
    c.setStrokeColor(colors.black)
    c.setLineWidth(0.8)
    for b in (company, proj, sign, approval, sheet_cell):
        c.rect(b.x, b.y, b.w, b.h, stroke=1, fill=0)

    # company and logo slot (filled by the user; empty otherwise)
    _caption(c, company, "Company")
    slot = Box(company.x + 4, company.y + company.h - 12 - 48, company.w - 8, 48)
    _logo(c, info.logo, slot, logo_note)
    _cell_lines(c, Box(company.x, company.y, company.w, company.h - 64), [("", info.company)], top_offset=0)

    # project, channel, location
    _cell_lines(c, proj, [("Project", sheet.project), ("Project no.", info.project_number),
                          ("Channel", sheet.channel), ("Location / stations", sheet.location)], top_offset=3)

    # signature block for wet signatures
    rows = (("Designed", info.designer, info.date_designed), ("Checked", info.checker, info.date_checked),
            ("Approved", info.approver, info.date_approved))
    row_h = sign.h / 3
    for i, (role, name, date) in enumerate(rows):
        yt = sign.y + sign.h - i * row_h
        if i:
            c.setLineWidth(0.4)
            c.line(sign.x, yt, sign.x + sign.w, yt)
        c.setFont(FONT, 5.2)
        c.setFillColor(GREY)
        c.drawString(sign.x + 2.5, yt - 7, f"{role.upper()} BY")
        c.drawString(sign.x + sign.w * 0.70, yt - 7, "DATE")
        c.drawString(sign.x + 2.5, yt - row_h + 3, "SIGNATURE")
        c.setFillColor(colors.black)
        name_w = sign.w * 0.70 - 6
        size = 7 if stringWidth(name or "", FONT, 7) <= name_w else 6.2
        c.setFont(FONT, size)
        c.drawString(sign.x + 2.5, yt - 15, _fit(name or "", FONT, size, name_w))
        c.setFont(FONT, 7)
        c.drawString(sign.x + sign.w * 0.70, yt - 15, _fit(date or "", FONT, 7, sign.w * 0.29))
        c.setLineWidth(0.3)
        c.setStrokeColor(GREY)
        c.line(sign.x + 30, yt - row_h + 3, sign.x + sign.w - 4, yt - row_h + 3)
        c.setStrokeColor(colors.black)

    # approval box: the digital signature's stamp is placed here when the sheet is signed
    _caption(c, approval, "Approval / digital signature")
    c.setFont(FONT, 5.2)
    c.setFillColor(GREY)
    if number > 1:
        c.drawCentredString(approval.x + approval.w / 2, approval.y + approval.h / 2, "see sheet 1")
    c.setFillColor(colors.black)

    # revision and sheet number
    _cell_lines(c, sheet_cell, [("Revision", info.revision or "\u2014"), ("Sheet", f"{number} of {count}"),
                                ("Units", sheet.units.key.upper())], top_offset=3, size=8)


def _logo(c, path: str, slot: Box, notes: list) -> None:
    """The user's logo (PNG, JPEG or SVG) fitted in the slot; nothing when none is set."""
    if not path:
        return
    if not os.path.isfile(path):
        notes.append(f"logo file not found: {path}")
        c.setFont(FONT, 5.2)
        c.setFillColor(GREY)
        c.drawString(slot.x, slot.y + slot.h / 2, "logo file not found")
        c.setFillColor(colors.black)
        return
    try:
        if path.lower().endswith(".svg"):
            from svglib.svglib import svg2rlg

            d = svg2rlg(path)
            k = min(slot.w / d.width, slot.h / d.height)
            d.scale(k, k)
            d.width, d.height = d.width * k, d.height * k
            d.drawOn(c, slot.x, slot.y + (slot.h - d.height) / 2)
        else:
            c.drawImage(path, slot.x, slot.y, slot.w, slot.h, preserveAspectRatio=True, anchor="w", mask="auto")
    except Exception as exc:  # an unreadable image must not stop the sheet; it is reported
        notes.append(f"logo {path} could not be read: {exc}")


def render(project, sheets, page: str = "letter") -> tuple[bytes, list]:
    """PDF bytes with one page per ChannelSheet, and notes (e.g. a missing logo) for the user."""
    register()
    size = page_size(page)
    buf = io.BytesIO()
    c = rl_canvas.Canvas(buf, pagesize=size, initialFontName=FONT, initialFontSize=8, pageCompression=1,
                         invariant=1)
    c.setTitle(f"Channel design sheets: {project.name}")
    c.setAuthor(project.sheet.designer or "")
    c.setCreator(f"Ditchwright {__version__}")
    c.setSubject("; ".join(f"{s.channel}: {s.fingerprint}" for s in sheets))
    c.setKeywords(["ditchwright-fingerprint=" + s.fingerprint for s in sheets])
    notes: list = []
    for i, sheet in enumerate(sheets, start=1):
        draw_page(c, sheet, project.sheet, page, i, len(sheets), notes)
        c.showPage()
    c.save()
    return buf.getvalue(), sorted(set(notes))
