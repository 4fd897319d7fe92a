"""Pages of a ditch run's design sheet: the profile to scale, then the tables, over as many pages as they need.

Every page carries the channel sheet's header rule, design fingerprint strip and title block (with the
signature block and the approval box), so a run's pages sit in the same plan set as the channels' sheets.
The first page holds the profile (:mod:`app.sheet.profile_drawing`) with its scale statement; then, flowing
from page to page: the lining schedule with quantities, cost and total; the run's facts, sections and
candidate linings; the cautions; the sub-areas and point inflows; the rainfall relation with its source; the
station table (its heading row repeated on each page it continues on, every number's unit in the heading,
trouble spots in words and red); the warnings, method notes and the values not verified against their
publication. A heading is never left alone at the foot of a page.
"""

from __future__ import annotations

from dataclasses import dataclass
from xml.sax.saxutils import escape

from reportlab.lib import colors
from reportlab.lib.enums import TA_RIGHT
from reportlab.lib.styles import ParagraphStyle
from reportlab.pdfbase.pdfmetrics import stringWidth
from reportlab.platypus import Flowable, Paragraph, Table, TableStyle

from hydraulics.provenance import NOT_VERIFIED_TITLE

from .content import pretty_unit
from .fonts import FONT
from .layout import (FINGERPRINT_HEIGHT, GAP, GREY, MARGIN_BOTTOM, MARGIN_LEFT, MARGIN_RIGHT, MARGIN_TOP, RULE,
                     TITLE_HEIGHT, _bold, _fingerprint_strip, _fit, _heading, _title_block, page_size)
from .profile_drawing import profile_drawing
from .run_content import STATION_COLUMNS, STATION_KEY, RunSheet

SIZE = 7.0                 # body text [pt]
TABLE_SIZE = 6.4           # schedule, sub-area and rainfall tables
STATION_SIZE = 5.3         # the station table
STATUS_MIN = 34.0          # the least width of its status column [pt] (longer words wrap)
PROFILE_HEIGHT = 290.0     # the most the profile may take on the first page [pt]
HEADER_H = 22.0
KEEP_WITH_HEADING = 36.0   # a heading needs this much of what follows on its page [pt]
_RED = colors.Color(0.75, 0.1, 0.1)
_RED_FILL = colors.Color(0.99, 0.90, 0.90)
_GRID = colors.Color(0.85, 0.85, 0.85)
_TOTAL_FILL = colors.Color(0.93, 0.93, 0.93)


def _styles() -> dict:
    base = ParagraphStyle("rbody", fontName=FONT, fontSize=SIZE, leading=SIZE * 1.22)
    t = TABLE_SIZE
    s = STATION_SIZE
    head = colors.Color(0.2, 0.2, 0.2)
    return {
        "body": base,
        "small": ParagraphStyle("rsmall", parent=base, fontSize=t, leading=t * 1.2),
        "label": ParagraphStyle("rlabel", parent=base, fontSize=t, leading=t * 1.2, textColor=head),
        "cell": ParagraphStyle("rcell", parent=base, fontSize=t, leading=t * 1.18),
        "num": ParagraphStyle("rnum", parent=base, fontSize=t, leading=t * 1.18, alignment=TA_RIGHT),
        "head": ParagraphStyle("rhead", parent=base, fontSize=t, leading=t * 1.15, textColor=head),
        "headnum": ParagraphStyle("rheadnum", parent=base, fontSize=t, leading=t * 1.15, textColor=head,
                                  alignment=TA_RIGHT),
        "scell": ParagraphStyle("rscell", parent=base, fontSize=s, leading=s * 1.15),
        "snum": ParagraphStyle("rsnum", parent=base, fontSize=s, leading=s * 1.15, alignment=TA_RIGHT),
        "shead": ParagraphStyle("rshead", parent=base, fontSize=s, leading=s * 1.12, textColor=head),
        "sheadnum": ParagraphStyle("rsheadnum", parent=base, fontSize=s, leading=s * 1.12, textColor=head,
                                   alignment=TA_RIGHT),
        "sred": ParagraphStyle("rsred", parent=base, fontSize=s, leading=s * 1.15, textColor=_RED),
        "bullet": ParagraphStyle("rbullet", parent=base, fontSize=t, leading=t * 1.22, leftIndent=8,
                                 bulletIndent=0, bulletFontName=FONT, bulletFontSize=t),
    }


