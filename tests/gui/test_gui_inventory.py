"""The inventory check in the window: rows and counts, bad rows, filters, sorting, import as channels, undo.

The inventory is invented. Expected values come from outside the program:
the normal depth of a trapezoid from an independent root of Manning's
equation (Chow, V. T., Open-Channel Hydraulics, McGraw-Hill, 1959, Eq. 5-6,
customary constant 1.486) with scipy.optimize.brentq; a reach laid at its
critical slope (Chow 1959, Sec. 6-4: S_c from Manning's equation at the
critical depth, y_c = (q^2/g)^(1/3) for a rectangle, Eq. 4-11 (not verified))
is near-critical by definition; a pipe given forty times its full-flow
capacity (Manning, A = pi D^2/4, R = D/4) has no normal depth; a
catalogue concrete lining is non-erodible (common practice); a misspelt
shape is an invalid row.
"""

from __future__ import annotations

import csv
import math
import time

import pytest
from PySide6.QtCore import QItemSelectionModel, Qt
from PySide6.QtWidgets import QApplication, QMessageBox
from scipy.optimize import brentq

from app import project as pj
from app.gui.inventory import IMPORT_ASK_ABOVE
from app.gui.mainwindow import MainWindow
from app.verdicts import Verdict

FOOT = 0.3048
G_US = 32.174   # ft/s^2, standard gravity 9.80665 m/s^2 in feet
HEADER = ["id", "shape", "bottom_width", "left_slope", "right_slope", "diameter", "slope", "flow", "lining", "d50",
          "n", "road"]


def critical_slope_rectangle(b, q, n):
    """S_c of a rectangle b [ft] at Q [ft^3/s] with Manning's n: Manning's equation at y_c = (q^2/g)^(1/3)."""
    yc = ((q / b) ** 2 / G_US) ** (1 / 3)
    area, perim = b * yc, b + 2 * yc
    v = q / area
    return (n * v / (1.486 * (area / perim) ** (2 / 3))) ** 2


def normal_depth_trapezoid(b, z, q, n, s):
    def excess(y):
        area = (b + z * y) * y
        perim = b + 2 * y * math.sqrt(1 + z * z)
        return 1.486 / n * area * (area / perim) ** (2 / 3) * math.sqrt(s) - q
    return brentq(excess, 1e-6, 50.0, xtol=1e-12)


ROWS = [
    {"id": "T-1", "shape": "trapezoid", "bottom_width": "3", "left_slope": "3", "right_slope": "3",
     "slope": "0.004", "flow": "20", "n": "0.035", "road": "Invented Rd 1"},
    {"id": "T-2", "shape": "trapezoid", "bottom_width": "2", "left_slope": "2", "right_slope": "2",
     "slope": "0.01", "flow": "15", "lining": "concrete", "road": "Invented Rd 1"},
    {"id": "X-3", "shape": "trapazoid", "bottom_width": "2", "left_slope": "2", "right_slope": "2",
     "slope": "0.01", "flow": "15", "n": "0.03", "road": "Invented Rd 2"},
    {"id": "P-4", "shape": "circle", "diameter": "1", "slope": "0.002", "flow": "40", "n": "0.013",
     "road": "Invented Rd 2"},
    {"id": "R-5", "shape": "rectangle", "bottom_width": "2", "slope": f"{critical_slope_rectangle(2, 10, 0.015):.6f}",
     "flow": "10", "n": "0.015", "road": "Invented Rd 3"},
]


def write_inventory(path, rows, header=HEADER):
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.DictWriter(fh, header, lineterminator="\n", extrasaction="ignore")
        w.writeheader()
        w.writerows(rows)
    return path


@pytest.fixture
def window(qtbot):
    w = MainWindow(pj.Project(name="Invented inventory test", units="us"))
    qtbot.addWidget(w)
    w.show()
    qtbot.waitExposed(w)
    yield w
    if w.inventory_dialog is not None:
        w.inventory_dialog.stop(wait=True)
    w.doc.undo_stack.setClean()


def checked(qtbot, window, path, units="us"):
    window.open_inventory()
    d = window.inventory_dialog
    d.path.setText(str(path))
    d.units.setCurrentIndex(d.units.findData(units))
    task = d.start_check()
    assert task is not None
    assert not d.check_button.isEnabled() and not d.progress.isHidden()   # running, off the window's thread
    qtbot.waitUntil(lambda: d.task is None, timeout=60000)
    assert d.progress.isHidden() and d.check_button.isEnabled()
    return d


def ids_shown(d):
    col = d.model.order.index(d.model.columns.index("id"))
    return [d.model.cell(r, col) for r in range(d.model.rowCount())]


def column(d, name):
    return d.model.order.index(d.model.columns.index(name))


def choose(d, ids):
    sel = d.table.selectionModel()
    sel.clearSelection()
    shown = ids_shown(d)
    for ident in ids:
        sel.select(d.model.index(shown.index(ident), 0),
                   QItemSelectionModel.SelectionFlag.Select | QItemSelectionModel.SelectionFlag.Rows)


@pytest.fixture
def inventory(tmp_path):
    return write_inventory(tmp_path / "invented-inventory.csv", ROWS)


def test_rows_counts_line_numbers_and_bad_rows(window, qtbot, inventory, dialogs):
    d = checked(qtbot, window, inventory)
    assert d.model.rowCount() == 5
    assert ids_shown(d) == ["T-1", "T-2", "X-3", "P-4", "R-5"]
    # the row headings: the file's line and the id, in view whatever column is scrolled to
    assert [d.model.headerData(r, Qt.Orientation.Vertical) for r in range(5)] == [
        "2  T-1", "3  T-2", "4  X-3", "5  P-4", "6  R-5"]
    verdict = column(d, "verdict")
    assert [d.model.cell(r, verdict) for r in range(5)] == [
        "hydraulics-only", "non-erodible", "invalid", "no-solution", "hydraulics-only"]
    boxes = {v: b.text() for v, b in d.verdict_boxes.items()}
    assert boxes["hydraulics-only"].endswith(": 2") and boxes["invalid"].endswith(": 1")
    assert boxes["no-solution"].endswith(": 1") and boxes["non-erodible"].endswith(": 1")
    assert boxes["stable"].endswith(": 0") and not d.verdict_boxes["stable"].isEnabled()
    # the bad rows, with their line numbers and reasons
    assert d.views.tabText(1) == "Bad rows (2)"
    bad = [[d.problems_model.cell(r, c) for c in range(4)] for r in range(d.problems_model.rowCount())]
    assert [b[:3] for b in bad] == [["4", "X-3", "invalid"], ["5", "P-4", "no-solution"]]
    assert "shape" in bad[0][3] and "trapazoid" in bad[0][3]
    assert "surcharge" in bad[1][3]
    # units in the headings; the summary tab
    assert d.model.headerData(column(d, "normal_depth"), Qt.Orientation.Horizontal) == "Normal depth\n(ft)"
    assert d.model.headerData(column(d, "safety_factor"), Qt.Orientation.Horizontal) == "Safety factor"
    # the shear columns are the bed's (hydraulics.many_reaches), the safety factor the governing check's: the
    # headings say so, as the window's results panel names the place of each shear
    assert d.model.headerData(column(d, "permissible_shear"), Qt.Orientation.Horizontal) == \
        "Permissible shear, bed\n(lb/ft²)"
    assert d.model.headerData(column(d, "bed_shear"), Qt.Orientation.Horizontal) == "Design shear, bed\n(lb/ft²)"
    assert "5 reaches" in d.summary.toPlainText()
    assert dialogs.shown == []


