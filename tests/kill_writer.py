"""The writing processes that tests/test_kill_during_write.py kills: a fresh Python process that forks them.

Forking the test process itself was unreliable: a child inherits every lock that one of the parent's threads held
at the moment of the fork (pyarrow's and the results writer's worker threads, Qt's from earlier tests of the same
run), and in a full test run a forked child sometimes hung before it reached the write. So the test starts this
file as a new program (``python kill_writer.py KIND PAYLOAD TARGET``). It loads the writer's inputs from the pickle
file PAYLOAD, writes once (a warm-up, elsewhere), checks that it runs one thread only and says ``ready``. Then, for
each line ``V`` read from its standard input, it forks a child that writes TARGET again and again, first version V
then the other, alternating; it prints the child's process id once the child runs, waits for the child's end (the
test kills it) and prints how it ended (``signal 9`` for SIGKILL). A fork from a process of one thread copies no
lock held by another thread.
"""

from __future__ import annotations

import os
import pickle
import shutil
import sys
import traceback
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone


def writers(kind: str, payload):
    """``write(path, version)`` of writer ``kind`` with its inputs ``payload`` (see the test for each)."""
    if kind == "project":
        from app import project as pj
        return lambda path, v: pj.save(payload[v], path)
    if kind == "sheet":
        from app.sheet import export_sheets
        project, names = payload
        return lambda path, v: export_sheets(project, path, channels=[names[v]], catalogue=SHIPPED)
    if kind == "drawing":     # the channel's section drawing, NAME-section.dxf in the folder of ``path``
        from app.drawings import export_drawings
        return lambda path, v: export_drawings(payload[v], os.path.dirname(path),
                                               channels=[payload[v].channels[0].name], catalogue=SHIPPED)
    if kind == "inventory":
        from app.inventory import write_results
        return lambda path, v: write_results(path, *payload[v])
    if kind == "stations":
        from app.files import write_atomic
        return lambda path, v: write_atomic(path, payload[v])
    raise ValueError(f"no writer {kind!r}")


def threads() -> int:
    """How many threads this process runs (Linux)."""
    return len(os.listdir("/proc/self/task"))


def _write_forever(write, path, version, started_fd) -> None:
    os.write(started_fd, b"s")
    os.close(started_fd)
    while True:
        write(path, version % 2)
        version += 1


def main(kind: str, payload_path: str, target: str) -> int:
    with open(payload_path, "rb") as fh:
        write = writers(kind, pickle.load(fh))
    if kind != "inventory":   # one write first, so that each child starts warm (fonts, caches) as the test's own
        folder = os.path.join(os.path.dirname(target), "_warm-up")    # write did; the results writer's would
        os.mkdir(folder)                                              # import pyarrow, whose import starts threads
        write(os.path.join(folder, os.path.basename(target)), 0)
        shutil.rmtree(folder)
    if threads() != 1:
        print(f"not ready: {threads()} threads", flush=True)
        return 1
    print("ready", flush=True)
    for line in sys.stdin:
        read_end, write_end = os.pipe()
        pid = os.fork()
        if pid == 0:
            os.close(read_end)
            try:
                _write_forever(write, target, int(line), write_end)
            except BaseException:
                traceback.print_exc()
            os._exit(1)      # a write that failed: the test sees an exit, not a kill
        os.close(write_end)
        os.read(read_end, 1)     # the child runs
        os.close(read_end)
        print(pid, flush=True)
        _, status = os.waitpid(pid, 0)
        print(f"signal {os.WTERMSIG(status)}" if os.WIFSIGNALED(status) else f"exit {os.WEXITSTATUS(status)}",
              flush=True)
    return 0


if __name__ == "__main__":
    sys.exit(main(*sys.argv[1:]))
