"""Whether an inventory's numbers look typed in the other unit system than the one chosen for it.

An inventory in feet read as metres (or the other way) gives no row a reason to
be refused: 20 ft³/s read as 20 m³/s is a valid flow, only an unusual one for a
roadside ditch. :func:`units_finding` compares the typical value (the median)
of each column with a unit (widths, diameters, flows, D50) against the range
usual for roadside ditches, read in the chosen system and read in the other;
when columns are out of range in the chosen system and in range in the other,
it returns a :class:`UnitsFinding` that says so with the numbers.

Two kinds of finding:
- every column that takes a side looks typed in the other system: a warning
  (the window and the command line show it; the check goes on);
- the columns disagree (flows that look typed in feet beside widths that look
  typed in metres): ``mixed``. One file cannot be in both systems, so the check
  is refused (``ditchwright batch`` writes nothing; the window asks before it
  shows any result) unless the user says the units are right.

Impossible values (a width of 0 or less, a flow of 0...) are refused row by row
by the check itself (hydraulics.many_reaches.screen).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from hydraulics import units as hu

from .reading import Inventory, InventoryError

#: The usual range [SI] of the median of each column for roadside ditches: common practice, this program's own
#: allowance (not from a standard), set wide so that only a factor of about 3.3 (lengths) or 35 (flows) off
#: leaves it. Bottom widths from 0.25 to 4 m (about 0.8 to 13 ft); pipe diameters from 0.15 to 3 m (6 in to
#: 10 ft); flows from 0.003 to 8 m³/s (about 0.1 to 280 ft³/s); stone D50 from 0.02 to 1 m (about 0.8 in to
#: 3.3 ft).
USUAL = {"bottom_width": (0.25, 4.0), "diameter": (0.15, 3.0), "flow": (0.003, 8.0), "d50": (0.02, 1.0)}
#: The quantity of each column (hydraulics.units) and its name in the sentence.
QUANTITY = {"bottom_width": "length", "diameter": "length", "flow": "flow", "d50": "length"}
WORDS = {"bottom_width": "bottom widths", "diameter": "diameters", "flow": "flows", "d50": "D50 sizes"}


class MixedUnits(InventoryError):
    """The inventory's columns disagree on their unit system (a ``mixed`` :class:`UnitsFinding`): refused."""


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
    text: str            # the warning (or refusal), in words with the numbers
    mixed: bool = False  # some columns look typed in the chosen system, others in the other one
    against: tuple = ()  # when mixed: the Look of each column usual only in the chosen system


def other_system(key: str) -> hu.UnitSystem:
    return hu.US if key == hu.SI.key else hu.SI


def units_finding(inventory: Inventory) -> UnitsFinding | None:
    """What says that ``inventory`` was typed in the other unit system, or None when nothing does.

    A column counts when it has at least one positive value; its median read in the chosen system is compared
    with :data:`USUAL`. The finding needs one column out of range in the chosen system and in range in the other,
    A column in range in the chosen system and out of it in the other as well makes the finding ``mixed``.

    >>> from app.inventory.reading import parse_inventory
    >>> rows = "id,shape,bottom_width,left_slope,right_slope,diameter,slope,flow,lining,d50,n\\n"
    >>> rows += "A,trapezoid,3,3,3,,0.01,25,,,0.03\\nB,trapezoid,4,3,3,,0.01,40,,,0.03\\n"
    >>> units_finding(parse_inventory(rows, "us")) is None       # usual in ft and ft³/s
    True
    >>> units_finding(parse_inventory(rows, "si")).other
    'us'
    >>> mixed = "A,trapezoid,0.4,3,3,,0.01,20,,,0.03\\nB,trapezoid,0.5,3,3,,0.01,25,,,0.03\\n"
    >>> units_finding(parse_inventory(rows.splitlines()[0] + "\\n" + mixed, "si")).mixed  # widths in m, flows in ft³/s
    True
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
    if not wrong:
        return None
    right = [k for k in looks if k.chosen_ok and not k.other_ok]
    if right:
        return UnitsFinding(chosen.key, other.key, tuple(wrong), _mixed_sentence(wrong, right, chosen, other),
                            mixed=True, against=tuple(right))
    return UnitsFinding(chosen.key, other.key, tuple(wrong), _sentence(wrong, chosen, other))


def _typed(k: Look, system: hu.UnitSystem) -> str:
    return f"{k.typed:.3g} {system.label(QUANTITY[k.column])}"


def _listed(parts: list) -> str:
    return parts[0] if len(parts) == 1 else ", ".join(parts[:-1]) + " and " + parts[-1]


def _sentence(wrong: list, chosen: hu.UnitSystem, other: hu.UnitSystem) -> str:
    typed = _typed
    sizes = {k.large for k in wrong}
    how = ("large" if True in sizes else "small") if len(sizes) == 1 else "unusual"
    parts = [f"{WORDS[k.column]} (median {typed(k, chosen)}"
             + (f", {'large' if k.large else 'small'})" if how == "unusual" else ")") for k in wrong]
    usual = ", ".join(typed(k, other) for k in wrong)
    return (f"The {_listed(parts)} are {how} for roadside ditches in {chosen.name} units but usual in {other.name} "
            f"units ({usual}): check the units chosen for this inventory.")


def _mixed_sentence(wrong: list, right: list, chosen: hu.UnitSystem, other: hu.UnitSystem) -> str:
    those = _listed([f"{WORDS[k.column]} (median {_typed(k, chosen)})" for k in wrong])
    these = _listed([f"{WORDS[k.column]} (median {_typed(k, chosen)})" for k in right])
    return (f"The columns disagree on their units: the {those} look typed in {other.name} units, the {these} in "
            f"{chosen.name} units. One inventory holds one unit system: check the columns before trusting any "
            f"result.")


__all__ = ["USUAL", "MixedUnits", "UnitsFinding", "units_finding"]
