"""The lining comparison: several linings for the current channel side by side.

A list to choose the linings (stored with the channel as its alternatives), a
table with one column per lining, a small section for each, and two actions:
apply the chosen column's lining to the channel (one undoable edit) and copy the
table as tab-separated text.

Clicking a quantity's heading orders the linings by it (again: the other way);
the columns can also be dragged. Only the order shown changes: a column keeps
its lining, so what is applied is always the lining the user picked.

The linings are computed off the window's thread by a :class:`~.tasks.Recomputer`
while the view is in sight, so typing in the form never waits for them: the
table shown stays until the one for the newest inputs is in, and a table for
inputs changed since is dropped. Applying and copying first wait for the table
of the inputs as they are.
"""

from __future__ import annotations

import copy
import re

from PySide6.QtCore import Qt, Signal
from PySide6.QtGui import QColor, QFontMetrics, QGuiApplication
from PySide6.QtWidgets import (QAbstractItemView, QCheckBox, QGridLayout, QHBoxLayout, QHeaderView, QLabel,
                               QPushButton, QScrollArea, QTableWidget, QTableWidgetItem, QVBoxLayout, QWidget)

from .. import channel_display as display
from ..project import LiningChoice
from .document import ProjectDocument
from .fields import keep_units_whole, number_marks, pretty
from .plots import SectionPicture
from .tasks import Recomputer


def wrap(text: str, width: float = 18, measure=len) -> str:
    """Break a lining name into lines no longer than ``width`` as ``measure`` counts (characters by default; a
    font's ``horizontalAdvance`` gives pixels), for a column heading or a tick's text."""
    lines, line = [], ""
    # a break may follow a comma between words, never a decimal comma ("D50 150,0 mm"); a no-break space holds
    for word in (w for w in re.sub(r",(?!\d)", ", ", text).split(" ") if w):
        if line and measure(f"{line} {word}") > width:
            lines.append(line)
            line = word
        else:
            line = f"{line} {word}".strip()
    lines.append(line)
    return "\n".join(lines)

COLUMN_WIDTH = 126
CHOICE_WIDTH = 205
CHOICE_COLUMNS = 3
PICTURE_HEIGHT = 92
SHORT = 420                     # a view lower than this [logical px] leaves out the two lines of instructions
CHOICE_HEIGHT = 6 * 22 + 8      # the list of ticks: six rows, fewer on a short window (a quarter of the view)
STATUS_COLOURS = {"pass": "#e7f4ea", "fail": "#fbeaea", "unchecked": "#fff6e0", "none": "#eef0f2"}


