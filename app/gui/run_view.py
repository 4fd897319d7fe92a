"""The window's view of a ditch run: its inputs, its profile over the station table, its lining schedule.

Built on the Qt-free layer only: :func:`app.run_design.design_run` solves the run (in a worker thread, so the
window stays live), ``station_rows`` gives the table's text as every front end shows it,
:func:`app.run_summary.run_summary` the results panel's verdict, schedule and cautions (as the run sheet and the
``run`` command word them) and each station's verdict, and :func:`app.run_drawing.profile_model` the one drawing
of the profile. Edits of grade points, candidates' unit costs and sub-areas go through the document, one undoable
command each (:mod:`app.run_editing` makes the changed run). An entry that cannot be used is refused where it was typed, the document is left as it was, and
the last good result stays in view, greyed.
"""

from __future__ import annotations

import copy
import re
from dataclasses import dataclass

import numpy as np

from PySide6.QtCore import QAbstractTableModel, QEvent, QModelIndex, Qt, QTimer, Signal
from PySide6.QtGui import QAction, QBrush, QColor, QKeySequence
from PySide6.QtWidgets import (QAbstractItemView, QComboBox, QDialog, QFormLayout, QFrame, QGroupBox, QHBoxLayout,
                               QHeaderView, QLabel, QListWidget, QMenu, QPushButton, QScrollArea, QSplitter,
                               QTableView, QTableWidget, QTableWidgetItem, QVBoxLayout, QWidget)

import hydraulics as hy
from hydraulics.provenance import NOT_VERIFIED_MARK, NOT_VERIFIED_TITLE
from hydraulics.units import UnitSystem
from hydraulics.wording import format_station

from ..channel_display import lining_groups
from ..project import OUTFALL_CONTROLS, RunCandidate
from ..results import RUN_STATION_FIELDS
from ..run_design import CONTROL_WORDS, RunDesign, design_run, section_words
from ..run_drawing import profile_model
from ..run_summary import RunSummary, run_summary
from ..run_editing import (ADDABLE, OUTFALL_LEVEL_PATH, REPLACEABLE, RUN_ITEMS, RUN_SETTINGS, StationNotOpenable,
                           cost_quantity, item_path, run_value, starting_run, station_channel, with_item_added,
                           with_item_removed, with_item_replaced, with_outfall_control, with_run_value)
from ..verdicts import Verdict
from .document import ProjectDocument
from .fields import (LineEdit, format_number, keep_units_whole, message_line, number_marks, pretty, sentence,
                     set_invalid, typed_number)
from .results_view import CAUTION, _escape
from .run_item_dialogs import SectionDialog, SubAreaDialog
from .run_plot import ProfilePicture
from .screen_fit import SideTabs
from .tasks import Recomputer

#: Columns of the station table, in reading order (keys of ``station_rows``); "check" is the row's verdict.
STATION_COLUMNS = ("station", "check", "flow", "slope", "lining", "normal_depth", "critical_depth", "water_depth",
                   "profile_type", "water_surface", "velocity", "froude", "regime", "bed_shear", "side_shear",
                   "permissible_shear", "safety_factor", "stable", "freeboard", "ditch_depth", "fits", "overtopped",
                   "invert", "ca", "tc", "intensity",
                   "manning_n", "required_d50", "dimensions")
#: The background of a station's row by its verdict (app.run_summary.station_states; the words are the vocabulary's).
ROW_COLOURS = {Verdict.UNSTABLE: "#fbdcda", Verdict.TOO_SHALLOW: "#fbe3cc", Verdict.NOT_CHECKED: "#fff6e0",
               Verdict.STABLE: None}
GREY = QColor("#a3a9ae")
#: Opens the chosen station of the table as a channel (not used by any other action of the window).
OPEN_STATION_KEY = "Ctrl+Shift+O"


def column_heading(key: str, units: UnitSystem) -> str:
    """A station-table heading: the label of app.results with its unit on a second line."""
    if key == "check":
        return "Check"
    if key == "dimensions":
        return "Section"
    f = RUN_STATION_FIELDS[key]
    if key == "station" or not f.quantity:
        return f.label
    return f"{f.label}\n[{pretty(units.label(f.quantity))}]"


class StationTableModel(QAbstractTableModel):
    """The station table over ``station_rows(units)``: text as given, failing rows marked in words and colour by
    their verdicts; ``stale`` greys every cell (the last good result, while the inputs are not usable)."""

    def __init__(self, parent=None):
        super().__init__(parent)
        self.rows: list[dict] = []
        self.verdicts: list[Verdict] = []
        self.headings: list[str] = [k for k in STATION_COLUMNS]
        self.lining_names: dict[str, str] = {}
        self.stale = False

    def set_rows(self, rows: list[dict], verdicts: list, units: UnitSystem, lining_names: dict) -> None:
        self.beginResetModel()
        self.rows, self.verdicts = rows, list(verdicts)
        self.lining_names = lining_names
        self.headings = [column_heading(k, units) for k in STATION_COLUMNS]
        self.stale = False
        self.endResetModel()

    def set_stale(self, stale: bool) -> None:
        if stale != self.stale:
            self.stale = stale
            if self.rows:
                self.dataChanged.emit(self.index(0, 0), self.index(len(self.rows) - 1, len(STATION_COLUMNS) - 1))

    def rowCount(self, parent=QModelIndex()):
        return 0 if parent.isValid() else len(self.rows)

    def columnCount(self, parent=QModelIndex()):
        return 0 if parent.isValid() else len(STATION_COLUMNS)

    def text(self, row: int, key: str) -> str:
        r = self.rows[row]
        if key == "check":
            return self.verdicts[row].words
        if key == "lining":
            return self.lining_names.get(r["lining"], r["lining"])
        if key == "dimensions":
            return f"{r['shape']} {r['dimensions']}".strip()
        return r.get(key, "")

    def data(self, index, role=Qt.ItemDataRole.DisplayRole):
        if not index.isValid():
            return None
        key = STATION_COLUMNS[index.column()]
        r = self.rows[index.row()]
        if role == Qt.ItemDataRole.DisplayRole:
            return self.text(index.row(), key)
        if role == Qt.ItemDataRole.TextAlignmentRole:
            left = key in ("check", "lining", "regime", "dimensions", "stable", "fits", "profile_type", "overtopped")
            return int((Qt.AlignmentFlag.AlignLeft if left else Qt.AlignmentFlag.AlignRight)
                       | Qt.AlignmentFlag.AlignVCenter)
        mark = self.verdicts[index.row()]
        if role == Qt.ItemDataRole.BackgroundRole:
            colour = ROW_COLOURS[mark]
            return QBrush(QColor(colour)) if colour and not self.stale else None
        if role == Qt.ItemDataRole.ForegroundRole:
            if self.stale:
                return QBrush(GREY)
            return QBrush(QColor("#8c1d16")) if mark.status == "fail" and key == "check" else None
        if role == Qt.ItemDataRole.FontRole and key == "check" and mark is not Verdict.STABLE:
            from PySide6.QtGui import QFont
            font = QFont()
            font.setBold(True)
            return font
        if role == Qt.ItemDataRole.ToolTipRole:
            if key in ("lining", "dimensions"):
                return self.text(index.row(), key)
            if key == "check" and r.get("not_checked"):
                return sentence(r["not_checked"][:1].upper() + r["not_checked"][1:])
            if key == "tc" and r.get("partial_area") == "True":
                return "The partial-area case governs here: a smaller, faster part of the area gives the larger flow."
        return None

    def headerData(self, section, orientation, role=Qt.ItemDataRole.DisplayRole):
        if role != Qt.ItemDataRole.DisplayRole:
            return None
        if orientation == Qt.Orientation.Horizontal:
            return self.headings[section]
        return str(section + 1)


# -- the inputs ---------------------------------------------------------------------------------------
@dataclass(frozen=True)
class Column:
    """One editable column of an input table: the run's item attribute, heading, quantity, allowed range."""

    attribute: str
    heading: str
    quantity: str = ""           # hydraulics.units quantity; "" a pure number; "cost" priced per the lining's basis
    low: float | None = None
    low_inclusive: bool = True
    high: float | None = None
    optional: bool = False
    editable: bool = True


