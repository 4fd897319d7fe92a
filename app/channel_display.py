"""One channel as the window shows it: its evaluation, verdict, lining names, comparison and curves. No Qt here.

The window's widgets never compute: they hand a :class:`app.project.Channel`
and the window's :class:`app.context.Context` (catalogue, units) to
:func:`evaluate` and draw what comes back. The numbers come from the shared
channel evaluation (:mod:`app.evaluate`: design flow, uniform flow, lining
stability by HEC-15, freeboard) and the lining comparison of
:mod:`hydraulics.lining_comparison`; this module only shapes them for display.
"""

from __future__ import annotations

import copy
import dataclasses
import math
from dataclasses import dataclass, field

import numpy as np

import hydraulics as hy
from hydraulics import units as hu
from hydraulics.curves import rating_curve, specific_energy
from hydraulics.linings.roughness import relation_switch_depth
from hydraulics.stability import StabilityResult
from hydraulics.units import UnitSystem
from hydraulics.wording import in_units

from .context import Context
from .evaluate import comparison_choices, design_flow, evaluate_channel, lining_comparison
from .files import tsv_cell
from .inputs import INPUTS
from .results import COMPARISON_FIELDS, PANEL_FIELDS, panel_field, rounded
from .project import Channel, LiningChoice
from .comparison_table import ComparisonTable
from .comparison_table import comparison_table as one_table
from .lining_names import lining_label
from .verdicts import Verdict as Verdicts
from .verdicts import too_shallow_reason, verdict_of

#: Core field names as the user reads them (for messages that name a field): the inputs' words (app.inputs), and
#: the other names the core gives.
FIELD_LABELS = {i.name: i.words for i in INPUTS} | {
    "value": "Design flow", "manning_n": "Manning's n", "stations": "Stations", "elevations": "Elevations",
    "depth": "Depth", "lining": "Lining"}


@dataclass
class Verdict:
    status: str      # "pass" | "fail" | "unchecked" | "none"
    headline: str    # the verdict's words (app.verdicts), or "No result" when there is none
    reason: str      # one sentence, with numbers in the user's units


@dataclass
class Evaluation:
    """Everything shown for one channel, SI. ``result`` is None when there is no answer."""

    flow: float | None = None
    time_of_concentration: float | None = None   # Kirpich [s], when asked for
    section: hy.Section | None = None
    roughness: object = None      # the n the solver used: a number or a depth-dependent model
    result: hy.ChannelResult | None = None
    lining: StabilityResult | None = None   # the core's lining check, as it is
    freeboard: float | None = None
    superelevation: float | None = None
    total_depth: float | None = None
    top_width_at_top: float | None = None
    verdict: Verdict = field(default_factory=lambda: Verdict("none", "No result", ""))
    warnings: list = field(default_factory=list)
    notes: list = field(default_factory=list)   # statements of method, with sources
    not_verified: list = field(default_factory=list)  # published values leant on, not yet read (provenance)
    design: object = field(default=None, repr=False)   # the app.evaluate.ChannelDesign shown, when there is one
    error: str | None = None          # why there is no result, in words
    error_field: str | None = None    # the core's name of the input at fault, if one is

    @property
    def ok(self) -> bool:
        return self.result is not None


def describe_error(exc: Exception, units=hu.SI) -> tuple[str, str | None]:
    """(message in words, core field name or None) for an error from the core, its numbers in ``units``."""
    if isinstance(exc, hy.InputError):
        name = exc.field
        label = FIELD_LABELS.get(name) or FIELD_LABELS.get(name.split(".")[-1]) or name.replace("_", " ")
        if name.startswith("lining "):
            label = "Lining " + name[len("lining "):]
        text = exc.in_units(units).split(": ", 1)[-1]
        if text.startswith("must be a number, got None"):   # an input left empty: say so in words
            return f"{label} is not given yet", name
        return f"{label} {text}", name
    if isinstance(exc, hy.NoSolutionError):
        return f"No solution: {exc.in_units(units)}", None
    raise exc


# -- the linings of the catalogue, named for the window -------------------------------
#: The kinds of lining, in the order the window lists them, with their headings.
LINING_KINDS = (("rigid", "Rigid"), ("stone", "Stone"), ("vegetation", "Grass"),
                ("manufactured", "Blankets and mats"), ("gabion", "Gabion mattresses"), ("soil", "Bare soil"))