def test_the_filter_boxes_say_the_verdicts_in_the_one_vocabulary(window, qtbot, inventory, dialogs):
    """Each filter box words its verdict as the window's headline, the sheet and the batch's plot do
    (app/verdicts.py), with its count; the table keeps the file's tokens."""
    d = checked(qtbot, window, inventory)
    assert list(d.verdict_boxes) == [v.token for v in Verdict if v is not Verdict.TOO_SHALLOW]
    for token, box in d.verdict_boxes.items():
        assert box.text().rsplit(": ", 1)[0] == Verdict.from_token(token).words
    assert d.verdict_boxes["hydraulics-only"].text() == "Hydraulics only: 2"
    assert d.verdict_boxes["invalid"].text() == "Invalid input: 1"


def test_normal_depth_shown_solves_mannings_equation(window, qtbot, inventory):
    d = checked(qtbot, window, inventory)
    shown = float(d.model.cell(0, column(d, "normal_depth")))
    # shown as the results panel shows a depth: three decimals (app.results), so within half of the last one
    assert shown == pytest.approx(normal_depth_trapezoid(3, 3, 20, 0.035, 0.004), abs=0.0005)


def test_filters_by_verdict_warning_and_text(window, qtbot, inventory):
    d = checked(qtbot, window, inventory)
    for v, box in d.verdict_boxes.items():
        box.setChecked(v in ("invalid", "no-solution"))
    assert ids_shown(d) == ["X-3", "P-4"]
    assert d.count.text() == "Showing 2 of 5 reaches"
    for box in d.verdict_boxes.values():
        box.setChecked(True)
    d.warning.setCurrentIndex(d.warning.findData("near_critical"))
    assert ids_shown(d) == ["R-5"]                      # laid at its critical slope
    d.warning.setCurrentIndex(0)
    d.text.setText("p-")
    assert ids_shown(d) == ["P-4"]                      # case-insensitive, in the id
    d.text.setText("SURCHARGE")
    assert ids_shown(d) == ["P-4"]                      # and in the reason
    d.text.clear()
    assert len(ids_shown(d)) == 5


def test_sorting_numbers_as_numbers_blanks_last(window, qtbot, inventory):
    d = checked(qtbot, window, inventory)
    c = column(d, "normal_depth")
    d.table.sortByColumn(c, Qt.SortOrder.DescendingOrder)
    values = [d.model.cell(r, c) for r in range(5)]
    numbers = [float(v) for v in values if v]
    assert numbers == sorted(numbers, reverse=True) and len(numbers) == 3
    assert values[3:] == ["", ""]                       # the invalid and unsolved rows last
    d.table.sortByColumn(c, Qt.SortOrder.AscendingOrder)
    values = [d.model.cell(r, c) for r in range(5)]
    assert [float(v) for v in values[:3]] == sorted(numbers) and values[3:] == ["", ""]
    d.table.sortByColumn(column(d, "id"), Qt.SortOrder.DescendingOrder)
    assert ids_shown(d) == ["X-3", "T-2", "T-1", "R-5", "P-4"]
    d.verdict_boxes["invalid"].setChecked(False)        # a filter keeps the sort
    assert ids_shown(d) == ["T-2", "T-1", "R-5", "P-4"]


