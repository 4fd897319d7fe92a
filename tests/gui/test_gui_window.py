"""The main window on the offscreen platform: live results, refusals, undo, units, files, autosave.

Expected numbers come from the core's own solvers, which are checked against
published cases in tests/test_published_cases.py; here the point is that the
window shows what the core computes, in the right units, at the right time.
"""

import json

import numpy as np
import pytest
from PySide6.QtCore import QPoint, Qt
from PySide6.QtWidgets import QLabel, QMessageBox

import hydraulics as hy
from app import project as pj
from app import channel_display as display
from app.context import Context
from app.editing import new_project
from app.gui import settings
from app.gui.forms import RATIONAL
from app.gui.mainwindow import MainWindow
from waiting import compared, evaluated
from window_typing import field, type_into


def shown(w, key):
    return w.results.values[key].text()


def test_window_builds_with_named_parts(demo_window):
    w = demo_window
    assert "[*]" in w.windowTitle() and "invented" in w.windowTitle()
    assert w.channel_list.count() == len(w.doc.project.channels) >= 3
    assert [w.tabs.tabText(i) for i in range(w.tabs.count())] == [
        "Cross-section", "Rating curve", "Specific energy", "Lining comparison"]
    assert w.results.caution.isVisible()
    assert "licensed engineer" in w.results.caution.text() and "local drainage code" in w.results.caution.text()
    assert w.save_action.shortcut().toString() and w.undo_action.shortcut().toString()
    assert w.results.values["normal_depth"].text().endswith(" m")


def test_typing_updates_results_and_plot(demo_window, qtbot):
    w = demo_window
    ch = w.doc.channel()
    before_depth = shown(w, "normal_depth")
    before_water = w.section_picture.water.get_xy().copy()
    type_into(qtbot, field(w, "trapezoid:section.bottom_width"), "1.5")
    assert w.doc.channel().section["bottom_width"] == 1.5
    evaluated(w, qtbot)
    sec = hy.Trapezoid(bottom_width=1.5, left_slope=ch.section["left_slope"], right_slope=ch.section["right_slope"])
    y = hy.normal_depth(sec, ch.flow.value, ch.slope, ch.manning_n)
    assert shown(w, "normal_depth") == f"{y:.3f} m" != before_depth
    assert w.results.numbers.isEnabled()
    water = w.section_picture.water.get_xy()
    assert water.shape != before_water.shape or not np.allclose(water, before_water)
    assert water[:, 1].max() == pytest.approx(y)          # water polygon tops out at normal depth (SI shown)
    assert w.section_picture.surface.get_ydata()[0] == pytest.approx(y)


def test_invalid_field_shows_message_and_keeps_last_good(demo_window, qtbot):
    w = demo_window
    f = field(w, "trapezoid:section.bottom_width")
    good_depth = shown(w, "normal_depth")
    stored = w.doc.channel().section["bottom_width"]
    type_into(qtbot, f, "-2")
    assert f.error and "≥ 0 m" in f.error and f.message.isVisible()
    assert f.edit.property("invalid") is True        # what the style sheet reads
    assert w.doc.channel().section["bottom_width"] == stored      # nothing reached the project
    assert shown(w, "normal_depth") == good_depth                 # last good result kept ...
    assert not w.results.numbers.isEnabled()                      # ... and greyed
    assert w.results.stale.isVisible()
    assert w.section_picture.water.get_alpha() == pytest.approx(0.3)
    assert w.section_picture.stale_note.get_visible()
    type_into(qtbot, f, "abc")
    assert "not a number" in f.error
    type_into(qtbot, f, "0.8")
    assert not f.error and w.results.numbers.isEnabled() and w.doc.channel().section["bottom_width"] == 0.8
    assert w.section_picture.water.get_alpha() == pytest.approx(1.0)


def test_combination_refused_by_the_core_marks_the_field(demo_window, qtbot):
    w = demo_window
    w.inputs.shape.setCurrentIndex(w.inputs.shape.findData("triangle"))
    w.inputs._shape_chosen(w.inputs.shape.currentIndex())
    assert w.doc.channel().section["shape"] == "triangle"
    type_into(qtbot, field(w, "triangle:section.left_slope"), "0")
    type_into(qtbot, field(w, "triangle:section.right_slope"), "0")
    f = field(w, "triangle:section.left_slope")
    assert "V-ditch" in f.error or "at least one side" in f.error
    assert w.doc.channel().section["right_slope"] > 0


def test_no_solution_keeps_last_good_without_a_dialog(demo_window, qtbot, dialogs):
    w = demo_window
    w.doc.set_current(3)                                          # the pipe
    assert w.doc.channel().section["shape"] == "circle"
    evaluated(w, qtbot)
    good = shown(w, "normal_depth")
    type_into(qtbot, field(w, "flow.value"), "50")
    evaluated(w, qtbot)
    assert "No solution" in w.results.reason.text() and "surcharge" in w.results.reason.text()
    assert shown(w, "normal_depth") == good and not w.results.numbers.isEnabled()
    assert dialogs.shown == []


def test_typing_in_one_field_is_one_undoable_edit(demo_window, qtbot):
    w = demo_window
    original = pj.Channel(**{**w.doc.channel().__dict__})
    f = field(w, "slope")
    type_into(qtbot, f, "0.02")
    assert w.doc.undo_stack.count() == 1                         # 0, 0., 0.0, 0.02 merged
    assert w.doc.channel().slope == 0.02 and w.isWindowModified()
    w.undo_action.trigger()
    assert w.doc.channel() == original and f.edit.text() == "0.012" and not w.isWindowModified()
    w.redo_action.trigger()
    assert w.doc.channel().slope == 0.02 and f.edit.text() == "0.02"


def test_channel_list_edits_are_undoable(demo_window):
    w = demo_window
    doc = w.doc
    names = [c.name for c in doc.project.channels]
    w.add_action.trigger()
    w.duplicate_action.trigger()
    assert len(doc.project.channels) == len(names) + 2
    assert doc.rename_channel(names[0]) is not None               # a used name is refused
    assert doc.rename_channel("Kerb drain") is None
    w.delete_action.trigger()
    assert "Kerb drain" not in [c.name for c in doc.project.channels]
    assert w.channel_list.count() == len(doc.project.channels)
    while doc.undo_stack.canUndo():
        doc.undo_stack.undo()
    assert [c.name for c in doc.project.channels] == names
    assert [w.channel_list.item(i).text() for i in range(w.channel_list.count())] == names


