#!/usr/bin/env bash
# Build the desktop bundle with PyInstaller in the CI environment and use it as a technician would:
# the window offscreen (screenshot), a design sheet, the DXF drawings and an inventory check on the shipped demo
# data.
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
cd "$out"   # away from the source tree: the bundle must find its own resources
export QT_QPA_PLATFORM=offscreen
"$exe" --screenshot shot.png
"$exe" sheet "$OLDPWD/resources/demo-project.json" -o sheets.pdf
"$exe" drawing "$OLDPWD/resources/demo-project.json" --out drawings >/dev/null
"$exe" batch "$OLDPWD/docs/screenshots/invented-inventory.csv" -o results.csv --no-progress >/dev/null 2>&1 || \
    [ $? -eq 1 ]   # 1: written, with the faulty rows the invented inventory has on purpose
test -s shot.png && test -s sheets.pdf && test -s results.csv && test -s drawings/North_verge_ditch-profile.dxf
echo "bundle: window, sheet, drawings and inventory check ran ($(du -sh dist/ditchwright | cut -f1))"
