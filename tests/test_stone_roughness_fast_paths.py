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
