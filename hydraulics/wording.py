"""Messages whose quantities can be restated in the user's units.

The core words its warnings and notes in its own units, SI. A message made
with :func:`worded` is a plain ``str`` that reads in SI (so it prints, logs
and compares like any text) and also remembers its quantities, so that the
edges of the program (window, sheet, command line) can restate it in US
customary units with :func:`in_units`. Any other text passes through
:func:`in_units` unchanged.

Rounding in sentences: a quantity is written to three significant figures
(:func:`significant`), a rough size ("about 150 mm tall") to whole units of
the system shown, a station to hundredths. Tables round by the decimals of
each value instead (``app.results``, the one rule of the front ends' tables).
"""

from __future__ import annotations

import math
import re

import numpy as np

from .units import SI, UnitSystem

__all__ = ["Worded", "format_quantity", "format_station", "format_value", "in_units", "significant", "worded",
           "worded_sizes"]


def significant(value: float, figures: int = 3) -> str:
    """``value`` to ``figures`` significant figures, no exponent for ordinary values: '0.0512', '123456'."""
    value = float(value)
    if value == 0 or not math.isfinite(value):
        return f"{value:g}"
    digits = max(0, figures - 1 - int(math.floor(math.log10(abs(value)))))
    return f"{value:.{digits}f}"


def format_value(value: float) -> str:
    """Three significant figures, the rounding of every quantity in a sentence."""
    return significant(value, 3)


def format_station(value: float, units: UnitSystem = SI) -> str:
    """A road station [m] as surveyors write it: hundreds of feet in US units ('12+34.56'), kilometres in SI
    ('1+234.56'), to hundredths (common practice)."""
    step = 100.0 if units.key == "us" else 1000.0
    v = float(units.from_si("length", value))
    sign = "-" if v < 0 else ""
    cents = round(abs(v) * 100)
    whole, rest = divmod(cents, round(step * 100))
    width = 5 if units.key == "us" else 6
    return f"{sign}{whole}+{rest / 100:0{width}.2f}"


def format_quantity(value, quantity: str, units: UnitSystem = SI, decimals: int | None = None) -> str:
    """A SI value in ``units`` to three significant figures with its label, e.g. '1.40 lb/ft^2' (to ``decimals``
    decimals where given: a rough size to whole units, '6 in'; or in a format of its own where ``decimals`` is a
    format spec such as ``"g"``, six significant figures for a number a message sets beside a near one); a
    ``"station"`` as a road station ('12+34.56')."""
    if quantity == "station":
        return format_station(value, units)
    v = float(units.from_si(quantity, value))
    label = units.label(quantity)
    text = (format_value(v) if decimals is None else format(v, decimals) if isinstance(decimals, str)
            else f"{v:.{decimals}f}")
    return f"{text} {label}".rstrip()


class Worded(str):
    """A message in SI that can be restated in another unit system (see :func:`worded`)."""

    template: str
    quantities: dict

    def in_units(self, units: UnitSystem) -> str:
        # the message reads in SI as it was made (a name quoting "1.3 mm" keeps its own figures there)
        return str(self) if units.key == SI.key else _fill(self.template, self.quantities, units)


def _fill(template, quantities, units):
    return template.format(**{k: v.in_units(units) if isinstance(v, Worded) else v if isinstance(v, str)
                              else format_quantity(*v[:2], units, *v[2:]) for k, v in quantities.items()})


def worded(template: str, **quantities) -> Worded:
    """The message ``template`` with each ``{name}`` replaced by a quantity given as ``name=(SI value, quantity)``.

    ``quantity`` is a key of the unit systems (``"length"``, ``"small_length"``,
    ``"velocity"``, ``"shear"``, ``"flow"``...). Each value is written to three
    significant figures with its unit label, or to a number of decimals given
    as a third item, ``(SI value, quantity, decimals)``. A ``name="text"`` is put in as
    it is (the same in every unit system), so that quoted sources need no
    escaping; other braces must be doubled, as in :meth:`str.format`.

    >>> w = worded("velocity {v} is below {v_min}", v=(0.3, "velocity"), v_min=(0.6, "velocity"))
    >>> str(w)
    'velocity 0.300 m/s is below 0.600 m/s'
    >>> from hydraulics.units import US
    >>> w.in_units(US)
    'velocity 0.984 ft/s is below 1.97 ft/s'
    >>> worded("from {a}: {w}", a=(365.76, "station"), w=w).in_units(US)
    'from 12+00.00: velocity 0.984 ft/s is below 1.97 ft/s'
    """
    quantities = {k: v if isinstance(v, str) else (float(v[0]), *v[1:]) for k, v in quantities.items()}
    out = Worded(_fill(template, quantities, SI))
    out.template, out.quantities = template, quantities
    return out


