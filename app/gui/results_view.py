"""The results beside the picture: the verdict in words and colour, the numbers with units, cautions.

When the inputs are not usable the last good result stays, greyed, under a
note that says what to fix. While a new result is being computed the one
shown stays; a note says so when that takes long.

An edit usually changes only the numbers. Qt relays out the whole scrolling
column (wrapped texts measured again, scroll bars repainted) for any label whose
size may change, unless the label's size is fixed. So each value is a label of
fixed size, resized to its text only when the new text does not fit or leaves
much room. A wrapped text (the verdict's reason, the cautions) sits in a
:class:`WrappedText` box, which passes its label's change on to the column only
when the new text needs another height at the box's width (or other size
hints). Nothing is held at a size: a held text once kept the column wider than
the view when the vertical scroll bar came.
"""

from __future__ import annotations

from functools import lru_cache

from PySide6.QtCore import QEvent, Qt
from PySide6.QtWidgets import QFrame, QGridLayout, QLabel, QScrollArea, QVBoxLayout, QWidget

from hydraulics.provenance import NOT_VERIFIED_MARK, NOT_VERIFIED_TITLE
from hydraulics.units import UnitSystem
from hydraulics.wording import in_units

from ..channel_display import OPTIONAL_VALUES, Evaluation, panel_values
from ..results import PANEL_FIELDS, format_value
from .fields import keep_units_whole, number_marks, pretty

CAUTION = ("Results assist design only. Check them against the local drainage code and design manual; "
           "a licensed engineer must review and approve the design before it is built.")

