"""Windows that fit the screen they open on: sized to its free area, tall forms in a scroll area.

A laptop of 1366x768 at 150 % scaling leaves Qt a logical screen of about
911x512, less the desktop's panel and the window's title bar; a dialog laid
out for a large screen would put its buttons below the edge. Every window
and dialog of Ditchwright takes its first size from :func:`fit_to_screen`,
and a form that can be taller than the screen sits in :func:`scrolling`, with
the dialog's buttons outside the scroll area so that they stay in view. A view
of three columns (inputs, picture, results) takes two below
``TWO_COLUMNS_BELOW`` (:class:`SideTabs`).
"""

from __future__ import annotations

from PySide6.QtCore import QEvent, QRect, QSize, Qt
from PySide6.QtGui import QGuiApplication
from PySide6.QtWidgets import QBoxLayout, QFrame, QGridLayout, QScrollArea, QSplitter, QTabWidget, QWidget

#: Logical pixels kept free above a window for the title bar the window manager adds (an allowance; title
#: bars are 24 to 32 px on the common desktops at 100 %, and Qt's logical pixels scale with them).
TITLE_BAR = 30
#: Below this width [logical px] a view has two columns, not three: the inputs and the results share the left
#: one as two tabs, so that the picture keeps the room (1366 px at 150 % scaling, 911 logical px, would leave
#: each of three columns too narrow to read). The three columns need about 360 + 480 + 280.
TWO_COLUMNS_BELOW = 1120


def free_area(widget: QWidget) -> QRect:
    """The part of the screen ``widget`` is on (its parent's, before it is shown) that a window's inside may
    take: the screen's available area (the desktop's panels left out) less a title bar."""
    parent = widget.parentWidget()
    screen = (parent.window().screen() if parent is not None else None) or widget.screen() \
        or QGuiApplication.primaryScreen()
    a = screen.availableGeometry()
    return QRect(a.x(), a.y() + TITLE_BAR, a.width(), max(a.height() - TITLE_BAR, 1))


def fit_to_screen(window: QWidget, width: int, height: int) -> QSize:
    """Resize ``window`` to ``width`` x ``height`` [logical px], or less where its screen has less room;
    returns the size given. The window's minimum size is lowered to the room as well, so that the window
    manager never has to place it partly off the screen."""
    room = free_area(window).size()
    w, h = min(width, room.width()), min(height, room.height())
    minimum = window.minimumSize()
    if minimum.width() > room.width() or minimum.height() > room.height():
        window.setMinimumSize(min(minimum.width(), room.width()), min(minimum.height(), room.height()))
    window.resize(w, h)
    return QSize(w, h)


def scrolling(body: QWidget, horizontal: bool = False) -> QScrollArea:
    """``body`` in a frameless scroll area that scrolls up and down (and sideways if ``horizontal``), for a form
    that may be taller than the screen. The body is given the viewport's size, or its least size when that is
    larger (Qt's own resizing gives a form with wrapped text its preferred height, scrolling a dialog that would
    fit); the area asks for the body's whole size when there is room."""
    area = _FormScroll(horizontal)
    area.setObjectName("formScroll")
    area.setFrameShape(QFrame.Shape.NoFrame)
    area.setWidget(body)
    return area


def least_height(body: QWidget, width: int) -> int:
    """The least height [logical px] of ``body`` at ``width``: its layout's least height for that width where
    the layout has wrapped text, else its least size."""
    lay = body.layout()
    least = body.minimumSizeHint().height()
    if isinstance(lay, (QBoxLayout, QGridLayout)) and lay.hasHeightForWidth():
        least = max(least, lay.minimumHeightForWidth(width))
    return max(least, body.minimumHeight())


