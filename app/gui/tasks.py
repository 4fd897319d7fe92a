"""Work off the window's thread: a design-sheet export, an inventory check, the result of inputs being edited.

A :class:`Task` runs one plain function in a QThread. The function gets a
``progress(done, total)`` callback; the task reports back through signals,
which Qt delivers in the window's thread, so the slots may touch widgets.
The function must not touch widgets or the open project: give it copies.
A task runs once; it drops the function when it starts, so that whatever
the function holds (a certificate password, a copy of the project) goes
when the work is done.

A :class:`Recomputer` keeps one result up to date with inputs that keep
changing (a channel or a ditch run being edited): one task at a time, the
newest inputs only.
"""

from __future__ import annotations

from PySide6.QtCore import QCoreApplication, QEvent, QObject, QThread, QTimer, Signal


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


class Recomputer(QObject):
    """One result kept up to date with inputs that keep changing, computed off the window's thread.

    :meth:`request` says that the inputs changed. The computation starts at the
    next turn of the event loop, so changes made in one go are computed once.
    While one runs, further requests only make it due again: when it ends, its
    result is dropped and the inputs as they are then are computed. Only the
    result of the newest request is delivered, so a stale result never
    overwrites a newer one.

    ``prepare()`` is called in the window's thread as a computation starts and
    returns the work: a function of no arguments run in the worker, on copies
    of the inputs as they are at that moment (it must not touch widgets or the
    open project). ``succeeded`` carries what the work returned, ``failed`` the
    exception it raised.
    """

    succeeded = Signal(object)
    failed = Signal(object)

    def __init__(self, prepare, parent=None):
        super().__init__(parent)
        self._prepare = prepare
        self._task: Task | None = None
        self._outcome = None
        self._requested = 0      # requests so far
        self._started = 0        # the request the running (or last) computation answers
        self._timer = QTimer(self)
        self._timer.setSingleShot(True)
        self._timer.setInterval(0)
        self._timer.timeout.connect(self._start)

    def request(self) -> None:
        """The inputs changed: compute them (once, however many requests come before it starts)."""
        self._requested += 1
        if self._task is None:
            self._timer.start()

    @property
    def idle(self) -> bool:
        """Nothing running or due: the last result delivered answers the newest request (tests wait for this)."""
        return self._task is None and self._started == self._requested

    @property
    def running(self) -> bool:
        return self._task is not None

    def wait(self) -> None:
        """Block until a running computation ends (the window is closing); its result comes at the next turn of
        the event loop."""
        if self._task is not None:
            self._task.wait()

    def finish(self) -> None:
        """Block until the result of the newest request has been delivered (an action that must act on the
        result for the inputs as they are, such as copying it). Only this object's own queued calls are handled
        meanwhile, not the rest of the event loop."""
        while not self.idle:
            if self._task is None:
                self._timer.stop()
                self._start()
            task = self._task
            task.wait()
            # the task's results and its end were queued to this object from the worker: take them now
            QCoreApplication.sendPostedEvents(self, QEvent.Type.MetaCall)
            if self._task is task:       # not delivered (it should have been): let go rather than wait forever
                self._finished()

    def _start(self) -> None:
        if self._task is not None or self._started == self._requested:
            return
        self._started = self._requested
        work = self._prepare()
        # The application owns the thread, so that it outlives a window closed while it runs (Qt aborts when a
        # running QThread is destroyed); it deletes itself when done.
        task = Task(lambda _progress: work(), QCoreApplication.instance())
        task.succeeded.connect(self._succeeded)
        task.failed.connect(self._failed)
        task.finished.connect(self._finished)
        task.finished.connect(task.deleteLater)
        self._task, self._outcome = task, None
        task.start()

    def _succeeded(self, result) -> None:
        self._outcome = (self.succeeded, result)

    def _failed(self, exc) -> None:
        self._outcome = (self.failed, exc)

    def _finished(self) -> None:
        self._task = None
        outcome, self._outcome = self._outcome, None
        if self._started != self._requested:     # a newer request came meanwhile: this result is stale
            self._start()
        elif outcome is not None:
            signal, value = outcome
            signal.emit(value)
