"""Numbers typed in the window are read by the user's number format (QLocale), never guessed.

The separators of each locale are Qt's own (CLDR data): en_US writes 1,234.5, de_DE 1.234,5, en_IN 12,34,567.5,
fr_FR groups with a narrow no-break space. The channel values are the invented demo project's.
"""

import pytest
from PySide6.QtCore import QLocale

from app.gui.fields import UnclearNumber, format_number, parse_number
from app.main import main
from waiting import compared, evaluated
from window_typing import field, type_into


@pytest.fixture
def user_locale():
    """Set the default QLocale (what the window reads numbers by) for one test, then put it back."""
    before = QLocale()

    def use(name):
        QLocale.setDefault(QLocale(name))
    yield use
    QLocale.setDefault(before)


@pytest.mark.parametrize("locale, text, value", [
    ("en_US", "1,200", 1200.0), ("en_US", "1,200.5", 1200.5), ("en_US", "1.2", 1.2), ("en_US", "12,345,678", 12345678),
    ("de_DE", "1,200", 1.2), ("de_DE", "1.200", 1200.0), ("de_DE", "1.200,5", 1200.5), ("de_DE", "0,5", 0.5),
    ("en_IN", "12,34,567.5", 1234567.5), ("fr_FR", "1 200,5", 1200.5), ("fr_FR", "1\u202f200,5", 1200.5),
    ("en_US", "-2e-3", -0.002), ("de_DE", "1,5e-3", 0.0015),
], ids=lambda v: str(v))
def test_a_number_is_read_by_the_locale(locale, text, value):
    assert parse_number(text, locale=QLocale(locale)) == pytest.approx(value, rel=1e-15)


@pytest.mark.parametrize("locale, text, readings", [
    ("en_US", "1,20", ["1.2", "120"]),        # a comma where neither the decimal mark nor a thousands group fits
    ("en_US", "1,5", ["1.5", "15"]),
    ("de_DE", "1.5", ["1,5", "15"]),
    ("de_DE", "1.20", ["1,2", "120"]),
    ("en_US", "0,5", ["0.5"]),                 # only one reading, and it is another format's: still refused
    ("en_US", "1.200,5", ["1200.5"]),
    ("de_DE", "1,200.5", ["1200,5"]),
], ids=lambda v: str(v))
def test_an_entry_read_two_ways_is_refused_with_each_reading(locale, text, readings):
    with pytest.raises(UnclearNumber) as caught:
        parse_number(text, locale=QLocale(locale))
    message = str(caught.value)
    for r in readings:
        assert f" {r} (" in message
    assert "as in " + QLocale(locale).toString(1234.5, "f", 1) in message


@pytest.mark.parametrize("text", ["abc", "", "1..2", "1,,200", ",", "inf", "nan", "1_000"])
def test_text_that_is_no_number_is_not_an_unclear_number(text):
    with pytest.raises(ValueError) as caught:
        parse_number(text, locale=QLocale("en_US"))
    assert not isinstance(caught.value, UnclearNumber)


def test_shown_numbers_use_the_locale_decimal_mark():
    assert format_number(0.0125, QLocale("de_DE")) == "0,0125"
    assert format_number(0.0125, QLocale("en_US")) == "0.0125"
    assert parse_number(format_number(1234.5, QLocale("de_DE")), locale=QLocale("de_DE")) == 1234.5


def test_en_us_window_reads_a_thousands_comma(user_locale, qtbot):
    user_locale("en_US")
    from app import project as pj
    from app.gui.mainwindow import MainWindow
    w = MainWindow(pj.loads(pj.demo_path().read_text(encoding="utf-8")), persistent=False)
    qtbot.addWidget(w)
    w.show()
    assert w.doc.channel().flow.method == "typed"
    type_into(qtbot, field(w, "flow.value"), "1,200")
    assert w.doc.channel().flow.value == 1200.0            # one thousand two hundred, not 1.2
    type_into(qtbot, field(w, "flow.value"), "1,20")
    f = field(w, "flow.value")
    assert "1.2 (the comma as a decimal mark)" in f.error and "120 (the comma between thousands)" in f.error
    assert w.doc.channel().flow.value not in (1.2, 120.0)    # nothing guessed (the "1" typed first was sent on)
    assert w.inputs.first_complaint() == f.error             # the window says the inputs are not all valid
    w.doc.undo_stack.setClean()


