"""The inputs of one channel, in one table: where each sits, its label, quantity, allowed range and shapes.

The window's forms, the command line's checks (``calc``, ``compare``) and the
names that messages give the inputs are taken from here. The project schema
(``resources/project.schema.json``) states the same ranges for a file, and the
inventory check screens its reaches in the core (``hydraulics.many_reaches``,
which cannot import the application); ``tests/test_input_table.py`` holds both
to this table, bound by bound. An input's ``name`` is what the core calls it,
which is also its command-line option (``--bottom-width``) and its inventory
column (``bottom_width``): those names are a contract and stay as they are.

Two kinds of range apply to a number. The range here is what the input can
mean at all (a flow > 0, a runoff coefficient in (0, 1]), and what the file
format states. The narrower design range of :data:`hydraulics.validate.LIMITS`
(a flow from 1 mL/s to 10,000 m^3/s) is checked after it, from
:attr:`Input.limit`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from hydraulics import validate as hv
from hydraulics.sections import SHAPE_DIMENSIONS
from hydraulics.units import UnitSystem

NO_UNIT = "–"
_SUPERSCRIPTS = {"2": "²", "3": "³"}


def pretty(text: str) -> str:
    """Unit labels as people write them: "m^3/s" -> "m³/s"."""
    out, i = [], 0
    while i < len(text):
        if text[i] == "^" and i + 1 < len(text) and text[i + 1] in _SUPERSCRIPTS:
            out.append(_SUPERSCRIPTS[text[i + 1]])
            i += 2
        else:
            out.append(text[i])
            i += 1
    return "".join(out)


#: The core's name of an input where it is not the last part of its path.
_CORE_NAMES = {"flow.value": "flow", "manning_n": "n"}


@dataclass(frozen=True)
class Input:
    """One number of a channel and what it may be (SI)."""

    path: str                   # where it sits in a channel, e.g. "slope", "section.bottom_width"
    label: str
    quantity: str = ""          # hydraulics.units quantity, "" for a pure number
    low: float | None = 0.0
    low_inclusive: bool = False
    high: float | None = None
    high_inclusive: bool = True
    optional: bool = False      # empty means "not given"
    tip: str = ""
    unit_text: str = ""         # the unit of a pure number ("H : 1V"); NO_UNIT when empty
    shapes: tuple = ()          # the section shapes that take it; () for an input of every channel
    in_words: str = ""          # how a message names it ("Design flow must be > 0"); the label when empty

    @property
    def name(self) -> str:
        """The core's name of the input: also its command-line option and its inventory column."""
        return _CORE_NAMES.get(self.path, self.path.rsplit(".", 1)[-1])

    @property
    def words(self) -> str:
        """The input as a message names it: its label without the symbol ("Design flow", not "Design flow Q")."""
        return self.in_words or self.label

    @property
    def limit(self) -> hv.Limit | None:
        """The design range of the input (hydraulics.validate.LIMITS), checked after :meth:`holds`."""
        return hv.limit_for(self.name)

    def suffix(self, units: UnitSystem) -> str:
        """The unit shown beside a value in ``units``."""
        if self.quantity:
            return pretty(units.label(self.quantity))
        return self.unit_text or NO_UNIT

    def to_si(self, value: float, units: UnitSystem) -> float:
        return float(units.to_si(self.quantity, value)) if self.quantity else value

    def from_si(self, value: float, units: UnitSystem) -> float:
        return float(units.from_si(self.quantity, value)) if self.quantity else value

    def holds(self, value: float) -> bool:
        """True when ``value`` [SI] lies within the range (NaN and the infinities do not)."""
        if not math.isfinite(value):
            return False
        low, high = self.low, self.high
        return not (low is not None and (value < low or (value == low and not self.low_inclusive))
                    or high is not None and (value > high or (value == high and not self.high_inclusive)))

    def allowed(self, units: UnitSystem, *, plain: bool = False) -> str:
        """The range in words, in ``units``: "> 0 ft³/s", "> 0 and ≤ 1 (or empty)".

        ``plain``: as a command line or a results file says it ("> 0 and <= 1"): ASCII signs, no unit, no
        word about an empty entry.
        """
        if plain:
            signs, unit = (">=", ">", "<=", "<"), ""
        else:
            signs = ("≥", ">", "≤", "<")
            unit = "" if not self.quantity or self.quantity == "slope" else f" {pretty(units.label(self.quantity))}"
        parts = []
        if self.low is not None:
            parts.append(f"{signs[0] if self.low_inclusive else signs[1]} {self.from_si(self.low, units):g}{unit}")
        if self.high is not None:
            parts.append(f"{signs[2] if self.high_inclusive else signs[3]} {self.from_si(self.high, units):g}{unit}")
        text = " and ".join(parts) if parts else "any number"
        return text + (" (or empty)" if self.optional and not plain else "")

    def percent_hint(self, shown: float) -> str:
        """For a slope typed above its highest ratio, the percentage it looks like ("" otherwise)."""
        if self.quantity == "slope" and self.high is not None and shown > self.high:
            return f"; if you meant {shown:g} %, enter {shown / 100:g}"
        return ""


