"""File > Import LandXML in the window: the runs a LandXML file makes join the open project in one undoable step;
a file that is refused says why in a message and changes nothing.

tests/data/crest-road.xml is a small LandXML 1.2 file of an invented road whose crest curve is the worked example
tests/test_landxml_import.py checks against its source; the numbers here come from app.landxml_import itself (the
same function as ``ditchwright import``), which that file tests.
"""

from pathlib import Path

import pytest

from app import project as pj
from app.landxml_import import read_landxml

DATA = Path(__file__).resolve().parents[1] / "data"
CREST = DATA / "crest-road.xml"


def test_the_runs_of_a_landxml_file_join_the_open_project_and_undo_takes_them_out(demo_window, dialogs, qtbot):
    w = demo_window
    before = pj.dumps(w.doc.project)
    channels = [c.name for c in w.doc.project.channels]
    expected, _ = read_landxml(CREST)
    dialogs.open_name = str(CREST)
    w.landxml_action.trigger()
    runs = w.doc.project.runs
    assert [r.name for r in runs] == ["North verge ditch", "CL FG"]
    assert runs[1].profile == expected.runs[0].profile and runs[1].sections == expected.runs[0].sections
    assert [c.name for c in w.doc.project.channels] == channels          # nothing else of the project changes
    assert w.doc.project.units == "si" and w.doc.modified
    kind, title, text = dialogs.shown[-1]
    assert (kind, title) == ("information", "LandXML imported")
    assert "'CL FG'" in text and "11 invert points" in text and "Undo removes them again" in text
    # the run page shows the new run, and the menu counts it
    assert w.pages.currentWidget() is w.run_view and w.run_view.current == 1
    assert w.runs_action.text() == "&Ditch runs (2)"
    assert w.run_view.inputs.run_list.count() == 2 and w.run_view.inputs.profile.table.rowCount() == 11
    qtbot.waitUntil(lambda: w.run_view.idle, timeout=60000)
    w.undo_action.trigger()
    assert pj.dumps(w.doc.project) == before
    assert w.runs_action.text() == "&Ditch runs (1)" and w.run_view.inputs.run_list.count() == 1
    qtbot.waitUntil(lambda: w.run_view.idle, timeout=60000)
    w.redo_action.trigger()
    assert [r.name for r in w.doc.project.runs] == ["North verge ditch", "CL FG"]
    qtbot.waitUntil(lambda: w.run_view.idle, timeout=60000)


def test_a_name_in_use_gets_a_number(demo_window, dialogs, qtbot):
    w = demo_window
    dialogs.open_name = str(CREST)
    w.landxml_action.trigger()
    w.landxml_action.trigger()
    assert [r.name for r in w.doc.project.runs][1:] == ["CL FG", "CL FG (2)"]
    assert w.doc.undo_stack.count() == 2
    qtbot.waitUntil(lambda: w.run_view.idle, timeout=60000)


@pytest.mark.parametrize("text, words", [
    ("not xml at all", "line"),
    ('<?xml version="1.0"?><LandXML xmlns="http://www.landxml.org/schema/LandXML-1.1" version="1.1"/>', "1.1"),
    ('<?xml version="1.0"?>\n<LandXML xmlns="http://www.landxml.org/schema/LandXML-1.2" version="1.2">'
     '<Units><Metric linearUnit="meter"/></Units><Alignments><Alignment name="A"><Profile><ProfAlign name="P">'
     '<PVI>0 10</PVI></ProfAlign></Profile></Alignment></Alignments></LandXML>', "line"),
])
def test_a_refused_file_says_why_and_changes_nothing(demo_window, dialogs, tmp_path, text, words):
    w = demo_window
    before = pj.dumps(w.doc.project)
    bad = tmp_path / "bad.xml"
    bad.write_text(text, encoding="utf-8")
    dialogs.open_name = str(bad)
    w.landxml_action.trigger()
    kind, title, message = dialogs.shown[-1]
    assert (kind, title) == ("warning", "Cannot import the LandXML file")
    assert words in message and "Nothing was changed." in message and "Traceback" not in message
    assert pj.dumps(w.doc.project) == before and w.doc.undo_stack.count() == 0 and not w.doc.modified


def test_a_missing_file_is_refused_in_words(demo_window, dialogs, tmp_path):
    w = demo_window
    dialogs.open_name = str(tmp_path / "gone.xml")
    w.landxml_action.trigger()
    kind, title, message = dialogs.shown[-1]
    assert kind == "warning" and "gone.xml" in message and w.doc.undo_stack.count() == 0


def test_cancelling_the_file_dialog_does_nothing(demo_window, dialogs):
    w = demo_window
    dialogs.open_name = ""
    w.landxml_action.trigger()
    assert dialogs.shown == [] and w.doc.undo_stack.count() == 0
