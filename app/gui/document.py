"""The open project with its undo history, file name and current channel.

The project itself (:mod:`app.project`) is plain Python. This controller owns
it, changes it only through the commands of :mod:`app.gui.commands`, and
tells the views what changed through Qt signals.
"""

from __future__ import annotations

import copy
from pathlib import Path

from PySide6.QtCore import QObject, Signal
from PySide6.QtGui import QUndoStack

import hydraulics as hy

from .. import project as pj
from ..context import Context
from ..files import FileChangedError, FileStamp
from . import commands as cmd


def with_value(channel: pj.Channel, path: str, value) -> pj.Channel:
    """A copy of ``channel`` with one input changed; ``path`` like "slope", "flow.value", "section.diameter"."""
    out = copy.deepcopy(channel)
    head, _, rest = path.partition(".")
    if head == "section" and rest:
        out.section[rest] = value
    elif head == "flow" and rest:
        setattr(out.flow, rest, value)
    elif head == "lining" and rest:
        if out.lining is None:
            raise KeyError(f"{path!r}: the channel has no lining")
        setattr(out.lining, rest, value)
    elif rest:
        raise KeyError(f"unknown input {path!r}")
    else:
        if not hasattr(out, head):
            raise KeyError(f"unknown input {path!r}")
        setattr(out, head, copy.deepcopy(value))
    return out


def value_at(channel: pj.Channel, path: str):
    head, _, rest = path.partition(".")
    if head == "section" and rest:
        return channel.section.get(rest)
    if head == "flow" and rest:
        return getattr(channel.flow, rest)
    if head == "lining" and rest:
        return None if channel.lining is None else getattr(channel.lining, rest)
    return getattr(channel, head)


def section_for_shape(channel: pj.Channel, shape: str) -> tuple[dict, float | None]:
    """A starting section of ``shape`` that resembles the channel's present one, and the n to use with it.

    Widths and slopes carry over where the shapes share them. A surveyed
    (irregular) section starts from the present outline, with the channel's n
    on every segment; leaving it takes the first segment's n.
    """
    old = channel.section
    n = channel.manning_n
    b = old.get("bottom_width") or old.get("top_width") or old.get("diameter") or 1.0
    z1 = old.get("left_slope", 2.0) or 2.0
    z2 = old.get("right_slope", z1) or z1
    if old.get("shape") == "irregular":
        n = float(old["n"][0]) if old.get("n") else 0.030
        xs = old["stations"]
        b = max(0.5, (xs[-1] - xs[0]) / 3)
    if shape == "trapezoid":
        sec = {"shape": shape, "bottom_width": b, "left_slope": z1, "right_slope": z2}
    elif shape == "triangle":
        sec = {"shape": shape, "left_slope": z1, "right_slope": z2}
    elif shape == "rectangle":
        sec = {"shape": shape, "bottom_width": b}
    elif shape == "parabola":
        sec = {"shape": shape, "top_width": max(b, 1.0) * 2, "at_depth": 0.5}
    elif shape == "circle":
        sec = {"shape": shape, "diameter": max(0.3, min(b, 3.0))}
    elif shape == "irregular":
        depth = 1.0
        try:
            current = hy.section_from_dict(old)
            depth = current.full_depth or 1.0
            if current.kind != "irregular" and current.full_depth is None:
                depth = 1.0
            x, z = current.outline(depth)
        except hy.InputError:
            x, z = hy.Trapezoid(bottom_width=1.0, side_slope=2.0).outline(depth)
        if old.get("shape") == "circle":
            # A pipe is not a surveyed ditch: start from a plain trapezoid of similar size.
            x, z = hy.Trapezoid(bottom_width=b / 2, side_slope=2.0).outline(b / 2)
        x = [round(float(v) - float(x[0]), 4) for v in x]
        z = [round(float(v), 4) for v in z]
        seg_n = n if n is not None else 0.030
        sec = {"shape": shape, "stations": x, "elevations": z, "n": [seg_n] * (len(x) - 1)}
        return sec, None
    else:
        raise KeyError(f"unknown shape {shape!r}")
    return sec, (n if n is not None else 0.030)


class ProjectDocument(QObject):
    reset = Signal()                 # another project was loaded: every view starts again
    channel_changed = Signal(int)    # the inputs of one channel changed
    channels_changed = Signal()      # channels added, removed or renamed
    units_changed = Signal()
    current_changed = Signal(int)
    project_changed = Signal()       # project name, notes or sheet details

    def __init__(self, project: pj.Project | None = None, path=None, parent=None, context: Context | None = None):
        """``context``: the catalogue and program version the project is evaluated with (default: the shipped
        catalogue alone); its units follow the project's (:attr:`context`)."""
        super().__init__(parent)
        self._context = context if context is not None else Context.load()
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
        if not name:
            return "A channel needs a name."
        if any(c.name == name for j, c in enumerate(self.project.channels) if j != i):
            return f"Another channel is already called '{name}'."
        old = self.project.channels[i].name
        if name != old:
            self.edit("name", name, f"Rename channel '{old}' to '{name}'", index=i)
        return None

    def add_channels(self, channels: list, text: str) -> list:
        """Append ``channels`` in one undoable step; a name already in use gets a number. Returns the names."""
        names = {c.name for c in self.project.channels}
        added = []
        for ch in channels:
            ch = copy.deepcopy(ch)
            base, k = ch.name.strip() or "Reach", 2
            name = base
            while name in names:
                name = f"{base} ({k})"
                k += 1
            ch.name = name
            names.add(name)
            added.append(ch)
        if added:
            self.undo_stack.push(cmd.AddChannels(self, added, text))
        return [c.name for c in added]

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

    def unique_name(self, base: str) -> str:
        names = {c.name for c in self.project.channels}
        if base not in names and base != "Ditch":
            return base
        k = 1
        while f"{base} {k}" in names:
            k += 1
        return f"{base} {k}"

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

    def _set_units(self, units: str) -> None:
        self.revision += 1
        self.project.units = units
        self.units_changed.emit()

    def _set_project_attribute(self, attribute: str, value) -> None:
        self.revision += 1
        setattr(self.project, attribute, value)
        self.project_changed.emit()


#: Round starting values of a new channel in each unit system's own units: (input path, quantity, US, SI).
#: A US project starts at 20 ft^3/s and 2 ft, not at 0.5 m^3/s shown as 17.657 ft^3/s. Typical sizes of a
#: small grassed roadside ditch (common practice); the freeboard is the 0.5 ft / 0.15 m minimum of the README.
STARTING_VALUES = (
    ("flow.value", "flow", 20.0, 0.5),
    ("slope", "slope", 0.005, 0.005),
    ("section.bottom_width", "length", 2.0, 0.6),
    ("section.left_slope", "", 3.0, 3.0),
    ("section.right_slope", "", 3.0, 3.0),
    ("manning_n", "", 0.030, 0.030),
    ("min_freeboard", "length", 0.5, 0.15),
)


def new_channel(units: str = "us", name: str = "Ditch 1") -> pj.Channel:
    """A new trapezoidal channel with the round starting values of the unit system ``units`` (stored in SI)."""
    system = hy.units.system(units)
    ch = pj.Channel(name=name)
    for path, quantity, us, si in STARTING_VALUES:
        shown = us if units == "us" else si
        ch = with_value(ch, path, float(system.to_si(quantity, shown)) if quantity else shown)
    return ch


def new_project(units: str = "us") -> pj.Project:
    """A fresh project in ``units`` with one channel at that unit system's round starting values."""
    return pj.Project(units=units, channels=[new_channel(units)])
