"""The one table of a channel's inputs (app.inputs) against the project schema, the command line and the batch.

The ranges are the program's own (what each input can mean, and the design ranges of
hydraulics.validate.LIMITS with their sources there); the published reference these tests hold the table to
is the project file format, resources/project.schema.json. Each edge is tried at the bound itself and one
floating-point step either side of it (math.nextafter), so a check that moves by one step fails here.
"""

import argparse
import json
import math
from pathlib import Path

import pytest

from app import inputs
from app.cli import calc, common
from app.inventory import reading
from app.main import main
from hydraulics import many_reaches as mr
from hydraulics import units as hu
from hydraulics.sections import SHAPE_DIMENSIONS
from app.context import Context

CONTEXT = Context.load()   # the shipped lining catalogue alone, US units

SCHEMA = json.loads((Path(__file__).parents[1] / "resources" / "project.schema.json").read_text(encoding="utf-8"))
DEFS = SCHEMA["$defs"]


def _resolved(node: dict) -> dict:
    """A schema node with its "$ref" laid under its own keywords."""
    if "$ref" not in node:
        return node
    target = DEFS[node["$ref"].split("/")[-1]]
    return {**_resolved(target), **{k: v for k, v in node.items() if k != "$ref"}}


def _schema_range(node: dict):
    """(low, low inclusive, high, high inclusive, null allowed) that a schema node states for a number."""
    node = _resolved(node)
    low, low_inclusive = (node["minimum"], True) if "minimum" in node else (node.get("exclusiveMinimum"), False)
    high, high_inclusive = (node["maximum"], True) if "maximum" in node else (node.get("exclusiveMaximum"), False)
    types = node.get("type", [])
    return low, low_inclusive if low is not None else None, high, high_inclusive if high is not None else None, \
        "null" in (types if isinstance(types, list) else [types])


def _table_range(spec: inputs.Input):
    return (spec.low, spec.low_inclusive if spec.low is not None else None,
            spec.high, spec.high_inclusive if spec.high is not None else None)


def _channel_node(path: str) -> dict:
    """The schema node of a channel input that is not a section dimension."""
    channel = DEFS["channel"]["properties"]
    first, _, rest = path.partition(".")
    if first == "lining":
        return DEFS["lining"]["properties"][rest]
    return channel[first]["properties"][rest] if rest else channel[first]


def _section_branches() -> dict:
    """Per shape given by numbers, the schema's properties of its section."""
    out = {}
    for branch in DEFS["section"]["allOf"]:
        shape = branch["if"]["properties"]["shape"]["const"]
        if shape != "irregular":
            out[shape] = {k: v for k, v in branch["then"]["properties"].items() if k != "shape"}
    return out


CHANNEL_INPUTS = [i for i in inputs.INPUTS if not i.shapes]


@pytest.mark.parametrize("spec", CHANNEL_INPUTS, ids=lambda s: s.path)
def test_a_channel_input_has_the_range_of_the_project_schema(spec):
    low, low_inc, high, high_inc, nullable = _schema_range(_channel_node(spec.path))
    assert _table_range(spec) == (low, low_inc, high, high_inc)
    if spec.optional:
        assert nullable, f"{spec.path} may be left empty in the form, so a file may hold null there"


@pytest.mark.parametrize("shape", sorted(_section_branches()))
def test_a_shape_takes_the_dimensions_of_the_schema_with_its_ranges(shape):
    schema_dims = _section_branches()[shape]
    table_dims = {d.name: d for d in inputs.SECTION_INPUTS[shape]}
    assert set(table_dims) == set(schema_dims) == set(SHAPE_DIMENSIONS[shape][1])
    for name, spec in table_dims.items():
        low, low_inc, high, high_inc, _ = _schema_range(schema_dims[name])
        assert _table_range(spec) == (low, low_inc, high, high_inc), (shape, name)


def test_the_shapes_of_each_dimension_are_those_whose_schema_section_takes_it():
    branches = _section_branches()
    for name in {d.name for d in inputs.DIMENSIONS}:
        in_table = {s for d in inputs.DIMENSIONS if d.name == name for s in d.shapes}
        assert in_table == {s for s, props in branches.items() if name in props}, name


