"""Drawings for the plan set: one DXF per channel (its typical section) and one per ditch run (its profile).

    from app.drawings import export_drawings
    written = export_drawings(project, "out/", channels=None, runs=None, units=None, catalogue=context.catalogue)

Every drawing is made before any file is written, so a channel that cannot be computed leaves the folder as it
was. Qt-free; the DXF itself is written by ezdxf (:mod:`app.drawings.dxf`, shared by :mod:`app.drawings.section` and
:mod:`app.drawings.profile`).
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from hydraulics import units as hu
from hydraulics.errors import HydraulicsError, InputError

from ..files import safe_file_name
from .dxf import write_document
from .profile import profile_document
from .section import section_document

__all__ = ["Drawing", "export_drawings", "make_drawings"]


@dataclass
class Drawing:
    """One drawing ready to write: what it shows (``kind`` "section" or "profile", ``name``), its file name and
    its ezdxf document."""

    kind: str
    name: str
    file_name: str
    document: object


def _chosen(project, channels, runs):
    """The channels and runs to draw: every one when neither is named; KeyError names an unknown one."""
    if not channels and not runs:
        return list(project.channels), list(project.runs)
    return [project.channel(n) for n in channels or []], [project.run(n) for n in runs or []]


def make_drawings(project, channels=None, runs=None, units=None, *, catalogue) -> list[Drawing]:
    """The drawings of ``project``: the sections of ``channels`` and the profiles of ``runs`` (names; every channel
    and run when neither is given), in ``units`` ("us", "si", a unit system, or None for the project's own),
    evaluated with ``catalogue`` (the front end's lining catalogue, with the user's entries; required).

    Raises KeyError for an unknown name (naming those there are), InputError for a bad unit system or a value of
    the project that cannot be computed and hydraulics.NoSolutionError for a channel or run without a solution; a
    channel's error has a ``channel`` attribute naming it as in the project file (as the design sheets do).
    """
    from ..evaluate import evaluate_channel
    from ..run_design import design_run
    from ..run_drawing import profile_model

    system = units if isinstance(units, hu.UnitSystem) else hu.system(units or project.units)
    chosen, chosen_runs = _chosen(project, channels, runs)
    out, taken = [], set()

    def name_for(name, suffix):
        file_name = safe_file_name(name, suffix)
        stem, n = file_name[: -len(suffix)], 2
        while file_name.lower() in taken:   # two names alike once made safe: number the later one
            file_name = f"{stem}_{n}{suffix}"
            n += 1
        taken.add(file_name.lower())
        return file_name

    for ch in chosen:
        try:
            design = evaluate_channel(ch, catalogue)
        except HydraulicsError as exc:
            exc.channel = project.channel_label(ch)
            raise
        doc = section_document(design, system)
        out.append(Drawing("section", ch.name, name_for(ch.name, "-section.dxf"), doc))
    for r in chosen_runs:
        try:
            design = design_run(project, r, catalogue)
        except HydraulicsError as exc:
            # a bad value's message names the run and the item already (app.run_design.RunInputError)
            exc.channel = None if isinstance(exc, InputError) else f'run "{r.name}"'
            raise
        doc = profile_document(profile_model(design, system), system)
        out.append(Drawing("profile", r.name, name_for(r.name, "-profile.dxf"), doc))
    return out


def export_drawings(project, folder, channels=None, runs=None, units=None, *, catalogue) -> list[Path]:
    """Write the drawings of :func:`make_drawings` into ``folder`` (made when missing), each file in one step;
    returns the paths written. Raises what :func:`make_drawings` raises before any file is written, and OSError
    when a file cannot be written."""
    drawings = make_drawings(project, channels, runs, units, catalogue=catalogue)
    folder = Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    written = []
    for d in drawings:
        path = folder / d.file_name
        write_document(d.document, path)
        written.append(path)
    return written