class InputTable(QWidget):
    """One list of a run (grade points, candidates, sub-areas) as an editable table with its message line."""

    edited = Signal(str, object, str)    # path (e.g. "profile[2].elevation"), SI value, description
    refused = Signal(str, str)           # path, message
    add_asked = Signal(str, int)         # items, the row the new one follows (-1: none chosen)
    remove_asked = Signal(str, int)      # items, row
    item_asked = Signal(str, int)        # items, row: edit the whole item in its dialog (REPLACEABLE lists)

    def __init__(self, items: str, columns: tuple, name: str, parent=None):
        super().__init__(parent)
        self.items, self.columns = items, columns
        self.run = None
        self.units: UnitSystem | None = None
        self.catalogue = None
        self.table = QTableWidget(0, len(columns))
        self.table.setObjectName(name)
        self.table.verticalHeader().setDefaultSectionSize(24)
        self.table.verticalHeader().setVisible(False)
        self.table.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Stretch)
        self.table.horizontalHeader().setMinimumSectionSize(60)
        self.table.setVerticalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAsNeeded)
        self.table.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        self.table.setEditTriggers(QAbstractItemView.EditTrigger.DoubleClicked
                                   | QAbstractItemView.EditTrigger.EditKeyPressed
                                   | QAbstractItemView.EditTrigger.AnyKeyPressed)
        self.table.setTabKeyNavigation(False)    # Tab leaves the table: the view is walked by keyboard
        self.table.itemChanged.connect(self._changed)
        self.message = message_line()
        lay = QVBoxLayout(self)
        lay.setContentsMargins(0, 0, 0, 0)
        lay.setSpacing(3)
        lay.addWidget(self.table)
        if items in ADDABLE:
            self.add_button = QPushButton("Add")
            self.add_button.setObjectName(f"{name}Add")
            self.add_button.setToolTip(f"Add {ITEM_WORDS[items]} after the chosen row (Insert in the table)")
            self.remove_button = QPushButton("Delete")
            self.remove_button.setObjectName(f"{name}Delete")
            self.remove_button.setToolTip(f"Delete the chosen {ITEM_WORDS[items]} (Delete in the table)")
            self.add_button.clicked.connect(self.ask_add)
            self.remove_button.clicked.connect(self.ask_remove)
            self.table.installEventFilter(self)     # Insert and Delete in the table, outside a cell being edited
            buttons = QHBoxLayout()
            buttons.setContentsMargins(0, 0, 0, 0)
            buttons.addStretch(1)
            if items in REPLACEABLE:
                self.item_button = QPushButton(ITEM_DIALOG_BUTTONS[items])
                self.item_button.setObjectName(f"{name}Details")
                self.item_button.setToolTip(f"Open the chosen {ITEM_WORDS[items]} in a dialog to change it whole "
                                            f"(or double-click its {'name' if items == 'sub_areas' else 'section'})")
                self.item_button.clicked.connect(self.ask_item)
                self.table.cellDoubleClicked.connect(self._double_clicked)
                buttons.addWidget(self.item_button)
            buttons.addWidget(self.add_button)
            buttons.addWidget(self.remove_button)
            lay.addLayout(buttons)
        lay.addWidget(self.message)
        self.marked: dict[tuple[int, int], str] = {}

    def eventFilter(self, watched, event) -> bool:
        if watched is self.table and event.type() == QEvent.Type.KeyPress \
                and self.table.state() != QAbstractItemView.State.EditingState \
                and event.key() in (Qt.Key.Key_Insert, Qt.Key.Key_Delete):
            (self.ask_add if event.key() == Qt.Key.Key_Insert else self.ask_remove)()
            return True
        return super().eventFilter(watched, event)

    def chosen_row(self) -> int:
        """The row of the current cell, -1 where none is chosen."""
        index = self.table.currentIndex()
        return index.row() if index.isValid() else -1

    def ask_add(self) -> None:
        self.add_asked.emit(self.items, self.chosen_row())

    def ask_item(self) -> None:
        row = self.chosen_row()
        if row < 0 and self.table.rowCount() == 1:
            row = 0
        if row < 0:
            self.say(f"Choose the {ITEM_WORDS[self.items]} to edit first.")
            return
        self.item_asked.emit(self.items, row)

    def _double_clicked(self, row: int, col: int) -> None:
        if self.columns[col].attribute in ("name", "section"):
            self.item_asked.emit(self.items, row)

    def ask_remove(self) -> None:
        row = self.chosen_row()
        if row < 0:
            self.say(f"Choose the {ITEM_WORDS[self.items]} to delete first.")
            return
        self.remove_asked.emit(self.items, row)

    def say(self, message: str) -> None:
        """A message under the table that marks no cell (a refused addition or deletion)."""
        self.marked.clear()
        self._paint()
        self.message.setText(message)
        self.message.setVisible(bool(message))

    # -- showing ---------------------------------------------------------------------------
    def heading(self, c: Column, row: int | None = None) -> str:
        if c.quantity == "cost":
            return c.heading
        unit = pretty(self.units.label(c.quantity)) if c.quantity else ""
        if not unit:
            return c.heading
        # five columns or more share the panel's width, and a narrow panel (two columns of the window): the unit
        # under the heading
        return f"{c.heading}\n[{unit}]" if len(self.columns) > 4 or self.stacked else f"{c.heading} [{unit}]"

    @property
    def stacked(self) -> bool:
        """Whether a heading with its unit on one line is wider than a column's share of the table."""
        if self.units is None:
            return False
        share = self.table.viewport().width() / len(self.columns)
        width = self.table.horizontalHeader().fontMetrics().horizontalAdvance
        return any(width(f"{c.heading} [{pretty(self.units.label(c.quantity))}]") + 12 > share
                   for c in self.columns if c.quantity and c.quantity != "cost")

    def resizeEvent(self, event) -> None:
        super().resizeEvent(event)
        if self.units is not None:
            t = self.table
            for j, c in enumerate(self.columns):
                text = self.heading(c)
                if t.horizontalHeaderItem(j) is not None and t.horizontalHeaderItem(j).text() != text and \
                        c.quantity != "cost":
                    t.horizontalHeaderItem(j).setText(text)
                    t.setFixedHeight(t.horizontalHeader().sizeHint().height() + min(t.rowCount(), 6) * 24 + 4)

    def cost_unit(self, row: int) -> str:
        entry = self.catalogue.get(self.run.candidates[row].key) if self.run.candidates[row].key in self.catalogue \
            else None
        basis = entry.unit_cost_basis if entry is not None else "area"
        return f"$/{pretty(self.units.label(cost_quantity(basis)))}"

    def shown(self, c: Column, row: int, value) -> str:
        """The SI value as the user reads it in the cell."""
        if value is None:
            return ""
        if c.quantity == "cost":
            return f"{format_number(self.cost_from_si(row, value))}"
        if c.quantity:
            return format_number(float(self.units.from_si(c.quantity, value)))
        return format_number(value) if isinstance(value, float) else str(value)

    def cost_from_si(self, row: int, value: float) -> float:
        """A price per m^2 or m^3 as a price per the shown unit of surface or volume."""
        q = self._cost_basis_quantity(row)
        return float(value) / float(self.units.from_si(q, 1.0))

    def cost_to_si(self, row: int, value: float) -> float:
        q = self._cost_basis_quantity(row)
        return float(value) * float(self.units.from_si(q, 1.0))

    def _cost_basis_quantity(self, row: int) -> str:
        key = self.run.candidates[row].key
        entry = self.catalogue.get(key) if key in self.catalogue else None
        return cost_quantity(entry.unit_cost_basis if entry is not None else "area")

    def load(self, run, units: UnitSystem, catalogue) -> None:
        """Fill the table from ``run`` (SI) in ``units``; what was marked is cleared."""
        self.run, self.units, self.catalogue = run, units, catalogue
        seq = getattr(run, self.items)
        t = self.table
        t.blockSignals(True)
        t.setRowCount(len(seq))
        t.setHorizontalHeaderLabels([self.heading(c) for c in self.columns])
        for j, c in enumerate(self.columns):
            t.horizontalHeader().setSectionResizeMode(j, QHeaderView.ResizeMode.Stretch if c.attribute in WIDE or
                                                      len(self.columns) == 2 else QHeaderView.ResizeMode.ResizeToContents)
        for i, item in enumerate(seq):
            for j, c in enumerate(self.columns):
                value = getattr(item, c.attribute, None)
                cell = QTableWidgetItem(self.cell_text(c, i, item, value))
                editable = c.editable and not (c.attribute == "runoff_coefficient" and item.land_covers)
                if not editable:
                    cell.setFlags(cell.flags() & ~Qt.ItemFlag.ItemIsEditable)
                    cell.setForeground(QBrush(QColor("#5f6870")))
                cell.setTextAlignment((Qt.AlignmentFlag.AlignRight if c.quantity or c.attribute in (
                    "runoff_coefficient",) else Qt.AlignmentFlag.AlignLeft) | Qt.AlignmentFlag.AlignVCenter)
                cell.setToolTip(self.cell_tip(c, i, item))
                t.setItem(i, j, cell)
        t.blockSignals(False)
        self.clear_marks()
        rows = min(len(seq), 6)
        t.setFixedHeight(t.horizontalHeader().sizeHint().height() + rows * 24 + 4)

    def cell_text(self, c: Column, row: int, item, value) -> str:
        if c.attribute == "section":
            return pretty(", ".join(section_words(value, self.units)))
        if c.attribute == "cost_unit":
            return self.cost_unit(row)
        if c.attribute == "runoff_coefficient" and item.land_covers:
            return "weighted"
        if c.attribute == "key":
            return self.catalogue.get(value).name if value in self.catalogue else value
        if c.attribute == "unit_cost" and value is None:
            return ""
        return self.shown(c, row, value)

    def cell_tip(self, c: Column, row: int, item) -> str:
        if c.attribute == "runoff_coefficient" and item.land_covers:
            return "C is weighted by area over the sub-area's land covers (edit them in the project file)."
        if c.attribute == "unit_cost":
            default = None
            if item.key in self.catalogue:
                default = self.catalogue.get(item.key).unit_cost
            unit = self.cost_unit(row)
            where = (f"empty: the catalogue's {format_number(self.cost_from_si(row, default))} {unit}"
                     if default is not None else "the catalogue has no price for it")
            return f"Price per unit of this lining, in {unit} ({where})."
        if c.attribute == "to_station" and self.items == "sub_areas":
            return ("Where the sub-area stops draining in, when it drains in along a range of stations; empty: it "
                    "enters at one station.")
        if c.attribute == "from_station" and self.items == "sub_areas":
            return "The station where the sub-area drains in (or starts to). A station as a distance along the road."
        if c.attribute in STATION_ATTRIBUTES:
            return "A station as a distance along the road, e.g. 180 for 0+180."
        if c.attribute == "section":
            return (f"{self.cell_text(c, row, item, item.section)}. Change the shape and its dimensions in the "
                    "project file; Add splits the chosen range in two.")
        if c.attribute == "key":
            name = self.cell_text(c, row, item, item.key)
            if item.d50 is not None:
                name += (f", stone size D50 {format_number(float(self.units.from_si('small_length', item.d50)))} "
                         f"{self.units.label('small_length')}")
            return name
        if c.attribute == "name":
            return item.name
        return ""

    # -- marks ------------------------------------------------------------------------------
    def clear_marks(self) -> None:
        self.marked.clear()
        self._paint()

    def mark(self, row: int, col: int, message: str) -> None:
        self.marked = {(row, col): message}
        self._paint()

    def _paint(self) -> None:
        t = self.table
        t.blockSignals(True)
        for i in range(t.rowCount()):
            for j in range(t.columnCount()):
                item = t.item(i, j)
                if item is not None:
                    item.setBackground(QColor("#fde8e8") if (i, j) in self.marked else QColor(0, 0, 0, 0))
        t.blockSignals(False)
        text = next(iter(self.marked.values()), "")
        self.message.setText(text)
        self.message.setVisible(bool(text))
        set_invalid(self.table, bool(text))

    def column_of(self, attribute: str) -> int:
        return next((j for j, c in enumerate(self.columns) if c.attribute == attribute), -1)

    # -- reading -----------------------------------------------------------------------------
    def _changed(self, item: QTableWidgetItem) -> None:
        row, col = item.row(), item.column()
        c = self.columns[col]
        path = item_path(self.items, row, c.attribute)
        try:
            value = self.read(c, row, item.text())
        except ValueError as exc:
            self.mark(row, col, str(exc))
            self.refused.emit(path, str(exc))
            return
        if (row, col) in self.marked:
            self.clear_marks()
        self.edited.emit(path, value, f"Change {self.describe(c, row)}")

    def describe(self, c: Column, row: int) -> str:
        item = getattr(self.run, self.items)[row]
        if hasattr(item, "name"):
            what = f"{ITEM_WORDS[self.items]} '{item.name}'"
        else:
            what = f"{ITEM_WORDS[self.items]} {row + 1}"
        return f"{c.heading.lower()} of {what}"

    def read(self, c: Column, row: int, text: str):
        """The SI value of ``text`` typed in column ``c`` of ``row``; ValueError with the reason in words."""
        where = self.describe(c, row)
        where = where[:1].upper() + where[1:]
        if not text.strip():
            if c.optional:
                return None
            raise ValueError(f"{where} is needed.")
        shown = typed_number(text, where)
        unit = ""
        if c.quantity == "cost":
            value, unit = self.cost_to_si(row, shown), f" {self.cost_unit(row)}"
        elif c.quantity:
            value, unit = float(self.units.to_si(c.quantity, shown)), f" {pretty(self.units.label(c.quantity))}"
        else:
            value = shown
        low, high = c.low, c.high
        if c.attribute in STATION_ATTRIBUTES:
            low, high = self.station_limits(c, row)
        if low is not None and (value < low or (value == low and not c.low_inclusive)):
            raise ValueError(f"{where} must be {'≥' if c.low_inclusive else '>'} {self.limit_text(c, row, low)}"
                             f"{unit}; {text.strip()} is outside.")
        if high is not None and value > high:
            raise ValueError(f"{where} must be ≤ {self.limit_text(c, row, high)}{unit}; {text.strip()} is outside.")
        return value

    def limit_text(self, c: Column, row: int, value: float) -> str:
        if c.quantity == "cost":
            return format_number(self.cost_from_si(row, value))
        return format_number(float(self.units.from_si(c.quantity, value))) if c.quantity else format_number(value)

    def station_limits(self, c: Column, row: int):
        """Allowed stations: a grade point between its neighbours (stations increase down the list), an entry
        within the run."""
        stations = [p.station for p in self.run.profile]
        if self.items != "profile":
            return min(stations), max(stations)
        low = stations[row - 1] if row > 0 else None
        high = stations[row + 1] if row + 1 < len(stations) else None
        return (low, high)


