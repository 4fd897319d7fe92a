"""Work off the window's thread (app.gui.tasks): a task's results, progress, stopping and letting go; the newest
inputs computed, once, and a stale result dropped."""

import gc
import threading
import weakref

from app.gui import tasks


def test_a_task_stops_at_its_next_progress_report(qtbot):
    steps = []

    def work(progress):
        for i in range(1000):
            steps.append(i)
            progress(i, 1000)
            if i == 2:
                task.cancel()
        return "finished"

    task = tasks.Task(work)
    with qtbot.waitSignal(task.failed, timeout=10000) as blocker:
        task.start()
    task.wait()
    assert isinstance(blocker.args[0], tasks.Cancelled) and steps == [0, 1, 2, 3]


def test_a_task_reports_its_result_and_progress(qtbot):
    seen = []
    task = tasks.Task(lambda progress: [progress(i, 3) for i in range(1, 4)] and "done")
    task.progressed.connect(lambda done, total: seen.append((done, total)))
    with qtbot.waitSignal(task.succeeded, timeout=10000) as blocker:
        task.start()
    task.wait()
    assert blocker.args == ["done"] and seen == [(1, 3), (2, 3), (3, 3)]


def test_a_task_lets_go_of_its_work(qtbot):
    class Secret:
        pass

    secret = Secret()
    ref = weakref.ref(secret)
    task = tasks.Task(lambda progress, s=secret: "done")
    del secret
    with qtbot.waitSignal(task.succeeded, timeout=10000):
        task.start()
    task.wait()
    gc.collect()
    assert ref() is None          # nothing of the work is kept by the finished task


class Inputs:
    """Inputs being edited, with a gate that holds the worker while the value 1 is computed."""

    def __init__(self):
        self.value = 1
        self.gate = threading.Event()
        self.prepared = []

    def prepare(self):
        value = self.value
        self.prepared.append(value)

        def work():
            if value == 1:
                assert self.gate.wait(10)
            if value == "bad":
                raise ValueError("not a number")
            return value * 10
        return work


def recomputer():
    inputs = Inputs()
    worker = tasks.Recomputer(inputs.prepare)
    results, failures = [], []
    worker.succeeded.connect(results.append)
    worker.failed.connect(failures.append)
    return inputs, worker, results, failures


def test_requests_made_in_one_go_are_computed_once(qtbot):
    inputs, worker, results, _ = recomputer()
    inputs.value = 2
    for _ in range(3):
        worker.request()
    assert not worker.idle                       # due, though not started yet
    qtbot.waitUntil(lambda: worker.idle, timeout=10000)
    assert inputs.prepared == [2] and results == [20]


def test_a_stale_result_is_dropped_and_the_newest_inputs_computed(qtbot):
    inputs, worker, results, _ = recomputer()
    try:
        worker.request()
        qtbot.waitUntil(lambda: worker.running, timeout=10000)   # held at the gate, computing the value 1
        for value in (2, 3):                                     # two more changes while it runs
            inputs.value = value
            worker.request()
    finally:
        inputs.gate.set()
    qtbot.waitUntil(lambda: worker.idle, timeout=10000)
    assert inputs.prepared == [1, 3]          # the value 2 was never computed: 3 had come before it could start
    assert results == [30]                    # the result of 1 came after 3 was asked for: dropped


def test_an_error_in_the_work_is_delivered_not_raised(qtbot):
    inputs, worker, results, failures = recomputer()
    inputs.value = "bad"
    worker.request()
    qtbot.waitUntil(lambda: worker.idle, timeout=10000)
    assert results == [] and len(failures) == 1 and isinstance(failures[0], ValueError)


def test_finish_waits_for_the_result_of_the_newest_inputs(qtbot):
    """An action on the result (a copy, an apply) waits in place: the stale result is dropped, the newest
    delivered before finish() returns."""
    inputs, worker, results, _ = recomputer()
    worker.request()
    qtbot.waitUntil(lambda: worker.running, timeout=10000)      # held at the gate, computing the value 1
    inputs.value = 4
    worker.request()
    threading.Timer(0.2, inputs.gate.set).start()                # the worker is let go while finish() waits
    worker.finish()
    assert worker.idle and inputs.prepared == [1, 4] and results == [40]


def test_finish_starts_a_computation_that_is_only_due(qtbot):
    inputs, worker, results, _ = recomputer()
    inputs.value = 5
    worker.request()                 # due at the next turn of the event loop, which finish() does not wait for
    worker.finish()
    assert results == [50] and worker.idle
