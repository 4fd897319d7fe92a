"""The stone roughness's short cuts give the same n as the full evaluation.

Two short cuts keep a stone lining's check cheap enough to follow every keystroke: depths that all lie in
Blodgett's range (da/D50 >= 1.5 x SPLIT_BAND) skip Bathurst's terms and the search for the lowest depth at
which Bathurst's relation is usable; and that search stops once its bracket is a few float spacings wide
instead of after a fixed 100 halvings. Both are checked here against references written in the test:
Blodgett's relation itself (HEC-15, 3rd ed., Eq. 6.1, through ``hec15.blodgett_n``) and the fixed 100-step
geometric bisection, on a dense grid of depths, stone sizes and sections.
"""

import numpy as np
import pytest

import hydraulics as hy
from hydraulics.linings import hec15
from hydraulics.linings import roughness
from hydraulics.linings.roughness import P_LIMIT, SPLIT_BAND, StoneRoughness, _average_depth

SECTIONS = [hy.Trapezoid(bottom_width=0.6, side_slope=3.0), hy.Trapezoid(bottom_width=2.0, side_slope=1.5),
            hy.Triangle(side_slope=4.0), hy.Rectangle(bottom_width=1.2), hy.Circle(diameter=1.5)]
SIZES = [0.015, 0.025, 0.05, 0.15, 0.3, 0.55]


@pytest.mark.filterwarnings("ignore::hydraulics.linings.hec15.ValidityWarning")  # deep flows beyond 185 D50
@pytest.mark.parametrize("section", SECTIONS, ids=lambda s: s.kind)
@pytest.mark.parametrize("d50", SIZES)
def test_depths_in_blodgetts_range_give_blodgetts_n(section, d50):
    rough = StoneRoughness(d50)
    top = section.capacity_depth if section.capacity_depth is not None else 5.0
    depths = np.geomspace(1e-3, float(top) * 0.999, 400)
    da = np.asarray(_average_depth(section, depths)[0], float)
    mask = da / d50 >= hec15.BLODGETT_RANGE[0] * SPLIT_BAND
    if not mask.any():
        pytest.skip("no depth of this section reaches Blodgett's range for this stone")
    got = rough.manning_n(section, depths[mask], 0.01)
    want = hec15.blodgett_n(da[mask], d50)
    np.testing.assert_allclose(got, want, rtol=1e-13)
    # one depth at a time, as the scalar solver asks
    for y, n in zip(depths[mask][::40], want[::40]):
        assert rough.manning_n(section, float(y), 0.01) == pytest.approx(float(n), rel=1e-13)


def _reference_lowest_depth(section, d50):
    """The lowest usable Bathurst depth by the fixed 100-step geometric bisection (the original search)."""
    def usable(y):
        da, r, top = _average_depth(section, y)
        _, p, _ = hec15._bathurst_terms(np.asarray(da, float), d50, np.asarray(top, float))
        return bool((da / d50 > hec15.BATHURST_RANGE[0]) and (float(p) <= P_LIMIT)), float(da / d50)

    hi = 1e-3 * d50
    for _ in range(80):
        if usable(hi)[1] >= hec15.BLODGETT_RANGE[0]:
            break
        hi *= 2.0
        if section.capacity_depth is not None:
            hi = min(hi, float(section.capacity_depth) * (1 - 1e-9))
    if not usable(hi)[0]:
        return np.inf
    lo = 1e-9 * d50
    for _ in range(100):
        mid = np.sqrt(lo * hi)
        if usable(mid)[0]:
            hi = mid
        else:
            lo = mid
    return hi


@pytest.mark.parametrize("section", SECTIONS, ids=lambda s: s.kind)
@pytest.mark.parametrize("d50", SIZES)
def test_lowest_usable_bathurst_depth_matches_the_full_bisection(section, d50):
    got, _ = StoneRoughness(d50)._lowest_bathurst_depth(section)
    want = _reference_lowest_depth(section, d50)
    if np.isinf(want):
        assert np.isinf(got)
    else:
        assert got == pytest.approx(want, rel=1e-14)


