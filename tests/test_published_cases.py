"""The core against worked examples from textbooks and agency manuals.

The cases, each with its source beside it, live in data/published_cases.toml.
"""

import tomllib
from pathlib import Path

import pytest

import hydraulics as hy
from hydraulics import units as hu

CASES = tomllib.loads((Path(__file__).parent / "data" / "published_cases.toml").read_text())["case"]
_LENGTHS = ("bottom_width", "side_slope", "left_slope", "right_slope", "diameter", "top_width", "at_depth")


def _section(case, system):
    dims = {k: case[k] for k in _LENGTHS if k in case}
    for k in dims:
        if not k.endswith("_slope"):
            dims[k] = system.to_si("length", dims[k])
    return hy.section_from_dict({"shape": case["shape"], **dims})


def test_enough_cases_across_shapes_and_units():
    assert len(CASES) >= 12
    assert {c["shape"] for c in CASES} == {"trapezoid", "triangle", "rectangle", "parabola", "circle"}
    assert {c["units"] for c in CASES} == {"us", "si"}
    assert all(c["source"] and c["provenance"] in ("published", "not verified") for c in CASES)


@pytest.mark.parametrize("case", CASES, ids=[c["id"] for c in CASES])
def test_published_case(case):
    system = hu.system(case["units"])
    section = _section(case, system)
    if case["expect"] == "flow":
        got = hy.flow_at_depth(section, system.to_si("length", case["depth"]), case["slope"], case["n"])
        got = system.from_si("flow", got)
    elif case["expect"] == "normal_depth":
        got = hy.normal_depth(section, system.to_si("flow", case["flow"]), case["slope"], case["n"])
        got = system.from_si("length", got)
    else:
        got = system.from_si("length", hy.critical_depth(section, system.to_si("flow", case["flow"])))
    assert got == pytest.approx(case["expected"], rel=case["rel_tol"]), case["source"]
