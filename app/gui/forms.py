"""The input forms of one channel: name, design flow, grade, section, lining, bend and freeboard.

The forms show the current channel of a :class:`~app.gui.document.ProjectDocument`
in the project's units and turn each accepted edit into one undoable command.
They never compute: the computed lines (design flow by the rational method,
Kirpich's time) come back from the window's evaluation through
:meth:`InputPanel.show_evaluation`.
"""

from __future__ import annotations

from PySide6.QtCore import Qt, Signal
from PySide6.QtGui import QColor
from PySide6.QtWidgets import (QAbstractItemView, QComboBox, QGridLayout, QGroupBox, QHBoxLayout, QHeaderView,
                               QLabel, QPushButton, QScrollArea, QTableWidget,
                               QTableWidgetItem, QVBoxLayout, QWidget)

from hydraulics.units import UnitSystem

from .. import channel_display as display
from ..editing import section_for_shape, segment_n, value_at, with_value
from ..inputs import BEND, CORE_TO_PATH, D50, FLOW, FREEBOARD, MANNING, RATIONAL, SECTION_FIELDS, SLOPE, Input
from ..lining_names import stone_size_text
from ..project import LiningChoice
from ..results import EXTRA_FIELDS, format_value, panel_field, rounded
from .document import ProjectDocument
from .fields import (LineEdit, NotesEdit, NumberField, UnclearNumber, format_number, keep_units_whole,
                     number_marks, parse_number, pretty, set_invalid)

SHAPES = (
    ("trapezoid", "Trapezoid"),
    ("triangle", "V-ditch (triangle)"),
    ("rectangle", "Rectangle"),
    ("parabola", "Parabolic swale"),
    ("circle", "Pipe, part full"),
    ("irregular", "Surveyed section"),
)
FLOW_METHODS = (("typed", "Typed value"), ("rational", "Rational method"))


def _grid() -> QGridLayout:
    g = QGridLayout()
    g.setColumnStretch(1, 1)
    g.setColumnMinimumWidth(0, 140)
    g.setHorizontalSpacing(8)
    g.setVerticalSpacing(4)
    return g


def _choice_box(name: str, items, on_chosen) -> QComboBox:
    """A drop-down of (key, text) items that calls ``on_chosen`` when the user picks one."""
    box = QComboBox()
    box.setObjectName(name)
    for key, text in items:
        box.addItem(text, key)
    box.activated.connect(on_chosen)
    box.setSizeAdjustPolicy(QComboBox.SizeAdjustPolicy.AdjustToMinimumContentsLengthWithIcon)
    box.setMinimumContentsLength(12)
    return box


def _group(title: str) -> tuple[QGroupBox, QGridLayout]:
    box = QGroupBox(title)
    grid = _grid()
    box.setLayout(grid)
    return box, grid


