"""The same channel and flow with several linings, one row each (SI).

Each row holds the numbers of :func:`hydraulics.stability.check_lining` for that lining (HEC-15's
permissible-shear check, with freeboard, lined width, layer volume and cost per length), so a comparison says
nothing a single check would not. The application lays the rows out as one table (``app.comparison_table``).
"""

from __future__ import annotations

from dataclasses import dataclass, field

from . import validate
from .errors import InputError, NoSolutionError
from .linings import hec15
from .stability import StabilityResult, check_lining
from .units import SI, UnitSystem
from .wording import in_units, worded, worded_sizes

__all__ = ["ComparisonRow", "compare_linings", "parse_choice"]


@dataclass
class ComparisonRow:
    """One lining of a comparison (SI). ``error`` is set, and the numbers None, when it has no solution."""

    key: str
    name: str
    d50: float | None
    depth: float | None
    velocity: float | None
    froude: float | None
    manning_n: float | None
    design_shear: float | None       # design shear of the governing check [Pa]
    permissible_shear: float | None  # permissible shear of the governing check [Pa]
    safety_factor: float | None
    required_safety_factor: float | None
    verdict: str                     # "stable" | "not stable" | "non-erodible" | "no solution"
    stable: bool | None
    governs: str | None
    reason: str
    required_d50: float | None
    total_depth: float | None
    lined_width: float | None        # [m per m of channel]
    layer_volume: float | None       # [m^3 per m]
    cost_per_length: float | None    # [$ per m]; None without a unit cost
    warnings: list = field(default_factory=list)
    error: str | None = None
    result: StabilityResult | None = field(default=None, repr=False)

    def to_dict(self, units: UnitSystem = SI) -> dict:
        L = lambda v: None if v is None else float(units.from_si("length", v))  # noqa: E731
        T = lambda v: None if v is None else float(units.from_si("shear", v))  # noqa: E731
        return {
            "lining": self.key, "name": in_units(worded_sizes(self.name), units), "d50": L(self.d50),
            "depth": L(self.depth),
            "velocity": None if self.velocity is None else float(units.from_si("velocity", self.velocity)),
            "froude": self.froude, "manning_n": self.manning_n, "design_shear": T(self.design_shear),
            "permissible_shear": T(self.permissible_shear), "safety_factor": self.safety_factor,
            "required_safety_factor": self.required_safety_factor, "verdict": self.verdict,
            "stable": self.stable, "governs": self.governs,
            "reason": self.result.reason(units) if self.result is not None else in_units(self.reason, units),
            "required_d50": L(self.required_d50), "total_depth": L(self.total_depth),
            "lined_width": L(self.lined_width),
            "layer_volume": None if self.layer_volume is None else float(units.from_si("volume_per_length",
                                                                                      self.layer_volume)),
            "cost_per_length": None if self.cost_per_length is None else float(units.from_si("cost_per_length",
                                                                                            self.cost_per_length)),
            "warnings": [in_units(w, units) for w in self.warnings],
            "error": None if self.error is None else in_units(self.error, units),
        }


def parse_choice(choice):
    """(key, d50 or None) from "key", "key:D50" [m], (key, d50), or an object with .key and .d50."""
    if isinstance(choice, str):
        key, sep, size = choice.partition(":")
        key = key.strip()
        if not key:
            raise InputError("lining", f"is empty in {choice!r} (give a catalogue key, e.g. riprap:0.15)")
        if not sep:
            return key, None
        try:
            d = float(size)
        except ValueError:
            raise InputError("d50", f"must be a number after ':' in {choice!r}, got {size!r}") from None
        return key, float(validate.positive("d50", d))
    if isinstance(choice, (tuple, list)) and len(choice) == 2:
        return str(choice[0]), choice[1]
    if hasattr(choice, "key"):
        return choice.key, getattr(choice, "d50", None)
    raise InputError("lining", f"must be a key, 'key:D50', (key, d50) or a lining choice, got {choice!r}")


def compare_linings(section, flow, slope, choices, catalogue, bend_radius=None,
                    min_freeboard=hec15.MIN_FREEBOARD, **options) -> list[ComparisonRow]:
    """The same channel and flow with several linings: one :class:`ComparisonRow` each.

    Parameters
    ----------
    section, flow, slope, bend_radius, min_freeboard
        As for :func:`check_lining` (SI).
    choices : iterable
        Linings: "key", "key:D50" (D50 in m), (key, d50) pairs or objects
        with ``key`` and ``d50`` (such as ``app.project.LiningChoice``).
    catalogue : hydraulics.linings.Catalogue
        Where the keys are looked up.
    **options
        Passed to :func:`check_lining` (``min_safety_factor``, ``min_velocity``).

    Returns
    -------
    list[ComparisonRow]
        In the order given. Each row's numbers are those of
        :func:`check_lining` for that lining (kept in ``row.result``). A lining
        with no normal depth gets a row with ``verdict`` "no solution" and
        the reason in ``error``; bad input raises InputError.

    Notes
    -----
    Lined width: the perimeter up to the top of the ditch
    (``hydraulics.lining_quantities.LINED_WIDTH_RULE``).
    Layer volume: lined width times the layer thickness of the catalogue rule
    (a thin-layer estimate). Cost: the user's unit cost (catalogue field
    ``unit_cost``) per m^2 of lined width or per m^3 of layer; None when no
    cost is set; never invented.
    """
    rows = []
    choices = list(choices)
    if not choices:
        raise InputError("lining", "give at least one lining to compare")
    for choice in choices:
        key, d50 = parse_choice(choice)
        lining = catalogue.get(key)
        try:
            r = check_lining(section, flow, slope, lining, d50=d50, bend_radius=bend_radius,
                             min_freeboard=min_freeboard, **options)
        except NoSolutionError as exc:
            said = exc.said()
            rows.append(ComparisonRow(
                key=key, name=lining.name, d50=d50, depth=None, velocity=None, froude=None, manning_n=None,
                design_shear=None, permissible_shear=None, safety_factor=None, required_safety_factor=None,
                verdict="no solution", stable=None, governs=None, reason=worded("no solution: {why}", why=said),
                required_d50=None, total_depth=None, lined_width=None, layer_volume=None, cost_per_length=None,
                warnings=[], error=said, result=None))
            continue
        gov = r.governing_check()
        rows.append(ComparisonRow(
            key=r.lining_key, name=r.lining_name, d50=r.d50, depth=r.depth, velocity=r.velocity, froude=r.froude,
            manning_n=r.manning_n, design_shear=gov.design_shear, permissible_shear=gov.permissible_shear,
            safety_factor=r.safety_factor, required_safety_factor=gov.required_safety_factor, verdict=r.verdict,
            stable=r.stable, governs=r.governs, reason=r.reason(), required_d50=r.required_d50,
            total_depth=r.total_depth, lined_width=r.lined_width, layer_volume=r.layer_volume,
            cost_per_length=r.cost_per_length, warnings=list(r.warnings), error=None, result=r))
    return rows
