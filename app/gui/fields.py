"""Form fields for numbers with units: the line edit, its unit suffix and its message, in one place.

A field shows an SI value in the project's unit system and reports what the
user types, converted back to SI, only when it is a number in the field's
allowed range. Otherwise it marks itself and says what is allowed, right under
the box; nothing is sent on.
"""

from __future__ import annotations

import html
import math
import re

from PySide6.QtCore import QEvent, QLocale, QObject, Qt, Signal
from PySide6.QtGui import QKeySequence
from PySide6.QtWidgets import QGridLayout, QLabel, QLineEdit, QPlainTextEdit, QSizePolicy

from hydraulics.units import UnitSystem

from ..inputs import Input, pretty

_JOIN = "\u2060"      # word joiner: no line break here
_NBSP = "\u00a0"


def _unit_pattern():
    from hydraulics.units import US, SI
    labels = {pretty(u.label(q)) for u in (US, SI) for q in u.units if u.label(q)} | {"in", "mm", "min", "%"}
    alternatives = "|".join(re.escape(x) for x in sorted(labels, key=len, reverse=True))
    return re.compile(rf"(?<=\d) (?=(?:{alternatives})(?![\w/]))")


def keep_units_whole(text: str) -> str:
    """``text`` for a label that wraps: a unit stays on the line of its number and is never split at its
    slash ("2.37 lb/ft²" does not become "2.37 lb/" and "ft²")."""
    global _UNIT_SPACE
    if _UNIT_SPACE is None:
        _UNIT_SPACE = _unit_pattern()
    text = _SIZE_NAME.sub(r"\1" + _NBSP, _UNIT_SPACE.sub(_NBSP, text))
    return _SLASH_IN_UNIT.sub(_JOIN + "/" + _JOIN, text)


_UNIT_SPACE = None
_SLASH_IN_UNIT = re.compile(r"(?<=[A-Za-z²³$])/(?=[A-Za-z])")
_SIZE_NAME = re.compile(r"\b(D(?:50|75|100)) (?=\d)")     # "D50 150 mm" stays together


def sentence(text) -> str:
    """``text`` ending in a full stop (unless it ends in one already, or in ! or ?)."""
    text = str(text).strip()
    return text if not text or text.endswith((".", "!", "?")) else text + "."


def format_number(value: float, locale: QLocale | None = None) -> str:
    """Up to five significant digits, no trailing zeros, no exponent for everyday sizes.

    The decimal mark is that of ``locale`` (the user's, by default), so that
    what a field shows reads back as the same number; no group separators.
    This is the text of an editable value (an input, an offered reading), kept
    near full precision on purpose: results are rounded by the one rule of
    :mod:`app.results` instead.
    """
    if value == 0:
        return "0"
    text = f"{value:.5g}"
    if "e" in text and 1e-5 <= abs(value) < 1e7:
        text = f"{value:.8f}".rstrip("0").rstrip(".")
    return text.replace(".", _locale(locale).decimalPoint())


class UnclearNumber(ValueError):
    """A typed number that the user's number format does not read one way only; the message gives the readings."""


class BeyondReach(UnclearNumber):
    """A typed number far beyond any design value: in SI it could pass the largest float (1e308 acres is infinite
    in square metres), so it is refused where it is typed, as every entry refuses what it cannot read."""


#: Largest size of a typed number: far above any design value in any unit, far below the largest float after any
#: conversion of units (common practice: a guard of the arithmetic, not a design range).
LARGEST_TYPED = 1e100


_MINUS = str.maketrans({"\u2212": "-", "\u2013": "-"})
_OTHER_MARK = {".": ",", ",": "."}


def _locale(locale: QLocale | None) -> QLocale:
    return locale if locale is not None else QLocale()


def number_marks(locale: QLocale | None = None) -> tuple[str, str]:
    """(decimal mark, group separator) of ``locale`` (the user's, by default): what the window writes its
    results with, so that they read as the numbers the fields take."""
    loc = _locale(locale)
    return loc.decimalPoint(), loc.groupSeparator()


