"""The channel evaluation facade (app.evaluate) used by the window, the design sheet and the batch checker."""

import pytest

import hydraulics as hy
from app.evaluate import ChannelDesign, evaluate_channel, load_default_catalogue
from app.project import Channel, FlowBasis, LiningChoice, Project, dumps, loads
from hydraulics.lining_comparison import compare_linings
from hydraulics.stability import check_lining
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone


@pytest.fixture(scope="module")
def cat():
    return load_default_catalogue()


def test_plain_manning_channel():
    ch = Channel(flow=FlowBasis(value=0.8), slope=0.004, manning_n=0.03,
                 section={"shape": "trapezoid", "bottom_width": 0.6, "left_slope": 3.0, "right_slope": 3.0})
    d = evaluate_channel(ch, catalogue=SHIPPED)
    assert isinstance(d, ChannelDesign) and d.stability is None and d.stable is None and d.comparison == []
    y = hy.normal_depth(hy.Trapezoid(bottom_width=0.6, side_slope=3.0), 0.8, 0.004, 0.03)
    assert d.analysis.normal_depth == pytest.approx(y, rel=1e-12) and d.flow == 0.8
    assert d.total_depth == pytest.approx(y + 0.15) and d.freeboard == pytest.approx(0.15)
    assert d.top_width_at_top == pytest.approx(0.6 + 6 * (y + 0.15))


def test_lined_channel_matches_the_core_check(cat):
    ch = Channel(flow=FlowBasis(value=0.42), slope=0.008, lining=LiningChoice("gravel"), bend_radius=None,
                 section={"shape": "trapezoid", "bottom_width": 0.4, "left_slope": 3.0, "right_slope": 3.0})
    d = evaluate_channel(ch, cat)
    single = check_lining(hy.Trapezoid(bottom_width=0.4, side_slope=3.0), 0.42, 0.008, cat.get("gravel"))
    assert d.stability.safety_factor == single.safety_factor and d.stable is False
    assert d.analysis is d.stability.analysis and d.total_depth == single.total_depth
    assert all(w in d.warnings for w in single.warnings)
    assert any("lining's own n" in n for n in d.notes)  # the default manning_n is not used with a lining
    assert any(n.startswith("freeboard: minimum freeboard") for n in d.notes)


def test_rational_flow_basis():
    # Rational method Q = C i A; HEC-22 (FHWA, 3rd ed., 2009) Eq. 3-1 in SI: Q = 0.00278 C i A, i in mm/h, A in ha.
    basis = FlowBasis(method="rational", runoff_coefficient=0.6, intensity=75 / 3.6e6, area=3.0e4,
                      flow_length=250.0, flow_path_slope=0.04)
    d = evaluate_channel(Channel(flow=basis, manning_n=0.03), catalogue=SHIPPED)
    assert d.flow == pytest.approx(0.00278 * 0.6 * 75 * 3.0, rel=1e-3) and d.flow_method == "rational"
    # Kirpich (1940): t_c = 0.0078 L^0.77 S^-0.385 minutes with L in ft
    assert d.time_of_concentration == pytest.approx(60 * 0.0078 * (250 / 0.3048) ** 0.77 * 0.04 ** -0.385)
    assert any("rational method" in n for n in d.notes)


def test_rational_flow_missing_fields_are_named():
    with pytest.raises(hy.InputError) as e:
        evaluate_channel(Channel(flow=FlowBasis(method="rational", runoff_coefficient=0.5, intensity=None,
                                                area=1e4)), catalogue=SHIPPED)
    assert e.value.field == "intensity"
    with pytest.raises(hy.InputError) as e:
        evaluate_channel(Channel(flow=FlowBasis(method="rational", runoff_coefficient=0.5, intensity=1e-5,
                                                area=1e4, flow_length=100.0)), catalogue=SHIPPED)
    assert e.value.field == "flow.flow_path_slope"


def test_no_lining_and_no_n_is_refused():
    with pytest.raises(hy.InputError) as e:
        evaluate_channel(Channel(manning_n=None), catalogue=SHIPPED)
    assert e.value.field == "manning_n"


