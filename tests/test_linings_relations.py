"""HEC-15 lining relations against published values and the circular's own constants.

"HEC-15" = Kilgore, R. T. and Cotton, G. K., Design of Roadside Channels with
Flexible Linings, Hydraulic Engineering Circular No. 15, 3rd ed.,
FHWA-NHI-05-114, FHWA, 2005. Each check names its source; "verified" means the
value was read in the HEC-15 text, "not verified" that it was recalled.
"""

import math
import warnings

import numpy as np
import pytest

import hydraulics as hy
from hydraulics.errors import InputError, NoSolutionError
from hydraulics.linings import StoneRoughness, ValidityWarning, hec15

FT = 0.3048  # m, exact
PSF = 0.45359237 * 9.80665 / FT ** 2  # Pa per lb/ft^2


# --------------------------------------------------------------- Eq. 6.7, Table 2.3

@pytest.mark.parametrize("d50_mm, published", [
    (25, 19.0),    # HEC-15 Table 2.3, gravel mulch, coarse gravel 25 mm: 19 N/m^2 (not verified)
    (50, 38.0),    # HEC-15 Table 2.3, very coarse gravel 50 mm: 38 N/m^2 (not verified)
    (150, 113.0),  # HEC-15 Table 2.3, riprap 150 mm: 113 N/m^2 (not verified)
    (300, 227.0),  # HEC-15 Table 2.3, riprap 300 mm: 227 N/m^2 (not verified)
])
def test_stone_permissible_shear_matches_table_2_3(d50_mm, published):
    # Table 2.3 is Eq. 6.7 at F* = 0.047 and gamma_s = 25.9 kN/m^3 (HEC-15 Section 6.2, verified).
    tau = hec15.stone_permissible_shear(d50_mm / 1000.0, shields=0.047)
    assert tau == pytest.approx(published, rel=0.01)


def test_stone_permissible_shear_customary_form_agrees():
    # HEC-15 Eq. 6.7 in CU with gamma = 62.4 and gamma_s = 165 lb/ft^3 (Section 6.2, verified):
    # 150 mm = 0.492 ft stone -> tau_p = 0.047 * (165 - 62.4) * 0.492 lb/ft^2.
    d_ft = 0.150 / FT
    tau_cu = 0.047 * (165.0 - 62.4) * d_ft * PSF
    assert hec15.stone_permissible_shear(0.150) == pytest.approx(tau_cu, rel=0.005)


def test_stone_permissible_shear_refuses_light_stone():
    with pytest.raises(InputError) as e:
        hec15.stone_permissible_shear(0.1, gamma_stone=9000.0)
    assert e.value.field == "gamma_stone"


def test_stone_size_outside_chapter_6_range_warns():
    # HEC-15 Chapter 6 (verified): the procedures cover 15 mm gravel to 550 mm riprap.
    with pytest.warns(ValidityWarning, match="outside the 15.0 mm to 550 mm range") as caught:
        hec15.stone_permissible_shear(0.8)
    from hydraulics.units import US
    from hydraulics.wording import in_units
    message = caught[0].message.args[0]
    assert in_units(message, US).startswith("D50 = 31.5 in is outside the 0.591 in to 21.7 in range")  # / 25.4


# --------------------------------------------------------------- Table 6.1

@pytest.mark.parametrize("re, f_star, sf", [
    (1.0e3, 0.047, 1.0),    # HEC-15 Table 6.1, Re* <= 4e4 (not verified)
    (4.0e4, 0.047, 1.0),    # lower end of the interpolation band (not verified)
    (2.0e5, 0.15, 1.5),     # upper end (not verified)
    (1.0e6, 0.15, 1.5),     # Re* >= 2e5 (not verified)
    (1.2e5, 0.0985, 1.25),  # midpoint of the linear interpolation (not verified)
])
def test_table_6_1(re, f_star, sf):
    f, s = hec15.shields_and_safety_factor(re)
    assert f == pytest.approx(f_star, abs=1e-12)
    assert s == pytest.approx(sf, abs=1e-12)


