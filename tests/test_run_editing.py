"""Changing a ditch run without Qt (app.run_editing): values of the run itself, items added and removed, a new
run. The hydraulics are the core's (tested elsewhere); these check that every change keeps a run the core can
solve, and that what cannot be removed is refused in words."""

from __future__ import annotations

import pytest

from app import project as pj
from app.run_design import design_run
from app.run_editing import (ADDABLE, new_run, run_value, with_item_added, with_item_removed, with_run_value)
from hydraulics.linings import load_catalogue



@pytest.fixture(scope="module")
def demo():
    return pj.load(pj.demo_path())


@pytest.fixture(scope="module")
def catalogue():
    return load_catalogue()


def _covers(run) -> bool:
    """The sections follow one another without gap or overlap from the first grade point to the last."""
    s = run.sections
    return (s[0].from_station == run.profile[0].station and s[-1].to_station == run.profile[-1].station
            and all(a.to_station == b.from_station for a, b in zip(s, s[1:])))


def test_values_of_the_run_itself_are_changed_on_a_copy(demo):
    run = demo.runs[0]
    new = with_run_value(run, "return_period", 25.0)
    assert run_value(new, "return_period") == 25.0 and run.return_period == 10.0
    assert with_run_value(run, "spacing", 5.0).spacing == 5.0
    assert with_run_value(run, "bends[0].radius", 40.0).bends[0].radius == 40.0
    assert with_run_value(run, "point_inflows[0].flow", 0.2).point_inflows[0].flow == 0.2
    assert with_run_value(run, "sections[1].ditch_depth", 1.2).sections[1].ditch_depth == 1.2
    with pytest.raises(KeyError, match="unknown run input"):
        with_run_value(run, "stone_porosity", 0.3)


def test_a_grade_point_goes_half_way_and_keeps_the_ends(demo):
    run = demo.runs[0]
    new = with_item_added(run, "profile", 0)
    a, b, c = new.profile[:3]
    assert (b.station, b.elevation) == ((a.station + c.station) / 2, (a.elevation + c.elevation) / 2)
    assert len(new.profile) == len(run.profile) + 1
    last = with_item_added(run, "profile")           # after the last: between the last two
    assert last.profile[-1] == run.profile[-1] and last.profile[0] == run.profile[0]
    assert with_item_removed(new, "profile", 1).profile == run.profile


def test_the_ends_of_the_profile_are_not_removed(demo):
    run = demo.runs[0]
    for end in (0, len(run.profile) - 1):
        with pytest.raises(ValueError, match="ends of the run"):
            with_item_removed(run, "profile", end)


def test_sections_are_split_and_merged_so_they_still_cover_the_run(demo):
    run = demo.runs[0]
    split = with_item_added(run, "sections", 0)
    assert len(split.sections) == len(run.sections) + 1 and _covers(split)
    assert split.sections[0].section == split.sections[1].section
    assert split.sections[0].to_station == (run.sections[0].from_station + run.sections[0].to_station) / 2
    for k in range(len(split.sections)):
        assert _covers(with_item_removed(split, "sections", k))
    one = with_item_removed(run, "sections", 1)
    assert len(one.sections) == 1 and _covers(one)
    with pytest.raises(ValueError, match="at least 1 section"):
        with_item_removed(one, "sections", 0)


@pytest.mark.parametrize("items", ["sub_areas", "bends", "point_inflows"])
def test_an_item_copied_gets_a_name_of_its_own_and_an_empty_list_starts_afresh(demo, items):
    run = demo.runs[0]
    more = with_item_added(run, items, 0)
    seq = getattr(more, items)
    assert len(seq) == len(getattr(run, items)) + 1
    if hasattr(seq[0], "name"):
        assert len({i.name for i in seq}) == len(seq)
    empty = run
    while getattr(empty, items):
        empty = with_item_removed(empty, items, 0)
    fresh = getattr(with_item_added(empty, items, units="us"), items)
    assert len(fresh) == 1


def test_an_edited_run_still_solves(demo, catalogue):
    run = demo.runs[0]
    for items in ADDABLE:
        item = pj.RunCandidate("asphalt", None, 40.0) if items == "candidates" else None
        changed = with_item_added(run, items, 0, item=item)
        design = design_run(demo, changed, catalogue)
        assert len(design.result.points) >= len(design_run(demo, run, catalogue).result.points) - 1


@pytest.mark.parametrize("units, length_shown", [("si", 150.0), ("us", 500.0)])
def test_a_new_run_has_round_values_of_its_unit_system_and_solves(demo, catalogue, units, length_shown):
    from hydraulics.units import system

    run = new_run("West ditch", units, demo.runs[0].candidates)
    shown = float(system(units).from_si("length", run.profile[-1].station))
    assert shown == pytest.approx(length_shown)
    assert run.outfall.station == run.profile[-1].station and _covers(run)
    design = design_run(demo, run, catalogue)       # the demo project gives the rainfall relation
    assert design.result.points[-1].flow > 0


def test_a_candidate_is_added_by_choice_and_the_last_one_kept(demo):
    from app.project import RunCandidate

    run = demo.runs[0]
    more = with_item_added(run, "candidates", 0, item=RunCandidate("asphalt", None, 60.0))
    assert [c.key for c in more.candidates] == ["grass_good_sod", "asphalt", "riprap", "concrete"]
    with pytest.raises(ValueError, match="already"):
        with_item_added(more, "candidates", item=RunCandidate("asphalt"))
    with pytest.raises(ValueError, match="choosing it from the catalogue"):
        with_item_added(run, "candidates")
    one = more
    for _ in range(3):
        one = with_item_removed(one, "candidates", 0 if one.candidates[0].key != "asphalt" else 1)
    assert [c.key for c in one.candidates] == ["asphalt"]
    with pytest.raises(ValueError, match="at least 1 candidate lining"):
        with_item_removed(one, "candidates", 0)


def test_a_sub_area_or_section_is_replaced_whole_on_a_copy(demo, catalogue):
    import copy

    from app.run_editing import with_item_replaced

    run = demo.runs[0]
    sa = copy.deepcopy(run.sub_areas[3])
    sa.time_of_concentration = {"method": "kirpich", "flow_length": 300.0, "slope": 0.02}
    new = with_item_replaced(run, "sub_areas", 3, sa)
    assert new.sub_areas[3] == sa and new.sub_areas[3] is not sa
    assert run.sub_areas[3].time_of_concentration == {"method": "typed", "value": 300.0}
    assert new.sub_areas[:3] == run.sub_areas[:3] and new.sections == run.sections
    rs = pj.RunSection(0.0, 330.0, {"shape": "triangle", "left_slope": 4.0, "right_slope": 4.0}, 0.9)
    tri = with_item_replaced(run, "sections", 0, rs)
    assert tri.sections[0].section["shape"] == "triangle" and run.sections[0].section["shape"] == "trapezoid"
    assert design_run(demo, tri, catalogue).result.points[-1].flow > 0
    with pytest.raises(KeyError, match="replaces whole items of sub_areas, sections"):
        with_item_replaced(run, "bends", 0, rs)
    with pytest.raises(TypeError, match="takes a RunSection"):
        with_item_replaced(run, "sections", 0, sa)
    with pytest.raises(KeyError, match=r"sub_areas\[9\]: the run has 4"):
        with_item_replaced(run, "sub_areas", 9, sa)
