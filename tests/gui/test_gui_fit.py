"""Labels at the default window size and at 1366x768: no unit split across lines, no label cut off."""

import re

import pytest
from PySide6.QtWidgets import QLabel

from app.gui.fields import keep_units_whole


@pytest.mark.parametrize("text, whole", [
    ("Stable, bend: 1.11 lb/ft² against 2.37 lb/ft² permissible", ["1.11\u00a0lb\u2060/\u2060ft²"]),
    ("2 to 3 ft/s (0.6 to 0.9 m/s)", ["3\u00a0ft\u2060/\u2060s", "0.9\u00a0m\u2060/\u2060s"]),
    ("D50 5.9 in", ["D50\u00a05.9\u00a0in"]),
    ("a flow of 0.65 m³/s.", ["0.65\u00a0m³\u2060/\u2060s"]),
])
def test_a_unit_is_kept_with_its_number(text, whole):
    out = keep_units_whole(text)
    assert all(w in out for w in whole)
    assert out.replace("\u2060", "").replace("\u00a0", " ") == text


def breakable_units(text):
    """Places where a label could break inside a unit or between a number and its unit."""
    return re.findall(r"\d [a-zA-Z]+/|[a-zA-Z²³]/[a-zA-Z]", text)


@pytest.mark.parametrize("units", ["us", "si"])
@pytest.mark.parametrize("size", [(1366, 768), (1440, 900), (1920, 1080)])
def test_no_label_is_cut_and_no_unit_can_wrap(demo_window, qtbot, units, size):
    w = demo_window
    w.doc.set_units(units)
    w.resize(*size)
    outfall = next(i for i, c in enumerate(w.doc.project.channels) if c.alternatives)
    for channel, tab in ((outfall, 0), (2, 0), (outfall, 3)):
        w.doc.set_current(channel)
        w.tabs.setCurrentIndex(tab)
        qtbot.wait(20)
        for lab in w.findChildren(QLabel):
            if not lab.isVisible() or not lab.text() or lab.width() == 0:
                continue
            if lab.wordWrap():
                assert not breakable_units(lab.text()), lab.text()
            else:
                assert lab.width() >= lab.minimumSizeHint().width(), (lab.objectName(), lab.text())
        table = w.comparison.table
        if tab == 3:
            assert table.columnCount() >= 2
            for j in range(table.columnCount()):                                 # no number left above its unit
                assert not re.search(r"\d\n[a-zA-Z]|D50\n", table.horizontalHeaderItem(j).text())
