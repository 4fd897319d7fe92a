"""A solved ditch run as its results panel states it, for every front end: the verdict on the run, the lining
schedule with its quantities and costs and the total, the water surface's controls and jumps, the cautions,
the method notes and the published values not yet verified. Qt-free.

Everything is text in the user's units, rounded by the rules of :mod:`app.results` (taken from
:class:`app.run_design.RunDesign`: ``schedule_rows``, ``total_cost_text``, ``control_rows``, ``jump_rows``),
and each design point's verdict is a word of the one vocabulary (:mod:`app.verdicts`). The window's results
panel, the run sheet and ``ditchwright run`` lay these lines out; ``run --json`` gives the same numbers
unrounded (:meth:`app.run_design.RunDesign.to_dict`).

    from app.run_summary import run_summary
    s = run_summary(design, units)
    s.verdict.status, s.headline, s.reason       # "pass", "Every station stable", "21 design points, ..."
    s.stretches[0]["cost"], s.total_cost         # "$ 12,345", "$ 54,544"
"""

from __future__ import annotations

from dataclasses import dataclass

from hydraulics.units import UnitSystem
from hydraulics.wording import in_units

from .run_design import RunDesign
from .verdicts import Verdict

__all__ = ["RunSummary", "run_summary", "station_verdict", "station_verdicts"]


def station_verdict(values: dict) -> Verdict:
    """The verdict on one design point, from its row of :meth:`app.run_design.RunDesign.station_values`: not
    stable where no candidate lining holds, too shallow where the water and its freeboard do not fit the ditch as
    built, not checked where there is no normal depth (no flow yet, a zero or adverse grade), else stable."""
    if values["stable"] is not None and not values["stable"]:
        return Verdict.UNSTABLE
    if values["fits"] is not None and not values["fits"]:
        return Verdict.TOO_SHALLOW
    if values["not_checked"]:
        return Verdict.NOT_CHECKED
    return Verdict.STABLE


def station_verdicts(design: RunDesign, units: UnitSystem) -> list[Verdict]:
    """The verdict on each design point of ``design``, in the order of the station table."""
    return [station_verdict(v) for v in design.station_values(units)]


def _plural(count: int, word: str, plural: str = "s") -> str:
    return f"{count} {word}{plural if count != 1 else ''}"


@dataclass(frozen=True)
class RunSummary:
    """A solved run in words and rounded numbers, in one unit system."""

    verdict: Verdict          # the run's: not stable or too shallow where any point is, else not checked, else stable
    headline: str             # "Every station stable", "2 stations fail", "1 station not checked"
    reason: str               # what the headline means, in a sentence
    stations: tuple           # the verdict of each design point (Verdict), in station order
    stretches: tuple          # app.run_design.RunDesign.schedule_rows: number, from/to station, lining, length...
    length_unit: str          # the unit of the stretches' lengths
    total_cost: str           # "$ 54,544"
    controls: tuple           # the water surface's controls, one line each
    jumps: tuple              # the hydraulic jumps, one line each ("at 0+329.14: 0.229 m to 0.549 m over ...")
    warnings: tuple           # the run's cautions, in the user's units
    notes: tuple              # statements of method
    not_verified: tuple       # published values leant on and not yet read in their publication


def run_summary(design: RunDesign, units: UnitSystem) -> RunSummary:
    """What the results of ``design`` say, in ``units`` (see the module's docstring)."""
    values = design.station_values(units)
    stations = tuple(station_verdict(v) for v in values)
    failing = [v for v in stations if v.status == "fail"]
    # a point with no flow yet (the top of the run) is not checked and needs no saying so
    unchecked = [v for v, p in zip(stations, design.result.points) if v is Verdict.NOT_CHECKED and p.flow > 0]
    stretches = tuple(design.schedule_rows(units))
    total = design.total_cost_text()
    if failing:
        verdict = Verdict.UNSTABLE if Verdict.UNSTABLE in failing else Verdict.TOO_SHALLOW
        headline = f"{_plural(len(failing), 'station')} fail"
        reason = ("No candidate lining is stable there, or the water and its freeboard do not fit the ditch as "
                  "built: see the rows marked in the station table and on the profile.")
    elif unchecked:
        verdict = Verdict.NOT_CHECKED
        headline = f"{_plural(len(unchecked), 'station')} not checked"
        reason = "Stations with flow but no normal depth (zero or adverse grade)."
    else:
        verdict = Verdict.STABLE
        headline = "Every station stable"
        reason = (f"{_plural(len(stations), 'design point')}, {_plural(len(stretches), 'lining stretch', 'es')}, "
                  f"total {total}.")
    return RunSummary(
        verdict=verdict, headline=headline, reason=reason, stations=stations, stretches=stretches,
        length_unit=units.label("length"), total_cost=total, controls=tuple(design.control_rows(units)),
        jumps=tuple(design.jump_rows(units)), warnings=tuple(in_units(w, units) for w in design.warnings),
        notes=tuple(in_units(n, units) for n in design.notes),
        not_verified=tuple(in_units(n, units) for n in design.not_verified))