def test_de_de_window_reads_a_decimal_comma_and_shows_commas(user_locale, qtbot):
    user_locale("de_DE")
    from app import project as pj
    from app.gui.mainwindow import MainWindow
    w = MainWindow(pj.loads(pj.demo_path().read_text(encoding="utf-8")), persistent=False)
    qtbot.addWidget(w)
    w.show()
    slope = w.doc.channel().slope
    assert field(w, "slope").edit.text() == format_number(slope).replace(".", ",")
    type_into(qtbot, field(w, "flow.value"), "1,200")
    assert w.doc.channel().flow.value == 1.2
    type_into(qtbot, field(w, "flow.value"), "1.200")
    assert w.doc.channel().flow.value == 1200.0
    type_into(qtbot, field(w, "flow.value"), "1.5")
    f = field(w, "flow.value")
    assert "1,5 (the point as a decimal mark)" in f.error and "15 (the point between thousands)" in f.error
    assert w.doc.channel().flow.value not in (1.5, 15.0)
    assert w.inputs.first_complaint() == f.error
    w.doc.undo_stack.setClean()


@pytest.mark.parametrize("text", ["1,200", "1,2"])
def test_command_line_keeps_refusing_a_comma(text, capsys):
    with pytest.raises(SystemExit) as caught:
        main(["calc", "--flow", text, "--slope", "0.004", "--n", "0.03", "--bottom-width", "2", "--side-slope", "3"])
    assert caught.value.code == 2 and "--flow" in capsys.readouterr().err


def test_results_and_comparison_are_written_with_the_locale_decimal_mark(user_locale, qtbot, capsys):
    """de_DE writes 0,312 m: the results panel and the comparison show what the fields would read back; the
    sheet, files and command line keep the point (they are read by programs, not by the user's locale)."""
    import re

    from app import channel_display as display
    from app import project as pj
    from app.gui.mainwindow import MainWindow

    user_locale("de_DE")
    w = MainWindow(pj.loads(pj.demo_path().read_text(encoding="utf-8")), persistent=False)
    qtbot.addWidget(w)
    w.doc.set_current(0)
    ev = evaluated(w, qtbot)
    depth = w.results.values["normal_depth"].text()
    assert re.fullmatch(r"\d+,\d{3} m", depth), depth
    assert parse_number(depth.split()[0]) == pytest.approx(ev.result.normal_depth, abs=5e-4)   # reads back
    assert "," in w.results.values["velocity"].text() and "." not in w.results.values["velocity"].text()
    outfall = next(i for i, c in enumerate(w.doc.project.channels) if c.alternatives)
    w.doc.set_current(outfall)
    w.tabs.setCurrentIndex(3)
    w.comparison.refresh()
    compared(w.comparison, qtbot)
    table = w.comparison.table
    heads = [table.verticalHeaderItem(i).text() for i in range(table.rowCount())]
    row = heads.index("Depth [m]")
    shown = [table.item(row, j).text() for j in range(table.columnCount())]
    assert shown and all(re.fullmatch(r"\d+,\d{3}", t) for t in shown), shown
    for text, r in zip(shown, w.comparison.rows):
        assert parse_number(text) == pytest.approx(r.core.depth, abs=5e-4)
    stone = next(table.horizontalHeaderItem(j).toolTip() for j in range(table.columnCount())
                 if "D50" in table.horizontalHeaderItem(j).toolTip())
    assert re.search(r"D50 \d+,\d mm", stone), stone            # the stone size in the name too
    headers = [table.horizontalHeaderItem(j).text() for j in range(table.columnCount())]
    assert not any(re.search(r"\d, \d|\d,\n\d", h) for h in headers), headers   # no break at a decimal comma
    assert re.search(r"D50 \d+,\d mm", w.comparison.checks["riprap"].toolTip())     # the list to tick agrees
    # what leaves the window for a file keeps the point
    _heads, body = display.comparison_table(w.comparison.rows, w.doc.context)
    assert all(re.fullmatch(r"\d+\.\d{3}", cells[1]) for cells in body)
    w.doc.undo_stack.setClean()


@pytest.mark.parametrize("text", ["1e308", "-1e101", "1e101"])
def test_a_number_beyond_any_design_value_is_refused_where_it_is_typed(text):
    """1e308 acres is infinite in square metres: such a number was taken by the field and the project could then
    not be saved (found by a random session in the window). Numbers up to 1e100 in size are read as typed."""
    from app.gui.fields import BeyondReach
    with pytest.raises(BeyondReach, match="beyond any design value"):
        parse_number(text, locale=QLocale(QLocale.Language.English, QLocale.Country.UnitedStates))
    assert parse_number("1e100", locale=QLocale(QLocale.Language.English, QLocale.Country.UnitedStates)) == 1e100


def test_a_drainage_area_beyond_reach_is_refused_and_the_project_still_saves(demo_window, qtbot, tmp_path):
    w = demo_window
    w.doc.set_units("us")
    type_into(qtbot, field(w, "flow.value"), "1e308")
    assert "beyond any design value" in field(w, "flow.value").error
    assert w.doc.channel().flow.value < 1e300
    w.doc.save(tmp_path / "still.json")
    assert (tmp_path / "still.json").exists()
