"""File > Export drawings (DXF)...: the window writes the same drawings as `ditchwright drawing`, in the units it
shows, and tells a failure in a message box (the demo project is invented)."""

import ezdxf
from PySide6.QtWidgets import QFileDialog

#: $INSUNITS codes: the DXF reference's header variable "INSUNITS", table of values (as ezdxf.units.FT and .M).
INSUNITS = {"us": 2, "si": 6}


def _choose(monkeypatch, folder):
    monkeypatch.setattr(QFileDialog, "getExistingDirectory", staticmethod(lambda *a, **k: str(folder)))


def test_the_file_menu_writes_every_drawing_in_the_units_shown(demo_window, monkeypatch, tmp_path, dialogs):
    w = demo_window
    file_menu = next(a.menu() for a in w.menuBar().actions() if a.text().replace("&", "") == "File")
    assert w.drawings_action in file_menu.actions()
    w.doc.set_units("us")
    out = tmp_path / "drawings"     # tmp_path holds the test's settings folder too
    out.mkdir()
    _choose(monkeypatch, out)
    w.drawings_action.trigger()
    project = w.doc.project
    names = sorted(p.name for p in out.iterdir())
    assert len(names) == len(project.channels) + len(project.runs)
    assert "North verge ditch-profile.dxf" in names and "East verge ditch-section.dxf" in names
    assert ezdxf.readfile(out / "East verge ditch-section.dxf").header["$INSUNITS"] == INSUNITS["us"]
    assert dialogs.shown == [] and "Wrote 6 DXF drawings (ft)" in w.statusBar().currentMessage()


def test_a_failure_is_told_in_a_dialog_and_nothing_is_written(demo_window, monkeypatch, tmp_path, dialogs):
    w = demo_window
    w.doc.project.channels[1].slope = -0.01     # a value that cannot be computed
    out = tmp_path / "out"
    _choose(monkeypatch, out)
    assert w.export_drawings_dialog() == []
    (kind, title, text), = dialogs.shown
    assert kind == "warning" and title == "Drawings not written"
    assert "North cut ditch" in text and "slope" in text and "Traceback" not in text
    assert not out.exists()


def test_cancelling_the_folder_writes_nothing(demo_window, monkeypatch, dialogs):
    _choose(monkeypatch, "")
    assert demo_window.export_drawings_dialog() == [] and dialogs.shown == []
