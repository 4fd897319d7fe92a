"""The window survives a long session of Qt calls (the None guard of app.gui.qtfix)."""

import subprocess
import sys
import textwrap


def test_many_qt_calls_do_not_exhaust_none():
    # 50,000 calls that return nothing: without the guard, PySide6 6.12 on CPython 3.11 aborts with
    # "none_dealloc" after a few thousand; with it (or on an interpreter without the fault) all is well.
    code = textwrap.dedent("""
        import os, sys
        os.environ["QT_QPA_PLATFORM"] = "offscreen"
        import app.gui.fields
        from PySide6.QtWidgets import QApplication, QLabel
        qapp = QApplication([])
        label = QLabel()
        for i in range(50_000):
            label.setText("x")
            label.setVisible(False)
        print("ok", app.gui.fields.qtfix.APPLIED)
    """)
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=300)
    assert out.returncode == 0, out.stderr[-2000:]
    assert out.stdout.startswith("ok")
