"""Starting the window: the QApplication, the first project, recovery, and offscreen screenshots."""

from __future__ import annotations

import os
import sys
import traceback
from pathlib import Path

MIN_SCREENSHOT = (1280, 800)
SCREENSHOT_SIZE = (1440, 900)


def _application(offscreen: bool = False):
    if offscreen:
        os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
    from PySide6.QtWidgets import QApplication

    from . import settings
    app = QApplication.instance()
    if app is None:
        app = QApplication(sys.argv[:1])
        settings.set_application_names(app)
        from PySide6.QtGui import QIcon
        from importlib import resources as ir
        icon = ir.files("resources").joinpath("icons/ditchwright-256.png")
        app.setWindowIcon(QIcon(str(icon)))
    return app


def _show_start_error(exc: BaseException) -> None:
    traceback.print_exception(exc, file=sys.stderr)
    try:
        from PySide6.QtWidgets import QMessageBox
        QMessageBox.critical(None, "Ditchwright could not start",
                             f"Ditchwright could not start:\n\n{type(exc).__name__}: {exc}\n\n"
                             "Details were written to the terminal.")
    except Exception:  # noqa: BLE001 - no dialog possible either; the terminal has the details
        pass


#: The window of the last :func:`run` (kept for the checks in the tests).
last_window = None


def _no_display() -> str:
    """Why no window can open here, or "" (Linux without a display and no platform chosen)."""
    if sys.platform.startswith("linux") and not any(
            os.environ.get(v) for v in ("DISPLAY", "WAYLAND_DISPLAY", "QT_QPA_PLATFORM")):
        return ("no display found (neither DISPLAY nor WAYLAND_DISPLAY is set). Run Ditchwright in a desktop "
                "session, use `ditchwright --screenshot PATH` to render offscreen, or the command-line tools "
                "(`ditchwright calc --help`).")
    return ""


def run(path=None) -> int:
    """Open the window on ``path``; else, after the offer to recover unsaved work (if any is left), on the last
    project opened or saved; else (first start) on the demo project; else on a new project."""
    global last_window
    why = _no_display()
    if why:
        print(f"ditchwright: {why}", file=sys.stderr)
        return 1
    try:
        app = _application()
        from .. import project as pj
        from . import settings
        from .mainwindow import MainWindow
        window = last_window = MainWindow()
        window.show()
        if path is not None:
            window.open_file(path, ask=False)
        elif window.offer_recovery():
            pass
        elif last_project():
            window.open_file(last_project(), ask=False)
        elif not settings.DEMO_SHOWN.read():
            window.doc.load(pj.loads(pj.demo_path().read_text(encoding="utf-8")), None)
            window.statusBar().showMessage("This is the demo project of an invented site. Start your own "
                                           "with File > New project.", 15000)
            settings.DEMO_SHOWN.write(True)
    except Exception as exc:  # noqa: BLE001 - any start-up failure is shown in a dialog, not a traceback
        _show_start_error(exc)
        return 1
    return app.exec()


def last_project() -> str:
    """The project file opened or saved last, if it is still there ("" otherwise)."""
    from . import settings
    files = settings.RECENT_FILES.read()
    return files[0] if files and Path(files[0]).is_file() else ""


def build_window_for(path=None):
    """A window on ``path`` (or the demo), without settings, autosave or dialogs: for screenshots and checks."""
    from .. import project as pj
    from .mainwindow import MainWindow
    project = pj.load(path) if path else pj.loads(pj.demo_path().read_text(encoding="utf-8"))
    window = MainWindow(project, path, persistent=False)
    window.resize(*SCREENSHOT_SIZE)
    return window


def screenshot(out, path=None, tab: int = 0, channel: int = 0) -> int:
    """Render the main window offscreen to the PNG ``out`` (at least 1280x800) and return 0."""
    app = _application(offscreen=True)
    from .. import project as pj
    try:
        window = build_window_for(path)
    except pj.ProjectFileError as exc:
        print(f"ditchwright: error: {exc}", file=sys.stderr)
        return 2
    window.doc.set_current(channel)
    window.tabs.setCurrentIndex(tab)
    window.show()
    for _ in range(3):
        app.processEvents()
    for pic in (window.section_picture, window.rating_picture, window.energy_picture):
        pic.canvas.draw()
    app.processEvents()
    image = window.grab().toImage()
    if image.width() < MIN_SCREENSHOT[0] or image.height() < MIN_SCREENSHOT[1]:
        print(f"ditchwright: error: the window rendered at {image.width()}x{image.height()}, "
              f"below {MIN_SCREENSHOT[0]}x{MIN_SCREENSHOT[1]}", file=sys.stderr)
        return 1
    out = Path(out)
    if not image.save(str(out), "PNG"):
        print(f"ditchwright: error: cannot write {out}", file=sys.stderr)
        return 1
    window.close()
    return 0