def test_every_number_of_a_channel_in_the_schema_is_in_the_table():
    channel = DEFS["channel"]["properties"]
    numbers = {k for k, v in channel.items() if _is_number(v)}
    numbers |= {f"flow.{k}" for k, v in channel["flow"]["properties"].items() if _is_number(v)}
    numbers |= {f"lining.{k}" for k, v in DEFS["lining"]["properties"].items() if _is_number(v)}
    numbers |= {f"section.{k}" for props in _section_branches().values() for k in props}
    assert numbers == {i.path for i in inputs.INPUTS}


def _is_number(node) -> bool:
    types = _resolved(node).get("type", [])
    return "number" in (types if isinstance(types, list) else [types])


# -- refusals exactly at the bounds ---------------------------------------------------------------------------------

def _edges(spec: inputs.Input, quantity: str, units: hu.UnitSystem):
    """Values typed in ``units`` at each bound of the input and of its design range, and one step either side."""
    bounds = [b for b in (spec.low, spec.high) if b is not None]
    limit = spec.limit
    if limit is not None:
        bounds += [limit.low, limit.high]
    shown = {float(units.from_si(quantity, b)) if quantity else b for b in bounds}
    return sorted({x for b in shown for x in (math.nextafter(b, -math.inf), b, math.nextafter(b, math.inf))})


def _accepted(spec: inputs.Input, si: float) -> bool:
    """What the table says of an SI value: within the input's range and its design range."""
    limit = spec.limit
    return spec.holds(si) and (limit is None or bool(limit.holds(si)))


#: (option, shape) pairs of the command line; the stone size is typed in ft or m there.
CLI_CASES = [("flow", "trapezoid"), ("slope", "trapezoid"), ("n", "trapezoid"), ("bottom_width", "trapezoid"),
             ("bottom_width", "rectangle"), ("side_slope", "triangle"), ("left_slope", "trapezoid"),
             ("right_slope", "triangle"), ("top_width", "parabola"), ("at_depth", "parabola"),
             ("diameter", "circle"), ("d50", "trapezoid"), ("bend_radius", "trapezoid"),
             ("min_freeboard", "trapezoid"), ("max_depth", "trapezoid")]
_GOOD = {"flow": 1.0, "slope": 0.01, "n": 0.013}
_SHAPE_GOOD = {"trapezoid": {"bottom_width": 1.0, "side_slope": 2.0}, "triangle": {"side_slope": 2.0},
               "rectangle": {"bottom_width": 1.0}, "parabola": {"top_width": 2.0, "at_depth": 0.5},
               "circle": {"diameter": 1.0}}


def _calc_args(shape: str, units: str, **given) -> argparse.Namespace:
    parser = argparse.ArgumentParser()
    calc.register(parser.add_subparsers())
    values = {**_GOOD, **_SHAPE_GOOD[shape], **given}
    if {"left_slope", "right_slope"} & set(given):
        values.pop("side_slope", None)
    argv = ["calc", "--units", units, "--shape", shape]
    argv += [f"{common.option_name(k)}={v!r}" for k, v in values.items()]
    return parser.parse_args(argv)


@pytest.mark.parametrize("units", ["si", "us"])
@pytest.mark.parametrize("field,shape", CLI_CASES, ids=[f"{f}-{s}" for f, s in CLI_CASES])
def test_the_command_line_refuses_exactly_outside_the_table(field, shape, units):
    system = hu.system(units)
    spec = common.option_input(field, shape)
    quantity = "length" if field == "d50" else spec.quantity
    assert spec.name == field
    for typed in _edges(spec, quantity, system):
        si = float(system.to_si(quantity, typed)) if quantity else typed
        try:
            common.check_numbers(_calc_args(shape, units, **{field: typed}))
            refused = None
        except common.CliError as exc:
            refused = str(exc)
        assert (refused is None) == _accepted(spec, si), (typed, refused)
        if refused is not None:
            assert refused.startswith(common.option_name(field) + " must be "), refused
            if not spec.holds(si):   # the table's words, as the form says them but in ASCII
                assert spec.allowed(system, plain=True) in refused, refused


def test_the_command_line_exits_2_on_the_table_s_bound(capsys):
    base = ["calc", "--units", "si", "--shape", "rectangle", "--flow", "1", "--slope", "0.01", "--n", "0.013"]
    assert main([*base, "--bottom-width", "0"]) == 2
    assert "--bottom-width must be > 0, got 0" in capsys.readouterr().err
    assert main([*base, "--bottom-width", "0.01"]) == 0      # the design range's lowest width
    assert main([*base[:-2], "--n", "1.0000000000000002", "--bottom-width", "1"]) == 2
    assert "--n must be > 0 and <= 1" in capsys.readouterr().err


