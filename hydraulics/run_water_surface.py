"""The water surface along a solved ditch run, and the fit of the ditch checked against it (SI).

A solved run (:func:`hydraulics.ditch_run.solve_run`) screens and schedules its linings on normal depth, the
design depth of HEC-15's permissible-shear method (Kilgore and Cotton, *Design of Roadside Channels with Flexible
Linings*, HEC-15, 3rd ed., FHWA-NHI-05-114, 2005, Chapter 3). This module takes that result and computes the real
water surface along the run with :func:`hydraulics.water_surface.water_surface` (standard step method, its
controls and hydraulic jumps; the method and its sources are stated there), with at every design point:

* the distance along the flow and the invert of the layout (:mod:`hydraulics.run_layout`), the section of its
  range, the design flow of the run's last round;
* Manning's n of the lining scheduled there (``Lining.roughness(d50)``, the same roughness the screening uses):
  a number, or for a depth-dependent lining the model's n at each depth of the profile. Grass takes HEC-15's
  n = Cn tau_o^-0.4 (Chapter 4) at the mean boundary shear tau_o = gamma R S with S the energy slope of the
  profile itself (:class:`~hydraulics.linings.roughness.EnergySlopeN`): HEC-22 (2009) Eq. 5-12 gives the mean
  shear with S "average bed slope or energy slope" (provenance key ``boundary_shear_slope``). In uniform flow the
  two slopes are one, so normal depth and the lining checks are unchanged; in backwater the energy slope is
  flatter, the grass stands rougher and the water higher. Stone takes its n at the grade of the stretch leaving
  the point (:class:`~hydraulics.linings.roughness.FixedSlopeN`; on a zero or adverse grade, at the grade of the
  nearest falling stretch downstream, else upstream): the program's rule, as the normal-depth design takes it;
* the outfall control of the run (``DitchRun.outfall_control``: normal depth, critical depth or a known water
  level, ``DitchRun.outfall_level``), normal depth at the top where the first stretch is steep.

The profile starts at the first design point the flow has reached; the points above it have no water. The fit
of the ditch is checked with the profile's water depth: that depth plus the freeboard of
:func:`hydraulics.freeboard.ditch_tops` at that depth (the minimum, the superelevation in a bend, at least the
flow depth in supercritical flow) against the depth of the ditch as built. The water surface above the top of
the ditch marks the stretch overtopped. Where the profile cannot be computed (no normal depth for a normal-depth
outfall control on a falling last stretch, a section too small for the flow...) the reason is stated, the points
are marked "not computed" and their fit is not checked: nothing falls back to normal depth.

Public API
----------
``run_water_surface(result, *, max_step=10.0, step_tolerance=1e-4) -> RunWaterSurface``
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from . import provenance
from .collector import collector_held
from .ditch_run import ranges_of, stretches
from .errors import HydraulicsError
from .freeboard import ditch_tops
from .linings.roughness import EnergySlopeN, FixedSlopeN, VegetationRoughness
from .water_surface import Jump, WaterSurface, water_surface
from .wording import worded, worded_sizes

__all__ = ["RunWaterSurface", "RunJump", "run_water_surface", "SURFACE_RULES"]

#: The rules of the water surface along a run, stated with every result.
SURFACE_RULES = (
    "water depth and water surface at each design point from the water-surface profile (standard step method, "
    "hydraulics.water_surface), with the scheduled lining's Manning's n; the fit of the ditch (water depth plus "
    "freeboard against the ditch as built) uses that depth",
    "the lining shear check and the schedule use normal depth, the design depth of HEC-15's permissible-shear "
    "method (HEC-15, 3rd ed., 2005, Chapter 3)",
    "n of a grass lining at each depth of the profile from the mean boundary shear at the energy slope there "
    f"(HEC-15 Chapter 4 with {provenance.cite('boundary_shear_slope')}); n of a stone "
    "lining taken at the bed slope of the stretch (on a zero or adverse grade, at the nearest falling one): the "
    "program's rule",
)


@dataclass(frozen=True)
class RunJump:
    """A hydraulic jump on the run: the station of its toe and of the end of its roller (the toe plus its length in
    the direction of flow) [m], road stationing, and the core's :class:`~hydraulics.water_surface.Jump`."""

    station: float
    end_station: float
    jump: Jump


