"""The design sheets: a PDF page per channel and a few pages per ditch run for the plan set, vector, headless.

    from app.sheet import export_sheets
    catalogue = Context.load(user_path).catalogue      # the shipped catalogue with the user's file
    export_sheets(project, "sheets.pdf", channels=["North roadside ditch"], page="letter", catalogue=catalogue)
    export_sheets(project, "runs.pdf", channels=[], runs=None, catalogue=catalogue)   # every run, no channel
    export_sheets(project, "all.pdf", runs=None, catalogue=catalogue)                 # every channel, then every run
    export_sheets(project, "signed.pdf", sign=("engineer.p12", password), catalogue=catalogue)

Each channel sheet prints what :func:`app.evaluate.evaluate_channel` finds for its
channel with the given lining catalogue (required: there is no default); each run
sheet what :func:`app.run_design.design_run` finds for its run
(:mod:`app.sheet.run_content`, :mod:`app.sheet.run_layout`).

No Qt here: the desktop window and the command line both call this package.
"""

from __future__ import annotations

import os

from hydraulics.errors import HydraulicsError, InputError

from ..files import write_atomic
from .content import ChannelSheet, channel_sheet
from .fingerprint import canonical_json, fingerprint, run_fingerprint
from .document import render
from .layout import PAGES, SheetLayoutError, approval_box
from .run_content import RunSheet, run_sheet
from .signing import (PASSWORD_ENV, SigningError, VerifyError, password_from_environment_or_prompt, sign_pdf,
                      verify_pdf)

__all__ = ["export_sheets", "sheet_pdf", "channel_sheet", "ChannelSheet", "run_sheet", "RunSheet", "fingerprint",
           "run_fingerprint", "canonical_json",
           "PAGES", "SheetLayoutError", "approval_box", "PASSWORD_ENV", "SigningError", "VerifyError",
           "sign_pdf", "verify_pdf"]


def _select(project, channels):
    if channels is None:
        return list(project.channels)
    if isinstance(channels, str):
        channels = [channels]
    chosen = []
    for name in channels:
        if not isinstance(name, str):  # a Channel object
            chosen.append(name)
            continue
        chosen.append(project.channel(name))  # KeyError names the channels there are
    return chosen


def _select_runs(project, runs):
    if runs is None:
        return list(project.runs)
    if isinstance(runs, str):
        runs = [runs]
    return [r if not isinstance(r, str) else project.run(r) for r in runs]  # KeyError names the runs there are


def sheet_pdf(project, channels=None, page: str = "letter", *, catalogue, runs=()) -> tuple[bytes, list]:
    """The unsigned PDF bytes (one page per channel, then the pages of each run) and notes for the user (e.g. a
    missing logo), evaluated with ``catalogue`` (the front end's)."""
    if page not in PAGES:
        raise ValueError(f"page must be one of {', '.join(PAGES)}, got {page!r}")
    chosen, chosen_runs = _select(project, channels), _select_runs(project, runs)
    if not chosen and not chosen_runs:
        raise KeyError("no channel or run chosen for the sheet")
    sheets = []
    for ch in chosen:
        try:
            sheets.append(channel_sheet(project, ch, catalogue))
        except HydraulicsError as exc:
            exc.channel = project.channel_label(ch)   # a value from the file: name the channel that holds it
            raise
    for r in chosen_runs:
        try:
            sheets.append(run_sheet(project, r, catalogue))
        except HydraulicsError as exc:
            # a bad value's message names the run and the item already (app.run_design.RunInputError)
            exc.channel = None if isinstance(exc, InputError) else f'run "{r.name}"'

            raise
    return render(project, sheets, page)


def export_sheets(project, path, channels=None, page: str = "letter", sign=None, *, catalogue, runs=()) -> list:
    """Write the design sheets of ``project`` to ``path`` (one PDF: one page per channel, then each run's pages).

    Parameters
    ----------
    project : app.project.Project
    path : str or Path
        The PDF to write; it is replaced in one step, so a failure leaves any old file as it was.
    channels : None, str or list
        Channel names (or Channel objects); None for every channel of the project, [] for none.
    runs : None, str or list
        Ditch run names (or Run objects) whose sheets follow the channels'; None for every run of the project;
        default none. A run's sheet takes as many pages as its station table needs.
    page : "letter" or "a4"
    sign : None, a path, or (path, password)
        The engineer's PKCS#12 file. With a bare path the password comes from
        DITCHWRIGHT_CERT_PASSWORD or is asked for at the terminal; a window
        asks for it itself and passes (path, password). It is never stored.
    catalogue : hydraulics.linings.Catalogue
        The lining catalogue, required (the front end's ``Context.catalogue``:
        the shipped one with the user's file). The fingerprints
        printed include the entries used, so ``ditchwright fingerprint`` needs
        the same catalogue to reproduce them.

    Returns the notes for the user (empty when there is nothing to say).
    Raises KeyError (unknown channel or run, or none chosen), ValueError (bad page), hydraulics.InputError /
    NoSolutionError (the channel cannot be solved; its ``channel`` attribute says which, as in the project
    file), SheetLayoutError, SigningError.
    """
    data, notes = sheet_pdf(project, channels, page, catalogue=catalogue, runs=runs)
    if sign is not None:
        if isinstance(sign, (str, os.PathLike)):
            p12, password = sign, password_from_environment_or_prompt(sign)
        else:
            p12, password = sign
        data = sign_pdf(data, p12, password, page)
    write_atomic(path, data)
    return notes