class ComparisonView(QWidget):
    status_message = Signal(str)

    def __init__(self, doc: ProjectDocument, parent=None):
        super().__init__(parent)
        self.doc = doc
        self.rows: list[display.ComparisonRow] = []
        self.data = None       # the one comparison table of ``rows`` as shown (app.comparison_table)
        self.pictures: list[SectionPicture] = []

        intro = self.intro = QLabel("Tick linings to compare them for this channel at its design flow. Pick a column to "
                       "apply that lining to the channel, or copy the table for a spreadsheet.")
        intro.setWordWrap(True)
        intro.setObjectName("hint")
        self.unavailable = QLabel()
        self.unavailable.setObjectName("staleNote")
        self.unavailable.setWordWrap(True)

        # the choice: a grid of ticks across the width, so that the table keeps the width
        self.choices = QWidget()
        self.choices.setObjectName("liningChoices")
        self.choice_grid = QGridLayout(self.choices)
        self.choice_grid.setContentsMargins(4, 2, 4, 2)
        self.choice_grid.setHorizontalSpacing(12)
        self.choice_grid.setVerticalSpacing(2)
        self.checks: dict[str, QCheckBox] = {}
        choice_scroll = self.choice_scroll = QScrollArea()
        choice_scroll.setWidgetResizable(True)
        choice_scroll.setWidget(self.choices)
        choice_scroll.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        choice_scroll.setFixedHeight(CHOICE_HEIGHT)

        self.table = QTableWidget(0, len(display.COMPARISON_COLUMNS))
        self.table.setObjectName("comparisonTable")
        self.table.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectColumns)
        self.table.setSelectionMode(QAbstractItemView.SelectionMode.SingleSelection)
        self.table.setEditTriggers(QAbstractItemView.EditTrigger.NoEditTriggers)
        self.table.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Fixed)
        self.table.horizontalHeader().setDefaultSectionSize(COLUMN_WIDTH)
        self.table.verticalHeader().setSectionResizeMode(QHeaderView.ResizeMode.ResizeToContents)
        self.table.setWordWrap(True)
        self.table.itemSelectionChanged.connect(self._selection_changed)
        self.table.horizontalHeader().setSectionsMovable(True)
        self.table.verticalHeader().setSectionsClickable(True)
        self.table.verticalHeader().sectionClicked.connect(self.sort_by)
        self._sort: tuple[int, bool] | None = None     # (quantity row, descending)

        self.apply_button = QPushButton("Apply chosen lining to the channel")
        self.apply_button.setObjectName("applyLining")
        self.apply_button.clicked.connect(self.apply_selected)
        self.copy_button = QPushButton("Copy table")
        self.copy_button.setObjectName("copyTable")
        self.copy_button.clicked.connect(self.copy_table)
        buttons = QHBoxLayout()
        buttons.addStretch(1)
        buttons.addWidget(self.copy_button)
        buttons.addWidget(self.apply_button)

        right = QWidget()
        rl = QVBoxLayout(right)
        rl.setContentsMargins(0, 0, 0, 0)
        rl.addWidget(self.table, 1)
        rl.addLayout(buttons)
        lay = QVBoxLayout(self)
        lay.setContentsMargins(10, 10, 10, 10)
        lay.addWidget(intro)
        lay.addWidget(self.unavailable)
        heading = QLabel("Linings to compare")
        heading.setObjectName("subheading")
        lay.addWidget(heading)
        lay.addWidget(choice_scroll)
        lay.addWidget(right, 1)

        # the linings are computed off the window's thread, the newest inputs only
        self.computer = Recomputer(self._comparison_work, self)
        self.computer.succeeded.connect(self._compared)
        self.computer.failed.connect(self._not_compared)
        for sig in (doc.reset, doc.current_changed, doc.units_changed, doc.channel_changed):
            sig.connect(self.mark_stale)
        self._stale = True
        self._pick = None      # the lining to pick when the next table is in (the one just applied)

    # -- refreshing -----------------------------------------------------------------------
    def mark_stale(self, *_signal_args) -> None:
        self._stale = True
        if self.isVisible():
            self.refresh()

    def showEvent(self, event):
        super().showEvent(event)
        if self._stale:
            self.refresh()

    @property
    def idle(self) -> bool:
        """The table shown is that of the inputs as they are (tests wait for this)."""
        return not self._stale and self.computer.idle

    def refresh(self) -> None:
        """Compute the comparison of the inputs as they are, off the window's thread; the table shown stays until
        the new one is in. The ticks follow the channel at once (they are inputs, not results)."""
        self._stale = False
        self._fill_choices(self.doc.channel())
        self.computer.request()

    def _comparison_work(self):
        """The comparison of the current channel as it is now, on copies (run in the worker)."""
        ch, context, marks = copy.deepcopy(self.doc.channel()), self.doc.context, number_marks()

        def work():
            rows, reason = display.compare(ch, context)
            return rows, reason, display.comparison_data(rows, context, *marks)
        return work

    def _not_compared(self, exc: BaseException) -> None:
        """A fault in the worker (not bad input, which ``compare`` words itself): said in words, no table."""
        self._show([], f"The linings could not be compared: {type(exc).__name__}: {exc}",
                   display.comparison_data([], self.doc.context, *number_marks()))

    def _compared(self, result) -> None:
        self._show(*result)

    def _show(self, rows, reason: str, data) -> None:
        """Linings side by side: one column each, the quantities down the side."""
        picked = self.selected()
        keep = self._pick or (self.rows[picked].choice if 0 <= picked < len(self.rows) else None)
        self._pick = None
        self.rows, self.data = rows, data
        self.unavailable.setText(reason)
        self.unavailable.setVisible(bool(reason))
        heads, body = [self.data.heading(f) for f in self.data.columns], self.data.body()
        self._set_columns(len(body))
        self.table.setRowCount(len(heads))          # row 0: the small section; then the quantities
        self.table.setHorizontalHeaderLabels([wrap(keep_units_whole(cells[0])) for cells in body])
        self._headings = ["Section"] + [pretty(h) for h in heads[1:]]
        self.table.setVerticalHeaderLabels(self._headings)
        self.table.setRowHeight(0, PICTURE_HEIGHT)
        for j, (row, cells) in enumerate(zip(self.rows, body)):
            self.table.horizontalHeaderItem(j).setToolTip(cells[0])
            colour = QColor(STATUS_COLOURS.get(row.evaluation.verdict.status, "#ffffff"))
            for i, text in enumerate(cells[1:], start=1):
                item = QTableWidgetItem(text)
                item.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
                if heads[i] == "Verdict":
                    item.setBackground(colour)
                    item.setTextAlignment(Qt.AlignmentFlag.AlignCenter)
                    item.setToolTip(pretty(row.evaluation.verdict.reason))
                self.table.setItem(i, j, item)
        self._fill_pictures()
        self._show_order()
        if keep is not None:           # the lining picked stays picked, wherever its column now is
            self._select_choice(keep)
        has_rows = bool(self.rows)
        self.copy_button.setEnabled(has_rows)
        self.apply_button.setEnabled(has_rows and self.selected() >= 0)

    def bring_up_to_date(self) -> None:
        """Make the table shown that of the inputs as they are, waiting for it if it is on its way (an action
        on the table acts on the numbers of the current inputs, never on a table left from before an edit)."""
        if self._stale:
            self.refresh()
        self.computer.finish()

    def selected(self) -> int:
        """The lining picked: its index in ``rows`` (the table's logical column, whatever the order shown), or -1."""
        cols = {i.column() for i in self.table.selectedIndexes()}
        return cols.pop() if len(cols) == 1 else -1

    def shown_order(self) -> list[int]:
        """Indices into ``rows`` from left to right as the table shows them."""
        header = self.table.horizontalHeader()
        return [header.logicalIndex(v) for v in range(len(self.rows))]

    def sort_by(self, row: int) -> None:
        """Order the linings by the quantity of table row ``row``; the same row again reverses the order."""
        if not 1 <= row < len(display.COMPARISON_COLUMNS):
            return
        descending = self._sort == (row, False)
        self._sort = (row, descending)
        self._show_order()

    def _show_order(self) -> None:
        header = self.table.horizontalHeader()
        labels = list(getattr(self, "_headings", []))
        if self._sort is None or not self.rows or not labels:
            return
        row, descending = self._sort
        key = display.COMPARISON_COLUMNS[row].key
        values = [r.values[key] for r in self.data.rows]
        present = [j for j, v in enumerate(values) if v is not None]

        def key(j):
            v = values[j]
            return (1, 0.0, str(v).lower()) if isinstance(v, str) else (0, float(v), "")
        order = sorted(present, key=key, reverse=descending) + [j for j, v in enumerate(values) if v is None]
        for visual, j in enumerate(order):
            header.moveSection(header.visualIndex(j), visual)
        labels[row] += " ▼" if descending else " ▲"
        self.table.setVerticalHeaderLabels(labels)

    def _columns(self) -> int:
        """Columns of ticks that fit the width shown (at most CHOICE_COLUMNS)."""
        room = self.choice_scroll.viewport().width() - 8
        return max(1, min(CHOICE_COLUMNS, (room + 12) // (CHOICE_WIDTH + 12)))

    def resizeEvent(self, event):
        super().resizeEvent(event)
        self.choice_scroll.setFixedHeight(max(3 * 22 + 8, min(CHOICE_HEIGHT, self.height() // 4)))
        self.intro.setVisible(self.height() >= SHORT)       # a short view keeps its height for the table
        if self.checks and self._columns() != getattr(self, "_filled_columns", None):
            self._groups = None
            self._fill_choices(self.doc.channel())

    def _fill_choices(self, ch) -> None:
        groups = display.lining_groups(self.doc.context, decimal_mark=number_marks()[0])
        columns = self._columns()
        if groups != getattr(self, "_groups", None) or columns != getattr(self, "_filled_columns", None):
            self._groups, self._filled_columns = groups, columns
            while self.choice_grid.count():
                item = self.choice_grid.takeAt(0)
                if item.widget() is not None:
                    item.widget().deleteLater()
            self.checks.clear()
            metrics = QFontMetrics(self.font())
            room = self.choice_scroll.viewport().width() - 8 - 12 * (columns - 1)
            text_width = max(CHOICE_WIDTH, room // columns) - 28     # what a tick's text may take; it wraps there
            row = 0
            for heading, items in groups:            # a heading per kind, its linings in rows beneath
                head = QLabel(heading)
                head.setObjectName("subheading")
                self.choice_grid.addWidget(head, row, 0, 1, columns)
                row += 1
                for i, (key, name) in enumerate(items):
                    box = QCheckBox(wrap(name, text_width, metrics.horizontalAdvance))
                    box.setObjectName(f"compare_{key}")
                    box.setToolTip(name)
                    box.setMinimumWidth(CHOICE_WIDTH)
                    box.toggled.connect(lambda on, key=key, name=name: self._choice_toggled(key, name, on))
                    self.choice_grid.addWidget(box, row + i // columns, i % columns)
                    self.checks[key] = box
                row += (len(items) + columns - 1) // columns
        chosen = {a.key for a in ch.alternatives}
        own = ch.lining.key if ch.lining is not None else None
        for key, box in self.checks.items():
            box.blockSignals(True)
            box.setChecked(key in chosen or key == own)
            box.setEnabled(key != own)   # the channel's own lining is always compared
            box.blockSignals(False)

    def _set_columns(self, count: int) -> None:
        """``count`` lining columns, each with its small section picture in row 0."""
        if count < len(self.pictures):
            for j in range(count, len(self.pictures)):
                self.table.removeCellWidget(0, j)    # Qt deletes the canvas with it
            del self.pictures[count:]
        self.table.setColumnCount(count)
        self.table.setRowCount(max(self.table.rowCount(), 1))
        while len(self.pictures) < count:
            pic = SectionPicture(width=COLUMN_WIDTH / 100, height=PICTURE_HEIGHT / 100, dpi=100, compact=True)
            self.table.setCellWidget(0, len(self.pictures), pic.canvas)
            self.pictures.append(pic)

    def _fill_pictures(self) -> None:
        units = self.doc.units
        for pic, row in zip(self.pictures, self.rows):
            if row.evaluation.ok:
                thick = row.evaluation.lining.layer_thickness if row.evaluation.lining else None
                pic.update(row.evaluation, units, title="", lining_thickness=thick)
            else:
                pic.fade(True, "no result")
            pic.canvas.draw_idle()

    # -- actions -------------------------------------------------------------------------------
    def _choice_toggled(self, key: str, name: str, on: bool) -> None:
        ch = self.doc.channel()
        current = [copy.deepcopy(a) for a in ch.alternatives]
        if on and key not in {a.key for a in current}:
            current.append(LiningChoice(key))
            text = f"Compare {name}"
        else:
            current = [a for a in current if a.key != key]
            text = f"Stop comparing {name}"
        self.doc.edit("alternatives", current, text)

    def _selection_changed(self) -> None:
        self.apply_button.setEnabled(self.selected() >= 0 and bool(self.rows))

    def select_lining(self, index: int) -> None:
        self.table.selectColumn(index)

    def apply_selected(self) -> None:
        index = self.selected()
        if not 0 <= index < len(self.rows):
            self.status_message.emit("Pick a lining (a column of the table) first.")
            return
        choice = self.rows[index].choice
        self.bring_up_to_date()
        index = next((j for j, r in enumerate(self.rows) if (r.choice.key, r.choice.d50) == (choice.key, choice.d50)),
                     -1)
        if index < 0:
            self.status_message.emit("That lining is no longer compared for this channel: pick a column again.")
            return
        picked = self.rows[index]     # held: the edit below refreshes the table, which may reorder ``rows``
        ch = self.doc.channel()
        new = display.with_lining(ch, picked.choice)
        if ch.lining is not None and all((a.key, a.d50) != (ch.lining.key, ch.lining.d50) for a in ch.alternatives):
            new.alternatives.insert(0, copy.deepcopy(ch.lining))   # the lining it had stays in the comparison
        self.doc.replace(new, f"Apply lining {picked.name}")
        self.status_message.emit(f"Lining '{picked.name}' applied to {self.doc.channel().name}.")
        self._pick = picked.choice     # picked again in the new table (the old lining joins it as a column)
        self._select_choice(picked.choice)

    def _select_choice(self, choice) -> None:
        """Keep the applied lining's column selected after the table was refilled."""
        for j, r in enumerate(self.rows):
            if (r.choice.key, r.choice.d50) == (choice.key, choice.d50):
                self.table.selectColumn(j)
                return

    def copy_table(self) -> str:
        self.bring_up_to_date()
        text = display.comparison_tsv([self.rows[j] for j in self.shown_order()], self.doc.context, *number_marks())
        QGuiApplication.clipboard().setText(text)
        self.status_message.emit(f"Comparison table copied ({len(self.rows)} rows, tab-separated).")
        return text
