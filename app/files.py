"""Writing files so that a crash never leaves half of one."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path


def write_atomic(path, data) -> None:
    """Write ``data`` to ``path`` through a temporary file in the same folder, then replace in one step.

    The temporary file is flushed and synced before ``os.replace``, so the
    target holds either its old content or the new, never a mixture; on any
    error the temporary file is removed and the old file is left as it was.
    ``data`` is text (written as UTF-8 with the newlines as given), bytes,
    or a list of bytes-like pieces written one after the other.
    """
    path = Path(path)
    pieces = data if isinstance(data, list) else [data]
    pieces = [p.encode("utf-8") if isinstance(p, str) else p for p in pieces]
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "wb") as fh:
            for piece in pieces:
                fh.write(piece)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise
