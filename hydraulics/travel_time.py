"""Travel time of overland flow by NRCS TR-55: sheet flow and shallow concentrated flow.

TR-55 (USDA Soil Conservation Service, *Urban Hydrology for Small
Watersheds*, Technical Release 55, 2nd ed., June 1986, Chapter 3) splits the
path of runoff into sheet flow, shallow concentrated flow and channel flow.
Each segment's travel time is its length over its average velocity,
Tt = L / (3600 V) in hours (TR-55 Eq. 3-1), and the time of concentration is
their sum (Eq. 3-2). The channel part is left to the ditch run, which knows
its own velocity.

Sheet flow (Manning's kinematic solution, Overton and Meadows 1976), as
printed on TR-55 Appendix D, form 3, line 6:

    Tt = 0.007 (n L)^0.8 / (P2^0.5 s^0.4)

with Tt in hours, n Manning's roughness for sheet flow (TR-55 Table 3-1), L
the flow length in feet, P2 the 2-year 24-hour rainfall in inches and s the
land slope in ft/ft. Here the arguments are SI ([m], [-], [m], [m/m]) and are
converted exactly (1 ft = 0.3048 m, 1 in = 0.0254 m) into that form; the
result is in seconds. The form limits the length: "Flow length, L (total
L < 300 ft)". Later NRCS guidance, the *National Engineering Handbook* Part
630, Chapter 15 (2010), says "Typically, sheet flow occurs for no more than
100 feet before transitioning to shallow concentrated flow (Merkel 2001)" and
gives McCuen and Spiess's limit L = 100 S^0.5 / n (L in ft, its Eq. 15-9);
that text was read as quoted in a public forum thread, see
:mod:`hydraulics.provenance`. :func:`sheet_flow_warnings` words all three.

Shallow concentrated flow: TR-55 reads the average velocity off Figure 3-1 for
paved and unpaved surfaces; the equations behind the figure (TR-55 Appendix F)
are taken as V = 16.1345 s^0.5 (unpaved) and V = 20.3282 s^0.5 (paved), V in
ft/s. Those two numbers have NOT been read in a stored copy of TR-55 (they
are marked so wherever cited); they agree within 0.2 % with the velocity-slope
coefficients k = 0.491 (unpaved) and 0.619 m/s (paved area) of V = k Sp^0.5
(Sp in percent) printed in the City of San Luis Obispo's *SLO Creek Drainage
Design Manual* (2003), Equation 3 and Table 4-2, which the tests check.

What FHWA HEC-22 (3rd ed., 2009) restates of these relations, and in which
section, was not found in the stored copies searched.

Examples
--------
>>> round(sheet_flow_time(30.48, 0.15, 0.0889, 0.02) / 3600, 4)  # 100 ft, n 0.15, 3.5 in, 2 %: hours
0.1561
>>> round(shallow_concentrated_velocity(0.01, "unpaved") / 0.3048, 3)  # ft/s
1.613
"""

from __future__ import annotations

import math

import numpy as np

from . import validate
from .errors import InputError
from .provenance import cite
from .units import FOOT, HOUR, INCH
from .wording import worded

__all__ = ["SHEET_FLOW_MAX_LENGTH", "SHEET_FLOW_USUAL_LENGTH", "SHALLOW_FLOW_COEFFICIENTS", "SURFACES",
           "sheet_flow_time", "sheet_flow_warnings", "sheet_flow_length_limit", "shallow_concentrated_velocity",
           "shallow_concentrated_time"]

#: TR-55 (1986) Appendix D form 3: "total L < 300 ft" [m] (provenance: ``tr55_sheet_length``).
SHEET_FLOW_MAX_LENGTH = 300 * FOOT
#: NEH Part 630 Ch. 15 (2010): sheet flow "typically ... no more than 100 feet" [m] (``neh630_sheet_length``).
SHEET_FLOW_USUAL_LENGTH = 100 * FOOT
#: V = k s^0.5 with V in ft/s, s in ft/ft, TR-55 Figure 3-1 / Appendix F (``tr55_shallow_velocity``, not verified).
SHALLOW_FLOW_COEFFICIENTS = {"unpaved": 16.1345, "paved": 20.3282}
SURFACES = tuple(SHALLOW_FLOW_COEFFICIENTS)

#: Largest roughness accepted for sheet flow [-]: common practice (a bound on typing errors, above any surface of
#: TR-55 Table 3-1, whose values were not read here).
MAX_SHEET_ROUGHNESS = 1.0


def _roughness(value):
    return validate.number("roughness", value, low=0.0, high=MAX_SHEET_ROUGHNESS,
                           hint=" (Manning's n for sheet flow, TR-55 Table 3-1)")


