"""A project's ditch run, solved and made ready for every front end (command line, window, sheet).

The one place that turns a run of the project file (:class:`app.project.Run`, SI) into the core's
:class:`hydraulics.ditch_run.DitchRun`, solves it, and states the result in the user's units: the station
table, the lining schedule with its quantities and cost, the warnings, and the published values leant on
that are not yet verified. Front ends only lay these out. Qt-free.

    from app.run_design import design_run
    design = design_run(project, project.runs[0], catalogue)
    design.to_dict(units)          # the ``ditchwright run --json`` layout of one run
    design.station_rows(units)     # the station table, rounded by the one rule of app.results
"""

from __future__ import annotations

from dataclasses import dataclass, field

import hydraulics as hy
from hydraulics import provenance, rational, travel_time
from hydraulics.ditch_run import NORMAL_DEPTH_FIT, Bend, Candidate, DitchRun, RunResult, SectionRange, solve_run
from hydraulics.linings import Catalogue
from hydraulics.rainfall import idf_from_dict
from hydraulics.run_inflow import PointInflow, SubArea
from hydraulics.run_layout import StationRange
from hydraulics.run_water_surface import RunWaterSurface, run_water_surface
from hydraulics.units import UnitSystem
from hydraulics.wording import format_station, in_units, worded

from .project import Project, Run
from .lining_names import name_in_units, stone_size_text
from .results import RUN_STATION_FIELDS, RUN_TABLE_FIELDS, convert, money_text, quantity_text, rounded

__all__ = ["RunDesign", "SubAreaBasis", "sub_area_basis", "build_run", "design_run", "run_label", "section_dimensions",
           "section_words", "RUN_CAUTIONS"]

#: The cautions printed with every run, in the command's, the window's and the sheet's words.
RUN_CAUTIONS = (
    "Results assist design; they do not replace the judgement of a licensed engineer, who checks them against "
    "local codes before construction.",
    "The water surface shown is computed along the run (standard step method, from the outfall control stated); "
    "the lining shear check uses normal depth, the design depth of HEC-15, and the fit of the ditch the computed "
    "water depth.",
)

#: The outfall controls in words.
CONTROL_WORDS = {"normal": "normal depth", "critical": "critical depth (free overfall)", "level": "water level"}
_SHAPES = {"trapezoid": "trapezoid", "triangle": "V-ditch (triangle)", "rectangle": "rectangle",
           "parabola": "parabolic swale", "circle": "circular pipe", "irregular": "surveyed (irregular)"}

#: Keys of a section's dimensions, as the ``calc`` options name them.
DIMENSION_KEYS = ("bottom_width", "left_slope", "right_slope", "diameter", "top_width", "at_depth")
_LENGTH_KEYS = {"bottom_width", "diameter", "top_width", "at_depth"}


def run_label(project: Project, run: Run) -> str:
    """``runs[0] "North verge ditch"``: where the run sits in the project file."""
    index = next((i for i, r in enumerate(project.runs) if r is run), None)
    return f'run "{run.name}"' if index is None else f'runs[{index}] "{run.name}"'


class RunInputError(hy.InputError):
    """A bad value of a run, named by where it sits in the project file."""


def _in_run(label: str, exc: hy.InputError) -> RunInputError:
    err = RunInputError(f"{label}: {exc.field}", str(exc).split(": ", 1)[-1])
    return err


@dataclass(frozen=True)
class SubAreaBasis:
    """How a sub-area's C and own time of concentration were found: values [SI], method in words, cautions."""

    name: str
    area: float
    runoff_coefficient: float
    coefficient_method: str
    time_of_concentration: float
    time_method: str
    warnings: tuple = ()


def _coefficient(sa, field: str) -> tuple[float, str]:
    """C typed, or weighted by area over the land covers: C = sum(C_j A_j) / sum(A_j) (FHWA HEC-22, 3rd ed., 2009,
    Section 3.2, composite runoff coefficient)."""
    if sa.land_covers:
        if sa.runoff_coefficient is not None:
            raise hy.InputError(f"{field}.runoff_coefficient", "give C or land covers, not both")
        total = sum(lc.area for lc in sa.land_covers)
        if abs(total - sa.area) > 0.005 * sa.area:
            raise hy.InputError(f"{field}.land_covers", worded("add up to {total}, but the sub-area is {area}; they "
                                                               "must agree within 0.5 %",
                                                               total=(total, "drainage_area"),
                                                               area=(sa.area, "drainage_area")))
        c = sum(lc.area * lc.runoff_coefficient for lc in sa.land_covers) / total
        return c, f"weighted by area over {len(sa.land_covers)} land covers ({provenance.cite('composite_c')})"
    if sa.runoff_coefficient is None:
        raise hy.InputError(f"{field}.runoff_coefficient", "is missing: give C (0 to 1) or the land covers")
    return float(sa.runoff_coefficient), "typed"


