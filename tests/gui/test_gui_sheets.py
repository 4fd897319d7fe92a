"""Design sheets from the window: the export dialog, the background export, signing, sheet details, notes.

The dialogs are driven by replacing their ``exec`` with a function that fills
them as a user would and presses OK. The printed normal depth is checked
against an independent root of Manning's equation (Chow, V. T.,
Open-Channel Hydraulics, McGraw-Hill, 1959, Eq. 5-6, customary constant
1.486 = (1/0.3048)^(1/3)) found with scipy.optimize.brentq. Signatures are
checked with pyHanko's validator against a certificate the test makes.
"""

from __future__ import annotations

import datetime
import math
import re

import pytest
from certs import make_test_certificate
from PySide6.QtCore import QSettings, Qt
from PySide6.QtGui import QColor, QImage
from PySide6.QtWidgets import QApplication, QDialog, QLineEdit, QMessageBox, QPushButton
from pypdf import PdfReader
from scipy.optimize import brentq

import hydraulics as hy
from app import project as pj
from app import sheet as sheet_errors
from app.gui.mainwindow import MainWindow, export_failure_text
from app.gui.sheet_dialogs import ExportSheetDialog, NotesDialog, SheetDetailsDialog

FOOT = 0.3048


def invented_project() -> pj.Project:
    """Three invented ditches in US units: two plain grass-n trapezoids and a pipe far too small for its flow."""
    a = pj.Channel(name="Invented ditch A", location="sta. 10+00 to 14+50 (invented)", slope=0.004,
                   flow=pj.FlowBasis("typed", 20 * FOOT ** 3),
                   section={"shape": "trapezoid", "bottom_width": 3 * FOOT, "left_slope": 3.0, "right_slope": 3.0},
                   manning_n=0.035)
    b = pj.Channel(name="Invented ditch B", slope=0.01, flow=pj.FlowBasis("typed", 8 * FOOT ** 3),
                   section={"shape": "trapezoid", "bottom_width": 2 * FOOT, "left_slope": 2.0, "right_slope": 4.0},
                   manning_n=0.030)
    pipe = pj.Channel(name="Invented pipe C", slope=0.002, flow=pj.FlowBasis("typed", 5.0),
                      section={"shape": "circle", "diameter": 0.3}, manning_n=0.013)
    return pj.Project(name="Invented test road", units="us", channels=[a, b, pipe])


@pytest.fixture
def window(qtbot):
    w = MainWindow(invented_project())
    qtbot.addWidget(w)
    w.show()
    qtbot.waitExposed(w)
    yield w
    w.doc.undo_stack.setClean()


def answer_export(monkeypatch, *, path, whole=False, page="letter", certificate=None, open_after=True):
    """Make the export dialog fill itself in as given and press Export (through its own checks)."""
    seen = {}

    def exec_(dialog):
        seen["dialog"] = dialog
        (dialog.all if whole else dialog.one).setChecked(True)
        dialog.paper.setCurrentIndex(dialog.paper.findData(page))
        dialog.path.setText(str(path))
        dialog.sign.setChecked(certificate is not None)
        if certificate is not None:
            dialog.certificate.setText(str(certificate))
        dialog.open_after.setChecked(open_after)
        dialog.export_button.click()
        return dialog.result()

    monkeypatch.setattr(ExportSheetDialog, "exec", exec_)
    return seen


def wait_for_export(qtbot, w):
    qtbot.waitUntil(lambda: w.export_task is None, timeout=60000)


def normal_depth_ft(ch: pj.Channel) -> float:
    """Independent root of Q = (1.486/n) A R^(2/3) S^(1/2) for a trapezoid (Chow 1959, Eq. 5-6), in ft."""
    sec = ch.section
    b, z1, z2 = sec["bottom_width"] / FOOT, sec["left_slope"], sec["right_slope"]
    q, n, s = ch.flow.value / FOOT ** 3, ch.manning_n, ch.slope

    def excess(y):
        area = (b + (z1 + z2) / 2 * y) * y
        perim = b + y * (math.sqrt(1 + z1 * z1) + math.sqrt(1 + z2 * z2))
        return 1.486 / n * area * (area / perim) ** (2 / 3) * math.sqrt(s) - q

    return brentq(excess, 1e-6, 50.0, xtol=1e-10)


