"""Check a ditch inventory from the window: every reach of a CSV, as a table to filter, sort and import from.

The check itself is :func:`app.inventory.run_inventory` (the vectorised core); it
runs in a worker thread (:class:`~app.gui.tasks.Task`), so a long inventory
shows its progress and the window stays usable. The table is a model over
the rows of :meth:`app.inventory.BatchRun.table`, with the file's line numbers
down the side; the filters are :meth:`app.inventory.BatchRun.select`. Chosen
reaches become channels of the project in one undoable step
(:meth:`app.gui.document.ProjectDocument.add_channels`).
"""

from __future__ import annotations

import csv
import math
from pathlib import Path

import numpy as np
from PySide6.QtCore import QAbstractTableModel, QModelIndex, Qt, QTimer, Signal
from PySide6.QtGui import QColor, QFontDatabase, QGuiApplication
from PySide6.QtWidgets import (QAbstractItemView, QCheckBox, QComboBox, QDialog, QFileDialog, QGridLayout,
                               QHBoxLayout, QInputDialog, QLabel, QLineEdit, QMessageBox, QPlainTextEdit,
                               QProgressBar, QPushButton, QTableView, QTabWidget, QVBoxLayout, QWidget)

from .. import inventory as ai
from ..files import tsv_cell
from ..results import INVENTORY_WORDS, MEASURED_LENGTH, rounded, table_field
from ..verdicts import Verdict
from ..inventory import InventoryError
from hydraulics import many_reaches as mr
from hydraulics import units as hu

from . import settings
from .fields import pretty, sentence
from .screen_fit import fit_to_screen, scrolling
from .style import STYLE
from .tasks import Cancelled, Task

CSV_FILTER = "Inventories (*.csv);;All files (*)"
#: What the check opens: a CSV file or a GeoPackage layer of lines.
OPEN_FILTER = "Inventories (*.csv *.gpkg);;CSV files (*.csv);;GeoPackages (*.gpkg);;All files (*)"
UNIT_CHOICES = (("us", "US customary (ft, ft³/s)"), ("si", "SI (m, m³/s)"))
#: Verdicts in words for the filter boxes: the words of the one vocabulary (the file keeps the tokens).
VERDICT_WORDS = {token: Verdict.from_token(token).words for token in mr.VERDICTS}
#: Background and text colour of the verdict cell; the word is always there as well.
VERDICT_COLOURS = {
    "stable": ("#e7f4ea", "#1e5a22"), "unstable": ("#fbeaea", "#8c1d16"), "non-erodible": ("#eef0f2", "#3b444c"),
    "hydraulics-only": ("#eef0f2", "#3b444c"), "not-checked": ("#fff6e0", "#6e4e08"),
    "no-solution": ("#f3e8f7", "#5b2270"), "invalid": ("#f3e8f7", "#5b2270"),
}
#: Columns shown first, in this order (the rest follow in the file's order; the reason comes last).
LEADING = ("id", "verdict", "safety_factor", "bed_shear", "permissible_shear", "normal_depth", "critical_depth",
           "velocity", "froude")
#: Above this many, importing asks first (a project of thousands of channels is slow to work in).
IMPORT_ASK_ABOVE = 100
ANY_WARNING = "__any__"
#: Above this many reaches the text filter waits for a pause in the typing.
TYPE_AHEAD_ROWS = 50_000


def _quantity(column: str) -> str | None:
    return mr.RESULT_FIELDS.get(column) or mr.NUMERIC_FIELDS.get(column)


def column_title(column: str, units: hu.UnitSystem) -> str:
    """The header of a column: what it holds in words, with the unit where it has one (an extra column of the
    file keeps its own name)."""
    q = _quantity(column)
    label = pretty(units.label(q)) if q and q not in ("ratio", "manning_n") else ""
    words = INVENTORY_WORDS.get(column, column)
    return f"{words}\n({label})" if label else words