def test_particle_reynolds_uses_hec15_viscosity():
    # HEC-15 Eq. 6.9 with nu = 1.131e-6 m^2/s (verified) and V* = sqrt(g d S).
    re = hec15.particle_reynolds(0.35, 0.008, 0.025)
    assert re == pytest.approx(math.sqrt(9.80665 * 0.35 * 0.008) * 0.025 / 1.131e-6, rel=1e-12)
    assert re < hec15.RE_LOW  # gravel mulch sits in the F* = 0.047 row


# --------------------------------------------------------------- Eq. 6.8

def _hec15_iteration(depth, slope, sg=25900.0 / 9810.0, nu=1.131e-6):
    """D50 by the trial procedure HEC-15 describes for Eq. 6.8: guess, read Table 6.1, repeat."""
    d50 = 0.1
    for _ in range(500):
        re = math.sqrt(9.80665 * depth * slope) * d50 / nu
        t = min(1.0, max(0.0, (re - 4e4) / 1.6e5))
        f, sf = 0.047 + 0.103 * t, 1.0 + 0.5 * t
        new = sf * depth * slope / (f * (sg - 1.0))
        if abs(new - d50) < 1e-13:
            return new
        d50 = 0.5 * (d50 + new)  # damped, as a designer would when the trials oscillate
    raise AssertionError("trial procedure did not settle")


@pytest.mark.parametrize("depth, slope", [(0.3, 0.01), (0.6, 0.02), (0.9, 0.04), (1.2, 0.08), (0.5, 0.15)])
def test_required_d50_matches_trial_procedure(depth, slope):
    # HEC-15 Eq. 6.8 (verified) with Table 6.1 (not verified), solved by the trial-and-error
    # procedure of HEC-15 Section 6.3 as an independent algorithm.
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        got = hec15.required_d50(depth, slope)
    assert got.d50 == pytest.approx(_hec15_iteration(depth, slope), rel=1e-9)
    # at the answer Eq. 6.8 holds with equality: tau_p = SF tau_d (HEC-15 Eq. 3.2 and 6.7)
    tau_p = hec15.stone_permissible_shear(got.d50, got.shields) if 0.015 <= got.d50 <= 0.55 else \
        got.shields * (25900.0 - 9810.0) * got.d50
    assert tau_p == pytest.approx(got.safety_factor * 9810.0 * depth * slope, rel=1e-9)


def test_required_d50_vectorised_equals_scalar():
    depth = np.array([0.3, 0.6, 0.9])
    slope = np.array([0.01, 0.02, 0.04])
    vec = hec15.required_d50(depth, slope)
    for i in range(3):
        assert vec.d50[i] == pytest.approx(hec15.required_d50(float(depth[i]), float(slope[i])).d50, rel=1e-14)


# --------------------------------------------------------------- Eq. 6.1, 6.2

def test_blodgett_si_and_customary_constants_agree():
    # HEC-15 Eq. 6.1 (verified): alpha = 0.319 SI and 0.262 CU; same n from either.
    da, d50 = 0.40, 0.05
    n_si = hec15.blodgett_n(da, d50)
    n_cu = 0.262 * (da / FT) ** (1 / 6) / (2.25 + 5.23 * math.log10(da / d50))
    assert n_si == pytest.approx(n_cu, rel=0.002)


def test_blodgett_range_warning_and_pole():
    # HEC-15 Eq. 6.1 is applicable for 1.5 <= da/D50 <= 185 (verified).
    with warnings.catch_warnings():
        warnings.simplefilter("error", ValidityWarning)
        hec15.blodgett_n(0.151, 0.1)
        hec15.blodgett_n(18.4, 0.1)
    with pytest.warns(ValidityWarning, match="Blodgett"):
        hec15.blodgett_n(0.1, 0.1)
    with pytest.raises(InputError) as e:
        hec15.blodgett_n(0.03, 0.1)  # denominator 2.25 + 5.23 log10(0.3) < 0
    assert e.value.field == "average_depth"


