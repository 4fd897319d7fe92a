"""Every candidate lining at every design point of a ditch run, on arrays: what the lining schedule needs.

A ditch run (:mod:`hydraulics.ditch_run`) needs, for each design point and candidate, whether the lining holds,
by how much, how wide it is laid and how much layer it takes. This module works that out for all the points of
one section and one lining at once, with the array forms of the relations that the one-channel check
(:func:`hydraulics.stability.check_lining`) strings together, in the same order (Kilgore, R. T. and Cotton,
G. K., *Design of Roadside Channels with Flexible Linings*, Hydraulic Engineering Circular No. 15, 3rd ed.,
FHWA-NHI-05-114, 2005, "HEC-15", Chapter 3):

1. normal depth with the lining's own, often depth-dependent, Manning's n (:func:`hydraulics.analyse` on arrays;
   stone by HEC-15 Section 6.1, grass by Chapter 4);
2. design shear at the maximum depth tau_d = gamma d S (HEC-15 Eq. 3.1), K1 tau_d on the side slopes
   (Section 3.3), Kb tau_d in a bend (Section 3.4), against the lining's permissible shear (stone by Eq. 6.7 and
   Table 6.1, K2 or Appendix D on the sides, Chapter 6; grass and soil, Chapter 4; rigid linings non-erodible,
   common practice): :func:`hydraulics.shear_checks.shear_checks` on arrays;
3. the lining holds where tau_p >= SF tau at every place checked (HEC-15 Eq. 3.2); the *margin* is the lowest
   safety factor over the checks divided by the required one (+inf for a rigid lining), kept on the side of its
   verdict (>= 1 where stable, < 1 where not);
4. freeboard and the top of the ditch (:func:`hydraulics.freeboard.ditch_tops`: the minimum plus the bend's
   superelevation, HEC-15 Sections 2 and 3.4; at least the flow depth in supercritical flow, Section 2.1.1),
   the lined width (the perimeter up to the top, common practice, ``LINED_WIDTH_RULE`` of
   :mod:`hydraulics.lining_quantities`) and the layer volume per length (lined width times the catalogue's
   layer thickness; stone 1.5 D50, HEC-15 Section 6.4, as the catalogue states).

Each number is the one ``check_lining(section, flow, slope, lining, d50, bend_radius, min_freeboard,
size_stone=False)`` gives for that channel (to rounding; the tests hold them within 1e-9 relative and the
verdict exactly). Where a channel cannot be checked (a pipe asked to carry more than it can, a bend tighter
than half the water-surface width, a catalogue entry whose user data are missing) its error is the one
``check_lining`` raises, in words: those channels, and any group whose array solve cannot be made, go through
``check_lining`` itself. The smallest stable stone, the words of the verdict and the warnings are not worked out
here: they belong to the full check, which a run makes for the scheduled lining when it is asked for.
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass

import numpy as np

from .analysis import analyse
from .errors import HydraulicsError
from .freeboard import ditch_tops
from .linings import hec15
from .linings.hec15 import ValidityWarning
from .shear_checks import shear_checks
from .solvers import max_flow
from .stability import check_lining

__all__ = ["SCREEN_FIELDS", "Screening", "screen_lining", "verdict_side", "solvable"]

#: The numbers screened per channel (SI; nan where the check could not be made): normal depth [m], velocity
#: [m/s], Froude number [-], Manning's n, water-surface width [m], bed shear tau_d [Pa], the lowest safety factor
#: over the checks (nan: rigid) and the one required [-], the margin [-], freeboard [m], depth plus freeboard [m],
#: the depth the lining reaches (depth plus freeboard, or a closed section's full depth) [m], the lined width [m]
#: and the layer volume per length [m^3/m] (nan: no layer).
SCREEN_FIELDS = ("depth", "velocity", "froude", "manning_n", "top_width", "bed_shear", "safety_factor",
                 "required_safety_factor", "margin", "freeboard", "total_depth", "depth_at_top", "lined_width",
                 "layer_volume")

#: A flow within this fraction of a closed section's largest flow is left to the scalar solve, which decides it.
_CAPACITY_BAND = 1e-9


def verdict_side(margin, stable):
    """The margin kept on the side of its verdict: at least 1 where ``stable``, below 1 where not [-]."""
    return np.where(stable, np.maximum(margin, 1.0), np.minimum(margin, math.nextafter(1.0, 0.0)))


@dataclass
class Screening:
    """Screened linings as arrays of one shape: ``(N,)`` for one lining over N channels (:func:`screen_lining`),
    ``(N points, K candidates)`` for every candidate at every design point of a run. Arrays of SCREEN_FIELDS,
    ``stable`` and ``checked`` (bool), and ``errors`` (objects: the words of why a channel could not be checked,
    else None)."""

    checked: np.ndarray
    stable: np.ndarray
    errors: np.ndarray
    depth: np.ndarray
    velocity: np.ndarray
    froude: np.ndarray
    manning_n: np.ndarray
    top_width: np.ndarray
    bed_shear: np.ndarray
    safety_factor: np.ndarray
    required_safety_factor: np.ndarray
    margin: np.ndarray
    freeboard: np.ndarray
    total_depth: np.ndarray
    depth_at_top: np.ndarray
    lined_width: np.ndarray
    layer_volume: np.ndarray

    @classmethod
    def empty(cls, *shape: int) -> "Screening":
        """Nothing checked yet: ``empty(n)`` for one lining, ``empty(points, candidates)`` for a run."""
        return cls(checked=np.zeros(shape, dtype=bool), stable=np.zeros(shape, dtype=bool),
                   errors=np.full(shape, None, dtype=object), **{k: np.full(shape, np.nan) for k in SCREEN_FIELDS})

    def put(self, index, screen: "Screening") -> None:
        """The entries at ``index`` (anything numpy indexes with: ``(rows, k)`` is candidate ``k`` at the points
        ``rows``) from ``screen``, whose arrays have the shape of that selection."""
        for name in (*SCREEN_FIELDS, "checked", "stable", "errors"):
            getattr(self, name)[index] = getattr(screen, name)

    def put_result(self, index, r, section) -> None:
        """The entry at ``index`` from a StabilityResult ``r`` of check_lining in ``section``."""
        gov = min((c.margin for c in r.checks), default=math.inf)
        values = {"depth": r.depth, "velocity": r.velocity, "froude": r.froude, "manning_n": r.manning_n,
                  "top_width": float(r.analysis.top_width), "bed_shear": r.bed_shear,
                  "safety_factor": math.nan if r.safety_factor is None else r.safety_factor,
                  "required_safety_factor": r.required_safety_factor,
                  "margin": float(verdict_side(gov, r.stable)), "freeboard": r.freeboard,
                  "total_depth": r.total_depth,
                  "depth_at_top": r.total_depth if section.full_depth is None else min(r.total_depth,
                                                                                        float(section.full_depth)),
                  "lined_width": r.lined_width,
                  "layer_volume": math.nan if r.layer_volume is None else r.layer_volume}
        for k, v in values.items():
            getattr(self, k)[index] = v
        self.checked[index], self.stable[index], self.errors[index] = True, bool(r.stable), None


def solvable(section, flow, slope, rough) -> tuple[np.ndarray, np.ndarray]:
    """Which flows a closed ``section`` surely carries at normal depth, and which are too close to its largest
    flow to say without the scalar solve: (sure, near) bool arrays. An open section carries every flow."""
    q = np.asarray(flow, dtype=float)
    if section.capacity_depth is None or not q.size:
        return np.ones(q.shape, dtype=bool), np.zeros(q.shape, dtype=bool)
    with np.errstate(invalid="ignore", over="ignore"):
        q_max = np.asarray(max_flow(section, np.asarray(slope, dtype=float), rough), dtype=float)
    sure = q < q_max * (1.0 - _CAPACITY_BAND)
    near = ~sure & (q <= q_max * (1.0 + _CAPACITY_BAND))
    return sure, near


def screen_lining(section, flow, slope, lining, d50=None, bend_radius=None, min_freeboard=hec15.MIN_FREEBOARD,
                  min_safety_factor=1.0, roughness=None, normal=None) -> Screening:
    """Screen ``lining`` in ``section`` for many flows and slopes (see the module's text).

    Parameters
    ----------
    section : hydraulics.Section
        One cross-section (scalar dimensions) [SI].
    flow, slope : ndarray
        Design flows Q [m^3/s] > 0 and bed slopes S [m/m] > 0, one per channel.
    lining : hydraulics.linings.Lining
        A catalogue entry.
    d50 : float, optional
        Stone size [m] for a stone lining (None: the entry's own), as for ``check_lining``.
    bend_radius : ndarray, optional
        Centre-line radius of a bend [m] per channel, nan on a straight reach (None: all straight).
    min_freeboard : float
        Minimum freeboard [m], >= 0.
    min_safety_factor : float
        Safety factor required of non-stone linings [-], >= 1 (stone: the larger of it and HEC-15 Table 6.1's).
    roughness : optional
        ``lining.roughness(d50)`` when the caller has made it already (a stone model keeps what it works out
        once per section).
    normal : hydraulics.solvers.DepthSolution, optional
        ``solve_normal_depth(section, flow, slope, roughness)`` of all the flows when the caller has made it
        already (a run's last travel-time round); used only when every flow is surely carried (an open section),
        else the normal depths are solved here.

    Returns
    -------
    Screening
        Of shape (N,): per channel the numbers of ``check_lining(..., size_stone=False)``, or its error in words.
    """
    q = np.atleast_1d(np.asarray(flow, dtype=float))
    s = np.broadcast_to(np.asarray(slope, dtype=float), q.shape)
    rc = None if bend_radius is None else np.broadcast_to(np.asarray(bend_radius, dtype=float), q.shape)
    out = Screening.empty(q.size)
    if not q.size:
        return out
    one_by_one = np.zeros(q.size, dtype=bool)      # channels left to check_lining itself
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ValidityWarning)   # the full check words them
            _screen_arrays(section, q, s, rc, lining, d50, min_freeboard, min_safety_factor, out, one_by_one,
                           roughness, normal)
    except HydraulicsError:
        one_by_one[:] = True
    for i in np.flatnonzero(one_by_one).tolist():
        try:
            r = check_lining(section, float(q[i]), float(s[i]), lining, d50=d50,
                             bend_radius=None if rc is None or math.isnan(rc[i]) else float(rc[i]),
                             min_freeboard=min_freeboard, min_safety_factor=min_safety_factor, size_stone=False)
        except HydraulicsError as exc:
            out.errors[i] = exc.said()
            out.checked[i] = False
            continue
        out.put_result(i, r, section)
    return out


def _screen_arrays(section, q, s, rc, lining, d50, min_freeboard, min_safety_factor, out, one_by_one, rough=None,
                   normal=None):
    """The array path of :func:`screen_lining`: fills ``out`` and marks in ``one_by_one`` the channels it leaves
    to the scalar check. Raises HydraulicsError when the group cannot be screened on arrays at all."""
    stone = lining.category == "stone"
    d = lining._d50(d50) if (stone or d50 is not None) else None   # refuses a D50 for a lining that is not stone
    rough = lining.roughness(d) if rough is None else rough
    thickness = lining.layer_thickness(d50) if lining.thickness_data["rule"] == "stone" else lining.layer_thickness()
    sure, near = solvable(section, q, s, rough)
    one_by_one |= ~sure                     # too much for a closed section (its error), or too close to say
    rows = np.flatnonzero(sure)
    if not rows.size:
        return
    if normal is not None and not (rows.size == q.size and np.shape(normal.depth) == q.shape):
        normal = None                         # the solution given is not the one of these flows
    res = analyse(section, q[rows], s[rows], rough, normal=normal)     # HEC-15 Chapter 3, step 1
    y, v, fr = (np.asarray(a, dtype=float) for a in (res.normal_depth, res.velocity, res.froude))
    top = np.asarray(res.top_width, dtype=float)
    n_used = np.broadcast_to(np.asarray(res.manning_n, dtype=float), y.shape)
    r_bend = None
    if rc is not None:
        r_bend = rc[rows]
        bent = ~np.isnan(r_bend)
        tight = bent & (r_bend < top / 2)     # shear_checks refuses these: the scalar check words the refusal
        if tight.any():
            one_by_one[rows[tight]] = True
            keep = ~tight
            rows, y, v, fr, top, n_used, r_bend = (a[keep] for a in (rows, y, v, fr, top, n_used, r_bend))
            if not rows.size:
                return
        if np.isnan(r_bend).all():
            r_bend = None
    zs = section.side_slopes
    sc = shear_checks(lining, y, s[rows], n_used, d50=d if stone else None,
                      left_slope=None if zs is None else float(zs[0]),
                      right_slope=None if zs is None else float(zs[1]),
                      bend_radius=r_bend, top_width=top if r_bend is not None else None,
                      min_safety_factor=min_safety_factor)            # steps 2 to 4 (HEC-15 Eq. 3.1, 3.2)
    if sc.non_erodible:
        stable = np.ones(rows.size, dtype=bool)
        margin = np.full(rows.size, np.inf)
        lowest = np.full(rows.size, np.nan)
    else:
        lowest = np.min(np.column_stack([c.safety_factor for c in sc.checks]), axis=1)
        stable = lowest >= sc.required_safety_factor
        margin = verdict_side(lowest / sc.required_safety_factor, stable)
    tops = ditch_tops(section, y, v, top, fr, r_bend, min_freeboard)       # step 6
    lined = np.broadcast_to(np.asarray(section.wetted_perimeter(tops.depth_at_top), dtype=float), y.shape)
    values = {"depth": y, "velocity": v, "froude": fr, "manning_n": n_used,
              "top_width": top, "bed_shear": sc.design_shear, "safety_factor": lowest,
              "required_safety_factor": sc.required_safety_factor, "margin": margin, "freeboard": tops.freeboard,
              "total_depth": tops.total_depth, "depth_at_top": tops.depth_at_top, "lined_width": lined,
              "layer_volume": np.full(y.shape, np.nan) if thickness is None else lined * float(thickness)}
    for k, arr in values.items():
        getattr(out, k)[rows] = arr
    out.stable[rows] = stable
    out.checked[rows] = True

