"""Gabion mattresses (HEC-15 Chapter 7) and rolled erosion control products (HEC-15 Chapter 5).

What the program takes from the circulars, and where each was read (hydraulics/provenance.py):

* HEC-15 (Kilgore and Cotton, 3rd ed., 2005, FHWA-NHI-05-114) Section 7.1: the Manning's n of a gabion
  mattress is that of its rock fill, "using the D50 of the basket rock as applied to the relationships provided
  for riprap and gravel linings (See Section 6.1)", the mesh neglected (FHWA web edition, hec1507.cfm).
* HEC-15 Section 7.2 gives the mattress's permissible shear from its rock size and thickness; that text could not
  be read, so the program takes the designer's value (user data) and checks the fill against the mattress.
* HEC-15 Table 5.1: the three classes of rolled product (hec1505.cfm). The classes' Manning's n, HEC-15 Table 2.1,
  as given in HEC-22, 3rd ed. (Brown et al., 2009, FHWA-NHI-10-009), Table 5-1, p. 5-5, which cites HEC-15.
* HEC-22 (2009) Examples 5-1 and 5-2 (pp. 5-5 to 5-10): a channel lined with a turf reinforcement mat of n 0.030,
  in SI and English units, reproduced here through the program's TRM entry.
"""

import json
import warnings

import numpy as np
import pytest

import hydraulics as hy
from app.main import main
from hydraulics.errors import InputError
from hydraulics.linings import CatalogueError, hec15, load_catalogue, parse_catalogue, read_catalogue_file
from hydraulics.linings import shipped_catalogue_path
from hydraulics.linings.hec15 import ValidityWarning
from hydraulics.run_screening import screen_lining
from hydraulics.shear_checks import shear_checks
from hydraulics.stability import check_lining
from hydraulics.units import FOOT, PSF, US

GABION = ('[[lining]]\nkey = "gabion_mattress_user"\n[lining.stone]\nd50 = {d50}\n[lining.thickness]\n'
          'value = {t}\n[lining.permissible]\nshear = {tau}\n')
TRM = '[[lining]]\nkey = "trm_user"\n[lining.roughness]\nn = {n}\n[lining.permissible]\nshear = {tau}\n'


def user_catalogue(tmp_path, text):
    path = tmp_path / "user.toml"
    path.write_text("schema_version = 1\n" + text)
    return load_catalogue(user_path=path), path


def gabion(tmp_path, d50=0.10, t=0.23, tau=200.0):
    cat, _ = user_catalogue(tmp_path, GABION.format(d50=d50, t=t, tau=tau))
    return cat.get("gabion_mattress_user")


def trm(tmp_path, n=0.030, tau=100.0):
    cat, _ = user_catalogue(tmp_path, TRM.format(n=n, tau=tau))
    return cat.get("trm_user")


# ------------------------------------------------------------------ rolled products: HEC-15 Table 2.1 classes

@pytest.mark.parametrize("product_class, printed", [
    # HEC-22 (2009) Table 5-1, "Typical Channel Lining Manning's Roughness Coefficients", RECP rows:
    # Maximum, Typical, Minimum as printed
    ("open_weave_textile", (0.028, 0.025, 0.022)),
    ("erosion_control_blanket", (0.045, 0.035, 0.028)),
    ("turf_reinforcement_mat", (0.036, 0.030, 0.024)),
])
def test_recp_class_n_matches_hec22_table_5_1(product_class, printed):
    low, typical, high = hec15.recp_typical_n(product_class)
    assert (high, typical, low) == printed


def test_data_sheet_n_outside_its_class_is_flagged_not_refused():
    with warnings.catch_warnings():
        warnings.simplefilter("error", ValidityWarning)
        assert hec15.recp_data_sheet_n(0.030, "turf_reinforcement_mat") == 0.030
        assert hec15.recp_data_sheet_n(0.024, "turf_reinforcement_mat") == 0.024     # the ends are inside
        assert hec15.recp_data_sheet_n(0.036, "turf_reinforcement_mat") == 0.036
    with pytest.warns(ValidityWarning, match=r"0\.05 is outside 0\.028 to 0\.045.*Table 2\.1"):
        assert hec15.recp_data_sheet_n(0.05, "erosion_control_blanket") == 0.05
    with pytest.raises(InputError) as e:
        hec15.recp_typical_n("jute")
    assert e.value.field == "product_class"
    with pytest.raises(InputError) as e:
        hec15.recp_data_sheet_n(-0.01, "turf_reinforcement_mat")
    assert e.value.field == "n"


def test_rolled_product_templates_carry_their_class():
    cat = load_catalogue()
    assert {k: cat.get(k).product_class for k in ("open_weave_user", "blanket_user", "trm_user")} == {
        "open_weave_user": "open_weave_textile", "blanket_user": "erosion_control_blanket",
        "trm_user": "turf_reinforcement_mat"}
    assert cat.get("riprap").product_class is None


