"""Whether an inventory's numbers look typed in the other unit system than the one chosen for it.

An inventory in feet read as metres (or the other way) gives no row a reason to
be refused: 20 ft³/s read as 20 m³/s is a valid flow, only an unusual one for a
roadside ditch. :func:`units_finding` compares the typical value (the median)
of each column with a unit (widths, diameters, flows, D50) against the range
usual for roadside ditches, read in the chosen system and read in the other;
when columns are out of range in the chosen system and in range in the other,
and no column says the opposite, it returns a :class:`UnitsFinding` that says
so with the numbers. It changes nothing: the window and the command line show
it as a warning. Impossible values (a width of 0 or less, a flow of 0...) are
refused row by row by the check itself (hydraulics.many_reaches.screen).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from hydraulics import units as hu

from .reading import Inventory

#: The usual range [SI] of the median of each column for roadside ditches: common practice, this program's own
#: allowance (not from a standard), set wide so that only a factor of about 3.3 (lengths) or 35 (flows) off
#: leaves it. Bottom widths from 0.25 to 4 m (about 0.8 to 13 ft); pipe diameters from 0.15 to 3 m (6 in to
#: 10 ft); flows from 0.003 to 8 m³/s (about 0.1 to 280 ft³/s); stone D50 from 0.02 to 1 m (about 0.8 in to
#: 3.3 ft).
USUAL = {"bottom_width": (0.25, 4.0), "diameter": (0.15, 3.0), "flow": (0.003, 8.0), "d50": (0.02, 1.0)}
#: The quantity of each column (hydraulics.units) and its name in the sentence.
QUANTITY = {"bottom_width": "length", "diameter": "length", "flow": "flow", "d50": "length"}
WORDS = {"bottom_width": "bottom widths", "diameter": "diameters", "flow": "flows", "d50": "D50 sizes"}


@dataclass(frozen=True)
class Look:
    """One column's median, as typed, and where it lies read in each system."""

    column: str
    typed: float         # the median as typed (in the chosen system's unit)
    chosen_ok: bool      # in the usual range read in the chosen system
    other_ok: bool       # in the usual range read in the other system
    large: bool          # above the range in the chosen system (else below, or in it)


@dataclass(frozen=True)
class UnitsFinding:
    """Columns of an inventory that look typed in ``other`` (a unit system key) rather than in ``chosen``."""

    chosen: str
    other: str
    looks: tuple         # the Look of each column out of range in the chosen system
    text: str            # the warning, one sentence with the numbers


def other_system(key: str) -> hu.UnitSystem:
    return hu.US if key == hu.SI.key else hu.SI


def units_finding(inventory: Inventory) -> UnitsFinding | None:
    """What says that ``inventory`` was typed in the other unit system, or None when nothing does.

    A column counts when it has at least one positive value; its median read in the chosen system is compared
    with :data:`USUAL`. The finding needs one column out of range in the chosen system and in range in the other,
    and no column in range in the chosen system and out of it in the other.

    >>> from app.inventory.reading import parse_inventory
    >>> rows = "id,shape,bottom_width,left_slope,right_slope,diameter,slope,flow,lining,d50,n\\n"
    >>> rows += "A,trapezoid,3,3,3,,0.01,25,,,0.03\\nB,trapezoid,4,3,3,,0.01,40,,,0.03\\n"
    >>> units_finding(parse_inventory(rows, "us")) is None       # usual in ft and ft³/s
    True
    >>> units_finding(parse_inventory(rows, "si")).other
    'us'
    """
    chosen = inventory.units
    other = other_system(chosen.key)
    looks = []
    for column, (low, high) in USUAL.items():
        values = np.asarray(getattr(inventory.reaches, column), dtype=float)
        values = values[np.isfinite(values) & (values > 0)]
        if not values.size:
            continue
        quantity = QUANTITY[column]
        typed = float(chosen.from_si(quantity, float(np.median(values))))
        as_chosen = float(chosen.to_si(quantity, typed))
        as_other = float(other.to_si(quantity, typed))
        looks.append(Look(column, typed, low <= as_chosen <= high, low <= as_other <= high, as_chosen > high))
    wrong = [k for k in looks if not k.chosen_ok and k.other_ok]
    if not wrong or any(k.chosen_ok and not k.other_ok for k in looks):
        return None
    return UnitsFinding(chosen.key, other.key, tuple(wrong), _sentence(wrong, chosen, other))


def _sentence(wrong: list, chosen: hu.UnitSystem, other: hu.UnitSystem) -> str:
    def typed(k, system):
        return f"{k.typed:.3g} {system.label(QUANTITY[k.column])}"

    sizes = {k.large for k in wrong}
    how = ("large" if True in sizes else "small") if len(sizes) == 1 else "unusual"
    parts = [f"{WORDS[k.column]} (median {typed(k, chosen)}"
             + (f", {'large' if k.large else 'small'})" if how == "unusual" else ")") for k in wrong]
    listed = parts[0] if len(parts) == 1 else ", ".join(parts[:-1]) + " and " + parts[-1]
    usual = ", ".join(typed(k, other) for k in wrong)
    return (f"The {listed} are {how} for roadside ditches in {chosen.name} units but usual in {other.name} units "
            f"({usual}): check the units chosen for this inventory.")


__all__ = ["USUAL", "UnitsFinding", "units_finding"]
