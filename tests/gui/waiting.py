"""Waiting for the window's worker threads in tests (one home for every test file that waits)."""

#: The demo run takes a few seconds to solve in the worker thread [ms].
WAIT = 60000


def shown(w, qtbot):
    """Show the run page of the window ``w`` and wait for its result."""
    w.show_runs()
    view = w.run_view
    qtbot.waitUntil(lambda: view.idle and view.design is not None, timeout=WAIT)
    return view


def settle(view, qtbot):
    """Wait until the run view has no computation running or due."""
    qtbot.waitUntil(lambda: view.idle, timeout=WAIT)
