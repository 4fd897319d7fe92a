"""`ditchwright calc --lining ...` and `ditchwright compare`: the JSON contract, tables, and every refusal."""

import json
import re
import subprocess
import sys

import pytest

import hydraulics as hy
from app.main import main
from hydraulics.linings import load_catalogue
from hydraulics.stability import check_lining
from hydraulics.units import FOOT, PSF

# HEC-15 gravel-mulch design example, SI (not verified; see tests/test_stability.py)
GRAVEL_SI = ["calc", "--units", "si", "--flow", "0.42", "--slope", "0.008", "--bottom-width", "0.4",
             "--side-slope", "3"]
US_CHANNEL = ["--flow", "15", "--slope", "0.01", "--bottom-width", "2", "--side-slope", "3"]
STABILITY_KEYS = {"bed_shear", "side_shear", "permissible_shear", "safety_factor", "stable", "freeboard",
                  "total_depth"}


def run_json(capsys, args):
    assert main(args + ["--json"]) == 0
    return json.loads(capsys.readouterr().out)


def call(argv):
    try:
        return main(argv)
    except SystemExit as exc:
        return exc.code


def refused(capsys, argv, *words, status=2):
    assert call(argv) == status
    err = capsys.readouterr().err
    assert "Traceback" not in err and len(err.strip().splitlines()) == 1, err
    for w in words:
        assert w in err, err
    return err


# ------------------------------------------------------------ calc --lining

def test_calc_json_contract_gravel_example(capsys):
    out = run_json(capsys, GRAVEL_SI + ["--lining", "gravel:0.025"])
    assert {"normal_depth", "manning_n", "units", "warnings", "lining", "stability"} <= set(out)
    assert out["lining"]["key"] == "gravel" and out["lining"]["name"] and out["lining"]["n_used"] == out["manning_n"]
    st = out["stability"]
    assert STABILITY_KEYS <= set(st) and "required_d50" in st and "bend_shear" not in st
    assert st["stable"] is False
    assert out["normal_depth"] == pytest.approx(0.35, abs=0.01)   # HEC-15 example (not verified)
    assert st["bed_shear"] == pytest.approx(27.0, abs=1.0)        # HEC-15 example (not verified)
    assert st["permissible_shear"] == pytest.approx(19.0, abs=0.5)  # HEC-15 Table 2.3, 25 mm (not verified)
    assert st["required_d50"] > 0.025


def test_calc_json_us_units_and_bend(capsys):
    out = run_json(capsys, ["calc"] + US_CHANNEL + ["--lining", "riprap:0.5", "--bend-radius", "40"])
    st = out["stability"]
    assert "bend_shear" in st and "required_d50" in st and out["lining"]["d50"] == pytest.approx(0.5)
    # the same channel through the core in SI (1 ft = 0.3048 m exactly)
    core = check_lining(hy.Trapezoid(bottom_width=2 * FOOT, side_slope=3), 15 * FOOT ** 3, 0.01,
                        load_catalogue().get("riprap"), d50=0.5 * FOOT, bend_radius=40 * FOOT)
    assert st["bed_shear"] == pytest.approx(core.bed_shear / PSF, rel=1e-12)
    assert st["bend_shear"] == pytest.approx(core.bend_shear / PSF, rel=1e-12)
    assert st["total_depth"] == pytest.approx(core.total_depth / FOOT, rel=1e-12)
    assert st["required_d50"] == pytest.approx(core.required_d50 / FOOT, rel=1e-9)
    assert "lb/ft^2" in st["reason"]


def test_calc_d50_option_equals_key_colon_form(capsys):
    a = run_json(capsys, ["calc"] + US_CHANNEL + ["--lining", "riprap", "--d50", "0.5"])
    b = run_json(capsys, ["calc"] + US_CHANNEL + ["--lining", "riprap:0.5"])
    assert a["stability"] == b["stability"]


def test_calc_rigid_lining(capsys):
    out = run_json(capsys, ["calc"] + US_CHANNEL + ["--lining", "concrete"])
    st = out["stability"]
    assert st["stable"] is True and st["permissible_shear"] is None and st["verdict"] == "non-erodible"
    assert out["manning_n"] == pytest.approx(0.015)


def test_calc_table_with_lining(capsys):
    assert main(GRAVEL_SI + ["--lining", "gravel:0.025"]) == 0
    text = capsys.readouterr().out
    for words in ("Lining stability", "Gravel mulch", "Permissible shear", "not stable", "Smallest stable D50",
                  "Total ditch depth", "Freeboard rule", "filter"):
        assert words in text


