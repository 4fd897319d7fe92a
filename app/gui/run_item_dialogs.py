"""Dialogs that edit one item of a ditch run as a whole: a sub-area (C or land covers, its own time of
concentration) and a section range (shape, dimensions, ditch depth).

Each dialog shows the item in the project's units, reads every entry back to SI, and asks the core whether it
takes the item (:func:`app.run_design.sub_area_basis`, :func:`hydraulics.section_from_dict`); while the core
refuses, its message is shown, the field it names is marked and OK stays disabled. ``result()`` is the edited
item; the run view makes it one undoable edit with :func:`app.run_editing.with_item_replaced`.
"""

from __future__ import annotations

import copy
import re

from PySide6.QtCore import Qt
from PySide6.QtWidgets import (
    QAbstractItemView,
    QComboBox,
    QDialog,
    QDialogButtonBox,
    QGridLayout,
    QGroupBox,
    QHBoxLayout,
    QHeaderView,
    QLabel,
    QLineEdit,
    QPushButton,
    QTableWidget,
    QTableWidgetItem,
    QVBoxLayout,
    QWidget,
)

import hydraulics as hy
from hydraulics.units import UnitSystem
from hydraulics.wording import format_station, in_units

from ..project import LandCover, RunSection, SubAreaInput
from ..run_design import sub_area_basis
from .fields import UnclearNumber, format_number, parse_number, pretty, sentence, set_invalid
from .forms import SECTION_FIELDS, SHAPES

TC_METHODS = (("typed", "Typed"), ("kirpich", "Kirpich's formula"), ("tr55", "NRCS TR-55 travel times"))
SEGMENT_KINDS = (("sheet", "Sheet"), ("shallow", "Shallow"))
SURFACES = (("unpaved", "unpaved"), ("paved", "paved"))
#: What a segment's cell that does not apply to its kind of flow shows, and why (TR-55 Chapter 3: sheet flow is
#: timed with Manning's n, shallow concentrated flow from its slope and surface).
NOT_USED = "—"
NOT_USED_WHY = {"roughness": "Shallow concentrated flow takes no Manning's n: its velocity follows from the slope "
                             "and the surface (TR-55 Figure 3-1)",
                "surface": "Sheet flow takes no surface: its roughness is Manning's n (TR-55 Table 3-1)"}


def _unit(units: UnitSystem, quantity: str, fallback: str = "") -> str:
    return pretty(units.label(quantity)) if quantity else fallback


def _shown(value, quantity: str, units: UnitSystem) -> str:
    if value is None:
        return ""
    return format_number(float(units.from_si(quantity, value)) if quantity else float(value))


class _Bad(ValueError):
    """An entry that is not a number: (field key, message)."""

    def __init__(self, key: str, message: str):
        super().__init__(message)
        self.key = key


def _read(text: str, quantity: str, units: UnitSystem, key: str, label: str, optional: bool = False):
    """SI value of a typed entry; _Bad in words where it is not a number."""
    if not text.strip():
        if optional:
            return None
        raise _Bad(key, f"{label} is needed.")
    try:
        shown = parse_number(text, percent_allowed=quantity == "slope")
    except UnclearNumber as exc:
        raise _Bad(key, str(exc)) from None
    except ValueError:
        raise _Bad(key, f"{label}: '{text.strip()}' is not a number.") from None
    return float(units.to_si(quantity, shown)) if quantity else shown