def _own_time(sa, field: str) -> tuple[float, str, list]:
    """The sub-area's own time of concentration [s], the method in words, and its cautions."""
    tc = sa.time_of_concentration
    method = tc.get("method")
    if method == "typed":
        return float(hy.validate.positive(f"{field}.time_of_concentration.value", tc["value"])), "typed", []
    if method == "kirpich":
        try:
            t = rational.kirpich_time(tc["flow_length"], tc["slope"])
        except hy.InputError as exc:
            raise hy.InputError(f"{field}.time_of_concentration.{exc.field}", exc.message) from None
        return t, "Kirpich's formula (Kirpich 1940)", rational.kirpich_warnings(tc["slope"], sa.area)
    if method == "tr55":
        total, warns = 0.0, []
        p2 = tc.get("rain_2yr_24h")
        for j, seg in enumerate(tc["segments"]):
            where = f"{field}.time_of_concentration.segments[{j}]"
            if seg["kind"] == "sheet":
                if p2 is None:
                    raise hy.InputError(f"{field}.time_of_concentration.rain_2yr_24h",
                                        "is missing: sheet flow by TR-55 needs the 2-year, 24-hour rainfall")
                if seg.get("roughness") is None:
                    raise hy.InputError(f"{where}.roughness", "is missing: sheet flow needs its roughness "
                                                              "coefficient (TR-55 Table 3-1)")
                try:
                    total += travel_time.sheet_flow_time(seg["length"], seg["roughness"], p2, seg["slope"])
                except hy.InputError as exc:
                    raise hy.InputError(f"{where}.{exc.field}", exc.message) from None
                warns += travel_time.sheet_flow_warnings(seg["length"])
            else:
                if seg.get("surface") not in ("paved", "unpaved"):
                    raise hy.InputError(f"{where}.surface", f"must be 'paved' or 'unpaved', got {seg.get('surface')!r}")
                try:
                    total += travel_time.shallow_concentrated_time(seg["length"], seg["slope"], seg["surface"])
                except hy.InputError as exc:
                    raise hy.InputError(f"{where}.{exc.field}", exc.message) from None
        return total, "NRCS TR-55 sheet and shallow concentrated flow (TR-55, 2nd ed., 1986, Chapter 3)", warns
    raise hy.InputError(f"{field}.time_of_concentration.method",
                        f"must be 'typed', 'kirpich' or 'tr55', got {method!r}")


def sub_area_basis(sa, field: str = "sub-area") -> SubAreaBasis:
    """How the core takes one sub-area: C (typed or weighted), its own time of concentration and cautions.
    Bad input raises hy.InputError naming ``field`` and the value inside it."""
    hy.validate.positive(f"{field}.area", sa.area)
    c, c_how = _coefficient(sa, field)
    t, t_how, warns = _own_time(sa, field)
    return SubAreaBasis(sa.name, sa.area, c, c_how, t, t_how, tuple(warns))


def section_dimensions(section: dict, units: UnitSystem) -> dict:
    """A section's dimensions keyed like the ``calc`` options, lengths in ``units``; those that apply."""
    out = {}
    for key, value in section.items():
        if key == "shape":
            continue
        if key == "side_slope":
            out["left_slope"] = out["right_slope"] = float(value)
        elif key in DIMENSION_KEYS:
            out[key] = float(units.from_si("length", value)) if key in _LENGTH_KEYS else float(value)
    return {k: out[k] for k in DIMENSION_KEYS if k in out}


