"""The program's names for Qt, and every persistent setting, declared once.

Nothing else in the window spells a settings key: it reads and writes the
:class:`Setting` objects below, which carry the key, the type QSettings must
convert to (QSettings returns strings otherwise), the default and what the
setting is for.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from PySide6.QtCore import QByteArray, QCoreApplication, QSettings, QStandardPaths

from .. import __version__

ORGANISATION = "Ditchwright"
ORGANISATION_DOMAIN = "ditchwright.github.io"
APPLICATION = "Ditchwright"
DESKTOP_FILE = "io.github.ditchwright.Ditchwright"


def set_application_names(app: QCoreApplication) -> None:
    """Called once, right after the QApplication is made and before any QSettings or path is used."""
    app.setOrganizationName(ORGANISATION)
    app.setOrganizationDomain(ORGANISATION_DOMAIN)
    app.setApplicationName(APPLICATION)
    app.setApplicationVersion(__version__)
    if hasattr(app, "setDesktopFileName"):
        app.setDesktopFileName(DESKTOP_FILE)


@dataclass(frozen=True)
class Setting:
    key: str
    type: type
    default: object
    doc: str

    def read(self, store: QSettings | None = None):
        store = store if store is not None else QSettings()
        value = store.value(self.key, self.default, type=self.type)
        return value if value is not None else self.default

    def write(self, value, store: QSettings | None = None) -> None:
        store = store if store is not None else QSettings()
        store.setValue(self.key, value)


WINDOW_GEOMETRY = Setting("window/geometry", QByteArray, QByteArray(), "size and place of the main window")
WINDOW_STATE = Setting("window/state", QByteArray, QByteArray(), "tool bar placement")
SPLITTER_STATE = Setting("window/splitter", QByteArray, QByteArray(), "widths of inputs, picture and results")
RECENT_FILES = Setting("files/recent", list, [], "project files opened or saved, most recent first")
LAST_FOLDER = Setting("files/last_folder", str, "", "folder of the last project opened or saved")
DEMO_SHOWN = Setting("start/demo_shown", bool, False, "the demo project was opened on the first start")
SHEET_PAGE = Setting("sheet/page", str, "", "paper of the last design-sheet export: letter or a4 (\"\": by units)")
SHEET_OPEN = Setting("sheet/open_after", bool, True, "open the PDF after a design-sheet export")
SHEET_FOLDER = Setting("sheet/folder", str, "", "folder of the last design-sheet export")
CERTIFICATE = Setting("sheet/certificate", str, "", "the PKCS#12 file last used to sign (its path only; "
                      "the password is never stored)")
INVENTORY_FOLDER = Setting("inventory/folder", str, "", "folder of the last inventory checked")
INVENTORY_UNITS = Setting("inventory/units", str, "", "units of the last inventory checked: us or si")

ALL = (WINDOW_GEOMETRY, WINDOW_STATE, SPLITTER_STATE, RECENT_FILES, LAST_FOLDER, DEMO_SHOWN, SHEET_PAGE, SHEET_OPEN,
       SHEET_FOLDER, CERTIFICATE, INVENTORY_FOLDER, INVENTORY_UNITS)
MAX_RECENT = 8


def add_recent(path: str) -> list:
    """Put ``path`` first in the recent-files list and return the list."""
    path = str(Path(path).resolve())
    files = [f for f in RECENT_FILES.read() if f != path]
    files.insert(0, path)
    files = files[:MAX_RECENT]
    RECENT_FILES.write(files)
    return files


def user_catalogue_path() -> Path:
    """The user's lining catalogue (TOML, the shipped layout): own linings, unit costs."""
    return data_folder() / "user-linings.toml"


def data_folder() -> Path:
    """The user's data folder for this program (QStandardPaths AppDataLocation)."""
    return Path(QStandardPaths.writableLocation(QStandardPaths.StandardLocation.AppDataLocation))
