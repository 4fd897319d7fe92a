"""Rainfall intensity-duration-frequency relations (hydraulics.rainfall): an IDF table and the fitted formula.

Sources named beside each check:
* the formula's form i = a / (t + b)^c: TxDOT Hydraulic Design Manual (online), Chapter 4, Section 12, Eq. 4-21
  (I = b / (tc + d)^e, I in in./hr, tc in min), and Campos et al. (2020), Water 12(10): 2730 (i = a / (b + td)^c);
* the depth i t of such a formula peaks at td = b / (c - 1) when c > 1: Campos et al. (2020), abstract;
* reading a table between durations along a power law (a straight line on log-log axes): common practice.
No published IDF table or formula with a value read from it in a worked example was found in the stored copies
searched (HEC-22 3rd ed. Chapter 3 was not among them); the coefficients below are invented and say so.
"""

import json
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from hydraulics import InputError
from hydraulics import provenance as pv
from hydraulics.rainfall import IdfFormula, IdfTable, idf_from_dict
from hydraulics.units import SI, US

MIN = 60.0
MMH = SI.to_si("intensity", 1.0)    # one mm/h [m/s]
INH = US.to_si("intensity", 1.0)    # one in/h [m/s]

# An invented table (mm/h) for 5 to 60 minutes and 2, 10 and 100 years.
DURATIONS = [5 * MIN, 10 * MIN, 15 * MIN, 30 * MIN, 60 * MIN]
PERIODS = [2, 10, 100]
CELLS_MMH = [[120.0, 170.0, 240.0],
             [95.0, 135.0, 190.0],
             [80.0, 115.0, 160.0],
             [55.0, 80.0, 115.0],
             [35.0, 52.0, 75.0]]


def invented_table():
    return IdfTable(DURATIONS, PERIODS, np.array(CELLS_MMH) * MMH)


# -- the table: a power law is read back exactly (common practice: straight lines on log-log axes) ----------------

@settings(max_examples=60, deadline=None)
@given(k=st.floats(1e-4, 1e-2), m=st.floats(0.2, 1.2),
       steps=st.lists(st.floats(1.1, 4.0), min_size=1, max_size=6),
       start=st.floats(60.0, 1800.0), where=st.floats(0.0, 1.0))
def test_a_power_law_is_reproduced_between_table_points(k, m, steps, start, where):
    t = [start]
    for ratio in steps:
        t.append(t[-1] * ratio)
    scales = [1.0, 1.4, 2.1]                             # three return periods, each a multiple of the first
    cells = [[s * k * ti ** -m for s in scales] for ti in t]
    table = IdfTable(t, [2, 10, 100], cells)
    d = t[0] * (t[-1] / t[0]) ** where                   # anywhere from the first to the last duration
    for col, s in enumerate(scales):
        expected = s * k * d ** -m
        assert table.intensity(d, [2, 10, 100][col]) == pytest.approx(expected, rel=1e-12)
    many = np.geomspace(t[0], t[-1], 7)
    assert table.intensity(many, 10) == pytest.approx(1.4 * k * many ** -m, rel=1e-12)


def test_scalar_and_array_paths_agree_and_keep_their_types():
    table = invented_table()
    d = np.array([[5.0, 7.5], [22.0, 60.0]]) * MIN
    out = table.intensity(d, 10)
    assert isinstance(out, np.ndarray) and out.shape == (2, 2)
    singles = [table.intensity(float(x), 10) for x in d.ravel()]
    assert all(type(v) is float for v in singles)
    assert out.ravel() == pytest.approx(singles, rel=1e-13)
    # at the table's own durations the table's own values come back
    assert table.intensity(np.array(DURATIONS), 100) / MMH == pytest.approx([r[2] for r in CELLS_MMH], rel=1e-12)
    assert table.intensity(np.int64(900), np.float64(2.0)) / MMH == pytest.approx(80.0, rel=1e-12)


def test_the_table_is_read_between_durations_along_the_power_law_through_its_neighbours():
    table = invented_table()
    # 20 min lies between 15 min (115 mm/h) and 30 min (80 mm/h) for 10 years: i = 115 (20/15)^(log(80/115)/log 2)
    m = math.log(80 / 115) / math.log(2)
    assert table.intensity(20 * MIN, 10) / MMH == pytest.approx(115 * (20 / 15) ** m, rel=1e-12)
    assert 80 < table.intensity(20 * MIN, 10) / MMH < 115


