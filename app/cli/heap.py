"""One heap for all the memory of a batch process (glibc), set before the batch's imports start any thread."""

from __future__ import annotations

import os
import platform
import sys

#: glibc's M_ARENA_MAX (malloc.h; -8 as the Rust libc crate's linux-gnu bindings give it): the most heaps
#: ("arenas") malloc keeps for the threads of a process (mallopt(3), Linux man-pages).
_M_ARENA_MAX = -8
#: glibc's M_TRIM_THRESHOLD and M_MMAP_THRESHOLD (-1 and -3 in the same bindings): the free memory at the top of
#: the heap kept rather than given back, and the size from which a block is mapped on its own (The GNU C Library
#: manual, "Malloc Tunable Parameters"; setting either turns off glibc's own adjustment of it).
_M_TRIM_THRESHOLD, _M_MMAP_THRESHOLD = -1, -3
#: The values the batch asks for: a block's arrays (a few MB each) come from the heap and its memory serves the
#: next block, instead of being mapped, zeroed by the kernel page by page and unmapped for every block.
BLOCK_HEAP = {_M_MMAP_THRESHOLD: 64 << 20, _M_TRIM_THRESHOLD: 256 << 20}


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

    The heap also keeps what a block frees for the next (:data:`BLOCK_HEAP`): with glibc's default, every block's
    large arrays were mapped afresh, some 190,000 page faults for 1,000,000 reaches against some 85,000, and
    the batch took about 3 % longer; the peak memory of a 5,000,000-reach run was 435 MB against 441 MB.
    """
    if not sys.platform.startswith("linux") or platform.libc_ver()[0] != "glibc":
        return False
    import ctypes

    try:
        libc = ctypes.CDLL(None)
        taken = bool(libc.mallopt(_M_ARENA_MAX, 1))
        if taken:
            for param, value in BLOCK_HEAP.items():
                libc.mallopt(param, value)
    except (OSError, AttributeError):
        return False
    if taken:
        os.environ.setdefault("ARROW_DEFAULT_MEMORY_POOL", "system")
    return taken
