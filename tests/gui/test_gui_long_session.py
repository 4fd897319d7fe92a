"""The window survives a long session of Qt calls.

PySide6-Essentials 6.12.0 on CPython 3.11 gives back a reference to None that it never took on every Qt
call that returns nothing; after a few thousand calls (a few dozen edits in the window) the interpreter
aborts with "none_dealloc: deallocating None". pyproject.toml excludes that release; this test fails if
an installed binding has the fault again.
"""

import subprocess
import sys
import textwrap


def test_many_qt_calls_do_not_exhaust_none():
    code = textwrap.dedent("""
        import os, sys
        os.environ["QT_QPA_PLATFORM"] = "offscreen"
        from PySide6.QtWidgets import QApplication, QLabel
        qapp = QApplication([])
        label = QLabel()
        before = sys.getrefcount(None)
        for i in range(50_000):
            label.setText("x")
            label.setVisible(False)
        print("ok", sys.getrefcount(None) - before)
    """)
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=300)
    assert out.returncode == 0, out.stderr[-2000:]
    assert out.stdout.startswith("ok")
    assert int(out.stdout.split()[1]) > -1000  # no steady loss of references to None