def number_after(text: str, label: str) -> tuple[float, str]:
    m = re.search(re.escape(label) + r"\s+(-?[0-9.]+)\s*([A-Za-z/³²]*)", text.replace("\n", " "))
    assert m, f"{label!r} not found on the sheet"
    return float(m.group(1)), m.group(2)


# ------------------------------------------------------------------ export


def test_export_current_channel_writes_a_readable_pdf_and_opens_it(window, qtbot, monkeypatch, tmp_path, dialogs):
    out = tmp_path / "ditch A.pdf"
    answer_export(monkeypatch, path=out)
    window.export_dialog()
    assert window.export_task is not None                                 # it runs in the background
    assert QApplication.overrideCursor().shape() == Qt.CursorShape.BusyCursor
    assert not window.export_action.isEnabled()
    wait_for_export(qtbot, window)
    assert QApplication.overrideCursor() is None and window.export_action.isEnabled()
    reader = PdfReader(out)
    assert len(reader.pages) == 1
    text = reader.pages[0].extract_text()
    ch = window.doc.channel()
    assert ch.name in text and "Invented test road" in text
    printed, unit = number_after(text, "Normal depth yn")
    assert unit == "ft"
    assert printed == pytest.approx(normal_depth_ft(ch), rel=2e-3)       # 1.486 vs 1.4859, printed figures
    assert [u.toLocalFile() for u in dialogs.opened] == [str(out)]
    assert str(out) in window.statusBar().currentMessage()
    assert dialogs.shown == []


def test_whole_project_on_a4_one_page_per_channel_without_the_unsolved_one(window, qtbot, monkeypatch, tmp_path,
                                                                            dialogs):
    # 5 m3/s cannot pass the 0.3 m pipe on a 0.2 % grade: Manning's full-flow capacity is about 0.04 m3/s
    # (Q = (1/n) A R^(2/3) S^(1/2) with A = pi D^2/4, R = D/4), so that channel has no sheet.
    out = tmp_path / "all"                    # no suffix: the dialog adds .pdf
    answer_export(monkeypatch, path=out, whole=True, page="a4", open_after=False)
    dialogs.answers["question"] = [QMessageBox.StandardButton.Yes]
    window.export_dialog()
    (kind, title, text), = dialogs.shown
    assert kind == "question" and "Invented pipe C" in text and "surcharge" in text
    assert "ft³/s" in text and "m³/s" not in text           # in the project's units, as every number it shows
    assert "other 2 channels" in text
    wait_for_export(qtbot, window)
    reader = PdfReader(tmp_path / "all.pdf")
    assert len(reader.pages) == 2
    box = reader.pages[0].mediabox
    # ISO 216 A4 is 210 mm x 297 mm = 595.3 pt x 841.9 pt
    assert float(box.width) == pytest.approx(210 / 25.4 * 72, abs=0.5)
    assert float(box.height) == pytest.approx(297 / 25.4 * 72, abs=0.5)
    texts = [p.extract_text() for p in reader.pages]
    assert "Invented ditch A" in texts[0] and "Invented ditch B" in texts[1]
    assert "1 of 2" in texts[0] and "2 of 2" in texts[1]
    assert dialogs.opened == [] and len(dialogs.shown) == 1


def test_declining_the_others_writes_nothing(window, monkeypatch, tmp_path, dialogs):
    answer_export(monkeypatch, path=tmp_path / "all.pdf", whole=True)
    dialogs.answers["question"] = [QMessageBox.StandardButton.No]
    window.export_dialog()
    assert window.export_task is None and not (tmp_path / "all.pdf").exists()


