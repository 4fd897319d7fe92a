"""Form fields for numbers with units: the line edit, its unit suffix and its message, in one place.

A field shows an SI value in the project's unit system and reports what the
user types, converted back to SI, only when it is a number in the field's
allowed range. Otherwise it marks itself and says what is allowed, right under
the box; nothing is sent on.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from PySide6.QtCore import QEvent, QObject, Qt, Signal
from PySide6.QtGui import QKeySequence
from PySide6.QtWidgets import QGridLayout, QLabel, QLineEdit, QPlainTextEdit, QSizePolicy

from hydraulics import validate as hv
from hydraulics.units import UnitSystem

NO_UNIT = "–"
_SUPERSCRIPTS = str.maketrans({"2": "²", "3": "³"})


def pretty(text: str) -> str:
    """Unit labels as people write them: "m^3/s" -> "m³/s"."""
    out, i = [], 0
    while i < len(text):
        if text[i] == "^" and i + 1 < len(text) and text[i + 1] in "23":
            out.append(text[i + 1].translate(_SUPERSCRIPTS))
            i += 2
        else:
            out.append(text[i])
            i += 1
    return "".join(out)


def sentence(text) -> str:
    """``text`` ending in a full stop (unless it ends in one already, or in ! or ?)."""
    text = str(text).strip()
    return text if not text or text.endswith((".", "!", "?")) else text + "."


@dataclass(frozen=True)
class FieldSpec:
    path: str                   # the input in the channel, e.g. "slope", "section.bottom_width"
    label: str
    quantity: str = ""          # hydraulics.units quantity, "" for a pure number
    low: float | None = 0.0
    low_inclusive: bool = False
    high: float | None = None
    high_inclusive: bool = True
    optional: bool = False      # empty means "not given"
    tip: str = ""
    unit_text: str = ""         # suffix for a pure number ("H:V"); NO_UNIT when empty

    def suffix(self, units: UnitSystem) -> str:
        if self.quantity:
            return pretty(units.label(self.quantity))
        return self.unit_text or NO_UNIT

    def to_si(self, value: float, units: UnitSystem) -> float:
        return float(units.to_si(self.quantity, value)) if self.quantity else value

    def from_si(self, value: float, units: UnitSystem) -> float:
        return float(units.from_si(self.quantity, value)) if self.quantity else value

    def allowed(self, units: UnitSystem) -> str:
        """The allowed range in words, in the shown units."""
        unit = "" if not self.quantity or self.quantity == "slope" else f" {pretty(units.label(self.quantity))}"
        parts = []
        if self.low is not None:
            parts.append(f"{'≥' if self.low_inclusive else '>'} {self.from_si(self.low, units):g}{unit}")
        if self.high is not None:
            parts.append(f"{'≤' if self.high_inclusive else '<'} {self.from_si(self.high, units):g}{unit}")
        text = " and ".join(parts) if parts else "any number"
        return text + (" (or empty)" if self.optional else "")


def format_number(value: float) -> str:
    """Up to five significant digits, no trailing zeros, no exponent for everyday sizes."""
    if value == 0:
        return "0"
    text = f"{value:.5g}"
    if "e" in text and 1e-5 <= abs(value) < 1e7:
        text = f"{value:.8f}".rstrip("0").rstrip(".")
    return text


def parse_number(text: str, percent_allowed: bool = False) -> float:
    """A typed number; accepts a decimal comma, and "0.5 %" where a percentage makes sense."""
    t = text.strip().replace(" ", "")
    scale = 1.0
    if percent_allowed and t.endswith("%"):
        t, scale = t[:-1], 0.01
    if "," in t and "." not in t:
        t = t.replace(",", ".")
    value = float(t) * scale
    if not math.isfinite(value):
        raise ValueError(text)
    return value


class _UndoGoesToWindow:
    """Mixin for text widgets: Ctrl+Z and Ctrl+Shift+Z reach the window's undo history, not the widget's own."""

    def event(self, event):
        if event.type() == QEvent.Type.ShortcutOverride and (
                event.matches(QKeySequence.StandardKey.Undo) or event.matches(QKeySequence.StandardKey.Redo)):
            event.ignore()
            return True
        return super().event(event)


class LineEdit(_UndoGoesToWindow, QLineEdit):
    """A line edit that leaves undo and redo to the window's undo history."""


class NotesEdit(_UndoGoesToWindow, QPlainTextEdit):
    """Several lines of free text, handed on when the box loses focus (one undoable edit per visit).

    Like :class:`LineEdit` it leaves undo and redo to the window's history.
    """

    editingFinished = Signal()

    def focusOutEvent(self, event):
        super().focusOutEvent(event)
        self.editingFinished.emit()

    def show_text(self, text: str, force: bool = False) -> None:
        """Show ``text`` unless the user is typing in the box (then only when forced)."""
        if self.toPlainText() != text and (force or not self.hasFocus()):
            self.setPlainText(text)


