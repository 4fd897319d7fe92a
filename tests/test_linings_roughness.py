"""Depth-dependent roughness models and the coupled normal-depth solve.

"HEC-15" = Kilgore and Cotton, Design of Roadside Channels with Flexible
Linings, HEC-15 3rd ed., FHWA-NHI-05-114, 2005.
"""

import math
import warnings

import numpy as np
import pytest
from scipy.optimize import brentq

import hydraulics as hy
from hydraulics.errors import InputError
from hydraulics.linings import StoneRoughness, ValidityWarning, VegetationRoughness, hec15


def _manning_depth(section, flow, slope, rough):
    """Normal depth by scipy's brentq on Manning's equation (independent of the core's solver)."""
    def f(y):
        g = section.properties(y)
        return g.area * (g.area / g.wetted_perimeter) ** (2 / 3) * math.sqrt(slope) / rough.manning_n(section, y, slope) - flow
    return brentq(f, 1e-3, 10.0, xtol=1e-14, rtol=1e-14)


# ------------------------------------------------------------ HEC-15 gravel mulch design example

def test_gravel_mulch_example_si():
    # HEC-15 Chapter 6 design example, gravel mulch, SI (not verified): trapezoid B = 0.4 m,
    # Z = 3, S = 0.008, Q = 0.42 m^3/s, D50 = 25 mm. Published outcome (not verified): depth near
    # 0.35 m, design shear near 27 N/m^2, above the permissible 19 N/m^2 (Table 2.3), so the
    # gravel mulch is not stable.
    section = hy.Trapezoid(bottom_width=0.4, side_slope=3.0)
    rough = StoneRoughness(0.025)
    y_core = hy.normal_depth(section, 0.42, 0.008, n=rough)
    y_ref = _manning_depth(section, 0.42, 0.008, rough)
    assert y_core == pytest.approx(y_ref, rel=1e-9)
    assert y_core == pytest.approx(0.35, abs=0.01)
    tau_d = hec15.design_shear(y_core, 0.008)
    assert tau_d == pytest.approx(27.0, abs=1.0)
    re = hec15.particle_reynolds(y_core, 0.008, 0.025)
    f_star, sf = hec15.shields_and_safety_factor(re)
    tau_p = hec15.stone_permissible_shear(0.025, f_star)
    assert tau_p == pytest.approx(19.0, abs=0.5)
    assert tau_p < sf * tau_d  # the lining fails
    assert rough.relation(section, y_core) == "blodgett" and rough.check(section, y_core, 0.008) == []


# ------------------------------------------------------------ StoneRoughness

def test_stone_roughness_matches_blodgett_and_bathurst_functions():
    section = hy.Trapezoid(bottom_width=2.0, side_slope=3.0)
    r = StoneRoughness(0.15)
    for y in (0.5, 0.8):  # da/D50 >= 1.5: Blodgett (HEC-15 Eq. 6.1)
        g = section.properties(y)
        assert r.manning_n(section, y, 0.02) == pytest.approx(hec15.blodgett_n(g.area / g.top_width, 0.15), rel=1e-12)
    y = 0.25  # da/D50 < 1.5: Bathurst (HEC-15 Eq. 6.2) with Manning's velocity
    g = section.properties(y)
    da, rh = g.area / g.top_width, g.area / g.wetted_perimeter
    assert r.manning_n(section, y, 0.02) == pytest.approx(
        hec15.bathurst_n_manning(da, 0.15, g.top_width, rh, 0.02), rel=1e-12)
    assert r.relation(section, 0.25) == "bathurst" and r.relation(section, 0.5) == "blodgett"


def test_stone_roughness_vectorised_equals_scalar():
    section = hy.Trapezoid(bottom_width=1.0, side_slope=2.0)
    depths = np.linspace(0.05, 1.5, 25)
    for method in ("auto", "blodgett", "bathurst", "strickler"):
        r = StoneRoughness(0.1, method)
        vec = r.manning_n(section, depths, 0.03)
        with np.errstate(all="ignore"):
            scal = np.array([r.manning_n(section, float(y), 0.03) for y in depths])
        np.testing.assert_allclose(vec, scal, rtol=1e-13, equal_nan=True)


def test_core_solver_takes_arrays_with_stone_roughness():
    section = hy.Trapezoid(bottom_width=2.0, side_slope=3.0)
    flows = np.array([0.5, 1.0, 2.0, 6.0])
    r = StoneRoughness(0.1)
    ys = hy.normal_depth(section, flows, 0.02, n=r)
    for q, y in zip(flows, ys):
        assert y == pytest.approx(_manning_depth(section, float(q), 0.02, r), rel=1e-8)