@pytest.mark.parametrize("d50", [0.15, 0.3])
def test_n_across_every_region_matches_with_and_without_the_short_cut(d50):
    """Depths below, inside and above the split, asked together (the full path) and one at a time."""
    section = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
    rough = StoneRoughness(d50)
    depths = np.geomspace(0.05 * d50, 10 * d50, 300)
    together = rough.manning_n(section, depths, 0.02)
    alone = np.array([rough.manning_n(section, float(y), 0.02) for y in depths])
    np.testing.assert_allclose(alone, together, rtol=1e-13)


# One model for every stone size of an inventory (a D50 per element of a section with array dimensions): each
# element's normal depth must be the one the plain scalar solver finds with a model of its own size, to the
# solver's tolerance (Manning's equation, Chow 1959 Eq. 5-6; n by HEC-15, 3rd ed., Eqs. 6.1 and 6.2).
GRID_SIZES = [0.015, 0.03, 0.05, 0.1, 0.15, 0.3, 0.55]
GRID_FLOWS = np.geomspace(0.01, 40.0, 14)
GRID_SLOPES = np.geomspace(1e-4, 0.08, 9)


def _grid(shape_of):
    d, q, s = (a.ravel() for a in np.meshgrid(GRID_SIZES, GRID_FLOWS, GRID_SLOPES, indexing="ij"))
    return d, q, s, shape_of(np.ones(d.size))


@pytest.mark.parametrize("make", [
    lambda one: hy.Trapezoid(bottom_width=0.6 * one, side_slope=3.0 * one),
    lambda one: hy.Trapezoid(bottom_width=2.0 * one, left_slope=1.5 * one, right_slope=4.0 * one),
    lambda one: hy.Triangle(side_slope=4.0 * one),
    lambda one: hy.Rectangle(bottom_width=1.2 * one),
], ids=["trapezoid", "uneven", "triangle", "rectangle"])
def test_every_size_in_one_solve_gives_each_reachs_own_depth(make):
    d50, q, s, section = _grid(make)
    one = make(1.0)
    got = hy.normal_depth(section, q, s, StoneRoughness(d50))
    want = np.array([hy.normal_depth(one, qi, si, StoneRoughness(di)) for di, qi, si in zip(d50, q, s)])
    np.testing.assert_allclose(got, want, rtol=1e-9)
    # and n at those depths, element by element
    n_got = StoneRoughness(d50).manning_n(section, got, s)
    n_want = np.array([StoneRoughness(di).manning_n(one, yi, si) for di, yi, si in zip(d50, got, s)])
    np.testing.assert_allclose(n_got, n_want, rtol=1e-12)


def test_where_several_depths_carry_the_flow_the_scalar_solvers_depth_is_reported():
    """Near da/D50 = 1.5 Bathurst's n lies below Blodgett's, so the flow falls with depth over a short span and
    a flow there has three uniform-flow depths. The rule kept: every path reports the depth the scalar
    iteration reaches from its own start (solvers._newton_log_vector follows its steps)."""
    one = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
    cases = []
    for d50 in (0.05, 0.15, 0.3, 0.55):
        for slope in (0.0118, 0.0308, 0.08):
            depths = np.geomspace(0.05 * d50, 20 * d50, 4000)
            flows = hy.flow_at_depth(one, depths, slope, StoneRoughness(d50))
            falls = np.flatnonzero(np.diff(flows) < 0)
            assert len(falls), "the grid must hold flows with several depths"
            top, bottom = flows[falls[0]], flows[falls[-1] + 1]
            for q in np.linspace(bottom, top, 7)[1:-1]:
                assert np.count_nonzero(np.diff(np.sign(flows - q))) >= 3  # several depths carry it
                cases.append((d50, slope, q))
    d50, s, q = (np.array(c) for c in zip(*cases))
    alone = np.array([hy.normal_depth(one, qi, si, StoneRoughness(di)) for di, si, qi in zip(d50, s, q)])
    ones = np.ones(len(q))
    together = hy.normal_depth(hy.Trapezoid(bottom_width=0.6 * ones, side_slope=3.0 * ones), q, s,
                               StoneRoughness(d50))
    np.testing.assert_allclose(together, alone, rtol=1e-9)
    by_size = np.concatenate([hy.normal_depth(hy.Trapezoid(bottom_width=0.6 * ones[d50 == d],
                                                           side_slope=3.0 * ones[d50 == d]),
                                              q[d50 == d], s[d50 == d], StoneRoughness(d))
                              for d in np.unique(d50)])
    np.testing.assert_allclose(together, by_size, rtol=1e-9)