def test_alternatives_give_comparison_rows_in_order(cat):
    ch = Channel(lining=LiningChoice("riprap", 0.2), alternatives=[LiningChoice("concrete"), LiningChoice("gravel")],
                 bend_radius=20.0, min_freeboard=0.2)
    d = evaluate_channel(ch, cat)
    assert [r.key for r in d.comparison] == ["riprap", "concrete", "gravel"]
    rows = compare_linings(ch.build_section(), ch.design_flow(), ch.slope, [("riprap", 0.2), "concrete", "gravel"],
                           cat, bend_radius=20.0, min_freeboard=0.2)
    assert [(r.depth, r.verdict, r.safety_factor) for r in d.comparison] == \
        [(r.depth, r.verdict, r.safety_factor) for r in rows]
    assert d.comparison[0].safety_factor == d.stability.safety_factor


def test_an_alternative_that_repeats_a_lining_is_compared_once(cat):
    ch = Channel(lining=LiningChoice("riprap", 0.2),
                 alternatives=[LiningChoice("riprap", 0.2), LiningChoice("concrete"), LiningChoice("riprap", 0.3),
                               LiningChoice("concrete")])
    d = evaluate_channel(ch, cat)
    assert [(r.key, r.d50) for r in d.comparison] == [("riprap", 0.2), ("concrete", None), ("riprap", 0.3)]


def test_user_catalogue_path_prices_the_comparison(tmp_path):
    user = tmp_path / "linings.toml"
    assert load_default_catalogue(user).get("concrete").unit_cost is None  # no file yet: shipped only
    user.write_text('schema_version = 1\n[[lining]]\nkey = "concrete"\nunit_cost = 70.0\n')
    cat = load_default_catalogue(user)
    d = evaluate_channel(Channel(lining=LiningChoice("gravel"), alternatives=[LiningChoice("concrete")]), cat)
    conc = d.comparison[1]
    assert conc.cost_per_length == pytest.approx(70.0 * conc.lined_width) and d.comparison[0].cost_per_length is None


def test_a_saved_project_evaluates_the_same(cat):
    p = Project(channels=[Channel(name="A", lining=LiningChoice("riprap", 0.15), bend_radius=12.0),
                          Channel(name="B", manning_n=0.025)])
    back = loads(dumps(p))
    for a, b in zip(p.channels, back.channels):
        da, db = evaluate_channel(a, cat), evaluate_channel(b, cat)
        assert da.analysis.normal_depth == db.analysis.normal_depth and da.warnings == db.warnings


def test_unknown_lining_key_names_the_field(cat):
    with pytest.raises(hy.InputError) as e:
        evaluate_channel(Channel(lining=LiningChoice("marble")), cat)
    assert e.value.field == "lining" and "riprap" in str(e.value)


def test_to_dict_matches_the_calc_json(capsys, cat):
    import json
    from app.main import main
    from hydraulics.units import SYSTEMS
    ch = Channel(flow=FlowBasis(value=0.42), slope=0.008, lining=LiningChoice("gravel"), bend_radius=6.0,
                 section={"shape": "trapezoid", "bottom_width": 0.4, "left_slope": 3.0, "right_slope": 3.0})
    d = evaluate_channel(ch, cat).to_dict(SYSTEMS["si"])
    assert main(["calc", "--units", "si", "--flow", "0.42", "--slope", "0.008", "--bottom-width", "0.4",
                 "--side-slope", "3", "--lining", "gravel:0.025", "--bend-radius", "6", "--json"]) == 0
    cli = json.loads(capsys.readouterr().out)
    for key in ("normal_depth", "velocity", "froude", "manning_n", "lining", "stability", "units"):
        assert d[key] == cli[key]
    json.dumps(d, allow_nan=False)


def test_surveyed_section_without_n_uses_its_own_n_per_segment():
    from app.evaluate import evaluate_channel
    from app.project import Channel, FlowBasis
    import hydraulics as hy
    section = {"shape": "irregular", "stations": [0, 2, 4, 6], "elevations": [1.0, 0, 0, 1.0],
               "n": [0.035, 0.015, 0.035]}
    design = evaluate_channel(Channel(name="Surveyed", flow=FlowBasis(value=0.6), slope=0.004, section=section,
                                      manning_n=None), catalogue=SHIPPED)
    assert design.analysis.normal_depth == hy.normal_depth(hy.section_from_dict(section), 0.6, 0.004)


