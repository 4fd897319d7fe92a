"""One heap for all the memory of a batch process (glibc), set before the batch's imports start any thread."""

from __future__ import annotations

import os
import platform
import sys

#: glibc's M_ARENA_MAX (malloc.h; -8 as the Rust libc crate's linux-gnu bindings give it): the most heaps
#: ("arenas") malloc keeps for the threads of a process (mallopt(3), Linux man-pages).
_M_ARENA_MAX = -8


def share_one_heap() -> bool:
    """Ask the C library for one heap for every thread of this process (glibc's ``mallopt(M_ARENA_MAX, 1)``) and
    pyarrow to take its buffers from that heap too (``ARROW_DEFAULT_MEMORY_POOL=system``, read when pyarrow is
    loaded, unless the user has set it); True where the C library took it (mallopt returns 1), False elsewhere (not
    Linux with glibc), where nothing is done.

    The batch reads and checks one block while a worker thread writes the one before. With a heap per thread
    (glibc's default) and pyarrow's own allocator, the memory each block frees stays spread over several heaps:
    the peak resident memory of a 5,000,000-reach run was about 60 MB higher with a heap per thread, and about
    90 MB higher with pyarrow's own allocator; the speed was the same within the noise
    (benchmarks/bench_batch_stream.py). It has to be asked for before numpy and pyarrow are loaded, so
    :func:`app.main.main` asks before the batch command's modules are imported. Nothing computed changes.
    """
    if not sys.platform.startswith("linux") or platform.libc_ver()[0] != "glibc":
        return False
    import ctypes

    try:
        taken = bool(ctypes.CDLL(None).mallopt(_M_ARENA_MAX, 1))
    except (OSError, AttributeError):
        return False
    if taken:
        os.environ.setdefault("ARROW_DEFAULT_MEMORY_POOL", "system")
    return taken
