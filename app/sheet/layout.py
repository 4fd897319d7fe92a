"""Page layout of the design sheet: one portrait page per channel, Letter or A4.

From the top: a header, the typical section, two columns (inputs and results;
rating curve and hand check), the lining stability (shear checks beside the
verdict, the reason, then the lining and the freeboard side by side), the
lining comparison and the cautions, then the design fingerprint and the title
block with the signature block and the approval box (where a digital
signature's stamp goes). Text is wrapped in its box; if a page's text does
not fit, the text size steps down to a floor; then a long comparison keeps
the rows that fit and names the others in a note; below that the sheet
refuses rather than cut anything off.
"""

from __future__ import annotations

import os
from dataclasses import dataclass
from xml.sax.saxutils import escape

from reportlab.lib import colors
from reportlab.lib.enums import TA_RIGHT
from reportlab.lib.pagesizes import A4, letter
from reportlab.lib.styles import ParagraphStyle
from reportlab.pdfbase.pdfmetrics import stringWidth
from reportlab.platypus import Paragraph, Table, TableStyle

from hydraulics.provenance import NOT_VERIFIED_TITLE

from ..verdicts import Verdict
from .fonts import FONT
from .rating import rating_drawing
from .section_drawing import lining_caption, section_drawing

PAGES = {"letter": letter, "a4": A4}
MARGIN_LEFT, MARGIN_RIGHT, MARGIN_TOP, MARGIN_BOTTOM = 36.0, 24.0, 20.0, 20.0
TITLE_HEIGHT = 86.0
FINGERPRINT_HEIGHT = 13.0
GAP = 6.0
TEXT_SIZES = (8.0, 7.5, 7.0, 6.6, 6.2)
RATING_HEIGHTS = (150.0, 130.0, 115.0, 100.0, 90.0)  # [pt], tallest first
GREY = colors.Color(0.45, 0.45, 0.45)
RULE = colors.Color(0.55, 0.55, 0.55)
_GREEN, _RED, _BLUE, _AMBER, _GREY = (colors.Color(0.1, 0.5, 0.2), colors.Color(0.75, 0.1, 0.1),
                                     colors.Color(0.15, 0.3, 0.55), colors.Color(0.75, 0.45, 0.0), GREY)
VERDICT_COLOURS = {Verdict.STABLE: _GREEN, Verdict.UNSTABLE: _RED, Verdict.NON_ERODIBLE: _BLUE,
                   Verdict.TOO_SHALLOW: _RED, Verdict.HYDRAULICS_ONLY: _AMBER, Verdict.NOT_CHECKED: _AMBER,
                   Verdict.NO_SOLUTION: _GREY, Verdict.INVALID: _GREY}
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
    small = size - 0.8
    return {
        "body": base,
        "label": ParagraphStyle("label", parent=base, textColor=colors.Color(0.2, 0.2, 0.2)),
        "calc": ParagraphStyle("calc", parent=base, leftIndent=6, firstLineIndent=-6),
        "small": ParagraphStyle("small", parent=base, fontSize=small, leading=small * 1.2),
        "num": ParagraphStyle("num", parent=base, fontSize=small, leading=small * 1.2, alignment=TA_RIGHT),
        "cell": ParagraphStyle("cell", parent=base, fontSize=small, leading=small * 1.2),
        "head": ParagraphStyle("head", parent=base, fontSize=small, leading=small * 1.15,
                               textColor=colors.Color(0.2, 0.2, 0.2)),
        "headnum": ParagraphStyle("headnum", parent=base, fontSize=small, leading=small * 1.15, alignment=TA_RIGHT,
                                  textColor=colors.Color(0.2, 0.2, 0.2)),
        "bullet": ParagraphStyle("bullet", parent=base, fontSize=small, leading=small * 1.2, leftIndent=8,
                                 bulletIndent=0, bulletFontName=FONT, bulletFontSize=small),
        "reason": ParagraphStyle("reason", parent=base, leftIndent=0),
    }


