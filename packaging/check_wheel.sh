#!/usr/bin/env bash
# Build the wheel, install it into a fresh virtual environment outside the source tree, and run the
# program from there on its shipped demo: proves that the data files travel inside the wheel.
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
python3 -m venv "$work/build-env"
"$work/build-env/bin/pip" install -q build
"$work/build-env/bin/python" -m build --wheel --outdir "$work/dist" "$root" >/dev/null
python3 -m venv "$work/venv"
"$work/venv/bin/pip" install -q "$work"/dist/ditchwright-*.whl pypdf
cd "$work"   # nowhere near the source tree
export QT_QPA_PLATFORM=offscreen
bin="$work/venv/bin/ditchwright"
"$bin" --version
"$bin" calc --shape trapezoid --bottom-width 2 --side-slope 3 --slope 0.004 --flow 20 --n 0.03 --json > calc.json
"$work/venv/bin/python" - <<'PY'
import json, importlib.resources as ir
out = json.load(open("calc.json"))
assert out["normal_depth"] > 0 and out["units"]["length"] == "ft", out
for name in ("linings.toml", "project.schema.json", "icons/ditchwright.svg"):
    assert ir.files("resources").joinpath(name).is_file(), name
print("wheel ok: calc ran and the resources were found inside the installed package")
PY
demo=$("$work/venv/bin/python" -c "from app.project import demo_path; print(demo_path())")
"$bin" sheet "$demo" -o demo-sheets.pdf
"$work/venv/bin/python" - <<'PY'
from pypdf import PdfReader
pages = PdfReader("demo-sheets.pdf").pages
assert len(pages) >= 3 and "Normal depth" in pages[0].extract_text()
print(f"wheel ok: design sheets of the demo project written ({len(pages)} pages)")
PY
