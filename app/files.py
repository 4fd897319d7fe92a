"""Writing files so that a crash never leaves half of one."""

from __future__ import annotations

import os
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
