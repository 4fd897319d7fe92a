"""Python's cyclic garbage collector held back while a computation makes many small objects that hold no cycles.

A long water-surface profile makes some ten thousand small objects (computation nodes, states, the props of each
point) that all live until it returns. Every 700 new objects start a pass of the cyclic collector, and as they
survive, the passes reach the older generations, which hold every object of the process (in the window: Qt's and
matplotlib's too). In ``benchmarks/bench_run.py`` those passes were a sixth to a fifth of the profile's time.
Reference counting frees objects as usual while the collector is held; only its search for reference cycles waits
until the computation returns (Python Standard Library, ``gc`` module: ``gc.disable``, ``gc.isenabled``).

The collector is process-wide: a computation that finds it already held (by the user, or by another thread's
computation) leaves it as it found it, so it is never left held.
"""

from __future__ import annotations

import gc
from contextlib import contextmanager

__all__ = ["collector_held"]


@contextmanager
def collector_held():
    """Context manager and decorator: the cyclic collector off inside, back on after if it was on before."""
    if not gc.isenabled():
        yield
        return
    gc.disable()
    try:
        yield
    finally:
        gc.enable()
