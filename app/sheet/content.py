"""What one design sheet says, as text in the project's units (no drawing here).

The layout module places these strings; the tests read them back from the
PDF. Every number carries its unit. Values are computed in SI by the core and
converted only here, at the edge.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import hydraulics as hy
from hydraulics import units as hu
from hydraulics.rational import kirpich_time, kirpich_warnings, rational_warnings

from .. import __version__
from .check import Evaluation, catalogue_lining, evaluate
from .fingerprint import fingerprint

#: Customary Manning constant, (1 m / 1 ft)^(1/3) = 1.4859 (Chow 1959, Sec. 5-6).
K_US = (1 / hu.FOOT) ** (1 / 3)
G_US = hy.G / hu.FOOT  # 32.174 ft/s^2

CAUTIONS = (
    "Design assistance only. The results follow the methods named on this sheet; they must be checked "
    "against the governing local drainage code and by a licensed professional engineer, who is "
    "responsible for the design.",
    "Uniform (normal) flow is assumed: the slope, section and lining hold long enough for the flow to "
    "reach normal depth. Backwater, inlets, outlets, transitions and junctions are not analysed.",
)


def pretty_unit(label: str) -> str:
    """'ft^3/s' -> 'ft³/s', 'm^2' -> 'm²' (the sheet font has the superscripts)."""
    return label.replace("^2", "\u00b2").replace("^3", "\u00b3")


@dataclass
class Item:
    label: str
    value: str


@dataclass
class ComparisonRow:
    lining: str
    n: str
    depth: str
    velocity: str
    shear: str          # governing design shear / permissible
    safety_factor: str
    verdict: str
    cost: str


@dataclass
class ChannelSheet:
    """Everything printed for one channel."""

    project: str
    channel: str
    location: str
    units: hu.UnitSystem
    fingerprint: str
    version: str
    inputs: list
    results: list
    stability: list | None          # Item list; None when the lining was not checked
    stability_note: str
    verdict: str                    # "STABLE", "NOT STABLE" or "NOT CHECKED"
    verdict_reason: str
    hand_check: list                # lines of text
    comparison: list | None         # ComparisonRow list, or None when there are no alternatives
    comparison_note: str
    cautions: list
    evaluation: Evaluation
    section: hy.Section
    slope: float
    flow: float
    lining_label: str
    thickness: float | None         # [m]


class Formatter:
    """SI value -> text in the chosen unit system, with the unit."""

    def __init__(self, units: hu.UnitSystem):
        self.units = units

    def unit(self, quantity: str) -> str:
        return pretty_unit(self.units.label(quantity))

    def number(self, value_si: float, quantity: str, figures: int = 3) -> str:
        """The value in display units to ``figures`` significant figures."""
        return _sig(float(self.units.from_si(quantity, value_si)), figures)

    def __call__(self, value_si: float, quantity: str, figures: int = 3) -> str:
        return f"{self.number(value_si, quantity, figures)} {self.unit(quantity)}"


def _sig(x: float, figures: int = 4) -> str:
    """A number to ``figures`` significant figures, without exponent for ordinary sizes."""
    if x == 0 or not math.isfinite(x):
        return f"{x:g}"
    digits = max(0, figures - 1 - int(math.floor(math.log10(abs(x)))))
    return f"{x:.{digits}f}"


def _slope_text(s: float) -> str:
    return f"{_sig(s, 3)} ({_sig(s * 100, 3)} %)"


def _slope_with_unit(s: float, f: "Formatter") -> str:
    return f"{_sig(s, 3)} {f.unit('slope')} ({_sig(s * 100, 3)} %)"


def section_description(section: hy.Section, f: Formatter) -> list:
    """Items describing the section's shape and dimensions."""
    kind = section.kind
    items = [Item("Section", {"trapezoid": "Trapezoid", "triangle": "V-ditch (triangle)", "rectangle": "Rectangle",
                              "parabola": "Parabolic swale", "circle": "Circular pipe",
                              "irregular": "Surveyed (irregular)"}[kind])]
    if kind in ("trapezoid", "rectangle"):
        items.append(Item("Bottom width b", f(section.bottom_width, "length", 3)))
    if section.side_slopes is not None and kind != "rectangle":
        z1, z2 = section.side_slopes
        if z1 == z2:
            items.append(Item("Side slopes z", f"{z1:g}H:1V both sides"))
        else:
            items.append(Item("Side slopes z1, z2", f"{z1:g}H:1V left, {z2:g}H:1V right"))
    if kind == "parabola":
        items.append(Item("Top width", f"{f(section.top_width_ref, 'length', 3)} at depth "
                                       f"{f(section.at_depth, 'length', 3)}"))
    if kind == "circle":
        items.append(Item("Diameter D", f(section.diameter, "length", 3)))
    if kind == "irregular":
        items.append(Item("Survey points", f"{len(section.stations)}; bank height {f(section.full_depth, 'length', 3)}"))
    return items