def test_return_period_matches_within_a_relative_1e_9():
    table = invented_table()
    assert table.intensity(10 * MIN, 10 * (1 + 1e-10)) == table.intensity(10 * MIN, 10)
    with pytest.raises(InputError, match="return periods the IDF table gives"):
        table.intensity(10 * MIN, 10 * (1 + 1e-6))


# -- the table: what it refuses, and what the refusals say --------------------------------------------------------

def test_a_duration_outside_the_table_is_refused_giving_it_and_the_range_in_minutes():
    table = invented_table()
    with pytest.raises(InputError, match=r"duration: 3 min is below the shortest duration the IDF table covers "
                                         r"\(5 min to 60 min\); it is not extrapolated"):
        table.intensity(3 * MIN, 10)
    with pytest.raises(InputError, match=r"duration: 90 min is above the longest duration the IDF table covers "
                                         r"\(5 min to 60 min\)"):
        table.intensity(np.array([10.0, 90.0]) * MIN, 10)
    with pytest.raises(InputError, match="duration"):
        table.intensity(0.0, 10)


def test_an_unknown_return_period_is_refused_listing_the_tables():
    with pytest.raises(InputError, match=r"return_period: must be one of the return periods the IDF table gives "
                                         r"\(2, 10, 100 years\), got 25 years"):
        invented_table().intensity(20 * MIN, 25)


def test_an_intensity_that_does_not_fall_with_duration_is_refused_naming_the_cell_and_both_values():
    cells = [row[:] for row in CELLS_MMH]
    cells[2][1] = 140.0                                   # 15 min, 10 years: above the 10-minute 135 mm/h
    with pytest.raises(InputError) as err:
        IdfTable(DURATIONS, PERIODS, np.array(cells) * MMH)
    assert err.value.field == "rainfall.intensities[2][1]"
    assert "140 mm/h at 15 min is not below 135 mm/h at 10 min (10 years)" in str(err.value)
    cells[2][1] = 135.0                                   # equal is not a fall either
    with pytest.raises(InputError, match=r"rainfall.intensities\[2\]\[1\]: 135 mm/h at 15 min is not below"):
        IdfTable(DURATIONS, PERIODS, np.array(cells) * MMH)


def test_an_intensity_that_falls_as_the_return_period_rises_is_refused():
    cells = [row[:] for row in CELLS_MMH]
    cells[3][2] = 78.0                                    # 30 min, 100 years below 80 mm/h of 10 years
    with pytest.raises(InputError) as err:
        IdfTable(DURATIONS, PERIODS, np.array(cells) * MMH)
    assert err.value.field == "rainfall.intensities[3][2]"
    assert "78.0 mm/h for 100 years is below 80.0 mm/h for 10 years (30 min)" in str(err.value)
    # restated in US units for a form that shows in/h (78 / 25.4 = 3.07, 80 / 25.4 = 3.15; 1 in = 25.4 mm)
    from hydraulics.units import US
    from hydraulics.wording import in_units
    assert in_units(err.value.message, US).startswith("3.07 in/h for 100 years is below 3.15 in/h for 10 years")
    cells[3][2] = 80.0                                    # equal intensities for two return periods are allowed
    IdfTable(DURATIONS, PERIODS, np.array(cells) * MMH)


@pytest.mark.parametrize("durations, periods, cells, field", [
    ([600.0], [10], [[1e-5]], "rainfall.durations"),                         # fewer than two durations
    ([600.0, 600.0], [10], [[2e-5], [1e-5]], "rainfall.durations[1]"),       # not increasing
    ([600.0, -1.0], [10], [[2e-5], [1e-5]], "rainfall.durations[1]"),
    ([600.0, 1200.0], [10, 5], [[2e-5, 3e-5], [1e-5, 2e-5]], "rainfall.return_periods[1]"),
    ([600.0, 1200.0], [10], [[2e-5, 1e-5]], "rainfall.intensities"),         # wrong shape
    ([600.0, 1200.0], [10], [[2e-5], [float("nan")]], "rainfall.intensities[1][0]"),
    ([600.0, 1200.0], [10], [[2e-5], [0.0]], "rainfall.intensities[1][0]"),
])
def test_malformed_tables_are_refused_naming_the_field(durations, periods, cells, field):
    with pytest.raises(InputError) as err:
        IdfTable(durations, periods, cells)
    assert err.value.field == field


