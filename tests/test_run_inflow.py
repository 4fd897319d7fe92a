"""The rational-method flow along a ditch run (hydraulics.run_inflow).

Checked against the rational method itself (FHWA HEC-22, 3rd ed., 2009, Eq. 3-1, Q = C i A, with the time of
concentration of a downstream point the longest travel time to it) worked by hand on invented areas, with a
rainfall table that follows a power law i = k D^-m exactly, so every intensity has a closed form. The published
worked example is in tests/test_run_published.py.
"""

import numpy as np
import pytest

from hydraulics.errors import InputError
from hydraulics.rainfall import IdfTable
from hydraulics.run_inflow import PointInflow, SubArea, peak_flows, split_sub_areas, travel_times
from hydraulics.run_layout import RunLayout, StationRange

K, M = 2.0e-4, 0.7                     # invented: i = K D^-M [m/s], D [s]
DURATIONS = np.array([60.0, 300.0, 600.0, 1800.0, 3600.0, 7200.0])
IDF = IdfTable(DURATIONS, [10.0], (K * DURATIONS ** -M)[:, None])


def i_of(d):
    return K * d ** -M


def layout(length=300.0, spacing=50.0, extra=()):
    return RunLayout([0.0, length], [10.0, 10.0 - 0.01 * length], outfall_station=length, spacing=spacing,
                     extra_stations=extra)


def test_one_area_at_the_top_arrives_later_down_the_ditch():
    lay = layout()
    area = SubArea("A", 2.0e4, 0.5, 600.0, StationRange(0.0, 0.0))
    pieces = split_sub_areas(lay, [area])
    tau = lay.x / 0.8                   # a ditch running at 0.8 m/s
    state = peak_flows(lay, pieces, [], tau, IDF, 10.0, min_duration=300.0)
    expected = 0.5 * 2.0e4 * i_of(600.0 + tau)
    assert state.flow == pytest.approx(expected, rel=1e-12)
    assert state.duration == pytest.approx(600.0 + tau)
    assert not state.partial.any()


def test_the_shortest_duration_read_is_the_minimum():
    lay = layout()
    area = SubArea("A", 1.0e4, 0.9, 120.0, StationRange(0.0, 0.0))
    state = peak_flows(lay, split_sub_areas(lay, [area]), [], np.zeros(lay.x.size), IDF, 10.0, min_duration=300.0)
    assert state.flow == pytest.approx(0.9 * 1.0e4 * i_of(300.0), rel=1e-12)
    assert state.duration == pytest.approx(300.0)


def test_partial_area_a_small_fast_area_gives_the_larger_peak():
    lay = layout()
    slow = SubArea("field", 10.0e4, 0.3, 2400.0, StationRange(100.0, 100.0))
    fast = SubArea("paved yard", 1.2e4, 0.9, 300.0, StationRange(100.0, 100.0))
    state = peak_flows(lay, split_sub_areas(lay, [slow, fast]), [], np.zeros(lay.x.size), IDF, 10.0, 300.0)
    i = lay.point_index(100.0)
    whole = i_of(2400.0) * (0.3 * 10.0e4 + 0.9 * 1.2e4)
    part = i_of(300.0) * 0.9 * 1.2e4
    assert part > whole                  # the case the manuals warn of
    assert state.flow[i] == pytest.approx(part, rel=1e-12)
    assert state.partial[i] and state.governing_ca[i] == pytest.approx(0.9 * 1.2e4)
    assert state.whole_duration[i] == pytest.approx(2400.0)
    assert state.flow[: i] == pytest.approx(0.0)          # nothing has joined above the entry


def test_a_spread_area_is_split_at_the_design_points_and_adds_up():
    lay = layout(extra=[30.0, 170.0])
    area = SubArea("verge", 0.6e4, 0.7, 300.0, StationRange(30.0, 170.0))
    pieces = split_sub_areas(lay, [area])
    inside = (lay.stations >= 30.0) & (lay.stations <= 170.0)
    assert pieces.ca.size == inside.sum() - 1
    assert pieces.ca.sum() == pytest.approx(0.7 * 0.6e4)
    state = peak_flows(lay, pieces, [], np.zeros(lay.x.size), IDF, 10.0, 300.0)
    # with no travel time every piece arrives at once: Q = C i(t_c) x the share of the area upstream
    for s in (50.0, 100.0, 150.0, 170.0, 300.0):
        share = (min(s, 170.0) - 30.0) / 140.0
        assert state.flow[lay.point_index(s)] == pytest.approx(0.7 * 0.6e4 * share * i_of(300.0), rel=1e-12)


def test_point_inflows_are_added_from_their_station_on():
    lay = layout()
    state = peak_flows(lay, split_sub_areas(lay, []), [PointInflow("pipe", 150.0, 0.25)], np.zeros(lay.x.size),
                       IDF, 10.0, 300.0)
    assert state.flow == pytest.approx(np.where(lay.stations >= 150.0, 0.25, 0.0))


