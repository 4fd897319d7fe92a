"""Speed of the live window, as a ratio against a baseline measured in the same run.

    QT_QPA_PLATFORM=offscreen python benchmarks/bench_gui.py

One edit, the whole way a keystroke goes: the bottom-width field parses the
text, the form pushes the undo command, the document tells the window, the
window evaluates the channel with the core, fills the results and moves the
section picture's artists, and the canvas renders. That is timed against a
bare ``canvas.draw()`` of the same figure at the same size, with nothing
changed. Goal: ratio <= 1.5.

Both figures are the best of several repeats, so that other load on the
machine weighs as little as possible.
"""

from __future__ import annotations

import os
import statistics
import sys
import time

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.abspath(__file__))))

from PySide6.QtWidgets import QApplication  # noqa: E402


def best(fn, number=20, repeat=7):
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        for _ in range(number):
            fn()
        times.append((time.perf_counter() - t0) / number)
    return min(times), statistics.median(times)


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
    bare, bare_med = best(bare_draw)
    edit, edit_med = best(edit_and_draw)
    print(f"canvas {width[0]}x{width[1]} px, {window.doc.undo_stack.count()} undo command(s) after all edits")
    print(f"bare canvas.draw():              {bare * 1e3:6.2f} ms (median {bare_med * 1e3:.2f})")
    print(f"edit + recompute + redraw:       {edit * 1e3:6.2f} ms (median {edit_med * 1e3:.2f})")
    print(f"ratio: {edit / bare:.2f}x (goal <= 1.5x)")
    window.doc.undo_stack.setClean()
    window.close()
    return 0


if __name__ == "__main__":
    sys.exit(main())