def test_calc_table_writes_stone_sizes_as_the_window_does(capsys):
    """Stone sizes and the layer thickness in mm (SI) or inches (US) to a tenth, as in the window's results panel,
    not in the length unit of depths."""
    assert main(["calc"] + US_CHANNEL + ["--lining", "riprap:0.5"]) == 0
    rows = dict(line.strip().split("  ", 1) for line in capsys.readouterr().out.splitlines()
                if line.strip().startswith(("D50 ", "Layer thickness")))
    assert rows["D50"].strip() == "6.0 in" and rows["Layer thickness"].strip() == "9.0 in"  # 1.5 D50 (HEC-15 6.4)
    assert main(GRAVEL_SI + ["--lining", "gravel:0.025"]) == 0
    si = [line.strip() for line in capsys.readouterr().out.splitlines()]
    assert "D50                         25.0 mm" in si
    assert any(re.fullmatch(r"Smallest stable D50\s+\d+\.\d mm", line) for line in si)


def test_calc_find_bottom_width_with_a_lining(capsys):
    out = run_json(capsys, ["calc", "--units", "si", "--flow", "1.0", "--slope", "0.01", "--side-slope", "3",
                            "--find", "bottom-width", "--max-depth", "0.5", "--lining", "riprap:0.15"])
    assert out["normal_depth"] == pytest.approx(0.5, rel=1e-6) and out["bottom_width"] > 0


def test_calc_user_catalogue_fills_a_mat(capsys, tmp_path):
    user = tmp_path / "mine.toml"
    user.write_text('schema_version = 1\n[[lining]]\nkey = "trm_user"\nunit_cost = 12.0\n[lining.roughness]\n'
                    'n = 0.032\nn_source = "user data"\n[lining.permissible]\nshear = 240.0\n'
                    'shear_source = "user data"\n')
    out = run_json(capsys, GRAVEL_SI + ["--lining", "trm_user", "--user-catalogue", str(user)])
    assert out["manning_n"] == 0.032 and out["stability"]["permissible_shear"] == 240.0
    assert out["stability"]["cost_per_length"] == pytest.approx(12.0 * out["stability"]["lined_width"])


def test_old_calc_without_lining_is_unchanged(capsys):
    out = run_json(capsys, ["calc", "--flow", "20", "--slope", "0.004", "--n", "0.03", "--bottom-width", "2",
                            "--side-slope", "3"])
    assert "lining" not in out and "stability" not in out


# ------------------------------------------------------------ compare

COMPARE = ["compare", "--units", "si", "--flow", "0.8", "--slope", "0.02", "--bottom-width", "0.6", "--side-slope", "3"]


def test_compare_json_is_a_list_of_rows(capsys):
    rows = run_json(capsys, COMPARE + ["--lining", "concrete", "--lining", "riprap:0.2", "--lining", "gravel:0.025",
                                       "--bend-radius", "15"])
    assert isinstance(rows, list) and [r["lining"] for r in rows] == ["concrete", "riprap", "gravel"]
    keys = {"depth", "velocity", "froude", "manning_n", "design_shear", "permissible_shear", "safety_factor",
            "verdict", "lined_width", "layer_volume", "cost_per_length", "governs"}
    assert all(keys <= set(r) for r in rows)
    single = run_json(capsys, ["calc"] + COMPARE[1:] + ["--lining", "riprap:0.2", "--bend-radius", "15"])
    assert rows[1]["depth"] == single["normal_depth"] and rows[1]["safety_factor"] == single["stability"]["safety_factor"]
    assert all(r["cost_per_length"] is None for r in rows)  # no prices set, none invented


def test_compare_table(capsys):
    assert main(COMPARE + ["--lining", "concrete", "--lining", "grass_good_sod"]) == 0
    text = capsys.readouterr().out
    assert "Design shear (Pa)" in text and "non-erodible" in text and "grass_good_sod" in text
    assert "no unit costs set" in text


# ------------------------------------------------------------ refusals (exit 2, one line, no traceback)

@pytest.mark.parametrize("extra, words", [
    (["--lining", "marble"], ["--lining", "unknown lining 'marble'"]),
    (["--lining", "riprap:abc"], ["D50", "'abc'"]),
    (["--lining", "riprap:-1"], ["--lining riprap:-1", "D50 must be > 0"]),
    (["--lining", "riprap:0"], ["--lining"]),
    (["--lining", ":0.3"], ["--lining", "empty"]),
    (["--lining", "concrete:0.3"], ["--d50", "stone linings only"]),
    (["--lining", "concrete", "--d50", "0.3"], ["--d50", "stone linings only"]),
    (["--lining", "riprap:0.5", "--d50", "0.5"], ["D50 once"]),
    (["--lining", "riprap", "--d50", "-0.5"], ["--d50"]),
    (["--lining", "riprap", "--d50", "nan"], ["--d50"]),
    (["--lining", "riprap", "--bend-radius", "0"], ["--bend-radius"]),
    (["--lining", "riprap", "--bend-radius", "-5"], ["--bend-radius"]),
    (["--lining", "riprap:0.5", "--bend-radius", "1"], ["--bend-radius", "half the water-surface width", "ft"]),
    (["--lining", "riprap", "--min-freeboard", "-0.1"], ["--min-freeboard"]),
    (["--lining", "riprap", "--min-freeboard", "inf"], ["--min-freeboard"]),
    (["--lining", "blanket_user"], ["--lining blanket_user", "roughness.n", "--user-catalogue"]),
    (["--lining", "trm_user"], ["--lining trm_user", "roughness.n"]),
    (["--lining", "soil_noncohesive"], ["--lining soil_noncohesive", "soil.d75"]),
    (["--lining", "soil_cohesive"], ["--lining soil_cohesive", "soil.soil_class"]),
    (["--lining", "riprap", "--user-catalogue", "/nonexistent/linings.toml"], ["--user-catalogue", "no such file"]),
    (["--d50", "0.5"], ["--d50 is used with --lining"]),
    (["--bend-radius", "30"], ["--bend-radius is used with --lining"]),
    (["--user-catalogue", "x.toml"], ["--user-catalogue is used with --lining"]),
])
def test_calc_lining_refusals(capsys, extra, words):
    base = ["calc"] + US_CHANNEL + ([] if "--lining" in extra else ["--n", "0.03"])
    refused(capsys, base + extra, *words)


