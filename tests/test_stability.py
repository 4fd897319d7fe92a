"""The lining stability check (hydraulics.stability) and the lining comparison (hydraulics.lining_comparison).

"HEC-15" = Kilgore, R. T. and Cotton, G. K., Design of Roadside Channels with
Flexible Linings, Hydraulic Engineering Circular No. 15, 3rd ed.,
FHWA-NHI-05-114, Federal Highway Administration, 2005.
"Chow (1959)" = Chow, V. T., Open-Channel Hydraulics, McGraw-Hill, 1959.
Checks against HEC-15 values recalled rather than re-read are marked "not verified".
"""

import math

import numpy as np
import pytest
from fluids.open_flow import n_lined_built
from scipy.optimize import brentq

import hydraulics as hy
from hydraulics.errors import InputError, NoSolutionError
from hydraulics.linings import hec15, load_catalogue
from hydraulics.wording import in_units
from hydraulics.lining_comparison import compare_linings, parse_choice
from hydraulics.shear_checks import shear_checks
from hydraulics.stability import SELF_CLEANING_VELOCITY, check_lining
from hydraulics.units import FOOT, PSF, SYSTEMS

US, SI = SYSTEMS["us"], SYSTEMS["si"]
G = 9.80665


@pytest.fixture(scope="module")
def cat():
    return load_catalogue()


def user_catalogue(tmp_path, text):
    path = tmp_path / "user.toml"
    path.write_text("schema_version = 1\n" + text)
    return load_catalogue(user_path=path)


def manning_depth(section, flow, slope, rough):
    """Normal depth by scipy's brentq on Manning's equation (Chow 1959, Eq. 5-6), independent of the core solver."""
    def f(y):
        g = section.properties(y)
        n = rough if isinstance(rough, float) else rough.manning_n(section, y, slope)
        return g.area * (g.area / g.wetted_perimeter) ** (2 / 3) * math.sqrt(slope) / n - flow
    return brentq(f, 1e-4, 20.0, xtol=1e-14, rtol=1e-14)


# ------------------------------------------------------------ HEC-15 gravel mulch example

def test_gravel_mulch_example_si(cat):
    # HEC-15 Chapter 6 design example, gravel mulch, SI (not verified): trapezoid B = 0.4 m, Z = 3,
    # S = 0.008, Q = 0.42 m^3/s, D50 = 25 mm. Published outcome (not verified): depth near 0.35 m,
    # design shear near 27 N/m^2, permissible shear of 25 mm gravel 19 N/m^2 (Table 2.3), so the
    # gravel mulch is not stable.
    section = hy.Trapezoid(bottom_width=0.4, side_slope=3.0)
    r = check_lining(section, 0.42, 0.008, cat.get("gravel"))
    assert r.depth == pytest.approx(manning_depth(section, 0.42, 0.008, cat.get("gravel").roughness()), rel=1e-9)
    assert r.depth == pytest.approx(0.35, abs=0.01)
    assert r.bed_shear == pytest.approx(27.0, abs=1.0)
    assert r.permissible_shear == pytest.approx(19.0, abs=0.5)
    bed = next(c for c in r.checks if c.location == "bed")
    assert bed.safety_factor == pytest.approx(r.permissible_shear / r.bed_shear) and bed.safety_factor < 1
    assert not r.stable and r.verdict == "not stable"
    assert r.n_relation == "blodgett" and r.d50 == 0.025
    assert r.required_d50 > 0.025
    assert "against" in r.reason() and "Pa" in r.reason()


# ------------------------------------------------------------ stone permissible shear

@pytest.mark.parametrize("d50, published", [(0.025, 19.0), (0.05, 38.0), (0.15, 113.0), (0.30, 227.0)])
def test_stone_permissible_shear_table_2_3(cat, d50, published):
    # HEC-15 Table 2.3 (not verified), consistent with Eq. 6.7 at F* = 0.047 and gamma_s = 25.9 kN/m^3;
    # a wide channel on a flat grade keeps Re* below 4e4, where Table 6.1 gives F* = 0.047.
    section = hy.Trapezoid(bottom_width=3.0, side_slope=3.0)
    r = check_lining(section, 2.0, 0.001, cat.get("riprap"), d50=d50)
    assert r.reynolds <= 4e4 and r.shields == 0.047 and r.required_safety_factor == 1.0
    assert r.permissible_shear == pytest.approx(published, abs=1.0)


