"""The rainfall (IDF) dialog: the project's table or formula in the project's units, typed back to SI, refused by
the core's own message, one undoable edit, and a new project's run solved once its rainfall is typed.

Conversions checked by plain arithmetic from the definitions of the units: 1 ft = 0.3048 m exactly, so 1 in =
25.4 mm (international yard and pound agreement, 1959; NIST Special Publication 811, 2008 ed., Appendix B.8, as
hydraulics/units.py cites it), 1 h = 3600 s, 1 min = 60 s. The demo's table and every number typed here are
invented.
"""

import pytest
from PySide6.QtCore import QLocale
from PySide6.QtWidgets import QDialog

import hydraulics as hy
from app import project as pj
from app.editing import new_project
from app.gui.fields import format_number
from app.gui.mainwindow import MainWindow
from app.gui.rainfall_dialog import EMPTY_SIZE, RainfallDialog
from hydraulics.rainfall import IdfFormula, IdfTable, idf_from_dict

WAIT = 60000
MM_PER_HOUR = 1e-3 / 3600          # [m/s]
IN_PER_HOUR = 0.0254 / 3600        # [m/s]
PER_HOUR = {"si": MM_PER_HOUR, "us": IN_PER_HOUR}


def plain(text: str) -> str:
    """A label's text without the no-break spaces and word joiners that keep units whole."""
    return text.replace("\u2060", "").replace("\u00a0", " ")


def demo_rainfall() -> dict:
    return pj.loads(pj.demo_path().read_text(encoding="utf-8")).rainfall


def dialog(qtbot, rainfall, units="si") -> RainfallDialog:
    d = RainfallDialog(rainfall, hy.units.system(units))
    qtbot.addWidget(d)
    return d


def type_cell(grid, row, col, text):
    grid.item(row, col).setText(text)


def answered_by(monkeypatch, fill):
    """RainfallDialog.exec replaced: ``fill(dialog)`` types, then OK is clicked; exec returns what a user's would."""
    seen = []

    def exec_(self):
        seen.append(self)
        fill(self)
        if self.ok.isEnabled():
            self.ok.click()
        return self.result()
    monkeypatch.setattr(RainfallDialog, "exec", exec_)
    return seen


@pytest.mark.parametrize("units, first", [("si", "110"), ("us", "4.3307")])
def test_the_demo_table_is_shown_in_the_projects_units(qtbot, units, first):
    rain = demo_rainfall()
    d = dialog(qtbot, rain, units)
    g = d.grid
    label = "mm/h" if units == "si" else "in/h"
    assert g.horizontalHeaderItem(0).text() == "Duration [min]"
    assert all(g.horizontalHeaderItem(j).text() == f"Intensity [{label}]" for j in range(1, g.columnCount()))
    assert "years" in g.item(0, 0).text()
    # the demo's 5-minute, 2-year intensity 3.0555556e-05 m/s: x 3.6e6 = 110 mm/h; / 25.4 = 4.3307 in/h
    assert g.item(1, 1).text() == first
    assert [g.item(0, j).text() for j in range(1, g.columnCount())] == ["2", "10", "25"]
    assert [g.item(i, 0).text() for i in range(1, g.rowCount())] == ["5", "10", "15", "30", "60", "120"]
    for i, row in enumerate(rain["intensities"], start=1):
        for j, v in enumerate(row, start=1):
            assert g.item(i, j).text() == format_number(v / PER_HOUR[units])
    assert d.source.text() == rain["source"] and d.chosen_kind == "table"
    assert d.ok.isEnabled() and d.message.isHidden()
    assert d.value() == rain                       # shown and taken back: every digit kept


def test_an_edited_cell_and_ok_change_the_rainfall_in_si_in_one_undo_step(demo_window, qtbot, monkeypatch):
    w = demo_window
    before = w.doc.project.rainfall
    kept = {k: v for k, v in before.items() if k != "intensities"}
    answered_by(monkeypatch, lambda d: type_cell(d.grid, 1, 1, "120"))        # 5 min, 2 years: 120 mm/h
    steps = w.doc.undo_stack.count()
    w.rainfall_action.trigger()
    after = w.doc.project.rainfall
    assert after["intensities"][0][0] == pytest.approx(120 * MM_PER_HOUR, rel=1e-12)
    assert after["intensities"][0][1:] == before["intensities"][0][1:]
    assert after["intensities"][1:] == before["intensities"][1:]
    assert {k: v for k, v in after.items() if k != "intensities"} == kept
    assert w.doc.undo_stack.count() == steps + 1
    assert w.doc.undo_stack.undoText() == "Change the rainfall (IDF)"
    w.doc.undo_stack.undo()
    assert w.doc.project.rainfall == before
    w.doc.undo_stack.redo()
    assert w.doc.project.rainfall["intensities"][0][0] == pytest.approx(120 * MM_PER_HOUR, rel=1e-12)