def sheet_flow_time(length, roughness, rain_2yr_24h, slope):
    """Travel time of sheet flow [s] by TR-55's simplified Manning kinematic solution.

    Tt = 0.007 (n L)^0.8 / (P2^0.5 s^0.4) hours with L in ft and P2 in inches
    (TR-55, 1986, Chapter 3; Appendix D form 3, line 6), the arguments converted
    exactly from SI.

    Parameters
    ----------
    length : float or ndarray
        Length of sheet flow L [m].
    roughness : float or ndarray
        Manning's n for sheet flow (TR-55 Table 3-1) [-], 0 < n <= 1.
    rain_2yr_24h : float or ndarray
        2-year, 24-hour rainfall depth P2 [m].
    slope : float or ndarray
        Land slope s [m/m].

    Returns
    -------
    float or ndarray
        Travel time [s].

    Notes
    -----
    TR-55 bases the equation on shallow steady uniform flow, constant rainfall
    excess, a 24-hour rainfall and a minor effect of infiltration. The length
    limits (300 ft on the form of Appendix D, about 100 ft in NEH Part 630 Ch. 15) are
    worded by :func:`sheet_flow_warnings`, not enforced.
    """
    length_ft = validate.positive("length", length) / FOOT
    n = _roughness(roughness)
    p2_in = validate.positive("rain_2yr_24h", rain_2yr_24h) / INCH
    s = validate.slope(slope)
    if validate.is_array(length_ft, n, p2_in, s):
        hours = 0.007 * (n * length_ft) ** 0.8 / (np.sqrt(p2_in) * s ** 0.4)
    else:
        hours = 0.007 * (n * length_ft) ** 0.8 / (math.sqrt(p2_in) * s ** 0.4)
    return hours * HOUR


def sheet_flow_length_limit(slope, roughness):
    """McCuen and Spiess's longest sheet flow L = 100 S^0.5 / n (L in ft), returned in metres [m].

    NRCS *National Engineering Handbook* Part 630, Chapter 15 (2010), Eq. 15-9
    (as quoted, see :mod:`hydraulics.provenance`, key ``neh630_sheet_length``).
    """
    s = validate.slope(slope)
    n = _roughness(roughness)
    root = np.sqrt(s) if validate.is_array(s, n) else math.sqrt(s)
    return 100.0 * root / n * FOOT


def sheet_flow_warnings(length, roughness=None, slope=None) -> list:
    """Cautions on the length of a sheet-flow segment [m], in words (SI; see :mod:`hydraulics.wording`).

    * beyond 300 ft (91.4 m), TR-55 Appendix D form 3's limit: the segment should be
      split, the rest being shallow concentrated flow;
    * beyond 100 ft (30.5 m), where NEH Part 630 Ch. 15 (2010) says sheet flow
      typically ends;
    * beyond McCuen and Spiess's 100 S^0.5 / n ft (NEH Part 630 Eq. 15-9), when
      ``roughness`` and ``slope`` are given.
    """
    L = validate.positive("length", length)
    if not isinstance(L, float):
        raise InputError("length", "must be one length (a number), got an array")
    notes = []
    if L > SHEET_FLOW_MAX_LENGTH:
        notes.append(worded("sheet-flow length {length} is beyond the {limit} TR-55 allows ({source}); treat the "
                            "rest of the path as shallow concentrated flow", length=(L, "length"),
                            limit=(SHEET_FLOW_MAX_LENGTH, "length"), source=cite("tr55_sheet_length")))
    elif L > SHEET_FLOW_USUAL_LENGTH:
        notes.append(worded("sheet-flow length {length} is beyond the {limit} after which sheet flow typically "
                            "becomes shallow concentrated flow ({source}); TR-55 (1986) allowed up to {max}",
                            length=(L, "length"), limit=(SHEET_FLOW_USUAL_LENGTH, "length"),
                            source=cite("neh630_sheet_length"), max=(SHEET_FLOW_MAX_LENGTH, "length")))
    if roughness is not None and slope is not None:
        limit = sheet_flow_length_limit(slope, roughness)
        if L > limit:
            notes.append(worded("sheet-flow length {length} is beyond McCuen and Spiess's limit 100 S^0.5/n = "
                                "{limit} for this slope and roughness ({source})", length=(L, "length"),
                                limit=(limit, "length"), source=cite("neh630_sheet_length")))
    return notes


def shallow_concentrated_velocity(slope, surface):
    """Average velocity of shallow concentrated flow [m/s] for a ``"paved"`` or ``"unpaved"`` surface.

    V = 16.1345 s^0.5 (unpaved) or 20.3282 s^0.5 (paved), V in ft/s, the
    relations behind TR-55 (1986) Figure 3-1 (Appendix F; not yet verified
    against a copy of TR-55, see :mod:`hydraulics.provenance`, key
    ``tr55_shallow_velocity``).

    Parameters
    ----------
    slope : float or ndarray
        Watercourse slope s [m/m].
    surface : str
        ``"paved"`` or ``"unpaved"``.
    """
    try:
        k = SHALLOW_FLOW_COEFFICIENTS[surface]
    except (KeyError, TypeError):
        raise InputError("surface", f"must be one of {', '.join(repr(s) for s in SURFACES)}, got {surface!r}") \
            from None
    s = validate.slope(slope)
    root = np.sqrt(s) if isinstance(s, np.ndarray) else math.sqrt(s)
    return k * root * FOOT


def shallow_concentrated_time(length, slope, surface):
    """Travel time of shallow concentrated flow [s]: Tt = L / V (TR-55 Eq. 3-1, in seconds).

    Parameters
    ----------
    length : float or ndarray
        Flow length L [m].
    slope : float or ndarray
        Watercourse slope s [m/m].
    surface : str
        ``"paved"`` or ``"unpaved"`` (see :func:`shallow_concentrated_velocity`).
    """
    L = validate.positive("length", length)
    return L / shallow_concentrated_velocity(slope, surface)