class _ItemDialog(QDialog):
    """The parts both dialogs share: a grid of labelled entries, a message line, OK and Cancel."""

    def __init__(self, title: str, units: UnitSystem, parent=None):
        super().__init__(parent)
        self.setWindowTitle(title)
        self.units = units
        self.entries: dict[str, QLineEdit] = {}
        self.labels: dict[str, tuple] = {}
        self.message = QLabel()
        self.message.setObjectName("fieldMessage")
        self.message.setWordWrap(True)
        self.message.hide()
        self.note = QLabel()
        self.note.setObjectName("hint")
        self.note.setWordWrap(True)
        self.note.hide()
        self.buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Ok | QDialogButtonBox.StandardButton.Cancel)
        self.buttons.accepted.connect(self.accept)
        self.buttons.rejected.connect(self.reject)
        self.ok = self.buttons.button(QDialogButtonBox.StandardButton.Ok)
        self.marked = ""
        self.markable: dict[str, QWidget] = {}      # other widgets an error may name (a table)
        # the values behind the texts shown, by (quantity, text): a text left as shown reads back as the value it
        # showed, not as its rounding (OK without a change changes nothing, in either unit system)
        self._behind: dict[tuple, set] = {}

    def shown(self, value, quantity: str) -> str:
        """``value`` [SI] as an entry or a cell shows it, in the dialog's units; the value is kept behind the text."""
        text = _shown(value, quantity, self.units)
        if value is not None:
            self._behind.setdefault((quantity, text), set()).add(float(value))
        return text

    def read(self, text: str, quantity: str, key: str, label: str, optional: bool = False):
        """The SI value of an entry or a cell: the value shown where its text is as shown (and shows that value
        alone), else the number typed (:func:`_read`)."""
        behind = self._behind.get((quantity, text.strip()), ())
        if len(behind) == 1:
            return next(iter(behind))
        return _read(text, quantity, self.units, key, label, optional)

    def entry(self, grid: QGridLayout, row: int, key: str, label: str, quantity: str, fallback: str = "",
              tip: str = "") -> QLineEdit:
        """A labelled entry with its unit in the label, on ``row`` of ``grid``."""
        unit = _unit(self.units, quantity, fallback)
        lab = QLabel(f"{label} [{unit}]" if unit else label)
        edit = QLineEdit()
        edit.setObjectName(key)
        edit.setAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        edit.setMinimumWidth(90)
        lab.setBuddy(edit)
        if tip:
            edit.setToolTip(tip)
            lab.setToolTip(tip)
        edit.textEdited.connect(lambda _t: self.check())
        grid.addWidget(lab, row, 0)
        grid.addWidget(edit, row, 1)
        self.entries[key] = edit
        self.labels[key] = (lab, quantity, label)
        return edit

    def value(self, key: str, optional: bool = False):
        _lab, quantity, label = self.labels[key]
        return self.read(self.entries[key].text(), quantity, key, label, optional)

    def show_value(self, key: str, value) -> None:
        self.entries[key].setText(self.shown(value, self.labels[key][1]))

    def refuse(self, key: str, message: str) -> None:
        """Show ``message``, mark the entry ``key`` names (when it is one of ours), disable OK."""
        for k, widget in {**self.entries, **self.markable}.items():
            set_invalid(widget, k == key)
        self.marked = key if key in self.entries or key in self.markable else ""
        self.message.setText(message)
        self.message.show()
        self.ok.setEnabled(False)

    def accept_all(self, note: str = "") -> None:
        for widget in {**self.entries, **self.markable}.values():
            set_invalid(widget, False)
        self.marked = ""
        self.message.clear()
        self.message.hide()
        self.note.setText(note)
        self.note.setVisible(bool(note))
        self.ok.setEnabled(True)


#: The core's names of a sub-area's values (inside ``sub-area.``) -> the dialog's entry (or table) to mark.
_CORE_FIELDS = {"area": "area", "runoff_coefficient": "runoff_coefficient", "land_covers": "landCovers",
                "time_of_concentration.value": "tc.value", "time_of_concentration.flow_length": "tc.flow_length",
                "time_of_concentration.slope": "tc.slope", "time_of_concentration.rain_2yr_24h": "tc.rain_2yr_24h"}


