"""One answer everywhere: the window, the sheet, `calc --json` and the batch show the same channel alike.

Two channels of the demo project (invented site), in SI and in US customary units, with a user catalogue that
holds an invented unit cost. The window and the sheet print the results by the one rounding rule
(app.results.PANEL_FIELDS), so each of their values is the same text; the command line and the batch write more
digits, so each printed number must lie within half a unit of its last printed digit of the value the others
print; the verdict is the same member of the one vocabulary (app/verdicts.py) in each; the cost per length is the
same; the warnings are the same words (`compare --json` gives the lining's row as `calc --json` does; the batch's
reason holds them, in the same order, after the verdict's words). The numbers themselves are checked against published cases elsewhere (tests/test_published_cases.py, tests/test_sheet.py).

The lining check is held together the same way, `compare --json` included, on a riprap channel with a bend, a
gravel one and a grass variant (invented): Manning's n used, the design shears, the governing permissible shear,
the safety factors and the stone sizes. So is the demo's ditch run in the window's run panel, on the run sheet
and in `run --json`: its lining schedule, total cost, water-surface controls and jumps, warnings and verdict.
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
from app.lining_names import STONE_SIZE
from app.main import main
from app.results import format_value
from app.sheet import export_sheets
from app.verdicts import Verdict
from hydraulics.units import system
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

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


def _calc_argv(channel, design, units: str, user_catalogue) -> list:
    """`calc --json` with the channel's inputs typed as options in the project's units (the design flow as solved,
    a rational-method flow included; the bend radius where the channel has one)."""
    u = system(units)
    sec = channel.section
    argv = ["calc", "--units", units, "--bottom-width", f"{u.from_si('length', sec['bottom_width']):.12g}",
            "--left-slope", str(sec["left_slope"]), "--right-slope", str(sec["right_slope"]),
            "--slope", str(channel.slope), "--flow", f"{u.from_si('flow', design.flow):.12g}",
            "--lining", _lining_text(channel, u), "--user-catalogue", str(user_catalogue), "--json"]
    if channel.bend_radius is not None:
        argv[-1:-1] = ["--bend-radius", f"{u.from_si('length', channel.bend_radius):.12g}"]
    return argv


def _lining_text(channel, u) -> str:
    """KEY or KEY:D50 (D50 in the length unit), as the command line takes a lining."""
    lining = channel.lining
    return lining.key + ("" if lining.d50 is None else f":{u.from_si('length', lining.d50):.10g}")


def _batch_row(channel, argv, units: str, user_catalogue, tmp_path, capsys) -> dict:
    """The batch's results row of one reach with the channel's inputs (those of ``argv``)."""
    sec = channel.section
    inventory, results = tmp_path / "inv.csv", tmp_path / "out.csv"
    with inventory.open("w", newline="", encoding="utf-8") as fh:
        out = csv.writer(fh)
        out.writerow(["id", "shape", "bottom_width", "left_slope", "right_slope", "diameter", "slope", "flow",
                      "lining", "d50", "n"])
        lining = argv[argv.index("--lining") + 1]
        out.writerow([channel.name, "trapezoid", argv[argv.index("--bottom-width") + 1], sec["left_slope"],
                      sec["right_slope"], "", channel.slope, argv[argv.index("--flow") + 1], channel.lining.key,
                      lining.split(":")[1] if ":" in lining else "", ""])
    assert main(["batch", str(inventory), "-o", str(results), "--units", units,
                 "--user-catalogue", str(user_catalogue)]) == 0
    capsys.readouterr()
    (row,) = list(csv.DictReader(results.open(encoding="utf-8")))
    return row


def _window(project, name, user_catalogue, qtbot, monkeypatch) -> MainWindow:
    """The window on ``project``, with the user's catalogue (from its settings) laid over the shipped one, showing
    the results of channel ``name``."""
    from app.gui import settings
    monkeypatch.setattr(settings, "user_catalogue_path", lambda: user_catalogue)
    w = MainWindow(copy.deepcopy(project))
    qtbot.addWidget(w)
    w.show()
    qtbot.waitExposed(w)
    w.channel_list.setCurrentRow([c.name for c in w.doc.project.channels].index(name))
    qtbot.waitUntil(lambda: getattr(getattr(w.results.shown, "design", None), "channel", None) is not None
                    and w.results.shown.design.channel.name == name)
    return w


@pytest.fixture(scope="module")
def user_catalogue(tmp_path_factory):
    path = tmp_path_factory.mktemp("linings") / "user-linings.toml"
    path.write_text(USER, encoding="utf-8")
    return path


def _designed(project, name: str, units: str, user_catalogue):
    """``project`` in ``units``, its unit system, its channel ``name``, the user's catalogue laid over the shipped
    one, and the channel's evaluation with it."""
    project.units = units
    channel = project.channel(name)
    catalogue = load_default_catalogue(user_catalogue)
    return project, system(units), channel, catalogue, evaluate_channel(channel, catalogue)


