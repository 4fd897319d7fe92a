"""The window's files: a private autosave, project files and sheets by the umask, and a sweep of temporary files
left by an autosave that was killed."""

import os
import stat
import time

import pytest

from app.gui import settings
from app.gui.mainwindow import MainWindow

pytestmark = pytest.mark.skipif(os.name != "posix", reason="modes are checked on POSIX")


def test_the_autosave_and_its_note_are_private(qtbot):
    old = os.umask(0o022)
    try:
        w = MainWindow()
        qtbot.addWidget(w)
        w.doc.edit("slope", 0.02, "Change bed slope")
        assert w.autosaver.save_now()
        for path in (w.autosaver.project_file, w.autosaver.meta_file):
            assert stat.S_IMODE(os.stat(path).st_mode) == 0o600, path
    finally:
        os.umask(old)
        w.doc.undo_stack.setClean()


def test_a_start_sweeps_stale_temporary_files_from_the_autosave_folder(qtbot):
    folder = settings.data_folder() / "autosave"
    folder.mkdir(parents=True, exist_ok=True)
    stale = folder / ".0123abcd.json.4194304.k1ll3d00.tmp"     # left by a killed autosave (invented name)
    other = folder / "notes.txt"
    for p in (stale, other):
        p.write_bytes(b"invented")
        t = time.time() - 3600
        os.utime(p, (t, t))
    w = MainWindow()
    qtbot.addWidget(w)
    assert not stale.exists() and other.exists()


def test_a_project_saved_and_a_sheet_exported_from_the_window_follow_the_umask(qtbot, tmp_path, dialogs, monkeypatch):
    """Issue 16 item 12: under umask 022 a new project file and a new sheet get 0644 (the Linux umask(2) manual:
    "0666 & ~022 = 0644" for a file opened with mode 0666); the autosave stays 0600 (above)."""
    from test_gui_sheets import answer_export, wait_for_export
    old = os.umask(0o022)
    try:
        w = MainWindow()
        qtbot.addWidget(w)
        dialogs.save_name = str(tmp_path / "invented.json")
        assert w.save_as()
        answer_export(monkeypatch, path=tmp_path / "invented.pdf", open_after=False)
        w.export_dialog()
        wait_for_export(qtbot, w)
        for path in (tmp_path / "invented.json", tmp_path / "invented.pdf"):
            assert stat.S_IMODE(os.stat(path).st_mode) == 0o644, path
    finally:
        os.umask(old)
        w.doc.undo_stack.setClean()