def test_stone_side_slope_uses_tractive_force_ratio(cat):
    # HEC-15 Section 6.3.2 (not verified; after Anderson et al. 1970): K2 = sqrt(1 - sin^2(theta)/sin^2(phi)),
    # theta = atan(1/Z); the side shear is K1 tau_d (HEC-15 Section 3.2).
    section = hy.Trapezoid(bottom_width=1.0, side_slope=2.5)
    lin = cat.get("riprap")
    r = check_lining(section, 1.5, 0.01, lin, d50=0.2)
    theta, phi = math.atan(1 / 2.5), math.radians(lin.angle_of_repose)
    k2 = math.sqrt(1 - math.sin(theta) ** 2 / math.sin(phi) ** 2)
    k1 = 0.066 * 2.5 + 0.67
    side = next(c for c in r.checks if c.location == "side slopes")
    assert side.design_shear == pytest.approx(k1 * r.bed_shear, rel=1e-12)
    assert side.permissible_shear == pytest.approx(k2 * r.permissible_shear, rel=1e-12)
    assert r.permissible_shear_side == pytest.approx(side.permissible_shear)


def test_side_size_is_k1_over_k2_times_bed_size_in_flat_table_range(cat):
    # HEC-15 Section 6.3.2 (not verified): D50,sides = K1/K2 D50,bottom, exact where F* and SF are constant (Re* < 4e4).
    section = hy.Trapezoid(bottom_width=0.4, side_slope=3.0)
    lin = cat.get("gravel")
    r = check_lining(section, 0.42, 0.008, lin)
    re = hec15.particle_reynolds(r.required_d50_depth, 0.008, r.required_d50)
    assert re < 4e4
    k1 = hec15.side_slope_factor(3.0)
    k2 = hec15.tractive_force_ratio(3.0, lin.angle_of_repose)
    assert r.required_d50_side / r.required_d50_bed == pytest.approx(k1 / k2, rel=1e-9)
    # and the bed part is Eq. 6.8 at that depth
    assert r.required_d50_bed == pytest.approx(hec15.required_d50(r.required_d50_depth, 0.008).d50, rel=1e-9)


def test_required_d50_is_the_settled_trial_procedure(cat):
    # HEC-15 Chapter 6 procedure: trial D50 -> depth and n -> required D50 (Eq. 6.8) -> repeat. A stone of
    # the reported size, checked again, just meets its safety factor and needs no larger stone.
    section = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
    lin = cat.get("riprap")
    r = check_lining(section, 1.0, 0.04, lin, d50=0.15, bend_radius=8.0)
    again = check_lining(section, 1.0, 0.04, lin, d50=r.required_d50, bend_radius=8.0)
    assert again.stable
    assert again.governing_check().margin == pytest.approx(1.0, abs=1e-6)
    assert again.required_d50 == pytest.approx(r.required_d50, rel=1e-6)
    assert again.depth == pytest.approx(r.required_d50_depth, rel=1e-6)
    smaller = check_lining(section, 1.0, 0.04, lin, d50=r.required_d50 * 0.98, bend_radius=8.0)
    assert not smaller.stable


def test_table_6_1_safety_factor_at_high_reynolds(cat):
    # HEC-15 Table 6.1 (not verified): Re* >= 2e5 gives F* = 0.15 and SF = 1.5.
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    r = check_lining(section, 6.0, 0.05, cat.get("riprap"), d50=0.5)
    assert r.reynolds >= 2e5 and r.shields == pytest.approx(0.15) and r.required_safety_factor == pytest.approx(1.5)
    assert r.permissible_shear == pytest.approx(0.15 * (25900 - 9810) * 0.5, rel=1e-12)


def test_steep_slope_uses_appendix_d(cat):
    # HEC-15 Appendix D (not verified): riprap on slopes steeper than 10 % by the steep-slope safety factor.
    section = hy.Trapezoid(bottom_width=0.6, side_slope=2.5)
    lin = cat.get("riprap")
    r = check_lining(section, 1.0, 0.12, lin, d50=0.3)
    side = next(c for c in r.checks if c.location == "side slopes")
    assert side.method == "appendix_d"
    sf = hec15.steep_slope_safety_factor(0.3, r.depth, 0.12, 2.5, lin.angle_of_repose, r.shields)
    assert side.safety_factor == pytest.approx(sf, rel=1e-12)
    # the permissible shear stated is where the Appendix D factor falls to 1 (incipient motion)
    tau = side.permissible_shear
    fac = hec15._steep_sf(0.3, tau, math.atan(1 / 2.5), math.atan(0.12), math.radians(lin.angle_of_repose),
                          r.shields, 25900.0, 9810.0)
    assert fac == pytest.approx(1.0, abs=1e-9)
    assert r.required_d50_method == "appendix_d"
    assert any("Appendix D" in n and "10 %" in n for n in r.notes)
    mild = check_lining(section, 1.0, 0.09, lin, d50=0.3)
    assert next(c for c in mild.checks if c.location == "side slopes").method == "k2"