# -- a sub-area -----------------------------------------------------------------------------------------
class SubAreaDialog(_ItemDialog):
    """A sub-area: name, area, C typed or land covers (C weighted shown), and its own time of concentration."""

    def __init__(self, sub_area: SubAreaInput, units: UnitSystem, parent=None):
        super().__init__(f"Sub-area '{sub_area.name}'", units, parent)
        self.setObjectName("subAreaDialog")
        self.original = copy.deepcopy(sub_area)
        lay = QVBoxLayout(self)

        top = QGridLayout()
        top.setColumnStretch(1, 1)
        self.name = QLineEdit(sub_area.name)
        self.name.setObjectName("name")
        self.name.textEdited.connect(lambda _t: self.check())
        top.addWidget(QLabel("Name"), 0, 0)
        top.addWidget(self.name, 0, 1)
        self.entry(top, 1, "area", "Area", "drainage_area")
        lay.addLayout(top)

        # runoff coefficient: typed or land covers
        cbox = QGroupBox("Runoff coefficient C")
        cl = QVBoxLayout(cbox)
        self.c_how = QComboBox()
        self.c_how.setObjectName("cHow")
        self.c_how.addItem("Typed", "typed")
        self.c_how.addItem("Weighted over land covers", "covers")
        self.c_how.activated.connect(self._c_how_picked)
        cl.addWidget(self.c_how)
        cg = QGridLayout()
        cg.setColumnStretch(1, 1)
        self.entry(cg, 0, "runoff_coefficient", "C", "", "-", "Fraction of the rainfall that runs off, 0 to 1")
        cl.addLayout(cg)
        self.covers = QTableWidget(0, 3)
        self.covers.setObjectName("landCovers")
        self.covers.setHorizontalHeaderLabels(["Cover", f"Area [{_unit(units, 'drainage_area')}]", "C [-]"])
        self.covers.verticalHeader().setVisible(False)
        self.covers.horizontalHeader().setSectionResizeMode(0, QHeaderView.ResizeMode.Stretch)
        self.covers.horizontalHeader().setSectionResizeMode(1, QHeaderView.ResizeMode.ResizeToContents)
        self.covers.horizontalHeader().setSectionResizeMode(2, QHeaderView.ResizeMode.ResizeToContents)
        self.covers.setEditTriggers(QAbstractItemView.EditTrigger.AllEditTriggers)
        self.covers.setMinimumHeight(110)
        self.covers.itemChanged.connect(lambda _i: self.check())
        self.markable["landCovers"] = self.covers
        cover_buttons = QHBoxLayout()
        self.add_cover = QPushButton("Add cover")
        self.remove_cover = QPushButton("Delete cover")
        self.add_cover.clicked.connect(self._add_cover)
        self.remove_cover.clicked.connect(self._remove_cover)
        cover_buttons.addStretch(1)
        cover_buttons.addWidget(self.add_cover)
        cover_buttons.addWidget(self.remove_cover)
        self.weighted = QLabel()
        self.weighted.setObjectName("weightedC")
        self.cover_part = QWidget()
        cpl = QVBoxLayout(self.cover_part)
        cpl.setContentsMargins(0, 0, 0, 0)
        cpl.addWidget(self.covers)
        cpl.addLayout(cover_buttons)
        cpl.addWidget(self.weighted)
        cl.addWidget(self.cover_part)
        cl.addStretch(1)
        groups = QHBoxLayout()             # side by side: the dialog fits a low screen at 150 %
        groups.addWidget(cbox, 2)
        lay.addLayout(groups)

        # time of concentration
        tbox = QGroupBox("Its own time of concentration")
        tl = QVBoxLayout(tbox)
        self.tc_how = QComboBox()
        self.tc_how.setObjectName("tcMethod")
        for key, text in TC_METHODS:
            self.tc_how.addItem(text, key)
        self.tc_how.activated.connect(lambda _i: self._show_method())
        tl.addWidget(self.tc_how)
        self.typed_part, tg = self._part(tl)
        self.entry(tg, 0, "tc.value", "Time of concentration", "duration")
        self.kirpich_part, kg = self._part(tl)
        self.entry(kg, 0, "tc.flow_length", "Flow length L", "length", tip="Longest flow path of the sub-area")
        self.entry(kg, 1, "tc.slope", "Average slope", "slope", tip="As a ratio, or a percentage with %")
        self.tr55_part, rg = self._part(tl)
        self.entry(rg, 0, "tc.rain_2yr_24h", "2-year, 24-hour rainfall P2", "small_length")
        self.segments = QTableWidget(0, 5)
        self.segments.setObjectName("segments")
        L = _unit(units, "length")
        self.segments.setHorizontalHeaderLabels(["Flow", f"Length [{L}]", f"Slope [{_unit(units, 'slope')}]",
                                                 "n [-]", "Surface"])
        self.segments.horizontalHeaderItem(0).setToolTip("Sheet flow, or shallow concentrated flow (TR-55 Chapter 3)")
        self.segments.horizontalHeaderItem(3).setToolTip("Manning's n of sheet flow (TR-55 Table 3-1)")
        self.segments.verticalHeader().setVisible(False)
        self.segments.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.ResizeToContents)
        self.segments.horizontalHeader().setStretchLastSection(True)
        self.segments.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        self.segments.setMinimumHeight(110)
        self.segments.itemChanged.connect(lambda _i: self.check())
        self.markable["segments"] = self.segments
        rg.addWidget(self.segments, 1, 0, 1, 2)
        seg_buttons = QHBoxLayout()
        self.add_sheet = QPushButton("Add sheet flow")
        self.add_shallow = QPushButton("Add shallow flow")
        self.remove_segment = QPushButton("Delete segment")
        self.add_sheet.clicked.connect(lambda: self._add_segment({"kind": "sheet", "length": None, "slope": None,
                                                                  "roughness": None}))
        self.add_shallow.clicked.connect(lambda: self._add_segment({"kind": "shallow", "length": None,
                                                                    "slope": None, "surface": "unpaved"}))
        self.remove_segment.clicked.connect(self._remove_segment)
        seg_buttons.addStretch(1)
        for b in (self.add_sheet, self.add_shallow, self.remove_segment):
            seg_buttons.addWidget(b)
        rg.addLayout(seg_buttons, 2, 0, 1, 2)
        tl.addStretch(1)
        groups.addWidget(tbox, 3)
        lay.addWidget(self.message)
        lay.addWidget(self.note)
        lay.addStretch(1)
        lay.addWidget(self.buttons)

        self._load(sub_area)

    def _part(self, into: QVBoxLayout) -> tuple[QWidget, QGridLayout]:
        w = QWidget()
        g = QGridLayout(w)
        g.setContentsMargins(0, 0, 0, 0)
        g.setColumnStretch(1, 1)
        into.addWidget(w)
        return w, g

    # -- showing ------------------------------------------------------------------------------
    def _load(self, sa: SubAreaInput) -> None:
        self.show_value("area", sa.area)
        self.show_value("runoff_coefficient", sa.runoff_coefficient)
        self.c_how.setCurrentIndex(1 if sa.land_covers else 0)
        self.covers.blockSignals(True)
        for lc in sa.land_covers:
            self._cover_row(lc.cover, lc.area, lc.runoff_coefficient)
        self.covers.blockSignals(False)
        tc = sa.time_of_concentration
        method = tc.get("method", "typed")
        self.tc_how.setCurrentIndex([k for k, _t in TC_METHODS].index(method))
        self.show_value("tc.value", tc.get("value"))
        self.show_value("tc.flow_length", tc.get("flow_length"))
        self.show_value("tc.slope", tc.get("slope"))
        self.show_value("tc.rain_2yr_24h", tc.get("rain_2yr_24h"))
        self.segments.blockSignals(True)
        for seg in tc.get("segments", []):
            self._segment_row(seg)
        self.segments.blockSignals(False)
        self._c_how_picked()
        self._show_method()
        self._fit_segments()

    def _fit_segments(self) -> None:
        """The segment table as wide as its columns, so that no column hides behind a scroll bar."""
        self.segments.resizeColumnsToContents()
        header = self.segments.horizontalHeader()
        self.segments.setMinimumWidth(sum(max(header.sectionSize(j), header.sectionSizeHint(j))
                                          for j in range(self.segments.columnCount()))
                                      + 2 * self.segments.frameWidth()
                                      + self.segments.verticalScrollBar().sizeHint().width())

    def _cover_row(self, name: str, area, c) -> None:
        r = self.covers.rowCount()
        self.covers.insertRow(r)
        for j, text in enumerate((name, self.shown(area, "drainage_area"), self.shown(c, ""))):
            item = QTableWidgetItem(text)
            if j:
                item.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
            self.covers.setItem(r, j, item)

    def _segment_row(self, seg: dict) -> None:
        r = self.segments.rowCount()
        self.segments.insertRow(r)
        kind = QTableWidgetItem(dict(SEGMENT_KINDS)[seg["kind"]])
        kind.setData(Qt.ItemDataRole.UserRole, seg["kind"])
        kind.setFlags(kind.flags() & ~Qt.ItemFlag.ItemIsEditable)
        self.segments.setItem(r, 0, kind)
        for j, (key, quantity) in enumerate((("length", "length"), ("slope", "slope"), ("roughness", "")), 1):
            item = QTableWidgetItem(self.shown(seg.get(key), quantity))
            item.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
            if key == "roughness" and seg["kind"] != "sheet":
                self._not_used(item, "roughness")
            self.segments.setItem(r, j, item)
        if seg["kind"] == "shallow":
            box = QComboBox()
            for key, text in SURFACES:
                box.addItem(text, key)
            box.setCurrentIndex([k for k, _t in SURFACES].index(seg.get("surface") or "unpaved"))
            box.activated.connect(lambda _i: self.check())
            self.segments.setCellWidget(r, 4, box)
        else:
            self.segments.setItem(r, 4, self._not_used(QTableWidgetItem(), "surface"))

    @staticmethod
    def _not_used(item: QTableWidgetItem, key: str) -> QTableWidgetItem:
        """``item`` as a cell that does not apply to its segment's kind of flow: a dash, greyed, not editable, with
        the reason in its tooltip."""
        item.setText(NOT_USED)
        item.setToolTip(NOT_USED_WHY[key])
        item.setTextAlignment(Qt.AlignmentFlag.AlignCenter)
        item.setFlags(item.flags() & ~Qt.ItemFlag.ItemIsEditable & ~Qt.ItemFlag.ItemIsEnabled)
        return item

    def _c_how_picked(self, _index: int = 0) -> None:
        covers = self.c_how.currentData() == "covers"
        self.cover_part.setVisible(covers)
        for w in self.labels["runoff_coefficient"][0], self.entries["runoff_coefficient"]:
            w.setVisible(not covers)
        self.check()

    def _show_method(self) -> None:
        method = self.tc_how.currentData()
        self.typed_part.setVisible(method == "typed")
        self.kirpich_part.setVisible(method == "kirpich")
        self.tr55_part.setVisible(method == "tr55")
        self.check()

    def _add_cover(self) -> None:
        self.covers.blockSignals(True)
        self._cover_row(f"Cover {self.covers.rowCount() + 1}", None, None)
        self.covers.blockSignals(False)
        self.check()

    def _remove_cover(self) -> None:
        r = self.covers.currentRow()
        self.covers.removeRow(r if r >= 0 else self.covers.rowCount() - 1)
        self.check()

    def _add_segment(self, seg: dict) -> None:
        self.segments.blockSignals(True)
        self._segment_row(seg)
        self.segments.blockSignals(False)
        self._fit_segments()
        self.check()

    def _remove_segment(self) -> None:
        r = self.segments.currentRow()
        self.segments.removeRow(r if r >= 0 else self.segments.rowCount() - 1)
        self.check()

    # -- reading ------------------------------------------------------------------------------
    def _cell(self, table: QTableWidget, r: int, c: int) -> str:
        item = table.item(r, c)
        return item.text() if item is not None else ""

    def _time(self) -> dict:
        method = self.tc_how.currentData()
        if method == "typed":
            return {"method": "typed", "value": self.value("tc.value")}
        if method == "kirpich":
            return {"method": "kirpich", "flow_length": self.value("tc.flow_length"), "slope": self.value("tc.slope")}
        segments = []
        for r in range(self.segments.rowCount()):
            kind = self.segments.item(r, 0).data(Qt.ItemDataRole.UserRole)
            where = f"segment {r + 1}"
            seg = {"kind": kind,
                   "length": self.read(self._cell(self.segments, r, 1), "length", "segments",
                                       f"Length of {where}"),
                   "slope": self.read(self._cell(self.segments, r, 2), "slope", "segments", f"Slope of {where}")}
            # both keys, the one that does not apply to the kind of flow empty, as the project file holds them
            if kind == "sheet":
                seg["roughness"] = self.read(self._cell(self.segments, r, 3), "", "segments",
                                             f"Manning's n of {where}")
                seg["surface"] = None
            else:
                seg["roughness"], seg["surface"] = None, self.segments.cellWidget(r, 4).currentData()
            segments.append(seg)
        if not segments:
            raise _Bad("segments", "TR-55 needs at least one flow segment: add sheet or shallow flow.")
        return {"method": "tr55", "rain_2yr_24h": self.value("tc.rain_2yr_24h", optional=True),
                "segments": segments}

    def _covers(self) -> list:
        out = []
        for r in range(self.covers.rowCount()):
            where = f"land cover {r + 1}"
            out.append(LandCover(area=self.read(self._cell(self.covers, r, 1), "drainage_area", "landCovers",
                                                f"Area of {where}"),
                                 runoff_coefficient=self.read(self._cell(self.covers, r, 2), "", "landCovers",
                                                              f"C of {where}"),
                                 cover=self._cell(self.covers, r, 0).strip()))
        if not out:
            raise _Bad("landCovers", "Add at least one land cover, or type C.")
        return out

    def edited(self) -> SubAreaInput:
        """The sub-area as the dialog shows it (SI); _Bad where an entry is not a number."""
        sa = copy.deepcopy(self.original)
        name = self.name.text().strip()
        if not name:
            raise _Bad("name", "A sub-area needs a name.")
        sa.name = name
        sa.area = self.value("area")
        if self.c_how.currentData() == "covers":
            sa.runoff_coefficient, sa.land_covers = None, self._covers()
        else:
            sa.runoff_coefficient, sa.land_covers = self.value("runoff_coefficient"), []
        sa.time_of_concentration = self._time()
        return sa

    def check(self) -> bool:
        """Read the entries and let the core judge the sub-area; OK only while it takes it."""
        self.weighted.setText("")
        try:
            sa = self.edited()
        except _Bad as exc:
            self.refuse(exc.key, str(exc))
            return False
        if sa.land_covers:
            total = sum(lc.area for lc in sa.land_covers)
            if total > 0:
                c = sum(lc.area * lc.runoff_coefficient for lc in sa.land_covers) / total
                self.weighted.setText(f"C weighted by area: {c:.3f}")
        try:
            basis = sub_area_basis(sa, "sub-area")
        except hy.InputError as exc:
            inner = exc.field.removeprefix("sub-area.")
            key = "segments" if ".segments[" in f".{inner}" else _CORE_FIELDS.get(inner, "")
            self.refuse(key, f"{_worded_field(inner)}: {in_units(exc.message, self.units)}")
            return False
        if sa.land_covers:
            self.weighted.setText(f"C weighted by area: {basis.runoff_coefficient:.3f}")
        self.accept_all(" ".join(sentence(w[:1].upper() + w[1:]) for w in (in_units(w, self.units)
                                                                             for w in basis.warnings)))
        return True

    def result(self) -> SubAreaInput:
        return self.edited()