def locale_description(locale: QLocale | None = None) -> str:
    """The number format in words, with an example: "the English (United States) format, as in 1,234.5"."""
    loc = _locale(locale)
    example = loc.toString(1234.5, "f", 1)
    if loc.language() == QLocale.Language.C:
        return f"the plain number format, as in {example}"
    name = QLocale.languageToString(loc.language())
    if loc.territory() != QLocale.Country.AnyTerritory:
        name += f" ({QLocale.territoryToString(loc.territory())})"
    return f"the {name} number format, as in {example}"


def _read(text: str, mark: str, group: str, check_group) -> float | None:
    """``text`` as a number with decimal ``mark`` and ``group`` separators (None: not of this form).

    ``check_group(integer_digits, typed_integer_part)`` says whether the group separators sit where they belong.
    """
    m = re.fullmatch(rf"([+-]?)(\d[\d{re.escape(group)}]*)?(?:{re.escape(mark)}(\d*))?([eE][+-]?\d+)?", text)
    if m is None:
        return None
    sign, whole, frac, exp = m.group(1), m.group(2) or "", m.group(3) or "", m.group(4) or ""
    if not (whole or frac) or whole.endswith(group):
        return None
    digits = whole.replace(group, "")
    if group in whole and not check_group(digits, whole):
        return None
    value = float(f"{sign}{digits or '0'}.{frac or '0'}{exp}")
    return value if math.isfinite(value) else None


def parse_number(text: str, percent_allowed: bool = False, locale: QLocale | None = None) -> float:
    """A typed number, read by the user's number format (``locale``, the default QLocale when None).

    The locale's decimal mark and its group separators, where they belong
    (en_US: "1,200.5"; de_DE: "1.200,5"), are accepted. An entry that the
    format does not read, but that would be a number with the other decimal
    mark or with the separators moved ("1,20" in en_US: 1.2 or 120?), raises
    :class:`UnclearNumber` whose message names each reading: nothing is
    guessed. Any other text raises ValueError. "0.5 %" reads as 0.005 where a
    percentage makes sense.
    """
    loc = _locale(locale)
    mark, group = loc.decimalPoint(), loc.groupSeparator()
    t = text.strip().translate(_MINUS)
    if group.isspace():   # French and others group with a (narrow) no-break space: any space will do
        t = re.sub(r"\s+", group, t)
    else:
        t = re.sub(r"\s+", "", t)
    scale = 1.0
    if percent_allowed and t.endswith(("%", loc.percent())):
        t, scale = t[:-1].rstrip(group if group.isspace() else " "), 0.01

    def locale_grouping(digits, whole):
        return len(digits) <= 18 and loc.toString(int(digits)) == whole

    value = _read(t, mark, group, locale_grouping)
    if value is not None:
        if not abs(value) <= LARGEST_TYPED:
            raise BeyondReach(f"'{text.strip()}' is beyond any design value (at most {LARGEST_TYPED:g} in size).")
        return value * scale
    readings = []
    other = _OTHER_MARK.get(mark)
    if other is not None and other in t:
        thousands = re.compile(r"\d{1,3}(?:" + re.escape(mark) + r"\d{3})*")
        v = _read(t, other, mark, lambda d, w: thousands.fullmatch(w) is not None)
        if v is not None:
            readings.append((v, f"the {_mark_name(other)} as a decimal mark"))
    if group and group in t:
        v = _read(t, mark, group, lambda d, w: not (len(d) > 1 and d.startswith("0")) and group * 2 not in w)
        if v is not None:
            readings.append((v, f"the {_mark_name(group)} between thousands"))
    readings = [r for i, r in enumerate(readings) if all(r[0] != q[0] for q in readings[:i])]
    if not readings:
        raise ValueError(text)
    shown = [f"{format_number(v * scale, loc)} ({why})" for v, why in readings]
    what = (f"could mean {' or '.join(shown)}" if len(shown) > 1
            else f"reads as {shown[0]} only in another number format")
    raise UnclearNumber(f"'{text.strip()}' {what}. Numbers are read in {locale_description(loc)}: "
                        f"type the number in that form.")