def test_stone_cannot_rest_on_vertical_walls(cat):
    r = check_lining(hy.Rectangle(bottom_width=1.0), 1.0, 0.01, cat.get("riprap"), d50=0.3)
    assert not r.stable and r.required_d50 is None
    assert "vertical walls" in r.reason() and any("flatten" in w for w in r.warnings)


def test_asymmetric_sides_are_checked_each(cat):
    section = hy.Trapezoid(bottom_width=1.0, left_slope=2.0, right_slope=4.0)
    r = check_lining(section, 1.0, 0.01, cat.get("riprap"), d50=0.2)
    locs = [c.location for c in r.checks]
    assert "left side slope" in locs and "right side slope" in locs
    assert r.side_shear == pytest.approx(hec15.side_slope_factor(4.0) * r.bed_shear)


# ------------------------------------------------------------ K1, Kb at the ends of their ranges

@pytest.mark.parametrize("z, k1", [(1.0, 0.77), (1.5, 0.77), (3.0, 0.066 * 3 + 0.67), (5.0, 1.0), (8.0, 1.0)])
def test_side_shear_k1_ends(cat, z, k1):
    # HEC-15 Section 3.2 (not verified): K1 = 0.77 for Z <= 1.5, 0.066 Z + 0.67 for 1.5 < Z < 5, 1.0 for Z >= 5.
    r = check_lining(hy.Trapezoid(bottom_width=1.0, side_slope=z), 1.0, 0.005, cat.get("concrete"))
    assert r.side_slope_factor == pytest.approx(k1, abs=5e-3)
    assert r.side_shear == pytest.approx(r.side_slope_factor * r.bed_shear, rel=1e-12)


@pytest.mark.parametrize("ratio, kb", [(1.0, 2.0), (2.0, 2.0), (5.0, 2.38 - 0.206 * 5 + 0.0073 * 25), (10.0, 1.05),
                                       (30.0, 1.05)])
def test_bend_shear_kb_ends(cat, ratio, kb):
    # HEC-15 Section 3.4 (not verified): Kb = 2.0 for Rc/T <= 2, 2.38 - 0.206 Rc/T + 0.0073 (Rc/T)^2
    # between, 1.05 for Rc/T >= 10.
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    top = check_lining(section, 1.0, 0.005, cat.get("concrete")).analysis.top_width
    r = check_lining(section, 1.0, 0.005, cat.get("concrete"), bend_radius=ratio * top)
    assert r.bend_factor == pytest.approx(kb, abs=4e-3)
    assert r.bend_shear == pytest.approx(r.bend_factor * r.bed_shear, rel=1e-12)


def test_bend_protection_length_customary_form(cat):
    # HEC-15 Section 3.4 (not verified): Lp = 0.604 R^(7/6) / n with R and Lp in ft (CU); the SI form is used.
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    r = check_lining(section, 1.0, 0.01, cat.get("riprap"), d50=0.15, bend_radius=20.0)
    r_ft = r.analysis.hydraulic_radius / FOOT
    assert r.bend_protection_length / FOOT == pytest.approx(0.604 * r_ft ** (7 / 6) / r.manning_n, rel=2e-3)


def test_bend_radius_smaller_than_half_the_width_is_refused(cat):
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    with pytest.raises(InputError) as e:
        check_lining(section, 1.0, 0.005, cat.get("concrete"), bend_radius=0.5)
    assert e.value.field == "bend_radius" and "half the water-surface width" in str(e.value)


# ------------------------------------------------------------ freeboard and ditch depth