def _p(text: str, style) -> Paragraph:
    return Paragraph(escape(text), style)


def _lines(parts, style) -> Paragraph:
    """A paragraph of several lines (a table heading with its unit under it)."""
    return Paragraph("<br/>".join(escape(p) for p in parts if p), style)


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
    _bold(c, x, y - 7.5, text.upper(), 7.4, stroke=0.2, char_space=0.4)
    c.saveState()
    c.setStrokeColor(RULE)
    c.setLineWidth(0.5)
    c.line(x, y - 10, x + w, y - 10)
    c.restoreState()
    return y - HEADING_H


HEADING_H = 12
_GRID = colors.Color(0.85, 0.85, 0.85)


def _table_style(header: bool, numeric_columns=()) -> TableStyle:
    cmds = [("VALIGN", (0, 0), (-1, -1), "TOP"), ("FONT", (0, 0), (-1, -1), FONT),
            ("LEFTPADDING", (0, 0), (-1, -1), 1.5), ("RIGHTPADDING", (0, 0), (-1, -1), 2),
            ("TOPPADDING", (0, 0), (-1, -1), 0.6), ("BOTTOMPADDING", (0, 0), (-1, -1), 0.8),
            ("LINEBELOW", (0, 0), (-1, -1), 0.25, _GRID)]
    if header:
        cmds += [("LINEBELOW", (0, 0), (-1, 0), 0.5, RULE), ("VALIGN", (0, 0), (-1, 0), "BOTTOM")]
    return TableStyle(cmds)


def _item_table(items, width, st, label_fraction=0.42) -> Table:
    """Label and value, one item a row; the label column as wide as the longest label, up to the fraction."""
    longest = max((stringWidth(i.label, FONT, st["label"].fontSize) for i in items), default=0.0)
    label_w = min(width * label_fraction, longest + 6)
    rows = [[_p(i.label, st["label"]), _p(i.value, st["body"])] for i in items]
    t = Table(rows, colWidths=[label_w, width - label_w])
    t.setStyle(_table_style(False))
    return t


def _pair_table(items, width, st) -> Table:
    """Items two to a row (label, value, label, value): short results."""
    rows = []
    for i in range(0, len(items), 2):
        row = []
        for it in items[i:i + 2]:
            row += [_p(it.label, st["label"]), _p(it.value, st["body"])]
        rows.append(row + [""] * (4 - len(row)))
    size = st["label"].fontSize
    widths = []
    for col in (0, 1):  # each label column as wide as its longest label, the values share the rest
        widths.append(max(stringWidth(it.label, FONT, size) for it in items[col::2]) + 4)
    # the values share the rest: each column what its longest value needs, then the spare room halved (a value
    # such as "0.0130 (typed)" keeps to one line), or halves when the room is short
    need = [max(stringWidth(it.value, FONT, st["body"].fontSize) for it in items[col::2]) + 6 for col in (0, 1)]
    spare = width - sum(widths) - sum(need)
    values = [n + spare / 2 for n in need] if spare >= 0 else [(width - sum(widths)) / 2] * 2
    t = Table(rows, colWidths=[widths[0], values[0], widths[1], values[1]])
    t.setStyle(_table_style(False))
    return t


def _check_table(rows, width, st, units) -> Table:
    """The shear checks: one row per place checked (bed, side slopes, bend)."""
    from .content import pretty_unit

    shear = pretty_unit(units.label("shear"))
    head = [_lines(["Location"], st["head"]), _lines(["Design shear \u03c4", shear], st["headnum"]),
            _lines(["Permissible \u03c4p", shear], st["headnum"]), _lines(["SF", "achieved"], st["headnum"]),
            _lines(["SF", "required"], st["headnum"]), _lines(["Result", "(SF \u2265 required)"], st["head"]),
            _lines(["Design shear from"], st["head"])]
    data = [head]
    for r in rows:
        data.append([_p(r.location, st["cell"]), _p(r.design, st["num"]), _p(r.permissible, st["num"]),
                     _p(r.safety_factor, st["num"]), _p(r.required, st["num"]), _p(r.result, st["cell"]),
                     _p(r.basis, st["cell"])])
    fr = (0.15, 0.13, 0.13, 0.08, 0.08, 0.15, 0.28)
    t = Table(data, colWidths=[width * f for f in fr], repeatRows=1)
    t.setStyle(_table_style(True))
    return t


