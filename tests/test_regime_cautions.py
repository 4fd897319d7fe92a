"""Cautions on the flow regime reach every front end, on every lining, rigid ones included.

FHWA HEC-15, 3rd ed. (Kilgore and Cotton, 2005), Section 2.1.1: supercritical flow "may create surface
waves whose height approaches the depth of flow", and on very steep grades the flow may splash and surge,
so that freeboard needs special consideration. The near-critical band (0.8 to 1.2) is
hydraulics.analysis.NEAR_CRITICAL_BAND with its source.
"""

import json
from pathlib import Path

import pytest
from pypdf import PdfReader

import hydraulics as hy
from app import project as P
from app.evaluate import evaluate_channel
from app.main import main
from app.sheet import export_sheets
from hydraulics.linings import load_catalogue
from hydraulics.stability import check_lining
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

# An invented steep concrete chute: Froude number about 3.4 (supercritical).
STEEP = dict(shape="trapezoid", bottom_width=0.6, side_slope=2.0)
FLOW, SLOPE = 1.13, 0.05
CLI = ["--units", "si", "--shape", "trapezoid", "--bottom-width", "0.6", "--side-slope", "2", "--slope", "0.05",
       "--flow", "1.13"]


def _supercritical(texts):
    return [t for t in texts if "is supercritical" in t]


def test_core_cautions_a_rigid_lining_in_supercritical_flow():
    section = hy.Trapezoid(bottom_width=0.6, side_slope=2.0)
    r = check_lining(section, FLOW, SLOPE, load_catalogue().get("concrete"))
    assert r.verdict == "non-erodible" and r.froude > 1.2
    (text,) = _supercritical(r.warnings)
    assert f"Froude number {r.froude:.2f}" in text and "HEC-15 Section 2.1.1" in text
    assert "surface waves" in text and "freeboard" in text and "jump" in text


def test_subcritical_flow_gets_no_regime_caution():
    r = hy.analyse(hy.Trapezoid(bottom_width=2.0, side_slope=3.0), 1.0, 0.0005, 0.03)
    assert r.froude < 0.8
    assert not any("critical" in w for w in r.warnings)


def test_near_critical_and_supercritical_are_told_apart():
    section = hy.Rectangle(bottom_width=1.0)
    s_c = hy.analyse(section, 1.0, 0.001, 0.015).critical_slope  # normal depth = critical depth there
    at = hy.analyse(section, 1.0, s_c, 0.015)
    assert at.froude == pytest.approx(1.0, abs=1e-6)
    assert any("is near critical (band 0.8 to 1.2" in w for w in at.warnings) and not _supercritical(at.warnings)
    steep = hy.analyse(section, 1.0, 20 * s_c, 0.015)
    assert steep.froude > 1.2 and len(_supercritical(steep.warnings)) == 1
    assert not any("near critical" in w for w in steep.warnings)


def test_array_results_count_the_supercritical_channels():
    section = hy.Rectangle(bottom_width=[1.0, 1.0, 1.0])
    r = hy.analyse(section, 1.0, [0.0005, 0.05, 0.08], 0.015)
    (text,) = _supercritical(r.warnings)
    assert text.startswith("2 of 3 channels: ")


def test_calc_and_compare_json_carry_the_caution(capsys):
    assert main(["calc", *CLI, "--lining", "concrete", "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    assert out["froude"] > 1.2 and len(_supercritical(out["warnings"])) == 1
    assert main(["compare", *CLI, "--lining", "concrete", "--lining", "riprap:0.3", "--json"]) == 0
    rows = json.loads(capsys.readouterr().out)
    assert [r["lining"] for r in rows] == ["concrete", "riprap"]
    for row in rows:  # each lining's own Froude number sets its caution (the stone is rougher: near critical)
        assert len(_supercritical(row["warnings"])) == (row["froude"] > 1.2)
        assert any("is near critical" in w for w in row["warnings"]) == (0.8 <= row["froude"] <= 1.2)
    assert rows[0]["froude"] > 1.2 and 0.8 <= rows[1]["froude"] <= 1.2


def test_window_evaluation_and_sheet_carry_the_caution(tmp_path):
    ch = P.Channel(name="Steep chute (invented)", flow=P.FlowBasis(value=FLOW), slope=SLOPE,
                   section={"shape": "trapezoid", "bottom_width": 0.6, "left_slope": 2.0, "right_slope": 2.0},
                   lining=P.LiningChoice("concrete", None), manning_n=None)
    design = evaluate_channel(ch, catalogue=SHIPPED)  # what the window shows
    assert len(_supercritical(design.warnings)) == 1
    proj = P.Project(name="Invented chute", units="si", channels=[ch])
    path = Path(tmp_path) / "chute.pdf"
    export_sheets(proj, path, catalogue=SHIPPED)
    text = " ".join(PdfReader(path).pages[0].extract_text().split())
    assert "is supercritical" in text and "HEC-15 Section 2.1.1" in text
    assert "None from the checks made" not in text