def _worded_field(inner: str) -> str:
    """``time_of_concentration.segments[0].length`` -> "time of concentration, segment 1, length"."""
    text = re.sub(r"segments\[(\d+)\]", lambda m: f"segment {int(m.group(1)) + 1}", inner)
    return text.replace(".", ", ").replace("_", " ")


# -- a section range --------------------------------------------------------------------------------------
class SectionDialog(_ItemDialog):
    """The shape, dimensions and ditch depth of a section range; a surveyed section is shown, not edited."""

    def __init__(self, run_section: RunSection, units: UnitSystem, parent=None):
        where = (f"stations {format_station(run_section.from_station, units)} to "
                 f"{format_station(run_section.to_station, units)}")
        super().__init__(f"Section, {where}", units, parent)
        self.setObjectName("sectionDialog")
        self.original = copy.deepcopy(run_section)
        lay = QVBoxLayout(self)
        self.stretch = QLabel(f"The ditch from {where}.")    # which range, also where no title bar shows it
        self.stretch.setObjectName("subheading")
        lay.addWidget(self.stretch)
        self.surveyed = run_section.section.get("shape") == "irregular"
        self.shape = QComboBox()
        self.shape.setObjectName("shape")
        for key, text in SHAPES:
            if key != "irregular" or self.surveyed:
                self.shape.addItem(text, key)
        self.shape.activated.connect(lambda _i: self._show_shape())
        head = QGridLayout()
        head.setColumnStretch(1, 1)
        head.addWidget(QLabel("Shape"), 0, 0)
        head.addWidget(self.shape, 0, 1)
        lay.addLayout(head)
        self.pages: dict[str, QWidget] = {}
        for shape, specs in SECTION_FIELDS.items():
            page = QWidget()
            g = QGridLayout(page)
            g.setContentsMargins(0, 0, 0, 0)
            g.setColumnStretch(1, 1)
            for r, spec in enumerate(specs):
                self.entry(g, r, f"{shape}.{spec.path.removeprefix('section.')}", spec.label, spec.quantity,
                           spec.unit_text, spec.tip)
            self.pages[shape] = page
            lay.addWidget(page)
        if self.surveyed:
            self.survey_note = QLabel("A surveyed section's stations, elevations and roughness are edited in the "
                                      "project file; only its ditch depth is edited here.")
            self.survey_note.setObjectName("hint")
            self.survey_note.setWordWrap(True)
            lay.addWidget(self.survey_note)
        depth = QGridLayout()
        depth.setColumnStretch(1, 1)
        self.entry(depth, 0, "ditch_depth", "Ditch depth as built", "length",
                   tip="Depth of the ditch from invert to the lower edge (empty only for a closed pipe)")
        lay.addLayout(depth)
        lay.addWidget(self.message)
        lay.addWidget(self.note)
        lay.addStretch(1)
        lay.addWidget(self.buttons)
        self._load(run_section)

    def _load(self, rs: RunSection) -> None:
        shape = rs.section.get("shape")
        self.shape.setCurrentIndex(self.shape.findData(shape))
        dims = dict(rs.section)
        if "side_slope" in dims:
            dims.setdefault("left_slope", dims["side_slope"])
            dims.setdefault("right_slope", dims["side_slope"])
        for key in self.entries:
            if "." in key:
                self.show_value(key, dims.get(key.split(".", 1)[1]))
        # dimensions the other shapes share with this one start at its values
        for key, edit in self.entries.items():
            if "." in key and not edit.text():
                same = [k for k in self.entries if k.endswith("." + key.split(".", 1)[1]) and self.entries[k].text()]
                if same:
                    edit.setText(self.entries[same[0]].text())
        self.show_value("ditch_depth", rs.ditch_depth)
        self._show_shape()

    def _show_shape(self) -> None:
        shape = self.shape.currentData()
        for key, page in self.pages.items():
            page.setVisible(key == shape)
        self.check()

    def edited(self) -> RunSection:
        rs = copy.deepcopy(self.original)
        shape = self.shape.currentData()
        if shape != "irregular":
            section = {"shape": shape}
            for spec in SECTION_FIELDS[shape]:
                key = spec.path.removeprefix("section.")
                section[key] = self.value(f"{shape}.{key}")
            rs.section = section
        rs.ditch_depth = self.value("ditch_depth", optional=True)
        return rs

    def check(self) -> bool:
        try:
            rs = self.edited()
        except _Bad as exc:
            self.refuse(exc.key, str(exc))
            return False
        shape = rs.section.get("shape")
        try:
            section = hy.section_from_dict(rs.section)
            if rs.ditch_depth is not None:
                hy.validate.positive("ditch_depth", rs.ditch_depth)
            elif section.full_depth is None:
                raise hy.InputError("ditch_depth", "is missing: an open ditch needs its depth as built")
        except hy.InputError as exc:
            key = "ditch_depth" if exc.field == "ditch_depth" else f"{shape}.{exc.field}"
            if exc.field == "side_slope":
                key = f"{shape}.left_slope"
            self.refuse(key, f"{exc.field.replace('_', ' ')}: {in_units(exc.message, self.units)}")
            return False
        self.accept_all()
        return True

    def result(self) -> RunSection:
        return self.edited()

