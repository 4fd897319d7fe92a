"""Dialogs around the design sheet: its title-block facts, the export itself, the certificate password,
and the project's notes.

The dialogs only collect what the user chooses; the window turns it into an
undoable edit (details, notes) or runs the export (see
:meth:`app.gui.mainwindow.MainWindow.export_sheets`). Nothing here stores a
password: :func:`ask_password` returns it to the caller, which hands it to
the signing and lets it go.
"""

from __future__ import annotations

import dataclasses
import datetime
from dataclasses import dataclass
from pathlib import Path

from PySide6.QtCore import Qt
from PySide6.QtGui import QPixmap
from PySide6.QtWidgets import (QButtonGroup, QCheckBox, QComboBox, QDialog, QDialogButtonBox, QFileDialog,
                               QGridLayout, QGroupBox, QHBoxLayout, QInputDialog, QLabel, QLineEdit,
                               QPlainTextEdit, QPushButton, QRadioButton, QVBoxLayout, QWidget)

from .. import project as pj
from ..files import safe_file_name
from .fields import message_line
from .screen_fit import fit_to_screen, scrolling
from .style import STYLE

PAPERS = (("letter", "Letter (8.5 × 11 in)"), ("a4", "A4 (210 × 297 mm)"))
PDF_FILTER = "PDF files (*.pdf);;All files (*)"
KEY_FILTER = "PKCS#12 key files (*.p12 *.pfx);;All files (*)"
IMAGE_FILTER = "Images (*.png *.jpg *.jpeg *.svg);;All files (*)"
#: Sign-off roles of the title block: (label, name attribute, date attribute).
ROLES = (("Designed by", "designer", "date_designed"), ("Checked by", "checker", "date_checked"),
         ("Approved by", "approver", "date_approved"))


def _hint(text: str) -> QLabel:
    label = QLabel(text)
    label.setObjectName("hint")
    label.setWordWrap(True)
    return label


# ----------------------------------------------------------------------------- sheet details