def _comparison_table(rows, width, st, units, priced: bool) -> Table:
    from .content import pretty_unit

    u = lambda q: pretty_unit(units.label(q))  # noqa: E731
    head = [("Lining", ""), ("n", ""), ("Depth", u("length")), ("V", u("velocity")), ("Fr", ""),
            ("\u03c4", u("shear")), ("\u03c4p", u("shear")), ("SF / req.", ""), ("Verdict (governs)", ""),
            ("Lined", u("length")), ("Layer", u("volume_per_length"))]
    fr = [0.21, 0.055, 0.06, 0.055, 0.045, 0.06, 0.085, 0.075, 0.16, 0.065, 0.065]
    if priced:
        head.append(("Cost", u("cost_per_length")))
        fr.append(0.065)
    else:
        fr[0] += 0.035
        fr[8] += 0.03
    text_cols = {0, 8}
    data = [[_lines(h, st["head"] if i in text_cols else st["headnum"]) for i, h in enumerate(head)]]
    for r in rows:
        values = [r.lining, r.n, r.depth, r.velocity, r.froude, r.design, r.permissible, r.safety_factor, r.verdict,
                  r.lined_width, r.layer_volume] + ([r.cost] if priced else [])
        data.append([_p(v, st["cell"] if i in text_cols else st["num"]) for i, v in enumerate(values)])
    t = Table(data, colWidths=[width * f for f in fr], repeatRows=1)
    t.setStyle(_table_style(True))
    return t


def _wrapped(f, width) -> float:
    """The height of flowable ``f`` wrapped to ``width`` [pt]. A flowable keeps the state of its last wrap for
    drawing, so it is wrapped again only at another width (measuring, splitting into columns and drawing would
    otherwise wrap every paragraph three times)."""
    last = getattr(f, "_ditchwright_wrap", None)
    if last is None or last[0] != width:
        last = (width, f.wrap(width, 10_000)[1])
        f._ditchwright_wrap = last
    return last[1]


def _height(flowables, width) -> float:
    return sum(_wrapped(f, width) for f in flowables)


def _draw_flow(c, flowables, x, y, width) -> float:
    """Draw flowables top-down from y; returns the y below them."""
    for f in flowables:
        h = _wrapped(f, width)
        f.drawOn(c, x, y - h)
        y -= h
    return y


def _split_even(flowables, width):
    """Two lists of flowables of about equal height (in order), for two columns."""
    heights = [_wrapped(f, width) for f in flowables]
    total, run = sum(heights), 0.0
    for i, h in enumerate(heights):
        if run + h / 2 > total / 2:
            return flowables[:i], flowables[i:]
        run += h
    return flowables, []


# ------------------------------------------------------------------ page parts
VERDICT_W = 90.0


@dataclass
class _Blocks:
    """The text of one page at one text size, built and measured."""

    left: list          # [(title, flowables)] of the left column
    right_text: list    # [(title, flowables)] below the rating curve
    checks: list        # flowables beside the verdict box
    reason: list
    lining: list        # flowables, full width under the checks
    comparison: list    # flowables, full width ([] without a comparison)
    cautions: tuple     # (left flowables, right flowables)
    height_left: float          # the left column
    height_right_text: float    # the right column without the rating curve
    height_bottom: float

    def height(self, rating_h: float) -> float:
        """The page's text with a rating curve ``rating_h`` tall [pt] (the text does not depend on it)."""
        return max(self.height_left, HEADING_H + rating_h + 3 + self.height_right_text) + GAP + self.height_bottom