def section_words(section: dict, units: UnitSystem) -> tuple[str, str]:
    """A run's section in words, in ``units``: ("trapezoid", "bottom width 0.600 m, left slope 3H:1V, ...")."""
    L = units.label("length")
    dims = []
    for key, value in section_dimensions(section, units).items():
        if key in _LENGTH_KEYS:
            dims.append(f"{key.replace('_', ' ')} {rounded(value, RUN_TABLE_FIELDS['length'])} {L}")
        else:
            dims.append(f"{key.replace('_', ' ')} {value:g}H:1V")
    return _SHAPES.get(section.get("shape"), str(section.get("shape"))), ", ".join(dims)


def build_run(project: Project, run: Run, catalogue: Catalogue) -> tuple[DitchRun, list]:
    """The core's run from the project's, and the basis of each sub-area. Bad input raises RunInputError naming
    the run and the item."""
    label = run_label(project, run)
    try:
        if project.rainfall is None:
            raise hy.InputError("rainfall", "is missing: a run needs the project's intensity-duration-frequency "
                                            "relation")
        idf = idf_from_dict(project.rainfall)
        bases = []
        for k, sa in enumerate(run.sub_areas):
            bases.append(sub_area_basis(sa, f"sub_areas[{k}]"))
        sub_areas = tuple(SubArea(b.name, b.area, b.runoff_coefficient, b.time_of_concentration,
                                  StationRange(sa.from_station, sa.from_station if sa.to_station is None
                                               else sa.to_station))
                          for b, sa in zip(bases, run.sub_areas))
        sections = []
        for k, rs in enumerate(run.sections):
            try:
                section = hy.section_from_dict(rs.section)
            except hy.InputError as exc:
                raise hy.InputError(f"sections[{k}].section.{exc.field}", exc.message) from None
            sections.append(SectionRange(StationRange(rs.from_station, rs.to_station), section, rs.ditch_depth))
        candidates = []
        for k, c in enumerate(run.candidates):
            if c.key not in catalogue:
                raise hy.InputError(f"candidates[{k}].key", f"{c.key!r} is not in the lining catalogue")
            candidates.append(Candidate(catalogue.get(c.key), c.d50, c.unit_cost))
        core = DitchRun(
            name=run.name, profile=tuple((p.station, p.elevation) for p in run.profile),
            outfall_station=run.outfall.station, sections=tuple(sections), candidates=tuple(candidates),
            sub_areas=sub_areas, idf=idf, return_period=run.return_period,
            point_inflows=tuple(PointInflow(p.name, p.station, p.flow) for p in run.point_inflows),
            bends=tuple(Bend(StationRange(b.from_station, b.to_station), b.radius) for b in run.bends),
            spacing=run.spacing, min_stretch=run.min_stretch, min_duration=run.min_duration,
            min_freeboard=run.min_freeboard, mat_allowance=run.mat_allowance, stone_porosity=run.stone_porosity,
            outfall_control=run.outfall.control, outfall_level=run.outfall.water_level)
    except hy.InputError as exc:
        raise _in_run(label, exc) from None
    return core, bases


