"""The dialogs that edit a ditch run's sub-area (C, land covers, own time of concentration) and section range
(shape, dimensions, ditch depth) as a whole, on the demo's invented run.

What the window shows after an edit is compared with the Qt-free layer (app.run_design) run on the same edited
project; the methods themselves are checked against their published sources in tests/test_run_*.
"""

import copy

import pytest
from PySide6.QtCore import QTimer
from PySide6.QtWidgets import QApplication

from app.run_design import design_run
from app.run_editing import with_item_replaced
from waiting import WAIT, shown


def column(view, key):
    from app.gui.run_view import STATION_COLUMNS
    j = STATION_COLUMNS.index(key)
    return [view.model.index(i, j).data() for i in range(view.model.rowCount())]


def through_dialog(qtbot, open_it, act):
    """Open a modal dialog with ``open_it``; ``act(dialog)`` runs on it while it is shown (it closes it)."""
    seen = {}

    def on_shown():
        d = QApplication.activeModalWidget()
        seen["dialog"] = d
        try:
            act(d)
        finally:
            if d.isVisible():
                d.reject()

    QTimer.singleShot(50, on_shown)
    open_it()
    return seen["dialog"]


def type_entry(dialog, key, text):
    edit = dialog.entries[key]
    edit.setText(text)
    edit.textEdited.emit(text)


