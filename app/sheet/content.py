"""What one design sheet says, as text in the project's units (no drawing here).

The numbers come from the channel evaluation that the window and the command
line share (:func:`app.evaluate.evaluate_channel`): the uniform flow
(``ChannelDesign.analysis``), the lining check (``ChannelDesign.stability``, a
:class:`hydraulics.stability.StabilityResult`) and the lining comparison
(``ChannelDesign.comparison``). This module only words them in the project's
unit system; the layout module places the strings and the tests read them
back from the PDF. Values are SI in the core and converted only here.

Rounding: every value of the design that the window's results panel shows
(the results, Manning's n used, the shear-check table, the safety factors,
stone sizes and layer thickness, freeboard and depths, quantities and cost)
is printed by the one rule of :data:`app.results.PANEL_FIELDS`, so that it
reads as in the window; the lining comparison is the one table of
:mod:`app.comparison_table`, as in the window and in ``ditchwright compare``.
Inputs echoed, and terms the panel does not show (superelevation, the bend's
factor), keep three significant figures, the rounding the core uses in its own
sentences such as the verdict's reason. The hand check carries four to five
figures, so that a checker can redo it with a calculator.
"""

from __future__ import annotations

import math
import re

import numpy as np
from dataclasses import dataclass

import hydraulics as hy
from hydraulics import provenance
from hydraulics import units as hu
from hydraulics.linings import Catalogue, hec15
from hydraulics.lining_quantities import LINED_WIDTH_RULE
from hydraulics.stability import StabilityResult
from hydraulics.wording import Worded, significant

from .. import __version__
from ..comparison_table import EMPTY, comparison_table
from ..context import Context
from ..verdicts import Verdict, too_shallow_reason
from ..evaluate import ChannelDesign, design_flow, evaluate_channel
from ..lining_names import STONE_SIZE, name_in_units
from ..results import EXTRA_FIELDS, convert, format_value, panel_field, rounded
from .fingerprint import fingerprint

#: Customary Manning constant, (1 m / 1 ft)^(1/3) = 1.4859 (Chow 1959, Sec. 5-6).
K_US = (1 / hu.FOOT) ** (1 / 3)
G_US = hy.G / hu.FOOT  # 32.174 ft/s^2
#: Significant figures of the printed values that the results panel does not show (inputs echoed, bend terms).
FIGURES = 3

CAUTIONS = (
    "Design assistance only: check these results against the governing local drainage code; a licensed "
    "professional engineer is responsible for the design.",
    "Uniform (normal) flow is assumed; backwater, inlets, outlets, transitions and junctions are not analysed.",
)

ORIGIN_WORDS = {"shipped": "shipped entry", "user": "user catalogue entry",
                "user override": "shipped entry changed by the user catalogue"}


def pretty_unit(label: str) -> str:
    """'ft^3/s' -> 'ft³/s', 'm^2' -> 'm²' (the sheet font has the superscripts)."""
    return label.replace("^2", "\u00b2").replace("^3", "\u00b3")


# SI amounts in the core's sentences ("1 Pa", "25 mm", "0.5 m"), for annotating them on a US sheet.
_SI_AMOUNT = re.compile(r"(?<![\w.])(?<!\d )(\d+(?:\.\d+)?)\s(m\^3/s|m/s|mm|m|Pa|N/m\^3)(?![\w^/])")
_SI_QUANTITY = {"m^3/s": "flow", "m/s": "velocity", "mm": "small_length", "m": "length", "Pa": "shear",
                "N/m^3": "unit_weight"}
_SI_FACTOR = {"mm": 1e-3}
_US_AMOUNT_END = re.compile(r"\d\s(ft|in|ft/s|lb/ft\^2|ft\^3/s|lb/ft\^3)\s*$")