def test_shape_change_is_one_undoable_edit(demo_window):
    w = demo_window
    old = w.doc.channel().section
    w.inputs._shape_chosen(w.inputs.shape.findData("circle"))
    assert w.doc.channel().section["shape"] == "circle"
    assert w.inputs.shape_pages.currentIndex() == w.inputs.shape.findData("circle")
    w.undo_action.trigger()
    assert w.doc.channel().section == old


def test_unit_switch_round_trips_fields_and_results(demo_window, qtbot):
    w = demo_window
    w.doc.set_current(2)                                          # rational method channel: more fields
    evaluated(w, qtbot)
    keys = [k for k, f in w.inputs.fields.items() if not f.edit.isHidden()]
    before = {k: w.inputs.fields[k].edit.text() for k in keys}
    results_before = {k: v.text() for k, v in w.results.values.items()}
    project_before = pj.dumps(w.doc.project)
    w.us_action.trigger()
    evaluated(w, qtbot)
    b = w.doc.channel().section["bottom_width"]
    assert field(w, "trapezoid:section.bottom_width").edit.text() == f"{b / 0.3048:.5g}"
    assert field(w, "trapezoid:section.bottom_width").suffix.text() == "ft"
    assert field(w, "flow.area").suffix.text() == "ac"
    assert shown(w, "flow").endswith("ft³/s")
    assert w.doc.project.units == "us"
    w.si_action.trigger()
    evaluated(w, qtbot)
    assert {k: w.inputs.fields[k].edit.text() for k in keys} == before
    assert {k: v.text() for k, v in w.results.values.items()} == results_before
    assert pj.dumps(w.doc.project) == project_before


def test_switching_units_is_no_undo_step_and_leaves_the_project_unmodified(demo_window, qtbot):
    w = demo_window
    assert not w.isWindowModified() and not w.undo_action.isEnabled()
    w.us_action.trigger()
    evaluated(w, qtbot)
    assert w.doc.project.units == "us" and w.results.values["normal_depth"].text().endswith(" ft")
    assert not w.doc.modified and not w.isWindowModified()          # how numbers are shown, not the design
    assert w.doc.undo_stack.count() == 0 and not w.undo_action.isEnabled()
    w.doc.edit("slope", 0.02, "Change bed slope")
    w.si_action.trigger()
    w.undo_action.trigger()                                            # undo takes back the edit, not the units
    assert w.doc.project.units == "si" and w.doc.channel().slope != 0.02 and not w.doc.modified


def test_values_typed_in_us_units_reach_the_core_in_si(demo_window, qtbot):
    w = demo_window
    w.us_action.trigger()
    type_into(qtbot, field(w, "trapezoid:section.bottom_width"), "3")
    assert w.doc.channel().section["bottom_width"] == pytest.approx(3 * 0.3048, rel=1e-15)
    type_into(qtbot, field(w, "slope"), "1.5%")
    assert w.doc.channel().slope == pytest.approx(0.015)


def test_rational_method_flow_is_shown(demo_window, qtbot):
    w = demo_window
    w.doc.set_current(2)
    fb = w.doc.channel().flow
    assert fb.method == "rational"
    evaluated(w, qtbot)
    q = hy.rational.rational_flow(fb.runoff_coefficient, fb.intensity, fb.area)
    assert w.inputs.q_value.text() == f"{round(q, 4):g}\u00a0m³\u2060/\u2060s"     # kept on one line
    assert "Kirpich" in w.inputs.tc_value.text()
    type_into(qtbot, field(w, "flow.runoff_coefficient"), "1.2")
    assert "≤ 1" in field(w, "flow.runoff_coefficient").error


def test_surveyed_section_table_edits(demo_window, qtbot):
    w = demo_window
    w.doc.set_current(4)
    table = w.inputs.survey.table
    assert table.rowCount() == len(w.doc.channel().section["stations"])
    table.item(3, 1).setText("0.05")                              # raise the lowest point
    assert w.doc.channel().section["elevations"][3] == pytest.approx(0.05)
    table.item(2, 0).setText("x")
    assert "not a number" in w.inputs.survey.message.text()
    assert w.doc.channel().section["stations"][2] == 2.6
    w.undo_action.trigger()
    assert w.doc.channel().section["elevations"][3] == 0.0


def _window_on_one_n_survey(qtbot):
    """The demo project with its surveyed section's n given once for every segment, as a project file may give it
    (and a LandXML import writes it); that channel chosen."""
    data = json.loads(pj.demo_path().read_text(encoding="utf-8"))
    survey = next(c for c in data["channels"] if c["section"]["shape"] == "irregular")
    survey["section"]["n"] = 0.035
    w = MainWindow(pj.loads(json.dumps(data)))
    qtbot.addWidget(w)
    w.show()
    qtbot.waitExposed(w)
    w.doc.set_current(data["channels"].index(survey))
    evaluated(w, qtbot)
    return w


@pytest.mark.parametrize("button", ["add", "remove"])
def test_adding_or_removing_a_point_keeps_one_n_given_for_every_segment(qtbot, button):
    """Adding a point once replaced an n given once (0.035) by 0.03 for every segment and broke the table;
    removing one raised. The points change, every segment keeps 0.035, and the result is computed with it."""
    w = _window_on_one_n_survey(qtbot)
    before = len(w.doc.channel().section["stations"])
    w.inputs.survey.table.setCurrentCell(1, 0)
    getattr(w.inputs.survey, button).click()
    ev = evaluated(w, qtbot)
    section = w.doc.channel().section
    assert len(section["stations"]) == before + (1 if button == "add" else -1)
    assert section["n"] == [0.035] * (len(section["stations"]) - 1)
    assert ev.ok and ev.result.manning_n == pytest.approx(0.035, rel=1e-12)
    assert w.inputs.survey.table.item(0, 2).text() == "0.035"
    w.doc.undo_stack.setClean()


def test_leaving_a_survey_with_one_n_takes_that_n(qtbot):
    w = _window_on_one_n_survey(qtbot)
    box = w.inputs.shape
    box.setCurrentIndex(box.findData("trapezoid"))
    w.inputs._shape_chosen(box.currentIndex())
    assert w.doc.channel().section["shape"] == "trapezoid" and w.doc.channel().manning_n == 0.035
    w.doc.undo_stack.setClean()


