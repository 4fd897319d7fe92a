"""Writing files so that a crash never leaves half of one."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path


def write_atomic(path, data: str | bytes) -> None:
    """Write ``data`` to ``path`` through a temporary file in the same folder, then replace in one step.

    The temporary file is flushed and synced before ``os.replace``, so the
    target holds either its old content or the new, never a mixture; on any
    error the temporary file is removed and the old file is left as it was.
    Text is written as UTF-8 with the newlines as given.
    """
    path = Path(path)
    raw = data.encode("utf-8") if isinstance(data, str) else data
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(raw)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise
