"""Waiting for the window's worker threads in tests (one home for every test file that waits).

The channel page evaluates the current channel off the window's thread, its lining comparison compares the
linings there, and the run view solves its run there; a test that reads what they show after an edit waits for it
here first.
"""

#: The demo run takes a few seconds to solve in the worker thread [ms].
WAIT = 60000


def evaluated(w, qtbot):
    """Wait until the main window ``w`` shows the result of its current channel as it is now; returns it."""
    qtbot.waitUntil(lambda: w.evaluator.idle and w.evaluation is not None, timeout=WAIT)
    return w.evaluation


def compared(view, qtbot):
    """Wait until the lining comparison ``view`` shows the table of its channel as it is now; returns its rows."""
    if view._stale:
        view.refresh()               # a view out of sight computes when shown; a test may read it unseen
    qtbot.waitUntil(lambda: view.idle, timeout=WAIT)
    return view.rows


def shown(w, qtbot):
    """Show the run page of the window ``w`` and wait for its result."""
    w.show_runs()
    view = w.run_view
    qtbot.waitUntil(lambda: view.idle and view.design is not None, timeout=WAIT)
    return view


def settle(view, qtbot):
    """Wait until the run view has no computation running or due."""
    qtbot.waitUntil(lambda: view.idle, timeout=WAIT)
