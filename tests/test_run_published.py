"""Flow accumulating down a run, against a published worked example of the rational method.

Source: V. M. Ponce, *Engineering Hydrology: Principles and Practices*, Prentice Hall, 1989 (online edition),
Chapter 4, Table 4-2, "Summary of computations illustrating application of the rational method to storm-sewer
design", transcribed in tests/data/rational_accumulation_example.toml (inputs and printed answers, with the
source's key). The main line (line 1, manholes 1-6 to 1-1) is taken as the run: each area increment enters at
the upper manhole of its section with the example's inlet time of 20.0 min; lines 3 and 2 join at manholes 1-3
and 1-2 as sub-areas whose own time is their printed arrival time there (21.1 + 1.1 and 20.0 + 1.4 min); the
travel time down line 1 is the printed flow time of each section. The printed time to the upper end of each
section (the longest arrival time) must come out to the printed tenth of a minute, and the printed runoff
within 0.4 % once the customary form's factor is taken out: the example writes Q = C i A with i in in/h and A in
acres as ft^3/s, leaving out 1 ac in/h = 1.0083 ft^3/s, which the program keeps (the conversion is exact); the
0.3 % left is the rounding of the printed average C, as the transcription notes.
"""

import tomllib
from pathlib import Path

import numpy as np
import pytest

from hydraulics.run_inflow import SubArea, peak_flows, split_sub_areas
from hydraulics.run_layout import RunLayout, StationRange
from hydraulics.units import ACRE, CUBIC_FOOT, FOOT, INCH

DATA = tomllib.loads((Path(__file__).parent / "data" / "rational_accumulation_example.toml").read_text())
SECTIONS = {(s["from"], s["to"]): s for s in DATA["section"]}
MAIN = [SECTIONS[k] for k in [("1-6", "1-5"), ("1-5", "1-4"), ("1-4", "1-3"), ("1-3", "1-2"), ("1-2", "1-1"),
                              ("1-1", "Out-fall")]]
LINE3 = SECTIONS[("3-1", "1-3")]
LINE2 = SECTIONS[("2-1", "1-2")]
IN_PER_H = INCH / 3600.0
CUSTOMARY_FACTOR = ACRE * IN_PER_H / CUBIC_FOOT      # 1 ac x 1 in/h in ft^3/s, 1.00833


class PrintedRainfall:
    """The rainfall the example prints for each time (its column 10), read between them on log-log axes (held
    beyond the last, which only the run's end below manhole 1-1, not checked, reaches)."""

    def __init__(self):
        pairs = sorted({(s["time_to_upper_end_min"] * 60.0, s["rainfall_in_per_h"] * IN_PER_H)
                        for s in DATA["section"]})
        self.t = np.log([p[0] for p in pairs])
        self.i = np.log([p[1] for p in pairs])

    def intensity(self, duration, return_period):
        d = np.log(np.asarray(duration, float))
        assert np.all(d >= self.t[0] - 1e-9), "no time in the example is below the inlet time"
        return np.exp(np.interp(d, self.t, self.i))


def _run():
    x = np.arange(len(MAIN)) * 400.0 * FOOT            # the manholes 1-6 .. 1-1, 400 ft apart
    end = x[-1] + MAIN[-1]["length_ft"] * FOOT
    layout = RunLayout([0.0, end], [10.0, 9.0], outfall_station=end, spacing=400.0 * FOOT)
    cum_ca = [s["runoff_coefficient"] * s["area_total_ac"] * ACRE for s in MAIN]
    branch = {3: (LINE3, LINE3["time_to_upper_end_min"] + LINE3["flow_time_in_section_min"]),
              4: (LINE2, LINE2["time_to_upper_end_min"] + LINE2["flow_time_in_section_min"])}
    areas, before = [], 0.0
    for k, s in enumerate(MAIN):
        if k in branch:
            line, minutes = branch[k]
            ca = line["runoff_coefficient"] * line["area_total_ac"] * ACRE
            areas.append(SubArea(f"line joining at {s['from']}", line["area_total_ac"] * ACRE,
                                 line["runoff_coefficient"], minutes * 60.0, StationRange(x[k], x[k])))
            before += ca
        increment = s["area_increment_ac"] * ACRE
        areas.append(SubArea(f"increment at {s['from']}", increment, (cum_ca[k] - before) / increment, 20.0 * 60.0,
                             StationRange(x[k], x[k])))
        before = cum_ca[k]
    flow_minutes = np.cumsum([0.0] + [s["flow_time_in_section_min"] for s in MAIN[:-1]])
    tau = np.append(flow_minutes * 60.0, flow_minutes[-1] * 60.0 + MAIN[-1]["length_ft"] /
                    MAIN[-1]["design_velocity_fps"])
    return layout, areas, tau, x


def test_the_time_of_concentration_at_each_manhole_is_the_longest_arrival():
    layout, areas, tau, x = _run()
    assert np.allclose(layout.x[:-1], x)
    state = peak_flows(layout, split_sub_areas(layout, areas), [], tau, PrintedRainfall(), 10.0, 0.0)
    for k, s in enumerate(MAIN):
        assert state.whole_duration[k] / 60.0 == pytest.approx(s["time_to_upper_end_min"], abs=0.051), s["from"]


def test_the_runoff_at_each_manhole_matches_the_printed_total():
    layout, areas, tau, _ = _run()
    state = peak_flows(layout, split_sub_areas(layout, areas), [], tau, PrintedRainfall(), 10.0, 0.0)
    for k, s in enumerate(MAIN):
        assert not state.partial[k], s["from"]       # the whole area governs here, as the example takes it
        assert state.ca[k] / ACRE == pytest.approx(s["runoff_coefficient"] * s["area_total_ac"], rel=1e-9)
        customary = state.flow[k] / CUBIC_FOOT / CUSTOMARY_FACTOR
        assert customary == pytest.approx(s["total_runoff_cfs"], rel=0.004), s["from"]