class SurveyTable(QWidget):
    """A surveyed section as a table of points: station, elevation, and n of the segment to the next point."""

    changed = Signal(dict, str)    # new section dict (SI), description of the edit
    invalid = Signal(str)

    def __init__(self, parent=None):
        super().__init__(parent)
        self.units = None
        self.section = None
        self.table = QTableWidget(0, 3)
        self.table.setObjectName("surveyTable")
        self.table.verticalHeader().setDefaultSectionSize(24)
        self.table.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Stretch)
        self.table.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.table.setMinimumHeight(200)
        self.table.itemChanged.connect(self._edited)
        self.add = QPushButton("Add point")
        self.remove = QPushButton("Remove point")
        self.add.clicked.connect(self._add_point)
        self.remove.clicked.connect(self._remove_point)
        self.message = QLabel()
        self.message.setObjectName("fieldMessage")
        self.message.setWordWrap(True)
        self.message.hide()
        note = QLabel("Points from left bank to right bank. n is for the segment to the next point.")
        note.setObjectName("hint")
        note.setWordWrap(True)
        buttons = QHBoxLayout()
        buttons.addWidget(self.add)
        buttons.addWidget(self.remove)
        buttons.addStretch(1)
        lay = QVBoxLayout(self)
        lay.setContentsMargins(0, 0, 0, 0)
        lay.addWidget(note)
        lay.addWidget(self.table)
        lay.addLayout(buttons)
        lay.addWidget(self.message)

    def load(self, section: dict, units: UnitSystem) -> None:
        self.section, self.units = section, units
        L = units.label("length")
        self.table.setHorizontalHeaderLabels([f"Station [{L}]", f"Elevation [{L}]", "n to next"])
        self.table.blockSignals(True)
        xs, zs, ns = section["stations"], section["elevations"], segment_n(section)
        self.table.setRowCount(len(xs))
        for i, (x, z) in enumerate(zip(xs, zs)):
            self.table.setItem(i, 0, self._item(format_number(units.from_si("length", x))))
            self.table.setItem(i, 1, self._item(format_number(units.from_si("length", z))))
            if i < len(xs) - 1:
                self.table.setItem(i, 2, self._item(format_number(ns[i])))
            else:
                last = self._item("")
                last.setFlags(Qt.ItemFlag.NoItemFlags)
                self.table.setItem(i, 2, last)
        self.table.blockSignals(False)
        self._set_message("")

    @staticmethod
    def _item(text: str) -> QTableWidgetItem:
        item = QTableWidgetItem(text)
        item.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        return item

    def _set_message(self, text: str) -> None:
        self.message.setText(text)
        self.message.setVisible(bool(text))

    def _read(self):
        rows = self.table.rowCount()
        xs, zs, ns = [], [], []
        for i in range(rows):
            for col, out in ((0, xs), (1, zs), (2, ns)):
                if col == 2 and i == rows - 1:
                    continue
                item = self.table.item(i, col)
                text = item.text() if item else ""
                try:
                    v = parse_number(text)
                except UnclearNumber as exc:
                    raise ValueError(f"Point {i + 1}: {exc}") from None
                except ValueError:
                    name = ("station", "elevation", "n")[col]
                    raise ValueError(f"Point {i + 1}: the {name} '{text}' is not a number.") from None
                if col == 2 and not MANNING.holds(v):
                    raise ValueError(f"Point {i + 1}: n must be {MANNING.allowed(self.units)}; {text} is outside.")
                out.append(self.units.to_si("length", v) if col < 2 else v)
        return {"shape": "irregular", "stations": xs, "elevations": zs, "n": ns}

    def _mark(self, row_col=None):
        self.table.blockSignals(True)   # a new background is itself an itemChanged
        for i in range(self.table.rowCount()):
            for j in range(3):
                item = self.table.item(i, j)
                if item is not None:
                    item.setBackground(QColor("#fde8e8") if (i, j) == row_col else QColor(0, 0, 0, 0))
        self.table.blockSignals(False)

    def _edited(self, item: QTableWidgetItem) -> None:
        row, col = item.row(), item.column()
        try:
            section = self._read()
        except ValueError as exc:
            self._mark((row, col))
            self._set_message(str(exc))
            self.invalid.emit(str(exc))
            return
        self._mark(None)
        self._set_message("")
        self.changed.emit(section, f"Edit surveyed point {row + 1}")

    def _add_point(self) -> None:
        s = dict(self.section)
        xs, zs, ns = list(s["stations"]), list(s["elevations"]), segment_n(s)
        row = self.table.currentRow()
        row = row if 0 <= row < len(xs) - 1 else len(xs) - 2
        xs.insert(row + 1, (xs[row] + xs[row + 1]) / 2)
        zs.insert(row + 1, (zs[row] + zs[row + 1]) / 2)
        ns.insert(row + 1, ns[row])           # the new point splits a segment: both halves keep its n
        self.changed.emit({"shape": "irregular", "stations": xs, "elevations": zs, "n": ns},
                          f"Add surveyed point {row + 2}")

    def _remove_point(self) -> None:
        s = self.section
        if len(s["stations"]) <= 3:
            self._set_message("A surveyed section needs at least 3 points.")
            return
        row = self.table.currentRow()
        row = row if 0 <= row < len(s["stations"]) else len(s["stations"]) - 1
        xs = [v for i, v in enumerate(s["stations"]) if i != row]
        zs = [v for i, v in enumerate(s["elevations"]) if i != row]
        ns = segment_n(s)
        del ns[min(row, len(ns) - 1)]
        self.changed.emit({"shape": "irregular", "stations": xs, "elevations": zs, "n": ns},
                          f"Remove surveyed point {row + 1}")


