"""One answer everywhere: the window, the sheet, `calc --json` and the batch show the same channel alike.

Two channels of the demo project (invented site), in SI and in US customary units, with a user catalogue that
holds an invented unit cost. The window and the sheet print the results by the one rounding rule
(app.results.PANEL_FIELDS), so each of their values is the same text; the command line and the batch write more
digits, so each printed number must lie within half a unit of its last printed digit of the value the others print; the verdict is the same member
of the one vocabulary (app/verdicts.py) in each; the cost per length is the same; the warnings are the same words
(`compare --json` gives the lining's row as `calc --json` does). The numbers themselves are
checked against published cases elsewhere (tests/test_published_cases.py, tests/test_sheet.py).
"""

from __future__ import annotations

import copy
import csv
import html
import json
import re

import pytest
from pypdf import PdfReader

from app import project as P
from app.evaluate import evaluate_channel, load_default_catalogue
from app.gui.mainwindow import MainWindow
from app.main import main
from app.sheet import export_sheets
from app.verdicts import Verdict
from hydraulics.units import system

CHANNELS = ("East verge ditch", "North cut ditch")      # concrete (priced), gravel mulch (priced)
USER = ('schema_version = 1\n'
        '[[lining]]\nkey = "concrete"\nunit_cost = 70.0\nunit_cost_basis = "area"\n'
        '[[lining]]\nkey = "gravel"\nunit_cost = 18.0\nunit_cost_basis = "area"\n')


#: Values of the window's results panel (key) that the sheet prints after a label, as the same text.
SAME_TEXT = {"normal_depth": "Normal depth yn", "critical_depth": "Critical depth yc", "velocity": "Velocity V",
             "froude": "Froude number Fr", "area": "Flow area A", "top_width": "Top width T",
             "hydraulic_radius": "Hydraulic radius R", "critical_slope": "Critical slope Sc", "freeboard": "Freeboard",
             "total_depth": "Total depth", "top_width_at_top": "Top width at top", "lined_width": "Lined width",
             "layer_volume": "; layer", "cost_per_length": "; cost"}


def _close(printed: str, value: float) -> None:
    """``printed`` (a number as a front end wrote it) is ``value`` rounded to its own digits."""
    decimals = len(printed.split(".")[1]) if "." in printed else 0
    assert abs(float(printed) - value) <= 0.5 * 10 ** -decimals * (1 + 1e-9), (printed, value)


@pytest.fixture(scope="module")
def user_catalogue(tmp_path_factory):
    path = tmp_path_factory.mktemp("linings") / "user-linings.toml"
    path.write_text(USER, encoding="utf-8")
    return path