def test_a_table_whose_rainfall_depth_falls_with_duration_is_flagged():
    # Campos et al. (2020): the depth i t of a consistent IDF relation does not fall as the duration grows.
    assert invented_table().warnings() == []
    bad = IdfTable([10 * MIN, 20 * MIN], [10], [[100 * MMH], [45 * MMH]])   # 16.7 mm in 10 min, 15 mm in 20 min
    notes = bad.warnings()
    assert len(notes) == 1
    assert "rainfall depth falls from 16.7 mm in 10 min to 15.0 mm in 20 min" in notes[0]
    assert "0.591 in" in notes[0].in_units(US)


# -- the formula ---------------------------------------------------------------------------------------------------

# Invented coefficients, written as published forms are: t and b in minutes, i in mm/h or in/h.
CUSTOMARY_SI = {2: (1000.0, 8.0, 0.75), 10: (1500.0, 10.0, 0.78), 100: (2400.0, 12.0, 0.8)}
CUSTOMARY_US = {10: (60.0, 10.0, 0.8), 25: (70.0, 11.0, 0.8)}


@pytest.mark.parametrize("units, coefficients", [("si", CUSTOMARY_SI), ("us", CUSTOMARY_US)])
def test_from_customary_and_back_give_the_published_numbers(units, coefficients):
    formula = IdfFormula.from_customary(coefficients, units)
    back = formula.customary(units)
    assert list(back) == sorted(coefficients)
    for period, abc in coefficients.items():
        assert back[period] == pytest.approx(abc, rel=1e-13)


@pytest.mark.parametrize("units, system", [("si", SI), ("us", US)])
def test_the_customary_form_evaluates_as_published(units, system):
    # TxDOT HDM Ch. 4 Sec. 12 Eq. 4-21: I = b / (tc + d)^e with tc in minutes (coefficients invented).
    coefficients = CUSTOMARY_SI if units == "si" else CUSTOMARY_US
    formula = IdfFormula.from_customary(coefficients, units)
    for period, (b, d, e) in coefficients.items():
        for tc in (5.0, 12.5, 30.0, 60.0):
            published = b / (tc + d) ** e                  # mm/h or in/h
            assert system.from_si("intensity", formula.intensity(tc * MIN, period)) == pytest.approx(published,
                                                                                                    rel=1e-12)


def test_the_same_rain_in_mm_and_in_inches_gives_the_same_intensity():
    mm = IdfFormula.from_customary({10: (1524.0, 10.0, 0.8)}, "si")
    inch = IdfFormula.from_customary({10: (60.0, 10.0, 0.8)}, "us")        # 1524 mm = 60 in exactly
    d = np.array([5.0, 15.0, 45.0]) * MIN
    assert mm.intensity(d, 10) == pytest.approx(inch.intensity(d, 10), rel=1e-13)
    assert mm.coefficients[10] == pytest.approx(inch.coefficients[10], rel=1e-13)
    assert mm.coefficients[10][1] == pytest.approx(600.0)                    # b = 10 min = 600 s


@pytest.mark.parametrize("abc, field", [
    ((0.0, 600.0, 0.8), "rainfall.coefficients[10].a"),
    ((-1e-3, 600.0, 0.8), "rainfall.coefficients[10].a"),
    ((1e-3, -1.0, 0.8), "rainfall.coefficients[10].b"),
    ((1e-3, 600.0, 0.0), "rainfall.coefficients[10].c"),
    ((1e-3, float("inf"), 0.8), "rainfall.coefficients[10].b"),
    ((1e-3, 600.0), "rainfall.coefficients[10]"),
])
def test_the_formula_refuses_bad_coefficients(abc, field):
    with pytest.raises(InputError) as err:
        IdfFormula({10: abc})
    assert err.value.field == field