PROFILE_COLUMNS = (Column("station", "Station", "length"), Column("elevation", "Invert elevation", "length"))
CANDIDATE_COLUMNS = (Column("key", "Lining", editable=False),
                     Column("unit_cost", "Unit cost", "cost", low=0.0, optional=True),
                     Column("cost_unit", "per", editable=False))
SUB_AREA_COLUMNS = (Column("name", "Sub-area", editable=False),
                    Column("area", "Area", "drainage_area", low=0.0, low_inclusive=False),
                    Column("runoff_coefficient", "C", "", low=0.0, high=1.0),
                    Column("from_station", "From", "length"),
                    Column("to_station", "To", "length", optional=True))
SECTION_COLUMNS = (Column("from_station", "From", "length"), Column("to_station", "To", "length"),
                   Column("section", "Section", editable=False),
                   Column("ditch_depth", "Ditch depth", "length", low=0.0, low_inclusive=False, optional=True))
BEND_COLUMNS = (Column("from_station", "From", "length"), Column("to_station", "To", "length"),
                Column("radius", "Radius", "length", low=0.0, low_inclusive=False))
INFLOW_COLUMNS = (Column("name", "Inflow", editable=False), Column("station", "Station", "length"),
                  Column("flow", "Flow", "flow", low=0.0, low_inclusive=False))
