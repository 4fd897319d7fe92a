"""The top of the ditch: freeboard above the design depth, one rule for every channel.

A lined channel (:func:`hydraulics.stability.check_lining`) and a channel
without a lining (the application's evaluation) both take their freeboard,
total depth, width at the top and the warnings about them from
:func:`ditch_top`, and word the rule with :func:`freeboard_rule`, so that the
window, the sheet, the command line and the batch say the same thing.

Relations (SI):

* freeboard = minimum + superelevation in a bend, HEC-15 Section 2 and
  Section 3.4 (:func:`hydraulics.linings.hec15.freeboard`; the minimum is not
  yet verified against the circular, see :mod:`hydraulics.provenance`, key
  ``freeboard``; local design codes govern);
* superelevation V^2 T / (g Rc) (key ``superelevation``);
* supercritical flow in a bend forms cross waves above that estimate
  (Chow 1959, Chapter 15; key ``supercritical_bend``);
* supercritical flow (Froude number above 1): HEC-15 Section 2.1.1 says it
  "may create surface waves whose height approaches the depth of flow" and
  that on very steep grades splash and surge need special consideration for
  freeboard, without a number. This program's rule, drawn from those words:
  the freeboard is at least the flow depth (a wave as high as the depth stays
  inside the ditch). Local codes govern; a chute may need more.
"""

from __future__ import annotations

from dataclasses import dataclass

from .linings import hec15
from .provenance import cite
from .units import SI, UnitSystem
from .wording import format_quantity, worded

__all__ = ["FREEBOARD_SOURCE", "SUPERELEVATION_SOURCE", "SUPERCRITICAL_BEND_SOURCE", "WAVE_RULE", "DitchTop",
           "ditch_top", "freeboard_rule"]

FREEBOARD_SOURCE = f"{cite('freeboard')}; local design codes govern and may ask for more"
SUPERELEVATION_SOURCE = f"superelevation in the bend V^2 T / (g Rc), {cite('superelevation')}"
SUPERCRITICAL_BEND_SOURCE = f"{cite('supercritical_bend')}, supercritical flow in curves"
WAVE_RULE = (f"supercritical flow: at least the flow depth, for surface waves whose height approaches the depth "
             f"({cite('supercritical_waves')}; the circular gives no number, this rule is the program's)")


@dataclass(frozen=True)
class DitchTop:
    """Freeboard and the top of the ditch for one design depth (SI)."""

    freeboard: float              # minimum plus superelevation [m]
    superelevation: float | None  # in a bend [m]; None on a straight reach
    wave_allowance: float | None  # supercritical flow: the flow depth [m], when it sets the freeboard; else None
    total_depth: float            # design depth plus freeboard [m]
    depth_at_top: float           # total depth, or the section's full depth where that is less [m]
    top_width: float              # width at depth_at_top [m]
    warnings: tuple               # worded once (see hydraulics.wording)


def ditch_top(section, depth, velocity, top_width, froude, bend_radius=None,
              min_freeboard=hec15.MIN_FREEBOARD) -> DitchTop:
    """Freeboard, total depth and top width of ``section`` at the design ``depth`` [m].

    ``velocity`` [m/s], ``top_width`` [m] and ``froude`` [-] are those of the
    design flow; ``bend_radius`` [m] (None: straight) adds the superelevation;
    ``min_freeboard`` [m] is the project's minimum. A closed or surveyed
    section shallower than depth plus freeboard is reported, never widened.
    """
    y, v, t, fr = float(depth), float(velocity), float(top_width), float(froude)
    warnings = []
    superelevation = None if bend_radius is None else float(hec15.superelevation(v, t, bend_radius))
    if bend_radius is not None and fr > 1.0:
        warnings.append(f"supercritical flow (Froude number {fr:.2f}) in a bend forms cross waves whose crests can "
                        f"rise above the superelevation estimate ({SUPERCRITICAL_BEND_SOURCE}); allow more "
                        "freeboard or avoid the bend")
    fb = float(hec15.freeboard(v, t, bend_radius, minimum=min_freeboard))
    wave = y if fr > 1.0 and y > fb else None
    if wave is not None:
        fb = wave
    total = y + fb
    at_top = total
    full = section.full_depth
    if full is not None and total > float(full):
        at_top = float(full)
        warnings.append(worded("the design depth plus freeboard ({total}) is above the section's full depth ({full}): "
                               "the {kind} is not deep enough for the freeboard", total=(total, "length"),
                               full=(float(full), "length"), kind=section.kind))
    return DitchTop(freeboard=fb, superelevation=superelevation, wave_allowance=wave, total_depth=total,
                    depth_at_top=at_top,
                    top_width=float(section.top_width(at_top)), warnings=tuple(warnings))


def freeboard_rule(min_freeboard: float, superelevation: float | None = None, units: UnitSystem = SI,
                   wave_allowance: float | None = None) -> str:
    """The freeboard rule applied, in words, in ``units``, with its source; says which part set the freeboard."""
    text = f"minimum freeboard {format_quantity(min_freeboard, 'length', units)} ({FREEBOARD_SOURCE})"
    if superelevation is not None:
        text += f", plus {format_quantity(superelevation, 'length', units)} {SUPERELEVATION_SOURCE}"
    if wave_allowance is not None:
        text += (f"; raised to {format_quantity(wave_allowance, 'length', units)} by the rule for "
                 f"{WAVE_RULE}")
    return text