def test_a_size_with_no_usable_bathurst_depth_does_not_change_the_others():
    """Bathurst's relation usable below da/D50 = 1.5 for one size and nowhere for another: each element holds
    its own n, as a model of its size alone does (fine stone in a wide channel: Bathurst's exponent p of
    HEC-15 Eq. 6.3 stays above P_LIMIT up to da/D50 = 1.5)."""
    one = np.ones(2)
    section = hy.Rectangle(bottom_width=np.array([3.0, 50.0]))
    d50 = np.array([0.05, 0.015])
    y_lim, _ = StoneRoughness(d50)._lowest_bathurst_depth(section)
    assert np.isfinite(y_lim[0]) and np.isinf(y_lim[1])
    depths = np.array([0.01, 0.01]) * one
    got = StoneRoughness(d50).manning_n(section, depths, 0.01)
    want = [StoneRoughness(0.05).manning_n(hy.Rectangle(bottom_width=3.0), 0.01, 0.01),
            StoneRoughness(0.015).manning_n(hy.Rectangle(bottom_width=50.0), 0.01, 0.01)]
    np.testing.assert_allclose(got, want, rtol=1e-12)


def test_the_model_of_some_elements_keeps_their_sizes_and_lowest_depths():
    d50 = np.array([0.05, 0.15, 0.3, 0.15])
    section = hy.Trapezoid(bottom_width=np.array([0.6, 1.0, 2.0, 0.4]), side_slope=np.full(4, 3.0))
    whole = StoneRoughness(d50)
    y_all, _ = whole._lowest_bathurst_depth(section)
    part = whole.take(np.array([1, 3]))
    np.testing.assert_array_equal(part.d50, [0.15, 0.15])
    sub = hy.Trapezoid(bottom_width=np.array([1.0, 0.4]), side_slope=np.full(2, 3.0))
    np.testing.assert_array_equal(part._lowest_bathurst_depth(sub)[0], y_all[[1, 3]])
    np.testing.assert_allclose(StoneRoughness(d50[[1, 3]])._lowest_bathurst_depth(sub)[0], y_all[[1, 3]],
                               rtol=1e-14)
    assert whole.take(slice(None)) is whole


@pytest.mark.parametrize("slope", [0.002, 0.02, 0.08])
def test_n_of_every_region_element_by_element_matches_each_size_alone(slope):
    """Depths from 0.05 to 10 D50 (held, Bathurst, the ramp and Blodgett), several sizes and sections in one
    call: the short cut that works out Bathurst's terms only where da/D50 < 1.53 gives each element the n of a
    model of its size on its own section."""
    d50 = np.repeat([0.02, 0.15, 0.3], 200)
    width = np.tile(np.repeat([0.6, 3.0], 100), 3)
    depth = np.concatenate([np.tile(np.geomspace(0.05 * d, 10 * d, 100), 2) for d in (0.02, 0.15, 0.3)])
    section = hy.Trapezoid(bottom_width=width, side_slope=np.full(width.size, 2.5))
    got = StoneRoughness(d50).manning_n(section, depth, slope)
    want = [StoneRoughness(d).manning_n(hy.Trapezoid(bottom_width=b, side_slope=2.5), y, slope)
            for d, b, y in zip(d50.tolist(), width.tolist(), depth.tolist())]
    codes = {StoneRoughness(d).relation(hy.Trapezoid(bottom_width=b, side_slope=2.5), y, slope)
             for d, b, y in zip(d50.tolist(), width.tolist(), depth.tolist())}
    assert codes >= {"blodgett", "bathurst", "transition"}
    np.testing.assert_allclose(got, want, rtol=1e-12)