@dataclass
class RunDesign:
    """One run of the project, solved (SI inside; every output method takes the unit system to show)."""

    project: Project
    run: Run
    result: RunResult
    bases: list                              # SubAreaBasis per sub-area
    surface: RunWaterSurface | None = None   # the water surface along the run and the fit of the ditch against it
    warnings: list = field(default_factory=list)
    notes: list = field(default_factory=list)

    @property
    def not_verified(self) -> list:
        """Published values this run leans on that are not yet verified against their publication (one line
        each), from :mod:`hydraulics.provenance`: those its warnings and notes cite and those the scheduled
        linings' checks use (the candidates not built are left out)."""
        texts = [*self.warnings, *self.notes, *(t for b in self.bases for t in (b.coefficient_method, b.time_method))]
        for p in self.result.points:
            r = p.result if p.not_checked is None else None
            if r is not None:
                texts += r.cited_texts()
        return provenance.not_verified_lines(provenance.cited_not_verified(texts))

    # -- the station table -------------------------------------------------------
    def station_values(self, units: UnitSystem) -> list[dict]:
        """One dict per design point with the keys of ``ditchwright run --json`` (unrounded, in ``units``)."""
        res = self.result
        f = res.flows
        rows = []
        for p in res.points:
            r = p.result
            rs = self.run.sections[p.section_index]
            checked = r is not None and p.not_checked is None
            y = r.depth if checked else None
            an = r.analysis if checked else None
            ws = self.surface
            wy = _finite(ws.depth[p.index])
            values = {
                "station": p.station, "invert": p.invert, "slope": p.grade, "ca": f.ca[p.index],
                "tc": f.duration[p.index] if f.ca[p.index] > 0 else None,
                "intensity": f.intensity[p.index] if f.ca[p.index] > 0 else None, "flow": p.flow,
                "shape": rs.section["shape"], "dimensions": section_dimensions(rs.section, units),
                "ditch_depth": p.ditch_depth, "manning_n": r.manning_n if checked else None,
                "normal_depth": y, "critical_depth": p.critical_depth, "water_depth": wy,
                "water_surface": _finite(ws.water_surface[p.index]), "profile_type": ws.profile_type[p.index],
                "velocity": r.velocity if checked else None, "froude": r.froude if checked else None,
                "regime": an.regime if checked else None, "bed_shear": r.bed_shear if checked else None,
                "side_shear": r.side_shear if checked else None,
                "permissible_shear": r.permissible_shear if checked else None,
                "safety_factor": r.safety_factor if checked else None,
                "lining": self.result.run.candidates[p.choice].lining.key if p.choice >= 0 else None,
                "stable": (r.stable if checked else None), "freeboard": _finite(ws.freeboard[p.index]),
                "fits": ws.fits[p.index], "overtopped": bool(ws.overtopped[p.index]) if wy is not None else None,
                "required_d50": r.required_d50 if checked and r.required_d50 is not None else None,
                "partial_area": bool(f.partial[p.index]), "not_checked": p.not_checked,
            }
            rows.append({k: (v if k in ("dimensions",) else convert(v, RUN_STATION_FIELDS[k].quantity, units)
                             if k in RUN_STATION_FIELDS else v) for k, v in values.items()})
        return rows

    def station_rows(self, units: UnitSystem) -> list[dict]:
        """The station table as text cells, rounded by the one rule of :mod:`app.results`; stations as 12+34.56."""
        out = []
        for raw, p in zip(self.station_values(units), self.result.points):
            row = {}
            for key, value in raw.items():
                if key == "station":
                    row[key] = format_station(p.station, units)
                elif key == "dimensions":
                    row[key] = " ".join(f"{k}={v:g}" for k, v in value.items())
                elif key in RUN_STATION_FIELDS:
                    row[key] = rounded(value, RUN_STATION_FIELDS[key])
                else:
                    row[key] = "" if value is None else str(value)
            out.append(row)
        return out

    # -- the schedule ----------------------------------------------------------------
    def schedule_values(self, units: UnitSystem) -> list[dict]:
        out = []
        for q in self.result.quantities:
            lo, hi = sorted((q.start, q.end))
            cand = self.result.run.candidates[q.choice]
            out.append({"from_station": float(units.from_si("length", lo)),
                        "to_station": float(units.from_si("length", hi)),
                        "lining": cand.lining.key, "lining_name": name_in_units(q.lining_name, units),
                        "d50": None if cand.d50 is None else float(units.from_si("small_length", cand.d50)),
                        "length": float(units.from_si("length", q.length)),
                        "quantities": [{"item": it.item, "amount": float(units.from_si(it.quantity, it.amount)),
                                        "unit": units.label(it.quantity)} for it in q.items],
                        "cost": q.cost})
        return out

    def schedule_rows(self, units: UnitSystem) -> list[dict]:
        """The lining schedule as text cells in ``units``: number, from and to stations (12+34.56), lining (with its
        D50), length, quantities [(item, amount, unit)] and cost, rounded by the rules of :mod:`app.results`."""
        F = RUN_TABLE_FIELDS
        out = []
        for k, (s, q) in enumerate(zip(self.schedule_values(units), self.result.quantities), start=1):
            lo, hi = sorted((q.start, q.end))
            cand = self.result.run.candidates[q.choice]
            lining = s["lining_name"] + ("" if cand.d50 is None else f", D50 {stone_size_text(cand.d50, units)}")
            out.append({"number": str(k), "from_station": format_station(lo, units),
                        "to_station": format_station(hi, units), "lining": lining, "key": s["lining"],
                        "length": rounded(s["length"], F["length"]),
                        "quantities": [(it["item"], quantity_text(it["amount"], F["amount"]), it["unit"])
                                       for it in s["quantities"]],
                        "cost": money_text(s["cost"])})
        return out

    def total_cost_text(self) -> str:
        """The schedule's total cost as every front end prints it ('$ 54,544')."""
        return money_text(self.result.total_cost)

    def sub_area_rows(self, units: UnitSystem) -> list[dict]:
        """The sub-areas as text cells in ``units``: name, area, C and how it was found, own time of concentration
        and its method, where it enters."""
        F = RUN_TABLE_FIELDS
        out = []
        for b, sa in zip(self.bases, self.run.sub_areas):
            enters = (f"at {format_station(sa.from_station, units)}" if sa.to_station is None else
                      f"{format_station(min(sa.from_station, sa.to_station), units)} to "
                      f"{format_station(max(sa.from_station, sa.to_station), units)}")
            out.append({"name": b.name, "area": rounded(convert(b.area, "drainage_area", units), F["area"]),
                        "runoff_coefficient": rounded(b.runoff_coefficient, F["runoff_coefficient"]),
                        "coefficient_method": b.coefficient_method,
                        "time_of_concentration": rounded(convert(b.time_of_concentration, "duration", units),
                                                         F["time_of_concentration"]),
                        "time_method": b.time_method, "enters": enters})
        return out

    def inflow_rows(self, units: UnitSystem) -> list[dict]:
        """The point inflows as text cells: name, station, flow in ``units``."""
        return [{"name": p.name, "station": format_station(p.station, units),
                 "flow": rounded(convert(p.flow, "flow", units), RUN_TABLE_FIELDS["flow"])}
                for p in self.run.point_inflows]

    def candidate_rows(self, units: UnitSystem) -> list[dict]:
        """The run's candidate linings: name, catalogue key, D50 and the unit cost that applies, per surface or
        per volume in ``units`` ('$ 7.50 per m^2')."""
        F = RUN_TABLE_FIELDS
        out = []
        for c in self.result.run.candidates:
            basis = "surface" if c.lining.unit_cost_basis == "area" else "volume"
            price = c.price
            cost = ("no price" if price is None else
                    f"{money_text(price / float(units.from_si(basis, 1.0)), F['unit_cost'].digits)} per {units.label(basis)}"
                    + (" (this run's)" if c.unit_cost is not None else " (catalogue's)"))
            out.append({"lining": c.lining.name, "key": c.lining.key,
                        "d50": "" if c.d50 is None else stone_size_text(c.d50, units),
                        "unit_cost": cost})
        return out

    def section_rows(self, units: UnitSystem) -> list[dict]:
        """The sections by station range: from, to, shape, dimensions and the ditch's depth as built, in ``units``."""
        F = RUN_TABLE_FIELDS
        L = units.label("length")
        out = []
        for rs in self.run.sections:
            shape, dims = section_words(rs.section, units)
            depth = ("its full depth" if rs.ditch_depth is None else
                     f"{rounded(convert(rs.ditch_depth, 'length', units), F['length'])} {L}")
            out.append({"from_station": format_station(rs.from_station, units),
                        "to_station": format_station(rs.to_station, units),
                        "shape": shape, "dimensions": dims, "ditch_depth": depth})
        return out

    def rainfall_rows(self, units: UnitSystem) -> dict:
        """The project's rainfall relation as the run used it, in ``units``: its kind, source text, the return period
        used, and either a table (``durations`` in min, ``return_periods``, ``intensities`` rows) or the formula
        (``formula`` lines, i = a / (t + b)^c with t in min and i in in/h or mm/h)."""
        F = RUN_TABLE_FIELDS
        idf = self.result.run.idf
        source = str((self.project.rainfall or {}).get("source") or "").strip()
        out = {"kind": self.project.rainfall.get("kind") if self.project.rainfall else "",
               "source": source or "no source given in the project",
               "return_period": f"{self.run.return_period:g}-year", "intensity_unit": units.label("intensity"),
               "duration_unit": units.label("duration")}
        periods = list(idf.return_periods)
        if hasattr(idf, "durations"):
            out["return_periods"] = [f"{p:g}-year" for p in periods]
            out["durations"] = [rounded(convert(float(t), "duration", units), F["duration"]) for t in idf.durations]
            out["intensities"] = [[rounded(convert(float(v), "intensity", units), F["intensity"]) for v in row]
                                  for row in idf.intensities]
            out["used_column"] = next((k for k, p in enumerate(periods) if p == self.run.return_period), None)
        else:
            lines = []
            for p, (a, b, c) in idf.customary(units.key).items():
                lines.append(f"{p:g}-year: a = {a:.4g}, b = {b:.4g} {units.label('duration')}, c = {c:.4g}")
            rng = idf.duration_range
            span = ("any duration" if rng is None else
                    f"{rounded(convert(rng[0], 'duration', units), F['duration'])} to "
                    f"{rounded(convert(rng[1], 'duration', units), F['duration'])} {units.label('duration')}")
            out["formula"] = [f"i = a / (t + b)^c, i in {units.label('intensity')}, t in {units.label('duration')}; "
                              f"used for durations {span}", *lines]
        return out

    def summary_items(self, units: UnitSystem) -> list[tuple[str, str]]:
        """(label, text) facts of the run in ``units``: length and stations, storm, outfall, design-point spacing,
        shortest stretch, minimum freeboard, bends, allowances (laps, stone voids), travel-time iterations, notes."""
        F = RUN_TABLE_FIELDS
        L = units.label("length")
        res, run = self.result, self.run
        length = lambda v: f"{rounded(convert(v, 'length', units), F['length'])} {L}"  # noqa: E731
        items = [("Length", f"{length(res.layout.length)}, {format_station(res.layout.first_station, units)} to "
                            f"{format_station(res.layout.last_station, units)}"),
                 ("Design storm", f"{run.return_period:g}-year return period"),
                 ("Outfall", f"{format_station(run.outfall.station, units)}"
                             + (f", {run.outfall.kind}" if run.outfall.kind else "")
                             + (f"; control: water level {length(run.outfall.water_level)}"
                                if run.outfall.control == "level" else
                                f"; control: {CONTROL_WORDS[run.outfall.control]}"
                                + ("" if run.outfall.water_level is None else
                                   f" (the water level {length(run.outfall.water_level)} given is not used)"))),
                 ("Design points", f"{len(res.points)}, at most {length(run.spacing)} apart and at every grade break, "
                                   "section change, bend end and inflow"),
                 ("Shortest stretch", length(run.min_stretch)),
                 ("Minimum freeboard", length(run.min_freeboard))]
        for b in run.bends:
            items.append(("Bend", f"{format_station(b.from_station, units)} to {format_station(b.to_station, units)}, "
                                  f"radius {length(b.radius)}"))
        items.append(("Allowances", f"laps and anchor trenches {100 * run.mat_allowance:g} % of the seeded or mat "
                                    f"surface; voids of a riprap layer {100 * run.stone_porosity:g} %"))
        items.append(("Travel time", f"settled after {res.iterations} iteration{'s' if res.iterations != 1 else ''}"))
        if run.notes:
            items.append(("Notes", run.notes))
        return items

    # -- the water surface's controls and jumps ----------------------------------------
    def control_values(self, units: UnitSystem) -> list[dict]:
        """What was assumed at each end of the run (and at each critical section between), with its depth and
        level, in ``units``: where ("inlet", "critical section", "outfall"), station, kind, depth, level, whether
        it governs, and its message."""
        L = lambda v: None if v is None or v != v else float(units.from_si("length", v))  # noqa: E731
        return [{"where": c["where"], "station": L(c["station"]), "kind": c["kind"], "depth": L(c["depth"]),
                 "level": L(c["level"]), "governs": bool(c["governs"]),
                 "message": None if c["message"] is None else in_units(c["message"], units)}
                for c in self.surface.controls]

    def jump_values(self, units: UnitSystem) -> list[dict]:
        """The hydraulic jumps in ``units``: station of the toe (the run's stationing), upstream and downstream
        (sequent) depths, length, and the Froude number and kind."""
        L = lambda v: float(units.from_si("length", v))  # noqa: E731
        return [{"station": L(j.station), "upstream_depth": L(j.jump.upstream_depth),
                 "downstream_depth": L(j.jump.downstream_depth), "length": L(j.jump.length),
                 "froude": j.jump.froude, "kind": j.jump.kind} for j in self.surface.jumps]

    def control_rows(self, units: UnitSystem) -> list[str]:
        """The controls as lines of text: 'outfall, 0+700.00: water level 45.86 m (depth 1.300 m), governs'."""
        F = RUN_STATION_FIELDS
        L = units.label("length")
        out = []
        for c, raw in zip(self.control_values(units), self.surface.controls):
            what = {"normal": "normal depth", "critical": "critical depth", "level": "water level",
                    "depth": "depth given"}.get(c["kind"], c["kind"])
            text = f"{c['where']}, {format_station(raw['station'], units)}: {what}"
            if c["level"] is not None:
                text += (f", level {rounded(c['level'], F['water_surface'])} {L} (depth "
                         f"{rounded(c['depth'], F['water_depth'])} {L})")
            text += ", governs" if c["governs"] else ", does not govern"
            if c["message"]:
                text += f": {c['message']}"
            out.append(text)
        return out

    def jump_rows(self, units: UnitSystem) -> list[str]:
        """The jumps as lines of text: 'at 0+329.14: 0.229 m to 0.549 m over 3.29 m (oscillating, Fr 2.61)'."""
        F = RUN_STATION_FIELDS
        L = units.label("length")
        return [f"at {format_station(j.station, units)}: {rounded(v['upstream_depth'], F['water_depth'])} {L} to "
                f"{rounded(v['downstream_depth'], F['water_depth'])} {L} over {rounded(v['length'], F['ditch_depth'])} "
                f"{L} ({v['kind']}, Froude number {v['froude']:.2f})"
                for j, v in zip(self.surface.jumps, self.jump_values(units))]

    def to_dict(self, units: UnitSystem) -> dict:
        """The ``ditchwright run --json`` layout of this run, in ``units``."""
        res = self.result
        return {"name": self.run.name, "length": float(units.from_si("length", res.layout.length)),
                "return_period": float(self.run.return_period),
                "outfall": {"station": float(units.from_si("length", self.run.outfall.station)),
                            "kind": self.run.outfall.kind, "control": self.run.outfall.control,
                            "water_level": (None if self.run.outfall.water_level is None else
                                            float(units.from_si("length", self.run.outfall.water_level)))},
                "depths_used": {"shear_check": "normal_depth", "fit_check": "water_depth"},
                "controls": self.control_values(units), "jumps": self.jump_values(units),
                "water_surface_error": None if self.surface.error is None else in_units(self.surface.error, units),
                "sub_areas": [{"name": b.name, "area": float(units.from_si("drainage_area", b.area)),
                               "runoff_coefficient": b.runoff_coefficient, "coefficient_method": b.coefficient_method,
                               "time_of_concentration": b.time_of_concentration / 60.0, "time_method": b.time_method}
                              for b in self.bases],
                "stations": self.station_values(units), "schedule": self.schedule_values(units),
                "total_cost": res.total_cost, "travel_time_iterations": res.iterations,
                "warnings": [in_units(w, units) for w in self.warnings],
                "notes": [in_units(n, units) for n in self.notes],
                "not_verified": [in_units(n, units) for n in self.not_verified]}


