"""The project's rainfall relation (intensity-duration-frequency) as the window shows and edits it.

Two kinds, as :mod:`hydraulics.rainfall` knows them: a table of intensities
(durations down, return periods across) and the fitted formula
i = a / (t + b)^c with one row of coefficients per return period, typed in
the units such formulas are published in (t and b in minutes, i in mm/h or
in/h). The dialog reads what is typed in the user's number format and turns
it into the project's rainfall dict in SI. Every rule about the numbers is
the core's (:func:`hydraulics.rainfall.idf_from_dict`, then the project
file's own check): its refusal is shown under the grid in words, the cell it
names is marked, and OK stays disabled until the relation is taken. Nothing
is made up: a project without rainfall starts from an empty grid. A number
shown and left as it was keeps all its digits (the cell remembers the value
it showed), so that opening the dialog and pressing OK changes nothing.
"""

from __future__ import annotations

import copy
import re

from PySide6.QtCore import Qt
from PySide6.QtGui import QColor, QFont
from PySide6.QtWidgets import (QComboBox, QDialog, QDialogButtonBox, QGridLayout, QHBoxLayout, QHeaderView, QLabel,
                               QLineEdit, QPushButton, QStackedWidget, QTableWidget, QTableWidgetItem, QVBoxLayout,
                               QWidget)

import hydraulics as hy
from hydraulics.rainfall import IdfFormula, idf_from_dict
from hydraulics.units import UnitSystem
from hydraulics.wording import in_units

from .. import project as pj
from .fields import format_number, keep_units_whole, pretty, sentence, set_invalid, typed_number
from .screen_fit import fit_to_screen, scrolling
from .style import STYLE

#: The kinds of relation, as the choice box words them.
KINDS = (("table", "Table of intensities"), ("formula", "Fitted formula i = a / (t + b)^c"))
#: Rows and columns of the empty grid a project without rainfall starts from.
EMPTY_SIZE = 3
_KEPT = Qt.ItemDataRole.UserRole          # (text shown, value it stands for) of a cell filled from the project
_ROW = Qt.ItemDataRole.UserRole + 1       # a formula row's coefficients as the project has them (SI)
_HEAD = QColor("#eef0f2")                 # the return-period row and the duration column
_BAD = QColor("#fde8e8")                  # a cell the core refused
_TODO = QColor("#fff6e0")                 # a cell still empty
_NONE = QColor(0, 0, 0, 0)
_FIELD = re.compile(r"rainfall\.(durations|return_periods|intensities|coefficients|duration_range)"
                    r"(?:\[([^\]]+)\])?(?:\[(\d+)\])?(?:\.(\w+))?")
_COEFFICIENT_COLUMNS = {"return_period": 0, "a": 1, "b": 2, "c": 3}


class Refusal(Exception):
    """Why the relation as typed is not taken: the words, where (a (table, row, column) or a line edit, or None),
    and whether it is only unfinished (an empty entry) rather than wrong."""

    def __init__(self, message: str, where=None, unfinished: bool = False):
        super().__init__(message)
        self.where, self.unfinished = where, unfinished


def _hint(text: str) -> QLabel:
    label = QLabel(text)
    label.setObjectName("hint")
    label.setWordWrap(True)
    return label


def _cell(value=None, text: str | None = None) -> QTableWidgetItem:
    """An editable cell showing ``text`` (``value`` formatted by default) that remembers ``value``."""
    if text is None:
        text = "" if value is None else format_number(value)
    item = QTableWidgetItem(text)
    item.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
    if value is not None:
        item.setData(_KEPT, (text, float(value)))
    return item


def _kept(item: QTableWidgetItem | None):
    """The value a cell was filled with when its text is still the one shown then, else None."""
    kept = item.data(_KEPT) if item is not None else None
    return kept[1] if kept is not None and kept[0] == item.text() else None


