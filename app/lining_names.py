"""The name a catalogue lining is shown by: grass heights and stone sizes in the user's units. No Qt here.

One wording for the window's lining list, its comparison and the comparison
of the sheet and the command line (:mod:`app.comparison_table`).
"""

from __future__ import annotations

import re

from hydraulics.units import UnitSystem
from hydraulics.wording import in_units, worded_sizes

from .results import ResultField, format_value

STONE_SIZE = ResultField("d50", "D50", "small_length", 1)       # to a tenth, as in the results panel
_GRASS_HEIGHT = ResultField("stem_height", "height", "small_length", 0)
_HEIGHT_WORDS = re.compile(r"about [0-9.]+ ?mm tall")


def lining_label(lin, units: UnitSystem, d50: float | None = None, size: bool = True, name: str | None = None,
                 decimal_mark: str = ".") -> str:
    """The name shown for a catalogue lining: grass heights and stone sizes in ``units``
    (``d50`` [m] for a stone size other than the catalogue's; ``size`` False leaves the stone size out, for a
    list with its own stone-size field; ``name`` instead of the catalogue's; ``decimal_mark`` the window's)."""
    name = lin.name if name is None else name
    height = (lin.data.get("roughness") or {}).get("stem_height")
    if height and _HEIGHT_WORDS.search(name):
        name = _HEIGHT_WORDS.sub(f"about {format_value(height, _GRASS_HEIGHT, units, decimal_mark)} tall", name)
    name = name_in_units(name, units)              # any other size the name quotes (D75 < 1.3 mm)
    if size and lin.category == "stone" and (d50 or lin.d50):
        name += f", D50 {stone_size_text(d50 or lin.d50, units, decimal_mark)}"
    if lin.user_data and "user data" not in name:
        name += " (your data)"
    return name


def stone_size_text(d50: float, units: UnitSystem, decimal_mark: str = ".") -> str:
    """A stone size in ``units`` by the results panel's rule (to a tenth of a mm or an inch), with its unit."""
    return format_value(d50, STONE_SIZE, units, decimal_mark)


def name_in_units(name: str, units: UnitSystem) -> str:
    """``name`` with each size it quotes in millimetres restated in ``units`` (as it is in SI), by the core's one
    wording of sizes in a name (:func:`hydraulics.wording.worded_sizes`: a rough size to whole units).

    >>> from hydraulics.units import US, SI
    >>> name_in_units("Grass, sod-forming, good stand, about 150 mm tall", US)
    'Grass, sod-forming, good stand, about 6 in tall'
    >>> name_in_units("Bare soil, non-cohesive, fine (D75 < 1.3 mm)", US)
    'Bare soil, non-cohesive, fine (D75 < 0.0512 in)'
    >>> name_in_units("Bare soil, non-cohesive, fine (D75 < 1.3 mm)", SI)
    'Bare soil, non-cohesive, fine (D75 < 1.3 mm)'
    """
    return in_units(worded_sizes(name), units)
