"""The top of the ditch: freeboard above the design depth, one rule for every channel.

A lined channel (:func:`hydraulics.stability.check_lining`) and a channel
without a lining (the application's evaluation) both take their freeboard,
total depth, width at the top and the warnings about them from
:func:`ditch_top`, and word the rule with :func:`freeboard_rule`, so that the
window, the sheet, the command line and the batch say the same thing. A ditch
run screens its candidates at every design point with :func:`ditch_tops`, the
same rule on arrays (:func:`ditch_top` is that function for one channel).

Relations (SI):

* freeboard = minimum + superelevation in a bend
  (:func:`hydraulics.linings.hec15.freeboard`): HEC-22, 3rd ed., 2009,
  Section 5.2.4, which gives HEC-15's guidance: about 150 mm (0.5 ft) is
  generally adequate (key ``freeboard``); local design codes govern;
* superelevation V^2 T / (g Rc), HEC-22 Eq. 5-11 (key ``superelevation``;
  HEC-22 puts the outer bank's water half of it above the centre line, the
  program adds all of it);
* supercritical flow in a bend forms cross waves above that estimate
  (Chow 1959, Chapter 15; key ``supercritical_bend``);
* supercritical flow (Froude number above 1): HEC-15 Section 2.1.1 says it
  "may create surface waves whose height approaches the depth of flow" and
  that on very steep grades splash and surge need special consideration for
  freeboard, without a number. HEC-22, 3rd ed., Section 5.2.4 gives the
  number: "a steep gradient channel should have a freeboard height equal to
  the flow depth". The program applies it wherever the flow is supercritical
  (Froude number above 1), the freeboard being at least the flow depth.
  Local codes govern; a chute may need more.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .linings import hec15
from .provenance import cite
from .units import SI, UnitSystem
from .wording import format_quantity, worded

__all__ = ["FREEBOARD_SOURCE", "SUPERELEVATION_SOURCE", "SUPERCRITICAL_BEND_SOURCE", "WAVE_RULE", "DitchTop",
           "DitchTops", "ditch_top", "ditch_tops", "freeboard_rule", "too_shallow_warning"]

FREEBOARD_SOURCE = f"{cite('freeboard')}; local design codes govern and may ask for more"
SUPERELEVATION_SOURCE = f"superelevation in the bend V^2 T / (g Rc), {cite('superelevation')}"
SUPERCRITICAL_BEND_SOURCE = f"{cite('supercritical_bend')}, supercritical flow in curves"
WAVE_RULE = (f"supercritical flow: at least the flow depth, for surface waves whose height approaches the depth "
             f"({cite('supercritical_waves')}; the depth as freeboard of a steep channel, {cite('freeboard')})")


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


@dataclass(frozen=True)
class DitchTops:
    """Freeboard and the top of the ditch for many design depths of one section (SI arrays, one entry each).

    ``superelevation`` is nan on a straight reach, ``wave_allowance`` nan where supercritical flow did not set
    the freeboard; ``supercritical_bend`` and ``too_shallow`` mark the entries whose :func:`ditch_top` carries
    the warning about cross waves in a bend and about a section shallower than depth plus freeboard.
    """

    freeboard: np.ndarray
    superelevation: np.ndarray
    wave_allowance: np.ndarray
    total_depth: np.ndarray
    depth_at_top: np.ndarray
    top_width: np.ndarray
    supercritical_bend: np.ndarray
    too_shallow: np.ndarray


def ditch_tops(section, depth, velocity, top_width, froude, bend_radius=None,
               min_freeboard=hec15.MIN_FREEBOARD) -> DitchTops:
    """Freeboard, total depth and top width of ``section`` at many design depths: the rule of :func:`ditch_top`
    on arrays (the one place it is computed; see the module's text for the relations and their sources).

    ``depth`` [m], ``velocity`` [m/s], ``top_width`` [m] and ``froude`` [-] are arrays of one length (those of
    each design flow); ``bend_radius`` [m] an array with nan on a straight reach, or None for all straight;
    ``min_freeboard`` [m] the project's minimum.
    """
    y, v, t, fr = (np.atleast_1d(np.asarray(a, dtype=float)) for a in (depth, velocity, top_width, froude))
    base = float(hec15.freeboard(minimum=min_freeboard))      # the minimum, checked >= 0
    superelevation = np.full(y.shape, np.nan)
    fb = np.full(y.shape, base)
    bent = np.zeros(y.shape, dtype=bool)
    if bend_radius is not None:
        rc = np.broadcast_to(np.asarray(bend_radius, dtype=float), y.shape)
        bent = ~np.isnan(rc)
        if bent.any():
            # HEC-15 Section 3.4: the minimum plus the superelevation V^2 T / (g Rc) (hec15.freeboard)
            superelevation[bent] = hec15.superelevation(v[bent], t[bent], rc[bent])
            fb[bent] = base + superelevation[bent]
    waved = (fr > 1.0) & (y > fb)       # supercritical: at least the flow depth (WAVE_RULE)
    fb = np.where(waved, y, fb)
    total = y + fb
    at_top = total
    full = section.full_depth
    too_shallow = np.zeros(y.shape, dtype=bool)
    if full is not None:   # one depth, or one per section of an array of pipes
        full = np.broadcast_to(np.asarray(full, dtype=float), y.shape)
        too_shallow = total > full
        at_top = np.where(too_shallow, full, total)
    return DitchTops(freeboard=fb, superelevation=superelevation, wave_allowance=np.where(waved, y, np.nan),
                     total_depth=total, depth_at_top=at_top,
                     top_width=np.broadcast_to(np.asarray(section.top_width(at_top), dtype=float), y.shape).copy(),
                     supercritical_bend=bent & (fr > 1.0), too_shallow=too_shallow)


def ditch_top(section, depth, velocity, top_width, froude, bend_radius=None,
              min_freeboard=hec15.MIN_FREEBOARD) -> DitchTop:
    """Freeboard, total depth and top width of ``section`` at the design ``depth`` [m].

    ``velocity`` [m/s], ``top_width`` [m] and ``froude`` [-] are those of the
    design flow; ``bend_radius`` [m] (None: straight) adds the superelevation;
    ``min_freeboard`` [m] is the project's minimum. A closed or surveyed
    section shallower than depth plus freeboard is reported, never widened.
    The numbers are :func:`ditch_tops` for one channel; this adds the warnings in words.
    """
    fr = float(froude)
    tops = ditch_tops(section, depth, velocity, top_width, froude,
                      None if bend_radius is None else float(bend_radius), min_freeboard)
    warnings = []
    if tops.supercritical_bend[0]:
        warnings.append(f"supercritical flow (Froude number {fr:.2f}) in a bend forms cross waves whose crests can "
                        f"rise above the superelevation estimate ({SUPERCRITICAL_BEND_SOURCE}); allow more "
                        "freeboard or avoid the bend")
    total = float(tops.total_depth[0])
    if tops.too_shallow[0]:
        warnings.append(too_shallow_warning(total, float(section.full_depth), section.kind))
    sup, wave = float(tops.superelevation[0]), float(tops.wave_allowance[0])
    return DitchTop(freeboard=float(tops.freeboard[0]), superelevation=None if bend_radius is None else sup,
                    wave_allowance=None if math.isnan(wave) else wave, total_depth=total,
                    depth_at_top=float(tops.depth_at_top[0]), top_width=float(tops.top_width[0]),
                    warnings=tuple(warnings))


def too_shallow_warning(total_depth: float, full_depth: float, kind: str):
    """The warning where the design depth plus freeboard, ``total_depth`` [m], is above a closed or surveyed
    section's ``full_depth`` [m] (the section is reported, never widened); ``kind`` names the section."""
    return worded("the design depth plus freeboard ({total}) is above the section's full depth ({full}): "
                  "the {kind} is not deep enough for the freeboard", total=(total_depth, "length"),
                  full=(full_depth, "length"), kind=kind)


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
