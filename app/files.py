"""Writing files so that a crash never leaves half of one."""

from __future__ import annotations

import hashlib
import os
import re
import stat
import tempfile
import time
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path


#: Temporary files of our own are named ``.<target name>.<process id>.<8 random characters>.tmp`` beside the target.
#: A temporary file of ours, or the journal SQLite keeps beside a GeoPackage's (GDAL writes through SQLite).
_TEMP_NAME = re.compile(r"\.(?P<name>.+)\.(?P<pid>\d+)\.[a-z0-9_]{8}\.tmp(?:-journal|-wal|-shm)?")
#: A temporary file of ours not written to for this long belongs to a save that ended without cleaning up
#: (killed, or the machine stopped), wherever that save ran, even on another computer sharing the folder.
STALE_AFTER_S = 60.0
#: ... and sooner when its process, on this computer, is gone (a short grace for a file system's coarse times).
STALE_DEAD_AFTER_S = 2.0


def _process_alive(pid: int) -> bool:
    if pid == os.getpid():
        return True
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except (PermissionError, OSError):
        return True   # someone else's process, or a platform that cannot tell: assume it runs
    return True


def remove_stale_temporaries(folder, name: str | None = None) -> list[Path]:
    """Remove the temporary files that a save of ours left behind in ``folder`` (of target ``name``, or of any).

    Only names of our own pattern are touched (see ``_TEMP_NAME``), and only when stale: not written to for
    :data:`STALE_AFTER_S`, or for :data:`STALE_DEAD_AFTER_S` when the process that wrote them is gone. A save in
    progress keeps writing, so its file is never taken. Returns what was removed; errors are ignored.
    """
    removed = []
    try:
        entries = list(os.scandir(folder))
    except OSError:
        return removed
    now = time.time()
    for entry in entries:
        m = _TEMP_NAME.fullmatch(entry.name)
        if not m or (name is not None and m["name"] != name):
            continue
        try:
            if not entry.is_file(follow_symlinks=False):
                continue
            age = now - entry.stat(follow_symlinks=False).st_mtime
            if age > STALE_AFTER_S or (age > STALE_DEAD_AFTER_S and not _process_alive(int(m["pid"]))):
                os.unlink(entry.path)
                removed.append(Path(entry.path))
        except (OSError, ValueError):
            continue
    return removed


def current_umask() -> int:
    """The process's umask, read without changing it where the system allows (Linux), else set and restored."""
    try:
        with open("/proc/self/status", encoding="ascii") as fh:
            for line in fh:
                if line.startswith("Umask:"):
                    return int(line.split()[1], 8)
    except (OSError, ValueError):
        pass
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


def write_target(path) -> Path:
    """The file a write to ``path`` must replace: ``path`` itself, or, through symbolic links, the file they name
    (a link is kept a link; its target gets the new content)."""
    path = Path(path)
    return Path(os.path.realpath(path)) if path.is_symlink() else path


@contextmanager
def atomic_writer(path, *, private: bool = False):
    """A binary file to write ``path`` through: a temporary file in the same folder, replacing ``path`` in one step
    when the block ends without an error.

    The temporary file is flushed and synced before ``os.replace``, so the
    target holds either its old content or the new, never a mixture; on any
    error the temporary file is removed and the old file is left as it was.
    When ``path`` is a symbolic link, the file it points to is replaced and the link stays. A new file gets the
    permissions the user's umask gives (0644 under umask 022), an existing one keeps its own; ``private`` files
    (autosaves) are readable by their owner only (0600). Temporary files that an earlier, killed save of the
    same target left behind are removed first.
    """
    path = write_target(path)
    remove_stale_temporaries(path.parent, path.name)
    try:
        mode = 0o600 if private else stat.S_IMODE(os.stat(path).st_mode)
    except FileNotFoundError:
        mode = 0o666 & ~current_umask()
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.{os.getpid()}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "wb") as fh:
            if hasattr(os, "fchmod"):
                os.fchmod(fh.fileno(), mode)
            else:   # Windows: only the read-only bit exists
                os.chmod(tmp, mode)
            yield fh
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise


def write_atomic(path, data, *, private: bool = False) -> None:
    """Write ``data`` to ``path`` through :func:`atomic_writer` (``private``: owner-only, for autosaves).

    ``data`` is text (written as UTF-8 with the newlines as given), bytes,
    or a list of bytes-like pieces written one after the other.
    """
    pieces = data if isinstance(data, list) else [data]
    with atomic_writer(path, private=private) as fh:
        for piece in pieces:
            fh.write(piece.encode("utf-8") if isinstance(piece, str) else piece)