def test_freeboard_superelevation_and_ditch_top(cat):
    # Superelevation V^2 T / (g Rc) (HEC-15 Section 3.4, not verified); minimum 0.15 m; trapezoid top width
    # b + 2 Z y and perimeter b + 2 y sqrt(1 + Z^2) (Chow 1959, Table 2-1).
    section = hy.Trapezoid(bottom_width=0.8, side_slope=3.0)
    # a subcritical grade (Froude number about 0.73); supercritical flow raises the freeboard, see test_freeboard.py
    straight = check_lining(section, 0.8, 0.002, cat.get("concrete"))
    assert straight.froude < 1
    assert straight.freeboard == pytest.approx(0.15) and straight.superelevation is None
    assert straight.total_depth == pytest.approx(straight.depth + 0.15)
    assert straight.top_width_at_top == pytest.approx(0.8 + 2 * 3 * straight.total_depth)
    assert straight.lined_width == pytest.approx(0.8 + 2 * straight.total_depth * math.sqrt(10))
    bend = check_lining(section, 0.8, 0.002, cat.get("concrete"), bend_radius=12.0, min_freeboard=0.3)
    dd = bend.velocity ** 2 * bend.analysis.top_width / (G * 12.0)
    assert bend.superelevation == pytest.approx(dd, rel=1e-12)
    assert bend.freeboard == pytest.approx(0.3 + dd) and bend.total_depth == pytest.approx(bend.depth + 0.3 + dd)
    assert "0.150 m" in straight.freeboard_rule(SI) and "0.492 ft" in straight.freeboard_rule(US)
    assert "superelevation" in bend.freeboard_rule(SI)


def test_pipe_too_shallow_for_the_freeboard_is_reported(cat):
    section = hy.Circle(diameter=0.6)
    r = check_lining(section, 0.5, 0.01, cat.get("concrete"))
    assert r.total_depth > 0.6 and r.top_width_at_top == pytest.approx(0.0, abs=1e-9)
    assert any("not deep enough" in w for w in r.warnings)


# ------------------------------------------------------------ rigid, grass, soil, user data

def test_rigid_lining_is_non_erodible_with_chow_n(cat):
    section = hy.Trapezoid(bottom_width=0.6, side_slope=2.0)
    r = check_lining(section, 0.5, 0.01, cat.get("concrete_trowel"))
    # n from Chow (1959) Table 5-6 as transcribed in the fluids library (concrete, trowel finish, normal)
    assert r.manning_n == pytest.approx(n_lined_built["Concrete"]["Trowel finish"][1])
    assert r.depth == pytest.approx(manning_depth(section, 0.5, 0.01, r.manning_n), rel=1e-9)
    assert r.verdict == "non-erodible" and r.stable and r.permissible_shear is None and r.safety_factor is None
    assert r.governs == "non-erodible" and r.required_d50 is None
    assert any("non-erodible" in n for n in r.notes)
    assert "non-erodible" in r.reason(US)


def test_low_velocity_warning_names_value_and_source(cat):
    section = hy.Trapezoid(bottom_width=2.0, side_slope=3.0)
    slow = check_lining(section, 0.2, 0.0005, cat.get("concrete"))
    assert slow.velocity < SELF_CLEANING_VELOCITY
    text = [w for w in slow.warnings if "silt" in w]
    assert len(text) == 1 and "0.610 m/s" in text[0] and "Chow (1959)" in text[0]
    assert "is below 2.00 ft/s" in in_units(text[0], hy.units.US)  # 0.61 m/s restated for a US session
    fast = check_lining(section, 2.0, 0.01, cat.get("concrete"))
    assert fast.velocity > SELF_CLEANING_VELOCITY and not any("silt" in w for w in fast.warnings)


def test_near_critical_warning_states_band_and_source(cat):
    section = hy.Rectangle(bottom_width=1.0)
    lin = cat.get("concrete")
    n = lin.roughness()
    yc = hy.critical_depth(section, 1.0)
    s_c = (1.0 * n / (yc * (yc / (1 + 2 * yc)) ** (2 / 3))) ** 2  # critical slope, Chow (1959) Sec. 6-6
    r = check_lining(section, 1.0, s_c, lin)
    assert r.froude == pytest.approx(1.0, abs=1e-6)
    near = [w for w in r.warnings if "near critical" in w]
    assert len(near) == 1 and "0.8 to 1.2" in near[0] and "common practice" in near[0]