def flow_items(channel, f: Formatter) -> tuple[list, list]:
    """Items for the design flow and its basis, and the cautions it raises."""
    q = channel.design_flow()
    basis = channel.flow
    notes = []
    if basis.method == "rational":
        items = [Item("Design flow Q", f"{f(q, 'flow', 4)} (rational method, Q = C i A)"),
                 Item("Runoff coefficient C", f"{basis.runoff_coefficient:.2f}"),
                 Item("Rainfall intensity i", f(basis.intensity, "intensity", 3)),
                 Item("Drainage area A", f(basis.area, "drainage_area", 3))]
        notes += rational_warnings(basis.area)
        if basis.flow_length is not None and basis.flow_path_slope is not None:
            tc = kirpich_time(basis.flow_length, basis.flow_path_slope)
            items.append(Item("Time of concentration", f"{tc / 60:.1f} min (Kirpich; L = "
                                                       f"{f(basis.flow_length, 'length', 3)}, "
                                                       f"S = {_slope_text(basis.flow_path_slope)})"))
            notes += kirpich_warnings(basis.flow_path_slope, basis.area)
    else:
        items = [Item("Design flow Q", f"{f(q, 'flow', 4)} (typed in the project)")]
    return items, notes


def rational_check(basis, flow: float, f: Formatter) -> str:
    """Q = C i A with the numbers in and the factor of the display units written out."""
    i = f.units.from_si("intensity", basis.intensity)
    a = f.units.from_si("drainage_area", basis.area)
    factor = f.units.unit("intensity").factor * f.units.unit("drainage_area").factor / f.units.unit("flow").factor
    units = f"{f.unit('intensity')} \u00d7 {f.unit('drainage_area')} \u2192 {f.unit('flow')}"
    return (f"Q = C i A u = {basis.runoff_coefficient:.2f} \u00d7 {_sig(i, 3)} \u00d7 {_sig(a, 3)} \u00d7 {_sig(factor, 5)}"
            f" = {f.number(flow, 'flow', 4)} {f.unit('flow')} (u = {_sig(factor, 5)} for {units})")


