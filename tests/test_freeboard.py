"""The top of the ditch: one freeboard rule and one wording for lined channels and channels without a lining.

Geometry: Chow, Open-Channel Hydraulics (1959), Table 2-1 (trapezoid top width b + 2 z y; circle
T = 2 sqrt(y (D - y))). The freeboard minimum and the bend superelevation V^2 T / (g Rc) are HEC-15 Sections 2
and 3.4, not yet verified against the circular (hydraulics/provenance.py, keys freeboard and superelevation):
here the point is that every front end applies and words the same rule.
"""

import math

import numpy as np

import pytest

import hydraulics as hy
from app.evaluate import evaluate_channel
from app.project import Channel, FlowBasis, LiningChoice
from hydraulics.freeboard import FREEBOARD_SOURCE, ditch_top, ditch_tops, freeboard_rule
from hydraulics.linings import hec15, load_catalogue
from hydraulics.stability import check_lining
from hydraulics.units import SI, US
from hydraulics.wording import in_units
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

TRAPEZOID = {"shape": "trapezoid", "bottom_width": 0.6, "left_slope": 3.0, "right_slope": 3.0}


def test_straight_reach_adds_the_minimum():
    sec = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
    r = hy.analyse(sec, 0.8, 0.004, 0.03)
    top = ditch_top(sec, r.normal_depth, r.velocity, r.top_width, r.froude, min_freeboard=0.2)
    assert top.freeboard == 0.2 and top.superelevation is None and top.warnings == ()
    assert top.total_depth == pytest.approx(r.normal_depth + 0.2, rel=1e-15)
    assert top.top_width == pytest.approx(0.6 + 2 * 3.0 * (r.normal_depth + 0.2), rel=1e-12)


def test_bend_adds_the_superelevation():
    sec = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
    r = hy.analyse(sec, 0.8, 0.004, 0.03)
    top = ditch_top(sec, r.normal_depth, r.velocity, r.top_width, r.froude, bend_radius=12.0)
    se = r.velocity ** 2 * r.top_width / (9.80665 * 12.0)
    assert top.superelevation == pytest.approx(se, rel=1e-12)
    assert top.freeboard == pytest.approx(hec15.MIN_FREEBOARD + se, rel=1e-12)


def test_a_pipe_too_shallow_for_the_freeboard_is_reported_not_widened():
    pipe = hy.Circle(diameter=0.6)
    r = hy.analyse(pipe, 0.25, 0.0015, 0.013)
    assert r.normal_depth + hec15.MIN_FREEBOARD > 0.6
    top = ditch_top(pipe, r.normal_depth, r.velocity, r.top_width, r.froude)
    assert top.depth_at_top == 0.6 and top.top_width == pytest.approx(0.0, abs=1e-9)
    (warning,) = top.warnings
    assert "not deep enough for the freeboard" in warning
    # restated in the user's units: a US project reads feet, never metres
    us = in_units(warning, US)
    assert f"{(r.normal_depth + 0.15) / 0.3048:.3g} ft" in us and f"{0.6 / 0.3048:.3g} ft" in us


def test_supercritical_flow_in_a_bend_is_cautioned_for_every_channel():
    sec = hy.Trapezoid(bottom_width=0.6, side_slope=2.0)
    r = hy.analyse(sec, 1.13, 0.05, 0.015)
    assert r.froude > 1
    top = ditch_top(sec, r.normal_depth, r.velocity, r.top_width, r.froude, bend_radius=20.0)
    assert any("cross waves" in w for w in top.warnings)
    unlined = evaluate_channel(Channel(flow=FlowBasis(value=1.13), slope=0.05, manning_n=0.015, bend_radius=20.0,
                                       section={"shape": "trapezoid", "bottom_width": 0.6, "left_slope": 2.0,
                                                "right_slope": 2.0}), catalogue=SHIPPED)
    assert any("cross waves" in w for w in unlined.warnings)


def test_lined_and_unlined_channels_word_the_rule_alike():
    unlined = evaluate_channel(Channel(flow=FlowBasis(value=0.8), slope=0.004, manning_n=0.03, bend_radius=12.0,
                                       section=TRAPEZOID), catalogue=SHIPPED)
    lined = evaluate_channel(Channel(flow=FlowBasis(value=0.8), slope=0.004, lining=LiningChoice("concrete"),
                                     bend_radius=12.0, section=TRAPEZOID), catalogue=SHIPPED)
    for design in (unlined, lined):
        (note,) = [n for n in design.notes if n.startswith("freeboard: ")]
        assert note == "freeboard: " + freeboard_rule(hec15.MIN_FREEBOARD, design.superelevation,
                                                      wave_allowance=design.wave_allowance)
        assert note == "freeboard: " + design.freeboard_rule()
        assert FREEBOARD_SOURCE in note and "superelevation in the bend" in note
    assert lined.stability.freeboard_rule() == lined.freeboard_rule()
    # concrete (n 0.015 or so) runs supercritical on this grade, the grassless earth ditch (n 0.03) does not
    assert lined.analysis.froude > 1 and lined.wave_allowance is not None
    assert unlined.analysis.froude < 1 and unlined.wave_allowance is None


def test_rule_in_us_units():
    text = freeboard_rule(0.1524, 0.03, US)
    assert text.startswith("minimum freeboard 0.500 ft") and "0.0984 ft superelevation" in text
    assert freeboard_rule(0.15, None, SI).startswith("minimum freeboard 0.150 m") and "superelevation" not in \
        freeboard_rule(0.15, None, SI)