def test_grass_permissible_shear_from_soil_and_cover(cat):
    # HEC-15 Section 4.2 (not verified): the effective shear on the soil, tau_d (1 - CF) (ns/n)^2, must not
    # exceed the soil's permissible shear; the check states it as tau_p = tau_p,soil / (1 - CF) (n/ns)^2.
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    for key in ("grass_good_sod", "grass_fair_mixed", "grass_poor_bunch"):
        lin = cat.get(key)
        r = check_lining(section, 0.6, 0.01, lin)
        te = hec15.effective_soil_shear(r.bed_shear, lin.cover_factor(), r.manning_n, lin.soil_grain_n())
        assert (te <= lin.soil_permissible_shear()) == next(c for c in r.checks if c.location == "bed").passes
        assert r.permissible_shear == pytest.approx(
            lin.soil_permissible_shear() / (1 - lin.cover_factor()) * (r.manning_n / lin.soil_grain_n()) ** 2)
        assert r.n_relation == "vegetation"
        assert r.depth == pytest.approx(manning_depth(section, 0.6, 0.01, lin.roughness()), rel=1e-8)


def test_excellent_sod_on_fine_soil_is_flagged_above_the_published_range_for_vegetated_soils(cat):
    """Fischenich, C., Stability Thresholds for Stream Restoration Materials (May 2001), Overview: "vegetated soils
    (0.5 - 4 lb/sf)", "hard armoring (< 13 lb/sf)". HEC-15 Section 4.2 (not verified) with CF 0.98 (Table 4.5, not
    verified) gives the shipped excellent sod on fine soil more than three times the hard-armouring figure: the
    result carries a warning naming the published range, in both unit systems; a good stand inside it does not."""
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    r = check_lining(section, 0.3, 0.01, cat.get("grass_excellent_sod"))
    assert r.permissible_shear > 13 * PSF
    flagged = [w for w in r.warnings if "vegetated soils" in w]
    assert len(flagged) == 1 and "Fischenich, 2001" in flagged[0]
    assert "above 192 Pa, the top of the range" in flagged[0]
    assert "4.00 lb/ft^2" in in_units(flagged[0], US)
    good = check_lining(section, 0.3, 0.01, cat.get("grass_good_sod"))
    assert good.permissible_shear < 4 * PSF and not [w for w in good.warnings if "vegetated soils" in w]


def test_bare_fine_soil(cat):
    r = check_lining(hy.Trapezoid(bottom_width=1.0, side_slope=3.0), 0.3, 0.002, cat.get("soil_fine_noncohesive"))
    assert r.permissible_shear == pytest.approx(1.0)  # HEC-15 Section 4.3 (not verified): 1.0 Pa below D75 1.3 mm
    assert r.manning_n == pytest.approx(0.016) and not r.stable


@pytest.mark.parametrize("key, field", [("blanket_user", "roughness.n"), ("trm_user", "roughness.n"),
                                        ("soil_noncohesive", "soil.d75"), ("soil_cohesive", "soil.soil_class")])
def test_unfilled_user_data_names_the_field(cat, key, field):
    with pytest.raises(InputError) as e:
        check_lining(hy.Trapezoid(bottom_width=1.0, side_slope=3.0), 0.5, 0.01, cat.get(key))
    assert e.value.field == f"lining {key!r} {field}"


def test_user_data_mat_half_filled_then_filled(tmp_path):
    half = user_catalogue(tmp_path, '[[lining]]\nkey = "trm_user"\n[lining.roughness]\nn = 0.03\n'
                                    'n_source = "user data: data sheet"\n')
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    with pytest.raises(InputError) as e:
        check_lining(section, 0.5, 0.01, half.get("trm_user"))
    assert e.value.field == "lining 'trm_user' permissible.shear"
    full = user_catalogue(tmp_path, '[[lining]]\nkey = "trm_user"\n[lining.roughness]\nn = 0.03\n'
                                    'n_source = "user data"\n[lining.permissible]\nshear = 150.0\n'
                                    'shear_source = "user data"\n')
    r = check_lining(section, 0.5, 0.01, full.get("trm_user"))
    assert r.permissible_shear == 150.0 and r.manning_n == 0.03 and r.stable
    assert r.safety_factor == pytest.approx(150.0 / r.bed_shear)


def test_d50_refused_for_a_lining_that_is_not_stone(cat):
    with pytest.raises(InputError) as e:
        check_lining(hy.Trapezoid(bottom_width=1.0, side_slope=3.0), 0.5, 0.01, cat.get("concrete"), d50=0.1)
    assert e.value.field == "d50"


@pytest.mark.parametrize("kwargs, field", [({"flow": 0.0}, "flow"), ({"slope": -0.01}, "slope"),
                                           ({"min_freeboard": -0.1}, "min_freeboard"), ({"d50": -0.1}, "d50"),
                                           ({"bend_radius": 0.0}, "bend_radius"), ({"n": 0.0}, "n"),
                                           ({"min_safety_factor": 0.9}, "min_safety_factor")])
