"""Flows that a stone lining carries uniformly at more than one depth (hydraulics.linings.several_depths).

The reference is Manning's equation itself with the stone's n: the depths at which the conveyance A R^(2/3) / n
equals that of the solved depth, counted as sign changes on a fine grid of depths (which includes the edges of
the band where the relation changes). The cases are invented: random sections, stones and slopes near the
change of relation, where a flow can have three depths.
"""

import numpy as np
import pytest

import hydraulics as hy
from hydraulics.linings import StoneRoughness
from hydraulics.linings.roughness import SPLIT_BAND
from hydraulics.linings.several_depths import depth_at_average, other_depth, other_side


def _section(rng, kind):
    if kind == "rectangle":
        return hy.Rectangle(bottom_width=rng.uniform(0.3, 4.0))
    if kind == "trapezoid":
        return hy.Trapezoid(bottom_width=rng.uniform(0.2, 3.0), side_slope=rng.uniform(1.5, 4.0))
    if kind == "triangle":
        return hy.Triangle(side_slope=rng.uniform(1.5, 4.0))
    return hy.Circle(diameter=rng.uniform(0.6, 3.0))


def _roots_apart(model, section, slope, depth):
    """-1 / +1 where the grid finds another depth carrying the same flow below / above ``depth``, else 0."""
    foot = float(depth_at_average(section, 1.5 * model.d50))
    top = float(depth_at_average(section, 1.5 * SPLIT_BAND * model.d50))
    high = section.capacity_depth * (1 - 1e-6) if section.capacity_depth is not None else 50 * top
    grid = np.unique(np.concatenate([np.geomspace(1e-3 * foot, high, 20_000), [foot * (1 - 1e-9), top]]))
    with np.errstate(all="ignore"):
        gap = np.sign(hy.flow_at_depth(section, grid, np.full(grid.shape, slope), model)
                      - hy.flow_at_depth(section, depth, slope, model))
    roots = grid[np.flatnonzero(gap[1:] != gap[:-1])]
    others = roots[np.abs(np.log(roots / depth)) > 1e-3]
    return 0 if not len(others) else (-1 if (others < depth).any() else 1)


@pytest.mark.parametrize("kind", ["rectangle", "trapezoid", "triangle", "circle"])
def test_another_depth_is_found_where_the_equation_has_one(kind):
    rng = np.random.default_rng({"rectangle": 1, "trapezoid": 2, "triangle": 3, "circle": 4}[kind])
    several = checked = 0
    for _ in range(150):
        section = _section(rng, kind)
        model = StoneRoughness(10 ** rng.uniform(np.log10(0.02), np.log10(0.6)))
        slope = 10 ** rng.uniform(-3, -1)
        foot = float(depth_at_average(section, 1.5 * model.d50))
        if not np.isfinite(foot):
            continue
        trial = foot * 10 ** rng.uniform(-0.4, 0.4)
        if section.capacity_depth is not None:
            trial = min(trial, 0.9 * section.capacity_depth)
        flow = float(hy.flow_at_depth(section, trial, slope, model))
        try:
            depth = hy.normal_depth(section, flow, slope, n=model)
        except hy.HydraulicsError:
            continue
        side = int(other_side(model, section, depth, slope))
        assert side == _roots_apart(model, section, slope, depth), (section, model, slope, depth)
        several += side != 0
        checked += 1
    assert checked > 100 and several > 5      # both kinds of flow were met


def test_the_average_depth_is_met_in_closed_form_and_by_bisection():
    sections = [hy.Trapezoid(bottom_width=np.array([0.5, 2.0, 0.0]), left_slope=np.array([2.0, 0.0, 1.5]),
                             right_slope=np.array([3.0, 0.0, 4.0])),
                hy.Circle(diameter=np.array([0.6, 1.2, 2.4]))]
    target = np.array([0.05, 0.3, 0.2])
    for section in sections:
        depth = depth_at_average(section, target)
        g = section.properties(depth)
        np.testing.assert_allclose(g.area / g.top_width, target, rtol=1e-11)
    # a pipe's A/T grows without bound towards its crown, but is finite just below it: beyond that, no depth
    pipe = hy.Circle(diameter=0.5)
    assert np.isfinite(depth_at_average(pipe, 0.3)) and np.isnan(depth_at_average(pipe, 1e6))