def test_a_channel_without_solution_is_one_dialog_in_words_and_no_file(window, monkeypatch, tmp_path, dialogs):
    window.doc.set_current(2)
    out = tmp_path / "pipe.pdf"
    out.write_bytes(b"an older file")
    answer_export(monkeypatch, path=out)
    window.export_dialog()
    assert window.export_task is None
    (kind, title, text), = dialogs.shown
    assert kind == "warning" and title == "Design sheets not written"
    assert "Invented pipe C" in text and "surcharge" in text and "Traceback" not in text
    assert out.read_bytes() == b"an older file" and dialogs.opened == []


@pytest.mark.parametrize("exc, words", [
    (sheet_errors.SigningError("cannot open k.p12: wrong password"), "could not be signed"),
    (sheet_errors.SheetLayoutError("the comparison does not fit"), "could not be laid out"),
    (hy.InputError("manning_n", "must be > 0, got 0"), "cannot be computed"),
    (PermissionError(13, "Permission denied"), "Cannot write"),
    (KeyError("no channel named 'X'; the project has: A"), "no channel named 'X'"),
], ids=["signing", "layout", "input", "disk", "channel"])
def test_export_failures_are_told_in_words(exc, words):
    text = export_failure_text(exc, "/tmp/out.pdf")
    assert words in text and "No file was written" in text and ".." not in text


def test_export_dialog_refuses_incomplete_choices_in_place(window, qtbot, tmp_path):
    d = ExportSheetDialog(window.doc.project, 0, modified=False, folder=str(tmp_path), parent=window)
    qtbot.addWidget(d)
    assert d.path.text().endswith("Invented test road - Invented ditch A.pdf")
    d.all.setChecked(True)
    assert d.path.text().endswith("Invented test road.pdf")   # the suggestion follows the scope
    d.path.setText(str(tmp_path / "no such folder" / "x.pdf"))
    d.export_button.click()
    assert d.result() != QDialog.DialogCode.Accepted
    assert "does not exist" in d.message.text() and not d.message.isHidden()
    d.path.setText(str(tmp_path / "x.pdf"))
    d.sign.setChecked(True)
    d.export_button.click()
    assert "certificate" in d.message.text()
    d.certificate.setText(str(tmp_path / "missing.p12"))
    d.export_button.click()
    assert "No such certificate file" in d.message.text()
    d.sign.setChecked(False)
    d.export_button.click()
    assert d.result() == QDialog.DialogCode.Accepted
    choice = d.choice()
    assert choice.channels is None and choice.certificate is None and choice.page == "letter"  # US project


# ------------------------------------------------------------------ signing


@pytest.fixture(scope="module")
def certificate(tmp_path_factory):
    """A self-signed EC P-256 certificate made for the test, as PKCS#12 (password 'pw-test') and PEM."""
    p12, pem, cert = make_test_certificate(tmp_path_factory.mktemp("cert"), "Window Test Engineer (invented)")
    return p12, cert


def _validate(path, cert):
    from pyhanko.pdf_utils.reader import PdfFileReader
    from pyhanko.sign.validation import validate_pdf_signature
    from pyhanko_certvalidator import ValidationContext
    from asn1crypto import x509 as asn1_x509
    from cryptography.hazmat.primitives import serialization

    trust = asn1_x509.Certificate.load(cert.public_bytes(serialization.Encoding.DER))
    with open(path, "rb") as fh:
        reader = PdfFileReader(fh)
        (sig,) = reader.embedded_signatures
        return validate_pdf_signature(sig, ValidationContext(trust_roots=[trust], allow_fetching=False))