class LiningForm(QWidget):
    """The lining: a catalogue entry (with its stone size), or none and a Manning's n."""

    def __init__(self, panel: "InputPanel"):
        super().__init__()
        self.panel = panel
        grid = _grid()
        grid.setContentsMargins(0, 0, 0, 0)
        self.setLayout(grid)
        self.combo = QComboBox()
        self.combo.setObjectName("lining")
        self.combo.setSizeAdjustPolicy(QComboBox.SizeAdjustPolicy.AdjustToMinimumContentsLengthWithIcon)
        self.combo.setMinimumContentsLength(12)
        self.combo.activated.connect(self._chosen)
        grid.addWidget(QLabel("Lining"), 0, 0)
        grid.addWidget(self.combo, 0, 1, 1, 2)
        self.message = QLabel()
        self.message.setObjectName("fieldMessage")
        self.message.setWordWrap(True)
        self.message.hide()
        grid.addWidget(self.message, 1, 1, 1, 2)
        self.d50 = panel._number(D50)
        row = self.d50.place(grid, 2)
        self.n = panel._number(MANNING)
        row = self.n.place(grid, row)
        self.n_label, self.n_value = QLabel("n at the design flow"), QLabel()
        self.n_value.setObjectName("computed")
        self.n_value.setAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        grid.addWidget(self.n_label, row, 0)
        grid.addWidget(self.n_value, row, 1, 1, 2)
        self.note = QLabel()
        self._notes = ""     # what the form itself has to say under the lining; the evaluation may say more
        self.note.setObjectName("hint")
        self.note.setWordWrap(True)
        grid.addWidget(self.note, row + 1, 0, 1, 3)
        self._fill()

    def _fill(self, units: UnitSystem | None = None) -> None:
        """The catalogue under a heading per kind (headings cannot be chosen), named in ``units``."""
        context = self.panel.doc.context
        if units is not None:
            context = context.with_units(units)
        self._filled_for = context.units
        self.combo.clear()
        self.combo.addItem("None: Manning's n only", "")
        model = self.combo.model()
        # the stone size has its own field
        for heading, items in display.lining_groups(context, sizes=False, decimal_mark=number_marks()[0]):
            self.combo.addItem(heading)
            head = model.item(self.combo.count() - 1)
            head.setEnabled(False)
            font = head.font()
            font.setBold(True)
            head.setFont(font)
            for key, label in items:
                self.combo.addItem(label, key)
                self.combo.setItemData(self.combo.count() - 1, label, Qt.ItemDataRole.ToolTipRole)
    def _chosen(self, index: int) -> None:
        key = self.combo.itemData(index)
        ch = self.panel.doc.channel()
        if not key:
            if ch.lining is not None:
                self.panel.doc.edit("lining", None, "Remove the lining")
            return
        if ch.lining is not None and ch.lining.key == key:
            return
        self.panel.doc.edit("lining", LiningChoice(key), f"Line with {self.combo.itemText(index).strip()}")

    def load(self, channel, units: UnitSystem, force: bool) -> None:
        self.set_message("")
        if units is not self._filled_for:
            self._fill(units)
        lining = channel.lining
        entry = None
        catalogue = self.panel.doc.context.catalogue
        if lining is not None and lining.key in catalogue:
            entry = catalogue.get(lining.key)
        i = self.combo.findData(lining.key if lining is not None else "")
        if i < 0:   # a key this catalogue does not know: show it, say so
            self.combo.addItem(f"{lining.key} (not in the catalogue)", lining.key)
            i = self.combo.count() - 1
        self.combo.setCurrentIndex(i)
        stone = entry is not None and entry.category == "stone"
        self.d50.set_visible(stone)
        if stone:
            self.d50.show_value(lining.d50, units, force)
            default = entry.d50
            self.d50.edit.setPlaceholderText(
                f"catalogue: {pretty(stone_size_text(default, units, number_marks()[0]))}" if default
                else "needed")
        surveyed = channel.section.get("shape") == "irregular"
        plain = lining is None
        self.n.set_visible(plain and not (surveyed and channel.manning_n is None))
        if plain:
            self.n.show_value(channel.manning_n, units, force)
        for w in (self.n_label, self.n_value):
            w.setVisible(not plain)
        notes = []
        if plain and surveyed and channel.manning_n is None:
            notes.append("Manning's n is set per segment in the surveyed-section table.")
        if not plain and channel.manning_n is not None:
            notes.append("The lining sets Manning's n; the n typed for the channel applies only without a lining.")
        self._notes = " ".join(notes)
        if plain:    # with a lining, the evaluation says where its n comes from when it is in (no flicker meanwhile)
            self._show_note(self._notes)

    def _show_note(self, text: str) -> None:
        if text != self.note.text():
            self.note.setText(text)
        self.note.setVisible(bool(text))

    def show_evaluation(self, ev) -> None:
        if ev.lining is not None:
            self.n_value.setText(rounded(ev.lining.manning_n, panel_field("manning_n")))   # as the results panel
            self.n_value.setToolTip(ev.lining.n_source)
            self._show_note(ev.lining.n_source[:1].upper() + ev.lining.n_source[1:] + ".")
        else:
            self._show_note(self._notes)
            if not self.n_label.isHidden():
                self.n_value.setText("—")
        if ev.error_field and ev.error_field.startswith("lining"):
            self.set_message(ev.error)

    def set_message(self, text: str) -> None:
        self.message.setText(text)
        self.message.setVisible(bool(text))
        set_invalid(self.combo, bool(text))

    def fields(self):
        return [self.n, self.d50]


