"""The design sheet: a PDF page per channel for the plan set, vector throughout, headless.

    from app.sheet import export_sheets
    export_sheets(project, "sheets.pdf", channels=["North roadside ditch"], page="letter")
    export_sheets(project, "signed.pdf", sign=("engineer.p12", password))
    export_sheets(project, "sheets.pdf", catalogue=load_default_catalogue(user_path))

Each sheet prints what :func:`app.evaluate.evaluate_channel` finds for its
channel with the given lining catalogue (default: the shipped one).

No Qt here: the desktop window and the command line both call this package.
"""

from __future__ import annotations

import os

from hydraulics.errors import HydraulicsError

from ..files import write_atomic
from .content import ChannelSheet, channel_sheet
from .fingerprint import canonical_json, fingerprint
from .layout import PAGES, SheetLayoutError, approval_box, render
from .signing import (PASSWORD_ENV, SigningError, VerifyError, password_from_environment_or_prompt, sign_pdf,
                      verify_pdf)

__all__ = ["export_sheets", "sheet_pdf", "channel_sheet", "ChannelSheet", "fingerprint", "canonical_json",
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
    if not chosen:
        raise KeyError("no channel chosen for the sheet")
    return chosen


def sheet_pdf(project, channels=None, page: str = "letter", catalogue=None) -> tuple[bytes, list]:
    """The unsigned PDF bytes (one page per channel) and notes for the user (e.g. a missing logo)."""
    if page not in PAGES:
        raise ValueError(f"page must be one of {', '.join(PAGES)}, got {page!r}")
    if catalogue is None:
        from ..evaluate import load_default_catalogue

        catalogue = load_default_catalogue()
    sheets = []
    for ch in _select(project, channels):
        try:
            sheets.append(channel_sheet(project, ch, catalogue))
        except HydraulicsError as exc:
            exc.channel = project.channel_label(ch)   # a value from the file: name the channel that holds it
            raise
    return render(project, sheets, page)


def export_sheets(project, path, channels=None, page: str = "letter", sign=None, catalogue=None) -> list:
    """Write the design sheets of ``project`` to ``path`` (one PDF, one page per channel).

    Parameters
    ----------
    project : app.project.Project
    path : str or Path
        The PDF to write; it is replaced in one step, so a failure leaves any old file as it was.
    channels : None, str or list
        Channel names (or Channel objects); None for every channel of the project.
    page : "letter" or "a4"
    sign : None, a path, or (path, password)
        The engineer's PKCS#12 file. With a bare path the password comes from
        DITCHWRIGHT_CERT_PASSWORD or is asked for at the terminal; a window
        asks for it itself and passes (path, password). It is never stored.
    catalogue : hydraulics.linings.Catalogue, optional
        The lining catalogue (``app.evaluate.load_default_catalogue(user_path)``
        to include the user's); default the shipped one. The fingerprints
        printed include the entries used, so ``ditchwright fingerprint`` needs
        the same catalogue to reproduce them.

    Returns the notes for the user (empty when there is nothing to say).
    Raises KeyError (unknown channel), ValueError (bad page), hydraulics.InputError /
    NoSolutionError (the channel cannot be solved; its ``channel`` attribute says which, as in the project
    file), SheetLayoutError, SigningError.
    """
    data, notes = sheet_pdf(project, channels, page, catalogue)
    if sign is not None:
        if isinstance(sign, (str, os.PathLike)):
            p12, password = sign, password_from_environment_or_prompt(sign)
        else:
            p12, password = sign
        data = sign_pdf(data, p12, password, page)
    write_atomic(path, data)
    return notes
