#!/usr/bin/env bash
# Build the desktop bundle with PyInstaller in the CI environment and use it as a technician would:
# the window offscreen (screenshot), a design sheet, the DXF drawings and inventory checks on the shipped demo
# data: the invented CSV inventory, and the same rows as a GeoPackage layer of invented lines (GeoPackage in and out,
# CSV in and GeoPackage out, GeoPackage in and CSV out, with the summary plot and the map).
# Usage: packaging/check_bundle.sh PYTHON   (the interpreter of an environment with the program installed)
set -euo pipefail
cd "$(dirname "$0")/.."
python="${1:-.venv/bin/python}"
"$python" -m pip install -q "pyinstaller>=6" 2>&1 | grep -v "^WARNING: Location" || true
out="$(mktemp -d)"
trap 'rm -rf "$out"' EXIT
"$python" packaging/build_bundle.py --dist "$out/dist" --work "$out/work" 2>&1 | grep -E "^\+|^bundle|rror" || true
exe="$out/dist/ditchwright/ditchwright"
test -x "$exe" || { echo "bundle: no executable at $exe"; exit 1; }
# The GeoPackage inventory, made with the environment's pyogrio and shapely (not the bundle's): the invented CSV's rows,
# each drawn as an invented 150 m line in UTM zone 33N.
"$python" - "$out/invented-inventory.gpkg" <<'PY'
import sys
import pyarrow as pa, pyarrow.csv as pacsv, pyogrio, shapely
rows = pacsv.read_csv("docs/screenshots/invented-inventory.csv")
lines = [shapely.LineString([(500000 + 200 * i, 5000000), (500150 + 200 * i, 5000000)]) for i in range(rows.num_rows)]
rows = rows.append_column("geom", pa.array(shapely.to_wkb(lines)))
pyogrio.write_arrow(rows, sys.argv[1], layer="ditches", driver="GPKG", geometry_name="geom",
                    geometry_type="LineString", crs="EPSG:32633")
PY
cd "$out"   # away from the source tree: the bundle must find its own resources
export QT_QPA_PLATFORM=offscreen
"$exe" --screenshot shot.png
"$exe" sheet "$OLDPWD/resources/demo-project.json" -o sheets.pdf
"$exe" drawing "$OLDPWD/resources/demo-project.json" --out drawings >/dev/null
"$exe" batch "$OLDPWD/docs/screenshots/invented-inventory.csv" -o results.csv --no-progress >/dev/null 2>&1 || \
    [ $? -eq 1 ]   # 1: written, with the faulty rows the invented inventory has on purpose
# 1 in each: written, with the faulty rows the invented inventory has on purpose.
"$exe" batch invented-inventory.gpkg -o results.gpkg --plot summary.png --no-progress >/dev/null 2>&1 || [ $? -eq 1 ]
"$exe" batch "$OLDPWD/docs/screenshots/invented-inventory.csv" -o from-csv.gpkg --no-progress >/dev/null 2>&1 || \
    [ $? -eq 1 ]
"$exe" batch invented-inventory.gpkg --layer ditches -o from-gpkg.csv --no-progress >/dev/null 2>&1 || [ $? -eq 1 ]
test -s shot.png && test -s sheets.pdf && test -s results.csv && test -s "drawings/North verge ditch-profile.dxf"
test -s results.gpkg && test -s summary.png && test -s summary-map.png && test -s from-csv.gpkg
grep -q "^R-101,.*,492.126,.*,stable," from-gpkg.csv || { echo "bundle: the GeoPackage inventory's results differ"; exit 1; }
echo "bundle: window, sheet, drawings and inventory checks (CSV and GeoPackage) ran ($(du -sh dist/ditchwright | cut -f1))"
