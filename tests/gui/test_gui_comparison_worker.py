"""The lining comparison computed off the window's thread (app.gui.comparison with app.gui.tasks.Recomputer):
typing never waits for it, the table shown stays until the newest is in, a stale table is dropped, a fault is said
in words, and apply and copy act on the table of the inputs as they are."""

import threading

from PySide6.QtCore import Qt
from PySide6.QtGui import QGuiApplication

from app import channel_display as display
from waiting import compared


def outfall(w):
    """The demo channel that compares linings (riprap, with gravel among its alternatives)."""
    w.doc.set_current(next(i for i, c in enumerate(w.doc.project.channels) if c.alternatives))
    w.tabs.setCurrentIndex(3)
    return w.comparison


class HeldCompare:
    """``display.compare`` counted, its threads noted, and held at a gate for the slopes in ``hold``."""

    def __init__(self, monkeypatch, hold=()):
        self.real, self.hold = display.compare, set(hold)
        self.gate = threading.Event()
        self.slopes, self.threads = [], []
        monkeypatch.setattr(display, "compare", self)

    def __call__(self, channel, context):
        self.slopes.append(channel.slope)
        self.threads.append(threading.get_ident())
        if channel.slope in self.hold:
            assert self.gate.wait(20)
        return self.real(channel, context)


def test_edits_are_compared_in_the_worker_and_the_last_table_stays_until_the_new_one(demo_window, qtbot, monkeypatch):
    w = demo_window
    view = outfall(w)
    compared(view, qtbot)
    held = HeldCompare(monkeypatch, hold={0.02})
    before = [r.core.depth for r in view.rows]
    try:
        w.doc.edit("slope", 0.02, "Change bed slope")
        qtbot.waitUntil(lambda: view.computer.running, timeout=10000)
        qtbot.waitUntil(lambda: held.slopes == [0.02], timeout=10000)    # held in the worker (once it has begun)
        assert held.threads and threading.get_ident() not in held.threads  # not on the window's thread
        assert [r.core.depth for r in view.rows] == before                 # the table shown stays meanwhile
        for slope in (0.021, 0.022):                                       # two more edits while it is held
            w.doc.edit("slope", slope, "Change bed slope")
    finally:
        held.gate.set()
    rows = compared(view, qtbot)
    assert held.slopes == [0.02, 0.022]         # 0.021 never computed: 0.022 had come before it could start
    fresh, _ = held.real(w.doc.channel(), w.doc.context)
    assert [r.core.depth for r in rows] == [r.core.depth for r in fresh]  # the table of 0.022, not the stale one
    assert threading.get_ident() not in held.threads


def test_a_hidden_comparison_computes_nothing_until_it_is_shown(demo_window, qtbot, monkeypatch):
    w = demo_window
    view = outfall(w)
    compared(view, qtbot)
    w.tabs.setCurrentIndex(0)
    held = HeldCompare(monkeypatch)
    w.doc.edit("slope", 0.02, "Change bed slope")
    qtbot.wait(50)
    assert held.slopes == []
    w.tabs.setCurrentIndex(3)
    compared(view, qtbot)
    assert held.slopes == [0.02]


def test_a_fault_in_the_worker_is_said_in_words(demo_window, qtbot, monkeypatch):
    w = demo_window
    view = outfall(w)
    compared(view, qtbot)

    def broken(channel, context):
        raise RuntimeError("the core broke")
    monkeypatch.setattr(display, "compare", broken)
    w.doc.edit("slope", 0.02, "Change bed slope")
    compared(view, qtbot)          # pytest-qt fails the test if the error escaped into Qt's event loop
    assert view.unavailable.isVisibleTo(view)
    assert "could not be compared: RuntimeError: the core broke" in view.unavailable.text()
    assert view.rows == [] and view.table.columnCount() == 0 and not view.copy_button.isEnabled()


def test_copy_right_after_an_edit_waits_for_the_table_of_the_new_inputs(demo_window, qtbot, monkeypatch):
    w = demo_window
    view = outfall(w)
    compared(view, qtbot)
    held = HeldCompare(monkeypatch, hold={0.02})
    w.doc.edit("slope", 0.02, "Change bed slope")
    qtbot.waitUntil(lambda: view.computer.running, timeout=10000)
    threading.Timer(0.2, held.gate.set).start()                 # the worker is let go while the copy waits
    qtbot.mouseClick(view.copy_button, Qt.MouseButton.LeftButton)
    fresh, _ = held.real(w.doc.channel(), w.doc.context)
    assert QGuiApplication.clipboard().text() == display.comparison_tsv(fresh, w.doc.context)


def test_apply_while_the_table_is_updated_applies_the_picked_lining_to_the_current_inputs(demo_window, qtbot,
                                                                                           monkeypatch):
    w = demo_window
    view = outfall(w)
    rows = compared(view, qtbot)
    gravel = [r.choice.key for r in rows].index("gravel")
    view.select_lining(gravel)
    held = HeldCompare(monkeypatch, hold={0.02})
    w.doc.edit("slope", 0.02, "Change bed slope")
    qtbot.waitUntil(lambda: view.computer.running, timeout=10000)
    threading.Timer(0.2, held.gate.set).start()
    qtbot.mouseClick(view.apply_button, Qt.MouseButton.LeftButton)
    ch = w.doc.channel()
    assert ch.lining.key == "gravel" and ch.slope == 0.02          # the new inputs kept, the lining applied
    rows = compared(view, qtbot)
    assert rows[view.selected()].choice.key == "gravel"            # still picked in the table that follows
    w.doc.undo_stack.setClean()