def test_hec22_example_5_1_trm_channel_capacity_si_and_english(tmp_path):
    """HEC-22 (2009) Example 5-1, p. 5-5 and 5-6: trapezoid So = 0.01, B = 0.8 m (2.62 ft), z = 3, d = 0.5 m
    (1.64 ft), "lined with a turf reinforcement mat with an n-value of 0.030": Q = 1.67 m3/s (59.7 ft3/s),
    V = 1.45 m/s (4.8 ft/s; the chart solution gives 1.46 m/s). Here the published flow goes in and the depth
    comes out; the published values carry two or three figures, rounded at each step (R = 0.29 m)."""
    mat = trm(tmp_path)
    si = check_lining(hy.Trapezoid(bottom_width=0.8, side_slope=3.0), 1.67, 0.01, mat)
    assert si.manning_n == 0.030
    assert si.depth == pytest.approx(0.5, abs=0.005)
    assert si.velocity == pytest.approx(1.45, abs=0.015)
    us = check_lining(hy.Trapezoid(bottom_width=2.62 * FOOT, side_slope=3.0), 59.7 * FOOT ** 3, 0.01, mat)
    assert us.depth / FOOT == pytest.approx(1.64, abs=0.01)
    assert us.velocity / FOOT == pytest.approx(4.8, abs=0.05)
    assert us.to_dict(US)["total_depth"] == pytest.approx(us.total_depth / FOOT)


def test_hec22_example_5_2_trm_straight_reach_shear_si_and_english(tmp_path):
    """HEC-22 (2009) Example 5-2, p. 5-9 and 5-10: So = 0.01, B = 0.90 m (3.0 ft), z = 3, the TRM of Example 5-1
    (n = 0.030), Q = 0.80 m3/s (28.2 ft3/s). "From Chart 14A d/B = 0.38", d = 0.34 m (1.1 ft), and in the straight
    reach tau_d = gamma d S = 33.4 Pa (0.69 lb/ft2). The chart is read to two figures: the exact normal depth
    (d/B = 0.383) gives 33.8 Pa. The example's bend (Kb = 1.6 from Chart 21, a function of Rc/B) uses another form
    of Kb than the program's (Rc/T, HEC-15 Section 3.4), so it is not compared."""
    mat = trm(tmp_path)
    si = check_lining(hy.Trapezoid(bottom_width=0.90, side_slope=3.0), 0.80, 0.01, mat)
    assert si.depth / 0.90 == pytest.approx(0.38, abs=0.005)
    assert si.depth == pytest.approx(0.34, abs=0.005)
    assert si.bed_shear == pytest.approx(33.4, abs=0.5)
    us = check_lining(hy.Trapezoid(bottom_width=3.0 * FOOT, side_slope=3.0), 28.2 * FOOT ** 3, 0.01, mat)
    d = us.to_dict(US)
    assert us.depth / FOOT == pytest.approx(1.1, abs=0.05)
    assert d["bed_shear"] == pytest.approx(0.69, abs=0.015)
    assert d["bed_shear"] == pytest.approx(us.bed_shear / PSF)
    assert d["permissible_shear"] == pytest.approx(100.0 / PSF)


def test_rolled_product_note_and_class_caution(tmp_path):
    ok = check_lining(hy.Trapezoid(bottom_width=0.9, side_slope=3.0), 0.8, 0.01, trm(tmp_path, n=0.030))
    assert not any("Table 2.1" in w for w in ok.warnings)
    note = next(n for n in ok.notes if "data-sheet values" in n)
    assert "HEC-22 (2009) Section 5.3.2" in note and "not built into this program" in note
    odd = check_lining(hy.Trapezoid(bottom_width=0.9, side_slope=3.0), 0.8, 0.01, trm(tmp_path, n=0.050))
    assert any("0.05 is outside 0.024 to 0.036" in w for w in odd.warnings)


# ------------------------------------------------------------------ gabion mattresses

def test_gabion_n_is_the_stone_n_of_its_fill(tmp_path):
    """HEC-15 Section 7.1: n from the D50 of the basket rock by the Section 6.1 relations: the same n as loose
    stone of that D50 in the same channel, and Blodgett's Eq. 6.1 at the average depth where da/D50 >= 1.5."""
    cat, _ = user_catalogue(tmp_path, GABION.format(d50=0.10, t=0.23, tau=200.0))
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    box = check_lining(section, 2.0, 0.05, cat.get("gabion_mattress_user"))
    loose = check_lining(section, 2.0, 0.05, cat.get("riprap"), d50=0.10)
    assert box.manning_n == pytest.approx(loose.manning_n, rel=1e-12) and box.depth == pytest.approx(loose.depth)
    g = section.properties(box.depth)
    da = float(g.area / g.top_width)
    assert da / 0.10 >= 1.5 and box.n_relation == "blodgett"
    assert box.manning_n == pytest.approx(hec15.blodgett_n(da, 0.10), rel=1e-9)
    assert "HEC-15 Section 7.1" in box.n_source