def test_ok_without_a_change_makes_no_edit(demo_window, monkeypatch):
    w = demo_window
    answered_by(monkeypatch, lambda d: None)
    steps = w.doc.undo_stack.count()
    w.rainfall_action.trigger()
    assert w.doc.undo_stack.count() == steps


def test_a_table_rising_with_duration_is_refused_with_the_cores_message(qtbot):
    rain = demo_rainfall()
    d = dialog(qtbot, rain, "si")
    type_cell(d.grid, 2, 1, "130")                  # 10 min, 2 years above the 110 mm/h of 5 min
    cells = [row[:] for row in rain["intensities"]]
    cells[1][0] = 130 * MM_PER_HOUR
    with pytest.raises(hy.InputError) as core:
        IdfTable(rain["durations"], rain["return_periods"], cells)
    assert core.value.field == "rainfall.intensities[1][0]"
    words = str(core.value).split(": ", 1)[1]
    shown = plain(d.message.text())
    assert words in shown and shown.startswith("The intensity for 10 min, 2 years")
    assert not d.ok.isEnabled() and d.value() is None
    assert d.marked == (d.grid, 2, 1) and d.message.objectName() == "fieldMessage"
    d.accept()
    assert d.result() != QDialog.DialogCode.Accepted
    type_cell(d.grid, 2, 1, "abc")
    assert "is not a number" in plain(d.message.text()) and not d.ok.isEnabled()
    type_cell(d.grid, 2, 1, "85")                   # back between its neighbours
    assert d.ok.isEnabled() and d.message.isHidden()


def test_durations_out_of_order_are_refused_in_minutes(qtbot):
    d = dialog(qtbot, demo_rainfall(), "us")
    type_cell(d.grid, 3, 0, "8")                    # 5, 10, 8, 30 ... minutes
    shown = plain(d.message.text())
    assert "must be greater than the value before it (10 min), got 8 min" in shown
    assert d.marked == (d.grid, 3, 0) and not d.ok.isEnabled()


def test_the_source_is_required(qtbot):
    d = dialog(qtbot, demo_rainfall(), "si")
    d.source.setText("  ")
    assert not d.ok.isEnabled() and "where these numbers come from" in plain(d.message.text())
    d.source.setText("Invented for a test")
    assert d.ok.isEnabled() and d.value()["source"] == "Invented for a test"


def test_a_project_without_rainfall_starts_from_an_empty_grid(qtbot):
    d = dialog(qtbot, None, "us")
    g = d.grid
    assert (g.rowCount(), g.columnCount()) == (EMPTY_SIZE + 1, EMPTY_SIZE + 1)
    assert all(g.item(i, j).text() == "" for i in range(g.rowCount()) for j in range(g.columnCount()) if i or j)
    assert d.source.text() == "" and not d.ok.isEnabled()
    assert not d.message.isHidden() and d.message.objectName() == "hint" and "in/h" in plain(d.message.text())


def test_rows_and_columns_are_added_and_deleted(qtbot):
    d = dialog(qtbot, demo_rainfall(), "si")
    g = d.grid
    assert not d.delete_duration.isEnabled()         # nothing chosen
    g.setCurrentCell(2, 1)
    d.add_duration_row()                             # after 10 min: empty, so OK waits for it
    assert g.rowCount() == 8 and g.item(3, 0).text() == "" and not d.ok.isEnabled()
    assert d.message.objectName() == "hint" and "row 3" in d.message.text()
    for col, text in enumerate(["12", "78", "112", "134"]):        # between 10 and 15 min
        type_cell(g, 3, col, text)
    assert d.ok.isEnabled()
    assert d.value()["durations"][2] == pytest.approx(12 * 60)
    g.setCurrentCell(3, 2)
    d.delete_duration_row()
    assert g.rowCount() == 7 and d.value() == demo_rainfall()
    g.setCurrentCell(0, 3)
    d.add_period_column()
    assert g.columnCount() == 5 and not d.ok.isEnabled()
    g.setCurrentCell(0, 4)
    d.delete_period_column()
    assert g.columnCount() == 4 and d.value() == demo_rainfall()


def fill_new_table(d):
    """An invented table in in/h (US), typed into the empty grid."""
    rows = [("5", "5", "6.5", "7.5"), ("30", "2.5", "3.4", "4"), ("60", "1.6", "2.2", "2.6")]
    for j, p in enumerate(["2", "10", "25"], start=1):
        type_cell(d.grid, 0, j, p)
    for i, row in enumerate(rows, start=1):
        for j, text in enumerate(row):
            type_cell(d.grid, i, j, format_number(float(text)))
    d.source.setText("Invented for a test (not a real station's data)")


