"""What a ditch run's design sheet says: everything taken, already in the user's units and rounded, from
:mod:`app.run_design` (tables, cautions), :mod:`app.run_summary` (the lining schedule and its total, the water
surface's controls and jumps, warnings and notes, as the window's results panel states them) and
:mod:`app.run_drawing` (the profile).

No core call, no unit conversion and no rounding here: the sheet shows the same answer as the window and the
``ditchwright run`` command. This module only picks the columns and headings; :mod:`app.sheet.run_layout`
places them on pages.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from hydraulics import units as hu
from hydraulics.linings import Catalogue

from .. import __version__
from ..results import RUN_STATION_FIELDS
from ..run_design import RUN_CAUTIONS, RunDesign, design_run
from ..run_drawing import ProfileModel, profile_model
from ..run_summary import run_summary
from .content import catalogue_words, pretty_unit
from .fingerprint import run_fingerprint

#: Columns of the station table: (key of the station rows, heading, short heading line 2 or None for the unit).
STATION_COLUMNS = (
    ("station", "Station", ""),
    ("invert", "Invert", None),
    ("slope", "Grade", None),
    ("ca", "\u03a3 C A", None),
    ("tc", "tc", None),
    ("intensity", "i", None),
    ("flow", "Q", None),
    ("lining", "Lining", ""),
    ("manning_n", "n", ""),
    ("normal_depth", "yn", None),
    ("critical_depth", "yc", None),
    ("water_depth", "y", None),
    ("profile_type", "Profile", ""),
    ("water_surface", "Water surface", None),
    ("velocity", "V", None),
    ("froude", "Fr", ""),
    ("bed_shear", "\u03c4 bed", None),
    ("side_shear", "\u03c4 side", None),
    ("permissible_shear", "\u03c4p", None),
    ("safety_factor", "SF", ""),
    ("freeboard", "Free- board", None),
    ("ditch_depth", "Ditch depth", None),
)
#: What the headings' short names mean, printed under the table.
STATION_KEY = ("\u03a3 C A: sum of runoff coefficient times area above the point; tc: time of concentration; "
               "i: rainfall intensity at tc; Q: design flow (rational method, the larger of the whole-area and "
               "partial-area flows); yn, yc: normal and critical depth; y: water depth from the water-surface "
               "profile (its type: M1, S2...), which the fit of the ditch uses; V: velocity and Fr: Froude number "
               "at normal depth, the depth of the shear check; "
               "\u03c4: design shear on the bed and the side slopes (bends included); \u03c4p: permissible shear "
               "of the lining; SF: safety factor \u03c4p / \u03c4 of the governing place; freeboard and ditch depth "
               "as built. Status: the verdict on each point, as the window's station table gives it, and what else "
               "is wrong there.")


@dataclass
class RunSheet:
    """Everything printed for one ditch run, and the design it was taken from."""

    project: str
    run: str
    location: str                    # "0+000.00 to 0+700.00"
    units: hu.UnitSystem
    fingerprint: str
    version: str
    catalogue: str
    design: RunDesign
    model: ProfileModel
    summary: list                    # (label, text)
    sections: list                   # dict rows (app.run_design.RunDesign.section_rows)
    candidates: list                 # dict rows
    schedule: list                   # dict rows
    total_cost: str
    sub_areas: list                  # dict rows
    inflows: list                    # dict rows
    rainfall: dict
    station_heads: list              # [(heading, unit)] per column of STATION_COLUMNS
    stations: list                   # [[cell text per column]] per design point
    status: list                     # (words, trouble: bool) per design point (app.run_summary.StationState)
    warnings: list
    notes: list
    not_verified: list
    cautions: list
    controls: list = field(default_factory=list)     # the water surface's controls, one line of text each
    jumps: list = field(default_factory=list)        # the hydraulic jumps, one line of text each
    page_notes: list = field(default_factory=list)

    # what the title block and the fingerprint strip print
    @property
    def subject(self) -> str:
        return self.run

    subject_caption = "Run"
    fingerprint_what = "of the run, its rainfall and linings"


def station_heads(units: hu.UnitSystem) -> list:
    """(heading, unit) of each column of the station table; every number has its unit in the heading."""
    out = []
    for key, head, unit in STATION_COLUMNS:
        if unit is None:
            unit = pretty_unit(units.label(RUN_STATION_FIELDS[key].quantity))
        out.append((head, unit))
    return out


def run_sheet(project, run, catalogue: Catalogue, design: RunDesign | None = None) -> RunSheet:
    """Solve ``run`` of ``project`` (through :func:`app.run_design.design_run`) and gather what its sheet prints,
    in the project's units. ``catalogue``: the front end's lining catalogue (with the user's entries); the printed
    fingerprint includes its entries of the run's candidates."""
    units = hu.system(project.units)
    if design is None:
        design = design_run(project, run, catalogue)
    rows = design.station_rows(units)
    stations = [[row[key] for key, _, _ in STATION_COLUMNS] for row in rows]
    summary = run_summary(design, units)
    status = [(st.status_words(), bool(st.trouble)) for st in summary.states]
    model = profile_model(design, units)
    first, last = rows[0]["station"], rows[-1]["station"]
    return RunSheet(
        project=project.name, run=run.name, location=f"{first} to {last}", units=units,
        fingerprint=run_fingerprint(project, run, catalogue=catalogue), version=__version__,
        catalogue=catalogue_words(catalogue), design=design, model=model,
        summary=design.summary_items(units), sections=design.section_rows(units),
        candidates=design.candidate_rows(units), schedule=list(summary.stretches), total_cost=summary.total_cost,
        sub_areas=design.sub_area_rows(units), inflows=design.inflow_rows(units),
        rainfall=design.rainfall_rows(units), station_heads=station_heads(units), stations=stations,
        status=status, warnings=[pretty_unit(w) for w in summary.warnings],
        notes=[pretty_unit(n) for n in summary.notes], not_verified=[pretty_unit(n) for n in summary.not_verified],
        cautions=list(RUN_CAUTIONS), controls=[pretty_unit(t) for t in summary.controls],
        jumps=[pretty_unit(t) for t in summary.jumps])


__all__ = ["RunSheet", "run_sheet", "STATION_COLUMNS", "STATION_KEY", "station_heads"]
