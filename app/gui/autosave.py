"""Autosave to the user's data folder, and recovery after a crash.

Each running window has a session id. While its project has unsaved changes it
is written (atomically, like any project) to ``<data folder>/autosave/<id>.json``
with a small ``<id>.meta.json`` beside it naming the file it came from. The
session holds ``<id>.lock`` (a QLockFile) while it runs. A clean close or a
save removes the autosave. At start, an autosave whose lock is free (its
program has ended without cleaning up) is offered for recovery.
"""

from __future__ import annotations

import dataclasses
import json
import time
import uuid
from dataclasses import dataclass
from pathlib import Path

from PySide6.QtCore import QLockFile, QObject, QTimer, Signal

from .. import project as pj
from ..files import FileStamp, remove_stale_temporaries, write_atomic
from .settings import data_folder

INTERVAL_MS = 30_000


def autosave_folder() -> Path:
    return data_folder() / "autosave"


@dataclass
class Recoverable:
    session: str
    project_file: Path       # the autosaved project
    original: str            # the file it was opened from, "" if it was never saved
    saved_at: float          # time.time() of the autosave
    name: str                # project name
    original_stamp: FileStamp | None = None   # the original file as the autosaved work last read or wrote it


    def discard(self) -> None:
        folder = self.project_file.parent
        for suffix in (".json", ".meta.json", ".lock"):
            (folder / f"{self.session}{suffix}").unlink(missing_ok=True)


def _lock(folder: Path, session: str) -> QLockFile:
    lock = QLockFile(str(folder / f"{session}.lock"))
    lock.setStaleLockTime(0)   # stale only when its process is gone, however long it ran
    return lock


def find_recoverable(own_session: str | None = None) -> list[Recoverable]:
    """Autosaves left by sessions that are no longer running, newest first."""
    folder = autosave_folder()
    if not folder.is_dir():
        return []
    found = []
    for meta_path in folder.glob("*.meta.json"):
        session = meta_path.name[: -len(".meta.json")]
        if session == own_session:
            continue
        lock = _lock(folder, session)
        if not lock.tryLock(0):
            continue          # that window is still open
        lock.unlock()
        try:
            meta = json.loads(meta_path.read_text(encoding="utf-8"))
        except (OSError, ValueError):
            meta = {}
        project_file = folder / f"{session}.json"
        if not project_file.exists():
            meta_path.unlink(missing_ok=True)
            continue
        found.append(Recoverable(session, project_file, str(meta.get("original", "")),
                                 float(meta.get("saved_at", project_file.stat().st_mtime)),
                                 str(meta.get("name", "")), _stamp_from(meta)))
    return sorted(found, key=lambda r: r.saved_at, reverse=True)


def _stamp_from(meta: dict) -> FileStamp | None:
    """The original file's stamp kept in an autosave's note; unknown (so a save over it always asks) when the
    note has none or a damaged one, and None for work that never had a file."""
    if not meta.get("original"):
        return None
    try:
        return FileStamp(**meta["original_stamp"])
    except (KeyError, TypeError):
        return FileStamp(-1, 0, "")


def save_failure_reason(exc: BaseException) -> str:
    """Why a project could not be written, in one line."""
    if isinstance(exc, pj.ProjectSaveError):
        return f"the project holds a value no file can keep: {exc}"
    if isinstance(exc, OSError):
        return f"{exc.strerror or exc}" + (f": {exc.filename}" if exc.filename else "")
    return f"unexpected error {type(exc).__name__}: {exc}"


class Autosaver(QObject):
    """Writes the document every ``interval_ms`` while it has changes that are not in the autosave yet.

    ``failed`` carries the reason when an autosave could not be written; it is emitted once per reason (not
    every interval), and again after a later autosave has succeeded.
    """

    failed = Signal(str)

    def __init__(self, doc, interval_ms: int = INTERVAL_MS, parent=None):
        super().__init__(parent)
        self.doc = doc
        self.session = uuid.uuid4().hex
        self.folder = autosave_folder()
        self.folder.mkdir(parents=True, exist_ok=True)
        remove_stale_temporaries(self.folder)   # left by an autosave that was killed part way
        self.lock = _lock(self.folder, self.session)
        self.lock.tryLock(0)
        self._written_index = None
        self.timer = QTimer(self)
        self.timer.setInterval(interval_ms)
        self.timer.timeout.connect(self.save_now)
        self.timer.start()
        self.last_error = ""

    @property
    def project_file(self) -> Path:
        return self.folder / f"{self.session}.json"

    @property
    def meta_file(self) -> Path:
        return self.folder / f"{self.session}.meta.json"

    def save_now(self) -> bool:
        """Autosave if there are unsaved changes not yet written; True if a file was written."""
        if not self.doc.modified:
            self.discard_file()
            return False
        index = (id(self.doc.project), self.doc.revision)
        if index == self._written_index and self.project_file.exists():
            return False
        try:
            pj.save(self.doc.project, self.project_file, private=True)
            meta = {"original": str(self.doc.path or ""), "saved_at": time.time(), "name": self.doc.project.name,
                    "original_stamp": dataclasses.asdict(self.doc.stamp) if self.doc.stamp else None}
            write_atomic(self.meta_file, json.dumps(meta, ensure_ascii=True), private=True)
        except Exception as exc:  # noqa: BLE001 - whatever the reason, the user must hear that work is unprotected
            reason = save_failure_reason(exc)
            if reason != self.last_error:
                self.last_error = reason
                self.failed.emit(reason)
            return False
        self.last_error = ""
        self._written_index = index
        return True

    def discard_file(self) -> None:
        self.project_file.unlink(missing_ok=True)
        self.meta_file.unlink(missing_ok=True)
        self._written_index = None

    def close(self) -> None:
        """A clean end: no autosave left behind, lock released."""
        self.timer.stop()
        self.discard_file()
        self.lock.unlock()
