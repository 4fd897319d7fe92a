"""The core stays pure: importing it loads no GUI, plotting or PDF library."""

import subprocess
import sys


def test_hydraulics_imports_no_gui_plot_or_pdf_library():
    code = ("import sys, hydraulics, hydraulics.analysis, hydraulics.design; "
            "bad = [m for m in ('PySide6', 'matplotlib', 'reportlab', 'PyQt5', 'PyQt6') if m in sys.modules]; "
            "print(','.join(bad))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == ""
