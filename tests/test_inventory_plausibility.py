"""An inventory whose numbers look typed in the other unit system is warned about, one whose columns disagree on
it is refused unless checked (app.inventory.plausibility),
in the result of the check and in `ditchwright batch`; impossible values are still refused row by row.

The inventories are invented. The usual ranges are the program's own allowance (common practice, see
app.inventory.plausibility.USUAL); the factors between the systems are exact by definition (1 ft = 0.3048 m,
so 1 ft^3/s = 0.3048^3 m^3/s).
"""

from __future__ import annotations

import pytest

from app import inventory as ai
from app.inventory.plausibility import USUAL, units_finding
from app.main import main
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

HEADER = "id,shape,bottom_width,left_slope,right_slope,diameter,slope,flow,lining,d50,n\n"
#: Invented reaches as typed in feet and ft^3/s (widths 2 to 4 ft, a 1.5 ft pipe, 6 to 30 ft^3/s).
IN_FEET = HEADER + ("A,trapezoid,3,3,3,,0.01,12,,,0.03\n"
                    "B,trapezoid,4,3,3,,0.004,30,,,0.035\n"
                    "C,trapezoid,2,2,2,,0.02,6,,,0.03\n"
                    "D,circle,,,,1.5,0.005,8,,,0.013\n")
#: The same kind of reaches as typed in metres and m^3/s (widths 0.6 to 1.2 m, a 0.45 m pipe, 0.15 to 0.8 m^3/s).
IN_METRES = HEADER + ("A,trapezoid,0.9,3,3,,0.01,0.35,,,0.03\n"
                      "B,trapezoid,1.2,3,3,,0.004,0.8,,,0.035\n"
                      "C,trapezoid,0.6,2,2,,0.02,0.15,,,0.03\n"
                      "D,circle,,,,0.45,0.005,0.2,,,0.013\n")


def test_values_read_in_the_system_they_were_typed_in_raise_nothing():
    assert units_finding(ai.parse_inventory(IN_FEET, "us")) is None
    assert units_finding(ai.parse_inventory(IN_METRES, "si")) is None


def test_feet_read_as_metres_are_said_to_look_us_customary_with_the_numbers():
    found = units_finding(ai.parse_inventory(IN_FEET, "si"))
    assert found is not None and (found.chosen, found.other) == ("si", "us")
    # the median flow 10 ft^3/s read as 10 m^3/s is above the usual 8 m^3/s; as ft^3/s it is 0.28 m^3/s
    assert [k.column for k in found.looks] == ["flow"]
    assert found.looks[0].typed == pytest.approx(10.0) and found.looks[0].large
    assert "flows (median 10 m^3/s) are large" in found.text
    assert "usual in US customary units (10 ft^3/s)" in found.text
    # the widths (median 3 ft read as 3 m) are usual either way, so they are not named
    assert "bottom widths" not in found.text


def test_metres_read_as_feet_are_said_to_look_metric():
    found = units_finding(ai.parse_inventory(IN_METRES, "us"))
    assert found is not None and found.other == "si"
    named = {k.column for k in found.looks}
    # median flow 0.275 "ft^3/s" = 0.0078 m^3/s is usual, but the median width 0.9 "ft" = 0.27 m is too, while
    # the diameter 0.45 "ft" = 0.137 m is below the 0.15 m of USUAL: it alone is named, as small
    assert named == {"diameter"}
    assert "diameters (median 0.45 ft) are small" in found.text and "SI (metric) units (0.45 m)" in found.text


MIXED = HEADER + "A,trapezoid,0.4,3,3,,0.01,20,,,0.03\nB,trapezoid,0.5,3,3,,0.01,25,,,0.03\n"


def test_columns_that_disagree_on_their_units_are_a_mixed_finding():
    """Flows look like ft^3/s, widths look like metres: one file cannot be both, so the finding is ``mixed``."""
    inventory = ai.parse_inventory(MIXED, "si")
    low = USUAL["bottom_width"][0]
    assert 0.45 >= low > 0.45 * 0.3048                    # 0.45 m is usual, 0.45 ft is not
    found = units_finding(inventory)
    assert found is not None and found.mixed
    assert [k.column for k in found.looks] == ["flow"] and [k.column for k in found.against] == ["bottom_width"]
    assert "the flows (median 22.5 m^3/s) look typed in US customary units" in found.text
    assert "the bottom widths (median 0.45 m) in SI (metric) units" in found.text
    # one-sided findings are not mixed
    assert not units_finding(ai.parse_inventory(IN_FEET, "si")).mixed


def test_the_batch_command_refuses_a_mixed_inventory_unless_its_units_are_checked(tmp_path, capsys):
    src, dst = tmp_path / "invented-mixed.csv", tmp_path / "out.csv"
    src.write_text(MIXED, encoding="utf-8")
    assert main(["batch", str(src), "-o", str(dst), "--units", "si", "--no-progress"]) == 2
    err = capsys.readouterr().err
    assert "The columns disagree on their units" in err and "--units-checked" in err and "Traceback" not in err
    assert not dst.exists()                                # nothing written
    assert main(["batch", str(src), "-o", str(dst), "--units", "si", "--no-progress", "--units-checked"]) == 0
    assert "warning: The columns disagree" in capsys.readouterr().err
    assert dst.exists()


def test_impossible_values_are_refused_by_the_check_and_left_out_of_the_median():
    text = IN_FEET + "E,trapezoid,-3,3,3,,0.01,0,,,0.03\nF,rectangle,0,,,,0.01,-5,,,0.03\n"
    inventory = ai.parse_inventory(text, "us")
    result = ai.evaluate(inventory, catalogue=SHIPPED)
    assert list(result.verdict[-2:]) == ["invalid", "invalid"]
    assert "bottom_width: must be >= 0" in result.reason[-2] and "flow: must be > 0" in result.reason[-2]
    assert "bottom_width: must be > 0" in result.reason[-1]
    assert units_finding(inventory) is None                # the four good rows are usual in ft, as before


def test_the_batch_command_warns_and_still_writes_the_results(tmp_path, capsys):
    src, dst = tmp_path / "invented.csv", tmp_path / "out.csv"
    src.write_text(IN_FEET, encoding="utf-8")
    assert main(["batch", str(src), "-o", str(dst), "--units", "si", "--no-progress"]) == 0
    err = capsys.readouterr().err
    assert "warning: The flows (median 10 m^3/s) are large" in err and "US customary" in err
    assert dst.exists()
    assert main(["batch", str(src), "-o", str(dst), "--units", "us", "--no-progress"]) == 0
    assert "warning" not in capsys.readouterr().err
