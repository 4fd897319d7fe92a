"""Open the window and every dialog on an emulated small screen and report what does not fit.

Run in a fresh process, because the screen and the scale factor are fixed when Qt starts::

    python tests/gui/fit_probe.py 1366 768 1.5 [--shots DIR] [--units us|si] [--maximized]

The screen is the offscreen platform's, given its size in device pixels by a
configuration file (``offscreen:configfile=``); ``QT_SCALE_FACTOR`` sets the
device pixel ratio, so 1366x768 at 1.5 gives Qt a logical screen of 911x512,
as a desktop at 150 % scaling does. Prints one JSON object: for each window
or dialog, its size and the list of what does not fit (empty when all fits).
With ``--shots`` every window is also saved as a PNG in device pixels.

What "fits" means here (the allowances are this program's own choice, not a
standard): a window with its title bar (``TITLE`` logical px) fits in the
screen's available height less a desktop panel (``PANEL`` device px); every
visible button lies inside its window and is not cut by a parent (a button
inside a scroll area counts as reachable when the scroll area's viewport is
inside the window); every visible label is at least as wide as its text needs
(``minimumSizeHint``), a word-wrapped one as tall as its text needs at its
width (``heightForWidth``), and no label or button text is elided with "…";
the writing of each picture in view (title, texts, legend, tick and axis
labels) lies inside its figure. Main views also report their columns' widths.
Settings, recent files and autosaves go to a temporary folder.
"""

from __future__ import annotations

import argparse
import json
import os
import sys
import tempfile
import time
from pathlib import Path

TITLE = 30      # logical px a window manager's title bar takes (allowance)
PANEL = 40      # device px a desktop panel (task bar) takes (allowance)


def configure(width: int, height: int, scale: float, home: Path) -> None:
    """The offscreen screen of ``width`` x ``height`` device px at ``scale``, less a desktop panel at the
    bottom (``PANEL`` device px, so that the screen Qt sees is the area a desktop leaves free); settings under
    ``home``."""
    config = home / "screen.json"
    free = height - PANEL                # the desktop's panel: the offscreen screen has none, so leave it out
    config.write_text(json.dumps({"screens": [{"name": "probe", "x": 0, "y": 0, "width": width, "height": free,
                                               "logicalDpi": 96, "logicalBaseDpi": 96, "dpr": 1}]}))
    os.environ["QT_QPA_PLATFORM"] = f"offscreen:configfile={config}"
    os.environ["QT_SCALE_FACTOR"] = repr(scale)
    os.environ.pop("QT_SCREEN_SCALE_FACTORS", None)
    os.environ.pop("QT_AUTO_SCREEN_SCALE_FACTOR", None)
    os.environ["HOME"] = str(home)


def room(screen) -> "QRect":
    """The part of the screen a window's inside may take: the available area (panel left out) less a title bar."""
    from PySide6.QtCore import QRect
    a = screen.availableGeometry()
    return QRect(a.x(), a.y(), a.width(), a.height() - TITLE)


def _scroll_area_of(widget, top):
    """The nearest scroll area whose viewport holds ``widget`` (None when none does, up to ``top``)."""
    from PySide6.QtWidgets import QAbstractScrollArea
    w = widget.parentWidget()
    while w is not None and w is not top:
        parent = w.parentWidget()
        if isinstance(parent, QAbstractScrollArea) and w is parent.viewport():
            return parent
        w = parent
    return None


def _clipped(widget, top) -> bool:
    """True when a parent (up to the window) cuts part of ``widget`` off in a direction no scroll bar shown
    reaches (a form in a scroll area is cut above and below on purpose, and sideways when it scrolls sideways)."""
    from PySide6.QtCore import QPoint
    from PySide6.QtWidgets import QAbstractScrollArea
    at = widget.mapTo(top, QPoint(0, 0))
    x0, x1, y0, y1 = at.x(), at.x() + widget.width(), at.y(), at.y() + widget.height()
    across = down = True             # whether a cut across (in width) or down (in height) counts
    w = widget.parentWidget()
    while w is not None and w is not top:
        parent = w.parentWidget()
        if isinstance(parent, QAbstractScrollArea) and w is parent.viewport():
            across = across and not parent.horizontalScrollBar().isVisible()
            down = down and not parent.verticalScrollBar().isVisible()
        p = w.mapTo(top, QPoint(0, 0))
        if across:
            x0, x1 = max(x0, p.x()), min(x1, p.x() + w.width())
        if down:
            y0, y1 = max(y0, p.y()), min(y1, p.y() + w.height())
        w = parent
    return x1 - x0 < widget.width() - 1 or y1 - y0 < widget.height() - 1     # a pixel of rounding allowed