# The lowest usable Bathurst depth of sections with array dimensions (an inventory's stone reaches) is found from
# the two depths where its conditions turn (da/D50 = 0.3, HEC-15, 3rd ed., Eq. 6.2's range; p = P_LIMIT with b of
# Eq. 6.6), then bisected on the predicate near them. Checked element by element against the full 100-step
# bisection above, on random sections and sizes (seeded).
def _random_sections(kind, size, rng):
    if kind == "trapezoid":
        b, z1, z2 = rng.uniform(0.1, 6.0, size), rng.uniform(0.0, 6.0, size), rng.uniform(0.0, 6.0, size)
        return (hy.Trapezoid(bottom_width=b, left_slope=z1, right_slope=z2),
                lambda i: hy.Trapezoid(bottom_width=float(b[i]), left_slope=float(z1[i]), right_slope=float(z2[i])))
    if kind == "triangle":
        z1, z2 = rng.uniform(0.5, 6.0, size), rng.uniform(0.5, 6.0, size)
        return (hy.Triangle(left_slope=z1, right_slope=z2),
                lambda i: hy.Triangle(left_slope=float(z1[i]), right_slope=float(z2[i])))
    if kind == "rectangle":
        b = rng.uniform(0.1, 60.0, size)
        return hy.Rectangle(bottom_width=b), lambda i: hy.Rectangle(bottom_width=float(b[i]))
    d = rng.uniform(0.2, 3.0, size)
    return hy.Circle(diameter=d), lambda i: hy.Circle(diameter=float(d[i]))


# A circle's area at small depths is rounded to some 1e-14 of itself, so there the predicate flickers over a band
# of a few dozen float spacings: any depth in it is the lowest usable one to that precision.
@pytest.mark.parametrize("kind, rtol", [("trapezoid", 1e-14), ("triangle", 1e-14), ("rectangle", 1e-14),
                                        ("circle", 1e-13)])
def test_lowest_usable_depth_of_every_element_matches_the_full_bisection(kind, rtol, monkeypatch):
    rng = np.random.default_rng(7)
    size = 240
    d50 = rng.choice(np.geomspace(0.01, 0.8, 40), size)
    section, one = _random_sections(kind, size, rng)
    searched = []   # the elements of each bisection: the first call refines every root, a later one searches all over
    bisect = roughness._bisect_usable

    def counted(part, d, lo, hi):
        searched.append(len(d))
        return bisect(part, d, lo, hi)
    monkeypatch.setattr(roughness, "_bisect_usable", counted)
    got, _ = StoneRoughness(d50)._lowest_bathurst_depth(section)
    assert sum(searched[1:]) <= size // 50, "the roots should bracket where the predicate turns"
    want = np.array([_reference_lowest_depth(one(i), float(d50[i])) for i in range(size)])
    np.testing.assert_array_equal(np.isinf(got), np.isinf(want))
    assert np.isfinite(want).sum() > size // 2
    np.testing.assert_allclose(got[np.isfinite(want)], want[np.isfinite(want)], rtol=rtol)


def test_both_conditions_rise_with_depth_in_a_circle():
    """The search relies on da = A/T and b of HEC-15 Eq. 6.6 (as T^-0.453 da^0.814) rising with depth; in a
    trapezoid d ln b / d ln y >= 0.34 in closed form, in a circle it is checked here up to the capacity depth."""
    pipe = hy.Circle(diameter=1.0)
    depths = np.linspace(1e-6, float(pipe.capacity_depth), 100_000)
    g = pipe.properties(depths)
    da = g.area / g.top_width
    assert np.all(np.diff(da) > 0)
    assert np.all(np.diff(0.814 * np.log(da) - 0.453 * np.log(g.top_width)) > 0)
