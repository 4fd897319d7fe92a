"""How files are written: through symbolic links, with the user's permissions, and without leaving our own
temporary files behind after a save that was killed part way."""

import os
import stat
import subprocess
import sys
import time

import pytest

from app import files
from app import project as pj

pytestmark = pytest.mark.skipif(os.name != "posix", reason="links, modes and kill are checked on POSIX")


@pytest.fixture
def umask():
    """Set the process's umask for one test, and put the old one back."""
    old = os.umask(0o022)
    yield lambda mask: os.umask(mask)
    os.umask(old)


def mode(path) -> int:
    return stat.S_IMODE(os.stat(path).st_mode)


def project(name="Invented test project"):
    return pj.Project(name=name)


# ----------------------------------------------------------------------------- symbolic links

def test_saving_through_a_link_writes_the_file_it_points_to(tmp_path):
    real_dir = tmp_path / "shared"
    real_dir.mkdir()
    real = real_dir / "roads.json"
    pj.save(project("old"), real)
    link = tmp_path / "roads-link.json"
    link.symlink_to(os.path.relpath(real, tmp_path))   # a relative link, as users make them
    pj.save(project("new"), link)
    assert link.is_symlink() and os.readlink(link) == os.path.relpath(real, tmp_path)
    assert pj.load(real).name == "new" and pj.load(link).name == "new"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["roads-link.json", "shared"]
    assert [p.name for p in real_dir.iterdir()] == ["roads.json"]   # the temporary file was made beside the target


def test_a_chain_of_links_and_a_link_to_a_missing_file(tmp_path):
    real = tmp_path / "real.json"
    first = tmp_path / "first.json"
    second = tmp_path / "second.json"
    first.symlink_to(real)          # real does not exist yet
    second.symlink_to(first)
    pj.save(project("through two links"), second)
    assert second.is_symlink() and first.is_symlink() and real.is_file() and not real.is_symlink()
    assert pj.load(real).name == "through two links"


# ----------------------------------------------------------------------------- permissions

def test_a_new_project_or_sheet_follows_the_umask(tmp_path, umask):
    umask(0o022)
    pj.save(project(), tmp_path / "p.json")
    files.write_atomic(tmp_path / "sheet.pdf", b"%PDF-1.7 invented bytes")
    assert mode(tmp_path / "p.json") == 0o644 and mode(tmp_path / "sheet.pdf") == 0o644
    umask(0o077)
    pj.save(project(), tmp_path / "q.json")
    assert mode(tmp_path / "q.json") == 0o600


def test_an_existing_file_keeps_its_permissions(tmp_path, umask):
    umask(0o022)
    path = tmp_path / "p.json"
    pj.save(project(), path)
    os.chmod(path, 0o640)
    pj.save(project("again"), path)
    assert mode(path) == 0o640 and pj.load(path).name == "again"


def test_an_autosave_is_private_whatever_the_umask(tmp_path, umask):
    umask(0o022)
    pj.save(project(), tmp_path / "autosave.json", private=True)
    assert mode(tmp_path / "autosave.json") == 0o600
    os.chmod(tmp_path / "autosave.json", 0o644)
    pj.save(project(), tmp_path / "autosave.json", private=True)
    assert mode(tmp_path / "autosave.json") == 0o600


def test_the_umask_is_read_without_changing_it(umask):
    umask(0o027)
    assert files.current_umask() == 0o027
    assert files.current_umask() == 0o027


# ----------------------------------------------------------------------------- stale temporary files

KILLED_SAVE = """
import os, signal, sys
from app import files
with files.atomic_writer(sys.argv[1]) as fh:
    fh.write(b"{half a project" * 100000)
    fh.flush()
    os.kill(os.getpid(), signal.SIGKILL)
"""


def _age(path, seconds):
    t = time.time() - seconds
    os.utime(path, (t, t))


def test_a_killed_save_leaves_the_old_file_and_the_next_save_removes_its_temporary_file(tmp_path):
    path = tmp_path / "p.json"
    pj.save(project("before"), path)
    done = subprocess.run([sys.executable, "-c", KILLED_SAVE, str(path)], cwd=os.getcwd(), capture_output=True)
    assert done.returncode == -9, done.stderr
    left = [p for p in tmp_path.iterdir() if p.name != "p.json"]
    assert len(left) == 1 and left[0].stat().st_size >= 1_500_000     # what a killed save leaves
    assert pj.load(path).name == "before"                               # the old file is whole
    _age(left[0], 5)       # its process is gone; a few seconds later it is stale
    pj.save(project("after"), path)
    assert [p.name for p in tmp_path.iterdir()] == ["p.json"] and pj.load(path).name == "after"


def test_only_our_own_stale_temporary_files_are_removed(tmp_path):
    dead = subprocess.run([sys.executable, "-c", "import os; print(os.getpid())"], capture_output=True, text=True)
    dead_pid = int(dead.stdout)
    own = os.getpid()
    keep = {
        "fresh-of-a-dead-process": f".p.json.{dead_pid}.abcd1234.tmp",     # its process may still be renaming it
        "running-save": f".p.json.{own}.efgh5678.tmp",                      # a save of this process, in progress
        "running-journal": f".p.json.{own}.efgh5678.tmp-journal",          # SQLite's, beside a GeoPackage's
        "not-a-journal": f".p.json.{dead_pid}.zzzz9999.tmp-other",
        "other-target": f".q.json.{dead_pid}.abcd1234.tmp",
        "not-our-pattern": ".p.json.tmp",
        "users-file": "p.json.tmp",
        "no-pid": ".p.json.abcd1234.tmp",
    }
    remove = {
        "dead-process": f".p.json.{dead_pid}.zzzz9999.tmp",
        "dead-journal": f".p.json.{dead_pid}.zzzz9999.tmp-journal",       # GDAL's, after a killed GeoPackage write
        "long-untouched": f".p.json.{own}.old00000.tmp",
    }
    for name in (*keep.values(), *remove.values()):
        (tmp_path / name).write_bytes(b"invented")
    _age(tmp_path / remove["dead-process"], 5)
    _age(tmp_path / remove["dead-journal"], 5)
    _age(tmp_path / keep["running-journal"], 5)
    _age(tmp_path / keep["not-a-journal"], 3600)
    _age(tmp_path / remove["long-untouched"], files.STALE_AFTER_S + 5)
    _age(tmp_path / keep["other-target"], files.STALE_AFTER_S + 5)
    _age(tmp_path / keep["not-our-pattern"], 3600)
    _age(tmp_path / keep["users-file"], 3600)
    _age(tmp_path / keep["no-pid"], 3600)
    pj.save(project(), tmp_path / "p.json")
    names = {p.name for p in tmp_path.iterdir()}
    assert set(keep.values()) <= names, "a file that is not a stale temporary of ours was removed"
    assert not set(remove.values()) & names
    # The start-up sweep of a folder takes every target's stale temporaries, still only ours.
    files.remove_stale_temporaries(tmp_path)
    names = {p.name for p in tmp_path.iterdir()}
    assert keep["other-target"] not in names
    assert {keep["not-our-pattern"], keep["users-file"], keep["no-pid"], keep["running-save"],
            keep["running-journal"], keep["not-a-journal"]} <= names
