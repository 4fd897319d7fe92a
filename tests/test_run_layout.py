"""Stations, grades, ranges and design points of a ditch run (hydraulics.run_layout).

These check the geometry rules the module states (grade = fall / run in the direction of flow; design points at
breaks, range ends and whole multiples of the spacing; a point where two ranges meet takes the downstream one).
The profiles are invented test data.
"""

import numpy as np
import pytest

from hydraulics.errors import InputError
from hydraulics.run_layout import RunLayout, StationRange
from hydraulics.units import US
from hydraulics.wording import format_station


def test_grades_follow_the_flow_and_keep_an_adverse_stretch():
    lay = RunLayout([0, 100, 250], [100.0, 99.0, 99.3], outfall_station=250, spacing=40)
    assert lay.direction == 1
    assert lay.grades == pytest.approx([0.01, -0.002])
    # design points: both ends, the break, and every multiple of 40 m
    assert list(lay.stations) == pytest.approx([0, 40, 80, 100, 120, 160, 200, 240, 250])
    assert lay.grade[lay.point_index(100)] == pytest.approx(-0.002)   # a break takes the stretch leaving it
    assert lay.grade[lay.point_index(80)] == pytest.approx(0.01)
    assert lay.grade[-1] == pytest.approx(-0.002)                      # the outfall: the last stretch
    assert lay.invert[lay.point_index(40)] == pytest.approx(99.6)


def test_a_run_flowing_back_down_the_stationing():
    lay = RunLayout([0, 100, 250], [98.0, 99.0, 101.0], outfall_station=0, spacing=50)
    assert lay.direction == -1
    assert lay.upstream_station == 250
    assert lay.x[0] == 0 and lay.stations[0] == 250 and lay.stations[-1] == 0
    assert np.all(np.diff(lay.x) > 0)
    # 101 -> 99 over 150 m, then 99 -> 98 over 100 m, both falling toward the outfall
    assert lay.grades == pytest.approx([2 / 150, 0.01])
    assert lay.grade[lay.point_index(100)] == pytest.approx(0.01)


def test_ranges_cover_the_run_and_a_boundary_point_takes_the_downstream_range():
    lay = RunLayout([0, 300], [10.0, 9.0], outfall_station=300, spacing=50, extra_stations=[120])
    which = lay.covering("sections", [StationRange(120, 300), StationRange(0, 120)])
    assert which[lay.point_index(100)] == 1
    assert which[lay.point_index(120)] == 0        # the range that begins at 120 in the direction of flow
    assert which[-1] == 0
    back = RunLayout([0, 300], [9.0, 10.0], outfall_station=0, spacing=50, extra_stations=[120])
    which = back.covering("sections", [StationRange(120, 300), StationRange(0, 120)])
    assert which[back.point_index(120)] == 1       # flowing back, the range 0-120 begins at 120
    assert which[back.point_index(150)] == 0


@pytest.mark.parametrize("ranges, field, words", [
    ([StationRange(0, 100), StationRange(120, 300)], "sections[1].from_station", "gap from 0+100.00 to 0+120.00"),
    ([StationRange(0, 150), StationRange(120, 300)], "sections[1].from_station", "overlaps the range before it"),
    ([StationRange(0, 200)], "sections", "gap from 0+200.00 to the end of the run at 0+300.00"),
    ([StationRange(0, 350)], "sections[0].to_station", "must lie on the run"),
    ([StationRange(50, 50)], "sections[0].to_station", "must be beyond from_station"),
])
def test_bad_ranges_are_refused_naming_the_item(ranges, field, words):
    lay = RunLayout([0, 300], [10.0, 9.0], outfall_station=300, spacing=50)
    with pytest.raises(InputError) as err:
        lay.covering("sections", ranges)
    assert err.value.field == field
    assert words in str(err.value)


@pytest.mark.parametrize("kwargs, field", [
    (dict(profile_stations=[0, 100, 100], profile_elevations=[3, 2, 1], outfall_station=100, spacing=10),
     "profile[2].station"),
    (dict(profile_stations=[0], profile_elevations=[3], outfall_station=0, spacing=10), "profile"),
    (dict(profile_stations=[0, 100], profile_elevations=[3, 2], outfall_station=50, spacing=10), "outfall.station"),
    (dict(profile_stations=[0, 100], profile_elevations=[3, 2], outfall_station=100, spacing=0), "spacing"),
    (dict(profile_stations=[0, 100], profile_elevations=[3, float("nan")], outfall_station=100, spacing=10),
     "profile[1].elevation"),
])
def test_bad_profiles_are_refused(kwargs, field):
    with pytest.raises(InputError) as err:
        RunLayout(**kwargs)
    assert err.value.field == field


def test_stations_are_written_as_surveyors_write_them():
    # common practice: hundreds of feet (12+34.56) in US units, kilometres (1+234.56) in SI
    assert format_station(1234.56 * 0.3048, US) == "12+34.56"
    assert format_station(1234.567) == "1+234.57"
    assert format_station(0.0, US) == "0+00.00"
    assert format_station(99.999) == "0+100.00"


@pytest.mark.parametrize("spacing, count", [(1e-3, "300,000"), (1e-308, "over 10^12")])
def test_too_many_design_points_are_refused_before_any_is_made(spacing, count):
    """A spacing that gives more than 200,000 design points is refused naming the count; one a hair wide
    (typed as 1e-308 in the window) once overflowed the conversion to whole numbers first (common practice:
    the limit keeps a run solvable in the window)."""
    with pytest.raises(InputError) as err:
        RunLayout([0, 300], [10.0, 9.0], outfall_station=300, spacing=spacing)
    assert err.value.field == "spacing" and f"gives {count} design points" in str(err.value)