def _mark_name(mark: str) -> str:
    return {",": "comma", ".": "point", "'": "apostrophe"}.get(mark, "space" if mark.isspace() else f"'{mark}'")


class LooksLikePercent(ValueError):
    """A slope typed as a ratio above 1 that reads well as a percentage; ``reading`` is that ratio."""

    def __init__(self, message: str, reading: float):
        super().__init__(message)
        self.reading = reading


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


def message_line() -> QLabel:
    """The line under an input that says why an entry was refused (hidden while there is nothing to say)."""
    label = QLabel()
    label.setObjectName("fieldMessage")
    label.setWordWrap(True)
    label.hide()
    return label


def typed_number(text: str, what: str) -> float:
    """The number typed in ``text`` (the user's number format); ValueError naming ``what`` when it is none."""
    try:
        return parse_number(text)
    except UnclearNumber as exc:
        raise ValueError(f"{what}: {exc}") from None
    except ValueError:
        raise ValueError(f"{what}: '{text.strip()}' is not a number.") from None


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

    def __init__(self, spec: Input, parent=None):
        super().__init__(parent)
        self.spec = spec
        self.units: UnitSystem | None = None
        self.value = None          # last SI value shown or accepted
        self.session = 0           # bumps when the user leaves the box: typing in one visit is one edit
        self.touched = False       # the user typed here since the channel was shown
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
        self.message = message_line()
        self.message.setTextFormat(Qt.TextFormat.RichText)
        self.message.linkActivated.connect(self._use_reading)
        self._error = ""
        self.offered = None        # a reading the message offers (a slope typed as a percentage), or None
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
        return self._error if is_invalid(self.edit) else ""

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

    def set_error(self, text: str, offer: float | None = None) -> None:
        """Show why the entry is refused; ``offer`` adds a link that enters that value (in the shown units)."""
        self._error, self.offered = text, offer
        shown = html.escape(text)
        if offer is not None:
            percent = f" ({format_number(offer * 100)} %)" if self.spec.quantity == "slope" else ""
            shown += f' <a href="use">Use {html.escape(format_number(offer) + percent)}</a>'
        self.message.setText(shown)
        self.message.setVisible(not self.edit.isHidden())
        set_invalid(self.edit, True)

    def clear_error(self) -> None:
        set_invalid(self.edit, False)
        self._error, self.offered = "", None
        self.message.clear()
        self.message.hide()

    def _use_reading(self, _link: str = "") -> None:
        """The user took the offered reading: enter it as if typed (one undoable edit)."""
        if self.offered is not None:
            text = format_number(self.offered)
            self.edit.setText(text)
            self._typed(text)

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
        except UnclearNumber as exc:
            raise ValueError(str(exc)) from None
        except ValueError:
            raise ValueError(f"'{text.strip()}' is not a number. {spec.label}: {spec.allowed(units)}.") from None
        high = spec.high
        value = spec.to_si(shown, units)
        typed = text.strip()
        if spec.quantity == "slope" and high is not None and 1 < shown <= 100 and not typed.endswith("%"):
            raise LooksLikePercent(
                f"{spec.label} is a ratio ({spec.suffix(units)}), at most {format_number(high)}; {typed} would be a "
                f"grade of {format_number(shown)} to 1. If you meant {typed} %, that is {format_number(shown / 100)} "
                f"(or type {typed} %).", shown / 100)
        if not spec.holds(value):
            raise ValueError(f"{spec.label} must be {spec.allowed(units)}; {text.strip()} is outside.")
        limit = spec.limit   # the design range shared with files and CLI
        if limit is not None and not limit.holds(value):
            raise ValueError(f"{spec.label} must be {limit.describe(units)}; {text.strip()} is outside.")
        return value

    def _typed(self, text: str) -> None:
        self.touched = True
        try:
            value = self.parse(text)
        except LooksLikePercent as exc:
            self.set_error(str(exc), offer=exc.reading)
            self.invalid.emit(str(exc))
            return
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
