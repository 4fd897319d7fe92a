"""Work off the window's thread (app.gui.tasks.Task): results, progress, stopping, and letting go."""

import gc
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