def test_stone_roughness_check_reports_ranges():
    section = hy.Trapezoid(bottom_width=2.0, side_slope=3.0)
    assert any("Bathurst" in w for w in StoneRoughness(0.5).check(section, 0.1, 0.02))   # da/D50 < 0.3
    assert any("550 mm" in w for w in StoneRoughness(0.8).check(section, 2.0, 0.02))     # size range
    assert any("Blodgett" in w for w in StoneRoughness(0.3, "blodgett").check(section, 0.3, 0.02))


def test_stone_roughness_in_a_pipe_smaller_than_one_metre():
    # The lowest usable depth of Bathurst's relation is searched from a small depth up; a pipe whose
    # crown is below 1 m must not be asked about a depth of 1 m on the way. Reference: Manning's
    # equation solved by scipy's brentq with the same roughness (independent of the core's solver),
    # at flows small enough that the depth lies below the jump of n at da/D50 = 1.5 (one root).
    r = StoneRoughness(0.15)
    diameters, flows = np.array([0.45, 0.6, 0.9]), np.array([0.02, 0.03, 0.04])
    ys = hy.normal_depth(hy.Circle(diameter=diameters), flows, 0.01, n=r)
    for d, q, y in zip(diameters, flows, ys):
        section = hy.Circle(diameter=float(d))
        assert hy.normal_depth(section, float(q), 0.01, n=r) == pytest.approx(y, rel=1e-9)
        def f(y):
            g = section.properties(y)
            return g.area * (g.area / g.wetted_perimeter) ** (2 / 3) * 0.1 / r.manning_n(section, y, 0.01) - q
        assert y == pytest.approx(brentq(f, 1e-3, 0.45 * d, xtol=1e-14, rtol=1e-14), rel=1e-9)


def test_strickler_is_depth_independent():
    section = hy.Rectangle(bottom_width=1.0)
    r = StoneRoughness(0.3048, "strickler")
    assert r.manning_n(section, 0.2, 0.01) == pytest.approx(0.034)  # Chow (1959), D in ft (not verified)
    assert r.manning_n(section, 2.0, 0.01) == r.manning_n(section, 0.2, 0.01)


def test_stone_roughness_input_checks():
    for kwargs, fld in [({"d50": -1}, "d50"), ({"d50": 0.1, "method": "limerinos"}, "method")]:
        with pytest.raises(InputError) as e:
            StoneRoughness(**kwargs)
        assert e.value.field == fld


# ------------------------------------------------------------ VegetationRoughness

def test_vegetation_roughness_formula_and_behaviour():
    # HEC-15 Chapter 4 (not verified): n = Cn (gamma R S)^-0.4, Cn = 0.35 Cs^0.10 h^0.528.
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    r = VegetationRoughness(106.0, 0.15)
    y, s = 0.4, 0.01
    g = section.properties(y)
    tau_o = 9810.0 * g.area / g.wetted_perimeter * s
    expected = 0.35 * 106.0 ** 0.10 * 0.15 ** 0.528 * tau_o ** -0.4
    assert r.manning_n(section, y, s) == pytest.approx(expected, rel=1e-12)
    # grass bends over as the flow deepens: n falls with depth (HEC-15 Section 4.1)
    ns = r.manning_n(section, np.array([0.2, 0.4, 0.8]), s)
    assert np.all(np.diff(ns) < 0)
    assert r.check(section, 0.1, s) and not r.check(section, 0.4, s)


def test_vegetation_n_within_chow_grass_range_at_roadside_flows():
    # Chow (1959) Table 5-6 via the fluids library: vegetal lining n from 0.030 to 0.500.
    from fluids.open_flow import n_lined_built
    lo, _, hi = n_lined_built["Vegatal"]["Lined"]
    section = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
    for cs, h in [(580.0, 0.30), (106.0, 0.15), (24.0, 0.15), (8.6, 0.075)]:
        r = VegetationRoughness(cs, h)
        y = hy.normal_depth(section, 0.5, 0.01, n=r)
        assert lo <= r.manning_n(section, y, 0.01) <= hi


def test_blodgett_method_refuses_depths_without_a_positive_n():
    section = hy.Trapezoid(bottom_width=2.0, side_slope=3.0)
    r = StoneRoughness(0.5, "blodgett")
    with np.errstate(all="ignore"):
        assert math.isnan(r.manning_n(section, 0.1, 0.02))  # da/D50 < 0.371: the solver refuses it
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        with pytest.raises(hy.NoSolutionError):
            hy.normal_depth(section, 0.05, 0.02, n=r)