def _p(text: str, style) -> Paragraph:
    return Paragraph(escape(text), style)


def _lines(parts, style) -> Paragraph:
    return Paragraph("<br/>".join(escape(p) for p in parts if p), style)


class Heading(Flowable):
    """A section heading as on the channel sheet: spaced capitals with a rule under, and a note at the right."""

    def __init__(self, text: str, note: str = ""):
        super().__init__()
        self.text, self.note = text, note

    def wrap(self, aw, ah):
        self.width, self.height = aw, 14.0
        return aw, 14.0

    def draw(self):
        c = self.canv
        y = self.height
        _heading(c, 0, y - 1, self.width, self.text)
        if self.note:
            c.saveState()
            c.setFont(FONT, 6.5)
            used = stringWidth(self.text.upper(), FONT, 7.4) + 0.4 * len(self.text) + 14
            c.drawRightString(self.width, y - 8, _fit(self.note, FONT, 6.5, self.width - used))
            c.restoreState()


class Gap(Flowable):
    def __init__(self, height: float):
        super().__init__()
        self.height = height

    def wrap(self, aw, ah):
        return aw, self.height

    def draw(self):
        pass


def _table_style(header_rows: int = 1, extra=()) -> TableStyle:
    cmds = [("VALIGN", (0, 0), (-1, -1), "TOP"), ("FONT", (0, 0), (-1, -1), FONT),
            ("LEFTPADDING", (0, 0), (-1, -1), 1.5), ("RIGHTPADDING", (0, 0), (-1, -1), 2),
            ("TOPPADDING", (0, 0), (-1, -1), 0.6), ("BOTTOMPADDING", (0, 0), (-1, -1), 0.8),
            ("LINEBELOW", (0, 0), (-1, -1), 0.25, _GRID)]
    if header_rows:
        cmds += [("LINEBELOW", (0, header_rows - 1), (-1, header_rows - 1), 0.5, RULE),
                 ("VALIGN", (0, 0), (-1, header_rows - 1), "BOTTOM")]
    return TableStyle(cmds + list(extra))


def _widths(fractions, width):
    total = sum(fractions)
    return [width * f / total for f in fractions]


# ------------------------------------------------------------------ the blocks
def _schedule(sheet: RunSheet, width, st) -> list:
    u = sheet.units
    head = [_lines(["No."], st["head"]), _lines(["From"], st["head"]), _lines(["To"], st["head"]),
            _lines(["Lining"], st["head"]), _lines(["Length", pretty_unit(u.label("length"))], st["headnum"]),
            _lines(["Quantities (item, amount, unit)"], st["head"]), _lines(["Cost", u.label("cost")], st["headnum"])]
    data = [head]
    for s in sheet.schedule:
        qty = "<br/>".join(f"{escape(item)}: {escape(amount)} {escape(pretty_unit(unit))}"
                           for item, amount, unit in s["quantities"])
        data.append([_p(s["number"], st["cell"]), _p(s["from_station"], st["cell"]), _p(s["to_station"], st["cell"]),
                     _p(s["lining"], st["cell"]), _p(s["length"], st["num"]), Paragraph(qty, st["cell"]),
                     _p(s["cost"], st["num"])])
    data.append(["", "", "", _p("Total cost of the run", st["cell"]), "", "", _p(sheet.total_cost, st["num"])])
    n = len(data)
    t = Table(data, colWidths=_widths((0.04, 0.08, 0.08, 0.25, 0.07, 0.38, 0.10), width), repeatRows=1)
    t.setStyle(_table_style(1, [("BACKGROUND", (0, n - 1), (-1, n - 1), _TOTAL_FILL),
                                ("LINEABOVE", (0, n - 1), (-1, n - 1), 0.6, RULE)]))
    return [Heading("Lining schedule", f"the cheapest buildable schedule of the run's candidates; stretches at "
                                       f"least {dict(sheet.summary).get('Shortest stretch', '')} long"), t,
            _p("Stretch numbers match the bands under the profile. Quantities by stretch as the run command gives "
               "them; costs from the unit costs listed below.", st["small"])]


