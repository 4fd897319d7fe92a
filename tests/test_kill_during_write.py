"""A writer killed at a random moment leaves the old file intact or the new one complete, never half of one.

Each writer (project save, sheet export, DXF drawing export, inventory results, a run's station table) runs in a
child process that writes the target again and again, alternating two versions; the child is killed with SIGKILL at
50 random moments (more when needed, see _hammer) spread over its first write and a little of the next. After every
kill the target must equal one complete version. Temporary files a killed write leaves behind carry a temporary
name and are cleared by the next write (app.files.remove_stale_temporaries). Common practice for crash safety:
write a temporary file in the same folder, sync it, then replace the target in one step (POSIX rename(2) is atomic).

The children are forked by a fresh Python process of one thread (tests/kill_writer.py), never by this one: a
process forked from one with threads inherits the locks those threads held, and such a child sometimes hung before
it reached the write.
"""

import io
import os
import pickle
import random
import re
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest
from pypdf import PdfReader

from app import project as pj
from app import files

import kill_writer
from app.context import Context

SHIPPED = Context.load().catalogue   # the shipped lining catalogue alone

KILLS = 50
pytestmark = pytest.mark.skipif(sys.platform != "linux", reason="fork and SIGKILL as on Linux")
ROOT = Path(__file__).resolve().parents[1]


class Writers:
    """The fresh process that forks the writing children (tests/kill_writer.py), as a context manager."""

    def __init__(self, kind, payload, target):
        self.payload = target.parent / "_payload.pickle"
        self.payload.write_bytes(pickle.dumps(payload))
        env = dict(os.environ, PYTHONPATH=os.pathsep.join(filter(None, [str(ROOT), os.environ.get("PYTHONPATH")])),
                   OPENBLAS_NUM_THREADS="1", OMP_NUM_THREADS="1")
        self.process = subprocess.Popen([sys.executable, str(Path(kill_writer.__file__)), kind, str(self.payload),
                                         str(target)], stdin=subprocess.PIPE, stdout=subprocess.PIPE, text=True,
                                        env=env)
        self.kind = kind
        self.running = None

    def __enter__(self):
        line = self.process.stdout.readline().strip()
        assert line == "ready", f"the {self.kind} writers did not start: {line!r}"
        return self

    def start(self, version) -> int:
        """Fork a child that writes ``version`` first; its process id once it runs."""
        self.process.stdin.write(f"{version}\n")
        self.process.stdin.flush()
        self.running = int(self.process.stdout.readline())
        return self.running

    def ended(self) -> str:
        self.running = None
        return self.process.stdout.readline().strip()

    def __exit__(self, *exc):
        if self.running is not None:      # a check failed while a child was writing: it must not write on
            os.kill(self.running, signal.SIGKILL)
            self.ended()
        self.process.stdin.close()
        self.process.wait(30)
        self.payload.unlink()


def _first_write_time(writers, path, version) -> float:
    """Seconds a fresh child takes from its start to the end of its first write (``version``); it then is killed."""
    before = path.stat().st_ino
    pid = writers.start(version)
    started = time.perf_counter()
    while path.stat().st_ino == before:     # the replace gives the file a new inode
        assert time.perf_counter() - started < 120, "the writing child never completed a write"
        time.sleep(0.001)
    duration = time.perf_counter() - started
    os.kill(pid, signal.SIGKILL)
    assert writers.ended() == f"signal {signal.SIGKILL}"
    return duration


