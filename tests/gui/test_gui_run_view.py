"""The run view of the window on the demo's invented run: stations, profile, edits with undo, refusals, a station
opened as a channel, keyboard and room on small screens.

The numbers checked come from the Qt-free layer (app.run_design, app.run_drawing, app.evaluate): what the window
shows must be exactly what that layer gives, which is checked against published examples in tests/test_run_*.
"""

import copy
import re

import numpy as np
import pytest
from PySide6.QtCore import Qt
from PySide6.QtGui import QColor
from PySide6.QtWidgets import QLabel

import hydraulics as hy
from app import project as pj
from app.evaluate import evaluate_channel
from app.run_design import design_run
from app.run_drawing import profile_model
from waiting import WAIT, evaluated, settle, shown


def cell(view, row, key):
    from app.gui.run_view import STATION_COLUMNS
    return view.model.index(row, STATION_COLUMNS.index(key)).data()


def type_in(table, row, col, text):
    """Enter ``text`` in a cell of an input table as an edit (the table's itemChanged)."""
    table.table.item(row, col).setText(text)


@pytest.fixture
def demo_design(demo_window):
    project = demo_window.doc.project
    return design_run(project, project.runs[0], demo_window.doc.context.catalogue)


def test_the_window_starts_without_the_run_view(demo_window):
    assert demo_window.run_view is None and demo_window.runs_action.isEnabled()


def test_the_view_shows_every_station_of_the_demo_run(demo_window, qtbot, demo_design):
    w = demo_window
    view = shown(w, qtbot)
    units = w.doc.units
    rows = demo_design.station_rows(units)
    assert view.model.rowCount() == len(demo_design.result.points) == len(rows)
    assert cell(view, 0, "station") == "0+000.00" == rows[0]["station"]
    assert cell(view, len(rows) - 1, "station") == "0+700.00" == rows[-1]["station"]
    for key in ("flow", "normal_depth", "bed_shear", "freeboard"):
        assert [cell(view, i, key) for i in range(len(rows))] == [r[key] for r in rows]
    # headings carry their units; the first point, with no flow yet, is marked in words and colour
    from app.gui.run_view import STATION_COLUMNS
    head = view.model.headerData(STATION_COLUMNS.index("flow"), Qt.Orientation.Horizontal)
    assert head == "Design flow\n[m³/s]"
    assert cell(view, 0, "check") == "Not checked"
    assert view.model.index(0, 0).data(Qt.ItemDataRole.BackgroundRole).color() == QColor("#fff6e0")
    assert cell(view, 20, "check") == "Stable"
    # the schedule with its total, and the cautions, beside
    assert "Total cost $\u00a054,544" in view.results.schedule.text() or "Total cost" in view.results.schedule.text()
    total = f"{demo_design.result.total_cost:,.0f}"
    assert total in view.results.schedule.text()
    assert "Kirpich" in view.results.warnings.text()
    assert view.results.unverified.isVisible()


def test_the_profile_draws_the_drawing_model(demo_window, qtbot, demo_design):
    w = demo_window
    view = shown(w, qtbot)
    model = profile_model(demo_design, w.doc.units)
    for name, line in view.picture.lines.items():
        x, y = line.get_data()
        np.testing.assert_array_equal(np.asarray(x), model.lines[name].x)
        np.testing.assert_array_equal(np.asarray(y), model.lines[name].y)
    assert view.picture.lines["critical"].get_linestyle() == ":"    # the critical-depth line dotted
    assert view.picture.lines["normal"].get_linestyle() == "--"     # the normal-depth line dashed
    assert view.picture.lines["water_surface"].get_label() == "Water surface (computed)"
    texts = [t.get_text() for t in view.picture.ax.texts]
    assert [j.label for j in model.jumps] == ["jump 0+329.01"] and "jump 0+329.01" in texts   # the jump marked
    assert [t.get_text() for t in view.picture.ax.get_xticklabels()] == [t for _, t in model.ticks]
    assert any("Concrete" in t for t in texts)                    # a lining stretch labelled in its band
    assert any("Farmyard pipe" in t for t in texts)               # an inflow
    assert any("grade 3.00 %" in t for t in texts)                # a grade label
    # a station picked in the table is marked on the profile
    view.table.selectRow(12)
    assert view.picture.cursor.get_visible() and view.picture.cursor.get_xdata()[0] == model.lines["invert"].x[12]


