"""Render the README screenshots from the demo project (offscreen).

    QT_QPA_PLATFORM=offscreen python docs/screenshots/render.py

Writes section.png (a lining that holds), failing-lining.png (one that does not)
and comparison.png (four linings side by side) next to this file, at 1440x900,
and inventory.png: File > Check an inventory... on invented-inventory.csv (an
invented road inventory of 60 reaches, some of them faulty on purpose), at
1440x860.
"""

import os
import sys
import time
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
    inventory(app, window)
    return 0


def inventory(app, window) -> None:
    """The inventory check on the invented inventory, one faulty row chosen."""
    os.chdir(HERE.parents[1])           # the file name shows relative to the repository
    window.open_inventory()
    dialog = window.inventory_dialog
    dialog.path.setText("docs/screenshots/invented-inventory.csv")
    dialog.units.setCurrentIndex(dialog.units.findData("us"))
    dialog.start_check()
    while dialog.task is not None:
        app.processEvents()
        time.sleep(0.01)
    dialog.resize(1440, 860)
    dialog.table.selectRow(9)           # line 11: a misspelt shape
    for _ in range(4):
        app.processEvents()
    dialog.grab().save(str(HERE / "inventory.png"))
    print(HERE / "inventory.png")


if __name__ == "__main__":
    sys.exit(main())