def _item_rows(items, width, st, label_w=80.0) -> Table:
    rows = [[_p(label, st["label"]), _p(value, st["cell"])] for label, value in items]
    t = Table(rows, colWidths=[label_w, width - label_w])
    t.setStyle(_table_style(0))
    return t


def _run_facts(sheet: RunSheet, width, st) -> list:
    u = sheet.units
    out = [Heading("The run", sheet.location), _item_rows(sheet.summary, width, st), Gap(3)]
    head = [_lines(["From"], st["head"]), _lines(["To"], st["head"]), _lines(["Section"], st["head"]),
            _lines(["Dimensions"], st["head"]), _lines(["Ditch depth as built"], st["head"])]
    data = [head] + [[_p(r["from_station"], st["cell"]), _p(r["to_station"], st["cell"]), _p(r["shape"], st["cell"]),
                      _p(r["dimensions"], st["cell"]), _p(r["ditch_depth"], st["cell"])] for r in sheet.sections]
    t = Table(data, colWidths=_widths((0.09, 0.09, 0.16, 0.5, 0.16), width), repeatRows=1)
    t.setStyle(_table_style(1))
    out += [t, Gap(3)]
    head = [_lines(["Candidate lining"], st["head"]), _lines(["Catalogue key"], st["head"]),
            _lines(["D50"], st["head"]), _lines(["Unit cost that applies"], st["head"])]
    data = [head] + [[_p(r["lining"], st["cell"]), _p(r["key"], st["cell"]), _p(r["d50"] or "\u2014", st["cell"]),
                      _p(pretty_unit(r["unit_cost"]), st["cell"])] for r in sheet.candidates]
    t = Table(data, colWidths=_widths((0.42, 0.18, 0.1, 0.3), width), repeatRows=1)
    t.setStyle(_table_style(1))
    del u
    return out + [t]


def _drainage(sheet: RunSheet, width, st) -> list:
    u = sheet.units
    head = [_lines(["Sub-area"], st["head"]), _lines(["Area", pretty_unit(u.label("drainage_area"))], st["headnum"]),
            _lines(["C"], st["headnum"]), _lines(["C found by"], st["head"]),
            _lines(["Own tc", u.label("duration")], st["headnum"]), _lines(["tc by"], st["head"]),
            _lines(["Enters the ditch"], st["head"])]
    data = [head] + [[_p(r["name"], st["cell"]), _p(r["area"], st["num"]), _p(r["runoff_coefficient"], st["num"]),
                      _p(r["coefficient_method"], st["cell"]), _p(r["time_of_concentration"], st["num"]),
                      _p(r["time_method"], st["cell"]), _p(r["enters"], st["cell"])] for r in sheet.sub_areas]
    t = Table(data, colWidths=_widths((0.15, 0.07, 0.05, 0.22, 0.07, 0.27, 0.17), width), repeatRows=1)
    t.setStyle(_table_style(1))
    out = [Heading("Drainage sub-areas and inflows", "rational method, Q = C i A, at each design point"), t]
    if sheet.inflows:
        head = [_lines(["Point inflow"], st["head"]), _lines(["Station"], st["head"]),
                _lines(["Q", pretty_unit(u.label("flow"))], st["headnum"])]
        data = [head] + [[_p(r["name"], st["cell"]), _p(r["station"], st["cell"]), _p(r["flow"], st["num"])]
                         for r in sheet.inflows]
        t = Table(data, colWidths=_widths((0.3, 0.12, 0.08), width * 0.5), repeatRows=1, hAlign="LEFT")
        t.setStyle(_table_style(1))
        out += [Gap(3), t, _p("Point inflows are added at their full flow with no timing.", st["small"])]
    return out


