"""The results panel's labels keep their size while only the numbers change (app.gui.results_view), so that an edit
does not lay the panel out again, yet every text stays whole."""

from PySide6.QtCore import QEvent, QObject
from PySide6.QtWidgets import QLabel, QVBoxLayout, QWidget

from app.gui import results_view as rv
from waiting import evaluated
from window_typing import field, type_into


class LayoutRequests(QObject):
    """Counts the layout requests that reach ``widget``."""

    def __init__(self, widget):
        super().__init__(widget)
        self.count = 0
        widget.installEventFilter(self)

    def eventFilter(self, watched, event):
        if event.type() == QEvent.Type.LayoutRequest:
            self.count += 1
        return False


def test_a_value_keeps_its_size_while_its_text_fits_and_grows_when_it_does_not(qtbot):
    box = QWidget()
    qtbot.addWidget(box)
    label = QLabel("—")
    QVBoxLayout(box).addWidget(label)
    label.setFixedSize(label.sizeHint())
    box.show()
    rv.set_value_text(label, "0.312 m")
    size = label.size()
    assert label.width() >= label.sizeHint().width()
    rv.set_value_text(label, "0.318 m")                      # the same digits: the same size
    assert label.size() == size and label.text() == "0.318 m"
    rv.set_value_text(label, "12,345.678 m³/s")              # longer: sized anew, whole
    assert label.width() > size.width() and label.width() >= label.sizeHint().width()
    rv.set_value_text(label, "1 m")                         # much shorter: no room left idle
    assert label.width() < size.width()


def test_the_column_never_runs_wider_than_its_view(demo_window, qtbot):
    """Whatever channel is shown and whether or not the vertical scroll bar is there, the results column fits its
    view: no number is cut at the right and no sideways scrolling (a held size once kept it 7 px too wide)."""
    w = demo_window
    w.doc.set_units("us")
    for row in range(len(w.doc.project.channels)):
        w.channel_list.setCurrentRow(row)
        evaluated(w, qtbot)
        qtbot.wait(20)
        scroll = w.results.scroll
        assert scroll.widget().width() <= scroll.viewport().width(), w.doc.channel().name
        assert not scroll.horizontalScrollBar().isVisible(), w.doc.channel().name
    w.doc.set_units("si")


def test_an_edit_that_changes_only_numbers_does_not_lay_the_panel_out(demo_window, qtbot):
    w = demo_window
    evaluated(w, qtbot)
    f = field(w, "trapezoid:section.bottom_width")
    type_into(qtbot, f, "0.61")
    evaluated(w, qtbot)
    qtbot.wait(50)
    requests = LayoutRequests(w.results.numbers)
    before = {k: v.text() for k, v in w.results.values.items()}
    type_into(qtbot, f, "0.62")
    evaluated(w, qtbot)
    qtbot.wait(50)
    assert {k: v.text() for k, v in w.results.values.items()} != before     # the numbers did change
    assert requests.count == 0
    for key, label in w.results.values.items():                           # and each is shown whole
        if label.isVisible():
            assert label.width() >= label.sizeHint().width(), key


def test_a_wrapped_text_lays_the_column_out_only_when_its_height_changes(qtbot):
    """A new text of the same height in a WrappedText box asks the column for no layout; a text that needs another
    height does, and the label shows each text whole at the column's width (no width is held)."""
    column = QWidget()
    qtbot.addWidget(column)
    column.resize(300, 400)
    label = QLabel("Stable: 40.1 Pa against 84.4 Pa permissible.")
    label.setWordWrap(True)
    box = rv.WrappedText(label)
    lay = QVBoxLayout(column)
    lay.addWidget(box)
    lay.addStretch(1)
    column.show()
    qtbot.waitExposed(column)
    requests = LayoutRequests(column)
    qtbot.wait(20)
    requests.count = 0
    rv.set_wrapped_text(label, "Stable: 40.0 Pa against 84.4 Pa permissible.")      # same height
    qtbot.wait(20)
    assert requests.count == 0 and label.text().startswith("Stable: 40.0")
    height = box.height()
    rv.set_wrapped_text(label, " ".join(["A much longer reason that needs more lines."] * 8))
    qtbot.wait(20)
    assert requests.count >= 1 and box.height() > height
    assert box.height() >= label.heightForWidth(box.width()) and label.width() == box.width() <= column.width()
    column.resize(200, 400)                                                        # narrower: follows, wraps more
    qtbot.wait(20)
    assert box.width() <= 200 and box.height() >= label.heightForWidth(box.width())