def test_calc_refuses_n_with_a_lining(capsys):
    refused(capsys, ["calc"] + US_CHANNEL + ["--n", "0.03", "--lining", "concrete"], "--n or --lining")


@pytest.mark.parametrize("text, words", [
    ("schema_version = 1\n[[lining]]\nkey = \"concrete\"\nunit_cost = -5.0\n", ["--user-catalogue", "unit_cost"]),
    ("schema_version = 9\n", ["--user-catalogue", "schema_version"]),
    ("this is not toml =\n", ["--user-catalogue", "not valid TOML"]),
])
def test_bad_user_catalogue(capsys, tmp_path, text, words):
    path = tmp_path / "bad.toml"
    path.write_text(text)
    refused(capsys, ["calc"] + US_CHANNEL + ["--lining", "concrete", "--user-catalogue", str(path)], *words)


def test_half_filled_mat_names_the_missing_field(capsys, tmp_path):
    path = tmp_path / "half.toml"
    path.write_text('schema_version = 1\n[[lining]]\nkey = "trm_user"\n[lining.roughness]\nn = 0.03\n'
                    'n_source = "user data"\n')
    refused(capsys, ["calc"] + US_CHANNEL + ["--lining", "trm_user", "--user-catalogue", str(path)],
            "--lining trm_user", "permissible.shear")
    refused(capsys, COMPARE + ["--lining", "trm_user", "--user-catalogue", str(path)], "permissible.shear")


@pytest.mark.parametrize("extra, words", [
    ([], ["--lining is required"]),
    (["--lining", "concrete", "--n", "0.02"], ["leave --n out"]),
    (["--lining", "concrete", "--lining", "marble"], ["unknown lining 'marble'"]),
    (["--lining", "riprap:x"], ["D50"]),
    (["--lining", "gravel:0.02", "--lining", "concrete:0.1"], ["stone linings only"]),
    (["--lining", "blanket_user"], ["--lining blanket_user", "roughness.n"]),
    (["--lining", "concrete", "--bend-radius", "0.5"], ["--bend-radius", "half the water-surface width", " m"]),
    (["--lining", "concrete", "--user-catalogue", "/nonexistent.toml"], ["no such file"]),
])
def test_compare_refusals(capsys, extra, words):
    refused(capsys, COMPARE + extra, *words)


def test_no_solution_exit_3(capsys):
    refused(capsys, ["calc", "--shape", "circle", "--diameter", "1", "--flow", "20", "--slope", "0.004",
                     "--lining", "concrete"], "surcharge", status=3)


def test_real_process_refusal_has_no_traceback():
    cmd = [sys.executable, "-m", "app.main", "compare"] + COMPARE[1:] + ["--lining", "soil_cohesive"]
    bad = subprocess.run(cmd, capture_output=True, text=True)
    assert bad.returncode == 2 and "Traceback" not in bad.stderr and "soil.soil_class" in bad.stderr


@pytest.mark.parametrize("units, height", [("us", "about 3 in tall"), ("si", "about 75 mm tall")])
def test_json_lining_names_quote_sizes_in_the_users_units(capsys, units, height):
    """The lining's name in the JSON of calc and compare quotes its sizes in the units of every other number, as
    the tables do (the catalogue's 75 mm grass is 2.95 in, written to whole units as a rough size)."""
    channel = ["--units", units, "--shape", "trapezoid", "--bottom-width", "2", "--side-slope", "3", "--slope", "0.01",
               "--flow", "5", "--lining", "grass_poor_bunch", "--json"]
    assert main(["calc", *channel]) == 0
    assert json.loads(capsys.readouterr().out)["lining"]["name"] == f"Grass, bunch type, poor stand, {height}"
    assert main(["compare", *channel]) == 0
    (row,) = json.loads(capsys.readouterr().out)
    assert row["name"] == f"Grass, bunch type, poor stand, {height}"
