"""Speed of a channel's design-sheet page, as a ratio against a bare page with the same figures.

    python benchmarks/bench_sheet.py [--rounds 9]

For each channel of the demo project (invented site), with its sheet content already evaluated:
(1) the page as the program draws it: ``app.sheet.document.render`` of that one ChannelSheet (the text laid out
    and fitted to the page, the typical section, the rating curve, the tables, the title block, the PDF saved);
(2) a bare reportlab page with the same two figures: a canvas, the typical-section Drawing and the rating-curve
    Drawing (matplotlib, SVG, svglib) drawn on it, the PDF saved; no text, no fitting.
Ratio = (1) / (2); goal <= 1.3x. The two are timed in alternating rounds, so that both meet the machine in the
same state; the median over the rounds of the ratio summed over the channels is printed with its range.
"""

from __future__ import annotations

import argparse
import io
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from reportlab.pdfgen import canvas as rl_canvas  # noqa: E402

from app.evaluate import load_default_catalogue  # noqa: E402
from app.project import load  # noqa: E402
from app.sheet.content import channel_sheet  # noqa: E402
from app.sheet.document import render  # noqa: E402
from app.sheet.fonts import FONT, register  # noqa: E402
from app.sheet.layout import page_size  # noqa: E402
from app.sheet.rating import rating_drawing  # noqa: E402
from app.sheet.section_drawing import section_drawing  # noqa: E402

DEMO = Path(__file__).resolve().parents[1] / "resources" / "demo-project.json"


def bare_page(sheet) -> bytes:
    register()
    buf = io.BytesIO()
    size = page_size("letter")
    c = rl_canvas.Canvas(buf, pagesize=size, initialFontName=FONT, initialFontSize=8, pageCompression=1, invariant=1)
    sec, _ = section_drawing(sheet, 540, 165)
    sec.drawOn(c, 36, 560)
    rd = rating_drawing(sheet, 265, 150)
    rd.drawOn(c, 300, 380)
    c.showPage()
    c.save()
    return buf.getvalue()


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rounds", type=int, default=9)
    args = parser.parse_args()
    project = load(DEMO)
    catalogue = load_default_catalogue()
    sheets = [channel_sheet(project, ch, catalogue) for ch in project.channels]
    for s in sheets:  # warm the fonts, matplotlib and svglib
        render(project, [s])
        bare_page(s)
    ratios, full_t, bare_t = [], [], []
    for _ in range(args.rounds):
        t0 = time.perf_counter()
        for s in sheets:
            bare_page(s)
        t1 = time.perf_counter()
        for s in sheets:
            render(project, [s])
        t2 = time.perf_counter()
        ratios.append((t2 - t1) / (t1 - t0))
        full_t.append((t2 - t1) / len(sheets))
        bare_t.append((t1 - t0) / len(sheets))
    print(f"channel sheet page / bare page with the same figures ({len(sheets)} demo channels): "
          f"{statistics.median(ratios):.2f}x (rounds {min(ratios):.2f}x to {max(ratios):.2f}x; about "
          f"{statistics.median(full_t) * 1e3:.0f} ms against {statistics.median(bare_t) * 1e3:.0f} ms a page; "
          "goal <= 1.3x)")


if __name__ == "__main__":
    main()