#: What the panel lists, in reading order: (key, how it is labelled and formatted), the one list of app.results.
ROWS = tuple((f.key, f) for f in PANEL_FIELDS)
class ResultsPanel(QWidget):
    """Verdict, numbers and cautions in a scrolling column, with the design caution always in view below."""

    def __init__(self, parent=None):
        super().__init__(parent)
        self.scroll = QScrollArea()
        self.scroll.setWidgetResizable(True)
        self.scroll.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        self.scroll.setFrameShape(QFrame.Shape.NoFrame)
        body = QWidget()
        body.setObjectName("resultsBody")
        lay = QVBoxLayout(body)
        lay.setContentsMargins(12, 10, 12, 10)
        lay.setSpacing(10)

        self.verdict = QFrame()
        self.verdict.setObjectName("verdict")
        vl = QVBoxLayout(self.verdict)
        vl.setContentsMargins(12, 10, 12, 10)
        self.headline = QLabel("—")
        self.headline.setObjectName("verdictHeadline")
        self.reason = QLabel()
        self.reason.setObjectName("verdictReason")
        self.reason.setWordWrap(True)
        vl.addWidget(self.headline)
        vl.addWidget(WrappedText(self.reason))
        lay.addWidget(self.verdict)

        self.stale = QLabel()
        self.stale.setObjectName("staleNote")
        self.stale.setWordWrap(True)
        self.stale.hide()
        lay.addWidget(self.stale)
        self.updating = QLabel("Updating: shown are the results before your last change; the new ones are being "
                               "computed.")
        self.updating.setObjectName("staleNote")
        self.updating.setWordWrap(True)
        self.updating.hide()
        lay.addWidget(self.updating)

        self.numbers = QWidget()
        self.numbers.setObjectName("numbers")
        grid = QGridLayout(self.numbers)
        grid.setContentsMargins(0, 0, 0, 0)
        grid.setHorizontalSpacing(12)
        grid.setVerticalSpacing(3)
        grid.setColumnStretch(0, 1)
        self.values: dict[str, QLabel] = {}
        self.names: dict[str, QLabel] = {}
        for i, (key, f) in enumerate(ROWS):
            name = QLabel(f.label)
            self.names[key] = name
            value = QLabel("—")
            value.setObjectName(f"value_{key}")
            value.setAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
            value.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
            value.setFixedSize(value.sizeHint())
            grid.addWidget(name, i, 0)
            grid.addWidget(value, i, 1, Qt.AlignmentFlag.AlignRight)     # a fixed width: kept to the right
            self.values[key] = value
        lay.addWidget(self.numbers)

        heading = QLabel("Cautions for this channel")
        heading.setObjectName("subheading")
        lay.addWidget(heading)
        self.warnings = QLabel()
        self.warnings.setObjectName("warnings")
        self.warnings.setWordWrap(True)
        self.warnings.setTextFormat(Qt.TextFormat.RichText)
        lay.addWidget(WrappedText(self.warnings))
        # the one list of published values this result leans on that have not been read in the publication
        self.unverified_heading = QLabel(f"{NOT_VERIFIED_TITLE} ({NOT_VERIFIED_MARK})")
        self.unverified_heading.setObjectName("subheading")
        self.unverified_heading.setToolTip("Values recalled from the publication and not yet read in it; the "
                                           "sheet lists them too. Check each before relying on the result.")
        lay.addWidget(self.unverified_heading)
        self.unverified = QLabel()
        self.unverified.setObjectName("unverified")
        self.unverified.setWordWrap(True)
        self.unverified.setTextFormat(Qt.TextFormat.RichText)
        self.unverified.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        self.unverified_box = WrappedText(self.unverified)
        lay.addWidget(self.unverified_box)
        lay.addStretch(1)
        self.scroll.setWidget(body)

        self.caution = QLabel(CAUTION)
        self.caution.setObjectName("caution")
        self.caution.setWordWrap(True)
        outer = QVBoxLayout(self)
        outer.setContentsMargins(0, 0, 0, 8)
        outer.setSpacing(6)
        outer.addWidget(self.scroll, 1)
        cl = QVBoxLayout()
        cl.setContentsMargins(12, 0, 12, 0)
        cl.addWidget(self.caution)
        outer.addLayout(cl)
        self.setMinimumWidth(300)
        self.shown: Evaluation | None = None

    def show_evaluation(self, ev: Evaluation | None, units: UnitSystem, last_good: Evaluation | None = None,
                        complaint: str = "") -> None:
        """Show ``ev``; if it has no result (or ``complaint`` is set), show ``last_good`` greyed instead.
        ``ev`` None: the first result of these inputs is still being computed."""
        usable = ev is not None and ev.ok and not complaint
        shown = ev if usable else last_good
        verdict = ev.verdict if usable else None
        if usable:
            self._set_verdict(verdict.status, verdict.headline, pretty(verdict.reason))
            self.stale.hide()
        elif ev is None and not complaint:
            self._set_verdict("none", "Computing…", "The channel is being computed.")
            self.stale.hide()
        else:
            why = complaint or (ev is not None and ev.error) or "The inputs are incomplete."
            self._set_verdict("none", "No result for these inputs", pretty(why))
            self.stale.setText("Showing the last good result, greyed, until the inputs are usable again."
                               if shown is not None else "No result yet.")
            self.stale.show()
        self.numbers.setEnabled(usable)
        mark = number_marks()[0]      # the user's decimal mark, as the fields read numbers
        values = panel_values(shown, mark) if shown is not None and shown.ok else {}
        for key, f in ROWS:
            v = values.get(key)
            set_value_text(self.values[key], "—" if v is None else _pretty(format_value(v, f, units, mark)))
            applies = key not in OPTIONAL_VALUES or v is not None
            self.values[key].setVisible(applies)
            self.names[key].setVisible(applies)
        lin = shown.lining if shown is not None and shown.ok else None
        where = lin.governs if lin is not None and lin.verdict != "non-erodible" else ""
        self.names["permissible_shear"].setText(f"Permissible shear, {where}" if where else "Permissible shear")
        self.names["safety_factor"].setText(f"Safety factor, {where}" if where else "Safety factor")
        warnings = [in_units(w, units) for w in shown.warnings] if shown is not None else []
        if warnings:
            items = "".join(f"<li>{_escape(w[:1].upper() + w[1:])}.</li>" if not w.endswith(".")
                            else f"<li>{_escape(w[:1].upper() + w[1:])}</li>" for w in warnings)
            set_wrapped_text(self.warnings, f"<ul style='margin-left:-24px'>{items}</ul>")
        else:
            set_wrapped_text(self.warnings, "None from the checks made." if shown is not None else "—")
        self.warnings.setEnabled(usable)
        design = shown.design if shown is not None else None
        self.values["freeboard"].setToolTip(in_units(design.freeboard_rule(units), units) if design is not None
                                            else "")
        unverified = [in_units(line, units) for line in shown.not_verified] if shown is not None else []
        set_wrapped_text(self.unverified, f"<ul style='margin-left:-24px'>{''.join(f'<li>{_escape(u)}</li>' for u in unverified)}"
                                "</ul>" if unverified else "")
        self.unverified_box.setVisible(bool(unverified))
        self.unverified_heading.setVisible(bool(unverified))
        self.unverified.setEnabled(usable)
        self.shown = shown

    def set_updating(self, updating: bool) -> None:
        """Say that what is shown is being brought up to date (when that takes long)."""
        self.updating.setVisible(updating)

    def _set_verdict(self, status: str, headline: str, reason: str) -> None:
        if self.verdict.property("status") != status:    # the style sheet's colours follow; a polish relays out
            self.verdict.setProperty("status", status)
            for w in (self.verdict, self.headline, self.reason):
                w.style().unpolish(w)
                w.style().polish(w)
        self.headline.setText(headline)
        set_wrapped_text(self.reason, _keep_units_whole(reason))