def test_one_relation_at_every_depth_has_one_depth():
    section = hy.Rectangle(bottom_width=1.1)
    for method in ("blodgett", "bathurst", "strickler"):
        model = StoneRoughness(0.5, method)
        assert int(other_side(model, section, 0.7, 0.02)) == 0


def test_the_other_depth_carries_the_same_flow_on_the_side_said():
    """The other depth quoted is a uniform-flow depth of the same flow (Manning's equation with the stone's n, to
    the solver's tolerance) and lies on the side of the change of relation that is said."""
    rng = np.random.default_rng(11)
    found = 0
    for _ in range(200):
        section = _section(rng, ["rectangle", "trapezoid", "triangle"][rng.integers(3)])
        model = StoneRoughness(10 ** rng.uniform(np.log10(0.05), np.log10(0.6)))
        slope = 10 ** rng.uniform(-3, -1)
        foot = float(depth_at_average(section, 1.5 * model.d50))
        top = float(depth_at_average(section, 1.5 * SPLIT_BAND * model.d50))
        flow = float(hy.flow_at_depth(section, foot * 10 ** rng.uniform(-0.3, 0.3), slope, model))
        depth = hy.normal_depth(section, flow, slope, n=model)
        side = other_side(model, section, depth, slope)
        if not side:
            continue
        other = float(other_depth(model, section, depth, slope, side))
        assert abs(float(hy.flow_at_depth(section, other, slope, model)) / flow - 1) < 1e-9
        assert other > top if side > 0 else other < foot
        found += 1
    assert found > 10


def test_the_caution_is_said_by_the_check_and_in_a_batch_reason():
    """Invented riprap reaches whose flow has a second uniform depth, one above with Blodgett's n, one below with
    Bathurst's: the one-channel check quotes it, the batch's reason says the same words in the inventory's units;
    a reach with one depth says nothing of it."""
    from app import inventory as ai
    from app.context import Context
    from hydraulics.units import US
    from hydraulics.wording import in_units

    ft = 0.3048
    said = []
    for width, d50, flow, slope, side in ((3.7, 1.643, 76.56, 0.02463, 1), (1.0, 0.429, 1.04, 0.00173, -1)):
        section, model = hy.Rectangle(bottom_width=width * ft), StoneRoughness(d50 * ft)
        depth = hy.normal_depth(section, flow * ft ** 3, slope, n=model)
        assert int(other_side(model, section, depth, slope)) == side == _roots_apart(model, section, slope, depth)
        other = float(other_depth(model, section, depth, slope, side))
        (note,) = [t for t in model.check(section, depth, slope) if "another uniform-flow depth" in t]
        where = "da/D50 above 1.53, Blodgett's n" if side > 0 else "da/D50 below 1.5, Bathurst's n"
        assert f"another uniform-flow depth with this stone, {other:.3g} m ({where})" in note
        said.append(in_units(note, US))
    assert "this stone, 5.14 ft (da/D50 above" in said[0]
    head = "id,shape,bottom_width,left_slope,right_slope,diameter,slope,flow,lining,d50,n\n"
    text = head + ("two,rectangle,3.7,,,,0.02463,76.56,riprap,1.643,\nlow,rectangle,1,,,,0.00173,1.04,riprap,0.429,\n"
                   "one,rectangle,3.7,,,,0.02463,20,riprap,0.3,\n")
    inventory = ai.parse_inventory(text, "us")
    reasons = ai.evaluate(inventory, catalogue=Context.load().catalogue).reason.tolist()
    assert said[0] in reasons[0] and said[1] in reasons[1]
    assert "another uniform-flow depth" not in reasons[2]
