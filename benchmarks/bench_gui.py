"""Speed of the live window, as a ratio against a baseline measured in the same run.

    QT_QPA_PLATFORM=offscreen python benchmarks/bench_gui.py

One edit, the whole way a keystroke goes: the bottom-width field parses the
text, the form pushes the undo command, the document tells the window, the
window evaluates the channel with the core, fills the results and moves the
section picture's artists, and the canvas renders. That is timed against a
bare ``canvas.draw()`` of the same figure at the same size, with nothing
changed. Goal: ratio <= 1.5.

The two are measured in alternating batches, and each figure is the best
batch of many, so that other load on the machine weighs as little as
possible; the median ratio is printed too.
"""

from __future__ import annotations

import os
import statistics
import sys
import time

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.abspath(__file__))))

from PySide6.QtWidgets import QApplication  # noqa: E402


def interleaved(a, b, number=10, repeat=15):
    """Per-call times of ``a`` and ``b`` in alternating batches: (best a, best b, median of a/b)."""
    ta, tb, ratios = [], [], []
    for _ in range(repeat):
        times = []
        for fn in (a, b):
            t0 = time.perf_counter()
            for _ in range(number):
                fn()
            times.append((time.perf_counter() - t0) / number)
        ta.append(times[0])
        tb.append(times[1])
        ratios.append(times[0] / times[1])
    return min(ta), min(tb), statistics.median(ratios)


def main() -> int:
    app = QApplication.instance() or QApplication([])
    from app import project as pj
    from app.gui.mainwindow import MainWindow

    project = pj.loads(pj.demo_path().read_text(encoding="utf-8"))
    window = MainWindow(project, persistent=False)
    window.resize(1440, 900)
    window.show()
    for _ in range(5):
        app.processEvents()
    canvas = window.section_picture.canvas
    field = window.inputs.fields["trapezoid:section.bottom_width"]
    width = canvas.width(), canvas.height()
    values = iter(f"{0.55 + 0.001 * (i % 200):.3f}" for i in range(10 ** 7))

    def edit_and_draw():
        text = next(values)
        field.edit.setText(text)
        field._typed(text)           # what QLineEdit.textEdited delivers on a keystroke
        canvas.draw()                # render now instead of at the next idle moment

    def bare_draw():
        canvas.draw()

    edit_and_draw()
    assert window.doc.channel().section["bottom_width"] != 0.6, "the edit did not reach the project"
    for _ in range(5):
        edit_and_draw()
        bare_draw()
    edit, bare, median = interleaved(edit_and_draw, bare_draw)
    print(f"canvas {width[0]}x{width[1]} px, {window.doc.undo_stack.count()} undo command(s) after all edits")
    print(f"bare canvas.draw():              {bare * 1e3:6.2f} ms")
    print(f"edit + recompute + redraw:       {edit * 1e3:6.2f} ms")
    print(f"ratio: {edit / bare:.2f}x best against best, {median:.2f}x median of paired batches (goal <= 1.5x)")
    window.doc.undo_stack.setClean()
    window.close()
    return 0


if __name__ == "__main__":
    sys.exit(main())
