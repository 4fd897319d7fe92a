"""The window's computations: they call the core, never raise for bad input, and import no Qt."""

import subprocess
import sys

import pytest

import hydraulics as hy
from app import project as pj
from app.context import Context
from app import channel_display as display
from hydraulics import rational

SI_CONTEXT, US_CONTEXT = Context.load(units="si"), Context.load(units="us")   # the shipped catalogue


def test_compute_imports_no_gui_library():
    code = ("import sys, app.channel_display; "
            "print(','.join(m for m in ('PySide6', 'matplotlib') if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == ""


def test_evaluation_is_the_core_analysis():
    ch = pj.Channel(slope=0.004, manning_n=0.025)
    ev = display.evaluate(ch, SI_CONTEXT)
    r = hy.analyse(ch.build_section(), ch.flow.value, 0.004, 0.025)
    assert ev.ok and ev.result.normal_depth == r.normal_depth and ev.result.froude == r.froude
    assert ev.total_depth == pytest.approx(r.normal_depth + ch.min_freeboard)


def test_rational_flow_and_kirpich_time_come_from_the_core():
    fb = pj.FlowBasis(method="rational", runoff_coefficient=0.5, intensity=2e-5, area=4e4,
                      flow_length=300.0, flow_path_slope=0.02)
    ev = display.evaluate(pj.Channel(flow=fb), SI_CONTEXT)
    assert ev.flow == pytest.approx(rational.rational_flow(0.5, 2e-5, 4e4))
    assert ev.time_of_concentration == pytest.approx(rational.kirpich_time(300.0, 0.02))
    assert any("Kirpich" in w for w in ev.warnings)                # 2 % is outside Kirpich's 3-10 %


@pytest.mark.parametrize("channel, field, words", [
    (pj.Channel(flow=pj.FlowBasis(method="rational")), "runoff_coefficient", "Runoff coefficient C"),
    (pj.Channel(manning_n=None), "manning_n", "Manning's n"),
    (pj.Channel(lining=pj.LiningChoice("no_such_lining")), "lining", "unknown lining"),
    (pj.Channel(section={"shape": "triangle", "left_slope": 0.0, "right_slope": 0.0}), "side_slope", "V-ditch"),
], ids=["rational-missing-C", "no-n", "unknown-lining", "flat-V"])
def test_bad_input_is_a_message_not_an_exception(channel, field, words):
    ev = display.evaluate(channel, SI_CONTEXT)
    assert not ev.ok and ev.error_field == field and words in ev.error
    assert ev.verdict.status == "none"


def test_overtopped_pipe_is_a_failed_verdict_with_the_reason():
    ch = pj.Channel(section={"shape": "circle", "diameter": 0.6}, flow=pj.FlowBasis(value=0.2), slope=0.003,
                    manning_n=0.013, min_freeboard=0.3)    # y = 0.33 m; 0.33 + 0.3 > D
    ev = display.evaluate(ch, US_CONTEXT)
    assert ev.ok and ev.verdict.status == "fail" and "ft" in ev.verdict.reason


def outfall():
    return next(c for c in pj.loads(pj.demo_path().read_text(encoding="utf-8")).channels if c.alternatives)


def test_comparison_rows_agree_with_single_lining_evaluations():
    ch = outfall()
    rows, reason = display.compare(ch, SI_CONTEXT)
    assert reason == "" and rows[0].choice.key == ch.lining.key
    assert {r.choice.key for r in rows} == {ch.lining.key} | {a.key for a in ch.alternatives}
    for row in rows:
        single = display.evaluate(display.with_lining(ch, row.choice), SI_CONTEXT)
        assert single.result.normal_depth == pytest.approx(row.evaluation.result.normal_depth, rel=1e-12)
        assert single.verdict == row.evaluation.verdict


def seen(text):
    """A label's text as read: no-break spaces and word joiners (which keep a unit on one line) as plain text."""
    return text.replace("\u2060", "").replace("\u00a0", " ")


def test_comparison_table_as_tab_separated_text():
    rows, _ = display.compare(outfall(), SI_CONTEXT)
    lines = display.comparison_tsv(rows, SI_CONTEXT).splitlines()
    assert len(lines) == len(rows) + 1
    assert all(line.count("\t") == len(display.COMPARISON_COLUMNS) - 1 for line in lines)
    assert lines[0].startswith("Lining\tDepth [m]\tVelocity [m/s]")
    riprap = next(i for i, r in enumerate(rows) if r.choice.key == "riprap")
    cells = lines[riprap + 1].split("\t")
    assert cells[0].startswith(rows[riprap].name) and "D50 150.0 mm" in cells[0]   # to a tenth, as in the results
    assert float(cells[1]) == pytest.approx(rows[riprap].core.depth, abs=5e-4)
    us = display.comparison_tsv(rows, US_CONTEXT).splitlines()[riprap + 1].split("\t")
    assert "D50 5.9 in" in us[0] and float(us[1]) == pytest.approx(rows[riprap].core.depth / 0.3048, abs=2e-3)


def test_gravel_mulch_example_fails_in_words():
    # FHWA HEC-15 (Kilgore and Cotton, 3rd ed., 2005), gravel-mulch design example, SI (not verified):
    # Q = 0.42 m^3/s, B = 0.4 m, Z = 3, S = 0.008, D50 = 25 mm; depth near 0.35 m, design shear near
    # 27 N/m^2, above the permissible shear, so the lining fails.
    ch = pj.Channel(flow=pj.FlowBasis(value=0.42), slope=0.008,
                    section={"shape": "trapezoid", "bottom_width": 0.4, "left_slope": 3.0, "right_slope": 3.0},
                    lining=pj.LiningChoice("gravel", d50=0.025))
    ev = display.evaluate(ch, SI_CONTEXT)
    assert ev.result.normal_depth == pytest.approx(0.35, abs=0.03)
    assert ev.lining.bed_shear == pytest.approx(27, rel=0.1)
    assert ev.verdict.status == "fail" and ev.verdict.headline == "Not stable"
    assert "permissible" in ev.verdict.reason and "Pa" in ev.verdict.reason
    assert "lb/ft^2" in display.evaluate(ch, US_CONTEXT).verdict.reason


def test_rigid_lining_passes_as_non_erodible():
    ev = display.evaluate(pj.Channel(lining=pj.LiningChoice("concrete")), SI_CONTEXT)
    assert ev.verdict.status == "pass" and ev.verdict.headline == "Non-erodible"
    assert ev.lining.layer_thickness is not None and ev.lining.layer_thickness > 0


def test_the_panel_values_are_those_of_the_governing_check_without_qt():
    """The values the results panel lists (app.results.PANEL_FIELDS) are chosen in the Qt-free layer: for the
    HEC-15 gravel-mulch example above (not verified) the permissible shear and safety factor of the check that
    governs, the factor written with the one it needs; a rigid lining is non-erodible, with no factor."""
    from app.results import PANEL_FIELDS, panel_field, rounded
    gravel = pj.Channel(flow=pj.FlowBasis(value=0.42), slope=0.008,
                        section={"shape": "trapezoid", "bottom_width": 0.4, "left_slope": 3.0, "right_slope": 3.0},
                        lining=pj.LiningChoice("gravel", d50=0.025))
    ev = display.evaluate(gravel, SI_CONTEXT)
    values = display.panel_values(ev, decimal_mark=",")
    assert set(values) == {f.key for f in PANEL_FIELDS}
    gov = ev.lining.governing_check()
    assert values["permissible_shear"] == gov.permissible_shear and values["bed_shear"] == ev.lining.bed_shear
    sf = panel_field("safety_factor")     # the one rounding rule, with the decimal mark asked for
    assert values["safety_factor"] == (f"{rounded(gov.safety_factor, sf, ',')} "
                                       f"(need {rounded(gov.required_safety_factor, sf, ',')})")
    assert "," in values["safety_factor"]
    assert values["normal_depth"] == ev.result.normal_depth and values["bend_shear"] is None
    rigid = display.panel_values(display.evaluate(pj.Channel(lining=pj.LiningChoice("concrete")), SI_CONTEXT))
    assert rigid["permissible_shear"] == "non-erodible" and rigid["safety_factor"] == "\u2014"


def test_curves_cover_the_design_point():
    ch = pj.Channel()
    ev = display.evaluate(ch, SI_CONTEXT)
    rating = display.rating(ch, ev)
    assert rating.depths.max() >= ev.total_depth and (rating.flows[1:] > rating.flows[:-1]).all()
    energy = display.energy(ch, ev)
    assert energy.depths.min() < ev.result.critical_depth < energy.depths.max()
    assert energy.min_energy <= energy.energy.min() + 1e-12


def test_results_panel_restates_core_warnings_in_the_session_units(qtbot):
    # A concrete ditch on a flat grade runs below the self-cleaning velocity (0.61 m/s, 2 ft/s, Chow 1959,
    # Sec. 7-3, not verified); the core words the warning in SI, the panel shows it in the session's units.
    from app.gui.results_view import ResultsPanel

    ch = pj.Channel(flow=pj.FlowBasis(value=0.2), slope=0.0005,
                    section={"shape": "trapezoid", "bottom_width": 2.0, "left_slope": 3.0, "right_slope": 3.0},
                    lining=pj.LiningChoice("concrete"))
    panel = ResultsPanel()
    qtbot.addWidget(panel)
    panel.show_evaluation(display.evaluate(ch, US_CONTEXT), hy.units.US)
    assert "Velocity 1.38 ft/s is below 2.00 ft/s" in seen(panel.warnings.text())
    panel.show_evaluation(display.evaluate(ch, SI_CONTEXT), hy.units.SI)
    assert "Velocity 0.420 m/s is below 0.610 m/s" in seen(panel.warnings.text())
