"""Reading a project file for a sub-command: a damaged or missing file is a one-line error (exit 2)."""

from __future__ import annotations

from .common import CliError


def load_project(path):
    from ..project import ProjectFileError, load

    try:
        return load(path)
    except ProjectFileError as exc:
        raise CliError(str(exc)) from None