#: Columns that take the room left; the others are as wide as their contents.
WIDE = ("key", "name", "section")
#: Columns holding a station: checked against the run's ends (a grade point's against its neighbours).
STATION_ATTRIBUTES = ("station", "from_station", "to_station")
#: One item of each list in words.
ITEM_WORDS = {"profile": "grade point", "candidates": "candidate", "sub_areas": "sub-area", "sections": "section",
              "bends": "bend", "point_inflows": "inflow"}
#: The button under a table whose items are edited whole in a dialog (app.gui.run_item_dialogs).
ITEM_DIALOG_BUTTONS = {"sub_areas": "Details…", "sections": "Edit…"}



class OutfallInput(QWidget):
    """What controls the water surface at the outfall: normal depth, critical depth (a free overfall) or a known
    water level, typed in the project's units and used only with that choice."""

    edited = Signal(str, object, str)    # control, water level (SI, or None), description
    refused = Signal(str, str)           # path, message

    def __init__(self, parent=None):
        super().__init__(parent)
        self.run = None
        self.units: UnitSystem | None = None
        self.control = QComboBox()
        self.control.setObjectName("outfallControl")
        # as narrow as the column needs: the longest choice would otherwise widen the whole panel past its view
        self.control.setSizeAdjustPolicy(QComboBox.SizeAdjustPolicy.AdjustToMinimumContentsLengthWithIcon)
        self.control.setMinimumContentsLength(10)
        for key in OUTFALL_CONTROLS:
            self.control.addItem(CONTROL_WORDS[key], key)
        self.control.setToolTip("What sets the water surface at the outfall; the subcritical stretches are "
                                "computed upstream from it.")
        self.level = LineEdit()
        self.level.setObjectName("outfallLevel")
        self.level.setToolTip("The water-surface elevation at the outfall, such as a culvert's headwater or a "
                              "receiving stream's level (used with the control 'water level').")
        self.level_label = QLabel("Water level")
        self.message = message_line()
        form = QFormLayout()
        form.setContentsMargins(0, 0, 0, 0)
        form.setSpacing(4)
        form.addRow("Control", self.control)
        form.addRow(self.level_label, self.level)
        lay = QVBoxLayout(self)
        lay.setContentsMargins(0, 0, 0, 0)
        lay.setSpacing(3)
        lay.addLayout(form)
        lay.addWidget(self.message)
        self.control.currentIndexChanged.connect(self._control_picked)
        self.level.editingFinished.connect(self._level_typed)

    @property
    def chosen(self) -> str:
        return self.control.currentData()

    def load(self, run, units: UnitSystem) -> None:
        """Show the outfall of ``run`` (SI) in ``units``; what was marked is cleared."""
        self.run, self.units = run, units
        out = run.outfall
        self.control.blockSignals(True)
        self.control.setCurrentIndex(OUTFALL_CONTROLS.index(out.control))
        self.control.blockSignals(False)
        self.level.setText("" if out.water_level is None else
                           format_number(round(float(units.from_si("length", out.water_level)), 3)))
        self.level_label.setText(f"Water level [{pretty(units.label('length'))}]")
        self.level.setEnabled(out.control == "level")
        self.mark("")

    def mark(self, message: str) -> None:
        self.message.setText(message)
        self.message.setVisible(bool(message))
        set_invalid(self.level, bool(message))

    def _control_picked(self, _index: int) -> None:
        self.level.setEnabled(self.chosen == "level")
        self._hand_on()

    def _level_typed(self) -> None:
        if self.chosen == "level" and self.level.isModified():
            self.level.setModified(False)
            self._hand_on()

    def _hand_on(self) -> None:
        control = self.chosen
        level = self.run.outfall.water_level          # kept, unused, with the other controls
        if control == "level":
            try:
                level = self.read(self.level.text())
            except ValueError as exc:
                self.mark(str(exc))
                self.refused.emit(OUTFALL_LEVEL_PATH, str(exc))
                return
        self.mark("")
        what = CONTROL_WORDS[control] if control != "level" else \
            f"water level {self.level.text().strip()} {pretty(self.units.label('length'))}"
        self.edited.emit(control, level, f"Set the outfall control of '{self.run.name}' to {what}")

    def outfall_invert(self) -> float:
        """The invert elevation at the outfall [m], from the run's grade points."""
        prof = sorted(self.run.profile, key=lambda p: p.station)
        return float(np.interp(self.run.outfall.station, [p.station for p in prof], [p.elevation for p in prof]))

    def read(self, text: str) -> float:
        """The outfall water level typed (SI); ValueError with the reason in words."""
        unit = pretty(self.units.label("length"))
        if not text.strip():
            raise ValueError("The outfall water level is needed: the control is a known water level.")
        shown = typed_number(text, "Outfall water level")
        value = float(self.units.to_si("length", shown))
        invert = self.outfall_invert()
        if value <= invert:
            raise ValueError(f"The outfall water level must be above the invert there, "
                             f"{format_number(round(float(self.units.from_si('length', invert)), 3))} {unit}; "
                             f"{text.strip()} is not.")
        return value


class RunSettings(QWidget):
    """Values of the run itself: design return period, largest spacing of design points, shortest stretch of
    one lining and minimum freeboard, typed in the project's units."""

    edited = Signal(str, object, str)    # path (a key of RUN_SETTINGS), SI value, description
    refused = Signal(str, str)           # path, message

    #: (path, label, lowest allowed, whether the lowest is allowed, tip)
    FIELDS = (("return_period", "Design storm", 0.0, False,
               "Return period of the design storm, in years; the project's rainfall relation must give it"),
              ("spacing", "Design points at most", 0.0, False,
               "Largest distance between design points; every grade break, section change, bend end and inflow is "
               "one too"),
              ("min_stretch", "Shortest lining stretch", 0.0, True, "A lining is not changed over a shorter length"),
              ("min_freeboard", "Minimum freeboard", 0.0, True, "Least height of the ditch above the water"))

    def __init__(self, parent=None):
        super().__init__(parent)
        self.run = None
        self.units: UnitSystem | None = None
        self.fields: dict[str, LineEdit] = {}
        self.labels: dict[str, QLabel] = {}
        form = QFormLayout()
        form.setContentsMargins(0, 0, 0, 0)
        form.setSpacing(4)
        for path, label, _low, _incl, tip in self.FIELDS:
            edit = LineEdit()
            edit.setObjectName(f"run_{path}")
            edit.setToolTip(tip)
            edit.editingFinished.connect(lambda p=path: self._typed(p))
            self.fields[path] = edit
            self.labels[path] = QLabel(label)
            form.addRow(self.labels[path], edit)
        self.message = message_line()
        lay = QVBoxLayout(self)
        lay.setContentsMargins(0, 0, 0, 0)
        lay.setSpacing(3)
        lay.addLayout(form)
        lay.addWidget(self.message)

    def unit(self, path: str) -> str:
        quantity = RUN_SETTINGS[path]
        return pretty(self.units.label(quantity)) if quantity else "years"

    def load(self, run, units: UnitSystem) -> None:
        """Show the values of ``run`` (SI) in ``units``; what was marked is cleared."""
        self.run, self.units = run, units
        for path, label, *_ in self.FIELDS:
            value = run_value(run, path)
            quantity = RUN_SETTINGS[path]
            shown = float(units.from_si(quantity, value)) if quantity else float(value)
            self.fields[path].setText(format_number(round(shown, 4)))
            self.fields[path].setModified(False)
            self.labels[path].setText(f"{label} [{self.unit(path)}]")
        self.mark("", "")

    def mark(self, path: str, message: str) -> None:
        for p, edit in self.fields.items():
            set_invalid(edit, bool(message) and p == path)
        self.message.setText(message)
        self.message.setVisible(bool(message))

    def _typed(self, path: str) -> None:
        edit = self.fields[path]
        if not edit.isModified() or self.run is None:
            return
        edit.setModified(False)
        try:
            value = self.read(path, edit.text())
        except ValueError as exc:
            self.mark(path, str(exc))
            self.refused.emit(path, str(exc))
            return
        self.mark("", "")
        label = next(f[1] for f in self.FIELDS if f[0] == path)
        self.edited.emit(path, value, f"Change {label.lower()} of '{self.run.name}' to {edit.text().strip()} "
                                      f"{self.unit(path)}")

    def read(self, path: str, text: str) -> float:
        """The SI value typed for ``path``; ValueError with the reason in words."""
        _p, label, low, inclusive, _tip = next(f for f in self.FIELDS if f[0] == path)
        if not text.strip():
            raise ValueError(f"{label} is needed.")
        shown = typed_number(text, label)
        if shown < low or (shown == low and not inclusive):
            raise ValueError(f"{label} must be {'≥' if inclusive else '>'} {format_number(low)} {self.unit(path)}; "
                             f"{text.strip()} is outside.")
        quantity = RUN_SETTINGS[path]
        return float(self.units.to_si(quantity, shown)) if quantity else float(shown)


