"""Property tests of the lining relations (hypothesis).

The properties follow from the relations of HEC-15 (Kilgore and Cotton, 3rd ed.,
FHWA-NHI-05-114, 2005): Eq. 3.1, 3.2, 6.7, 6.8 and Table 6.1, the K1 and Kb
factors of Chapter 3, and Manning's equation (Chow 1959, Eq. 5-6).
"""

import math
import warnings

from hypothesis import given, settings
from hypothesis import strategies as st

import hydraulics as hy
from hydraulics.linings import StoneRoughness, ValidityWarning, hec15

depth = st.floats(0.05, 3.0)
slope = st.floats(1e-4, 0.3)
flow = st.floats(0.05, 20.0)
width = st.floats(0.2, 6.0)
side = st.floats(0.0, 6.0)
d50s = st.floats(0.015, 0.55)


@given(depth, slope, st.floats(1.01, 3.0))
def test_required_d50_grows_with_depth_and_slope(d, s, k):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        base = hec15.required_d50(d, s).d50
        assert hec15.required_d50(d * k, s).d50 > base
        if s * k <= 1.0:
            assert hec15.required_d50(d, s * k).d50 > base


@settings(max_examples=60, deadline=None)
@given(width, st.floats(0.5, 4.0), flow, st.floats(1e-3, 0.1), st.floats(1.05, 3.0))
def test_required_d50_grows_with_flow_and_slope_at_normal_depth(b, z, q, s, k):
    # design shear at the normal depth (n held at 0.035) rises with flow and with slope
    sec = hy.Trapezoid(bottom_width=b, side_slope=z)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        base = hec15.required_d50(hy.normal_depth(sec, q, s, n=0.035), s).d50
        assert hec15.required_d50(hy.normal_depth(sec, q * k, s, n=0.035), s).d50 > base
        s2 = min(1.0, s * k)
        assert hec15.required_d50(hy.normal_depth(sec, q, s2, n=0.035), s2).d50 > base


@given(depth, slope, st.floats(1.0, 5.0))
def test_a_stone_that_passes_has_a_safety_factor_of_at_least_one(d, s, k):
    # tau_p >= SF tau_d (HEC-15 Eq. 3.2) for any stone at least as large as Eq. 6.8 asks for
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        need = hec15.required_d50(d, s)
        d50 = need.d50 * k
        f, sf = hec15.shields_and_safety_factor(hec15.particle_reynolds(d, s, d50))
        tau_p = f * (hec15.GAMMA_STONE - 9810.0) * d50
    tau_d = hec15.design_shear(d, s)
    assert tau_p / tau_d >= sf * (1 - 1e-12)
    assert sf >= 1.0


@given(st.floats(0.0, 20.0), st.floats(0.0, 20.0))
def test_side_slope_factor_is_monotone_and_bounded(z1, z2):
    lo, hi = sorted((z1, z2))
    k_lo, k_hi = hec15.side_slope_factor(lo), hec15.side_slope_factor(hi)
    # The linear piece gives 0.066 * 1.5 + 0.67 = 0.769 at Z = 1.5, just under the 0.77 of the steep piece
    # (HEC-15 Section 3.2, not verified): the relation dips by 0.001 across that joint and rises otherwise.
    assert 0.769 <= k_lo <= k_hi + 0.0011 and k_hi <= 1.0
    if lo > 1.5 or hi <= 1.5:
        assert k_lo <= k_hi


@given(st.floats(0.1, 200.0), st.floats(0.1, 200.0), st.floats(0.1, 50.0))
def test_bend_factor_is_monotone_and_bounded(r1, r2, t):
    lo, hi = sorted((r1, r2))
    assert 2.0 >= hec15.bend_factor(lo, t) >= hec15.bend_factor(hi, t) >= 1.05


@settings(max_examples=80, deadline=None)
@given(width, side, d50s, st.floats(0.001, 5.0), st.floats(1e-4, 0.3))
def test_auto_stone_n_is_always_a_usable_number(b, z, d50, y, s):
    # the solver may try any depth: the default model must give a finite, positive n there
    sec = hy.Trapezoid(bottom_width=b, side_slope=z)
    n = StoneRoughness(d50).manning_n(sec, y, s)
    assert math.isfinite(n) and n > 0.0


@settings(max_examples=150, deadline=None)
@given(width, st.floats(0.0, 5.0), st.floats(0.003, 30.0), st.floats(1e-4, 0.3),
       st.sampled_from([0.015, 0.025, 0.05, 0.15, 0.3, 0.5]))
def test_coupled_normal_depth_exists_and_satisfies_manning_with_its_own_n(b, z, q, s, d50):
    # every flow has a uniform-flow depth with the default stone model, including shallow flow
    # over large stone on steep slopes, where HEC-15 switches to Bathurst's relation
    sec = hy.Trapezoid(bottom_width=b, side_slope=z)
    r = StoneRoughness(d50)
    y = hy.normal_depth(sec, q, s, n=r)
    g = sec.properties(y)
    q_back = g.area * (g.area / g.wetted_perimeter) ** (2 / 3) * math.sqrt(s) / r.manning_n(sec, y, s)
    assert abs(q_back / q - 1) < 1e-9


@given(st.floats(0.5, 20.0), st.floats(0.0, 0.98), st.floats(0.016, 0.3))
def test_grass_cover_raises_the_permissible_shear(tp_soil, cf, n):
    # HEC-15 Section 4.2: tau_p = tau_p,soil / (1 - CF) (n / ns)^2 >= tau_p,soil when n >= ns
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)   # above the range published for vegetated soils
        assert hec15.vegetation_permissible_shear(tp_soil, cf, n, 0.016) >= tp_soil * (1 - 1e-12)


@given(st.lists(st.floats(0.0, 1e4, allow_nan=False), min_size=1, max_size=5))
def test_user_catalogue_text_round_trips(costs):
    import tomllib
    from hydraulics.linings import dumps_user_catalogue, load_catalogue
    entries = [{"key": k, "unit_cost": c} for k, c in zip(["concrete", "riprap", "gravel", "asphalt", "trm_user"],
                                                            costs)]
    data = tomllib.loads(dumps_user_catalogue(entries))
    cat = load_catalogue().merged(data)
    for e in entries:
        assert cat.get(e["key"]).unit_cost == e["unit_cost"]