def test_import_chosen_reaches_as_channels_in_one_undoable_step(window, qtbot, inventory):
    d = checked(qtbot, window, inventory)
    doc = window.doc
    before = [c.name for c in doc.project.channels]
    choose(d, ["T-1", "X-3", "R-5"])
    assert d.import_button.isEnabled() and "3 chosen reaches" in d.import_button.text()
    names = d.import_chosen()
    assert names == ["T-1", "R-5"]                      # the invalid row is not imported ...
    assert "line 4 (X-3)" in d.status.text()            # ... and the user is told why
    assert [c.name for c in doc.project.channels] == before + ["T-1", "R-5"]
    assert window.channel_list.count() == 3 and doc.channel().name == "T-1"
    t1 = doc.project.channel("T-1")
    assert t1.section == {"shape": "trapezoid", "bottom_width": pytest.approx(3 * FOOT), "left_slope": 3.0,
                          "right_slope": 3.0}
    assert t1.flow.value == pytest.approx(20 * FOOT ** 3) and t1.slope == 0.004 and t1.manning_n == 0.035
    assert "Invented Rd 1" in t1.notes                  # the extra column travels in the notes
    assert t1.location == "invented-inventory.csv, line 2"
    assert doc.project.channel("R-5").location == "invented-inventory.csv, line 6"
    assert doc.undo_stack.count() == 1 and doc.undo_stack.undoText() == "Import 2 reaches from invented-inventory.csv"
    doc.undo_stack.undo()
    assert [c.name for c in doc.project.channels] == before and window.channel_list.count() == 1
    doc.undo_stack.redo()
    assert [c.name for c in doc.project.channels] == before + ["T-1", "R-5"]
    # importing again does not duplicate names
    choose(d, ["T-1"])
    assert d.import_chosen() == ["T-1 (2)"]


def test_many_reaches_ask_first(window, qtbot, tmp_path, dialogs):
    rows = [dict(ROWS[0], id=f"T-{i}") for i in range(IMPORT_ASK_ABOVE + 1)]
    d = checked(qtbot, window, write_inventory(tmp_path / "long.csv", rows))
    d.choose_all.click()
    dialogs.answers["question"] = [QMessageBox.StandardButton.No]
    assert d.import_chosen() == []
    assert dialogs.kinds() == ["question"] and len(window.doc.project.channels) == 1
    dialogs.answers["question"] = [QMessageBox.StandardButton.Yes]
    assert len(d.import_chosen()) == IMPORT_ASK_ABOVE + 1
    assert window.doc.undo_stack.count() == 1


def test_a_file_that_is_not_an_inventory_is_told_in_the_dialog(window, qtbot, tmp_path, dialogs):
    path = write_inventory(tmp_path / "no-n.csv", ROWS[:1], header=[h for h in HEADER if h != "n"])
    d = checked(qtbot, window, path)
    assert d.status.objectName() == "fieldMessage"
    assert "missing column n" in d.status.text()
    assert d.run is None and not d.filters.isEnabled() and not d.save_button.isEnabled()
    assert dialogs.shown == []                          # no message box: the words are in the dialog
    d = checked(qtbot, window, tmp_path / "absent.csv")
    assert "absent.csv" in d.status.text() and d.status.objectName() == "fieldMessage"
    good = checked(qtbot, window, write_inventory(tmp_path / "good.csv", ROWS))
    assert good.model.rowCount() == 5
    d = checked(qtbot, window, path)                    # a bad file after a good one: the good results stay
    assert d.model.rowCount() == 5 and "still shows" in d.status.text() and "good.csv" in d.status.text()


def test_si_units_read_as_si(window, qtbot, tmp_path):
    row = dict(ROWS[0], bottom_width="1", slope="0.004", flow="0.5", n="0.035")
    d = checked(qtbot, window, write_inventory(tmp_path / "si.csv", [row]), units="si")
    assert d.model.headerData(column(d, "normal_depth"), Qt.Orientation.Horizontal) == "Normal depth\n(m)"
    choose(d, ["T-1"])
    (name,) = d.import_chosen()
    assert window.doc.project.channel(name).section["bottom_width"] == pytest.approx(1.0)


