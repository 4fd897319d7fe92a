"""Layers: the core stays pure, the application layer stays Qt-, plot- and PDF-free, and imports run downward.

hydraulics/ (the core) imports nothing from app/; the application modules that every front end renders
(evaluation, verdicts, results, project files, number text, the batch) load no GUI, plotting or PDF library, so
that the command line, the batch and the tests can use them without a display.
"""

import ast
import pkgutil
import subprocess
import sys
from pathlib import Path

import pytest

import hydraulics

ROOT = Path(__file__).resolve().parents[1]
HEAVY = ("PySide6", "matplotlib", "reportlab", "PyQt5", "PyQt6")
CORE = sorted(m.name for m in pkgutil.walk_packages(hydraulics.__path__, "hydraulics."))
APPLICATION = ["app.evaluate", "app.verdicts", "app.results", "app.project", "app.files", "app.numtext", "app.inventory",
               "app.inventory.reading", "app.inventory.checking", "app.inventory.writing", "app.inventory.reporting",
               "app.gui.compute", "app.cli.calc", "app.cli.compare"]


def _loads_heavy(module: str) -> list:
    code = (f"import sys, importlib; importlib.import_module({module!r}); "
            f"print(','.join(m for m in {HEAVY!r} if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True, cwd=ROOT)
    return [m for m in out.stdout.strip().split(",") if m]


def test_hydraulics_imports_no_gui_plot_or_pdf_library():
    code = ("import sys, importlib; " + "; ".join(f"importlib.import_module({m!r})" for m in CORE) +
            f"; print(','.join(m for m in {HEAVY!r} if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True, cwd=ROOT)
    assert len(CORE) > 10 and out.stdout.strip() == ""


@pytest.mark.parametrize("module", APPLICATION)
def test_the_application_layer_loads_no_gui_plot_or_pdf_library(module):
    assert _loads_heavy(module) == []


def test_imports_run_from_app_down_to_hydraulics_only():
    for path in (ROOT / "hydraulics").rglob("*.py"):
        tree = ast.parse(path.read_text(encoding="utf-8"))
        for node in ast.walk(tree):
            names = [a.name for a in node.names] if isinstance(node, ast.Import) else \
                [node.module or ""] if isinstance(node, ast.ImportFrom) and node.level == 0 else []
            assert not any(n == "app" or n.startswith("app.") for n in names), path


def test_the_table_of_input_ranges_agrees_with_the_project_schema():
    """One table of input ranges (hydraulics.validate.LIMITS) and the published project schema say the same about
    which inputs may be zero: a schema "non_negative" input is one the table lets be 0, a "positive" one is not."""
    import json

    from hydraulics.validate import LIMITS
    schema = json.loads((ROOT / "resources" / "project.schema.json").read_text(encoding="utf-8"))
    defs = schema["$defs"]
    kinds = {}    # input name -> set of schema kinds it is given
    for branch in defs["section"]["allOf"]:
        for name, spec in branch["then"]["properties"].items():
            if isinstance(spec, dict) and spec.get("$ref", "").split("/")[-1] in ("positive", "non_negative"):
                kinds.setdefault(name, set()).add(spec["$ref"].split("/")[-1])
    channel = defs["channel"]["properties"]
    kinds.setdefault("slope", set()).add(channel["slope"]["$ref"].split("/")[-1])
    kinds.setdefault("flow", set()).add(channel["flow"]["properties"]["value"]["$ref"].split("/")[-1])
    kinds.setdefault("n", set()).add("positive")                      # manning_n: positive_or_null
    kinds.setdefault("bend_radius", set()).add("positive")            # positive_or_null
    kinds.setdefault("min_freeboard", set()).add("non_negative" if channel["min_freeboard"]["minimum"] == 0
                                                 else "positive")
    assert set(kinds) <= set(LIMITS), set(kinds) - set(LIMITS)
    for name, found in kinds.items():
        limit = LIMITS[name]
        zero_ok = limit.zero or limit.low == 0
        if found == {"positive"}:
            assert not zero_ok, name
        if "non_negative" in found:
            assert zero_ok, name
