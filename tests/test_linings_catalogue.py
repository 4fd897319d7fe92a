"""The shipped lining catalogue: schema, sources, user overrides, and n against published tables.

Rigid-lining n values are cross-checked against the Manning's n tables of the
`fluids` library (fluids.open_flow.n_lined_built, transcribed from Chow, V. T.,
Open-Channel Hydraulics, McGraw-Hill, 1959, Table 5-6; minimum, normal, maximum).
"""

import copy
import hashlib
import tomllib

import pytest
from fluids.open_flow import n_lined_built

import hydraulics as hy
from hydraulics.errors import InputError
from hydraulics.linings import (Catalogue, CatalogueError, StoneRoughness, VegetationRoughness,
                                dumps_user_catalogue, load_catalogue, parse_catalogue, read_catalogue_file,
                                shipped_catalogue_path)


@pytest.fixture(scope="module")
def shipped():
    return load_catalogue()


@pytest.fixture()
def raw():
    return read_catalogue_file(shipped_catalogue_path())


# ------------------------------------------------------------------ shipped content

def test_shipped_catalogue_loads_with_required_keys(shipped):
    for key in ("concrete", "riprap", "gravel", "concrete_trowel", "concrete_float", "concrete_unfinished",
                "asphalt", "grouted_riprap", "blanket_user", "trm_user", "open_weave_user", "soil_noncohesive",
                "soil_cohesive", "gabion_mattress_user"):
        assert key in shipped
    assert shipped.schema_version == 1 and shipped.catalogue_version
    cats = {lin.category for lin in shipped}
    assert cats == {"rigid", "stone", "vegetation", "manufactured", "soil", "gabion"}
    assert len(shipped.by_category("vegetation")) >= 3


def test_no_price_is_shipped(shipped):
    # unit costs are the user's own; the shipped file never sets one
    assert all(lin.unit_cost is None for lin in shipped)


def test_user_data_entries_name_no_product_and_carry_no_values(shipped):
    for key in ("blanket_user", "trm_user", "open_weave_user"):
        lin = shipped.get(key)
        assert lin.user_data and "user data" in lin.name.lower()
        assert "n" not in lin.roughness_data and "shear" not in lin.permissible_data
        with pytest.raises(InputError) as e:
            lin.roughness()
        assert "roughness.n" in e.value.field and "data sheet" in str(e.value)


def test_every_number_in_the_shipped_file_has_a_source(raw):
    # independent of the validator: walk the parsed TOML
    for entry in raw["lining"]:
        for name, table in entry.items():
            if not isinstance(table, dict):
                continue
            for k, v in table.items():
                if isinstance(v, (int, float)) and not isinstance(v, bool):
                    assert isinstance(table.get(f"{k}_source"), str) or isinstance(table.get("source"), str), \
                        f"{entry['key']}.{name}.{k} has no source"


@pytest.mark.parametrize("key, chow_row", [
    ("concrete_trowel", ("Concrete", "Trowel finish")),
    ("concrete_float", ("Concrete", "Float finish")),
    ("concrete", ("Concrete", "Float finish")),
    ("concrete_unfinished", ("Concrete", "Unfinished")),
    ("grouted_riprap", ("Masonry", "Cemented rubble")),
])
def test_rigid_n_matches_chow_table_in_fluids(shipped, key, chow_row):
    lo, normal, hi = n_lined_built[chow_row[0]][chow_row[1]]
    r = shipped.get(key).roughness_data
    assert (r["n_min"], r["n"], r["n_max"]) == pytest.approx((lo, normal, hi), abs=1e-12)


def test_asphalt_n_matches_chow_table_in_fluids(shipped):
    # Chow (1959) Table 5-6 via fluids: asphalt smooth 0.013, rough 0.016
    r = shipped.get("asphalt").roughness_data
    assert r["n"] == pytest.approx(n_lined_built["Asphalt"]["Rough"][1])
    assert r["n_min"] == pytest.approx(n_lined_built["Asphalt"]["Smooth"][1])


