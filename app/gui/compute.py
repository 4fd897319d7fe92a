"""What the window shows for one channel, computed by the core. No Qt here.

The widgets never compute: they hand a :class:`app.project.Channel` to
:func:`evaluate` and draw what comes back. Everything about linings (their
roughness, the stability check, freeboard in bends, the comparison) goes
through the few functions marked "lining" below, so that they can follow the
lining catalogue and its checks as those grow.
"""

from __future__ import annotations

import copy
import math
from dataclasses import dataclass, field

import numpy as np

import hydraulics as hy
from hydraulics import rational, validate
from hydraulics.curves import rating_curve, specific_energy
from hydraulics.units import UnitSystem

from ..project import Channel, LiningChoice

#: Core field names as the user reads them (for messages that name a field).
FIELD_LABELS = {
    "flow": "Design flow", "value": "Design flow", "slope": "Bed slope", "n": "Manning's n",
    "manning_n": "Manning's n", "bottom_width": "Bottom width", "side_slope": "Side slope",
    "left_slope": "Left side slope", "right_slope": "Right side slope", "diameter": "Diameter",
    "top_width": "Top width", "at_depth": "Depth of top width", "stations": "Stations", "elevations": "Elevations",
    "runoff_coefficient": "Runoff coefficient C", "intensity": "Rainfall intensity", "area": "Drainage area",
    "flow_length": "Flow-path length", "flow_path_slope": "Flow-path slope", "depth": "Depth",
    "min_freeboard": "Minimum freeboard", "bend_radius": "Bend radius", "d50": "Stone size D50",
}


@dataclass
class Verdict:
    status: str      # "pass" | "fail" | "unchecked" | "none"
    headline: str    # a few words: "Lining holds", "Lining fails", ...
    reason: str      # one sentence, with numbers in the user's units


@dataclass
class LiningCheck:
    """The lining's stability at the design flow (from the lining catalogue's checks)."""

    key: str
    name: str
    manning_n: float
    design_shear: float          # [Pa], the governing one
    permissible_shear: float     # [Pa]
    safety_factor: float         # [-] permissible / design
    stable: bool
    governs: str                 # "bed", "side slopes", "bend"
    thickness: float | None      # lining layer thickness [m]
    details: dict = field(default_factory=dict)


@dataclass
class Evaluation:
    """Everything shown for one channel, SI. ``result`` is None when there is no answer."""

    flow: float | None = None
    time_of_concentration: float | None = None   # Kirpich [s], when asked for
    section: hy.Section | None = None
    roughness: object = None
    result: hy.ChannelResult | None = None
    lining: LiningCheck | None = None
    freeboard: float | None = None
    total_depth: float | None = None
    verdict: Verdict = field(default_factory=lambda: Verdict("none", "No result", ""))
    warnings: list = field(default_factory=list)
    error: str | None = None          # why there is no result, in words
    error_field: str | None = None    # the core's name of the input at fault, if one is

    @property
    def ok(self) -> bool:
        return self.result is not None


def describe_error(exc: Exception) -> tuple[str, str | None]:
    """(message in words, core field name or None) for an error from the core."""
    if isinstance(exc, hy.InputError):
        label = FIELD_LABELS.get(exc.field, exc.field.replace("_", " "))
        text = str(exc).split(": ", 1)[-1]
        return f"{label} {text}", exc.field
    if isinstance(exc, hy.NoSolutionError):
        return f"No solution: {exc}", None
    raise exc


def design_flow(channel: Channel) -> tuple[float, float | None, list]:
    """Design flow [m^3/s], Kirpich's t_c [s] or None, and the method's cautions."""
    fb = channel.flow
    if fb.method != "rational":
        return validate.positive("flow", fb.value), None, []
    q = rational.rational_flow(fb.runoff_coefficient, fb.intensity, fb.area)
    notes = rational.rational_warnings(fb.area)
    tc = None
    if fb.flow_length is not None or fb.flow_path_slope is not None:
        tc = rational.kirpich_time(fb.flow_length, fb.flow_path_slope)
        notes += rational.kirpich_warnings(fb.flow_path_slope, fb.area)
    return q, tc, notes


# -- lining ------------------------------------------------------------------
LININGS_AVAILABLE = False


def lining_roughness(channel: Channel, section: hy.Section):
    """Manning's n (or a roughness model) for the channel.

    Until the lining catalogue is installed the channel's own Manning's n is
    used; a surveyed section with no n set uses its own n per segment.
    """
    if channel.manning_n is not None:
        return channel.manning_n
    if section.kind == "irregular":
        return None
    raise hy.InputError("manning_n", "is missing (Manning's n, a number > 0 such as 0.030)")