class SheetDetailsDialog(QDialog):
    """The title-block facts printed on every sheet: company, logo, project number, revision, sign-off."""

    def __init__(self, info: pj.SheetInfo, parent=None):
        super().__init__(parent)
        self.setWindowTitle("Sheet details")
        self.setStyleSheet(STYLE)
        self.setObjectName("sheetDetails")
        self.edits: dict[str, QLineEdit] = {}
        outer = QVBoxLayout(self)
        body = QWidget()
        lay = QVBoxLayout(body)
        lay.setContentsMargins(0, 0, 0, 0)
        lay.setSpacing(10)
        lay.addWidget(_hint("These facts go into the title block of every design sheet of this project. "
                            "They are saved with the project and printed as typed."))

        box = QGroupBox("Company")
        g = QGridLayout(box)
        g.setColumnStretch(1, 1)
        g.setColumnMinimumWidth(0, 110)
        g.addWidget(QLabel("Name"), 0, 0)
        g.addWidget(self._edit("company", info.company, "the firm or agency that issues the sheet"), 0, 1, 1, 3)
        g.addWidget(QLabel("Logo"), 1, 0)
        g.addWidget(self._edit("logo", info.logo, "PNG, JPEG or SVG file (optional)"), 1, 1)
        choose = QPushButton("Choose…")
        choose.clicked.connect(self._choose_logo)
        clear = QPushButton("Clear")
        clear.clicked.connect(lambda: self.edits["logo"].setText(""))
        g.addWidget(choose, 1, 2)
        g.addWidget(clear, 1, 3)
        self.logo_preview = QLabel()
        self.logo_preview.setObjectName("logoPreview")
        self.logo_preview.setFixedHeight(48)
        self.logo_preview.setAlignment(Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter)
        g.addWidget(self.logo_preview, 2, 1, 1, 3)
        self.edits["logo"].textChanged.connect(self._show_logo)
        lay.addWidget(box)

        box = QGroupBox("Project")
        g = QGridLayout(box)
        g.setColumnStretch(1, 1)
        g.setColumnStretch(3, 1)
        g.setColumnMinimumWidth(0, 110)
        g.addWidget(QLabel("Project number"), 0, 0)
        g.addWidget(self._edit("project_number", info.project_number, "e.g. 2025-014"), 0, 1)
        g.addWidget(QLabel("Revision"), 0, 2)
        g.addWidget(self._edit("revision", info.revision, "e.g. A, or 0"), 0, 3)
        lay.addWidget(box)

        box = QGroupBox("Sign-off")
        g = QGridLayout(box)
        g.setColumnStretch(1, 2)
        g.setColumnStretch(2, 1)
        g.setColumnMinimumWidth(0, 110)
        head_name, head_date = QLabel("Name"), QLabel("Date")
        for h in (head_name, head_date):
            h.setObjectName("hint")
        g.addWidget(head_name, 0, 1)
        g.addWidget(head_date, 0, 2)
        for row, (label, name, date) in enumerate(ROLES, start=1):
            g.addWidget(QLabel(label), row, 0)
            g.addWidget(self._edit(name, getattr(info, name), "name and initials"), row, 1)
            g.addWidget(self._edit(date, getattr(info, date), "YYYY-MM-DD"), row, 2)
            today = QPushButton("Today")
            today.setObjectName(f"today_{date}")
            today.setToolTip("Put today's date in this box")
            today.clicked.connect(lambda _=False, d=date: self.edits[d].setText(datetime.date.today().isoformat()))
            g.addWidget(today, row, 3)
        lay.addWidget(box)
        lay.addWidget(_hint("The wet signatures go on the printout; a digital signature is added when a sheet is "
                            "exported with a certificate."))
        lay.addStretch(1)
        outer.addWidget(scrolling(body), 1)     # a short screen scrolls the form; the buttons stay in view

        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Ok | QDialogButtonBox.StandardButton.Cancel)
        buttons.accepted.connect(self.accept)
        buttons.rejected.connect(self.reject)
        outer.addWidget(buttons)
        self._show_logo()
        fit_to_screen(self, 620, self.sizeHint().height())

    def _edit(self, key: str, text: str, placeholder: str = "") -> QLineEdit:
        e = QLineEdit(text)
        e.setObjectName(key)
        e.setPlaceholderText(placeholder)
        self.edits[key] = e
        return e

    def _choose_logo(self) -> None:
        current = self.edits["logo"].text()
        path, _ = QFileDialog.getOpenFileName(self, "Company logo", str(Path(current).parent) if current else "",
                                              IMAGE_FILTER)
        if path:
            self.edits["logo"].setText(path)

    def _show_logo(self) -> None:
        path = self.edits["logo"].text().strip()
        label = self.logo_preview
        label.setPixmap(QPixmap())
        label.setObjectName("hint")
        if not path:
            label.setText("No logo: the logo slot of the title block stays empty.")
        elif not Path(path).is_file():
            label.setObjectName("fieldMessage")
            label.setText("No such file; the sheet will say the logo was not found.")
        elif path.lower().endswith(".svg"):
            label.setText("SVG logo (drawn as vectors on the sheet).")
        else:
            pix = QPixmap(path)
            if pix.isNull():
                label.setObjectName("fieldMessage")
                label.setText("This file cannot be read as an image.")
            else:
                label.setPixmap(pix.scaledToHeight(44, Qt.TransformationMode.SmoothTransformation))
        label.style().unpolish(label)
        label.style().polish(label)

    def info(self) -> pj.SheetInfo:
        """The facts as typed (surrounding blanks removed)."""
        values = {f.name: self.edits[f.name].text().strip() for f in dataclasses.fields(pj.SheetInfo)}
        return pj.SheetInfo(**values)


# ----------------------------------------------------------------------------- export

@dataclass
class ExportChoice:
    """What the user chose in the export dialog."""

    path: Path
    channels: list | None     # channel names; None for the whole project
    page: str                 # "letter" | "a4"
    certificate: str | None   # PKCS#12 file to sign with, or None
    open_after: bool