def test_roughness_objects(shipped):
    assert isinstance(shipped.get("concrete").roughness(), float)
    stone = shipped.get("riprap").roughness(d50=0.3)
    assert isinstance(stone, StoneRoughness) and stone.d50 == 0.3
    assert isinstance(shipped.get("grass_good_sod").roughness(), VegetationRoughness)
    assert shipped.get("soil_fine_noncohesive").roughness() == pytest.approx(0.016)
    with pytest.raises(InputError) as e:
        shipped.get("concrete").roughness(d50=0.1)
    assert e.value.field == "d50"


def test_unknown_key_lists_the_known_ones(shipped):
    with pytest.raises(InputError) as e:
        shipped.get("granite")
    assert e.value.field == "lining" and "riprap" in str(e.value)


def test_layer_thickness(shipped):
    assert shipped.get("riprap").layer_thickness(0.2) == pytest.approx(0.3)
    assert shipped.get("concrete").layer_thickness() == pytest.approx(0.10)
    assert shipped.get("grass_good_sod").layer_thickness() is None


def test_permissible_helpers(shipped):
    # HEC-15 Table 4.5 (not verified): sod, good stand CF = 0.90; fine non-cohesive soil 1.0 N/m^2
    g = shipped.get("grass_good_sod")
    assert g.cover_factor() == 0.90
    assert g.soil_permissible_shear() == 1.0
    assert g.soil_grain_n() == 0.016


# ------------------------------------------------------------------ schema errors

def _bad(raw, key, mutate):
    data = copy.deepcopy(raw)
    entry = next(e for e in data["lining"] if e["key"] == key)
    mutate(entry)
    return data


@pytest.mark.parametrize("key, mutate, field_part, words", [
    ("riprap", lambda e: e["roughness"].__setitem__("model", "magic"), "roughness.model", "one of"),
    ("concrete", lambda e: e["roughness"].pop("source"), "roughness.n", "no source"),
    ("concrete", lambda e: e["roughness"].__setitem__("n", -0.01), "roughness.n", "> 0"),
    ("concrete", lambda e: e["roughness"].__setitem__("n", 0.03), "roughness.n", "n_max"),
    ("riprap", lambda e: e["stone"].__setitem__("specific_weight", 5000.0), "stone.specific_weight", ">"),
    ("riprap", lambda e: e.pop("stone"), "stone", "missing"),
    ("gravel", lambda e: e.__setitem__("category", "rock"), "category", "one of"),
    ("gravel", lambda e: e.__setitem__("colour", "grey"), "colour", "not a known field"),
    ("grass_good_sod", lambda e: e["permissible"].__setitem__("growth_form", "tuft"),
     "permissible.growth_form", "one of"),
    ("concrete", lambda e: e.__setitem__("unit_cost", "cheap"), "unit_cost", "number"),
    ("trm_user", lambda e: e.__setitem__("user_data", False), "roughness.n", "missing"),
])
def test_schema_errors_name_entry_and_field(raw, key, mutate, field_part, words):
    with pytest.raises(CatalogueError) as e:
        parse_catalogue(_bad(raw, key, mutate), "test.toml")
    assert f"lining {key!r}" in e.value.field and field_part in e.value.field
    assert words in str(e.value) and "test.toml" in str(e.value)


def test_schema_version_and_duplicates(raw):
    data = copy.deepcopy(raw)
    data["schema_version"] = 2
    with pytest.raises(CatalogueError) as e:
        parse_catalogue(data)
    assert e.value.field == "schema_version"
    data = copy.deepcopy(raw)
    data["lining"].append(copy.deepcopy(data["lining"][0]))
    with pytest.raises(CatalogueError, match="appears twice"):
        parse_catalogue(data)


