"""The quantities of one lining in one channel: lined width, layer thickness and volume, cost per length (SI).

The lining is carried up the whole perimeter to the top of the ditch (``LINED_WIDTH_RULE``, common practice);
the layer volume is the lined width times the catalogue's layer thickness (a thin-layer estimate); the cost is the
user's unit cost per m^2 of lined width or per m^3 of layer, and None where no unit cost is set (never invented).
"""

from __future__ import annotations

from .linings.catalogue import Lining

__all__ = ["LINED_WIDTH_RULE", "lining_quantities", "cost_per_length"]

#: Why a lining with a unit cost per volume gets no cost per length.
_NO_VOLUME = "the unit cost is per volume but the lining has no layer thickness: no cost per length"

LINED_WIDTH_RULE = ("lining carried up the whole perimeter to the top of the ditch (design depth plus freeboard); "
                    "common practice")


def lining_quantities(lining: Lining, section, depth_at_top: float, d50: float | None):
    """Lined width, layer thickness and volume, and cost per length of channel.

    ``depth_at_top`` is the depth the lining reaches [m] (design depth plus freeboard,
    :func:`hydraulics.freeboard.ditch_top`); ``d50`` the user's stone size [m] or None.

    Returns (lined width [m], thickness [m] or None, volume [m^3/m] or None, cost [$/m] or None, notes).
    """
    # the user's D50 (None: the entry's own, with its D100 where the catalogue gives one)
    thickness = lining.layer_thickness(d50) if lining.thickness_data["rule"] == "stone" else lining.layer_thickness()
    thickness = None if thickness is None else float(thickness)
    lined = float(section.wetted_perimeter(depth_at_top))    # the boundary from the invert up to the top
    notes = [LINED_WIDTH_RULE]
    volume = None if thickness is None else lined * thickness
    cost = cost_per_length(lining, lined, volume)
    if cost is None and lining.unit_cost is not None:
        notes.append(_NO_VOLUME)
    return lined, thickness, volume, cost, notes


def cost_per_length(lining: Lining, lined_width, volume):
    """The user's unit cost per length of channel [$/m]: per m^2 times the lined width [m], or per m^3 times the
    layer volume [m^3/m]; None where the entry has no unit cost, or a cost per volume and no layer (``volume``
    None). Takes floats or arrays alike (the batch prices many reaches in one call)."""
    if lining.unit_cost is None:
        return None
    if lining.unit_cost_basis == "area":
        return float(lining.unit_cost) * lined_width
    return None if volume is None else float(lining.unit_cost) * volume