class SortableRows(QAbstractTableModel):
    """A read-only table with a chosen subset of its rows shown, sortable on any column.

    Subclasses give the text of a cell (:meth:`text`) and the sort keys of a
    column over all rows (:meth:`keys`: floats with nan for blank, or text).
    ``order`` maps shown columns to the subclass's columns; ``shown`` holds the
    indices of the rows in view, in view order. Numbers sort as numbers with
    blanks last either way, text sorts as text.
    """

    def __init__(self, parent=None):
        super().__init__(parent)
        self.columns: list[str] = []
        self.titles: list[str] = []
        self.order: list[int] = []
        self.lines = np.zeros(0, dtype=np.int64)
        self.shown = np.zeros(0, dtype=np.int64)
        self._keys: dict[int, np.ndarray] = {}
        self._sorted: tuple[int, Qt.SortOrder] | None = None

    # -- for subclasses ----------------------------------------------------------------------
    def text(self, i: int, c: int) -> str:
        raise NotImplementedError

    def keys(self, c: int) -> np.ndarray:
        raise NotImplementedError

    def verdict(self, i: int) -> str:
        return ""

    #: What a row's number is (``Inventory.row_word``): a line of a CSV file, a feature of a GeoPackage layer.
    row_word = "line"

    def _reset(self, columns, titles, order, lines) -> None:
        self.columns = list(columns)
        self.titles = list(titles or columns)
        self.order = list(order) if order is not None else list(range(len(self.columns)))
        self.lines = np.asarray(lines, dtype=np.int64)
        self.shown = np.arange(len(self.lines), dtype=np.int64)
        self._keys.clear()
        self._sorted = None

    # -- Qt model -------------------------------------------------------------------------
    def rowCount(self, parent=QModelIndex()):
        return 0 if parent.isValid() else len(self.shown)

    def columnCount(self, parent=QModelIndex()):
        return 0 if parent.isValid() else len(self.order)

    def cell(self, row: int, column: int) -> str:
        """The text in view row ``row``, view column ``column``."""
        return self.text(int(self.shown[row]), self.order[column])

    def data(self, index, role=Qt.ItemDataRole.DisplayRole):
        if not index.isValid():
            return None
        r, c = index.row(), index.column()
        name = self.columns[self.order[c]]
        if role == Qt.ItemDataRole.DisplayRole:
            return pretty(self.cell(r, c)) if name == "reason" else self.cell(r, c)
        if role == Qt.ItemDataRole.ToolTipRole and name == "reason":
            return pretty(self.cell(r, c)) or None
        if role == Qt.ItemDataRole.TextAlignmentRole and self.numeric(self.order[c]):
            return int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        if name == "verdict" and role in (Qt.ItemDataRole.BackgroundRole, Qt.ItemDataRole.ForegroundRole):
            colours = VERDICT_COLOURS.get(self.verdict(int(self.shown[r])))
            if colours:
                return QColor(colours[0] if role == Qt.ItemDataRole.BackgroundRole else colours[1])
        return None

    def headerData(self, section, orientation, role=Qt.ItemDataRole.DisplayRole):
        if orientation == Qt.Orientation.Horizontal:
            if role == Qt.ItemDataRole.DisplayRole and 0 <= section < len(self.order):
                return self.titles[self.order[section]]
            return None
        if role == Qt.ItemDataRole.DisplayRole:
            return str(int(self.lines[self.shown[section]])) if 0 <= section < len(self.shown) else None
        if role == Qt.ItemDataRole.ToolTipRole:
            return "line in the file" if self.row_word == "line" else "feature id in the layer"
        return None

    def numeric(self, c: int) -> bool:
        """Whether column ``c`` holds numbers (shown right-aligned)."""
        return _numeric(self.columns[c])

    # -- filtering and sorting ---------------------------------------------------------------
    def show_rows(self, indices) -> None:
        """Show the rows ``indices`` (file order), sorted as the view is sorted."""
        self.beginResetModel()
        self.shown = np.asarray(indices, dtype=np.int64)
        if self._sorted is not None:
            self.shown = self._sort(self.shown, *self._sorted)
        self.endResetModel()

    def sort(self, column, order=Qt.SortOrder.AscendingOrder):
        if not 0 <= column < len(self.order):
            return
        self.layoutAboutToBeChanged.emit()
        self._sorted = (column, order)
        self.shown = self._sort(self.shown, column, order)
        self.layoutChanged.emit()

    def _sort(self, shown, column, order):
        c = self.order[column]
        if c not in self._keys:
            self._keys[c] = self.keys(c)
        key = self._keys[c][shown]
        descending = order == Qt.SortOrder.DescendingOrder
        if key.dtype.kind != "f":
            pos = np.argsort(key, kind="stable")
            return shown[pos[::-1]] if descending else shown[pos]
        blank = np.isnan(key)
        filled = np.flatnonzero(~blank)
        ranked = filled[np.argsort(-key[filled] if descending else key[filled], kind="stable")]
        return shown[np.concatenate([ranked, np.flatnonzero(blank)])]  # blanks last either way

    def source_rows(self, view_rows) -> list[int]:
        """Row indices (file order) of rows in view."""
        return sorted(int(self.shown[r]) for r in view_rows)


def _numeric(column: str) -> bool:
    return _quantity(column) is not None or column in ("line", "feature")


