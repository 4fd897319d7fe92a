"""Speed of the live window, as a ratio against a baseline measured in the same run.

    QT_QPA_PLATFORM=offscreen python benchmarks/bench_gui.py

One edit, the whole way a keystroke goes: the bottom-width field parses the
text, the form pushes the undo command, the document tells the window, the
window hands a copy of the channel to its worker thread, the worker evaluates
it with the core, and back in the window's thread the results are filled, the
section picture's artists moved and the canvas rendered. What is timed is the
time the window's thread is busy with that edit: the computation in the worker
is left out (the window's thread waits for it here only to keep the rounds
apart; while typing it is free to take the next keystroke). That is set
against a bare ``canvas.draw()`` of the same figure at the same size, with
nothing changed, for a concrete, a riprap, a gravel and a grass lining in turn,
with the number of channel evaluations one edit makes. Goal: ratio <= 1.2.

The two are measured in alternating batches, and each figure is the best
batch of many, so that other load on the machine weighs as little as
possible; the median ratio of the paired batches is printed with the spread
(lowest to highest), and the time from the keystroke to the new picture
(worker included) for information.
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
    """Per-call times of ``a`` and ``b`` (each returns the seconds it counts) in alternating batches:
    (best a, best b, ratios a/b of the paired batches)."""
    ta, tb, ratios = [], [], []
    for _ in range(repeat):
        times = [sum(fn() for _ in range(number)) / number for fn in (a, b)]
        ta.append(times[0])
        tb.append(times[1])
        ratios.append(times[0] / times[1])
    return min(ta), min(tb), ratios


#: (what, lining key, D50 [m] or None): one demo channel is given each in turn (invented data)
LININGS = (("concrete", "concrete", None), ("riprap D50 150 mm", "riprap", 0.15),
           ("gravel D50 25 mm", "gravel", 0.025), ("grass, good sod", "grass_good_sod", None))


def measure(app, lining_key, d50):
    """(best edit, best bare draw, paired ratios, evaluations per edit, canvas size, best keystroke-to-picture)
    for the first demo channel lined so."""
    from app import channel_display
    from app import project as pj
    from app.gui.mainwindow import MainWindow

    project = pj.loads(pj.demo_path().read_text(encoding="utf-8"))
    project.channels[0].lining = pj.LiningChoice(key=lining_key, d50=d50)
    window = MainWindow(project, persistent=False)
    window.resize(1440, 900)
    window.show()
    evaluator = window.evaluator
    while not evaluator.idle or window.evaluation is None:
        app.processEvents()
    canvas = window.section_picture.canvas
    field = window.inputs.fields["trapezoid:section.bottom_width"]
    values = iter(f"{0.55 + 0.001 * (i % 200):.3f}" for i in range(10 ** 7))
    real_draw = canvas.draw
    draws = [0]

    def counted_draw(*args, **kwargs):   # the window draws with draw_idle: count the renders it leads to
        draws[0] += 1
        return real_draw(*args, **kwargs)

    canvas.draw = counted_draw
    latency = []

    def edit():
        """The time the window's thread is busy with one edit [s]."""
        text, drawn = next(values), draws[0]
        t0 = time.perf_counter()
        field.edit.setText(text)
        field._typed(text)                       # what QLineEdit.textEdited delivers on a keystroke
        while not (evaluator.running or evaluator.idle):
            app.processEvents()                  # the worker starts at the next turn of the event loop
        busy = time.perf_counter() - t0
        evaluator.wait()                         # the worker computes; the window's thread is free meanwhile
        t1 = time.perf_counter()
        while not evaluator.idle or draws[0] == drawn:
            app.processEvents()                  # the result is shown and the picture rendered
        t2 = time.perf_counter()
        latency.append(t2 - t0)
        return busy + t2 - t1

    def bare_draw():
        t0 = time.perf_counter()
        real_draw()
        return time.perf_counter() - t0

    calls = [0]
    original = channel_display.evaluate_channel

    def counted(*args, **kwargs):
        calls[0] += 1
        return original(*args, **kwargs)

    channel_display.evaluate_channel = counted
    try:
        edit()
        per_edit = calls[0]
    finally:
        channel_display.evaluate_channel = original
    assert window.doc.channel().section["bottom_width"] != 0.6, "the edit did not reach the project"
    assert window.evaluation.section.bottom_width == window.doc.channel().section["bottom_width"]
    for _ in range(5):
        edit()
        bare_draw()
    latency.clear()
    best_edit, best_bare, ratios = interleaved(edit, bare_draw)
    size = canvas.width(), canvas.height()
    window.doc.undo_stack.setClean()
    window.close()
    return best_edit, best_bare, ratios, per_edit, size, min(latency)


def main() -> int:
    app = QApplication.instance() or QApplication([])
    for what, key, d50 in LININGS:
        edit, bare, ratios, per_edit, size, latency = measure(app, key, d50)
        print(f"{what:18s} canvas {size[0]}x{size[1]} px: bare draw {bare * 1e3:6.2f} ms, window's thread busy "
              f"per edit {edit * 1e3:6.2f} ms: {edit / bare:.2f}x best against best, {statistics.median(ratios):.2f}x "
              f"median of paired batches ({min(ratios):.2f}-{max(ratios):.2f}); keystroke to new picture "
              f"{latency * 1e3:.1f} ms; {per_edit} evaluation(s) per edit")
    return 0


if __name__ == "__main__":
    sys.exit(main())
