"""Unit systems for the edges of the program (forms, command line, files, sheets).

The core computes in SI. These exact factors convert at the edges:
1 ft = 0.3048 m and 1 lb = 0.45359237 kg exactly (international yard and pound
agreement, 1959; NIST Special Publication 811, 2008 ed., Appendix B.8), standard
gravity 9.80665 m/s^2 for the pound-force.

The tests check every factor against the Pint library's unit definitions.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .errors import InputError

FOOT = 0.3048                       # m
INCH = FOOT / 12                    # m
SQUARE_FOOT = FOOT ** 2             # m^2
CUBIC_FOOT = FOOT ** 3              # m^3
ACRE = 43560 * SQUARE_FOOT          # m^2, international acre; the older U.S. survey acre is 2 ppm larger
HECTARE = 1.0e4                     # m^2
POUND_FORCE = 0.45359237 * 9.80665  # N
PSF = POUND_FORCE / SQUARE_FOOT     # Pa per lb/ft^2
PCF = POUND_FORCE / CUBIC_FOOT      # N/m^3 per lb/ft^3
MILLIMETRE = 1e-3                   # m
HOUR = 3600.0                       # s
MINUTE = 60.0                       # s
YARD = 3 * FOOT                     # m
SHORT_TON = 2000 * 0.45359237       # kg (2,000 lb)
TONNE = 1000.0                      # kg


@dataclass(frozen=True)
class Unit:
    label: str        # what the user sees, e.g. "ft^3/s"
    factor: float     # SI value of one of these units


@dataclass(frozen=True)
class UnitSystem:
    """A named set of display units, one per physical quantity."""

    key: str
    name: str
    units: dict

    def unit(self, quantity: str) -> Unit:
        try:
            return self.units[quantity]
        except KeyError:
            raise InputError("quantity", f"unknown quantity {quantity!r}; known: {', '.join(sorted(self.units))}") from None

    def label(self, quantity: str) -> str:
        return self.unit(quantity).label

    def to_si(self, quantity: str, value):
        """Value in this system's unit -> SI (float or ndarray)."""
        f = self.unit(quantity).factor
        return value * f if isinstance(value, (int, float)) else np.asarray(value, dtype=float) * f

    def from_si(self, quantity: str, value):
        """SI value -> this system's unit."""
        f = self.unit(quantity).factor
        return value / f if isinstance(value, (int, float)) else np.asarray(value, dtype=float) / f


_DIMENSIONLESS = {"slope", "ratio", "froude", "manning_n", "side_slope"}

US = UnitSystem("us", "US customary", {
    "length": Unit("ft", FOOT),
    "small_length": Unit("in", INCH),
    "area": Unit("ft^2", SQUARE_FOOT),
    "flow": Unit("ft^3/s", CUBIC_FOOT),
    "velocity": Unit("ft/s", FOOT),
    "shear": Unit("lb/ft^2", PSF),
    "unit_weight": Unit("lb/ft^3", PCF),
    "slope": Unit("ft/ft", 1.0),
    "drainage_area": Unit("ac", ACRE),
    "intensity": Unit("in/h", INCH / HOUR),
    "volume_per_length": Unit("ft^3/ft", SQUARE_FOOT),
    "cost_per_length": Unit("$/ft", 1 / FOOT),
    "surface": Unit("yd^2", YARD ** 2),        # quantities of lining work: surface laid
    "volume": Unit("yd^3", YARD ** 3),         # quantities: volume placed
    "mass": Unit("ton", SHORT_TON),            # quantities: stone delivered (short ton, 2,000 lb)
    "cost": Unit("$", 1.0),
    "duration": Unit("min", MINUTE),
    "side_slope": Unit("H:V", 1.0),
    "manning_n": Unit("", 1.0),
    "ratio": Unit("", 1.0),
})

SI = UnitSystem("si", "SI (metric)", {
    "length": Unit("m", 1.0),
    "small_length": Unit("mm", MILLIMETRE),
    "area": Unit("m^2", 1.0),
    "flow": Unit("m^3/s", 1.0),
    "velocity": Unit("m/s", 1.0),
    "shear": Unit("Pa", 1.0),
    "unit_weight": Unit("N/m^3", 1.0),
    "slope": Unit("m/m", 1.0),
    "drainage_area": Unit("ha", HECTARE),
    "intensity": Unit("mm/h", MILLIMETRE / HOUR),
    "volume_per_length": Unit("m^3/m", 1.0),
    "cost_per_length": Unit("$/m", 1.0),
    "surface": Unit("m^2", 1.0),
    "volume": Unit("m^3", 1.0),
    "mass": Unit("t", TONNE),
    "cost": Unit("$", 1.0),
    "duration": Unit("min", MINUTE),
    "side_slope": Unit("H:V", 1.0),
    "manning_n": Unit("", 1.0),
    "ratio": Unit("", 1.0),
})

SYSTEMS = {"us": US, "si": SI}


def system(key: str) -> UnitSystem:
    """The unit system ``"us"`` or ``"si"``; anything else is refused."""
    try:
        return SYSTEMS[key]
    except (KeyError, TypeError):
        raise InputError("units", f"must be 'us' or 'si', got {key!r}") from None