def test_a_us_inventory_in_an_si_project_is_read_and_shown_as_us(qtbot, inventory):
    """Issue 16 item 3: the inventory's unit system is asked for, not taken from the project, and the view says it.
    ROWS are typed in ft and ft^3/s; T-1's normal depth is Manning's equation in US units (Chow 1959, Eq. 5-6, as
    above), so it is right only if the file was read in feet."""
    w = MainWindow(pj.Project(name="Invented SI project", units="si"))
    qtbot.addWidget(w)
    w.show()
    d = checked(qtbot, w, inventory, units="us")
    assert d.units.count() == 2 and w.doc.project.units == "si"
    assert d.model.headerData(column(d, "normal_depth"), Qt.Orientation.Horizontal) == "Normal depth\n(ft)"
    assert "(US customary units)" in d.status.text() and "(US customary units)" in d.windowTitle()
    t1 = ids_shown(d).index("T-1")
    assert float(d.model.cell(t1, column(d, "normal_depth"))) == pytest.approx(
        normal_depth_trapezoid(3, 3, 20, 0.035, 0.004), abs=0.0005)
    d.stop(wait=True)
    w.doc.undo_stack.setClean()


def test_saved_results_have_one_row_per_input_row(window, qtbot, inventory, tmp_path, dialogs):
    d = checked(qtbot, window, inventory)
    dialogs.save_name = str(tmp_path / "results.csv")
    d.save_results()
    with open(tmp_path / "results.csv", newline="") as fh:
        out = list(csv.DictReader(fh))
    assert [r["id"] for r in out] == [r["id"] for r in ROWS]
    assert out[2]["verdict"] == "invalid" and out[2]["normal_depth"] == ""


def test_copy_chosen_rows_as_tab_separated_text(window, qtbot, inventory):
    d = checked(qtbot, window, inventory)
    choose(d, ["T-2", "P-4"])
    d.copy_rows()
    lines = QApplication.clipboard().text().splitlines()
    assert lines[0].split("\t")[:3] == ["line", "Id", "Verdict"]
    assert [line.split("\t")[:3] for line in lines[1:]] == [["3", "T-2", "non-erodible"],
                                                            ["5", "P-4", "no-solution"]]


def test_double_click_on_a_bad_row_shows_it_among_the_reaches(window, qtbot, inventory):
    d = checked(qtbot, window, inventory)
    d.verdict_boxes["invalid"].setChecked(False)
    d._show_problem(d.problems_model.index(0, 0))
    assert d.views.currentIndex() == 0 and d.chosen_rows() == [2]
    assert d.detail.text().startswith("Line 4, X-3: invalid.")


def test_a_long_inventory_shows_progress_and_the_window_keeps_running(window, qtbot, tmp_path):
    from hydraulics.many_reaches import CHUNK
    from PySide6.QtCore import QTimer

    size = CHUNK + CHUNK // 5
    line = ",".join(ROWS[0].get(h, "") for h in HEADER[1:])
    path = tmp_path / "long.csv"
    path.write_text(",".join(HEADER) + "\n" + "".join(f"L-{i},{line}\n" for i in range(size)), encoding="utf-8")
    window.open_inventory()
    d = window.inventory_dialog
    d.path.setText(str(path))
    seen, ticks = [], []
    timer = QTimer()
    timer.timeout.connect(lambda: ticks.append(1))
    timer.start(20)
    started = time.perf_counter()
    task = d.start_check()
    task.progressed.connect(lambda done, total: seen.append((done, total)))
    qtbot.waitUntil(lambda: d.task is None, timeout=120000)
    timer.stop()
    lasted = time.perf_counter() - started
    assert seen[0] == (CHUNK, size) and seen[-1] == (size, size)     # one report per chunk of reaches
    # the window's event loop kept turning while the check ran: a tick every 100 ms at least, 3 in all (a frozen
    # window gets none; a check quicker than that, as on a fast machine, needs fewer; a busy machine gives fewer
    # than the timer's 20 ms)
    assert len(ticks) >= min(3, lasted / 0.1), (len(ticks), lasted)
    assert d.model.rowCount() == size and d.verdict_boxes["hydraulics-only"].text().endswith(f": {size:,}")


