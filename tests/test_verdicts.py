"""One verdict vocabulary for every front end (window, sheet, command line, batch)."""

import pytest

from app.context import Context
from app.evaluate import evaluate_channel
from app import channel_display as display
from app.project import Channel, FlowBasis, LiningChoice
from app.verdicts import Verdict, verdict_of
from hydraulics import many_reaches as mr
from hydraulics.units import US
from hydraulics.wording import in_units

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

TRAPEZOID = {"shape": "trapezoid", "bottom_width": 0.4, "left_slope": 3.0, "right_slope": 3.0}


def test_the_batch_tokens_are_the_vocabularys():
    """The batch CSV's verdict column (a published contract, README) uses the same tokens; only too-shallow is
    given where the depth of the ditch is known, which an inventory does not say."""
    assert mr.VERDICTS == tuple(v.token for v in Verdict if v is not Verdict.TOO_SHALLOW)
    assert len({v.words for v in Verdict}) == len({v.heading for v in Verdict}) == len(Verdict)
    assert all(Verdict.from_token(v.token) is v for v in Verdict)
    with pytest.raises(ValueError, match="no verdict 'pass'"):
        Verdict.from_token("pass")


@pytest.mark.parametrize("lining, expected", [("gravel", Verdict.UNSTABLE), ("concrete", Verdict.NON_ERODIBLE),
                                              ("riprap", Verdict.STABLE), (None, Verdict.HYDRAULICS_ONLY)])
def test_window_and_sheet_share_the_verdict(lining, expected):
    ch = Channel(flow=FlowBasis(value=0.42), slope=0.008, manning_n=0.03, section=TRAPEZOID,
                 lining=None if lining is None else LiningChoice(lining))
    design = evaluate_channel(ch, catalogue=SHIPPED)
    assert design.verdict is expected
    ev = display.evaluate(ch, Context.load(units="si"))
    assert (ev.verdict.headline, ev.verdict.status) == (expected.words, expected.status)


def test_a_pipe_too_shallow_for_its_freeboard_says_so_everywhere():
    """Design depth plus freeboard above the crown: the window and the sheet both say too shallow (before this
    vocabulary, the window said "Too small" and the sheet the lining's verdict)."""
    ch = Channel(flow=FlowBasis(value=0.2), slope=0.0015, lining=LiningChoice("concrete"),
                 section={"shape": "circle", "diameter": 0.6})
    design = evaluate_channel(ch, catalogue=SHIPPED)
    assert design.total_depth > 0.6 and design.verdict is Verdict.TOO_SHALLOW
    ev = display.evaluate(ch, Context.load(units="us"))
    assert ev.verdict.headline == "Too shallow" and ev.verdict.status == "fail"
    assert "ft" in ev.verdict.reason and "crown of the pipe" in ev.verdict.reason
    assert verdict_of(design.stability) is Verdict.NON_ERODIBLE      # without the depth it is the lining's
    assert "above the crown of the pipe" in in_units(ev.verdict.reason, US)


def test_the_sheet_prints_the_heading(tmp_path):
    from pypdf import PdfReader
    from app.project import Project
    from app.sheet import export_sheets
    pipe = Channel(name="Invented shallow pipe", flow=FlowBasis(value=0.2), slope=0.0015,
                   lining=LiningChoice("concrete"), section={"shape": "circle", "diameter": 0.6})
    ditch = Channel(name="Invented earth ditch", flow=FlowBasis(value=0.42), slope=0.008, manning_n=0.03,
                    section=TRAPEZOID)
    path = tmp_path / "v.pdf"
    export_sheets(Project(name="Invented", channels=[pipe, ditch]), path, catalogue=SHIPPED)
    first, second = (p.extract_text().replace("\n", " ") for p in PdfReader(path).pages)
    assert "TOO SHALLOW" in first and "Reason: water plus freeboard reaches" in first
    assert "HYDRAULICS ONLY" in second  # the earth ditch has no lining


def test_calc_and_compare_json_speak_the_one_vocabulary(capsys):
    """`calc --json` stability.verdict and `compare --json` rows carry tokens, the batch CSV's words."""
    import json

    from app.main import main
    tokens = {v.token for v in Verdict}
    common = ["--units", "si", "--shape", "trapezoid", "--bottom-width", "0.6", "--side-slope", "3", "--slope", "0.03",
              "--flow", "0.8"]
    assert main(["compare", *common, "--lining", "grass_good_sod", "--lining", "concrete", "--json"]) == 0
    rows = json.loads(capsys.readouterr().out)
    assert [r["verdict"] for r in rows] == ["unstable", "non-erodible"]
    assert main(["calc", *common, "--lining", "grass_good_sod", "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    assert out["stability"]["verdict"] == "unstable" and out["verdict"] in tokens
