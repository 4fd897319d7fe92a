"""Unit factors against the Pint library's definitions (a general-purpose reference)."""

import pint
import pytest

from hydraulics import units as hu

ureg = pint.UnitRegistry()

PINT_NAMES = {
    "length": ("foot", "meter"), "small_length": ("inch", "millimeter"), "area": ("foot**2", "meter**2"),
    "flow": ("foot**3/second", "meter**3/second"), "velocity": ("foot/second", "meter/second"),
    "shear": ("force_pound/foot**2", "pascal"), "unit_weight": ("force_pound/foot**3", "newton/meter**3"),
    "intensity": ("inch/hour", "millimeter/hour"),
    "volume_per_length": ("foot**3/foot", "meter**3/meter"),
    "surface": ("yard**2", "meter**2"), "volume": ("yard**3", "meter**3"), "mass": ("short_ton", "tonne"),
    "duration": ("minute", "minute"),
}


@pytest.mark.parametrize("quantity", sorted(PINT_NAMES))
def test_factor_matches_pint(quantity):
    us_name, si_name = PINT_NAMES[quantity]
    base = ureg.Quantity(1, si_name).to_base_units().magnitude
    assert hu.US.unit(quantity).factor == pytest.approx(ureg.Quantity(1, us_name).to_base_units().magnitude, rel=1e-12)
    assert hu.SI.unit(quantity).factor == pytest.approx(base, rel=1e-12)


def test_acre_is_the_international_acre():
    # 1 acre = 43,560 ft^2 (international foot); Pint's "acre" is the older U.S. survey acre (2 ppm larger).
    assert hu.US.unit("drainage_area").factor == pytest.approx(ureg.Quantity(43560, "foot**2").to("m**2").magnitude, rel=1e-14)
    assert hu.US.unit("drainage_area").factor == pytest.approx(ureg.Quantity(1, "acre").to("m**2").magnitude, rel=5e-6)
    assert hu.SI.unit("drainage_area").factor == ureg.Quantity(1, "hectare").to("m**2").magnitude


def test_round_trip_and_unknown_system():
    assert hu.US.from_si("flow", hu.US.to_si("flow", 12.5)) == pytest.approx(12.5, rel=1e-15)
    with pytest.raises(hu.InputError, match="'us' or 'si'"):
        hu.system("imperial")