def distinct_groups(key):
    """(an index of one member of each distinct value of the int64 array ``key``, in increasing value; the group of
    each element): np.unique's ``return_index`` and ``return_inverse``, except that the member named may be any of
    its group (the callers write one text per group, the same for every member). Where the values span not much
    more than there are elements, as the digits of a batch's numbers usually do, a table of the values present
    stands in for np.unique's sort."""
    size = len(key)
    if size:
        low, high = int(key.min()), int(key.max())
        if high - low < 4 * size + 4096:
            at = key - low
            present = np.zeros(high - low + 1, dtype=bool)
            present[at] = True
            member = np.empty(high - low + 1, dtype=np.intp)
            member[at] = np.arange(size)
            return member[present], (np.cumsum(present, dtype=np.intp) - 1)[at]
    _, first, which = np.unique(key, return_index=True, return_inverse=True)
    return first, which


def printed_alike(values, figures: int = 3, whole_numbers: bool = True):
    """How ``values`` print to ``figures`` significant figures, as group numbers: (groups, clear), int array and
    boolean mask. Values of one group print alike, values of two groups differently; a value within 1e-9 of a
    rounding tie, or not finite, is not ``clear`` (group -1: to be written on its own). ``whole_numbers``: as
    :func:`significant` writes them, no figure dropped left of the point ('1894'); else as "%.3g" does ('1.89e+03').
    Lets a batch write each distinct text once."""
    signed = np.asarray(values, dtype=float)
    v = np.abs(signed)
    with np.errstate(divide="ignore", invalid="ignore"):
        decimals = np.where(v > 0, figures - 1 - np.floor(np.log10(v)), 0.0)
        if whole_numbers:
            decimals = np.maximum(decimals, 0.0)
        scaled = v * 10.0 ** decimals
    whole = np.rint(scaled)
    clear = np.isfinite(scaled) & (np.abs(scaled - whole) < 0.5 - 1e-9)
    groups = np.full(signed.shape, -1, dtype=np.intp)
    # the digits (signed) and the number of decimals tell the text; 1.00 and 1.000 are two texts
    digits, places = np.copysign(whole, signed)[clear], decimals[clear]
    if len(digits) and np.abs(digits).max() < 2.0 ** 40:   # one whole number for each pair: (places, digits)
        widest, fewest = int(np.abs(digits).max()), int(places.min())
        key = (places.astype(np.int64) - fewest) * (2 * widest + 1) + (digits.astype(np.int64) + widest)
        groups[clear] = distinct_groups(key)[1]
    elif len(digits):
        _, groups[clear] = np.unique(digits + 1j * places, return_inverse=True)
    return groups, clear


def restate_each(message: Worded, name: str, values, units: UnitSystem) -> list:
    """``message`` (made by :func:`worded`) in ``units`` once for each SI value of its quantity ``name``, in
    ``values``: the rest of the message is filled once, and only the number is written each time.

    >>> w = worded("velocity {v} is below {v_min}", v=(0.3, "velocity"), v_min=(0.6, "velocity"))
    >>> restate_each(w, "v", [0.1, 0.25], SI)
    ['velocity 0.100 m/s is below 0.600 m/s', 'velocity 0.250 m/s is below 0.600 m/s']
    """
    _, quantity, *rest = message.quantities[name]
    mark = "\x00"      # a character no message holds, where the number goes
    frame = _fill(message.template, {**message.quantities, name: mark}, units)
    return [frame.replace(mark, format_quantity(v, quantity, units, *rest)) for v in values]


def in_units(message, units: UnitSystem) -> str:
    """``message`` restated in ``units`` where it was made by :func:`worded`; any other text as it is."""
    return message.in_units(units) if isinstance(message, Worded) else str(message)


#: A size quoted in millimetres in a name: an optional "about ", a number, and mm (not part of a longer word).
_SIZE_MM = re.compile(r"(?P<about>about )?(?P<value>\d+(?:\.\d+)?) ?mm\b")


def worded_sizes(text: str) -> str:
    """``text`` (a catalogue lining's name) with each size it quotes in millimetres as a quantity, so that
    :func:`in_units` restates it: a rough size ("about 150 mm tall") to whole units, any other to three
    significant figures. It reads in SI as written; a text quoting no size comes back as it is.

    >>> from hydraulics.units import US
    >>> in_units(worded_sizes("Grass, sod-forming, good stand, about 150 mm tall"), US)
    'Grass, sod-forming, good stand, about 6 in tall'
    >>> in_units(worded_sizes("Bare soil, non-cohesive, fine (D75 < 1.3 mm)"), US)
    'Bare soil, non-cohesive, fine (D75 < 0.0512 in)'
    >>> in_units(worded_sizes("Bare soil, non-cohesive, fine (D75 < 1.3 mm)"), SI)
    'Bare soil, non-cohesive, fine (D75 < 1.3 mm)'
    """
    if not _SIZE_MM.search(text):
        return text
    quantities, pieces, at = {}, [], 0
    for k, m in enumerate(_SIZE_MM.finditer(text)):
        pieces.append(text[at:m.start()].replace("{", "{{").replace("}", "}}"))
        size = (float(m["value"]) / 1000.0, "small_length") + ((0,) if m["about"] else ())
        quantities[f"s{k}"] = size
        pieces.append(("about " if m["about"] else "") + f"{{s{k}}}")
        at = m.end()
    pieces.append(text[at:].replace("{", "{{").replace("}", "}}"))
    out = Worded(text)
    out.template, out.quantities = "".join(pieces), quantities
    return out