def _build(sheet, size, col_w, full_w, comparison_rows):
    st = _styles(size)
    left = [("Inputs", [_item_table(sheet.inputs, col_w, st, 0.34)]),
            ("Results (uniform flow at the design discharge)", [_pair_table(sheet.results, col_w, st)]),
            ("Freeboard and ditch depth", [_item_table(sheet.depth_items, col_w, st, 0.34)])]
    right_text = [("Hand check (4 to 5 figures, for a calculator)", [_p(t, st["calc"]) for t in sheet.hand_check])]
    beside = full_w - VERDICT_W - GAP
    checks = [_check_table(sheet.checks, beside, st, sheet.units)] if sheet.checks else []
    reason = [_p(f"Reason: {sheet.verdict_reason}", st["reason"])]
    lining = [_item_table(sheet.lining_items, full_w, st, 0.2)] if sheet.lining_items else []
    comparison = []
    if sheet.comparison is not None:
        shown = sheet.comparison[:comparison_rows]
        if shown:
            comparison.append(_comparison_table(shown, full_w, st, sheet.units, sheet.comparison_priced))
        notes = list(sheet.comparison_notes) if shown else []   # the table's own notes go with it
        left_out = sheet.comparison[comparison_rows:]
        if left_out:
            many = "s" if len(left_out) > 1 else ""
            what = (f"{len(left_out)} more lining{many} not shown" if shown
                    else f"The table is left out, its {len(left_out)} lining{many} named here")
            named = (r.lining[2:] + " (the channel's lining)" if r.lining.startswith("* ") else r.lining
                     for r in left_out)   # the star of the table's first column, in words
            notes.insert(0, f"{what} for lack of room: " + "; ".join(f"{name}: {r.verdict}"
                                                                     for name, r in zip(named, left_out))
                         + ". Run ditchwright compare for the full table.")
        comparison += [_p(n, st["small"]) for n in notes]
    bullets = [Paragraph(escape(t), st["bullet"], bulletText="\u2022") for t in sheet.cautions]
    bullets += [_p(t, st["bullet"]) for t in sheet.sources]
    if sheet.not_verified:
        bullets.append(Paragraph(escape(sheet.not_verified).replace(NOT_VERIFIED_TITLE, f"<b>{NOT_VERIFIED_TITLE}</b>", 1),
                                 st["bullet"]))
    cautions = _split_even(bullets, col_w)

    h_left = sum(HEADING_H + _height(fl, col_w) + 3 for _, fl in left)
    h_right_text = sum(HEADING_H + _height(fl, col_w) + 3 for _, fl in right_text)
    h_stab = (HEADING_H + max(_height(checks, beside), 20) + 2 + _height(reason, beside) + 3
              + _height(lining, full_w) + 3)
    h_comp = HEADING_H + _height(comparison, full_w) + 3 if comparison else 0.0
    h_caut = HEADING_H + max(_height(cautions[0], col_w), _height(cautions[1], col_w)) + 3
    return _Blocks(left, right_text, checks, reason, lining, comparison, cautions,
                   h_left, h_right_text, h_stab + h_comp + h_caut)


