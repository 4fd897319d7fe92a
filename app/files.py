"""Writing files so that a crash never leaves half of one."""

from __future__ import annotations

import os
import re
import tempfile
from contextlib import contextmanager
from pathlib import Path


@contextmanager
def atomic_writer(path):
    """A binary file to write ``path`` through: a temporary file in the same folder, replacing ``path`` in one step
    when the block ends without an error.

    The temporary file is flushed and synced before ``os.replace``, so the
    target holds either its old content or the new, never a mixture; on any
    error the temporary file is removed and the old file is left as it was.
    """
    path = Path(path)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "wb") as fh:
            yield fh
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise


def write_atomic(path, data) -> None:
    """Write ``data`` to ``path`` through :func:`atomic_writer`.

    ``data`` is text (written as UTF-8 with the newlines as given), bytes,
    or a list of bytes-like pieces written one after the other.
    """
    pieces = data if isinstance(data, list) else [data]
    with atomic_writer(path) as fh:
        for piece in pieces:
            fh.write(piece.encode("utf-8") if isinstance(piece, str) else piece)


# -- text cells that a spreadsheet would run -----------------------------------------------------------------------

#: The first characters that make a spreadsheet read a cell as a formula (or, for tab and carriage return, that let
#: one slip past a check for the others), the usual list for CSV formula injection.
FORMULA_STARTS = frozenset("=+-@\t\r")
_PLAIN_NUMBER = re.compile(r"[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?")


def spreadsheet_safe(text: str) -> str:
    """``text`` as a cell of a CSV or TSV file that a spreadsheet will show and never evaluate.

    A cell starting with one of :data:`FORMULA_STARTS` gets a leading apostrophe, which spreadsheets take as
    "this is text" (``=HYPERLINK(...)`` becomes ``'=HYPERLINK(...)``); a plain number such as ``-1.5`` or
    ``+2e-3`` is left as it is, so that numbers stay numbers.
    """
    if text[:1] in FORMULA_STARTS and not _PLAIN_NUMBER.fullmatch(text):
        return "'" + text
    return text