class RunInputs(QScrollArea):
    """The runs of the project, and the editable lists of the one shown."""

    run_picked = Signal(int)
    run_asked = Signal(str)              # "new", "duplicate" or "delete" the run shown
    run_renamed = Signal(int, str)       # run, the name typed

    def __init__(self, parent=None):
        super().__init__(parent)
        self.setWidgetResizable(True)
        self.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        self.setFrameShape(QFrame.Shape.NoFrame)
        body = QWidget()
        body.setObjectName("inputBody")
        lay = QVBoxLayout(body)
        lay.setContentsMargins(10, 6, 10, 8)
        lay.setSpacing(8)
        heading = QLabel("Ditch runs in this project")
        heading.setObjectName("subheading")
        self.run_list = QListWidget()
        self.run_list.setObjectName("runs")
        self.run_list.setMaximumHeight(48)
        self.run_list.currentRowChanged.connect(lambda r: r >= 0 and self.run_picked.emit(r))
        self.run_list.setToolTip("Double-click a run (or F2) to rename it")
        self.run_list.setEditTriggers(QAbstractItemView.EditTrigger.DoubleClicked
                                      | QAbstractItemView.EditTrigger.EditKeyPressed)
        self.run_list.itemChanged.connect(lambda item: self.run_renamed.emit(self.run_list.row(item),
                                                                             item.text()))
        run_buttons = QHBoxLayout()
        run_buttons.setContentsMargins(0, 0, 0, 0)
        self.run_buttons = {}
        for key, text, tip in (("new", "New", "Add a new run at round starting values"),
                               ("duplicate", "Duplicate", "Add a copy of the run shown"),
                               ("delete", "Delete", "Delete the run shown (Undo brings it back)")):
            button = QPushButton(text)
            button.setObjectName(f"run_{key}")
            button.setToolTip(tip)
            button.clicked.connect(lambda _checked=False, k=key: self.run_asked.emit(k))
            run_buttons.addWidget(button)
            self.run_buttons[key] = button
        run_buttons.addStretch(1)
        self.summary = QLabel()
        self.summary.setObjectName("hint")
        self.summary.setWordWrap(True)
        lay.addWidget(heading)
        lay.addWidget(self.run_list)
        lay.addLayout(run_buttons)
        lay.addWidget(self.summary)
        self.profile = InputTable("profile", PROFILE_COLUMNS, "gradePoints")
        self.candidates = InputTable("candidates", CANDIDATE_COLUMNS, "candidates")
        self.sub_areas = InputTable("sub_areas", SUB_AREA_COLUMNS, "subAreas")
        self.inflows = InputTable("point_inflows", INFLOW_COLUMNS, "pointInflows")
        self.sections = InputTable("sections", SECTION_COLUMNS, "runSections")
        self.bends = InputTable("bends", BEND_COLUMNS, "bends")
        self.settings = RunSettings()
        self.outfall = OutfallInput()
        # a refused level's message is the last thing in the panel: scroll it into view
        self.outfall.refused.connect(lambda *_: QTimer.singleShot(
            0, lambda: self.ensureWidgetVisible(self.outfall.message)))
        for title, table, hint in (
                ("Grade points (invert profile)", self.profile, "Grade breaks along the run; the grade of each "
                                                                "stretch follows."),
                ("Candidate linings", self.candidates, "The linings the run may use; the cheapest stable one is "
                                                       "scheduled."),
                ("Sub-areas draining in", self.sub_areas, ""),
                ("Point inflows", self.inflows, "Flows typed as they enter, such as a pipe from upstream."),
                ("Sections", self.sections,
                 "The cross-section over each station range, with the depth of the ditch as built."),
                ("Bends", self.bends, "Bends of the ditch, by station range and centre-line radius."),
                ("Storm and design points", self.settings, ""),
                ("Outfall", self.outfall, "The downstream control of the water surface.")):
            box = QGroupBox(title)
            bl = QVBoxLayout(box)
            bl.setContentsMargins(8, 6, 8, 6)
            bl.setSpacing(4)
            if hint:
                h = QLabel(hint)
                h.setObjectName("hint")
                h.setWordWrap(True)
                bl.addWidget(h)
            bl.addWidget(table)
            lay.addWidget(box)
        lay.addStretch(1)
        self.setWidget(body)
        self.setMinimumWidth(290)

    def tables(self) -> tuple:
        return (self.profile, self.candidates, self.sub_areas, self.inflows, self.sections, self.bends)

    def fill_runs(self, names: list, current: int) -> None:
        self.run_list.blockSignals(True)
        self.run_list.clear()
        self.run_list.addItems(names)
        for i in range(self.run_list.count()):
            item = self.run_list.item(i)
            item.setFlags(item.flags() | Qt.ItemFlag.ItemIsEditable)
        self.run_list.setCurrentRow(current)
        self.run_list.blockSignals(False)
        self.run_buttons["duplicate"].setEnabled(bool(names))
        self.run_buttons["delete"].setEnabled(bool(names))

    def load(self, run, units: UnitSystem, catalogue) -> None:
        for t in self.tables():
            t.load(run, units, catalogue)
        self.settings.load(run, units)
        self.outfall.load(run, units)
        self.summary.setText(keep_units_whole(
            f"{format_station(run.profile[0].station, units)} to {format_station(run.profile[-1].station, units)}, "
            f"{run.return_period:g}-year storm, outfall: {run.outfall.kind or 'not described'} at "
            f"{format_station(run.outfall.station, units)}."))

    def table_for(self, items: str) -> InputTable:
        return next(t for t in self.tables() if t.items == items)