def _fit_blocks(sheet, col_w, full_w, room, page):
    """The largest text size (and rating-curve height) at which the page's text fits ``room`` [pt].

    When even the smallest size does not fit, the comparison keeps as many rows
    as fit and names the others in a note (with its verdict: the table may go
    altogether); where even that does not fit, the sheet refuses.
    """
    n_rows = len(sheet.comparison) if sheet.comparison is not None else 0
    for rows in range(n_rows, -1, -1):
        for size in TEXT_SIZES:
            b = _build(sheet, size, col_w, full_w, max(rows, 0))   # built and measured once per size
            for rating_h in RATING_HEIGHTS:
                if b.height(rating_h) <= room:
                    return b, size, rating_h
    raise SheetLayoutError(f"the sheet for channel {sheet.channel!r} has more text than fits on a "
                           f"{page} page (cautions or comparison too long)")


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
    c.setFont(FONT, 6.5)
    c.setFillColor(GREY)
    heading_w = stringWidth("TYPICAL SECTION", FONT, 7.4) + 16 * 0.4 + 12
    c.drawRightString(x0 + full_w, y + 4.5, _fit(lining_caption(sheet), FONT, 6.5, full_w - heading_w))
    c.setFillColor(colors.black)
    sec, _ = section_drawing(sheet, full_w, 165)
    sec.drawOn(c, x0, y - sec.height)
    y -= sec.height + GAP

    body_bottom = MARGIN_BOTTOM + TITLE_HEIGHT + FINGERPRINT_HEIGHT + GAP
    b, size, rating_h = _fit_blocks(sheet, col_w, full_w, y - body_bottom, page)

    # two columns
    yl = y
    for title, fl in b.left:
        yl = _heading(c, x0, yl, col_w, title)
        yl = _draw_flow(c, fl, x0, yl, col_w) - 3
    xr = x0 + col_w + 2 * GAP
    yr = _heading(c, xr, y, col_w, "Rating curve")
    rd = rating_drawing(sheet, col_w, rating_h)
    rd.drawOn(c, xr, yr - rating_h)
    yr -= rating_h + 3
    for title, fl in b.right_text:
        yr = _heading(c, xr, yr, col_w, title)
        yr = _draw_flow(c, fl, xr, yr, col_w) - 3
    c.setStrokeColor(RULE)
    c.setLineWidth(0.4)
    c.line(x0 + col_w + GAP, y - 2, x0 + col_w + GAP, min(yl, yr) + 2)
    yb = min(yl, yr) - GAP

    # lining stability: the checks beside the verdict, the reason, then the lining's data
    beside = full_w - VERDICT_W - GAP
    yb = _heading(c, x0, yb, full_w, "Lining stability")
    _verdict(c, x0 + full_w - VERDICT_W, yb + 1, VERDICT_W, sheet.verdict)
    y_text = _draw_flow(c, b.checks, x0, yb, beside)
    yb = min(y_text, yb - 20) - 2
    yb = _draw_flow(c, b.reason, x0, yb, beside) - 3
    yb = _draw_flow(c, b.lining, x0, yb, full_w) - 3

    if b.comparison:
        yb = _heading(c, x0, yb, full_w, "Lining comparison")
        yb = _draw_flow(c, b.comparison, x0, yb, full_w) - 3

    yb = _heading(c, x0, yb, full_w, "Cautions, notes and sources")
    _draw_flow(c, b.cautions[0], x0, yb, col_w)
    _draw_flow(c, b.cautions[1], xr, yb, col_w)

    _fingerprint_strip(c, sheet, x0, MARGIN_BOTTOM + TITLE_HEIGHT, full_w)
    _title_block(c, sheet, info, page, number, count, logo_note)


def _verdict(c, x, y_top, w, verdict: Verdict):
    colour = VERDICT_COLOURS[verdict]
    verdict = verdict.heading
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
    label = f"Design fingerprint SHA-256: {sheet.fingerprint}"
    what = f"{getattr(sheet, 'fingerprint_what', 'of the inputs, linings')} ({sheet.catalogue}), Ditchwright {sheet.version}"
    size = 6.5
    while size > 5.4 and stringWidth(label, FONT, size) + stringWidth(what, FONT, size) + 12 > w:
        size -= 0.2
    c.setFont(FONT, size)
    c.drawString(x + 3, y + 4, label)
    c.setFillColor(GREY)
    used = stringWidth(label, FONT, size) + 12
    c.drawRightString(x + w - 3, y + 4, _fit(what, FONT, size, w - used))
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
                          (getattr(sheet, "subject_caption", "Channel"), subject_of(sheet)),
                          ("Location / stations", sheet.location)], top_offset=3)

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


def subject_of(sheet) -> str:
    """What a sheet is about: the channel's name, or the run's (a RunSheet names its subject)."""
    return getattr(sheet, "subject", None) or sheet.channel