def in_units(text: str, units: hu.UnitSystem) -> str:
    """A sentence of the core (worded in SI) for a sheet in ``units``.

    On a US sheet each SI amount gets its US equivalent beside it, "1 Pa"
    -> "1 Pa (0.0209 lb/ft²)", unless the sentence already gives one
    ("0.15 m (0.5 ft)") or the amount is itself the equivalent of a US value
    ("2 ft/s (0.6 m/s)"). A message the core made with
    :func:`hydraulics.wording.worded` is restated in ``units`` instead. Unit
    powers are written as superscripts.
    """
    if isinstance(text, Worded):
        return pretty_unit(text.in_units(units))
    if units.key != "si":
        def annotate(m):
            if text.startswith(" (", m.end()):
                return m.group(0)  # the sentence gives an equivalent already
            before = text[:m.start()]
            opened = before.rfind("(")
            if opened > before.rfind(")") and _US_AMOUNT_END.search(before[:opened]):
                return m.group(0)  # inside the parentheses after a US amount: it is the equivalent
            quantity = _SI_QUANTITY[m.group(2)]
            value = float(m.group(1)) * _SI_FACTOR.get(m.group(2), 1.0)
            return f"{m.group(0)} ({significant(units.from_si(quantity, value), FIGURES)} {units.label(quantity)})"
        text = _SI_AMOUNT.sub(annotate, text)
    return pretty_unit(text)


def sentence(text: str, units: hu.UnitSystem) -> str:
    """A core sentence as a sheet line: in the sheet's units, capital first letter, full stop."""
    text = in_units(text, units).strip()
    text = text[:1].upper() + text[1:]
    return text if text.endswith(".") else text + "."


@dataclass
class Item:
    label: str
    value: str


@dataclass
class CheckRow:
    """One line of the shear-check table, as printed."""

    location: str
    basis: str
    design: str
    permissible: str
    safety_factor: str
    required: str
    result: str


@dataclass
class ComparisonLine:
    """One lining of the comparison table, as printed."""

    lining: str
    n: str
    depth: str
    velocity: str
    froude: str
    design: str
    permissible: str
    safety_factor: str
    verdict: str
    lined_width: str
    layer_volume: str
    cost: str


@dataclass
class ChannelSheet:
    """Everything printed for one channel, and the evaluation it was worded from."""

    project: str
    channel: str
    location: str
    units: hu.UnitSystem
    format: "Formatter"
    fingerprint: str
    version: str
    catalogue: str                  # which lining catalogue the sheet used, in words
    inputs: list                    # Item list
    results: list                   # Item list
    checks: list                    # CheckRow list (empty without a lining)
    lining_items: list              # Item list under the shear checks (stone: Table 6.1, required D50, layer)
    depth_items: list               # Item list: freeboard, bend, total depth, top width, quantities
    verdict: Verdict                # one vocabulary with the window and the batch (app.verdicts)
    verdict_reason: str
    hand_check: list                # lines of text
    comparison: list | None         # ComparisonLine list, or None when there are no alternatives
    comparison_notes: list          # footnotes of the comparison
    comparison_priced: bool         # a cost column is printed
    cautions: list                  # sentences
    sources: list                   # "[1] Manning n: ..." lines the items refer to
    not_verified: str               # the values cited here not yet read in their publication, one paragraph ("" none)
    design: ChannelDesign
    roughness: object               # the n the solver used: a float or a depth-dependent model
    lining_label: str
    thickness: float | None         # [m]


class Formatter:
    """SI value -> text in the chosen unit system, with the unit."""

    def __init__(self, units: hu.UnitSystem):
        self.units = units

    def unit(self, quantity: str) -> str:
        return pretty_unit(self.units.label(quantity))

    def number(self, value_si: float, quantity: str, figures: int = FIGURES) -> str:
        """The value in display units to ``figures`` significant figures."""
        return significant(float(self.units.from_si(quantity, value_si)), figures)

    def __call__(self, value_si: float, quantity: str, figures: int = FIGURES) -> str:
        return f"{self.number(value_si, quantity, figures)} {self.unit(quantity)}"

    def shown(self, value: float, quantity: str, figures: int = FIGURES) -> str:
        """A value already in the display units, as :meth:`__call__` writes it (to ``figures`` figures, its unit)."""
        return f"{significant(float(value), figures)} {self.unit(quantity)}"

    def value(self, value_si: float, key: str) -> str:
        """A value of the design (a key of :data:`app.results.PANEL_FIELDS`) as the window's results panel writes
        it: the one rounding of that value, in the display units, with its unit."""
        return pretty_unit(format_value(value_si, panel_field(key), self.units))

    def shown_value(self, value: float, key: str) -> str:
        """A value already in the display units, as :meth:`value` writes it."""
        field = panel_field(key)
        return f"{rounded(float(value), field)} {self.unit(field.quantity)}".rstrip()

    def rounded(self, value_si, key: str) -> str:
        """A value of the design (a key of :data:`app.results.PANEL_FIELDS`) in the display units, rounded as
        the results panel rounds it, without its unit (for a table whose heading gives the unit)."""
        field = panel_field(key)
        return rounded(convert(value_si, field.quantity, self.units), field)

    def stone(self, value_si: float) -> str:
        """A stone size or layer thickness in mm or inches, to a tenth, as the results panel and the lining
        list write it."""
        return pretty_unit(format_value(value_si, STONE_SIZE, self.units))