#: (column, shape, lining) of an inventory row; the other columns hold a valid reach of that shape.
BATCH_CASES = [("flow", "trapezoid", ""), ("slope", "trapezoid", ""), ("n", "trapezoid", ""),
               ("bottom_width", "trapezoid", ""), ("bottom_width", "rectangle", ""),
               ("left_slope", "trapezoid", ""), ("right_slope", "triangle", ""), ("diameter", "circle", ""),
               ("d50", "trapezoid", "riprap")]
_ROW = {"id": "r", "bottom_width": 1.0, "left_slope": 2.0, "right_slope": 2.0, "diameter": "", "slope": 0.01,
        "flow": 1.0, "lining": "", "d50": "", "n": 0.013}
_ROW_OF = {"trapezoid": {}, "triangle": {"bottom_width": ""}, "rectangle": {"left_slope": "", "right_slope": ""},
           "circle": {"bottom_width": "", "left_slope": "", "right_slope": "", "diameter": 1.0}}


@pytest.mark.parametrize("column,shape,lining", BATCH_CASES, ids=[f"{c}-{s}" for c, s, _ in BATCH_CASES])
def test_the_batch_refuses_exactly_outside_the_table(column, shape, lining):
    spec = inputs.input_named(column, shape)
    values = _edges(spec, "", hu.SI)     # an SI inventory: every column in SI units (a stone size in m)
    rows = []
    for v in values:
        row = {**_ROW, **_ROW_OF[shape], "shape": shape, column: repr(v)}
        if lining:
            row.update(lining=lining, n="")
        rows.append(",".join(str(row[c]) for c in reading.INPUT_COLUMNS))
    text = ",".join(reading.INPUT_COLUMNS) + "\n" + "\n".join(rows) + "\n"
    problems = mr.screen(reading.parse_inventory(text, "si").reaches, hu.SI)
    for v, problem in zip(values, problems):
        expected = _accepted(spec, v)
        if column == "d50" and v == 0:
            expected = True     # an inventory's 0 for a stone size means none given (the batch's own reading)
        assert (problem == "") == expected, (v, problem)
        if problem:
            assert problem.startswith(f"{column}: must be "), problem


# -- the window's form ----------------------------------------------------------------------------------------------

@pytest.fixture(params=["us", "si"])
def input_panel(qtbot, request):
    """The window's input form over the demo project (an invented site), in US or SI units."""
    from app import project as pj
    from app.gui.document import ProjectDocument
    from app.gui.forms import InputPanel

    project = pj.loads(pj.demo_path().read_text(encoding="utf-8"))
    project.units = request.param
    panel = InputPanel(ProjectDocument(project, context=CONTEXT))
    qtbot.addWidget(panel)
    return panel


def test_the_form_shows_every_input_of_the_table_with_its_record(input_panel):
    fields = input_panel.fields
    assert all(any(f.spec is i for i in inputs.INPUTS) for f in fields.values())
    shown = {(key.partition(":")[0] if ":" in key else None, f.spec.path) for key, f in fields.items()}
    expected = {(None, i.path) for i in inputs.INPUTS if not i.shapes}
    expected |= {(s, d.path) for s, dims in inputs.SECTION_INPUTS.items() for d in dims if d.name != "side_slope"}
    assert shown == expected


def test_the_form_s_fields_refuse_exactly_outside_the_table(input_panel):
    units = hu.system(input_panel.doc.project.units)
    for key, field in input_panel.fields.items():
        spec = field.spec
        field.show_value(None, units)      # the fields of the shapes not shown have not been given units yet
        for typed in _edges(spec, spec.quantity, units):
            try:
                field.parse(repr(typed))
                refused = None
            except ValueError as exc:
                refused = str(exc)
            assert (refused is None) == _accepted(spec, spec.to_si(typed, units)), (key, typed, refused)


def test_a_surveyed_segment_s_n_has_the_range_of_manning_s_n():
    """The survey table of the form checks each segment's n as Manning's n; the file says the same."""
    irregular = next(b for b in DEFS["section"]["allOf"] if b["if"]["properties"]["shape"]["const"] == "irregular")
    one, each = irregular["then"]["properties"]["n"]["anyOf"]
    for node in (one, each["items"]):
        assert _schema_range(node)[:4] == _table_range(inputs.MANNING)
