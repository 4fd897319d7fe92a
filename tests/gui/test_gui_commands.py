"""Undo commands on a bare document and undo stack: each edit records its old value and undoes exactly."""

import copy

import pytest

from app import project as pj
from app.gui import commands as cmd
from app.editing import section_for_shape, with_value
from app.gui.document import ProjectDocument
from app.context import Context

CONTEXT = Context.load()   # the shipped lining catalogue alone, US units


def sample():
    return pj.Project(name="Invented test site", units="si",
                      channels=[pj.Channel(name="A"), pj.Channel(name="B", slope=0.02)])


def test_edit_channel_undo_redo():
    doc = ProjectDocument(sample(), context=CONTEXT)
    before = copy.deepcopy(doc.project)
    stack = doc.undo_stack
    stack.push(cmd.EditChannel(doc, 1, with_value(doc.project.channels[1], "section.bottom_width", 2.0), "w"))
    assert doc.project.channels[1].section["bottom_width"] == 2.0 and doc.current == 1
    stack.undo()
    assert doc.project == before
    stack.redo()
    assert doc.project.channels[1].section["bottom_width"] == 2.0


def test_typing_merges_and_typing_back_drops_the_command():
    doc = ProjectDocument(sample(), context=CONTEXT)
    for v in (0.01, 0.015, 0.0155):
        doc.edit("slope", v, "Change bed slope", merge_key=("slope", 1))
    assert doc.undo_stack.count() == 1 and doc.channel().slope == 0.0155
    doc.edit("slope", 0.005, "Change bed slope", merge_key=("slope", 1))   # back to the stored value
    assert doc.undo_stack.count() == 0 and doc.channel().slope == 0.005
    doc.edit("slope", 0.01, "Change bed slope", merge_key=("slope", 2))
    doc.edit("slope", 0.02, "Change bed slope", merge_key=("slope", 3))   # a new visit: a new command
    assert doc.undo_stack.count() == 2


def test_add_remove_and_units_round_trip():
    doc = ProjectDocument(sample(), context=CONTEXT)
    before = copy.deepcopy(doc.project)
    doc.add_channel()
    doc.duplicate_channel(0)
    assert [c.name for c in doc.project.channels] == ["A", "A copy", "B", "Ditch 1"]
    assert doc.remove_channel(2) is None
    doc.set_units("us")
    assert doc.rename_channel("A copy", index=0) == "Another channel is already called 'A copy'."
    assert doc.rename_channel("  ", index=0) == "A channel needs a name."
    doc.rename_channel("North ditch", index=0)
    assert doc.undo_stack.count() == 4                     # the unit switch is no step of the history
    assert doc.undo_stack.text(3) == "Rename channel 'A' to 'North ditch'"
    while doc.undo_stack.canUndo():
        doc.undo_stack.undo()
    assert doc.project.units == "us"
    doc.set_units(before.units)
    assert doc.project == before


def test_switching_units_is_not_an_edit():
    doc = ProjectDocument(sample(), context=CONTEXT)
    seen = []
    doc.units_changed.connect(lambda: seen.append(doc.project.units))
    doc.set_units("si" if doc.project.units == "us" else "us")
    assert seen and doc.undo_stack.count() == 0 and not doc.modified


def test_last_channel_cannot_be_deleted():
    doc = ProjectDocument(pj.Project(), context=CONTEXT)
    assert "at least one channel" in doc.remove_channel()
    assert len(doc.project.channels) == 1 and doc.undo_stack.count() == 0


def test_edits_never_change_a_channel_in_place():
    doc = ProjectDocument(sample(), context=CONTEXT)
    old = doc.project.channels[0]
    snapshot = copy.deepcopy(old)
    doc.edit("section.bottom_width", 1.7, "w", index=0)
    doc.edit("flow.value", 0.9, "q", index=0)
    assert old == snapshot and doc.project.channels[0] is not old


@pytest.mark.parametrize("shape", ["trapezoid", "triangle", "rectangle", "parabola", "circle", "irregular"])
def test_every_shape_gets_a_buildable_starting_section(shape):
    ch = pj.Channel()
    section, n = section_for_shape(ch, shape)
    new = with_value(with_value(ch, "section", section), "manning_n", n)
    assert new.build_section().kind == shape
    assert (n is None) == (shape == "irregular")
    back, n_back = section_for_shape(new, "trapezoid")
    assert n_back == pytest.approx(0.030) and back["shape"] == "trapezoid"


def test_unknown_input_path_is_refused():
    with pytest.raises(KeyError):
        with_value(pj.Channel(), "colour", "blue")