@pytest.mark.parametrize("units", ["si", "us"])
@pytest.mark.parametrize("name", CHANNELS)
def test_every_front_end_shows_one_answer(name, units, user_catalogue, tmp_path, qtbot, capsys, monkeypatch):
    project, u, channel, catalogue, design = _designed(P.load(P.demo_path()), name, units, user_catalogue)
    verdict = design.verdict
    y = float(u.from_si("length", design.analysis.normal_depth))
    v = float(u.from_si("velocity", design.analysis.velocity))
    cost = float(u.from_si("cost_per_length", design.stability.cost_per_length))

    # the window, with the user's catalogue (from its settings) laid over the shipped one
    w = _window(project, name, user_catalogue, qtbot, monkeypatch)
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
    argv = _calc_argv(channel, design, units, user_catalogue)
    assert main(argv) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["normal_depth"] == pytest.approx(y, rel=1e-9) and data["velocity"] == pytest.approx(v, rel=1e-9)
    assert data["stability"]["cost_per_length"] == pytest.approx(cost, rel=1e-9)
    assert data["verdict"] == verdict.token

    # the batch, one reach with the same inputs
    row = _batch_row(channel, argv, units, user_catalogue, tmp_path, capsys)
    _close(row["normal_depth"], y)
    _close(row["velocity"], v)
    _close(row["cost_per_length"], cost)
    assert Verdict.from_token(row["verdict"]) is verdict
    # the batch's reason: the verdict's words, then the same warnings in the same order
    at = [row["reason"].find(x) for x in data["warnings"]]
    assert data["warnings"] and -1 not in at and at == sorted(at), (row["reason"], data["warnings"])

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


# -- the lining check: Manning's n, the shear-check table, safety factors, stone sizes -----------------------------
#: A grass channel: the demo's East verge ditch with a good sod instead of concrete (a variant, invented).
GRASS = "East verge ditch, grass (variant)"
#: The window's rows of the lining check's shears (app.results.PANEL_FIELDS), and the row of the sheet's
#: shear-check table that prints each.
SHEARS = {"bed_shear": "bed", "side_shear": "side slopes", "bend_shear": "bend"}
STONE = ("required_d50", "layer_thickness")


def _with_grass(project):
    """The project with the grass variant of the East verge ditch added."""
    grass = copy.deepcopy(project.channel("East verge ditch"))
    grass.name, grass.lining = GRASS, P.LiningChoice("grass_good_sod", None)
    project.channels.append(grass)
    return project


def _check_rows(text: str) -> dict:
    """{location: [design shear, permissible, SF achieved, SF required]} of the sheet's shear-check table."""
    block = text.split("LINING STABILITY")[1].split("Reason:")[0]
    rows = re.findall(r"(bed|side slopes|bend)\s+([0-9.]+)\s+([0-9.]+|non-erodible)\s+([0-9.]+|—)\s+([0-9.]+|—)\s+"
                      r"(?:passes|FAILS|non-erodible)", block)
    return {loc: rest for loc, *rest in rows}


