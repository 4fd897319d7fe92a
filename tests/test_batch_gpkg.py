"""`ditchwright batch` with GeoPackage inventories and results (app.inventory.layers): a layer of lines gives the
results the same rows give as CSV; geometry, coordinate system and attributes come through; lengths are measured on
projected lines; a layer in degrees, one without lines and one with a column missing are refused in one line. The
reaches are invented (tests/test_batch_streaming.py's generator) and drawn as invented lines."""

import csv
import io
import math

import numpy as np
import pyarrow as pa
import pyogrio
import pytest
import shapely
from matplotlib import rc_context

from app import inventory as ai
from app.inventory import plots
from app.main import main
from test_batch_streaming import HEADER, mixed_rows, write_csv
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

UTM = "EPSG:32633"          # projected, metres
STATE_PLANE_FT = "EPSG:2227"  # projected, US survey feet
#: The US survey foot, 1200/3937 m: the definition in the EPSG dataset's unit 9003 (common practice).
US_SURVEY_FOOT = 1200 / 3937
NUMBERS = [c for c in ai.INPUT_COLUMNS if c not in ("id", "shape", "lining")]


def invented_lines(size, seed=5):
    """One invented line a reach: two or three vertices some 50 to 300 units long, around (500000, 5000000)."""
    rng = np.random.default_rng(seed)
    out = []
    for i in range(size):
        x, y = 500_000 + 400 * (i % 40), 5_000_000 + 400 * (i // 40)
        dx, dy = rng.uniform(50, 200, 2)
        points = [(x, y), (x + dx, y + dy)] + ([(x + dx + 30, y + dy - 40)] if i % 3 == 0 else [])
        out.append(shapely.LineString(points))
    return out


def write_layer(path, rows, lines, crs=UTM, layer="reaches", columns=None, typed=False, geometry_type="LineString",
                append=False):
    """A GeoPackage layer of ``rows`` (text columns as written, or with ``typed`` the number columns as float64,
    a text that is no number left blank) drawn as ``lines``."""
    columns = columns if columns is not None else HEADER
    data = {}
    for c in columns:
        texts = [r.get(c, "") for r in rows]
        if typed and c in NUMBERS:
            data[c] = pa.array([_number(t) for t in texts], type=pa.float64())
        else:
            data[c] = pa.array(texts, type=pa.string())
    data["geom"] = pa.array(shapely.to_wkb(np.array(lines, dtype=object)))
    pyogrio.write_arrow(pa.table(data), path, layer=layer, driver="GPKG", geometry_name="geom",
                        geometry_type=geometry_type, crs=crs, append=append)


def _number(text):
    try:
        value = float(text)
    except ValueError:
        return None
    return value if math.isfinite(value) else None


def typed_rows(rows):
    """``rows`` as a typed layer holds them: a number column's text that is no number becomes blank."""
    return [{c: (v if c not in NUMBERS or _number(v) is not None else "") for c, v in r.items()} for r in rows]


def results(path):
    """The rows of a results CSV file as dicts."""
    return list(csv.DictReader(io.StringIO(path.read_text(encoding="utf-8"), newline="")))


def layer_table(path, layer=None):
    meta, table = pyogrio.read_arrow(path, layer=layer)
    return meta, table


# ----------------------------------------------------------------------------- the same results as CSV

@pytest.mark.parametrize("typed", [False, True], ids=["text columns", "number columns"])
@pytest.mark.parametrize("rows_a_block", [7, 100_000])
def test_a_layer_gives_the_results_of_the_same_rows_as_csv(tmp_path, typed, rows_a_block):
    rows = mixed_rows(60)
    if typed:
        rows = typed_rows(rows)
    write_csv(tmp_path / "inv.csv", rows)
    write_layer(tmp_path / "inv.gpkg", rows, invented_lines(len(rows)), typed=typed)
    tally_csv = ai.check_file(tmp_path / "inv.csv", tmp_path / "from-csv.csv", rows=rows_a_block, catalogue=SHIPPED)
    tally_gpkg = ai.check_file(tmp_path / "inv.gpkg", tmp_path / "from-gpkg.csv", rows=rows_a_block, catalogue=SHIPPED)
    assert tally_gpkg.counts() == tally_csv.counts()
    assert tally_csv.counts()["invalid"] >= 2 and tally_csv.counts()["stable"] >= 1
    a, b = results(tmp_path / "from-csv.csv"), results(tmp_path / "from-gpkg.csv")
    assert len(a) == len(b) == len(rows)
    for x, y in zip(a, b):
        for column in ("id", "road", *ai.RESULT_COLUMNS):
            assert x[column] == y[column], (column, x, y)
    # A problem row is named by its feature id (1, 2, ... in the layer's order) where the CSV names its line.
    assert [p[0] for p in tally_gpkg.problems] == [p[0] - 1 for p in tally_csv.problems]
    # The results layer holds the same numbers, unrounded, as numbers.
    ai.check_file(tmp_path / "inv.gpkg", tmp_path / "out.gpkg", rows=rows_a_block, catalogue=SHIPPED)
    _, table = layer_table(tmp_path / "out.gpkg")
    for column in ai.RESULT_COLUMNS:
        values = table.column(column).to_pylist()
        for text, value in zip((r[column] for r in a), values):
            if column in ("verdict", "reason"):
                assert value == text
            elif text == "":
                assert value is None
            else:
                assert f"{value:.5g}" == f"{float(text):.5g}", (column, text, value)


def test_geometry_coordinate_system_and_attributes_come_through_unchanged(tmp_path):
    rows = typed_rows(mixed_rows(40)[:30])
    lines = [shapely.MultiLineString([g]) for g in invented_lines(len(rows))]
    lines[4] = shapely.MultiLineString([[(0, 0), (30, 40)], [(100, 0), (100, 60)]])   # 50 + 60 m
    write_layer(tmp_path / "inv.gpkg", rows, lines, typed=True, geometry_type="MultiLineString")
    before_bytes = (tmp_path / "inv.gpkg").read_bytes()
    assert main(["batch", str(tmp_path / "inv.gpkg"), "-o", str(tmp_path / "out.gpkg"), "--units", "si",
                 "--no-progress"]) == 1   # the invented rows include invalid ones on purpose
    assert (tmp_path / "inv.gpkg").read_bytes() == before_bytes    # an inventory is only read
    info_in, info_out = pyogrio.read_info(tmp_path / "inv.gpkg"), pyogrio.read_info(tmp_path / "out.gpkg")
    assert info_out["crs"] == info_in["crs"] == UTM
    assert info_out["geometry_type"] == "MultiLineString"
    assert info_out["layer_name"] == "reaches"
    meta_in, before = layer_table(tmp_path / "inv.gpkg")
    meta_out, after = layer_table(tmp_path / "out.gpkg")
    geometry = meta_out["geometry_name"]
    assert after.column(geometry).to_pylist() == before.column(meta_in["geometry_name"]).to_pylist()
    assert after.column_names == [*HEADER, "length", *ai.RESULT_COLUMNS, geometry]
    for column in HEADER:
        assert after.column(column).type == before.column(column).type
        assert after.column(column).to_pylist() == before.column(column).to_pylist()
    lengths = after.column("length").to_pylist()
    assert lengths[4] == pytest.approx(110.0, abs=1e-3)
    assert lengths == pytest.approx([round(g.length, 3) for g in lines], abs=1e-9)


def test_lengths_are_measured_in_the_layer_unit_and_given_in_the_inventory_units(tmp_path):
    rows = typed_rows(mixed_rows(40)[:4])
    # 1000 US survey feet along x, in a state plane system whose unit is the US survey foot.
    lines = [shapely.LineString([(6_000_000, 2_000_000), (6_001_000, 2_000_000)])] * len(rows)
    write_layer(tmp_path / "ft.gpkg", rows, lines, crs=STATE_PLANE_FT, typed=True)
    for units, expected in (("si", 1000 * US_SURVEY_FOOT), ("us", 1000 * US_SURVEY_FOOT / 0.3048)):
        target = tmp_path / f"out-{units}.csv"
        ai.check_file(tmp_path / "ft.gpkg", target, units, catalogue=SHIPPED)
        assert [float(r["length"]) for r in results(target)] == pytest.approx([expected] * len(rows), abs=6e-4)


def test_a_length_column_of_the_layer_is_kept_and_a_layer_in_degrees_is_then_read(tmp_path):
    rows = [dict(r, length="123.5") for r in typed_rows(mixed_rows(40)[:8])]
    lines = [shapely.LineString([(15.0, 48.0), (15.001, 48.001)])] * len(rows)
    write_layer(tmp_path / "geo.gpkg", rows, lines, crs="EPSG:4326", columns=HEADER + ["length"], typed=True)
    ai.check_file(tmp_path / "geo.gpkg", tmp_path / "out.csv", catalogue=SHIPPED)
    assert {r["length"] for r in results(tmp_path / "out.csv")} == {"123.5"}


# ----------------------------------------------------------------------------- CSV and GeoPackage mixed

def test_csv_in_geopackage_out_and_back(tmp_path):
    rows = mixed_rows(40)
    write_csv(tmp_path / "inv.csv", rows)
    assert main(["batch", str(tmp_path / "inv.csv"), "-o", str(tmp_path / "out.gpkg"), "--no-progress"]) == 1
    ai.check_file(tmp_path / "inv.csv", tmp_path / "out.csv", catalogue=SHIPPED)
    info = pyogrio.read_info(tmp_path / "out.gpkg")
    assert info["layer_name"] == "inv" and info["geometry_type"] is None
    _, table = layer_table(tmp_path / "out.gpkg")
    expected = results(tmp_path / "out.csv")
    assert table.column("id").to_pylist() == [r["id"] for r in rows]
    assert table.column("verdict").to_pylist() == [r["verdict"] for r in expected]
    assert table.column("road").to_pylist() == [r["road"] for r in rows]   # as written: no apostrophe in a layer
    # And back: the layer (with geometry) read, the results written as CSV.
    write_layer(tmp_path / "inv.gpkg", rows, invented_lines(len(rows)))
    assert main(["batch", str(tmp_path / "inv.gpkg"), "-o", str(tmp_path / "back.csv"), "--no-progress"]) == 1
    back = results(tmp_path / "back.csv")
    assert [r["reason"] for r in back] == [r["reason"] for r in expected]
    assert back[23]["road"] == "'=SUM(A1)"   # a results CSV guards formula-like cells whatever the inventory


# ----------------------------------------------------------------------------- refusals

def refused(tmp_path, capsys, args, *words):
    target = tmp_path / "out.gpkg"
    assert main(["batch", *map(str, args), "-o", str(target), "--no-progress"]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and "Traceback" not in err, err
    for word in words:
        assert word in err, err
    assert not target.exists()
    return err


def test_a_layer_in_degrees_without_lengths_is_refused(tmp_path, capsys):
    rows = typed_rows(mixed_rows(40)[:5])
    write_layer(tmp_path / "geo.gpkg", rows, [shapely.LineString([(15, 48), (15.01, 48.01)])] * 5, crs="EPSG:4326")
    refused(tmp_path, capsys, [tmp_path / "geo.gpkg"], "degrees", "EPSG:4326", "'length'", "reproject")


def test_a_layer_without_lines_is_refused(tmp_path, capsys):
    rows = typed_rows(mixed_rows(40)[:5])
    write_layer(tmp_path / "points.gpkg", rows, [shapely.Point(500_000, 5_000_000)] * 5, geometry_type="Point")
    refused(tmp_path, capsys, [tmp_path / "points.gpkg"], "Point", "not lines")
    pyogrio.write_arrow(pa.table({c: pa.array([""], type=pa.string()) for c in HEADER}), tmp_path / "table.gpkg",
                        layer="plain", driver="GPKG")
    refused(tmp_path, capsys, [tmp_path / "table.gpkg"], "no geometry", "not lines")


@pytest.mark.parametrize("drop", ["flow", "shape"])
def test_a_missing_attribute_is_refused(tmp_path, capsys, drop):
    rows = typed_rows(mixed_rows(40)[:5])
    write_layer(tmp_path / "inv.gpkg", rows, invented_lines(5), columns=[c for c in HEADER if c != drop])
    refused(tmp_path, capsys, [tmp_path / "inv.gpkg"], f"missing column {drop}")


def test_layers_are_chosen_by_name(tmp_path, capsys):
    rows = typed_rows(mixed_rows(40)[:6])
    write_layer(tmp_path / "two.gpkg", rows, invented_lines(6), layer="north")
    write_layer(tmp_path / "two.gpkg", rows[:3], invented_lines(3), layer="south", append=True)
    refused(tmp_path, capsys, [tmp_path / "two.gpkg"], "2 layers", "'north'", "'south'", "--layer")
    refused(tmp_path, capsys, [tmp_path / "two.gpkg", "--layer", "east"], "no layer 'east'")
    write_csv(tmp_path / "inv.csv", rows)
    refused(tmp_path, capsys, [tmp_path / "inv.csv", "--layer", "north"], "CSV inventory has no layers")
    assert main(["batch", str(tmp_path / "two.gpkg"), "--layer", "south", "-o", str(tmp_path / "s.gpkg"),
                 "--no-progress"]) in (0, 1)
    assert pyogrio.read_info(tmp_path / "s.gpkg", layer="south")["features"] == 3


def test_a_refused_inventory_leaves_the_old_results_layer(tmp_path, capsys):
    rows = typed_rows(mixed_rows(40)[:5])
    write_layer(tmp_path / "inv.gpkg", rows, invented_lines(5))
    ai.check_file(tmp_path / "inv.gpkg", tmp_path / "out.gpkg", catalogue=SHIPPED)
    before = (tmp_path / "out.gpkg").read_bytes()
    write_layer(tmp_path / "bad.gpkg", rows, invented_lines(5), columns=[c for c in HEADER if c != "slope"])
    assert main(["batch", str(tmp_path / "bad.gpkg"), "-o", str(tmp_path / "out.gpkg"), "--no-progress"]) == 2
    assert (tmp_path / "out.gpkg").read_bytes() == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["bad.gpkg", "inv.gpkg", "out.gpkg"]


def test_not_a_geopackage_is_refused(tmp_path, capsys):
    (tmp_path / "junk.gpkg").write_bytes(b"not a database at all\n" * 10)
    refused(tmp_path, capsys, [tmp_path / "junk.gpkg"], "junk.gpkg")


# ----------------------------------------------------------------------------- the map

def test_the_map_is_saved_beside_the_summary_plot(tmp_path, capsys):
    rows = typed_rows(mixed_rows(40))
    write_layer(tmp_path / "inv.gpkg", rows, invented_lines(len(rows)))
    assert main(["batch", str(tmp_path / "inv.gpkg"), "-o", str(tmp_path / "out.csv"), "--plot",
                 str(tmp_path / "summary.png"), "--no-progress"]) == 1
    for name in ("summary.png", "summary-map.png"):
        assert (tmp_path / name).read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    out, err = capsys.readouterr()
    assert "map: " in out and "(feature " in out
    assert f"{tmp_path / 'inv.gpkg'}: feature 6 (id 'M5'): invalid: flow" in err   # named by its feature id
    write_csv(tmp_path / "inv.csv", rows)
    main(["batch", str(tmp_path / "inv.csv"), "-o", str(tmp_path / "c.csv"), "--plot", str(tmp_path / "c.png"),
          "--no-progress"])
    assert (tmp_path / "c.png").exists() and not (tmp_path / "c-map.png").exists()


def test_the_map_legend_says_each_verdict_in_words_with_its_reaches_and_length(tmp_path):
    rows = typed_rows(mixed_rows(40))
    lines = [shapely.LineString([(500_000 + 300 * i, 5_000_000), (500_000 + 300 * i + 100, 5_000_000)])
             for i in range(len(rows))]   # 100 m each
    write_layer(tmp_path / "inv.gpkg", rows, lines)
    tally = ai.check_file(tmp_path / "inv.gpkg", tmp_path / "out.csv", "si", rows=7, catalogue=SHIPPED)
    with rc_context({"svg.fonttype": "none"}):
        plots.plot_map(tally.lines, tally.counts(), tmp_path / "map.svg")
    svg = (tmp_path / "map.svg").read_text(encoding="utf-8")
    counts = tally.counts()
    assert counts["unstable"] and counts["invalid"]
    assert f"Not stable: {counts['unstable']:,} reach" in svg
    assert f"Invalid input: {counts['invalid']:,} reaches, {100 * counts['invalid']:,} m" in svg
    assert "Stable: " in svg and "Hydraulics only: " in svg and "hydraulics-only" not in svg   # words, not tokens
    kept = sum(len(v) for v in tally.lines.verdicts)
    assert kept == len(rows)


def test_a_layer_is_read_in_blocks_with_progress_by_features(tmp_path):
    rows = typed_rows(mixed_rows(40))
    write_layer(tmp_path / "inv.gpkg", rows, invented_lines(len(rows)))
    blocks = list(ai.read_layer_blocks(tmp_path / "inv.gpkg", "us", rows=15))
    assert [len(b) for b in blocks] == [15, 15, 10]
    assert [b.end for b in blocks] == [15, 30, 40]
    assert [b.features.num_rows for b in blocks] == [15, 15, 10]
    assert np.concatenate([b.lines for b in blocks]).tolist() == list(range(1, 41))   # feature ids
    seen = []
    ai.check_file(tmp_path / "inv.gpkg", tmp_path / "out.gpkg", rows=15, progress=lambda d, t: seen.append((d, t)),
                  catalogue=SHIPPED)
    assert seen == [(15, 40), (30, 40), (40, 40)]


def test_damaged_geopackages_are_read_or_refused_in_one_line(tmp_path, capsys):
    """A fixed budget of damaged copies of a good layer (truncated, or bytes overwritten at random places): each is
    checked or refused with exit status 2 and one line, never a traceback. A damaged geometry gets no length."""
    import random
    import warnings

    rows = typed_rows(mixed_rows(40))
    write_layer(tmp_path / "good.gpkg", rows, invented_lines(len(rows)))
    good = (tmp_path / "good.gpkg").read_bytes()
    rng = random.Random(17)
    outcomes = set()
    for k in range(60):
        data = bytearray(good)
        if k % 3 == 0:
            data = data[:rng.randrange(len(data))]
        else:
            for _ in range(rng.randint(1, 20)):
                data[rng.randrange(len(data))] = rng.randrange(256)
        (tmp_path / "damaged.gpkg").write_bytes(bytes(data))
        with warnings.catch_warnings():   # GDAL's notes about what it finds in a damaged file
            warnings.simplefilter("ignore")
            status = main(["batch", str(tmp_path / "damaged.gpkg"), "-o", str(tmp_path / "out.gpkg"),
                           "--no-progress"])
        err = capsys.readouterr().err
        assert status in (0, 1, 2) and "Traceback" not in err
        if status == 2:
            assert len(err.strip().splitlines()) == 1, err
        outcomes.add(status)
    assert 2 in outcomes and 1 in outcomes   # some copies are refused, some still read