def _rainfall(sheet: RunSheet, width, st) -> list:
    r = sheet.rainfall
    out = [Heading("Rainfall (intensity-duration-frequency)", f"{r['return_period']} storm used"),
           _p(f"Source: {r['source']}", st["cell"])]
    if "durations" in r:
        used = r.get("used_column")
        heads = [_lines(["Duration", r["duration_unit"]], st["headnum"])]
        for k, period in enumerate(r["return_periods"]):
            mark = " (used)" if k == used else ""
            heads.append(_lines([f"{period}{mark}", f"i {r['intensity_unit']}"], st["headnum"]))
        data = [heads] + [[_p(d, st["num"])] + [_p(v, st["num"]) for v in row]
                          for d, row in zip(r["durations"], r["intensities"])]
        n = len(heads)
        t = Table(data, colWidths=[min(60.0, width / n)] * n, repeatRows=1, hAlign="LEFT")
        extra = []
        if used is not None:
            extra.append(("BACKGROUND", (used + 1, 1), (used + 1, -1), colors.Color(0.92, 0.95, 0.99)))
        t.setStyle(_table_style(1, extra))
        out += [Gap(2), t, _p("Read between durations along a straight line on log-log axes; never beyond the "
                              "table's durations.", st["small"])]
    else:
        out += [_p(line, st["cell"]) for line in r.get("formula", [])]
    return out


def _column_widths(heads, rows, width, size, padding=7.0, last_min=70.0) -> list:
    """Each column as wide as its widest cell or heading word; the last column (words) takes what is left.
    When even that does not fit, every column shrinks in proportion."""
    widths = []
    for i, (head, unit) in enumerate(heads[:-1]):
        words = [*head.split(), unit]
        w = max([stringWidth(t, FONT, size) for t in words] + [stringWidth(r[i], FONT, size) for r in rows])
        widths.append(w + padding)
    rest = width - sum(widths)
    if rest >= last_min:
        return widths + [rest]
    k = (width - last_min) / sum(widths)
    return [w * k for w in widths] + [last_min]


def _stations(sheet: RunSheet, width, st) -> list:
    text_cols = {i for i, (key, _, _) in enumerate(STATION_COLUMNS) if key in ("station", "lining", "profile_type")}
    text_cols.add(len(STATION_COLUMNS))   # the status
    heads = [*sheet.station_heads, ("Status", "")]
    data = [[_lines([h, u], st["shead"] if i in text_cols else st["sheadnum"]) for i, (h, u) in enumerate(heads)]]
    extra = []
    for k, (cells, (words, trouble)) in enumerate(zip(sheet.stations, sheet.status), start=1):
        row = [_p(v, st["scell"] if i in text_cols else st["snum"]) for i, v in enumerate(cells)]
        row.append(_p(words, st["sred"] if trouble else st["scell"]))
        data.append(row)
        if trouble:
            extra.append(("BACKGROUND", (0, k), (-1, k), _RED_FILL))
    t = Table(data, colWidths=_column_widths(heads, sheet.stations, width, STATION_SIZE, padding=5.0,
                                        last_min=STATUS_MIN),
              repeatRows=1)
    t.setStyle(_table_style(1, extra + [("TOPPADDING", (0, 1), (-1, -1), 0.3),
                                        ("BOTTOMPADDING", (0, 1), (-1, -1), 0.5)]))
    troubles = sum(1 for _, tr in sheet.status if tr)
    note = (f"{len(sheet.stations)} design points; "
            + (f"{troubles} trouble spot{'s' if troubles != 1 else ''} (red)" if troubles else "no trouble spots"))
    return [Heading("Stations", note), t, _p(STATION_KEY, st["small"])]


def _bullets(title: str, lines, st, note: str = "") -> list:
    if not lines:
        return []
    return [Heading(title, note)] + [Paragraph(escape(t), st["bullet"], bulletText="\u2022") for t in lines]


def story(sheet: RunSheet, width: float) -> list:
    """The flowing blocks of a run's sheet, in order, after the profile."""
    st = _styles()
    out = []
    # The cautions follow the run's facts, so that they stand on the first page with the profile and schedule.
    for block in (_schedule(sheet, width, st), _run_facts(sheet, width, st), _bullets("Cautions", sheet.cautions, st),
                  _drainage(sheet, width, st),
                  _rainfall(sheet, width, st), _stations(sheet, width, st),
                  _bullets("Water surface: controls", sheet.controls, st, "what was assumed at each end, and "
                           "where the flow passes through critical depth"),
                  _bullets("Hydraulic jumps", sheet.jumps or ["none"], st, "station of the toe, depth before and "
                           "after, length"),
                  _bullets("Warnings", sheet.warnings, st),
                  _bullets("Method", sheet.notes, st),
                  _bullets(NOT_VERIFIED_TITLE, sheet.not_verified, st,
                           "\u2020 recalled, not yet read in the publication: check each before relying on it")):
        if block:
            out += block + [Gap(4)]
    return out