def _depth_at_ratio(section, d50, ratio):
    return brentq(lambda y: section.area(y) / section.top_width(y) / d50 - ratio, 1e-6, 50.0, xtol=1e-15)


def test_auto_n_is_continuous_across_the_hec15_split():
    # HEC-15 Section 6.1 switches from Bathurst (Eq. 6.2) to Blodgett (Eq. 6.1) at da/D50 = 1.5;
    # here the two differ by about 50 %, and the program's rule bridges them over 1.5 to 1.53.
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    r = StoneRoughness(0.15)
    s = 0.0005
    y0 = _depth_at_ratio(section, 0.15, 1.5)
    y1 = _depth_at_ratio(section, 0.15, 1.5 * 1.02)
    below, above = r.manning_n(section, y0 * (1 - 1e-9), s), r.manning_n(section, y0 * (1 + 1e-9), s)
    assert below == pytest.approx(above, rel=1e-6)
    assert r.manning_n(section, y1 * (1 + 1e-9), s) == pytest.approx(r.manning_n(section, y1 * (1 - 1e-9), s),
                                                                       rel=1e-6)
    g = section.properties(y1 * 1.001)
    assert r.manning_n(section, y1 * 1.001, s) == pytest.approx(hec15.blodgett_n(g.area / g.top_width, 0.15))
    ym = 0.5 * (y0 + y1)
    assert r.relation(section, ym, s) == "transition"
    assert any("between the two" in w for w in r.check(section, ym, s))
    # the flow that fell in the jump now has a depth, at da/D50 of about 1.5
    y = hy.normal_depth(section, 0.0625, s, n=r)
    assert y0 <= y <= y1


def test_auto_n_below_bathurst_range_is_held_and_reported():
    section = hy.Trapezoid(bottom_width=2.0, side_slope=3.0)
    r = StoneRoughness(0.1)
    y = _depth_at_ratio(section, 0.1, 0.2)
    assert r.relation(section, y, 0.1) == "held"
    assert any("too shallow" in w for w in r.check(section, y, 0.1))
    assert r.manning_n(section, y, 0.1) == pytest.approx(r.manning_n(section, 0.5 * y, 0.1), rel=1e-12)


def test_switch_depth_is_where_the_average_depth_is_one_and_a_half_d50():
    """da = A/T (HEC-15's average depth); trapezoid A = (b + z y) y, T = b + 2 z y (Chow 1959, Table 2-1)."""
    from hydraulics.linings.roughness import StoneRoughness, relation_switch_depth
    stone = StoneRoughness(0.15)
    y = stone.switch_depth(hy.Trapezoid(bottom_width=1.0, side_slope=4.0))
    assert (1.0 + 4.0 * y) * y / (1.0 + 8.0 * y) == pytest.approx(1.5 * 0.15, rel=1e-10)
    assert stone.switch_depth(hy.Triangle(side_slope=3.0)) == pytest.approx(2 * 1.5 * 0.15, rel=1e-10)  # da = y/2
    assert StoneRoughness(0.15, method="blodgett").switch_depth(hy.Triangle(side_slope=3.0)) is None
    pipe = hy.Circle(diameter=0.3)          # near the crown A/T grows without bound, so a pipe always gets there
    g = pipe.properties(StoneRoughness(0.3).switch_depth(pipe))
    assert g.area / g.top_width == pytest.approx(1.5 * 0.3, rel=1e-9)
    assert relation_switch_depth(0.035, hy.Triangle(side_slope=3.0)) is None


def test_a_note_on_many_depths_quotes_the_da_d50_of_the_depths_it_is_about():
    """The notes on one stone size over many depths (the batch's notes per lining) quote the span of da/D50 of the
    depths each note concerns, not of every depth: Blodgett's range 1.5 to 185 (HEC-15 Eq. 6.1), the depths held
    below Bathurst's usable ones, and this program's ramp from da/D50 = 1.5 to 1.53."""
    from hydraulics.linings.several_depths import depth_at_average
    section, stone = hy.Trapezoid(bottom_width=1.0, side_slope=2.0), StoneRoughness(0.02)
    ratios = np.array([0.1, 0.2, 0.9, 1.51, 1.52, 3.0, 190.0, 200.0])
    depth = depth_at_average(section, ratios * 0.02)
    (notes,) = stone.check_each(section, depth, np.full(len(ratios), 0.01)).values()
    assert any(t.startswith("da/D50 = 190..200 is outside 1.5 to 185") for t in notes), notes
    assert any(t.startswith("da/D50 = 1.51..1.52: at the change") for t in notes), notes
    assert any(t.startswith("da/D50 = 0.1..0.2: the flow is too shallow") for t in notes), notes
    assert len(notes) == 3