def set_invalid(widget, invalid: bool) -> None:
    """Mark a widget (the style sheet draws ``[invalid="true"]`` in red).

    The state is kept on the Python side as well: reading an unset dynamic
    property back with ``QObject.property`` returns None and, in PySide6 6.12,
    takes a reference from None each time, which ends in a crash after a few
    thousand calls. Nothing here reads Qt properties back.
    """
    if is_invalid(widget) != invalid:
        widget._invalid_mark = invalid
        widget.setProperty("invalid", invalid)
        widget.style().unpolish(widget)
        widget.style().polish(widget)


def is_invalid(widget) -> bool:
    return bool(getattr(widget, "_invalid_mark", False))


class NumberField(QObject):
    """Label, line edit, unit suffix and message for one number; ``place`` puts them in a grid."""

    edited = Signal(object)   # SI value (float, or None for an empty optional field)
    invalid = Signal(str)     # the reason, when what was typed is refused

    def __init__(self, spec: FieldSpec, parent=None):
        super().__init__(parent)
        self.spec = spec
        self.units: UnitSystem | None = None
        self.value = None          # last SI value shown or accepted
        self.session = 0           # bumps when the user leaves the box: typing in one visit is one edit
        self.label = QLabel(spec.label)
        self.edit = LineEdit()
        self.edit.setObjectName(spec.path)
        self.edit.setAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        self.edit.setSizePolicy(QSizePolicy.Policy.Expanding, QSizePolicy.Policy.Fixed)
        self.edit.setMinimumWidth(80)
        self.label.setBuddy(self.edit)
        self.suffix = QLabel()
        self.suffix.setObjectName("unitSuffix")
        self.suffix.setMinimumWidth(48)
        self.message = QLabel()
        self.message.setObjectName("fieldMessage")
        self.message.setWordWrap(True)
        self.message.hide()
        if spec.tip:
            self.edit.setToolTip(spec.tip)
            self.label.setToolTip(spec.tip)
        self.edit.textEdited.connect(self._typed)
        self.edit.editingFinished.connect(self._left)

    def place(self, grid: QGridLayout, row: int) -> int:
        """Put the field on ``row`` (and its message on the next); returns the next free row."""
        grid.addWidget(self.label, row, 0)
        grid.addWidget(self.edit, row, 1)
        grid.addWidget(self.suffix, row, 2)
        grid.addWidget(self.message, row + 1, 1, 1, 2)
        return row + 2

    def set_visible(self, visible: bool) -> None:
        for w in (self.label, self.edit, self.suffix):
            w.setVisible(visible)
        self.message.setVisible(visible and bool(self.error))

    @property
    def error(self) -> str:
        return self.message.text() if is_invalid(self.edit) else ""

    # -- showing -------------------------------------------------------------------
    def show_value(self, value, units: UnitSystem, force: bool = False) -> None:
        """Show an SI value. Keeps what the user typed when it already means this value."""
        units_changed = units is not self.units
        self.units = units
        self.suffix.setText(self.spec.suffix(units))
        self.value = value
        if not force and not units_changed and not self.error and self._text_means(value):
            return
        self.edit.setText("" if value is None else format_number(self.spec.from_si(value, units)))
        self.clear_error()

    def _text_means(self, value) -> bool:
        try:
            typed = self.parse(self.edit.text())
        except ValueError:
            return False
        if typed is None or value is None:
            return typed is value
        return math.isclose(typed, value, rel_tol=5e-5, abs_tol=1e-12)

    def set_error(self, text: str) -> None:
        self.message.setText(text)
        self.message.setVisible(not self.edit.isHidden())
        set_invalid(self.edit, True)

    def clear_error(self) -> None:
        set_invalid(self.edit, False)
        self.message.clear()
        self.message.hide()

    # -- reading ---------------------------------------------------------------------
    def parse(self, text: str):
        """SI value of ``text``; ValueError with the reason in words."""
        spec, units = self.spec, self.units
        if not text.strip():
            if spec.optional:
                return None
            raise ValueError(f"{spec.label} is needed: enter a number {spec.allowed(units)}.")
        try:
            shown = parse_number(text, percent_allowed=spec.quantity == "slope")
        except ValueError:
            raise ValueError(f"'{text.strip()}' is not a number. {spec.label}: {spec.allowed(units)}.") from None
        low, high = spec.low, spec.high
        value = spec.to_si(shown, units)
        if low is not None and (value < low or (value == low and not spec.low_inclusive)) or \
           high is not None and (value > high or (value == high and not spec.high_inclusive)):
            raise ValueError(f"{spec.label} must be {spec.allowed(units)}; {text.strip()} is outside.")
        limit = hv.limit_for(spec.path.rsplit(".", 1)[-1])   # the design range shared with files and CLI
        if limit is not None and not limit.holds(value):
            raise ValueError(f"{spec.label} must be {limit.describe(units)}; {text.strip()} is outside.")
        return value

    def _typed(self, text: str) -> None:
        try:
            value = self.parse(text)
        except ValueError as exc:
            self.set_error(str(exc))
            self.invalid.emit(str(exc))
            return
        self.clear_error()
        self.edited.emit(value)

    def _left(self) -> None:
        self.session += 1

    @property
    def merge_key(self):
        return (self.spec.path, id(self), self.session)