def _name(widget) -> str:
    text = widget.text() if hasattr(widget, "text") else ""
    return f"{type(widget).__name__} {widget.objectName() or ''} {text[:60]!r}".replace("  ", " ")


def elided(widget) -> bool:
    """True when the text shown is cut short with "…" (the whole of it kept in the tooltip); "Choose…" on a
    button that opens a dialog is not elided."""
    text = widget.text()
    return text.endswith("…") and len(widget.toolTip()) > len(text) and widget.toolTip().startswith(text[:-1])


def problems(top, screen) -> list[str]:
    """What of the window ``top`` does not fit the screen, in words (empty when everything fits)."""
    from PySide6.QtCore import QPoint, QRect
    from PySide6.QtWidgets import QAbstractButton, QLabel
    out = []
    space = room(screen)
    size = top.size()
    if size.width() > space.width() or size.height() > space.height():
        out.append(f"the window is {size.width()}x{size.height()}, the screen has room for "
                   f"{space.width()}x{space.height()}")
    inside = top.rect().adjusted(-1, -1, 1, 1)      # a pixel of rounding at fractional scale factors
    for b in top.findChildren(QAbstractButton):
        if not b.isVisible() or b.window() is not top:
            continue
        if elided(b):
            out.append(f"text elided: {_name(b)}")
        area = _scroll_area_of(b, top)
        target = area.viewport() if area is not None else b
        r = QRect(target.mapTo(top, QPoint(0, 0)), target.size())
        if not inside.contains(r) or _clipped(target, top) or (area is not None and _clipped(b, top)):
            out.append(f"out of reach: {_name(b)} at {r.x()},{r.y()} {r.width()}x{r.height()}")
        elif area is None and b.width() < b.minimumSizeHint().width():
            out.append(f"squeezed: {_name(b)} {b.width()} px wide, needs {b.minimumSizeHint().width()}")
    for lab in top.findChildren(QLabel):
        if not lab.isVisible() or not lab.text() or lab.window() is not top or lab.width() == 0:
            continue
        if elided(lab):
            out.append(f"text elided: {_name(lab)}")
        if lab.wordWrap():
            need = lab.heightForWidth(lab.width())
            if need > lab.height() + 1:
                out.append(f"cut: {_name(lab)} {lab.height()} px high, needs {need} at {lab.width()} wide")
        elif lab.width() < lab.minimumSizeHint().width():
            out.append(f"cut: {_name(lab)} {lab.width()} px wide, needs {lab.minimumSizeHint().width()}")
        if _clipped(lab, top):
            out.append(f"cut by its parent: {_name(lab)}")
    return out


def figure_cut(picture) -> list[str]:
    """What of a matplotlib picture's writing (titles, texts, legend, and the tick labels and label of each axis
    drawn) reaches past its figure, in words."""
    fig = picture.figure
    renderer = fig.canvas.get_renderer()
    box = fig.bbox
    pieces = [(t.get_text(), t) for t in fig.texts]
    for ax in fig.axes:
        pieces += [(t.get_text(), t) for t in (*ax.texts, ax.title, ax._left_title, ax._right_title)]
        legend = ax.get_legend()
        if legend is not None and legend.get_visible():
            pieces.append(("legend", legend))
        if ax.axison:
            pieces += [("x axis", ax.xaxis), ("y axis", ax.yaxis)]
    out = []
    for name, artist in pieces:
        if not artist.get_visible() or not name.strip():
            continue
        e = artist.get_tightbbox(renderer) if name in ("x axis", "y axis") else artist.get_window_extent(renderer)
        if e is None or e.width == 0:
            continue
        if e.x0 < box.x0 - 1 or e.x1 > box.x1 + 1 or e.y0 < box.y0 - 1 or e.y1 > box.y1 + 1:
            out.append(f"figure text cut: {name[:60]!r} at {e.x0:.0f}..{e.x1:.0f} x {e.y0:.0f}..{e.y1:.0f}, "
                       f"figure {box.width:.0f}x{box.height:.0f}")
    return out


def page_scrolls(top) -> str:
    """Which way the window's form (the main window's page, a dialog's form) scrolls: "", "down", "across" or
    "both" (``app.gui.screen_fit.scrolling`` areas, named formScroll)."""
    from PySide6.QtWidgets import QScrollArea
    across = down = False
    for area in top.findChildren(QScrollArea, "formScroll"):
        if area.window() is top and area.isVisible():
            across = across or area.horizontalScrollBar().isVisible()
            down = down or area.verticalScrollBar().isVisible()
    return {(False, False): "", (False, True): "down", (True, False): "across", (True, True): "both"}[across, down]