def test_bathurst_customary_form_agrees():
    # HEC-15 Eq. 6.2 (form and constants verified): alpha = 1.0 SI with g in m/s^2, 1.49 CU with
    # g = 32.2 ft/s^2. Eq. 6.3-6.6 (not verified) written out here in customary units, where the
    # lengths enter only as ratios.
    da, d50, t, fr = 0.3, 0.3, 3.0, 0.8
    da_ft, d50_ft, t_ft = da / FT, d50 / FT, t / FT
    b = 1.14 * (d50_ft / t_ft) ** 0.453 * (da_ft / d50_ft) ** 0.814
    f_fr = (0.28 * fr / b) ** math.log10(0.755 / b)
    f_reg = 13.434 * (t_ft / d50_ft) ** 0.492 * b ** (1.025 * (t_ft / d50_ft) ** 0.118)
    f_cg = (t_ft / da_ft) ** -b
    n_cu = 1.49 * da_ft ** (1 / 6) / (math.sqrt(32.2) * f_fr * f_reg * f_cg)
    assert hec15.bathurst_n(da, d50, t, fr) == pytest.approx(n_cu, rel=0.005)


def test_bathurst_with_manning_is_self_consistent():
    # n from the closed form must reproduce itself through Eq. 6.2 when the Froude number is
    # computed from the Manning velocity V = R^(2/3) S^(1/2) / n (Chow 1959, Eq. 5-6).
    da, d50, t, r, s = 0.25, 0.3, 2.5, 0.22, 0.05
    n = hec15.bathurst_n_manning(da, d50, t, r, s)
    v = r ** (2 / 3) * s ** 0.5 / n
    fr = v / math.sqrt(9.80665 * da)
    assert hec15.bathurst_n(da, d50, t, fr) == pytest.approx(n, rel=1e-10)


def test_bathurst_range_warning():
    # HEC-15 Eq. 6.2 is applicable for 0.3 < da/D50 < 8.0 (verified).
    with pytest.warns(ValidityWarning, match="Bathurst"):
        hec15.bathurst_n(0.05, 0.3, 3.0, 1.0)


def test_strickler_customary_form():
    # Chow (1959): n = 0.034 D^(1/6) with D in feet (not verified); 1 ft stone gives 0.034.
    assert hec15.strickler_n(FT) == pytest.approx(0.034, rel=1e-12)


# --------------------------------------------------------------- Chapter 3 factors

def test_side_slope_factor_ends_of_range():
    # HEC-15 Chapter 3, K1 (not verified): 0.77 for Z <= 1.5, 1.0 for Z >= 5, linear between.
    assert hec15.side_slope_factor(0.0) == 0.77
    assert hec15.side_slope_factor(1.5) == 0.77
    assert hec15.side_slope_factor(5.0) == 1.0
    assert hec15.side_slope_factor(10.0) == 1.0
    # the middle piece meets both ends (0.066 Z + 0.67)
    assert hec15.side_slope_factor(1.5 + 1e-9) == pytest.approx(0.77, abs=0.002)
    assert hec15.side_slope_factor(5.0 - 1e-9) == pytest.approx(1.0, abs=1e-6)


def test_bend_factor_ends_of_range():
    # HEC-15 Chapter 3, Kb (not verified): 2.00 for Rc/T <= 2, 1.05 for Rc/T >= 10.
    assert hec15.bend_factor(1.0, 1.0) == 2.0
    assert hec15.bend_factor(2.0, 1.0) == 2.0
    assert hec15.bend_factor(10.0, 1.0) == 1.05
    assert hec15.bend_factor(50.0, 1.0) == 1.05
    assert hec15.bend_factor(2.0 + 1e-9, 1.0) == pytest.approx(2.0, abs=0.005)
    assert hec15.bend_factor(10.0 - 1e-9, 1.0) == pytest.approx(1.05, abs=1e-6)


