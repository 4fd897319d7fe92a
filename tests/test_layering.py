"""Layers: the core stays pure, the application layer stays Qt-, plot- and PDF-free, and imports run downward.

hydraulics/ (the core) imports nothing from app/; every application module outside the front ends that draw
(app/gui: Qt and matplotlib; app/sheet: reportlab; app/inventory/plots.py: the inventory's plot and map with
matplotlib) loads no GUI, plotting or PDF library, nor names one even inside a function, so that the command line,
the inventory checker and the tests can use them without a display. The list is found from the files, so a new
module is checked as soon as it exists. The application layer itself imports no front end.
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
#: The front ends that draw: Qt and matplotlib, reportlab, matplotlib alone (the inventory's plot and map).
DRAWING = ("app.gui", "app.sheet", "app.inventory.plots")


def _modules(package: str) -> list:
    """Every module of ``package`` (a folder under the checkout), by its dotted name, without importing any."""
    names = []
    for path in sorted((ROOT / package).rglob("*.py")):
        parts = path.relative_to(ROOT).with_suffix("").parts
        names.append(".".join(parts[:-1] if parts[-1] == "__init__" else parts))
    return names


APPLICATION = [m for m in _modules("app") if not any(m == d or m.startswith(d + ".") for d in DRAWING)]
#: The Qt-free layer between the core and the front ends: it never imports a front end, not even when called.
LAYER = [m for m in APPLICATION if m not in ("app.main", "app.cli") and not m.startswith("app.cli.")]


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


def test_the_qt_free_modules_are_found_from_the_files():
    assert {"app.evaluate", "app.verdicts", "app.results", "app.project", "app.files", "app.numtext", "app.context",
            "app.editing", "app.channel_display", "app.inventory", "app.inventory.reading", "app.inventory.checking",
            "app.inventory.writing", "app.inventory.reporting", "app.cli.calc", "app.cli.compare",
            "app.cli.inventory_command", "app.main"} <= set(APPLICATION)
    assert not any(m.startswith(("app.gui", "app.sheet")) for m in APPLICATION)
    assert "app.gui.mainwindow" in _modules("app") and "app.sheet.layout" in _modules("app")


@pytest.mark.parametrize("module", APPLICATION)
def test_the_application_layer_loads_no_gui_plot_or_pdf_library(module):
    assert _loads_heavy(module) == []


def _imported(module: str) -> list:
    """Every module name ``module`` imports, at its top or inside a function, as an absolute dotted name."""
    path = ROOT / Path(*module.split("."))
    path = path / "__init__.py" if path.is_dir() else path.with_suffix(".py")
    package = module.split(".") if path.name == "__init__.py" else module.split(".")[:-1]
    found = []
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            found += [a.name for a in node.names]
        elif isinstance(node, ast.ImportFrom):
            base = package[:len(package) - node.level + 1] if node.level else []
            if node.module:
                found.append(".".join(base + [node.module]))
            else:   # "from .. import gui"
                found += [".".join(base + [a.name]) for a in node.names]
    return found


@pytest.mark.parametrize("module", LAYER)
def test_the_application_layer_imports_no_front_end(module):
    """Not at the top of a module nor inside a function: the window and the sheet render this layer, not the
    other way round (app.main and app.cli start the window or write a sheet when asked, so they may)."""
    for name in _imported(module):
        assert not any(name == d or name.startswith(d + ".") for d in DRAWING), (module, name)


@pytest.mark.parametrize("module", APPLICATION)
def test_the_application_layer_names_no_gui_plot_or_pdf_library(module):
    """Not even inside a function, where loading the module does not show it: a Qt widget, a matplotlib figure
    or a reportlab page is drawn by a front end (DRAWING), which the command line may start when asked."""
    for name in _imported(module):
        assert name.split(".")[0] not in HEAVY, (module, name)


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


def test_the_table_of_shape_dimensions_agrees_with_the_project_schema():
    """One table of which dimensions each shape takes (hydraulics.sections.SHAPE_DIMENSIONS), used by the command
    line and the inventory reader, and the project schema's section of each shape allow the same dimensions."""
    import json

    from hydraulics.many_reaches import _DIMENSIONS, SHAPES
    from hydraulics.sections import SHAPE_DIMENSIONS
    schema = json.loads((ROOT / "resources" / "project.schema.json").read_text(encoding="utf-8"))
    allowed = {}
    for branch in schema["$defs"]["section"]["allOf"]:
        shape = branch["if"]["properties"]["shape"]["const"]
        allowed[shape] = set(branch["then"]["properties"]) - {"shape"}
    for shape, (needed, may) in SHAPE_DIMENSIONS.items():
        assert set(may) == allowed[shape], shape
        assert needed <= may, shape
    assert set(allowed) - set(SHAPE_DIMENSIONS) == {"irregular"}    # a survey is given by its points
    # an inventory names each side slope: every dimension a shape takes, with side_slope as its two sides
    for shape in SHAPES:
        assert set(_DIMENSIONS[shape]) == (set(SHAPE_DIMENSIONS[shape][1]) - {"side_slope"}), shape
