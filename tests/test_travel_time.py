"""Travel time of overland flow by NRCS TR-55 (hydraulics.travel_time).

Sources named beside each check:
* the sheet-flow equation Tt = 0.007 (n L)^0.8 / (P2^0.5 s^0.4) (hours, ft, in) and its limit "total L < 300 ft":
  TR-55, 2nd ed., June 1986, Appendix D form 3 (p. D-3), lines 3 and 6, read in scanned copies;
* Tt = L / (3600 V): TR-55 (1986) Eq. 3-1;
* the 100-ft sentence, McCuen and Spiess's limit L = 100 S^0.5 / n and its Table 15-2: NRCS National Engineering
  Handbook Part 630, Chapter 15 (2010), Eq. 15-9 and Table 15-2, as quoted in a public forum thread;
* shallow concentrated flow: the velocity-slope coefficients k = 0.491 (unpaved) and 0.619 m/s (paved area) of
  V = Ku k Sp^0.5 (Ku = 1.0 in SI, Sp in percent), City of San Luis Obispo, SLO Creek Drainage Design Manual,
  February 2003, Equation 3 and Table 4-2, page 26.
Not found in the stored copies searched, hence not tested here: TR-55 Example 3-1 with its Appendix D form, the TR-55
Table 3-1 roughness values, the Appendix F equations of Figure 3-1 themselves (16.1345 and 20.3282 are marked not
verified), and HEC-22's restatement of these relations with its examples.
"""

import numpy as np
import pytest

from hydraulics import InputError
from hydraulics import provenance as pv
from hydraulics.travel_time import (SHEET_FLOW_MAX_LENGTH, SHEET_FLOW_USUAL_LENGTH, shallow_concentrated_time,
                                    shallow_concentrated_velocity, sheet_flow_length_limit, sheet_flow_time,
                                    sheet_flow_warnings)
from hydraulics.units import FOOT, INCH, US

# -- sheet flow ---------------------------------------------------------------------------------------------------


@pytest.mark.parametrize("length_ft, n, p2_in, s", [      # any inputs (not TR-55 Table 3-1 values, not read)
    (100.0, 0.2, 3.6, 0.01),
    (300.0, 0.015, 2.5, 0.005),
    (50.0, 0.35, 4.2, 0.08),
    (150.0, 0.6, 3.0, 0.2),
])
def test_sheet_flow_in_si_is_the_appendix_d_equation_in_feet_and_inches(length_ft, n, p2_in, s):
    # TR-55 (1986) Appendix D form 3, line 6: Tt = 0.007 (nL)^0.8 / (P2^0.5 s^0.4) hours, L in ft, P2 in inches.
    hours = 0.007 * (n * length_ft) ** 0.8 / (p2_in ** 0.5 * s ** 0.4)
    seconds = sheet_flow_time(length_ft * 0.3048, n, p2_in * 0.0254, s)
    assert seconds == pytest.approx(hours * 3600.0, rel=1e-12)


def test_sheet_flow_scales_with_its_exponents():
    # Same source: (nL)^0.8, P2^-0.5, s^-0.4.
    base = sheet_flow_time(25.0, 0.15, 0.09, 0.02)
    assert sheet_flow_time(50.0, 0.15, 0.09, 0.02) / base == pytest.approx(2 ** 0.8, rel=1e-12)
    assert sheet_flow_time(25.0, 0.30, 0.09, 0.02) / base == pytest.approx(2 ** 0.8, rel=1e-12)
    assert sheet_flow_time(25.0, 0.15, 0.36, 0.02) / base == pytest.approx(4 ** -0.5, rel=1e-12)
    assert sheet_flow_time(25.0, 0.15, 0.09, 0.04) / base == pytest.approx(2 ** -0.4, rel=1e-12)


def test_sheet_flow_takes_arrays():
    lengths = np.array([10.0, 30.0, 60.0])
    out = sheet_flow_time(lengths, 0.2, 0.09, np.array([0.01, 0.02, 0.03]))
    assert out.shape == (3,)
    assert out == pytest.approx([sheet_flow_time(L, 0.2, 0.09, s) for L, s in zip(lengths, (0.01, 0.02, 0.03))],
                                rel=1e-13)


@pytest.mark.parametrize("args, field", [
    ((0.0, 0.2, 0.09, 0.01), "length"),
    ((30.0, 0.0, 0.09, 0.01), "roughness"),
    ((30.0, 1.5, 0.09, 0.01), "roughness"),
    ((30.0, 0.2, -0.09, 0.01), "rain_2yr_24h"),
    ((30.0, 0.2, 0.09, 0.0), "slope"),
    ((30.0, 0.2, 0.09, 2.0), "slope"),
])
def test_sheet_flow_refuses_bad_input_naming_the_field(args, field):
    with pytest.raises(InputError) as err:
        sheet_flow_time(*args)
    assert err.value.field == field