def test_bad_inputs_name_their_field(cat, kwargs, field):
    args = {"flow": 0.5, "slope": 0.01, "d50": 0.1}
    args.update(kwargs)
    flow, slope = args.pop("flow"), args.pop("slope")
    with pytest.raises(InputError) as e:
        check_lining(hy.Trapezoid(bottom_width=1.0, side_slope=3.0), flow, slope, cat.get("riprap"), **args)
    assert e.value.field == field


def test_stone_outside_chapter_6_range_is_warned(cat):
    r = check_lining(hy.Trapezoid(bottom_width=3.0, side_slope=3.0), 2.0, 0.001, cat.get("riprap"), d50=0.01)
    # HEC-15 Chapter 6 covers 15 mm to 550 mm stone (verified); the warning restates itself in inches
    assert any("D50 = 10.0 mm is outside the 15.0 mm to 550 mm range" in w for w in r.warnings)
    assert any("D50 = 0.394 in is outside the 0.591 in to 21.7 in range" in in_units(w, hy.units.US)
               for w in r.warnings)


def test_min_safety_factor_raises_the_requirement(cat):
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    lin = cat.get("grass_good_sod")
    base = check_lining(section, 0.6, 0.01, lin)
    strict = check_lining(section, 0.6, 0.01, lin, min_safety_factor=base.safety_factor * 1.01)
    assert base.stable and not strict.stable


# ------------------------------------------------------------ verdict in words, units

def test_reason_in_us_and_si_units(cat):
    section = hy.Trapezoid(bottom_width=0.4, side_slope=3.0)
    r = check_lining(section, 0.42, 0.008, cat.get("gravel"))
    gov = r.governing_check()
    assert gov.location == r.governs == "side slopes"
    us = r.reason(US)
    assert us.startswith("not stable, side slopes: ")
    assert f"{gov.design_shear / PSF:.3f} lb/ft^2 against {gov.permissible_shear / PSF:.3f} lb/ft^2 permissible" in us
    si = r.reason(SI)
    assert f"{gov.design_shear:.1f} Pa against {gov.permissible_shear:.1f} Pa permissible" in si
    d = r.to_dict(US)
    assert d["bed_shear"] == pytest.approx(r.bed_shear / PSF) and d["total_depth"] == pytest.approx(r.total_depth / FOOT)
    assert d["stable"] is False and d["required_d50"] == pytest.approx(r.required_d50 / FOOT)


# ------------------------------------------------------------ comparison

def test_compare_rows_agree_with_single_checks(cat, tmp_path):
    priced = user_catalogue(tmp_path, '[[lining]]\nkey = "concrete"\nunit_cost = 80.0\n'
                                      '[[lining]]\nkey = "riprap"\nunit_cost = 60.0\n')
    section = hy.Trapezoid(bottom_width=0.6, side_slope=3.0)
    choices = ["concrete", "riprap:0.2", ("gravel", None), "grass_good_sod"]
    rows = compare_linings(section, 0.8, 0.02, choices, priced, bend_radius=15.0)
    assert [r.key for r in rows] == ["concrete", "riprap", "gravel", "grass_good_sod"]
    for row, choice in zip(rows, choices):
        key, d50 = parse_choice(choice)
        single = check_lining(section, 0.8, 0.02, priced.get(key), d50=d50, bend_radius=15.0)
        assert row.depth == single.depth and row.manning_n == single.manning_n
        assert row.safety_factor == single.safety_factor and row.verdict == single.verdict
        assert row.governs == single.governs and row.total_depth == single.total_depth
        assert row.design_shear == single.governing_check().design_shear
    conc, rip, grav, grass = rows
    # cost per length: price per m^2 times the lined perimeter; stone per m^3 of a 1.5 D50 layer
    assert conc.cost_per_length == pytest.approx(80.0 * conc.lined_width)
    assert rip.layer_volume == pytest.approx(rip.lined_width * 1.5 * 0.2)
    assert rip.cost_per_length == pytest.approx(60.0 * rip.layer_volume)
    assert grav.cost_per_length is None and grass.cost_per_length is None and grass.layer_volume is None
    assert conc.lined_width == pytest.approx(0.6 + 2 * conc.total_depth * math.sqrt(10))