F = Input
FLOW = F("flow.value", "Design flow Q", "flow", tip="Design discharge", in_words="Design flow")
RUNOFF_COEFFICIENT = F("flow.runoff_coefficient", "Runoff coefficient C", "", 0.0, False, 1.0, True,
                       tip="Fraction of the rainfall that runs off, 0 < C <= 1")
RATIONAL = (
    RUNOFF_COEFFICIENT,
    F("flow.intensity", "Rainfall intensity i", "intensity",
      tip="Intensity for a storm lasting the time of concentration", in_words="Rainfall intensity"),
    F("flow.area", "Drainage area A", "drainage_area", in_words="Drainage area"),
    F("flow.flow_length", "Flow-path length L", "length", optional=True,
      tip="Longest flow path of the basin, for Kirpich's time of concentration (optional)",
      in_words="Flow-path length"),
    F("flow.flow_path_slope", "Flow-path slope", "slope", 0.0, False, hv.MAX_SLOPE, True, optional=True,
      tip="Average slope along that path as a ratio, or a percentage with %"),
)
SLOPE = F("slope", "Bed slope S", "slope", 0.0, False, hv.MAX_SLOPE, True,
          tip="Grade of the ditch as a ratio (0.005), or a percentage with % (0.5 %)", in_words="Bed slope")
MANNING = F("manning_n", "Manning's n", "", 0.0, False, 1.0, True,
            tip="Roughness of the lining, e.g. 0.013 smooth concrete, 0.030 to 0.040 grass or stone")
D50 = F("lining.d50", "Stone size D50", "small_length", optional=True,
        tip="Median stone size of the riprap or gravel; empty for the catalogue's own size")
BEND = F("bend_radius", "Bend radius", "length", optional=True,
         tip="Centre-line radius of the sharpest bend (empty for a straight ditch)")
FREEBOARD = F("min_freeboard", "Minimum freeboard", "length", 0.0, True)

_SIDE = dict(quantity="", low=0.0, low_inclusive=True, unit_text="H : 1V", shapes=("trapezoid", "triangle"))
#: The dimensions of the sections given by numbers (a survey gives its points instead). A trapezoid's bottom
#: width may be 0 (a V bottom), a rectangle's may not, so each is an input of its own.
DIMENSIONS = (
    F("section.bottom_width", "Bottom width b", "length", 0.0, True, shapes=("trapezoid",), in_words="Bottom width"),
    F("section.bottom_width", "Bottom width b", "length", shapes=("rectangle",), in_words="Bottom width"),
    F("section.side_slope", "Side slope", **_SIDE),          # both sides at once (command line, files)
    F("section.left_slope", "Left side slope", **_SIDE),
    F("section.right_slope", "Right side slope", **_SIDE),
    F("section.top_width", "Top width T", "length", shapes=("parabola",), in_words="Top width"),
    F("section.at_depth", "at depth", "length", shapes=("parabola",), tip="Depth at which the top width is measured",
      in_words="Depth of top width"),
    F("section.diameter", "Diameter D", "length", shapes=("circle",), in_words="Diameter"),
)
del F

#: Every input of a channel.
INPUTS = (FLOW, *RATIONAL, SLOPE, *DIMENSIONS, MANNING, D50, BEND, FREEBOARD)

#: Per shape given by numbers, the dimensions it takes (as hydraulics.sections.SHAPE_DIMENSIONS says).
SECTION_INPUTS = {shape: tuple(d for d in DIMENSIONS if shape in d.shapes) for shape in SHAPE_DIMENSIONS}
#: What the section form shows: each side slope on its own line.
SECTION_FIELDS = {shape: tuple(d for d in dims if d.name != "side_slope") for shape, dims in SECTION_INPUTS.items()}


def input_named(name: str, shape: str | None = None) -> Input | None:
    """The input the core calls ``name`` (a command-line option's or inventory column's name), or None; for a
    dimension, that of ``shape`` when it takes it (else that of the first shape that does)."""
    found = [i for i in INPUTS if i.name == name]
    return next((i for i in found if shape in i.shapes), found[0] if found else None)


#: The core's field names (as an InputError names them) -> the input's path (to mark the field an error names).
CORE_TO_PATH = {i.name: i.path for i in INPUTS} | {i.path: i.path for i in INPUTS} | {
    "side_slope": "section.left_slope", "section.side_slope": "section.left_slope", "manning_n": "manning_n"}