def hand_check(section: hy.Section, ev: Evaluation, flow: float, slope: float, f: Formatter,
               basis=None) -> list:
    """Lines a checker can verify with a calculator, in the sheet's units."""
    r = ev.result
    us = f.units.key == "us"
    L, A2 = f.unit("length"), f.unit("area")
    y = f.units.from_si("length", r.normal_depth)
    area = f.units.from_si("area", r.area)
    perim = f.units.from_si("length", r.wetted_perimeter)
    radius = area / perim
    q = f.units.from_si("flow", flow)
    n = float(r.manning_n)
    k = K_US if us else 1.0
    lines = [rational_check(basis, flow, f)] if basis is not None and basis.method == "rational" else []
    lines.append(f"At the normal depth y = {_sig(y, 4)} {L}:")
    if section.side_slopes is not None:
        b = f.units.from_si("length", section.bottom_width)
        z1, z2 = section.side_slopes
        if b == 0:
            lines.append(f"A = (z1 + z2) y\u00b2 / 2 = ({z1:g} + {z2:g}) \u00d7 {_sig(y, 4)}\u00b2 / 2 = {_sig(area, 5)} {A2}")
            lines.append(f"P = y (\u221a(1 + z1\u00b2) + \u221a(1 + z2\u00b2)) = {_sig(y, 4)} \u00d7 "
                         f"(\u221a(1 + {z1:g}\u00b2) + \u221a(1 + {z2:g}\u00b2)) = {_sig(perim, 5)} {L}")
        elif z1 == z2:
            lines.append(f"A = (b + z y) y = ({_sig(b, 4)} + {z1:g} \u00d7 {_sig(y, 4)}) \u00d7 {_sig(y, 4)} = {_sig(area, 5)} {A2}")
            lines.append(f"P = b + 2 y \u221a(1 + z\u00b2) = {_sig(b, 4)} + 2 \u00d7 {_sig(y, 4)} \u00d7 \u221a(1 + {z1:g}\u00b2)"
                         f" = {_sig(perim, 5)} {L}")
        else:
            lines.append(f"A = (b + (z1 + z2) y / 2) y = ({_sig(b, 4)} + {z1 + z2:g} \u00d7 {_sig(y, 4)} / 2) \u00d7 {_sig(y, 4)}"
                         f" = {_sig(area, 5)} {A2}")
            lines.append(f"P = b + y (\u221a(1 + z1\u00b2) + \u221a(1 + z2\u00b2)) = {_sig(b, 4)} + {_sig(y, 4)} \u00d7 "
                         f"(\u221a(1 + {z1:g}\u00b2) + \u221a(1 + {z2:g}\u00b2)) = {_sig(perim, 5)} {L}")
    else:
        lines.append(f"A = {_sig(area, 5)} {A2}, P = {_sig(perim, 5)} {L} (section geometry)")
    factor = area * radius ** (2 / 3)
    target = q * n / (k * math.sqrt(slope))
    delta = (factor - target) / target * 100
    delta_text = "|\u0394| < 0.001 %" if abs(delta) < 0.0005 else f"\u0394 = {delta:+.3f} %"
    exponent = "ft^(8/3)" if us else "m^(8/3)"
    lines += [
        f"R = A / P = {_sig(area, 5)} / {_sig(perim, 5)} = {_sig(radius, 4)} {L}",
        f"A R^(2/3) = {_sig(area, 5)} \u00d7 {_sig(radius, 4)}^(2/3) = {_sig(factor, 5)} {exponent}",
        f"Q n / (k \u221aS) = {_sig(q, 4)} \u00d7 {n:.4f} / ({k:.4f} \u00d7 \u221a{slope:g}) = {_sig(target, 5)} {exponent}",
        f"{delta_text} (k = {k:.4f}{' = (1/0.3048)^(1/3), US units' if us else ', SI'})",
    ]
    gamma = f.units.from_si("unit_weight", hy.GAMMA_WATER)
    tau = f.units.from_si("shear", r.bed_shear)
    lines.append(f"\u03c4 = \u03b3 d S = {_sig(gamma, 4)} {f.unit('unit_weight')} \u00d7 {_sig(y, 4)} {L} \u00d7 {slope:g}"
                 f" = {_sig(tau, 3)} {f.unit('shear')}")
    v = f.units.from_si("velocity", r.velocity)
    top = f.units.from_si("length", r.top_width)
    g = G_US if us else hy.G
    lines.append(f"V = Q / A = {_sig(q, 4)} / {_sig(area, 5)} = {_sig(v, 4)} {f.unit('velocity')}")
    lines.append(f"Fr = V / \u221a(g A / T) = {_sig(v, 4)} / \u221a({_sig(g, 5)} \u00d7 {_sig(area, 5)} / {_sig(top, 4)})"
                 f" = {float(r.froude):.3f}")
    return lines