def test_compare_reports_no_solution_in_its_row(cat):
    rows = compare_linings(hy.Circle(diameter=0.3), 2.0, 0.001, ["concrete"], cat)
    assert rows[0].verdict == "no solution" and rows[0].error and rows[0].depth is None
    with pytest.raises(NoSolutionError):
        check_lining(hy.Circle(diameter=0.3), 2.0, 0.001, cat.get("concrete"))


def test_compare_refuses_bad_choices(cat):
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    with pytest.raises(InputError) as e:
        compare_linings(section, 0.5, 0.01, ["nonsuch"], cat)
    assert e.value.field == "lining"
    with pytest.raises(InputError) as e:
        compare_linings(section, 0.5, 0.01, ["riprap:big"], cat)
    assert e.value.field == "d50"
    with pytest.raises(InputError):
        compare_linings(section, 0.5, 0.01, [], cat)


def test_parse_choice_forms():
    assert parse_choice("riprap") == ("riprap", None)
    assert parse_choice("riprap:0.3") == ("riprap", 0.3)
    assert parse_choice(("gravel", 0.02)) == ("gravel", 0.02)
    with pytest.raises(InputError):
        parse_choice(":0.3")
    with pytest.raises(InputError):
        parse_choice("riprap:-1")


def test_sizing_steps_past_a_trial_size_without_a_settled_depth(cat):
    # Found by the property tests: on the way to the required size a trial D50 lands where the "auto" n makes
    # the conveyance dip just above da/D50 = 1.5 and the depth solver cannot settle; the search nudges it.
    section = hy.Trapezoid(bottom_width=4.0, side_slope=4.0)
    r = check_lining(section, 4.0, 0.05, cat.get("gravel"))
    assert not r.stable and r.required_d50 > 0.15
    assert check_lining(section, 4.0, 0.05, cat.get("riprap"), d50=r.required_d50).stable


def test_layer_thickness_rule_and_d100(cat, tmp_path):
    # Common practice, also HEC-15 Section 6.4 (not verified): thickness the larger of 1.5 D50 and D100.
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    r = check_lining(section, 1.0, 0.01, cat.get("riprap"), d50=0.2)
    assert r.layer_thickness == pytest.approx(0.3) and r.filter_note and "geotextile" in r.filter_note
    graded = user_catalogue(tmp_path, '[[lining]]\nkey = "riprap"\n[lining.stone]\nd50 = 0.2\nd100 = 0.45\n'
                                      'd50_source = "user data"\nd100_source = "user data"\n')
    r = check_lining(section, 1.0, 0.01, graded.get("riprap"))
    assert r.layer_thickness == pytest.approx(0.45)


def test_supercritical_flow_in_a_bend_is_warned(cat):
    section = hy.Trapezoid(bottom_width=0.6, side_slope=2.0)
    r = check_lining(section, 0.8, 0.02, cat.get("concrete"), bend_radius=10.0)
    assert r.froude > 1 and any("cross waves" in w and "Chow (1959)" in w for w in r.warnings)
    straight = check_lining(section, 0.8, 0.02, cat.get("concrete"))
    assert not any("cross waves" in w for w in straight.warnings)


# ------------------------------------------------------------ the shear checks on arrays

def test_shear_checks_on_arrays_give_the_published_stone_values(cat):
    # HEC-15 Table 2.3 (not verified): 25 mm stone about 19 N/m^2, 50 mm 38, 150 mm 113, 300 mm 227, i.e. Eq. 6.7
    # at F* = 0.047 (Table 6.1 below Re* = 4e4); K1 = 0.77 for Z <= 1.5 and 1.0 for Z >= 5 (HEC-15 Section 3.2,
    # not verified); K2 = sqrt(1 - sin^2(theta)/sin^2(phi)) on a mild bed (HEC-15 Section 6.3.2, not verified).
    lin = cat.get("riprap")
    d50 = np.array([0.025, 0.05, 0.15, 0.30])
    sc = shear_checks(lin, 0.5, 0.001, d50=d50, left_slope=np.array([1.5, 5.0, 3.0, np.nan]), right_slope=6.0)
    assert np.all(sc.reynolds <= 4e4) and np.all(sc.shields == 0.047) and np.all(sc.required_safety_factor == 1.0)
    np.testing.assert_allclose(sc.permissible_shear, [19.0, 38.0, 113.0, 227.0], atol=1.0)
    bed, left, right = sc.checks
    assert np.all(bed.design_shear == pytest.approx(9810 * 0.5 * 0.001))
    assert left.shear_factor[:2].tolist() == [0.77, 1.0] and not left.applies[3]
    theta, phi = np.arctan(1 / left.side_slope[:3]), math.radians(lin.angle_of_repose)
    k2 = np.sqrt(1 - np.sin(theta) ** 2 / math.sin(phi) ** 2)
    np.testing.assert_allclose(left.permissible_shear[:3], k2 * sc.permissible_shear[:3], rtol=1e-12)
    assert left.safety_factor[3] == math.inf  # no left side: never governs
    assert list(left.location) == ["left side slope"] * 4 and list(right.location) == ["right side slope"] * 4
    gov = sc.governing()
    np.testing.assert_array_equal(sc.safety_factor, np.min(np.column_stack(
        [c.safety_factor for c in sc.checks]), axis=1))
    np.testing.assert_array_equal(sc.stable, sc.safety_factor >= sc.required_safety_factor)
    assert gov.shape == (4,)


