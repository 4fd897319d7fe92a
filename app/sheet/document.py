"""The PDF file of design sheets: channel pages (app.sheet.layout) and run pages (app.sheet.run_layout) numbered
through the whole file. Kept apart from both page layouts, which share the page's measures and title block."""

from __future__ import annotations

import io

from reportlab.pdfgen import canvas as rl_canvas

from .. import __version__
from .fonts import FONT, register
from .layout import draw_page, page_size, subject_of
from .run_content import RunSheet
from .run_layout import draw_run_page, paginate

__all__ = ["render"]


def render(project, sheets, page: str = "letter") -> tuple[bytes, list]:
    """PDF bytes with one page per ChannelSheet and as many pages as each RunSheet needs (numbered through the
    whole file in the title block), and notes (e.g. a missing logo) for the user."""
    register()
    size = page_size(page)
    plans = [paginate(s, page) if isinstance(s, RunSheet) else None for s in sheets]
    count = sum(1 if p is None else len(p) for p in plans)
    buf = io.BytesIO()
    c = rl_canvas.Canvas(buf, pagesize=size, initialFontName=FONT, initialFontSize=8, pageCompression=1,
                         invariant=1)
    runs = any(p is not None for p in plans)
    c.setTitle(f"{'Design sheets' if runs else 'Channel design sheets'}: {project.name}")
    c.setAuthor(project.sheet.designer or "")
    c.setCreator(f"Ditchwright {__version__}")
    c.setSubject("; ".join(f"{subject_of(s)}: {s.fingerprint}" for s in sheets))
    c.setKeywords(["ditchwright-fingerprint=" + s.fingerprint for s in sheets])
    notes: list = []
    number = 0
    for sheet, plan in zip(sheets, plans):
        if plan is None:
            number += 1
            draw_page(c, sheet, project.sheet, page, number, count, notes)
            c.showPage()
            continue
        for k, run_page in enumerate(plan, start=1):
            number += 1
            draw_run_page(c, sheet, project.sheet, page, run_page, number, count, (k, len(plan)), notes)
            c.showPage()
    c.save()
    return buf.getvalue(), sorted(set(notes))