@dataclass
class RunWaterSurface:
    """The water surface along a run, per design point (arrays of the points' length, SI; nan where there is no
    water or the profile is not computed).

    ``profile`` is the core's result over the points from ``first`` on (None where it could not be computed,
    ``error`` saying why); ``profile_type`` is a type of :data:`hydraulics.water_surface.PROFILE_TYPES`, "no
    flow" above the first point with water, or "not computed". ``freeboard`` and ``total_depth`` are those of the
    fit check at the water depth, ``fits`` True, False or None (not checked), ``overtopped`` True where the water
    surface stands above the top of the ditch. ``controls`` is a list of dicts (``where``: "inlet", "outfall" or
    "critical section"; ``station`` [m], ``kind``, ``depth`` [m], ``level`` [m], ``governs``, ``message``).
    ``warnings`` and ``notes`` are worded (:mod:`hydraulics.wording`).
    """

    stations: np.ndarray
    invert: np.ndarray
    ditch_top: np.ndarray
    depth: np.ndarray
    water_surface: np.ndarray
    profile_type: list
    normal_depth: np.ndarray
    critical_depth: np.ndarray
    velocity: np.ndarray
    froude: np.ndarray
    freeboard: np.ndarray
    total_depth: np.ndarray
    fits: list
    overtopped: np.ndarray
    first: int
    profile: WaterSurface | None
    jumps: list = field(default_factory=list)
    controls: list = field(default_factory=list)
    warnings: list = field(default_factory=list)
    notes: list = field(default_factory=list)
    error: str | None = None
    n_used: list = field(default_factory=list)   # per point: the roughness (a number or a model) used

    @property
    def computed(self) -> np.ndarray:
        """True at each point whose water depth comes from the profile."""
        return np.isfinite(self.depth)


def _at(station):
    return (station, "station")


def _roughness_at(result, rows, flow) -> list:
    """Manning's n for each design point in ``rows``: a number, or a callable n(depth) of the scheduled lining's
    model at the point's section, and for grass its flow (``flow`` [m^3/s] per point), else its slope (see the
    module's rule), callables shared between equal points."""
    run, layout = result.run, result.layout
    grade = np.asarray(layout.grade, dtype=float)
    falling = np.flatnonzero(grade > 0)
    grades, choice, section_index, flows = grade.tolist(), result.choice.tolist(), \
        np.asarray(result.section_index).tolist(), np.asarray(flow, dtype=float).tolist()
    models = {}
    out = []
    for i in rows.tolist():
        k = int(choice[i])
        c = run.candidates[k]
        if k not in models:
            models[k] = c.lining.roughness(c.d50)
        model = models[k]
        if isinstance(model, (int, float)):
            out.append(float(model))
            continue
        j = int(section_index[i])
        section = run.sections[j].section
        if isinstance(model, VegetationRoughness):
            key = (k, j, "flow", flows[i])
            if key not in models:
                models[key] = EnergySlopeN(model, section, flows[i])
            out.append(models[key])
            continue
        s = grades[i]
        if not s > 0:
            below = falling[falling > i]
            above = falling[falling < i]
            s = float(grade[below[0]]) if below.size else float(grade[above[-1]]) if above.size else math.nan
        key = (k, j, s)
        if key not in models:
            if not math.isfinite(s):
                raise HydraulicsError(worded("no stretch of the run falls: the depth-dependent n of {name} has no "
                                             "slope to be taken at", name=worded_sizes(c.lining.name)))
            models[key] = FixedSlopeN(model, section, s)
        out.append(models[key])
    return out