def test_a_failed_save_of_the_results_is_said_and_the_results_stay(window, qtbot, inventory, tmp_path, dialogs,
                                                                     monkeypatch):
    from app import inventory as ai
    d = checked(qtbot, window, inventory)
    dialogs.save_name = str(tmp_path / "results.csv")

    def broken(*args, **kwargs):
        raise RuntimeError("something nobody expected")
    monkeypatch.setattr(ai, "write_results", broken)
    d.save_results()
    assert "not saved" in d.status.text() and "RuntimeError: something nobody expected" in d.status.text()
    assert d.run is not None and not (tmp_path / "results.csv").exists()


def test_copied_rows_keep_formulas_as_text(window, qtbot, tmp_path):
    rows = [dict(ROWS[0], id="=HYPERLINK(1)", road="@SUM(1+1)"), dict(ROWS[1], id="+cmd", road="-2+3")]
    d = checked(qtbot, window, write_inventory(tmp_path / "formulas.csv", rows))
    choose(d, ["=HYPERLINK(1)", "+cmd"])
    d.copy_rows()
    lines = QApplication.clipboard().text().splitlines()
    cells = [line.split("\t") for line in lines[1:]]
    assert [c[1] for c in cells] == ["'=HYPERLINK(1)", "'+cmd"]
    assert "'@SUM(1+1)" in cells[0] and "'-2+3" in cells[1]
    assert all(not c.startswith(tuple("=+-@")) or c.lstrip("+-").replace(".", "").isdigit()
               for row in cells for c in row)


def test_safety_factor_says_where_it_governs_and_numbers_follow_the_one_rounding_rule(window, qtbot, tmp_path):
    from app.results import rounded, table_field
    # invented reaches: grass on a steep grade (the bed governs on 4:1 sides) and one with steep sides
    rows = [dict(ROWS[0], id="G-1", lining="grass_good_sod", n="", slope="0.03", flow="10", left_slope="4",
                 right_slope="4"),
            dict(ROWS[0], id="G-2", lining="riprap", d50="0.5", n="", slope="0.02", flow="40", left_slope="1.5",
                 right_slope="1.5")]
    d = checked(qtbot, window, write_inventory(tmp_path / "lined.csv", rows))
    sf = column(d, "safety_factor")
    cells = [d.model.cell(r, sf) for r in range(2)]
    governs = d.run.result.governs
    for cell, where, value in zip(cells, governs, d.run.result.safety_factor):
        assert where in ("bed", "side slopes", "left side slope", "right side slope")
        assert cell == f"{rounded(value, table_field('safety_factor'))} ({where})"
    velocity = d.model.cell(0, column(d, "velocity"))
    assert velocity == rounded(float(velocity), table_field("velocity")) and len(velocity.split(".")[1]) == 2


def test_numbers_that_look_like_the_other_unit_system_are_warned_about_in_the_status(window, qtbot, inventory):
    """ROWS are typed in ft and ft^3/s (median flow 15 ft^3/s): checked as SI the status line says they look US
    customary, with the numbers, as a warning (app.inventory.plausibility); checked as US it does not."""
    d = checked(qtbot, window, inventory, units="si")
    text = d.status.text()
    assert "The flows (median 15 m³/s) are large for roadside ditches in SI (metric) units" in text, text
    assert "usual in US customary units (15 ft³/s)" in text and d.status.objectName() == "fieldMessage"
    assert "Checked 5 reaches" in text                       # the check itself went on
    d = checked(qtbot, window, inventory, units="us")
    assert "look" not in d.status.text() and "US customary units (" not in d.status.text()
    assert d.status.objectName() == "hint"


