"""The window's autosave: private files, and a sweep of temporary files left by an autosave that was killed."""

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
