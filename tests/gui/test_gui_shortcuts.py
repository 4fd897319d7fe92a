"""Window shortcuts while a text box has the focus, Alt mnemonics in the menus, and the last project on start."""

import pytest
from PySide6.QtCore import QEvent, Qt
from PySide6.QtWidgets import QApplication, QLineEdit, QMenu

from app import project as pj
from app.gui import application, settings
from app.gui.mainwindow import MainWindow
from app.main import main


class GreedyBox(QLineEdit):
    """A line edit that claims every key combination, as a line edit does with Ctrl+E and Ctrl+D under the X11
    key scheme of Linux desktops (end of line, delete); offscreen Qt uses another scheme, so this stands in."""

    def event(self, event):
        if event.type() == QEvent.Type.ShortcutOverride:
            event.accept()
            return True
        return super().event(event)


def counting_export(w):
    hits = []
    w.export_action.triggered.disconnect()
    w.export_action.triggered.connect(lambda: hits.append(1))
    return hits


def ctrl(qtbot, widget, key):
    widget.setFocus()
    qtbot.waitUntil(widget.hasFocus, timeout=1000)
    qtbot.keyClick(widget, key, Qt.KeyboardModifier.ControlModifier)


def test_ctrl_e_exports_from_every_text_box(demo_window, qtbot):
    w = demo_window
    hits = counting_export(w)
    boxes = [w.inputs.name, w.inputs.notes, w.inputs.fields["slope"].edit, w.inputs.fields["flow.value"].edit]
    for box in boxes:
        before = len(hits)
        ctrl(qtbot, box, Qt.Key.Key_E)
        assert len(hits) == before + 1, box.objectName()


def test_a_box_that_claims_the_key_still_lets_the_window_have_it(demo_window, qtbot):
    w = demo_window
    hits = counting_export(w)
    greedy = GreedyBox()
    w.inputs.widget().layout().addWidget(greedy)       # a box made after the window, found when it gets the focus
    greedy.show()
    ctrl(qtbot, greedy, Qt.Key.Key_E)
    assert hits == [1]
    count = len(w.doc.project.channels)
    ctrl(qtbot, greedy, Qt.Key.Key_D)                  # Ctrl+D: duplicate the channel, not delete a character
    assert len(w.doc.project.channels) == count + 1
    greedy.setText("abc")
    greedy.setFocus()
    qtbot.keyClick(greedy, Qt.Key.Key_X)               # plain typing stays in the box
    assert greedy.text().endswith("x")


def test_ctrl_e_exports_while_renaming_a_channel_in_the_list(demo_window, qtbot):
    w = demo_window
    hits = counting_export(w)
    w.channel_list.editItem(w.channel_list.item(0))
    editor = QApplication.focusWidget()
    assert isinstance(editor, QLineEdit)
    qtbot.keyClick(editor, Qt.Key.Key_E, Qt.KeyboardModifier.ControlModifier)
    assert hits == [1]


def mnemonic(text):
    i = text.find("&")
    while i >= 0 and text[i + 1:i + 2] == "&":
        i = text.find("&", i + 2)
    return text[i + 1].lower() if i >= 0 else None


def test_every_menu_item_has_its_own_alt_mnemonic(demo_window):
    w = demo_window

    def check(menu_actions, where):
        letters = []
        for a in menu_actions:
            if a.isSeparator():
                continue
            letter = mnemonic(a.text())
            assert letter, f"{where}: '{a.text()}' has no mnemonic"
            letters.append(letter)
            if a.menu() is not None:
                check(a.menu().actions(), a.text())
        assert len(letters) == len(set(letters)), f"{where}: mnemonics used twice: {letters}"
    check(w.menuBar().actions(), "menu bar")
    assert isinstance(w.recent_menu, QMenu)


def test_the_last_project_reopens_on_start(monkeypatch, tmp_path):
    monkeypatch.setattr(QApplication, "exec", lambda self: 0)
    project = pj.Project(name="Last one (invented)")
    path = tmp_path / "last.json"
    pj.save(project, path)
    settings.DEMO_SHOWN.write(True)
    settings.add_recent(str(path))
    assert main([]) == 0
    w = application.last_window
    assert w.doc.project.name == "Last one (invented)" and w.doc.path == path.resolve()
    w.close()
    path.unlink()                                      # gone: a new project, no complaint
    assert main([]) == 0
    w = application.last_window
    assert w.doc.path is None and w.doc.project.name == "Untitled project"
    w.close()


@pytest.mark.parametrize("answer, expected", [("recover", "Before the crash"), ("later", "Last one (invented)")])
def test_the_recovery_offer_comes_before_the_last_project(monkeypatch, tmp_path, qtbot, answer, expected):
    monkeypatch.setattr(QApplication, "exec", lambda self: 0)
    path = tmp_path / "last.json"
    pj.save(pj.Project(name="Last one (invented)"), path)
    settings.DEMO_SHOWN.write(True)
    settings.add_recent(str(path))
    crashed = MainWindow(pj.Project(name="Before the crash"))
    qtbot.addWidget(crashed)
    crashed.doc.edit("slope", 0.0321, "Change bed slope")
    assert crashed.autosaver.save_now()
    crashed.autosaver.lock.unlock()                    # as if the program had died
    asked = []
    monkeypatch.setattr(MainWindow, "ask_recovery", lambda self, r: asked.append(r.name) or answer)
    assert main([]) == 0
    w = application.last_window
    assert asked == ["Before the crash"] and w.doc.project.name == expected
    w.doc.undo_stack.setClean()
    w.doc.recovered = False
    w.close()
    crashed.doc.undo_stack.setClean()