def test_signed_export_validates_and_the_password_is_not_kept(window, qtbot, monkeypatch, tmp_path, dialogs,
                                                              certificate):
    p12, cert = certificate
    out = tmp_path / "signed.pdf"
    answer_export(monkeypatch, path=out, certificate=p12)
    dialogs.texts = [("pw-test", True)]
    window.export_dialog()
    (title, label, echo), = dialogs.asked
    assert echo == QLineEdit.EchoMode.Password and "engineer.p12" in label
    wait_for_export(qtbot, window)
    assert dialogs.shown == [], dialogs.shown
    status = _validate(out, cert)
    assert status.intact and status.valid and status.trusted
    assert status.coverage.name == "ENTIRE_FILE"
    assert "signed" in window.statusBar().currentMessage()
    # the certificate's path is remembered for next time, its password nowhere
    store = QSettings()
    values = [str(store.value(k)) for k in store.allKeys()]
    assert str(p12) in values
    assert not any("pw-test" in v for v in values)
    assert all("pw-test" not in str(v) for v in vars(window).values())


def test_wrong_password_is_one_dialog_and_no_file(window, qtbot, monkeypatch, tmp_path, dialogs, certificate):
    p12, _ = certificate
    out = tmp_path / "signed.pdf"
    answer_export(monkeypatch, path=out, certificate=p12)
    dialogs.texts = [("not the password", True)]
    window.export_dialog()
    wait_for_export(qtbot, window)
    assert dialogs.kinds() == ["warning"]
    assert "could not be signed" in dialogs.shown[0][2] and "wrong password" in dialogs.shown[0][2]
    assert not out.exists() and dialogs.opened == []


def test_cancelled_password_writes_nothing(window, monkeypatch, tmp_path, dialogs, certificate):
    p12, _ = certificate
    out = tmp_path / "signed.pdf"
    answer_export(monkeypatch, path=out, certificate=p12)
    dialogs.texts = [("", False)]
    window.export_dialog()
    assert window.export_task is None and not out.exists()
    assert "password" in window.statusBar().currentMessage()


# ------------------------------------------------------------------ sheet details and notes


def test_sheet_details_edit_is_undoable_saved_and_printed(window, qtbot, monkeypatch, tmp_path, dialogs):
    typed = {"company": "Invented Drainage Works", "designer": "A. Example", "checker": "B. Example",
             "approver": "C. Example", "date_designed": "2025-03-01", "date_checked": "2025-03-04",
             "revision": "B", "project_number": "INV-0042"}

    def exec_(dialog):
        for key, value in typed.items():
            dialog.edits[key].setText(f"  {value} ")     # blanks around are dropped
        return QDialog.DialogCode.Accepted

    monkeypatch.setattr(SheetDetailsDialog, "exec", exec_)
    window.edit_sheet_details()
    doc = window.doc
    assert doc.project.sheet == pj.SheetInfo(**typed)
    assert doc.undo_stack.count() == 1 and doc.undo_stack.undoText() == "Change sheet details"
    assert doc.modified and window.isWindowModified()
    doc.undo_stack.undo()
    assert doc.project.sheet == pj.SheetInfo()
    doc.undo_stack.redo()
    path = tmp_path / "p.json"
    doc.save(path)
    assert pj.load(path).sheet == pj.SheetInfo(**typed)
    # and the title block prints them
    out = tmp_path / "sheet.pdf"
    answer_export(monkeypatch, path=out, open_after=False)
    window.export_dialog()
    wait_for_export(qtbot, window)
    text = PdfReader(out).pages[0].extract_text()
    for value in typed.values():
        assert value in text, value


def test_sheet_details_cancel_changes_nothing(window, monkeypatch):
    monkeypatch.setattr(SheetDetailsDialog, "exec", lambda d: (d.edits["company"].setText("X"),
                                                                QDialog.DialogCode.Rejected)[1])
    window.edit_sheet_details()
    assert window.doc.project.sheet == pj.SheetInfo() and window.doc.undo_stack.count() == 0


def test_today_button_and_logo_preview(qtbot, tmp_path):
    d = SheetDetailsDialog(pj.SheetInfo(), None)
    qtbot.addWidget(d)
    d.findChild(QPushButton, "today_date_checked").click()
    assert d.info().date_checked == datetime.date.today().isoformat()
    d.edits["logo"].setText(str(tmp_path / "none.png"))
    assert "No such file" in d.logo_preview.text()
    image = QImage(40, 20, QImage.Format.Format_RGB32)
    image.fill(QColor("#1d4f7a"))
    image.save(str(tmp_path / "logo.png"))
    d.edits["logo"].setText(str(tmp_path / "logo.png"))
    assert not d.logo_preview.pixmap().isNull()