# -- the results beside ---------------------------------------------------------------------------------
class RunResultsPanel(QWidget):
    """The run's verdict, lining schedule with quantities and cost, the total, warnings, notes and the published
    values not yet verified; greyed while they are the last good ones."""

    def __init__(self, parent=None):
        super().__init__(parent)
        scroll = QScrollArea()
        scroll.setWidgetResizable(True)
        scroll.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        scroll.setFrameShape(QFrame.Shape.NoFrame)
        body = QWidget()
        body.setObjectName("resultsBody")
        lay = QVBoxLayout(body)
        lay.setContentsMargins(12, 10, 12, 10)
        lay.setSpacing(8)
        self.verdict = QFrame()
        self.verdict.setObjectName("verdict")
        vl = QVBoxLayout(self.verdict)
        vl.setContentsMargins(12, 8, 12, 8)
        self.headline = QLabel("—")
        self.headline.setObjectName("verdictHeadline")
        self.reason = QLabel()
        self.reason.setObjectName("verdictReason")
        self.reason.setWordWrap(True)
        vl.addWidget(self.headline)
        vl.addWidget(self.reason)
        lay.addWidget(self.verdict)
        self.stale = QLabel()
        self.stale.setObjectName("staleNote")
        self.stale.setWordWrap(True)
        self.stale.hide()
        lay.addWidget(self.stale)
        self.body_widgets = []

        def section(title: str, name: str) -> QLabel:
            head = QLabel(title)
            head.setObjectName("subheading")
            text = QLabel()
            text.setObjectName(name)
            text.setWordWrap(True)
            text.setTextFormat(Qt.TextFormat.RichText)
            text.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
            lay.addWidget(head)
            lay.addWidget(text)
            self.body_widgets.append(text)
            return head, text

        _, self.schedule = section("Lining schedule", "schedule")
        self.schedule.setObjectName("numbers")
        _, self.surface = section("Water surface: controls and jumps", "surface")
        _, self.warnings = section("Cautions for this run", "warnings")
        _, self.notes = section("Method", "runNotes")
        self.unverified_heading, self.unverified = section(f"{NOT_VERIFIED_TITLE} ({NOT_VERIFIED_MARK})",
                                                           "unverified")
        self.unverified_heading.setToolTip("Values recalled from the publication and not yet read in it; the sheet "
                                           "lists them too. Check each before relying on the result.")
        lay.addStretch(1)
        scroll.setWidget(body)
        self.caution = QLabel(CAUTION)
        self.caution.setObjectName("caution")
        self.caution.setWordWrap(True)
        outer = QVBoxLayout(self)
        outer.setContentsMargins(0, 0, 0, 8)
        outer.setSpacing(6)
        outer.addWidget(scroll, 1)
        cl = QVBoxLayout()
        cl.setContentsMargins(12, 0, 12, 0)
        cl.addWidget(self.caution)
        outer.addLayout(cl)
        self.setMinimumWidth(270)

    def set_verdict(self, status: str, headline: str, reason: str) -> None:
        self.verdict.setProperty("status", status)
        for w in (self.verdict, self.headline, self.reason):
            w.style().unpolish(w)
            w.style().polish(w)
        self.headline.setText(headline)
        self.reason.setText(keep_units_whole(reason))

    def show_design(self, summary: RunSummary | None, problem: str = "") -> None:
        """Show ``summary`` (:func:`app.run_summary.run_summary` of the run; the last good one when ``problem``
        says why the present inputs have none)."""
        if problem:
            self.set_verdict("none", "No result for these inputs", problem)
            self.stale.setText("Showing the last good result, greyed, until the inputs are usable again."
                               if summary is not None else "No result yet.")
            self.stale.show()
        else:
            self.stale.hide()
        for w in self.body_widgets:
            w.setEnabled(not problem)
        if summary is None:
            for w in self.body_widgets:
                w.setText("")
            return
        if not problem:
            self.set_verdict(summary.verdict.status, summary.headline, summary.reason)
        L = pretty(summary.length_unit)
        items = []
        for s in summary.stretches:
            qty = "".join(f"<br>&nbsp;&nbsp;{_escape(item)}: {amount}&nbsp;{pretty(unit)}"
                          for item, amount, unit in s["quantities"])
            items.append(f"<p style='margin:0 0 6px 0'><b>{s['from_station']} to {s['to_station']}</b>, "
                         f"{s['length']}&nbsp;{L}<br>{_escape(s['lining'])}{qty}<br>cost <b>{nbsp(s['cost'])}</b></p>")
        items.append(f"<p style='margin:2px 0 0 0'><b>Total cost {nbsp(summary.total_cost)}</b></p>")
        self.schedule.setText("".join(items))
        self.surface.setText(bullets([*summary.controls, *(f"Hydraulic jump {j}" for j in summary.jumps)]))
        self.warnings.setText(bullets(list(summary.warnings)) or "None from the checks made.")
        self.notes.setText(bullets(list(summary.notes)))
        self.unverified.setText(bullets(list(summary.not_verified)))
        self.unverified.setVisible(bool(summary.not_verified))
        self.unverified_heading.setVisible(bool(summary.not_verified))


def nbsp(text: str) -> str:
    """``text`` kept on one line ("$ 12,345")."""
    return text.replace(" ", "\u00a0")


def bullets(lines: list) -> str:
    """Sentences as a list, each with a capital and a full stop, its units as people write them (as the sheet)."""
    if not lines:
        return ""
    items = "".join(f"<li>{_escape(sentence(pretty(w[:1].upper() + w[1:])))}</li>" for w in lines)
    return f"<ul style='margin-left:-24px'>{items}</ul>"


# -- the view ---------------------------------------------------------------------------------------------
_ITEM = re.compile(r"(" + "|".join(RUN_ITEMS) + r")\[(\d+)\]\.([a-z_]+)")