def _stability_items(ev: Evaluation, f: Formatter) -> list:
    c = ev.check
    items = [Item("Lining", c.lining_name), Item("Values from", c.source)]
    for s in c.shears:
        rel = f" ({s.relation})" if s.relation else ""
        op = "\u2264" if s.design <= s.permissible else ">"
        items.append(Item(f"Shear, {s.where}", f"\u03c4 {f.number(s.design, 'shear', 3)} {op} "
                                                f"\u03c4p {f(s.permissible, 'shear', 3)}{rel}"))
    items.append(Item("Safety factor", f"{c.safety_factor:.2f} (required \u2265 {c.required_safety_factor:.2f})"))
    if c.thickness is not None:
        items.append(Item("Lining thickness", f(c.thickness, "small_length", 3)))
    return items


def comparison_rows(channel, f: Formatter) -> tuple[list | None, str]:
    """One row per lining (the chosen one first, then the alternatives), or None without alternatives."""
    if not channel.alternatives:
        return None, ""
    rows, unchecked = [], []
    for choice in [channel.lining, *channel.alternatives]:
        if choice is None:
            continue
        try:
            ev = evaluate(channel, choice)
        except hy.HydraulicsError as exc:
            rows.append(ComparisonRow(choice.key, "", "", "", "", "", f"no solution: {exc}", ""))
            continue
        c = ev.check
        if c is None:
            entry = catalogue_lining(choice)
            unchecked.append(entry.name if entry is not None else choice.key)
            continue
        gov = min(c.shears, key=lambda s: s.safety_factor) if c.shears else None
        cost = "" if c.cost_per_length is None else f"{f.units.from_si('cost_per_length', c.cost_per_length):.2f} " \
                                                    f"{f.unit('cost_per_length')}"
        rows.append(ComparisonRow(
            lining=c.lining_name, n=f"{float(ev.result.manning_n):.3f}", depth=f(ev.design_depth, "length", 3),
            velocity=f(ev.result.velocity, "velocity", 3),
            shear="" if gov is None else f"{f.number(gov.design, 'shear', 3)} / {f(gov.permissible, 'shear', 3)}",
            safety_factor=f"{c.safety_factor:.2f}", verdict="stable" if c.stable else "not stable", cost=cost))
    note = ""
    if unchecked:
        note = ("Alternatives named in the project but not compared, because this version of the program has "
                "no lining stability check: " + "; ".join(unchecked) + ".")
    return rows, note


