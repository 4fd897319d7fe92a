"""Degenerate numbers (subnormal, near-zero, huge) are refused in one line that states the allowed range, the same
range at every edge: the command line, project files, inventories and the window's fields. An error nobody
foresaw ends in one line and a report file, never a traceback.

The ranges themselves are common practice (see hydraulics.validate.LIMITS); these tests check that values far
outside them never reach the formulas, where they ended in math domain errors, overflows and divisions by zero.
"""

import csv
import io
import json
import math

import pytest

from app import inventory as ai
from app import project
from app.main import UNEXPECTED_STATUS, main
from hydraulics import units as hu
from hydraulics import validate as hv
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

US_TRAP = ["--bottom-width", "2", "--side-slope", "3", "--slope", "0.004"]


def refused(capsys, argv, *words, status=2):
    try:
        code = main(argv)
    except SystemExit as exc:
        code = exc.code
    captured = capsys.readouterr()
    err = captured.err
    assert code == status, err
    assert "Traceback" not in err and len(err.strip().splitlines()) == 1, err
    for w in words:
        assert w in err, err
    return err


# Each case once ended in a traceback (or, for --n 1e-300, in a velocity of 6e176 ft/s with no warning).
DEGENERATE = [
    (["--flow", "1e-320", "--n", "0.03", *US_TRAP], ["--flow", "from 3.53e-05 to 353147 ft^3/s"]),
    (["--flow", "20", "--n", "0.03", "--side-slope", "1e-300", "--bottom-width", "0", "--slope", "0.004"],
     ["--side-slope", "0 or from 0.05 to 50 H:V", "1e-300"]),
    (["--shape", "circle", "--diameter", "1e-300", "--flow", "20", "--slope", "0.004", "--n", "0.013"],
     ["--diameter", "from 0.164 to 49.2 ft", "1e-300"]),
    (["--shape", "parabola", "--top-width", "1e-300", "--at-depth", "1", "--flow", "20", "--slope", "0.004",
      "--n", "0.03"], ["--top-width", "ft", "1e-300"]),
    (["--flow", "20", *US_TRAP, "--lining", "riprap:1e308"], ["--lining riprap:1e308: D50", "from", "ft", "1e+308"]),
    (["--flow", "20", *US_TRAP, "--n", "1e-300"], ["--n", "from 0.005 to 1", "1e-300"]),
    (["--flow", "20", "--n", "0.03", "--bottom-width", "2", "--side-slope", "3", "--slope", "1e-300"],
     ["--slope", "from 1e-06 to 1"]),
    (["--flow", "1e300", "--n", "0.03", *US_TRAP], ["--flow", "1e+300"]),
]


@pytest.mark.parametrize("argv, words", DEGENERATE, ids=[" ".join(a[:2]) + " " + a[-1] for a, _ in DEGENERATE])
def test_calc_refuses_degenerate_numbers_with_the_range(capsys, argv, words):
    refused(capsys, ["calc", *argv], *words)


def test_si_ranges_are_stated_in_si(capsys):
    refused(capsys, ["calc", "--units", "si", "--shape", "circle", "--diameter", "1e-300", "--flow", "0.5",
                     "--slope", "0.004", "--n", "0.013"], "--diameter must be from 0.05 to 15 m, got 1e-300 m")


def test_the_edges_of_each_range_are_accepted(capsys):
    """The bounds themselves compute (SI, exactly on the limit)."""
    for argv in (["--flow", "1e-6", "--n", "0.005", "--bottom-width", "0.01", "--side-slope", "0.05"],
                 ["--flow", "1e4", "--n", "1", "--bottom-width", "100", "--side-slope", "50"]):
        assert main(["calc", "--units", "si", "--slope", "0.004", *argv, "--json"]) == 0, capsys.readouterr().err
        out = json.loads(capsys.readouterr().out)
        assert math.isfinite(out["normal_depth"]) and math.isfinite(out["velocity"])


@pytest.mark.parametrize("command, lining", [("calc", "riprap"), ("calc", "gravel"), ("compare", "riprap")])
def test_a_stone_lining_without_its_size_is_refused(capsys, command, lining):
    argv = [command, "--flow", "20", *US_TRAP, "--lining", lining]
    if command == "compare":
        argv += ["--lining", "concrete"]
    refused(capsys, argv, f"--lining {lining}", "give the stone size D50 in ft", "is not assumed")


