"""Long work off the window's thread: a design-sheet export, an inventory check.

A :class:`Task` runs one plain function in a QThread. The function gets a
``progress(done, total)`` callback; the task reports back through signals,
which Qt delivers in the window's thread, so the slots may touch widgets.
The function must not touch widgets or the open project: give it copies.
A task runs once; it drops the function when it starts, so that whatever
the function holds (a certificate password, a copy of the project) goes
when the work is done.
"""

from __future__ import annotations

from PySide6.QtCore import QThread, Signal


class Cancelled(Exception):
    """Raised inside the work at its next progress report after :meth:`Task.cancel`."""


class Task(QThread):
    progressed = Signal(int, int)   # done, total
    succeeded = Signal(object)      # what the function returned
    failed = Signal(object)         # the exception it raised (Cancelled after cancel())

    def __init__(self, work, parent=None):
        super().__init__(parent)
        self._work = work
        self._cancelled = False

    def cancel(self) -> None:
        """Ask the work to stop at its next progress report."""
        self._cancelled = True

    @property
    def cancelled(self) -> bool:
        return self._cancelled

    def _report(self, done: int, total: int) -> None:
        if self._cancelled:
            raise Cancelled()
        self.progressed.emit(int(done), int(total))

    def run(self) -> None:  # in the worker thread
        work, self._work = self._work, None   # let go of the work (and what it holds, e.g. a password)
        try:
            result = work(self._report)
        except BaseException as exc:  # noqa: BLE001 - every failure goes back to the window, in words
            self.failed.emit(Cancelled() if self._cancelled else exc)
        else:
            if self._cancelled:
                self.failed.emit(Cancelled())
            else:
                self.succeeded.emit(result)