def n_text(n: float) -> str:
    """A Manning's n typed or surveyed, as the inputs and the hand check echo it: four significant figures (the
    n used, a result, is printed by the rule of the results panel)."""
    return f"{float(n):.4g}"


def _slope_text(s: float) -> str:
    return f"{significant(s, 3)} ({significant(s * 100, 3)} %)"


def _slope_with_unit(s: float, f: Formatter) -> str:
    return f"{significant(s, 3)} {f.unit('slope')} ({significant(s * 100, 3)} %)"


def _sf(value) -> str:
    """A safety factor (achieved or required) as the results panel rounds it; a dash where there is none."""
    return "\u2014" if value is None else rounded(float(value), panel_field("safety_factor"))


# ------------------------------------------------------------------ inputs
def section_description(section: hy.Section, f: Formatter) -> list:
    """Items describing the section's shape and dimensions."""
    kind = section.kind
    parts = [{"trapezoid": "trapezoid", "triangle": "V-ditch (triangle)", "rectangle": "rectangle",
              "parabola": "parabolic swale", "circle": "circular pipe", "irregular": "surveyed (irregular)"}[kind]]
    if kind in ("trapezoid", "rectangle"):
        parts.append(f"bottom width b {f(section.bottom_width, 'length')}")
    if section.side_slopes is not None and kind != "rectangle":
        z1, z2 = section.side_slopes
        parts.append(f"side slopes {z1:g}H:1V both sides" if z1 == z2 else
                     f"side slopes {z1:g}H:1V left, {z2:g}H:1V right")
    if kind == "parabola":
        parts.append(f"top width {f(section.top_width_ref, 'length')} at depth {f(section.at_depth, 'length')}")
    if kind == "circle":
        parts.append(f"diameter D {f(section.diameter, 'length')}")
    if kind == "irregular":
        parts.append(f"{len(section.stations)} survey points, bank height {f(section.full_depth, 'length')}")
    return [Item("Section", ", ".join(parts))]


def flow_items(design: ChannelDesign, f: Formatter) -> list:
    """Items for the design flow and its basis."""
    basis = design.channel.flow
    q = design.flow
    if basis.method != "rational":
        return [Item("Design flow Q", f"{f.value(q, 'flow')} (typed in the project)")]
    items = [Item("Design flow Q", f"{f.value(q, 'flow')} by the rational method Q = C i A: runoff coefficient C "
                                   f"{basis.runoff_coefficient:.2f}, rainfall intensity i {f(basis.intensity, 'intensity')}, "
                                   f"drainage area A {f(basis.area, 'drainage_area')}")]
    if design.time_of_concentration is not None:
        items.append(Item("Time of concentration", f"{f.value(design.time_of_concentration, 'time_of_concentration')} (Kirpich; L = "
                                                   f"{f(basis.flow_length, 'length')}, S = "
                                                   f"{_slope_text(basis.flow_path_slope)}); read i for this "
                                                   "duration"))
    return items


def _lining_text(st: StabilityResult, f: Formatter) -> str:
    return name_in_units(st.lining_name, f.units) + (f", D50 {f.stone(st.d50)}" if st.d50 is not None else "")


def _typed_n_words(ch, section) -> str:
    """The Manning's n of a channel without a lining: typed, or a surveyed section's own n per segment."""
    if ch.manning_n is not None:
        return f"{n_text(ch.manning_n)} (typed in the project)"
    per_segment = np.atleast_1d(np.asarray(section.n, float))
    if np.all(per_segment == per_segment[0]):
        return f"{n_text(per_segment[0])} (the survey's own, on every segment)"
    values = ", ".join(n_text(v) for v in per_segment)
    return (f"the survey's own, per segment: {values}; composite n by Horton and Einstein "
            f"({provenance.cite('composite_n')})")