@collector_held()
def run_water_surface(result, *, max_step: float = 10.0, step_tolerance: float = 1e-4) -> RunWaterSurface:
    """The water surface along the solved run ``result`` (a :class:`hydraulics.ditch_run.RunResult`) and the fit
    of the ditch against it; see the module's text. ``max_step`` [m] and ``step_tolerance`` [-] are passed to
    :func:`hydraulics.water_surface.water_surface`.

    A profile that cannot be computed does not raise: ``error`` and ``warnings`` say why, and every point is
    "not computed".
    """
    run, layout = result.run, result.layout
    count = layout.x.size
    stations = np.asarray(layout.stations, dtype=float)
    invert = np.asarray(layout.invert, dtype=float)
    ditch_depth = np.asarray(result.ditch_depth, dtype=float)
    top = invert + ditch_depth
    flow = np.asarray(result.flows.flow, dtype=float)
    nan = lambda: np.full(count, np.nan)  # noqa: E731
    out = RunWaterSurface(stations=stations, invert=invert, ditch_top=top, depth=nan(), water_surface=nan(),
                          profile_type=["no flow"] * count, normal_depth=nan(), critical_depth=nan(),
                          velocity=nan(), froude=nan(), freeboard=nan(), total_depth=nan(), fits=[None] * count,
                          overtopped=np.zeros(count, dtype=bool), first=count, profile=None,
                          notes=list(SURFACE_RULES))
    wet = flow > 0
    if not wet.any():
        out.error = "no flow reaches the run"
        out.warnings.append("the water surface is not computed: no flow reaches the run")
        return out
    first = int(np.argmax(wet))
    out.first = first
    rows = np.arange(first, count)
    control, level = run.outfall_control, run.outfall_level
    outfall_top = float(top[-1])
    if control == "level" and level is not None and level > outfall_top:
        out.warnings.append(worded("the outfall water level {level} is above the top of the ditch at the outfall "
                                   "({top}): the water stands over the banks there, and the profile upstream is "
                                   "open-channel flow only where it is below the top; the stretch overtopped is "
                                   "marked", level=(level, "length"), top=(outfall_top, "length")))
    try:
        if not wet[first:].all():
            dry = first + int(np.argmin(wet[first:]))
            raise HydraulicsError(str(worded("the design flow falls to nothing at {s}, downstream of water",
                                             s=_at(stations[dry]))))
        n_used = _roughness_at(result, rows, flow)
        sections = [run.sections[int(result.section_index[i])].section for i in rows]
        ws = water_surface(layout.x[rows], invert[rows], sections, n_used, flow[rows],
                           outfall="level" if control == "level" else control,
                           outfall_level=level if control == "level" else None,
                           max_step=max_step, step_tolerance=step_tolerance)
    except HydraulicsError as exc:
        out.error = exc.said()
        out.profile_type = ["no flow"] * first + ["not computed"] * (count - first)
        out.warnings.append(worded("the water surface could not be computed from {a} to {b}: {why}; the depth "
                                   "of the water and the fit of the ditch are not checked there (no fallback to "
                                   "normal depth)", a=_at(stations[first]), b=_at(stations[-1]),
                                   why=exc.said()))
        return out
    out.profile, out.n_used = ws, [None] * first + list(n_used)
    out.depth[rows] = ws.depth
    out.water_surface[rows] = ws.water_surface
    out.normal_depth[rows] = ws.normal_depth
    out.critical_depth[rows] = ws.critical_depth
    out.velocity[rows] = ws.velocity
    out.froude[rows] = ws.froude
    out.profile_type = ["no flow"] * first + list(ws.profile_type)

    # -- the fit of the ditch at the water depth (freeboard rule of hydraulics.freeboard, per section)
    done = rows[np.isfinite(ws.depth)]
    for index in np.unique(result.section_index[done]):
        at = done[result.section_index[done] == index]
        section = run.sections[int(index)].section
        y = out.depth[at]
        tops = ditch_tops(section, y, out.velocity[at], np.asarray(section.top_width(y), dtype=float),
                          out.froude[at], bend_radius=np.asarray(result.bend_radius, dtype=float)[at],
                          min_freeboard=run.min_freeboard)
        out.freeboard[at] = tops.freeboard
        out.total_depth[at] = tops.total_depth
    for i in done:
        out.fits[i] = bool(out.total_depth[i] <= ditch_depth[i] * (1 + 1e-9))
    out.overtopped[done] = out.water_surface[done] > top[done] + 1e-9

    # -- jumps and controls, by station
    for j in ws.jumps:
        s0 = float(layout.station_of(j.distance))
        rj = RunJump(s0, float(layout.station_of(j.distance + j.length)), j)
        out.jumps.append(rj)
        out.warnings.append(worded("hydraulic jump at {s} ({kind}, Froude number {fr}): depth {y1} to {y2} over "
                                   "about {length}; turbulence and surface waves there: the lining through and "
                                   "below the jump needs protection", s=_at(s0), kind=j.kind, fr=f"{j.froude:.2f}",
                                   y1=(j.upstream_depth, "length"), y2=(j.downstream_depth, "length"),
                                   length=(j.length, "length")))
    c_in, c_out = ws.controls["inlet"], ws.controls["outfall"]
    out.controls.append({"where": "inlet", "station": float(stations[first]), "kind": c_in["kind"],
                         "depth": c_in["depth"], "level": c_in["level"], "governs": c_in["governs"],
                         "message": c_in["message"]})
    for x in ws.controls["critical_sections"]:
        s = float(layout.station_of(x))
        i = int(np.argmin(np.abs(stations - s)))
        out.controls.append({"where": "critical section", "station": s, "kind": "critical",
                             "depth": float(out.critical_depth[i]), "level": float(invert[i] + out.critical_depth[i]),
                             "governs": True, "message": None})
    out.controls.append({"where": "outfall", "station": float(stations[-1]), "kind": c_out["kind"],
                         "depth": c_out["depth"], "level": c_out["level"], "governs": c_out["governs"],
                         "message": c_out["message"]})
    for c in out.controls:
        if c["message"]:
            out.warnings.append(worded("{where} control: {m}", where=c["where"], m=c["message"]))

    # -- the stretches overtopped, too shallow and not computed, by station
    if over := ranges_of(out.overtopped.tolist(), stations):
        out.warnings.append(worded("the water surface stands above the top of the ditch {where}: the ditch "
                                   "overtops there; deepen it or lower the water at the outfall",
                                   where=stretches(over)))
    short = np.array([f is False for f in out.fits]) & ~out.overtopped
    if shallow := ranges_of(short.tolist(), stations):
        out.warnings.append(worded("water depth from the profile plus freeboard is above the ditch as built {where}: "
                                   "deepen the ditch", where=stretches(shallow)))
    lost = np.zeros(count, dtype=bool)
    lost[rows] = ~np.isfinite(ws.depth)
    out.profile_type = [("not computed" if lost[i] else t) for i, t in enumerate(out.profile_type)]
    if missing := ranges_of(lost.tolist(), stations):
        out.warnings.append(worded("the water surface is not computed {where}: the water downstream rises above the "
                                   "top of the closed section; the fit there is not checked",
                                   where=stretches(missing)))
    return out