def test_kirpich_time_recomputes_the_run(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    before = column(view, "tc")
    table = view.inputs.sub_areas
    row = 3                                     # "South verge": 5 minutes typed, along 330 to 700
    table.table.setCurrentCell(row, 0)

    def act(d):
        assert d.objectName() == "subAreaDialog"
        d.tc_how.setCurrentIndex(d.tc_how.findData("kirpich"))
        d.tc_how.activated.emit(d.tc_how.currentIndex())
        type_entry(d, "tc.flow_length", "2000")
        type_entry(d, "tc.slope", "0.01")
        assert "[m]" in d.labels["tc.flow_length"][0].text()
        assert d.ok.isEnabled(), d.message.text()
        d.accept()

    through_dialog(qtbot, table.item_button.click, act)
    sa = w.doc.project.runs[0].sub_areas[row]
    assert sa.time_of_concentration == {"method": "kirpich", "flow_length": 2000.0, "slope": 0.01}
    qtbot.waitUntil(lambda: view.idle and view.design is not None, timeout=WAIT)
    expected = design_run(w.doc.project, w.doc.project.runs[0], w.doc.context.catalogue).station_rows(w.doc.units)
    after = column(view, "tc")
    assert after == [r["tc"] for r in expected]
    stations = [p.station for p in view.design.result.points]
    drained = [i for i, s in enumerate(stations) if s > 330.0]
    assert any(after[i] != before[i] for i in drained)
    assert all(after[i] == before[i] for i, s in enumerate(stations) if s < 330.0)
    w.doc.undo_stack.undo()
    assert w.doc.project.runs[0].sub_areas[row].time_of_concentration == {"method": "typed", "value": 300.0}


def test_land_covers_weighted_c_shown_and_applied(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    table = view.inputs.sub_areas

    def act(d):
        # "Pasture field A": 3.6 ha at 0.30 and 0.6 ha at 0.55 -> (3.6*0.30 + 0.6*0.55) / 4.2 = 0.336
        assert d.c_how.currentData() == "covers"
        assert d.weighted.text() == "C weighted by area: 0.336"
        d.covers.item(1, 2).setText("0.9")     # the farm track sealed: (1.08 + 0.54) / 4.2 = 0.386
        assert d.weighted.text() == "C weighted by area: 0.386"
        d.covers.item(1, 1).setText("1.6")     # no longer adds up to the area: the core refuses
        assert not d.ok.isEnabled() and "must agree within 0.5 %" in d.message.text()
        d.covers.item(1, 1).setText("0.6")
        assert d.ok.isEnabled()
        type_entry(d, "area", "0")             # the core's check of the area, the entry marked
        assert not d.ok.isEnabled() and d.marked == "area" and d.message.text().startswith("area: must be > 0")
        type_entry(d, "area", "4.2")
        d.accept()

    through_dialog(qtbot, lambda: table._double_clicked(1, 0), act)
    sa = w.doc.project.runs[0].sub_areas[1]
    assert [lc.runoff_coefficient for lc in sa.land_covers] == [0.3, 0.9] and sa.runoff_coefficient is None
    qtbot.waitUntil(lambda: view.idle and view.design is not None, timeout=WAIT)
    basis = next(b for b in view.design.bases if b.name == "Pasture field A")
    assert basis.runoff_coefficient == pytest.approx((36000 * 0.3 + 6000 * 0.9) / 42000)


def test_a_bad_sheet_flow_length_is_refused_with_the_cores_message(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    table = view.inputs.sub_areas
    before = copy.deepcopy(w.doc.project.runs[0])

    def act(d):
        assert d.tc_how.currentData() == "tr55"
        assert d.ok.isEnabled()
        d.segments.item(0, 1).setText("0")
        assert not d.ok.isEnabled()
        assert d.message.text() == "time of concentration, segment 1, length: must be > 0, got 0"
        assert d.marked == "segments"
        # beyond the 300 ft of TR-55 Appendix D form 3: the core cautions, it does not refuse
        d.segments.item(0, 1).setText("150")
        assert d.ok.isEnabled() and "beyond the 91.4 m TR-55 allows" in d.note.text()

    through_dialog(qtbot, lambda: table._double_clicked(0, 0), act)
    assert w.doc.project.runs[0] == before


def test_a_section_changed_to_a_triangle_and_undone(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    table = view.inputs.sections
    section_col = [c.attribute for c in table.columns].index("section")
    before = copy.deepcopy(w.doc.project.runs[0])
    depth = w.doc.undo_stack.count()

    def act(d):
        assert d.objectName() == "sectionDialog"
        d.shape.setCurrentIndex(d.shape.findData("triangle"))
        d.shape.activated.emit(d.shape.currentIndex())
        assert d.entries["triangle.left_slope"].text() == "3"
        type_entry(d, "triangle.left_slope", "-1")
        assert not d.ok.isEnabled() and d.marked == "triangle.left_slope"
        type_entry(d, "triangle.left_slope", "4")
        assert d.ok.isEnabled(), d.message.text()
        d.accept()

    through_dialog(qtbot, lambda: table._double_clicked(0, section_col), act)
    rs = w.doc.project.runs[0].sections[0]
    assert rs.section == {"shape": "triangle", "left_slope": 4.0, "right_slope": 3.0}
    assert w.doc.undo_stack.count() == depth + 1
    assert "triangle" in table.table.item(0, section_col).text()
    w.doc.undo_stack.undo()
    assert w.doc.project.runs[0] == before


def test_us_units_in_the_dialogs(demo_window, qtbot):
    w = demo_window
    w.doc.set_units("us")
    view = shown(w, qtbot)
    from app.gui.run_item_dialogs import SectionDialog, SubAreaDialog
    d = view.item_dialog("sub_areas", 0)
    qtbot.addWidget(d)
    assert isinstance(d, SubAreaDialog)
    assert d.labels["area"][0].text() == "Area [ac]"
    assert d.labels["tc.rain_2yr_24h"][0].text().endswith("[in]")
    assert d.entries["tc.rain_2yr_24h"].text() == "2.7559"          # 70 mm
    assert "Length [ft]" in d.segments.horizontalHeaderItem(1).text()
    s = view.item_dialog("sections", 0)
    qtbot.addWidget(s)
    assert isinstance(s, SectionDialog)
    assert s.labels["ditch_depth"][0].text() == "Ditch depth as built [ft]"
    assert s.entries["trapezoid.bottom_width"].text() == "1.9685"   # 0.6 m


@pytest.mark.parametrize("units", ["us", "si"])
def test_ok_without_a_change_changes_nothing_and_a_change_touches_only_its_entry(demo_window, qtbot, units):
    """The dialogs show values rounded in the user's units (0.6 m as 1.9685 ft); an entry left as shown reads
    back as the value it showed, so OK at once is no edit, and a changed entry changes that value alone (the
    others were drifting: 9000 m^2 to 8999.8, 0.9 m to 0.90001344; found by a random session in the window)."""
    w = demo_window
    w.doc.set_units(units)
    view = shown(w, qtbot)
    run = copy.deepcopy(w.doc.project.runs[view.current])
    steps = w.doc.undo_stack.count()
    for items in ("sub_areas", "sections"):
        d = view.item_dialog(items, 0)
        qtbot.addWidget(d)
        assert d.result() == getattr(run, items)[0]
    through_dialog(qtbot, lambda: view.edit_item("sub_areas", 0), lambda d: d.accept())
    through_dialog(qtbot, lambda: view.edit_item("sections", 0), lambda d: d.accept())
    assert w.doc.undo_stack.count() == steps and w.doc.project.runs[view.current] == run
    d = view.item_dialog("sub_areas", 0)
    qtbot.addWidget(d)
    type_entry(d, "runoff_coefficient", "0.55")
    changed = d.result()
    assert changed.runoff_coefficient == 0.55
    assert (changed.area, changed.time_of_concentration) == (run.sub_areas[0].area,
                                                              run.sub_areas[0].time_of_concentration)


def test_a_surveyed_section_is_shown_not_edited(demo_window, qtbot):
    from app import project as pj
    from app.gui.run_item_dialogs import SectionDialog
    rs = pj.RunSection(0.0, 10.0, {"shape": "irregular", "stations": [0.0, 1.0, 2.0], "elevations": [1.0, 0.0, 1.0],
                                   "n": 0.03}, 0.8)
    d = SectionDialog(rs, demo_window.doc.units)
    qtbot.addWidget(d)
    assert d.shape.currentData() == "irregular" and "project file" in d.survey_note.text()
    assert d.ok.isEnabled(), d.message.text()
    type_entry(d, "ditch_depth", "0.5")
    assert d.result().section == rs.section and d.result().ditch_depth == 0.5
    assert with_item_replaced(pj.Run("r", [], pj.Outfall(0.0), [rs], [], []), "sections", 0,
                              d.result()).sections[0].ditch_depth == 0.5


@pytest.mark.parametrize("units, first, last", [("si", "0+330.00", "0+700.00"),
                                                 # 330 m and 700 m in ft (1 ft = 0.3048 m exactly, NIST SP 811,
                                                 # 2008 ed., Appendix B.8): 1082.68 ft and 2296.59 ft
                                                 ("us", "10+82.68", "22+96.59")])
def test_the_section_dialog_says_which_stations_it_edits(demo_window, qtbot, units, first, last):
    w = demo_window
    w.doc.set_units(units)
    view = shown(w, qtbot)
    d = view.item_dialog("sections", 1)              # the demo's second range: 330 m to 700 m
    qtbot.addWidget(d)
    d.show()
    assert d.windowTitle() == f"Section, stations {first} to {last}"
    assert d.stretch.text() == f"The ditch from stations {first} to {last}." and d.stretch.isVisible()


def test_a_segments_cells_that_do_not_apply_say_so_and_cautions_read_as_sentences(demo_window, qtbot):
    from PySide6.QtCore import Qt
    from app.gui.run_item_dialogs import NOT_USED
    w = demo_window
    view = shown(w, qtbot)
    d = view.item_dialog("sub_areas", 0)             # "North lanes verge": sheet flow, then shallow flow
    qtbot.addWidget(d)
    surface, n = d.segments.item(0, 4), d.segments.item(1, 3)
    # TR-55 (NRCS 1986) Chapter 3: sheet flow is timed with Manning's n (Table 3-1), shallow concentrated flow from
    # its slope and whether it is paved (Figure 3-1)
    assert surface.text() == n.text() == NOT_USED
    assert "no surface" in surface.toolTip() and "no Manning's n" in n.toolTip()
    for item in (surface, n):
        assert not item.flags() & Qt.ItemFlag.ItemIsEditable
    assert d.ok.isEnabled(), d.message.text()
    segments = d.result().time_of_concentration["segments"]
    assert segments[0]["roughness"] == 0.011 and segments[1]["surface"] == "unpaved"
    assert segments[1]["roughness"] is None and segments[0]["surface"] is None   # as the project file holds them
    d.add_shallow.click()                             # an added segment alike
    assert d.segments.item(2, 3).text() == NOT_USED
    k = view.item_dialog("sub_areas", 1)             # "Pasture field A": Kirpich's formula on a 2.5 % slope
    qtbot.addWidget(k)
    assert k.ok.isEnabled() and k.note.text().startswith("Flow-path slope 2.5 % is outside Kirpich's data")
    assert k.note.text().endswith(".")