def test_gabion_check_si_and_customary(tmp_path):
    """The mattress holds where the designer's permissible shear / design shear >= SF, on the bed and on the side
    slopes (K1 tau_d); its layer is the mattress (thickness x lined width)."""
    box = gabion(tmp_path, d50=0.10, t=0.23, tau=200.0)
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    r = check_lining(section, 1.0, 0.05, box)
    assert r.category == "gabion" and r.permissible_shear == 200.0
    bed = next(c for c in r.checks if c.location == "bed")
    side = next(c for c in r.checks if c.location == "side slopes")
    assert bed.design_shear == pytest.approx(hy.constants.GAMMA_WATER * r.depth * 0.05)
    assert side.design_shear == pytest.approx(hec15.side_slope_factor(3.0) * bed.design_shear)
    assert side.permissible_shear == bed.permissible_shear == 200.0
    assert r.safety_factor == pytest.approx(200.0 / bed.design_shear) and r.stable == (r.safety_factor >= 1.0)
    assert r.layer_thickness == 0.23 and r.layer_volume == pytest.approx(0.23 * r.lined_width)
    assert r.reynolds is None and r.required_d50 is None and r.d50 is None
    note = next(n for n in r.notes if n.startswith("gabion mattress"))
    assert "230 mm" in note and "100 mm" in note and "HEC-15 Section 7.2" in note
    d = r.to_dict(US)
    assert d["permissible_shear"] == pytest.approx(200.0 / PSF) and d["layer_thickness"] == pytest.approx(0.23 / FOOT)
    assert "lb/ft^2" in r.reason(US) and "Pa" in r.reason()
    assert "9.06 in" in " ".join(d["notes"])          # 230 mm in inches


def test_gabion_fill_and_thickness_checks():
    """Fill against thickness: the D50 must fit, at most 2/3 of the thickness is the usual largest stone (common
    practice); mattresses are 0.5 to 1.5 ft thick (Freeman and Fischenich, 2000, ERDC TN-EMRRP-SR-22, p. 1)."""
    assert hec15.MATTRESS_THICKNESS_RANGE == pytest.approx((0.5 * FOOT, 1.5 * FOOT))
    with warnings.catch_warnings():
        warnings.simplefilter("error", ValidityWarning)
        assert hec15.gabion_fill_check(0.10, 0.23) == pytest.approx(0.10 / 0.23)
        hec15.gabion_fill_check(0.05, 0.5 * FOOT)          # both ends of the usual range are inside
        hec15.gabion_fill_check(0.20, 1.5 * FOOT)
    with pytest.warns(ValidityWarning, match="usual thickness of a gabion mattress"):
        hec15.gabion_fill_check(0.05, 0.14)
    with pytest.warns(ValidityWarning, match="usual thickness of a gabion mattress"):
        hec15.gabion_fill_check(0.20, 0.50)
    with pytest.warns(ValidityWarning, match="more than two thirds"):
        hec15.gabion_fill_check(0.16, 0.23)
    with pytest.raises(InputError) as e:
        hec15.gabion_fill_check(0.23, 0.23)
    assert e.value.field == "rock_d50" and "0.23" in str(e.value)


def test_gabion_cautions_reach_the_result(tmp_path):
    r = check_lining(hy.Trapezoid(bottom_width=1.0, side_slope=3.0), 1.0, 0.05, gabion(tmp_path, d50=0.17, t=0.23))
    assert any("more than two thirds" in w for w in r.warnings)
    with pytest.raises(InputError) as e:
        check_lining(hy.Trapezoid(bottom_width=1.0, side_slope=3.0), 1.0, 0.05, gabion(tmp_path, d50=0.3, t=0.23))
    assert e.value.field == "rock_d50"


def test_gabion_takes_its_fill_from_the_entry(tmp_path):
    box = gabion(tmp_path)
    with pytest.raises(InputError) as e:
        check_lining(hy.Trapezoid(bottom_width=1.0, side_slope=3.0), 1.0, 0.05, box, d50=0.15)
    assert e.value.field == "d50" and "stone.d50" in str(e.value)
    with pytest.raises(InputError) as e:
        shear_checks(box, 0.3, 0.05, d50=0.15)
    assert e.value.field == "d50"