class _FormScroll(QScrollArea):
    """A scroll area that sizes its form itself (see :func:`scrolling`)."""

    def __init__(self, horizontal: bool):
        super().__init__()
        self.horizontal = horizontal
        self.setWidgetResizable(False)
        if not horizontal:
            self.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)

    def setWidget(self, body: QWidget) -> None:
        super().setWidget(body)
        body.installEventFilter(self)

    def eventFilter(self, watched, event) -> bool:
        if watched is self.widget() and event.type() == QEvent.Type.LayoutRequest:
            self.place()
        return super().eventFilter(watched, event)

    def resizeEvent(self, event) -> None:
        super().resizeEvent(event)
        self.place()

    def place(self) -> None:
        """Give the form the viewport's room, or its least size where the room is smaller."""
        body = self.widget()
        if body is None:
            return
        room = self.maximumViewportSize()           # the viewport without scroll bars
        bar_w = self.verticalScrollBar().sizeHint().width()
        bar_h = self.horizontalScrollBar().sizeHint().height()
        least_w = body.minimumSizeHint().width()
        width = max(room.width(), least_w) if self.horizontal else room.width()
        height = least_height(body, width)
        if height > room.height():                  # a scroll bar down the side takes from the width
            width = max(room.width() - bar_w, least_w) if self.horizontal else room.width() - bar_w
            height = least_height(body, width)
        across = width > room.width() - (bar_w if height > room.height() else 0)
        body.resize(width, max(height, room.height() - (bar_h if across else 0)))

    def sizeHint(self) -> QSize:
        body = self.widget()
        if body is None:
            return super().sizeHint()
        hint = body.sizeHint()
        return QSize(hint.width() + self.verticalScrollBar().sizeHint().width(), hint.height())

    def minimumSizeHint(self) -> QSize:
        body = self.widget()
        if body is None or self.horizontal:
            return super().minimumSizeHint()
        bar = self.verticalScrollBar().sizeHint().width()
        return QSize(body.minimumSizeHint().width() + bar, min(body.minimumSizeHint().height(), 80))


class SideTabs(QTabWidget):
    """The narrow window's left column: a view of three columns in ``splitter`` (the inputs, in their own splitter
    or in ``splitter`` itself, then the picture, then ``results``) takes two below ``TWO_COLUMNS_BELOW``. These
    tabs take the inputs' place and hold the inputs and the results; the results' tab says the verdict
    (``results.headline``), so that it is in view while the inputs are. Only where the panels sit changes.

    ``wide``: the shares of the width the first two columns take when there are three again."""

    def __init__(self, splitter: QSplitter, inputs: QScrollArea, results: QWidget, wide=(0.28, 0.48),
                 name: str = "sideTabs"):
        super().__init__()
        self.setObjectName(name)
        self.setDocumentMode(True)
        self.hide()
        self.splitter, self.inputs, self.results, self.wide = splitter, inputs, results, wide
        self.two_columns = False
        self._home: tuple[QSplitter, int] | None = None     # the inputs' splitter and place, while here
        self._results_at = splitter.indexOf(results)

    def follow(self, width: int) -> None:
        """Two columns or three for a view ``width`` logical px wide."""
        self.arrange(width < TWO_COLUMNS_BELOW, width)

    def arrange(self, two_columns: bool, width: int) -> None:
        if two_columns == self.two_columns:
            return
        self.two_columns = two_columns
        inputs, results, splitter = self.inputs, self.results, self.splitter
        if two_columns:
            holder = inputs.parentWidget()
            self._home = (holder, holder.indexOf(inputs))
            self.setSizePolicy(inputs.sizePolicy())          # its stretch in the inputs' splitter
            holder.replaceWidget(self._home[1], self)
            self.addTab(inputs, "Inputs")
            self.addTab(results, "Results")
            self.show()
            inputs.show()
            self.show_verdict()
            form = inputs.widget().sizeHint().width() + inputs.verticalScrollBar().sizeHint().width() + 8
            left = max(splitter.widget(0).minimumSizeHint().width(), min(form, int(0.45 * width)))
            splitter.setSizes([left, width - left])
        else:
            holder, at = self._home
            self.clear()                                      # the pages stay children of the tabs till moved
            holder.replaceWidget(at, inputs)
            splitter.insertWidget(self._results_at, results)
            splitter.setStretchFactor(self._results_at, 0)
            self.setParent(None)
            self.hide()
            inputs.show()
            results.show()
            first, second = (int(width * share) for share in self.wide)
            splitter.setSizes([first, second, width - first - second])

    def show_verdict(self) -> None:
        """The results' tab says the verdict shown."""
        i = self.indexOf(self.results)
        if i >= 0:
            self.setTabText(i, f"Results: {self.results.headline.text()}")


__all__ = ["TITLE_BAR", "TWO_COLUMNS_BELOW", "free_area", "fit_to_screen", "scrolling", "least_height", "SideTabs"]