def test_bend_protection_length_si_and_customary_agree():
    # HEC-15 Chapter 3 (not verified): Lp = alpha R^(7/6) / n, alpha = 0.736 SI, 0.604 CU.
    r, n = 0.5, 0.035
    lp_cu_ft = 0.604 * (r / FT) ** (7 / 6) / n
    assert hec15.bend_protection_length(r, n) == pytest.approx(lp_cu_ft * FT, rel=0.002)


def test_design_shear_eq_3_1():
    # HEC-15 Eq. 3.1 (verified): tau_d = gamma d S with gamma = 9810 N/m^3.
    assert hec15.design_shear(0.5, 0.01) == pytest.approx(9810 * 0.5 * 0.01, rel=1e-12)


@pytest.mark.parametrize("ratio, relation", [
    (1.2, "bathurst"),    # below the lower end of Eq. 6.1's range, inside Eq. 6.2's 0.3 < da/D50 < 8.0
    (1.49, "bathurst"),
    (1.56, "blodgett"),   # inside 1.5 <= da/D50 <= 185 (past the program's 1.5-1.53 blend)
    (7.9, "blodgett"),    # both ranges hold: Eq. 6.1 applies (the circular's further words on the overlap not read)
    (185.0, "blodgett"),
])
def test_relation_choice_follows_section_6_1(ratio, relation):
    """HEC-15 Section 6.1 (verified, FHWA web edition hec1506.cfm): "Equation 6.1 is applicable for the range of
    conditions where 1.5 <= da/D50 <= 185"; below "the lower end of this range" the riprap's protrusion changes the
    roughness and "The relationship described by Bathurst (1991) addresses these conditions" (Eq. 6.2,
    0.3 < da/D50 < 8.0). In a rectangle da is the depth; a narrow one keeps Bathurst's relation usable (its
    exponent p of Eq. 6.3 well below 1), so no rule of the program stands in for it."""
    d50 = 0.1
    section = hy.Rectangle(bottom_width=1.0)
    depth = ratio * d50
    rough = StoneRoughness(d50)
    assert rough.relation(section, depth, 0.02) == relation
    g = section.properties(depth)
    expected = (hec15._blodgett_n(g.area / g.top_width, d50) if relation == "blodgett" else
                hec15._bathurst_n_manning(g.area / g.top_width, d50, g.top_width, g.area / g.wetted_perimeter, 0.02))
    assert rough.manning_n(section, depth, 0.02) == pytest.approx(expected, rel=1e-12)


# --------------------------------------------------------------- side slopes and steep slopes

def test_tractive_force_ratio_limits():
    # HEC-15 Section 6.3.2 (not verified): K2 = sqrt(1 - sin^2 theta / sin^2 phi).
    assert hec15.tractive_force_ratio(1e6, 42.0) == pytest.approx(1.0, abs=1e-9)
    z_repose = 1.0 / math.tan(math.radians(42.0))
    with pytest.raises(NoSolutionError, match="angle of repose"):
        hec15.tractive_force_ratio(z_repose * 0.99, 42.0)


def test_side_d50_larger_than_bed_on_steep_banks():
    # HEC-15 Section 6.3.2 (not verified): D50 sides = K1/K2 D50 bottom; on a 2:1 bank K1 = 0.77,
    # K2 < 0.77 for phi = 42 deg, so the sides need the larger stone.
    assert hec15.required_d50_side(0.1, 2.0, 42.0) > 0.1


def test_steep_slope_method_reduces_to_eq_6_8_on_a_flat_bank():
    # HEC-15 Appendix D (not verified): on a bank of vanishing slope the stability reduces to
    # the bed relation, SF = F* (gamma_s - gamma) D50 / tau (Eq. 6.7 and 3.2, verified).
    depth, slope = 0.3, 0.005
    d50 = hec15.required_d50(depth, slope).d50
    sf = hec15.steep_slope_safety_factor(d50, depth, slope, 1e5, 42.0)
    assert sf == pytest.approx(1.0, rel=1e-6)