def comparison_label(row, context: Context) -> str:
    """A compared lining's name: as in the lining list, with the stone size the row was computed with."""
    entry = context.catalogue.get(row.choice.key)
    if entry is None:
        return row.name
    return lining_label(entry, context.units, d50=row.choice.d50, name=row.name)


def lining_groups(context: Context, sizes: bool = True,
                  decimal_mark: str = ".") -> list[tuple[str, list[tuple[str, str]]]]:
    """The context's catalogue as (kind heading, [(key, label)]) groups in :data:`LINING_KINDS` order, named in
    its units (numbers with ``decimal_mark``, the window's), every label different from the others (a repeated
    one names its key)."""
    seen: dict[str, int] = {}
    groups: dict[str, list] = {}
    for lin in context.catalogue:
        label = lining_label(lin, context.units, size=sizes, decimal_mark=decimal_mark)
        if label.casefold() in seen:
            label += f" [{lin.key}]"
        seen[label.casefold()] = 1
        groups.setdefault(lin.category, []).append((lin.key, label))
    order = [k for k, _ in LINING_KINDS] + sorted(set(groups) - {k for k, _ in LINING_KINDS})
    headings = dict(LINING_KINDS)
    return [(headings.get(k, k.capitalize()), groups[k]) for k in order if k in groups]


def solver_roughness(channel: Channel, catalogue):
    """The n the solver uses for ``channel``: its lining's own roughness (from ``catalogue``), else the channel's
    Manning's n.

    A surveyed section with neither uses its own n per segment (the section
    itself is the roughness model; :func:`hydraulics.solvers.resolve_roughness`).
    """
    if channel.lining is not None:
        entry = catalogue.get(channel.lining.key)
        return entry.roughness(channel.lining.d50 if entry.category == "stone" else None)
    if channel.manning_n is not None:
        return channel.manning_n
    section = channel.build_section()
    if section.kind == "irregular":
        return section
    raise hy.InputError("manning_n", "is missing: give Manning's n or choose a lining")


def _for_facade(channel: Channel) -> Channel:
    """The channel as the evaluation facade takes it: no comparison (the comparison view asks on demand)."""
    out = copy.copy(channel)
    out.alternatives = []
    return out


def _verdict(ev: Evaluation, units: UnitSystem) -> Verdict:
    """The window's verdict: the one vocabulary of :mod:`app.verdicts`, with its reason in the user's units."""
    v = verdict_of(ev.lining, ev.total_depth, ev.section.full_depth)
    if v is Verdicts.TOO_SHALLOW:
        reason = in_units(too_shallow_reason(ev.section, ev.total_depth), units)
    elif v is Verdicts.HYDRAULICS_ONLY:
        n_words = ("the surveyed section's n" if ev.section.kind == "irregular" and isinstance(ev.roughness, hy.Section)
                   else "the Manning's n given")
        reason = (f"no lining chosen: depth and velocity use {n_words}, and no shear is checked. Choose a lining to "
                  "check its stability")
    else:
        reason = ev.lining.reason(units)
    return Verdict(v.status, v.words, reason[:1].upper() + reason[1:] + ".")


@dataclass
class ComparisonRow:
    choice: LiningChoice
    name: str
    evaluation: Evaluation
    core: object = None                    # hydraulics.lining_comparison.ComparisonRow
    cost_per_length: float | None = None   # [currency/m], from the user's unit costs


def compare(channel: Channel, context: Context) -> tuple[list[ComparisonRow], str]:
    """One row per lining for the same channel and flow, and a reason when there can be none."""
    choices = comparison_choices(channel)
    if not choices:
        return [], "Tick linings in the list to compare them for this channel."
    try:
        q, _tc, _w, _n = design_flow(channel)
        section = channel.build_section()
        rows = lining_comparison(channel, context.catalogue, choices, section=section, flow=q)
    except (hy.InputError, hy.NoSolutionError) as exc:
        return [], describe_error(exc, context.units)[0]
    out = []
    for choice, row in zip(choices, rows):
        ev = Evaluation(flow=q, section=section)
        if row.result is not None:
            st = row.result
            ev.result, ev.freeboard, ev.total_depth = st.analysis, st.freeboard, st.total_depth
            ev.superelevation, ev.top_width_at_top = st.superelevation, st.top_width_at_top
            ev.lining = st
            ev.warnings = list(st.warnings)
            ev.verdict = _verdict(ev, context.units)
        else:
            ev.error = row.reason
            ev.verdict = Verdict("none", "No solution", row.reason)
        out.append(ComparisonRow(LiningChoice(row.key, row.d50 if choice.d50 is not None or row.d50 else None),
                                 row.name, ev, row, row.cost_per_length))
    return out, ""


