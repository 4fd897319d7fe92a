"""The lining comparison reads the same in the window, on the design sheet and from ``ditchwright compare``.

One channel (invented) with four linings, one of them priced by a user catalogue (an invented price, not data),
goes through the three front ends; every number, verdict word and cost they show for a lining must be the same
text, because all three lay out the one table of :mod:`app.comparison_table`. This checks the front ends
against each other, not the hydraulics (the core's own tests do that against HEC-15 and Chow).
"""

from __future__ import annotations

import re

import pytest
from pypdf import PdfReader

from app import project as pj
from app.context import Context
from app.gui.fields import pretty
from app.gui.mainwindow import MainWindow
from app.main import main
from app.sheet import export_sheets
from hydraulics import units as hu
from waiting import compared

USER = 'schema_version = 1\n[[lining]]\nkey = "concrete"\nunit_cost = 1234.5\nunit_cost_basis = "area"\n'
#: (units, flow, bottom width, bend radius, riprap D50) typed in that unit system; slope 0.02, sides 3H:1V.
CASES = {"si": ("si", 0.8, 0.6, 15.0, 0.2), "us": ("us", 28.0, 2.0, 50.0, 0.6)}
#: The quantities compared, as the window heads its rows (the sheet and compare show the same columns).
KEYS = ("depth", "velocity", "froude", "manning_n", "design_shear", "permissible_shear", "safety_factor",
        "verdict", "lined_width", "layer_volume", "cost_per_length")


def channel(units: hu.UnitSystem, flow, width, radius, d50) -> pj.Channel:
    L = lambda v: float(units.to_si("length", v))  # noqa: E731
    return pj.Channel(name="Invented swale", flow=pj.FlowBasis(value=float(units.to_si("flow", flow))), slope=0.02,
                      section={"shape": "trapezoid", "bottom_width": L(width), "left_slope": 3.0, "right_slope": 3.0},
                      lining=pj.LiningChoice("riprap", L(d50)), manning_n=None, bend_radius=L(radius),
                      alternatives=[pj.LiningChoice("concrete"), pj.LiningChoice("gravel", 0.025),
                                    pj.LiningChoice("grass_good_sod")])


def window_cells(w, qtbot) -> dict:
    """{lining name: {key: text}} from the window's comparison table."""
    from app.results import COMPARISON_FIELDS
    view = w.comparison
    view.refresh()
    compared(view, qtbot)          # computed off the window's thread
    table = view.table
    out = {}
    for j in range(table.columnCount()):
        name = table.horizontalHeaderItem(j).toolTip()
        out[name] = {f.key: table.item(i, j).text() for i, f in enumerate(COMPARISON_FIELDS) if i > 0}
    return out


def sheet_cells(path, names) -> dict:
    """{lining name: {key: text}} read back from the sheet's comparison (pypdf)."""
    text = re.sub(r"\s+", " ", PdfReader(path).pages[0].extract_text())
    table = text.split("LINING COMPARISON")[1].split("CAUTIONS")[0]
    out = {}
    number = r"([0-9.,]+|non-erodible|—)"
    for name in names:
        m = re.search(re.escape(name) + r" " + r" ".join([number] * 6) + r" ([0-9.]+ / [0-9.]+|—) "
                      r"(Stable|Not stable|Non-erodible|Too shallow)(?: \([a-z ]+\))?(?:; needs D50 ≥ [0-9.]+ (?:in|mm))? "
                      + r" ".join([number] * 3), table)
        assert m, f"no sheet row for {name!r} in {table!r}"
        n, depth, v, fr, tau, taup, sf, verdict, lined, layer, cost = m.groups()
        out[name] = dict(depth=depth, velocity=v, froude=fr, manning_n=n, design_shear=tau, permissible_shear=taup,
                         safety_factor=sf.split(" / ")[0] if sf != "—" else "—", verdict=verdict, lined_width=lined,
                         layer_volume=layer, cost_per_length=cost)
    return out


def compare_cells(capsys, args) -> dict:
    """{lining name: {key: text}} from the text table of ``ditchwright compare``."""
    from app.results import COMPARISON_FIELDS
    assert main(args) == 0
    lines = capsys.readouterr().out.splitlines()
    at = next(i for i, line in enumerate(lines) if line.startswith("Lining  "))
    out = {}
    for line in lines[at + 2:]:
        if line.startswith("  "):           # the reasons below the table
            break
        cells = re.split(r"\s{2,}", line.strip())
        assert len(cells) == len(COMPARISON_FIELDS), line
        out[cells[0]] = {f.key: c for f, c in zip(COMPARISON_FIELDS, cells)}
    return out


@pytest.mark.parametrize("case", sorted(CASES))
def test_window_sheet_and_compare_show_the_same_comparison(case, tmp_path, qtbot, capsys):
    key, flow, width, radius, d50 = CASES[case]
    units = hu.system(key)
    prices = tmp_path / "prices.toml"
    prices.write_text(USER, encoding="utf-8")
    ch = channel(units, flow, width, radius, d50)
    project = pj.Project(name="Invented comparison", units=key, channels=[ch])

    w = MainWindow(project, persistent=False, context=Context.load(prices, units=key))
    qtbot.addWidget(w)
    w.tabs.setCurrentIndex(3)
    window = window_cells(w, qtbot)
    names = list(window)
    assert len(names) == 4 and any("D50" in n for n in names)

    sheet_file = tmp_path / "sheet.pdf"
    export_sheets(project, sheet_file, catalogue=w.doc.context.catalogue)
    sheet = sheet_cells(sheet_file, names)

    cli = compare_cells(capsys, ["compare", "--units", key, "--flow", str(flow), "--slope", "0.02",
                                 "--bottom-width", str(width), "--side-slope", "3", "--bend-radius", str(radius),
                                 "--lining", f"riprap:{d50}", "--lining", "concrete", "--lining", "gravel:"
                                 f"{units.from_si('length', 0.025)!r}", "--lining", "grass_good_sod",
                                 "--user-catalogue", str(prices)])
    assert list(cli) == names
    for name in names:
        for k in KEYS:
            assert window[name][k] == sheet[name][k] == cli[name][k], (name, k)
    concrete = next(n for n in names if n.startswith("Concrete"))
    cost = window[concrete]["cost_per_length"]
    assert "," in cost and re.fullmatch(r"\d{1,3}(,\d{3})*\.\d\d", cost)   # money: cents, thousands grouped
    assert pretty(units.label("cost_per_length")) in [w.comparison.table.verticalHeaderItem(i).text()
                                                      for i in range(w.comparison.table.rowCount())][-1]
    w.doc.undo_stack.setClean()