@pytest.mark.parametrize("units", ["si", "us"])
@pytest.mark.parametrize("name", CHANNELS)
def test_every_front_end_shows_one_answer(name, units, user_catalogue, tmp_path, qtbot, capsys, monkeypatch):
    project = P.load(P.demo_path())
    project.units = units
    u = system(units)
    channel = project.channel(name)
    catalogue = load_default_catalogue(user_catalogue)
    design = evaluate_channel(channel, catalogue)
    verdict = design.verdict
    y = float(u.from_si("length", design.analysis.normal_depth))
    v = float(u.from_si("velocity", design.analysis.velocity))
    cost = float(u.from_si("cost_per_length", design.stability.cost_per_length))

    # the window, with the user's catalogue (from its settings) laid over the shipped one
    from app.gui import settings
    monkeypatch.setattr(settings, "user_catalogue_path", lambda: user_catalogue)
    w = MainWindow(copy.deepcopy(project))
    qtbot.addWidget(w)
    w.show()
    qtbot.waitExposed(w)
    w.channel_list.setCurrentRow([c.name for c in w.doc.project.channels].index(name))
    qtbot.waitUntil(lambda: w.results.values["cost_per_length"].text() != "\u2014")
    shown = {k: w.results.values[k].text() for k in SAME_TEXT}
    assert w.results.headline.text() == verdict.words
    w.doc.undo_stack.setClean()
    _close(shown["normal_depth"].split()[0], y)
    _close(shown["velocity"].split()[0], v)
    _close(shown["cost_per_length"].split()[0].replace(",", ""), cost)

    # the sheet
    pdf = tmp_path / "sheet.pdf"
    export_sheets(project, pdf, channels=[name], catalogue=catalogue)
    text = PdfReader(pdf).pages[0].extract_text().replace("\n", " ")
    _close(re.search(r"Normal depth yn\s+([0-9.]+)", text).group(1), y)
    _close(re.search(r"Velocity V\s+([0-9.]+)", text).group(1), v)
    _close(re.search(r"; cost ([0-9][0-9,]*\.?[0-9]*)", text).group(1).replace(",", ""), cost)
    assert verdict.heading in text
    for key, label in SAME_TEXT.items():   # the one rounding rule (app.results.PANEL_FIELDS): the same words
        assert re.search(re.escape(label) + r"\s+" + re.escape(shown[key]) + r"(?![0-9])", text), (key, shown[key])

    # the command line, from the same inputs typed as options in the project's units
    sec = channel.section
    lining = channel.lining.key + ("" if channel.lining.d50 is None
                                   else f":{u.from_si('length', channel.lining.d50):.10g}")
    argv = ["calc", "--units", units, "--bottom-width", f"{u.from_si('length', sec['bottom_width']):.12g}",
            "--left-slope", str(sec["left_slope"]), "--right-slope", str(sec["right_slope"]),
            "--slope", str(channel.slope), "--flow", f"{u.from_si('flow', channel.flow.value):.12g}",
            "--lining", lining, "--user-catalogue", str(user_catalogue), "--json"]
    assert main(argv) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["normal_depth"] == pytest.approx(y, rel=1e-9) and data["velocity"] == pytest.approx(v, rel=1e-9)
    assert data["stability"]["cost_per_length"] == pytest.approx(cost, rel=1e-9)
    assert data["verdict"] == verdict.token

    # the batch, one reach with the same inputs
    inventory, results = tmp_path / "inv.csv", tmp_path / "out.csv"
    with inventory.open("w", newline="", encoding="utf-8") as fh:
        out = csv.writer(fh)
        out.writerow(["id", "shape", "bottom_width", "left_slope", "right_slope", "diameter", "slope", "flow",
                      "lining", "d50", "n"])
        out.writerow([name, "trapezoid", argv[argv.index("--bottom-width") + 1], sec["left_slope"],
                      sec["right_slope"], "", channel.slope, argv[argv.index("--flow") + 1], channel.lining.key,
                      "" if channel.lining.d50 is None else lining.split(":")[1], ""])
    assert main(["batch", str(inventory), "-o", str(results), "--units", units,
                 "--user-catalogue", str(user_catalogue)]) == 0
    capsys.readouterr()
    (row,) = list(csv.DictReader(results.open(encoding="utf-8")))
    _close(row["normal_depth"], y)
    _close(row["velocity"], v)
    assert Verdict.from_token(row["verdict"]) is verdict

    # the warnings: worded once (hydraulics.wording), restated in the project's units by each front end; the
    # window and the sheet make sentences of them (capital first letter, full stop), the command line does not
    window_warnings = [_plain(html.unescape(w)) for w in re.findall(r"<li>(.*?)</li>", w.results.warnings.text())]
    assert window_warnings and window_warnings == [_plain(x) for x in data["warnings"]]
    for words in window_warnings:
        assert words[1:] in _plain(text.replace("\u00b2", "^2").replace("\u00b3", "^3")), words

    # `compare --json` with the channel's lining alone: its row says what `calc --json` says
    assert main(["compare", *argv[1:argv.index("--json")], "--json"]) == 0
    (compared,) = json.loads(capsys.readouterr().out)
    assert compared["depth"] == pytest.approx(y, rel=1e-9) and compared["velocity"] == pytest.approx(v, rel=1e-9)
    assert compared["cost_per_length"] == pytest.approx(cost, rel=1e-9)
    assert Verdict.from_token(compared["verdict"]) is verdict
    assert [_plain(x) for x in compared["warnings"]] == window_warnings


def _plain(sentence: str) -> str:
    """A warning without the sentence case and full stop the window and the sheet give it, on one line."""
    sentence = re.sub(r"\s+", " ", sentence).strip().rstrip(".")
    return sentence[:1].lower() + sentence[1:]