class ReachesModel(SortableRows):
    """Every reach of a :class:`app.inventory.BatchRun`: the input columns as written, then the results.

    Cells are made when Qt asks for them (an input row is split only when it
    is shown; result numbers are rounded by the one rule of :mod:`app.results`,
    as the results panel shows them), so a 100,000-reach inventory costs little
    more than the run itself. The row headings give the file's line and the
    reach's id, so the id stays in view while the columns scroll.
    """

    def __init__(self, parent=None):
        super().__init__(parent)
        self.run: ai.BatchRun | None = None
        self._values: dict = {}
        self._fields: dict[int, list] = {}
        self._width = 0
        self._measured: int | None = None    # the column of lengths the program measured, if any

    def load(self, run: ai.BatchRun, order_names=LEADING) -> None:
        self.beginResetModel()
        inv = run.inventory
        self.run = run
        self._width = len(inv.header)
        measured = inv.layer is not None and inv.layer.measured_length and ai.LENGTH_COLUMN in inv.header
        self._measured = inv.header.index(ai.LENGTH_COLUMN) if measured else None
        self._values = ai.display_values(inv, run.result)
        self._verdicts = run.result.verdict.astype(str)
        self._fields.clear()
        columns = list(inv.header) + list(ai.RESULT_COLUMNS)
        lead = [columns.index(c) for c in order_names if c in columns]
        reason = columns.index("reason")
        order = lead + [i for i in range(len(columns)) if i not in lead and i != reason] + [reason]
        titles = [column_title(c, inv.units) for c in columns]
        if self._measured is not None:
            titles[self._measured] = f"{MEASURED_LENGTH.label}\n({pretty(inv.units.label(MEASURED_LENGTH.quantity))})"
        self._reset(columns, titles, order, inv.lines)
        self.endResetModel()

    def _row(self, i: int) -> list:
        fields = self._fields.get(i)
        if fields is None:
            if len(self._fields) > 4096:
                self._fields.clear()
            fields = self._fields[i] = next(csv.reader([self.run.inventory.rows[i]]), [])
        return fields

    def text(self, i: int, c: int) -> str:
        if c < self._width:
            fields = self._row(i)
            text = fields[c] if c < len(fields) else ""
            if c == self._measured and text.strip():     # measured here (in the inventory's units): the one rule
                return rounded(float(text), MEASURED_LENGTH)
            return text
        name = self.columns[c]
        if name == "verdict":
            return self._verdicts[i]
        if name == "reason":
            return self.run.result.reason[i]
        value = float(self._values[name][i])
        if math.isnan(value):
            return ""
        text = rounded(value, table_field(name)) if table_field(name) else f"{value:.{ai.DIGITS}g}"
        if name == "safety_factor" and self.run.result.governs is not None and self.run.result.governs[i]:
            text += f" ({self.run.result.governs[i]})"   # where the lowest factor was found
        return text

    def verdict(self, i: int) -> str:
        return self._verdicts[i]

    def numeric(self, c: int) -> bool:
        return c == self._measured or super().numeric(c)

    def headerData(self, section, orientation, role=Qt.ItemDataRole.DisplayRole):
        if (orientation == Qt.Orientation.Horizontal and role == Qt.ItemDataRole.ToolTipRole
                and 0 <= section < len(self.order) and self.order[section] == self._measured):
            return ("Measured on each reach's line in the layer's coordinate system (the layer has no "
                    f"'{ai.LENGTH_COLUMN}' column)")
        if orientation == Qt.Orientation.Vertical and 0 <= section < len(self.shown) and self.run is not None:
            i = int(self.shown[section])
            if role == Qt.ItemDataRole.DisplayRole:
                return f"{int(self.lines[i])}  {self.run.inventory.ids[i]}"
            if role == Qt.ItemDataRole.ToolTipRole:
                where = "of the file" if self.row_word == "line" else "of the layer"
                return f"{self.row_word} {int(self.lines[i])} {where}, id {self.run.inventory.ids[i]}"
        return super().headerData(section, orientation, role)

    def keys(self, c: int) -> np.ndarray:
        name, inv, res = self.columns[c], self.run.inventory, self.run.result
        if name in self._values:
            return np.asarray(self._values[name], dtype=float)
        if name in mr.NUMERIC_FIELDS and c < self._width:
            return np.asarray(getattr(inv.reaches, name), dtype=float)   # SI: the same order as shown
        if name == "verdict":
            return self._verdicts
        if name == "reason":
            return np.char.lower(res.reason.astype(str))
        if name == "id":
            texts = inv.ids
        elif any('"' in r for r in inv.rows):
            texts = [f[c] if c < len(f) else "" for f in csv.reader(inv.rows)]
        else:
            texts = [r.split(",")[c] if r.count(",") >= c else "" for r in inv.rows]
        numbers = np.array([_float(t) if t.strip() else math.nan for t in texts], dtype=float)
        if np.isfinite(numbers).sum() == sum(1 for t in texts if t.strip()):
            return numbers                      # an extra column of numbers sorts as numbers
        return np.array([t.strip().lower() for t in texts], dtype=str)


class RowsModel(SortableRows):
    """A small table of text rows (the bad rows), with the file's line numbers."""

    def __init__(self, parent=None):
        super().__init__(parent)
        self.rows: list[list[str]] = []

    def load(self, columns, rows, lines) -> None:
        self.beginResetModel()
        self.rows = rows
        self._reset(columns, columns, None, lines)
        self.endResetModel()

    def text(self, i: int, c: int) -> str:
        row = self.rows[i]
        return row[c] if c < len(row) else ""

    def verdict(self, i: int) -> str:
        return self.text(i, self.columns.index("verdict")) if "verdict" in self.columns else ""

    def keys(self, c: int) -> np.ndarray:
        texts = [self.text(i, c) for i in range(len(self.rows))]
        if _numeric(self.columns[c]):
            return np.array([_float(t) for t in texts], dtype=float)
        return np.array([t.strip().lower() for t in texts], dtype=str)