# ------------------------------------------------------------------ the modes `calc` and `compare` go through
def test_width_for_depth_gives_a_channel_that_runs_at_the_allowed_depth():
    """The width found puts the normal depth at the allowed depth (its definition: common practice); a V-ditch that
    already runs shallow enough comes back as a triangle of width 0."""
    from app.evaluate import width_for_depth

    ch = Channel(flow=FlowBasis(value=2.0), slope=0.004, manning_n=0.015,
                 section={"shape": "trapezoid", "left_slope": 2.0, "right_slope": 2.0})
    sized, width = width_for_depth(ch, 0.6, SHIPPED)
    assert width > 0 and sized.section == {"shape": "trapezoid", "bottom_width": width, "left_slope": 2.0,
                                           "right_slope": 2.0}
    assert evaluate_channel(sized, SHIPPED).analysis.normal_depth == pytest.approx(0.6, rel=1e-9)
    v, zero = width_for_depth(ch, 5.0, SHIPPED)
    assert zero == 0.0 and v.section["shape"] == "triangle"
    lined, w_lined = width_for_depth(Channel(flow=FlowBasis(value=2.0), slope=0.004, manning_n=None,
                                             lining=LiningChoice("concrete"), section={"shape": "rectangle"}),
                                     0.6, SHIPPED)
    assert evaluate_channel(lined, SHIPPED).analysis.normal_depth == pytest.approx(0.6, rel=1e-9)
    with pytest.raises(hy.InputError, match="section.shape"):
        width_for_depth(Channel(section={"shape": "circle", "diameter": 1.0}), 0.5, SHIPPED)


def test_lining_comparison_is_the_channels_own_comparison():
    from app.evaluate import lining_comparison

    ch = Channel(flow=FlowBasis(value=0.8), slope=0.01, lining=LiningChoice("riprap", 0.15), manning_n=None,
                 alternatives=[LiningChoice("concrete"), LiningChoice("riprap", 0.15)], bend_radius=30.0)
    own = evaluate_channel(ch, SHIPPED).comparison
    rows = lining_comparison(ch, SHIPPED)
    assert [r.to_dict() for r in rows] == [r.to_dict() for r in own]
    assert [r.key for r in rows] == ["riprap", "concrete"]            # each lining once, the channel's first
    asked = lining_comparison(ch, SHIPPED, [("concrete", None), ("concrete", None)])
    assert [r.key for r in asked] == ["concrete", "concrete"]           # as asked, in that order


def test_calc_and_compare_print_the_shared_evaluation(capsys):
    """`ditchwright calc --json` and `compare --json` hold the numbers of app.evaluate for the same channel."""
    import json

    from app.evaluate import lining_comparison
    from app.main import main
    from hydraulics.units import SI

    argv = ["--units", "si", "--bottom-width", "0.6", "--side-slope", "3", "--slope", "0.01", "--flow", "0.8",
            "--bend-radius", "30"]
    ch = Channel(flow=FlowBasis(value=0.8), slope=0.01, lining=LiningChoice("riprap", 0.15), manning_n=None,
                 bend_radius=30.0, section={"shape": "trapezoid", "bottom_width": 0.6, "left_slope": 3.0,
                                            "right_slope": 3.0})
    assert main(["calc", *argv, "--lining", "riprap:0.15", "--json"]) == 0
    calc = json.loads(capsys.readouterr().out)
    evaluated = evaluate_channel(ch, SHIPPED)
    design = evaluated.to_dict(SI)
    for key in ("normal_depth", "velocity", "froude", "stability", "lining"):
        assert calc[key] == design[key], key
    assert calc["verdict"] == evaluated.verdict.token
    assert main(["compare", *argv, "--lining", "riprap:0.15", "--lining", "concrete", "--json"]) == 0
    rows = json.loads(capsys.readouterr().out)
    expected = lining_comparison(ch, SHIPPED, [("riprap", 0.15), ("concrete", None)])
    assert [r["depth"] for r in rows] == [r.to_dict(SI)["depth"] for r in expected]
    assert [r["cost_per_length"] for r in rows] == [None, None]
