"""Render the README screenshots from the demo project (offscreen).

    QT_QPA_PLATFORM=offscreen python docs/screenshots/render.py

Writes section.png (a lining that holds), failing-lining.png (one that does not)
and comparison.png (four linings side by side) next to this file, at 1440x900.
"""

import os
import sys
from pathlib import Path

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
sys.path.insert(0, str(Path(__file__).resolve().parents[2]))

from PySide6.QtWidgets import QApplication  # noqa: E402

from app.gui import settings  # noqa: E402
from app.gui.application import build_window_for  # noqa: E402

HERE = Path(__file__).resolve().parent
SHOTS = (("section.png", "Outfall swale", 0), ("failing-lining.png", "North cut ditch", 0),
         ("comparison.png", "Outfall swale", 3))


def main() -> int:
    app = QApplication.instance() or QApplication([])
    settings.set_application_names(app)
    window = build_window_for(None)
    window.show()
    names = [c.name for c in window.doc.project.channels]
    for file, channel, tab in SHOTS:
        window.doc.set_current(names.index(channel))
        window.tabs.setCurrentIndex(tab)
        for _ in range(3):
            app.processEvents()
        for picture in (window.section_picture, window.rating_picture, window.energy_picture):
            picture.canvas.draw()
        app.processEvents()
        window.grab().save(str(HERE / file))
        print(HERE / file)
    return 0


if __name__ == "__main__":
    sys.exit(main())
