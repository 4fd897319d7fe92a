"""Fixtures for the window tests: fresh settings and data folders, and no real dialogs.

Every test gets its own QSettings files and QStandardPaths folders under
``tmp_path`` (QStandardPaths test mode, with HOME pointing there), so a test
never reads or writes the user's own settings, recent files or autosaves.
Message boxes, file dialogs and QInputDialog.getText are replaced by
recorders that answer as the test says; a dialog no test expected is recorded
and answered "Cancel". QDesktopServices.openUrl only records the address, so
no test starts a PDF viewer.
"""

import os

import pytest

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

from PySide6.QtCore import QSettings, QStandardPaths  # noqa: E402
from PySide6.QtGui import QDesktopServices  # noqa: E402
from PySide6.QtWidgets import QFileDialog, QInputDialog, QMessageBox  # noqa: E402

from waiting import evaluated  # noqa: E402


@pytest.fixture(autouse=True)
def isolated_settings(qapp, tmp_path, monkeypatch):
    from app.gui import settings
    home = tmp_path / "home"
    home.mkdir()
    monkeypatch.setenv("HOME", str(home))
    QStandardPaths.setTestModeEnabled(True)
    for fmt in (QSettings.Format.NativeFormat, QSettings.Format.IniFormat):
        QSettings.setPath(fmt, QSettings.Scope.UserScope, str(tmp_path / "settings"))
    settings.set_application_names(qapp)
    assert str(settings.data_folder()).startswith(str(home))
    yield tmp_path
    QStandardPaths.setTestModeEnabled(False)


class Dialogs:
    """Records message boxes; ``answers`` gives the button to return, per kind, in order."""

    def __init__(self):
        self.shown = []        # (kind, title, text)
        self.answers = {}      # kind -> list of StandardButton
        self.open_name = ""    # what QFileDialog.getOpenFileName returns
        self.save_name = ""    # what QFileDialog.getSaveFileName returns
        self.texts = []        # answers of QInputDialog.getText, in order: (text, ok); none left: ("", False)
        self.asked = []        # (title, label, echo mode) of every QInputDialog.getText
        self.opened = []       # addresses given to QDesktopServices.openUrl

    def _box(self, kind):
        def show(parent, title, text, *args, **kwargs):
            self.shown.append((kind, title, text))
            queue = self.answers.get(kind, [])
            return queue.pop(0) if queue else QMessageBox.StandardButton.Cancel
        return show

    def _get_text(self, parent, title, label, echo=None, text="", *args, **kwargs):
        self.asked.append((title, label, kwargs.get("echo", echo)))
        return self.texts.pop(0) if self.texts else ("", False)

    def _open_url(self, url):
        self.opened.append(url)
        return True

    def kinds(self):
        return [k for k, _, _ in self.shown]


@pytest.fixture(autouse=True)
def dialogs(monkeypatch):
    d = Dialogs()
    for kind in ("warning", "critical", "question", "information"):
        monkeypatch.setattr(QMessageBox, kind, staticmethod(d._box(kind)))
    monkeypatch.setattr(QMessageBox, "about", staticmethod(lambda *a, **k: d.shown.append(("about", "", ""))))
    monkeypatch.setattr(QMessageBox, "exec", lambda self: d.shown.append(("exec", self.windowTitle(), self.text())))
    monkeypatch.setattr(QFileDialog, "getOpenFileName", staticmethod(lambda *a, **k: (d.open_name, "")))
    monkeypatch.setattr(QFileDialog, "getSaveFileName", staticmethod(lambda *a, **k: (d.save_name, "")))
    monkeypatch.setattr(QInputDialog, "getText", staticmethod(d._get_text))
    monkeypatch.setattr(QDesktopServices, "openUrl", staticmethod(d._open_url))
    return d


@pytest.fixture
def demo_window(qtbot):
    from app import project as pj
    from app.gui.mainwindow import MainWindow
    w = MainWindow(pj.loads(pj.demo_path().read_text(encoding="utf-8")))
    qtbot.addWidget(w)
    w.resize(1440, 900)
    w.show()
    qtbot.waitExposed(w)
    evaluated(w, qtbot)
    yield w
    w.doc.undo_stack.setClean()
    w.doc.recovered = False