def test_the_formula_refuses_a_return_period_not_given_and_durations_outside_its_range():
    formula = IdfFormula.from_customary(CUSTOMARY_SI, "si", duration_range=(5 * MIN, 120 * MIN))
    with pytest.raises(InputError, match=r"return_period: must be one of the return periods the IDF formula gives "
                                         r"\(2, 10, 100 years\), got 50 years"):
        formula.intensity(10 * MIN, 50)
    with pytest.raises(InputError, match=r"duration: 2 min is below the shortest duration the IDF formula covers "
                                         r"\(5 min to 120 min\); it is not extrapolated"):
        formula.intensity(2 * MIN, 10)
    with pytest.raises(InputError, match="180 min is above the longest duration"):
        formula.intensity(np.array([30.0, 180.0]) * MIN, 10)
    assert formula.duration_range == (300.0, 7200.0)
    assert IdfFormula.from_customary(CUSTOMARY_SI, "si").duration_range is None
    with pytest.raises(InputError, match=r"rainfall.duration_range\[1\]"):
        IdfFormula({10: (1e-3, 600.0, 0.8)}, duration_range=(600.0, 300.0))
    with pytest.raises(InputError, match="units"):
        IdfFormula.from_customary(CUSTOMARY_SI, "metric")


def test_a_formula_whose_depth_peaks_is_flagged_at_b_over_c_minus_1():
    # Campos et al. (2020): for i = a/(b + td)^c with c > 1 the depth i td is largest at td = b/(c - 1).
    formula = IdfFormula.from_customary({10: (5000.0, 20.0, 1.25)}, "si")
    t = np.linspace(1.0, 400.0, 400_001) * MIN
    depth = formula.intensity(t, 10) * t
    assert t[np.argmax(depth)] / MIN == pytest.approx(20.0 / 0.25, abs=1e-3)
    notes = formula.warnings()
    assert len(notes) == 1 and "largest at t = b/(c - 1) = 80 min" in notes[0]
    assert pv.cite("idf_depth_consistency") in notes[0]
    # below the peak over its whole range, or with c <= 1, nothing to say
    assert IdfFormula.from_customary({10: (5000.0, 20.0, 1.25)}, "si", duration_range=(300, 3600)).warnings() == []
    assert IdfFormula.from_customary(CUSTOMARY_SI, "si").warnings() == []


# -- files ---------------------------------------------------------------------------------------------------------

def test_table_and_formula_survive_json_and_dispatch_on_kind():
    table = invented_table()
    formula = IdfFormula.from_customary(CUSTOMARY_US, "us", duration_range=(300.0, 3600.0))
    for idf in (table, formula):
        data = json.loads(json.dumps(idf.to_dict()))
        again = idf_from_dict(data)
        assert type(again) is type(idf) and again == idf
        assert again.intensity(1200.0, 10) == idf.intensity(1200.0, 10)
    assert table.to_dict()["kind"] == "table" and formula.to_dict()["kind"] == "formula"
    assert IdfFormula.from_customary(CUSTOMARY_US, "us").to_dict()["duration_range"] is None


def test_files_that_are_not_an_idf_relation_are_refused_clearly():
    with pytest.raises(InputError, match=r"rainfall.kind: must be one of 'table', 'formula', got 'curve'"):
        idf_from_dict({"kind": "curve"})
    with pytest.raises(InputError, match="rainfall: must be a table"):
        idf_from_dict(["table"])
    data = invented_table().to_dict()
    del data["intensities"]
    with pytest.raises(InputError, match="rainfall.intensities: is missing"):
        idf_from_dict(data)
    with pytest.raises(InputError, match=r"rainfall.coefficients\[0\]: is missing c"):
        idf_from_dict({"kind": "formula", "coefficients": [{"return_period": 10, "a": 1e-3, "b": 600.0}]})
    with pytest.raises(InputError, match="rainfall.kind: must be 'formula' here"):
        IdfFormula.from_dict(data)


def test_the_formula_form_is_cited_as_read():
    assert pv.entry("idf_formula").verified and pv.entry("idf_depth_consistency").verified


def test_durations_and_return_periods_out_of_order_are_refused_in_minutes_and_years():
    with pytest.raises(InputError, match=r"rainfall.durations\[1\]: must be greater than the value before it "
                                         r"\(10 min\), got 5 min"):
        IdfTable([600.0, 300.0], [10], [[2e-5], [1e-5]])
    with pytest.raises(InputError, match=r"rainfall.return_periods\[1\]: must be greater than the value before it "
                                         r"\(10 years\), got 2 years"):
        IdfTable([300.0, 600.0], [10, 2], [[2e-5, 3e-5], [1e-5, 2e-5]])