def input_items(design: ChannelDesign, f: Formatter, lining=None, catalogue_text: str = "",
                src: "Sources | None" = None) -> list:
    """Items for the inputs; with a lining, its catalogue entry and the sources of its values."""
    ch, st = design.channel, design.stability
    items = [*flow_items(design, f), Item("Bed slope S", _slope_with_unit(ch.slope, f)),
             *section_description(design.section, f)]
    if st is not None:
        origin = ORIGIN_WORDS.get(lining.origin, lining.origin)
        refs = [f"n {src.ref('Manning n', in_units(st.n_source, f.units))}"]
        if st.permissible_shear is not None:
            refs.append(f"\u03c4p {src.ref('permissible shear', in_units(st.permissible_source, f.units))}")
        if st.layer_thickness is not None:
            refs.append(f"layer {src.ref('layer thickness', in_units(st.thickness_rule, f.units))}")
        items.append(Item("Lining", f"{_lining_text(st, f)}; {origin} '{st.lining_key}'; sources {', '.join(refs)}"))
    else:
        items.append(Item("Lining", "none chosen"))
        items.append(Item("Manning's n", _typed_n_words(ch, design.section)))
    if ch.bend_radius is not None:
        items.append(Item("Bend radius Rc", f(ch.bend_radius, "length")))
    min_fb = hec15.MIN_FREEBOARD if ch.min_freeboard is None else ch.min_freeboard
    items += [Item("Minimum freeboard", f(min_fb, "length")),
              Item("Unit system", f.units.name)]
    return items


def result_items(design: ChannelDesign, f: Formatter, n_ref: str = "") -> list:
    """The uniform-flow results; ``n_ref`` points to the source of the lining's n ("[1]")."""
    r, st = design.analysis, design.stability
    n = f.value(float(r.manning_n), "manning_n")
    if st is not None:
        n = f"{n} {n_ref}"
    else:
        n = f"{n} ({'typed' if design.channel.manning_n is not None else 'composite'})"
    return [  # printed two to a row, in this order
        Item("Normal depth yn", f.value(r.normal_depth, "normal_depth")),
        Item("Critical depth yc", f.value(r.critical_depth, "critical_depth")),
        Item("Velocity V", f.value(r.velocity, "velocity")),
        Item("Froude number Fr", f.value(r.froude, "froude")),
        Item("Flow regime", str(r.regime)),
        Item("Critical slope Sc", f"{f.value(r.critical_slope, 'critical_slope')}"),
        Item("Flow area A", f.value(r.area, "area")),
        Item("Top width T", f.value(r.top_width, "top_width")),
        Item("Hydraulic radius R", f.value(r.hydraulic_radius, "hydraulic_radius")),
        Item("Manning's n used", n),
    ]


# ------------------------------------------------------------------ hand check
def rational_check(basis, flow: float, f: Formatter) -> str:
    """Q = C i A with the numbers in and the factor of the display units written out."""
    i = f.units.from_si("intensity", basis.intensity)
    a = f.units.from_si("drainage_area", basis.area)
    factor = f.units.unit("intensity").factor * f.units.unit("drainage_area").factor / f.units.unit("flow").factor
    units = f"{f.unit('intensity')} \u00d7 {f.unit('drainage_area')} \u2192 {f.unit('flow')}"
    return (f"Q = C i A u = {basis.runoff_coefficient:.2f} \u00d7 {significant(i, 4)} \u00d7 {significant(a, 4)} \u00d7 {significant(factor, 5)}"
            f" = {f.number(flow, 'flow', 4)} {f.unit('flow')} (u = {significant(factor, 5)} for {units})")