@pytest.mark.parametrize("units", ["si", "us"])
@pytest.mark.parametrize("name", ["Outfall swale", "North cut ditch", GRASS])   # riprap with a bend, gravel, grass
def test_every_front_end_rounds_the_lining_check_alike(name, units, user_catalogue, tmp_path, qtbot, capsys,
                                                      monkeypatch):
    """Manning's n used, the design shears, the governing permissible shear and safety factors, and the stone sizes
    read the same in the window's results panel and on the sheet (the one rule, app.results.PANEL_FIELDS), and
    `calc --json`, `compare --json` and the batch give the numbers they round."""
    project, u, channel, catalogue, design = _designed(_with_grass(P.load(P.demo_path())), name, units, user_catalogue)
    st = design.stability
    governs = st.governs

    w = _window(project, name, user_catalogue, qtbot, monkeypatch)
    panel = {k: w.results.values[k].text() for k in ("manning_n", *SHEARS, "permissible_shear", "safety_factor",
                                                     *STONE) if w.results.values[k].isVisibleTo(w.results)}
    w.doc.undo_stack.setClean()
    assert set(panel) >= {"manning_n", "bed_shear", "side_shear", "permissible_shear", "safety_factor"}
    assert ("bend_shear" in panel) == (channel.bend_radius is not None)
    assert all(k in panel for k in STONE) == (st.category == "stone")
    sf, needed = re.fullmatch(r"([0-9.]+) \(need ([0-9.]+)\)", panel["safety_factor"]).groups()

    # the sheet: the same texts
    pdf = tmp_path / "sheet.pdf"
    export_sheets(project, pdf, channels=[name], catalogue=catalogue)
    text = PdfReader(pdf).pages[0].extract_text().replace("\n", " ")
    assert re.search(r"Manning's n used (\S+)", text).group(1) == panel["manning_n"]
    table = _check_rows(text)
    for key, loc in SHEARS.items():
        if key in panel:
            assert table[loc][0] + " " + u.label("shear").replace("^2", "\u00b2") == panel[key], key
    assert table[governs][1:] == [panel["permissible_shear"].split()[0], sf, needed]
    if st.category == "stone":
        assert re.search(r"Required D50 (\S+ \S+) smallest stable", text).group(1) == panel["required_d50"]
        assert re.search(r"layer thickness t (\S+ \S+)", text).group(1) == panel["layer_thickness"]
        assert f"D50 {format_value(channel.lining.d50, STONE_SIZE, u)}" in text.split("Lining")[1]

    # calc --json: the numbers the window and the sheet round
    argv = _calc_argv(channel, design, units, user_catalogue)
    assert main(argv) == 0
    data = json.loads(capsys.readouterr().out)
    _close(panel["manning_n"], data["lining"]["n_used"])
    checks = {c["location"]: c for c in data["stability"]["checks"]}
    for key, loc in SHEARS.items():
        if key in panel:
            _close(panel[key].split()[0], checks[loc]["design_shear"])
    _close(panel["permissible_shear"].split()[0], checks[governs]["permissible_shear"])
    _close(sf, checks[governs]["safety_factor"])
    _close(needed, checks[governs]["required_safety_factor"])
    small = lambda v: float(u.from_si("small_length", u.to_si("length", v)))  # noqa: E731  (the JSON's length)
    for key in STONE:
        if key in panel:
            _close(panel[key].split()[0], small(data["stability"][key]))

    # compare --json, the channel's lining alone: the governing check's numbers
    argv[0] = "compare"
    assert main(argv) == 0
    (row,) = json.loads(capsys.readouterr().out)
    _close(panel["manning_n"], row["manning_n"])
    _close(panel[{v: k for k, v in SHEARS.items()}[governs]].split()[0], row["design_shear"])
    _close(panel["permissible_shear"].split()[0], row["permissible_shear"])
    _close(sf, row["safety_factor"])
    if st.category == "stone":
        _close(panel["required_d50"].split()[0], small(row["required_d50"]))

    # the batch (no bends: the bend's checks are the window's, the sheet's and the command line's only; its file
    # has no column of the n used, and its permissible shear is the bed's, the sheet's bed row)
    row = _batch_row(channel, argv, units, user_catalogue, tmp_path, capsys)
    _close(panel["bed_shear"].split()[0], float(row["bed_shear"]))
    _close(table["bed"][1], float(row["permissible_shear"]))
    if channel.bend_radius is None:
        _close(sf, float(row["safety_factor"]))


# -- a ditch run: the window's run panel, the run sheet and `run --json` ------------------------------------------
RUN = "North verge ditch"       # the demo's invented run


def _label_lines(label) -> list:
    """The lines of a rich-text label as it reads (no-break spaces and word joiners as plain spaces)."""
    from PySide6.QtGui import QTextDocument
    doc = QTextDocument()
    doc.setHtml(label.text())
    return [t for t in (_spaced(line) for line in doc.toPlainText().splitlines()) if t]


def _spaced(text: str) -> str:
    return re.sub(r"\s+", " ", text.replace("\u00a0", " ").replace("\u2060", "")).strip()


def _station(text: str) -> float:
    """'12+34.56' -> 1234.56 (a station as a distance in the run's length unit)."""
    head, tail = text.split("+")
    return int(head) * 10 ** len(tail.split(".")[0]) + float(tail)