def new_window(qtbot):
    w = MainWindow(new_project("us"))
    qtbot.addWidget(w)
    w.resize(1440, 900)
    w.show()
    return w


def priced(w, qtbot):
    """Every candidate of the shown run given a unit cost (a new run has none), then its result awaited."""
    view = w.run_view
    table = view.inputs.candidates
    for row in range(table.table.rowCount()):
        type_cell(table.table, row, table.column_of("unit_cost"), "10")
        qtbot.waitUntil(lambda: view.idle, timeout=WAIT)
    qtbot.waitUntil(lambda: view.idle and view.design is not None, timeout=WAIT)


def test_a_new_project_gets_its_rainfall_typed_and_a_new_run_is_solved(qtbot, monkeypatch):
    w = new_window(qtbot)
    assert w.doc.project.rainfall is None
    answered_by(monkeypatch, fill_new_table)
    w.rainfall_action.trigger()
    rain = w.doc.project.rainfall
    assert rain["durations"] == pytest.approx([300.0, 1800.0, 3600.0])
    assert rain["intensities"][1][1] == pytest.approx(3.4 * IN_PER_HOUR, rel=1e-12)
    w.new_run_action.trigger()
    view = w.run_view
    qtbot.waitUntil(lambda: view.idle, timeout=WAIT)
    assert "rainfall" not in view.problem and view.rainfall_button.isHidden()
    priced(w, qtbot)
    assert view.problem == "" and view.design.result.total_cost > 0
    w.doc.undo_stack.setClean()


def test_the_run_view_offers_the_rainfall_while_it_is_missing_and_solves_again_after(qtbot, monkeypatch):
    w = new_window(qtbot)
    w.new_run_action.trigger()
    view = w.run_view
    qtbot.waitUntil(lambda: view.idle, timeout=WAIT)
    assert "rainfall: is missing" in view.problem and not view.rainfall_button.isHidden()
    seen = answered_by(monkeypatch, fill_new_table)
    view.rainfall_button.click()
    assert len(seen) == 1 and w.doc.project.rainfall is not None
    qtbot.waitUntil(lambda: view.idle and "rainfall" not in view.problem, timeout=WAIT)
    assert view.rainfall_button.isHidden()
    w.doc.undo_stack.undo()                          # the rainfall taken out again: the run says so again
    qtbot.waitUntil(lambda: view.idle and "rainfall: is missing" in view.problem, timeout=WAIT)
    w.doc.undo_stack.setClean()


def invented_formula() -> dict:
    """Invented coefficients as published (mm/h, min), 5 to 120 minutes."""
    f = IdfFormula.from_customary({10: (1200.0, 10.0, 0.8), 25: (1500.0, 12.0, 0.8)}, "si", (300.0, 7200.0))
    return {"kind": "formula", "source": "Invented formula for a test", **{k: v for k, v in f.to_dict().items()
                                                                           if k != "kind"}}


def test_the_formula_is_shown_as_published_and_round_trips(qtbot):
    rain = invented_formula()
    d = dialog(qtbot, rain, "us")
    g = d.coefficients
    assert d.chosen_kind == "formula" and d.pages.currentIndex() == 1
    assert g.horizontalHeaderItem(1).text() == "a [in/h·min^c]" and g.horizontalHeaderItem(2).text() == "b [min]"
    # a in in/h min^c is the mm/h one divided by 25.4; b and c as published
    assert [g.item(0, j).text() for j in range(4)] == ["10", format_number(1200 / 25.4), "10", "0.8"]
    assert (d.range_from.text(), d.range_to.text()) == ("5", "120")
    assert d.ok.isEnabled() and d.value() == rain
    type_cell(g, 1, 2, "15")                         # 25 years: b from 12 to 15 min
    out = d.value()
    assert out["coefficients"][0] == rain["coefficients"][0]
    assert out["coefficients"][1]["b"] == pytest.approx(15 * 60)
    assert out["coefficients"][1]["a"] == pytest.approx(1500 * MM_PER_HOUR * 60 ** 0.8, rel=1e-4)
    again = dialog(qtbot, out, "si")                 # what was stored, opened again, gives itself back
    assert again.value() == out
    assert [again.coefficients.item(1, j).text() for j in range(4)] == ["25", "1500", "15", "0.8"]