def test_travel_time_is_the_trapezoidal_integral_of_one_over_velocity():
    x = np.array([0.0, 50.0, 120.0])
    v = np.array([0.5, 1.0, 2.0])
    assert travel_times(x, v) == pytest.approx([0.0, 50 * 0.5 * (2 + 1), 75 + 70 * 0.5 * (1 + 0.5)])
    with pytest.raises(InputError, match="velocity"):
        travel_times(x, [0.5, 0.0, 1.0])


@pytest.mark.parametrize("area, field", [
    (SubArea("A", -1.0, 0.5, 300.0, StationRange(0, 0)), "sub_areas[0].area"),
    (SubArea("A", 1.0e4, 1.2, 300.0, StationRange(0, 0)), "sub_areas[0].runoff_coefficient"),
    (SubArea("A", 1.0e4, 0.0, 300.0, StationRange(0, 0)), "sub_areas[0].runoff_coefficient"),
    (SubArea("A", 1.0e4, 0.5, 300.0, StationRange(0, 500)), "sub_areas[0].to_station"),
    (SubArea("A", 1.0e4, 0.5, 300.0, StationRange(100, 50)), "sub_areas[0].to_station"),
])
def test_bad_sub_areas_are_refused_naming_them(area, field):
    with pytest.raises(InputError) as err:
        split_sub_areas(layout(), [area])
    assert err.value.field == field


def test_a_duration_beyond_the_rainfall_table_is_refused():
    lay = layout()
    area = SubArea("A", 1.0e4, 0.5, 9000.0, StationRange(0.0, 0.0))
    with pytest.raises(InputError):
        peak_flows(lay, split_sub_areas(lay, [area]), [], np.zeros(lay.x.size), IDF, 10.0, 300.0)


def _peak_by_hand(lay, pieces, tau, idf, t_min):
    """The module's rule, point by point (HEC-22, 3rd ed., Section 3.2: the time of concentration of a point is
    the longest arrival there; each shorter arrival time D is tried with the C A arrived by then): the pieces
    joined at the point, their arrival t_c + tau(x) - tau(x_e), sorted, and the largest i(max(D, t_min)) x C A."""
    flow, ca, whole = np.zeros(lay.x.size), np.zeros(lay.x.size), np.zeros(lay.x.size)
    for i in range(lay.x.size):
        arrivals = sorted((pieces.tc[p] + tau[i] - tau[pieces.origin[p]], pieces.ca[p])
                          for p in range(pieces.ca.size) if pieces.join[p] <= i)
        if not arrivals:
            continue
        total, best = 0.0, 0.0
        for d, a in arrivals:
            total += a
            best = max(best, float(idf.intensity(np.array([max(d, t_min)]), 10.0)[0]) * total)
        flow[i], ca[i], whole[i] = best, total, arrivals[-1][0]
    return flow, ca, whole


class _SameRainfall:
    """The table's intensities, from an object that does not say they fall with duration (every arrival read)."""

    def __init__(self, table):
        self.table = table

    def intensity(self, duration, return_period):
        return self.table.intensity(duration, return_period)


@pytest.mark.parametrize("seed", range(6))
def test_many_pieces_give_the_flow_of_the_rule_point_by_point(seed):
    """Invented runs with up to a few hundred pieces (the search takes them in blocks): the flow, C A and time of
    concentration at every point are those of the rule worked point by point, with a relation that falls with
    duration (blocks that cannot hold the peak are skipped) and one that does not say so (all are read)."""
    rng = np.random.default_rng(seed)
    length = rng.uniform(300.0, 1500.0)
    areas = []
    for k in range(int(rng.integers(3, 25))):
        a = rng.uniform(0.0, length)
        b = a if rng.random() < 0.4 else min(length, a + rng.uniform(0.0, length / 2))
        areas.append(SubArea(f"a{k}", rng.uniform(1e3, 3e4), rng.uniform(0.2, 0.9), rng.uniform(120.0, 3000.0),
                             StationRange(a, b)))
    lay = layout(length, rng.uniform(3.0, 8.0), [s for a in areas for s in (a.entry.start, a.entry.end)])
    pieces = split_sub_areas(lay, areas)
    tau = np.concatenate([[0.0], np.cumsum(np.diff(lay.x) / rng.uniform(0.2, 2.0, lay.x.size - 1))])
    flow, ca, whole = _peak_by_hand(lay, pieces, tau, IDF, 300.0)
    assert pieces.ca.size > 32                 # more pieces than one block of the search
    for idf in (IDF, _SameRainfall(IDF)):
        state = peak_flows(lay, pieces, [], tau, idf, 10.0, 300.0)
        assert state.flow == pytest.approx(flow, rel=1e-12)
        assert state.ca == pytest.approx(ca, rel=1e-12)
        assert state.whole_duration == pytest.approx(whole, rel=1e-12)