@pytest.mark.parametrize("units", ["si", "us"])
def test_a_run_reads_alike_in_the_window_the_sheet_and_the_run_command(units, demo_window, qtbot, tmp_path, capsys):
    """The lining schedule (stations, lining, length, quantities, cost), the total, the water surface's controls and
    jumps and the warnings of the demo's run read the same in the window's run panel and on the run sheet (one
    Qt-free statement of them, app.run_summary, rounded by the rules of app.results), and `run --json` gives the
    numbers they round; the run's verdict agrees with the stations of the JSON."""
    from waiting import shown
    from app.sheet.content import pretty_unit

    w = demo_window
    w.doc.set_units(units)
    view = shown(w, qtbot)
    panel = {k: _label_lines(getattr(view.results, k)) for k in ("schedule", "surface", "warnings")}
    flat = {k: " ".join(v) for k, v in panel.items()}
    u = system(units)
    L = pretty_unit(u.label("length"))

    project = P.load(P.demo_path())
    project.units = units
    pdf = tmp_path / "run.pdf"
    export_sheets(project, pdf, channels=[], runs=[RUN], catalogue=SHIPPED)
    sheet = _spaced(" ".join(p.extract_text() for p in PdfReader(pdf).pages))
    schedule = sheet.split("LINING SCHEDULE", 1)[1].split("THE RUN", 1)[0]

    assert main(["run", str(P.demo_path()), "--run", RUN, "--units", units, "--json"]) == 0
    (data,) = json.loads(capsys.readouterr().out)["runs"]

    # the schedule, stretch by stretch: "from to to, length", the lining, its quantities, "cost $ ..."
    lines, stretches = panel["schedule"], []
    for i, line in enumerate(lines):
        m = re.fullmatch(r"(\d+\+[\d.]+) to (\d+\+[\d.]+), ([0-9.]+) " + re.escape(L), line)
        if m:
            end = next(k for k in range(i, len(lines)) if lines[k].startswith("cost $ "))
            stretches.append((*m.groups(), lines[i + 1], lines[i + 2:end], lines[end][len("cost "):]))
    assert len(stretches) == len(data["schedule"]) >= 2
    for (a, b, length, lining, quantities, cost), js in zip(stretches, data["schedule"]):
        assert f"{a} {b} {lining} {length} " in schedule        # number, from, to, lining, length, then quantities
        assert all(q in schedule for q in quantities) and quantities
        assert cost in schedule
        _close(str(_station(a)), js["from_station"])
        _close(str(_station(b)), js["to_station"])
        _close(length, js["length"])
        for q, jq in zip(quantities, js["quantities"]):
            item, amount, unit = re.fullmatch(r"(.+): ([0-9,.]+) (\S+)", q).groups()
            assert (item, unit) == (jq["item"], pretty_unit(jq["unit"]))
            _close(amount.replace(",", ""), jq["amount"])
        _close(cost[2:].replace(",", ""), js["cost"])
    total = re.search(r"Total cost (\$ [0-9,]+)", flat["schedule"]).group(1)
    assert f"Total cost of the run {total}" in schedule
    _close(total[2:].replace(",", ""), data["total_cost"])

    # the water surface: controls and jumps, with the depths and levels of the JSON
    for c in data["controls"]:
        line = next(t for t in panel["surface"] if t.lower().startswith(c["where"]))
        text = line[:1].lower() + line[1:].rstrip(".")
        assert text in sheet
        level, depth = re.search(r"level ([0-9.]+) \S+ \(depth ([0-9.]+)", text).groups()
        _close(level, c["level"])
        _close(depth, c["depth"])
    jumps = [t[len("Hydraulic jump "):].rstrip(".") for t in panel["surface"] if t.startswith("Hydraulic jump ")]
    assert len(jumps) == len(data["jumps"]) >= 1
    for text, j in zip(jumps, data["jumps"]):
        assert text in sheet
        up, down, length = re.search(r": ([0-9.]+) \S+ to ([0-9.]+) \S+ over ([0-9.]+)", text).groups()
        _close(up, j["upstream_depth"])
        _close(down, j["downstream_depth"])
        _close(length, j["length"])

    # the warnings: the same sentences in each (the panel's start with a capital and end with a full stop)
    assert data["warnings"]
    for warning in data["warnings"]:
        words = _spaced(pretty_unit(warning))
        assert words[1:] in flat["warnings"]
        assert words in sheet

    # the verdict: every station of the JSON stable and fitting the ditch, so the run is stable
    assert all(s["stable"] is not False and s["fits"] is not False for s in data["stations"])
    assert view.results.headline.text() == "Every station stable"
    # the stations left unchecked are those without flow yet, and the reason says so (the table shows "Not checked")
    dry = [s for s in data["stations"] if s["stable"] is None]
    assert dry and all(s["flow"] == 0 for s in dry)
    assert (f"{len(dry)} station without flow yet (the top of the run) is not checked"
            in _spaced(view.results.reason.text()))
    assert view.results.verdict.property("status") == Verdict.STABLE.status
    assert "NOT STABLE" not in sheet and "TOO SHALLOW" not in sheet