def test_an_inventory_whose_columns_disagree_on_their_units_is_shown_only_when_the_user_says_so(
        window, qtbot, tmp_path, dialogs):
    """Bottom widths usual in metres beside flows usual in ft^3/s (app.inventory.plausibility, a ``mixed``
    finding): checked as SI, the window asks before it shows anything; No keeps the table as it was."""
    rows = [dict(ROWS[0], id="M-1", bottom_width="0.4", flow="20"), dict(ROWS[0], id="M-2", bottom_width="0.5",
                                                                       flow="25")]
    path = write_inventory(tmp_path / "invented-mixed.csv", rows)
    dialogs.answers["question"] = [QMessageBox.StandardButton.No]
    d = checked(qtbot, window, path, units="si")
    assert dialogs.kinds() == ["question"]
    assert d.run is None and d.model.rowCount() == 0                   # nothing shown
    assert "The columns disagree on their units" in d.status.text() and "Not shown" in d.status.text()
    assert d.status.objectName() == "fieldMessage"
    dialogs.answers["question"] = [QMessageBox.StandardButton.Yes]
    d = checked(qtbot, window, path, units="si")
    assert d.model.rowCount() == 2 and ids_shown(d) == ["M-1", "M-2"]
    assert "The columns disagree on their units" in d.status.text() and "Checked 2 reaches" in d.status.text()
    d = checked(qtbot, window, write_inventory(tmp_path / "invented-inventory.csv", ROWS), units="us")
    assert dialogs.kinds() == ["question", "question"]                # an inventory that agrees asks nothing


def write_geopackage(path, rows, layers=("reaches",)):
    """``rows`` as a GeoPackage layer of invented 150 m lines (UTM zone 33N) under each name of ``layers``."""
    import shapely
    from test_batch_gpkg import write_layer
    lines = [shapely.LineString([(500_000 + 300 * i, 5_000_000), (500_000 + 300 * i + 120, 5_000_090)])
             for i in range(len(rows))]
    for name in layers:
        write_layer(path, rows, lines, crs="EPSG:32633", layer=name, columns=HEADER, append=name != layers[0])
    return path


def test_a_geopackage_layer_is_checked_as_the_same_rows_in_csv(window, qtbot, tmp_path, inventory):
    from app.gui.inventory import OPEN_FILTER
    assert "*.gpkg" in OPEN_FILTER
    as_csv = checked(qtbot, window, inventory)
    csv_cells = {i: as_csv.model.cell(r, column(as_csv, "normal_depth")) for r, i in enumerate(ids_shown(as_csv))}
    assert as_csv.problems_model.columns[0] == "line"                          # a CSV file's rows are its lines
    d = checked(qtbot, window, write_geopackage(tmp_path / "reaches.gpkg", ROWS))
    assert d.model.rowCount() == len(ROWS)
    assert {i: d.model.cell(r, column(d, "normal_depth")) for r, i in enumerate(ids_shown(d))} == csv_cells
    assert "layer 'reaches' (5 features)" in d.status.text()
    assert d.problems_model.columns[0] == "feature"                             # a layer's rows are its features
    assert d.model.headerData(0, Qt.Orientation.Vertical, Qt.ItemDataRole.ToolTipRole).startswith("feature ")
    lengths = {d.model.cell(r, column(d, "length")) for r in range(d.model.rowCount())}
    assert lengths == {"492.13"}                    # 150 m measured on each line, in ft, by the one rounding rule
    choose(d, ["T-1"])
    (name,) = d.import_chosen()                                   # importing chosen reaches still works
    assert window.doc.project.channel(name).section["shape"] == "trapezoid"


