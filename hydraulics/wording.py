"""Messages whose quantities can be restated in the user's units.

The core words its warnings and notes in its own units, SI. A message made
with :func:`worded` is a plain ``str`` that reads in SI (so it prints, logs
and compares like any text) and also remembers its quantities, so that the
edges of the program (window, sheet, command line) can restate it in US
customary units with :func:`in_units`. Any other text passes through
:func:`in_units` unchanged.
"""

from __future__ import annotations

import math

from .units import SI, UnitSystem

__all__ = ["Worded", "format_quantity", "format_station", "format_value", "in_units", "worded"]


def format_value(value: float) -> str:
    """Three significant figures, no exponent for ordinary values."""
    if value == 0 or not math.isfinite(value):
        return f"{value:g}"
    digits = max(0, 2 - int(math.floor(math.log10(abs(value)))))
    return f"{value:.{digits}f}"


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


def format_quantity(value, quantity: str, units: UnitSystem = SI) -> str:
    """A SI value in ``units`` to three significant figures with its label, e.g. '1.40 lb/ft^2'; a ``"station"``
    as a road station ('12+34.56')."""
    if quantity == "station":
        return format_station(value, units)
    v = units.from_si(quantity, value)
    label = units.label(quantity)
    return f"{format_value(float(v))} {label}".rstrip()


class Worded(str):
    """A message in SI that can be restated in another unit system (see :func:`worded`)."""

    template: str
    quantities: dict

    def in_units(self, units: UnitSystem) -> str:
        return _fill(self.template, self.quantities, units)


def _fill(template, quantities, units):
    return template.format(**{k: v.in_units(units) if isinstance(v, Worded) else v if isinstance(v, str)
                              else format_quantity(v[0], v[1], units) for k, v in quantities.items()})


def worded(template: str, **quantities) -> Worded:
    """The message ``template`` with each ``{name}`` replaced by a quantity given as ``name=(SI value, quantity)``.

    ``quantity`` is a key of the unit systems (``"length"``, ``"small_length"``,
    ``"velocity"``, ``"shear"``, ``"flow"``...). Each value is written to three
    significant figures with its unit label. A ``name="text"`` is put in as
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
    quantities = {k: v if isinstance(v, str) else (float(v[0]), v[1]) for k, v in quantities.items()}
    out = Worded(_fill(template, quantities, SI))
    out.template, out.quantities = template, quantities
    return out


def in_units(message, units: UnitSystem) -> str:
    """``message`` restated in ``units`` where it was made by :func:`worded`; any other text as it is."""
    return message.in_units(units) if isinstance(message, Worded) else str(message)