@pytest.mark.parametrize("units", ["si", "us"])
def test_each_elements_warnings_are_its_own_checks(units):
    """StoneRoughness.check_elements (the batch's per-reach warnings) gives each element the words check() gives
    that element alone: sizes inside and outside HEC-15 Chapter 6's 15 to 550 mm, depths in Blodgett's range, at
    the change of relation, in Bathurst's and below its usable depth (HEC-15 Section 6.1's ranges)."""
    from hydraulics.units import system
    from hydraulics.wording import in_units
    u = system(units)
    rng = np.random.default_rng(21)
    size = 400
    d50 = rng.choice([0.01, 0.05, 0.15, 0.3, 0.6], size)
    b, z = rng.uniform(0.3, 2.0, size), rng.choice([2.0, 3.0, 4.0], size)
    depth = np.minimum(d50 * 10 ** rng.uniform(-1.5, 2.7, size), 3.0)   # da/D50 from about 0.03 to 500
    depth[:40] = d50[:40] * rng.uniform(1.5, 1.6, 40) * 1.3        # about the change of relation at 1.5
    d50[40:60], depth[40:60] = 0.005, 2.5                             # da/D50 above Blodgett's 185
    slope = rng.uniform(0.002, 0.08, size)
    section = hy.Trapezoid(bottom_width=b, left_slope=z, right_slope=z)
    got = StoneRoughness(d50).check_elements(section, depth, slope, units=u)
    for i in range(size):
        one = hy.Trapezoid(bottom_width=float(b[i]), left_slope=float(z[i]), right_slope=float(z[i]))
        want = "; ".join(in_units(t, u) for t in StoneRoughness(float(d50[i])).check(one, float(depth[i]),
                                                                                     float(slope[i])))
        assert got[i] == want, (i, d50[i], depth[i])
    texts = " ".join(got.tolist())
    for words in ("range of Blodgett's", "at the change from Bathurst's", "too shallow for Bathurst's",
                  "HEC-15 Chapter 6 procedures"):
        assert words in texts, words
    assert (got == "").any()


@pytest.mark.parametrize("units", ["si", "us"])
def test_each_grass_elements_warning_is_its_own_check(units):
    """VegetationRoughness.check_elements: the warning check() gives an element alone (flow below the stem height,
    HEC-15 Chapter 4), and nothing where the grass is submerged."""
    from hydraulics.units import system
    from hydraulics.wording import in_units
    u = system(units)
    r = VegetationRoughness(106.0, 0.15)
    section = hy.Trapezoid(bottom_width=1.0, left_slope=3.0, right_slope=3.0)
    depth = np.array([0.05, 0.149, 0.15, 0.4])
    got = r.check_elements(section, depth, 0.01, units=u)
    assert got.tolist() == ["; ".join(in_units(t, u) for t in r.check(section, float(y), 0.01)) for y in depth]
    assert got[0] and got[1] and not got[2] and not got[3]


def test_an_n_from_a_relation_above_the_input_range_is_cautioned():
    """Bathurst's relation (HEC-15 Eq. 6.2) at a trickle among large stones gives n far above 1, the largest n the
    program accepts as input (hydraulics.validate.LIMITS, common practice): the analysis says so, for one channel
    and, counted, for arrays; an n of 1 typed by hand is within the range and gets no such caution. Invented
    channels from a random search over the accepted ranges."""
    from hydraulics.analysis import HIGH_N_CAUTION

    pipe, stone = hy.Circle(diameter=10.97), StoneRoughness(0.3071)
    one = hy.analyse(pipe, 1.20041e-06, 1.40868e-05, stone)
    assert one.manning_n > 1 and HIGH_N_CAUTION.format(n=f"{one.manning_n:.0f}") in one.warnings
    both = hy.analyse(hy.Circle(diameter=np.array([10.97, 1.0])), np.array([1.20041e-06, 0.3]),
                      np.array([1.40868e-05, 0.01]), StoneRoughness(np.array([0.3071, 0.1])))
    assert both.manning_n[0] > 1 >= both.manning_n[1]
    assert any(w.startswith("1 of 2 channels: Manning's n up to ") for w in both.warnings)
    plain = hy.analyse(hy.Trapezoid(bottom_width=1.0, side_slope=2.0), 0.5, 0.01, 1.0)
    assert not any("from the lining's relation" in w for w in plain.warnings)