def test_a_measured_length_is_headed_in_words_with_its_unit_and_rounded_by_the_one_rule(window, qtbot, tmp_path):
    """Issue 16 item 13: the program's own lengths of a layer's lines read as the results do; a length the file
    gives itself (a CSV file's, a layer's own column) is shown under its name as written."""
    from app.results import MEASURED_LENGTH, rounded
    # 150 m (UTM metres: a 90-120-150 right triangle) = 150 / 0.3048 ft = 492.1260 ft (1 ft = 0.3048 m exactly,
    # NIST SP 811 (2008), Appendix B.8); in SI the same lines measure 150 m
    for units, expected in (("us", "492.13"), ("si", "150.00")):
        d = checked(qtbot, window, write_geopackage(tmp_path / f"measured-{units}.gpkg", ROWS), units=units)
        c = column(d, "length")
        unit = "ft" if units == "us" else "m"
        assert d.model.headerData(c, Qt.Orientation.Horizontal) == f"Measured length\n({unit})"
        assert "measured" in d.model.headerData(c, Qt.Orientation.Horizontal, Qt.ItemDataRole.ToolTipRole).lower()
        assert {d.model.cell(r, c) for r in range(d.model.rowCount())} == {expected}
        assert expected == rounded(150 / (FOOT if units == "us" else 1), MEASURED_LENGTH)
        assert d.model.data(d.model.index(0, c), Qt.ItemDataRole.TextAlignmentRole) == int(
            Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
    # the file's own length column: its name and its text as written, in a CSV file and in a layer alike
    own = [dict(r, length=f"{100 + i}.12345") for i, r in enumerate(ROWS)]
    for path in (write_inventory(tmp_path / "own.csv", own, HEADER + ["length"]), write_own_lengths(tmp_path, own)):
        d = checked(qtbot, window, path)
        c = column(d, "length")
        assert d.model.headerData(c, Qt.Orientation.Horizontal) == "length", path
        assert d.model.headerData(c, Qt.Orientation.Horizontal, Qt.ItemDataRole.ToolTipRole) is None
        assert sorted(d.model.cell(r, c) for r in range(d.model.rowCount())) == [r["length"] for r in own], path


def write_own_lengths(tmp_path, rows):
    """``rows`` with their own length column as a layer of invented lines (UTM zone 33N)."""
    import shapely
    from test_batch_gpkg import write_layer
    path = tmp_path / "own-lengths.gpkg"
    lines = [shapely.LineString([(500_000 + 300 * i, 5_000_000), (500_000 + 300 * i + 10, 5_000_000)])
             for i in range(len(rows))]
    write_layer(path, rows, lines, crs="EPSG:32633", columns=HEADER + ["length"])
    return path


def test_the_layer_of_a_geopackage_with_several_is_asked_for(window, qtbot, tmp_path, monkeypatch):
    from PySide6.QtWidgets import QInputDialog
    path = write_geopackage(tmp_path / "two.gpkg", ROWS[:2], layers=("north", "south"))
    asked = []
    monkeypatch.setattr(QInputDialog, "getItem",
                        staticmethod(lambda _p, _t, label, items, *a: (asked.append(list(items)) or "south", True)))
    d = checked(qtbot, window, path)
    assert asked == [["north", "south"]] and "layer 'south'" in d.status.text()


def test_a_geopackage_in_degrees_without_lengths_is_refused_in_the_dialog(window, qtbot, tmp_path, dialogs):
    import shapely
    from test_batch_gpkg import write_layer
    path = tmp_path / "degrees.gpkg"
    write_layer(path, ROWS[:1], [shapely.LineString([(10, 50), (10.01, 50.01)])], crs="EPSG:4326", columns=HEADER)
    d = checked(qtbot, window, path)
    assert d.status.objectName() == "fieldMessage" and "degrees" in d.status.text() and d.run is None
    assert dialogs.shown == []


@pytest.mark.parametrize("units", ["si", "us"])
def test_every_result_column_is_headed_in_words_with_its_unit(units):
    """The table's heading of each result column is words (never the file's column name), with the unit of a
    quantity that has one: the cost per length in $/m or $/ft."""
    from app import inventory as ai
    from app.gui.inventory import column_title
    from hydraulics.units import system
    titles = {c: column_title(c, system(units)) for c in ai.RESULT_COLUMNS}
    assert all("_" not in t for t in titles.values()), titles
    assert titles["cost_per_length"] == "Cost\n($/%s)" % ("m" if units == "si" else "ft")