# -- has someone else changed the file? ---------------------------------------------------------------------------

@dataclass(frozen=True)
class FileStamp:
    """What a file was when we last read or wrote it: size [bytes], modification time [ns] and SHA-256."""

    size: int
    mtime_ns: int
    sha256: str

    @classmethod
    def of(cls, path) -> "FileStamp | None":
        """The stamp of ``path`` as it is now (through links), or None when there is no such file."""
        digest = hashlib.sha256()
        try:
            with open(path, "rb") as fh:
                st = os.fstat(fh.fileno())
                for block in iter(lambda: fh.read(1 << 20), b""):
                    digest.update(block)
        except (FileNotFoundError, IsADirectoryError, NotADirectoryError):
            return None
        return cls(st.st_size, st.st_mtime_ns, digest.hexdigest())

    def changed_on_disk(self, path) -> bool:
        """True when the file at ``path`` now holds other content than it did (a new time alone is not a change;
        a file that is gone is no change either: saving puts it back and overwrites nobody's work)."""
        now = FileStamp.of(path)
        return now is not None and (now.size != self.size or now.sha256 != self.sha256)


class FileChangedError(Exception):
    """The file to be saved over was changed by someone else since we read or wrote it; nothing was written."""

    def __init__(self, path, old: FileStamp, new: "FileStamp | None"):
        self.path, self.old, self.new = Path(path), old, new
        super().__init__(f"{path} was changed by another program or person since it was opened or saved here")


# -- text cells that a spreadsheet would run -----------------------------------------------------------------------

#: Names a file may not have on Windows, whatever its extension.
_RESERVED = {"CON", "PRN", "AUX", "NUL", *(f"COM{i}" for i in range(1, 10)), *(f"LPT{i}" for i in range(1, 10))}
#: The longest stem :func:`safe_file_name` gives, well inside every file system's limit with a folder around it.
MAX_STEM = 100


def safe_file_name(name: str, suffix: str = "", fallback: str = "unnamed") -> str:
    """``name`` as a file name on every system, then ``suffix``: the one rule of the design sheets' suggested name
    and the drawings' files.

    What the user typed is kept wherever file systems allow it (spaces and letters of any language included): a
    colon becomes " - ", a run of the other characters Windows refuses (``\\ / * ? " < > |``, control characters)
    one "-"; spaces, dots and dashes at either end go (Windows drops trailing dots and spaces, a leading dash
    reads as an option), the stem is cut to :data:`MAX_STEM` characters, a device name of Windows (CON, COM1...)
    gets a leading "_", and a name with nothing left is ``fallback``. ("Road 7: North ditch" -> "Road 7 - North
    ditch", "a/b" -> "a-b", "CON" -> "_CON".)
    """
    safe = re.sub(r"\s*:\s*", " - ", name)
    safe = re.sub(r'[\\/*?"<>|\x00-\x1f\x7f]+', "-", safe).strip(" .-")
    safe = safe[:MAX_STEM].rstrip(" .-") or fallback
    if safe.split(".")[0].strip().upper() in _RESERVED:
        safe = "_" + safe
    return safe + suffix


#: The first characters that make a spreadsheet read a cell as a formula (or, for tab and carriage return, that let
#: one slip past a check for the others), the usual list for CSV formula injection.
FORMULA_STARTS = frozenset("=+-@\t\r")
_PLAIN_NUMBER = re.compile(r"[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?")


def spreadsheet_safe(text: str) -> str:
    """``text`` as a cell of a CSV or TSV file that a spreadsheet will show and never evaluate.

    A cell starting with one of :data:`FORMULA_STARTS` gets a leading apostrophe, which spreadsheets take as
    "this is text" (``=HYPERLINK(...)`` becomes ``'=HYPERLINK(...)``); a plain number such as ``-1.5`` or
    ``+2e-3`` is left as it is, so that numbers stay numbers.
    """
    if text[:1] in FORMULA_STARTS and not _PLAIN_NUMBER.fullmatch(text):
        return "'" + text
    return text


def tsv_cell(text: str) -> str:
    """A cell of tab-separated text for a spreadsheet: no tab or line break inside, and never run as a formula."""
    return " ".join(spreadsheet_safe(text).replace("\t", " ").splitlines())
