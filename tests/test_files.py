"""app.files.write_atomic: the target holds the old content or the new, never a mixture (common practice)."""

import pytest

from app.files import write_atomic


def test_text_bytes_and_pieces(tmp_path):
    target = tmp_path / "out.csv"
    write_atomic(target, "a,b\nπ,2\n")
    assert target.read_bytes() == "a,b\nπ,2\n".encode("utf-8")
    write_atomic(target, b"raw")
    assert target.read_bytes() == b"raw"
    body = bytearray(b"xyz,1\n")
    write_atomic(target, [b"head\n", memoryview(body)[:4], "é\n"])
    assert target.read_bytes() == "head\nxyz,é\n".encode("utf-8")
    assert [p.name for p in tmp_path.iterdir()] == ["out.csv"]


def test_a_failed_write_leaves_the_old_file_and_no_temporary(tmp_path):
    target = tmp_path / "out.csv"
    target.write_bytes(b"good")
    with pytest.raises(TypeError):
        write_atomic(target, [b"half of it", 12345])  # the second piece cannot be written
    assert target.read_bytes() == b"good"
    assert [p.name for p in tmp_path.iterdir()] == ["out.csv"]