def test_the_sheet_flow_limits_are_those_read():
    # TR-55 (1986) Appendix D form 3, line 3: "total L < 300 ft"; NEH 630 Ch. 15: "no more than 100 feet".
    assert SHEET_FLOW_MAX_LENGTH == pytest.approx(300 * 0.3048, rel=1e-15)
    assert SHEET_FLOW_USUAL_LENGTH == pytest.approx(100 * 0.3048, rel=1e-15)


@pytest.mark.parametrize("cover, n, s, length_ft", [
    # NEH Part 630 Ch. 15 (2010), Table 15-2, maximum sheet flow lengths by the McCuen-Spiess criterion (as quoted);
    # lengths printed to the foot (12.5 to the half foot).
    ("range", 0.13, 0.01, 77), ("grass", 0.41, 0.01, 24), ("woods", 0.80, 0.01, 12.5),
    ("range", 0.13, 0.05, 172), ("grass", 0.41, 0.05, 55), ("woods", 0.80, 0.05, 28),
])
def test_mccuen_spiess_lengths_of_neh_630_table_15_2(cover, n, s, length_ft):
    assert sheet_flow_length_limit(s, n) / FOOT == pytest.approx(length_ft, abs=0.51)


def test_sheet_flow_warnings_say_which_limit_is_passed():
    assert sheet_flow_warnings(25.0) == []                                   # under 100 ft
    usual = sheet_flow_warnings(50.0)                                        # 164 ft
    assert len(usual) == 1 and "30.5 m" in usual[0] and pv.cite("neh630_sheet_length") in usual[0]
    assert "100 ft" in usual[0].in_units(US)
    beyond = sheet_flow_warnings(100.0)                                      # 328 ft
    assert len(beyond) == 1 and "91.4 m TR-55 allows" in beyond[0] and pv.cite("tr55_sheet_length") in beyond[0]
    assert "shallow concentrated flow" in beyond[0]
    # McCuen-Spiess: grass n = 0.41 on 1 % allows 100 (0.01)^0.5 / 0.41 = 24.4 ft (7.43 m)
    short = sheet_flow_warnings(10.0, roughness=0.41, slope=0.01)
    assert len(short) == 1 and "McCuen and Spiess" in short[0] and "7.43 m" in short[0]
    assert sheet_flow_warnings(7.0, roughness=0.41, slope=0.01) == []
    with pytest.raises(InputError, match="length"):
        sheet_flow_warnings(-1.0)


# -- shallow concentrated flow --------------------------------------------------------------------------------------

@pytest.mark.parametrize("surface, k", [("unpaved", 0.491), ("paved", 0.619)])
def test_shallow_velocity_agrees_with_a_published_velocity_slope_table(surface, k):
    # SLO Creek Drainage Design Manual (2003), Eq. 3 and Table 4-2: V = Ku k Sp^0.5, V in m/s, Sp in percent.
    slopes = np.array([0.002, 0.005, 0.01, 0.03, 0.08, 0.2])
    published = k * np.sqrt(slopes * 100)
    assert shallow_concentrated_velocity(slopes, surface) == pytest.approx(published, rel=2e-3)


def test_shallow_velocity_goes_with_the_root_of_the_slope_and_paved_is_faster():
    v1 = shallow_concentrated_velocity(0.01, "unpaved")
    assert shallow_concentrated_velocity(0.04, "unpaved") == pytest.approx(2 * v1, rel=1e-13)
    assert shallow_concentrated_velocity(0.01, "paved") > v1
    assert isinstance(v1, float)


def test_shallow_time_is_length_over_velocity():
    # TR-55 (1986) Eq. 3-1, Tt = L / (3600 V) in hours: here in seconds.
    L, s = np.array([120.0, 300.0]), 0.015
    t = shallow_concentrated_time(L, s, "paved")
    assert t == pytest.approx(L / shallow_concentrated_velocity(s, "paved"), rel=1e-14)
    assert shallow_concentrated_time(426.72, 0.01, "unpaved") == pytest.approx(1400 / 1.61345, rel=1e-12)


def test_shallow_flow_refuses_an_unknown_surface_listing_the_known():
    with pytest.raises(InputError, match=r"surface: must be one of 'unpaved', 'paved', got 'gravel'"):
        shallow_concentrated_velocity(0.01, "gravel")
    with pytest.raises(InputError, match="length"):
        shallow_concentrated_time(0.0, 0.01, "paved")
    with pytest.raises(InputError, match="slope"):
        shallow_concentrated_time(10.0, -0.01, "paved")


def test_what_is_read_and_what_is_not_is_marked():
    for key in ("tr55_travel_time", "tr55_sheet_flow", "tr55_sheet_length", "neh630_sheet_length"):
        assert pv.entry(key).verified, key
    assert pv.cite("tr55_shallow_velocity").endswith(pv.NOT_VERIFIED_MARK)
    assert FOOT == 0.3048 and INCH == pytest.approx(0.0254, rel=1e-15)