# ------------------------------------------------------------------ pages
@dataclass
class RunPage:
    profile: bool          # the first page: the profile on top
    flowables: list        # (flowable, height) drawn top-down under it


def _frame(page: str):
    pw, ph = page_size(page)
    full_w = pw - MARGIN_LEFT - MARGIN_RIGHT
    top = ph - MARGIN_TOP - HEADER_H
    bottom = MARGIN_BOTTOM + TITLE_HEIGHT + FINGERPRINT_HEIGHT + GAP
    return full_w, top, bottom


def _profile(sheet: RunSheet, full_w: float):
    numbers = [s["number"] for s in sheet.schedule]
    return profile_drawing(sheet.model, sheet.units, full_w, PROFILE_HEIGHT, band_numbers=numbers)


def paginate(sheet: RunSheet, page: str) -> list:
    """The pages of ``sheet``: which blocks go on which page (each a RunPage)."""
    full_w, top, bottom = _frame(page)
    drawing, _ = _profile(sheet, full_w)
    pending = story(sheet, full_w)
    pages = [RunPage(True, [])]
    room = top - bottom - 14 - drawing.height - GAP
    while pending:
        f = pending.pop(0)
        _, h = f.wrap(full_w, room)
        if isinstance(f, Heading) and pending:
            _, h_next = pending[0].wrap(full_w, 10_000)
            need = h + min(h_next, KEEP_WITH_HEADING)
        else:
            need = h
        if need <= room:
            pages[-1].flowables.append((f, h))
            room -= h
            continue
        if not isinstance(f, Heading):
            parts = f.split(full_w, room) if room > 20 else []
            if len(parts) >= 2:
                first = parts[0]
                _, h1 = first.wrap(full_w, room)
                pages[-1].flowables.append((first, h1))
                pending[0:0] = parts[1:]
                pages.append(RunPage(False, []))
                room = top - bottom
                continue
        if not pages[-1].flowables and not pages[-1].profile:   # taller than a whole page and cannot be split
            raise ValueError(f"a block of the sheet of run {sheet.run!r} is taller than a page")
        pages.append(RunPage(False, []))
        room = top - bottom
        pending.insert(0, f)
    return pages


def draw_run_page(c, sheet: RunSheet, info, page: str, plan: RunPage, number: int, count: int,
                  part: tuple, logo_note: list) -> None:
    """Draw one page of a run's sheet; ``part`` is (this page, pages of this run)."""
    full_w, top, _ = _frame(page)
    x0 = MARGIN_LEFT
    y_head = top + HEADER_H
    _bold(c, x0, y_head - 12, "DITCH RUN DESIGN SHEET", 12, stroke=0.35)
    c.setFont(FONT, 8)
    c.drawRightString(x0 + full_w, y_head - 6, _fit(sheet.run, FONT, 8, full_w * 0.6))
    c.setFillColor(GREY)
    c.drawRightString(x0 + full_w, y_head - 15, _fit(f"{sheet.location} \u00b7 page {part[0]} of {part[1]} of "
                                                     "this run", FONT, 7, full_w * 0.6))
    c.setFillColor(colors.black)
    c.setStrokeColor(colors.black)
    c.setLineWidth(0.8)
    c.line(x0, y_head - 19, x0 + full_w, y_head - 19)
    y = top
    if plan.profile:
        drawing, scales = _profile(sheet, full_w)
        y = _heading(c, x0, y, full_w, "Profile")
        c.setFont(FONT, 7)
        heading_w = stringWidth("PROFILE", FONT, 7.4) + 8 * 0.4 + 12
        c.drawRightString(x0 + full_w, y + 4.5, _fit(scales.statement, FONT, 7, full_w - heading_w))
        drawing.drawOn(c, x0, y - drawing.height)
        y -= drawing.height + GAP
    for f, h in plan.flowables:
        f.drawOn(c, x0, y - h)
        y -= h
    _fingerprint_strip(c, sheet, x0, MARGIN_BOTTOM + TITLE_HEIGHT, full_w)
    _title_block(c, sheet, info, page, number, count, logo_note)


__all__ = ["paginate", "draw_run_page", "story", "RunPage", "Heading"]
