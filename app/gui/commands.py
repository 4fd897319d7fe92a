"""Undoable edits of a project: one small QUndoCommand per user action.

Each command records the old value when it is made and only ever swaps whole
:class:`~app.project.Channel` values in and out of the document, so undo and
redo cannot drift. Channels are treated as values: an edit makes a changed
copy, never changes a channel in place.
"""

from __future__ import annotations

from PySide6.QtGui import QUndoCommand

#: id() of commands that may merge with the next one (typing in one field).
MERGE_ID = 4711


class EditChannel(QUndoCommand):
    """Replace channel ``index`` with ``new``; consecutive edits with the same ``merge_key`` merge."""

    def __init__(self, doc, index: int, new, text: str, merge_key=None):
        super().__init__(text)
        self.doc, self.index, self.new, self.merge_key = doc, index, new, merge_key
        self.old = doc.project.channels[index]

    def redo(self):
        self.doc._replace_channel(self.index, self.new)

    def undo(self):
        self.doc._replace_channel(self.index, self.old)

    def id(self):
        return MERGE_ID if self.merge_key is not None else -1

    def mergeWith(self, other):
        if not isinstance(other, EditChannel) or other.merge_key != self.merge_key or other.index != self.index:
            return False
        self.new = other.new
        if self.new == self.old:
            self.setObsolete(True)  # typed back to where it was: the stack drops the command
        return True


class AddChannel(QUndoCommand):
    """Insert ``channel`` at ``index`` (add and duplicate)."""

    def __init__(self, doc, index: int, channel, text: str):
        super().__init__(text)
        self.doc, self.index, self.channel = doc, index, channel

    def redo(self):
        self.doc._insert_channel(self.index, self.channel)

    def undo(self):
        self.doc._remove_channel(self.index)


class AddChannels(QUndoCommand):
    """Append several channels at once (an inventory import): one step of the history."""

    def __init__(self, doc, channels: list, text: str):
        super().__init__(text)
        self.doc, self.channels = doc, list(channels)
        self.index = len(doc.project.channels)

    def redo(self):
        self.doc._insert_channels(self.index, self.channels)

    def undo(self):
        self.doc._remove_channels(self.index, len(self.channels))


class AddRuns(QUndoCommand):
    """Append several ditch runs at once (a LandXML import): one step of the history."""

    def __init__(self, doc, runs: list, text: str):
        super().__init__(text)
        self.doc, self.runs = doc, list(runs)
        self.index = len(doc.project.runs)

    def redo(self):
        self.doc._insert_runs(self.index, self.runs)

    def undo(self):
        self.doc._remove_runs(self.index, len(self.runs))


class RemoveRun(QUndoCommand):
    def __init__(self, doc, index: int):
        self.doc, self.index = doc, index
        self.run = doc.project.runs[index]
        super().__init__(f"Delete run '{self.run.name}'")

    def redo(self):
        self.doc._remove_runs(self.index, 1)

    def undo(self):
        self.doc._insert_runs(self.index, [self.run])


class RemoveChannel(QUndoCommand):
    def __init__(self, doc, index: int):
        self.doc, self.index = doc, index
        self.channel = doc.project.channels[index]
        super().__init__(f"Delete channel '{self.channel.name}'")

    def redo(self):
        self.doc._remove_channel(self.index)

    def undo(self):
        self.doc._insert_channel(self.index, self.channel)


class EditProject(QUndoCommand):
    """Change a project-level value (name, notes, rainfall relation), swapped whole."""

    def __init__(self, doc, attribute: str, value: str, text: str):
        super().__init__(text)
        self.doc, self.attribute, self.new = doc, attribute, value
        self.old = getattr(doc.project, attribute)

    def redo(self):
        self.doc._set_project_attribute(self.attribute, self.new)

    def undo(self):
        self.doc._set_project_attribute(self.attribute, self.old)


class EditSheetInfo(QUndoCommand):
    """Replace the title-block facts of the design sheets (a whole SheetInfo value)."""

    def __init__(self, doc, info, text: str):
        super().__init__(text)
        self.doc, self.new, self.old = doc, info, doc.project.sheet

    def redo(self):
        self.doc._set_project_attribute("sheet", self.new)

    def undo(self):
        self.doc._set_project_attribute("sheet", self.old)


class EditRun(QUndoCommand):
    """Replace ditch run ``index`` with ``new`` (a whole Run value); edits with the same ``merge_key`` merge."""

    def __init__(self, doc, index: int, new, text: str, merge_key=None):
        super().__init__(text)
        self.doc, self.index, self.new, self.merge_key = doc, index, new, merge_key
        self.old = doc.project.runs[index]

    def redo(self):
        self.doc._replace_run(self.index, self.new)

    def undo(self):
        self.doc._replace_run(self.index, self.old)

    def id(self):
        return RUN_MERGE_ID if self.merge_key is not None else -1

    def mergeWith(self, other):
        if not isinstance(other, EditRun) or other.merge_key != self.merge_key or other.index != self.index:
            return False
        self.new = other.new
        if self.new == self.old:
            self.setObsolete(True)
        return True


#: id() of run edits that may merge with the next one.
RUN_MERGE_ID = 4712