def test_a_stone_lining_with_its_size_by_d50_is_accepted(capsys):
    assert main(["calc", "--flow", "20", *US_TRAP, "--lining", "riprap", "--d50", "0.5", "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["lining"]["d50"] == pytest.approx(0.5)


# ----------------------------------------------------------------------------- the last resort

def test_an_unforeseen_error_is_one_line_and_a_report_file(capsys, monkeypatch, tmp_path):
    import tempfile

    from app.cli import calc

    def broken(args):
        raise ZeroDivisionError("float division by zero")
    monkeypatch.setattr(calc, "solve", broken)
    monkeypatch.setattr(tempfile, "tempdir", str(tmp_path))
    err = refused(capsys, ["calc", "--flow", "20", "--n", "0.03", *US_TRAP], "ditchwright calc: internal error",
                  "ZeroDivisionError", status=UNEXPECTED_STATUS)
    reports = list(tmp_path.glob("ditchwright-error-*.txt"))
    assert len(reports) == 1 and str(reports[0]) in err
    text = reports[0].read_text(encoding="utf-8")
    assert "Traceback" in text and "broken" in text and "ZeroDivisionError: float division by zero" in text


def test_the_last_resort_says_so_when_no_report_can_be_written(capsys, monkeypatch, tmp_path):
    import tempfile

    from app.cli import calc
    monkeypatch.setattr(calc, "solve", lambda args: 1 / 0)
    monkeypatch.setattr(tempfile, "tempdir", str(tmp_path / "missing"))
    refused(capsys, ["calc", "--flow", "20", "--n", "0.03", *US_TRAP], "internal error", "no report could be written",
            status=UNEXPECTED_STATUS)


# ----------------------------------------------------------------------------- the same ranges in files

DEMO = json.loads(project.demo_path().read_text(encoding="utf-8"))


@pytest.mark.parametrize("where, value, words", [
    (("manning_n",), 1e-300, 'channels[0] "East verge ditch": manning_n: must be from 0.005 to 1, got 1e-300'),
    (("flow", "value"), 1e-320, "flow.value: must be from 1e-06 to 10000 m^3/s"),
    (("section", "bottom_width"), 1e-300, "section.bottom_width: must be 0 or from 0.01 to 100 m"),
    (("slope",), 1e-300, "slope: must be from 1e-06 to 1"),
], ids=["n", "flow", "bottom_width", "slope"])
def test_a_project_file_with_a_degenerate_number_is_refused(where, value, words):
    doc = json.loads(json.dumps(DEMO))
    target = doc["channels"][0]
    for key in where[:-1]:
        target = target[key]
    target[where[-1]] = value
    with pytest.raises(project.ProjectFileError) as info:
        project.loads(json.dumps(doc))
    assert words in str(info.value)


def test_the_demo_project_is_within_every_range():
    project.loads(json.dumps(DEMO))


GOOD = {"id": "ok", "shape": "trapezoid", "bottom_width": "2", "left_slope": "3", "right_slope": "3",
        "slope": "0.004", "flow": "20", "n": "0.03"}


@pytest.mark.parametrize("change, message", [
    ({"left_slope": "1e-300", "right_slope": "1e-300", "bottom_width": "0"}, "left_slope: must be 0 or from 0.05 to 50"),
    ({"shape": "circle", "bottom_width": "", "left_slope": "", "right_slope": "", "diameter": "1e-300"},
     "diameter: must be from 0.164 to 49.2 ft, got 1e-300 ft"),
    ({"flow": "1e-320"}, "flow: must be from 3.53e-05"),
    ({"n": "1e-300"}, "n: must be from 0.005 to 1, got 1e-300"),
    ({"n": "", "lining": "riprap", "d50": "1e308"}, "d50: must be from 0.00328 to 9.84 ft, got 1e+308 ft"),
], ids=["slit", "pipe", "flow", "n", "d50"])
def test_an_inventory_row_with_a_degenerate_number_is_invalid(change, message):
    header = list(ai.INPUT_COLUMNS)
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(header)
    for row in (GOOD, {**GOOD, **change, "id": "bad"}):
        w.writerow([row.get(c, "") for c in header])
    inv = ai.parse_inventory(buf.getvalue(), "us")
    res = ai.evaluate(inv, catalogue=SHIPPED)
    out = list(csv.DictReader(io.StringIO(ai.format_results(inv, res), newline="")))
    assert out[0]["verdict"] == "hydraulics-only"
    assert out[1]["verdict"] == "invalid" and message in out[1]["reason"], out[1]["reason"]


def test_one_table_gives_every_range():
    """Each edge reads hydraulics.validate.LIMITS: the same words for the same input."""
    assert hv.limit_for("manning_n") is hv.LIMITS["n"] and hv.limit_for("value") is hv.LIMITS["flow"]
    assert hv.LIMITS["left_slope"] is hv.LIMITS["side_slope"]
    assert hv.LIMITS["flow"].describe(hu.SI) == "from 1e-06 to 10000 m^3/s"
    assert hv.outside_limit("flow", 1.0) is None and hv.outside_limit("area", 1e-300) is None
    assert all(limit.source for limit in hv.LIMITS.values())


def test_the_window_field_refuses_what_the_files_refuse(qtbot):
    from app.gui.fields import NumberField
    from app.inputs import Input
    field = NumberField(Input("manning_n", "Manning's n", "", 0.0, False, 1.0, True))
    qtbot.addWidget(field.edit)
    field.show_value(0.03, hu.SI)
    assert field.parse("0.013") == 0.013
    with pytest.raises(ValueError, match="from 0.005 to 1; 1e-300 is outside"):
        field.parse("1e-300")
    diameter = NumberField(Input("section.diameter", "Diameter D", "length"))
    qtbot.addWidget(diameter.edit)
    diameter.show_value(0.9, hu.US)
    with pytest.raises(ValueError, match="from 0.164 to 49.2 ft"):
        diameter.parse("1e-300")
