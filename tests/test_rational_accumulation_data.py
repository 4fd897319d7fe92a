"""The transcription of a published rational-method run (tests/data/rational_accumulation_example.toml) holds together.

Source: V. M. Ponce, Engineering Hydrology: Principles and Practices (1989; online edition, San Diego State
University), Chapter 4, Table 4-2, "Summary of computations illustrating application of the rational method to
storm-sewer design". These checks use only the printed numbers and the arithmetic the table's key states, so a
mistyped cell shows up here before the ditch-run test relies on it.
"""

import tomllib
from pathlib import Path

import pytest

DATA = Path(__file__).parent / "data" / "rational_accumulation_example.toml"


@pytest.fixture(scope="module")
def sections():
    with DATA.open("rb") as f:
        data = tomllib.load(f)
    assert "Table 4-2" in data["source"]["place"]
    return {s["from"]: s for s in data["section"]}


def _upstream(sections, manhole):
    return [s for s in sections.values() if s["to"] == manhole]


def test_areas_add_up_down_the_run(sections):
    for s in sections.values():
        above = sum(u["area_total_ac"] for u in _upstream(sections, s["from"]))
        assert s["area_total_ac"] == pytest.approx(above + s["area_increment_ac"], abs=0.006), s["from"]


def test_the_time_at_a_junction_is_the_longest_of_the_arriving_times(sections):
    for s in sections.values():
        arriving = [u["time_to_upper_end_min"] + u["flow_time_in_section_min"] for u in _upstream(sections, s["from"])]
        expected = max(arriving) if arriving else 20.0                      # head sections start at the inlet time
        assert s["time_to_upper_end_min"] == pytest.approx(expected, abs=0.051), s["from"]


def test_flow_time_is_length_over_design_velocity(sections):
    for s in sections.values():
        if "flow_time_in_section_min" in s:
            minutes = s["length_ft"] / s["design_velocity_fps"] / 60
            assert s["flow_time_in_section_min"] == pytest.approx(minutes, abs=0.051), s["from"]


def test_runoff_is_c_times_i_times_a(sections):
    for s in sections.values():
        per_acre = s["runoff_coefficient"] * s["rainfall_in_per_h"]
        assert s["runoff_cfs_per_ac"] == pytest.approx(per_acre, abs=0.006), s["from"]
        assert s["total_runoff_cfs"] == pytest.approx(s["runoff_cfs_per_ac"] * s["area_total_ac"], rel=0.004), \
            s["from"]


def test_the_rainfall_falls_as_the_time_grows(sections):
    pairs = sorted((s["time_to_upper_end_min"], s["rainfall_in_per_h"]) for s in sections.values())
    assert all(i1 >= i2 for (_, i1), (_, i2) in zip(pairs, pairs[1:]))
    assert len(sections) == 9 and sections["1-1"]["total_runoff_cfs"] == 53.20