def test_shear_checks_agree_with_check_lining_channel_by_channel(cat):
    # The same relations as check_lining, bends included (Kb, HEC-15 Section 3.4, not verified).
    rng = np.random.default_rng(21)
    for key in ("riprap", "grass_good_sod", "soil_fine_noncohesive", "concrete"):
        lin = cat.get(key)
        for _ in range(6):
            section = hy.Trapezoid(bottom_width=float(rng.uniform(0.3, 2)), left_slope=float(rng.choice([1, 2, 3])),
                                   right_slope=float(rng.choice([2, 4])))
            q, s = float(rng.uniform(0.1, 3)), float(10 ** rng.uniform(-3, -0.8))
            r = check_lining(section, q, s, lin, bend_radius=25.0)
            sc = shear_checks(lin, np.array([r.depth, r.depth]), s, r.manning_n, d50=r.d50,
                              left_slope=section.left_slope, right_slope=section.right_slope,
                              bend_radius=np.array([25.0, np.nan]), top_width=r.analysis.top_width)
            assert sc.stable[0] == r.stable
            if r.permissible_shear is None:
                assert sc.non_erodible and np.isnan(sc.permissible_shear[0])
                continue
            assert sc.safety_factor[0] == pytest.approx(r.safety_factor, rel=1e-12)
            assert sc.checks[-1].design_shear[0] == pytest.approx(r.bend_shear, rel=1e-12)
            assert not sc.checks[-1].applies[1] and sc.checks[-1].safety_factor[1] == math.inf


def test_shear_checks_refuse_bad_input_naming_the_field(cat):
    riprap, grass = cat.get("riprap"), cat.get("grass_good_sod")
    with pytest.raises(InputError) as err:
        shear_checks(riprap, 0.5, 0.01, d50=0.2, left_slope=-1.0)
    assert err.value.field == "left_slope"
    with pytest.raises(InputError) as err:
        shear_checks(riprap, 0.5, 0.01, d50=0.2, bend_radius=1.0, top_width=3.0)
    assert err.value.field == "bend_radius" and "half the water-surface width" in str(err.value)
    for call, field in ((lambda: shear_checks(riprap, 0.5, 0.01), "d50"),
                        (lambda: shear_checks(grass, 0.5, 0.01, d50=0.2), "d50"),
                        (lambda: shear_checks(grass, 0.5, 0.01), "manning_n"),
                        (lambda: shear_checks(riprap, -0.5, 0.01, d50=0.2), "depth"),
                        (lambda: shear_checks(riprap, 0.5, 2.0, d50=0.2), "slope"),
                        (lambda: shear_checks(riprap, 0.5, 0.01, d50=0.2, bend_radius=5.0), "top_width")):
        with pytest.raises(InputError) as err:
            call()
        assert err.value.field == field


def test_grass_on_a_surveyed_section_near_bank_full():
    # The depth-dependent n is probed below the trial depth, so a flow close to bank-full is solved
    # rather than refused for a probe above the bank.
    import hydraulics as hy
    from hydraulics.linings import load_catalogue
    from hydraulics.stability import check_lining
    ir = hy.Irregular([0, 2, 3, 4, 6], [1.1, 0.3, 0.0, 0.3, 1.1], n=0.04)
    lining = load_catalogue().get("grass_good_sod")
    rough = lining.roughness()
    q = 0.999 * hy.max_flow(ir, 0.01, rough)
    result = check_lining(ir, q, 0.01, lining)
    assert 0 < result.depth <= ir.full_depth