def test_steep_slope_sizing_meets_its_safety_factor():
    got = hec15.required_d50_steep(0.3, 0.12, 3.0, 42.0)
    sf = hec15.steep_slope_safety_factor(got.d50, 0.3, 0.12, 3.0, 42.0, shields=got.shields)
    assert sf == pytest.approx(got.safety_factor, rel=1e-8)
    # close to, and not smaller than, the mild-slope side rule at this slope (both HEC-15)
    mild = hec15.required_d50_side(hec15.required_d50(0.3, 0.12).d50, 3.0, 42.0)
    assert mild <= got.d50 <= 1.5 * mild


def test_steep_slope_sizing_refuses_a_bank_steeper_than_repose():
    with pytest.raises(NoSolutionError):
        hec15.required_d50_steep(0.3, 0.12, 1.0, 40.0)


def test_layer_thickness_rule():
    # Common practice (also HEC-15 Section 6.4, not verified): max(1.5 D50, D100).
    assert hec15.stone_layer_thickness(0.2) == pytest.approx(0.3)
    assert hec15.stone_layer_thickness(0.2, d100=0.4) == pytest.approx(0.4)
    with pytest.raises(InputError) as e:
        hec15.stone_layer_thickness(0.2, d100=0.1)
    assert e.value.field == "d100"


# --------------------------------------------------------------- Chapter 4: soils and grass

def test_noncohesive_soil_pieces_meet_and_customary_form_agrees():
    # HEC-15 Chapter 4 (not verified): 1.0 N/m^2 below D75 = 1.3 mm; 0.75 D75 (mm) SI,
    # 0.4 D75 (in) lb/ft^2 CU above.
    assert hec15.noncohesive_permissible_shear(1.0e-3) == 1.0
    assert hec15.noncohesive_permissible_shear(1.3e-3) == pytest.approx(1.0, rel=0.03)
    d75 = 10e-3
    cu = 0.4 * (d75 / (FT / 12)) * PSF
    assert hec15.noncohesive_permissible_shear(d75) == pytest.approx(cu, rel=0.02)


def test_soil_grain_n_pieces_meet_and_customary_form_agrees():
    # HEC-15 Chapter 4 (not verified): ns = 0.016 fine; 0.015 D75^(1/6) (mm) SI, 0.026 (in) CU.
    assert hec15.soil_grain_n(None) == 0.016
    assert hec15.soil_grain_n(1.3e-3) == pytest.approx(0.016, rel=0.03)
    d75 = 20e-3
    # the two constants agree to about 1 % (0.026 in^(-1/6) = 0.0152 mm^(-1/6))
    assert hec15.soil_grain_n(d75) == pytest.approx(0.026 * (d75 / (FT / 12)) ** (1 / 6), rel=0.015)


@pytest.mark.parametrize("soil", ["GM", "GC", "SM", "SC", "ML", "CL", "MH"])
def test_cohesive_soil_rows_meet_at_pi_20(soil):
    # HEC-15 Table 4.6 (not verified): the PI 10-20 and PI >= 20 rows give the same shear at PI = 20.
    below = hec15.cohesive_permissible_shear(soil, 19.999999, 0.5)
    at = hec15.cohesive_permissible_shear(soil, 20.0, 0.5)
    assert below == pytest.approx(at, rel=0.005)


def test_cohesive_soil_refuses_low_plasticity():
    with pytest.raises(InputError) as e:
        hec15.cohesive_permissible_shear("CL", 5.0, 0.5)
    assert e.value.field == "plasticity_index"
    with pytest.raises(InputError) as e:
        hec15.cohesive_permissible_shear("XX", 15.0, 0.5)
    assert e.value.field == "soil_class"