def hand_check(design: ChannelDesign, f: Formatter) -> list:
    """Lines a checker can verify with a calculator, in the sheet's units."""
    r, section, slope, flow = design.analysis, design.section, design.channel.slope, design.flow
    basis = design.channel.flow
    us = f.units.key == "us"
    L, A2 = f.unit("length"), f.unit("area")
    y = f.units.from_si("length", r.normal_depth)
    area = f.units.from_si("area", r.area)
    perim = f.units.from_si("length", r.wetted_perimeter)
    radius = area / perim
    q = f.units.from_si("flow", flow)
    n = float(r.manning_n)
    k = K_US if us else 1.0
    lines = [rational_check(basis, flow, f)] if basis.method == "rational" else []
    lines.append(f"At the normal depth y = {significant(y, 4)} {L}:")
    if section.side_slopes is not None:
        b = f.units.from_si("length", section.bottom_width)
        z1, z2 = section.side_slopes
        if b == 0:
            lines.append(f"A = (z1 + z2) y\u00b2 / 2 = ({z1:g} + {z2:g}) \u00d7 {significant(y, 4)}\u00b2 / 2 = {significant(area, 5)} {A2}")
            lines.append(f"P = y (\u221a(1 + z1\u00b2) + \u221a(1 + z2\u00b2)) = {significant(y, 4)} \u00d7 "
                         f"(\u221a(1 + {z1:g}\u00b2) + \u221a(1 + {z2:g}\u00b2)) = {significant(perim, 5)} {L}")
        elif z1 == z2:
            lines.append(f"A = (b + z y) y = ({significant(b, 4)} + {z1:g} \u00d7 {significant(y, 4)}) \u00d7 {significant(y, 4)} = {significant(area, 5)} {A2}")
            lines.append(f"P = b + 2 y \u221a(1 + z\u00b2) = {significant(b, 4)} + 2 \u00d7 {significant(y, 4)} \u00d7 \u221a(1 + {z1:g}\u00b2)"
                         f" = {significant(perim, 5)} {L}")
        else:
            lines.append(f"A = (b + (z1 + z2) y / 2) y = ({significant(b, 4)} + {z1 + z2:g} \u00d7 {significant(y, 4)} / 2) \u00d7 {significant(y, 4)}"
                         f" = {significant(area, 5)} {A2}")
            lines.append(f"P = b + y (\u221a(1 + z1\u00b2) + \u221a(1 + z2\u00b2)) = {significant(b, 4)} + {significant(y, 4)} \u00d7 "
                         f"(\u221a(1 + {z1:g}\u00b2) + \u221a(1 + {z2:g}\u00b2)) = {significant(perim, 5)} {L}")
    else:
        lines.append(f"A = {significant(area, 5)} {A2}, P = {significant(perim, 5)} {L} (section geometry)")
    factor = area * radius ** (2 / 3)
    target = q * n / (k * math.sqrt(slope))
    delta = (factor - target) / target * 100
    delta_text = "|\u0394| < 0.001 %" if abs(delta) < 0.0005 else f"\u0394 = {delta:+.3f} %"
    exponent = "ft^(8/3)" if us else "m^(8/3)"
    lines += [
        f"R = A / P = {significant(area, 5)} / {significant(perim, 5)} = {significant(radius, 4)} {L}",
        f"A R^(2/3) = {significant(area, 5)} \u00d7 {significant(radius, 4)}^(2/3) = {significant(factor, 5)} {exponent}",
        f"Q n / (k \u221aS) = {significant(q, 4)} \u00d7 {n_text(n)} / ({k:.4f} \u00d7 \u221a{slope:g}) = {significant(target, 5)} {exponent}",
        f"{delta_text} (k = {k:.4f}{' = (1/0.3048)^(1/3), US units' if us else ', SI'})",
    ]
    v = f.units.from_si("velocity", r.velocity)
    top = f.units.from_si("length", r.top_width)
    g = G_US if us else hy.G
    lines.append(f"V = Q / A = {significant(q, 4)} / {significant(area, 5)} = {significant(v, 4)} {f.unit('velocity')}")
    lines.append(f"Fr = V / \u221a(g A / T) = {significant(v, 4)} / \u221a({significant(g, 5)} \u00d7 {significant(area, 5)} / {significant(top, 4)})"
                 f" = {float(r.froude):.3f}")
    gamma = f.units.from_si("unit_weight", hy.GAMMA_WATER)
    tau_si = float(r.bed_shear) if design.stability is None else design.stability.bed_shear
    tau = f.units.from_si("shear", tau_si)
    T = f.unit("shear")
    lines.append(f"\u03c4d = \u03b3 d S = {significant(gamma, 4)} {f.unit('unit_weight')} \u00d7 {significant(y, 4)} {L} \u00d7 {slope:g}"
                 f" = {significant(tau, 4)} {T} (HEC-15 Eq. 3.1)")
    st = design.stability
    if st is not None:
        gov = st.governing_check()
        if gov is not None and gov.permissible_shear is not None and gov.method != "appendix_d" and gov.design_shear > 0:
            tp = f.units.from_si("shear", gov.permissible_shear)
            td = f.units.from_si("shear", gov.design_shear)
            lines.append(f"SF = \u03c4p / \u03c4 = {significant(tp, 4)} / {significant(td, 4)} = {tp / td:.2f} ({gov.location}, "
                         f"{gov.required_safety_factor:.2f} required)")
    return lines