class Probe:
    def __init__(self, app, shots: Path | None):
        self.app = app
        self.shots = shots
        self.report = {}
        self.window = None       # the main window, once made: its worker threads are waited for

    def settle(self, rounds: int = 4) -> None:
        """Let Qt lay out and paint, after the window's channel result, its lining comparison and run (computed off
        its thread) are in."""
        import time
        end = time.monotonic() + 60
        while self.window is not None and time.monotonic() < end and not (
                self.window.evaluator.idle and self.window.comparison.computer.idle
                and (self.window.run_view is None or self.window.run_view.idle)):
            self.app.processEvents()
            time.sleep(0.01)
        for _ in range(rounds):
            self.app.processEvents()

    def look(self, name: str, top, pictures=()) -> None:
        """Show ``top`` (if it is not shown), check it and the matplotlib ``pictures`` in it (drawn), and save
        its picture."""
        if not top.isVisible():
            top.show()
        self.settle()
        screen = top.screen()
        found = problems(top, screen)
        for picture in pictures:
            found += figure_cut(picture)
        self.report[name] = {"size": [top.width(), top.height()], "problems": found,
                             "scrolls": page_scrolls(top)}
        if self.shots is not None:
            self.shots.mkdir(parents=True, exist_ok=True)
            top.grab().save(str(self.shots / f"{name}.png"), "PNG")


def message_boxes(probe: Probe):
    """QMessageBox's static functions and exec, replaced: each box is shown, looked at, and answered."""
    from PySide6.QtWidgets import QMessageBox
    seen = {"n": 0}

    def shown(box):
        seen["n"] += 1
        probe.look(f"message-{seen['n']}-{box.windowTitle().lower().replace(' ', '-')[:30]}", box)
        box.close()

    def static(kind):
        icon = {"warning": QMessageBox.Icon.Warning, "critical": QMessageBox.Icon.Critical,
                "question": QMessageBox.Icon.Question, "information": QMessageBox.Icon.Information}[kind]

        def ask(parent, title, text, buttons=QMessageBox.StandardButton.Ok, default=None):
            box = QMessageBox(icon, title, text, buttons, parent)
            shown(box)
            return QMessageBox.StandardButton.Cancel if buttons & QMessageBox.StandardButton.Cancel \
                else QMessageBox.StandardButton.No
        return ask

    for kind in ("warning", "critical", "question", "information"):
        setattr(QMessageBox, kind, staticmethod(static(kind)))

    def about(parent, title, text):
        box = QMessageBox(parent)
        box.setWindowTitle(title)
        box.setText(text)
        box.setIconPixmap(parent.windowIcon().pixmap(64, 64) if parent is not None else box.iconPixmap())
        shown(box)
    QMessageBox.about = staticmethod(about)
    QMessageBox.exec = lambda self: shown(self)