def assess_lining(channel: Channel, ev: Evaluation, units: UnitSystem) -> None:
    """Lining stability, freeboard, total depth and the verdict, written into ``ev``."""
    r = ev.result
    ev.freeboard = channel.min_freeboard
    ev.total_depth = r.normal_depth + ev.freeboard
    ev.lining = None
    full = ev.section.full_depth
    if full is not None and ev.total_depth > full * (1 + 1e-9):
        where = "crown of the pipe" if ev.section.kind == "circle" else "lower bank"
        ev.verdict = Verdict("fail", "Too small",
                             f"Water plus freeboard reaches {_len(ev.total_depth, units)}, above the {where} "
                             f"at {_len(full, units)}.")
        return
    if channel.lining is not None:
        ev.verdict = Verdict("unchecked", "Stability not checked",
                             f"Lining '{channel.lining.key}' is set, but the lining catalogue and its "
                             "stability check are not installed; only the hydraulics are shown.")
    else:
        ev.verdict = Verdict("unchecked", "Hydraulics only",
                             "No lining chosen: depth and velocity are solved with the Manning's n given; "
                             "choose a lining to check its stability.")


def catalogue_choices() -> list[tuple[str, str]]:
    """(key, name) of every lining the user can choose, in catalogue order."""
    return []


@dataclass
class ComparisonRow:
    choice: LiningChoice
    name: str
    evaluation: Evaluation
    cost_per_length: float | None = None   # [currency/m], from the user's unit costs


def compare(channel: Channel, choices, units: UnitSystem) -> list[ComparisonRow]:
    """One row per lining for the same channel and flow (empty until the lining catalogue is available)."""
    if not LININGS_AVAILABLE:
        return []
    names = dict(catalogue_choices())
    return [ComparisonRow(c, names.get(c.key, c.key), evaluate(with_lining(channel, c), units)) for c in choices]


#: Columns of the comparison table: (heading, quantity for the unit, how to read the value from a row).
COMPARISON_COLUMNS = (
    ("Lining", "", lambda r: r.name),
    ("Depth", "length", lambda r: r.evaluation.result.normal_depth if r.evaluation.ok else None),
    ("Velocity", "velocity", lambda r: r.evaluation.result.velocity if r.evaluation.ok else None),
    ("Froude", "", lambda r: r.evaluation.result.froude if r.evaluation.ok else None),
    ("n", "", lambda r: r.evaluation.lining.manning_n if r.evaluation.lining else None),
    ("Design shear", "shear", lambda r: r.evaluation.lining.design_shear if r.evaluation.lining else None),
    ("Permissible shear", "shear", lambda r: r.evaluation.lining.permissible_shear if r.evaluation.lining else None),
    ("Safety factor", "", lambda r: r.evaluation.lining.safety_factor if r.evaluation.lining else None),
    ("Verdict", "", lambda r: r.evaluation.verdict.headline),
    ("Governs", "", lambda r: r.evaluation.lining.governs if r.evaluation.lining else ""),
    ("Cost", "cost_per_length", lambda r: r.cost_per_length),
)
_DIGITS = {"Depth": 3, "Velocity": 2, "Froude": 2, "n": 4, "Design shear": 1, "Permissible shear": 1,
           "Safety factor": 2, "Cost": 2}


def comparison_table(rows, units: UnitSystem) -> tuple[list[str], list[list[str]]]:
    """Headings with units, and the cells as text in the user's units."""
    heads = [h + (f" [{units.label(q)}]" if q else "") for h, q, _ in COMPARISON_COLUMNS]
    body = []
    for r in rows:
        cells = []
        for head, q, get in COMPARISON_COLUMNS:
            v = get(r)
            if head == "Lining" and r.choice.d50:
                v += f", D50 {units.from_si('small_length', r.choice.d50):.0f} {units.label('small_length')}"
            if v is None:
                cells.append("—")
            elif isinstance(v, str):
                cells.append(v)
            else:
                v = float(units.from_si(q, v)) if q else float(v)
                cells.append(f"{v:.{_DIGITS.get(head, 3)}f}")
        body.append(cells)
    return heads, body


def comparison_tsv(rows, units: UnitSystem) -> str:
    """The comparison as tab-separated text, for pasting into a spreadsheet."""
    heads, body = comparison_table(rows, units)
    return "\n".join("\t".join(c.replace("\t", " ") for c in line) for line in [heads, *body]) + "\n"


def with_lining(channel: Channel, choice: LiningChoice) -> Channel:
    """A copy of ``channel`` lined with ``choice``."""
    out = copy.deepcopy(channel)
    out.lining = copy.deepcopy(choice)
    return out


# -- the evaluation ------------------------------------------------------------
def evaluate(channel: Channel, units: UnitSystem) -> Evaluation:
    """Flow, normal and critical depth, the lining check and a verdict; never raises for bad input."""
    ev = Evaluation()
    try:
        ev.flow, ev.time_of_concentration, notes = design_flow(channel)
        ev.warnings.extend(notes)
        ev.section = channel.build_section()
        ev.roughness = lining_roughness(channel, ev.section)
        ev.result = hy.analyse(ev.section, ev.flow, channel.slope, ev.roughness)
        ev.warnings.extend(ev.result.warnings)
        assess_lining(channel, ev, units)
    except (hy.InputError, hy.NoSolutionError) as exc:
        ev.result = None
        ev.error, ev.error_field = describe_error(exc)
        ev.verdict = Verdict("none", "No result", ev.error)
    return ev


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
    return RatingData(depths, flows, crit)


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


def _len(value: float, units: UnitSystem) -> str:
    return f"{units.from_si('length', value):.2f} {units.label('length')}"


def finite(value) -> bool:
    return value is not None and math.isfinite(value)