def channel_sheet(project, channel) -> ChannelSheet:
    """Compute and word everything printed for ``channel`` of ``project``."""
    units = hu.system(project.units)
    f = Formatter(units)
    section = channel.build_section()
    flow = channel.design_flow()
    ev = evaluate(channel)
    r = ev.result
    check = ev.check

    flow_rows, flow_notes = flow_items(channel, f)
    lining = channel.lining
    entry = catalogue_lining(lining) if lining is not None else None
    lining_rows = []
    if check is not None:
        lining_text = check.lining_name
        lining_rows.append(Item("Lining values from", check.source))
    elif entry is not None:
        lining_text = entry.name + (f", D50 {f(entry.d50, 'small_length', 3)}" if entry.d50 else "")
        lining_rows.append(Item("Lining n from", entry.roughness_source))
        if channel.manning_n is not None:
            lining_rows.append(Item("n override", f"{channel.manning_n:g} typed in the project is used "
                                                  "instead of the catalogue's"))
        lining_rows.append(Item("Permissible shear from", entry.permissible_source))
    elif lining is not None:
        lining_text = f"{lining.key} (not in the lining catalogue)"
        lining_rows.append(Item("Lining values from", "n typed in the project"))
    else:
        lining_text = "none given"
        lining_rows.append(Item("Lining values from", "n typed in the project"))
    inputs = [*flow_rows,
              Item("Bed slope S", _slope_with_unit(channel.slope, f)),
              *section_description(section, f),
              Item("Lining", lining_text),
              *lining_rows]
    if channel.bend_radius is not None:
        inputs.append(Item("Bend radius (centreline)", f(channel.bend_radius, "length", 3)))
    inputs += [Item("Minimum freeboard", f(channel.min_freeboard, "length", 2)),
               Item("Unit system", f"{units.name} ({f.unit('length')}, {f.unit('flow')}, {f.unit('shear')})")]

    top_total = float(section.top_width(min(ev.total_depth, section.full_depth or math.inf)))
    results = [
        Item("Normal depth yn", f(r.normal_depth, "length", 4)),
        Item("Critical depth yc", f(r.critical_depth, "length", 4)),
        Item("Velocity V", f(r.velocity, "velocity", 3)),
        Item("Froude number Fr", f"{float(r.froude):.2f}, {r.regime}"),
        Item("Manning's n used", f"{float(r.manning_n):.4f} ({ev.n_basis})"),
        Item("Flow area A", f(r.area, "area", 4)),
        Item("Hydraulic radius R", f(r.hydraulic_radius, "length", 3)),
        Item("Top width of flow", f(r.top_width, "length", 4)),
        Item("Bed shear \u03c4 = \u03b3 yn S", f(r.bed_shear, "shear", 3)),
        Item("Critical slope Sc", f"{_sig(float(r.critical_slope), 3)} {f.unit('slope')}"),
        Item("Freeboard", f"{f(ev.freeboard, 'length', 2)} ({ev.freeboard_basis})"),
        Item("Total depth", f"{f(ev.total_depth, 'length', 3)} (yn + freeboard)"),
        Item("Top width at total depth", f(top_total, "length", 4)),
    ]

    cautions = list(CAUTIONS)
    cautions += [w[0].upper() + w[1:] + "." for w in r.warnings]
    cautions += [w[0].upper() + w[1:] + "." for w in flow_notes]
    if check is not None:
        stability = _stability_items(ev, f)
        verdict = "STABLE" if check.stable else "NOT STABLE"
        reason = check.reason
        note = ""
        cautions += [w[0].upper() + w[1:] + "." for w in check.warnings]
        thickness = check.thickness
        lining_label = check.lining_name
    else:
        stability = None
        verdict = "NOT CHECKED"
        reason = ("This version of the program has no lining stability check: the design shear on bed, sides and "
                  "bends against the lining's permissible shear (FHWA HEC-15; stable when SF = \u03c4p / \u03c4 "
                  "\u2265 the required safety factor) is not computed. Check the lining by hand before this "
                  "sheet is approved.")
        note = reason
        cautions.append("Lining stability was not checked on this sheet (see the stability block).")
        thickness = entry.thickness if entry is not None else None
        lining_label = lining_text
    if section.full_depth is not None and ev.total_depth > section.full_depth:
        cautions.append(f"The total depth {f(ev.total_depth, 'length', 3)} is above the section's full depth "
                        f"{f(section.full_depth, 'length', 3)}: the freeboard is not available.")

    comparison, comparison_note = comparison_rows(channel, f)
    return ChannelSheet(
        project=project.name, channel=channel.name, location=channel.location, units=units,
        fingerprint=fingerprint(channel), version=__version__, inputs=inputs, results=results,
        stability=stability, stability_note=note, verdict=verdict, verdict_reason=reason,
        hand_check=hand_check(section, ev, flow, channel.slope, f, channel.flow), comparison=comparison,
        comparison_note=comparison_note, cautions=cautions, evaluation=ev, section=section,
        slope=channel.slope, flow=flow, lining_label=lining_label, thickness=thickness)
