"""The lining catalogue is handed to every evaluation and export, never picked by default.

A default catalogue is how the window's sheet once came to ignore the user's prices: each entry point below must
refuse to run without one, and the commands that take ``--user-catalogue`` must carry the user's entries through.
The prices and names in the user catalogues here are invented, not data.
"""

from __future__ import annotations

import inspect
import json

import ezdxf
import pytest
from pypdf import PdfReader

from app import inventory as ai
from app import project as pj
from app.context import Context
from app.drawings import export_drawings, make_drawings
from app.evaluate import evaluate_channel
from app.main import main
from app.run_design import design_run
from app.sheet import channel_sheet, export_sheets, fingerprint, run_fingerprint, run_sheet, sheet_pdf
from app.sheet.content import Formatter, comparison_lines

DEMO = pj.demo_path()

#: entry point -> the name of the catalogue argument it must be given
ENTRY_POINTS = {evaluate_channel: "catalogue", channel_sheet: "catalogue", comparison_lines: "catalogue",
                run_sheet: "catalogue", sheet_pdf: "catalogue", export_sheets: "catalogue",
                make_drawings: "catalogue", export_drawings: "catalogue", design_run: "catalogue",
                fingerprint: "catalogue", run_fingerprint: "catalogue", ai.evaluate: "catalogue",
                ai.check_file: "catalogue", ai.run_inventory: "catalogue"}


@pytest.mark.parametrize("func", ENTRY_POINTS, ids=lambda f: f.__name__)
def test_catalogue_has_no_default(func):
    parameter = inspect.signature(func).parameters[ENTRY_POINTS[func]]
    assert parameter.default is inspect.Parameter.empty


def test_each_entry_point_refuses_to_run_without_the_catalogue(tmp_path):
    project = pj.load(DEMO)
    channel, run = project.channel("East verge ditch"), project.runs[0]
    design = evaluate_channel(project.channel("Outfall swale"), Context.load().catalogue)   # has alternatives
    inventory = ai.parse_inventory(",".join(ai.INPUT_COLUMNS) + "\nR1,circle,,,,0.6,0.01,0.1,,,0.013\n", "si")
    calls = [lambda: evaluate_channel(channel), lambda: channel_sheet(project, channel),
             lambda: comparison_lines(design, Formatter(Context.load().units)),
             lambda: run_sheet(project, run), lambda: sheet_pdf(project),
             lambda: export_sheets(project, tmp_path / "x.pdf"), lambda: make_drawings(project),
             lambda: export_drawings(project, tmp_path), lambda: design_run(project, run),
             lambda: fingerprint(channel), lambda: run_fingerprint(project, run),
             lambda: ai.evaluate(inventory),
             lambda: ai.check_file(tmp_path / "in.csv", tmp_path / "out.csv"),
             lambda: ai.run_inventory(tmp_path / "in.csv")]
    for call in calls:
        with pytest.raises(TypeError, match="catalogue"):
            call()
    assert not any(tmp_path.iterdir())   # nothing written


# ------------------------------------------------------------------ --user-catalogue through the commands
PRICED = 'schema_version = 1\n[[lining]]\nkey = "concrete"\nunit_cost = 473.0\nunit_cost_basis = "area"\n'


def test_sheet_command_prints_the_user_catalogues_cost(tmp_path, capsys):
    user = tmp_path / "prices.toml"
    user.write_text(PRICED, encoding="utf-8")
    project = pj.load(DEMO)
    expected = channel_sheet(project, project.channel("East verge ditch"), Context.load(user).catalogue)
    (lined,) = [i.value for i in expected.depth_items if i.label == "Lined width"]
    assert "; cost " in lined
    texts = {}
    for name, extra in (("priced", ["--user-catalogue", str(user)]), ("shipped", [])):
        out = tmp_path / f"{name}.pdf"
        assert main(["sheet", str(DEMO), "--channel", "East verge ditch", "-o", str(out), *extra]) == 0
        texts[name] = " ".join(" ".join(p.extract_text().split()) for p in PdfReader(out).pages)
    capsys.readouterr()
    assert " ".join(lined.split()) in texts["priced"]
    assert expected.fingerprint in texts["priced"]
    assert "; cost " not in texts["shipped"] and expected.fingerprint not in texts["shipped"]


def test_run_command_prices_the_schedule_from_the_user_catalogue(tmp_path, capsys):
    project = pj.load(DEMO)
    prices = {c.key: c.unit_cost for c in project.runs[0].candidates}   # the demo run's own (invented) prices
    for c in project.runs[0].candidates:
        c.unit_cost = None
    path = tmp_path / "unpriced.json"
    pj.save(project, path)
    user = tmp_path / "prices.toml"
    user.write_text("schema_version = 1\n" + "".join(f'[[lining]]\nkey = "{k}"\nunit_cost = {v}\n'
                                                     for k, v in prices.items()), encoding="utf-8")

    assert main(["run", str(DEMO), "--json"]) == 0
    typed = json.loads(capsys.readouterr().out)["runs"][0]["total_cost"]
    assert main(["run", str(path), "--json", "--user-catalogue", str(user)]) == 0
    from_catalogue = json.loads(capsys.readouterr().out)["runs"][0]["total_cost"]
    assert typed is not None and from_catalogue == pytest.approx(typed, rel=1e-12)
    assert main(["run", str(path), "--json"]) == 2        # neither the run nor the shipped catalogue prices them
    assert "unit_cost: is missing" in capsys.readouterr().err


def test_drawing_command_draws_with_the_user_catalogue(tmp_path, capsys):
    """A drawing prints no cost; the user's entry shows in the lining it names (an override of the name)."""
    user = tmp_path / "site.toml"
    user.write_text('schema_version = 1\n[[lining]]\nkey = "concrete"\nname = "Site-mixed concrete"\n'
                    'unit_cost = 473.0\n', encoding="utf-8")

    def notes(folder, *extra):
        assert main(["drawing", str(DEMO), "--out", str(folder), "--channel", "East verge ditch", *extra]) == 0
        (path,) = folder.iterdir()
        doc = ezdxf.readfile(path)
        return " ".join(e.plain_text() if e.dxftype() == "MTEXT" else e.dxf.text
                        for e in doc.modelspace() if e.dxftype() in ("TEXT", "MTEXT"))

    assert "Lining: Site-mixed concrete" in notes(tmp_path / "user", "--user-catalogue", str(user))
    assert "Site-mixed" not in notes(tmp_path / "shipped")
    capsys.readouterr()