#: Columns of the comparison table: the one list of :mod:`app.results` (key, label, quantity, decimals).
COMPARISON_COLUMNS = COMPARISON_FIELDS


def comparison_data(rows, context: Context, decimal_mark: str = ".", group_mark: str = ",") -> ComparisonTable:
    """The one comparison table (:mod:`app.comparison_table`) of the window's rows, in the context's units, with
    the window's decimal mark and group separator (its locale's)."""
    full = rows[0].evaluation.section.full_depth if rows and rows[0].evaluation.section is not None else None
    core = [r.core if r.core.name == r.name else dataclasses.replace(r.core, name=r.name) for r in rows]
    return one_table(core, context, full, decimal_mark, group_mark)


def comparison_table(rows, context: Context, decimal_mark: str = ".",
                     group_mark: str = ",") -> tuple[list[str], list[list[str]]]:
    """Headings with units, and the cells as text in the context's units (the one comparison table laid out)."""
    table = comparison_data(rows, context, decimal_mark, group_mark)
    return [table.heading(f) for f in table.columns], table.body()


def comparison_tsv(rows, context: Context, decimal_mark: str = ".", group_mark: str = ",") -> str:
    """The comparison as tab-separated text, for pasting into a spreadsheet (with the marks the table shows)."""
    heads, body = comparison_table(rows, context, decimal_mark, group_mark)
    return "\n".join("\t".join(tsv_cell(c) for c in line) for line in [heads, *body]) + "\n"


def with_lining(channel: Channel, choice: LiningChoice) -> Channel:
    """A copy of ``channel`` lined with ``choice``."""
    out = copy.deepcopy(channel)
    out.lining = copy.deepcopy(choice)
    return out


# -- the results panel's values -------------------------------------------------------
#: Values of the results panel left out when they do not apply (no lining, no bend, not stone, no price).
OPTIONAL_VALUES = {"side_shear", "bend_shear", "required_d50", "layer_thickness", "bend_protection_length",
                   "lined_width", "layer_volume", "cost_per_length"}
_SF = panel_field("safety_factor")


def panel_values(ev: Evaluation, decimal_mark: str = ".") -> dict:
    """Every value of :data:`app.results.PANEL_FIELDS` for an evaluation (SI, or words), None where it does not
    apply: with a lining, the shears, n and sizes of its check, and the permissible shear and safety factor of the
    check that governs; words that carry a number (the safety factor with the one needed) write it by the one
    rounding rule with ``decimal_mark``."""
    r = ev.result
    out = {f.key: getattr(r, f.key, None) for f in PANEL_FIELDS}
    out.update(flow=ev.flow, freeboard=ev.freeboard, total_depth=ev.total_depth,
               top_width_at_top=ev.top_width_at_top)
    for key in ("side_shear", "bend_shear", "permissible_shear", "safety_factor", "required_d50",
                "layer_thickness", "bend_protection_length", "lined_width", "layer_volume", "cost_per_length"):
        out[key] = None
    st = ev.lining
    if st is not None:
        out.update(bed_shear=st.bed_shear, side_shear=st.side_shear, bend_shear=st.bend_shear,
                   required_d50=st.required_d50, layer_thickness=st.layer_thickness,
                   cost_per_length=st.cost_per_length, manning_n=st.manning_n,
                   bend_protection_length=st.bend_protection_length, lined_width=st.lined_width,
                   layer_volume=st.layer_volume)
        gov = st.governing_check()
        if st.verdict == "non-erodible" or gov is None:
            out["permissible_shear"] = "non-erodible"
            out["safety_factor"] = "\u2014"
        else:
            out["permissible_shear"] = gov.permissible_shear
            out["safety_factor"] = (f"{rounded(gov.safety_factor, _SF, decimal_mark)} "
                                    f"(need {rounded(gov.required_safety_factor, _SF, decimal_mark)})"
                                    if gov.safety_factor is not None else None)
    return out