def _hammer(kind, payload, path, complete, seed, inside=True, both=False):
    """Kill a child writing ``path`` at random moments; ``complete(bytes)`` says which version a file is.
    ``inside``: some kill must land while the file itself is being written (leaving a temporary file); a sheet is
    composed in memory for most of its time and written in a blink, so there the kills land mostly before."""
    write = kill_writer.writers(kind, payload)
    write(path, 1)
    rng = random.Random(seed)
    seen = set()
    current = 0
    kills = 0

    def inside_once():
        return any(p.name.endswith(".tmp") for p in path.parent.iterdir())

    with Writers(kind, payload, path) as writers:
        duration = _first_write_time(writers, path, current)
        # at least KILLS kills; more (up to four times as many) while none has yet landed inside a write
        # (and, with ``both``, until the file has been seen as each version: kills before and after a replace)
        while kills < KILLS or (kills < 4 * KILLS and ((inside and not inside_once()) or (both and len(seen) < 2))):
            kills += 1
            # each child first writes the version the file does not hold, so a completed write shows
            pid = writers.start(1 - current)   # timed from the child's start, however slow forking is
            # the window widens with every KILLS kills: on a busy machine a write can take longer than the first did
            time.sleep(rng.uniform(0.0, (1 + kills // KILLS) * 1.3 * duration + 0.002))
            os.kill(pid, signal.SIGKILL)
            assert writers.ended() == f"signal {signal.SIGKILL}", "the writing child ended before it was killed"
            version = complete(path.read_bytes())
            assert version in (0, 1), f"the file is neither version after a kill: {path.read_bytes()[:80]!r}"
            seen.add(version)
            current = version
    leftovers = [p for p in path.parent.iterdir() if p != path and not p.name.startswith("_")]
    assert leftovers or not inside, "no kill landed inside a write: the test did not test anything"
    assert all(p.name.startswith(f".{path.name}.") and p.name.endswith(".tmp") for p in leftovers), leftovers
    time.sleep(files.STALE_DEAD_AFTER_S + 0.2)   # past the grace given to a temporary file of a dead process
    write(path, 0)     # the next write clears what killed writes left
    assert [p for p in path.parent.iterdir() if p.name.endswith(".tmp")] == []
    return seen


def _project(version):
    project = pj.load(pj.demo_path())
    project.name = f"Kill test, version {version}"
    project.channels = project.channels * (30 + 10 * version)    # a file of some size, a different one per version
    return project


VERSIONS = {v: _project(v) for v in (0, 1)}
PROJECTS = {v: pj.dumps(p).encode("utf-8") for v, p in VERSIONS.items()}


def test_project_save(tmp_path):
    seen = _hammer("project", VERSIONS, tmp_path / "p.json", lambda b: {v: k for k, v in PROJECTS.items()}.get(b),
                   seed=1)
    assert seen      # the file was always one of the two versions


def test_sheet_export(tmp_path):
    project = pj.load(pj.demo_path())
    names = [project.channels[0].name, project.channels[1].name]

    def complete(data):
        reader = PdfReader(io.BytesIO(data))
        text = reader.pages[0].extract_text()
        return 0 if names[0] in text else 1 if names[1] in text else None
    seen = _hammer("sheet", (project, names), tmp_path / "sheet.pdf", complete, seed=2, inside=False, both=True)
    assert seen == {0, 1}     # kills landed both before and after a new sheet replaced the old one


# What changes from one DXF export of the same drawing to the next: the header's dates (Julian days), the document's
# GUIDs and ezdxf's time stamp in its metadata; and from one process to the next the order of a few objects
# (Python's string hashing differs), so a file is known by its lines as a sorted multiset (a half file lacks some).
_DXF_VOLATILE = re.compile(rb"^(\d{7}\.\d+|\{[0-9A-F-]{36}\}|.* @ \d{4}-\d\d-\d\dT[^\n]*)$", re.M)


def _dxf_lines(data: bytes) -> bytes:
    return b"\n".join(sorted(_DXF_VOLATILE.sub(b"", data).splitlines()))


def test_drawing_export(tmp_path):
    from app.drawings import make_drawings
    projects = {}
    for v, width in enumerate((0.6, 0.9)):
        projects[v] = pj.load(pj.demo_path())
        projects[v].channels = projects[v].channels[:1]
        projects[v].channels[0].section["bottom_width"] = width
        projects[v].runs = []
    write = kill_writer.writers("drawing", projects)
    (name,) = [d.file_name for d in make_drawings(projects[0], catalogue=SHIPPED)]
    versions = {}
    for v in (0, 1):
        probe = tmp_path / f"_probe{v}"
        probe.mkdir()
        write(probe / name, v)
        versions[_dxf_lines((probe / name).read_bytes())] = v
        (probe / name).unlink()
        probe.rmdir()
    assert len(versions) == 2
    seen = _hammer("drawing", projects, tmp_path / name, lambda b: versions.get(_dxf_lines(b)), seed=5,
                   inside=False, both=True)
    assert seen == {0, 1}


def test_inventory_results(tmp_path):
    """The results file as the batch writes it, with pyarrow and its worker threads (each child starts its own).

    One id is quoted, so the file is read by the csv-module reader, not by pyarrow: the inventory then holds no
    pyarrow object and the forking process never imports pyarrow (its import starts threads)."""
    from app.inventory import evaluate, read_inventory
    rows = ["id,shape,bottom_width,left_slope,right_slope,diameter,slope,flow,lining,d50,n",
            '"R, quoted",trapezoid,0.6,3,3,,0.002,0.3,,,0.03']
    rows += [f"R{i},trapezoid,{0.5 + i % 7 * 0.1:g},3,3,,0.00{1 + i % 9},{0.2 + i % 11 * 0.05:g},,,0.03"
             for i in range(20000)]
    source = tmp_path / "_inventory.csv"
    source.write_text("\n".join(rows) + "\n")
    inventory = read_inventory(source, "si")
    other = read_inventory(source, "us")     # the second version: the same file read in US units
    checked = {0: (inventory, evaluate(inventory, catalogue=SHIPPED)), 1: (other, evaluate(other, catalogue=SHIPPED))}
    write = kill_writer.writers("inventory", checked)
    versions = {}
    for v in (0, 1):
        probe = tmp_path / f"_probe{v}.csv"
        write(probe, v)
        versions[probe.read_bytes()] = v
        probe.unlink()
    _hammer("inventory", checked, tmp_path / "results.csv", versions.get, seed=3)


def test_run_station_table(tmp_path):
    texts = {0: "station\n" + "0+000.00\n" * 50000, 1: "station\n" + "0+00.00\n" * 60000}
    data = {v: t.encode("utf-8") for v, t in texts.items()}
    _hammer("stations", data, tmp_path / "stations.csv", {b: v for v, b in data.items()}.get, seed=4)