def design_run(project: Project, run: Run, catalogue: Catalogue) -> RunDesign:
    """Solve one run of ``project`` with ``catalogue`` (the front end's, with the user's entries; required). Bad
    input raises RunInputError naming the run and the item; hydraulics.NoSolutionError where no buildable schedule
    exists."""
    core, bases = build_run(project, run, catalogue)
    try:
        result = solve_run(core)
    except hy.InputError as exc:
        raise _in_run(run_label(project, run), exc) from None
    warnings = [worded("sub-area {name}: {w}", name=b.name, w=w) for b in bases for w in b.warnings]
    # the run's warnings with the cautions of the scheduled linings' full checks: asking for them makes those
    # checks (solve_run only screens the candidates); the station table needs them all the same
    # the fit of the ditch is checked on the water surface (hydraulics.run_water_surface), not on normal depth
    surface = run_water_surface(result)
    warnings += [w for w in result.warnings if getattr(w, "template", None) != NORMAL_DEPTH_FIT]
    warnings += surface.warnings
    notes = list(result.notes) + list(surface.notes)
    if any(b.time_method.startswith("Kirpich") for b in bases):
        notes.append("own times of concentration by Kirpich's formula where stated (Kirpich 1940)")
    return RunDesign(project=project, run=run, result=result, bases=bases, surface=surface, warnings=warnings,
                     notes=notes)


def _finite(value):
    """A float, or None where it is NaN (no water, not computed)."""
    value = float(value)
    return None if value != value else value
