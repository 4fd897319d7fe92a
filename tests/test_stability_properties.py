"""Property tests of the lining stability check (hypothesis).

They follow from HEC-15 (Kilgore and Cotton, 3rd ed., FHWA-NHI-05-114, 2005):
Eq. 3.1 (tau_d = gamma d S grows with depth and slope), Eq. 3.2 (stable where
tau_p >= SF tau_d, SF >= 1), Eq. 6.7-6.9 with Table 6.1, and Manning's
equation (Chow 1959, Eq. 5-6: depth grows with flow).
"""

import math

import pytest
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

import hydraulics as hy
from hydraulics.linings import load_catalogue
from hydraulics.lining_comparison import compare_linings
from hydraulics.stability import check_lining

CAT = load_catalogue()
# The filter of the relation (many random channels run under Bathurst's relation or across the change) is meant,
# not a slow strategy; the examples are the same on every run (tests/conftest.py).
SLOW = settings(max_examples=30, deadline=None,
                suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])

width = st.floats(0.3, 4.0)
side = st.floats(2.0, 5.0)      # flatter than the angle of repose of the shipped stone
flow = st.floats(0.1, 8.0)
mild = st.floats(0.002, 0.09)   # below the steep-slope threshold
d50s = st.floats(0.05, 0.4)
ratio = st.floats(1.1, 3.0)


def _required(section, q, s):
    """Smallest stable riprap D50 and the n relation it runs under (see the Blodgett/Bathurst note below)."""
    lin = CAT.get("riprap")
    r = check_lining(section, q, s, lin, d50=0.15)
    return r.required_d50, lin.roughness(r.required_d50).relation(section, r.required_d50_depth, s)


# Within one roughness relation the required size grows with slope and flow. Across the change from
# Blodgett's relation to Bathurst's at da/D50 = 1.5 (HEC-15 Section 6.1) it need not: Bathurst's n there
# is lower, the flow shallower and the stone needed smaller (an open point, see the stability module).

@SLOW
@given(width, side, flow, mild, ratio)
def test_required_d50_grows_with_slope(b, z, q, s, k):
    assume(s * k <= 0.09)
    section = hy.Trapezoid(bottom_width=b, side_slope=z)
    low, rel_low = _required(section, q, s)
    high, rel_high = _required(section, q, s * k)
    assume(rel_low == rel_high == "blodgett")
    assert high > low


@SLOW
@given(width, side, flow, mild, ratio)
def test_required_d50_grows_with_flow(b, z, q, s, k):
    section = hy.Trapezoid(bottom_width=b, side_slope=z)
    low, rel_low = _required(section, q, s)
    high, rel_high = _required(section, q * k, s)
    assume(rel_low == rel_high == "blodgett")
    assert high > low


def test_required_d50_can_fall_across_the_blodgett_bathurst_change():
    # Documents the open point above with a case found by the property test: 25 % more slope, smaller stone.
    section = hy.Trapezoid(bottom_width=0.375, side_slope=2.0)
    low, rel_low = _required(section, 1.5, 0.03125)
    high, rel_high = _required(section, 1.5, 0.0390625)
    assert (rel_low, rel_high) == ("blodgett", "bathurst") and high < low


@SLOW
@given(width, st.floats(0.0, 6.0), flow, st.floats(0.001, 0.2), d50s,
       st.sampled_from(["riprap", "gravel", "grass_good_sod", "grass_fair_mixed", "soil_fine_noncohesive"]),
       st.one_of(st.none(), st.floats(3.0, 60.0)))
def test_a_lining_that_passes_has_safety_factors_of_at_least_one(b, z, q, s, d, key, rc):
    section = hy.Trapezoid(bottom_width=b, side_slope=z)
    lin = CAT.get(key)
    try:
        r = check_lining(section, q, s, lin, d50=d if lin.category == "stone" else None, bend_radius=rc)
    except hy.InputError as exc:  # a bend tighter than half the width is refused, by design
        assume(exc.field != "bend_radius")
        raise
    if r.stable:
        assert r.safety_factor >= r.required_safety_factor >= 1.0
        for c in r.checks:
            assert c.safety_factor >= c.required_safety_factor >= 1.0
            assert c.permissible_shear >= c.design_shear
    else:
        assert any(c.safety_factor < c.required_safety_factor for c in r.checks)
    assert r.governs in {c.location for c in r.checks}
    assert r.total_depth >= r.depth + 0.15 - 1e-12


@SLOW
@given(width, side, flow, mild, d50s, st.one_of(st.none(), st.floats(5.0, 80.0)))
def test_stone_of_the_required_size_is_stable_and_just_so(b, z, q, s, d, rc):
    section = hy.Trapezoid(bottom_width=b, side_slope=z)
    lin = CAT.get("riprap")
    try:
        r = check_lining(section, q, s, lin, d50=d, bend_radius=rc)
        # the required stone gives another depth and top width: the bend may then be tighter than half of it
        again = check_lining(section, q, s, lin, d50=r.required_d50, bend_radius=rc)
        below = check_lining(section, q, s, lin, d50=r.required_d50 * (1 - 1e-5), bend_radius=rc)
    except hy.InputError as exc:  # a bend tighter than half the width is refused, by design
        assume(exc.field != "bend_radius")
        raise
    assert again.stable and not below.stable  # the smallest stable size
    if not any("changes abruptly" in w for w in r.warnings):
        # away from the Blodgett/Bathurst switch the trial procedure settles where the factor just suffices
        assert again.governing_check().margin == pytest.approx(1.0, abs=1e-5)
    assert (r.required_d50 <= d) == r.stable or math.isclose(r.required_d50, d, rel_tol=1e-6)


@SLOW
@given(width, side, flow, st.floats(0.001, 0.15), d50s)
def test_comparison_rows_agree_with_single_lining_calls(b, z, q, s, d):
    section = hy.Trapezoid(bottom_width=b, side_slope=z)
    choices = [("concrete", None), ("riprap", d), ("gravel", None), ("grass_good_sod", None)]
    rows = compare_linings(section, q, s, choices, CAT)
    for row, (key, size) in zip(rows, choices):
        try:
            single = check_lining(section, q, s, CAT.get(key), d50=size)
        except hy.NoSolutionError as exc:
            assert row.verdict == "no solution" and row.error == str(exc)
            continue
        assert (row.depth, row.velocity, row.froude, row.manning_n) == \
            (single.depth, single.velocity, single.froude, single.manning_n)
        assert (row.safety_factor, row.verdict, row.governs, row.required_d50) == \
            (single.safety_factor, single.verdict, single.governs, single.required_d50)
        assert row.lined_width == single.lined_width and row.layer_volume == single.layer_volume