def set_value_text(label: QLabel, text: str) -> None:
    """Show ``text`` in the fixed-size ``label``, sized anew only when the text does not fit or leaves more than
    two digits of room (so that typing does not relay out the panel)."""
    if text == label.text():
        return
    metrics = label.fontMetrics()
    margins = label.contentsMargins()
    need = metrics.horizontalAdvance(text) + 2 * label.margin() + margins.left() + margins.right() + 2
    room = metrics.horizontalAdvance("00")
    if not need <= label.width() <= need + 2 * room:
        label.setFixedWidth(need)          # the text's own width: the column is never held wider than it needs
    label.setText(text)
    label.sizeHint()     # lays the selectable text out now: laid out while painted, it would ask for a second paint


def set_wrapped_text(label: QLabel, text: str) -> None:
    """Show ``text`` in the word-wrapped ``label`` (unchanged text asks for no relayout; in a :class:`WrappedText`,
    a text of the same height neither)."""
    if text != label.text():
        label.setText(text)


class WrappedText(QWidget):
    """A box for one word-wrapped ``label`` that lets the column be laid out again only when the label's new text
    needs it.

    Qt lays the parent's layout out again after any new text of a label. This box has no layout: the label fills
    it, and a new text reaches the box as a layout request, which it passes on only when the label's size hints
    (its height at the box's width, its smallest and preferred sizes) have changed. The box reports the label's
    own hints and takes whatever width the column gives it: no size is held.
    """

    def __init__(self, label: QLabel, parent=None):
        super().__init__(parent)
        self.label = label
        label.setParent(self)
        self.setSizePolicy(label.sizePolicy())       # word wrap: height for width
        self._hints = None                          # the hints the column was last laid out with

    def _measure(self):
        label = self.label
        return label.sizeHint(), label.minimumSizeHint(), label.heightForWidth(self.width())

    def hasHeightForWidth(self) -> bool:
        return self.label.hasHeightForWidth()

    def heightForWidth(self, width: int) -> int:
        return self.label.heightForWidth(width)

    def sizeHint(self):
        return self.label.sizeHint()

    def minimumSizeHint(self):
        return self.label.minimumSizeHint()

    def resizeEvent(self, event) -> None:
        self.label.setGeometry(self.rect())
        self._hints = self._measure()               # what the column has just laid the box out with

    def showEvent(self, event) -> None:
        super().showEvent(event)
        self._hints = self._measure()               # changed while hidden: the column asks again when shown

    def event(self, event) -> bool:
        if event.type() == QEvent.Type.LayoutRequest:
            hints = self._measure()
            if hints != self._hints:
                self._hints = hints
                self.updateGeometry()               # another size: the column is laid out again
            return True
        return super().event(event)


# the same texts come again edit after edit (a value that did not change at its rounding, a caution): each is
# worded for the panel once
_pretty = lru_cache(maxsize=4096)(pretty)
_keep_units_whole = lru_cache(maxsize=1024)(keep_units_whole)


@lru_cache(maxsize=1024)
def _escape(text: str) -> str:
    return _keep_units_whole(text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;"))