# ------------------------------------------------------------------ stability
class Sources:
    """The numbered sources printed at the foot of the sheet; items refer to them as [1], [2], ..."""

    def __init__(self):
        self.lines: list = []

    def ref(self, what: str, text: str) -> str:
        line = f"{what}: {text}"
        if line not in self.lines:
            self.lines.append(line)
        return f"[{self.lines.index(line) + 1}]"

    def printed(self) -> list:
        return [f"[{i}] {line}" for i, line in enumerate(self.lines, start=1)]


def _check_rows(st: StabilityResult, f: Formatter) -> list:
    rows = []
    for c in st.checks:
        basis = c.factor + ("; HEC-15 Appendix D" if c.method == "appendix_d" and "Appendix D" not in c.factor else "")
        if c.cannot_rest:
            result = "FAILS: stone cannot rest on this slope"
        elif c.permissible_shear is None:
            result = "non-erodible"
        else:
            result = "passes" if c.passes else "FAILS"
        rows.append(CheckRow(location=c.location, basis=pretty_unit(basis), design=f.rounded(c.design_shear, "bed_shear"),
                             permissible=("non-erodible" if c.permissible_shear is None
                                          else f.rounded(c.permissible_shear, "permissible_shear")),
                             safety_factor=_sf(c.safety_factor),
                             required="\u2014" if c.permissible_shear is None else _sf(c.required_safety_factor),
                             result=result))
    return rows


_REQUIRED_METHOD = {"eq_6_8": "HEC-15 Eq. 6.8",
                    "appendix_d": "HEC-15 Eq. 6.8, Appendix D on the side slopes"}


def _stone_items(st: StabilityResult, f: Formatter) -> list:
    """What the stability block adds for stone: Table 6.1's factors, the required D50, the layer, the filter."""
    items = []
    if st.category == "stone":
        if st.required_d50 is None:
            items.append(Item("Required D50", "no stone size is stable here (see the cautions)"))
        else:
            parts = [f"{where} {f.stone(v)}" for where, v in (("bed", st.required_d50_bed),
                                                                  ("side slopes", st.required_d50_side),
                                                                  ("bend", st.required_d50_bend)) if v is not None]
            method = _REQUIRED_METHOD.get(st.required_d50_method, st.required_d50_method or "")
            depth = ("" if st.required_d50_depth is None
                     else f" at depth {f.value(st.required_d50_depth, 'normal_depth')}")
            enough = "given D50 enough" if st.d50 >= st.required_d50 else "given D50 too small"
            items.append(Item("Required D50", f"{f.stone(st.required_d50)} smallest stable, {enough} "
                                              f"({', '.join(parts)}{depth}; {method})"))
    parts = []
    if st.reynolds is not None:
        parts.append(f"particle Reynolds number Re* {significant(st.reynolds, 3)}: F* {st.shields:.3f}, SF required "
                     f"{_sf(st.required_safety_factor)} ({provenance.cite('table_6_1')})")
    if st.layer_thickness is not None and st.category == "stone":
        parts.append(f"layer thickness t {f.stone(st.layer_thickness)}")
    if parts:
        items.append(Item("Stone and layer", "; ".join(parts)))
    return items


def freeboard_rule(design: ChannelDesign, f: Formatter) -> str:
    """The freeboard rule in the sheet's units, saying which part set the freeboard."""
    return in_units(design.freeboard_rule(f.units), f.units)


