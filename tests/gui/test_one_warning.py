"""One warning, one wording: the window's results panel, the design sheet and `calc --json` say it alike.

An invented US project holds one channel whose concrete pipe (600 mm, 1.97 ft) at 0.2 m^3/s on a 0.15 % grade is
too shallow for the default minimum freeboard, so the core warns that the design depth plus freeboard is above the
section's full depth (test_verdicts.py checks that verdict). The warning is worded once (hydraulics.wording) and
each front end only restates it in the project's units: before that, the window said the depth in metres, the
sheet in metres with feet beside, and the command line in feet. Here the three must give the same words and the
same numbers; only the sheet's sentence case and full stop are its own.
"""

from __future__ import annotations

import html
import json
import re

from pypdf import PdfReader

from app import project as pj
from app.context import Context
from app.evaluate import evaluate_channel
from app.gui.mainwindow import MainWindow
from app.main import main
from app.sheet import export_sheets
from hydraulics.units import US
from hydraulics.wording import in_units
from waiting import evaluated

MARK = "not deep enough for the freeboard"


def _plain(text: str) -> str:
    """Sentence case, full stop and line breaks left out, to compare the words and numbers alone."""
    text = re.sub(r"\s+", " ", text).strip().rstrip(".")
    return text[:1].lower() + text[1:]


def test_a_warning_reads_alike_in_the_window_on_the_sheet_and_from_calc(qtbot, tmp_path, capsys):
    pipe = pj.Channel(name="Invented shallow pipe", flow=pj.FlowBasis(value=0.2), slope=0.0015,
                      lining=pj.LiningChoice("concrete"), section={"shape": "circle", "diameter": 0.6})
    project = pj.Project(name="Invented", units="us", channels=[pipe])
    context = Context.load(units="us")
    (core,) = [w for w in evaluate_channel(pipe, context.catalogue).warnings if MARK in w]
    expected = in_units(core, US)
    assert " ft)" in expected and " m)" not in expected

    window = MainWindow(project, persistent=False, context=context)
    qtbot.addWidget(window)
    evaluated(window, qtbot)
    shown = [html.unescape(i) for i in re.findall(r"<li>(.*?)</li>", window.results.warnings.text())]
    (in_window,) = [w for w in shown if MARK in w]

    sheet = tmp_path / "pipe.pdf"
    export_sheets(project, sheet, catalogue=context.catalogue)
    text = re.sub(r"\s+", " ", PdfReader(sheet).pages[0].extract_text())

    assert main(["calc", "--units", "us", "--shape", "circle", "--diameter", repr(0.6 / 0.3048), "--slope", "0.0015",
                 "--flow", repr(US.from_si("flow", 0.2)), "--lining", "concrete", "--json"]) == 0
    (from_calc,) = [w for w in json.loads(capsys.readouterr().out)["warnings"] if MARK in w]

    assert _plain(in_window) == _plain(from_calc) == _plain(expected)
    assert _plain(expected)[1:] in text      # the sheet's sentence: its first letter a capital
    window.doc.undo_stack.setClean()