class ShapePages(QWidget):
    """One page of fields per shape; only the current one is shown and takes room."""

    def __init__(self):
        super().__init__()
        self._pages = []
        self._current = -1
        lay = QVBoxLayout(self)
        lay.setContentsMargins(0, 0, 0, 0)

    def addWidget(self, page: QWidget) -> None:
        self._pages.append(page)
        self.layout().addWidget(page)
        page.setVisible(len(self._pages) - 1 == max(self._current, 0))
        if self._current < 0:
            self._current = 0

    def setCurrentIndex(self, index: int) -> None:
        self._current = index
        for i, page in enumerate(self._pages):
            page.setVisible(i == index)

    def currentIndex(self) -> int:
        return self._current

    def currentWidget(self) -> QWidget:
        return self._pages[self._current]


class InputPanel(QScrollArea):
    """Every input of the current channel, in reading order, in aligned groups."""

    validity_changed = Signal(str)   # "" when every field is valid, else the first complaint

    def __init__(self, doc: ProjectDocument, parent=None):
        super().__init__(parent)
        self.doc = doc
        self.fields: dict[str, NumberField] = {}
        self._invalid: dict[str, str] = {}
        self.setWidgetResizable(True)     # narrower than the form (a small screen): it scrolls, never cuts
        self.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAsNeeded)
        body = QWidget()
        body.setObjectName("inputBody")
        lay = QVBoxLayout(body)
        lay.setContentsMargins(10, 8, 10, 8)
        lay.setSpacing(10)

        # channel
        box, grid = _group("Channel")
        self.name = LineEdit()
        self.name.setObjectName("name")
        self.location = LineEdit()
        self.location.setObjectName("location")
        self.location.setPlaceholderText("station range or where it runs")
        self.name_message = QLabel()
        self.name_message.setObjectName("fieldMessage")
        self.name_message.hide()
        grid.addWidget(QLabel("Name"), 0, 0)
        grid.addWidget(self.name, 0, 1, 1, 2)
        grid.addWidget(self.name_message, 1, 1, 1, 2)
        grid.addWidget(QLabel("Location"), 2, 0)
        grid.addWidget(self.location, 2, 1, 1, 2)
        self.name.editingFinished.connect(self._rename)
        self.location.editingFinished.connect(self._relocate)
        lay.addWidget(box)

        # flow
        box, grid = _group("Design flow")
        self.method = _choice_box("flowMethod", FLOW_METHODS, self._method_chosen)
        grid.addWidget(QLabel("Obtained by"), 0, 0)
        grid.addWidget(self.method, 0, 1, 1, 2)
        row = self._number(FLOW).place(grid, 1)
        for spec in RATIONAL:
            row = self._number(spec).place(grid, row)
        self.tc_label, self.tc_value = QLabel("Time of concentration"), QLabel()
        self.q_label, self.q_value = QLabel("Design flow Q = C i A"), QLabel()
        for lab, val in ((self.tc_label, self.tc_value), (self.q_label, self.q_value)):
            val.setObjectName("computed")
            val.setWordWrap(True)       # a long line wraps inside the panel rather than widening it
            val.setAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
            grid.addWidget(lab, row, 0)
            grid.addWidget(val, row, 1, 1, 2)
            row += 1
        self.flow_box = box
        lay.addWidget(box)

        # grade
        box, grid = _group("Grade")
        self._number(SLOPE).place(grid, 0)
        lay.addWidget(box)

        # section
        box, grid = _group("Cross-section")
        self.shape = _choice_box("shape", SHAPES, self._shape_chosen)
        grid.addWidget(QLabel("Shape"), 0, 0)
        grid.addWidget(self.shape, 0, 1, 1, 2)
        self.shape_pages = ShapePages()
        self.shape_fields: dict[str, list[NumberField]] = {}
        for key, _ in SHAPES:
            page = QWidget()
            if key == "irregular":
                self.survey = SurveyTable()
                self.survey.changed.connect(self._survey_changed)
                self.survey.invalid.connect(lambda msg: self._note_invalid("survey", msg))
                pl = QVBoxLayout(page)
                pl.setContentsMargins(0, 4, 0, 0)
                pl.addWidget(self.survey)
            else:
                pg = _grid()
                pg.setContentsMargins(0, 4, 0, 0)
                page.setLayout(pg)
                r = 0
                self.shape_fields[key] = []
                for spec in SECTION_FIELDS[key]:
                    f = self._number(spec, key=f"{key}:{spec.path}")
                    self.shape_fields[key].append(f)
                    r = f.place(pg, r)
            self.shape_pages.addWidget(page)
        grid.addWidget(self.shape_pages, 1, 0, 1, 3)
        lay.addWidget(box)

        # lining
        box, grid = _group("Lining")
        self.lining = LiningForm(self)
        grid.addWidget(self.lining, 0, 0, 1, 3)
        lay.addWidget(box)

        # bend and freeboard
        box, grid = _group("Bend and freeboard")
        row = self._number(BEND).place(grid, 0)
        self._number(FREEBOARD).place(grid, row)
        lay.addWidget(box)

        # notes
        box, grid = _group("Notes")
        self.notes = NotesEdit()
        self.notes.setObjectName("channelNotes")
        self.notes.setPlaceholderText("Anything a checker should know: survey date, assumptions, "
                                      "who asked for it")
        self.notes.setTabChangesFocus(True)
        self.notes.setFixedHeight(74)
        self.notes.editingFinished.connect(self._renote)
        grid.addWidget(self.notes, 0, 0, 1, 3)
        lay.addWidget(box)
        lay.addStretch(1)
        self.setWidget(body)
        self.setMinimumWidth(300)

        for sig in (doc.reset, doc.current_changed, doc.units_changed):
            sig.connect(self._reload_all)
        doc.channel_changed.connect(self._channel_changed)
        self._committing: NumberField | None = None    # the field whose edit is being stored
        self.reload(force=True)

    # -- building -----------------------------------------------------------------------
    def _number(self, spec: Input, key: str | None = None) -> NumberField:
        f = NumberField(spec, self)
        key = key or spec.path
        self.fields[key] = f
        f.edited.connect(lambda value, f=f, key=key: self._commit(f, key, value))
        f.invalid.connect(lambda msg, key=key: self._note_invalid(key, msg))
        return f

    # -- showing ------------------------------------------------------------------------------
    def _reload_all(self, *_signal_args) -> None:
        self.reload(force=True)

    def _channel_changed(self, index: int) -> None:
        if index == self.doc.current:
            self.reload(own=self._committing)

    def reload(self, force: bool = False, own: NumberField | None = None) -> None:
        """Show the current channel. Keeps text the user is typing when it means the stored value. ``own``: the
        field whose edit this is; the other fields' accepted text still means their unchanged values, so only
        they that complain are shown again (reading every field back costs each keystroke a millisecond)."""
        ch, units = self.doc.channel(), self.doc.units
        complaint_before = self.first_complaint()
        if force:
            self._invalid.clear()
            for f in self.fields.values():
                f.touched = False
        if force or self.name.text() != ch.name:
            self.name.setText(ch.name)
            self.name.setCursorPosition(0)
        self._set_name_message("")
        if force or self.location.text() != ch.location:
            self.location.setText(ch.location)
            self.location.setCursorPosition(0)
        self.notes.show_text(ch.notes, force)
        self.method.setCurrentIndex(max(0, self.method.findData(ch.flow.method)))
        rational = ch.flow.method == "rational"
        self.fields[FLOW.path].set_visible(not rational)
        for spec in RATIONAL:
            self.fields[spec.path].set_visible(rational)
        for w in (self.tc_label, self.tc_value, self.q_label, self.q_value):
            w.setVisible(rational)
        shape = ch.section.get("shape")
        self.shape.setCurrentIndex(max(0, self.shape.findData(shape)))
        self.shape_pages.setCurrentIndex(self.shape.currentIndex())
        for key, f in self.fields.items():
            if ":" in key:
                owner, path = key.split(":", 1)
                if owner != shape:
                    continue
            else:
                path = key
            if f in self.lining.fields() or (own is not None and f is not own and not f.error):
                continue
            f.show_value(value_at(ch, path), units, force)
        self.lining.load(ch, units, force)
        if shape == "irregular":
            self.survey.load(ch.section, units)
        for key, f in self.fields.items():   # a field that no longer applies has nothing to complain about
            if f.edit.isHidden() and f.error:
                f.clear_error()
        # the survey table was just refilled from the project, so it has nothing left to complain about
        self._invalid = {k: v for k, v in self._invalid.items() if k in self.fields and self.fields[k].error}
        # only a changed complaint is news: the window refreshes on the channel change itself, and a second
        # signal would evaluate the channel twice for one keystroke
        if self.first_complaint() != complaint_before:
            self.validity_changed.emit(self.first_complaint())

    def show_evaluation(self, ev: display.Evaluation) -> None:
        """The computed lines of the form, and a mark on the field the core's error names."""
        units = self.doc.units
        if ev.time_of_concentration is not None:
            tc = format_value(ev.time_of_concentration, EXTRA_FIELDS["time_of_concentration"], units)
            self.tc_value.setText(keep_units_whole(f"{tc} (Kirpich)"))
        else:
            self.tc_value.setText("needs the flow-path length and slope")
        if ev.flow is not None:
            self.q_value.setText(keep_units_whole(f"{format_number(round(units.from_si('flow', ev.flow), 4))} "
                                                  f"{pretty(units.label('flow'))}"))
        else:
            self.q_value.setText("—")
        self.lining.show_evaluation(ev)
        if ev.error_field:
            path = CORE_TO_PATH.get(ev.error_field)
            shape = self.doc.channel().section.get("shape")
            f = self.fields.get(f"{shape}:{path}") or self.fields.get(path or "")
            untouched_blank = f is not None and not f.touched and not f.edit.text().strip()
            if f is not None and not f.error and not f.edit.isHidden() and not untouched_blank:
                f.set_error(ev.error)

    def first_complaint(self) -> str:
        return next(iter(self._invalid.values()), "")

    def _note_invalid(self, key: str, message: str) -> None:
        self._invalid[key] = message
        self.validity_changed.emit(self.first_complaint())

    def _note_valid(self, key: str) -> None:
        if self._invalid.pop(key, None) is not None:
            self.validity_changed.emit(self.first_complaint())

    def _set_name_message(self, text: str) -> None:
        self.name_message.setText(text)
        self.name_message.setVisible(bool(text))
        set_invalid(self.name, bool(text))

    # -- edits -----------------------------------------------------------------------------------
    def _commit(self, field: NumberField, key: str, value) -> None:
        path = field.spec.path
        candidate = with_value(self.doc.channel(), path, value)
        refusal = display.check_section(candidate)
        if refusal is not None:
            message, core_field = refusal
            target = self.fields.get(f"{candidate.section['shape']}:{CORE_TO_PATH.get(core_field, '')}", field)
            target.set_error(message)
            self._note_invalid(key, message)
            return
        self._note_valid(key)
        self._committing = field
        try:     # the checked copy is the new channel: no second copy made
            self.doc.replace(candidate, f"Change {field.spec.label.lower()}", merge_key=field.merge_key)
        finally:
            self._committing = None

    def _rename(self) -> None:
        text = self.name.text()
        if text == self.doc.channel().name:
            self._set_name_message("")
            return
        refusal = self.doc.rename_channel(text)
        self._set_name_message(refusal or "")

    def _relocate(self) -> None:
        self.doc.edit("location", self.location.text(), "Change location")

    def _renote(self) -> None:
        self.doc.edit("notes", self.notes.toPlainText(), "Change channel notes")

    def _method_chosen(self, index: int) -> None:
        self.doc.edit("flow.method", self.method.itemData(index), f"Obtain flow by {self.method.itemText(index)}")

    def _shape_chosen(self, index: int) -> None:
        shape = self.shape.itemData(index)
        ch = self.doc.channel()
        if shape == ch.section.get("shape"):
            return
        section, n = section_for_shape(ch, shape)
        new = with_value(with_value(ch, "section", section), "manning_n", n)
        self.doc.replace(new, f"Change shape to {self.shape.itemText(index).lower()}")

    def _survey_changed(self, section: dict, text: str) -> None:
        candidate = with_value(self.doc.channel(), "section", section)
        refusal = display.check_section(candidate)
        if refusal is not None:
            self.survey._set_message(refusal[0])
            self._note_invalid("survey", refusal[0])
            return
        self._note_valid("survey")
        self.doc.replace(candidate, text)