def test_editing_a_grade_point_recomputes_and_undo_restores(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    before = [cell(view, i, "slope") for i in range(view.model.rowCount())]
    depth_before = cell(view, 30, "normal_depth")
    row = 3                                                       # the grade point at 0+520
    col = view.inputs.profile.column_of("elevation")
    type_in(view.inputs.profile, row, col, "46")                  # from 45.28 m: a flatter stretch above, steeper below
    assert w.doc.project.runs[0].profile[row].elevation == 46.0
    assert w.doc.undo_stack.count() == 1
    settle(view, qtbot)
    after = [cell(view, i, "slope") for i in range(view.model.rowCount())]
    assert after != before and cell(view, 30, "normal_depth") != depth_before
    w.undo_action.trigger()
    assert w.doc.project.runs[0].profile[row].elevation == pytest.approx(45.28)
    settle(view, qtbot)
    assert [cell(view, i, "slope") for i in range(view.model.rowCount())] == before
    assert view.inputs.profile.table.item(row, col).text() == "45.28"


@pytest.mark.parametrize("table, attribute, text, words", [
    ("sub_areas", "runoff_coefficient", "1.5", "must be ≤ 1"),
    ("sub_areas", "area", "-2", "must be > 0"),
    ("profile", "station", "600", "must be ≤ 520"),              # beyond the next grade point
    ("candidates", "unit_cost", "abc", "is not a number"),
])
def test_a_bad_value_is_refused_with_the_field_marked_and_the_old_table_greyed(demo_window, qtbot, table, attribute,
                                                                              text, words):
    w = demo_window
    view = shown(w, qtbot)
    run_before = pj.dumps(w.doc.project)
    rows_before = [cell(view, i, "flow") for i in range(view.model.rowCount())]
    t = view.inputs.table_for(table)
    col = t.column_of(attribute)
    type_in(t, 0 if table != "profile" else 2, col, text)
    assert pj.dumps(w.doc.project) == run_before and w.doc.undo_stack.count() == 0   # the document is unchanged
    assert words in t.message.text() and t.message.isVisible()
    assert t.marked and t.table.item(*next(iter(t.marked))).background().color() == QColor("#fde8e8")
    assert view.model.stale and view.model.rowCount() == len(rows_before)           # the last good table, greyed
    assert [cell(view, i, "flow") for i in range(view.model.rowCount())] == rows_before
    assert view.model.index(5, 2).data(Qt.ItemDataRole.ForegroundRole).color() == QColor("#a3a9ae")
    assert view.results.stale.isVisible() and "No result" in view.results.headline.text()
    assert not view.open_button.isEnabled()


def test_a_value_the_core_refuses_marks_its_cell_and_greys_the_result(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    flows = [cell(view, i, "flow") for i in range(view.model.rowCount())]
    t = view.inputs.candidates
    col = t.column_of("unit_cost")
    type_in(t, 1, col, "")             # riprap's price left to the shipped catalogue, which has none
    settle(view, qtbot)
    assert w.doc.project.runs[0].candidates[1].unit_cost is None       # taken (undoable), then refused by the run
    assert "candidates[1].unit_cost: is missing for Rock riprap" in view.complaint
    assert t.marked == {(1, col): view.complaint} and t.message.isVisible()
    assert view.model.stale and [cell(view, i, "flow") for i in range(view.model.rowCount())] == flows
    w.undo_action.trigger()
    settle(view, qtbot)
    assert not view.complaint and not view.model.stale and not t.marked
    assert t.table.item(1, col).text() == "95"


def test_moving_a_sub_area_recomputes(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    before = cell(view, 30, "flow")
    t = view.inputs.sub_areas
    type_in(t, 2, t.column_of("from_station"), "700")             # the woodlot enters at the outfall instead
    settle(view, qtbot)
    assert not view.complaint and view.design.run.sub_areas[2].from_station == 700.0
    assert cell(view, 30, "flow") != before
    w.undo_action.trigger()
    settle(view, qtbot)
    assert cell(view, 30, "flow") == before


def test_a_station_opens_as_a_channel_with_the_same_depth(demo_window, qtbot, demo_design):
    w = demo_window
    view = shown(w, qtbot)
    count = len(w.doc.project.channels)
    row = 12                                                       # 0+180.00, on the riprap stretch
    view.table.selectRow(row)
    view.table.setFocus()
    qtbot.keyClick(view.table, Qt.Key.Key_O, Qt.KeyboardModifier.ControlModifier | Qt.KeyboardModifier.ShiftModifier)
    assert len(w.doc.project.channels) == count + 1
    ch = w.doc.channel()
    assert ch.name == "North verge ditch at 0+180.00" and w.pages.currentWidget() is w.splitter
    assert ch.lining.key == "riprap" and w.doc.current == count
    station = demo_design.station_values(hy.units.SI)[row]
    design = evaluate_channel(ch, w.doc.context.catalogue)
    assert design.analysis.normal_depth == pytest.approx(station["normal_depth"], rel=1e-12)
    assert design.flow == pytest.approx(station["flow"], rel=1e-12)
    assert evaluated(w, qtbot).ok and w.tabs.currentIndex() == 0    # its cross-section and results are in view
    w.undo_action.trigger()                                        # one step undoes it
    assert len(w.doc.project.channels) == count


def test_a_station_without_flow_is_not_opened(demo_window, qtbot, dialogs):
    w = demo_window
    view = shown(w, qtbot)
    count = len(w.doc.project.channels)
    assert view.open_station(0) is None
    assert len(w.doc.project.channels) == count
    assert "no flow has reached" in w.statusBar().currentMessage()


def test_the_run_view_is_reached_by_keyboard(demo_window, qtbot):
    w = demo_window
    w.inputs.fields["slope"].edit.setFocus()
    qtbot.keyClick(w.inputs.fields["slope"].edit, Qt.Key.Key_5, Qt.KeyboardModifier.ControlModifier)
    assert w.run_view is not None and w.pages.currentWidget() is w.run_view
    qtbot.waitUntil(lambda: w.run_view.table.hasFocus(), timeout=2000)
    settle(w.run_view, qtbot)
    qtbot.keyClick(w.run_view.table, Qt.Key.Key_1, Qt.KeyboardModifier.ControlModifier)
    assert w.pages.currentWidget() is w.splitter and w.tabs.currentIndex() == 0
    for key, action in (("Ctrl+5", w.runs_action), ("Ctrl+Shift+O", w.open_station_action)):   # no clash
        users = [a for a in w.findChildren(type(action)) if any(s.toString() == key for s in a.shortcuts())]
        assert users == [action], key


def test_units_change_restates_the_table(demo_window, qtbot, demo_design):
    w = demo_window
    view = shown(w, qtbot)
    w.doc.set_units("us")
    rows = demo_design.station_rows(hy.units.US)
    assert cell(view, 12, "station") == rows[12]["station"] and cell(view, 12, "flow") == rows[12]["flow"]
    assert view.inputs.profile.table.horizontalHeaderItem(0).text() == "Station [ft]"


def labels_fit(root):
    for lab in root.findChildren(QLabel):
        if not lab.isVisible() or not lab.text() or lab.width() == 0 or lab.wordWrap():
            continue
        assert lab.width() >= lab.minimumSizeHint().width(), (lab.objectName(), lab.text())


@pytest.mark.parametrize("units", ["si", "us"])
def test_the_run_view_fits_1366_by_768(demo_window, qtbot, units):
    w = demo_window
    w.doc.set_units(units)
    w.resize(1366, 768)
    view = shown(w, qtbot)
    qtbot.wait(50)
    assert w.width() <= 1366 and w.height() <= 768
    labels_fit(view)
    assert view.picture.canvas.height() >= 250 and view.picture.canvas.width() >= 500
    assert view.table.viewport().height() >= 6 * 22                 # six stations at least
    for t in view.inputs.tables():                                   # every input column readable
        header = t.table.horizontalHeader()
        for j in range(t.table.columnCount()):
            assert header.sectionSize(j) >= 40, (t.table.objectName(), j)
        assert sum(header.sectionSize(j) for j in range(t.table.columnCount())) <= t.table.viewport().width() + 1


def test_the_run_view_fits_1024_by_640(demo_window, qtbot):
    from app.gui.run_view import RunView
    view = RunView(demo_window.doc)
    qtbot.addWidget(view)
    view.resize(1024, 640)
    view.show()
    qtbot.waitUntil(lambda: view.idle and view.design is not None, timeout=WAIT)
    qtbot.wait(50)
    hint = view.minimumSizeHint()
    assert hint.width() <= 1024 and hint.height() <= 640
    labels_fit(view)
    assert view.picture.canvas.height() >= 200 and view.table.viewport().height() >= 4 * 22
    assert all(re.fullmatch(r"\d\+\d{3}\.\d\d", t.get_text()) for t in view.picture.ax.get_xticklabels())


def test_a_narrow_window_gives_the_run_view_two_columns_and_the_verdict_on_its_tab(demo_window, qtbot):
    """Below TWO_COLUMNS_BELOW the run view, like the channel page, has the inputs and the results as two tabs on
    the left, and its profile takes the room; above it, three columns again."""
    from app.gui.screen_fit import TWO_COLUMNS_BELOW
    w = demo_window
    w.resize(1440, 900)
    view = shown(w, qtbot)
    assert not view.side_tabs.two_columns and view.splitter.count() == 3
    w.resize(911, 455)                                # 1366x768 at 150 %, less the panel and title bar
    qtbot.waitUntil(lambda: view.side_tabs.isVisible())
    assert view.width() < TWO_COLUMNS_BELOW and view.splitter.count() == 2
    assert [view.side_tabs.tabText(i) for i in range(2)] == ["Inputs", "Results: Every station stable"]
    assert view.middle.width() >= 0.55 * view.width() and view.inputs.isVisible()
    assert view.picture.canvas.width() >= 500                       # was about 320 in the middle of three
    view.side_tabs.setCurrentIndex(1)
    qtbot.waitUntil(lambda: view.results.isVisible())
    type_in(view.inputs.profile, 0, 1, "bad")         # a refusal: the tab says so as the panel does
    qtbot.waitUntil(lambda: view.results.headline.text() == "No result for these inputs")
    assert view.side_tabs.tabText(1) == "Results: No result for these inputs"
    w.resize(1440, 900)
    qtbot.waitUntil(lambda: not view.side_tabs.isVisible())
    assert view.splitter.count() == 3 and view.splitter.indexOf(view.inputs) == 0
    assert view.splitter.indexOf(view.results) == 2 and view.results.isVisible() and view.inputs.isVisible()


def _fit_probe():
    import sys
    from pathlib import Path
    here = str(Path(__file__).parent)
    sys.path.insert(0, here)
    try:
        import fit_probe
    finally:
        sys.path.remove(here)
    return fit_probe


@pytest.mark.parametrize("size", [(911, 455), (683, 370), (1366, 768)])
@pytest.mark.parametrize("units", ["si", "us"])
def test_the_profile_keeps_its_writing_inside_and_apart_on_small_windows(demo_window, qtbot, size, units):
    """At the logical sizes of 1366x768 and 1024x640 at 150 % (the probe in test_gui_fit checks the same at a
    pixel ratio of 1.5): title, ticks, labels and key inside the figure, no two labels over each other, station
    labels apart; the key, when left out for want of height, is in the tooltip."""
    w = demo_window
    w.doc.set_units(units)
    w.resize(*size)
    view = shown(w, qtbot)
    qtbot.wait(50)
    view.picture.canvas.draw()
    assert _fit_probe().figure_cut(view.picture) == []
    assert overlapping_labels(view.picture) == []
    renderer = view.picture.canvas.get_renderer()
    ticks = [t.get_window_extent(renderer) for t in view.picture.ax.get_xticklabels() if t.get_text()]
    assert len(ticks) >= 2 and all(a.x1 < b.x0 for a, b in zip(ticks, ticks[1:]))
    assert view.picture.title.get_text().startswith("North verge ditch")
    if view.picture.legend.get_visible():
        assert view.picture.canvas.toolTip() == ""
    else:
        assert "Water surface (computed) (blue, solid)" in view.picture.canvas.toolTip()


def test_an_overtopping_backwater_is_marked_on_the_run_profile(demo_window, qtbot):
    """An invented culvert headwater 0.3 m over the ditch top at the outfall: the profile marks the stretch."""
    w = demo_window
    view = shown(w, qtbot)
    run = w.doc.project.runs[0]
    run.outfall.control, run.outfall.water_level = "level", 44.56 + 1.3
    try:
        view.compute()
        settle(view, qtbot)
        qtbot.waitUntil(lambda: view.design is not None and view.design.run.outfall.control == "level", timeout=WAIT)
        texts = [t.get_text() for t in view.picture.ax.texts]
        assert "overtopped" in texts and "too shallow" in texts
        ws = view.picture.lines["water_surface"].get_data()[1]
        assert np.nanmax(ws) > 0 and abs(float(ws[-1]) - (44.56 + 1.3)) < 1e-9
    finally:
        run.outfall.control, run.outfall.water_level = "normal", None


# -- the outfall control ----------------------------------------------------------------------------------
def outfall_control(view):
    """The control the shown result assumed at the outfall: (kind, level in the user's units)."""
    c = next(c for c in view.design.control_values(view.doc.units) if c["where"] == "outfall")
    return c["kind"], c["level"]


def type_level(box, text):
    """Type ``text`` in the outfall's water-level field and leave it."""
    box.level.setText(text)
    box.level.setModified(True)
    box.level.editingFinished.emit()


def test_changing_the_outfall_control_recomputes_the_profile_and_undo_restores(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    box = view.inputs.outfall
    # the demo's invented culvert headwater, 45.4 m, controls the outfall
    assert box.chosen == "level" and box.level.isEnabled() and box.level.text() == "45.4"
    assert box.level_label.text() == "Water level [m]"
    assert outfall_control(view) == ("level", pytest.approx(45.4))
    ws_before = view.picture.lines["water_surface"].get_data()[1].copy()
    box.control.setCurrentIndex(box.control.findData("critical"))      # a free overfall at the outfall instead
    assert not box.level.isEnabled()
    out = w.doc.project.runs[0].outfall
    assert (out.control, out.water_level) == ("critical", 45.4) and w.doc.undo_stack.count() == 1
    assert "critical depth" in w.doc.undo_stack.undoText()
    settle(view, qtbot)
    assert outfall_control(view)[0] == "critical"
    # the computed water surface now ends on the critical-depth line at the outfall, below the headwater
    ws = view.picture.lines["water_surface"].get_data()[1]
    crit = view.picture.lines["critical"].get_data()[1]
    assert float(ws[-1]) == pytest.approx(float(crit[-1]), abs=1e-6)
    assert float(ws[-1]) < float(ws_before[-1]) == pytest.approx(45.4)
    assert "critical depth" in view.results.surface.text()
    w.undo_action.trigger()
    assert w.doc.project.runs[0].outfall.control == "level" and box.chosen == "level" and box.level.isEnabled()
    settle(view, qtbot)
    assert outfall_control(view) == ("level", pytest.approx(45.4))
    np.testing.assert_array_equal(view.picture.lines["water_surface"].get_data()[1], ws_before)
    assert "Outfall, 0+700.00: water level, level 45.40\xa0m" in view.results.surface.text()


def test_a_known_outfall_water_level_is_typed_in_the_projects_units(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    box = view.inputs.outfall
    box.control.setCurrentIndex(box.control.findData("normal"))
    settle(view, qtbot)
    assert outfall_control(view)[0] == "normal"
    type_level(box, "")                                # the level field is not read with another control
    box.control.setCurrentIndex(box.control.findData("level"))
    # no level given: refused where it is typed, the document unchanged, the last result kept (greyed)
    assert box.level.isEnabled() and "is needed" in box.message.text() and box.message.isVisible()
    assert w.doc.project.runs[0].outfall.control == "normal" and w.doc.undo_stack.count() == 1
    assert view.model.stale and view.results.stale.isVisible()
    type_level(box, "45.2")                          # the invert at the outfall is 44.56 m (invented demo data)
    assert not box.message.isVisible()
    out = w.doc.project.runs[0].outfall
    assert (out.control, out.water_level) == ("level", 45.2) and w.doc.undo_stack.count() == 2
    settle(view, qtbot)
    assert outfall_control(view) == ("level", pytest.approx(45.2))
    assert not view.model.stale
    # the same level in feet: the field speaks the project's units
    w.doc.set_units("us")
    assert float(box.level.text()) == pytest.approx(45.2 / 0.3048, abs=0.01) and "ft" in box.level_label.text()


@pytest.mark.parametrize("text, words", [("abc", "is not a number"), ("44", "must be above the invert there, 44.56"),
                                         ("", "is needed")])
def test_a_bad_outfall_level_is_refused_and_the_last_result_kept(demo_window, qtbot, text, words):
    w = demo_window
    view = shown(w, qtbot)
    box = view.inputs.outfall
    rows = [cell(view, i, "water_depth") for i in range(view.model.rowCount())]
    saved = pj.dumps(w.doc.project)
    type_level(box, text)
    assert words in box.message.text() and box.message.isVisible()
    assert pj.dumps(w.doc.project) == saved and w.doc.undo_stack.count() == 0
    assert view.model.stale and [cell(view, i, "water_depth") for i in range(view.model.rowCount())] == rows
    assert words in view.results.reason.text()
    assert outfall_control(view) == ("level", pytest.approx(45.4))
    type_level(box, "45.4")                           # put right: the marks go, the result is current again
    assert not box.message.isVisible() and not view.model.stale and not view.complaint


def overlapping_labels(picture):
    """Pairs of words drawn on the profile (labels, marks, legend entries) whose boxes cover each other, as
    rendered in the window's figure."""
    picture.canvas.draw()
    renderer = picture.canvas.get_renderer()
    texts = [t for t in picture.ax.texts if t.get_visible() and t.get_text().strip()]
    texts += [t for t in picture.legend.get_texts() if picture.legend.get_visible()] + [picture.title]
    boxes = [(t.get_text(), t.get_window_extent(renderer)) for t in texts]
    return [(a, b) for i, (a, ba) in enumerate(boxes) for b, bb in boxes[i + 1:] if ba.overlaps(bb)]


@pytest.mark.parametrize("size", [(1366, 768), (1920, 1080)])
def test_no_words_on_the_demo_profile_cover_others(demo_window, qtbot, size):
    w = demo_window
    w.resize(*size)
    view = shown(w, qtbot)
    qtbot.wait(50)
    labels = [t.get_text() for t in view.picture.ax.texts]
    assert "jump 0+329.01" in labels and "grade 3.00 %" in labels   # the demo's jump, on its steep stretch
    assert overlapping_labels(view.picture) == []
    # the legend stays within the canvas
    legend = view.picture.legend.get_window_extent(view.picture.canvas.get_renderer())
    assert 0 <= legend.x0 and legend.x1 <= view.picture.figure.bbox.width


# -- items, values of the run itself, and runs added, renamed and deleted (app.run_editing does the change) --------
def test_a_bend_added_and_its_radius_typed_recompute_and_undo_takes_both_back(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    bends = view.inputs.bends
    assert bends.table.rowCount() == 1
    bends.table.setCurrentCell(0, 0)
    qtbot.keyClick(bends.table, Qt.Key.Key_Insert)               # Insert in the table adds after the chosen row
    assert len(w.doc.project.runs[0].bends) == 2 and bends.table.rowCount() == 2
    settle(view, qtbot)
    type_in(bends, 1, bends.column_of("radius"), "12")
    assert w.doc.project.runs[0].bends[1].radius == 12.0
    settle(view, qtbot)
    assert view.problem == "" and w.doc.undo_stack.count() == 2
    w.undo_action.trigger()
    w.undo_action.trigger()
    assert len(w.doc.project.runs[0].bends) == 1


def test_a_section_split_gives_one_more_range_and_the_stations_follow(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    sections = view.inputs.sections
    sections.table.setCurrentCell(1, 0)
    sections.add_button.click()
    run = w.doc.project.runs[0]
    assert [(s.from_station, s.to_station) for s in run.sections] == [(0.0, 330.0), (330.0, 515.0), (515.0, 700.0)]
    assert sections.table.item(2, sections.column_of("section")).text().startswith("trapezoid, bottom width 0.9")
    settle(view, qtbot)
    assert view.problem == ""
    type_in(sections, 2, sections.column_of("ditch_depth"), "1.4")
    assert w.doc.project.runs[0].sections[2].ditch_depth == 1.4


def test_what_the_run_cannot_do_without_is_not_deleted_and_says_why(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    profile = view.inputs.profile
    profile.table.setCurrentCell(0, 0)
    profile.remove_button.click()
    assert "ends of the run" in profile.message.text() and profile.message.isVisible()
    assert len(w.doc.project.runs[0].profile) == 5 and w.doc.undo_stack.count() == 0
    profile.table.setCurrentCell(2, 0)
    qtbot.keyClick(profile.table, Qt.Key.Key_Delete)
    assert len(w.doc.project.runs[0].profile) == 4 and w.doc.undo_stack.count() == 1
    inflows = view.inputs.inflows
    inflows.table.setCurrentCell(-1, -1)
    inflows.remove_button.click()
    assert "Choose the inflow" in inflows.message.text()


def test_the_design_storm_is_typed_and_a_bad_one_refused(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    field = view.inputs.settings.fields["return_period"]
    assert view.inputs.settings.labels["return_period"].text() == "Design storm [years]"
    field.setText("-5")
    field.setModified(True)
    field.editingFinished.emit()
    assert "must be > 0 years" in view.inputs.settings.message.text()
    assert w.doc.project.runs[0].return_period == 10.0 and view.complaint
    field.setText("25")
    field.setModified(True)
    field.editingFinished.emit()
    assert w.doc.project.runs[0].return_period == 25.0
    settle(view, qtbot)
    assert "25-year" in view.inputs.summary.text()


def test_the_spacing_is_typed_in_the_projects_units(demo_window, qtbot):
    w = demo_window
    w.us_action.trigger()
    view = shown(w, qtbot)
    settings = view.inputs.settings
    assert settings.labels["spacing"].text() == "Design points at most [ft]"
    settings.fields["spacing"].setText("100")
    settings.fields["spacing"].setModified(True)
    settings.fields["spacing"].editingFinished.emit()
    assert w.doc.project.runs[0].spacing == pytest.approx(30.48)
    settle(view, qtbot)
    stations = [view.values[i]["station"] for i in range(len(view.values))]
    assert max(np.diff(stations)) <= 100.0 + 1e-9


def test_runs_are_added_renamed_and_deleted_with_undo(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    view.inputs.run_buttons["new"].click()
    runs = w.doc.project.runs
    assert [r.name for r in runs] == ["North verge ditch", "Run 1"] and view.current == 1
    assert runs[1].candidates == runs[0].candidates              # the candidates of the run shown, with their prices
    settle(view, qtbot)
    assert view.problem == "" and view.design.run.name == "Run 1"
    item = view.inputs.run_list.item(1)
    item.setText("North verge ditch")                             # a name in use is refused
    assert w.doc.project.runs[1].name == "Run 1"
    view.inputs.run_list.item(1).setText("South verge ditch")
    assert w.doc.project.runs[1].name == "South verge ditch"
    view.inputs.run_buttons["delete"].click()
    assert [r.name for r in w.doc.project.runs] == ["North verge ditch"]
    w.undo_action.trigger()
    assert [r.name for r in w.doc.project.runs] == ["North verge ditch", "South verge ditch"]
    assert w.runs_action.text() == "&Ditch runs (2)"
    w.undo_action.trigger()                                       # the rename undone: the list says so too
    names = [view.inputs.run_list.item(i).text() for i in range(view.inputs.run_list.count())]
    assert [r.name for r in w.doc.project.runs] == names == ["North verge ditch", "Run 1"]


def test_a_project_without_runs_gets_one_from_the_menu(qtbot):
    from app.editing import new_project
    from app.gui.mainwindow import MainWindow
    w = MainWindow(new_project("us"))
    qtbot.addWidget(w)
    w.resize(1440, 900)
    w.show()
    assert not w.runs_action.isEnabled()
    w.new_run_action.trigger()
    view = w.run_view
    assert w.runs_action.isEnabled() and [r.name for r in w.doc.project.runs] == ["Run 1"]
    settle(view, qtbot)
    # a new project has no rainfall relation: the run says so instead of a result
    assert "rainfall" in view.problem
    w.doc.undo_stack.setClean()


def test_a_candidate_lining_is_chosen_from_the_catalogue_and_priced(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    groups = dict(view.candidate_choices())
    assert ("asphalt", "Asphalt") in [(k, label.split(",")[0]) for k, label in groups["Rigid"]]
    assert all(label for entries in groups.values() for _k, label in entries)
    view.add_candidate("asphalt", 0)
    run = w.doc.project.runs[0]
    assert [c.key for c in run.candidates] == ["grass_good_sod", "asphalt", "riprap", "concrete"]
    settle(view, qtbot)
    assert "unit cost" in view.problem and "Asphalt" in view.problem     # the catalogue has no price for it
    table = view.inputs.candidates
    type_in(table, 1, table.column_of("unit_cost"), "30")
    settle(view, qtbot)
    assert view.problem == ""
    view.add_candidate("asphalt")
    assert "already" in table.message.text()
    table.table.setCurrentCell(1, 0)
    table.remove_button.click()
    assert [c.key for c in w.doc.project.runs[0].candidates] == ["grass_good_sod", "riprap", "concrete"]


def test_the_add_button_of_the_candidates_offers_the_catalogue_with_the_present_ones_greyed(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    view.inputs.candidates.table.setCurrentCell(2, 0)
    view.inputs.candidates.add_button.click()
    menu = view.candidate_menu
    qtbot.waitUntil(menu.isVisible)
    offered = {a.text(): a.isEnabled() for a in menu.actions() if not a.isSeparator()}
    assert offered["Asphalt, rough"] is True and len(offered) == 19             # the shipped catalogue
    greyed = [k for k, enabled in offered.items() if not enabled]               # the run's three candidates
    assert len(greyed) == 3 and "Grass, sod-forming, good stand, about 150 mm tall" in greyed
    next(a for a in menu.actions() if a.text().startswith("Gravel")).trigger()
    menu.close()
    assert [c.key for c in w.doc.project.runs[0].candidates] == ["grass_good_sod", "riprap", "concrete", "gravel"]


def test_a_sub_area_spread_along_a_range_or_entering_at_one_station(demo_window, qtbot):
    w = demo_window
    view = shown(w, qtbot)
    table = view.inputs.sub_areas
    col = table.column_of("to_station")
    assert table.table.item(0, col).text() == "330" and table.table.item(1, col).text() == ""
    type_in(table, 1, col, "400")                                  # Pasture field A drains in from 0+180 to 0+400
    assert w.doc.project.runs[0].sub_areas[1].to_station == 400.0
    settle(view, qtbot)
    assert view.problem == ""
    type_in(table, 1, col, "")                                      # back to one station
    assert w.doc.project.runs[0].sub_areas[1].to_station is None
    type_in(table, 1, col, "900")
    assert "≤ 700 m" in table.message.text() and w.doc.project.runs[0].sub_areas[1].to_station is None


def test_station_labels_are_thinned_to_the_room_of_the_axis():
    """Each label of 7 characters takes (7 + 2) x 6.3 = 56.7 px; ten of them need 567 px: on 300 px every second
    one is kept, on 150 px every fourth, on 2000 px all."""
    from app.gui.run_plot import thinned
    ticks = [(i * 100.0, f"{i}+00.00") for i in range(10)]
    assert thinned(ticks, 2000, 6.3) == ticks
    assert thinned(ticks, 300, 6.3) == ticks[::2]
    assert thinned(ticks, 150, 6.3) == ticks[::4]
    assert thinned([], 100, 6.3) == []


# -- one verdict per station -------------------------------------------------------------------------------
def _grass_only(run):
    """Invented: the demo run with grass as its only candidate, which cannot hold the 3 % stretch."""
    run.candidates = [c for c in run.candidates if c.key.startswith("grass")]


def _backwater(run):
    """Invented: a culvert headwater 0.3 m over the ditch top at the outfall (too shallow, then overtopped)."""
    run.outfall.control, run.outfall.water_level = "level", 44.56 + 1.3


@pytest.mark.parametrize("change, expected", [(None, set()), (_grass_only, {"UNSTABLE"}),
                                              (_backwater, {"TOO_SHALLOW"})])
def test_each_station_has_one_verdict_in_the_window_the_sheet_and_the_profile(demo_window, qtbot, change, expected):
    """The station table's word and colour, the run sheet's status and the profile's trouble bands come from the one
    state of each design point (app.run_summary.station_states). The demo run (invented) passes everywhere; with
    grass alone, or a headwater over the banks, stations fail and each front end marks the same ones."""
    from app.gui.run_view import ROW_COLOURS
    from app.run_summary import run_summary
    from app.sheet.run_content import run_sheet
    w = demo_window
    view = shown(w, qtbot)
    project = w.doc.project
    saved = copy.deepcopy(project.runs[0])
    if change is not None:
        change(project.runs[0])
    try:
        view.compute()
        settle(view, qtbot)
        qtbot.waitUntil(lambda: view.design is not None and view.design.run.candidates == project.runs[0].candidates
                        and view.design.run.outfall.control == project.runs[0].outfall.control, timeout=WAIT)
        design = view.design
        units = w.doc.units
        states = run_summary(design, units).states
        sheet = run_sheet(project, project.runs[0], w.doc.context.catalogue, design=design)
        model = profile_model(design, units)
        stations = [float(units.from_si("length", p.station)) for p in design.result.points]
        assert len(states) == view.model.rowCount() == len(sheet.status) == len(stations)
        for row, (st, (words, trouble), x) in enumerate(zip(states, sheet.status, stations)):
            assert cell(view, row, "check") == st.verdict.words
            brush = view.model.index(row, 0).data(Qt.ItemDataRole.BackgroundRole)
            colour = ROW_COLOURS[st.verdict]
            assert (brush is None and colour is None) or brush.color() == QColor(colour)
            assert words.startswith(st.verdict.heading) and trouble == bool(st.trouble)
            bands = {b.status for b in model.trouble if b.start - 1e-9 <= x <= b.end + 1e-9}
            assert bands == set(st.trouble)
            assert (st.verdict.status == "fail") == bool(bands & {"not stable", "overtopped", "too shallow"})
        failing = {st.verdict.name for st in states if st.verdict.status == "fail"}
        assert failing == expected
    finally:
        project.runs[0] = saved
        view.compute()
        settle(view, qtbot)
