"""The verdict on a channel, in one vocabulary for the window, the sheet, the command line and the batch.

Each verdict has one token (the batch CSV's ``verdict`` column and JSON), one
set of words (the window's headline, the comparison table), one heading (the
design sheet's box) and one status that front ends colour by. No front end
spells a verdict itself. Qt-free.

The tokens of the batch CSV are a published contract (README, "Batch"):
``stable``, ``unstable``, ``non-erodible``, ``hydraulics-only``,
``not-checked``, ``no-solution``, ``invalid``. ``too-shallow`` is given only
where the ditch's depth is known (window, sheet): design depth plus freeboard
above the section's full depth.
"""

from __future__ import annotations

from enum import Enum

from hydraulics.wording import worded

__all__ = ["Verdict", "verdict_of", "row_verdict", "with_tokens", "too_shallow_reason"]


class Verdict(Enum):
    """(token, words, heading, status); status is "pass", "fail", "unchecked" or "none"."""

    STABLE = ("stable", "Stable", "STABLE", "pass")
    UNSTABLE = ("unstable", "Not stable", "NOT STABLE", "fail")
    NON_ERODIBLE = ("non-erodible", "Non-erodible", "NON-ERODIBLE", "pass")
    TOO_SHALLOW = ("too-shallow", "Too shallow", "TOO SHALLOW", "fail")
    HYDRAULICS_ONLY = ("hydraulics-only", "Hydraulics only", "HYDRAULICS ONLY", "unchecked")
    NOT_CHECKED = ("not-checked", "Not checked", "NOT CHECKED", "unchecked")
    NO_SOLUTION = ("no-solution", "No solution", "NO SOLUTION", "none")
    INVALID = ("invalid", "Invalid input", "INVALID INPUT", "none")

    def __init__(self, token: str, words: str, heading: str, status: str):
        self.token, self.words, self.heading, self.status = token, words, heading, status

    @classmethod
    def from_token(cls, token: str) -> "Verdict":
        for v in cls:
            if v.token == token:
                return v
        raise ValueError(f"no verdict {token!r}; known: {', '.join(v.token for v in cls)}")


#: The core's words for a lining check (hydraulics.stability.StabilityResult.verdict).
_CORE = {"stable": Verdict.STABLE, "not stable": Verdict.UNSTABLE, "non-erodible": Verdict.NON_ERODIBLE}


def verdict_of(stability=None, total_depth: float | None = None, full_depth: float | None = None) -> Verdict:
    """The verdict on one channel: too shallow for its freeboard first (where the ditch's depth is known), then
    the lining check's own verdict, else hydraulics only (no lining chosen)."""
    if full_depth is not None and total_depth is not None and total_depth > full_depth * (1 + 1e-9):
        return Verdict.TOO_SHALLOW
    if stability is None:
        return Verdict.HYDRAULICS_ONLY
    return _CORE[stability.verdict]


def row_verdict(row, full_depth: float | None = None) -> Verdict:
    """The verdict on one lining of a comparison (hydraulics.lining_comparison.ComparisonRow): no solution where it
    could not be checked, else as :func:`verdict_of` with the ditch's depth where it is known."""
    if row.result is None:
        return Verdict.NO_SOLUTION
    return verdict_of(row.result, row.result.total_depth, full_depth)


def with_tokens(data: dict, stability=None, full_depth: float | None = None, rows=()) -> dict:
    """A JSON summary whose ``stability.verdict`` and ``comparison[].verdict`` (the core's words) become tokens of
    the one vocabulary, ``rows`` being the comparison rows behind ``data["comparison"]``."""
    if stability is not None and "stability" in data:
        data["stability"]["verdict"] = verdict_of(stability).token
    for d, row in zip(data.get("comparison", ()), rows):
        d["verdict"] = row_verdict(row, full_depth).token
    return data


def too_shallow_reason(section, total_depth: float) -> str:
    """Why a channel is too shallow, worded once (SI; restate with hydraulics.wording.in_units)."""
    where = "crown of the pipe" if section.kind == "circle" else "top of the section"
    return worded("water plus freeboard reaches {total}, above the {where} at {full}", total=(total_depth, "length"),
                  where=where, full=(float(section.full_depth), "length"))
