"""The lining comparison: several linings for the current channel side by side.

A list to choose the linings (stored with the channel as its alternatives), a
table with one row per lining, a small section for each, and two actions:
apply the chosen row's lining to the channel (one undoable edit) and copy the
table as tab-separated text.
"""

from __future__ import annotations

import copy

from PySide6.QtCore import Qt, Signal
from PySide6.QtGui import QColor, QGuiApplication
from PySide6.QtWidgets import (QAbstractItemView, QHBoxLayout, QHeaderView, QLabel, QListWidget, QListWidgetItem,
                               QPushButton, QScrollArea, QSplitter, QTableWidget, QTableWidgetItem, QVBoxLayout,
                               QWidget)

from ..project import LiningChoice
from . import compute
from .document import ProjectDocument
from .plots import SectionPicture

STATUS_COLOURS = {"pass": "#e7f4ea", "fail": "#fbeaea", "unchecked": "#fff6e0", "none": "#eef0f2"}


class ComparisonView(QWidget):
    status_message = Signal(str)

    def __init__(self, doc: ProjectDocument, parent=None):
        super().__init__(parent)
        self.doc = doc
        self.rows: list[compute.ComparisonRow] = []
        self.pictures: list[SectionPicture] = []

        intro = QLabel("Choose linings to compare for this channel at its design flow. "
                       "Pick a row and apply it to the channel, or copy the table for a spreadsheet.")
        intro.setWordWrap(True)
        intro.setObjectName("hint")
        self.unavailable = QLabel()
        self.unavailable.setObjectName("staleNote")
        self.unavailable.setWordWrap(True)

        self.choices = QListWidget()
        self.choices.setObjectName("liningChoices")
        self.choices.itemChanged.connect(self._choice_toggled)
        self.choices.setMaximumWidth(210)

        self.table = QTableWidget(0, len(compute.COMPARISON_COLUMNS))
        self.table.setObjectName("comparisonTable")
        self.table.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.table.setSelectionMode(QAbstractItemView.SelectionMode.SingleSelection)
        self.table.setEditTriggers(QAbstractItemView.EditTrigger.NoEditTriggers)
        self.table.verticalHeader().hide()
        self.table.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.ResizeToContents)
        self.table.horizontalHeader().setStretchLastSection(True)
        self.table.itemSelectionChanged.connect(self._selection_changed)

        self.strip = QWidget()
        self.strip_layout = QHBoxLayout(self.strip)
        self.strip_layout.setContentsMargins(0, 0, 0, 0)
        self.strip_layout.addStretch(1)
        strip_scroll = QScrollArea()
        strip_scroll.setWidgetResizable(True)
        strip_scroll.setWidget(self.strip)
        strip_scroll.setMinimumHeight(170)
        strip_scroll.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAsNeeded)

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
        rl.addWidget(self.table, 3)
        rl.addWidget(strip_scroll, 2)
        rl.addLayout(buttons)
        split = QSplitter()
        left = QWidget()
        ll = QVBoxLayout(left)
        ll.setContentsMargins(0, 0, 0, 0)
        ll.addWidget(QLabel("Linings to compare"))
        ll.addWidget(self.choices)
        split.addWidget(left)
        split.addWidget(right)
        split.setStretchFactor(1, 1)

        lay = QVBoxLayout(self)
        lay.setContentsMargins(10, 10, 10, 10)
        lay.addWidget(intro)
        lay.addWidget(self.unavailable)
        lay.addWidget(split, 1)

        for sig in (doc.reset, doc.current_changed, doc.units_changed, doc.channel_changed):
            sig.connect(self.mark_stale)
        self._stale = True

    # -- refreshing -----------------------------------------------------------------------
    def mark_stale(self, *_signal_args) -> None:
        self._stale = True
        if self.isVisible():
            self.refresh()

    def showEvent(self, event):
        super().showEvent(event)
        if self._stale:
            self.refresh()

    def refresh(self) -> None:
        self._stale = False
        ch, units = self.doc.channel(), self.doc.units
        self._fill_choices(ch)
        if not compute.LININGS_AVAILABLE:
            self.unavailable.setText(
                "The lining catalogue is not part of this build yet, so linings cannot be compared. "
                + (f"This channel lists {len(ch.alternatives)} alternatives: "
                   + ", ".join(a.key for a in ch.alternatives) + "." if ch.alternatives else ""))
            self.unavailable.show()
        else:
            self.unavailable.hide()
        self.rows = compute.compare(ch, ch.alternatives, units)
        heads, body = compute.comparison_table(self.rows, units)
        self.table.setColumnCount(len(heads))
        self.table.setHorizontalHeaderLabels([h.replace(" [", "\n[") for h in heads])
        self.table.setRowCount(len(body))
        for i, (row, cells) in enumerate(zip(self.rows, body)):
            colour = QColor(STATUS_COLOURS.get(row.evaluation.verdict.status, "#ffffff"))
            for j, text in enumerate(cells):
                item = QTableWidgetItem(text)
                if j > 0:
                    item.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
                if heads[j].startswith("Verdict"):
                    item.setBackground(colour)
                    item.setTextAlignment(Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter)
                self.table.setItem(i, j, item)
        self._fill_pictures()
        has_rows = bool(self.rows)
        self.copy_button.setEnabled(has_rows)
        self.apply_button.setEnabled(has_rows and self.table.currentRow() >= 0)

    def _fill_choices(self, ch) -> None:
        self.choices.blockSignals(True)
        self.choices.clear()
        chosen = {a.key for a in ch.alternatives}
        for key, name in compute.catalogue_choices():
            item = QListWidgetItem(name)
            item.setData(Qt.ItemDataRole.UserRole, key)
            item.setFlags(item.flags() | Qt.ItemFlag.ItemIsUserCheckable)
            item.setCheckState(Qt.CheckState.Checked if key in chosen else Qt.CheckState.Unchecked)
            self.choices.addItem(item)
        self.choices.blockSignals(False)
        self.choices.setEnabled(self.choices.count() > 0)

    def _fill_pictures(self) -> None:
        while len(self.pictures) < len(self.rows):
            pic = SectionPicture(width=2.4, height=1.6, dpi=100, compact=True)
            pic.canvas.setMinimumSize(200, 140)
            self.pictures.append(pic)
            self.strip_layout.insertWidget(self.strip_layout.count() - 1, pic.canvas)
        units = self.doc.units
        for i, pic in enumerate(self.pictures):
            visible = i < len(self.rows)
            pic.canvas.setVisible(visible)
            if visible:
                row = self.rows[i]
                if row.evaluation.ok:
                    thick = row.evaluation.lining.thickness if row.evaluation.lining else None
                    pic.update(row.evaluation, units, title=f"{row.name}\n{row.evaluation.verdict.headline}",
                               lining_thickness=thick)
                else:
                    pic.fade(True, "no result")
                pic.canvas.draw_idle()

    # -- actions -------------------------------------------------------------------------------
    def _choice_toggled(self, item: QListWidgetItem) -> None:
        ch = self.doc.channel()
        key = item.data(Qt.ItemDataRole.UserRole)
        current = [copy.deepcopy(a) for a in ch.alternatives]
        if item.checkState() == Qt.CheckState.Checked and key not in {a.key for a in current}:
            current.append(LiningChoice(key))
            text = f"Compare lining {item.text()}"
        else:
            current = [a for a in current if a.key != key]
            text = f"Stop comparing {item.text()}"
        self.doc.edit("alternatives", current, text)

    def _selection_changed(self) -> None:
        self.apply_button.setEnabled(self.table.currentRow() >= 0 and bool(self.rows))

    def select_row(self, row: int) -> None:
        self.table.selectRow(row)

    def apply_selected(self) -> None:
        row = self.table.currentRow()
        if not 0 <= row < len(self.rows):
            self.status_message.emit("Pick a row of the table first.")
            return
        choice = self.rows[row].choice
        self.doc.edit("lining", copy.deepcopy(choice), f"Apply lining {self.rows[row].name}")
        self.status_message.emit(f"Lining '{self.rows[row].name}' applied to {self.doc.channel().name}.")

    def copy_table(self) -> str:
        text = compute.comparison_tsv(self.rows, self.doc.units)
        QGuiApplication.clipboard().setText(text)
        self.status_message.emit(f"Comparison table copied ({len(self.rows)} rows, tab-separated).")
        return text