def _depth_items(design: ChannelDesign, f: Formatter, src: Sources) -> list:
    st, ch = design.stability, design.channel
    min_fb = hec15.MIN_FREEBOARD if ch.min_freeboard is None else ch.min_freeboard
    fb = f"{f.value(design.freeboard, 'freeboard')}"
    if design.wave_allowance is not None:
        fb += ", the flow depth (supercritical flow: waves as high as the depth)"
    elif design.superelevation is not None:
        # the terms to three figures: a superelevation of a few millimetres keeps its size
        fb += f" = minimum {f(min_fb, 'length')} + superelevation {f(design.superelevation, 'length')}"
    else:
        fb += ", the minimum"
    items = [Item("Freeboard", f"{fb} {src.ref('freeboard', freeboard_rule(design, f))}")]
    if ch.bend_radius is not None and st is not None and st.bend_factor is not None:
        text = f"Rc {f(ch.bend_radius, 'length')}, Kb {rounded(st.bend_factor, EXTRA_FIELDS['bend_factor'])}"
        if st.bend_protection_length is not None:
            lp_source = src.ref("bend protection", f"Lp = 0.736 R^(7/6) / n (SI), {provenance.cite('bend_length')}")
            text += f"; protect {f.value(st.bend_protection_length, 'bend_protection_length')} downstream {lp_source}"
        items.append(Item("Bend", text))
    items.append(Item("Total depth", f"{f.value(design.total_depth, 'total_depth')} (yn + freeboard)"))
    items.append(Item("Top width at top", f.value(design.top_width_at_top, "top_width_at_top")))
    if st is not None:
        text = f"{f.value(st.lined_width, 'lined_width')} per {f.unit('length')} of channel"
        if st.layer_volume is not None:
            text += f"; layer {f.value(st.layer_volume, 'layer_volume')}"
        if st.cost_per_length is not None:
            text += f"; cost {f.value(st.cost_per_length, 'cost_per_length')}"
        items.append(Item("Lined width", text))
    return items


# ------------------------------------------------------------------ comparison
def comparison_lines(design: ChannelDesign, f: Formatter, catalogue: Catalogue) -> tuple[list | None, list, bool]:
    """One line per lining (the channel's own first), footnotes, and whether any is priced: the one comparison
    table (:mod:`app.comparison_table`, the window's and ``ditchwright compare``'s) laid out for the sheet."""
    rows = design.comparison
    if not rows:
        return None, [], False
    table = comparison_table(rows, Context(catalogue, f.units), design.section.full_depth)
    own = design.channel.lining.key if design.channel.lining is not None else None
    lines, notes = [], []
    for i, r in enumerate(table.rows):
        c = r.cells
        name = ("* " if i == 0 and own is not None and r.key == own else "") + r.name
        if r.error is not None:
            lines.append(ComparisonLine(name, *[EMPTY] * 7, r.verdict.words, EMPTY, EMPTY, EMPTY))
            notes.append(f"{r.name}: {in_units(r.error, f.units)}")
            continue
        verdict = r.verdict.words + ("" if r.values["governs"] in (None, "non-erodible") else f" ({c['governs']})")
        needed = r.values["required_d50"]
        if needed is not None and r.values["d50"] is not None and needed > r.values["d50"]:
            verdict += f"; needs D50 \u2265 {c['required_d50']} {f.unit('small_length')}"
        sf = EMPTY if r.values["safety_factor"] is None else f"{c['safety_factor']} / {c['required_safety_factor']}"
        lines.append(ComparisonLine(
            lining=name, n=c["manning_n"], depth=c["depth"], velocity=c["velocity"], froude=c["froude"],
            design=c["design_shear"], permissible=c["permissible_shear"], safety_factor=sf, verdict=verdict,
            lined_width=c["lined_width"], layer_volume=c["layer_volume"], cost=c["cost_per_length"]))
    text = ("* the channel's lining, then the alternatives named in the project. " if own is not None else "")
    text += (f"\u03c4, \u03c4p and SF of the governing check (the bed for a non-erodible lining). Lined width: "
             f"{in_units(LINED_WIDTH_RULE, f.units)}; layer = lined width \u00d7 layer thickness, per "
             f"{f.unit('length')} of channel.")
    if not table.priced:
        text += " No cost column: no lining compared has a unit cost (unit_cost in a user catalogue)."
    notes.insert(0, text)
    return lines, notes, table.priced


# ------------------------------------------------------------------ the sheet
def _notes_printed_elsewhere(design: ChannelDesign) -> set:
    """The evaluation's notes that the sheet already prints in its own blocks, in the sheet's units."""
    return {LINED_WIDTH_RULE, *design_flow(design.channel)[3]}