def test_bad_toml_names_the_file(tmp_path):
    p = tmp_path / "mine.toml"
    p.write_text("schema_version = = 1\n")
    with pytest.raises(CatalogueError, match="mine.toml"):
        read_catalogue_file(p)


# ------------------------------------------------------------------ user catalogue

def test_user_override_prices_an_entry_and_leaves_the_shipped_file_alone(tmp_path):
    shipped_bytes = shipped_catalogue_path().read_bytes()
    user = tmp_path / "user.toml"
    user.write_text('schema_version = 1\n[[lining]]\nkey = "concrete"\nunit_cost = 95.0\n'
                    '[lining.thickness]\nvalue = 0.15\n')
    cat = load_catalogue(user_path=user)
    c = cat.get("concrete")
    assert c.unit_cost == 95.0 and c.origin == "user override"
    assert c.layer_thickness() == pytest.approx(0.15)
    assert c.roughness() == 0.015  # untouched fields come from the shipped entry
    assert hashlib.sha256(shipped_catalogue_path().read_bytes()).digest() == hashlib.sha256(shipped_bytes).digest()
    assert load_catalogue().get("concrete").unit_cost is None


def test_user_fills_in_a_data_sheet_product(tmp_path):
    user = tmp_path / "user.toml"
    user.write_text('schema_version = 1\n[[lining]]\nkey = "trm_user"\nname = "My mat"\n'
                    '[lining.roughness]\nn = 0.034\nn_source = "user data: data sheet"\n'
                    '[lining.permissible]\nshear = 280.0\nshear_source = "user data: data sheet"\n')
    trm = load_catalogue(user_path=user).get("trm_user")
    assert trm.roughness() == 0.034 and trm.permissible_data["shear"] == 280.0


def test_user_adds_an_entry_and_incomplete_ones_are_refused(tmp_path):
    extra = {"key": "cobble_local", "name": "Local cobble", "category": "stone", "unit_cost_basis": "volume",
             "roughness": {"model": "stone", "source": "HEC-15 Eq. 6.1 and 6.2"},
             "permissible": {"method": "shields", "source": "HEC-15 Eq. 6.7"},
             "stone": {"d50": 0.09, "specific_weight": 26500.0, "angle_of_repose": 40.0,
                       "source": "user data: quarry test report"},
             "thickness": {"rule": "stone", "multiple_of_d50": 1.5, "source": "common practice"}}
    text = dumps_user_catalogue([extra])
    assert tomllib.loads(text)["lining"][0] == extra  # the writer round-trips
    user = tmp_path / "user.toml"
    user.write_text(text)
    cat = load_catalogue(user_path=user)
    assert cat.get("cobble_local").origin == "user" and cat.get("cobble_local").d50 == 0.09
    assert len(cat) == len(load_catalogue()) + 1

    broken = copy.deepcopy(extra)
    del broken["stone"]["source"]
    user.write_text(dumps_user_catalogue([broken]))
    with pytest.raises(CatalogueError) as e:
        load_catalogue(user_path=user)
    assert "cobble_local" in e.value.field and "stone.d50" in e.value.field and "user.toml" in str(e.value)


def test_missing_user_file_is_not_an_error(tmp_path):
    assert len(load_catalogue(user_path=tmp_path / "none.toml")) == len(load_catalogue())


def test_catalogue_is_usable_with_the_solver(shipped):
    # the gravel entry's depth-dependent n goes straight into the core's coupled solve
    y = hy.normal_depth(hy.Trapezoid(bottom_width=0.4, side_slope=3.0), 0.42, 0.008,
                        n=shipped.get("gravel").roughness())
    assert 0.2 < y < 0.5


def test_merged_refuses_a_wrong_schema_version(shipped):
    with pytest.raises(CatalogueError) as e:
        shipped.merged({"schema_version": 3, "lining": []}, "u.toml")
    assert e.value.field == "schema_version" and isinstance(shipped, Catalogue)