def test_channel_notes_are_one_undoable_edit_per_visit(window, qtbot):
    notes = window.inputs.notes
    notes.setFocus()
    qtbot.keyClicks(notes, "Surveyed 2025-02 (invented)")
    assert window.doc.channel().notes == ""              # nothing yet: handed on when the box is left
    window.inputs.name.setFocus()
    qtbot.waitUntil(lambda: window.doc.channel().notes == "Surveyed 2025-02 (invented)")
    assert window.doc.undo_stack.undoText() == "Change channel notes"
    window.doc.undo_stack.undo()
    assert window.doc.channel().notes == "" and notes.toPlainText() == ""
    window.doc.set_current(1)
    window.doc.undo_stack.redo()
    assert window.doc.project.channels[0].notes == "Surveyed 2025-02 (invented)"


def test_project_notes_dialog_is_undoable(window, monkeypatch):
    def exec_(dialog):
        dialog.edit.setPlainText("Client: invented county.\nScope: three ditches.")
        return QDialog.DialogCode.Accepted

    monkeypatch.setattr(NotesDialog, "exec", exec_)
    window.edit_project_notes()
    assert window.doc.project.notes == "Client: invented county.\nScope: three ditches."
    window.doc.undo_stack.undo()
    assert window.doc.project.notes == ""


def test_menus_hold_the_new_actions(window):
    titles = {a.text().replace("&", ""): a for a in window.menuBar().actions()}
    file_items = [a.text() for a in titles["File"].menu().actions()]
    assert window.export_action.text() in file_items and window.inventory_action.text() in file_items
    project_items = [a.text() for a in titles["Project"].menu().actions()]
    assert project_items == [window.project_name_action.text(), window.sheet_details_action.text(),
                             window.project_notes_action.text(), window.rainfall_action.text()]


def test_safe_file_names():
    from app.files import safe_file_name   # the one rule, shared with the drawings (tests/test_dxf_drawing.py)

    assert safe_file_name("Demo: a/b") == "Demo - a-b"
    assert safe_file_name("...", fallback="design-sheets") == "design-sheets"


def test_sheet_from_the_window_uses_the_users_catalogue(qtbot, monkeypatch, tmp_path, dialogs):
    """The window evaluates with the user's catalogue laid over the shipped one; its sheets must too (an invented
    unit cost of 70 per m^2 on concrete shows as a cost per length on both)."""
    from app.context import Context
    from app import channel_display as display
    user = tmp_path / "my-linings.toml"
    user.write_text('schema_version = 1\n[[lining]]\nkey = "concrete"\nunit_cost = 70.0\nunit_cost_basis = "area"\n',
                    encoding="utf-8")
    context = Context.load(user)
    assert context.catalogue_problem == ""
    window = MainWindow(invented_project(), context=context)
    qtbot.addWidget(window)
    window.show()
    qtbot.waitExposed(window)
    window.doc.project.channels[0].lining = pj.LiningChoice("concrete")
    ev = display.evaluate(window.doc.channel(), window.doc.context.with_units("us"))
    assert ev.lining.cost_per_length is not None
    out = tmp_path / "priced.pdf"
    answer_export(monkeypatch, path=out, open_after=False)
    window.export_dialog()
    wait_for_export(qtbot, window)
    text = PdfReader(out).pages[0].extract_text().replace("\n", " ")
    m = re.search(r"; cost ([0-9][0-9,]*\.?[0-9]*) \$/ft", text)
    assert m, "no cost on the sheet"
    assert float(m.group(1).replace(",", "")) == pytest.approx(ev.lining.cost_per_length * FOOT, rel=5e-3)
    window.doc.undo_stack.setClean()