def cautions(design: ChannelDesign, f: Formatter) -> list:
    """The fixed cautions, then the evaluation's warnings and its notes not printed elsewhere on the sheet."""
    out = list(CAUTIONS)
    out += [sentence(w, f.units) for w in design.warnings]
    skip = _notes_printed_elsewhere(design)
    out += ["Note: " + sentence(n, f.units) for n in design.notes
            if n not in skip and not n.startswith("freeboard: ")]
    return list(dict.fromkeys(out))


def _item_texts(items) -> list:
    return [f"{i.label} {i.value}" for i in items]


def catalogue_words(catalogue: Catalogue) -> str:
    """'linings.toml 1.0.0' or 'linings.toml + prices.toml 1.0.0' (the shipped catalogue's version)."""
    version = f" {catalogue.catalogue_version}" if catalogue.catalogue_version else ""
    return f"{catalogue.origin}{version}"


def channel_sheet(project, channel, catalogue: Catalogue) -> ChannelSheet:
    """Evaluate ``channel`` of ``project`` and word everything printed for it.

    ``catalogue`` is the lining catalogue (the front end's, with the user's
    entries); pass the same one to :func:`app.sheet.fingerprint.fingerprint`
    to recompute the printed fingerprint.
    """
    units = hu.system(project.units)
    f = Formatter(units)
    design = evaluate_channel(channel, catalogue)
    st = design.stability
    cat_text = catalogue_words(catalogue)
    src = Sources()

    if st is not None:
        lining = catalogue.get(st.lining_key)
        inputs = input_items(design, f, lining, cat_text, src)  # first: it numbers the lining's sources
        n_ref = src.ref("Manning n", in_units(st.n_source, units))  # the number given in the inputs
        roughness = lining.roughness(st.d50)
        checks = _check_rows(st, f)
        lining_items = _stone_items(st, f)
        reason = in_units(st.reason(units), units)
        lining_label = _lining_text(st, f)
        thickness = st.layer_thickness
    else:
        inputs = input_items(design, f)
        n_ref = ""
        roughness = None if channel.manning_n is None else float(channel.manning_n)  # None: the survey's own n
        checks = []
        tau = float(design.analysis.bed_shear)
        lining_items = [Item("Bed shear", f"\u03c4d = \u03b3 d S = {f.value(tau, 'bed_shear')} (HEC-15 Eq. 3.1), not compared "
                                          "with a permissible shear")]
        n_from = ("the Manning's n typed in the project" if channel.manning_n is not None
                  else "the surveyed section's own n")
        reason = (f"no lining chosen, so no permissible shear to check against; the uniform flow uses {n_from}. "
                  "Choose a lining from the catalogue to check the channel's stability (HEC-15 permissible shear).")
        lining_label = "none chosen"
        thickness = None
    verdict = design.verdict
    if verdict is Verdict.TOO_SHALLOW:
        reason = in_units(too_shallow_reason(design.section, design.total_depth), units) + "; " + reason
    depth_items = _depth_items(design, f, src)
    comparison, comparison_notes, priced = comparison_lines(design, f, catalogue)
    warned = cautions(design, f)
    printed = [*_item_texts(inputs), *_item_texts(lining_items), *_item_texts(depth_items), reason, *warned,
               *src.lines, *comparison_notes, *(c.basis for c in checks), *design.cited_texts()]
    return ChannelSheet(
        project=project.name, channel=channel.name, location=channel.location, units=units, format=f,
        fingerprint=fingerprint(channel, catalogue=catalogue), version=__version__, catalogue=cat_text,
        inputs=inputs, results=result_items(design, f, n_ref), checks=checks,
        lining_items=lining_items,
        depth_items=depth_items, verdict=verdict, verdict_reason=reason, hand_check=hand_check(design, f),
        comparison=comparison, comparison_notes=comparison_notes, comparison_priced=priced,
        cautions=warned, sources=src.printed(),
        not_verified=in_units(provenance.not_verified_paragraph(provenance.cited_not_verified(printed), values=False),
                              units),
        design=design, roughness=roughness,
        lining_label=lining_label, thickness=thickness)


__all__ = ["ChannelSheet", "channel_sheet", "Formatter", "Item", "CheckRow", "ComparisonLine", "pretty_unit",
           "in_units", "hand_check", "FIGURES"]

