"""Peak flow from a small drainage area by the rational method, with Kirpich's time of concentration.

Rational method (Kuichling 1889; e.g. FHWA HEC-22, *Urban Drainage Design
Manual*, 3rd ed., 2009, Eq. 3-1):

    Q = C i A        (SI: Q [m^3/s], i [m/s], A [m^2])

The customary form Q = C i A with i in in/h and A in acres gives ft^3/s with a
factor of 1.008 left out (HEC-22 Eq. 3-1 uses K_u = 1.0 in US units and 0.00278
in SI with i in mm/h and A in ha). Here the units are converted exactly, so a
US result is 0.8 % above that customary figure; the difference is far below the
uncertainty of C and i.

Kirpich's formula (Kirpich 1940, *Civil Engineering* 10(6): 362) for the time
of concentration of small rural basins:

    t_c = 0.0078 L^0.77 S^-0.385   (t_c in min, L in ft, S in ft/ft)

which is 0.0195 L^0.77 S^-0.385 with L in metres (the customary constant
converted exactly). The formula and its data range, basins of 1.2 to 112 acres
(0.5 to 45 ha) on slopes of 3 to 10 %, are not verified against a published
text (provenance: ``kirpich``, ``kirpich_range``; HEC-22, 3rd ed., does not
give them in its Chapter 3); outside those ranges the result carries a warning.

The rational method is meant for small areas: HEC-22, 3rd ed., 2009, Section
3.2.2, p. 3-5, applies it only to drainage areas smaller than 80 ha (200 ac)
(provenance: ``rational_area``); local manuals often set a lower limit.
"""

from __future__ import annotations

from . import validate
from .provenance import cite
from .units import ACRE, FOOT

#: Largest area for which the rational method is normally used [m^2] (provenance: ``rational_area``).
RATIONAL_MAX_AREA = 80e4
#: Range of Kirpich's data: areas 1.2 to 112 acres, slopes 3 to 10 % (provenance: ``kirpich_range``).
KIRPICH_AREA_RANGE = (1.2 * ACRE, 112 * ACRE)
KIRPICH_SLOPE_RANGE = (0.03, 0.10)


def rational_flow(runoff_coefficient, intensity, area):
    """Peak discharge Q = C i A [m^3/s].

    Parameters
    ----------
    runoff_coefficient : float
        C [-], 0 < C <= 1.
    intensity : float
        Rainfall intensity for a duration equal to the time of concentration [m/s].
    area : float
        Drainage area [m^2].
    """
    c = validate.number("runoff_coefficient", runoff_coefficient, low=0.0, high=1.0)
    i = validate.positive("intensity", intensity)
    a = validate.positive("area", area)
    return c * i * a


def rational_warnings(area) -> list[str]:
    """Plain-language cautions on the rational method for this drainage area [m^2]."""
    a = validate.positive("area", area)
    if a > RATIONAL_MAX_AREA:
        return [f"drainage area {a / 1e4:.1f} ha is above the {RATIONAL_MAX_AREA / 1e4:.0f} ha usually allowed "
                f"for the rational method ({cite('rational_area')}); use a hydrograph method"]
    return []


def kirpich_time(flow_length, slope):
    """Time of concentration by Kirpich's formula [s].

    Parameters
    ----------
    flow_length : float
        Length of the longest flow path L [m].
    slope : float
        Average slope along it S [m/m].
    """
    length = validate.positive("flow_length", flow_length)
    s = validate.slope(slope, field="flow_path_slope")
    minutes = 0.0078 * (length / FOOT) ** 0.77 * s ** -0.385
    return minutes * 60.0


def kirpich_warnings(slope, area=None) -> list[str]:
    """Cautions when the basin lies outside the data Kirpich's formula came from."""
    notes = []
    lo, hi = KIRPICH_SLOPE_RANGE
    if not lo <= slope <= hi:
        notes.append(f"flow-path slope {slope * 100:.1f} % is outside Kirpich's data (3 to 10 %, "
                     f"{cite('kirpich_range')})")
    if area is not None and not KIRPICH_AREA_RANGE[0] <= area <= KIRPICH_AREA_RANGE[1]:
        notes.append(f"drainage area {area / 1e4:.2f} ha is outside Kirpich's data (0.5 to 45 ha, "
                     f"{cite('kirpich_range')})")
    return notes
