"""The open project with its undo history, file name and current channel.

The project itself (:mod:`app.project`) is plain Python. This controller owns
it, changes it only through the commands of :mod:`app.gui.commands`, and
tells the views what changed through Qt signals. The changes themselves
(an input by its path, new channels) are the Qt-free :mod:`app.editing`.
"""

from __future__ import annotations

import copy
from pathlib import Path

from PySide6.QtCore import QObject, Signal
from PySide6.QtGui import QUndoStack

import hydraulics as hy

from .. import project as pj
from ..context import Context
from ..editing import name_refusal, named_copies, new_channel, new_name, new_project, with_value
from ..files import FileChangedError, FileStamp
from . import commands as cmd


class ProjectDocument(QObject):
    reset = Signal()                 # another project was loaded: every view starts again
    channel_changed = Signal(int)    # the inputs of one channel changed
    channels_changed = Signal()      # channels added, removed or renamed
    units_changed = Signal()
    current_changed = Signal(int)
    project_changed = Signal()       # project name, notes, sheet details or rainfall
    run_changed = Signal(int)        # the inputs of one ditch run changed
    runs_changed = Signal(int)       # ditch runs added or removed; the index of the run to show

    def __init__(self, project: pj.Project | None = None, path=None, parent=None, *, context: Context):
        """``context``: the catalogue and program version the project is evaluated with (the window's, required);
        its units follow the project's (:attr:`context`)."""
        super().__init__(parent)
        self._context = context
        self.undo_stack = QUndoStack(self)
        self.project = project or new_project()
        self.path = Path(path) if path else None
        self.stamp = FileStamp.of(self.path) if self.path else None   # the file as we last read or wrote it
        self.current = 0
        self.recovered = False   # loaded from an autosave: unsaved although the history is empty
        self.revision = 0        # counts every change, including merged typing

    # -- state ------------------------------------------------------------------
    @property
    def modified(self) -> bool:
        return self.recovered or not self.undo_stack.isClean()

    @property
    def units(self) -> hy.units.UnitSystem:
        return hy.units.system(self.project.units)

    @property
    def context(self) -> Context:
        """What the project is evaluated and exported with: the window's context, in the project's units."""
        return self._context.with_units(self.units)

    def channel(self, index: int | None = None) -> pj.Channel:
        return self.project.channels[self.current if index is None else index]

    def load(self, project: pj.Project, path=None, recovered: bool = False, stamp: FileStamp | None = None) -> None:
        """Show ``project``, read from ``path`` (``stamp``: the file as it was read; taken now when not given)."""
        self.project = project
        self.path = Path(path) if path else None
        self.stamp = stamp if stamp is not None or self.path is None else FileStamp.of(self.path)
        self.current = 0
        self.recovered = recovered
        self.revision += 1
        self.undo_stack.clear()
        self.undo_stack.setClean()
        self.reset.emit()

    def save(self, path=None, overwrite: bool = False) -> Path:
        """Write the project atomically; the document becomes unmodified.

        Saving over the file it was opened from (or last saved to) raises FileChangedError, writing nothing,
        when someone else has changed that file since; ``overwrite`` saves anyway.
        """
        target = Path(path) if path else self.path
        if target is None:
            raise ValueError("no file name given for an untitled project")
        if not overwrite and self.stamp is not None and self.path is not None and target == self.path \
                and self.stamp.changed_on_disk(target):
            raise FileChangedError(target, self.stamp, FileStamp.of(target))
        pj.save(self.project, target)
        self.path = target
        self.stamp = FileStamp.of(target)
        self.recovered = False
        self.undo_stack.setClean()
        return target

    def set_current(self, index: int) -> None:
        index = max(0, min(index, len(self.project.channels) - 1))
        if index != self.current:
            self.current = index
            self.current_changed.emit(index)

    # -- edits (each pushes one command) ----------------------------------------------
    def edit(self, path: str, value, text: str, merge_key=None, index: int | None = None) -> None:
        """Change one input of a channel (the current one by default)."""
        i = self.current if index is None else index
        new = with_value(self.project.channels[i], path, value)
        if new == self.project.channels[i]:
            return
        self.undo_stack.push(cmd.EditChannel(self, i, new, text, merge_key))

    def replace(self, new: pj.Channel, text: str, index: int | None = None, merge_key=None) -> None:
        i = self.current if index is None else index
        if new == self.project.channels[i]:
            return
        self.undo_stack.push(cmd.EditChannel(self, i, new, text, merge_key))

    def add_channel(self) -> None:
        ch = new_channel(self.project.units, self.unique_name("Ditch"))
        ch.section = copy.deepcopy(self.channel().section) if self.project.channels else ch.section
        self.undo_stack.push(cmd.AddChannel(self, len(self.project.channels), ch, f"Add channel '{ch.name}'"))

    def duplicate_channel(self, index: int | None = None) -> None:
        i = self.current if index is None else index
        ch = copy.deepcopy(self.project.channels[i])
        ch.name = self.unique_name(f"{ch.name} copy")
        self.undo_stack.push(cmd.AddChannel(self, i + 1, ch, f"Duplicate channel '{self.project.channels[i].name}'"))

    def remove_channel(self, index: int | None = None) -> str | None:
        """Delete a channel; refuses (and says why) to delete the last one."""
        if len(self.project.channels) <= 1:
            return "A project keeps at least one channel; add another before deleting this one."
        i = self.current if index is None else index
        self.undo_stack.push(cmd.RemoveChannel(self, i))
        return None

    def rename_channel(self, name: str, index: int | None = None) -> str | None:
        """Rename; returns the reason when the name is refused (empty or already used)."""
        i = self.current if index is None else index
        name = name.strip()
        refusal = name_refusal(name, {c.name for j, c in enumerate(self.project.channels) if j != i}, "channel")
        if refusal:
            return refusal
        old = self.project.channels[i].name
        if name != old:
            self.edit("name", name, f"Rename channel '{old}' to '{name}'", index=i)
        return None

    def add_channels(self, channels: list, text: str) -> list:
        """Append ``channels`` in one undoable step; a name already in use gets a number. Returns the names."""
        added = named_copies(channels, {c.name for c in self.project.channels}, "Reach")
        if added:
            self.undo_stack.push(cmd.AddChannels(self, added, text))
        return [c.name for c in added]

    def add_runs(self, runs: list, text: str) -> list:
        """Append ditch ``runs`` in one undoable step; a name already in use gets a number. Returns the names."""
        added = named_copies(runs, {r.name for r in self.project.runs}, "Run")
        if added:
            self.undo_stack.push(cmd.AddRuns(self, added, text))
        return [r.name for r in added]

    def edit_run(self, index: int, new: pj.Run, text: str, merge_key=None) -> None:
        """Replace ditch run ``index`` with ``new`` (one undoable step; a changed copy, see app.run_editing)."""
        if new != self.project.runs[index]:
            self.undo_stack.push(cmd.EditRun(self, index, copy.deepcopy(new), text, merge_key))

    def remove_run(self, index: int) -> None:
        """Delete ditch run ``index`` (one undoable step)."""
        self.undo_stack.push(cmd.RemoveRun(self, index))

    def rename_run(self, index: int, name: str) -> str | None:
        """Rename run ``index``; returns the reason when the name is refused (empty or already used)."""
        name = name.strip()
        refusal = name_refusal(name, {r.name for j, r in enumerate(self.project.runs) if j != index}, "ditch run")
        if refusal:
            return refusal
        old = self.project.runs[index]
        if name != old.name:
            new = copy.deepcopy(old)
            new.name = name
            self.edit_run(index, new, f"Rename run '{old.name}' to '{name}'")
        return None

    def add_channel_from(self, channel: pj.Channel, text: str) -> str:
        """Append ``channel`` (a name already in use gets a number) and make it current, in one undoable step.
        Returns its name."""
        (ch,) = named_copies([channel], {c.name for c in self.project.channels}, "Ditch")
        self.undo_stack.push(cmd.AddChannel(self, len(self.project.channels), ch, text))
        return ch.name

    def set_sheet_info(self, info: pj.SheetInfo, text: str = "Change sheet details") -> None:
        """Replace the title-block facts of the design sheets (one undoable step)."""
        if info != self.project.sheet:
            self.undo_stack.push(cmd.EditSheetInfo(self, copy.deepcopy(info), text))

    def set_units(self, units: str) -> None:
        """Show the project in ``units``. Not an edit of the design: no undo step, the project stays unmodified
        (the file records the units it was saved in)."""
        if units != self.project.units:
            hy.units.system(units)
            self._set_units(units)

    def set_project_text(self, attribute: str, value: str, text: str) -> None:
        if getattr(self.project, attribute) != value:
            self.undo_stack.push(cmd.EditProject(self, attribute, value, text))

    def set_rainfall(self, rainfall: dict | None, text: str = "Change the rainfall (IDF)") -> None:
        """Replace the project's rainfall relation (a dict for hydraulics.rainfall.idf_from_dict, its source text
        included) in one undoable step; the runs are solved again (``project_changed``)."""
        if rainfall != self.project.rainfall:
            self.undo_stack.push(cmd.EditProject(self, "rainfall", copy.deepcopy(rainfall), text))

    def unique_name(self, base: str) -> str:
        return new_name(base, {c.name for c in self.project.channels})

    # -- primitive changes, for the commands only -----------------------------------------
    def _replace_channel(self, index: int, channel: pj.Channel) -> None:
        self.revision += 1
        renamed = self.project.channels[index].name != channel.name
        self.project.channels[index] = channel
        self.set_current(index)
        if renamed:
            self.channels_changed.emit()
        self.channel_changed.emit(index)

    def _insert_channel(self, index: int, channel: pj.Channel) -> None:
        self.revision += 1
        self.project.channels.insert(index, channel)
        self.current = index
        self.channels_changed.emit()
        self.current_changed.emit(index)

    def _insert_channels(self, index: int, channels: list) -> None:
        self.revision += 1
        self.project.channels[index:index] = channels
        self.current = index
        self.channels_changed.emit()
        self.current_changed.emit(index)

    def _remove_channels(self, index: int, count: int) -> None:
        self.revision += 1
        del self.project.channels[index:index + count]
        self.current = min(max(index - 1, 0), len(self.project.channels) - 1)
        self.channels_changed.emit()
        self.current_changed.emit(self.current)

    def _remove_channel(self, index: int) -> None:
        self.revision += 1
        del self.project.channels[index]
        self.current = min(index, len(self.project.channels) - 1)
        self.channels_changed.emit()
        self.current_changed.emit(self.current)

    def _insert_runs(self, index: int, runs: list) -> None:
        self.revision += 1
        self.project.runs[index:index] = runs
        self.runs_changed.emit(index)

    def _remove_runs(self, index: int, count: int) -> None:
        self.revision += 1
        del self.project.runs[index:index + count]
        self.runs_changed.emit(max(min(index, len(self.project.runs) - 1), 0))

    def _replace_run(self, index: int, run: pj.Run) -> None:
        self.revision += 1
        self.project.runs[index] = run
        self.run_changed.emit(index)

    def _set_units(self, units: str) -> None:
        self.revision += 1
        self.project.units = units
        self.units_changed.emit()

    def _set_project_attribute(self, attribute: str, value) -> None:
        self.revision += 1
        setattr(self.project, attribute, value)
        self.project_changed.emit()