def run(args) -> dict:
    from PySide6.QtCore import QSettings, QStandardPaths
    from PySide6.QtWidgets import QApplication, QFileDialog, QInputDialog

    from app import project as pj
    from app.gui import settings
    app = QApplication([sys.argv[0]])
    settings.set_application_names(app)
    QStandardPaths.setTestModeEnabled(True)
    for fmt in (QSettings.Format.NativeFormat, QSettings.Format.IniFormat):
        QSettings.setPath(fmt, QSettings.Scope.UserScope, os.environ["HOME"])
    QFileDialog.getOpenFileName = staticmethod(lambda *a, **k: ("", ""))
    QFileDialog.getSaveFileName = staticmethod(lambda *a, **k: ("", ""))
    QInputDialog.getText = staticmethod(lambda *a, **k: ("", False))
    probe = Probe(app, Path(args.shots) if args.shots else None)
    message_boxes(probe)

    from app.gui.mainwindow import MainWindow
    from app.gui.sheet_dialogs import ExportSheetDialog, NotesDialog, SheetDetailsDialog
    demo = pj.loads(pj.demo_path().read_text(encoding="utf-8"))
    w = MainWindow(demo, persistent=False)
    probe.window = w
    w.doc.set_units(args.units)
    if args.maximized:                   # as a maximised window: the screen's room less the title bar
        w.resize(room(w.screen()).size())
    w.show()
    probe.settle()
    names = [c.name for c in w.doc.project.channels]
    outfall = names.index(args.channel) if args.channel in names else \
        next(i for i, c in enumerate(w.doc.project.channels) if c.alternatives)
    for tab, name in enumerate(("section", "rating", "energy", "comparison")):
        w.doc.set_current(outfall)
        w.show_channels(tab)
        probe.settle()
        shown = [p for p in (w.section_picture, w.rating_picture, w.energy_picture) if p.canvas.isVisible()]
        for pic in (w.section_picture, w.rating_picture, w.energy_picture):
            pic.canvas.draw()
        probe.look(f"main-{name}", w, shown)
        probe.report[f"main-{name}"]["columns"] = [wd.width() for wd in (w.splitter.widget(i) for i in
                                                   range(w.splitter.count())) if wd.isVisible()]
    if w.doc.project.runs:
        w.show_runs()
        view = w.run_view
        for _ in range(600):             # the run is solved in a worker thread
            probe.settle(1)
            if view.idle and view.design is not None:
                break
            time.sleep(0.05)
        probe.settle()
        view.picture.canvas.draw()
        probe.look("main-runs", w, [view.picture])
        probe.report["main-runs"]["columns"] = [wd.width() for wd in (view.splitter.widget(i) for i in
                                                range(view.splitter.count())) if wd.isVisible()]
        probe.report["main-runs"]["picture"] = [view.picture.canvas.width(), view.picture.canvas.height()]
        # the dialogs that edit a sub-area (land covers; TR-55 segments) and a section range
        run = w.doc.project.runs[0]
        for name, items, row in (("run-sub-area-covers", "sub_areas", next(
                (i for i, sa in enumerate(run.sub_areas) if sa.land_covers), 0)),
                                 ("run-sub-area-tr55", "sub_areas", next(
                (i for i, sa in enumerate(run.sub_areas) if sa.time_of_concentration["method"] == "tr55"), 0)),
                                 ("run-section", "sections", 0)):
            if row < len(getattr(run, items)):
                d = view.item_dialog(items, row)
                probe.look(name, d)
                d.close()
                d.deleteLater()
        w.show_channels(0)

    for name, make in (("sheet-details", lambda: SheetDetailsDialog(w.doc.project.sheet, parent=w)),
                       ("sheet-export", lambda: ExportSheetDialog(w.doc.project, w.doc.current, modified=True,
                                                                  parent=w)),
                       ("project-notes", lambda: NotesDialog(w.doc.project.notes, parent=w))):
        d = make()
        probe.look(name, d)
        if name == "sheet-export":         # the complaint under the form, and the signature part in use
            d.sign.setChecked(True)
            d._accept_if_complete()
            probe.look("sheet-export-complaint", d)
        d.close()
        d.deleteLater()

    from app.gui.rainfall_dialog import RainfallDialog
    for name, rainfall in (("rainfall", w.doc.project.rainfall), ("rainfall-empty", None)):
        d = RainfallDialog(rainfall, w.doc.units, parent=w)
        probe.look(name, d)
        if rainfall is not None:          # a refused cell: the core's message under the grid
            d.grid.item(2, 1).setText("900")
            probe.look("rainfall-complaint", d)
            d.kind.setCurrentIndex(d.kind.findData("formula"))
            probe.look("rainfall-formula", d)
        d.close()
        d.deleteLater()

    w.open_inventory()
    inv = w.inventory_dialog
    probe.look("inventory", inv)
    if args.inventory:
        inv.path.setText(args.inventory)         # as given: a relative name is read from the current folder
        inv.units.setCurrentIndex(inv.units.findData(args.units))
        inv.start_check()
        for _ in range(1200):
            probe.settle(1)
            if inv.task is None:
                break
            time.sleep(0.05)
        probe.settle()
        inv.table.selectRow(args.inventory_row)
        probe.look("inventory-checked", inv)
    inv.close()

    # the questions and notices of the window
    w.about()
    w.doc.add_channel()                  # an edit, so that closing asks about unsaved changes
    w.maybe_save()
    w.ask_file_changed(Path(os.environ["HOME"]) / "a-project-someone-else-changed.ditchwright.json")
    from app.gui.autosave import Recoverable
    w.ask_recovery(Recoverable("s", Path(os.environ["HOME"]) / "s.json",
                               str(Path(os.environ["HOME"]) / "projects" / "Invented county roads 2025.json"),
                               time.time() - 600, "Invented county roads"))
    w.autosave_failed("the disk is full")
    w.doc.undo_stack.setClean()
    w.close()
    return probe.report


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("width", type=int)
    parser.add_argument("height", type=int)
    parser.add_argument("scale", type=float)
    parser.add_argument("--units", choices=("us", "si"), default="us")
    parser.add_argument("--shots", default="")
    parser.add_argument("--inventory", default="", help="an inventory CSV to check in the inventory dialog")
    parser.add_argument("--inventory-row", type=int, default=0, help="the row chosen in the checked inventory")
    parser.add_argument("--channel", default="", help="the demo channel shown (one with linings to compare if not given)")
    parser.add_argument("--maximized", action="store_true", help="the main window takes the screen's whole room")
    args = parser.parse_args(argv)
    with tempfile.TemporaryDirectory(prefix="ditchwright-fit-") as home:
        configure(args.width, args.height, args.scale, Path(home))
        report = run(args)
    print(json.dumps(report, indent=1))
    return 0


if __name__ == "__main__":
    sys.exit(main())