class RainfallDialog(QDialog):
    """The project's IDF relation as a table or as the fitted formula, in the project's units."""

    def __init__(self, rainfall: dict | None, units: UnitSystem, parent=None):
        super().__init__(parent)
        self.setWindowTitle("Rainfall (IDF)")
        self.setObjectName("rainfallDialog")
        self.setStyleSheet(STYLE)
        self.units = units
        self.original = copy.deepcopy(rainfall)
        self._value: dict | None = None
        self.I = pretty(units.label("intensity"))
        self.T = pretty(units.label("duration"))
        outer = QVBoxLayout(self)
        body = QWidget()
        lay = QVBoxLayout(body)
        lay.setContentsMargins(0, 0, 0, 0)
        lay.setSpacing(8)
        lay.addWidget(_hint("Every ditch run of this project reads its design storm here."))
        form = QGridLayout()
        form.setColumnStretch(1, 1)
        form.addWidget(QLabel("Kind"), 0, 0)
        self.kind = QComboBox()
        self.kind.setObjectName("rainfallKind")
        for key, words in KINDS:
            self.kind.addItem(words, key)
        form.addWidget(self.kind, 0, 1)
        form.addWidget(QLabel("Source"), 1, 0)
        self.source = QLineEdit(str((rainfall or {}).get("source") or ""))
        self.source.setObjectName("rainfallSource")
        self.source.setPlaceholderText("where the numbers come from: agency, station or publication, date")
        self.source.setToolTip("Printed on the design sheet beside the rainfall table; required")
        form.addWidget(self.source, 1, 1)
        lay.addLayout(form)

        self.pages = QStackedWidget()
        self.pages.addWidget(self._table_page())
        self.pages.addWidget(self._formula_page())
        lay.addWidget(self.pages, 1)
        self.cautions = _hint("")
        self.cautions.hide()
        lay.addWidget(self.cautions)
        outer.addWidget(scrolling(body), 1)      # a short screen scrolls the form; the buttons stay in view
        self.message = QLabel()                  # what keeps OK off, always in view above it
        self.message.setObjectName("fieldMessage")
        self.message.setWordWrap(True)
        outer.addWidget(self.message)

        self.buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Ok | QDialogButtonBox.StandardButton.Cancel)
        self.ok = self.buttons.button(QDialogButtonBox.StandardButton.Ok)
        self.buttons.accepted.connect(self.accept)
        self.buttons.rejected.connect(self.reject)
        outer.addWidget(self.buttons)

        kind = (rainfall or {}).get("kind", "table")
        self._fill_table(rainfall if kind == "table" else None)
        self._fill_formula(rainfall if kind == "formula" else None)
        self.kind.setCurrentIndex(max(self.kind.findData(kind), 0))
        self.pages.setCurrentIndex(self.kind.currentIndex())
        self.kind.currentIndexChanged.connect(self._kind_picked)
        self.source.textChanged.connect(self.check)
        for grid in (self.grid, self.coefficients):
            grid.itemChanged.connect(self.check)
            grid.currentCellChanged.connect(self._update_buttons)
        for edit in (self.range_from, self.range_to):
            edit.textChanged.connect(self.check)
        self.check()
        self._update_buttons()
        fit_to_screen(self, 640, 520)

    # -- the two pages -----------------------------------------------------------------------------------
    def _table_page(self) -> QWidget:
        page = QWidget()
        lay = QVBoxLayout(page)
        lay.setContentsMargins(0, 0, 0, 0)
        lay.setSpacing(4)
        lay.addWidget(_hint(f"Return periods [years] across, durations [{self.T}] down, intensities [{self.I}] "
                            "inside."))
        self.grid = QTableWidget(0, 0)
        self.grid.setObjectName("idfTable")
        self.grid.verticalHeader().setVisible(False)
        self.grid.verticalHeader().setDefaultSectionSize(24)
        self.grid.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Stretch)
        self.grid.horizontalHeader().setMinimumSectionSize(70)
        self.grid.setMinimumHeight(100)
        lay.addWidget(self.grid, 1)
        buttons = QHBoxLayout()
        buttons.setContentsMargins(0, 0, 0, 0)
        self.add_duration = self._button("Add duration", "addDuration", "A row after the chosen one",
                                         self.add_duration_row)
        self.delete_duration = self._button("Delete duration", "deleteDuration", "Delete the chosen row",
                                            self.delete_duration_row)
        self.add_period = self._button("Add return period", "addReturnPeriod", "A column after the chosen one",
                                       self.add_period_column)
        self.delete_period = self._button("Delete return period", "deleteReturnPeriod", "Delete the chosen column",
                                          self.delete_period_column)
        for b in (self.add_duration, self.delete_duration):
            buttons.addWidget(b)
        buttons.addStretch(1)
        for b in (self.add_period, self.delete_period):
            buttons.addWidget(b)
        lay.addLayout(buttons)
        return page

    def _formula_page(self) -> QWidget:
        page = QWidget()
        lay = QVBoxLayout(page)
        lay.setContentsMargins(0, 0, 0, 0)
        lay.setSpacing(4)
        lay.addWidget(_hint(f"One row per return period: i in {self.I}, the duration t and b in {self.T}, c "
                            "without unit."))
        self.coefficients = QTableWidget(0, 4)
        self.coefficients.setObjectName("idfFormula")
        self.coefficients.setHorizontalHeaderLabels(["Return period [years]", f"a [{self.I}·{self.T}^c]",
                                                     f"b [{self.T}]", "c [–]"])
        self.coefficients.verticalHeader().setVisible(False)
        self.coefficients.verticalHeader().setDefaultSectionSize(24)
        self.coefficients.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Stretch)
        self.coefficients.setMinimumHeight(80)
        lay.addWidget(self.coefficients, 1)
        buttons = QHBoxLayout()
        buttons.setContentsMargins(0, 0, 0, 0)
        self.add_formula_row = self._button("Add return period", "addFormulaRow", "A row after the chosen one",
                                            self.add_coefficient_row)
        self.delete_formula_row = self._button("Delete return period", "deleteFormulaRow", "Delete the chosen row",
                                               self.delete_coefficient_row)
        buttons.addWidget(self.add_formula_row)
        buttons.addWidget(self.delete_formula_row)
        buttons.addStretch(1)
        lay.addLayout(buttons)
        row = QHBoxLayout()
        row.setContentsMargins(0, 6, 0, 0)
        row.addWidget(QLabel("Fitted on durations from"))
        self.range_from = QLineEdit()
        self.range_from.setObjectName("rangeFrom")
        self.range_to = QLineEdit()
        self.range_to.setObjectName("rangeTo")
        for edit in (self.range_from, self.range_to):
            edit.setAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
            edit.setMaximumWidth(80)
            edit.setToolTip("The formula is not read outside the durations it was fitted on; leave both empty "
                            "to read it at any duration")
        row.addWidget(self.range_from)
        row.addWidget(QLabel("to"))
        row.addWidget(self.range_to)
        row.addWidget(QLabel(f"{self.T} (empty: any duration)"))
        row.addStretch(1)
        lay.addLayout(row)
        return page

    def _button(self, text: str, name: str, tip: str, slot) -> QPushButton:
        b = QPushButton(text)
        b.setObjectName(name)
        b.setToolTip(tip)
        b.setAutoDefault(False)
        b.clicked.connect(slot)
        return b

    # -- filling ------------------------------------------------------------------------------------------
    def _fill_table(self, rainfall: dict | None) -> None:
        """The table of ``rainfall`` in the project's units, or an empty grid of EMPTY_SIZE x EMPTY_SIZE."""
        if rainfall is None:
            durations, periods, cells = [None] * EMPTY_SIZE, [None] * EMPTY_SIZE, None
        else:
            durations, periods, cells = rainfall["durations"], rainfall["return_periods"], rainfall["intensities"]
        g = self.grid
        g.blockSignals(True)
        g.setRowCount(len(durations) + 1)
        g.setColumnCount(len(periods) + 1)
        corner = QTableWidgetItem("Return period [years] →")
        corner.setFlags(Qt.ItemFlag.ItemIsEnabled)
        corner.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        g.setItem(0, 0, corner)
        for j, p in enumerate(periods, start=1):
            g.setItem(0, j, _cell(p))
        for i, t in enumerate(durations, start=1):
            g.setItem(i, 0, self._si_cell(t, "duration"))
            for j in range(1, len(periods) + 1):
                g.setItem(i, j, self._si_cell(None if cells is None else cells[i - 1][j - 1], "intensity"))
        g.blockSignals(False)
        self._table_headings()

    def _si_cell(self, si_value, quantity: str) -> QTableWidgetItem:
        """A cell showing an SI value in the project's units and remembering the SI value itself."""
        if si_value is None:
            return _cell()
        item = _cell(text=format_number(float(self.units.from_si(quantity, si_value))))
        item.setData(_KEPT, (item.text(), float(si_value)))
        return item

    def _table_headings(self) -> None:
        g = self.grid
        g.setHorizontalHeaderLabels([f"Duration [{self.T}]"] + [f"Intensity [{self.I}]"] * (g.columnCount() - 1))
        g.horizontalHeader().setSectionResizeMode(0, QHeaderView.ResizeMode.ResizeToContents)
        bold = QFont(g.font())
        bold.setBold(True)
        g.blockSignals(True)
        for i in range(g.rowCount()):
            for j in range(g.columnCount()):
                item = g.item(i, j)
                if item is None:
                    item = _cell()
                    g.setItem(i, j, item)
                item.setFont(bold if (i == 0 or j == 0) else g.font())
        g.blockSignals(False)

    def _fill_formula(self, rainfall: dict | None) -> None:
        """The formula of ``rainfall`` in customary units, or EMPTY_SIZE empty rows."""
        g = self.coefficients
        g.blockSignals(True)
        if rainfall is None:
            g.setRowCount(EMPTY_SIZE)
            for i in range(EMPTY_SIZE):
                for j in range(4):
                    g.setItem(i, j, _cell())
        else:
            formula = IdfFormula.from_dict(rainfall)
            rows = formula.to_dict()["coefficients"]
            g.setRowCount(len(rows))
            for i, ((p, (a, b, c)), si) in enumerate(zip(formula.customary(self.units.key).items(), rows, strict=True)):
                for j, v in enumerate((p, a, b, c)):
                    g.setItem(i, j, _cell(v))
                g.item(i, 0).setData(_ROW, si)
            rng = formula.duration_range
            if rng is not None:
                for edit, v in zip((self.range_from, self.range_to), rng, strict=True):
                    edit.setText(format_number(float(self.units.from_si("duration", v))))
                    edit.kept = (edit.text(), float(v))
        g.blockSignals(False)

    # -- rows and columns ------------------------------------------------------------------------------------
    def add_duration_row(self) -> None:
        g = self.grid
        row = g.currentRow() + 1 if g.currentRow() >= 1 else g.rowCount()
        g.blockSignals(True)
        g.insertRow(row)
        g.blockSignals(False)
        self._table_headings()
        g.setCurrentCell(row, 0)
        self.check()

    def delete_duration_row(self) -> None:
        g = self.grid
        if g.currentRow() >= 1 and g.rowCount() > 2:
            g.removeRow(g.currentRow())
            self.check()
        self._update_buttons()

    def add_period_column(self) -> None:
        g = self.grid
        col = g.currentColumn() + 1 if g.currentColumn() >= 1 else g.columnCount()
        g.blockSignals(True)
        g.insertColumn(col)
        g.blockSignals(False)
        self._table_headings()
        g.setCurrentCell(0, col)
        self.check()

    def delete_period_column(self) -> None:
        g = self.grid
        if g.currentColumn() >= 1 and g.columnCount() > 2:
            g.removeColumn(g.currentColumn())
            self._table_headings()
            self.check()
        self._update_buttons()

    def add_coefficient_row(self) -> None:
        g = self.coefficients
        row = g.currentRow() + 1 if g.currentRow() >= 0 else g.rowCount()
        g.blockSignals(True)
        g.insertRow(row)
        for j in range(4):
            g.setItem(row, j, _cell())
        g.blockSignals(False)
        g.setCurrentCell(row, 0)
        self.check()

    def delete_coefficient_row(self) -> None:
        g = self.coefficients
        if g.currentRow() >= 0 and g.rowCount() > 1:
            g.removeRow(g.currentRow())
            self.check()
        self._update_buttons()

    def _update_buttons(self, *_cell_args) -> None:
        g = self.grid
        self.delete_duration.setEnabled(g.currentRow() >= 1 and g.rowCount() > 2)
        self.delete_period.setEnabled(g.currentColumn() >= 1 and g.columnCount() > 2)
        f = self.coefficients
        self.delete_formula_row.setEnabled(f.currentRow() >= 0 and f.rowCount() > 1)

    def _kind_picked(self, index: int) -> None:
        self._carry_return_periods()
        self.pages.setCurrentIndex(index)
        self.check()

    def _carry_return_periods(self) -> None:
        """The return periods typed on the page being left, copied to the page chosen while none is typed there
        (one row of the formula per column of the table, and back), so that a switch does not start blank."""
        g, f = self.grid, self.coefficients
        table = [self._text(g, 0, j) for j in range(1, g.columnCount())]
        formula = [self._text(f, i, 0) for i in range(f.rowCount())]
        to_formula = self.chosen_kind == "formula"
        given, target = (table, formula) if to_formula else (formula, table)
        given = [t for t in given if t]
        if not given or any(target):
            return
        grid = f if to_formula else g
        grid.blockSignals(True)
        if to_formula:
            f.setRowCount(len(given))
            for i, text in enumerate(given):
                for j in range(4):
                    f.setItem(i, j, _cell(text=text if j == 0 else ""))
        else:
            g.setColumnCount(len(given) + 1)
            for j, text in enumerate(given, start=1):
                g.setItem(0, j, _cell(text=text))
        grid.blockSignals(False)
        if not to_formula:
            self._table_headings()

    # -- reading ----------------------------------------------------------------------------------------------
    @property
    def chosen_kind(self) -> str:
        return self.kind.currentData()

    def _number(self, grid: QTableWidget, row: int, col: int, quantity: str | None, what: str):
        """The value of a cell: what it was filled with when left as shown, else the typed number in SI
        (``quantity``: None when no unit is converted); None when empty. Refusal when it is not a number."""
        item = grid.item(row, col)
        kept = _kept(item)
        if kept is not None:
            return kept
        text = item.text() if item is not None else ""
        if not text.strip():
            return None
        try:
            value = typed_number(text, what)
        except ValueError as exc:
            raise Refusal(str(exc), (grid, row, col)) from None
        return float(self.units.to_si(quantity, value)) if quantity else value

    def _text(self, grid, row, col) -> str:
        item = grid.item(row, col)
        return item.text().strip() if item is not None else ""

    def _table_words(self, row: int, col: int) -> str:
        """A cell of the table in words, by the duration and return period typed beside it."""
        g = self.grid
        if row == 0:
            return f"The return period in column {col}" + (f" ({self._text(g, 0, col)} years)"
                                                           if self._text(g, 0, col) else "")
        if col == 0:
            return f"The duration in row {row}" + (f" ({self._text(g, row, 0)} {self.T})"
                                                   if self._text(g, row, 0) else "")
        t, p = self._text(g, row, 0), self._text(g, 0, col)
        return (f"The intensity for {t + ' ' + self.T if t else f'row {row}'}, "
                f"{p + ' years' if p else f'column {col}'}")

    def _table_relation(self) -> dict:
        g = self.grid
        rows, cols = g.rowCount(), g.columnCount()
        if all(not self._text(g, i, j) for i in range(rows) for j in range(cols) if (i, j) != (0, 0)):
            raise Refusal(f"Type the table: return periods across the first row, durations down the first column, "
                          f"and the intensities of your rainfall source in {self.I}.", unfinished=True)
        values = {}
        empty = None
        for i in range(rows):
            for j in range(cols):
                if (i, j) == (0, 0):
                    continue
                quantity = None if i == 0 else "duration" if j == 0 else "intensity"
                v = self._number(g, i, j, quantity, self._table_words(i, j))
                if v is None and empty is None:
                    empty = (i, j)
                values[i, j] = v
        if empty is not None:
            raise Refusal(f"{self._table_words(*empty)} is still empty.", (g, *empty), unfinished=True)
        d = {"kind": "table",
             "durations": [values[i, 0] for i in range(1, rows)],
             "return_periods": [values[0, j] for j in range(1, cols)],
             "intensities": [[values[i, j] for j in range(1, cols)] for i in range(1, rows)]}
        try:
            idf_from_dict(d)
        except hy.InputError as exc:
            raise self._core_refusal(exc) from None
        return d

    def _formula_words(self, row: int, col: int) -> str:
        p = self._text(self.coefficients, row, 0)
        name = ("the return period", "a", "b", "c")[col]
        return f"Row {row + 1}{' (' + p + ' years)' if p else ''}: {name}"

    def _range_value(self, edit: QLineEdit, what: str):
        kept = getattr(edit, "kept", None)
        if kept is not None and kept[0] == edit.text():
            return kept[1]
        if not edit.text().strip():
            return None
        try:
            return float(self.units.to_si("duration", typed_number(edit.text(), what)))
        except ValueError as exc:
            raise Refusal(str(exc), edit) from None

    def _formula_relation(self) -> dict:
        g = self.coefficients
        rows = []
        empty = None
        for i in range(g.rowCount()):
            cells = [self._number(g, i, j, None, self._formula_words(i, j)) for j in range(4)]
            if None in cells:
                empty = empty or (i, cells.index(None))
                continue
            original = g.item(i, 0).data(_ROW)
            if original is not None and all(_kept(g.item(i, j)) is not None for j in range(4)):
                rows.append(dict(original))      # left as shown: the project's own coefficients, every digit
                continue
            p, a, b, c = cells
            try:
                rows.append(IdfFormula.from_customary({p: (a, b, c)}, self.units.key).to_dict()["coefficients"][0])
            except hy.InputError as exc:
                what = (exc.field.rsplit(".", 1)[-1] if exc.field.endswith((".a", ".b", ".c")) else "return_period")
                raise Refusal(sentence(f"{self._formula_words(i, _COEFFICIENT_COLUMNS[what])}: "
                                       f"{self._words(exc)}"), (g, i, _COEFFICIENT_COLUMNS[what])) from None
        if empty is not None:
            raise Refusal(f"{self._formula_words(*empty)} is still empty.", (g, *empty), unfinished=True)
        low = self._range_value(self.range_from, "The shortest duration")
        high = self._range_value(self.range_to, "The longest duration")
        if (low is None) != (high is None):
            edit = self.range_to if high is None else self.range_from
            raise Refusal("Give both ends of the durations the formula was fitted on, or leave both empty.", edit,
                          unfinished=True)
        d = {"kind": "formula", "coefficients": rows, "duration_range": None if low is None else [low, high]}
        try:
            idf_from_dict(d)
        except hy.InputError as exc:
            raise self._core_refusal(exc) from None
        return d

    def _words(self, exc: hy.InputError) -> str:
        """The core's refusal without the field it names, in the project's units where the core worded it so."""
        return in_units(getattr(exc, "message", None) or str(exc).split(": ", 1)[-1], self.units)

    def _core_refusal(self, exc: hy.InputError) -> Refusal:
        """The core's refusal in words, with the cell (or box) it names."""
        text = self._words(exc)
        m = _FIELD.fullmatch(exc.field)
        where, words = None, ""
        if m is not None:
            what, first, second, part = m.groups()
            if what == "intensities" and second is not None:
                where = (self.grid, int(first) + 1, int(second) + 1)
            elif what == "durations":
                where = (self.grid, int(first) + 1, 0) if first is not None else None
                words = "The durations"
            elif what == "return_periods":
                where = (self.grid, 0, int(first) + 1) if first is not None else None
                words = "The return periods"
            elif what == "coefficients" and first is not None and first.isdigit() \
                    and int(first) < self.coefficients.rowCount():
                row = int(first)
                where = (self.coefficients, row, _COEFFICIENT_COLUMNS.get(part or "return_period", 0))
            elif what == "duration_range":
                where = self.range_to if first == "1" else self.range_from
                words = "The durations the formula was fitted on"
        if isinstance(where, tuple):
            grid, row, col = where
            words = self._table_words(row, col) if grid is self.grid else self._formula_words(row, col)
        return Refusal(sentence(f"{words}: {text}" if words else text), where)

    def relation(self) -> dict:
        """The relation as typed, checked by the core and by the project file's own check, with its source;
        Refusal when it is not taken."""
        d = self._table_relation() if self.chosen_kind == "table" else self._formula_relation()
        source = self.source.text().strip()
        if not source:
            raise Refusal("Say where these numbers come from (agency, station or publication, date): the design "
                          "sheet prints it beside them.", self.source, unfinished=True)
        d = {"kind": d.pop("kind"), "source": source, **d}
        try:
            pj.Project.from_dict(pj.Project(units=self.units.key, rainfall=d).to_dict())
        except pj.ProjectFileError as exc:
            raise Refusal(sentence(str(exc))) from None
        return d

    # -- checking -------------------------------------------------------------------------------------------
    def check(self, *_signal_args) -> None:
        """Read what is typed, say what keeps it from being taken (marking the place), enable OK when nothing."""
        self._clear_marks()
        self._value = None
        try:
            d = self.relation()
        except Refusal as refusal:
            self._say(str(refusal), refusal.unfinished)
            self._mark(refusal.where, refusal.unfinished)
            self.cautions.hide()
        else:
            self._say("", False)
            self._value = d
            notes = [in_units(w, self.units) for w in idf_from_dict(d).warnings()]
            self.cautions.setText(keep_units_whole(" ".join(sentence("Caution: " + n) for n in notes)))
            self.cautions.setVisible(bool(notes))
        self.ok.setEnabled(self._value is not None)

    def _say(self, text: str, unfinished: bool) -> None:
        self.message.setObjectName("hint" if unfinished else "fieldMessage")
        self.message.style().unpolish(self.message)
        self.message.style().polish(self.message)
        self.message.setText(keep_units_whole(text))
        self.message.setVisible(bool(text))

    def _clear_marks(self) -> None:
        for grid in (self.grid, self.coefficients):
            grid.blockSignals(True)
            for i in range(grid.rowCount()):
                for j in range(grid.columnCount()):
                    item = grid.item(i, j)
                    if item is not None:
                        head = grid is self.grid and (i == 0 or j == 0)
                        item.setBackground(_HEAD if head else _NONE)
            grid.blockSignals(False)
        for edit in (self.source, self.range_from, self.range_to):
            set_invalid(edit, False)
        self.marked = None

    def _mark(self, where, unfinished: bool) -> None:
        self.marked = where
        if isinstance(where, tuple):
            grid, row, col = where
            item = grid.item(row, col)
            if item is not None:
                grid.blockSignals(True)
                item.setBackground(_TODO if unfinished else _BAD)
                grid.blockSignals(False)
        elif isinstance(where, QLineEdit) and not unfinished:
            set_invalid(where, True)

    # -- the answer --------------------------------------------------------------------------------------------
    def value(self) -> dict | None:
        """The relation to store (SI, with its source), or None while it is not taken. The project's own dict when
        nothing of it was changed."""
        if self._value is None:
            return None
        if self.original is not None:
            try:
                same = idf_from_dict(self.original) == idf_from_dict(self._value)
            except hy.InputError:
                same = False
            if same and str(self.original.get("source") or "").strip() == self._value["source"]:
                return copy.deepcopy(self.original)
        return copy.deepcopy(self._value)

    def accept(self) -> None:
        self.check()
        if self._value is not None:
            super().accept()


__all__ = ["EMPTY_SIZE", "KINDS", "RainfallDialog", "Refusal"]
