"""Someone else changed the project file: saving over it asks first (save elsewhere, reload, overwrite), and the
autosave and recovery keep working meanwhile. The projects here are invented."""

import json
import os

import pytest

from app import project as pj
from app.files import FileChangedError, FileStamp
from app.gui.mainwindow import MainWindow
from app.context import Context

CONTEXT = Context.load()   # the shipped lining catalogue alone, US units


def _theirs(path, name="Changed by a colleague"):
    """Another program writes the file (a colleague on a shared drive, a sync client)."""
    other = pj.load(path)
    other.name = name
    path.write_text(pj.dumps(other), encoding="utf-8")


@pytest.fixture
def opened(qtbot, tmp_path):
    path = tmp_path / "ditches.json"
    pj.save(pj.Project(name="Mine"), path)
    w = MainWindow()
    qtbot.addWidget(w)
    assert w.open_file(path, ask=False)
    w.doc.edit("slope", 0.0123, "Change bed slope")
    yield w, path
    w.doc.undo_stack.setClean()
    w.doc.recovered = False


def test_an_unchanged_file_is_saved_without_asking(opened, dialogs):
    w, path = opened
    asked = []
    w.ask_file_changed = lambda p: asked.append(p) or "cancel"
    os.utime(path, (1_000_000_000, 1_000_000_000))   # a new time alone (a copy, a touch) is no change
    assert w.save() and asked == [] and dialogs.shown == []
    assert pj.load(path).channels[0].slope == 0.0123
    # and a second save after our own save does not ask either
    w.doc.edit("slope", 0.0456, "Change bed slope")
    assert w.save() and asked == []


def test_a_changed_file_is_not_overwritten_when_cancelled(opened):
    w, path = opened
    _theirs(path)
    asked = []
    w.ask_file_changed = lambda p: asked.append(p) or "cancel"
    assert w.save() is False
    assert asked == [path]
    assert pj.load(path).name == "Changed by a colleague"        # their work is kept
    assert w.isWindowModified() and w.doc.channel().slope == 0.0123  # and ours is still open
    assert "changed by someone else" in w.statusBar().currentMessage()


def test_overwrite_replaces_their_file(opened):
    w, path = opened
    _theirs(path)
    w.ask_file_changed = lambda p: "overwrite"
    assert w.save()
    assert pj.load(path).name == "Mine" and pj.load(path).channels[0].slope == 0.0123
    assert not w.isWindowModified()


def test_reload_shows_their_file_and_drops_our_changes(opened):
    w, path = opened
    _theirs(path)
    w.ask_file_changed = lambda p: "reload"
    assert w.save() is False
    assert w.doc.project.name == "Changed by a colleague" and not w.isWindowModified()
    assert pj.load(path).name == "Changed by a colleague"
    w.doc.edit("slope", 0.0222, "Change bed slope")     # after reloading, saving over it no longer asks
    w.ask_file_changed = lambda p: pytest.fail("asked again after a reload")
    assert w.save() and pj.load(path).channels[0].slope == 0.0222


def test_save_under_another_name_keeps_both(opened, dialogs, tmp_path):
    w, path = opened
    _theirs(path)
    w.ask_file_changed = lambda p: "save_as"
    dialogs.save_name = str(tmp_path / "mine-too.json")
    assert w.save()
    assert pj.load(path).name == "Changed by a colleague"
    assert pj.load(tmp_path / "mine-too.json").channels[0].slope == 0.0123
    assert w.doc.path == tmp_path / "mine-too.json" and not w.isWindowModified()


def test_the_dialog_offers_the_three_choices(opened, dialogs):
    """The real message box (its exec() is recorded by the test fixtures and answers nothing: cancel)."""
    w, path = opened
    _theirs(path)
    assert w.save() is False
    (kind, title, text), = dialogs.shown
    assert kind == "exec" and title == "The file was changed" and str(path) in text
    for words in ("another name", "reload", "overwrite"):
        assert words in text
    assert pj.load(path).name == "Changed by a colleague"


def test_autosave_and_recovery_still_work_while_the_file_is_changed(opened, qtbot):
    w, path = opened
    _theirs(path)
    w.ask_file_changed = lambda p: "cancel"
    assert w.save() is False
    assert w.autosaver.save_now()                                # our work is copied all the same
    meta = json.loads(w.autosaver.meta_file.read_text(encoding="utf-8"))
    assert meta["original"] == str(path) and meta["original_stamp"]["size"] > 0
    w.autosaver.lock.unlock()                                   # as if the program had died
    second = MainWindow()
    qtbot.addWidget(second)
    second.ask_recovery = lambda r: "recover"
    assert second.offer_recovery()
    assert second.doc.channel().slope == 0.0123 and second.doc.path == path
    asked = []
    second.ask_file_changed = lambda p: asked.append(p) or "cancel"
    assert second.save() is False and asked == [path]            # the recovered work knows the file changed since
    second.doc.recovered = False


def test_the_document_refuses_to_save_over_a_changed_file(tmp_path):
    """The check below the window: nothing is written, the error says which file."""
    from app.gui.document import ProjectDocument
    path = tmp_path / "p.json"
    pj.save(pj.Project(name="Mine"), path)
    doc = ProjectDocument(pj.load(path), path, context=CONTEXT)
    before = FileStamp.of(path)
    _theirs(path, "Mina")                       # same size, other content: the hash tells
    assert FileStamp.of(path).size == before.size
    with pytest.raises(FileChangedError) as info:
        doc.save()
    assert info.value.path == path and info.value.old == before and pj.load(path).name == "Mina"
    doc.save(overwrite=True)
    assert pj.load(path).name == "Mine"