def test_the_core_check_uses_the_same_ditch_top():
    sec = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
    st = check_lining(sec, 0.8, 0.004, load_catalogue().get("riprap"), bend_radius=12.0, min_freeboard=0.2)
    top = ditch_top(sec, st.depth, st.velocity, float(st.analysis.top_width), st.froude, 12.0, 0.2)
    assert (st.freeboard, st.superelevation, st.total_depth, st.top_width_at_top) == (
        top.freeboard, top.superelevation, top.total_depth, top.top_width)
    assert math.isfinite(st.total_depth)


def test_an_unlined_pipe_warns_in_the_projects_units():
    """The window, sheet and command line restate the one worded warning; none prints metres in a US project."""
    design = evaluate_channel(Channel(flow=FlowBasis(value=0.25), slope=0.0015, manning_n=0.013,
                                      section={"shape": "circle", "diameter": 0.6}), catalogue=SHIPPED)
    (warning,) = [w for w in design.warnings if "not deep enough for the freeboard" in w]
    us = in_units(warning, US)
    assert " ft" in us and " m)" not in us and " m " not in us


def test_supercritical_flow_raises_the_freeboard_to_the_flow_depth():
    """HEC-15 Section 2.1.1: supercritical flow "may create surface waves whose height approaches the depth of
    flow"; the program keeps a wave as high as the depth inside the ditch and says that this rule set it."""
    # an invented steep riprap chute, 20 % grade: Froude number well above 1, depth above the 0.15 m minimum
    chute = hy.Trapezoid(bottom_width=0.6, side_slope=2.0)
    st = check_lining(chute, 1.5, 0.20, load_catalogue().get("riprap"), d50=0.45)
    assert st.froude > 1.0 and st.depth > hec15.MIN_FREEBOARD
    assert st.freeboard == st.depth == st.wave_allowance and st.total_depth == pytest.approx(2 * st.depth)
    rule = st.freeboard_rule()
    assert "raised to" in rule and "surface waves whose height approaches the depth" in rule
    assert "HEC-15 Section 2.1.1" in rule
    # a mild ditch keeps the minimum, and its rule does not mention waves
    mild = check_lining(hy.Trapezoid(bottom_width=0.6, side_slope=3.0), 0.8, 0.004, load_catalogue().get("riprap"))
    assert mild.froude < 1 and mild.wave_allowance is None and "raised to" not in mild.freeboard_rule()
    # shallow supercritical flow below the minimum keeps the minimum
    thin = ditch_top(chute, 0.05, 3.0, 0.8, 4.3)
    assert thin.freeboard == hec15.MIN_FREEBOARD and thin.wave_allowance is None


def test_unlined_supercritical_channel_gets_the_same_rule():
    design = evaluate_channel(Channel(flow=FlowBasis(value=1.13), slope=0.05, manning_n=0.015,
                                      section={"shape": "trapezoid", "bottom_width": 0.6, "left_slope": 2.0,
                                               "right_slope": 2.0}), catalogue=SHIPPED)
    y = design.analysis.normal_depth
    assert design.analysis.froude > 1 and y > hec15.MIN_FREEBOARD
    assert design.freeboard == y == design.wave_allowance
    (note,) = [n for n in design.notes if n.startswith("freeboard: ")]
    assert note == "freeboard: " + design.freeboard_rule() and "raised to" in note


def test_the_array_form_gives_each_channel_what_the_one_channel_form_gives():
    """ditch_tops (a ditch run's screening) and ditch_top (one channel) are one rule: straight and bent reaches,
    supercritical flow (freeboard raised to the depth, HEC-15 Section 2.1.1), a pipe too shallow for depth plus
    freeboard. Channels invented; the top width of a trapezoid is b + 2 z y (Chow 1959, Table 2-1)."""
    trapezoid, pipe = hy.Trapezoid(bottom_width=0.6, side_slope=3.0), hy.Circle(diameter=0.6)
    depth = np.array([0.3, 0.3, 0.05, 0.4, 0.5, 0.2])
    velocity = np.array([1.0, 2.5, 3.0, 4.0, 1.2, 0.8])
    top = np.array([2.4, 2.4, 0.9, 3.0, 2.0, 1.5])
    froude = np.array([0.6, 1.6, 4.3, 2.1, 1.5, 0.5])
    radius = np.array([np.nan, 15.0, np.nan, 9.0, np.nan, 20.0])
    for section in (trapezoid, pipe):
        tops = ditch_tops(section, depth, velocity, top, froude, radius, 0.2)
        for i in range(depth.size):
            one = ditch_top(section, depth[i], velocity[i], top[i], froude[i],
                            None if np.isnan(radius[i]) else radius[i], 0.2)
            assert tops.freeboard[i] == one.freeboard and tops.total_depth[i] == one.total_depth
            assert tops.depth_at_top[i] == one.depth_at_top and tops.top_width[i] == pytest.approx(one.top_width,
                                                                                                  rel=1e-12)
            assert (one.superelevation is None) == np.isnan(tops.superelevation[i])
            assert (one.wave_allowance is None) == np.isnan(tops.wave_allowance[i])
            assert tops.supercritical_bend[i] == any("cross waves" in w for w in one.warnings)
            assert tops.too_shallow[i] == any("not deep enough" in w for w in one.warnings)
    tops = ditch_tops(trapezoid, depth, velocity, top, froude, radius, 0.2)
    assert tops.freeboard[4] == 0.5 and tops.freeboard[0] == 0.2               # raised to the depth; the minimum
    assert tops.top_width[0] == pytest.approx(0.6 + 2 * 3.0 * 0.5, rel=1e-12)
    assert tops.supercritical_bend.tolist() == [False, True, False, True, False, False]
    assert ditch_tops(pipe, depth, velocity, top, froude, radius, 0.2).too_shallow.any()