class ExportSheetDialog(QDialog):
    """Which sheets, on what paper, to which file, signed or not."""

    def __init__(self, project: pj.Project, current: int, *, modified: bool, folder: str = "", page: str = "",
                 certificate: str = "", open_after: bool = True, parent=None):
        super().__init__(parent)
        self.project = project
        self.setWindowTitle("Export design sheets")
        self.setObjectName("exportSheets")
        self.setStyleSheet(STYLE)
        outer = QVBoxLayout(self)
        body = QWidget()
        lay = QVBoxLayout(body)
        lay.setContentsMargins(0, 0, 0, 0)
        lay.setSpacing(10)
        channel = project.channels[current]
        count = len(project.channels)

        box = QGroupBox("Sheets")
        v = QVBoxLayout(box)
        self.one = QRadioButton(f"This channel only: {channel.name}")
        self.one.setObjectName("exportCurrent")
        self.all = QRadioButton(f"The whole project: {count} channel{'s' if count != 1 else ''}, "
                                "one sheet each, in one PDF")
        self.all.setObjectName("exportAll")
        self.scope = QButtonGroup(self)
        self.scope.addButton(self.one)
        self.scope.addButton(self.all)
        self.one.setChecked(True)
        self.current_name = channel.name
        v.addWidget(self.one)
        v.addWidget(self.all)
        row = QHBoxLayout()
        row.addWidget(QLabel("Paper"))
        self.paper = QComboBox()
        self.paper.setObjectName("paper")
        for key, text in PAPERS:
            self.paper.addItem(text, key)
        default = page if page in dict(PAPERS) else ("a4" if project.units == "si" else "letter")
        self.paper.setCurrentIndex(self.paper.findData(default))
        row.addWidget(self.paper)
        row.addStretch(1)
        v.addLayout(row)
        lay.addWidget(box)

        box = QGroupBox("File")
        g = QGridLayout(box)
        g.setColumnStretch(0, 1)
        self.folder = folder or str(Path.home())
        self.path = QLineEdit()
        self.path.setObjectName("sheetPath")
        self.path.setMinimumWidth(300)
        browse = QPushButton("Choose…")
        browse.clicked.connect(self._choose_path)
        g.addWidget(self.path, 0, 0)
        g.addWidget(browse, 0, 1)
        self.open_after = QCheckBox("Open the PDF when it is written")
        self.open_after.setObjectName("openAfter")
        self.open_after.setChecked(open_after)
        g.addWidget(self.open_after, 1, 0, 1, 2)
        lay.addWidget(box)
        self._suggest_path()
        self.one.toggled.connect(self._suggest_path)

        box = QGroupBox("Digital signature")
        g = QGridLayout(box)
        g.setColumnStretch(0, 1)
        self.sign = QCheckBox("Sign the PDF with my certificate (PKCS#12 file)")
        self.sign.setObjectName("sign")
        self.certificate = QLineEdit(certificate)
        self.certificate.setObjectName("certificate")
        self.certificate.setPlaceholderText(".p12 or .pfx file with your key and certificate")
        self.cert_browse = QPushButton("Choose…")
        self.cert_browse.clicked.connect(self._choose_certificate)
        g.addWidget(self.sign, 0, 0, 1, 2)
        g.addWidget(self.certificate, 1, 0)
        g.addWidget(self.cert_browse, 1, 1)
        g.addWidget(_hint("The password is asked for when you export and is used for this signature only; "
                          "it is never saved. The visible stamp goes in the approval box of sheet 1."), 2, 0, 1, 2)
        self.sign.toggled.connect(self._sign_toggled)
        self._sign_toggled(False)
        lay.addWidget(box)

        if modified:
            lay.addWidget(_hint("The project has unsaved changes. The sheets show it as it is in the window; "
                                "save the project so that its file matches the fingerprints printed on them."))
        lay.addWidget(_hint("Design sheets assist design: a licensed engineer checks and approves them against "
                            "local codes."))
        lay.addStretch(1)
        outer.addWidget(scrolling(body), 1)     # a short screen scrolls the form; the buttons stay in view
        self.message = message_line()          # what is missing, next to the buttons where it is seen
        outer.addWidget(self.message)
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Cancel)
        self.export_button = buttons.addButton("Export", QDialogButtonBox.ButtonRole.AcceptRole)
        self.export_button.setDefault(True)
        buttons.accepted.connect(self._accept_if_complete)
        buttons.rejected.connect(self.reject)
        outer.addWidget(buttons)
        fit_to_screen(self, 640, self.sizeHint().height())

    def _suggest_path(self, *_args) -> None:
        """A file name from the project (and channel), in the last export folder, unless the user typed one."""
        typed = self.path.text().strip()
        if typed and typed != getattr(self, "_suggested", None):
            return
        stem = self.project.name + (f" - {self.current_name}" if self.one.isChecked() else "")
        self._suggested = str(Path(self.folder) / safe_file_name(stem, ".pdf", fallback="design-sheets"))
        self.path.setText(self._suggested)

    def _choose_path(self) -> None:
        path, _ = QFileDialog.getSaveFileName(self, "Save design sheets as", self.path.text(), PDF_FILTER)
        if path:
            self.path.setText(path)

    def _choose_certificate(self) -> None:
        current = self.certificate.text()
        path, _ = QFileDialog.getOpenFileName(self, "Certificate to sign with",
                                              str(Path(current).parent) if current else "", KEY_FILTER)
        if path:
            self.certificate.setText(path)
            self.sign.setChecked(True)

    def _sign_toggled(self, on: bool) -> None:
        self.certificate.setEnabled(on)
        self.cert_browse.setEnabled(on)

    def complaint(self) -> str:
        """Why the choice cannot be exported yet, or ""."""
        text = self.path.text().strip()
        if not text:
            return "Give the file to write."
        path = Path(text).expanduser()
        if path.is_dir():
            return f"{path} is a folder; give a file name."
        if not path.parent.is_dir():
            return f"The folder {path.parent} does not exist."
        if self.sign.isChecked():
            cert = self.certificate.text().strip()
            if not cert:
                return "Choose the certificate file to sign with, or clear 'Sign the PDF'."
            if not Path(cert).expanduser().is_file():
                return f"No such certificate file: {cert}"
        return ""

    def _accept_if_complete(self) -> None:
        why = self.complaint()
        self.message.setText(why)
        self.message.setVisible(bool(why))
        if not why:
            self.accept()

    def choice(self) -> ExportChoice:
        path = Path(self.path.text().strip()).expanduser()
        if path.suffix.lower() != ".pdf":
            path = path.with_name(path.name + ".pdf")
        cert = str(Path(self.certificate.text().strip()).expanduser()) if self.sign.isChecked() else None
        return ExportChoice(path=path, channels=[self.current_name] if self.one.isChecked() else None,
                            page=self.paper.currentData(), certificate=cert,
                            open_after=self.open_after.isChecked())