def _float(text: str) -> float:
    try:
        return float(text)
    except ValueError:
        return math.nan


class _Views(QTabWidget):
    """The tabs of reaches, bad rows and summary: as tall as the dialog leaves them (the tables scroll), not as
    tall as the wrapped reach detail would like, so that a short screen does not scroll the whole dialog."""

    def hasHeightForWidth(self) -> bool:
        return False


class InventoryDialog(QDialog):
    """Check an inventory file, look at its reaches, and import chosen ones as channels."""

    imported = Signal(list)   # names of the channels added

    def __init__(self, doc, persistent: bool = True, parent=None):
        super().__init__(parent)
        self.doc = doc
        self.persistent = persistent
        self.run: ai.BatchRun | None = None
        self.task: Task | None = None
        self.setWindowTitle("Check a ditch inventory — Ditchwright")
        self.setObjectName("inventory")
        self.setWindowFlag(Qt.WindowType.Window, True)
        self.setStyleSheet(STYLE + INVENTORY_STYLE)
        self.setModal(False)
        outer = QVBoxLayout(self)
        outer.setContentsMargins(12, 10, 12, 10)
        outer.setSpacing(8)
        body = QWidget()
        body.setObjectName("inventoryBody")
        lay = QVBoxLayout(body)
        lay.setContentsMargins(0, 0, 0, 0)
        lay.setSpacing(8)

        # the file and how to read it
        top = QGridLayout()
        top.setHorizontalSpacing(8)
        top.addWidget(QLabel("Inventory"), 0, 0)    # a CSV file or a GeoPackage (the file dialog says which)
        self.path = QLineEdit()
        self.path.setObjectName("inventoryPath")
        self.path.setPlaceholderText("columns id, shape, bottom_width, left_slope, right_slope, diameter, slope, "
                                     "flow, lining, d50, n")
        self.path.returnPressed.connect(self.start_check)
        top.addWidget(self.path, 0, 1)
        browse = QPushButton("Choose…")
        browse.clicked.connect(self.choose_file)
        top.addWidget(browse, 0, 2)
        top.addWidget(QLabel("Units in the file"), 0, 3)
        self.units = QComboBox()
        self.units.setObjectName("inventoryUnits")
        for key, text in UNIT_CHOICES:
            self.units.addItem(text, key)
        remembered = settings.INVENTORY_UNITS.read() if persistent else ""
        self.units.setCurrentIndex(self.units.findData(remembered if remembered in ("us", "si")
                                                       else doc.project.units))
        top.addWidget(self.units, 0, 4)
        self.check_button = QPushButton("Check")
        self.check_button.setObjectName("checkInventory")
        self.check_button.setDefault(True)
        self.check_button.clicked.connect(self.start_check)
        top.addWidget(self.check_button, 0, 5)
        top.setColumnStretch(1, 1)
        lay.addLayout(top)

        # progress while it runs, then what happened
        row = QHBoxLayout()
        self.progress = QProgressBar()
        self.progress.setObjectName("inventoryProgress")
        self.progress.setTextVisible(True)
        self.progress.hide()
        self.cancel_button = QPushButton("Stop")
        self.cancel_button.setToolTip("Stop the check after the part it is working on")
        self.cancel_button.clicked.connect(self.stop)
        self.cancel_button.hide()
        self.status = QLabel("Choose an inventory file and its units, then Check.")
        self.status.setObjectName("hint")
        self.status.setWordWrap(True)
        row.addWidget(self.progress, 1)
        row.addWidget(self.cancel_button)
        row.addWidget(self.status, 3)
        lay.addLayout(row)

        # filters: verdicts with their counts, warnings, text
        self.filters = QWidget()
        self.filters.setObjectName("inventoryFilters")
        fl = QGridLayout(self.filters)
        fl.setContentsMargins(0, 0, 0, 0)
        fl.setHorizontalSpacing(14)
        fl.setVerticalSpacing(4)
        heading = QLabel("Show verdicts")
        heading.setObjectName("subheading")
        fl.addWidget(heading, 0, 0)
        self.verdict_boxes: dict[str, QCheckBox] = {}
        for i, verdict in enumerate(mr.VERDICTS):
            box = QCheckBox(VERDICT_WORDS[verdict])
            box.setObjectName(f"verdict_{verdict}")
            box.setProperty("verdict", verdict)
            box.setChecked(True)
            box.toggled.connect(self.apply_filters)
            self.verdict_boxes[verdict] = box
            fl.addWidget(box, 0 if i < 4 else 1, 1 + i % 4)
        fl.addWidget(QLabel("Warning"), 2, 0)
        self.warning = QComboBox()
        self.warning.setObjectName("warningFilter")
        self.warning.addItem("any reach, warned or not", None)
        self.warning.addItem("with any warning", ANY_WARNING)
        for key, label in mr.WARNINGS.items():
            self.warning.addItem(f"with {label}", key)
        self.warning.setSizeAdjustPolicy(QComboBox.SizeAdjustPolicy.AdjustToMinimumContentsLengthWithIcon)
        self.warning.setMinimumContentsLength(24)     # the list opens as wide as its longest entry
        self.warning.currentIndexChanged.connect(self.apply_filters)
        fl.addWidget(self.warning, 2, 1, 1, 2)
        fl.addWidget(QLabel("Find"), 2, 3, Qt.AlignmentFlag.AlignRight)
        self.text = QLineEdit()
        self.text.setObjectName("textFilter")
        self.text.setPlaceholderText("text in the id or the reason")
        self.text.setClearButtonEnabled(True)
        self.text.textChanged.connect(self._text_changed)
        self._text_timer = QTimer(self)    # long inventories: filter when the typing pauses
        self._text_timer.setSingleShot(True)
        self._text_timer.setInterval(250)
        self._text_timer.timeout.connect(self.apply_filters)
        fl.addWidget(self.text, 2, 4, 1, 2)
        self.count = QLabel()
        self.count.setObjectName("shownCount")
        fl.addWidget(self.count, 1, 4, 1, 2, Qt.AlignmentFlag.AlignRight)   # beside the short second row
        fl.setColumnStretch(5, 1)
        lay.addWidget(self.filters)
        self.filters.setEnabled(False)

        # the reaches, the bad rows, the summary
        self.model = ReachesModel(self)
        self.table = QTableView()
        self.table.setObjectName("reaches")
        self.table.setModel(self.model)
        self.table.setSortingEnabled(True)
        self.table.horizontalHeader().setSortIndicatorShown(True)
        self.table.horizontalHeader().setSortIndicator(-1, Qt.SortOrder.AscendingOrder)
        self.table.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.table.setSelectionMode(QAbstractItemView.SelectionMode.ExtendedSelection)
        self.table.setAlternatingRowColors(True)
        self.table.setWordWrap(False)
        self.table.verticalHeader().setDefaultSectionSize(22)
        self.table.horizontalHeader().setStretchLastSection(True)
        # two-line headings (name, then unit): the style sheet's padding is not in Qt's own estimate
        self.table.horizontalHeader().setMinimumHeight(2 * self.fontMetrics().height() + 12)
        self.table.selectionModel().selectionChanged.connect(self._selection_changed)
        self.problems_model = RowsModel(self)
        self.problems = QTableView()
        self.problems.setObjectName("problems")
        self.problems.setModel(self.problems_model)
        self.problems.setSortingEnabled(True)
        self.problems.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.problems.setWordWrap(False)
        self.problems.verticalHeader().hide()
        self.problems.verticalHeader().setDefaultSectionSize(22)
        self.problems.horizontalHeader().setStretchLastSection(True)
        self.problems.doubleClicked.connect(self._show_problem)
        self.summary = QPlainTextEdit()
        self.summary.setObjectName("inventorySummary")
        self.summary.setReadOnly(True)
        self.summary.setFont(QFontDatabase.systemFont(QFontDatabase.SystemFont.FixedFont))
        reaches = QWidget()
        rl = QVBoxLayout(reaches)
        rl.setContentsMargins(0, 0, 0, 0)
        rl.setSpacing(0)
        rl.addWidget(self.table, 1)
        self.detail = QLabel()
        self.detail.setObjectName("reachDetail")
        self.detail.setWordWrap(True)
        self.detail.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        rl.addWidget(self.detail)
        self.views = _Views()
        self.views.setObjectName("inventoryViews")
        self.views.addTab(reaches, "Reaches")
        self.views.addTab(self.problems, "Bad rows")
        self.views.addTab(self.summary, "Summary")
        lay.addWidget(self.views, 1)

        # what to do with them
        caution = QLabel("Results assist design; a licensed engineer checks them against local codes.")
        caution.setObjectName("hint")
        caution.setWordWrap(True)
        lay.addWidget(caution)
        # on a screen too small for it all, the part above the buttons scrolls; the buttons stay in view
        outer.addWidget(scrolling(body, horizontal=True), 1)
        bottom = QHBoxLayout()
        bottom.addStretch(1)
        self.choose_all = QPushButton("Choose all shown")
        self.choose_all.clicked.connect(self.table.selectAll)
        self.copy_button = QPushButton("Copy rows")
        self.copy_button.setToolTip("Copy the chosen rows as tab-separated text for a spreadsheet")
        self.copy_button.clicked.connect(self.copy_rows)
        self.save_button = QPushButton("Save as CSV…")
        self.save_button.setToolTip("Save the results of every reach as a CSV file")
        self.save_button.clicked.connect(self.save_results)
        self.import_button = QPushButton()
        self.import_button.setObjectName("importReaches")
        self.import_button.setToolTip("Add the chosen reaches to the project, each as a channel of its own")
        self.import_button.clicked.connect(self.import_chosen)
        close = QPushButton("Close")
        close.clicked.connect(self.close)
        for b in (self.choose_all, self.copy_button, self.save_button, self.import_button, close):
            bottom.addWidget(b)
        outer.addLayout(bottom)
        self._set_result_actions()
        fit_to_screen(self, 1280, 760)

    # -- running the check --------------------------------------------------------------------
    def choose_file(self) -> None:
        folder = settings.INVENTORY_FOLDER.read() if self.persistent else ""
        path, _ = QFileDialog.getOpenFileName(self, "Inventory to check", folder, OPEN_FILTER)
        if path:
            self.path.setText(path)
            self.start_check()

    def start_check(self) -> Task | None:
        """Read and check the inventory in a worker thread; returns the task (None when nothing to do)."""
        if self.task is not None:
            return None
        text = self.path.text().strip()
        if not text:
            self._say("Choose the inventory file first.", error=True)
            return None
        path = Path(text).expanduser()
        units = self.units.currentData()
        if self.persistent:
            settings.INVENTORY_FOLDER.write(str(path.parent))
            settings.INVENTORY_UNITS.write(units)
        catalogue = self.doc.context.catalogue   # the window's: shipped, with the user's file
        layer = None
        if ai.is_geopackage(path):
            try:
                names = ai.layer_names(path)
            except ai.InventoryError as exc:
                self._say(sentence(str(exc)), error=True)
                return None
            if len(names) > 1:
                layer, chosen = QInputDialog.getItem(self, "Layer to check", f"{path.name} holds {len(names)} "
                                                     "layers; check the reaches of:", names, 0, False)
                if not chosen:
                    return None

        def work(progress):
            return ai.run_inventory(path, units, progress=progress, catalogue=catalogue, layer=layer)

        task = Task(work, self)
        task.progressed.connect(self._progressed)
        task.succeeded.connect(lambda run: self._checked(path, run))
        task.failed.connect(lambda exc: self._check_failed(path, exc))
        task.finished.connect(self._ended)
        self.task = task
        self.check_button.setEnabled(False)
        self.progress.setRange(0, 0)  # reading: no count yet
        self.progress.setFormat("reading…")
        self.progress.show()
        self.cancel_button.show()
        self.cancel_button.setEnabled(True)
        self._say(f"Checking {path.name}…")
        task.start()
        return task

    def stop(self, wait: bool = False) -> None:
        """Stop a running check at its next progress report (and, with ``wait``, let its thread end)."""
        if self.task is not None:
            self.task.cancel()
            self.cancel_button.setEnabled(False)
            self._say("Stopping after the part in hand…")
            if wait:
                self.task.wait()

    def _progressed(self, done: int, total: int) -> None:
        self.progress.setRange(0, max(total, 1))
        self.progress.setValue(done)
        self.progress.setFormat(f"{done:,} of {total:,} reaches checked")

    def _ended(self) -> None:
        task, self.task = self.task, None
        if task is not None:
            task.deleteLater()
        self.progress.hide()
        self.cancel_button.hide()
        self.check_button.setEnabled(True)

    def _check_failed(self, path: Path, exc: BaseException) -> None:
        before = ("" if self.run is None else
                  f" The table still shows the results of {Path(self.run.inventory.source).name}.")
        if isinstance(exc, Cancelled):
            self._say("Stopped." + (before or " No results."))
        elif isinstance(exc, InventoryError):
            self._say(sentence(exc) + before, error=True)
        elif isinstance(exc, (OSError, ValueError)):
            self._say(sentence(f"{path}: {exc}") + before, error=True)
        else:
            self._say(sentence(f"The check stopped with an unexpected error: {type(exc).__name__}: {exc}") + before,
                      error=True)

    def _checked(self, path: Path, run: ai.BatchRun) -> None:
        finding = ai.units_finding(run.inventory)
        if finding is not None and finding.mixed and not self._units_checked(path, finding):
            before = ("" if self.run is None else
                      f" The table still shows the results of {Path(self.run.inventory.source).name}.")
            self._say(f"{pretty(finding.text)} Not shown: check the file's units and check it again.{before}",
                      error=True)
            return
        self.run = run
        units = run.inventory.units
        self.model.load(run)
        self.table.horizontalHeader().setSortIndicator(-1, Qt.SortOrder.AscendingOrder)
        problems = run.problems()
        word = run.inventory.row_word
        self.model.row_word = self.problems_model.row_word = word
        self.problems_model.load([word, "id", "verdict", "reason"],
                                 [[str(line), ident, str(verdict), reason] for line, ident, verdict, reason in problems],
                                 [p[0] for p in problems])
        self.views.setTabText(1, f"Bad rows ({len(problems):,})")
        self.summary.setPlainText(run.summary())
        counts = run.result.counts()
        for verdict, box in self.verdict_boxes.items():
            box.blockSignals(True)
            box.setChecked(True)
            box.setText(f"{VERDICT_WORDS[verdict]}: {counts[verdict]:,}")
            box.setEnabled(counts[verdict] > 0)
            box.blockSignals(False)
        for w in (self.warning, self.text):
            w.blockSignals(True)
        self.warning.setCurrentIndex(0)
        self.text.clear()
        for w in (self.warning, self.text):
            w.blockSignals(False)
        self.filters.setEnabled(True)
        self._fit_columns()
        self.apply_filters()
        found = getattr(run.inventory, "layer", None)
        where = f"{path.name}, layer '{found.name}' ({found.features:,} features)" if found is not None else path.name
        done = f"Checked {len(run.inventory):,} reaches of {where} ({units.name} units)."
        if finding is not None:          # the numbers look like the other unit system: said first, as a warning
            self._say(f"{pretty(finding.text)} {done}", error=True)
        else:
            self._say(f"{done} Click a column heading to sort; choose rows (Shift or Ctrl for several) to import "
                      "them as channels or copy them.")
        self.setWindowTitle(f"{path.name} ({units.name} units) — inventory check — Ditchwright")

    def _units_checked(self, path: Path, finding: ai.UnitsFinding) -> bool:
        """Whether the user says the units of an inventory whose columns disagree on them are right."""
        answer = QMessageBox.question(
            self, "Units of the inventory",
            f"{pretty(finding.text)}\n\nShow the results of {path.name} read in "
            f"{hu.system(finding.chosen).name} units anyway?",
            QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.No, QMessageBox.StandardButton.No)
        return answer == QMessageBox.StandardButton.Yes

    def _fit_columns(self) -> None:
        header = self.table.horizontalHeader()
        header.setResizeContentsPrecision(400)   # sample rows: a 100,000-row table stays quick
        self.table.resizeColumnsToContents()
        for c in range(self.model.columnCount() - 1):
            header.resizeSection(c, min(max(header.sectionSize(c), 56), 220))
        self.problems.resizeColumnsToContents()

    # -- filters -------------------------------------------------------------------------------
    def chosen_verdicts(self) -> list | None:
        """The verdicts ticked, or None when all are (no condition)."""
        on = [v for v, box in self.verdict_boxes.items() if box.isChecked()]
        return None if len(on) == len(self.verdict_boxes) else on

    def _text_changed(self, *_args) -> None:
        if self.run is not None and len(self.run.inventory) > TYPE_AHEAD_ROWS:
            self._text_timer.start()
        else:
            self.apply_filters()

    def apply_filters(self, *_args) -> None:
        if self.run is None:
            return
        key = self.warning.currentData()
        warnings = None if key is None else (list(mr.WARNINGS) if key == ANY_WARNING else [key])
        rows = self.run.select(verdicts=self.chosen_verdicts(), warnings=warnings, text=self.text.text().strip())
        self.model.show_rows(rows)
        self._show_detail()
        total = len(self.run.inventory)
        self.count.setText(f"Showing {len(rows):,} of {total:,} reaches")
        self._set_result_actions()

    # -- results -------------------------------------------------------------------------------
    def chosen_rows(self) -> list[int]:
        """Inventory row indices (file order) of the rows chosen in the table."""
        view_rows = {i.row() for i in self.table.selectionModel().selectedRows()}
        return self.model.source_rows(view_rows)

    def _selection_changed(self, *_args) -> None:
        self._set_result_actions()
        self._show_detail()

    def _show_detail(self) -> None:
        """The verdict and reason of the chosen row in full, under the table."""
        chosen = self.table.selectionModel().selectedRows() if self.run is not None else []
        if len(chosen) != 1:
            self.detail.setText("Click a row to read its verdict and reason in full." if not chosen else
                                f"{len(chosen):,} reaches chosen. Click one to read its verdict and reason in full.")
            return
        i = int(self.model.shown[chosen[0].row()])
        inv, res = self.run.inventory, self.run.result
        ident = inv.id_at(i) or "no id"
        verdict, reason = str(res.verdict[i]), pretty(res.reason[i])
        told = reason if reason.lower().startswith(verdict) else f"{verdict}. {reason}"
        self.detail.setText(f"{inv.row_word.capitalize()} {int(inv.lines[i])}, {ident}: {told}")

    def _set_result_actions(self) -> None:
        has_run = self.run is not None
        chosen = len(self.table.selectionModel().selectedRows()) if has_run else 0
        self.choose_all.setEnabled(has_run and self.model.rowCount() > 0)
        self.save_button.setEnabled(has_run)
        self.copy_button.setEnabled(chosen > 0)
        self.import_button.setEnabled(chosen > 0)
        self.import_button.setText("Import chosen reaches" if not chosen else
                                   "Import the chosen reach" if chosen == 1 else
                                   f"Import {chosen:,} chosen reaches")

    def import_chosen(self) -> list:
        """Add the chosen reaches to the project as channels (one undoable step); returns their names."""
        rows = self.chosen_rows()
        if not rows or self.run is None:
            return []
        if len(rows) > IMPORT_ASK_ABOVE:
            answer = QMessageBox.question(
                self, "Import many reaches",
                f"Import {len(rows):,} reaches as channels of the project? Each becomes a channel of its own; "
                "a project of thousands of channels is slow to work in.",
                QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.No, QMessageBox.StandardButton.No)
            if answer != QMessageBox.StandardButton.Yes:
                return []
        channels, skipped = self.run.to_channels(rows)
        source = Path(self.run.inventory.source).name
        inv = self.run.inventory
        taken = [i for i in rows if self.run.result.verdict[i] != "invalid"]
        if len(taken) == len(channels):   # say where each channel came from, unless the row said it
            for i, ch in zip(taken, channels):
                ch.location = ch.location or f"{source}, {inv.row_word} {int(inv.lines[i])}"
        names = self.doc.add_channels(channels, f"Import {len(channels):,} reach{'es' if len(channels) != 1 else ''} "
                                                f"from {source}") if channels else []
        parts = []
        if len(names) == 1:
            parts.append(f"Imported 1 reach as a channel ({names[0]}); Edit > Undo in the main window takes it "
                         "out again.")
        elif names:
            parts.append(f"Imported {len(names):,} reaches as channels ({_list(names)}); Edit > Undo in the main "
                         "window takes them out again.")
        if skipped:
            parts.append("Not imported, the row is invalid: " +
                         "; ".join(f"{inv.row_word} {line} ({ident or 'no id'}): {reason}"
                                   for line, ident, reason in skipped[:3])
                         + (f"; and {len(skipped) - 3:,} more" if len(skipped) > 3 else "") + ".")
        self._say(" ".join(parts), error=bool(skipped) and not names)
        if names:
            self.imported.emit(names)
        return names

    def copy_rows(self) -> None:
        rows = sorted({i.row() for i in self.table.selectionModel().selectedRows()})
        if not rows:
            return
        lines = ["\t".join([self.run.inventory.row_word] + [tsv_cell(self.model.titles[c]) for c in self.model.order])]
        for r in rows:
            lines.append("\t".join([str(int(self.model.lines[self.model.shown[r]]))] +
                                   [tsv_cell(self.model.cell(r, c)) for c in range(self.model.columnCount())]))
        QGuiApplication.clipboard().setText("\n".join(lines) + "\n")
        self._say(f"Copied {len(rows):,} row{'s' if len(rows) != 1 else ''} as tab-separated text.")

    def save_results(self) -> None:
        if self.run is None:
            return
        src = Path(self.run.inventory.source)
        suggestion = str(src.with_name(src.stem + "-results.csv"))
        path, _ = QFileDialog.getSaveFileName(self, "Save the results as", suggestion, CSV_FILTER)
        if not path:
            return
        try:
            ai.write_results(path, self.run.inventory, self.run.result)
        except Exception as exc:  # noqa: BLE001 - any failure is said; the results stay in the window
            why = exc.strerror or exc if isinstance(exc, OSError) else f"unexpected error {type(exc).__name__}: {exc}"
            self._say(f"The results were not saved to {path}: {why}.", error=True)
            return
        self._say(f"Saved one result row per input row to {path}.")

    def _show_problem(self, index) -> None:
        """Double-click on a bad row: show it in the table of reaches."""
        line = int(self.problems_model.lines[self.problems_model.shown[index.row()]])
        for box in self.verdict_boxes.values():
            box.blockSignals(True)
            box.setChecked(True)
            box.blockSignals(False)
        self.warning.blockSignals(True)
        self.warning.setCurrentIndex(0)
        self.warning.blockSignals(False)
        self.text.blockSignals(True)
        self.text.clear()
        self.text.blockSignals(False)
        self.apply_filters()
        where = np.flatnonzero(self.model.lines[self.model.shown] == line)
        if where.size:
            self.views.setCurrentIndex(0)
            self.table.selectRow(int(where[0]))
            self.table.scrollTo(self.model.index(int(where[0]), 0))

    # -- small things ----------------------------------------------------------------------------
    def _say(self, text: str, error: bool = False) -> None:
        self.status.setText(text)
        self.status.setObjectName("fieldMessage" if error else "hint")
        self.status.style().unpolish(self.status)
        self.status.style().polish(self.status)

    def closeEvent(self, event) -> None:
        self.stop(wait=True)
        super().closeEvent(event)


def _list(names: list, most: int = 4) -> str:
    shown = ", ".join(names[:most])
    return shown + (f" and {len(names) - most:,} more" if len(names) > most else "")


INVENTORY_STYLE = """
QDialog#inventory { background: #f5f6f7; }
QTableView { background: #ffffff; alternate-background-color: #f7f9fb; gridline-color: #e3e6e9;
             selection-background-color: #cfe0ef; selection-color: #1d2b36; }
QHeaderView::section { background: #eceff1; padding: 3px 6px; border: none; border-right: 1px solid #d9dde1;
                       border-bottom: 1px solid #d9dde1; }
QLabel#fieldMessage { font-size: 12px; }
QLabel#reachDetail { background: #ffffff; border: 1px solid #d9dde1; border-top: none; padding: 5px 8px;
                     color: #2b3035; min-height: 32px; }
"""