@pytest.mark.parametrize("text, field", [
    ("", "stone.d50"),
    ('[lining.stone]\nd50 = 0.1\n', "thickness.value"),
    ('[lining.stone]\nd50 = 0.1\n[lining.thickness]\nvalue = 0.23\n', "permissible.shear"),
])
def test_the_gabion_template_asks_for_its_values(tmp_path, text, field):
    cat, _ = user_catalogue(tmp_path, '[[lining]]\nkey = "gabion_mattress_user"\n' + text)
    with pytest.raises(InputError) as e:
        check_lining(hy.Trapezoid(bottom_width=1.0, side_slope=3.0), 1.0, 0.05, cat.get("gabion_mattress_user"))
    assert field in e.value.field


def test_gabion_shear_checks_on_arrays_match_one_by_one(tmp_path):
    box = gabion(tmp_path)
    depth, slope = np.array([0.2, 0.3, 0.4]), np.array([0.02, 0.05, 0.1])
    sc = shear_checks(box, depth, slope, left_slope=3.0, right_slope=2.0)
    assert sc.method == "gabion" and np.all(sc.permissible_shear == 200.0)
    assert [c.location[0] for c in sc.checks] == ["bed", "left side slope", "right side slope"]
    for i in range(3):
        one = shear_checks(box, float(depth[i]), float(slope[i]), left_slope=3.0, right_slope=2.0)
        assert float(one.safety_factor[0]) == pytest.approx(sc.safety_factor[i])
    # K1 < 1 on both sides (Z = 3 and 2), so the bed governs: tau_p / (gamma d S)
    assert sc.checks[1].design_shear == pytest.approx(hec15.side_slope_factor(3.0) * sc.design_shear)
    assert sc.checks[2].permissible_shear == pytest.approx(sc.permissible_shear)
    assert sc.safety_factor == pytest.approx(200.0 / (hy.constants.GAMMA_WATER * depth * slope))


def test_gabion_screening_on_arrays_agrees_with_the_check(tmp_path):
    box = gabion(tmp_path)
    section = hy.Trapezoid(bottom_width=1.0, side_slope=3.0)
    q, s = np.array([0.5, 1.0, 2.0]), np.array([0.02, 0.05, 0.12])
    screen = screen_lining(section, q, s, box)
    for i in range(3):
        r = check_lining(section, float(q[i]), float(s[i]), box)
        assert screen.checked[i] and bool(screen.stable[i]) == r.stable
        assert screen.safety_factor[i] == pytest.approx(r.safety_factor)
        assert screen.layer_volume[i] == pytest.approx(r.layer_volume)


@pytest.mark.parametrize("change, field", [
    (lambda e: e["permissible"].__setitem__("method", "value"), "permissible.method"),
    (lambda e: e["thickness"].__setitem__("rule", "none"), "thickness.rule"),
    (lambda e: e.__setitem__("category", "stone"), "permissible.method"),
    (lambda e: e["roughness"].__setitem__("product_class", "erosion_control_blanket"), "roughness.product_class"),
])
def test_catalogue_refuses_a_malformed_gabion(change, field):
    raw = read_catalogue_file(shipped_catalogue_path())
    entry = next(e for e in raw["lining"] if e["key"] == "gabion_mattress_user")
    change(entry)
    with pytest.raises(CatalogueError) as e:
        parse_catalogue(raw)
    assert field in e.value.field


def test_catalogue_refuses_an_unknown_product_class():
    raw = read_catalogue_file(shipped_catalogue_path())
    entry = next(e for e in raw["lining"] if e["key"] == "trm_user")
    entry["roughness"]["product_class"] = "jute_net"
    with pytest.raises(CatalogueError) as e:
        parse_catalogue(raw)
    assert "roughness.product_class" in e.value.field


def test_calc_command_checks_a_gabion_in_us_units(tmp_path, capsys):
    _, path = user_catalogue(tmp_path, GABION.format(d50=0.10, t=0.23, tau=200.0))
    argv = ["calc", "--units", "us", "--flow", "20", "--slope", "0.05", "--bottom-width", "3", "--side-slope", "3",
            "--lining", "gabion_mattress_user", "--user-catalogue", str(path), "--json"]
    assert main(argv) == 0
    out = json.loads(capsys.readouterr().out)
    st = out["stability"]
    assert out["lining"]["key"] == "gabion_mattress_user"
    assert st["permissible_shear"] == pytest.approx(200.0 / PSF)
    assert st["layer_thickness"] == pytest.approx(0.23 / FOOT)
    section = hy.Trapezoid(bottom_width=3 * FOOT, side_slope=3.0)
    r = check_lining(section, 20 * FOOT ** 3, 0.05, load_catalogue(user_path=path).get("gabion_mattress_user"))
    assert st["bed_shear"] == pytest.approx(r.bed_shear / PSF) and st["stable"] == r.stable
    assert any("HEC-15 Section 7.1" in n for n in st["notes"])