def test_a_formula_is_typed_from_nothing_and_its_refusal_marks_the_cell(qtbot):
    d = dialog(qtbot, None, "si")
    d.kind.setCurrentIndex(d.kind.findData("formula"))
    assert d.pages.currentIndex() == 1 and not d.ok.isEnabled()
    g = d.coefficients
    d.source.setText("Invented for a test")
    g.setCurrentCell(2, 0)
    d.delete_coefficient_row()
    g.setCurrentCell(1, 0)
    d.delete_coefficient_row()
    assert g.rowCount() == 1
    for j, text in enumerate(["10", "1200", "10", "0"]):
        type_cell(g, 0, j, text)
    assert d.marked == (g, 0, 3) and "c: must be > 0" in plain(d.message.text()) and not d.ok.isEnabled()
    type_cell(g, 0, 3, format_number(0.8))
    d.range_from.setText("5")
    assert not d.ok.isEnabled() and d.marked is d.range_to        # both ends, or neither
    d.range_to.setText("120")
    assert d.ok.isEnabled()
    out = d.value()
    idf = idf_from_dict(out)
    # i = 1200 / (20 + 10)^0.8 mm/h at 20 minutes
    assert idf.intensity(20 * 60.0, 10) == pytest.approx(1200 / 30 ** 0.8 * MM_PER_HOUR, rel=1e-12)
    assert out["duration_range"] == pytest.approx([300.0, 7200.0])
    d.range_to.setText("4")                          # the core refuses a range that ends before it starts
    assert d.marked is d.range_to and not d.ok.isEnabled()
    assert "must be above the shortest duration 5 min, got 4 min" in plain(d.message.text())


def test_a_refusal_is_worded_in_the_projects_units(qtbot):
    d = dialog(qtbot, demo_rainfall(), "us")
    type_cell(d.grid, 2, 1, "5")                    # 10 min, 2 years: 5 in/h above the 4.3307 in/h of 5 min
    shown = plain(d.message.text())
    # 5 in/h and the demo's 110 mm/h = 4.33 in/h, each to three figures (1 in = 25.4 mm)
    assert "5.00 in/h at 10 min is not below 4.33 in/h at 5 min (2 years)" in shown and "mm/h" not in shown
    assert d.marked == (d.grid, 2, 1)


@pytest.fixture
def german_numbers():
    before = QLocale()
    QLocale.setDefault(QLocale("de_DE"))
    yield
    QLocale.setDefault(before)


def test_numbers_are_shown_and_read_in_the_users_number_format(qtbot, german_numbers):
    d = dialog(qtbot, demo_rainfall(), "us")
    assert d.grid.item(1, 1).text() == "4,3307"                 # 110 mm/h / 25.4 with a decimal comma
    type_cell(d.grid, 1, 1, "4,5")
    assert d.ok.isEnabled()
    assert d.value()["intensities"][0][0] == pytest.approx(4.5 * IN_PER_HOUR, rel=1e-12)
    type_cell(d.grid, 1, 1, "4,500.5")                          # a number only in another format
    assert "4,500.5" in plain(d.message.text()) and not d.ok.isEnabled() and d.marked == (d.grid, 1, 1)


def test_the_cores_cautions_are_shown_without_refusing(qtbot):
    # invented: 100 mm/h for 5 min is 8.33 mm of rain, 40 mm/h for 10 min only 6.67 mm: the depth falls
    rain = {"kind": "table", "source": "Invented for a test", "durations": [300.0, 600.0], "return_periods": [10.0],
            "intensities": [[100 * MM_PER_HOUR], [40 * MM_PER_HOUR]]}
    d = dialog(qtbot, rain, "si")
    assert d.ok.isEnabled() and not d.cautions.isHidden()
    assert "rainfall depth falls from 8.33 mm in 5 min to 6.67 mm in 10 min" in plain(d.cautions.text())
    type_cell(d.grid, 2, 1, "60")                                # 10 mm in 10 min: no caution
    assert d.ok.isEnabled() and d.cautions.isHidden()


def test_a_switch_of_kind_carries_the_return_periods_to_an_empty_page(qtbot):
    d = dialog(qtbot, demo_rainfall(), "si")         # the demo's table: 2, 10 and 25 years
    d.kind.setCurrentIndex(d.kind.findData("formula"))
    f = d.coefficients
    assert [f.item(i, 0).text() for i in range(f.rowCount())] == ["2", "10", "25"]
    assert all(f.item(i, j).text() == "" for i in range(3) for j in (1, 2, 3))
    assert d.marked == (f, 0, 1) and not d.ok.isEnabled()       # the coefficients are still to be typed
    type_cell(f, 0, 1, "800")
    d.kind.setCurrentIndex(d.kind.findData("table"))             # back: the table is kept as it was
    assert d.ok.isEnabled() and d.value() == demo_rainfall()
    d.kind.setCurrentIndex(d.kind.findData("formula"))           # and the typed formula too
    assert f.item(0, 1).text() == "800"
    e = dialog(qtbot, invented_formula(), "si")       # a formula's return periods head an empty table
    e.kind.setCurrentIndex(e.kind.findData("table"))
    g = e.grid
    assert [g.item(0, j).text() for j in range(1, g.columnCount())] == ["10", "25"]
    assert g.horizontalHeaderItem(2).text() == "Intensity [mm/h]" and g.item(0, 2).font().bold()
