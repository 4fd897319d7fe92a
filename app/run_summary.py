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

__all__ = ["RunSummary", "StationState", "TROUBLE", "run_summary", "station_states"]


#: What can be wrong at a design point, in the order every front end names it, with the verdict each makes (the
#: first that holds gives the point's verdict). The words are also the trouble bands of the profile
#: (:mod:`app.run_drawing`); "overtopped" is the part of "too shallow" where the water rises over the banks.
TROUBLE = {"not stable": Verdict.UNSTABLE, "overtopped": Verdict.TOO_SHALLOW, "too shallow": Verdict.TOO_SHALLOW,
           "not computed": Verdict.NOT_CHECKED, "not checked": Verdict.NOT_CHECKED}
#: A trouble's words where the band's are too short to stand alone.
_TROUBLE_WORDS = {"not computed": "water surface not computed"}


@dataclass(frozen=True)
class StationState:
    """A design point's verdict and what is wrong there: the one answer that the window's station table (word and
    colour), the run sheet's status column, ``ditchwright run``'s marks and the profile's trouble bands show."""

    verdict: Verdict           # not stable, too shallow, not checked or stable
    trouble: tuple             # keys of TROUBLE that hold here, in that order (empty where the point passes)
    why: str = ""              # why no lining was checked here (no flow yet, a zero or adverse grade), else ""
    partial_area: bool = False  # a part of the drainage area gives the larger flow here

    def trouble_words(self) -> list[str]:
        """What is wrong here, in words ("not stable", "overtopped", the reason it was not checked)."""
        return [self.why if k == "not checked" else _TROUBLE_WORDS.get(k, k) for k in self.trouble]

    def status_words(self) -> str:
        """The point's status as the run sheet prints it: the verdict's heading ("TOO SHALLOW"), the other troubles
        there in capitals ("OVERTOPPED"), then why it was not checked and whether a partial area governs."""
        parts = [self.verdict.heading]
        parts += [w.upper() for k, w in zip(self.trouble, self.trouble_words())
                  if k != "not checked" and w.upper() != self.verdict.heading]
        if self.why:
            parts.append(self.why)
        if self.partial_area:
            parts.append("partial area governs")
        return ", ".join(parts)


def station_states(design: RunDesign) -> list[StationState]:
    """The state of each design point of ``design``, in the order of the station table: not stable where no
    candidate lining holds (the schedule's finding, as in the run's warnings), overtopped or too shallow where the
    water and its freeboard do not fit the ditch as built, not computed where the water surface could not be
    computed, not checked where there is no normal depth (a zero or adverse grade; no flow yet is not checked
    either, but nothing is wrong there)."""
    ws, flows = design.surface, design.result.flows
    out = []
    for p in design.result.points:
        i = p.index
        flags = {"not stable": p.not_checked is None and bool(p.failing),
                 "overtopped": bool(ws.overtopped[i]),
                 "too shallow": ws.fits[i] is False and not bool(ws.overtopped[i]),
                 "not computed": ws.profile_type[i] == "not computed",
                 "not checked": p.not_checked is not None and p.flow > 0}
        trouble = tuple(k for k in TROUBLE if flags[k])
        verdict = (TROUBLE[trouble[0]] if trouble else Verdict.NOT_CHECKED if p.not_checked is not None
                   else Verdict.STABLE)
        out.append(StationState(verdict, trouble, p.not_checked or "", bool(flows.partial[i])))
    return out


def _plural(count: int, word: str, plural: str = "s") -> str:
    return f"{count} {word}{plural if count != 1 else ''}"


@dataclass(frozen=True)
class RunSummary:
    """A solved run in words and rounded numbers, in one unit system."""

    verdict: Verdict          # the run's: not stable or too shallow where any point is, else not checked, else stable
    headline: str             # "Every station stable", "2 stations fail", "1 station not checked"
    reason: str               # what the headline means, in a sentence
    stations: tuple           # the verdict of each design point (Verdict), in station order
    states: tuple             # the state of each design point (StationState: verdict and troubles), in station order
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
    states = tuple(station_states(design))
    stations = tuple(st.verdict for st in states)
    failing = [v for v in stations if v.status == "fail"]
    # a point with no flow yet (the top of the run) is not checked and needs no saying so
    unchecked = [st for st in states if st.trouble]
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
        reason = ("Stations with flow but no normal depth (zero or adverse grade), or where the water surface "
                  "could not be computed.")
    else:
        verdict = Verdict.STABLE
        headline = "Every station stable"
        reason = (f"{_plural(len(stations), 'design point')}, {_plural(len(stretches), 'lining stretch', 'es')}, "
                  f"total {total}.")
        dry = sum(v is Verdict.NOT_CHECKED for v in stations)   # no flow yet: the only stations left unchecked
        if dry:
            reason += (f" {_plural(dry, 'station')} without flow yet (the top of the run) "
                       f"{'is' if dry == 1 else 'are'} not checked.")
    return RunSummary(
        verdict=verdict, headline=headline, reason=reason, stations=stations, states=states, stretches=stretches,
        length_unit=units.label("length"), total_cost=total, controls=tuple(design.control_rows(units)),
        jumps=tuple(design.jump_rows(units)), warnings=tuple(in_units(w, units) for w in design.warnings),
        notes=tuple(in_units(n, units) for n in design.notes),
        not_verified=tuple(in_units(n, units) for n in design.not_verified))
