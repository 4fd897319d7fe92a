"""A guard against a reference-count fault seen with PySide6 6.12 on CPython 3.11.

With that pair every Qt call that returns nothing (``setText``,
``setVisible``, ``setEnabled``...) and every one that returns a null value
(an unset ``QObject.property``, an empty ``QTableWidget.item``) gives back a
reference to ``None`` that it never took. ``None`` is an ordinary object
before CPython 3.12, so after a few thousand such calls, a few dozen edits in
the window, its count reaches zero and the interpreter aborts with "none_dealloc:
deallocating None". CPython 3.12 and later make ``None`` immortal, which hides
the fault.

On an affected interpreter (checked by measuring, not by version numbers)
this module raises None's reference count by 2**40 once, which is what
CPython 3.12 does by design. Nothing else is touched.
"""

from __future__ import annotations

import ctypes
import sys

_RESERVE = 1 << 40


def leaks_none(calls: int = 64) -> bool:
    """True when a Qt call that returns nothing takes a reference from None."""
    from PySide6.QtCore import QObject

    probe = QObject()
    probe.setObjectName("probe")
    before = sys.getrefcount(None)
    for _ in range(calls):
        probe.setObjectName("probe")
    return sys.getrefcount(None) <= before - calls // 2


def apply() -> bool:
    """Guard None if this interpreter and Qt binding need it; True if the guard was applied."""
    if sys.implementation.name != "cpython" or sys.version_info >= (3, 12):
        return False
    if not leaks_none():
        return False
    ctypes.c_ssize_t.from_address(id(None)).value += _RESERVE
    return True


APPLIED = apply()