# -- the evaluation ------------------------------------------------------------
def evaluate(channel: Channel, context: Context) -> Evaluation:
    """Flow, normal and critical depth, the lining check and a verdict in the context's units, with its
    catalogue; never raises for bad input.

    Everything goes through the shared evaluation :func:`app.evaluate.evaluate_channel`
    (the same numbers as the command line and the design sheet). The
    comparison is left out here and made by :func:`compare` when it is shown.
    """
    ev = Evaluation()
    try:
        design = evaluate_channel(_for_facade(channel), context.catalogue)
    except (hy.InputError, hy.NoSolutionError) as exc:
        ev.error, ev.error_field = describe_error(exc, context.units)
        ev.verdict = Verdict("none", "No result", ev.error)
        try:   # the flow and t_c lines of the form still have something to say
            ev.flow, ev.time_of_concentration, _w, _n = design_flow(channel)
        except hy.InputError:
            pass
        return ev
    ev.flow, ev.time_of_concentration = design.flow, design.time_of_concentration
    ev.section, ev.result = design.section, design.analysis
    ev.freeboard, ev.superelevation = design.freeboard, design.superelevation
    ev.total_depth, ev.top_width_at_top = design.total_depth, design.top_width_at_top
    ev.warnings, ev.notes = list(design.warnings), list(design.notes)
    ev.not_verified = design.not_verified
    ev.design = design
    ev.lining = design.stability
    ev.roughness = solver_roughness(channel, context.catalogue)
    ev.verdict = _verdict(ev, context.units)
    return ev


def not_computed(exc: BaseException) -> Evaluation:
    """No result, in words, for an error :func:`evaluate` does not expect (a fault, not bad input): the window
    shows it as it shows any missing result, never as a traceback."""
    error = f"The channel could not be computed: {type(exc).__name__}: {exc}"
    return Evaluation(verdict=Verdict("none", "No result", error), error=error)


def check_section(channel: Channel) -> tuple[str, str | None] | None:
    """A refusal (message, core field) if the channel's section cannot be built, else None.

    The fields check their own ranges; this catches what only the combination
    decides (a V-ditch with both sides vertical, a survey whose ends are lower
    than its bottom). Other gaps (a rational flow still missing C) are shown by
    :func:`evaluate` as the reason there is no result.
    """
    try:
        channel.build_section()
    except hy.InputError as exc:
        return describe_error(exc)
    return None


# -- curves ----------------------------------------------------------------------
@dataclass
class RatingData:
    depths: np.ndarray       # [m]
    flows: np.ndarray        # [m^3/s], Manning at each depth
    critical: np.ndarray     # critical depth for each flow [m] (nan where none)
    switch_depth: float | None = None   # stone: where n passes from Bathurst's relation to Blodgett's [m]


def rating(channel: Channel, ev: Evaluation, points: int = 120) -> RatingData | None:
    """Flow against depth up to about 1.6 times the design total depth (or the full depth)."""
    if not ev.ok:
        return None
    top = 1.6 * max(ev.total_depth, ev.result.normal_depth)
    cap = ev.section.capacity_depth
    if cap is not None:
        top = min(top, cap)
    depths = np.linspace(top / points, top, points)
    flows = rating_curve(ev.section, channel.slope, ev.roughness, depths)
    crit = np.full_like(flows, np.nan)
    try:
        crit = np.asarray(hy.critical_depth(ev.section, flows), dtype=float)
    except hy.NoSolutionError:
        for i, q in enumerate(flows):
            try:
                crit[i] = hy.critical_depth(ev.section, float(q))
            except hy.NoSolutionError:
                pass
    switch = relation_switch_depth(ev.roughness, ev.section)
    return RatingData(depths, flows, crit, switch if switch is not None and switch <= top else None)


@dataclass
class EnergyData:
    depths: np.ndarray       # [m]
    energy: np.ndarray       # [m]
    critical_depth: float
    min_energy: float
    normal_depth: float
    normal_energy: float


def energy(channel: Channel, ev: Evaluation, points: int = 200) -> EnergyData | None:
    """Specific energy against depth for the design flow, from a quarter of y_c to past y_n."""
    if not ev.ok:
        return None
    r = ev.result
    top = 2.2 * max(r.normal_depth, r.critical_depth)
    full = ev.section.full_depth
    if full is not None:
        top = min(top, full)
    low = 0.3 * min(r.normal_depth, r.critical_depth)
    depths = np.geomspace(low, top, points)
    e = specific_energy(ev.section, ev.flow, depths)
    return EnergyData(depths, e, r.critical_depth, specific_energy(ev.section, ev.flow, r.critical_depth),
                      r.normal_depth, r.specific_energy)


def finite(value) -> bool:
    return value is not None and math.isfinite(value)