def ask_password(parent, certificate) -> str | None:
    """The password of ``certificate``, typed blind in a dialog; None when the user cancels."""
    text, ok = QInputDialog.getText(parent, "Certificate password",
                                    f"Password of the key file {Path(certificate).name}\n"
                                    "(used for this signature only, never saved):",
                                    QLineEdit.EchoMode.Password)
    return text if ok else None


# ----------------------------------------------------------------------------- notes

class NotesDialog(QDialog):
    """Free text for the whole project: client, scope, assumptions, sources of survey data."""

    def __init__(self, text: str, title: str = "Project notes", parent=None):
        super().__init__(parent)
        self.setWindowTitle(title)
        self.setStyleSheet(STYLE)
        lay = QVBoxLayout(self)
        lay.addWidget(_hint("Notes about the whole project (client, scope, assumptions, where the survey came "
                            "from). Saved with the project."))
        self.edit = QPlainTextEdit(text)
        self.edit.setObjectName("projectNotes")
        self.edit.setTabChangesFocus(True)
        lay.addWidget(self.edit, 1)
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Ok | QDialogButtonBox.StandardButton.Cancel)
        buttons.accepted.connect(self.accept)
        buttons.rejected.connect(self.reject)
        lay.addWidget(buttons)
        fit_to_screen(self, 560, 380)

    def text(self) -> str:
        return self.edit.toPlainText()


__all__ = ["SheetDetailsDialog", "ExportSheetDialog", "ExportChoice", "ask_password", "NotesDialog", "PAPERS"]
