"""A lining's name in the user's units: the sizes a catalogue name quotes, restated.

Catalogue names quote sizes in millimetres ("Grass, sod-forming, good stand,
about 150 mm tall", "Bare soil, non-cohesive, fine (D75 < 1.3 mm)"). Every
place that shows a lining's name in US customary units (the window's lists
and comparison, the design sheet, the ditch-run schedule, the command line)
passes it through :func:`name_in_units`, so that a US session reads inches.
A size written "about ..." is a rough one and reads to whole units, by the
results rule of :mod:`app.results`; any other is restated by
:func:`hydraulics.wording.worded` to three significant figures. In SI the
name is shown as written.
"""

from __future__ import annotations

import re

from hydraulics.units import UnitSystem
from hydraulics.wording import in_units, worded

from .results import ResultField, format_value

#: A size in a name: an optional "about ", a number, and mm (not part of a longer word).
_SIZE = re.compile(r"(?P<about>about )?(?P<value>\d+(?:\.\d+)?) ?mm\b")
#: A rough size ("about 150 mm tall"): to whole units, as the grass heights of the lining list.
_ROUGH = ResultField("size", "size", "small_length", 0)


def name_in_units(name: str, units: UnitSystem) -> str:
    """``name`` with each size it quotes in millimetres restated in ``units`` (as it is in SI).

    >>> from hydraulics.units import US, SI
    >>> name_in_units("Grass, sod-forming, good stand, about 150 mm tall", US)
    'Grass, sod-forming, good stand, about 6 in tall'
    >>> name_in_units("Bare soil, non-cohesive, fine (D75 < 1.3 mm)", US)
    'Bare soil, non-cohesive, fine (D75 < 0.0512 in)'
    >>> name_in_units("Bare soil, non-cohesive, fine (D75 < 1.3 mm)", SI)
    'Bare soil, non-cohesive, fine (D75 < 1.3 mm)'
    """
    if units.key == "si" or not _SIZE.search(name):
        return name
    quantities = {}
    pieces = []
    at = 0
    for k, m in enumerate(_SIZE.finditer(name)):
        pieces.append(name[at:m.start()].replace("{", "{{").replace("}", "}}"))
        metres = float(m["value"]) / 1000.0
        if m["about"]:
            quantities[f"s{k}"] = "about " + format_value(metres, _ROUGH, units)
        else:
            quantities[f"s{k}"] = (metres, "small_length")
        pieces.append(f"{{s{k}}}")
        at = m.end()
    pieces.append(name[at:].replace("{", "{{").replace("}", "}}"))
    return in_units(worded("".join(pieces), **quantities), units)


__all__ = ["name_in_units"]
