"""Quantities and cost of one lining stretch of a ditch run.

Along a stretch the lined width (the lined perimeter up to the top of the
lining, design depth plus freeboard, common practice) and the layer volume
per length change from point to point with the flow; both are integrated
along the stretch by the trapezoidal rule between design points, the same
rule the lining schedule prices by (:mod:`hydraulics.lining_schedule`), so
the cost of a stretch is its quantity times the unit cost.

Items by kind of lining (SI: surfaces [m^2], volumes [m^3], masses [kg]):

* every lining: the lined surface;
* rigid (concrete, asphalt): the paving volume (surface x the catalogue's thickness);
* stone: the layer volume (surface x the layer thickness of the catalogue's rule at the stone size used), its
  mass = volume x (1 - porosity) x the stone's specific weight / g, and the filter or geotextile surface
  beneath it (equal to the lined surface; common practice);
* grass and rolled products: the seeded or mat surface, the lined surface with the user's allowance for laps
  and anchor trenches added (none unless the user sets one).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .constants import G

__all__ = ["Quantity", "StretchQuantities", "stretch_quantities", "trapezoid_along"]


@dataclass(frozen=True)
class Quantity:
    item: str          # what it is, in words
    amount: float      # SI
    quantity: str      # hydraulics.units quantity: "surface", "volume" or "mass"


@dataclass(frozen=True)
class StretchQuantities:
    """One stretch: its lining (candidate index and name), stations [m], length [m], items and cost."""

    choice: int
    lining_name: str
    start: float
    end: float
    length: float
    items: tuple
    cost: float

    def amount(self, item: str) -> float:
        for q in self.items:
            if q.item == item:
                return q.amount
        raise KeyError(f"no quantity {item!r} on this stretch; it has: {', '.join(q.item for q in self.items)}")


def trapezoid_along(x, values) -> float:
    """The integral of ``values`` over ``x`` [m] by the trapezoidal rule."""
    x = np.asarray(x, dtype=float)
    v = np.asarray(values, dtype=float)
    return float(np.sum(np.diff(x) * 0.5 * (v[:-1] + v[1:])))


def stretch_quantities(x, lined_width, layer_volume, candidate, *, choice: int, start: float, end: float,
                       mat_allowance: float = 0.0, stone_porosity: float = 0.4) -> StretchQuantities:
    """Quantities and cost of a stretch covering the design points at ``x`` [m along the flow].

    ``lined_width`` [m] and ``layer_volume`` [m^3/m] (NaN where the lining has no layer) at each point, for
    ``candidate`` (a ``hydraulics.ditch_run.Candidate``: its lining and unit cost); ``start``/``end`` its
    stations [m].
    """
    lining = candidate.lining
    surface = trapezoid_along(x, lined_width)
    items = [Quantity("lined surface", surface, "surface")]
    vol = None
    if np.all(np.isfinite(layer_volume)):
        vol = trapezoid_along(x, layer_volume)
    category = lining.category
    if category == "rigid" and vol is not None:
        items.append(Quantity("paving volume", vol, "volume"))
    elif category == "stone" and vol is not None:
        density = float(lining.specific_weight) / G
        items += [Quantity("stone layer volume", vol, "volume"),
                  Quantity("stone mass", vol * (1.0 - stone_porosity) * density, "mass"),
                  Quantity("filter or geotextile surface", surface, "surface")]
    elif category == "gabion" and vol is not None:
        items.append(Quantity("gabion mattress volume", vol, "volume"))
    elif category in ("vegetation", "manufactured"):
        what = "seeded or sodded surface" if category == "vegetation" else "mat surface"
        items.append(Quantity(f"{what} (with {100 * mat_allowance:g} % for laps and anchor trenches)",
                              surface * (1.0 + mat_allowance), "surface"))
    cost = float("nan")
    if candidate.price is not None:
        if lining.unit_cost_basis == "area":
            factor = 1.0 + mat_allowance if category in ("vegetation", "manufactured") else 1.0
            cost = float(candidate.price) * surface * factor
        elif vol is not None:
            cost = float(candidate.price) * vol
    return StretchQuantities(choice=choice, lining_name=lining.name, start=float(start), end=float(end),
                             length=float(abs(end - start)), items=tuple(items), cost=cost)