class RunView(QWidget):
    """Inputs | profile over station table | schedule and cautions, for one run of the document's project."""

    status_message = Signal(str)
    open_channel = Signal(str)     # the name of a channel just opened from a station
    rainfall_asked = Signal()      # the rainfall (IDF) button: the project's rainfall keeps the run from a result

    def __init__(self, doc: ProjectDocument, open_action: QAction | None = None, can_draw=lambda: True, parent=None):
        """``open_action``: the window's action that opens the selected station as a channel (made here when
        none is given); ``can_draw``: whether matplotlib may draw now."""
        super().__init__(parent)
        self.doc = doc
        self.can_draw = can_draw
        self.current = 0
        self.design: RunDesign | None = None        # the result of the inputs as they are, or None
        self.last_good: RunDesign | None = None
        self.values: list[dict] = []                 # station_values of what is shown
        self.problem = ""                            # why the inputs as they are have no result
        self.refusals: dict[str, str] = {}           # path -> message, entries refused in the tables
        self.worker = Recomputer(self._prepare, self)   # solves the newest inputs off the window's thread
        self.worker.succeeded.connect(self._solved)
        self.worker.failed.connect(self._not_solved)
        self._dirty_picture = True

        self.inputs = RunInputs()
        self.inputs.run_picked.connect(self.pick_run)
        for t in self.inputs.tables():
            t.edited.connect(self._edited)
            t.refused.connect(self._refused)
            t.add_asked.connect(self.add_item)
            t.remove_asked.connect(self.remove_item)
            t.item_asked.connect(self.edit_item)
        self.inputs.settings.edited.connect(self._edited)
        self.inputs.settings.refused.connect(self._refused)
        self.inputs.run_asked.connect(self._run_asked)
        self.inputs.run_renamed.connect(self.rename_run)
        self.inputs.outfall.edited.connect(self._outfall_edited)
        self.inputs.outfall.refused.connect(self._refused)

        self.picture = ProfilePicture()
        self.picture.canvas.setMinimumHeight(170)   # with the table below, fits a 1024x640 screen at 150 %
        self.picture.canvas.mpl_connect("button_press_event", self._profile_clicked)
        self.table = QTableView()
        self.table.setObjectName("stationTable")
        self.model = StationTableModel(self)
        self.table.setModel(self.model)
        self.table.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.table.setSelectionMode(QAbstractItemView.SelectionMode.SingleSelection)
        self.table.setAlternatingRowColors(False)
        self.table.verticalHeader().setDefaultSectionSize(22)
        self.table.horizontalHeader().setDefaultAlignment(Qt.AlignmentFlag.AlignCenter)
        self.table.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Interactive)
        self.table.setWordWrap(False)
        self.table.setContextMenuPolicy(Qt.ContextMenuPolicy.CustomContextMenu)
        self.table.customContextMenuRequested.connect(self._table_menu)
        self.table.selectionModel().currentRowChanged.connect(self._row_picked)
        self.table.doubleClicked.connect(lambda _i: None)

        if open_action is None:
            open_action = QAction("&Open station as a channel", self)
            open_action.setShortcut(QKeySequence(OPEN_STATION_KEY))
            open_action.triggered.connect(self.open_selected_station)
            self.addAction(open_action)
        self.open_action = open_action
        self.open_button = QPushButton("Open as a channel")
        self.open_button.setToolTip(f"Open the station chosen in the table as a channel ({OPEN_STATION_KEY})")
        self.open_button.setObjectName("openStation")
        self.open_button.clicked.connect(self.open_selected_station)
        self.busy = QLabel()
        self.busy.setObjectName("hint")
        table_head = QLabel("Stations")
        table_head.setObjectName("subheading")
        row = QHBoxLayout()
        row.setContentsMargins(8, 2, 8, 0)
        row.addWidget(table_head)
        row.addWidget(self.busy, 1)
        row.addWidget(self.open_button)
        lower = QWidget()
        ll = QVBoxLayout(lower)
        ll.setContentsMargins(0, 0, 0, 0)
        ll.setSpacing(3)
        ll.addLayout(row)
        ll.addWidget(self.table, 1)
        self.middle = QSplitter(Qt.Orientation.Vertical)
        self.middle.setObjectName("runMiddle")
        self.middle.addWidget(self.picture.canvas)
        self.middle.addWidget(lower)
        self.middle.setStretchFactor(0, 5)
        self.middle.setStretchFactor(1, 4)
        self.middle.setChildrenCollapsible(False)
        self.middle.setSizes([560, 340])     # the profile the larger part, more so on a low screen
        lower.setMinimumHeight(110)

        self.results = RunResultsPanel()
        self.rainfall_button = QPushButton("Rainfall (IDF)…")     # shown while the rainfall is what is wrong
        self.rainfall_button.setObjectName("editRainfall")
        self.rainfall_button.hide()
        self.rainfall_button.clicked.connect(self.rainfall_asked)
        self.results.verdict.layout().addWidget(self.rainfall_button, 0, Qt.AlignmentFlag.AlignLeft)
        self.splitter = QSplitter(Qt.Orientation.Horizontal)
        self.splitter.setObjectName("runSplitter")
        self.splitter.addWidget(self.inputs)
        self.splitter.addWidget(self.middle)
        self.splitter.addWidget(self.results)
        self.splitter.setStretchFactor(0, 0)
        self.splitter.setStretchFactor(1, 1)
        self.splitter.setStretchFactor(2, 0)
        self.splitter.setSizes([380, 740, 320])
        self.splitter.setChildrenCollapsible(False)
        # below TWO_COLUMNS_BELOW the inputs and the results as tabs on the left, as in the channel page
        self.side_tabs = SideTabs(self.splitter, self.inputs, self.results, wide=(0.26, 0.52), name="runSideTabs")
        lay = QVBoxLayout(self)
        lay.setContentsMargins(0, 0, 0, 0)
        lay.addWidget(self.splitter)
        self.setFocusProxy(self.table)
        self.picture.canvas.mpl_connect("resize_event", lambda _e: self._redraw_if_shown())

        doc.reset.connect(self.reload)
        doc.units_changed.connect(self._units_changed)
        doc.run_changed.connect(self._run_changed)
        doc.runs_changed.connect(self.show_run)
        doc.project_changed.connect(self.compute)      # the project's rainfall feeds every run
        self.reload()

    # -- which run --------------------------------------------------------------------------
    @property
    def run(self):
        runs = self.doc.project.runs
        return runs[self.current] if 0 <= self.current < len(runs) else None

    def reload(self, *_signal_args) -> None:
        """Another project (or a first look): start again from the document."""
        self.current = min(self.current, max(len(self.doc.project.runs) - 1, 0))
        self.design = self.last_good = None
        self.values, self.problem = [], ""
        self.refusals.clear()
        self.inputs.fill_runs([r.name for r in self.doc.project.runs], self.current)
        self._load_inputs()
        self.compute()

    def pick_run(self, index: int) -> None:
        if index != self.current and 0 <= index < len(self.doc.project.runs):
            self.current = index
            self.design = self.last_good = None
            self.refusals.clear()
            self._load_inputs()
            self.compute()

    def _load_inputs(self) -> None:
        if self.run is not None:
            self.inputs.load(self.run, self.doc.units, self.doc.context.catalogue)

    def _run_changed(self, index: int) -> None:
        names = [r.name for r in self.doc.project.runs]
        shown = [self.inputs.run_list.item(i).text() for i in range(self.inputs.run_list.count())]
        if index != self.current or shown != names:    # another run, or a name changed (a rename undone)
            self.current = index
            self.inputs.fill_runs(names, index)
        self.refusals.clear()
        self._load_inputs()
        self.compute()

    def show_run(self, index: int) -> None:
        """Show run ``index`` afresh (runs were added or removed)."""
        self.current = index
        self.reload()

    def _units_changed(self) -> None:
        self._load_inputs()
        self.show_result()

    # -- edits ------------------------------------------------------------------------------------
    def _edited(self, path: str, value, text: str) -> None:
        run = self.run
        self.refusals.pop(path, None)
        if run_value(run, path) == value:
            self.show_result()
            return
        self.doc.edit_run(self.current, with_run_value(run, path, value), text)

    def _outfall_edited(self, control: str, level, text: str) -> None:
        run = self.run
        self.refusals.pop(OUTFALL_LEVEL_PATH, None)
        if (run.outfall.control, run.outfall.water_level) == (control, level):
            self.show_result()
            return
        self.doc.edit_run(self.current, with_outfall_control(run, control, level), text)

    def add_item(self, items: str, after: int) -> None:
        """Add an item to list ``items`` of the run after row ``after`` (the last when -1), one undoable step; a
        candidate lining is chosen from the catalogue in a menu first."""
        run = self.run
        if items == "candidates":
            self._candidate_menu(after)
            return
        new = with_item_added(run, items, None if after < 0 else after, self.doc.project.units)
        self.doc.edit_run(self.current, new, f"Add a {ITEM_WORDS[items]} to '{run.name}'")

    def candidate_choices(self) -> list:
        """The catalogue as the lining list shows it: (kind heading, [(key, name)]) in the project's units."""
        return lining_groups(self.doc.context, decimal_mark=number_marks()[0])

    def _candidate_menu(self, after: int) -> None:
        present = {c.key for c in self.run.candidates}
        menu = QMenu(self)
        for heading, entries in self.candidate_choices():
            menu.addSection(heading)
            for key, label in entries:
                action = menu.addAction(label)
                action.setEnabled(key not in present)
                action.triggered.connect(lambda _checked=False, k=key: self.add_candidate(k, after))
        button = self.inputs.candidates.add_button
        menu.setAttribute(Qt.WidgetAttribute.WA_DeleteOnClose)
        self.candidate_menu = menu             # open, not modal: chosen or closed, it goes
        menu.popup(button.mapToGlobal(button.rect().bottomLeft()))

    def add_candidate(self, key: str, after: int = -1) -> None:
        """Add catalogue lining ``key`` to the run's candidates (its unit cost the catalogue's until typed)."""
        run = self.run
        try:
            new = with_item_added(run, "candidates", None if after < 0 else after, item=RunCandidate(key))
        except ValueError as exc:
            self.inputs.candidates.say(str(exc))
            return
        name = self.doc.context.catalogue.get(key).name
        self.doc.edit_run(self.current, new, f"Add the candidate lining '{name}' to '{run.name}'")

    def item_dialog(self, items: str, row: int):
        """The dialog that edits item ``row`` of ``items`` (a sub-area or a section range) as a whole."""
        item, units = getattr(self.run, items)[row], self.doc.units
        return (SubAreaDialog if items == "sub_areas" else SectionDialog)(item, units, self)

    def edit_item(self, items: str, row: int) -> None:
        """Edit item ``row`` of ``items`` in its dialog; OK is one undoable edit."""
        run = self.run
        dialog = self.item_dialog(items, row)
        if dialog.exec() == QDialog.DialogCode.Accepted and dialog.result() != getattr(run, items)[row]:
            what = f"sub-area '{run.sub_areas[row].name}'" if items == "sub_areas" else f"section {row + 1}"
            self.doc.edit_run(self.current, with_item_replaced(run, items, row, dialog.result()),
                              f"Edit {what} of '{run.name}'")
        dialog.deleteLater()

    def remove_item(self, items: str, row: int) -> None:
        """Delete item ``row`` of list ``items`` (one undoable step), or say why the run needs it."""
        run = self.run
        try:
            new = with_item_removed(run, items, row)
        except ValueError as exc:
            self.inputs.table_for(items).say(str(exc))
            return
        item = getattr(run, items)[row]
        what = (f"'{item.name}'" if hasattr(item, "name") else
                f"'{self.doc.context.catalogue.get(item.key).name}'" if items == "candidates" and
                item.key in self.doc.context.catalogue else str(row + 1))
        self.doc.edit_run(self.current, new, f"Delete {ITEM_WORDS[items]} {what} of '{run.name}'")

    def _run_asked(self, what: str) -> None:
        if what == "new":
            self.new_run()
        elif what == "duplicate" and self.run is not None:
            self.doc.add_runs([self.run], f"Duplicate run '{self.run.name}'")
        elif what == "delete" and self.run is not None:
            self.doc.remove_run(self.current)

    def new_run(self) -> None:
        """Add a run at round starting values, with the candidates of the run shown (one undoable step)."""
        run = starting_run(self.doc.project, self.doc.context.catalogue, self.run)
        self.doc.add_runs([run], f"Add run '{run.name}'")

    def rename_run(self, index: int, name: str) -> None:
        refused = self.doc.rename_run(index, name)
        if refused:
            self.status_message.emit(refused)
            self.inputs.fill_runs([r.name for r in self.doc.project.runs], self.current)

    def _refused(self, path: str, message: str) -> None:
        self.refusals[path] = message
        self.show_result()

    # -- computing --------------------------------------------------------------------------------
    def compute(self) -> None:
        """Solve the run as it is in the document, in a worker thread; only the newest inputs' result is shown."""
        self.worker.request()      # also with no run left: a result still on its way is then dropped
        if self.run is None:
            self.show_result()
        else:
            self.busy.setText("computing…")

    def _prepare(self):
        """The work that solves the shown run as it is now, on a copy of the project (in the worker)."""
        project = copy.deepcopy(self.doc.project)
        index = self.current
        catalogue = self.doc.context.catalogue
        if not 0 <= index < len(project.runs):
            return lambda: None
        return lambda: design_run(project, project.runs[index], catalogue)

    def _solved(self, design: RunDesign | None) -> None:
        self.busy.setText("")
        if design is None:     # no run to solve
            return
        self.design = self.last_good = design
        self.problem = ""
        self.rainfall_button.hide()
        self.show_result()

    def _not_solved(self, exc: BaseException) -> None:
        self.busy.setText("")
        if not isinstance(exc, (hy.InputError, hy.NoSolutionError, hy.ConvergenceError)):
            self.problem = f"The run could not be computed: {type(exc).__name__}: {exc}"
        else:
            said = pretty(exc.in_units(self.doc.units))
            self.problem = sentence(said) if isinstance(exc, hy.InputError) else sentence(f"No solution: {said}")
        self.design = None
        where = getattr(exc, "field", "") or ""
        m = _ITEM.search(where)
        if isinstance(exc, hy.InputError) and where.startswith("outfall"):
            self.inputs.outfall.mark(self.problem)
        setting = where.rsplit(": ", 1)[-1]
        self.rainfall_button.setVisible(setting.split(".")[0] in ("rainfall", "return_period"))
        if isinstance(exc, hy.InputError) and setting in RUN_SETTINGS:
            self.inputs.settings.mark(setting, self.problem)
        if m is not None and isinstance(exc, hy.InputError):
            table = self.inputs.table_for(m.group(1))
            col = table.column_of(m.group(3))
            if col >= 0:
                table.mark(int(m.group(2)), col, self.problem)
        self.show_result()

    @property
    def idle(self) -> bool:
        """No computation running or due (tests wait for this)."""
        return self.worker.idle

    def stop(self) -> None:
        """Let a running computation end (the window is closing)."""
        self.worker.wait()

    # -- showing ----------------------------------------------------------------------------------
    @property
    def complaint(self) -> str:
        """Why what is shown is not the result of the inputs as typed ("" when it is)."""
        return next(iter(self.refusals.values()), "") or self.problem

    def show_result(self) -> None:
        shown = self.design if not self.complaint else self.last_good
        units = self.doc.units
        stale = bool(self.complaint)
        if shown is None:
            self.values = []
            self.model.set_rows([], [], units, {})
            self.results.show_design(None, self.complaint or ("This project has no ditch runs."
                                                                          if self.run is None else ""))
            if self.run is not None and not self.complaint:
                self.results.set_verdict("none", "Computing…", "The run is being solved.")
            self.side_tabs.show_verdict()
            self.open_button.setEnabled(False)
            self._dirty_picture = True
            self._draw()
            return
        rows = shown.station_rows(units)
        self.values = shown.station_values(units)
        names = {s["lining"]: s["lining_name"] for s in shown.schedule_values(units)}
        summary = run_summary(shown, units)
        selected = self.selected_row()
        self.model.set_rows(rows, summary.stations, units, names)
        self.model.set_stale(stale)
        self._size_columns()
        if selected is not None and selected < len(rows):
            self.table.selectRow(selected)
        self.results.show_design(summary, self.complaint)
        self.side_tabs.show_verdict()
        self.open_button.setEnabled(not stale)
        self._dirty_picture = True
        self._draw()

    def _size_columns(self) -> None:
        h = self.table.horizontalHeader()
        self.table.resizeColumnsToContents()
        for j, key in enumerate(STATION_COLUMNS):
            if key in ("lining", "dimensions"):
                h.resizeSection(j, min(h.sectionSize(j), 220))

    def resizeEvent(self, event) -> None:
        super().resizeEvent(event)
        self.side_tabs.follow(self.width())

    def _redraw_if_shown(self) -> None:
        if self.picture.model is not None and self.isVisible():
            self._dirty_picture = True
            self._draw()

    def showEvent(self, event) -> None:
        super().showEvent(event)
        self._draw()

    def _draw(self) -> None:
        """Redraw the profile when it is in view and matplotlib is free (a sheet export draws in its thread)."""
        if not self._dirty_picture or not self.isVisible() or not self.can_draw():
            return
        self._dirty_picture = False
        shown = self.design if not self.complaint else self.last_good
        if shown is not None:
            self.picture.update(profile_model(shown, self.doc.units))
            self._mark_selected()
            if self.complaint:
                self.picture.fade(True, "Last good result: " + ("fix the marked input" if self.refusals
                                                                else "no result for these inputs"))
        elif self.picture.model is not None:
            self.picture.fade(True, "No result for these inputs")
        self.picture.canvas.draw_idle()

    def redraw(self) -> None:
        """Draw what waited for a sheet export."""
        self._dirty_picture = True
        self._draw()

    # -- stations -------------------------------------------------------------------------------------
    def selected_row(self) -> int | None:
        index = self.table.selectionModel().currentIndex()
        return index.row() if index.isValid() else None

    def _row_picked(self, current, _previous) -> None:
        self._mark_selected()
        self.picture.canvas.draw_idle()

    def _mark_selected(self) -> None:
        row = self.selected_row()
        if row is None or row >= len(self.values):
            self.picture.show_station(None)
        else:
            self.picture.show_station(self.values[row]["station"], self.model.text(row, "station"))

    def _profile_clicked(self, event) -> None:
        """A click on the profile picks the nearest design point in the table."""
        if event.inaxes is not self.picture.ax or event.xdata is None or not self.values:
            return
        row = min(range(len(self.values)), key=lambda i: abs(self.values[i]["station"] - event.xdata))
        self.table.selectRow(row)
        self.table.scrollTo(self.model.index(row, 0))

    def _table_menu(self, pos) -> None:
        index = self.table.indexAt(pos)
        if not index.isValid():
            return
        self.table.selectRow(index.row())
        menu = QMenu(self)
        menu.addAction(self.open_action)
        menu.exec(self.table.viewport().mapToGlobal(pos))
        menu.removeAction(self.open_action)
        menu.deleteLater()

    def open_selected_station(self) -> str | None:
        """Add the selected station as a channel of the project (one undoable step); returns its name."""
        row = self.selected_row()
        if row is None:
            self.status_message.emit("Choose a station in the table first.")
            return None
        return self.open_station(row)

    def open_station(self, row: int) -> str | None:
        design = self.design
        if not self.idle:
            self.status_message.emit("The run is still being computed; open the station when it is done.")
            return None
        if design is None or self.complaint:
            self.status_message.emit("The run has no result for its inputs as they are; fix the marked input first.")
            return None
        units = self.doc.units
        where = self.model.text(row, "station")
        try:
            channel = station_channel(design, row, f"{design.run.name} at {where}", units)
        except StationNotOpenable as exc:
            self.status_message.emit(str(exc))
            return None
        name = self.doc.add_channel_from(channel, f"Open station {where} of '{design.run.name}' as a channel")
        self.status_message.emit(f"Opened station {where} as the channel '{name}'. Undo removes it again.")
        self.open_channel.emit(name)
        return name


__all__ = ["RunView", "StationTableModel", "RunInputs", "RunResultsPanel", "STATION_COLUMNS", "column_heading"]
