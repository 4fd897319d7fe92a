"""Speed of the live window, as a ratio against a baseline measured in the same run.

    QT_QPA_PLATFORM=offscreen python benchmarks/bench_gui.py

One edit, the whole way a keystroke goes: the bottom-width field parses the
text, the form pushes the undo command, the document tells the window, the
window evaluates the channel with the core, fills the results and moves the
section picture's artists, and the canvas renders. That is timed against a
bare ``canvas.draw()`` of the same figure at the same size, with nothing
changed, for a concrete, a riprap, a gravel and a grass lining in turn,\nwith the number of channel evaluations one edit makes. Goal: ratio <= 1.2.

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


#: (what, lining key, D50 [m] or None): one demo channel is given each in turn (invented data)
LININGS = (("concrete", "concrete", None), ("riprap D50 150 mm", "riprap", 0.15),
           ("gravel D50 25 mm", "gravel", 0.025), ("grass, good sod", "grass_good_sod", None))


def measure(app, lining_key, d50):
    """(best edit, best bare draw, median ratio, evaluations per edit) for the first demo channel lined so."""
    from app import channel_display
    from app import project as pj
    from app.gui.mainwindow import MainWindow

    project = pj.loads(pj.demo_path().read_text(encoding="utf-8"))
    project.channels[0].lining = pj.LiningChoice(key=lining_key, d50=d50)
    window = MainWindow(project, persistent=False)
    window.resize(1440, 900)
    window.show()
    for _ in range(5):
        app.processEvents()
    canvas = window.section_picture.canvas
    field = window.inputs.fields["trapezoid:section.bottom_width"]
    values = iter(f"{0.55 + 0.001 * (i % 200):.3f}" for i in range(10 ** 7))

    def edit_and_draw():
        text = next(values)
        field.edit.setText(text)
        field._typed(text)           # what QLineEdit.textEdited delivers on a keystroke
        canvas.draw()                # render now instead of at the next idle moment

    def bare_draw():
        canvas.draw()

    calls = [0]
    original = channel_display.evaluate_channel

    def counted(*args, **kwargs):
        calls[0] += 1
        return original(*args, **kwargs)

    channel_display.evaluate_channel = counted
    try:
        edit_and_draw()
        per_edit = calls[0]
    finally:
        channel_display.evaluate_channel = original
    assert window.doc.channel().section["bottom_width"] != 0.6, "the edit did not reach the project"
    for _ in range(5):
        edit_and_draw()
        bare_draw()
    edit, bare, median = interleaved(edit_and_draw, bare_draw)
    size = canvas.width(), canvas.height()
    window.doc.undo_stack.setClean()
    window.close()
    return edit, bare, median, per_edit, size


def main() -> int:
    app = QApplication.instance() or QApplication([])
    for what, key, d50 in LININGS:
        edit, bare, median, per_edit, size = measure(app, key, d50)
        print(f"{what:18s} canvas {size[0]}x{size[1]} px: bare draw {bare * 1e3:6.2f} ms, edit + recompute + "
              f"redraw {edit * 1e3:6.2f} ms, {edit / bare:.2f}x best against best, {median:.2f}x median of paired "
              f"batches; {per_edit} evaluation(s) per edit")
    return 0


if __name__ == "__main__":
    sys.exit(main())
