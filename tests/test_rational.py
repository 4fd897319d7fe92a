"""Rational method and Kirpich's time of concentration."""

import pytest

from hydraulics import InputError
from hydraulics import units as hu
from hydraulics.rational import kirpich_time, kirpich_warnings, rational_flow, rational_warnings


def test_rational_si_form():
    # HEC-22 (3rd ed., 2009) Eq. 3-1 in SI: Q = 0.00278 C i A, i in mm/h, A in ha (K_u = 1/360).
    c, i_mmh, a_ha = 0.6, 85.0, 3.2
    q = rational_flow(c, hu.SI.to_si("intensity", i_mmh), hu.SI.to_si("drainage_area", a_ha))
    assert q == pytest.approx(c * i_mmh * a_ha / 360, rel=1e-12)
    assert q == pytest.approx(0.00278 * c * i_mmh * a_ha, rel=1e-3)


def test_rational_us_form_differs_by_the_customary_1008():
    # Q = C i A in ft^3/s with i in in/h and A in acres omits 43560/(12*3600) = 1.0083 (HEC-22 Eq. 3-1, K_u = 1.0).
    q = rational_flow(0.5, hu.US.to_si("intensity", 4.0), hu.US.to_si("drainage_area", 10.0))
    assert hu.US.from_si("flow", q) == pytest.approx(0.5 * 4.0 * 10.0 * 43560 / 43200, rel=1e-12)


def test_kirpich_us_and_si_forms_agree():
    # t_c = 0.0078 L^0.77 S^-0.385 (L ft) and 0.0195 L^0.77 S^-0.385 (L m), both as quoted in HEC-22 (3rd ed.).
    length_m, s = 600.0, 0.04
    assert kirpich_time(length_m, s) / 60 == pytest.approx(0.0195 * length_m ** 0.77 * s ** -0.385, rel=2e-3)


def test_kirpich_range_warnings_and_refusals():
    assert kirpich_warnings(0.05, area=10e4) == []
    assert "outside Kirpich" in kirpich_warnings(0.005)[0]
    assert rational_warnings(200e4)
    with pytest.raises(InputError, match="runoff_coefficient"):
        rational_flow(1.4, 1e-5, 1e4)
    with pytest.raises(InputError, match="flow_length"):
        kirpich_time(0.0, 0.05)
