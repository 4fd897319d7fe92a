"""Speed of the live window, as a ratio against a baseline measured in the same run.

    QT_QPA_PLATFORM=offscreen python benchmarks/bench_gui.py
    QT_QPA_PLATFORM=offscreen python benchmarks/bench_gui.py --profile riprap   # where the window's time goes

One edit, the whole way a keystroke goes: the bottom-width field parses the
text, the form pushes the undo command, the document tells the window, the
window hands a copy of the channel to its worker thread, the worker evaluates
it with the core, and back in the window's thread the results are filled, the
section picture's artists moved and the canvas rendered. What is timed is the
time the window's thread is busy with that edit: the computation in the worker
is left out (the window's thread waits for it here only to keep the rounds
apart; while typing it is free to take the next keystroke). It includes what
Qt paints for the edit (the field, the results, the canvas put on screen). That
is set against a bare ``canvas.draw()`` of the same figure at the same size,
with nothing changed, and against that draw put on screen (``canvas.repaint()``
after it, as the edit's draw is), for a concrete, a riprap, a gravel and a
grass lining in turn, with the number of channel evaluations one edit makes.
Goal: ratio <= 1.2.

Times are the CPU time of the window's thread (``time.thread_time``), so
that other programs on the machine do not count; the three are measured in
alternating batches, and each figure is the best batch of many; the median ratio of the paired batches is printed with the spread
(lowest to highest), and the time from the keystroke to the new picture
(worker included) for information.
"""

from __future__ import annotations

import argparse
import cProfile
import os
import pstats
import statistics
import sys
import time

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.abspath(__file__))))

from PySide6.QtWidgets import QApplication  # noqa: E402


def interleaved(fns, number=10, repeat=15):
    """Per-call times of ``fns`` (each returns the seconds it counts) in alternating batches: the best time of
    each, and the ratios of the first to each other in the paired batches."""
    times = [[] for _ in fns]
    for _ in range(repeat):
        for t, fn in zip(times, fns):
            t.append(sum(fn() for _ in range(number)) / number)
    return [min(t) for t in times], [[a / b for a, b in zip(times[0], t)] for t in times[1:]]


#: (what, lining key, D50 [m] or None): one demo channel is given each in turn (invented data)
LININGS = (("concrete", "concrete", None), ("riprap D50 150 mm", "riprap", 0.15),
           ("gravel D50 25 mm", "gravel", 0.025), ("grass, good sod", "grass_good_sod", None))


def measure(app, lining_key, d50, profile=None):
    """(best edit, bare draw, bare draw on screen; paired ratios to each; evaluations per edit, canvas size,
    best keystroke-to-picture) for the first demo channel lined so."""
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
    profiling = [None]           # the profile, once the warm-up is done

    def edit():
        """The time the window's thread is busy with one edit [s]."""
        text = next(values)
        start, t0 = time.perf_counter(), time.thread_time()
        if profiling[0] is not None:
            profiling[0].enable()                # cProfile follows this thread only: the worker is left out
        field.edit.setText(text)
        field._typed(text)                       # what QLineEdit.textEdited delivers on a keystroke
        while not (evaluator.running or evaluator.idle):
            app.processEvents()                  # the worker starts at the next turn of the event loop
        busy = time.thread_time() - t0
        if profiling[0] is not None:
            profiling[0].disable()
        evaluator.wait()                         # the worker computes; the window's thread is free meanwhile
        t1, drawn = time.thread_time(), draws[0]
        if profiling[0] is not None:
            profiling[0].enable()
        while not evaluator.idle or draws[0] == drawn:
            app.processEvents()                  # the result is shown and the picture rendered
        if profiling[0] is not None:
            profiling[0].disable()
        busy += time.thread_time() - t1
        latency.append(time.perf_counter() - start)
        return busy

    def bare_draw():
        t0 = time.thread_time()
        real_draw()
        return time.thread_time() - t0

    def bare_draw_on_screen():
        t0 = time.thread_time()
        real_draw()
        canvas.repaint()
        return time.thread_time() - t0

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
        bare_draw_on_screen()
    latency.clear()
    if profile is not None:                      # the edits profiled, then the bare draws alike for comparison
        profiling[0] = profile
        for _ in range(60):
            edit()
        profiling[0] = None
        bare = cProfile.Profile()
        bare.enable()
        for _ in range(60):
            real_draw()
        bare.disable()
        window.doc.undo_stack.setClean()
        window.close()
        return bare
    best, ratios = interleaved((edit, bare_draw, bare_draw_on_screen))
    size = canvas.width(), canvas.height()
    window.doc.undo_stack.setClean()
    window.close()
    return best, ratios, per_edit, size, min(latency)


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--profile", metavar="LINING", choices=[key for _, key, _ in LININGS],
                        help="profile 60 edits of one lining in the window's thread (cProfile) against 60 bare draws "
                             "instead of timing")
    args = parser.parse_args(argv)
    app = QApplication.instance() or QApplication([])
    if args.profile:
        what, key, d50 = next(lining for lining in LININGS if lining[1] == args.profile)
        edits = cProfile.Profile()
        bare = measure(app, key, d50, profile=edits)
        print(f"== 60 edits, {what}: the window's thread")
        pstats.Stats(edits).sort_stats("cumulative").print_stats(40)
        print("== 60 bare draws of the same figure")
        pstats.Stats(bare).sort_stats("cumulative").print_stats(10)
        return 0
    for what, key, d50 in LININGS:
        (edit, bare, shown), ratios, per_edit, size, latency = measure(app, key, d50)
        print(f"{what}: canvas {size[0]}x{size[1]} px, {per_edit} evaluation(s) per edit; window's thread busy per "
              f"edit {edit * 1e3:.2f} ms, keystroke to new picture {latency * 1e3:.1f} ms (worker included)")
        for name, base, r in (("bare draw", bare, ratios[0]), ("bare draw on screen", shown, ratios[1])):
            print(f"    against {name:19s} {base * 1e3:6.2f} ms: {edit / base:.2f}x best against best, "
                  f"{statistics.median(r):.2f}x median of paired batches ({min(r):.2f}-{max(r):.2f})")
    return 0


if __name__ == "__main__":
    sys.exit(main())