def test_save_then_reopen_gives_the_same_project(demo_window, tmp_path, dialogs):
    w = demo_window
    w.doc.edit("slope", 0.0123, "Change bed slope")
    dialogs.save_name = str(tmp_path / "site")
    assert w.save_action.trigger() is None and w.doc.path == tmp_path / "site.json"
    assert not w.isWindowModified()
    saved = pj.load(tmp_path / "site.json")
    assert saved == w.doc.project
    assert settings.RECENT_FILES.read()[0] == str((tmp_path / "site.json").resolve())
    w.new_action.trigger()
    assert w.doc.project != saved
    dialogs.open_name = str(tmp_path / "site.json")
    w.open_action.trigger()
    assert w.doc.project == saved and w.doc.path == tmp_path / "site.json"


@pytest.mark.parametrize("damage, reason", [
    (lambda t: t[: len(t) // 3], "damaged or incomplete"),
    (lambda t: "{not json", "damaged or incomplete"),
    (lambda t: t.replace('"schema_version": 2', '"schema_version": 99'), "newer Ditchwright"),
    (lambda t: json.dumps({"format": "something else"}), "not a Ditchwright project"),
    (lambda t: t.replace('"slope": 0.012', '"slope": NaN', 1), 'channels[0] "East verge ditch": slope: must be a finite'),
    (lambda t: "[" * 100_000 + "]" * 100_000, "nest too deeply to read"),
    (lambda t: t.replace('"bottom_width": 0.6', '"bottom_width": [0.6, 0.7]', 1),
     'channels[0] "East verge ditch": section.bottom_width: must be a single number, got a list'),
], ids=["truncated", "corrupt", "future-version", "foreign", "nan", "nested-100000", "list-dimension"])
def test_bad_file_gives_a_clear_message_and_changes_nothing(demo_window, tmp_path, dialogs, damage, reason):
    w = demo_window
    path = tmp_path / "bad.json"
    text = damage(pj.dumps(w.doc.project))
    path.write_text(text, encoding="utf-8")
    project_before, path_before = w.doc.project, w.doc.path
    assert w.open_file(path, ask=False) is False
    kind, title, message = dialogs.shown[-1]
    assert kind == "warning" and reason in message and "Nothing was changed" in message
    assert w.doc.project is project_before and w.doc.path == path_before
    assert path.read_text(encoding="utf-8") == text
    assert [p.name for p in tmp_path.iterdir() if p.name.endswith(".json")] == ["bad.json"]


def test_unsaved_changes_are_guarded(demo_window, dialogs):
    w = demo_window
    w.doc.edit("slope", 0.02, "Change bed slope")
    dialogs.answers["warning"] = [QMessageBox.StandardButton.Cancel]
    w.new_action.trigger()
    assert w.doc.channel().slope == 0.02                          # cancelled: nothing dropped
    dialogs.answers["warning"] = [QMessageBox.StandardButton.Discard]
    w.new_action.trigger()
    assert w.doc.project == new_project("si") and not w.isWindowModified()   # the demo's units, round values
    assert dialogs.kinds() == ["warning", "warning"]


def test_failed_save_says_so_and_stays_modified(demo_window, tmp_path, dialogs, monkeypatch):
    w = demo_window
    w.doc.edit("slope", 0.02, "Change bed slope")
    import app.files

    def disk_full(*args):
        raise OSError("disk full")
    monkeypatch.setattr(app.files.os, "replace", disk_full)
    assert w._write(tmp_path / "x.json") is False
    assert dialogs.kinds() == ["critical"] and "disk full" in dialogs.shown[0][2]
    assert w.isWindowModified() and not (tmp_path / "x.json").exists()


def test_autosave_and_recovery_after_a_crash(qtbot, tmp_path):
    from app.gui import autosave
    first = MainWindow(pj.Project(name="Before the crash"))
    qtbot.addWidget(first)
    first.doc.edit("slope", 0.0321, "Change bed slope")
    assert first.autosaver.save_now()
    assert first.autosaver.project_file.parent == settings.data_folder() / "autosave"
    assert autosave.find_recoverable() == []                      # its window still holds the lock
    first.autosaver.lock.unlock()                                  # as if the program had died
    second = MainWindow()
    qtbot.addWidget(second)
    second.ask_recovery = lambda r: "recover"
    assert second.offer_recovery()
    assert second.doc.project.name == "Before the crash" and second.doc.channel().slope == 0.0321
    assert second.isWindowModified() and second.doc.path is None
    assert not first.autosaver.project_file.exists()
    first.doc.undo_stack.setClean()
    second.doc.recovered = False


def test_clean_close_leaves_no_autosave(qtbot):
    w = MainWindow()
    qtbot.addWidget(w)
    w.doc.edit("slope", 0.02, "Change bed slope")
    w.autosaver.save_now()
    files = list((settings.data_folder() / "autosave").glob("*.json"))
    assert files
    w.doc.undo_stack.setClean()
    w.close()
    assert list((settings.data_folder() / "autosave").glob("*.json")) == []


def test_window_settings_are_remembered(qtbot, monkeypatch):
    w = MainWindow()
    qtbot.addWidget(w)
    w.close()
    stored = settings.WINDOW_GEOMETRY.read()
    assert not stored.isEmpty() and stored == w.saveGeometry()
    assert settings.SPLITTER_STATE.read() == w.splitter.saveState()
    restored = []
    monkeypatch.setattr(MainWindow, "restoreGeometry", lambda self, g: restored.append(g) or True)
    again = MainWindow()
    qtbot.addWidget(again)
    assert restored == [stored]


def test_settings_keys_are_declared_once():
    keys = [s.key for s in settings.ALL]
    assert len(keys) == len(set(keys))
    import pathlib
    import re
    gui = pathlib.Path(settings.__file__).parent
    for path in gui.glob("*.py"):
        if path.name != "settings.py":
            assert not re.search(r"QSettings\(\)\.(value|setValue)", path.read_text()), path


def test_rating_and_energy_views_draw_the_current_channel(demo_window):
    w = demo_window
    w.tabs.setCurrentIndex(1)
    ev = w.evaluation
    x, y = w.rating_picture.normal.get_data()
    q_at = np.interp(ev.result.normal_depth, y, x)
    assert q_at == pytest.approx(ev.flow, rel=2e-3)               # the curve passes through the design point
    w.tabs.setCurrentIndex(2)
    e, yy = w.energy_picture.curve.get_data()
    assert yy[int(np.argmin(e))] == pytest.approx(ev.result.critical_depth, rel=0.02)


def test_caution_and_warnings_in_words(demo_window, qtbot):
    w = demo_window
    w.doc.set_current(3)                                           # the pipe runs near critical
    evaluated(w, qtbot)
    assert "near critical" in w.results.warnings.text()


def test_a_supercritical_channel_is_cautioned_in_the_window(qtbot):
    """Issue 16 item 5: FHWA HEC-15, 3rd ed. (2005), Section 2.1.1: supercritical flow may raise surface waves
    approaching the depth of flow, so the freeboard needs care; the caution says so with the Froude number and its
    source. The chute is invented (tests/test_regime_cautions.py: Froude number about 3.4)."""
    ch = pj.Channel(name="Steep chute (invented)", flow=pj.FlowBasis(value=1.13), slope=0.05,
                    section={"shape": "trapezoid", "bottom_width": 0.6, "left_slope": 2.0, "right_slope": 2.0},
                    lining=pj.LiningChoice("concrete", None), manning_n=None)
    w = MainWindow(pj.Project(name="Invented chute", units="si", channels=[ch]))
    qtbot.addWidget(w)
    w.show()
    evaluated(w, qtbot)
    text = " ".join(w.results.warnings.text().split())
    assert "is supercritical" in text and "HEC-15 Section 2.1.1" in text
    assert "surface waves" in text and "freeboard" in text and "jump" in text
    froude = float(shown(w, "froude"))
    assert froude > 1.2 and f"Froude number {froude:.2f}" in text
    w.doc.undo_stack.setClean()


def outfall_index(w):
    return next(i for i, c in enumerate(w.doc.project.channels) if c.alternatives)


def test_comparison_view_applies_a_lining_in_one_undoable_step(demo_window, qtbot):
    w = demo_window
    w.doc.set_current(outfall_index(w))
    w.tabs.setCurrentIndex(3)
    view = w.comparison
    before = w.doc.channel()
    keys = [r.choice.key for r in compared(view, qtbot)]
    assert keys[0] == before.lining.key and "gravel" in keys
    assert view.table.columnCount() == len(view.rows)
    assert view.table.cellWidget(0, 0) is view.pictures[0].canvas          # a small section per lining
    gravel = keys.index("gravel")
    verdict_row = [view.table.verticalHeaderItem(i).text() for i in range(view.table.rowCount())].index("Verdict")
    assert view.table.item(verdict_row, gravel).text() == view.rows[gravel].evaluation.verdict.headline
    view.select_lining(gravel)
    assert view.apply_button.isEnabled()
    count = w.doc.undo_stack.count()
    qtbot.mouseClick(view.apply_button, Qt.MouseButton.LeftButton)
    assert w.doc.channel().lining.key == "gravel" and w.doc.undo_stack.count() == count + 1
    assert {r.choice.key for r in compared(view, qtbot)} == set(keys)       # the old lining stays compared
    assert view.rows[view.selected()].choice.key == "gravel"                 # and the applied one stays picked
    evaluated(w, qtbot)
    assert w.results.headline.text() == "Not stable"                     # the verdict follows
    w.undo_action.trigger()
    assert w.doc.channel() == before


def test_comparison_table_is_copied_as_tab_separated_text(demo_window, qtbot):
    from PySide6.QtGui import QGuiApplication

    from app import channel_display as display
    w = demo_window
    w.doc.set_current(outfall_index(w))
    w.tabs.setCurrentIndex(3)
    qtbot.mouseClick(w.comparison.copy_button, Qt.MouseButton.LeftButton)
    text = QGuiApplication.clipboard().text()
    assert text == display.comparison_tsv(w.comparison.rows, w.doc.context)
    assert text.splitlines()[0].split("\t")[:3] == ["Lining", "Depth [m]", "Velocity [m/s]"]


def test_ticking_a_lining_to_compare_is_undoable(demo_window, qtbot):
    w = demo_window
    w.doc.set_current(outfall_index(w))
    w.tabs.setCurrentIndex(3)
    view = w.comparison
    before = list(w.doc.channel().alternatives)
    assert not view.checks[w.doc.channel().lining.key].isEnabled()          # its own lining is always in
    view.checks["asphalt"].setChecked(True)
    assert [a.key for a in w.doc.channel().alternatives][-1] == "asphalt"
    assert "asphalt" in [r.choice.key for r in compared(view, qtbot)]
    w.undo_action.trigger()
    assert w.doc.channel().alternatives == before and not view.checks["asphalt"].isChecked()


def test_choosing_a_lining_checks_its_stability(demo_window, qtbot):
    w = demo_window
    w.doc.set_current(0)
    form = w.inputs.lining
    form.combo.setCurrentIndex(form.combo.findData("riprap"))
    form._chosen(form.combo.currentIndex())
    assert w.doc.channel().lining.key == "riprap"
    evaluated(w, qtbot)
    assert not form.d50.edit.isHidden() and form.d50.suffix.text() == "mm"
    assert form.n.edit.isHidden() and form.n_value.text() != "—"
    assert w.results.values["permissible_shear"].text().endswith("Pa")
    assert w.results.headline.text() in ("Stable", "Not stable")
    type_into(qtbot, form.d50, "300")
    assert w.doc.channel().lining.d50 == pytest.approx(0.3)
    evaluated(w, qtbot)
    assert not w.results.values["required_d50"].isHidden()
    type_into(qtbot, form.d50, "0")
    assert "> 0 mm" in form.d50.error
    form._chosen(form.combo.findData(""))
    assert w.doc.channel().lining is None and not form.n.edit.isHidden()
    evaluated(w, qtbot)
    assert w.results.headline.text() == "Hydraulics only"


def test_a_lining_the_catalogue_does_not_know_is_named(qtbot):
    project = pj.Project(channels=[pj.Channel(lining=pj.LiningChoice("marble_tiles"))])
    w = MainWindow(project)
    qtbot.addWidget(w)
    evaluated(w, qtbot)
    assert "unknown lining 'marble_tiles'" in w.results.reason.text()
    assert "marble_tiles" in w.inputs.lining.combo.currentText()
    assert "unknown lining" in w.inputs.lining.message.text()


def test_ctrl_z_in_a_field_undoes_the_project_edit(demo_window, qtbot):
    w = demo_window
    w.activateWindow()
    f = field(w, "slope")
    type_into(qtbot, f, "0.03")
    assert w.doc.channel().slope == 0.03
    qtbot.keyClick(f.edit, Qt.Key.Key_Z, Qt.KeyboardModifier.ControlModifier)
    assert w.doc.channel().slope == 0.012 and f.edit.text() == "0.012"


def test_user_catalogue_in_the_data_folder_sets_unit_costs(qtbot):
    from app import channel_display as display
    path = settings.user_catalogue_path()
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text('schema_version = 1\n[[lining]]\nkey = "concrete"\nunit_cost = 95.0\n', encoding="utf-8")
    w = MainWindow(pj.loads(pj.demo_path().read_text(encoding="utf-8")))
    qtbot.addWidget(w)
    w.doc.set_current(next(i for i, c in enumerate(w.doc.project.channels) if c.alternatives))
    rows, _ = display.compare(w.doc.channel(), w.doc.context)
    concrete = next(r for r in rows if r.choice.key == "concrete")
    assert concrete.cost_per_length is not None and concrete.cost_per_length > 0
    w.doc.undo_stack.setClean()


# -- a project that cannot be written: said, work kept (issue 18, item 1) -----------------------------------------
@pytest.mark.parametrize("spoil, reason", [
    (lambda doc: setattr(doc.project.channels[0], "slope", float("nan")),
     'channels[0] "East verge ditch": slope: must be a finite number, got nan'),
    (lambda doc: setattr(doc.project.channels[1], "name", "North \ud800 ditch"),
     'channels[1] "North \\ud800 ditch": name: holds a lone surrogate character'),
    (lambda doc: setattr(doc.project.sheet, "company", "\udfff"), "sheet.company: holds a lone surrogate character"),
], ids=["nan", "surrogate-name", "surrogate-company"])
def test_a_save_that_cannot_be_written_says_why_and_keeps_the_work(demo_window, tmp_path, dialogs, spoil, reason):
    w = demo_window
    w.doc.edit("bend_radius", 40.0, "Change bend radius")
    spoil(w.doc)
    (tmp_path / "out").mkdir()
    target = tmp_path / "out" / "x.json"
    target.write_text("old", encoding="utf-8")
    assert w._write(target) is False
    assert dialogs.kinds() == ["critical"]
    assert reason in dialogs.shown[0][2] and "still open" in dialogs.shown[0][2]
    assert w.isWindowModified() and w.doc.path is None
    assert target.read_text(encoding="utf-8") == "old" and list(target.parent.iterdir()) == [target]


def test_an_autosave_that_fails_says_so_once_and_keeps_the_work(qtbot, dialogs, monkeypatch):
    w = MainWindow(pj.Project(name="Unsaved"))
    qtbot.addWidget(w)
    w.doc.edit("slope", 0.0321, "Change bed slope")
    w.doc.project.channels[0].flow.value = float("inf")
    assert w.autosaver.save_now() is False
    assert w.autosaver.save_now() is False                     # the same reason is not shown twice
    assert dialogs.kinds() == ["warning"]
    kind, title, text = dialogs.shown[0]
    assert title == "Autosave failed" and 'channels[0] "Ditch 1": flow.value: must be a finite number' in text
    assert "Autosave failed" in w.statusBar().currentMessage()
    assert not w.autosaver.project_file.exists() and w.isWindowModified()
    w.doc.project.channels[0].flow.value = 0.5
    assert w.autosaver.save_now() is True                      # fixed: the copy is written again

    def broken(*args, **kwargs):
        raise RuntimeError("something nobody expected")
    monkeypatch.setattr(pj, "save", broken)
    w.doc.edit("slope", 0.0322, "Change bed slope")
    assert w.autosaver.save_now() is False
    assert dialogs.kinds() == ["warning", "warning"] and "RuntimeError: something nobody expected" in dialogs.shown[1][2]
    w.doc.undo_stack.setClean()


def test_the_copied_comparison_keeps_formulas_as_text(demo_window, qtbot):
    from PySide6.QtGui import QGuiApplication

    w = demo_window
    w.doc.set_current(outfall_index(w))
    w.tabs.setCurrentIndex(3)
    assert compared(w.comparison, qtbot)
    for row, name in zip(w.comparison.rows, ["=HYPERLINK(\"x\")", "@SUM(1)", "+1+cmd", "-1+cmd", "\tx=1"]):
        row.name = name            # a name from the user's own lining catalogue
    qtbot.mouseClick(w.comparison.copy_button, Qt.MouseButton.LeftButton)
    lines = QGuiApplication.clipboard().text().splitlines()
    names = [line.split("\t")[0] for line in lines[1:]]
    expected = ["'=HYPERLINK(\"x\")", "'@SUM(1)", "'+1+cmd", "'-1+cmd", "' x=1"]
    assert names and all(n.startswith(e) for n, e in zip(names, expected))
    assert all(len(line.split("\t")) == len(lines[0].split("\t")) for line in lines)


def test_results_list_the_values_not_yet_verified(demo_window, qtbot):
    """The window's results carry the same list as the sheet: values leant on but not yet read in HEC-15."""
    from hydraulics import provenance as pv
    w = demo_window
    names = [c.name for c in w.doc.project.channels]
    w.channel_list.setCurrentRow(names.index("Outfall swale"))       # riprap in a bend
    evaluated(w, qtbot)
    panel = w.results
    assert panel.unverified.isVisible() and pv.NOT_VERIFIED_TITLE in panel.unverified_heading.text()
    text = panel.unverified.text()
    for key in ("table_6_1", "bend_factor", "side_factor"):
        assert pv.entry(key).what in text, key
    assert pv.entry("blodgett").what not in text        # read in the circular, so not listed
    assert pv.entry("freeboard").what not in text       # read in HEC-22 (2009), which gives HEC-15's guidance
    w.channel_list.setCurrentRow(names.index("East verge ditch"))    # concrete: no stone relations
    evaluated(w, qtbot)
    assert pv.entry("table_6_1").what not in panel.unverified.text()
    assert pv.entry("freeboard").what not in panel.unverified.text()


def test_rating_curve_marks_where_the_stone_relation_changes(demo_window, qtbot):
    """Riprap: n passes from Bathurst's relation to Blodgett's at da/D50 = 1.5 (HEC-15 Eq. 6.1 and 6.2 ranges);
    the curve kinks there, so the picture marks the depth; a concrete ditch has no such mark."""
    from hydraulics.linings.roughness import SWITCH_NOTE
    w = demo_window
    names = [c.name for c in w.doc.project.channels]
    w.tabs.setCurrentIndex(1)
    w.channel_list.setCurrentRow(names.index("Outfall swale"))
    evaluated(w, qtbot)
    pic = w.rating_picture
    assert pic.switch.get_visible()
    ys = pic.switch.get_ydata()[0]
    sec = w.doc.channel().build_section()
    g = sec.properties(ys)
    assert g.area / g.top_width == pytest.approx(1.5 * w.doc.channel().lining.d50, rel=1e-6)   # SI project
    assert SWITCH_NOTE in [t.get_text() for t in pic.legend.get_texts()]
    w.channel_list.setCurrentRow(names.index("East verge ditch"))
    evaluated(w, qtbot)
    assert not pic.switch.get_visible()
    assert SWITCH_NOTE not in [t.get_text() for t in pic.legend.get_texts()]


def test_comparison_applies_the_picked_lining_after_the_columns_are_reordered(demo_window, qtbot):
    w = demo_window
    w.doc.set_current(outfall_index(w))
    w.tabs.setCurrentIndex(3)
    view = w.comparison
    for key in ("concrete", "riprap", "grass_good_sod"):                  # more linings to order
        if not view.checks[key].isChecked():
            view.checks[key].setChecked(True)
    compared(view, qtbot)
    heads = [view.table.verticalHeaderItem(i).text() for i in range(view.table.rowCount())]
    velocity_row = next(i for i, h in enumerate(heads) if h.startswith("Velocity"))
    view.table.verticalHeader().sectionClicked.emit(velocity_row)         # the user clicks "Velocity"
    view.table.verticalHeader().sectionClicked.emit(velocity_row)         # and again: fastest first
    speeds = [view.rows[j].core.velocity for j in view.shown_order()]
    assert speeds == sorted(speeds, reverse=True) and speeds != [r.core.velocity for r in view.rows]
    assert view.table.verticalHeaderItem(velocity_row).text().endswith("▼")
    header = view.table.horizontalHeader()
    first = header.logicalIndex(0)                                         # the leftmost lining on screen
    x = header.sectionViewportPosition(first) + header.sectionSize(first) // 2
    qtbot.mouseClick(header.viewport(), Qt.MouseButton.LeftButton, pos=QPoint(x, header.height() // 2))
    picked = view.rows[first]
    assert view.selected() == first
    messages = []
    view.status_message.connect(messages.append)
    qtbot.mouseClick(view.apply_button, Qt.MouseButton.LeftButton)
    assert w.doc.channel().lining.key == picked.choice.key
    assert messages and picked.name in messages[-1]                        # and says so, by its own name
    compared(view, qtbot)
    assert view.rows[view.selected()].choice.key == picked.choice.key       # still picked after the refresh
    assert view.copy_table().splitlines()[1].startswith(display.comparison_label(picked, w.doc.context))  # order shown


@pytest.mark.parametrize("units, ratio_unit", [("us", "ft/ft"), ("si", "m/m")])
def test_a_slope_typed_as_a_percentage_is_refused_with_that_reading_offered(demo_window, qtbot, units, ratio_unit):
    w = demo_window
    w.doc.set_units(units)
    f = field(w, "slope")
    before = w.doc.channel().slope
    assert f.suffix.text() == ratio_unit and "%" not in f.suffix.text()   # a ratio field says so, never "%"
    type_into(qtbot, f, "3.5")
    assert w.doc.channel().slope == before                                  # 3.5 ft/ft is never taken
    assert "If you meant 3.5 %, that is 0.035" in f.error and ratio_unit in f.error
    assert f.offered == pytest.approx(0.035) and 'href="use"' in f.message.text()
    assert f.suffix.text() == ratio_unit
    f.message.linkActivated.emit("use")                                     # the user takes the offer
    assert w.doc.channel().slope == pytest.approx(0.035) and f.edit.text() == "0.035" and not f.error
    w.undo_action.trigger()
    assert w.doc.channel().slope == before


def test_rational_form_says_nothing_until_typed_then_in_words_and_fits(demo_window, qtbot):
    from PySide6.QtWidgets import QLabel
    w = demo_window
    w.resize(1366, 768)
    qtbot.wait(10)
    assert w.doc.channel().flow.method == "typed"
    w.inputs._method_chosen(w.inputs.method.findData("rational"))        # the user picks the rational method
    blanks = [field(w, s.path) for s in RATIONAL if not s.optional]
    assert all(not f.edit.text() and not f.error and f.message.isHidden() for f in blanks)
    texts = [lab.text() for lab in w.inputs.findChildren(QLabel) + w.results.findChildren(QLabel)
             if lab.isVisible()]
    assert not any("None" in t or "got" in t for t in texts), texts
    c = field(w, "flow.runoff_coefficient")
    type_into(qtbot, c, "x")
    assert c.error.startswith("'x' is not a number") and c.message.isVisible()
    c.edit.clear()
    c._typed("")
    assert c.error == "Runoff coefficient C is needed: enter a number > 0 and ≤ 1."
    body = w.inputs.widget()                                               # nothing wider than its panel
    assert body.minimumSizeHint().width() <= w.inputs.viewport().width()
    for lab in w.inputs.findChildren(QLabel):
        if lab.isVisible() and lab.text() and not lab.wordWrap():
            assert lab.width() >= lab.minimumSizeHint().width(), lab.text()


@pytest.mark.parametrize("units, flow, width, freeboard", [("us", "20", "2", "0.5"), ("si", "0.5", "0.6", "0.15")])
def test_a_new_project_starts_with_round_values_of_its_unit_system(qtbot, units, flow, width, freeboard):
    w = MainWindow(pj.Project(units=units), persistent=False)
    qtbot.addWidget(w)
    w.new_action.trigger()                                     # nothing to save: a new project at once
    assert w.doc.project.units == units
    assert field(w, "flow.value").edit.text() == flow          # not 17.657 ft³/s
    assert field(w, "trapezoid:section.bottom_width").edit.text() == width
    assert field(w, "min_freeboard").edit.text() == freeboard
    w.doc.add_channel()                                        # a channel added later starts round too
    assert field(w, "flow.value").edit.text() == flow
    assert w.doc.channel().flow.value == pytest.approx(20 * 0.3048 ** 3 if units == "us" else 0.5, rel=1e-15)
    w.doc.undo_stack.setClean()


def combo_entries(combo):
    """(text, key, selectable) of each entry of a drop-down."""
    model = combo.model()
    return [(combo.itemText(i), combo.itemData(i), bool(model.item(i).isEnabled())) for i in range(combo.count())
            if combo.itemText(i)]


@pytest.mark.parametrize("units, grass, stone", [("us", "about 6 in tall", "D50 5.9 in"),
                                                 ("si", "about 150 mm tall", "D50 150.0 mm")])
def test_lining_list_is_grouped_by_kind_with_sizes_in_the_project_units(demo_window, qtbot, units, grass, stone):
    w = demo_window
    w.doc.set_units(units)
    entries = combo_entries(w.inputs.lining.combo)
    headings = [t for t, key, selectable in entries if not selectable]
    assert headings == ["Rigid", "Stone", "Grass", "Blankets and mats", "Gabion mattresses", "Bare soil"]
    kinds = {}
    current = None
    for text, key, selectable in entries:                     # every lining sits under the heading of its kind
        if not selectable:
            current = text
        elif key:
            kinds.setdefault(current, set()).add(w.doc.context.catalogue.get(key).category)
    assert all(len(v) == 1 for v in kinds.values())
    names = [t.strip() for t, key, sel in entries if sel and key]
    assert len(names) == len({n.casefold() for n in names})    # no two alike
    sod = next(t for t, key, _ in entries if key == "grass_good_sod")
    riprap = next(t for t, key, _ in entries if key == "riprap")
    assert grass in sod and "D50" not in riprap                # stem height 0.15 m; the D50 has its own field
    w.doc.set_current(outfall_index(w))                        # a riprap lining: the catalogue size, as a hint
    assert field(w, "lining.d50").edit.placeholderText() == "catalogue: " + stone.removeprefix("D50 ")
    assert ("mm" in sod) == (units == "si")
    w.tabs.setCurrentIndex(3)
    qtbot.wait(10)                                             # new widgets of a shown layout show when idle
    heads = [lab.text() for lab in w.comparison.choices.findChildren(QLabel) if lab.isVisible()]
    assert heads == ["Rigid", "Stone", "Grass", "Blankets and mats", "Gabion mattresses", "Bare soil"]
    assert grass in w.comparison.checks["grass_good_sod"].toolTip()
    assert w.comparison.checks["riprap"].toolTip() == f"Rock riprap, {stone}"    # catalogue D50 0.15 m


def test_a_user_lining_named_like_a_shipped_one_is_told_apart(tmp_path):
    user = tmp_path / "mine.toml"      # an invented user entry that repeats a shipped name
    user.write_text('''schema_version = 1

[[lining]]
key = "my_asphalt"
name = "Asphalt, rough"
category = "rigid"
unit_cost_basis = "area"
[lining.roughness]
model = "constant"
n = 0.017
source = "Invented for this test"
[lining.permissible]
method = "none"
source = "Invented for this test"
[lining.thickness]
rule = "fixed"
value = 0.05
source = "Invented for this test"
''', encoding="utf-8")
    context = Context.load(user, units="si")
    assert context.catalogue_problem == ""
    labels = [label for _, items in display.lining_groups(context) for _, label in items]
    assert len(labels) == len({x.casefold() for x in labels})
    assert "Asphalt, rough" in labels and "Asphalt, rough [my_asphalt]" in labels


def test_the_pictures_write_the_depths_as_the_results_panel_does(demo_window, qtbot):
    """One rounding rule (app.results.PANEL_FIELDS) for the section picture's depth chain and key and the rating
    curve's design point, as for the results panel and the sheet's section drawing (e.g. 0.280 m, not 0.28 m)."""
    w = demo_window
    for row in range(len(w.doc.project.channels)):
        w.channel_list.setCurrentRow(row)
        evaluated(w, qtbot)
        panel = {k: w.results.values[k].text().replace("\u00a0", " ") for k in ("normal_depth", "critical_depth",
                                                                              "flow")}
        pic = w.section_picture
        assert pic.dims["depth"].label.get_text().strip() == f"depth {panel['normal_depth']}"
        keys = " ".join(t.get_text() for t in pic.key_texts)
        assert f"normal depth, {panel['normal_depth']}" in keys and f"critical depth, {panel['critical_depth']}" in keys
        w.tabs.setCurrentIndex(1)                                  # the rating curve
        qtbot.waitUntil(lambda: "design:" in w.rating_picture.point_label.get_text())
        assert (f"design: {panel['flow']} at {panel['normal_depth']}"
                in w.rating_picture.point_label.get_text().replace("\u00a0", " "))
        w.tabs.setCurrentIndex(0)


def test_results_show_the_lining_facts_the_sheet_gives(demo_window, qtbot):
    """Issue 16 item 14: the window shows what the sheet's stability block gives: protection below the bend,
    lined width and layer volume (besides the required D50, thickness and side and bend shear)."""
    w = demo_window
    names = [c.name for c in w.doc.project.channels]
    w.channel_list.setCurrentRow(names.index("Outfall swale"))          # riprap in a bend
    evaluated(w, qtbot)
    st = w.results.shown.lining
    for key, value, unit in (("bend_protection_length", st.bend_protection_length, "m"),
                             ("lined_width", st.lined_width, "m"), ("layer_volume", st.layer_volume, "m³/m")):
        label = w.results.values[key]
        assert label.isVisibleTo(w.results), key
        number, shown_unit = label.text().split("\u00a0")[0].split(" ")[0], label.text().split()[-1]
        assert abs(float(number) - value) <= 0.5 * 10 ** -len(number.split(".")[1]), key
        assert shown_unit.replace("^3", "³") in (unit, unit.replace("³", "^3")), (key, label.text())
    w.channel_list.setCurrentRow(names.index("Farm crossing pipe"))      # no lining: none of them
    evaluated(w, qtbot)
    for key in ("bend_protection_length", "lined_width", "layer_volume"):
        assert not w.results.values[key].isVisibleTo(w.results)


def test_one_keystroke_evaluates_the_channel_once(demo_window, qtbot, monkeypatch):
    """A typed value reaches the core once (in the worker): the form's reload tells the window about its complaint
    only when the complaint changed, and a changed complaint alone shows the result again without evaluating."""
    from app import channel_display
    w = demo_window
    calls = []
    original = channel_display.evaluate_channel
    monkeypatch.setattr(channel_display, "evaluate_channel", lambda *a, **k: calls.append(1) or original(*a, **k))
    field = w.inputs.fields["trapezoid:section.bottom_width"]
    for text in ("0.7", "0.75"):
        calls.clear()
        field.edit.setText(text)
        field._typed(text)
        ev = evaluated(w, qtbot)
        assert len(calls) == 1, text
        assert ev.section.bottom_width == pytest.approx(float(text))     # the result shown is of that input
    assert w.doc.channel().section["bottom_width"] == pytest.approx(0.75)
    # a value the form refuses is not evaluated at all, and the complaint still reaches the results
    calls.clear()
    field.edit.setText("-1")
    field._typed("-1")
    evaluated(w, qtbot)
    assert w.complaint and calls == []
    assert w.results.headline.text() == "No result for these inputs" and "-1 is outside" in w.results.reason.text()


def widths_evaluated(monkeypatch, gate=None):
    """The bottom widths the core is asked to evaluate, in order; with ``gate`` (a threading.Event) the first
    evaluation waits in the worker until the gate is opened."""
    from app import channel_display
    widths = []
    original = channel_display.evaluate_channel

    def evaluate(channel, *args, **kwargs):
        widths.append(channel.section["bottom_width"])
        if gate is not None and len(widths) == 1:
            assert gate.wait(20)
        return original(channel, *args, **kwargs)
    monkeypatch.setattr(channel_display, "evaluate_channel", evaluate)
    return widths


def test_typing_several_edits_quickly_evaluates_only_the_last(demo_window, qtbot, monkeypatch):
    w = demo_window
    widths = widths_evaluated(monkeypatch)
    type_into(qtbot, field(w, "trapezoid:section.bottom_width"), "1.25")   # four edits: 1, 1., 1.2, 1.25
    assert w.doc.channel().section["bottom_width"] == 1.25
    assert evaluated(w, qtbot).section.bottom_width == pytest.approx(1.25)
    assert widths == [1.25]


def test_a_stale_result_never_overwrites_a_newer_one(demo_window, qtbot, monkeypatch):
    """An edit made while the worker computes the one before: the older result is dropped, the newer one shown;
    meanwhile the last good result stays in view, marked as being updated once that takes long."""
    import threading
    w = demo_window
    before = shown(w, "normal_depth")
    gate = threading.Event()
    widths = widths_evaluated(monkeypatch, gate)
    delivered = []
    w.evaluator.succeeded.connect(lambda done: delivered.append(done[0].section["bottom_width"]))
    f = field(w, "trapezoid:section.bottom_width")
    try:
        f.edit.setText("0.7")
        f._typed("0.7")
        qtbot.waitUntil(lambda: w.evaluator.running, timeout=10000)       # held in the worker at 0.7
        f.edit.setText("0.9")
        f._typed("0.9")
        qtbot.waitUntil(lambda: w.results.updating.isVisible(), timeout=10000)
        assert shown(w, "normal_depth") == before and w.results.numbers.isEnabled()   # the last result stays
    finally:
        gate.set()
    ev = evaluated(w, qtbot)
    assert widths == [0.7, 0.9] and delivered == [0.9]
    assert ev.section.bottom_width == pytest.approx(0.9) and not w.results.updating.isVisible()
    ch = w.doc.channel()
    sec = hy.Trapezoid(bottom_width=0.9, left_slope=ch.section["left_slope"], right_slope=ch.section["right_slope"])
    assert shown(w, "normal_depth") == f"{hy.normal_depth(sec, ch.flow.value, ch.slope, ch.manning_n):.3f} m"


def test_an_error_in_the_worker_is_a_message_not_a_traceback(demo_window, qtbot, monkeypatch, dialogs):
    from app import channel_display
    w = demo_window
    good = shown(w, "normal_depth")

    def broken(*args, **kwargs):
        raise RuntimeError("the core broke")
    monkeypatch.setattr(channel_display, "evaluate_channel", broken)
    type_into(qtbot, field(w, "trapezoid:section.bottom_width"), "0.8")
    evaluated(w, qtbot)                 # pytest-qt fails the test if the error escaped into Qt's event loop
    assert w.results.headline.text() == "No result for these inputs"
    assert "could not be computed: RuntimeError: the core broke" in w.results.reason.text()
    assert shown(w, "normal_depth") == good and not w.results.numbers.isEnabled()   # the last good, greyed
    assert dialogs.shown == []


def test_copying_the_comparison_right_after_an_edit_uses_the_new_inputs(demo_window, qtbot):
    """The comparison is computed for the channel as it is, not taken from a result still on its way."""
    from PySide6.QtGui import QGuiApplication
    w = demo_window
    w.doc.set_current(outfall_index(w))
    w.tabs.setCurrentIndex(3)
    w.doc.edit("slope", 0.02, "Change bed slope")
    w.copy_table_action.trigger()                           # no waiting
    rows, _ = display.compare(w.doc.channel(), w.doc.context)
    depth = QGuiApplication.clipboard().text().splitlines()[1].split("\t")[1]
    assert float(depth) == pytest.approx(rows[0].core.depth, abs=5e-4)
    assert w.doc.channel().slope == 0.02


def test_a_channel_without_any_result_shows_the_note_alone_then_its_pictures(qtbot):
    """A project opened on a pipe too small for its flow (invented, US units) has no result to grey: the
    picture shows no empty key or axes, only the note, and the reason quotes the project's units. Once the flow
    fits, the picture is drawn; a later bad input greys that last good result."""
    data = json.loads(pj.demo_path().read_text(encoding="utf-8"))
    data["units"] = "us"
    pipe = next(c for c in data["channels"] if c["section"]["shape"] == "circle")
    pipe["flow"]["value"] = 2.5                                    # m^3/s in the file: far above a 0.75 m pipe
    data["channels"] = [pipe] + [c for c in data["channels"] if c is not pipe]
    w = MainWindow(pj.loads(json.dumps(data)))
    qtbot.addWidget(w)
    w.resize(1440, 900)
    w.show()
    qtbot.waitExposed(w)
    evaluated(w, qtbot)
    pic = w.section_picture
    reason = w.results.reason.text().replace("\u2060", "")       # the units kept whole with word joiners
    assert "88.2867\xa0ft³/s exceeds" in reason and "m³/s" not in reason
    assert not pic.ax.get_visible() and pic.stale_note.get_visible()
    assert pic.stale_note.get_text() == "No result for these inputs"
    type_into(qtbot, field(w, "flow.value"), "10")                # ft^3/s: the pipe carries it
    evaluated(w, qtbot)
    assert pic.ax.get_visible() and not pic.stale_note.get_visible() and pic.water.get_alpha() == 1.0
    type_into(qtbot, field(w, "flow.value"), "500")
    evaluated(w, qtbot)
    assert pic.ax.get_visible() and pic.water.get_alpha() == pytest.approx(0.3)
    assert pic.stale_note.get_text() == "Last good result: no result for these inputs"
    w.doc.undo_stack.setClean()