def test_cohesive_soil_denser_is_stronger():
    # HEC-15 Section 4.3: a lower void ratio (denser soil) resists more shear.
    assert hec15.cohesive_permissible_shear("CL", 16, 0.4) > hec15.cohesive_permissible_shear("CL", 16, 0.8)


def test_vegetation_n_customary_constant_agrees():
    # HEC-15 Chapter 4 (not verified): n = alpha Cn tau_o^-0.4, alpha = 1.0 SI, 0.213 CU.
    cn, tau = 0.2, 40.0
    assert hec15.vegetation_n(cn, tau) == pytest.approx(0.213 * cn * (tau / PSF) ** -0.4, rel=0.005)


def test_grass_and_soil_permissible_round_trip():
    # HEC-15 Section 4.2: at tau_d = tau_p of the lining the effective soil shear equals tau_p,soil.
    tp = hec15.vegetation_permissible_shear(1.0, 0.9, 0.05, 0.016)
    assert hec15.effective_soil_shear(tp, 0.9, 0.05, 0.016) == pytest.approx(1.0, rel=1e-12)


def test_grass_permissible_shear_warns_above_the_range_published_for_vegetated_soils():
    """Fischenich, C., Stability Thresholds for Stream Restoration Materials (May 2001), Overview: "vegetated soils
    (0.5 - 4 lb/sf)". The bound is that range; the value is returned as computed, with a ValidityWarning above it."""
    lo, hi = hec15.VEGETATED_SHEAR_RANGE
    assert lo == pytest.approx(0.5 * PSF, rel=1e-12) and hi == pytest.approx(4.0 * PSF, rel=1e-12)
    with pytest.warns(hec15.ValidityWarning, match="vegetated soils"):
        tp = hec15.vegetation_permissible_shear(1.0, 0.98, 0.06, 0.016)
    assert tp == pytest.approx(1.0 / 0.02 * (0.06 / 0.016) ** 2)
    with warnings.catch_warnings():
        warnings.simplefilter("error", hec15.ValidityWarning)
        assert hec15.vegetation_permissible_shear(1.0, 0.9, 0.05, 0.016) < hi


def test_cover_factor_table():
    # HEC-15 Table 4.5 (not verified): sod, good stand = 0.90; bunch is lower than sod.
    assert hec15.cover_factor("sod", "good") == 0.90
    for cond in hec15.DENSITY_STIFFNESS:
        assert hec15.cover_factor("bunch", cond) < hec15.cover_factor("mixed", cond) < hec15.cover_factor("sod", cond)
    with pytest.raises(InputError) as e:
        hec15.cover_factor("tuft", "good")
    assert e.value.field == "growth_form"


# --------------------------------------------------------------- freeboard

def test_superelevation_and_freeboard():
    # HEC-15 Section 3.4 (not verified): delta_d = V^2 T / (g Rc), added to the freeboard in bends.
    dd = hec15.superelevation(2.0, 3.0, 15.0)
    assert dd == pytest.approx(4.0 * 3.0 / (9.80665 * 15.0), rel=1e-12)
    assert hec15.freeboard() == hec15.MIN_FREEBOARD
    assert hec15.freeboard(2.0, 3.0, 15.0) == pytest.approx(hec15.MIN_FREEBOARD + dd)
    with pytest.raises(InputError):
        hec15.freeboard(bend_radius=15.0)


def test_inputs_are_checked_with_field_names():
    for call, fld in [(lambda: hec15.design_shear(-1, 0.01), "depth"),
                      (lambda: hec15.design_shear(1, 0.0), "slope"),
                      (lambda: hec15.bend_factor(0, 1), "bend_radius"),
                      (lambda: hec15.required_d50(0.5, 2.0), "slope"),
                      (lambda: hec15.tractive_force_ratio(2, 95), "angle_of_repose")]:
        with pytest.raises(InputError) as e:
            call()
        assert e.value.field == fld
